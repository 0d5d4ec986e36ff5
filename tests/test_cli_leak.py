"""`vacsim leak` end to end: bad logs exit 2 with one line; good logs give a table, JSON, a plot."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from vacsim.analysis.leak import default_sigma, fit_rate_of_rise, rate_of_rise_model
from vacsim.cli.app import app
from vacsim.report.leak_plots import plot_leak

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "scenarios" / "logs" / "leak-test-demo.csv"
ENTRY = [sys.executable, "-c", "from vacsim.cli import main; main()", "leak"]

BAD_LOGS = {
    # name: (log text, line number the message must name, text it must contain)
    "no_time": ("pressure_mbar\n20\n21\n", 1, "no time column"),
    "unknown_unit": ("time_s,pressure_hpa\n0,20\n10,21\n", 1, "unknown unit 'hpa'; accepted: pressure_mbar"),
    "non_monotone": ("time_s,pressure_mbar\n0,20\n30,21\n20,22\n", 4, "times must increase"),
    "single_row": ("# one reading\ntime_s,pressure_mbar\n0,20\n", 3, "at least two"),
    "non_numeric": ("time_s,pressure_mbar\n0,20\n30,n/a\n", 3, "'n/a' is not a number"),
}


@pytest.fixture(scope="module")
def bad_runs(tmp_path_factory):
    """Run every bad log through the real entry point at once (subprocesses in parallel)."""
    folder = tmp_path_factory.mktemp("bad")
    procs = {}
    for name, (text, _, _) in BAD_LOGS.items():
        path = folder / f"{name}.csv"
        path.write_text(text)
        procs[name] = (
            path,
            subprocess.Popen(
                [*ENTRY, str(path), "--volume", "2 L", "--out", str(folder / "out")],
                stdout=subprocess.PIPE,
                stderr=subprocess.PIPE,
                text=True,
                cwd=folder,
            ),
        )
    results = {}
    for name, (path, proc) in procs.items():
        out, err = proc.communicate(timeout=60)
        results[name] = (path, proc.returncode, out, err)
    return results


@pytest.mark.parametrize("name", list(BAD_LOGS))
def test_bad_log_exits_2_with_one_line(bad_runs, name):
    path, code, out, err = bad_runs[name]
    _, line, text = BAD_LOGS[name]
    assert code == 2, err
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith(f"vacsim: error: {path}: line {line}:")
    assert text in lines[0]
    assert "Traceback" not in err and out == ""


def test_demo_log_json_through_entry_point(tmp_path):
    proc = subprocess.run(
        [*ENTRY, str(DEMO), "--volume", "2.5 L", "--json", "--out", str(tmp_path / "o")],
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)
    for key in (
        "leak_rate_pa_m3_s",
        "leak_rate_stderr_pa_m3_s",
        "vapor_rise_pa",
        "time_constant_s",
        "floor_cost_pa",
        "warnings",
    ):
        assert key in data
    assert data["floor_cost_pa"] is None
    # the demo log's stated leak: 0.030 mbar L/s = 0.0030 Pa m^3/s (invented, see its header)
    assert data["leak_rate_pa_m3_s"] == pytest.approx(0.0030, rel=0.05)
    assert (tmp_path / "o" / "leak.png").stat().st_size > 1000


def test_table_output_and_default_plot_folder(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    res = CliRunner().invoke(app, ["leak", str(DEMO), "--volume", "2500 mL"])
    assert res.exit_code == 0, res.output
    assert "mbar·L/s" in res.output and "±" in res.output and "min" in res.output
    assert (tmp_path / "results" / "leak-leak-test-demo" / "leak.png").is_file()
    leftovers = [p for p in (tmp_path / "results" / "leak-leak-test-demo").iterdir() if p.name != "leak.png"]
    assert leftovers == []  # the atomic write left no temp file


def test_units_option_and_gauge_log(tmp_path):
    log = tmp_path / "gauge.csv"
    t = np.arange(0, 1801, 60.0)
    p = 2000.0 + 0.5 * t  # 0.5 Pa/s in 1 L: Q = V dp/dt = 5e-4 Pa m^3/s (EN 13184)
    rows = "\n".join(f"{ti / 60:g},{(101325.0 - pi) / 3386.389:.6f}" for ti, pi in zip(t, p))
    log.write_text("time_min,vacuum_inhg\n" + rows + "\n")
    res = CliRunner().invoke(
        app,
        ["leak", str(log), "--volume", "1 L", "--barometric", "1013.25 mbar", "--units", "torr", "--json",
         "--out", str(tmp_path / "o")],
    )
    assert res.exit_code == 0, res.output
    data = json.loads(res.output)
    assert data["leak_rate_pa_m3_s"] == pytest.approx(5e-4, rel=1e-4)
    assert data["time_constant_s"] is None  # linear model: no levelling time constant
    assert [w["code"] for w in data["warnings"]] == ["linear_fallback"]


def test_scenario_floor_cost(tmp_path):
    scenario = Path(__file__).parents[1] / "scenarios" / "bench-tap-water.toml"
    res = CliRunner().invoke(app, ["leak", str(DEMO), "--volume", "2.5 L", "--scenario", str(scenario),
                                   "--out", str(tmp_path / "o"), "--json"])
    assert res.exit_code == 0, res.output
    cost = json.loads(res.stdout)["floor_cost_pa"]
    assert 20.0 < cost < 200.0  # 0.03 mbar L/s over ~0.05 L/s of pump: ~0.6 mbar


def test_plot_artists():
    t = np.arange(0.0, 2401.0, 20.0)
    truth = rate_of_rise_model(t, 2000.0, 1.0, 800.0, 180.0)
    p = truth + np.random.default_rng(0).normal(0, 1, t.size) * default_sigma(truth)
    result = fit_rate_of_rise(t, p, 2e-3)
    fig = plot_leak(t, p, result, "mbar", title="demo")
    ax = fig.axes[0]
    labels = [line.get_label() for line in ax.get_lines()]
    assert len(labels) == 3
    assert labels[0] == "readings" and labels[1].startswith("fit:") and labels[2].startswith("leak alone")
    assert ax.get_xlabel() == "time since start [min]" and ax.get_ylabel() == "pressure [mbar]"
    assert len(ax.get_legend().get_texts()) == 3
    # the leak-alone line starts at p0 and has the fitted slope, in display units (mbar, min)
    x, y = ax.get_lines()[2].get_data()
    slope_mbar_per_min = (y[-1] - y[0]) / (x[-1] - x[0])
    assert slope_mbar_per_min == pytest.approx(result.slope_pa_s * 60 / 100, rel=1e-9)


def test_zero_within_its_error_prints_as_zero():
    from vacsim.cli.leak_cmd import _pm

    # round-off noise far below the standard error is no digit worth printing (issue: "-5.84e-17 ± 0.011")
    assert _pm(-5.84e-17, 0.011) == "0 ± 0.011"
    assert _pm(2e-9, 0.011) == "0 ± 0.011"  # below 1e-6 of the standard error
    assert _pm(0.0003, 0.011) == "0.0003 ± 0.011"  # small but not noise: kept
    assert _pm(0.0864, float("nan")) == "0.0864"
    assert _pm(float("nan"), 0.01) == "-"


def test_leak_warning_in_the_table_unit(tmp_path):
    # a flat log: the leak is not resolved, and its bound is quoted in Torr·L/s beside a Torr table
    log = tmp_path / "flat.csv"
    t = np.arange(0, 1801, 30.0)
    p = 2000.0 + 0.02 * t + np.random.default_rng(1).normal(0.0, 100.0, t.size)  # invented: a rise lost in the noise
    log.write_text("time_s,pressure_mbar\n" + "\n".join(f"{ti:g},{pi / 100:.3f}" for ti, pi in zip(t, p)) + "\n")
    res = CliRunner().invoke(app, ["leak", str(log), "--volume", "3 L", "--units", "torr", "--out", str(tmp_path / "o")])
    assert res.exit_code == 0, res.output
    text = " ".join(res.output.split())
    assert "leak_not_resolved" in text and "Torr·L/s" in text.split("leak_not_resolved")[1]
    assert "Pa m^3/s" not in text
