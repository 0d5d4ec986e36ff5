"""`vacsim run` end to end on real scenario files, and bad scenario files."""

import json
import subprocess
import sys
from pathlib import Path

import pytest
from typer.testing import CliRunner

import vacsim
from vacsim.cli.app import app

SCENARIOS = Path(__file__).parents[1] / "scenarios"
SUMMARY_KEYS = {
    "scenario", "duration_s", "target_pressure_pa", "time_to_target_s", "usable_start_s", "usable_end_s",
    "usable_duration_s", "min_pressure_pa", "final_pressure_pa", "ultimate_pressure_start_pa", "motive_flow_m3_s",
    "ejector_speed_m3_s", "pump_heat_w", "ice_gone_s", "min_tub_temperature_k", "max_tub_temperature_k",
    "final_tub_temperature_k", "usable_windows", "warnings", "assumptions",
}
CSV_COLUMNS = ["time_s", "pressure_pa", "tub_temperature_k", "ice_mass_kg", "vapor_pressure_pa", "ejector_speed_m3_s"]


def _main(*args, cwd):
    return subprocess.run([sys.executable, "-c", "from vacsim.cli import main; main()", *args], cwd=cwd, capture_output=True, text=True)


def test_run_writes_files_and_json(tmp_path):
    out = tmp_path / "out"
    res = CliRunner().invoke(app, ["run", str(SCENARIOS / "bench-iced.toml"), "--out", str(out), "--json"])
    assert res.exit_code == 0, res.output
    summary = json.loads(res.stdout)
    assert SUMMARY_KEYS <= summary.keys()
    assert {p.name for p in out.iterdir()} == {"timeseries.csv", "summary.json", "pressure.png", "tub.png"}
    assert json.loads((out / "summary.json").read_text()) == summary
    header = (out / "timeseries.csv").read_text().splitlines()[0].split(",")
    assert header[: len(CSV_COLUMNS)] == CSV_COLUMNS or set(CSV_COLUMNS) <= set(header)
    assert all({"name", "value", "unit", "source"} <= a.keys() for a in summary["assumptions"])
    assert any(a["name"] == "ejector.entrainment_ratio" for a in summary["assumptions"]) is False  # given in the file


def test_run_table_and_set_override(tmp_path):
    res = CliRunner().invoke(app, ["run", str(SCENARIOS / "bench-tap-water.toml"), "--out", str(tmp_path / "o"), "--set", "tub.ice=1 kg", "--set", "tub.initial_temperature=3 degC", "--units", "torr"])
    assert res.exit_code == 0, res.output
    assert "Torr" in res.output and "holds target for" in res.output
    assert "vent" in res.output.lower() or "Safety" in res.output


def test_python_api(tmp_path):
    s = vacsim.load_scenario(SCENARIOS / "bench-tap-water.toml")
    r = vacsim.simulate(s)
    assert SUMMARY_KEYS <= r.summary.keys()
    r.to_csv(tmp_path / "t.csv")
    assert (tmp_path / "t.csv").read_text().startswith("time_s,pressure_pa")
    figs = r.plot()
    ax = figs["pressure.png"].axes[0]
    labels = [ln.get_label() for ln in ax.get_lines()]
    assert "apparatus pressure" in labels and "tub fluid vapor pressure (floor)" in labels
    assert ax.get_yscale() == "log" and "mbar" in ax.get_ylabel()


BAD = {
    "unknown key": ('[tub]\nliquid_volume = "10 L"\nua = "3 W/K"\nicee = "1 kg"\n', "tub.icee: unknown key"),
    "missing unit": ('[tub]\nliquid_volume = "10"\nua = "3 W/K"\n', "tub.liquid_volume"),
    "negative volume": ('[apparatus]\nvolume = "-2 L"\n', "apparatus.volume"),
    "glycol fraction 0.8": ('[tub]\nliquid_volume = "10 L"\nua = "3 W/K"\nglycol = "ethylene"\nglycol_mass_fraction = 0.8\n', "tub.glycol_mass_fraction"),
    "tub colder than freezing": ('[tub]\nliquid_volume = "10 L"\nua = "3 W/K"\ninitial_temperature = "-5 degC"\n', "tub.initial_temperature"),
    "malformed TOML": ("[tub\nliquid_volume = 10 L\n", "not valid TOML"),
}


@pytest.mark.parametrize("case", sorted(BAD))
def test_bad_scenario_files(tmp_path, case):
    body, expected = BAD[case]
    path = tmp_path / "bad.toml"
    path.write_text(f'base = "{(SCENARIOS / "bench-tap-water.toml").as_posix()}"\nname = "bad"\n' + body if case != "malformed TOML" else body)
    res = _main("run", str(path), cwd=tmp_path)
    assert res.returncode == 2, res.stderr
    lines = res.stderr.strip().splitlines()
    assert len(lines) == 1 and "Traceback" not in res.stderr
    assert str(path) in lines[0] and expected in lines[0]
    assert not (tmp_path / "results").exists()


@pytest.mark.parametrize(
    "override, expected",
    [
        ("tub.ice=2", "(--set): tub.ice: expected a mass with a unit"),
        ("ejector.area_ratio=0.3 mm", "(--set): ejector.area_ratio: expected a plain number (dimensionless"),
        ("name=../escape", "(--set): name: use letters, digits"),
    ],
)
def test_bad_set_overrides_blame_the_command_line(tmp_path, override, expected):
    res = _main("run", str(SCENARIOS / "bench-iced.toml"), "--set", override, "--out", str(tmp_path / "o"), cwd=tmp_path)
    assert res.returncode == 2 and "Traceback" not in res.stderr
    assert expected in res.stderr.strip().splitlines()[-1]
    assert not (tmp_path / "o").exists()
