"""The result of one run: series, summary figures, and how they are written."""

from __future__ import annotations

import csv
import io
import json
from dataclasses import asdict, dataclass, field
from pathlib import Path

import numpy as np


# Columns of timeseries.csv, in order, each with its SI unit in the name.
CSV_COLUMNS = (
    "time_s",
    "pressure_pa",
    "tub_temperature_k",
    "ice_mass_kg",
    "water_mass_kg",
    "vapor_pressure_pa",
    "floor_pressure_pa",
    "ejector_speed_m3_s",
    "effective_speed_m3_s",
    "motive_flow_m3_s",
    "pump_heat_w",
    "room_heat_w",
    "melt_heat_w",
    "glycol_mass_fraction",
    "freezing_point_k",
    "target_boiling_temperature_k",
    "solvent_tub_kg",
    "solvent_partial_pressure_pa",
    "slip_pa_m3_s",
    "degassing_pa_m3_s",
    "pump_on",
)


@dataclass(frozen=True)
class Warning_:
    """A warning of the run: a short code, a sentence for the user, and when it happened [s]."""

    code: str
    message: str
    time_s: float | None = None


def _first_window(windows):
    return windows[0] if windows else None


def usable_windows(duration, target, crossings, pump_stops, vents, p0, pump_on_at_start=True, resumes=()):
    """Windows [start, end] [s] in which the apparatus is at or below the target pressure.

    A window opens when the pressure falls to the target while the pump runs on the closed
    apparatus, or when pumping resumes (pump restarted, vent closed) with the pressure already at
    or below it; it closes at the first later time the pressure rises above the target, the pump
    stops, the apparatus is vented, or the run ends.

    Parameters
    ----------
    crossings : list of (time [s], direction)
        Target crossings, direction -1 falling and +1 rising.
    pump_stops, vents : list of float
        Times [s] pumping stopped or the apparatus was opened.
    p0 : float
        Pressure at t = 0 [Pa].
    resumes : list of (time [s], pressure [Pa])
        Times pumping on the closed apparatus resumed, with the pressure then.
    """
    if target is None:
        return []
    marks = sorted(
        [(t, "down" if d < 0 else "up", None) for t, d in crossings]
        + [(t, "stop", None) for t in pump_stops]
        + [(t, "vent", None) for t in vents]
        + [(t, "resume", p) for t, p in resumes],
        key=lambda m: m[0],
    )
    windows = []
    pumping = pump_on_at_start
    start = 0.0 if (p0 <= target and pumping) else None
    for t, kind, p in marks:
        if kind in ("stop", "vent"):
            pumping = False
        if kind == "resume":
            pumping = True
        opens = (kind == "down" and pumping) or (kind == "resume" and p <= target)
        if opens and start is None:
            start = t
        elif kind in ("up", "stop", "vent") and start is not None:
            if t > start:
                windows.append((start, t))
            start = None
    if start is not None and duration > start:
        windows.append((start, duration))
    return windows


# Pump-down counts as stalled once the pressure changes by less than this share per second.
STALL_RATE = 1e-4  # 1/s, i.e. 0.6 % per minute


def stall_time(time, pressure, pump_on, target):
    """First time [s] the pump-down levels off above the target (None if it never does)."""
    if target is None or len(time) < 3:
        return None
    t = np.asarray(time, dtype=float)
    keep = np.concatenate([[True], np.diff(t) > 0])
    t, p, on = t[keep], np.asarray(pressure)[keep], np.asarray(pump_on)[keep]
    rate = np.abs(np.gradient(p, t)) / p
    stalled = (rate < STALL_RATE) & (p > target) & (on > 0) & (t > 0)
    below = np.flatnonzero(p <= target)
    if below.size:
        stalled &= t < t[below[0]]
    idx = np.flatnonzero(stalled)
    return float(t[idx[0]]) if idx.size else None


def run_events(target, crossings, ice_gone_s, stalled_s):
    """The run's events in time order: target reached / lost, ice gone, pump-down stalled."""
    events = [{"event": "target_reached" if d < 0 else "target_lost", "time_s": t} for t, d in crossings]
    if ice_gone_s is not None:
        events.append({"event": "ice_gone", "time_s": ice_gone_s})
    if stalled_s is not None:
        events.append({"event": "pumpdown_stalled", "time_s": stalled_s})
    return sorted(events, key=lambda e: e["time_s"])


def summarise(*, scenario, rig, time, series, target, crossings, pump_stops, vents, ice_gone_s, ultimate_start, start_fluxes, warnings, resumes=(), pump_on_at_start=True):
    """The summary figures of a run (summary.json); SI units, None where not applicable."""
    p = series["pressure_pa"]
    temp = series["tub_temperature_k"]
    duration = float(time[-1])
    windows = usable_windows(duration, target, crossings, pump_stops, vents, float(p[0]), pump_on_at_start, resumes)
    first = _first_window(windows)
    warnings = list(warnings)
    stalled_s = stall_time(time, p, series["pump_on"], target) if first is None else None
    pumping = (series["pump_on"] > 0) & (series["vented"] < 1)
    if target is not None and first is None and not pumping.any():
        warnings.append(Warning_("target_not_reached", "the pump never ran on the closed apparatus: no usable window.", None))
    elif target is not None and first is None:
        p_min = float(np.min(p[pumping]))
        floor_min = float(np.min(series["floor_pressure_pa"][pumping]))
        warnings.append(
            Warning_(
                "target_not_reached",
                f"never reached the {target / 100:.1f} mbar target while pumping: the lowest pressure was {p_min / 100:.1f} mbar "
                f"(fluid vapor-pressure floor {floor_min / 100:.1f} mbar); pump-down stalled above the target.",
                stalled_s,
            )
        )
    return {
        "scenario": scenario.name,
        "description": scenario.description,
        "duration_s": duration,
        "target_pressure_pa": target,
        "time_to_target_s": first[0] if first else None,
        "usable_start_s": first[0] if first else None,
        "usable_end_s": first[1] if first else None,
        "usable_duration_s": (first[1] - first[0]) if first else 0.0,
        "usable_windows": [{"start_s": a, "end_s": b, "duration_s": b - a} for a, b in windows],
        "events": run_events(target, crossings, ice_gone_s, stalled_s),
        "min_pressure_pa": float(np.min(p)),
        "final_pressure_pa": float(p[-1]),
        "ultimate_pressure_start_pa": ultimate_start,
        "motive_flow_m3_s": float(start_fluxes.motive_flow_m3_s),
        "ejector_speed_m3_s": float(start_fluxes.ejector_speed_m3_s),
        "pump_heat_w": float(start_fluxes.pump_heat_w),
        # the ejector's own cut-off (zero gas flow); None when it lies below zero (the fluid's
        # vapor pressure, not the jet, limits) or with a measured curve
        "jet_shutoff_pressure_pa": float(rig.shutoff_pressure) if np.isfinite(rig.shutoff_pressure) and rig.shutoff_pressure > 0 else None,
        "ua_w_k": rig.ua,
        "ice_initial_kg": float(series["ice_mass_kg"][0]),
        "ice_gone_s": ice_gone_s,
        "min_tub_temperature_k": float(np.min(temp)),
        "max_tub_temperature_k": float(np.max(temp)),
        "final_tub_temperature_k": float(temp[-1]),
        "barometric_pressure_pa": rig.barometric_pressure,
        "distillate": rig.distillation.compound if rig.distillation is not None else None,
        "solvent_in_tub_kg": float(series["solvent_tub_kg"][-1]),
        "solvent_floor_pa": float(series["solvent_partial_pressure_pa"][-1]),
        "warnings": [asdict(w) for w in sorted(warnings, key=lambda w: -1.0 if w.time_s is None else w.time_s)],
        "assumptions": [asdict(a) for a in rig.assumptions],
    }


@dataclass(frozen=True)
class RunResult:
    """One simulated run.

    Attributes
    ----------
    scenario : Scenario
        What was simulated.
    time_s : ndarray
        Sample times [s]; a schedule entry that changes the state appears twice (before, after).
    series : dict of str -> ndarray
        State and derived series, each name carrying its SI unit (see CSV_COLUMNS).
    summary : dict
        The summary figures (summary.json), SI units.
    solver : dict
        Solver method and statistics.
    """

    scenario: object
    time_s: np.ndarray
    series: dict
    summary: dict
    solver: dict = field(default_factory=dict)

    def csv_text(self) -> str:
        """timeseries.csv as text."""
        buf = io.StringIO()
        writer = csv.writer(buf, lineterminator="\n")
        columns = [col for col in CSV_COLUMNS if col == "time_s" or col in self.series]
        writer.writerow(columns)
        data = [self.time_s] + [self.series[col] for col in columns[1:]]
        for row in zip(*data):
            writer.writerow([f"{v:.10g}" for v in row])
        return buf.getvalue()

    def summary_json(self) -> str:
        """summary.json as text."""
        from .report.files import json_safe

        return json.dumps(json_safe(self.summary), indent=2) + "\n"

    def to_csv(self, path) -> Path:
        """Write timeseries.csv atomically; returns the path."""
        from .report.files import write_text_atomic

        return write_text_atomic(Path(path), self.csv_text())

    def plot(self, out_dir=None):
        """Pressure and tub figures; written to `out_dir` if given, else returned."""
        from .report import plots

        return plots.run_figures(self, out_dir)

    def at(self, name: str, time_s: float) -> float:
        """A series interpolated at a time [s]."""
        return float(np.interp(time_s, self.time_s, self.series[name]))
