"""The ``axialfe collapse`` and ``axialfe path`` commands: beyond linear elastic."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .app import (CheckFormat, DispUnit, ForceUnit, LengthUnit, ModelPath, Output, StressUnit,
                  app, emit, load, outputs, user_errors)

__all__ = ["collapse", "path"]


@app.command()
def collapse(model: ModelPath,
             case: Annotated[Optional[str], typer.Option(
                 "--case", help="The case (required when there are several).")] = None,
             format: Annotated[CheckFormat, typer.Option("--format", "-f",
                                                         help="Output format.")] = CheckFormat.table,
             output: Output = None, force_unit: ForceUnit = None):
    """The collapse load factor of a case by limit analysis, with its mechanism.

    With properties against temperature the yield strengths are those at each
    segment's temperature in the case.
    """
    from ..output.plastictext import collapse_json, collapse_table
    from ..plastic import collapse as run

    with user_errors(model):
        outputs([model], ("--output", output))
        m, units = load(model, force_unit)
        result = run(m, case)
        emit(collapse_json(result, units) if format is CheckFormat.json
             else collapse_table(result, units), output)


@app.command()
def path(model: ModelPath,
         path: Annotated[str, typer.Option(
             "--path", help="Legs separated by ';', e.g. 'load 0..1; temperature-change 0 K..150 K; "
             "temperature-change 150 K..0 K' (load, temperature-change, temperature-factor, "
             "temperature).")],
         case: Annotated[Optional[str], typer.Option(
             "--case", help="The case (required when there are several).")] = None,
         cycles: Annotated[Optional[int], typer.Option(
             "--cycles", help="Run legs --cycle-from to the last this many times, and say "
             "whether they shake down, alternate or ratchet.")] = None,
         cycle_from: Annotated[Optional[int], typer.Option(
             "--cycle-from", help="The first leg of the cycle (default 1).")] = None,
         format: Annotated[CheckFormat, typer.Option("--format", "-f",
                                                     help="Output format.")] = CheckFormat.table,
         output: Output = None,
         plot: Annotated[Optional[Path], typer.Option(
             "--plot", dir_okay=False, help="Also draw the forces of the plastic segments and "
             "the gaps against the path, events marked (.png or .svg).")] = None,
         force_unit: ForceUnit = None, length_unit: LengthUnit = None,
         displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Follow a case along a load and temperature path with elastic-plastic segments.

    The events are exact; after a collapse the path stops (exit code 0).  Properties
    given against temperature are followed: on legs that move the temperatures the
    events are found by root-finding between the table entries.
    """
    from ..output.plastictext import path_json, path_table
    from ..tracking.plastic import parse_path, track_path

    with user_errors(model):
        outputs([model], ("--output", output), ("--plot", plot))
        if plot is not None:
            from ..output.plot import _suffix

            _suffix(plot)
        legs, groups = parse_path(path, cycles, cycle_from)
        m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit)
        result = track_path(m, legs, case, groups)
        emit(path_json(result, units) if format is CheckFormat.json
             else path_table(result, units), output)
        if plot is not None:
            from ..output.plasticplot import plot_path

            plot_path(result, plot, units)
            typer.echo(f"wrote {plot}", err=True)
