"""Effectiveness of an air cooler's tube bundle: cross flow in each pass, passes in overall counterflow (layer 4).

Each tube pass is a cross-flow unit over the rows it occupies; the passes are joined in counterflow to the air (the
tube fluid enters in the rows the air leaves), the tube fluid mixed in the headers between passes.

- one row per pass: the tube fluid is mixed across the air flow (one tube in the air's path), the air unmixed: the
  exact cross-flow relation with one fluid mixed (Incropera et al. 2007, Table 11.3);
- two or more rows per pass: both fluids unmixed (Mason 1954, exact series in :mod:`revamp.thermal`), which the
  deep-bank limit of the row-by-row solutions (Schedwill 1968, as tabulated by ESDU 86018) approaches;
- several passes: the counterflow series relation for identical units (Kays & London 1984), which takes the air as
  mixed between passes; the air is in fact unmixed, so the effectiveness is slightly underestimated for deep
  multi-pass bundles at high NTU.

Checked against the explicit approximation of Roetzel & Nicole (1975) as implemented by ``ht.Ft_aircooler``: up to
NTU 3 the effectiveness agrees within 0.013 for 3 or 4 rows in one pass and for 2-2, 3-3, 4-4 and 4-2 rows-passes,
within 0.025 for two rows in one pass; for one row in one pass the fit and the exact relation used here differ by up
to 0.032 (tests/test_aircooler.py).

References
----------
Incropera, F. P., DeWitt, D. P., Bergman, T. L., Lavine, A. S. (2007). *Fundamentals of Heat and Mass Transfer*,
6th ed., Wiley, Table 11.3.
Mason, J. L. (1954). Heat transfer in crossflow. *Proc. 2nd U.S. National Congress of Applied Mechanics*, 801-803.
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill.
Roetzel, W., Nicole, F. J. L. (1975). Mean temperature difference for heat exchanger design: a general approximate
explicit equation. *J. Heat Transfer* 97(1), 5-8.
"""
from __future__ import annotations

import numpy as np

from . import thermal

__all__ = ["effectiveness_air_cooler"]


def _eps_one_mixed(ntu, cr, mixed_is_cmin):
    """Cross flow, one fluid mixed: ``(eps, 1 - eps)``; ``mixed_is_cmin`` says which fluid is the mixed one."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        crs = np.where(cr > 0, cr, 1.0)
        # Cmin mixed: eps = 1 - exp(-(1 - e^{-Cr NTU})/Cr); Cr -> 0 gives 1 - e^{-NTU}
        x_min = np.where(cr > 0, -np.expm1(-cr * ntu) / crs, ntu)
        w_min = np.exp(-x_min)
        # Cmax mixed: eps = (1 - exp(-Cr (1 - e^{-NTU})))/Cr
        y = -np.expm1(-ntu)
        e_max = np.where(cr > 0, -np.expm1(-cr * y) / crs, y)
    eps = np.where(mixed_is_cmin, 1.0 - w_min, e_max)
    w = np.where(mixed_is_cmin, w_min, 1.0 - e_max)
    return eps, w


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
    n1 = ntu / passes
    if rows // passes == 1:
        eps1, w1 = _eps_one_mixed(n1, cr, np.asarray(tube_is_cmin, dtype=bool))
    else:
        eps1, w1 = thermal._eps_crossflow(n1, cr)
    eps, w = thermal._series(eps1, w1, cr, passes)
    return np.minimum(eps, 1.0), np.maximum(w, 0.0)
