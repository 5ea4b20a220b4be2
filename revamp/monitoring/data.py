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
  any exchanger (the hot side is the one with the hotter inlet in that row).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd
import pint

from ..errors import InputError
from ..units import DIMENSIONS, ureg

__all__ = ["COLUMNS", "PlantData", "read_plant_data"]

COLUMNS = ("timestamp", "shell_flow", "shell_t_in", "shell_t_out", "tube_flow", "tube_t_in", "tube_t_out")
_KIND = {"shell_flow": "mass_flow", "tube_flow": "mass_flow", "shell_t_in": "temperature",
         "shell_t_out": "temperature", "tube_t_in": "temperature", "tube_t_out": "temperature"}


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
    """

    frame: pd.DataFrame
    counts: dict


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


def read_plant_data(data, columns=None, *, sort: bool = False, flat_rows: int = 6, flat_tol: float = 0.0,
                    timestamp_format: str | None = None) -> PlantData:
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
        strftime format of the timestamps; None lets pandas infer it.

    Returns
    -------
    PlantData
    """
    if isinstance(data, pd.DataFrame):
        raw = data
    else:
        try:
            raw = pd.read_csv(data, dtype=str, keep_default_na=False)
        except (OSError, ValueError) as exc:
            raise InputError("data", str(data), f"a readable CSV file or a DataFrame ({exc})") from None
    spec = _mapping(columns)
    missing_cols = [f"{src} (for {key})" for key, (src, _) in spec.items() if src not in raw.columns]
    if missing_cols:
        raise InputError("data.columns", list(raw.columns)[:12], f"to contain {', '.join(missing_cols)}")
    n = len(raw)
    reasons = [[] for _ in range(n)]

    def add(mask, text):
        for i in np.flatnonzero(mask):
            reasons[i].append(text)

    out = pd.DataFrame({"row": np.arange(n)})
    src_t = raw[spec["timestamp"][0]]
    blank_t = src_t.isna().to_numpy() | (src_t.astype(str).str.strip() == "").to_numpy()
    if not pd.api.types.is_datetime64_any_dtype(src_t):
        src_t = src_t.astype(object).where(blank_t, src_t.astype(str))  # a bare number is not a time: parse text
    ts = pd.to_datetime(src_t.where(~blank_t), format=timestamp_format, errors="coerce")
    add(blank_t, "missing timestamp")
    add(ts.isna().to_numpy() & ~blank_t, "bad timestamp")
    out["timestamp"] = ts.to_numpy()
    for key in COLUMNS[1:]:
        src, unit = spec[key]
        col = raw[src]
        text = col.astype(str).str.strip()
        blank = col.isna().to_numpy() | text.isin(["", "nan", "NaN", "NA", "N/A", "null", "None"]).to_numpy()
        num = pd.to_numeric(col.where(~blank), errors="coerce").to_numpy(dtype=float)
        bad = ~np.isfinite(num) & ~blank
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
    return PlantData(frame=out, counts=counts)
