"""Pass 4 of the check: cross-field rules, file paths (inside the unit's folder), then the model objects.

Every model constructor's :class:`~revamp.errors.InputError` becomes a :class:`Problem` under the file's path.
"""
from __future__ import annotations

import csv
import inspect
import re
from pathlib import Path

from ..errors import InputError
from ._model import (
    STANDARD_COLUMNS,
    ExchangerCase,
    PlantData,
    Problem,
    UnitEconomics,
    UnitFileError,
)
from ._reading import _convert, _path, _show


# ------------------------------------------------------------------------------------- pass 4: rules, paths, models
def _exchanger_rules(x: dict, parts: list, base: Path, seen_tags: dict) -> list[Problem]:
    out = []
    tag = x.get("tag")
    if isinstance(tag, str):
        if tag in seen_tags:
            out.append(Problem(_path(parts + ["tag"]), tag, f"must be unique (also used by exchangers[{seen_tags[tag]}])"))
        seen_tags.setdefault(tag, parts[-1])
    rv = x.get("revamp")
    if isinstance(rv, dict):
        if "throughput" in rv and "flows" in rv:
            out.append(Problem(_path(parts + ["revamp"]), "throughput and flows",
                               "must give either a throughput factor or explicit flows, not both"))
        if "side" in rv and "throughput" not in rv:
            out.append(Problem(_path(parts + ["revamp", "side"]), _show(rv["side"]), "must come with a throughput"))
    for side in ("shell_side", "tube_side"):
        fluid = (x.get(side) or {}).get("fluid") if isinstance(x.get(side), dict) else None
        name = fluid.get("fluid") if isinstance(fluid, dict) and fluid.get("kind") == "pure" else None
        if isinstance(name, str) and re.search(r"[&\[\]|:]", name):
            # CoolProp's mixture and backend syntax ('Water&Ethanol', 'HEOS::Water[0.5]&...'): the pure-fluid
            # provider would quietly rate the first component alone
            out.append(Problem(_path(parts + [side, "fluid", "fluid"]), name,
                               "must be one pure substance (mixtures are not supported here: describe a mixture "
                               "as a 'table' or 'constant' fluid from its measured properties)"))
        if isinstance(fluid, dict) and fluid.get("kind") == "table":
            lengths = {k: len(fluid[k]) for k in ("T", "density", "heat_capacity", "viscosity", "conductivity")
                       if isinstance(fluid.get(k), list)}
            if len(set(lengths.values())) > 1:
                out.append(Problem(_path(parts + [side, "fluid"]), str(lengths), "must have lists of equal length"))
    pd = x.get("plant_data")
    if isinstance(pd, dict) and isinstance(pd.get("file"), str):
        out.extend(_plant_data_rules(pd, parts + ["plant_data"], base))
    return out


def _safe_file(text: str, base: Path):
    """Resolve a path written in the file; (Path, None) or (None, reason)."""
    if not text.isprintable():  # a NUL would make the file system call raise; control characters are never meant
        return None, "must be a printable path (no NUL or control characters)"
    p = Path(text)
    if p.is_absolute() or re.match(r"^[A-Za-z]:[\\/]", text) or text.startswith("~"):
        return None, "must be a path relative to the unit file's folder"
    full = (base / p).resolve()
    try:
        full.relative_to(base.resolve())
    except ValueError:
        return None, "must stay inside the unit file's folder (no '..' out of it, no link out of it)"
    if not full.exists():
        return None, f"must be an existing file (looked for {full.relative_to(base.resolve())})"
    if not full.is_file():
        return None, "must be a regular file (not a folder, pipe or device)"
    return full, None


#: how much of a plant-data CSV ``check`` reads for its header and first rows [bytes]
CSV_HEAD_BYTES = 1 << 18
_TZ_RE = re.compile(r"(Z|[+-]\d\d:?\d\d)$")


def _csv_head(full: Path, delimiter: str = ","):
    """The header, the first data rows and the first six lines of a CSV, reading at most :data:`CSV_HEAD_BYTES` (a UTF-8 byte-order mark,
    as spreadsheet programs write, is dropped, as pandas does). Raises ValueError with the reason."""
    import io

    with open(full, "rb") as fh:
        head = fh.read(CSV_HEAD_BYTES)
    text = head.decode("utf-8-sig", errors="strict") if len(head) < CSV_HEAD_BYTES else \
        head.decode("utf-8-sig", errors="ignore")
    lines = text.splitlines()
    if len(head) == CSV_HEAD_BYTES and lines:
        lines = lines[:-1]  # a partly read last line
    rows = list(csv.reader(io.StringIO("\n".join(lines[:1000])), delimiter=delimiter))
    if not rows:
        raise ValueError(f"must have a header row within its first {CSV_HEAD_BYTES // 1024} KiB")
    return [h.strip() for h in rows[0]], rows[1:], lines[:6]


DIALECT_KEYS = ("delimiter", "decimal", "timestamp_format", "dayfirst", "timezone")


def _is_date(text) -> bool:
    from datetime import datetime

    try:
        datetime.fromisoformat(str(text).strip())
    except ValueError:
        try:
            import pandas

            return pandas.notna(pandas.Timestamp(str(text)))
        except (ValueError, TypeError):
            return False
    return True


#: how much of a plant-data CSV the time-zone check reads [bytes] (a year of minute data is about 40 MB)
CSV_SCAN_BYTES = 64 << 20
_TZ_TAIL_RE = re.compile(rb"(Z|[+-]\d\d:?\d\d)$")


def _time_zones(full: Path, j: int, delimiter: str = ",") -> set:
    """The distinct zone suffixes (``"Z"``, ``"+01:00"``, None for naive) of the timestamp column ``j`` over the
    first :data:`CSV_SCAN_BYTES` of the file (a switch to summer time may come months in). Rows are split on commas
    (a quoted timestamp holding a comma is not expected) and only the distinct last six characters are examined."""
    with open(full, "rb") as fh:
        lines = fh.read(CSV_SCAN_BYTES).split(b"\n")[1:]
    sep = delimiter.encode("utf-8")
    if j == 0:
        cells = [line.partition(sep)[0] for line in lines]
    else:
        cells = [parts[j] for parts in (line.split(sep, j + 1) for line in lines) if len(parts) > j]
    tails = {c.strip().strip(b'"')[-6:] for c in cells}
    return {(m.group(1).decode() if (m := _TZ_TAIL_RE.search(t)) else None) for t in tails if t}


def _plant_data_rules(pd: dict, parts: list, base: Path) -> list[Problem]:
    full, reason = _safe_file(pd["file"], base)
    if reason:
        return [Problem(_path(parts + ["file"]), pd["file"], reason)]
    from ..monitoring.data import CsvDialect, dialect_problem  # pandas: imported only when a file has plant data

    out = []
    dialect = {k: pd[k] for k in DIALECT_KEYS if k in pd}
    try:
        CsvDialect.make(dialect)
    except InputError as exc:
        out.append(Problem(_path(parts + [exc.field]), _show(exc.value), f"must be {exc.allowed}"))
        dialect = {}
    for i, when in enumerate(pd.get("cleanings") or []):
        if not _is_date(when):
            out.append(Problem(_path(parts + ["cleanings", i]), _show(when), "must be a date, e.g. '2031-04-10 12:00'"))
    try:
        header, rows, lines = _csv_head(full, dialect.get("delimiter", ","))
    except (OSError, UnicodeDecodeError, csv.Error) as exc:
        return out + [Problem(_path(parts + ["file"]), pd["file"], f"must be a readable UTF-8 CSV file "
                                                                   f"({exc.__class__.__name__}: {str(exc)[:80]})")]
    except ValueError as exc:
        return out + [Problem(_path(parts + ["file"]), pd["file"], str(exc))]
    if not any(any(cell.strip() for cell in row) for row in rows):
        out.append(Problem(_path(parts + ["file"]), pd["file"], "must hold at least one data row below its header"))
    cols = pd.get("columns") if isinstance(pd.get("columns"), dict) else {}
    names = [s if isinstance(s, str) else s.get("column") for s in (cols.get(std, std) for std in STANDARD_COLUMNS)]
    names = [n for n in names if isinstance(n, str)]
    if any(n not in header for n in names):
        problem = dialect_problem(lines, names, dialect)
        if problem is not None:  # one problem naming the separator, not one per column
            return out + [Problem(_path(parts + ["delimiter"]), _show(pd.get("delimiter", ",")),
                                  f"must be {problem.allowed}")]
    for std, kind in STANDARD_COLUMNS.items():
        spec = cols.get(std, std)
        name, unit = (spec, None) if isinstance(spec, str) else (spec.get("column"), spec.get("unit"))
        if not isinstance(name, str):
            continue
        if name not in header:
            out.append(Problem(_path(parts + ["columns", std]), name,
                               f"must be a column of {pd['file']} (it has: {', '.join(header)[:200]})"))
        if std in cols and isinstance(spec, str) and kind is not None:
            # a mapped column read without a unit would be taken as SI: degC data read as kelvin discards every row
            example = "degC" if kind == "temperature" else "t/h"
            out.append(Problem(_path(parts + ["columns", std]), name,
                               f"must give its unit: {{column: {name}, unit: {example}}} (SI is written "
                               f"'{'K' if kind == 'temperature' else 'kg/s'}')"))
        if unit is not None and kind is not None:
            try:
                _convert(f"1 {unit}", kind, "unit", "USD")
            except InputError as exc:
                out.append(Problem(_path(parts + ["columns", std, "unit"]), unit, f"must be the unit of {exc.allowed}"))
        elif unit is not None:
            out.append(Problem(_path(parts + ["columns", std, "unit"]), unit, "must not be given for the timestamp"))
    ts = cols.get("timestamp", "timestamp")
    ts = ts if isinstance(ts, str) else ts.get("column") if isinstance(ts, dict) else None
    if ts in header:
        zones = _time_zones(full, header.index(ts), dialect.get("delimiter", ","))
        if len(zones) > 1 and not (dialect.get("timezone") and None not in zones):  # offsets given: one instant each
            shown = ", ".join(sorted("none" if z is None else z for z in zones))[:80]
            out.append(Problem(_path(parts + ["columns", "timestamp"]), ts,
                               f"must use one time zone throughout (it has: {shown}); convert the timestamps to "
                               "one zone, e.g. UTC"))
    return out


OPTION_CLASSES = {"clean": "Clean", "twisted_tape": "TwistedTape", "wire_coil": "WireCoil",
                  "insert_factors": "InsertFactors", "add_shells": "AddShells", "new_bundle": "NewBundle",
                  "retube": "Retube", "baffle_change": "BaffleChange", "combined": "Combined"}
_META = ("type", "label", "capex", "note")


def _call(factory, kwargs: dict):
    """Call ``factory`` with the keyword arguments it accepts (optional ones such as ``label`` may be absent)."""
    try:
        params = inspect.signature(factory).parameters
    except (TypeError, ValueError):  # pragma: no cover - builtins
        return factory(**kwargs)
    if any(p.kind is p.VAR_KEYWORD for p in params.values()):
        return factory(**kwargs)
    return factory(**{k: v for k, v in kwargs.items() if k in params})


def _build_option(spec: dict):
    from .. import options as opt_mod

    cls = getattr(opt_mod, OPTION_CLASSES[spec["type"]])
    params = {k: v for k, v in spec.items() if k not in _META}
    if spec["type"] == "combined":
        children = [_build_option(c) for c in params.pop("options")]
        return cls(*children, label=spec.get("label"))
    if "label" in spec:
        params["label"] = spec["label"]
    return _call(cls, params)


def _option_label(obj, spec: dict, j: int) -> str:
    return str(getattr(obj, "label", None) or spec.get("label") or f"{spec['type']} {j + 1}")


def _build_fluid(spec: dict):
    from .. import fluids

    params = {k: v for k, v in spec.items() if k != "kind"}
    if spec["kind"] == "pure":  # the user's own name is the label; the substance is CoolProp's name
        params["label"] = params.pop("name", None)
        params["name"] = params.pop("fluid")
    elif spec["kind"] == "petroleum":
        params["viscosity"] = [tuple(p) for p in params["viscosity"]]
    return _call(getattr(fluids, spec["kind"]), params)


def _guard(problems: list, prefix: str, func, *args, field_of=None):
    """Run a model constructor; its InputError (or any error) becomes a Problem under ``prefix``.

    ``field_of(field) -> str`` rewrites the error's own field name before the prefix is put in front (e.g. to drop
    a provider's name, or to point at the prefix itself)."""
    try:
        return func(*args)
    except UnitFileError:
        raise
    except InputError as exc:
        name = field_of(exc.field) if field_of else exc.field
        e = InputError(f"{prefix}.{name}" if name else prefix, exc.value, exc.allowed)
        problems.append(Problem(e.field, e.value if isinstance(e.value, str) else _show(e.value), f"must be {e.allowed}"))
    except Exception as exc:  # a constructor that fails another way: still one line, never a traceback
        problems.append(Problem(prefix, "(as given)", f"could not be built: {exc.__class__.__name__}: {exc}"))
    return None


#: the path of one option's problem (``exchangers[2].options[1].tube_pitch``); group 1 is the exchanger, 2 the option
OPTION_PATH = re.compile(r"^exchangers\[(\d+)\]\.options\[(\d+)\]")
#: option labels the study uses for its own rows (``revamp.study`` refuses them as option labels)
RESERVED_LABELS = frozenset({"base", "today", "today (clean)", "revamp", "revamp (clean)"})
#: an insert's field (as its model names it) -> the option field the unit file writes
_INSERT_FIELDS = {"insert.thickness_ratio": "thickness", "insert.wire_ratio": "wire_diameter",
                  "insert.pitch_ratio": "pitch", "insert.twist_ratio": "twist_ratio"}
#: the largest relative roughness of a tube bore read on the Moody (1944) chart, whose curves end at e/d = 0.05
MAX_RELATIVE_ROUGHNESS = 0.05


def _option_field(field: str) -> str:
    if re.match(r"^(NewBundle|Retube|TwistedTape|WireCoil|BaffleChange)\.", field):
        field = field.split(".", 1)[1]
    return _INSERT_FIELDS.get(field, field)


#: how far outside its property model's range an inlet may lie before check refuses it [K]: beyond this the
#: correlations are extrapolated so far that the rating would mean nothing (common practice, no source)
FLUID_RANGE_MARGIN = 50.0


def _fluid_at_inlet(problems: list, where: str, fluid, t_in):
    """Evaluate the fluid at its inlet; a provider that fails other than by InputError (e.g. a petroleum
    correlation overflowing at 1 K), or an inlet far outside the provider's range (:data:`FLUID_RANGE_MARGIN`), is
    reported as a temperature outside the fluid's range. Nearer the range the rating runs and warns."""
    screen = getattr(fluid, "screen", None)
    known = screen() if screen is not None else None
    if known is not None and not getattr(fluid, "loaded", True):  # water: judged without importing CoolProp
        return _screened_inlet(problems, where, fluid, t_in, *known)
    lo, hi = getattr(fluid, "t_min", None), getattr(fluid, "t_max", None)
    if lo is not None and hi is not None and not (lo - FLUID_RANGE_MARGIN <= t_in <= hi + FLUID_RANGE_MARGIN):
        problems.append(Problem(where, f"{t_in - 273.15:.6g} degC",
                                f"must lie within {FLUID_RANGE_MARGIN:.0f} K of the range the fluid's property model "
                                f"covers ({lo - 273.15:.0f} to {hi - 273.15:.0f} degC)"))
        return None
    try:
        return fluid.props(t_in)
    except InputError as exc:
        problems.append(Problem(where, exc.value if isinstance(exc.value, str) else _show(exc.value),
                                f"must be {exc.allowed}"))
    except (ArithmeticError, ValueError, FloatingPointError) as exc:
        lo, hi = getattr(fluid, "t_min", None), getattr(fluid, "t_max", None)
        span = f" ({lo - 273.15:.0f} to {hi - 273.15:.0f} degC)" if lo is not None and hi is not None else ""
        problems.append(Problem(where, f"{t_in:.6g} K", f"must be a temperature the fluid's property model covers"
                                                        f"{span}; it fails there ({exc.__class__.__name__})"))
    return None


def _screened_inlet(problems: list, where: str, fluid, t_in, lo: float, hi: float):
    """The inlet of a liquid whose range is known without its property library (water: triple point and IF97
    saturation): refused as its ``props`` would refuse it (at or above saturation, below the triple point); True
    when it is inside."""
    if lo <= t_in < hi:
        return True
    if t_in >= hi:
        allowed = (f"below saturation {hi:.2f} K at {fluid.pressure:.6g} Pa (the {fluid.fluid} provider is liquid "
                   "only)")
    else:
        allowed = f"at least {lo:.2f} K (lower limit of the {fluid.fluid} liquid table)"
    problems.append(Problem(where, f"{t_in:.6g} K", f"must be {allowed}"))
    return None


def _bore_rule(exchanger, g: dict, where: str, problems: list):
    """A tube bore small against its roughness (a wall near half the od) is named as such, not as a friction-factor
    range error deep inside the rating (Moody 1944: the chart stops at e/d = 0.05)."""
    if exchanger is None:
        return
    rel = float(exchanger.tube_roughness) / float(exchanger.tube_id)
    if rel > MAX_RELATIVE_ROUGHNESS:
        field = "tube_roughness" if "tube_roughness" in g else "tube_wall"
        bore, rough = exchanger.tube_id * 1e3, exchanger.tube_roughness * 1e3
        problems.append(Problem(f"{where}.{field}", _show(g.get(field)),
                                f"must leave a bore large against the tube roughness: bore {bore:.3g} mm, roughness "
                                f"{rough:.3g} mm, relative roughness {rel:.3g} > {MAX_RELATIVE_ROUGHNESS} (end of the "
                                "Moody chart)"))


def _inlets_rule(service, where: str, problems: list) -> bool:
    """Equal inlet temperatures give no driving force: the rating would refuse them, so check does first."""
    ts, tt = float(service.shell.t_in), float(service.tube.t_in)
    if abs(ts - tt) < 1e-6:
        problems.append(Problem(where, f"{tt - 273.15:.6g} degC", "must differ from the other side's inlet "
                                f"temperature ({ts - 273.15:.6g} degC): equal inlets give no driving force"))
        return True
    return False


def _target_rule(target: dict, service, where: str, problems: list):
    """An outlet-temperature target must lie between the two inlets at the revamp conditions (second law): the hot
    side can only cool towards the cold inlet, the cold side only heat towards the hot inlet."""
    for side in ("shell", "tube"):
        key = f"t_out_{side}"
        if target.get(key) is None:
            continue
        own = float(getattr(service, side).t_in)
        other = float(getattr(service, "tube" if side == "shell" else "shell").t_in)
        lo, hi = sorted((own, other))
        if not lo < float(target[key]) < hi:
            verb = "cooled" if own > other else "heated"
            problems.append(Problem(f"{where}.{key}", f"{float(target[key]) - 273.15:.6g} degC",
                                    f"must lie between the {side}-side inlet ({own - 273.15:.6g} degC) and the other "
                                    f"inlet ({other - 273.15:.6g} degC) at the revamp conditions: the {side} side is "
                                    f"{verb}"))


def _economics(econ: UnitEconomics, capex: dict, capacity_flow, value_basis=None):
    """The study's Economics for one exchanger (None when the file gives no energy price and the exchanger's value
    basis needs one); ``value_basis`` is the exchanger's own, else the unit's, else fired fuel."""
    basis = value_basis or econ.value_basis or "fuel"
    if econ.energy_price is None and (basis == "fuel" or (econ.utility_price is None and econ.capacity_margin is None)):
        return None
    from ..economics import Economics

    fields = {"energy_price": None if econ.energy_price is None else econ.energy_price * 1e9, "price_per": "GJ",
              "currency": econ.currency, "capex": {k: v for k, v in capex.items() if v is not None},
              "value_basis": basis}
    if econ.utility_price is not None:
        fields["utility_price"] = econ.utility_price * 1e9
    if econ.heater_efficiency is not None:
        fields["efficiency"] = econ.heater_efficiency
    if econ.hours_per_year is not None:
        fields["operating_time"] = econ.hours_per_year * 3600.0
    if econ.discount_rate is not None:
        fields["discount_rate"] = econ.discount_rate
    if econ.horizon_years is not None:
        fields["horizon"] = econ.horizon_years
    if capacity_flow is not None and econ.capacity_margin is not None:
        fields.update(capacity_flow=capacity_flow, capacity_margin=econ.capacity_margin)
    return Economics(**fields)


def _tema_to_shell_type(geo: dict, where: str, problems: list) -> dict:
    """A copy of a geometry section with its ``tema_type`` (if any) read as ``shell_type``: the middle letter of a
    three-letter TEMA designation; any other designation is a problem at ``where.tema_type``."""
    from .. import geometry

    g = dict(geo)
    tema = g.pop("tema_type", None)
    if tema is not None:
        code = str(tema).strip().upper()
        if len(code) == 3 and code[1] in geometry.SHELL_TYPES:
            g["shell_type"] = code[1]
        else:
            problems.append(Problem(f"{where}.tema_type", str(tema), "must be a three-letter TEMA designation whose "
                                    f"shell letter (the middle one) is one of {', '.join(geometry.SHELL_TYPES)}"))
    return g


def _build_exchanger(i: int, x: dict, si: dict, base: Path, problems: list,
                     econ: UnitEconomics, refused=frozenset()) -> ExchangerCase | None:
    """The exchanger's model objects, or None when any of its inputs is wrong. An option that is wrong (``refused``:
    indices already refused by the earlier passes, or refused here) is left out and only its own problem recorded:
    the exchanger is still built, so that a batch may show that option's row as failed and rate the others."""
    from .. import geometry
    from .. import service as rating

    start, pre = len(problems), f"exchangers[{i}]"
    g = _tema_to_shell_type(si["geometry"], f"{pre}.geometry", problems)
    exchanger = _guard(problems, f"{pre}.geometry", lambda: geometry.ShellAndTube(**g, tag=x["tag"]))
    streams = {}
    for side in ("shell", "tube"):
        s = si[f"{side}_side"]
        kind = s["fluid"]["kind"]
        fluid = _guard(problems, f"{pre}.{side}_side.fluid", _build_fluid, s["fluid"],
                       field_of=lambda f, k=kind: f[len(k) + 1:] if f.startswith(k + ".") else f)
        if fluid is None:
            continue
        # evaluate the fluid once at its inlet: a liquid-only provider refuses a vapour here, with its reason
        if _fluid_at_inlet(problems, f"{pre}.{side}_side.t_in", fluid, s["t_in"]) is None:
            continue
        streams[side] = _guard(problems, f"{pre}.{side}_side", rating.Stream, fluid, s["flow"], s["t_in"])
    if len(problems) > start or None in streams.values():
        return None
    _bore_rule(exchanger, si["geometry"], f"{pre}.geometry", problems)
    service = _guard(problems, pre, lambda: rating.Service(
        shell=streams["shell"], tube=streams["tube"], fouling_shell=si["shell_side"].get("fouling", 0.0),
        fouling_tube=si["tube_side"].get("fouling", 0.0)))
    rv = si.get("revamp") or {}
    throughput = float(rv.get("throughput", 1.0))
    revamp_service = service
    if service is not None and rv:
        def revamped():
            svc = service.scaled(throughput=throughput, side=rv.get("side", "both")) if "throughput" in rv else service
            flows, t_ins = rv.get("flows", {}), rv.get("t_in", {})
            changes = {}
            for side in ("shell", "tube"):
                stream = getattr(svc, side)
                upd = {k: v for k, v in (("flow", flows.get(side)), ("t_in", t_ins.get(side))) if v is not None}
                changes[side] = stream.replace(**upd) if upd else stream
            return svc.replace(**changes)
        revamp_service = _guard(problems, f"{pre}.revamp", revamped)
    for svc, where in ((service, f"{pre}.tube_side.t_in"), (revamp_service, f"{pre}.revamp.t_in")):
        if svc is not None and _inlets_rule(svc, where, problems):
            break
    if revamp_service is not None:
        _target_rule(rv.get("target") or {}, revamp_service, f"{pre}.revamp.target", problems)
    opts, capex, labels = [], {}, {}
    for j, spec in enumerate(si.get("options") or []):
        if j in refused:
            continue
        obj = _guard(problems, f"{pre}.options[{j}]", _build_option, spec)
        if obj is None:
            continue
        label = _option_label(obj, spec, j)
        where = f"{pre}.options[{j}]" + (".label" if "label" in spec else "")
        if label in labels:
            # a dict of capex by label would silently keep the second figure: refuse the repeat by its place
            problems.append(Problem(where, label, f"must be distinct from the label of {pre}.options[{labels[label]}] "
                                                  "(give each option its own 'label')"))
            continue
        if label.strip().lower() in RESERVED_LABELS:
            problems.append(Problem(where, label, f"must not be one of the study's own rows "
                                                  f"({', '.join(sorted(RESERVED_LABELS))})"))
            continue
        labels[label] = j
        # apply it once to the exchanger and the revamp service (no rating): what the study would refuse,
        # check refuses first (a pitch below the tube od, an insert thicker than the bore, a bad material)
        if exchanger is not None and revamp_service is not None:
            before = len(problems)
            applied = _guard(problems, f"{pre}.options[{j}]", obj.apply, exchanger, revamp_service,
                             field_of=_option_field)
            if applied is not None:  # a new bundle or a retube may leave too small a bore
                _bore_rule(applied[0], {k: spec[k] for k in ("tube_wall",) if k in spec}, f"{pre}.options[{j}]",
                           problems)
            if len(problems) > before:
                continue
        opts.append(obj)
        capex[label] = spec.get("capex")
    plant = None
    if "plant_data" in si:
        pd = si["plant_data"]
        full, _ = _safe_file(pd["file"], base)
        cols = {}
        for std in STANDARD_COLUMNS:
            spec = (pd.get("columns") or {}).get(std, std)
            cols[std] = (spec, None) if isinstance(spec, str) else (spec["column"], spec.get("unit"))
        plant = PlantData(file=full, columns=cols, uncertainty=dict(pd.get("uncertainty") or {}),
                          fouling_side=pd.get("fouling_side"), run_length=pd.get("run_length"),
                          cleaning_downtime=pd.get("cleaning_downtime"),
                          dialect={k: pd[k] for k in DIALECT_KEYS if k in pd}, steady=pd.get("steady"),
                          cleanings=tuple(pd["cleanings"]) if "cleanings" in pd else None,
                          drift_tolerance=pd.get("drift_tolerance"))
    economics = _guard(problems, f"{pre}.options", _economics, econ, capex, rv.get("capacity_flow"),
                       si.get("value_basis"))
    if any(not OPTION_PATH.match(p.path) for p in problems[start:]):
        return None
    limits = {f"dp_{side}": si[f"{side}_side"]["dp_allowed"] for side in ("shell", "tube")
              if "dp_allowed" in si[f"{side}_side"]}
    limits.update(si.get("limits") or {})
    cycle, cycle_from = _cycle_fields(i, si, econ)
    return ExchangerCase(index=i, tag=x["tag"], description=x.get("description", ""), exchanger=exchanger,
                         service=service, revamp_service=revamp_service, throughput=throughput,
                         target=dict(rv.get("target") or {}), limits=limits, options=tuple(opts), capex=capex,
                         plant_data=plant, economics=economics, **cycle, cycle_from=cycle_from, raw=x,
                         rank_by=econ.rank_by, judge_on=econ.judge_on)


def _cycle_fields(i: int, si: dict, econ: UnitEconomics):
    """The fouling side, run length and cleaning downtime the file gives this exchanger (its ``plant_data`` first,
    then the unit's ``economics``), and the path each came from; None where the file says nothing."""
    pd = si.get("plant_data") or {}
    values, where = {"fouling_side": pd.get("fouling_side")}, {}
    if values["fouling_side"] is not None:
        where["fouling_side"] = f"exchangers[{i}].plant_data.fouling_side"
    for name in ("run_length", "cleaning_downtime"):
        if pd.get(name) is not None:
            values[name], where[name] = float(pd[name]), f"exchangers[{i}].plant_data.{name}"
        elif getattr(econ, name) is not None:
            values[name], where[name] = float(getattr(econ, name)), f"economics.{name}"
        else:
            values[name] = None
    if si.get("value_basis") is not None:
        where["value_basis"] = f"exchangers[{i}].value_basis"
    elif econ.value_basis is not None:
        where["value_basis"] = "economics.value_basis"
    return values, where


