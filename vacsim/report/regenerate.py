"""Regenerate results/ from the demo scenarios: `python -m vacsim.report.regenerate`.

Each job is one vacsim command line; they run in order, each in a fresh interpreter, so a
failure names the command that failed. Outputs go to results/<name>/.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
SCENARIOS = ROOT / "scenarios"


def jobs() -> list[list[str]]:
    """The command lines that make results/ (without the leading 'vacsim')."""
    out = [["run", str(p.relative_to(ROOT)), "--out", f"results/{p.stem}"] for p in sorted(SCENARIOS.glob("*.toml"))]
    out += [list(job) for job in EXTRA_JOBS]
    return out


# Answers built on runs (planning, fits, uncertainty); each writes its own results folder.
EXTRA_JOBS: tuple[tuple[str, ...], ...] = (
    ("ice", "scenarios/bench-iced.toml", "--out", "results/bench-iced-ice"),
    ("ice", "scenarios/bench-iced.toml", "--set", "tub.ice=0.5 kg", "--top-up", "45 min", "--hold", "10 mbar", "--out", "results/bench-iced-top-up-plan"),
    ("sweep", "scenarios/bench-iced.toml", "--vary", "tub.ice=0..3kg", "--steps", "13", "--out", "results/bench-iced-sweep-ice"),
    ("sweep", "scenarios/bench-tap-water.toml", "--set", "tub.capacity=50 L", "--vary", "tub.liquid_volume=5..40L", "--steps", "8",
     "--vary", "run.ambient_temperature=18..30degC", "--steps", "7", "--out", "results/bench-tap-water-sweep-tub-room"),
    ("compare", "scenarios/bench-iced.toml", "scenarios/glycol-chilled.toml", "--out", "results/glycol-vs-ice"),
    ("compare", "scenarios/bench-iced.toml", "scenarios/glycol-chilled.toml", "--hold", "10 mbar", "--out", "results/glycol-vs-ice-10mbar"),
    ("compare", "scenarios/bench-tap-water.toml", "scenarios/big-tub.toml", "scenarios/bench-iced.toml", "--hold", "25 mbar", "--out", "results/tub-choices"),
    ("fit", "scenarios/fit-demo-rig.toml", "scenarios/logs/fit-gauge-demo.csv", "--out", "results/fit-gauge-demo", "--save", "results/fit-gauge-demo/calibrated.toml"),
    ("fit", "scenarios/fit-demo-rig.toml", "scenarios/logs/fit-head-temperature-demo.csv", "--compound", "water", "--out", "results/fit-head-temperature-demo", "--save", "results/fit-head-temperature-demo/calibrated.toml"),
    ("fit", "scenarios/fit-demo-rig.toml", "scenarios/logs/fit-short-demo.csv", "--out", "results/fit-short-demo", "--save", "results/fit-short-demo/calibrated.toml"),
    ("spread", "scenarios/bench-iced-uncertain.toml", "--samples", "1000", "--seed", "1", "--out", "results/spread-bench-iced"),
    ("sensitivity", "scenarios/bench-iced-uncertain.toml", "--out", "results/sensitivity-bench-iced"),
    ("leak", "scenarios/logs/leak-test-demo.csv", "--volume", "2.5 L", "--scenario", "scenarios/bench-tap-water.toml", "--out", "results/leak-test-demo"),
)


def main() -> int:
    for args in jobs():
        print("vacsim", " ".join(args), flush=True)
        done = subprocess.run([sys.executable, "-c", "from vacsim.cli import main; main()", *args], cwd=ROOT, capture_output=True, text=True)
        if done.returncode != 0:
            sys.stderr.write(done.stderr)
            return done.returncode
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
