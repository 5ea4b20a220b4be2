"""The notebooks in a real JupyterLab, in headless Chromium driven by Playwright.

JupyterLab runs on a copy of ``notebooks/``; each notebook is opened and run (Run > Run All Cells) as a user would.
Checked: no cell ends in an error (read from the saved copy: nbformat ``output_type == "error"``), no widget failed
to display, every plotly figure on the page drew (plotly.js gives a drawn figure's div the class ``js-plotly-plot``
and an ``svg.main-svg`` with its traces), and moving a what-if slider changes the table.

Needs the ``playwright`` package (test extra; it brings its driver, not a browser) and Debian's ``chromium``
(installed with apt-get when ``CI=true`` and missing, as ``test_browser.py`` does).
"""
from __future__ import annotations

import nbformat
import pytest

pytest.importorskip("playwright.sync_api")
from lab_session import CHROMIUM_ARGS, copy_notebooks, lab_server, open_and_run  # noqa: E402
from test_browser import _browser  # noqa: E402


@pytest.fixture(scope="module")
def lab(tmp_path_factory):
    from playwright.sync_api import sync_playwright

    browser_path = _browser()
    work = tmp_path_factory.mktemp("lab")
    names = copy_notebooks(work)
    with lab_server(work) as (base, token), sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=browser_path, headless=True, args=CHROMIUM_ARGS)
        try:
            yield browser, base, token, work, names
        finally:
            browser.close()


# per figure div: its title, and whether it drew (an svg.main-svg; traces drawn for each trace it was given; a
# figure given no trace, such as the economics chart of a study without economics, draws its axes and text only)
_DRAWN = """() => [...document.querySelectorAll('.jp-OutputArea .js-plotly-plot')].map(d => {
  const svg = d.querySelector('svg.main-svg');
  const given = (d.data || []).length;
  const traces = d.querySelectorAll('.trace, .barlayer .point, .scatterlayer path').length;
  const title = (d.querySelector('.gtitle') || {}).textContent || '';
  return [title, !!svg && (given === 0 || traces > 0)];
})"""


@pytest.mark.parametrize("name", ["exchanger_study.ipynb", "resistance_primer.ipynb", "unit_summary.ipynb"])
def test_notebook_runs_and_draws_in_jupyterlab(lab, name):
    browser, base, token, work, names = lab
    assert name in names
    page = browser.new_page(viewport={"width": 1400, "height": 1000})
    console = []
    page.on("console", lambda m: console.append(m.text))
    try:
        open_and_run(page, base, token, name, workdir=work)
        drawn = page.evaluate(_DRAWN)
        text = page.inner_text(".jp-Notebook")
    finally:
        page.close()
    nb = nbformat.read(work / name, as_version=4)
    errors = [o for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", []) if o.output_type == "error"]
    assert not errors, [f"{e.ename}: {e.evalue}" for e in errors]
    not_run = [i for i, c in enumerate(nb.cells) if c.cell_type == "code" and c.get("execution_count") is None]
    assert not not_run, f"cells not run: {not_run}"
    assert "Error displaying widget" not in text
    # the figures the notebook shows: plotly mime outputs and FigureWidget views (the what-if and primer charts)
    figures = sum(1 for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", [])
                  if "application/vnd.plotly.v1+json" in o.get("data", {}))
    assert figures >= 1
    assert len(drawn) >= figures and all(ok for _, ok in drawn), drawn
    # plotly.js logs this for a colour it cannot read (e.g. a pattern over a list of colours): bars may draw black
    assert not [m for m in console if "Invalid color" in m]


def test_what_if_slider_changes_the_table(lab):
    browser, base, token, work, names = lab
    page = browser.new_page(viewport={"width": 1400, "height": 1000})
    try:
        open_and_run(page, base, token, "exchanger_study.ipynb")
        assert page.locator(".rv-widget-hint").first.is_hidden()  # the controls are live: the hint is hidden
        slider = page.locator(".widget-slider", has_text="throughput (both flows)").first
        table = page.locator(".widget-html-content", has_text="pressure drop vs allowed").first
        before = table.inner_html()
        slider.locator(".noUi-handle").first.focus()
        page.keyboard.press("ArrowRight")
        page.wait_for_function("b => [...document.querySelectorAll('.widget-html-content')].some("
                               "e => e.textContent.includes('pressure drop vs allowed') && e.innerHTML !== b)",
                               arg=before, timeout=60_000)
        assert table.inner_html() != before
    finally:
        page.close()


from test_browser import report_page  # noqa: E402,F401  (the batch report fixture)


def test_static_report_tables_fit_the_page_and_colours_are_valid(lab, report_page):  # noqa: F811
    browser = lab[0]  # the module's browser (one Playwright session per module)
    page_path, _ = report_page
    page = browser.new_page(viewport={"width": 1000, "height": 1200})  # about an A4 page's width on screen
    console = []
    page.on("console", lambda m: console.append(m.text))
    try:
        page.goto(page_path.as_uri())
        page.wait_for_function("() => document.querySelectorAll('.js-plotly-plot').length > 0", timeout=60_000)
        page.wait_for_timeout(1000)
        # every table's box ends inside the page body's content box (no table wider than the page)
        widths = page.evaluate("""() => { const b = document.body.getBoundingClientRect();
            const right = b.right - parseFloat(getComputedStyle(document.body).paddingRight);
            return [...document.querySelectorAll('table')].map(t => [t.getBoundingClientRect().right, right]); }""")
        text = page.inner_text("body")
    finally:
        page.close()
    assert widths and all(right <= body + 0.5 for right, body in widths), widths
    assert not [m for m in console if "Invalid color" in m], console
    for leak in ("<NA>", " inf ", "True", "e+0"):
        assert leak not in text, leak
