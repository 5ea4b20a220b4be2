"""The few numbers a unit summary shows for each exchanger, computed (the report formats them)."""
from __future__ import annotations

__all__ = ["unit_ratings"]


def unit_ratings(case):
    """``(today, revamp)`` ratings of a shell-and-tube case of a unit file at its own services (revamp: the revamp
    service, today's when the file gives none)."""
    import revamp as rv

    return rv.rate(case.exchanger, case.service), rv.rate(case.exchanger, case.revamp_service)
