"""`vacsim ice`: the least ice (or the top-up plan) that holds the target pressure for the run."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer
from rich.table import Table

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety


def plan_table(plan, unit: str = "mbar") -> Table:
    """The ice plan's figures as a rich table."""
    from ..units import format_duration, format_pressure

    name = plan.scenario.name if plan.scenario is not None else ""
    title = f"{name}: ice to hold {format_pressure(plan.target_pressure_pa, unit)}"
    table = Table(title=title, show_header=False, title_justify="left")
    table.add_column("figure", style="bold")
    table.add_column("value")
    if not plan.feasible:
        table.add_row("answer", "[bold red]not possible[/bold red]")
        table.add_row("why", plan.reason)
        table.add_row("best achievable pressure", format_pressure(plan.best_pressure_pa, unit))
        return table
    if plan.mode == "initial":
        table.add_row("ice at the start", f"[bold]{plan.ice_kg:.2f} kg[/bold]")
    else:
        table.add_row("ice at the start", f"{plan.initial_ice_kg:.2f} kg (fixed)")
        table.add_row(f"top up every {format_duration(plan.top_up_every_s)}", f"[bold]{plan.ice_kg:.2f} kg[/bold]" if plan.ice_kg > 0 else "none needed")
        table.add_row("ice in all", f"{plan.total_ice_kg:.2f} kg")
    table.add_row("solved to", f"± {plan.tolerance_kg * 1000:.0f} g ({plan.simulations} runs)")
    table.add_row("target first reached", format_duration(plan.hold_from_s))
    table.add_row("held until", format_duration(plan.hold_until_s))
    table.add_row("lowest pressure", format_pressure(plan.best_pressure_pa, unit))
    if plan.result is not None:
        gone = plan.result.summary["ice_gone_s"]
        # with top-ups the run's figure is the last melt-out, after the last addition
        label = "last ice gone after" if plan.mode == "top-up" and len(plan.schedule) > 1 else "ice gone after"
        table.add_row(label, format_duration(gone) if gone is not None else ("not gone" if plan.total_ice_kg else "no ice"))
    if plan.free_volume_m3 is not None:
        table.add_row("ice volume / free volume", f"{plan.ice_volume_m3 * 1e3:.2f} L / {plan.free_volume_m3 * 1e3:.2f} L")
    return table


def schedule_table(plan) -> Table:
    """The schedule the user follows."""
    from ..units import format_duration

    table = Table(title="schedule", title_justify="left")
    table.add_column("at", justify="right")
    table.add_column("add ice", justify="right")
    for entry in plan.schedule:
        table.add_row(format_duration(entry["at_s"]) if entry["at_s"] > 0 else "start", f"{entry['ice_kg']:.2f} kg")
    return table


@app.command("ice")
def ice(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML).")],
    hold: Annotated[Optional[str], typer.Option("--hold", help="Pressure to hold instead of the scenario's target, e.g. '12 mbar'.")] = None,
    for_: Annotated[Optional[str], typer.Option("--for", help="Hold this long after first reaching it (e.g. '2 h') instead of to the end of the run.")] = None,
    top_up: Annotated[Optional[str], typer.Option("--top-up", help="Plan equal ice additions at this interval (e.g. '30 min'); the initial charge stays tub.ice.")] = None,
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key: --set tub.liquid_volume='15 L'.")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/<name>-ice/).")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    as_json: Annotated[bool, typer.Option("--json", help="Print the plan as JSON to stdout.")] = False,
) -> None:
    """Least ice that holds the target from when it is first reached to the end of the run
    (or --for), found over whole simulated runs to 1 % or 10 g; or a top-up schedule."""
    from ..analysis.ice_budget import solve_ice
    from ..report import plots
    from ..report.files import json_safe, output_directory
    from ..scenario import load_scenario
    from ..units import parse_quantity

    import json

    unit = check_pressure_unit(units)
    hold_pa = parse_quantity(hold, "pressure", where="--hold") if hold is not None else None
    for_s = parse_quantity(for_, "time", where="--for") if for_ is not None else None
    every_s = parse_quantity(top_up, "time", where="--top-up") if top_up is not None else None
    s = load_scenario(scenario, set_ or [])
    plan = solve_ice(s, hold=hold_pa, hold_for=for_s, top_up_every=every_s)
    target_dir = out if out is not None else Path("results") / f"{s.name}-ice"
    written = ["ice.json"]
    with output_directory(target_dir) as staging:
        (staging / "ice.json").write_text(json.dumps(json_safe(plan.to_json()), indent=2) + "\n", encoding="utf-8")
        if plan.result is not None:
            (staging / "timeseries.csv").write_text(plan.result.csv_text(), encoding="utf-8")
            plots.run_figures(plan.result, staging, unit)
            written += ["timeseries.csv", "pressure.png", "tub.png"]
    if as_json:
        emit_json(plan.to_json())
    else:
        console.print(plan_table(plan, unit))
        if plan.feasible:
            console.print(schedule_table(plan))
        for w in plan.warnings:
            console.print(f"[bold yellow]warning[/bold yellow] ({w['code']}): {w['message']}", highlight=False)
        console.print(f"wrote {target_dir}/: {', '.join(written)}", highlight=False)
    print_safety()
