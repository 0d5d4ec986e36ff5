"""Liquid-jet gas pump (ejector, aspirator): nozzle law, shut-off pressure, suction capacity.

Sources: Cunningham, "Gas compression with the liquid jet pump", J. Fluids Eng. 96(3), 203-215
(1974); Cunningham & Dopkin, J. Fluids Eng. 96(3), 216-226 (1974); "Jet Pumps", ch. 4 of
Karassik et al., Pump Handbook, 3rd ed. (2001). Symbols: p_i nozzle inlet (absolute), p_s
suction, p_d discharge, b = A_nozzle/A_throat, a = A_throat/A_diffuser-exit.
"""

from __future__ import annotations

import numpy as np

# Defaults for a well-formed nozzle and a short mixing throat (Cunningham 1974; Pump Handbook ch. 4)
NOZZLE_LOSS = 0.05  # K_n, C_d ~ 0.975
THROAT_LOSS = 0.10  # K_th
DIFFUSER_LOSS = 0.10  # K_di
DIFFUSER_AREA_RATIO = 0.20  # a
# A measured point must lie this far above the water's vapor pressure for S_air p/(p - p_v) to be
# well conditioned (at 1.2 x p_v the correction is already a factor 6).
MEASURED_MARGIN = 1.2
CUTOFF_WIDTH = 500.0  # Pa, delta: how sharply capacity collapses near shut-off (estimate)


def nozzle_area(nozzle_diameter):
    """Flow area of a round nozzle [m^2] from its diameter [m]."""
    return np.pi / 4.0 * np.asarray(nozzle_diameter) ** 2


def nozzle_flow(nozzle_diameter, pressure_drop, density, nozzle_loss=NOZZLE_LOSS):
    """Motive liquid flow through the nozzle.

    Q_j = A_n sqrt(2 (p_i - p_s) / (rho (1 + K_n)))  (Cunningham 1974, eq. 1).

    Parameters
    ----------
    nozzle_diameter : float or ndarray
        Nozzle bore [m].
    pressure_drop : float or ndarray
        p_i - p_s across the nozzle [Pa]; negative values give zero flow.
    density : float or ndarray
        Motive liquid density [kg/m^3].
    nozzle_loss : float
        Nozzle loss coefficient K_n [-].

    Returns
    -------
    float or ndarray
        Motive flow [m^3/s].
    """
    dp = np.maximum(np.asarray(pressure_drop, dtype=float), 0.0)
    return nozzle_area(nozzle_diameter) * np.sqrt(2.0 * dp / (density * (1.0 + nozzle_loss)))  # Eq. 1


def momentum_factor(area_ratio, throat_loss=THROAT_LOSS, diffuser_loss=DIFFUSER_LOSS, diffuser_area_ratio=DIFFUSER_AREA_RATIO):
    """F = 2b - b^2 (1 + K_th + K_di + a^2): the pressure gain per unit nozzle head at zero gas flow.

    Momentum balance of the mixing throat and diffuser (Cunningham 1974, eq. 9 at zero
    secondary flow).

    Parameters
    ----------
    area_ratio : float or ndarray
        b = nozzle area / throat area [-].
    throat_loss, diffuser_loss : float
        Loss coefficients K_th, K_di [-].
    diffuser_area_ratio : float
        a = throat area / diffuser exit area [-].

    Returns
    -------
    float or ndarray
        F [-].
    """
    b = np.asarray(area_ratio, dtype=float)
    return 2.0 * b - b**2 * (1.0 + throat_loss + diffuser_loss + diffuser_area_ratio**2)


def shutoff_pressure(
    inlet_pressure,
    discharge_pressure,
    area_ratio,
    nozzle_loss=NOZZLE_LOSS,
    throat_loss=THROAT_LOSS,
    diffuser_loss=DIFFUSER_LOSS,
    diffuser_area_ratio=DIFFUSER_AREA_RATIO,
):
    """Suction pressure at which the jet stops drawing gas (zero secondary flow).

    p_shut = p_d - Z F with Z = (p_i - p_shut)/(1 + K_n); solved for p_shut explicitly:
    p_shut = [p_d (1 + K_n) - p_i F] / (1 + K_n - F)  (Cunningham 1974, eq. 9 rearranged).
    Negative results mean the jet could compress from below zero: the floor is then set by the
    fluid's vapor pressure, not by the jet. They are returned as computed.

    Parameters
    ----------
    inlet_pressure : float or ndarray
        Absolute pressure at the nozzle inlet [Pa].
    discharge_pressure : float or ndarray
        Absolute pressure at the diffuser exit (the tub) [Pa].
    area_ratio : float or ndarray
        b = nozzle area / throat area [-].

    Returns
    -------
    float or ndarray
        Shut-off suction pressure [Pa].
    """
    f = momentum_factor(area_ratio, throat_loss, diffuser_loss, diffuser_area_ratio)
    return (discharge_pressure * (1.0 + nozzle_loss) - np.asarray(inlet_pressure) * f) / (1.0 + nozzle_loss - f)


def working_inlet_pressure(
    target_pressure,
    discharge_pressure,
    area_ratio,
    nozzle_loss=NOZZLE_LOSS,
    throat_loss=THROAT_LOSS,
    diffuser_loss=DIFFUSER_LOSS,
    diffuser_area_ratio=DIFFUSER_AREA_RATIO,
):
    """Nozzle inlet pressure at which the shut-off pressure equals a target (the working head).

    Inverse of :func:`shutoff_pressure` (Cunningham 1974, eq. 9):
    p_i = [p_d (1 + K_n) - p_t (1 + K_n - F)] / F.

    Parameters
    ----------
    target_pressure : float or ndarray
        Suction pressure to be reached [Pa].
    discharge_pressure : float
        Absolute discharge pressure [Pa].
    area_ratio : float
        b [-].

    Returns
    -------
    float or ndarray
        Absolute nozzle inlet pressure [Pa].
    """
    f = momentum_factor(area_ratio, throat_loss, diffuser_loss, diffuser_area_ratio)
    return (discharge_pressure * (1.0 + nozzle_loss) - np.asarray(target_pressure) * (1.0 + nozzle_loss - f)) / f


def cutoff_factor(suction_pressure, shutoff, width=CUTOFF_WIDTH):
    """f(p) = 1 - exp(-(p - p_shut)/delta) above shut-off, zero below (DESIGN capacity model).

    Parameters
    ----------
    suction_pressure : float or ndarray
        Suction pressure [Pa].
    shutoff : float
        Shut-off pressure [Pa]; a negative value (the jet could compress from below zero) leaves
        f = 1 at every real pressure, so the fluid's vapor pressure, not the jet, sets the floor.
    width : float
        delta [Pa].

    Returns
    -------
    float or ndarray
        f [-], 0..1.
    """
    excess = np.asarray(suction_pressure, dtype=float) - float(shutoff)
    return np.where(excess > 0.0, -np.expm1(-np.maximum(excess, 0.0) / width), 0.0)


def total_speed(motive_flow, entrainment_ratio, suction_pressure, shutoff, width=CUTOFF_WIDTH):
    """Total gas (air + vapor) volume flow drawn at suction: S_tot = kappa Q_j f(p).

    kappa, the entrainment ratio, is the gas volume drawn per volume of motive liquid
    (Cunningham & Dopkin 1974 measured 0.5-1.5 for jet pumps; a calibration constant).

    Parameters
    ----------
    motive_flow : float or ndarray
        Q_j [m^3/s].
    entrainment_ratio : float
        kappa [-].
    suction_pressure : float or ndarray
        [Pa].
    shutoff : float
        Shut-off pressure [Pa].

    Returns
    -------
    float or ndarray
        S_tot [m^3/s].
    """
    return entrainment_ratio * np.asarray(motive_flow) * cutoff_factor(suction_pressure, shutoff, width)


def total_speed_from_measured(suction_pressure, curve_pressure, curve_dry_air_speed, measured_vapor_pressure):
    """Total gas speed from a measured dry-air speed curve taken at a known water temperature.

    A measured curve gives net dry-air speed S_air(p); the jet drew vapor-saturated gas, so
    S_tot = S_air p / (p - p_v(measured_at)) (same saturated-gas relation as the gas balance;
    Ryans & Roper 1986). Interpolated linearly in log pressure; held constant beyond the ends.

    Parameters
    ----------
    suction_pressure : float or ndarray
        [Pa].
    curve_pressure : ndarray
        Measured points' pressures, increasing [Pa], all above `measured_vapor_pressure`.
    curve_dry_air_speed : ndarray
        Measured net dry-air speeds [m^3/s].
    measured_vapor_pressure : float
        Vapor pressure of the water the curve was measured with [Pa].

    Returns
    -------
    float or ndarray
        S_tot [m^3/s].
    """
    cp = np.asarray(curve_pressure, dtype=float)
    s_tot_points = np.asarray(curve_dry_air_speed, dtype=float) * cp / (cp - measured_vapor_pressure)
    return np.interp(np.log(np.maximum(suction_pressure, 1e-3)), np.log(cp), s_tot_points)


def efficiency(suction_pressure, speed, discharge_pressure, motive_flow, inlet_pressure):
    """Isothermal compression efficiency of the jet pump.

    eta = p_s S ln(p_d/p_s) / (Q_j (p_i - p_d))  (Cunningham 1974, eq. 14).

    Parameters
    ----------
    suction_pressure, discharge_pressure, inlet_pressure : float or ndarray
        [Pa].
    speed, motive_flow : float or ndarray
        Gas speed at suction and motive flow [m^3/s].

    Returns
    -------
    float or ndarray
        eta [-].
    """
    ps = np.asarray(suction_pressure, dtype=float)
    return ps * speed * np.log(discharge_pressure / ps) / (motive_flow * (inlet_pressure - discharge_pressure))
