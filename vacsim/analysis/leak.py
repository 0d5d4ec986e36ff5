"""Rate-of-rise leak test: how much gas leaks into the isolated apparatus.

Close the valve to the pump and log the pressure. A real leak adds gas at a constant
throughput Q, so the pressure rises linearly, Q = V dp/dt (EN 13184:2001, Non-destructive
testing - Leak testing - Pressure change method; O'Hanlon, A User's Guide to Vacuum
Technology, 3rd ed., Wiley 2003, the rate-of-rise method). Liquid left in the apparatus
(solvent, water in the trap) evaporates until its vapor pressure is reached, and
degassing surfaces slow down: that part of the rise levels off. This module separates the
two by fitting

    p(t) = p0 + (Q/V) t + dp (1 - exp(-t/tau))

where the levelling term is a first-order approach to saturation (this module's choice of
shape, not taken from the standard, which only names the distinction). Time runs from the
first logged point. When the data cannot tell the levelling term from the line (the rise is
straight, or tau is comparable to the log length) the fit falls back to a straight line,
which is the conservative reading: all of the rise is charged to the leak.

Pure functions, SI in and out: Pa, s, m^3, Pa m^3/s (1 Pa m^3/s = 10 mbar L/s).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from scipy.optimize import least_squares

from .. import constants as c
from ..errors import InputError
from ..units import PRESSURE_UNITS, format_pressure, format_pressure_sig, format_throughput

#: default measurement uncertainty: sigma = max(SIGMA_FLOOR_PA, SIGMA_RELATIVE * p)
#: [common practice: a bench dial or Pirani-type gauge reads to about 1 mbar or 2 % of reading]
SIGMA_FLOOR_PA = 100.0
SIGMA_RELATIVE = 0.02
#: fewest points for the four-parameter levelling fit; below this only the line is fitted
MIN_POINTS_LEVELLING = 8
#: tau above this share of the log length cannot be told apart from the linear leak
TAU_MAX_SHARE_OF_LOG = 1.0 / 3.0
#: a levelling term smaller than this many standard errors is not resolved
SIGNIFICANCE = 2.0
#: normalised residual beyond which a point is reported as an outlier
OUTLIER_SIGMAS = 4.0
#: above this share of an atmosphere a viscous leak's flow, proportional to p_atm^2 - p^2
#: (Hagen-Poiseuille for a compressible gas), has fallen by 9 %: the rise is no longer linear
NEAR_ATMOSPHERE_SHARE = 0.3

PARAMETER_NAMES = ("p0", "slope", "dp", "tau")


def leak_from_rise(volume, dp, dt):
    """Leak throughput from a pressure rise in an isolated volume.

    Q = V dp/dt (EN 13184:2001, pressure-change method; O'Hanlon 2003, rate of rise).

    Parameters
    ----------
    volume : float or ndarray
        Isolated volume [m^3].
    dp : float or ndarray
        Pressure rise [Pa].
    dt : float or ndarray
        Time the rise took [s].

    Returns
    -------
    float or ndarray
        Leak throughput Q [Pa m^3/s].
    """
    volume, dp, dt = np.asarray(volume, float), np.asarray(dp, float), np.asarray(dt, float)
    return volume * dp / dt  # Eq. Q = V dp/dt (EN 13184)


def rate_of_rise_model(time, p0, slope, dp, tau):
    """Pressure in an isolated volume with a constant leak plus a levelling vapor source.

    p(t) = p0 + slope t + dp (1 - exp(-t/tau)); slope = Q/V (EN 13184 pressure-change method
    for the linear part; first-order levelling term as described in the module docstring).

    Parameters
    ----------
    time : float or ndarray
        Time since the start of the test [s].
    p0 : float or ndarray
        Pressure at t = 0 [Pa].
    slope : float or ndarray
        Linear rise from the leak, Q/V [Pa/s].
    dp : float or ndarray
        Final rise of the levelling part [Pa].
    tau : float or ndarray
        Time constant of the levelling part [s].

    Returns
    -------
    float or ndarray
        Pressure [Pa].
    """
    t = np.asarray(time, float)
    return p0 + slope * t + dp * -np.expm1(-t / tau)  # Eq. p0 + (Q/V) t + dp (1 - exp(-t/tau))


def default_sigma(pressure):
    """Default reading uncertainty, max(1 mbar, 2 % of reading) [Pa] (common practice)."""
    p = np.asarray(pressure, float)
    return np.maximum(SIGMA_FLOOR_PA, SIGMA_RELATIVE * np.abs(p))


@dataclass(frozen=True, eq=False)
class LeakTestResult:
    """Outcome of a rate-of-rise fit. Every figure in SI; NaN where not defined.

    Attributes
    ----------
    leak_rate_pa_m3_s : float
        Leak throughput Q = V slope [Pa m^3/s].
    leak_rate_stderr_pa_m3_s : float
        Its standard error [Pa m^3/s] (see `stderr_basis`).
    vapor_rise_pa : float
        Final rise of the levelling part dp [Pa]; 0 for the linear model.
    vapor_rise_stderr_pa : float
        Its standard error [Pa]; NaN for the linear model.
    time_constant_s : float
        Time constant tau of the levelling part [s]; NaN for the linear model.
    time_constant_stderr_s : float
        Its standard error [s]; NaN for the linear model.
    p0_pa : float
        Fitted pressure at the first logged point [Pa].
    slope_pa_s : float
        Fitted linear rise Q/V [Pa/s].
    vapor_share : float
        Share of the rise observed over the log that is the levelling part [-].
    residual_rms_pa : float
        Root-mean-square of the fit residuals [Pa].
    reduced_chi2 : float
        Weighted sum of squared residuals per degree of freedom [-].
    stderr_basis : str
        How the standard errors were obtained.
    model : str
        "levelling" (line plus levelling term) or "linear".
    volume_m3 : float
        The isolated volume used [m^3].
    time_origin_s : float
        Log time of the first point used, where the fit's t = 0 lies [s].
    duration_s : float
        Time span of the points used [s].
    n_points : int
        Number of points used in the fit.
    warnings : list of dict
        Each {"code", "message", "time_s"} (time_s None when not tied to a point).
    """

    leak_rate_pa_m3_s: float
    leak_rate_stderr_pa_m3_s: float
    vapor_rise_pa: float
    vapor_rise_stderr_pa: float
    time_constant_s: float
    time_constant_stderr_s: float
    p0_pa: float
    slope_pa_s: float
    vapor_share: float
    residual_rms_pa: float
    reduced_chi2: float
    stderr_basis: str
    model: str
    volume_m3: float
    time_origin_s: float
    duration_s: float
    n_points: int
    warnings: list[dict] = field(default_factory=list)

    def pressure(self, time_s):
        """Fitted pressure [Pa] at log times `time_s` [s]."""
        t = np.asarray(time_s, float) - self.time_origin_s
        if self.model == "linear":
            return self.p0_pa + self.slope_pa_s * t
        return rate_of_rise_model(t, self.p0_pa, self.slope_pa_s, self.vapor_rise_pa, self.time_constant_s)

    def leak_part(self, time_s):
        """The leak's linear share of the fitted pressure, p0 + slope t [Pa], at log times [s]."""
        t = np.asarray(time_s, float) - self.time_origin_s
        return self.p0_pa + self.slope_pa_s * t


# ---- fitting internals ---------------------------------------------------------------


def _covariance(jac: np.ndarray, chi2: float, dof: int) -> tuple[np.ndarray | None, float, str]:
    """inv(J^T J) from the SVD of the weighted Jacobian, scaled by chi2/dof when that exceeds 1.

    Returns (covariance or None if singular, reduced chi-square, basis text).
    """
    _, s, vt = np.linalg.svd(jac, full_matrices=False)
    threshold = np.finfo(float).eps * max(jac.shape) * s[0]
    red = chi2 / dof if dof > 0 else math.nan
    if s[-1] <= threshold * 1e4:
        return None, red, "not available (parameters not identifiable)"
    cov = (vt.T / s**2) @ vt
    if dof > 0 and red > 1.0:
        cov = cov * red
        basis = f"inv(J^T J) scaled by the reduced chi-square {red:.3g} (scatter exceeds the stated sigma)"
    else:
        basis = f"inv(J^T J) from the stated sigma (reduced chi-square {red:.3g} <= 1, not scaled)"
    return cov, red, basis


def _linear_fit(t, p, sigma):
    """Weighted straight line; returns (p0, slope, cov, chi2, reduced chi2, basis, model values)."""
    jac = np.column_stack([np.ones_like(t), t]) / sigma[:, None]
    coef, *_ = np.linalg.lstsq(jac, p / sigma, rcond=None)
    model = coef[0] + coef[1] * t
    chi2 = float(np.sum(((model - p) / sigma) ** 2))
    cov, red, basis = _covariance(jac, chi2, t.size - 2)
    return float(coef[0]), float(coef[1]), cov, chi2, red, basis, model


def _levelling_jacobian(x, t, sigma):
    p0, slope, dp, tau = x
    e = np.exp(-t / tau)
    cols = [np.ones_like(t), t, -np.expm1(-t / tau), -dp * t / tau**2 * e]
    return np.column_stack(cols) / sigma[:, None]


def _levelling_fit(t, p, sigma):
    """Least-squares fit of the four-parameter model from several robust starting points."""
    duration = t[-1]
    dt_min = float(np.min(np.diff(t)))
    # linear fit on the last third: the leak's slope once the vapor has levelled
    tail = t >= t[-1] - duration / 3.0
    if np.count_nonzero(tail) < 3:
        tail = np.zeros_like(t, bool)
        tail[-3:] = True
    a_tail, b_tail = _line(t[tail], p[tail])
    p0_start = float(p[0])
    rise = max(float(p[-1] - p[0]), SIGMA_FLOOR_PA)
    dp_start = float(b_tail - p0_start)
    if dp_start <= 0:
        dp_start = 0.05 * rise
    excess = p - p0_start - a_tail * t
    reached = np.nonzero(excess >= (1 - math.exp(-1)) * dp_start)[0]
    tau_guess = float(t[reached[0]]) if reached.size else duration / 5.0
    tau_lo, tau_hi = dt_min / 100.0, 100.0 * duration
    starts = {min(max(tau_guess, dt_min), duration / 3.0), duration / 20.0, duration / 8.0, duration / 3.0}

    def residuals(x):
        return (rate_of_rise_model(t, *x) - p) / sigma

    best = None
    for tau0 in sorted(starts):
        x0 = np.array([p0_start, a_tail, dp_start, max(tau0, 2 * tau_lo)])
        sol = least_squares(
            residuals,
            x0,
            jac=lambda x: _levelling_jacobian(x, t, sigma),
            bounds=([-np.inf, -np.inf, 0.0, tau_lo], [np.inf, np.inf, np.inf, tau_hi]),
            x_scale="jac",
            method="trf",
        )
        if best is None or sol.cost < best.cost:
            best = sol
    return best


def _line(t, p):
    """Unweighted straight line through (t, p): (slope, intercept)."""
    slope, intercept = np.polyfit(t, p, 1)
    return float(slope), float(intercept)


def _warn(warnings: list, code: str, message: str, time_s: float | None = None) -> None:
    warnings.append({"code": code, "message": message, "time_s": None if time_s is None else float(time_s)})


def fit_rate_of_rise(time_s, pressure_pa, volume, *, sigma_pa=None, units: str = "mbar") -> LeakTestResult:
    """Fit a rate-of-rise log: the linear leak plus a levelling vapor/outgassing part.

    Model p(t) = p0 + (Q/V) t + dp (1 - exp(-t/tau)), Q = V dp/dt for the linear part
    (EN 13184:2001 pressure-change method; O'Hanlon 2003). Weighted least squares
    (scipy.optimize.least_squares, trust-region reflective, bounds dp >= 0, tau > 0) from
    starting values taken from a straight line through the last third of the log. Standard
    errors from the Jacobian: covariance = inv(J^T J), scaled by the reduced chi-square when it
    exceeds 1 (the scatter is larger than the stated sigma); `stderr_basis` says which.
    When the levelling term is not identifiable (not significant, tau >= log length / 3, tau
    shorter than the sampling step, singular covariance, or too few points) a straight line
    is fitted instead and a "linear_fallback" warning says why.

    Parameters
    ----------
    time_s : ndarray
        Log times [s], increasing. The fit's t = 0 is the first point with a pressure.
    pressure_pa : ndarray
        Absolute pressure [Pa]; NaN entries (blank cells) are dropped.
    volume : float
        Isolated volume: apparatus, hose and trap [m^3].
    sigma_pa : float or ndarray, optional
        Reading uncertainty [Pa]; default max(1 mbar, 2 % of reading).
    units : str
        Pressure display unit of the warning texts (mbar, torr, pa, inhg, psi): pressures in it,
        throughputs in it times L/s, as the table printed beside them. The numbers are SI.

    Returns
    -------
    LeakTestResult
    """
    t_all = np.asarray(time_s, float)
    p_all = np.asarray(pressure_pa, float)
    if t_all.shape != p_all.shape or t_all.ndim != 1:
        raise InputError("rate-of-rise fit: time and pressure must be 1-D arrays of one length")
    if not (np.isfinite(volume) and volume > 0):
        raise InputError(f"rate-of-rise fit: the volume must be positive, got {volume!r} m^3")
    if units.lower() not in PRESSURE_UNITS:
        raise InputError(f"units: unknown pressure display unit {units!r}; expected one of {', '.join(PRESSURE_UNITS)}")
    units = units.lower()
    warnings: list[dict] = []
    keep = np.isfinite(p_all) & np.isfinite(t_all)
    if sigma_pa is not None:
        sigma_all = np.broadcast_to(np.asarray(sigma_pa, float), p_all.shape)
        keep &= np.isfinite(sigma_all) & (sigma_all > 0)
    if np.count_nonzero(~keep):
        _warn(warnings, "blank_pressure", f"{np.count_nonzero(~keep)} row(s) without a pressure were skipped")
    t_log, p = t_all[keep], p_all[keep]
    if t_log.size < 3:
        raise InputError(f"rate-of-rise fit: {t_log.size} pressure reading(s); at least 3 are needed")
    if np.any(np.diff(t_log) <= 0):
        raise InputError("rate-of-rise fit: times must increase")
    sigma = default_sigma(p) if sigma_pa is None else np.asarray(sigma_all, float)[keep]
    origin = float(t_log[0])
    t = t_log - origin
    duration = float(t[-1])
    n = t.size

    lin_p0, lin_slope, lin_cov, lin_chi2, lin_red, lin_basis, lin_model = _linear_fit(t, p, sigma)

    reason = None
    if n < MIN_POINTS_LEVELLING:
        reason = f"only {n} points (the levelling fit needs {MIN_POINTS_LEVELLING})"
    else:
        sol = _levelling_fit(t, p, sigma)
        x = sol.x
        chi2 = 2.0 * float(sol.cost)
        cov, red, basis = _covariance(_levelling_jacobian(x, t, sigma), chi2, n - 4)
        se = np.sqrt(np.diag(cov)) if cov is not None else np.full(4, np.nan)
        p0, slope, dp, tau = (float(v) for v in x)
        dt_min = float(np.min(np.diff(t)))
        if cov is None and dp <= 1e-9 * max(float(np.ptp(p)), SIGMA_FLOOR_PA):
            reason = "no levelling part (fitted to zero): the rise is linear"
        elif cov is None:
            reason = "the levelling term is not identifiable (singular covariance)"
        elif not dp > SIGNIFICANCE * se[2]:
            reason = "no significant levelling part: the rise is linear"
        elif tau >= TAU_MAX_SHARE_OF_LOG * duration:
            reason = (
                f"the levelling time constant ({tau / 60:.3g} min) is comparable to the log length "
                f"({duration / 60:.3g} min): log longer to separate vapor from leak"
            )
        elif tau < dt_min:
            reason = f"the levelling ({tau:.3g} s) is faster than the sampling step ({dt_min:.3g} s)"
        elif lin_chi2 - chi2 < 4.0:  # two extra parameters must buy more than 2 per parameter (AIC)
            reason = "the levelling term does not improve the fit enough over a straight line (AIC)"

    if reason is None:
        model = "levelling"
        fitted = rate_of_rise_model(t, p0, slope, dp, tau)
        se_slope, se_dp, se_tau = float(se[1]), float(se[2]), float(se[3])
        levelled = dp * -math.expm1(-duration / tau)
    else:
        _warn(warnings, "linear_fallback", f"straight-line fit used: {reason}")
        model = "linear"
        p0, slope, dp, tau = lin_p0, lin_slope, 0.0, math.nan
        fitted = lin_model
        chi2, red, basis = lin_chi2, lin_red, lin_basis
        se_slope = float(np.sqrt(lin_cov[1, 1])) if lin_cov is not None else math.nan
        se_dp = se_tau = math.nan
        levelled = 0.0

    total = slope * duration + levelled
    vapor_share = levelled / total if total > 0 else math.nan
    resid = fitted - p
    rms = float(np.sqrt(np.mean(resid**2)))

    q, q_se = volume * slope, volume * se_slope
    if slope < 0:
        _warn(
            warnings,
            "falling_pressure",
            "the fitted leak slope is negative: the pump may not be isolated, or the gauge drifts",
        )
    elif np.isfinite(se_slope) and slope < SIGNIFICANCE * se_slope:
        _warn(
            warnings,
            "leak_not_resolved",
            f"the leak rise is within {SIGNIFICANCE:g} standard errors of zero: "
            f"the leak is below about {format_throughput((slope + SIGNIFICANCE * se_slope) * volume, units)}",
        )
    scale = math.sqrt(max(red, 1.0)) if np.isfinite(red) else 1.0
    z = np.abs(resid) / (sigma * scale)
    outliers = np.nonzero(z > OUTLIER_SIGMAS)[0]
    for i in outliers[:5]:
        _warn(
            warnings,
            "outlier",
            f"reading {format_pressure_sig(p[i], units, 4)} is {z[i]:.1f} sigma off the fitted curve",
            t_log[i],
        )
    if outliers.size > 5:
        _warn(warnings, "outlier", f"{outliers.size - 5} further outlier(s) not listed")
    if np.max(p) > NEAR_ATMOSPHERE_SHARE * c.STANDARD_ATMOSPHERE:
        i = int(np.argmax(p > NEAR_ATMOSPHERE_SHARE * c.STANDARD_ATMOSPHERE))
        _warn(
            warnings,
            "near_atmosphere",
            f"the pressure exceeds {format_pressure(NEAR_ATMOSPHERE_SHARE * c.STANDARD_ATMOSPHERE, units)} "
            f"({NEAR_ATMOSPHERE_SHARE:g} atm): the leak flow falls as the inside "
            "approaches the outside pressure, so the rise is no longer linear; test at working vacuum",
            t_log[i],
        )

    return LeakTestResult(
        leak_rate_pa_m3_s=float(q),
        leak_rate_stderr_pa_m3_s=float(q_se),
        vapor_rise_pa=float(dp),
        vapor_rise_stderr_pa=float(se_dp),
        time_constant_s=float(tau),
        time_constant_stderr_s=float(se_tau),
        p0_pa=float(p0),
        slope_pa_s=float(slope),
        vapor_share=float(vapor_share),
        residual_rms_pa=rms,
        reduced_chi2=float(red),
        stderr_basis=basis,
        model=model,
        volume_m3=float(volume),
        time_origin_s=origin,
        duration_s=duration,
        n_points=int(n),
        warnings=warnings,
    )
