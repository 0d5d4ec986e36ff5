"""Checks of vacsim.properties.air: Sutherland viscosity and Henry's-law dissolved air."""

import numpy as np
import pytest

from vacsim.errors import InputError
from vacsim.properties import air

O2_MOLAR_MASS = 31.9988e-3  # kg/mol (IUPAC atomic weights)


def test_sutherland_viscosity():
    # Sutherland constants (DESIGN.md sec. 2): mu(T0) = mu0 exactly; 20 degC 1.813e-5 Pa s
    assert air.viscosity(273.15) == pytest.approx(1.716e-5, rel=1e-12)
    assert air.viscosity(293.15) == pytest.approx(1.813e-5, rel=5e-4)
    # Lemmon & Jacobsen (2004), Int. J. Thermophys. 25, 21 via CoolProp: 1.8206e-5 Pa s at
    # 20 degC, 1 atm; Sutherland is good to ~0.5 % here
    assert air.viscosity(293.15) == pytest.approx(1.8206e-5, rel=5e-3)


@pytest.mark.parametrize(
    "temperature, mu_ref",
    [
        # Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table A.4, air at 1 atm
        # (from memory): 250 K 159.6e-7, 300 K 184.6e-7, 350 K 208.2e-7 N s/m^2
        (250.0, 159.6e-7),
        (300.0, 184.6e-7),
        (350.0, 208.2e-7),
    ],
)
def test_sutherland_vs_handbook_table(temperature, mu_ref):
    assert air.viscosity(temperature) == pytest.approx(mu_ref, rel=1e-2)
    assert air.viscosity(temperature + 50) > air.viscosity(temperature)  # gases: rises with T


def test_henry_reference_values_and_temperature_dependence():
    # Sander (2023), Atmos. Chem. Phys. 23, 10901 (Wilhelm et al. 1977 rows) at 298.15 K
    assert air.henry_solubility("O2", 298.15) == pytest.approx(1.3e-5)
    assert air.henry_solubility("N2", 298.15) == pytest.approx(6.4e-6)
    assert air.henry_solubility("Ar", 298.15) == pytest.approx(1.4e-5)
    # van 't Hoff: ln(H(T1)/H(T2)) = B (1/T1 - 1/T2), B = 1500 K for O2
    r = air.henry_solubility("O2", 283.15) / air.henry_solubility("O2", 298.15)
    assert np.log(r) == pytest.approx(1500.0 * (1 / 283.15 - 1 / 298.15), rel=1e-12)
    with pytest.raises(InputError, match="O2, N2, Ar"):
        air.henry_solubility("CO2", 298.15)


@pytest.mark.parametrize(
    "t_c, mg_per_l, tol",
    [
        # APHA Standard Methods 4500-O, Table 4500-O:I (Benson & Krause 1984), oxygen
        # solubility in fresh water in equilibrium with water-saturated air at 101.325 kPa
        # (USGS DOTABLES give the same: 9.09 mg/L at 20 degC). Sander's Hcp has two
        # significant figures (+-4 %) and a single van 't Hoff B, hence 5-6 %.
        (0.0, 14.621, 0.06),
        (10.0, 11.288, 0.05),
        (20.0, 9.092, 0.05),
        (25.0, 8.263, 0.05),
    ],
)
def test_oxygen_solubility_vs_standard_methods(t_c, mg_per_l, tol):
    T = 273.15 + t_c
    from vacsim.properties import water

    p_o2 = air.DRY_AIR_MOLE_FRACTION["O2"] * (101325.0 - water.liquid_vapor_pressure(T))
    c_mg_l = air.henry_solubility("O2", T) * p_o2 * O2_MOLAR_MASS * 1e3  # mol/m^3 -> mg/L
    assert c_mg_l == pytest.approx(mg_per_l, rel=tol)


def test_dissolved_air_amount():
    # DESIGN.md sec. 2 [derived from Sander]: air-saturated water at 20 degC holds about
    # 20 mbar L of air per litre = 2.0e3 Pa m^3 per m^3 (1 mbar L/L = 100 Pa)
    assert air.dissolved_air_pv(293.15) == pytest.approx(2.0e3, rel=5e-2)
    # Bunsen coefficient of air in water at 20 degC, 0.01869 (from memory; CRC Handbook
    # "Solubility of gases in water"): V_STP/V_water at 1 atm of dry air, i.e.
    # 0.01869 * 101325 Pa * 293.15/273.15 = 2032 Pa m^3/m^3 at 20 degC
    assert air.dissolved_air_pv(293.15, humid=False) == pytest.approx(0.01869 * 101325 * 293.15 / 273.15, rel=5e-2)


def test_dissolved_air_scaling_and_shapes():
    T = np.array([278.15, 293.15, 308.15])
    c1 = air.dissolved_air_concentration(T, 101325.0, humid=False)
    c2 = air.dissolved_air_concentration(T, 50662.5, humid=False)
    np.testing.assert_allclose(c2, c1 / 2, rtol=1e-12)  # Henry's law is linear in p
    assert np.all(np.diff(c1) < 0)  # less soluble when warmer
    # below the water's own vapor pressure no air stays dissolved
    assert air.dissolved_air_concentration(293.15, 2000.0) == 0.0
    pv = air.dissolved_air_pv(T)
    assert pv.shape == (3,) and np.ndim(air.dissolved_air_pv(293.15)) == 0
