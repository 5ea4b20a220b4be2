"""Plant data: what the exchanger really does today.

:func:`monitor` turns historian data (flows and temperatures of both sides) into the measured U, the fouling
resistance with its uncertainty band, the fouling trend, a projection and the optimal cleaning interval. The steps live
in their own modules: :mod:`.data` (reading, units, per-row flags), :mod:`.steady` (steady-state filter),
:mod:`.reconcile` (heat balance, weighted least squares), :mod:`.cleaning` (Epstein cleaning interval) and
:mod:`.core` (the orchestration). Fouling growth models live in :mod:`revamp.fouling.models`.
"""
from .cleaning import CleaningInterval, linear_closed_form, optimal_cleaning_interval
from .core import DEFAULT_UNCERTAINTY, Monitoring, monitor
from .data import COLUMNS, PlantData, read_plant_data
from .reconcile import HeatBalance, reconcile_heat_balance, reconcile_linear
from .steady import steady_state

__all__ = ["monitor", "Monitoring", "DEFAULT_UNCERTAINTY", "read_plant_data", "PlantData", "COLUMNS",
           "steady_state", "reconcile_linear", "reconcile_heat_balance", "HeatBalance",
           "optimal_cleaning_interval", "linear_closed_form", "CleaningInterval"]
