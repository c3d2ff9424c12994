"""Gaps and one-way links: exact contact states against closed forms and brute force."""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from hypothesis import given, strategies as st

from axialfe import Gap, Load, Model, ModelError, Segment, SolveError, Station, Support, solve
from axialfe.io.modelfile import parse_model

from conftest import area, assert_close, steel

E, A, L = 200e9, 1e-4, 2.0
EA = E * A


def bar_with_stop(P, a, clearance, side="+x"):
    """Bar A-B fixed at A, load P at C (distance a from A), stop at B."""
    return Model([Station("A", 0.0), Station("C", a), Station("B", L)],
                 [Segment("AC", "A", "C", steel(), area("s", A)),
                  Segment("CB", "C", "B", steel(), area("s", A))],
                 [Support("A")], [Load("C", P)], gaps=[Gap("wall", ("B",), clearance, side=side)])


@pytest.mark.parametrize("P", [10e3, 40e3, 90e3, 200e3])
def test_bar_with_clearance_to_wall(P):
    # A bar with a gap to a rigid wall under a load (textbook problem of an axial member
    # with a gap: Gere and Goodno, Mechanics of Materials, statically indeterminate
    # members; Hibbeler, Mechanics of Materials, ch. 4; from memory, edition not checked).
    # The wall takes nothing until P*a/(EA) reaches the clearance c, then
    # R_B = (P*a - c*EA)/L and R_A = P - R_B (compressions toward the supports).
    a, c = 1.5, 1e-3
    case = solve(bar_with_stop(P, a, c))["base"]
    free_tip = P * a / EA
    if free_tip <= c:
        assert case.gap("wall") == {"state": "open", "opening": pytest.approx(c - free_tip, rel=1e-9),
                                    "force": 0.0}
        assert_close(case.reaction("A"), -P)
    else:
        R_B = (P * a - c * EA) / L
        g = case.gap("wall")
        assert g["state"] == "closed" and g["opening"] == 0.0
        assert_close(g["force"], -R_B, what="wall force (compression negative)")
        assert_close(case.reaction("A"), -(P - R_B))
        assert_close(case.displacement("B"), c, what="closed gap is an exact constraint")
    assert case.equilibrium_residual < 1e-12


def test_stop_on_minus_side_mirrors():
    # Mirror symmetry (common practice): a load toward -x against a stop on the -x side.
    a, c, P = 1.5, 1e-3, 90e3
    plus = solve(bar_with_stop(P, a, c, "+x"))["base"]
    minus = solve(bar_with_stop(-P, a, c, "-x"))["base"]
    assert_close(minus.gap("wall")["force"], plus.gap("wall")["force"])
    assert_close(minus.u, -plus.u)


def test_rail_expansion_gap_closed_form():
    # Rail with an expansion gap heated: closes at dT_c = c/(alpha*L) above the reference,
    # then sigma = -E*alpha*(dT - dT_c) (common practice; e.g. Gere and Goodno, thermal
    # effects with a gap, from memory).
    alpha, Lr, c = 11.5e-6, 25.0, 6e-3
    for dT in (10.0, 20.0, 40.0, 60.0):
        m = Model([Station("a", 0.0), Station("b", Lr)],
                  [Segment("rail", "a", "b", steel(alpha=alpha), area("r", 7.6e-3))],
                  [Support("a")], gaps=[Gap("joint", ("b",), c, side="+x")],
                  temperature_change=dT)
        case = solve(m)["base"]
        dT_c = c / (alpha * Lr)
        expected = -E * alpha * max(dT - dT_c, 0.0)
        assert_close(case.stress[0], [expected, expected], abs_=1e-6)
        assert case.gap("joint")["state"] == ("closed" if dT > dT_c else "open")
        assert case.equilibrium_residual == 0.0 if dT < dT_c else case.equilibrium_residual < 1e-12


def test_free_thermal_growth_has_zero_residual():
    # With no load, reaction or gap force at all, the residual is exactly 0 (by definition).
    m = Model([Station("a", 0.0), Station("b", 1.0)], [Segment("s", "a", "b", steel(), area("r", A))],
              [Support("a")], gaps=[Gap("g", ("b",), 1.0, side="+x")], temperature_change=50.0)
    case = solve(m)["base"]
    assert case.equilibrium_residual == 0.0
    assert_close(case.displacement("b"), 12e-6 * 50.0)


def test_slack_tether_semantics():
    # A slack tether anchored on the +x side goes taut when the station has moved the
    # clearance away from it (u <= -c), then carries tension (positive force).
    c, P = 1e-3, -60e3
    m = Model([Station("A", 0.0), Station("B", L)], [Segment("AB", "A", "B", steel(), area("s", A))],
              [Support("A", "spring", stiffness=EA / L)], [Load("B", P)],
              gaps=[Gap("tether", ("B",), c, kind="slack", side="+x")])
    case = solve(m)["base"]
    g = case.gap("tether")
    assert g["state"] == "closed" and g["force"] > 0
    # series spring+bar: flexibility 2L/EA; with u_B = -c the tether carries P_total - c*EA/(2L)
    assert_close(g["force"], -P - c * EA / (2 * L))
    assert_close(case.displacement("B"), -c)


def test_between_gap_order_and_butting_parts():
    # Two parts butting at one position (clearance 0): the floating part is held only by the
    # contact and pushes through it; pulled, it has no equilibrium (statics, common practice).
    def model(P):
        return Model([Station("A", 0.0), Station("B", 1.0), Station("C", 1.0), Station("D", 2.0)],
                     [Segment("AB", "A", "B", steel(), area("s", A)),
                      Segment("CD", "C", "D", steel(), area("s", A))],
                     [Support("A")], [Load("D", P)], gaps=[Gap("butt", ("B", "C"), 0.0)])

    case = solve(model(-50e3))["base"]
    assert_close(case.gap("butt")["force"], -50e3)
    assert_close(case.axial_force, -50e3 * np.ones((2, 2)))
    with pytest.raises(SolveError) as err:
        solve(model(50e3))
    assert str(err.value) == (
        "no equilibrium in case 'base': the part with stations 'C', 'D' is held only by gap(s) "
        "'butt', and the gaps cannot hold the load on it (the part floats while the gap is open)")


def test_unloaded_part_behind_open_gap_is_not_unique():
    m = Model([Station("A", 0.0), Station("B", 1.0), Station("C", 1.0), Station("D", 2.0)],
              [Segment("AB", "A", "B", steel(), area("s", A)),
               Segment("CD", "C", "D", steel(), area("s", A))],
              [Support("A")], gaps=[Gap("butt", ("B", "C"), 1e-3)])
    with pytest.raises(SolveError, match="not unique: stations 'C', 'D' are held only by gap"):
        solve(m)


def test_gap_file_keys_and_errors(tmp_path):
    text = """
[materials.m]
elastic_modulus = "200 GPa"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
b = "1000 mm"
[[segments]]
from = "a"
to = "b"
material = "m"
section = "s"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "30 kN"
[[gaps]]
name = "stop"
at = "b"
side = "+x"
clearance = "0.5 mm"
"""
    case = solve(parse_model(text, "stop.toml"))["base"]
    assert case.gap("stop")["state"] == "closed"
    assert_close(case.gap("stop")["force"], -(30e3 - 0.5e-3 * 200e9 * 1e-4 / 1.0))
    bad = text.replace('side = "+x"', 'side = "up"')
    with pytest.raises(ModelError) as err:
        parse_model(bad, "stop.toml")
    assert str(err.value) == "stop.toml:23: gaps[1] ('stop'): 'side' must be '+x' or '-x': got 'up'"
    bad = text.replace('clearance = "0.5 mm"', 'clearence = "0.5 mm"')
    with pytest.raises(ModelError) as err:
        parse_model(bad, "stop.toml")
    assert str(err.value) == ("stop.toml:24: gaps[1] ('stop'): unknown key 'clearence'; "
                              "did you mean 'clearance'?")


# --- property tests: complementarity, equilibrium, and brute force -------------------

def _brute_force(model):
    """Try every gap state with a dense KKT solve; return the states that satisfy
    complementarity (the LCP of a positive definite system has exactly one)."""
    from axialfe.engine.system import System
    from axialfe.model.cases import load_states

    system = System(model)
    F, up, _ = system.state_vectors(load_states(model)[0])
    K = system.K.toarray()
    n, g = K.shape[0], len(model.gaps)
    B = system.B.toarray()
    free = np.setdiff1d(np.arange(n), system.presc)
    found = []
    for closed in itertools.product([False, True], repeat=g):
        C = np.flatnonzero(closed)
        Bc = B[C][:, free]
        KKT = np.block([[K[np.ix_(free, free)], Bc.T], [Bc, np.zeros((len(C), len(C)))]])
        rhs = np.concatenate([F[free], system.clearance[C]])
        try:
            x = np.linalg.solve(KKT, rhs)
        except np.linalg.LinAlgError:
            continue
        u = np.zeros(n)
        u[free] = x[:len(free)]
        lam = np.zeros(g)
        lam[C] = x[len(free):]
        opening = system.clearance - B @ u
        scale = max(np.abs(lam).max(initial=0), 1.0)
        if np.all(lam >= -1e-9 * scale) and np.all(opening >= -1e-12):
            found.append((np.array(closed), u))
    return found


@st.composite
def gap_models(draw):
    n_seg = draw(st.integers(2, 5))
    xs = np.cumsum([0.0] + [draw(st.floats(0.2, 2.0)) for _ in range(n_seg)])
    names = [f"s{i}" for i in range(n_seg + 1)]
    segments = [Segment(f"e{i}", names[i], names[i + 1],
                        steel(E=draw(st.sampled_from([70e9, 110e9, 200e9])), alpha=12e-6),
                        area(f"a{i}", draw(st.floats(1e-5, 1e-3)))) for i in range(n_seg)]
    supports = [Support(names[0])]
    if draw(st.booleans()):
        supports.append(Support(names[-1], "spring", stiffness=draw(st.floats(1e6, 1e9))))
    # no subnormal or vanishing loads: a force of 1e-300 N has no engineering meaning and
    # its balance cannot be checked relative to itself
    force = draw(st.one_of(st.just(0.0), st.floats(1.0, 1e5), st.floats(-1e5, -1.0)))
    loads = [Load(names[draw(st.integers(1, n_seg))], force)]
    gaps, used = [], set()
    for j in range(draw(st.integers(1, 3 if n_seg > 2 else 2))):
        kind = draw(st.sampled_from(["contact", "slack"]))
        i = draw(st.integers(1, n_seg))
        c = draw(st.one_of(st.just(0.0), st.floats(1e-6, 2e-3)))  # no sub-atomic clearances
        # one gap per station or station pair: two gaps acting on the same relative motion
        # make their force split non-unique, which the solver reports as such
        if draw(st.booleans()):
            if (i,) in used:
                continue
            used.add((i,))
            gaps.append(Gap(f"g{j}", (names[i],), c, kind, draw(st.sampled_from(["+x", "-x"]))))
        else:
            k = draw(st.integers(1, n_seg).filter(lambda k: k != i))  # s0 is fixed: no pair with it
            if frozenset((i, k)) in used:
                continue
            used.add(frozenset((i, k)))
            gaps.append(Gap(f"g{j}", (names[i], names[k]), c, kind))
    dT = round(draw(st.floats(-80.0, 80.0)), 3)  # no subnormal temperature changes
    return Model([Station(nm, float(x)) for nm, x in zip(names, xs)], segments, supports, loads,
                 gaps=gaps, temperature_change=dT)


@given(gap_models())
def test_complementarity_and_equilibrium(model):
    case = solve(model)["base"]
    scale = max(np.abs(case.gap_force).max(initial=0), np.abs(case.axial_force).max(), 1.0)
    for j, gap in enumerate(model.gaps):
        force, opening = case.gap_force[j], case.gap_opening[j]
        assert opening >= 0.0
        if case.gap_closed[j]:
            # a closed contact carries compression, a taut link tension
            assert (force <= 1e-9 * scale) if gap.kind == "contact" else (force >= -1e-9 * scale)
        else:
            assert force == 0.0
    assert case.equilibrium_residual <= 1e-9


@given(gap_models())
def test_contact_state_matches_brute_force(model):
    case = solve(model)["base"]
    found = _brute_force(model)
    assert found, "the brute-force search found no complementary state"
    u_ref = found[0][1]
    assert_close(case.u, u_ref, rel=1e-7, abs_=1e-12 + 1e-7 * np.abs(u_ref).max())


def test_residual_detects_an_unbalanced_solution():
    # The residual is an independent check: recovering forces from slightly wrong
    # displacements must show the imbalance at about the size of the error.
    from axialfe.model.cases import load_states
    from axialfe.engine.system import System

    model = bar_with_stop(90e3, 1.5, 1e-3)
    system = System(model)
    state = load_states(model)[0]
    F, up, terms = system.state_vectors(state)
    lam, shift = system.contact(F, up)
    u = system.displacements(F, up, lam, shift)
    good = system.recover(state, u, F, lam, terms)
    assert good.equilibrium_residual < 1e-12
    assert (good.status, good.message) == ("ok", None)
    wrong = u * (1 + 1e-6 * np.arange(len(u)))
    bad = system.recover(state, wrong, F, lam, terms)
    assert bad.equilibrium_residual > 1e-7
    # the result is flagged, not only printed
    assert bad.status == "inaccurate"
    assert bad.message.startswith(f"the equilibrium residual {bad.equilibrium_residual:.1e} "
                                  "exceeds 1e-09: the result does not balance")
    assert bad.to_dict()["status"] == "inaccurate"


def test_a_gap_over_closed_by_settlements_has_no_equilibrium():
    # both ends of a link held by supports: their settlements fix its opening, and one
    # that overlaps the clearance admits no equilibrium (it is not a question of uniqueness)
    from axialfe import parse_model

    text = """
[materials.m]
elastic_modulus = "200 GPa"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
b = "1000 mm"
[[segments]]
from = "a"
to = "b"
material = "m"
section = "s"
[[supports]]
at = "a"
[[supports]]
at = "b"
kind = "settlement"
displacement = "{settle}"
[[gaps]]
name = "tie"
between = ["a", "b"]
clearance = "0.02 mm"
kind = "slack"
"""
    with pytest.raises(SolveError) as err:
        solve(parse_model(text.format(settle="0.1 mm"), "bar.toml"))
    assert str(err.value) == (
        "bar.toml:21: no equilibrium in case 'base': gap 'tie' joins stations that supports hold "
        "in place, and their prescribed displacements close it by more than its clearance; check "
        "the settlements or the clearance")
    case = solve(parse_model(text.format(settle="0.01 mm")))["base"]
    assert case.gap("tie") == {"state": "open", "opening": pytest.approx(1e-5), "force": 0.0}
