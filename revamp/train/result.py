"""Typed results of a train solve: :class:`TrainResult` and its limit checks (:class:`LimitCheck`)."""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

__all__ = ["LimitCheck", "TrainResult"]


@dataclass(frozen=True)
class LimitCheck:
    """One limit of the train checked in every case.

    Attributes
    ----------
    name : str
        What is limited ("furnace duty", "E-101 dp_tube", "desalter temperature", "crude pressure drop").
    quantity : str
        Its kind ("power", "dp", "temperature") for display.
    value : float or ndarray
        The solved value [SI].
    low, high : float, ndarray or None
        The allowed band [SI] (an array of the case shape where it depends on the case, e.g. a pump's pressure).
    ok : bool or ndarray
        Whether the value is within the band (False for a failed case).
    """

    name: str
    quantity: str
    value: object
    low: float | None
    high: float | None
    ok: object

    @classmethod
    def of(cls, name, quantity, value, low=None, high=None, shape=()):
        v = np.asarray(value, float)
        ok = np.isfinite(v)
        bounds = []
        for b in (low, high):
            if b is not None and np.ndim(b):  # a bound per case (NaN: unknown there, so the check fails)
                b = np.broadcast_to(np.asarray(b, float), v.shape)
                ok &= np.isfinite(b)
                b = float(b.reshape(shape)) if shape == () else b.reshape(shape)
            bounds.append(b)
        if low is not None:
            ok &= v >= np.asarray(low, float).reshape(v.shape) if np.ndim(low) else v >= low
        if high is not None:
            ok &= v <= np.asarray(high, float).reshape(v.shape) if np.ndim(high) else v <= high
        v, ok = v.reshape(shape), ok.reshape(shape)
        if shape == ():
            v, ok = float(v), bool(ok)
        return cls(name, quantity, v, bounds[0], bounds[1], ok)

    def margin(self):
        """The smallest relative distance to the band [-] (negative when outside)."""
        v = np.asarray(self.value, float)
        m = np.full(v.shape, np.inf)
        if self.high is not None:
            m = np.minimum(m, (self.high - v) / abs(self.high))
        if self.low is not None:
            m = np.minimum(m, (v - self.low) / abs(self.low))
        return float(m) if m.ndim == 0 else m


@dataclass(frozen=True)
class TrainResult:
    """The solved train. SI units; arrays of the train's case shape for sweeps.

    Attributes
    ----------
    exchangers : DataFrame
        One row per exchanger (index ``tag``; a ``(tag, case)`` MultiIndex for sweeps): streams, ``duty`` [W],
        ``t_in_shell``, ``t_out_shell``, ``t_in_tube``, ``t_out_tube`` [K], flows [kg/s], ``effectiveness``,
        ``U_clean``, ``U_service`` [W/m²K], fouling [m²K/W], ``dp_shell``, ``dp_tube`` and their allowed values [Pa],
        velocities [m/s]. An air cooler's row (``kind`` "air cooler", empty ``shell_stream``) has its air instead of
        a shell side: ``t_in_air``, ``t_out_air`` [K], ``flow_air`` [kg/s], ``fouling_air`` [m²K/W], ``dp_air`` [Pa],
        ``velocity_face`` [m/s], ``fan_power`` [W] (columns present only when the train has an air cooler; NaN in the
        other rows, as the shell columns are in its own).
    streams : DataFrame
        One row per stream: ``supply`` and ``final`` temperatures [K], ``flow`` [kg/s], ``duty`` (heat taken up
        over its exchangers, negative for a hot stream) [W], ``dp`` over its route (largest branch of a split) and
        ``dp_max`` [Pa], ``rundown`` limit [K] and the ``trim_duty`` [W] a trim cooler takes above it; with a pump
        curve, ``pump_dp``: what the pump leaves for the route at the stream's flow (its differential pressure less
        the curve's allowance) [Pa], checked as the limit ``"<stream> pump"``. An air
        cooler's duty leaves the streams to the air: with one, the streams' duties sum to minus its duty.
    points : DataFrame
        Named points: stream, ``temperature`` and the band ``t_min``, ``t_max`` [K].
    limits : tuple of LimitCheck
        Every limit of the train and whether it holds.
    ratings : dict of str -> Rating
        Each exchanger's rating at its solved inlets (an :class:`~revamp.rating_air.AirRating` for an air cooler).
    furnace_inlet : float or ndarray
        Temperature of the furnace's stream leaving its last exchanger [K] (None without a furnace).
    furnace_absorbed, furnace_duty : float or ndarray
        Absorbed and fired duty of the furnace [W] (fired = absorbed / efficiency).
    converged : bool or ndarray
        Cases that converged (False also for failed cases, whose results are NaN).
    iterations : int
    residual : float or ndarray
        Largest inlet change in the last iteration [K].
    final_temperatures : dict of str -> float or ndarray
        Each stream's temperature at the end of its route [K].
    violated : tuple of str
        Names of the limits that fail in at least one case.
    warnings : tuple of str
    """

    train: object = field(repr=False)
    shape: tuple
    exchangers: pd.DataFrame
    streams: pd.DataFrame
    points: pd.DataFrame
    limits: tuple
    ratings: dict = field(repr=False)
    furnace_inlet: object = None
    furnace_absorbed: object = None
    furnace_duty: object = None
    converged: object = True
    iterations: int = 0
    residual: object = 0.0
    final_temperatures: dict = field(default_factory=dict)
    violated: tuple = ()
    warnings: tuple = ()

    def limits_frame(self) -> pd.DataFrame:
        """The limits as a table (one case): value, low, high, ok, margin."""
        if self.shape != ():
            ok = {c.name: bool(np.all(c.ok)) for c in self.limits}
            return pd.DataFrame({"ok in every case": ok}).rename_axis("limit")
        return pd.DataFrame({c.name: {"quantity": c.quantity, "value": c.value, "low": c.low, "high": c.high,
                                      "ok": c.ok, "margin": c.margin()} for c in self.limits}).T.rename_axis("limit")

    @property
    def all_ok(self):
        """Whether every limit holds (per case for sweeps)."""
        ok = np.ones(self.shape, dtype=bool)
        for c in self.limits:
            ok &= np.asarray(c.ok, bool)
        ok &= np.asarray(self.converged, bool)
        return bool(ok) if self.shape == () else ok
