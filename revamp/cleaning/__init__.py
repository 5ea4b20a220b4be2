"""Cleaning schedules for a train of fouling exchangers (:func:`schedule_cleaning`).

Layer 6 (studies): built on :class:`revamp.Train` (which rates every exchanger) and the growth laws of
:mod:`revamp.fouling.growth`; nothing below it knows a schedule exists.
"""
from .calendar import Calendar, make_calendar
from .montecarlo import PlanMonteCarlo, plan_monte_carlo
from .schedule import POLICIES, CleaningPlan, Optimality, schedule_cleaning, train_evaluator

__all__ = ["schedule_cleaning", "CleaningPlan", "Optimality", "Calendar", "make_calendar", "POLICIES",
           "train_evaluator", "plan_monte_carlo", "PlanMonteCarlo"]
