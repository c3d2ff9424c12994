"""A tolerance study of a bolted joint file: its states' bolt and clamp forces over toleranced inputs.

The preload of each sample is F_i = T/(K*d) with its sampled nut factor
(Shigley, 10th ed., eq. 8-27, from memory).  A closed joint's forces are
affine in the preload, so two solves by :func:`axialfe.joints.joint.solve_joint`
at the ends of the range of preloads give every sample at once; samples at
which a state separates are solved one by one.  The worst case evaluates
every vertex of the tolerance box; the bolt and clamp forces are monotone in
the nut factor, so the vertices give them exactly.
"""

from __future__ import annotations

import itertools
from dataclasses import replace

import numpy as np

from ..errors import ModelError
from ..joints.joint import solve_joint
from .study import (MAX_VERTEX_INPUTS, Study, _draw, _event, input_notes, input_rows,
                    vertex_row)

__all__ = ["run_joint_study", "JOINT_OUTPUTS"]

JOINT_OUTPUTS = ("bolt_force", "clamp_force")


def _at_preload(joint, preload):
    """The joint's states with the preload replaced: ``{(state, output): value}``, separated."""
    result = solve_joint(replace(joint, preload=float(preload)))
    values = {(st.name, out): getattr(st, out) for st in result.states for out in JOINT_OUTPUTS}
    return values, {st.name: bool(st.separated) for st in result.states}


def _evaluate(joint, preloads, names):
    """The states at each preload of ``preloads``: ``{(state, output): values}`` and the
    separation flags ``{state: bools}``.

    While the joint stays closed its forces are affine in the preload (the joint
    diagram: F_b = F_i + C*P, F_m = F_i - (1 - C)*P, Shigley, 10th ed., eqs. 8-24,
    8-25, from memory), so two solves at the ends of the range give every sample
    at once; samples at which a state separates are solved one by one.
    """
    preloads = np.asarray(preloads, dtype=float)
    lo, hi = float(preloads.min()), float(preloads.max())
    a, sep_a = _at_preload(joint, lo)
    b, sep_b = _at_preload(joint, hi) if hi > lo else (a, sep_a)
    states = list(sep_a)
    t = (preloads - lo) / (hi - lo) if hi > lo else np.zeros_like(preloads)
    values = {k: a[k] + t * (b[k] - a[k]) for k in a}
    separated = {s: np.zeros(len(preloads), dtype=bool) for s in states}
    if any(sep_a.values()) or any(sep_b.values()):
        alone = np.ones(len(preloads), dtype=bool)   # the line is not certified: every sample
    else:
        alone = np.zeros(len(preloads), dtype=bool)
        for s in states:
            alone |= values[(s, "clamp_force")] <= 0.0
    for i in np.flatnonzero(alone):
        v, sep = _at_preload(joint, preloads[i])
        for k in values:
            values[k][i] = v[k]
        for s in states:
            separated[s][i] = sep[s]
    return values, separated, int(alone.sum())


def _preloads(joint, paths, tols, points):
    """The preload of each row of ``points``: F_i = T/(K*d) with the sampled nut factor K
    (Shigley, 10th ed., eq. 8-27, from memory), i.e. the nominal preload scaled by K0/K."""
    k = paths.index("assembly.nut_factor")
    return joint.preload * tols[k].nominal / points[:, k]


def run_joint_study(joint, found, samples=10_000, seed=1, outputs=None) -> Study:
    """Study a joint over its toleranced inputs (see :func:`axialfe.tolerance.study.run_study`
    for the fields of the result).  Outputs are ``<state>:bolt_force`` and
    ``<state>:clamp_force``; events ``separates`` and ``clamp-below-minimum``."""
    if not found:
        raise ModelError("the joint has no toleranced input: write one as, e.g., "
                         "nut_factor = \"0.2 ±0.03\"", file=joint.source)
    for t in found:
        if t.problem:
            raise ModelError(f"{t.path}: {t.problem}; narrow the tolerance", file=joint.source,
                             line=t.line)
    if len(found) > MAX_VERTEX_INPUTS:
        raise ModelError(f"a joint study takes at most {MAX_VERTEX_INPUTS} toleranced inputs")
    nominal = solve_joint(joint)
    states = [s.name for s in nominal.states]
    known = [f"{s}:{o}" for s in states for o in JOINT_OUTPUTS]
    if outputs:
        from ..errors import suggest

        for name in outputs:
            if name not in known:
                raise ModelError(f"unknown output '{name}'", place="--output",
                                 hint=suggest(name, known), options=known)
    chosen = list(dict.fromkeys(outputs)) if outputs else known
    paths = [t.path for t in found]
    tols = [t.tolerance for t in found]
    lower = np.array([t.lower for t in tols])
    upper = np.array([t.upper for t in tols])
    corners = np.array(list(itertools.product((0, 1), repeat=len(tols))), dtype=float)
    vertices = lower + corners * (upper - lower)
    at_vertex, _, _ = _evaluate(joint, _preloads(joint, paths, tols, vertices), chosen)
    draws, separated, alone = {}, {}, 0
    if samples:
        x = _draw(tols, samples, seed)
        draws, separated, alone = _evaluate(joint, _preloads(joint, paths, tols, x), chosen)
    rows = []
    for name in chosen:
        state, out = name.rsplit(":", 1)
        rows.append(vertex_row(name, state, "force", getattr(nominal.state(state), out), at_vertex[(state, out)],
                               vertices, paths, draws[(state, out)] if samples else None))
    events = []
    if samples:
        for state in states:
            events.append(_event(state, "separates", state,
                                 int(np.count_nonzero(separated[state])), samples))
            if joint.minimum_clamp_force is not None:
                below = draws[(state, "clamp_force")] < joint.minimum_clamp_force
                events.append(_event(state, "clamp-below-minimum", state,
                                     int(np.count_nonzero(below)), samples))
    notes = ["the preload of each sample is T/(K*d) with its nut factor; the forces of a "
             "closed joint are affine in the preload, so they come from two solves at the "
             "ends of the range" + (f"; {alone:,} samples at which the joint separates were "
                                    "solved one by one" if alone else ""),
             "worst case by vertices: exact, as the bolt and clamp forces are monotone in "
             "the nut factor"]
    notes += input_notes(tols)
    inputs = input_rows(paths, tols)
    return Study(title=joint.title, samples=samples, seed=seed, worst_case_method="vertices",
                 inputs=inputs, outputs=tuple(rows), events=tuple(events), notes=tuple(notes),
                 draws={(k[0], f"{k[0]}:{k[1]}"): v for k, v in draws.items()
                        if f"{k[0]}:{k[1]}" in chosen},
                 units=joint.units)
