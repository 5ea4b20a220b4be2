"""The planning calendar: periods, downtime, blackout dates and planned turnarounds, parsed once at the edge."""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError
from ..units import require, to_si

__all__ = ["Calendar", "make_calendar"]

_MAX_PERIODS = 5000  # a plan longer than this is refused (memory and time grow with it)


@dataclass(frozen=True)
class Calendar:
    """Periods of a cleaning plan (SI inside; dates only for display).

    Attributes
    ----------
    start : pandas.Timestamp
        Start of the first period.
    period : float
        Length of one period [s].
    periods : int
        Number of periods in the horizon.
    downtime : int
        Periods a bundle is out of service per cleaning (0: cleaned between two periods, as in Epstein's
        no-downtime case; a crew is then busy for the period the cleaning starts in).
    min_interval : int
        Fewest periods between the starts of two cleanings of one bundle (at least ``downtime``).
    blocked : numpy.ndarray of bool, shape (periods,)
        Periods in which no bundle may be out of service (blackouts).
    turnaround : tuple of int
        Periods at which a planned turnaround starts: every bundle listed is cleaned then, the unit is down for
        ``turnaround_length`` periods (no fuel, no crew limit).
    turnaround_length : int
        Periods the unit is down at each turnaround.
    """

    start: pd.Timestamp
    period: float
    periods: int
    downtime: int
    min_interval: int
    blocked: np.ndarray
    turnaround: tuple
    turnaround_length: int

    @property
    def dates(self) -> pd.DatetimeIndex:
        """Start date of each period."""
        return self.start + pd.to_timedelta(np.arange(self.periods) * self.period, unit="s")

    def date(self, p: float) -> pd.Timestamp:
        return self.start + pd.to_timedelta(p * self.period, unit="s")

    @property
    def down(self) -> np.ndarray:
        """Periods in which the unit is down for a turnaround (no fuel is fired)."""
        out = np.zeros(self.periods, dtype=bool)
        for p in self.turnaround:
            out[p:p + self.turnaround_length] = True
        return out

    def can_start(self) -> np.ndarray:
        """Periods in which a cleaning may start: its whole downtime clear of every blackout."""
        ok = np.ones(self.periods, dtype=bool)
        for p in np.flatnonzero(self.blocked):
            ok[max(0, p - max(self.downtime, 1) + 1):p + 1] = False
        return ok


def _timestamp(value, field):
    try:
        ts = pd.Timestamp(value)
    except (ValueError, TypeError, OverflowError):
        raise InputError(field, value, "a date such as '2027-03-01'") from None
    if ts is pd.NaT or pd.isna(ts):
        raise InputError(field, value, "a date such as '2027-03-01'")
    return ts.tz_localize(None) if ts.tzinfo is not None else ts


def _periods_of(value, period, field, minimum=0):
    seconds = require(float(to_si(value, "time", field)), field, ge=0)
    return max(int(math.ceil(seconds / period - 1e-9)), minimum)


def make_calendar(horizon, period, downtime, start=None, min_interval=None, blackouts=(), turnaround=(),
                  turnaround_length=None) -> Calendar:
    """Parse and check the calendar inputs of :func:`revamp.cleaning.schedule_cleaning` (see there)."""
    period_s = require(float(to_si(period, "time", "period")), "period", gt=0)
    horizon_s = require(float(to_si(horizon, "time", "horizon")), "horizon", gt=0)
    n = int(round(horizon_s / period_s))
    if n < 2 or n > _MAX_PERIODS:
        raise InputError("horizon", horizon, f"between 2 and {_MAX_PERIODS} periods of {period} (it is {n})")
    start_ts = _timestamp(start, "start") if start is not None else pd.Timestamp.today().normalize()
    d = _periods_of(downtime, period_s, "downtime", minimum=0)
    if d >= n:
        raise InputError("downtime", downtime, f"shorter than the horizon ({n} periods)")
    m = max(d, 1) if min_interval is None else max(_periods_of(min_interval, period_s, "min_interval"), d, 1)
    blocked = np.zeros(n, dtype=bool)
    for k, item in enumerate(blackouts or ()):
        if not isinstance(item, (tuple, list)) or len(item) != 2:
            raise InputError(f"blackouts[{k}]", item, "a pair (first date, last date)")
        a, b = (_timestamp(v, f"blackouts[{k}]") for v in item)
        if b < a:
            raise InputError(f"blackouts[{k}]", item, "a first date on or before the last date")
        pa = (a - start_ts).total_seconds() / period_s
        pb = (b - start_ts).total_seconds() / period_s
        lo, hi = max(int(math.floor(pa)), 0), min(int(math.floor(pb)), n - 1)
        if hi >= lo:
            blocked[lo:hi + 1] = True
    if isinstance(turnaround, (str, pd.Timestamp)):
        turnaround = (turnaround,)
    t_len = max(d, 1) if turnaround_length is None else _periods_of(turnaround_length, period_s, "turnaround_length", 1)
    tps = []
    for k, item in enumerate(turnaround or ()):
        p = int(math.floor((_timestamp(item, f"turnaround[{k}]") - start_ts).total_seconds() / period_s))
        if not 0 <= p < n:
            raise InputError(f"turnaround[{k}]", item, f"a date inside the horizon ({start_ts.date()} to "
                                                       f"{(start_ts + pd.to_timedelta(horizon_s, unit='s')).date()})")
        if blocked[p]:
            raise InputError(f"turnaround[{k}]", item, "a date outside every blackout")
        tps.append(p)
    return Calendar(start=start_ts, period=period_s, periods=n, downtime=d, min_interval=m, blocked=blocked,
                    turnaround=tuple(sorted(set(tps))), turnaround_length=t_len)
