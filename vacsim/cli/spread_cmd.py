"""`vacsim spread` (uncertainty bands) and `vacsim sensitivity` (Morris screening)."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer
from rich.table import Table

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety
from .sweep_cmd import print_wide

_FIGURE_LABELS = {
    "usable_duration_s": "holds target for",
    "time_to_target_s": "reaches target after",
    "min_pressure_pa": "lowest pressure",
    "ice_gone_s": "last ice gone after",
}
#: Prefix of a figure that is only a lower bound (samples held the target to the end of the run).
AT_LEAST = "≥ "


def _format(name: str, value, unit: str) -> str:
    from ..units import format_duration, format_pressure

    if value is None:
        return "not in run"
    return format_pressure(value, unit) if name.endswith("_pa") else format_duration(value)


def load_with_fit(path: Path, overrides: list[str], fit: Path | None):
    """Load a scenario with its --set overrides; a calibrated file's own `[fitted]` table is read
    from the scenario itself (vacsim.analysis.uncertain.scenario_distributions)."""
    from ..scenario import apply_overrides, build_scenario, read_raw

    raw = read_raw(path)
    return build_scenario(apply_overrides(raw, overrides), source=str(path)), fit


def _deterministic_held(spread) -> bool:
    sm = spread.deterministic.summary
    end = sm.get("usable_end_s")
    return sm.get("usable_start_s") is not None and end is not None and end >= spread.scenario.run.duration - 1e-6


def spread_table(spread, unit: str = "mbar") -> Table:
    """P10/P50/P90, mean, samples without a value, and the deterministic run, per figure. A
    usable duration that samples held to the end of the run enter is a lower bound: '≥ ...'."""
    det = spread.deterministic.summary
    table = Table(title=f"{spread.scenario.name}: {spread.samples} samples ({spread.method.upper()}, seed {spread.seed})", title_justify="left")
    for col in ("figure", "P10", "P50", "P90", "mean", "none", "deterministic"):
        table.add_column(col, justify="left" if col == "figure" else "right")
    for name, label in _FIGURE_LABELS.items():
        b = spread.band(name)
        bound = spread.lower_bounds(name)
        cells = [(AT_LEAST if bound[k] and b[k] is not None else "") + _format(name, b[k], unit) for k in ("p10", "p50", "p90", "mean")]
        det_text = _format(name, det[name], unit)
        if name == "usable_duration_s" and _deterministic_held(spread):
            det_text = AT_LEAST + det_text
        table.add_row(label, *cells, str(b["none"]), det_text)
    return table


def held_note(spread) -> str | None:
    """The line under the table when samples held the target to the end of the run."""
    from ..units import format_duration

    held = spread.held_to_end()
    if not held:
        return None
    return (
        f"{held} of {spread.samples} samples held the target for the whole run (to {format_duration(spread.scenario.run.duration)}), "
        f"so their hold is cut by its end: a figure marked {AT_LEAST.strip()} includes them and is a lower bound "
        "(a longer run.duration gives the full spread)."
    )


def _samples_csv(spread) -> str:
    import csv
    import io

    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    keys = [d.key for d in spread.distributions]
    names = list(_FIGURE_LABELS)
    writer.writerow(["sample", *keys, *names])
    for i, row in enumerate(spread.values):
        figs = [spread.figures[n][i] for n in names]
        writer.writerow([i, *(f"{v:.10g}" for v in row), *("" if v != v else f"{v:.10g}" for v in figs)])
    return buf.getvalue()


@app.command("spread")
def spread(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML) with an \\[uncertain] section.")],
    samples: Annotated[int, typer.Option("--samples", help="Number of sampled runs.")] = 200,
    seed: Annotated[int, typer.Option("--seed", help="Random seed (same seed, same answer).")] = 0,
    method: Annotated[str, typer.Option("--method", help="Sampling: mc (Monte Carlo) or lhs (Latin hypercube).")] = "mc",
    jobs: Annotated[Optional[int], typer.Option("--jobs", help="Worker processes (default: all cores; 1: no pool).")] = None,
    fit: Annotated[Optional[Path], typer.Option("--fit", help="Calibrated scenario whose \\[fitted] standard errors add normal distributions.")] = None,
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key first: --set tub.ice='2 kg'.")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/spread-<name>/).")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    progress: Annotated[Optional[bool], typer.Option("--progress/--no-progress", help="Progress bar on stderr (default: on a terminal).")] = None,
    as_json: Annotated[bool, typer.Option("--json", help="Print the bands as JSON to stdout.")] = False,
) -> None:
    """Uncertainty bands: run the scenario over its \\[uncertain] inputs; P10/P50/P90 of the usable
    duration, time to target, lowest pressure and ice-gone time; writes spread.json, samples.csv,
    spread.png (fan chart) and usable-duration.png."""
    import json

    from ..analysis.spread import run_spread
    from ..errors import InputError
    from ..report.files import json_safe, output_directory
    from ..report.spread_plots import spread_figures

    unit = check_pressure_unit(units)
    if samples < 1:
        raise InputError(f"--samples: expected at least 1, got {samples}")
    s, fit = load_with_fit(scenario, set_ or [], fit)
    result = run_spread(s, samples=samples, seed=seed, method=method.lower(), fit_file=fit, jobs=jobs, progress=progress)
    target_dir = out if out is not None else Path("results") / f"spread-{s.name}"
    data = result.to_json()
    with output_directory(target_dir) as staging:
        (staging / "spread.json").write_text(json.dumps(json_safe(data), indent=2) + "\n", encoding="utf-8")
        (staging / "samples.csv").write_text(_samples_csv(result), encoding="utf-8")
        spread_figures(result, staging, unit)
    if as_json:
        emit_json(data)
    else:
        print_wide(spread_table(result, unit))
        console.print(
            f"{result.samples} runs in {result.timing['samples_s']:.1f} s ({'batched' if result.batched else 'one by one'}); "
            f"'none' = target never reached / ice not gone in the run, ranked after every value.",
            highlight=False,
        )
        note = held_note(result)
        if note:
            console.print(note, highlight=False)
        console.print(f"wrote {target_dir}/: spread.json, samples.csv, spread.png, usable-duration.png", highlight=False)
    print_safety()


def _range_text(key: str, low: float, high: float) -> str:
    """An input's screened range in its display unit: '2.4 … 3.6 W/K', '18 … 26 °C'."""
    from ..analysis.sweep import display_unit, format_value, to_display

    lo, hi = to_display(key, [low, high])
    unit = display_unit(key)
    return f"{format_value(lo)} … {format_value(hi)}" + (f" {unit}" if unit else "")


def sensitivity_table(result) -> Table:
    """Inputs ranked by Morris mu*: each range in its key's display unit, the effects in minutes
    of usable duration over that range."""
    from rich.markup import escape

    table = Table(title=f"{result.scenario}: Morris screening of usable duration (r = {result.trajectories})", title_justify="left")
    for col in ("rank", "key", "range", "mu* [min]", "sigma [min]", "mu [min]"):
        table.add_column(escape(col), justify="left" if col in ("key", "range") else "right")
    for i, row in enumerate(result.ranking(), 1):
        table.add_row(
            str(i), row["key"], _range_text(row["key"], row["low"], row["high"]),
            f"{row['mu_star'] / 60:.1f}", f"{row['sigma'] / 60:.1f}", f"{row['mu'] / 60:+.1f}",
        )
    return table


@app.command("sensitivity")
def sensitivity(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML) with an \\[uncertain] section.")],
    trajectories: Annotated[int, typer.Option("--trajectories", help="Morris trajectories r (r x (inputs + 1) runs).")] = 10,
    seed: Annotated[int, typer.Option("--seed", help="Random seed of the trajectories.")] = 0,
    jobs: Annotated[Optional[int], typer.Option("--jobs", help="Worker processes (default: all cores; 1: no pool).")] = None,
    fit: Annotated[Optional[Path], typer.Option("--fit", help="Calibrated scenario whose \\[fitted] standard errors add inputs.")] = None,
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key first.")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/sensitivity-<name>/).")] = None,
    progress: Annotated[Optional[bool], typer.Option("--progress/--no-progress", help="Progress bar on stderr (default: on a terminal).")] = None,
    as_json: Annotated[bool, typer.Option("--json", help="Print method and ranking as JSON to stdout.")] = False,
) -> None:
    """Rank the \\[uncertain] inputs by their effect on the usable duration (Morris elementary
    effects, mu*); writes sensitivity.json and sensitivity.png."""
    import json

    from ..analysis.sensitivity import run_sensitivity
    from ..report.files import json_safe, output_directory
    from ..report.spread_plots import save_sensitivity_chart

    s, fit = load_with_fit(scenario, set_ or [], fit)
    result = run_sensitivity(s, trajectories=trajectories, seed=seed, fit_file=fit, jobs=jobs, progress=progress)
    target_dir = out if out is not None else Path("results") / f"sensitivity-{s.name}"
    data = result.to_json()
    with output_directory(target_dir) as staging:
        (staging / "sensitivity.json").write_text(json.dumps(json_safe(data), indent=2) + "\n", encoding="utf-8")
        save_sensitivity_chart(result, staging / "sensitivity.png")
    if as_json:
        emit_json(data)
    else:
        print_wide(sensitivity_table(result))
        console.print(
            "mu*: mean |elementary effect|, in minutes of usable duration across each input's range (normal/lognormal: "
            "5-95 % quantiles); sigma: non-linearity or interaction; mu: signed (+: a higher value holds longer).",
            highlight=False,
        )
        console.print(f"wrote {target_dir}/: sensitivity.json, sensitivity.png", highlight=False)
    print_safety()
