"""Command-line skin: each command lives in its own module and registers on `app`."""

from __future__ import annotations

import sys

from .app import app, err_console

# Importing a command module registers its commands on `app`.
from . import boil_cmd  # noqa: F401,E402  boil
from . import fluid_cmd  # noqa: F401,E402  fluid
from . import run_cmd  # noqa: F401,E402  run
from . import leak_cmd  # noqa: F401,E402  leak
from . import ice_cmd  # noqa: F401,E402  ice
from . import sweep_cmd  # noqa: F401,E402  sweep
from . import compare_cmd  # noqa: F401,E402  compare
from . import fit_cmd  # noqa: F401,E402  fit
from . import spread_cmd  # noqa: F401,E402  spread, sensitivity


def main() -> None:
    """Console-script entry point: one-line errors and exit code 2 for bad input."""
    from ..errors import InputError, SolverError

    try:
        app()
    except InputError as exc:
        err_console.print(f"vacsim: error: {exc}", markup=False, highlight=False, soft_wrap=True)
        sys.exit(2)
    except SolverError as exc:
        err_console.print(f"vacsim: solver failed: {exc}", markup=False, highlight=False, soft_wrap=True)
        sys.exit(1)
