"""Read plant data (a CSV file or a DataFrame) into SI, and flag every bad row with its reason.

Canonical columns (SI): ``timestamp``, ``shell_flow`` [kg/s], ``shell_t_in``, ``shell_t_out`` [K], ``tube_flow``
[kg/s], ``tube_t_in``, ``tube_t_out`` [K]. ``columns=`` maps the caller's names and units onto these, e.g.
``{"shell_flow": ("FI101", "lb/h"), "shell_t_in": ("TI101", "degF"), "tube_flow": "FI102"}`` (a bare name means
the column is already in SI).

Every row keeps its place: nothing is dropped. A row with a problem gets its reasons in the ``flag`` column
(``""`` for a good row) and the counts by reason are returned, so that a caller can say how many rows were left out
and why. Reasons:

- ``missing <col>``: empty cell; ``non-numeric <col>``: a cell that is not a number;
  ``missing timestamp`` / ``bad timestamp``;
- ``duplicated timestamp``: the same time as an earlier row (the first is kept);
- ``unsorted timestamp``: earlier than a row above it (pass ``sort=True`` to re-order instead, counted as
  ``re-ordered``);
- ``flat-lined <col>``: the reading did not change for ``flat_rows`` or more consecutive rows (a stuck transmitter;
  common practice, no source);
- ``flow <= 0 <col>``;
- ``<side> outlet above inlet on the hot side`` / ``below inlet on the cold side``, ``cold outlet above hot inlet``,
  ``hot outlet below cold inlet``, ``no driving force (equal inlets)``: temperatures that break the second law for
  any exchanger (the hot side is the one with the hotter inlet in that row);
- ``timestamp not a time in <zone>``: a local time that the clock skipped or repeated at a daylight-saving change.

Plants export CSV files in their own dialect (:class:`CsvDialect`): the separator (``,``, ``;``, tab), the decimal
mark (``.`` or ``,``), the timestamp format, day-first dates and the local time zone. A file that looks like another
dialect than the one set gets one error naming the setting to change (a semicolon file read with commas, numbers
with a decimal comma read with a point), not one error per column. Dates written with two small numbers first
(``03/04/2031``) can be read day-first or month-first: when the setting is not given and both readings parse every
row, the reading with the time in order and steady steps is taken and said so in ``PlantData.dialect.hints``; when
the time order cannot tell them apart the setting is required. Times are kept in UTC when a time zone is given (or
the timestamps carry offsets), otherwise as written.
"""
from __future__ import annotations

import re
import warnings
import zoneinfo
from dataclasses import dataclass, field, fields

import numpy as np
import pandas as pd
import pint

from ..errors import InputError
from ..units import DIMENSIONS, ureg

__all__ = ["COLUMNS", "CsvDialect", "DialectUsed", "PlantData", "dialect_problem", "read_plant_data"]

COLUMNS = ("timestamp", "shell_flow", "shell_t_in", "shell_t_out", "tube_flow", "tube_t_in", "tube_t_out")
_KIND = {"shell_flow": "mass_flow", "tube_flow": "mass_flow", "shell_t_in": "temperature",
         "shell_t_out": "temperature", "tube_t_in": "temperature", "tube_t_out": "temperature"}


_DELIMITERS = {",": "comma", ";": "semicolon", "\t": "tab", "|": "vertical bar"}
_DECIMAL_COMMA = re.compile(r"^\s*[+-]?\d+,\d+\s*$")
_DAY_MONTH = re.compile(r"^\s*(\d{1,2})([./-])(\d{1,2})\2(\d{2,4})\b")  # two small numbers first: d/m or m/d
#: A temperature column read as kelvin (no unit given) whose median is below this is taken to be in another unit
#: (200 K = −73 °C: colder than the process streams of the services this package rates; a cryogenic service states
#: its unit, 'K'). Common practice, no source.
_KELVIN_FLOOR = 200.0


@dataclass(frozen=True)
class CsvDialect:
    """How a plant CSV file is written.

    Attributes
    ----------
    delimiter : str
        Field separator: ``","`` (default), ``";"``, ``"\t"`` or ``"|"``.
    decimal : str
        Decimal mark of the numbers: ``"."`` (default) or ``","``.
    timestamp_format : str or None
        strftime format of the timestamps (e.g. ``"%d.%m.%Y %H:%M"``); None reads common forms.
    dayfirst : bool or None
        Dates such as ``03/04/2031`` are day-first (3 April) when True, month-first (4 March) when False; None
        detects it (see the module notes). Ignored when ``timestamp_format`` is given.
    timezone : str or None
        IANA time zone of timestamps written without an offset (e.g. ``"Europe/Berlin"``): they are converted to UTC.
        None keeps them as written.
    """

    delimiter: str = ","
    decimal: str = "."
    timestamp_format: str | None = None
    dayfirst: bool | None = None
    timezone: str | None = None

    def __post_init__(self):
        if self.delimiter not in _DELIMITERS:
            raise InputError("delimiter", self.delimiter, "one of ',', ';', '\\t' (tab) or '|'")
        if self.decimal not in (".", ","):
            raise InputError("decimal", self.decimal, "'.' or ','")
        if self.decimal == self.delimiter:
            raise InputError("decimal", self.decimal, f"different from the delimiter {self.delimiter!r}")
        if self.timestamp_format is not None and (not isinstance(self.timestamp_format, str)
                                                  or "%" not in self.timestamp_format):
            raise InputError("timestamp_format", self.timestamp_format, "an strftime format such as '%d.%m.%Y %H:%M'")
        if self.dayfirst is not None and not isinstance(self.dayfirst, (bool, np.bool_)):
            raise InputError("dayfirst", self.dayfirst, "true, false or not given (detected)")
        if self.timezone is not None:
            try:
                zoneinfo.ZoneInfo(str(self.timezone))
            except (zoneinfo.ZoneInfoNotFoundError, ValueError, TypeError):
                raise InputError("timezone", self.timezone, "an IANA time zone such as 'Europe/Berlin' or 'UTC'") \
                    from None

    @classmethod
    def make(cls, value) -> "CsvDialect":
        """A dialect from None (the default), a CsvDialect or a dict of its fields."""
        if value is None:
            return cls()
        if isinstance(value, cls):
            return value
        if not isinstance(value, dict):
            raise InputError("dialect", value, "a CsvDialect or a dict of delimiter, decimal, timestamp_format, "
                                               "dayfirst, timezone")
        names = {f.name for f in fields(cls)}
        for key in value:
            if key not in names:
                raise InputError(f"dialect.{key}", key, f"one of {sorted(names)}")
        return cls(**value)


@dataclass(frozen=True)
class DialectUsed:
    """How a plant data set was read, for the record.

    Attributes
    ----------
    dialect : CsvDialect
        The settings given.
    dayfirst : bool or None
        The date order used for dates with two small numbers first; None when the timestamps have no such dates
        (ISO dates, or an explicit ``timestamp_format``).
    dayfirst_from : str
        Why: ``"given"`` (the setting), ``"format"`` (the explicit format), ``"not ambiguous"``, ``"only reading"``
        (the other order leaves rows unread) or ``"time order"`` (both read every row; the one with the time in order
        and steady steps was taken).
    utc : bool
        Timestamps converted to UTC (a time zone was given or the timestamps carry offsets).
    hints : tuple of str
        What was noticed about the file and what to set to be explicit.
    """

    dialect: CsvDialect
    dayfirst: bool | None = None
    dayfirst_from: str = "not ambiguous"
    utc: bool = False
    hints: tuple = ()


@dataclass(frozen=True)
class PlantData:
    """Plant data in SI with per-row flags.

    Attributes
    ----------
    frame : pandas.DataFrame
        Canonical columns in SI, plus ``row`` (the row number in the source, 0-based), ``flag`` (reasons joined by
        ``"; "``, empty for a good row) and ``valid`` (no flag).
    counts : dict
        Number of rows per reason, plus ``"rows"`` (total) and ``"valid"``; ``"re-ordered"`` when sorted.
    dialect : DialectUsed
        How the file was read (date order and why, UTC or not, hints).
    """

    frame: pd.DataFrame
    counts: dict
    dialect: DialectUsed = field(default_factory=lambda: DialectUsed(CsvDialect()))


def _mapping(columns):
    spec = {c: (c, None) for c in COLUMNS}
    for key, val in (columns or {}).items():
        if key not in COLUMNS:
            raise InputError(f"columns.{key}", key, f"one of {list(COLUMNS)}")
        if isinstance(val, str):
            spec[key] = (val, None)
        elif isinstance(val, (tuple, list)) and len(val) == 2:
            spec[key] = (str(val[0]), val[1])
        else:
            raise InputError(f"columns.{key}", val, "a column name or a (name, unit) pair")
    return spec


def _convert(values: np.ndarray, unit, kind: str, field: str) -> np.ndarray:
    if unit is None:
        return values
    si = DIMENSIONS[kind][0]
    try:
        return np.asarray(ureg.Quantity(values, unit).to(si).magnitude, dtype=float)
    except (pint.errors.PintError, AttributeError, TypeError, ValueError) as exc:  # undefined unit, wrong dimension
        raise InputError(f"columns.{field}", unit, f"a unit of {DIMENSIONS[kind][1]} ({exc.__class__.__name__})") \
            from None


def _flat_runs(x: np.ndarray, n: int, tol: float) -> np.ndarray:
    """True where x sits in a run of >= n consecutive rows whose successive changes are all <= tol."""
    out = np.zeros(x.size, dtype=bool)
    if x.size < n or n < 2:
        return out
    same = np.abs(np.diff(x)) <= tol  # same[i]: row i+1 equals row i
    # run ids of consecutive "same" steps
    change = np.concatenate([[True], ~same])  # a new run starts at row i when row i differs from row i-1
    run_id = np.cumsum(change)
    counts = np.bincount(run_id)
    out = counts[run_id] >= n
    return out & np.isfinite(x)


_TIME = re.compile(r"\d:\d\d(?::\d\d(?:\.\d+)?)?\s*(?:Z|[+-]\d\d:?\d\d)\s*$")  # a clock time, then an offset


def _fields(line: str, sep: str) -> list[str]:
    return [f.strip().strip('"').strip() for f in line.split(sep)]


def dialect_problem(lines, names, dialect=None) -> InputError | None:
    """The error to raise when a file's header lacks columns but splits into them on another separator.

    Parameters
    ----------
    lines : list of str
        The first lines of the file, header first.
    names : list of str
        The column names the file should have.
    dialect : CsvDialect, dict or None
        The settings the file was read with.

    Returns
    -------
    InputError or None
        One error on ``delimiter`` naming the separator the file seems to use (and ``decimal ','`` when its numbers
        have a decimal comma), or None when the header has the columns or no other separator does better.
    """
    d = CsvDialect.make(dialect)
    header = lines[0] if lines else ""
    count = lambda sep: sum(n in _fields(header, sep) for n in names)
    have = count(d.delimiter)
    if have == len(names):
        return None
    best = max((sep for sep in _DELIMITERS if sep != d.delimiter), key=count)
    if count(best) <= have:
        return None
    shown = ", ".join(_fields(header, best)[:8])
    text = f"{best!r} ({_DELIMITERS[best]}): the file looks {_DELIMITERS[best]}-separated (its header splits on " \
           f"{best!r} into {shown})"
    cells = [c for line in lines[1:6] for c in _fields(line, best)]
    commas = [c for c in cells if _DECIMAL_COMMA.match(c)]
    if commas and d.decimal == ".":
        text += f"; its numbers have a decimal comma (e.g. {commas[0]!r}): set decimal ',' as well"
    return InputError("delimiter", d.delimiter, text)


def _first_lines(path, n: int = 6) -> list[str]:
    try:
        with open(path, encoding="utf-8-sig", errors="replace") as fh:
            return [line.rstrip("\r\n") for _, line in zip(range(n), fh)]
    except (OSError, TypeError, ValueError):
        return []


def _parse(vals: pd.Series, dayfirst: bool | None, fmt: str | None, utc: bool) -> pd.Series:
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", UserWarning)  # pandas' notes on inferred formats: the choice is ours
        kw = {"format": fmt} if fmt else {"dayfirst": bool(dayfirst)} if dayfirst is not None else {}
        try:
            ts = pd.to_datetime(vals, errors="coerce", utc=utc, **kw)
        except (ValueError, TypeError):  # e.g. a format pandas cannot use at all
            ts = pd.Series(pd.NaT, index=vals.index, dtype="datetime64[ns]")
    if getattr(ts.dt, "tz", None) is not None:
        ts = ts.dt.tz_convert(None)  # UTC, without the zone
    return ts


def _order_score(ts: pd.Series):
    """(steps back in time, largest forward step / median forward step) of the rows in their order."""
    t = ts.dropna().to_numpy().astype("datetime64[ns]").astype(np.int64)
    d = np.diff(t)
    fwd = d[d > 0]
    return int(np.sum(d < 0)), float(fwd.max() / np.median(fwd)) if fwd.size else np.inf


def _read_times(src: pd.Series, blank: np.ndarray, d: CsvDialect):
    """Timestamps (naive; UTC when converted), the rows a time zone could not place, and how they were read."""
    vals = src.astype(object).where(~blank)
    text = vals.dropna().astype(str)
    utc = bool(text.str.contains(_TIME).any())
    hints: list[str] = []
    dayfirst, why = None, "not ambiguous"
    if d.timestamp_format:
        ts, why = _parse(vals, None, d.timestamp_format, utc), "format"
    elif not text.str.match(_DAY_MONTH).any():
        ts = _parse(vals, None, None, utc)
    elif d.dayfirst is not None:
        dayfirst, why = bool(d.dayfirst), "given"
        ts = _parse(vals, dayfirst, None, utc)
    else:
        month, day = _parse(vals, False, None, utc), _parse(vals, True, None, utc)
        if month.equals(day):
            ts = month
        else:
            example = next(iter(text[(month != day).reindex(text.index, fill_value=False)]), text.iloc[0])
            n_m, n_d = int(month.notna().sum()), int(day.notna().sum())
            if n_m != n_d:
                dayfirst, why = n_d > n_m, "only reading"
                other = "month" if dayfirst else "day"
                hints.append(f"dates read {'day' if dayfirst else 'month'}-first: {abs(n_d - n_m)} rows do not "
                             f"read {other}-first; set dayfirst: {str(dayfirst).lower()} to say so")
            else:
                s_m, s_d = _order_score(month), _order_score(day)
                if s_m[0] != s_d[0]:
                    dayfirst = s_d[0] < s_m[0]
                elif max(s_m[1], s_d[1]) > 1.5 * min(s_m[1], s_d[1]):
                    dayfirst = s_d[1] < s_m[1]
                else:
                    raise InputError("dayfirst", None,
                                     f"given (true or false): dates such as {example!r} read both day-first "
                                     f"and month-first, and the time order does not tell which is meant")
                why = "time order"
                lost = s_m if dayfirst else s_d
                hints.append(f"dates such as {example!r} read both day-first and month-first; "
                             f"{'day' if dayfirst else 'month'}-first was taken because its times run in order "
                             f"with steady steps (the other reading: {lost[0]} steps back in time, largest step "
                             f"{lost[1]:.3g} times the usual); set dayfirst: {str(dayfirst).lower()} to say so")
            ts = day if dayfirst else month
    unplaced = np.zeros(len(ts), dtype=bool)
    if d.timezone and not utc:
        had = ts.notna().to_numpy()
        ts = ts.dt.tz_localize(d.timezone, ambiguous="NaT", nonexistent="NaT").dt.tz_convert(None)
        unplaced = had & ts.isna().to_numpy()
        utc = True
    elif d.timezone and utc:
        hints.append(f"the timestamps carry UTC offsets: those were used, not the time zone {d.timezone}")
    return ts, unplaced, DialectUsed(dialect=d, dayfirst=dayfirst, dayfirst_from=why, utc=utc, hints=tuple(hints))


def _numbers(text: pd.Series, blank: np.ndarray, decimal: str) -> np.ndarray:
    if decimal != ".":
        text = text.str.replace(decimal, ".", regex=False)
    return pd.to_numeric(text.where(~blank), errors="coerce").to_numpy(dtype=float)


def read_plant_data(data, columns=None, *, sort: bool = False, flat_rows: int = 6, flat_tol: float = 0.0,
                    timestamp_format: str | None = None, dialect=None) -> PlantData:
    """Read and validate plant data.

    Parameters
    ----------
    data : str, path or pandas.DataFrame
        A CSV file or a DataFrame with a timestamp and, for each side, flow, inlet and outlet temperature.
    columns : dict or None
        Canonical name -> source column name, or (name, unit) with a unit pint understands (``"lb/h"``,
        ``"degF"``, ``"t/h"``, ``"degC"``). Unmapped columns are read by their canonical names, in SI.
    sort : bool
        Re-order rows by time instead of flagging out-of-order rows.
    flat_rows : int
        A sensor unchanged over this many consecutive rows or more is flagged as flat-lined (>= 2).
    flat_tol : float
        Changes up to this size count as unchanged, in SI units of the column [kg/s or K].
    timestamp_format : str or None
        strftime format of the timestamps (the same as ``dialect={"timestamp_format": ...}``).
    dialect : CsvDialect, dict or None
        How the file is written: delimiter, decimal mark, timestamp format, day-first dates, time zone.

    Returns
    -------
    PlantData
    """
    d = CsvDialect.make(dialect)
    if timestamp_format is not None:
        d = CsvDialect(**{**{f.name: getattr(d, f.name) for f in fields(d)}, "timestamp_format": timestamp_format})
    lines: list = []
    if isinstance(data, pd.DataFrame):
        raw = data
        lines = [d.delimiter.join(str(c) for c in raw.columns)]
    else:
        try:
            raw = pd.read_csv(data, dtype=str, keep_default_na=False, sep=d.delimiter, encoding="utf-8-sig")
        except (OSError, ValueError) as exc:
            raise InputError("data", str(data), f"a readable CSV file or a DataFrame ({exc})") from None
        lines = _first_lines(data)
    spec = _mapping(columns)
    missing_cols = [f"{src} (for {key})" for key, (src, _) in spec.items() if src not in raw.columns]
    if missing_cols:
        problem = dialect_problem(lines, [src for src, _ in spec.values()], d)
        if problem is not None:
            raise problem
        raise InputError("data.columns", list(raw.columns)[:12], f"to contain {', '.join(missing_cols)}")
    n = len(raw)
    reasons = [[] for _ in range(n)]

    def add(mask, text):
        for i in np.flatnonzero(mask):
            reasons[i].append(text)

    out = pd.DataFrame({"row": np.arange(n)})
    src_t = raw[spec["timestamp"][0]]
    blank_t = src_t.isna().to_numpy() | (src_t.astype(str).str.strip() == "").to_numpy()
    if pd.api.types.is_datetime64_any_dtype(src_t):
        ts, unplaced, used = src_t, np.zeros(n, dtype=bool), DialectUsed(dialect=d, dayfirst_from="not ambiguous")
        if getattr(ts.dt, "tz", None) is not None:
            ts, used = ts.dt.tz_convert(None), DialectUsed(dialect=d, utc=True)
        elif d.timezone:
            had = ts.notna().to_numpy()
            ts = ts.dt.tz_localize(d.timezone, ambiguous="NaT", nonexistent="NaT").dt.tz_convert(None)
            unplaced, used = had & ts.isna().to_numpy(), DialectUsed(dialect=d, utc=True)
    else:
        # a bare number is not a time: parse text
        ts, unplaced, used = _read_times(src_t.astype(object).where(blank_t, src_t.astype(str)), blank_t, d)
    add(blank_t, "missing timestamp")
    add(ts.isna().to_numpy() & ~blank_t & ~unplaced, "bad timestamp")
    add(unplaced, f"timestamp not a time in {d.timezone}")
    out["timestamp"] = ts.to_numpy()
    for key in COLUMNS[1:]:
        src, unit = spec[key]
        col = raw[src]
        text = col.astype(str).str.strip()
        blank = col.isna().to_numpy() | text.isin(["", "nan", "NaN", "NA", "N/A", "null", "None"]).to_numpy()
        num = _numbers(text, blank, d.decimal)
        bad = ~np.isfinite(num) & ~blank
        if d.decimal == "." and bad.sum() > 0.5 * max((~blank).sum(), 1):
            commas = text[bad & text.str.match(_DECIMAL_COMMA).to_numpy()]
            if len(commas) > 0.5 * bad.sum():
                thousands = commas.str.fullmatch(r"\s*[+-]?\d{1,3},\d{3}\s*").all()
                raise InputError("decimal", d.decimal, f"',': most cells of column {src!r} are numbers with a "
                                                       f"decimal comma (e.g. {commas.iloc[0]!r})" +
                                 ("; if the comma separates thousands instead, export the numbers without it"
                                  if thousands else ""))
        if unit is None and _KIND[key] == "temperature" and np.isfinite(num).any() \
                and np.nanmedian(num) < _KELVIN_FLOOR:
            raise InputError(f"columns.{key}", src,
                             f"given with its unit, e.g. ({src!r}, 'degC'): a bare column is read as kelvin, and its "
                             f"values (median {np.nanmedian(num):.4g}) would be below {_KELVIN_FLOOR:.0f} K; write "
                             f"({src!r}, 'K') if they really are kelvin")
        add(blank, f"missing {key}")
        add(bad, f"non-numeric {key}")
        out[key] = _convert(num, unit, _KIND[key], key)

    counts: dict = {}
    if sort:
        order = np.argsort(out["timestamp"].to_numpy(), kind="stable")  # NaT sorts last
        moved = int(np.sum(order != np.arange(n)))
        out = out.iloc[order].reset_index(drop=True)
        reasons = [reasons[i] for i in order]
        if moved:
            counts["re-ordered"] = moved
    tvals = out["timestamp"]
    have_t = tvals.notna().to_numpy()
    add(tvals.duplicated(keep="first").to_numpy() & have_t, "duplicated timestamp")
    tnum = np.where(have_t, tvals.to_numpy().astype("datetime64[ns]").astype(np.int64), np.iinfo(np.int64).min)
    running = np.maximum.accumulate(tnum)
    earlier = np.zeros(n, dtype=bool)
    earlier[1:] = tnum[1:] < running[:-1]
    add(earlier & have_t, "unsorted timestamp")

    for key in COLUMNS[1:]:
        add(_flat_runs(out[key].to_numpy(), flat_rows, flat_tol), f"flat-lined {key}")
    for key in ("shell_flow", "tube_flow"):
        add(out[key].to_numpy() <= 0, f"flow <= 0 {key}")

    si, so = out["shell_t_in"].to_numpy(), out["shell_t_out"].to_numpy()
    ti, to = out["tube_t_in"].to_numpy(), out["tube_t_out"].to_numpy()
    shell_hot = si > ti
    tube_hot = ti > si
    hot_in, hot_out = np.where(shell_hot, si, ti), np.where(shell_hot, so, to)
    cold_in, cold_out = np.where(shell_hot, ti, si), np.where(shell_hot, to, so)
    hot_side = np.where(shell_hot, "shell", "tube")
    cold_side = np.where(shell_hot, "tube", "shell")
    hot = shell_hot | tube_hot
    add(si == ti, "no driving force (equal inlets)")
    for i in np.flatnonzero(hot & (hot_out > hot_in)):
        reasons[i].append(f"{hot_side[i]} outlet above inlet on the hot side")
    for i in np.flatnonzero(hot & (cold_out < cold_in)):
        reasons[i].append(f"{cold_side[i]} outlet below inlet on the cold side")
    add(hot & (cold_out > hot_in), "cold outlet above hot inlet")
    add(hot & (hot_out < cold_in), "hot outlet below cold inlet")

    out["flag"] = ["; ".join(r) for r in reasons]
    out["valid"] = out["flag"] == ""
    for r in reasons:
        for text in r:
            counts[text] = counts.get(text, 0) + 1
    counts = {"rows": n, "valid": int(out["valid"].sum()), **dict(sorted(counts.items()))}
    return PlantData(frame=out, counts=counts, dialect=used)
