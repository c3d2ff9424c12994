"""The ``axialfe joint`` command: one bolted joint, its states, checks and temperature sweep."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .app import (CheckFormat, ForceUnit, LengthUnit, Output, StressUnit, app, checks_exit, emit,
                  output_units, user_errors)

__all__ = ["joint"]

JointPath = Annotated[Path, typer.Argument(help="The joint file (TOML).")]


@app.command()
def joint(path: JointPath,
          format: Annotated[CheckFormat, typer.Option("--format", "-f", help="Output format.")] = CheckFormat.table,
          sweep: Annotated[Optional[str], typer.Option(
              "--sweep", help="Sweep the temperature of one service state, e.g. "
              "'-40 degC..150 degC'; the events are exact.")] = None,
          state: Annotated[Optional[str], typer.Option(
              "--state", help="The service state to sweep (default: the first).")] = None,
          part: Annotated[Optional[str], typer.Option(
              "--part", help="Sweep only this part ('bolt' or a clamped part's name); the "
              "others keep the state's temperatures.")] = None,
          steps: Annotated[int, typer.Option("--steps", help="Grid points of a sweep, both ends "
                                                             "included.")] = 21,
          output: Output = None,
          plot: Annotated[Optional[Path], typer.Option(
              "--plot", dir_okay=False, help="Also draw the joint diagram (with --sweep: the "
              "forces against the temperature, events marked), .png or .svg.")] = None,
          force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          stress_unit: StressUnit = None):
    """Solve a bolted joint: bolt and clamped-part stiffness, every state, the checks.

    Exit code 0 when every check passes, 1 when any fails, 3 when none fails
    but some cannot be decided; 2 for bad input.  With --sweep the events are
    reported and the exit code is 0.
    """
    from ..errors import ModelError
    from ..joints import solve_joint, sweep_joint
    from ..output.jointtext import joint_json, joint_table, sweep_json, sweep_table
    from ..tracking.sweep import parse_range

    with user_errors():
        if plot is not None:
            from ..output.plot import _suffix

            _suffix(plot)  # a wrong suffix is refused before any work
        from ..joints.reader import read_joint_toleranced

        j, found, _ = read_joint_toleranced(path)
        if found:
            from ..io.modelfile import tolerance_note

            typer.echo(tolerance_note(found, "joint"), err=True)
        units = output_units(j, force_unit, length_unit, None, stress_unit)
        if sweep is None:
            for flag, value in (("--state", state), ("--part", part)):
                if value is not None:
                    raise ModelError(f"{flag} belongs to a sweep: give --sweep as well")
            result = solve_joint(j)
            emit(joint_json(result, units) if format is CheckFormat.json
                 else joint_table(result, units), output)
            code = checks_exit(result.checks)
            if plot is not None:
                from ..output.jointplot import plot_joint

                plot_joint(result, plot, units)
                typer.echo(f"wrote {plot}", err=True)
        else:
            try:
                start, stop, unit = parse_range(sweep, "temperature")
                result = sweep_joint(j, start, stop, steps, unit=unit, state=state, part=part)
            except ModelError as exc:
                if exc.place == "--temperature":
                    raise ModelError(exc.message, place="--sweep") from None
                raise
            emit(sweep_json(result, units) if format is CheckFormat.json
                 else sweep_table(result, units), output)
            if plot is not None:
                from ..output.jointplot import plot_joint_sweep

                plot_joint_sweep(result, plot, units)
                typer.echo(f"wrote {plot}", err=True)
            code = 0
    raise typer.Exit(code)

