"""Readers of the sections of a ``kind: condenser`` unit-file entry (quantities, condensing curve file, vapour,
geometry, coolant, options, plant data), each appending its problems with their paths (layer 8).

Moved here from :mod:`revamp.unitfile._condenser` (which assembles the entry from them and re-exports them).
"""
from __future__ import annotations

import numpy as np

from ..errors import InputError
from ._aircooler import (_FIN, _GEOMETRY as _AIR_GEOMETRY, _columns_missing, _guard, _mapping, _plant_columns_given,
                         _plant_dialect, _plant_file, _plant_head, _quantity_problems, _unknown)
from ._condenser_spec import (_AIR_OPTIONS, _COOLANT, _COOLANT_CHANGE, _PLANT, _PLANT_AIR, _ST_OPTIONS,
                              AIR_CONDENSER_PLANT_COLUMNS, AIR_FLOW_FROM, CONDENSER_PLANT_COLUMNS, CONDENSING_FROM,
                              CURVE_COLUMNS, DUTY_FROM, SPECIFIC_ENERGY, CondenserPlantData)
from ._model import Problem
from ._reading import _show

#: quantity fields checked one by one before the constructors run: section -> field -> (kind, lower bound, strict)
_QUANTITIES = {
    "vapour": {"pressure": ("pressure", 0.0, True), "flow": ("mass_flow", 0.0, True),
               "quality": ("dimensionless", 0.0, False), "superheat": ("temperature_difference", 0.0, False),
               "fouling": ("fouling", 0.0, False), "dp_allowed": ("pressure", 0.0, True),
               "critical_pressure": ("pressure", 0.0, True)},
    "coolant": {"flow": ("mass_flow", 0.0, True), "t_in": ("temperature", 0.0, True),
                "fouling": ("fouling", 0.0, False), "dp_allowed": ("pressure", 0.0, True)},
    "revamp": {"vapour_load": ("mass_flow", 0.0, True), "throughput": ("dimensionless", 0.0, True)},
    "allowed": {"pressure": ("pressure", 0.0, True), "temperature": ("temperature", 0.0, True)},
}


def _quantities(section: dict, name: str, where: str, problems: list) -> dict:
    """Every quantity of ``section`` in SI (fields with problems left out, their problems appended)."""
    return _quantity_problems(section, name, where, problems, table=_QUANTITIES)


def _read_curve(file: str, units: dict, where: str, base, problems: list):
    """A condensing-curve table file (CSV) as the columns :func:`revamp.fluids.condensing_curve` takes (SI)."""
    import pandas as pd

    from ..units import to_si
    from ._building import _safe_file

    full, reason = _safe_file(file, base) if base is not None else (None, "must be read from a unit file")
    if reason:
        problems.append(Problem(f"{where}.curve", file, reason))
        return None
    try:
        frame = pd.read_csv(full, encoding="utf-8-sig")
    except Exception as exc:  # unreadable: one line naming the file
        problems.append(Problem(f"{where}.curve", file, f"must be a readable CSV file ({exc.__class__.__name__})"))
        return None
    table = {}
    for col in frame.columns:
        kind = CURVE_COLUMNS.get(col)
        unit = (units or {}).get(col)
        values = pd.to_numeric(frame[col], errors="coerce").to_numpy(float)
        if not np.all(np.isfinite(values)):
            problems.append(Problem(f"{where}.curve", file, f"must hold numbers only (column {col!r} has others)"))
            return None
        if kind is None and unit is not None:
            problems.append(Problem(f"{where}.curve_units.{col}", unit, "must not be given: the column is read in "
                                                                        "SI (or is not a curve column)"))
            return None
        if unit is None or kind is None:
            table[col] = values
            continue
        try:
            if kind == "specific_energy":
                if unit not in SPECIFIC_ENERGY:
                    raise InputError(col, unit, f"one of {', '.join(SPECIFIC_ENERGY)}")
                table[col] = values * SPECIFIC_ENERGY[unit]
            elif kind == "temperature":
                table[col] = np.array([to_si(f"{v} {unit}", kind, col) for v in values])
            else:
                table[col] = values * to_si(f"1 {unit}", kind, col)
        except InputError as exc:
            problems.append(Problem(f"{where}.curve_units.{col}", unit, f"must be {exc.allowed}"))
            return None
    return table


def _vapour_fluid(v: dict, q: dict, where: str, base, problems: list):
    """The condensing fluid of the ``vapour`` section (None with problems)."""
    from .. import fluids

    given = [k for k in ("fluid", "mixture", "curve") if k in v]
    if len(given) != 1:
        problems.append(Problem(where, ", ".join(given) or "(none)",
                                "must name the vapour one way: fluid (a pure fluid), mixture (CoolProp) or curve "
                                "(a condensing-curve CSV file)"))
        return None
    if "pressure" not in q:
        return None
    p = q["pressure"]
    if "condensate" in v and "curve" not in v:
        problems.append(Problem(f"{where}.condensate", _show(v["condensate"]), "must be given only with a curve (a "
                                "pure fluid's or a mixture's condensate comes from CoolProp)"))
        return None
    if "fluid" in v:
        name = v["fluid"]
        if not isinstance(name, str) or not name.strip():
            problems.append(Problem(f"{where}.fluid", _show(name), "must be a pure fluid's name (CoolProp)"))
            return None
        if any(c in name for c in "&[]|:"):
            problems.append(Problem(f"{where}.fluid", name, "must be one pure substance (a mixture goes under "
                                                            "'mixture', e.g. HEOS::n-Pentane[0.6]&n-Hexane[0.4])"))
            return None
        make = (lambda: fluids.water(p)) if name.strip().lower() == "water" else (lambda: fluids.pure(name, p))
        return _guard(problems, where, make, rename=lambda f: "fluid" if f.split(".")[-1] in ("name", "fluid") else f)
    if "mixture" in v:
        return _guard(problems, where, lambda: fluids.condensing_curve(mixture=v["mixture"], pressure=p),
                      rename=lambda f: "mixture" if f.startswith(("condensing_curve", "mixture", "table")) else f)
    if not isinstance(v["curve"], str):
        problems.append(Problem(f"{where}.curve", _show(v["curve"]), "must be the path of a CSV file"))
        return None
    units = v.get("curve_units") or {}
    if not isinstance(units, dict):
        problems.append(Problem(f"{where}.curve_units", _show(units), "must map a column to its unit"))
        return None
    _unknown(units, set(CURVE_COLUMNS), f"{where}.curve_units", problems)
    table = _read_curve(v["curve"], units, where, base, problems)
    if table is None:
        return None
    kw = {"critical_pressure": q["critical_pressure"]} if "critical_pressure" in q else {}
    if "condensate" in v:  # the subcooled condensate below the curve's bubble point (the curve's rows end there)
        from ._building import _build_fluid

        spec = v["condensate"]
        if not isinstance(spec, dict) or "kind" not in spec:
            problems.append(Problem(f"{where}.condensate", _show(spec), "must be a fluid mapping with a 'kind'"))
            return None
        kind = str(spec["kind"])
        kw["liquid"] = _guard(problems, f"{where}.condensate", lambda: _build_fluid(dict(spec)),
                              rename=lambda f: f[len(kind) + 1:] if f.startswith(kind + ".") else f)
        if kw["liquid"] is None:
            return None
    return _guard(problems, where, lambda: fluids.condensing_curve(table=table, pressure=p, name=str(v["curve"]),
                                                                   **kw),
                  rename=lambda f: "curve" if f.startswith(("table", "condensing_curve")) else f)


def _vapour_stream(v: dict, q: dict, fluid, where: str, problems: list):
    """Today's condensing stream: saturated at ``quality`` (default 1) or superheated by ``superheat``."""
    from .. import fluids
    from ..service import Stream

    if "quality" in v and "superheat" in v:
        problems.append(Problem(f"{where}.superheat", _show(v["superheat"]),
                                "must not be given with quality (a saturated inlet has no superheat)"))
        return None
    if "quality" in q and q["quality"] > 1.0:
        problems.append(Problem(f"{where}.quality", _show(v["quality"]), "must be between 0 and 1"))
        return None
    if fluid is None or "flow" not in q:
        return None
    if "superheat" in q and q["superheat"] > 0:
        curve = fluid if hasattr(fluid, "t_dew") else _guard(problems, where, lambda: fluids.condensing(fluid))
        if curve is None:
            return None
        return _guard(problems, where, lambda: Stream(fluid, q["flow"], t_in=float(curve.t_dew) + q["superheat"],
                                                      phase="vapour"))
    return _guard(problems, where, lambda: Stream(fluid, q["flow"], quality=q.get("quality", 1.0)))


def _shell_and_tube(geo: dict, tag, where: str, problems: list):
    from .. import geometry
    from ._reading import schema

    allowed = set(schema()["$defs"]["geometry"]["properties"])
    before = len(problems)
    _unknown(geo, allowed, where, problems)
    from ._building import _tema_to_shell_type

    g = _tema_to_shell_type(geo, where, problems)
    if len(problems) > before:
        return None
    return _guard(problems, where, lambda: geometry.ShellAndTube(**g, tag=str(tag)))


def _air_cooler(geo: dict, tag, where: str, problems: list):
    from .. import aircooler
    before = len(problems)
    _unknown(geo, _AIR_GEOMETRY, where, problems)
    _quantity_problems(geo, "geometry", where, problems)
    fin_spec = _mapping(geo, "fin", where, problems)
    fin = None
    if fin_spec is not None:
        _unknown(fin_spec, _FIN, f"{where}.fin", problems)
        fin = _guard(problems, f"{where}.fin", lambda: aircooler.Fin(**fin_spec),
                     rename=lambda f: f[4:] if f.startswith("fin.") else f)
    if fin is None or len(problems) > before:
        return None
    kw = {k: v for k, v in geo.items() if k != "fin"}
    return _guard(problems, where, lambda: aircooler.AirCooler(**kw, fin=fin, name=str(tag)))


def _coolant_stream(c: dict, where: str, problems: list):
    from ..service import Stream
    from ._building import _build_fluid

    before = len(problems)
    _unknown(c, _COOLANT, where, problems)
    _quantities(c, "coolant", where, problems)
    spec = c.get("fluid")
    fluid = None
    if not isinstance(spec, dict) or "kind" not in spec:
        problems.append(Problem(f"{where}.fluid", _show(spec), "must be a fluid mapping with a 'kind'"))
    else:
        kind = str(spec["kind"])
        fluid = _guard(problems, f"{where}.fluid", lambda: _build_fluid(dict(spec)),
                       rename=lambda f: f[len(kind) + 1:] if f.startswith(kind + ".") else f)
    for key in ("flow", "t_in"):
        if key not in c:
            problems.append(Problem(f"{where}.{key}", "(missing)", "must be given"))
    if fluid is None or len(problems) > before:
        return None
    return _guard(problems, where, lambda: Stream(fluid, c["flow"], c["t_in"]))


def _options(specs, exchanger, svc, is_air: bool, coolant_side: str, pre: str, problems: list) -> list:
    from .. import options as options_mod
    from .. import options_air, options_condenser
    from ._building import _build_option

    if specs is None:
        return []
    if not isinstance(specs, list):
        problems.append(Problem(f"{pre}.options", _show(specs), "must be a list of options"))
        return []
    allowed = ({"coolant_change"} | (set(_AIR_OPTIONS) | {"twisted_tape", "wire_coil"} if is_air
                                     else set(_ST_OPTIONS)))
    out, labels = [], {}
    for j, spec in enumerate(specs):
        where = f"{pre}.options[{j}]"
        kind = spec.get("type") if isinstance(spec, dict) else None
        if kind not in allowed:
            problems.append(Problem(f"{where}.type", _show(kind if isinstance(spec, dict) else spec),
                                    f"must be one of {', '.join(sorted(allowed))} (for a condenser "
                                    f"{'air cooler' if is_air else 'shell and tube'})"))
            continue
        params = {k: v for k, v in spec.items() if k not in ("type", "capex", "note")}
        if kind == "coolant_change":
            _unknown({k: v for k, v in params.items() if k != "label"}, _COOLANT_CHANGE, where, problems)
            opt = _guard(problems, where, lambda: options_condenser.CoolantChange(**params),
                         rename=lambda f: f.split(".", 1)[-1] if f.startswith("CoolantChange") else f)
        elif kind in _AIR_OPTIONS:
            cls_name, fields = _AIR_OPTIONS[kind]
            _unknown({k: v for k, v in params.items() if k != "label"}, fields, where, problems)
            opt = _guard(problems, where, lambda: getattr(options_air, cls_name)(**params),
                         rename=lambda f: f.split(".", 1)[-1])
        elif is_air:  # inserts in an air cooler's tubes: where the vapour condenses, refused below
            cls = getattr(options_mod, {"twisted_tape": "TwistedTape", "wire_coil": "WireCoil"}[kind])
            opt = _guard(problems, where, lambda: cls(**params), rename=lambda f: f.split(".", 1)[-1])
        else:
            opt = _guard(problems, where, lambda: _build_option(dict(spec)), rename=lambda f: f.split(".", 1)[-1])
        if opt is None:
            continue
        label = str(getattr(opt, "label", None) or f"{kind} {j + 1}")
        if label in labels or label.strip().lower() in ("base", "today", "revamp"):
            problems.append(Problem(f"{where}.label" if "label" in spec else where, label,
                                    "must be a label of its own (not repeated, not base, today or revamp)"))
            continue
        if kind in ("twisted_tape", "wire_coil") and coolant_side != "tube":
            problems.append(Problem(f"{where}.type", kind, "must not be a tube insert where the vapour condenses in "
                                                           "the tubes (the condensing correlations have no insert "
                                                           "form): inserts go on a tube-side coolant"))
            continue
        if exchanger is not None and svc is not None:  # apply once (no rating): what the study would refuse
            if _guard(problems, where, lambda: opt.apply(exchanger, svc), rename=lambda f: f.split(".", 1)[-1]) \
                    is None:
                continue
        labels[label] = j
        out.append(opt)
    return out


def _plant_data(pd_spec: dict, where: str, base, problems: list, is_air: bool = False):
    """Check and build a condenser's ``plant_data`` section (None with problems, appended)."""
    from ..units import to_si

    start = len(problems)
    _unknown(pd_spec, _PLANT | _PLANT_AIR if is_air else _PLANT, where, problems)
    known = AIR_CONDENSER_PLANT_COLUMNS if is_air else CONDENSER_PLANT_COLUMNS
    found = _plant_file(pd_spec, where, base, problems)
    if found is None:
        return None
    file, full = found
    source = pd_spec.get("condensing_from", "pressure")
    if source not in CONDENSING_FROM:
        problems.append(Problem(f"{where}.condensing_from", _show(source),
                                f"must be one of {', '.join(CONDENSING_FROM)}"))
        return None
    dialect = _plant_dialect(pd_spec, where, problems)
    given = _plant_columns_given(pd_spec, known, where, problems)
    duty_from = air_from = None
    if is_air:
        duty_from, air_from = pd_spec.get("duty_from", "condensate"), pd_spec.get("air_flow_from", "stated")
        for key, value, allowed in (("duty_from", duty_from, DUTY_FROM), ("air_flow_from", air_from, AIR_FLOW_FROM)):
            if value not in allowed:
                problems.append(Problem(f"{where}.{key}", _show(value), f"must be one of {', '.join(allowed)}"))
        if len(problems) > start:
            return None
        need = ["timestamp", "air_t_in", CONDENSING_FROM[source]] + [
            c for c in (DUTY_FROM[duty_from], AIR_FLOW_FROM[air_from]) if c]
    else:
        need = ["timestamp", "coolant_flow", "coolant_t_in", "coolant_t_out", CONDENSING_FROM[source]]
    if "condensate_t" in given:  # optional: the condensate outlet (read from the file by its standard name too)
        need.append("condensate_t")
    columns = {}
    for std in need:
        spec = given.get(std, std)
        if isinstance(spec, str):
            name, unit = spec, None
        elif isinstance(spec, dict) and isinstance(spec.get("column"), str):
            name, unit = spec["column"], spec.get("unit")
            kind = known[std]
            if unit is not None and kind is not None:
                try:
                    to_si(f"1 {unit}", kind, "unit")
                except InputError as exc:
                    problems.append(Problem(f"{where}.columns.{std}.unit", _show(unit), f"must be {exc.allowed}"))
        else:
            problems.append(Problem(f"{where}.columns.{std}", _show(spec), "must be a column name or {column, unit}"))
            continue
        columns[std] = (name, unit)
    unc = pd_spec.get("uncertainty") or {}
    uncertainty = {}
    if not isinstance(unc, dict):
        problems.append(Problem(f"{where}.uncertainty", _show(unc), "must be a mapping of flow, temperature, "
                                                                    "pressure"))
        unc = {}
    _unknown(unc, {"flow", "temperature", "pressure"} | ({"air_flow"} if is_air else set()), f"{where}.uncertainty",
             problems)
    for key, kind, hi in (("flow", "dimensionless", 1.0), ("temperature", "temperature_difference", 50.0),
                          ("pressure", "dimensionless", 1.0), ("air_flow", "dimensionless", 1.0)):
        if key in unc:
            try:
                v = to_si(unc[key], kind, key)
            except InputError as exc:
                problems.append(Problem(f"{where}.uncertainty.{key}", _show(unc[key]), f"must be {exc.allowed}"))
                continue
            if not (isinstance(v, float) and 0.0 <= v < hi):
                problems.append(Problem(f"{where}.uncertainty.{key}", _show(unc[key]), f"must be >= 0 and < {hi:g}"))
            else:
                uncertainty[key] = v
    steady = pd_spec.get("steady")
    if steady is not None and not isinstance(steady, (bool, dict)):
        problems.append(Problem(f"{where}.steady", _show(steady), "must be true, false or a mapping of window, "
                                                                  "flow_rsd, t_range, min_rows"))
    elif isinstance(steady, dict):
        _unknown(steady, {"window", "flow_rsd", "t_range", "min_rows"}, f"{where}.steady", problems)
    if len(problems) > start:
        return None
    head = _plant_head(full, file, dialect, where, problems)
    if head is None:
        return None
    header, lines = head
    if _columns_missing(pd_spec, file, header, lines, columns, dialect, where, problems):
        return None
    return CondenserPlantData(file=full, columns=columns, condensing_from=source, uncertainty=uncertainty,
                              steady=steady, dialect=dialect, duty_from=duty_from, air_flow_from=air_from)
