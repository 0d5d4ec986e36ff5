"""`vacsim run`: simulate one scenario, print the summary, write the run's files."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer
from rich.table import Table

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety


def summary_table(summary: dict, unit: str = "mbar") -> Table:
    """The run's key figures as a rich table, in the trade's units."""
    from ..units import format_duration, format_pressure, format_temperature

    s = summary
    table = Table(title=f"{s['scenario']}", show_header=False, title_justify="left")
    table.add_column("figure", style="bold")
    table.add_column("value")
    target = s["target_pressure_pa"]
    rows = [
        ("target pressure", format_pressure(target, unit)),
        ("reaches target after", format_duration(s["time_to_target_s"]) if target is not None else "-"),
        ("holds target for", format_duration(s["usable_duration_s"]) if target is not None else "-"),
        ("usable window", f"{format_duration(s['usable_start_s'])} → {format_duration(s['usable_end_s'])}" if s["usable_start_s"] is not None else "-"),
        ("lowest pressure", format_pressure(s["min_pressure_pa"], unit)),
        ("ultimate at start (steady)", format_pressure(s["ultimate_pressure_start_pa"], unit)),
        ("pressure at end", format_pressure(s["final_pressure_pa"], unit)),
        ("tub temperature", f"{format_temperature(s['min_tub_temperature_k'])} … {format_temperature(s['max_tub_temperature_k'])} (end {format_temperature(s['final_tub_temperature_k'])})"),
        ("ice gone after", format_duration(s["ice_gone_s"]) if s["ice_initial_kg"] > 0 or s["ice_gone_s"] else "no ice"),
        ("motive flow", f"{s['motive_flow_m3_s'] * 6e4:.2f} L/min"),
        ("ejector speed at start", f"{s['ejector_speed_m3_s'] * 1e3:.3f} L/s ({s['ejector_speed_m3_s'] * 3600:.2f} m³/h)"),
        ("pump heat into tub", f"{s['pump_heat_w']:.1f} W"),
        ("run length", format_duration(s["duration_s"])),
    ]
    for name, value in rows:
        table.add_row(name, value)
    return table


def print_warnings(summary: dict) -> None:
    from ..units import format_duration

    for w in summary["warnings"]:
        when = f" at {format_duration(w['time_s'])}" if w.get("time_s") else ""
        console.print(f"[bold yellow]warning[/bold yellow] ({w['code']}{when}): {w['message']}", highlight=False)


@app.command("run")
def run(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML).")],
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key: --set tub.ice='3 kg'.")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/<name>/).")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    as_json: Annotated[bool, typer.Option("--json", help="Print summary.json's object to stdout.")] = False,
) -> None:
    """Simulate a run: pump-down, tub warm-up, usable window; writes timeseries.csv, summary.json and plots."""
    from ..report.files import output_directory
    from ..scenario import load_scenario
    from ..simulation import simulate

    unit = check_pressure_unit(units)
    s = load_scenario(scenario, set_ or [])
    result = simulate(s)
    target_dir = out if out is not None else Path("results") / s.name
    with output_directory(target_dir) as staging:
        (staging / "timeseries.csv").write_text(result.csv_text(), encoding="utf-8")
        (staging / "summary.json").write_text(result.summary_json(), encoding="utf-8")
        result.plot(staging)
    if as_json:
        emit_json(result.summary)
    else:
        console.print(summary_table(result.summary, unit))
        print_warnings(result.summary)
        console.print(f"wrote {target_dir}/: timeseries.csv, summary.json, pressure.png, tub.png", highlight=False)
    print_safety()
