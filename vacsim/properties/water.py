"""Properties of pure water: vapor pressure over liquid and ice, and liquid properties near 0.1 MPa.

Every function takes temperatures [K] (float or ndarray, broadcast) and returns SI values.
Scalars in give numpy scalars out; arrays in give arrays out.

Sources
-------
- Wagner, W. & Pruss, A. (1993), "International equations for the saturation properties of
  ordinary water substance. Revised according to the International Temperature Scale of 1990",
  J. Phys. Chem. Ref. Data 22, 783-787; adopted as IAPWS SR1-86(1992), "Revised Supplementary
  Release on Saturation Properties of Ordinary Water Substance".
- IAPWS R14-08(2011), "Revised Release on the Pressure along the Melting and Sublimation Curves
  of Ordinary Water Substance" (Wagner, Riethmann, Feistel & Harvey 2011, J. Phys. Chem. Ref.
  Data 40, 043103).
- Murphy, D. M. & Koop, T. (2005), "Review of the vapour pressures of ice and supercooled water
  for atmospheric applications", Q. J. R. Meteorol. Soc. 131, 1539-1565.
- Kell, G. S. (1975), "Density, thermal expansivity, and compressibility of liquid water from
  0 deg to 150 deg C", J. Chem. Eng. Data 20, 97-105.
- IAPWS SR6-08(2011), "Revised Supplementary Release on Properties of Liquid Water at 0.1 MPa",
  based on Patek, Hruby, Klomfar, Souckova & Harvey (2009), J. Phys. Chem. Ref. Data 38, 21-29.
- IAPWS R12-08, "Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water
  Substance" (Huber et al. 2009, J. Phys. Chem. Ref. Data 38, 101-125).
- IAPWS R7-97(2012), "Revised Release on the IAPWS Industrial Formulation 1997 for the
  Thermodynamic Properties of Water and Steam" (IAPWS-IF97), Eq. 31 (backward saturation
  temperature), used only as the starting point of a Newton iteration.
"""

from __future__ import annotations

import numpy as np

from .. import constants as c
from ._validity import check_range

__all__ = [
    "saturation_pressure",
    "saturation_temperature",
    "supercooled_vapor_pressure",
    "liquid_vapor_pressure",
    "sublimation_pressure",
    "density",
    "heat_capacity",
    "viscosity",
    "thermal_conductivity",
    "latent_heat_vaporization",
    "saturated_liquid_density",
    "saturated_vapor_density",
]

_TC = c.WATER_CRITICAL_TEMPERATURE  # K
_PC = c.WATER_CRITICAL_PRESSURE  # Pa
_RHOC = 322.0  # kg/m^3, critical density, IAPWS R6-95
_TT = c.WATER_TRIPLE_POINT_TEMPERATURE  # K
_PT = c.WATER_TRIPLE_POINT_PRESSURE  # Pa
_R_WATER = 461.51805  # J/(kg K), specific gas constant used by IAPWS SR6-08 (R/M, IAPWS R6-95)

# Validity ranges as stated by each source: name -> (low, high, unit)
VALIDITY = {
    "water.saturation_pressure": (273.15, _TC, "K"),  # Wagner & Pruss 1993 from 273.16 K; 0.01 K extrapolation allowed
    "water.saturation_temperature": (_PT, _PC, "Pa"),
    "water.supercooled_vapor_pressure": (123.0, 332.0, "K"),  # Murphy & Koop 2005, eq. 10
    "water.sublimation_pressure": (50.0, _TT, "K"),  # IAPWS R14-08(2011)
    "water.density": (253.15, 423.15, "K"),  # SR6-08 below 0 degC, Kell 1975 0..150 degC
    "water.heat_capacity": (253.15, 383.15, "K"),  # IAPWS SR6-08, 0.1 MPa
    "water.viscosity": (253.15, 383.15, "K"),  # IAPWS 2008 at 0.1 MPa, Kell density above 273.15 K
    "water.thermal_conductivity": (253.15, 383.15, "K"),  # IAPWS SR6-08, 0.1 MPa
    "water.latent_heat_vaporization": (_TT, _TC, "K"),  # IAPWS SR1-86(1992)
}


def _out(x):
    """Unwrap 0-d arrays so scalar input gives a numpy scalar."""
    x = np.asarray(x, dtype=float)
    return x[()] if x.ndim == 0 else x


def _range(name, value):
    low, high, unit = VALIDITY[name]
    check_range(name, value, low, high, unit)


# ---- saturation pressure over liquid water (Wagner & Pruss 1993) ------------------------

_WP_A = np.array([-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502])
_WP_E = np.array([1.0, 1.5, 3.0, 3.5, 4.0, 7.5])


def _wp_sums(temperature):
    """tau = 1 - T/Tc; return (tau, S(tau), dS/dtau) of the Wagner-Pruss sum."""
    T = np.minimum(np.asarray(temperature, dtype=float), _TC)
    tau = 1.0 - T / _TC
    tau_ = tau[..., None]
    s = np.sum(_WP_A * tau_**_WP_E, axis=-1)
    ds = np.sum(_WP_A * _WP_E * tau_ ** (_WP_E - 1.0), axis=-1)
    return tau, s, ds


def saturation_pressure(temperature):
    """Vapor pressure of liquid water (saturation pressure).

    Wagner & Pruss (1993), J. Phys. Chem. Ref. Data 22, 783, Eq. 1 (IAPWS SR1-86(1992)):
    ln(p/pc) = (Tc/T)(a1 t + a2 t^1.5 + a3 t^3 + a4 t^3.5 + a5 t^4 + a6 t^7.5), t = 1 - T/Tc.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Saturation pressure [Pa].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.saturation_pressure", T)
    _, s, _ = _wp_sums(T)
    return _out(_PC * np.exp(_TC / T * s))  # Eq. 1


def _saturation_pressure_derivative(temperature):
    """dp_sat/dT [Pa/K] of the Wagner-Pruss equation, differentiated analytically."""
    T = np.asarray(temperature, dtype=float)
    _, s, ds = _wp_sums(T)
    p = _PC * np.exp(_TC / T * s)
    return p, -(p / T) * (_TC / T * s + ds)


# IAPWS-IF97 region 4 coefficients n1..n10 (IAPWS R7-97(2012), Table 34)
_IF97_N = (
    0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
    -0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6,
    -0.23855557567849, 0.65017534844798e3,
)


def saturation_temperature(pressure):
    """Boiling temperature of water at a pressure: the inverse of :func:`saturation_pressure`.

    Start from the IAPWS-IF97 backward equation (IAPWS R7-97(2012), Eq. 31), then refine with
    Newton steps on the Wagner & Pruss (1993) equation so the two functions invert each other
    to machine precision.

    Parameters
    ----------
    pressure : float or ndarray
        Pressure [Pa].

    Returns
    -------
    float or ndarray
        Saturation temperature [K].
    """
    p = np.asarray(pressure, dtype=float)
    _range("water.saturation_temperature", p)
    n1, n2, n3, n4, n5, n6, n7, n8, n9, n10 = _IF97_N
    beta = np.clip(p, _PT, _PC) ** 0.25 / 1e6**0.25  # beta = (p / 1 MPa)^(1/4)
    e = beta**2 + n3 * beta + n6
    f = n1 * beta**2 + n4 * beta + n7
    g = n2 * beta**2 + n5 * beta + n8
    d = 2.0 * g / (-f - np.sqrt(f**2 - 4.0 * e * g))
    T = 0.5 * (n10 + d - np.sqrt((n10 + d) ** 2 - 4.0 * (n9 + n10 * d)))  # Eq. 31
    lnp = np.log(np.clip(p, 1e-300, None))
    for _ in range(3):  # Newton on ln p (quadratic convergence; IF97 starts within 0.03 K)
        T = np.clip(T, 200.0, _TC)
        ps, dps = _saturation_pressure_derivative(T)
        step = (np.log(ps) - lnp) / (dps / ps)
        T = T - step
    return _out(np.minimum(T, _TC))


# ---- supercooled liquid and ice ----------------------------------------------------------


def supercooled_vapor_pressure(temperature):
    """Vapor pressure over liquid water, including supercooled liquid.

    Murphy & Koop (2005), Q. J. R. Meteorol. Soc. 131, 1539, Eq. 10:
    ln p = 54.842763 - 6763.22/T - 4.210 ln T + 0.000367 T
           + tanh(0.0415 (T - 218.8)) (53.878 - 1331.22/T - 9.44523 ln T + 0.014025 T).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Vapor pressure [Pa].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.supercooled_vapor_pressure", T)
    lnp = (
        54.842763 - 6763.22 / T - 4.210 * np.log(T) + 0.000367 * T
        + np.tanh(0.0415 * (T - 218.8)) * (53.878 - 1331.22 / T - 9.44523 * np.log(T) + 0.014025 * T)
    )  # Eq. 10
    return _out(np.exp(lnp))


def liquid_vapor_pressure(temperature):
    """Vapor pressure over liquid water at any temperature, stable or supercooled.

    Wagner & Pruss (1993) at and above the triple point 273.16 K, Murphy & Koop (2005) Eq. 10
    below it (the two agree to about 0.01 % at the triple point). This is the pure-water
    pressure that a solution's water activity multiplies.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Vapor pressure over liquid water [Pa].
    """
    T = np.asarray(temperature, dtype=float)
    cold = T < _TT
    out = np.empty(np.broadcast(T).shape)
    if np.any(~cold):
        out[~cold] = saturation_pressure(T[~cold])
    if np.any(cold):
        out[cold] = supercooled_vapor_pressure(T[cold])
    return _out(out)


_SUB_A = np.array([-21.2144006, 27.3203819, -6.10598130])
_SUB_B = np.array([0.333333333e-2, 1.20666667, 1.70333333])


def sublimation_pressure(temperature):
    """Vapor pressure over ice Ih (sublimation pressure).

    IAPWS R14-08(2011), Eq. 6: ln(p/pt) = (1/theta) sum_i a_i theta^b_i, theta = T/Tt,
    Tt = 273.16 K, pt = 611.657 Pa.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Sublimation pressure [Pa].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.sublimation_pressure", T)
    theta = T / _TT
    s = np.sum(_SUB_A * theta[..., None] ** _SUB_B, axis=-1)
    return _out(_PT * np.exp(s / theta))  # Eq. 6


# ---- liquid properties near 0.1 MPa ------------------------------------------------------

_KELL_NUM = (999.83952, 16.945176, -7.9870401e-3, -46.170461e-6, 105.56302e-9, -280.54253e-12)
_KELL_DEN = 16.879850e-3  # the correct value; a misprinted 16.897850e-3 circulates


def density(temperature):
    """Density of air-free liquid water at 1 atm.

    Kell (1975), J. Chem. Eng. Data 20, 97, Eq. 16, at and above 0 degC:
    rho = (999.83952 + 16.945176 t - 7.9870401e-3 t^2 - 46.170461e-6 t^3 + 105.56302e-9 t^4
           - 280.54253e-12 t^5) / (1 + 16.879850e-3 t), t in degC (IPTS-68; the ITS-90
    difference is a few mK and changes rho by under 1 ppm). Below 0 degC (supercooled
    liquid, e.g. an ice-water tub that dips a little) the IAPWS SR6-08 Gibbs-function
    density at 0.1 MPa, which meets Kell's within 4 ppm at 0 degC.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Density [kg/m^3].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.density", T)
    return _out(_density_extended(T))


def _kell_density(temperature):
    """Kell (1975) Eq. 16 [kg/m^3]."""
    t = np.asarray(temperature, dtype=float) - c.ZERO_CELSIUS
    num = np.polynomial.polynomial.polyval(t, _KELL_NUM)
    return num / (1.0 + _KELL_DEN * t)  # Eq. 16


# IAPWS SR6-08(2011), Table 2 (Gibbs function of liquid water at 0.1 MPa)
_SR6_A = {1: (-1.661470539e5, 4), 2: (2.708781640e6, 5), 3: (-1.557191544e8, 7)}
_SR6_B = {1: (-8.237426256e-1, 2), 2: (1.908956353, 3), 3: (-2.017597384, 4), 4: (8.546361348e-1, 5)}
_SR6_C3 = -8.983025854
_SR6_TR = 10.0  # K


def heat_capacity(temperature):
    """Isobaric specific heat capacity of liquid water at 0.1 MPa (stable and supercooled).

    IAPWS SR6-08(2011) (Patek et al. 2009, J. Phys. Chem. Ref. Data 38, 21): the Gibbs function
    g(T) = R Tr [c1 + c2 tau + c3 tau ln tau + sum a_i alpha^n_i + sum b_i beta^m_i],
    tau = T/Tr, alpha = Tr/(593 K - T), beta = Tr/(T - 232 K), Tr = 10 K, so
    cp = -T d2g/dT2 = -R [c3 + tau (sum n_i (n_i + 1) a_i alpha^(n_i+2)
                                      + sum m_i (m_i + 1) b_i beta^(m_i+2))].
    The release states an uncertainty of about 0.1 % in the stable liquid (0..100 degC).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Specific heat capacity [J/(kg K)].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.heat_capacity", T)
    tau = T / _SR6_TR
    alpha = _SR6_TR / (593.0 - T)
    beta = _SR6_TR / (T - 232.0)
    sa = sum(a * n * (n + 1) * alpha ** (n + 2) for a, n in _SR6_A.values())
    sb = sum(b * m * (m + 1) * beta ** (m + 2) for b, m in _SR6_B.values())
    return _out(-_R_WATER * (_SR6_C3 + tau * (sa + sb)))  # cp = -T d2g/dT2 of the SR6-08 Gibbs function (Table 2 terms)


# IAPWS R12-08 (viscosity 2008), Tables 1 and 2
_VIS_H0 = np.array([1.67752, 2.20462, 0.6366564, -0.241605])
_VIS_HIJ = np.zeros((6, 7))
for (_i, _j), _h in {
    (0, 0): 5.20094e-1, (1, 0): 8.50895e-2, (2, 0): -1.08374, (3, 0): -2.89555e-1,
    (0, 1): 2.22531e-1, (1, 1): 9.99115e-1, (2, 1): 1.88797, (3, 1): 1.26613, (5, 1): 1.20573e-1,
    (0, 2): -2.81378e-1, (1, 2): -9.06851e-1, (2, 2): -7.72479e-1, (3, 2): -4.89837e-1,
    (4, 2): -2.57040e-1, (0, 3): 1.61913e-1, (1, 3): 2.57399e-1, (0, 4): -3.25372e-2,
    (3, 4): 6.98452e-2, (4, 5): 8.72102e-3, (3, 6): -4.35673e-3, (5, 6): -5.93264e-4,
}.items():
    _VIS_HIJ[_i, _j] = _h
_MU_STAR = 1.0e-6  # Pa s


def viscosity_from_density(temperature, rho):
    """Viscosity of water from temperature and density, IAPWS 2008 without critical enhancement.

    Huber et al. (2009), J. Phys. Chem. Ref. Data 38, 101 (IAPWS R12-08), Eqs. 10-12:
    mu = mu* mu0(Tbar) mu1(Tbar, rhobar); the critical enhancement mu2 equals 1 to better
    than 0.1 % outside a small region around the critical point, and is omitted.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].
    rho : float or ndarray
        Density [kg/m^3].

    Returns
    -------
    float or ndarray
        Dynamic viscosity [Pa s].
    """
    tb = np.asarray(temperature, dtype=float) / _TC
    db = np.asarray(rho, dtype=float) / _RHOC
    mu0 = 100.0 * np.sqrt(tb) / np.sum(_VIS_H0 / tb[..., None] ** np.arange(4), axis=-1)  # Eq. 11
    x = (1.0 / tb - 1.0)[..., None] ** np.arange(6)  # (1/Tbar - 1)^i
    y = (db - 1.0)[..., None] ** np.arange(7)  # (rhobar - 1)^j
    s = np.einsum("...i,ij,...j->...", x, _VIS_HIJ, y)
    mu1 = np.exp(db * s)  # Eq. 12
    return _out(_MU_STAR * mu0 * mu1)  # Eq. 10 with mu2 = 1


def _density_extended(T):
    """Kell density at and above 0 degC; below, the SR6-08 Gibbs-function density (0.1 MPa)."""
    T = np.asarray(T, dtype=float)
    kell = _kell_density(np.maximum(T, c.ZERO_CELSIUS))
    return np.where(T >= c.ZERO_CELSIUS, kell, _sr6_density(np.minimum(T, c.ZERO_CELSIUS)))


# IAPWS SR6-08(2011), Table 2, specific-volume terms a5..a10 (with n) and b5..b10 (with m)
_SR6_A5 = 1.93763157e-2
_SR6_AV = ((6.74458446e3, 4), (-2.22521604e5, 5), (1.00231247e8, 7), (-1.63552118e9, 8), (8.32299658e9, 9))
_SR6_BV = ((5.78545292e-3, 1), (-1.53195665e-2, 2), (3.11337859e-2, 3), (-4.23546241e-2, 4),
           (3.38713507e-2, 5), (-1.19946761e-2, 6))
_SR6_P0 = 1.0e5  # Pa


def _sr6_density(temperature):
    """Density of liquid water at 0.1 MPa from the IAPWS SR6-08 Gibbs function (v = dg/dp)."""
    T = np.asarray(temperature, dtype=float)
    alpha = _SR6_TR / (593.0 - T)
    beta = _SR6_TR / (T - 232.0)
    s = _SR6_A5 + sum(a * alpha**n for a, n in _SR6_AV) + sum(b * beta**m for b, m in _SR6_BV)
    return 1.0 / (_R_WATER * _SR6_TR / _SR6_P0 * s)  # v = dg/dp of the SR6-08 Gibbs function


def viscosity(temperature):
    """Dynamic viscosity of liquid water at 0.1 MPa.

    IAPWS 2008 formulation (Huber et al. 2009, J. Phys. Chem. Ref. Data 38, 101, Eqs. 10-12;
    see :func:`viscosity_from_density`) evaluated at the Kell (1975) density (at 1 atm; the
    pressure effect on viscosity near 0.1 MPa is below 0.01 %). Below 0 degC (supercooled
    liquid) the density comes from IAPWS SR6-08.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Dynamic viscosity [Pa s].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.viscosity", T)
    return viscosity_from_density(T, _density_extended(T))


_SR6_K = ((1.6630, -1.15), (-1.7781, -3.4), (1.1567, -6.0), (-0.432115, -7.6))


def thermal_conductivity(temperature):
    """Thermal conductivity of liquid water at 0.1 MPa.

    IAPWS SR6-08(2011), Eq. 8 (Patek et al. 2009): lambda = sum_i c_i (T/300 K)^d_i W/(m K),
    253.15..383.15 K; it reproduces the IAPWS 2011 thermal-conductivity formulation within
    its uncertainty.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Thermal conductivity [W/(m K)].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.thermal_conductivity", T)
    x = T / 300.0
    return _out(sum(ci * x**di for ci, di in _SR6_K))  # Eq. 8


# ---- saturated densities and latent heat (IAPWS SR1-86(1992)) ----------------------------

_RHOL_B = np.array([1.99274064, 1.09965342, -0.510839303, -1.75493479, -45.5170352, -6.74694450e5])
_RHOL_E = np.array([1.0, 2.0, 5.0, 16.0, 43.0, 110.0]) / 3.0
_RHOV_C = np.array([-2.03150240, -2.68302940, -5.38626492, -17.2991605, -44.7586581, -63.9201063])
_RHOV_E = np.array([2.0, 4.0, 8.0, 18.0, 37.0, 71.0]) / 6.0


def saturated_liquid_density(temperature):
    """Density of saturated liquid water.

    IAPWS SR1-86(1992) (Wagner & Pruss 1993), Eq. 2:
    rho'/rhoc = 1 + sum b_i tau^(e_i), e = 1/3, 2/3, 5/3, 16/3, 43/3, 110/3, tau = 1 - T/Tc.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Saturated liquid density [kg/m^3].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.latent_heat_vaporization", T)
    tau, _, _ = _wp_sums(T)
    return _out(_RHOC * (1.0 + np.sum(_RHOL_B * tau[..., None] ** _RHOL_E, axis=-1)))  # Eq. 2


def saturated_vapor_density(temperature):
    """Density of saturated water vapor.

    IAPWS SR1-86(1992) (Wagner & Pruss 1993), Eq. 3:
    ln(rho''/rhoc) = sum c_i tau^(e_i), e = 2/6, 4/6, 8/6, 18/6, 37/6, 71/6.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Saturated vapor density [kg/m^3].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.latent_heat_vaporization", T)
    tau, _, _ = _wp_sums(T)
    return _out(_RHOC * np.exp(np.sum(_RHOV_C * tau[..., None] ** _RHOV_E, axis=-1)))  # Eq. 3


def latent_heat_vaporization(temperature):
    """Specific enthalpy of vaporization of water along the saturation line.

    Clapeyron equation with the IAPWS SR1-86(1992) auxiliary equations (Wagner & Pruss 1993):
    h'' - h' = T (dp/dT) (1/rho'' - 1/rho'), with dp/dT from Eq. 1 and rho', rho'' from
    Eqs. 2 and 3; SR1-86 constructs its enthalpy equations (Eqs. 6-7) to obey exactly this.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature [K].

    Returns
    -------
    float or ndarray
        Latent heat of vaporization [J/kg].
    """
    T = np.asarray(temperature, dtype=float)
    _range("water.latent_heat_vaporization", T)
    _, dpdt = _saturation_pressure_derivative(T)
    rl = saturated_liquid_density(T)
    rv = saturated_vapor_density(T)
    return _out(T * dpdt * (1.0 / rv - 1.0 / rl))  # Clapeyron
