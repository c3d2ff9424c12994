"""The review of a hand calculation: each stated value against the solved model.

:func:`verify` solves the model (or takes its solution), gives every claim its
verdict (:func:`axialfe.review.claims.judge`) and, for each claim that
differs, tries the common slips (:mod:`axialfe.review.slips`) in their order:
a slip is reported when the value it gives reproduces the claimed value
within the claim's tolerance taken of that value (a relative tolerance of a
value that is zero to rounding is taken of the quantity's floor in the case).
Each slipped model is solved once with the same engine, however many claims
try it; a slip that makes the model unsolvable (a mechanism, a state with no
equilibrium) is skipped.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..engine.system import solve
from ..errors import AxialfeError
from ..formatting import number
from ..model import Model
from ..results import Solution
from ..units import OutputUnits
from .claims import DISPLAY, Claim, Verdict, check_claim, judge, within
from .slips import model_slips, reading_slips

__all__ = ["SlipFound", "ClaimReview", "Review", "verify", "find_slips"]


@dataclass(frozen=True)
class SlipFound:
    """A slip that reproduces a claimed value: its identifier, words and value (SI)."""

    slip: str
    text: str
    value: float


@dataclass(frozen=True)
class ClaimReview:
    """One claim's verdict, the slips that explain it when it differs, and the number of
    model slips a large model's review left untried."""

    verdict: Verdict
    slips: tuple[SlipFound, ...] = ()
    untried: int = 0

    @property
    def claim(self) -> Claim:
        return self.verdict.claim

    @property
    def agrees(self) -> bool:
        return self.verdict.agrees

    def notes(self, units: OutputUnits) -> list[str]:
        """What the verdict needs said beside its numbers."""
        claim, v = self.claim, self.verdict
        out = []
        if v.floor_used:
            key = DISPLAY[claim.what]
            out.append(f"the {claim.tolerance.text()} tolerance of a zero value is taken of the "
                       f"largest {claim.what.replace('_', ' ')} in the case, "
                       f"{number(v.floor / units.factor(key))} {getattr(units, key)}")
        if not v.agrees and not self.slips:
            out.append("no common slip reproduces the claimed value"
                       + (" among those tried" if self.untried else ""))
        if self.untried:
            out.append(f"{self.untried} slips of single segments or stations were not tried: "
                       "a review of a model this large solves a bounded number of slipped models")
        return out

    def to_dict(self, units: OutputUnits) -> dict:
        claim, v = self.claim, self.verdict
        key = DISPLAY[claim.what]
        f = units.factor(key)
        unit = getattr(units, key)
        notes = self.notes(units)
        return {"what": claim.what, "at": claim.at, "end": claim.end, "case": claim.case,
                "claimed": claim.value / f, "computed": v.computed / f,
                "difference": v.difference / f, "relative_difference": v.relative_difference,
                "tolerance": claim.tolerance.text(f, unit), "verdict": v.verdict,
                "source": claim.source,
                "slips": [{"slip": s.slip, "text": s.text, "value": s.value / f}
                          for s in self.slips],
                "note": "; ".join(notes) if notes else None}


@dataclass(frozen=True)
class Review:
    """The verdicts of every claim of a model, in the order they were stated."""

    model: Model
    claims: tuple[ClaimReview, ...]

    @property
    def agree(self) -> int:
        return sum(1 for c in self.claims if c.agrees)

    @property
    def differ(self) -> int:
        return len(self.claims) - self.agree

    def to_dict(self, units: OutputUnits | None = None) -> dict:
        units = units or self.model.units
        return {"title": self.model.title, "units": units.as_dict(),
                "claims": [c.to_dict(units) for c in self.claims],
                "agree": self.agree, "differ": self.differ}


class _Solver:
    """Solves slipped models for one review: each once, and no more of them than a budget.

    A hand calculation's model is small and every slip is tried.  A large model
    has a slip per heated or misfit segment and per loaded station, each a full
    solve: the budget bounds the work to about two million segment-solves (a few
    seconds), and the claims whose slips were not all tried say so.
    """

    def __init__(self, model: Model):
        size = len(model.segments) + len(model.stations)
        self.budget = max(20, min(1000, 2_000_000 // max(size, 1)))
        self.solved = {}

    def solution(self, slip):
        """The slipped model's solution, None when it has none, _UNTRIED past the budget."""
        if slip.slip in self.solved:
            return self.solved[slip.slip]
        if len(self.solved) >= self.budget:
            return _UNTRIED
        try:
            solution = solve(slip.build())
        except (AxialfeError, FloatingPointError):
            solution = None  # the slip leaves no equilibrium: it explains nothing
        self.solved[slip.slip] = solution
        return solution


_UNTRIED = object()


def _candidates(model, result):
    """Every model slip that applies, in the documented order."""
    out = []
    for slip_fn in model_slips:
        try:
            out.extend(slip_fn(model, result))
        except AxialfeError:  # a slip function that cannot describe its slip explains nothing
            continue
    return out


def find_slips(model: Model, verdict: Verdict, solution: Solution,
               solver: _Solver | None = None) -> tuple[tuple[SlipFound, ...], int]:
    """The slips that reproduce a claimed value, in the documented order, and how many
    model slips were left untried by the review's budget.

    Slips of the whole model are tried before slips of one item (a segment, a
    station), so that a budget spent on a large model's items never leaves them
    out; the slips found are listed in the documented order all the same.
    """
    solver = solver or _Solver(model)
    claim = verdict.claim
    candidates = _candidates(model, solution[claim.case])
    order = sorted(range(len(candidates)), key=lambda i: (candidates[i].per_item, i))
    found, untried = {}, 0
    for i in order:
        slip = candidates[i]
        slipped = solver.solution(slip)
        if slipped is _UNTRIED:
            untried += 1
            continue
        if slipped is None:
            continue
        try:
            value = slip.value(claim, slipped[claim.case])
        except AxialfeError:
            continue
        if within(claim.value, value, claim.tolerance, verdict.floor):
            found[i] = SlipFound(slip.slip, slip.text, value)
    out = [found[i] for i in sorted(found)]
    for slip_fn in reading_slips:
        for slip in slip_fn(claim, verdict.computed):
            if within(claim.value, slip.value, claim.tolerance, verdict.floor):
                out.append(SlipFound(slip.slip, slip.text, slip.value))
    return tuple(out), untried


def verify(model: Model, claims, solution: Solution | None = None) -> Review:
    """Review the ``claims`` of a calculation against ``model``.

    Parameters
    ----------
    model : Model
    claims : iterable of Claim
        Each is checked against the model first (names, case).
    solution : Solution, optional
        The model's solution, when already at hand.

    Raises
    ------
    ModelError
        For a claim that speaks of nothing in the model.
    SolveError
        When the model itself cannot be solved.

    Examples
    --------
    A bar between walls, 9 kN toward +x at a third of its length: the near
    wall takes P*b/L = 6 kN toward -x.  A calculation stating +6 kN there
    took the force of the bar on the wall, or turned the load over; both
    slips reproduce it, and both are listed:

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Model
    >>> steel, rod = Material("steel", 200e9), Section("rod", "area", (("area", 1e-4),))
    >>> model = Model([Station("A", 0.0), Station("C", 1.0), Station("B", 3.0)],
    ...               [Segment("AC", "A", "C", steel, rod), Segment("CB", "C", "B", steel, rod)],
    ...               [Support("A"), Support("B")], [Load("C", 9000.0)])
    >>> review = verify(model, [Claim("reaction", "A", 6000.0)])
    >>> item = review.claims[0]
    >>> item.verdict.verdict, [s.slip for s in item.slips]
    ('differs', ['load-sign:C', 'reaction-sign'])
    """
    claims = [check_claim(model, c) for c in claims]
    solution = solution if solution is not None else solve(model)
    solver = _Solver(model)
    out = []
    for claim in claims:
        verdict = judge(claim, solution[claim.case])
        slips, untried = ((), 0) if verdict.agrees else find_slips(model, verdict, solution, solver)
        out.append(ClaimReview(verdict, slips, untried))
    return Review(model, tuple(out))
