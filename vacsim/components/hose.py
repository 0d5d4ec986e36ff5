"""Vacuum hose: conductance of a round tube from viscous to molecular flow, and series speed."""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from ..properties import air

# Knudsen's transition formula as given for air at 20 degC with d, L in cm, p in mbar, C in L/s.
_VISCOUS_COEFF = 135.0  # L/s per (cm^3 mbar)       Eq. (viscous)
_MOLECULAR_COEFF = 12.1  # L/s per cm               Eq. (molecular)
_REFERENCE_TEMPERATURE = 293.15  # K, the temperature the coefficients are stated at


def conductance(inner_diameter, length, mean_pressure, temperature=293.15):
    """Conductance of a long round tube for air across the flow regimes.

    Knudsen's semi-empirical transition formula (Knudsen 1909, Ann. Phys. 28, 75, as given in
    Wutz, Adam & Walcher, Theorie und Praxis der Vakuumtechnik, 5th ed., 1992):
    C = 135 d^4 p / L + 12.1 (d^3 / L) (1 + 192 d p) / (1 + 237 d p), with d, L in cm, p in
    mbar, C in L/s, for air at 20 degC. The viscous (Hagen-Poiseuille) part scales with
    1/viscosity and the molecular part with sqrt(T) away from 20 degC.

    Parameters
    ----------
    inner_diameter : float or ndarray
        Hose bore [m].
    length : float or ndarray
        Hose length [m].
    mean_pressure : float or ndarray
        Mean pressure along the hose [Pa].
    temperature : float or ndarray
        Gas temperature [K].

    Returns
    -------
    float or ndarray
        Conductance [m^3/s].
    """
    d_cm = np.asarray(inner_diameter) * 100.0
    l_cm = np.asarray(length) * 100.0
    p_mbar = np.asarray(mean_pressure) / 100.0
    if np.ndim(temperature) == 0:
        viscosity_ratio, thermal_ratio = _temperature_ratios(float(temperature))
    else:
        viscosity_ratio = air.viscosity(_REFERENCE_TEMPERATURE) / air.viscosity(temperature)
        thermal_ratio = np.sqrt(np.asarray(temperature) / _REFERENCE_TEMPERATURE)
    viscous = _VISCOUS_COEFF * d_cm**4 * p_mbar / l_cm * viscosity_ratio  # Hagen-Poiseuille
    dp = d_cm * p_mbar
    molecular = _MOLECULAR_COEFF * d_cm**3 / l_cm * (1.0 + 192.0 * dp) / (1.0 + 237.0 * dp) * thermal_ratio
    return (viscous + molecular) * 1.0e-3  # L/s -> m^3/s


@lru_cache(maxsize=64)
def _temperature_ratios(temperature: float) -> tuple[float, float]:
    """(viscous, molecular) scale factors from 20 degC to `temperature` (cached: the RHS asks often)."""
    return float(air.viscosity(_REFERENCE_TEMPERATURE) / air.viscosity(temperature)), (temperature / _REFERENCE_TEMPERATURE) ** 0.5


def series_speed(pump_speed, conductance_value):
    """Effective speed of a pump behind a conductance: 1/S_eff = 1/S + 1/C.

    O'Hanlon, A User's Guide to Vacuum Technology, 3rd ed. (2003), eq. 3.23.

    Parameters
    ----------
    pump_speed : float or ndarray
        Speed at the pump's inlet [m^3/s].
    conductance_value : float or ndarray
        Conductance of the line between pump and apparatus [m^3/s].

    Returns
    -------
    float or ndarray
        Effective speed at the apparatus [m^3/s] (0 where the pump speed is 0).
    """
    s = np.asarray(pump_speed, dtype=float)
    c = np.asarray(conductance_value, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(s > 0, s * c / (s + c), 0.0)
    return out if out.ndim else float(out)
