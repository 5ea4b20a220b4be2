"""Effectiveness of an air cooler's tube bundle: cross flow row by row in each pass, passes in overall counterflow
(layer 4).

Within one tube pass of ``r`` rows, the tube fluid enters every row at the header temperature and is mixed across
each tube (one tube in the air's path per row), the air is unmixed along the tubes and crosses the rows in turn. The
energy balances of the rows give a linear system along the tube length, ``du/dx = M u`` for the tube-to-inlet-air
temperature differences of the rows, with ``M = -b I + c L`` (``L`` strictly lower triangular): its exponential is
the finite series ``e^{-b} sum_{m<r} (c L)^m / m!``, exact and vectorized. One row is the textbook cross-flow relation
with the tube fluid mixed (Incropera et al. 2007, Table 11.3); many rows tend to cross flow with both fluids
unmixed (Mason 1954). This is the row-by-row model of the tabulated solutions for air coolers (Schedwill 1968, as
reproduced by ESDU 86018; from memory), derived here from the row energy balances.

Several passes are joined in counterflow to the air (the tube fluid enters in the rows the air leaves) by the series
relation for identical units (Kays & London 1984), which takes the air as mixed between passes; the air is in fact
unmixed there, which this slightly underestimates for deep multi-pass bundles at high NTU.

Checked against the explicit approximation of Roetzel & Nicole (1975) as implemented by ``ht.Ft_aircooler``: up to
NTU 3 the effectiveness agrees within 0.008 for 2, 3 or 4 rows in one pass and for 2-2, 3-3, 4-4 and 4-2
rows-passes; for one row in one pass the fit and the exact relation differ by up to 0.032 (tests/test_aircooler.py).

References
----------
Incropera, F. P., DeWitt, D. P., Bergman, T. L., Lavine, A. S. (2007). *Fundamentals of Heat and Mass Transfer*,
6th ed., Wiley, Table 11.3.
Mason, J. L. (1954). Heat transfer in crossflow. *Proc. 2nd U.S. National Congress of Applied Mechanics*, 801-803.
Schedwill, H. (1968). Thermische Auslegung von Kreuzstromwärmeaustauschern. *Fortschr.-Ber. VDI* 6(19).
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill.
Roetzel, W., Nicole, F. J. L. (1975). Mean temperature difference for heat exchanger design: a general approximate
explicit equation. *J. Heat Transfer* 97(1), 5-8.
"""
from __future__ import annotations

import numpy as np

from . import thermal

__all__ = ["effectiveness_air_cooler", "effectiveness_one_pass"]


def effectiveness_one_pass(ntu, cr, tube_is_cmin, rows):
    """Effectiveness and its complement of one tube pass over ``rows`` rows (tube fluid mixed in each tube, the air
    unmixed, crossing the rows in turn).

    Parameters
    ----------
    ntu : array_like
        U A / C_min of the pass [-], >= 0.
    cr : array_like
        C_min / C_max [-], in [0, 1].
    tube_is_cmin : array_like of bool
    rows : int
        Rows of the pass, >= 1.

    Returns
    -------
    (eps, w) : tuple of numpy.ndarray
    """
    ntu, cr, tmin = np.broadcast_arrays(np.asarray(ntu, dtype=float), np.asarray(cr, dtype=float),
                                        np.asarray(tube_is_cmin, dtype=bool))
    shape = ntu.shape
    ntu, cr, tmin = ntu.ravel(), cr.ravel(), tmin.ravel()
    ntu_t = np.where(tmin, ntu, ntu * cr)  # U A / C_tube
    a = np.where(tmin, ntu * cr, ntu) / rows  # U A_row / C_air: the air's NTU over one row
    with np.errstate(divide="ignore", invalid="ignore"):
        g = np.where(a > 0, -np.expm1(-a) / np.where(a > 0, a, 1.0), 1.0)
    b = ntu_t * g  # decay of each row's tube temperature difference along the tube
    c = b * -np.expm1(-a)  # coupling to the rows the air crossed before
    k = np.arange(rows)
    lag = k[:, None] - k[None, :] - 1
    L = np.where((lag >= 0)[..., None], np.exp(-np.maximum(lag, 0)[..., None] * a[None, None, :]), 0.0)
    N = L * c[None, None, :]
    term = np.repeat(np.eye(rows)[..., None], ntu.size, axis=2)
    total = term.copy()
    for m in range(1, rows):
        term = np.einsum("ijn,jkn->ikn", N, term) / m
        total = total + term
    left = total.sum(axis=1).mean(axis=0) * np.exp(-b)  # mixed tube outlet difference over the inlet difference
    p_tube = 1.0 - left
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):  # clipped to [0, 1] below
        eps = np.where(tmin, p_tube, p_tube / np.where(cr > 0, cr, 1.0))
    eps = np.clip(eps, 0.0, 1.0)
    w = np.where(tmin, left, 1.0 - eps)
    return eps.reshape(shape), w.reshape(shape)


def effectiveness_air_cooler(ntu, cr, tube_is_cmin, rows, passes):
    """Effectiveness and its complement ``(eps, 1 - eps)`` of a tube bundle in cross flow with the air.

    Parameters
    ----------
    ntu : array_like
        U A / C_min of the whole bundle [-], >= 0.
    cr : array_like
        C_min / C_max [-], in [0, 1].
    tube_is_cmin : array_like of bool
        Whether the tube-side stream has the smaller heat-capacity rate.
    rows, passes : int
        Tube rows crossed by the air, tube passes (``rows`` a multiple of ``passes``).

    Returns
    -------
    (eps, w) : tuple of numpy.ndarray
        Effectiveness [-] and 1 - eps [-].
    """
    ntu = np.asarray(ntu, dtype=float)
    cr = np.asarray(cr, dtype=float)
    eps1, w1 = effectiveness_one_pass(ntu / passes, cr, tube_is_cmin, rows // passes)
    eps, w = thermal._series(eps1, w1, cr, passes)
    return np.minimum(eps, 1.0), np.maximum(w, 0.0)
