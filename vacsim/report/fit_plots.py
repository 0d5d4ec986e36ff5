"""Figure of a calibration fit (fit.png): fitted curves over the logged readings, and the residuals.

Matplotlib is imported inside the function only, so the CLI starts fast.
"""

from __future__ import annotations

import numpy as np

from .. import constants as c

READING_COLOR = "0.30"
FIT_COLOR = "#1f4e79"
START_COLOR = "0.55"
#: residual markers per observable
RESIDUAL_STYLE = {
    "pressure_pa": ("o", "#1f4e79", "pressure"),
    "boiling_temperature_k": ("s", "#2e8b57", "head temperature"),
    "tub_temperature_k": ("^", "#c0504d", "tub temperature"),
}


def fit_figure(fit, unit: str = "mbar", title: str = "", events=()):
    """The fit's figure: one panel per logged quantity (readings, fitted run, start run), then
    the weighted residuals (model - reading) / sigma of all of them.

    Parameters
    ----------
    fit : FitResult
        The fit (vacsim.analysis.fit.fit_scenario).
    unit : str
        Display unit for pressures (a key of vacsim.units.PRESSURE_UNITS).
    title : str
        Figure title.
    events : sequence of (float, str)
        Log events (time [s], text), marked with thin vertical lines.

    Returns
    -------
    matplotlib.figure.Figure
    """
    from matplotlib.figure import Figure

    from ..units import PRESSURE_LABELS, pressure_in

    obs = fit.observations
    panels = [name for name in ("pressure_pa", "boiling_temperature_k", "tub_temperature_k") if name in fit.residuals]
    n = len(panels) + 1
    fig = Figure(figsize=(8.0, 2.3 * n + 0.6), layout="constrained")
    axes = fig.subplots(n, 1, sharex=True, gridspec_kw={"height_ratios": [2.0] * (n - 1) + [1.4]})
    axes = np.atleast_1d(axes)
    t_obs = obs.time_s / 60.0
    for ax, name in zip(axes, panels):
        ok = np.isfinite(getattr(obs, name))
        fitted = getattr(fit.fitted, name)
        initial = getattr(fit.initial, name)
        if name == "pressure_pa":
            label = PRESSURE_LABELS[unit]
            ax.plot(t_obs[ok], pressure_in(obs.pressure_pa[ok], unit), "o", ms=3, color=READING_COLOR, label="log readings")
            ax.plot(fit.initial.time_s / 60.0, pressure_in(initial, unit), "--", lw=1.0, color=START_COLOR, label="start values")
            ax.plot(fit.fitted.time_s / 60.0, pressure_in(fitted, unit), "-", lw=1.8, color=FIT_COLOR, label="fitted run")
            ax.set_yscale("log")
            ax.set_ylabel(f"pressure [{label}]")
        else:
            what = f"{obs.compound} head temperature" if name == "boiling_temperature_k" else "tub temperature"
            ax.plot(t_obs[ok], obs_values(obs, name)[ok] - c.ZERO_CELSIUS, "o", ms=3, color=READING_COLOR, label="log readings")
            ax.plot(fit.initial.time_s / 60.0, initial - c.ZERO_CELSIUS, "--", lw=1.0, color=START_COLOR, label="start values")
            ax.plot(fit.fitted.time_s / 60.0, fitted - c.ZERO_CELSIUS, "-", lw=1.8, color=FIT_COLOR, label="fitted run")
            ax.set_ylabel(f"{what} [°C]")
            if name == "boiling_temperature_k":
                lo, hi = np.nanmin(obs.boiling_temperature_k[ok]), np.nanmax(obs.boiling_temperature_k[ok])
                pad = 0.1 * (hi - lo) + 1.0
                ax.set_ylim(lo - c.ZERO_CELSIUS - pad, hi - c.ZERO_CELSIUS + pad)
        ax.grid(True, which="both", alpha=0.3)
        ax.legend(loc="best", fontsize=8, framealpha=0.9)
    res_ax = axes[-1]
    for name in panels:
        marker, color, label = RESIDUAL_STYLE[name]
        r = fit.residuals[name]
        ok = np.isfinite(r)
        res_ax.plot(t_obs[ok], r[ok], marker, ms=3, ls="none", color=color, label=label)
    res_ax.axhline(0.0, color="0.2", lw=0.8)
    for k in (-2.0, 2.0):
        res_ax.axhline(k, color="0.5", lw=0.7, ls=":")
    res_ax.set_ylabel("(fit − reading) / σ")
    res_ax.set_xlabel("time [min]")
    res_ax.grid(True, alpha=0.3)
    res_ax.legend(loc="best", fontsize=8, ncol=len(panels))
    for ax in axes:
        for t, text in events:
            ax.axvline(t / 60.0, color="0.45", lw=0.8, ls=(0, (2, 2)))
    for t, text in events:
        axes[0].annotate(text, (t / 60.0, 1.0), xycoords=("data", "axes fraction"), rotation=90, va="top", ha="right",
                         fontsize=7, color="0.3", xytext=(-2, -2), textcoords="offset points")
    axes[0].set_xlim(0.0, max(float(obs.time_s[-1]), 1.0) / 60.0)
    axes[0].set_title(title or "fit to the log")
    return fig


def obs_values(obs, name: str) -> np.ndarray:
    """A logged series of the observations by name (K or Pa)."""
    return np.asarray(getattr(obs, name), dtype=float)
