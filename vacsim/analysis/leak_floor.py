"""What a measured leak costs in ultimate pressure on a given rig."""

from __future__ import annotations

from pathlib import Path

from ..model import build_rig, initial_controls, initial_state
from ..scenario import build_scenario, raw_of, load_scenario, set_key
from ..simulation import ultimate_pressure


def floor_with_leak(scenario, leak_rate: float) -> float | None:
    """Steady (ultimate) apparatus pressure at the scenario's initial tub state with a given leak [Pa].

    Parameters
    ----------
    scenario : Scenario
        The rig.
    leak_rate : float
        Leak throughput [Pa m^3/s].
    """
    raw = set_key(raw_of(scenario), "apparatus.leak_rate", f"{leak_rate!r} Pa*m^3/s")
    s = build_scenario(raw, "leak-floor")
    rig = build_rig(s)
    return ultimate_pressure(rig, initial_controls(s, rig), initial_state(s, rig))


def floor_cost(scenario_path: str | Path, leak_rate_pa_m3_s: float) -> float:
    """Rise of the rig's ultimate pressure caused by the leak, against a leak-tight apparatus [Pa]."""
    s = load_scenario(scenario_path)
    with_leak = floor_with_leak(s, leak_rate_pa_m3_s)
    tight = floor_with_leak(s, 0.0)
    return float(with_leak - tight)
