"""The train page: a drawing of the preheat train (our own SVG, offline), its tables, options at train level and
the throughput limit. Formatting only: every number comes from a solved :class:`revamp.train.TrainResult`,
a :class:`revamp.train.TrainStudy` and a :class:`revamp.train.Throughput`.
"""
from __future__ import annotations

import math

import numpy as np

from ..train import Point, Split
from .pages import esc, page, table_html, temperatures_in

__all__ = ["train_svg", "train_body", "train_page"]

_BOX_W, _BOX_H, _GAP = 92, 46, 70
_COLORS = ("#c0392b", "#d35400", "#8e44ad", "#2c3e50", "#16a085", "#7f8c8d")


def _c(t_kelvin) -> str:
    """A temperature for a label [°C]."""
    t = float(t_kelvin)
    return "n/a" if not math.isfinite(t) else f"{t - 273.15:.0f} °C"


def _mw(w) -> str:
    w = float(w)
    return "n/a" if not math.isfinite(w) else f"{w / 1e6:.2f} MW"


def _main_stream(train):
    if train.furnace is not None:
        return train.furnace.stream
    return max(train.routes, key=lambda s: len(train.routes[s]))


def train_svg(result, title: str = "") -> str:
    """An SVG drawing of a solved train: the main stream (the furnace's) left to right through its exchangers, points
    and branches, the furnace at the end; every other stream enters its exchangers from above; the temperature at
    each node is written beside it.

    Parameters
    ----------
    result : TrainResult
        A single-case solve.
    title : str
        Caption (user text, escaped).
    """
    train, ex = result.train, result.exchangers
    main = _main_stream(train)
    pos = {}  # tag -> (x, y) of the box's top-left corner
    items_svg, labels = [], []
    x, y0 = 130, 130
    supply = float(result.streams.loc[main, "supply"])
    labels.append((10, y0 + _BOX_H / 2 - 8, f"{esc(main)} {_c(supply)}", "start"))
    line_pts = [(10, y0 + _BOX_H / 2)]
    max_rows = 1
    for item in train.routes.get(main, ()):
        if isinstance(item, str):
            pos[item] = (x, y0)
            x += _BOX_W + _GAP
        elif isinstance(item, Point):
            cx, cy = x + 10, y0 + _BOX_H / 2
            t = float(result.points.loc[item.name, "temperature"])
            ok = all(bool(c.ok) for c in result.limits if c.name == f"{item.name} temperature")
            items_svg.append(f'<polygon points="{cx - 12},{cy} {cx},{cy - 12} {cx + 12},{cy} {cx},{cy + 12}" '
                             f'fill="{"#27ae60" if ok else "#e74c3c"}"/>')
            labels.append((cx, cy + 30, f"{esc(item.name)} {_c(t)}", "middle"))
            x += 20 + _GAP
        elif isinstance(item, Split):
            n = len(item.branches)
            max_rows = max(max_rows, n)
            width = max((len(b) for b in item.branches), default=1) or 1
            for b, (branch, frac) in enumerate(zip(item.branches, item.fractions)):
                by = y0 + (b - (n - 1) / 2) * (_BOX_H + 40)
                bx = x
                for tag in branch:
                    pos[tag] = (bx, by)
                    bx += _BOX_W + _GAP // 2
                labels.append((x - 6, by - 6, f"{frac:.0%}", "end"))
            x_end = x + width * (_BOX_W + _GAP // 2)
            ys = [y0 + (b - (n - 1) / 2) * (_BOX_H + 40) + _BOX_H / 2 for b in range(n)]
            for bx_ in (x - _GAP / 2, x_end):  # the split and the remix
                items_svg.append(f'<line x1="{bx_}" y1="{min(ys)}" x2="{bx_}" y2="{max(ys)}" stroke="#1f5fa8" '
                                 f'stroke-width="3"/>')
            for b, branch in enumerate(item.branches):
                if not branch:  # a bypass
                    items_svg.append(f'<line x1="{x - _GAP / 2}" y1="{ys[b]}" x2="{x_end}" y2="{ys[b]}" '
                                     f'stroke="#1f5fa8" stroke-width="3" stroke-dasharray="6 4"/>')
            x += width * (_BOX_W + _GAP // 2) + _GAP // 2
    end_x = x
    # exchangers not on the main route: a second row
    extra = [t for t in train.exchangers if t not in pos]
    for k, tag in enumerate(extra):
        pos[tag] = (40 + k * (_BOX_W + _GAP), y0 + 190)
    height = y0 + _BOX_H + 70 + (190 if extra else 0) + (_BOX_H + 40) * max(0, max_rows - 1) / 2
    # main stream line through its exchangers (branches drawn from the split column)
    main_path = []
    for tag, (bx, by) in pos.items():
        if tag in extra:
            continue
        main_path.append(f'<line x1="{bx - _GAP / 2}" y1="{by + _BOX_H / 2}" x2="{bx + _BOX_W + _GAP / 2}" '
                         f'y2="{by + _BOX_H / 2}" stroke="#1f5fa8" stroke-width="3"/>')
        t_out = float(ex.loc[tag, "t_out_tube" if train.exchangers[tag].tube == main else "t_out_shell"])
        labels.append((bx + _BOX_W + 6, by + _BOX_H / 2 + 16, _c(t_out), "start"))
    line_pts.append((end_x, y0 + _BOX_H / 2))
    main_path.insert(0, f'<line x1="{line_pts[0][0]}" y1="{line_pts[0][1]}" x2="{line_pts[1][0]}" '
                        f'y2="{line_pts[1][1]}" stroke="#1f5fa8" stroke-width="3" stroke-opacity="0.35"/>')
    # furnace
    if train.furnace is not None and result.furnace_inlet is not None:
        fx, fy, fw = end_x, y0 - 17, _BOX_W + 50
        items_svg.append(f'<rect x="{fx}" y="{fy}" width="{fw}" height="{_BOX_H + 34}" rx="4" '
                         f'fill="#fdebd0" stroke="#a04000" stroke-width="2"/>')
        labels.append((fx + fw / 2, fy + 20, "furnace", "middle"))
        labels.append((fx + fw / 2, fy + 40, f"{_c(result.furnace_inlet)} → {_c(train.furnace.outlet)}", "middle"))
        labels.append((fx + fw / 2, fy + 60, f"fired {_mw(result.furnace_duty)}", "middle"))
        end_x += fw + 20
    # other streams: into each exchanger from above, in route order
    others = [s for s in train.routes if s != main]
    for k, s in enumerate(others):
        color = _COLORS[k % len(_COLORS)]
        tags = [t for t in _route_tags(train.routes[s]) if t in pos]
        prev = None
        for j, tag in enumerate(tags):
            bx, by = pos[tag]
            side = train.exchangers[tag].side_of(s)
            t_in, t_out = float(ex.loc[tag, f"t_in_{side}"]), float(ex.loc[tag, f"t_out_{side}"])
            top_in, top_out = (bx + _BOX_W * 0.3, by), (bx + _BOX_W * 0.7, by)
            lift = 40 + 16 * (k % 3)
            if prev is None:
                items_svg.append(f'<line x1="{top_in[0]}" y1="{by - lift}" x2="{top_in[0]}" y2="{by}" '
                                 f'stroke="{color}" stroke-width="2"/>')
                labels.append((top_in[0], by - lift - 4, f"{esc(s)} {_c(t_in)}", "middle", color))
            else:
                px, py = prev
                items_svg.append(f'<path d="M{px},{py} C{px},{py - lift - 30} {top_in[0]},{by - lift - 30} '
                                 f'{top_in[0]},{by}" fill="none" stroke="{color}" stroke-width="2"/>')
            labels.append((top_out[0] + 4, by - 6, _c(t_out), "start", color))
            prev = top_out
            if j == len(tags) - 1:
                items_svg.append(f'<line x1="{top_out[0]}" y1="{by}" x2="{top_out[0]}" y2="{by - 22}" '
                                 f'stroke="{color}" stroke-width="2" stroke-dasharray="4 3"/>')
    boxes = []
    for tag, (bx, by) in pos.items():
        duty = float(ex.loc[tag, "duty"])
        air = _is_air(ex.loc[tag])
        dash = ' stroke-dasharray="5 3"' if air else ""
        boxes.append(f'<rect x="{bx}" y="{by}" width="{_BOX_W}" height="{_BOX_H}" rx="6" '
                     f'fill="{"#eaf4fb" if air else "#ffffff"}" stroke="#34495e" stroke-width="2"{dash}/>')
        if air:  # an air cooler: the air from below, its ambient and outlet written under the box
            labels.append((bx + _BOX_W / 2, by + _BOX_H + 16, f"air {_c(ex.loc[tag, 't_in_air'])} → "
                           f"{_c(ex.loc[tag, 't_out_air'])}", "middle", "#2471a3"))
        labels.append((bx + _BOX_W / 2, by + 19, esc(tag), "middle"))
        labels.append((bx + _BOX_W / 2, by + 36, _mw(duty), "middle"))
    width = max(end_x + 60, 600)
    text = []
    for lab in labels:
        lx, ly, s, anchor = lab[:4]
        color = lab[4] if len(lab) > 4 else "#222"
        text.append(f'<text x="{lx:.1f}" y="{ly:.1f}" text-anchor="{anchor}" fill="{color}">{s}</text>')
    cap = f'<text x="10" y="20" font-weight="bold">{esc(title)}</text>' if title else ""
    return (f'<svg xmlns="http://www.w3.org/2000/svg" class="rv-train" viewBox="0 0 {width:.0f} {height:.0f}" '
            f'width="100%" style="max-width:{width:.0f}px;font-family:sans-serif;font-size:12px" role="img" '
            f'aria-label="{esc(title or "preheat train")}">' + cap + "".join(main_path) + "".join(items_svg)
            + "".join(boxes) + "".join(text) + "</svg>")


def _route_tags(route):
    for item in route:
        if isinstance(item, str):
            yield item
        elif isinstance(item, Split):
            for branch in item.branches:
                yield from branch


def _is_air(row) -> bool:
    return row.get("kind", "") == "air cooler"


def _exchanger_rows(result):
    """The exchangers' table; an air cooler's air stands in the shell-side columns (marked 'air'), with its fan
    power in a column of its own when the train has one."""
    ex = result.exchangers
    air_any = "kind" in ex.columns and bool((ex["kind"] == "air cooler").any())
    rows = []
    for tag in ex.index:
        r = ex.loc[tag]
        if _is_air(r):
            row = [tag, f"air / {r['tube_stream']}", _mw(r["duty"]),
                   f"air {_c(r['t_in_air'])} → {_c(r['t_out_air'])}",
                   f"{_c(r['t_in_tube'])} → {_c(r['t_out_tube'])}",
                   f"{r['U_service']:.0f}", f"{r['dp_air'] / 1e3:.2f} (air)", f"{r['dp_tube'] / 1e3:.1f}"]
        else:
            row = [tag, f"{r['shell_stream']} / {r['tube_stream']}", _mw(r["duty"]),
                   f"{_c(r['t_in_shell'])} → {_c(r['t_out_shell'])}",
                   f"{_c(r['t_in_tube'])} → {_c(r['t_out_tube'])}",
                   f"{r['U_service']:.0f}", f"{r['dp_shell'] / 1e3:.1f}", f"{r['dp_tube'] / 1e3:.1f}"]
        if air_any:
            row.append(f"{r['fan_power'] / 1e3:.1f}" if _is_air(r) else "")
        rows.append(row)
    header = ["exchanger", "shell / tube stream", "duty", "shell side (air)" if air_any else "shell side",
              "tube side", "U in service [W/m²K]", "ΔP shell [kPa]", "ΔP tube [kPa]"]
    return table_html(rows, header + (["fan power [kW]"] if air_any else []))


def _limit_rows(result):
    rows = []
    for c in result.limits:
        unit = {"dp": (1e-3, "kPa"), "power": (1e-6, "MW")}.get(c.quantity)
        if c.quantity == "temperature":
            fmt = _c
        else:
            fmt = (lambda v, u=unit: "" if v is None else f"{v * u[0]:.2f} {u[1]}")
        rows.append([c.name, fmt(c.value), "" if c.low is None else fmt(c.low), "" if c.high is None else fmt(c.high),
                     "ok" if c.ok else "FAILS"])
    return table_html(rows, ["limit", "value", "low", "high", "status"]) if rows else "<p>No limits given.</p>"


def _stream_rows(result):
    s = result.streams
    pumps = "pump_dp" in s.columns
    rows = [[name, f"{r['flow']:.1f}", _c(r["supply"]), _c(r["final"]), _mw(r["duty"]), f"{r['dp'] / 1e3:.1f}",
             "" if not np.isfinite(r["rundown"]) else _c(r["rundown"]), _mw(r["trim_duty"]) if r["trim_duty"] else ""]
            + ([_pump_cell(name, r, result)] if pumps else [])
            for name, r in s.iterrows()]
    return table_html(rows, ["stream", "flow [kg/s]", "supply", "final", "heat taken up", "ΔP [kPa]", "rundown limit",
                             "trim cooler duty"] + (["pump: ΔP left for the route [kPa]"] if pumps else []))


def _pump_cell(name, r, result):
    """What the stream's pump leaves for its route (curve less allowance) at its flow, or why there is none."""
    if name not in getattr(result.train, "pump_curves", {}):
        return ""
    v = r["pump_dp"]
    return "outside the curve's points" if not np.isfinite(v) else f"{v / 1e3:.1f}"


def _study_rows(study, currency=""):
    t = study.table
    rows = []
    for label, r in t.iterrows():
        money = (lambda v: "" if not np.isfinite(v) else f"{v:,.0f} {currency}".strip())
        row = [label, _c(r["furnace_inlet"]), _mw(r["furnace_duty"]), _mw(r["furnace_duty_saved"]),
               r["limits"], money(r["capex"]), money(r["annual_value"]),
               "" if not np.isfinite(r["payback"]) else f"{r['payback']:.2g} y", money(r["npv"])]
        if "max_throughput" in t.columns:
            f = r["max_throughput"]
            row += ["" if not np.isfinite(f) else f"{f:.3f}×", r["binding"]]
        rows.append(row)
    header = ["case", "furnace inlet", "fired duty", "fired duty saved", "limits failing", "capex", "value per year",
              "payback", "NPV"]
    if "max_throughput" in t.columns:
        header += ["max throughput (× today's flow)", "binding limit"]
    changes = study.duty_changes
    crow = [[label] + [f"{v / 1e3:+,.0f}" for v in changes.loc[label]] for label in changes.index if label != "base"]
    iso = study.isolated_gains
    parts = [table_html(rows, header)]
    if crow:
        parts.append("<h3>Where the gain goes: change of each exchanger's duty [kW] from the base</h3>")
        parts.append(table_html(crow, ["case"] + list(changes.columns)))
    if len(iso):
        irow = [[label, _mw(np.nansum(iso.loc[label].to_numpy(float))), _mw(t.loc[label, "furnace_duty_saved"])]
                for label in iso.index]
        parts.append("<p>The changed exchangers' own duty gains (each rated alone at its base inlets) beside the "
                     "fuel the train saves: a gain upstream is partly lost by the exchangers downstream, which is "
                     "why the saving is taken from the furnace, never as a sum of exchanger gains.</p>")
        parts.append(table_html(irow, ["case", "isolated duty gains", "fired duty saved by the train"]))
    return "".join(parts)


def train_body(today, study, throughput=None, revamp_factor=1.0, currency="") -> str:
    """The train page's body (HTML).

    Parameters
    ----------
    today : TrainResult
        The train at today's flows.
    study : TrainStudy
        Options at train level at the revamp conditions (its ``base`` row is the train at revamp as is).
    throughput : Throughput, optional
        Today's throughput limit.
    revamp_factor : float
        The factor on every stream's flow the study was made at.
    """
    rev = study.results["base"]
    out = ["<p>The exchangers as one network: each outlet feeds the next inlet, so an option on one exchanger "
           "changes what the others recover. The furnace inlet temperature and the fired duty measure the whole "
           "train.</p>"]
    for name, res, caption in (("today", today, "today"),
                               ("revamp", rev, f"at the revamp conditions ({revamp_factor:g}× every flow)")):
        out.append(f'<section id="train-{name}"><h2>The train {esc(caption)}</h2>')
        out.append(train_svg(res, f"The train {caption}"))
        out.append(f"<p>Furnace inlet {_c(res.furnace_inlet) if res.furnace_inlet is not None else 'n/a'}, fired "
                   f"duty {_mw(res.furnace_duty) if res.furnace_duty is not None else 'n/a'}; solved in "
                   f"{res.iterations} iteration(s), {'converged' if res.converged else 'NOT converged'}.</p>")
        out.append(_exchanger_rows(res) + _stream_rows(res) + "<h3>Limits</h3>" + _limit_rows(res))
        if res.warnings:
            out.append("<details><summary>Warnings</summary><ul>" + "".join(
                f"<li>{esc(temperatures_in(w))}</li>" for w in res.warnings) + "</ul></details>")  # in °C
        out.append("</section>")
    out.append('<section id="train-options"><h2>Options rated across the train (revamp conditions)</h2>')
    out.append("<p>Each option is judged at the end of its run: its change to the exchanger applied, every side at "
               "its design fouling, the basis of the exchanger reports. A cleaning is therefore worth nothing here "
               "(the bundle fouls back by the end of its next run); what cleanings are worth over time, and when, is "
               "the cleaning plan's subject.</p>")
    out.append(_study_rows(study, currency) + "</section>")
    if throughput is not None:
        out.append('<section id="train-throughput"><h2>Throughput limit</h2>'
                   f"<p>Today's train: {esc(throughput.describe())} (search step {throughput.resolution:.3g}; "
                   "the exchangers' allowed pressure drops, the streams' allowed pressure drops and pumps, the "
                   "points' bands and the furnace's maximum fired duty are the limits checked)." +
                   _pump_text(today) + "</p></section>")
    return "".join(out)


def _pump_text(result) -> str:
    """One sentence on the pump check when a stream has a pump curve."""
    names = list(getattr(result.train, "pump_curves", {}))
    if not names:
        return ""
    return (f" A stream's pump ({', '.join(names)}) limits the flow where its route's pressure drop (exchangers and "
            "nozzles) meets the pump's curve less its allowance; the curve is interpolated monotone piecewise-cubic "
            "between the points given (PCHIP, Fritsch & Carlson 1980) and not extrapolated beyond them.")


def train_page(title, today, study, throughput=None, revamp_factor=1.0, currency="", prov=None) -> str:
    """A whole offline HTML page for the train (cautions and provenance included)."""
    return page(title, train_body(today, study, throughput, revamp_factor, currency), prov)
