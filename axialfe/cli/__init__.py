"""The command line (typer): ``app`` and its entry point ``main``.

``app`` holds the model commands; ``joint`` adds ``axialfe joint`` to it when imported.
"""

from . import joint
from .app import app, main

__all__ = ["app", "main", "joint"]
