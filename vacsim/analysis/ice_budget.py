"""Ice budget: the least ice that holds the target pressure for the run, found over whole runs.

The question "how much ice?" is answered by simulating the run, not by a formula: the amount is
the root of a measure of how far the run falls short of holding the target, found by a bracketed
search (regula falsi with the Illinois modification, bisection where no interpolation is
trustworthy) to 1 % of the answer or 10 g, whichever is larger. The answer returned is always
the upper end of the final bracket, i.e. an amount that a simulation has shown to hold.

Two plans:

* initial charge: the least `tub.ice` at the start;
* top-up: the initial charge fixed at the scenario's `tub.ice`, the least equal additions at a
  fixed interval (schedule entries `add_ice`), reported as a schedule.

The measures (both continuous in the amount, monotone, positive while it falls short):

* initial charge: the hold shortfall in seconds, required end - the time the target is lost;
  when the target still holds at the end, minus the time the end-of-run pressure would need to
  reach the target at its final rate of rise (a linear extrapolation, continuous at zero);
* top-up: the highest pressure over the hold after the pump-down minimum, minus the target
  [Pa]; the shortfall in time jumps at each addition, the pressure excess does not.

The first guess comes from the energy balance of the ice-free run: the heat entering the tub
while it falls short, divided by what a kilogram of ice absorbs.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .. import constants as c
from ..errors import InputError
from ..scenario import Scenario, build_scenario, raw_of, set_key, source_of

# Solve tolerance: 1 % of the answer or 10 g, whichever is larger (the contract).
RELATIVE_TOLERANCE = 0.01
ABSOLUTE_TOLERANCE_KG = 0.010
# Safety factor on the energy-balance first guess, so that it usually already holds.
FIRST_GUESS_FACTOR = 1.15
# Where the bracket search gives up growing the amount (kg of ice per kg of tub liquid).
MAX_ICE_PER_LIQUID = 10.0
MAX_SIMULATIONS = 40
# Fraction of the tolerance by which a step aims past the interpolated root, so that a good
# estimate closes the bracket from both sides in two runs.
_AIM = 0.45


def ice_absorbed_heat(latent_heat, ice_heat_capacity, ice_temperature, melt_temperature, water_heat_capacity, final_temperature):
    """Heat one kilogram of ice absorbs from the tub: warm to the melting point, melt, warm the
    meltwater to the tub temperature (first law, enthalpy of each step).

    Parameters
    ----------
    latent_heat : float or ndarray
        Latent heat of fusion at the melting temperature [J/kg].
    ice_heat_capacity : float or ndarray
        Specific heat capacity of ice [J/(kg K)].
    ice_temperature, melt_temperature, final_temperature : float or ndarray
        Ice as added, the solution's freezing point, and the tub temperature the meltwater
        ends at [K].
    water_heat_capacity : float or ndarray
        Specific heat capacity of the meltwater [J/(kg K)].

    Returns
    -------
    float or ndarray
        Heat absorbed per kilogram of ice [J/kg].
    """
    warm_ice = ice_heat_capacity * (melt_temperature - ice_temperature)  # negative: 0 degC ice cooling into a brine
    warm_meltwater = water_heat_capacity * np.maximum(final_temperature - melt_temperature, 0.0)
    return warm_ice + latent_heat + warm_meltwater  # sum of the enthalpy steps


def energy_balance_ice(heat_flow, duration, absorbed_per_kg):
    """Ice that absorbs a steady heat flow for a time: m = Q t / q (first law).

    Parameters
    ----------
    heat_flow : float or ndarray
        Heat entering the tub [W].
    duration : float or ndarray
        How long the ice must absorb it [s].
    absorbed_per_kg : float or ndarray
        Heat a kilogram of ice absorbs [J/kg] (see ice_absorbed_heat).

    Returns
    -------
    float or ndarray
        Ice mass [kg].
    """
    return np.maximum(heat_flow, 0.0) * np.maximum(duration, 0.0) / absorbed_per_kg  # m = Q t / q


@dataclass
class _Point:
    amount: float  # kg: the initial charge, or each top-up
    holds: bool
    value: float  # the measure (> 0 falls short)
    reached: bool
    result: object
    t_reach: float | None
    required_end: float
    scenario: object = None


@dataclass
class IcePlan:
    """The answer of `solve_ice`. SI units; `to_json` gives the `vacsim ice --json` object."""

    feasible: bool
    mode: str  # "initial" or "top-up"
    target_pressure_pa: float
    ice_kg: float | None  # the solved amount: the initial charge, or each addition
    schedule: list = field(default_factory=list)  # [{at_s, ice_kg}], the initial charge at 0
    total_ice_kg: float | None = None
    initial_ice_kg: float | None = None
    top_up_every_s: float | None = None
    hold_from_s: float | None = None
    hold_until_s: float | None = None
    required_hold_s: float | None = None
    usable_duration_s: float = 0.0
    reason: str | None = None
    best_pressure_pa: float | None = None
    tolerance_kg: float | None = None
    simulations: int = 0
    run_duration_s: float | None = None
    fits: bool | None = None
    ice_volume_m3: float | None = None
    free_volume_m3: float | None = None
    warnings: list = field(default_factory=list)  # [{code, message}]
    result: object = None  # RunResult of the plan (or of the best attempt when infeasible)
    scenario: object = None  # the Scenario of that run

    def to_json(self) -> dict:
        keys = (
            "feasible", "mode", "ice_kg", "schedule", "total_ice_kg", "initial_ice_kg", "top_up_every_s",
            "usable_duration_s", "target_pressure_pa", "reason", "best_pressure_pa", "hold_from_s", "hold_until_s",
            "required_hold_s", "tolerance_kg", "simulations", "run_duration_s", "fits", "ice_volume_m3",
            "free_volume_m3", "warnings",
        )
        out = {k: getattr(self, k) for k in keys}
        out["scenario"] = self.scenario.name if self.scenario is not None else None
        out["summary"] = self.result.summary if self.result is not None else None
        return out


def with_target(scenario: Scenario, pressure: float) -> Scenario:
    """The same scenario with its target replaced by a pressure [Pa] (--hold).

    A hold at or above the barometric pressure is refused: the apparatus starts there, so such
    a "target" is met at time zero without any vacuum and every answer would be trivially 0.
    """
    from ..units import format_pressure

    if not (pressure > 0):
        raise InputError(f"--hold: expected a pressure above zero, got {pressure!r} Pa")
    baro = scenario.barometric_pressure
    if pressure >= baro:
        raise InputError(
            f"--hold: {format_pressure(pressure)} is at or above the barometric pressure ({format_pressure(baro)}); "
            "give a vacuum to hold, below it (e.g. '25 mbar')"
        )
    raw = raw_of(scenario)
    raw["target"] = {"pressure": f"{pressure!r} Pa"}
    return build_scenario(raw, source_of(scenario))


# ---- helpers on a run -----------------------------------------------------------------------


def _until(result, t_end: float):
    """Time and pressure samples up to t_end, the pre-jump sample at t_end included."""
    t = np.asarray(result.time_s)
    p = np.asarray(result.series["pressure_pa"])
    idx = np.searchsorted(t, t_end - 1e-9, side="left")
    stop = min(idx + 1, len(t))
    return t[:stop], p[:stop]


def _run_end(s: Scenario) -> float:
    """When the run's vacuum ends: its duration, or an earlier scheduled vent or pump stop [s]."""
    stops = [e.at for e in s.schedule if e.vent or e.pump == "off"]
    return min([s.run.duration, *stops])


def _holds(summary: dict, required_end: float) -> bool:
    end = summary["usable_end_s"]
    return summary["usable_start_s"] is not None and end is not None and end >= required_end - 1e-6


def _time_shortfall(result, summary, target, required_end, duration) -> float:
    """Seconds by which the first usable window falls short of required_end (< 0: to spare)."""
    end = summary["usable_end_s"]
    if end < required_end - 1e-6 or end < duration - 1e-6:
        return required_end - end
    t, p = _until(result, required_end)
    recent = t >= t[-1] - 600.0
    slope = np.polyfit(t[recent], p[recent], 1)[0] if recent.sum() >= 3 else 0.0
    spare = (target - p[-1]) / slope if slope > 0 else duration
    return -min(spare, duration)


def _pressure_excess(result, target, required_end) -> float:
    """Highest pressure after the pump-down minimum, up to required_end, minus the target [Pa]."""
    t, p = _until(result, required_end)
    below = np.nonzero(p <= target)[0]
    i = int(below[0]) if len(below) else 0
    while i + 1 < len(p) and p[i + 1] <= p[i]:
        i += 1
    return float(np.max(p[i:]) - target)


# ---- feasibility without simulating -----------------------------------------------------------


def best_floor(s: Scenario) -> tuple[float | None, float, float]:
    """The lowest steady pressure the rig can hold with its tub at the fluid's freezing point.

    Returns
    -------
    (ultimate [Pa] or None with the pump off, freezing point [K], jet shut-off pressure [Pa])
    """
    from ..model import T, build_rig, initial_controls, initial_state
    from ..properties import fluid
    from ..simulation import ultimate_pressure

    rig = build_rig(s)
    y = initial_state(s, rig)
    ctl = initial_controls(s, rig)
    t_f = float(fluid.freezing_point(s.tub.glycol, s.tub.glycol_mass_fraction))
    y[T] = t_f
    return ultimate_pressure(rig, ctl, y), t_f, max(float(rig.shutoff_pressure), 0.0)


def _infeasible_reason(s: Scenario, target: float) -> tuple[str | None, float | None]:
    from ..units import format_pressure, format_temperature

    p_best, t_f, p_shut = best_floor(s)
    if p_shut > target:
        return (
            f"the feed pump is below the ejector's working head: the jet shuts off at {format_pressure(p_shut)}, "
            f"above the {format_pressure(target)} target, whatever the tub temperature (more feed pressure at the "
            f"nozzle would help; ice will not)",
            p_best,
        )
    if p_best is not None and p_best > target:
        return (
            f"even with the tub held at its freezing point ({format_temperature(t_f)}) the rig's floor is "
            f"{format_pressure(p_best)}, above the {format_pressure(target)} target: no amount of ice can hold it "
            f"(a colder fluid such as a chilled glycol mix, a tighter apparatus or a stronger jet could)",
            p_best,
        )
    return None, p_best


# ---- the search ---------------------------------------------------------------------------------


def _tolerance(amount: float, rel: float, abs_: float) -> float:
    return max(rel * abs(amount), abs_)


def _interpolate(lo: _Point, hi: _Point, f_lo: float, f_hi: float) -> float | None:
    if not (lo.reached and hi.reached) or not (f_lo > 0 >= f_hi) or f_lo == f_hi:
        return None
    return lo.amount + (hi.amount - lo.amount) * f_lo / (f_lo - f_hi)


def _bracket_and_solve(evaluate, first: _Point, guess: float, cap: float, rel: float, abs_: float, budget):
    """Least amount that holds: grow from `guess` until a run holds, then narrow the bracket.

    Returns (the holding point or None, the failing point below it: with None, the most-ice
    attempt).
    """
    lo = first
    hi = evaluate(guess)
    while not hi.holds:
        if hi.amount >= cap or budget() <= 0:
            return None, hi
        if lo.reached and hi.reached and hi.value >= lo.value * (1.0 - 1e-3) and hi.amount > lo.amount:
            return None, hi  # more ice did not help
        slope_step = None
        if lo.reached and hi.reached and hi.value < lo.value:
            slope_step = hi.value * (hi.amount - lo.amount) / (lo.value - hi.value)
        grow = hi.amount + 1.25 * slope_step if slope_step is not None else 2.0 * hi.amount
        nxt = min(max(grow, 1.5 * hi.amount), 4.0 * hi.amount, cap)
        lo, hi = hi, evaluate(nxt)

    f_lo, f_hi = lo.value, hi.value
    kept = None  # which end the last step kept (Illinois)
    aim_up = True
    while hi.amount - lo.amount > _tolerance(hi.amount, rel, abs_) and budget() > 0:
        width = hi.amount - lo.amount
        tol = _tolerance(hi.amount, rel, abs_)
        root = _interpolate(lo, hi, f_lo, f_hi)
        if root is None:
            trial = 0.5 * (lo.amount + hi.amount)
        else:
            trial = root + (_AIM if aim_up else -_AIM) * tol
        margin = min(0.05 * width, 0.25 * tol)
        trial = min(max(trial, lo.amount + margin), hi.amount - margin)
        p = evaluate(trial)
        if p.holds:
            hi, f_hi = p, p.value
            if kept == "lo":
                f_lo *= 0.5  # Illinois: the stale end's weight is halved
            kept = "lo"
            aim_up = False
        else:
            lo, f_lo = p, p.value
            if kept == "hi":
                f_hi *= 0.5
            kept = "hi"
            aim_up = True
    return hi, lo


def solve_ice(
    scenario: Scenario,
    hold: float | None = None,
    hold_for: float | None = None,
    top_up_every: float | None = None,
    rel_tol: float = RELATIVE_TOLERANCE,
    abs_tol: float = ABSOLUTE_TOLERANCE_KG,
    max_simulations: int = MAX_SIMULATIONS,
) -> IcePlan:
    """The least ice that holds the target from when it is first reached to the end of the run.

    Parameters
    ----------
    scenario : Scenario
        The run (its tub.ice is the initial charge for a top-up plan, else ignored).
    hold : float, optional
        Pressure to hold [Pa] instead of the scenario's target.
    hold_for : float, optional
        Hold for this long after the target is first reached [s], instead of to the end of the
        run (the run is lengthened if it is too short).
    top_up_every : float, optional
        Plan equal additions at this interval [s], the initial charge fixed.
    rel_tol, abs_tol : float
        Solve tolerance: the bracket is narrowed to max(rel_tol * answer, abs_tol [kg]).
    max_simulations : int
        Give up (with what was found so far) after this many runs.

    Returns
    -------
    IcePlan
    """
    from ..simulation import simulate, target_pressure

    source = source_of(scenario)
    base = with_target(scenario, hold) if hold is not None else scenario
    raw = raw_of(base)
    target = target_pressure(base)
    if target is None:
        raise InputError(f"{source}: no target pressure: give --hold PRESSURE or a [target] section")
    if hold_for is not None and not hold_for > 0:
        raise InputError(f"--for: expected a duration above zero, got {hold_for!r} s")
    mode = "top-up" if top_up_every is not None else "initial"
    if top_up_every is not None and not (0 < top_up_every < base.run.duration):
        raise InputError(f"--top-up: the interval must be above zero and shorter than the run ({base.run.duration / 60:.0f} min)")
    plan = IcePlan(feasible=False, mode=mode, target_pressure_pa=target, ice_kg=None, top_up_every_s=top_up_every)
    plan.initial_ice_kg = base.tub.ice if mode == "top-up" else None

    reason, p_best = _infeasible_reason(base, target)
    if reason is not None:
        plan.reason = reason
        plan.best_pressure_pa = p_best
        plan.scenario = base
        plan.run_duration_s = base.run.duration
        return plan

    state = {"raw": raw, "sims": 0, "times": None}

    def scenario_for(amount: float) -> Scenario:
        r = state["raw"]
        if mode == "initial":
            r = set_key(r, "tub.ice", f"{amount!r} kg")
        elif amount > 0:
            extra = [{"at": f"{t!r} s", "add_ice": f"{amount!r} kg"} for t in state["times"]]
            r = dict(r)
            r["schedule"] = list(r.get("schedule", [])) + extra
        return build_scenario(r, source)

    def run(amount: float):
        s = scenario_for(amount)
        state["sims"] += 1
        return s, simulate(s)

    def evaluate(amount: float) -> _Point:
        s, result = run(amount)
        sm = result.summary
        t_reach = sm["usable_start_s"]
        if hold_for is not None and t_reach is not None and t_reach + hold_for > _run_end(s) + 1e-6:
            if any(e.vent or e.pump == "off" for e in s.schedule):
                raise InputError(f"--for: the schedule vents or stops the pump before {(t_reach + hold_for) / 60:.0f} min")
            longer = math.ceil((t_reach + hold_for) / 60.0 + 10.0)
            state["raw"] = set_key(state["raw"], "run.duration", f"{longer} min")
            s, result = run(amount)
            sm = result.summary
            t_reach = sm["usable_start_s"]
        run_end = _run_end(s)
        required_end = min(t_reach + hold_for, run_end) if (hold_for is not None and t_reach is not None) else run_end
        reached = t_reach is not None
        holds = reached and _holds(sm, required_end)
        if mode == "initial" and reached:
            value = _time_shortfall(result, sm, target, required_end, run_end)
        elif mode == "initial":
            value = required_end
        else:
            value = _pressure_excess(result, target, required_end)
        # the measure and the run's own windows must agree on which side of the root we are
        if holds and value > 0:
            value = -1e-9
        if not holds and value <= 0:
            value = 1e-9
        return _Point(amount, holds, float(value), reached, result, t_reach, required_end, s)

    def budget() -> int:
        return max_simulations - state["sims"]

    if mode == "top-up":
        # The schedule's times come from when the target is first reached (ice-free top-ups).
        state["times"] = []
    zero_amount = 0.0
    first = evaluate(zero_amount)
    if mode == "top-up":
        stop = first.required_end
        state["times"] = [k * top_up_every for k in range(1, int(stop / top_up_every) + 2) if k * top_up_every < stop - 1e-6]
        if not state["times"]:
            raise InputError(f"--top-up: no addition falls inside the hold (it ends at {stop / 60:.0f} min)")

    if first.holds:
        answer, below = first, None
    else:
        guess = _first_guess(first, base, target, mode, len(state["times"] or []) or 1)
        cap = MAX_ICE_PER_LIQUID * base.tub.liquid_volume * 1000.0
        answer, below = _bracket_and_solve(evaluate, first, guess, cap, rel_tol, abs_tol, budget)
        if answer is None:
            bf = below
            sm = bf.result.summary
            plan.reason = (
                f"the target is not held to the end even with {bf.amount:.2f} kg of ice"
                + (" per top-up" if mode == "top-up" else "")
                + f": the lowest pressure was {sm['min_pressure_pa'] / 100:.1f} mbar and the window "
                + (f"closed after {sm['usable_duration_s'] / 60:.0f} min" if sm["usable_start_s"] is not None else "never opened")
                + "; more ice does not help (pump-down, leak or jet capacity limit the run)"
            )
            plan.best_pressure_pa = sm["min_pressure_pa"]
            plan.usable_duration_s = sm["usable_duration_s"]
            plan.result, plan.scenario = bf.result, bf.scenario
            plan.simulations = state["sims"]
            plan.run_duration_s = bf.scenario.run.duration
            return plan

    sm = answer.result.summary
    plan.feasible = True
    plan.ice_kg = answer.amount
    # the bracket actually reached (the requested tolerance unless the run budget ran out)
    width = answer.amount - below.amount if below is not None else 0.0
    plan.tolerance_kg = max(_tolerance(answer.amount, rel_tol, abs_tol), width)
    if mode == "initial":
        plan.schedule = [{"at_s": 0.0, "ice_kg": answer.amount}]
        plan.total_ice_kg = answer.amount
    else:
        plan.schedule = [{"at_s": 0.0, "ice_kg": base.tub.ice}] + (
            [{"at_s": t, "ice_kg": answer.amount} for t in state["times"]] if answer.amount > 0 else []
        )
        plan.total_ice_kg = sum(e["ice_kg"] for e in plan.schedule)
    plan.hold_from_s = sm["usable_start_s"]
    plan.hold_until_s = answer.required_end
    plan.required_hold_s = answer.required_end - sm["usable_start_s"]
    plan.usable_duration_s = sm["usable_duration_s"]
    plan.best_pressure_pa = sm["min_pressure_pa"]
    plan.result, plan.scenario = answer.result, answer.scenario
    plan.simulations = state["sims"]
    plan.run_duration_s = answer.scenario.run.duration
    if plan.run_duration_s > base.run.duration + 1e-6:
        plan.warnings.append({"code": "run_lengthened", "message": f"the run was lengthened to {plan.run_duration_s / 60:.0f} min to cover --for"})
    _check_fit(plan, answer.scenario, answer.result)
    return plan


def _first_guess(first: _Point, s: Scenario, target: float, mode: str, n_additions: int) -> float:
    """Energy-balance estimate of the amount, from the ice-free (or top-up-free) run."""
    from ..properties import fluid, ice

    result = first.result
    sm = result.summary
    end = first.required_end
    lost = sm["usable_end_s"] if first.reached and sm["usable_end_s"] is not None else (sm["usable_start_s"] or 0.0)
    short = max(end - lost, 0.1 * end) if first.reached else end
    t_f = float(fluid.freezing_point(s.tub.glycol, s.tub.glycol_mass_fraction))
    t_lost = result.at("tub_temperature_k", min(lost, result.time_s[-1]))
    t_mean = 0.5 * (t_f + max(t_lost, t_f))
    heat = float(result.at("pump_heat_w", min(lost, result.time_s[-1])))  # motor losses included
    ua = sm["ua_w_k"]
    heat += ua * (s.run.ambient_temperature - t_mean)
    per_kg = float(
        ice_absorbed_heat(
            ice.latent_heat_fusion(t_f), ice.heat_capacity(min(s.tub.ice_temperature, t_f)), s.tub.ice_temperature, t_f,
            fluid.heat_capacity("none", 0.0, max(t_mean, c.ZERO_CELSIUS)), t_mean,
        )
    )
    mass = float(energy_balance_ice(heat, short, per_kg)) * FIRST_GUESS_FACTOR
    if mode == "top-up":
        mass /= n_additions
    return max(mass, 4.0 * ABSOLUTE_TOLERANCE_KG)


def _check_fit(plan: IcePlan, s: Scenario, result) -> None:
    """Does the ice (and its meltwater) fit in the tub's free volume?"""
    from ..properties import fluid, ice

    rho_ice = float(ice.density(c.ZERO_CELSIUS))
    rho_water = float(fluid.density("none", 0.0, c.ZERO_CELSIUS + 4.0))
    ice_mass = np.asarray(result.series["ice_mass_kg"])
    meltwater = np.asarray(result.series["water_mass_kg"]) - float(result.series["water_mass_kg"][0])
    occupied = float(np.max(ice_mass / rho_ice + np.maximum(meltwater, 0.0) / rho_water))
    plan.ice_volume_m3 = occupied
    if s.tub.capacity is None:
        plan.fits = None
        if occupied > 0:
            plan.warnings.append({
                "code": "capacity_unknown",
                "message": f"tub.capacity is not given: cannot check that {occupied * 1e3:.2f} L of ice (with its meltwater) fits in the tub",
            })
        return
    free = s.tub.capacity - s.tub.liquid_volume
    plan.free_volume_m3 = free
    plan.fits = occupied <= free
    if not plan.fits:
        plan.warnings.append({
            "code": "ice_does_not_fit",
            "message": f"the ice does not fit: it takes up to {occupied * 1e3:.2f} L (with its meltwater) but the tub has "
            f"{free * 1e3:.2f} L free ({s.tub.capacity * 1e3:.1f} L capacity, {s.tub.liquid_volume * 1e3:.1f} L of liquid); "
            "use a larger tub, less liquid, or top up in smaller portions",
        })
