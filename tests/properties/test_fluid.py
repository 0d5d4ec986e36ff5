"""Checks of the tub-fluid dispatcher vacsim.properties.fluid."""

import numpy as np
import pytest

from vacsim.errors import InputError
from vacsim.properties import fluid, glycol, water

PROPS = ["vapor_pressure", "water_activity", "density", "heat_capacity", "viscosity", "thermal_conductivity"]
WATER_FN = {
    "vapor_pressure": water.liquid_vapor_pressure,
    "water_activity": lambda T: np.ones_like(np.asarray(T, dtype=float)),
    "density": water.density,
    "heat_capacity": water.heat_capacity,
    "viscosity": water.viscosity,
    "thermal_conductivity": water.thermal_conductivity,
}


def test_constants():
    assert fluid.GLYCOL_KINDS == ("none", "ethylene", "propylene")
    assert fluid.MAX_MASS_FRACTION == 0.6


@pytest.mark.parametrize("name", PROPS)
def test_water_dispatch(name):
    T = np.array([273.15, 293.15, 353.15])
    expected = WATER_FN[name](T)
    fn = getattr(fluid, name)
    np.testing.assert_allclose(fn("none", 0.0, T), expected, rtol=1e-14)
    np.testing.assert_allclose(fn("ethylene", 0.0, T), expected, rtol=1e-14)  # w = 0 is water
    assert np.ndim(fn("none", 0.0, 293.15)) == 0


@pytest.mark.parametrize("name", PROPS)
@pytest.mark.parametrize("kind", ["ethylene", "propylene"])
def test_glycol_dispatch(name, kind):
    T = np.array([263.15, 293.15])
    np.testing.assert_allclose(
        getattr(fluid, name)(kind, 0.4, T), getattr(glycol, name)(kind, 0.4, T), rtol=1e-14
    )


def test_mixed_array_with_zero_mass_fraction():
    w = np.array([0.0, 0.3])
    p = fluid.vapor_pressure("ethylene", w, 293.15)
    assert p[0] == pytest.approx(water.saturation_pressure(293.15), rel=1e-14)
    assert p[1] == pytest.approx(glycol.vapor_pressure("ethylene", 0.3, 293.15), rel=1e-14)
    tf = fluid.freezing_point("propylene", w)
    assert tf[0] == 273.15 and tf[1] < 273.15


def test_design_check_values():
    # DESIGN.md sec. 5 [lib: CoolProp INCOMP::MEG, Melinder 2010]: EG 30 wt % freezes at
    # -14.58 degC, EG 50 % at -35.99; MEG 30 % at 20 degC rho 1038.05, cp 3718, mu 2.166 mPa s
    assert fluid.freezing_point("none", 0.0) == 273.15
    assert fluid.freezing_point("ethylene", 0.3) - 273.15 == pytest.approx(-14.58, abs=0.02)
    assert fluid.freezing_point("ethylene", 0.5) - 273.15 == pytest.approx(-35.99, abs=0.02)
    assert fluid.density("ethylene", 0.3, 293.15) == pytest.approx(1038.05, abs=0.05)
    assert fluid.heat_capacity("ethylene", 0.3, 293.15) == pytest.approx(3718.0, rel=1e-3)
    assert fluid.viscosity("ethylene", 0.3, 293.15) == pytest.approx(2.166e-3, rel=2e-3)


@pytest.mark.parametrize(
    "kind, w, a_ref",
    [
        # DESIGN.md sec. 5 [derived]: at the freezing point a_w = p_ice(T_f)/p_liquid(T_f):
        # EG 30 % 0.868, EG 50 % 0.705, PG 30 % 0.883, PG 50 % 0.731
        ("ethylene", 0.3, 0.868),
        ("ethylene", 0.5, 0.705),
        ("propylene", 0.3, 0.883),
        ("propylene", 0.5, 0.731),
    ],
)
def test_water_activity_at_freezing_point(kind, w, a_ref):
    tf = fluid.freezing_point(kind, w)
    # ice/solution equilibrium, independently: p_ice / p_liquid from IAPWS R14-08 and Murphy & Koop
    ratio = water.sublimation_pressure(tf) / water.liquid_vapor_pressure(tf)
    assert ratio == pytest.approx(a_ref, abs=2e-3)
    assert fluid.water_activity(kind, w, tf) == pytest.approx(a_ref, abs=1e-2)


def test_vapor_pressure_lowered_by_glycol():
    T = 293.15
    p_w = fluid.vapor_pressure("none", 0.0, T)
    for kind in ("ethylene", "propylene"):
        p = fluid.vapor_pressure(kind, np.array([0.1, 0.3, 0.5]), T)
        assert np.all(np.diff(p) < 0) and np.all(p < p_w)


def test_check_fluid_accepts_valid():
    fluid.check_fluid("none", 0.0)
    fluid.check_fluid("ethylene", 0.6)
    fluid.check_fluid("propylene", np.array([0.0, 0.3]))


@pytest.mark.parametrize(
    "kind, w, match",
    [
        ("ethylene", 0.8, r"tub\.glycol_mass_fraction: 0\.8 is outside 0\.\.0\.6 .*mass fraction 0\.\.0\.6"),
        ("ethylene", -0.1, r"tub\.glycol_mass_fraction: -0\.1 is outside 0\.\.0\.6"),
        ("ethylene", float("nan"), r"tub\.glycol_mass_fraction: .*finite mass fraction 0\.\.0\.6"),
        ("ethylene", "lots", r"tub\.glycol_mass_fraction: expected a number"),
        ("glycerol", 0.3, r"tub\.glycol: unknown glycol 'glycerol'; expected one of none, ethylene, propylene"),
        ("none", 0.3, r"tub\.glycol_mass_fraction: 0\.3 given but tub\.glycol is 'none'"),
    ],
)
def test_check_fluid_rejects(kind, w, match):
    with pytest.raises(InputError, match=match):
        fluid.check_fluid(kind, w)


def test_check_fluid_where_prefix_and_unknown_in_property():
    with pytest.raises(InputError, match=r"^variant\.glycol_mass_fraction"):
        fluid.check_fluid("propylene", 0.7, where="variant")
    with pytest.raises(InputError, match="expected one of none, ethylene, propylene"):
        fluid.density("brine", 0.2, 293.15)


def test_describe():
    assert fluid.describe("none", 0.0) == "water"
    assert fluid.describe("ethylene", 0.3) == "30 wt% ethylene glycol"
