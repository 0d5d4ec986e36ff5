"""(placeholder: commands to come)."""
from .app import app  # noqa: F401
