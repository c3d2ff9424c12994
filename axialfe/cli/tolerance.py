"""The ``axialfe tolerance`` command: worst case and Monte Carlo over the toleranced inputs of a
model, joint or fit file."""

from __future__ import annotations

import sys
from pathlib import Path
from typing import Annotated, List, Optional

import typer

from .app import CheckFormat, ModelPath, app, emit, outputs, user_errors

__all__ = ["tolerance"]

_PROGRESS_FROM = 200_000   # samples: a progress bar on a terminal's stderr from here on


def _progress_bar():
    """A progress bar on stderr when it is a terminal (nothing otherwise)."""
    if not sys.stderr.isatty():
        return None
    state = {"last": -1}

    def show(done, total):
        if total < _PROGRESS_FROM:
            return
        tenth = int(40 * done / max(total, 1))
        if tenth != state["last"]:
            state["last"] = tenth
            sys.stderr.write(f"\r[{'#' * tenth}{'.' * (40 - tenth)}] {done}/{total}")
            if done >= total:
                sys.stderr.write("\n")
            sys.stderr.flush()

    return show


@app.command()
def tolerance(model: ModelPath,
              samples: Annotated[int, typer.Option(
                  "--samples", "-n", help="Monte Carlo samples (0: the worst case only); at "
                  "most 10,000,000.")] = 10_000,
              seed: Annotated[int, typer.Option("--seed", help="Seed of the random streams "
                                                "(one per input).")] = 1,
              output: Annotated[Optional[List[str]], typer.Option(
                  "--output", help="An output to study, e.g. reaction:left, "
                  "displacement:cover, stress:sleeve, gap:end-float:opening, "
                  "gap:end-float:force; repeat it for more (default: every reaction, gap "
                  "opening and force, and each segment's largest |stress|).")] = None,
              format: Annotated[CheckFormat, typer.Option("--format", "-f",
                                                          help="Output format.")] = CheckFormat.table,
              plot: Annotated[Optional[Path], typer.Option(
                  "--plot", dir_okay=False, help="Histograms of the outputs with their limits "
                  "and worst case marked (.png or .svg).")] = None):
    r"""Study a model, joint or fit file over its toleranced inputs: worst case and Monte Carlo.

    Any value written with a tolerance ("0.20 mm +0.05/-0.03", "0.20 mm ±0.02",
    { value = "0.20 mm", std = "0.01 mm" }) is an input.  The worst case
    evaluates every vertex of the tolerance box, then searches locally where
    the response is not affine; the Monte Carlo draws one seeded stream per
    input.  A joint file (a \[bolt] table) takes tolerances on its torque, nut
    factor, lengths, thicknesses, temperatures, loads and own materials; its
    outputs are each state's bolt_force and clamp_force.  A fit file (a \[fit]
    table) is studied over its ISO 286 or shaft/bore limits and its other
    toleranced values; its outputs are each state's pressure and
    holding_force.  Events: closes, opens, taut, slack, yields, separates,
    clamp-below-minimum, slips, loosens, check-fails.  Exit code 0, or 2 for
    bad input.
    """
    from ..errors import ModelError
    from ..io.modelfile import read_toleranced
    from ..output.tolerancetext import study_json, study_table
    from ..tolerance.study import run_study

    with user_errors(model):
        outputs([model], ("--plot", plot))
        if plot is not None:
            from ..output.plot import _suffix

            _suffix(plot)  # a wrong suffix is refused before any work
        if not 0 <= samples <= 10_000_000:
            raise ModelError(f"--samples must lie from 0 to 10,000,000: got {samples}")
        if seed < 0:
            raise ModelError(f"--seed must not be negative: got {seed}")
        from ..fits.reader import is_fit_file
        from ..joints import is_joint_file

        if is_joint_file(model):  # a bolted joint: its states' bolt and clamp forces
            from ..joints.reader import read_joint_toleranced
            from ..tolerance.jointstudy import run_joint_study

            joint, found, build = read_joint_toleranced(model)
            study = run_joint_study(joint, found, build, samples=samples, seed=seed,
                                    outputs=output, progress=_progress_bar())
        elif is_fit_file(model):  # a press fit: pressure and holding force over its limits
            from ..fits.reader import read_fit_toleranced
            from ..tolerance.fitstudy import run_fit_study

            fit, found, build = read_fit_toleranced(model)
            study = run_fit_study(fit, found, build, samples=samples, seed=seed,
                                  outputs=output, source=str(model), progress=_progress_bar())
        else:
            nominal, build = read_toleranced(model)
            study = run_study(nominal, build, samples=samples, seed=seed, outputs=output,
                              progress=_progress_bar())
        emit(study_json(study) if format is CheckFormat.json else study_table(study), None)
        if plot is not None:
            from ..output.toleranceplot import plot_study

            plot_study(study, plot)
            typer.echo(f"wrote {plot}", err=True)
