"""Fouling growth laws for planning: how a deposit grows over one period, from any state, after a cleaning.

The plant-data fits (:mod:`revamp.fouling.models`) describe one run from a cleaning; a cleaning schedule needs more:
the deposit must grow on from today's value, restart from clean (or a stated residual) after a cleaning, and, for the
crude-oil threshold law, grow at a rate set by the flow conditions the train gives in each period. Each law here is a
small frozen object with

- ``rf_now`` [m²K/W]: the resistance at the start of the plan;
- ``residual`` [m²K/W]: what a cleaning leaves;
- ``step(rf, dt, conditions=None) -> rf`` [m²K/W]: the resistance one step ``dt`` [s] later (numpy broadcasting);
- ``recursion(dt, conditions=None) -> (a, c)``: the same step written as ``rf_next = a·rf + c`` (exact for the
  linear and asymptotic laws, exact for the threshold law at fixed conditions), which the schedule optimiser uses.

Laws
----
``Linear(rate)``: dRf/dt = rate.
``Asymptotic(rf_inf, time_constant)``: Kern & Seaton (1959), Rf → residual + rf_inf with time constant τ; in
    one step of length Δt, Rf' = a·Rf + (1 − a)·(residual + rf_inf) with a = exp(−Δt/τ), exact.
``Threshold(alpha_ref, E, gamma, ...)``: Ebert & Panchal (1995), dRf/dt = α·Re^β·Pr^−0.33·exp(−E/(R·T_film)) − γ·τ_w,
    with the tube-side Re, Pr, film temperature and wall shear of the period; a net rate below zero (removal beats
    deposition) leaves a clean surface clean and never takes Rf below the residual.

:func:`growth_law` turns what a user gives (a law, or a :class:`~revamp.fouling.models.FoulingFit` from the plant
data) into a law, the fit's current Rf (at its last run time) becoming ``rf_now``.

References
----------
Kern, D. Q., Seaton, R. E. (1959). A theoretical analysis of thermal surface fouling. Brit. Chem. Eng. 4, 258-262.
Ebert, W., Panchal, C. B. (1995). Analysis of Exxon crude-oil-slip-stream coking data. Fouling Mitigation of
    Industrial Heat-Exchange Equipment, Begell House, 451-460 (pages from memory).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..units import require, to_si
from .models import FoulingFit, threshold_rate

__all__ = ["Linear", "Asymptotic", "Threshold", "growth_law", "CONDITION_NAMES"]

#: The flow conditions a threshold law needs, in the order the train gives them.
CONDITION_NAMES = ("Re", "Pr", "T_film", "shear")


def _fouling(value, field, allow_zero=True):
    v = float(to_si(value, "fouling", field))
    return require(v, field, ge=0) if allow_zero else require(v, field, gt=0)


@dataclass(frozen=True)
class Linear:
    """Constant deposition rate: Rf(t) = Rf(0) + rate·t.

    Parameters
    ----------
    rate : float or str
        dRf/dt [m²K/W/s], e.g. ``"2e-11 m**2*K/W/s"``.
    rf_now : float or str
        Resistance at the start of the plan [m²K/W] (default 0: starts clean).
    residual : float or str
        Resistance a cleaning leaves [m²K/W] (default 0).

    Examples
    --------
    >>> law = Linear(rate=1e-10)
    >>> float(law.step(2e-4, 86400.0))  # 2e-4 + 1e-10 · 86400
    0.00020864
    """

    rate: float
    rf_now: float = 0.0
    residual: float = 0.0
    needs_conditions = False

    def __post_init__(self):
        rate = float(to_si(self.rate, "fouling_rate", "fouling.rate"))
        object.__setattr__(self, "rate", require(rate, "fouling.rate", ge=0))
        object.__setattr__(self, "rf_now", _fouling(self.rf_now, "fouling.rf_now"))
        object.__setattr__(self, "residual", _fouling(self.residual, "fouling.residual"))

    def recursion(self, dt, conditions=None):
        """``(a, c)`` with Rf' = a·Rf + c over a step ``dt`` [s]."""
        return np.ones_like(np.asarray(dt, dtype=float)), self.rate * np.asarray(dt, dtype=float)

    def step(self, rf, dt, conditions=None):
        a, c = self.recursion(dt, conditions)
        return a * np.asarray(rf, dtype=float) + c

    def describe(self) -> str:
        return f"linear, {self.rate * 86400 * 1e4:.3g}·10⁻⁴ m²K/W per day"


@dataclass(frozen=True)
class Asymptotic:
    """Kern-Seaton asymptotic growth towards ``residual + rf_inf`` with time constant ``time_constant``.

    Parameters
    ----------
    rf_inf : float or str
        Asymptotic deposit above the residual [m²K/W].
    time_constant : float or str
        τ [s] (strings such as ``"120 day"``).
    rf_now, residual : float or str
        As for :class:`Linear` [m²K/W].

    Examples
    --------
    One time constant from clean reaches 1 − 1/e of the asymptote (Kern & Seaton 1959):

    >>> law = Asymptotic(rf_inf=5e-4, time_constant=100.0)
    >>> round(float(law.step(0.0, 100.0)) / 5e-4, 6)
    0.632121
    """

    rf_inf: float
    time_constant: float
    rf_now: float = 0.0
    residual: float = 0.0
    needs_conditions = False

    def __post_init__(self):
        object.__setattr__(self, "rf_inf", _fouling(self.rf_inf, "fouling.rf_inf"))
        tau = float(to_si(self.time_constant, "time", "fouling.time_constant"))
        object.__setattr__(self, "time_constant", require(tau, "fouling.time_constant", gt=0))
        object.__setattr__(self, "rf_now", _fouling(self.rf_now, "fouling.rf_now"))
        object.__setattr__(self, "residual", _fouling(self.residual, "fouling.residual"))

    def recursion(self, dt, conditions=None):
        a = np.exp(-np.asarray(dt, dtype=float) / self.time_constant)
        return a, (1.0 - a) * (self.residual + self.rf_inf)

    def step(self, rf, dt, conditions=None):
        a, c = self.recursion(dt, conditions)
        return a * np.asarray(rf, dtype=float) + c

    def describe(self) -> str:
        return (f"asymptotic, Rf∞ {self.rf_inf * 1e4:.3g}·10⁻⁴ m²K/W, τ {self.time_constant / 86400:.3g} days")


@dataclass(frozen=True)
class Threshold:
    """Ebert-Panchal threshold growth with the flow conditions of each period (tube side).

    Parameters
    ----------
    alpha_ref : float
        Deposition coefficient at the reference film temperature ``T_ref`` [m²K/W/s].
    E : float
        Activation energy [J/mol].
    gamma : float
        Removal coefficient [m²K/W/s/Pa].
    beta : float
        Reynolds-number exponent [-] (−0.66 in Ebert & Panchal 1995).
    T_ref : float
        Reference film temperature of ``alpha_ref`` [K].
    rf_now, residual : float
        As for :class:`Linear` [m²K/W].

    Notes
    -----
    ``conditions`` is a mapping with arrays ``Re``, ``Pr``, ``T_film`` [K] and ``shear`` [Pa] (the tube side of the
    exchanger in that period); the rate is held over the step.
    """

    alpha_ref: float
    E: float
    gamma: float
    beta: float = -0.66
    T_ref: float = 500.0
    rf_now: float = 0.0
    residual: float = 0.0
    needs_conditions = True

    def rate_at(self, conditions):
        """Net fouling rate [m²K/W/s] at the given conditions (may be negative)."""
        if conditions is None:
            raise InputError("fouling.conditions", None, "the tube-side Re, Pr, T_film and shear of the period")
        c = conditions
        return threshold_rate(c["Re"], c["Pr"], c["T_film"], c["shear"], self.alpha_ref, self.E, self.gamma,
                              self.beta, self.T_ref)

    def recursion(self, dt, conditions=None):
        rate = np.asarray(self.rate_at(conditions), dtype=float)
        return np.ones_like(rate), rate * np.asarray(dt, dtype=float)

    def step(self, rf, dt, conditions=None):
        a, c = self.recursion(dt, conditions)
        return np.maximum(a * np.asarray(rf, dtype=float) + c, self.residual)

    def describe(self) -> str:
        return f"threshold (Ebert-Panchal), E {self.E / 1000:.3g} kJ/mol"


_LAWS = (Linear, Asymptotic, Threshold)


def growth_law(value, field: str = "fouling", residual: float = 0.0):
    """A planning growth law from a law or a plant-data fit.

    Parameters
    ----------
    value : Linear, Asymptotic, Threshold or FoulingFit
        A fit continues from its value at its last run time (``rf_now = fit(fit.t_end)``, never below 0).
    field : str
        Path named in errors.
    residual : float
        Resistance a cleaning leaves, for a fit [m²K/W].
    """
    if isinstance(value, _LAWS):
        return value
    if isinstance(value, FoulingFit):
        p = value.params
        now = max(float(value(value.t_end)), 0.0)
        if value.model == "linear":
            return Linear(rate=max(float(p["b"]), 0.0), rf_now=now, residual=residual)
        if value.model == "asymptotic":
            return Asymptotic(rf_inf=max(float(p["Rf_inf"]), 0.0), time_constant=float(p["tau"]), rf_now=now,
                              residual=residual)
        if value.model == "threshold":
            c = value.conditions
            return Threshold(alpha_ref=float(p["alpha_ref"]), E=float(p["E"]), gamma=float(p["gamma"]),
                             beta=float(c["beta"]), T_ref=float(c["T_ref"]), rf_now=now, residual=residual)
    raise InputError(field, type(value).__name__,
                     "a growth law (revamp.fouling.Linear, Asymptotic, Threshold) or a fit from monitor()")
