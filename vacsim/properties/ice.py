"""Properties of ice Ih: density, heat capacity, latent heat of fusion.

Sources
-------
- IAPWS R10-06(2009), "Revised Release on the Equation of State 2006 for H2O Ice Ih", based on
  Feistel, R. & Wagner, W. (2006), "A new equation of state for H2O ice Ih",
  J. Phys. Chem. Ref. Data 35, 1021-1047. The Gibbs function g(T, p), Eqs. 1-4 of the release.
- Murphy, D. M. & Koop, T. (2005), Q. J. R. Meteorol. Soc. 131, 1539-1565: molar enthalpy of
  sublimation of ice (Eq. 5) and of evaporation of supercooled water (Eq. 9); their difference
  is the enthalpy of fusion of ice melting into supercooled liquid at T.
"""

from __future__ import annotations

import numpy as np

from .. import constants as c
from ._validity import check_range

__all__ = ["density", "heat_capacity", "latent_heat_fusion"]

VALIDITY = {
    "ice.gibbs": (0.0, c.WATER_TRIPLE_POINT_TEMPERATURE, "K"),  # IAPWS R10-06, ice Ih stable range
    "ice.latent_heat_fusion": (236.0, 273.16, "K"),  # Murphy & Koop 2005, Eq. 9 range (236..273 K)
}

_TT = c.WATER_TRIPLE_POINT_TEMPERATURE  # K
_PT = c.WATER_TRIPLE_POINT_PRESSURE  # Pa
_P0 = c.STANDARD_ATMOSPHERE  # Pa, the release's normal pressure

# IAPWS R10-06(2009), Table 2 (SI units: J/kg and J/(kg K))
_G0 = (-0.632020233335886e6, 0.655022213658955, -0.189369929326131e-7,
       0.339746123271053e-14, -0.556464869058991e-21)
_S0 = -0.332733756492168e4  # absolute entropy constant, J/(kg K)
_T1 = complex(0.368017112855051e-1, 0.510878114959572e-1)
_R1 = complex(0.447050716285388e2, 0.656876847463481e2)
_T2 = complex(0.337315741065416, 0.335449415919309)
_R2 = (complex(-0.725974574329220e2, -0.781008427112870e2),
       complex(-0.557107698030123e-4, 0.464578634580806e-4),
       complex(0.234801409215913e-10, -0.285651142904972e-10))


def _out(x):
    x = np.asarray(x, dtype=float)
    return x[()] if x.ndim == 0 else x


def _gibbs_derivatives(temperature, pressure):
    """(g_p, g_TT) of the IAPWS R10-06 Gibbs function [m^3/kg, J/(kg K^2)]."""
    T = np.asarray(temperature, dtype=float)
    p = np.asarray(pressure, dtype=float)
    check_range("ice.gibbs", T, *VALIDITY["ice.gibbs"])
    tau = (T / _TT).astype(complex)
    dpi = (p - _P0) / _PT  # pi - pi0
    g0_p = sum(_G0[k] * k / _PT * dpi ** (k - 1) for k in range(1, 5))  # Eq. 2, d/dp
    r2_p = sum(_R2[k] * k / _PT * dpi ** (k - 1) for k in range(1, 3))  # Eq. 3, d/dp

    def bracket(t):
        # Eq. 1 kernel: (t - tau) ln(t - tau) + (t + tau) ln(t + tau) - 2 t ln t - tau^2 / t
        return (t - tau) * np.log(t - tau) + (t + tau) * np.log(t + tau) - 2.0 * t * np.log(t) - tau**2 / t

    def bracket_tt(t):
        # its second tau derivative
        return 1.0 / (t - tau) + 1.0 / (t + tau) - 2.0 / t

    r2 = sum(_R2[k] * dpi**k for k in range(3))
    g_p = g0_p + _TT * np.real(r2_p * bracket(_T2))  # Eq. 1, dg/dp
    g_tt = np.real(_R1 * bracket_tt(_T1) + r2 * bracket_tt(_T2)) / _TT  # Eq. 1, d2g/dT2
    return g_p, g_tt


def density(temperature, pressure=c.STANDARD_ATMOSPHERE):
    """Density of ice Ih.

    IAPWS R10-06(2009) (Feistel & Wagner 2006, J. Phys. Chem. Ref. Data 35, 1021):
    rho = 1 / (dg/dp), with g(T, p) from Eqs. 1-4 of the release.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].
    pressure : float or ndarray
        Pressure [Pa]; the default is one standard atmosphere.

    Returns
    -------
    float or ndarray
        Density [kg/m^3].
    """
    g_p, _ = _gibbs_derivatives(temperature, pressure)
    return _out(1.0 / g_p)  # Table 3: rho = 1/g_p


def heat_capacity(temperature, pressure=c.STANDARD_ATMOSPHERE):
    """Isobaric specific heat capacity of ice Ih.

    IAPWS R10-06(2009) (Feistel & Wagner 2006): cp = -T d2g/dT2, g from Eqs. 1-4.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].
    pressure : float or ndarray
        Pressure [Pa]; the default is one standard atmosphere.

    Returns
    -------
    float or ndarray
        Specific heat capacity [J/(kg K)].
    """
    T = np.asarray(temperature, dtype=float)
    _, g_tt = _gibbs_derivatives(T, pressure)
    return _out(-T * g_tt)  # Table 3: cp = -T g_TT


def latent_heat_fusion(temperature=c.ZERO_CELSIUS):
    """Specific enthalpy of fusion of ice melting into liquid water at the same temperature.

    Below 0 degC this is ice melting into a solution (brine, glycol mix) at its freezing point
    T: the liquid is then supercooled water thermodynamically, so L(T) falls with T.
    Murphy & Koop (2005), Q. J. R. Meteorol. Soc. 131, 1539: L_fus = L_sub - L_vap with
    L_sub = 46782.5 + 35.8925 T - 0.07414 T^2 + 541.5 exp(-(T/123.75)^2) J/mol (Eq. 5) and
    L_vap = 56579 - 42.212 T + exp(0.1149 (281.6 - T)) J/mol (Eq. 9), both toward the same
    vapor, divided by the molar mass of water. It reproduces IAPWS-95 minus IAPWS R10-06
    within 0.15 % from 0 to -10 degC.

    Parameters
    ----------
    temperature : float or ndarray
        Melting temperature [K].

    Returns
    -------
    float or ndarray
        Latent heat of fusion [J/kg].
    """
    T = np.asarray(temperature, dtype=float)
    check_range("ice.latent_heat_fusion", T, *VALIDITY["ice.latent_heat_fusion"])
    l_sub = 46782.5 + 35.8925 * T - 0.07414 * T**2 + 541.5 * np.exp(-((T / 123.75) ** 2))  # Eq. 5
    l_vap = 56579.0 - 42.212 * T + np.exp(0.1149 * (281.6 - T))  # Eq. 9
    return _out((l_sub - l_vap) / c.MOLAR_MASS_WATER)
