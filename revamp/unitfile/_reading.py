"""Passes 1-3 of the check: YAML (safe loader only), structure (the JSON schema), quantities (units and bounds).

Each pass returns :class:`Problem` objects naming the path; nothing here builds a model or computes anything.
"""
from __future__ import annotations

import json
import math
import re
from functools import lru_cache

import yaml

from ..errors import InputError, printable
from ..units import to_si
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
#: the largest unit file read [bytes] (the demo unit is under 10 kB)
MAX_FILE_BYTES = 2 * 1024 * 1024
#: the deepest nesting of mappings and lists (a unit file needs about 10; combined options add 2 per level)
MAX_DEPTH = 32
#: the most values a file may hold once its YAML aliases are expanded (a 100-exchanger unit holds about 10,000)
MAX_NODES = 50_000


def _read_file(path):
    """The bytes of a unit file, or ``(None, reason)``: only a regular file of at most :data:`MAX_FILE_BYTES` is
    read. It is opened without blocking (a FIFO would otherwise wait for a writer forever) and checked with fstat
    before anything is read (``/dev/zero`` or ``/dev/urandom`` would never end)."""
    import os
    import stat

    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except (OSError, ValueError) as exc:  # ValueError: a NUL in the path
        return None, f"must be a readable file ({getattr(exc, 'strerror', None) or exc})"
    try:
        st = os.fstat(fd)
        if not stat.S_ISREG(st.st_mode):
            return None, "must be a regular file (not a folder, pipe or device)"
        if st.st_size > MAX_FILE_BYTES:
            return None, f"must be at most {MAX_FILE_BYTES // 1024} KiB (it has {st.st_size // 1024} KiB)"
        chunks, size = [], 0
        while size <= MAX_FILE_BYTES:
            chunk = os.read(fd, 1 << 16)
            if not chunk:
                break
            chunks.append(chunk)
            size += len(chunk)
        if size > MAX_FILE_BYTES:
            return None, f"must be at most {MAX_FILE_BYTES // 1024} KiB"
        return b"".join(chunks), None
    except OSError as exc:
        return None, f"must be a readable file ({exc.strerror or exc})"
    finally:
        os.close(fd)


# libyaml (the C parser) when PyYAML was built with it: the same safe constructor, a parser several times faster
_SafeBase = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


class _Loader(_SafeBase):
    """The safe loader, plus a check for duplicated keys (silently last-wins in plain YAML) and for keys that are
    not text (a list as a key, ``1:``, ``null:``)."""


def _construct_mapping(loader, node, deep=False):
    seen = {}
    for key_node, _ in node.value:
        key = loader.construct_object(key_node, deep=True)
        if not isinstance(key, str):
            loader.bad_keys.append((key, key_node.start_mark.line + 1))
            continue
        if key in seen:
            loader.duplicates.append((key, key_node.start_mark.line + 1))
        seen[key] = True
    if loader.bad_keys:
        return {}
    return yaml.constructor.SafeConstructor.construct_mapping(loader, node, deep)


_Loader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_MAPPING_TAG, _construct_mapping)


class _TooBig(Exception):
    def __init__(self, line, value, message):
        super().__init__(message)
        self.problem = Problem(f"(line {line})", value, message)


def _check_depth(text: str):
    """Walk the YAML events (the parser is not recursive) and refuse nesting deeper than :data:`MAX_DEPTH` before
    the recursive composer could overflow the stack."""
    depth = 0
    for event in yaml.parse(text, Loader=_SafeBase):
        if isinstance(event, yaml.CollectionStartEvent):
            depth += 1
            if depth > MAX_DEPTH:
                raise _TooBig(event.start_mark.line + 1, f"{depth} levels",
                              f"must nest mappings and lists at most {MAX_DEPTH} levels deep")
        elif isinstance(event, yaml.CollectionEndEvent):
            depth -= 1


def _check_size(node):
    """Count the values of the document with its aliases expanded (each node counted once per use, memoized, so
    that the count itself stays linear) and its nesting depth through aliases (``&a1 [*a0]``, ``&a2 [*a1]``...
    nests without nesting in the text); refuse an alias that contains itself, more than :data:`MAX_NODES` values
    and more than :data:`MAX_DEPTH` levels. Anchors precede their aliases in the text, and the walk follows the
    text, so an alias always meets a node already counted: the walk itself recurses only as deep as the text."""
    memo, active = {}, set()

    def measure(n):
        key = id(n)
        if key in memo:
            return memo[key]
        if key in active:
            raise _TooBig(n.start_mark.line + 1, "(an alias)", "must not contain itself (a recursive alias)")
        active.add(key)
        if isinstance(n, yaml.SequenceNode):
            parts = [measure(c) for c in n.value]
        elif isinstance(n, yaml.MappingNode):
            parts = [measure(c) for pair in n.value for c in pair]
        else:
            parts = None
        active.discard(key)
        if parts is None:
            size, depth = 1, 0
        else:
            size, depth = 1 + sum(p[0] for p in parts), 1 + max((p[1] for p in parts), default=0)
        if depth > MAX_DEPTH:
            raise _TooBig(n.start_mark.line + 1, f"{depth} levels", f"must nest mappings and lists at most "
                                                                   f"{MAX_DEPTH} levels deep (aliases included)")
        memo[key] = out = (min(size, MAX_NODES + 1), depth)
        return out

    if node is not None and measure(node)[0] > MAX_NODES:
        raise _TooBig(1, "(the whole file)", f"must hold at most {MAX_NODES:,} values once its aliases are expanded")


def _read_yaml(text: str):
    loader = None
    try:
        _check_depth(text)
        loader = _Loader(text)
        loader.duplicates, loader.bad_keys = [], []
        node = loader.get_single_node()
        _check_size(node)
        doc = loader.construct_document(node) if node is not None else None
    except _TooBig as exc:
        return None, [exc.problem]
    except yaml.constructor.ConstructorError as exc:
        line = exc.problem_mark.line + 1 if exc.problem_mark else "?"
        tag = re.search(r"tag '([^']*)'", str(exc.problem))
        shown = tag.group(1) if tag else str(exc.problem)
        return None, [Problem(f"(line {line})", shown, "must be plain YAML (mappings, lists, strings, numbers): "
                                                      "object and other tags are refused")]
    except yaml.reader.ReaderError as exc:
        return None, [Problem(f"(character {exc.position})", f"#x{exc.character:04x}" if isinstance(exc.character, int)
                              else repr(exc.character), "must be printable text (no NUL or control characters)")]
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        line = mark.line + 1 if mark else "?"
        return None, [Problem(f"(line {line})", str(getattr(exc, "problem", exc)), "must be valid YAML")]
    except RecursionError:  # pragma: no cover - the depth check comes first
        return None, [Problem("(file)", "(nesting)", f"must nest at most {MAX_DEPTH} levels deep")]
    finally:
        if loader is not None:
            loader.dispose()
    if loader.bad_keys:
        return None, [Problem(f"(line {line})", _show(k), "must be a text key (a name such as 'tag' or 'flow')")
                      for k, line in loader.bad_keys]
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
        return printable(value, limit=60)
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


# ------------------------------------------------------------------------------------------------------ text
def _bad_text(text: str, one_line: bool) -> str | None:
    """Why a text from the file cannot be shown or written as it is (None when it can)."""
    import unicodedata

    for c in text:
        cat = unicodedata.category(c)
        if cat == "Cs":
            return "must be valid text (it holds a lone surrogate, which no file or page can encode)"
        if cat == "Cc" and (one_line or c not in "\t\n\r"):
            return ("must be printable text (it holds a control character such as NUL or a terminal escape, "
                    f"{c!r})")
        if one_line and cat == "Cf":
            return f"must be plain text (it holds an invisible formatting character, {c!r})"
    return None


def _text_problems(node, parts=()) -> list[Problem]:
    """Every string (keys and values) with a lone surrogate or a control character, by path; a tag, a label or a
    name must also be one line with no invisible formatting characters (they show in file names and tables)."""
    out = []
    if isinstance(node, dict):
        for k, v in node.items():
            if isinstance(k, str) and (why := _bad_text(k, True)):
                out.append(Problem(_path([*parts, k]), _show(k), "(a key) " + why))
            out += _text_problems(v, (*parts, k))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            out += _text_problems(v, (*parts, i))
    elif isinstance(node, str):
        one_line = bool(parts) and parts[-1] in ("tag", "label", "name", "fluid", "file", "column", "unit", "currency")
        if why := _bad_text(node, one_line):
            out.append(Problem(_path(list(parts)), _show(node), why))
    return out


def _cleaned(node):
    """``node`` with every string that :func:`_bad_text` refuses shown escaped (keys too), so that the parsed
    document kept for display (``Unit.raw``: a failed exchanger's description in a batch index) can always be
    printed and encoded; the problems are reported all the same."""
    if isinstance(node, dict):
        return {_cleaned(k): _cleaned(v) for k, v in node.items()}
    if isinstance(node, list):
        return [_cleaned(v) for v in node]
    if isinstance(node, str) and _bad_text(node, True):
        return printable(node, limit=max(len(node) * 10, 10))
    return node


# ------------------------------------------------------------------------------------------------ pass 3: quantities
_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"


def _amount(text: str, where: str, words: str) -> float:
    """A money number written in the file: finite (``1e400`` reads as infinity in Python)."""
    out = float(text)
    if not math.isfinite(out):
        raise InputError(where, text, f"{words}, finite")
    return out


def _currency_of(value: str, code, currency: str, where: str, example: str):
    """Refuse a money figure in another currency than the unit's, naming both (no exchange rate is applied)."""
    if code and code.upper() != currency:
        raise InputError(where, value, f"in the unit's currency {currency} (economics.currency), not {code.upper()}: "
                                       f"convert the figure and write it as {example}")


def _convert(value, kind: str, where: str, currency: str):
    """A user value of ``kind`` to SI (or to the unit's money for money kinds). Raises InputError."""
    if isinstance(value, str):
        try:  # YAML reads '2.5e5' as a string: a plain number is a number
            value = float(value)
        except ValueError:
            pass
    if kind == "temperature" and isinstance(value, (int, float)):
        # a bare number is ambiguous in a file people write by hand: 135 meant as degC would be read as 135 K
        # (common practice, no source: data sheets give temperatures in degC or degF, never bare kelvin)
        raise InputError(where, value, f"a temperature with its unit, e.g. '{value:g} degC' or '{value:g} K' "
                                       "(a bare number is ambiguous in a unit file)")
    if isinstance(value, float) and not math.isfinite(value):
        raise InputError(where, value, "a finite number")
    if kind == "money":
        if isinstance(value, (int, float)):
            return float(value)
        m = re.fullmatch(rf"\s*({_NUMBER})\s*([A-Za-z]{{3}})?\s*", value)
        if not m:
            raise InputError(where, value, f"an amount: a number or '<number> {currency}' (the unit's currency)")
        _currency_of(value, m.group(2), currency, where, f"'<amount> {currency}'")
        return _amount(m.group(1), where, "an amount")
    if kind == "energy_price":
        if isinstance(value, (int, float)):
            return float(value)
        m = re.fullmatch(rf"\s*({_NUMBER})\s*([A-Za-z]{{3}})?\s*/\s*(.+?)\s*", value)
        if not m:
            raise InputError(where, value, f"a price per energy, e.g. '8 {currency}/GJ' or '9 /MMBTU'")
        _currency_of(value, m.group(2), currency, where, f"'<price> {currency}/{m.group(3)}'")
        joules = to_si("1 " + m.group(3), "energy", where)
        return _amount(m.group(1), where, "a price per energy") / joules
    if kind == "money_per_mass":
        if isinstance(value, (int, float)):
            return float(value)
        m = re.fullmatch(rf"\s*({_NUMBER})\s*([A-Za-z]{{3}})?\s*/\s*(.+?)\s*", value)
        if not m:
            raise InputError(where, value, f"a price per mass, e.g. '5 {currency}/t' or '2 {currency}/kg'")
        _currency_of(value, m.group(2), currency, where, f"'<price> {currency}/{m.group(3)}'")
        try:
            kg = to_si("1 " + m.group(3), "mass", where)
        except InputError:
            raise InputError(where, value, f"a price per mass, e.g. '5 {currency}/t' or '2 {currency}/kg'") from None
        return _amount(m.group(1), where, "a price per mass") / kg
    return to_si(value, kind, where)


_SI_LABEL = {"temperature": "K", "temperature_difference": "K", "length": "m", "mass_flow": "kg/s", "pressure": "Pa",
             "power": "W", "fouling": "m²·K/W", "time": "s", "kinematic_viscosity": "m²/s", "viscosity": "Pa·s",
             "density": "kg/m³", "heat_capacity": "J/kg·K", "conductivity": "W/m·K", "thermal_conductance": "W/K",
             "energy_price": "per J", "money_per_mass": "per kg"}


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
    if "if" in sch and "$ref" in sch.get("then", {}):  # a conditional entry (another exchanger kind): its branch
        branch = sch["then"] if jsonschema.Draft202012Validator(sch["if"]).is_valid(node) else sch.get("else", {})
        return _walk(node, branch, parts, currency, problems)
    kind = sch.get("x-kind")
    if kind is not None:
        if isinstance(node, bool) or not isinstance(node, (int, float, str)):
            return node  # the schema pass reported the type
        try:
            si = _convert(node, kind, _path(parts), currency)
        except InputError as exc:
            problems.append(Problem(_path(parts), _show(node), f"must be {exc.allowed}"))
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


