"""Uncertainty bands of a run: Monte Carlo (or Latin hypercube) over the `[uncertain]` keys.

Each sample is a full run of the scenario with the uncertain keys drawn from their
distributions (vacsim.analysis.uncertain). The answer is the spread of the run's figures
(P10/P50/P90 and mean of the usable duration, time to target, minimum pressure, ice-gone time)
and a band of pressure against time.

Cost: samples whose varied keys enter the model as plain numbers (vacsim.batch.BATCH_KEYS) are
solved together, one stacked ODE system per chunk, the chunks in parallel through
vacsim.analysis.executor.run_many; other keys fall back to one full simulate per sample, in
parallel. The deterministic run (the scenario as written) is simulated once for comparison.

"Does not happen" (target never reached, ice never gone within the run, or no ice at all) is
counted per figure (`none`) and ranked as later than every value that happens, i.e. as +infinity:
a percentile that falls among those samples is reported as None ("not within the run"); the mean
is over the samples that have a value (None when none has). The usable duration is 0 when the
target is never reached (as in summary.json), so it is never None; a sample that holds the target
to the end of the run has its usable duration cut by the run's end, so a percentile among those
samples is a lower bound (SpreadResult.lower_bounds; `lower_bound` in the JSON).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field

import numpy as np

from ..batch import RECORD_STEP, batchable, simulate_batch
from ..errors import InputError
from ..scenario import Scenario, build_scenario, raw_of, set_key, source_of
from .executor import run_many
from .uncertain import Distribution, sample, scenario_distributions, value_text

#: The figures a spread reports, each a summary.json key in SI.
FIGURES = ("usable_duration_s", "time_to_target_s", "min_pressure_pa", "ice_gone_s")
PERCENTILES = (10, 50, 90)
#: Samples stacked into one batched solve: a quarter of the samples (work for up to four
#: workers), at least MIN_CHUNK, at most MAX_CHUNK (beyond it the shared step size and the cost
#: per step grow faster than the per-run overhead falls). The split depends on the sample count
#: only, never on the number of workers, so a seed gives the same numbers on any machine.
MIN_CHUNK = 25
MAX_CHUNK = 500
CHUNKS = 4


def default_chunk_size(samples: int) -> int:
    """Samples per batched solve for a spread of `samples` runs (see CHUNKS)."""
    return min(MAX_CHUNK, max(MIN_CHUNK, math.ceil(samples / CHUNKS)))


@dataclass(frozen=True)
class SpreadResult:
    """A spread of runs.

    Attributes
    ----------
    scenario : Scenario
        The scenario as written (the deterministic run's input).
    distributions : list of Distribution
        The uncertain keys, in column order of `values`.
    values : ndarray, shape (n, k)
        The sampled inputs, SI.
    method, seed : str, int or None
        Sampling design ("mc" or "lhs") and seed.
    time_s : ndarray, shape (n_t,)
        Times of the stored series [s].
    pressure_pa : ndarray, shape (n, n_t)
        Apparatus pressure per sample [Pa].
    figures : dict of str -> ndarray, shape (n,)
        The FIGURES per sample, NaN where it does not happen.
    target_pressure_pa : float or None
        The scenario's target [Pa].
    deterministic : RunResult
        The scenario as written.
    batched : bool
        Whether the samples were solved as stacked systems.
    timing : dict
        Wall time of the sampled runs [s] and of the deterministic run.
    """

    scenario: Scenario
    distributions: list
    values: np.ndarray
    method: str
    seed: int | None
    time_s: np.ndarray
    pressure_pa: np.ndarray
    figures: dict
    target_pressure_pa: float | None
    deterministic: object
    batched: bool
    timing: dict = field(default_factory=dict)

    @property
    def samples(self) -> int:
        """Number of samples."""
        return int(self.values.shape[0])

    def band(self, name: str) -> dict:
        """{p10, p50, p90, mean, count, none} of one figure (see the module docstring for None)."""
        return figure_band(self.figures[name])

    def held_mask(self) -> np.ndarray:
        """Per sample, whether its first window lasts to the end of the run: its usable duration
        is cut by the run's end (right-censored), the true hold is at least that long."""
        end = self.figures["time_to_target_s"] + self.figures["usable_duration_s"]
        return np.isfinite(end) & (end >= self.scenario.run.duration - 1e-6)

    def held_to_end(self) -> int:
        """Samples whose first window lasts to the end of the run (their usable duration is cut by it)."""
        return int(np.sum(self.held_mask()))

    def lower_bounds(self, name: str = "usable_duration_s") -> dict[str, bool]:
        """{p10, p50, p90, mean}: True where the figure's value is only a lower bound because
        samples that held to the end of the run enter it (see censored_lower_bounds). Only the
        usable duration is cut by the run's end; other figures give all False."""
        held = self.held_mask() if name == "usable_duration_s" else np.zeros(self.samples, dtype=bool)
        return censored_lower_bounds(self.figures[name], held)

    def pressure_band(self) -> dict[int, np.ndarray]:
        """Percentiles of pressure at each stored time, {10: ..., 50: ..., 90: ...} [Pa]."""
        return {q: np.percentile(self.pressure_pa, q, axis=0) for q in PERCENTILES}

    def to_json(self) -> dict:
        """The `--json` object: one band per figure, the deterministic figures, the inputs."""
        det = self.deterministic.summary
        out = {
            "scenario": self.scenario.name,
            "samples": self.samples,
            "method": self.method,
            "seed": self.seed,
            "batched": self.batched,
            "target_pressure_pa": self.target_pressure_pa,
        }
        for name in FIGURES:
            out[name] = self.band(name)
        out["usable_duration_s"]["held_to_end"] = self.held_to_end()
        out["usable_duration_s"]["lower_bound"] = self.lower_bounds("usable_duration_s")
        out["deterministic"] = {name: det[name] for name in FIGURES}
        out["uncertain"] = [
            {"key": d.key, "distribution": d.name, "parameters_si": list(d.params), "sampled_min": float(col.min()), "sampled_max": float(col.max())}
            for d, col in zip(self.distributions, self.values.T)
        ]
        out["none_means"] = "target never reached / ice not gone within the run; ranked as later than any value, so a percentile among them is null; mean over samples with a value"
        out["lower_bound_means"] = "held_to_end samples kept the target to the end of the run, so their usable duration is cut by it; a percentile (or the mean) they enter is a lower bound (lower_bound: true)"
        return out


def _quantile_sorted(ordered: np.ndarray, q: float) -> float | None:
    """Linear-interpolated quantile of sorted values that may end in +inf (None there)."""
    pos = q * (ordered.size - 1)
    lo, hi = int(math.floor(pos)), int(math.ceil(pos))
    if not np.isfinite(ordered[hi]):
        return None
    return float(ordered[lo] + (ordered[hi] - ordered[lo]) * (pos - lo))


def figure_band(values) -> dict:
    """P10/P50/P90, mean, count and none-count of one figure's samples (NaN = does not happen).

    Percentiles use linear interpolation between order statistics (numpy's default, Hyndman &
    Fan 1996 definition 7), with "does not happen" ranked above every value.
    """
    v = np.asarray(values, dtype=float)
    happened = v[np.isfinite(v)]
    ordered = np.sort(np.where(np.isfinite(v), v, np.inf))
    out = {f"p{q}": _quantile_sorted(ordered, q / 100.0) if v.size else None for q in PERCENTILES}
    out["mean"] = float(happened.mean()) if happened.size else None
    out["count"] = int(happened.size)
    out["none"] = int(v.size - happened.size)
    return out


def censored_lower_bounds(values, censored) -> dict[str, bool]:
    """Which of P10/P50/P90 and the mean of `values` are lower bounds when the `censored`
    samples' true values may be larger (right-censoring: a hold cut by the end of the run).

    Every percentile (figure_band's, Hyndman & Fan 1996 definition 7) is non-decreasing in each
    sample, so raising a censored sample can only raise it; it is exact when every censored
    sample ranks above the order statistics it interpolates between, and a lower bound
    otherwise. The mean is a lower bound as soon as one sample is censored.
    """
    v = np.asarray(values, dtype=float)
    cut = np.asarray(censored, dtype=bool) & np.isfinite(v)
    out = {f"p{q}": False for q in PERCENTILES}
    out["mean"] = bool(cut.any())
    if v.size == 0 or not cut.any():
        return out
    order = np.argsort(np.where(np.isfinite(v), v, np.inf), kind="stable")
    cut_sorted = cut[order]
    for q in PERCENTILES:
        hi = int(math.ceil(q / 100.0 * (v.size - 1)))
        out[f"p{q}"] = bool(cut_sorted[: hi + 1].any())
    return out


# ---- the sampled runs (module-level so they pickle into worker processes) ------------------


def _batch_task(item):
    raw, source, values, record_step = item
    s = build_scenario(raw, source)
    b = simulate_batch(s, values, record_step=record_step)
    return b.pressure_pa, b.figures()


def _single_task(item):
    raw, source, record = item
    from ..simulation import simulate

    r = simulate(build_scenario(raw, source))
    pressure = np.interp(record, r.time_s, r.series["pressure_pa"])
    figures = {name: (np.nan if r.summary[name] is None else float(r.summary[name])) for name in FIGURES}
    return pressure, figures


def _with_values(raw: dict, distributions, row) -> dict:
    for d, v in zip(distributions, row):
        raw = set_key(raw, d.key, value_text(v, d.kind))
    return raw


def check_samples(scenario: Scenario, distributions, values: np.ndarray) -> None:
    """Validate the scenario at the sampled extremes (all keys at their lowest, then highest
    draw): a key the scenario's schema refuses, or an impossible combination, fails once here."""
    raw = raw_of(scenario)
    for row in (values.min(axis=0), values.max(axis=0)):
        try:
            build_scenario(_with_values(raw, distributions, row), f"{source_of(scenario)} [uncertain]")
        except InputError as exc:
            raise InputError(f"a sampled value is not a valid scenario: {exc}") from None


def run_samples(
    scenario: Scenario,
    distributions: list[Distribution],
    values: np.ndarray,
    *,
    jobs: int | None = None,
    executor=None,
    progress: bool | None = False,
    batch: bool | None = None,
    record_step: float = RECORD_STEP,
    chunk_size: int | None = None,
    label: str = "samples",
):
    """Run the scenario at each row of `values`; returns (time_s, pressure (n, n_t), figures, batched).

    Parameters
    ----------
    batch : bool, optional
        Stack samples into batched solves (default: when every key allows it).
    chunk_size : int, optional
        Samples per batched solve (default: default_chunk_size; the numbers depend on it at the
        solver-tolerance level, not on the number of workers).
    """
    keys = [d.key for d in distributions]
    can_batch = batchable(scenario, keys)
    if batch and not can_batch:
        raise InputError(f"cannot batch samples of {', '.join(k for k in keys if not batchable(scenario, [k]))}: run them one by one")
    use_batch = can_batch if batch is None else batch
    raw = raw_of(scenario)
    source = source_of(scenario)
    n = values.shape[0]
    duration = scenario.run.duration
    record = np.unique(np.append(np.arange(0.0, duration, record_step), duration))
    if use_batch:
        size = chunk_size or default_chunk_size(n)
        items = [
            (raw, source, {k: values[a : a + size, j] for j, k in enumerate(keys)}, record_step)
            for a in range(0, n, size)
        ]
        parts = list(run_many(_batch_task, items, executor=executor, jobs=jobs, progress=progress, label=label))
        pressure = np.concatenate([p for p, _ in parts], axis=0)
        figures = {name: np.concatenate([f[name] for _, f in parts]) for name in FIGURES}
    else:
        items = [(_with_values(raw, distributions, row), source, record) for row in values]
        parts = list(run_many(_single_task, items, executor=executor, jobs=jobs, progress=progress, label=label))
        pressure = np.vstack([p for p, _ in parts])
        figures = {name: np.array([f[name] for _, f in parts]) for name in FIGURES}
    return record, pressure, figures, use_batch


def run_spread(
    scenario: Scenario,
    *,
    samples: int = 200,
    seed: int | None = 0,
    method: str = "mc",
    distributions: list[Distribution] | None = None,
    fit_file=None,
    jobs: int | None = None,
    executor=None,
    progress: bool | None = False,
    batch: bool | None = None,
    record_step: float = RECORD_STEP,
    chunk_size: int | None = None,
) -> SpreadResult:
    """Sample the scenario's uncertain keys and run each sample.

    Parameters
    ----------
    scenario : Scenario
        A validated scenario with an `[uncertain]` section (or `distributions` / `fit_file`).
    samples : int
        Number of runs.
    seed : int or None
        Seed of the sampling (same seed, same inputs, same answer).
    method : str
        "mc" (independent draws) or "lhs" (Latin hypercube).
    distributions : list of Distribution, optional
        Instead of the scenario's own.
    fit_file : path, optional
        A calibrated scenario whose `[fitted]` standard errors add normal distributions.
    jobs, executor, progress
        As in vacsim.analysis.executor.run_many.
    batch, record_step, chunk_size
        See run_samples.

    Returns
    -------
    SpreadResult
    """
    from ..simulation import simulate, target_pressure

    dists = distributions if distributions is not None else scenario_distributions(raw_of(scenario), fit_file)
    values = sample(dists, samples, seed, method)
    check_samples(scenario, dists, values)
    t0 = time.perf_counter()
    record, pressure, figures, batched = run_samples(
        scenario, dists, values, jobs=jobs, executor=executor, progress=progress, batch=batch,
        record_step=record_step, chunk_size=chunk_size, label=f"{scenario.name}: {samples} samples",
    )
    t1 = time.perf_counter()
    deterministic = simulate(scenario)
    t2 = time.perf_counter()
    return SpreadResult(
        scenario=scenario,
        distributions=list(dists),
        values=values,
        method=method,
        seed=seed,
        time_s=record,
        pressure_pa=pressure,
        figures=figures,
        target_pressure_pa=target_pressure(scenario),
        deterministic=deterministic,
        batched=batched,
        timing={"samples_s": t1 - t0, "deterministic_s": t2 - t1},
    )
