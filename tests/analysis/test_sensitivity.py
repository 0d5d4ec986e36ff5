"""Morris elementary effects (vacsim.analysis.sensitivity)."""

from pathlib import Path

import numpy as np
import pytest

from vacsim.analysis.sensitivity import elementary_effects, morris_trajectories, run_sensitivity
from vacsim.analysis.uncertain import parse_uncertain
from vacsim.errors import InputError
from vacsim.scenario import load_scenario

SCENARIOS = Path(__file__).parents[2] / "scenarios"


def test_trajectories_move_one_input_at_a_time():
    k, r, p = 3, 6, 4
    points, moved, steps = morris_trajectories(k, r, p, seed=2)
    delta = p / (2 * (p - 1))  # Morris (1991) eq. for the step on a p-level grid
    assert points.shape == (r * (k + 1), k)
    assert np.all((points >= 0) & (points <= 1 + 1e-12))
    levels = np.arange(p) / (p - 1)
    assert np.all(np.min(np.abs(points[..., None] - levels), axis=-1) < 1e-12)  # on the grid
    traj = points.reshape(r, k + 1, k)
    for t in range(r):
        diffs = np.diff(traj[t], axis=0)
        assert np.all(np.count_nonzero(np.abs(diffs) > 1e-12, axis=1) == 1)
        assert np.allclose(np.abs(diffs).sum(axis=1), delta)
        assert sorted(moved[t]) == list(range(k))  # each input moves once


def test_linear_model_effects_are_its_slopes():
    # For y = sum a_i x_i every elementary effect equals a_i (Morris 1991, sec. 2: EE is the
    # incremental ratio, exact for a linear model), so mu* = |a_i| and sigma = 0.
    a = np.array([3.0, -1.0, 0.2])
    points, moved, steps = morris_trajectories(3, 8, 4, seed=1)
    ee = elementary_effects(points @ a, moved, steps)
    assert np.allclose(ee, a)


def test_bad_design_inputs():
    with pytest.raises(InputError):
        morris_trajectories(2, r=1)
    with pytest.raises(InputError):
        morris_trajectories(2, levels=3)


def test_iced_demo_ranks_ua_and_ice_above_hose_length():
    # the screening: tub.ua +-30 %, tub.ice +-30 %, hose.length 0.5-3 m, Morris r = 10
    s = load_scenario(SCENARIOS / "bench-iced-uncertain.toml")
    dists = parse_uncertain({
        "tub.ua": {"uniform": ["2.1 W/K", "3.9 W/K"]},
        "tub.ice": {"uniform": ["1.05 kg", "1.95 kg"]},
        "hose.length": {"uniform": ["0.5 m", "3 m"]},
    })
    result = run_sensitivity(s, trajectories=10, seed=0, distributions=dists, jobs=1)
    ranking = [row["key"] for row in result.ranking()]
    assert ranking.index("hose.length") == 2
    mu = {row["key"]: row["mu_star"] for row in result.ranking()}
    assert min(mu["tub.ua"], mu["tub.ice"]) > 10 * mu["hose.length"]
    # signs: more heat gain shortens the window, more ice lengthens it (physical expectation)
    signed = dict(zip(result.keys, result.mu))
    assert signed["tub.ua"] < 0 < signed["tub.ice"]
    data = result.to_json()
    assert data["method"] == "morris" and {"key", "mu_star", "sigma"} <= data["ranking"][0].keys()


def test_unbounded_distributions_use_their_5_95_quantiles():
    s = load_scenario(SCENARIOS / "bench-iced-uncertain.toml", ["run.duration=1 h"])
    dists = parse_uncertain({"tub.ua": {"normal": ["3 W/K", "0.5 W/K"]}})
    result = run_sensitivity(s, trajectories=2, seed=0, distributions=dists, jobs=1)
    # 3 -+ 1.644854 * 0.5 (Abramowitz & Stegun 1964, Table 26.5)
    assert result.ranges[0] == pytest.approx((3 - 1.644854 * 0.5, 3 + 1.644854 * 0.5), rel=1e-5)
