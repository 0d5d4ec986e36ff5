"""The floor a leak costs: the steady gas balance Q = S_eff (p - p_floor)."""

from pathlib import Path

import pytest

from vacsim.analysis.leak_floor import floor_cost, floor_with_leak
from vacsim.scenario import load_scenario

SCENARIOS = Path(__file__).parents[2] / "scenarios"


def test_floor_cost_is_leak_over_speed():
    # O'Hanlon 2003 eq. 10.1 at steady state: dp = Q / S_eff for a small leak (S_eff nearly constant)
    from vacsim.model import P, build_rig, fluxes, initial_controls, initial_state

    s = load_scenario(SCENARIOS / "bench-tap-water.toml")
    rig = build_rig(s)
    y = initial_state(s, rig)
    y[P] = floor_with_leak(s, 0.0)
    speed = float(fluxes(rig, initial_controls(s, rig), y).effective_speed_m3_s)  # at the floor
    leak = 2e-3  # Pa m^3/s = 0.02 mbar L/s
    cost = floor_cost(SCENARIOS / "bench-tap-water.toml", leak)
    assert cost == pytest.approx(leak / speed, rel=0.05)
    assert floor_with_leak(s, 10 * leak) > floor_with_leak(s, leak)
