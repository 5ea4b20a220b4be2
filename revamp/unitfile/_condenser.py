"""Unit-file entries of ``kind: condenser``: checked and built into a :class:`CondenserCase` (layer 8).

An entry as written in the unit file (YAML already read; values as the user wrote them, with their units)::

    - tag: C-401
      kind: condenser
      description: splitter overhead condenser
      exchanger: shell and tube          # or: air cooler (then air_side instead of coolant, vapour in the tubes)
      condensing_side: shell             # shell-and-tube only: where the vapour condenses (default shell)
      geometry: {shell_id: 0.84 m, ...}  # the geometry of a shell-and-tube (or air-cooler) entry
      vapour:
        fluid: n-Pentane                 # a pure fluid (CoolProp name); or mixture: "HEOS::Pentane[0.6]&Hexane[0.4]"
        pressure: 2.6 bar                # or curve: overhead_curve.csv (a condensing-curve table, see the docs)
        quality: 1.0                     # or superheat: 5 K
        flow: 12 kg/s
        fouling: 0.0001 m**2*K/W
      coolant: {fluid: {kind: water, pressure: 4 bar}, flow: 90 kg/s, t_in: 30 degC, fouling: 0.0003 m**2*K/W}
      revamp: {vapour_load: 15 kg/s}     # or throughput: 1.25 (a factor on today's vapour flow)
      allowed: {pressure: 2.9 bar}       # the highest condensing pressure the column may run at (or temperature)
      options: [{type: add_shells, n: 1}, {type: coolant_change, flow_ratio: 1.3}]
      plant_data: {file: plant/C-401.csv, condensing_from: pressure}

:func:`build_condenser` returns the case or ``None`` and appends every problem with its path (as
:func:`revamp.unitfile.check` does for the other kinds). :data:`CONDENSER_SCHEMA` describes the entry for
``unit_schema.json``. The entry's vocabulary, schema and result types live in :mod:`revamp.unitfile._condenser_spec`,
the section readers in :mod:`revamp.unitfile._condenser_sections`; their names are re-exported here.
"""
from __future__ import annotations

import numpy as np

from ._aircooler import _guard, _mapping, _quantity_problems, _unknown
from ._condenser_sections import (  # noqa: F401  (the section readers now live in _condenser_sections)
    _QUANTITIES, _air_cooler, _coolant_stream, _options, _plant_data, _quantities, _read_curve, _shell_and_tube,
    _vapour_fluid, _vapour_stream)
from ._condenser_spec import (  # noqa: F401  (the entry's vocabulary and results now live in _condenser_spec)
    _AIR, _AIR_OPTIONS, _COLUMN, _COOLANT, _COOLANT_CHANGE, _DIALECT, _ENTRY, _PLANT, _PLANT_AIR, _Q, _ST_OPTIONS,
    _VAPOUR, AIR_CONDENSER_PLANT_COLUMNS, AIR_FLOW_FROM, CONDENSER_KIND, CONDENSER_PLANT_COLUMNS, CONDENSER_SCHEMA,
    CONDENSING_FROM, CURVE_COLUMNS, DUTY_FROM, EXCHANGER_TYPES, MAX_THROUGHPUT, SPECIFIC_ENERGY, CondenserCase,
    CondenserPlantData)
from ._model import Problem
from ._reading import _show

__all__ = ["CONDENSER_KIND", "CONDENSER_PLANT_COLUMNS", "CONDENSER_SCHEMA", "CondenserCase", "CondenserPlantData",
           "build_condenser", "condenser_problems"]

def build_condenser(i: int, x: dict, problems: list, base=None) -> CondenserCase | None:
    """Check and build ``exchangers[i]`` of ``kind: condenser``; problems are appended (paths from the file).

    ``base`` is the unit file's folder (for ``vapour.curve`` and ``plant_data.file``)."""
    from ..service import Service
    from ..service_air import AirService
    from ._building import _safe_file

    pre, start = f"exchangers[{i}]", len(problems)
    if not isinstance(x, dict):
        problems.append(Problem(pre, _show(x), "must be a mapping"))
        return None
    _unknown(x, _ENTRY, pre, problems)
    tag = x.get("tag")
    if not isinstance(tag, str) or not tag.strip():
        problems.append(Problem(f"{pre}.tag", _show(tag), "must be a non-empty name"))
    kind = x.get("exchanger", "shell and tube")
    if kind not in EXCHANGER_TYPES:
        problems.append(Problem(f"{pre}.exchanger", _show(kind), f"must be one of {', '.join(EXCHANGER_TYPES)}"))
        return None
    is_air = kind == "air cooler"
    side = x.get("condensing_side", "tube" if is_air else "shell")
    if side not in ("shell", "tube") or (is_air and side != "tube"):
        problems.append(Problem(f"{pre}.condensing_side", _show(side),
                                "must be tube for an air cooler" if is_air else "must be shell or tube"))
        return None
    coolant_side = "air" if is_air else ("tube" if side == "shell" else "shell")
    wrong = "coolant" if is_air else "air_side"
    if wrong in x:
        problems.append(Problem(f"{pre}.{wrong}", "(given)", f"must not be given for a condenser {kind} (it takes "
                                                            f"{'air_side' if is_air else 'coolant'})"))
    geo = _mapping(x, "geometry", pre, problems)
    vap = _mapping(x, "vapour", pre, problems)
    cool = _mapping(x, "air_side" if is_air else "coolant", pre, problems)
    exchanger = None
    if geo is not None:
        exchanger = (_air_cooler if is_air else _shell_and_tube)(geo, tag, f"{pre}.geometry", problems)
    stream = None
    q = {}
    if vap is not None:
        _unknown(vap, _VAPOUR, f"{pre}.vapour", problems)
        before = len(problems)
        q = _quantities(vap, "vapour", f"{pre}.vapour", problems)
        for key in ("pressure", "flow"):
            if key not in vap:
                problems.append(Problem(f"{pre}.vapour.{key}", "(missing)", "must be given"))
        if len(problems) == before:
            fluid = _vapour_fluid(vap, q, f"{pre}.vapour", base, problems)
            stream = _vapour_stream(vap, q, fluid, f"{pre}.vapour", problems)
    svc = None
    if is_air and cool is not None:
        _unknown(cool, _AIR, f"{pre}.air_side", problems)
        before = len(problems)
        from ._aircooler import _quantity_problems as air_quantities

        air_quantities(cool, "air_side", f"{pre}.air_side", problems)
        if stream is not None and len(problems) == before:
            names = {"t_in": "air_in", "flow": "air_flow", "fouling": "fouling_air"}
            back = {v: k for k, v in names.items()}
            kw = {names.get(k, k): v for k, v in cool.items()}
            svc = _guard(problems, pre, lambda: AirService(tube=stream, fouling_tube=q.get("fouling", 0.0), **kw),
                         rename=lambda f: "vapour.fouling" if f == "fouling_tube" else "air_side." + back.get(f, f))
    elif cool is not None:
        coolant = _coolant_stream(cool, f"{pre}.coolant", problems)
        if stream is not None and coolant is not None:
            fouling = {f"fouling_{side}": q.get("fouling", 0.0),
                       f"fouling_{coolant_side}": _quantities(cool, "coolant", "", []).get("fouling", 0.0)}
            svc = _guard(problems, pre, lambda: Service(**{side: stream, coolant_side: coolant}, **fouling),
                         rename=lambda f: {side: "vapour", coolant_side: "coolant"}.get(f.split(".")[0], f))
    if svc is not None:  # the coolant must be colder than the vapour's bubble point to condense anything
        from ..rating_condenser import _curve_of

        t_cool = float(svc.air_in if is_air else getattr(svc, coolant_side).t_in)
        curve = _guard(problems, f"{pre}.vapour", lambda: _curve_of(stream.fluid))
        if curve is not None and t_cool >= float(curve.t_dew):
            where = f"{pre}.air_side.t_in" if is_air else f"{pre}.coolant.t_in"
            problems.append(Problem(where, f"{t_cool - 273.15:.6g} degC", f"must be below the vapour's dew point "
                                    f"({float(curve.t_dew) - 273.15:.6g} degC at its pressure): nothing condenses"))
            svc = None
    rv = _mapping(x, "revamp", pre, problems, required=False)
    load, throughput = None, 1.0
    if rv is not None:
        _unknown(rv, {"vapour_load", "throughput"}, f"{pre}.revamp", problems)
        r = _quantities(rv, "revamp", f"{pre}.revamp", problems)
        if ("vapour_load" in rv) == ("throughput" in rv):
            problems.append(Problem(f"{pre}.revamp", ", ".join(sorted(rv)) or "(empty)",
                                    "must give one of vapour_load (kg/s) or throughput (a factor on today's vapour "
                                    "flow)"))
        elif "throughput" in r and r["throughput"] > MAX_THROUGHPUT:
            problems.append(Problem(f"{pre}.revamp.throughput", _show(rv["throughput"]),
                                    f"must be > 0 and <= {MAX_THROUGHPUT:g}"))
        elif "flow" in q:
            load = r.get("vapour_load", q["flow"] * r.get("throughput", np.nan))
            throughput = load / q["flow"] if np.isfinite(load) else 1.0
            if not np.isfinite(load):
                load = None
    allowed = _mapping(x, "allowed", pre, problems, required=False)
    a = {}
    if allowed is not None:
        _unknown(allowed, {"pressure", "temperature"}, f"{pre}.allowed", problems)
        a = _quantities(allowed, "allowed", f"{pre}.allowed", problems)
        if len(allowed) != 1:
            problems.append(Problem(f"{pre}.allowed", ", ".join(sorted(allowed)) or "(empty)",
                                    "must give one of pressure or temperature (the highest condensing pressure, or "
                                    "dew point, the column may run at)"))
    dp = {}
    if vap is not None and "dp_allowed" in q:
        dp["condensing"] = q["dp_allowed"]
    if cool is not None and not is_air:
        c = _quantities(cool, "coolant", "", [])
        if "dp_allowed" in c:
            dp["coolant"] = c["dp_allowed"]
    revamp_service = None
    if svc is not None and load is not None:
        revamp_service = _guard(problems, f"{pre}.revamp", lambda: svc.replace(
            **{side: getattr(svc, side).replace(flow=load)}))
    opts = _options(x.get("options"), exchanger, revamp_service or svc, is_air, coolant_side, pre, problems)
    plant = None
    pd_spec = _mapping(x, "plant_data", pre, problems, required=False)
    if pd_spec is not None:
        plant = _plant_data(pd_spec, f"{pre}.plant_data", base, problems, is_air=is_air)
    if len(problems) > start or exchanger is None or svc is None:
        return None
    return CondenserCase(tag=tag, description=str(x.get("description", "")), exchanger=exchanger, service=svc,
                         condensing_side=side, coolant_side=coolant_side, options=tuple(opts),
                         revamp_service=revamp_service, vapour_load=load, throughput=throughput,
                         allowed_pressure=a.get("pressure"), allowed_temperature=a.get("temperature"),
                         dp_allowed=dp, plant_data=plant, index=i,
                         curve_file=_safe_file(vap["curve"], base)[0] if "curve" in vap and base is not None else None)


def condenser_problems(i: int, x: dict, base=None) -> list[Problem]:
    """Every problem of ``exchangers[i]`` (a condenser entry); empty when it builds."""
    problems: list[Problem] = []
    build_condenser(i, x, problems, base)
    return problems
