"""Run every benchmarks/bench_*.py in turn (``make bench``)."""
import pathlib
import runpy
import sys

here = pathlib.Path(__file__).parent
names = sys.argv[1:] or sorted(p.stem for p in here.glob("bench_*.py"))
for name in names:
    print(f"== {name}", flush=True)
    runpy.run_path(str(here / f"{name}.py"), run_name="__main__")
