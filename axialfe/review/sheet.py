"""The arithmetic of the calculation sheet: what a checker redoes by hand, as plain numbers.

Three things a reviewer checks besides each segment's elongation:

- **gap compatibility** (:func:`gap_compatibility`): for each closed gap, the
  closure its stations' displacements give (``u(a) - u(b)`` for a contact
  between ``a`` and ``b``, ``u(b) - u(a)`` for a taut link, ``u(a)`` or
  ``-u(a)`` against a stop) equals its clearance;
- **station balance** (:func:`station_balance`): at each station the forces on
  it (the point load, the pull of each segment end, the reactions, the gap
  forces) sum to zero;
- **thermal and other parts of each force** (:func:`thermal_split`): the force
  the case's temperature changes give alone (the self-limiting, thermal part,
  which practice treats apart from a load-driven force), and the rest.  The
  split is by linearity, exact only while every gap keeps the state it has in
  the case; where the thermal input alone leaves a gap in another state the
  parts are not separable, and the split says so instead of giving numbers.

All values are in SI (m, N), signed as in the results: a force on a station is
positive toward +x.  The output writes them in its units; it computes nothing.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from ..results import CaseResult, Solution

__all__ = ["GapLine", "BalanceLine", "ThermalSplit", "gap_compatibility", "station_balance",
           "thermal_split", "thermal_model"]

# a sum within this many units of rounding of its terms' sizes is zero
_ROUNDING = 1e3 * float(np.finfo(float).eps)


@dataclass(frozen=True)
class GapLine:
    """The compatibility of one closed gap: ``sum(coefficient * u(station)) = clearance``.

    Attributes
    ----------
    gap : str
    terms : tuple of (float, str, float)
        (coefficient, station, displacement in m) of the closure measure.
    closure : float
        The sum of the terms (m).
    clearance : float
        The gap's clearance (m).
    """

    gap: str
    terms: tuple[tuple[float, str, float], ...]
    closure: float
    clearance: float

    @property
    def defect(self) -> float:
        """Closure minus clearance (m); 0 below the rounding bound of the numbers it comes
        from (a closed gap's defect is rounding)."""
        d = self.closure - self.clearance
        bound = _ROUNDING * (sum(abs(c * u) for c, _, u in self.terms) + abs(self.clearance))
        return 0.0 if abs(d) <= bound else d


@dataclass(frozen=True)
class BalanceLine:
    """The forces on one station (N, positive toward +x) and their sum.

    Attributes
    ----------
    station : str
    terms : tuple of (str, float)
        (what acts, force on the station): ``'load'``, ``"segment 'name'"``,
        ``"support (fixed)"``, ``"gap 'name'"``; only those that act here.
    total : float
    """

    station: str
    terms: tuple[tuple[str, float], ...]
    total: float

    @property
    def imbalance(self) -> float:
        """The total; 0 below the rounding bound of its terms."""
        bound = _ROUNDING * sum(abs(f) for _, f in self.terms)
        return 0.0 if abs(self.total) <= bound else self.total


@dataclass(frozen=True)
class ThermalSplit:
    """The thermal part of each segment's force in one case, and the rest.

    Attributes
    ----------
    case : str
    separable : bool
        False when the temperature changes alone leave some gap in another state
        than the case does: no part is then given.
    changed : tuple of str
        The gaps whose state differs (empty when separable).
    thermal, other : ndarray, shape (n_segments, 2) or None
        Axial force (N) at each end from the temperature changes alone, and the
        rest (loads, self-weight, settlements, misfit and preload); they sum to
        the case's force.
    heated : bool
        Whether the case has any temperature change at all.
    """

    case: str
    separable: bool
    changed: tuple[str, ...] = ()
    thermal: np.ndarray | None = None
    other: np.ndarray | None = None
    heated: bool = True


def gap_compatibility(result: CaseResult) -> tuple[GapLine, ...]:
    """The compatibility line of each closed gap of ``result``, in model order.

    Examples
    --------
    A contact between ``a`` and ``b`` with 0.1 mm clearance, closed with u(a) =
    0.3 mm and u(b) = 0.2 mm: u(a) - u(b) = 0.1 mm, the clearance.
    """
    model = result.model
    index = model._station_index
    lines = []
    for j, gap in enumerate(model.gaps):
        if not result.gap_closed[j]:
            continue
        terms = tuple((c, name, float(result.u[index[name]]))
                      for c, name in zip(gap.sign, gap.stations) if c != 0)
        closure = float(sum(c * u for c, _, u in terms))
        lines.append(GapLine(gap.name, terms, closure, float(gap.clearance)))
    return tuple(lines)


def station_balance(result: CaseResult) -> tuple[BalanceLine, ...]:
    """The forces on each station of ``result`` and their sum, stations in order of x.

    A segment pulls each of its end stations toward itself with its tension
    (``N_from`` toward the far end at its ``from`` station, ``N_to`` at its
    ``to`` station); a reaction is the force the support exerts on the bar; a
    gap's force pushes its stations apart (contact) or together (link).
    """
    model = result.model
    index = model._station_index
    xs = np.array([st.x for st in model.stations], dtype=float)
    terms: list[list[tuple[str, float]]] = [[] for _ in model.stations]
    for i, p in enumerate(result.applied):
        if p != 0:
            terms[i].append(("load", float(p)))
    for k, seg in enumerate(model.segments):
        a, b = index[seg.start], index[seg.end]
        e = 1.0 if xs[b] > xs[a] else -1.0
        terms[a].append((f"segment '{seg.name}'", float(e * result.axial_force[k, 0])))
        terms[b].append((f"segment '{seg.name}'", float(-e * result.axial_force[k, 1])))
    for j, sup in enumerate(model.supports):
        terms[index[sup.at]].append((f"support ({sup.kind})", float(result.reactions[j])))
    for j, gap in enumerate(model.gaps):
        if result.gap_force[j] == 0:
            continue
        lam = (-1.0 if gap.kind == "contact" else 1.0) * float(result.gap_force[j])
        for c, name in zip(gap.sign, gap.stations):
            if c != 0:
                terms[index[name]].append((f"gap '{gap.name}'", -c * lam))
    order = sorted(range(len(model.stations)), key=lambda i: xs[i])
    return tuple(BalanceLine(model.stations[i].name, tuple(terms[i]),
                             float(sum(f for _, f in terms[i]))) for i in order)


def thermal_model(solution: Solution):
    """The model of ``solution`` with only the temperature changes of each of its cases.

    One case per solved case (or combination), of the same name, with each
    segment's temperature change as solved; no loads, settlements, self-weight,
    distributed loads, misfits or preloads; the same supports (settlements at
    zero), gaps and clearances.
    """
    from ..model import Case

    model = solution.model
    segments = tuple(dataclasses.replace(s, misfit=0.0, preload=None, distributed_load=0.0,
                                         temperature_change=None) for s in model.segments)
    supports = tuple(dataclasses.replace(s, displacement=0.0) if s.kind == "settlement" else s
                     for s in model.supports)
    cases = tuple(Case(r.name, temperature_change=tuple(
        (s.name, float(dt)) for s, dt in zip(model.segments, r.temperature_change)))
        for r in solution.cases)
    return dataclasses.replace(model, segments=segments, supports=supports, loads=(),
                               cases=cases, combinations=(), temperature_change=None,
                               gravity=0.0, limits=())


def thermal_split(solution: Solution) -> tuple[ThermalSplit, ...]:
    """The thermal part of each segment's force in every case of ``solution``.

    The temperature changes of each case are solved alone (:func:`thermal_model`,
    one more solve of the model); where every gap has the state it has in the
    case, the response is linear in the inputs with that state, so the thermal
    part is that solve's force and the rest is the case's force minus it.

    Examples
    --------
    A steel bar between rigid walls, heated by 50 K and pushed at its middle: its
    thermal force is -E*alpha*dT*A at both ends (Gere and Goodno, Mechanics of
    Materials, 7th ed., sec. 2.5), whatever the load, and the load's part is the
    rest.
    """
    from ..engine.system import solve

    if not any(np.any(r.temperature_change != 0) for r in solution.cases):
        return tuple(ThermalSplit(r.name, True, (), np.zeros_like(r.axial_force),
                                  np.array(r.axial_force), heated=False)
                     for r in solution.cases)
    alone = solve(thermal_model(solution))
    out = []
    for r in solution.cases:
        t = alone[r.name]
        if not np.any(r.temperature_change != 0):
            out.append(ThermalSplit(r.name, True, (), np.zeros_like(r.axial_force),
                                    np.array(r.axial_force), heated=False))
            continue
        changed = tuple(g.name for g, a, b in zip(solution.model.gaps, r.gap_closed,
                                                  t.gap_closed) if bool(a) != bool(b))
        if changed or t.status != "ok":
            out.append(ThermalSplit(r.name, False, changed))
            continue
        thermal = np.array(t.axial_force)
        other = np.array(r.axial_force) - thermal
        # a difference at the level of rounding of the two forces is no force
        noise = _ROUNDING * (np.abs(r.axial_force) + np.abs(thermal))
        other[np.abs(other) <= noise] = 0.0
        out.append(ThermalSplit(r.name, True, (), thermal, other))
    return tuple(out)
