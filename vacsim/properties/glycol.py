"""Aqueous ethylene glycol and propylene glycol: freezing point, density, heat capacity,
thermal conductivity, viscosity, water activity and vapor pressure.

Liquid properties follow Melinder's double polynomials (Melinder 2010, IIR; the
coefficients and their provenance are in `glycol_coefficients`). Water activity comes
from a Margules activity model fitted, for this package, to the ice/solution equilibrium
along Melinder's freezing curve and, for ethylene glycol, to the vapor-pressure
correlation of Fujita & Kikuchi (1989); see `_ACTIVITY_MODELS`.

All functions take the glycol's name (one of `GLYCOLS`), the glycol mass fraction
[kg glycol / kg solution] and, where relevant, the temperature [K]; they broadcast
numpy arrays and return SI quantities.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from vacsim.constants import (
    MOLAR_MASS_ETHYLENE_GLYCOL,
    MOLAR_MASS_PROPYLENE_GLYCOL,
    MOLAR_MASS_WATER,
    ZERO_CELSIUS,
)
from vacsim.errors import InputError
from vacsim.properties import glycol_coefficients as _coef
from vacsim.properties._validity import check_range
from vacsim.properties.water import liquid_vapor_pressure

GLYCOLS = ("ethylene", "propylene")
MASS_FRACTION_RANGE = (0.0, 0.6)

# Melinder's fits cover the liquid from the freezing point up to +100 degC (the upper
# limit CoolProp's implementation of the same fits uses; the fits' mean temperature,
# about +32 degC, shows the data reach well above room temperature).
PROPERTY_TEMPERATURE_MAX = 373.15  # K
# Tolerance below the freezing curve before warning (ice-bath slush sits on the curve).
FREEZING_TOLERANCE = 0.5  # K

# Water activity: ethylene glycol is backed by data from the freezing curve (down to
# -51 degC at 60 wt %) up to +60 degC (Fujita & Kikuchi 1989); propylene glycol only by
# the freezing curve, its temperature dependence is an assumption (see below).
ACTIVITY_TEMPERATURE_MAX = 333.15  # K


@dataclass(frozen=True)
class _MelinderFit:
    x_mean: float  # mass per cent
    t_mean: float  # degC
    coefficients: np.ndarray  # (18, 5), rows in _coef.EXPONENTS order


@dataclass(frozen=True)
class _ActivityModel:
    """ln(gamma_w) = x_g^2 [A + 2 (B - A) x_w] [1 + c (T_ref / T - 1)].

    A and B are the Margules end values (formally ln gamma_w at x_w -> 0 and ln gamma_g
    at x_g -> 0, at T_ref); data reach only x_g ~ 0.3, so they are fitting parameters,
    not trustworthy infinite-dilution values, and gamma_g is not taken from them.
    """

    molar_mass: float  # kg/mol of the glycol
    a: float  # ln(gamma_w) of water infinitely dilute in glycol at T_ref
    b: float  # ln(gamma_g) of glycol infinitely dilute in water at T_ref
    c: float  # temperature factor (0: ln(gamma) independent of T)
    t_ref: float  # K
    # Glycol saturation pressure, DIPPR equation 101 coefficients C1..C5 (T in K, p in
    # Pa). Perry's range starts at the glycol's melting point (EG 260.15 K, PG 213.15 K);
    # colder solutions extrapolate it, harmless for a term this small.
    dippr101: tuple[float, float, float, float, float]


_MELINDER = {
    "ethylene": _MelinderFit(_coef.ETHYLENE_X_MEAN, _coef.ETHYLENE_T_MEAN, _coef.ETHYLENE),
    "propylene": _MelinderFit(_coef.PROPYLENE_X_MEAN, _coef.PROPYLENE_T_MEAN, _coef.PROPYLENE),
}

# Activity-model parameters: least-squares fits made for this package (by the author of
# this module) of ln(a_w) = ln(x_w gamma_w) to
#  * the ice/solution equilibrium a_w(T_f) = p_ice(T_f) / p_liquid(T_f) along Melinder's
#    freezing curve, w = 0.04 ... 0.60 in steps of 0.02 (IAPWS R14-08(2011) sublimation
#    pressure, Murphy & Koop 2005 Eq. 10 for supercooled water), both glycols; and
#  * for ethylene glycol, the total vapor pressure of Fujita & Kikuchi 1989 (Trans. JSRAE
#    6(2), 183) at 20 ... 50 wt % (step 5) and -10 ... +60 degC (step 5 K), points above
#    the freezing curve, divided by the pure-water vapor pressure (IAPWS / Wagner & Pruss
#    1993 above 0 degC, Murphy & Koop below).
# Each data set weighted by 1/sqrt(number of points). Residuals: ethylene glycol, max
# 0.29 % in a_w on the freezing curve, 0.49 % against Fujita & Kikuchi; propylene
# glycol, max 0.20 % on the freezing curve.
# Propylene glycol has no data away from its freezing curve here (Fendu & Oprea 2014,
# J. Chem. Eng. Data 59, 792, were not at hand), so c = 0: ln(gamma_w) is taken
# independent of temperature, as Miyawaki et al. 1997 (Biosci. Biotech. Biochem. 61,
# 466) found water activities from freezing-point depression close to those at room
# temperature for such solutes. UNIFAC was not used: the project's design notes record
# that it predicts gamma_w > 1 for propylene glycol, the wrong sign.
# Glycol vapor pressure: Perry's Chemical Engineers' Handbook, 8th ed. (2008),
# Table 2-8 (DIPPR 101 coefficients), transcribed via the `chemicals` package's copy.
_ACTIVITY_MODELS = {
    "ethylene": _ActivityModel(
        molar_mass=MOLAR_MASS_ETHYLENE_GLYCOL,
        a=2.166,
        b=0.3274,
        c=7.237,
        t_ref=293.15,
        dippr101=(84.09, -10411.0, -8.1976, 1.6536e-18, 6.0),
    ),
    "propylene": _ActivityModel(
        molar_mass=MOLAR_MASS_PROPYLENE_GLYCOL,
        a=0.5445,
        b=-1.506,
        c=0.0,
        t_ref=293.15,
        dippr101=(212.8, -15420.0, -28.109, 2.1564e-05, 2.0),
    ),
}

_COLUMN = {name: k for k, name in enumerate(_coef.PROPERTIES)}


def _lookup(table: dict, glycol: str):
    try:
        return table[glycol]
    except (KeyError, TypeError):
        valid = ", ".join(GLYCOLS)
        raise InputError(f"unknown glycol {glycol!r}; expected one of: {valid}") from None


def _check_mass_fraction(glycol: str, mass_fraction) -> None:
    low, high = MASS_FRACTION_RANGE
    check_range(f"{glycol} glycol solution: mass fraction", mass_fraction, low, high)


def _melinder(fit: _MelinderFit, column: int, mass_fraction, temperature=None):
    """Melinder's double polynomial sum c_ij (x - x_m)^i (t - t_m)^j (Eq. 1)."""
    x = 100.0 * np.asarray(mass_fraction, dtype=float) - fit.x_mean
    if temperature is None:
        t = np.zeros_like(x)
        rows = [k for k, (_, j) in enumerate(_coef.EXPONENTS) if j == 0]
    else:
        t = np.asarray(temperature, dtype=float) - ZERO_CELSIUS - fit.t_mean
        rows = range(len(_coef.EXPONENTS))
    x, t = np.broadcast_arrays(x, t)
    result = np.zeros(x.shape)
    for k in rows:
        i, j = _coef.EXPONENTS[k]
        result = result + fit.coefficients[k, column] * x**i * t**j  # Eq. 1
    return result[()]


def freezing_point(glycol: str, mass_fraction):
    """Temperature at which ice starts to form in the solution.

    Melinder, A. (2010). Properties of Secondary Working Fluids for Indirect Systems,
    2nd ed., IIR, Paris: freezing-point polynomial in (x - x_m), x in mass per cent
    (Eq. 1 of this module with j = 0). At w = 0 the propylene-glycol fit gives
    -0.025 degC rather than 0.

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].

    Returns
    -------
    float or ndarray
        Freezing point [K].
    """
    fit = _lookup(_MELINDER, glycol)
    _check_mass_fraction(glycol, mass_fraction)
    return _melinder(fit, _COLUMN["freezing_point"], mass_fraction) + ZERO_CELSIUS


def _property(glycol: str, name: str, mass_fraction, temperature):
    fit = _lookup(_MELINDER, glycol)
    _check_mass_fraction(glycol, mass_fraction)
    t_freeze = _melinder(fit, _COLUMN["freezing_point"], mass_fraction) + ZERO_CELSIUS
    check_range(
        f"{glycol} glycol solution: temperature above freezing point",
        np.asarray(temperature, dtype=float) - t_freeze,
        -FREEZING_TOLERANCE,
        np.inf,
        "K",
    )
    check_range(
        f"{glycol} glycol solution: temperature",
        temperature,
        -np.inf,
        PROPERTY_TEMPERATURE_MAX,
        "K",
    )
    return _melinder(fit, _COLUMN[name], mass_fraction, temperature)


def density(glycol: str, mass_fraction, temperature):
    """Density of the liquid solution.

    Melinder (2010), IIR, density polynomial (Eq. 1), freezing point to 100 degC,
    0-60 wt %.

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].
    temperature : float or ndarray
        Solution temperature [K].

    Returns
    -------
    float or ndarray
        Density [kg/m^3].
    """
    return _property(glycol, "density", mass_fraction, temperature)


def heat_capacity(glycol: str, mass_fraction, temperature):
    """Specific isobaric heat capacity of the liquid solution.

    Melinder (2010), IIR, specific-heat polynomial (Eq. 1).

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].
    temperature : float or ndarray
        Solution temperature [K].

    Returns
    -------
    float or ndarray
        Specific heat capacity [J/(kg K)].
    """
    return _property(glycol, "heat_capacity", mass_fraction, temperature)


def thermal_conductivity(glycol: str, mass_fraction, temperature):
    """Thermal conductivity of the liquid solution.

    Melinder (2010), IIR, thermal-conductivity polynomial (Eq. 1).

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].
    temperature : float or ndarray
        Solution temperature [K].

    Returns
    -------
    float or ndarray
        Thermal conductivity [W/(m K)].
    """
    return _property(glycol, "thermal_conductivity", mass_fraction, temperature)


def viscosity(glycol: str, mass_fraction, temperature):
    """Dynamic viscosity of the liquid solution.

    Melinder (2010), IIR: ln(mu / mPa s) is the polynomial (Eq. 1).

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].
    temperature : float or ndarray
        Solution temperature [K].

    Returns
    -------
    float or ndarray
        Dynamic viscosity [Pa s].
    """
    ln_mu_mpas = _property(glycol, "ln_viscosity", mass_fraction, temperature)
    return 1.0e-3 * np.exp(ln_mu_mpas)  # Eq. 1, mPa s -> Pa s


def _mole_fraction(model: _ActivityModel, mass_fraction):
    """Glycol mole fraction x_g from mass fraction w [-]."""
    w = np.asarray(mass_fraction, dtype=float)
    n_glycol = w / model.molar_mass
    n_water = (1.0 - w) / MOLAR_MASS_WATER
    return n_glycol / (n_glycol + n_water)


def _check_activity_range(glycol: str, mass_fraction, temperature) -> None:
    _check_mass_fraction(glycol, mass_fraction)
    t_freeze = freezing_point(glycol, mass_fraction)
    check_range(
        f"{glycol} glycol water activity: temperature above freezing point",
        np.asarray(temperature, dtype=float) - t_freeze,
        -FREEZING_TOLERANCE,
        np.inf,
        "K",
    )
    check_range(
        f"{glycol} glycol water activity: temperature",
        temperature,
        -np.inf,
        ACTIVITY_TEMPERATURE_MAX,
        "K",
    )


def water_activity(glycol: str, mass_fraction, temperature):
    """Activity of water in the solution, a_w = x_w gamma_w.

    Two-parameter (three-suffix) Margules equation in mole fractions (Margules 1895;
    e.g. Prausnitz, Lichtenthaler & de Azevedo, Molecular Thermodynamics of Fluid-Phase
    Equilibria, 3rd ed., 1999, ch. 7):
    ln gamma_w = x_g^2 [A + 2 (B - A) x_w]                                   (Eq. 2)
    times a Gibbs-Helmholtz temperature factor 1 + c (T_ref/T - 1), i.e. constant
    partial molar excess enthalpy and entropy                                (Eq. 3).
    Parameters fitted for this package to ice/solution equilibrium on Melinder's
    freezing curve and (ethylene glycol) to Fujita & Kikuchi 1989; details beside
    `_ACTIVITY_MODELS`. a_w -> 1 as w -> 0 by construction.

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].
    temperature : float or ndarray
        Solution temperature [K].

    Returns
    -------
    float or ndarray
        Water activity (mole-fraction basis) [-].
    """
    model = _lookup(_ACTIVITY_MODELS, glycol)
    _check_activity_range(glycol, mass_fraction, temperature)
    x_g = _mole_fraction(model, mass_fraction)
    x_w = 1.0 - x_g
    t = np.asarray(temperature, dtype=float)
    ln_gamma_ref = x_g**2 * (model.a + 2.0 * (model.b - model.a) * x_w)  # Eq. 2
    ln_gamma = ln_gamma_ref * (1.0 + model.c * (model.t_ref / t - 1.0))  # Eq. 3
    return (x_w * np.exp(ln_gamma))[()]


def _glycol_saturation_pressure(model: _ActivityModel, temperature):
    """Pure-glycol vapor pressure, DIPPR equation 101 (Perry's 8th ed., Table 2-8) [Pa]."""
    c1, c2, c3, c4, c5 = model.dippr101
    t = np.asarray(temperature, dtype=float)
    return np.exp(c1 + c2 / t + c3 * np.log(t) + c4 * t**c5)  # Eq. 4


def vapor_pressure(glycol: str, mass_fraction, temperature):
    """Total equilibrium vapor pressure over the solution.

    p = a_w p_w*(T) + x_g p_g*(T)                                            (Eq. 5)
    Water's part uses `water_activity` and `vacsim.properties.water.liquid_vapor_pressure`
    (Wagner & Pruss 1993; Murphy & Koop 2005 below the triple point). The glycol's part
    is Raoult's law with gamma_g taken as 1 and p_g* from Perry's Chemical Engineers'
    Handbook, 8th ed., Table 2-8 (DIPPR Eq. 101); it is small, below 0.7 % of the total
    over 0-60 wt % up to 60 degC, and is kept only so the total is complete.

    Parameters
    ----------
    glycol : str
        "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction of the solution [-].
    temperature : float or ndarray
        Solution temperature [K].

    Returns
    -------
    float or ndarray
        Total vapor pressure [Pa].
    """
    model = _lookup(_ACTIVITY_MODELS, glycol)
    a_w = water_activity(glycol, mass_fraction, temperature)
    x_g = _mole_fraction(model, mass_fraction)
    p_water = a_w * liquid_vapor_pressure(temperature)
    p_glycol = x_g * _glycol_saturation_pressure(model, temperature)
    return (p_water + p_glycol)[()]  # Eq. 5
