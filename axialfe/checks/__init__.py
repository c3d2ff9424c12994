"""Design checks of a solved model: strength, buckling, deformation limits.

Each check gives one :class:`CheckEntry` per item and case with a utilisation
(demand over capacity, 1 at the limit) and a verdict ``ok``: True (passes),
False (fails) or None (the tool cannot decide; an engineer must judge).

- ``strength``: max|sigma| * safety factor / yield strength over each segment
  (the larger end), where a yield strength is known; the others are named in
  the basis of the report as not checked.
- ``buckling``: for each segment in compression at either end, the largest
  compression * safety factor / capacity over the buckling length of its braced
  run (:mod:`~axialfe.checks.bracing`), the capacity from the column curve
  ``[checks] column_curve`` (:mod:`~axialfe.checks.columns`: Johnson's parabola
  by default, EN 1993-1-1 curves a0..d, AISC 360-16 E3) and never more than the
  squash load A * f_y; ``euler-only`` keeps Euler's load alone and leaves
  stocky members undecided, as does a missing yield strength or a run braced
  at neither end.
- ``displacement``: |u| / allowable at a station (``[[limits]] at``).
- ``gap``: min_opening / opening of a gap (``[[limits]] gap``); a closed gap
  fails with no utilisation.

No safety factor applies to deformation limits.  The checks read results and
compute; they print nothing (see :mod:`axialfe.output`).

Examples
--------
A pinned-pinned steel strut, 1 m long, 20 mm round, braced at both ends: slender
(K L / r = 200), so Johnson's curve gives Euler's load pi^2 E I / L^2.

>>> import math
>>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Model
>>> steel = Material("steel", 200e9, 12e-6, yield_strength=250e6)
>>> rod = Section("d20", "round", (("diameter", 0.020),))
>>> m = Model((Station("a", 0.0), Station("b", 1.0, braced=True)),
...           (Segment("strut", "a", "b", steel, rod),),
...           (Support("a"),), (Load("b", -5e3),))
>>> from axialfe import solve
>>> entry = [e for e in check_case(solve(m)["base"]) if e.kind == "buckling"][0]
>>> p_cr = math.pi ** 2 * 200e9 * (math.pi * 0.020 ** 4 / 64) / 1.0 ** 2
>>> abs(entry.capacity - p_cr) / p_cr < 1e-12   # should be True
True
>>> round(entry.utilization, 4), entry.ok
(0.3225, True)
"""

from __future__ import annotations

from ..model import CheckSettings
from ..results import CaseResult, Solution
from .buckling import buckling_checks
from .entries import KINDS, CaseChecks, CheckEntry, CheckReport
from .limits import limit_checks
from .strength import strength_checks

__all__ = ["CheckEntry", "CaseChecks", "CheckReport", "check_case", "check_solution", "KINDS",
           "CHECKS", "strength_checks", "buckling_checks", "limit_checks"]

# The checks in the order of their entries; a new check is one module and one name here.
CHECKS = (strength_checks, buckling_checks, limit_checks)


def check_case(result: CaseResult, settings: CheckSettings | None = None) -> tuple[CheckEntry, ...]:
    """Check one solved case.

    Parameters
    ----------
    result : CaseResult
    settings : CheckSettings, optional
        Default: the model's ``checks``.

    Returns
    -------
    tuple of CheckEntry
        Strength entries for every segment, buckling entries for the
        compressed segments, then one entry per limit.
    """
    settings = settings or result.model.checks
    return tuple(e for check in CHECKS for e in check(result, settings))


def check_solution(solution: Solution) -> CheckReport:
    """Check every case of a solution and find the governing entry.

    Parameters
    ----------
    solution : Solution

    Returns
    -------
    CheckReport
    """
    settings = solution.model.checks
    cases = tuple(CaseChecks(c.name, check_case(c, settings)) for c in solution.cases)
    governing = None
    for c in cases:
        for e in c.entries:
            if e.utilization is not None and (governing is None
                                              or e.utilization > governing.utilization):
                governing = e
    unchecked = tuple(seg.name for seg in solution.model.segments
                      if seg.material.yield_strength is None)
    return CheckReport(settings, cases, governing, unchecked)
