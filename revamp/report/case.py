"""One exchanger's study as the reports show it: the ratings, the plant data, the options, the summary for the index.

The notebooks call these and display what they return; the computing (and every choice of the study) is the studies
layer's (:func:`revamp.studies.study_exchanger` returns a frozen ``ExchangerStudy``), the layout is here.
The plant-data section (``monitoring_items``, ``fit_text``, ``rf_figure``) lives in :mod:`revamp.report.plant` and
is re-exported here.
"""
from __future__ import annotations

import json
import re


from ..studies import ExchangerStudy, fouling_side, study_exchanger  # noqa: F401  (fouling_side: re-exported)
from .labels import NAMES, rescale
from .pages import esc, figure_html, plot_text, temperatures_in, write_atomic
from .plant import fit_text, monitoring_items, rf_figure  # noqa: F401  (the plant-data section: report/plant.py)


def run_case(case, mc_draws: int = 100, **kwargs) -> ExchangerStudy:
    """The exchanger's study, as the notebooks call it: :func:`revamp.studies.study_exchanger` (same arguments)."""
    return study_exchanger(case, mc_draws=mc_draws, **kwargs)


def _source_text(setting) -> str:
    """``(from the unit file, <path>)`` or the default's own words, for a :class:`revamp.studies.Setting`."""
    src = setting.source
    if src.startswith("unit file: "):
        return f"from the unit file, {src[len('unit file: '):]}"
    return src[len("default: "):] if src.startswith("default: ") else src


def cycle_text(cycle) -> str:
    """The paragraph the report shows about the fouling cycle (:class:`revamp.studies.CycleSettings`)."""
    days = lambda s: f"{s / 86400.0:.4g} days"
    run = f"Run length {days(cycle.run_length.value)} ({_source_text(cycle.run_length)})"
    if cycle.downtime.source.startswith("unit file: "):
        down = (f"cleaning downtime {days(cycle.downtime.value)} per run, counted with no duty "
                f"({_source_text(cycle.downtime)})")
    else:
        down = "no cleaning downtime counted (the unit file gives none)"
    side = cycle.side.value
    return (f"Duty averaged over the run: the duty averaged over the next run until a cleaning, with the {side}-side "
            f"fouling growing as the plant-data trend says; value, payback and NPV use it instead of the end-of-run duty. "
            f"{run}, {down}; the other side, with no growth model, goes linearly from where the option leaves it "
            f"to its design fouling at the end of the run. Fouling model: {cycle.model_text}. Side: "
            f"{cycle.side.source}. Doing nothing, the base case goes on fouling from where the plant data leave it "
            f"({cycle.base_age / 86400.0:.0f} days into its run); every option is installed at a shutdown and "
            f"starts its run clean.")


_NUMBER_AFTER_EQUALS = re.compile(r"(= )(-?[0-9][0-9.]*(?:e[-+]?[0-9]+)?)")


def _note_pattern(text: str) -> tuple:
    """A note's text with the number after its first ``=`` taken out (the pattern), and that number (or None)."""
    m = _NUMBER_AFTER_EQUALS.search(text)
    if not m:
        return text, None
    return text[:m.start(2)] + "{}" + text[m.end(2):], (float(m.group(2)), m.group(2))


def notes_legend(notes, system: str = "SI") -> tuple:
    """Number the notes: ``(marks, table)``.

    ``marks`` maps each :class:`revamp.studies.Note` to its number. Notes that say the same thing of the same
    quantity with another value (e.g. a property fit outside its range at 533.9 K in one rating, 613.2 K in another)
    share one number, and the table states the range of those values. The table has one row per number: where it
    applies (the ratings), the quantity it qualifies, the severity and the note.
    """
    import pandas as pd

    groups, marks = {}, {}
    for n in notes:
        pattern, value = _note_pattern(n.text)
        key = (n.quantity, n.severity, pattern)
        g = groups.setdefault(key, {"number": len(groups) + 1, "where": [], "values": []})
        g["where"].append(n.source)
        if value is not None:
            g["values"].append(value)
        marks[n] = g["number"]
    rows = []
    for (quantity, severity, pattern), g in groups.items():
        text = pattern
        if "{}" in pattern:
            (lo, lo_text), (hi, hi_text) = min(g["values"]), max(g["values"])
            text = pattern.replace("{}", lo_text if lo == hi else f"{lo_text} to {hi_text}", 1)
        rows.append({"where": ", ".join(dict.fromkeys(g["where"])), "severity": severity,
                     "qualifies": NAMES.get(quantity, quantity) if isinstance(quantity, str) else quantity,
                     "note": temperatures_in(text, system)})  # the report's temperature unit, not kelvin
    table = pd.DataFrame(rows, index=[f"[{g['number']}]" for g in groups.values()],
                         columns=["where", "qualifies", "severity", "note"])
    return marks, table


def _marks_for(notes, marks, source, quantity=None) -> list:
    return sorted({marks[n] for n in notes if n.source == source and (quantity is None or n.quantity == quantity)})


RATING_COLUMNS = [("duty", "power"), ("t_out_shell", "temperature"), ("t_out_tube", "temperature"),
                  ("U_clean", "htc"), ("U_service", "htc"), ("h_shell", "htc"), ("h_tube", "htc"),
                  ("dp_shell", "pressure"), ("dp_tube", "pressure"), ("velocity_tube", "velocity"),
                  ("velocity_shell", "velocity")]


def ratings_table(ratings: dict, system: str = "SI", notes=(), marks=None):
    """A display table (pandas DataFrame) of named ratings in ``system`` units, one column per rating.

    With ``notes`` (:class:`revamp.studies.Note`, their ``source`` the rating labels), a last column ``notes`` puts
    beside each quantity the numbers of the notes that qualify it, as ``label [n]`` (``marks`` from
    :func:`notes_legend`; built here when not given).
    """
    import pandas as pd

    from ..units import from_si

    rows = {}
    for label, r in ratings.items():
        col = {}
        for attr, kind in RATING_COLUMNS:
            value, unit = from_si(float(getattr(r, attr)), kind, system)
            col[f"{attr} [{unit}]"] = round(value, 3 if abs(value) < 100 else 1)
        rows[label] = col
    table = pd.DataFrame(rows)
    if notes:
        marks = marks if marks is not None else notes_legend(notes)[0]
        column = []
        for attr, _ in RATING_COLUMNS:
            cells = [f"{label} {' '.join(f'[{m}]' for m in found)}" for label in ratings
                     if (found := _marks_for(notes, marks, label, attr))]
            column.append("; ".join(cells))
        table["notes"] = column
    return table


def rating_items(result, system: str = "SI") -> list:
    """The ratings section: the four base-case ratings with the note numbers beside the quantities they qualify,
    then the notes themselves (or a line saying there are none)."""
    labels = ("today", "today (clean)", "revamp", "revamp (clean)")
    notes = [n for n in result.notes if n.source in labels]
    marks, legend = notes_legend(notes, system)
    items = [ratings_table(result.ratings, system, notes, marks)]
    if notes:
        items += ["Notes on these ratings (numbers in the notes column point here): a warning means the number "
                  "it qualifies comes from a method outside its stated range or from extrapolated properties, and "
                  "is less certain.", legend]
    else:
        items.append("No rating raised a warning.")
    return items


def breakdown_figure(ratings: dict, title: str = "Where the resistance to heat transfer lies"):
    """Stacked bars of the five series resistances (outside-area basis), one bar per named rating."""
    import plotly.graph_objects as go

    labels = [plot_text(k) for k in ratings]
    fig = go.Figure()
    names = list(next(iter(ratings.values())).resistances.index)
    for name in names:
        fig.add_bar(name=name, x=labels, y=[float(r.resistances[name]) * 1e4 for r in ratings.values()])
    fig.update_layout(barmode="stack", title=title, yaxis_title="resistance [10⁻⁴ m²·K/W, outside area]",
                      height=420, margin={"t": 50}, legend={"orientation": "h", "y": -0.2})
    return fig


def option_breakdown_figure(study):
    """The five resistances of the base case and of each option at the revamp conditions (rows of study.table)."""
    ratings = {str(k): study.ratings[k] for k in study.table.index if k in study.ratings}
    return breakdown_figure(ratings, "Resistances of each option at the revamp conditions")


def summary(result) -> dict:
    """The few numbers the unit index shows for one exchanger (JSON-ready)."""
    case, today, rev, svc_rev = result.case, result.today, result.revamp, result.service_revamp
    target = case.target or {}
    text = ", ".join(f"{k} {v:.4g}" for k, v in target.items())
    if "duty" in target:
        text, meets = f"duty {target['duty'] / 1e3:,.0f} kW", float(rev.duty) >= target["duty"]
    elif "t_out_tube" in target:
        text = f"tube outlet {target['t_out_tube'] - 273.15:.1f} °C"
        hot_tube = float(svc_rev.tube.t_in) > float(svc_rev.shell.t_in)
        meets = (float(rev.t_out_tube) <= target["t_out_tube"]) if hot_tube else (float(rev.t_out_tube) >= target["t_out_tube"])
    elif "t_out_shell" in target:
        text = f"shell outlet {target['t_out_shell'] - 273.15:.1f} °C"
        hot_shell = float(svc_rev.shell.t_in) > float(svc_rev.tube.t_in)
        meets = (float(rev.t_out_shell) <= target["t_out_shell"]) if hot_shell else (float(rev.t_out_shell) >= target["t_out_shell"])
    else:
        meets = None
    out = {"tag": case.tag, "duty_today": float(today.duty), "duty_revamp": float(rev.duty), "target": text,
           "target_duty": target.get("duty"), "meets_target": meets, "recommendation": ""}
    study = result.study
    out["warnings"] = sum(1 for n in result.notes if n.severity == "warning")
    if study is not None:
        out["recommendation"] = str(study.recommendation or "")
        out["judged_on"], out["rank_by"] = study.basis, study.rank_by
        out["value_basis"] = getattr(study.economics, "value_basis", None)
        if "meets_target" in study.table and "base" in study.table.index and target:
            out["meets_target"] = bool(study.table.loc["base", "meets_target"])
        if "screening" in study.table and "base" in study.table.index:
            out["screening_as_is"] = str(study.table.loc["base", "screening"])
    return out


def write_summary(path, result) -> None:
    """Write :func:`summary` as JSON (atomically); ``path`` None does nothing."""
    if path:
        write_atomic(path, json.dumps(summary(result), indent=1))


def show(obj, interactive: bool = False):
    """Display a plotly figure or a DataFrame in a notebook: live plotly in Jupyter, offline HTML for the reports."""
    from IPython.display import HTML, display

    if hasattr(obj, "to_plotly_json"):
        if interactive:
            obj.show()
        else:
            display(HTML(figure_html(obj)))
    elif hasattr(obj, "to_html"):
        display(HTML(obj.to_html(escape=True, classes="rv-table", border=0)))
    else:
        display(HTML(f"<p>{esc(obj)}</p>"))


def _short(value) -> str:
    """A number in a sentence: three significant figures without trailing zeros (18, 21.6, 0.4)."""
    from .labels import format_value

    text = format_value(float(value))
    return text.rstrip("0").rstrip(".") if "." in text and "e" not in text else text


def fluid_source(fluid, system: str = "SI") -> str:
    """Where a fluid's properties come from, in plain words: the secondary line under the user's own name.

    >>> from revamp.fluids import water
    >>> fluid_source(water("4 bar", name="cooling water"))
    'properties: IAPWS-95 (through CoolProp), liquid at 4 bar'
    """
    from ..units import from_si
    from .labels import unit_of

    def pressure(p):
        if system == "US":
            mag, unit = from_si(float(p), "pressure", "US")
            return f"{_short(float(mag))} {unit_of(unit)}"
        return f"{_short(float(p) / 1e5)} bar"

    kind = type(fluid).__name__
    if kind == "CoolPropLiquid":
        return f"properties: {fluid.source}, liquid at {pressure(fluid.pressure)}"
    if kind == "PetroleumFluid":
        return (f"properties: petroleum-fraction correlations from API gravity {_short(fluid.api)} and Watson K "
                f"{_short(fluid.watson_k)}, with the two viscosities given")
    if kind == "TableFluid":
        lo, hi = (from_si(float(t), "temperature", system) for t in (fluid.t_min, fluid.t_max))
        return (f"properties: the user's table, {_short(float(lo[0]))} to {_short(float(hi[0]))} "
                f"{unit_of(lo[1])}")
    if kind == "ConstantFluid":
        return "properties: constant values given by the user"
    return f"properties: {kind}"


def revamp_lines(today, revamp, throughput: float = 1.0, system: str = "SI") -> list:
    """What changes from today's service to the revamp service, side by side, in words: which side's flow was scaled
    (and by how much), which inlet moved; the sides left as today say so.

    >>> from revamp import Service, Stream
    >>> from revamp.fluids import constant
    >>> oil = constant(850, 2200, 2e-3, 0.12, name="diesel")
    >>> cw = constant(995, 4180, 8e-4, 0.6, name="cooling water")
    >>> a = Service(shell=Stream(oil, 18.0, 393.15), tube=Stream(cw, 45.0, 303.15))
    >>> b = Service(shell=Stream(oil, 21.6, 393.15), tube=Stream(cw, 45.0, 305.15))
    >>> for line in revamp_lines(a, b, 1.2): print(line)
    throughput × 1.2
    shell side (diesel): flow × 1.2, 18 → 21.6 kg/s; inlet as today
    tube side (cooling water): flow as today; inlet 30 → 32 °C
    """
    import math

    from ..units import from_si
    from .labels import unit_of

    def q(v, kind):
        mag, unit = from_si(float(v), kind, system)
        return _short(float(mag)), unit_of(unit)

    lines = [f"throughput × {throughput:g}"]
    for side in ("shell", "tube"):
        a, b = getattr(today, side), getattr(revamp, side)
        name = getattr(a.fluid, "name", side)
        fa, fb, ta, tb = float(a.flow), float(b.flow), float(a.t_in), float(b.t_in)
        if math.isclose(fa, fb, rel_tol=1e-9):
            flow = "flow as today"
        else:
            (x, unit), (y, _) = q(fa, "mass_flow"), q(fb, "mass_flow")
            flow = f"flow × {fb / fa:.3g}, {x} → {y} {unit}"
        if math.isclose(ta, tb, rel_tol=0.0, abs_tol=1e-9):
            inlet = "inlet as today"
        else:
            (x, unit), (y, _) = q(ta, "temperature"), q(tb, "temperature")
            inlet = f"inlet {x} → {y} {unit}"
        lines.append(f"{side} side ({name}): {flow}; {inlet}")
    return lines


def case_header_html(case, unit, result=None, system: str = "SI") -> str:
    """Who the exchanger is and what it serves, as escaped HTML: each side's fluid by the user's own name with the
    property source on a plain second line, and what the revamp changes on each side (flows scaled, inlets moved).

    ``result`` (the :class:`revamp.studies.ExchangerStudy`) gives the services the study used, e.g. the inlets a
    train solve gave; without it, the unit file's own services are shown."""
    from ..units import format_quantity

    def fq(v, kind):
        return format_quantity(v, kind, system)

    ex = case.exchanger
    s = getattr(result, "service_today", None) or case.service
    rev = getattr(result, "service_revamp", None) or case.revamp_service
    side = lambda st: (f"{getattr(st.fluid, 'name', '')}: {fq(st.flow, 'mass_flow')}, in at "  # noqa: E731
                       f"{fq(st.t_in, 'temperature')}", fluid_source(st.fluid, system))
    changes = revamp_lines(s, rev, case.throughput, system)
    rows = [["unit", unit.name], ["exchanger", case.tag], ["description", case.description],
            ["shells (series × parallel)", f"{ex.shells} × {ex.shells_parallel}"],
            ["tubes", f"{ex.tube_count} × {fq(ex.tube_od, 'length')} od, {fq(ex.tube_length, 'length')}, "
                      f"{ex.tube_passes} pass(es)"],
            ["area (outside, all shells)", fq(ex.area_outside, "area")],
            ["shell side today", side(s.shell)], ["tube side today", side(s.tube)],
            ["revamp conditions", (changes[0], *changes[1:])]]
    out = ['<table class="rv-table"><tbody>']
    for label, cell in rows:
        if isinstance(cell, tuple):  # a main line and plain secondary lines
            text = esc(cell[0]) + "".join(f'<br><span class="rv-secondary">{esc(c)}</span>' for c in cell[1:])
        else:
            text = esc(cell)
        out.append(f"<tr><th>{esc(label)}</th><td>{text}</td></tr>")
    out.append("</tbody></table>")
    return "".join(out)


def unit_table(unit, system: str = "SI"):
    """All exchangers of a unit in one table: duty today and at revamp, U, pressure drops against the allowed."""
    import pandas as pd

    from ..studies.unit import unit_ratings
    from ..units import from_si

    rows = []
    for case in unit.exchangers:
        if getattr(case, "kind", None) in ("air cooler", "condenser"):  # its own row: other sides
            from importlib import import_module

            unit_row = import_module(".air" if case.kind == "air cooler" else ".condenser", __package__).unit_row

            try:
                rows.append(unit_row(case, system))
            except Exception as exc:
                rows.append({"exchanger": case.tag, "error": f"{exc.__class__.__name__}: {exc}"})
            continue
        try:
            today, rev = unit_ratings(case)
        except Exception as exc:
            rows.append({"exchanger": case.tag, "error": f"{exc.__class__.__name__}: {exc}"})
            continue
        p = lambda v: round(from_si(float(v), "pressure", system)[0], 1)
        q = lambda v: round(from_si(float(v), "power", system)[0], 0)
        rows.append({"exchanger": case.tag, "description": case.description,
                     f"duty today [{from_si(1, 'power', system)[1]}]": q(today.duty),
                     f"duty at revamp [{from_si(1, 'power', system)[1]}]": q(rev.duty),
                     "U in service [W/m²K]": round(float(rev.U_service), 0),
                     "controlling resistance": rev.controlling_resistance(),
                     f"dp shell / allowed [{from_si(1, 'pressure', system)[1]}]":
                         f"{p(rev.dp_shell)} / {p(case.limits['dp_shell']) if 'dp_shell' in case.limits else '-'}",
                     f"dp tube / allowed [{from_si(1, 'pressure', system)[1]}]":
                         f"{p(rev.dp_tube)} / {p(case.limits['dp_tube']) if 'dp_tube' in case.limits else '-'}"})
    return pd.DataFrame(rows).set_index("exchanger")


def unit_figure(table):
    """Duty today and at revamp for every exchanger of :func:`unit_table`."""
    import plotly.graph_objects as go

    cols = [c for c in table.columns if c.startswith("duty")]
    fig = go.Figure()
    for c in cols:
        fig.add_bar(name=c, x=[plot_text(t) for t in table.index], y=table[c])
    fig.update_layout(barmode="group", title="Duty of each exchanger today and at the revamp conditions",
                      yaxis_title=cols[0].split("[")[-1].rstrip("]") if cols else "", height=420)
    return fig


def study_items(result, system: str = "SI") -> list:
    """What the options section shows: the basis every row is judged on, the comparison table in display units
    (with the note numbers of each row's rating), the money with its value basis and the ranking rule, the notes,
    and the study figures."""
    study = result.study
    if study is None:
        refused = [n.text for n in result.notes if n.source == "options" and n.severity == "error"]
        return refused or ["The unit file lists no option for this exchanger."]
    from .. import plots

    rows = {str(i) for i in study.table.index}
    notes = [n for n in result.notes if n.source in rows]
    marks, legend = notes_legend(notes, system)
    refused = [n.text for n in result.notes if n.source == "options" and n.severity == "error"]
    basis = str(study.basis_text or "").replace(" (duty_cycle_avg)", "")  # the column's words are in the table
    items = [basis] if basis else []
    items += refused  # an option the unit file check refused: named here, the others are rated
    items += [study_table(study, system, notes, marks)]
    if notes:
        items += ["Notes on the ratings of these rows (numbers in the notes column point here):", legend]
    if study.value_text:
        items.append(f"Money: {study.value_text}")
    if study.ranking_text:
        items.append(study.ranking_text)
    items.append(study_money_table(study))
    if "duty_cycle_avg" in study.table:
        items.append(cycle_text(result.cycle) if result.cycle is not None else
                     "Duty averaged over the run: the duty averaged over a run between cleanings; value, payback and "
                     "NPV use it.")
    elif result.cycle_error:
        items.append(f"No cycle-averaged duty (end-of-run duties used for the money): {result.cycle_error}.")
    elif result.monitoring is not None:
        items.append("No cycle-averaged duty: no fouling trend could be fitted to the plant data; value, payback "
                     "and NPV use the end-of-run duties.")
    return items + [plots.option_comparison(study, system), plots.resistance_breakdown(study),
                    plots.economics_chart(study)]


_STUDY_COLUMNS = [("duty", "power"), ("duty_gain", "power"), ("duty_cycle_avg", "power"), ("U_service", "htc"), ("t_out_shell", "temperature"),
                  ("t_out_tube", "temperature"), ("dp_shell", "pressure"), ("dp_tube", "pressure"),
                  ("velocity_tube", "velocity"), ("velocity_shell", "velocity")]


def study_table(study, system: str = "SI", notes=(), marks=None):
    """The study table with physical columns in display units and the money and screening columns as they are;
    with ``notes``, a last column gives each row's note numbers beside the quantity they qualify."""
    import pandas as pd

    from ..units import from_si

    t = study.table
    out = pd.DataFrame(index=[str(i) for i in t.index])
    for col, kind in _STUDY_COLUMNS:
        if col in t:
            mag, unit = from_si(t[col].to_numpy(dtype=float), kind, system)
            factor, unit = rescale(unit)  # rounded in the unit shown (MW), so a gain of a few W reads 0, not 8.9e-05
            out[f"{col} [{unit}]"] = [round(float(v) * factor, 3 if abs(v * factor) < 100 else 1) for v in mag]
    if "controlling" in t:
        out["controlling resistance"] = t["controlling"].tolist()
    if notes:
        marks = marks if marks is not None else notes_legend(notes)[0]
        column = []
        for label in out.index:
            by_quantity = {}
            for n in notes:
                if n.source == label:
                    by_quantity.setdefault(n.quantity, set()).add(marks[n])
            column.append("; ".join(f"{NAMES.get(q, q)} {' '.join(f'[{m}]' for m in sorted(ms))}"  # in words
                                    for q, ms in by_quantity.items()))
        out["notes"] = column
    return out


def study_money_table(study):
    """Screening statuses, target, money and rank of each row of the study, with the one-line reason."""
    import pandas as pd

    t = study.table
    out = pd.DataFrame(index=[str(i) for i in t.index])
    cur = getattr(study.economics, "currency", "") or ""
    names = {"dp_shell_status": "dp shell", "dp_tube_status": "dp tube", "velocity_status": "tube velocity",
             "vibration_status": "vibration", "nozzle_status": "nozzle", "meets_target": "meets target",
             "capex": f"capex [{cur}]", "annual_value": f"value [{cur}/yr]", "payback": "payback [yr]",
             "npv": f"NPV [{cur}]", "value_basis": "value basis", "money_basis": "money on",
             "annual_value_own": f"own-duty value [{cur}/yr]", "payback_own": "own-duty payback [yr]",
             "npv_own": f"own-duty NPV [{cur}]", "rank": f"rank (by {getattr(study, 'rank_by', '')})",
             "reason": "why"}
    for col, name in names.items():
        if col in t:
            values = t[col].tolist()
            if col in ("capex", "annual_value", "npv", "annual_value_own", "npv_own"):
                values = ["" if pd.isna(v) else f"{v:,.0f}" for v in values]
            elif col in ("payback", "payback_own"):
                values = ["" if pd.isna(v) else f"{v:.2f}" for v in values]
            out[name] = values
    return out


def recommendation_html(result) -> str:
    """The recommendation, followed by the numbers of the notes that qualify the first-ranked option's rating
    (the same numbers as the options section's legend)."""
    study = result.study
    if study is None:
        return "<p>No option to compare.</p>"
    html = f'<p class="rv-recommendation"><b>{esc(study.recommendation)}</b></p>'
    ranked = study.ranked() if len(study.table.index) > 1 else None
    if ranked is not None and len(ranked):
        best = str(ranked.index[0])
        rows = {str(i) for i in study.table.index}
        notes = [n for n in result.notes if n.source in rows]
        marks, _ = notes_legend(notes)
        own = sorted({marks[n] for n in notes if n.source == best and n.severity != "info"})
        if own:
            html += (f"<p>Read it with the notes on the rating of {esc(best)}: "
                     f"{esc(', '.join(f'[{m}]' for m in own))} (see the options section).</p>")
    return html




def train_value_items(train_study, tag: str, currency: str = "") -> list:
    """What each option of exchanger ``tag`` is worth to the whole train (a :class:`revamp.train.TrainStudy` of its
    options, each applied alone at the revamp conditions): its own duty gain in the train beside the fired duty the
    train saves, and the money on the train's value. Empty without a train study."""
    if train_study is None:
        return []
    import pandas as pd

    t = train_study.table
    base = t.loc["base"]
    rows = {}
    prefix = f"{tag}: "
    for label in t.index:
        if label == "base":
            continue
        r = t.loc[label]
        rows[str(label)[len(prefix):] if str(label).startswith(prefix) else str(label)] = {
            "duty gain in this exchanger [MW]": (float(r[f"duty {tag}"]) - float(base[f"duty {tag}"])) / 1e6,
            "fired duty saved by the train [MW]": float(r["furnace_duty_saved"]) / 1e6,
            "furnace inlet rise [K]": float(r["furnace_inlet"]) - float(base["furnace_inlet"]),
            f"value per year, train [{currency}]".replace(" []", ""): float(r.get("annual_value", float("nan"))),
            "payback, train [years]": float(r.get("payback", float("nan"))),
            "limits of the train": str(r.get("limits", "")),
        }
    table = pd.DataFrame(rows).T
    return ["What each option is worth to the whole preheat train: the option applied to this exchanger alone and the "
            "train solved again at the revamp conditions, every exchanger at the end of its run (its design "
            "fouling), so the heat the exchangers downstream no longer recover is taken off; on the fuel value basis "
            "the options' money above is this value (the train page applies each option as it is, a cleaning "
            "there starting from a clean bundle).", table]
