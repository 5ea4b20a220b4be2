"""The unit file: a YAML description of a process unit's exchangers, validated before anything is computed.

The format is documented in ``docs/unit-file.md``; its machine-readable form is ``revamp/unit_schema.json``
(JSON Schema 2020-12, with ``x-kind`` annotations naming the quantity kind of every field that carries a unit).

Two entry points:

* :func:`check` lists **every** problem in a file, each with its path (``exchangers[2].tube_side.flow: -5 kg/s:
  must be > 0``). It never raises on a bad file and never runs a rating.
* :func:`load` returns a :class:`Unit` (model objects ready for :func:`revamp.rate` and :func:`revamp.compare`), or
  raises :class:`UnitFileError` carrying the same list of problems.

Validation runs in four passes: YAML (safe loader only: object tags are refused, duplicate keys reported),
structure (the JSON schema), quantities (every ``x-kind`` field converted with :func:`revamp.units.to_si` and
checked against its bounds), then cross-field rules, file paths and the model constructors, whose
:class:`~revamp.errors.InputError` are turned into problems with the full path in front.
"""
from __future__ import annotations

import csv
import hashlib
import inspect
import json
import re
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any

import yaml

from .errors import InputError


def _import_jsonschema():
    """Import jsonschema without its optional IRI format checker: we use no ``format`` keyword, and that checker
    builds a grammar at import that costs over a second in every notebook kernel and CLI call."""
    import sys

    blocked = "rfc3987_syntax" not in sys.modules
    if blocked:
        sys.modules["rfc3987_syntax"] = None  # makes its import fail, which jsonschema tolerates
    try:
        import jsonschema as module
    finally:
        if blocked and sys.modules.get("rfc3987_syntax", 0) is None:
            del sys.modules["rfc3987_syntax"]
    return module


jsonschema = _import_jsonschema()
from .units import to_si, ureg

__all__ = [
    "STANDARD_COLUMNS",
    "ExchangerCase",
    "PlantData",
    "Problem",
    "Unit",
    "UnitEconomics",
    "UnitFileError",
    "check",
    "load",
    "load_partial",
    "schema",
]

SCHEMA_PATH = Path(__file__).with_name("unit_schema.json")
#: the plant-data columns :func:`revamp.monitor` reads, and the quantity kind of each
STANDARD_COLUMNS = {"timestamp": None, "shell_flow": "mass_flow", "shell_t_in": "temperature",
                    "shell_t_out": "temperature", "tube_flow": "mass_flow", "tube_t_in": "temperature",
                    "tube_t_out": "temperature"}


# ------------------------------------------------------------------------------------------------------------ results
@dataclass(frozen=True)
class Problem:
    """One thing wrong with a unit file: where (``path``), what was given (``value``) and what is allowed.

    >>> str(Problem("exchangers[2].tube_side.flow", "-5 kg/s", "must be > 0"))
    'exchangers[2].tube_side.flow: -5 kg/s: must be > 0'
    """

    path: str
    value: str
    message: str

    def __str__(self) -> str:
        return f"{self.path}: {self.value}: {self.message}"


class UnitFileError(InputError):
    """A unit file with problems; ``problems`` lists them all, ``str()`` shows them one per line."""

    def __init__(self, path, problems):
        self.problems = list(problems)
        text = "\n".join(str(p) for p in self.problems)
        ValueError.__init__(self, f"{path}: {len(self.problems)} problem(s)\n{text}")
        self.field, self.value, self.allowed = str(path), None, "a valid unit file"


@dataclass(frozen=True)
class UnitEconomics:
    """The unit's economic inputs in plain numbers (money in ``currency``)."""

    currency: str = "USD"
    energy_price: float | None = None      #: [currency/J] fired-heater fuel
    heater_efficiency: float | None = None  #: [-]
    hours_per_year: float | None = None     #: [h/yr]
    discount_rate: float | None = None      #: [-/yr]
    horizon_years: float | None = None      #: [yr]
    capacity_margin: float | None = None    #: [currency/kg]
    cleaning_cost: float | None = None      #: [currency]


@dataclass(frozen=True)
class PlantData:
    """Where an exchanger's plant data is and how its columns map onto the standard names."""

    file: Path
    columns: dict           #: standard name -> (CSV column, unit or None)
    uncertainty: dict       #: {"flow": relative [-], "temperature": absolute [K]} (keys present if given)


@dataclass(frozen=True)
class ExchangerCase:
    """One exchanger of a unit file, with its model objects built.

    ``service`` is today's service; ``revamp_service`` the service at the revamp conditions (today's if the file gives
    none); ``target`` a dict with one of ``duty`` [W], ``t_out_shell``/``t_out_tube`` [K], ``UA`` [W/K] (empty if
    none); ``limits`` the screening limits given in the file (``dp_shell``, ``dp_tube`` [Pa] from each side's
    ``dp_allowed``, and the ``limits`` section's fields, as :class:`revamp.screening.Limits` takes them); ``options``
    the option objects in file order, ``capex`` a dict option label -> capex [currency]; ``economics`` the
    :class:`revamp.economics.Economics` of its study (None when the file gives no energy price).
    """

    index: int
    tag: str
    description: str
    exchanger: Any
    service: Any
    revamp_service: Any
    throughput: float
    target: dict
    limits: dict
    options: tuple
    capex: dict
    plant_data: PlantData | None
    economics: Any = None
    raw: dict = field(repr=False, default_factory=dict)


@dataclass(frozen=True)
class Unit:
    """A loaded unit file: name, economics and exchangers; ``sha256`` is the hash of the file's bytes."""

    name: str
    description: str
    path: Path
    sha256: str
    economics: UnitEconomics
    exchangers: tuple
    raw: dict = field(repr=False, default_factory=dict)

    @property
    def tags(self) -> list[str]:
        return [x.tag for x in self.exchangers]

    def exchanger(self, tag: str) -> ExchangerCase:
        """The exchanger with this tag (InputError listing the tags otherwise)."""
        for x in self.exchangers:
            if x.tag == tag:
                return x
        raise InputError("tag", tag, f"one of the unit's tags: {', '.join(self.tags)}")


# --------------------------------------------------------------------------------------------------------- pass 1: YAML
class _Loader(yaml.SafeLoader):
    """The safe loader, plus a check for duplicated keys (silently last-wins in plain YAML)."""


def _construct_mapping(loader, node, deep=False):
    seen = {}
    for key_node, _ in node.value:
        key = loader.construct_object(key_node, deep=True)
        if key in seen:
            loader.duplicates.append((key, key_node.start_mark.line + 1))
        seen[key] = True
    return yaml.SafeLoader.construct_mapping(loader, node, deep)


_Loader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_MAPPING_TAG, _construct_mapping)


def _read_yaml(text: str):
    loader = _Loader(text)
    loader.duplicates = []
    try:
        doc = loader.get_single_data()
    except yaml.constructor.ConstructorError as exc:
        line = exc.problem_mark.line + 1 if exc.problem_mark else "?"
        tag = re.search(r"tag '([^']*)'", str(exc.problem))
        shown = tag.group(1) if tag else str(exc.problem)
        return None, [Problem(f"(line {line})", shown, "must be plain YAML (mappings, lists, strings, numbers): "
                                                      "object and other tags are refused")]
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        line = mark.line + 1 if mark else "?"
        return None, [Problem(f"(line {line})", str(getattr(exc, "problem", exc)), "must be valid YAML")]
    finally:
        loader.dispose()
    return doc, [Problem(f"(line {line})", repr(k), "must not repeat a key in the same mapping")
                 for k, line in loader.duplicates]


# ---------------------------------------------------------------------------------------------------- pass 2: schema
@lru_cache(maxsize=1)
def schema() -> dict:
    """The unit file's JSON schema (a dict)."""
    return json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))


def _path(parts) -> str:
    out = ""
    for p in parts:
        out += f"[{p}]" if isinstance(p, int) else (f".{p}" if out else str(p))
    return out or "(file)"


def _show(value) -> str:
    if isinstance(value, str):
        return value if len(value) <= 60 else value[:57] + "..."
    if isinstance(value, (dict, list)):
        return {dict: "(a mapping)", list: "(a list)"}[type(value)]
    return "null" if value is None else str(value).lower() if isinstance(value, bool) else repr(value)


_TYPE_WORDS = {"number": "a number", "string": "a text string", "integer": "an integer", "object": "a mapping",
               "array": "a list", "boolean": "true or false", "null": "null"}


def _schema_problems(doc) -> list[Problem]:
    validator = jsonschema.Draft202012Validator(schema())
    out = []
    for err in validator.iter_errors(doc):
        out.extend(_explain(err))
    return out


def _explain(err) -> list[Problem]:
    parts, v, sch = list(err.absolute_path), err.instance, err.schema
    kind = err.validator
    if kind == "required":
        name = re.match(r"'([^']*)'", err.message)
        name = name.group(1) if name else err.message
        return [Problem(_path(parts + [name]), "(missing)", "must be given")]
    if kind == "additionalProperties":
        known = set(sch.get("properties", {}))
        return [Problem(_path(parts + [k]), _show(v[k]), f"is not a known field here (known: {', '.join(sorted(known))})")
                for k in v if k not in known]
    if kind == "type":
        want = sch["type"] if isinstance(sch["type"], list) else [sch["type"]]
        if set(want) == {"number", "string"}:
            words = "a number (SI) or a string with a unit"
        else:
            words = " or ".join(_TYPE_WORDS.get(t, t) for t in want)
        return [Problem(_path(parts), _show(v), f"must be {words}")]
    if kind == "enum":
        return [Problem(_path(parts), _show(v), f"must be one of: {', '.join(map(str, sch['enum']))}")]
    if kind == "const":
        return [Problem(_path(parts), _show(v), f"must be {sch['const']!r}")]
    if kind in ("minItems", "maxItems"):
        return [Problem(_path(parts), f"{len(v)} item(s)", f"must have {'at least' if kind == 'minItems' else 'at most'} "
                                                           f"{sch[kind]} item(s)")]
    if kind in ("minimum", "maximum", "exclusiveMinimum", "exclusiveMaximum"):
        op = {"minimum": ">=", "maximum": "<=", "exclusiveMinimum": ">", "exclusiveMaximum": "<"}[kind]
        return [Problem(_path(parts), _show(v), f"must be {op} {sch[kind]}")]
    if kind == "minLength":
        return [Problem(_path(parts), _show(v), "must not be empty")]
    if kind == "maxLength":
        return [Problem(_path(parts), _show(v), f"must be at most {sch['maxLength']} characters")]
    if kind == "pattern":
        return [Problem(_path(parts), _show(v), "must be a 3-letter currency code such as USD or EUR")]
    if kind in ("minProperties", "maxProperties"):
        words = sch.get("description") or f"{kind} {sch[kind]}"
        return [Problem(_path(parts), f"{len(v)} field(s)", f"must have {words[0].lower() + words[1:]}")]
    if kind == "oneOf":
        return [Problem(_path(parts), _show(v), "must be a column name or a mapping {column: ..., unit: ...}")]
    return [Problem(_path(parts), _show(v), err.message)]  # pragma: no cover - a validator we do not use


# ------------------------------------------------------------------------------------------------ pass 3: quantities
_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"


def _convert(value, kind: str, where: str, currency: str):
    """A user value of ``kind`` to SI (or to the unit's money for money kinds). Raises InputError."""
    if isinstance(value, str):
        try:  # YAML reads '2.5e5' as a string: a plain number is a number
            value = float(value)
        except ValueError:
            pass
    if kind == "money":
        if isinstance(value, (int, float)):
            return float(value)
        m = re.fullmatch(rf"\s*({_NUMBER})\s*([A-Za-z]{{3}})?\s*", value)
        if not m or (m.group(2) and m.group(2).upper() != currency):
            raise InputError(where, value, f"an amount: a number or '<number> {currency}' (the unit's currency)")
        return float(m.group(1))
    if kind == "energy_price":
        if isinstance(value, (int, float)):
            return float(value)
        m = re.fullmatch(rf"\s*({_NUMBER})\s*([A-Za-z]{{3}})?\s*/\s*(.+?)\s*", value)
        if not m or (m.group(2) and m.group(2).upper() != currency):
            raise InputError(where, value, f"a price per energy, e.g. '8 {currency}/GJ' or '9 /MMBTU'")
        joules = to_si("1 " + m.group(3), "energy", where)
        return float(m.group(1)) / joules
    if kind == "money_per_mass":
        if isinstance(value, (int, float)):
            return float(value)
        m = re.fullmatch(rf"\s*({_NUMBER})\s*([A-Za-z]{{3}})?\s*/\s*(.+?)\s*", value)
        if not m or (m.group(2) and m.group(2).upper() != currency):
            raise InputError(where, value, f"a price per mass, e.g. '5 {currency}/t' or '2 {currency}/kg'")
        try:
            kg = float(ureg.Quantity(1.0, m.group(3)).to("kg").magnitude)
        except Exception:
            raise InputError(where, value, f"a price per mass, e.g. '5 {currency}/t' or '2 {currency}/kg'") from None
        return float(m.group(1)) / kg
    if kind == "thermal_conductance":
        if isinstance(value, (int, float)):
            return float(value)
        try:
            return float(ureg.Quantity(value).to("W/K").magnitude)
        except Exception:
            raise InputError(where, value, "a thermal conductance U·A (W/K, or e.g. '150 kW/K')") from None
    return to_si(value, kind, where)


_SI_LABEL = {"temperature": "K", "temperature_difference": "K", "length": "m", "mass_flow": "kg/s", "pressure": "Pa",
             "power": "W", "fouling": "m²·K/W", "time": "s", "kinematic_viscosity": "m²/s", "viscosity": "Pa·s",
             "density": "kg/m³", "heat_capacity": "J/kg·K", "conductivity": "W/m·K", "thermal_conductance": "W/K",
             "energy_price": "per J"}


def _bounds(si, sch, kind) -> str | None:
    ops = [("x-gt", ">", lambda a, b: a > b), ("x-ge", ">=", lambda a, b: a >= b),
           ("x-lt", "<", lambda a, b: a < b), ("x-le", "<=", lambda a, b: a <= b)]
    bad = [f"{sym} {sch[key]:g}" for key, sym, ok in ops if key in sch and not ok(si, sch[key])]
    if not bad:
        return None
    allowed = " and ".join(f"{sym} {sch[key]:g}" for key, sym, _ in ops if key in sch)
    return f"must be {allowed}" + (f" {_SI_LABEL[kind]}" if kind in _SI_LABEL else "")


def _resolve(sch: dict) -> dict:
    while "$ref" in sch:
        target = schema()
        for part in sch["$ref"].lstrip("#/").split("/"):
            target = target[part]
        sch = {**target, **{k: v for k, v in sch.items() if k != "$ref"}}
    return sch


def _walk(node, sch, parts, currency, problems):
    """Return ``node`` with every ``x-kind`` leaf converted to SI; record conversion and bound problems."""
    sch = _resolve(sch) if isinstance(sch, dict) else {}
    kind = sch.get("x-kind")
    if kind is not None:
        if isinstance(node, bool) or not isinstance(node, (int, float, str)):
            return node  # the schema pass reported the type
        try:
            si = _convert(node, kind, _path(parts), currency)
        except InputError as exc:
            problems.append(Problem(_path(parts), _show(node), f"must be {exc.allowed.split('; ')[0]}"))
            return None
        msg = _bounds(si, sch, kind)
        if msg:
            problems.append(Problem(_path(parts), _show(node), msg))
        return si
    if isinstance(node, dict):
        props = dict(sch.get("properties", {}))
        for branch in sch.get("allOf", []):
            if "if" in branch and jsonschema.Draft202012Validator(branch["if"]).is_valid(node):
                props.update({k: s for k, s in branch["then"].get("properties", {}).items() if isinstance(s, dict)})
        return {k: (_walk(v, props[k], parts + [k], currency, problems) if isinstance(props.get(k), dict) else v)
                for k, v in node.items()}
    if isinstance(node, list):
        prefix, items = sch.get("prefixItems", []), sch.get("items")
        out = []
        for i, v in enumerate(node):
            sub = prefix[i] if i < len(prefix) else items
            out.append(_walk(v, sub, parts + [i], currency, problems) if isinstance(sub, dict) else v)
        return out
    return node


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


def _plant_data_rules(pd: dict, parts: list, base: Path) -> list[Problem]:
    full, reason = _safe_file(pd["file"], base)
    if reason:
        return [Problem(_path(parts + ["file"]), pd["file"], reason)]
    out = []
    try:
        with open(full, newline="", encoding="utf-8") as fh:
            header = next(csv.reader(fh), [])
    except (OSError, UnicodeDecodeError) as exc:
        return [Problem(_path(parts + ["file"]), pd["file"], f"must be a readable UTF-8 CSV file ({exc.__class__.__name__})")]
    header = [h.strip() for h in header]
    cols = pd.get("columns") if isinstance(pd.get("columns"), dict) else {}
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
    from . import options as opt_mod

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
    from . import fluids

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
    from .economics import Economics

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
    from . import geometry
    from . import service as rating

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
        plant = PlantData(file=full, columns=cols, uncertainty=dict(pd.get("uncertainty") or {}))
    economics = _guard(problems, f"{pre}.options", _economics, econ, capex, rv.get("capacity_flow"))
    if len(problems) > start:
        return None
    limits = {f"dp_{side}": si[f"{side}_side"]["dp_allowed"] for side in ("shell", "tube")
              if "dp_allowed" in si[f"{side}_side"]}
    limits.update(si.get("limits") or {})
    return ExchangerCase(index=i, tag=x["tag"], description=x.get("description", ""), exchanger=exchanger,
                         service=service, revamp_service=revamp_service, throughput=throughput,
                         target=dict(rv.get("target") or {}), limits=limits, options=tuple(opts), capex=capex,
                         plant_data=plant, economics=economics, raw=x)


# -------------------------------------------------------------------------------------------------------- entry points
def _sorted(problems):
    """File order: by path, numbers compared as numbers (exchangers[2] before exchangers[10])."""
    key = lambda p: [int(t) if t.isdigit() else t for t in re.split(r"(\d+)", p.path)]
    return sorted(problems, key=key)


def _validate(path, build: bool, only=None):
    path = Path(path)
    try:
        data = path.read_bytes()
    except OSError as exc:
        return None, [Problem(str(path), "(file)", f"must be a readable file ({exc.strerror or exc})")]
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        return None, [Problem(str(path), "(file)", "must be UTF-8 text")]
    doc, problems = _read_yaml(text)
    if doc is None and not problems:
        problems = [Problem("(file)", "(empty)", "must hold a unit: a mapping with 'unit' and 'exchangers'")]
    if problems and doc is None:
        return None, problems
    problems += _schema_problems(doc)
    if not isinstance(doc, dict):
        return None, _sorted(problems)
    econ = doc.get("economics") if isinstance(doc.get("economics"), dict) else {}
    currency = econ.get("currency") if isinstance(econ.get("currency"), str) else "USD"
    quantity_problems = []
    si = _walk(doc, schema(), [], currency, quantity_problems)
    # one line per place: a field the schema already refused is not reported twice
    seen = {p.path for p in problems}
    problems += [p for p in quantity_problems if p.path not in seen]
    base, tags = path.resolve().parent, {}
    exchangers = doc.get("exchangers") if isinstance(doc.get("exchangers"), list) else []
    for i, x in enumerate(exchangers):
        if isinstance(x, dict):
            problems += _exchanger_rules(x, ["exchangers", i], base, tags)
    if not build or any(not _owned([p], None) for p in problems):  # the unit as a whole is wrong: build nothing
        return None, _sorted(problems)
    e = si.get("economics") or {}
    econ = UnitEconomics(
        currency=currency, energy_price=e.get("energy_price"), heater_efficiency=e.get("heater_efficiency"),
        hours_per_year=e["hours_per_year"] / 3600.0 if "hours_per_year" in e else None,
        discount_rate=e.get("discount_rate"),
        horizon_years=e["horizon"] / (365.25 * 86400.0) if "horizon" in e else None,
        capacity_margin=e.get("capacity_margin"), cleaning_cost=e.get("cleaning_cost"))
    built = []
    for i, x in enumerate(exchangers):
        if _owned(problems, i) or not isinstance(x, dict) or (only is not None and x.get("tag") not in only):
            continue  # never build (let alone rate) an exchanger whose inputs are already known to be wrong
        case = _build_exchanger(i, x, si["exchangers"][i], base, problems, econ)
        if case is not None:
            built.append(case)
    problems = [_as_written(p, doc) for p in problems]
    unit = Unit(name=doc["unit"]["name"], description=doc["unit"].get("description", ""), path=path.resolve(),
                sha256=hashlib.sha256(data).hexdigest(), economics=econ, exchangers=tuple(built), raw=doc)
    return unit, _sorted(problems)


def _as_written(problem: Problem, doc) -> Problem:
    """Show a model constructor's complaint with the value as the user wrote it (``12 mm``, not ``0.012``)."""
    node = doc
    for name, index in re.findall(r"([A-Za-z_][\w]*)|\[(\d+)\]", problem.path):
        try:
            node = node[int(index)] if index else node[name]
        except (KeyError, IndexError, TypeError, ValueError):
            return problem
    if isinstance(node, (str, int, float)) and not isinstance(node, bool):
        return Problem(problem.path, _show(node), problem.message)
    return problem


def _owned(problems, i) -> bool:
    """Whether any problem lies inside ``exchangers[i]`` (any exchanger when ``i`` is None)."""
    pattern = re.compile(r"^exchangers\[\d+\]" if i is None else rf"^exchangers\[{i}\](?:$|[.\[])")
    return any(pattern.match(p.path) for p in problems)


def _entries(unit_or_doc) -> list[tuple[str, int]]:
    exchangers = unit_or_doc.get("exchangers") if isinstance(unit_or_doc, dict) else None
    out = []
    for i, x in enumerate(exchangers if isinstance(exchangers, list) else []):
        tag = x.get("tag") if isinstance(x, dict) else None
        out.append((tag if isinstance(tag, str) and tag else f"exchangers[{i}]", i))
    return out


def load_partial(path, only=None):
    """Load what is valid: ``(unit, problems, entries)``.

    ``unit`` holds the exchangers without problems (``None`` when the file has problems outside its exchangers,
    e.g. bad YAML or economics); ``problems`` lists every problem; ``entries`` is ``(tag, index)`` for every exchanger
    of the file in order (an exchanger without a usable tag is named ``exchangers[i]``). The batch uses this so that
    one broken exchanger never stops the others. ``only``: tags to build (the others are still checked, not built).
    """
    unit, problems = _validate(path, build=True, only=set(only) if only is not None else None)
    return unit, problems, _entries(unit.raw if unit is not None else {})


def check(path) -> list[Problem]:
    """Every problem in the unit file at ``path`` (an empty list when it is valid).

    Builds the model objects (geometry, fluids, streams, options) to let their own checks speak, but never rates.
    Never raises on a bad file.
    """
    return _validate(path, build=True)[1]


def load(path) -> Unit:
    """Load and validate a unit file.

    Raises
    ------
    UnitFileError
        With every problem (``.problems``), when the file is not valid.
    """
    unit, problems = _validate(path, build=True)
    if problems:
        raise UnitFileError(path, problems)
    return unit
