"""Load cases and combinations: what each case puts on the model, and superposition."""

from __future__ import annotations

import numpy as np
import pytest

from axialfe import Case, Combination, Gap, Load, Model, ModelError, Segment, Station, Support, solve
from axialfe.io.modelfile import parse_model

from conftest import area, assert_close, steel

E, A, L, ALPHA = 200e9, 1e-4, 2.0, 12e-6

TWO_BARS = """
title = "two bars"
[materials.m]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
left = "0 mm"
joint = "1000 mm"
right = "2000 mm"
[[segments]]
name = "bolt"
from = "left"
to = "joint"
material = "m"
section = "s"
temperature_change = "5 K"
[[segments]]
name = "rod"
from = "joint"
to = "right"
material = "m"
section = "s"
[[supports]]
at = "left"
[[supports]]
at = "right"
kind = "settlement"
displacement = "0.1 mm"
"""


def with_cases(extra):
    return parse_model(TWO_BARS + extra, "cases.toml")


def test_base_case_without_cases():
    sol = solve(parse_model(TWO_BARS, "cases.toml"))
    assert sol.names == ("base",)


def test_case_temperature_priority_and_settlements():
    # Precedence of thermal input: a segment's name in the case beats "all", which beats the
    # segment's own field, which beats settings.temperature_change.
    model = with_cases("""
[[cases]]
name = "hot"
temperature_change = { all = "85 K", bolt = "60 K" }
settlements = [{ at = "right", displacement = "0.05 mm" }]
[[cases]]
name = "own"
loads = [{ at = "joint", force = "3 kN" }]
""")
    sol = solve(model)
    hot, own = sol["hot"], sol["own"]
    assert_close(hot.temperature_change, [60.0, 85.0])
    assert_close(own.temperature_change, [5.0, 0.0])
    assert_close(hot.displacement("right"), 0.05e-3)
    assert_close(own.displacement("right"), 0.1e-3)
    # Series bar between supports (Gere and Goodno, superposition of thermal and settlement,
    # from memory): N = EA/(2L) * (s - alpha*(dT1 + dT2)*L), equal in both halves.
    N = E * A / (2 * 1.0) * (0.05e-3 - ALPHA * (60 + 85) * 1.0)
    assert_close(hot.axial_force, N * np.ones((2, 2)))


def test_top_level_loads_with_cases_is_an_error():
    with pytest.raises(ModelError) as err:
        with_cases("""
[[loads]]
at = "joint"
force = "1 kN"
[[cases]]
name = "a"
""")
    assert str(err.value) == ("cases.toml:33: loads: top-level loads are not allowed when the model "
                              "has cases; move them into a case")


def test_case_errors_name_the_place():
    with pytest.raises(ModelError) as err:
        with_cases("""
[[cases]]
name = "hot"
temperature_change = { all = "85 K", blot = "60 K" }
""")
    assert str(err.value) == ("cases.toml:35: cases[1] ('hot'): unknown segment 'blot' in "
                              "temperature_change; did you mean 'bolt'?")
    with pytest.raises(ModelError) as err:
        with_cases("""
[[cases]]
name = "hot"
settlements = [{ at = "joint", displacement = "0.05 mm" }]
""")
    assert str(err.value) == ("cases.toml:35: cases[1] ('hot') settlements: station 'joint' has no "
                              "settlement support to move; expected one of: 'right'")
    with pytest.raises(ModelError) as err:
        with_cases("""
[[cases]]
name = "hot"
[[combinations]]
name = "c"
factors = { hto = 1.0 }
""")
    assert "unknown case 'hto'; did you mean 'hot'?" in str(err.value)


def test_combination_factors_loads_and_keeps_part_properties_once():
    # A combination is one new case: its loads, temperature changes and settlements are the
    # factored sums of its cases' own; the parts' own temperature is counted once.
    model = with_cases("""
[[cases]]
name = "thrust"
loads = [{ at = "joint", force = "10 kN" }]
[[cases]]
name = "warm"
temperature_change = { rod = "20 K" }
[[combinations]]
name = "design"
factors = { thrust = 1.35, warm = 1.5 }
""")
    sol = solve(model)
    d = sol["design"]
    assert_close(d.applied[model.station_index("joint")], 13.5e3)
    assert_close(d.temperature_change, [5.0, 30.0])  # bolt: its own 5 K once; rod: 1.5 * 20 K
    assert_close(d.displacement("right"), 0.1e-3)  # the support's own settlement, once
    # Linear model: the combination equals a model with those inputs solved directly.
    direct = with_cases("""
[[cases]]
name = "direct"
loads = [{ at = "joint", force = "13.5 kN" }]
temperature_change = { rod = "30 K" }
""")
    assert_close(d.u, solve(direct)["direct"].u, rel=1e-12)


def test_combination_with_a_gap_is_solved_not_superposed():
    # With a gap the response is not linear: superposing case results would give a closed
    # gap carrying force where the combined loads leave it open (basic mechanics of
    # unilateral contact, common practice).
    c = 1e-3
    model = Model([Station("A", 0.0), Station("B", L)],
                  [Segment("AB", "A", "B", steel(), area("s", A))], [Support("A")],
                  gaps=[Gap("stop", ("B",), c, side="+x")],
                  cases=[Case("push", [Load("B", 30e3)]), Case("pull", [Load("B", -25e3)])],
                  combinations=[Combination("both", [("push", 1.0), ("pull", 1.0)])])
    sol = solve(model)
    push, pull, both = sol["push"], sol["pull"], sol["both"]
    superposed_force = push.gap_force[0] + pull.gap_force[0]
    assert push.gap("stop")["state"] == "closed" and superposed_force < -1e3
    assert both.gap("stop") == {"state": "open", "opening": pytest.approx(c - 5e3 * L / (E * A)),
                                "force": 0.0}
    assert_close(both.displacement("B"), 5e3 * L / (E * A))


def test_cases_reuse_one_factorisation():
    from axialfe.engine import factor

    before = factor.made()
    model = with_cases("".join(f"""
[[cases]]
name = "c{i}"
loads = [{{ at = "joint", force = "{i} kN" }}]
""" for i in range(6)))
    sol = solve(model)
    assert len(sol) == 6 and factor.made() - before == 1
    assert_close([c.reaction("left") for c in sol], [-i * 1e3 / 2 + sol["c0"].reaction("left")
                                                     for i in range(6)], rel=1e-9)
