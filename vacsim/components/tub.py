"""The tub: heat from the room, ice pieces melting into the working fluid.

The tub liquid is taken as well mixed (the ejector's discharge stirs it). Heat balance terms
are in W; the rig model adds them up.
"""

from __future__ import annotations

import numpy as np

# Overall wall coefficient of a thin plastic or glass tub, water inside, still room air outside:
# natural convection in air 2-25 W/(m^2 K) (Incropera et al., Fundamentals of Heat and Mass
# Transfer, 6th ed. 2007, Table 1.1) plus about 5 W/(m^2 K) of radiation; the water-side
# resistance is small. Estimate.
DEFAULT_WALL_U = 10.0  # W/(m^2 K)
# Stirred water over melting ice: forced convection of liquids spans 50-20000 W/(m^2 K)
# (Incropera Table 1.1); a gently circulated tub sits near the low end. Estimate.
DEFAULT_ICE_HEAT_TRANSFER = 250.0  # W/(m^2 K)
DEFAULT_ICE_PIECE_SIZE = 0.025  # m, a common ice cube edge (common practice)


def wall_ua(wall_area, wall_u=DEFAULT_WALL_U):
    """Thermal conductance tub -> room from wetted wall area and an overall coefficient.

    UA = U A (Incropera et al. 2007, eq. 3.19).

    Parameters
    ----------
    wall_area : float
        Wall and open-surface area in contact with the room [m^2].
    wall_u : float
        Overall heat-transfer coefficient [W/(m^2 K)].

    Returns
    -------
    float
        UA [W/K].
    """
    return wall_area * wall_u


def room_heat_flow(ua, ambient_temperature, tub_temperature):
    """Heat flowing from the room into the tub, UA (T_amb - T) [W] (Newton's law of cooling).

    Parameters
    ----------
    ua : float
        [W/K].
    ambient_temperature, tub_temperature : float or ndarray
        [K].

    Returns
    -------
    float or ndarray
        [W], negative when the tub is warmer than the room.
    """
    return ua * (np.asarray(ambient_temperature) - tub_temperature)


def ice_piece_count(ice_mass, piece_size, ice_density):
    """Number of cube-shaped pieces of edge `piece_size` in a mass of ice.

    Parameters
    ----------
    ice_mass : float
        [kg].
    piece_size : float
        Cube edge [m].
    ice_density : float
        [kg/m^3].

    Returns
    -------
    float
        Piece count [-] (not rounded: a mean over a bag of pieces).
    """
    return ice_mass / (ice_density * piece_size**3)


def ice_surface_area(ice_mass, piece_count, ice_density):
    """Surface area of `piece_count` equal cubes holding `ice_mass` together.

    Each piece shrinks uniformly as it melts: A = 6 n^(1/3) (m / rho)^(2/3).

    Parameters
    ----------
    ice_mass : float or ndarray
        [kg], clipped at zero.
    piece_count : float
        [-].
    ice_density : float
        [kg/m^3].

    Returns
    -------
    float or ndarray
        [m^2].
    """
    m = np.maximum(np.asarray(ice_mass, dtype=float), 0.0)
    return 6.0 * np.cbrt(piece_count) * np.cbrt(m / ice_density) ** 2


def melt_heat_flow(heat_transfer_coefficient, area, tub_temperature, freezing_temperature):
    """Heat the liquid gives to the ice, h A (T - T_f), zero when the liquid is at or below T_f.

    Melting is controlled by heat transfer to the ice surface, which sits at the solution's
    freezing point (Stefan-type melting with a convective boundary; Incropera 2007, sec. 10.1).
    Freezing of the tub is not modelled.

    Parameters
    ----------
    heat_transfer_coefficient : float
        [W/(m^2 K)].
    area : float or ndarray
        Ice surface area [m^2].
    tub_temperature, freezing_temperature : float or ndarray
        [K].

    Returns
    -------
    float or ndarray
        [W], >= 0.
    """
    return heat_transfer_coefficient * area * np.maximum(np.asarray(tub_temperature) - freezing_temperature, 0.0)
