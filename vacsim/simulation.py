"""Solve the rig model over a run: schedule segments, events, usable windows, warnings."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

from . import constants as c
from .components import ejector
from .errors import SolverError
from .properties._validity import quiet_ranges
from .model import ICE, ICE_GONE_KG, P, STATE, WATER, Controls, Rig, apply_entry, build_rig, fluxes, initial_controls, initial_state, rhs
from .results import RunResult, Warning_, summarise
from .scenario import Scenario

# Stiff methods only: the gas side relaxes in seconds, the tub over hours.
METHODS = ("LSODA", "BDF", "Radau")
# Absolute tolerances per state slot, in its SI unit.
_ATOL = np.array([1e-4, 1e-7, 1e-8, 1e-8, 1e-2, 1e-2, 1e-2, 1e-2, 1e-10, 1e-10, 1e-2, 1e-9])


@dataclass
class _Segment:
    t: np.ndarray
    y: np.ndarray
    controls: Controls


def target_pressure(s: Scenario) -> float | None:
    """The target pressure [Pa]: given, or the compound's vapor pressure at its boiling temperature."""
    if s.target is None:
        return None
    if s.target.pressure is not None:
        return s.target.pressure
    from .properties import solvents

    limit = s.target.boiling_temperature if s.target.boiling_temperature is not None else s.target.pot_temperature
    return float(solvents.vapor_pressure(s.target.compound, limit))


def _events(rig: Rig, controls: Controls, target: float | None):
    def ice_gone(t, y, rig_, ctl_):
        return y[ICE] - ICE_GONE_KG

    ice_gone.terminal = True
    ice_gone.direction = -1
    events = [ice_gone]
    if target is not None:

        def crossing(t, y, rig_, ctl_):
            return y[P] - target

        crossing.terminal = False
        crossing.direction = 0
        events.append(crossing)
    return events


def ultimate_pressure(rig: Rig, controls: Controls, y: np.ndarray) -> float | None:
    """Steady apparatus pressure with the tub frozen at state `y` [Pa] (None with the pump off)."""
    if not controls.pump_on:
        return None
    state = np.array(y, dtype=float)

    def imbalance(p):
        state[P] = p
        f = fluxes(rig, controls, state)
        return float(f.gas_load_pa_m3_s - f.effective_speed_m3_s * (p - f.floor_pressure_pa))

    state[P] = rig.barometric_pressure
    low = float(fluxes(rig, controls, state).vapor_pressure_pa) * (1.0 + 1e-9) + 1e-9
    high = rig.barometric_pressure
    if imbalance(high) >= 0:
        return high
    if imbalance(low) <= 0:
        return low
    return float(brentq(imbalance, low, high, xtol=1e-9, rtol=1e-12))


def simulate(
    scenario: Scenario, *, method: str = "LSODA", rtol: float | None = None, max_step: float | None = None, rig: Rig | None = None
) -> RunResult:
    """Simulate a scenario's run.

    Parameters
    ----------
    scenario : Scenario
        A validated scenario (see vacsim.scenario.load_scenario).
    method : str
        One of METHODS (stiff scipy integrators).
    rtol : float, optional
        Relative tolerance (default: the scenario's run.relative_tolerance).
    max_step : float, optional
        Largest solver step [s] (default: the output interval times 30).
    rig : Rig, optional
        A prepared rig (default: built from the scenario); tests use it to pin components.

    Returns
    -------
    RunResult
    """
    if method not in METHODS and method != "RK45":
        raise ValueError(f"unknown method {method!r}; valid: {', '.join(METHODS)}")
    s = scenario
    rig = build_rig(s) if rig is None else rig
    y = initial_state(s, rig)
    ctl = initial_controls(s, rig)
    target = target_pressure(s)
    duration = s.run.duration
    rtol = s.run.relative_tolerance if rtol is None else rtol
    atol = _ATOL * np.array([1.0, 1.0, max(s.tub.ice, 1e-3), max(y[3], 1e-3), 1, 1, 1, 1, 1, 1, 1, 1])
    max_step = max_step if max_step is not None else 30.0 * s.run.output_interval
    grid = np.unique(np.append(np.arange(0.0, duration, s.run.output_interval), duration))

    warnings: list[Warning_] = []
    crossings: list[tuple[float, int]] = []
    pump_stops: list[float] = []
    vents: list[float] = []
    resumes: list[tuple[float, float]] = []
    ice_gone_s: float | None = None
    stats = {"nfev": 0, "njev": 0, "nlu": 0, "segments": 0}
    entries = sorted(s.schedule, key=lambda e: e.at)
    boundaries = sorted({e.at for e in entries if 0.0 < e.at < duration} | {duration})
    segments: list[_Segment] = []

    # entries at t = 0 apply before the run starts
    for e in (e for e in entries if e.at == 0.0):
        ctl, y = _apply(e, ctl, y, rig, warnings, pump_stops, vents)
    ctl0, y0 = ctl, y.copy()  # the start, after any t = 0 entries
    pump_stops.clear()
    vents.clear()
    segments.append(_Segment(np.array([0.0]), y[:, None].copy(), ctl))
    t = 0.0
    for t_end in boundaries:
        while t < t_end:
            events = _events(rig, ctl, target)
            if ctl.ice_pieces <= 0 or y[ICE] <= ICE_GONE_KG:
                events[0] = _never
            t_eval = grid[(grid > t) & (grid < t_end)]
            t_eval = np.append(t_eval, t_end)
            sol = solve_ivp(
                rhs, (t, t_end), y, method=method, t_eval=t_eval, events=events, args=(rig, ctl),
                rtol=rtol, atol=atol, max_step=max_step,
            )
            stats["nfev"] += sol.nfev
            stats["njev"] += sol.njev
            stats["nlu"] += sol.nlu
            stats["segments"] += 1
            if sol.status == -1:
                raise SolverError(f"{s.name}: integration failed at t = {t:.1f} s: {sol.message}")
            if len(events) > 1:
                for te, ye in zip(sol.t_events[1], sol.y_events[1]):
                    slope = rhs(te, ye, rig, ctl)[P]
                    crossings.append((float(te), -1 if slope < 0 else 1))
            if sol.status == 1 and len(sol.t_events[0]):
                te = float(sol.t_events[0][0])
                ye = sol.y_events[0][0].copy()
                segments.append(_Segment(np.append(sol.t, te), np.column_stack([sol.y, ye]), ctl))
                ye[WATER] += ye[ICE]  # the last crumb (ICE_GONE_KG) joins the liquid; its heat is negligible
                ye[ICE] = 0.0
                ctl = replace(ctl, ice_pieces=0.0)
                ice_gone_s = te
                t, y = te, ye
                continue
            segments.append(_Segment(sol.t, sol.y, ctl))
            t, y = t_end, sol.y[:, -1].copy()
        for e in (e for e in entries if e.at == t_end):
            was_pumping = ctl.pump_on and not ctl.vented
            ctl, y = _apply(e, ctl, y, rig, warnings, pump_stops, vents)
            if ctl.pump_on and not ctl.vented and not was_pumping:
                resumes.append((t_end, float(y[P])))
            if e.add_ice:
                ice_gone_s = None
            segments.append(_Segment(np.array([t_end]), y[:, None].copy(), ctl))

    time = np.concatenate([seg.t for seg in segments])
    states = np.concatenate([seg.y for seg in segments], axis=1)
    derived = [fluxes(rig, seg.controls, seg.y) for seg in segments]
    series = {name: states[i] for i, name in enumerate(STATE)}
    for key in derived[0].__dataclass_fields__:
        series[key] = np.concatenate([np.broadcast_to(np.asarray(getattr(d, key), dtype=float), seg.t.shape) for d, seg in zip(derived, segments)])
    series["pump_on"] = np.concatenate([np.full(seg.t.shape, 1.0 if seg.controls.pump_on else 0.0) for seg in segments])
    series["vented"] = np.concatenate([np.full(seg.t.shape, 1.0 if seg.controls.vented else 0.0) for seg in segments])
    series["exit_vapor_pressure_pa"] = np.concatenate([np.full(seg.t.shape, seg.controls.exit_vapor_pressure) for seg in segments])
    if s.target is not None and s.target.compound is not None:
        from .properties import solvents

        with np.errstate(all="ignore"), quiet_ranges():
            series["target_boiling_temperature_k"] = np.asarray(solvents.boiling_temperature(s.target.compound, series["pressure_pa"]), dtype=float)
    if rig.distillation is not None:
        _distillation_warnings(s, rig, time, series, warnings)

    ultimate0 = ultimate_pressure(rig, ctl0, y0) if not ctl0.vented else None
    _feed_warnings(s, rig, target, ultimate0, warnings)
    _capacity_warning(s, rig, warnings)
    summary = summarise(
        scenario=s, rig=rig, time=time, series=series, target=target, crossings=crossings, pump_stops=pump_stops,
        vents=vents, ice_gone_s=ice_gone_s, ultimate_start=ultimate0, start_fluxes=fluxes(rig, ctl0, y0), warnings=warnings,
        resumes=resumes, pump_on_at_start=ctl0.pump_on and not ctl0.vented,
    )
    return RunResult(scenario=s, time_s=time, series=series, summary=summary, solver={"method": method, **stats})


# Share of the lower flammability limit above which vapor in the tub's headspace is flagged:
# NFPA 69 (Standard on Explosion Prevention Systems) keeps combustible concentrations at or
# below 25 % of the LFL (from memory).
LFL_FRACTION = 0.25
# A compound target overshot by more than this (boiling temperature below the one asked for)
# is flagged: the pot then boils much harder than planned (common practice).
FAR_BELOW_TARGET_K = 15.0


def _first(mask, time):
    idx = np.flatnonzero(mask)
    return float(time[idx[0]]) if idx.size else None


def _distillation_warnings(s: Scenario, rig: Rig, time, series, warnings: list) -> None:
    """Condenser overload, solvent phase separation and flammable headspace, each once."""
    from .properties import solvents

    d = rig.distillation
    comp = solvents.get_compound(d.compound)
    p = series["pressure_pa"]
    boiling = series["boil_up_pa_m3_s"] > 0.05 * max(float(series["boil_up_pa_m3_s"].max()), 1e-30)  # boiling in earnest
    if d.boil_up_mass_rate > 0 and not d.has_condenser and s.trap is None:
        warnings.append(Warning_("no_condenser", f"the pot boils {d.compound} up with no condenser or trap: all of it goes to the pump and the tub.", 0.0))
    # Overloaded: the pressure is at the distillate's vapor pressure at the coolant, or half the
    # boil-up already slips past (the pressure then sits just above it, held up by vapor).
    stalled = boiling & ((p <= series["exit_vapor_pressure_pa"] * 1.001) | (series["slip_pa_m3_s"] >= 0.5 * series["boil_up_pa_m3_s"]))
    t_fail = _first(stalled, time)
    if t_fail is not None and (d.has_condenser or s.trap is not None):
        p_fail = float(np.interp(t_fail, time, p))
        coolant = s.condenser.coolant_temperature if s.condenser else s.trap.temperature
        floor = float(np.min(series["floor_pressure_pa"]))
        with quiet_ranges():
            t_floor = float(solvents.boiling_temperature(comp, floor)) - c.ZERO_CELSIUS
            target = target_pressure(s)
            t_target = float(solvents.boiling_temperature(comp, target)) - c.ZERO_CELSIUS if target else None
        advice = (
            f"At the {target / 100:.0f} mbar target it boils at {t_target:.0f} °C: keep the pressure there (bleed valve) "
            f"with coolant below that (common practice: 20 K colder, {t_target - 20:.0f} °C). "
            if t_target is not None
            else ""
        )
        warnings.append(
            Warning_(
                "condenser_cannot_condense",
                f"CONDENSER OVERLOADED at {t_fail / 60:.0f} min ({p_fail / 100:.1f} mbar): {d.compound} boils below the "
                f"{coolant - c.ZERO_CELSIUS:.1f} °C coolant, so the vapor goes to the pump and into the tub, holding the pressure up. "
                + advice
                + f"Left to the pump's floor ({floor / 100:.0f} mbar) it boils at {t_floor:.0f} °C: only a colder trap keeps it out of the tub.",
                t_fail,
            )
        )
    if d.charge_mass is not None:
        t_dry = _first(series["boiled_kg"] >= 0.99 * d.charge_mass, time)
        if t_dry is not None:
            warnings.append(
                Warning_(
                    "pot_dry",
                    f"the pot has boiled dry at {t_dry / 60:.0f} min ({d.charge_mass * 1e3:.0f} g of {d.compound} charged): "
                    "stop heating before that; never distil to dryness (residues, peroxides from ethers).",
                    t_dry,
                )
            )
    if d.has_condenser and s.trap is not None and s.condenser is not None:
        bypass = boiling & (p <= np.array([float(solvents.vapor_pressure(comp, s.condenser.coolant_temperature))]) * 1.001)
        t_bypass = _first(bypass, time)
        if t_bypass is not None:
            warnings.append(
                Warning_(
                    "condenser_bypassed",
                    f"from {t_bypass / 60:.0f} min the {s.condenser.coolant_temperature - c.ZERO_CELSIUS:.0f} °C condenser cannot condense "
                    f"{d.compound}: the cold trap collects the distillate. Watch it: empty it before it fills or plugs.",
                    t_bypass,
                )
            )
    if s.target is not None and s.target.compound is not None and "target_boiling_temperature_k" in series:
        asked = s.target.boiling_temperature if s.target.boiling_temperature is not None else s.target.pot_temperature
        pumping = series["pump_on"] > 0
        if d.boil_up_mass_rate > 0:
            pumping = pumping & boiling  # while the pot boils: that is when overshooting matters
        coldest = float(np.nanmin(series["target_boiling_temperature_k"][pumping])) if pumping.any() else asked
        if coldest < asked - FAR_BELOW_TARGET_K:
            t_far = _first(pumping & (series["target_boiling_temperature_k"] < asked - FAR_BELOW_TARGET_K), time)
            warnings.append(
                Warning_(
                    "far_below_target",
                    f"the rig pulls the boiling pot down to {float(np.min(p[pumping])) / 100:.0f} mbar, where {s.target.compound} boils at "
                    f"{coldest - c.ZERO_CELSIUS:.0f} °C, {asked - coldest:.0f} K below the {asked - c.ZERO_CELSIUS:.0f} °C asked for: "
                    "the pot boils harder and may bump or foam over, and the condenser must take colder vapor. "
                    "Hold the pressure near the target with a bleed valve or a vacuum regulator.",
                    t_far,
                )
            )
    solvent = series["solvent_tub_kg"]
    if d.solubility_mass_fraction is not None:
        t_sep = _first(solvent > d.solubility_mass_fraction * series["water_mass_kg"], time)
        if t_sep is not None:
            warnings.append(
                Warning_(
                    "solvent_phase_separated",
                    f"{d.compound} in the tub exceeds its solubility in water ({100 * d.solubility_mass_fraction:.2g} wt%, {comp.solubility_source}) "
                    f"at {t_sep / 60:.0f} min: a separate layer forms and adds its full vapor pressure to the floor. Change the tub water.",
                    t_sep,
                )
            )
    if comp.lower_flammability_limit is not None:
        share = series["solvent_partial_pressure_pa"] / rig.barometric_pressure
        t_lfl = _first(share >= LFL_FRACTION * comp.lower_flammability_limit, time)
        if t_lfl is not None:
            warnings.append(
                Warning_(
                    "flammable_headspace",
                    f"{d.compound} vapor over the tub reaches {100 * LFL_FRACTION:.0f} % of its lower flammability limit "
                    f"({100 * comp.lower_flammability_limit:.2g} vol%, {comp.flammability_source}) at {t_lfl / 60:.0f} min: "
                    "no sparks or hot surfaces near the tub; run it in a hood; dispose of the water as solvent waste.",
                    t_lfl,
                )
            )


def _never(t, y, *args):
    return 1.0


_never.terminal = False
_never.direction = 0


def _apply(entry, ctl, y, rig, warnings, pump_stops, vents):
    if entry.pump == "off" and ctl.pump_on and not ctl.vented and not entry.vent and y[P] < 0.8 * rig.barometric_pressure:
        warnings.append(
            Warning_(
                "suck_back",
                f"pump stopped at {entry.at / 60:.0f} min with the apparatus under vacuum: tub water can be drawn back into it. "
                "Vent first, then stop the pump.",
                entry.at,
            )
        )
    if entry.pump == "off" and ctl.pump_on:
        pump_stops.append(entry.at)
    if entry.vent:
        vents.append(entry.at)
    return apply_entry(entry, ctl, y, rig)


def _capacity_warning(s: Scenario, rig: Rig, warnings: list) -> None:
    """Warn when the liquid and the largest load of ice would not fit in the tub."""
    if s.tub.capacity is None:
        return
    ice_kg = s.tub.ice
    for e in sorted(s.schedule, key=lambda e: e.at):
        ice_kg += e.add_ice or 0.0  # upper bound: no melting between additions
    volume = s.tub.liquid_volume + ice_kg / rig.ice_density
    if s.tub.liquid_volume > s.tub.capacity:
        warnings.append(
            Warning_("ice_overflow", f"{s.tub.liquid_volume * 1e3:.1f} L of liquid do not fit in the tub's {s.tub.capacity * 1e3:.1f} L (tub.capacity).", 0.0)
        )
    elif volume > s.tub.capacity:
        warnings.append(
            Warning_(
                "ice_overflow",
                f"{s.tub.liquid_volume * 1e3:.1f} L of liquid and up to {ice_kg:.2f} kg of ice ({ice_kg / rig.ice_density * 1e3:.1f} L) "
                f"exceed the tub's {s.tub.capacity * 1e3:.1f} L: it would overflow.",
                0.0,
            )
        )


def _feed_warnings(s: Scenario, rig: Rig, target: float | None, ultimate0: float | None, warnings: list) -> None:
    """Warn when the feed pump is below the ejector's working head for the target."""
    if s.ejector.measured is not None:
        return
    p_baro = rig.barometric_pressure
    rise = float(rig.pump_rise(max(rig.shutoff_pressure, 0.0)))
    reference = target if target is not None else 0.05 * p_baro
    inlet_needed = float(ejector.working_inlet_pressure(reference, p_baro, s.ejector.area_ratio, s.ejector.nozzle_loss, s.ejector.throat_loss, s.ejector.diffuser_loss, s.ejector.diffuser_area_ratio))
    needed = inlet_needed - p_baro
    if rig.shutoff_pressure > reference:
        what = f"the {reference / 100:.1f} mbar target" if target is not None else "a useful vacuum"
        warnings.append(
            Warning_(
                "below_working_head",
                f"the feed pump gives a {rise / 1e5:.2f} bar pressure rise (gauge) at the nozzle; the ejector needs about "
                f"{needed / 1e5:.2f} bar ({needed / c.PSI:.0f} psi) to reach {what}. The jet shuts off at {rig.shutoff_pressure / 100:.0f} mbar.",
                0.0,
            )
        )
