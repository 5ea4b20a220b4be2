"""A JupyterLab server on a copy of the notebooks, driven by Playwright through Debian's Chromium.

Shared by ``tests/test_lab_browser.py`` and ``benchmarks/bench_widgets.py``. The browser is the system one
(``executable_path``), never a browser download; JupyterLab gets its own config and runtime folders, a random token
and a free port, and is stopped (its process group) at the end.
"""
from __future__ import annotations

import json
import os
import secrets
import shutil
import signal
import socket
import subprocess
import sys
import time
import urllib.request
from contextlib import contextmanager
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
BROWSERS = ("chromium", "chromium-browser", "google-chrome", "chrome")
CHROMIUM_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage", "--disable-quic", "--no-first-run",
                 "--disable-background-networking", "--disable-component-update", "--disable-sync"]


def find_browser():
    """The system Chromium on PATH (or in /usr/bin), or None."""
    for name in BROWSERS:
        path = shutil.which(name) or (f"/usr/bin/{name}" if os.access(f"/usr/bin/{name}", os.X_OK) else None)
        if path:
            return path
    return None


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@contextmanager
def lab_server(workdir: Path):
    """Start JupyterLab on ``workdir`` (a copy of notebooks/); yields (base_url, token)."""
    port, token = _free_port(), secrets.token_hex(16)
    env = dict(os.environ, JUPYTER_CONFIG_DIR=str(workdir / ".cfg"), JUPYTER_RUNTIME_DIR=str(workdir / ".run"),
               PYTHONPATH=os.pathsep.join(p for p in (str(ROOT), os.environ.get("PYTHONPATH", "")) if p))
    cmd = [sys.executable, "-m", "jupyterlab", "--no-browser", f"--port={port}", "--ip=127.0.0.1",
           f"--IdentityProvider.token={token}", f"--ServerApp.root_dir={workdir}",
           "--LabApp.check_for_updates_class=jupyterlab.NeverCheckForUpdate", "--LabApp.news_url=None",
           "--ServerApp.disable_check_xsrf=False"]
    if hasattr(os, "geteuid") and os.geteuid() == 0:
        cmd.append("--allow-root")
    # no "news" prompt over the page (JupyterLab's announcements plugin)
    (workdir / ".cfg" / "labconfig").mkdir(parents=True, exist_ok=True)
    (workdir / ".cfg" / "labconfig" / "page_config.json").write_text(json.dumps(
        {"disabledExtensions": {"@jupyterlab/apputils-extension:announcements": True}}))
    log = open(workdir / ".lab.log", "w")
    proc = subprocess.Popen(cmd, cwd=workdir, env=env, stdout=log, stderr=subprocess.STDOUT, start_new_session=True)
    base = f"http://127.0.0.1:{port}"
    try:
        deadline = time.monotonic() + 120
        while True:
            try:
                with urllib.request.urlopen(f"{base}/api/status?token={token}", timeout=2) as r:
                    json.load(r)
                break
            except OSError:
                if proc.poll() is not None or time.monotonic() > deadline:
                    raise RuntimeError("JupyterLab did not start: " + (workdir / ".lab.log").read_text()[-2000:])
                time.sleep(0.5)
        yield base, token
    finally:
        try:
            os.killpg(proc.pid, signal.SIGTERM)
            proc.wait(timeout=20)
        except (ProcessLookupError, subprocess.TimeoutExpired):
            os.killpg(proc.pid, signal.SIGKILL)
        log.close()


def copy_notebooks(dest: Path, names=None) -> list:
    dest.mkdir(parents=True, exist_ok=True)
    out = []
    for nb in sorted((ROOT / "notebooks").glob("*.ipynb")):
        if names is None or nb.name in names:
            shutil.copy(nb, dest / nb.name)
            out.append(nb.name)
    return out


def open_and_run(page, base: str, token: str, name: str, timeout_s: float = 600, workdir: Path | None = None):
    """Open a notebook in JupyterLab, run all cells (Run menu), wait until every cell has run; then save it (and,
    given ``workdir``, wait until the saved file carries execution counts)."""
    # a workspace of its own, reset: JupyterLab would otherwise restore the tabs of the last page, and the Run menu
    # acts on whichever notebook is active
    page.goto(f"{base}/lab/workspaces/rv-{secrets.token_hex(4)}/tree/{name}?reset&token={token}")
    page.wait_for_selector(".jp-Notebook .jp-Cell", state="attached", timeout=120_000)
    # the kernel is ready when the status bar says so
    page.wait_for_function("() => [...document.querySelectorAll('.jp-StatusBar-TextItem')]"
                           ".some(e => /Idle/.test(e.textContent))", timeout=120_000, polling=250)
    page.wait_for_timeout(500)
    page.get_by_role("menuitem", name="Run", exact=True).click()
    page.get_by_role("menuitem", name="Run All Cells", exact=True).click()
    # done: every prompt shows a number, or (a cell failed and JupyterLab stopped the run) none shows "*" (its
    # running marker) and the kernel is idle again; the caller reads the saved notebook for errors and cells not run
    page.wait_for_function(
        """() => {
          const p = [...document.querySelectorAll('.jp-CodeCell .jp-InputPrompt')].map(e => e.textContent.trim());
          if (p.length > 0 && p.every(t => /^\\[\\d+\\]:$/.test(t))) return true;
          const idle = [...document.querySelectorAll('.jp-StatusBar-TextItem')].some(e => /Idle/.test(e.textContent));
          if (!(idle && p.some(t => /^\\[\\d+\\]:$/.test(t)) && !p.some(t => t.includes('*')))) {
            window.__rvIdleSince = null;
            return false;
          }
          window.__rvIdleSince = window.__rvIdleSince || Date.now();
          return Date.now() - window.__rvIdleSince > 3000;
        }""", timeout=timeout_s * 1000, polling=500)
    # save (File > Save Notebook) and wait until the file on disk is the executed one: the caller reads it
    page.get_by_role("menuitem", name="File", exact=True).click()
    page.get_by_role("menuitem", name="Save Notebook", exact=False).first.click()
    deadline = time.monotonic() + 60
    while workdir is not None and time.monotonic() < deadline:
        try:
            cells = json.loads((workdir / name).read_text(encoding="utf-8"))["cells"]
        except (OSError, ValueError):
            cells = []
        if any(c.get("execution_count") for c in cells if c.get("cell_type") == "code"):
            break
        page.wait_for_timeout(500)
    page.wait_for_timeout(500)
