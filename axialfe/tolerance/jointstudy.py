"""A tolerance study of a bolted joint file: its states' bolt and clamp forces over toleranced inputs.

Any toleranced value of a joint file is an input (torque, nut factor, preload,
lengths and thicknesses, moduli and expansion coefficients of its own
materials, temperatures, external loads, the minimum clamp force).  Every
sample is evaluated at once by the joint-diagram closed forms on arrays
(:func:`axialfe.joints.joint.closed_states`: the preload F_i = T/(K*d) with
the sampled nut factor, Shigley, 10th ed., eq. 8-27, from memory; F_b and F_m
of eqs. 8-24 and 8-25; the stiffness of eqs. 8-17 and 8-20), the parameters of
each sample coming from the affine map of :class:`ParameterMap`.  Samples the
closed forms do not describe (a state that separates under no pull) are solved
one by one by :func:`axialfe.joints.joint.solve_joint`.  The worst case
evaluates every vertex of the tolerance box; the forces are monotone in each
load-type input (torque, nut factor, preload, temperatures, loads,
expansion), so the vertices give them exactly, and stiffness-type inputs
(lengths, thicknesses, moduli) are polished by the model study's local search.
"""

from __future__ import annotations

import itertools

import numpy as np

from ..errors import ModelError, suggest
from ..joints.joint import closed_states, joint_parameters, solve_joint
from .parameters import ParameterMap
from .study import (MAX_VERTEX_INPUTS, Study, _draw, _event, _worst_case, input_notes,
                    input_rows, statistics)

__all__ = ["run_joint_study", "JOINT_OUTPUTS", "CHUNK"]

JOINT_OUTPUTS = ("bolt_force", "clamp_force")
CHUNK = 200_000          # samples evaluated at once (about 100 MB of arrays)
# inputs through which the forces are monotone (so the vertices give the worst case)
_MONOTONE = ("torque", "nut_factor", "preload", "temperature", "temperatures",
             "external_load", "minimum_clamp_force", "thermal_expansion")
_GEOMETRY = ("length", "thread_length", "thickness")


class _Joints:
    """Many samples of one joint: outputs, separation and check verdicts on arrays."""

    def __init__(self, joint, found, build, names):
        self.joint, self.build, self.names = joint, build, names
        self.paths = [t.path for t in found]
        tols = [t.tolerance for t in found]
        nominal = np.array([t.nominal for t in tols])
        half = np.array([0.5 * (t.upper - t.lower) for t in tols])
        centre = np.array([t.centre for t in tols])
        self.map = ParameterMap(joint_parameters, build, found, nominal,
                                np.where(nominal > centre, -half, half), joint.source)
        self.alone = 0

    def closed(self, points):
        return closed_states(self.joint, self.map.at(points))

    def evaluate(self, points):
        """``{output: values}``, ``{state: separated}``, ``{(state, kind): ok}`` and
        ``{state: clamp below minimum}`` at each row of ``points``."""
        out, sep, checks, low = {}, {}, {}, {}
        for start in range(0, len(points), CHUNK):
            rows = points[start:start + CHUNK]
            cs = self.closed(rows)
            theta = self.map.at(rows)
            got = {f"{s}:{o}": np.array(getattr(cs, o)[s]) for s in cs.bolt_force
                   for o in JOINT_OUTPUTS}
            part_sep = {s: np.array(v) for s, v in cs.separated.items()}
            part_checks = {k: np.array(v) for k, v in cs.checks.items()}
            for i in np.flatnonzero(cs.unsure):   # not described by the closed forms
                self.alone += 1
                result = solve_joint(self.build(dict(zip(self.paths, rows[i].tolist()))))
                for st in result.states:
                    for o in JOINT_OUTPUTS:
                        got[f"{st.name}:{o}"][i] = getattr(st, o)
                    part_sep[st.name][i] = st.separated
                for case in result.checks.cases:
                    for e in case.entries:
                        part_checks[(case.case, e.kind)][i] = -1 if e.ok is None else int(e.ok)
            fmin = theta["minimum_clamp_force"]
            for s in part_sep:
                below = got[f"{s}:clamp_force"] < fmin
                low.setdefault(s, []).append(np.broadcast_to(below, len(rows)))
                sep.setdefault(s, []).append(part_sep[s])
            for k, v in got.items():
                out.setdefault(k, []).append(v)
            for k, v in part_checks.items():
                checks.setdefault(k, []).append(np.broadcast_to(v, len(rows)))
        join = lambda d: {k: np.concatenate(v) for k, v in d.items()}  # noqa: E731
        return join(out), join(sep), join(checks), join(low)

    def solve(self, points, chosen, tick=None):
        """The batch protocol of the model study's worst case: ``{(0, name): values}``."""
        out = self.evaluate(np.atleast_2d(points))[0]
        return {(0, n): out[n] for n in chosen.names}


class _Chosen:
    def __init__(self, names):
        self.names = tuple(names)


def _refuse(joints, found, tols, source):
    """Before sampling: inputs whose draws leave their physical range, and a geometry the
    joint would refuse anywhere in the range of draws (at its vertices: the lengths and
    thicknesses enter the conditions monotonically)."""
    for t in found:
        if t.problem:
            raise ModelError(f"{t.path}: {t.problem} within its tolerance (the worst-case box "
                             "or +-6 sigma of a normal); narrow the tolerance", file=source,
                             line=t.line)
    geometry = [i for i, t in enumerate(found) if t.path.rsplit(".", 1)[-1] in _GEOMETRY]
    if not geometry or len(geometry) > MAX_VERTEX_INPUTS:
        return
    points = np.tile(np.array([t.nominal for t in tols]), (2 ** len(geometry), 1))
    for row, corner in enumerate(itertools.product((0, 1), repeat=len(geometry))):
        for i, c in zip(geometry, corner):
            points[row, i] = tols[i].spread[c]
    if not np.all(joints.closed(points).assembles):
        names = ", ".join(found[i].path for i in geometry)
        raise ModelError(f"{found[geometry[0]].path}: within the tolerances of {names} (the "
                         "worst-case box or +-6 sigma of a normal) the bolt could fail to pass "
                         "the grip, or its thread start outside it; narrow them", file=source,
                         line=found[geometry[0]].line)


def run_joint_study(joint, found, build, samples=10_000, seed=1, outputs=None,
                    progress=None) -> Study:
    """Study a joint over its toleranced inputs (see :func:`axialfe.tolerance.study.run_study`
    for the fields of the result).

    Parameters
    ----------
    joint : Joint
        The joint at its nominal values.
    found : sequence of Toleranced
        Its toleranced inputs (:func:`axialfe.joints.reader.read_joint_toleranced`).
    build : callable
        ``build({path: SI value})``: the joint read again with those inputs moved.

    Outputs are ``<state>:bolt_force`` and ``<state>:clamp_force``; events
    ``separates``, ``clamp-below-minimum`` and ``check-fails`` (one per check of each
    state, and ``checks`` for any of them).
    """
    if not found:
        raise ModelError("the joint has no toleranced input: write one as, e.g., "
                         "nut_factor = \"0.2 ±0.03\" or torque = \"70 N*m ±5\"",
                         file=joint.source)
    if len(found) > MAX_VERTEX_INPUTS:
        raise ModelError(f"a joint study takes at most {MAX_VERTEX_INPUTS} toleranced inputs: "
                         f"got {len(found)}", file=joint.source)
    nominal = solve_joint(joint)
    states = [s.name for s in nominal.states]
    known = [f"{s}:{o}" for s in states for o in JOINT_OUTPUTS]
    for name in outputs or ():
        if name not in known:
            raise ModelError(f"unknown output '{name}'", place="--output",
                             hint=suggest(name, known), options=known)
    chosen = _Chosen(dict.fromkeys(outputs) if outputs else known)
    paths = [t.path for t in found]
    tols = [t.tolerance for t in found]
    joints = _Joints(joint, found, build, chosen.names)
    _refuse(joints, found, tols, joint.source)
    lower = np.array([t.lower for t in tols])
    upper = np.array([t.upper for t in tols])
    draws = {}
    events = []
    x = None
    if samples:
        x = _draw(tols, samples, seed)
        out, separated, checks, low = joints.evaluate(x)
        if progress is not None:
            progress(samples, samples)
        draws = {n: out[n] for n in chosen.names}
        undecided = 0
        for state in states:
            events.append(_event(state, "separates", state,
                                 int(np.count_nonzero(separated[state])), samples))
            if joint.minimum_clamp_force is not None:
                events.append(_event(state, "clamp-below-minimum", state,
                                     int(np.count_nonzero(low[state])), samples))
            kinds = [k for s, k in checks if s == state]
            fails = np.zeros(samples, dtype=bool)
            for kind in kinds:
                bad = checks[(state, kind)] == 0
                fails |= bad
                undecided += int(np.count_nonzero(checks[(state, kind)] == -1))
                events.append(_event(kind, "check-fails", state, int(np.count_nonzero(bad)),
                                     samples))
            events.append(_event("checks", "check-fails", state, int(np.count_nonzero(fails)),
                                 samples))
    monotone = all(p.rsplit(".", 1)[-1] in _MONOTONE or p.split(".")[-2] in _MONOTONE
                   for p in paths)
    worst, method = _worst_case(joints, chosen, ["joint"], lower, upper, x,
                                {(0, n): v for n, v in draws.items()}, monotone, None)
    rows = []
    for name in chosen.names:
        state, o = name.rsplit(":", 1)
        (lo_v, lo_x), (hi_v, hi_x) = worst[(0, name)]
        row = {"name": name, "case": state, "kind": "force",
               "nominal": float(getattr(nominal.state(state), o)),
               "worst_case": [lo_v, hi_v],
               "worst_case_inputs": [dict(zip(paths, lo_x.tolist())),
                                     dict(zip(paths, hi_x.tolist()))]}
        if samples:
            row.update(statistics(draws[name]))
        rows.append(row)
    notes = ["each sample by the joint-diagram closed forms on arrays: F_i = T/(K*d) where a "
             "torque is given (Shigley, 10th ed., eq. 8-27), F_b = F_i + dF_th + C*P and "
             "F_m = F_i + dF_th - (1 - C)*P until the joint separates, then F_b = P "
             "(eqs. 8-24, 8-25; from memory)"
             + (f"; {joints.alone:,} samples the closed forms do not describe were solved "
                "one by one" if joints.alone else "")]
    if method == "vertices":
        notes.append("worst case by vertices: exact, as the bolt and clamp forces are "
                     "monotone in each of these inputs")
    else:
        notes.append(f"worst case by {method}: lengths, thicknesses and moduli set the "
                     "stiffness, which need not be monotone; the extremes found are local ones")
    if samples:
        notes.append("check-fails: a check of the state fails in the sample (its own name, or "
                     "'checks' for any of them), as 'axialfe joint' judges it"
                     + (f"; {undecided:,} verdicts of samples were undecided and are not "
                        "counted as failures" if undecided else ""))
    notes += input_notes(tols)
    return Study(title=joint.title, samples=samples, seed=seed, worst_case_method=method,
                 inputs=input_rows(paths, tols), outputs=tuple(rows), events=tuple(events),
                 notes=tuple(notes),
                 draws={(name.rsplit(":", 1)[0], name): v for name, v in draws.items()},
                 units=joint.units)
