"""Regenerate the invented fit demo logs (run: python scenarios/logs/make_fit_demo_logs.py).

Every fit-*.csv written here is INVENTED demo data, not a measurement: a simulation of
scenarios/fit-demo-rig.toml with the "true" values below, read at the stated times with
Gaussian noise sigma = max(1 mbar, 2 % of p) on pressure and 0.3 K on temperatures (fixed
seeds). Fitting a log from the scenario's first-guess values should give the true values back
within their standard errors.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from vacsim.analysis.fit import log_times, synthetic_log_text
from vacsim.scenario import build_scenario, read_raw, set_key
from vacsim.simulation import simulate

HERE = Path(__file__).resolve().parent
RIG = HERE.parent / "fit-demo-rig.toml"

#: the values the invented logs were made with (the scenario file holds first guesses)
TRUTH = {
    "ejector.entrainment_ratio": 0.8,
    "apparatus.leak_rate": "0.15 mbar*L/s",
    "tub.ua": "4 W/K",
}
TRUTH_TEXT = "entrainment_ratio 0.8, leak_rate 0.15 mbar*L/s, tub ua 4 W/K"


def truth_run(extra: dict | None = None):
    raw = read_raw(RIG)
    for key, value in {**TRUTH, **(extra or {})}.items():
        raw = set_key(raw, key, value)
    return simulate(build_scenario(raw, "fit demo truth"), rtol=1e-8)


def _header(what: str, seed: int, try_line: str) -> str:
    return (
        f"INVENTED demo data, not a measurement: {what}\n"
        f"made by make_fit_demo_logs.py from scenarios/fit-demo-rig.toml with {TRUTH_TEXT};\n"
        f"noise sigma = max(1 mbar, 2 % of p) on pressure, 0.3 K on temperatures; seed {seed}\n"
        f"try: {try_line}"
    )


def gauge_demo() -> None:
    """Gauge and tub thermometer over 3 h, 0.5 kg of ice added at 90 min."""
    result = truth_run({"schedule": [{"at": "90 min", "add_ice": "0.5 kg"}]})
    times = log_times(3 * 3600.0)
    text = synthetic_log_text(
        result, times, seed=61,
        header_comment=_header("gauge (mbar) and tub thermometer, 0.5 kg ice added at 90 min", 61,
                               "vacsim fit scenarios/fit-demo-rig.toml scenarios/logs/fit-gauge-demo.csv"),
        events={90 * 60.0: "ice added 0.5 kg"},
    )
    (HERE / "fit-gauge-demo.csv").write_text(text)


def head_temperature_demo() -> None:
    """No gauge: the still head's temperature over boiling water (pot boils below 150 mbar) and the tub."""
    result = truth_run()
    times = log_times(3 * 3600.0)
    text = synthetic_log_text(
        result, times, seed=62, pressure=False, boiling_compound="water", boiling_below=150e2,
        header_comment=_header("no gauge; head temperature over boiling water (blank until the pot boils) and tub", 62,
                               "vacsim fit scenarios/fit-demo-rig.toml scenarios/logs/fit-head-temperature-demo.csv --compound water"),
    )
    (HERE / "fit-head-temperature-demo.csv").write_text(text)


def short_demo() -> None:
    """A 20 min gauge log with no tub thermometer: too short to say anything about the tub's UA."""
    result = truth_run({"run.duration": "20 min"})
    times = np.arange(0.0, 20 * 60.0 + 1.0, 30.0)
    text = synthetic_log_text(
        result, times, seed=63, tub=False,
        header_comment=_header("20 min of gauge readings every 30 s, no tub thermometer (UA cannot be fitted)", 63,
                               "vacsim fit scenarios/fit-demo-rig.toml scenarios/logs/fit-short-demo.csv"),
    )
    (HERE / "fit-short-demo.csv").write_text(text)


if __name__ == "__main__":
    gauge_demo()
    head_temperature_demo()
    short_demo()
