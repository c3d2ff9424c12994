"""The command line (typer): ``app`` and its entry point ``main``.

``app`` holds the model commands; ``joint`` adds ``axialfe joint`` and ``plastic`` adds ``collapse`` and
``path`` to it when imported.
"""

from . import joint, plastic
from .app import app, main

__all__ = ["app", "main", "joint", "plastic"]
