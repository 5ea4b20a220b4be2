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

import dataclasses
import hashlib
import re
from pathlib import Path

from ._aircooler import AIR_COOLER_KIND, AirCoolerCase, build_air_cooler
from ._condenser import CONDENSER_KIND, CondenserCase, build_condenser
from ._building import OPTION_PATH, _build_exchanger, _exchanger_rules
from ._cleaning import cleaning_quantities, cleaning_rules
from ._network import build_network, network_quantities, network_rules
from ._model import (
    SCHEMA_PATH,
    STANDARD_COLUMNS,
    ExchangerCase,
    PlantData,
    Problem,
    Unit,
    UnitEconomics,
    UnitFileError,
)
from ._reading import (
    _bad_text,
    _cleaned,
    _read_file,
    _read_yaml,
    _schema_problems,
    _show,
    _text_problems,
    _walk,
    schema,
)

__all__ = [
    "AIR_COOLER_KIND",
    "AirCoolerCase",
    "CONDENSER_KIND",
    "CondenserCase",
    "SCHEMA_PATH",
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
    "network_inlets",
    "network_option_values",
    "schema",
]


# -------------------------------------------------------------------------------------------------------- entry points
def _sorted(problems):
    """File order: by path, numbers compared as numbers (exchangers[2] before exchangers[10])."""
    key = lambda p: [int(t) if t.isdigit() else t for t in re.split(r"(\d+)", p.path)]
    return sorted(problems, key=key)


def _validate(path, build: bool, only=None):
    path = Path(path)
    data, reason = _read_file(path)
    if data is None:
        return None, [Problem(str(path), "(file)", reason)]
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
    text_problems = _text_problems(doc)
    if text_problems:
        problems += text_problems
        doc = _cleaned(doc)
    if not isinstance(doc, dict):
        return None, _sorted(problems)
    econ = doc.get("economics") if isinstance(doc.get("economics"), dict) else {}
    currency = econ.get("currency") if isinstance(econ.get("currency"), str) else "USD"
    quantity_problems = []
    si = _walk(doc, schema(), [], currency, quantity_problems)
    network_quantities(doc, si, currency, quantity_problems)
    cleaning_quantities(doc, si, currency, quantity_problems)
    # one line per place: a field the schema already refused is not reported twice
    seen = {p.path for p in problems}
    problems += [p for p in quantity_problems if p.path not in seen]
    base, tags = path.resolve().parent, {}
    exchangers = doc.get("exchangers") if isinstance(doc.get("exchangers"), list) else []
    seen = {p.path for p in problems}
    air = {}  # index -> AirCoolerCase (None when it has problems): such entries are checked by their own module
    for i, x in enumerate(exchangers):
        if _is_air_cooler(x):
            own: list = []
            air[i] = build_air_cooler(i, x, own, base=base, network=doc.get("network"))
            own += _air_tag_rule(x, i, tags)
            problems += [p for p in own if p.path not in seen]
        elif isinstance(x, dict) and x.get("kind") == CONDENSER_KIND:  # checked and built by its own module too
            own = []
            air[i] = build_condenser(i, x, own, base)
            own += _air_tag_rule(x, i, tags)
            problems += [p for p in own if p.path not in seen]
        elif isinstance(x, dict):  # a place already refused (e.g. a NUL in a file name) is not reported twice
            problems += [p for p in _exchanger_rules(x, ["exchangers", i], base, tags) if p.path not in seen]
    problems += network_rules(doc, si)  # also fills the sides that name a network stream
    problems += cleaning_rules(doc, si)
    if not build or any(not _owned([p], None) for p in problems):  # the unit as a whole is wrong: build nothing
        return None, _sorted(problems)
    e = si.get("economics") or {}
    econ = UnitEconomics(
        currency=currency, energy_price=e.get("energy_price"), heater_efficiency=e.get("heater_efficiency"),
        hours_per_year=e["hours_per_year"] / 3600.0 if "hours_per_year" in e else None,
        discount_rate=e.get("discount_rate"),
        horizon_years=e["horizon"] / (365.25 * 86400.0) if "horizon" in e else None,
        capacity_margin=e.get("capacity_margin"), cleaning_cost=e.get("cleaning_cost"),
        run_length=e.get("run_length"), cleaning_downtime=e.get("cleaning_downtime"),
        value_basis=e.get("value_basis"), utility_price=e.get("utility_price"), rank_by=e.get("rank_by"),
        judge_on=e.get("judge_on"))
    built = []
    for i, x in enumerate(exchangers):
        own = [p for p in problems if _owned([p], i)]
        if i in air:  # an air cooler is built whole or not at all (its checks ran above)
            if not own and air[i] is not None and (only is None or air[i].tag in only):
                built.append(air[i])
            continue
        refused = {int(m.group(2)) for p in own if (m := OPTION_PATH.match(p.path))}
        if len(refused) < len(own) or not isinstance(x, dict) or (only is not None and x.get("tag") not in only):
            continue  # never build (let alone rate) an exchanger whose inputs are already known to be wrong
        case = _build_exchanger(i, x, si["exchangers"][i], base, problems, econ, refused=refused)
        if case is not None:  # built without its wrong options, which keep their problems
            built.append(dataclasses.replace(case, refused_options=tuple(p for p in problems if _owned([p], i))))
    in_train = tuple(c for c in built if getattr(c, "kind", None) != CONDENSER_KIND)  # condensers are not in a train
    network = build_network(si, doc, in_train, problems) if only is None else None
    problems = [_as_written(p, doc) for p in problems]
    unit = Unit(name=doc["unit"]["name"], description=doc["unit"].get("description", ""), path=path.resolve(),
                sha256=hashlib.sha256(data).hexdigest(), economics=econ, exchangers=tuple(built), raw=doc,
                network=network, network_throughput=float((si.get("network") or {}).get("throughput", 1.0)),
                cleaning=si.get("cleaning") if isinstance(doc.get("cleaning"), dict) else None)
    return unit, _sorted(problems)


def _is_air_cooler(x) -> bool:
    return isinstance(x, dict) and x.get("kind") == AIR_COOLER_KIND


def _air_tag_rule(x: dict, i: int, seen_tags: dict) -> list[Problem]:
    """An air cooler's tag is unique among all the exchangers of the unit, like any other tag."""
    tag = x.get("tag")
    if not isinstance(tag, str):
        return []
    if tag in seen_tags:
        return [Problem(f"exchangers[{i}].tag", tag, f"must be unique (also used by exchangers[{seen_tags[tag]}])")]
    seen_tags[tag] = i
    return []


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
        usable = isinstance(tag, str) and tag.strip() and _bad_text(tag, True) is None
        out.append((tag if usable else f"exchangers[{i}]", i))  # never a tag that cannot be printed or written
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


def network_inlets(path, tag: str):
    """``(service_today, service_revamp, text)`` of exchanger ``tag`` as the unit's train gives them.

    When the unit file has a ``network`` section listing ``tag``, the whole train is solved today and at its revamp
    throughput (:func:`revamp.train.network_services`), so an exchanger's study takes the inlets its neighbours give
    it instead of the ones written beside it; ``text`` says so for the report. Otherwise ``(None, None, "")``: the
    study keeps the exchanger's own services. A train that cannot be built or solved says why in ``text``.
    """
    unit, _, _ = load_partial(path)
    if unit is None or unit.network is None or tag not in unit.network.exchangers:
        return None, None, ""
    from ..train import network_services

    try:
        services = network_services(unit.network, revamp=unit.network_throughput, tol=1e-3)
    except Exception as exc:  # the train is context for this report, not a precondition
        return None, None, (f"The unit's train could not be solved ({exc.__class__.__name__}: {exc}); this study "
                            "uses the exchanger's own inlets from the unit file.")
    bad = [k for k, r in services.results.items() if not bool(r.converged)]
    if bad:
        return None, None, (f"The unit's train did not converge ({', '.join(bad)}); this study uses the exchanger's "
                            "own inlets from the unit file.")
    today, rev = services.today[tag], services.revamp[tag]
    c = lambda t: f"{float(t) - 273.15:.1f} °C"  # noqa: E731
    if not hasattr(today, "shell"):  # an air cooler: its tube inlet from the train, the air its own
        text = (f"Tube inlet from the train (network section), not the one written beside the air cooler: today "
                f"{c(today.tube.t_in)}; at the revamp throughput (x{unit.network_throughput:g} on every stream) "
                f"{c(rev.tube.t_in)}. The air is the air cooler's own (ambient {c(today.air_in)}).")
        return today, rev, text
    text = (f"Inlets from the train (network section), not the ones written beside the exchanger: today shell "
            f"{c(today.shell.t_in)}, tube {c(today.tube.t_in)}; at the revamp throughput (x{unit.network_throughput:g} "
            f"on every stream) shell {c(rev.shell.t_in)}, tube {c(rev.tube.t_in)}.")
    return today, rev, text


def network_option_values(path, tag: str):
    """This exchanger's options valued by the whole train (None when the unit has no network listing ``tag``, or
    the exchanger has no option).

    Each option is applied to ``tag`` alone and the train re-solved at its revamp throughput
    (:func:`revamp.train.compare_train`): what the option saves is the furnace's fired duty, after the exchangers
    downstream have recovered less, never this exchanger's own duty gain counted as fuel. Every option is judged at
    the end of its run, as the exchanger's own study judges it: its exchanger change applied, every side at the
    unit file's design fouling (a cleaning is not credited with a clean bundle that lasts).
    """
    unit, _, _ = load_partial(path)
    if unit is None or unit.network is None or tag not in unit.network.exchangers:
        return None
    from ..train import compare_train
    from ._network import AtDesignFouling, train_options

    cases, economics = train_options(unit)
    mine = {k: {t: AtDesignFouling(o) for t, o in v.items()} for k, v in cases.items() if set(v) == {tag}}
    if not mine:
        return None
    return compare_train(unit.network, mine, economics=economics, revamp=unit.network_throughput, tol=1e-3)
