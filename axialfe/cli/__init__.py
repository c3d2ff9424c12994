"""The command line (typer): ``app`` and its entry point ``main``."""

from .app import app, main

__all__ = ["app", "main"]
