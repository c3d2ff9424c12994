"""Braced runs: where a member is held laterally, and the lengths it can buckle over.

A compression member buckles between the points where it is braced laterally,
whatever the number of segments between them.  This module finds, for every
segment, its *run*: the stretch of the member between the nearest braced
stations at or beyond the segment's two ends.

- A station is braced when it is marked ``braced`` or carries a support of any
  kind (fixed, spring, settlement: a modelling assumption, stated in the check
  basis).  Gaps (``at`` stops, contacts, slack links) brace nothing.
- A run follows the segments, the member itself, outward from each end of the
  segment in x until it meets a braced station.  Where it meets none, it ends
  at the last station of the member on that side: a free end.
- Gaps are not segments, so a run never passes through one: two rods butting at
  a ``between`` contact are two runs (a contact is a hinge that gives no lateral
  restraint).
- Where the member forks beyond an unbraced station into ways that end at
  different stations, the run ends at the farthest of them, is braced on that
  side only if every way ends braced, and records the fork: the buckling check
  leaves such a run to the user (``buckling_length``).

The run of a segment whose two ends are braced is the segment itself, so
splitting a strut into several segments leaves its buckling length unchanged.

Examples
--------
A strut braced at both ends and split in three: every segment has the whole run.

>>> from axialfe.model import Material, Section, Station, Segment, Support, Model
>>> steel = Material("steel", 200e9)
>>> rod = Section("d20", "round", (("diameter", 0.020),))
>>> st = [Station("a", 0.0), Station("p", 0.3), Station("q", 0.7), Station("b", 1.0, braced=True)]
>>> segs = [Segment(f"s{i}", st[i].name, st[i + 1].name, steel, rod) for i in range(3)]
>>> runs = braced_runs(Model(tuple(st), tuple(segs), (Support("a"),)))
>>> [(r.start, r.end, r.length, r.braced_ends) for r in runs][0]
('a', 'b', 1.0, 2)
>>> len(set(runs))   # the same run for all three segments
1
"""

from __future__ import annotations

import functools
import weakref
from dataclasses import dataclass

from ..model import Model

__all__ = ["Run", "braced_runs", "braced_stations", "parallel_segments"]


def _once_per_model(fn):
    """``fn(model)`` worked out once for each model object: a model is immutable, and the
    checks and the notes of a solve all ask for its runs (the entry goes with the model)."""
    cache = {}

    @functools.wraps(fn)
    def once(model):
        key = id(model)
        hit = cache.get(key)
        if hit is not None and hit[0]() is model:
            return hit[1]
        value = fn(model)
        cache[key] = (weakref.ref(model, lambda _, key=key: cache.pop(key, None)), value)
        return value

    return once


@dataclass(frozen=True)
class Run:
    """The braced run of a segment.

    Attributes
    ----------
    start, end : str
        The run's end stations, ``start`` at the smaller x.
    length : float
        x(end) - x(start), in m.
    start_braced, end_braced : bool
        Whether the run is braced at that end (False: a free end).
    fork : str or None
        A station beyond which the member forks into ways that end at different
        stations (None when it does not).
    """

    start: str
    end: str
    length: float
    start_braced: bool
    end_braced: bool
    fork: str | None = None

    @property
    def braced_ends(self) -> int:
        """How many ends of the run are braced: 0, 1 or 2."""
        return int(self.start_braced) + int(self.end_braced)

    @property
    def free_end(self) -> str | None:
        """The free end of a run braced at one end only, else None."""
        if self.braced_ends != 1:
            return None
        return self.end if self.start_braced else self.start

    @property
    def braced_end(self) -> str | None:
        """The braced end of a run braced at one end only, else None."""
        if self.braced_ends != 1:
            return None
        return self.start if self.start_braced else self.end


def braced_stations(model: Model) -> frozenset[str]:
    """The stations marked ``braced`` or carrying a support of any kind."""
    return frozenset({st.name for st in model.stations if st.braced}
                     | {sup.at for sup in model.supports})


@_once_per_model
def braced_runs(model: Model) -> tuple[Run, ...]:
    """The braced run of every segment, in the order of ``model.segments``.

    Parameters
    ----------
    model : Model

    Returns
    -------
    tuple of Run

    Notes
    -----
    Each station's way outward is worked out once per direction, in order of x,
    so the cost grows with the number of segments, not with its square.
    """
    x = {st.name: float(st.x) for st in model.stations}
    braced = braced_stations(model)
    neighbours = {name: [] for name in x}
    for seg in model.segments:
        neighbours[seg.start].append(seg.end)
        neighbours[seg.end].append(seg.start)
    order = sorted(x, key=x.__getitem__)
    # ends[direction][station]: the stations where the member, followed outward from
    # the station in that direction, first meets a braced station or runs out
    ends = {}
    for direction, stations in ((-1, order), (1, order[::-1])):
        found = {}
        for name in stations:
            if name in braced:
                found[name] = frozenset((name,))
                continue
            beyond = [o for o in neighbours[name] if (x[o] - x[name]) * direction > 0]
            if not beyond:
                found[name] = frozenset((name,))
            elif len(beyond) == 1:
                found[name] = found[beyond[0]]
            else:
                found[name] = frozenset().union(*(found[o] for o in beyond))
        ends[direction] = found

    def side(name, direction):
        reached = ends[direction][name]
        if len(reached) == 1:              # one way out: no fork
            (far,) = reached
            return far, far in braced, None
        far = max(reached, key=lambda s: ((x[s] - x[name]) * direction, s))
        return far, reached <= braced, name

    runs, made = [], {}                    # the segments of one run share its Run
    for seg in model.segments:
        lo, hi = (seg.start, seg.end) if x[seg.start] <= x[seg.end] else (seg.end, seg.start)
        key = side(lo, -1) + side(hi, 1)
        run = made.get(key)
        if run is None:
            start, start_braced, fork_lo, end, end_braced, fork_hi = key
            run = made[key] = Run(start, end, x[end] - x[start], start_braced, end_braced,
                                  fork_lo or fork_hi)
        runs.append(run)
    return tuple(runs)


@_once_per_model
def parallel_segments(model: Model) -> tuple[tuple[str, ...], ...]:
    """For every segment, the segments of the same member that lie beside it.

    Two segments are parallel when segments join them (directly or through
    other segments) and their spans in x overlap over a length: a sleeve and
    the bolt inside it, for instance.

    Returns
    -------
    tuple of tuple of str
        In the order of ``model.segments``, the names of the parallel segments.
    """
    x = {st.name: float(st.x) for st in model.stations}
    parent = {name: name for name in x}

    def root(name):
        while parent[name] != name:
            parent[name] = parent[parent[name]]
            name = parent[name]
        return name

    for seg in model.segments:
        parent[root(seg.start)] = root(seg.end)
    spans = [(root(seg.start), *sorted((x[seg.start], x[seg.end])), i)
             for i, seg in enumerate(model.segments)]
    spans.sort()
    found = [[] for _ in model.segments]
    for k, (part, lo, hi, i) in enumerate(spans):
        for m in range(k + 1, len(spans)):
            other_part, other_lo, _, j = spans[m]
            if other_part != part or other_lo >= hi:   # sorted by lo: no overlap from here on
                break
            found[i].append(j)                          # lo <= other_lo < hi: they overlap
            found[j].append(i)
    return tuple(tuple(model.segments[j].name for j in sorted(f)) for f in found)
