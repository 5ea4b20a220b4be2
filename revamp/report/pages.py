"""HTML pages: escaping, offline plotly figures, the provenance block, the cautions, atomic writes.

No physics here. Every user-supplied text goes through :func:`esc` (or :func:`plot_text` for a plotly label);
figures load plotly.js from a local file (``plotly.min.js`` copied once into the report folder), never from a CDN.

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

CAUTIONS = (
    "Screening-level results: every number comes from published correlations applied to the inputs shown, with their "
    "stated uncertainty (film coefficients typically within ±20–30 %).",
    "Mechanical design, flow-induced vibration and code compliance of any change must be verified by licensed "
    "engineers under the local codes before anything is built or operated; the vibration screen can flag a design, "
    "never clear it.",
    "Costs and prices are the user's inputs, not estimates made by this tool.",
)
#: added to the cautions of a report made from the demo unit file shipped with revamp
DEMO_CAUTION = "This report is made from the demo unit file shipped with revamp: its plant, data, prices and costs are invented."

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


def _is_demo(prov) -> bool:
    """Whether the report's unit file is the demo's (same SHA-256 as the demo unit file shipped with revamp)."""
    digests = set((prov or {}).get("inputs_sha256", {}).values())
    if not digests:
        return False
    demo = Path(__file__).resolve().parent.parent / "demo" / "unit.yaml"
    return demo.is_file() and file_sha256(demo) in digests


def cautions_html(prov: dict | None = None) -> str:
    """The standing cautions; the demo's line only when ``prov`` (a :func:`provenance`) shows the demo unit file."""
    items = "".join(f"<li>{esc(c)}</li>" for c in CAUTIONS + ((DEMO_CAUTION,) if _is_demo(prov) else ()))
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
table.rv-table thead th{white-space:normal;font-weight:600;vertical-align:bottom}
table.rv-wide{width:100%;font-size:.8rem}table.rv-wide th,table.rv-wide td{padding:.2rem .3rem}
table.rv-wide th,table.rv-wide td:not(.num){overflow-wrap:anywhere}table.rv-wide td.num{white-space:nowrap}
.rv-scroll{max-width:100%;overflow-x:auto}.rv-note{color:#555;font-size:.85rem}.rv-secondary{color:#555;font-size:.85rem}
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
             f"<h1>{esc(title)}</h1>", cautions_html(prov) if cautions else "", body_html,
             provenance_html(prov) if prov else "", "</body></html>"]
    return "\n".join(p for p in parts if p)




def frame_html(df, cls: str = "rv-table", digits: int = 3, system: str = "SI") -> str:
    """A pandas table as a reader sees it: display labels and units (:mod:`.labels`), engineering precision, numbers
    right-aligned, no ``True``/``<NA>``/``inf``; every cell escaped."""
    import numbers as _numbers

    from .labels import display_frame, format_value

    shown = display_frame(df, system=system)
    if len(shown.columns) > 6:  # many columns: across the page, words may wrap anywhere, numbers never
        cls = f"{cls} rv-wide"
    out = [f'<div class="rv-scroll"><table class="{esc(cls)}"><thead><tr><th>{esc(shown.index.name or "")}</th>']
    out += [f"<th>{esc(c)}</th>" for c in shown.columns]
    out.append("</tr></thead><tbody>")
    for label, row in zip(shown.index, shown.itertuples(index=False)):
        cells = [f"<th>{esc(label)}</th>"]
        for v in row:
            num = isinstance(v, _numbers.Number) and not isinstance(v, bool)
            cells.append(f'<td class="num">{esc(format_value(v, digits))}</td>' if num
                         else f"<td>{esc(format_value(v, digits))}</td>")
        out.append("<tr>" + "".join(cells) + "</tr>")
    out.append("</tbody></table></div>")
    return "".join(out)


def polish_figure(fig, system: str = "SI"):
    """Apply the display conventions to a figure made elsewhere (in place; returns it): each resistance's own colour,
    legend names and axis units in their display form (kW -> MW), the resistance axis in ``system`` units."""
    from ..units import from_si
    from .labels import RESISTANCE_COLOURS, display_name, rescale, split_label

    res_fig = False
    for tr in fig.data:
        name = getattr(tr, "name", None)
        if name in RESISTANCE_COLOURS and tr.type == "bar":
            tr.marker.color = RESISTANCE_COLOURS[name]
            res_fig = True
        elif name and split_label(name)[1]:
            factor, _ = rescale(split_label(name)[1])
            if factor != 1.0 and tr.y is not None:
                tr.y = [None if v is None else float(v) * factor for v in tr.y]
            tr.name = display_name(name)
    ytitle = fig.layout.yaxis.title.text or ""
    if res_fig and system == "US" and "10⁻⁴ m²·K/W" in ytitle:
        factor = 1e-4 * from_si(1.0, "fouling", "US")[0] * 1e3
        for tr in fig.data:
            tr.y = [float(v) * factor for v in tr.y]
        fig.layout.yaxis.title.text = ytitle.replace("10⁻⁴ m²·K/W", "10⁻³ h·ft²·°F/Btu")
    elif ytitle and rescale(ytitle.strip())[0] != 1.0:  # an axis titled by its bare unit ("kW")
        fig.layout.yaxis.title.text = f"duty [{rescale(ytitle.strip())[1]}]" if ytitle.strip() in ("kW", "W") \
            else rescale(ytitle.strip())[1]
    return fig


_KELVIN = re.compile(r"(?<![\w.])(\d{3,4}(?:\.\d+)?)(?:( to )(\d{3,4}(?:\.\d+)?))? K\b")


def temperatures_in(text: str, system: str = "SI") -> str:
    """Absolute temperatures written in kelvin in a note (200 K and above: no temperature difference in a note is
    that large) rewritten in °C, or °F for US units.

    >>> temperatures_in("T = 400.15 K above the range 255.37 to 422 K; ΔT 5 K")
    'T = 127 °C above the range -18 to 149 °C; ΔT 5 K'
    """
    def one(k):
        return f"{k - 273.15:.0f}" if system != "US" else f"{(k - 273.15) * 1.8 + 32:.0f}"

    def repl(m):
        values = [float(m.group(1))] + ([float(m.group(3))] if m.group(3) else [])
        if min(values) < 200.0:
            return m.group(0)
        unit = "°C" if system != "US" else "°F"
        return " to ".join(one(k) for k in values) + f" {unit}"

    return _KELVIN.sub(repl, text)


def _notes_html(text: str, system: str = "SI") -> str:
    """A sentence-list string ("Notes ...: a; b; c") as a heading line and a bulleted list, temperatures in °C/°F."""
    head, _, rest = text.partition(": ")
    items = [temperatures_in(s.strip(), system) for s in rest.split("; ") if s.strip()]
    return f"<p>{esc(head)}:</p><ul>" + "".join(f"<li>{esc(i)}</li>" for i in items) + "</ul>"


def show(obj, interactive: bool = False, units: str = "SI"):
    """Display a plotly figure, a table or a line of text in a notebook, in the report's display conventions: live
    plotly in JupyterLab, offline HTML for the static reports."""
    from IPython.display import HTML, display

    if hasattr(obj, "to_plotly_json"):
        polish_figure(obj, units)
        if interactive:
            obj.show()
        else:
            display(HTML(figure_html(obj)))
    elif hasattr(obj, "to_html"):
        display(HTML(frame_html(obj, system=units)))
    elif isinstance(obj, str) and obj.startswith("Notes from the analysis: ") and "; " in obj:
        display(HTML(_notes_html(obj, units)))
    else:
        display(HTML(f"<p>{esc(obj)}</p>"))


def defaults_html(exchanger) -> str:
    """What the rating assumed that the user did not give: every TEMA (or common-practice) default applied to the
    geometry, and for a U-tube bundle what ``tube_count`` counts."""
    used = list(getattr(exchanger, "defaults_used", ()) or ())
    items = "".join(f"<li>{esc(d)}</li>" for d in used)
    parts = ['<section class="rv-defaults"><h3>Defaults the rating applied</h3>']
    parts.append(f"<ul>{items}</ul>" if used else "<p>None: every geometric input was given.</p>")
    if getattr(exchanger, "rear_head", None) == "u-tube":
        parts.append("<p class='rv-note'>U-tube bundle: the tube count is the number of holes in the tubesheet, so "
                     "each U-tube counts once per leg (a bundle of N U-tubes has a tube count of 2N).</p>")
    parts.append("</section>")
    return "".join(parts)
