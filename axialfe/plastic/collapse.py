"""Limit analysis: the collapse load factor of a case by the static theorem, as a linear programme.

The static (lower-bound) theorem of plastic limit analysis: any set of segment
forces in equilibrium with lambda times the case's loads, within every
segment's strength ``-N_c <= N <= N_t``, gives a load factor lambda at or below
the collapse factor, and the largest such lambda is the collapse factor
(perfectly plastic, ductile segments, small displacements).  In one dimension
this is a small linear programme, solved by :func:`scipy.optimize.linprog`:

    maximise lambda  subject to  station balance,  N_from - N_to = W0 + lambda*W1,
                                 -N_c <= N_from, N_to <= N_t.

The mechanism (the segments at their limit) is read from the programme's dual
values (a bound with a non-zero marginal is one the factor depends on), not
from a tolerance on the forces.  Temperature, misfit and settlement put only
self-equilibrated forces on the model and do not change the collapse factor.
Self-weight is held; point and distributed loads are scaled.

With properties against temperature the strengths are those at each segment's
temperature in the case (:func:`axialfe.model.temperature.at_temperature`): the
thermal strains still put only self-equilibrated forces on the model, and the
temperature enters the collapse factor only through f_y(T).

Springs and segments without a yield strength are of unlimited strength here.
Models with gaps are refused: their clearances decide which path carries the
load, which :mod:`axialfe.tracking.plastic` follows.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import ModelError, SolveError
from ..model import Model
from ..model.cases import pick_state

__all__ = ["CollapseResult", "collapse", "strengths"]

# A dual value below this share of the largest one is round-off (common practice for LP duals).
_DUAL_NOISE = 1e-9


@dataclass(frozen=True, repr=False)
class CollapseResult:
    """The collapse of one case.

    Attributes
    ----------
    case : str
    load_factor : float
        The collapse factor on the case's point and distributed loads.
    mechanism : tuple of str
        The segments at their limit in the collapse (tension or compression).
    limit_sides : tuple of str
        ``'tension'`` or ``'compression'`` for each segment of ``mechanism``.
    axial_force : ndarray, shape (n_segments, 2)
        One statically admissible field at collapse (N, from and to ends): unique
        in the mechanism, one choice of many elsewhere.
    buckling_capped_load_factor : float or None
        The factor with every segment's compression capped at its buckling
        capacity, given when a compressed segment of the mechanism buckles
        before it yields; None otherwise.
    notes : tuple of str
    model : Model
    """

    case: str
    load_factor: float
    mechanism: tuple[str, ...]
    limit_sides: tuple[str, ...]
    axial_force: np.ndarray
    buckling_capped_load_factor: float | None
    notes: tuple[str, ...]
    model: Model = field(compare=False)

    def to_dict(self, units=None) -> dict:
        units = units or self.model.units
        fF = units.factor("force")
        return {"title": self.model.title, "case": self.case, "load_factor": self.load_factor,
                "mechanism": list(self.mechanism),
                "segments": [{"name": s.name, "axial_force": (self.axial_force[i] / fF).tolist()}
                             for i, s in enumerate(self.model.segments)],
                "buckling_capped_load_factor": self.buckling_capped_load_factor,
                "notes": list(self.notes)}

    def __repr__(self):
        return (f"<CollapseResult '{self.case}': load factor {self.load_factor:.6g}, "
                f"mechanism {', '.join(self.mechanism) or '-'}>")


def strengths(model: Model):
    """Tension and compression strength of each segment (N; inf without a yield strength).

    The weaker end of a taper governs (its force is constant along it when it
    carries no distributed load, which :func:`collapse` requires).
    """
    t, c = [], []
    for seg in model.segments:
        area = min(s.area for s in seg.sections)
        fy = seg.material.yield_strength
        fc = seg.material.compressive_yield_strength or fy
        t.append(np.inf if fy is None else fy * area)
        c.append(np.inf if fc is None else fc * area)
    return np.array(t), np.array(c)


def _programme(model, asm, state, t_cap, c_cap):
    """Solve the linear programme; return (linprog result, m, n)."""
    from scipy.optimize import linprog

    from ..engine.assembly import element_loads

    n, m, r = len(model.stations), len(model.segments), len(model.supports)
    _, _, _, W0 = element_loads(asm, np.zeros(m), 0.0)
    _, _, _, Wq = element_loads(asm, np.zeros(m), state.q_factor)
    W1 = Wq - W0
    # unknowns: lambda, N_from (m), N_to (m), reactions (r)
    nv = 1 + 2 * m + r
    A = np.zeros((n + m, nv))
    b = np.zeros(n + m)
    seg = np.arange(m)
    d = asm.direction
    A[asm.start, 1 + seg] += d          # a tensile segment pulls its from station toward its to end
    A[asm.end, 1 + m + seg] -= d
    at = np.array([model.station_index(s.at) for s in model.supports], dtype=int)
    A[at, 1 + 2 * m + np.arange(r)] = 1.0
    A[:n, 0] = state.forces              # balance: segments + reactions + lambda*F = 0
    A[n + seg, 1 + seg] = 1.0
    A[n + seg, 1 + m + seg] = -1.0
    A[n + seg, 0] = -W1
    b[n:] = W0
    bound = [(None if not np.isfinite(c) else -c, None if not np.isfinite(t) else t)
             for t, c in zip(t_cap, c_cap)]
    bounds = [(0, None)] + bound + bound + [(None, None)] * r
    cost = np.zeros(nv)
    cost[0] = -1.0
    scale = max(np.abs(A).max(), 1.0)
    res = linprog(cost, A_eq=A / scale, b_eq=b / scale, bounds=bounds, method="highs")
    return res, m


def collapse(model: Model, case: str | None = None, check_buckling: bool = True) -> CollapseResult:
    """The collapse load factor of a case by the static theorem of limit analysis.

    Parameters
    ----------
    model : Model
    case : str, optional
        The case or combination (required when there are several).
    check_buckling : bool
        Cap compressed segments of the mechanism at their buckling capacity
        (:func:`axialfe.checks.buckling.buckling_capacities`) when it is lower.

    Raises
    ------
    ModelError
        For a model with gaps, an unknown case, a taper carrying a distributed load.
    SolveError
        When the loads never collapse the model, or the held loads alone exceed it.

    Examples
    --------
    A bar fixed at both ends, loaded at an interior point, collapses when both
    parts yield: P_P = f_y*(A_1 + A_2):

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Model
    >>> steel = Material("steel", 200e9, yield_strength=250e6)
    >>> a1, a2 = (Section(n, "area", (("area", a),)) for n, a in (("a1", 2e-4), ("a2", 1e-4)))
    >>> bar = Model([Station("A", 0.0), Station("C", 0.4), Station("B", 1.0)],
    ...             [Segment("AC", "A", "C", steel, a1), Segment("CB", "C", "B", steel, a2)],
    ...             [Support("A"), Support("B")], [Load("C", 1000.0)])
    >>> round(collapse(bar).load_factor * 1000.0 / (250e6 * 3e-4), 9)  # should be 1
    1.0
    """
    from ..engine.assembly import assemble
    from ..model.temperature import (at_temperature, basis_note, constant_compression_note,
                                     has_tables)

    if model.gaps:
        raise ModelError("limit analysis cannot follow gaps (the clearances decide which parts "
                         "carry the load): track the loading with 'axialfe path' instead",
                         file=model.source, place="gaps")
    for seg in model.segments:
        if seg.end_section is not None and seg.distributed_load:
            raise ModelError("limit analysis of a taper under a distributed load is not "
                             "supported: split the segment into shorter prismatic ones",
                             file=model.source, place=f"segments ('{seg.name}')")
    state = pick_state(model, case)
    notes = []
    tabled = has_tables(model)
    if tabled:
        # the strengths (and the moduli of the buckling check) at each segment's temperature
        # in the case; the thermal strains themselves do not enter the programme
        notes.append(basis_note(model) + f", in case '{state.name}'")
        constant = constant_compression_note(model)
        if constant:
            notes.append(constant)
        model = at_temperature(model, state)
    asm = assemble(model)
    t_cap, c_cap = strengths(model)
    free = [s.name for s, t in zip(model.segments, t_cap) if not np.isfinite(t)]
    if free:
        notes.append("no yield strength, taken as unlimited: "
                     + ", ".join(f"'{n}'" for n in free))
    if any(s.kind == "spring" for s in model.supports):
        notes.append("springs are taken as unlimited in strength")
    hardening = [s.name for s in model.segments if s.material.hardening_modulus > 0]
    if hardening:
        notes.append("hardening is ignored (perfectly plastic at the yield strength): the "
                     "factor is a lower bound for " + ", ".join(f"'{n}'" for n in hardening))
    res, m = _programme(model, asm, state, t_cap, c_cap)
    where = f"case '{state.name}'"
    if res.status == 3:
        raise SolveError(f"the loads of {where} never collapse the model: a path of unlimited "
                         "strength (a support, a spring or a segment without a yield strength) "
                         "carries them", file=model.source)
    if res.status == 2:
        raise SolveError(f"the held loads of {where} (self-weight) alone exceed the strength of "
                         "the model", file=model.source)
    if res.status != 0:
        raise SolveError(f"the limit analysis of {where} did not finish: {res.message}",
                         file=model.source)
    factor = float(res.x[0])
    forces = np.column_stack([res.x[1:1 + m], res.x[1 + m:1 + 2 * m]])
    duals = np.column_stack([res.upper.marginals[1:1 + m], res.upper.marginals[1 + m:1 + 2 * m],
                             res.lower.marginals[1:1 + m], res.lower.marginals[1 + m:1 + 2 * m]])
    big = max(np.abs(duals).max(initial=0.0), 1e-300)
    active = np.abs(duals) > _DUAL_NOISE * big
    tension = active[:, 0] | active[:, 1]
    compression = active[:, 2] | active[:, 3]
    in_mech = np.flatnonzero(tension | compression)
    mechanism = tuple(model.segments[i].name for i in in_mech)
    sides = tuple("tension" if tension[i] else "compression" for i in in_mech)
    capped = None
    if check_buckling and compression.any():
        from ..checks.buckling import buckling_capacities

        caps = buckling_capacities(model, model.checks)
        lower = c_cap.copy()
        weak = []
        for i in np.flatnonzero(compression):
            cap, why = caps[i]
            name = model.segments[i].name
            if cap is None:
                notes.append(f"'{name}' is compressed in the mechanism and its buckling capacity "
                             f"is undecided ({why}): the collapse factor assumes it reaches its "
                             "yield force, which the tool cannot confirm")
            elif cap < c_cap[i]:
                weak.append(f"'{name}' ({cap:.6g} N against a squash load of {c_cap[i]:.6g} N)")
        for i, (cap, _) in enumerate(caps):
            if cap is not None and cap < lower[i]:
                lower[i] = cap
        if weak:
            res_b, _ = _programme(model, asm, state, t_cap, lower)
            if res_b.status == 0:
                capped = float(res_b.x[0])
            notes.append("compressed in the mechanism and buckling before it yields: "
                         + ", ".join(weak) + "; the capped factor holds every compressed segment "
                         "at its buckling capacity (a buckled strut sheds load, so even that "
                         "factor is not a safe collapse load)")
    notes.append("temperature, misfit and settlement do not change the collapse factor "
                 "(they stress the model in self-equilibrium)"
                 + ("; the temperature enters only through the yield strengths at it"
                    if tabled else ""))
    return CollapseResult(state.name, factor, mechanism, sides, forces, capped, tuple(notes),
                          model)
