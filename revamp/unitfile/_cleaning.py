"""The unit file's ``cleaning`` section: a cleaning schedule for the train of the ``network`` section.

:func:`cleaning_quantities` converts the per-exchanger entries (a mapping keyed by tag, which the schema walk does not
reach); :func:`cleaning_rules` checks the section against the network and the exchangers; :func:`cleaning_inputs`
turns it, with the built unit, into the arguments of :func:`revamp.cleaning.schedule_cleaning` (fitting the plant data
where an exchanger's fouling is ``plant_data``).
"""
from __future__ import annotations

from ._model import Problem
from ._reading import _path, _show, _walk, schema

#: defaults of the section (common practice, no source: a three-year plan in weekly periods, one crew)
DEFAULTS = {"horizon": 3 * 365.25 * 86400.0, "period": 7 * 86400.0, "crews": 1, "downtime": 5 * 86400.0,
            "time_limit": 60.0}


def cleaning_quantities(doc: dict, si: dict, currency: str, problems: list) -> None:
    """Convert ``cleaning.exchangers.<tag>`` (keyed by tag) to SI, recording problems by path."""
    sec = doc.get("cleaning")
    if not isinstance(sec, dict) or not isinstance(sec.get("exchangers"), dict):
        return
    sub = schema()["$defs"]["cleaning_exchanger"]
    out = si.setdefault("cleaning", {})
    out["exchangers"] = {tag: _walk(x, sub, ["cleaning", "exchangers", tag], currency, problems)
                         for tag, x in sec["exchangers"].items() if isinstance(x, dict)}


def _network_tags(net: dict) -> set:
    tags = set()
    for route in (net.get("routes") or {}).values():
        for item in route if isinstance(route, list) else []:
            if isinstance(item, str):
                tags.add(item)
            elif isinstance(item, dict) and isinstance(item.get("split"), list):
                tags.update(t for br in item["split"] if isinstance(br, list) for t in br if isinstance(t, str))
    return tags


def cleaning_rules(doc: dict, si: dict) -> list[Problem]:
    """Cross-field rules: a network with a furnace, known exchangers, a complete fouling law for each."""
    sec = doc.get("cleaning")
    if not isinstance(sec, dict):
        return []
    net = doc.get("network")
    if not isinstance(net, dict):
        return [Problem("cleaning", "(section)", "must go with a network section (the plan prices the train's fired "
                                                 "fuel)")]
    if not isinstance(net.get("furnace"), dict):
        return [Problem("cleaning", "(section)", "must go with a furnace in the network section (the plan prices its "
                                                 "fired fuel)")]
    out = []
    on_routes = _network_tags(net)
    with_data = {x.get("tag") for x in doc.get("exchangers") or [] if isinstance(x, dict) and x.get("plant_data")
                 and x.get("kind") != "air cooler"}  # an air cooler's bundle is not on the plan (no fired fuel)
    air = {x.get("tag") for x in doc.get("exchangers") or [] if isinstance(x, dict) and x.get("kind") == "air cooler"}
    given = sec.get("exchangers")
    if given is None:
        if not (on_routes & with_data):
            out.append(Problem("cleaning.exchangers", "(none)", "must name the exchangers to schedule with their "
                                                                "fouling law: no exchanger of the network has plant "
                                                                "data to fit one from"))
        return out
    if isinstance(given, dict) and not given:
        out.append(Problem("cleaning.exchangers", "{}", "must name at least one exchanger of the network"))
    for tag, x in (given or {}).items():
        where = ["cleaning", "exchangers", tag]
        if tag not in on_routes or tag in air:
            out.append(Problem(_path(where), _show(tag), f"must be a shell-and-tube exchanger on a route of the "
                                                          f"network ({', '.join(sorted(on_routes - air))})"))
            continue
        f = (x or {}).get("fouling") if isinstance(x, dict) else None
        if not isinstance(f, dict):
            if tag not in with_data:
                out.append(Problem(_path(where + ["fouling"]), "(none)", "must be given: the exchanger has no plant "
                                                                         "data to fit a fouling law from"))
            continue
        model = f.get("model")
        need = {"linear": ("rate",), "asymptotic": ("rf_inf", "time_constant"), "plant_data": ()}.get(model, ())
        for key in need:
            if key not in f:
                out.append(Problem(_path(where + ["fouling", key]), "(missing)", f"must be given for a {model} law"))
        if model == "plant_data" and tag not in with_data:
            out.append(Problem(_path(where + ["fouling", "model"]), "plant_data",
                               "must name a law of its own: this exchanger has no plant_data section"))
    return out


def cleaning_inputs(unit, mc_draws: int = 0) -> dict:
    """The keyword arguments of :func:`revamp.cleaning.schedule_cleaning` from a loaded unit (with its network).

    Exchangers whose law is ``plant_data`` (or that the section leaves to the default) are fitted from their plant
    data at today's conditions (the same analysis as their report, without the Monte Carlo band).
    """
    from ..fouling.growth import Asymptotic, Linear, growth_law
    from ..monitoring import monitor

    sec = unit.cleaning or {}
    econ = unit.economics
    tags = [t for t in unit.network.exchangers]
    given = sec.get("exchangers")
    if given is None:
        given = {x.tag: {} for x in unit.exchangers if x.tag in tags and getattr(x, "plant_data", None) is not None
                 and getattr(x, "kind", None) != "air cooler"}
    fouling, costs, sides = {}, {}, {}
    default_cost = sec.get("cleaning_cost", econ.cleaning_cost if econ.cleaning_cost is not None else 0.0)
    for tag, x in given.items():
        f = (x or {}).get("fouling") or {"model": "plant_data"}
        keep = {k: f[k] for k in ("rf_now", "residual") if k in f}
        if f["model"] == "linear":
            fouling[tag] = Linear(rate=f["rate"], **keep)
        elif f["model"] == "asymptotic":
            fouling[tag] = Asymptotic(rf_inf=f["rf_inf"], time_constant=f["time_constant"], **keep)
        else:
            case = unit.exchanger(tag)
            pdata = case.plant_data
            side = (x or {}).get("side") or pdata.fouling_side or "tube"
            mon = monitor(case.exchanger, case.service, pdata.file, mc_draws=mc_draws, fouling_side=side,
                          **pdata.monitor_options())
            if mon.trend is None:
                raise ValueError(f"{tag}: its plant data gave no fouling trend to schedule with")
            fouling[tag] = growth_law(mon.trend, f"cleaning.exchangers[{tag!r}]", residual=keep.get("residual", 0.0))
        costs[tag] = (x or {}).get("cleaning_cost", default_cost)
        if (x or {}).get("side"):
            sides[tag] = x["side"]
    downtime = sec.get("downtime", econ.cleaning_downtime if econ.cleaning_downtime is not None
                       else DEFAULTS["downtime"])
    if econ.energy_price is None:
        raise ValueError("the unit's economics give no energy_price: the plan cannot price fired fuel")
    kwargs = dict(fouling=fouling, horizon=sec.get("horizon", DEFAULTS["horizon"]),
                  period=sec.get("period", DEFAULTS["period"]), cleaning_cost=costs, downtime=downtime,
                  crews=int(sec.get("crews", DEFAULTS["crews"])),
                  fuel_price=f"{econ.energy_price * 1e9:.12g} {econ.currency}/GJ", sides=sides,
                  blackouts=[tuple(b) for b in sec.get("blackouts", [])],
                  turnaround=sec.get("turnaround") or (), time_limit=sec.get("time_limit", DEFAULTS["time_limit"]))
    for key in ("start", "min_interval", "turnaround_length"):
        if key in sec:
            kwargs[key] = sec[key]
    return kwargs
