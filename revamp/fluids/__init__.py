"""Layer 1, fluid properties: every fluid has ``name``, ``t_min``, ``t_max`` [K], ``props(T) -> Props`` and
``check(T) -> list[str]`` (see docs/architecture.md).

Providers: :func:`water`, :func:`pure` (CoolProp, cached tables), :func:`petroleum` (API gravity, Watson K and
two viscosities), :func:`table` (data-sheet points), :func:`constant`.
"""
from .base import Fluid, Props
from .coolprop_liquid import CoolPropLiquid, pure, water
from .petroleum import PetroleumFluid, petroleum
from .table import ConstantFluid, TableFluid, constant, table

__all__ = [
           "ConstantFluid",
           "CoolPropLiquid",
           "Fluid",
           "PetroleumFluid",
           "Props",
           "TableFluid",
           "constant",
           "petroleum",
           "pure",
           "table",
           "water",
]
