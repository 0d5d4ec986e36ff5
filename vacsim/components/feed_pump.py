"""Feed pump: pressure-rise curves, the operating point with the nozzle, and heat into the tub."""

from __future__ import annotations

import numpy as np
from scipy.optimize import brentq

from . import ejector


def linear_curve(flow, shutoff_pressure, free_flow):
    """Pressure rise of a pump with a straight curve (diaphragm pumps, near-linear; common practice).

    dp = dp0 (1 - Q / Q_free).

    Parameters
    ----------
    flow : float or ndarray
        Delivered flow [m^3/s].
    shutoff_pressure : float
        Pressure rise at zero flow [Pa].
    free_flow : float
        Flow at zero pressure rise [m^3/s].

    Returns
    -------
    float or ndarray
        Pressure rise [Pa], never negative.
    """
    return np.maximum(shutoff_pressure * (1.0 - np.asarray(flow) / free_flow), 0.0)


def quadratic_curve(flow, shutoff_pressure, free_flow):
    """Pressure rise of a centrifugal pump, dp = dp0 (1 - (Q/Q_free)^2).

    The parabolic head curve of the affinity-law description of centrifugal pumps
    (Karassik et al., Pump Handbook, 3rd ed. 2001, ch. 2).

    Parameters
    ----------
    flow : float or ndarray
        Delivered flow [m^3/s].
    shutoff_pressure : float
        Pressure rise at zero flow [Pa].
    free_flow : float
        Flow at zero pressure rise [m^3/s].

    Returns
    -------
    float or ndarray
        Pressure rise [Pa], never negative.
    """
    return np.maximum(shutoff_pressure * (1.0 - (np.asarray(flow) / free_flow) ** 2), 0.0)


def table_curve(flow, table_flow, table_pressure_rise):
    """Pressure rise interpolated linearly in a manufacturer's table (zero past its last point).

    Parameters
    ----------
    flow : float or ndarray
        Delivered flow [m^3/s].
    table_flow : ndarray
        Tabulated flows, increasing [m^3/s].
    table_pressure_rise : ndarray
        Tabulated pressure rises [Pa].

    Returns
    -------
    float or ndarray
        Pressure rise [Pa].
    """
    return np.interp(flow, table_flow, table_pressure_rise, right=0.0)


CURVES = {"linear": linear_curve, "quadratic": quadratic_curve, "table": table_curve}


def operating_point(pressure_rise, nozzle_diameter, density, inlet_gauge_offset, nozzle_loss=ejector.NOZZLE_LOSS):
    """Flow where the pump curve meets the nozzle law.

    Solves dp_pump(Q) + offset = (1 + K_n) rho Q^2 / (2 A_n^2) for Q, where offset = p_supply - p_s
    (the pump draws from the open tub at barometric pressure and the nozzle discharges into the
    suction chamber at p_s). Pipe losses are neglected.

    Parameters
    ----------
    pressure_rise : callable
        Q [m^3/s] -> pump pressure rise [Pa], non-increasing.
    nozzle_diameter : float
        [m].
    density : float
        Motive liquid density [kg/m^3].
    inlet_gauge_offset : float
        Barometric minus suction pressure [Pa] (>= 0 under vacuum).

    Returns
    -------
    tuple of float
        (flow [m^3/s], pump pressure rise [Pa]).
    """

    def mismatch(q):
        return ejector.nozzle_flow(nozzle_diameter, pressure_rise(q) + inlet_gauge_offset, density, nozzle_loss) - q

    q_hi = float(ejector.nozzle_flow(nozzle_diameter, pressure_rise(0.0) + inlet_gauge_offset, density, nozzle_loss))
    if q_hi <= 0.0:
        return 0.0, float(pressure_rise(0.0))
    q = brentq(mismatch, 0.0, q_hi * 1.000001 + 1e-15, xtol=1e-12, rtol=1e-10)
    return float(q), float(pressure_rise(q))


def hydraulic_power(flow, pressure_rise):
    """Hydraulic power the pump puts into the liquid, all of which ends as heat in the tub [W].

    P = Q dp (Karassik et al., Pump Handbook 2001, ch. 2: water horsepower).

    Parameters
    ----------
    flow : float or ndarray
        [m^3/s].
    pressure_rise : float or ndarray
        [Pa].

    Returns
    -------
    float or ndarray
        [W].
    """
    return np.asarray(flow) * pressure_rise
