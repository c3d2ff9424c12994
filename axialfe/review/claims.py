"""Stated values of a hand calculation and the arithmetic of their verdicts.

A :class:`Claim` is one value that a calculation under review states: a
reaction, a displacement, a segment's axial force, stress or elongation, or a
gap's force or opening, with the tolerance it is held to.  This module checks
claims for themselves and against a model, reads the computed value a claim
speaks of from a solved case, and decides ``agrees`` or ``differs``:

    difference = claimed - computed
    relative_difference = difference / |computed|    (None when computed is 0)
    agrees  <=>  |difference| <= allowed

with ``allowed`` the absolute tolerance, or the relative one times |computed|;
a relative tolerance of a zero value is taken of the largest magnitude of that
quantity in the case (the *floor* of the quantity), and the verdict says so.
The boundary is included.

Everything is in SI floats; the file reader (:mod:`axialfe.io.claims`) applies
units.  This module imports the model and the results only.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from ..errors import ModelError, suggest
from ..formatting import number
from ..model import Model
from ..results import CaseResult

__all__ = ["WHATS", "TARGET", "KIND", "ENDS", "DEFAULT_TOLERANCE", "Tolerance", "Claim",
           "Verdict", "check_claim", "measure", "quantity_scale", "judge", "within", "allowed",
           "near_zero", "case_names"]

# each kind of stated value: what it is stated at, and the kind of its unit
TARGET = {"reaction": "station", "displacement": "station", "axial_force": "segment",
          "stress": "segment", "elongation": "segment", "gap_force": "gap",
          "gap_opening": "gap"}
WHATS = tuple(TARGET)
KIND = {"reaction": "force", "displacement": "length", "axial_force": "force",
        "stress": "stress", "elongation": "length", "gap_force": "force",
        "gap_opening": "length"}
# the output unit (a key of OutputUnits) each kind of value is shown in
DISPLAY = {"reaction": "force", "displacement": "displacement", "axial_force": "force",
           "stress": "stress", "elongation": "displacement", "gap_force": "force",
           "gap_opening": "displacement"}
ENDS = ("from", "to", "max")
# values that have an end: the others (elongation) are one number per segment
WITH_ENDS = ("axial_force", "stress")
# comparisons are made to a few units in the last place of the numbers compared,
# so that a claim exactly on the boundary of its tolerance agrees as documented
_ROUNDING = 1e-12
# a value this small against the largest of its quantity in the case is zero to rounding
_NEAR_ZERO = 1e-9


@dataclass(frozen=True)
class Tolerance:
    """How far a stated value may lie from the computed one.

    Exactly one of ``relative`` (a fraction: 0.005 for "0.5 %") and
    ``absolute`` (SI units of the claimed value) is given.
    """

    relative: float | None = None
    absolute: float | None = None

    def __post_init__(self):
        if (self.relative is None) == (self.absolute is None):
            raise ModelError("a tolerance is either relative ('1 %') or absolute ('0.01 mm')",
                             place="tolerance")
        value = self.relative if self.relative is not None else self.absolute
        if isinstance(value, bool) or not isinstance(value, (int, float)) \
                or not (math.isfinite(value) and value >= 0):
            raise ModelError(f"tolerance must not be negative: got {value!r}", place="tolerance")

    def allowed(self, value: float, floor: float = 0.0) -> float:
        """The largest |difference| allowed around ``value``, not below ``relative * floor``."""
        if self.absolute is not None:
            return self.absolute
        return self.relative * max(abs(value), floor)

    def text(self, unit_factor: float = 1.0, unit: str = "") -> str:
        """``'0.5 %'``, or the absolute tolerance in ``unit`` (SI value of one unit)."""
        if self.relative is not None:
            return f"{number(self.relative * 100)} %"
        return f"{number(self.absolute / unit_factor)} {unit}".rstrip()


DEFAULT_TOLERANCE = Tolerance(relative=0.005)


@dataclass(frozen=True)
class Claim:
    """One value stated by a calculation under review.

    Parameters
    ----------
    what : str
        One of :data:`WHATS`.
    at : str
        The station (reaction, displacement), segment (axial_force, stress,
        elongation) or gap (gap_force, gap_opening) the value belongs to.
    value : float
        The stated value in SI units, with the signs of the results (tension
        positive; a reaction is the force of the support on the bar).
    end : str, optional
        For axial_force and stress: ``'from'``, ``'to'`` or ``'max'`` (the value
        of largest magnitude along the segment, the default).
    case : str, optional
        The case or combination; None for a model with only one.
    tolerance : Tolerance
    source : str, optional
        Where the value comes from (a page of the calculation), echoed in the output.
    place : str
        Where the claim was stated, for messages (``"claims[2]"``).
    """

    what: str
    at: str
    value: float
    end: str | None = None
    case: str | None = None
    tolerance: Tolerance = DEFAULT_TOLERANCE
    source: str | None = None
    place: str = "claims"

    def __post_init__(self):
        if self.what not in TARGET:
            raise ModelError(f"unknown value '{self.what}'", place=self.place,
                             hint=suggest(self.what, WHATS), options=WHATS)
        if not isinstance(self.at, str) or not self.at:
            raise ModelError("'at' needs a name in quotes", place=self.place)
        if isinstance(self.value, bool) or not isinstance(self.value, (int, float)) \
                or not math.isfinite(self.value):
            raise ModelError(f"value must be a finite number: got {self.value!r}", place=self.place)
        if self.end is not None:
            if self.end not in ENDS:
                raise ModelError(f"unknown end '{self.end}'", place=self.place,
                                 hint=suggest(self.end, ENDS), options=ENDS)
            if self.what not in WITH_ENDS:
                raise ModelError(f"'end' belongs to axial_force and stress, not to {self.what}",
                                 place=self.place)
        elif self.what in WITH_ENDS:
            object.__setattr__(self, "end", "max")
        if not isinstance(self.tolerance, Tolerance):
            raise ModelError("tolerance must be a Tolerance", place=self.place)

    @property
    def target(self) -> str:
        """``'station'``, ``'segment'`` or ``'gap'``."""
        return TARGET[self.what]


def case_names(model: Model) -> list[str]:
    return [c.name for c in (*model.all_cases, *model.combinations)]


def check_claim(model: Model, claim: Claim) -> Claim:
    """Check that ``claim`` speaks of something in ``model``; return it with its case named
    (a new claim when it named none and the model has one case).

    Raises
    ------
    ModelError
        For an unknown name, a name of the wrong kind for ``what`` (a stress at a
        station), a reaction where no support stands, or a missing or unknown case.
    """
    place = claim.place
    names = {"station": [s.name for s in model.stations],
             "segment": [s.name for s in model.segments],
             "gap": [g.name for g in model.gaps]}
    target = claim.target
    if claim.at not in names[target]:
        other = next((k for k in ("station", "segment", "gap") if claim.at in names[k]), None)
        if other is not None:
            raise ModelError(f"{claim.what} is stated at a {target}: '{claim.at}' is a {other}",
                             place=place, hint=suggest(claim.at, names[target]),
                             options=names[target] or None)
        raise ModelError(f"unknown {target} '{claim.at}'", place=place,
                         hint=suggest(claim.at, names[target]), options=names[target] or None)
    if claim.what == "reaction":
        held = list(dict.fromkeys(s.at for s in model.supports))
        if claim.at not in held:
            raise ModelError(f"station '{claim.at}' has no support, so it has no reaction",
                             place=place, hint=suggest(claim.at, held), options=held or None)
    cases = case_names(model)
    if claim.case is None:
        if len(cases) != 1:
            raise ModelError("the model has several cases: give 'case'", place=place,
                             options=cases)
        return replace(claim, case=cases[0])
    if claim.case not in cases:
        raise ModelError(f"unknown case '{claim.case}'", place=place,
                         hint=suggest(claim.case, cases), options=cases)
    return claim


# --- end = "max" of a segment: the one place to switch to the field inside a segment ------
def _along(result: CaseResult, what: str, i: int, end: str) -> float:
    """One value of segment ``i``: at its ``from`` or ``to`` end, or the one of largest
    magnitude along it, inside included (a taper's stress may peak between the ends)."""
    if end in ("from", "to"):
        arr = result.axial_force if what == "axial_force" else result.stress
        return float(arr[i, 0 if end == "from" else 1])
    fields = result.fields.take(slice(i, i + 1))
    peak, _ = fields.force_peak() if what == "axial_force" else fields.stress_peak()
    return float(peak[0])


def measure(claim: Claim, result: CaseResult) -> float:
    """The value ``claim`` speaks of in a solved case (SI)."""
    m = result.model
    if claim.what == "reaction":
        return result.reaction(claim.at)
    if claim.what == "displacement":
        return result.displacement(claim.at)
    if claim.what in ("axial_force", "stress"):
        return _along(result, claim.what, m.segment_index(claim.at), claim.end)
    if claim.what == "elongation":
        return float(result.elongation[m.segment_index(claim.at)])
    gap = result.gap(claim.at)
    return gap["force"] if claim.what == "gap_force" else gap["opening"]


def quantity_scale(what: str, result: CaseResult) -> float:
    """The largest magnitude of quantity ``what`` in a solved case: the floor of a
    relative tolerance (0 when the case has none of it)."""
    arrays = {"reaction": result.reactions, "displacement": result.u,
              "axial_force": result.axial_force, "stress": result.stress,
              "elongation": result.elongation, "gap_force": result.gap_force,
              "gap_opening": result.gap_opening}
    return float(np.abs(arrays[what]).max(initial=0.0))


def near_zero(value: float, floor: float) -> bool:
    """True for a value that is zero to rounding against the quantity's floor."""
    return abs(value) <= _NEAR_ZERO * floor


def allowed(value: float, tolerance: Tolerance, floor: float) -> float:
    """The largest |difference| from ``value`` that ``tolerance`` allows.

    A relative tolerance of a value that is zero (to rounding) is taken of the
    floor of the quantity, as a relative tolerance of nothing allows nothing.
    """
    if tolerance.relative is not None and near_zero(value, floor):
        return tolerance.relative * floor
    return tolerance.allowed(value, 0.0)


def within(claimed: float, value: float, tolerance: Tolerance, floor: float) -> bool:
    """True when ``claimed`` lies within ``tolerance`` of ``value``, boundary included."""
    slack = _ROUNDING * max(abs(claimed), abs(value))
    return abs(claimed - value) <= allowed(value, tolerance, floor) + slack


@dataclass(frozen=True)
class Verdict:
    """The comparison of one claim with its computed value (SI).

    ``allowed`` is the largest |difference| that agrees; ``floor_used`` is True
    when a relative tolerance of a zero value was taken of the quantity's floor.
    """

    claim: Claim
    computed: float
    difference: float
    relative_difference: float | None
    allowed: float
    floor: float
    floor_used: bool
    agrees: bool

    @property
    def verdict(self) -> str:
        return "agrees" if self.agrees else "differs"


def judge(claim: Claim, result: CaseResult) -> Verdict:
    """Compare ``claim`` with the solved case ``result`` (its case)."""
    computed = measure(claim, result)
    floor = quantity_scale(claim.what, result)
    difference = claim.value - computed
    if abs(difference) <= 1e-12 * max(abs(claim.value), abs(computed)):
        difference = 0.0        # rounding of the computation, not a difference of the claim
    relative = difference / abs(computed) if computed != 0 else None
    floor_used = claim.tolerance.relative is not None and near_zero(computed, floor)
    agrees = within(claim.value, computed, claim.tolerance, floor)
    return Verdict(claim, computed, difference, relative, allowed(computed, claim.tolerance, floor),
                   floor, floor_used, agrees)
