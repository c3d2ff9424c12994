"""The study of a workflow whose states are closed forms on arrays (bolted joints, press fits).

A workflow gives a :class:`ClosedBatch`: its parameters by the affine map of
:class:`~axialfe.tolerance.parameters.ParameterMap`, and ``chunk(points)``,
the outputs and event flags of a block of samples on arrays.
:func:`run_closed_study` does the rest as the model study does it: the
refusals before sampling, the draws (:func:`axialfe.tolerance.study._draw`),
the worst case by the vertices of the box and, where the response need not be
monotone, the model study's local search (:func:`axialfe.tolerance.study._worst_case`),
the statistics and the events with their Wilson intervals.
"""

from __future__ import annotations

import itertools

import numpy as np

from ..errors import ModelError
from .parameters import ParameterMap
from .study import (MAX_VERTEX_INPUTS, Study, _draw, _event, _worst_case, input_notes,
                    input_rows, statistics)

__all__ = ["ClosedBatch", "run_closed_study", "CHUNK"]

CHUNK = 200_000          # samples evaluated at once (some 100 MB of arrays)


class ClosedBatch:
    """Many samples of one file's object, evaluated by closed forms on arrays.

    Subclasses give ``chunk(rows) -> (outputs, flags, undecided)``: ``{name: values}``,
    ``{(name, event, case): bools}`` and the number of undecided check verdicts.
    """

    def __init__(self, params_of, build, found, source=None):
        self.build, self.found, self.source = build, list(found), source
        self.paths = [t.path for t in found]
        tols = [t.tolerance for t in found]
        nominal = np.array([t.nominal for t in tols])
        half = np.array([0.5 * (t.upper - t.lower) for t in tols])
        centre = np.array([t.centre for t in tols])
        self.map = ParameterMap(params_of, build, found, nominal,
                                np.where(nominal > centre, -half, half), source)
        self.alone = 0      # samples the closed forms left to the workflow's own solver

    def chunk(self, rows):  # pragma: no cover - each workflow gives its own
        raise NotImplementedError

    def values(self, row) -> dict:
        """One sample's input values by path (for ``build``)."""
        return dict(zip(self.paths, np.asarray(row, dtype=float).tolist()))

    def evaluate(self, points, progress=None):
        """Outputs, event flags and undecided verdicts of every row of ``points``
        (``progress(done, total)`` after each block, when given)."""
        out, flags, undecided = {}, {}, 0
        points = np.atleast_2d(np.asarray(points, dtype=float))
        for start in range(0, len(points), CHUNK):
            o, f, u = self.chunk(points[start:start + CHUNK])
            if progress is not None:
                progress(min(len(points), start + CHUNK), len(points))
            undecided += u
            for k, v in o.items():
                out.setdefault(k, []).append(v)
            for k, v in f.items():
                flags.setdefault(k, []).append(v)
        join = lambda d: {k: np.concatenate(v) for k, v in d.items()}  # noqa: E731
        return join(out), join(flags), undecided

    def solve(self, points, chosen, tick=None):
        """The batch protocol of the model study's worst case: ``{(0, name): values}``."""
        out = self.evaluate(points)[0]
        return {(0, n): out[n] for n in chosen.names}

    def refuse_geometry(self, keys, valid, what):
        """Refuse, before sampling, inputs among ``keys`` (the last part of their path)
        whose ranges of draws let ``valid(params)`` fail at a vertex of those ranges (the
        conditions are monotone in each such input); ``what`` says what could happen."""
        tols = [t.tolerance for t in self.found]
        moved = [i for i, p in enumerate(self.paths) if p.rsplit(".", 1)[-1] in keys]
        if not moved or len(moved) > MAX_VERTEX_INPUTS:
            return
        points = np.tile(np.array([t.nominal for t in tols]), (2 ** len(moved), 1))
        for row, corner in enumerate(itertools.product((0, 1), repeat=len(moved))):
            for i, c in zip(moved, corner):
                points[row, i] = tols[i].spread[c]
        if not np.all(valid(self.map.at(points))):
            first = self.found[moved[0]]
            names = ", ".join(self.paths[i] for i in moved)
            many = len(moved) > 1
            raise ModelError(f"{first.path}: within the tolerance{'s' if many else ''} of "
                             f"{names} (the worst-case box or +-6 sigma of a normal) {what}; "
                             f"narrow {'them' if many else 'it'}", file=self.source,
                             line=first.line)


class _Chosen:
    def __init__(self, names):
        self.names = tuple(names)


def refuse_problems(found, source, limit_text):
    """The refusals every study makes before sampling: no input, too many, or one whose
    draws leave its physical range (the reader's ``problem``)."""
    if not found:
        raise ModelError(limit_text, file=source)
    if len(found) > MAX_VERTEX_INPUTS:
        raise ModelError(f"a joint or fit study takes at most {MAX_VERTEX_INPUTS} toleranced "
                         f"inputs: got {len(found)}", file=source)
    for t in found:
        if t.problem:
            raise ModelError(f"{t.path}: {t.problem} within its tolerance (the worst-case box "
                             "or +-6 sigma of a normal); narrow the tolerance", file=source,
                             line=t.line)


def run_closed_study(batch, title, units, nominal, chosen, samples, seed, monotone, notes,
                     progress=None) -> Study:
    """The study of a :class:`ClosedBatch`.

    Parameters
    ----------
    nominal : dict
        ``{output name: (case, kind, nominal value)}`` of every output that may be chosen.
    chosen : sequence of str
        The outputs studied.
    monotone : bool
        Whether every output is monotone in each input (the vertices then give the
        worst case exactly).
    notes : list of str
        The workflow's own notes, first.
    """
    chosen = _Chosen(chosen)
    tols = [t.tolerance for t in batch.found]
    paths = batch.paths
    lower = np.array([t.lower for t in tols])
    upper = np.array([t.upper for t in tols])
    draws, events, x, undecided = {}, [], None, 0
    if samples:
        x = _draw(tols, samples, seed)
        out, flags, undecided = batch.evaluate(x, progress)
        draws = {n: out[n] for n in chosen.names}
        for (name, event, case), flag in flags.items():
            events.append(_event(name, event, case, int(np.count_nonzero(flag)), samples))
    worst, method = _worst_case(batch, chosen, ["all"], lower, upper, x,
                                {(0, n): v for n, v in draws.items()}, monotone, None)
    rows = []
    for name in chosen.names:
        case, kind, value = nominal[name]
        (lo_v, lo_x), (hi_v, hi_x) = worst[(0, name)]
        row = {"name": name, "case": case, "kind": kind, "nominal": float(value),
               "worst_case": [lo_v, hi_v],
               "worst_case_inputs": [dict(zip(paths, lo_x.tolist())),
                                     dict(zip(paths, hi_x.tolist()))]}
        if samples:
            row.update(statistics(draws[name]))
        rows.append(row)
    notes = list(notes)
    if batch.alone:
        notes.append(f"{batch.alone:,} samples the closed forms do not describe were solved "
                     "one by one")
    if method == "vertices":
        notes.append("worst case by vertices: exact, as every output is monotone in each of "
                     "these inputs")
    else:
        notes.append(f"worst case by {method}: sizes and moduli set the stiffness, in which "
                     "an output need not be monotone; the extremes found are local ones, exact "
                     "for outputs monotone in each input")
    if samples:
        notes.append("check-fails: a check fails in the sample as the workflow's own command "
                     "judges it (named by its check; 'checks' for any of the state's checks), "
                     "every sample evaluated"
                     + (f"; {undecided:,} undecided verdicts are not counted as failures"
                        if undecided else ""))
    notes += input_notes(tols)
    return Study(title=title, samples=samples, seed=seed, worst_case_method=method,
                 inputs=input_rows(paths, tols), outputs=tuple(rows), events=tuple(events),
                 notes=tuple(notes),
                 draws={(nominal[name][0], name): v for name, v in draws.items()},
                 units=units)
