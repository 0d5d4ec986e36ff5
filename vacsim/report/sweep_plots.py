"""Figures of the planning answers: sweeps (lines, heat-maps) and side-by-side comparisons.

Matplotlib is imported lazily (through plots._pyplot) so the CLI starts fast. Times are shown
in minutes, pressures in the display unit (mbar by default), temperatures in °C, each varied key in its kind's display unit (vacsim.analysis.sweep.display_unit).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from .. import constants as c
from ..analysis.sweep import display_label
from ..units import PRESSURE_LABELS, pressure_in
from .files import save_figure_atomic
from .plots import TARGET_COLOR, _minutes, _pyplot

# One color per variant (compare) and per sweep figure.
VARIANT_COLORS = ("#1f4e79", "#c0504d", "#4f8a3c", "#8e5ea2", "#d08b1c", "#2a9d8f", "#6b6b6b", "#b5527f")
HOLD_COLOR = "#2e7d4f"
REACH_COLOR = "#1f4e79"
LOWEST_COLOR = "#8e5ea2"
HEATMAP_CMAP = "viridis"
# Above this many cells per axis the heat-map carries no numbers in its cells.
_ANNOTATE_LIMIT = 12


def _minutes_or_nan(values):
    return np.asarray(values, dtype=float) / 60.0


# Tick labels on a heat-map axis: at most this many grid values are labelled (every k-th beyond).
_MAX_TICK_LABELS = 12
# The "reaches target after" panel spans at least this many minutes (from zero), so a pump-down
# that changes by seconds across the sweep is not drawn as a steep curve.
_MIN_REACH_SPAN_MIN = 1.0


def _cell_edges(values: np.ndarray) -> np.ndarray:
    """Edges of cells centred on monotonic grid values: halfway between neighbours, the outer
    edges half a step outside (so the cells line up with a linear axis)."""
    v = np.asarray(values, dtype=float)
    if v.size == 1:
        return np.array([v[0] - 0.5, v[0] + 0.5])
    mid = 0.5 * (v[1:] + v[:-1])
    return np.concatenate([[2.0 * v[0] - mid[0]], mid, [2.0 * v[-1] - mid[-1]]])


def _grid_axis(values: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(cell centres, cell edges) on the axis: the values themselves when they are strictly
    monotonic, else their positions 0..n-1 (labelled with the values)."""
    v = np.asarray(values, dtype=float)
    d = np.diff(v)
    centres = v if (np.all(d > 0) or np.all(d < 0)) else np.arange(v.size, dtype=float)
    return centres, _cell_edges(centres)


def _label_ticks(axis, centres: np.ndarray, values: np.ndarray) -> None:
    """Ticks at the grid values, labelled with them (every k-th when there are many)."""
    from ..analysis.sweep import format_value

    step = max(1, int(np.ceil(len(values) / _MAX_TICK_LABELS)))
    keep = list(range(0, len(values), step))
    axis.set_ticks([centres[i] for i in keep], labels=[format_value(values[i]) for i in keep])
    from matplotlib.ticker import NullLocator

    axis.set_minor_locator(NullLocator())


def _reach_limits(ax, reach_min: np.ndarray) -> None:
    """y limits of the time-to-target panel: from 0, spanning at least _MIN_REACH_SPAN_MIN."""
    top = float(np.nanmax(reach_min)) if np.isfinite(reach_min).any() else 0.0
    ax.set_ylim(0.0, max(_MIN_REACH_SPAN_MIN, 1.1 * top))


def sweep_line_figure(sweep, unit: str = "mbar"):
    """Usable duration, time to target and lowest pressure against one varied parameter."""
    plt = _pyplot()
    v = sweep.varies[0]
    x = sweep.display_values(0, unit)
    label = PRESSURE_LABELS[unit]
    fig, axes = plt.subplots(3, 1, figsize=(7.5, 8.0), sharex=True, layout="constrained")
    hold = _minutes_or_nan(sweep.column("usable_duration_s"))
    reach = _minutes_or_nan(sweep.column("time_to_target_s"))
    lowest = pressure_in(sweep.column("min_pressure_pa"), unit)
    axes[0].plot(x, hold, "o-", color=HOLD_COLOR, lw=2, ms=4, label="holds target for")
    axes[0].set_ylabel("holds target for [min]")
    axes[0].set_ylim(bottom=0)
    axes[1].plot(x, reach, "o-", color=REACH_COLOR, lw=2, ms=4, label="reaches target after")
    axes[1].set_ylabel("reaches target after [min]")
    _reach_limits(axes[1], reach)
    axes[2].plot(x, lowest, "o-", color=LOWEST_COLOR, lw=2, ms=4, label="lowest pressure")
    if sweep.target_pressure_pa is not None:
        tgt = pressure_in(sweep.target_pressure_pa, unit)
        axes[2].axhline(tgt, color=TARGET_COLOR, ls=":", lw=1.2, label=f"target {tgt:.3g} {label}")
    axes[2].set_ylabel(f"lowest pressure [{label}]")
    axes[2].set_xlabel(display_label(v.key, unit))
    for ax in axes:
        ax.grid(True, alpha=0.3)
        ax.legend(loc="best", fontsize=8)
    axes[0].set_title(f"{sweep.scenario}: sweep of {v.key}")
    return fig


def sweep_heatmap_figure(sweep, unit: str = "mbar"):
    """Heat-map of the usable duration over a grid of two varied parameters: one cell per grid
    point, centred on its values (edges halfway between neighbours), ticks at the grid values."""
    plt = _pyplot()
    v1, v2 = sweep.varies
    x_values = sweep.display_values(0, unit)
    y_values = sweep.display_values(1, unit)
    x, x_edges = _grid_axis(x_values)
    y, y_edges = _grid_axis(y_values)
    hold = _minutes_or_nan(sweep.column("usable_duration_s"))  # shape (n1, n2)
    fig, ax = plt.subplots(figsize=(7.5, 5.8), layout="constrained")
    mesh = ax.pcolormesh(x_edges, y_edges, hold.T, shading="flat", cmap=HEATMAP_CMAP)
    bar = fig.colorbar(mesh, ax=ax)
    bar.set_label("holds target for [min]")
    if len(x) <= _ANNOTATE_LIMIT and len(y) <= _ANNOTATE_LIMIT:
        top = np.nanmax(hold) if np.isfinite(hold).any() else 1.0
        for i, xi in enumerate(x):
            for j, yj in enumerate(y):
                val = hold[i, j]
                text = "-" if not np.isfinite(val) else f"{val:.0f}"
                dark = np.isfinite(val) and val < 0.6 * top
                ax.text(xi, yj, text, ha="center", va="center", fontsize=8, color="white" if dark else "black")
    _label_ticks(ax.xaxis, x, x_values)
    _label_ticks(ax.yaxis, y, y_values)
    ax.set_xlim(x_edges.min(), x_edges.max())
    ax.set_ylim(y_edges.min(), y_edges.max())
    ax.set_xlabel(display_label(v1.key, unit))
    ax.set_ylabel(display_label(v2.key, unit))
    tgt = ""
    if sweep.target_pressure_pa is not None:
        tgt = f" {pressure_in(sweep.target_pressure_pa, unit):.3g} {PRESSURE_LABELS[unit]}"
    ax.set_title(f"{sweep.scenario}: minutes at or below the{tgt} target")
    return fig


def sweep_figure(sweep, unit: str = "mbar"):
    """The sweep's figure: lines for one parameter, a heat-map for two."""
    if len(sweep.varies) == 1:
        return sweep_line_figure(sweep, unit)
    return sweep_heatmap_figure(sweep, unit)


def save_sweep_figure(sweep, path, unit: str = "mbar") -> Path:
    """Write the sweep's figure (sweep.png) atomically."""
    plt = _pyplot()
    fig = sweep_figure(sweep, unit)
    try:
        return save_figure_atomic(fig, Path(path))
    finally:
        plt.close(fig)


def compare_figure(names, results, unit: str = "mbar"):
    """Overlaid apparatus pressure (log scale) and tub temperature of several variants."""
    plt = _pyplot()
    label = PRESSURE_LABELS[unit]
    fig, (ax_p, ax_t) = plt.subplots(2, 1, figsize=(8.5, 7.5), sharex=True, layout="constrained")
    targets = {}
    t_max = 0.0
    for k, (name, result) in enumerate(zip(names, results)):
        color = VARIANT_COLORS[k % len(VARIANT_COLORS)]
        t = _minutes(result.time_s)
        t_max = max(t_max, float(t[-1]))
        ax_p.plot(t, pressure_in(result.series["pressure_pa"], unit), color=color, lw=2, label=name)
        ax_t.plot(t, result.series["tub_temperature_k"] - c.ZERO_CELSIUS, color=color, lw=2, label=name)
        target = result.summary["target_pressure_pa"]
        if target is not None:
            targets.setdefault(round(target, 6), []).append(name)
    for target, who in targets.items():
        tv = pressure_in(target, unit)
        suffix = "" if len(targets) == 1 else f" ({', '.join(who)})"
        ax_p.axhline(tv, color=TARGET_COLOR, ls=":", lw=1.2, label=f"target {tv:.3g} {label}{suffix}")
    ax_p.set_yscale("log")
    ax_p.set_ylabel(f"apparatus pressure [{label}]")
    ax_p.grid(True, which="both", alpha=0.3)
    ax_p.legend(loc="upper right", fontsize=8)
    ax_p.set_title("pressure: " + " vs ".join(names))
    ax_t.set_ylabel("tub temperature [°C]")
    ax_t.set_xlabel("time [min]")
    ax_t.set_xlim(0, t_max)
    ax_t.grid(True, alpha=0.3)
    ax_t.legend(loc="upper left", fontsize=8)
    ax_t.set_title("tub temperature")
    return fig


def save_compare_figure(names, results, path, unit: str = "mbar") -> Path:
    """Write compare.png atomically."""
    plt = _pyplot()
    fig = compare_figure(names, results, unit)
    try:
        return save_figure_atomic(fig, Path(path))
    finally:
        plt.close(fig)
