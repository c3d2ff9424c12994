"""Common slips of a hand calculation, one small function each, in a fixed order.

A *model slip* is a mistake in setting the problem up: a temperature change
left out, a support treated as free, two moduli swapped.  Its function takes
the model and the solved case a claim belongs to and yields the slips that
apply there (:class:`ModelSlip`), each with the function that builds its
slipped model from the model by :func:`dataclasses.replace` when it is tried;
the reviewer solves it with the same engine and compares the claimed value
with what the slipped model gives.

A *reading slip* is a mistake in stating a right number: the opposite sign, a
unit off by a factor of 10^3 or 10^6.  Its function takes the claim and the
computed value and yields the value that slip would have written.

:data:`SLIPS` lists them in the documented order; a new slip is one function
added there.  Identifiers (``no-temperature``, ``free-support:<station>``, ...)
are part of the interface and never change.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from dataclasses import dataclass, field, replace
from functools import partial

from ..model import Case, Gap, Material, Model, Section, Segment, Station, Support
from ..results import CaseResult
from .claims import Claim, measure

__all__ = ["ModelSlip", "ReadingSlip", "SLIPS", "model_slips", "reading_slips"]


@dataclass(frozen=True)
class ModelSlip:
    """A model as a slipped calculation sets it up.

    ``build`` makes the slipped model (built only when the slip is tried, so
    that listing the slips of a large model costs little).  ``read`` gives the
    claimed quantity from the slipped model's solved case where the slip
    removed or replaced what the claim speaks of (a support treated as free
    has no reaction); it returns None to read the quantity as usual.
    """

    slip: str
    text: str
    build: Callable[[], Model] = field(compare=False)
    read: Callable[[Claim, CaseResult], float | None] | None = field(default=None, compare=False)

    @property
    def per_item(self) -> bool:
        """True for a slip of one named item (``no-misfit:<segment>``), not of the whole model."""
        return ":" in self.slip

    def value(self, claim: Claim, result: CaseResult) -> float:
        if self.read is not None:
            found = self.read(claim, result)
            if found is not None:
                return found
        return measure(claim, result)


@dataclass(frozen=True)
class ReadingSlip:
    """A right number stated wrongly: the value the slip would have written."""

    slip: str
    text: str
    value: float


# --- the slipped models --------------------------------------------------------------
def _heated(result: CaseResult) -> list[int]:
    return [i for i, t in enumerate(result.thermal_strain) if t != 0]


def _cases(model: Model, change) -> tuple[Case, ...]:
    return tuple(change(c) for c in model.cases)


def _segments(model: Model, change) -> tuple[Segment, ...]:
    return tuple(change(s) for s in model.segments)


def _named(name, change):
    """``change`` applied to the segment called ``name`` only."""
    return lambda s: change(s) if s.name == name else s


def _without_temperature(model: Model) -> Model:
    return replace(model, temperature_change=None,
                   segments=_segments(model, lambda s: replace(s, temperature_change=None)),
                   cases=_cases(model, lambda c: replace(c, temperature_change=())))


def _without_segment_temperature(model: Model, name: str) -> Model:
    def case(c):
        if not c.temperature_change:
            return c
        table = tuple((n, t) for n, t in c.temperature_change if n != name)
        return replace(c, temperature_change=table + ((name, 0.0),))

    return replace(model, cases=_cases(model, case), segments=_segments(
        model, _named(name, lambda s: replace(s, temperature_change=0.0))))


def _flipped_temperature(model: Model) -> Model:
    def flip(t):
        return None if t is None else -t

    return replace(model, temperature_change=flip(model.temperature_change),
                   segments=_segments(model, lambda s: replace(
                       s, temperature_change=flip(s.temperature_change))),
                   cases=_cases(model, lambda c: replace(
                       c, temperature_change=tuple((n, -t) for n, t in c.temperature_change))))


def _with_misfit(model: Model, name: str, value: float) -> Model:
    return replace(model, segments=_segments(model, _named(name, lambda s: replace(s, misfit=value))))


def _without_support(model: Model, at: str) -> Model:
    return replace(model, supports=tuple(s for s in model.supports if s.at != at),
                   cases=_cases(model, lambda c: replace(
                       c, settlements=tuple(p for p in c.settlements if p[0] != at))))


def _spring_fixed(model: Model, j: int) -> Model:
    return replace(model, supports=tuple(Support(s.at) if k == j else s
                                         for k, s in enumerate(model.supports)))


def _without_settlement(model: Model, j: int) -> Model:
    at = model.supports[j].at
    return replace(model,
                   supports=tuple(replace(s, displacement=0.0) if k == j else s
                                  for k, s in enumerate(model.supports)),
                   cases=_cases(model, lambda c: replace(c, settlements=tuple(
                       (st, 0.0 if st == at else d) for st, d in c.settlements))))


def _without_gap(model: Model, name: str) -> Model:
    return replace(model, gaps=tuple(g for g in model.gaps if g.name != name),
                   limits=tuple(lim for lim in model.limits if lim.gap != name))


# a rigid link stands in for a gap treated as closed: this many times the stiffness of
# the stiffest segment, so that its own stretch is far below any tolerance of a claim
_RIGID = 1e8


def _closed_gap(model: Model, gap: Gap) -> Model:
    """The model with ``gap`` held closed both ways.

    A gap against ground becomes a settlement support (the model's last) that
    holds its station where the gap closes; a gap between two stations becomes
    a link :data:`_RIGID` times stiffer than the stiffest segment, made to the
    clearance, so that it holds the two stations where the gap closes (to a
    relative error of about 1e-8).  Parts that butt at one position are linked
    through a station placed beside them.
    """
    base = _without_gap(model, gap.name)
    s1, s2 = gap.sign
    if len(gap.stations) == 1:
        support = Support(gap.stations[0], "settlement", displacement=s1 * gap.clearance)
        return replace(base, supports=base.supports + (support,))
    a, b = gap.stations
    x = {st.name: st.x for st in model.stations}
    span = (max(x.values()) - min(x.values())) or 1.0
    k_max = max(seg.material.elastic_modulus * min(sec.area for sec in seg.sections)
                / abs(x[seg.end] - x[seg.start]) for seg in model.segments)
    stations, ends = base.stations, [(a, b)]
    if x[a] == x[b]:
        beside = f"{gap.name}~link"
        x[beside] = x[a] + 1e-3 * span
        stations = stations + (Station(beside, x[beside]),)
        ends = [(a, beside), (beside, b)]
    links = []
    for n, (p, q) in enumerate(ends):
        e = 1.0 if x[q] > x[p] else -1.0
        # s1*u_a + s2*u_b = clearance, and u_q - u_p = e*(change of the link's length)
        links.append(Segment(f"{gap.name}~link{n + 1}", p, q,
                             Material(f"{gap.name}~rigid", _RIGID * k_max * abs(x[q] - x[p])),
                             Section(f"{gap.name}~rigid", "area", (("area", 1.0),)),
                             misfit=e * s2 * gap.clearance if n == 0 else 0.0))
    return replace(base, stations=stations, segments=base.segments + tuple(links))


def _gap_reader(gap: Gap, closed: bool):
    """How a claim on ``gap`` is read once the gap is held closed or removed (open)."""
    def read(claim, slipped):
        if claim.target != "gap" or claim.at != gap.name:
            return None
        if closed:
            if claim.what == "gap_opening":
                return 0.0
            if len(gap.stations) == 2:
                return float(slipped.force(f"{gap.name}~link1")[0])
            # the support standing in for the gap is the model's last one (a spring may
            # stand beside it at the same station); the stop's side gives the sign
            return (1.0 if gap.side == "+x" else -1.0) * float(slipped.reactions[-1])
        if claim.what == "gap_force":
            return 0.0
        s1, s2 = gap.sign
        closure = s1 * slipped.displacement(gap.stations[0])
        if len(gap.stations) == 2:
            closure += s2 * slipped.displacement(gap.stations[1])
        return gap.clearance - closure

    return read


def _without_distributed_load(model: Model, name: str) -> Model:
    return replace(model, segments=_segments(
        model, _named(name, lambda s: replace(s, distributed_load=0.0))))


def _flipped_load(model: Model, at: str) -> Model:
    def flip(loads):
        return tuple(replace(ld, force=-ld.force) if ld.at == at else ld for ld in loads)

    return replace(model, loads=flip(model.loads),
                   cases=_cases(model, lambda c: replace(c, loads=flip(c.loads))))


def _swapped_moduli(model: Model, a: Material, b: Material) -> Model:
    swap = {a.name: replace(a, elastic_modulus=b.elastic_modulus),
            b.name: replace(b, elastic_modulus=a.elastic_modulus)}
    return replace(model, segments=_segments(model, lambda s: replace(
        s, material=swap.get(s.material.name, s.material))))


def _scaled_section(model: Model, name: str, factor: float) -> Model:
    def scale(sec):
        if sec is None or sec.name != name:
            return sec
        return replace(sec, dimensions=tuple((k, v * factor) for k, v in sec.dimensions))

    return replace(model, segments=_segments(model, lambda s: replace(
        s, section=scale(s.section), end_section=scale(s.end_section))))


# --- model slips, in the documented order --------------------------------------------
def no_temperature(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """The temperature change left out: of the whole model, or of one segment."""
    heated = _heated(result)
    if not heated:
        return
    yield ModelSlip("no-temperature", "the temperature change is left out",
                    partial(_without_temperature, model))
    if len(heated) < 2:
        return  # one heated segment: the same as the whole model's
    for i in heated:
        name = model.segments[i].name
        yield ModelSlip(f"no-temperature:{name}",
                        f"the temperature change of segment '{name}' is left out",
                        partial(_without_segment_temperature, model, name))


def temperature_sign(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """Every temperature change taken with the opposite sign."""
    if _heated(result):
        yield ModelSlip("temperature-sign",
                        "the temperature change is taken with the opposite sign (heating as "
                        "cooling)", partial(_flipped_temperature, model))


def misfit(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A segment's misfit (or preload) left out, or taken with the opposite sign."""
    for seg in model.segments:
        if seg.misfit == 0:
            continue
        name = seg.name
        yield ModelSlip(f"no-misfit:{name}",
                        f"the misfit (or preload) of segment '{name}' is left out",
                        partial(_with_misfit, model, name, 0.0))
        yield ModelSlip(f"misfit-sign:{name}",
                        f"the misfit (or preload) of segment '{name}' is taken with the opposite "
                        "sign (too short as too long)", partial(_with_misfit, model, name, -seg.misfit))


def _no_reaction_at(at: str):
    def read(claim, slipped):
        return 0.0 if claim.what == "reaction" and claim.at == at else None  # a free end

    return read


def free_support(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A support treated as free: the station is left unrestrained."""
    for at in dict.fromkeys(s.at for s in model.supports):
        yield ModelSlip(f"free-support:{at}", f"the support at '{at}' is treated as free",
                        partial(_without_support, model, at), _no_reaction_at(at))


def rigid_spring(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A spring support treated as rigid (fixed)."""
    prescribed = {s.at for s in model.supports if s.kind != "spring"}
    for j, sup in enumerate(model.supports):
        if sup.kind != "spring" or sup.at in prescribed:
            continue  # a spring beside a fixed support carries nothing either way
        yield ModelSlip(f"rigid-spring:{sup.at}", f"the spring at '{sup.at}' is treated as rigid",
                        partial(_spring_fixed, model, j))


def no_settlement(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A settlement support's prescribed displacement left out."""
    for j, sup in enumerate(model.supports):
        if sup.kind != "settlement":
            continue
        moved = [d for c in model.cases for st, d in c.settlements if st == sup.at]
        if sup.displacement == 0 and not any(moved):
            continue
        yield ModelSlip(f"no-settlement:{sup.at}",
                        f"the settlement of the support at '{sup.at}' is left out",
                        partial(_without_settlement, model, j))


def gap_state(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A gap treated as closed where it stays open, or as open where it closes."""
    prescribed = {s.at for s in model.supports if s.kind != "spring"}
    for j, gap in enumerate(model.gaps):
        if result.gap_closed[j]:
            continue
        if len(gap.stations) == 1 and gap.stations[0] in prescribed:
            continue  # a support holds the station already: the gap cannot move
        yield ModelSlip(f"gap-closed:{gap.name}",
                        f"gap '{gap.name}' is treated as closed, but it stays open",
                        partial(_closed_gap, model, gap), _gap_reader(gap, closed=True))
    for j, gap in enumerate(model.gaps):
        if result.gap_closed[j]:
            yield ModelSlip(f"gap-open:{gap.name}",
                            f"gap '{gap.name}' is treated as open, but it closes",
                            partial(_without_gap, model, gap.name), _gap_reader(gap, closed=False))


def no_self_weight(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """Self-weight left out."""
    if model.gravity != 0 and any(s.material.density for s in model.segments):
        yield ModelSlip("no-self-weight", "the self-weight is left out",
                        partial(replace, model, gravity=0.0))


def no_distributed_load(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A segment's distributed load left out."""
    for seg in model.segments:
        if seg.distributed_load != 0:
            yield ModelSlip(f"no-distributed-load:{seg.name}",
                            f"the distributed load on segment '{seg.name}' is left out",
                            partial(_without_distributed_load, model, seg.name))


def load_sign(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A point load taken with the opposite sign."""
    for i, st in enumerate(model.stations):
        if result.applied[i] != 0:
            yield ModelSlip(f"load-sign:{st.name}",
                            f"the point load at '{st.name}' is taken with the opposite sign",
                            partial(_flipped_load, model, st.name))


def moduli_swapped(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """The elastic moduli of two materials swapped."""
    used = list({s.material.name: s.material for s in model.segments}.values())
    for i, a in enumerate(used):
        for b in used[i + 1:]:
            if a.elastic_modulus != b.elastic_modulus:
                yield ModelSlip(f"moduli-swapped:{a.name}:{b.name}",
                                f"the elastic moduli of '{a.name}' and '{b.name}' are swapped",
                                partial(_swapped_moduli, model, a, b))


# the shapes whose every dimension is a diameter
_DIAMETER_SHAPES = ("round", "tube")


def diameter_radius(model: Model, result: CaseResult) -> Iterator[ModelSlip]:
    """A diameter used as a radius (area 4 times too large), or a radius as a diameter."""
    sections = {}
    for seg in model.segments:
        for sec in seg.sections:
            if sec.shape in _DIAMETER_SHAPES:
                sections.setdefault(sec.name, sec)
    for name in sections:
        yield ModelSlip(f"diameter-as-radius:{name}",
                        f"a diameter of section '{name}' is used as a radius (its area taken "
                        "4 times too large)", partial(_scaled_section, model, name, 2.0))
    for name in sections:
        yield ModelSlip(f"radius-as-diameter:{name}",
                        f"a radius of section '{name}' is used as a diameter (its area taken "
                        "4 times too small)", partial(_scaled_section, model, name, 0.5))


# --- reading slips -------------------------------------------------------------
def opposite_sign(claim: Claim, computed: float) -> Iterator[ReadingSlip]:
    """The right number with the opposite sign."""
    if computed == 0:
        return
    if claim.what == "reaction":
        yield ReadingSlip("reaction-sign", "the reaction has the opposite sign: the force of the "
                          "bar on the support, not of the support on the bar", -computed)
    else:
        yield ReadingSlip("sign", "the value has the opposite sign (tension read as compression, "
                          "or a direction turned over)", -computed)


_UNIT_SLIPS = (
    (1e3, "units-1e3", "the value is 1000 times the computed one: a unit slip (a number in N "
                       "written as kN, or in mm as m)"),
    (1e-3, "units-1e-3", "the value is 1/1000 of the computed one: a unit slip (a number in kN "
                         "written as N, or in m as mm)"),
    (1e6, "units-1e6", "the value is 10^6 times the computed one: a unit slip (a number in Pa "
                       "written as MPa, or an area in m^2 used as if in mm^2)"),
    (1e-6, "units-1e-6", "the value is 10^-6 of the computed one: a unit slip (a number in MPa "
                         "written as Pa, or an area in mm^2 used as if in m^2)"),
)


def unit_factor(claim: Claim, computed: float) -> Iterator[ReadingSlip]:
    """The right number off by a factor of 10^3 or 10^6 (claimed = factor * computed)."""
    if computed == 0:
        return
    for factor, slip, text in _UNIT_SLIPS:
        yield ReadingSlip(slip, text, factor * computed)


# The documented order: model slips, then reading slips.
SLIPS = (no_temperature, temperature_sign, misfit, free_support, rigid_spring, no_settlement,
         gap_state, no_self_weight, no_distributed_load, load_sign, moduli_swapped,
         diameter_radius, opposite_sign, unit_factor)
model_slips = SLIPS[:12]
reading_slips = SLIPS[12:]
