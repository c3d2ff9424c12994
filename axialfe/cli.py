"""The command line: thin typer commands over the library.

Each command reads a model, calls the library and prints.  Errors of the user's
input (the :class:`~axialfe.errors.AxialfeError` family) print one line,
``error: ...``, to stderr and exit with code 2; anything else is a bug and keeps
its traceback.  Heavy imports stay inside the commands that need them.
"""

from __future__ import annotations

import contextlib
import sys
from enum import Enum
from pathlib import Path
from typing import Annotated, Optional

import typer

from .errors import AxialfeError

app = typer.Typer(add_completion=False, no_args_is_help=True,
                  help="Axially loaded bars and assemblies by the direct stiffness method.")

EXIT_INPUT = 2

# The reader itself reports a missing or unreadable file, on one line like every input error.
ModelPath = Annotated[Path, typer.Argument(help="The model file (TOML).")]


class Format(str, Enum):
    table = "table"
    json = "json"
    csv = "csv"
    markdown = "markdown"


ForceUnit = Annotated[Optional[str], typer.Option("--force-unit", help="Unit of forces, e.g. kN, lbf.")]
LengthUnit = Annotated[Optional[str], typer.Option("--length-unit", help="Unit of positions and lengths.")]
DispUnit = Annotated[Optional[str], typer.Option("--displacement-unit", help="Unit of displacements, e.g. mm, in.")]
StressUnit = Annotated[Optional[str], typer.Option("--stress-unit", help="Unit of stresses, e.g. MPa, ksi.")]
Output = Annotated[Optional[Path], typer.Option("--output", "-o", dir_okay=False,
                                                help="Write to this file instead of the terminal.")]


@contextlib.contextmanager
def user_errors():
    """Turn the project's errors into one line on stderr and exit code 2."""
    try:
        yield
    except AxialfeError as exc:
        typer.echo(f"error: {exc}", err=True)
        raise typer.Exit(EXIT_INPUT) from None


def output_units(model, force=None, length=None, displacement=None, stress=None):
    """The model's output units with the command line's overrides, each checked."""
    from .errors import UnitError
    from .units import OutputUnits

    base = model.units.as_dict()
    for key, value in (("force", force), ("length", length), ("displacement", displacement),
                       ("stress", stress)):
        if value:
            try:
                OutputUnits(**{**base, key: value})
            except UnitError as exc:
                raise UnitError(f"--{key}-unit: {exc.message}") from None
            base[key] = value
    return OutputUnits(**base)


def emit(text: str, output: Path | None):
    if output is None:
        typer.echo(text, nl=False)
    else:
        try:
            output.write_text(text, encoding="utf-8")
        except OSError as exc:
            from .errors import ModelError

            raise ModelError(f"cannot write the output file: {exc}", file=str(output)) from exc
        typer.echo(f"wrote {output}", err=True)


@app.command()
def solve(model: ModelPath,
          format: Annotated[Format, typer.Option("--format", "-f", help="Output format.")] = Format.table,
          output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Solve a model: displacements, segment forces and stresses, reactions, gaps."""
    from .modelfile import read_model
    from .output import render
    from .solve import solve as run

    with user_errors():
        m = read_model(model)
        units = output_units(m, force_unit, length_unit, displacement_unit, stress_unit)
        solution = run(m)
        emit(render(solution, format.value, units), output)


@app.command()
def init(path: Annotated[Path, typer.Argument(dir_okay=False, help="Where to write the starter model.")],
         force: Annotated[bool, typer.Option("--force", help="Overwrite an existing file.")] = False):
    """Write a commented starter model that solves as it is."""
    from importlib import resources

    with user_errors():
        if path.exists() and not force:
            from .errors import ModelError

            raise ModelError("the file exists already; use --force to overwrite it", file=str(path))
        text = resources.files("axialfe").joinpath("data/starter.toml").read_text(encoding="utf-8")
        path.write_text(text, encoding="utf-8")
        typer.echo(f"wrote {path}; solve it with: axialfe solve {path}")


@app.command()
def materials():
    """List the built-in materials, their values and sources."""
    from .modelfile import _builtin_table

    for name, entry in _builtin_table().items():
        typer.echo(f"{name}: {entry.get('description', '')}")
        for key in ("elastic_modulus", "thermal_expansion", "yield_strength", "density"):
            typer.echo(f"    {key:18s} {entry.get(key, '(not given)')}")
        typer.echo(f"    source             {entry['source']}")
    typer.echo("\nA model's own [materials] entry of the same name takes precedence. Values are "
               "typical: verify against your material certificate.")


class SweepFormat(str, Enum):
    table = "table"
    json = "json"
    csv = "csv"


@app.command()
def sweep(model: ModelPath,
          temperature_change: Annotated[Optional[str], typer.Option(
              "--temperature-change", help="Range of the change, e.g. '-40 K..120 K': replaces "
              "every segment's thermal input.")] = None,
          temperature: Annotated[Optional[str], typer.Option(
              "--temperature", help="Range of absolute temperature against "
              "settings.reference_temperature, e.g. '-20 degC..150 degC'.")] = None,
          load_factor: Annotated[Optional[str], typer.Option(
              "--load-factor", help="Range of the factor on point and distributed loads, e.g. "
              "'0..2'.")] = None,
          steps: Annotated[int, typer.Option("--steps", help="Grid points, both ends included.")] = 101,
          case: Annotated[Optional[str], typer.Option("--case", help="Case to sweep (default: the first).")] = None,
          format: Annotated[SweepFormat, typer.Option("--format", "-f", help="Output format.")] = SweepFormat.table,
          output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Solve a case along a temperature or load range and report the exact events."""
    from .errors import ModelError
    from .modelfile import read_model
    from .sweep import parse_range, sweep as run
    from .sweepout import sweep_csv, sweep_json, sweep_summary

    with user_errors():
        given = [(p, v) for p, v in (("temperature_change", temperature_change),
                                     ("temperature", temperature), ("load_factor", load_factor))
                 if v is not None]
        if len(given) != 1:
            raise ModelError("give exactly one of --temperature-change, --temperature or "
                             "--load-factor")
        parameter, text = given[0]
        start, stop, unit = parse_range(text, parameter)
        m = read_model(model)
        units = output_units(m, force_unit, length_unit, displacement_unit, stress_unit)
        result = run(m, parameter, start, stop, steps, unit=None if unit == "1" else unit, case=case)
        long = steps * max(len(m.segments), 1) > 200_000 and format is not SweepFormat.table
        if format is SweepFormat.table:
            text_out = sweep_summary(result, units)
        elif format is SweepFormat.json:
            text_out = sweep_json(result, units, progress=long)
        else:
            text_out = sweep_csv(result, units, progress=long)
        emit(text_out, output)


def main():  # pragma: no cover - entry point
    app(prog_name="axialfe")


if __name__ == "__main__":  # pragma: no cover
    main()
