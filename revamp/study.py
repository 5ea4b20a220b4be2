"""The comparison study: rate the base case and every retrofit option the same way and rank them.

``compare(exchanger, service, options, target=..., limits=..., economics=..., revamp=...)`` rates the base case
and each option at the revamp conditions, screens each rating (pressure drops, velocity, vibration, nozzle),
prices it and ranks the options: those that meet the target without failing a limit first, then by payback.

Examples
--------
See ``docs`` and the demo notebook; a small case is in ``tests/test_study.py``.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import pandas as pd
import pint

from .economics import Economics, cycle_average, simple_payback
from .errors import InputError
from .options import option_label
from .screening import Limits, screen, worst
from .units import require, to_si, ureg

__all__ = ["RESISTANCE_NAMES", "Study", "Target", "compare"]

RESISTANCE_NAMES = ("shell film", "shell fouling", "wall", "tube fouling", "tube film")
_TARGET_KINDS = {"duty": "power", "t_out_shell": "temperature", "t_out_tube": "temperature", "UA": None}
_RESERVED = {"base", "today", "today (clean)", "revamp", "revamp (clean)"}
_STATUS_COLUMNS = {"dp_shell": "dp_shell_status", "dp_tube": "dp_tube_status", "velocity_tube": "velocity_status",
                   "fluidelastic": "vibration_status", "vortex_shedding": "vibration_status", "tube_span": "vibration_status",
                   "nozzle_shell": "nozzle_status"}


@dataclass(frozen=True)
class Target:
    """What the exchanger must give at the revamp conditions.

    Parameters
    ----------
    kind : {"duty", "t_out_shell", "t_out_tube", "UA"}
        Duty [W]; an outlet temperature [K] (reached or passed in the direction that side is heated or cooled);
        or a required U·A [W/K] (in service, outside basis).
    value : float or str
        The required value, SI or a string with a unit.
    """

    kind: str
    value: float

    def __post_init__(self):
        if self.kind not in _TARGET_KINDS:
            raise InputError("target", self.kind, f"one of {sorted(_TARGET_KINDS)}")
        unit = _TARGET_KINDS[self.kind]
        if unit is not None:
            v = to_si(self.value, unit, f"target.{self.kind}")
        elif isinstance(self.value, str):  # a U·A with its unit, e.g. "20 kW/K"
            try:
                v = ureg.Quantity(self.value).to("W/K").magnitude
            except (pint.errors.PintError, ValueError, TypeError, AttributeError):
                raise InputError("target.UA", self.value, "a conductance U·A (W/K, or e.g. '20 kW/K')") from None
        else:
            v = float(self.value)
        object.__setattr__(self, "value", float(require(v, f"target.{self.kind}", gt=0)))

    @classmethod
    def of(cls, value):
        """A Target from ``None``, a duty (number or string), a one-key dict ``{"t_out_tube": "120 degC"}``."""
        if value is None or isinstance(value, cls):
            return value
        if isinstance(value, dict):
            if len(value) != 1:
                raise InputError("target", value, "one entry, e.g. {'duty': '5 MW'} or {'t_out_tube': 393.15}")
            (kind, v), = value.items()
            return cls(kind, v)
        return cls("duty", value)

    def achieved(self, rating) -> float:
        """The rating's value of the target quantity [W, K or W/K]."""
        if self.kind == "UA":
            return float(rating.U_service) * float(rating.area)
        return float(getattr(rating, self.kind))

    def met(self, rating) -> bool:
        """Whether the rating meets the target (relative tolerance 1e-9)."""
        got, tol = self.achieved(rating), 1e-9 * self.value
        if self.kind.startswith("t_out_"):
            side = self.kind[len("t_out_"):]
            other = "tube" if side == "shell" else "shell"
            heated = float(getattr(rating.service, side).t_in) < float(getattr(rating.service, other).t_in)
            return got >= self.value - tol if heated else got <= self.value + tol
        return got >= self.value - tol

    def describe(self, value=None) -> str:
        fmt = {"duty": lambda x: f"{x / 1e6:.4g} MW", "UA": lambda x: f"{x / 1e3:.4g} kW/K"}.get(
            self.kind, lambda x: f"{x - 273.15:.4g} °C")
        return fmt(self.value if value is None else value)


@dataclass(frozen=True)
class Study:
    """The result of :func:`compare`.

    Attributes
    ----------
    table : pandas.DataFrame
        One row for ``"base"`` (the exchanger as it is, at the revamp conditions) and one per option label. SI
        columns: ``duty`` [W], ``duty_gain`` [W, vs base], ``U_clean``, ``U_service`` [W/m²K], ``area`` [m²],
        ``t_out_shell``, ``t_out_tube`` [K], ``dp_shell``, ``dp_tube`` [Pa], ``velocity_tube``,
        ``velocity_shell`` [m/s], ``controlling`` (largest resistance), the screening statuses ``dp_shell_status``,
        ``dp_tube_status``, ``velocity_status``, ``vibration_status``, ``nozzle_status``, ``screening`` (worst),
        ``meets_target``, ``capex`` [currency], ``annual_value`` [currency/year], ``payback`` [years], ``npv``
        [currency], ``duty_cycle_avg`` [W] (when a fouling model was given), ``rank`` (options, 1 = best) and
        ``reason`` (one line).
    cases : pandas.DataFrame
        The base case today and at the revamp conditions, fouled and clean (same columns as ``table`` where they
        apply).
    ratings : dict
        Label -> :class:`~revamp.rating.Rating`, for the rows of ``table`` and of ``cases``.
    breakdowns : dict
        Label -> resistance breakdown DataFrame (``resistance``, ``share``).
    resistances : pandas.DataFrame
        Rows of ``table``, the five series resistances [m²K/W, outside basis] as columns.
    checks : dict
        Label -> tuple of :class:`~revamp.screening.Check`.
    recommendation : str
    target : Target or None
    limits : Limits
    economics : Economics or None
    warnings : tuple of str
    """

    table: pd.DataFrame
    cases: pd.DataFrame
    ratings: dict
    breakdowns: dict
    resistances: pd.DataFrame
    checks: dict
    recommendation: str
    target: Target | None = None
    limits: Limits = field(default_factory=Limits)
    economics: Economics | None = None
    warnings: tuple = ()

    def ranked(self) -> pd.DataFrame:
        """The options in rank order (base row excluded)."""
        return self.table.drop(index="base").sort_values("rank")


def _row(rating, checks):
    row = {k: float(getattr(rating, k)) for k in ("duty", "U_clean", "U_service", "area", "t_out_shell",
                                                   "t_out_tube", "dp_shell", "dp_tube", "velocity_tube",
                                                   "velocity_shell")}
    row["controlling"] = rating.controlling_resistance()
    for col in dict.fromkeys(_STATUS_COLUMNS.values()):
        names = [n for n, c in _STATUS_COLUMNS.items() if c == col]
        row[col] = worst(c for c in checks if c.name in names) if any(c.name in names for c in checks) else "n/a"
    row["screening"] = worst(checks)
    return row


def _reason(row, checks, target, economics):
    parts = []
    if target is not None:
        got = {"duty": row["duty"], "t_out_shell": row["t_out_shell"], "t_out_tube": row["t_out_tube"],
               "UA": row["U_service"] * row["area"]}[target.kind]
        verb = "meets" if row["meets_target"] else "misses"
        parts.append(f"{verb} target ({target.describe(got)} vs {target.describe()})")
    flagged = [c for c in checks if c.status != "ok"]
    if not flagged:
        parts.append("no screening flag")
    else:
        parts.append(", ".join(f"{c.status} {c.name}" for c in flagged))
    if economics is not None:
        pb = row["payback"]
        parts.append("no payback" if not math.isfinite(pb) else f"payback {pb:.2g} y")
    return "; ".join(parts)


def _cycle(cycle, ex, svc, rate, shell_method, start=0.0):
    """Duty averaged over a run; ``start`` [s] is how far into its run the exchanger already is (the base case
    goes on fouling from where it stands; an option, installed at a shutdown, starts clean)."""
    side = cycle.get("side", "tube")
    if "run_length" not in cycle:
        raise InputError("cycle.run_length", None, "a run length between cleanings, e.g. '365 day'")
    if side not in ("shell", "tube"):
        raise InputError("cycle.side", side, "'shell' or 'tube'")
    model = cycle.get("fouling")
    if "fouling_for" in cycle:  # a model that depends on the option's own clean velocity / shear
        model = cycle["fouling_for"](rate(ex, svc.replace(**{f"fouling_{side}": 0.0}), shell_method=shell_method))
    if model is None:
        raise InputError("cycle.fouling", None, "a fouling model Rf(t) (or 'fouling_for': rating -> model)")
    if start:
        fitted = model if callable(model) else model.Rf

        def model(t, _fitted=fitted, _start=float(start)):
            return _fitted(np.asarray(t, dtype=float) + _start)

    def duty_at(rf):
        return rate(ex, svc.replace(**{f"fouling_{side}": np.asarray(rf, float)}), shell_method=shell_method).duty

    return cycle_average(duty_at, model, cycle["run_length"], cycle.get("downtime", 0.0),
                         cycle.get("points", 21)).duty_mean


def compare(exchanger, service, options=(), target=None, limits=None, economics=None, revamp=None, cycle=None,
            shell_method="bell-delaware") -> Study:
    """Rate the base case and every option at the revamp conditions, screen, price and rank them.

    Parameters
    ----------
    exchanger : ShellAndTube
        The exchanger as it is.
    service : Service
        Today's service (with today's fouling).
    options : sequence of options
        From :mod:`revamp.options`; labels must be unique and not ``"base"``.
    target : None, float, str, dict or Target
        A duty [W] or ``{"t_out_tube": ...}``, ``{"t_out_shell": ...}``, ``{"UA": ...}`` (see :class:`Target`).
    limits : None, dict or Limits
        Screening limits (:class:`revamp.screening.Limits`).
    economics : None, dict or Economics
        Prices and costs (:class:`revamp.economics.Economics`); the value of an option is that of its extra duty
        over the base case, plus the capacity value when it meets the target without failing a limit while the base
        case does not (the exchanger was the bottleneck).
    revamp : None, float or Service
        The revamp conditions: a throughput factor on both flows (``1.2``) or a Service; ``None``: today's.
    cycle : dict, optional
        Cycle-averaged duty: ``{"fouling": model Rf(t), "run_length": "365 day", "downtime": "10 day",
        "side": "tube"}`` (or ``"fouling_for": rating -> model`` for a model that depends on each option's clean
        velocity and wall shear). When given, the annual value uses the cycle-averaged duties. ``"base_age"``
        (time since the last cleaning, e.g. from plant data) lets the base case go on fouling from where it stands,
        while every option, installed at a shutdown, starts its run clean; without it the base also starts clean.
    shell_method : str
        Passed to :func:`revamp.rate`.

    Returns
    -------
    Study
    """
    from .rating import rate
    from .service import Service

    tgt = Target.of(target)
    lim = Limits.of(limits)
    eco = Economics.of(economics)
    if revamp is None or revamp is service:
        revamp, rev = None, service
    elif isinstance(revamp, Service):
        rev = revamp
    else:
        rev = service.scaled(revamp)
    labels = [option_label(o) for o in options]
    if set(labels) & _RESERVED or len(set(labels)) != len(labels):
        dup = next(x for x in labels if x in _RESERVED or labels.count(x) > 1)
        raise InputError("options.label", dup, f"unique labels other than {sorted(_RESERVED)} (give label=...)")

    cases = {"base": (exchanger, rev)}
    for i, (opt, label) in enumerate(zip(options, labels)):
        try:
            cases[label] = opt.apply(exchanger, rev)
        except InputError as exc:
            raise exc.with_prefix(f"options[{i}] ({label})") from None

    ratings, checks, rows = {}, {}, {}
    for label, (ex, svc) in cases.items():
        ratings[label] = rating = rate(ex, svc, shell_method=shell_method)
        checks[label] = screen(rating, lim)
        rows[label] = _row(rating, checks[label])
        rows[label]["meets_target"] = bool(tgt.met(rating)) if tgt is not None else True
        if cycle is not None:
            start = to_si(cycle.get("base_age", 0.0), "time", "cycle.base_age") if label == "base" else 0.0
            rows[label]["duty_cycle_avg"] = _cycle(cycle, ex, svc, rate, shell_method, start)
    base_duty = rows["base"]["duty_cycle_avg" if cycle is not None else "duty"]
    # capacity is gained only when the base case is the bottleneck (misses the target or fails a limit)
    base_ok = tgt is None or (rows["base"]["meets_target"] and rows["base"]["screening"] != "fail")
    for label, row in rows.items():
        row["duty_gain"] = row["duty"] - rows["base"]["duty"]
        ok = row["meets_target"] and row["screening"] != "fail"
        if eco is None or label == "base":
            row.update(capex=0.0 if label == "base" else math.nan, annual_value=0.0 if label == "base" else math.nan,
                       payback=math.nan, npv=math.nan)
        else:
            gain = row["duty_cycle_avg" if cycle is not None else "duty"] - base_duty
            row["capex"] = eco.cost(label)
            row["annual_value"] = eco.value(gain, meets_target=ok and not base_ok)
            row["payback"] = float(simple_payback(row["capex"], row["annual_value"]))
            row["npv"] = eco.npv(label, row["annual_value"])
    order = sorted(labels, key=lambda k: (not (rows[k]["meets_target"] and rows[k]["screening"] != "fail"),
                                          rows[k]["payback"] if math.isfinite(rows[k]["payback"]) else math.inf,
                                          -rows[k]["duty"]))
    for label, row in rows.items():
        row["rank"] = order.index(label) + 1 if label != "base" else pd.NA
        row["reason"] = ("base case at the revamp conditions; " if label == "base" else "") + \
            _reason(row, checks[label], tgt, eco if label != "base" else None)
    table = pd.DataFrame.from_dict(rows, orient="index")
    table["rank"] = table["rank"].astype("Int64")
    table.index.name = "case"

    if not labels:
        recommendation = "No options given."
    else:
        best = order[0]
        good = rows[best]["meets_target"] and rows[best]["screening"] != "fail"
        recommendation = (f"{best}: {rows[best]['reason']}" if good else
                          f"No option meets the target without failing a limit; nearest: {best} "
                          f"({rows[best]['reason']}).")

    # the base case today and at the revamp conditions, fouled and clean
    base_cases = {"today": (exchanger, service), "today (clean)": (exchanger, service.clean()),
                  "revamp": (exchanger, rev), "revamp (clean)": (exchanger, rev.clean())}
    if revamp is None:
        base_cases = {"today": base_cases["today"], "today (clean)": base_cases["today (clean)"]}
    case_rows = {}
    for label, (ex, svc) in base_cases.items():
        r = ratings["base"] if svc is rev and ex is exchanger else rate(ex, svc, shell_method=shell_method)
        ratings.setdefault(label, r)
        case_rows[label] = _row(r, screen(r, lim))
        case_rows[label]["meets_target"] = bool(tgt.met(r)) if tgt is not None else True
    case_table = pd.DataFrame.from_dict(case_rows, orient="index")
    case_table.index.name = "case"

    breakdowns = {k: ratings[k].breakdown() for k in rows}
    resistances = pd.DataFrame({k: ratings[k].resistances for k in rows}).T.reindex(columns=list(RESISTANCE_NAMES))
    warnings = tuple(dict.fromkeys(f"{k}: {w}" for k in rows for w in ratings[k].warnings))
    return Study(table, case_table, ratings, breakdowns, resistances, checks, recommendation, tgt, lim, eco, warnings)
