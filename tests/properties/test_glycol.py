"""Aqueous ethylene / propylene glycol properties against published values.

CoolProp (INCOMP::MEG / INCOMP::MPG) implements the same Melinder 2010 coefficients, so
comparing with it checks the transcription only; the independent checks are the
handbook tables, the pure-water limit (IAPWS via the `iapws` package), the cryoscopic
law, ice/solution equilibrium and Fujita & Kikuchi 1989.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest

from vacsim.errors import InputError
from vacsim.properties import glycol
from vacsim.properties._validity import OutOfRangeWarning, reset_warnings

ZERO_C = 273.15
M_WATER = 18.015268e-3  # kg/mol, IAPWS R6-95
M_GLYCOL = {"ethylene": 62.068e-3, "propylene": 76.095e-3}  # kg/mol


# --- private reference copies of pure-water vapor pressures (test only) -------------
def _p_ice(t):
    """IAPWS R14-08(2011) sublimation pressure [Pa]."""
    th = t / 273.16
    a = (-21.2144006, 27.3203819, -6.10598130)
    b = (0.00333333333, 1.20666667, 1.70333333)
    return 611.657 * np.exp(sum(ai * th**bi for ai, bi in zip(a, b)) / th)


def _p_supercooled(t):
    """Murphy & Koop 2005, Q. J. R. Meteorol. Soc. 131, 1539, Eq. 10 [Pa]."""
    return np.exp(
        54.842763 - 6763.22 / t - 4.210 * np.log(t) + 0.000367 * t
        + np.tanh(0.0415 * (t - 218.8))
        * (53.878 - 1331.22 / t - 9.44523 * np.log(t) + 0.014025 * t)
    )  # fmt: skip


def _p_liquid(t):
    """IAPWS 1992 / Wagner & Pruss 1993 saturation pressure [Pa]."""
    tc, pc = 647.096, 22.064e6
    tau = 1.0 - t / tc
    a = (-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502)
    s = (
        a[0] * tau + a[1] * tau**1.5 + a[2] * tau**3
        + a[3] * tau**3.5 + a[4] * tau**4 + a[5] * tau**7.5
    )  # fmt: skip
    return pc * np.exp(tc / t * s)


def _fujita_kikuchi(y, t_c):
    """Fujita & Kikuchi 1989, Trans. JSRAE 6(2), 183: EG/water total pressure [Pa]."""
    return 101325.0 * 10 ** (5.351 - 6.4e-4 * y - (1817 + 0.008 * y * (y + 10)) / (t_c + 240))


@pytest.fixture(autouse=True)
def _quiet():
    reset_warnings()
    with warnings.catch_warnings():
        warnings.simplefilter("error", OutOfRangeWarning)
        yield
    reset_warnings()


# --- freezing point -----------------------------------------------------------------
@pytest.mark.parametrize(
    ("name", "w", "t_c", "tol"),
    [
        ("ethylene", 0.30, -14.58, 0.01),  # CoolProp INCOMP::MEG (DESIGN.md sect. 5)
        ("ethylene", 0.50, -35.99, 0.01),  # CoolProp INCOMP::MEG (DESIGN.md sect. 5)
        ("ethylene", 0.30, -15.0, 1.0),  # glycol suppliers' / ASHRAE tables, from memory
        ("ethylene", 0.50, -37.0, 1.5),  # glycol suppliers' / ASHRAE tables, from memory
    ],
)
def test_freezing_point_values(name, w, t_c, tol):
    assert glycol.freezing_point(name, w) - ZERO_C == pytest.approx(t_c, abs=tol)


# Lange's Handbook of Chemistry, 15th ed. (Dean 1999), Table 5.13 "Compositions of
# aqueous antifreeze solutions", propylene glycol-water: volume % of pure glycol,
# freezing point [degC], specific gravity 15.6 degC. Volume % converted to mass fraction
# with pure-component densities at 15.6 degC: water 999.0 kg/m^3 (IAPWS-95), propylene
# glycol 1039 kg/m^3 (CRC Handbook 1.036 g/cm^3 at 20 degC, from memory, + expansion).
# Tolerance 1 K / 0.6 %: the table is rounded to 0.1 K and the volume-to-mass
# conversion neglects the volume contraction on mixing.
LANGE_PG = [(0.30, -12.8, 1.024), (0.40, -20.6, 1.032), (0.50, -33.3, 1.040)]


def _volume_to_mass(phi, rho_glycol=1039.0, rho_water=999.0):
    return phi * rho_glycol / (phi * rho_glycol + (1 - phi) * rho_water)


@pytest.mark.parametrize(("phi", "t_c", "sg"), LANGE_PG)
def test_propylene_glycol_against_lange(phi, t_c, sg):
    w = _volume_to_mass(phi)
    assert glycol.freezing_point("propylene", w) - ZERO_C == pytest.approx(t_c, abs=1.0)
    rho = glycol.density("propylene", w, ZERO_C + 15.6)
    assert rho / 999.0 == pytest.approx(sg, rel=6e-3)


@pytest.mark.parametrize("name", glycol.GLYCOLS)
def test_freezing_point_dilute_limit_follows_cryoscopic_law(name):
    # Ideal dilute solution: dT = K_f m, K_f = R T0^2 M_w / dH_fus = 1.860 K kg/mol
    # (CRC Handbook "Cryoscopic constants": water 1.86; dH_fus = 6.0095 kJ/mol,
    # IAPWS). At 5 wt % the non-ideality is below 1 %; Melinder's fits are good to about
    # 0.1 K (propylene glycol gives -0.025 degC at w = 0).
    w = 0.05
    molality = w / M_GLYCOL[name] / (1 - w)
    depression = glycol.freezing_point(name, 0.0) - glycol.freezing_point(name, w)
    assert depression == pytest.approx(1.860 * molality, abs=0.15)


def test_freezing_point_decreases_with_concentration():
    w = np.linspace(0.0, 0.6, 61)
    for name in glycol.GLYCOLS:
        assert np.all(np.diff(glycol.freezing_point(name, w)) < 0)


# --- liquid properties --------------------------------------------------------------
def test_ethylene_glycol_30_percent_at_20c():
    t = ZERO_C + 20.0
    # CoolProp INCOMP::MEG[0.3] at 20 degC (DESIGN.md sect. 5)
    assert glycol.density("ethylene", 0.3, t) == pytest.approx(1038.05, abs=0.01)
    assert glycol.heat_capacity("ethylene", 0.3, t) == pytest.approx(3718, abs=0.5)
    assert glycol.viscosity("ethylene", 0.3, t) == pytest.approx(2.166e-3, rel=1e-3)


@pytest.mark.parametrize("name", glycol.GLYCOLS)
def test_pure_water_limit_matches_iapws(name):
    # Melinder's fits at w = 0 must reproduce water. IAPWS-95 (rho, cp), IAPWS 2008
    # viscosity, IAPWS 2011 conductivity, via the `iapws` package (test-only oracle):
    # 20 degC: rho 998.21 kg/m^3, cp 4184.1 J/(kg K), mu 1.0016 mPa s (DESIGN.md
    # sect. 5), k 0.5980 W/(m K). Tolerances = Melinder's fit quality at the edge.
    iapws = pytest.importorskip("iapws")
    t = ZERO_C + 20.0
    water = iapws.IAPWS95(T=t, P=0.101325)
    assert glycol.density(name, 0.0, t) == pytest.approx(water.rho, rel=2e-3)
    assert glycol.heat_capacity(name, 0.0, t) == pytest.approx(water.cp * 1e3, rel=2e-3)
    assert glycol.viscosity(name, 0.0, t) == pytest.approx(water.mu, rel=1.5e-2)
    assert glycol.thermal_conductivity(name, 0.0, t) == pytest.approx(water.k, rel=1e-2)


@pytest.mark.parametrize(("name", "fluid"), [("ethylene", "MEG"), ("propylene", "MPG")])
def test_transcription_against_coolprop(name, fluid):
    # CoolProp INCOMP::MEG / INCOMP::MPG carry Melinder's coefficients: agreement to
    # round-off checks our transcription over 0-60 wt % and T_f ... 100 degC.
    cp = pytest.importorskip("CoolProp.CoolProp")
    for w in (0.0, 0.1, 0.25, 0.4, 0.6):
        t_f = cp.PropsSI("T_freeze", "T", 300.0, "P", 1e5, f"INCOMP::{fluid}[{w}]")
        assert glycol.freezing_point(name, w) == pytest.approx(t_f, abs=1e-9)
        temps = np.linspace(t_f + 0.5, ZERO_C + 99.5, 5)
        for key, func in (
            ("D", glycol.density),
            ("C", glycol.heat_capacity),
            ("L", glycol.thermal_conductivity),
            ("V", glycol.viscosity),
        ):
            ref = [cp.PropsSI(key, "T", t, "P", 1e5, f"INCOMP::{fluid}[{w}]") for t in temps]
            np.testing.assert_allclose(func(name, w, temps), ref, rtol=1e-6)


def test_properties_broadcast():
    w = np.array([[0.1], [0.3], [0.5]])
    t = np.array([280.0, 300.0, 320.0, 330.0])
    for func in (
        glycol.density,
        glycol.heat_capacity,
        glycol.thermal_conductivity,
        glycol.viscosity,
        glycol.water_activity,
    ):
        out = func("ethylene", w, t)
        assert out.shape == (3, 4)
        assert out[1, 2] == pytest.approx(func("ethylene", 0.3, 320.0))
    assert glycol.freezing_point("propylene", w).shape == (3, 1)


def test_viscosity_rises_with_glycol_and_falls_with_temperature():
    t = np.linspace(ZERO_C + 5, ZERO_C + 90, 18)
    for name in glycol.GLYCOLS:
        mu = glycol.viscosity(name, np.array([[0.2], [0.4], [0.6]]), t)
        assert np.all(np.diff(mu, axis=0) > 0)
        assert np.all(np.diff(mu, axis=1) < 0)


# --- water activity and vapor pressure ----------------------------------------------
@pytest.mark.parametrize(
    ("name", "w", "a_ref"),
    [
        ("ethylene", 0.30, 0.868),  # DESIGN.md sect. 5 [derived]: p_ice/p_liquid at T_f
        ("ethylene", 0.50, 0.705),  # idem
        ("propylene", 0.30, 0.883),  # idem
        ("propylene", 0.50, 0.731),  # idem
    ],
)
def test_water_activity_at_freezing_point(name, w, a_ref):
    # Ice in equilibrium with the solution: a_w(T_f) = p_ice(T_f) / p_supercooled(T_f)
    # (IAPWS R14-08 sublimation, Murphy & Koop 2005 Eq. 10).
    t_f = glycol.freezing_point(name, w)
    derived = _p_ice(t_f) / _p_supercooled(t_f)
    assert derived == pytest.approx(a_ref, abs=1.5e-3)
    assert glycol.water_activity(name, w, t_f) == pytest.approx(derived, rel=1e-2)


@pytest.mark.parametrize("name", glycol.GLYCOLS)
def test_water_activity_along_the_whole_freezing_curve(name):
    w = np.linspace(0.02, 0.6, 30)
    t_f = glycol.freezing_point(name, w)
    derived = _p_ice(t_f) / _p_supercooled(t_f)
    np.testing.assert_allclose(glycol.water_activity(name, w, t_f), derived, rtol=1e-2)


@pytest.mark.parametrize("name", glycol.GLYCOLS)
def test_water_activity_limits_and_monotonicity(name):
    assert glycol.water_activity(name, 0.0, 300.0) == 1.0
    w = np.linspace(0.0, 0.6, 121)
    for t in (ZERO_C - 10, ZERO_C + 20, ZERO_C + 60):
        warm = t > glycol.freezing_point(name, w) + 0.1
        a = glycol.water_activity(name, w[warm], t)
        assert np.all(np.diff(a) < 0)
        assert np.all((a > 0) & (a <= 1))
    # small-w slope is Raoult's: a_w = 1 - x_g + O(x_g^2)
    w_small = 1e-4
    x_g = (w_small / M_GLYCOL[name]) / (w_small / M_GLYCOL[name] + (1 - w_small) / M_WATER)
    a = glycol.water_activity(name, w_small, 300.0)
    assert 1 - a == pytest.approx(x_g, rel=1e-3)


def test_propylene_glycol_norrish_constant():
    # Norrish equation a_w = x_w exp(-K x_s^2) with K = 4 for 1,2-propanediol at 25 degC
    # (Chirife, Ferro Fontan & Benmergui 1980, from memory). Loose 1.5 % tolerance.
    w = 0.30
    x_s = (w / M_GLYCOL["propylene"]) / (w / M_GLYCOL["propylene"] + (1 - w) / M_WATER)
    norrish = (1 - x_s) * np.exp(-4.0 * x_s**2)
    assert glycol.water_activity("propylene", w, ZERO_C + 25) == pytest.approx(norrish, rel=1.5e-2)
    # propylene glycol lowers a_w below Raoult's law (gamma_w < 1), unlike UNIFAC's
    # prediction (DESIGN.md sect. 5)
    assert glycol.water_activity("propylene", w, ZERO_C + 25) < 1 - x_s


def test_ethylene_glycol_vapor_pressure_against_fujita_kikuchi():
    # Fujita & Kikuchi 1989 correlation, its stated range 20-50 wt %, -10 ... 60 degC
    # (points above the freezing curve); within 3 %.
    y, t_c = np.meshgrid(np.arange(20.0, 50.1, 5.0), np.arange(-10.0, 60.1, 5.0))
    liquid = ZERO_C + t_c > glycol.freezing_point("ethylene", y / 100) + 0.1
    y, t_c = y[liquid], t_c[liquid]
    p = glycol.vapor_pressure("ethylene", y / 100, ZERO_C + t_c)
    np.testing.assert_allclose(p, _fujita_kikuchi(y, t_c), rtol=3e-2)
    # one spot value: EG 30 wt % at 20 degC, Fujita & Kikuchi 2.05 kPa
    assert glycol.vapor_pressure("ethylene", 0.3, ZERO_C + 20) == pytest.approx(2052, rel=1e-2)


@pytest.mark.parametrize("name", glycol.GLYCOLS)
def test_vapor_pressure_joins_pure_water_and_glycol_part_is_negligible(name):
    for t in (ZERO_C + 5, ZERO_C + 20, ZERO_C + 60):
        # w = 0: the pure-water vapor pressure (IAPWS 1992, DESIGN.md: 20 degC 2339.3 Pa)
        assert glycol.vapor_pressure(name, 0.0, t) == pytest.approx(_p_liquid(t), rel=1e-4)
    assert glycol.vapor_pressure(name, 0.0, ZERO_C + 20) == pytest.approx(2339.3, abs=0.5)
    w = np.linspace(0.05, 0.6, 12)
    t = ZERO_C + 60
    total = glycol.vapor_pressure(name, w, t)
    water_part = glycol.water_activity(name, w, t) * _p_liquid(t)
    assert np.all(total > water_part)
    assert np.all((total - water_part) / total < 7e-3)
    # below 0 degC the supercooled-water branch is used
    t_cold = ZERO_C - 10
    assert glycol.vapor_pressure(name, 0.4, t_cold) == pytest.approx(
        glycol.water_activity(name, 0.4, t_cold) * 286.5, rel=2e-3
    )  # Murphy & Koop 2005 at -10 degC: 286.5 Pa (DESIGN.md sect. 5)


# --- errors and ranges --------------------------------------------------------------
def test_unknown_glycol_lists_valid_ones():
    for func, args in (
        (glycol.freezing_point, (0.3,)),
        (glycol.density, (0.3, 300.0)),
        (glycol.water_activity, (0.3, 300.0)),
        (glycol.vapor_pressure, (0.3, 300.0)),
    ):
        with pytest.raises(InputError, match="ethylene, propylene"):
            func("glycerol", *args)


def test_out_of_range_warns_once():
    with pytest.warns(OutOfRangeWarning, match="mass fraction"):
        glycol.density("ethylene", 0.8, 300.0)
    with pytest.warns(OutOfRangeWarning, match="freezing point"):
        glycol.viscosity("propylene", 0.3, ZERO_C - 30)
    with pytest.warns(OutOfRangeWarning, match="water activity: temperature"):
        glycol.water_activity("ethylene", 0.3, ZERO_C + 90)
