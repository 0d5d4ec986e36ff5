"""Sweeps: parsing --vary, valid keys, monotone ice sweep, grid heat-map, agreement with a single run.

Expected numbers are derived (evenly spaced ends of a range; SI conversion of kg/L/degC by
definition: 1 L = 1e-3 m^3, 0 degC = 273.15 K, NIST SP 811); physical behaviour checked is
qualitative (more ice never shortens the hold: the heat balance of DESIGN.md sec. 4).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from vacsim.analysis.sweep import SweepResult, display_label, numeric_keys, parse_vary, prepare, run_sweep, sweep_notes, to_display
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
    assert ax.get_xlabel() == "tub.ice [kg]" and ax.get_ylabel() == "run.ambient_temperature [°C]"  # display units: kg, °C
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


# ---- display: grid values on the axes and in the table (no simulation: a made-up result) -------


def _fake_grid(vary_1: str, steps_1: int, vary_2: str, steps_2: int) -> SweepResult:
    """A SweepResult over a grid without running it: the usable duration is a made-up 60 s per
    cell index, enough to draw; the SI values are the units' definitions (1 L = 1e-3 m^3,
    0 degC = 273.15 K, NIST SP 811)."""
    v1, v2 = parse_vary(vary_1, steps=steps_1), parse_vary(vary_2, steps=steps_2)
    si = {"L": 1e-3, "kg": 1.0}
    def to_si(v):
        return [x + 273.15 for x in v.values] if v.unit == "degC" else [x * si[v.unit] for x in v.values]
    points = []
    for i, a in enumerate(to_si(v1)):
        for j, b in enumerate(to_si(v2)):
            points.append({v1.key: a, v2.key: b, "usable_duration_s": 60.0 * (i + j), "usable_start_s": 200.0,
                           "time_to_target_s": 200.0, "min_pressure_pa": 1900.0, "ice_gone_s": None, "ice_initial_kg": 0.0, "warnings": []})
    return SweepResult(scenario="made-up", varies=[v1, v2], points=points, shape=(len(v1.values), len(v2.values)),
                       si_values=[to_si(v1), to_si(v2)], target_pressure_pa=2500.0)


def test_heat_map_ticks_are_the_grid_values_and_cells_are_centred_on_them():
    import matplotlib.pyplot as plt

    from vacsim.report.sweep_plots import sweep_figure

    # the review's case: 5..40 L in 7 steps is 5, 10.83, 16.67 ... 40 L (derived: step 35/6 L)
    sweep = _fake_grid("tub.liquid_volume=5..40L", 7, "run.ambient_temperature=18..30degC", 7)
    fig = sweep_figure(sweep)
    ax = fig.axes[0]
    x = np.linspace(5, 40, 7)  # derived: evenly spaced, ends included
    assert [t.get_text() for t in ax.get_xticklabels()] == ["5", "10.83", "16.67", "22.5", "28.33", "34.17", "40"]
    assert ax.get_xticks() == pytest.approx(x)
    assert [t.get_text() for t in ax.get_yticklabels()] == ["18", "20", "22", "24", "26", "28", "30"]  # derived: 2 K steps
    assert ax.get_xlabel() == "tub.liquid_volume [L]" and ax.get_ylabel() == "run.ambient_temperature [°C]"
    mesh = next(c for c in ax.collections if type(c).__name__ == "QuadMesh")
    edges = np.asarray(mesh.get_coordinates())[0, :, 0]
    step = 35.0 / 6.0  # derived: (40 - 5) / (7 - 1)
    assert edges == pytest.approx(np.concatenate([[5 - step / 2], (x[1:] + x[:-1]) / 2, [40 + step / 2]]))
    assert ax.get_xlim() == pytest.approx((5 - step / 2, 40 + step / 2))
    plt.close(fig)


def test_heat_map_labels_every_kth_value_when_there_are_many():
    import matplotlib.pyplot as plt

    from vacsim.report.sweep_plots import sweep_figure

    sweep = _fake_grid("tub.ice=0..2.4kg", 25, "tub.liquid_volume=8,12 L", None)
    fig = sweep_figure(sweep)
    labels = [t.get_text() for t in fig.axes[0].get_xticklabels()]
    assert labels == ["0", "0.3", "0.6", "0.9", "1.2", "1.5", "1.8", "2.1", "2.4"]  # derived: every 3rd of 0.1 kg steps
    assert [t.get_text() for t in fig.axes[0].get_yticklabels()] == ["8", "12"]
    plt.close(fig)


def test_unsorted_values_are_drawn_at_their_positions_with_value_labels():
    import matplotlib.pyplot as plt

    from vacsim.report.sweep_plots import sweep_figure

    sweep = _fake_grid("tub.liquid_volume=12,8,10 L", None, "tub.ice=0,1 kg", None)
    fig = sweep_figure(sweep)
    ax = fig.axes[0]
    assert ax.get_xticks() == pytest.approx([0, 1, 2]) and [t.get_text() for t in ax.get_xticklabels()] == ["12", "8", "10"]
    plt.close(fig)


def test_reach_axis_starts_at_zero_and_spans_a_minute():
    import matplotlib.pyplot as plt

    from vacsim.report.sweep_plots import sweep_figure

    sweep = _fake_grid("tub.ice=0,1 kg", None, "tub.liquid_volume=8,12 L", None)
    line = SweepResult(scenario="made-up", varies=sweep.varies[:1], points=sweep.points[::2], shape=(2,),
                       si_values=sweep.si_values[:1], target_pressure_pa=2500.0)
    line.points[1] = dict(line.points[1], time_to_target_s=203.0)  # 3 s apart (made-up)
    fig = sweep_figure(line)
    bottom, top = fig.axes[1].get_ylim()
    assert bottom == 0.0 and top >= 1.0  # the panel's contract: from 0, at least 1 min
    plt.close(fig)


def test_display_units_of_the_trades_kinds():
    # conversions by definition (NIST SP 811): 1 L = 1e-3 m^3, 0 degC = 273.15 K, 1 mbar = 100 Pa,
    # 1 mbar L/s = 0.1 Pa m^3/s, 1 L/min = 1/60000 m^3/s
    assert display_label("tub.liquid_volume") == "tub.liquid_volume [L]"
    assert display_label("run.ambient_temperature") == "run.ambient_temperature [°C]"
    assert display_label("hose.inner_diameter") == "hose.inner_diameter [mm]" and display_label("hose.length") == "hose.length [m]"
    assert display_label("feed_pump.free_flow") == "feed_pump.free_flow [L/min]"
    assert display_label("apparatus.leak_rate") == "apparatus.leak_rate [mbar·L/s]"
    assert display_label("tub.ua") == "tub.ua [W/K]" and display_label("target.pressure", "torr") == "target.pressure [Torr]"
    assert display_label("ejector.area_ratio") == "ejector.area_ratio"
    assert to_display("tub.liquid_volume", [8e-3]) == pytest.approx([8.0])
    assert to_display("run.ambient_temperature", [291.15]) == pytest.approx([18.0])
    assert to_display("hose.inner_diameter", [0.008]) == pytest.approx([8.0])
    assert to_display("feed_pump.free_flow", [8.0 / 60000.0]) == pytest.approx([8.0])
    assert to_display("apparatus.leak_rate", [0.003]) == pytest.approx([0.03])
    assert to_display("target.pressure", [2500.0]) == pytest.approx([25.0])


def test_sweep_table_headers_carry_units_and_grid_values():
    from rich.console import Console

    from vacsim.cli.sweep_cmd import sweep_table

    sweep = _fake_grid("tub.liquid_volume=5..40L", 7, "run.ambient_temperature=18..30degC", 2)
    out = Console(width=300, record=True, file=__import__("io").StringIO())
    out.print(sweep_table(sweep))
    text = out.export_text()
    assert "liquid volume (L)" in text and "ambient temperature (°C)" in text
    assert "10.83" in text and "…" not in text


def test_steps_pair_with_the_ranges_in_order():
    from vacsim.cli.sweep_cmd import _steps_for

    assert _steps_for(["tub.liquid_volume=5..40L", "run.ambient_temperature=18..30degC"], [8, 7]) == [8, 7]
    assert _steps_for(["tub.ice=0,1kg", "run.ambient_temperature=18..30degC"], [7]) == [None, 7]
    assert _steps_for(["tub.ice=0..1kg", "run.ambient_temperature=18..30degC"], [5]) == [5, 5]
    with pytest.raises(InputError, match="one per range"):
        _steps_for(["tub.ice=0..1kg", "run.ambient_temperature=18..30degC"], [5, 6, 7])


def test_growing_tub_with_fixed_ua_gets_a_note():
    s = load_scenario(SCENARIOS / "bench-tap-water.toml")  # gives tub.ua = "3 W/K"
    notes = sweep_notes(s, ["tub.liquid_volume"])
    assert len(notes) == 1 and "tub.ua is held at 3 W/K" in notes[0] and "Leave tub.ua out" in notes[0]
    assert sweep_notes(s, ["tub.liquid_volume", "tub.ua"]) == []
    assert "no effect" in sweep_notes(s, ["tub.ice_piece_size"])[0]  # the file has no ice


def test_a_non_numeric_key_says_what_it_is():
    with pytest.raises(InputError) as err:
        parse_vary("tub.glycol=none,ethylene")
    msg = str(err.value)
    assert "not numeric" in msg and "none/ethylene/propylene" in msg and "did you mean" not in msg
    assert "\n" not in msg
