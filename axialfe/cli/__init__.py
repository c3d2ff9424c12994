"""The command line (typer): ``app`` and its entry point ``main``."""

from .app import app, main
from . import joint as _joint  # noqa: F401  (registers `axialfe joint` on the app)

__all__ = ["app", "main"]
