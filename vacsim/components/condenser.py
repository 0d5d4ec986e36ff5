"""Condenser and cold trap: how much distillate vapor slips past them to the pump."""

from __future__ import annotations

import numpy as np

from .smooth import smooth_min


def slip_throughput(noncondensable_throughput, pressure, exit_vapor_pressure, boil_up_throughput):
    """Distillate vapor carried past a condenser by the non-condensable gas flowing through it.

    The gas leaving a condenser is saturated with vapor at its exit temperature, so each unit
    of inert gas carries p_s / (p - p_s) units of vapor (Colburn & Hougen 1934, Ind. Eng.
    Chem. 26, 1178): Q_c = Q_gas p_s / (p - p_s). The slip cannot exceed what the pot boils up;
    the smaller of the two is taken, smoothly for the stiff solver. At or below p_s the condenser
    cannot condense at all and all the boil-up slips. The cap is a smooth minimum (see smooth.py).

    Parameters
    ----------
    noncondensable_throughput : float or ndarray
        Air (leak, degassing) flowing through the condenser [Pa m^3/s].
    pressure : float or ndarray
        Apparatus pressure [Pa].
    exit_vapor_pressure : float or ndarray
        Distillate vapor pressure at the condenser (or trap) exit temperature [Pa].
    boil_up_throughput : float or ndarray
        Vapor the pot sends up [Pa m^3/s].

    Returns
    -------
    float or ndarray
        Vapor slipping to the pump [Pa m^3/s].
    """
    p = np.asarray(pressure, dtype=float)
    q_b = np.asarray(boil_up_throughput, dtype=float)
    margin = p - exit_vapor_pressure
    with np.errstate(divide="ignore", invalid="ignore"):
        q_c = np.where(margin > 0, noncondensable_throughput * exit_vapor_pressure / np.where(margin > 0, margin, 1.0), np.inf)
    return smooth_min(q_c, q_b)
