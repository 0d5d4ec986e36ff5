"""Checks of vacsim.units: the trade's spellings parse to the right SI values."""

import pytest

from vacsim import constants as c
from vacsim.errors import InputError
from vacsim.units import (
    barometric_pressure_at_altitude,
    format_pressure,
    parse_quantity,
    pressure_in,
    registry,
)

# Exact definitions: 1 atm = 101325 Pa (CGPM 1954), 1 Torr = 101325/760 Pa,
# 1 mmHg (conventional) = 133.322387415 Pa, 1 inHg (conventional) = 3386.389 Pa,
# 1 psi = 6894.757293168 Pa, 1 bar = 1e5 Pa (NIST SP 811 (2008), Appendix B.8)
TORR = 101325.0 / 760.0


@pytest.mark.parametrize(
    "text, kind, si",
    [
        ("25 mbar", "pressure", 2500.0),
        ("18 Torr", "pressure", 18 * TORR),
        ("13.5 mmHg", "pressure", 13.5 * 133.322387415),
        ("28 inHg", "pressure", 28 * 3386.389),
        ("100 psi", "pressure", 100 * 6894.757293168),
        ("6 bar", "pressure", 6e5),
        ("4 L/min", "volume flow", 4e-3 / 60),
        ("240 L/h", "volume flow", 240e-3 / 3600),
        ("0.02 mbar*L/s", "throughput", 0.02 * 100 * 1e-3),  # 1 Pa m^3/s = 10 mbar L/s (DESIGN sec. 6)
        ("2.5 kg", "mass", 2.5),
        ("20 degC", "temperature", 293.15),
        ("68 degF", "temperature", 293.15),
        ("293.15 K", "temperature", 293.15),
        ("45 min", "time", 2700.0),
        ("20 °C", "temperature", 293.15),
        ("-5 degC", "temperature", 268.15),
        ("760 torr", "pressure", 101325.0),
        ("1 atm", "pressure", 101325.0),
        ("1.2 m^3/h", "speed", 1.2 / 3600),  # 1 m^3/h = 0.2778 L/s (DESIGN sec. 6)
        ("500 mL", "volume", 5e-4),
        ("5 K", "temperature difference", 5.0),
        ("9 delta_degF", "temperature difference", 5.0),
    ],
)
def test_forms_parse_to_si(text, kind, si):
    assert parse_quantity(text, kind) == pytest.approx(si, rel=1e-12)


def test_offset_units_as_temperature_difference():
    # "5 degC" written as a difference means 5 K, not 278.15 K (bug fixed in units.py)
    assert parse_quantity("5 degC", "temperature difference") == pytest.approx(5.0)
    assert parse_quantity("9 degF", "temperature difference") == pytest.approx(5.0)


@pytest.mark.parametrize(
    "text, si",
    [
        # NIST SP 811 sec. 7.4: gauge pressure is relative to the local barometric pressure
        ("100 psig", 101325.0 + 100 * 6894.757293168),
        ("2 barg", 301325.0),
        ("27 inHg vacuum", 101325.0 - 27 * 3386.389),
        ("100 mmHg vacuum", 101325.0 - 100 * 133.322387415),
    ],
)
def test_gauge_forms(text, si):
    assert parse_quantity(text, "pressure", barometric_pressure=101325.0) == pytest.approx(si, rel=1e-12)


def test_gauge_against_local_barometer():
    # at 1000 m (ISO 2533) "27 inHg vacuum" is a much poorer vacuum than at sea level
    baro = barometric_pressure_at_altitude(1000.0)
    assert parse_quantity("27 inHg vacuum", "pressure", barometric_pressure=baro) == pytest.approx(
        baro - 27 * 3386.389
    )
    with pytest.raises(InputError, match="needs the barometric pressure"):
        parse_quantity("100 psig", "pressure", where="rig.feed")


@pytest.mark.parametrize(
    "altitude, p_ref",
    [
        # ISO 2533:1975 standard atmosphere table (geopotential altitude)
        (0.0, 101325.0),
        (1000.0, 89874.6),
        (2000.0, 79495.2),  # from memory
    ],
)
def test_iso_2533_altitude(altitude, p_ref):
    assert barometric_pressure_at_altitude(altitude) == pytest.approx(p_ref, abs=0.1)


def test_altitude_out_of_range():
    with pytest.raises(InputError, match="altitude"):
        barometric_pressure_at_altitude(12000.0)


def test_constants_vs_nist_sp811():
    # NIST SP 811 (2008), Appendix B.8 factors (7 significant figures there)
    assert c.TORR == pytest.approx(1.333224e2, rel=1e-6)
    assert c.MMHG == pytest.approx(1.333224e2, rel=1e-6)
    assert c.INHG == pytest.approx(3.386389e3, rel=1e-7)
    assert c.PSI == pytest.approx(6.894757e3, rel=1e-7)
    assert c.STANDARD_ATMOSPHERE == 101325.0 and c.BAR == 1e5 and c.MBAR == 100.0
    # pint's own definitions agree with ours
    ureg = registry()
    assert ureg.Quantity(1, "Torr").to("Pa").magnitude == pytest.approx(c.TORR, rel=1e-12)
    assert ureg.Quantity(1, "psi").to("Pa").magnitude == pytest.approx(c.PSI, rel=1e-9)


@pytest.mark.parametrize(
    "value, kind, match",
    [
        ("25", "pressure", "with a unit"),
        (25, "pressure", "bare number"),
        (20, "temperature", "bare number"),
        ("2 kg", "pressure", r"expected a pressure .*'2 kg'"),
        ("4 L/min", "pressure", "expected a pressure"),
        ("20 degC", "volume flow", "expected a volume flow"),
        ("abc", "pressure", "cannot read 'abc'"),
        ("inf mbar", "pressure", "not a finite"),
        ("-20 K", "temperature", "below absolute zero"),
        (True, "pressure", "expected a pressure"),
    ],
)
def test_errors(value, kind, match):
    with pytest.raises(InputError, match=match) as info:
        parse_quantity(value, kind, where="rig.hose.length")
    msg = str(info.value)
    assert msg.startswith("rig.hose.length: ") and "\n" not in msg


def test_unknown_kind_is_a_programming_error():
    with pytest.raises(KeyError):
        parse_quantity("1 m", "furlongs")


def test_display_helpers():
    assert pressure_in(101325.0, "torr") == pytest.approx(760.0)
    assert format_pressure(2339.3, "mbar") == "23.4 mbar"
    assert format_pressure(101325.0, "torr") == "760 Torr"
    assert format_pressure(None) == "-"
