"""Buckling of compressed segments: Euler's load with its slenderness limit."""

from __future__ import annotations

import math

import numpy as np

from ..model import CheckSettings
from ..results import CaseResult
from ..units import OutputUnits
from .entries import CheckEntry, quantity_text

__all__ = ['buckling_checks']

# A compression below this strain times E*A is round-off, not load (common practice).
_STRAIN_NOISE = 1e-12


def buckling_checks(result: CaseResult, settings: CheckSettings, units: OutputUnits):
    """One Euler buckling entry per segment in compression at either end."""
    model, case, sf = result.model, result.name, settings.safety_factor
    out = []
    for i, seg in enumerate(model.segments):
        compression = float(max(-result.axial_force[i, 0], -result.axial_force[i, 1]))
        areas = [s.area for s in seg.sections]
        if compression <= _STRAIN_NOISE * seg.material.elastic_modulus * min(areas):
            continue
        k = seg.effective_length_factor or settings.effective_length_factor
        length = seg.buckling_length or float(result.length[i])
        basis = f"K = {k:g}, L = {quantity_text(length, units.length, units, 'length')}"
        moments = [s.second_moment for s in seg.sections]
        if any(m is None for m in moments):
            out.append(CheckEntry("buckling", seg.name, case, None, None,
                                  f"second moment of area missing: section "
                                  f"'{seg.sections[moments.index(None)].name}' gives only an area; "
                                  "add second_moment to check buckling", "force", compression,
                                  None, k, length))
            continue
        j = int(np.argmin(moments))          # the weaker end of a taper governs
        inertia, area = moments[j], areas[j]
        E = seg.material.elastic_modulus
        p_cr = math.pi ** 2 * E * inertia / (k * length) ** 2
        util = compression * sf / p_cr
        slender = k * length / math.sqrt(inertia / area)
        fy = seg.material.yield_strength
        limit = None if fy is None else math.pi * math.sqrt(E / fy)
        if limit is None:
            ok, note = None, (f"{basis}; no yield strength given for material "
                              f"'{seg.material.name}', so the slenderness limit pi*sqrt(E/f_y) "
                              "of the Euler formula is unknown: an engineer must judge")
        elif slender < limit:
            ok, note = None, (f"{basis}; slenderness K*L/r = {slender:.4g} is below the Euler "
                              f"limit pi*sqrt(E/f_y) = {limit:.4g}: an inelastic column curve "
                              "from the applicable code governs")
        else:
            ok, note = util <= 1.0, basis
        out.append(CheckEntry("buckling", seg.name, case, util, ok, note, "force", compression,
                              p_cr, k, length, slender, limit))
    return out
