"""`vacsim sweep`: run a scenario across one or two parameters; table, sweep.csv, sweep.png."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer
from rich.markup import escape
from rich.table import Table

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety


def _header(key: str, keys: list[str], unit: str) -> str:
    """A varied column's header: the field name in words and its display unit ('liquid volume
    (L)'); the section stays when two varied keys share a field name. The title names the keys."""
    from ..analysis.sweep import display_unit

    section, _, name = key.partition(".")
    shared = sum(k.partition(".")[2] == name for k in keys) > 1
    words = (f"{section} " if shared else "") + name.replace("_", " ")
    u = display_unit(key, unit)
    return f"{words} ({u})" if u else words


def sweep_table(sweep, unit: str = "mbar") -> Table:
    """One row per point: the varied values (in each key's display unit) and the key figures."""
    import itertools

    from ..analysis.sweep import format_value
    from ..units import format_duration, format_pressure

    target = format_pressure(sweep.target_pressure_pa, unit) if sweep.target_pressure_pa is not None else "target"
    title = f"{sweep.scenario}: sweep of {' × '.join(sweep.parameters)}"
    table = Table(title=escape(title), title_justify="left")
    shown = [sweep.display_values(j, unit) for j in range(len(sweep.varies))]
    # a word too long for a squeezed column folds onto the next line instead of ending in "…"
    for v in sweep.varies:
        table.add_column(escape(_header(v.key, sweep.parameters, unit)), justify="right", overflow="fold")
    warned = any("error" in p or p.get("warnings") for p in sweep.points)
    iced = any(p.get("ice_initial_kg") or p.get("ice_gone_s") is not None for p in sweep.points)
    names = [f"holds {target} for", "reached after", "lowest pressure"] + (["last ice gone"] if iced else []) + (["warnings"] if warned else [])
    for name in names:
        table.add_column(name, justify="right", overflow="fold")
    combos = itertools.product(*(range(len(v.values)) for v in sweep.varies))
    for combo, p in zip(combos, sweep.points):
        cells = [format_value(values[i]) for values, i in zip(shown, combo)]
        if "error" in p:
            cells += ["[red]solver failed[/red]", "-", "-"] + (["-"] if iced else []) + [escape(p["error"][:40])]
        else:
            cells += [
                format_duration(p["usable_duration_s"]) if p["usable_start_s"] is not None else "never reached",
                format_duration(p["time_to_target_s"]),
                format_pressure(p["min_pressure_pa"], unit),
            ] + (
                [format_duration(p["ice_gone_s"]) if p["ice_gone_s"] is not None else ("-" if not p.get("ice_initial_kg") else "not gone")]
                if iced else []
            ) + ([" ".join(sorted({w["code"] for w in p["warnings"]}))] if warned else [])
        table.add_row(*cells)
    return table


def print_wide(table) -> None:
    """Print a table at the console's width, or wider when it needs more and stdout is not a
    terminal (a pipe or file has no line to wrap, so headers need not be squeezed into stubs)."""
    from rich.console import Console
    from rich.measure import Measurement

    if not console.is_terminal:
        natural = Measurement.get(console, console.options.update(width=10_000), table).maximum
        if natural > console.width:
            # console.print(width=...) cannot exceed the console's own width: a wider one for this table
            Console(width=natural, color_system=console.color_system and "auto", highlight=False).print(table)
            return
    console.print(table)


def _steps_for(vary: list[str], steps: list[int] | None) -> list[int | None]:
    """Pair --steps with the --vary ranges: one value for all, or one per range in order."""
    from ..errors import InputError

    ranges = [i for i, text in enumerate(vary) if ".." in text]
    out: list[int | None] = [None] * len(vary)
    if not steps:
        return out
    if not ranges:
        raise InputError("--steps needs a range FROM..TO in --vary")
    if len(steps) not in (1, len(ranges)):
        raise InputError(f"--steps: give one value for every range or one per range ({len(ranges)}), got {len(steps)}")
    for n, i in enumerate(ranges):
        out[i] = steps[0] if len(steps) == 1 else steps[n]
    return out


@app.command("sweep")
def sweep(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML).")],
    vary: Annotated[list[str], typer.Option("--vary", help="KEY=FROM..TO, e.g. tub.ice=0..4kg; twice for a grid. KEY=a,b,c lists values.")],
    steps: Annotated[Optional[list[int]], typer.Option("--steps", help="Values across each FROM..TO, ends included (default 9); once for all ranges, or once per --vary range in order.")] = None,
    values: Annotated[Optional[str], typer.Option("--values", help="Explicit values a,b,c for a single --vary KEY.")] = None,
    jobs: Annotated[Optional[int], typer.Option("--jobs", help="Worker processes (default: all cores; 1: no pool).")] = None,
    progress: Annotated[Optional[bool], typer.Option("--progress/--no-progress", help="Progress bar on stderr (default: on a terminal).")] = None,
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key first: --set tub.ice='2 kg'.")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/<name>-sweep/).")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    as_json: Annotated[bool, typer.Option("--json", help="Print parameters and points as JSON to stdout.")] = False,
) -> None:
    """Run the scenario across one parameter (lines) or two (a heat-map of the usable duration);
    writes sweep.csv, sweep.json (with notes on what the sweep holds fixed) and sweep.png."""
    from ..analysis.sweep import parse_vary, run_sweep
    from ..errors import InputError
    from ..report.files import json_safe, output_directory
    from ..report.sweep_plots import save_sweep_figure

    import json

    unit = check_pressure_unit(units)
    for n in steps or []:
        if n < 2:
            raise InputError(f"--steps: expected 2 or more values across the range, got {n}")
    if steps and values is not None:
        raise InputError("give --steps or --values, not both")
    if values is not None and len(vary) != 1:
        raise InputError("--values: with two --vary give each its values inline (KEY=a,b,c)")
    per_vary = _steps_for(vary, steps) if values is None else [None] * len(vary)
    varies = [parse_vary(text, steps=n, values=values) for text, n in zip(vary, per_vary)]
    result = run_sweep(scenario, varies, overrides=set_ or [], jobs=jobs, progress=progress)
    target_dir = out if out is not None else Path("results") / f"{result.scenario}-sweep"
    with output_directory(target_dir) as staging:
        (staging / "sweep.csv").write_text(result.csv_text(), encoding="utf-8")
        (staging / "sweep.json").write_text(json.dumps(json_safe(result.to_json()), indent=2) + "\n", encoding="utf-8")
        save_sweep_figure(result, staging / "sweep.png", unit)
    if as_json:
        emit_json(result.to_json())
    else:
        for note in result.notes:
            console.print(f"[bold yellow]note[/bold yellow] {escape(note)}", highlight=False)
        print_wide(sweep_table(result, unit))
        console.print(f"wrote {target_dir}/: sweep.csv, sweep.json, sweep.png", highlight=False)
    print_safety()
