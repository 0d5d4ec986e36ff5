"""The coupled rig model against closed forms, conservation laws and invariants."""

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from vacsim import constants as c
from vacsim.components import apparatus
from vacsim.model import build_rig
from vacsim.scenario import build_scenario, load_scenario, read_raw, set_key
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[2] / "scenarios"


def normalised_error(y, y_true, atol, rtol):
    """scipy's normalised error (y - y_true) / (atol + rtol |y_true|)."""
    return np.abs(y - y_true) / (atol + rtol * np.abs(y_true))


def _constant_speed_scenario():
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw["run"].update(duration="120 s", output_interval="0.5 s", relative_tolerance=1e-9, ambient_temperature="20 degC")
    raw["apparatus"].update(volume="2 L", leak_rate="0 mbar*L/s", initial_pressure="1013.25 mbar")
    raw["hose"].update(inner_diameter="50 cm", length="1 cm")  # conductance ~1e7 L/s: no hose
    raw["tub"].update(liquid_volume="1000000 L", initial_temperature="20 degC", ua="0.001 W/K", capacity="1000001 L")
    raw["ejector"].update(motive_degassing=0.0)
    return build_scenario(raw, "constant-speed")


def test_closed_form_pumpdown():
    # DESIGN.md sec. 2 worked check, from the closed form of Chambers 2005 sec. 4.8 /
    # O'Hanlon 2003: V = 2.0 L, S = 0.15 L/s, p_u = water's vapor pressure at 20 degC.
    s = _constant_speed_scenario()
    rig = build_rig(s)
    speed = 0.15e-3  # m^3/s
    rig = replace(rig, motive_flow_grid=np.full_like(rig.motive_flow_grid, speed / rig.entrainment_ratio), cutoff_width=1e-9)
    r = simulate(s, rig=rig, rtol=1e-10, max_step=0.5)
    p_u = r.series["vapor_pressure_pa"][0]
    assert p_u == pytest.approx(2339.3, rel=2e-4)  # IAPWS-95 at 20 degC (DESIGN sec. 5)
    t = r.time_s
    closed = p_u + (101325.0 - p_u) * np.exp(-speed * t / 2.0e-3)
    err = normalised_error(r.series["pressure_pa"], closed, atol=1e-3, rtol=1e-4)
    assert err.max() <= 1.0
    # the worked numbers: 500 mbar at 9.7 s, 100 mbar at 34.1 s, 50 mbar at 48.2 s (derived)
    for p_mbar, t_expected in [(500, 9.7), (100, 34.1), (50, 48.2)]:
        t_hit = np.interp(-p_mbar * 100.0, -r.series["pressure_pa"], t)
        assert t_hit == pytest.approx(t_expected, abs=0.06)
        assert apparatus.pumpdown_time(2.0e-3, speed, 101325.0, p_mbar * 100.0, 2339.3) == pytest.approx(t_expected, abs=0.05)


@pytest.fixture(scope="module")
def iced_run():
    return simulate(load_scenario(SCENARIOS / "bench-iced-top-up.toml", ["run.output_interval=2 s"]))


def _sensible_heat(r):
    s = r.series
    m_liquid = s["water_mass_kg"] / (1.0 - s["glycol_mass_fraction"])
    from vacsim.properties import fluid

    cp = fluid.heat_capacity(r.scenario.tub.glycol, s["glycol_mass_fraction"], s["tub_temperature_k"])
    heat_capacity = m_liquid * cp
    d_t = np.diff(s["tub_temperature_k"])
    return float(np.sum(0.5 * (heat_capacity[1:] + heat_capacity[:-1]) * d_t))


@pytest.mark.parametrize("name", ["bench-iced-top-up.toml", "glycol-chilled.toml", "bench-tap-water.toml", "acetone-warm-coolant.toml"])
def test_energy_balance_closes(name):
    # First law over the run: pump heat + room heat = sensible heat of the liquid + heat taken
    # by the ice (latent, and warming freezer ice) + heat warming the meltwater to the tub;
    # condensation heat of distillate vapor absorbed by the jet counts as heat in.
    r = simulate(load_scenario(SCENARIOS / name, ["run.output_interval=2 s"]), rtol=1e-9)
    s = r.series
    heat_in = s["pump_heat_j"][-1] + s["room_heat_j"][-1] + s["vapor_heat_j"][-1]
    total = s["pump_heat_j"][-1] + abs(s["room_heat_j"]).max() + s["vapor_heat_j"][-1]
    taken = _sensible_heat(r) + s["melt_heat_j"][-1] + s["meltwater_heat_j"][-1]
    assert abs(heat_in - taken) <= 1e-5 * total


def test_ice_never_grows_without_an_addition(iced_run):
    r = iced_run
    ice = r.series["ice_mass_kg"]
    added_at = {e.at for e in r.scenario.schedule if e.add_ice}
    steps = np.diff(ice)
    grows = np.where(steps > 1e-12)[0]
    assert all(r.time_s[i] in added_at or r.time_s[i + 1] in added_at for i in grows)
    assert len(grows) == 1


def test_glycol_mass_conserved():
    r = simulate(load_scenario(SCENARIOS / "glycol-chilled.toml"))
    w = r.series["glycol_mass_fraction"]
    m_w = r.series["water_mass_kg"]
    glycol = w * m_w / (1.0 - w)
    assert np.ptp(glycol) <= 1e-12 * glycol[0]
    assert r.series["ice_mass_kg"][0] + m_w[0] == pytest.approx(r.series["ice_mass_kg"][-1] + m_w[-1], rel=1e-9)


@pytest.mark.parametrize("name", sorted(p.name for p in SCENARIOS.glob("*.toml")))
def test_pressure_never_below_vapor_pressure(name):
    r = simulate(load_scenario(SCENARIOS / name))
    assert np.all(r.series["pressure_pa"] >= r.series["vapor_pressure_pa"] * (1 - 1e-3))


def test_weak_feed_pump_is_reported_and_never_reaches_target():
    r = simulate(load_scenario(SCENARIOS / "weak-feed-pump.toml"))
    codes = [w["code"] for w in r.summary["warnings"]]
    assert "below_working_head" in codes
    assert r.summary["time_to_target_s"] is None and r.summary["usable_duration_s"] == 0.0
    assert r.summary["min_pressure_pa"] > r.summary["target_pressure_pa"]


def test_plain_water_floor_is_vapor_pressure_plus_a_few_mbar():
    # common practice: an aspirator's floor is the water's vapor pressure plus a few mbar
    r = simulate(load_scenario(SCENARIOS / "bench-tap-water.toml"))
    excess = r.summary["ultimate_pressure_start_pa"] - r.series["vapor_pressure_pa"][0]
    assert 50.0 <= excess <= 600.0


@pytest.mark.parametrize("water_c", [10.0, 15.0])
@pytest.mark.parametrize("feed_bar", [3.0, 4.0])
def test_tap_fed_rig_lands_in_10_to_20_mmhg(water_c, feed_bar):
    # Gattermann-Wieland, Laboratory Methods of Organic Chemistry: tap-water aspirators reach
    # 10-20 mmHg depending on water temperature and pressure.
    # the tap main as a constant-pressure source: a flat 'pump curve' at the line pressure
    s = load_scenario(
        SCENARIOS / "bench-tap-water.toml",
        [
            f"tub.initial_temperature={water_c} degC",
            f"run.ambient_temperature={water_c} degC",
            "feed_pump.curve=table",
            f'feed_pump.points=[["0 L/min", "{feed_bar} bar"], ["30 L/min", "{feed_bar} bar"]]',
            "run.duration=20 min",
        ],
    )
    r = simulate(s)
    assert 10.0 <= r.summary["min_pressure_pa"] / c.MMHG <= 20.0


def test_suck_back_warning_when_pump_stops_under_vacuum():
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw = set_key(raw, "schedule", [{"at": "30 min", "pump": "off"}])
    r = simulate(build_scenario(raw, "stop-under-vacuum"))
    codes = [w["code"] for w in r.summary["warnings"]]
    assert "suck_back" in codes
    assert r.summary["usable_end_s"] == pytest.approx(1800.0)
    r_safe = simulate(load_scenario(SCENARIOS / "bench-iced-top-up.toml"))
    assert "suck_back" not in [w["code"] for w in r_safe.summary["warnings"]]


def test_vent_closes_window_and_restores_barometric(iced_run):
    r = iced_run
    assert r.summary["usable_end_s"] == pytest.approx(170 * 60.0)
    assert r.at("pressure_pa", 172 * 60.0) == pytest.approx(r.summary["barometric_pressure_pa"])


# ---- invariants over generated rigs (hypothesis) -------------------------------------------

rigs = st.fixed_dictionaries(
    {
        "volume_l": st.floats(0.2, 5.0),
        "leak": st.floats(0.001, 0.2),
        "nozzle_mm": st.floats(1.0, 2.2),
        "shutoff_bar": st.floats(2.5, 7.0),
        "tub_l": st.floats(5.0, 30.0),
        "ua": st.floats(1.0, 8.0),
        "ambient_c": st.floats(16.0, 30.0),
        "start_below_c": st.floats(0.0, 8.0),
        "ice_kg": st.floats(0.0, 2.0),
        "target_mbar": st.floats(15.0, 40.0),
    }
)


def _raw(g, ice_kg=None, ambient_c=None, tub_l=None):
    ambient = g["ambient_c"] if ambient_c is None else ambient_c
    ice_kg = g["ice_kg"] if ice_kg is None else ice_kg
    start = 2.0 if ice_kg > 0 else ambient - g["start_below_c"]
    return {
        "name": "generated",
        "run": {"duration": "90 min", "ambient_temperature": f"{ambient} degC", "output_interval": "30 s"},
        "apparatus": {"volume": f"{g['volume_l']} L", "leak_rate": f"{g['leak']} mbar*L/s"},
        "hose": {"inner_diameter": "8 mm", "length": "1.5 m"},
        "feed_pump": {"curve": "linear", "shutoff_pressure": f"{g['shutoff_bar']} bar", "free_flow": "8 L/min"},
        "ejector": {"nozzle_diameter": f"{g['nozzle_mm']} mm"},
        "tub": {"liquid_volume": f"{g['tub_l'] if tub_l is None else tub_l} L", "ua": f"{g['ua']} W/K", "ice": f"{ice_kg} kg", "initial_temperature": f"{start} degC"},
        "target": {"pressure": f"{g['target_mbar']} mbar"},
    }


def _usable(raw):
    return simulate(build_scenario(raw, "generated")).summary["usable_duration_s"]


def _not_shorter(better, worse):
    return better >= worse - max(1.0, 1e-3 * abs(worse))


SETTINGS = settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@SETTINGS
@given(rigs, st.floats(0.1, 1.5))
def test_more_ice_never_shortens_the_run(g, extra):
    g = dict(g, ice_kg=max(g["ice_kg"], 0.05))
    assert _not_shorter(_usable(_raw(g, ice_kg=g["ice_kg"] + extra)), _usable(_raw(g)))


@SETTINGS
@given(rigs, st.floats(1.0, 8.0))
def test_cooler_room_never_shortens_the_run(g, cooler):
    g = dict(g, start_below_c=max(g["start_below_c"], cooler))
    warm = _raw(g)
    cool = _raw(g, ambient_c=g["ambient_c"] - cooler)
    cool["tub"]["initial_temperature"] = warm["tub"]["initial_temperature"]
    assert _not_shorter(_usable(cool), _usable(warm))


@SETTINGS
@given(rigs, st.floats(1.2, 3.0))
def test_larger_tub_never_shortens_the_run(g, factor):
    g = dict(g, ice_kg=0.0)
    assert _not_shorter(_usable(_raw(g, tub_l=g["tub_l"] * factor)), _usable(_raw(g)))


def test_events_listed_in_time_order():
    r = simulate(load_scenario(SCENARIOS / "bench-iced.toml"))
    kinds = [e["event"] for e in r.summary["events"]]
    assert kinds == ["target_reached", "ice_gone"]
    stalled = simulate(load_scenario(SCENARIOS / "leaky-long-hose.toml")).summary["events"]
    assert [e["event"] for e in stalled] == ["pumpdown_stalled"]


def test_failed_solve_raises_with_solver_message(monkeypatch):
    from types import SimpleNamespace

    import vacsim.simulation as simulation
    from vacsim.errors import SolverError

    def failing(*args, **kwargs):
        return SimpleNamespace(status=-1, message="Required step size is less than spacing between numbers.", nfev=1, njev=0, nlu=0)

    monkeypatch.setattr(simulation, "solve_ivp", failing)
    with pytest.raises(SolverError, match="Required step size"):
        simulate(load_scenario(SCENARIOS / "bench-tap-water.toml"))


def test_window_reopens_after_a_short_pump_stop():
    # the pressure stays under the target during a one-minute stop: pumping resumes inside it
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw["schedule"] = [{"at": "30 min", "pump": "off"}, {"at": "31 min", "pump": "on"}]
    r = simulate(build_scenario(raw, "short-stop"))
    windows = r.summary["usable_windows"]
    assert len(windows) == 2
    assert windows[0]["end_s"] == pytest.approx(1800.0) and windows[1]["start_s"] == pytest.approx(1860.0)
    assert windows[1]["end_s"] > 100 * 60.0


def test_start_figures_follow_entries_at_time_zero():
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw["schedule"] = [{"at": "0 s", "pump": "off"}]
    r = simulate(build_scenario(raw, "pump-off"))
    assert r.summary["ultimate_pressure_start_pa"] is None and r.summary["usable_duration_s"] == 0.0
    assert "never ran" in r.summary["warnings"][-1]["message"]
    raw["schedule"] = [{"at": "0 s", "add_ice": "1 kg"}]
    raw["tub"]["initial_temperature"] = "2 degC"
    iced = simulate(build_scenario(raw, "ice-at-zero")).summary
    plain = simulate(load_scenario(SCENARIOS / "bench-tap-water.toml", ["tub.initial_temperature=2 degC"])).summary
    assert iced["ice_gone_s"] is not None and iced["max_tub_temperature_k"] < plain["max_tub_temperature_k"]


def test_ice_overflow_warning():
    r = simulate(load_scenario(SCENARIOS / "bench-iced.toml", ["tub.ice=5 kg"]))
    assert "ice_overflow" in [w["code"] for w in r.summary["warnings"]]
    r = simulate(load_scenario(SCENARIOS / "bench-iced.toml", ["tub.capacity=5 L"]))
    assert "do not fit" in next(w["message"] for w in r.summary["warnings"] if w["code"] == "ice_overflow")
