"""The package installs from a wheel and runs without the source tree: notebooks and demo data ship inside it.

The wheel is built with ``pip wheel --no-deps`` and installed (``--no-deps``) into a fresh virtual environment made
with ``venv``; that environment sees the dependencies of the running test environment through a ``.pth`` line (a
plain path: the test environment's own editable install of revamp is not activated by it) and their data files
(nbconvert's templates) through ``JUPYTER_PATH``. ``revamp demo`` and
``revamp batch`` then run from a folder outside the checkout, with ``PYTHONPATH`` unset, so only the wheel's copy of
revamp can be imported.
"""
from __future__ import annotations

import os
import subprocess
import sys
import sysconfig
import venv
import zipfile
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


def test_package_links_point_at_the_one_copy():
    # revamp/notebooks and revamp/demo are links into the checkout's notebooks/ and data/demo/ (one copy in git);
    # the files seen through them are the very same files
    for link, target in (("revamp/notebooks", "notebooks"), ("revamp/demo", "data/demo")):
        assert (ROOT / link).resolve() == (ROOT / target).resolve()
    names = {p.name for p in (ROOT / "revamp" / "notebooks").glob("*.ipynb")}
    assert names == {p.name for p in (ROOT / "notebooks").glob("*.ipynb")} and names


@pytest.fixture(scope="module")
def installed(tmp_path_factory):
    root = tmp_path_factory.mktemp("wheel")
    dist = root / "dist"
    build = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist), str(ROOT)],
                           capture_output=True, text=True, timeout=600, check=False)
    if build.returncode != 0 and "Could not find a version" in build.stderr:  # pragma: no cover - no index at all
        pytest.skip("pip could not fetch the build backend (setuptools, wheel): no package index reachable")
    assert build.returncode == 0, build.stderr[-3000:]
    wheels = list(dist.glob("revamp-*.whl"))
    assert len(wheels) == 1
    with zipfile.ZipFile(wheels[0]) as z:
        inside = set(z.namelist())
    # the files batch and demo read at run time are real files inside the wheel
    for name in ("revamp/notebooks/exchanger_study.ipynb", "revamp/notebooks/unit_summary.ipynb",
                 "revamp/notebooks/resistance_primer.ipynb", "revamp/demo/unit.yaml",
                 "revamp/demo/plant/E-101.csv", "revamp/demo/curves/C-401.csv", "revamp/unit_schema.json"):
        assert name in inside, name
    env_dir = root / "venv"
    venv.EnvBuilder(with_pip=False, symlinks=True).create(env_dir)
    py = env_dir / "bin" / "python"
    site = Path(subprocess.check_output([str(py), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"],
                                        text=True).strip())
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONHOME")}
    inst = subprocess.run([sys.executable, "-m", "pip", "--python", str(py), "install", "--no-deps", "-q",
                           str(wheels[0])], capture_output=True, text=True, timeout=600, check=False, env=env)
    assert inst.returncode == 0, inst.stderr[-3000:]
    # only now the dependencies (after the install: pip would otherwise find the test env's revamp and skip ours)
    (site / "_deps_of_the_test_env.pth").write_text(sysconfig.get_paths()["purelib"] + "\n")
    outside = root / "elsewhere"
    outside.mkdir()
    # the dependencies' data files (nbconvert's templates, the kernel spec) as a full install would place them
    env["JUPYTER_PATH"] = str(Path(sys.prefix) / "share" / "jupyter")
    env["PATH"] = f"{env_dir / 'bin'}{os.pathsep}{env.get('PATH', '')}"
    return env_dir, outside, env


def _run(installed, *args, timeout=900):
    env_dir, outside, env = installed
    return subprocess.run([str(env_dir / "bin" / "revamp"), *args], cwd=outside, env=env, capture_output=True,
                          text=True, timeout=timeout, check=False)


def test_wheel_imports_its_own_copy(installed):
    env_dir, outside, env = installed
    where = subprocess.run([str(env_dir / "bin" / "python"), "-c", "import revamp; print(revamp.__file__)"],
                           cwd=outside, env=env, capture_output=True, text=True, check=True).stdout.strip()
    assert Path(where).resolve().is_relative_to(env_dir.resolve()), where
    assert not Path(where).resolve().is_relative_to(ROOT)


def test_wheel_runs_demo_and_batch_outside_the_checkout(installed):
    env_dir, outside, env = installed
    demo = _run(installed, "demo", "--out", "demo-reports", "--jobs", "2", "--quiet")
    assert demo.returncode == 0, demo.stdout[-2000:] + demo.stderr[-3000:]
    index = outside / "demo-reports" / "index.html"
    assert index.is_file() and Path(demo.stdout.strip().splitlines()[-1]) == index.resolve()
    reports = sorted(p.name for p in (outside / "demo-reports").glob("*.html"))
    # one report per exchanger the demo unit file lists (of every kind), the index, and its train and cleaning
    # sections add the train page and the cleaning page
    import yaml

    tags = [x["tag"] for x in yaml.safe_load((ROOT / "data" / "demo" / "unit.yaml").read_text())["exchangers"]]
    assert set(reports) == {f"{t}.html" for t in tags} | {"index.html", "train.html", "cleaning.html"}, reports
    # batch on a unit file outside the package: the demo's file copied next to its plant data
    src = Path(subprocess.check_output([str(env_dir / "bin" / "python"), "-c",
                                        "from revamp.cli import demo_unit_path; print(demo_unit_path())"],
                                       cwd=outside, env=env, text=True).strip())
    assert src.resolve().is_relative_to(env_dir.resolve())
    unit = outside / "myunit"
    (unit / "plant").mkdir(parents=True)
    (unit / "unit.yaml").write_text(src.read_text(encoding="utf-8"), encoding="utf-8")
    (unit / "plant" / "E-101.csv").write_bytes((src.parent / "plant" / "E-101.csv").read_bytes())
    batch = _run(installed, "batch", str(unit / "unit.yaml"), "--out", "batch-reports", "--only", "E-101",
                 "--jobs", "1", "--quiet")
    assert batch.returncode == 0, batch.stdout[-2000:] + batch.stderr[-3000:]
    assert (outside / "batch-reports" / "E-101.html").is_file()
    assert "E-101" in (outside / "batch-reports" / "index.html").read_text("utf-8")
