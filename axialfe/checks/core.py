"""Design checks of a solved model: strength, Euler buckling, deformation limits.

Each check gives one :class:`CheckEntry` per item and case with a utilisation
(demand over capacity, 1 at the limit) and a verdict ``ok``: True (passes),
False (fails) or None (the tool cannot decide; an engineer must judge).

- ``strength``: max|sigma| * safety factor / yield strength over each segment
  (the larger end), where a yield strength is known; the others are named in
  the basis of the report as not checked.
- ``buckling``: for each segment in compression at either end, the largest
  compression * safety factor / Euler load pi^2 E I / (K L)^2.  Euler's formula
  holds for slender elastic members only: where K L / r lies below the limit
  pi * sqrt(E / f_y), at which the Euler stress reaches the yield strength, the
  entry keeps its utilisation but is undecided (an inelastic column curve from
  the applicable code governs); without a yield strength the limit is unknown
  and the entry is undecided as well.
- ``displacement``: |u| / allowable at a station (``[[limits]] at``).
- ``gap``: min_opening / opening of a gap (``[[limits]] gap``); a closed gap
  fails with no utilisation.

No safety factor applies to deformation limits.  The checks read results and
compute; they print nothing (see :mod:`axialfe.output`).

Examples
--------
A pinned-pinned steel strut, 1 m long, 20 mm round: Euler load pi^2 E I / L^2.

>>> import math
>>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Model
>>> steel = Material("steel", 200e9, 12e-6, yield_strength=250e6)
>>> rod = Section("d20", "round", (("diameter", 0.020),))
>>> m = Model((Station("a", 0.0), Station("b", 1.0)), (Segment("strut", "a", "b", steel, rod),),
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

import math
from dataclasses import dataclass

import numpy as np

from ..model import CheckSettings
from ..results import CaseResult, Solution
from ..units import OutputUnits

__all__ = ["CheckEntry", "CaseChecks", "CheckReport", "check_case", "check_solution", "KINDS",
           "CHECKS", "strength_checks", "buckling_checks", "limit_checks"]

KINDS = ("strength", "buckling", "displacement", "gap")

# A compression below this strain times E*A is round-off, not load (common practice).
_STRAIN_NOISE = 1e-12


@dataclass(frozen=True)
class CheckEntry:
    """One check of one item in one case.

    Attributes
    ----------
    kind : {'strength', 'buckling', 'displacement', 'gap'}
    name : str
        The segment, station or gap checked.
    case : str
    utilization : float or None
        Demand over capacity (safety factor included where it applies).
    ok : bool or None
        True passes (utilisation at most 1), False fails, None undecided.
    note : str or None
        Why an entry is undecided or fails without a utilisation, or what it assumed.
    quantity : {'stress', 'force', 'displacement'}
        What ``demand`` and ``capacity`` measure.
    demand, capacity : float or None
        In SI units; ``demand`` without the safety factor.  For a gap limit the
        demand is the required opening and the capacity the opening left.
    k_factor, buckling_length, slenderness, slenderness_limit : float or None
        The buckling basis (buckling entries only).
    """

    kind: str
    name: str
    case: str
    utilization: float | None
    ok: bool | None
    note: str | None = None
    quantity: str = "stress"
    demand: float | None = None
    capacity: float | None = None
    k_factor: float | None = None
    buckling_length: float | None = None
    slenderness: float | None = None
    slenderness_limit: float | None = None

    @property
    def verdict(self) -> str:
        """``'pass'``, ``'FAIL'`` or ``'review'`` (undecided)."""
        return {True: "pass", False: "FAIL", None: "review"}[self.ok]

    def to_dict(self) -> dict:
        """The JSON form: kind, name, utilization, ok, note."""
        return {"kind": self.kind, "name": self.name,
                "utilization": None if self.utilization is None else float(self.utilization),
                "ok": self.ok, "note": self.note}


@dataclass(frozen=True)
class CaseChecks:
    """The check entries of one case, in the order strength, buckling, limits."""

    case: str
    entries: tuple[CheckEntry, ...]

    def __iter__(self):
        return iter(self.entries)

    def __len__(self):
        return len(self.entries)


@dataclass(frozen=True)
class CheckReport:
    """All checks of a solution, with the governing entry and the overall status.

    Attributes
    ----------
    settings : CheckSettings
    cases : tuple of CaseChecks
    governing : CheckEntry or None
        The entry with the highest utilisation over all cases (None when no
        entry has one).
    unchecked : tuple of str
        Segments whose material gives no yield strength: they get no strength
        entry, and :meth:`settings_text` names them.
    """

    settings: CheckSettings
    cases: tuple[CaseChecks, ...]
    governing: CheckEntry | None
    unchecked: tuple[str, ...] = ()

    @property
    def entries(self) -> tuple[CheckEntry, ...]:
        return tuple(e for c in self.cases for e in c.entries)

    @property
    def status(self) -> str:
        """``'fail'`` if any entry fails, else ``'undecided'`` if any is undecided or a
        segment's strength could not be checked, else ``'pass'``."""
        oks = [e.ok for e in self.entries]
        if any(ok is False for ok in oks):
            return "fail"
        if any(ok is None for ok in oks) or self.unchecked:
            return "undecided"
        return "pass"

    @property
    def exit_code(self) -> int:
        """0 all pass, 1 any fails, 3 none fails but some are undecided."""
        return {"pass": 0, "fail": 1, "undecided": 3}[self.status]

    def case(self, name: str) -> CaseChecks:
        for c in self.cases:
            if c.case == name:
                return c
        raise KeyError(name)

    def governing_dict(self) -> dict | None:
        """The JSON form of the governing entry: kind, name, case, utilization."""
        g = self.governing
        if g is None:
            return None
        return {"kind": g.kind, "name": g.name, "case": g.case, "utilization": float(g.utilization)}

    def settings_text(self) -> str:
        """One line stating the basis of the checks, defaults included."""
        s = self.settings
        k_default = " (default)" if s.effective_length_factor == 1.0 else ""
        sf_default = " (default)" if s.safety_factor == 1.0 else ""
        return (f"safety factor {s.safety_factor:g}{sf_default} on strength and buckling, none on "
                f"deformation limits; buckling: Euler load pi^2*E*I/(K*L)^2 with K = "
                f"{s.effective_length_factor:g}{k_default} and L = the segment length unless a "
                "segment sets effective_length_factor or buckling_length (the default assumes "
                "both end stations of a segment are braced laterally; give buckling_length for "
                "an unbraced run)"
                + ("; strength NOT checked (no yield strength given): "
                   + ", ".join(f"'{n}'" for n in self.unchecked) if self.unchecked else ""))


def _num(value: float) -> str:
    """Four significant digits, in plain digits where that stays short."""
    text = f"{value:.4g}"
    if "e" in text and 1e-4 <= abs(value) < 1e7:
        text = f"{float(text):.10f}".rstrip("0").rstrip(".")
    return text


def _fmt(value, unit, units: OutputUnits, key):
    return f"{_num(value / units.factor(key))} {unit}"


def check_case(result: CaseResult, settings: CheckSettings | None = None,
               units: OutputUnits | None = None) -> tuple[CheckEntry, ...]:
    """Check one solved case.

    Parameters
    ----------
    result : CaseResult
    settings : CheckSettings, optional
        Default: the model's ``checks``.
    units : OutputUnits, optional
        Units of the values quoted in notes (default: the model's).

    Returns
    -------
    tuple of CheckEntry
        Strength entries for every segment, buckling entries for the
        compressed segments, then one entry per limit.
    """
    settings = settings or result.model.checks
    units = units or result.model.units
    return tuple(e for check in CHECKS for e in check(result, settings, units))


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
        basis = f"K = {k:g}, L = {_fmt(length, units.length, units, 'length')}"
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


def limit_checks(result: CaseResult, settings: CheckSettings, units: OutputUnits):
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
        need = _fmt(lim.min_opening, units.displacement, units, "displacement")
        if result.gap_closed[j]:
            out.append(CheckEntry("gap", lim.gap, case, None, False,
                                  f"the gap is closed; it must keep an opening of at least {need}",
                                  "displacement", lim.min_opening, 0.0))
        else:                                # an open gap has an opening above 0
            util = lim.min_opening / opening
            out.append(CheckEntry("gap", lim.gap, case, util, util <= 1.0, None, "displacement",
                                  lim.min_opening, opening))
    return out


# The checks in the order of their entries; a new check is one function here.
CHECKS = (strength_checks, buckling_checks, limit_checks)


def check_solution(solution: Solution, units: OutputUnits | None = None) -> CheckReport:
    """Check every case of a solution and find the governing entry.

    Parameters
    ----------
    solution : Solution
    units : OutputUnits, optional
        Units of the values quoted in notes (default: the model's).

    Returns
    -------
    CheckReport
    """
    settings = solution.model.checks
    cases = tuple(CaseChecks(c.name, check_case(c, settings, units)) for c in solution.cases)
    governing = None
    for c in cases:
        for e in c.entries:
            if e.utilization is not None and (governing is None
                                              or e.utilization > governing.utilization):
                governing = e
    unchecked = tuple(seg.name for seg in solution.model.segments
                      if seg.material.yield_strength is None)
    return CheckReport(settings, cases, governing, unchecked)
