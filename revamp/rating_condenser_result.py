"""What a condenser rating returns: :class:`CondenserRating`, with its zones and increments tables.

:func:`revamp.rating_condenser.rate_condenser` hands its per-increment arrays to :func:`_result`, which sums them into
the duty, outlets, area-weighted coefficients and resistances, builds the zones and increments tables and adds the
rating's cautions. :mod:`revamp.rating_condenser` re-exports :class:`CondenserRating`.

References
----------
Serth, R. W., Lestina, T. G. (2014). *Process Heat Transfer: Principles and Applications*, 2nd ed., Academic Press,
ch. 11 (condensers: zone and incremental analysis).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ._arrays import as_out
from .rating_condenser_path import ZONES
from .rating_result import ResultFrames

__all__ = ["CondenserRating"]


_FIELDS = {
    "duty": ("W", "heat duty"),
    "t_out_condensing": ("K", "condensing-stream outlet temperature"),
    "quality_out": ("-", "condensing-stream outlet vapour fraction"),
    "t_out_coolant": ("K", "coolant outlet temperature"),
    "U_service": ("W/m²K", "overall coefficient in service (area-weighted resistance)"),
    "U_clean": ("W/m²K", "overall coefficient clean (area-weighted resistance)"),
    "dp_condensing": ("Pa", "condensing-side pressure drop"),
    "dp_coolant": ("Pa", "coolant-side pressure drop"),
    "dt_sat_drop": ("K", "saturation-temperature drop caused by the condensing-side pressure drop"),
    "condensed": ("kg/s", "vapour condensed"),
}


@dataclass(frozen=True)
class CondenserRating(ResultFrames):
    """The result of rating a condenser. SI; arrays of the service's broadcast shape for sweeps.

    Attributes
    ----------
    duty : heat duty [W]
    condensing_side, coolant_side : the side names (``"shell"``/``"tube"``, or ``"tube"``/``"air"``)
    t_out_condensing, quality_out : outlet temperature [K] and vapour fraction [-] of the condensing stream (1.0
        while the outlet is still in the desuperheating zone, 0.0 once subcooled)
    t_out_coolant : coolant outlet temperature [K] (air: mixed outlet)
    t_out_shell, t_out_tube, t_out_air : the same outlets under the side names (None for a side the kind lacks)
    quality_out_shell, quality_out_tube : the outlet vapour fraction under the condensing side's name (None on the
        other side)
    U_service, U_clean : the reciprocal of the area-weighted mean total resistance, in service and clean [W/m²K] on
        the exchanger's area basis (the layers of :attr:`resistances` sum to ``1/U_service``)
    dp_condensing, dp_coolant : pressure drops [Pa] (also as ``dp_<side>``)
    dt_sat_drop : drop of the saturation temperature between inlet and outlet caused by the condensing-side pressure
        drop [K]
    condensed : vapour condensed [kg/s]
    area : the exchanger's area (the basis of U) [m²]
    zones : DataFrame, one row per zone (and case): ``case``, ``zone``, ``duty`` [W], ``area`` [m²] (whole exchanger),
        ``area_share`` [-], ``U`` [W/m²K] (area-weighted within the zone), ``t_in``/``t_out`` of the condensing
        stream and ``t_coolant_in``/``t_coolant_out`` [K], ``x_in``/``x_out`` [-], ``dp`` [Pa], ``F`` [-] (the
        zone's tube-pass correction, :func:`zone_F`; 1 where none applies)
    increments : DataFrame, one row per increment: the local state (``x``, ``T``, ``T_coolant``, ``h_condensing``,
        ``h_coolant``, ``U``, ``dT``, ``duty`` and ``area`` (whole exchanger), ``length`` (along one tube path),
        ``dp``, ``G``, the phase properties) for checks and plots
    resistances : Series (one case) or DataFrame of the model's layers [m²K/W], area-weighted means
    layers : the layer names (from the exchanger's model)
    warnings : tuple of str, each film's prefixed with the film and side (in those, "cases" count the increments
        along the path where the film is used)
    exchanger, service : the inputs
    """

    duty: object
    t_out_condensing: object
    quality_out: object
    t_out_coolant: object
    U_service: object
    U_clean: object
    dp_condensing: object
    dp_coolant: object
    dt_sat_drop: object
    condensed: object
    area: float
    condensing_side: str
    coolant_side: str
    zones: object = field(repr=False)
    increments: object = field(repr=False)
    resistances: object = field(repr=False)
    layers: tuple = ()
    t_out_shell: object = None
    t_out_tube: object = None
    t_out_air: object = None
    quality_out_shell: object = None
    quality_out_tube: object = None
    dp_shell: object = None
    dp_tube: object = None
    dp_air: object = None
    warnings: tuple = ()
    exchanger: object = field(default=None, repr=False)
    service: object = field(default=None, repr=False)

    _FRAME_FIELDS = tuple(_FIELDS)


def _zone_frames(d, n, shape, c_side, k_side):
    """The zones (one row per zone reached, per case) and the increments (one row per increment with duty)."""
    dA, dQ, U = d["dA"], d["dQ"], d["U"]
    Th, Tc = d["Th"], d["Tc"]
    case = np.broadcast_to(np.arange(n)[:, None, None], dA.shape)
    zone = np.broadcast_to(np.arange(3)[None, :, None], dA.shape)
    inc = pd.DataFrame({
        "case": case.ravel(), "zone": np.asarray(ZONES)[zone.ravel()], "x": d["x"].ravel(),
        "T": d["thm"].ravel(), "T_coolant": d["tcm"].ravel(), "h_condensing": d["h_c"].ravel(),
        "h_coolant": d["h_k"].ravel(), "h_film": np.where(zone.ravel() == 1, d["h_film"].ravel(), np.nan),
        "dT_film": np.where(zone.ravel() == 1, d["dtf"].ravel(), np.nan), "Z": d["Z"].ravel(),
        "u_vapour": d["u_v"].ravel(), "U": U.ravel(), "dT": (d["thm"] - d["tcm"]).ravel(), "duty": dQ.ravel(),
        "area": dA.ravel(), "length": d["length"].ravel(), "dp": d["dp"].ravel(), "G": d["G"].ravel(),
        "rho_l": d["rho_l"].ravel(), "rho_v": d["rho_v"].ravel(), "mu_l": d["mu_l"].ravel(),
        "mu_v": d["mu_v"].ravel(), "k_l": d["k_l"].ravel(), "cp_l": d["cp_l"].ravel()})
    inc = inc[inc["duty"] > 0].reset_index(drop=True)
    area_tot = dA.sum(axis=(1, 2))
    with np.errstate(invalid="ignore", divide="ignore"):
        rows = _zone_rows(dA, dQ, U, Th, Tc, d, n, area_tot)
    zones = pd.DataFrame(rows, columns=["case", "zone", "duty", "area", "area_share", "U", "t_in", "t_out",
                                        "t_coolant_in", "t_coolant_out", "x_in", "x_out", "dp", "F"])
    return zones, inc


def _zone_rows(dA, dQ, U, Th, Tc, d, n, area_tot):
    rows = []
    x_nodes = d["x_nodes"]
    for i in range(n):
        for z, name in enumerate(ZONES):
            q = float(dQ[i, z].sum())
            if q <= 0:
                continue
            a = float(dA[i, z].sum())
            rows.append(dict(case=i, zone=name, duty=q, area=a, area_share=a / area_tot[i],
                             U=float((U[i, z] * dA[i, z]).sum() / a) if a > 0 else np.nan,
                             t_in=float(Th[i, z, 0]), t_out=float(Th[i, z, -1]), t_coolant_in=float(Tc[i, z, -1]),
                             t_coolant_out=float(Tc[i, z, 0]), x_in=float(x_nodes[i, z, 0]),
                             x_out=float(x_nodes[i, z, -1]), dp=float(d["dp"][i, z].sum()),
                             F=float(d["F"][i, z])))
    return rows


def _result(exchanger, service, model, curve, path, d, s_out, m_h, m_c, tc_in, cp_c, n_par, shape, n, c_side,
            k_side, dp_total, dt_drop, air, warnings, coolant_props, x_in, hot):
    s1, s2 = path.bounds
    valid = hot
    q = m_h * d["E_out"]
    Th_out = d["Th"][:, 2, -1]  # the last node of the last zone reached is s_out (zones past it collapse there)
    x_out = path.x_at(s_out)
    if air:
        t_guess = tc_in + q / (m_c * np.asarray(coolant_props(tc_in).heat_capacity, dtype=float))
        cpa = np.asarray(coolant_props(0.5 * (tc_in + t_guess)).heat_capacity, dtype=float)
        tc_out = tc_in + q / (m_c * cpa)
    else:
        tc_out = tc_in + q / (m_c * cp_c)
    fk = model.film(k_side, m_c, coolant_props(0.5 * (tc_in + tc_out)))
    dp_k = np.asarray(fk.dp, dtype=float) * np.ones(n)
    x_in = 1.0 if x_in is None else x_in
    dA = d["dA"]
    A = dA.sum(axis=(1, 2))
    with np.errstate(divide="ignore", invalid="ignore"):
        R_mean = [np.where(A > 0, (r * dA).sum(axis=(1, 2)) / A, np.nan) for r in d["R"]]
    layers = tuple(model.layers)
    R_tot = sum(R_mean)
    R_clean = sum(r for r, name in zip(R_mean, layers) if "fouling" not in name)
    fields = dict(duty=q * n_par, t_out_condensing=Th_out, quality_out=x_out, t_out_coolant=tc_out,
                  U_service=1.0 / R_tot, U_clean=1.0 / R_clean, dp_condensing=dp_total, dp_coolant=dp_k,
                  dt_sat_drop=dt_drop, condensed=m_h * n_par * np.maximum(x_in - x_out, 0.0))
    for key, value in fields.items():
        value = np.where(valid | (key in ("duty", "condensed")), np.broadcast_to(value, (n,)), np.nan)
        fields[key] = as_out(value.reshape(shape))
    if shape == ():
        resistances = pd.Series([float(r[0]) for r in R_mean], index=pd.Index(layers), name="resistance [m²K/W]")
    else:
        resistances = pd.DataFrame({name: r for name, r in zip(layers, R_mean)})
    zones, inc = _zone_frames(d, n, shape, c_side, k_side)
    for frame in (zones, inc):  # the whole exchanger: every parallel unit alike
        frame["duty"] *= n_par
        frame["area"] *= n_par
    warnings = list(warnings) + list(d["warnings"])
    arr_name = None if air else tuple(getattr(model, "arrangement", ("counterflow", 1)))[0]
    if not air and arr_name not in ("counterflow", "E") and (
            s1 > 0 or np.any(s_out > s2) or float(curve.t_dew) - float(curve.t_bubble) > 0.5):
        warnings.append(f"zones: the coolant is taken in counterflow with the condensing stream (no zone correction "
                        f"for the {arr_name} arrangement); this is optimistic where the condensing temperature "
                        "changes (desuperheating, subcooling, a mixture's glide)")
    if not air and c_side == "shell" and np.any(s_out > s2):
        warnings.append("subcooling zone: the condensate is taken to flow over the bundle as a single-phase "
                        "liquid at the shell-side flow areas (no flooded zone modelled); screening only")
    if np.any(~valid):
        warnings.append(f"{int(np.sum(~valid))} case(s) without a result (NaN): a coolant not colder than the "
                        "condensing inlet, or a pressure drop near choking")
    warnings.append("screening-level rating: mechanical design, vibration, venting of non-condensables and code "
                    "compliance must be verified by licensed engineers")
    side_fields = {f"t_out_{c_side}": fields["t_out_condensing"], f"t_out_{k_side}": fields["t_out_coolant"],
                   f"quality_out_{c_side}": fields["quality_out"], f"dp_{c_side}": fields["dp_condensing"],
                   f"dp_{k_side}": fields["dp_coolant"]}
    return CondenserRating(**fields, area=float(model.area), condensing_side=c_side, coolant_side=k_side,
                           zones=zones, increments=inc, resistances=resistances, layers=layers,
                           warnings=tuple(dict.fromkeys(warnings)), exchanger=exchanger, service=service,
                           **side_fields)
