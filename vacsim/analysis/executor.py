"""Run one picklable task over many inputs, in parallel, results in input order.

This is the one place vacsim fans work out: sweeps, comparisons, the uncertainty spread. A task
is a plain module-level function of one argument (so it pickles); the inputs are plain data
(raw scenario dictionaries, floats). The executor is pluggable:

* default: a :class:`concurrent.futures.ProcessPoolExecutor` with one worker per core
  (``jobs`` workers if given), started with ``fork`` on Linux so the workers inherit the
  already-imported model and start in milliseconds;
* ``jobs=1``: no pool at all, everything in this process (easiest to debug and profile);
* any object with the :class:`concurrent.futures.Executor` interface (``submit`` returning
  futures with ``.result()``): it is used as given and not shut down.

Running a large sweep on a dask.distributed cluster (optional extra: ``pip install
"vacsim[cluster]"``; dask is not needed otherwise)::

    from dask.distributed import Client
    from vacsim.analysis.sweep import run_sweep, parse_vary

    client = Client("tcp://scheduler:8786")        # or Client() for a local cluster
    with client.get_executor() as pool:             # a concurrent.futures.Executor
        sweep = run_sweep("scenarios/bench-iced.toml",
                          [parse_vary("tub.ice=0..4 kg", steps=200)], executor=pool)

The workers need vacsim installed (same version) in their environment. Nothing in vacsim
imports dask; the client's executor is just one more Executor.
"""

from __future__ import annotations

import multiprocessing
import os
import sys
from collections.abc import Callable, Iterable, Iterator
from concurrent.futures import Executor, Future, ProcessPoolExecutor, wait, FIRST_COMPLETED
from typing import Any, TypeVar

T = TypeVar("T")
R = TypeVar("R")


def available_cores() -> int:
    """CPU cores this process may use (affinity-aware where the OS tells)."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        return max(1, os.cpu_count() or 1)


def _check_jobs(jobs: int | None) -> int:
    if jobs is None:
        return available_cores()
    if isinstance(jobs, bool) or not isinstance(jobs, int) or jobs < 1:
        from ..errors import InputError

        raise InputError(f"--jobs: expected a whole number of at least 1, got {jobs!r}")
    return jobs


def _context():
    # fork is fast (the model is already imported) and safe on Linux; elsewhere keep the default.
    if sys.platform.startswith("linux") and "fork" in multiprocessing.get_all_start_methods():
        return multiprocessing.get_context("fork")
    return None


def _progress_bar(total: int, label: str):
    from rich.console import Console
    from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn, TimeRemainingColumn

    return Progress(
        TextColumn("{task.description}"),
        BarColumn(),
        MofNCompleteColumn(),
        TimeElapsedColumn(),
        TextColumn("eta"),
        TimeRemainingColumn(),
        console=Console(stderr=True),
        transient=False,
    )


class _NoBar:
    """Stands in for a progress bar when none is shown."""

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        return False

    def add_task(self, *args, **kwargs):
        return 0

    def advance(self, *args, **kwargs):
        pass


def run_many(
    fn: Callable[[T], R],
    items: Iterable[T],
    executor: Executor | None = None,
    jobs: int | None = None,
    progress: bool | None = False,
    label: str = "",
) -> Iterator[R]:
    """Map `fn` over `items`, yielding the results in input order.

    Parameters
    ----------
    fn : callable
        A module-level (picklable) function of one argument.
    items : iterable
        The inputs; each must pickle when a process pool or a cluster runs them.
    executor : concurrent.futures.Executor, optional
        Used as given (a thread pool, a dask.distributed ``client.get_executor()``, ...) and
        left open. Default: a process pool of `jobs` workers, shut down at the end.
    jobs : int, optional
        Worker processes for the default pool (default: all cores). ``jobs=1`` runs
        everything in this process, without a pool.
    progress : bool or None
        Show a progress bar on stderr; None shows it when stderr is a terminal.
    label : str
        The bar's description.

    Yields
    ------
    The results of ``fn(item)``, in the order of `items`. An exception raised by a task is
    re-raised here, at that item's turn, after the remaining work has been cancelled.
    """
    items = list(items)
    if progress is None:
        progress = sys.stderr.isatty()
    n_jobs = _check_jobs(jobs) if executor is None else None
    if executor is None and (n_jobs == 1 or len(items) <= 1):
        yield from _serial(fn, items, progress, label)
        return
    owned = executor is None
    pool = ProcessPoolExecutor(max_workers=min(n_jobs, len(items)), mp_context=_context()) if owned else executor
    futures: list[Future] = []
    try:
        # Submit before any progress thread exists: a forking pool starts its workers here.
        futures = [pool.submit(fn, item) for item in items]
        bar = _progress_bar(len(items), label) if progress else _NoBar()
        with bar:
            task = bar.add_task(label or "running", total=len(items))
            if not all(isinstance(f, Future) for f in futures):
                # futures of another kind: wait on each in turn
                for fut in futures:
                    result = fut.result()
                    bar.advance(task)
                    yield result
                return
            pending = set(futures)
            next_index = 0
            while next_index < len(futures):
                if not futures[next_index].done():
                    done, pending = wait(pending, return_when=FIRST_COMPLETED)
                    for _ in done:
                        bar.advance(task)
                    continue
                fut = futures[next_index]
                if fut in pending:
                    pending.discard(fut)
                    bar.advance(task)
                next_index += 1
                yield fut.result()
    finally:
        for fut in futures:
            fut.cancel()
        if owned:
            pool.shutdown(wait=True, cancel_futures=True)


def _serial(fn, items, progress, label):
    bar = _progress_bar(len(items), label) if progress else _NoBar()
    with bar:
        task = bar.add_task(label or "running", total=len(items))
        for item in items:
            result = fn(item)
            bar.advance(task)
            yield result


def map_list(fn: Callable[[T], R], items: Iterable[T], **kwargs: Any) -> list[R]:
    """`run_many` collected into a list (same arguments)."""
    return list(run_many(fn, items, **kwargs))
