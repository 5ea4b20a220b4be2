"""Builders of condensing streams: the pure-fluid curve (CoolProp saturation), a CoolProp mixture's curve and a
user's table curve, each a :class:`~revamp.fluids.condensing.CondensingFluid`.

Moved here from :mod:`revamp.fluids.condensing` (which keeps the curve itself and re-exports :func:`condensing` and
:func:`condensing_curve`); the sources, approximations and references are described there.

References
----------
Bell, I.H., Wronski, J., Quoilin, S., Lemort, V. (2014), "Pure and pseudo-pure fluid thermophysical property
evaluation and the open-source thermophysical property library CoolProp", Ind. Eng. Chem. Res. 53(6):2498-2508.
Kunz, O., Wagner, W. (2012), "The GERG-2008 wide-range equation of state for natural gases and other mixtures",
J. Chem. Eng. Data 57(11):3032-3091.
Kay, W.B. (1936), "Density of hydrocarbon gases and vapors at high temperature and pressure", Ind. Eng. Chem.
28(9):1014-1019.
"""
from __future__ import annotations

import re

import numpy as np

from ..errors import InputError
from ..units import require, to_si, ureg
from .coolprop_liquid import CoolPropLiquid, _coolprop
from .table import constant, table
from .condensing import (MIXTURE_POINTS, SUBCOOL_SPAN, SUPERHEAT_SPAN, CondensingFluid, _Enthalpy)

__all__ = ["condensing", "condensing_curve"]

# ------------------------------------------------------------------------------------------------ builders
def _freeze(*arrays):
    for a in arrays:
        a.setflags(write=False)


def _vapour_table(CP, fluid_names, fractions, p, t_dew, label):
    """Superheated vapour properties from the dew point up by SUPERHEAT_SPAN, as a TableFluid."""
    AS = CP.AbstractState("HEOS", "&".join(fluid_names))
    if len(fluid_names) > 1:
        AS.set_mole_fractions(list(fractions))
    t_top = t_dew + SUPERHEAT_SPAN
    try:
        t_top = min(t_top, 0.98 * AS.Tmax())
    except ValueError:
        pass
    T = np.linspace(t_dew, t_top, 31)
    rows = []
    for j, t in enumerate(T):
        if j == 0:
            AS.update(CP.PQ_INPUTS, p, 1.0)
        else:
            AS.specify_phase(CP.iphase_gas)
            AS.update(CP.PT_INPUTS, p, float(t))
            AS.unspecify_phase()
        rows.append((AS.rhomass(), AS.cpmass(), AS.viscosity(), AS.conductivity(), AS.hmass()))
    r = np.array(rows).T
    if not np.isfinite(r).all():
        raise InputError("pressure", f"{p:.6g} Pa", f"a pressure at which CoolProp gives the superheated vapour "
                         f"properties of {label} above its dew point {t_dew:.2f} K")
    enthalpy = _Enthalpy(T, r[4], r[1])
    _freeze(T, r)
    return table(T=T, density=r[0], heat_capacity=r[1], viscosity=r[2], conductivity=r[3],
                 name=f"{label} vapour at {p:.6g} Pa"), enthalpy


def _pure_liquid_enthalpy(CP, name, p, t_low, t_sat):
    """CoolProp enthalpy and heat capacity of the subcooled liquid on 31 nodes up to saturation."""
    T = np.linspace(max(t_low, t_sat - SUBCOOL_SPAN - 70.0), t_sat, 31)
    h = np.empty_like(T)
    cp = np.empty_like(T)
    h[:-1] = CP.PropsSI("H", "T", T[:-1], "P", np.full(T.size - 1, p), name)
    cp[:-1] = CP.PropsSI("C", "T", T[:-1], "P", np.full(T.size - 1, p), name)
    h[-1] = CP.PropsSI("H", "P", p, "Q", 0.0, name)
    cp[-1] = CP.PropsSI("C", "P", p, "Q", 0.0, name)
    _freeze(T, h, cp)
    return _Enthalpy(T, h, cp)


def condensing(fluid) -> CondensingFluid:
    """The condensing curve of a pure fluid at the pressure of its liquid provider (CoolProp saturation).

    Parameters
    ----------
    fluid : CoolPropLiquid
        From :func:`~revamp.fluids.pure` or :func:`~revamp.fluids.water` (name and pressure).

    Returns
    -------
    CondensingFluid
        Isothermal at the saturation temperature; ``latent`` = h_fg; the equilibrium phases are CoolProp's
        saturated liquid and vapour; the vapour provider is a superheated-vapour table (31 points over 150 K above
        the dew point, linear); ``liquid`` is ``fluid`` itself.

    Raises
    ------
    InputError
        For anything but a CoolProp liquid (field ``"fluid"``).

    Examples
    --------
    >>> from revamp.fluids import pure
    >>> c = condensing(pure("n-Pentane", "3 bar"))
    >>> round(c.t_dew - 273.15, 1), round(c.latent / 1e3)   # saturation [degC], h_fg [kJ/kg]
    (72.1, 326)
    """
    if not isinstance(fluid, CoolPropLiquid):
        raise InputError("fluid", getattr(fluid, "name", fluid), "a CoolProp liquid from fluids.pure(name, "
                         "pressure) or fluids.water(pressure); a mixture's curve comes from fluids.condensing_curve")
    CP = _coolprop()
    name, p = fluid.fluid, fluid.pressure
    keys = ("D", "C", "V", "L")
    liq = np.array([CP.PropsSI(k, "P", p, "Q", 0.0, name) for k in keys])
    vap = np.array([CP.PropsSI(k, "P", p, "Q", 1.0, name) for k in keys])
    h_fg = float(CP.PropsSI("H", "P", p, "Q", 1.0, name) - CP.PropsSI("H", "P", p, "Q", 0.0, name))
    t_sat = float(CP.PropsSI("T", "P", p, "Q", 1.0, name))
    try:
        sigma = float(CP.PropsSI("I", "P", p, "Q", 0.0, name))
    except ValueError:
        sigma = float("nan")
    n = 11
    q = np.linspace(0.0, h_fg, n)
    T = np.full(n, t_sat)
    x = 1.0 - q / h_fg
    x[-1] = 0.0
    sat_l = np.repeat(liq[:, None], n, axis=1)
    sat_v = np.repeat(vap[:, None], n, axis=1)
    sig = np.full(n, sigma)
    _freeze(q, T, x, sat_l, sat_v, sig)
    vapour, h_vap = _vapour_table(CP, [name], [1.0], p, t_sat, name)
    return CondensingFluid(
        name=f"{name} condensing at {p:.6g} Pa", pressure=p, q=q, T=T, x=x, liquid=fluid,
        vapour=vapour, t_dew=t_sat, t_bubble=t_sat, latent=h_fg,
        pure_name=name, critical_pressure=float(CP.PropsSI("pcrit", name)), mixture=None,
        source=f"CoolProp saturation of {name} at {p:.6g} Pa", sat_liquid=sat_l, sat_vapour=sat_v, sigma=sig,
        vapour_enthalpy=h_vap, liquid_enthalpy=_pure_liquid_enthalpy(CP, name, p, fluid.t_min, t_sat))


# ------------------------------------------------------------------------------------------------ mixtures
_COMPONENT = re.compile(r"^\s*([^\[\]&]+?)\s*\[\s*([0-9.eE+-]+)\s*\]\s*$")


def _parse_mixture(spec):
    fieldname = "condensing_curve.mixture"
    allowed = "a CoolProp HEOS mixture with mole fractions, e.g. 'HEOS::Pentane[0.6]&Hexane[0.4]'"
    if not isinstance(spec, str) or "&" not in spec:
        raise InputError(fieldname, spec, allowed)
    body = spec.strip()
    if "::" in body:
        backend, body = body.split("::", 1)
        if backend.strip().upper() != "HEOS":
            raise InputError(fieldname, spec, allowed + " (the HEOS backend only)")
    CP = _coolprop()
    names, fracs = [], []
    for part in body.split("&"):
        m = _COMPONENT.match(part)
        if not m:
            raise InputError(fieldname, spec, allowed + f" ({part!r} is not 'Name[fraction]')")
        try:
            frac = float(m.group(2))
        except ValueError:
            raise InputError(fieldname, spec, allowed) from None
        try:
            canonical = CP.get_fluid_param_string(m.group(1), "name")
        except ValueError:
            raise InputError(fieldname, spec, f"{allowed}; {m.group(1)!r} is not a CoolProp fluid name") from None
        names.append(canonical)
        fracs.append(frac)
    fr = np.array(fracs)
    if not (np.all(fr > 0.0) and abs(fr.sum() - 1.0) < 1e-6):
        raise InputError(fieldname, spec, "mole fractions > 0 that sum to 1")
    if len(set(names)) != len(names):
        raise InputError(fieldname, spec, "each component once")
    return names, fr


def _mixture_curve(spec, p, name):
    CP = _coolprop()
    names, z = _parse_mixture(spec)
    molar = np.array([CP.PropsSI("M", n) for n in names])
    try:
        AS = CP.AbstractState("HEOS", "&".join(names))
        AS.set_mole_fractions(list(z))
        AS.update(CP.PQ_INPUTS, p, 1.0)
        AS.update(CP.PQ_INPUTS, p, 0.0)
    except ValueError as exc:
        raise InputError("condensing_curve.pressure", f"{p:.6g} Pa", f"a pressure at which CoolProp finds the dew "
                         f"and bubble points of {spec} (below its critical point; {str(exc)[:80]})") from None
    Q = np.linspace(1.0, 0.0, MIXTURE_POINTS)
    T = np.empty_like(Q)
    h = np.empty_like(Q)
    x = np.empty_like(Q)
    sat_l = np.empty((4, Q.size))
    sat_v = np.empty((4, Q.size))
    sig = np.empty(Q.size)
    phase_state = CP.AbstractState("HEOS", "&".join(names))
    pure_states = [CP.AbstractState("HEOS", n) for n in names]
    for j, qv in enumerate(Q):
        try:
            AS.update(CP.PQ_INPUTS, p, float(qv))
            T[j], h[j] = AS.T(), AS.hmass()
            xl = np.array(AS.mole_fractions_liquid())
            yv = np.array(AS.mole_fractions_vapor())
            m_l, m_v = float(xl @ molar), float(yv @ molar)
            x[j] = qv * m_v / (qv * m_v + (1.0 - qv) * m_l)  # molar vapour fraction -> mass fraction
            for comp, phase, dt, out in ((xl, CP.iphase_liquid, -1e-3, sat_l), (yv, CP.iphase_gas, 1e-3, sat_v)):
                phase_state.set_mole_fractions(list(comp))
                phase_state.specify_phase(phase)
                phase_state.update(CP.PT_INPUTS, p, T[j] + dt)
                phase_state.unspecify_phase()
                out[:, j] = (phase_state.rhomass(), phase_state.cpmass(), phase_state.viscosity(),
                             phase_state.conductivity())
        except ValueError as exc:
            raise InputError("condensing_curve.pressure", f"{p:.6g} Pa", f"a pressure at which CoolProp can flash "
                             f"{spec} from dew to bubble point (well below its critical point; {str(exc)[:80]})") \
                from None
        s = []
        for st in pure_states:
            try:
                st.update(CP.QT_INPUTS, 0.0, float(T[j]))
                s.append(st.surface_tension())
            except ValueError:
                s.append(np.nan)
        sig[j] = float(xl @ np.array(s))
    x[0], x[-1] = 1.0, 0.0
    q = h[0] - h
    q[0] = 0.0
    if not (np.all(np.diff(q) > 0) and np.all(np.diff(T) <= 0)):
        raise InputError("condensing_curve.mixture", spec, f"a mixture whose curve at {p:.6g} Pa releases heat and "
                         f"cools monotonically from dew to bubble point (CoolProp's flash did not)")
    if not (np.isfinite(sat_l).all() and np.isfinite(sat_v).all()):
        j = int(np.flatnonzero(~(np.isfinite(sat_l).all(axis=0) & np.isfinite(sat_v).all(axis=0)))[0])
        raise InputError("condensing_curve.mixture", spec, f"a mixture with CoolProp transport properties for both "
                         f"phases from dew to bubble point (none at {T[j]:.2f} K, vapour fraction {x[j]:.3g}; a "
                         f"mixture with non-condensables that never condenses fully is not supported)")
    # subcooled condensate (feed composition) below the bubble point
    liq_state = CP.AbstractState("HEOS", "&".join(names))
    liq_state.set_mole_fractions(list(z))
    t_b = float(T[-1])
    Tl = np.linspace(t_b - SUBCOOL_SPAN, t_b, 33)
    rows = []
    for j, t in enumerate(Tl):
        if j == Tl.size - 1:
            rows.append((*sat_l[:, -1], h[-1]))
            continue
        liq_state.specify_phase(CP.iphase_liquid)
        try:
            liq_state.update(CP.PT_INPUTS, p, float(t))
            rows.append((liq_state.rhomass(), liq_state.cpmass(), liq_state.viscosity(), liq_state.conductivity(),
                         liq_state.hmass()))
        except ValueError:
            rows.append((np.nan,) * 5)
        liq_state.unspecify_phase()
    r = np.array(rows, dtype=float).T
    ok = np.isfinite(r).all(axis=0)
    label = name or spec.split("::")[-1]
    liquid = table(T=Tl[ok], density=r[0, ok], heat_capacity=r[1, ok], viscosity=r[2, ok], conductivity=r[3, ok],
                   name=f"{label} condensate at {p:.6g} Pa")
    h_liq = _Enthalpy(np.ascontiguousarray(Tl[ok]), np.ascontiguousarray(r[4, ok]), np.ascontiguousarray(r[1, ok]))
    vapour, h_vap = _vapour_table(CP, names, z, p, float(T[0]), label)
    pc = float(z @ np.array([CP.PropsSI("pcrit", n) for n in names]))  # Kay's rule (mole fractions)
    _freeze(q, T, x, sat_l, sat_v, sig)
    return CondensingFluid(
        name=f"{label} at {p:.6g} Pa", pressure=p, q=q, T=T, x=x, liquid=liquid, vapour=vapour,
        t_dew=float(T[0]), t_bubble=t_b, latent=float(q[-1]), pure_name=None, critical_pressure=pc, mixture=spec,
        source=f"CoolProp HEOS mixture {spec} at {p:.6g} Pa ({MIXTURE_POINTS} points; critical pressure by Kay's "
               f"rule; surface tension the mole-fraction average of the components')",
        sat_liquid=sat_l, sat_vapour=sat_v, sigma=sig, vapour_enthalpy=h_vap, liquid_enthalpy=h_liq)


# ---------------------------------------------------------------------------------------------------- tables
_PROP_COLUMNS = (("density", "density"), ("heat_capacity", "heat_capacity"), ("viscosity", "viscosity"),
                 ("conductivity", "conductivity"))


def _specific_energy(values, fieldname):
    out = []
    for j, v in enumerate(values):
        f = f"{fieldname}[{j}]"
        if isinstance(v, str):
            try:
                out.append(float(ureg.Quantity(v.strip()).to("joule/kilogram").magnitude))
            except Exception:
                raise InputError(f, v, "a heat per unit mass (J/kg, or e.g. '350 kJ/kg', '150 BTU/lb')") from None
        else:
            out.append(float(to_si(v, "dimensionless", f)))
    return np.array(out, dtype=float)


def _table_columns(tab):
    if hasattr(tab, "columns") and hasattr(tab, "to_dict"):  # a pandas DataFrame
        return {str(k): list(tab[k]) for k in tab.columns}
    if isinstance(tab, dict):
        return {str(k): (list(v) if np.ndim(v) else v) for k, v in tab.items()}
    raise InputError("condensing_curve.table", type(tab).__name__, "a mapping (dict or DataFrame) of columns: "
                     "temperature, heat_released (or enthalpy), vapour_fraction, and optionally liquid_* / vapour_* "
                     "properties and surface_tension")


def _table_curve(tab, p, liquid, vapour, name, critical_pressure, surface_tension):
    f = "condensing_curve.table"
    cols = _table_columns(tab)
    known = {"temperature", "heat_released", "enthalpy", "vapour_fraction", "surface_tension"}
    known |= {f"{ph}_{k}" for ph in ("liquid", "vapour") for k, _ in _PROP_COLUMNS}
    for k in cols:
        if k not in known:
            raise InputError(f"{f}.{k}", "(column)", f"one of {sorted(known)}")
    for k in ("temperature", "vapour_fraction"):
        if k not in cols:
            raise InputError(f"{f}.{k}", None, "a column (list of values, one per point)")
    if ("heat_released" in cols) == ("enthalpy" in cols):
        raise InputError(f"{f}.heat_released", None, "one column, heat_released (from the dew point) or enthalpy")
    n = len(cols["temperature"])
    if n < 2:
        raise InputError(f"{f}.temperature", cols["temperature"], "at least 2 points")
    for k, v in cols.items():
        if np.ndim(v) == 0 or len(v) != n:
            raise InputError(f"{f}.{k}", v, f"{n} values, one per point")
    T = np.array([to_si(v, "temperature", f"{f}.temperature[{j}]") for j, v in enumerate(cols["temperature"])])
    x = np.array([to_si(v, "dimensionless", f"{f}.vapour_fraction[{j}]")
                  for j, v in enumerate(cols["vapour_fraction"])])
    if "heat_released" in cols:
        q = _specific_energy(cols["heat_released"], f"{f}.heat_released")
    else:
        hcol = _specific_energy(cols["enthalpy"], f"{f}.enthalpy")
        q = hcol.max() - hcol
    order = np.argsort(q, kind="stable")
    q, T, x = q[order], T[order], x[order]
    qname = "heat_released" if "heat_released" in cols else "enthalpy"
    if not np.all(np.diff(q) > 0):
        raise InputError(f"{f}.{qname}", cols[qname], "distinct values, one per point")
    if q[0] != 0.0:
        if "heat_released" in cols:
            raise InputError(f"{f}.heat_released", cols["heat_released"], "0 at the dew point (heat released from "
                             "the dew point)")
    if not (np.all(T > 0) and np.all(np.diff(T) <= 0)):
        raise InputError(f"{f}.temperature", cols["temperature"], "temperatures > 0 K that do not rise as heat is "
                         "released")
    if not (abs(x[0] - 1.0) < 1e-6 and abs(x[-1]) < 1e-6 and np.all(np.diff(x) <= 0) and np.all((x >= 0) & (x <= 1))):
        raise InputError(f"{f}.vapour_fraction", cols["vapour_fraction"], "vapour mass fractions from 1 at the dew "
                         "point down to 0 at the bubble point, never rising")
    x = np.clip(x, 0.0, 1.0)
    x[0], x[-1] = 1.0, 0.0
    isothermal = T[0] - T[-1] <= 1e-9 * T[0]

    def phase(ph, given):
        have = [f"{ph}_{k}" in cols for k, _ in _PROP_COLUMNS]
        if any(have) and not all(have):
            missing = [f"{ph}_{k}" for (k, _), h in zip(_PROP_COLUMNS, have) if not h]
            raise InputError(f"{f}.{missing[0]}", None, f"all four {ph} property columns, or none")
        if all(have):
            arr = np.array([[to_si(v, kind, f"{f}.{ph}_{k}[{j}]") for j, v in enumerate(cols[f"{ph}_{k}"])]
                            for k, kind in _PROP_COLUMNS])[:, order]
            if not (arr > 0).all():
                raise InputError(f"{f}.{ph}_density", None, f"positive {ph} properties")
            if given is None:
                if isothermal:
                    given = constant(*arr.mean(axis=1), name=f"{name} {ph}")
                else:
                    rev = slice(None, None, -1)  # ascending temperature for the table
                    Tu, idx = np.unique(T[rev], return_index=True)
                    a = arr[:, rev][:, idx]
                    given = (table(T=Tu, density=a[0], heat_capacity=a[1], viscosity=a[2], conductivity=a[3],
                                   name=f"{name} {ph}") if Tu.size >= 2 else constant(*arr.mean(axis=1)))
            return arr, given
        if given is None:
            raise InputError(f"condensing_curve.{ph}", None, f"a {ph} property provider (a Fluid with props(T)) "
                             f"or the four {ph}_* columns in the table")
        if not hasattr(given, "props"):
            raise InputError(f"condensing_curve.{ph}", given, "an object with props(T) -> Props (e.g. fluids.table)")
        pr = given.props(np.array(T, dtype=float))
        arr = np.array([pr.density, pr.heat_capacity, pr.viscosity, pr.conductivity], dtype=float)
        return arr, given

    sat_l, liquid = phase("liquid", liquid)
    sat_v, vapour = phase("vapour", vapour)
    for nm, prov in (("liquid", liquid), ("vapour", vapour)):
        if nm == "liquid" and not all(hasattr(prov, a) for a in ("t_min", "t_max", "check")):
            raise InputError("condensing_curve.liquid", prov, "a Fluid (name, t_min, t_max, props, check)")
    if "surface_tension" in cols:
        sig = np.array([to_si(v, "dimensionless", f"{f}.surface_tension[{j}]")
                        for j, v in enumerate(cols["surface_tension"])])[order]
    elif surface_tension is not None:
        sig = np.full(n, float(to_si(surface_tension, "dimensionless", "condensing_curve.surface_tension")))
    else:
        sig = np.full(n, np.nan)
    if np.any(sig[np.isfinite(sig)] <= 0):
        raise InputError("condensing_curve.surface_tension", surface_tension, "a positive surface tension [N/m]")
    pc = float("nan")
    if critical_pressure is not None:
        pc = float(to_si(critical_pressure, "pressure", "condensing_curve.critical_pressure"))
        require(pc, "condensing_curve.critical_pressure", gt=p, what=f"a critical pressure above {p:.6g} Pa [Pa]")
    _freeze(q, T, x, sat_l, sat_v, sig)
    return CondensingFluid(
        name=f"{name} at {p:.6g} Pa", pressure=p, q=q, T=T, x=x, liquid=liquid, vapour=vapour, t_dew=float(T[0]),
        t_bubble=float(T[-1]), latent=float(q[-1]), pure_name=None, critical_pressure=pc, mixture=None,
        source=f"user condensing curve ({n} points) at {p:.6g} Pa", sat_liquid=sat_l, sat_vapour=sat_v, sigma=sig)


def condensing_curve(table=None, *, mixture=None, pressure=None, liquid=None, vapour=None, name=None,
                     critical_pressure=None, surface_tension=None) -> CondensingFluid:
    """A condensing stream from a user's condensing curve or from a CoolProp mixture.

    Parameters
    ----------
    table : dict or pandas.DataFrame, optional
        Columns, one value per point (SI numbers or strings with units): ``temperature`` [K];
        ``heat_released`` from the dew point [J/kg] (0 at the dew point) or ``enthalpy`` [J/kg] (falling as the
        vapour condenses); ``vapour_fraction`` (mass) from 1 to 0. Optional: ``liquid_density``,
        ``liquid_heat_capacity``, ``liquid_viscosity``, ``liquid_conductivity`` (all four) for the condensate in
        equilibrium at each point, likewise ``vapour_*`` for the vapour, ``surface_tension`` [N/m].
    mixture : str, optional
        Instead of a table: a CoolProp HEOS mixture with mole fractions, e.g.
        ``"HEOS::Pentane[0.6]&Hexane[0.4]"``.
    pressure : float or str
        Condensing pressure [Pa] (required).
    liquid : Fluid, optional
        Condensate liquid provider (subcooling zone); with a table and no ``liquid_*`` columns it also gives the
        film properties at the curve temperatures. Built from the ``liquid_*`` columns when omitted.
    vapour : object with props(T), optional
        Vapour provider (desuperheating zone); as ``liquid``.
    name : str, optional
        A printable name.
    critical_pressure : float or str, optional
        Critical (or pseudo-critical) pressure [Pa] of a table's fluid, for Shah's reduced pressure; NaN when
        omitted (tube-side Shah then refuses it).
    surface_tension : float, optional
        A constant surface tension [N/m] when the table has no column (Friedel's pressure drop needs it).

    Returns
    -------
    CondensingFluid

    Raises
    ------
    InputError
        Naming the column or argument: both or neither of table and mixture, a curve that is not monotone, missing
        property providers, a mixture CoolProp cannot flash at ``pressure``.

    Examples
    --------
    >>> c = condensing_curve(mixture="HEOS::Pentane[0.6]&Hexane[0.4]", pressure="3 bar")
    >>> round(c.t_dew - 273.15, 1), round(c.t_bubble - 273.15, 1)   # dew and bubble points [degC]
    (90.0, 83.1)
    """
    if (table is None) == (mixture is None):
        raise InputError("condensing_curve", "table" if table is not None else None,
                         "exactly one of table= (a condensing curve) or mixture= (a CoolProp mixture)")
    if pressure is None:
        raise InputError("condensing_curve.pressure", None, "the condensing pressure (e.g. '3 bar')")
    p = float(to_si(pressure, "pressure", "condensing_curve.pressure"))
    require(p, "condensing_curve.pressure", gt=0.0, what="a pressure [Pa]")
    if mixture is not None:
        if liquid is not None or vapour is not None:
            raise InputError("condensing_curve.liquid", "given", "no liquid/vapour providers with mixture= "
                             "(CoolProp gives both phases)")
        return _mixture_curve(mixture, p, name)
    return _table_curve(table, p, liquid, vapour, str(name or "condensing curve"), critical_pressure,
                        surface_tension)

