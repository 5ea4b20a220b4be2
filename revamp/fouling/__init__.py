"""Fouling: TEMA design fouling resistances (``tables``) and growth models fitted to plant data (``models``)."""
from .tables import FoulingLookup, design_fouling, fouling_table, services

__all__ = ["FoulingLookup", "design_fouling", "fouling_table", "services"]
