"""Plant data: what the exchanger really does today.

:func:`monitor` turns historian data (flows and temperatures of both sides) into the measured U, the fouling
resistance with its uncertainty band, the fouling trend, a projection and the optimal cleaning interval. The steps live
in their own modules: :mod:`.data` (reading the plant's CSV dialect, units, per-row flags), :mod:`.steady`
(steady-state filter and what each setting removed), :mod:`.reconcile` (heat balance, weighted least squares, the
drift of the closure over time), :mod:`.cleaning` (Epstein cleaning interval, runs between cleanings),
:mod:`.engine` (the vectorized calls) and :mod:`.core` (the orchestration). Fouling growth models live in
:mod:`revamp.fouling.models`.
"""
from .cleaning import CleaningInterval, Cycle, find_cleanings, linear_closed_form, optimal_cleaning_interval
from .core import DEFAULT_UNCERTAINTY, Horizon, Monitoring, monitor
from .data import COLUMNS, CsvDialect, DialectUsed, PlantData, read_plant_data
from .reconcile import BalanceDrift, HeatBalance, balance_drift, reconcile_heat_balance, reconcile_linear
from .steady import SteadyFilter, steady_filter, steady_state

__all__ = [
           "COLUMNS",
           "DEFAULT_UNCERTAINTY",
           "BalanceDrift",
           "CleaningInterval",
           "CsvDialect",
           "Cycle",
           "DialectUsed",
           "HeatBalance",
           "Horizon",
           "Monitoring",
           "PlantData",
           "SteadyFilter",
           "balance_drift",
           "find_cleanings",
           "linear_closed_form",
           "monitor",
           "optimal_cleaning_interval",
           "read_plant_data",
           "reconcile_heat_balance",
           "reconcile_linear",
           "steady_filter",
           "steady_state",
]
