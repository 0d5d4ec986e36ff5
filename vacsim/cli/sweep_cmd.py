"""`vacsim sweep`: run a scenario across one or two parameters; table, sweep.csv, sweep.png."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer
from rich.table import Table

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety


def sweep_table(sweep, unit: str = "mbar") -> Table:
    """One row per point: the varied values (in the user's units) and the key figures."""
    import itertools

    from ..units import format_duration, format_pressure

    target = format_pressure(sweep.target_pressure_pa, unit) if sweep.target_pressure_pa is not None else "target"
    table = Table(title=f"{sweep.scenario}: sweep of {' × '.join(sweep.parameters)}", title_justify="left")
    for v in sweep.varies:
        table.add_column(v.label, justify="right")
    for name in (f"holds {target} for", "reaches it after", "lowest pressure", "ice gone after", "warnings"):
        table.add_column(name, justify="right")
    combos = itertools.product(*(range(len(v.values)) for v in sweep.varies))
    for combo, p in zip(combos, sweep.points):
        cells = [f"{v.values[i]:.4g}" for v, i in zip(sweep.varies, combo)]
        if "error" in p:
            cells += ["[red]solver failed[/red]", "-", "-", "-", p["error"][:40]]
        else:
            cells += [
                format_duration(p["usable_duration_s"]) if p["usable_start_s"] is not None else "never reached",
                format_duration(p["time_to_target_s"]),
                format_pressure(p["min_pressure_pa"], unit),
                format_duration(p["ice_gone_s"]) if p["ice_gone_s"] is not None else ("-" if not p.get("ice_initial_kg") else "not gone"),
                " ".join(sorted({w["code"] for w in p["warnings"]})),
            ]
        table.add_row(*cells)
    return table


@app.command("sweep")
def sweep(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML).")],
    vary: Annotated[list[str], typer.Option("--vary", help="KEY=FROM..TO, e.g. tub.ice=0..4kg; twice for a grid. KEY=a,b,c lists values.")],
    steps: Annotated[Optional[int], typer.Option("--steps", help="Values across each FROM..TO, ends included (default 9).")] = None,
    values: Annotated[Optional[str], typer.Option("--values", help="Explicit values a,b,c for a single --vary KEY.")] = None,
    jobs: Annotated[Optional[int], typer.Option("--jobs", help="Worker processes (default: all cores; 1: no pool).")] = None,
    progress: Annotated[Optional[bool], typer.Option("--progress/--no-progress", help="Progress bar on stderr (default: on a terminal).")] = None,
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key first: --set tub.ice='2 kg'.")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/<name>-sweep/).")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    as_json: Annotated[bool, typer.Option("--json", help="Print parameters and points as JSON to stdout.")] = False,
) -> None:
    """Run the scenario across one parameter (lines) or two (a heat-map of the usable duration);
    writes sweep.csv, sweep.json and sweep.png."""
    from ..analysis.sweep import parse_vary, run_sweep
    from ..errors import InputError
    from ..report.files import json_safe, output_directory
    from ..report.sweep_plots import save_sweep_figure

    import json

    unit = check_pressure_unit(units)
    if steps is not None and steps < 2:
        raise InputError(f"--steps: expected 2 or more values across the range, got {steps}")
    if steps is not None and values is not None:
        raise InputError("give --steps or --values, not both")
    if values is not None and len(vary) != 1:
        raise InputError("--values: with two --vary give each its values inline (KEY=a,b,c)")
    varies = [parse_vary(text, steps=steps if ".." in text else None, values=values) for text in vary]
    result = run_sweep(scenario, varies, overrides=set_ or [], jobs=jobs, progress=progress)
    target_dir = out if out is not None else Path("results") / f"{result.scenario}-sweep"
    with output_directory(target_dir) as staging:
        (staging / "sweep.csv").write_text(result.csv_text(), encoding="utf-8")
        (staging / "sweep.json").write_text(json.dumps(json_safe(result.to_json()), indent=2) + "\n", encoding="utf-8")
        save_sweep_figure(result, staging / "sweep.png", unit)
    if as_json:
        emit_json(result.to_json())
    else:
        console.print(sweep_table(result, unit))
        console.print(f"wrote {target_dir}/: sweep.csv, sweep.json, sweep.png", highlight=False)
    print_safety()
