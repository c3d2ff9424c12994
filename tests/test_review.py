"""Review of stated values: verdicts, tolerances, and each common slip diagnosed.

For every slip, a textbook problem solved correctly agrees, and the same
problem worked with that slip is diagnosed as that slip.  The closed forms are
those of the books named beside each problem (quoted from memory, as is the
section numbering); the numbers of each problem are our own.
"""

import math

import pytest
from hypothesis import assume, given, strategies as st

from axialfe.engine.system import solve
from axialfe.errors import ModelError
from axialfe.model import Gap, Load, Material, Model, Section, Segment, Station, Support, Case
from axialfe.review import Claim, Tolerance, verify
from axialfe.review.claims import check_claim, judge
from axialfe.review.verify import ClaimReview

from conftest import area, steel

E, A, ALPHA = 200e9, 5e-4, 12e-6
EA = E * A                      # 1e8 N
P = 20e3                        # at C, toward +x
a, b, L = 0.4, 0.6, 1.0         # A--C--B


def bar(*, dT=(0.0, 0.0), misfit=0.0, supports=None, loads=None, gaps=(), extra_stations=(),
        q=0.0, gravity=0.0, density=None):
    """A two-segment steel bar A (x=0) -- C (x=0.4 m) -- B (x=1 m), 500 mm^2."""
    mat = steel(E=E, alpha=ALPHA, density=density)
    sec = area("a500", A)
    stations = (Station("A", 0.0), Station("C", a), Station("B", L)) + tuple(extra_stations)
    segments = (Segment("AC", "A", "C", mat, sec, temperature_change=dT[0], misfit=misfit,
                        distributed_load=q),
                Segment("CB", "C", "B", mat, sec, temperature_change=dT[1], distributed_load=q))
    return Model(stations, segments,
                 supports if supports is not None else (Support("A"), Support("B")),
                 loads if loads is not None else (Load("C", P),), tuple(gaps), gravity=gravity)


def review_of(model, *claims):
    return verify(model, list(claims)).claims


def slips_of(model, claim):
    (item,) = review_of(model, claim)
    assert item.verdict.verdict == "differs", item.verdict
    return [s.slip for s in item.slips]


def agrees(model, claim):
    (item,) = review_of(model, claim)
    return item.verdict.verdict == "agrees" and item.slips == ()


# --- temperature: a bar between walls, heated, with a load --------------------------
# Gere and Goodno, Mechanics of Materials, 8th ed., 2.4 and 2.5 (from memory): a load
# between walls gives R_A = -P*b/L; a heated bar between walls pushes on them with
# E*A*alpha*(dT_1*a + dT_2*b)/L; by superposition
def thermal_reaction(dT1, dT2, p=P):
    return -p * b / L + EA * ALPHA * (dT1 * a + dT2 * b) / L


HEATED = bar(dT=(30.0, 50.0))
R_HEATED = thermal_reaction(30.0, 50.0)        # 38.4 kN


def test_heated_bar_solved_right_agrees():
    assert R_HEATED == pytest.approx(38400.0)
    assert agrees(HEATED, Claim("reaction", "A", R_HEATED))


def test_temperature_left_out():
    assert slips_of(HEATED, Claim("reaction", "A", thermal_reaction(0, 0))) == ["no-temperature"]


def test_temperature_of_one_segment_left_out():
    assert slips_of(HEATED, Claim("reaction", "A", thermal_reaction(30.0, 0))) == [
        "no-temperature:CB"]
    assert slips_of(HEATED, Claim("reaction", "A", thermal_reaction(0, 50.0))) == [
        "no-temperature:AC"]


def test_one_heated_segment_has_no_separate_slip():
    model = bar(dT=(30.0, 0.0))
    assert slips_of(model, Claim("reaction", "A", thermal_reaction(0, 0))) == ["no-temperature"]


def test_temperature_sign_reversed():
    assert slips_of(HEATED, Claim("reaction", "A", thermal_reaction(-30.0, -50.0))) == [
        "temperature-sign"]


def test_reaction_sign_and_plain_sign():
    assert slips_of(HEATED, Claim("reaction", "A", -R_HEATED)) == ["reaction-sign"]
    stress = -R_HEATED / A               # N_AC = -R_A: compression
    assert agrees(HEATED, Claim("stress", "AC", stress))
    assert slips_of(HEATED, Claim("stress", "AC", -stress)) == ["sign"]


@pytest.mark.parametrize("factor, slip", [(1e3, "units-1e3"), (1e-3, "units-1e-3"),
                                          (1e6, "units-1e6"), (1e-6, "units-1e-6")])
def test_unit_slips(factor, slip):
    # claimed = factor * computed, matched within 0.5 % of that value (the displacement of
    # C: no model slip of this bar gives a displacement there of about zero)
    u = solve(HEATED)["base"].displacement("C")
    assert slips_of(HEATED, Claim("displacement", "C", factor * u * 1.004)) == [slip]
    if factor > 1:
        assert slips_of(HEATED, Claim("reaction", "A", factor * R_HEATED * 1.004)) == [slip]


def test_a_stress_with_the_area_in_the_wrong_unit():
    # sigma = N/A with A = 500 mm^2 used as if it were 500 m^2: 10^-6 of the stress (and
    # about zero, as AC carries nothing with the support at A taken as free)
    stress = solve(HEATED)["base"].stress[0, 0]
    (item,) = review_of(HEATED, Claim("stress", "AC", stress * 1e-6))
    assert [(s.slip, s.text) for s in item.slips] == [
        ("free-support:A", "the support at 'A' is treated as free"), (
        "units-1e-6", "the value is 10^-6 of the computed one: a unit slip (a number in MPa "
        "written as Pa, or an area in mm^2 used as if in m^2)")]


def test_a_small_claim_is_about_zero():
    # 1/1000 of the reaction is within 0.5 % of the largest reaction (58.4 kN) of zero:
    # the support at A treated as free (no reaction there) reproduces it too
    assert slips_of(HEATED, Claim("reaction", "A", 1e-3 * R_HEATED)) == [
        "free-support:A", "units-1e-3"]


def test_several_slips_in_the_documented_order():
    # one load, no temperature: turning the load over and the reaction's sign
    # convention give the same number
    model = bar()
    assert slips_of(model, Claim("reaction", "A", P * b / L)) == ["load-sign:C", "reaction-sign"]


# --- misfit: a bar made too long, forced between walls ---------------------------------
# Gere and Goodno, 8th ed., 2.5 (misfits and prestrains; from memory): N = -E*A*delta/L
DELTA = 0.2e-3
MISFIT = bar(misfit=DELTA)


def misfit_reaction(delta):
    return -P * b / L + EA * delta / L


def test_misfit_solved_right_agrees():
    assert agrees(MISFIT, Claim("reaction", "A", misfit_reaction(DELTA)))


def test_misfit_left_out():
    assert slips_of(MISFIT, Claim("reaction", "A", misfit_reaction(0.0))) == ["no-misfit:AC"]


def test_misfit_sign_reversed():
    assert slips_of(MISFIT, Claim("reaction", "A", misfit_reaction(-DELTA))) == ["misfit-sign:AC"]


# --- supports -------------------------------------------------------------------------
def test_support_treated_as_free():
    # without the wall at B the bar is a cantilever: R_A = -P (statics), N_CB = 0
    model = bar()
    assert agrees(model, Claim("reaction", "A", -P * b / L))
    assert slips_of(model, Claim("reaction", "A", -P)) == ["free-support:B"]
    assert slips_of(model, Claim("axial_force", "CB", 0.0)) == ["free-support:B"]


def test_a_slip_that_leaves_a_mechanism_is_skipped():
    # a cantilever: freeing its only support leaves nothing; the slip explains nothing
    model = bar(supports=(Support("A"),))
    (item,) = review_of(model, Claim("reaction", "A", -2 * P))
    assert item.slips == ()
    assert item.notes(model.units) == ["no common slip reproduces the claimed value"]


# Gere and Goodno, 8th ed., 2.2 and 2.4 (from memory): an elastic support in series
# with the part CB; the load splits by the stiffness of each side
K_SPRING = 1e8


def test_spring_treated_as_rigid():
    model = bar(supports=(Support("A"), Support("B", "spring", stiffness=K_SPRING)))
    k1, k2 = EA / a, 1 / (b / EA + 1 / K_SPRING)
    assert agrees(model, Claim("reaction", "A", -P * k1 / (k1 + k2)))      # -16 kN
    assert slips_of(model, Claim("reaction", "A", -P * b / L)) == ["rigid-spring:B"]


def test_a_spring_beside_a_fixed_support_is_no_slip():
    # the spring at B carries nothing: treating it as rigid changes nothing, and the
    # model with two fixed supports at B is never built
    model = bar(supports=(Support("A"), Support("B"), Support("B", "spring", stiffness=K_SPRING)))
    assert slips_of(model, Claim("reaction", "A", -P)) == ["free-support:B"]


def test_settlement_left_out():
    # the wall at B moved 0.1 mm toward +x: the bar is stretched by E*A*s/L more
    s = 0.1e-3
    model = bar(supports=(Support("A"), Support("B", "settlement", displacement=s)))
    assert agrees(model, Claim("reaction", "A", -P * b / L - EA * s / L))
    assert slips_of(model, Claim("reaction", "A", -P * b / L)) == ["no-settlement:B"]


def test_settlement_of_a_case_left_out():
    s = 0.1e-3
    model = Model(bar().stations, bar().segments,
                  (Support("A"), Support("B", "settlement")), (),
                  cases=(Case("moved", (Load("C", P),), settlements=(("B", s),)),))
    assert agrees(model, Claim("reaction", "A", -P * b / L - EA * s / L))
    assert slips_of(model, Claim("reaction", "A", -P * b / L)) == ["no-settlement:B"]


def test_claims_on_a_combination():
    # the heated bar's load and temperature as two cases and their combination
    from axialfe.model import Combination

    base = bar()
    model = Model(base.stations, base.segments, base.supports, (),
                  cases=(Case("load", (Load("C", P),)), Case("heat", temperature_change=(("all", 30.0),))),
                  combinations=(Combination("both", (("load", 1.0), ("heat", 1.0))),))
    assert agrees(model, Claim("reaction", "A", thermal_reaction(30.0, 30.0), case="both"))
    assert slips_of(model, Claim("reaction", "A", thermal_reaction(0, 0), case="both")) == [
        "no-temperature"]
    assert slips_of(model, Claim("reaction", "A", thermal_reaction(30.0, 30.0, -P),
                                 case="both")) == ["load-sign:C"]
    with pytest.raises(ModelError) as info:
        verify(model, [Claim("reaction", "A", 1.0)])
    assert str(info.value) == ("claims: the model has several cases: give 'case'; expected one "
                               "of: 'load', 'heat', 'both'")


# --- gaps -----------------------------------------------------------------------------
# Gere and Goodno, 8th ed., 2.4 (a bar with a gap to a wall; from memory): the end
# closes a clearance s once P*a/(E*A) > s, and then N_AC = P*b/L + E*A*s/L
def gap_bar(clearance, two_station=False):
    if two_station:  # a wall W that butts against the bar's end B, at the same position or apart
        x_wall = L if two_station == "butting" else L + 0.05
        return bar(supports=(Support("A"), Support("W")), extra_stations=(Station("W", x_wall),),
                   gaps=(Gap("stop", ("B", "W"), clearance),))
    return bar(supports=(Support("A"),), gaps=(Gap("stop", ("B",), clearance, side="+x"),))


def closed_reaction(s):
    return -(P * b / L + EA * s / L)


def test_gap_treated_as_open_but_it_closes():
    model = gap_bar(0.05e-3)                 # P*a/(E*A) = 0.08 mm > 0.05 mm
    assert agrees(model, Claim("reaction", "A", closed_reaction(0.05e-3)))       # -17 kN
    assert agrees(model, Claim("gap_force", "stop", -closed_reaction(0.05e-3) - P))  # -3 kN
    assert slips_of(model, Claim("reaction", "A", -P)) == ["gap-open:stop"]
    # no force in the stop: also what the load turned over gives (the end moves away)
    assert slips_of(model, Claim("gap_force", "stop", 0.0)) == ["gap-open:stop", "load-sign:C"]


def test_gap_treated_as_open_gives_its_opening():
    # treated as open, the end moves P*a/(E*A) = 0.08 mm: "opening" 0.05 - 0.08 mm
    model = gap_bar(0.05e-3)
    assert slips_of(model, Claim("gap_opening", "stop", -0.03e-3)) == ["gap-open:stop"]


@pytest.mark.parametrize("two_station", [False, "butting", "apart"])
def test_gap_treated_as_closed_but_it_stays_open(two_station):
    model = gap_bar(0.1e-3, two_station)     # 0.08 mm < 0.1 mm: stays open
    assert agrees(model, Claim("reaction", "A", -P))
    assert agrees(model, Claim("gap_opening", "stop", 0.02e-3))
    assert slips_of(model, Claim("reaction", "A", closed_reaction(0.1e-3))) == ["gap-closed:stop"]
    # held closed, the "contact" would have to pull: +2 kN
    claim = Claim("gap_force", "stop", -closed_reaction(0.1e-3) - P)
    (item,) = review_of(model, claim)
    assert [s.slip for s in item.slips] == ["gap-closed:stop"]
    assert item.slips[0].value == pytest.approx(2000.0, rel=1e-6)


@pytest.mark.parametrize("form", ["stop", "between"])
def test_slack_link_treated_as_taut_but_it_stays_slack(form):
    # the mirror of the contact: P pulls the bar away from a tie that takes up 0.1 mm
    # of slack; P*a/(E*A) = 0.08 mm leaves it slack, and held taut it would push
    tie = (Gap("tie", ("B",), 0.1e-3, kind="slack", side="+x") if form == "stop" else
           Gap("tie", ("B", "W"), 0.1e-3, kind="slack"))
    model = bar(supports=(Support("A"),) + ((Support("W"),) if form == "between" else ()),
                extra_stations=(Station("W", L + 0.05),) if form == "between" else (),
                loads=(Load("C", -P),), gaps=(tie,))
    assert agrees(model, Claim("reaction", "A", P))
    assert slips_of(model, Claim("reaction", "A", -closed_reaction(0.1e-3))) == ["gap-closed:tie"]
    assert slips_of(model, Claim("gap_force", "tie", -2000.0)) == ["gap-closed:tie"]


# --- loads ----------------------------------------------------------------------------
def test_self_weight_left_out():
    # Timoshenko, Strength of Materials, Part I, art. 2 (bar under its own weight; from
    # memory): a rod hanging from its top carries P + rho*g*A*L there
    rho, g = 7850.0, 9.80665
    model = bar(supports=(Support("B"),), loads=(Load("A", -5e3),), gravity=-g, density=rho)
    top = 5e3 + rho * g * A * L
    assert agrees(model, Claim("reaction", "B", top))
    assert agrees(model, Claim("stress", "CB", top / A))          # end = max: the top
    assert slips_of(model, Claim("stress", "CB", 5e3 / A)) == ["no-self-weight"]


def test_distributed_load_left_out():
    # Gere and Goodno, 8th ed., 2.3 (a bar under a uniform axial load; from memory):
    # a cantilever with q along it and P at its end: R_A = -(P + q*L)
    q, p_end = 2e3, 3e3
    mat, sec = steel(E=E), area("a500", A)
    model = Model((Station("A", 0.0), Station("B", 1.5)),
                  (Segment("AB", "A", "B", mat, sec, distributed_load=q),),
                  (Support("A"),), (Load("B", p_end),))
    assert agrees(model, Claim("reaction", "A", -(p_end + q * 1.5)))
    assert agrees(model, Claim("axial_force", "AB", p_end, end="to"))
    assert slips_of(model, Claim("reaction", "A", -p_end)) == ["no-distributed-load:AB"]


def test_point_load_sign_reversed():
    # two loads between walls: R_A = -sum P_i * (L - x_i) / L (Gere and Goodno, 8th ed., 2.4)
    model = bar(extra_stations=(Station("D", 0.7),),
                loads=(Load("C", 30e3), Load("D", -10e3)))
    model = Model(model.stations,
                  (Segment("AC", "A", "C", steel(E=E), area("a", A)),
                   Segment("CD", "C", "D", steel(E=E), area("a", A)),
                   Segment("DB", "D", "B", steel(E=E), area("a", A))),
                  model.supports, model.loads)
    assert agrees(model, Claim("reaction", "A", -(30e3 * 0.6 - 10e3 * 0.3)))
    assert slips_of(model, Claim("reaction", "A", -(30e3 * 0.6 + 10e3 * 0.3))) == ["load-sign:D"]


# --- materials and sections -----------------------------------------------------------
# Gere and Goodno, 8th ed., 2.4, and Timoshenko, Part I, art. 5 (statically
# indeterminate problems; from memory): a steel and an aluminium part between walls, the
# load at the joint, shared by stiffness: R_A = -P*k_1/(k_1 + k_2), k_i = E_i*A_i/L_i
E_ST, E_AL = 200e9, 70e9
D1, D2, L1, L2, P2 = 0.020, 0.030, 0.3, 0.5, 25e3


def composite(d1=D1, d2=D2, e1=E_ST, e2=E_AL):
    return -P2 * (e1 * math.pi * d1**2 / 4 / L1) / (
        e1 * math.pi * d1**2 / 4 / L1 + e2 * math.pi * d2**2 / 4 / L2)


COMPOSITE = Model((Station("A", 0.0), Station("C", L1), Station("B", L1 + L2)),
                  (Segment("steel-part", "A", "C", Material("steel", E_ST),
                           Section("d20", "round", (("diameter", D1),))),
                   Segment("alloy-part", "C", "B", Material("alloy", E_AL),
                           Section("d30", "round", (("diameter", D2),)))),
                  (Support("A"), Support("B")), (Load("C", P2),))


def test_composite_bar_solved_right_agrees():
    assert agrees(COMPOSITE, Claim("reaction", "A", composite()))


def test_moduli_swapped():
    assert slips_of(COMPOSITE, Claim("reaction", "A", composite(e1=E_AL, e2=E_ST))) == [
        "moduli-swapped:steel:alloy"]


def test_diameter_used_as_radius():
    # the reactions only see k_1/k_2: four times the area of one part is a quarter of the
    # other's, and both slips are listed
    assert slips_of(COMPOSITE, Claim("reaction", "A", composite(d1=2 * D1))) == [
        "diameter-as-radius:d20", "radius-as-diameter:d30"]
    # the stress of the steel part tells them apart: N_1/(4*A_1) with the area taken 4 times
    stress = -composite(d1=2 * D1) / (math.pi * (2 * D1) ** 2 / 4)
    assert slips_of(COMPOSITE, Claim("stress", "steel-part", stress)) == ["diameter-as-radius:d20"]


def test_radius_used_as_diameter():
    N2 = composite(d2=D2 / 2) + P2            # the alloy part: N_2 = N_1 - P = -R_A - P
    stress = -N2 / (math.pi * (D2 / 2) ** 2 / 4)
    assert stress < 0
    assert slips_of(COMPOSITE, Claim("stress", "alloy-part", stress)) == ["radius-as-diameter:d30"]


def test_diameter_slip_of_a_tube():
    # a tube's area pi/4*(D^2 - d^2) is 4 times as large with both diameters doubled
    tube = Section("tube", "tube", (("outer_diameter", 0.030), ("inner_diameter", 0.020)))
    model = Model(COMPOSITE.stations,
                  (COMPOSITE.segments[0], Segment("alloy-part", "C", "B", Material("alloy", E_AL),
                                                  tube)),
                  COMPOSITE.supports, COMPOSITE.loads)
    k1 = E_ST * math.pi * D1**2 / 4 / L1
    k2 = E_AL * math.pi * (0.030**2 - 0.020**2) / 4 / L2
    assert agrees(model, Claim("reaction", "A", -P2 * k1 / (k1 + k2)))
    n2 = -P2 * 4 * k2 / (k1 + 4 * k2)
    assert slips_of(model, Claim("stress", "alloy-part",
                                 n2 / (math.pi * (0.060**2 - 0.040**2) / 4))) == [
        "diameter-as-radius:tube"]


def test_a_large_model_tries_the_whole_model_slips_first_and_says_what_it_left():
    # twelve heated segments between walls: a slip per segment, and one budget too small
    # for them all; the temperature left out everywhere is still found, and the claim
    # says how many single-segment slips were not tried
    from axialfe.review.verify import _Solver, find_slips

    n = 12
    stations = tuple(Station(f"s{i}", 0.1 * i) for i in range(n + 1))
    segments = tuple(Segment(f"p{i}", f"s{i}", f"s{i + 1}", steel(E=E, alpha=ALPHA),
                             area("a", A), temperature_change=10.0 + i) for i in range(n))
    model = Model(stations, segments, (Support("s0"), Support(f"s{n}")), (Load("s3", P),))
    solution = solve(model)
    claim = check_claim(model, Claim("reaction", "s0", -P * 0.9 / 1.2))  # the load alone: -P*b/L
    verdict = judge(claim, solution["base"])
    solver = _Solver(model)
    solver.budget = 4
    slips, untried = find_slips(model, verdict, solution, solver)
    assert [s.slip for s in slips] == ["no-temperature"]
    # two slips of the whole model, then 12 segments' temperatures, 2 supports, 1 load:
    # 17, of which 4 were tried
    assert untried == 13
    assert ClaimReview(verdict, slips, untried).notes(model.units) == [
        "13 slips of single segments or stations were not tried: a review of a model this "
        "large solves a bounded number of slipped models"]
    review = verify(model, [claim])
    assert [s.slip for s in review.claims[0].slips] == ["no-temperature"]
    assert review.claims[0].untried == 0


# --- verdict arithmetic and tolerances -------------------------------------------------
def test_relative_tolerance_boundary_included():
    r = solve(HEATED)["base"].reaction("A")
    assert judge(Claim("reaction", "A", r * 1.005), solve(HEATED)["base"]).agrees
    assert not judge(Claim("reaction", "A", r * 1.00501), solve(HEATED)["base"]).agrees
    assert not judge(Claim("reaction", "A", r * 0.99499), solve(HEATED)["base"]).agrees
    one = Tolerance(relative=0.01)
    assert judge(Claim("reaction", "A", r * 1.00999, tolerance=one), solve(HEATED)["base"]).agrees
    assert not judge(Claim("reaction", "A", r * 1.01001, tolerance=one),
                     solve(HEATED)["base"]).agrees


def test_absolute_tolerance():
    result = solve(HEATED)["base"]
    u = result.displacement("C")
    tol = Tolerance(absolute=0.01e-3)
    assert judge(Claim("displacement", "C", u + 0.01e-3, tolerance=tol), result).agrees
    assert judge(Claim("displacement", "C", u - 0.01e-3, tolerance=tol), result).agrees
    assert not judge(Claim("displacement", "C", u + 0.0101e-3, tolerance=tol), result).agrees


def test_difference_and_relative_difference():
    result = solve(HEATED)["base"]
    v = judge(Claim("reaction", "A", 38500.0), result)
    assert v.difference == pytest.approx(100.0, rel=1e-9)
    assert v.relative_difference == pytest.approx(100.0 / 38400.0, rel=1e-9)
    assert v.allowed == pytest.approx(0.005 * 38400.0, rel=1e-9)


def test_a_percent_tolerance_of_zero_is_taken_of_the_largest_value():
    # a cantilever loaded at C: CB carries nothing; the largest stress is P/A = 40 MPa
    model = bar(supports=(Support("A"),))
    result = solve(model)["base"]
    assert result.force("CB").tolist() == [0.0, 0.0]
    near = judge(Claim("stress", "CB", 0.004 * P / A), result)
    assert near.agrees and near.floor_used and near.relative_difference is None
    assert not judge(Claim("stress", "CB", 0.006 * P / A), result).agrees
    (item,) = review_of(model, Claim("stress", "CB", 0.004 * P / A))
    assert item.to_dict(model.units)["note"] == (
        "the 0.5 % tolerance of a zero value is taken of the largest stress in the case, 40 MPa")
    # an absolute tolerance of a zero value is itself
    assert judge(Claim("stress", "CB", 1e5, tolerance=Tolerance(absolute=1e5)), result).agrees


def test_ends_of_a_segment():
    # the cantilever under q: N = P at the free end, P + q*L at the support
    q, p_end = 2e3, 3e3
    model = Model((Station("A", 0.0), Station("B", 1.5)),
                  (Segment("AB", "A", "B", steel(E=E), area("a", A), distributed_load=q),),
                  (Support("A"),), (Load("B", p_end),))
    result = solve(model)["base"]
    for end, value in (("from", p_end + 3e3), ("to", p_end), ("max", p_end + 3e3)):
        assert judge(Claim("axial_force", "AB", value, end=end), result).agrees
    assert Claim("axial_force", "AB", 1.0).end == "max"


def test_json_of_a_review():
    review = verify(HEATED, [Claim("reaction", "A", 38.5e3, source="sheet 2"),
                             Claim("reaction", "A", -38.4e3)])
    data = review.to_dict()
    assert list(data) == ["title", "units", "claims", "agree", "differ"]
    first, second = data["claims"]
    assert list(first) == ["what", "at", "end", "case", "claimed", "computed", "difference",
                           "relative_difference", "tolerance", "verdict", "source", "slips",
                           "note"]
    assert first["claimed"] == 38500.0 and first["computed"] == pytest.approx(38400.0)
    assert (first["end"], first["case"], first["tolerance"], first["verdict"],
            first["source"], first["slips"]) == (None, "base", "0.5 %", "agrees", "sheet 2", [])
    assert second["verdict"] == "differs"
    assert second["slips"] == [{"slip": "reaction-sign", "text": (
        "the reaction has the opposite sign: the force of the bar on the support, not of the "
        "support on the bar"), "value": pytest.approx(-38400.0)}]
    assert (data["agree"], data["differ"], review.differ) == (1, 1, 1)


# --- claims checked for themselves and against the model ---------------------------------
@pytest.mark.parametrize("kwargs, message", [
    ({"what": "reactoin", "at": "A", "value": 1.0},
     "claims: unknown value 'reactoin'; did you mean 'reaction'?"),
    ({"what": "reaction", "at": "A", "value": math.inf},
     "claims: value must be a finite number: got inf"),
    ({"what": "elongation", "at": "AC", "value": 1.0, "end": "to"},
     "claims: 'end' belongs to axial_force and stress, not to elongation"),
    ({"what": "stress", "at": "AC", "value": 1.0, "end": "middle"},
     "claims: unknown end 'middle'; expected one of: 'from', 'to', 'max'"),
])
def test_bad_claims(kwargs, message):
    with pytest.raises(ModelError) as info:
        Claim(**kwargs)
    assert str(info.value) == message


@pytest.mark.parametrize("claim, message", [
    (Claim("reaction", "a", 1.0), "claims: unknown station 'a'; did you mean 'A'?"),
    (Claim("stress", "A", 1.0), "claims: stress is stated at a segment: 'A' is a station; "
                                "did you mean 'AC'?"),
    (Claim("reaction", "C", 1.0), "claims: station 'C' has no support, so it has no reaction; "
                             "expected one of: 'A', 'B'"),
    (Claim("gap_force", "AC", 1.0), "claims: gap_force is stated at a gap: 'AC' is a segment"),
    (Claim("reaction", "A", 1.0, case="hot"), "claims: unknown case 'hot'; expected one of: 'base'"),
])
def test_claims_against_the_model(claim, message):
    with pytest.raises(ModelError) as info:
        verify(HEATED, [claim])
    assert str(info.value) == message


def test_bad_tolerance():
    with pytest.raises(ModelError) as info:
        Tolerance(relative=-0.01)
    assert str(info.value) == "tolerance: tolerance must not be negative: got -0.01"
    with pytest.raises(ModelError) as info:
        Tolerance(relative=0.01, absolute=1.0)
    assert str(info.value) == ("tolerance: a tolerance is either relative ('1 %') or absolute "
                               "('0.01 mm')")


# --- property: a slip worked by hand is always among the slips found ----------------------
@given(dT=st.floats(5.0, 80.0), delta=st.floats(0.02e-3, 0.5e-3), p=st.floats(1e3, 50e3),
       a_=st.floats(0.2, 0.8), which=st.sampled_from(["no-temperature", "temperature-sign",
                                                       "no-misfit:AC", "misfit-sign:AC",
                                                       "load-sign:C", "free-support:B"]))
def test_a_slip_built_by_hand_is_found(dT, delta, p, a_, which):
    # the slipped model is built here directly, not by the slip's own function
    mat, sec = steel(E=E, alpha=ALPHA), area("a500", A)

    def model(dT=dT, delta=delta, p=p, supports=(Support("A"), Support("B"))):
        return Model((Station("A", 0.0), Station("C", a_), Station("B", L)),
                     (Segment("AC", "A", "C", mat, sec, temperature_change=dT, misfit=delta),
                      Segment("CB", "C", "B", mat, sec, temperature_change=dT)),
                     supports, (Load("C", p),))

    slipped = {"no-temperature": model(dT=0.0), "temperature-sign": model(dT=-dT),
               "no-misfit:AC": model(delta=0.0), "misfit-sign:AC": model(delta=-delta),
               "load-sign:C": model(p=-p), "free-support:B": model(supports=(Support("A"),))}
    right = solve(model())["base"].force("AC")[0]
    value = solve(slipped[which])["base"].force("AC")[0]
    assume(abs(value - right) > 0.02 * max(abs(value), abs(right)))
    assert agrees(model(), Claim("axial_force", "AC", right))
    assert which in slips_of(model(), Claim("axial_force", "AC", value))
