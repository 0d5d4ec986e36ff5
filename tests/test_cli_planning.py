"""`vacsim ice`, `vacsim sweep`, `vacsim compare` end to end on the demo scenarios.

Happy paths run through typer's CliRunner; bad input runs through the real entry point in a
subprocess (it is `vacsim.cli.main` that turns an InputError into one line and exit code 2).
Expected values are the commands' own contract (keys, files) or derived from the demo files.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest
from typer.testing import CliRunner

from vacsim.cli.app import app

SCENARIOS = Path(__file__).parents[1] / "scenarios"
ICED = str(SCENARIOS / "bench-iced.toml")
GLYCOL = str(SCENARIOS / "glycol-chilled.toml")
runner = CliRunner()


def _invoke(args):
    res = runner.invoke(app, args)
    assert res.exit_code == 0, res.output
    return res


def test_ice_json_and_files(tmp_path):
    out = tmp_path / "ice"
    res = _invoke(["ice", ICED, "--out", str(out), "--json"])
    data = json.loads(res.stdout)
    assert {"feasible", "ice_kg", "schedule", "usable_duration_s", "target_pressure_pa", "reason"} <= set(data)
    assert data["feasible"] is True and data["reason"] is None
    assert data["schedule"][0]["at_s"] == 0.0 and data["schedule"][0]["ice_kg"] == data["ice_kg"]
    assert {p.name for p in out.iterdir()} == {"ice.json", "timeseries.csv", "pressure.png", "tub.png"}
    assert json.loads((out / "ice.json").read_text())["ice_kg"] == data["ice_kg"]


def test_ice_top_up_table(tmp_path):
    res = _invoke(["ice", ICED, "--top-up", "1 h", "--set", "tub.ice=0.5 kg", "--out", str(tmp_path / "t")])
    assert "top up every" in res.stdout and "schedule" in res.stdout
    assert "1 h 00 min" in res.stdout and "2 h 00 min" in res.stdout  # derived: additions at 1 h and 2 h


def test_ice_infeasible_exits_0_with_the_reason(tmp_path):
    res = _invoke(["ice", ICED, "--hold", "5 mbar", "--out", str(tmp_path / "x"), "--json"])
    data = json.loads(res.stdout)
    assert data["feasible"] is False and data["ice_kg"] is None and "freezing point" in data["reason"]
    assert data["best_pressure_pa"] > 500.0  # above the 5 mbar asked for


def test_sweep_json_files_and_progress(tmp_path):
    out = tmp_path / "sweep"
    res = _invoke(["sweep", ICED, "--vary", "tub.ice=0..2kg", "--steps", "3", "--jobs", "2", "--progress", "--out", str(out), "--json"])
    data = json.loads(res.stdout)
    assert data["parameters"] == ["tub.ice"] and data["parameter"] == "tub.ice"
    assert [p["tub.ice"] for p in data["points"]] == pytest.approx([0.0, 1.0, 2.0])  # derived: 3 steps over 0..2 kg
    assert {p.name for p in out.iterdir()} == {"sweep.csv", "sweep.json", "sweep.png"}
    assert len((out / "sweep.csv").read_text().splitlines()) == 4


def test_sweep_grid_table(tmp_path):
    res = _invoke(["sweep", ICED, "--vary", "tub.ice=0,1 kg", "--vary", "tub.liquid_volume=8,12 L", "--jobs", "1", "--out", str(tmp_path / "g")])
    assert "sweep of tub.ice × tub.liquid_volume" in res.stdout
    header = (tmp_path / "g" / "sweep.csv").read_text().splitlines()[0].split(",")
    assert header[:2] == ["tub.ice", "tub.liquid_volume"]
    assert (tmp_path / "g" / "sweep.png").is_file()


def test_compare_json_and_figure(tmp_path):
    out = tmp_path / "cmp"
    res = _invoke(["compare", ICED, GLYCOL, "--out", str(out), "--json", "--jobs", "1"])
    data = json.loads(res.stdout)
    assert [v["variant"] for v in data["variants"]] == ["bench-iced", "glycol-chilled"]
    assert data["best"]["min_pressure_pa"] == "glycol-chilled"
    assert {p.name for p in out.iterdir()} == {"compare.json", "compare.png"}


def test_compare_table_and_words(tmp_path):
    res = _invoke(["compare", ICED, GLYCOL, "--out", str(tmp_path / "c"), "--jobs", "1", "--units", "torr"])
    assert "comparison" in res.stdout and "lowest pressure" in res.stdout and "Torr" in res.stdout
    assert "glycol-chilled's lowest pressure is" in res.stdout
    # CliRunner's stdout is no terminal (no color): the best value is marked with a character
    row = next(line for line in res.stdout.splitlines() if "lowest pressure" in line)
    cells = [c.strip() for c in row.strip().strip("│").split("│")]
    assert cells[2].startswith("* ") and "*" not in cells[1]  # glycol-chilled is lowest (test_compare_json_and_figure)


def test_sweep_grid_with_steps_per_range_and_notes(tmp_path):
    tap = str(SCENARIOS / "bench-tap-water.toml")  # gives tub.ua = "3 W/K"
    out = tmp_path / "g"
    res = _invoke(["sweep", tap, "--vary", "tub.liquid_volume=8..12L", "--steps", "3", "--vary", "run.ambient_temperature=18..26degC",
                   "--steps", "2", "--jobs", "2", "--out", str(out)])
    data = json.loads((out / "sweep.json").read_text())
    assert data["shape"] == [3, 2]  # derived: one --steps per range, in order
    assert len(data["notes"]) == 1 and "tub.ua is held at 3 W/K" in data["notes"][0]
    assert "tub.ua is held at 3 W/K" in " ".join(res.stdout.split())
    assert "liquid volume (L)" in res.stdout and "ambient temperature (°C)" in res.stdout


BAD_INPUTS = {
    "unknown key": (["sweep", ICED, "--vary", "tub.icee=0..4kg"], "tub.liquid_volume"),
    "wrong unit": (["sweep", ICED, "--vary", "tub.ice=0..4 m"], "mass"),
    "empty range": (["sweep", ICED, "--vary", "tub.ice=2..2kg"], "empty range"),
    "zero steps": (["sweep", ICED, "--vary", "tub.ice=0..4kg", "--steps", "0"], "--steps"),
    "bad jobs": (["sweep", ICED, "--vary", "tub.ice=0..4kg", "--jobs", "0"], "--jobs"),
    "ice bad interval": (["ice", ICED, "--top-up", "3 kg"], "--top-up"),
    "compare one file": (["compare", ICED], "two or more"),
    # bench-iced.toml's barometric pressure is 1013 mbar: a hold above it is no vacuum
    "ice hold above barometric": (["ice", ICED, "--hold", "2000 mbar"], "barometric pressure"),
    "compare hold above barometric": (["compare", ICED, GLYCOL, "--hold", "2000 mbar"], "barometric pressure"),
    "non-numeric key": (["sweep", ICED, "--vary", "tub.glycol=none,ethylene"], "none/ethylene/propylene"),
    "too many steps": (["sweep", ICED, "--vary", "tub.ice=0..1kg", "--steps", "2", "--steps", "3"], "--steps"),
}


def test_bad_input_is_one_line_and_exit_2(tmp_path):
    procs = {
        case: subprocess.Popen(
            [sys.executable, "-c", "from vacsim.cli import main; main()", *args, "--out", str(tmp_path / case.replace(" ", "-"))],
            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
        )
        for case, (args, _) in BAD_INPUTS.items()
    }
    for case, proc in procs.items():
        out, err = proc.communicate(timeout=120)
        assert proc.returncode == 2, (case, out, err)
        errors = [line for line in err.splitlines() if line.startswith("vacsim: error:")]
        assert len(errors) == 1 and "Traceback" not in err, (case, err)
        assert BAD_INPUTS[case][1] in errors[0], (case, errors[0])
        assert not (tmp_path / case.replace(" ", "-")).exists()  # nothing written
