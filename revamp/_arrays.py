"""Array helpers shared by the numeric core: scalars in give floats out, arrays in give arrays out."""
from __future__ import annotations

import numpy as np


def as_array(x) -> np.ndarray:
    """``x`` as a float ndarray (no copy when it already is one)."""
    return np.asarray(x, dtype=float)


def as_out(x):
    """A float for a 0-d result, the float array otherwise.

    >>> as_out(np.float64(2.0)), as_out([1, 2])
    (2.0, array([1., 2.]))
    """
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x
