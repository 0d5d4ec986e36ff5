"""Many samples of one scenario integrated together as one ODE system.

For an uncertainty spread or a sensitivity screen the same rig runs hundreds of times with a few
inputs changed. Solving each run alone pays the solver's Python overhead (a right-hand side
call costs ~100 µs whatever its size) hundreds of times over. Here N samples are stacked into
one state vector of N x (dynamic slots) numbers, ordered sample by sample, and integrated at once
with LSODA (Hindmarsh 1983, ODEPACK; Petzold 1983, SIAM J. Sci. Stat. Comput. 4, 136). The
samples do not interact, so the Jacobian is block diagonal: with that ordering it is banded
(bandwidth = slots - 1), and LSODA builds it by finite differences in `slots` calls of the
vectorised right-hand side (vacsim.model.rhs broadcasts over columns of states). LSODA's error
test uses the weighted max-norm, so every sample is held to the tolerance, not their average.

Differences from vacsim.simulation.simulate, by design:

* No terminal "ice gone" event (each sample melts out at its own time): the melt law
  dm/dt ~ -m^(2/3) goes to zero with the ice, so the right-hand side stays continuous and the
  solver steps over the melt-out; ice-gone times and target crossings are found afterwards from
  the dense solution (bisection to 1e-3 s).
* Only the summary figures a spread needs are computed (usable windows, time to target,
  minimum pressure, ice-gone time), plus pressure, tub temperature and ice on a coarse grid.
* Only keys that enter the right-hand side as plain numbers can vary (BATCH_KEYS); anything that
  changes the operating-point tables or the fluid table (pump curve, nozzle, tub volume, glycol,
  initial tub temperature...) needs a full simulate per sample (see `batchable`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np
from scipy.integrate import solve_ivp

from .components import tub
from .errors import SolverError
from .model import BOILED, ICE, ICE_GONE_KG, P, POT_AIR, SOLVENT, STATE, T, WATER, Rig, apply_entry, build_rig, initial_controls, initial_state, rhs
from .results import usable_windows
from .scenario import Scenario
from .simulation import _ATOL, target_pressure

#: Scenario keys a batch can vary, and where a sample's value goes: a Rig field, a slot of the
#: initial state, or the target pressure.
BATCH_KEYS: dict[str, tuple[str, str | int | None]] = {
    "apparatus.volume": ("rig", "volume"),
    "apparatus.leak_rate": ("rig", "leak_rate"),
    "apparatus.initial_pressure": ("state", P),
    "hose.inner_diameter": ("rig", "hose_diameter"),
    "hose.length": ("rig", "hose_length"),
    "tub.ua": ("rig", "ua"),
    "tub.ice": ("state", ICE),
    "tub.ice_heat_transfer": ("rig", "ice_heat_transfer"),
    "tub.ice_piece_size": ("rig", "ice_piece_size"),
    "tub.ice_temperature": ("rig", "ice_temperature"),
    "feed_pump.motor_heat": ("rig", "motor_heat"),
    "ejector.entrainment_ratio": ("rig", "entrainment_ratio"),
    "ejector.cutoff_width": ("rig", "cutoff_width"),
    "ejector.motive_degassing": ("rig", "motive_degassing"),
    "target.pressure": ("target", None),
}

#: Default spacing of the stored series [s] (bands need about one-minute resolution).
RECORD_STEP = 60.0
# Bisection tolerance for crossing and melt-out times [s].
_TIME_TOL = 1e-3


def batchable(scenario: Scenario, keys) -> bool:
    """True when every key can vary inside one batched solve of `scenario`."""
    for key in keys:
        if key not in BATCH_KEYS:
            return False
        if key == "tub.ua" and scenario.tub.ua is None:
            return False  # UA from wall_area/wall_u: the sample must go through validation
        if key == "target.pressure" and (scenario.target is None or scenario.target.pressure is None):
            return False
    return True


@dataclass(frozen=True)
class BatchResult:
    """N runs of one scenario that differ in a few inputs.

    Attributes
    ----------
    time_s : ndarray, shape (n_t,)
        Record times [s] (every `record_step`, plus the end of the run).
    pressure_pa, tub_temperature_k, ice_mass_kg : ndarray, shape (N, n_t)
        Apparatus pressure [Pa], tub temperature [K], ice mass [kg] per sample.
    target_pressure_pa : ndarray, shape (N,) or None
        The target each sample was judged against [Pa].
    usable_duration_s, min_pressure_pa : ndarray, shape (N,)
        Length of the first usable window [s] (0 when the target is never reached, as in
        summary.json) and the lowest pressure on the scenario's output grid [Pa].
    time_to_target_s, ice_gone_s : ndarray, shape (N,)
        When the first window opens / the ice is gone [s]; NaN where that does not happen.
    windows : list of list of (start, end)
        Every usable window of each sample [s].
    solver : dict
        Solver statistics summed over segments.
    """

    time_s: np.ndarray
    pressure_pa: np.ndarray
    tub_temperature_k: np.ndarray
    ice_mass_kg: np.ndarray
    target_pressure_pa: np.ndarray | None
    usable_duration_s: np.ndarray
    time_to_target_s: np.ndarray
    min_pressure_pa: np.ndarray
    ice_gone_s: np.ndarray
    windows: list = field(default_factory=list)
    solver: dict = field(default_factory=dict)

    def figures(self) -> dict[str, np.ndarray]:
        """The four spread figures, {name: array (N,)}, NaN for "does not happen"."""
        return {
            "usable_duration_s": self.usable_duration_s,
            "time_to_target_s": self.time_to_target_s,
            "min_pressure_pa": self.min_pressure_pa,
            "ice_gone_s": self.ice_gone_s,
        }


def _active_slots(rig: Rig) -> list[int]:
    """State slots that feed back into the dynamics (the energy tallies do not)."""
    slots = [P, T, ICE, WATER]
    if rig.distillation is not None:
        slots += [SOLVENT, POT_AIR, BOILED]
    return slots


def simulate_batch(
    scenario: Scenario,
    values: dict[str, np.ndarray],
    *,
    rig: Rig | None = None,
    rtol: float | None = None,
    record_step: float = RECORD_STEP,
) -> BatchResult:
    """Simulate N variants of a scenario at once.

    Parameters
    ----------
    scenario : Scenario
        The base scenario (validated).
    values : dict of str -> array, shape (N,)
        SI values per sample for keys of BATCH_KEYS (see `batchable`).
    rig : Rig, optional
        The base scenario's rig (built if not given).
    rtol : float, optional
        Relative tolerance (default: the scenario's run.relative_tolerance).
    record_step : float
        Spacing of the stored series [s].

    Returns
    -------
    BatchResult
    """
    s = scenario
    unknown = [k for k in values if k not in BATCH_KEYS]
    if unknown:
        raise ValueError(f"simulate_batch cannot vary {', '.join(unknown)}; batchable keys: {', '.join(BATCH_KEYS)}")
    arrays = {k: np.asarray(v, dtype=float).reshape(-1) for k, v in values.items()}
    sizes = {a.size for a in arrays.values()}
    if len(sizes) > 1:
        raise ValueError("simulate_batch: every key needs the same number of samples")
    n = sizes.pop() if sizes else 1
    rig0 = build_rig(s) if rig is None else rig

    # Per-sample rig fields as columns (N, 1): they broadcast against states of shape (N, k).
    rig_fields = {BATCH_KEYS[k][1]: a[:, None] for k, a in arrays.items() if BATCH_KEYS[k][0] == "rig"}
    rig_b = replace(rig0, **rig_fields)
    y0 = initial_state(s, rig0)
    y = np.repeat(y0[:, None, None], n, axis=1)  # (n_states, N, 1)
    for k, a in arrays.items():
        if BATCH_KEYS[k][0] == "state":
            y[BATCH_KEYS[k][1], :, 0] = a
    ctl0 = initial_controls(s, rig0)
    ice0 = y[ICE]
    pieces = np.where(ice0 > 0, tub.ice_piece_count(ice0, rig_b.ice_piece_size, rig_b.ice_density), 0.0)
    ctl = replace(ctl0, ice_pieces=pieces)
    base_target = target_pressure(s)
    if "target.pressure" in arrays:
        targets = arrays["target.pressure"]
    else:
        targets = None if base_target is None else np.full(n, base_target)

    slots = _active_slots(rig0)
    na = len(slots)
    rtol = s.run.relative_tolerance if rtol is None else rtol
    duration = s.run.duration
    grid = np.unique(np.append(np.arange(0.0, duration, s.run.output_interval), duration))
    max_step = 30.0 * s.run.output_interval
    atol_slots = _ATOL[slots]
    scale = np.ones((na, n))
    scale[slots.index(ICE)] = np.maximum(y[ICE, :, 0], 1e-3)
    scale[slots.index(WATER)] = np.maximum(y[WATER, :, 0], 1e-3)
    atol = (atol_slots[:, None] * scale).T.reshape(-1)

    entries = sorted(s.schedule, key=lambda e: e.at)
    boundaries = sorted({e.at for e in entries if 0.0 < e.at < duration} | {duration})
    pump_stops: list[float] = []
    vents: list[float] = []
    resumes: list[tuple[float, np.ndarray]] = []  # (time, pressure per sample) when pumping resumes
    stats = {"method": "LSODA (batched)", "nfev": 0, "njev": 0, "segments": 0, "samples": n}
    segments = []  # (t0, t1, OdeSolution)
    last_ice_added = 0.0

    def apply(entry, ctl, y):
        nonlocal last_ice_added
        if entry.pump == "off" and ctl.pump_on:
            pump_stops.append(entry.at)
        if entry.vent:
            vents.append(entry.at)
        if entry.add_ice:
            last_ice_added = entry.at
            # a sample whose ice is gone has no pieces left (simulate's ice-gone event does this)
            ctl = replace(ctl, ice_pieces=np.where(y[ICE] <= ICE_GONE_KG, 0.0, ctl.ice_pieces))
        return apply_entry(entry, ctl, y, rig_b)

    for e in (e for e in entries if e.at == 0.0):
        ctl, y = apply(e, ctl, y)
    pump_stops.clear()
    vents.clear()
    pumping_at_start = ctl.pump_on and not ctl.vented
    t = 0.0
    start_pressure = y[P, :, 0].copy()
    for t_end in boundaries:
        if t_end > t:
            fun = _batched_rhs(rig_b, ctl, y, slots, n)
            z0 = y[slots, :, 0].T.reshape(-1)
            sol = solve_ivp(
                fun, (t, t_end), z0, method="LSODA", rtol=rtol, atol=atol, lband=na - 1, uband=na - 1,
                dense_output=True, max_step=max_step,
            )
            stats["nfev"] += sol.nfev
            stats["njev"] += sol.njev
            stats["segments"] += 1
            if sol.status == -1:
                raise SolverError(f"{s.name}: batched integration failed at t = {t:.1f} s: {sol.message}")
            segments.append((t, t_end, sol.sol))
            y = y.copy()
            y[slots, :, 0] = sol.y[:, -1].reshape(n, na).T
            t = t_end
        for e in (e for e in entries if e.at == t_end):
            was_pumping = ctl.pump_on and not ctl.vented
            ctl, y = apply(e, ctl, y)
            if ctl.pump_on and not ctl.vented and not was_pumping:
                resumes.append((t_end, y[P, :, 0].copy()))

    record = np.unique(np.append(np.arange(0.0, duration, record_step), duration))
    rec = {name: np.empty((n, record.size)) for name in ("p", "T", "ice")}
    ip, it, ii = slots.index(P), slots.index(T), slots.index(ICE)
    min_p = np.full(n, np.inf)
    crossings = [[] for _ in range(n)]
    brackets = []  # (segment, sample, t_a, t_b, slot, level, direction)
    for seg_index, (t0, t1, dense) in enumerate(segments):
        times = np.unique(np.concatenate([[t0], grid[(grid > t0) & (grid < t1)], [t1]]))
        z = _evaluate(dense, times, n, na)  # (na, N, n_times)
        p = z[ip]
        min_p = np.minimum(min_p, p.min(axis=1))
        if targets is not None:
            above = p > targets[:, None]
            for j, k in zip(*np.nonzero(above[:, 1:] != above[:, :-1])):
                brackets.append((seg_index, j, times[k], times[k + 1], ip, targets[j], -1 if above[j, k] else 1))
        if t1 > last_ice_added:  # simulate reports the melt-out after the last ice was added
            has = z[ii] > ICE_GONE_KG
            for j, k in zip(*np.nonzero(has[:, :-1] & ~has[:, 1:])):
                brackets.append((seg_index, j, times[k], times[k + 1], ii, ICE_GONE_KG, 0))
        sel = (record >= t0) & ((record < t1) | ((record == t1) & (seg_index == len(segments) - 1)))
        if sel.any():
            zr = _evaluate(dense, record[sel], n, na)
            rec["p"][:, sel], rec["T"][:, sel], rec["ice"][:, sel] = zr[ip], zr[it], zr[ii]
    roots = _bisect(segments, brackets, n, na)
    ice_gone = np.full(n, np.nan)
    for (seg_index, j, _, _, slot, _, direction), root in zip(brackets, roots):
        if slot == ip:
            crossings[j].append((root, direction))
        elif root >= last_ice_added and (np.isnan(ice_gone[j]) or root < ice_gone[j]):
            ice_gone[j] = root

    usable = np.zeros(n)
    first = np.full(n, np.nan)
    all_windows = []
    for j in range(n):
        if targets is None:
            all_windows.append([])
            continue
        windows = usable_windows(
            duration, float(targets[j]), sorted(crossings[j]), pump_stops, vents, float(start_pressure[j]),
            pumping_at_start, [(t_r, float(p_r[j])) for t_r, p_r in resumes],
        )
        all_windows.append(windows)
        if windows:
            first[j] = windows[0][0]
            usable[j] = windows[0][1] - windows[0][0]
    return BatchResult(
        time_s=record,
        pressure_pa=rec["p"],
        tub_temperature_k=rec["T"],
        ice_mass_kg=np.maximum(rec["ice"], 0.0),
        target_pressure_pa=targets,
        usable_duration_s=usable,
        time_to_target_s=first,
        min_pressure_pa=min_p,
        ice_gone_s=ice_gone,
        windows=all_windows,
        solver=stats,
    )


def _batched_rhs(rig: Rig, controls, y_template: np.ndarray, slots: list[int], n: int):
    """The stacked right-hand side: z holds N samples' active slots, sample after sample."""
    na = len(slots)
    n_states = len(STATE)
    passive = [i for i in range(n_states) if i not in slots]
    frozen = y_template[passive]  # energy tallies: not read by the fluxes

    def fun(t, z):
        k = 1 if z.ndim == 1 else z.shape[1]
        full = np.empty((n_states, n, k))
        full[slots] = z.reshape(n, na, k).transpose(1, 0, 2)
        full[passive] = frozen
        dy = rhs(t, full, rig, controls)[slots]
        out = dy.transpose(1, 0, 2).reshape(n * na, k)
        return out[:, 0] if z.ndim == 1 else out

    return fun


def _evaluate(dense, times, n: int, na: int) -> np.ndarray:
    """Dense solution at `times`, shape (na, N, len(times))."""
    z = dense(np.asarray(times, dtype=float))
    return z.reshape(n, na, -1).transpose(1, 0, 2)


def _bisect(segments, brackets, n: int, na: int) -> list[float]:
    """Times where a slot of a sample crosses its level inside each bracket (vectorised bisection)."""
    if not brackets:
        return []
    roots = np.empty(len(brackets))
    by_segment: dict[int, list[int]] = {}
    for i, b in enumerate(brackets):
        by_segment.setdefault(b[0], []).append(i)
    for seg_index, members in by_segment.items():
        dense = segments[seg_index][2]
        idx = np.array(members)
        samples = np.array([brackets[i][1] for i in idx])
        lo = np.array([brackets[i][2] for i in idx], dtype=float)
        hi = np.array([brackets[i][3] for i in idx], dtype=float)
        slot = np.array([brackets[i][4] for i in idx])
        level = np.array([brackets[i][5] for i in idx], dtype=float)
        rows = samples * na + slot
        f_lo = _pick(dense, lo, rows) - level
        iterations = max(1, int(math.ceil(math.log2(max(float(np.max(hi - lo)), _TIME_TOL) / _TIME_TOL))))
        for _ in range(iterations):
            mid = 0.5 * (lo + hi)
            f_mid = _pick(dense, mid, rows) - level
            same = np.sign(f_mid) == np.sign(f_lo)
            lo = np.where(same, mid, lo)
            f_lo = np.where(same, f_mid, f_lo)
            hi = np.where(same, hi, mid)
        roots[idx] = 0.5 * (lo + hi)
    return [float(r) for r in roots]


def _pick(dense, times, rows) -> np.ndarray:
    """One component per time: dense(times[i])[rows[i]], evaluated segment-wise to bound memory."""
    out = np.empty(times.size)
    order = np.argsort(times)
    chunk = 256
    for start in range(0, times.size, chunk):
        sel = order[start : start + chunk]
        z = dense(times[sel])
        out[sel] = z[rows[sel], np.arange(sel.size)]
    return out
