"""The result of one screening check, shared by every check."""
from __future__ import annotations

from dataclasses import dataclass

from ..errors import InputError

__all__ = ["STATUSES", "Check", "worst"]

STATUSES = ("ok", "warn", "fail")


@dataclass(frozen=True)
class Check:
    """One screening check: a number against a limit, with a verdict.

    Parameters
    ----------
    name : str
        What was checked, e.g. ``"dp_tube"`` or ``"fluidelastic"``.
    status : str
        ``"ok"`` (no flag raised), ``"warn"`` (close to or past a soft limit) or ``"fail"`` (past the limit).
        A screen can flag a design, never clear it: ``"ok"`` means only that this screen raised no flag.
    value : float
        The number checked, in ``unit``.
    limit : float
        The limit it was compared with, in ``unit`` (NaN when there is none).
    unit : str
        Unit of ``value`` and ``limit`` (SI).
    message : str
        One line saying what was compared with what, where the limit came from and what was assumed.
    """

    name: str
    status: str
    value: float
    limit: float
    unit: str
    message: str

    def __post_init__(self):
        if self.status not in STATUSES:
            raise InputError(f"Check({self.name}).status", self.status, f"one of {STATUSES}")
        object.__setattr__(self, "value", float(self.value))
        object.__setattr__(self, "limit", float(self.limit))


def worst(checks) -> str:
    """The worst status among ``checks`` (``"ok"`` for none).

    >>> worst([Check("a", "ok", 1, 2, "Pa", ""), Check("b", "warn", 1, 2, "Pa", "")])
    'warn'
    """
    rank = {s: i for i, s in enumerate(STATUSES)}
    return max((c.status for c in checks), key=rank.__getitem__, default="ok")
