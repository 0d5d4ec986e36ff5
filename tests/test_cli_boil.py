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
    # IAPWS R14-08(2011): water's triple point is at 611.657 Pa = 6.12 mbar = 4.59 Torr (1 Torr = 101325/760 Pa);
    # below it ice sublimes, there is no boiling
    "below triple point": (["boil", "water", "--at", "0.5 mbar"], "below its triple-point pressure, 6.12 mbar"),
    "below triple point, torr": (
        ["boil", "water", "--at", "0.5 mbar", "--units", "torr"], "below its triple-point pressure, 4.59 Torr"
    ),
    "ice, observed": (["boil", "water", "--observed", "-5 degC"], "below its triple point, 0.01 °C"),
    # IAPWS R6-95: critical point 647.096 K (373.9 degC), 22.064 MPa (220640 mbar); no boiling above it
    "above critical temperature": (["boil", "water", "--observed", "500 degC"], "above its critical temperature, 373.9 °C"),
    "above critical pressure": (["boil", "water", "--at", "300 bar"], "above its critical pressure, 220640 mbar"),
    # ethanol: Tc 513.92 K = 240.8 degC in its Wagner row (Poling et al. 2001 App. A): refused the same way
    "ethanol above Tc": (["boil", "ethanol", "--observed", "300 degC"], "above its critical temperature, 240.8 °C"),
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


def test_water_at_the_ice_point_is_still_liquid():
    # 0 degC is 0.01 K below the triple point (ITS-90); p_sat(273.15 K) = 611.2 Pa
    # [lib: iapws IF97 region 4, _PSat_T]
    iapws97 = pytest.importorskip("iapws.iapws97")
    out = _json(["water", "--observed", "0 degC"])
    assert out["pressure_pa"] == pytest.approx(iapws97._PSat_T(273.15) * 1e6, rel=1e-4)


def test_below_the_melting_point_is_flagged_in_the_table():
    # glycerol's VDI correlation starts at its melting point, 291.45 K (CRC Handbook: 291.3 K);
    # at 1e-5 mbar its boiling point is below it: flagged in the table in degC, not as a note in K
    reset_warnings()
    result = runner.invoke(app, ["boil", "glycerin", "--at", "0.00001 mbar"])
    assert result.exit_code == 0, result.output
    assert "Caution" in result.stdout and "frozen" in result.stdout and "extrapolated" in result.stdout
    assert "18.3 °C" in result.stdout  # 291.45 K - 273.15
    assert "1e-05 mbar" in result.stdout  # not rounded to 0.00 mbar
    assert "291.45..850.05 K" not in result.output
    out = _json(["glycerin", "--at", "0.00001 mbar"])
    assert any("frozen" in w for w in out["warnings"])


def test_outside_an_antoine_range_is_flagged_as_extrapolated():
    # pyridine's Antoine row holds 292.51..413.57 K (Poling et al. 2001 App. A); 5 mbar lies below it
    reset_warnings()
    result = runner.invoke(app, ["boil", "pyridine", "--at", "5 mbar"])
    assert result.exit_code == 0, result.output
    assert "Caution" in result.stdout and "fitted range" in result.stdout and "extrapolated" in result.stdout
