"""What-if ratings of one exchanger for the interactive controls: a throughput factor and fouling, as is, with
twisted tapes, or with N shells in series (the widgets format and cache them)."""
from __future__ import annotations

__all__ = ["what_if", "what_if_rating"]


def what_if_rating(case, kind: str, throughput, fouling_shell, fouling_tube, twist_ratio=4.0, shells=None):
    """One rating of ``case`` (an exchanger of a unit file) at a throughput factor and fouling [m²K/W] on each
    side's own surface; any of these may be an array (one vectorized call). ``kind``: ``"as is"``, ``"tape"``
    (twisted tapes of ``twist_ratio``) or ``"shells"`` (``shells`` in series)."""
    import revamp as rv

    from ..options import TwistedTape

    svc = case.service.scaled(throughput=throughput).replace(fouling_shell=fouling_shell, fouling_tube=fouling_tube)
    ex = case.exchanger
    if kind == "tape":
        ex, svc = TwistedTape(twist_ratio=twist_ratio).apply(ex, svc)
    elif kind == "shells":
        ex = ex.replace(shells=int(shells))
    return rv.rate(ex, svc)


def what_if(case, throughput=1.0, fouling_shell=None, fouling_tube=None, twist_ratio=4.0, shells=None) -> dict:
    """Re-rate one exchanger at a throughput factor and fouling, as is, with twisted tapes and with N shells.

    Returns ``{label: Rating}`` (a few ratings: well under 100 ms on the demo).
    """
    fs = case.service.fouling_shell if fouling_shell is None else fouling_shell
    ft = case.service.fouling_tube if fouling_tube is None else fouling_tube
    out = {"as is": what_if_rating(case, "as is", throughput, fs, ft)}
    out[f"twisted tape y={twist_ratio:g}"] = what_if_rating(case, "tape", throughput, fs, ft, twist_ratio)
    n = int(shells or case.exchanger.shells)
    if n != case.exchanger.shells:
        out[f"{n} shell(s) in series"] = what_if_rating(case, "shells", throughput, fs, ft, shells=n)
    return out
