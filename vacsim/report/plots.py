"""Figures of a run. Matplotlib is imported here only, lazily, so the CLI starts fast."""

from __future__ import annotations


import numpy as np

from .. import constants as c
from ..units import PRESSURE_LABELS, pressure_in
from .files import save_figures

PRESSURE_COLOR = "#1f4e79"
FLOOR_COLOR = "#b8860b"
TARGET_COLOR = "#a52a2a"
WINDOW_COLOR = "#9ccc9c"
TUB_COLOR = "#c0504d"
ICE_COLOR = "#4a90c2"
SOLVENT_COLOR = "#7b3f99"
BOIL_COLOR = "#2e8b57"


def _pyplot():
    import matplotlib

    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt

    return plt


def _minutes(t):
    return np.asarray(t) / 60.0


def _schedule_label(entry) -> str:
    parts = []
    if entry.add_ice:
        parts.append(f"+{entry.add_ice:.3g} kg ice")
    if entry.vent:
        parts.append("vent")
    elif entry.vent is False:
        parts.append("close vent")
    if entry.pump:
        parts.append(f"pump {entry.pump}")
    if entry.ambient_temperature is not None:
        parts.append(f"room {entry.ambient_temperature - c.ZERO_CELSIUS:.0f} °C")
    if entry.coolant_temperature is not None:
        parts.append(f"coolant {entry.coolant_temperature - c.ZERO_CELSIUS:.0f} °C")
    return ", ".join(parts)


def mark_schedule(ax, scenario) -> None:
    """Thin vertical lines, labelled at the top, where schedule entries act."""
    for entry in scenario.schedule:
        ax.axvline(entry.at / 60.0, color="0.45", lw=0.8, ls=(0, (2, 2)))
        ax.annotate(_schedule_label(entry), (entry.at / 60.0, 1.0), xycoords=("data", "axes fraction"), rotation=90,
                    va="top", ha="right", fontsize=7, color="0.3", xytext=(-2, -2), textcoords="offset points")


def pressure_figure(result, unit: str = "mbar"):
    """Apparatus pressure (log scale) against time, the fluid's vapor-pressure floor, the
    target and the usable window(s) shaded."""
    plt = _pyplot()
    s = result.summary
    fig, ax = plt.subplots(figsize=(8, 4.8), layout="constrained")
    t = _minutes(result.time_s)
    label = PRESSURE_LABELS[unit]
    for w in s["usable_windows"]:
        ax.axvspan(w["start_s"] / 60, w["end_s"] / 60, color=WINDOW_COLOR, alpha=0.35, lw=0, label="usable window" if w is s["usable_windows"][0] else None)
    ax.plot(t, pressure_in(result.series["pressure_pa"], unit), color=PRESSURE_COLOR, lw=2, label="apparatus pressure")
    ax.plot(t, pressure_in(result.series["vapor_pressure_pa"], unit), color=FLOOR_COLOR, lw=1.3, ls="--", label="tub fluid vapor pressure (floor)")
    if s["target_pressure_pa"] is not None:
        ax.axhline(pressure_in(s["target_pressure_pa"], unit), color=TARGET_COLOR, lw=1.2, ls=":", label=f"target {pressure_in(s['target_pressure_pa'], unit):.3g} {label}")
    if "solvent_partial_pressure_pa" in result.series and np.any(result.series["solvent_partial_pressure_pa"] > 0.01 * result.series["vapor_pressure_pa"]):
        ax.plot(t, pressure_in(result.series["floor_pressure_pa"], unit), color=SOLVENT_COLOR, lw=1.3, ls="-.", label="floor with absorbed distillate")
    ax.set_yscale("log")
    ax.set_xlabel("time [min]")
    ax.set_ylabel(f"pressure [{label}]")
    ax.set_xlim(0, t[-1])
    ax.grid(True, which="both", alpha=0.3)
    ax.set_title(f"{s['scenario']}: pump-down and drift")
    mark_schedule(ax, result.scenario)
    handles, labels = ax.get_legend_handles_labels()
    if "target_boiling_temperature_k" in result.series:
        ax2 = ax.twinx()
        compound = result.scenario.target.compound
        line = ax2.plot(t, result.series["target_boiling_temperature_k"] - c.ZERO_CELSIUS, color=BOIL_COLOR, lw=1.2, label=f"{compound} boils at [°C]")
        ax2.set_ylabel(f"{compound} boiling (head) temperature [°C]", color=BOIL_COLOR)
        handles += line
        labels += [line[0].get_label()]
    ax.legend(handles, labels, loc="center right", fontsize=8, framealpha=0.9)
    return fig


def tub_figure(result):
    """Tub temperature and ice mass against time."""
    plt = _pyplot()
    s = result.summary
    fig, ax = plt.subplots(figsize=(8, 4.2), layout="constrained")
    t = _minutes(result.time_s)
    ax.plot(t, result.series["tub_temperature_k"] - c.ZERO_CELSIUS, color=TUB_COLOR, lw=2, label="tub temperature")
    ax.set_xlabel("time [min]")
    ax.set_ylabel("tub temperature [°C]", color=TUB_COLOR)
    ax.set_xlim(0, t[-1])
    ax.grid(True, alpha=0.3)
    ax2 = ax.twinx()
    ax2.plot(t, result.series["ice_mass_kg"], color=ICE_COLOR, lw=1.5, ls="-.", label="ice in tub")
    ax2.set_ylabel("ice [kg]", color=ICE_COLOR)
    ax2.set_ylim(bottom=0)
    lines = ax.get_lines() + ax2.get_lines()
    ax.legend(lines, [ln.get_label() for ln in lines], loc="upper left", fontsize=8)
    ax.set_title(f"{s['scenario']}: tub")
    mark_schedule(ax, result.scenario)
    return fig


def run_figures(result, out_dir=None, unit: str = "mbar"):
    """Both run figures; saved as pressure.png and tub.png in `out_dir` when given."""
    figs = {"pressure.png": pressure_figure(result, unit), "tub.png": tub_figure(result)}
    return figs if out_dir is None else save_figures(figs, out_dir)
