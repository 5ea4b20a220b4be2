"""Export: every table of a report to CSV, one Excel workbook per batch (a sheet per table), a rating as CSV.

Tables keep their numbers as numbers, in the display units of the report, with the unit in each header
(``"duty [MW]"``), named as in the report (:mod:`.labels`). Workbooks are written with openpyxl.

>>> sheet_name("E-101: options [money]/x", set())
'E-101 options money x'
"""
from __future__ import annotations

import re
from pathlib import Path

__all__ = ["rating_frame", "report_tables", "sheet_name", "write_csv", "write_workbook", "collect_tables",
           "write_batch_workbook"]

#: what a rating prints: (attribute, quantity kind)
RATING_QUANTITIES = [("duty", "power"), ("t_out_shell", "temperature"), ("t_out_tube", "temperature"),
                     ("U_clean", "htc"), ("U_service", "htc"), ("area", "area"), ("h_shell", "htc"),
                     ("h_tube", "htc"), ("effectiveness", "dimensionless"), ("F", "dimensionless"),
                     ("lmtd", "temperature_difference"), ("dp_shell", "pressure"), ("dp_tube", "pressure"),
                     ("velocity_tube", "velocity"), ("velocity_shell", "velocity"), ("Re_tube", "dimensionless"),
                     ("Re_shell", "dimensionless")]


def rating_frame(rating, system: str = "SI"):
    """One scalar rating as a table: quantity, value (display units), unit; then the five resistances with their
    share of 1/U (outside-area basis)."""
    import pandas as pd

    from ..units import from_si
    from .labels import display_name, rescale, unit_of

    rows = []
    for attr, kind in RATING_QUANTITIES:
        value = getattr(rating, attr, None)
        if value is None:
            continue
        mag, unit = from_si(float(value), kind, system)
        factor, unit = rescale(unit) if kind == "power" else (1.0, unit_of(unit))
        rows.append({"quantity": display_name(attr), "value": mag * factor, "unit": unit})
    r_unit = unit_of(from_si(1.0, "fouling", system)[1])
    total = float(rating.resistances.sum())
    for name, r in rating.resistances.items():
        rows.append({"quantity": f"resistance: {name}", "value": from_si(float(r), "fouling", system)[0],
                     "unit": r_unit})
        rows.append({"quantity": f"share of 1/U: {name}", "value": 100.0 * float(r) / total, "unit": "%"})
    return pd.DataFrame(rows)


def _get(result, key):
    """A part of a case result, whether a dict or an object with attributes."""
    return result.get(key) if isinstance(result, dict) else getattr(result, key, None)


def report_tables(result, system: str = "SI") -> dict:
    """Every table of one exchanger's report, by name, as display tables (numbers in display units, units in the
    headers): the base-case ratings, the options and their money, and the plant-data findings."""
    import pandas as pd

    from .case import ratings_table, study_table
    from .labels import display_frame

    tables = {}
    named = {k: _get(result, k) for k in ("today", "today_clean", "revamp", "revamp_clean")
             if _get(result, k) is not None}
    if named:
        words = {"today": "today", "today_clean": "today, clean", "revamp": "revamp", "revamp_clean": "revamp, clean"}
        t = display_frame(ratings_table({words[k]: v for k, v in named.items()}, system), rows_are_quantities=True)
        t.index.name = "quantity"
        tables["ratings"] = t
    study = _get(result, "study")
    if study is not None:
        t = display_frame(study_table(study, system))
        t.index.name = "case"
        tables["options"] = t
        cur = getattr(study.economics, "currency", "") or ""
        cols = {"screening": "limits", "dp_shell_status": "shell pressure drop", "dp_tube_status": "tube pressure drop",
                "velocity_status": "tube velocity", "vibration_status": "vibration", "nozzle_status": "nozzle",
                "meets_target": "meets target", "capex": f"capex [{cur}]", "annual_value": f"value per year [{cur}]",
                "payback": "payback [years]", "npv": f"NPV [{cur}]", "rank": "rank", "reason": "why"}
        money = pd.DataFrame(index=[str(i) for i in study.table.index])
        for col, name in cols.items():
            if col in study.table:
                money[name.replace(" []", "")] = list(study.table[col])
        money.index.name = "case"
        tables["options, limits and money"] = money
    mon = _get(result, "monitoring")
    if mon is not None:
        findings = {str(k): v for k, v in mon.summary.items() if not str(k).startswith("rows: ") and k != "warnings"}
        t = display_frame(pd.DataFrame({"value": list(findings.values())}, index=list(findings)).T,
                          rows_are_quantities=False, system=system).T
        t.index.name = "finding"
        tables["plant data"] = t
        rows = {str(k)[len("rows: "):]: int(v) for k, v in mon.summary.items() if str(k).startswith("rows: ")}
        tables["plant data rows"] = pd.DataFrame({"rows": list(rows.values())},
                                                 index=pd.Index(list(rows), name="rows"))
    return tables


def _file_stem(name: str) -> str:
    return re.sub(r"[^A-Za-z0-9._-]+", "_", name).strip("_") or "table"


def write_csv(tables: dict, folder) -> list:
    """One CSV per table (UTF-8, the index as the first column); returns the paths written."""
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    paths = []
    for name, df in tables.items():
        path = folder / f"{_file_stem(name)}.csv"
        df.to_csv(path, encoding="utf-8")
        paths.append(path)
    return paths


def sheet_name(text: str, taken: set) -> str:
    """An Excel sheet name: none of ``[]:*?/\\``, at most 31 characters, unique in ``taken`` (added to it)."""
    name = re.sub(r"\s+", " ", re.sub(r"[\[\]:*?/\\]+", " ", str(text))).strip().strip("'")[:31] or "sheet"
    base, n = name, 2
    while name.lower() in {t.lower() for t in taken}:
        suffix = f" ({n})"
        name, n = base[: 31 - len(suffix)] + suffix, n + 1
    taken.add(name)
    return name


def write_workbook(sheets: dict, path) -> Path:
    """One Excel workbook, one sheet per table (``{title: DataFrame}``), header row bold, columns sized."""
    import pandas as pd

    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    tmp = path.with_name(f".{path.name}.tmp.xlsx")
    taken: set = set()
    with pd.ExcelWriter(tmp, engine="openpyxl") as xw:
        if not sheets:
            pd.DataFrame({"note": ["no table to export"]}).to_excel(xw, sheet_name="empty", index=False)
        for title, df in sheets.items():
            name = sheet_name(title, taken)
            df.to_excel(xw, sheet_name=name)
            ws = xw.sheets[name]
            for col in ws.columns:
                width = max(len(str(c.value)) if c.value is not None else 0 for c in col)
                ws.column_dimensions[col[0].column_letter].width = min(max(10, width + 2), 60)
    tmp.replace(path)
    return path


def collect_tables(folder) -> dict:
    """The CSV tables of :func:`write_csv` in ``folder`` read back, by file stem (for the batch workbook)."""
    import pandas as pd

    return {p.stem.replace("_", " "): pd.read_csv(p, index_col=0, encoding="utf-8")
            for p in sorted(Path(folder).glob("*.csv"))}


def write_batch_workbook(tables_root, path, names=None) -> Path | None:
    """One workbook for a batch: a sheet per table of every exchanger (``tables_root/<exchanger>/*.csv``, as the
    study notebook writes them), named ``"<exchanger> <table>"``; ``names`` limits it to those exchanger folders (in
    that order). Returns None when there is no table."""
    root = Path(tables_root)
    sheets = {}
    folders = sorted(p for p in root.iterdir() if p.is_dir()) if root.is_dir() else []
    if names is not None:
        folders = [root / n for n in names if (root / n).is_dir()]
    for folder in folders:
        for name, df in collect_tables(folder).items():
            sheets[f"{folder.name} {name}"] = df
    return write_workbook(sheets, path) if sheets else None
