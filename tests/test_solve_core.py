"""The engine against published closed forms of axially loaded members.

Each check names its source.  References used throughout (editions from memory):
  [T]  S. Timoshenko, Strength of Materials, Part I, 3rd ed., ch. 1 (tension and
       compression; statically indeterminate problems; stresses from temperature
       and from inaccuracies of fabrication; bar of variable cross-section).
  [GG] J. M. Gere and B. J. Goodno, Mechanics of Materials, 8th ed., ch. 2
       (2.3 nonuniform conditions and tapered bars, 2.4 statically indeterminate
       structures, 2.5 thermal effects, misfits and prestrains).
Everything is exact in linear elasticity, so the engine must agree to 1e-9 relative.
"""

import math

import numpy as np
import pytest
from scipy.integrate import quad

from axialfe.errors import ModelError
from axialfe.model import Load, Material, Model, Section, Segment, Station, Support
from axialfe.io.modelfile import parse_model
from axialfe.engine.system import solve

REL = 1e-9

STEEL = Material("steel", 200e9, 12e-6, density=7850.0)
ALU = Material("alu", 70e9, 23e-6, density=2700.0)
COPPER = Material("copper", 120e9, 17e-6)


def area(a):
    return Section(f"A{a:g}", "area", (("area", a),))


def rod(d):
    return Section(f"d{d:g}", "round", (("diameter", d),))


def approx(value):
    return pytest.approx(value, rel=REL, abs=1e-12 * (abs(value) if np.ndim(value) == 0 else 0))


def close(actual, expected, rel=REL):
    """Compare arrays or scalars, relative to the largest magnitude of ``expected``."""
    actual, expected = np.asarray(actual, float), np.asarray(expected, float)
    scale = np.abs(expected).max(initial=0.0)
    assert np.abs(actual - expected).max(initial=0.0) <= rel * scale, (actual, expected)


def model(stations, segments, supports=(), loads=(), **kw):
    return Model(tuple(Station(n, x) for n, x in stations.items()), tuple(segments),
                 tuple(supports), tuple(loads), **kw)


def check_balance(case):
    assert case.equilibrium_residual <= 1e-9


# --- statically indeterminate bar with a point load ---------------------------

@pytest.mark.parametrize("a, b", [(1.0, 2.0), (0.3, 1.7), (2.5, 0.5)])
def test_fixed_fixed_bar_point_load(a, b):
    # [T] art. on statically indeterminate problems: R_left = P*b/L, R_right = P*a/L;
    # [GG] 2.4, bar fixed at both ends loaded at an intermediate point.  The support
    # forces act against P.  Displacement of the loaded point: P*a*b/(L*E*A).
    P, A, L = 30e3, 4e-4, a + b
    m = model({"A": 0.0, "C": a, "B": L},
              [Segment("AC", "A", "C", STEEL, area(A)), Segment("CB", "C", "B", STEEL, area(A))],
              [Support("A"), Support("B")], [Load("C", P)])
    case = solve(m)["base"]
    assert case.reaction("A") == approx(-P * b / L)
    assert case.reaction("B") == approx(-P * a / L)
    assert case.displacement("C") == approx(P * a * b / (L * 200e9 * A))
    close(case.force("AC"), [P * b / L] * 2)
    close(case.force("CB"), [-P * a / L] * 2)
    check_balance(case)


def test_load_at_a_fixed_station_goes_into_its_reaction():
    # statics: a load on a rigid support is carried by that support alone (common practice)
    m = model({"A": 0.0, "B": 1.0}, [Segment("AB", "A", "B", STEEL, area(1e-4))],
              [Support("A"), Support("B")], [Load("B", 5e3)])
    case = solve(m)["base"]
    assert case.reaction("B") == approx(-5e3)
    assert case.reaction("A") == 0.0
    close(case.force("AB"), [0.0, 0.0])


# --- thermal ---------------------------------------------------------------------

def test_fully_restrained_heated_bar():
    # [GG] 2.5, bar between immovable supports: sigma = -E*alpha*dT, and no point moves;
    # [T] art. on thermal stresses
    dT, A = 60.0, 3e-4
    m = model({"A": 0.0, "C": 0.4, "D": 0.7, "B": 1.5},
              [Segment("AC", "A", "C", STEEL, area(A)), Segment("CD", "C", "D", STEEL, area(A)),
               Segment("DB", "D", "B", STEEL, area(A))],
              [Support("A"), Support("B")], temperature_change=dT)
    case = solve(m)["base"]
    sigma = -200e9 * 12e-6 * dT
    close(case.stress, np.full((3, 2), sigma))
    # zero to rounding, relative to the free growth alpha*dT*L
    assert np.abs(case.u).max() <= 1e-12 * 12e-6 * dT * 1.5
    close(case.thermal_strain, [12e-6 * dT] * 3)
    close(case.mechanical_strain, np.full((3, 2), -12e-6 * dT))
    assert case.reaction("A") == approx(-sigma * A)
    assert case.reaction("B") == approx(sigma * A)
    check_balance(case)


def test_two_material_series_bar_heated():
    # [GG] 2.5 (and [T], thermal stresses in a compound bar between walls):
    # R = dT*(a1*L1 + a2*L2) / (L1/(E1*A1) + L2/(E2*A2)), both parts in compression
    dT, L1, L2, A1, A2 = 45.0, 0.25, 0.35, 7e-4, 3e-4
    m = model({"left": 0.0, "joint": L1, "right": L1 + L2},
              [Segment("alu", "left", "joint", ALU, area(A1)),
               Segment("steel", "joint", "right", STEEL, area(A2))],
              [Support("left"), Support("right")], temperature_change=dT)
    case = solve(m)["base"]
    R = dT * (23e-6 * L1 + 12e-6 * L2) / (L1 / (70e9 * A1) + L2 / (200e9 * A2))
    close(case.force("alu"), [-R, -R])
    close(case.force("steel"), [-R, -R])
    assert case.reaction("left") == approx(R)
    assert case.reaction("right") == approx(-R)
    # the joint moves by the alu part's free growth minus its shortening under R
    assert case.displacement("joint") == approx(23e-6 * dT * L1 - R * L1 / (70e9 * A1))
    check_balance(case)


def test_free_thermal_growth_has_zero_residual():
    # a bar held at one end grows freely by alpha*dT*L with no force ([GG] 2.5)
    m = model({"A": 0.0, "B": 2.0}, [Segment("AB", "A", "B", ALU, area(1e-4))],
              [Support("A")], temperature_change=-30.0)
    case = solve(m)["base"]
    assert np.all(case.axial_force == 0.0)
    assert case.equilibrium_residual == 0.0
    assert case.displacement("B") == approx(23e-6 * -30.0 * 2.0)
    assert case.elongation[0] == approx(23e-6 * -30.0 * 2.0)


@pytest.mark.parametrize("kind", ["thermal", "misfit"])
def test_free_growth_of_a_partly_heated_bar_has_no_force(kind):
    # a bar held at one end, one part heated (or made too long), the others not: it
    # grows freely, no force anywhere, and nothing is out of balance ([GG] 2.5)
    mat = Material("m", 50e9, 12e-6)
    sec = rod(0.03125)
    st = {f"s{i}": float(i) for i in range(5)}
    segs = [Segment(f"g{i}", f"s{i}", f"s{i + 1}", mat, sec,
                    temperature_change=30.0 if kind == "thermal" and i in (0, 2) else 0.0,
                    misfit=1e-5 if kind == "misfit" and i == 0 else 0.0) for i in range(4)]
    case = solve(model(st, segs, [Support("s0")]))["base"]
    grow = 12e-6 * 30.0 * 2 if kind == "thermal" else 1e-5
    assert case.displacement("s4") == approx(grow)
    k = 50e9 * sec.area / 1.0
    assert np.abs(case.axial_force).max() <= 1e-9 * k * grow
    assert case.equilibrium_residual <= 1e-9


def test_unstrained_segment_of_a_growing_bar_reports_exactly_zero_force():
    mat = Material("m", 50e9, 12e-6)
    st = {f"s{i}": float(i) for i in range(5)}
    segs = [Segment(f"g{i}", f"s{i}", f"s{i + 1}", mat, rod(0.03125),
                    misfit=1e-5 if i == 0 else 0.0) for i in range(4)]
    case = solve(model(st, segs, [Support("s0")]))["base"]
    assert np.all(case.axial_force == 0.0)


def test_segment_temperature_overrides_model_default():
    m = model({"A": 0.0, "B": 1.0, "C": 2.0},
              [Segment("AB", "A", "B", STEEL, area(1e-4), temperature_change=10.0),
               Segment("BC", "B", "C", STEEL, area(1e-4))],
              [Support("A")], temperature_change=40.0)
    case = solve(m)["base"]
    close(case.temperature_change, [10.0, 40.0])
    assert case.displacement("C") == approx(12e-6 * (10.0 + 40.0))


# --- determinate bars ---------------------------------------------------------------

def test_determinate_stepped_bar_tip_displacement():
    # [GG] 2.3, eq. (2-5): delta = sum N_i L_i / (E_i A_i), N_i from free bodies;
    # [T] art. 1-2.  Loads 20 kN at B (-x), 50 kN at C (+x), 15 kN at D (+x).
    segs = [("AB", "A", "B", STEEL, 6e-4, 0.3), ("BC", "B", "C", ALU, 9e-4, 0.5),
            ("CD", "C", "D", COPPER, 2e-4, 0.2)]
    m = model({"A": 0.0, "B": 0.3, "C": 0.8, "D": 1.0},
              [Segment(n, a, b, mat, area(A)) for n, a, b, mat, A, _ in segs],
              [Support("A")], [Load("B", -20e3), Load("C", 50e3), Load("D", 15e3)])
    case = solve(m)["base"]
    N = [-20e3 + 50e3 + 15e3, 50e3 + 15e3, 15e3]
    for (name, *_), n in zip(segs, N):
        close(case.force(name), [n, n])
    tip = sum(n * L / (mat.elastic_modulus * A) for n, (_, _, _, mat, A, L) in zip(N, segs))
    assert case.displacement("D") == approx(tip)
    assert case.reaction("A") == approx(-(-20e3 + 50e3 + 15e3))
    check_balance(case)


def test_hanging_bar_self_weight():
    # [T] art. 2 (bar under its own weight) and [GG] 2.3: the end of a bar hanging
    # from its top drops rho*g*L^2/(2E); N varies linearly from rho*g*A*L at the top
    # to 0 at the free end; u(x) = rho*g*(2*L*x - x^2)/(2E) from the top.
    # x runs downward here (gravity component +9.80665 along +x).
    g, L, A, n = 9.80665, 12.0, 5e-4, 6
    xs = np.linspace(0.0, L, n + 1)
    st = {f"s{i}": x for i, x in enumerate(xs)}
    m = model(st, [Segment(f"e{i}", f"s{i}", f"s{i + 1}", STEEL, area(A)) for i in range(n)],
              [Support("s0")], gravity=g)
    case = solve(m)["base"]
    rho, E = 7850.0, 200e9
    assert case.displacement(f"s{n}") == approx(rho * g * L**2 / (2 * E))
    close(case.u, rho * g * (2 * L * xs - xs**2) / (2 * E))
    close(case.axial_force[:, 0], rho * g * A * (L - xs[:-1]))
    close(case.axial_force[:, 1], rho * g * A * (L - xs[1:]))
    assert case.axial_force[-1, 1] == 0.0
    assert case.reaction("s0") == approx(-rho * g * A * L)
    check_balance(case)


def test_hanging_bar_one_element_is_exact_and_end_load_adds():
    # one element gives the exact end forces too (element equilibrium, not nodal
    # lumping); an end load P adds P*L/(E*A) ([GG] 2.3, superposition)
    g, L, A, P = 9.80665, 30.0, 2e-4, 4e3
    m = model({"top": 0.0, "end": L}, [Segment("rod", "top", "end", STEEL, area(A))],
              [Support("top")], [Load("end", P)], gravity=g)
    case = solve(m)["base"]
    W = 7850.0 * g * A * L
    close(case.force("rod"), [W + P, P])
    assert case.displacement("end") == approx(7850.0 * g * L**2 / (2 * 200e9) + P * L / (200e9 * A))


def test_hanging_bar_with_x_upward():
    # the same bar with x pointing up: gravity -g along +x, support at the top (x = L)
    g, L, A = 9.80665, 8.0, 3e-4
    m = model({"bottom": 0.0, "top": L}, [Segment("rod", "bottom", "top", STEEL, area(A))],
              [Support("top")], gravity=-g)
    case = solve(m)["base"]
    close(case.force("rod"), [0.0, 7850.0 * g * A * L])
    assert case.displacement("bottom") == approx(-7850.0 * g * L**2 / (2 * 200e9))


def test_uniform_distributed_load_between_walls():
    # fixed-fixed bar under uniform axial load q: reactions -q*L/2 each, N from
    # +q*L/2 to -q*L/2, largest displacement q*L^2/(8*E*A) at mid-length
    # (by symmetry and [GG] 2.3, eq. (2-7), integrating N/(EA))
    q, L, A = 2e4, 2.0, 1e-4
    m = model({"A": 0.0, "M": L / 2, "B": L},
              [Segment("AM", "A", "M", STEEL, area(A), distributed_load=q),
               Segment("MB", "M", "B", STEEL, area(A), distributed_load=q)],
              [Support("A"), Support("B")])
    case = solve(m)["base"]
    assert case.reaction("A") == approx(-q * L / 2)
    assert case.reaction("B") == approx(-q * L / 2)
    close(case.axial_force, [[q * L / 2, 0.0], [0.0, -q * L / 2]])
    assert case.displacement("M") == approx(q * L**2 / (8 * 200e9 * A))


# --- tapered bars -----------------------------------------------------------------

def test_solid_cone():
    # [GG] 2.3, tapered bar of circular cross-section: delta = 4*P*L/(pi*E*d1*d2)
    # [T] art. on bars of variable cross-section
    P, L, d1, d2 = 25e3, 0.6, 0.05, 0.02
    m = model({"wide": 0.0, "narrow": L},
              [Segment("cone", "wide", "narrow", STEEL, rod(d1), end_section=rod(d2))],
              [Support("wide")], [Load("narrow", P)])
    case = solve(m)["base"]
    assert case.displacement("narrow") == approx(4 * P * L / (math.pi * 200e9 * d1 * d2))
    close(case.force("cone"), [P, P])
    close(case.stress[0], [P / (math.pi * d1**2 / 4), P / (math.pi * d2**2 / 4)])


def test_cone_in_reverse_direction():
    # the same cone, its 'from' end at larger x and the narrow end at the support
    P, L, d1, d2 = 25e3, 0.6, 0.02, 0.05
    m = model({"a": 0.0, "b": L},
              [Segment("cone", "b", "a", STEEL, rod(d2), end_section=rod(d1))],
              [Support("a")], [Load("b", P)])
    case = solve(m)["base"]
    assert case.displacement("b") == approx(4 * P * L / (math.pi * 200e9 * d1 * d2))


def test_tapered_tube_against_quadrature():
    # delta = P * integral dx/(E*A(x)) with D(x), d(x) linear ([GG] 2.3, eq. (2-7));
    # the integral is taken by scipy.integrate.quad (reference library)
    P, L, E = 10e3, 0.9, 200e9
    D1, t1, D2, t2 = 0.06, 0.004, 0.03, 0.006
    s0 = Section("t1", "tube", (("outer_diameter", D1), ("inner_diameter", D1 - 2 * t1)))
    s1 = Section("t2", "tube", (("outer_diameter", D2), ("inner_diameter", D2 - 2 * t2)))
    m = model({"a": 0.0, "b": L}, [Segment("tube", "a", "b", STEEL, s0, end_section=s1)],
              [Support("a")], [Load("b", P)])
    case = solve(m)["base"]

    def area_at(x):
        D = D1 + (D2 - D1) * x / L
        d = (D1 - 2 * t1) + ((D2 - 2 * t2) - (D1 - 2 * t1)) * x / L
        return math.pi / 4 * (D**2 - d**2)

    flex, _ = quad(lambda x: 1 / (E * area_at(x)), 0, L, epsabs=0, epsrel=1e-13)
    assert case.displacement("b") == approx(P * flex)


def test_linearly_tapered_area():
    # A(x) linear: k = E*(A2 - A1)/(L*ln(A2/A1)) (integral of dx/(E*A(x)) in closed form)
    P, L, A1, A2 = 8e3, 1.2, 4e-4, 1e-4
    m = model({"a": 0.0, "b": L},
              [Segment("bar", "a", "b", ALU, area(A1), end_section=area(A2))],
              [Support("a")], [Load("b", P)])
    case = solve(m)["base"]
    k = 70e9 * (A2 - A1) / (L * math.log(A2 / A1))
    assert case.displacement("b") == approx(P / k)


def test_tapered_rectangle_against_quadrature():
    # width tapering, height constant: integral of dx/(E*w(x)*h) by scipy quad
    P, L, h, w1, w2 = 5e3, 0.5, 0.01, 0.04, 0.015
    s0 = Section("r1", "rectangle", (("width", w1), ("height", h)))
    s1 = Section("r2", "rectangle", (("width", w2), ("height", h)))
    m = model({"a": 0.0, "b": L}, [Segment("plate", "a", "b", STEEL, s0, end_section=s1)],
              [Support("a")], [Load("b", P)])
    flex, _ = quad(lambda x: 1 / (200e9 * h * (w1 + (w2 - w1) * x / L)), 0, L, epsrel=1e-13)
    assert solve(m)["base"].displacement("b") == approx(P * flex)


def test_hanging_cone_self_weight_against_quadrature():
    # a cone hanging from its wide end: N(x) = rho*g*V(x..L), tip drop = integral of
    # N/(E*A) (equilibrium of the part below x; quadrature by scipy quad)
    g, L, d1, d2, rho, E = 9.80665, 3.0, 0.08, 0.03, 7850.0, 200e9
    m = model({"top": 0.0, "tip": L},
              [Segment("cone", "top", "tip", STEEL, rod(d1), end_section=rod(d2))],
              [Support("top")], gravity=g)
    case = solve(m)["base"]

    def A(x):
        return math.pi / 4 * (d1 + (d2 - d1) * x / L) ** 2

    def N(x):
        return rho * g * quad(A, x, L, epsrel=1e-14)[0]

    drop, _ = quad(lambda x: N(x) / (E * A(x)), 0, L, epsrel=1e-12)
    close(case.force("cone"), [N(0.0), 0.0])
    assert case.displacement("tip") == approx(drop)


# --- parallel segments, misfit ------------------------------------------------------

def test_parallel_concentric_bars_share_by_EA():
    # [GG] 2.4, Example of a cylinder inside a tube under a common load: equal
    # strains, so N_i = P * E_i*A_i / sum(E*A); [T] art. on statically indeterminate problems
    P, L = 120e3, 0.4
    core = Section("core", "round", (("diameter", 0.03),))
    tube = Section("tube", "tube", (("outer_diameter", 0.05), ("inner_diameter", 0.035)))
    m = model({"base": 0.0, "cap": L},
              [Segment("core", "base", "cap", COPPER, core), Segment("tube", "base", "cap", STEEL, tube)],
              [Support("base")], [Load("cap", -P)])
    case = solve(m)["base"]
    ea = np.array([120e9 * core.area, 200e9 * tube.area])
    close(case.force("core"), [-P * ea[0] / ea.sum()] * 2)
    close(case.force("tube"), [-P * ea[1] / ea.sum()] * 2)
    assert case.displacement("cap") == approx(-P * L / ea.sum())
    close(case.mechanical_strain[0], case.mechanical_strain[1])  # equal strains


def test_bolt_and_sleeve_misfit_preload():
    # [GG] 2.5, misfits and prestrains (bolt and sleeve, nut turned): a bolt made
    # shorter by delta clamps the sleeve with preload = delta / (1/k_b + 1/k_s);
    # [T] art. on stresses from inaccuracies of fabrication
    L, delta = 0.08, 0.05e-3
    bolt, sleeve = rod(0.012), Section("sl", "tube", (("outer_diameter", 0.03),
                                                      ("inner_diameter", 0.013)))
    m = model({"head": 0.0, "nut": L},
              [Segment("bolt", "head", "nut", STEEL, bolt, misfit=-delta),
               Segment("sleeve", "head", "nut", ALU, sleeve)], [Support("head")])
    case = solve(m)["base"]
    kb, ks = 200e9 * bolt.area / L, 70e9 * sleeve.area / L
    F = delta / (1 / kb + 1 / ks)
    close(case.force("bolt"), [F, F])
    close(case.force("sleeve"), [-F, -F])
    assert case.displacement("nut") == approx(-F / ks)
    assert case.reaction("head") == 0.0 or abs(case.reaction("head")) <= 1e-9 * F
    check_balance(case)


def test_bolt_and_sleeve_heated_after_tightening():
    # [GG] 2.5, sleeve and bolt heated: the extra bolt force is
    # (alpha_s - alpha_b)*dT*L / (1/k_b + 1/k_s), added to the preload (superposition)
    L, delta, dT = 0.08, 0.05e-3, 70.0
    bolt, sleeve = rod(0.012), Section("sl", "tube", (("outer_diameter", 0.03),
                                                      ("inner_diameter", 0.013)))
    m = model({"head": 0.0, "nut": L},
              [Segment("bolt", "head", "nut", STEEL, bolt, misfit=-delta),
               Segment("sleeve", "head", "nut", ALU, sleeve)], [Support("head")],
              temperature_change=dT)
    case = solve(m)["base"]
    kb, ks = 200e9 * bolt.area / L, 70e9 * sleeve.area / L
    F = (delta + (23e-6 - 12e-6) * dT * L) / (1 / kb + 1 / ks)
    close(case.force("bolt"), [F, F])
    close(case.force("sleeve"), [-F, -F])


def test_misfit_between_walls():
    # a bar made too long by e and forced between walls: N = -E*A*e/L ([GG] 2.5)
    e, L, A = 0.2e-3, 1.5, 2e-4
    m = model({"A": 0.0, "B": L}, [Segment("AB", "A", "B", STEEL, area(A), misfit=e)],
              [Support("A"), Support("B")])
    case = solve(m)["base"]
    close(case.force("AB"), [-200e9 * A * e / L] * 2)
    assert case.elongation[0] == 0.0


# --- spring supports and settlements ----------------------------------------------

def test_spring_support_by_superposition():
    # hand superposition: bar (k_b = EA/L) fixed at A, spring k_s at B, load P at B;
    # u_B = P/(k_b + k_s); the spring takes k_s*u_B, the wall k_b*u_B (common practice)
    P, L, A, ks = 9e3, 1.0, 1e-4, 5e6
    kb = 200e9 * A / L
    m = model({"A": 0.0, "B": L}, [Segment("AB", "A", "B", STEEL, area(A))],
              [Support("A"), Support("B", "spring", stiffness=ks)], [Load("B", P)])
    case = solve(m)["base"]
    uB = P / (kb + ks)
    assert case.displacement("B") == approx(uB)
    assert case.reaction("B") == approx(-ks * uB)  # the spring's force on the bar is -k*u
    assert case.reaction("A") == approx(-kb * uB)
    check_balance(case)


def test_heated_bar_against_spring():
    # free growth e = alpha*dT*L restrained by a wall and a spring in series:
    # N = -e / (1/k_b + 1/k_s) (compatibility, [GG] 2.5 with an elastic support)
    dT, L, A, ks = 50.0, 2.0, 1e-4, 2e7
    kb = 200e9 * A / L
    m = model({"A": 0.0, "B": L}, [Segment("AB", "A", "B", STEEL, area(A))],
              [Support("A", "spring", stiffness=ks), Support("B")], temperature_change=dT)
    case = solve(m)["base"]
    N = -12e-6 * dT * L / (1 / kb + 1 / ks)
    close(case.force("AB"), [N, N])
    assert case.displacement("A") == approx(N / ks)
    assert case.reaction("A") == approx(-N)


def test_settlement_plus_point_load_by_superposition():
    # [GG] 2.4 plus a prescribed support movement s at B: N_s = E*A*s/L adds to the
    # P*b/L, P*a/L split (superposition of the two hand solutions)
    P, a, b, A, s = 20e3, 0.4, 0.6, 2e-4, 0.1e-3
    L, EA = a + b, 200e9 * 2e-4
    m = model({"A": 0.0, "C": a, "B": L},
              [Segment("AC", "A", "C", STEEL, area(A)), Segment("CB", "C", "B", STEEL, area(A))],
              [Support("A"), Support("B", "settlement", displacement=s)], [Load("C", P)])
    case = solve(m)["base"]
    Ns = EA * s / L
    assert case.displacement("B") == approx(s)
    close(case.force("AC"), [P * b / L + Ns] * 2)
    close(case.force("CB"), [-P * a / L + Ns] * 2)
    assert case.reaction("A") == approx(-P * b / L - Ns)
    assert case.reaction("B") == approx(-P * a / L + Ns)
    check_balance(case)


def test_settlement_and_spring_at_one_station():
    # statics of the moved station (hand superposition): the bar pushes back with
    # k_b*s, the spring with k_s*s, and the settlement support supplies both
    s, L, A, ks = 1e-3, 2.0, 2.8e-3, 1e6
    kb = 200e9 * A / L
    m = model({"a": 0.0, "b": L}, [Segment("c", "a", "b", STEEL, area(A))],
              [Support("a", "settlement", displacement=s), Support("a", "spring", stiffness=ks),
               Support("b")])
    case = solve(m)["base"]
    close(case.force("c"), [-kb * s] * 2)
    close(case.reactions, [kb * s + ks * s, -ks * s, -kb * s])
    check_balance(case)


# --- ordering and direction ----------------------------------------------------------

def stepped(order, reverse):
    """A two-wall stepped bar, stations listed in ``order``, segments maybe run toward -x."""
    pos = {"A": 0.0, "B": 0.3, "C": 0.7, "D": 1.0}
    pairs = [("AB", "A", "B", area(6e-4)), ("BC", "B", "C", area(3e-4)), ("CD", "C", "D", area(2e-4))]
    segs = [Segment(n, b, a, STEEL, s, distributed_load=-4e3) if reverse
            else Segment(n, a, b, STEEL, s, distributed_load=-4e3) for n, a, b, s in pairs]
    return model({k: pos[k] for k in order}, segs, [Support("A"), Support("D")],
                 [Load("B", 15e3), Load("C", -7e3)], temperature_change=20.0)


def test_station_order_and_segment_direction_do_not_matter():
    ref = solve(stepped("ABCD", False))["base"]
    for order, reverse in [("DCBA", False), ("CADB", True), ("ABCD", True)]:
        case = solve(stepped(order, reverse))["base"]
        for st in "ABCD":
            assert case.displacement(st) == pytest.approx(ref.displacement(st), rel=REL, abs=1e-15)
        for name in ("AB", "BC", "CD"):
            f = case.force(name)
            expected = ref.force(name)[::-1] if reverse else ref.force(name)
            close(f, expected)  # ordered [at from, at to]
        assert case.reaction("A") == approx(ref.reaction("A"))
        assert case.reaction("D") == approx(ref.reaction("D"))
        close(case.elongation, ref.elongation)
        check_balance(case)


def test_results_ordered_from_to_under_distributed_load():
    # a segment from x = L to x = 0 with q toward +x, fixed at x = 0: N(x) = q*(L - x)
    # in the bar's coordinate: at 'from' (x = L) 0, at 'to' (x = 0) q*L (tension)
    q, L = 3e3, 2.0
    m = model({"a": 0.0, "b": L}, [Segment("ba", "b", "a", STEEL, area(1e-4), distributed_load=q)],
              [Support("a")])
    case = solve(m)["base"]
    close(case.force("ba"), [0.0, q * L])


# --- model file end to end -------------------------------------------------------------

def test_mixed_units_file_matches_si_model():
    # the spec's unit handling: a US customary file gives the same answers in SI
    text = """
[sections.rod]
shape = "round"
diameter = "1 in"
[stations]
A = "0 in"
C = "10 in"
B = "30 in"
[[segments]]
from = "A"
to = "C"
material = "mat"
section = "rod"
[[segments]]
from = "C"
to = "B"
material = "mat"
section = "rod"
[materials.mat]
elastic_modulus = "29000 ksi"
[[supports]]
at = "A"
[[supports]]
at = "B"
[[loads]]
at = "C"
force = "9 kip"
"""
    case = solve(parse_model(text))["base"]
    P = 9 * 4448.2216152605  # NIST SP 811, B.8: 1 kip = 1000 lbf
    assert case.reaction("A") == approx(-P * 20 / 30)
    E, A = 29e6 * 6894.757293168361, math.pi / 4 * 0.0254**2
    assert case.displacement("C") == approx(P * 10 * 20 / 30 * 0.0254 / (E * A))


# --- the object API checks the types of its values ------------------------------

@pytest.mark.parametrize("build, message", [
    (lambda: Material("s", "200 GPa"),
     "materials.s: elastic_modulus must be a real number in SI units: got '200 GPa'"),
    (lambda: Section("rod", "area", (("area", "100 mm^2"),)),
     "sections.rod: area must be a real number in SI units: got '100 mm^2'"),
    (lambda: Station("a", "x"), "stations.a: position must be a real number in SI units: got 'x'"),
    (lambda: Station("a", True), "stations.a: position must be a real number in SI units: got True"),
    (lambda: Station(3, 0.0), "stations: a station's name must be a name (a non-empty string): got 3"),
    (lambda: Load("a", "5 kN"), "loads ('a'): force must be a real number in SI units: got '5 kN'"),
    (lambda: Segment("s", "a", "b", "steel", Section("r", "area", (("area", 1e-4),))),
     "segments ('s'): material must be a Material: got 'steel'"),
])
def test_object_api_refuses_values_of_the_wrong_type(build, message):
    with pytest.raises(ModelError) as err:
        build()
    assert str(err.value) == message


def test_numeric_solve_refuses_symbols():
    import sympy

    E = sympy.Symbol("E", positive=True)
    model = Model((Station("a", 0.0), Station("b", 1.0)),
                  (Segment("ab", "a", "b", Material("m", E), Section("r", "area", (("area", 1e-4),))),),
                  (Support("a"),), (Load("b", 1e3),))
    with pytest.raises(ModelError) as err:
        solve(model)
    assert str(err.value) == ("the model holds symbolic values; give every symbol a value, or ask "
                              "for the closed form (axialfe closed-form)")


def test_an_unknown_solver_method_lists_the_names():
    model = Model((Station("a", 0.0), Station("b", 1.0)),
                  (Segment("ab", "a", "b", Material("m", 200e9), Section("r", "area", (("area", 1e-4),))),),
                  (Support("a"),), (Load("b", 1e3),))
    assert solve(model, method="sparse-lu")["base"].displacement("b") == pytest.approx(1e3 / 2e7)
    with pytest.raises(ModelError) as err:
        solve(model, method="sparse_lu")
    assert str(err.value) == "method: unknown solver method 'sparse_lu'; did you mean 'sparse-lu'?"
