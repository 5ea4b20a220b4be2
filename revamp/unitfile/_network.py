"""The unit file's ``network`` section: the exchangers as one preheat train.

Three steps, called from the unit file's validation:

* :func:`network_quantities` converts the section's quantities (stream supply conditions, point bands, split
  fractions) to SI, recording unit and bound problems by path;
* :func:`network_rules` checks the network against the exchangers (unknown stream, an exchanger on no route or on
  a route whose stream it does not carry, a route that visits one exchanger twice, a side whose fluid disagrees with
  its stream, fractions that do not balance at a remix, a furnace on an unknown stream) and fills the sides that
  name a stream with that stream's fluid, flow and supply temperature where they give none;
* :func:`build_network` makes the :class:`revamp.train.Train` from the built exchangers.
"""
from __future__ import annotations

from ..errors import InputError
from ._model import Problem
from ._reading import _path, _show, _walk, schema

_SIDES = ("shell_side", "tube_side")


def _defs(name):
    return schema()["$defs"][name]


def network_quantities(doc: dict, si: dict, currency: str, problems: list) -> None:
    """Convert the parts of ``network`` the schema walk does not reach (mappings keyed by stream name)."""
    net = doc.get("network")
    if not isinstance(net, dict):
        return
    out = si.setdefault("network", {})
    streams = net.get("streams") if isinstance(net.get("streams"), dict) else {}
    out["streams"] = {name: _walk(s, _defs("network_stream"), ["network", "streams", name], currency, problems)
                      for name, s in streams.items() if isinstance(s, dict)}
    routes = net.get("routes") if isinstance(net.get("routes"), dict) else {}
    out["routes"] = {name: [_walk(item, _defs("route_item"), ["network", "routes", name, i], currency, problems)
                            for i, item in enumerate(r)]
                     for name, r in routes.items() if isinstance(r, list)}


def _route_tags(route):
    """(index path parts, tag) for every exchanger a route visits, splits included."""
    for i, item in enumerate(route):
        if isinstance(item, str):
            yield [i], item
        elif isinstance(item, dict) and isinstance(item.get("split"), list):
            for b, branch in enumerate(item["split"]):
                for j, tag in enumerate(branch if isinstance(branch, list) else []):
                    if isinstance(tag, str):
                        yield [i, "split", b, j], tag


def network_rules(doc: dict, si: dict) -> list[Problem]:
    """Cross-field rules of the network; fills the stream-naming sides of ``si`` with their stream's values."""
    net = doc.get("network")
    exchangers = doc.get("exchangers") if isinstance(doc.get("exchangers"), list) else []
    out = []
    streams = net.get("streams") if isinstance(net, dict) and isinstance(net.get("streams"), dict) else {}
    known = sorted(streams)
    named = {}  # (stream, tag) -> (exchanger index, side)
    tags = {}
    for i, x in enumerate(exchangers):
        if not isinstance(x, dict):
            continue
        if isinstance(x.get("tag"), str):
            tags.setdefault(x["tag"], i)
        sides = {}
        for side in _SIDES:
            s = x.get(side)
            if not isinstance(s, dict) or not isinstance(s.get("stream"), str):
                continue
            name, here = s["stream"], ["exchangers", i, side]
            if name not in streams:
                out.append(Problem(_path(here + ["stream"]), name,
                                   f"must be one of the network's streams ({', '.join(known)})" if known else
                                   "must name a stream of a 'network' section (the file has none)"))
                continue
            if name in sides.values():
                out.append(Problem(_path(here + ["stream"]), name, "must differ from the other side's stream"))
                continue
            sides[side] = name
            stream = streams[name] if isinstance(streams[name], dict) else {}
            if "fluid" in s and "fluid" in stream and s["fluid"] != stream["fluid"]:
                out.append(Problem(_path(here + ["fluid"]), _show(s["fluid"]),
                                   f"must be the fluid of stream '{name}' (network.streams.{name}.fluid) or be left out"))
            if isinstance(x.get("tag"), str):
                named[(name, x["tag"])] = (i, side)
            # the side takes its stream's fluid, flow and supply temperature where it gives none
            si_side = si["exchangers"][i].get(side) if i < len(si.get("exchangers") or []) else None
            si_stream = (si.get("network") or {}).get("streams", {}).get(name)
            if isinstance(si_side, dict) and isinstance(si_stream, dict):
                for key in ("fluid", "flow", "t_in"):
                    if key not in si_side and key in si_stream:
                        si_side[key] = si_stream[key]
    if not isinstance(net, dict):
        return out
    routes = net.get("routes") if isinstance(net.get("routes"), dict) else {}
    visited = set()
    points = {}
    for name, route in routes.items():
        here = ["network", "routes", name]
        if name not in streams:
            out.append(Problem(_path(here), name, f"must be the route of one of the streams ({', '.join(known)})"))
            continue
        if not isinstance(route, list):
            continue
        seen = {}
        for i, item in enumerate(route):
            if isinstance(item, dict):
                kinds = [k for k in ("point", "split") if k in item]
                if len(kinds) != 1:
                    out.append(Problem(_path(here + [i]), _show(item),
                                       "must be an exchanger tag, {point: name, t_min:, t_max:} or "
                                       "{split: [[tags], [tags]], fractions: [...]}"))
                    continue
                if "point" in item:
                    if "split" in item or "fractions" in item:
                        out.append(Problem(_path(here + [i]), _show(item), "must be a point or a split, not both"))
                    if item["point"] in points:
                        out.append(Problem(_path(here + [i, "point"]), item["point"],
                                           f"must be a point name used once (also at {points[item['point']]})"))
                    points.setdefault(item["point"], _path(here + [i]))
                else:
                    branches, fr = item.get("split"), item.get("fractions")
                    if isinstance(fr, str):
                        if fr != "equal_dp":
                            out.append(Problem(_path(here + [i, "fractions"]), fr,
                                               "must be a list of shares, one per branch, or 'equal_dp'"))
                        elif isinstance(branches, list) and any(b == [] for b in branches):
                            out.append(Problem(_path(here + [i, "split"]), "(an empty branch)",
                                               "must have exchangers in every branch of an 'equal_dp' split"))
                    elif not isinstance(fr, list):
                        out.append(Problem(_path(here + [i, "fractions"]), "(missing)",
                                           "must be given: the share of the flow in each branch"))
                    elif isinstance(branches, list) and len(fr) != len(branches):
                        out.append(Problem(_path(here + [i, "fractions"]), f"{len(fr)} item(s)",
                                           f"must give one fraction per branch ({len(branches)})"))
                    elif all(isinstance(f, (int, float)) and not isinstance(f, bool) for f in fr) and \
                            abs(sum(fr) - 1.0) > 1e-9:
                        out.append(Problem(_path(here + [i, "fractions"]), str(fr),
                                           f"must sum to 1 so that the flows balance at the remix (sum {sum(fr):g})"))
        for parts, tag in _route_tags(route):
            path = _path(here + parts)
            if tag not in tags:
                out.append(Problem(path, tag, f"must be the tag of an exchanger of the file ({', '.join(tags)})"))
                continue
            if (name, tag) not in named:
                out.append(Problem(path, tag, f"must be an exchanger with a side that names stream '{name}' "
                                              f"(add 'stream: {name}' to its shell_side or tube_side)"))
                continue
            if tag in seen:
                out.append(Problem(path, tag, f"must visit each exchanger once (already at {seen[tag]})"))
                continue
            seen[tag] = path
            visited.add((name, tag))
    for (name, tag), (i, side) in named.items():
        if (name, tag) not in visited and name in streams:
            out.append(Problem(_path(["exchangers", i, side, "stream"]), name,
                               f"must be a stream whose route lists {tag} (network.routes.{name} does not)"))
    furnace = net.get("furnace")
    if isinstance(furnace, dict) and isinstance(furnace.get("stream"), str) and furnace["stream"] not in streams:
        out.append(Problem("network.furnace.stream", furnace["stream"], f"must be one of the streams ({', '.join(known)})"))
    return out


def _pump_curve(si: dict, raw, pre: str, problems: list):
    """A stream's :class:`revamp.train.PumpCurve` from the file (None, with the problems recorded, when bad).

    A flow point must carry its unit: a bare number could be a volume or a mass flow (a silent wrong number either
    way), so it is refused with a hint, as a bare temperature is."""
    from ..train import PumpCurve
    from ._building import _guard

    flows = (raw or {}).get("flow")
    if isinstance(flows, list):
        bare = [i for i, v in enumerate(flows) if isinstance(v, (int, float)) and not isinstance(v, bool)]
        if bare:
            problems.append(Problem(f"{pre}.flow[{bare[0]}]", _show(flows[bare[0]]),
                                    "must be a flow with its unit, e.g. '120 m**3/h' or '30 kg/s' (a bare number "
                                    "could be either)"))
            return None
    if any(v is None for k in ("dp", "head") for v in (si.get(k) or [])):
        return None  # a point's own unit problem is already recorded under its path
    if si.get("allowance", 0.0) is None:
        return None
    return _guard(problems, pre, PumpCurve, si.get("flow"), si.get("dp"), si.get("head"), si.get("allowance", 0.0))


def build_network(si: dict, doc: dict, cases: tuple, problems: list):
    """The :class:`revamp.train.Train` of the file (None without a network section or when a part failed)."""
    net = si.get("network")
    if not isinstance(doc.get("network"), dict) or not isinstance(net, dict):
        return None
    from ..service import Stream
    from ..train import AirSide, Furnace, Match, Point, Split, Train
    from ._building import _build_fluid, _guard

    start = len(problems)
    by_tag = {c.tag: c for c in cases}
    streams, rundown, dp_max, pumps = {}, {}, {}, {}
    for name, s in net["streams"].items():
        pre = f"network.streams.{name}"
        kind = (s.get("fluid") or {}).get("kind", "")
        fluid = _guard(problems, f"{pre}.fluid", _build_fluid, s["fluid"],
                       field_of=lambda f, k=kind: f[len(k) + 1:] if f.startswith(k + ".") else f)
        if fluid is None:
            continue
        streams[name] = _guard(problems, pre, Stream, fluid, s["flow"], s["t_in"])
        if "rundown" in s:
            rundown[name] = s["rundown"]
        if "dp_allowed" in s:
            dp_max[name] = s["dp_allowed"]
        if isinstance(s.get("pump_curve"), dict):
            curve = _pump_curve(s["pump_curve"], (doc["network"]["streams"].get(name) or {}).get("pump_curve"),
                                f"{pre}.pump_curve", problems)
            if curve is not None:
                pumps[name] = curve
    matches = {}
    for tag, case in by_tag.items():
        if getattr(case, "kind", None) == "air cooler":  # one stream (its tubes); the air is the match's own
            if case.stream is not None:
                matches[tag] = _guard(problems, f"exchangers[{case.index}]", lambda c=case: Match(
                    c.exchanger, tube=c.stream, fouling_tube=c.service.fouling_tube, dp_max_tube=c.dp_allowed_tube,
                    air=AirSide.of(c.service)))
            continue
        sides = {side: (case.raw.get(f"{side}_side") or {}).get("stream") for side in ("shell", "tube")}
        if not all(sides.values()):
            if any(sides.values()):
                i = case.index
                missing = next(s for s, v in sides.items() if not v)
                problems.append(Problem(f"exchangers[{i}].{missing}_side.stream", "(missing)",
                                        "must be given: an exchanger in the network names the stream on both sides"))
            continue
        matches[tag] = _guard(problems, f"exchangers[{case.index}]", Match, case.exchanger, sides["shell"],
                              sides["tube"], case.service.fouling_shell, case.service.fouling_tube,
                              case.limits.get("dp_shell"), case.limits.get("dp_tube"))
    routes = {}
    for name, route in net["routes"].items():
        items = []
        for i, item in enumerate(route):
            if isinstance(item, str):
                if item not in by_tag:  # the exchanger itself has problems (reported under exchangers[...])
                    return None
                items.append(item)
            elif "point" in item:
                items.append(_guard(problems, f"network.routes.{name}[{i}]", Point, item["point"], item.get("t_min"),
                                    item.get("t_max")))
            else:
                items.append(_guard(problems, f"network.routes.{name}[{i}]", Split, item["split"], item["fractions"]))
        routes[name] = items
    furnace = None
    if "furnace" in net:
        f = net["furnace"]
        furnace = _guard(problems, "network.furnace", Furnace, f["stream"], f["outlet"], f.get("efficiency", 1.0),
                         f.get("max_duty"))
    if len(problems) > start:
        return None
    try:
        return Train(streams=streams, exchangers=matches, routes=routes, furnace=furnace, rundown=rundown,
                     dp_max=dp_max, pump_curves=pumps)
    except InputError as exc:  # the rules above should have named it already; never a traceback
        problems.append(Problem(f"network.{exc.field}", _show(exc.value), f"must be {exc.allowed}"))
        return None


class AtDesignFouling:
    """An option whose exchanger change is applied while its sides keep the fouling they had (the unit file's design
    fouling): the end-of-run basis, on which the exchanger's own study judges every option, cleaning included (a
    cleaned bundle is judged with the fouling it will have again at the end of its next run)."""

    def __init__(self, option):
        self.option = option
        self.label = option.label

    def apply(self, exchanger, service):
        hx, _ = self.option.apply(exchanger, service)
        return hx, service

    def __repr__(self):
        return f"AtDesignFouling({self.option!r})"


def train_options(unit):
    """The options of the network's exchangers as train-level cases, and their economics.

    Returns ``({"<tag>: <option label>": {tag: option}}, Economics or None)``: each exchanger's options from the file,
    one case each, with its capex; the economics from the unit's prices (None without an energy price).
    """
    from ._building import _economics

    network = unit.network
    if network is None:
        return {}, None
    cases, capex = {}, {}
    for tag in network.exchangers:
        case = unit.exchanger(tag)
        if getattr(case, "kind", None) == "air cooler":  # a rundown cooler saves no fuel: its options are judged
            continue                                      # in its own study, at the inlet the train gives it
        for opt in case.options:
            label = f"{tag}: {opt.label}"
            cases[label] = {tag: opt}
            cost = case.capex.get(opt.label)
            if cost is not None:
                capex[label] = cost
    return cases, _economics(unit.economics, capex, None)
