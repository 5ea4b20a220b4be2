"""Passes 1-3 of the check: YAML (safe loader only), structure (the JSON schema), quantities (units and bounds).

Each pass returns :class:`Problem` objects naming the path; nothing here builds a model or computes anything.
"""
from __future__ import annotations

import json
import re
from functools import lru_cache

import yaml

from ..errors import InputError
from ..units import to_si, ureg
from ._model import SCHEMA_PATH, Problem


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


