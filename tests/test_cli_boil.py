"""`vacsim boil`: happy paths through typer's CliRunner, bad input through the real entry point.

CliRunner calls the typer app directly and so bypasses `vacsim.cli.main`, which is what turns
an InputError into one line on stderr and exit code 2; those cases run in a subprocess.
"""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
from typer.testing import CliRunner

from vacsim.cli.app import app
from vacsim.properties._validity import reset_warnings

runner = CliRunner()


def _json(args):
    reset_warnings()
    result = runner.invoke(app, ["boil", *args, "--json"])
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout)


def test_water_at_23_4_mbar_boils_at_20_degC():
    # IAPWS-95 saturation pressure at 20 degC is 2339.3 Pa (DESIGN.md sec. 5 [lib: IAPWS-95])
    out = _json(["water", "--at", "23.4 mbar"])
    assert out["temperature_k"] == pytest.approx(293.15, abs=0.1)
    assert out["pressure_pa"] == pytest.approx(2340.0)
    assert out["compound"] == "water"
    assert {"compound", "pressure_pa", "temperature_k", "source", "valid_range_k"} <= set(out)
    assert "IAPWS" in out["source"]


def test_observed_boiling_gives_the_no_gauge_pressure():
    # water boiling at 20 degC implies 2339.3 Pa over it (IAPWS-95, DESIGN.md sec. 5)
    out = _json(["water", "--observed", "20 degC", "--units", "torr"])
    assert out["pressure_pa"] == pytest.approx(2339.3, rel=2e-4)
    assert out["pressure_display"] == pytest.approx(2339.3 / (101325.0 / 760.0), rel=2e-4)  # 1 Torr = 101325/760 Pa
    assert out["units"] == "Torr"
    assert out["mode"] == "observed"


def test_aliases_and_range_note():
    out = _json(["IPA", "--observed", "25 degC"])
    assert out["compound"] == "isopropanol"
    assert out["in_range"] is True and out["warnings"] == []
    # 1e-5 mbar puts glycerol's boiling point (274 K) below its 291 K melting point, the
    # lower end of its VDI correlation: reported, not hidden
    out = _json(["glycerin", "--at", "0.00001 mbar"])
    assert out["in_range"] is False
    assert out["warnings"] and "glycerol" in out["warnings"][0]


def test_table_output_in_trade_terms():
    reset_warnings()
    result = runner.invoke(app, ["boil", "ethanol", "--at", "40 mbar"])
    assert result.exit_code == 0, result.output
    assert "ethanol boils at" in result.stdout
    assert "40.0 mbar" in result.stdout
    assert "Poling" in result.stdout


BAD_INPUTS = {
    "unknown compound": (["boil", "ethanoll", "--at", "23.4 mbar"], "did you mean: ethanol, methanol?"),
    "missing unit": (["boil", "water", "--at", "23.4"], "with a unit"),
    "length unit": (["boil", "water", "--at", "2 m"], "expected a pressure"),
    "neither option": (["boil", "water"], "exactly one of --at"),
    "both options": (["boil", "water", "--at", "20 mbar", "--observed", "20 degC"], "exactly one of --at"),
}


def test_bad_input_is_one_line_and_exit_code_2():
    procs = {
        case: subprocess.Popen(
            [sys.executable, "-c", "from vacsim.cli import main; main()", *args],
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
        )
        for case, (args, _) in BAD_INPUTS.items()
    }
    for case, proc in procs.items():
        out, err = proc.communicate(timeout=60)
        expected = BAD_INPUTS[case][1]
        assert proc.returncode == 2, (case, out, err)
        assert "Traceback" not in err, case
        lines = [line for line in err.splitlines() if line.strip()]
        assert len(lines) == 1, (case, err)
        assert lines[0].startswith("vacsim: error:") and expected in lines[0], (case, err)
