"""Money: the value of recovered duty or of capacity, simple payback, NPV, and the cycle-averaged duty over a run.

No prices are built in: every price and cost comes from the user. Currency is whatever the user's numbers are in.

References
----------
Brealey, R. A., Myers, S. C., & Allen, F. (2020). *Principles of Corporate Finance*, 13th ed., ch. 2-3 (present
value, annuities).
Epstein, N. (1979). Optimum evaporator cycles with scale formation. *Can. J. Chem. Eng.* 57, 659-661 (averaging the
performance over a run including the cleaning downtime).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .errors import InputError
from .units import require, to_si, ureg

__all__ = [
    "ENERGY_BASES",
    "VALUE_BASES",
    "CycleAverage",
    "Economics",
    "annual_capacity_value",
    "annual_duty_value",
    "annual_fired_value",
    "annuity_factor",
    "cycle_average",
    "npv",
    "price_per_joule",
    "project_npv",
    "simple_payback",
]

_YEAR_H = 8766.0  # hours in a mean (Julian) year

#: energy units a price may be given per
ENERGY_BASES = ("J", "kJ", "MJ", "GJ", "kWh", "MWh", "BTU", "MMBTU", "therm")

#: What an exchanger's extra duty is worth, by service (each a sentence the report shows beside the money). The
#: split by service is common practice in revamp work, no source: recovered heat in a preheat train replaces fired
#: fuel; a cooler's extra duty saves nothing and costs cooling utility, and is worth money only when it lifts a
#: rundown-temperature or throughput limit; a condenser's duty is worth the column throughput it allows.
VALUE_BASES = {
    "fuel": "fired fuel saved: extra recovered duty × operating time × fuel price / heater efficiency (preheat "
            "service)",
    "cooling": "cooler: the extra duty costs cooling utility (cooling water or fan power, at the utility price per "
               "energy removed) and earns the throughput value only when it lifts the rundown or throughput limit",
    "throughput": "rundown/throughput value only: the capacity value when the option lifts the limit the "
                  "exchanger sets, nothing for the duty itself",
    "column": "condenser: the column throughput value when the option lifts the column limit the condenser "
              "sets, nothing for the duty itself",
}


def price_per_joule(price, per="GJ") -> float:
    """An energy price converted to currency per joule.

    Parameters
    ----------
    price : float
        Price in currency per ``per`` [currency/unit of energy].
    per : str
        The energy unit of the price, one of :data:`ENERGY_BASES` (BTU is the International Table BTU).

    Examples
    --------
    >>> round(price_per_joule(10.0, "GJ") * 1e9, 12)
    10.0
    >>> round(price_per_joule(1.0, "MMBTU") * 1e9, 6)   # 1 MMBTU = 1.055056 GJ
    0.947817
    """
    if per not in ENERGY_BASES:
        raise InputError("price_per", per, f"one of {ENERGY_BASES}")
    unit, scale = ("BTU", 1e6) if per == "MMBTU" else (per, 1.0)
    joules = ureg.Quantity(scale, unit).to("J").magnitude
    return float(require(price, "energy_price", ge=0)) / joules


def _seconds_per_year(operating_time):
    """Operating time per year [s]: a number in seconds or a string such as ``"8000 h"``."""
    t = to_si(operating_time, "time", "operating_time")
    require(t, "operating_time", gt=0, le=_YEAR_H * 3600 * (1 + 1e-9), what="a time per year")
    return t


def annual_duty_value(delta_duty, price, per="GJ", operating_time="8000 h", efficiency=1.0):
    """Value per year of extra heat recovered: ``ΔQ·t·price/η``.

    The recovered heat replaces fuel fired in a heater of efficiency η (or a utility, with η = 1).

    Parameters
    ----------
    delta_duty : float or array_like
        Extra duty [W] (negative for a loss).
    price : float
        Fuel or utility price [currency per ``per``].
    per : str
        Energy unit of the price (:data:`ENERGY_BASES`).
    operating_time : float or str
        Operating time per year [s], e.g. ``"8000 h"``.
    efficiency : float
        Fired-heater efficiency (0, 1] [-].

    Returns
    -------
    float or ndarray
        Value [currency/year].

    Examples
    --------
    >>> round(annual_duty_value(1e6, 8.0, "GJ", "8000 h", 0.9))  # 1 MW for 8000 h = 28.8 TJ
    256000
    """
    q = np.asarray(to_si(delta_duty, "power", "delta_duty"), float)
    eta = require(efficiency, "efficiency", gt=0, le=1)
    out = q * _seconds_per_year(operating_time) * price_per_joule(price, per) / eta
    return float(out) if out.ndim == 0 else out


def annual_fired_value(fired_duty_saved, price, per="GJ", operating_time="8000 h"):
    """Value per year of fired duty saved in a furnace: ``ΔQ_fired·t·price``.

    The fired duty is the absorbed duty over the furnace's efficiency already, so no efficiency is applied again:
    ``ΔQ_fired = ΔQ_absorbed / η``, the same number as :func:`annual_duty_value` of the absorbed duty with η.

    Parameters
    ----------
    fired_duty_saved : float or array_like
        Fired duty saved [W] (negative for more fuel).
    price : float
        Fuel price [currency per ``per``].
    per : str
        Energy unit of the price (:data:`ENERGY_BASES`).
    operating_time : float or str
        Operating time per year [s], e.g. ``"8000 h"``.

    Returns
    -------
    float or ndarray
        Value [currency/year].

    Examples
    --------
    >>> round(annual_fired_value(1e6 / 0.9, 8.0, "GJ", "8000 h"))  # = annual_duty_value(1e6, 8, ..., 0.9)
    256000
    """
    return annual_duty_value(fired_duty_saved, price, per, operating_time, efficiency=1.0)


def annual_capacity_value(extra_flow, margin, operating_time="8000 h"):
    """Value per year of extra throughput when the exchanger is the bottleneck: ``Δm·t·margin``.

    Parameters
    ----------
    extra_flow : float or str
        Extra throughput the change allows [kg/s].
    margin : float
        Margin per kg of extra throughput [currency/kg].
    operating_time : float or str
        Operating time per year [s], e.g. ``"8000 h"``.

    >>> round(annual_capacity_value(1.0, 0.01, "8000 h"))
    288000
    """
    m = to_si(extra_flow, "mass_flow", "extra_flow")
    return float(np.asarray(m) * _seconds_per_year(operating_time) * float(margin))


def simple_payback(capex, annual_value):
    """Simple payback time [years] = capex / annual value; ``inf`` when the value is zero or negative.

    >>> simple_payback(500e3, 250e3)
    2.0
    """
    capex = np.asarray(require(capex, "capex", ge=0), float)
    value = np.asarray(annual_value, float)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(value > 0, capex / np.where(value > 0, value, 1.0), np.where(capex > 0, np.inf, 0.0))
    return float(out) if out.ndim == 0 else out


def annuity_factor(rate, years):
    """Present value of 1 per year for ``years`` years, paid at year ends: ``(1 − (1+r)^−n)/r`` (n when r = 0).

    Parameters
    ----------
    rate : float
        Discount rate per year [-], > -1.
    years : int or float
        Horizon [years].

    >>> round(annuity_factor(0.10, 10), 4)
    6.1446
    """
    r = float(require(rate, "discount_rate", gt=-1))
    n = float(require(years, "horizon", ge=0))
    # expm1/log1p keep full precision for small rates, where 1 - (1+r)^-n cancels
    return n if r == 0 else float(-np.expm1(-n * np.log1p(r)) / r)


def npv(rate, cashflows):
    """Net present value of cash flows at years 0, 1, 2, ... : ``Σ c_t/(1+r)^t``.

    >>> round(npv(0.10, [-100, 110]), 10)
    0.0
    """
    r = float(require(rate, "discount_rate", gt=-1))
    c = np.asarray(cashflows, float)
    if c.ndim != 1 or c.size == 0:
        raise InputError("cashflows", cashflows, "a non-empty 1-D sequence of numbers")
    return float(np.sum(c / (1 + r) ** np.arange(c.size)))


def project_npv(capex, annual_value, rate, years):
    """NPV of spending ``capex`` now for ``annual_value`` at each year end over ``years`` years."""
    return -float(capex) + float(annual_value) * annuity_factor(rate, years)


@dataclass(frozen=True)
class CycleAverage:
    """Duty averaged over one run between cleanings.

    Attributes
    ----------
    duty_mean : float
        Time-averaged duty over run plus downtime [W] (zero duty while down).
    duty_start, duty_end : float
        Duty at the start and the end of the run [W].
    fouling_end : float
        Fouling resistance at the end of the run [m²K/W].
    run_length, downtime : float
        [s].
    """

    duty_mean: float
    duty_start: float
    duty_end: float
    fouling_end: float
    run_length: float
    downtime: float


def _fouling_curve(fouling):
    if hasattr(fouling, "Rf"):
        return fouling.Rf
    if callable(fouling):
        return fouling
    raise InputError("fouling", fouling, "a callable Rf(t) [m²K/W, t in s] or an object with an Rf(t) method")


def cycle_average(duty_at, fouling, run_length, downtime=0.0, points=41) -> CycleAverage:
    """Average duty over a run between cleanings, with the fouling growing as ``fouling``.

    ``Q̄ = ∫₀^τ Q(Rf(t)) dt / (τ + τ_down)`` by Simpson's rule on ``points`` times (one vectorized call of
    ``duty_at``). An option that raises velocity fouls more slowly: compare its cycle average, not only its clean and
    fouled duties (Epstein 1979).

    Parameters
    ----------
    duty_at : callable
        ``duty_at(Rf) -> duty [W]``, array in, array out (e.g. a rating with the fouling set to ``Rf``).
    fouling : callable or object with ``Rf(t)``
        Fouling resistance [m²K/W] at run time t [s] (``revamp.fouling.models`` fits are callables).
    run_length : float or str
        Run length between cleanings [s], e.g. ``"365 day"``.
    downtime : float or str
        Cleaning downtime [s] (no duty).
    points : int
        Odd number of integration points.

    Examples
    --------
    >>> avg = cycle_average(lambda rf: 1e6 / (1 + 1e3 * rf), lambda t: 1e-9 * t, 1e6)
    >>> round(avg.duty_mean)     # closed form 1e6·ln(2)/1: ln(1 + 1e3·1e-3)/(1e3·1e-3) MW
    693147
    """
    tau = float(require(to_si(run_length, "time", "run_length"), "run_length", gt=0))
    down = float(require(to_si(downtime, "time", "downtime"), "downtime", ge=0))
    n = int(points) | 1
    if n < 3:
        raise InputError("points", points, "an odd integer >= 3")
    t = np.linspace(0.0, tau, n)
    rf = np.asarray(_fouling_curve(fouling)(t), float)
    q = np.broadcast_to(np.asarray(duty_at(rf), float), t.shape)
    from scipy import integrate  # imported on use: a heavy module that `revamp check` never needs

    mean = float(integrate.simpson(q, x=t) / (tau + down))
    return CycleAverage(mean, float(q[0]), float(q[-1]), float(rf[-1]), tau, down)


@dataclass(frozen=True)
class Economics:
    """The money inputs of a study; no prices are built in.

    Parameters
    ----------
    energy_price : float or None
        Price of the fired fuel the recovered heat replaces [currency per ``price_per``]; needed for the ``"fuel"``
        value basis only.
    price_per : str
        Energy unit of the price (:data:`ENERGY_BASES`).
    efficiency : float
        Fired-heater efficiency [-]; 1.0 values the heat itself.
    operating_time : float or str
        Operating time per year [s], e.g. ``"8000 h"`` (the default, common practice for a refinery unit).
    discount_rate : float or None
        Discount rate per year [-]; ``None``: no NPV.
    horizon : float
        NPV horizon [years].
    capex, installation : dict
        Option label -> cost [currency]; an option not listed costs nothing (say so in your inputs).
    capacity_flow : float or None
        Extra throughput the exchanger allows when it stops being the bottleneck [kg/s]; valued for options that
        meet the target and the limits.
    capacity_margin : float or None
        Margin per kg of that throughput [currency/kg].
    currency : str
        Label only.
    value_basis : str
        What extra duty is worth, one of :data:`VALUE_BASES`: ``"fuel"`` (default, preheat), ``"cooling"``,
        ``"throughput"`` or ``"column"``.
    utility_price : float or None
        Cost of removing heat in a cooler (cooling water or fan power) [currency per ``price_per`` of heat
        removed], for the ``"cooling"`` basis; ``None``: counted as zero and said so.
    """

    energy_price: float | None = None
    price_per: str = "GJ"
    efficiency: float = 1.0
    operating_time: object = "8000 h"
    discount_rate: float | None = None
    horizon: float = 10.0
    capex: dict = field(default_factory=dict)
    installation: dict = field(default_factory=dict)
    capacity_flow: float | None = None
    capacity_margin: float | None = None
    currency: str = ""
    value_basis: str = "fuel"
    utility_price: float | None = None

    def __post_init__(self):
        if self.value_basis not in VALUE_BASES:
            raise InputError("economics.value_basis", self.value_basis, f"one of {sorted(VALUE_BASES)}")
        if self.energy_price is None:
            if self.value_basis == "fuel":
                raise InputError("economics.energy_price", None, "a fuel price for the 'fuel' value basis")
            price_per_joule(0.0, self.price_per)
        else:
            price_per_joule(self.energy_price, self.price_per)
        if self.utility_price is not None:
            price_per_joule(self.utility_price, self.price_per)
        require(self.efficiency, "economics.efficiency", gt=0, le=1)
        _seconds_per_year(self.operating_time)
        if self.discount_rate is not None:
            require(self.discount_rate, "economics.discount_rate", gt=-1)
        require(self.horizon, "economics.horizon", gt=0)
        for name in ("capex", "installation"):
            for label, cost in dict(getattr(self, name)).items():
                require(cost, f"economics.{name}[{label!r}]", ge=0)
        if (self.capacity_flow is None) != (self.capacity_margin is None):
            raise InputError("economics.capacity_margin", self.capacity_margin,
                             "given together with capacity_flow (both or neither)")

    @classmethod
    def of(cls, value):
        """An Economics from ``None`` (returns None), a dict of its fields or an Economics."""
        if value is None or isinstance(value, cls):
            return value
        if isinstance(value, dict):
            try:
                return cls(**value)
            except TypeError as exc:
                raise InputError("economics", sorted(value), f"the fields of Economics ({exc})") from None
        raise InputError("economics", value, "None, a dict or an Economics")

    def cost(self, label) -> float:
        """Capex plus installation of an option [currency]."""
        return float(self.capex.get(label, 0.0)) + float(self.installation.get(label, 0.0))

    def value(self, delta_duty, meets_target=False) -> float:
        """Annual value [currency/year] of an extra duty [W] on this exchanger's :attr:`value_basis`.

        ``"fuel"``: ``ΔQ·t·price/η``; ``"cooling"``: ``−ΔQ·t·utility_price``; ``"throughput"``, ``"column"``: 0 for
        the duty. On every basis the capacity value ``Δm·t·margin`` is added when ``meets_target`` (the option
        lifts the limit the exchanger set) and a capacity flow is given.
        """
        if self.value_basis == "fuel":
            v = annual_duty_value(delta_duty, self.energy_price, self.price_per, self.operating_time, self.efficiency)
        elif self.value_basis == "cooling" and self.utility_price is not None:
            v = -annual_duty_value(delta_duty, self.utility_price, self.price_per, self.operating_time, 1.0)
        else:
            v = 0.0 * float(to_si(delta_duty, "power", "delta_duty"))
        if meets_target and self.capacity_flow is not None:
            v += annual_capacity_value(self.capacity_flow, self.capacity_margin, self.operating_time)
        return float(v)

    def basis_text(self) -> str:
        """One sentence: the value basis the money figures use, with what is and is not counted."""
        text = f"Value basis '{self.value_basis}': {VALUE_BASES[self.value_basis]}"
        if self.value_basis == "cooling" and self.utility_price is None:
            text += " (no utility price given: the utility cost is counted as zero)"
        if self.value_basis != "fuel" and self.capacity_flow is None:
            text += " (no capacity flow given: no throughput value can be counted, so the options earn nothing)"
        return text + "."

    def npv(self, label, annual_value) -> float:
        """NPV of an option over the horizon (NaN without a discount rate)."""
        if self.discount_rate is None:
            return float("nan")
        return project_npv(self.cost(label), annual_value, self.discount_rate, self.horizon)
