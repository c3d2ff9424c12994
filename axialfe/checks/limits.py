"""Deformation limits: displacements at stations and the least opening of gaps."""

from __future__ import annotations

from ..model import CheckSettings
from ..results import CaseResult
from .entries import CheckEntry, quantity_text

__all__ = ['limit_checks']


def limit_checks(result: CaseResult, settings: CheckSettings):
    """One entry per ``[[limits]]`` item: |u| / allowable, or min_opening / opening."""
    model, case = result.model, result.name
    out = []
    gap_names = [g.name for g in model.gaps]
    for lim in model.limits:
        if lim.at is not None:
            u = abs(result.displacement(lim.at))
            util = u / lim.displacement
            out.append(CheckEntry("displacement", lim.at, case, util, util <= 1.0, None,
                                  "displacement", u, lim.displacement))
            continue
        j = gap_names.index(lim.gap)
        opening = float(result.gap_opening[j])
        need = quantity_text(lim.min_opening, "displacement")
        if result.gap_closed[j]:
            out.append(CheckEntry("gap", lim.gap, case, None, False,
                                  f"the gap is closed; it must keep an opening of at least {need}",
                                  "displacement", lim.min_opening, 0.0))
        else:                                # an open gap has an opening above 0
            util = lim.min_opening / opening
            out.append(CheckEntry("gap", lim.gap, case, util, util <= 1.0, None, "displacement",
                                  lim.min_opening, opening))
    return out
