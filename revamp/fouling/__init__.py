"""Fouling: TEMA design fouling resistances (``tables``) and growth models fitted to plant data (``models``)."""
from .models import MODELS as GROWTH_MODELS
from .models import FoulingFit, film_temperature, fit_asymptotic, fit_best, fit_linear, fit_threshold, threshold_rate
from .tables import FoulingLookup, design_fouling, fouling_table, services

__all__ = ["FoulingLookup", "design_fouling", "fouling_table", "services", "FoulingFit", "fit_linear",
           "fit_asymptotic", "fit_threshold", "fit_best", "film_temperature", "threshold_rate", "GROWTH_MODELS"]
