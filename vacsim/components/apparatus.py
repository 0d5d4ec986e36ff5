"""The evacuated apparatus: one lumped, isothermal gas volume with its gas loads."""

from __future__ import annotations

import numpy as np


def pressure_rate(volume, gas_load, effective_speed, pressure, floor_pressure):
    """Rate of change of the apparatus pressure.

    Lumped gas balance (O'Hanlon 2003, eq. 10.1; Chambers, Modern Vacuum Physics 2005, sec. 4.8):
    V dp/dt = Q - S_eff (p - p_floor), where the pump removes gas saturated with its working
    fluid's vapor, so the net removal vanishes at the fluid's vapor pressure (the analogous
    liquid-ring relation: Ryans & Roper, Process Vacuum System Design and Operation, 1986).

    Parameters
    ----------
    volume : float
        Apparatus + hose + trap volume [m^3].
    gas_load : float or ndarray
        Total gas throughput into the volume: leak, degassing, vapor slip [Pa m^3/s].
    effective_speed : float or ndarray
        Pump speed at the apparatus, hose included [m^3/s].
    pressure : float or ndarray
        Apparatus pressure [Pa].
    floor_pressure : float or ndarray
        Pressure at which the pump's net removal is zero [Pa].

    Returns
    -------
    float or ndarray
        dp/dt [Pa/s].
    """
    return (gas_load - effective_speed * (np.asarray(pressure) - floor_pressure)) / volume


def pumpdown_time(volume, speed, initial_pressure, pressure, ultimate_pressure=0.0):
    """Time for a constant-speed pump to bring a volume from one pressure to another.

    Closed form of V dp/dt = -S (p - p_u): t = (V/S) ln((p0 - p_u)/(p - p_u))
    (Chambers 2005, sec. 4.8; O'Hanlon 2003, eq. 10.3).

    Parameters
    ----------
    volume : float
        Volume [m^3].
    speed : float
        Constant pump speed [m^3/s].
    initial_pressure, pressure, ultimate_pressure : float or ndarray
        Start, end and ultimate pressure [Pa].

    Returns
    -------
    float or ndarray
        Time [s].
    """
    return volume / speed * np.log((initial_pressure - ultimate_pressure) / (np.asarray(pressure) - ultimate_pressure))
