"""A tolerance study of a bolted joint file: its states' bolt and clamp forces over toleranced inputs.

Any toleranced value of a joint file is an input (torque, nut factor, preload,
lengths and thicknesses, moduli and expansion coefficients of its own
materials, temperatures, external loads, the minimum clamp force).  Every
sample is evaluated at once by the joint-diagram closed forms on arrays
(:func:`axialfe.joints.joint.closed_states`: the preload F_i = T/(K*d) with
the sampled torque and nut factor, Shigley, 10th ed., eq. 8-27, from memory;
F_b and F_m of eqs. 8-24 and 8-25; the stiffness of eqs. 8-17 and 8-20).
Samples the closed forms do not describe (a state that separates under no
pull) are solved one by one by :func:`axialfe.joints.joint.solve_joint`.  The
forces are monotone in each load-type input (torque, nut factor, preload,
temperatures, loads, expansion), so the vertices give their worst case
exactly; lengths, thicknesses and moduli set the stiffness and are polished by
the model study's local search.
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError, suggest
from ..joints.joint import closed_states, joint_parameters, solve_joint
from .closed import ClosedBatch, refuse_problems, run_closed_study

__all__ = ["run_joint_study", "JOINT_OUTPUTS"]

JOINT_OUTPUTS = ("bolt_force", "clamp_force")
# inputs through which the forces are monotone (so the vertices give the worst case)
_MONOTONE = ("torque", "nut_factor", "preload", "temperature", "temperatures",
             "external_load", "minimum_clamp_force", "thermal_expansion")


class _Joints(ClosedBatch):
    """Many samples of one joint: outputs, separation, clamp and check verdicts on arrays."""

    def __init__(self, joint, found, build):
        super().__init__(joint_parameters, build, found, joint.source)
        self.joint = joint
        self.refuse_geometry(("length", "thread_length", "thickness"),
                             lambda p: closed_states(joint, p).assembles,
                             "the bolt could fail to pass the grip, or its thread start "
                             "outside it")

    def chunk(self, rows):
        p = self.map.at(rows)
        cs = closed_states(self.joint, p)
        out = {f"{s}:{o}": np.array(getattr(cs, o)[s]) for s in cs.bolt_force
               for o in JOINT_OUTPUTS}
        sep = {s: np.array(v) for s, v in cs.separated.items()}
        checks = {k: np.array(np.broadcast_to(v, len(rows))) for k, v in cs.checks.items()}
        for i in np.flatnonzero(cs.unsure):   # not described by the closed forms
            self.alone += 1
            result = solve_joint(self.build(self.values(rows[i])))
            for st in result.states:
                for o in JOINT_OUTPUTS:
                    out[f"{st.name}:{o}"][i] = getattr(st, o)
                sep[st.name][i] = st.separated
            for case in result.checks.cases:
                for e in case.entries:
                    checks[(case.case, e.kind)][i] = -1 if e.ok is None else int(e.ok)
        flags, undecided = {}, 0
        for s in sep:
            flags[(s, "separates", s)] = sep[s]
            if self.joint.minimum_clamp_force is not None:
                flags[(s, "clamp-below-minimum", s)] = np.broadcast_to(
                    out[f"{s}:clamp_force"] < p["minimum_clamp_force"], len(rows))
            fails = np.zeros(len(rows), dtype=bool)
            for (state, kind), ok in checks.items():
                if state == s:
                    flags[(kind, "check-fails", s)] = ok == 0
                    fails |= ok == 0
                    undecided += int(np.count_nonzero(ok == -1))
            flags[("checks", "check-fails", s)] = fails
        return out, flags, undecided


def run_joint_study(joint, found, build, samples=10_000, seed=1, outputs=None,
                    progress=None):
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
    ``separates``, ``clamp-below-minimum`` and ``check-fails`` (one per check of
    each state, and ``checks`` for any of them).
    """
    refuse_problems(found, joint.source, "the joint has no toleranced input: write one as, "
                    "e.g., nut_factor = \"0.2 ±0.03\" or torque = \"70 N*m ±5\"")
    nominal = solve_joint(joint)
    values = {f"{s.name}:{o}": (s.name, "force", getattr(s, o)) for s in nominal.states
              for o in JOINT_OUTPUTS}
    for name in outputs or ():
        if name not in values:
            raise ModelError(f"unknown output '{name}'", place="--output",
                             hint=suggest(name, list(values)), options=list(values))
    batch = _Joints(joint, found, build)
    monotone = all(p.rsplit(".", 1)[-1] in _MONOTONE or p.split(".")[-2] in _MONOTONE
                   for p in batch.paths)
    notes = ["each sample by the joint-diagram closed forms on arrays: F_i = T/(K*d) where a "
             "torque is given (Shigley, 10th ed., eq. 8-27), F_b = F_i + dF_th + C*P and "
             "F_m = F_i + dF_th - (1 - C)*P until the joint separates, then F_b = P "
             "(eqs. 8-24, 8-25; from memory)"]
    return run_closed_study(batch, joint.title, joint.units, values,
                            list(dict.fromkeys(outputs)) if outputs else list(values),
                            samples, seed, monotone, notes, progress)
