"""Checks of vacsim.properties.ice against IAPWS R10-06 tables, DESIGN values and iapws."""

import numpy as np
import pytest

from vacsim.properties import ice

iapws = pytest.importorskip("iapws")


@pytest.mark.parametrize(
    "temperature, pressure, rho_ref, cp_ref",
    [
        # IAPWS R10-06(2009), Table 6 (check values of the ice Ih Gibbs function)
        (273.16, 611.657, 916.709492, 2096.78431),
        (273.152519, 101325.0, 916.721463, 2096.71391),
        (100.0, 100e6, 941.678203, 866.333195),
    ],
)
def test_release_check_values(temperature, pressure, rho_ref, cp_ref):
    assert ice.density(temperature, pressure) == pytest.approx(rho_ref, abs=1e-6)
    assert ice.heat_capacity(temperature, pressure) == pytest.approx(cp_ref, abs=1e-5)


def test_handbook_values():
    # CRC Handbook 97th ed., "Properties of ice and supercooled water" (from memory):
    # density 0.9167 g/cm^3 at 0 degC, 0.9182 at -10 degC; cp 2.11 J/(g K) at 0 degC,
    # 2.03 at -10 degC (older calorimetry, +-1 %)
    assert ice.density(273.15) == pytest.approx(916.7, abs=0.2)
    assert ice.density(263.15) == pytest.approx(918.2, abs=0.3)
    assert ice.heat_capacity(273.15) == pytest.approx(2110.0, rel=1e-2)
    assert ice.heat_capacity(263.15) == pytest.approx(2030.0, rel=1e-2)


def test_vs_iapws_library():
    from iapws._iapws import _Ice

    T = np.linspace(150.0, 273.15, 12)
    rho = np.array([_Ice(t, 0.101325)["rho"] for t in T])
    cp = np.array([_Ice(t, 0.101325)["cp"] * 1e3 for t in T])
    np.testing.assert_allclose(ice.density(T), rho, rtol=1e-10)
    np.testing.assert_allclose(ice.heat_capacity(T), cp, rtol=1e-10)


@pytest.mark.parametrize(
    "t_c, l_ref",
    [
        # DESIGN.md sec. 4 [lib: IAPWS-95 minus IAPWS-06]: 333.4 kJ/kg at 0 degC, melting
        # into brine at -5 degC 322.7, at -10 degC 311.6; required within 0.3 %
        (0.0, 333.4e3),
        (-5.0, 322.7e3),
        (-10.0, 311.6e3),
    ],
)
def test_latent_heat_fusion_design(t_c, l_ref):
    assert ice.latent_heat_fusion(273.15 + t_c) == pytest.approx(l_ref, rel=3e-3)


@pytest.mark.filterwarnings("ignore:Using extrapolated values")
def test_latent_heat_fusion_vs_iapws():
    # IAPWS-95 (metastable liquid) minus IAPWS R10-06 enthalpy at 0.101325 MPa, iapws library
    from iapws._iapws import _Ice

    for T in (273.15, 270.15, 266.15, 263.15):
        ref = (iapws.IAPWS95(T=T, P=0.101325).h - _Ice(T, 0.101325)["h"]) * 1e3
        assert ice.latent_heat_fusion(T) == pytest.approx(ref, rel=3e-3)


def test_latent_heat_fusion_default_and_trend():
    # default is 0 degC; L falls as the melting point falls (c_p,water > c_p,ice, Kirchhoff)
    assert ice.latent_heat_fusion() == pytest.approx(ice.latent_heat_fusion(273.15))
    T = np.linspace(240.0, 273.15, 20)
    L = ice.latent_heat_fusion(T)
    assert L.shape == T.shape and np.all(np.diff(L) > 0)
    # Kirchhoff slope dL/dT = cp_w - cp_ice ~ 2.1 kJ/(kg K) near 0 degC (4.22 - 2.10)
    slope = (ice.latent_heat_fusion(273.15) - ice.latent_heat_fusion(272.15)) / 1.0
    assert slope == pytest.approx(4219.0 - 2097.0, rel=0.05)
