"""Comparisons: best per figure, differences in words, the overlaid figure, a real pair of demos.

The synthetic summaries carry invented round numbers chosen for the arithmetic (derived); the
real comparison's physical direction is cited beside it.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from vacsim.analysis.compare import FIGURES, best_of, compare, differences, duration_words, variant_names, winners
from vacsim.errors import InputError

SCENARIOS = Path(__file__).parents[2] / "scenarios"


def _summary(**over):
    s = {
        "target_pressure_pa": 2500.0, "time_to_target_s": 200.0, "usable_start_s": 200.0, "usable_end_s": 7400.0,
        "usable_duration_s": 7200.0, "min_pressure_pa": 1500.0, "ultimate_pressure_start_pa": 1550.0,
        "final_pressure_pa": 2400.0, "min_tub_temperature_k": 275.0, "max_tub_temperature_k": 285.0,
        "final_tub_temperature_k": 285.0, "ice_gone_s": 3600.0, "motive_flow_m3_s": 5e-5, "ejector_speed_m3_s": 5e-5,
        "pump_heat_w": 20.0, "ice_initial_kg": 1.0, "warnings": [],
    }
    s.update(over)
    return s


def test_the_issue_s_sentence():
    a = _summary()
    b = _summary(usable_duration_s=7200.0 + 48 * 60, usable_end_s=7400.0 + 48 * 60)
    lines = differences(["A", "B"], [a, b])
    # derived: 2 h 48 min against 2 h 00 min at the same 25 mbar target
    assert lines[0] == "B holds 25.0 mbar 48 min longer than A (2 h 48 min against 2 h 00 min)."


def test_sentences_for_pressure_temperature_and_reaching():
    a = _summary()
    b = _summary(time_to_target_s=140.0, min_pressure_pa=1200.0, final_pressure_pa=1800.0, final_tub_temperature_k=282.0)
    text = " ".join(differences(["A", "B"], [a, b]))
    assert "B reaches 25.0 mbar 1 min 00 s sooner than A" in text  # derived: 200 s - 140 s
    assert "B's lowest pressure is 3.00 mbar lower than A's (12.0 mbar against 15.0 mbar)" in text
    assert "B is at 18.0 mbar, better than A at 24.0 mbar" in text
    assert "B's tub ends 3.0 K colder" in text


def test_never_reached_and_different_targets():
    a = _summary()
    b = _summary(usable_start_s=None, usable_end_s=None, usable_duration_s=0.0, time_to_target_s=None)
    assert differences(["A", "B"], [a, b])[0] == "B never reaches 25.0 mbar; A holds it for 2 h 00 min."
    c = _summary(target_pressure_pa=2000.0, usable_duration_s=3600.0)
    assert differences(["A", "C"], [a, c])[0].startswith("C holds its 20.0 mbar target 1 h 00 min shorter than A holds its 25.0 mbar target")


def test_best_per_figure_and_ties():
    a = _summary()
    b = _summary(usable_duration_s=9000.0, min_pressure_pa=1400.0, time_to_target_s=None)
    best = best_of(["A", "B"], [a, b])
    assert best["usable_duration_s"] == "B" and best["min_pressure_pa"] == "B"
    assert best["time_to_target_s"] == "A"  # never reaching ranks last
    assert best["pump_heat_w"] is None  # all tie: no best
    assert winners(["A", "B"], [a, b])["pump_heat_w"] == []
    assert set(best) == {k for k, _, better, _ in FIGURES if better}


@pytest.mark.parametrize("seconds, words", [(40, "40 s"), (184, "3 min 04 s"), (2880, "48 min"), (3900, "1 h 05 min"), (-2880, "48 min")])
def test_duration_words(seconds, words):
    assert duration_words(seconds) == words  # derived


def test_variant_names_are_unique():
    class S:
        def __init__(self, name):
            self.name = name

    assert variant_names([S("a"), S("b"), S("a")]) == ["a", "b", "a#2"]


def test_iced_water_against_chilled_glycol():
    cmp = compare([SCENARIOS / "bench-iced.toml", SCENARIOS / "glycol-chilled.toml"], jobs=1)
    assert cmp.names == ["bench-iced", "glycol-chilled"]
    # a 25 wt% EG mix chilled below 0 degC has a lower water vapor pressure than iced water near 0 degC
    # (water activity < 1: Fujita & Kikuchi 1989, Trans. JSRAE 6(2), 183; and a colder tub), so a
    # lower floor: the glycol tub bottoms out lower
    assert cmp.best["min_pressure_pa"] == "glycol-chilled"
    assert cmp.summaries[1]["min_tub_temperature_k"] < 273.15
    data = cmp.to_json()
    assert [v["variant"] for v in data["variants"]] == cmp.names
    assert {"usable_duration_s", "min_pressure_pa", "warnings"} <= set(data["variants"][0])
    assert data["differences"] and all("glycol-chilled" in line and "bench-iced" in line for line in data["differences"])


def test_compare_at_a_common_target_and_its_figure():
    from vacsim.report.sweep_plots import compare_figure

    cmp = compare([SCENARIOS / "bench-iced.toml", SCENARIOS / "bench-tap-water.toml"], hold=2000.0, jobs=2)
    assert all(s["target_pressure_pa"] == 2000.0 for s in cmp.summaries)
    fig = compare_figure(cmp.names, cmp.results)
    ax_p, ax_t = fig.axes
    assert ax_p.get_yscale() == "log" and ax_p.get_ylabel() == "apparatus pressure [mbar]"
    assert ax_t.get_xlabel() == "time [min]" and ax_t.get_ylabel() == "tub temperature [°C]"
    assert len(ax_t.get_lines()) == 2 and len(ax_p.get_lines()) == 3  # two variants, one shared target line
    assert [t.get_text() for t in ax_t.get_legend().get_texts()] == cmp.names
    import matplotlib.pyplot as plt

    plt.close(fig)


def test_one_file_is_not_a_comparison():
    with pytest.raises(InputError, match="two or more"):
        compare([SCENARIOS / "bench-iced.toml"])


def test_table_marks_the_best_value_in_plain_text():
    # a pipe has no color: the best value carries a character (the table's own contract)
    import io
    from types import SimpleNamespace

    from rich.console import Console

    from vacsim.cli.compare_cmd import BEST_MARK, comparison_table

    a, b = _summary(), _summary(min_pressure_pa=1200.0, ice_gone_s=None)
    names = ["A", "B"]
    cmp = SimpleNamespace(names=names, summaries=[a, b], winners=winners(names, [a, b]))
    out = Console(file=io.StringIO(), width=200, force_terminal=False, color_system=None, record=True)
    out.print(comparison_table(cmp))
    text = out.export_text()
    row = next(line for line in text.splitlines() if "lowest pressure" in line)
    assert f"{BEST_MARK} 12.0 mbar" in row and f"{BEST_MARK} 15.0 mbar" not in row  # derived: 1200 Pa < 1500 Pa
    assert f"marks the best" in text
    tie = next(line for line in text.splitlines() if "motive flow" in line)
    assert BEST_MARK not in tie  # equal values: nothing is best
    assert "last ice gone after" in text
