"""The element and its fields: one description for the numeric and the exact solver.

References: Gere & Goodno, Mechanics of Materials (nonuniform bars: N(x) and
A(x) vary along the bar, delta = integral N/(E*A) dx; from memory), and the
closed forms derived beside each test.
"""

import json
import math

import numpy as np
import pytest
import sympy

from axialfe import parse_model, solve
from axialfe.checks import check_solution
from axialfe.mechanics import NUMERIC, element_terms, exact
from conftest import assert_close

CONE = """
title = "cone under a distributed load"
[materials.m]
elastic_modulus = "200 GPa"
yield_strength = "250 MPa"
{density}
[sections.wide]
shape = "round"
diameter = "40 mm"
[sections.narrow]
shape = "round"
diameter = "10 mm"
[stations]
a = "0 m"
b = "1 m"
[[segments]]
name = "cone"
from = "{start}"
to = "{end}"
material = "m"
section = "{first}"
end_section = "{second}"
{load}
[[supports]]
at = "a"
{settings}
"""


def cone(start="a", end="b", load='distributed_load = "-30 kN/m"', density="", settings=""):
    first, second = ("wide", "narrow") if start == "a" else ("narrow", "wide")
    return parse_model(CONE.format(start=start, end=end, first=first, second=second, load=load,
                                   density=density, settings=settings))


@pytest.mark.parametrize("start", ["a", "b"])
def test_taper_stress_peaks_inside_the_segment(start):
    # Fixed at the wide end (x = 0), q = -30 kN/m: N(x) = q*(L - x) (compression),
    # A(x) = pi/4*d(x)^2 with d from 40 to 10 mm; d/dx[(L - x)/d(x)^2] = 0 where
    # d = 2*d_narrow = 20 mm, x = 2/3 m, sigma = -10 kN/(pi*1e-4 m^2) = -1e8/pi Pa.
    # The end stresses are -23.87 MPa and 0: an end-only check is 25 % low.
    model = cone(start=start, end="b" if start == "a" else "a")
    result = solve(model)["base"]
    peak, t = result.fields.stress_peak()
    assert_close(peak[0], -1e8 / math.pi, rel=1e-12)
    assert_close(result.fields.position(t)[0], 2 / 3, rel=1e-12)
    entry = [e for e in check_solution(solve(model)).entries if e.kind == "strength"][0]
    assert_close(entry.demand, 1e8 / math.pi, rel=1e-12)
    assert_close(entry.at, 2 / 3, rel=1e-12)
    assert entry.to_dict(model.units)["at"] == pytest.approx(666.6666666667, rel=1e-12)  # mm


def test_strength_json_gives_the_place_of_the_peak(tmp_path, cli):
    path = tmp_path / "cone.toml"
    path.write_text(CONE.format(start="a", end="b", first="wide", second="narrow",
                                load='distributed_load = "-30 kN/m"', density="", settings=""))
    out = cli("check", path, "--format", "json")
    entry = json.loads(out.stdout)["cases"][0]["checks"][0]
    assert entry["kind"] == "strength" and entry["at"] == pytest.approx(2000 / 3, rel=1e-12)
    assert entry["utilization"] == pytest.approx(1e8 / math.pi / 250e6, rel=1e-12)


def test_self_weight_on_a_taper_gives_a_cubic_force():
    # A cone hanging from its wide end (x = 1 m, fixed) with its tip at x = 0, gravity
    # -g along x: N(x) = rho*g*V(x), V the volume below x, a cubic in x (Gere & Goodno,
    # nonuniform bars; the volume of a frustum is pi*h*(R^2 + R*r + r^2)/3).
    text = CONE.format(start="a", end="b", first="narrow", second="wide", load="",
                       density='density = "7850 kg/m^3"',
                       settings='[settings]\ngravity = "-9.80665 m/s^2"')
    text = text.replace('[[supports]]\nat = "a"', '[[supports]]\nat = "b"')
    result = solve(parse_model(text))["base"]
    rho_g = 7850 * 9.80665
    x = np.linspace(0, 1, 11)
    r0, r1 = 0.005, 0.005 + 0.015 * x
    volume = math.pi * x * (r1**2 + r1 * r0 + r0**2) / 3
    assert_close(result.fields.axial_force(x)[0], rho_g * volume, rel=1e-12, abs_=1e-9)
    assert_close(result.axial_force[0], [0.0, rho_g * volume[-1]], rel=1e-12)


def test_numeric_and_exact_backends_agree_on_a_tapered_tube():
    # the same element formulas on floats and on exact rationals
    c, p1, q1, p2, q2, L, E, rho_g = (math.pi / 4, 0.010, 0.070, 0.006, 0.046, 0.8, 70e9, 2.7e3 * 9.81)
    num = element_terms(c, *(np.array([v]) for v in (p1, q1, p2, q2, L, E, rho_g)), NUMERIC)
    R = sympy.Rational
    ex = element_terms(sympy.pi / 4, R(10, 1000), R(70, 1000), R(6, 1000), R(46, 1000), R(8, 10),
                       70 * 10**9, R(27, 10) * 1000 * R(981, 100), exact())
    for key in ("stiffness", "area_from", "area_to", "g_unit_q", "w_self", "g_self"):
        assert_close(getattr(num, key)[0], float(sympy.N(getattr(ex, key), 30)), rel=1e-12, what=key)


def test_result_arrays_are_read_only_and_not_shared():
    model = cone()
    solution = solve(model)
    case = solution["base"]
    for key in ("u", "axial_force", "stress", "length", "elongation", "reactions",
                "temperature_change", "thermal_strain", "gap_force"):
        with pytest.raises(ValueError, match="read-only"):
            getattr(case, key)[...] = 0
    from axialfe.engine import System
    from axialfe.model.cases import load_states

    system = System(model)
    state = load_states(model)[0]
    a, b = system.solve_state(state), system.solve_state(state)
    assert not np.shares_memory(a.length, b.length)
    assert not np.shares_memory(a.length, system.asm.length)


def test_diagrams_draw_the_fields_inside_a_taper():
    # the force diagram of a hanging cone follows N = rho*g*V(x), a cubic, and the
    # stress diagram of the loaded cone passes through its inside peak (-1e8/pi Pa)
    from axialfe.output.plot import diagram_data

    model = cone()
    curve = diagram_data(solve(model)["base"], "stress")[0]
    assert min(curve.y) == pytest.approx(-1e8 / math.pi / 1e6, rel=1e-12)      # MPa
    text = CONE.format(start="a", end="b", first="narrow", second="wide", load="",
                       density='density = "7850 kg/m^3"',
                       settings='[settings]\ngravity = "-9.80665 m/s^2"')
    text = text.replace('[[supports]]\nat = "a"', '[[supports]]\nat = "b"')
    model = parse_model(text)
    curve = diagram_data(solve(model)["base"], "force")[0]
    x = curve.x / 1e3                                                           # mm to m
    r0, r1 = 0.005, 0.005 + 0.015 * x
    expected = 7850 * 9.80665 * math.pi * x * (r1**2 + r1 * r0 + r0**2) / 3
    assert len(x) > 2
    assert_close(curve.y * model.units.factor("force"), expected, rel=1e-9, abs_=1e-9)


def test_sweep_yield_event_follows_a_moving_peak():
    # A cone hanging from its wide end (gravity toward +x, away from the support)
    # under a distributed load scaled by the load factor, its self-weight held:
    # sigma(x, f) = (rho*g*V_beyond(x) + f*q*(L - x))/A(x), whose peak moves along the
    # segment as f grows, so max|sigma|(f) is not affine.  The event must be the
    # root of max over x of |sigma(x, f)| - f_y: checked against direct solves at
    # the event, sampled densely along the segment (an end-only rule comes late).
    from dataclasses import replace

    from axialfe.tracking.sweep import sweep

    text = CONE.format(start="a", end="b", first="wide", second="narrow",
                       load='distributed_load = "30 kN/m"', density='density = "7850 kg/m^3"',
                       settings='[settings]\ngravity = "9.80665 m/s^2"')
    model = parse_model(text)
    result = sweep(model, "load_factor", 0.0, 10.0, 3)
    (event,) = [e for e in result.events if e.event == "yields"]
    t = np.linspace(0, 1, 200001)

    def solved(factor):
        seg = model.segments[0]
        return solve(replace(model, segments=(replace(seg, distributed_load=factor * 30e3),)))

    def dense_peak(factor):
        return np.abs(solved(factor)["base"].fields.stress(t)[0]).max()

    assert dense_peak(event.value) == pytest.approx(250e6, rel=1e-9)
    assert dense_peak(event.value * (1 - 1e-6)) < 250e6
    assert np.abs(solved(event.value)["base"].stress[0]).max() < 0.9 * 250e6  # the ends lag


def test_a_claim_of_the_largest_stress_includes_the_inside_of_a_taper():
    # the stated peak of the loaded cone (-1e8/pi Pa at x = 2/3 m) agrees; its end
    # value (-30 kN / (pi/4 * (40 mm)^2) = -23.87 MPa) differs from the peak
    from axialfe.review.claims import Claim, measure

    case = solve(cone())["base"]

    def value(what, end):
        return measure(Claim(what, "cone", 0.0, end=end), case)

    assert value("stress", "max") == pytest.approx(-1e8 / math.pi, rel=1e-12)
    assert value("stress", "from") == pytest.approx(-30e3 / (math.pi / 4 * 0.04**2))
    assert value("axial_force", "max") == pytest.approx(-30e3, rel=1e-12)
