"""End-to-end tests of `vacsim fluid`."""

import json
import subprocess
import sys

import pytest
from typer.testing import CliRunner

from vacsim.cli import app
from vacsim.errors import InputError
from vacsim.properties import fluid, water

runner = CliRunner()


def test_json_water():
    result = runner.invoke(app, ["fluid", "--at", "20 degC", "--json"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    for key in (
        "vapor_pressure_pa", "water_activity", "freezing_point_k", "density_kg_m3",
        "heat_capacity_j_kg_k", "viscosity_pa_s", "glycol", "mass_fraction", "temperature_k",
    ):
        assert key in data
    assert data["glycol"] == "none" and data["mass_fraction"] == 0.0
    assert data["temperature_k"] == pytest.approx(293.15)
    # DESIGN.md sec. 5 [IAPWS-95]: 20 degC p_sat 2339.3 Pa, rho 998.21, mu 1.0016 mPa s
    assert data["vapor_pressure_pa"] == pytest.approx(2339.3, rel=2e-4)
    assert data["density_kg_m3"] == pytest.approx(998.21, abs=0.01)
    assert data["viscosity_pa_s"] == pytest.approx(1.0016e-3, rel=2e-3)
    assert data["water_activity"] == 1.0 and data["freezing_point_k"] == 273.15


def test_json_glycol_matches_library():
    result = runner.invoke(
        app, ["fluid", "--glycol", "ethylene", "--mass-fraction", "0.3", "--at", "68 degF", "--json"]
    )
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    T = 293.15
    assert data["vapor_pressure_pa"] == pytest.approx(fluid.vapor_pressure("ethylene", 0.3, T), rel=1e-9)
    assert data["water_activity"] == pytest.approx(fluid.water_activity("ethylene", 0.3, T), rel=1e-9)
    # DESIGN.md sec. 5 [lib: CoolProp INCOMP::MEG]: EG 30 % freezes at -14.58 degC; rho 1038.05 at 20 degC
    assert data["freezing_point_k"] - 273.15 == pytest.approx(-14.58, abs=0.02)
    assert data["density_kg_m3"] == pytest.approx(1038.05, abs=0.05)


def test_table_output():
    result = runner.invoke(app, ["fluid", "--at", "20 degC", "--units", "torr"])
    assert result.exit_code == 0, result.output
    for label in ("Vapor pressure", "Water activity", "Freezing point", "Density", "Heat capacity", "Viscosity"):
        assert label in result.stdout
    # 2339.2 Pa = 17.5 Torr
    assert f"{water.saturation_pressure(293.15) / (101325 / 760):.1f} Torr" in result.stdout


def test_below_freezing_point_is_input_error():
    result = runner.invoke(
        app, ["fluid", "--glycol", "ethylene", "--mass-fraction", "0.3", "--at", "-20 degC"]
    )
    assert isinstance(result.exception, InputError)
    assert str(result.exception) == (
        "--at: -20 degC is below the freezing point of 30 wt% ethylene glycol (-14.6 degC)"
    )


def _run(*args):
    return subprocess.run(
        [sys.executable, "-c", "from vacsim.cli import main; main()", "fluid", *args],
        capture_output=True,
        text=True,
        timeout=60,
    )


@pytest.mark.parametrize(
    "args, message",
    [
        (["--at", "-20 degC", "--glycol", "ethylene", "--mass-fraction", "0.3"], "below the freezing point"),
        (["--at", "20 degC", "--glycol", "ethylene", "--mass-fraction", "0.8"], "0.8 is outside 0..0.6"),
        (["--at", "20", "--json"], "--at: expected a temperature with a unit"),
    ],
)
def test_bad_input_exit_code_2(args, message):
    # through the real entry point main(), which CliRunner bypasses
    proc = _run(*args)
    assert proc.returncode == 2
    assert message in proc.stderr
    assert proc.stderr.strip().count("\n") == 0  # one line, no traceback
    assert proc.stdout == ""


@pytest.mark.parametrize(
    "args, message",
    [
        (["--at", "20 degC", "--glycol", "brine", "--mass-fraction", "0.2"], "--glycol: unknown glycol 'brine'"),
        (["--at", "20 degC", "--units", "bar"], "--units: expected one of"),
        (["--at", "20 degC", "--glycol", "propylene"], "--mass-fraction: needed with --glycol propylene"),
        (["--at", "20 degC", "--mass-fraction", "0.2"], "--mass-fraction: 0.2 given without --glycol"),
        (["--at", "120 degC"], "above 100 degC"),
        (["--at", "2 kg"], "--at: expected a temperature"),
    ],
)
def test_bad_input_raises_input_error(args, message):
    # main() turns any InputError into one stderr line and exit code 2 (checked above)
    result = runner.invoke(app, ["fluid", *args])
    assert isinstance(result.exception, InputError)
    assert message in str(result.exception)


def test_unknown_option_is_usage_error():
    result = runner.invoke(app, ["fluid", "--at", "20 degC", "--temperature", "3"])
    assert result.exit_code == 2
