"""Layer 1, fluid properties: every fluid has ``name``, ``t_min``, ``t_max`` [K], ``props(T) -> Props`` and
``check(T) -> list[str]`` (see docs/architecture.md).

Providers: :func:`water`, :func:`pure` (CoolProp, cached tables), :func:`petroleum` (API gravity, Watson K and
two viscosities), :func:`table` (data-sheet points), :func:`constant`. Condensing streams: :func:`condensing` (a
pure fluid's saturation), :func:`condensing_curve` (a user's curve or a CoolProp mixture), both giving a
:class:`CondensingFluid`.
"""
from .base import Fluid, Props
from .condensing import CondensingFluid, SaturationProps, condensing, condensing_curve
from .coolprop_liquid import CoolPropLiquid, pure, water
from .petroleum import PetroleumFluid, petroleum
from .table import ConstantFluid, TableFluid, constant, table

__all__ = [
           "CondensingFluid",
           "ConstantFluid",
           "CoolPropLiquid",
           "Fluid",
           "PetroleumFluid",
           "Props",
           "SaturationProps",
           "TableFluid",
           "condensing",
           "condensing_curve",
           "constant",
           "petroleum",
           "pure",
           "table",
           "water",
]
