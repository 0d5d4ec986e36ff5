"""Reading logged runs: tolerance of hand-kept logs, units, and one-line errors."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from vacsim.errors import InputError
from vacsim.logs import accepted_headers, read_log

LOGS = Path(__file__).resolve().parents[1] / "scenarios" / "logs"


def write(tmp_path: Path, text: str, name: str = "run.csv") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


# ---- tolerance ---------------------------------------------------------------------------


def test_comments_blank_lines_blank_cells_and_events(tmp_path):
    path = write(
        tmp_path,
        "# invented test log\n"
        "\n"
        "time_s, pressure_mbar, tub_degc, event   # header comment\n"
        "0, 20.0, 10.0, valve closed\n"
        "\n"
        "# a comment between rows\n"
        "30, , 10.5,\n"
        "60, 21.5, , \n"
        "90, 22.0, 11.0, vented  # trailing comment\n",
    )
    log = read_log(path)
    np.testing.assert_array_equal(log.time_s, [0, 30, 60, 90])
    # exact: 1 mbar = 100 Pa (NIST SP 811, 2008, B.8)
    np.testing.assert_allclose(log.pressure_pa, [2000.0, np.nan, 2150.0, 2200.0])
    # exact: T/K = t/degC + 273.15 (NIST SP 811 sec. 4.2.1.1)
    np.testing.assert_allclose(log.tub_temperature_k, [283.15, 283.65, np.nan, 284.15])
    assert log.boiling_temperature_k is None
    assert log.events == [(0.0, "valve closed"), (90.0, "vented")]
    assert log.columns["pressure"] == "pressure_mbar"
    assert log.path == path
    assert not log.time_s.flags.writeable


def test_decimal_comma_with_semicolons_and_minutes(tmp_path):
    path = write(tmp_path, "time_min;pressure_torr;boiling_degc\n0;15,0;45,5\n1,5;15,5;46\n3;16;\n")
    log = read_log(path)
    np.testing.assert_allclose(log.time_s, [0.0, 90.0, 180.0])
    # exact: 1 Torr = 101325/760 Pa (NIST SP 811, B.8)
    np.testing.assert_allclose(log.pressure_pa, np.array([15.0, 15.5, 16.0]) * 101325.0 / 760.0)
    np.testing.assert_allclose(log.boiling_temperature_k, [318.65, 319.15, np.nan])


def test_tab_separated_hours_and_kelvin(tmp_path):
    path = write(tmp_path, "time_h\tpressure_kpa\ttub_k\n0\t2,5\t290\n0,5\t2,6\t291\n")
    log = read_log(path)
    np.testing.assert_allclose(log.time_s, [0.0, 1800.0])
    np.testing.assert_allclose(log.pressure_pa, [2500.0, 2600.0])
    np.testing.assert_allclose(log.tub_temperature_k, [290.0, 291.0])


def test_clock_times_relative_to_first_row_and_midnight(tmp_path):
    path = write(tmp_path, "clock,pressure_mmhg\n23:58:30,12\n23:59,12.5\n00:00:15,13\n00:02,13.5\n")
    log = read_log(path)
    np.testing.assert_allclose(log.time_s, [0.0, 30.0, 105.0, 210.0])
    assert log.clock_start == "23:58:30"
    # conventional mmHg = 133.322387415 Pa (NIST SP 811, 2008, B.8)
    np.testing.assert_allclose(log.pressure_pa[0], 12 * 133.322387415)


def test_time_header_with_clock_hh_mm(tmp_path):
    # the 40 CFR 1065.644 example's start and end times, 10:56:25 and 10:57:35 -> 70 s apart
    path = write(tmp_path, "time,pressure_pa\n10:56:25,25300\n10:57:35,50600\n")
    log = read_log(path)
    np.testing.assert_allclose(log.time_s, [0.0, 70.0])


def test_header_spellings_with_brackets_and_degree_sign(tmp_path):
    path = write(tmp_path, "Time (s),Pressure [mbar],Tub °F,Note,operator\n0,30,50,,ann\n60,31,59,ice in,ann\n")
    log = read_log(path)
    # exact: t/degC = (t/degF - 32)/1.8 (NIST SP 811, B.9): 50 degF = 10 degC, 59 degF = 15 degC
    np.testing.assert_allclose(log.tub_temperature_k, [283.15, 288.15])
    assert log.events == [(60.0, "ice in")]
    assert log.columns["ignored"] == "operator"


@pytest.mark.parametrize(
    ("header", "factor"),
    [
        ("pressure_inhg", 3386.389),  # conventional inHg, NIST SP 811 (2008) B.8
        ("pressure_psi", 6894.757),  # lbf/in^2, NIST SP 811 (2008) B.8 (6.894 757 E+03 Pa)
        ("pressure_pa", 1.0),
    ],
)
def test_pressure_units(tmp_path, header, factor):
    log = read_log(write(tmp_path, f"time_s,{header}\n0,1\n10,2\n"))
    np.testing.assert_allclose(log.pressure_pa, [factor, 2 * factor], rtol=1e-6)


def test_gauge_vacuum_needs_and_uses_barometric_pressure(tmp_path):
    path = write(tmp_path, "time_min,vacuum_inhg\n0,29.0\n1,29.5\n")
    with pytest.raises(InputError, match=r"line 1: .*vacuum_inhg.*barometric"):
        read_log(path)
    # gauge vacuum = barometric - absolute (NIST SP 811, 2008, sec. 7.4); 1 inHg = 3386.389 Pa
    log = read_log(path, barometric_pressure=101325.0)
    np.testing.assert_allclose(log.pressure_pa, [101325.0 - 29.0 * 3386.389, 101325.0 - 29.5 * 3386.389])
    log = read_log(write(tmp_path, "time_s,vacuum_kpa\n0,98\n5,99\n", "k.csv"), barometric_pressure=101000.0)
    np.testing.assert_allclose(log.pressure_pa, [3000.0, 2000.0])


def test_demo_logs_are_labelled_invented_and_readable():
    paths = sorted(LOGS.glob("*.csv"))
    assert {p.name for p in paths} >= {"leak-test-demo.csv", "warmup-demo.csv", "warmup-gauge-demo.csv"}
    for path in paths:
        first = path.read_text().splitlines()[0]
        assert first.startswith("#") and "INVENTED demo data" in first
        log = read_log(path, barometric_pressure=29.92 * 3386.389)
        assert len(log) >= 20 and (log.pressure_pa is not None or log.boiling_temperature_k is not None)


# ---- errors: one line, the file, the line number, what is wrong ----------------------------


@pytest.mark.parametrize(
    ("text", "line", "pattern"),
    [
        ("pressure_mbar,tub_degc\n20,10\n21,11\n", 1, r"no time column"),
        ("# c\ntime_s,pressure_bar\n0,20\n", 2, r"unknown unit 'bar'; accepted: pressure_mbar, pressure_pa"),
        ("time_sec,pressure_mbar\n0,20\n", 1, r"unknown unit 'sec'; accepted: time_s, time_min, time_h"),
        ("time_s,pressure_mbar\n0,20\n10,21\n10,22\n", 4, r"repeats the previous row \(line 3\)"),
        ("time_s,pressure_mbar\n0,20\n\n10,21\n5,22\n", 5, r"goes back from the previous row \(line 4\)"),
        ("time_s,pressure_mbar\n# one row only\n0,20\n", 3, r"1 data row\(s\); a log needs at least two"),
        ("time_s,pressure_mbar\n", 1, r"0 data row\(s\)"),
        ("time_s,pressure_mbar\n0,20\n10,2O\n", 3, r"'2O' is not a number"),
        ("time_s,event\n0,start\n10,stop\n", 1, r"no measurement column"),
        ("time_s,pressure_mbar\n0,20\n10,20,5\n", 3, r"3 cells but the header has 2 columns \(a decimal comma"),
        ("clock,pressure_mbar\n10:00,20\n9:59,21\n", 3, r"goes back"),
        ("clock,pressure_mbar\n10:00,20\n25:00,21\n", 3, r"not a valid clock time"),
        ("time,pressure_mbar\n0,20\n10,21\n", 2, r"not a clock time .*time_s"),
        ("time_s,pressure_mbar,pressure_torr\n0,1,1\n", 1, r"more than one pressure column"),
        ("time_s,pressure_mbar\n0,20\n,21\n", 3, r"time cell .* is blank"),
        ("time_s,pressure_mbar\n0,20\n10,-1\n", 3, r"negative absolute pressure"),
    ],
)
def test_bad_logs_give_one_line_with_file_and_line(tmp_path, text, line, pattern):
    path = write(tmp_path, text)
    with pytest.raises(InputError, match=pattern) as info:
        read_log(path)
    message = str(info.value)
    assert "\n" not in message
    assert message.startswith(f"{path}: line {line}:")


def test_missing_file_is_an_input_error(tmp_path):
    with pytest.raises(InputError, match="no such log file"):
        read_log(tmp_path / "nope.csv")


def test_accepted_headers_lists_every_family():
    text = accepted_headers()
    for name in ("time_min", "clock", "pressure_inhg", "vacuum_mmhg", "boiling_degf", "tub_k", "event"):
        assert name in text
