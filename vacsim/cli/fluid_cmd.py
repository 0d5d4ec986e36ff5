"""`vacsim fluid`: properties of the tub liquid (water or a water-glycol mix) at one temperature.

A thin skin: parse the options, validate them, call vacsim.properties.fluid, print a rich
table or one JSON object. Numerical imports happen inside the command so `vacsim --help`
stays fast.
"""

from __future__ import annotations

from typing import Annotated, Optional

import typer

from .app import PRESSURE_UNIT_HELP, app, check_pressure_unit, console, emit_json, err_console

_TOP_TEMPERATURE = 373.15  # K: top of the liquid-property correlations (Melinder 2010; IAPWS SR6-08 to 383 K)


def _degc(value_k: float) -> str:
    return f"{round(value_k - 273.15, 2):g} degC"


def _validate(glycol: str, mass_fraction: Optional[float]) -> float:
    """Check --glycol and --mass-fraction; return the mass fraction to use."""
    from ..errors import InputError
    from ..properties.fluid import GLYCOL_KINDS, MAX_MASS_FRACTION

    if glycol not in GLYCOL_KINDS:
        raise InputError(f"--glycol: unknown glycol {glycol!r}; expected one of {', '.join(GLYCOL_KINDS)}")
    if mass_fraction is None:
        if glycol != "none":
            raise InputError(
                f"--mass-fraction: needed with --glycol {glycol} (glycol mass fraction 0..{MAX_MASS_FRACTION:g}, e.g. 0.3)"
            )
        return 0.0
    if not 0.0 <= mass_fraction <= MAX_MASS_FRACTION:
        raise InputError(
            f"--mass-fraction: {mass_fraction:g} is outside 0..{MAX_MASS_FRACTION:g} "
            f"(mass fraction 0..{MAX_MASS_FRACTION:g}, e.g. 0.3 for 30 wt%)"
        )
    if glycol == "none" and mass_fraction != 0.0:
        raise InputError(f"--mass-fraction: {mass_fraction:g} given without --glycol ethylene|propylene")
    return float(mass_fraction)


def _mix_name(glycol: str, mass_fraction: float) -> str:
    """The tub liquid's name for titles: 'water' or '30 wt% ethylene glycol' (glycol mass fraction)."""
    if glycol == "none" or mass_fraction == 0:
        return "water"
    return f"{100 * mass_fraction:.4g} wt% {glycol} glycol"


@app.command("fluid")
def fluid(
    at: Annotated[str, typer.Option("--at", help="Liquid temperature, e.g. '20 degC', '68 degF', '293.15 K'.")],
    glycol: Annotated[str, typer.Option("--glycol", help="Glycol in the water: none, ethylene or propylene.")] = "none",
    mass_fraction: Annotated[
        Optional[float],
        typer.Option("--mass-fraction", help="Glycol mass fraction 0..0.6 (0.3 = 30 wt%)."),
    ] = None,
    units: Annotated[str, typer.Option("--units", help=PRESSURE_UNIT_HELP)] = "mbar",
    as_json: Annotated[bool, typer.Option("--json", help="Print one JSON object (SI units) instead of a table.")] = False,
) -> None:
    """Vapor pressure, water activity, freezing point, density, heat capacity and viscosity of the tub liquid."""
    import warnings

    from rich.table import Table

    from ..errors import InputError
    from ..properties import fluid as props
    from ..units import format_pressure, format_temperature, parse_quantity

    unit = check_pressure_unit(units)
    glycol = glycol.strip().lower()
    w = _validate(glycol, mass_fraction)
    temperature = parse_quantity(at, "temperature", where="--at")
    name = _mix_name(glycol, w)
    t_freeze = float(props.freezing_point(glycol, w))
    if temperature < t_freeze - 1e-9:
        raise InputError(
            f"--at: {_degc(temperature)} is below the freezing point of {name} ({t_freeze - 273.15:.1f} degC)"
        )
    if temperature > _TOP_TEMPERATURE:
        raise InputError(
            f"--at: {_degc(temperature)} is above {_degc(_TOP_TEMPERATURE)}, the top of the liquid-property correlations"
        )

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        values = {
            "vapor_pressure_pa": float(props.vapor_pressure(glycol, w, temperature)),
            "water_activity": float(props.water_activity(glycol, w, temperature)),
            "freezing_point_k": t_freeze,
            "density_kg_m3": float(props.density(glycol, w, temperature)),
            "heat_capacity_j_kg_k": float(props.heat_capacity(glycol, w, temperature)),
            "viscosity_pa_s": float(props.viscosity(glycol, w, temperature)),
            "thermal_conductivity_w_m_k": float(props.thermal_conductivity(glycol, w, temperature)),
        }
    notes = sorted({str(item.message) for item in caught})

    if as_json:
        emit_json({"glycol": glycol, "mass_fraction": w, "temperature_k": temperature, **values})
        for note in notes:
            err_console.print(f"note: {note}", markup=False, highlight=False)
        return

    table = Table(title=f"{name} at {format_temperature(temperature)}")
    table.add_column("Property")
    table.add_column("Value", justify="right")
    table.add_row("Vapor pressure", format_pressure(values["vapor_pressure_pa"], unit))
    table.add_row("Water activity", f"{values['water_activity']:.4f}")
    table.add_row("Freezing point", format_temperature(t_freeze))
    table.add_row("Density", f"{values['density_kg_m3']:.2f} kg/m³")
    table.add_row("Heat capacity", f"{values['heat_capacity_j_kg_k']:.0f} J/(kg·K)")
    table.add_row("Viscosity", f"{values['viscosity_pa_s'] * 1e3:.4g} mPa·s")
    table.add_row("Thermal conductivity", f"{values['thermal_conductivity_w_m_k']:.4f} W/(m·K)")
    console.print(table)
    for note in notes:
        err_console.print(f"note: {note}", markup=False, highlight=False)
