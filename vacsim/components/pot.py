"""The distillation pot: vapor boil-up and release of dissolved air under vacuum."""

from __future__ import annotations

import numpy as np

from ..constants import GAS_CONSTANT

BOILING_ONSET_WIDTH = 0.03  # fraction of p_sat over which boiling sets in (smooth for the solver)


def boil_up_throughput(mass_rate, molar_mass, gas_temperature):
    """Vapor sent up by the pot as a gas throughput, Q = (mdot / M) R T [Pa m^3/s] (ideal gas).

    Parameters
    ----------
    mass_rate : float or ndarray
        Boil-up [kg/s].
    molar_mass : float
        [kg/mol].
    gas_temperature : float
        Temperature at which throughput is counted (the apparatus gas) [K].

    Returns
    -------
    float or ndarray
        [Pa m^3/s].
    """
    return np.asarray(mass_rate) / molar_mass * GAS_CONSTANT * gas_temperature


def boiling_fraction(pressure, pot_vapor_pressure, width=BOILING_ONSET_WIDTH):
    """0 while the pot is below its boiling pressure, 1 once the pressure is below p_sat(T_pot).

    A liquid at fixed temperature boils when the pressure above it falls below its vapor
    pressure; the step is smoothed (smoothstep over `width` x p_sat) for the stiff solver.

    Parameters
    ----------
    pressure : float or ndarray
        Apparatus pressure [Pa].
    pot_vapor_pressure : float
        Pot liquid vapor pressure at the pot temperature [Pa].
    width : float
        Relative width of the onset [-].

    Returns
    -------
    float or ndarray
        [-], 0..1.
    """
    x = np.clip((pot_vapor_pressure - np.asarray(pressure, dtype=float)) / (width * pot_vapor_pressure), 0.0, 1.0)
    return x * x * (3.0 - 2.0 * x)


DRY_WIDTH = 0.01  # share of the charge over which boiling dies away as the pot runs dry


def remaining_fraction(boiled, charge, width=DRY_WIDTH):
    """1 while the pot holds liquid, falling smoothly to 0 as the boiled mass reaches the charge.

    Parameters
    ----------
    boiled : float or ndarray
        Mass boiled off so far [kg].
    charge : float
        Mass charged [kg].
    width : float
        Relative width of the run-out [-].

    Returns
    -------
    float or ndarray
        [-], 0..1.
    """
    x = np.clip((charge - np.asarray(boiled, dtype=float)) / (width * charge), 0.0, 1.0)
    return x * x * (3.0 - 2.0 * x)


def degassing_throughput(rate_constant, dissolved_amount, equilibrium_amount, gas_temperature):
    """Air released by a liquid holding more than its equilibrium amount.

    First-order mass transfer, dn/dt = -k_La (n - n_eq) (Lewis & Whitman two-film model, as in
    Sander 2023 for the equilibrium), counted as gas throughput n R T.

    Parameters
    ----------
    rate_constant : float
        k_La [1/s].
    dissolved_amount, equilibrium_amount : float or ndarray
        Air dissolved now, and at equilibrium with the apparatus pressure [mol].
    gas_temperature : float
        [K].

    Returns
    -------
    float or ndarray
        [Pa m^3/s], negative when air dissolves back.
    """
    return rate_constant * (np.asarray(dissolved_amount) - equilibrium_amount) * GAS_CONSTANT * gas_temperature
