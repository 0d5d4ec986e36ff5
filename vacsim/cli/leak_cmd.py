"""`vacsim leak`: read a rate-of-rise log, fit leak and levelling vapor, table + plot.

A thin skin: parse the options, read the log (vacsim.logs), fit (vacsim.analysis.leak),
print a table in the trade's units, write leak.png. Heavy imports (numpy, scipy,
matplotlib) happen inside the command so `vacsim --help` stays fast.
"""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json

# 1 L = 1e-3 m^3: throughput in <unit> L/s from Pa m^3/s
_LITRE = 1.0e-3


def _floor_cost(scenario: Path, leak_rate_pa_m3_s: float) -> float:
    """The rise of the rig's ultimate pressure the leak causes with that rig's pump [Pa]."""
    from ..analysis.leak_floor import floor_cost
    from ..errors import InputError

    if not scenario.is_file():
        raise InputError(f"--scenario: no such scenario file {str(scenario)!r}")
    return float(floor_cost(scenario, leak_rate_pa_m3_s))


def _pm(value: float, stderr: float, digits: str = ".3g") -> str:
    from ..units import format_plus_minus

    return format_plus_minus(value, stderr, digits)


@app.command("leak")
def leak(
    log: Annotated[Path, typer.Argument(help="Rate-of-rise log (CSV with time_* and pressure_* columns).")],
    volume: Annotated[str, typer.Option("--volume", help="Isolated volume: apparatus + hose + trap, e.g. '2.5 L'.")],
    barometric: Annotated[
        Optional[str],
        typer.Option("--barometric", help="Local barometric pressure, e.g. '1013 mbar' (for vacuum_* gauge columns)."),
    ] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    scenario: Annotated[
        Optional[Path],
        typer.Option("--scenario", help="Rig scenario: also report the floor pressure this leak costs with its pump."),
    ] = None,
    out: Annotated[
        Optional[Path], typer.Option("--out", help="Folder for leak.png (default results/leak-<logname>/).")
    ] = None,
    json_out: Annotated[bool, typer.Option("--json", help="Print one JSON object instead of the table.")] = False,
) -> None:
    """Rate-of-rise leak test: fit the linear leak and the levelling vapor part of a logged rise."""
    from ..logs import read_log
    from ..units import PRESSURE_LABELS, format_pressure, parse_quantity, throughput_in, throughput_label
    from ..errors import InputError

    unit = check_pressure_unit(units)
    volume_m3 = parse_quantity(volume, "volume", where="--volume")
    if not volume_m3 > 0:
        raise InputError(f"--volume: must be positive, got {volume!r}")
    baro = None if barometric is None else parse_quantity(barometric, "pressure", where="--barometric")
    run = read_log(log, barometric_pressure=baro)
    if run.pressure_pa is None:
        raise InputError(f"{log}: no pressure column; a leak test needs pressure_* or vacuum_* readings")

    from ..analysis.leak import fit_rate_of_rise

    result = fit_rate_of_rise(run.time_s, run.pressure_pa, volume_m3, units=unit)

    floor_cost_pa = None
    if scenario is not None:
        floor_cost_pa = _floor_cost(scenario, result.leak_rate_pa_m3_s)

    out_dir = out if out is not None else Path("results") / f"leak-{log.stem}"
    plot_path = out_dir / "leak.png"
    from ..report.files import save_figure_atomic
    from ..report.leak_plots import plot_leak

    fig = plot_leak(run.time_s, run.pressure_pa, result, unit, title=f"rate-of-rise test: {log.name}")
    save_figure_atomic(fig, plot_path)

    if json_out:
        emit_json(
            {
                "leak_rate_pa_m3_s": result.leak_rate_pa_m3_s,
                "leak_rate_stderr_pa_m3_s": result.leak_rate_stderr_pa_m3_s,
                "vapor_rise_pa": result.vapor_rise_pa,
                "time_constant_s": result.time_constant_s,
                "floor_cost_pa": floor_cost_pa,
                "warnings": result.warnings,
                "model": result.model,
                "p0_pa": result.p0_pa,
                "vapor_share": result.vapor_share,
                "residual_rms_pa": result.residual_rms_pa,
                "stderr_basis": result.stderr_basis,
                "volume_m3": result.volume_m3,
                "plot": str(plot_path),
            }
        )
        return

    from rich.table import Table

    label = PRESSURE_LABELS[unit]
    table = Table(title=f"Rate-of-rise test: {log.name}", title_justify="left")
    table.add_column("quantity")
    table.add_column("value", justify="right")
    table.add_row(
        "leak rate",
        _pm(throughput_in(result.leak_rate_pa_m3_s, unit), throughput_in(result.leak_rate_stderr_pa_m3_s, unit))
        + f" {throughput_label(unit)}",
    )
    if result.model == "levelling":
        table.add_row(
            "vapor / outgassing rise",
            _pm(result.vapor_rise_pa / _unit_pa(unit), result.vapor_rise_stderr_pa / _unit_pa(unit)) + f" {label}",
        )
        table.add_row(
            "levelling time constant",
            _pm(result.time_constant_s / 60.0, result.time_constant_stderr_s / 60.0) + " min",
        )
        table.add_row("vapor share of the rise", f"{100 * result.vapor_share:.0f} %")
    else:
        table.add_row("vapor / outgassing rise", "none resolved (straight-line fit)")
    table.add_row("pressure at start", format_pressure(result.p0_pa, unit))
    table.add_row("volume", f"{result.volume_m3 / _LITRE:.3g} L")
    table.add_row("log", f"{result.n_points} readings over {result.duration_s / 60:.1f} min")
    table.add_row("residual rms", format_pressure(result.residual_rms_pa, unit))
    if floor_cost_pa is not None:
        table.add_row("floor raised by the leak", format_pressure(floor_cost_pa, unit))
    console.print(table)
    console.print(f"[dim]standard errors: {result.stderr_basis}[/dim]")
    for w in result.warnings:
        at = "" if w["time_s"] is None else f" (at {w['time_s'] / 60:.1f} min)"
        console.print(f"[yellow]warning[/yellow] {w['code']}: {w['message']}{at}", highlight=False)
    console.print(f"plot: {plot_path}", highlight=False)


def _unit_pa(unit: str) -> float:
    from ..units import PRESSURE_UNITS

    return PRESSURE_UNITS[unit]
