"""The distillation side: condenser slip, solvent build-up in the tub, degassing, compound targets."""

from pathlib import Path

import numpy as np
import pytest

from vacsim import constants as c
from vacsim.components import condenser, tub_solvent
from vacsim.properties import solvents
from vacsim.scenario import build_scenario, load_scenario, read_raw
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[2] / "scenarios"


@pytest.fixture(scope="module")
def warm():
    return simulate(load_scenario(SCENARIOS / "acetone-warm-coolant.toml"))


def _solvent_creep(r):
    return r.series["floor_pressure_pa"] - r.series["vapor_pressure_pa"]


def test_warm_coolant_floor_creeps_up(warm):
    creep = _solvent_creep(warm)
    assert creep[-1] - creep[10] > 500.0  # more than 5 mbar of acetone in the floor by the end
    assert np.all(np.diff(warm.series["solvent_tub_kg"]) >= -1e-12)
    assert warm.summary["solvent_in_tub_kg"] > 0.05
    codes = [w["code"] for w in warm.summary["warnings"]]
    assert {"condenser_cannot_condense", "flammable_headspace", "pot_dry"} <= set(codes)
    # while the pot boils the pressure is held up near acetone's vapor pressure at the 20 degC coolant
    p_cool = solvents.vapor_pressure("acetone", c.ZERO_CELSIUS + 20.0)
    assert warm.at("pressure_pa", 3600.0) == pytest.approx(p_cool, rel=0.03)


def test_pot_runs_dry(warm):
    # 395 g charged, 3 g/min boiled up: dry after about 132 min, then the boil-up stops
    boiled = warm.series["boiled_kg"]
    assert boiled[-1] == pytest.approx(0.395, rel=0.01)
    dry = next(w for w in warm.summary["warnings"] if w["code"] == "pot_dry")
    assert dry["time_s"] == pytest.approx(395 / 3 * 60, rel=0.03)
    assert warm.at("boil_up_pa_m3_s", 170 * 60.0) < 1e-3 * warm.at("boil_up_pa_m3_s", 600.0)


@pytest.mark.parametrize("override", [[], ["condenser.coolant_temperature=-40 degC"]])
def test_cold_trap_or_colder_coolant_keeps_floor(override):
    name = "acetone-cold-trap.toml" if not override else "acetone-warm-coolant.toml"
    r = simulate(load_scenario(SCENARIOS / name, override))
    assert r.summary["solvent_floor_pa"] < 5.0  # under 0.05 mbar
    assert np.max(_solvent_creep(r)) < 150.0  # only the motive-air share remains
    assert "condenser_cannot_condense" not in [w["code"] for w in r.summary["warnings"]]


def _toluene_raw():
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw["name"] = "toluene-into-tub"
    raw["target"] = {"compound": "toluene", "boiling_temperature": "40 degC"}
    raw["pot"] = {"liquid_volume": "0.5 L", "temperature": "70 degC", "boil_up_rate": "2 g/min"}
    raw["condenser"] = {"coolant_temperature": "25 degC"}
    raw["tub"].update(liquid_volume="3 L", ua="1.5 W/K")
    return raw


def test_immiscible_distillate_adds_its_own_vapor_pressure():
    # A floating toluene layer adds its whole vapor pressure to the floor (DESIGN sec. 5; Raoult
    # for a pure second phase). Check value: toluene's own vapor pressure at the tub temperature.
    r = simulate(build_scenario(_toluene_raw(), "toluene"))
    tub_t = r.summary["final_tub_temperature_k"]
    solubility = solvents.get_compound("toluene").solubility_mass_fraction  # CRC, 0.053 wt%
    assert r.summary["solvent_in_tub_kg"] > 1.5 * solubility * r.series["water_mass_kg"][-1]
    assert r.summary["solvent_floor_pa"] == pytest.approx(float(solvents.vapor_pressure("toluene", tub_t)), rel=0.02)
    assert "solvent_phase_separated" in [w["code"] for w in r.summary["warnings"]]


def test_solvent_partial_pressure_limits():
    # Henry's law in the dilute limit, the pure vapor pressure above solubility (Sander 2023 eq. 2)
    hcp, p_sat = 1.5e-3, 3000.0
    dilute = tub_solvent.solvent_partial_pressure(0.01, 10.0, 0.01, hcp, p_sat)
    assert dilute == pytest.approx(0.01 / 0.01 / hcp, rel=1e-4)
    assert tub_solvent.solvent_partial_pressure(10.0, 10.0, 0.01, hcp, p_sat) == pytest.approx(p_sat, rel=1e-6)
    raoult = tub_solvent.solvent_partial_pressure(0.0555, 10.0, 0.01, None, p_sat)
    assert raoult == pytest.approx(0.0555 / (10.0 / c.MOLAR_MASS_WATER) * p_sat, rel=1e-3)


def test_colburn_slip():
    # Colburn & Hougen 1934: gas leaving saturated carries p_s/(p - p_s) of vapor per unit gas
    q = condenser.slip_throughput(1e-3, 2000.0, 1000.0, 1e6)
    assert q == pytest.approx(1e-3 * 1000.0 / 1000.0, rel=1e-6)
    assert condenser.slip_throughput(1e-3, 900.0, 1000.0, 0.5) == 0.5  # cannot condense: all slips
    assert condenser.slip_throughput(1e-3, 1000.1, 1000.0, 0.5) < 0.5


def _degassing_raw(saturated):
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw["name"] = "degassing"
    raw["run"]["duration"] = "40 min"
    raw["apparatus"]["volume"] = "1 L"
    raw["pot"] = {"compound": "water", "liquid_volume": "1 L", "temperature": "20 degC", "degassing_rate": "0.005 1/s", "air_saturated": saturated}
    return raw


def test_degassing_shoulder():
    gassy = simulate(build_scenario(_degassing_raw(True), "gassy"))
    free = simulate(build_scenario(_degassing_raw(False), "free"))
    t = gassy.time_s
    p_g = np.interp(t, gassy.time_s, gassy.series["pressure_pa"])
    p_f = np.interp(t, free.time_s, free.series["pressure_pa"])
    early = (t > 60) & (t < 300)
    assert np.min(p_g[early] - p_f[early]) > 50.0  # the early shoulder: over 0.5 mbar above the gas-free curve
    assert abs(p_g[-1] - p_f[-1]) < 0.01 * p_f[-1]  # converged later
    assert gassy.series["pot_air_mol"][-1] < 0.05 * gassy.series["pot_air_mol"][0]


def test_compound_target_and_boiling_column(tmp_path, warm):
    # acetone boils at 25 degC at its vapor pressure there (solvent table), 308 mbar
    assert warm.summary["target_pressure_pa"] == pytest.approx(float(solvents.vapor_pressure("acetone", 298.15)))
    header = warm.csv_text().splitlines()[0].split(",")
    assert "target_boiling_temperature_k" in header
    t_b = warm.series["target_boiling_temperature_k"]
    p = warm.series["pressure_pa"]
    assert t_b[-1] == pytest.approx(float(solvents.boiling_temperature("acetone", p[-1])), rel=1e-9)
    raw = read_raw(SCENARIOS / "acetone-warm-coolant.toml")
    raw["target"] = {"compound": "ethanol", "pot_temperature": "45 degC"}
    s = build_scenario(raw, "pot-limit")
    from vacsim.simulation import target_pressure

    # pot kept below 45 degC: the pressure at which ethanol boils at 45 degC (~230 mbar)
    assert target_pressure(s) == pytest.approx(float(solvents.vapor_pressure("ethanol", c.ZERO_CELSIUS + 45.0)))
    assert 200e2 < target_pressure(s) < 260e2  # CRC: ethanol 45 degC ~ 231 mbar (from memory)
