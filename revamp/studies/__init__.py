"""Studies: the orchestration above the rating, plant-data, options, screening and money modules.

A study computes everything a decision needs and returns it as a frozen, typed result; the presentation layer
(``revamp.report``) only formats it. :func:`study_exchanger` studies one exchanger (its inlets may come from the
caller, e.g. a train solve).
"""
from .exchanger import (
    DEFAULT_RUN_LENGTH,
    SEVERITIES,
    CycleSettings,
    ExchangerStudy,
    Note,
    Setting,
    cycle_settings,
    fouling_side,
    rating_notes,
    study_exchanger,
    warning_quantity,
)

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
    "warning_quantity",
]
