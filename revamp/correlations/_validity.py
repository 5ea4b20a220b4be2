"""Validity-range checks shared by the correlations.

A correlation used outside its published range does not raise: it returns its number and the caller collects a
warning string produced here, which ends up in ``Rating.warnings``.
"""
from __future__ import annotations

import numpy as np

__all__ = ["range_warning"]


def range_warning(name: str, quantity: str, values, low=None, high=None, source: str = "") -> list[str]:
    """Return ``[]`` when all finite ``values`` lie in [low, high], else one warning string.

    Parameters
    ----------
    name : str
        The correlation, e.g. ``"Gnielinski (1976)"``.
    quantity : str
        The variable checked, e.g. ``"Re"``.
    values : array_like
        The values used.
    low, high : float or None
        The published range; ``None`` for an open end.
    source : str
        Where the range is stated.

    Examples
    --------
    >>> range_warning("Gnielinski (1976)", "Re", [2000.0, 5000.0], 2300, 5e6)
    ['Gnielinski (1976): Re = 2000 is outside its validity range 2300 to 5e+06 (1 of 2 cases)']
    >>> range_warning("Gnielinski (1976)", "Re", 5000.0, 2300, 5e6)
    []
    """
    arr = np.atleast_1d(np.asarray(values, dtype=float))
    arr = arr[np.isfinite(arr)]
    if arr.size == 0:
        return []
    bad = np.zeros(arr.shape, dtype=bool)
    if low is not None:
        bad |= arr < low
    if high is not None:
        bad |= arr > high
    n = int(bad.sum())
    if n == 0:
        return []
    worst = arr[bad]
    # report the value farthest outside
    if low is not None and np.any(worst < low):
        shown = float(worst.min())
    else:
        shown = float(worst.max())
    if low is None and high is None:  # (cannot happen: nothing is then outside)
        span = "unbounded"
    elif low is None:
        span = f"(values below {high:g})"
    elif high is None:
        span = f"(values above {low:g})"
    else:
        span = f"{low:g} to {high:g}"
    where = f"; range from {source}" if source else ""
    count = f" ({n} of {arr.size} cases)" if arr.size > 1 else ""
    return [f"{name}: {quantity} = {shown:.4g} is outside its validity range {span}{count}{where}"]
