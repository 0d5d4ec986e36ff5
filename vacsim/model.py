"""The coupled rig model: state layout, controls, and the right-hand side of the ODE system.

State vector (SI), one named slot each (see STATE):

    pressure_pa          apparatus pressure p                       [Pa]
    tub_temperature_k    tub liquid temperature T (well mixed)       [K]
    ice_mass_kg          ice floating in the tub                     [kg]
    water_mass_kg        liquid water in the tub (meltwater adds)    [kg]
    pump_heat_j          cumulative pump heat into the tub           [J]
    room_heat_j          cumulative heat from the room               [J]
    melt_heat_j          cumulative heat taken up by melting ice     [J]
    meltwater_heat_j     cumulative heat warming meltwater to T      [J]
    solvent_tub_kg       distillate absorbed by the tub liquid       [kg]
    pot_air_mol          air still dissolved in the pot charge       [mol]
    vapor_heat_j         cumulative condensation heat of absorbed vapor [J]
    boiled_kg            distillate boiled off the pot so far         [kg]

Gas side (DESIGN sec. 2): V dp/dt = Q_leak + Q_degas + Q_slip - S_eff (p - p_floor), S_eff the
ejector's total speed in series with the hose, p_floor the tub fluid's vapor pressure (water and
absorbed distillate) plus the share of the suction the motive liquid's own released air takes. Heat side (DESIGN sec. 4):
(m_liq c_p) dT/dt = P_pump + UA (T_amb - T) - q_melt - mdot_melt c_w (T - T_f).

Everything the RHS needs is computed once in `build_rig` from a Scenario; `Controls` carries
what the schedule changes (ambient, pump on/off, vent, ice piece count).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np

from . import constants as c
from .components import apparatus, condenser, ejector, feed_pump, hose, pot, tub, tub_solvent
from .properties import fluid, ice
from .properties.tabulated import FluidTable, _Row, _row, build_table, hermite
from .scenario import Scenario

STATE = (
    "pressure_pa",
    "tub_temperature_k",
    "ice_mass_kg",
    "water_mass_kg",
    "pump_heat_j",
    "room_heat_j",
    "melt_heat_j",
    "meltwater_heat_j",
    "solvent_tub_kg",
    "pot_air_mol",
    "vapor_heat_j",
    "boiled_kg",
)
IDX = {name: i for i, name in enumerate(STATE)}
P, T, ICE, WATER, E_PUMP, E_ROOM, E_MELT, E_MELTWATER, SOLVENT, POT_AIR, E_VAPOR, BOILED = range(len(STATE))

# Ice below this mass counts as gone (the melt law's m^(2/3) is singular at zero).
ICE_GONE_KG = 1e-6


@dataclass(frozen=True)
class Controls:
    """What the schedule sets, constant between schedule entries."""

    ambient_temperature: float  # K
    pump_on: bool = True
    vented: bool = False
    ice_pieces: float = 0.0  # number of pieces the ice mass is spread over
    coolant_temperature: float | None = None  # K, condenser coolant
    exit_vapor_pressure: float = math.inf  # Pa, distillate vapor pressure where gas leaves condenser/trap


@dataclass(frozen=True)
class Assumption:
    """A default the model relies on, with its source (or 'estimate')."""

    name: str
    value: float | str
    unit: str
    source: str


@dataclass(frozen=True)
class Distillation:
    """The pot, condenser, trap and the distillate's behaviour in the tub, in SI."""

    compound: str
    molar_mass: float  # kg/mol
    boil_up_mass_rate: float  # kg/s while boiling
    pot_vapor_pressure: float | None  # Pa at the pot temperature; None: boils throughout
    has_condenser: bool
    trap_vapor_pressure: float  # Pa (inf without a trap)
    latent_heat: float  # J/kg, released in the tub when slip vapor is absorbed
    gas_temperature: float  # K, at which gas throughputs are counted
    solvent_vapor_row: _Row  # pure distillate vapor pressure over the tub temperature grid [Pa]
    henry_row: _Row | None  # Hcp over the tub temperature grid [mol/(m^3 Pa)]
    solubility_mass_fraction: float | None  # in water; None = miscible
    pot_volume: float  # m^3
    degassing_rate: float  # 1/s
    pot_air_saturation: float  # mol/m^3 at the pot temperature, 1 atm air
    charge_mass: float | None = None  # kg of distillate in the pot at the start (None: never runs dry)

    def exit_vapor_pressure(self, coolant_temperature: float | None) -> float:
        """Distillate vapor pressure of the gas leaving the condenser (and trap) [Pa]."""
        from .properties import solvents

        condenser = math.inf if coolant_temperature is None else float(solvents.vapor_pressure(self.compound, coolant_temperature))
        return min(condenser, self.trap_vapor_pressure)


@dataclass(frozen=True)
class Rig:
    """Everything fixed about a rig and run, in SI, ready for the RHS."""

    volume: float
    leak_rate: float
    barometric_pressure: float
    hose_diameter: float
    hose_length: float
    glycol: str
    glycol_mass: float
    ua: float
    ice_heat_transfer: float
    ice_density: float
    ice_piece_size: float
    ice_temperature: float
    motor_heat: float
    # ejector
    entrainment_ratio: float
    cutoff_width: float
    shutoff_pressure: float  # Pa (may be negative: jet not the limit)
    measured_pressure: np.ndarray | None
    measured_dry_air_speed: np.ndarray | None
    measured_vapor_pressure: float
    motive_degassing: float
    # motive flow and pump pressure rise tabulated against suction pressure
    suction_grid: np.ndarray
    motive_flow_grid: np.ndarray
    pump_rise_grid: np.ndarray
    table: FluidTable
    distillation: Distillation | None = None
    assumptions: tuple[Assumption, ...] = field(default=())

    def motive_flow(self, suction_pressure):
        """Motive flow at a suction pressure [m^3/s] (operating point, tabulated)."""
        return np.interp(suction_pressure, self.suction_grid, self.motive_flow_grid)

    def pump_rise(self, suction_pressure):
        """Feed-pump pressure rise at the operating point [Pa]."""
        return np.interp(suction_pressure, self.suction_grid, self.pump_rise_grid)


def _pump_curve(s: Scenario):
    fp = s.feed_pump
    if fp.curve == "table":
        flows = np.array([q for q, _ in fp.points])
        rises = np.array([dp for _, dp in fp.points])
        return lambda q: feed_pump.table_curve(q, flows, rises)
    shape = feed_pump.CURVES[fp.curve]
    return lambda q: shape(q, fp.shutoff_pressure, fp.free_flow)


def build_rig(s: Scenario) -> Rig:
    """Turn a validated scenario into the fixed data the RHS uses."""
    tb, ej = s.tub, s.ejector
    p_baro = s.barometric_pressure
    t0 = s.initial_tub_temperature
    rho0 = float(fluid.density(tb.glycol, tb.glycol_mass_fraction, t0))
    liquid_mass = tb.liquid_volume * rho0
    assumptions: list[Assumption] = []

    if tb.ua is not None:
        ua = tb.ua
    else:
        if tb.wall_area is not None:
            area = tb.wall_area
        else:
            # An open, roughly cubic tub: four walls, bottom and the open surface all exchange heat.
            side = tb.liquid_volume ** (1.0 / 3.0)
            area = 6.0 * side**2
            assumptions.append(Assumption("tub.wall_area", area, "m^2", "estimate: cube of the liquid volume, six faces"))
        u = tb.wall_u if tb.wall_u is not None else tub.DEFAULT_WALL_U
        if tb.wall_u is None:
            assumptions.append(Assumption("tub.wall_u", u, "W/(m^2 K)", "estimate from Incropera et al. 2007 Table 1.1 (natural convection 2-25) + radiation"))
        ua = tub.wall_ua(area, u)
    h_ice = tb.ice_heat_transfer if tb.ice_heat_transfer is not None else tub.DEFAULT_ICE_HEAT_TRANSFER
    if tb.ice_heat_transfer is None:
        assumptions.append(Assumption("tub.ice_heat_transfer", h_ice, "W/(m^2 K)", "estimate: low end of forced convection of liquids, Incropera et al. 2007 Table 1.1"))

    curve = _pump_curve(s)
    # Motive flow depends weakly on suction pressure through the nozzle's pressure drop.
    suction_grid = np.linspace(0.0, p_baro, 65)
    flows, rises = [], []
    for ps in suction_grid:
        q, dp = feed_pump.operating_point(curve, ej.nozzle_diameter, rho0, p_baro - ps, ej.nozzle_loss)
        flows.append(q)
        rises.append(dp)
    flows, rises = np.array(flows), np.array(rises)

    if ej.measured is None:
        # Shut-off: the nozzle inlet pressure is that of the operating point at suction ~ shut-off.
        p_shut = 0.0
        for _ in range(4):
            inlet = p_baro + float(np.interp(max(p_shut, 0.0), suction_grid, rises))
            p_shut = float(ejector.shutoff_pressure(inlet, p_baro, ej.area_ratio, ej.nozzle_loss, ej.throat_loss, ej.diffuser_loss, ej.diffuser_area_ratio))
        measured_p = s_air = None
        pv_meas = 0.0
        if "entrainment_ratio" not in s.ejector.model_fields_set:
            assumptions.append(Assumption("ejector.entrainment_ratio", ej.entrainment_ratio, "-", "estimate: middle of 0.5-1.5 (Cunningham & Dopkin 1974); calibrate with vacsim fit"))
        for name in ("area_ratio", "nozzle_loss", "throat_loss", "diffuser_loss", "diffuser_area_ratio"):
            if name not in s.ejector.model_fields_set:
                assumptions.append(Assumption(f"ejector.{name}", getattr(ej, name), "-", "Cunningham 1974; Karassik et al., Pump Handbook 2001, ch. 4 (typical value)"))
        if "cutoff_width" not in s.ejector.model_fields_set:
            assumptions.append(Assumption("ejector.cutoff_width", ej.cutoff_width, "Pa", "estimate (from memory: ~5 mbar)"))
    else:
        p_shut = -math.inf
        measured_p = np.array([p for p, _ in ej.measured])
        s_air = np.array([v for _, v in ej.measured])
        pv_meas = float(fluid.vapor_pressure("none", 0.0, ej.measured_at))
    if "motive_degassing" not in s.ejector.model_fields_set:
        assumptions.append(Assumption("ejector.motive_degassing", ej.motive_degassing, "-", "estimate (from memory: 0.01-0.1 of the motive liquid's dissolved air released at suction)"))
    if "ice_temperature" not in tb.model_fields_set and (tb.ice > 0 or any(e.add_ice for e in s.schedule)):
        assumptions.append(Assumption("tub.ice_temperature", tb.ice_temperature, "K", "estimate: melting ice at 0 degC; freezer ice (-18 degC) absorbs about 11 % more heat per kg"))
    if "ice_piece_size" not in tb.model_fields_set and tb.ice > 0:
        assumptions.append(Assumption("tub.ice_piece_size", tb.ice_piece_size, "m", "common practice: ice cube edge"))
    if s.run.barometric_pressure is None and s.run.altitude is None:
        assumptions.append(Assumption("run.barometric_pressure", c.STANDARD_ATMOSPHERE, "Pa", "standard atmosphere (CGPM 1954)"))
    assumptions.append(Assumption("motive liquid density", rho0, "kg/m^3", "tub fluid at its initial temperature, held for the operating point"))

    table = build_table(tb.glycol, tb.glycol_mass_fraction, t_max=max(t0, s.run.ambient_temperature, *(e.ambient_temperature or 0 for e in s.schedule)) + 60.0)
    distillation = _build_distillation(s, table, assumptions)
    return Rig(
        volume=s.apparatus.volume,
        leak_rate=s.apparatus.leak_rate,
        barometric_pressure=p_baro,
        hose_diameter=s.hose.inner_diameter,
        hose_length=s.hose.length,
        glycol=tb.glycol,
        glycol_mass=liquid_mass * tb.glycol_mass_fraction,
        ua=ua,
        ice_heat_transfer=h_ice,
        ice_density=float(ice.density(c.ZERO_CELSIUS)),
        ice_piece_size=tb.ice_piece_size,
        ice_temperature=tb.ice_temperature,
        motor_heat=s.feed_pump.motor_heat,
        entrainment_ratio=ej.entrainment_ratio,
        cutoff_width=ej.cutoff_width,
        shutoff_pressure=p_shut,
        measured_pressure=measured_p,
        measured_dry_air_speed=s_air,
        measured_vapor_pressure=pv_meas,
        motive_degassing=ej.motive_degassing,
        suction_grid=suction_grid,
        motive_flow_grid=flows,
        pump_rise_grid=rises,
        table=table,
        distillation=distillation,
        assumptions=tuple(assumptions),
    )


DEFAULT_DEGASSING_RATE = 1.0 / 60.0  # 1/s, k_La of a stirred/boiling pot (estimate, from memory)


def _build_distillation(s: Scenario, table: FluidTable, assumptions: list) -> Distillation | None:
    if s.pot is None and s.condenser is None and s.trap is None:
        return None
    from .properties import air, solvents
    from .properties._validity import quiet_ranges

    name = s.distillate
    if name is None:
        return None
    comp = solvents.get_compound(name)
    pot = s.pot
    t_gas = s.run.ambient_temperature
    if pot is not None and pot.boil_up_rate is not None:
        boil = pot.boil_up_rate
    elif pot is not None and pot.heat_input is not None:
        t_ref = (s.target.boiling_temperature or s.target.pot_temperature) if (s.target and s.target.compound) else t_gas
        boil = pot.heat_input / float(solvents.latent_heat_vaporization(comp, t_ref))
        assumptions.append(Assumption("pot.boil_up_rate", boil, "kg/s", "heat_input / latent heat at the target boiling temperature (Clausius-Clapeyron)"))
    else:
        boil = 0.0
    pot_pv = float(solvents.vapor_pressure(comp, pot.temperature)) if pot is not None and pot.temperature is not None else None
    trap_pv = float(solvents.vapor_pressure(comp, s.trap.temperature)) if s.trap is not None else math.inf
    grid = table.temperatures
    with quiet_ranges():
        vap_row = _row(grid, solvents.vapor_pressure(comp, grid))
        henry_row = _row(grid, solvents.henry_solubility(comp, grid)) if comp.henry_hcp is not None else None
        latent = float(solvents.latent_heat_vaporization(comp, s.initial_tub_temperature))
    if comp.henry_hcp is None:
        assumptions.append(Assumption("tub solvent model", "Raoult", "-", f"no Henry constant on file for {comp.name}: ideal solution assumed"))
    pot_volume = pot.liquid_volume if pot is not None and pot.liquid_volume is not None else 0.0
    k_la = pot.degassing_rate if pot is not None and pot.degassing_rate is not None else DEFAULT_DEGASSING_RATE
    if pot is not None and pot.degassing_rate is None and pot_volume > 0:
        assumptions.append(Assumption("pot.degassing_rate", k_la, "1/s", "estimate (from memory: ~1/60 s)"))
    t_pot = pot.temperature if pot is not None and pot.temperature is not None else t_gas
    saturation = float(air.dissolved_air_concentration(max(t_pot, c.ZERO_CELSIUS), s.barometric_pressure)) if pot is not None and pot.air_saturated else 0.0
    if pot_volume > 0 and saturation > 0:
        assumptions.append(Assumption("pot air solubility", saturation, "mol/m^3", "water's air solubility (Sander 2023) used for the pot charge: estimate"))
    return Distillation(
        compound=comp.name,
        molar_mass=comp.molar_mass,
        boil_up_mass_rate=boil,
        pot_vapor_pressure=pot_pv,
        has_condenser=s.condenser is not None,
        trap_vapor_pressure=trap_pv,
        latent_heat=latent,
        gas_temperature=t_gas,
        solvent_vapor_row=vap_row,
        henry_row=henry_row,
        solubility_mass_fraction=comp.solubility_mass_fraction,
        pot_volume=pot_volume,
        degassing_rate=k_la,
        pot_air_saturation=saturation,
        charge_mass=pot.charge if pot is not None else None,
    )


def initial_state(s: Scenario, rig: Rig) -> np.ndarray:
    """State vector at t = 0."""
    tb = s.tub
    t0 = s.initial_tub_temperature
    rho0 = float(fluid.density(tb.glycol, tb.glycol_mass_fraction, t0))
    y = np.zeros(len(STATE))
    y[P] = s.initial_pressure
    y[T] = t0
    y[ICE] = tb.ice
    y[WATER] = tb.liquid_volume * rho0 * (1.0 - tb.glycol_mass_fraction)
    if rig.distillation is not None:
        y[POT_AIR] = rig.distillation.pot_volume * rig.distillation.pot_air_saturation
    return y


def initial_controls(s: Scenario, rig: Rig) -> Controls:
    """Controls at t = 0 (pump on, apparatus closed)."""
    pieces = tub.ice_piece_count(s.tub.ice, rig.ice_piece_size, rig.ice_density) if s.tub.ice > 0 else 0.0
    coolant = s.condenser.coolant_temperature if s.condenser is not None else None
    exit_pv = rig.distillation.exit_vapor_pressure(coolant) if rig.distillation is not None else math.inf
    return Controls(ambient_temperature=s.run.ambient_temperature, pump_on=True, vented=False, ice_pieces=pieces, coolant_temperature=coolant, exit_vapor_pressure=exit_pv)


def apply_entry(entry, controls: Controls, y: np.ndarray, rig: Rig) -> tuple[Controls, np.ndarray]:
    """Apply one schedule entry at its time: new controls and a (possibly jumped) state."""
    y = y.copy()
    changes = {}
    if entry.add_ice:
        changes["ice_pieces"] = controls.ice_pieces + tub.ice_piece_count(entry.add_ice, rig.ice_piece_size, rig.ice_density)
        y[ICE] = np.maximum(y[ICE], 0.0) + entry.add_ice
    if entry.ambient_temperature is not None:
        changes["ambient_temperature"] = entry.ambient_temperature
    if entry.pump is not None:
        changes["pump_on"] = entry.pump == "on"
    if entry.coolant_temperature is not None and rig.distillation is not None:
        changes["coolant_temperature"] = entry.coolant_temperature
        changes["exit_vapor_pressure"] = rig.distillation.exit_vapor_pressure(entry.coolant_temperature)
    if entry.vent is not None:
        changes["vented"] = bool(entry.vent)
        if entry.vent:
            y[P] = rig.barometric_pressure
    gone = y[ICE] <= ICE_GONE_KG  # one flag per column when y holds a batch of states
    if not entry.add_ice and np.any(gone):
        changes["ice_pieces"] = np.where(gone, 0.0, controls.ice_pieces) if np.ndim(gone) else 0.0
    return replace(controls, **changes), y


@dataclass(frozen=True)
class Fluxes:
    """Every rate and derived quantity at one state (scalars or arrays alike)."""

    glycol_mass_fraction: object
    freezing_point_k: object
    vapor_pressure_pa: object
    floor_pressure_pa: object
    motive_flow_m3_s: object
    ejector_speed_m3_s: object
    hose_conductance_m3_s: object
    effective_speed_m3_s: object
    gas_load_pa_m3_s: object
    pump_heat_w: object
    room_heat_w: object
    melt_heat_w: object
    meltwater_heat_w: object
    melt_rate_kg_s: object
    heat_capacity_j_k: object
    boil_up_pa_m3_s: object
    slip_pa_m3_s: object
    degassing_pa_m3_s: object
    solvent_partial_pressure_pa: object
    vapor_heat_w: object
    solvent_rate_kg_s: object
    boil_up_kg_s: object


def ejector_total_speed(rig: Rig, suction_pressure, motive_flow):
    """S_tot at a suction pressure [m^3/s], by the momentum model or the measured curve."""
    if rig.measured_pressure is not None:
        return ejector.total_speed_from_measured(suction_pressure, rig.measured_pressure, rig.measured_dry_air_speed, rig.measured_vapor_pressure)
    return ejector.total_speed(motive_flow, rig.entrainment_ratio, suction_pressure, rig.shutoff_pressure, rig.cutoff_width)


def fluxes(rig: Rig, controls: Controls, y) -> Fluxes:
    """All rates at state `y` (columns of an array of states work too)."""
    p, temp, m_ice, m_water = y[P], y[T], np.maximum(y[ICE], 0.0), y[WATER]
    m_liquid = m_water + rig.glycol_mass
    w = rig.glycol_mass / m_liquid
    tab = rig.table
    t_f = tab.freezing_point(w)
    p_v = tab.vapor_pressure(w, temp)

    if controls.pump_on:
        q_j = rig.motive_flow(p)
        s_tot = ejector_total_speed(rig, p, q_j)
        pump_heat = feed_pump.hydraulic_power(q_j, rig.pump_rise(p)) + rig.motor_heat
        # Air the motive liquid releases at suction takes part of the jet's air throughput
        # (a measured dry-air curve is already net of it).
        released = (0.0 if rig.measured_pressure is not None else rig.motive_degassing) * q_j * tab.dissolved_air_pv(temp) * np.clip(1.0 - p / rig.barometric_pressure, 0.0, 1.0)
        with np.errstate(divide="ignore", invalid="ignore"):
            excess = np.where(s_tot > 0, released / np.where(s_tot > 0, s_tot, 1.0), 0.0)
    else:
        q_j = np.zeros_like(p) if isinstance(p, np.ndarray) else 0.0
        s_tot = q_j
        pump_heat = q_j * 0.0
        excess = q_j * 0.0
    conductance = hose.conductance(rig.hose_diameter, rig.hose_length, p)
    s_eff = hose.series_speed(s_tot, conductance)

    zero = temp * 0.0
    d = rig.distillation
    if d is None:
        boil = slip = degas = p_solvent = vapor_heat = solvent_rate = boil_mass = zero
    else:
        boiling = 1.0 if d.pot_vapor_pressure is None else pot.boiling_fraction(p, d.pot_vapor_pressure)
        if d.charge_mass is not None:
            boiling = boiling * pot.remaining_fraction(y[BOILED], d.charge_mass)
        boil_mass = d.boil_up_mass_rate * boiling
        boil = pot.boil_up_throughput(boil_mass, d.molar_mass, d.gas_temperature)
        n_eq = d.pot_volume * d.pot_air_saturation * np.clip(p / rig.barometric_pressure, 0.0, 1.0)
        degas = pot.degassing_throughput(d.degassing_rate, y[POT_AIR], n_eq, d.gas_temperature)
        slip = condenser.slip_throughput(rig.leak_rate + np.maximum(degas, 0.0), p, controls.exit_vapor_pressure, boil)
        solvent_rate = slip / (c.GAS_CONSTANT * d.gas_temperature) * d.molar_mass if controls.pump_on else zero
        vapor_heat = solvent_rate * d.latent_heat
        p_pure = hermite(temp, tab.temperatures, d.solvent_vapor_row.values, d.solvent_vapor_row.slopes)
        henry = None if d.henry_row is None else hermite(temp, tab.temperatures, d.henry_row.values, d.henry_row.slopes)
        liquid_volume = m_liquid / 1000.0  # m^3; the solvent's share of the floor needs no better
        p_solvent = tub_solvent.solvent_partial_pressure(y[SOLVENT] / d.molar_mass, m_water, liquid_volume, henry, p_pure)
    floor = p_v + p_solvent + excess

    room = tub.room_heat_flow(rig.ua, controls.ambient_temperature, temp)
    if np.any(np.asarray(controls.ice_pieces) > 0):  # per-column piece counts in a batch
        area = tub.ice_surface_area(m_ice, controls.ice_pieces, rig.ice_density)
        q_melt = tub.melt_heat_flow(rig.ice_heat_transfer, area, temp, t_f)
    else:
        q_melt = temp * 0.0
    # Ice goes from its own temperature to the solution's freezing point (warming freezer ice,
    # or cooling 0 degC ice into a brine: the enthalpy path is the same), then melts there.
    latent = tab.latent_heat(w) + tab.ice_heat_capacity(w) * (t_f - rig.ice_temperature)
    mdot = q_melt / latent
    meltwater = mdot * tab.water_heat_capacity(temp) * (temp - t_f)
    cp_liquid = tab.heat_capacity(w, temp)
    return Fluxes(
        glycol_mass_fraction=w,
        freezing_point_k=t_f,
        vapor_pressure_pa=p_v,
        floor_pressure_pa=floor,
        motive_flow_m3_s=q_j,
        ejector_speed_m3_s=s_tot,
        hose_conductance_m3_s=conductance,
        effective_speed_m3_s=s_eff,
        gas_load_pa_m3_s=rig.leak_rate + degas + slip,
        pump_heat_w=pump_heat,
        room_heat_w=room,
        melt_heat_w=q_melt,
        meltwater_heat_w=meltwater,
        melt_rate_kg_s=mdot,
        heat_capacity_j_k=m_liquid * cp_liquid,
        boil_up_pa_m3_s=boil,
        slip_pa_m3_s=slip,
        degassing_pa_m3_s=degas,
        solvent_partial_pressure_pa=p_solvent,
        vapor_heat_w=vapor_heat,
        solvent_rate_kg_s=solvent_rate,
        boil_up_kg_s=boil_mass,
    )


def rhs(t: float, y: np.ndarray, rig: Rig, controls: Controls) -> np.ndarray:
    """dy/dt of the whole rig."""
    f = fluxes(rig, controls, y)
    dy = np.empty((len(STATE),) + np.shape(y)[1:])  # (n_states,) or (n_states, columns...)
    if controls.vented:
        dy[P] = 0.0
    else:
        dy[P] = apparatus.pressure_rate(rig.volume, f.gas_load_pa_m3_s, f.effective_speed_m3_s, y[P], f.floor_pressure_pa)
    dy[T] = (f.pump_heat_w + f.room_heat_w + f.vapor_heat_w - f.melt_heat_w - f.meltwater_heat_w) / f.heat_capacity_j_k
    dy[ICE] = -f.melt_rate_kg_s
    dy[WATER] = f.melt_rate_kg_s
    dy[E_PUMP] = f.pump_heat_w
    dy[E_ROOM] = f.room_heat_w
    dy[E_MELT] = f.melt_heat_w
    dy[E_MELTWATER] = f.meltwater_heat_w
    dy[SOLVENT] = f.solvent_rate_kg_s
    dy[POT_AIR] = -f.degassing_pa_m3_s / (c.GAS_CONSTANT * rig.distillation.gas_temperature) if rig.distillation is not None else 0.0
    dy[E_VAPOR] = f.vapor_heat_w
    dy[BOILED] = f.boil_up_kg_s
    return dy
