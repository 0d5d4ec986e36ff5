"""The typer application object and what every command shares (console, JSON, errors)."""

from __future__ import annotations

import json
import sys

import typer
from rich.console import Console

app = typer.Typer(
    name="vacsim",
    help="Plan vacuum runs on a recirculating liquid-jet pump rig: pump-down, tub warm-up, ice budget.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)

console = Console()
err_console = Console(stderr=True)

SAFETY_LINES = (
    "Safety: inspect glassware for star cracks and shield it; vent before stopping the pump (suck-back); "
    "run vapors to a hood; treat tub water as chemical waste.",
    "Glycol is toxic; keep mains power away from the tub (RCD/GFCI). These figures are estimates: follow local codes and licensed practice.",
)

PRESSURE_UNIT_HELP = "Display unit for pressures: mbar, torr, pa, inhg or psi."


def emit_json(obj: dict) -> None:
    """Print one JSON object to stdout (the `--json` contract)."""
    from ..report.files import json_safe

    sys.stdout.write(json.dumps(json_safe(obj), indent=2) + "\n")
    sys.stdout.flush()


def check_pressure_unit(unit: str) -> str:
    from ..units import PRESSURE_UNITS
    from ..errors import InputError

    if unit.lower() not in PRESSURE_UNITS:
        raise InputError(f"--units: expected one of {', '.join(PRESSURE_UNITS)}, got {unit!r}")
    return unit.lower()


def print_safety() -> None:
    for line in SAFETY_LINES:
        err_console.print(f"[dim]{line}[/dim]")
