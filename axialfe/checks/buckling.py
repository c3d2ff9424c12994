"""Buckling of compressed segments over their braced runs, on a column curve.

Each segment in compression gets one entry, checked with its own section,
material and compression over the buckling length of its run (see
:mod:`axialfe.checks.bracing`):

- a segment's ``buckling_length`` overrides the run; K is the segment's
  ``effective_length_factor``, else ``[checks] effective_length_factor``;
- a run braced at both ends: L = the run's length, K as above;
- a run braced at one end only (a free end): L = the run's length, K = 2 unless
  the segment sets ``effective_length_factor``;
- a run braced at neither end, or a member that forks beyond the segment: no
  length the tool can stand behind, so the entry is undecided.

The capacity is the column curve's critical stress times the area (never more
than A * f_y; see :mod:`axialfe.checks.columns`), or Euler's load alone with
``column_curve = "euler-only"``, which leaves stocky members (K*L/r below
pi*sqrt(E/f_y)) undecided.  Without a yield strength no curve can be drawn and
the entry is undecided.  A taper is checked with its weaker end.
"""

from __future__ import annotations

import math

import numpy as np

from ..model import CheckSettings
from ..results import CaseResult
from .bracing import braced_runs, parallel_segments
from .columns import IMPERFECTION, column_strength, johnson_tangency
from .entries import CheckEntry, quantity_text

__all__ = ["buckling_checks", "buckling_capacities"]

# A compression below this strain times E*A is round-off, not load (common practice).
_STRAIN_NOISE = 1e-12
# K of a run braced at one end only: a cantilever, its braced end held against rotation
# (Timoshenko and Gere, Theory of Elastic Stability, 2nd ed., sec. 2.1; from memory).
FREE_END_K = 2.0


def _length_bases(settings, length_text):
    """:func:`_length_basis` of each segment, worked out once for the segments of one run
    that set the same length and factor of their own (all of a long member's, as a rule)."""
    made = {}

    def basis(seg, run):
        key = (run, seg.buckling_length, seg.effective_length_factor)
        found = made.get(key)
        if found is None:
            found = made[key] = _length_basis(seg, run, settings, length_text)
        return found

    return basis


def _length_basis(seg, run, settings, length_text):
    """Return (L, K, text, undecided note or None) of one segment."""
    own_k = seg.effective_length_factor
    if seg.buckling_length is not None:
        k = own_k or settings.effective_length_factor
        return (seg.buckling_length, k, f"L = {length_text(seg.buckling_length)} (the segment's "
                f"buckling_length), K = {k:g}", None)
    where = f"run '{run.start}'..'{run.end}'"
    if run.fork is not None:
        return (run.length, own_k or settings.effective_length_factor, where,
                f"{where}: the member forks beyond '{run.fork}' into ways that end at different "
                "stations, so its braced run is not clear: give the segment buckling_length")
    if run.braced_ends == 0:
        return (run.length, own_k or settings.effective_length_factor, where,
                f"{where} is braced at neither end: mark the stations that hold it laterally "
                "with braced = true, or give the segment buckling_length")
    if run.braced_ends == 2:
        k = own_k or settings.effective_length_factor
        return (run.length, k, f"{where} braced at both ends: L = {length_text(run.length)}, "
                f"K = {k:g}", None)
    text = (f"{where} braced at '{run.braced_end}' only (free end '{run.free_end}'): "
            f"L = {length_text(run.length)}, ")
    if own_k:
        return (run.length, own_k, text + f"K = {own_k:g} (the segment's effective_length_factor)",
                None)
    return (run.length, FREE_END_K, text + f"K = {FREE_END_K:g} for the free end (this assumes "
            f"'{run.braced_end}' holds the member against rotation; set effective_length_factor "
            "otherwise)", None)


def _parallel_text(names):
    shown = ", ".join(f"'{n}'" for n in names[:3]) + (" ..." if len(names) > 3 else "")
    return (f"; parallel to {shown}: a part guided by another along its length (a sleeve on a "
            "bolt) is laterally supported there (common practice), which this check does not "
            "assume: set buckling_length or braced stations deliberately")


def _curve_text(curve, strength, slender, tangency):
    if curve == "johnson":
        side = "below" if strength.branch == "parabola" else "at or above"
        return (f"johnson ({'parabola' if strength.branch == 'parabola' else 'Euler branch'}: "
                f"K*L/r = {slender:.4g} {side} the tangency {tangency:.4g}): "
                f"sigma_cr = {strength.reduction:.4g}*f_y")
    if curve in IMPERFECTION:
        return (f"{curve} (alpha = {IMPERFECTION[curve]:g}, gamma_M1 = the safety factor): "
                f"K*L/r = {slender:.4g}, relative slenderness {strength.relative_slenderness:.4g}, "
                f"chi = {strength.reduction:.4g}")
    return (f"aisc360 (eq. {strength.branch}): K*L/r = {slender:.4g}, "
            f"F_cr = {strength.reduction:.4g}*F_y")


def _weaker_end(moments) -> int:
    """The index of the smaller of a segment's two second moments (the first of equals)."""
    return 1 if moments[1] < moments[0] else 0


def _bending_stiffness(seg):
    """The smaller E*I of a segment's two ends, None when a section gives no second moment."""
    moments = [s.second_moment for s in seg.sections]
    return None if any(m is None for m in moments) else seg.material.elastic_modulus * min(moments)


def _weaker_in_run(model, runs, parallel):
    """For every segment, the weakest other segment of its run in series with it (or None)."""
    groups = {}
    for i, seg in enumerate(model.segments):
        ei = _bending_stiffness(seg)
        if ei is not None:
            groups.setdefault((runs[i].start, runs[i].end), []).append((ei, i))
    for members in groups.values():
        members.sort()
    out = []
    for i, seg in enumerate(model.segments):
        ei, found = _bending_stiffness(seg), None
        for other_ei, j in groups.get((runs[i].start, runs[i].end), ()) if ei is not None else ():
            if other_ei >= ei:
                break
            if model.segments[j].name not in parallel[i]:
                found = model.segments[j].name
                break
        out.append(found)
    return out


def buckling_checks(result: CaseResult, settings: CheckSettings):
    """One buckling entry per segment in compression at either end."""
    model, case = result.model, result.name
    sf, curve = settings.safety_factor, settings.column_curve
    runs, parallel = braced_runs(model), parallel_segments(model)
    weaker = _weaker_in_run(model, runs, parallel)

    def length_text(value):
        return quantity_text(value, "length")

    def force_text(value):
        return quantity_text(value, "force")

    length_basis = _length_bases(settings, length_text)
    out = []
    N = result.axial_force
    compressions = np.maximum(-N[:, 0], -N[:, 1]).tolist()
    for i, seg in enumerate(model.segments):
        compression = compressions[i]
        areas = [s.area for s in seg.sections]
        if compression <= _STRAIN_NOISE * seg.material.elastic_modulus * min(areas):
            continue
        length, k, basis, unclear = length_basis(seg, runs[i])
        own_length = seg.buckling_length is not None     # the user has set it deliberately
        tail = _parallel_text(parallel[i]) if parallel[i] and not own_length else ""
        if weaker[i] is not None and not own_length:
            tail += (f"; the run also holds the weaker segment '{weaker[i]}': this capacity takes "
                     "this segment's own section over the whole run, which overstates a run of "
                     "mixed sections")

        def entry(util, ok, note, capacity=None, slender=None, limit=None, lam=None):
            return CheckEntry("buckling", seg.name, case, util, ok, note + tail, "force",
                              compression, capacity, k, length, slender, limit, curve, lam)

        if unclear is not None:
            out.append(entry(None, None, unclear))
            continue
        moments = [s.second_moment for s in seg.sections]
        if any(m is None for m in moments):
            out.append(entry(None, None, f"second moment of area missing: section "
                             f"'{seg.sections[moments.index(None)].name}' gives only an area; "
                             "add second_moment to check buckling"))
            continue
        j = _weaker_end(moments)             # the weaker end of a taper governs
        inertia, area = moments[j], areas[j]
        E, fy = seg.material.elastic_modulus, seg.material.yield_strength
        p_euler = math.pi ** 2 * E * inertia / (k * length) ** 2
        slender = k * length / math.sqrt(inertia / area)
        limit = None if fy is None else math.pi * math.sqrt(E / fy)
        if fy is None:
            util = compression * sf / p_euler
            out.append(entry(util, None, f"{basis}; no yield strength given for material "
                             f"'{seg.material.name}', so neither the column curve nor the "
                             "slenderness limit pi*sqrt(E/f_y) of the Euler formula is known "
                             f"(Euler load {force_text(p_euler)}): an engineer must judge",
                             p_euler, slender))
            continue
        if curve == "euler-only":
            util = compression * sf / p_euler
            if slender < limit:
                out.append(entry(util, None, f"{basis}; euler-only: slenderness K*L/r = "
                                 f"{slender:.4g} is below the Euler limit pi*sqrt(E/f_y) = "
                                 f"{limit:.4g}: an inelastic column curve from the applicable "
                                 "code governs (set [checks] column_curve)",
                                 p_euler, slender, limit))
            else:
                out.append(entry(util, util <= 1.0, f"{basis}; euler-only: K*L/r = {slender:.4g}, "
                                 f"Euler load {force_text(p_euler)} (no reduction)",
                                 p_euler, slender, limit))
            continue
        strength = column_strength(curve, E, fy, slender)
        capacity = strength.stress * area
        util = compression * sf / capacity
        text = _curve_text(curve, strength, slender, johnson_tangency(E, fy))
        out.append(entry(util, util <= 1.0, f"{basis}; {text}, capacity {force_text(capacity)}",
                         capacity, slender, limit, strength.relative_slenderness))
    return out


def buckling_capacities(model, settings: CheckSettings):
    """Each segment's buckling capacity in compression (N), as the entries above compute it.

    Returns one ``(capacity, note)`` per segment: ``capacity`` is None where the
    check would be undecided (no clear braced run, no second moment of area or
    no yield strength, or a stocky member with ``column_curve = "euler-only"``),
    and ``note`` then says why.  Used by limit analysis to cap a compressed
    segment of a mechanism.
    """
    runs, curve = braced_runs(model), settings.column_curve
    length_basis = _length_bases(settings, lambda v: f"{v:g} m")
    out = []
    for i, seg in enumerate(model.segments):
        length, k, _, unclear = length_basis(seg, runs[i])
        moments = [s.second_moment for s in seg.sections]
        E, fy = seg.material.elastic_modulus, seg.material.yield_strength
        if unclear is not None:
            out.append((None, unclear))
            continue
        if any(m is None for m in moments):
            out.append((None, "second moment of area missing"))
            continue
        if fy is None:
            out.append((None, "no yield strength"))
            continue
        j = _weaker_end(moments)
        inertia, area = moments[j], [s.area for s in seg.sections][j]
        slender = k * length / math.sqrt(inertia / area)
        if curve == "euler-only":
            if slender < math.pi * math.sqrt(E / fy):
                out.append((None, "euler-only below the slenderness limit"))
            else:
                out.append((math.pi ** 2 * E * inertia / (k * length) ** 2, "Euler load"))
            continue
        out.append((column_strength(curve, E, fy, slender).stress * area, f"column curve {curve}"))
    return out
