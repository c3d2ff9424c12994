"""The command line: thin typer commands over the library.

Each command reads a model, calls the library and prints.  Errors of the user's
input (the :class:`~axialfe.errors.AxialfeError` family) print one line,
``error: ...``, to stderr and exit with code 2; anything else is a bug and keeps
its traceback.  Heavy imports stay inside the commands that need them.
"""

from __future__ import annotations

import contextlib
import re
import sys
from enum import Enum
from pathlib import Path
from typing import Annotated, Optional

import typer

from ..errors import AxialfeError

app = typer.Typer(add_completion=False, no_args_is_help=True,
                  help="Axially loaded bars and assemblies by the direct stiffness method.")


def _show_version(value: bool):
    if value:
        from .. import __version__

        typer.echo(f"axialfe {__version__}")
        raise typer.Exit(0)


@app.callback()
def _main(version: Annotated[bool, typer.Option(
        "--version", callback=_show_version, is_eager=True,
        help="Print the version and exit.")] = False):
    """Axially loaded bars and assemblies by the direct stiffness method."""

EXIT_INPUT = 2
EXIT_INACCURATE = 4
# the exit code of a verdict: checks (and joints, fits) by their overall status, claims by
# whether any differs
EXIT_STATUS = {"pass": 0, "fail": 1, "undecided": 3}


def checks_exit(checks) -> int:
    """0 every check passes, 1 any fails, 3 none fails but some are undecided."""
    return EXIT_STATUS[checks.status]


MAX_STEPS = 100_000   # grid points of a sweep
CLOSED_FORM_SECONDS = 120   # the longest a closed form may take before it is refused


def check_count(option, value, most):
    """A count from the command line within its stated bounds."""
    if value > most:
        from ..errors import ModelError

        raise ModelError(f"must be at most {most}: got {value}", place=option)


def exit_if_inaccurate(items):
    """Exit with code 4 after the output when any result is inaccurate.

    ``items`` are ``(label, message)`` of the inaccurate cases or steps; one line
    on stderr names the first and counts the rest.
    """
    items = list(items)
    if items:
        label, message = items[0]
        more = f" (and {len(items) - 1} more)" if len(items) > 1 else ""
        from ..errors import one_line

        typer.echo(one_line(f"inaccurate: {label}{more}: {message}"), err=True)
        raise typer.Exit(EXIT_INACCURATE)

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


class TemperatureUnit(str, Enum):
    K = "K"
    degF = "degF"


TempUnit = Annotated[Optional[TemperatureUnit], typer.Option(
    "--temperature-unit", help="Unit of temperature changes: K, or degF (the US system's default).")]
Output = Annotated[Optional[Path], typer.Option("--output", "-o", dir_okay=False,
                                                help="Write to this file instead of the terminal.")]


@contextlib.contextmanager
def user_errors(source=None):
    """Turn the project's errors into one line on stderr and exit code 2.

    The numerics run with floating-point trouble raised, not warned: nothing but
    the one error line reaches stderr (see :mod:`axialfe.cli.guards`).
    """
    from .guards import numerics_guarded

    try:
        with numerics_guarded(source):
            yield
    except AxialfeError as exc:
        typer.echo(f"error: {exc}", err=True)
        raise typer.Exit(EXIT_INPUT) from None


def outputs(inputs, *named):
    """Check every output path a command was given before anything is read or written.

    ``named`` are ``(option, path)``; a path of None is not given.
    """
    from ..io.files import check_output

    given = [(o, p) for o, p in named if p is not None]
    for i, (option, path) in enumerate(given):
        check_output(path, [p for p in inputs if p is not None], option, others=given[:i])


def output_units(model, force=None, length=None, displacement=None, stress=None,
                 temperature=None):
    """The model's output units with the command line's overrides, each checked."""
    from ..errors import UnitError
    from ..units import OutputUnits

    base = model.units.as_dict()
    for key, value in (("force", force), ("length", length), ("displacement", displacement),
                       ("stress", stress), ("temperature", temperature)):
        if value:
            try:
                OutputUnits(**{**base, key: value})
            except UnitError as exc:
                raise UnitError(f"--{key}-unit: {exc.message}") from None
            base[key] = value
    return OutputUnits(**base)


def load(path, force=None, length=None, displacement=None, stress=None, temperature=None):
    """Read a model file and the units to report it in (the model's, with the overrides)."""
    from ..errors import ModelError
    from ..io.modelfile import read_model

    try:
        model = read_model(path)
    except ModelError:
        from ..fits.reader import is_fit_file

        if is_fit_file(path):  # looked at only when the file is not a model
            raise ModelError("this is a fit file (it has a [fit] table): check it with "
                             f"'axialfe fit {path}'", file=str(path)) from None
        raise
    if model.tolerances:
        from ..io.modelfile import tolerance_note

        typer.echo(tolerance_note(model.tolerances), err=True)
    return model, output_units(model, force, length, displacement, stress, temperature)


def stated_values(path, model, solution):
    """The review of the values the model file states ([[claims]]), or None when it states none."""
    from ..io.modelfile import states_claims

    if not states_claims(model, path):  # no claims: the review's modules are not loaded
        return None
    from ..io.claims import read_claims
    from ..review import verify

    claims = read_claims(path, model)
    return verify(model, claims, solution) if claims else None


def plastic_notes(solution, units):
    """Say on stderr what a linear solve leaves out of elastic-plastic materials."""
    from ..plastic.notes import linear_notes

    for note in linear_notes(solution, units):
        typer.echo(f"note: {note}", err=True)


def emit(text: str, output: Path | None):
    if output is None:
        typer.echo(text, nl=False)
    else:
        from ..io.files import write_text

        try:
            write_text(output, text)  # atomic: a failing write leaves the folder as it was
        except OSError as exc:
            from ..errors import ModelError

            raise ModelError(f"cannot write the output file: {exc}", file=str(output)) from exc
        typer.echo(f"wrote {output}", err=True)


@app.command()
def solve(model: ModelPath,
          format: Annotated[Format, typer.Option("--format", "-f", help="Output format.")] = Format.table,
          output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          displacement_unit: DispUnit = None, stress_unit: StressUnit = None,
          temperature_unit: TempUnit = None,
          envelope: Annotated[bool, typer.Option(
              "--envelope", help="List the envelope of every station, segment, reaction and "
              "gap over the cases (least and largest, with the case of each); without it a "
              "model of several cases gets a short summary.")] = False,
          brief: Annotated[bool, typer.Option(
              "--brief", help="Print only each case's reactions and notes, and the governing "
              "check (table format).")] = False):
    """Solve a model: displacements, segment forces and stresses, reactions, gaps, checks."""
    from .._gcpause import gc_paused
    from ..output.text import render
    from ..engine.system import solve as run

    # one pass over one model makes millions of small objects and no lasting cycles: the
    # cyclic collector would rescan them all many times over (a third of a big model's time)
    with user_errors(model), gc_paused():
        outputs([model], ("--output", output))
        m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit,
                        temperature_unit.value if temperature_unit else None)
        solution = run(m)
        from ..checks import check_solution
        from ..checks.assumptions import assumption_notes, model_warnings
        from ..envelope import envelope as envelope_of

        checks = check_solution(solution)
        # the envelope is shown by JSON always, by the others for several cases or --envelope
        shown = format.value == "json" or envelope or len(solution.cases) > 1
        emit(render(solution, format.value, units, checks=checks,
                    review=stated_values(model, m, solution),
                    envelope=envelope_of(solution) if shown else None,
                    full_envelope=envelope, notes=assumption_notes(solution), brief=brief,
                    warnings=model_warnings(solution)), output)
        plastic_notes(solution, units)
    exit_if_inaccurate((f"case '{c.name}'", c.message) for c in solution.inaccurate)


class Template(str, Enum):
    stepped_bar = "stepped-bar"
    bolt_sleeve = "bolt-sleeve"
    pipe_anchors = "pipe-anchors"


@app.command()
def init(path: Annotated[Path, typer.Argument(dir_okay=False, help="Where to write the starter model.")],
         template: Annotated[Template, typer.Option(
             "--template", help="The starter: stepped-bar (a stepped bar between walls, loaded and "
             "heated), bolt-sleeve (a bolt and sleeve with preload and temperature) or "
             "pipe-anchors (a pipe between anchors with a guide gap).")] = Template.stepped_bar,
         force: Annotated[bool, typer.Option("--force", help="Overwrite an existing file.")] = False):
    """Write a commented starter model that solves as it is."""
    from importlib import resources

    from ..io.files import write_text

    with user_errors():
        outputs([], ("PATH", path))
        if path.exists() and not force:
            from ..errors import ModelError

            raise ModelError("the file exists already; use --force to overwrite it", file=str(path))
        text = (resources.files("axialfe.cli").joinpath("templates", f"{template.value}.toml")
                .read_text(encoding="utf-8"))
        write_text(path, text)
        typer.echo(f"wrote {path}; solve it with: axialfe solve {path}")


class System(str, Enum):
    SI = "SI"
    US = "US"


@app.command()
def materials(model: Annotated[Optional[Path], typer.Argument(
                  help="A model file: show the values in its units (its \\[units] system and "
                  "stress unit).")] = None,
              system: Annotated[Optional[System], typer.Option(
                  "--system", help="Show the values in SI (MPa, /K, kg/m^3) or US customary "
                  "units (psi, /degF, lb/in^3).")] = None):
    """List the built-in materials, each value with its source."""
    from ..io.modelfile import _builtin_table
    from ..output.materialtext import materials_text
    from ..units import OutputUnits

    with user_errors(model):
        if model is not None:
            units = load(model)[1]
            if system is not None:
                units = OutputUnits.system(system.value)
        else:
            units = OutputUnits.system((system or System.SI).value)
        from ..output.text import terminal_width

        typer.echo(materials_text(_builtin_table(), units, terminal_width()), nl=False)


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
          temperature_factor: Annotated[Optional[str], typer.Option(
              "--temperature-factor", help="Range of the factor on the case's own temperature "
              "change of each segment, e.g. '0..1.5': scales, replaces nothing.")] = None,
          load_factor: Annotated[Optional[str], typer.Option(
              "--load-factor", help="Range of the factor on point and distributed loads, e.g. "
              "'0..2'.")] = None,
          segments: Annotated[Optional[str], typer.Option(
              "--segments", help="A temperature sweep acts on these segments only "
              "(NAME,NAME,...); the others keep the case's own temperature change.")] = None,
          steps: Annotated[int, typer.Option("--steps", help="Grid points, both ends included.")] = 101,
          case: Annotated[Optional[str], typer.Option("--case", help="Case to sweep (default: the first).")] = None,
          format: Annotated[SweepFormat, typer.Option("--format", "-f", help="Output format.")] = SweepFormat.table,
          output: Output = None,
          plot: Annotated[Optional[Path], typer.Option(
              "--plot", dir_okay=False, help="Also draw gap forces and segment stresses against "
              "the parameter, events marked (.png or .svg).")] = None,
          force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          displacement_unit: DispUnit = None, stress_unit: StressUnit = None,
          temperature_unit: TempUnit = None):
    """Solve a case along a temperature or load range and report the exact events."""
    import numpy as np

    from ..errors import ModelError
    from ..tracking.sweep import parse_range, sweep as run
    from ..output.sweeptext import sweep_csv, sweep_json, sweep_summary

    with user_errors(model):
        outputs([model], ("--output", output), ("--plot", plot))
        if plot is not None:
            from ..output.plot import _suffix

            _suffix(plot)  # a figure's format is checked before any output is written
        check_count("--steps", steps, MAX_STEPS)
        given = [(p, v) for p, v in (("temperature_change", temperature_change),
                                     ("temperature", temperature),
                                     ("temperature_factor", temperature_factor),
                                     ("load_factor", load_factor))
                 if v is not None]
        if len(given) != 1:
            raise ModelError("give exactly one of --temperature-change, --temperature, "
                             "--temperature-factor or --load-factor")
        parameter, text = given[0]
        start, stop, unit = parse_range(text, parameter)
        m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit,
                        temperature_unit.value if temperature_unit else None)
        from ..io.physical import check_sweep_range

        check_sweep_range(m, parameter, start, stop, unit)
        from ..checks.buckling import buckling_capacities

        capacity = [np.inf if c is None else c for c, _ in buckling_capacities(m, m.checks)]
        chosen = None if segments is None else [n.strip() for n in segments.split(",") if n.strip()]
        result = run(m, parameter, start, stop, steps, unit=None if unit == "1" else unit, case=case,
                     segments=chosen, buckling_capacity=capacity)
        long = steps * max(len(m.segments), 1) > 200_000 and format is not SweepFormat.table
        if format is SweepFormat.table:
            text_out = sweep_summary(result, units)
        elif format is SweepFormat.json:
            text_out = sweep_json(result, units, progress=long)
        else:
            text_out = sweep_csv(result, units, progress=long)
        emit(text_out, output)
        if plot is not None:
            from ..output.plot import plot_sweep

            plot_sweep(result, plot, units)
            typer.echo(f"wrote {plot}", err=True)
        shown = "" if result.unit == "1" else f" {result.unit}"
        bad = [(f"step {result.parameter} = {v:.6g}{shown}", msg)
               for v, msg in result.results.inaccurate()]
    exit_if_inaccurate(bad)
# --- closed form -------------------------------------------------------------
class ClosedFormat(str, Enum):
    table = "table"
    json = "json"


def _parse_assume(items, gap_names):
    from ..errors import ModelError, suggest

    out = {}
    for item in items or ():
        for part in item.split(","):
            name, sep, state = part.strip().partition("=")
            if not sep or state.strip() not in ("closed", "open"):
                raise ModelError(f"--assume takes GAP=closed or GAP=open: got '{part.strip()}'")
            name = name.strip()
            if not gap_names:
                raise ModelError(f"--assume: the model has no gaps (got '{name}')")
            if name not in gap_names:
                raise ModelError(f"--assume: unknown gap '{name}'", hint=suggest(name, gap_names),
                                 options=gap_names or None)
            out[name] = state.strip() == "closed"
    return out


def _parse_only(items):
    from ..errors import ModelError, suggest
    from ..symbolic.closed_form import QUANTITIES

    aliases = {"forces": "axial_forces", "axial-forces": "axial_forces", "reaction": "reactions",
               "displacement": "displacements", "stress": "stresses", "gap": "gaps",
               "condition": "conditions"}
    out = set()
    for item in items or ():
        for part in item.split(","):
            key = aliases.get(part.strip(), part.strip())
            if key not in QUANTITIES:
                raise ModelError(f"--only: unknown quantity '{part.strip()}'",
                                 hint=suggest(part.strip(), QUANTITIES), options=QUANTITIES)
            out.add(key)
    return out or None


@app.command("closed-form")
def closed_form(model: ModelPath,
                latex: Annotated[bool, typer.Option("--latex", help="Print the formulas as LaTeX.")] = False,
                only: Annotated[Optional[list[str]], typer.Option(
                    "--only", help="Show only these: reactions, displacements, axial_forces, "
                                   "stresses, gaps (repeat or separate by commas), or 'conditions' "
                                   "for none of them; the conditions of the contact state are "
                                   "always shown.")] = None,
                format: Annotated[ClosedFormat, typer.Option("--format", "-f", help="Output format.")] = ClosedFormat.table,
                assume: Annotated[Optional[list[str]], typer.Option(
                    "--assume", help="Give the formulas for this contact state: GAP=closed or "
                                     "GAP=open (repeatable).")] = None,
                case: Annotated[Optional[str], typer.Option("--case", help="The case or combination (default: the first case).")] = None,
                output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
                displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Solve a model in closed form with sympy: formulas in the declared symbols.

    The formulas are checked against the numeric solver where every symbol has a value.
    """
    import json

    from ..errors import SolveError
    from ..io.modelfile import read_model
    from ..output.text import CAUTIONS
    from ..engine.system import solve as run
    from ..symbolic.closed_form import (closed_form_dict, closed_form_text, numeric_model, solve_symbolic,
                           used_symbols)

    from .guards import time_limit

    with user_errors(model), time_limit(
            CLOSED_FORM_SECONDS, f"the closed form takes longer than {CLOSED_FORM_SECONDS} s; "
            "give more symbols a value, or fewer symbols", model):
        outputs([model], ("--output", output))
        m = read_model(model, symbolic=True)
        units = output_units(m, force_unit, length_unit, displacement_unit, stress_unit)
        assumed = _parse_assume(assume, [g.name for g in m.gaps])
        wanted = _parse_only(only)
        case_names = [c.name for c in (*m.all_cases, *m.combinations)]
        if case is not None and case not in case_names:
            from ..errors import ModelError, suggest

            raise ModelError(f"--case: unknown case '{case}'", hint=suggest(case, case_names),
                             options=case_names)
        numeric, notes = None, []
        values = {d.name: d.value for d in m.symbols}
        if all(values[n] is not None for n in used_symbols(m)):
            try:
                numeric = run(numeric_model(m))[case or case_names[0]]
            except SolveError as exc:
                notes.append(f"the numeric solver cannot solve this model ({exc.message}); "
                             "nothing is compared")
        state = ({g.name: bool(numeric.gap_closed[j]) for j, g in enumerate(m.gaps)}
                 if numeric is not None else None)
        cf = solve_symbolic(m, case=case, assume=assumed, state=state)
        compare = numeric is not None and all(state[g] == c for g, c in cf.gap_closed.items())
        if numeric is not None and not compare:
            notes.append("the numeric solver finds another contact state ("
                         + ", ".join(f"'{g}' {'closed' if state[g] else 'open'}" for g in state)
                         + "); its values are shown but not compared")
        data = closed_form_dict(cf, numeric, units, wanted,
                                compare=True if compare else (None if numeric is not None else False))
        data["notes"] += notes
        if format is ClosedFormat.json:
            data["cautions"] = list(CAUTIONS)
            text = json.dumps(data, indent=2) + "\n"
        else:
            text = closed_form_text(data, latex=latex, cautions=CAUTIONS)
        emit(text, output)


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
    from ..errors import ModelError, suggest

    if name is None:
        return solution.cases[0]
    if name not in solution.names:
        raise ModelError(f"unknown case '{name}'", place="--case", hint=suggest(name, solution.names),
                         options=solution.names)
    return solution[name]


class CheckOnlyFormat(str, Enum):
    table = "table"
    json = "json"
    csv = "csv"


@app.command()
def check(model: ModelPath,
          case: Annotated[Optional[str], typer.Option(
              "--case", help="Check this case or combination only (default: every one).")] = None,
          format: Annotated[CheckOnlyFormat, typer.Option(
              "--format", "-f", help="Output format (JSON and CSV give each check's demand and "
              "capacity, or required, actual and margin of a deformation limit, with the "
              "unit).")] = CheckOnlyFormat.table,
          output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
          displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Run the design checks (strength, buckling, limits) of every case.

    Exit code 0 when every check passes, 1 when any fails, 3 when none fails
    but some cannot be decided (an engineer must review them); 2 for bad input.
    """
    from ..checks import check_solution
    from ..output.text import checks_csv, checks_json, checks_table
    from .._gcpause import gc_paused
    from ..engine.system import solve as run

    with user_errors(model), gc_paused():   # as in solve
        outputs([model], ("--output", output))
        m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit)
        solution = run(m)
        if case is not None:  # one case: its checks, its status and its exit code
            from ..results import Solution

            solution = Solution(solution.model, (_pick_case(solution, case),))
        report = check_solution(solution)
        if format is CheckOnlyFormat.json:
            text = checks_json(report, units, title=m.title)
        elif format is CheckOnlyFormat.csv:
            text = checks_csv(report, units)
        else:
            text = checks_table(report, units, title=m.title)
        emit(text, output)
        plastic_notes(solution, units)
    exit_if_inaccurate((f"case '{c.name}'", c.message) for c in solution.inaccurate)
    raise typer.Exit(checks_exit(report))


def figures_beside(model: Path, report: Path, count: int):
    """Check the diagram files a Markdown report writes beside itself, as every output is."""
    from ..output.report import figure_names

    outputs([model], ("--output", report),
            *(("a diagram of the report", f) for f in figure_names(report, count)))


def beside(model: Path, output: Optional[Path], suffix: str) -> Path:
    """``output``, or ``MODEL-STEM`` + ``suffix`` beside the model when none is given."""
    return output if output is not None else model.with_name(model.stem + suffix)


@app.command()
def plot(model: ModelPath,
         output: Annotated[Optional[Path], typer.Option(
             "--output", "-o", dir_okay=False,
             help="The figure file: .png or .svg (default: MODEL-STEM.png beside the model).")] = None,
         what: Annotated[str, typer.Option("--what", help="force, stress, displacement or all.")] = "all",
         case: Annotated[Optional[str], typer.Option("--case", help="The case to draw (default: the first).")] = None,
         force_unit: ForceUnit = None, length_unit: LengthUnit = None,
         displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    """Draw the axial force, stress and displacement diagrams of one case."""
    from ..errors import ModelError, suggest
    from ..output.plot import WHAT, _suffix, plot_case
    from ..engine.system import solve as run

    output = beside(model, output, ".png")
    with user_errors(model):
        outputs([model], ("--output", output))
        if what not in WHAT:
            raise ModelError(f"--what: unknown diagram '{what}'", hint=suggest(what, WHAT),
                             options=WHAT)
        _suffix(output)
        from ..fits.reader import is_fit_file

        if is_fit_file(model):  # a fit: pressure and stresses against temperature
            from ..output.fitplot import plot_fit

            result, fit_units = _solved_fit(model, force_unit, length_unit, stress_unit)
            plot_fit(result, output, fit_units)
        else:
            m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit)
            plot_case(_pick_case(run(m), case), what, output, units)
        typer.echo(f"wrote {output}", err=True)


class Paper(str, Enum):
    a4 = "a4"
    letter = "letter"


@app.command()
def report(model: ModelPath,
           output: Annotated[Optional[Path], typer.Option(
               "--output", "-o", dir_okay=False,
               help="The report file: .html, or .md for Markdown (default: MODEL-STEM.html, "
                    "or .md with --format markdown, beside the model).")] = None,
           format: Annotated[Optional[ReportFormat], typer.Option(
               "--format", "-f", help="html or markdown (default: by the file's suffix).")] = None,
           paper: Annotated[Paper, typer.Option(
               "--paper", help="The paper the printed report is laid out on: a4 or letter.")] = Paper.a4,
           force_unit: ForceUnit = None, length_unit: LengthUnit = None,
           displacement_unit: DispUnit = None, stress_unit: StressUnit = None,
           tolerance: Annotated[bool, typer.Option(
               "--tolerance", help="Add a tolerance study of the model's toleranced inputs "
               "(see axialfe tolerance).")] = False,
           samples: Annotated[int, typer.Option(
               "--samples", help="Monte Carlo samples of the tolerance study.")] = 10_000,
           seed: Annotated[int, typer.Option("--seed", help="Seed of the tolerance study.")] = 1):
    """Write a report: a one-page summary, then input, results, calculation sheet, checks.

    The summary gives the verdict, the envelope and the cautions; diagrams follow the checks.

    The HTML report needs no other file and prints on A4 or Letter with the title
    block of the model's project table on every page; a Markdown report links its
    diagrams, written beside it as REPORT-STEM-diagram-N.png.
    """
    from ..output.report import report_format, write_report
    from ..engine.system import solve as run

    from ..fits.reader import is_fit_file

    output = beside(model, output, ".md" if format is ReportFormat.markdown else ".html")
    with user_errors(model):
        outputs([model], ("--output", output))
        fmt = report_format(output, format.value if format else None)
        from ..joints import is_joint_file

        if tolerance and (is_joint_file(model) or is_fit_file(model)):
            from ..errors import ModelError

            raise ModelError("a report's tolerance section is made for model files only: run "
                             "'axialfe tolerance' on a joint or fit file", place="--tolerance")
        if is_joint_file(model):  # a bolted joint: its own report (axialfe.output.jointreport)
            from ..joints import read_joint, solve_joint
            from ..output.jointreport import write_joint_report

            j = read_joint(model)
            units = output_units(j, force_unit, length_unit, None, stress_unit)
            solved = solve_joint(j)
            if fmt == "markdown":  # the joint diagram and one per state
                figures_beside(model, output, 1 + len(solved.solution.cases))
            write_joint_report(solved, output, fmt, units)
        elif is_fit_file(model):  # a press or shrink fit (axialfe fit) has its own report
            from ..output.fitreport import write_fit_report

            result, units = _solved_fit(model, force_unit, length_unit, stress_unit)
            if fmt == "markdown":
                figures_beside(model, output, 1)
            write_fit_report(result, output, fmt, units)
        else:
            m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit)
            solution = run(m)
            if fmt == "markdown":  # its diagrams are files beside it: checked before writing
                figures_beside(model, output, len(solution.cases))
            from ..checks import check_solution
            from ..checks.assumptions import assumption_notes
            from ..envelope import envelope
            from ..review.sheet import thermal_split

            write_report(solution, output, fmt, units, checks=check_solution(solution),
                         review=stated_values(model, m, solution), envelope=envelope(solution),
                         thermal=thermal_split(solution), paper=paper.value,
                         notes=assumption_notes(solution),
                         tolerance=_tolerance_study(model, tolerance, samples, seed))
        typer.echo(f"wrote {output}", err=True)


def _tolerance_study(path, wanted, samples, seed):
    """The tolerance study of a report (``--tolerance``), or None."""
    if not wanted:
        return None
    from ..errors import ModelError
    from ..io.modelfile import read_toleranced
    from ..tolerance.study import run_study

    if not 0 <= samples <= 10_000_000 or seed < 0:
        raise ModelError("--samples must lie from 0 to 10,000,000 and --seed must not be "
                         "negative")
    nominal, build = read_toleranced(path)
    return run_study(nominal, build, samples=samples, seed=seed)


@app.command()
def fit(fit: Annotated[Path, typer.Argument(help="The fit file (TOML).")],
        format: Annotated[CheckFormat, typer.Option("--format", "-f", help="Output format.")] = CheckFormat.table,
        output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
        stress_unit: StressUnit = None,
        torque_unit: Annotated[Optional[str], typer.Option("--torque-unit", help="Unit of torques, e.g. N*m, lbf*in.")] = None):
    """Check a press or shrink fit (Lamé's thick-walled cylinders) under temperature.

    Exit code 0 when every check passes, 1 when any fails, 3 when none fails
    but some cannot be decided; 2 for bad input.
    """
    from ..output.fittext import fit_json, fit_table

    with user_errors(fit):
        outputs([fit], ("--output", output))
        result, units = _solved_fit(fit, force_unit, length_unit, stress_unit, torque_unit)
        render = fit_json if format is CheckFormat.json else fit_table
        emit(render(result, units), output)
    raise typer.Exit(checks_exit(result.checks))


def _solved_fit(path, force=None, length=None, stress=None, torque=None):
    """Read and solve a fit file; return it with its units and the command line's overrides."""
    from ..errors import UnitError
    from ..fits.fit import FitUnits, solve_fit
    from ..fits.reader import read_fit_toleranced
    from ..io.modelfile import tolerance_note

    spec, found, _ = read_fit_toleranced(path)
    stated = [t for t in found if t.path not in ("fit.bore", "fit.shaft")]
    if stated:   # the limits of a designation are the fit's own range, not a tolerance
        typer.echo(tolerance_note(stated, "fit"), err=True)
    base = spec.units.as_dict()
    for key, value in (("force", force), ("length", length), ("stress", stress),
                       ("torque", torque)):
        if value:
            try:
                FitUnits(**{**base, key: value})
            except UnitError as exc:
                raise UnitError(f"--{key}-unit: {exc.message}") from None
            base[key] = value
    return solve_fit(spec), FitUnits(**base)


@app.command("verify")
def verify_claims(model: ModelPath,
                  format: Annotated[CheckFormat, typer.Option("--format", "-f", help="Output format.")] = CheckFormat.table,
                  output: Output = None, force_unit: ForceUnit = None, length_unit: LengthUnit = None,
                  displacement_unit: DispUnit = None, stress_unit: StressUnit = None):
    r"""Check the values a hand calculation states (\[\[claims]], claims_file) against the model.

    Each claim gets the computed value, the difference and a verdict, agrees or
    differs; for each that differs, the common slips that reproduce it.  Exit
    code 0 when every claim agrees, 1 when any differs, 2 for bad input.
    """
    from ..errors import ModelError
    from ..output.reviewtext import review_json, review_table
    from ..engine.system import solve as run

    with user_errors():
        m, units = load(model, force_unit, length_unit, displacement_unit, stress_unit)
        review = stated_values(model, m, run(m))
        if review is None:
            raise ModelError("the model states no values to verify: add [[claims]] or "
                             "claims_file", file=str(model))
        text = (review_json if format is CheckFormat.json else review_table)(review, units)
        emit(text, output)
    raise typer.Exit(0 if review.differ == 0 else 1)


_CHOICE = re.compile(r"Invalid value for (?P<option>.+?): Value error, '(?P<value>.*)' is not one "
                     r"of (?P<choices>'.*')\.$")


def _usage_text(message: str) -> str:
    """click's message for a bad choice, in the tool's own shape, with a "did you mean"."""
    from ..errors import suggest

    found = _CHOICE.match(message.strip())
    if found is None:
        return message
    choices = re.findall(r"'([^']*)'", found["choices"])
    close = suggest(found["value"], choices) or next(
        (c for c in choices if found["value"] and c.startswith(found["value"])), None)
    hint = f"; did you mean '{close}'?" if close else ""
    return (f"{found['option']}: '{found['value']}' is not one of "
            + ", ".join(f"'{c}'" for c in choices) + hint)


def main():
    """The entry point: a mistake on the command line is one ``error:`` line, exit 2.

    typer would draw a framed panel for a usage error; a script or a log wants one
    line, like every other input error of the tool.
    """
    try:
        code = app(prog_name="axialfe", standalone_mode=False)
    except Exception as exc:  # noqa: BLE001 - only click's own usage errors are handled
        # typer may bring click's exception classes under its own module, so they are
        # recognised by name, not by import
        kinds = {cls.__name__ for cls in type(exc).__mro__}
        if "NoArgsIsHelpError" in kinds:
            typer.echo(exc.format_message())
            code = 0
        elif "UsageError" in kinds:
            ctx = getattr(exc, "ctx", None)
            command = ctx.command_path if ctx is not None else "axialfe"
            typer.echo(f"error: {_usage_text(exc.format_message())} (see '{command} --help')",
                       err=True)
            code = EXIT_INPUT
        elif "Abort" in kinds:
            typer.echo("error: aborted", err=True)
            code = 1
        else:
            raise
    sys.exit(code or 0)


if __name__ == "__main__":  # pragma: no cover
    main()
