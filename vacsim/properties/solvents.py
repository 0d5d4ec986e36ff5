"""Lab solvents: vapor pressure, boiling point at reduced pressure, Henry's law, solubility.

The table of compounds (with every value's source) is :mod:`vacsim.properties.solvent_data`.
This module holds the equation forms, the registry that maps a correlation's ``kind`` to
its equation, and the public functions. SI throughout: temperatures [K], pressures [Pa].

Public functions take a :class:`Compound` or any of its names or aliases (case-insensitive)
and broadcast over numpy arrays.
"""

from __future__ import annotations

import difflib
import re
from dataclasses import dataclass
from functools import lru_cache
from typing import Callable

import numpy as np

from ..constants import (
    GAS_CONSTANT,
    WATER_CRITICAL_PRESSURE,
    WATER_CRITICAL_TEMPERATURE,
    WATER_TRIPLE_POINT_PRESSURE,
    WATER_TRIPLE_POINT_TEMPERATURE,
)
from ..errors import InputError
from ._validity import check_range
from .solvent_data import COMPOUNDS, Compound, VaporPressureCorrelation

__all__ = [
    "Compound",
    "VaporPressureCorrelation",
    "VAPOR_PRESSURE_EQUATIONS",
    "get_compound",
    "compound_names",
    "vapor_pressure",
    "boiling_temperature",
    "henry_solubility",
    "solubility_mass_fraction",
    "LiquidRange",
    "liquid_range",
]

# Reference temperature of Sander's compilation [K] (Sander 2023, Sect. 2).
HENRY_REFERENCE_TEMPERATURE = 298.15
# A single d ln H / d(1/T) (constant enthalpy of solution) is a fair description over a few
# tens of kelvin around the reference temperature [common practice]; outside this, warn.
HENRY_VALID_RANGE = (273.15, 323.15)  # K
# Solubilities are tabulated at 25 degC only and used as temperature-independent; outside this, warn.
SOLUBILITY_VALID_RANGE = (283.15, 313.15)  # K


# ---- equation forms ------------------------------------------------------------------


def antoine_pressure(temperature, a, b, c, pressure_unit, celsius):
    """Antoine equation, in the units the source tabulates.

    log10(p / p_unit) = A - B / (t + C), with t the temperature in degC when ``celsius`` is
    1 and in K when it is 0. Antoine, C. (1888), Compt. Rend. 107, 681; the form with a
    pressure unit and degC is that of Poling, Prausnitz & O'Connell, *The Properties of
    Gases and Liquids*, 5th ed. (2001), Eq. (7-3.1) (equation numbers in this module from
    memory of that edition).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].
    a, b, c : float
        Antoine coefficients in the source's units.
    pressure_unit : float
        The source's pressure unit [Pa] (1e5 for bar, 1e3 for kPa).
    celsius : float
        1.0 if the source's temperature is in degC, 0.0 if in K.

    Returns
    -------
    ndarray
        Vapor pressure [Pa].
    """
    t = np.asarray(temperature, dtype=float) - 273.15 * celsius
    return pressure_unit * 10.0 ** (a - b / (t + c))  # Eq. (7-3.1)


def antoine_temperature(pressure, a, b, c, pressure_unit, celsius):
    """Inverse of :func:`antoine_pressure`, analytic.

    t = B / (A - log10(p / p_unit)) - C (Poling et al. 2001, Eq. (7-3.1) solved for t).

    Parameters
    ----------
    pressure : float or ndarray
        Vapor pressure [Pa].
    a, b, c, pressure_unit, celsius : float
        As for :func:`antoine_pressure`.

    Returns
    -------
    ndarray
        Temperature [K].
    """
    p = np.asarray(pressure, dtype=float)
    return b / (a - np.log10(p / pressure_unit)) - c + 273.15 * celsius  # Eq. (7-3.1) inverted


def wagner_pressure(temperature, tc, pc, a, b, c, d):
    """Wagner equation, "2.5, 5" form (also the PPDS vapor-pressure equation).

    ln(p / pc) = (a tau + b tau^1.5 + c tau^2.5 + d tau^5) / Tr, tau = 1 - Tr, Tr = T/Tc.
    Wagner, W. (1973), Cryogenics 13, 470; this form as Poling, Prausnitz & O'Connell,
    *The Properties of Gases and Liquids*, 5th ed. (2001), Eq. (7-3.3), and VDI Heat Atlas,
    2nd ed. (2010), D3.1 Eq. (5). Above Tc it has no meaning and returns nan.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].
    tc : float
        Critical temperature used in the fit [K].
    pc : float
        Critical pressure used in the fit [Pa].
    a, b, c, d : float
        Wagner coefficients [-].

    Returns
    -------
    ndarray
        Vapor pressure [Pa].
    """
    tr = np.asarray(temperature, dtype=float) / tc
    tau = np.where(tr <= 1.0, 1.0 - tr, np.nan)
    return pc * np.exp((a * tau + b * tau**1.5 + c * tau**2.5 + d * tau**5) / tr)  # Eq. (7-3.3)


def dippr101_pressure(temperature, c1, c2, c3, c4, c5):
    """DIPPR equation 101 for vapor pressure.

    ln(p / Pa) = C1 + C2/T + C3 ln T + C4 T^C5. Perry's Chemical Engineers' Handbook, 8th ed.
    (Green & Perry, 2008), Table 2-8, equation in the table heading (DIPPR 801, eq. 101).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].
    c1, c2, c3, c4, c5 : float
        Coefficients as tabulated (p in Pa, T in K).

    Returns
    -------
    ndarray
        Vapor pressure [Pa].
    """
    t = np.asarray(temperature, dtype=float)
    return np.exp(c1 + c2 / t + c3 * np.log(t) + c4 * t**c5)  # Eq. DIPPR 101


def _iapws_water_pressure(temperature):
    """Water: IAPWS saturation pressure, delegated to :mod:`vacsim.properties.water` [Pa]."""
    from . import water

    return np.asarray(water.saturation_pressure(temperature), dtype=float)


def _iapws_water_temperature(pressure):
    """Water: IAPWS saturation temperature, delegated to :mod:`vacsim.properties.water` [K]."""
    from . import water

    return np.asarray(water.saturation_temperature(pressure), dtype=float)


@dataclass(frozen=True)
class _Equation:
    """A registered equation form: p(T), and T(p) where it has a closed form."""

    pressure: Callable
    temperature: Callable | None = None
    checks_own_range: bool = False  # the delegate warns itself; do not warn twice


VAPOR_PRESSURE_EQUATIONS: dict[str, _Equation] = {
    "antoine": _Equation(antoine_pressure, antoine_temperature),
    "wagner_25_5": _Equation(wagner_pressure),
    "dippr_101": _Equation(dippr101_pressure),
    "iapws_water": _Equation(_iapws_water_pressure, _iapws_water_temperature, checks_own_range=True),
}


def _out(x):
    """Scalar in, numpy scalar out; arrays stay arrays (the convention of vacsim.properties.water)."""
    x = np.asarray(x, dtype=float)
    return x[()] if x.ndim == 0 else x


def _equation(kind: str) -> _Equation:
    try:
        return VAPOR_PRESSURE_EQUATIONS[kind]
    except KeyError:
        valid = ", ".join(sorted(VAPOR_PRESSURE_EQUATIONS))
        raise ValueError(f"unknown vapor-pressure equation {kind!r}; valid ones: {valid}") from None


# ---- lookup --------------------------------------------------------------------------


def _key(text: str) -> str:
    return re.sub(r"\s+", " ", text.strip().lower())


@lru_cache(maxsize=1)
def _index() -> dict[str, Compound]:
    index: dict[str, Compound] = {}
    for compound in COMPOUNDS:
        for label in (compound.name, compound.cas, *compound.aliases):
            key = _key(label)
            if key in index and index[key] is not compound:
                raise RuntimeError(f"solvent table: {label!r} names both {index[key].name} and {compound.name}")
            index[key] = compound
    return index


def _close_names(key: str, index: dict[str, Compound]) -> list[str]:
    """Canonical names whose name or alias is nearly as close to `key` as the closest one."""
    scores = {k: difflib.SequenceMatcher(None, key, k).ratio() for k in index}
    best = max(scores.values(), default=0.0)
    keep = [k for k in sorted(scores, key=scores.get, reverse=True) if scores[k] >= max(0.6, best - 0.07)]
    return list(dict.fromkeys(index[k].name for k in keep))[:4]


def compound_names() -> tuple[str, ...]:
    """Canonical names of all compounds in the table, in table order."""
    return tuple(c.name for c in COMPOUNDS)


def get_compound(name: str | Compound) -> Compound:
    """Find a compound by name, alias or CAS number (case-insensitive).

    Parameters
    ----------
    name : str or Compound
        "ethanol", "IPA", "DCM", "EtOAc", "67-64-1"...; a Compound is returned as is.

    Returns
    -------
    Compound

    Raises
    ------
    InputError
        Unknown name; the message lists the closest known names.
    """
    if isinstance(name, Compound):
        return name
    if not isinstance(name, str):
        raise InputError(f"compound: expected a name such as 'ethanol', got {name!r}")
    index = _index()
    found = index.get(_key(name))
    if found is not None:
        return found
    suggestions = _close_names(_key(name), index)
    if suggestions:
        raise InputError(f"unknown compound {name!r}; did you mean: {', '.join(suggestions)}?")
    raise InputError(f"unknown compound {name!r}; known compounds: {', '.join(compound_names())}")


# ---- properties ----------------------------------------------------------------------


def _range_name(compound: Compound) -> str:
    return f"vapor pressure of {compound.name} ({compound.vapor_pressure.source})"


def vapor_pressure(compound: str | Compound, temperature):
    """Saturation (vapor) pressure of the pure liquid.

    Uses the compound's published correlation (see its ``vapor_pressure.source``); warns
    once per compound outside the source's stated temperature range.

    Parameters
    ----------
    compound : str or Compound
        The compound or any of its names.
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Vapor pressure [Pa], same shape as `temperature`.
    """
    c = get_compound(compound)
    corr = c.vapor_pressure
    eq = _equation(corr.kind)
    t = np.asarray(temperature, dtype=float)
    if not eq.checks_own_range:
        check_range(_range_name(c), t, corr.t_min, corr.t_max, "K")
    return _out(eq.pressure(t, *corr.coefficients))


def _newton_in_inverse_temperature(eq: _Equation, corr: VaporPressureCorrelation, p):
    """Solve ln p(T) = ln p_target for T by Newton's method in x = 1/T.

    ln p is nearly linear in 1/T (Clausius-Clapeyron), so the start from a straight line
    through the range ends converges in a few steps; the derivative is a central
    difference. Returns nan where the target has no solution below the fit's Tc.
    """
    coeffs = corr.coefficients
    ln_target = np.log(p)
    t_lo, t_hi = corr.t_min, corr.t_max
    x_lo, x_hi = 1.0 / t_lo, 1.0 / t_hi
    with np.errstate(all="ignore"):
        y_lo = np.log(eq.pressure(t_lo, *coeffs))
        y_hi = np.log(eq.pressure(0.999 * t_hi, *coeffs))
        slope = (y_hi - y_lo) / (1.0 / (0.999 * t_hi) - x_lo)
        x = x_lo + (ln_target - y_lo) / slope
        x = np.clip(x, x_hi, None)  # not above the fit's upper end (Tc for Wagner)
        for _ in range(60):
            h = 1e-7 * x
            f = np.log(eq.pressure(1.0 / x, *coeffs)) - ln_target
            df = (np.log(eq.pressure(1.0 / (x + h), *coeffs)) - np.log(eq.pressure(1.0 / np.maximum(x - h, x_hi), *coeffs))) / (
                x + h - np.maximum(x - h, x_hi)
            )
            step = f / df
            x_new = np.clip(x - step, x_hi, None)
            done = np.all(~np.isfinite(step) | (np.abs(x_new - x) <= 1e-14 * x))
            x = x_new
            if done:
                break
        t = 1.0 / x
        # reject non-solutions (target above p(Tc) or numerical failure)
        ok = np.abs(np.log(eq.pressure(t, *coeffs)) - ln_target) < 1e-10
    return np.where(ok, t, np.nan)


def boiling_temperature(compound: str | Compound, pressure):
    """Boiling temperature of the pure liquid at a given pressure: the inverse of vapor_pressure.

    Analytic for the Antoine form and for water (IAPWS), Newton's method otherwise, to
    1e-10 in ln p (1e-10 relative in pressure). Warns once per compound if the result
    lies outside the correlation's stated range.

    Parameters
    ----------
    compound : str or Compound
        The compound or any of its names.
    pressure : float or ndarray
        Pressure over the liquid [Pa]; non-positive values give nan.

    Returns
    -------
    float or ndarray
        Boiling temperature [K], same shape as `pressure`; nan where no solution exists.
    """
    c = get_compound(compound)
    corr = c.vapor_pressure
    eq = _equation(corr.kind)
    p = np.asarray(pressure, dtype=float)
    p_safe = np.where(p > 0.0, p, np.nan)
    if eq.temperature is not None:
        with np.errstate(all="ignore"):
            t = eq.temperature(p_safe, *corr.coefficients)
    else:
        t = _newton_in_inverse_temperature(eq, corr, p_safe)
    if not eq.checks_own_range:
        check_range(_range_name(c), t[np.isfinite(t)], corr.t_min, corr.t_max, "K")
    return _out(t)


#: Equation forms whose sources state their range as the whole liquid range, from the triple
#: (melting) point to the critical point: IAPWS by definition (R6-95, SR1-86); Poling et al.
#: (2001) App. A Wagner rows and VDI Heat Atlas D3.1 PPDS rows run from the melting point to Tc;
#: Perry's Table 2-8 DIPPR rows from the triple point to Tc. Each row's t_min and t_max are checked
#: against independent triple/melting and critical temperatures in tests/properties/test_solvents.py.
#: Antoine ranges are fitted intervals only and say nothing about the phase.
LIQUID_RANGE_FORMS = frozenset({"iapws_water", "wagner_25_5", "dippr_101"})


@dataclass(frozen=True)
class LiquidRange:
    """Where the pure liquid can boil: between its triple point and its critical point.

    Attributes
    ----------
    triple_temperature, critical_temperature : float
        Ends of the liquid range [K].
    triple_pressure, critical_pressure : float
        Vapor pressure at those ends [Pa]: below the first the solid sublimes, above the
        second there is no liquid-vapor boundary.
    exact : bool
        True where the ends are the measured triple and critical points (water, IAPWS);
        False where they are the correlation's stated Tmin and Tc (Tmin at the melting or
        triple point, to within a few K).
    triple_source, critical_source : str
        Where each end comes from.
    """

    triple_temperature: float
    triple_pressure: float
    critical_temperature: float
    critical_pressure: float
    exact: bool
    triple_source: str
    critical_source: str


def liquid_range(compound: str | Compound) -> LiquidRange | None:
    """The liquid range of a pure compound, as far as its vapor-pressure source states it.

    Water: the triple point (IAPWS R14-08(2011), 273.16 K, 611.657 Pa) and the critical point
    (IAPWS R6-95, 647.096 K, 22.064 MPa). Other compounds whose correlation form is in
    :data:`LIQUID_RANGE_FORMS`: the correlation's stated range t_min..t_max and its own vapor
    pressure at the two ends.

    Parameters
    ----------
    compound : str or Compound
        The compound or any of its names.

    Returns
    -------
    LiquidRange or None
        None where the source's range is only a fitted interval (Antoine rows).
    """
    c = get_compound(compound)
    corr = c.vapor_pressure
    if corr.kind == "iapws_water":
        return LiquidRange(
            WATER_TRIPLE_POINT_TEMPERATURE, WATER_TRIPLE_POINT_PRESSURE,
            WATER_CRITICAL_TEMPERATURE, WATER_CRITICAL_PRESSURE,
            True, "IAPWS R14-08(2011)", "IAPWS R6-95",
        )
    if corr.kind not in LIQUID_RANGE_FORMS:
        return None
    eq = _equation(corr.kind)
    with np.errstate(all="ignore"):
        p_low, p_high = (float(eq.pressure(t, *corr.coefficients)) for t in (corr.t_min, corr.t_max))
    return LiquidRange(
        corr.t_min, p_low, corr.t_max, p_high, False,
        "the Tmin of its vapor-pressure source, at its melting point", "the Tc of its vapor-pressure source",
    )


def henry_solubility(compound: str | Compound, temperature):
    """Henry's-law solubility constant Hcp = c_aq / p of the compound in water.

    Hcp(T) = Hcp(298.15 K) exp[d ln Hcp/d(1/T) (1/T - 1/298.15 K)] (van 't Hoff form of
    Sander 2023, Atmos. Chem. Phys. 23, 10901, Sect. 2.5, Eq. 19 [equation number from memory]).
    Where no temperature coefficient is published the constant is used as is. Values and
    the entry they come from are in the compound's ``henry_source``.

    Parameters
    ----------
    compound : str or Compound
        The compound or any of its names.
    temperature : float or ndarray
        Water temperature [K].

    Returns
    -------
    float or ndarray
        Hcp [mol/(m^3 Pa)], same shape as `temperature`.

    Raises
    ------
    InputError
        The table has no Henry's-law constant for this compound.
    """
    c = get_compound(compound)
    if c.henry_hcp is None:
        raise InputError(f"no Henry's-law constant on file for {c.name} ({c.henry_source})")
    t = np.asarray(temperature, dtype=float)
    check_range(f"Henry's-law constant of {c.name}", t, *HENRY_VALID_RANGE, "K")
    slope = 0.0 if c.henry_dlnh_dinvt is None else c.henry_dlnh_dinvt
    return _out(c.henry_hcp * np.exp(slope * (1.0 / t - 1.0 / HENRY_REFERENCE_TEMPERATURE)))  # Eq. 19


def solubility_mass_fraction(compound: str | Compound, temperature):
    """Mass fraction of the compound in water saturated with it (above it a second phase forms).

    The 25 degC value of the compound's ``solubility_source``, used as independent of
    temperature (warns once outside 10-40 degC). Miscible compounds return 1.0.

    Parameters
    ----------
    compound : str or Compound
        The compound or any of its names.
    temperature : float or ndarray
        Water temperature [K].

    Returns
    -------
    float or ndarray
        Mass fraction [-], same shape as `temperature`.
    """
    c = get_compound(compound)
    t = np.asarray(temperature, dtype=float)
    check_range(f"solubility of {c.name} in water", t, *SOLUBILITY_VALID_RANGE, "K")
    w = 1.0 if c.solubility_mass_fraction is None else c.solubility_mass_fraction
    return _out(np.full_like(t, w))


def latent_heat_vaporization(compound: str | Compound, temperature):
    """Latent heat of vaporization from the vapor-pressure correlation (Clausius-Clapeyron).

    h_vap = R T^2 (d ln p_sat / dT) / M for an ideal vapor and a negligible liquid volume
    (Poling, Prausnitz & O'Connell 2001, eq. 7-9.1 with Delta Z = 1); good to a few percent
    well below the critical point. The derivative is a central difference of the compound's
    own correlation.

    Parameters
    ----------
    compound : str or Compound
        The compound or any of its names.
    temperature : float or ndarray
        [K].

    Returns
    -------
    float or ndarray
        [J/kg].
    """
    c = get_compound(compound)
    t = np.asarray(temperature, dtype=float)
    dt = 0.01
    dlnp = np.log(vapor_pressure(c, t + dt)) - np.log(vapor_pressure(c, t - dt))
    return _out(GAS_CONSTANT * t**2 * dlnp / (2 * dt) / c.molar_mass)
