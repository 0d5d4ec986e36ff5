"""`vacsim compare`: rig variants side by side, the best of each figure, differences in words."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer
from rich.table import Table

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety
from .sweep_cmd import print_wide


def _cell(kind: str, value, unit: str) -> str:
    from ..units import format_duration, format_pressure, format_temperature

    if value is None:
        return "-"
    if kind == "duration":
        return format_duration(value)
    if kind == "pressure":
        return format_pressure(value, unit)
    if kind == "temperature":
        return format_temperature(value)
    if kind == "flow":
        return f"{value * 6e4:.2f} L/min"
    if kind == "speed":
        return f"{value * 1e3:.3f} L/s"
    if kind == "power":
        return f"{value:.1f} W"
    return f"{value:.4g}"


#: Marks the best value of a figure in plain text, so it survives a pipe or a file (the green
#: of a terminal does not).
BEST_MARK = "*"


def comparison_table(comparison, unit: str = "mbar") -> Table:
    """Figures as rows, variants as columns; the best value of each figure marked with
    BEST_MARK (and bold green on a terminal)."""
    from ..analysis.compare import FIGURES

    table = Table(title=f"comparison ({BEST_MARK} marks the best of each figure)", title_justify="left")
    table.add_column("figure", style="bold")
    for name in comparison.names:
        table.add_column(name, justify="right")
    for key, label, better, kind in FIGURES:
        best = set(comparison.winners.get(key, []))
        row = []
        for name, summary in zip(comparison.names, comparison.summaries):
            value = summary.get(key)
            text = _cell(kind, value, unit)
            if key == "time_to_target_s" and value is None and summary["target_pressure_pa"] is not None:
                text = "never"
            if key == "ice_gone_s" and value is None:
                text = "not gone" if summary.get("ice_initial_kg") else "no ice"
            # the mark leads the value, so the right-aligned numbers stay aligned
            row.append(f"[bold green]{BEST_MARK} {text}[/bold green]" if name in best else text)
        table.add_row(label, *row)
    return table


@app.command("compare")
def compare(
    scenarios: Annotated[list[Path], typer.Argument(help="Two or more scenario files (the first is the reference).")],
    hold: Annotated[Optional[str], typer.Option("--hold", help="Compare at this target pressure instead of each file's own, e.g. '10 mbar'.")] = None,
    jobs: Annotated[Optional[int], typer.Option("--jobs", help="Worker processes (default: all cores; 1: no pool).")] = None,
    out: Annotated[Optional[Path], typer.Option("--out", help="Output folder (default results/<A>-vs-<B>-compare/).")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    as_json: Annotated[bool, typer.Option("--json", help="Print variants, best and differences as JSON to stdout.")] = False,
) -> None:
    """Simulate rig variants and set them side by side: table, overlaid plots (compare.png),
    and the differences against the first variant in words."""
    from ..analysis.compare import compare as run_compare
    from ..report.files import json_safe, output_directory
    from ..report.sweep_plots import save_compare_figure
    from ..units import parse_quantity

    import json

    unit = check_pressure_unit(units)
    hold_pa = parse_quantity(hold, "pressure", where="--hold") if hold is not None else None
    comparison = run_compare(scenarios, hold=hold_pa, jobs=jobs, unit=unit)
    target_dir = out if out is not None else Path("results") / ("-vs-".join(comparison.names) + "-compare")
    with output_directory(target_dir) as staging:
        (staging / "compare.json").write_text(json.dumps(json_safe(comparison.to_json()), indent=2) + "\n", encoding="utf-8")
        save_compare_figure(comparison.names, comparison.results, staging / "compare.png", unit)
    if as_json:
        emit_json(comparison.to_json())
    else:
        print_wide(comparison_table(comparison, unit))
        for line in comparison.differences:
            console.print(f"• {line}", highlight=False)
        for name, summary in zip(comparison.names, comparison.summaries):
            for w in summary["warnings"]:
                console.print(f"[bold yellow]warning[/bold yellow] {name} ({w['code']}): {w['message']}", highlight=False)
        console.print(f"wrote {target_dir}/: compare.json, compare.png", highlight=False)
    print_safety()
