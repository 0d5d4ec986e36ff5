"""`[uncertain]` parsing and sampling, and the spread of runs (vacsim.analysis.uncertain/spread)."""

import math
from pathlib import Path

import numpy as np
import pytest

from vacsim.analysis.spread import FIGURES, censored_lower_bounds, figure_band, run_spread
from vacsim.analysis.uncertain import (
    Distribution,
    distributions_from_fit,
    key_info,
    parse_distribution,
    parse_uncertain,
    sample,
    scenario_distributions,
    unit_samples,
)
from vacsim.errors import InputError
from vacsim.scenario import load_scenario, raw_of

SCENARIOS = Path(__file__).parents[2] / "scenarios"
# Standard normal 95 % point: Abramowitz & Stegun (1964), Handbook of Mathematical Functions,
# Table 26.5 (percentage points of the normal distribution), Q(x) = 0.05 at x = 1.644854.
Z95 = 1.644854


def _iced(duration="4 h"):
    return load_scenario(SCENARIOS / "bench-iced-uncertain.toml", [f"run.duration={duration}"])


# ---- parsing --------------------------------------------------------------------------------


def test_kinds_come_from_the_schema():
    # kinds as declared in vacsim/scenario.py (Conductance, Length, Throughput, plain float)
    assert key_info("tub.ua").kind == "thermal conductance" and key_info("tub.ua").low == 0.0
    assert key_info("hose.length").kind == "length"
    assert key_info("apparatus.leak_rate").kind == "throughput"
    assert key_info("ejector.entrainment_ratio").kind is None and key_info("ejector.entrainment_ratio").high == 5.0
    assert key_info("run.ambient_temperature").kind == "temperature"


def test_units_are_read_per_key():
    d = parse_distribution("tub.ua", {"normal": ["4 W/K", "0.8 W/K"]})
    assert d.params == (4.0, 0.8)
    # 1 mbar L/s = 0.1 Pa m^3/s (DESIGN sec. 6: 1 Pa m^3/s = 10 mbar L/s)
    d = parse_distribution("apparatus.leak_rate", {"lognormal": ["0.01 mbar*L/s", 0.5]})
    assert d.params == pytest.approx((1e-3, 0.5))
    # a temperature's spread is a difference: 1 K, not 1 K absolute; 22 degC = 295.15 K (ITS-90 offset)
    d = parse_distribution("run.ambient_temperature", {"normal": ["22 degC", "1 K"]})
    assert d.params == pytest.approx((295.15, 1.0))
    d = parse_distribution("hose.length", {"triangular": ["50 cm", "1 m", "3 m"]})
    assert d.params == pytest.approx((0.5, 1.0, 3.0))


def test_nested_and_quoted_keys_are_the_same():
    nested = parse_uncertain({"tub": {"ua": {"uniform": ["2 W/K", "4 W/K"]}}})
    quoted = parse_uncertain({"tub.ua": {"uniform": ["2 W/K", "4 W/K"]}})
    assert nested == quoted


@pytest.mark.parametrize(
    "key, entry, message",
    [
        ("tub.uaa", {"normal": ["1 W/K", "0.1 W/K"]}, "did you mean ua"),
        ("tub.glycol", {"uniform": [0, 1]}, "not a single number"),
        ("tub.ua", {"normal": [4, 1]}, "with a unit"),
        ("tub.ua", {"normal": ["4 W/K"]}, "takes"),
        ("tub.ua", {"gauss": ["4 W/K", "1 W/K"]}, "expected exactly one of"),
        ("tub.ua", {"uniform": ["4 W/K", "2 W/K"]}, "increasing"),
        ("tub.ua", {"normal": ["4 W/K", "-1 W/K"]}, "negative"),
        ("hose.length", {"uniform": ["2 kg", "3 kg"]}, "length"),
        ("schedule.at", {"uniform": ["1 min", "2 min"]}, "unknown section"),
    ],
)
def test_bad_entries_are_one_line_errors(key, entry, message):
    with pytest.raises(InputError, match=message):
        parse_distribution(key, entry)


def test_fitted_table_gives_normals():
    dists = distributions_from_fit({"tub.ua": {"value": 3.2, "stderr": 0.4}, "ejector": {"entrainment_ratio": {"value": 0.9, "stderr": 0.05}}})
    assert [(d.key, d.name, d.params) for d in dists] == [("tub.ua", "normal", (3.2, 0.4)), ("ejector.entrainment_ratio", "normal", (0.9, 0.05))]
    # [uncertain] wins over [fitted] for the same key
    both = parse_uncertain({"tub.ua": {"uniform": ["2 W/K", "4 W/K"]}}, {"tub.ua": {"value": 3.2, "stderr": 0.4}})
    assert len(both) == 1 and both[0].name == "uniform"
    with pytest.raises(InputError, match="stderr"):
        distributions_from_fit({"tub.ua": {"value": 3.2}})


def test_fit_file_is_read(tmp_path):
    fit = tmp_path / "calibrated.toml"
    fit.write_text('[fitted]\n"tub.ua" = {value = 3.2, stderr = 0.4}\n', encoding="utf-8")
    raw = raw_of(_iced())
    dists = scenario_distributions(raw, fit)
    assert [d.key for d in dists] == ["tub.ua", "tub.ice", "hose.length"]  # tub.ua already in [uncertain]
    raw.pop("uncertain")
    assert [d.name for d in scenario_distributions(raw, fit)] == ["normal"]
    with pytest.raises(InputError, match="nothing to vary"):
        scenario_distributions(raw)


# ---- distributions and sampling -------------------------------------------------------------


def test_quantiles_of_the_distributions():
    normal = Distribution("tub.ua", "normal", (4.0, 0.8), 0.0, math.inf)
    # truncation at 0 moves the 5 % point by cdf(-5 sd) ~ 3e-7: negligible here
    assert normal.support() == pytest.approx((4.0 - Z95 * 0.8, 4.0 + Z95 * 0.8), rel=1e-5)
    # lognormal: the median is exp(mu) by definition; the 95 % point is median * exp(1.644854 sigma)
    logn = Distribution("apparatus.leak_rate", "lognormal", (1e-3, 0.5), 0.0, math.inf)
    assert logn.ppf(0.5) == pytest.approx(1e-3)
    assert logn.support()[1] == pytest.approx(1e-3 * math.exp(Z95 * 0.5), rel=1e-5)
    # triangular (a=0, c=0, b=1): F(x) = 1 - (1 - x)^2 (Evans, Hastings & Peacock, Statistical
    # Distributions, 3rd ed. 2000, ch. 40), so F = 0.75 at x = 0.5
    tri = Distribution("hose.length", "triangular", (0.0, 0.0, 1.0), 0.0, math.inf)
    assert tri.ppf(0.75) == pytest.approx(0.5)
    assert tri.support() == (0.0, 1.0)


def test_draws_stay_inside_the_keys_range():
    wide = Distribution("tub.ua", "normal", (1.0, 5.0), 0.0, math.inf)
    x = wide.ppf(np.linspace(0, 1, 1001))
    assert np.all(x > 0) and np.all(np.isfinite(x))


def test_latin_hypercube_fills_every_stratum():
    u = unit_samples(50, 3, seed=4, method="lhs")
    for col in u.T:  # one point per 1/n stratum (McKay et al. 1979)
        assert sorted(np.floor(col * 50).astype(int)) == list(range(50))


def test_same_seed_same_draws_and_zero_spread_is_a_point():
    dists = parse_uncertain({"tub.ua": {"normal": ["4 W/K", "0.8 W/K"]}, "tub.ice": {"uniform": ["1 kg", "1 kg"]}})
    a, b, c = sample(dists, 20, seed=3), sample(dists, 20, seed=3), sample(dists, 20, seed=4)
    assert np.array_equal(a, b) and not np.array_equal(a, c)
    assert np.all(a[:, 1] == 1.0)


def test_band_counts_and_ranks_none_last():
    # Hyndman & Fan (1996) definition 7 on 1..10: P10 = 1.9, P50 = 5.5, P90 = 9.1 (by hand)
    band = figure_band(np.arange(1.0, 11.0))
    assert (band["p10"], band["p50"], band["p90"], band["mean"], band["none"]) == pytest.approx((1.9, 5.5, 9.1, 5.5, 0))
    # two of ten never happen: ranked after 1..8, so P90 falls among them -> None
    band = figure_band(np.r_[np.arange(1.0, 9.0), np.nan, np.nan])
    assert band["p90"] is None and band["p50"] == pytest.approx(5.5) and band["mean"] == pytest.approx(4.5)
    assert band["count"] == 8 and band["none"] == 2


# ---- spreads of runs ------------------------------------------------------------------------


def test_zero_spread_collapses_onto_the_deterministic_run():
    s = _iced("3 h")
    dists = parse_uncertain({"tub.ua": {"normal": ["3 W/K", "0 W/K"]}, "hose.length": {"uniform": ["1.5 m", "1.5 m"]}})
    r = run_spread(s, samples=4, seed=1, distributions=dists, jobs=1)
    det = r.deterministic.summary  # reference: vacsim.simulation.simulate of the scenario as written
    for name in FIGURES:
        band = r.band(name)
        if det[name] is None:
            assert band["none"] == 4
        else:
            # melt-out: the batch has no terminal event, so the ice's cubic tail is located from
            # the dense solution (within 1 s, see tests/test_batch.py); the rest to 0.05 s / 1e-5
            tol = 1.0 if name == "ice_gone_s" else 0.05
            assert band["p10"] == pytest.approx(det[name], rel=1e-5, abs=tol)
            assert band["p90"] == pytest.approx(det[name], rel=1e-5, abs=tol)
    pb = r.pressure_band()
    p_det = np.interp(r.time_s, r.deterministic.time_s, r.deterministic.series["pressure_pa"])
    assert np.max(np.abs(pb[90] - pb[10]) / p_det) < 1e-9
    assert np.max(np.abs(pb[50] - p_det) / p_det) < 1e-4


def test_wider_ua_spread_widens_the_usable_band():
    s = _iced()
    width = []
    for sd in ("0.2 W/K", "0.8 W/K"):
        dists = parse_uncertain({"tub.ua": {"normal": ["3 W/K", sd]}})
        band = run_spread(s, samples=24, seed=5, method="lhs", distributions=dists, jobs=1).band("usable_duration_s")
        width.append(band["p90"] - band["p10"])
    assert width[1] > 2.0 * width[0] > 0


def test_same_seed_gives_identical_output_in_parallel():
    s = _iced("2 h")
    a = run_spread(s, samples=60, seed=11, jobs=2).to_json()  # three chunks over two workers
    b = run_spread(s, samples=60, seed=11, jobs=1).to_json()
    c = run_spread(s, samples=60, seed=12, jobs=1).to_json()
    assert a == b
    assert a["usable_duration_s"] != c["usable_duration_s"]
    assert a["samples"] == 60 and set(FIGURES) <= a.keys()


def test_unbatchable_keys_run_one_by_one_and_agree():
    s = _iced("1 h")
    dists = parse_uncertain({"tub.ua": {"uniform": ["2 W/K", "4 W/K"]}})
    batched = run_spread(s, samples=3, seed=2, distributions=dists, jobs=1)
    single = run_spread(s, samples=3, seed=2, distributions=dists, jobs=1, batch=False)
    assert batched.batched and not single.batched
    for name in ("usable_duration_s", "time_to_target_s", "min_pressure_pa"):
        assert batched.figures[name] == pytest.approx(single.figures[name], rel=1e-5, abs=0.05)
    # a key that changes the operating point cannot be batched: one full simulate per sample
    volume = parse_uncertain({"tub.liquid_volume": {"uniform": ["9 L", "11 L"]}})
    r = run_spread(s, samples=2, seed=2, distributions=volume, jobs=1)
    assert not r.batched and r.figures["min_pressure_pa"].shape == (2,)


def test_percentiles_among_runs_held_to_the_end_are_lower_bounds():
    # derived (Hyndman & Fan 1996 definition 7 on five values): P10 interpolates ranks 0-1,
    # P50 is rank 2, P90 interpolates ranks 3-4; only rank 4 (the largest) is cut by the run's end
    values = np.array([1.0, 2.0, 3.0, 4.0, 10.0])
    held = np.array([False, False, False, False, True])
    assert censored_lower_bounds(values, held) == {"p10": False, "p50": False, "p90": True, "mean": True}
    # a short hold that held to the end (reached late) ranks low and makes every percentile a bound
    held = np.array([True, False, False, False, False])
    assert censored_lower_bounds(values, held) == {"p10": True, "p50": True, "p90": True, "mean": True}
    assert censored_lower_bounds(values, np.zeros(5, bool)) == {"p10": False, "p50": False, "p90": False, "mean": False}


def test_spread_reports_which_usable_figures_are_lower_bounds():
    r = run_spread(_iced("4 h"), samples=12, seed=0, jobs=1)
    held = r.held_mask()
    assert held.sum() == r.held_to_end() > 0  # the 4 h demo: some samples hold to the end (seen in its spread)
    # a held sample's first window ends at the run's end (the definition of held_to_end)
    end = r.figures["time_to_target_s"] + r.figures["usable_duration_s"]
    assert end[held] == pytest.approx(np.full(held.sum(), 4 * 3600.0))
    bounds = r.lower_bounds("usable_duration_s")
    assert bounds["mean"] and bounds["p90"]
    data = r.to_json()["usable_duration_s"]
    assert data["lower_bound"] == bounds and data["held_to_end"] == held.sum()
    assert isinstance(data["p90"], float)  # the JSON stays numeric
    assert r.lower_bounds("min_pressure_pa") == {"p10": False, "p50": False, "p90": False, "mean": False}
