"""One batch report opened in a real headless browser (Debian's chromium): the charts must have drawn.

The browser is found on PATH. When it is missing and ``CI=true`` the test installs Debian's ``chromium`` package
with apt-get (as CI runs as root); elsewhere it is skipped with the reason.
"""
from __future__ import annotations

import os
import re
import shutil
import subprocess
import tempfile

import pytest
from test_unitfile import make_unit, write_unit

BROWSERS = ("chromium", "chromium-browser", "google-chrome", "chrome")


def _browser():
    for name in BROWSERS:
        path = shutil.which(name)
        if path:
            return path
    if os.environ.get("CI") == "true" and shutil.which("apt-get") and hasattr(os, "geteuid") and os.geteuid() == 0:
        env = dict(os.environ, DEBIAN_FRONTEND="noninteractive")
        subprocess.run(["apt-get", "update", "-qq"], check=False, env=env, timeout=600, capture_output=True)
        subprocess.run(["apt-get", "install", "-y", "-qq", "chromium"], check=False, env=env, timeout=900,
                       capture_output=True)
        for name in BROWSERS:
            path = shutil.which(name)
            if path:
                return path
    pytest.skip("no headless browser: install Debian's 'chromium' (apt-get install chromium), or run with CI=true "
                "as root to let this test install it")


def _run(browser, *args):
    # the background-networking flags keep a closed-network machine from refusing Chromium's own connections
    profile = tempfile.mkdtemp(prefix="revamp-chromium-")
    cmd = [browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage", "--hide-scrollbars",
           "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
           "--disable-sync", f"--user-data-dir={profile}", "--virtual-time-budget=20000", *args]
    return subprocess.run(cmd, capture_output=True, text=True, check=False, timeout=180)


@pytest.fixture(scope="module")
def report_page(tmp_path_factory):
    from revamp.batch import run_batch

    root = tmp_path_factory.mktemp("browser")
    result = run_batch(write_unit(root / "unit.yaml", make_unit("E-1")), root / "out", jobs=1, progress=False)
    assert not result.failures, result.failures
    return result.reports["E-1"], result.index_path


def test_charts_draw_in_headless_browser(report_page):
    browser = _browser()
    page, index = report_page
    html = page.read_text(encoding="utf-8")
    expected = html.count("Plotly.newPlot")
    # invariant of the report layout: one breakdown chart and at least two plant-data/study charts are written
    assert expected >= 3
    dom = _run(browser, "--dump-dom", page.as_uri())
    assert dom.returncode == 0, dom.stderr[-2000:]  # the browser's own exit status: 0 = page loaded
    # plotly.js documents that a drawn figure's div gets class "js-plotly-plot" and an <svg class="main-svg"> inside
    # (plotly.js source, plot_api); invariant checked: every figure written into the page was drawn
    drawn = len(re.findall(r'class="[^"]*\bjs-plotly-plot\b', dom.stdout))
    assert drawn == expected, f"{drawn} of {expected} figures drew"
    assert dom.stdout.count('class="main-svg"') >= expected
    shot = page.parent / "shot.png"
    snap = _run(browser, f"--screenshot={shot}", "--window-size=1200,3000", page.as_uri())
    assert snap.returncode == 0 and shot.is_file()
    # a blank 1200x3000 white PNG compresses to a few kB; charts and tables make it tens of kB (common practice for
    # a smoke check of a screenshot, no source)
    assert shot.stat().st_size > 30_000
    shot.unlink()


def test_index_chart_draws(report_page):
    browser = _browser()
    _, index = report_page
    dom = _run(browser, "--dump-dom", index.as_uri())
    assert dom.returncode == 0
    # the unit summary's chart drew (plotly.js marks a drawn figure's div "js-plotly-plot", as above)
    assert re.search(r'class="[^"]*\bjs-plotly-plot\b', dom.stdout)
