"""The studies layer: one exchanger's study as a frozen, typed result; inlets from the caller; every rating warning
as a typed note shown in the report beside the number it qualifies.

Expected numbers are direct ``rv.rate``/``rv.compare`` calls on the services the rule names (the orchestration must
reproduce them); which quantity a warning qualifies is our own rule (common practice, no source), checked on the
warning texts the correlations write.
"""
import dataclasses
from types import SimpleNamespace

import pandas as pd
import pytest

import revamp as rv
from revamp import options as op
from revamp import report
from revamp.errors import InputError
from revamp.studies import ExchangerStudy, Note, Setting, rating_notes, study_exchanger, warning_quantity

OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=0.4e-3, conductivity=0.132)
CRUDE = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)
EX = rv.ShellAndTube(shell_id="21.25 in", tube_od="1 in", tube_wall="0.095 in", tube_length="16 ft", tube_count=158,
                     tube_passes=4, tube_pitch="1.25 in", layout=90, baffle_spacing="5 in", baffle_cut=0.25,
                     tube_material="carbon steel")
SVC = rv.Service(shell=rv.Stream(OIL, "43800 lb/h", "390 degF"), tube=rv.Stream(CRUDE, "149000 lb/h", "100 degF"),
                 fouling_shell=2e-4, fouling_tube=5e-4)
OPTIONS = (op.AddShells(1), op.TwistedTape(4.0))


def make_case(**changes):
    """A case as the unit file builds it (only the fields the study reads)."""
    fields = dict(tag="E-9", exchanger=EX, service=SVC, revamp_service=SVC.scaled(1.2), options=OPTIONS,
                  target={"duty": 1.6e6}, limits={"vibration": False}, economics=None, plant_data=None,
                  fouling_side=None, cycle_from={})
    fields.update(changes)
    return SimpleNamespace(**fields)


@pytest.fixture(scope="module")
def result():
    return study_exchanger(make_case(), mc_draws=0)


def test_the_study_is_a_frozen_typed_result(result):
    assert isinstance(result, ExchangerStudy)
    with pytest.raises(dataclasses.FrozenInstanceError):
        result.today = None
    # the four base-case ratings are those of the case's services, today and at the revamp conditions
    for r, svc in ((result.today, SVC), (result.today_clean, SVC.clean()), (result.revamp, SVC.scaled(1.2)),
                   (result.revamp_clean, SVC.scaled(1.2).clean())):
        assert float(r.duty) == pytest.approx(float(rv.rate(EX, svc).duty), rel=1e-12)
    assert isinstance(result.fouling_side, Setting)
    # the design fouling 5e-4 inside the tube is the larger on the outside area: inferred, and said so
    assert result.fouling_side.value == "tube" and result.fouling_side.source.startswith("inferred")
    assert any(n.quantity == "fouling_side" and n.severity == "info" for n in result.notes)
    assert result.study is not None and result.cycle is None and result.monitoring is None
    assert all(isinstance(n, Note) for n in result.notes)


def test_the_option_study_is_the_compare_of_the_case(result):
    direct = rv.compare(EX, SVC, list(OPTIONS), target=1.6e6, limits={"vibration": False}, revamp=SVC.scaled(1.2))
    pd.testing.assert_frame_equal(result.study.table, direct.table)


def test_inlets_from_the_caller_replace_the_cases_own():
    # a train solve gives this exchanger other inlets: the study rates and compares at those
    today = SVC.replace(tube=SVC.tube.replace(t_in=330.0))
    revamp = today.scaled(1.1)
    res = study_exchanger(make_case(), service_today=today, service_revamp=revamp, mc_draws=0)
    assert float(res.today.duty) == pytest.approx(float(rv.rate(EX, today).duty), rel=1e-12)
    assert float(res.revamp.duty) == pytest.approx(float(rv.rate(EX, revamp).duty), rel=1e-12)
    assert res.study.table.loc["base", "duty"] == pytest.approx(float(rv.rate(EX, revamp).duty), rel=1e-12)
    assert res.service_today is today and res.service_revamp is revamp
    assert "caller" in res.inlets and any("train solve" in n.text for n in res.notes)


def test_policy_settings_can_be_given_and_bad_ones_are_refused():
    res = study_exchanger(make_case(rank_by="duty_gain"), mc_draws=0)
    assert res.study.rank_by == "duty_gain"
    # no fouling trend: a cycle-average basis falls back to end of run, with a note saying so
    res = study_exchanger(make_case(), basis="cycle_average", mc_draws=0)
    assert res.study.basis == "end_of_run" and any(n.quantity == "judged_on" for n in res.notes)
    with pytest.raises(InputError, match="rank_by"):
        study_exchanger(make_case(), rank_by="fastest", mc_draws=0)
    with pytest.raises(InputError, match="Note.severity"):
        Note("today", "duty", "fatal", "x")


@pytest.mark.parametrize("text, quantity", [
    ("Gnielinski (1976): Re = 2000 is outside its validity range 3000 to 5e+06", "h_tube"),
    ("tube side: transitional flow (2300 < Re < 1e4) in 1 case(s): Nu from the Gnielinski (2013) blend", "h_tube"),
    ("García wire coil: p/d = 3 is outside its validity range 1.17 to 2.68", "h_tube"),
    ("Bell-Delaware: leakage correction Jl = 0.57 < 0.6: baffle leakage streams are large", "h_shell"),
    ("Kern (1950) shell-side h: Re = 100 is outside its validity range 2000 to 1e+06", "h_shell"),
    ("shell side: wall temperature outside the range of water (273.2..372.8 K)", "t_out_shell"),
    ("tube side: ASTM D341 Walther form: viscosity [cSt] = 1.5 is outside its validity range 2 to inf", "t_out_tube"),
    ("property iteration: outlet temperatures settled only to within 0.1 K", "duty"),
    ("geometry: baffle spacing outside the range", "duty"),
])
def test_each_warning_names_the_quantity_it_qualifies(text, quantity):
    # the correlations' own warning texts (revamp/correlations, revamp/rating.py); the mapping is our rule
    assert warning_quantity(text) == quantity


def test_every_rating_warning_is_a_note(result):
    assert result.today.warnings  # the premise: this case warns (transitional tube flow, Bell-Delaware Jl and Jb)
    for label, r in result.ratings.items():
        assert {n.text for n in result.notes_for(source=label)} >= set(r.warnings)
    for label in result.study.table.index:
        assert {n.text for n in result.notes_for(source=str(label))} >= set(result.study.ratings[label].warnings)
    assert all(n.severity == "warning" for n in rating_notes("today", result.today))


def _cell_marks(cell: str) -> dict:
    """``"today [1] [2]; revamp (clean) [1]"`` -> {"today": {1, 2}, "revamp (clean)": {1}} (the notes column)."""
    out = {}
    for part in filter(None, cell.split("; ")):
        label, _, marks = part.partition(" [")
        out[label] = {int(m.strip("[] ")) for m in ("[" + marks).split() if m}
    return out


def test_the_report_shows_each_warning_beside_the_number_it_qualifies(result):
    from revamp.report.case import notes_legend

    table, _, legend = report.rating_items(result)[:3]
    notes = [n for n in result.notes if n.source in result.ratings]
    marks, _ = notes_legend(notes)
    assert len(notes) >= 3  # the premise: this case warns (transitional tube flow, Bell-Delaware Jl and Jb)
    for n in notes:
        row = next(i for i in table.index if i.startswith(n.quantity + " ["))
        assert marks[n] in _cell_marks(table.loc[row, "notes"])[n.source]
        # the legend's line for that number says what the warning says (up to its first "= value")
        assert legend.loc[f"[{marks[n]}]", "note"].startswith(n.text.split("= ")[0])
    # the option rows carry their own ratings' notes in the study table, with the legend after it
    items = report.study_items(result)
    study_tab = next(x for x in items if isinstance(x, pd.DataFrame) and "notes" in x.columns)
    rows = {str(i) for i in result.study.table.index}
    notes = [n for n in result.notes if n.source in rows]
    marks, _ = notes_legend(notes)
    for label in result.study.table.index:
        assert {n.text for n in notes if n.source == str(label)} == set(result.study.ratings[label].warnings)
    from revamp.report.labels import NAMES

    for n in notes:  # the notes column names each quantity in words (shell outlet temperature [1])
        assert marks[n] in _cell_marks(study_tab.loc[n.source, "notes"])[NAMES.get(n.quantity, n.quantity)]


def test_notes_saying_the_same_with_other_values_share_a_number_and_state_the_range():
    from revamp.report.case import notes_legend

    text = "shell side: residue: API MPMS 11.1 density: T = {} K is outside its valid range 255.37 to 422.04 K"
    notes = [Note("today", "t_out_shell", "warning", text.format("613.15")),
             Note("revamp", "t_out_shell", "warning", text.format("533.88")),
             Note("revamp", "h_tube", "warning", "Gnielinski (1976): Pr = 0.3 is outside its validity range")]
    marks, legend = notes_legend(notes)
    assert marks[notes[0]] == marks[notes[1]] != marks[notes[2]]
    # shown in the report's °C: 533.88 K = 260.7 °C, 613.15 K = 340 °C, 255.37 K = -17.8 °C, 422.04 K = 148.9 °C
    assert legend.loc["[1]", "note"] == ("shell side: residue: API MPMS 11.1 density: T = 261 to 340 °C is outside "
                                         "its valid range -18 to 149 °C")
    assert legend.loc["[1]", "where"] == "today, revamp"


def test_the_report_states_the_basis_the_value_and_the_ranking_rule():
    econ = rv.economics.Economics(energy_price=8.0, discount_rate=0.1, capex={o.label: 1e5 for o in OPTIONS})
    res = study_exchanger(make_case(economics=econ), mc_draws=0)
    text = " ".join(x for x in report.study_items(res) if isinstance(x, str))
    assert "judged on one basis" in text and "end of run" in text
    assert "Value basis 'fuel'" in text and "fired fuel" in text
    assert "never ranks above" in text and "net present value" in text
    money = report.study_money_table(res.study)
    assert (money["value basis"].iloc[1:] == "fuel").all() and "rank (by npv)" in money.columns


def test_the_recommendation_points_at_the_notes_of_the_first_ranked_option(result):
    from revamp.report.case import notes_legend

    best = str(result.study.ranked().index[0])
    rows = {str(i) for i in result.study.table.index}
    notes = [n for n in result.notes if n.source in rows]
    marks, _ = notes_legend(notes)
    html = report.recommendation_html(result)
    assert result.study.ratings[best].warnings  # the premise: the first-ranked option's rating warns
    for n in notes:
        if n.source == best:
            assert f"[{marks[n]}]" in html


def test_the_index_summary_carries_the_decision_bases():
    import json

    econ = rv.economics.Economics(value_basis="throughput", capacity_flow=1.0, capacity_margin=0.01,
                                  discount_rate=0.1, capex={o.label: 1e5 for o in OPTIONS})
    res = study_exchanger(make_case(economics=econ), mc_draws=0)
    out = json.loads(json.dumps(report.summary(res)))
    assert out["value_basis"] == "throughput" and out["rank_by"] == "npv" and out["judged_on"] == "end_of_run"
    assert out["warnings"] == sum(1 for n in res.notes if n.severity == "warning") > 0
