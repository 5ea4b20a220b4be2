"""Benchmark of ``revamp check``: the demo unit, and the hostile files it must refuse quickly.

Run: ``make bench`` or ``python benchmarks/bench_check.py``. Prints medians; asserts nothing.

The demo's time is mostly the schema pass, building the model objects and reading the plant-data CSVs (their header
and the time zones of every timestamp). The hostile files (a YAML alias bomb, an exploding quantity string, a
device, deep nesting) must each be refused in about the time of a small file.
"""
from __future__ import annotations

import json
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

import yaml

from revamp import unitfile
from revamp.cli import demo_unit_path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))
from test_unitfile import make_unit, write_unit  # noqa: E402


def median_seconds(func, repeat: int = 5) -> float:
    func()  # warm: imports, caches
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        func()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def hostile_files(work: Path) -> dict:
    files = {}
    doc = make_unit()
    doc["exchangers"][0]["options"] = ["BOMB"]
    bomb = "x-anchors:\n  - &a0 {type: clean}\n" + "".join(
        f"  - &a{n} {{type: combined, options: [*a{n - 1}, *a{n - 1}]}}\n" for n in range(1, 17))
    (work / "bomb.yaml").write_text(bomb + yaml.safe_dump(doc, sort_keys=False).replace("BOMB", "*a16"))
    files["alias bomb (2**16 options)"] = work / "bomb.yaml"
    doc = make_unit()
    doc["exchangers"][0]["shell_side"]["t_in"] = "9**9**9 K"
    files["t_in: 9**9**9 K"] = Path(write_unit(work / "power.yaml", doc))
    option = {"type": "clean"}
    for _ in range(300):
        option = {"type": "combined", "options": [option, {"type": "clean"}]}
    doc = make_unit()
    doc["exchangers"][0]["options"] = [option]
    (work / "deep.json").write_text(json.dumps(doc))
    files["300 nested options"] = work / "deep.json"
    if os.path.exists("/dev/zero"):
        files["/dev/zero"] = Path("/dev/zero")
    files["small valid unit"] = Path(write_unit(work / "small.yaml", make_unit("E-1", "E-2")))
    return files


def main() -> None:
    print(f"check(demo unit): {median_seconds(lambda: unitfile.check(demo_unit_path())) * 1e3:.0f} ms (median of 5)")
    with tempfile.TemporaryDirectory() as tmp:
        for name, path in hostile_files(Path(tmp)).items():
            seconds = median_seconds(lambda p=path: unitfile.check(p))
            print(f"check({name}): {seconds * 1e3:.1f} ms")


if __name__ == "__main__":
    main()
