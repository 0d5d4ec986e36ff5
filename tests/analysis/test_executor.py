"""The pluggable executor: input order, in-process jobs=1, foreign executors, errors, progress.

No physical check values here: every expected value is the task's own arithmetic (derived).
"""

from __future__ import annotations

import os
import time
from concurrent.futures import ThreadPoolExecutor

import pytest

from vacsim.analysis.executor import available_cores, map_list, run_many
from vacsim.errors import InputError


def _slow_square(x):
    # later items finish first, so completion order differs from input order
    time.sleep(0.02 * (4 - x) if x < 4 else 0.0)
    return x * x


def _pid(_):
    return os.getpid()


def _fails_on_two(x):
    if x == 2:
        raise ValueError("two")
    return x


def test_results_come_in_input_order_from_a_process_pool():
    # derived: the squares of 0..5, in order, whatever order the workers finish in
    assert list(run_many(_slow_square, range(6), jobs=2)) == [0, 1, 4, 9, 16, 25]


def test_pool_runs_in_other_processes_and_jobs_1_in_this_one():
    pids = set(run_many(_pid, range(4), jobs=2))
    assert os.getpid() not in pids
    assert set(run_many(_pid, range(4), jobs=1)) == {os.getpid()}


def test_any_concurrent_futures_executor_is_used_and_left_open():
    with ThreadPoolExecutor(max_workers=3) as pool:
        assert map_list(_slow_square, [3, 1, 2], executor=pool) == [9, 1, 4]
        # still usable afterwards: run_many does not shut down an executor it was given
        assert pool.submit(_slow_square, 4).result() == 16


def test_a_task_error_is_raised_at_its_turn():
    results = []
    with pytest.raises(ValueError, match="two"):
        for r in run_many(_fails_on_two, range(5), jobs=2):
            results.append(r)
    assert results == [0, 1]


def test_progress_bar_on_stderr_when_asked(capsys):
    assert map_list(_slow_square, range(3), jobs=1, progress=True, label="squares") == [0, 1, 4]
    err = capsys.readouterr().err
    assert "squares" in err and "3/3" in err


def test_no_progress_bar_unless_asked(capsys):
    map_list(_slow_square, range(3), jobs=1, progress=False)
    assert capsys.readouterr().err == ""


@pytest.mark.parametrize("jobs", [0, -1, 1.5])
def test_bad_jobs_is_an_input_error(jobs):
    with pytest.raises(InputError, match="--jobs"):
        list(run_many(_slow_square, range(3), jobs=jobs))


def test_available_cores_is_positive():
    assert available_cores() >= 1
