"""Sweeps: the response along a temperature or load-factor range, with exact events.

Between two changes of state the response is an affine function of the swept
parameter s, so the path is tracked interval by interval: for the gap state of
an interval the gap forces, openings and stresses are affine in s, each event
(a gap closing or opening, a link going taut or slack, a segment reaching its
yield strength or its buckling capacity) is the root of one of those functions
(affine, or convex and bracketed), and the state
after an event comes from the exact gap search just past it.  One factorisation
serves the whole sweep.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field, replace

import numpy as np

from ..errors import ModelError, SolveError, suggest
from ..formatting import note_text, quantity_text
from ..model.cases import LoadState, load_states
from ..model import Model
from ..results import CaseResult
from ..engine.contact import solve_gaps
from .events import GAP_EVENTS, affine_roots, buckle_excess, buckle_roots, yield_excess, yield_roots
from ..engine.system import System
from ..units import (kelvin_to_temperature, parse_quantity, number_and_unit,
                    temperature_to_kelvin, unit_factor)

__all__ = ["PARAMETERS", "DIMENSIONLESS", "Event", "SweepResult", "sweep", "parse_range"]

PARAMETERS = ("temperature_change", "temperature", "temperature_factor", "load_factor")
# the sweeps of a plain number (no unit)
DIMENSIONLESS = ("temperature_factor", "load_factor")


@dataclass(frozen=True)
class Event:
    """A change of state at parameter ``value`` (in the sweep's unit).

    ``event`` is ``closes`` or ``opens`` (contacts), ``taut`` or ``slack``
    (links), ``yields`` or ``buckles`` (segments).
    """

    name: str
    event: str
    value: float


@dataclass(frozen=True)
class _Interval:
    """One stretch of the path with a fixed gap state; everything affine in s."""

    s_from: float
    s_to: float
    closed: np.ndarray
    lam: tuple[np.ndarray, np.ndarray]    # value at s = 0 and slope
    shift: tuple[np.ndarray, np.ndarray]
    u: tuple[np.ndarray, np.ndarray]      # displacements: affine too, two solves


class _Steps(Sequence):
    """The results at the grid values, built on access (the sweep may be long)."""

    def __init__(self, tracker, grid):
        self._tracker, self._grid = tracker, grid
        self._status = {}          # the status of each step built so far

    def __len__(self):
        return len(self._grid)

    def __getitem__(self, i):
        if isinstance(i, slice):
            return [self[j] for j in range(*i.indices(len(self)))]
        result = self._tracker.result_at(float(self._grid[i]))
        self._status[i % len(self)] = (result.status, result.message)
        return result

    def inaccurate(self):
        """``(value, message)`` of every step whose status is not ok (builds the rest)."""
        for i in range(len(self)):
            if i not in self._status:
                self[i]
        return [(float(self._grid[i]), msg) for i, (status, msg) in sorted(self._status.items())
                if status != "ok"]


class _Solved(Sequence):
    """The results at the grid values, solved already (a sweep over tables)."""

    def __init__(self, grid, results):
        self._grid, self._results = grid, list(results)

    def __len__(self):
        return len(self._results)

    def __getitem__(self, i):
        return self._results[i]

    def inaccurate(self):
        """``(value, message)`` of every step whose status is not ok."""
        return [(float(v), r.message) for v, r in zip(self._grid, self._results)
                if r.status != "ok"]


@dataclass(frozen=True, repr=False)
class SweepResult:
    """A solved sweep.

    Attributes
    ----------
    parameter : str
        One of :data:`PARAMETERS`.
    unit : str
        Unit of ``values`` and of every event value.
    values : ndarray
        The evenly spaced grid, both ends included.
    results : sequence of CaseResult
        One result per grid value, in the same form as a solved case.
    events : tuple of Event
        In the order they occur along the range.
    notes : tuple of str
        Their quantities are kept as SI data: ``axialfe.formatting.note_text(note, units)``
        writes them in ``units`` (:meth:`to_dict` does).
    model : Model
    case : str
        The case swept.
    exact : callable, optional
        The exact result at any value of the range (set by :func:`sweep`).
    replaced : str
        Which thermal inputs of the case the sweep replaced (or scaled, or none), its
        quantities kept as data like the notes'.
    """

    parameter: str
    unit: str
    values: np.ndarray
    results: Sequence
    events: tuple[Event, ...]
    notes: tuple[str, ...]
    model: Model
    case: str
    exact: object = field(default=None, compare=False, repr=False)
    replaced: str = ""

    def grouped_events(self) -> list[tuple[tuple[str, ...], str, float]]:
        """The events with identical ``event`` at one value (to rounding of the range) as one
        ``(names, event, value)``, in order along the range; the names in the model's order."""
        span = abs(float(self.values[-1]) - float(self.values[0])) if len(self.values) else 0.0
        tol = 1e-9 * max(span, 1e-300)
        out: list[tuple[list[str], str, float]] = []
        for e in self.events:
            for group in out:
                if group[1] == e.event and abs(group[2] - e.value) <= tol:
                    group[0].append(e.name)
                    break
            else:
                out.append(([e.name], e.event, e.value))
        rank = {n: i for i, n in enumerate([g.name for g in self.model.gaps]
                                           + [s.name for s in self.model.segments])}
        return [(tuple(sorted(names, key=lambda n: rank.get(n, len(rank)))), event, value)
                for names, event, value in out]

    def result_at(self, value: float) -> CaseResult:
        """The exact result at any ``value`` of the range (events included)."""
        lo, hi = sorted((float(self.values[0]), float(self.values[-1])))
        if self.exact is None:
            raise ModelError("this sweep result keeps only its grid values")
        if not lo <= value <= hi:
            raise ModelError(f"{value:g} {self.unit} lies outside the swept range {lo:g}..{hi:g}")
        return self.exact(float(value))

    def to_dict(self, units=None, steps=None) -> dict:
        """Plain numbers in ``units``; ``steps`` may wrap :attr:`results` (a progress bar)."""
        units = units or self.model.units
        return {"title": self.model.title, "units": units.as_dict(), "parameter": self.parameter,
                "unit": self.unit, "case": self.case, "replaced": note_text(self.replaced, units),
                "values": self.values.tolist(),
                "events": [{"name": e.name, "event": e.event, "value": e.value} for e in self.events],
                "notes": [note_text(n, units) for n in self.notes],
                "cases": [r.to_dict(units) for r in (self.results if steps is None else steps)]}

    def __repr__(self):
        return (f"<SweepResult of {self.parameter} over {self.values[0]:g}..{self.values[-1]:g} "
                f"{self.unit}, {len(self.values)} steps, {len(self.events)} events>")


def parse_range(text: str, parameter: str) -> tuple[float, float, str]:
    """Read ``"-40 K..120 K"`` into (start, stop, unit) in the unit given.

    Raises
    ------
    ModelError
        When the text is not ``A..B`` or a value has the wrong unit.
    """
    where = f"--{parameter.replace('_', '-')}"
    parts = text.split("..")
    if len(parts) != 2 or not parts[0].strip() or not parts[1].strip():
        raise ModelError(f"expected a range 'START..STOP', e.g. "
                         f"'{ {'load_factor': '0..2', 'temperature': '-20 degC..150 degC'}.get(parameter, '-40 K..120 K') }': got '{text}'",
                         place=where)
    try:
        (a, ua), (b, ub) = number_and_unit(parts[0]), number_and_unit(parts[1])
    except ModelError as exc:
        raise ModelError(exc.message, place=where) from None
    if parameter in DIMENSIONLESS:
        if ua or ub:
            word = "load" if parameter == "load_factor" else "temperature"
            raise ModelError(f"a {word} factor is a plain number: got '{text}'", place=where)
        return a, b, "1"
    unit = ua or ub
    if not unit:
        raise ModelError(f"'{text}' has no unit: give e.g. '-40 K..120 K'", place=where)
    ub = ub or unit
    kind = "temperature_difference" if parameter == "temperature_change" else "temperature"
    try:
        if kind == "temperature":
            parse_quantity(f"{b} {ub}", kind)  # refuses a temperature below absolute zero
            b_in = float(kelvin_to_temperature(temperature_to_kelvin(b, ub), unit))
            parse_quantity(f"{a} {unit}", kind)
        else:
            b_in = b * unit_factor(ub, kind) / unit_factor(unit, kind)
    except ModelError as exc:
        raise ModelError(exc.message, place=where) from None
    return a, b_in, unit


def _singular(A, p) -> bool:
    """Whether the system of a gap state is singular to rounding.

    Without gap-held parts (p = 0) it is symmetric positive semidefinite and a
    Cholesky factorisation tells; otherwise (small systems) the condition number.
    """
    if p == 0:
        try:
            pivots = np.diag(np.linalg.cholesky(A)) ** 2
        except np.linalg.LinAlgError:
            return True
        return bool(pivots.min() <= 1e-12 * pivots.max())
    return bool(np.linalg.cond(A) > 1e12)


def _at(pair, s):
    """``a + s*b`` of an affine pair (value at s = 0, slope)."""
    return pair[0] + s * pair[1]


def _swept_state(base, parameter, mask, s) -> LoadState:
    """The load state at internal parameter ``s`` of a sweep of ``base``."""
    if parameter == "load_factor":
        return base.scaled_loads(s)
    swept = (base.dT * s if parameter == "temperature_factor"
             else np.full(base.dT.shape, float(s)))
    return base.with_temperature(swept if mask is None else np.where(mask, swept, base.dT))


class _Tracker:
    """Follows the piecewise-affine path of one case along the internal parameter s."""

    def __init__(self, system: System, base: LoadState, parameter: str, from_user, mask=None):
        self.system = system
        self.base = base
        self.parameter = parameter
        self.mask = mask            # the segments a temperature sweep acts on (None: all)
        self.from_user = from_user  # the user's parameter value to the internal s
        s0, s1 = self.state(0.0), self.state(1.0)
        F0, up0, t0 = system.state_vectors(s0)
        F1, up1, t1 = system.state_vectors(s1)
        self.F = (F0, F1 - F0)
        self.up = (up0, up1 - up0)
        self.terms = tuple((a, b - a) for a, b in zip(t0, t1))
        g = len(system.model.gaps)
        if g:
            o_a, f_a = system.gap_problem(F0, up0)
            o_b, f_b = system.gap_problem(F1, up1)
            self.o0 = (o_a, o_b - o_a)
            self.f = (f_a, f_b - f_a)
            self.M, self.H = system.gap_matrix
        self.intervals: list[_Interval] = []

    def state(self, s) -> LoadState:
        return _swept_state(self.base, self.parameter, self.mask, s)

    def gap_measures(self, closed, lam, shift):
        """Each gap's event measure, affine in s, as (value at s = 0, slope): the force of
        a closed gap, the opening of an open one (an event where it reaches zero)."""
        o = [_at(self.o0, t) + self.M @ _at(lam, t) - self.H @ _at(shift, t) for t in (0.0, 1.0)]
        return np.where(closed, lam[0], o[0]), np.where(closed, lam[1], o[1] - o[0])

    def gap_state(self, s):
        """Exact gap search at s; returns the closed set."""
        system = self.system
        g = len(system.model.gaps)
        if g == 0:
            return np.zeros(0, dtype=bool)
        return solve_gaps(self.M, self.H, _at(self.o0, s), _at(self.f, s), system,
                          with_state=True)[2]

    def violations(self, closed, s):
        """The gaps that break the state ``closed`` at ``s`` (None: the state is singular).

        Exact for a fixed state (its forces and openings are affine in s), so a
        state just past an event is tested without any solver tolerance.
        """
        try:
            lam, shift = self.affine_forces(closed)
        except SolveError:
            return None
        force = _at(lam, s)
        opening = _at(self.o0, s) + self.M @ force - self.H @ _at(shift, s)
        tol_f = 1e-12 * max(np.abs(force).max(initial=0), 1e-300)
        tol_o = 1e-12 * max(np.abs(opening).max(initial=0),
                            self.system.clearance.max(initial=0), 1e-300)
        return (closed & (force < -tol_f)) | (~closed & (opening < -tol_o))

    def state_after(self, s, direction, span, guess=None):
        """The gap state just past ``s`` in ``direction``.

        Starting from the guess (the state with the gaps that reached zero
        flipped) or from the exact search close past s, the gaps that break the
        state just past s are flipped until none does; if that does not settle,
        the exact search a little further on decides.
        """
        probe = s + direction * 1e-7 * span
        state = guess if guess is not None else self.gap_state(s + direction * 1e-9 * span)
        for _ in range(2 * len(state) + 2):
            bad = self.violations(state, probe)
            if bad is None:
                break
            if not bad.any():
                return state
            state = state ^ bad
        return self.gap_state(s + direction * 1e-4 * span)

    def affine_forces(self, closed):
        """Gap forces and rigid shifts for a fixed closed set, affine in s."""
        M, H = self.M, self.H
        C = np.flatnonzero(closed)
        p = H.shape[1]
        A = np.block([[M[np.ix_(C, C)], -H[C]], [H[C].T, np.zeros((p, p))]])
        if len(A) and _singular(A, p):
            # closed gaps acting on dependent motions: their forces have no unique split
            names = ", ".join(f"'{self.system.model.gaps[j].name}'" for j in C)
            raise SolveError(f"the contact state is not unique: gaps {names} act together on the "
                             "same stations, so their forces cannot be told apart; remove the "
                             "redundant gap")
        out = []
        for s in (0.0, 1.0):
            rhs = np.concatenate([-_at(self.o0, s)[C], _at(self.f, s)])
            try:
                x = np.linalg.solve(A, rhs) if len(rhs) else rhs
            except np.linalg.LinAlgError:
                raise SolveError("the gap state is not unique along the sweep") from None
            lam = np.zeros(len(closed))
            lam[C] = x[:len(C)]
            out.append((lam, x[len(C):]))
        (l0, r0), (l1, r1) = out
        return (l0, l1 - l0), (r0, r1 - r0)

    def result_at(self, s_user: float) -> CaseResult:
        s = self.from_user(s_user)
        iv = self.interval_of(s)
        return self.result(iv, s)

    def interval(self, s_from, s_to, closed, lam, shift) -> _Interval:
        """The interval of one gap state; u is affine in s, so two solves serve all its steps."""
        def u_at(s):
            return self.system.displacements(
                _at(self.F, s), _at(self.up, s),
                _at(lam, s) if lam[0].size else None,
                _at(shift, s) if shift[0].size else None)

        u0 = u_at(0.0)
        return _Interval(s_from, s_to, closed, lam, shift, (u0, u_at(1.0) - u0))

    def result(self, iv: _Interval, s: float) -> CaseResult:
        """The result at s on interval ``iv`` (everything affine there)."""
        system = self.system
        F = _at(self.F, s)
        lam = _at(iv.lam, s) if iv.lam[0].size else np.zeros(0)
        u = _at(iv.u, s)
        terms = tuple(_at(t, s) for t in self.terms)

        def size(pair):  # a bound on |a + s*b| before any cancellation
            return np.abs(pair[0]) + abs(s) * np.abs(pair[1])

        magnitudes = (size(iv.u), size(self.F), size(iv.lam) if lam.size else lam,
                      *(size(t) for t in self.terms))
        return system.recover(self.state(s), u, F, np.maximum(lam, 0.0) if lam.size else lam, terms,
                              iv.closed, magnitudes)

    def interval_of(self, s):
        for iv in self.intervals:
            lo, hi = sorted((iv.s_from, iv.s_to))
            if lo - 1e-12 * (1 + abs(lo)) <= s <= hi + 1e-12 * (1 + abs(hi)):
                return iv
        return self.intervals[-1]


def _replaced(model, base, parameter, mask) -> str:
    """What the sweep does to the case's thermal input, in words."""
    def own(rows):
        text = [f"'{model.segments[i].name}' {quantity_text(base.dT[i], 'temperature')}"
                for i in rows[:6]]
        return ", ".join(text) + (f" and {len(rows) - 6} more" if len(rows) > 6 else "")

    rows = list(range(len(model.segments))) if mask is None else list(np.flatnonzero(mask))
    if parameter == "load_factor":
        return "replaces no thermal input (the factor scales the case's point and distributed loads)"
    which = "every segment" if mask is None else "segments " + ", ".join(
        f"'{model.segments[i].name}'" for i in rows)
    rest = "" if mask is None or mask.all() else "; the others keep the case's own"
    if parameter == "temperature_factor":
        return (f"scales the case's own temperature changes of {which} ({own(rows)}){rest}; "
                "replaces none")
    swept = "change" if parameter == "temperature_change" else "temperature"
    return (f"replaces the thermal input of {which} ({own(rows)} in case '{base.name}') by the "
            f"swept {swept}{rest}")


def sweep(model: Model, parameter: str, start: float, stop: float, steps: int,
          unit: str | None = None, case: str | None = None,
          segments: Sequence[str] | None = None,
          buckling_capacity=None) -> SweepResult:
    """Solve a case along a parameter range and find its events exactly.

    Parameters
    ----------
    model : Model
    parameter : {'temperature_change', 'temperature', 'temperature_factor', 'load_factor'}
        ``temperature_change`` replaces every segment's thermal input by the
        swept change; ``temperature`` sweeps an absolute temperature against
        ``settings.reference_temperature``; ``temperature_factor`` scales the
        case's own temperature change of each segment; ``load_factor`` scales
        the point and distributed loads of the case (temperatures, self-weight,
        misfit and settlements are held).
    start, stop : float
        The range in ``unit`` (it may decrease).
    steps : int
        Grid points, both ends included (at least 2).
    unit : str, optional
        Unit of start and stop: a temperature difference unit, an absolute
        temperature unit, or None for a load factor.
    case : str, optional
        The case or combination to sweep (default: the first).
    segments : sequence of str, optional
        A temperature sweep acts on these segments only; the others keep the
        case's own temperature change (default: every segment).
    buckling_capacity : array of float, optional
        Each segment's buckling capacity in N (inf or NaN where it has none), as
        the checks compute it (:func:`axialfe.checks.buckling.buckling_capacities`):
        with it, the sweep finds where each compressed segment ``buckles``.

    Raises
    ------
    SolveError
        When equilibrium is lost along the range, naming the value.
    """
    if parameter not in PARAMETERS:
        raise ModelError(f"unknown sweep parameter '{parameter}'", hint=suggest(parameter, PARAMETERS),
                         options=PARAMETERS)
    if steps < 2:
        raise ModelError(f"must be at least 2 (both ends of the range): got {steps}",
                         place="--steps")
    from ..engine.preload import resolve_preloads
    from ..model.temperature import at_temperature, has_tables

    model = resolve_preloads(model)
    states = load_states(model)
    names = [s.name for s in states]
    if case is None:
        base = states[0]
    elif case in names:
        base = states[names.index(case)]
    else:
        raise ModelError(f"unknown case '{case}'", place="--case", hint=suggest(case, names),
                         options=names)

    mask = None
    if segments is not None:
        if parameter == "load_factor":
            raise ModelError("chooses the segments of a temperature sweep; a load-factor sweep "
                             "scales the case's loads", place="--segments")
        if not segments:
            raise ModelError("give at least one segment's name (NAME,NAME,...)", place="--segments")
        seg_names = [seg.name for seg in model.segments]
        mask = np.zeros(len(seg_names), dtype=bool)
        for name in segments:
            if name not in seg_names:
                raise ModelError(f"unknown segment '{name}'", place="--segments",
                                 hint=suggest(name, seg_names))
            mask[seg_names.index(name)] = True

    if parameter == "temperature_change":
        unit = unit or "K"
        factor = unit_factor(unit, "temperature_difference")
        to_internal = lambda v: v * factor  # noqa: E731
        to_user = lambda s: s / factor  # noqa: E731
    elif parameter == "temperature":
        if model.reference_temperature is None:
            raise ModelError("a sweep of absolute temperature needs settings.reference_temperature",
                             file=model.source, place="settings")
        unit = unit or "K"
        ref = model.reference_temperature
        to_internal = lambda v: temperature_to_kelvin(v, unit) - ref  # noqa: E731
        to_user = lambda s: float(kelvin_to_temperature(ref + s, unit))  # noqa: E731
    else:
        unit = "1"
        to_internal = to_user = lambda v: float(v)  # noqa: E731

    notes: list[str] = []
    acted = base.dT if mask is None else base.dT[mask]
    if parameter == "temperature_factor" and not np.any(acted):
        notes.append(f"case '{base.name}' has no temperature change on the segments swept: the "
                     "factor changes nothing")
    if parameter in ("temperature_change", "temperature") and mask is None and np.ptp(base.dT) > 0:
        own = [f"'{seg.name}' ({quantity_text(dt, 'temperature')})"
               for seg, dt in zip(model.segments, base.dT)]
        notes.append("the swept temperature replaces every segment's own thermal input, which "
                     f"in case '{base.name}' varies by segment: " + ", ".join(own[:6])
                     + (f" and {len(own) - 6} more" if len(own) > 6 else ""))
    if has_tables(model):
        if parameter != "load_factor":
            return _tabled_sweep(model, base, parameter, unit, start, stop, steps, to_internal,
                                 to_user, mask, notes, buckling_capacity)
        # the temperatures hold: the properties are the case's, and the sweep stays affine
        model = at_temperature(model, base)
    system = System(model)
    tracker = _Tracker(system, base, parameter, to_internal, mask)
    s_start, s_stop = to_internal(start), to_internal(stop)
    direction = 1.0 if s_stop >= s_start else -1.0
    span = abs(s_stop - s_start)
    delta = 1e-9 * max(span, 1e-12)
    g = len(model.gaps)
    gaps = model.gaps
    yield_strength = np.array([seg.material.yield_strength or np.inf for seg in model.segments])
    yielded = np.zeros(len(model.segments), dtype=bool)
    capacity = (np.full(len(model.segments), np.inf) if buckling_capacity is None else
                np.where(np.isfinite(np.asarray(buckling_capacity, dtype=float)),
                         np.asarray(buckling_capacity, dtype=float), np.inf))
    buckled = np.zeros(len(model.segments), dtype=bool)
    convex_sources = (
        (yield_strength, yield_excess, yield_roots, yielded, "yields", "yield strength",
         "the sweep stays linear-elastic and the results are not valid for a yielded part"),
        (capacity, buckle_excess, buckle_roots, buckled, "buckles", "buckling capacity",
         "the sweep follows straight bars and the results are not valid for a buckled member"))
    events: list[Event] = []

    shown_unit = "" if unit == "1" else f" {unit}"

    def lost(exc, s):
        shown = f"{to_user(s):.6g}{shown_unit}"
        return SolveError(f"{exc.message} at {parameter} = {shown}", file=model.source,
                          line=exc.line)

    s = s_start
    try:
        closed = (tracker.state_after(s, direction, max(span, 1e-12)) if g
                  else np.zeros(0, dtype=bool))
    except SolveError as exc:
        raise lost(exc, s) from None
    first = True
    for _ in range(10_000 + 100 * g):
        try:
            lam, shift = (tracker.affine_forces(closed) if g
                          else ((np.zeros(0),) * 2, (np.zeros(0),) * 2))
        except SolveError as exc:
            raise lost(exc, s) from None
        iv_probe = tracker.interval(s, s_stop, closed, lam, shift)
        # gap events: a closed gap's force, or an open gap's opening, reaching zero
        s_next = s_stop
        if g:
            root, ahead = affine_roots(*tracker.gap_measures(closed, lam, shift), s, direction,
                                       2 * delta)
            if ahead.any():
                first_root = root[ahead][np.argmin((root[ahead] - s) * direction)]
                if (first_root - s_stop) * direction < 0:
                    s_next = float(first_root)
                    hitting = ahead & (np.abs(root - s_next) <= 1e-9 * max(span, 1e-12))
        # the fields at s = 0 and 1 of this interval's state, for the convex event sources
        if np.isfinite(yield_strength).any() or np.isfinite(capacity).any():
            f0 = tracker.result(iv_probe, 0.0).fields
            f1 = tracker.result(iv_probe, 1.0).fields
        # yield and buckling events inside [s, s_next]: the peak of |sigma| along each
        # segment against its yield strength, its largest compression against its capacity
        for bound, excess, roots_of, reached, event, what, beyond in convex_sources:
            if not np.isfinite(bound).any():
                continue
            if first:
                already = excess(f0, f1, s, bound) >= -1e-12 * bound
                for j in np.flatnonzero(already & ~reached):
                    notes.append(f"segment '{model.segments[j].name}' is at or beyond its {what} "
                                 "at the start of the range")
                reached |= already
            roots = roots_of(f0, f1, s, s_next, bound, ~reached)
            for j in np.flatnonzero(np.isfinite(roots)):
                s_e = float(roots[j])
                events.append(Event(model.segments[j].name, event, to_user(s_e)))
                reached[j] = True
                notes.append(f"segment '{model.segments[j].name}' reaches its {what} at "
                             f"{parameter} = {to_user(s_e):.6g}{shown_unit}; beyond it {beyond}")
        first = False
        tracker.intervals.append(replace(iv_probe, s_to=s_next))
        if s_next == s_stop:
            break
        try:
            new_closed = tracker.state_after(s_next, direction, max(span, 1e-12),
                                             guess=closed ^ hitting)
        except SolveError as exc:
            raise lost(exc, s_next) from None
        for j in np.flatnonzero(new_closed != closed):
            events.append(Event(gaps[j].name, GAP_EVENTS[(gaps[j].kind, bool(new_closed[j]))],
                                to_user(s_next)))
        closed, s = new_closed, s_next
    else:
        raise SolveError("the sweep found too many changes of state to follow", file=model.source)

    order = np.argsort([direction * to_internal(e.value) for e in events], kind="stable")
    events = [events[i] for i in order]
    grid = np.linspace(start, stop, steps)
    return SweepResult(parameter=parameter, unit=unit, values=grid, results=_Steps(tracker, grid),
                       events=tuple(events), notes=tuple(notes), model=model, case=base.name,
                       exact=tracker.result_at,
                       replaced=_replaced(model, base, parameter, mask))


def _tabled_sweep(model, base, parameter, unit, start, stop, steps, to_internal, to_user, mask,
                  notes, buckling_capacity) -> SweepResult:
    """A temperature sweep of a model with properties against temperature.

    Between table entries the response is no longer affine in the temperature,
    so each value is solved on its own (the model at that temperature,
    :func:`axialfe.model.temperature.at_temperature`), and each event is found by
    bisection to rounding on an interval bracketed by the grid and the table
    entries: a gap whose state differs at the two ends, a segment whose stress
    peak passes its yield strength at that temperature.
    """
    from ..model.temperature import at_temperature, basis_note

    def solve_at(s):
        state = _swept_state(base, parameter, mask, s)
        return System(at_temperature(model, state)).solve_state(state)

    s_start, s_stop = to_internal(start), to_internal(stop)
    lo, hi = sorted((s_start, s_stop))
    grid = np.linspace(start, stop, steps)
    nodes = {float(to_internal(v)) for v in grid}
    T0 = model.reference_temperature
    for i, seg in enumerate(model.segments):          # the table entries, as values of s
        mat = seg.material
        for table in (mat.modulus_table, mat.yield_table, mat.expansion_table):
            if table is None:
                continue
            for T in table.temperatures:
                if parameter == "temperature_factor":
                    if base.dT[i] == 0:
                        continue
                    sk = (T - T0) / base.dT[i]
                else:
                    sk = T - T0
                if lo < sk < hi and (mask is None or mask[i]):
                    nodes.add(float(sk))
    direction = 1.0 if s_stop >= s_start else -1.0
    nodes = sorted(nodes, key=lambda v: direction * v)
    results = {s: solve_at(s) for s in nodes}
    has_fy = [seg.material.yield_strength is not None for seg in model.segments]

    def excess(r):
        peak, _ = r.fields.stress_peak()
        return np.array([abs(peak[i]) - r.model.segments[i].material.yield_strength
                         if has_fy[i] else -np.inf for i in range(len(peak))])

    def bisect(a, b, flipped):
        """The last s on a's side, to rounding, where ``flipped(result)`` is still false."""
        for _ in range(200):
            mid = 0.5 * (a + b)
            if mid in (a, b):
                break
            if flipped(solve_at(mid)):
                b = mid
            else:
                a = mid
        return b

    events = []
    yielded = np.zeros(len(model.segments), dtype=bool)
    for a, b in zip(nodes, nodes[1:]):
        ra, rb = results[a], results[b]
        for j in np.flatnonzero(ra.gap_closed != rb.gap_closed):
            now = bool(rb.gap_closed[j])
            root = bisect(a, b, lambda r, j=j, now=now: bool(r.gap_closed[j]) == now)
            gap = model.gaps[j]
            events.append(Event(gap.name, GAP_EVENTS[(gap.kind, now)], to_user(root)))
        ea, eb = excess(ra), excess(rb)
        for i in np.flatnonzero(~yielded & (ea < 0) & (eb >= 0)):
            root = bisect(a, b, lambda r, i=i: excess(r)[i] >= 0)
            events.append(Event(model.segments[i].name, "yields", to_user(root)))
            yielded[i] = True
    order = np.argsort([direction * to_internal(e.value) for e in events], kind="stable")
    notes = list(notes) + [basis_note(model) + "; events found by bisection between the "
                           "grid values and the table entries"]
    if buckling_capacity is not None:
        notes.append("buckling events are not followed along a sweep with properties against "
                     "temperature (check each temperature with 'axialfe check')")
    return SweepResult(parameter=parameter, unit=unit, values=grid,
                       results=_Solved(grid, [results[float(to_internal(v))] for v in grid]),
                       events=tuple(events[k] for k in order), notes=tuple(notes), model=model,
                       case=base.name, exact=lambda v: solve_at(float(to_internal(v))),
                       replaced=_replaced(model, base, parameter, mask))
