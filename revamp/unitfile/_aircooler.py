"""Unit-file entries of ``kind: air cooler``: checked and built into an :class:`AirCoolerCase` (layer 8).

An entry as written in the unit file (YAML already read; values as the user wrote them, with their units)::

    - tag: AC-101
      kind: air cooler
      geometry:
        bays: 2
        bundles_per_bay: 1
        tube_rows: 4
        tubes_per_row: 46
        tube_passes: 4
        tube_length: 9.14 m
        tube_od: 25.4 mm
        tube_wall: 2.11 mm
        transverse_pitch: 63.5 mm
        row_pitch: 55 mm
        tube_material: carbon steel
        fin: {height: 15.9 mm, thickness: 0.4 mm, per_length: 394 /m, material: aluminium, bond: embedded}
        fans_per_bay: 2
        fan_diameter: 3.66 m
        fan_efficiency: 0.65
        draft: forced
      tube_side: {fluid: {kind: constant, ...}, flow: 25 kg/s, t_in: 150 degC, fouling: 0.0003 m**2*K/W}
      # in a network: tube_side: {stream: diesel, fouling: ...} (fluid, flow and t_in from network.streams.diesel)
      air_side: {t_in: 35 degC, flow: 420 kg/s, altitude: 300 m, fouling: 0.0001 m**2*K/W}   # or face_velocity
      plant_data:                 # the fouling from the tube-side heat balance (revamp.monitoring_air_data)
        file: plant/AC-101.csv
        columns: {tube_t_out: {column: TI-310, unit: degC}, ...}   # timestamp, tube_flow, tube_t_in, tube_t_out,
                                                                   # air_t_in; air_flow or fan_power when used
        air_flow_from: stated     # or measured (an air_flow column), fan_power (a fan_power column, fan laws)
        uncertainty: {air_flow: 15 %, temperature: 1 delta_degC}
        steady: {window: 2 h, t_range: 4 delta_degC}               # and delimiter, decimal, timestamp_format, ...
      revamp: {throughput: 1.2}   # the tube-side flow at the revamp conditions, a factor on today's
      hot_day: {ambient: [20 degC, 30 degC, 40 degC, 45 degC], t_out_target: 60 degC}
      options:
        - {type: add_bays, n: 1}
        - {type: more_rows, tube_rows: 6, tube_passes: 6}
        - {type: fan_upgrade, speed_ratio: 1.15}
        - {type: clean_fins}
        - {type: twisted_tape, twist_ratio: 4}

:func:`air_cooler_problems` lists every problem with its path (as :func:`revamp.unitfile.check` does for
shell-and-tube entries); :func:`build_air_cooler` returns the case or ``None`` and appends the problems. The
schema fragment :data:`AIR_COOLER_SCHEMA` describes the entry for ``unit_schema.json``.
"""
from __future__ import annotations

from dataclasses import dataclass

from ..errors import InputError
from ._model import Problem
from ._reading import _show

#: How a plant-data file is written (the schema of the reading-dialect fields every plant_data section shares).
_DIALECT_SCHEMA = {
    "delimiter": {"enum": [",", ";", "\t", "|"]},
    "decimal": {"enum": [".", ","]},
    "timestamp_format": {"type": "string", "minLength": 2},
    "dayfirst": {"type": "boolean"},
    "timezone": {"type": "string", "minLength": 1},
}

__all__ = ["AIR_COOLER_KIND", "AIR_COOLER_SCHEMA", "AIR_PLANT_COLUMNS", "AirCoolerCase", "AirPlantData",
           "air_cooler_problems", "build_air_cooler"]

AIR_COOLER_KIND = "air cooler"

_GEOMETRY = {"bays", "bundles_per_bay", "tube_rows", "tubes_per_row", "tube_passes", "tube_length", "tube_od",
             "tube_wall", "transverse_pitch", "row_pitch", "tube_material", "fin", "fans_per_bay", "fan_diameter",
             "fan_efficiency", "draft", "tube_roughness"}
_FIN = {"height", "thickness", "per_length", "material", "bond", "bond_resistance"}
_TUBE = {"fluid", "flow", "t_in", "fouling", "dp_allowed", "stream"}
_AIR = {"t_in", "flow", "face_velocity", "altitude", "fouling"}
_HOT = {"ambient", "t_out_target"}
_ENTRY = {"tag", "kind", "description", "geometry", "tube_side", "air_side", "revamp", "hot_day", "options",
          "plant_data"}
#: the keys of an air cooler's plant_data section
_PLANT = {"file", "columns", "air_flow_from", "uncertainty", "steady", "delimiter", "decimal", "timestamp_format",
          "dayfirst", "timezone"}
_DIALECT = ("delimiter", "decimal", "timestamp_format", "dayfirst", "timezone")
#: standard plant-data columns of an air cooler -> quantity kind (None: the timestamp)
AIR_PLANT_COLUMNS = {"timestamp": None, "tube_flow": "mass_flow", "tube_t_in": "temperature",
                     "tube_t_out": "temperature", "air_t_in": "temperature", "air_flow": "mass_flow",
                     "fan_power": "power"}
_AIR_FLOW_FROM = {"stated": None, "measured": "air_flow", "fan_power": "fan_power"}
#: the largest throughput factor accepted (as for a shell-and-tube entry's revamp.throughput)
MAX_THROUGHPUT = 10.0
#: option ``type`` -> (class name, module, fields)
_OPTIONS = {
    "add_bays": ("AddBays", "options_air", {"n"}),
    "add_bundles": ("AddBundles", "options_air", {"n"}),
    "more_rows": ("MoreRows", "options_air", {"tube_rows", "tube_passes"}),
    "fan_upgrade": ("FanUpgrade", "options_air", {"speed_ratio", "air_flow_ratio"}),
    "clean_fins": ("CleanFins", "options_air", {"side", "residual"}),
    "twisted_tape": ("TwistedTape", "options", {"twist_ratio", "thickness"}),
    "wire_coil": ("WireCoil", "options", {"pitch", "wire_diameter"}),
}

_Q = {"type": ["string", "number"]}
AIR_COOLER_SCHEMA = {
    "type": "object",
    "required": ["tag", "kind", "geometry", "tube_side", "air_side"],
    "additionalProperties": False,
    "properties": {
        "tag": {"type": "string", "minLength": 1, "maxLength": 64},
        "kind": {"const": AIR_COOLER_KIND},
        "description": {"type": "string"},
        "geometry": {"type": "object", "additionalProperties": False,
                     "properties": {**{k: _Q for k in _GEOMETRY - {"fin", "draft", "tube_material"}},
                                    "tube_material": _Q, "draft": {"enum": ["forced", "induced"]},
                                    "fin": {"type": "object", "additionalProperties": False,
                                            "properties": {k: _Q for k in _FIN}}}},
        "tube_side": {"type": "object", "additionalProperties": False,
                      "description": "The process stream: fluid, flow and t_in, or a stream of the network section "
                                     "(stream: name), which gives those it leaves out.",
                      "properties": {"fluid": {"$ref": "#/$defs/fluid"},
                                     "stream": {"type": "string", "minLength": 1},
                                     **{k: _Q for k in _TUBE - {"fluid", "stream"}}}},
        "air_side": {"type": "object", "additionalProperties": False, "required": ["t_in"],
                     "properties": {k: _Q for k in _AIR}},
        "revamp": {"type": "object", "additionalProperties": False, "required": ["throughput"],
                   "properties": {"throughput": _Q}},
        "hot_day": {"type": "object", "additionalProperties": False,
                    "properties": {"ambient": {"type": "array", "items": _Q, "minItems": 1, "maxItems": 200},
                                   "t_out_target": _Q}},
        "options": {"type": "array", "items": {"type": "object", "required": ["type"],
                                               "properties": {"type": {"enum": sorted(_OPTIONS)}}}},
        "plant_data": {
            "type": "object", "additionalProperties": False, "required": ["file"],
            "description": "Measured tube-side data and ambient: the fouling from the tube-side heat balance at a "
                           "stated (or fan-power, or measured) air flow.",
            "properties": {
                "file": {"type": "string", "minLength": 1},
                "columns": {"type": "object", "additionalProperties": False,
                            "properties": {k: {"$ref": "#/$defs/column"} for k in AIR_PLANT_COLUMNS}},
                "air_flow_from": {"enum": sorted(_AIR_FLOW_FROM)},
                "uncertainty": {"type": "object", "additionalProperties": False,
                                "properties": {"air_flow": _Q, "temperature": _Q}},
                "steady": {"type": ["object", "boolean"], "additionalProperties": False,
                           "properties": {"window": _Q, "flow_rsd": _Q, "t_range": _Q,
                                          "min_rows": {"type": "integer", "minimum": 1}}},
                **_DIALECT_SCHEMA,
            },
        },
    },
}


@dataclass(frozen=True)
class AirPlantData:
    """Where an air cooler's plant data is and how to read it (:func:`revamp.monitoring_air_data.monitor_air_data`).
    """

    file: object                    #: Path of the CSV file
    columns: dict                   #: standard name -> (CSV column, unit or None)
    air_flow_from: str = "stated"   #: "stated", "measured" or "fan_power"
    uncertainty: dict = None        #: {"air_flow": relative [-], "temperature": [K]} (keys present if given)
    steady: object = None           #: steady-state settings in SI, False for none, None: defaults
    dialect: dict = None            #: CSV dialect settings given

    def monitor_options(self) -> dict:
        """Keyword arguments of :func:`revamp.monitoring_air_data.monitor_air_data` that this section gives."""
        return {"columns": dict(self.columns), "air_flow_from": self.air_flow_from,
                "uncertainty": dict(self.uncertainty or {}) or None, "steady": self.steady,
                "dialect": dict(self.dialect or {})}


@dataclass(frozen=True)
class AirCoolerCase:
    """One air cooler of a unit, ready to rate (:func:`revamp.rate`), compare (:func:`revamp.options_air.compare_air`)
    and sweep (:func:`revamp.hot_day.hot_day`)."""

    tag: str
    description: str
    exchanger: object
    service: object
    options: tuple = ()
    revamp_service: object = None  #: the service at the revamp conditions (None: no revamp section)
    throughput: float = 1.0        #: the factor on today's tube-side flow at the revamp conditions
    hot_day_ambient: tuple | None = None
    t_out_target: float | None = None
    dp_allowed_tube: float | None = None
    kind: str = AIR_COOLER_KIND
    index: int = -1                 #: its place in the file's exchangers list
    stream: str | None = None       #: the network stream in its tubes (tube_side.stream), None outside a network
    plant_data: AirPlantData | None = None


def _unknown(section: dict, allowed: set, where: str, problems: list):
    for key in section:
        if key not in allowed:
            problems.append(Problem(f"{where}.{key}", _show(section[key]),
                                    f"must be one of the known fields: {', '.join(sorted(allowed))}"))


def _mapping(x, key, where, problems, required=True):
    value = x.get(key)
    if value is None:
        if required:
            problems.append(Problem(f"{where}.{key}", "(missing)", "must be given"))
        return None
    if not isinstance(value, dict):
        problems.append(Problem(f"{where}.{key}", _show(value), "must be a mapping of fields"))
        return None
    return value


def _guard(problems, prefix, func, rename=None):
    """Run a constructor; its InputError becomes a Problem under ``prefix`` (never a traceback)."""
    try:
        return func()
    except InputError as exc:
        name = rename(exc.field) if rename else exc.field
        problems.append(Problem(f"{prefix}.{name}" if name else prefix,
                                exc.value if isinstance(exc.value, str) else _show(exc.value), f"must be {exc.allowed}"))
    except Exception as exc:  # a constructor failing another way: one line, never a traceback
        problems.append(Problem(prefix, "(as given)", f"could not be built: {exc.__class__.__name__}: {exc}"))
    return None


#: quantity fields checked one by one before the constructors run (so that every bad one is reported at once):
#: section -> field -> (kind, lower bound, strict)
_QUANTITIES = {
    "geometry": {**{k: ("length", 0.0, True) for k in ("tube_length", "tube_od", "tube_wall", "transverse_pitch",
                                                        "row_pitch", "fan_diameter")},
                 "tube_roughness": ("length", 0.0, False)},
    "tube_side": {"flow": ("mass_flow", 0.0, True), "t_in": ("temperature", 0.0, True),
                  "fouling": ("fouling", 0.0, False), "dp_allowed": ("pressure", 0.0, True)},
    "air_side": {"flow": ("mass_flow", 0.0, True), "t_in": ("temperature", 0.0, True),
                 "face_velocity": ("velocity", 0.0, True), "altitude": ("length", None, False),
                 "fouling": ("fouling", 0.0, False)},
}


def _quantity_problems(section: dict, name: str, where: str, problems: list, table=None) -> dict:
    """Every quantity of ``section`` (the fields of ``table[name]``, default this module's) in SI, one float each;
    a field that is not one value of its kind, or is below its lower bound, is left out with its problem appended.
    (``to_si`` refuses NaN and infinity.)"""
    from ..units import to_si

    out = {}
    for key, (kind, low, strict) in (_QUANTITIES if table is None else table)[name].items():
        if key not in section:
            continue
        try:
            v = to_si(section[key], kind, key)
        except InputError as exc:
            problems.append(Problem(f"{where}.{key}", _show(section[key]), f"must be {exc.allowed}"))
            continue
        if not isinstance(v, float):
            problems.append(Problem(f"{where}.{key}", _show(section[key]), "must be one value (not a list)"))
        elif low is not None and (v <= low if strict else v < low):
            problems.append(Problem(f"{where}.{key}", _show(section[key]), f"must be {'>' if strict else '>='} "
                                    f"{low:g} (SI)"))
        else:
            out[key] = v
    return out


def _plant_file(spec: dict, where: str, base, problems: list):
    """A plant_data section's ``file``: (as written, the resolved path), or None with the problem appended."""
    from ._building import _safe_file

    file = spec.get("file")
    if not isinstance(file, str) or not file.strip():
        problems.append(Problem(f"{where}.file", _show(file), "must be the path of a CSV file"))
        return None
    full, reason = _safe_file(file, base) if base is not None else (None, "must be read from a unit file")
    if reason:
        problems.append(Problem(f"{where}.file", file, reason))
        return None
    return file, full


def _plant_dialect(spec: dict, where: str, problems: list) -> dict:
    """A plant_data section's CSV dialect settings (empty, with the problem appended, when they are not valid)."""
    from ..monitoring.data import CsvDialect

    dialect = {k: spec[k] for k in _DIALECT if k in spec}
    try:
        CsvDialect.make(dialect)
    except InputError as exc:
        problems.append(Problem(f"{where}.{exc.field}", _show(exc.value), f"must be {exc.allowed}"))
        dialect = {}
    return dialect


def _plant_columns_given(spec: dict, known, where: str, problems: list) -> dict:
    """A plant_data section's ``columns`` mapping (empty when it is not one), unknown standard names appended."""
    given = spec.get("columns") or {}
    if not isinstance(given, dict):
        problems.append(Problem(f"{where}.columns", _show(given), "must be a mapping of standard name -> column"))
        given = {}
    _unknown(given, set(known), f"{where}.columns", problems)
    return given


def _columns_missing(spec: dict, file, header, lines, columns: dict, dialect: dict, where: str, problems: list,
                     why=lambda std: "") -> bool:
    """Whether a column the section reads is not in the CSV header (the problem appended: the delimiter when another
    one would find the columns, else each missing column, with ``why(std)`` after the file's name)."""
    from ..monitoring.data import dialect_problem

    names = [name for name, _ in columns.values()]
    if not any(name not in header for name in names):
        return False
    problem = dialect_problem(lines, names, dialect)
    if problem is not None:
        problems.append(Problem(f"{where}.delimiter", _show(spec.get("delimiter", ",")),
                                f"must be {problem.allowed}"))
        return True
    for std, (name, _) in columns.items():
        if name not in header:
            problems.append(Problem(f"{where}.columns.{std}", name,
                                    f"must be a column of {file}{why(std)} (it has: {', '.join(header)[:200]})"))
    return True


def _plant_head(full, file: str, dialect: dict, where: str, problems: list):
    """A plant-data file's header and first lines ``(header, lines)``, or None with the problem at ``where.file``:
    unreadable (one line naming the file, never a traceback), no header, or no data row below it."""
    from ._building import _csv_head

    try:
        header, rows, lines = _csv_head(full, dialect.get("delimiter", ","))
    except ValueError as exc:
        problems.append(Problem(f"{where}.file", file, str(exc)))
        return None
    except Exception as exc:  # unreadable
        problems.append(Problem(f"{where}.file", file, f"must be a readable UTF-8 CSV file "
                                                       f"({exc.__class__.__name__}: {str(exc)[:80]})"))
        return None
    if not any(any(cell.strip() for cell in row) for row in rows):
        problems.append(Problem(f"{where}.file", file, "must hold at least one data row below its header"))
        return None
    return header, lines


def _plant_data(pd, where: str, base, problems: list):
    """Check and build an air cooler's ``plant_data`` section (None with problems, appended)."""
    from ..units import to_si

    start = len(problems)
    _unknown(pd, _PLANT, where, problems)
    found = _plant_file(pd, where, base, problems)
    if found is None:
        return None
    file, full = found
    source = pd.get("air_flow_from", "stated")
    if source not in _AIR_FLOW_FROM:
        problems.append(Problem(f"{where}.air_flow_from", _show(source), f"must be one of {', '.join(_AIR_FLOW_FROM)}"))
        source = "stated"
    dialect = _plant_dialect(pd, where, problems)
    cols_given = _plant_columns_given(pd, AIR_PLANT_COLUMNS, where, problems)
    need = ["timestamp", "tube_flow", "tube_t_in", "tube_t_out", "air_t_in"] + (
        [_AIR_FLOW_FROM[source]] if _AIR_FLOW_FROM[source] else [])
    columns = {}
    for std in need:
        spec = cols_given.get(std, std)
        if isinstance(spec, str):
            name, unit = spec, None
            if std in cols_given and AIR_PLANT_COLUMNS[std] is not None:
                example = {"temperature": "degC", "mass_flow": "t/h", "power": "kW"}[AIR_PLANT_COLUMNS[std]]
                problems.append(Problem(f"{where}.columns.{std}", name, f"must give its unit: {{column: {name}, "
                                        f"unit: {example}}} (a column without one is read in SI)"))
        elif isinstance(spec, dict) and isinstance(spec.get("column"), str):
            name, unit = spec["column"], spec.get("unit")
            if unit is not None and AIR_PLANT_COLUMNS[std] is not None:
                try:
                    to_si(f"1 {unit}", AIR_PLANT_COLUMNS[std], "unit")
                except InputError as exc:
                    problems.append(Problem(f"{where}.columns.{std}.unit", _show(unit), f"must be {exc.allowed}"))
            elif unit is not None:
                problems.append(Problem(f"{where}.columns.{std}.unit", _show(unit), "must not be given for the "
                                                                                      "timestamp"))
        else:
            problems.append(Problem(f"{where}.columns.{std}", _show(spec), "must be a column name or {column, unit}"))
            continue
        columns[std] = (name, unit)
    unc = pd.get("uncertainty") or {}
    uncertainty = {}
    if not isinstance(unc, dict):
        problems.append(Problem(f"{where}.uncertainty", _show(unc), "must be a mapping of air_flow, temperature"))
        unc = {}
    _unknown(unc, {"air_flow", "temperature"}, f"{where}.uncertainty", problems)
    for key, kind, hi in (("air_flow", "dimensionless", 1.0), ("temperature", "temperature_difference", 50.0)):
        if key in unc:
            try:
                v = to_si(unc[key], kind, key)
            except InputError as exc:
                problems.append(Problem(f"{where}.uncertainty.{key}", _show(unc[key]), f"must be {exc.allowed}"))
                continue
            if not (isinstance(v, float) and 0.0 < v < hi):
                problems.append(Problem(f"{where}.uncertainty.{key}", _show(unc[key]), f"must be > 0 and < {hi:g} "
                                                                                      "(SI)"))
            else:
                uncertainty[key] = v
    steady = pd.get("steady")
    if isinstance(steady, dict):
        _unknown(steady, {"window", "flow_rsd", "t_range", "min_rows"}, f"{where}.steady", problems)
        clean = {}
        for key, kind in (("window", "time"), ("flow_rsd", "dimensionless"), ("t_range", "temperature_difference")):
            if key in steady:
                try:
                    v = to_si(steady[key], kind, key)
                except InputError as exc:
                    problems.append(Problem(f"{where}.steady.{key}", _show(steady[key]), f"must be {exc.allowed}"))
                    continue
                if not (isinstance(v, float) and v > 0):
                    problems.append(Problem(f"{where}.steady.{key}", _show(steady[key]), "must be one value > 0"))
                else:
                    clean[key] = v
        if "min_rows" in steady:
            m = steady["min_rows"]
            if isinstance(m, bool) or not isinstance(m, int) or m < 1:
                problems.append(Problem(f"{where}.steady.min_rows", _show(m), "must be a whole number >= 1"))
            else:
                clean["min_rows"] = m
        steady = clean
    elif steady is not None and not isinstance(steady, bool):
        problems.append(Problem(f"{where}.steady", _show(steady), "must be true, false or a mapping of window, "
                                                                  "flow_rsd, t_range, min_rows"))
    if len(problems) > start:
        return None
    head = _plant_head(full, file, dialect, where, problems)
    if head is None:
        return None
    header, lines = head
    if _columns_missing(pd, file, header, lines, columns, dialect, where, problems,
                        lambda std: f" (air_flow_from: {source} reads it)" if std == _AIR_FLOW_FROM[source] else ""):
        return None
    return AirPlantData(file=full, columns=columns, air_flow_from=source, uncertainty=uncertainty,
                        steady=steady, dialect=dialect)


def _from_stream(tube: dict, network) -> dict:
    """The tube side with the fluid, flow and inlet of its network stream where it gives none."""
    name = tube.get("stream")
    streams = network.get("streams") if isinstance(network, dict) else None
    if not isinstance(name, str) or not isinstance(streams, dict) or not isinstance(streams.get(name), dict):
        return tube
    out = dict(tube)
    for key in ("fluid", "flow", "t_in"):
        if key not in out and key in streams[name]:
            out[key] = streams[name][key]
    return out


def build_air_cooler(i: int, x: dict, problems: list, base=None, network=None) -> AirCoolerCase | None:
    """Check and build ``exchangers[i]`` of ``kind: air cooler``; problems are appended (paths from the file).

    ``base`` is the unit file's folder (for ``plant_data.file``); ``network`` the file's raw ``network`` section,
    whose stream a ``tube_side.stream`` names (its fluid, flow and supply temperature fill the tube side where it
    gives none; the network's own rules check the name)."""
    from .. import aircooler, options, options_air, service, service_air
    from ..units import to_si
    from ._building import _build_fluid

    pre, start = f"exchangers[{i}]", len(problems)
    if not isinstance(x, dict):
        problems.append(Problem(pre, _show(x), "must be a mapping"))
        return None
    _unknown(x, _ENTRY, pre, problems)
    tag = x.get("tag")
    if not isinstance(tag, str) or not tag.strip():
        problems.append(Problem(f"{pre}.tag", _show(tag), "must be a non-empty name"))
    geo = _mapping(x, "geometry", pre, problems)
    tube = _mapping(x, "tube_side", pre, problems)
    if tube is not None:
        tube = _from_stream(tube, network)
    air = _mapping(x, "air_side", pre, problems)
    hot = _mapping(x, "hot_day", pre, problems, required=False)
    exchanger = svc = None
    failed = set()
    for name, section in (("geometry", geo), ("tube_side", tube), ("air_side", air)):
        if section is not None:
            before = len(problems)
            _quantity_problems(section, name, f"{pre}.{name}", problems)
            if len(problems) > before:
                failed.add(name)
    if geo is not None:
        _unknown(geo, _GEOMETRY, f"{pre}.geometry", problems)
        fin_spec = _mapping(geo, "fin", f"{pre}.geometry", problems)
        fin = None
        if fin_spec is not None:
            _unknown(fin_spec, _FIN, f"{pre}.geometry.fin", problems)
            fin = _guard(problems, f"{pre}.geometry.fin", lambda: aircooler.Fin(**fin_spec),
                         rename=lambda f: f[4:] if f.startswith("fin.") else f)
        if fin is not None and len(problems) == start:  # geometry with no problem so far
            kw = {k: v for k, v in geo.items() if k != "fin"}
            exchanger = _guard(problems, f"{pre}.geometry",
                               lambda: aircooler.AirCooler(**kw, fin=fin, name=str(tag)))
    stream = None
    if tube is not None and "tube_side" not in failed:
        _unknown(tube, _TUBE, f"{pre}.tube_side", problems)
        spec = tube.get("fluid")
        fluid = None
        if not isinstance(spec, dict) or "kind" not in spec:
            problems.append(Problem(f"{pre}.tube_side.fluid", _show(spec), "must be a fluid mapping with a 'kind'"))
        else:
            kind = str(spec["kind"])  # the fluid's complaint names "<kind>.<field>": the file says "<field>"
            fluid = _guard(problems, f"{pre}.tube_side.fluid", lambda: _build_fluid(dict(spec)),
                           rename=lambda f: f[len(kind) + 1:] if f.startswith(kind + ".") else f)
        if fluid is not None:
            stream = _guard(problems, f"{pre}.tube_side",
                            lambda: service.Stream(fluid, tube.get("flow"), tube.get("t_in")))
    if air is not None:
        _unknown(air, _AIR, f"{pre}.air_side", problems)
    if stream is not None and air is not None and "air_side" not in failed:
        names = {"t_in": "air_in", "flow": "air_flow", "fouling": "fouling_air"}
        back = {v: k for k, v in names.items()}
        kw = {names.get(k, k): v for k, v in air.items()}
        kw["fouling_tube"] = tube.get("fouling", 0.0)

        def rename(f):
            if f == "fouling_tube":
                return "tube_side.fouling"
            return "air_side." + back.get(f, f)

        svc = _guard(problems, pre, lambda: service_air.AirService(tube=stream, **kw), rename=rename)
    opts = []
    for j, spec in enumerate(x.get("options") or []):
        where = f"{pre}.options[{j}]"
        if not isinstance(spec, dict) or spec.get("type") not in _OPTIONS:
            problems.append(Problem(f"{where}.type", _show(spec.get("type") if isinstance(spec, dict) else spec),
                                    f"must be one of {', '.join(sorted(_OPTIONS))}"))
            continue
        cls_name, module, fields = _OPTIONS[spec["type"]]
        _unknown({k: v for k, v in spec.items() if k not in ("type", "label")}, fields, where, problems)
        cls = getattr(options_air if module == "options_air" else options, cls_name)
        params = {k: v for k, v in spec.items() if k in fields | {"label"}}
        opt = _guard(problems, where, lambda: cls(**params), rename=lambda f: f.split(".", 1)[-1])
        if opt is not None and exchanger is not None and svc is not None:
            if _guard(problems, where, lambda: opt.apply(exchanger, svc), rename=lambda f: f.split(".", 1)[-1]):
                opts.append(opt)
    ambient = target = None
    if hot is not None:
        _unknown(hot, _HOT, f"{pre}.hot_day", problems)
        amb = hot.get("ambient")
        if amb is not None:
            if not isinstance(amb, list) or not amb:
                problems.append(Problem(f"{pre}.hot_day.ambient", _show(amb), "must be a list of temperatures"))
            else:
                vals = [_guard(problems, f"{pre}.hot_day.ambient[{k}]", lambda v=v: to_si(v, "temperature", ""))
                        for k, v in enumerate(amb)]
                ambient = tuple(vals) if None not in vals else None
        if hot.get("t_out_target") is not None:
            target = _guard(problems, f"{pre}.hot_day", lambda: to_si(hot["t_out_target"], "temperature",
                                                                       "t_out_target"))
    throughput, rv = 1.0, _mapping(x, "revamp", pre, problems, required=False)
    if rv is not None:
        _unknown(rv, {"throughput"}, f"{pre}.revamp", problems)
        if "throughput" not in rv:
            problems.append(Problem(f"{pre}.revamp.throughput", "(missing)", "must be given"))
        else:
            factor = _guard(problems, f"{pre}.revamp", lambda: to_si(rv["throughput"], "dimensionless", "throughput"))
            if factor is not None and not (isinstance(factor, float) and 0.0 < factor <= MAX_THROUGHPUT):
                problems.append(Problem(f"{pre}.revamp.throughput", _show(rv["throughput"]),
                                        f"must be one factor > 0 and <= {MAX_THROUGHPUT:g}"))
            elif factor is not None:
                throughput = factor
    dp_allowed = None
    if tube is not None and tube.get("dp_allowed") is not None:
        dp_allowed = _guard(problems, f"{pre}.tube_side", lambda: to_si(tube["dp_allowed"], "pressure", "dp_allowed"))
    plant = None
    pd_spec = _mapping(x, "plant_data", pre, problems, required=False)
    if pd_spec is not None:
        plant = _plant_data(pd_spec, f"{pre}.plant_data", base, problems)
    if len(problems) > start or exchanger is None or svc is None:
        return None
    revamp_service = None
    if rv is not None:
        revamp_service = _guard(problems, f"{pre}.revamp", lambda: svc.replace(
            tube=svc.tube.replace(flow=svc.tube.flow * throughput)))
        if revamp_service is None:
            return None
    return AirCoolerCase(tag=tag, description=str(x.get("description", "")), exchanger=exchanger, service=svc,
                         options=tuple(opts), revamp_service=revamp_service, throughput=throughput,
                         hot_day_ambient=ambient, t_out_target=target, dp_allowed_tube=dp_allowed, index=i,
                         stream=tube.get("stream") if isinstance(tube.get("stream"), str) else None,
                         plant_data=plant)


def air_cooler_problems(i: int, x: dict) -> list[Problem]:
    """Every problem of ``exchangers[i]`` (an air-cooler entry); empty when it builds."""
    problems: list[Problem] = []
    build_air_cooler(i, x, problems)
    return problems
