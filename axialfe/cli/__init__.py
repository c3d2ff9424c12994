"""The command line (typer): ``app`` and its entry point ``main``.

``app`` holds the model commands; ``joint`` adds ``axialfe joint``, ``plastic`` adds ``collapse`` and
``path`` and ``tolerance`` adds ``axialfe tolerance`` to it when imported.
"""

from . import joint, plastic, tolerance
from .app import app, main

__all__ = ["app", "main", "joint", "plastic", "tolerance"]
