"""Which uncertain input matters most for the usable duration: Morris elementary effects.

Method of Morris (1991, Technometrics 33(2), 161-174, "Factorial sampling plans for preliminary
computational experiments") with the mu* measure of Campolongo, Cariboni & Saltelli (2007,
Environ. Model. Softw. 22, 1509-1518): each input x_i is scaled to [0, 1] over its range; r random
one-at-a-time trajectories on a p-level grid each move every input once by Delta = p / (2 (p - 1));
the elementary effect EE_i = [y(x + Delta e_i) - y(x)] / Delta (signed by the direction of the
move). mu*_i = mean |EE_i| ranks the inputs (large: influential); sigma_i = standard deviation of
EE_i (large: non-linear or interacting). Units: seconds of usable duration per unit of the
normalised range, so inputs with different units are comparable.

Ranges: the `[uncertain]` distributions' supports for uniform and triangular keys; for the
unbounded normal and lognormal, their 5-95 % quantiles (Distribution.support).

The r (k + 1) runs go through the same batched solver and executor as the spread.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..batch import RECORD_STEP
from ..errors import InputError
from ..scenario import Scenario, raw_of
from .spread import check_samples, run_samples
from .uncertain import Distribution, scenario_distributions

#: Default number of trajectories and grid levels (Morris 1991 recommends an even p; p = 4 with
#: r = 10 is the usual screening choice, Saltelli et al., Global Sensitivity Analysis: The Primer,
#: 2008, sec. 3.3).
TRAJECTORIES = 10
LEVELS = 4
#: What is ranked: a summary.json figure.
OUTPUT = "usable_duration_s"


def morris_trajectories(k: int, r: int = TRAJECTORIES, levels: int = LEVELS, seed: int | None = 0) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Morris (1991) one-at-a-time trajectories in the unit hypercube.

    Parameters
    ----------
    k : int
        Number of inputs.
    r : int
        Number of trajectories.
    levels : int
        Grid levels p (even).
    seed : int or None
        Random seed.

    Returns
    -------
    points : ndarray, shape (r * (k + 1), k)
        Trajectory points, trajectory after trajectory.
    moved : ndarray, shape (r, k) of int
        Which input moves at each step of each trajectory.
    steps : ndarray, shape (r, k)
        The signed step (+Delta or -Delta) of that move.
    """
    if k < 1:
        raise InputError("sensitivity: needs at least one uncertain key")
    if r < 2:
        raise InputError(f"--trajectories: expected 2 or more, got {r}")
    if levels < 2 or levels % 2:
        raise InputError(f"levels: expected an even number >= 2, got {levels}")
    rng = np.random.default_rng(seed)
    delta = levels / (2.0 * (levels - 1))
    base_levels = np.arange(levels // 2) / (levels - 1)  # x* in {0, ..., 1 - Delta}
    points = np.empty((r, k + 1, k))
    moved = np.empty((r, k), dtype=int)
    steps = np.empty((r, k))
    for t in range(r):
        low = rng.choice(base_levels, size=k)
        up = rng.random(k) < 0.5  # direction of each input's move
        x = np.where(up, low, low + delta)
        order = rng.permutation(k)
        points[t, 0] = x
        for m, i in enumerate(order):
            x = x.copy()
            x[i] += delta if up[i] else -delta
            points[t, m + 1] = x
            moved[t, m] = i
            steps[t, m] = delta if up[i] else -delta
    return points.reshape(r * (k + 1), k), moved, steps


def elementary_effects(outputs: np.ndarray, moved: np.ndarray, steps: np.ndarray) -> np.ndarray:
    """EE per trajectory and input, shape (r, k), from outputs along the trajectories (Morris 1991)."""
    r, k = moved.shape
    y = np.asarray(outputs, dtype=float).reshape(r, k + 1)
    ee = np.empty((r, k))
    for t in range(r):
        ee[t, moved[t]] = (y[t, 1:] - y[t, :-1]) / steps[t]
    return ee


@dataclass(frozen=True)
class SensitivityResult:
    """Morris screening of the uncertain keys.

    Attributes
    ----------
    keys : list of str
        Inputs, in `[uncertain]` order.
    ranges : list of (float, float)
        The range each input was screened over [SI].
    mu_star, mu, sigma : ndarray, shape (k,)
        Campolongo et al. (2007) mu*, Morris's mu and sigma [s of usable duration per unit range].
    elementary_effects : ndarray, shape (r, k)
    trajectories, levels, seed : int
    output : str
        The figure ranked (usable_duration_s).
    """

    scenario: str
    keys: list
    ranges: list
    mu_star: np.ndarray
    mu: np.ndarray
    sigma: np.ndarray
    elementary_effects: np.ndarray
    trajectories: int
    levels: int
    seed: int | None
    output: str = OUTPUT

    def ranking(self) -> list[dict]:
        """Inputs by decreasing mu*: [{key, mu_star, sigma, mu, low, high}]."""
        order = np.argsort(-self.mu_star, kind="stable")
        return [
            {"key": self.keys[i], "mu_star": float(self.mu_star[i]), "sigma": float(self.sigma[i]), "mu": float(self.mu[i]),
             "low": self.ranges[i][0], "high": self.ranges[i][1]}
            for i in order
        ]

    def to_json(self) -> dict:
        """The `--json` object."""
        return {
            "scenario": self.scenario,
            "method": "morris",
            "measure": "mu_star (Campolongo et al. 2007) of elementary effects (Morris 1991) on usable_duration_s, "
            "in seconds per unit of each input's normalised range",
            "output": self.output,
            "trajectories": self.trajectories,
            "levels": self.levels,
            "seed": self.seed,
            "runs": int(self.trajectories * (len(self.keys) + 1)),
            "ranges_note": "uniform/triangular: their support; normal/lognormal: their 5-95 % quantiles",
            "ranking": self.ranking(),
        }


def run_sensitivity(
    scenario: Scenario,
    *,
    trajectories: int = TRAJECTORIES,
    levels: int = LEVELS,
    seed: int | None = 0,
    distributions: list[Distribution] | None = None,
    fit_file=None,
    jobs: int | None = None,
    executor=None,
    progress: bool | None = False,
    batch: bool | None = None,
) -> SensitivityResult:
    """Morris screening of the scenario's uncertain keys for the usable duration.

    Parameters
    ----------
    scenario : Scenario
        A validated scenario with an `[uncertain]` section (or `distributions` / `fit_file`).
    trajectories : int
        r, the number of trajectories (r (k + 1) runs).
    levels : int
        p, grid levels.
    seed : int or None
        Seed of the trajectories.
    distributions, fit_file, jobs, executor, progress, batch
        As in vacsim.analysis.spread.run_spread.

    Returns
    -------
    SensitivityResult
    """
    dists = distributions if distributions is not None else scenario_distributions(raw_of(scenario), fit_file)
    ranges = [d.support() for d in dists]
    unit, moved, steps = morris_trajectories(len(dists), trajectories, levels, seed)
    lo = np.array([a for a, _ in ranges])
    hi = np.array([b for _, b in ranges])
    values = lo + unit * (hi - lo)
    check_samples(scenario, dists, values)
    _, _, figures, _ = run_samples(
        scenario, dists, values, jobs=jobs, executor=executor, progress=progress, batch=batch,
        record_step=RECORD_STEP, label=f"{scenario.name}: Morris, {values.shape[0]} runs",
    )
    y = figures[OUTPUT]
    ee = elementary_effects(y, moved, steps)
    return SensitivityResult(
        scenario=scenario.name,
        keys=[d.key for d in dists],
        ranges=[(float(a), float(b)) for a, b in ranges],
        mu_star=np.mean(np.abs(ee), axis=0),
        mu=np.mean(ee, axis=0),
        sigma=np.std(ee, axis=0, ddof=1),
        elementary_effects=ee,
        trajectories=trajectories,
        levels=levels,
        seed=seed,
    )
