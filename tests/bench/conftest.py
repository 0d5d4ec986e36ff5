import pytest


@pytest.fixture
def heavy(request):
    """Skip heavy benchmark bodies unless benchmarks are enabled (`--benchmark-enable`)."""
    if request.config.getoption("benchmark_disable") and not request.config.getoption("benchmark_enable"):
        pytest.skip("benchmark: run with `python -m pytest tests/bench --benchmark-enable -s`")
