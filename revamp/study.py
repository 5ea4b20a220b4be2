"""The comparison study: rate the base case and every retrofit option the same way and rank them.

``compare(exchanger, service, options, target=..., limits=..., economics=..., revamp=...)`` rates the base case
and each option at the revamp conditions, screens each rating (pressure drops, velocity, vibration, nozzle),
prices it and ranks the options: those within every screening limit first, then those that meet the target, then by
the stated criterion (NPV by default). Every row is judged on one stated basis (end of run by default).

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

__all__ = ["JUDGE_BASES", "RANK_CRITERIA", "RESISTANCE_NAMES", "Study", "Target", "compare"]

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

    def achieved_array(self, rating):
        """As :meth:`achieved` for an array rating (one value per case)."""
        if self.kind == "UA":
            return np.asarray(rating.U_service, dtype=float) * np.asarray(rating.area, dtype=float)
        return np.asarray(getattr(rating, self.kind), dtype=float)

    def met(self, rating, value=None) -> bool:
        """Whether the rating (or ``value``, e.g. a run average, in the rating's service) meets the target
        (relative tolerance 1e-9)."""
        got = self.achieved(rating) if value is None else float(value)
        tol = 1e-9 * self.value
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
    basis : str
        What every row was judged on (:data:`JUDGE_BASES`); ``basis_text`` says it in a sentence.
    rank_by : str
        The ranking criterion used (:data:`RANK_CRITERIA`); ``ranking_text`` states the whole ranking rule.
    value_text : str
        The value basis of the money columns (:meth:`revamp.economics.Economics.basis_text`).
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
    basis: str = "end_of_run"
    basis_text: str = ""
    rank_by: str = "npv"
    ranking_text: str = ""
    value_text: str = ""

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


def _fouling_model(cycle, ex, svc, rate, shell_method, start=0.0):
    """The fouling-side Rf(t) [m²K/W] of one case over its next run; ``start`` [s] is how far into its run the
    exchanger already is (the base case goes on fouling from where it stands; an option, installed at a shutdown,
    starts clean)."""
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
    fitted = model.Rf if (hasattr(model, "Rf") and not callable(model)) else model
    if start:
        return lambda t, _f=fitted, _s=float(start): np.asarray(_f(np.asarray(t, dtype=float) + _s), dtype=float)
    return lambda t, _f=fitted: np.asarray(_f(np.asarray(t, dtype=float)), dtype=float)


def _other_side_ramp(svc, design, side):
    """Fouling of the side with no growth model over the run: from where the option leaves it to its design value
    at the end of the run, linearly (common practice, no source); a side at its design value stays there."""
    other = "shell" if side == "tube" else "tube"
    begin = float(np.asarray(getattr(svc, f"fouling_{other}"), dtype=float))
    end = float(np.asarray(getattr(design, f"fouling_{other}"), dtype=float))
    return other, (lambda frac: begin + (end - begin) * np.asarray(frac, dtype=float))


def _cycle(cycle, ex, svc, design, model, rate, shell_method):
    """Duty averaged over a run (Epstein 1979's mean, with the downtime at no duty), with the fouling side growing
    as ``model`` and the other side ramping to its design value (see :func:`_other_side_ramp`)."""
    side = cycle.get("side", "tube")
    other, ramp = _other_side_ramp(svc, design, side)

    def duty_at(rf):
        rf = np.asarray(rf, dtype=float)
        frac = np.linspace(0.0, 1.0, rf.size).reshape(rf.shape) if rf.ndim else 1.0
        return rate(ex, svc.replace(**{f"fouling_{side}": rf, f"fouling_{other}": ramp(frac)}),
                    shell_method=shell_method).duty

    return cycle_average(duty_at, model, cycle["run_length"], cycle.get("downtime", 0.0), cycle.get("points", 21))


def _run_mean(cycle, ex, svc, design, model, rate, shell_method, target):
    """The target quantity averaged over the on-stream run (Simpson's rule on the cycle's points) [W, K or W/K]."""
    from scipy import integrate

    side = cycle.get("side", "tube")
    other, ramp = _other_side_ramp(svc, design, side)
    tau = float(to_si(cycle["run_length"], "time", "cycle.run_length"))
    n = int(cycle.get("points", 21)) | 1
    t = np.linspace(0.0, tau, n)
    r = rate(ex, svc.replace(**{f"fouling_{side}": model(t), f"fouling_{other}": ramp(t / tau)}),
             shell_method=shell_method)
    q = np.broadcast_to(np.asarray(target.achieved_array(r), dtype=float), t.shape)
    return float(integrate.simpson(q, x=t) / tau)


#: The one basis every row (base case and every option, cleaning included) is judged on: the target, the limits, the
#: duty columns and the rank. The design fouling resistance is the allowance for the end of a run between cleanings
#: (TEMA RGP-T-2.4, from memory), so a design is checked there; the cycle average is the mean over the next run.
JUDGE_BASES = {
    "end_of_run": "end of run: each row with the fouling it will have when its next run ends (the design fouling "
                  "for a side without a growth model, also for an option that cleans it now)",
    "cycle_average": "cycle average: the target quantity averaged over each row's next run, with the fouling "
                     "growing from where that row starts it",
}

#: What ranks the options among those in the same class (all limits met and target met first; see compare()).
RANK_CRITERIA = {
    "npv": "net present value, highest first",
    "payback": "simple payback, shortest first",
    "npv_per_capex": "NPV per unit of capex, highest first",
    "duty_gain": "duty gain over the base case, largest first",
}


def _rank_criterion(rank_by, eco):
    """The criterion actually used and a sentence saying so (and why when it had to fall back)."""
    if rank_by not in RANK_CRITERIA:
        raise InputError("rank_by", rank_by, f"one of {sorted(RANK_CRITERIA)}")
    used, why = rank_by, ""
    if used in ("npv", "npv_per_capex") and (eco is None or eco.discount_rate is None):
        used = "payback" if eco is not None else "duty_gain"
        why = f" ({rank_by} asked for, but {'no discount rate' if eco is not None else 'no economics'} is given)"
    if used == "payback" and eco is None:
        used, why = "duty_gain", f" ({rank_by} asked for, but no economics is given)"
    text = (f"Ranking: an option that fails a screening limit never ranks above one that meets every limit; among "
            f"those, an option that meets the target ranks above one that misses it; within each class by "
            f"{RANK_CRITERIA[used]}{why}. (Limits before target before money: common practice, no source.)")
    return used, text


def _criterion_key(row, used):
    def finite(x, default):
        return x if x is not None and math.isfinite(x) else default

    gain = row.get("value_gain", row["duty_gain"])
    if used == "npv":
        return -finite(row["npv"], -math.inf)
    if used == "payback":
        return finite(row["payback"], math.inf)
    if used == "npv_per_capex":
        npv_, capex = row["npv"], row["capex"]
        if not math.isfinite(npv_):
            return math.inf
        return -(npv_ / capex if capex > 0 else math.copysign(math.inf, npv_) if npv_ else 0.0)
    return -finite(gain, -math.inf)


def compare(exchanger, service, options=(), target=None, limits=None, economics=None, revamp=None, cycle=None,
            shell_method="bell-delaware", basis="end_of_run", rank_by="npv") -> Study:
    """Rate the base case and every option at the revamp conditions, screen, price and rank them.

    Every row (the base case and each option, cleaning included) is judged on one stated ``basis``: at the end of
    its next run with the fouling it will have then (default), or averaged over that run.

    Parameters
    ----------
    exchanger : ShellAndTube
        The exchanger as it is.
    service : Service
        Today's service (with today's fouling, taken as the design fouling the exchanger reaches at end of run).
    options : sequence of options
        From :mod:`revamp.options`; labels must be unique and not ``"base"``.
    target : None, float, str, dict or Target
        A duty [W] or ``{"t_out_tube": ...}``, ``{"t_out_shell": ...}``, ``{"UA": ...}`` (see :class:`Target`).
    limits : None, dict or Limits
        Screening limits (:class:`revamp.screening.Limits`).
    economics : None, dict or Economics
        Prices and costs (:class:`revamp.economics.Economics`); the value of an option is that of its extra duty
        over the base case on the economics' ``value_basis``, plus the capacity value when it meets the target
        without failing a limit while the base case does not (the exchanger was the bottleneck).
    revamp : None, float or Service
        The revamp conditions: a throughput factor on both flows (``1.2``) or a Service; ``None``: today's.
    cycle : dict, optional
        Cycle-averaged duty: ``{"fouling": model Rf(t), "run_length": "365 day", "downtime": "10 day",
        "side": "tube"}`` (or ``"fouling_for": rating -> model`` for a model that depends on each option's clean
        velocity and wall shear). When given, the annual value uses the cycle-averaged duties. ``"base_age"``
        (time since the last cleaning, e.g. from plant data) lets the base case go on fouling from where it stands,
        while every option, installed at a shutdown, starts its run clean; without it the base also starts clean.
        The other side has no growth model: it goes linearly from where the option leaves it to its design value.
    shell_method : str
        Passed to :func:`revamp.rate`.
    basis : {"end_of_run", "cycle_average"}
        What every row is judged on (:data:`JUDGE_BASES`); ``"cycle_average"`` needs ``cycle``.
    rank_by : {"npv", "payback", "npv_per_capex", "duty_gain"}
        The ranking criterion within a class (:data:`RANK_CRITERIA`); it falls back (and says so) when the money
        it needs is not given.

    Returns
    -------
    Study

    References
    ----------
    Epstein, N. (1979). Optimum evaporator cycles with scale formation.
    TEMA (2007). Standards of the Tubular Exchanger Manufacturers Association, 9th ed., RGP-T-2.4 (fouling
    resistances as an allowance for the end of a run, from memory).
    """
    from .rating import rate
    from .service import Service

    for side in ("shell", "tube"):
        if getattr(getattr(service, side, None), "condensing", False):
            raise InputError(f"service.{side}", "a vapour or two-phase stream",
                             "a liquid service here: compare a condenser's options with "
                             "revamp.options_condenser.compare_condenser")
    tgt = Target.of(target)
    lim = Limits.of(limits)
    eco = Economics.of(economics)
    if basis not in JUDGE_BASES:
        raise InputError("basis", basis, f"one of {sorted(JUDGE_BASES)}")
    if basis == "cycle_average" and cycle is None:
        raise InputError("basis", basis, "'end_of_run' when no fouling cycle is given (cycle_average needs one)")
    used, ranking_text = _rank_criterion(rank_by, eco)
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
        # the state the row is judged in: the end of its next run (design fouling where no growth model says more)
        judged = svc.replace(fouling_shell=rev.fouling_shell, fouling_tube=rev.fouling_tube)
        model = None
        if cycle is not None:
            start = to_si(cycle.get("base_age", 0.0), "time", "cycle.base_age") if label == "base" else 0.0
            model = _fouling_model(cycle, ex, svc, rate, shell_method, start)
            side = cycle.get("side", "tube")
            tau = float(to_si(cycle["run_length"], "time", "cycle.run_length"))
            judged = judged.replace(**{f"fouling_{side}": float(max(float(model(tau)), 0.0))})
        ratings[label] = rating = rate(ex, judged, shell_method=shell_method)
        checks[label] = screen(rating, lim)
        rows[label] = _row(rating, checks[label])
        if model is not None:
            avg = _cycle(cycle, ex, svc, rev, model, rate, shell_method)
            rows[label]["duty_cycle_avg"] = avg.duty_mean
        if tgt is None:
            rows[label]["meets_target"] = True
        elif basis == "cycle_average":
            mean = _run_mean(cycle, ex, svc, rev, model, rate, shell_method, tgt)
            rows[label]["target_mean"] = mean
            rows[label]["meets_target"] = bool(tgt.met(rating, mean))
        else:
            rows[label]["meets_target"] = bool(tgt.met(rating))
        rows[label]["judged_on"] = basis
    money_col = "duty_cycle_avg" if cycle is not None else "duty"
    base_duty = rows["base"][money_col]
    # capacity is gained only when the base case is the bottleneck (misses the target or fails a limit)
    base_ok = tgt is None or (rows["base"]["meets_target"] and rows["base"]["screening"] != "fail")
    for label, row in rows.items():
        row["duty_gain"] = row["duty"] - rows["base"]["duty"]
        row["value_gain"] = row[money_col] - base_duty
        ok = row["meets_target"] and row["screening"] != "fail"
        if eco is None or label == "base":
            row.update(capex=0.0 if label == "base" else math.nan, annual_value=0.0 if label == "base" else math.nan,
                       payback=math.nan, npv=math.nan)
        else:
            row["capex"] = eco.cost(label)
            row["annual_value"] = eco.value(row["value_gain"], meets_target=ok and not base_ok)
            row["payback"] = float(simple_payback(row["capex"], row["annual_value"]))
            row["npv"] = eco.npv(label, row["annual_value"])
        row["value_basis"] = eco.value_basis if eco is not None else ""
    # hard limits first, then the target, then the stated criterion (then the larger duty on a tie)
    order = sorted(labels, key=lambda k: (rows[k]["screening"] == "fail", not rows[k]["meets_target"],
                                          _criterion_key(rows[k], used), -rows[k]["duty"]))
    for label, row in rows.items():
        row["rank"] = order.index(label) + 1 if label != "base" else pd.NA
        row["reason"] = ("base case at the revamp conditions; " if label == "base" else "") + \
            _reason(row, checks[label], tgt, eco if label != "base" else None)
    for row in rows.values():
        del row["value_gain"]
    table = pd.DataFrame.from_dict(rows, orient="index")
    table["rank"] = table["rank"].astype("Int64")
    table.index.name = "case"

    if not labels:
        recommendation = "No options given."
    else:
        best = order[0]
        within = rows[best]["screening"] != "fail"
        if within and rows[best]["meets_target"]:
            recommendation = f"{best}: {rows[best]['reason']}"
        elif within:
            recommendation = (f"No option meets the target; the nearest within every limit: {best} "
                              f"({rows[best]['reason']}).")
        else:
            recommendation = (f"Every option fails a screening limit; least bad: {best} ({rows[best]['reason']}). "
                              f"Not a recommendation.")

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
    basis_text = f"Every row is judged on one basis, the same for all: {JUDGE_BASES[basis]}."
    if cycle is not None:
        basis_text += (" Value, payback and NPV use the duty averaged over each row's next run (duty_cycle_avg).")
    value_text = eco.basis_text() if eco is not None else ""
    return Study(table, case_table, ratings, breakdowns, resistances, checks, recommendation, tgt, lim, eco, warnings,
                 basis=basis, basis_text=basis_text, rank_by=used, ranking_text=ranking_text, value_text=value_text)
