"""The ``revamp`` command: check a unit file, rate one exchanger, write the reports of a unit.

Usage::

    revamp check FILE
    revamp rate FILE --tag TAG [--units SI|US] [--revamp] [--csv FILE]
    revamp batch FILE [FILE ...] --out DIR [--jobs N] [--only TAG ...] [--units SI|US] [--cluster ADDRESS]
    revamp demo [--out DIR] [--jobs N] [--units SI|US]

Errors are printed one per line, without a traceback unless ``--debug`` is given; the exit code is 1 when there is
any problem.
"""
from __future__ import annotations

import argparse
import sys
from pathlib import Path

from .errors import InputError

__all__ = ["demo_unit_path", "format_rating", "main"]


def demo_unit_path() -> Path:
    """The demo unit file shipped with the package (``revamp/demo/unit.yaml``; in a checkout a link to ``data/demo``)."""
    here = Path(__file__).resolve().parent
    for candidate in (here / "demo" / "unit.yaml", here.parent / "data" / "demo" / "unit.yaml"):
        if candidate.is_file():
            return candidate
    raise InputError("demo", str(here.parent / "data" / "demo" / "unit.yaml"),
                     "present: the demo unit ships inside the package (reinstall revamp)")


# rows of the rating printout: (label, Rating attribute, quantity kind)
RATING_ROWS = [
    ("duty", "duty", "power"), ("shell outlet", "t_out_shell", "temperature"),
    ("tube outlet", "t_out_tube", "temperature"), ("U clean", "U_clean", "htc"),
    ("U in service", "U_service", "htc"), ("area (outside)", "area", "area"),
    ("h shell", "h_shell", "htc"), ("h tube", "h_tube", "htc"), ("effectiveness", "effectiveness", "dimensionless"),
    ("F", "F", "dimensionless"), ("LMTD", "lmtd", "temperature_difference"),
    ("dp shell", "dp_shell", "pressure"), ("dp tube", "dp_tube", "pressure"),
    ("velocity tube", "velocity_tube", "velocity"), ("velocity shell (crossflow)", "velocity_shell", "velocity"),
    ("Re tube", "Re_tube", "dimensionless"), ("Re shell", "Re_shell", "dimensionless"),
]


def format_rating(rating, system: str = "SI", title: str = "") -> str:
    """A plain-text rating: the main results and the resistance breakdown, in SI or US display units."""
    from .units import format_quantity, from_si

    lines = [title] if title else []
    width = max(len(r[0]) for r in RATING_ROWS)
    for label, attr, kind in RATING_ROWS:
        value = getattr(rating, attr, None)
        if value is None:
            continue
        text = f"{float(value):.4g}" if kind == "dimensionless" else format_quantity(value, kind, system)
        lines.append(f"  {label:<{width}}  {text}")
    lines.append("")
    lines.append("  resistance breakdown (outside-area basis):")
    unit_label = from_si(1.0, "fouling", system)[1]
    total = float(sum(rating.resistances.values))
    for name, r in rating.resistances.items():
        mag = from_si(float(r), "fouling", system)[0]
        share = float(r) / total if total > 0 else float("nan")
        lines.append(f"    {name:<14} {mag:10.4g} {unit_label:<14} {share:6.1%}")
    lines.append(f"  controlling resistance: {rating.resistances.idxmax()}")
    if rating.warnings:
        lines.append("")
        lines.append("  warnings:")
        lines.extend(f"    - {w}" for w in rating.warnings)
    return "\n".join(lines)


def _cmd_check(args) -> int:
    from .unitfile import check

    problems = check(args.file)
    for p in problems:
        print(p, file=sys.stderr)
    if problems:
        print(f"{args.file}: {len(problems)} problem(s)", file=sys.stderr)
        return 1
    print(f"{args.file}: OK")
    return 0


def _shown(text: str) -> str:
    """Text safe for a terminal: control characters (escape sequences, NUL) shown escaped, line breaks kept."""
    from .errors import printable

    return "\n".join(printable(line, limit=10_000) for line in str(text).split("\n"))


def _load_one(path, tag):
    """The unit with only ``tag`` built: problems of *other* exchangers (a missing CSV elsewhere) do not stop the
    rating of this one; the unit's own problems and this exchanger's do."""
    import re

    from .unitfile import UnitFileError, load_partial

    unit, problems, entries = load_partial(path, only=[tag])
    indices = {i for t, i in entries if t == tag}
    if entries and not indices:
        raise InputError("--tag", tag, f"one of the unit's tags: {', '.join(t for t, _ in entries)}")

    def ours(p):
        m = re.match(r"^exchangers\[(\d+)\]", p.path)
        return m is None or int(m.group(1)) in indices

    blocking = [p for p in problems if ours(p)]
    if blocking or unit is None:
        raise UnitFileError(path, blocking or problems)
    if problems:
        print(f"note: {len(problems)} problem(s) in other exchangers of {path}; run 'revamp check' for the list",
              file=sys.stderr)
    return unit


def _cmd_rate(args) -> int:
    from . import rating as rating_mod

    unit = _load_one(args.file, args.tag)
    case = unit.exchanger(args.tag)
    service = case.revamp_service if args.revamp else case.service
    result = rating_mod.rate(case.exchanger, service)
    when = "today's conditions"
    if args.revamp:  # which side's flow was scaled and which inlet moved, as the report's header says it
        from .report.case import revamp_lines

        lines = revamp_lines(case.service, case.revamp_service, case.throughput, args.units)
        when = f"revamp conditions ({lines[0]})\n" + "\n".join(f"  {line}" for line in lines[1:])
    if args.csv:  # the same numbers as a table: quantity, value, unit (display units of --units)
        from .report.export import rating_frame

        frame = rating_frame(result, args.units)
        if args.csv == "-":
            frame.to_csv(sys.stdout, index=False)
        else:
            frame.to_csv(args.csv, index=False, encoding="utf-8")
            print(Path(args.csv).resolve())
        return 0
    print(_shown(format_rating(result, args.units, f"{case.tag}: {case.description} - {when}")))
    return 0


def _usable_cores() -> int:
    import os

    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


def _cap_jobs(args) -> None:
    """``--jobs`` at least 1 and at most the cores this process may use (each worker runs a notebook kernel of a
    few hundred MB: more workers than cores only add memory)."""
    if args.jobs < 1:
        raise InputError("--jobs", args.jobs, "a whole number >= 1")
    cores = _usable_cores()
    if args.jobs > cores:
        print(f"note: --jobs {args.jobs} capped to {cores}, the cores available", file=sys.stderr)
        args.jobs = cores


def _cmd_batch(args) -> int:
    from .batch import run_batch

    _cap_jobs(args)

    files = args.file if isinstance(args.file, list) else [args.file]
    cluster = getattr(args, "cluster", None)
    if len(files) > 1:  # a fleet: one folder and index per unit, a fleet index above them
        from .fleet import run_fleet

        fleet = run_fleet(files, args.out, jobs=args.jobs, only=args.only or None, progress=not args.quiet,
                          units=args.units, cluster=cluster)
        print(fleet.index_path)
        failed = False
        for name, res in fleet.units.items():
            if res is None:
                print(f"{_shown(name)}: FAILED: {_shown(fleet.failures[name])}", file=sys.stderr)
                failed = True
                continue
            for tag, reason in res.failures.items():
                print(f"{_shown(name)}/{_shown(tag)}: FAILED: {_shown(reason)}", file=sys.stderr)
                failed = True
        return 1 if failed else 0
    result = run_batch(files[0], args.out, jobs=args.jobs, only=args.only or None, progress=not args.quiet,
                       units=args.units, cluster=cluster)
    print(result.index_path)
    for note in getattr(result, "notes", ()):
        print(f"note: {note}", file=sys.stderr)
    for tag, reason in result.failures.items():
        print(f"{tag}: FAILED: {reason}", file=sys.stderr)
    return 1 if result.failures else 0


def _cmd_demo(args) -> int:
    args.file = demo_unit_path()
    args.only = None
    return _cmd_batch(args)


def _parser() -> argparse.ArgumentParser:
    top = argparse.ArgumentParser(prog="revamp", description="Heat-exchanger revamp studies from a unit file.")
    top.add_argument("--debug", action="store_true", help="show the full traceback of an error")
    sub = top.add_subparsers(dest="command", required=True)
    p = sub.add_parser("check", help="validate a unit file and list every problem")
    p.add_argument("file")
    p.set_defaults(func=_cmd_check)
    p = sub.add_parser("rate", help="rate one exchanger and print the resistance breakdown")
    p.add_argument("file")
    p.add_argument("--tag", required=True)
    p.add_argument("--units", choices=["SI", "US"], default="SI")
    p.add_argument("--revamp", action="store_true", help="rate at the revamp conditions instead of today's")
    p.add_argument("--csv", metavar="FILE", help="write the rating as CSV (quantity, value, unit) to FILE ('-': print)")
    p.set_defaults(func=_cmd_rate)
    for name, helptext in (("batch", "write one comparison report per exchanger and an index"),
                           ("demo", "batch on the demo unit into ./reports")):
        p = sub.add_parser(name, help=helptext)
        if name == "batch":
            p.add_argument("file", nargs="+", help="unit file(s); several make a fleet with an index above them")
            p.add_argument("--out", required=True, help="output folder")
            p.add_argument("--only", nargs="+", metavar="TAG", help="only these exchangers")
        else:
            p.add_argument("--out", default="reports", help="output folder (default: reports)")
        p.add_argument("--jobs", type=int, default=2, help="notebooks run in parallel (default 2)")
        p.add_argument("--quiet", action="store_true", help="no progress bar")
        p.add_argument("--units", choices=["SI", "US"], default="SI", help="display units of the reports")
        p.add_argument("--cluster", metavar="ADDRESS", help="run on a Dask cluster: 'local:N' (N local workers) or a "
                                                            "scheduler address such as tcp://host:8786")
        p.set_defaults(func=_cmd_batch if name == "batch" else _cmd_demo)
    return top


def main(argv=None) -> int:
    """Entry point of the ``revamp`` command; returns the exit code."""
    args = _parser().parse_args(argv)
    try:
        return args.func(args)
    except KeyboardInterrupt as exc:  # Ctrl-C or SIGTERM: one line, no traceback (a batch has cleaned up first)
        print(f"revamp: {getattr(exc, 'message', None) or 'interrupted'}", file=sys.stderr)
        return 128 + int(getattr(exc, "signum", 2))
    except Exception as exc:  # one clear line per error; the traceback only on request
        if args.debug:
            raise
        problems = getattr(exc, "problems", None)
        if problems:
            for p in problems:
                print(p, file=sys.stderr)
            print(f"{len(problems)} problem(s); run 'revamp check' for the list", file=sys.stderr)
        elif isinstance(exc, InputError):
            print(_shown(f"error: {exc}"), file=sys.stderr)
        else:
            print(_shown(f"error: {exc.__class__.__name__}: {exc} (use --debug for the traceback)"), file=sys.stderr)
        return 1


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
