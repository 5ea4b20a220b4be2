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
    p = Path(text)
    if p.is_absolute() or re.match(r"^[A-Za-z]:[\\/]", text) or text.startswith("~"):
        return None, "must be a path relative to the unit file's folder"
    full = (base / p).resolve()
    try:
        full.relative_to(base.resolve())
    except ValueError:
        return None, "must stay inside the unit file's folder (no '..' out of it, no link out of it)"
    if not full.is_file():
        return None, f"must be an existing file (looked for {full.relative_to(base.resolve())})"
    return full, None


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
        with open(full, newline="", encoding="utf-8-sig") as fh:
            lines = [line.rstrip("\r\n") for _, line in zip(range(6), fh)]
    except (OSError, UnicodeDecodeError) as exc:
        return [Problem(_path(parts + ["file"]), pd["file"], f"must be a readable UTF-8 CSV file ({exc.__class__.__name__})")]
    header = next(csv.reader(lines[:1], delimiter=dialect.get("delimiter", ",")), [])
    header = [h.strip() for h in header]
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
        if unit is not None and kind is not None:
            try:
                _convert(f"1 {unit}", kind, "unit", "USD")
            except InputError as exc:
                out.append(Problem(_path(parts + ["columns", std, "unit"]), unit, f"must be the unit of {exc.allowed}"))
        elif unit is not None:
            out.append(Problem(_path(parts + ["columns", std, "unit"]), unit, "must not be given for the timestamp"))
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
    if spec["kind"] == "pure":
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


def _economics(econ: UnitEconomics, capex: dict, capacity_flow):
    """The study's Economics for one exchanger (None when the file gives no energy price)."""
    if econ.energy_price is None:
        return None
    from ..economics import Economics

    fields = {"energy_price": econ.energy_price * 1e9, "price_per": "GJ", "currency": econ.currency,
              "capex": {k: v for k, v in capex.items() if v is not None}}
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


def _build_exchanger(i: int, x: dict, si: dict, base: Path, problems: list,
                     econ: UnitEconomics) -> ExchangerCase | None:
    from .. import geometry
    from .. import service as rating

    start, pre = len(problems), f"exchangers[{i}]"
    g = dict(si["geometry"])
    g.pop("tema_type", None)
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
        if _guard(problems, f"{pre}.{side}_side.t_in", fluid.props, s["t_in"], field_of=lambda f: "") is None:
            continue
        streams[side] = _guard(problems, f"{pre}.{side}_side", rating.Stream, fluid, s["flow"], s["t_in"])
    if len(problems) > start or None in streams.values():
        return None
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
    opts, capex = [], {}
    for j, spec in enumerate(si.get("options") or []):
        obj = _guard(problems, f"{pre}.options[{j}]", _build_option, spec)
        if obj is not None:
            opts.append(obj)
            capex[_option_label(obj, spec, j)] = spec.get("capex")
    labels = list(capex)
    for label in {lab for lab in labels if labels.count(lab) > 1}:
        problems.append(Problem(f"{pre}.options", label, "must have distinct labels (give each a 'label')"))
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
    economics = _guard(problems, f"{pre}.options", _economics, econ, capex, rv.get("capacity_flow"))
    if len(problems) > start:
        return None
    limits = {f"dp_{side}": si[f"{side}_side"]["dp_allowed"] for side in ("shell", "tube")
              if "dp_allowed" in si[f"{side}_side"]}
    limits.update(si.get("limits") or {})
    cycle, cycle_from = _cycle_fields(i, si, econ)
    return ExchangerCase(index=i, tag=x["tag"], description=x.get("description", ""), exchanger=exchanger,
                         service=service, revamp_service=revamp_service, throughput=throughput,
                         target=dict(rv.get("target") or {}), limits=limits, options=tuple(opts), capex=capex,
                         plant_data=plant, economics=economics, **cycle, cycle_from=cycle_from, raw=x)


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
    return values, where


