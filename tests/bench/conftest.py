import statistics
import time

import pytest


@pytest.fixture
def heavy(request):
    """Skip heavy benchmark bodies unless benchmarks are enabled (`--benchmark-enable`)."""
    if request.config.getoption("benchmark_disable") and not request.config.getoption("benchmark_enable"):
        pytest.skip("benchmark: run with `python -m pytest tests/bench --benchmark-enable -s`")


def _median_time(fn, repeats):
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


@pytest.fixture(scope="session")
def median_time():
    """median_time(fn, repeats) -> median wall time of `repeats` calls of fn() [s]."""
    return _median_time
