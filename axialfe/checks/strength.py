"""Strength: the largest |stress| of each segment against its yield strength."""

from __future__ import annotations

from ..model import CheckSettings
from ..results import CaseResult
from .entries import CheckEntry

__all__ = ['strength_checks']


def strength_checks(result: CaseResult, settings: CheckSettings):
    """One strength entry per segment: max|sigma| * safety factor / yield strength.

    The largest |sigma| is taken over the whole segment, inside it included
    (a taper's stress peaks inside it), from :meth:`axialfe.mechanics.Fields.stress_peak`.
    """
    model, case, sf = result.model, result.name, settings.safety_factor
    peak, t = result.fields.stress_peak()
    at = result.fields.position(t)
    out = []
    for i, seg in enumerate(model.segments):
        fy = seg.material.yield_strength
        if fy is None:  # no entry: the report's basis line names these segments
            continue
        demand = abs(float(peak[i]))
        util = demand * sf / fy
        out.append(CheckEntry("strength", seg.name, case, util, util <= 1.0, None, "stress",
                              demand, fy, at=float(at[i])))
    return out
