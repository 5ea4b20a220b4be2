"""Latency of the what-if controls in a real JupyterLab (headless Chromium driven by Playwright).

For ~20 key presses on a slider: time from the key press (a ``keydown`` listener in the page) to the changed table
(first DOM mutation of the table) and to the painted figure (first mutation of the chart, then two animation
frames).
Prints median and max [ms] for the throughput slider (back and forth) and the tube-fouling slider (one way, so each
press is a new position). Nothing asserted. Also prints the kernel-side time per move with no browser (``WhatIf``).

Run: ``PYTHONPATH=. python benchmarks/bench_widgets.py [--moves 20]``
"""
from __future__ import annotations

import argparse
import statistics
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))

_SETUP = """() => {
  const tbl = [...document.querySelectorAll('.widget-html-content')]
      .find(e => e.textContent.includes('pressure drop vs allowed'));
  const box = tbl.closest('.widget-vbox');
  // the chart: an inline SVG in its own HTML widget (replaced whole on a move), or a plotly figure
  const svg = box.querySelector('svg.rv-whatif-chart');
  const fig = svg ? svg.closest('.widget-html-content') : box.querySelector('.js-plotly-plot');
  window.__lat = {};
  document.addEventListener('keydown', () => { window.__lat = {key: performance.now()}; }, true);
  new MutationObserver(() => { const l = window.__lat; if (l.key && !l.table) l.table = performance.now(); })
      .observe(tbl, {childList: true, subtree: true, characterData: true});
  new MutationObserver(() => {
      const l = window.__lat;
      if (l.key && !l.figm) { l.figm = performance.now();
          requestAnimationFrame(() => requestAnimationFrame(() => { l.fig = performance.now(); })); }
  }).observe(fig, {childList: true, subtree: true, attributes: true});
  return !!fig;
}"""


def _moves(page, label, keys, pause_ms=400):
    handle = page.locator(".widget-slider", has_text=label).first.locator(".noUi-handle").first
    handle.focus()
    table, figure = [], []
    for key in keys:
        page.keyboard.press(key)
        page.wait_for_function("() => window.__lat.table && window.__lat.fig", timeout=30_000, polling="raf")
        lat = page.evaluate("() => window.__lat")
        table.append(lat["table"] - lat["key"])
        figure.append(lat["fig"] - lat["key"])
        page.wait_for_timeout(pause_ms)
    return table, figure


def _report(name, table, figure):
    print(f"{name:<34} key->table median {statistics.median(table):6.0f} ms, max {max(table):6.0f} ms | "
          f"key->painted figure median {statistics.median(figure):6.0f} ms, max {max(figure):6.0f} ms "
          f"({len(table)} moves)")


def browser_latency(moves: int = 20):
    from lab_session import CHROMIUM_ARGS, copy_notebooks, find_browser, lab_server, open_and_run
    from playwright.sync_api import sync_playwright

    path = find_browser()
    if path is None:
        print("no chromium: skipped the browser latency")
        return
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        copy_notebooks(work, {"exchanger_study.ipynb"})
        with lab_server(work) as (base, token), sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=path, headless=True, args=CHROMIUM_ARGS)
            page = browser.new_page(viewport={"width": 1400, "height": 1000})
            open_and_run(page, base, token, "exchanger_study.ipynb")
            page.locator(".widget-slider", has_text="throughput (both flows)").first.scroll_into_view_if_needed()
            assert page.evaluate(_SETUP)
            _report("throughput slider, back and forth", *_moves(page, "throughput (both flows)",
                                                                  ["ArrowRight", "ArrowLeft"] * (moves // 2)))
            _report("tube fouling slider, one way", *_moves(page, "tube fouling, inside area",
                                                            ["ArrowRight"] * (moves // 2)))
            browser.close()


def kernel_side(moves: int = 20):
    """The callback's work without a browser: cached moves and a move to a new fouling (a vectorized miss)."""
    import numpy as np

    from revamp import unitfile
    from revamp.cli import demo_unit_path
    from revamp.report.case import RATING_COLUMNS
    from revamp.report.widgets import WhatIf, _Affine, what_if, what_if_table_html

    case = unitfile.load(demo_unit_path()).exchanger("E-101")
    fo = np.round(np.arange(0, 10.01e-4, 0.25e-4), 9)
    engine = WhatIf(case, np.round(np.arange(0.6, 1.6 + 1e-9, 0.05), 9), fo, fo)
    conv = {k: _Affine(k, "SI") for _, k in RATING_COLUMNS}
    fs, ft = float(case.service.fouling_shell), float(case.service.fouling_tube)
    engine.cases(1.2, fs, ft, 4.0, 2)
    hits = []
    for i in range(moves):
        t0 = time.perf_counter()
        what_if_table_html(case, engine.cases(1.2 + 0.05 * (i % 2), fs, ft, 4.0, 2), "SI", conv)
        hits.append(1e3 * (time.perf_counter() - t0))
    t0 = time.perf_counter()
    engine.cases(1.2, fs, ft + 0.25e-4, 4.0, 2, along="fouling_tube")
    miss = 1e3 * (time.perf_counter() - t0)
    t0 = time.perf_counter()
    what_if(case, 1.25, fs, ft, 4.0, 2)  # the scalar path: one rating per case, as before
    scalar = 1e3 * (time.perf_counter() - t0)
    print(f"kernel side, E-101: cached move median {statistics.median(hits):.1f} ms, max {max(hits):.1f} ms; "
          f"new fouling position (one vectorized rating per case over the slider) {miss:.0f} ms; "
          f"scalar re-rating of the three cases {scalar:.0f} ms; ratio scalar/cached {scalar / statistics.median(hits):.0f}x")


if __name__ == "__main__":
    ap = argparse.ArgumentParser()
    ap.add_argument("--moves", type=int, default=20)
    ap.add_argument("--no-browser", action="store_true")
    a, _ = ap.parse_known_args()
    kernel_side(a.moves)
    if not a.no_browser:
        browser_latency(a.moves)
