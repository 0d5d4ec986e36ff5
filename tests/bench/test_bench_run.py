"""Benchmark: a 3-hour demo run in-process, against RK45 at equal accuracy.

Run with `python -m pytest tests/bench/test_bench_run.py --benchmark-enable -s`.
Accuracy: the normalised error (y - y_ref) / (atol + rtol |y_ref|) of pressure and tub
temperature against Radau at rtol 1e-10 must be <= 1 with rtol = 1e-4, atol = 1 Pa / 1 mK.
"""

import statistics
from pathlib import Path

import numpy as np
import pytest

from vacsim.scenario import load_scenario
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[2] / "scenarios"
ACCURACY = {"pressure_pa": (1.0, 1e-4), "tub_temperature_k": (1e-3, 1e-4)}


def _error(result, reference):
    worst = 0.0
    for name, (atol, rtol) in ACCURACY.items():
        y = np.interp(reference.time_s, result.time_s, result.series[name])
        ref = reference.series[name]
        worst = max(worst, float(np.max(np.abs(y - ref) / (atol + rtol * np.abs(ref)))))
    return worst


def _loosest(scenario, method, reference):
    for rtol in (1e-3, 3e-4, 1e-4, 3e-5, 1e-5, 3e-6, 1e-6, 3e-7, 1e-7, 1e-8):
        if _error(simulate(scenario, method=method, rtol=rtol), reference) <= 1.0:
            return rtol
    raise AssertionError(f"{method} never reached the accuracy")


@pytest.mark.parametrize("name", ["bench-iced", "small-flask-strong-pump"])
def test_run_against_rk45(benchmark, heavy, median_time, name):
    s = load_scenario(SCENARIOS / f"{name}.toml")
    reference = simulate(s, method="Radau", rtol=1e-10)
    default = simulate(s)
    assert _error(default, reference) <= 1.0, "the default solve is not accurate enough"
    rk_rtol = _loosest(s, "RK45", reference)
    default_time = benchmark.pedantic(lambda: simulate(s), rounds=7, iterations=1)
    del default_time
    ours = statistics.median(benchmark.stats.stats.data)
    rk45 = median_time(lambda: simulate(s, method="RK45", rtol=rk_rtol), 3)
    print(f"\n{name}: default (LSODA, rtol {s.run.relative_tolerance:g}) median {ours * 1e3:.1f} ms; "
          f"RK45 at equal accuracy (rtol {rk_rtol:g}) {rk45 * 1e3:.0f} ms; ratio 1/{rk45 / ours:.0f}")
    benchmark.extra_info.update(rk45_s=rk45, ratio=rk45 / ours, rk45_rtol=rk_rtol)


def test_default_solve_is_accurate():
    """Always runs (cheap): the default solve meets the accuracy the benchmark compares at."""
    s = load_scenario(SCENARIOS / "bench-tap-water.toml", ["run.duration=30 min"])
    assert _error(simulate(s), simulate(s, method="Radau", rtol=1e-10)) <= 1.0
