"""Where a result leaves its own assumptions: the notes of each solved case.

A linear-elastic, small-displacement solve of straight bars stays true only
while the parts stay elastic, straight and as connected as the model says.
Each case gets a note (kept in SI, with its quantities as data for
:func:`~axialfe.checks.entries.note_text`) where:

- ``yield``: a segment's largest stress along it (its inside included) is
  beyond its yield strength (the compressive yield strength where the material
  gives one and the stress is compressive);
- ``buckling``: a segment's largest compression is beyond its buckling
  capacity, the capacity the buckling check uses (its column curve over its
  braced run, :func:`~axialfe.checks.buckling.buckling_capacities`), without
  the safety factor;
- ``crushing``: a closed contact's force, spread over the end areas of the
  parts that meet at one of its stations (the sum of their areas there), is a
  contact stress beyond the yield strength (compressive where given) of one of
  those parts;
- ``clamped``: a part that a preload puts in compression when installed (no
  loads, no temperature) carries tension in the case: the clamped interface
  is bonded in the model, where a real one would open (model it as a contact
  gap of zero clearance).

Across the cases, :func:`model_warnings` warns of a contact that looks inverted:
open in every case, its stations moving apart in every case, and by more than
they ever move relative to each other (its ``between`` order, or its side, is
likely the wrong way round).

The notes read results and compute; they print nothing (see :mod:`axialfe.output`).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..model import CheckSettings
from ..results import Solution
from .buckling import buckling_capacities
from .entries import quantity_text

__all__ = ["assumption_notes", "model_warnings", "NOT_ELASTIC"]

NOT_ELASTIC = "linear-elastic results are not valid beyond first yield"
# a stress, force or area this far past its bound only is rounding, not a finding
_ROUNDING = 1e-9


def _q(value, key):
    return quantity_text(value, key)


def _strength(material, compressive: bool):
    if compressive and material.compressive_yield_strength is not None:
        return material.compressive_yield_strength, "compressive yield strength"
    return material.yield_strength, "yield strength"


def _clamped_parts(model) -> set[int]:
    """The segments a preload holds in compression in the installed state."""
    if np.isnan(model.arrays.preload).all():   # no preload (read from the array form)
        return set()
    from ..engine.preload import installed_model
    from ..engine.system import solve

    # the misfits found for the preloads stay; preload=None keeps the solve from finding them again
    installed = installed_model(model)
    installed = replace(installed, segments=tuple(replace(s, preload=None)
                                                  for s in installed.segments))
    force = solve(installed).cases[0].axial_force
    scale = max(abs(s.preload) for s in model.segments if s.preload is not None)
    return {i for i, seg in enumerate(model.segments)
            if seg.preload is None and force[i].max() < -_ROUNDING * scale}


def assumption_notes(solution: Solution,
                     settings: CheckSettings | None = None) -> dict[str, tuple[str, ...]]:
    """The notes of every case: where its result leaves the assumptions of the solve.

    Parameters
    ----------
    solution : Solution
    settings : CheckSettings, optional
        For the buckling capacities (default: the model's ``checks``).

    Returns
    -------
    dict
        Case name to its notes, in the order yield, buckling, crushing, clamped;
        every case of the solution is a key (an empty tuple where nothing is to be
        said).  Quantities are kept as data: show a note with
        :func:`~axialfe.checks.entries.note_text`.

    Examples
    --------
    A steel rod of 100 mm^2 between walls, heated by 150 K: sigma = -E*alpha*dT =
    -360 MPa (Gere and Goodno, Mechanics of Materials, sec. 2.5), beyond a yield
    strength of 240 MPa.

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Model
    >>> from axialfe.engine.system import solve
    >>> from axialfe.checks.entries import note_text
    >>> from axialfe.units import OutputUnits
    >>> m = Material("s", 200e9, 12e-6, 240e6)
    >>> bar = Model([Station("a", 0.0), Station("b", 1.0)],
    ...             [Segment("ab", "a", "b", m, Section("r", "area", (("area", 1e-4),)),
    ...                      temperature_change=150.0)], [Support("a"), Support("b")])
    >>> for note in assumption_notes(solve(bar))["base"]:
    ...     print(note_text(note, OutputUnits()))
    segment 'ab' reaches -360 MPa (at x = 0 mm), beyond its yield strength 240 MPa: linear-elastic results are not valid beyond first yield
    """
    model = solution.model
    settings = settings or model.checks
    segments = model.segments
    capacities = capacities_of = None
    clamped = _clamped_parts(model)
    clamp_scale = max((abs(s.preload) for s in segments if s.preload is not None), default=0.0)
    # the end area each segment presents at each of its stations
    at_station: dict[str, list[tuple[int, float]]] = {}
    for i, seg in enumerate(segments):
        first, last = seg.sections
        at_station.setdefault(seg.start, []).append((i, first.area))
        at_station.setdefault(seg.end, []).append((i, last.area))

    out = {}
    for case in solution.cases:
        notes = []
        peak, t_peak = case.fields.stress_peak()
        n_low, _, n_high, _ = case.fields.force_range()
        x_peak = case.fields.position(t_peak)
        # properties at the case's temperatures where the model gives tables
        own = case.model.segments if case.model is not None else segments
        for i, seg in enumerate(segments):                       # --- yield ---
            strength, word = _strength(own[i].material, peak[i] < 0)
            if strength is not None and abs(peak[i]) > strength * (1 + _ROUNDING):
                notes.append(f"segment '{seg.name}' reaches {_q(peak[i], 'stress')} (at x = "
                             f"{_q(x_peak[i], 'length')}), beyond its {word} "
                             f"{_q(strength, 'stress')}: {NOT_ELASTIC}")
        for i, seg in enumerate(segments):                       # --- buckling ---
            if n_low[i] >= 0:
                continue
            if capacities is None or case.model is not capacities_of:
                capacities_of = case.model if case.model is not None else model
                capacities = buckling_capacities(capacities_of, settings)
            capacity = capacities[i][0]
            if capacity is not None and -n_low[i] > capacity * (1 + _ROUNDING):
                notes.append(f"segment '{seg.name}' carries a compression of "
                             f"{_q(-n_low[i], 'force')}, beyond its buckling capacity "
                             f"{_q(capacity, 'force')} (column curve {settings.column_curve} "
                             "over its braced run, no safety factor): the member would buckle, "
                             "which a solve of straight bars does not follow")
        for j, gap in enumerate(model.gaps):                     # --- crushing ---
            force = float(case.gap_force[j])
            if gap.kind != "contact" or not case.gap_closed[j] or force >= 0:
                continue
            for station in gap.stations:
                parts = at_station.get(station, [])
                total = sum(a for _, a in parts)
                if not parts or total <= 0:
                    continue
                stress = -force / total
                for i, _ in parts:
                    strength, word = _strength(own[i].material, True)
                    if strength is not None and stress > strength * (1 + _ROUNDING):
                        notes.append(
                            f"gap '{gap.name}' is closed with {_q(-force, 'force')}: over the end "
                            f"area{'s' if len(parts) > 1 else ''} of the "
                            f"part{'s' if len(parts) > 1 else ''} at '{station}' that is a "
                            f"contact stress of {_q(stress, 'stress')}, beyond the {word} of "
                            f"'{segments[i].name}' ({_q(strength, 'stress')}): the contact would "
                            "crush it, which a linear-elastic solve does not follow")
        for i in sorted(clamped):                                # --- clamped ---
            high = float(n_high[i])
            if high > _ROUNDING * clamp_scale:
                bolts = [s.name for s in segments if s.preload is not None]
                notes.append(f"segment '{segments[i].name}' carries a tension of "
                             f"{_q(high, 'force')} although the preload of "
                             + ", ".join(f"'{b}'" for b in bolts) + " clamps it, and no contact "
                             f"gap lets its stations '{segments[i].start}' and "
                             f"'{segments[i].end}' part: likely an unmodelled clamped interface "
                             "(a real one would open); model the interface as a contact gap of "
                             "zero clearance")
        out[case.name] = tuple(notes)
    return out


def model_warnings(solution: Solution) -> tuple[str, ...]:
    """Warnings about the model that only all its cases together show (quantities as data).

    A contact is likely inverted when, in every case whose result is accurate, it is
    open, its stations move apart (the closure u(a) - u(b) of ``between = [a, b]``, or
    the station's travel toward an ``at`` stop, is negative), and the opening is larger
    than the largest relative movement of its stations in any case.  A gap whose
    stations do not move (rounding noise) gets no warning.

    Examples
    --------
    >>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Gap, Model
    >>> from axialfe.engine.system import solve
    >>> rod = Segment("rod", "wall", "tip", Material("s", 200e9), Section("a", "area", (("area", 1e-4),)))
    >>> m = Model((Station("wall", 0.0), Station("tip", 1.0)), (rod,), (Support("wall"),),
    ...           (Load("tip", 1e3),), gaps=(Gap("stop", ("tip",), 1e-4, side="-x"),))
    >>> len(model_warnings(solve(m)))   # the tip moves away from a stop on its -x side
    1
    """
    from ..results import rounding_bounds

    used = [c for c in solution.cases if c.status == "ok"]
    out = []
    if not used:
        return ()
    for j, gap in enumerate(solution.model.gaps):
        if gap.kind != "contact":
            continue
        opening = [float(c.gap_opening[j]) for c in used]
        closure = [gap.clearance - o for o in opening]          # how far the parts approach
        moved = max(abs(d) for d in closure)
        noise = max(rounding_bounds(c)["displacement"] for c in used)
        if (all(not c.gap_closed[j] for c in used) and moved > noise
                and all(d < 0 for d in closure) and min(opening) > moved):
            if len(gap.stations) == 2:
                a, b = gap.stations
                how = (f"between = ['{a}', '{b}'] closes as u('{a}') - u('{b}') reaches the "
                       "clearance; swap them, or give minus_side and plus_side")
            else:
                how = (f"side = '{gap.side}' puts the stop on that side of '{gap.stations[0]}'; "
                       "check the side")
            out.append(f"gap '{gap.name}' is open in every case by more than its stations ever "
                       f"move relative to each other (at least {_q(min(opening), 'displacement')} "
                       f"open, at most {_q(moved, 'displacement')} of movement, always apart): "
                       f"it is likely inverted; {how}")
    return tuple(out)
