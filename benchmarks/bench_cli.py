"""Start-up of the ``revamp`` command, as ratios to bare Python imports (nothing asserted).

Each command runs in a fresh process (as the console script does: ``from revamp.cli import main``), a few times;
the median wall time is printed with its ratio to the reference: ``revamp --help`` against ``python -c "import
numpy"``, ``revamp check`` and ``revamp rate`` on the demo unit against ``python -c "import numpy, pandas, pint"``.
With ``-X importtime`` the slowest imports of ``revamp check`` are listed, so the next target is plain.

Run: ``PYTHONPATH=. python benchmarks/bench_cli.py [--repeat 5]``
"""
from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
ENTRY = "import sys; from revamp.cli import main; sys.exit(main())"


def _time(args, repeat):
    env = dict(os.environ, PYTHONPATH=os.pathsep.join(p for p in (str(ROOT), os.environ.get("PYTHONPATH", "")) if p))
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, *args], env=env, cwd=ROOT, capture_output=True, check=True)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def _slowest_imports(args, n=8):
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    err = subprocess.run([sys.executable, "-X", "importtime", *args], env=env, cwd=ROOT, capture_output=True,
                         text=True, check=False).stderr
    rows = []
    for line in err.splitlines():
        parts = line.split("|")
        if len(parts) == 3 and parts[1].strip().isdigit():
            rows.append((int(parts[1]), parts[2].rstrip()))
    top = [r for r in sorted(rows, reverse=True) if r[1].strip().count(".") == 0][:n]
    return ", ".join(f"{name.strip()} {us / 1e6:.2f} s" for us, name in top)


def main(repeat: int = 5):
    demo = str(ROOT / "data" / "demo" / "unit.yaml")
    numpy = _time(["-c", "import numpy"], repeat)
    base = _time(["-c", "import numpy, pandas, pint"], repeat)
    rows = [("revamp --help", _time(["-c", ENTRY, "--help"], repeat), numpy, 'python -c "import numpy"'),
            ("revamp check (demo)", _time(["-c", ENTRY, "check", demo], repeat), base,
             'python -c "import numpy, pandas, pint"'),
            ("revamp rate (demo, E-101)", _time(["-c", ENTRY, "rate", demo, "--tag", "E-101"], max(1, repeat // 2)),
             base, 'python -c "import numpy, pandas, pint"')]
    for name, t, ref, ref_name in rows:
        print(f"{name:<28} {t:6.2f} s  = {t / ref:4.1f} x {ref_name} ({ref:.2f} s)")
    print("slowest top-level imports of revamp check:", _slowest_imports(["-c", ENTRY, "check", demo]))


if __name__ == "__main__":
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=5)
    a, _ = ap.parse_known_args()
    main(a.repeat)
