"""One exchanger's study: ratings today and at the revamp conditions, plant data, the fouling cycle, the options.

:func:`study_exchanger` computes everything a report on one exchanger shows and returns it as a frozen
:class:`ExchangerStudy` (the way pvlib separates ``ModelChain`` from ``ModelChainResult``); ``revamp.report`` only
formats it. The policy lives here, each piece stated with where it came from: which side fouls, the run length and
the cleaning downtime of the cycle, the fouling model used for each option, and the warnings of every rating as
typed :class:`Note` objects naming the quantity they qualify.

The inlet streams may be given by the caller (``service_today``, ``service_revamp``), e.g. from a train solve;
otherwise they are the case's own.

References
----------
Ebert, W., Panchal, C. B. (1995). Analysis of Exxon crude-oil-slip-stream coking data.
Epstein, N. (1979). Optimum evaporator cycles with scale formation. *Can. J. Chem. Eng.* 57, 659-661.
Holmgren, W. F., Hansen, C. W., Mikofski, M. A. (2018). pvlib python: a python package for modeling solar energy
systems. *J. Open Source Software* 3(29), 884 (the model-chain / result split followed here).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Callable

import numpy as np

from ..errors import InputError

__all__ = [
    "DEFAULT_RUN_LENGTH",
    "SEVERITIES",
    "CycleSettings",
    "ExchangerStudy",
    "Note",
    "Setting",
    "cycle_settings",
    "fouling_side",
    "rating_notes",
    "study_exchanger",
    "train_valued",
    "warning_quantity",
]

#: Run length between cleanings when the unit file gives none [s]: one year (common practice, no source).
DEFAULT_RUN_LENGTH = 365.0 * 86400.0

#: How much a note matters: ``info`` (a choice made, stated), ``warning`` (a number outside a method's range or a
#: property extrapolated: the number it qualifies is less certain), ``error`` (a part of the study could not be
#: computed and was left out).
SEVERITIES = ("info", "warning", "error")


@dataclass(frozen=True)
class Note:
    """One statement attached to a number of the study.

    Parameters
    ----------
    source : str
        What produced it: a rating's label (``"today"``, ``"revamp (clean)"``, an option label), ``"plant data"``,
        ``"cycle"`` or ``"study"``.
    quantity : str
        The quantity it qualifies, as the Rating field name (``"h_tube"``, ``"t_out_shell"``, ``"dp_shell"``,
        ``"duty"`` for the rating as a whole) or the study item (``"fouling_side"``, ``"duty_cycle_avg"``).
    severity : str
        One of :data:`SEVERITIES`.
    text : str
        The statement, in plain words.
    """

    source: str
    quantity: str
    severity: str
    text: str

    def __post_init__(self):
        if self.severity not in SEVERITIES:
            raise InputError("Note.severity", self.severity, f"one of {SEVERITIES}")


@dataclass(frozen=True)
class Setting:
    """A value the study used and where it came from (``"unit file: <path>"``, ``"default: ..."``,
    ``"inferred: ..."``, ``"argument"``)."""

    value: Any
    source: str


@dataclass(frozen=True)
class CycleSettings:
    """The fouling cycle the options are averaged over (the ``cycle`` argument of :func:`revamp.compare`).

    Attributes
    ----------
    side : Setting
        The side the deposit grows on (``"shell"`` or ``"tube"``).
    run_length, downtime : Setting
        Run length between cleanings and downtime per cleaning [s].
    base_age : float
        How far into its run the exchanger is at the last plant-data row [s]; the base case goes on from there.
    model : str
        The fitted trend's model name (``"linear"``, ``"asymptotic"``, ``"threshold"``, ...).
    model_text : str
        How the model is used for the options, in a sentence.
    fouling : callable or None
        Rf(t) [m²K/W on the side's own surface, t in s] used for every option; None when ``fouling_for`` is set.
    fouling_for : callable or None
        ``rating -> Rf(t)``: the model rebuilt at each option's clean rating (threshold model).
    """

    side: Setting
    run_length: Setting
    downtime: Setting
    base_age: float
    model: str
    model_text: str
    fouling: Callable | None = field(default=None, repr=False)
    fouling_for: Callable | None = field(default=None, repr=False)

    def as_compare_argument(self) -> dict:
        """The ``cycle`` dict :func:`revamp.compare` takes."""
        out = {"side": self.side.value, "run_length": float(self.run_length.value),
               "downtime": float(self.downtime.value), "base_age": float(self.base_age)}
        if self.fouling_for is not None:
            out["fouling_for"] = self.fouling_for
        else:
            out["fouling"] = self.fouling
        return out


@dataclass(frozen=True)
class ExchangerStudy:
    """Everything computed for one exchanger (see :func:`study_exchanger`).

    Attributes
    ----------
    case : object
        The exchanger case studied (a :class:`revamp.unitfile.ExchangerCase` or any object with its fields).
    service_today, service_revamp : Service
        The services rated (the case's own, or the caller's, e.g. from a train solve); ``inlets`` says which.
    today, today_clean, revamp, revamp_clean : Rating
        The exchanger as it is, today and at the revamp conditions, with its design fouling and clean.
    fouling_side : Setting
        The side the deposit forms on, and why.
    monitoring : Monitoring or None
        The plant-data analysis (None without plant data, or when it failed: ``monitoring_error``).
    cycle : CycleSettings or None
        The fouling cycle (None without a fitted trend).
    study : Study or None
        The option comparison at the revamp conditions (None when no option is given).
    notes : tuple of Note
        Every rating's warnings (each naming the quantity it qualifies) and the study's own statements.
    monitoring_error, cycle_error : str or None
        Why the plant-data analysis, or the cycle-averaged comparison, is missing.
    inlets : str
        Where the inlet streams came from.
    train_values : TrainStudy or None
        This exchanger's options valued by the whole train (:func:`revamp.unitfile.network_option_values`), when
        given: on the ``fuel`` value basis the study's money (``annual_value``, ``payback``, ``npv``, and so the
        rank) is then the train's, its own-duty money kept as ``annual_value_own``, ``payback_own``, ``npv_own``
        and the basis of each row in ``money_basis``.
    """

    case: Any
    service_today: Any
    service_revamp: Any
    today: Any
    today_clean: Any
    revamp: Any
    revamp_clean: Any
    fouling_side: Setting
    monitoring: Any = None
    cycle: CycleSettings | None = None
    study: Any = None
    notes: tuple = ()
    monitoring_error: str | None = None
    cycle_error: str | None = None
    inlets: str = "the case's own"
    train_values: Any = field(default=None, repr=False)

    @property
    def ratings(self) -> dict:
        """The four base-case ratings by label (``today``, ``today (clean)``, ``revamp``, ``revamp (clean)``)."""
        return {"today": self.today, "today (clean)": self.today_clean, "revamp": self.revamp,
                "revamp (clean)": self.revamp_clean}

    def notes_for(self, source: str | None = None, quantity: str | None = None) -> tuple:
        """The notes of one source and/or quantity."""
        return tuple(n for n in self.notes if (source is None or n.source == source)
                     and (quantity is None or n.quantity == quantity))


# --------------------------------------------------------------------------------------------------- rating notes
_SHELL_METHODS = ("bell-delaware", "kern")
_TUBE_METHODS = ("gnielinski", "sieder-tate", "twisted tape", "wire coil", "insert", "transitional flow",
                 "manglik", "garcía", "garcia")


def warning_quantity(text: str) -> str:
    """The Rating quantity a rating warning qualifies (its Rating field name).

    A shell-side correlation's range qualifies ``h_shell`` (and with it the shell pressure drop); a tube-side or
    insert correlation's ``h_tube``; a fluid property or phase statement of one side that side's outlet
    temperature; the property iteration, the geometry and anything else the rating as a whole (``duty``).

    >>> warning_quantity("Gnielinski (1976): Re = 2000 is outside its validity range 3000 to 5e+06")
    'h_tube'
    >>> warning_quantity("shell side: wall temperature outside the range of water")
    't_out_shell'
    """
    low = text.lower()
    if low.startswith("geometry:") or low.startswith("property iteration"):
        return "duty"
    if any(k in low for k in _SHELL_METHODS):
        return "h_shell"
    if any(k in low for k in _TUBE_METHODS):
        return "h_tube"
    for side in ("shell", "tube"):
        if low.startswith(f"{side} side:"):
            return f"t_out_{side}"
    return "duty"


def rating_notes(source: str, rating) -> tuple:
    """Every warning of a rating as a :class:`Note` (severity ``warning``) naming the quantity it qualifies."""
    return tuple(Note(source, warning_quantity(w), "warning", str(w)) for w in getattr(rating, "warnings", ()))


# --------------------------------------------------------------------------------------------- policy, with sources
def fouling_side(rating, given: str | None = None, where: str = "plant_data.fouling_side") -> tuple:
    """Where the deposit is taken to form, and why, as ``(side, reason)``.

    ``given`` is the side the unit file names (``where`` says which field); the reason then starts "from the unit
    file". Without it the side with the larger design fouling resistance is taken, compared on the outside-area
    basis of the resistance breakdown (``rating.resistances``); a tie goes to the tube side, and the reason starts
    "inferred:" (common practice, no source).
    """
    if given is not None:
        if given not in ("shell", "tube"):
            raise InputError("fouling_side", given, "'shell' or 'tube'")
        return given, f"from the unit file ({where}: {given})"
    shell, tube = (float(rating.resistances[f"{s} fouling"]) for s in ("shell", "tube"))
    side = "shell" if shell > tube else "tube"
    values = f"{shell * 1e4:.2f} shell vs {tube * 1e4:.2f} tube, 10⁻⁴ m²·K/W on the outside area"
    rule = "its design fouling resistance is the larger" if shell != tube else "the design fouling resistances are equal"
    return side, (f"inferred: the unit file does not say which side fouls (plant_data.fouling_side), so the {side} "
                  f"side is taken: {rule} ({values})")


def _cycle_fouling(trend, side: str, ratio: float, rating=None):
    """The fitted plant-data trend as a fouling model Rf(t) for a run from clean [m²K/W on the side's own surface].

    ``ratio`` converts the trend's outside-area Rf to the side's own surface (tube side: di/do of the exchanger the
    data come from, so the same deposit; shell side: 1). A linear or asymptotic trend is used as it was fitted,
    whatever the option (it knows nothing of velocity). A threshold trend (Ebert & Panchal 1995) is rebuilt at the
    clean ``rating`` of each option: its fitted Rf0, alpha_ref, E, gamma, with the rating's tube-side Re, Pr, wall
    shear and film temperature (T_b + 0.55·(T_w − T_b)), held for the run; a net rate below zero (removal beats
    deposition) is taken as no growth. Negative Rf from a fit is clipped to 0.
    """
    from ..fouling.models import film_temperature, threshold_rate

    if trend.model == "threshold" and side == "tube" and rating is not None:
        p, c = trend.params, trend.conditions
        t_bulk = 0.5 * (float(rating.service.tube.t_in) + float(rating.t_out_tube))
        growth = max(float(threshold_rate(float(rating.Re_tube), float(rating.Pr_tube),
                                          film_temperature(t_bulk, float(rating.t_wall_tube)),
                                          float(rating.shear_tube), p["alpha_ref"], p["E"], p["gamma"],
                                          c["beta"], c["T_ref"])), 0.0)
        rf0 = max(float(p["Rf0"]), 0.0)
        return lambda t: ratio * (rf0 + growth * np.asarray(t, dtype=float))
    return lambda t: ratio * np.maximum(np.asarray(trend(np.asarray(t, dtype=float)), dtype=float), 0.0)


def _given(case, name: str, index_path: str | None = None) -> Setting | None:
    value = getattr(case, name, None)
    if value is None:
        return None
    where = (getattr(case, "cycle_from", None) or {}).get(name, index_path or name)
    return Setting(float(value), f"unit file: {where}")


def cycle_settings(case, monitoring, side: Setting) -> CycleSettings | None:
    """The fouling cycle from the plant-data trend (None without a trend), each setting with its source."""
    trend = getattr(monitoring, "trend", None)
    if trend is None:
        return None
    ex = case.exchanger
    ratio = float(ex.tube_id) / float(ex.tube_od) if side.value == "tube" else 1.0
    run = _given(case, "run_length") or Setting(DEFAULT_RUN_LENGTH, "default: the unit file gives none, so one "
                                                                    "year is taken (common practice, no source)")
    down = _given(case, "cleaning_downtime") or Setting(0.0, "default: the unit file gives none, so no downtime "
                                                             "is counted")
    run_time = monitoring.table["run_time"].to_numpy(dtype=float)
    age = max(float(np.nanmax(run_time)) if np.isfinite(run_time).any() else 0.0, 0.0)
    if trend.model == "threshold" and side.value == "tube":
        return CycleSettings(side, run, down, age, trend.model,
                             "threshold model rebuilt at each option's own clean tube velocity, wall shear and film "
                             "temperature, so an option that raises velocity fouls more slowly; where removal beats "
                             "deposition the deposit is taken not to grow",
                             fouling_for=lambda rating: _cycle_fouling(trend, side.value, ratio, rating))
    return CycleSettings(side, run, down, age, trend.model,
                         f"{trend.model} model used as fitted for every option (it does not depend on velocity, so "
                         f"it cannot credit an option that fouls more slowly)",
                         fouling=_cycle_fouling(trend, side.value, ratio))


# --------------------------------------------------------------------------------------------------- the study
def study_exchanger(case, *, service_today=None, service_revamp=None, mc_draws: int = 100, basis=None,
                    rank_by=None, train_values=None) -> ExchangerStudy:
    """Study one exchanger: ratings, plant data, fouling cycle, options; every choice stated with its source.

    Parameters
    ----------
    case : ExchangerCase
        The exchanger and its inputs (``revamp.unitfile`` builds them; any object with the same fields works).
    service_today, service_revamp : Service, optional
        Inlet streams (and fouling) to rate today and at the revamp conditions instead of the case's own, e.g. the
        inlets a train solve gives this exchanger. Given alone, ``service_today`` also stands for the revamp
        service only when the case has no revamp conditions of its own (its revamp service is its service).
    mc_draws : int
        Monte Carlo draws for the plant-data uncertainty band (0: none).
    basis : {"end_of_run", "cycle_average"}, optional
        What every option is judged on (:data:`revamp.study.JUDGE_BASES`); default the case's ``judge_on`` or
        end of run. ``"cycle_average"`` falls back to end of run, with a note, when no fouling trend is fitted.
    rank_by : str, optional
        Ranking criterion (:data:`revamp.study.RANK_CRITERIA`); default the case's ``rank_by`` or NPV.
    train_values : TrainStudy, optional
        The exchanger's options valued by its train (:func:`revamp.unitfile.network_option_values`: each option
        applied to this exchanger alone, the train solved again). On the ``fuel`` value basis the money then values
        the fired duty the train saves, not this exchanger's own duty gain (see :func:`train_valued`).

    Returns
    -------
    ExchangerStudy
    """
    import revamp as rv  # the package's public names, so that a caller's stand-in (a test spy) is honoured

    rate, monitor, compare = rv.rate, rv.monitor, rv.compare

    notes = []
    given_today, given_revamp = service_today is not None, service_revamp is not None
    if service_today is None:
        service_today = case.service
    if service_revamp is None:
        service_revamp = service_today if (given_today and case.revamp_service is case.service) else case.revamp_service
    inlets = ("the caller's (e.g. a train solve)" if given_today or given_revamp else "the case's own")
    if given_today or given_revamp:
        notes.append(Note("study", "duty", "info", f"Inlet streams from the caller (e.g. a train solve) for "
                                                   f"{' and '.join(n for n, g in (('today', given_today), ('the revamp', given_revamp)) if g)}, "
                                                   f"not the unit file's."))

    today = rate(case.exchanger, service_today)
    today_clean = rate(case.exchanger, service_today.clean())
    revamp = rate(case.exchanger, service_revamp)
    revamp_clean = rate(case.exchanger, service_revamp.clean())
    for label, r in (("today", today), ("today (clean)", today_clean), ("revamp", revamp),
                     ("revamp (clean)", revamp_clean)):
        notes += rating_notes(label, r)

    for problem in getattr(case, "refused_options", ()):  # options the unit file check refused: said, not rated
        notes.append(Note("options", "option", "error", f"Option not rated, the unit file has a problem with it: "
                                                         f"{problem}"))
    where = (getattr(case, "cycle_from", None) or {}).get("fouling_side", "plant_data.fouling_side")
    side_value, why = fouling_side(today, getattr(case, "fouling_side", None), where)
    side = Setting(side_value, why)

    monitoring = monitoring_error = cycle = cycle_error = None
    if getattr(case, "plant_data", None) is not None:
        pdata = case.plant_data
        try:
            # the same run length as the cycle average: the unit file's, else the stated one-year default
            run = getattr(case, "run_length", None)
            options = pdata.monitor_options() if hasattr(pdata, "monitor_options") else {
                "columns": pdata.columns, "uncertainty": pdata.uncertainty or None}
            monitoring = monitor(case.exchanger, service_today, pdata.file, mc_draws=mc_draws, fouling_side=side.value,
                                 run_length=run if run is not None else DEFAULT_RUN_LENGTH, **options)
        except Exception as exc:  # plant data is evidence, not a precondition: the study goes on without it
            monitoring_error = f"{exc.__class__.__name__}: {exc}"
            notes.append(Note("plant data", "fouling", "error", f"No plant-data analysis: {monitoring_error}"))
        else:
            cycle = cycle_settings(case, monitoring, side)

    basis = basis or getattr(case, "judge_on", None) or "end_of_run"
    if basis == "cycle_average" and cycle is None:
        notes.append(Note("study", "judged_on", "info", "The cycle average was asked for, but no fouling trend was "
                                                        "fitted: every option is judged at the end of its run."))
        basis = "end_of_run"
    rank_by = rank_by or getattr(case, "rank_by", None) or "npv"

    study = None
    if case.options:
        kwargs = {"target": case.target or None, "limits": case.limits or None, "economics": case.economics,
                  "revamp": service_revamp, "rank_by": rank_by}
        try:
            study = compare(case.exchanger, service_today, list(case.options), basis=basis,
                            cycle=cycle.as_compare_argument() if cycle is not None else None, **kwargs)
        except Exception as exc:
            if cycle is None:
                raise
            # the cycle average is an extra: when a rating along the run fails, keep the end-of-run comparison
            cycle_error = f"{exc.__class__.__name__}: {exc}"
            notes.append(Note("cycle", "duty_cycle_avg", "error",
                              f"No cycle-averaged duty (end-of-run duties used for the money): {cycle_error}"))
            study = compare(case.exchanger, service_today, list(case.options), **kwargs)
        for label in study.table.index:  # the rows as judged (end of run): the base case and each option
            notes += rating_notes(str(label), study.ratings[label])
    if study is not None and train_values is not None:
        study, money_notes = train_valued(study, train_values, case.tag)
        notes += money_notes
    if side.source.startswith("inferred"):
        notes.append(Note("study", "fouling_side", "info", side.source))
    economics = getattr(case, "economics", None)
    if economics is not None:
        where = (getattr(case, "cycle_from", None) or {}).get("value_basis")
        origin = (f"from the unit file ({where})" if where else
                  "the default: the unit file names none (economics.value_basis or the exchanger's value_basis)")
        notes.append(Note("study", "value_basis", "info",
                          f"Money valued on the '{economics.value_basis}' basis, {origin}."))
    return ExchangerStudy(case=case, service_today=service_today, service_revamp=service_revamp, today=today,
                          today_clean=today_clean, revamp=revamp, revamp_clean=revamp_clean, fouling_side=side,
                          monitoring=monitoring, cycle=cycle, study=study, notes=tuple(dict.fromkeys(notes)),
                          monitoring_error=monitoring_error, cycle_error=cycle_error, inlets=inlets,
                          train_values=train_values)


# ------------------------------------------------------------------------------------------- money from the train
#: The money basis of a row valued by its train, and of one valued by its own duty (the ``money_basis`` column).
MONEY_BASES = {
    "train": "train: fired duty saved by the whole train",
    "own": "own duty gain of this exchanger",
}


def train_valued(study, train_study, tag: str) -> tuple:
    """The study with its money on the train's value: ``(Study, notes)``.

    An option's worth to a preheat train is the fired duty the furnace saves once the exchangers downstream have
    recovered less (the train solved again with the option applied to this exchanger alone,
    :func:`revamp.train.compare_train`), not this exchanger's own duty gain counted as fuel. On the ``fuel`` value
    basis each option's annual value becomes

        fired duty saved × operating time × fuel price  (+ the capacity value it already had, if any)

    (:func:`revamp.economics.annual_fired_value`: the furnace's efficiency is in the fired duty), and its payback
    and NPV follow from it with the option's own capex; the rank and the recommendation are made again on these
    (the same rule: limits, then target, then the stated criterion). The own-duty money stays beside it as
    ``annual_value_own``, ``payback_own``, ``npv_own``; ``money_basis`` says which one each row's money uses. A row
    the train could not value (no converged solve, no such option) keeps its own-duty money, said so in a note.
    On another value basis (a cooler, a condenser, throughput) the money is left as it is, and a note says so.

    Parameters
    ----------
    study : Study
        The exchanger's comparison (:func:`revamp.compare`).
    train_study : TrainStudy
        Its options at train level; rows named ``"<tag>: <option label>"``.
    tag : str
        The exchanger's tag.
    """
    import dataclasses
    import math

    from ..economics import annual_fired_value, simple_payback
    from ..study import _criterion_key, _reason

    eco = study.economics
    notes = []
    if eco is None:
        return study, ()
    if eco.value_basis != "fuel":
        notes.append(Note("study", "value_basis", "info",
                          f"The train's value of each option (fired duty saved) is shown beside, not used: this "
                          f"exchanger's money is on the '{eco.value_basis}' basis, not fuel."))
        return study, tuple(notes)
    t = study.table.copy()
    tt = train_study.table
    money_col = "duty_cycle_avg" if "duty_cycle_avg" in t else "duty"
    for col in ("annual_value", "payback", "npv"):
        t[f"{col}_own"] = t[col]
    basis = []
    for label in t.index:
        if label == "base":
            basis.append("")
            continue
        key = f"{tag}: {label}"
        row = tt.loc[key] if key in tt.index else None
        saved = float(row["furnace_duty_saved"]) if row is not None else math.nan
        if row is None or not bool(row["converged"]) or not math.isfinite(saved):
            why = "no such option in the train study" if row is None else "the train solve did not converge"
            notes.append(Note(str(label), "annual_value", "warning",
                              f"Money on this exchanger's own duty gain: the train could not value it ({why})."))
            basis.append(MONEY_BASES["own"])
            continue
        # the capacity value (when the option lifts the limit the exchanger set) does not depend on the duty basis
        gain = float(t.loc[label, money_col] - t.loc["base", money_col])
        capacity = float(t.loc[label, "annual_value_own"]) - eco.value(gain, meets_target=False)
        value = float(annual_fired_value(saved, eco.energy_price, eco.price_per, eco.operating_time)) + capacity
        t.loc[label, "annual_value"] = value
        t.loc[label, "payback"] = float(simple_payback(t.loc[label, "capex"], value))
        t.loc[label, "npv"] = eco.npv(label, value)
        basis.append(MONEY_BASES["train"])
    t["money_basis"] = basis
    # rank again on the new money: the same rule as revamp.compare (limits, target, criterion, larger duty)
    labels = [k for k in t.index if k != "base"]
    rows = {k: t.loc[k].to_dict() for k in t.index}
    base_money = rows["base"][money_col]
    for k in labels:
        rows[k]["value_gain"] = rows[k][money_col] - base_money
    order = sorted(labels, key=lambda k: (rows[k]["screening"] == "fail", not rows[k]["meets_target"],
                                          _criterion_key(rows[k], study.rank_by), -rows[k]["duty"]))
    for k in labels:
        t.loc[k, "rank"] = order.index(k) + 1
        t.loc[k, "reason"] = _reason(rows[k], study.checks[k], study.target, eco)
    t["rank"] = t["rank"].astype("Int64")
    recommendation = study.recommendation
    if order:
        best = order[0]
        if rows[best]["screening"] != "fail" and rows[best]["meets_target"]:
            recommendation = f"{best}: {t.loc[best, 'reason']}"
        elif rows[best]["screening"] != "fail":
            recommendation = (f"No option meets the target; the nearest within every limit: {best} "
                              f"({t.loc[best, 'reason']}).")
        else:
            recommendation = (f"Every option fails a screening limit; least bad: {best} ({t.loc[best, 'reason']}). "
                              f"Not a recommendation.")
    used = sum(b == MONEY_BASES["train"] for b in basis)
    text = (f"Money on the train's value ({used} of {len(labels)} option(s)): each option applied to this exchanger "
            f"alone and the whole train solved again at its revamp throughput, every exchanger at the end of its "
            f"run (its unit-file design fouling); the annual value is the fired duty the train saves × operating time × fuel price (the "
            f"furnace's efficiency is in the fired duty), plus any capacity value, so heat the exchangers downstream "
            f"no longer recover is taken off. "
            + ("With the cycle average asked for, the train value stays at the end of run (the train is not "
               "solved along the run). " if study.basis == "cycle_average" else "")
            + f"This exchanger's own-duty money is kept for reference (value, payback, NPV 'own'). "
            + "Own-duty money: " + study.value_text)
    notes.append(Note("study", "annual_value", "info", text))
    return dataclasses.replace(study, table=t, recommendation=recommendation, value_text=text), tuple(notes)
