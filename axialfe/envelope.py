"""Envelopes: the least and the largest of every result over the cases of a solution.

Across every case and combination of a :class:`~axialfe.results.Solution`, the
envelope holds, for each station its displacement, for each segment its axial
force and stress (along the whole segment: its inside is included, where a taper
or a distributed load puts a turning point), for each support its reaction and
for each gap its force and opening; each with the least value, the largest, and
the case that gives each.  Values are in SI units, as in the results; the
output converts them.  A case whose result is inaccurate is left out and named
(its numbers must not be used); ties go to the case that comes first.

Examples
--------
A steel rod, 1 m long, 100 mm^2, fixed at one end and pulled at the other by
10 kN in one case and pushed by 25 kN in another: N = P in each case, so the
envelope of its force is [-25 kN, 10 kN] and of its tip displacement
[-25e3 / (200e9 * 1e-4), 10e3 / (200e9 * 1e-4)] m = [-1.25 mm, 0.5 mm]
(u = PL/EA, Gere and Goodno, Mechanics of Materials, 7th ed., eq. 2-3).

>>> from axialfe.model import Case, Load, Material, Model, Section, Segment, Station, Support
>>> from axialfe import solve
>>> m = Model((Station("wall", 0.0), Station("tip", 1.0)),
...           (Segment("rod", "wall", "tip", Material("steel", 200e9, 12e-6),
...                    Section("a", "area", (("area", 1e-4),))),),
...           (Support("wall"),),
...           cases=(Case("pull", loads=(Load("tip", 10e3),)),
...                  Case("push", loads=(Load("tip", -25e3),))))
>>> env = envelope(solve(m))
>>> rod = env.entry("segment", "rod", "axial_force")
>>> round(rod.min, 6), rod.min_case, round(rod.max, 6), rod.max_case
(-25000.0, 'push', 10000.0, 'pull')
>>> tip = env.entry("station", "tip", "displacement")
>>> round(tip.min * 1e3, 12), round(tip.max * 1e3, 12)   # should be -1.25, 0.5
(-1.25, 0.5)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .errors import ModelError, suggest
from .results import Solution
from .units import OutputUnits

__all__ = ["Envelope", "EnvelopeEntry", "envelope", "GROUPS"]

# the groups of an envelope, in the order of the output, and their items' kind
GROUPS = (("stations", "station"), ("segments", "segment"), ("reactions", "reaction"),
          ("gaps", "gap"))

# the quantity of each entry and the output unit it is shown in
UNIT_OF = {"displacement": "displacement", "axial_force": "force", "stress": "stress",
           "force": "force", "opening": "displacement"}


@dataclass(frozen=True)
class EnvelopeEntry:
    """The least and the largest value of one quantity of one item over the cases.

    Attributes
    ----------
    item : {'station', 'segment', 'reaction', 'gap'}
    name : str
        The station, segment or gap; for a reaction the support's station.
    quantity : {'displacement', 'axial_force', 'stress', 'force', 'opening'}
    min, max : float
        In SI units (m, N, Pa), signed as the results are.
    min_case, max_case : str
        The case (or combination) that gives each.
    min_at, max_at : float or None
        Segments only: the position x (m) along the axis where each occurs.
    kind : str or None
        Reactions: the kind of support; gaps: contact or slack.
    """

    item: str
    name: str
    quantity: str
    min: float
    max: float
    min_case: str
    max_case: str
    min_at: float | None = None
    max_at: float | None = None
    kind: str | None = None

    def __post_init__(self):
        if not self.min <= self.max:
            raise ValueError(f"envelope of {self.item} '{self.name}' {self.quantity}: "
                             f"min {self.min} exceeds max {self.max}")

    @property
    def unit_key(self) -> str:
        """The output unit kind of the quantity (force, length, displacement, stress)."""
        return UNIT_OF[self.quantity]

    def to_dict(self, units: OutputUnits) -> dict:
        """The JSON form, values in ``units`` (positions in its length unit)."""
        f = units.factor(self.unit_key)
        fL = units.factor("length")
        key = "at" if self.item == "reaction" else "name"
        out = {key: self.name, "quantity": self.quantity, "unit": getattr(units, self.unit_key),
               "min": self.min / f, "max": self.max / f,
               "min_case": self.min_case, "max_case": self.max_case}
        if self.kind is not None:
            out["kind"] = self.kind
        if self.item == "segment":
            out["min_x"] = self.min_at / fL
            out["max_x"] = self.max_at / fL
        return out


@dataclass(frozen=True)
class Envelope:
    """The envelope of a solution: one :class:`EnvelopeEntry` per item and quantity.

    Attributes
    ----------
    stations, segments, reactions, gaps : tuple of EnvelopeEntry
        Stations in order of x (then of the model); the others in model order,
        a segment's axial force before its stress, a gap's force before its opening.
    cases : tuple of str
        The cases it covers.
    excluded : tuple of str
        The cases left out because their result is inaccurate.
    """

    stations: tuple[EnvelopeEntry, ...]
    segments: tuple[EnvelopeEntry, ...]
    reactions: tuple[EnvelopeEntry, ...]
    gaps: tuple[EnvelopeEntry, ...]
    cases: tuple[str, ...]
    excluded: tuple[str, ...] = ()

    @property
    def entries(self) -> tuple[EnvelopeEntry, ...]:
        return self.stations + self.segments + self.reactions + self.gaps

    def entry(self, item: str, name: str, quantity: str) -> EnvelopeEntry:
        """The entry of ``quantity`` of ``item`` ``name`` (a reaction by its station)."""
        for e in self.entries:
            if e.item == item and e.name == name and e.quantity == quantity:
                return e
        known = sorted({e.name for e in self.entries if e.item == item})
        raise ModelError(f"no envelope of {quantity} for {item} '{name}'", place="envelope",
                         hint=suggest(name, known))

    def to_dict(self, units: OutputUnits) -> dict:
        """The JSON form ``{"cases", "excluded", "stations", "segments", "reactions", "gaps"}``."""
        out = {"cases": list(self.cases), "excluded": list(self.excluded)}
        for group, _ in GROUPS:
            out[group] = [e.to_dict(units) for e in getattr(self, group)]
        return out


def _extremes(values):
    """Per row of ``values`` (rows: items, columns: cases): the least and the largest value
    and the index of the first case that gives each."""
    lo, hi = np.argmin(values, axis=1), np.argmax(values, axis=1)   # the first of ties
    rows = np.arange(values.shape[0])
    return values[rows, lo], lo, values[rows, hi], hi


def envelope(solution: Solution) -> Envelope:
    """The envelope of every result over the cases and combinations of ``solution``.

    Parameters
    ----------
    solution : Solution

    Returns
    -------
    Envelope
        Empty groups (no entries) when every case is inaccurate.
    """
    model = solution.model
    used = [c for c in solution.cases if c.status == "ok"]
    excluded = tuple(c.name for c in solution.cases if c.status != "ok")
    names = tuple(c.name for c in used)
    if not used:
        return Envelope((), (), (), (), names, excluded)

    def entries(item, labels, quantity, values, kinds=None):
        lo, i_lo, hi, i_hi = _extremes(np.asarray(values, dtype=float).reshape(len(labels), -1))
        return [EnvelopeEntry(item, label, quantity, float(lo[r]), float(hi[r]),
                              names[i_lo[r]], names[i_hi[r]],
                              kind=None if kinds is None else kinds[r])
                for r, label in enumerate(labels)]

    # stations in order of x (a stable sort keeps the model's order among equal x)
    order = sorted(range(len(model.stations)), key=lambda i: model.stations[i].x)
    u = np.column_stack([c.u for c in used])
    stations = entries("station", [model.stations[i].name for i in order], "displacement",
                       u[order])

    segments = []
    if model.segments:
        ranges = {"axial_force": [], "stress": []}
        for c in used:
            for quantity, extremes in (("axial_force", c.fields.force_range()),
                                       ("stress", c.fields.stress_range())):
                low, t_low, high, t_high = extremes
                x_low, x_high = c.fields.position(t_low), c.fields.position(t_high)
                ranges[quantity].append((low, high, x_low, x_high))
        per_quantity = {}
        for quantity, parts in ranges.items():
            low = np.column_stack([p[0] for p in parts])
            high = np.column_stack([p[1] for p in parts])
            x_low = np.column_stack([p[2] for p in parts])
            x_high = np.column_stack([p[3] for p in parts])
            lo_v, i_lo, _, _ = _extremes(low)
            _, _, hi_v, i_hi = _extremes(high)
            per_quantity[quantity] = (lo_v, i_lo, hi_v, i_hi, x_low, x_high)
        for r, seg in enumerate(model.segments):
            for quantity in ("axial_force", "stress"):
                lo_v, i_lo, hi_v, i_hi, x_low, x_high = per_quantity[quantity]
                segments.append(EnvelopeEntry(
                    "segment", seg.name, quantity, float(lo_v[r]), float(hi_v[r]),
                    names[i_lo[r]], names[i_hi[r]], min_at=float(x_low[r, i_lo[r]]),
                    max_at=float(x_high[r, i_hi[r]])))

    reactions = entries("reaction", [s.at for s in model.supports], "force",
                        np.column_stack([c.reactions for c in used]) if model.supports else [],
                        kinds=[s.kind for s in model.supports])
    gaps = []
    if model.gaps:
        force = entries("gap", [g.name for g in model.gaps], "force",
                        np.column_stack([c.gap_force for c in used]),
                        kinds=[g.kind for g in model.gaps])
        opening = entries("gap", [g.name for g in model.gaps], "opening",
                          np.column_stack([c.gap_opening for c in used]),
                          kinds=[g.kind for g in model.gaps])
        gaps = [e for pair in zip(force, opening) for e in pair]
    return Envelope(tuple(stations), tuple(segments), tuple(reactions), tuple(gaps), names,
                    excluded)
