"""The certificate of every answer: compatibility re-checked, redundant gaps refused."""

from __future__ import annotations

import numpy as np
import pytest

from axialfe.engine.certificate import compatibility, status_of
from axialfe.engine.system import System, solve
from axialfe.errors import SolveError
from axialfe.model import Gap, Load, Model, Segment, Station, Support
from axialfe.results import RESIDUAL_BOUND

from conftest import area, steel


def _bar_with_gaps(gaps, load=10e3):
    st = [Station("a", 0.0), Station("b", 0.5), Station("c", 0.9)]
    rod = area("rod", 3e-4)
    segs = [Segment("left", "a", "b", steel(), rod), Segment("right", "b", "c", steel(), rod)]
    return Model(st, segs, [Support("a"), Support("c")], [Load("b", load)], gaps=gaps)


def test_two_identical_gaps_are_refused_by_name():
    model = _bar_with_gaps([Gap("g1", ("b",), 0.0, side="+x"), Gap("g2", ("b",), 0.0, side="+x")])
    with pytest.raises(SolveError) as err:
        solve(model)
    assert str(err.value) == (
        "the gap forces in case 'base' are not unique: gaps 'g1', 'g2' act on dependent motions "
        "(the same constraint twice, or openings whose sum is fixed), so only their total is "
        "known; remove the redundant gap")


def test_two_gaps_whose_openings_sum_to_a_fixed_value_are_refused():
    # a stop on each side of 'b' with no clearance: opening_a + opening_b = 0 always
    model = _bar_with_gaps([Gap("ga", ("b",), 0.0, side="+x"), Gap("gb", ("b",), 0.0, side="-x")])
    with pytest.raises(SolveError, match="gaps 'ga', 'gb' act on dependent motions"):
        solve(model)


def test_independent_gaps_pass_and_carry_a_zero_defect():
    # one stop each side with clearance: only one can close; closed-form check of the split
    # of P between the two walls is in test_gaps.py, here only the certificate
    model = _bar_with_gaps([Gap("ga", ("b",), 1e-6, side="+x"), Gap("gb", ("b",), 1e-6, side="-x")])
    case = solve(model)["base"]
    assert case.status == "ok" and case.compatibility_defect <= RESIDUAL_BOUND
    assert case.gap("ga")["state"] == "closed" and case.gap("gb")["state"] == "open"


def _pieces(model):
    system = System(model)
    case = solve(model)["base"]
    asm = system.asm
    du = asm.direction * (case.u[asm.end] - case.u[asm.start])
    terms = (np.zeros(len(du)), np.zeros(len(du)), np.zeros(len(du)))
    lam = -case.gap_force  # contact: force magnitudes
    return system, case, du, terms, lam


def test_a_closed_gap_that_does_not_touch_is_caught():
    model = _bar_with_gaps([Gap("ga", ("b",), 1e-6, side="+x")])
    system, case, du, terms, lam = _pieces(model)
    ok, _ = compatibility(system, case.u, du, case.axial_force[:, 0], terms, lam,
                          case.gap_closed, 1e-10 * 1e-6)
    assert ok <= RESIDUAL_BOUND
    u = case.u.copy()
    u[1] -= 1e-7  # the stations say the gap is open by 0.1 um while it is reported closed
    bad, where = compatibility(system, u, du, case.axial_force[:, 0], terms, lam,
                               case.gap_closed, 1e-10 * 1e-6)
    assert bad > RESIDUAL_BOUND and where == "closed gap 'ga' (opening)"
    status, message = status_of(0.0, bad, where)
    assert status == "inaccurate" and message.startswith(
        f"the compatibility defect {bad:.1e} at closed gap 'ga' (opening) exceeds 1e-09")


def test_a_pulling_contact_and_a_loaded_open_gap_are_caught():
    model = _bar_with_gaps([Gap("ga", ("b",), 1e-6, side="+x")])
    system, case, du, terms, lam = _pieces(model)
    _, where = compatibility(system, case.u, du, case.axial_force[:, 0], terms, -lam,
                             case.gap_closed, 1e-16)
    assert where == "gap 'ga' (sign of the force)"
    _, where = compatibility(system, case.u, du, case.axial_force[:, 0], terms, lam,
                             ~case.gap_closed, 1e-16)
    assert where in ("open gap 'ga' (opening)", "gap 'ga' (force of an open gap)")


def test_a_segment_whose_force_contradicts_its_elongation_is_caught():
    model = _bar_with_gaps([])
    system, case, du, terms, lam = _pieces(model)
    n = case.axial_force[:, 0].copy()
    n[0] *= 1.01
    bad, where = compatibility(system, case.u, du, n, terms, lam, case.gap_closed, 1e-16)
    assert bad > 1e-3 and where == "segment 'left' (elongation)"


def test_a_gap_at_a_fixed_station_does_not_hide_a_wrong_state():
    # found by the fuzzer: a gap at the supported station (no motion, zero flexibility)
    # once loosened the force tolerance of the contact search so much that a state with a
    # pulling contact passed; the certificate flagged it.  Statics: the stop at 'b' takes
    # the whole 1 kN, 'c' does not move, so the 1 mm clearance at 'c' stays open.
    st = [Station("a", 0.0), Station("b", 1e-3), Station("c", 2e-3)]
    rod = area("rod", 7.853981633974483e-07)
    segs = [Segment("ab", "a", "b", steel(E=1e9), rod), Segment("bc", "b", "c", steel(E=1e9), rod)]
    gaps = [Gap("g0", ("a",), 1e-3, side="+x"), Gap("g1", ("b",), 0.0, side="+x"),
            Gap("g2", ("c",), 1e-3, side="+x")]
    case = solve(Model(st, segs, [Support("a")], [Load("b", 1e3)], gaps=gaps))["base"]
    assert case.status == "ok"
    assert [case.gap(g)["state"] for g in ("g0", "g1", "g2")] == ["open", "closed", "open"]
    assert case.gap("g1")["force"] == pytest.approx(-1e3, rel=1e-12)
    assert case.gap("g2")["opening"] == pytest.approx(1e-3, rel=1e-12)
