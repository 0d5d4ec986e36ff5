"""Sweeps: parsing --vary, valid keys, monotone ice sweep, grid heat-map, agreement with a single run.

Expected numbers are derived (evenly spaced ends of a range; SI conversion of kg/L/degC by
definition: 1 L = 1e-3 m^3, 0 degC = 273.15 K, NIST SP 811); physical behaviour checked is
qualitative (more ice never shortens the hold: the heat balance of DESIGN.md sec. 4).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from vacsim.analysis.sweep import numeric_keys, parse_vary, prepare, run_sweep
from vacsim.errors import InputError
from vacsim.scenario import load_scenario, read_raw
from vacsim.simulation import simulate

SCENARIOS = Path(__file__).parents[2] / "scenarios"
ICED = SCENARIOS / "bench-iced.toml"


# ---- parsing ------------------------------------------------------------------------------------


@pytest.mark.parametrize("text", ["tub.ice=0..4kg", 'tub.ice="0 kg..4 kg"', "tub.ice=0..4 kg", "tub.ice=0kg..4"])
def test_range_with_the_unit_on_one_or_both_ends(text):
    v = parse_vary(text, steps=5)
    assert v.key == "tub.ice" and v.unit == "kg"
    assert v.values == pytest.approx([0, 1, 2, 3, 4])  # derived: 5 evenly spaced values, ends included
    assert v.text(1) == "1 kg"


def test_values_list_inline_and_with_values_option():
    assert parse_vary("tub.liquid_volume=5,10,20 L").values == (5.0, 10.0, 20.0)
    v = parse_vary("run.ambient_temperature", values="15,22 degC")
    assert v.unit == "degC" and v.values == (15.0, 22.0)


def test_dimensionless_key_takes_plain_numbers():
    v = parse_vary("ejector.area_ratio=0.2..0.3", steps=3)
    assert v.unit is None and v.text(1) == pytest.approx(0.25)  # derived: midpoint


def test_default_steps_is_nine():
    assert len(parse_vary("tub.ice=0..4kg").values) == 9


@pytest.mark.parametrize(
    "text, steps, match",
    [
        ("tub.ice=2..2kg", 5, "empty range"),
        ("tub.ice=..4kg", 5, "both ends"),
        ("tub.ice=0..4kg", 0, "at least 2"),
        ("tub.ice=0 g..4 kg", 5, "one unit"),
        ("tub.ice", None, "FROM..TO"),
        ("tub.ice=zero..4kg", 5, "number"),
    ],
)
def test_bad_ranges_are_one_line_errors(text, steps, match):
    with pytest.raises(InputError, match=match) as err:
        parse_vary(text, steps=steps)
    assert "\n" not in str(err.value)


def test_unknown_key_lists_the_valid_numeric_keys():
    with pytest.raises(InputError) as err:
        parse_vary("tub.icee=0..4kg")
    msg = str(err.value)
    assert "did you mean tub.ice" in msg
    for key in ("tub.liquid_volume", "hose.inner_diameter", "feed_pump.free_flow", "run.ambient_temperature"):
        assert key in msg
    assert "\n" not in msg


def test_numeric_keys_are_the_float_fields():
    keys = numeric_keys()
    # the keys the issue names as examples
    for key in ("tub.ice", "tub.liquid_volume", "tub.glycol_mass_fraction", "hose.inner_diameter", "feed_pump.free_flow", "run.ambient_temperature", "target.pressure"):
        assert key in keys
    # text, choice and list fields are not numeric
    for key in ("tub.glycol", "feed_pump.curve", "feed_pump.points", "ejector.measured", "name"):
        assert key not in keys


def test_a_wrong_unit_fails_before_any_run():
    with pytest.raises(InputError, match="mass") as err:
        prepare(read_raw(ICED), str(ICED), [parse_vary("tub.ice=0..4 m", steps=3)])
    assert "\n" not in str(err.value)


def test_out_of_range_value_names_the_value():
    with pytest.raises(InputError, match="area_ratio"):
        prepare(read_raw(ICED), str(ICED), [parse_vary("ejector.area_ratio=0.2..0.9", steps=3)])


# ---- running ------------------------------------------------------------------------------------


def test_ice_sweep_of_nine_values_is_monotone_and_shows_progress(capsys):
    sweep = run_sweep(ICED, [parse_vary("tub.ice=0..4kg", steps=9)], jobs=2, progress=True)
    assert "9/9" in capsys.readouterr().err
    assert sweep.parameters == ["tub.ice"] and sweep.shape == (9,)
    assert [p["tub.ice"] for p in sweep.points] == pytest.approx(np.linspace(0, 4, 9))  # kg is SI
    held = sweep.column("usable_duration_s")
    assert np.all(np.diff(held) >= -1e-6), held  # more ice never shortens the hold
    assert held[-1] > held[0]
    data = sweep.to_json()
    assert data["parameter"] == "tub.ice" and data["parameters"] == ["tub.ice"]
    assert {"tub.ice", "usable_duration_s", "time_to_target_s", "min_pressure_pa", "warnings"} <= set(data["points"][0])
    rows = sweep.csv_text().splitlines()
    assert rows[0].startswith("tub.ice,usable_duration_s") and len(rows) == 10


def test_a_sweep_point_is_the_same_as_a_single_run():
    sweep = run_sweep(ICED, [parse_vary("tub.liquid_volume=8,12 L")], jobs=1)
    assert [p["tub.liquid_volume"] for p in sweep.points] == pytest.approx([8e-3, 12e-3])  # 1 L = 1e-3 m^3
    single = simulate(load_scenario(ICED, ["tub.liquid_volume=12 L"])).summary
    for key in ("usable_duration_s", "min_pressure_pa", "final_tub_temperature_k"):
        assert sweep.points[1][key] == pytest.approx(single[key], rel=1e-9)


def test_grid_sweep_and_its_heat_map():
    from vacsim.report.sweep_plots import sweep_figure

    sweep = run_sweep(ICED, [parse_vary("tub.ice=0..1kg", steps=2), parse_vary("run.ambient_temperature=18,26 degC")], jobs=2)
    assert sweep.shape == (2, 2) and len(sweep.points) == 4
    assert sweep.si_values[1] == pytest.approx([291.15, 299.15])  # 0 degC = 273.15 K
    # the first parameter varies slowest
    assert [p["tub.ice"] for p in sweep.points] == pytest.approx([0, 0, 1, 1])
    assert [p["run.ambient_temperature"] for p in sweep.points] == pytest.approx([291.15, 299.15, 291.15, 299.15])
    held = sweep.column("usable_duration_s")
    assert held[1, 0] >= held[0, 0] and held[0, 0] >= held[0, 1]  # more ice helps, a warmer room hurts
    fig = sweep_figure(sweep)
    ax = fig.axes[0]
    meshes = [c for c in ax.collections if type(c).__name__ == "QuadMesh"] + list(ax.images)
    assert meshes, "no heat-map artist"
    assert ax.get_xlabel() == "tub.ice [kg]" and ax.get_ylabel() == "run.ambient_temperature [degC]"
    assert any("holds target for" in a.get_ylabel() for a in fig.axes[1:])  # the colorbar
    assert len(ax.texts) == 4  # one number per cell
    import matplotlib.pyplot as plt

    plt.close(fig)


def test_line_figure_has_the_three_panels():
    from vacsim.report.sweep_plots import sweep_figure

    sweep = run_sweep(ICED, [parse_vary("tub.ice=0,1 kg")], jobs=1)
    fig = sweep_figure(sweep, unit="torr")
    labels = [a.get_ylabel() for a in fig.axes]
    assert labels == ["holds target for [min]", "reaches target after [min]", "lowest pressure [Torr]"]
    assert fig.axes[2].get_xlabel() == "tub.ice [kg]"
    assert all(len(a.get_lines()) >= 1 for a in fig.axes)
    import matplotlib.pyplot as plt

    plt.close(fig)
