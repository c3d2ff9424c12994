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

Gaps and slack links are constraints of the same problem: a closed gap with a
force keeps its opening (an equality, eliminated by a Schur complement), a gap
just reached or closed without force may close or open (complementarity, with
its force rate as the unknown), and an open gap's opening or a closed gap's
force reaching zero is one more affine root.  Where perfectly plastic segments
form a mechanism at a fixed parameter, the model moves along it until a gap
arrests it (the motion found from the null space of the rate problem); with no
gap in reach the model ``collapses``.

Properties against temperature: a leg that holds the temperatures is affine
as above, on the tracker built at them; a leg that moves them through tables is
followed by :class:`axialfe.tracking.plastictables.TabledCourse` (the same
events, found by bracketed root-finding between the table entries).  The step
from one event to the next is a course's (``_AffineCourse`` here).

Scope: prismatic plastic segments without distributed load or self-weight;
every part held by a support (a part held only by gaps is refused).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import ModelError, SolveError, suggest
from ..formatting import names as names_text
from ..model import Model
from ..model.cases import LoadState, pick_state
from ..results import CaseResult
from .events import GAP_EVENTS
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
    """``event`` of ``name`` on leg ``leg`` at ``value``.

    ``'yields'``, ``'unloads'`` (plastic flow starts, ends) and ``'collapses'`` for
    segments; ``'closes'``, ``'opens'`` (contacts), ``'taut'``, ``'slack'`` (links).
    """

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
    history : tuple of (leg, value, forces, gap forces) tuples
        The segment forces (N, per segment; NaN where not followed) and the gap
        forces (N, signed as in results) at the start, every event and every leg
        end, for plots.
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


def point_state(base, lam, thermal) -> LoadState:
    """The load state of a point of the path: the case's loads times ``lam``, the thermal input."""
    dT = (np.full(len(base.dT), float(thermal.value)) if thermal.mode == "change"
          else thermal.value * base.dT if thermal.mode == "factor" else np.zeros(len(base.dT)))
    return LoadState(base.name, base.forces * lam, dT, base.settlement * lam,
                     base.q_factor * lam)


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
        # the gaps: force per unit gap force (R) and opening per unit plastic elongation (Gp)
        g = self.g = len(model.gaps)
        if g and system.n_parts:
            raise ModelError("the elastic-plastic path does not follow parts held only by gaps: "
                             "give each part a support (a soft spring will do)",
                             file=model.source, place="gaps")
        UL = system.displacements(np.zeros((asm.n, g)), 0.0, np.eye(g)) if g else None
        self.M = system.gap_matrix[0] if g else np.zeros((0, 0))
        self.R = k[:, None] * self._elong(UL) if g else np.zeros((len(P), 0))
        self.Gp = -(system.B @ self.U) if g else np.zeros((0, len(P)))
        # the response X = (forces of the plastic segments, gap openings): affine in (load
        # factor, uniform dT, factor on the field), plastic elongations and gap forces
        self.A_p = np.vstack([self.S, self.Gp])
        self.A_g = np.vstack([self.R, self.M])
        self.X0 = self.elastic(self.state(0.0, _Thermal()))
        self.XL = self.elastic(self.state(1.0, _Thermal())) - self.X0
        self.XU = self.elastic(self.state(0.0, _Thermal("change", 1.0))) - self.X0
        self.XF = self.elastic(self.state(0.0, _Thermal("factor", 1.0))) - self.X0

    def state(self, lam, thermal) -> LoadState:
        return point_state(self.base, lam, thermal)

    def elastic(self, state):
        """(forces of the plastic segments, gap openings) with no plastic strain, gaps open."""
        F, up, (delta0, _, _) = self.system.state_vectors(state)
        u = self.system.displacements(F, up)
        N = self.k * (self._elong(u) - delta0[self.P])
        return np.concatenate([N, self.system.gap_problem(F, up)[0] if self.g else []])

    def response(self, lam, thermal, p, gl):
        """(forces of the plastic segments, gap openings) of a state."""
        dT_u = thermal.value if thermal.mode == "change" else 0.0
        f = thermal.value if thermal.mode == "factor" else 0.0
        X = (self.X0 + lam * self.XL + dT_u * self.XU + f * self.XF + self.A_p @ p
             + self.A_g @ gl)
        return X[:len(self.P)], X[len(self.P):]

    def _reduced(self, side, held, touching, dX_el):
        """The rate problem with the held gaps' equalities eliminated (a Schur complement).

        The responses at the segments at a bound (forces) and at the gaps in
        contact (openings) to ``y = (dp_C, dg_E, dg_T)`` are ``r + A y``; the held
        gaps' openings stay zero, which gives ``dg_E``; what is left is the
        complementarity problem ``w = q + M x`` in ``x = (z_C, dg_T)``.
        """
        nP = len(side)
        C = np.flatnonzero(side != 0)
        Eg = np.flatnonzero(held)
        T = np.flatnonzero(touching & ~held)
        s = side[C].astype(float)
        rows = np.concatenate([C, nP + Eg, nP + T])
        A = np.hstack([self.A_p[:, C], self.A_g[:, Eg], self.A_g[:, T]])[rows]
        r = dX_el[rows]
        nc, ne = len(C), len(Eg)
        X = np.r_[0:nc, nc + ne:len(rows)]
        Ei = np.arange(nc, nc + ne)
        if ne:
            try:
                inv_rE = np.linalg.solve(A[np.ix_(Ei, Ei)], np.column_stack(
                    [r[Ei], A[np.ix_(Ei, X)]]))
            except np.linalg.LinAlgError:
                raise SolveError("the contact state is not unique: closed gaps "
                                 f"{names_text([self.model.gaps[j].name for j in Eg])} act "
                                 "together on the same stations; remove the redundant gap",
                                 file=self.model.source) from None
            r_x = r[X] - A[np.ix_(X, Ei)] @ inv_rE[:, 0]
            A_x = A[np.ix_(X, X)] - A[np.ix_(X, Ei)] @ inv_rE[:, 1:]
        else:
            inv_rE = np.zeros((0, 1 + len(X)))
            r_x, A_x = r[X], A[np.ix_(X, X)]
        sign = np.concatenate([s, np.ones(len(T))])         # y = sign * x
        flip = np.concatenate([-s, np.ones(len(T))])        # w = flip * response (+ h z)
        q = flip * r_x
        M = flip[:, None] * A_x * sign[None, :]
        M[:nc, :nc] += np.diag(self.h[C])
        return C, Eg, T, nc, ne, X, Ei, inv_rE, sign, q, M

    def _unpack(self, side, parts, x, dX_el):
        """(z, w, dg, v) of a solution x of the reduced problem."""
        C, Eg, T, nc, ne, X, Ei, inv_rE, sign, q, M = parts
        nP = len(side)
        wx = q + M @ x
        y = np.zeros(nc + ne + len(T))
        y[X] = sign * x
        if ne:
            y[Ei] = -(inv_rE[:, 0] + inv_rE[:, 1:] @ y[X])
        z, w = np.zeros(nP), np.zeros(nP)
        z[C], w[C] = x[:nc], wx[:nc]
        dg = np.zeros(self.g)
        dg[Eg], dg[T] = y[Ei], y[nc + ne:]
        v = (dX_el + self.A_p @ (side * z) + self.A_g @ dg)[nP:]
        return z, w, dg, v

    def rates(self, side, held, touching, dX_el, tol=1e-10):
        """The rates of plastic elongation and gap force per unit of the leg's parameter.

        ``side`` marks the segments at a bound, ``held`` the closed gaps with a force
        (their opening stays zero: an equality), ``touching`` the gaps closed with no
        force or just reached (they may close or open: complementarity).  The
        equalities are eliminated, the rest is one complementarity problem solved by
        Lemke's method (:func:`axialfe.engine.pivoting.lemke`).

        ``tol`` is the rounding bound of the rates' input (relative), below which a
        segment's distance from flowing counts as zero for the least-norm split.

        Returns ``(z, w, dg, v)``: plastic rates (>= 0) and the distance of each
        segment's rate from its bound's, gap force rates and opening rates; all None
        for a ray (a mechanism).
        """
        from ..engine import pivoting

        parts = self._reduced(side, held, touching, dX_el)
        C, T, q, M = parts[0], parts[2], parts[-2], parts[-1]
        x = np.zeros(len(q))
        if len(q):
            diag = np.diag(self.M)
            D = np.concatenate([1.0 / np.sqrt(self.k[C]), 1.0 / np.sqrt(np.maximum(
                diag[T], 1e-12 * max(diag.max(initial=0.0), 1e-300)))])
            qs = D * q
            scale = np.abs(qs).max(initial=0.0)
            if scale > 0:
                xs, _, status = pivoting.lemke(D[:, None] * M * D[None, :], qs / scale,
                                               100 * len(q) + 100)
                if status == pivoting.RAY:
                    return None, None, None, None
                if status != pivoting.SOLVED:
                    raise SolveError("the search for the yielding segments did not settle",
                                     file=self.model.source)
                x = _least_norm(M, q, np.maximum(xs, 0.0) * D * scale, tol)
        return self._unpack(side, parts, x, dX_el)

    def mechanism(self, side, held, touching, dX_el):
        """The motion of a mechanism at a fixed parameter, or None.

        Where the rate problem has no solution, the segments at their bound
        can flow at constant forces while the load does work.  Returns
        ``(dp, dg, v)`` of one such motion (plastic elongations, gap forces,
        openings, per unit of total plastic flow), which leaves the forces of the
        flowing segments and the openings of the gaps in contact unchanged.
        """
        from scipy.linalg import null_space
        from scipy.optimize import linprog

        parts = self._reduced(side, held, touching, dX_el)
        nc, q, M = parts[3], parts[-2], parts[-1]
        if not nc:
            return None
        basis = null_space(M[:nc, :nc], rcond=1e-9)
        if not basis.shape[1]:
            return None
        # x = basis @ c >= 0, sum x = 1, the gaps in contact not closing (M_TC x >= 0), the
        # load doing work (q_C . x < 0): the motion on which it does the most
        nb = basis.shape[1]
        A_ub = np.vstack([-basis, -(M[nc:, :nc] @ basis)])
        res = linprog(q[:nc] @ basis, A_ub=A_ub, b_ub=np.zeros(len(A_ub)),
                      A_eq=basis.sum(axis=0)[None, :], b_eq=[1.0], bounds=[(None, None)] * nb,
                      method="highs")
        if res.status != 0 or res.fun >= -1e-12 * max(np.abs(q).max(initial=0.0), 1e-300):
            return None
        x = np.zeros(len(q))
        x[:nc] = np.maximum(basis @ res.x, 0.0)
        z, _, dg, _ = self._unpack(side, parts, x, np.zeros_like(dX_el))
        dp = side * z
        v = (self.A_p @ dp + self.A_g @ dg)[len(side):]
        return dp, dg, v

    def signed(self, gl):
        """Gap forces with the sign of results (compression of a contact negative)."""
        return self.system.cons.force_sign * gl if self.g else np.zeros(0)

    def result(self, lam, thermal, p, gl, closed) -> CaseResult:
        state = self.state(lam, thermal)
        F, up, (delta0, G, W) = self.system.state_vectors(state)
        full = np.zeros(len(self.model.segments))
        full[self.P] = p
        F = F + _nodal(self.asm, full)
        u = self.system.displacements(F, up, gl if self.g else None)
        return self.system.recover(state, u, F, gl, (delta0 + full, G, W), closed)


class _AffineCourse:
    """A leg on which the properties hold: one tracker, and everything affine in the leg's t.

    ``rate`` is the change of the elastic response per unit t; ``step`` goes from
    ``t`` to the next event, the least affine root (an elastic segment reaching a
    bound, a closed gap's force or an open gap's opening reaching zero).
    :class:`axialfe.tracking.plastictables.TabledCourse` is the same interface for
    legs over tables against temperature.
    """

    tol = 1e-10      # the rounding bound of the rates (exact affine responses)

    def __init__(self, tr, dX_el):
        self.tr, self.dX_el = tr, dX_el

    def tracker(self, t):
        return self.tr

    def rate(self, t, side, p, gl):
        return self.dX_el

    def between(self):
        return ()          # straight between events

    def clean(self, z, dX_el, tr):
        """Plastic rates below the rounding bound are no flow (a segment at its bound that
        shares the force of a perfectly plastic one in series gets a rate of rounding)."""
        nP = len(z)
        bound = self.tol * max(np.abs(dX_el[:nP] / tr.k).max(initial=0.0), 1e-300)
        return np.where(z > bound, z, 0.0)

    def step(self, t, side, z, dg, v, closed, touching, p, gl, N, o):
        """``(t_next, hit, tension, release, g_hit, p, gl)`` at the next event.

        ``hit``: elastic segments reaching a bound (``tension`` says which);
        ``release``: segments whose flow stops inside the interval (never here:
        affine rates keep their sign); ``g_hit``: gaps reaching a change.
        """
        tr = self.tr
        nP = len(side)
        dp = side * z
        dN = self.dX_el[:nP] + tr.S @ dp + tr.R @ dg
        slope = dN - tr.h * dp
        excess = N - tr.h * p
        # roots of the elastic segments reaching a bound, of a closed gap's force and an
        # open gap's opening reaching zero
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            up = np.where((side == 0) & (slope > 0), (tr.Nt - excess) / slope, np.inf)
            down = np.where((side == 0) & (slope < 0), (-tr.Nc - excess) / slope, np.inf)
            g_root = np.where(closed & (dg < 0), -gl / dg,
                              np.where(~closed & ~touching & (v < 0), -o / v, np.inf))
        root = np.maximum(np.minimum(up, down), 0.0)
        g_root = np.maximum(g_root, 0.0)
        t_next = min(float(min(root.min(initial=np.inf), g_root.min(initial=np.inf))) + t, 1.0)
        if t_next >= 1.0 - _SAME:
            t_next = 1.0
        hit = (root + t <= t_next + _SAME) & np.isfinite(root)
        g_hit = (g_root + t <= t_next + _SAME) & np.isfinite(g_root)
        step = t_next - t
        gl = np.where(g_hit & closed, 0.0, np.maximum(gl + dg * step, 0.0))
        return (t_next, hit, up <= down, np.zeros(nP, dtype=bool), g_hit, p + dp * step, gl)


def _motion(leg, thermal):
    """The leg's rates per unit t in [0, 1]: ``(d load factor, thermal mode, d thermal value)``."""
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
    return d_lam, mode, d_th


def _check_ranges(model, base, legs):
    """A temperature outside a table anywhere on the path, as one located error, before any solve.

    The temperatures are affine along each leg, so its ends bound them.
    """
    from .plastictables import temperatures_at

    lam, thermal = 0.0, _Thermal()
    temperatures_at(model, base, lam, thermal, "at the start of the path")
    for leg in legs:          # each leg ends at its own stop
        if leg.parameter == "load":
            lam = leg.stop
        elif leg.parameter == "temperature-factor":
            thermal = _Thermal("factor", leg.stop)
        elif leg.parameter == "temperature-change":
            thermal = _Thermal("change", leg.stop * unit_factor(leg.unit,
                                                                "temperature_difference"))
        else:
            thermal = _Thermal("change", temperature_to_kelvin(leg.stop, leg.unit)
                               - model.reference_temperature)
        temperatures_at(model, base, lam, thermal, f"on leg {leg.index} of the path")


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
        For a part held only by gaps, a plastic taper or distributed load, a leg
        that starts away from the current value, a temperature outside a table
        on the path (naming the leg and the material), a preload with tables.
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
    from ..model.temperature import (basis_note, constant_compression_note, has_tables,
                                     refuse_tabled_preloads)

    refuse_tabled_preloads(model)
    model = resolve_preloads(model)
    base = pick_state(model, case)
    tabled = has_tables(model)
    if tabled:
        from .plastictables import TabledCourse, tracker_at

        _check_ranges(model, base, legs)

        reference_tracker = tracker_at(model, base, 0.0, _Thermal(), "at the start of the path")
    else:
        reference_tracker = _Tracker(model, base)
    tr = reference_tracker
    P, names = tr.P, [model.segments[i].name for i in tr.P]
    gap_names = [gp.name for gp in model.gaps]
    reference = model.reference_temperature
    if any(g.parameter == "temperature" for g in legs) and reference is None:
        raise ModelError("a leg of absolute temperature needs settings.reference_temperature",
                         file=model.source, place="settings")
    notes = []
    if tabled:
        notes.append(basis_note(model) + "; on legs that change the temperature the events are "
                     "found by bracketed root-finding between the table entries")
        constant = constant_compression_note(model)
        if constant:
            notes.append(constant)
    if not len(P):
        notes.append("no segment is elastic-plastic (behaviour = \"elastic-plastic\"): the path "
                     "is linear-elastic")
    if base.settlement.any():
        notes.append("the load factor scales the case's settlements with its loads")
    lam, thermal = 0.0, _Thermal()
    p = np.zeros(len(P))
    side = np.zeros(len(P), dtype=int)      # at the tension (+1) or compression (-1) bound
    flowing = np.zeros(len(P), dtype=bool)  # yielding on the last interval
    # the gaps at the start: the exact contact search of the unloaded state
    if tr.g:
        F0, up0, _ = tr.system.state_vectors(tr.state(lam, thermal))
        gl, _, closed = tr.system.contact(F0, up0, base.name, with_state=True)
        gl, closed = np.maximum(gl, 0.0), np.array(closed, dtype=bool)
    else:
        gl, closed = np.zeros(0), np.zeros(0, dtype=bool)
    N, o = tr.response(lam, thermal, p, gl)
    o_scale = max(np.abs(o).max(initial=0.0), tr.system.clearance.max(initial=0.0), 1e-300)
    touching = ~closed & (o <= 1e-12 * o_scale)   # open gaps that may close as the path moves
    pending = {}                                  # gap -> (leg, value) where its measure hit zero
    over = (N - tr.h * p > tr.Nt * (1 + 1e-12)) | (N - tr.h * p < -tr.Nc * (1 + 1e-12))
    if over.any():
        raise ModelError(f"segment '{names[int(np.flatnonzero(over)[0])]}' is beyond its yield "
                         "strength at the start of the path (from misfit, preload or "
                         "self-weight)", file=model.source)
    events, states, history = [], [], [(0, 0.0, _full(model, P, N), tr.signed(gl))]
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
        lam0, th0 = lam, _Thermal(thermal.mode, thermal.value)
        d_lam, mode, d_th = _motion(leg, thermal)
        moved = np.zeros(len(P))
        t = 0.0

        def at(t_, lam0=lam0, d_lam=d_lam, mode=mode, th0=th0.value, d_th=d_th):
            return lam0 + t_ * d_lam, _Thermal(mode, th0 + t_ * d_th)

        if tabled and d_th != 0:
            course = TabledCourse(model, base, at, leg)
        else:
            if tabled:   # the temperatures hold on this leg: so do the properties
                tr = tracker_at(model, base, *at(0.0), f"on leg {leg.index} of the path")
            course = _AffineCourse(tr, d_lam * tr.XL
                                   + d_th * (tr.XU if mode == "change" else tr.XF))
        for _ in range(10_000 + 100 * (len(P) + tr.g)):
            tr = course.tracker(t)
            dX_el = course.rate(t, side, p, gl)
            held = closed & (gl > 0)
            contact = touching | (closed & ~held)
            z, w, dg, v = tr.rates(side, held, contact, dX_el, course.tol)
            if z is not None:
                z = course.clean(z, dX_el, tr)
            if z is None and tr.g:
                # a mechanism: it moves at the fixed parameter until a gap arrests it
                motion = tr.mechanism(side, held, contact, dX_el)
                if motion is not None:
                    dp, dg, v = motion
                    dN = tr.S @ dp + tr.R @ dg
                    excess = N - tr.h * p
                    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                        g_root = np.where(~closed & ~touching & (v < 0), -o / v,
                                          np.where(closed & (dg < 0), -gl / dg, np.inf))
                        bound = np.where((side == 0) & (dN > 0), (tr.Nt - excess) / dN,
                                         np.where((side == 0) & (dN < 0),
                                                  (-tr.Nc - excess) / dN, np.inf))
                    reach = float(np.maximum(np.concatenate([g_root, bound]), 0.0)
                                  .min(initial=np.inf))
                    if np.isfinite(reach):
                        for j in np.flatnonzero((side != 0) & ~flowing):
                            events.append(PathEvent(leg.index, names[j], "yields",
                                                    leg.value(t)))
                        flowing = side != 0
                        p = p + dp * reach
                        moved += np.abs(dp) * reach
                        g_hit = np.isclose(g_root, reach, rtol=1e-12, atol=0.0)
                        gl = np.where(g_hit & closed, 0.0, np.maximum(gl + dg * reach, 0.0))
                        touching = touching | (g_hit & ~closed)
                        for j in np.flatnonzero(g_hit):
                            pending[j] = (leg.index, leg.value(t))
                        hit = np.isclose(bound, reach, rtol=1e-12, atol=0.0)
                        side = np.where(hit, np.where(dN > 0, 1, -1), side)
                        N, o = tr.response(lam, thermal, p, gl)
                        history.append((leg.index, leg.value(t), _full(model, P, N),
                                        tr.signed(gl)))
                        continue
            if z is None:   # no rate solution and no gap to arrest it: the model collapses
                for j in np.flatnonzero((side != 0) & ~flowing):
                    events.append(PathEvent(leg.index, names[j], "yields", leg.value(t)))
                collapsed_on = leg.index
                events.append(PathEvent(leg.index, ", ".join(n for n, s in zip(names, side) if s),
                                        "collapses", leg.value(t)))
                break
            tol_w = course.tol * max(np.abs(dX_el[:len(P)]).max(initial=0.0), 1e-300)
            leave = (side != 0) & (z <= 0) & (w > tol_w)
            # the gaps in contact: closed where their force grows, open where they part (a
            # gap event exactly at a leg's end belongs to that leg: `pending`)
            tol_v = course.tol * max(np.abs(dX_el[len(P):]).max(initial=0.0),
                                     np.abs(v).max(initial=0.0), 1e-300)
            tol_g = course.tol * max(np.abs(dg).max(initial=0.0), 1e-300)
            decided = contact & ((dg > tol_g) | (v > tol_v))
            now_closed = np.where(decided, dg > tol_g, closed)
            for j in np.flatnonzero(now_closed != closed):
                leg_at, value = pending.get(j, (leg.index, leg.value(t)))
                events.append(PathEvent(leg_at, gap_names[j],
                                        GAP_EVENTS[(model.gaps[j].kind, bool(now_closed[j]))],
                                        value))
            for j in np.flatnonzero(decided):
                pending.pop(j, None)
            closed, touching = now_closed, touching & ~decided
            # plastic flow ends where a segment leaves its bound or stops flowing at it (a
            # gap that closes takes the load off it)
            for j in np.flatnonzero(flowing & ~(z > 0)):
                events.append(PathEvent(leg.index, names[j], "unloads", leg.value(t)))
            for j in np.flatnonzero((z > 0) & ~flowing):
                events.append(PathEvent(leg.index, names[j], "yields", leg.value(t)))
            side = np.where(leave, 0, side)
            flowing = z > 0
            dg = np.where(closed, dg, 0.0)
            t_next, hit, tension, release, g_hit, p_next, gl = course.step(
                t, side, z, dg, v, closed, touching, p, gl, N, o)
            moved += np.abs(p_next - p)
            for s_, N_s, gl_s in course.between():
                history.append((leg.index, leg.value(s_), _full(model, P, N_s),
                                tr.signed(gl_s)))
            p, t = p_next, t_next
            lam, thermal = at(t)
            tr = course.tracker(t)
            N, o = tr.response(lam, thermal, p, gl)
            side = np.where(hit, np.where(tension, 1, -1), np.where(release, 0, side))
            for j in np.flatnonzero(g_hit):
                pending[j] = (leg.index, leg.value(t))
                touching[j] = touching[j] or not closed[j]
            history.append((leg.index, leg.value(t), _full(model, P, N), tr.signed(gl)))
            if t >= 1.0:
                break
        else:
            raise SolveError("the path found too many changes of state to follow",
                             file=model.source)
        activity.append(moved)
        plastic = np.zeros(len(model.segments))
        plastic[P] = p / tr.asm.length[P] if len(P) else 0.0
        # the plastic displacement: what stays with every load and thermal input removed
        # elastically, so with the stiffness at the reference temperature
        states.append(PathState(leg.index, leg.value(t), tr.result(lam, thermal, p, gl, closed),
                                plastic, reference_tracker.U @ p if len(P)
                                else np.zeros(len(model.stations))))
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
        cycles = _cycle_outcome(cycle_legs, activity, plastic_at_end,
                                reference_tracker.yield_elongation,
                                collapsed_on, notes)
    return PathResult(tuple(legs), tuple(events), tuple(states), cycles, collapsed_on,
                      tuple(history), tuple(notes), model, base.name)


def _least_norm(M, q, z, tol=1e-10):
    """Among the rate solutions with the same set at a bound, the one of least norm.

    With perfectly plastic segments yielding together in series, M is singular
    and the split of the plastic rate among them is not unique (the forces
    are); the least-norm split shares it alike, independent of the pivot order.
    Kept only when it is still a solution.
    """
    w = q + M @ z
    J = np.flatnonzero((z > 0) | (np.abs(w) <= tol * max(np.abs(q).max(initial=0.0), 1e-300)))
    if len(J) < 2 or np.linalg.matrix_rank(M[np.ix_(J, J)]) == len(J):
        return z
    trial = np.zeros_like(z)
    trial[J] = np.linalg.lstsq(M[np.ix_(J, J)], -q[J], rcond=None)[0]
    w_t = q + M @ trial
    size = max(np.abs(z).max(initial=0.0), 1e-300)
    scale = max(np.abs(q).max(initial=0.0), 1e-300)
    accept = max(1e-9, 10 * tol)    # the rounding of q (rates by differences: coarser)
    if trial.min(initial=0.0) >= -accept * size and w_t.min(initial=0.0) >= -accept * scale:
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
