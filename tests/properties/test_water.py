"""Checks of vacsim.properties.water against published tables and reference libraries.

Tolerances follow the stated uncertainty of each source; library comparisons use iapws
(IAPWS-95, Wagner & Pruss 2002) which is an independent implementation of a different,
more complete formulation than the auxiliary equations tested here.
"""

import warnings

import numpy as np
import pytest

from vacsim.properties import water
from vacsim.properties._validity import OutOfRangeWarning, reset_warnings

iapws = pytest.importorskip("iapws")


def c2k(t):
    return np.asarray(t, dtype=float) + 273.15


# ---- saturation pressure ----------------------------------------------------------------


@pytest.mark.parametrize(
    "t_c, p_ref",
    [
        # DESIGN.md sec. 5 check values [lib: IAPWS-95]
        (10.0, 1228.2),
        (20.0, 2339.3),
        (25.0, 3169.9),
        (40.0, 7384.9),
        (100.0, 101418.0),
    ],
)
def test_saturation_pressure_design_values(t_c, p_ref):
    # the DESIGN values carry 5 significant figures; Wagner-Pruss agrees with IAPWS-95 to 0.02 %
    assert water.saturation_pressure(c2k(t_c)) == pytest.approx(p_ref, rel=2e-4)


@pytest.mark.parametrize(
    "temperature, p_ref",
    [
        # IAPWS R6-95(2018), Table 8 (saturation states computed from IAPWS-95)
        (275.0, 698.451167),
        (450.0, 0.932203564e6),
        (625.0, 16.9082693e6),
    ],
)
def test_saturation_pressure_iapws95_release_table(temperature, p_ref):
    # Wagner & Pruss (1993) state consistency with IAPWS-95 within its uncertainty (< 0.025 %)
    assert water.saturation_pressure(temperature) == pytest.approx(p_ref, rel=2.5e-4)


def test_saturation_pressure_vs_iapws95_library():
    # iapws.IAPWS95 saturated liquid, 0.01..100 degC: within 0.02 % (assignment requirement)
    T = np.linspace(273.16, 373.15, 25)
    ref = np.array([iapws.IAPWS95(T=t, x=0).P * 1e6 for t in T])
    np.testing.assert_allclose(water.saturation_pressure(T), ref, rtol=2e-4)


def test_saturation_pressure_at_critical_and_triple_point():
    # Wagner & Pruss (1993): p(Tc) = pc exactly; IAPWS R14-08: pt = 611.657 Pa at 273.16 K
    assert water.saturation_pressure(647.096) == pytest.approx(22.064e6, rel=1e-12)
    assert water.saturation_pressure(273.16) == pytest.approx(611.657, rel=1e-5)


def test_saturation_temperature_normal_boiling_point():
    # IAPWS R6-95(2018): normal boiling point 373.124 K (ITS-90) at 101.325 kPa
    assert water.saturation_temperature(101325.0) == pytest.approx(373.124, abs=2e-3)


def test_saturation_temperature_inverts_saturation_pressure():
    # self-consistency over 611.657 Pa .. 22.064 MPa (Newton on the Wagner-Pruss equation)
    T = np.linspace(273.16, 647.0, 200)
    np.testing.assert_allclose(water.saturation_temperature(water.saturation_pressure(T)), T, rtol=1e-10)
    p = np.geomspace(611.657, 22.064e6, 50)
    np.testing.assert_allclose(water.saturation_pressure(water.saturation_temperature(p)), p, rtol=1e-9)


def test_saturation_temperature_vs_iapws_if97_backward():
    # IAPWS-IF97 Eq. 31 (iapws.iapws97._TSat_P) agrees with IAPWS-95 within 0.03 K at low pressure
    from iapws.iapws97 import _TSat_P

    for p in (1000.0, 2339.3, 5e4, 1e6, 1e7):
        assert water.saturation_temperature(p) == pytest.approx(_TSat_P(p / 1e6), abs=0.03)


# ---- supercooled liquid, ice ------------------------------------------------------------


@pytest.mark.parametrize(
    "temperature, p_ref",
    [
        # Murphy & Koop (2005), Q. J. R. Meteorol. Soc. 131, Appendix C check values of Eq. 10
        # (from memory; they match the equation to 5 significant figures)
        (150.0, 1.562e-5),
        (180.0, 0.011239),
        (210.0, 1.2335),
        (240.0, 37.667),
        (273.16, 611.657),
        (300.0, 3536.8),
    ],
)
def test_supercooled_vapor_pressure_murphy_koop_checks(temperature, p_ref):
    assert water.supercooled_vapor_pressure(temperature) == pytest.approx(p_ref, rel=1e-4)


def test_supercooled_vapor_pressure_design_value():
    # DESIGN.md sec. 5: Murphy & Koop at -10 degC, 286.5 Pa
    assert water.supercooled_vapor_pressure(263.15) == pytest.approx(286.5, rel=2e-4)


def test_liquid_vapor_pressure_branches_and_continuity():
    T = np.array([253.15, 263.15, 273.15, 273.16, 293.15])
    got = water.liquid_vapor_pressure(T)
    np.testing.assert_allclose(got[:3], water.supercooled_vapor_pressure(T[:3]), rtol=1e-14)
    np.testing.assert_allclose(got[3:], water.saturation_pressure(T[3:]), rtol=1e-14)
    # the two branches meet within 0.01 % at the triple point (Murphy & Koop 2005, sec. 5)
    below, above = water.liquid_vapor_pressure(np.array([273.16 - 1e-9, 273.16]))
    assert below == pytest.approx(above, rel=1e-4)
    assert np.all(np.diff(water.liquid_vapor_pressure(np.linspace(240, 300, 121))) > 0)


def test_sublimation_pressure_release_and_design():
    # IAPWS R14-08(2011), Table 3 check value: 230 K -> 8.94735e-6 MPa
    assert water.sublimation_pressure(230.0) == pytest.approx(8.94735, rel=1e-6)
    # DESIGN.md sec. 5: -10 degC 259.87 Pa [lib]; triple point pt = 611.657 Pa
    assert water.sublimation_pressure(263.15) == pytest.approx(259.87, rel=1e-4)
    assert water.sublimation_pressure(273.16) == pytest.approx(611.657, rel=1e-9)


def test_sublimation_pressure_vs_iapws_library():
    from iapws._iapws import _Sublimation_Pressure

    T = np.linspace(200.0, 273.16, 20)
    ref = np.array([_Sublimation_Pressure(t) * 1e6 for t in T])
    np.testing.assert_allclose(water.sublimation_pressure(T), ref, rtol=1e-8)
    # ice's vapor pressure is below the supercooled liquid's (thermodynamic necessity)
    assert np.all(water.sublimation_pressure(T[:-1]) < water.supercooled_vapor_pressure(T[:-1]))


# ---- liquid properties ------------------------------------------------------------------


@pytest.mark.parametrize(
    "t_c, rho_ref, tol",
    [
        # CRC Handbook of Chemistry and Physics, 97th ed., "Properties of water in the range
        # 0-100 degC" (density, kg/m^3); tolerance = Kell's stated +-0.01 (0..40 degC)
        (0.0, 999.84, 0.01),
        (4.0, 999.97, 0.01),
        (20.0, 998.21, 0.01),
        (25.0, 997.05, 0.01),
        (40.0, 992.22, 0.01),
        (100.0, 958.37, 0.03),
    ],
)
def test_density_crc(t_c, rho_ref, tol):
    assert water.density(c2k(t_c)) == pytest.approx(rho_ref, abs=tol)


def test_density_kell_coefficient_is_the_correct_one():
    # Kell (1975) Eq. 16 at t = 0 is its leading coefficient; at 50 degC the misprinted
    # denominator 16.897850e-3 would give 987.2 instead of 988.04 (CRC 97th ed.)
    assert water.density(273.15) == pytest.approx(999.83952, abs=1e-9)
    assert water.density(c2k(50.0)) == pytest.approx(988.04, abs=0.02)


def test_density_vs_iapws95():
    # IAPWS-95 at 0.101325 MPa, 0..99 degC: Kell agrees within 20 ppm
    T = np.linspace(273.15, 372.15, 12)
    ref = np.array([iapws.IAPWS95(T=t, P=0.101325).rho for t in T])
    np.testing.assert_allclose(water.density(T), ref, rtol=2e-5)


def test_heat_capacity():
    # DESIGN.md sec. 5: 20 degC 4184.1 J/(kg K) [IAPWS-95]; SR6-08 uncertainty ~0.1 %
    assert water.heat_capacity(293.15) == pytest.approx(4184.1, rel=1e-3)
    # CRC Handbook 97th ed., "Properties of water in the range 0-100 degC": 25 degC 4.1813 J/(g K)
    # (from memory)
    assert water.heat_capacity(298.15) == pytest.approx(4181.3, rel=1e-3)
    # iapws IAPWS-95 at 0.101325 MPa over 0..99 degC within 0.1 %
    T = np.linspace(273.16, 372.15, 12)
    ref = np.array([iapws.IAPWS95(T=t, P=0.101325).cp * 1e3 for t in T])
    np.testing.assert_allclose(water.heat_capacity(T), ref, rtol=1e-3)


def test_heat_capacity_supercooled_vs_iapws_g12_15():
    # IAPWS G12-15 supercooled-water guideline (iapws._Supercooled) at -10 degC, within 0.5 %
    from iapws._iapws import _Supercooled

    assert water.heat_capacity(263.15) == pytest.approx(_Supercooled(263.15, 0.101325)["cp"] * 1e3, rel=5e-3)


@pytest.mark.parametrize(
    "temperature, rho, mu_ref",
    [
        # IAPWS R12-08 (viscosity 2008), Table 4 check values, mu0*mu1 (mu2 = 1) [uPa s]
        (298.15, 998.0, 889.735100),
        (298.15, 1200.0, 1437.649467),
        (373.15, 1000.0, 307.883622),
        (433.15, 1.0, 14.538324),
        (873.15, 600.0, 77.430195),
    ],
)
def test_viscosity_from_density_release_table(temperature, rho, mu_ref):
    assert water.viscosity_from_density(temperature, rho) * 1e6 == pytest.approx(mu_ref, abs=1e-6)


def test_viscosity_at_0_1_mpa():
    # ISO/TR 3666:1998 (and DESIGN.md): 20 degC 1.0016 mPa s, uncertainty 0.17 %
    assert water.viscosity(293.15) == pytest.approx(1.0016e-3, rel=1.7e-3)
    # CRC Handbook 97th ed., "Viscosity of water": 0 degC 1.793 mPa s, 100 degC 0.282 mPa s
    # (from memory)
    assert water.viscosity(273.15) == pytest.approx(1.793e-3, rel=3e-3)
    assert water.viscosity(373.15) == pytest.approx(0.282e-3, rel=5e-3)
    T = np.linspace(273.16, 372.15, 12)
    ref = np.array([iapws.IAPWS95(T=t, P=0.101325).mu for t in T])
    np.testing.assert_allclose(water.viscosity(T), ref, rtol=1e-4)


def test_thermal_conductivity():
    # Ramires et al. (1995), J. Phys. Chem. Ref. Data 24, 1377: standard reference value at
    # 298.15 K, 0.1 MPa, 0.6065 W/(m K), +-0.3 %
    assert water.thermal_conductivity(298.15) == pytest.approx(0.6065, rel=3e-3)
    T = np.linspace(273.16, 372.15, 12)
    ref = np.array([iapws.IAPWS95(T=t, P=0.101325).k for t in T])
    np.testing.assert_allclose(water.thermal_conductivity(T), ref, rtol=2e-3)


def test_latent_heat_vaporization():
    # Wagner & Pruss (2002), J. Phys. Chem. Ref. Data 31, 387, Table 13.1 (from memory):
    # 0.01 degC 2500.9 kJ/kg, 100 degC 2256.4 kJ/kg (at 373.124 K: 2256.5)
    assert water.latent_heat_vaporization(273.16) == pytest.approx(2500.9e3, rel=5e-4)
    assert water.latent_heat_vaporization(373.15) == pytest.approx(2256.4e3, rel=5e-4)
    T = np.linspace(273.16, 473.15, 9)
    ref = np.array([(iapws.IAPWS95(T=t, x=1).h - iapws.IAPWS95(T=t, x=0).h) * 1e3 for t in T])
    np.testing.assert_allclose(water.latent_heat_vaporization(T), ref, rtol=5e-4)


def test_saturated_densities_vs_iapws95():
    T = np.array([280.0, 350.0, 450.0, 600.0])
    rl = np.array([iapws.IAPWS95(T=t, x=0).rho for t in T])
    rv = np.array([iapws.IAPWS95(T=t, x=1).rho for t in T])
    # IAPWS SR1-86(1992): the auxiliary equations reproduce IAPWS-95 within 0.1 %
    np.testing.assert_allclose(water.saturated_liquid_density(T), rl, rtol=1e-3)
    np.testing.assert_allclose(water.saturated_vapor_density(T), rv, rtol=1e-3)


# ---- array behaviour and validity ranges -------------------------------------------------

FUNCS = [
    water.saturation_pressure, water.supercooled_vapor_pressure, water.liquid_vapor_pressure,
    water.sublimation_pressure, water.density, water.heat_capacity, water.viscosity,
    water.thermal_conductivity, water.latent_heat_vaporization,
]


@pytest.mark.parametrize("fn", FUNCS, ids=lambda f: f.__name__)
def test_scalar_and_array_shapes(fn):
    t = 272.0 if fn is water.sublimation_pressure else 290.0
    scalar = fn(t)
    assert np.ndim(scalar) == 0 and isinstance(scalar, float)
    arr = fn(np.full((2, 3), t))
    assert arr.shape == (2, 3)
    np.testing.assert_allclose(arr, scalar, rtol=1e-15)


def test_out_of_range_warns_once():
    reset_warnings()
    with pytest.warns(OutOfRangeWarning, match="water.density"):
        water.density(500.0)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        water.density(500.0)  # second time: silent
    reset_warnings()
