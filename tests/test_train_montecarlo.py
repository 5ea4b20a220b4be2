"""Monte Carlo of a train (revamp.train.montecarlo), chunked through the executor.

Source for the check of the spread: with constant-property fluids every exchanger's effectiveness is independent of
its inlet temperatures, so the furnace inlet is linear in the supply temperatures; for a linear model the Monte Carlo
standard deviation must equal the linear (first-order) propagation of JCGM 100 (GUM), |dT/dT_in|·σ, within sampling
error (the sensitivity taken from two solves).
"""
import numpy as np
import pytest
from test_train import CRUDE_C, KERO_C, RESID_C, interlinked

from revamp.errors import InputError
from revamp.executor import executor_for
from revamp.train import Furnace
from revamp.train.montecarlo import monte_carlo


@pytest.fixture(scope="module")
def train():
    return interlinked(CRUDE_C, RESID_C, KERO_C, furnace=Furnace("crude", "360 degC", 0.85, "60 MW"))


def test_spread_of_a_linear_train_matches_linear_propagation(train):
    sigma = 2.0
    mc = monte_carlo(train, draws=2000, uncertainty={"resid.t_in": f"{sigma} K"}, seed=3, chunk=500)
    lo = train.replace(streams={**train.streams, "resid": train.streams["resid"].replace(t_in=613.15 - 1.0)})
    hi = train.replace(streams={**train.streams, "resid": train.streams["resid"].replace(t_in=613.15 + 1.0)})
    slope = (float(hi.solve().furnace_inlet) - float(lo.solve().furnace_inlet)) / 2.0
    n = 2000
    assert mc.summary.loc["furnace_inlet", "std"] == pytest.approx(abs(slope) * sigma, rel=4 / np.sqrt(2 * n))
    assert mc.samples["converged"].all()


def test_chunks_and_executors_do_not_change_the_draws(train):
    unc = {"crude.flow": 0.02, "E-102.fouling_tube": 0.3}
    a = monte_carlo(train, draws=60, uncertainty=unc, seed=1, chunk=60)
    b = monte_carlo(train, draws=60, uncertainty=unc, seed=1, chunk=25, executor=executor_for("local:2"))
    assert np.allclose(a.samples.to_numpy(float), b.samples.to_numpy(float), rtol=1e-9, equal_nan=True)


@pytest.mark.parametrize("unc, field", [({"steam.flow": 0.1}, "uncertainty['steam.flow']"),
                                        ({"crude.pressure": 0.1}, "uncertainty['crude.pressure']"),
                                        ({"crude.flow": 3.0}, "uncertainty['crude.flow']"),
                                        ({"E-999.fouling_tube": 0.1}, "uncertainty['E-999.fouling_tube']")])
def test_bad_uncertainty_is_named(train, unc, field):
    with pytest.raises(InputError) as e:
        monte_carlo(train, draws=10, uncertainty=unc)
    assert e.value.field == field
