"""`vacsim boil`: boiling point of a lab solvent at a pressure, or the pressure a boil implies.

    vacsim boil ethanol --at "40 mbar"        -> the temperature it boils at, 40 mbar over it
    vacsim boil water --observed "20 degC"    -> the pressure that boiling at 20 degC implies
                                                 (an estimate of the vacuum without a gauge)

A thin skin over :mod:`vacsim.properties.solvents`: parse, call, print.
"""

from __future__ import annotations

import math
import warnings
from typing import Optional

import typer

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, err_console


@app.command("boil")
def boil(
    compound: str = typer.Argument(..., help="Solvent name, alias or CAS number: water, ethanol, IPA, DCM, EtOAc, toluene..."),
    at: Optional[str] = typer.Option(None, "--at", help="Pressure over the liquid, with its unit: '23.4 mbar', '15 Torr'."),
    observed: Optional[str] = typer.Option(
        None, "--observed", help="Temperature at which the liquid is seen to boil: '20 degC', '68 degF'."
    ),
    units: str = typer.Option("mbar", "--units", help=PRESSURE_UNIT_HELP),
    json_output: bool = typer.Option(False, "--json", help="Print one JSON object instead of a table."),
) -> None:
    """Boiling temperature at a pressure (--at), or the pressure a boiling temperature implies (--observed)."""
    from ..errors import InputError
    from ..properties import solvents
    from ..properties._validity import OutOfRangeWarning
    from ..units import format_pressure, format_temperature, parse_quantity, pressure_in, PRESSURE_LABELS

    unit = check_pressure_unit(units)
    if (at is None) == (observed is None):
        raise InputError("give exactly one of --at PRESSURE (e.g. '23.4 mbar') or --observed TEMPERATURE (e.g. '20 degC')")
    chosen = solvents.get_compound(compound)
    corr = chosen.vapor_pressure

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", OutOfRangeWarning)
        if at is not None:
            pressure = parse_quantity(at, "pressure", where="--at")
            if pressure <= 0.0:
                raise InputError(f"--at: expected a positive absolute pressure, got {at!r}")
            temperature = float(solvents.boiling_temperature(chosen, pressure))
            mode = "at"
        else:
            temperature = parse_quantity(observed, "temperature", where="--observed")
            if temperature <= 0.0:
                raise InputError(f"--observed: expected a temperature above absolute zero, got {observed!r}")
            pressure = float(solvents.vapor_pressure(chosen, temperature))
            mode = "observed"
    if math.isnan(temperature) or math.isnan(pressure):  # no liquid-vapor solution
        raise InputError(
            f"{chosen.name}: no boiling point on its correlation for that input "
            f"(stated range {corr.t_min:g}..{corr.t_max:g} K; above the critical point there is no boiling)"
        )
    notes = [str(w.message) for w in caught if issubclass(w.category, OutOfRangeWarning)]
    in_range = corr.t_min <= temperature <= corr.t_max

    if json_output:
        emit_json(
            {
                "compound": chosen.name,
                "cas": chosen.cas,
                "mode": mode,
                "pressure_pa": pressure,
                "temperature_k": temperature,
                "temperature_c": temperature - 273.15,
                "pressure_display": pressure_in(pressure, unit),
                "units": PRESSURE_LABELS[unit],
                "source": corr.source,
                "correlation": corr.kind,
                "valid_range_k": [corr.t_min, corr.t_max],
                "in_range": in_range,
                "warnings": notes,
            }
        )
        return

    from rich.table import Table

    p_text = format_pressure(pressure, unit)
    t_text = format_temperature(temperature)
    if mode == "at":
        headline = f"{chosen.name} boils at {t_text} at {p_text}"
    else:
        headline = f"{chosen.name} boiling at {t_text} means about {p_text} over it"
    table = Table(title=headline, show_header=False, title_justify="left")
    table.add_column("", style="bold")
    table.add_column("")
    table.add_row("Compound", f"{chosen.name} (CAS {chosen.cas})")
    other = "mbar" if unit == "torr" else "torr"
    table.add_row("Pressure", f"{p_text}  ({format_pressure(pressure, other)}, {pressure:.5g} Pa)")
    table.add_row("Boiling temperature", f"{t_text}  ({temperature:.2f} K)")
    table.add_row("Vapor-pressure data", corr.source)
    table.add_row("Stated range", f"{format_temperature(corr.t_min)} to {format_temperature(corr.t_max)}")
    console.print(table)
    if mode == "observed":
        err_console.print(
            "[dim]No-gauge estimate: holds only if the liquid is pure, really boiling (not just degassing) "
            "and the thermometer reads the boiling liquid; dissolved air or solvent mixtures change it.[/dim]"
        )
    for note in notes:
        err_console.print(f"note: {note}", markup=False, highlight=False)
