"""One condenser's study, computed: ratings today and at the revamp vapour load (in service and clean), the zones,
the condensing pressure the exchanger can hold at the revamp vapour load against the one the column may run at, the
options side by side, and the fouling from plant data (:func:`run_condenser_case` -> :class:`CondenserStudy`);
:mod:`revamp.report.condenser` formats it.

References
----------
Bell, K. J., and Ghaly, M. A. (1973). An approximate generalized design method for multicomponent/partial
condensers. AIChE Symp. Ser. 69(131), 72-79 (the zone-by-zone rating along the condensing curve).
Brent, R. P. (1973). *Algorithms for Minimization without Derivatives*. Prentice-Hall, ch. 4 (the root search on
the pressure).
Kister, H. Z. (1990). *Distillation Operation*. McGraw-Hill, ch. 15 (a column's top pressure set by what its
overhead condenser can condense: the column-pressure question).
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field

from ..errors import InputError
from .exchanger import Note

__all__ = ["CondenserStudy", "condenser_unit_ratings", "run_condenser_case"]

#: the ratings a condenser study makes, in order
RATING_LABELS = ("today", "today (clean)", "revamp", "revamp (clean)")


@dataclass(frozen=True)
class CondenserStudy:
    """One condenser's study (SI inside).

    Attributes
    ----------
    case : CondenserCase
    ratings : dict
        Label -> :class:`~revamp.rating_condenser.CondenserRating`: ``"today"``, ``"today (clean)"`` and, with a
        revamp section, ``"revamp"`` and ``"revamp (clean)"`` (the revamp vapour load at today's pressure).
    vapour_load : float
        The vapour load the pressure question is asked at [kg/s] (the revamp load, or today's flow).
    pressure : CondensingPressure or None
        :func:`~revamp.rating_condenser.condensing_pressure_for` at that load, with the fouling of the unit file
        (None when the search found no pressure: ``pressure_error``).
    pressure_error : str
    holds : bool or None
        Whether that pressure (or its dew point) is within the allowed one (None: no ``allowed`` section, or no
        pressure found).
    answer : str
        The column-pressure answer in plain words.
    options : pandas.DataFrame or None
        :func:`~revamp.options_condenser.compare_condenser` at the revamp service, with the condensing pressure
        each option holds at the vapour load (None without options: ``options_error`` says why when they failed).
    options_error : str
    monitoring : CondenserPlantMonitoring or None
    monitoring_error : str
    notes : tuple of Note
        What qualifies the numbers, each with its source (rating warnings once each, the methods, the basis).
    """

    case: object
    ratings: dict
    vapour_load: float
    pressure: object = None
    pressure_error: str = ""
    holds: object = None
    answer: str = ""
    options: object = None
    options_error: str = ""
    monitoring: object = None
    monitoring_error: str = ""
    notes: tuple = field(default=())

    @property
    def warnings(self) -> tuple:
        """The notes' texts of severity ``warning``."""
        return tuple(n.text for n in self.notes if n.severity == "warning")


def _clean(service):
    if hasattr(service, "air_in"):
        return service.replace(fouling_tube=0.0, fouling_air=0.0)
    return service.replace(fouling_shell=0.0, fouling_tube=0.0)


def _answer(case, pressure, load, holds) -> str:
    from ..units import format_quantity as fq

    p_today = float(getattr(case.vapour, "fluid").pressure) if hasattr(case.vapour.fluid, "pressure") else None
    said = (f"At the {'revamp ' if case.vapour_load is not None else ''}vapour load of {fq(load, 'mass_flow')} "
            f"this condenser, with the fouling of the unit file and its coolant as given, condenses all the vapour "
            f"once the condensing pressure is {fq(pressure.pressure, 'pressure')} (dew point "
            f"{fq(pressure.temperature, 'temperature')}); below that pressure vapour leaves uncondensed.")
    if p_today is not None:
        said += f" Today it condenses at {fq(p_today, 'pressure')}."
    if holds is None:
        return said + " The unit file gives no allowed condensing pressure or temperature to judge it against."
    if case.allowed_pressure is not None:
        limit = f"the allowed {fq(case.allowed_pressure, 'pressure')}"
    else:
        limit = f"the allowed dew point {fq(case.allowed_temperature, 'temperature')}"
    if holds:
        return said + f" That is within {limit}: the column can keep its pressure at this load."
    return said + (f" That is above {limit}: at this load the column pressure would have to rise beyond what is "
                   "allowed, unless the condenser is improved (see the options).")


def _holds(case, pressure):
    if pressure is None:
        return None
    if case.allowed_pressure is not None:
        return bool(pressure.pressure <= case.allowed_pressure)
    if case.allowed_temperature is not None:
        return bool(pressure.temperature <= case.allowed_temperature)
    return None


def run_condenser_case(case, *, increments: int | None = None) -> CondenserStudy:
    """Rate, question and compare one condenser of a unit file (a :class:`~revamp.unitfile.CondenserCase`).

    Parameters
    ----------
    case : CondenserCase
    increments : int, optional
        Increments per zone of the ratings (default: the engine's,
        :data:`revamp.rating_condenser.INCREMENTS`); the pressure search and the options use the same.
    """
    from ..options_condenser import compare_condenser
    from ..rating_condenser import condensing_pressure_for, rate_condenser

    if getattr(case, "kind", None) != "condenser":
        raise InputError("case", type(case).__name__, "a condenser case of a unit file (kind: condenser)")
    kw = {} if increments is None else {"increments": int(increments)}
    ex, today = case.exchanger, case.service
    ratings = {"today": rate_condenser(ex, today, **kw), "today (clean)": rate_condenser(ex, _clean(today), **kw)}
    svc = today
    if case.revamp_service is not None:
        svc = case.revamp_service
        ratings["revamp"] = rate_condenser(ex, svc, **kw)
        ratings["revamp (clean)"] = rate_condenser(ex, _clean(svc), **kw)
    load = float(case.vapour_load if case.vapour_load is not None else getattr(today, case.condensing_side).flow)
    notes = [Note("study", "duty", "info", "Rated zone by zone along the condensing curve (desuperheating, "
                  "condensing, subcooling), each increment with its own U and temperature difference (Bell & Ghaly "
                  "1973).")]
    pressure, perr, pexc = None, "", None
    try:
        pressure = condensing_pressure_for(ex, svc, load, **kw)
    except InputError as exc:
        perr, pexc = str(exc), exc
        notes.append(Note("study", "condensing_pressure", "warning", f"No condensing pressure found: {perr}"))
    holds = _holds(case, pressure)
    answer = _answer(case, pressure, load, holds) if pressure is not None else (
        f"The condensing pressure at the vapour load could not be found: {perr}")
    if pressure is not None:
        notes.append(Note("study", "condensing_pressure", "info", "The lowest condensing pressure at which the "
                          "whole load condenses: the stream moved to each pressure with its inlet quality (or "
                          "superheat) held, Brent's search on log p (Brent 1973). " + pressure.basis + "."))
    options, oerr = None, ""
    if case.options:
        try:
            # the base row's pressure is the one just found (or its failure): the search runs once per study
            options = compare_condenser(ex, svc, case.options, vapour_load=load,
                                        base_pressure=pressure if pressure is not None else pexc, **kw)
        except InputError as exc:
            oerr = str(exc)
            notes.append(Note("study", "options", "error", f"The options could not be compared: {oerr}"))
    monitoring, merr = None, ""
    if case.plant_data is not None:
        from ..monitoring_condenser import monitor_condenser_data

        try:
            monitoring = monitor_condenser_data(ex, today, case.plant_data.file,
                                                **case.plant_data.monitor_options())
        except Exception as exc:  # plant data is evidence, not a precondition: the study goes on without it
            merr = f"{exc.__class__.__name__}: {exc}"
            notes.append(Note("plant data", "fouling", "error", f"No plant-data analysis: {merr}"))
        else:
            notes += [Note("plant data", "fouling", "info", n) for n in monitoring.notes]
    keys = set()
    for label, r in ratings.items():  # each warning once: the same complaint at another number is not repeated
        for w in r.warnings:
            key = re.sub(r"\d[\d.eE+-]*", "#", w)
            if key not in keys:
                keys.add(key)
                notes.append(Note(label, "duty", "info" if w.startswith("screening-level") else "warning", w))
    return CondenserStudy(case=case, ratings=ratings, vapour_load=load, pressure=pressure, pressure_error=perr,
                          holds=holds, answer=answer, options=options, options_error=oerr, monitoring=monitoring,
                          monitoring_error=merr, notes=tuple(notes))


def condenser_unit_ratings(case):
    """``(today, revamp or None)``: the condenser rated at today's service and at the revamp vapour load."""
    from ..rating_condenser import rate_condenser

    today = rate_condenser(case.exchanger, case.service)
    rev = rate_condenser(case.exchanger, case.revamp_service) if case.revamp_service is not None else None
    return today, rev
