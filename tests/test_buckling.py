"""Buckling: braced runs, column curves, the buckling entries and their output."""

import json
import math

import pytest
from typer.testing import CliRunner

from axialfe import ModelError, parse_model, solve
from axialfe.checks import check_case
from axialfe.checks.bracing import braced_runs, braced_stations, parallel_segments
from axialfe.checks.columns import (CURVE_NAMES, IMPERFECTION, aisc360_stress, column_strength,
                                    en1993_reduction, euler_stress, johnson_stress,
                                    johnson_tangency)
from axialfe.cli import app
from axialfe.model.parts import COLUMN_CURVES, CheckSettings
from axialfe.units import OutputUnits

SHOWN = OutputUnits()   # the default output units: notes show lengths in mm

runner = CliRunner()

E, FY = 200e9, 250e6          # built-in structural-steel
D = 0.020                     # the 20 mm round of the struts below
AREA, INERTIA = math.pi * D ** 2 / 4, math.pi * D ** 4 / 64


def strut(length_mm=2000.0, parts=1, *, braced_at=(), force="-1 kN", checks="", end_braced=True,
          segment_extra=""):
    """A 20 mm steel strut from 'a' (fixed) to 'b' (load), cut into ``parts`` equal segments.

    ``braced_at`` lists the cut stations (1 .. parts-1) marked braced; 'b' is braced
    unless ``end_braced`` is False.
    """
    stations = ['s0 = "0 mm"']
    for k in range(1, parts):
        x = f'"{length_mm * k / parts!r} mm"'
        stations.append(f"s{k} = {{ x = {x}, braced = true }}" if k in braced_at else f"s{k} = {x}")
    end = f'"{length_mm!r} mm"'
    stations.append(f"s{parts} = {{ x = {end}, braced = true }}" if end_braced
                    else f"s{parts} = {end}")
    segments = "".join(f"""
[[segments]]
name = "p{k}"
from = "s{k}"
to = "s{k + 1}"
material = "structural-steel"
section = "rod"
{segment_extra}
""" for k in range(parts))
    nl = "\n"
    return parse_model(f"""
{checks}
[sections.rod]
shape = "round"
diameter = "20 mm"
[stations]
{nl.join(stations)}
{segments}
[[supports]]
at = "s0"
[[loads]]
at = "s{parts}"
force = "{force}"
""", "strut.toml")


def buckling(model, case="base"):
    return [e for e in check_case(solve(model)[case]) if e.kind == "buckling"]


# --- braced runs -------------------------------------------------------------------
@pytest.mark.parametrize("curve", ["euler-only", "johnson"])
@pytest.mark.parametrize("parts", [2, 3, 7])
def test_a_split_strut_keeps_the_capacity_of_the_whole(parts, curve):
    # Euler load of a pinned-pinned strut pi^2 E I / L^2 over its whole length, however many
    # segments it is cut into (Timoshenko and Gere, Theory of Elastic Stability, 2nd ed.,
    # sec. 2.1; Gere and Goodno, Mechanics of Materials, 8th ed., ch. 11; from memory).
    checks = f'[checks]\ncolumn_curve = "{curve}"'
    whole, = buckling(strut(checks=checks))
    assert whole.capacity == pytest.approx(math.pi ** 2 * E * INERTIA / 2.0 ** 2, rel=1e-12)
    split = buckling(strut(parts=parts, checks=checks))
    assert [e.name for e in split] == [f"p{k}" for k in range(parts)]
    for e in split:
        assert e.capacity == pytest.approx(whole.capacity, rel=1e-12)
        assert e.buckling_length == pytest.approx(2.0, rel=1e-12)
        assert e.ok is True
        assert e.note_in(SHOWN).startswith(f"run 's0'..'s{parts}' braced at both ends: L = 2000 mm, K = 1;")


@pytest.mark.parametrize("curve", ["euler-only", "johnson"])
def test_bracing_at_mid_length_gives_four_times_the_capacity(curve):
    # Halving the buckling length multiplies pi^2 E I / L^2 by four (same sources as above).
    # K*L/r = 400 and 200 both lie above Johnson's tangency 125.7: the Euler branch.
    checks = f'[checks]\ncolumn_curve = "{curve}"'
    whole, = buckling(strut(checks=checks))
    halves = buckling(strut(parts=2, braced_at=(1,), checks=checks))
    for e in halves:
        assert e.capacity == pytest.approx(4 * whole.capacity, rel=1e-12)
        assert e.buckling_length == pytest.approx(1.0, rel=1e-12)
    assert halves[0].note_in(SHOWN).startswith("run 's0'..'s1' braced at both ends: L = 1000 mm")
    assert halves[1].note_in(SHOWN).startswith("run 's1'..'s2' braced at both ends: L = 1000 mm")


def test_a_free_end_takes_k_2_and_says_so():
    # A cantilever (fixed at one end, free at the other) buckles as a pinned strut of twice
    # its length: P = pi^2 E I / (2 L)^2 (Timoshenko and Gere, 2nd ed., sec. 2.1; from memory).
    e1, e2 = buckling(strut(parts=2, end_braced=False, checks='[checks]\ncolumn_curve = "euler-only"'))
    for e in (e1, e2):
        assert e.k_factor == 2.0 and e.buckling_length == pytest.approx(2.0)
        assert e.capacity == pytest.approx(math.pi ** 2 * E * INERTIA / 4.0 ** 2, rel=1e-12)
        assert e.note_in(SHOWN).startswith(
            "run 's0'..'s2' braced at 's0' only (free end 's2'): L = 2000 mm, K = 2 for the free "
            "end (this assumes 's0' holds the member against rotation; set "
            "effective_length_factor otherwise);")
    # the [checks] default K is for runs braced at both ends; a segment's own K overrides
    e, = buckling(strut(end_braced=False, checks="[checks]\neffective_length_factor = 0.7"))
    assert e.k_factor == 2.0
    e, = buckling(strut(end_braced=False, segment_extra="effective_length_factor = 2.1"))
    assert e.k_factor == 2.1
    assert "K = 2.1 (the segment's effective_length_factor)" in e.note_in(SHOWN)


def test_buckling_length_overrides_the_run():
    e, = buckling(strut(end_braced=False, segment_extra='buckling_length = "500 mm"'))
    assert e.buckling_length == pytest.approx(0.5) and e.k_factor == 1.0
    assert e.note_in(SHOWN).startswith("L = 500 mm (the segment's buckling_length), K = 1;")


RODS_AT_A_CONTACT = """
[sections.rod]
shape = "round"
diameter = "20 mm"
[stations]
left = "0 mm"
mid = "400 mm"
tip = "600 mm"
end = "600 mm"
right = "1000 mm"
[[segments]]
name = "r1"
from = "left"
to = "mid"
material = "structural-steel"
section = "rod"
[[segments]]
name = "r2"
from = "mid"
to = "tip"
material = "structural-steel"
section = "rod"
[[segments]]
name = "r3"
from = "end"
to = "right"
material = "structural-steel"
section = "rod"
[[supports]]
at = "left"
{kind}
[[supports]]
at = "right"
[[gaps]]
name = "butt"
between = ["tip", "end"]
clearance = "0 mm"
[[gaps]]
name = "stop"
at = "mid"
side = "+x"
clearance = "1 mm"
[settings]
temperature_change = "30 K"
"""


@pytest.mark.parametrize("kind", ["", 'kind = "spring"\nstiffness = "50 kN/mm"',
                                  'kind = "settlement"\ndisplacement = "0.01 mm"'])
def test_supports_brace_and_a_contact_ends_a_run(kind):
    model = parse_model(RODS_AT_A_CONTACT.format(kind=kind))
    assert braced_stations(model) == {"left", "right"}       # an `at` stop braces nothing
    r1, r2, r3 = braced_runs(model)
    assert r1 == r2
    assert (r1.start, r1.end, r1.length, r1.braced_ends) == ("left", "tip", pytest.approx(0.6), 1)
    assert (r3.start, r3.end, r3.length, r3.braced_ends) == ("end", "right", pytest.approx(0.4), 1)
    assert r1.free_end == "tip" and r3.free_end == "end" and r3.braced_end == "right"
    # heated between walls, the rods butt and are compressed: each a cantilever from its wall
    entries = buckling(model)
    assert [e.name for e in entries] == ["r1", "r2", "r3"]
    for e in entries:
        assert e.k_factor == 2.0 and e.ok is not None
    assert entries[0].buckling_length == pytest.approx(0.6)
    assert entries[2].buckling_length == pytest.approx(0.4)


def test_a_run_braced_at_neither_end_is_undecided():
    # a rod held only by a stop, pushed against it
    model = parse_model("""
[sections.rod]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = "300 mm"
[[segments]]
name = "rod"
from = "a"
to = "b"
material = "structural-steel"
section = "rod"
[[gaps]]
name = "low"
at = "a"
side = "-x"
clearance = "0 mm"
[[loads]]
at = "b"
force = "-1 kN"
""")
    e, = buckling(model)
    assert e.ok is None and e.utilization is None and e.capacity is None
    assert e.note_in(SHOWN) == ("run 'a'..'b' is braced at neither end: mark the stations that hold it "
                      "laterally with braced = true, or give the segment buckling_length")


def test_a_fork_beyond_a_segment_is_left_to_the_user():
    model = parse_model("""
[sections.rod]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
p = "300 mm"
q = "500 mm"
r = "700 mm"
[[segments]]
name = "stem"
from = "a"
to = "p"
material = "structural-steel"
section = "rod"
[[segments]]
name = "short"
from = "p"
to = "q"
material = "structural-steel"
section = "rod"
[[segments]]
name = "long"
from = "p"
to = "r"
material = "structural-steel"
section = "rod"
[[supports]]
at = "a"
[[loads]]
at = "q"
force = "-1 kN"
[[loads]]
at = "r"
force = "-1 kN"
""")
    stem = braced_runs(model)[0]
    assert (stem.start, stem.end, stem.fork, stem.braced_ends) == ("a", "r", "p", 1)
    e = buckling(model)[0]
    assert e.name == "stem" and e.ok is None and e.utilization is None
    assert e.note_in(SHOWN) == ("run 'a'..'r': the member forks beyond 'p' into ways that end at different "
                      "stations, so its braced run is not clear: give the segment buckling_length")


def test_parallel_parts_are_named_in_the_note():
    # a sleeve clamped by a bolt over the same stations
    model = parse_model("""
[sections.bolt]
shape = "round"
diameter = "12 mm"
[sections.sleeve]
shape = "tube"
outer_diameter = "24 mm"
inner_diameter = "13 mm"
[stations]
head = "0 mm"
nut = { x = "80 mm", braced = true }
tip = "200 mm"
[[segments]]
name = "bolt"
from = "head"
to = "nut"
material = "structural-steel"
section = "bolt"
misfit = "-0.05 mm"
[[segments]]
name = "sleeve"
from = "head"
to = "nut"
material = "aluminium-alloy"
section = "sleeve"
[[segments]]
name = "stub"
from = "nut"
to = "tip"
material = "structural-steel"
section = "bolt"
[[supports]]
at = "head"
""")
    assert parallel_segments(model) == (("sleeve",), ("bolt",), ())
    e, = buckling(model)
    assert e.name == "sleeve" and e.ok is True
    assert e.note_in(SHOWN).endswith(
        "; parallel to 'bolt': a part guided by another along its length (a sleeve on a bolt) "
        "is laterally supported there (common practice), which this check does not assume: set "
        "buckling_length or braced stations deliberately")


def test_a_stiffer_part_of_a_mixed_run_names_the_weaker_one():
    # the starter's stepped rod: both parts over the run 'left'..'right'
    from importlib import resources

    model = parse_model(resources.files("axialfe.cli").joinpath("templates", "stepped-bar.toml")
                        .read_text(encoding="utf-8"))
    thick, thin = buckling(model)
    assert thick.note_in(SHOWN).endswith("; the run also holds the weaker segment 'thin-part': this "
                               "capacity takes this segment's own section over the whole run, "
                               "which overstates a run of mixed sections")
    assert "weaker" not in thin.note_in(SHOWN)
    assert thick.buckling_length == thin.buckling_length == pytest.approx(0.5)


def test_long_chains_are_walked_once():
    # 3000 segments between two supports: one run, found without recursion
    model = strut(length_mm=3000.0, parts=3000)
    runs = braced_runs(model)
    assert len(set(runs)) == 1 and runs[0].length == pytest.approx(3.0)


# --- column curves -------------------------------------------------------------------
def test_curve_names_match_the_model():
    assert COLUMN_CURVES == (*CURVE_NAMES, "euler-only")


def test_johnson_meets_euler_at_the_tangency():
    # Johnson's parabola sigma = S_y - (S_y/(2 pi) * l/k)^2 / E is tangent to Euler's curve at
    # l/k = sqrt(2 pi^2 E / S_y), where both give S_y/2 (Shigley's Mechanical Engineering
    # Design, 9th ed., sec. 4-13, intermediate-length columns with central loading; from memory).
    t = johnson_tangency(E, FY)
    assert t == pytest.approx(math.pi * math.sqrt(2 * E / FY), rel=1e-15)
    assert t == pytest.approx(125.66, abs=0.01)
    below = FY - (FY / (2 * math.pi) * t) ** 2 / E
    assert below == pytest.approx(FY / 2, rel=1e-12)
    assert euler_stress(E, t) == pytest.approx(FY / 2, rel=1e-12)
    for s in (0.999 * t, t, 1.001 * t):     # continuous, and tangent: slopes agree at t
        assert johnson_stress(FY, E, s) == pytest.approx(euler_stress(E, s), rel=1e-5)
    h = 1e-6 * t
    slope_parabola = (johnson_stress(FY, E, t - h) - johnson_stress(FY, E, t - 2 * h)) / h
    slope_euler = (euler_stress(E, t + 2 * h) - euler_stress(E, t + h)) / h
    assert slope_parabola == pytest.approx(slope_euler, rel=1e-4)
    assert johnson_stress(FY, E, 1e-9) == pytest.approx(FY, rel=1e-12)
    assert johnson_stress(FY, E, 2 * t) == euler_stress(E, 2 * t)


@pytest.mark.parametrize("curve", list(IMPERFECTION))
def test_en1993_reduction_against_the_formula(curve):
    # EN 1993-1-1:2005, 6.3.1.2, eq. (6.49): Phi = 0.5 [1 + alpha (lam - 0.2) + lam^2],
    # chi = 1 / (Phi + sqrt(Phi^2 - lam^2)) <= 1, alpha from Table 6.1.
    alpha = {"en1993-a0": 0.13, "en1993-a": 0.21, "en1993-b": 0.34, "en1993-c": 0.49,
             "en1993-d": 0.76}[curve]
    assert IMPERFECTION[curve] == alpha
    assert en1993_reduction(0.2, alpha) == 1.0
    assert en1993_reduction(0.1, alpha) == 1.0               # the plateau, chi <= 1
    phi_1 = 0.5 * (1 + alpha * 0.8 + 1.0)
    assert en1993_reduction(1.0, alpha) == pytest.approx(1 / (phi_1 + math.sqrt(phi_1 ** 2 - 1)),
                                                         rel=1e-14)
    phi_2 = 0.5 * (1 + alpha * 1.8 + 4.0)
    assert en1993_reduction(2.0, alpha) == pytest.approx(1 / (phi_2 + math.sqrt(phi_2 ** 2 - 4)),
                                                         rel=1e-14)
    # and the Ayrton-Perry form the curves come from: (1 - chi)(1 - chi lam^2) = eta chi,
    # eta = alpha (lam - 0.2) (background of EN 1993-1-1, 6.3.1.2; from memory)
    for lam in (0.5, 1.0, 1.5, 2.0, 3.0):
        chi = en1993_reduction(lam, alpha)
        assert (1 - chi) * (1 - chi * lam ** 2) == pytest.approx(alpha * (lam - 0.2) * chi,
                                                                 rel=1e-10)


@pytest.mark.parametrize("curve, chi", [
    # chi at lam = 1.0 as tabulated in the design aids to EN 1993-1-1 (from memory)
    ("en1993-a0", 0.7253), ("en1993-a", 0.6656), ("en1993-b", 0.5970), ("en1993-c", 0.5399),
    ("en1993-d", 0.4671),
])
def test_en1993_reduction_against_tabulated_values(curve, chi):
    assert en1993_reduction(1.0, IMPERFECTION[curve]) == pytest.approx(chi, abs=5e-5)


def test_aisc360_switches_where_the_two_equations_meet():
    # ANSI/AISC 360-16, E3: F_cr = 0.658^(F_y/F_e) F_y for F_y/F_e <= 2.25 (E3-2), else
    # 0.877 F_e (E3-3); at the switch 0.658^2.25 = 0.38996 against 0.877/2.25 = 0.38978.
    fe = FY / 2.25
    assert aisc360_stress(FY, fe) == pytest.approx(0.658 ** 2.25 * FY, rel=1e-15)
    assert aisc360_stress(FY, fe) == pytest.approx(0.877 * fe, rel=5e-4)
    assert aisc360_stress(FY, fe * 0.999) == pytest.approx(0.877 * fe * 0.999, rel=1e-15)
    assert aisc360_stress(FY, fe * 1.001) == pytest.approx(0.658 ** (2.25 / 1.001) * FY, rel=1e-15)
    assert aisc360_stress(FY, 1e6 * FY) == pytest.approx(FY, rel=1e-6)
    # the switch is the slenderness 4.71 sqrt(E/F_y) of E3 (E3-4: F_e = pi^2 E / (L_c/r)^2)
    assert math.pi * math.sqrt(E / fe) == pytest.approx(4.71 * math.sqrt(E / FY), rel=1e-3)


@pytest.mark.parametrize("curve", CURVE_NAMES)
def test_no_curve_exceeds_the_squash_load(curve):
    for slender in (0.01, 1, 10, 40, 80, 88.86, 120, 125.66, 200, 400):
        s = column_strength(curve, E, FY, slender)
        assert 0 < s.stress <= FY and s.reduction == pytest.approx(s.stress / FY)
        assert s.stress <= euler_stress(E, slender) * (1 + 1e-12)   # nor the Euler stress
        lam = math.sqrt(FY / euler_stress(E, slender))
        assert s.relative_slenderness == (pytest.approx(lam) if curve in IMPERFECTION else None)


# --- the entries -----------------------------------------------------------------------
def test_a_stocky_strut_is_decided_below_the_squash_load():
    # 20 mm round, L = 200 mm braced at both ends: K*L/r = 40; Johnson (as above) gives
    # 250 - (250*40/(2 pi))^2/200000 = 237.33 MPa
    e, = buckling(strut(length_mm=200.0))
    sigma = FY - (FY * 40 / (2 * math.pi)) ** 2 / E
    assert e.capacity == pytest.approx(sigma * AREA, rel=1e-12)
    assert e.capacity < AREA * FY < math.pi ** 2 * E * INERTIA / 0.2 ** 2
    assert e.ok is True and e.curve == "johnson" and e.slenderness == pytest.approx(40)
    assert e.note_in(SHOWN) == ("run 's0'..'s1' braced at both ends: L = 200 mm, K = 1; johnson (parabola: "
                      "K*L/r = 40 below the tangency 125.7): sigma_cr = 0.9493*f_y, "
                      "capacity 74560 N")


@pytest.mark.parametrize("curve", list(IMPERFECTION))
def test_en1993_entry_takes_the_safety_factor_as_gamma_m1(curve):
    checks = f'[checks]\ncolumn_curve = "{curve}"\nsafety_factor = 1.1'
    e, = buckling(strut(length_mm=800.0, checks=checks, force="-20 kN"))
    lam = (160 / math.pi) * math.sqrt(FY / E)        # K*L/r = 800/5 over pi*sqrt(E/f_y)
    chi = en1993_reduction(lam, IMPERFECTION[curve])
    assert e.relative_slenderness == pytest.approx(lam, rel=1e-12)
    assert e.capacity == pytest.approx(chi * AREA * FY, rel=1e-12)
    assert e.utilization == pytest.approx(20e3 * 1.1 / (chi * AREA * FY), rel=1e-12)
    assert f"{curve} (alpha = {IMPERFECTION[curve]:g}, gamma_M1 = the safety factor)" in e.note_in(SHOWN)


def test_aisc360_entry():
    e, = buckling(strut(length_mm=500.0, checks='[checks]\ncolumn_curve = "aisc360"'))
    fe = math.pi ** 2 * E / 100 ** 2
    assert e.capacity == pytest.approx(0.658 ** (FY / fe) * FY * AREA, rel=1e-12)
    assert "aisc360 (eq. E3-2): K*L/r = 100" in e.note_in(SHOWN)
    e, = buckling(strut(length_mm=2000.0, checks='[checks]\ncolumn_curve = "aisc360"'))
    assert e.capacity == pytest.approx(0.877 * math.pi ** 2 * E / 400 ** 2 * AREA, rel=1e-12)
    assert "aisc360 (eq. E3-3)" in e.note_in(SHOWN)


@pytest.mark.parametrize("curve", COLUMN_CURVES)
def test_no_yield_strength_stays_undecided_on_every_curve(curve):
    model = parse_model(f"""
[checks]
column_curve = "{curve}"
[sections.rod]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = {{ x = "200 mm", braced = true }}
[[segments]]
name = "rod"
from = "a"
to = "b"
material = "grey-cast-iron"
section = "rod"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "-1 kN"
""")
    e, = buckling(model)
    assert e.ok is None and e.curve == curve
    assert "no yield strength given for material 'grey-cast-iron'" in e.note_in(SHOWN)


def test_json_of_a_buckling_entry(tmp_path):
    path = tmp_path / "strut.toml"
    path.write_text(f"""
[checks]
column_curve = "en1993-c"
[units]
length = "m"
[sections.rod]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
p = "400 mm"
b = {{ x = "800 mm", braced = true }}
[[segments]]
from = "a"
to = "p"
material = "structural-steel"
section = "rod"
[[segments]]
from = "p"
to = "b"
material = "structural-steel"
section = "rod"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "-10 kN"
""", encoding="utf-8")
    for command in ("check", "solve"):
        result = runner.invoke(app, [command, str(path), "--format", "json"])
        data = json.loads(result.stdout)
        entries = [c for c in data["cases"][0]["checks"] if c["kind"] == "buckling"]
        assert [c["name"] for c in entries] == ["a-p", "p-b"]
        for c in entries:
            assert c["curve"] == "en1993-c"
            assert c["buckling_length"] == pytest.approx(0.8, rel=1e-12)     # in m, before K
            assert c["effective_length_factor"] == 1.0
            assert c["slenderness"] == pytest.approx(160, rel=1e-12)
            assert c["relative_slenderness"] == pytest.approx(160 / (math.pi * math.sqrt(800)),
                                                              rel=1e-12)
            assert c["ok"] is True and "chi = " in c["note"]
    result = runner.invoke(app, ["check", str(path), "--format", "json", "--length-unit", "mm"])
    c = json.loads(result.stdout)["cases"][0]["checks"][-1]
    assert c["buckling_length"] == pytest.approx(800, rel=1e-12)


# --- input --------------------------------------------------------------------------------
def test_station_checks_its_bracing():
    from axialfe.model import Station

    assert Station("a", 0.0).braced is False
    with pytest.raises(ModelError) as err:
        Station("a", 0.0, braced=1)
    assert str(err.value) == "stations.a: braced must be true or false: got 1"


def test_station_as_a_table():
    model = strut(parts=2, braced_at=(1,))
    assert [(s.name, s.x, s.braced) for s in model.stations] == [
        ("s0", 0.0, False), ("s1", pytest.approx(1.0), True), ("s2", pytest.approx(2.0), True)]
    assert CheckSettings().column_curve == "johnson"


@pytest.mark.parametrize("entry, message", [
    ('b = { x = "1 m", bracd = true }', "m.toml:5: stations.b: unknown key 'bracd'; did you mean "
                                         "'braced'?"),
    ('b = { braced = true }', "m.toml:5: stations.b: a station given as a table needs 'x' "
                              "(its position)"),
    ('b = { x = "1 m", braced = "yes" }', "m.toml:5: stations.b: braced: expected true or false: "
                                          "got 'yes'"),
    ('b = { x = "1", braced = true }', "m.toml:5: stations.b: x: '1' has no unit: give a length, "
                                       "e.g. '40 mm'"),
])
def test_station_table_errors(entry, message):
    with pytest.raises(ModelError) as err:
        parse_model(f"""[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
{entry}
a = "0 mm"
[[segments]]
from = "a"
to = "b"
material = "structural-steel"
section = "s"
[[supports]]
at = "a"
""", "m.toml")
    assert str(err.value) == message


def test_unknown_column_curve_is_one_located_error(tmp_path):
    with pytest.raises(ModelError) as err:
        strut(checks='[checks]\ncolumn_curve = "en1993b"')
    assert str(err.value) == ("strut.toml:3: checks: column_curve: unknown column curve "
                              "'en1993b'; did you mean 'en1993-b'?")
    with pytest.raises(ModelError) as err:
        strut(checks='[checks]\ncolumn_curve = "spline"')
    assert str(err.value) == (
        "strut.toml:3: checks: column_curve: unknown column curve 'spline'; expected one of: "
        "'johnson', 'en1993-a0', 'en1993-a', 'en1993-b', 'en1993-c', 'en1993-d', 'aisc360', "
        "'euler-only'")
    path = tmp_path / "m.toml"
    path.write_text('[checks]\ncolumn_curve = "jonson"\n[sections.s]\nshape = "round"\n'
                    'diameter = "20 mm"\n[stations]\na = "0 mm"\nb = "1 m"\n[[segments]]\n'
                    'from = "a"\nto = "b"\nmaterial = "structural-steel"\nsection = "s"\n'
                    '[[supports]]\nat = "a"\n', encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2
    assert result.stderr.strip().splitlines() == [
        f"error: {path}:2: checks: column_curve: unknown column curve 'jonson'; did you mean "
        "'johnson'?"]


def test_readme_check_excerpt_is_what_the_tool_prints():
    from pathlib import Path

    root = Path(__file__).resolve().parent.parent
    readme = (root / "README.md").read_text(encoding="utf-8")
    command = "$ axialfe check docs/clamped-spacer.toml\n"
    excerpt = readme[readme.index(command) + len(command):].split("\n```", 1)[0]
    result = runner.invoke(app, ["check", str(root / "docs" / "clamped-spacer.toml")])
    assert result.exit_code == 0, result.output
    assert excerpt in result.stdout
    assert excerpt.startswith(" checks of case 'base'") and "(overall: pass)" in excerpt
    assert max(len(line) for line in result.stdout.splitlines()) <= 120
