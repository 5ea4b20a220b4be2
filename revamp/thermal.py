"""Duty and temperatures: LMTD, the F correction, effectiveness-NTU.

Arrangements (keys of :data:`ARRANGEMENTS`):

- ``"counterflow"``, ``"parallel"``: pure counter- and parallel flow;
- ``"E"``: TEMA E shell, one shell pass and an even number of tube passes (1-2N exchanger);
- ``"crossflow"``: single-pass crossflow, both fluids unmixed (TEMA X shell);
- ``"J1"``, ``"J2"``, ``"J4"``: TEMA J shell (divided flow) with 1, 2 and 4 tube passes.

A TEMA F shell (two shell passes with a longitudinal baffle) is two E shells in series (four or more tube passes)
or pure counterflow (two tube passes), when no fluid or heat leaks across the longitudinal baffle.

``shells`` = N identical units in series, connected in overall counterflow. All functions broadcast over numpy
arrays; scalars in give floats out.

The LMTD and the F correction (:func:`lmtd`, :func:`lmtd_kernel`, :func:`F_1_2N`, :func:`F_series`) live in
:mod:`revamp.thermal_lmtd` and are re-exported here; this module holds effectiveness-NTU.

References
----------
.. [1] Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Mean temperature difference in design.
   Trans. ASME 62, 283-294.
.. [2] Kays, W. M., London, A. L. (1984). Compact Heat Exchangers, 3rd ed. McGraw-Hill, ch. 2.
.. [3] Shah, R. K., Sekulić, D. P. (2003). Fundamentals of Heat Exchanger Design. Wiley, ch. 3
   (P-NTU of 1-2N shells, shells in series).
.. [4] Kern, D. Q. (1950). Process Heat Transfer. McGraw-Hill, ch. 7 (1-2 exchanger, shells in series).
.. [5] Mason, J. L. (1954). Heat transfer in cross flow. Proc. 2nd U.S. National Congress of Applied Mechanics,
   801-803 (crossflow, both fluids unmixed, exact series).
"""
from __future__ import annotations

import math

import numpy as np

from ._arrays import as_out as _out
from .errors import InputError
# LMTD and the F correction live in thermal_lmtd (with the input checks both use); re-exported here
from .thermal_lmtd import F_1_2N, F_series, _arr, _check_shells, _p_per_shell, lmtd, lmtd_kernel  # noqa: F401

__all__ = [
    "ARRANGEMENTS",
    "F_1_2N",
    "EFFECTIVENESS_ARRANGEMENTS",
    "F_series",
    "effectiveness",
    "effectiveness_kernel",
    "lmtd",
    "lmtd_kernel",
    "max_effectiveness",
    "ntu_from_effectiveness",
    "outlets",
]

#: arrangements with a closed-form inverse (:func:`ntu_from_effectiveness`, :func:`max_effectiveness`)
ARRANGEMENTS = ("counterflow", "parallel", "E")
#: every arrangement :func:`effectiveness` rates: also crossflow (TEMA X) and TEMA J with 1, 2, 4 tube passes
EFFECTIVENESS_ARRANGEMENTS = ARRANGEMENTS + ("crossflow", "J1", "J2", "J4")


def _check_cr(Cr):
    Cr = _arr(Cr, "Cr")
    if np.any((Cr < 0) | (Cr > 1)):
        raise InputError("Cr", Cr, "a heat capacity rate ratio Cmin/Cmax with 0 <= Cr <= 1")
    return Cr


def _check_arrangement(arrangement):
    if arrangement not in ARRANGEMENTS:
        raise InputError("arrangement", arrangement, f"one of {list(ARRANGEMENTS)}")
    return arrangement


# ----------------------------------------------------------------------------------------------- effectiveness
# Unvalidated kernels: arrays in, ``(eps, w)`` out with w = 1 - eps computed without cancellation, so that a close
# temperature approach (eps -> 1) keeps its terminal differences. The public functions validate and call them.
def _eps_counterflow(ntu, cr):
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        em = np.expm1(-ntu * (1.0 - cr))  # e^{-NTU(1-Cr)} - 1
        den = (1.0 - cr) - cr * em
        general = -em / den
        w_general = (1.0 - cr) * (1.0 + em) / den
    one = ntu / (1.0 + ntu)
    w_one = 1.0 / (1.0 + ntu)
    at1 = cr >= 1.0
    return np.where(at1, one, general), np.where(at1, w_one, w_general)


def _eps_parallel(ntu, cr):
    x = ntu * (1.0 + cr)
    return -np.expm1(-x) / (1.0 + cr), (cr + np.exp(-x)) / (1.0 + cr)


def _eps_E(ntu, cr):
    s = np.sqrt(1.0 + cr * cr)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        g = 2.0 / np.expm1(ntu * s)  # coth(NTU s / 2) - 1, small at large NTU
        den = 1.0 + cr + s * (1.0 + g)
        eps = 2.0 / den
        w = (s * g + cr * cr / (s + 1.0) + cr) / den  # (s coth + Cr - 1)/den with s - 1 = Cr²/(s + 1)
    zero = ntu < 1e-150  # 0 there to within 1e-150 (below it the closed form is 0·inf)
    return np.where(zero, 0.0, eps), np.where(zero, 1.0, w)


def _eps_crossflow(ntu, cr):
    """Single-pass crossflow, both fluids unmixed: the exact series of Mason (1954),

    eps = 1/(Cr NTU) sum_{n>=0} Q(n + 1, NTU) Q(n + 1, Cr NTU), with Q(n + 1, x) = P(a Poisson(x) variable > n)
    the regularized lower incomplete gamma function. Terms are summed per case until both tails are negligible.
    """
    from scipy.special import gammainc  # on use (X shells only): `revamp check` never needs scipy.special

    ntu, cr = np.broadcast_arrays(np.asarray(ntu, dtype=float), np.asarray(cr, dtype=float))
    shape = ntu.shape
    n_ = ntu.ravel()
    c_ = cr.ravel()
    y = c_ * n_
    # Both tails are 1 to within e^-72 while n is more than 12 standard deviations below the smaller mean m, and
    # their product is negligible once n is as far above it: those first terms are counted, the rest summed.
    m = np.minimum(n_, y)
    start = np.floor(np.maximum(m - 12.0 * np.sqrt(m) - 40.0, 0.0))
    total = start.copy()
    width = np.ceil(24.0 * np.sqrt(m) + 80.0).astype(int)
    live = np.flatnonzero((y > 0) & (n_ > 0))
    k0 = 0
    while live.size:  # blocks of terms, all live cases at once
        block = int(min(64, width[live].max() - k0))
        k = k0 + np.arange(block)
        a = start[live, None] + (k + 1)
        terms = gammainc(a, n_[live, None]) * gammainc(a, y[live, None])
        total[live] += np.sum(np.where(k < width[live, None], terms, 0.0), axis=1)
        k0 += block
        live = live[width[live] > k0]
    with np.errstate(divide="ignore", invalid="ignore"):
        eps = np.where(y > 0, total / np.where(y > 0, y, 1.0), -np.expm1(-n_))  # Cr = 0: 1 - e^{-NTU}
    eps = np.minimum(eps, 1.0).reshape(shape)
    return eps, 1.0 - eps


def _p1_J1(N, R):
    """P1 of the shell fluid, TEMA J shell with one tube pass (Shah & Sekulić 2003, Table 3.6), overflow-free."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore", under="ignore"):
        Rg = np.where(np.abs(R - 2.0) < 1e-6, 2.0 - 1e-6, R)  # removable 0/0 at R = 2
        lo = Rg < 2.0
        # (2E + R B)/(2E - R/B), E = e^N, B = e^{-NR/2}, divided by its largest term
        num = np.where(lo, 2.0 + Rg * np.exp(-N * (1.0 + Rg / 2.0)), 2.0 * np.exp(N * (1.0 - Rg / 2.0))
                       + Rg * np.exp(-N * Rg))
        den = np.where(lo, 2.0 - Rg * np.exp(-N * (1.0 - Rg / 2.0)), 2.0 * np.exp(N * (1.0 - Rg / 2.0)) - Rg)
        p = (1.0 - (2.0 - Rg) * num / ((2.0 + Rg) * den)) / Rg
    return np.where(R < 1e-8, -np.expm1(-N), p)


def _p1_J2N(N, R, passes):
    """P1 of the shell fluid, TEMA J shell with 2 or 4 tube passes (Shah & Sekulić 2003, Table 3.6)."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore", under="ignore"):
        lam = np.sqrt(1.0 + R * R / (4.0 if passes == 2 else 16.0))
        B = 1.0 + 2.0 / np.expm1(lam * N)  # (A^lam + 1)/(A^lam - 1), A = e^N
        C = np.exp(-(lam - 1.0) * N / 2.0) / ((lam - 1.0) * np.exp(-lam * N) + (1.0 + lam))
        D = 1.0 + lam * np.exp(-(lam + 1.0) * N / 2.0) / -np.expm1(-lam * N)
        if passes == 2:
            first = 1.0 + R / 2.0
        else:
            e = np.exp(-R * N / 2.0)
            first = 1.0 + R / 4.0 * (3.0 + e) / (1.0 + e)  # (R/4)(1 + 3E)/(1 + E), E = e^{RN/2}
        p = 1.0 / (first + lam * B - 2.0 * lam * C * D)
    # below NTU1 ~ 1e-150 the closed form loses itself in 0·inf; P1 = NTU1 there (the first-order term of every
    # arrangement: at vanishing area the whole driving force acts)
    return np.where(N < 1e-150, N, p)


def _eps_J(ntu, cr, shell_min, passes):
    """Effectiveness of a J shell from the shell-fluid P1: eps = P1 C_shell / Cmin."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):  # a vanishing cr: handled below
        crs = np.where(cr > 0, cr, 1.0)
        R1 = np.where(shell_min, cr, 1.0 / crs)  # C_shell / C_tube
        N1 = np.where(shell_min, ntu, ntu * cr)  # UA / C_shell
    p1 = _p1_J1(N1, R1) if passes == 1 else _p1_J2N(N1, R1, passes)
    eps = np.where(shell_min, p1, p1 * R1)
    eps = np.where(cr <= 1e-12, -np.expm1(-ntu), eps)
    return eps, 1.0 - eps


_EPS = {"counterflow": _eps_counterflow, "parallel": _eps_parallel, "E": _eps_E, "crossflow": _eps_crossflow}
_J_PASSES = {"J1": 1, "J2": 2, "J4": 4}


def _series(eps1, w1, cr, n):
    """Effectiveness (and 1 - eps) of n identical units in series, overall counterflow, from the unit's."""
    if n == 1:
        return eps1, w1
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        lny = np.log1p(eps1 * (1.0 - cr) / w1)  # ln[(1 - eps1 Cr)/(1 - eps1)]
        top = np.expm1(n * lny)  # Y^n - 1
        general = np.where(np.isinf(top), 1.0, top / (top + (1.0 - cr)))
        w_general = (1.0 - cr) / (top + (1.0 - cr))
        one = n * eps1 / (1.0 + (n - 1) * eps1)
        w_one = w1 / (1.0 + (n - 1) * eps1)
    saturated = w1 <= 0.0
    general = np.where(saturated, 1.0, general)
    w_general = np.where(saturated, 0.0, w_general)
    at1 = cr >= 1.0
    return np.where(at1, one, general), np.where(at1, w_one, w_general)


def effectiveness_kernel(ntu, cr, arrangement, units=1, shell_is_cmin=True):
    """Effectiveness and its complement ``(eps, 1 - eps)``, without input checks (the rating loop's kernel).

    Arguments as in :func:`effectiveness` (``units`` identical units in series); NTU >= 0 and 0 <= Cr <= 1 are
    the caller's responsibility. ``1 - eps`` is computed directly (not by subtraction), so that the terminal
    temperature differences of a close approach keep their digits.
    """
    if arrangement in _J_PASSES:
        eps1, w1 = _eps_J(ntu / units, cr, shell_is_cmin, _J_PASSES[arrangement])
    else:
        eps1, w1 = _EPS[arrangement](ntu / units, cr)
    return _series(eps1, w1, cr, units)


def effectiveness(NTU, Cr, arrangement="E", shells=1, shell_is_cmin=True):
    """Exchanger effectiveness from NTU.

    - counterflow: eps = (1 - e^{-NTU(1-Cr)})/(1 - Cr e^{-NTU(1-Cr)}); Cr = 1: NTU/(1 + NTU);
    - parallel: eps = (1 - e^{-NTU(1+Cr)})/(1 + Cr);
    - E (1 shell pass, even tube passes): eps1 = 2/{1 + Cr + S (1 + e^{-NTU1 S})/(1 - e^{-NTU1 S})}, S = sqrt(1 + Cr²)
      (Kays & London 1984);
    - crossflow (single pass, both fluids unmixed, the TEMA X shell): the exact series of Mason (1954),
      eps = (1/(Cr NTU)) sum_n [1 - e^{-NTU} sum_{m<=n} NTU^m/m!] [1 - e^{-Cr NTU} sum_{m<=n} (Cr NTU)^m/m!];
    - J1, J2, J4 (TEMA J, divided flow, shell fluid mixed, with 1, 2 and 4 tube passes): the P1-NTU1 relations of
      the shell fluid in Shah & Sekulić (2003), Table 3.6, turned into eps = P1 C_shell / Cmin; they depend on which
      stream is on the shell side (``shell_is_cmin``); with 2 and 4 passes P1 passes a maximum in NTU and falls
      beyond it (a temperature cross in the second pass, Shah & Sekulić 2003 §3.6);
    - N units in series (overall counterflow), NTU1 = NTU/N:
      eps = {[(1 - eps1 Cr)/(1 - eps1)]^N - 1} / {[(1 - eps1 Cr)/(1 - eps1)]^N - Cr}; Cr = 1: N eps1/(1 + (N-1) eps1).

    Cr = 0 gives 1 - e^{-NTU} for every arrangement. The forms are arranged so that no exponential overflows at
    large NTU; eps reaches 1 only where the arrangement's limit is 1.

    Parameters
    ----------
    NTU : float or array_like
        Number of transfer units UA/Cmin of the whole train [-], >= 0.
    Cr : float or array_like
        Cmin/Cmax [-], 0 <= Cr <= 1.
    arrangement : str
        One of :data:`EFFECTIVENESS_ARRANGEMENTS`.
    shells : int
        Identical units in series, >= 1.
    shell_is_cmin : bool or array_like of bool
        Whether the shell-side stream has the smaller heat-capacity rate (J shells only; default True).

    Returns
    -------
    float or numpy.ndarray
        Effectiveness Q/Qmax [-].

    References
    ----------
    Kays, W. M., London, A. L. (1984). Compact Heat Exchangers, 3rd ed., McGraw-Hill.
    Shah, R. K., Sekulić, D. P. (2003). Fundamentals of Heat Exchanger Design, Wiley, Table 3.6.
    Mason, J. L. (1954). Heat transfer in cross flow. Proc. 2nd U.S. National Congress of Applied Mechanics,
    801-803.

    Examples
    --------
    >>> round(effectiveness(1.0, 0.0), 6)   # 1 - e^-1
    0.632121
    >>> effectiveness(1.0, 1.0, "counterflow")
    0.5
    """
    if arrangement not in EFFECTIVENESS_ARRANGEMENTS:
        raise InputError("arrangement", arrangement, f"one of {list(EFFECTIVENESS_ARRANGEMENTS)}")
    shells = _check_shells(shells)
    ntu = _arr(NTU, "NTU")
    if np.any(ntu < 0):
        raise InputError("NTU", ntu, ">= 0")
    cr = _check_cr(Cr)
    smin = np.asarray(shell_is_cmin, dtype=bool)
    ntu, cr, smin = np.broadcast_arrays(ntu, cr, smin)
    eps, _ = effectiveness_kernel(ntu, cr, arrangement, shells, smin)
    return _out(eps)


def max_effectiveness(Cr, arrangement="E", shells=1):
    """The effectiveness reached as NTU -> infinity [-] (Cr [-], arrangement, shells as in :func:`effectiveness`).

    Counterflow: 1. Parallel: 1/(1 + Cr) for one unit. E: 2/(1 + Cr + sqrt(1 + Cr²)) for one shell. N units in
    series: the series formula applied to the one-unit maximum.

    Examples
    --------
    >>> round(max_effectiveness(1.0, "E"), 6)   # 2/(2 + sqrt 2)
    0.585786
    """
    _check_arrangement(arrangement)
    shells = _check_shells(shells)
    cr = _check_cr(Cr)
    if arrangement == "counterflow":
        e1 = np.ones_like(cr)
    elif arrangement == "parallel":
        e1 = 1.0 / (1.0 + cr)
    else:
        e1 = 2.0 / (1.0 + cr + np.sqrt(1.0 + cr * cr))
    return _out(_series(e1, 1.0 - e1, cr, shells)[0])


def _ntu_counterflow(eps, cr):
    with np.errstate(divide="ignore", invalid="ignore"):
        general = np.log1p(eps * (1.0 - cr) / (1.0 - eps)) / np.where(cr >= 1.0, 1.0, 1.0 - cr)
        one = eps / (1.0 - eps)
    return np.where(cr >= 1.0, one, general)


def _ntu_parallel(eps, cr):
    with np.errstate(divide="ignore", invalid="ignore"):
        return -np.log1p(-eps * (1.0 + cr)) / (1.0 + cr)


def _ntu_E(eps, cr):
    s = np.sqrt(1.0 + cr * cr)
    with np.errstate(divide="ignore", invalid="ignore"):
        E = (2.0 / eps - (1.0 + cr)) / s  # = coth(NTU1 s / 2)
        ntu = np.log((E + 1.0) / (E - 1.0)) / s
    return np.where(eps == 0, 0.0, ntu)


_NTU = {"counterflow": _ntu_counterflow, "parallel": _ntu_parallel, "E": _ntu_E}


def ntu_from_effectiveness(eps, Cr, arrangement="E", shells=1):
    """NTU of the whole train from its effectiveness: the inverse of :func:`effectiveness`, in closed form.

    For N shells in series the per-unit effectiveness is recovered first,
    eps1 = (Y - 1)/(Y - Cr), Y = [(1 - eps Cr)/(1 - eps)]^(1/N) (Cr = 1: eps1 = eps/(N - (N - 1) eps)), then
    NTU = N NTU1(eps1). E shell: NTU1 = ln[(E + 1)/(E - 1)]/S with E = (2/eps1 - 1 - Cr)/S, S = sqrt(1 + Cr²).

    Parameters
    ----------
    eps : float or array_like
        Effectiveness [-], 0 <= eps <= 1.
    Cr : float or array_like
        Cmin/Cmax [-], 0 <= Cr <= 1.
    arrangement : str
        "counterflow", "parallel" or "E".
    shells : int
        Identical units in series, >= 1.

    Returns
    -------
    float or numpy.ndarray
        NTU [-]; ``inf`` at exactly the arrangement's maximum effectiveness and NaN beyond it (see
        :func:`max_effectiveness`).

    Examples
    --------
    >>> round(ntu_from_effectiveness(0.5, 1.0, "counterflow"), 12)
    1.0
    """
    _check_arrangement(arrangement)
    shells = _check_shells(shells)
    e = _arr(eps, "effectiveness")
    if np.any((e < 0) | (e > 1)):
        raise InputError("effectiveness", e, "0 <= effectiveness <= 1")
    cr = _check_cr(Cr)
    e, cr = np.broadcast_arrays(e, cr)
    emax = _arr(max_effectiveness(cr, arrangement, shells), "max")
    beyond = e > emax * (1.0 + 1e-12)
    at_max = ~beyond & (e >= emax * (1.0 - 1e-12))
    es = np.where(beyond | at_max, 0.5 * emax, e)
    if shells > 1:
        with np.errstate(divide="ignore", invalid="ignore"):
            lny = np.log1p(es * (1.0 - cr) / (1.0 - es)) / shells
            y1 = np.expm1(lny)  # Y - 1
            general = y1 / (y1 + (1.0 - cr))
            one = es / (shells - (shells - 1) * es)
        e1 = np.where(cr >= 1.0, one, general)
    else:
        e1 = es
    ntu = shells * _NTU[arrangement](e1, cr)
    ntu = np.where(at_max, np.inf, ntu)
    return _out(np.where(beyond, np.nan, ntu))


def outlets(t_hot_in, t_cold_in, C_hot, C_cold, eps):
    """Outlet temperatures and duty from the effectiveness.

    Q = eps Cmin (Th,in - Tc,in); Th,out = Th,in - Q/C_hot; Tc,out = Tc,in + Q/C_cold.

    Parameters
    ----------
    t_hot_in, t_cold_in : float or array_like
        Inlet temperatures [K], t_hot_in >= t_cold_in.
    C_hot, C_cold : float or array_like
        Heat capacity rates m_dot cp [W/K], > 0.
    eps : float or array_like
        Effectiveness [-], 0 <= eps <= 1.

    Returns
    -------
    (t_hot_out, t_cold_out, duty) : tuple
        Outlet temperatures [K] and duty [W].

    Examples
    --------
    >>> outlets(400.0, 300.0, 1000.0, 2000.0, 0.5)
    (350.0, 325.0, 50000.0)
    """
    th = _arr(t_hot_in, "t_hot_in")
    tc = _arr(t_cold_in, "t_cold_in")
    ch = _arr(C_hot, "C_hot")
    cc = _arr(C_cold, "C_cold")
    e = _arr(eps, "effectiveness")
    if np.any(ch <= 0):
        raise InputError("C_hot", ch, "a heat capacity rate > 0 W/K")
    if np.any(cc <= 0):
        raise InputError("C_cold", cc, "a heat capacity rate > 0 W/K")
    if np.any((e < 0) | (e > 1)):
        raise InputError("effectiveness", e, "0 <= effectiveness <= 1")
    if np.any(th < tc):
        raise InputError("t_hot_in", th, "a hot inlet temperature >= the cold inlet temperature")
    q = e * np.minimum(ch, cc) * (th - tc)
    return _out(th - q / ch), _out(tc + q / cc), _out(q)


def effectiveness_float(ntu, cr, arrangement, units=1, shell_is_cmin=True):
    """:func:`effectiveness_kernel` for one case, on Python floats: ``(eps, 1 - eps)``.

    Counterflow and the E shell (one unit or ``units`` in series) are written out in floats, with the same
    cancellation-free forms as the array kernels; the other arrangements call the array kernel. The single-case
    rating iterates on it (the tests check it against the array kernel).
    """
    if arrangement not in ("counterflow", "E"):
        eps, w = effectiveness_kernel(np.array([ntu]), np.array([cr]), arrangement, units, np.array([shell_is_cmin]))
        return float(eps[0]), float(w[0])
    n1 = ntu / units
    if arrangement == "counterflow":
        if cr >= 1.0:
            eps1, w1 = n1 / (1.0 + n1), 1.0 / (1.0 + n1)
        else:
            em = math.expm1(-n1 * (1.0 - cr))
            den = (1.0 - cr) - cr * em
            eps1, w1 = -em / den, (1.0 - cr) * (1.0 + em) / den
    elif n1 < 1e-150:  # as _eps_E
        eps1, w1 = 0.0, 1.0
    else:
        s = math.sqrt(1.0 + cr * cr)
        x = n1 * s
        g = 2.0 / math.expm1(x) if x < 700.0 else 0.0  # coth(NTU s / 2) - 1
        den = 1.0 + cr + s * (1.0 + g)
        eps1, w1 = 2.0 / den, (s * g + cr * cr / (s + 1.0) + cr) / den
    if units == 1:
        return eps1, w1
    if cr >= 1.0:
        return units * eps1 / (1.0 + (units - 1) * eps1), w1 / (1.0 + (units - 1) * eps1)
    if w1 <= 0.0:
        return 1.0, 0.0
    lny = math.log1p(eps1 * (1.0 - cr) / w1)
    top = math.expm1(units * lny) if units * lny < 700.0 else math.inf
    if math.isinf(top):
        return 1.0, 0.0
    return top / (top + (1.0 - cr)), (1.0 - cr) / (top + (1.0 - cr))
