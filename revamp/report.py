"""HTML assembly for the reports: escaping, offline plotly figures, the provenance block, the cautions, atomic writes.

No physics here. Every user-supplied text goes through :func:`esc`; figures are written with plotly.js loaded from a
local file (``plotly.min.js`` copied once into the report folder), never from a CDN.

>>> esc('<E-1 & "x">')
'&lt;E-1 &amp; &quot;x&quot;&gt;'
>>> safe_name("../E<101> & co")
'E_101_co'
"""
from __future__ import annotations

import datetime as _dt
import hashlib
import html
import json
import os
import platform
import re
import shutil
import tempfile
from importlib import metadata
from pathlib import Path

__all__ = [
    "option_breakdown_figure",
    "CAUTIONS",
    "PACKAGES",
    "plot_text",
    "cautions_html",
    "copy_plotly_js",
    "esc",
    "figure_html",
    "file_sha256",
    "page",
    "plotly_js_source",
    "provenance",
    "provenance_html",
    "safe_name",
    "table_html",
    "write_atomic",
]

CAUTIONS = (
    "Screening-level results: every number comes from published correlations applied to the inputs shown, with their "
    "stated uncertainty (film coefficients typically within ±20–30 %).",
    "Mechanical design, flow-induced vibration and code compliance of any change must be verified by licensed "
    "engineers under the local codes before anything is built or operated; the vibration screen can flag a design, "
    "never clear it.",
    "Costs and prices are the user's inputs (the demo's figures are invented), not estimates made by this tool.",
)

#: packages whose versions a report records
PACKAGES = ("revamp", "numpy", "scipy", "pandas", "plotly", "pint", "CoolProp", "papermill", "nbconvert", "PyYAML")


def esc(text) -> str:
    """HTML-escape any user text (quotes included)."""
    return html.escape(str(text), quote=True)


def plot_text(text) -> str:
    """User text for a plotly label: ``<``, ``>`` and ``&`` escaped, which plotly decodes back for display, so the
    text shows exactly as written and no tag in it is interpreted (quotes stay as they are: plotly would show
    ``&quot;`` literally).

    >>> plot_text('E<1> & "x"')
    'E&lt;1&gt; &amp; "x"'
    """
    return html.escape(str(text), quote=False)


def safe_name(tag: str, taken=()) -> str:
    """A file-name-safe form of an exchanger tag: letters, digits, ``.``, ``_`` and ``-`` only, no leading dot,
    never ``index``, unique against ``taken``."""
    name = re.sub(r"[^A-Za-z0-9._-]+", "_", str(tag)).strip("._-") or "exchanger"
    name = re.sub(r"\.{2,}", ".", name)[:80]
    if name.lower() in ("index", "plotly.min"):
        name = f"{name}_"
    base, n = name, 2
    lowered = {t.lower() for t in taken}
    while name.lower() in lowered:
        name, n = f"{base}-{n}", n + 1
    return name


def _json_for_script(obj) -> str:
    """JSON safe inside a <script> element: no ``</script>``, no HTML comment or CDATA openers."""
    text = obj if isinstance(obj, str) else json.dumps(obj)
    return text.replace("<", "\\u003c").replace(">", "\\u003e").replace("&", "\\u0026").replace(
        "\u2028", "\\u2028").replace("\u2029", "\\u2029")


def figure_html(fig, div_id: str | None = None, height: int | None = None) -> str:
    """A plotly figure as a ``<div>`` and a ``<script>`` calling ``Plotly.newPlot``; plotly.js must be on the page."""
    import plotly.io as pio

    div_id = div_id or "fig-" + hashlib.sha1(pio.to_json(fig).encode()).hexdigest()[:12]
    payload = _json_for_script(pio.to_json(fig, validate=False))
    style = f"height:{int(height)}px;" if height else ""
    return (f'<div id="{esc(div_id)}" class="plotly-graph-div" style="width:100%;{style}"></div>\n'
            f'<script>(function(){{var f={payload};'
            f'Plotly.newPlot("{esc(div_id)}",f.data,f.layout||{{}},{{responsive:true,displaylogo:false}});}})();'
            f'</script>')


def plotly_js_source() -> Path:
    """The plotly.min.js shipped inside the plotly Python package (no download)."""
    import plotly

    path = Path(plotly.__file__).parent / "package_data" / "plotly.min.js"
    if not path.is_file():  # pragma: no cover - a broken plotly install
        raise FileNotFoundError(f"plotly.min.js not found in the plotly package at {path}")
    return path


def copy_plotly_js(out_dir) -> Path:
    """Copy plotly.min.js once into ``out_dir`` (atomically; skipped when an identical copy is there)."""
    src, dest = plotly_js_source(), Path(out_dir) / "plotly.min.js"
    if dest.is_file() and dest.stat().st_size == src.stat().st_size:
        return dest
    fd, tmp = tempfile.mkstemp(dir=dest.parent, prefix=".plotly-", suffix=".tmp")
    os.close(fd)
    shutil.copyfile(src, tmp)
    os.chmod(tmp, 0o666 & ~_umask())
    os.replace(tmp, dest)
    return dest


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def write_atomic(path, text: str) -> Path:
    """Write ``text`` to ``path`` through a temporary file in the same folder and ``os.replace``: a reader sees the
    old file or the whole new one, never half of it."""
    path = Path(path)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}-", suffix=".tmp")
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
        os.chmod(tmp, 0o666 & ~_umask())
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
    return path


def file_sha256(path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def provenance(unit_path=None, tag=None, extra_files=(), parameters=None, inputs=None) -> dict:
    """What produced a report: inputs and their SHA-256, package versions, Python, platform, UTC date.

    ``inputs`` (optional) is the exchanger's entry of the unit file, shown verbatim (as YAML) in the report."""
    versions = {}
    for name in PACKAGES:
        try:
            versions[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            versions[name] = "not installed"
    files = {}
    for p in [unit_path, *extra_files]:
        if p is not None and Path(p).is_file():
            files[Path(p).name] = file_sha256(p)
    return {
        "date": _dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M:%S UTC"),
        "unit_file": str(Path(unit_path).name) if unit_path else None,
        "tag": tag,
        "inputs_sha256": files,
        "parameters": dict(parameters or {}),
        "inputs": inputs,
        "versions": versions,
        "python": platform.python_version(),
        "platform": platform.platform(terse=True),
    }


def table_html(rows, header=None, cls="rv-table") -> str:
    """A simple escaped HTML table from a list of rows (each a list of cell texts)."""
    out = [f'<table class="{esc(cls)}">']
    if header:
        out.append("<thead><tr>" + "".join(f"<th>{esc(h)}</th>" for h in header) + "</tr></thead>")
    out.append("<tbody>")
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{esc(c)}</td>" for c in row) + "</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def provenance_html(prov: dict) -> str:
    rows = [["date", prov.get("date", "")], ["unit file", prov.get("unit_file") or ""],
            ["exchanger", prov.get("tag") or "(all)"]]
    rows += [[f"SHA-256 of {name}", digest] for name, digest in prov.get("inputs_sha256", {}).items()]
    rows += [[f"parameter {k}", v] for k, v in prov.get("parameters", {}).items()]
    rows += [[name, version] for name, version in prov.get("versions", {}).items()]
    rows += [["python", prov.get("python", "")], ["platform", prov.get("platform", "")]]
    inputs = ""
    if prov.get("inputs"):
        import yaml

        text = yaml.safe_dump(prov["inputs"], sort_keys=False, allow_unicode=True, width=110)
        inputs = f"<details><summary>The inputs of this exchanger, as in the unit file</summary><pre>{esc(text)}</pre></details>"
    return ('<section class="rv-provenance" id="provenance"><h2>What produced this report</h2>'
            + table_html(rows, ["item", "value"]) + inputs + "</section>")


def cautions_html() -> str:
    items = "".join(f"<li>{esc(c)}</li>" for c in CAUTIONS)
    return f'<section class="rv-cautions" id="cautions"><h2>Cautions</h2><ul>{items}</ul></section>'


_CSS = """
body{font-family:system-ui,-apple-system,'Segoe UI',Roboto,sans-serif;margin:0 auto;max-width:1100px;padding:1rem 2rem;
color:#1b1f24;line-height:1.45}
h1{font-size:1.6rem;border-bottom:2px solid #345;padding-bottom:.3rem}h2{font-size:1.25rem;margin-top:1.6rem}
table{border-collapse:collapse;margin:.6rem 0;font-size:.9rem}th,td{border:1px solid #ccd;padding:.25rem .55rem;
text-align:left;vertical-align:top}th{background:#eef1f5}td.num{text-align:right;font-variant-numeric:tabular-nums}
table.dataframe td{text-align:right}table.dataframe th{text-align:left}
.rv-cautions{background:#fff7e0;border-left:4px solid #d90;padding:.4rem 1rem;margin:1rem 0}
.rv-provenance{font-size:.8rem;color:#444}.rv-status-ok{color:#161}.rv-status-failed{color:#a11;font-weight:600}
.jp-InputPrompt,.jp-OutputPrompt,.prompt{display:none}pre{white-space:pre-wrap}
@media print{.plotly-graph-div{page-break-inside:avoid}}
"""


def page(title: str, body_html: str, prov: dict | None = None, plotly_src: str | None = "plotly.min.js",
         cautions: bool = True) -> str:
    """A whole offline HTML page: escaped title, plotly.js from a local file, the body, cautions and provenance.

    ``body_html`` is trusted HTML produced by the package (notebook outputs converted by nbconvert, tables made with
    escaping); ``title`` is user text and is escaped here.
    """
    script = f'<script src="{esc(plotly_src)}" charset="utf-8"></script>' if plotly_src else ""
    parts = ["<!DOCTYPE html>", '<html lang="en"><head><meta charset="utf-8">',
             '<meta name="viewport" content="width=device-width, initial-scale=1">',
             f"<title>{esc(title)}</title>", f"<style>{_CSS}</style>", script, "</head><body>",
             f"<h1>{esc(title)}</h1>", cautions_html() if cautions else "", body_html,
             provenance_html(prov) if prov else "", "</body></html>"]
    return "\n".join(p for p in parts if p)


# ------------------------------------------------------------------------------------------- one exchanger's study
def run_case(case, mc_draws: int = 100):
    """Everything a report on one exchanger shows, computed by the package (the notebooks only display it).

    Returns a dict: ``today``, ``today_clean``, ``revamp``, ``revamp_clean`` (Ratings), ``monitoring``
    (:class:`revamp.Monitoring` or None, with ``monitoring_error`` when the plant data could not be used) and
    ``study`` (:class:`revamp.Study` at the revamp conditions, or None when the file lists no option).
    """
    import revamp as rv

    out = {"case": case}
    out["today"] = rv.rate(case.exchanger, case.service)
    out["today_clean"] = rv.rate(case.exchanger, case.service.clean())
    out["revamp"] = rv.rate(case.exchanger, case.revamp_service)
    out["revamp_clean"] = rv.rate(case.exchanger, case.revamp_service.clean())
    out["monitoring"], out["monitoring_error"] = None, None
    if case.plant_data is not None:
        try:
            out["monitoring"] = rv.monitor(case.exchanger, case.service, case.plant_data.file,
                                           columns=case.plant_data.columns,
                                           uncertainty=case.plant_data.uncertainty or None, mc_draws=mc_draws)
        except Exception as exc:  # plant data is evidence, not a precondition: the study goes on without it
            out["monitoring_error"] = f"{exc.__class__.__name__}: {exc}"
    out["study"] = None
    if case.options:
        out["study"] = rv.compare(case.exchanger, case.service, list(case.options), target=case.target or None,
                                  limits=case.limits or None, economics=case.economics,
                                  revamp=case.revamp_service)
    return out


RATING_COLUMNS = [("duty", "power"), ("t_out_shell", "temperature"), ("t_out_tube", "temperature"),
                  ("U_clean", "htc"), ("U_service", "htc"), ("h_shell", "htc"), ("h_tube", "htc"),
                  ("dp_shell", "pressure"), ("dp_tube", "pressure"), ("velocity_tube", "velocity"),
                  ("velocity_shell", "velocity")]


def ratings_table(ratings: dict, system: str = "SI"):
    """A display table (pandas DataFrame) of named ratings in ``system`` units, one column per rating."""
    import pandas as pd

    from .units import from_si

    rows = {}
    for label, r in ratings.items():
        col = {}
        for attr, kind in RATING_COLUMNS:
            value, unit = from_si(float(getattr(r, attr)), kind, system)
            col[f"{attr} [{unit}]"] = round(value, 3 if abs(value) < 100 else 1)
        rows[label] = col
    return pd.DataFrame(rows)


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


def summary(result: dict) -> dict:
    """The few numbers the unit index shows for one exchanger (JSON-ready)."""
    case, today, rev = result["case"], result["today"], result["revamp"]
    target = case.target or {}
    text = ", ".join(f"{k} {v:.4g}" for k, v in target.items())
    if "duty" in target:
        text, meets = f"duty {target['duty'] / 1e3:,.0f} kW", float(rev.duty) >= target["duty"]
    elif "t_out_tube" in target:
        text = f"tube outlet {target['t_out_tube'] - 273.15:.1f} °C"
        hot_tube = float(case.revamp_service.tube.t_in) > float(case.revamp_service.shell.t_in)
        meets = (float(rev.t_out_tube) <= target["t_out_tube"]) if hot_tube else (float(rev.t_out_tube) >= target["t_out_tube"])
    elif "t_out_shell" in target:
        text = f"shell outlet {target['t_out_shell'] - 273.15:.1f} °C"
        hot_shell = float(case.revamp_service.shell.t_in) > float(case.revamp_service.tube.t_in)
        meets = (float(rev.t_out_shell) <= target["t_out_shell"]) if hot_shell else (float(rev.t_out_shell) >= target["t_out_shell"])
    else:
        meets = None
    out = {"tag": case.tag, "duty_today": float(today.duty), "duty_revamp": float(rev.duty), "target": text,
           "target_duty": target.get("duty"), "meets_target": meets, "recommendation": ""}
    study = result.get("study")
    if study is not None:
        out["recommendation"] = str(study.recommendation or "")
        if "meets_target" in study.table and "base" in study.table.index and target:
            out["meets_target"] = bool(study.table.loc["base", "meets_target"])
        if "screening" in study.table and "base" in study.table.index:
            out["screening_as_is"] = str(study.table.loc["base", "screening"])
    return out


def write_summary(path, result: dict) -> None:
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


def widgets_available() -> bool:
    """Whether ipywidgets can be imported (the notebooks fall back to static output otherwise)."""
    try:
        import ipywidgets  # noqa: F401
    except ImportError:
        return False
    return True


def what_if(case, throughput=1.0, fouling_shell=None, fouling_tube=None, twist_ratio=4.0, shells=None) -> dict:
    """Re-rate one exchanger at a throughput factor and fouling, as is, with twisted tapes and with N shells.

    Returns ``{label: Rating}``; used by the notebooks' widgets (a few ratings: well under 100 ms on the demo).
    """
    import revamp as rv

    from .options import TwistedTape

    svc = case.service.scaled(throughput=throughput)
    changes = {}
    if fouling_shell is not None:
        changes["fouling_shell"] = fouling_shell
    if fouling_tube is not None:
        changes["fouling_tube"] = fouling_tube
    svc = svc.replace(**changes) if changes else svc
    ex = case.exchanger
    out = {"as is": rv.rate(ex, svc)}
    tape = TwistedTape(twist_ratio=twist_ratio)
    out[f"twisted tape y={twist_ratio:g}"] = rv.rate(*tape.apply(ex, svc))
    n = int(shells or ex.shells)
    if n != ex.shells:
        out[f"{n} shell(s) in series"] = rv.rate(ex.replace(shells=n), svc)
    return out


def what_if_widget(case, system: str = "SI"):
    """ipywidgets controls (throughput, fouling on each side, twist ratio, shells) that re-rate and redraw in place."""
    import ipywidgets as w
    from IPython.display import display

    f_s, f_t = float(case.service.fouling_shell), float(case.service.fouling_tube)
    slider = dict(continuous_update=False, style={"description_width": "11em"}, layout=w.Layout(width="32em"))
    controls = {
        "throughput": w.FloatSlider(value=case.throughput, min=0.6, max=1.6, step=0.05,
                                    description="throughput factor", **slider),
        "fouling_shell": w.FloatSlider(value=f_s * 1e4, min=0, max=max(10.0, 3 * f_s * 1e4), step=0.25,
                                       description="shell fouling [1e-4 m²K/W]", **slider),
        "fouling_tube": w.FloatSlider(value=f_t * 1e4, min=0, max=max(10.0, 3 * f_t * 1e4), step=0.25,
                                      description="tube fouling [1e-4 m²K/W]", **slider),
        "twist_ratio": w.FloatSlider(value=4.0, min=2.5, max=10, step=0.5, description="twist ratio y", **slider),
        "shells": w.IntSlider(value=int(case.exchanger.shells), min=1, max=4, description="shells in series",
                              **slider),
    }
    table, plot, status = w.HTML(), w.Output(), w.HTML()

    def redraw(_=None):
        import time

        start = time.perf_counter()
        try:
            ratings = what_if(case, controls["throughput"].value, controls["fouling_shell"].value * 1e-4,
                              controls["fouling_tube"].value * 1e-4, controls["twist_ratio"].value,
                              controls["shells"].value)
        except Exception as exc:  # an infeasible setting: say why, keep the last picture
            status.value = f"<p class='rv-status-failed'>{esc(exc)}</p>"
            return
        table.value = ratings_table(ratings, system).to_html(escape=True, border=0)
        with plot:
            plot.clear_output(wait=True)
            breakdown_figure(ratings).show()
        status.value = f"<small>re-rated in {1e3 * (time.perf_counter() - start):.0f} ms</small>"

    for c in controls.values():
        c.observe(redraw, names="value")
    box = w.VBox([w.HTML(f"<b>What if: {esc(case.tag)}</b>"), *controls.values(), status, table, plot])
    redraw()
    display(box)
    return box


def case_header_html(case, unit) -> str:
    """Who the exchanger is and what it serves, as escaped HTML."""
    from .units import format_quantity as fq

    ex, s = case.exchanger, case.service
    rows = [["unit", unit.name], ["exchanger", case.tag], ["description", case.description],
            ["shells (series × parallel)", f"{ex.shells} × {ex.shells_parallel}"],
            ["tubes", f"{ex.tube_count} × {fq(ex.tube_od, 'length')} od, {fq(ex.tube_length, 'length')}, "
                      f"{ex.tube_passes} pass(es)"],
            ["area (outside, all shells)", fq(ex.area_outside, "area")],
            ["shell side", f"{getattr(s.shell.fluid, 'name', '')}: {fq(s.shell.flow, 'mass_flow')}, "
                           f"in at {fq(s.shell.t_in, 'temperature')}"],
            ["tube side", f"{getattr(s.tube.fluid, 'name', '')}: {fq(s.tube.flow, 'mass_flow')}, "
                          f"in at {fq(s.tube.t_in, 'temperature')}"],
            ["revamp", f"throughput × {case.throughput:g}"]]
    return table_html(rows, ["", ""])


def unit_table(unit, system: str = "SI"):
    """All exchangers of a unit in one table: duty today and at revamp, U, pressure drops against the allowed."""
    import pandas as pd

    import revamp as rv

    from .units import from_si

    rows = []
    for case in unit.exchangers:
        try:
            today, rev = rv.rate(case.exchanger, case.service), rv.rate(case.exchanger, case.revamp_service)
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


def monitoring_items(result: dict, system: str = "SI") -> list:
    """What the plant-data section shows: the findings, the row counts by reason, and the fouling figure."""
    import pandas as pd

    mon = result.get("monitoring")
    if mon is None:
        why = result.get("monitoring_error") or "the unit file gives no plant data for this exchanger"
        return [f"No plant-data analysis: {why}."]
    summ = mon.summary
    rows = {str(k)[len("rows: "):]: v for k, v in summ.items() if str(k).startswith("rows: ")}
    findings = {str(k): v for k, v in summ.items() if not str(k).startswith("rows: ") and str(k) != "warnings"}
    fmt = lambda v: f"{v:.4g}" if isinstance(v, float) else str(v)
    items = [pd.DataFrame({"value": [fmt(v) for v in findings.values()]}, index=list(findings)),
             pd.DataFrame({"rows": [int(v) for v in rows.values()]}, index=list(rows))]
    try:
        from . import plots_monitoring as pm
    except ImportError:  # the plant-data figures module is optional here: fall back to the fouling chart alone
        items.append(rf_figure(mon))
    else:
        items += [pm.fouling_trend(mon, system), pm.heat_balance(mon), pm.duty_lost(mon, system)]
    warnings = summ.get("warnings") if "warnings" in summ else None
    if warnings:
        items.append(f"Notes from the analysis: {warnings}")
    return items


def rf_figure(mon):
    """Fouling resistance from plant data against time: daily medians of the used rows with their band, and the
    fitted trend (plotly; daily points keep the report small)."""
    import pandas as pd
    import plotly.graph_objects as go

    t = mon.table
    used = t[t["used"]] if "used" in t else t
    daily = used.set_index(pd.to_datetime(used["timestamp"]))[["Rf", "Rf_low", "Rf_high", "run_time"]]
    daily = daily.resample("1D").median().dropna()
    x = list(daily.index)
    fig = go.Figure()
    fig.add_scatter(x=x, y=daily["Rf_high"] * 1e4, mode="lines", line={"width": 0}, showlegend=False,
                    hoverinfo="skip")
    fig.add_scatter(x=x, y=daily["Rf_low"] * 1e4, mode="lines", line={"width": 0}, fill="tonexty",
                    fillcolor="rgba(77,126,168,0.25)", name="5-95 % band")
    fig.add_scatter(x=x, y=daily["Rf"] * 1e4, mode="markers", marker={"size": 4}, name="measured Rf (daily median)")
    trend = getattr(mon, "trend", None)
    if callable(trend):
        try:
            fig.add_scatter(x=x, y=trend(daily["run_time"].to_numpy()) * 1e4, mode="lines",
                            name=f"fitted trend: {plot_text(getattr(trend, 'model', 'model'))}")
        except Exception:  # a trend that cannot be drawn must not hide the data
            pass
    fig.update_layout(title="Fouling resistance from plant data", yaxis_title="Rf [10⁻⁴ m²·K/W, outside area]",
                      height=420, legend={"orientation": "h", "y": -0.2})
    return fig


def study_items(result: dict, system: str = "SI") -> list:
    """What the options section shows: the comparison table in display units and the study figures."""
    study = result.get("study")
    if study is None:
        return ["The unit file lists no option for this exchanger."]
    from . import plots

    return [study_table(study, system), study_money_table(study), plots.option_comparison(study, system),
            plots.resistance_breakdown(study), plots.economics_chart(study)]


_STUDY_COLUMNS = [("duty", "power"), ("duty_gain", "power"), ("U_service", "htc"), ("t_out_shell", "temperature"),
                  ("t_out_tube", "temperature"), ("dp_shell", "pressure"), ("dp_tube", "pressure"),
                  ("velocity_tube", "velocity"), ("velocity_shell", "velocity")]


def study_table(study, system: str = "SI"):
    """The study table with physical columns in display units and the money and screening columns as they are."""
    import pandas as pd

    from .units import from_si

    t = study.table
    out = pd.DataFrame(index=[str(i) for i in t.index])
    for col, kind in _STUDY_COLUMNS:
        if col in t:
            mag, unit = from_si(t[col].to_numpy(dtype=float), kind, system)
            out[f"{col} [{unit}]"] = [round(float(v), 3 if abs(v) < 100 else 1) for v in mag]
    if "controlling" in t:
        out["controlling resistance"] = t["controlling"].tolist()
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
             "npv": f"NPV [{cur}]", "rank": "rank", "reason": "why"}
    for col, name in names.items():
        if col in t:
            values = t[col].tolist()
            if col in ("capex", "annual_value", "npv"):
                values = ["" if pd.isna(v) else f"{v:,.0f}" for v in values]
            elif col == "payback":
                values = ["" if pd.isna(v) else f"{v:.2f}" for v in values]
            out[name] = values
    return out


def recommendation_html(result: dict) -> str:
    study = result.get("study")
    if study is None:
        return "<p>No option to compare.</p>"
    return f'<p class="rv-recommendation"><b>{esc(study.recommendation)}</b></p>'


def primer_table(rating):
    """The five resistances of one rating: value, share, and the U they give (outside-area basis)."""
    import pandas as pd

    r = rating.resistances
    total = float(r.sum())
    return pd.DataFrame({"resistance [10⁻⁴ m²·K/W]": (r * 1e4).round(3), "share of 1/U [%]": (100 * r / total).round(1),
                         "U if this one were zero [W/m²·K]": [round(1.0 / (total - float(v)), 0) for v in r]},
                        index=list(r.index))


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
        rows[name] = {"U as is [W/m²·K]": round(1 / base, 1), "U, this one halved": round(1 / (base - r / 2), 1),
                      "U, this one doubled": round(1 / (base + r), 1)}
    return pd.DataFrame(rows).T


def primer_widget(rating):
    """Sliders for each resistance of one rating; the bar chart and U update in place."""
    import ipywidgets as w
    from IPython.display import display

    ratio = rating.exchanger.tube_od / rating.exchanger.tube_id
    fs = float(rating.resistances["shell fouling"])
    ft = float(rating.resistances["tube fouling"]) / ratio
    st = dict(continuous_update=False, style={"description_width": "14em"}, layout=w.Layout(width="34em"))
    c = {"scale_h_shell": w.FloatSlider(value=1, min=0.25, max=4, step=0.05, description="shell film h ×", **st),
         "scale_h_tube": w.FloatSlider(value=1, min=0.25, max=4, step=0.05, description="tube film h ×", **st),
         "fouling_shell": w.FloatSlider(value=fs * 1e4, min=0, max=max(10, 3 * fs * 1e4), step=0.25,
                                        description="shell fouling [1e-4 m²K/W]", **st),
         "fouling_tube": w.FloatSlider(value=ft * 1e4, min=0, max=max(10, 3 * ft * 1e4), step=0.25,
                                       description="tube fouling [1e-4 m²K/W]", **st),
         "wall_factor": w.FloatSlider(value=1, min=0.2, max=5, step=0.1, description="wall conductivity ×", **st)}
    out, label = w.Output(), w.HTML()

    def redraw(_=None):
        import plotly.graph_objects as go

        r = _primer_u(rating, c["scale_h_shell"].value, c["scale_h_tube"].value, c["fouling_shell"].value * 1e-4,
                      c["fouling_tube"].value * 1e-4, c["wall_factor"].value)
        label.value = (f"<b>U = {1 / float(r.sum()):.0f} W/m²·K</b> (as rated: {float(rating.U_service):.0f}); "
                       f"controlling: {esc(r.idxmax())}")
        fig = go.Figure(go.Bar(x=list(r.index), y=(r * 1e4).tolist()))
        fig.update_layout(yaxis_title="resistance [10⁻⁴ m²·K/W]", height=360, margin={"t": 20})
        with out:
            out.clear_output(wait=True)
            fig.show()

    for s in c.values():
        s.observe(redraw, names="value")
    box = w.VBox([*c.values(), label, out])
    redraw()
    display(box)
    return box
