"""The tub liquid's properties, dispatched by glycol kind: plain water or a water-glycol mix.

Plain water ("none", or a glycol mass fraction of exactly 0) comes from
:mod:`vacsim.properties.water`; ethylene and propylene glycol mixes from
:mod:`vacsim.properties.glycol` (Melinder 2010 polynomials, activity model for the vapor
pressure). Every property function has the signature ``f(glycol, mass_fraction, temperature)``;
mass fraction and temperature broadcast as numpy arrays. Validate user input once with
:func:`check_fluid`; the property functions only check the glycol name.
"""

from __future__ import annotations

import numpy as np

from .. import constants as c
from ..errors import InputError
from . import glycol as _glycol
from . import water as _water

__all__ = [
    "GLYCOL_KINDS",
    "MAX_MASS_FRACTION",
    "check_fluid",
    "describe",
    "freezing_point",
    "vapor_pressure",
    "water_activity",
    "density",
    "heat_capacity",
    "viscosity",
    "thermal_conductivity",
]

GLYCOL_KINDS = ("none", "ethylene", "propylene")
MAX_MASS_FRACTION = 0.6  # upper end of Melinder's (2010) correlations


def check_fluid(glycol, mass_fraction, where: str = "tub") -> None:
    """Validate a tub fluid as given by the user; raise InputError naming the field.

    Parameters
    ----------
    glycol : str
        One of :data:`GLYCOL_KINDS`.
    mass_fraction : float or ndarray
        Glycol mass fraction of the mix [-], 0..0.6; must be 0 for "none".
    where : str
        Prefix for the field names in the message (e.g. "tub" -> "tub.glycol").
    """
    if not isinstance(glycol, str) or glycol not in GLYCOL_KINDS:
        raise InputError(f"{where}.glycol: unknown glycol {glycol!r}; expected one of {', '.join(GLYCOL_KINDS)}")
    field = f"{where}.glycol_mass_fraction"
    try:
        w = np.asarray(mass_fraction, dtype=float)
    except (TypeError, ValueError):
        raise InputError(f"{field}: expected a number, mass fraction 0..{MAX_MASS_FRACTION:g}; got {mass_fraction!r}") from None
    if w.size == 0 or not np.all(np.isfinite(w)):
        raise InputError(f"{field}: expected a finite mass fraction 0..{MAX_MASS_FRACTION:g}; got {mass_fraction!r}")
    if np.any(w < 0.0) or np.any(w > MAX_MASS_FRACTION):
        bad = w.flat[np.argmax((w < 0.0) | (w > MAX_MASS_FRACTION))]
        raise InputError(f"{field}: {bad:g} is outside 0..{MAX_MASS_FRACTION:g} (mass fraction 0..{MAX_MASS_FRACTION:g})")
    if glycol == "none" and np.any(w != 0.0):
        raise InputError(f"{field}: {float(w.flat[np.argmax(w != 0.0)]):g} given but {where}.glycol is 'none'")


def describe(glycol: str, mass_fraction: float) -> str:
    """Short human name of the fluid, e.g. 'water' or '30 % ethylene glycol'."""
    if glycol == "none" or mass_fraction == 0:
        return "water"
    return f"{100 * mass_fraction:.4g} wt% {glycol} glycol"


def _kind(glycol):
    if not isinstance(glycol, str) or glycol not in GLYCOL_KINDS:
        raise InputError(f"glycol: unknown glycol {glycol!r}; expected one of {', '.join(GLYCOL_KINDS)}")
    return glycol


def _dispatch(glycol, mass_fraction, temperature, water_fn, glycol_fn):
    """water_fn(T) for water, glycol_fn(glycol, w, T) for mixes; w == 0 elements use water."""
    kind = _kind(glycol)
    T = np.asarray(temperature, dtype=float)
    w = np.asarray(mass_fraction, dtype=float)
    if kind == "none" or (w.ndim == 0 and w == 0.0):
        out = np.broadcast_to(np.asarray(water_fn(T), dtype=float), np.broadcast_shapes(T.shape, w.shape))
        return np.array(out)[()]
    mix = np.asarray(glycol_fn(kind, w, T), dtype=float)
    if np.any(w == 0.0):
        w_b, T_b = np.broadcast_arrays(w, T)
        mix = np.where(w_b == 0.0, water_fn(T_b), mix)
    return mix[()]


def freezing_point(glycol, mass_fraction):
    """Temperature at which ice starts to form in the tub liquid.

    273.15 K for water; Melinder (2010) via :func:`vacsim.properties.glycol.freezing_point`
    for mixes.

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].

    Returns
    -------
    float or ndarray
        Freezing point [K].
    """
    kind = _kind(glycol)
    w = np.asarray(mass_fraction, dtype=float)
    water_fp = np.full(w.shape, c.ZERO_CELSIUS)
    if kind == "none" or (w.ndim == 0 and w == 0.0):
        return water_fp[()]
    return np.where(w == 0.0, water_fp, _glycol.freezing_point(kind, w))[()]


def vapor_pressure(glycol, mass_fraction, temperature):
    """Total equilibrium vapor pressure over the tub liquid.

    Water: :func:`vacsim.properties.water.liquid_vapor_pressure` (Wagner & Pruss 1993,
    Murphy & Koop 2005 below the triple point). Mixes:
    :func:`vacsim.properties.glycol.vapor_pressure` (a_w p_w* + x_g p_g*).

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].
    temperature : float or ndarray
        Liquid temperature [K].

    Returns
    -------
    float or ndarray
        Vapor pressure [Pa].
    """
    return _dispatch(glycol, mass_fraction, temperature, _water.liquid_vapor_pressure, _glycol.vapor_pressure)


def water_activity(glycol, mass_fraction, temperature):
    """Activity of water in the tub liquid (1 for pure water).

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].
    temperature : float or ndarray
        Liquid temperature [K].

    Returns
    -------
    float or ndarray
        Water activity [-].
    """
    return _dispatch(glycol, mass_fraction, temperature, np.ones_like, _glycol.water_activity)


def density(glycol, mass_fraction, temperature):
    """Density of the tub liquid (Kell 1975 for water; Melinder 2010 for mixes).

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].
    temperature : float or ndarray
        Liquid temperature [K].

    Returns
    -------
    float or ndarray
        Density [kg/m^3].
    """
    return _dispatch(glycol, mass_fraction, temperature, _water.density, _glycol.density)


def heat_capacity(glycol, mass_fraction, temperature):
    """Isobaric specific heat capacity of the tub liquid (IAPWS SR6-08 / Melinder 2010).

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].
    temperature : float or ndarray
        Liquid temperature [K].

    Returns
    -------
    float or ndarray
        Specific heat capacity [J/(kg K)].
    """
    return _dispatch(glycol, mass_fraction, temperature, _water.heat_capacity, _glycol.heat_capacity)


def viscosity(glycol, mass_fraction, temperature):
    """Dynamic viscosity of the tub liquid (IAPWS 2008 / Melinder 2010).

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].
    temperature : float or ndarray
        Liquid temperature [K].

    Returns
    -------
    float or ndarray
        Dynamic viscosity [Pa s].
    """
    return _dispatch(glycol, mass_fraction, temperature, _water.viscosity, _glycol.viscosity)


def thermal_conductivity(glycol, mass_fraction, temperature):
    """Thermal conductivity of the tub liquid (IAPWS SR6-08 / Melinder 2010).

    Parameters
    ----------
    glycol : str
        "none", "ethylene" or "propylene".
    mass_fraction : float or ndarray
        Glycol mass fraction [-].
    temperature : float or ndarray
        Liquid temperature [K].

    Returns
    -------
    float or ndarray
        Thermal conductivity [W/(m K)].
    """
    return _dispatch(glycol, mass_fraction, temperature, _water.thermal_conductivity, _glycol.thermal_conductivity)
