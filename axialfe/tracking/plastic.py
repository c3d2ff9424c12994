"""Elastic-plastic load paths: exact, event by event, with plastic strain kept on unloading.

A path is a list of legs, each changing one parameter linearly (the load
factor, a uniform temperature change, a factor on the case's own temperature
field, or an absolute temperature) while the others hold.  In one dimension
the response is piecewise linear along it: between events every segment is
either elastic or yielding at a known force, so the path is followed exactly.

A yielding segment is a unilateral constraint of the same kind as a gap, on
its plastic elongation ``p`` instead of a closure: with ``N`` its force, ``h =
H*A/L`` its hardening stiffness and ``-N_c <= N - h*p <= N_t`` its yield
condition, the plastic rates of the segments at a yield bound solve the linear
complementarity problem (rates per unit of the leg's parameter)

    w = -side*(N_el' + S @ (side*z)) + h*z >= 0,   z >= 0,   w*z = 0,

``S`` the change of force per unit plastic elongation (a misfit, built from the
one factorisation of :class:`~axialfe.engine.system.System`, as the gap matrix
``B K^-1 B^T`` is) and ``side`` +1 at the tension bound, -1 at the compression
one.  It is solved by the engine's pivoting (:func:`axialfe.engine.pivoting.lemke`);
a ray (no solution) is a mechanism: the model ``collapses``.  Within an interval
everything is affine in the parameter, so the next event (an elastic segment
reaching a bound) is the root of an affine function; a segment whose rate
solution leaves its bound ``unloads`` and keeps its plastic strain.

Scope: prismatic plastic segments without distributed load or self-weight; no
gaps yet (a model with gaps is refused with a message).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import ModelError, SolveError, suggest
from ..model import Model
from ..model.cases import LoadState, load_states
from ..results import CaseResult
from ..units import kelvin_to_temperature, temperature_to_kelvin, unit_factor

__all__ = ["LEG_PARAMETERS", "OUTCOMES", "Leg", "PathEvent", "PathState", "PathResult",
           "parse_path", "track_path"]

LEG_PARAMETERS = ("load", "temperature-change", "temperature-factor", "temperature")
OUTCOMES = ("shakedown", "alternating", "ratcheting", "elastic")
# A plastic elongation below this share of a segment's yield elongation is rounding (the
# rounding bound of the path, for the cycle outcome).
_PLASTIC_NOISE = 1e-9
# Roots closer than this share of a leg are one event (rounding of an affine root).
_SAME = 1e-12


@dataclass(frozen=True)
class Leg:
    """One leg: ``parameter`` from ``start`` to ``stop`` in ``unit`` ('1' for factors)."""

    index: int
    parameter: str
    start: float
    stop: float
    unit: str

    def value(self, t: float) -> float:
        return self.start + t * (self.stop - self.start)


@dataclass(frozen=True)
class PathEvent:
    """``event`` ('yields', 'unloads', 'collapses') of ``name`` on leg ``leg`` at ``value``."""

    leg: int
    name: str
    event: str
    value: float


@dataclass(frozen=True, repr=False)
class PathState:
    """The state at the end of a leg: the result as ``solve`` gives it, and the plastic part."""

    leg: int
    value: float
    result: CaseResult
    plastic_strain: np.ndarray        # per segment
    plastic_displacement: np.ndarray  # per station: u of the plastic strains alone

    def to_dict(self, units) -> dict:
        out = self.result.to_dict(units)
        fD = units.factor("displacement")
        for i, seg in enumerate(out["segments"]):
            seg["plastic_strain"] = float(self.plastic_strain[i])
        for i, st in enumerate(out["stations"]):
            st["plastic_displacement"] = float(self.plastic_displacement[i] / fD)
        return {"leg": self.leg, "value": self.value, **out}


@dataclass(frozen=True, repr=False)
class PathResult:
    """A tracked path.

    Attributes
    ----------
    legs : tuple of Leg
        Every leg of the path, cycles expanded, numbered from 1.
    events : tuple of PathEvent
    states : tuple of PathState
        One per leg run (legs after a collapse are not run).
    cycles : dict or None
        ``{"count", "outcome", "decided_at"}`` with ``--cycles``.
    collapsed_on : int or None
        The leg on which the model collapsed.
    history : tuple of (leg, value, forces) tuples
        The segment forces (N, per segment) at the start, every event and every
        leg end, for plots.
    notes : tuple of str
    model : Model
    case : str
    """

    legs: tuple[Leg, ...]
    events: tuple[PathEvent, ...]
    states: tuple[PathState, ...]
    cycles: dict | None
    collapsed_on: int | None
    history: tuple
    notes: tuple[str, ...]
    model: Model = field(compare=False)
    case: str = ""

    def to_dict(self, units=None) -> dict:
        units = units or self.model.units
        return {"title": self.model.title, "units": units.as_dict(), "case": self.case,
                "legs": [{"index": g.index, "parameter": g.parameter, "from": g.start,
                          "to": g.stop, "unit": g.unit} for g in self.legs],
                "events": [{"leg": e.leg, "name": e.name, "event": e.event, "value": e.value}
                           for e in self.events],
                "states": [s.to_dict(units) for s in self.states],
                "cycles": self.cycles, "collapsed_on": self.collapsed_on,
                "notes": list(self.notes)}

    def __repr__(self):
        return (f"<PathResult '{self.case}': {len(self.states)} of {len(self.legs)} legs, "
                f"{len(self.events)} events>")


# --- the path text -------------------------------------------------------------
def _leg_range(text, parameter, where):
    from .sweep import parse_range

    inner = {"load": "load_factor", "temperature-factor": "load_factor",
             "temperature-change": "temperature_change", "temperature": "temperature"}[parameter]
    try:
        return parse_range(text, inner)
    except ModelError as exc:
        message = exc.message.replace("a load factor is", f"a {parameter.replace('-', ' ')} is")
        raise ModelError(message, place=where) from None


def parse_path(text: str, cycles: int | None = None, cycle_from: int | None = None):
    """Read ``"load 0..1; temperature-change 0 K..150 K"`` into legs, cycles expanded.

    Returns ``(legs, cycle_legs)``: every leg in order, and the indices (from 1)
    of the legs of each cycle (empty without ``cycles``).

    Raises
    ------
    ModelError
        For an unknown parameter, a malformed range, or cycles that do not fit.
    """
    pieces = [p.strip() for p in text.split(";")]
    if not text.strip() or any(not p for p in pieces):
        raise ModelError(f"expected legs separated by ';', e.g. 'load 0..1; temperature-change "
                         f"0 K..100 K': got '{text}'", place="--path")
    base = []
    for i, piece in enumerate(pieces, 1):
        where = f"--path leg {i}"
        name, _, rest = piece.partition(" ")
        if name not in LEG_PARAMETERS:
            raise ModelError(f"unknown parameter '{name}'", place=where,
                             hint=suggest(name, LEG_PARAMETERS), options=LEG_PARAMETERS)
        start, stop, unit = _leg_range(rest.strip(), name, where)
        base.append((name, start, stop, unit))
    if cycles is None:
        if cycle_from is not None:
            raise ModelError("--cycle-from belongs to --cycles: give --cycles as well")
        return tuple(Leg(i, *b) for i, b in enumerate(base, 1)), ()
    if cycles < 1:
        raise ModelError(f"must be at least 1: got {cycles}", place="--cycles")
    k = 1 if cycle_from is None else cycle_from
    if not 1 <= k <= len(base):
        raise ModelError(f"must name a leg from 1 to {len(base)}: got {k}", place="--cycle-from")
    legs = [Leg(i, *b) for i, b in enumerate(base[:k - 1], 1)]
    groups = []
    for _ in range(cycles):
        group = []
        for b in base[k - 1:]:
            legs.append(Leg(len(legs) + 1, *b))
            group.append(len(legs))
        groups.append(tuple(group))
    return tuple(legs), tuple(groups)


# --- the tracker ---------------------------------------------------------------
class _Thermal:
    """The thermal input: none, a uniform change (K), or a factor on the case's field."""

    def __init__(self, mode="none", value=0.0):
        self.mode, self.value = mode, value


def _nodal(asm, delta):
    """Equivalent nodal forces of free changes of length ``delta`` (columns allowed)."""

    delta = np.asarray(delta, float)
    zero = np.zeros_like(delta)
    k = asm.stiffness if delta.ndim == 1 else asm.stiffness[:, None]
    d = asm.direction if delta.ndim == 1 else asm.direction[:, None]
    f_from, f_to = -k * delta, k * delta + zero
    out = np.zeros((asm.n,) + delta.shape[1:])
    np.add.at(out, asm.start, d * f_from)
    np.add.at(out, asm.end, d * f_to)
    return out


def _plastic_scope(model):
    """The plastic segments; a taper or distributed load on one is an error."""
    rows = []
    for i, seg in enumerate(model.segments):
        if not seg.material.plastic:
            continue
        place = f"segments ('{seg.name}')"
        line = model.line_of(f"segments.{seg.name}")
        if seg.end_section is not None:
            raise ModelError("an elastic-plastic segment must be prismatic (a taper yields over "
                             "part of its length first): split it into shorter prismatic "
                             "segments", file=model.source, line=line, place=place)
        if seg.distributed_load or (model.gravity and seg.material.density):
            raise ModelError("an elastic-plastic segment cannot carry a distributed load or "
                             "self-weight (its force varies along it): split it into shorter "
                             "segments with the load as point loads at the new stations",
                             file=model.source, line=line, place=place)
        rows.append(i)
    return np.array(rows, dtype=int)


class _Tracker:
    """The exact elastic-plastic state of one case along a path."""

    def __init__(self, model: Model, base: LoadState):
        from ..engine.system import System

        self.model, self.base = model, base
        self.system = system = System(model)
        self.asm = asm = system.asm
        self.P = P = _plastic_scope(model)
        m = len(model.segments)
        k, d = asm.stiffness[P], asm.direction[P]
        a, b = asm.start[P], asm.end[P]
        self.k = k
        self._elong = lambda u: d * (u[b] - u[a]) if u.ndim == 1 else d[:, None] * (u[b] - u[a])
        unit = np.zeros((m, len(P)))
        unit[P, np.arange(len(P))] = 1.0
        self.U = system.displacements(_nodal(asm, unit), 0.0) if len(P) else np.zeros((asm.n, 0))
        self.S = k[:, None] * (self._elong(self.U) - np.eye(len(P)))
        self.S = 0.5 * (self.S + self.S.T)          # symmetric by reciprocity; rounding removed
        mats = [model.segments[i].material for i in P]
        areas = asm.area[P, 0]
        self.Nt = np.array([mt.yield_strength for mt in mats]) * areas
        self.Nc = np.array([mt.compressive_yield_strength or mt.yield_strength
                            for mt in mats]) * areas
        self.h = np.array([mt.hardening_modulus for mt in mats]) * areas / asm.length[P]
        self.yield_elongation = (np.array([mt.yield_strength / mt.elastic_modulus for mt in mats])
                                 * asm.length[P])
        # elastic forces of the plastic segments: affine in (load factor, uniform dT, factor)
        self.N0 = self.elastic(self.state(0.0, _Thermal()))
        self.NL = self.elastic(self.state(1.0, _Thermal())) - self.N0
        self.NU = self.elastic(self.state(0.0, _Thermal("change", 1.0))) - self.N0
        self.NF = self.elastic(self.state(0.0, _Thermal("factor", 1.0))) - self.N0

    def state(self, lam, thermal) -> LoadState:
        b = self.base
        dT = (np.full(len(b.dT), float(thermal.value)) if thermal.mode == "change"
              else thermal.value * b.dT if thermal.mode == "factor" else np.zeros(len(b.dT)))
        return LoadState(b.name, b.forces * lam, dT, b.settlement * lam, b.q_factor * lam)

    def elastic(self, state):
        F, up, (delta0, _, _) = self.system.state_vectors(state)
        u = self.system.displacements(F, up)
        return self.k * (self._elong(u) - delta0[self.P])

    def forces(self, lam, thermal, p):
        dT_u = thermal.value if thermal.mode == "change" else 0.0
        f = thermal.value if thermal.mode == "factor" else 0.0
        return self.N0 + lam * self.NL + dT_u * self.NU + f * self.NF + self.S @ p

    def rates(self, side, dN_el):
        """Plastic rates z of the segments at a bound (side != 0); None for a mechanism."""
        from ..engine import pivoting

        C = np.flatnonzero(side != 0)
        z = np.zeros(len(side))
        w = np.zeros(len(side))
        if not len(C):
            return z, w
        s = side[C].astype(float)
        q = -s * dN_el[C]
        M = -(s[:, None] * self.S[np.ix_(C, C)] * s[None, :]) + np.diag(self.h[C])
        D = 1.0 / np.sqrt(self.k[C])
        qs = D * q
        scale = np.abs(qs).max(initial=0.0)
        if scale == 0:
            return z, w
        zc, _, status = pivoting.lemke(D[:, None] * M * D[None, :], qs / scale,
                                       100 * len(C) + 100)
        if status == pivoting.RAY:
            return None, None
        if status != pivoting.SOLVED:
            raise SolveError("the search for the yielding segments did not settle",
                             file=self.model.source)
        zc = np.maximum(zc, 0.0) * D * scale
        zc = _least_norm(M, q, zc)
        z[C] = zc
        w[C] = q + M @ zc
        return z, w

    def result(self, lam, thermal, p) -> CaseResult:
        state = self.state(lam, thermal)
        F, up, (delta0, G, W) = self.system.state_vectors(state)
        full = np.zeros(len(self.model.segments))
        full[self.P] = p
        F = F + _nodal(self.asm, full)
        u = self.system.displacements(F, up)
        return self.system.recover(state, u, F, np.zeros(0), (delta0 + full, G, W),
                                   np.zeros(0, dtype=bool))


def _current(leg, lam, thermal, reference):
    """The current value of the leg's parameter, in its unit (None: it cannot be told)."""
    if leg.parameter == "load":
        return lam
    if leg.parameter == "temperature-factor":
        if thermal.mode == "change" and thermal.value != 0:
            return None
        return thermal.value if thermal.mode == "factor" else 0.0
    if thermal.mode == "factor" and thermal.value != 0:
        return None
    dT = thermal.value if thermal.mode == "change" else 0.0
    if leg.parameter == "temperature-change":
        return dT / unit_factor(leg.unit, "temperature_difference")
    return float(kelvin_to_temperature(reference + dT, leg.unit))


def _pick_case(model, case):
    states = load_states(model)
    names = [s.name for s in states]
    if case is None:
        if len(states) > 1:
            raise ModelError("the model has several cases: choose one with --case",
                             place="--case", options=names)
        return states[0]
    if case not in names:
        raise ModelError(f"unknown case '{case}'", place="--case", hint=suggest(case, names),
                         options=names)
    return states[names.index(case)]


def track_path(model: Model, legs, case: str | None = None, cycle_legs=()) -> PathResult:
    """Follow a case along the legs of a path, exactly, with elastic-plastic segments.

    Parameters
    ----------
    model : Model
    legs : sequence of Leg
        From :func:`parse_path`.
    case : str, optional
        Required when the model has several cases.
    cycle_legs : sequence of tuples of int
        The legs of each cycle (from :func:`parse_path`), for the cycle outcome.

    Raises
    ------
    ModelError
        For a model with gaps, a plastic taper or distributed load, a leg that
        starts away from the current value.
    SolveError
        When the rate problem does not settle.

    Examples
    --------
    A bar between walls heated past its yield temperature and cooled back keeps
    a residual tension f_y*(dT/dT_y - 1) (see ``tests/test_plastic.py``):

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Model
    >>> m = Material("s", 200e9, 12e-6, 240e6, behaviour="elastic-plastic")
    >>> bar = Model([Station("a", 0.0), Station("b", 1.0)],
    ...             [Segment("ab", "a", "b", m, Section("r", "area", (("area", 1e-4),)))],
    ...             [Support("a"), Support("b")])
    >>> legs, _ = parse_path("temperature-change 0 K..150 K; temperature-change 150 K..0 K")
    >>> path = track_path(bar, legs)
    >>> round(float(path.states[-1].result.stress[0, 0]) / (240e6 * (150 / 100 - 1)), 9)  # should be 1
    1.0
    """
    from ..engine.preload import resolve_preloads

    if model.gaps:
        raise ModelError("the elastic-plastic path does not follow gaps yet: use 'axialfe "
                         "sweep' for the gap events of a linear-elastic model",
                         file=model.source, place="gaps")
    model = resolve_preloads(model)
    base = _pick_case(model, case)
    tr = _Tracker(model, base)
    P, names = tr.P, [model.segments[i].name for i in tr.P]
    reference = model.reference_temperature
    if any(g.parameter == "temperature" for g in legs) and reference is None:
        raise ModelError("a leg of absolute temperature needs settings.reference_temperature",
                         file=model.source, place="settings")
    notes = []
    if not len(P):
        notes.append("no segment is elastic-plastic (behaviour = \"elastic-plastic\"): the path "
                     "is linear-elastic")
    if base.settlement.any():
        notes.append("the load factor scales the case's settlements with its loads")
    lam, thermal = 0.0, _Thermal()
    p = np.zeros(len(P))
    side = np.zeros(len(P), dtype=int)      # at the tension (+1) or compression (-1) bound
    flowing = np.zeros(len(P), dtype=bool)  # yielding on the last interval
    N = tr.forces(lam, thermal, p)
    over = (N - tr.h * p > tr.Nt * (1 + 1e-12)) | (N - tr.h * p < -tr.Nc * (1 + 1e-12))
    if over.any():
        raise ModelError(f"segment '{names[int(np.flatnonzero(over)[0])]}' is beyond its yield "
                         "strength at the start of the path (from misfit, preload or "
                         "self-weight)", file=model.source)
    events, states, history = [], [], [(0, 0.0, _full(model, P, N))]
    activity = []          # per leg: the sum of |plastic elongation| it made, per segment
    plastic_at_end = []
    collapsed_on = None
    for leg in legs:
        now = _current(leg, lam, thermal, reference)
        if now is None:
            raise ModelError(f"leg {leg.index} changes the {leg.parameter.replace('-', ' ')}, "
                             "but the thermal input is of another kind there: return it to "
                             "zero first", place="--path")
        if abs(leg.start - now) > 1e-9 * max(1.0, abs(now)):
            shown = "" if leg.unit == "1" else f" {leg.unit}"
            raise ModelError(f"leg {leg.index} starts at {leg.start:g}{shown}, but the "
                             f"{leg.parameter.replace('-', ' ')} is {now:.6g}{shown} there: start "
                             "the leg where the path stands", place="--path")
        # the leg's rates of (load factor, thermal value) per unit t in [0, 1]
        lam0, th0 = lam, _Thermal(thermal.mode, thermal.value)
        d_lam = d_th = 0.0
        mode = thermal.mode
        if leg.parameter == "load":
            d_lam = leg.stop - leg.start
        elif leg.parameter == "temperature-factor":
            mode, d_th = "factor", leg.stop - leg.start
        else:
            mode = "change"
            if leg.parameter == "temperature-change":
                d_th = (leg.stop - leg.start) * unit_factor(leg.unit, "temperature_difference")
            else:
                d_th = (temperature_to_kelvin(leg.stop, leg.unit)
                        - temperature_to_kelvin(leg.start, leg.unit))
        dN_el = d_lam * tr.NL + d_th * (tr.NU if mode == "change" else tr.NF)
        moved = np.zeros(len(P))
        t = 0.0

        def at(t_):
            return lam0 + t_ * d_lam, _Thermal(mode, th0.value + t_ * d_th)

        for _ in range(10_000 + 100 * len(P)):
            z, w = tr.rates(side, dN_el)
            if z is None:   # no rate solution: a mechanism
                for j in np.flatnonzero((side != 0) & ~flowing):
                    events.append(PathEvent(leg.index, names[j], "yields", leg.value(t)))
                collapsed_on = leg.index
                events.append(PathEvent(leg.index, ", ".join(n for n, s in zip(names, side) if s),
                                        "collapses", leg.value(t)))
                break
            tol_w = 1e-10 * max(np.abs(dN_el).max(initial=0.0), 1e-300)
            leave = (side != 0) & (z <= 0) & (w > tol_w)
            for j in np.flatnonzero(leave & flowing):
                events.append(PathEvent(leg.index, names[j], "unloads", leg.value(t)))
            for j in np.flatnonzero((z > 0) & ~flowing):
                events.append(PathEvent(leg.index, names[j], "yields", leg.value(t)))
            side = np.where(leave, 0, side)
            flowing = z > 0
            dp = side * z
            dN = dN_el + tr.S @ dp
            slope = dN - tr.h * dp
            excess = N - tr.h * p
            # roots of the elastic segments reaching a bound
            with np.errstate(divide="ignore", invalid="ignore"):
                up = np.where((side == 0) & (slope > 0), (tr.Nt - excess) / slope, np.inf)
                down = np.where((side == 0) & (slope < 0), (-tr.Nc - excess) / slope, np.inf)
            root = np.maximum(np.minimum(up, down), 0.0)
            t_next = min(float(root.min(initial=np.inf)) + t, 1.0)
            if t_next >= 1.0 - _SAME:
                t_next = 1.0
            hit = (root + t <= t_next + _SAME) & np.isfinite(root)
            step = t_next - t
            p = p + dp * step
            moved += np.abs(dp) * step
            t = t_next
            lam, thermal = at(t)
            N = tr.forces(lam, thermal, p)
            for j in np.flatnonzero(hit):
                side[j] = 1 if up[j] <= down[j] else -1
            history.append((leg.index, leg.value(t), _full(model, P, N)))
            if t >= 1.0:
                break
        else:
            raise SolveError("the path found too many changes of state to follow",
                             file=model.source)
        activity.append(moved)
        plastic = np.zeros(len(model.segments))
        plastic[P] = p / tr.asm.length[P] if len(P) else 0.0
        if True:
            states.append(PathState(leg.index, leg.value(t), tr.result(lam, thermal, p), plastic,
                                    tr.U @ p if len(P) else np.zeros(len(model.stations))))
        plastic_at_end.append(p.copy())
        if collapsed_on is not None:
            left = [g.index for g in legs if g.index > leg.index]
            notes.append(f"the model collapses on leg {leg.index} at {leg.value(t):.9g}: no "
                         "further load can be carried; the path stops there"
                         + (f" (legs {left[0]} to {left[-1]} not run)" if len(left) > 1 else
                            f" (leg {left[0]} not run)" if left else ""))
            break
    cycles = None
    if cycle_legs:
        cycles = _cycle_outcome(cycle_legs, activity, plastic_at_end, tr.yield_elongation,
                                collapsed_on, notes)
    return PathResult(tuple(legs), tuple(events), tuple(states), cycles, collapsed_on,
                      tuple(history), tuple(notes), model, base.name)


def _least_norm(M, q, z):
    """Among the rate solutions with the same set at a bound, the one of least norm.

    With perfectly plastic segments yielding together in series, M is singular
    and the split of the plastic rate among them is not unique (the forces
    are); the least-norm split shares it alike, independent of the pivot order.
    Kept only when it is still a solution.
    """
    w = q + M @ z
    J = np.flatnonzero((z > 0) | (np.abs(w) <= 1e-10 * max(np.abs(q).max(initial=0.0), 1e-300)))
    if len(J) < 2 or np.linalg.matrix_rank(M[np.ix_(J, J)]) == len(J):
        return z
    trial = np.zeros_like(z)
    trial[J] = np.linalg.lstsq(M[np.ix_(J, J)], -q[J], rcond=None)[0]
    w_t = q + M @ trial
    size = max(np.abs(z).max(initial=0.0), 1e-300)
    scale = max(np.abs(q).max(initial=0.0), 1e-300)
    if trial.min(initial=0.0) >= -1e-9 * size and w_t.min(initial=0.0) >= -1e-9 * scale:
        return np.maximum(trial, 0.0)
    return z


def _full(model, P, N_plastic):
    """The forces of every segment where known cheaply: the plastic ones (NaN elsewhere)."""
    out = np.full(len(model.segments), np.nan)
    out[P] = N_plastic
    return out


def _cycle_outcome(cycle_legs, activity, plastic_at_end, yield_elongation, collapsed_on, notes):
    """Shakedown, alternating, ratcheting or elastic, and the cycle that decided it.

    Per cycle: elastic (no plastic elongation made beyond the rounding bound),
    alternating (plastic, but back to the plastic elongation it started from),
    ratcheting (a net plastic elongation left).  The outcome is the kind of the
    last cycle run; it is decided at the first cycle from which every later one
    is of that kind (for shakedown: the first elastic cycle after a plastic one).
    """
    tol = _PLASTIC_NOISE * yield_elongation
    kinds = []
    for group in cycle_legs:
        if group[-1] > len(activity):
            break                              # not run: the model collapsed before
        start = plastic_at_end[group[0] - 2] if group[0] >= 2 else np.zeros_like(tol)
        made = sum(activity[g - 1] for g in group)
        net = plastic_at_end[group[-1] - 1] - start
        kinds.append("elastic" if not np.any(made > tol) else
                     "ratcheting" if np.any(np.abs(net) > tol) else "alternating")
    if collapsed_on is not None:
        notes.append(f"the cycles stop at the collapse: {len(kinds)} of {len(cycle_legs)} run")
    if not kinds:
        return {"count": 0, "outcome": None, "decided_at": None}
    count, last = len(kinds), kinds[-1]
    if all(k == "elastic" for k in kinds):
        return {"count": count, "outcome": "elastic", "decided_at": 1}
    c = count
    while c > 1 and kinds[c - 2] == last:
        c -= 1
    if last == "elastic":
        return {"count": count, "outcome": "shakedown", "decided_at": c}
    c = max(c, 2)       # the first cycle starts from the virgin state: it cannot decide
    if count < 2:
        notes.append("one cycle cannot tell alternating from ratcheting plasticity: run more "
                     "cycles")
        return {"count": count, "outcome": last, "decided_at": None}
    return {"count": count, "outcome": last, "decided_at": c}
