"""The report says the user's own case in the user's words: which side's flow the revamp scaled and which inlet
moved, each fluid by the name the unit file gives it with its property source on a plain line (pressures in bar),
the fouling trend's time constant in days, and temperatures in the report's unit rather than kelvin.

Expected values come from the inputs written here (a flow times the stated factor, a pressure in Pa divided by 1e5
for bar, seconds divided by 86,400 for days: SI definitions, NIST SP 811)."""
from __future__ import annotations

import re

import pytest
from test_unitfile import make_unit, write_unit

from revamp import Service, Stream, unitfile
from revamp.fluids import constant
from revamp.fouling import FoulingFit
from revamp.report.case import case_header_html, fit_text, notes_legend, revamp_lines
from revamp.studies import Note

OIL = constant(850.0, 2200.0, 2e-3, 0.12, name="diesel product")
CW = constant(995.0, 4180.0, 8e-4, 0.6, name="cooling water")


def test_revamp_lines_say_which_side_was_scaled_and_which_inlet_moved():
    today = Service(shell=Stream(OIL, 18.0, 393.15), tube=Stream(CW, 45.0, 303.15))
    revamp = Service(shell=Stream(OIL, 18.0 * 1.15, 393.15), tube=Stream(CW, 45.0, 305.15))
    lines = revamp_lines(today, revamp, 1.15)
    assert lines[0] == "throughput × 1.15"
    # 18 kg/s × 1.15 = 20.7 kg/s; the cooling water's flow is untouched, its inlet 30 -> 32 °C (303.15/305.15 K)
    assert lines[1] == "shell side (diesel product): flow × 1.15, 18 → 20.7 kg/s; inlet as today"
    assert lines[2] == "tube side (cooling water): flow as today; inlet 30 → 32 °C"
    us = revamp_lines(today, revamp, 1.15, "US")
    # 30 °C = 86 °F and 32 °C = 89.6 °F (°F = °C × 1.8 + 32)
    assert us[2] == "tube side (cooling water): flow as today; inlet 86 → 89.6 °F"


def test_header_shows_the_users_fluid_name_and_the_source_in_bar(tmp_path):
    doc = make_unit("E-1")
    x = doc["exchangers"][0]
    x["tube_side"]["fluid"] = {"kind": "water", "name": "cooling water", "pressure": "4 bar"}
    x["revamp"] = {"throughput": 1.2, "side": "shell", "t_in": {"tube": "32 degC"}}
    unit = unitfile.load(write_unit(tmp_path / "u.yaml", doc))
    case = unit.exchangers[0]
    html = case_header_html(case, unit)
    text = re.sub(r"<[^>]+>", "\n", html)
    assert "cooling water: 12 kg/s, in at 30 °C" in text
    assert "properties: IAPWS-95 (through CoolProp), liquid at 4 bar" in text  # 400,000 Pa = 4 bar
    assert "Pa" not in text and "400000" not in text and "CoolProp)" not in text.split("properties")[0]
    # 10 kg/s × 1.2 = 12 kg/s on the shell side only; the tube inlet moved from 30 to 32 °C
    assert "shell side (test oil): flow × 1.2, 10 → 12 kg/s; inlet as today" in text
    assert "tube side (cooling water): flow as today; inlet 30 → 32 °C" in text


def test_fit_text_gives_the_time_constant_in_days_and_no_exponent():
    # tau = 4.065e6 s = 47.05 days (86,400 s per day); Rf_inf 2.309e-4 m²K/W = 2.31 × 10⁻⁴ m²·K/W
    fit = FoulingFit("asymptotic", {"Rf0": -3.59e-5, "Rf_inf": 2.309e-4, "tau": 4.065e6},
                     {"Rf0": 1.6e-6, "Rf_inf": 1.6e-6, "tau": 4.9e4}, r2=0.791, rmse=2.6e-5, aic=-175105.3, n=8292,
                     t_end=3.15e7)
    text = fit_text(fit)
    assert "time constant = 47.0 ± 0.57 [days]" in text  # 4.9e4 s / 86,400 = 0.567 days
    assert "asymptotic Rf = 2.31 ± 0.016 [10⁻⁴ m²·K/W]" in text
    assert "e+" not in text and "e-" not in text and "tau" not in text


@pytest.mark.parametrize("system, expected", [("SI", "T = 127 °C is outside its range 40 to 100 °C"),
                                              ("US", "T = 261 °F is outside its range 104 to 212 °F")])
def test_rating_notes_give_temperatures_in_the_report_unit(system, expected):
    # 400.15 K = 127 °C = 260.6 °F; 313.15 K = 40 °C = 104 °F; 373.15 K = 100 °C = 212 °F (NIST SP 811)
    note = Note("today", "t_out_shell", "warning",
                "shell side: oil: T = 400.15 K is outside its range 313.15 to 373.15 K (1 of 2 temperatures)")
    _, table = notes_legend([note], system)
    row = table.iloc[0]
    assert expected in row["note"] and " K" not in row["note"]
    assert row["qualifies"] == "shell outlet temperature"


def test_plant_data_findings_in_display_units(monkeypatch):
    # the findings table: resistances on the charts' 10⁻⁴ m²·K/W, the rate per year (365.25 days), the heat-balance
    # error in per cent, counts as whole numbers, column identifiers in words
    from types import SimpleNamespace

    import revamp.plots_monitoring as pm
    from revamp.report.case import monitoring_items

    for name in ("fouling_trend", "heat_balance", "duty_lost"):
        monkeypatch.setattr(pm, name, lambda *a, **k: None)
    summary = {"rows: missing tube_flow": 3, "Rf now [m2K/W]": -6.73e-05, "fouling rate now [m2K/W per day]": 2.1e-09,
               "heat balance error median [-]": -0.0236, "steady filter: removed, tube_t_in range > 2 K": 99,
               "warnings": "shell side: oil: T = 401.02 K is outside its range 313.15 to 373.15 K"}
    result = SimpleNamespace(monitoring=SimpleNamespace(summary=summary, trend=None))
    items = monitoring_items(result)
    findings, rows = items[0], items[1]
    assert findings.loc["Rf now [10⁻⁴ m²·K/W]", "value"] == pytest.approx(-0.673)
    assert findings.loc["fouling rate now [10⁻⁴ m²·K/W per year]", "value"] == pytest.approx(2.1e-9 * 1e4 * 365.25)
    assert findings.loc["heat balance error median [%]", "value"] == pytest.approx(-2.36)
    assert findings.loc["steady filter: removed, tube inlet temperature range > 2 K", "value"] == 99
    assert list(rows.index) == ["missing tube-side flow"]
    # 401.02 K = 127.87 °C, 313.15 K = 40 °C, 373.15 K = 100 °C
    assert items[-1] == "Notes from the analysis: shell side: oil: T = 128 °C is outside its range 40 to 100 °C"
