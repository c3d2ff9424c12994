"""Strength: the largest |stress| of each segment against its yield strength."""

from __future__ import annotations

import numpy as np

from ..model import CheckSettings
from ..results import CaseResult
from ..units import OutputUnits
from .entries import CheckEntry

__all__ = ['strength_checks']


def strength_checks(result: CaseResult, settings: CheckSettings, units: OutputUnits):
    """One strength entry per segment: max|sigma| * safety factor / yield strength."""
    model, case, sf = result.model, result.name, settings.safety_factor
    out = []
    smax = np.abs(result.stress).max(axis=1)
    for i, seg in enumerate(model.segments):
        fy = seg.material.yield_strength
        if fy is None:  # no entry: the report's basis line names these segments
            continue
        util = float(smax[i]) * sf / fy
        out.append(CheckEntry("strength", seg.name, case, util, util <= 1.0, None, "stress",
                              float(smax[i]), fy))
    return out
