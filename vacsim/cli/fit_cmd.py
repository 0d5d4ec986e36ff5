"""`vacsim fit`: calibrate a scenario to a logged run; table, fit.png, fit.json, calibrated file.

A thin skin: parse the options, load the scenario and the log, fit (vacsim.analysis.fit),
print a table in the trade's units, write the files. Heavy imports happen inside the command
so `vacsim --help` stays fast.
"""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, print_safety


def _free_keys(free: list[str] | None) -> tuple[str, ...]:
    """--free values; each may also hold comma-separated keys."""
    from ..analysis.fit import DEFAULT_FREE, free_parameter

    if not free:
        return DEFAULT_FREE
    keys = tuple(dict.fromkeys(k.strip() for item in free for k in item.split(",") if k.strip()))
    for key in keys:
        free_parameter(key)
    return keys


def _pm(value: float, stderr: float) -> str:
    from ..units import format_plus_minus

    return format_plus_minus(value, stderr, ".4g", unknown=" ± ?")


def fit_table(fit, unit: str = "mbar"):
    """The fitted values as a rich table, in the trade's units."""
    from rich.table import Table

    from ..analysis.fit import FITTABLE

    table = Table(title="fitted parameters", title_justify="left")
    table.add_column("scenario key", style="bold")
    table.add_column("start", justify="right")
    table.add_column("fitted ± standard error", justify="right")
    table.add_column("unit")
    rows = [(k, fit.start[k], fit.values[k], fit.stderr[k], "") for k in fit.keys]
    rows += [(k, v["start"], v["value"], v["stderr"], " (this run)") for k, v in fit.nuisance.items()]
    for key, start, value, stderr, what in rows:
        scale, offset, unit_label = FITTABLE[key].display_scale(unit)
        table.add_row(key + what, f"{start * scale + offset:.4g}", _pm(value * scale + offset, stderr * scale), unit_label)
    return table


def correlation_table(fit):
    from rich.table import Table

    table = Table(title="correlation of the fitted values", title_justify="left")
    table.add_column("")
    for k in fit.keys:
        table.add_column(k.split(".")[-1], justify="right")
    for i, a in enumerate(fit.keys):
        table.add_row(a, *(f"{fit.correlation[i, j]:+.2f}" for j in range(len(fit.keys))))
    return table


@app.command("fit")
def fit(
    scenario: Annotated[Path, typer.Argument(help="Scenario file (TOML) of the rig; its values are the start.")],
    log: Annotated[Path, typer.Argument(help="Logged run (CSV): time_* plus pressure_*, vacuum_*, boiling_* and/or tub_* columns.")],
    free: Annotated[
        Optional[list[str]],
        typer.Option("--free", help="Scenario key to fit (repeat, or comma-separate); default: ejector.entrainment_ratio, apparatus.leak_rate, tub.ua."),
    ] = None,
    save: Annotated[Optional[Path], typer.Option("--save", help="Write the calibrated scenario (base = the scenario, fitted keys, \\[fitted] table) here.")] = None,
    compound: Annotated[Optional[str], typer.Option("--compound", help="Liquid boiling at the still head, for a boiling_* column (e.g. water).")] = None,
    set_: Annotated[Optional[list[str]], typer.Option("--set", help="Override a key for this fit's run (not written to --save): --set tub.ice='1 kg'.")] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    out: Annotated[Optional[Path], typer.Option("--out", help="Folder for fit.png and fit.json (default results/fit-<log name>/).")] = None,
    as_json: Annotated[bool, typer.Option("--json", help="Print fit.json's object to stdout.")] = False,
) -> None:
    """Calibrate the rig to a logged run: fit entrainment ratio, leak and tub UA (or --free keys) with standard errors."""
    import json

    from rich.markup import escape

    from ..analysis.fit import fit_scenario, undetermined_keys, write_calibrated
    from ..logs import read_log
    from ..report.files import json_safe, output_directory, save_figure_atomic, write_text_atomic
    from ..scenario import load_scenario

    unit = check_pressure_unit(units)
    keys = _free_keys(free)
    s = load_scenario(scenario, set_ or [])
    run_log = read_log(log, barometric_pressure=s.barometric_pressure)
    result = fit_scenario(
        s, run_log, keys, compound=compound if compound is not None else _default_compound(s, run_log), units=unit
    )

    from ..report.fit_plots import fit_figure

    payload = result.to_dict()
    payload["scenario"] = str(scenario)
    payload["log"] = str(log)
    if save is not None:
        payload["calibrated"] = str(save)
        payload["notes"] += [f"{k} not written to {save}: the log does not determine it" for k in undetermined_keys(result)]
    target_dir = out if out is not None else Path("results") / (log.stem if log.stem.startswith("fit-") else f"fit-{log.stem}")
    fig = fit_figure(result, unit, title=f"{s.name} fitted to {log.name}", events=run_log.events)
    with output_directory(target_dir) as staging:
        save_figure_atomic(fig, staging / "fit.png")
        write_text_atomic(staging / "fit.json", json.dumps(json_safe(payload), indent=2) + "\n")
    written = [f"{target_dir}/fit.png", f"{target_dir}/fit.json"]
    if save is not None:
        write_calibrated(result, s, scenario, save, log_name=log.name)
        written.append(str(save))
    if as_json:
        emit_json(payload)
    else:
        console.print(fit_table(result, unit))
        if len(result.keys) > 1:
            console.print(correlation_table(result))
        console.print(
            f"weighted residual rms {result.residual_rms:.2f} (1 = the log's stated scatter) over "
            f"{result.n_observations} readings; {result.n_simulations} simulations; standard errors x{result.stderr_scale:.2f}",
            highlight=False,
        )
        for note in payload["notes"]:
            console.print(f"[dim]note: {escape(note)}[/dim]", highlight=False)
        for w in result.warnings:
            console.print(f"[bold yellow]warning[/bold yellow] ({w['code']}): {escape(w['message'])}", highlight=False)
        console.print("wrote " + ", ".join(written), highlight=False)
    print_safety()


def _default_compound(s, run_log) -> str | None:
    """A boiling column without --compound: the scenario's distillate, if it names one."""
    if run_log.boiling_temperature_k is None:
        return None
    return s.distillate
