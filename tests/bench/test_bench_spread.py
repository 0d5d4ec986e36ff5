"""Benchmark: 1000 samples of a 3-hour run on 2 cores against the single-run median.

Run with `python -m pytest tests/bench/test_bench_spread.py --benchmark-enable -s`.
Target (issue 7): the 1000 samples cost at most 250 single-run medians measured in the same
benchmark (parallelism alone over 2 cores would give about 500).
"""

import statistics
from pathlib import Path


from vacsim.analysis.spread import run_spread
from vacsim.scenario import load_scenario
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[2] / "scenarios"
SAMPLES = 1000
TARGET_MULTIPLE = 250


def test_spread_1000_samples(benchmark, heavy, median_time):
    s = load_scenario(SCENARIOS / "bench-iced-uncertain.toml", ["run.duration=3 h"])
    single = median_time(lambda: simulate(s), 7)
    run_spread(s, samples=20, seed=0, jobs=2)  # warm caches (imports, pools) outside the timing

    def spread():
        return run_spread(s, samples=SAMPLES, seed=1, jobs=2)

    result = benchmark.pedantic(spread, rounds=3, iterations=1)
    wall = statistics.median(benchmark.stats.stats.data)
    one_by_one = median_time(lambda: run_spread(s, samples=100, seed=1, jobs=2, batch=False), 1) * SAMPLES / 100
    print(
        f"\n{SAMPLES} samples of a 3-hour run, 2 workers: wall {wall:.2f} s, {SAMPLES / wall:.0f} runs/s, "
        f"{wall / single:.0f} x the single-run median ({single * 1e3:.1f} ms); "
        f"one simulate per sample on the same 2 workers (from 100): {one_by_one:.1f} s = {one_by_one / single:.0f} x"
    )
    benchmark.extra_info.update(single_run_s=single, multiple=wall / single, one_by_one_multiple=one_by_one / single)
    assert result.samples == SAMPLES
    assert wall <= TARGET_MULTIPLE * single
