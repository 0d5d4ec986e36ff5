"""The measured-curve ejector option: net dry-air speed at a stated water temperature."""

from pathlib import Path

import numpy as np
import pytest

from vacsim import constants as c
from vacsim.components import ejector
from vacsim.errors import InputError
from vacsim.properties import water
from vacsim.scenario import build_scenario, read_raw
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[2] / "scenarios"
# an invented curve: dry-air speed of a bench aspirator measured with 15 degC water
CURVE = [["30 mbar", "0.030 L/s"], ["100 mbar", "0.045 L/s"], ["500 mbar", "0.050 L/s"], ["1000 mbar", "0.050 L/s"]]


def _raw(curve=CURVE, measured_at="15 degC"):
    raw = read_raw(SCENARIOS / "bench-tap-water.toml")
    raw["name"] = "measured"
    raw["ejector"] = {"nozzle_diameter": "1.5 mm", "measured": curve, "measured_at": measured_at}
    return raw


def test_total_speed_from_measured_corrects_for_vapor():
    # S_tot = S_air p / (p - p_v(measured_at)); DESIGN sec. 3
    p_v = float(water.saturation_pressure(c.ZERO_CELSIUS + 15.0))
    s = ejector.total_speed_from_measured(3000.0, np.array([3000.0, 10000.0]), np.array([3e-5, 4.5e-5]), p_v)
    assert s == pytest.approx(3e-5 * 3000.0 / (3000.0 - p_v))


def test_measured_rig_runs_and_floors_near_water_vapor_pressure():
    r = simulate(build_scenario(_raw(), "measured"))
    p_v0 = r.series["vapor_pressure_pa"][0]
    assert r.summary["ultimate_pressure_start_pa"] > p_v0
    assert r.summary["ultimate_pressure_start_pa"] - p_v0 < 300.0  # leak / speed only: no jet cut-off term
    assert not any(a["name"] == "ejector.entrainment_ratio" for a in r.summary["assumptions"])


def test_lowest_point_too_close_to_vapor_pressure_is_refused():
    close = [["18 mbar", "0.02 L/s"]] + CURVE[1:]
    with pytest.raises(InputError, match="close.toml: ejector.measured: .* too close to the vapor pressure"):
        build_scenario(_raw(close), "close.toml")
