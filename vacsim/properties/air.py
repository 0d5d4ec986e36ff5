"""Air: viscosity of the gas, and the air dissolved in water (Henry's law).

Sources
-------
- Sutherland, W. (1893), "The viscosity of gases and molecular force", Phil. Mag. (5) 36,
  507-531; constants for air mu0 = 1.716e-5 Pa s, T0 = 273.15 K, S = 110.4 K (the values of
  White, F. M., Viscous Fluid Flow, 3rd ed., 2006, table of Sutherland constants).
- Sander, R. (2023), "Compilation of Henry's law constants (version 5.0.0) for water as
  solvent", Atmos. Chem. Phys. 23, 10901-12440, doi:10.5194/acp-23-10901-2023: Hcp at
  298.15 K and d ln Hcp / d(1/T); the values used are the entries taken from Wilhelm,
  Battino & Wilcock (1977), Chem. Rev. 77, 219.
- ISO 2533:1975, Standard Atmosphere, Table 1: composition of dry air (mole fractions).
"""

from __future__ import annotations

import numpy as np

from .. import constants as c
from ..errors import InputError
from . import water
from ._validity import check_range

__all__ = [
    "viscosity",
    "henry_solubility",
    "dissolved_air_concentration",
    "dissolved_air_pv",
    "HENRY",
    "DRY_AIR_MOLE_FRACTION",
]

VALIDITY = {
    "air.viscosity": (170.0, 1900.0, "K"),  # Sutherland with S = 110.4 K; White 2006 quotes about 2 % over 170..1900 K (from memory)
    "air.henry_solubility": (273.15, 373.15, "K"),  # van 't Hoff form, liquid water near 1 atm
}

_SUTHERLAND_MU0 = 1.716e-5  # Pa s
_SUTHERLAND_T0 = 273.15  # K
_SUTHERLAND_S = 110.4  # K

_HENRY_T_REF = 298.15  # K
# gas -> (Hcp at 298.15 K [mol/(m^3 Pa)], B = d ln Hcp / d(1/T) [K]); Sander 2023, Wilhelm et al. 1977 rows
HENRY: dict[str, tuple[float, float]] = {
    "O2": (1.3e-5, 1500.0),
    "N2": (6.4e-6, 1300.0),
    "Ar": (1.4e-5, 1500.0),
}

# ISO 2533:1975 Table 1, dry air by volume (= mole fraction for ideal gases); CO2 (0.000314)
# and the trace gases are left out: they carry 0.03 % of the moles.
DRY_AIR_MOLE_FRACTION: dict[str, float] = {"N2": 0.78084, "O2": 0.209476, "Ar": 0.00934}


def _out(x):
    x = np.asarray(x, dtype=float)
    return x[()] if x.ndim == 0 else x


def viscosity(temperature):
    """Dynamic viscosity of air at low density.

    Sutherland's law: mu = mu0 (T/T0)^(3/2) (T0 + S)/(T + S), mu0 = 1.716e-5 Pa s,
    T0 = 273.15 K, S = 110.4 K (Sutherland 1893; constants as tabulated by White 2006,
    Viscous Fluid Flow, 3rd ed.). Independent of pressure in the viscous regime.

    Parameters
    ----------
    temperature : float or ndarray
        Gas temperature [K].

    Returns
    -------
    float or ndarray
        Dynamic viscosity [Pa s].
    """
    T = np.asarray(temperature, dtype=float)
    check_range("air.viscosity", T, *VALIDITY["air.viscosity"])
    ratio = T / _SUTHERLAND_T0
    return _out(_SUTHERLAND_MU0 * ratio**1.5 * (_SUTHERLAND_T0 + _SUTHERLAND_S) / (T + _SUTHERLAND_S))  # Sutherland's law


def henry_solubility(gas, temperature):
    """Henry's law solubility constant of a gas in water.

    Sander (2023), Atmos. Chem. Phys. 23, 10901, van 't Hoff form used by the compilation:
    Hcp(T) = Hcp(298.15 K) exp(B (1/T - 1/298.15 K)), with c = Hcp p.

    Parameters
    ----------
    gas : str
        "O2", "N2" or "Ar".
    temperature : float or ndarray
        Water temperature [K].

    Returns
    -------
    float or ndarray
        Hcp [mol/(m^3 Pa)]: dissolved concentration per partial pressure.
    """
    if gas not in HENRY:
        raise InputError(f"gas: unknown gas {gas!r}; expected one of {', '.join(HENRY)}")
    T = np.asarray(temperature, dtype=float)
    check_range("air.henry_solubility", T, *VALIDITY["air.henry_solubility"])
    h0, b = HENRY[gas]
    return _out(h0 * np.exp(b * (1.0 / T - 1.0 / _HENRY_T_REF)))  # van 't Hoff, Hcp(T) = H0 exp(B (1/T - 1/T0))


def dissolved_air_concentration(temperature, pressure=c.STANDARD_ATMOSPHERE, *, humid=True):
    """Total air dissolved in fresh water at equilibrium with air (Henry's law).

    c = sum_i Hcp_i(T) x_i p_air, x_i the ISO 2533 dry-air mole fractions. With `humid`
    (the default, and the basis of published oxygen-solubility tables such as Benson &
    Krause 1984) the air over the water is saturated with water vapor at the water
    temperature, so p_air = p - p_sat(T); otherwise p_air = p (dry air at `pressure`).

    Parameters
    ----------
    temperature : float or ndarray
        Water temperature [K].
    pressure : float or ndarray
        Total gas pressure over the water [Pa].
    humid : bool
        Whether `pressure` includes the water's own vapor pressure.

    Returns
    -------
    float or ndarray
        Dissolved air (O2 + N2 + Ar) [mol/m^3].
    """
    T = np.asarray(temperature, dtype=float)
    p = np.asarray(pressure, dtype=float)
    p_air = np.maximum(p - water.liquid_vapor_pressure(T), 0.0) if humid else p
    total = sum(henry_solubility(gas, T) * x for gas, x in DRY_AIR_MOLE_FRACTION.items())
    return _out(total * p_air)  # Henry's law, c_i = Hcp_i p_i


def dissolved_air_pv(temperature, pressure=c.STANDARD_ATMOSPHERE, *, humid=True):
    """Dissolved air as a gas amount (p V) per volume of water, ideal gas at the water temperature.

    n R T with n from :func:`dissolved_air_concentration`. Note the unit: 1 Pa m^3/m^3 is
    1 Pa, so air-saturated water at 20 degC, about 20 mbar L per litre, is about 2.0e3 Pa here.

    Parameters
    ----------
    temperature : float or ndarray
        Water temperature [K].
    pressure : float or ndarray
        Total gas pressure over the water [Pa].
    humid : bool
        Whether `pressure` includes the water's own vapor pressure.

    Returns
    -------
    float or ndarray
        Dissolved gas amount [Pa m^3 per m^3 of water].
    """
    T = np.asarray(temperature, dtype=float)
    return _out(dissolved_air_concentration(T, pressure, humid=humid) * c.GAS_CONSTANT * T)  # ideal gas
