"""Preloads: a segment's installed force turned into the misfit that gives it.

A segment may be given ``preload`` (N, tension positive) instead of a misfit.
Before a model is solved, each preload is replaced by the misfit that makes the
segment carry that force in the *installed* state: no point or distributed
loads, no self-weight, no temperature change, no settlement.  The misfit comes
from the model's own response, so it holds for any topology.

The force of a segment is a continuous, piecewise-linear, non-increasing
function of its own misfit (the least strain energy is convex in the misfit,
and the segment force is minus its derivative; gaps make the pieces).  Within
one contact state it is exactly affine, so the misfit is found by secant steps
on solves of the model itself, each exact once its two points share a piece,
with a bracket and bisection to guarantee progress across the pieces; the
answer is accepted when the force equals the preload to rounding, never read
off a grid.  Several preloads are found together by Newton steps on the same
exact pieces.

A segment whose force does not respond to its misfit (no closed loop restrains
it, or its loop is held open by a gap that never closes) cannot be preloaded:
that is a located :class:`~axialfe.errors.ModelError`.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..errors import ModelError, SolveError
from ..formatting import number
from ..model import Model
from ..model.cases import case_state
from .assembly import assemble
from .system import System

__all__ = ["resolve_preloads", "installed_model"]

_RTOL = 1e-9      # a preload is met when the force equals it to this part of the force scale
_MAX_STEPS = 200  # solves of the model per preload search, a bound never met in practice


def installed_model(model: Model) -> Model:
    """The model as installed: its parts and misfits, with no loads of any kind.

    Point and distributed loads, self-weight, temperature changes (the model's,
    each segment's and every case's) and settlements are removed; cases and
    combinations go, leaving the single case ``base``.
    """
    segments = tuple(replace(s, temperature_change=None, distributed_load=0.0)
                     for s in model.segments)
    supports = tuple(replace(s, displacement=0.0) if s.kind == "settlement" else s
                     for s in model.supports)
    return replace(model, segments=segments, supports=supports, loads=(), cases=(),
                   combinations=(), temperature_change=None, gravity=0.0, limits=())


def _with_misfits(model: Model, index, misfits) -> Model:
    segments = list(model.segments)
    for i, m in zip(index, misfits):
        segments[i] = replace(segments[i], misfit=float(m))
    return replace(model, segments=tuple(segments))


class _Response:
    """Forces of the preloaded segments of the installed model, as a function of their misfits."""

    def __init__(self, model: Model, index):
        self.model = installed_model(model)
        self.index = list(index)
        self.calls = 0

    def __call__(self, misfits):
        self.calls += 1
        trial = _with_misfits(self.model, self.index, misfits)
        result = System(trial).solve_state(case_state(trial, trial.all_cases[0]))
        return result.axial_force[self.index, 0].astype(float)


def _force_text(model: Model, force: float) -> str:
    unit = model.units.force
    return f"{number(force / model.units.factor('force'))} {unit}"


def _no_response(model: Model, i: int) -> ModelError:
    seg = model.segments[i]
    return ModelError(
        f"preload: no closed loop restrains this segment (its force does not change with its "
        f"length), so no misfit gives it {_force_text(model, seg.preload)}; clamp it between "
        "parts that hold both its ends, or give 'misfit' instead",
        place=f"segments[{i + 1}] ('{seg.name}')", file=model.source,
        line=model.line_of(f"segments.{seg.name}"))


def _span(model: Model) -> float:
    xs = [st.x for st in model.stations]
    return max(xs) - min(xs)


def _solve_one(model: Model, i: int, response: _Response, k: float) -> float:
    """The misfit of segment ``i`` that gives its preload: secant steps with a bracket.

    A trial misfit at which the installed model has no unique equilibrium (a part
    held only by gaps that this misfit leaves open) tells nothing of the force; it
    lies on the slack side of the answer, where those gaps have not yet closed, so
    the search goes on past it as if the force there fell short of the preload.
    """
    target = model.segments[i].preload

    failed = []

    def f_of(m, short):
        try:
            return float(response([m])[0]) - target
        except SolveError as exc:
            failed.append(exc)
            return short

    m0 = 0.0
    f0 = f_of(m0, -target)  # unsolvable: taken as carrying nothing yet
    scale = max(abs(target), abs(f0 + target))
    tol = _RTOL * scale if scale > 0 else 0.0
    if abs(f0) <= tol:
        return m0
    # |dN/dm| never exceeds the segment's own stiffness k, so this step cannot pass the root
    step = f0 / k  # f falls as m grows: a force short of the preload needs a shorter part
    limit = max(_span(model), abs(step))
    m1, f1 = m0 + step, None
    while True:  # march until the force responds
        f1 = f_of(m1, f0)
        if abs(f1) <= _RTOL * max(scale, k * abs(m1)):
            return m1
        if abs(f1 - f0) > _RTOL * max(scale, k * abs(m1)):
            break
        if abs(m1) > limit:  # as long as the whole model, and still no response
            raise _no_response(model, i)
        m0, f0 = m1, f1
        step *= 2.0
        m1 = m0 + step
    lo = hi = None  # the bracket: f(lo) > 0 > f(hi) (f is non-increasing)
    for m, f in ((m0, f0), (m1, f1)):
        if f > 0:
            lo = m if lo is None or m > lo else lo
        else:
            hi = m if hi is None or m < hi else hi
    prev, cur = (m0, f0), (m1, f1)
    for _ in range(_MAX_STEPS):
        (mp, fp), (mc, fc) = prev, cur
        if fc == fp:
            nxt = None
        else:
            nxt = mc - fc * (mc - mp) / (fc - fp)
        inside = (nxt is not None and (lo is None or nxt > lo) and (hi is None or nxt < hi))
        if not inside:
            if lo is not None and hi is not None:
                nxt = 0.5 * (lo + hi)
            else:  # no sign change yet: keep marching the way the force must go
                nxt = mc + 2.0 * (mc - mp)
                if abs(nxt) > 2.0 * limit:
                    raise _no_response(model, i)
        f = f_of(nxt, f0)
        if abs(f) <= _RTOL * max(scale, k * abs(nxt)):
            return nxt
        if f > 0:
            lo = nxt if lo is None or nxt > lo else lo
        else:
            hi = nxt if hi is None or nxt < hi else hi
        prev, cur = cur, (nxt, f)
        if failed and lo is not None and hi is not None and hi - lo <= 1e-12 * abs(hi):
            break  # closed in on the edge of misfits the engine cannot solve
    if failed:
        raise ModelError("preload: the installed model has no unique equilibrium near the misfit "
                         f"that would give this force ({failed[-1].message})",
                         place=f"segments[{i + 1}] ('{model.segments[i].name}')",
                         file=model.source, line=model.line_of(f"segments.{model.segments[i].name}"))
    raise ModelError("preload: the misfit that gives this force was not found within "
                     f"{_MAX_STEPS} solves", place=f"segments[{i + 1}] "
                     f"('{model.segments[i].name}')", file=model.source,
                     line=model.line_of(f"segments.{model.segments[i].name}"))


def _solve_many(model: Model, index, response: _Response, k) -> np.ndarray:
    """Several preloads together: Newton steps on the exact piece of the current point."""
    target = np.array([model.segments[i].preload for i in index])
    m = np.zeros(len(index))
    f = response(m) - target
    scale = np.maximum(np.abs(target), np.abs(f + target)).max()
    for _ in range(_MAX_STEPS):
        if np.all(np.abs(f) <= _RTOL * max(scale, float(np.max(k * np.abs(m))))):
            return m
        # each column: a step that cannot pass that segment's own root (|dN/dm| <= k)
        steps = np.where(f != 0, -f / k, -scale / k)
        J = np.empty((len(index), len(index)))
        for j in range(len(index)):
            trial = m.copy()
            trial[j] += steps[j]
            J[:, j] = (response(trial) - target - f) / steps[j]
        dead = [j for j in range(len(index)) if abs(J[j, j]) <= _RTOL * k[j]]
        if dead:
            raise _no_response(model, index[dead[0]])
        try:
            m = m - np.linalg.solve(J, f)
        except np.linalg.LinAlgError:
            raise ModelError("preload: the preloaded segments "
                             + ", ".join(f"'{model.segments[i].name}'" for i in index)
                             + " act on the same loop; their forces cannot be set one by one",
                             place="segments", file=model.source) from None
        f = response(m) - target
    raise ModelError("preload: the misfits that give these forces were not found within "
                     f"{_MAX_STEPS} steps", place="segments", file=model.source)


def resolve_preloads(model: Model) -> Model:
    """Return ``model`` with the misfit of every preloaded segment set to give its preload.

    A model without preloads is returned as it is.  The segments keep their
    ``preload``; their ``misfit`` is the one found (reported as
    ``preload_misfit``).

    Raises
    ------
    ModelError
        When a preloaded segment's force does not respond to its misfit.

    Examples
    --------
    A steel bolt clamping an aluminium sleeve (two parallel segments between
    the same stations): the misfit that gives a preload F is
    -F*(1/k_bolt + 1/k_sleeve), the bolt made short.

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Model
    >>> steel, alu = Material("steel", 200e9), Material("alu", 70e9)
    >>> a = Section("a", "area", (("area", 1e-4),))
    >>> m = Model([Station("head", 0.0), Station("nut", 0.05)],
    ...           [Segment("bolt", "head", "nut", steel, a, preload=20e3),
    ...            Segment("sleeve", "head", "nut", alu, a)], [Support("head")])
    >>> misfit = resolve_preloads(m).segments[0].misfit
    >>> exact = -20e3 * (0.05 / (200e9 * 1e-4) + 0.05 / (70e9 * 1e-4))
    >>> abs(misfit - exact) < 1e-12 * abs(exact)   # should be True
    True
    """
    index = np.flatnonzero(~np.isnan(model.arrays.preload)).tolist()
    if not index:
        return model
    response = _Response(model, index)
    k = assemble(model).stiffness[index]
    if len(index) == 1:
        misfits = [_solve_one(model, index[0], response, float(k[0]))]
    else:
        misfits = _solve_many(model, index, response, k)
    return _with_misfits(model, index, misfits)
