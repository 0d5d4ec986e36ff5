"""`vacsim run` (placeholder until the rig model lands)."""

from .app import app


@app.command("version")
def version() -> None:
    """Print the vacsim version."""
    from .. import __version__

    print(__version__)
