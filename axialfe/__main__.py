"""Run the command line as ``python -m axialfe``."""

from .cli import main

main()
