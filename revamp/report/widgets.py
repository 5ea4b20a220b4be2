"""Interactive controls for JupyterLab (ipywidgets): re-rate and redraw in place; static stand-ins for reports.

The ratings are computed in :mod:`revamp.studies.what_if`; here they are cached, laid out and drawn."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..studies.what_if import what_if, what_if_rating  # noqa: F401  (what_if: the notebooks' name)
from .pages import esc


def widgets_available() -> bool:
    """Whether ipywidgets can be imported (the notebooks fall back to static output otherwise)."""
    try:
        import ipywidgets  # noqa: F401
    except ImportError:
        return False
    return True


#: the what-if controls: name -> (lowest, highest, step) of the slider, SI (fouling [m²K/W] on its own surface)
_FOULING_STEP = 0.25e-4


@dataclass(frozen=True)
class WhatIfPoint:
    """One what-if case as the table and chart need it (a scalar slice of a vectorized rating).

    Numeric fields as :class:`revamp.rating.Rating` names them [SI]; ``resistances`` the five series resistances
    [m²K/W, outside-area basis]."""

    duty: float
    t_out_shell: float
    t_out_tube: float
    U_clean: float
    U_service: float
    h_shell: float
    h_tube: float
    dp_shell: float
    dp_tube: float
    velocity_tube: float
    velocity_shell: float
    resistances: object


def _points(rating, n: int) -> list:
    """Scalar slices of a rating over ``n`` cases."""
    import numpy as np

    cols = {f: np.broadcast_to(np.asarray(getattr(rating, f), dtype=float), (n,))
            for f in WhatIfPoint.__dataclass_fields__ if f != "resistances"}
    res = rating.resistances
    rows = [res.iloc[i] if hasattr(res, "iloc") and getattr(res, "ndim", 1) == 2 else res for i in range(n)]
    return [WhatIfPoint(**{f: float(v[i]) for f, v in cols.items()}, resistances=rows[i].astype(float))
            for i in range(n)]


class WhatIf:
    """What-if ratings of one exchanger (as is, with twisted tapes, with N shells in series), cached.

    A miss rates the whole range of the slider that moved in one vectorized :func:`revamp.rate` call per case
    (throughput, shell fouling or tube fouling as an array of the service), so the next positions of that slider are
    already rated; the twist ratio and the shell count change the exchanger, so they cost one scalar rating.

    Parameters
    ----------
    case : Exchanger case of a unit file (``exchanger``, ``service``, ``throughput``, ``limits``).
    throughputs, foulings : ndarray
        The slider positions: throughput factors [-] and fouling resistances [m²K/W].
    """

    def __init__(self, case, throughputs, foulings_shell, foulings_tube):
        import numpy as np

        self.case = case
        self.grid = {"throughput": np.asarray(throughputs, float), "fouling_shell": np.asarray(foulings_shell, float),
                     "fouling_tube": np.asarray(foulings_tube, float)}
        self._cache: dict = {}
        self.ratings_run = 0  # vectorized or scalar ratings made (for the benchmark)

    @staticmethod
    def _key(x) -> float:
        return round(float(x), 9)

    def _rate(self, kind, throughput, fs, ft, twist_ratio, shells, along):
        values = {"throughput": throughput, "fouling_shell": fs, "fouling_tube": ft}
        if along is not None:
            values[along] = self.grid[along]
        rating = what_if_rating(self.case, "as is" if kind not in ("tape", "shells") else kind,
                                values["throughput"], values["fouling_shell"], values["fouling_tube"], twist_ratio,
                                shells)
        self.ratings_run += 1
        n = len(self.grid[along]) if along is not None else 1
        for i, pt in enumerate(_points(rating, n)):
            v = dict(values)
            if along is not None:
                v[along] = self.grid[along][i]
            self._cache[self._cache_key(kind, v["throughput"], v["fouling_shell"], v["fouling_tube"], twist_ratio,
                                        shells)] = pt

    def _cache_key(self, kind, throughput, fs, ft, twist_ratio, shells):
        k = self._key
        return (kind, k(throughput), k(fs), k(ft), k(twist_ratio) if kind == "tape" else 0.0,
                int(shells) if kind == "shells" else 0)

    def point(self, kind, throughput, fs, ft, twist_ratio=4.0, shells=1, along=None) -> WhatIfPoint:
        """One case at these settings; on a miss the whole range of ``along`` (a slider name) is rated at once."""
        key = self._cache_key(kind, throughput, fs, ft, twist_ratio, shells)
        if key not in self._cache:
            at = {"throughput": throughput, "fouling_shell": fs, "fouling_tube": ft}
            on_grid = along in self.grid and bool((abs(self.grid[along] - at[along]) < 1e-12).any())
            try:
                self._rate(kind, throughput, fs, ft, twist_ratio, shells, along if on_grid else None)
            except Exception:  # a setting elsewhere on the slider that cannot be rated: rate this one alone
                if not on_grid:
                    raise
                self._rate(kind, throughput, fs, ft, twist_ratio, shells, None)
        return self._cache[key]

    def prefetch_one(self, throughput, fs, ft, twist_ratio=4.0, shells=None) -> bool:
        """Rate one slider range not yet cached at these settings (the neighbours of the current position on each
        slider); False when there is nothing left to rate. Called when the controls are idle."""
        n = int(shells or self.case.exchanger.shells)
        kinds = ["as is", "tape"] + (["shells"] if n != self.case.exchanger.shells else [])
        at = {"throughput": throughput, "fouling_shell": fs, "fouling_tube": ft}
        for along, grid in self.grid.items():
            i = int(np.argmin(np.abs(grid - at[along])))
            for j in (i + 1, i - 1):
                if not 0 <= j < len(grid):
                    continue
                moved = dict(at, **{along: float(grid[j])})
                for kind in kinds:
                    key = self._cache_key(kind, moved["throughput"], moved["fouling_shell"], moved["fouling_tube"],
                                          twist_ratio, n)
                    if key not in self._cache:
                        self.point(kind, moved["throughput"], moved["fouling_shell"], moved["fouling_tube"],
                                   twist_ratio, n, along=along)
                        return True
        return False

    def cases(self, throughput, fs, ft, twist_ratio=4.0, shells=None, along="throughput") -> dict:
        """``{label: WhatIfPoint}``: as is, with twisted tapes, and with ``shells`` in series when it differs."""
        ex = self.case.exchanger
        out = {"as is": self.point("as is", throughput, fs, ft, along=along),
               f"twisted tape y={twist_ratio:g}": self.point("tape", throughput, fs, ft, twist_ratio, along=along)}
        n = int(shells or ex.shells)
        if n != ex.shells:
            out[f"{n} shell(s) in series"] = self.point("shells", throughput, fs, ft, shells=n, along=along)
        return out


def _limits_row(case, points: dict, system: str) -> list:
    """One cell per case: which pressure drop is over the allowed (the unit file's, or the screening default)."""
    from ..screening import DEFAULT_DP_LIQUID
    from ..units import from_si
    from .labels import format_value

    limits = getattr(case, "limits", None) or {}
    cells = []
    for pt in points.values():
        over = []
        for side in ("shell", "tube"):
            given = f"dp_{side}" in limits
            allowed = float(limits[f"dp_{side}"]) if given else DEFAULT_DP_LIQUID
            dp = getattr(pt, f"dp_{side}")
            if dp > allowed:
                (a, unit), b = from_si(allowed, "pressure", system), from_si(dp, "pressure", system)[0]
                over.append(f"{side} ΔP {format_value(b)} > {format_value(a)} {unit} allowed"
                            + ("" if given else " (screening default)"))
        cells.append("over: " + "; ".join(over) if over else "within allowed ΔP")
    return cells


class _Affine:
    """SI -> display unit of one quantity kind as ``a + b·x`` (found once with pint, then plain arithmetic)."""

    def __init__(self, kind: str, system: str):
        from ..units import from_si
        from .labels import rescale

        zero, unit = from_si(0.0, kind, system)
        one = from_si(1.0, kind, system)[0]
        factor, self.unit = rescale(unit)
        self.a, self.b = zero * factor, (one - zero) * factor

    def __call__(self, x: float) -> float:
        return self.a + self.b * x


def what_if_table_html(case, points: dict, system: str = "SI", _conv: dict | None = None) -> str:
    """The what-if table: the main results of each case in display units (the rows of the reports' ratings table),
    and a row flagging pressure drops over the allowed. Built without pandas or pint in the loop (a slider move
    redraws it)."""
    from .case import RATING_COLUMNS
    from .labels import display_name, format_value

    conv = _conv if _conv is not None else {kind: _Affine(kind, system) for _, kind in RATING_COLUMNS}
    head = "".join(f"<th>{esc(k)}</th>" for k in points)
    rows = []
    for attr, kind in RATING_COLUMNS:
        c = conv[kind]
        cells = "".join(f'<td class="num">{esc(format_value(c(getattr(p, attr))))}</td>' for p in points.values())
        rows.append(f"<tr><th>{esc(display_name(f'{attr} [{c.unit}]', rescale_units=False))}</th>{cells}</tr>")
    flags = _limits_row(case, points, system)
    rows.append("<tr><th>pressure drop vs allowed</th>" + "".join(
        f'<td class="{"rv-status-failed" if f.startswith("over") else "rv-status-ok"}">{esc(f)}</td>'
        for f in flags) + "</tr>")
    return (f'<div class="rv-scroll"><table class="rv-table"><thead><tr><th></th>{head}</tr></thead><tbody>'
            + "".join(rows) + "</tbody></table></div>")


def _breakdown_traces(points: dict, system: str):
    """x labels, {resistance: y values} and the axis unit of the resistance chart (shared with the reports)."""
    from .labels import RESISTANCES, resistance_axis
    from .pages import plot_text

    factor, unit = resistance_axis(system)
    labels = [plot_text(k) for k in points]
    return labels, {n: [float(p.resistances[n]) * factor for p in points.values()] for n in RESISTANCES}, unit


def _nice_step(top: float, ticks: int = 5) -> float:
    """A tick step of 1, 2, 2.5 or 5 × 10^k giving about ``ticks`` intervals up to ``top`` (common practice)."""
    import math

    raw = max(top, 1e-300) / ticks
    mag = 10.0 ** math.floor(math.log10(raw))
    return next(m * mag for m in (1.0, 2.0, 2.5, 5.0, 10.0) if m * mag >= raw)


def _tick(value: float) -> str:
    """An axis tick: three significant figures, no trailing zeros (10, 2.5, 0.25)."""
    from .labels import format_value

    text = format_value(value)
    return text.rstrip("0").rstrip(".") if "." in text and "e" not in text else text


def breakdown_svg(labels, ys: dict, unit: str, title: str = "Where the resistance to heat transfer lies (what if)",
                  width: int = 720, height: int = 420) -> str:
    """The what-if resistance chart as one inline SVG: a stacked bar per case, the five resistances in their colours
    (:data:`revamp.report.labels.RESISTANCE_COLOURS`), a labelled value axis and a legend.

    Drawn as text so that a slider move repaints it in the same step as the table (a plotly figure re-lays itself
    out on every update: 100-300 ms in the browser); the size is fixed, so the page never jumps.

    Parameters
    ----------
    labels : list of str
        One case per bar.
    ys : dict
        Resistance name -> one value per case [``unit``], stacked in the dict's order from the bottom.
    unit : str
        The axis unit (e.g. ``"10⁻⁴ m²·K/W"``).
    """
    from .labels import RESISTANCE_COLOURS, format_value

    left, right, top, bottom = 70, 20, 40, 95
    pw, ph = width - left - right, height - top - bottom
    totals = [sum(float(ys[n][i]) for n in ys) for i in range(len(labels))]
    peak = max([t for t in totals if t == t] + [0.0])
    step = _nice_step(peak if peak > 0 else 1.0)
    y_max = step * max(1, -(-peak // step)) if peak > 0 else step * 5
    sy = ph / y_max
    out = [f'<svg class="rv-whatif-chart" xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
           f'viewBox="0 0 {width} {height}" role="img" style="font:12px sans-serif">',
           f'<text x="{width / 2:.0f}" y="20" text-anchor="middle" style="font-size:14px">{esc(title)}</text>']
    k = 0
    while k * step <= y_max * (1 + 1e-9):
        y = top + ph - k * step * sy
        out.append(f'<line x1="{left}" x2="{left + pw}" y1="{y:.1f}" y2="{y:.1f}" stroke="#e5e5e5"/>'
                   f'<text x="{left - 6}" y="{y + 4:.1f}" text-anchor="end">{esc(_tick(k * step))}</text>')
        k += 1
    out.append(f'<text transform="translate(16 {top + ph / 2:.0f}) rotate(-90)" text-anchor="middle">'
               f'resistance [{esc(unit)}, outside area]</text>')
    slot = pw / max(len(labels), 1)
    bar = min(120.0, 0.6 * slot)
    for i, label in enumerate(labels):
        x, base = left + slot * (i + 0.5) - bar / 2, top + ph
        for name, values in ys.items():
            v = float(values[i])
            if not v > 0:
                continue
            h = v * sy
            base -= h
            out.append(f'<rect x="{x:.1f}" y="{base:.1f}" width="{bar:.1f}" height="{h:.1f}" '
                       f'fill="{RESISTANCE_COLOURS.get(name, "#888888")}"><title>{esc(name)}: {esc(format_value(v))} '
                       f'{esc(unit)}</title></rect>')
        out.append(f'<text x="{x + bar / 2:.1f}" y="{base - 4:.1f}" text-anchor="middle">'
                   f'{esc(format_value(totals[i]))}</text>'
                   f'<text x="{x + bar / 2:.1f}" y="{top + ph + 16}" text-anchor="middle">{esc(label)}</text>')
    out.append(f'<line x1="{left}" x2="{left + pw}" y1="{top + ph}" y2="{top + ph}" stroke="#444"/>')
    lx, ly = left, height - 40
    for name in ys:
        out.append(f'<rect x="{lx}" y="{ly}" width="12" height="12" fill="{RESISTANCE_COLOURS.get(name, "#888888")}"/>'
                   f'<text x="{lx + 16}" y="{ly + 10}">{esc(name)}</text>')
        lx += 22 + 7 * len(name)
    out.append("</svg>")
    return "".join(out)


def _live_hint():
    """A plain hint shown where the controls are not live (a saved notebook reopened: 'model not found'); the
    controls, once drawn by a running kernel, carry a style that hides it."""
    from IPython.display import HTML, display

    display(HTML('<p class="rv-widget-hint" style="color:#8a5a00">The controls below are live only while this '
                 "notebook's kernel runs. If they show an error (e.g. after reopening a saved notebook), run all "
                 "cells again (Run &gt; Run All Cells).</p>"))
    return "<style>.rv-widget-hint{display:none}</style>"


def _figure_widget(fig):
    """A plotly FigureWidget (updated in place) when anywidget is installed, else None."""
    try:
        import plotly.graph_objects as go

        return go.FigureWidget(fig)
    except ImportError:
        return None


def what_if_widget(case, system: str = "SI", debounce: float = 0.03, idle: float = 1.0):
    """Controls (throughput, fouling on each side, twist ratio, shells) that re-rate and update the table and the
    chart in place.

    Moves closer together than ``debounce`` [s] are rated once, at the last position. After ``idle`` [s] without a
    move, the slider ranges next to the current position are rated in the background (one vectorized call per idle
    tick, so a move waits at most for one such call), so that switching sliders finds them ready. The fouling sliders are on
    each side's own surface (tube fouling on the inside area, as a unit file gives it); the chart beside them refers
    every resistance to the outside area, so the tube fouling there is the slider's value × do/di.
    """
    import asyncio
    import time

    import ipywidgets as w
    import numpy as np
    from IPython.display import display

    from ..units import from_si
    from .labels import unit_of

    ex = case.exchanger
    f_s, f_t = float(case.service.fouling_shell), float(case.service.fouling_tube)
    top = max(10e-4, 3 * max(f_s, f_t))
    foulings = np.round(np.arange(0.0, top + _FOULING_STEP / 2, _FOULING_STEP), 9)
    foulings = np.unique(np.round(np.concatenate([foulings, [f_s, f_t]]), 12))  # the file's own values exactly
    throughputs = np.round(np.arange(0.6, 1.6 + 1e-9, 0.05), 9)
    engine = WhatIf(case, throughputs, foulings, foulings)
    f_factor, f_unit = from_si(1.0, "fouling", system)
    f_unit = unit_of(f_unit)
    scale = 1e4 if system == "SI" else 1e3  # slider in 10⁻⁴ m²·K/W, or 10⁻³ h·ft²·°F/Btu
    f_label = ("10⁻⁴ " if system == "SI" else "10⁻³ ") + f_unit
    shown = lambda si: float(si) * f_factor * scale
    slider = dict(continuous_update=False, style={"description_width": "15em"}, layout=w.Layout(width="40em"))
    snap = lambda v: float(foulings[np.argmin(np.abs(foulings - v))])
    controls = {
        "throughput": w.FloatSlider(value=float(throughputs[np.argmin(np.abs(throughputs - case.throughput))]),
                                    min=0.6, max=1.6, step=0.05, description="throughput (both flows) ×", **slider),
        "fouling_shell": w.SelectionSlider(options=[(f"{shown(v):.3g}", float(v)) for v in foulings],
                                           value=snap(f_s), description=f"shell fouling [{f_label}]", **slider),
        "fouling_tube": w.SelectionSlider(options=[(f"{shown(v):.3g}", float(v)) for v in foulings],
                                          value=snap(f_t), description=f"tube fouling, inside area [{f_label}]",
                                          **slider),
        "twist_ratio": w.FloatSlider(value=4.0, min=2.5, max=10, step=0.5, description="twisted tape: twist ratio y",
                                     **slider),
        "shells": w.IntSlider(value=int(ex.shells), min=1, max=4, description="shells in series", **slider),
    }
    basis = w.HTML()
    table, status = w.HTML(layout=w.Layout(min_height="22em")), w.HTML()
    from .case import RATING_COLUMNS

    conv = {kind: _Affine(kind, system) for _, kind in RATING_COLUMNS}
    hide_hint = _live_hint()

    def current(along="throughput"):
        c = {k: v.value for k, v in controls.items()}
        return engine.cases(c["throughput"], c["fouling_shell"], c["fouling_tube"], c["twist_ratio"], c["shells"],
                            along=along)

    current()  # the first position rated before the controls show
    plot = w.HTML(layout=w.Layout(height="440px", overflow="hidden"))  # fixed height: the page never jumps
    ratio = float(ex.tube_od) / float(ex.tube_id)
    state = {"handle": None, "along": "throughput", "last": 0.0}

    def redraw():
        start = time.perf_counter()
        state["handle"] = None
        try:
            pts = current(state["along"])
        except Exception as exc:  # an infeasible setting: say why, keep the last picture
            status.value = f"<p class='rv-status-failed'>{esc(exc)}</p>"
            return
        table.value = what_if_table_html(case, pts, system, conv)
        labels, ys, r_unit = _breakdown_traces(pts, system)
        plot.value = breakdown_svg(labels, ys, r_unit)  # the chart in the same step as the table: one paint
        ft = controls["fouling_tube"].value
        basis.value = (f"<small>Tube fouling {shown(ft):.3g} {esc(f_label)} on the inside area is "
                       f"{shown(ft * ratio):.3g} on the outside area of the chart (× do/di = {ratio:.3f}).</small>")
        status.value = (f"<small>updated in {1e3 * (time.perf_counter() - start):.0f} ms{hide_hint}</small>")
        schedule_prefetch()

    def prefetch():  # idle: rate the next slider range that a move could need, one call per idle tick
        state["prefetch"] = None
        c = {k: v.value for k, v in controls.items()}
        try:
            more = engine.prefetch_one(c["throughput"], c["fouling_shell"], c["fouling_tube"], c["twist_ratio"],
                                       c["shells"])
        except Exception:  # a range that cannot be rated is rated point by point when the user gets there
            more = False
        if more:
            schedule_prefetch()

    def schedule_prefetch():
        try:
            loop = asyncio.get_running_loop()
        except RuntimeError:
            return
        if state.get("prefetch") is not None:
            state["prefetch"].cancel()
        state["prefetch"] = loop.call_later(idle, prefetch)

    def changed(change):
        for name, control in controls.items():
            if control is change["owner"] and name in engine.grid:
                state["along"] = name  # the next miss rates this slider's whole range
        try:
            loop = asyncio.get_running_loop()
        except RuntimeError:  # no event loop (called directly): at once
            redraw()
            return
        if state.get("prefetch") is not None:  # the user is moving: no background rating now
            state["prefetch"].cancel()
            state["prefetch"] = None
        now = loop.time()
        if state["handle"] is None and now - state["last"] >= debounce:  # a move after a pause: at once
            state["last"] = now
            redraw()
            return
        if state["handle"] is not None:  # quick moves: once, at the last position, ``debounce`` after the previous
            state["handle"].cancel()

        def trailing():
            state["last"] = loop.time()
            redraw()

        state["handle"] = loop.call_later(max(debounce - (now - state["last"]), 0.0), trailing)

    for c in controls.values():
        c.observe(changed, names="value")
    box = w.VBox([w.HTML(f"<b>What if: {esc(case.tag)}</b>"), *controls.values(), basis, status, table, plot])
    redraw()
    display(box)
    return box


def primer_table(rating):
    """The five resistances of one rating: value, share, and the U they give (outside-area basis)."""
    import pandas as pd

    r = rating.resistances
    total = float(r.sum())
    # SI numbers with their units in the headers: the report's table display rounds them and converts for US units
    return pd.DataFrame({"resistance [m²·K/W]": r.astype(float), "share of 1/U [%]": 100 * r / total,
                         "U if this one were zero [W/m²·K]": [1.0 / (total - float(v)) for v in r]},
                        index=pd.Index(list(r.index), name="resistance"))


def _primer_u(rating, scale_h_shell=1.0, scale_h_tube=1.0, fouling_shell=None, fouling_tube=None,
              wall_factor=1.0) -> dict:
    """The five resistances after scaling the films and setting the fouling (wall conductivity × ``wall_factor``)."""
    r = rating.resistances.astype(float).copy()
    ex = rating.exchanger
    ratio = ex.tube_od / ex.tube_id
    r["shell film"] = r["shell film"] / scale_h_shell
    r["tube film"] = r["tube film"] / scale_h_tube
    if fouling_shell is not None:
        r["shell fouling"] = fouling_shell
    if fouling_tube is not None:
        r["tube fouling"] = fouling_tube * ratio
    r["wall"] = r["wall"] / wall_factor
    return r


def primer_sweep(rating):
    """U as each resistance alone is halved, and as it is doubled (static stand-in for the widgets)."""
    import pandas as pd

    base = float(rating.resistances.sum())
    rows = {}
    for name in rating.resistances.index:
        r = float(rating.resistances[name])
        rows[name] = {"U as is [W/m²·K]": 1 / base, "U, this one halved [W/m²·K]": 1 / (base - r / 2),
                      "U, this one doubled [W/m²·K]": 1 / (base + r)}
    out = pd.DataFrame(rows).T
    out.index.name = "resistance"
    return out


def primer_widget(rating, system: str = "SI"):
    """Sliders for each resistance of one rating; the bar chart and U update in place.

    The fouling sliders are on each side's own surface (tube fouling on the inside area); the chart refers every
    resistance to the outside area (tube fouling × do/di), as every resistance chart of the reports does.
    """
    import ipywidgets as w
    import plotly.graph_objects as go
    from IPython.display import display

    from ..units import from_si
    from .labels import RESISTANCE_COLOURS, resistance_axis, unit_of

    ratio = rating.exchanger.tube_od / rating.exchanger.tube_id
    fs = float(rating.resistances["shell fouling"])
    ft = float(rating.resistances["tube fouling"]) / ratio
    factor, r_unit = resistance_axis(system)
    u_factor, u_unit = from_si(1.0, "htc", system)
    u_unit = unit_of(u_unit)
    st = dict(continuous_update=False, style={"description_width": "17em"}, layout=w.Layout(width="40em"))
    fouling = lambda v, d: w.FloatSlider(value=v * factor, min=0, max=max(10.0, 3 * v * factor), step=0.25,
                                         description=d, readout_format=".2f", **st)
    c = {"scale_h_shell": w.FloatSlider(value=1, min=0.25, max=4, step=0.05, description="shell film coefficient ×",
                                        **st),
         "scale_h_tube": w.FloatSlider(value=1, min=0.25, max=4, step=0.05, description="tube film coefficient ×",
                                       **st),
         "fouling_shell": fouling(fs, f"shell fouling [{r_unit}]"),
         "fouling_tube": fouling(ft, f"tube fouling, inside area [{r_unit}]"),
         "wall_factor": w.FloatSlider(value=1, min=0.2, max=5, step=0.1, description="wall conductivity ×", **st)}
    label = w.HTML()
    hide_hint = _live_hint()
    names = list(rating.resistances.index)
    fig = go.Figure(go.Bar(x=names, y=[0.0] * len(names), marker_color=[RESISTANCE_COLOURS.get(n, "#888")
                                                                           for n in names]))
    fig.update_layout(yaxis_title=f"resistance [{r_unit}, outside area]", height=360, margin={"t": 20},
                      template="simple_white")
    live = _figure_widget(fig)
    out = live if live is not None else w.Output(layout=w.Layout(min_height="380px"))

    def redraw(_=None):
        r = _primer_u(rating, c["scale_h_shell"].value, c["scale_h_tube"].value, c["fouling_shell"].value / factor,
                      c["fouling_tube"].value / factor, c["wall_factor"].value)
        label.value = (f"<b>U = {u_factor / float(r.sum()):,.0f} {esc(u_unit)}</b> (as rated: "
                       f"{u_factor * float(rating.U_service):,.0f}); controlling: {esc(r.idxmax())}. Tube fouling "
                       f"{c['fouling_tube'].value:.2f} on the inside area is {c['fouling_tube'].value * ratio:.2f} "
                       f"on the outside area of the chart.{hide_hint}")
        y = (r * factor).tolist()
        if live is not None:
            live.data[0].y = y
        else:
            fig.data[0].y = y
            with out:
                out.clear_output(wait=True)
                fig.show()

    for s_ in c.values():
        s_.observe(redraw, names="value")
    box = w.VBox([*c.values(), label, out])
    redraw()
    display(box)
    return box
