"""Figures of a spread (fan chart, histogram of usable duration) and of a Morris screening."""

from __future__ import annotations

from pathlib import Path

import numpy as np

from ..units import PRESSURE_LABELS, pressure_in
from .files import save_figure_atomic, save_figures
from .plots import PRESSURE_COLOR, TARGET_COLOR, _pyplot, mark_schedule

BAND_COLOR = "#8fb3d9"
DETERMINISTIC_COLOR = "#333333"


def fan_chart(spread, unit: str = "mbar"):
    """Pressure against time: the P10-P90 band of the samples, their P50, the deterministic run
    and the target."""
    plt = _pyplot()
    fig, ax = plt.subplots(figsize=(8, 4.8), layout="constrained")
    label = PRESSURE_LABELS[unit]
    t = spread.time_s / 60.0
    band = spread.pressure_band()
    ax.fill_between(t, pressure_in(band[10], unit), pressure_in(band[90], unit), color=BAND_COLOR, alpha=0.6, lw=0, label="P10-P90 of samples")
    ax.plot(t, pressure_in(band[50], unit), color=PRESSURE_COLOR, lw=2, label="P50 of samples")
    det = spread.deterministic
    ax.plot(det.time_s / 60.0, pressure_in(det.series["pressure_pa"], unit), color=DETERMINISTIC_COLOR, lw=1.2, ls="--", label="deterministic run (inputs as written)")
    if spread.target_pressure_pa is not None:
        ax.axhline(pressure_in(spread.target_pressure_pa, unit), color=TARGET_COLOR, lw=1.2, ls=":", label=f"target {pressure_in(spread.target_pressure_pa, unit):.3g} {label}")
    ax.set_yscale("log")
    ax.set_xlim(0, t[-1])
    ax.set_xlabel("time [min]")
    ax.set_ylabel(f"pressure [{label}]")
    ax.grid(True, which="both", alpha=0.3)
    ax.set_title(f"{spread.scenario.name}: pressure over {spread.samples} samples ({spread.method.upper()}, seed {spread.seed})")
    mark_schedule(ax, spread.scenario)
    ax.legend(loc="upper right", fontsize=8, framealpha=0.9)
    return fig


def usable_histogram(spread):
    """Histogram of the usable duration [min] with P10/P50/P90 and the deterministic value marked."""
    plt = _pyplot()
    fig, ax = plt.subplots(figsize=(7, 4.2), layout="constrained")
    minutes = spread.figures["usable_duration_s"] / 60.0
    ax.hist(minutes, bins=min(40, max(5, spread.samples // 10)), color=BAND_COLOR, edgecolor=PRESSURE_COLOR, lw=0.6, label=f"{spread.samples} samples")
    band = spread.band("usable_duration_s")
    for q, style in ((10, ":"), (50, "-"), (90, ":")):
        value = band[f"p{q}"]
        if value is not None:
            ax.axvline(value / 60.0, color=PRESSURE_COLOR, lw=1.4, ls=style, label=f"P{q} {value / 60:.0f} min")
    det = spread.deterministic.summary["usable_duration_s"]
    ax.axvline(det / 60.0, color=DETERMINISTIC_COLOR, lw=1.2, ls="--", label=f"deterministic {det / 60:.0f} min")
    held = spread.held_to_end()
    if held:
        ax.annotate(f"{held} held to the end of the run", (1.0, 1.0), xycoords="axes fraction", xytext=(-4, -4), textcoords="offset points", ha="right", va="top", fontsize=8)
    ax.set_xlabel("usable duration (first window at or below target) [min]")
    ax.set_ylabel("samples")
    ax.grid(True, alpha=0.3)
    ax.set_title(f"{spread.scenario.name}: how long the target holds")
    ax.legend(fontsize=8, loc="upper left")
    return fig


def spread_figures(spread, out_dir=None, unit: str = "mbar"):
    """spread.png (fan chart) and usable-duration.png (histogram); saved to `out_dir` if given."""
    figs = {"spread.png": fan_chart(spread, unit), "usable-duration.png": usable_histogram(spread)}
    return figs if out_dir is None else save_figures(figs, out_dir)


def sensitivity_chart(result):
    """Horizontal bars of Morris mu* per input (largest on top), sigma as error whiskers."""
    plt = _pyplot()
    ranking = result.ranking()
    fig, ax = plt.subplots(figsize=(7, 1.2 + 0.55 * len(ranking)), layout="constrained")
    keys = [r["key"] for r in ranking][::-1]
    mu_star = np.array([r["mu_star"] for r in ranking][::-1]) / 60.0
    sigma = np.array([r["sigma"] for r in ranking][::-1]) / 60.0
    ax.barh(keys, mu_star, xerr=sigma, color=BAND_COLOR, edgecolor=PRESSURE_COLOR, ecolor="0.4", capsize=3, label="mu* (bar), sigma (whisker)")
    ax.set_xlabel("effect on usable duration, Morris mu* [min per input range]")
    ax.grid(True, axis="x", alpha=0.3)
    ax.set_xlim(left=0)
    ax.set_title(f"{result.scenario}: Morris screening, r = {result.trajectories}")
    ax.legend(fontsize=8, loc="lower right")
    return fig


def save_sensitivity_chart(result, path) -> Path:
    """Write sensitivity.png (or another path)."""
    plt = _pyplot()
    fig = sensitivity_chart(result)
    try:
        return save_figure_atomic(fig, Path(path))
    finally:
        plt.close(fig)
