"""Retrofit options for air coolers: ``apply(air_cooler, air_service) -> (air_cooler, air_service)`` (layer 6).

The same small immutable transforms as :mod:`revamp.options`, for the air cooler's own parts: a bay or a bundle in
parallel, a new bundle with more tube rows, a fan upgrade, fin (air-side) cleaning. Tube inserts are the existing
:class:`revamp.options.TwistedTape` and :class:`revamp.options.WireCoil`, which apply to an air cooler unchanged.
:func:`compare_air` rates the base case and each option side by side.

>>> FanUpgrade(speed_ratio=1.15).label
'fan upgrade: speed x1.15 (air flow x1.15, fan laws)'

References
----------
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell, ch. 8 (fans, fan laws).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from .aircooler import AirCooler
from .correlations.air import fan_laws
from .errors import InputError
from .options import TwistedTape, WireCoil, option_label
from .service_air import AirService
from .units import require, to_si

__all__ = ["AddBays", "AddBundles", "CleanFins", "FanUpgrade", "MoreRows", "TwistedTape", "WireCoil", "compare_air"]


def _set_label(obj, text):
    if obj.label is None:
        object.__setattr__(obj, "label", text)
    elif not isinstance(obj.label, str) or not obj.label.strip():
        raise InputError("label", obj.label, "a non-empty string or None")


def _whole(value, name):
    if isinstance(value, bool) or not isinstance(value, int) or value < 1:
        raise InputError(name, value, "a whole number >= 1")
    return value


def _check(exchanger, service):
    if not isinstance(exchanger, AirCooler):
        raise InputError("exchanger", exchanger, "a revamp.AirCooler")
    if not isinstance(service, AirService):
        raise InputError("service", service, "a revamp.AirService")


@dataclass(frozen=True)
class AddBays:
    """Add ``n`` bays in parallel, each with its bundles and fans as the existing ones.

    The new fans move as much air per bay as the old ones: a service given as an air mass flow has its flow scaled
    by the number of bays (a face velocity stays as it is).
    """

    n: int = 1
    label: str | None = None

    def __post_init__(self):
        _whole(self.n, "AddBays.n")
        _set_label(self, f"add {self.n} bay{'s' if self.n > 1 else ''} in parallel (with fans)")

    def apply(self, exchanger, service):
        _check(exchanger, service)
        bays = exchanger.bays + self.n
        if service.air_flow is not None:
            service = service.replace(air_flow=np.multiply(service.air_flow, bays / exchanger.bays))
        return exchanger.replace(bays=bays), service


@dataclass(frozen=True)
class AddBundles:
    """Add ``n`` bundles in each bay, beside the existing ones, with the existing fans.

    The fans are assumed to move the same air mass flow through the wider face (a fan on a lower-resistance system
    would move somewhat more: not modelled, conservative for duty). A face-velocity service keeps its velocity.
    """

    n: int = 1
    label: str | None = None

    def __post_init__(self):
        _whole(self.n, "AddBundles.n")
        _set_label(self, f"add {self.n} bundle{'s' if self.n > 1 else ''} per bay (same fans)")

    def apply(self, exchanger, service):
        _check(exchanger, service)
        return exchanger.replace(bundles_per_bay=exchanger.bundles_per_bay + self.n), service


@dataclass(frozen=True)
class MoreRows:
    """New bundles with more tube rows (same tubes per row, pitches, fins), the same fans and air mass flow.

    The deeper bundle has more area and a higher air pressure drop: the fan power in the rating shows what that
    costs at the same air flow (check the fan and motor can deliver it).

    Parameters
    ----------
    tube_rows : int
        Rows of the new bundles, more than today.
    tube_passes : int, optional
        Passes of the new bundles (default: today's, when it divides the new rows).
    """

    tube_rows: int
    tube_passes: int | None = None
    label: str | None = None

    def __post_init__(self):
        _whole(self.tube_rows, "MoreRows.tube_rows")
        if self.tube_passes is not None:
            _whole(self.tube_passes, "MoreRows.tube_passes")
        _set_label(self, f"new bundles with {self.tube_rows} tube rows")

    def apply(self, exchanger, service):
        _check(exchanger, service)
        if self.tube_rows <= exchanger.tube_rows:
            raise InputError("MoreRows.tube_rows", self.tube_rows, f"more than today's {exchanger.tube_rows} rows")
        passes = exchanger.tube_passes if self.tube_passes is None else self.tube_passes
        return exchanger.replace(tube_rows=self.tube_rows, tube_passes=passes), service


@dataclass(frozen=True)
class FanUpgrade:
    """Run the fans faster (new speed, new pitch or new motor): the air flow scales with the speed (fan law
    Q2/Q1 = N2/N1); the rating computes the new bundle pressure drop and the fan power.

    Give ``speed_ratio`` (N2/N1) or ``air_flow_ratio`` (the new air flow over today's; a pitch change is described
    by the flow it gives). The fan-law power ratio (N2/N1)³ is in :attr:`power_ratio` as a cross-check of the
    rating's power.
    """

    speed_ratio: object = None
    air_flow_ratio: object = None
    label: str | None = None

    def __post_init__(self):
        if (self.speed_ratio is None) == (self.air_flow_ratio is None):
            raise InputError("FanUpgrade.speed_ratio", self.speed_ratio, "given, or air_flow_ratio instead (one)")
        name = "speed_ratio" if self.speed_ratio is not None else "air_flow_ratio"
        value = to_si(getattr(self, name), "dimensionless", f"FanUpgrade.{name}")
        if np.ndim(value) != 0:
            raise InputError(f"FanUpgrade.{name}", getattr(self, name), "one ratio (not an array)")
        object.__setattr__(self, name, float(require(value, f"FanUpgrade.{name}", gt=0, le=2.0, what="a ratio")))
        if self.speed_ratio is not None:
            text = f"fan upgrade: speed x{self.speed_ratio:g} (air flow x{self.speed_ratio:g}, fan laws)"
        else:
            text = f"fan upgrade: air flow x{self.air_flow_ratio:g}"
        _set_label(self, text)

    @property
    def flow_ratio(self) -> float:
        """New air flow over today's [-]."""
        return fan_laws(self.speed_ratio)[0] if self.speed_ratio is not None else self.air_flow_ratio

    @property
    def power_ratio(self) -> float:
        """Fan-law power ratio at the same air density [-] ((N2/N1)³)."""
        return fan_laws(self.flow_ratio)[2]

    def apply(self, exchanger, service):
        _check(exchanger, service)
        r = self.flow_ratio
        if service.air_flow is not None:
            return exchanger, service.replace(air_flow=np.multiply(service.air_flow, r))
        return exchanger, service.replace(face_velocity=np.multiply(service.face_velocity, r))


@dataclass(frozen=True)
class CleanFins:
    """Clean the fins (air side) and optionally the tubes, to no fouling or a stated residual [m²K/W]."""

    side: str = "air"
    residual: object = 0.0
    label: str | None = None

    def __post_init__(self):
        if self.side not in ("air", "tube", "both"):
            raise InputError("CleanFins.side", self.side, "'air', 'tube' or 'both'")
        r = to_si(self.residual, "fouling", "CleanFins.residual")
        if np.ndim(r) != 0:
            raise InputError("CleanFins.residual", self.residual, "one fouling resistance (m²K/W)")
        object.__setattr__(self, "residual", float(require(r, "CleanFins.residual", ge=0)))
        what = {"air": "clean fins", "tube": "clean tubes", "both": "clean fins and tubes"}[self.side]
        _set_label(self, what + (f" to {self.residual:.3g} m²K/W" if self.residual else ""))

    def apply(self, exchanger, service):
        _check(exchanger, service)
        return exchanger, service.clean(self.side, self.residual)


def compare_air(exchanger, service, options=(), **rating_kw) -> pd.DataFrame:
    """Rate the base case and each option; one row each (SI): duty, outlets, U, pressure drops, fan power.

    Parameters
    ----------
    exchanger : AirCooler
    service : AirService
        A single case (no arrays).
    options : sequence of options
        Options of this module or :mod:`revamp.options` inserts; labels unique.
    **rating_kw
        Passed to :func:`revamp.rating_air.rate_air_cooler` (methods).

    Returns
    -------
    pandas.DataFrame
        Indexed by label (``"base"`` first), with ``duty``, ``t_out_tube``, ``t_out_air``, ``U_service``,
        ``dp_air``, ``dp_tube``, ``fan_power``, ``air_flow``, ``area``, ``velocity_tube`` and ``warnings`` (count).
    """
    from .rating_air import rate_air_cooler

    _check(exchanger, service)
    labels = [option_label(o) for o in options]
    if len(set(labels)) != len(labels) or "base" in labels:
        raise InputError("options", labels, "options with unique labels, none called 'base'")
    cols = ("duty", "t_out_tube", "t_out_air", "U_service", "dp_air", "dp_tube", "fan_power", "air_flow",
            "velocity_tube")
    rows = {}
    for label, option in [("base", None)] + list(zip(labels, options)):
        ac, svc = (exchanger, service) if option is None else option.apply(exchanger, service)
        r = rate_air_cooler(ac, svc, **rating_kw)
        if r.shape != ():
            raise InputError("service", "an array service", "a single case for compare_air()")
        row = {c: float(getattr(r, c)) for c in cols}
        row["area"] = r.area
        row["warnings"] = len(r.warnings)
        rows[label] = row
    return pd.DataFrame.from_dict(rows, orient="index")
