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

ModelPath = Annotated[Path, typer.Argument(exists=True, dir_okay=False, readable=True,
                                           help="The model file (TOML).")]


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
    """Solve a model: displacements, segment forces and stresses, reactions, gaps, checks."""
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


# --- design checks, diagrams and the report document ---------------------------
EXIT_FAIL = 1        # axialfe check: some check fails
EXIT_UNDECIDED = 3   # axialfe check: none fails, some need an engineer's review


class CheckFormat(str, Enum):
    table = "table"
    json = "json"


class ReportFormat(str, Enum):
    html = "html"
    markdown = "markdown"


def _pick_case(solution, name):
    return solution.cases[0] if name is None else solution[name]


@app.command()
def check(model: ModelPath,
          format: Annotated[CheckFormat, typer.Option("--format", "-f", help="Output format.")] = CheckFormat.table,
          output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Run the design checks (strength, buckling, limits) of every case.

    Exit code 0 when every check passes, 1 when any fails, 3 when none fails
    but some cannot be decided (an engineer must review them); 2 for bad input.
    """
    import json

    from .checks import check_solution
    from .modelfile import read_model
    from .output import CAUTIONS, checks_table
    from .solve import solve as run

    with user_errors():
        m = read_model(model)
        units = output_units(m, force_unit, length_unit, displacement_unit, stress_unit)
        report = check_solution(run(m), units)
        if format is CheckFormat.json:
            text = json.dumps({"title": m.title, "units": units.as_dict(),
                               "cases": [{"name": c.case, "checks": [e.to_dict() for e in c]}
                                         for c in report.cases],
                               "governing": report.governing_dict(), "status": report.status,
                               "cautions": list(CAUTIONS)}, indent=2) + "\n"
        else:
            text = checks_table(report, units, title=m.title)
        emit(text, output)
    raise typer.Exit(report.exit_code)


@app.command()
def plot(model: ModelPath,
         output: Annotated[Path, typer.Option("--output", "-o", dir_okay=False,
                                              help="The figure file: .png or .svg.")],
         what: Annotated[str, typer.Option("--what", help="force, stress, displacement or all.")] = "all",
         case: Annotated[Optional[str], typer.Option("--case", help="The case to draw (default: the first).")] = None,
         force_unit: ForceUnit = None, length_unit: LengthUnit = None,
         displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Draw the axial force, stress and displacement diagrams of one case."""
    from .errors import ModelError, suggest
    from .modelfile import read_model
    from .plot import WHAT, _suffix, plot_case
    from .solve import solve as run

    with user_errors():
        if what not in WHAT:
            raise ModelError(f"--what: unknown diagram '{what}'", hint=suggest(what, WHAT),
                             options=WHAT)
        _suffix(output)
        m = read_model(model)
        units = output_units(m, force_unit, length_unit, displacement_unit, stress_unit)
        result = _pick_case(run(m), case)
        plot_case(result, what, output, units)
        typer.echo(f"wrote {output}", err=True)


@app.command()
def report(model: ModelPath,
           output: Annotated[Path, typer.Option("--output", "-o", dir_okay=False,
                                                help="The report file: .html, or .md for Markdown.")],
           format: Annotated[Optional[ReportFormat], typer.Option(
               "--format", "-f", help="html or markdown (default: by the file's suffix).")] = None,
           force_unit: ForceUnit = None, length_unit: LengthUnit = None,
           displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Write a self-contained report: input, results, calculation sheet, checks, diagrams."""
    from .modelfile import read_model
    from .report import report_format, write_report
    from .solve import solve as run

    with user_errors():
        fmt = report_format(output, format.value if format else None)
        m = read_model(model)
        units = output_units(m, force_unit, length_unit, displacement_unit, stress_unit)
        write_report(run(m), output, fmt, units)
        typer.echo(f"wrote {output}", err=True)


def main():  # pragma: no cover - entry point
    app(prog_name="axialfe")


if __name__ == "__main__":  # pragma: no cover
    main()
