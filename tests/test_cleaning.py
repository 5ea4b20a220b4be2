"""Cleaning schedules (revamp.cleaning): optimum cycles, crews, blackouts, turnarounds, growth laws.

The optimiser is checked first on a train whose fired duty is exactly linear in each bundle's deposit (a stand-in
evaluator written in this file), where Epstein's closed form holds exactly; then on a real one-exchanger train rated
by the engine, with the loss-rate growth b taken from two ratings.
"""
import numpy as np
import pandas as pd
import pytest

from revamp.cleaning.calendar import make_calendar
from revamp.cleaning.model import Problem, TrainState
from revamp.cleaning.schedule import POLICIES, plan
from revamp.errors import InputError
from revamp.fouling.growth import Asymptotic, Linear, growth_law

WEEK = 7 * 86400.0


def linear_train(g, beta, q_clean=50e6):
    """Fired duty = clean + Σ g_i·Rf_i, + β_i while bundle i is bypassed: exactly linear (a stand-in train)."""
    g, beta = np.asarray(g, float), np.asarray(beta, float)

    def evaluate(rf, bypass):
        k = len(rf)
        q = q_clean + (np.where(bypass, 0.0, rf) * g).sum(axis=1) + (bypass * beta).sum(axis=1)
        return TrainState(furnace_duty=q, furnace_inlet=np.full(k, 500.0), conditions=tuple(None for _ in g),
                          converged=np.ones(k, dtype=bool))

    return evaluate


def intervals(plan_, tag):
    starts = plan_.cleanings.loc[plan_.cleanings["tag"] == tag, "start"]
    return np.diff(np.concatenate([[0.0], (starts - plan_.timeline.index[0]).dt.total_seconds().to_numpy()]))


def test_epstein_optimum_cycle_on_a_linear_train():
    # Epstein (1979), Ma & Epstein (1981): a loss-cost rate rising as b·t and a cleaning cost C, no downtime, give
    # the optimum cycle tau* = sqrt(2C/b); over a finite horizon H with N cleanings the best cycles are equal,
    # H/(N+1) (Ishiyama et al. 2011). With H = 5 tau*, N = 4 and the cycles are tau* (cost 9C against 9.17C for
    # N = 5 and 9.25C for N = 3), here 20 weeks.
    rate, g, price = 1e-4 / (10 * WEEK), 5e9, 10e-9
    b = price * g * rate
    tau = 20 * WEEK
    C = 0.5 * b * tau**2
    cal = make_calendar("100 week", "1 week", "0 s", start="2027-01-04")
    pr = Problem(tags=("E-1",), laws=(Linear(rate=rate),), calendar=cal, cleaning_cost=np.array([C]),
                 fuel_price=price, evaluator=linear_train([g], [0.0]), turnaround_mask=np.zeros(1, bool))
    p = plan(pr, crews=1, time_limit=30)
    got = intervals(p, "E-1")
    assert len(got) == 4
    assert np.all(np.abs(got - tau) <= WEEK)  # within one period
    # the mean cost rate over a full cycle is sqrt(2bC) (Epstein), i.e. b tau²/2 + C = tau·sqrt(2bC) per cycle; the
    # horizon holds five runs but only four cleanings (the last run ends with the horizon): 5·b tau²/2 + 4C = 9C
    assert p.cost["fuel"] == pytest.approx(5 * 0.5 * b * tau**2, rel=0.02)
    assert p.cost["total"] == pytest.approx(5 * tau * np.sqrt(2 * b * C) - C, rel=0.02)


def test_two_identical_bundles_one_crew_never_overlap_and_plan_beats_every_reference():
    # Requirement: with one crew, two cleanings never overlap; the plan costs no more than any reference policy.
    rate, g, price = 1.5e-4 / (10 * WEEK), 4e9, 9e-9
    laws = (Linear(rate=rate, rf_now=1e-4), Linear(rate=rate, rf_now=1e-4))
    cal = make_calendar("2 yr", "1 week", "2 week", start="2027-01-04")
    pr = Problem(tags=("A", "B"), laws=laws, calendar=cal, cleaning_cost=np.array([40e3, 40e3]), fuel_price=price,
                 evaluator=linear_train([g, g], [1e6, 1e6]), turnaround_mask=np.zeros(2, bool))
    p = plan(pr, crews=1, time_limit=30)
    c = p.cleanings.sort_values("start")
    assert len(c) >= 2
    assert np.all(c["start"].to_numpy()[1:] >= c["end"].to_numpy()[:-1])  # one bundle out at a time
    for policy in POLICIES:
        if policy in p.compare.index:
            assert p.compare.loc["plan", "total"] <= p.compare.loc[policy, "total"] * (1 + 1e-12)
    # the identical bundles are treated alike: the same number of cleanings each (the optimum is symmetric)
    assert abs((c["tag"] == "A").sum() - (c["tag"] == "B").sum()) <= 1


def test_blackout_is_respected_and_turnaround_cleans_every_bundle():
    # Requirements: no bundle out of service inside a blackout; every bundle cleaned at a planned turnaround.
    rate, g, price = 3e-4 / (10 * WEEK), 6e9, 9e-9
    laws = (Linear(rate=rate), Asymptotic(rf_inf=6e-4, time_constant=12 * WEEK))
    black = ("2027-06-01", "2027-09-30")
    cal = make_calendar("2 yr", "1 week", "1 week", start="2027-01-04", blackouts=[black],
                        turnaround="2028-03-06", turnaround_length="4 week")
    pr = Problem(tags=("A", "B"), laws=laws, calendar=cal, cleaning_cost=np.array([20e3, 20e3]), fuel_price=price,
                 evaluator=linear_train([g, g], [5e5, 5e5]), turnaround_mask=np.ones(2, bool))
    p = plan(pr, crews=1, time_limit=30)
    c = p.cleanings
    lo, hi = pd.Timestamp(black[0]), pd.Timestamp(black[1])
    planned = c[~c["at_turnaround"]]
    assert not ((planned["start"] <= hi) & (planned["end"] > lo)).any()
    at_t = c[c["at_turnaround"]]
    assert sorted(at_t["tag"]) == ["A", "B"]
    assert (at_t["start"] == pd.Timestamp("2028-03-06")).all()
    # the unit burns no fuel while it is down for the turnaround
    assert p.timeline.loc["2028-03-06":"2028-03-27", "unit_down"].all()


def test_asymptotic_step_matches_kern_seaton_closed_form():
    # Kern & Seaton (1959): Rf(t) = Rf_inf (1 - exp(-t/tau)); stepping in 10 pieces gives the closed form exactly.
    law = Asymptotic(rf_inf=5e-4, time_constant="30 day")
    rf = 0.0
    for _ in range(10):
        rf = law.step(rf, 3 * 86400.0)
    assert rf == pytest.approx(5e-4 * (1 - np.exp(-1.0)), rel=1e-12)


def test_linear_law_reads_units_and_fit_continues_from_its_last_value():
    # 1e-5 m²K/W per day is 1e-5/86400 per second (definition of the unit).
    law = Linear(rate="1e-5 m**2*K/W/day")
    assert law.rate == pytest.approx(1e-5 / 86400.0, rel=1e-12)
    from revamp.fouling.models import fit_linear

    t = np.linspace(0, 100 * 86400.0, 50)
    fit = fit_linear(t, 1e-5 + 2e-11 * t)  # exact line: a = 1e-5, b = 2e-11
    cont = growth_law(fit)
    assert cont.rate == pytest.approx(2e-11, rel=1e-6)
    assert cont.rf_now == pytest.approx(1e-5 + 2e-11 * t[-1], rel=1e-6)


@pytest.mark.parametrize("kwargs, field", [
    (dict(horizon="1 day", period="1 week"), "horizon"),
    (dict(downtime="1 yr"), "downtime"),
    (dict(blackouts=[("2027-05-01",)]), "blackouts[0]"),
    (dict(blackouts=[("2027-05-01", "2027-04-01")]), "blackouts[0]"),
    (dict(turnaround="2040-01-01"), "turnaround[0]"),
    (dict(start="not a date"), "start"),
])
def test_calendar_errors_name_the_field(kwargs, field):
    args = dict(horizon="1 yr", period="1 week", downtime="1 week", start="2027-01-04")
    args.update(kwargs)
    with pytest.raises(InputError) as e:
        make_calendar(**args)
    assert e.value.field == field


def test_growth_law_refuses_other_things():
    with pytest.raises(InputError) as e:
        growth_law("linear", "fouling['E-1']")
    assert e.value.field == "fouling['E-1']"
    with pytest.raises(InputError):
        Linear(rate=-1e-11)


# ---------------------------------------------------------------------------------------------- on a real train
def one_exchanger_train():
    """An invented crude/residue exchanger as a one-match train feeding a furnace (petroleum properties)."""
    import revamp as rv
    from revamp.train import Furnace, Match, Train

    crude = rv.fluids.petroleum(api=31, watson_k=11.8, viscosity=[("40 degC", "9 cSt"), ("100 degC", "3 cSt")])
    resid = rv.fluids.petroleum(api=18, watson_k=11.6, viscosity=[("100 degC", "30 cSt"), ("150 degC", "9 cSt")])
    hx = rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
                         tube_count=500, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="450 mm",
                         baffle_cut=0.25, tube_material="carbon steel")
    return Train(streams={"crude": rv.Stream(crude, "60 kg/s", "150 degC"),
                          "resid": rv.Stream(resid, "30 kg/s", "330 degC")},
                 exchangers={"E-1": Match(hx, shell="resid", tube="crude", fouling_shell=2e-4)},
                 routes={"crude": ["E-1"], "resid": ["E-1"]},
                 furnace=Furnace("crude", "360 degC", 0.85))


def test_epstein_interval_on_a_real_train_with_b_from_two_ratings():
    # Epstein (1979): tau* = sqrt(2C/b), b the growth of the loss-cost rate, here from two ratings of the engine
    # (the train clean, and with the deposit of mid-cycle: a secant); with H = 5 tau* the cycles are tau* (see above).
    from revamp.cleaning import schedule_cleaning

    train = one_exchanger_train()
    rate = 1e-4 / (20 * WEEK)  # small enough that the lost duty is close to linear in the deposit over a cycle
    price_gj = 9.0
    q0 = float(train.solve().furnace_duty)
    t1 = 10 * WEEK
    q1 = float(train.replace(exchangers={"E-1": train.exchangers["E-1"].replace(fouling_tube=rate * t1)}).solve()
               .furnace_duty)
    b = price_gj * 1e-9 * (q1 - q0) / t1
    assert b > 0
    tau = 20 * WEEK
    C = 0.5 * b * tau**2
    plan_ = schedule_cleaning(train, {"E-1": Linear(rate=rate)}, horizon="100 week", period="1 week",
                              cleaning_cost=C, downtime="0 s", crews=1, fuel_price=f"{price_gj} USD/GJ",
                              start="2027-01-04", time_limit="60 s")
    got = intervals(plan_, "E-1")
    assert len(got) == 4
    assert np.all(np.abs(got - tau) <= WEEK)
    assert plan_.currency == "USD"
    # the timeline is the engine's: the fired duty of the first period is that of the train with its mid-period deposit
    first = float(train.replace(exchangers={"E-1": train.exchangers["E-1"].replace(fouling_tube=rate * 0.5 * WEEK)})
                  .solve().furnace_duty)
    assert plan_.timeline["furnace_duty"].iloc[0] == pytest.approx(first, rel=1e-6)


def test_schedule_cleaning_errors_name_the_field():
    from revamp.cleaning import schedule_cleaning

    train = one_exchanger_train()
    law = {"E-1": Linear(rate=1e-11)}
    for kwargs, field in [(dict(fouling={"E-9": Linear(rate=1e-11)}), "fouling['E-9']"),
                          (dict(fuel_price="9 USD/barrel"), "fuel_price"),
                          (dict(crews=0), "crews"),
                          (dict(cleaning_cost={"E-1": -5}), "cleaning_cost['E-1']"),
                          (dict(sides={"E-1": "both"}), "sides['E-1']")]:
        args = dict(fouling=law, horizon="20 week", period="1 week", fuel_price="9 USD/GJ", start="2027-01-04")
        args.update(kwargs)
        with pytest.raises(InputError) as e:
            schedule_cleaning(train, **args)
        assert e.value.field == field


# ---------------------------------------------------------------------------------------------- plan uncertainty
def test_plan_monte_carlo_without_spread_gives_the_plans_own_costs_and_a_cluster_the_same_draws():
    # With no spread every draw is the fitted laws: each policy's total must be the plan's own comparison table
    # (the same model evaluated again); with a spread the draws must not depend on where they run.
    from revamp.cleaning import plan_monte_carlo, schedule_cleaning
    from revamp.executor import executor_for

    train = one_exchanger_train()
    plan_ = schedule_cleaning(train, {"E-1": Linear(rate=1e-4 / (8 * WEEK))}, horizon="40 week", period="1 week",
                              cleaning_cost=30000.0, downtime="0 s", fuel_price="9 USD/GJ", start="2027-01-04",
                              time_limit="30 s")
    flat = plan_monte_carlo(plan_, draws=3, spread=0.0)
    for name in flat.totals.columns:
        assert flat.totals[name].to_numpy() == pytest.approx(plan_.compare.loc[name, "total"], rel=1e-9)
    a = plan_monte_carlo(plan_, draws=6, spread=0.4, seed=2, chunk=6)
    b = plan_monte_carlo(plan_, draws=6, spread=0.4, seed=2, chunk=2, executor=executor_for("local:2"))
    assert np.allclose(a.totals.to_numpy(), b.totals.to_numpy(), rtol=1e-9)
    assert ((a.summary["plan_wins"] >= 0) & (a.summary["plan_wins"] <= 1)).all()
