"""Quantities as practitioners write them, turned into SI floats at the edge.

Everything inside vacsim is SI (Pa, K, m^3, kg, s, W). This module is the only place that
knows about mbar, Torr, psi, L/min or degF. Parsing is done with pint; the unit definitions
follow NIST SP 811 (2008) and are checked in tests against vacsim.constants.
"""

from __future__ import annotations

import math
import re
from functools import lru_cache

import pint

from . import constants as c
from .errors import InputError

# The kinds of quantity a scenario or command may ask for: name -> (pint dimensionality, SI unit)
KINDS: dict[str, tuple[str, str]] = {
    "pressure": ("[pressure]", "Pa"),
    "temperature": ("[temperature]", "K"),
    "temperature difference": ("[temperature]", "K"),
    "volume": ("[volume]", "m^3"),
    "length": ("[length]", "m"),
    "area": ("[area]", "m^2"),
    "mass": ("[mass]", "kg"),
    "time": ("[time]", "s"),
    "volume flow": ("[volume] / [time]", "m^3/s"),
    "speed": ("[volume] / [time]", "m^3/s"),
    "throughput": ("[pressure] * [volume] / [time]", "Pa*m^3/s"),
    "power": ("[power]", "W"),
    "heat transfer coefficient": ("[power] / [area] / [temperature]", "W/(m^2*K)"),
    "thermal conductance": ("[power] / [temperature]", "W/K"),
    "mass flow": ("[mass] / [time]", "kg/s"),
    "rate constant": ("1 / [time]", "1/s"),
}

# Examples for error messages, in the trade's own units.
_EXAMPLES = {
    "pressure": "'25 mbar', '18 Torr', '3 bar'",
    "temperature": "'20 degC', '68 degF', '293.15 K'",
    "temperature difference": "'5 K', '9 delta_degF'",
    "volume": "'2 L', '500 mL'",
    "length": "'1.5 m', '8 mm'",
    "area": "'0.3 m^2'",
    "mass": "'2.5 kg', '500 g'",
    "time": "'45 min', '3 h', '90 s'",
    "volume flow": "'4 L/min', '240 L/h'",
    "speed": "'0.15 L/s', '1.2 m^3/h'",
    "throughput": "'0.02 mbar*L/s'",
    "power": "'46 W'",
    "heat transfer coefficient": "'10 W/(m^2*K)'",
    "thermal conductance": "'4 W/K'",
    "mass flow": "'1 g/min'",
    "rate constant": "'1/60 s^-1', '0.02 1/s'",
}


@lru_cache(maxsize=1)
def registry() -> pint.UnitRegistry:
    """The package's single pint registry, with the trade's spellings added."""
    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.define("Torr = torr")
    ureg.define(f"mmHg_conventional = {c.MMHG} * Pa = mmHg_c")
    ureg.define(f"inHg_conventional = {c.INHG} * Pa = inHg_c")
    ureg.define("lpm = liter / minute")
    ureg.define("lph = liter / hour")
    return ureg


_GAUGE = re.compile(r"^\s*(?P<num>[-+0-9.eE]+)\s*(?P<unit>psi|bar|kPa|MPa|mbar)g\s*$")
_VACUUM = re.compile(r"^\s*(?P<num>[-+0-9.eE]+)\s*(?P<unit>inHg|mmHg|Torr|mbar|kPa)\s+vacuum\s*$")
_TIME_TERM = re.compile(r"([0-9.]+)\s*(h|hr|hour|hours|min|minute|minutes|s|sec|second|seconds)\b")
_COMPOUND_TIME = re.compile(r"\s*(?:[0-9.]+\s*(?:h|hr|hour|hours|min|minute|minutes|s|sec|second|seconds)\b\s*)+")
# Unit spellings pint would get wrong or not know.
_SPELLINGS = [
    (re.compile(r"\bmmHg\b"), "mmHg_c"),
    (re.compile(r"\binHg\b"), "inHg_c"),
    (re.compile(r"\bdeg\s?C\b|°C"), "degC"),
    (re.compile(r"\bdeg\s?F\b|°F"), "degF"),
]


def _normalise(text: str) -> str:
    out = text.strip()
    for pattern, repl in _SPELLINGS:
        out = pattern.sub(repl, out)
    return out


def _parse_plain(text: str) -> pint.Quantity:
    ureg = registry()
    norm = _normalise(text)
    # pint reads "20 degC" as an offset quantity only through Quantity(number, unit)
    m = re.match(r"^\s*([-+]?[0-9.]+(?:[eE][-+]?[0-9]+)?)\s*(.*)$", norm)
    if m and m.group(2):
        return ureg.Quantity(float(m.group(1)), m.group(2))
    return ureg.Quantity(norm)


def parse_quantity(
    value: str | float | int,
    kind: str,
    *,
    where: str | None = "value",
    barometric_pressure: float | None = None,
) -> float:
    """Parse a quantity as written ("25 mbar", "4 L/min", "20 degC") into SI.

    Parameters
    ----------
    value : str
        The text, a number followed by a unit. Bare numbers are refused: a vacuum number
        without its unit is ambiguous by a factor of 100 or more.
    kind : str
        The kind of quantity expected, a key of :data:`KINDS`.
    where : str
        Name of the field, for the error message.
    barometric_pressure : float, optional
        Local barometric pressure [Pa], needed for gauge forms ("100 psig",
        "27 inHg vacuum"), which NIST SP 811 sec. 7.4 defines relative to the local
        atmosphere.

    Returns
    -------
    float
        The value in the SI unit of `kind` (see :data:`KINDS`).
    """
    if kind not in KINDS:
        raise KeyError(f"unknown kind of quantity {kind!r}")
    if where is None:  # the caller (e.g. the scenario loader) prefixes the field's path itself
        try:
            return parse_quantity(value, kind, where="\0", barometric_pressure=barometric_pressure)
        except InputError as exc:
            raise InputError(str(exc).removeprefix("\0: ")) from None
    dim, si_unit = KINDS[kind]
    example = _EXAMPLES.get(kind, si_unit)
    if isinstance(value, bool) or not isinstance(value, (str, int, float)):
        raise InputError(f"{where}: expected a {kind} such as {example}, got {value!r}")
    if isinstance(value, (int, float)):
        if value == 0 and kind not in ("temperature",):
            return 0.0
        raise InputError(f"{where}: expected a {kind} with a unit, such as {example}; got the bare number {value!r}")
    text = value.strip()
    if kind == "pressure":
        gauge = _GAUGE.match(text) or _VACUUM.match(text)
        if gauge:
            if barometric_pressure is None:
                raise InputError(f"{where}: the gauge reading {text!r} needs the barometric pressure")
            reading = parse_quantity(f"{gauge['num']} {gauge['unit']}", "pressure", where=where)
            return barometric_pressure - reading if "vacuum" in text else barometric_pressure + reading
    compound = _COMPOUND_TIME.fullmatch(text) if kind == "time" else None
    if compound and len(_TIME_TERM.findall(text)) > 1:  # "2 h 50 min"
        return sum(parse_quantity(f"{n} {u}", "time", where=where) for n, u in _TIME_TERM.findall(text))
    try:
        q = _parse_plain(text)
    except (pint.errors.PintError, ValueError, TypeError, AttributeError, SyntaxError, KeyError) as exc:
        raise InputError(f"{where}: cannot read {text!r} as a {kind} (expected e.g. {example}): {exc}") from None
    if not isinstance(q, pint.Quantity) or q.dimensionless:
        raise InputError(f"{where}: expected a {kind} with a unit, such as {example}; got {text!r}")
    ureg = registry()
    if kind == "temperature difference":
        # "5 degC" as a difference is 5 K; pint would read it as the temperature 278.15 K
        offset_scale = {"degree_Celsius": 1.0, "degree_Fahrenheit": 5.0 / 9.0}
        if str(q.units) in offset_scale:
            return float(q.magnitude) * offset_scale[str(q.units)]
        try:
            return float(q.to("delta_degC").magnitude) if q.units != ureg.kelvin else float(q.magnitude)
        except pint.errors.DimensionalityError:
            pass
    try:
        out = float(q.to(si_unit).magnitude)
    except pint.errors.DimensionalityError:
        raise InputError(f"{where}: expected a {kind} such as {example}; got {text!r} ({q.dimensionality})") from None
    if not math.isfinite(out):
        raise InputError(f"{where}: {text!r} is not a finite {kind}")
    if kind == "temperature" and out < 0.0:
        raise InputError(f"{where}: {text!r} is below absolute zero")
    return out


def barometric_pressure_at_altitude(altitude: float) -> float:
    """Standard-atmosphere pressure at a geopotential altitude.

    ISO 2533:1975 troposphere (0-11 km): p = p0 (1 - L h / T0)^(g M / (R L)).

    Parameters
    ----------
    altitude : float
        Geopotential altitude above mean sea level [m], valid -2000..11000.

    Returns
    -------
    float
        Barometric pressure [Pa].
    """
    if not -2000.0 <= altitude <= 11000.0:
        raise InputError(f"altitude: {altitude:g} m is outside the troposphere model (-2000..11000 m)")
    exponent = c.STANDARD_GRAVITY * c.ISA_MOLAR_MASS_AIR / (c.ISA_GAS_CONSTANT * c.ISA_LAPSE_RATE)
    return c.STANDARD_ATMOSPHERE * (1.0 - c.ISA_LAPSE_RATE * altitude / c.ISA_SEA_LEVEL_TEMPERATURE) ** exponent


# ---- display at the edge -------------------------------------------------------------

PRESSURE_UNITS = {"mbar": c.MBAR, "torr": c.TORR, "pa": 1.0, "inhg": c.INHG, "psi": c.PSI}
PRESSURE_LABELS = {"mbar": "mbar", "torr": "Torr", "pa": "Pa", "inhg": "inHg", "psi": "psi"}


def pressure_in(value_pa: float, unit: str) -> float:
    """Convert a pressure [Pa] to a display unit (mbar, torr, pa, inhg, psi)."""
    return value_pa / PRESSURE_UNITS[unit.lower()]


def throughput_in(value_pa_m3_s: float, unit: str) -> float:
    """A throughput [Pa m^3/s] in <unit>*L/s (1 Pa m^3/s = 10 mbar L/s)."""
    return pressure_in(value_pa_m3_s, unit) / 1.0e-3


def format_pressure(value_pa: float | None, unit: str = "mbar") -> str:
    """A pressure [Pa] as display text with sensible significant figures."""
    if value_pa is None:
        return "-"
    v = pressure_in(value_pa, unit)
    label = PRESSURE_LABELS[unit.lower()]
    if abs(v) >= 100:
        return f"{v:.0f} {label}"
    if abs(v) >= 10:
        return f"{v:.1f} {label}"
    return f"{v:.2f} {label}"


def format_pressure_sig(value_pa: float, unit: str = "mbar", digits: int = 3) -> str:
    """A pressure [Pa] as display text with `digits` significant figures (for notes and small values)."""
    return f"{pressure_in(value_pa, unit):.{digits}g} {PRESSURE_LABELS[unit.lower()]}"


def throughput_label(unit: str = "mbar") -> str:
    """The display unit of a throughput for a pressure display unit: 'mbar·L/s', 'Torr·L/s'..."""
    return f"{PRESSURE_LABELS[unit.lower()]}·L/s"


def format_throughput(value_pa_m3_s: float, unit: str = "mbar", digits: int = 3) -> str:
    """A throughput [Pa m^3/s] as display text in <unit>·L/s with `digits` significant figures."""
    return f"{throughput_in(value_pa_m3_s, unit):.{digits}g} {throughput_label(unit)}"


#: a value smaller than this share of its standard error is shown as 0 (it is zero within its error,
#: and its printed digits would be round-off noise such as -5.84e-17)
ZERO_WITHIN_ERROR = 1.0e-6


def format_plus_minus(value: float, stderr: float, digits: str = ".3g", stderr_digits: str = ".2g", unknown: str = "") -> str:
    """'value ± stderr' display text (numbers already in display units).

    A value smaller than :data:`ZERO_WITHIN_ERROR` times its standard error prints as 0; a
    non-finite value as '-'; a non-finite standard error as the value alone, followed by
    `unknown` (e.g. ' ± ?') when given.
    """
    if not math.isfinite(value):
        return "-"
    if not math.isfinite(stderr):
        return f"{value:{digits}}{unknown}"
    if abs(value) < ZERO_WITHIN_ERROR * abs(stderr):
        value = 0.0
    return f"{value:{digits}} ± {stderr:{stderr_digits}}"


def format_temperature(value_k: float | None) -> str:
    """A temperature [K] as degC text."""
    return "-" if value_k is None else f"{value_k - c.ZERO_CELSIUS:.1f} °C"


def format_duration(value_s: float | None) -> str:
    """A duration [s] as 'h:mm' or 'm:ss' text."""
    if value_s is None:
        return "-"
    s = int(round(value_s))
    if s >= 3600:
        return f"{s // 3600} h {s % 3600 // 60:02d} min"
    if s >= 60:
        return f"{s // 60} min {s % 60:02d} s"
    return f"{value_s:.0f} s"
