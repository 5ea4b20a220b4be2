"""Taborek's ideal tube-bank fits for the Bell-Delaware method, and the blends across their seams.

The ideal tube-bank Colburn factor j and friction factor f (:func:`ideal_j`, :func:`ideal_f`) by Re band, their
blends across the band edges and across Re = 100 (the laminar/turbulent switch of the corrections), and the fit
evaluations the array kernel and the one-case float path of :mod:`revamp.correlations.shell_bell` call. Moved
verbatim from that module, which re-exports every name here.

References
----------
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. In *Heat Exchanger Design Handbook*, §3.3,
Hemisphere. (Curve fits of the ideal j and f.)
Serth, R. W., Lestina, T. (2014). *Process Heat Transfer*, 2nd ed., Academic Press, ch. 6, Table 6.1 (the same fits).
"""
from __future__ import annotations

import functools
import math

import numpy as np

__all__ = ["TABOREK_FITS", "ideal_j", "ideal_f"]

# Taborek (1983) fits: per layout, coefficients for the Re bands [<10, 10-1e2, 1e2-1e3, 1e3-1e4, 1e4-1e5];
# a3, a4, b3, b4 per layout. The 45° a1 in 10 < Re < 100 is 1.498: some printed copies show 0.498, which breaks
# continuity with both neighbouring bands by a factor of three (checked in the tests).
TABOREK_FITS = {
    30: dict(a1=(1.400, 1.360, 0.593, 0.321, 0.321), a2=(-0.667, -0.657, -0.477, -0.388, -0.388), a3=1.450, a4=0.519,
             b1=(48.0, 45.1, 4.570, 0.486, 0.372), b2=(-1.000, -0.973, -0.476, -0.152, -0.123), b3=7.00, b4=0.500),
    45: dict(a1=(1.550, 1.498, 0.730, 0.370, 0.370), a2=(-0.667, -0.656, -0.500, -0.396, -0.396), a3=1.930, a4=0.500,
             b1=(32.0, 26.2, 3.50, 0.333, 0.303), b2=(-1.000, -0.913, -0.476, -0.136, -0.126), b3=6.59, b4=0.520),
    90: dict(a1=(0.970, 0.900, 0.408, 0.107, 0.370), a2=(-0.667, -0.631, -0.460, -0.266, -0.395), a3=1.187, a4=0.370,
             b1=(35.0, 32.1, 6.09, 0.0815, 0.391), b2=(-1.000, -0.963, -0.602, 0.022, -0.148), b3=6.30, b4=0.378),
}
TABOREK_FITS[60] = TABOREK_FITS[30]  # Taborek: the 60° layout uses the 30° fits
_EDGES = np.array([10.0, 100.0, 1e3, 1e4])
_LAMINAR_RE = 100.0
# Seams. Taborek's method switches abruptly at band edges (the ideal-bank fits, a few per cent apart there) and at
# Re = 100 between its laminar and turbulent constants (Jb, Rb, Js, Rs and the window pressure drop, which can differ
# several-fold there). A rating swept in flow must not see a step, so each switch is replaced by a blend, geometric
# in the blended value with a smoothstep weight in ln Re (value and slope continuous), over a band centred (in ln Re)
# on the published switch point:
# a factor 1.25 either side of each fit edge, a factor 2.5 either side of Re = 100 (40 to 250). Outside these bands
# the published values are used unchanged. The blend and its widths are our choice (no published source). The
# window pressure drop, whose laminar and turbulent forms can differ up to about 7 times at Re = 100, is
# interpolated between its band-end values instead (see _window_dp), which keeps it rising with flow.
_FIT_BLEND = 1.25
_SWITCH_BLEND = 2.5


def _weight(Re, edge, factor):
    """Blend weight of the upper side: 0 below ``edge/factor``, 1 above ``edge*factor``, between a smoothstep
    ``3u² - 2u³`` of u linear in ln Re (so the blended value has a continuous slope too)."""
    u = np.minimum(np.maximum(0.5 + np.log(np.asarray(Re, dtype=float) / edge) / (2.0 * math.log(factor)), 0.0), 1.0)
    return u * u * (3.0 - 2.0 * u)


def _log_blend(lower, upper, w):
    """Geometric blend ``lower^(1-w) upper^w`` of two positive values (w = 0: lower, w = 1: upper)."""
    w = np.asarray(w)
    if np.all(w >= 1.0):  # the common cases: every Re on one side of the band
        return upper + np.zeros_like(w)
    if np.all(w <= 0.0):
        return lower + np.zeros_like(w)
    return np.where(w <= 0.0, lower, np.where(w >= 1.0, upper, lower ** (1.0 - w) * upper ** w))


_LN_EDGES = np.log(_EDGES)
_LN_LAMINAR = math.log(_LAMINAR_RE)
_LN_SWITCH = math.log(_SWITCH_BLEND)
_HALF_BAND = 2.0 * math.log(_FIT_BLEND)


def _fit_scalar(Re, pitch_ratio, c1, c2, c3, c4):
    lr = math.log(Re)
    band = int(np.searchsorted(_EDGES, Re, side="right"))
    core = c1[band] * math.exp(c2[band] * lr)
    edge = min(max(int(round(lr / math.log(10.0))) - 1, 0), len(_EDGES) - 1)
    u = 0.5 + (lr - _LN_EDGES[edge]) / _HALF_BAND
    if 0.0 < u < 1.0:
        w = u * u * (3.0 - 2.0 * u)
        ln_lower = math.log(c1[edge]) + c2[edge] * lr
        ln_upper = math.log(c1[edge + 1]) + c2[edge + 1] * lr
        core = math.exp((1.0 - w) * ln_lower + w * ln_upper)
    return core * (1.33 / pitch_ratio) ** (c3 / (1.0 + 0.14 * Re ** c4))


def _fit(Re, pitch_ratio, layout, kind):
    c = TABOREK_FITS[int(layout)]
    k1, k2, k3, k4 = ("a1", "a2", "a3", "a4") if kind == "j" else ("b1", "b2", "b3", "b4")
    Re = np.asarray(Re, dtype=float)
    if Re.ndim == 0:  # the same formulas on Python floats (a scalar rating calls this in its loop)
        return _fit_scalar(float(Re), pitch_ratio, c[k1], c[k2], c[k3], c[k4])
    c1, c2 = np.asarray(c[k1]), np.asarray(c[k2])
    lr = np.log(Re)
    band = np.searchsorted(_EDGES, Re, side="right")
    core = c1[band] * np.exp(c2[band] * lr)
    # near an edge, blend with the neighbouring band's fit (see _FIT_BLEND); the edges are a decade apart, so at
    # most one (the nearest in log) is near
    edge = np.clip(np.rint(lr / math.log(10.0)) - 1, 0, len(_EDGES) - 1).astype(int)
    u = 0.5 + (lr - _LN_EDGES[edge]) / _HALF_BAND
    near = (u > 0.0) & (u < 1.0)
    if np.any(near):
        uc = np.clip(u, 0.0, 1.0)  # the weight outside the band is never used: clipped, it cannot overflow exp
        w = uc * uc * (3.0 - 2.0 * uc)
        ln_lower = np.log(c1[edge]) + c2[edge] * lr
        ln_upper = np.log(c1[edge + 1]) + c2[edge + 1] * lr
        core = np.where(near, np.exp((1.0 - w) * ln_lower + w * ln_upper), core)
    expo = c[k3] / (1.0 + 0.14 * Re ** c[k4])
    out = core * (1.33 / pitch_ratio) ** expo
    return float(out) if out.ndim == 0 else out


@functools.lru_cache(maxsize=16)
def _fit_coefficients(layout, kind):
    """Taborek's coefficients of one fit as arrays: ``(ln c1, c2, c3, c4)`` per band."""
    c = TABOREK_FITS[layout]
    k1, k2, k3, k4 = ("a1", "a2", "a3", "a4") if kind == "j" else ("b1", "b2", "b3", "b4")
    return np.log(np.asarray(c[k1], dtype=float)), np.asarray(c[k2], dtype=float), float(c[k3]), float(c[k4])


def _band_away_from_edges(lo, hi):
    """The band of :func:`_fit_ln` shared by every ``ln Re`` in ``[lo, hi]`` when none of them lies in an edge's
    blend (then the band's own fit applies to all), else None. The bands are monotonic in ln Re and the blends are
    disjoint intervals around the edges: two ends in one band, each outside a blend, leave every value between them
    in that band and outside every blend (NaN: None)."""
    bands, near = [], False
    for lr in (lo, hi):
        if not math.isfinite(lr):
            return None
        t = lr * (1.0 / math.log(10.0))
        bands.append(int(min(max(t, 0.0), 4.0)))
        edge = int(min(max(float(np.rint(t)) - 1.0, 0.0), len(_EDGES) - 1.0))
        u = 0.5 + (lr - float(_LN_EDGES[edge])) / _HALF_BAND
        near = near or 0.0 < u < 1.0
    return bands[0] if bands[0] == bands[1] and not near else None


def _fit_ln(lr, ln_ratio, fits):
    """The logarithms of ideal-bank fits (:func:`_fit`) from ``lr = ln Re`` and ``ln_ratio = ln(1.33/(Pt/do))``:
    ``ln c1 + c2 ln Re + a ln_ratio`` with ``a = c3 / (1 + 0.14 Re^c4)``, blended across the band edges as
    :func:`_fit` (one exponential left to the caller instead of three powers). ``fits`` is a tuple of
    :func:`_fit_coefficients` (j and f share the band lookup); returns one array per fit.

    The band is ``floor(log10 Re)`` (0 to 4), which can differ from the comparison with the edges only within
    rounding of an edge, where the blend replaces the band's value anyway."""
    shape = np.shape(lr)
    lr = np.reshape(lr, -1)
    if lr.size:  # every case in one band and away from its edges (the usual sweep): one band's constants
        b = _band_away_from_edges(float(lr.min()), float(lr.max()))
        if b is not None:
            return [(ln_c1[b] + c2[b] * lr + c3 / (1.0 + 0.14 * np.exp(c4 * lr)) * ln_ratio).reshape(shape)
                    for ln_c1, c2, c3, c4 in fits]
    t = lr * (1.0 / math.log(10.0))
    band = np.fmin(np.fmax(t, 0.0), 4.0).astype(np.intp)  # floor for t >= 0 (fmax/fmin: NaN gives band 0)
    edge = np.fmin(np.fmax(np.rint(t) - 1.0, 0.0), len(_EDGES) - 1.0).astype(np.intp)
    u = 0.5 + (lr - _LN_EDGES.take(edge)) / _HALF_BAND
    near = np.flatnonzero((u > 0.0) & (u < 1.0))
    if near.size:
        un, en, ln_ = u[near], edge[near], lr[near]
        w = un * un * (3.0 - 2.0 * un)
    out = []
    for ln_c1, c2, c3, c4 in fits:
        ln_core = ln_c1.take(band) + c2.take(band) * lr
        if near.size:
            ln_core[near] = ((1.0 - w) * (ln_c1.take(en) + c2.take(en) * ln_)
                             + w * (ln_c1.take(en + 1) + c2.take(en + 1) * ln_))
        out.append((ln_core + c3 / (1.0 + 0.14 * np.exp(c4 * lr)) * ln_ratio).reshape(shape))
    return out


def ideal_j(Re, pitch_ratio, layout):
    """Ideal tube-bank Colburn factor j_i (Taborek's fit) [-].

    ``j = a1 (1.33/(Pt/do))^a Re^a2`` with ``a = a3 / (1 + 0.14 Re^a4)``; within a factor 1.25 of a band edge
    (Re = 10, 100, 1e3, 1e4) the two bands' values are blended geometrically (smoothstep weight in ln Re), so that j is
    continuous with a continuous slope (the fits differ by up to a few per cent at the edges).

    Parameters
    ----------
    Re : float or array_like
        Shell-side Reynolds number do·(m/Sm)/μ [-].
    pitch_ratio : float
        Tube pitch over tube outside diameter Pt/do [-].
    layout : int
        30, 45, 60 or 90 [deg] (60 uses the 30° fits).

    Returns
    -------
    float or ndarray
        j_i [-].

    References
    ----------
    Taborek (1983), HEDH §3.3; Serth & Lestina (2014) Table 6.1. Fitted for about 1 < Re < 1e5.

    Examples
    --------
    At Re = 2e4, Pt/do = 1.25, 90° (by hand: a = 1.187/(1 + 0.14·2e4^0.37) = 0.18363,
    j = 0.370·(1.33/1.25)^0.18363·2e4^-0.395 = 0.0074859):

    >>> round(ideal_j(2e4, 1.25, 90), 7)
    0.0074859
    """
    return _fit(Re, pitch_ratio, layout, "j")


def ideal_f(Re, pitch_ratio, layout):
    """Ideal tube-bank friction factor f_i (Taborek's fit) [-].

    ``f = b1 (1.33/(Pt/do))^b Re^b2`` with ``b = b3 / (1 + 0.14 Re^b4)``; used as Δp = 2 f Nc (m/Sm)²/ρ.
    Blended across the band edges as :func:`ideal_j`.

    Parameters
    ----------
    Re : float or array_like
        Shell-side Reynolds number [-].
    pitch_ratio : float
        Pt/do [-].
    layout : int
        30, 45, 60 or 90 [deg].

    Returns
    -------
    float or ndarray
        f_i [-].

    References
    ----------
    Taborek (1983), HEDH §3.3; Serth & Lestina (2014) Table 6.1.
    """
    return _fit(Re, pitch_ratio, layout, "f")


def _fit_ln_float(Re, lr, ln_ratio, coefs):
    """:func:`_fit_ln` for one case, on Python floats (the same formulas)."""
    ln_c1, c2, c3, c4 = coefs
    band = 0 if Re < 10.0 else 1 if Re < 100.0 else 2 if Re < 1e3 else 3 if Re < 1e4 else 4
    ln_core = float(ln_c1[band]) + float(c2[band]) * lr
    edge = min(max(round(lr / math.log(10.0)) - 1, 0), len(_EDGES) - 1)
    u = 0.5 + (lr - float(_LN_EDGES[edge])) / _HALF_BAND
    if 0.0 < u < 1.0:
        w = u * u * (3.0 - 2.0 * u)
        ln_core = ((1.0 - w) * (float(ln_c1[edge]) + float(c2[edge]) * lr)
                   + w * (float(ln_c1[edge + 1]) + float(c2[edge + 1]) * lr))
    return ln_core + c3 / (1.0 + 0.14 * math.exp(c4 * lr)) * ln_ratio
