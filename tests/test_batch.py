"""The batched solver against the single-run solver, sample by sample.

Check values: vacsim.simulation.simulate on the same inputs (the reference solver; the batch must
reproduce it). Tolerances: both solve at the scenario's rtol (1e-6); crossings are bisected to
1e-3 s, the single run's events are located by LSODA's root finder; melt-out times differ by the
batch's lack of a terminal event (the ice's cubic tail, well under 1 s in these runs).
"""

from pathlib import Path

import numpy as np
import pytest

from vacsim.batch import BATCH_KEYS, batchable, simulate_batch
from vacsim.scenario import build_scenario, load_scenario, raw_of, set_key
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[1] / "scenarios"
UNITS = {"tub.ua": "W/K", "hose.length": "m", "tub.ice": "kg", "apparatus.leak_rate": "Pa*m^3/s"}


def _single(s, values, j):
    raw = raw_of(s)
    for key, v in values.items():
        raw = set_key(raw, key, f"{float(v[j])!r} {UNITS[key]}")
    return simulate(build_scenario(raw))


@pytest.mark.parametrize(
    "name, overrides",
    [
        ("bench-iced", ["run.duration=4 h", "run.output_interval=20 s"]),  # window closes after the ice is gone
        ("bench-iced-top-up", ["run.output_interval=20 s"]),  # schedule: ice added at 80 min, vent at 2 h 50
        ("leaky-long-hose", ["run.duration=2 h"]),  # some samples never reach the target
    ],
)
def test_batch_matches_single_runs(name, overrides):
    s = load_scenario(SCENARIOS / f"{name}.toml", overrides)
    rng = np.random.default_rng(7)
    n = 3
    values = {
        "tub.ua": (s.tub.ua or 3.0) * rng.uniform(0.7, 1.3, n),
        "hose.length": rng.uniform(0.5, 3.0, n),
        "tub.ice": max(s.tub.ice, 0.5) * rng.uniform(0.7, 1.3, n),
        "apparatus.leak_rate": s.apparatus.leak_rate * rng.uniform(0.5, 2.0, n),
    }
    b = simulate_batch(s, values)
    for j in range(n):
        ref = _single(s, values, j)  # reference: vacsim.simulation.simulate
        sm = ref.summary
        assert b.usable_duration_s[j] == pytest.approx(sm["usable_duration_s"], abs=0.05)
        if sm["time_to_target_s"] is None:
            assert np.isnan(b.time_to_target_s[j])
        else:
            assert b.time_to_target_s[j] == pytest.approx(sm["time_to_target_s"], abs=0.05)
        assert b.min_pressure_pa[j] == pytest.approx(sm["min_pressure_pa"], rel=1e-5)
        if sm["ice_gone_s"] is None:
            assert np.isnan(b.ice_gone_s[j])
        else:
            assert b.ice_gone_s[j] == pytest.approx(sm["ice_gone_s"], abs=2.0)
        assert len(b.windows[j]) == len(sm["usable_windows"])
        p_ref = np.interp(b.time_s, ref.time_s, ref.series["pressure_pa"])
        assert np.max(np.abs(b.pressure_pa[j] - p_ref) / p_ref) < 1e-4


def test_batch_of_one_equals_the_scenario():
    s = load_scenario(SCENARIOS / "bench-iced.toml", ["run.duration=1 h"])
    b = simulate_batch(s, {})
    sm = simulate(s).summary  # reference: vacsim.simulation.simulate
    assert b.pressure_pa.shape == (1, b.time_s.size)
    assert b.time_to_target_s[0] == pytest.approx(sm["time_to_target_s"], abs=0.05)
    assert b.usable_duration_s[0] == pytest.approx(sm["usable_duration_s"], abs=0.05)


def test_target_pressure_varies_per_sample():
    s = load_scenario(SCENARIOS / "bench-iced.toml", ["run.duration=30 min"])
    b = simulate_batch(s, {"target.pressure": np.array([1500.0, 800.0])})
    # 8 mbar is below the iced rig's floor (about 8.9 mbar at its lowest, from the single run)
    assert np.isfinite(b.time_to_target_s[0]) and np.isnan(b.time_to_target_s[1])
    assert b.usable_duration_s[1] == 0.0


def test_batchable_keys():
    s = load_scenario(SCENARIOS / "bench-iced.toml")
    assert batchable(s, ["tub.ua", "tub.ice", "hose.length"])
    assert not batchable(s, ["tub.liquid_volume"])  # changes the operating point and the fluid table
    assert not batchable(s, ["tub.initial_temperature"])
    assert set(BATCH_KEYS) >= {"tub.ua", "tub.ice", "hose.length", "apparatus.leak_rate", "ejector.entrainment_ratio"}
    with pytest.raises(ValueError, match="cannot vary"):
        simulate_batch(s, {"tub.liquid_volume": np.array([0.01])})
