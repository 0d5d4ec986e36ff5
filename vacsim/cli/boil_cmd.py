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
    from rich.markup import escape

    from ..constants import ZERO_CELSIUS
    from ..units import PRESSURE_LABELS, format_temperature, parse_quantity, pressure_in

    unit = check_pressure_unit(units)
    if (at is None) == (observed is None):
        raise InputError("give exactly one of --at PRESSURE (e.g. '23.4 mbar') or --observed TEMPERATURE (e.g. '20 degC')")
    chosen = solvents.get_compound(compound)
    corr = chosen.vapor_pressure
    liquid = solvents.liquid_range(chosen)  # None where the source's range is only a fitted interval

    def p_text_of(value_pa: float) -> str:
        return _pressure_text(value_pa, unit)

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", OutOfRangeWarning)
        if at is not None:
            pressure = parse_quantity(at, "pressure", where="--at")
            if pressure <= 0.0:
                raise InputError(f"--at: expected a positive absolute pressure, got {at!r}")
            if liquid is not None and liquid.exact and pressure < liquid.triple_pressure:
                raise InputError(
                    f"--at {p_text_of(pressure)}: {chosen.name} does not boil below its triple-point pressure, "
                    f"{p_text_of(liquid.triple_pressure)} ({liquid.triple_source}): there the solid sublimes instead"
                )
            if liquid is not None and pressure > liquid.critical_pressure:
                raise InputError(
                    f"--at {p_text_of(pressure)}: {chosen.name} does not boil above its critical pressure, "
                    f"{p_text_of(liquid.critical_pressure)} ({liquid.critical_source}): there is no liquid-vapor boundary"
                )
            temperature = float(solvents.boiling_temperature(chosen, pressure))
            mode = "at"
        else:
            temperature = parse_quantity(observed, "temperature", where="--observed")
            if temperature <= 0.0:
                raise InputError(f"--observed: expected a temperature above absolute zero, got {observed!r}")
            if liquid is not None and temperature > liquid.critical_temperature:
                raise InputError(
                    f"--observed {format_temperature(temperature)}: {chosen.name} cannot boil above its critical "
                    f"temperature, {format_temperature(liquid.critical_temperature)} ({liquid.critical_source}): "
                    "there is no liquid-vapor boundary"
                )
            if liquid is not None and liquid.exact and temperature < liquid.triple_temperature - _ICE_POINT_SLACK - 1e-9:
                raise InputError(
                    f"--observed {format_temperature(temperature)}: {chosen.name} does not boil below its triple "
                    f"point, {liquid.triple_temperature - ZERO_CELSIUS:.2f} °C at {p_text_of(liquid.triple_pressure)} "
                    f"({liquid.triple_source}): there it is solid"
                )
            pressure = float(solvents.vapor_pressure(chosen, temperature))
            mode = "observed"
    if math.isnan(temperature) or math.isnan(pressure):  # no liquid-vapor solution
        raise InputError(
            f"{chosen.name}: no boiling point on its correlation for that input "
            f"(stated range {format_temperature(corr.t_min)} to {format_temperature(corr.t_max)}; "
            "above the critical point there is no boiling)"
        )
    notes = [str(w.message) for w in caught if issubclass(w.category, OutOfRangeWarning)]
    in_range = corr.t_min <= temperature <= corr.t_max
    # water outside its triple..critical range was refused above; the 0.01 K of slack needs no caution
    exact = liquid is not None and liquid.exact
    caution = None if in_range or exact else _caution(chosen.name, temperature, corr, liquid)

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
                "warnings": notes + ([caution] if caution is not None else []),
            }
        )
        return

    from rich.table import Table

    p_text = p_text_of(pressure)
    t_text = format_temperature(temperature)
    if mode == "at":
        headline = f"{chosen.name} boils at {t_text} at {p_text}"
    else:
        headline = f"{chosen.name} boiling at {t_text} means about {p_text} over it"
    if caution is not None:
        headline += " (extrapolated: see Caution)"
    table = Table(title=headline, show_header=False, title_justify="left")
    table.add_column("", style="bold")
    table.add_column("")
    table.add_row("Compound", f"{chosen.name} (CAS {chosen.cas})")
    other = "mbar" if unit == "torr" else "torr"
    table.add_row("Pressure", f"{p_text}  ({_pressure_text(pressure, other)}, {pressure:.5g} Pa)")
    table.add_row("Boiling temperature", f"{t_text}  ({temperature:.2f} K)")
    table.add_row("Vapor-pressure data", corr.source)
    table.add_row("Stated range", f"{format_temperature(corr.t_min)} to {format_temperature(corr.t_max)}")
    if caution is not None:
        table.add_row("[bold red]Caution[/bold red]", f"[bold red]{escape(caution)}[/bold red]")
    console.print(table)
    if mode == "observed":
        err_console.print(
            "[dim]No-gauge estimate: holds only if the liquid is pure, really boiling (not just degassing) "
            "and the thermometer reads the boiling liquid; dissolved air or solvent mixtures change it.[/dim]"
        )
    if caution is None:  # the range notes are in SI; the Caution row says the same in display units
        for note in notes:
            err_console.print(f"note: {note}", markup=False, highlight=False)


# 0 degC, the ice point at 1 atm, lies 0.01 K below water's triple point (ITS-90 / IAPWS R14-08):
# still read as liquid
_ICE_POINT_SLACK = 0.01  # K


def _pressure_text(value_pa: float, unit: str) -> str:
    """Display text of a pressure; three significant figures where the fixed decimals would show 0.00."""
    from ..units import format_pressure, format_pressure_sig, pressure_in

    return format_pressure(value_pa, unit) if abs(pressure_in(value_pa, unit)) >= 0.1 else format_pressure_sig(value_pa, unit)


def _caution(name: str, temperature: float, corr, liquid) -> str:
    """Why a boiling temperature outside the correlation's stated range is suspect, in °C."""
    from ..units import format_temperature

    low, high = format_temperature(corr.t_min), format_temperature(corr.t_max)
    if liquid is not None and temperature < corr.t_min:  # the range is the liquid range: below it, frozen
        return (
            f"below {low}, where its source's range starts (about {name}'s melting point): "
            f"{name} is probably frozen there and sublimes rather than boils; the value is extrapolated"
        )
    side = "below" if temperature < corr.t_min else "above"
    frozen = " (and the liquid may be frozen: its melting point is not on file)" if side == "below" else ""
    return f"{side} the correlation's fitted range ({low} to {high}): the value is extrapolated{frozen}"
