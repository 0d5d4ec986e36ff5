"""`vacsim spread` and `vacsim sensitivity` end to end on the demo scenario (typer's CliRunner)."""

import json
import subprocess
import sys
from pathlib import Path

from typer.testing import CliRunner

from vacsim.cli.app import app

SCENARIOS = Path(__file__).parents[1] / "scenarios"
DEMO = str(SCENARIOS / "bench-iced-uncertain.toml")
BAND_KEYS = {"p10", "p50", "p90", "mean"}


def _main(*args, cwd):
    return subprocess.run([sys.executable, "-c", "from vacsim.cli import main; main()", *args], cwd=cwd, capture_output=True, text=True)


def test_spread_json_and_files(tmp_path):
    out = tmp_path / "spread"
    args = ["spread", DEMO, "--samples", "16", "--seed", "3", "--jobs", "1", "--set", "run.duration=2 h", "--out", str(out), "--json"]
    res = CliRunner().invoke(app, args)
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert data["samples"] == 16
    for name in ("usable_duration_s", "time_to_target_s", "min_pressure_pa", "ice_gone_s"):
        assert BAND_KEYS <= data[name].keys()
        assert data[name]["count"] + data[name]["none"] == 16
    assert {p.name for p in out.iterdir()} == {"spread.json", "samples.csv", "spread.png", "usable-duration.png"}
    assert json.loads((out / "spread.json").read_text()) == data
    assert (out / "samples.csv").read_text().splitlines()[0].startswith("sample,tub.ua,tub.ice,hose.length,")
    again = CliRunner().invoke(app, args)
    assert json.loads(again.stdout) == data  # same seed, same output


def test_spread_table_marks_lower_bounds_when_samples_hold_to_the_end(tmp_path):
    # the 4 h demo run: some samples hold the target to the end (seen in its spread), so the
    # mean of the usable duration, at least, is a lower bound
    res = CliRunner().invoke(app, ["spread", DEMO, "--samples", "12", "--jobs", "1", "--out", str(tmp_path / "o")])
    assert res.exit_code == 0, res.output
    data = json.loads((tmp_path / "o" / "spread.json").read_text())
    held = data["usable_duration_s"]["held_to_end"]
    assert held > 0 and data["usable_duration_s"]["lower_bound"]["mean"] is True
    row = next(line for line in res.stdout.splitlines() if "holds target for" in line)
    assert "≥" in row
    assert f"{held} of 12 samples held the target for the whole run" in " ".join(res.stdout.split())


def test_help_keeps_square_brackets():
    for args in (["--help"], ["spread", "--help"], ["sensitivity", "--help"]):
        res = CliRunner().invoke(app, args, env={"COLUMNS": "200"})
        assert res.exit_code == 0 and "[uncertain]" in res.stdout, (args, res.stdout)
    assert "[fitted]" in CliRunner().invoke(app, ["spread", "--help"], env={"COLUMNS": "200"}).stdout


def test_sensitivity_ranges_in_display_units():
    from vacsim.cli.spread_cmd import _range_text

    # 0 degC = 273.15 K; 1 mbar L/s = 0.1 Pa m^3/s (by definition, NIST SP 811)
    assert _range_text("tub.ua", 2.1, 3.9) == "2.1 … 3.9 W/K"
    assert _range_text("run.ambient_temperature", 291.15, 299.15) == "18 … 26 °C"
    assert _range_text("apparatus.leak_rate", 0.001, 0.003) == "0.01 … 0.03 mbar·L/s"
    assert _range_text("ejector.entrainment_ratio", 0.8, 1.2) == "0.8 … 1.2"


def test_spread_table_and_lhs(tmp_path):
    res = CliRunner().invoke(app, ["spread", DEMO, "--samples", "8", "--method", "lhs", "--jobs", "1", "--set", "run.duration=1 h", "--out", str(tmp_path / "o")])
    assert res.exit_code == 0, res.output
    assert "P10" in res.stdout and "holds" in res.stdout


def test_sensitivity_json_and_chart(tmp_path):
    out = tmp_path / "sens"
    res = CliRunner().invoke(app, ["sensitivity", DEMO, "--trajectories", "3", "--jobs", "1", "--set", "run.duration=1 h", "--out", str(out), "--json"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert data["method"] == "morris" and data["trajectories"] == 3 and data["runs"] == 12
    assert [set(r) >= {"key", "mu_star", "sigma"} for r in data["ranking"]] == [True] * 3
    assert {p.name for p in out.iterdir()} == {"sensitivity.json", "sensitivity.png"}
    table = CliRunner().invoke(app, ["sensitivity", DEMO, "--trajectories", "3", "--jobs", "1", "--set", "run.duration=1 h", "--out", str(tmp_path / "t")])
    assert "mu* [min]" in table.stdout and "W/K" in table.stdout  # units survive rich markup


def test_bad_input_is_one_line_and_exit_2(tmp_path):
    res = _main("spread", str(SCENARIOS / "bench-iced.toml"), "--samples", "2", "--out", str(tmp_path / "x"), cwd=tmp_path)
    assert res.returncode == 2 and "nothing to vary" in res.stderr and "Traceback" not in res.stderr
    res = _main("spread", DEMO, "--method", "sobol", "--out", str(tmp_path / "x"), cwd=tmp_path)
    assert res.returncode == 2 and "--method" in res.stderr
    bad = tmp_path / "bad.toml"
    bad.write_text(f'base = "{DEMO}"\n[uncertain]\ntub.ua = {{normal = [3, 1]}}\n', encoding="utf-8")
    res = _main("sensitivity", str(bad), cwd=tmp_path)
    assert res.returncode == 2 and "uncertain.tub.ua" in res.stderr and len(res.stderr.strip().splitlines()) == 1


def test_calibrated_file_fitted_table_is_used(tmp_path):
    # the form `vacsim fit --save` writes: a base file plus [fitted] {value, stderr} in SI
    calibrated = tmp_path / "calibrated.toml"
    calibrated.write_text(
        f'base = "{SCENARIOS / "bench-iced.toml"}"\nname = "cal"\n[run]\nduration = "1 h"\n'
        '[fitted]\n"tub.ua" = {value = 3.1, stderr = 0.2}\n"ejector.entrainment_ratio" = {value = 0.9, stderr = 0.02}\n',
        encoding="utf-8",
    )
    res = CliRunner().invoke(app, ["spread", str(calibrated), "--samples", "6", "--jobs", "1", "--out", str(tmp_path / "o"), "--json"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert [(u["key"], u["distribution"]) for u in data["uncertain"]] == [("tub.ua", "normal"), ("ejector.entrainment_ratio", "normal")]
