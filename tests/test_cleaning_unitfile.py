"""The unit file's cleaning section: every inconsistency named by path, the plan built from the file, the page.

Units and numbers are invented; the expected values are the file's own (the loader must only translate it) and the
paths the file's layout gives.
"""
import copy

import pytest
from test_train_unitfile import unit_doc, write

from revamp import unitfile
from revamp.fouling.growth import Asymptotic, Linear

SECTION = {"horizon": "40 week", "period": "1 week", "crews": 1, "cleaning_cost": 50000, "downtime": "5 day",
           "start": "2027-01-04", "time_limit": "20 s",
           "exchangers": {"E-1": {"fouling": {"model": "linear", "rate": "1e-6 m**2*K/W/day"}},
                          "E-2": {"fouling": {"model": "asymptotic", "rf_inf": "5e-4 m**2*K/W",
                                              "time_constant": "60 day"}, "cleaning_cost": "80000 USD"}}}


def doc_with(section=None, **changes):
    doc = unit_doc()
    doc["economics"] = {"currency": "USD", "energy_price": "9 USD/GJ"}
    doc["cleaning"] = copy.deepcopy(SECTION if section is None else section)
    for key, value in changes.items():
        doc["cleaning"][key] = value
    return doc


def test_section_loads_in_si_and_builds_the_schedule_arguments(tmp_path):
    from revamp.unitfile._cleaning import cleaning_inputs

    unit = unitfile.load(write(tmp_path, doc_with()))
    kw = cleaning_inputs(unit)
    assert kw["horizon"] == pytest.approx(40 * 7 * 86400.0)  # 40 weeks in seconds (definition)
    assert kw["downtime"] == pytest.approx(5 * 86400.0)
    assert kw["cleaning_cost"] == {"E-1": 50000.0, "E-2": 80000.0}
    assert isinstance(kw["fouling"]["E-1"], Linear)
    assert kw["fouling"]["E-1"].rate == pytest.approx(1e-6 / 86400.0)
    assert isinstance(kw["fouling"]["E-2"], Asymptotic)
    assert kw["fouling"]["E-2"].time_constant == pytest.approx(60 * 86400.0)
    assert kw["fuel_price"] == "9 USD/GJ"


@pytest.mark.parametrize("change, path, words", [
    ({"exchangers": {"E-9": {"fouling": {"model": "linear", "rate": 1e-11}}}}, "cleaning.exchangers.E-9",
     "route of the network"),
    ({"exchangers": {"E-1": {"fouling": {"model": "asymptotic", "rf_inf": 5e-4}}}},
     "cleaning.exchangers.E-1.fouling.time_constant", "asymptotic"),
    ({"exchangers": {"E-1": {"fouling": {"model": "plant_data"}}}}, "cleaning.exchangers.E-1.fouling.model",
     "no plant_data"),
    ({"exchangers": {"E-1": {}}}, "cleaning.exchangers.E-1.fouling", "no plant"),
    ({"crews": 0}, "cleaning.crews", ""),
    ({"horizon": "3 parsecs"}, "cleaning.horizon", ""),
    ({"exchangers": {"E-1": {"fouling": {"model": "linear", "rate": "-1e-11 m**2*K/W/s"}}}},
     "cleaning.exchangers.E-1.fouling.rate", ""),
])
def test_check_names_every_problem_of_the_section(tmp_path, change, path, words):
    doc = doc_with()
    doc["cleaning"].update(change)
    problems = unitfile.check(write(tmp_path, doc))
    hits = [p for p in problems if p.path == path]
    assert hits, [str(p) for p in problems]
    assert words in str(hits[0])


def test_the_section_needs_a_network_with_a_furnace(tmp_path):
    doc = doc_with()
    del doc["network"]["furnace"]
    assert any(p.path == "cleaning" and "furnace" in str(p) for p in unitfile.check(write(tmp_path, doc)))


def test_cleaning_page_is_written_and_linked(tmp_path):
    from revamp.batch_cleaning import CLEANING_FILE, index_section, run_cleaning_page

    path = write(tmp_path, doc_with())
    res = run_cleaning_page({"unit_file": str(path), "out": str(tmp_path)})
    assert res["status"] == "ok", res["reason"]
    page = (tmp_path / CLEANING_FILE).read_text(encoding="utf-8")
    assert "When each bundle is cleaned" in page and "Cautions" in page
    assert f'href="{CLEANING_FILE}"' in index_section(res)
    assert res["summary"]["saving"] >= 0.0  # never worse than a reference policy


def test_the_demo_unit_has_a_valid_cleaning_section():
    from revamp.cli import demo_unit_path

    unit = unitfile.load(demo_unit_path())
    assert unit.cleaning is not None and unit.network is not None
