"""Export of the report tables (CSV, Excel) and the display conventions they share with the reports."""
from __future__ import annotations

import csv
import io
import math

import numpy as np
import pandas as pd
import pytest

import revamp as rv
from revamp import options as op
from revamp.report import export, labels
from revamp.report.pages import frame_html
from revamp.units import ureg
from test_plots import EX, SVC


@pytest.fixture(scope="module")
def study():
    return rv.compare(EX, SVC, [op.Clean(), op.AddShells(1)], target="1.6 MW", limits={"dp_tube": "1 bar"},
                      economics={"energy_price": 6.0, "price_per": "MMBTU", "discount_rate": 0.08,
                                 "capex": {"clean both sides": 30e3, "add 1 shell in series": 600e3}})


@pytest.fixture(scope="module")
def result(study):
    return {"today": rv.rate(EX, SVC), "today_clean": rv.rate(EX, SVC.clean()), "revamp": rv.rate(EX, SVC),
            "revamp_clean": rv.rate(EX, SVC.clean()), "study": study, "monitoring": None}


# ------------------------------------------------------------------------------------------------ display rules
@pytest.mark.parametrize("value, text", [
    # three significant figures, separators, no exponent (engineering practice of data sheets: common practice,
    # no source)
    (5728.8, "5,730"), (74.132, "74.1"), (0.000352, "0.000352"), (9164.0, "9,160"), (1.954741e7, "19,500,000"),
    (0.5, "0.500"), (12, "12"), (0.0, "0"),
    # what pandas would print and a reader should not see
    (True, "yes"), (False, "no"), (pd.NA, "—"), (None, "—"), (float("nan"), "—"), (float("inf"), "—"),
    (np.float64(2.5), "2.50"), (np.int64(3), "3"),
])
def test_format_value(value, text):
    assert labels.format_value(value) == text


def test_one_spelling_per_unit():
    # the same unit reached us as m2K/W (monitoring summary) and m²·K/W (units.from_si): one spelling shown
    assert labels.unit_of("m2K/W") == labels.unit_of("m²K/W") == labels.unit_of("m²·K/W") == "m²·K/W"
    assert labels.unit_of("W/m2K") == "W/m²·K"
    assert labels.display_name("Rf now [m2K/W]") == "fouling resistance now (outside area) [m²·K/W]"
    assert labels.display_name("energy lost to fouling to date [J]") == "energy lost to fouling to date [GJ]"
    assert labels.display_name("duty [kW]") == "duty [MW]"
    assert labels.display_name("heat balance error median [-]") == "heat-balance error, median"


def test_display_frame_rescales_units_of_rows_and_columns():
    df = pd.DataFrame({"duty [kW]": [9164.0], "dp_tube [kPa]": [74.132]}, index=["base"])
    shown = labels.display_frame(df)
    assert list(shown.columns) == ["duty [MW]", "tube pressure drop [kPa]"]
    assert shown.iloc[0, 0] == pytest.approx(ureg.Quantity(9164.0, "kW").to("MW").magnitude)  # pint
    rows = labels.display_frame(df.T)
    assert list(rows.index) == ["duty [MW]", "tube pressure drop [kPa]"]
    # a finding given as text in J moves to GJ (pint), a text that is no number stays
    f = labels.display_frame(pd.DataFrame({"value": ["1.234e+13", "linear"]},
                                          index=["energy lost to fouling to date [J]", "model (lowest AIC)"]))
    assert f.iloc[0, 0] == pytest.approx(ureg.Quantity(1.234e13, "J").to("GJ").magnitude)
    assert f.iloc[1, 0] == "linear"


def test_frame_html_has_no_pandas_leaks():
    df = pd.DataFrame({"meets_target": [True, False], "rank": pd.array([1, pd.NA], dtype="Int64"),
                       "payback [yr]": [2.345, math.inf], "t_out_shell [°C]": [145.47391, 150.0]},
                      index=["base", "x<b>"])
    html = frame_html(df)
    for leak in ("True", "False", "&lt;NA&gt;", "<NA>", "inf", "nan", "<b>"):
        assert leak not in html, leak
    assert "shell outlet temperature [°C]" in html and "145" in html and "x&lt;b&gt;" in html


# ------------------------------------------------------------------------------------------------------ export
def test_report_tables_carry_units_and_numbers(result, study):
    tables = export.report_tables(result)
    assert set(tables) == {"ratings", "options", "options, limits and money"}
    opts = tables["options"]
    assert "duty [MW]" in opts.columns
    # W -> MW by pint (the study table keeps SI)
    assert list(opts["duty [MW]"]) == pytest.approx([ureg.Quantity(v, "W").to("MW").magnitude
                                                     for v in study.table["duty"]], rel=1e-3)
    r = tables["ratings"]
    assert "duty [MW]" in r.index and list(r.columns) == ["today", "today, clean", "revamp", "revamp, clean"]
    us = export.report_tables(result, "US")["options"]
    assert list(us["duty [MMBtu/h]"]) == pytest.approx([ureg.Quantity(v, "W").to("MMBtu/h").magnitude
                                                        for v in study.table["duty"]], rel=1e-3)


def test_csv_and_workbook(result, tmp_path):
    openpyxl = pytest.importorskip("openpyxl")
    tables = export.report_tables(result)
    paths = export.write_csv(tables, tmp_path / "csv")
    assert {p.name for p in paths} == {"ratings.csv", "options.csv", "options_limits_and_money.csv"}
    header = next(csv.reader(io.StringIO((tmp_path / "csv" / "options.csv").read_text("utf-8"))))
    assert header[0] == "case" and "duty [MW]" in header
    back = export.collect_tables(tmp_path / "csv")
    assert back["options"]["duty [MW]"].to_numpy() == pytest.approx(tables["options"]["duty [MW]"].to_numpy())
    (tmp_path / "all" / "E-1").mkdir(parents=True)
    (tmp_path / "all" / "E-2").mkdir()
    export.write_csv(tables, tmp_path / "all" / "E-1")
    export.write_csv({"ratings": tables["ratings"]}, tmp_path / "all" / "E-2")
    book = export.write_batch_workbook(tmp_path / "all", tmp_path / "batch.xlsx")
    wb = openpyxl.load_workbook(book)
    assert wb.sheetnames == ["E-1 options", "E-1 options limits and money", "E-1 ratings", "E-2 ratings"]
    ws = wb["E-1 options"]
    heads = [c.value for c in ws[1]]
    assert "duty [MW]" in heads
    col = heads.index("duty [MW]")
    assert ws.cell(row=2, column=col + 1).value == pytest.approx(float(tables["options"]["duty [MW]"].iloc[0]))
    only = openpyxl.load_workbook(export.write_batch_workbook(tmp_path / "all", tmp_path / "one.xlsx", ["E-2"]))
    assert only.sheetnames == ["E-2 ratings"]


def test_sheet_names_follow_excel_rules():
    # Excel: at most 31 characters, none of [ ] : * ? / \ (Microsoft Excel specifications and limits)
    taken: set = set()
    a = export.sheet_name("E-101/2: options, limits and money [USD]", taken)
    b = export.sheet_name("E-101/2: options, limits and money [USD]", taken)
    for name in (a, b):
        assert len(name) <= 31 and not set(name) & set("[]:*?/\\")
    assert a != b


def test_rating_frame_and_cli_csv(tmp_path):
    from revamp.cli import main
    from test_unitfile import make_unit, write_unit

    r = rv.rate(EX, SVC)
    f = export.rating_frame(r)
    duty = f.set_index("quantity").loc["duty"]
    assert duty["unit"] == "MW" and duty["value"] == pytest.approx(ureg.Quantity(float(r.duty), "W").to("MW").m)
    shares = f[f["quantity"].str.startswith("share of 1/U")]["value"]
    assert shares.sum() == pytest.approx(100.0)  # the five shares of a series sum make the whole
    unit = write_unit(tmp_path / "unit.yaml", make_unit("E-1"))
    out = tmp_path / "e1.csv"
    assert main(["rate", str(unit), "--tag", "E-1", "--csv", str(out), "--units", "US"]) == 0
    rows = list(csv.DictReader(out.open(encoding="utf-8")))
    assert rows[0]["quantity"] == "duty" and rows[0]["unit"] == "MMBtu/h"


def test_demo_caution_only_on_the_demo(tmp_path):
    from revamp.cli import demo_unit_path
    from revamp.report.pages import DEMO_CAUTION, cautions_html, provenance

    other = tmp_path / "unit.yaml"
    other.write_text("version: 1\n", encoding="utf-8")
    assert DEMO_CAUTION not in cautions_html(provenance(other)) and DEMO_CAUTION not in cautions_html()
    assert DEMO_CAUTION in cautions_html(provenance(demo_unit_path()))


def test_plant_data_findings_in_us_units():
    # a finding given in SI (monitoring summary) shown in US units: 0.000352 m²K/W × 5.678263 = 0.0019988
    # h·ft²·°F/Btu (NIST SP 811 factor); 100 °C = 212 °F
    f = labels.display_frame(pd.DataFrame({"value": ["0.000352", "100"]}, index=["Rf now [m2K/W]", "t [°C]"]),
                             system="US")
    assert list(f.index) == ["fouling resistance now (outside area) [h·ft²·°F/Btu]", "t [°F]"]
    assert f.iloc[0, 0] == pytest.approx(0.000352 * 5.678263, rel=1e-6)
    assert f.iloc[1, 0] == pytest.approx(212.0)


def test_defaults_the_rating_applied_are_shown():
    from revamp.report.pages import defaults_html

    html = defaults_html(EX)
    # every default the geometry states it applied (ShellAndTube.defaults_used) is listed, escaped
    assert EX.defaults_used and all(labels.format_value(d) and d.split(" ")[0] in html for d in EX.defaults_used)
    assert "U-tube" not in html
    u = EX.replace(rear_head="u-tube")
    assert "once per leg" in defaults_html(u)


def test_counts_stay_whole_numbers():
    # a table of counts (plant-data rows) shows 12, not 12.0
    html = frame_html(pd.DataFrame({"rows": [12, 1, 8330]}, index=["a", "b", "c"]))
    assert ">12<" in html and ">1<" in html and ">8,330<" in html
    html_us = frame_html(pd.DataFrame({"rows": [12]}, index=["a"]), system="US")
    assert ">12<" in html_us
