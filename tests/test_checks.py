"""Design checks: strength, Euler buckling, deformation limits, governing entry, `axialfe check`."""

import json
import math

import pytest
from typer.testing import CliRunner

from axialfe import ModelError, parse_model, solve
from axialfe.checks import check_case, check_solution
from axialfe.cli import app
from axialfe.model import Limit
from axialfe.io.modelfile import builtin_materials
from axialfe.units import OutputUnits

SHOWN = OutputUnits()   # the default output units: notes show lengths in mm

runner = CliRunner()

KSI = 6.894757293168361e6   # Pa; NIST SP 811 (1 ksi = 6.894757 MPa)


def strut(*, length="1000 mm", section='shape = "round"\ndiameter = "20 mm"', force="-5 kN",
          material="structural-steel", checks="", extra="", segment_extra=""):
    """A strut fixed at 'a' with an axial load at 'b', braced laterally at both (pinned-pinned)."""
    return parse_model(f"""
title = "strut"
{checks}
[sections.s]
{section}
[stations]
a = "0 mm"
b = {{ x = "{length}", braced = true }}
[[segments]]
name = "strut"
from = "a"
to = "b"
material = "{material}"
section = "s"
{segment_extra}
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "{force}"
{extra}
""", "strut.toml")


def entries(model, kind=None, case="base"):
    out = check_case(solve(model)[case])
    return [e for e in out if kind is None or e.kind == kind]


# --- Euler buckling --------------------------------------------------------------
def test_euler_pinned_pinned_load():
    # Euler load of a pinned-pinned column P_cr = pi^2 E I / L^2 (Timoshenko and Gere,
    # Theory of Elastic Stability, 2nd ed., section 2.1; from memory).
    e, = entries(strut(), "buckling")
    inertia = math.pi * 0.020 ** 4 / 64
    p_cr = math.pi ** 2 * 200e9 * inertia / 1.0 ** 2
    assert e.capacity == pytest.approx(p_cr, rel=1e-12)
    assert e.utilization == pytest.approx(5e3 / p_cr, rel=1e-12)
    assert e.demand == pytest.approx(5e3, rel=1e-12)
    assert e.k_factor == 1.0 and e.buckling_length == pytest.approx(1.0)
    assert e.ok is True
    assert e.curve == "johnson"      # slender: the Euler branch of the default curve
    assert e.note_in(SHOWN) == ("run 'a'..'b' braced at both ends: L = 1000 mm, K = 1; johnson (Euler "
                      "branch: K*L/r = 200 at or above the tangency 125.7): sigma_cr = "
                      "0.1974*f_y, capacity 15500 N")  # pi^2*E/200^2 = 49.35 MPa


@pytest.mark.parametrize("k, coefficient, rel", [
    # Ideal end conditions (Timoshenko and Gere, Theory of Elastic Stability, 2nd ed., ch. 2;
    # from memory): fixed-fixed 4 pi^2 EI/L^2 (K = 0.5), fixed-pinned 20.19 EI/L^2 (the root
    # of tan(kL) = kL; K = 0.7 is the rounded design value, within 0.3 %), fixed-free
    # pi^2 EI/(4 L^2) (K = 2), pinned-pinned pi^2 EI/L^2 (K = 1).
    (0.5, 4 * math.pi ** 2, 1e-12),
    (0.7, 20.19, 3e-3),
    (2.0, math.pi ** 2 / 4, 1e-12),
    (1.0, math.pi ** 2, 1e-12),
])
def test_effective_length_factors_of_ideal_ends(k, coefficient, rel):
    model = strut(segment_extra=f"effective_length_factor = {k}",
                  checks='[checks]\ncolumn_curve = "euler-only"')
    e, = entries(model, "buckling")
    EI = 200e9 * math.pi * 0.020 ** 4 / 64
    assert e.capacity == pytest.approx(coefficient * EI / 1.0 ** 2, rel=rel)
    assert e.k_factor == k


def test_default_k_from_checks_table_and_segment_override():
    model = strut(checks="[checks]\neffective_length_factor = 2.0")
    e, = entries(model, "buckling")
    assert e.k_factor == 2.0
    model = strut(checks="[checks]\neffective_length_factor = 2.0",
                  segment_extra="effective_length_factor = 0.5")
    assert entries(model, "buckling")[0].k_factor == 0.5


def test_buckling_length_replaces_segment_length():
    model = strut(segment_extra='buckling_length = "2000 mm"')
    e, = entries(model, "buckling")
    EI = 200e9 * math.pi * 0.020 ** 4 / 64
    assert e.buckling_length == pytest.approx(2.0)
    assert e.capacity == pytest.approx(math.pi ** 2 * EI / 2.0 ** 2, rel=1e-12)


def test_rectangle_buckles_about_its_weaker_axis():
    # Smaller principal second moment of a rectangle b*h^3/12 with h the smaller side
    # (common practice).
    model = strut(section='shape = "rectangle"\nwidth = "30 mm"\nheight = "10 mm"',
                  length="2000 mm", force="-1 kN")
    e, = entries(model, "buckling")
    inertia = 0.030 * 0.010 ** 3 / 12
    assert e.capacity == pytest.approx(math.pi ** 2 * 200e9 * inertia / 2.0 ** 2, rel=1e-12)


def test_area_section_with_and_without_second_moment():
    model = strut(section='shape = "area"\narea = "314.16 mm^2"\nsecond_moment = "7854 mm^4"')
    e, = entries(model, "buckling")
    assert e.capacity == pytest.approx(math.pi ** 2 * 200e9 * 7854e-12, rel=1e-12)
    assert e.ok is True
    model = strut(section='shape = "area"\narea = "314.16 mm^2"')
    e, = entries(model, "buckling")
    assert e.ok is None and e.utilization is None and e.capacity is None
    assert e.note_in(SHOWN) == ("second moment of area missing: section 's' gives only an area; "
                      "add second_moment to check buckling")


def test_tension_gets_no_buckling_entry():
    assert entries(strut(force="5 kN"), "buckling") == []
    assert len(entries(strut(force="5 kN"), "strength")) == 1


def test_buckling_fails_above_euler_load():
    # 20 mm round, 1 m: P_cr = 15.50 kN (pi^2 E I / L^2); 20 kN is above it.
    e, = entries(strut(force="-20 kN"), "buckling")
    assert e.utilization > 1 and e.ok is False


def test_safety_factor_scales_buckling_utilization():
    base, = entries(strut(), "buckling")
    factored, = entries(strut(checks="[checks]\nsafety_factor = 1.5"), "buckling")
    assert factored.utilization == pytest.approx(1.5 * base.utilization, rel=1e-12)


def test_euler_only_leaves_stocky_struts_undecided():
    # The Euler stress pi^2 E/(KL/r)^2 reaches f_y at KL/r = pi*sqrt(E/f_y): 88.86 for
    # E = 200 GPa, f_y = 250 MPa (common practice; e.g. Gere and Goodno, Mechanics of
    # Materials, columns chapter, from memory).  A 20 mm round has r = d/4 = 5 mm.
    limit = math.pi * math.sqrt(200e9 / 250e6)
    below = 0.99 * limit * 5.0   # mm
    above = 1.01 * limit * 5.0
    euler_only = '[checks]\ncolumn_curve = "euler-only"'
    e, = entries(strut(length=f"{below} mm", force="-1 kN", checks=euler_only), "buckling")
    assert e.slenderness == pytest.approx(0.99 * limit, rel=1e-9)
    assert e.slenderness_limit == pytest.approx(88.857658763167, rel=1e-12)
    assert e.ok is None and e.utilization is not None and e.utilization < 1
    assert "below the Euler limit pi*sqrt(E/f_y) = 88.86" in e.note_in(SHOWN)
    assert "inelastic column curve from the applicable code governs" in e.note_in(SHOWN)
    assert e.curve == "euler-only" and e.capacity > 250e6 * math.pi * 0.01 ** 2
    e, = entries(strut(length=f"{above} mm", force="-1 kN", checks=euler_only), "buckling")
    assert e.ok is True
    # the default curve decides the stocky strut, with a capacity below the squash load
    e, = entries(strut(length=f"{below} mm", force="-1 kN"), "buckling")
    assert e.ok is True and e.curve == "johnson"
    assert e.capacity < 250e6 * math.pi * 0.01 ** 2


def test_no_yield_strength_leaves_buckling_undecided_and_strength_unchecked():
    # strength entries exist only where a yield strength is known; the basis names the rest
    from axialfe.checks import check_solution

    model = strut(material="grey-cast-iron", length="3000 mm", force="-1 kN")
    b, = entries(model, "buckling")
    assert entries(model, "strength") == []
    assert b.ok is None and b.utilization is not None
    assert ("neither the column curve nor the slenderness limit pi*sqrt(E/f_y) of the Euler "
            "formula is known") in b.note_in(SHOWN)
    report = check_solution(solve(model))
    assert report.unchecked == (model.segments[0].name,)
    # a strength that cannot be checked is never a pass, even with nothing else to check
    tension = strut(material="grey-cast-iron", length="3000 mm", force="1 kN")
    assert check_solution(solve(tension)).status == "undecided"
    assert report.settings_text().endswith(
        f"; strength NOT checked (no yield strength given): '{model.segments[0].name}'")


def test_taper_uses_the_weaker_end():
    model = parse_model("""
[sections.big]
shape = "round"
diameter = "30 mm"
[sections.small]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = { x = "2000 mm", braced = true }
[[segments]]
from = "a"
to = "b"
material = "structural-steel"
section = "big"
end_section = "small"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "-1 kN"
""")
    e, = entries(model, "buckling")
    assert e.capacity == pytest.approx(math.pi ** 2 * 200e9 * math.pi * 0.02 ** 4 / 64 / 4,
                                       rel=1e-12)


# --- strength ----------------------------------------------------------------------
BUILTIN_YIELD = [
    # (material, yield in Pa, the same in ksi, source)
    ("structural-steel", 250e6, 36, "ASTM A36/A36M: minimum yield 36 ksi [250 MPa]"),
    ("stainless-steel", 205e6, 30, "ASTM A240/A240M type 304: minimum 0.2 % proof 30 ksi [205 MPa]"),
    ("aluminium-alloy", 240e6, 35, "ASTM B221 6061-T6: minimum yield 35 ksi [240 MPa]"),
    ("titanium-alloy", 828e6, 120, "ASTM B348 Grade 5: minimum yield 120 ksi [828 MPa]"),
]


@pytest.mark.parametrize("name, pa, ksi, source", BUILTIN_YIELD)
def test_builtin_yield_strengths_against_their_standards(name, pa, ksi, source):
    # Each standard gives both the metric and the inch-pound minimum (source in the row).
    mat = builtin_materials()[name]
    assert mat.yield_strength == pytest.approx(pa, rel=1e-12)
    assert mat.yield_strength == pytest.approx(ksi * KSI, rel=0.01)
    assert source.split(":")[0].split(" type")[0].split(" 6061")[0].split(" Grade")[0] in mat.source


def test_builtin_without_standard_are_marked_typical():
    mats = builtin_materials()
    for name in ("copper", "brass", "bronze", "grey-cast-iron"):
        assert "typical value, from memory" in mats[name].source
    assert mats["grey-cast-iron"].yield_strength is None


def restrained_bar(dT, sf=None):
    checks = f"[checks]\nsafety_factor = {sf}" if sf else ""
    return parse_model(f"""
{checks}
[settings]
temperature_change = "{dT} K"
[sections.s]
shape = "round"
diameter = "25 mm"
[stations]
a = "0 mm"
b = "750 mm"
[[segments]]
name = "bar"
from = "a"
to = "b"
material = "structural-steel"
section = "s"
[[supports]]
at = "a"
[[supports]]
at = "b"
""")


def test_restrained_bar_heated_to_first_yield():
    # A fully restrained bar heated by dT carries sigma = -E*alpha*dT, so it first yields at
    # dT_y = f_y/(E*alpha) (Gere and Goodno, Mechanics of Materials, thermal effects;
    # from memory): 250 MPa / (200 GPa * 11.7e-6 /K) = 106.84 K.
    dT_y = 250e6 / (200e9 * 11.7e-6)
    e, = entries(restrained_bar(dT_y), "strength")
    assert e.utilization == pytest.approx(1.0, rel=1e-12)
    assert e.demand == pytest.approx(250e6, rel=1e-12)
    low, = entries(restrained_bar(0.999 * dT_y), "strength")
    high, = entries(restrained_bar(1.001 * dT_y), "strength")
    assert low.ok is True and high.ok is False
    assert high.utilization == pytest.approx(1.001, rel=1e-12)
    # with a safety factor of 1.5 the limit is reached at dT_y / 1.5
    e, = entries(restrained_bar(dT_y / 1.5, sf=1.5), "strength")
    assert e.utilization == pytest.approx(1.0, rel=1e-12)


def test_strength_takes_the_larger_end():
    model = strut(section='shape = "round"\ndiameter = "20 mm"', force="5 kN",
                  segment_extra='distributed_load = "10 kN/m"')
    e, = entries(model, "strength")
    res = solve(model)["base"]
    assert e.demand == pytest.approx(abs(res.stress[0]).max(), rel=1e-15)
    assert abs(res.stress[0, 0]) != pytest.approx(abs(res.stress[0, 1]))


# --- deformation limits ------------------------------------------------------------
LIMITS_MODEL = """
[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = "1000 mm"
[[segments]]
name = "rod"
from = "a"
to = "b"
material = "structural-steel"
section = "s"
[[supports]]
at = "a"
[[gaps]]
name = "stop"
at = "b"
side = "+x"
clearance = "0.2 mm"
[[cases]]
name = "light"
loads = [{{ at = "b", force = "{light}" }}]
[[cases]]
name = "heavy"
loads = [{{ at = "b", force = "30 kN" }}]
[[limits]]
at = "b"
displacement = "{allow}"
[[limits]]
gap = "stop"
min_opening = "{need}"
"""


def limits_model(light="5 kN", allow="0.1 mm", need="0.05 mm"):
    return parse_model(LIMITS_MODEL.format(light=light, allow=allow, need=need))


def test_displacement_limit():
    # tip of a determinate bar: u = P L/(E A) (the textbook sum N L/(E A)).
    model = limits_model()
    u = 5e3 * 1.0 / (200e9 * math.pi * 0.02 ** 2 / 4)
    d, = [e for e in entries(model, "displacement", "light")]
    assert d.utilization == pytest.approx(u / 0.1e-3, rel=1e-9)
    assert d.ok is True and d.note_in(SHOWN) is None
    d, = entries(limits_model(allow="0.05 mm"), "displacement", "light")
    assert d.ok is False and d.utilization > 1


def test_gap_limit_open_and_closed():
    model = limits_model()
    u = 5e3 * 1.0 / (200e9 * math.pi * 0.02 ** 2 / 4)
    g, = entries(model, "gap", "light")
    assert g.utilization == pytest.approx(0.05e-3 / (0.2e-3 - u), rel=1e-9)
    assert g.ok is True
    g, = entries(limits_model(need="0.2 mm"), "gap", "light")
    assert g.ok is False and g.utilization > 1
    g, = entries(model, "gap", "heavy")       # 30 kN closes the 0.2 mm gap
    assert g.utilization is None and g.ok is False
    assert g.note_in(SHOWN) == "the gap is closed; it must keep an opening of at least 0.05 mm"


def test_no_safety_factor_on_limits():
    plain = entries(limits_model(), "displacement", "light")[0]
    model = parse_model("[checks]\nsafety_factor = 2.0\n" + LIMITS_MODEL.format(
        light="5 kN", allow="0.1 mm", need="0.05 mm"))
    assert entries(model, "displacement", "light")[0].utilization == plain.utilization


def test_governing_is_the_highest_utilization_over_cases():
    report = check_solution(solve(limits_model()))
    best = max((e for e in report.entries if e.utilization is not None),
               key=lambda e: e.utilization)
    assert report.governing is best
    assert report.governing.case == "heavy"
    assert report.governing_dict() == {"kind": best.kind, "name": best.name, "case": "heavy",
                                       "utilization": best.utilization}


def test_limit_validation_messages():
    with pytest.raises(ModelError) as err:
        Limit(at="b", displacement=1e-3, min_opening=1e-4)
    assert str(err.value) == "limits: 'min_opening' belongs to a limit on a gap, not at a station"
    with pytest.raises(ModelError) as err:
        Limit(gap="g", min_opening=0.0)
    assert str(err.value) == "limits: min_opening must be positive: got 0"
    with pytest.raises(ModelError) as err:
        Limit(gap="g", min_opening=1e-4, displacement=1e-3)
    assert str(err.value) == "limits: 'displacement' belongs to a limit at a station, not on a gap"


def test_checks_table_errors_in_file():
    with pytest.raises(ModelError) as err:
        strut(checks="[checks]\nsafety_factr = 1.5")
    assert str(err.value) == ("strut.toml:4: checks: unknown key 'safety_factr'; "
                              "did you mean 'safety_factor'?")
    with pytest.raises(ModelError) as err:
        strut(checks='[checks]\nsafety_factor = "1.5"')
    assert str(err.value) == "strut.toml:4: checks: safety_factor: expected a plain number: got '1.5'"


# --- output and the command line ----------------------------------------------------
def write(tmp_path, model_text, name="m.toml"):
    path = tmp_path / name
    path.write_text(model_text, encoding="utf-8")
    return path


def strut_text(force, length="1000 mm"):
    return f"""
title = "strut"
[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = {{ x = "{length}", braced = true }}
[[segments]]
name = "strut"
from = "a"
to = "b"
material = "structural-steel"
section = "s"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "{force}"
"""


def test_solve_json_has_checks_and_governing(tmp_path):
    path = write(tmp_path, strut_text("-5 kN"))
    result = runner.invoke(app, ["solve", str(path), "--format", "json"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    checks = data["cases"][0]["checks"]
    assert [c["kind"] for c in checks] == ["strength", "buckling"]
    assert set(checks[0]) == {"kind", "name", "utilization", "ok", "note", "at", "demand", "capacity",
                              "unit"}
    assert set(checks[1]) == {"kind", "name", "utilization", "ok", "note", "curve",
                              "buckling_length", "effective_length_factor", "slenderness",
                              "relative_slenderness", "demand", "capacity", "unit"}
    # a uniform strut: the stress is the same along it, so "at" is its least x (mm)
    assert checks[0] == {"kind": "strength", "name": "strut",
                         "utilization": pytest.approx(5e3 / (math.pi * 0.01 ** 2) / 250e6),
                         "ok": True, "note": None, "at": 0.0,
                         "demand": pytest.approx(5e3 / (math.pi * 0.01 ** 2) / 1e6),
                         "capacity": 250.0, "unit": "MPa"}
    assert set(data["governing"]) == {"kind", "name", "case", "utilization"}
    assert data["governing"]["kind"] == "buckling" and data["governing"]["case"] == "base"


def test_solve_table_shows_checks(tmp_path):
    path = write(tmp_path, strut_text("-5 kN"))
    result = runner.invoke(app, ["solve", str(path)])
    assert result.exit_code == 0
    assert " checks of case 'base'" in result.stdout
    assert "governing check: buckling of 'strut' in case 'base'" in result.stdout
    assert "safety factor 1 (default)" in result.stdout
    assert "K = 1 (default)" in result.stdout


@pytest.mark.parametrize("force, length, code, status", [
    ("5 kN", "1000 mm", 0, "pass"),            # tension, strength only, passes
    ("-5 kN", "1000 mm", 0, "pass"),           # slender strut, Euler applies, passes
    ("-20 kN", "1000 mm", 1, "fail"),          # above the Euler load
    ("80 kN", "1000 mm", 1, "fail"),           # 255 MPa > 250 MPa
    ("-1 kN", "200 mm", 0, "pass"),            # stocky: KL/r = 40, decided by Johnson's parabola
    ("-76 kN", "200 mm", 1, "fail"),           # stocky: above the parabola (74.56 kN), below A*f_y
    ("-1 kN", "200 mm", 3, "undecided"),       # no yield strength: no column curve
])
def test_check_exit_codes(tmp_path, force, length, code, status):
    text = strut_text(force, length)
    if status == "undecided":
        text = text.replace("structural-steel", "grey-cast-iron")
    path = write(tmp_path, text)
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == code, result.output
    assert f"(overall: {status})" in result.stdout
    assert "cautions:" in result.stdout
    result = runner.invoke(app, ["check", str(path), "--format", "json"])
    assert result.exit_code == code
    data = json.loads(result.stdout)
    assert data["status"] == status
    assert data["cases"][0]["name"] == "base"


def test_check_input_error_exit_2(tmp_path):
    path = write(tmp_path, strut_text("-5 kN").replace('material = "structural-steel"',
                                                       'material = "structural-stel"'))
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2
    assert result.stderr.strip().splitlines() == [
        f"error: {path}:13: segments[1] ('strut'): unknown material 'structural-stel'; "
        "did you mean 'structural-steel'?"]


def test_json_nulls_for_undecided_entries(tmp_path):
    path = write(tmp_path, strut_text("-1 kN", "3000 mm").replace("structural-steel",
                                                                   "grey-cast-iron"))
    result = runner.invoke(app, ["solve", str(path), "--format", "json"])
    data = json.loads(result.stdout)
    buckling, = data["cases"][0]["checks"]  # no strength entry without a yield strength
    assert buckling["kind"] == "buckling"
    assert buckling["ok"] is None and buckling["utilization"] > 0
    # the governing entry is the one with a utilization
    assert data["governing"]["kind"] == "buckling"
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 3


def test_governing_line_names_a_failure_without_utilization():
    # the heavy case closes the stop, which must keep 0.05 mm: a failure with no utilization
    from axialfe.output.text import checks_table

    report = check_solution(solve(limits_model(allow="10 mm")))
    assert report.status == "fail"
    text = checks_table(report, report_units())
    # the governing paragraph, its wrapped lines joined
    line = text[text.index("governing check: "):text.index("\nchecks: ")].replace("\n  ", " ")
    assert line.endswith("; FAILING without a utilization: gap of 'stop' in case 'heavy'")


def report_units():
    from axialfe.units import OutputUnits

    return OutputUnits()


# --- the amounts behind each check, in JSON and CSV ----------------------------------------
AMOUNTS = """title = "rod against a stop"
[units]
force = "kN"
[materials.m]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
yield_strength = "250 MPa"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
wall = "0 mm"
tip = "1000 mm"
[[segments]]
name = "rod"
from = "wall"
to = "tip"
material = "m"
section = "s"
[[supports]]
at = "wall"
[[gaps]]
name = "stop"
at = "tip"
side = "+x"
clearance = "0.1 mm"
[[loads]]
at = "tip"
force = "1 kN"
[[limits]]
at = "tip"
displacement = "0.1 mm"
[[limits]]
gap = "stop"
min_opening = "0.02 mm"
"""


def test_check_amounts_in_json_and_csv(cli, tmp_path):
    # A 1 kN pull on a rod of E*A = 2e7 N, 1 m long: sigma = 10 MPa, u = P*L/(E*A) = 0.05 mm
    # (Gere and Goodno, Mechanics of Materials, eq. 2-3), so the stop 0.1 mm away keeps 0.05 mm.
    import csv
    import io
    import json

    path = tmp_path / "rod.toml"
    path.write_text(AMOUNTS, encoding="utf-8")
    res = cli("check", path, "-f", "json")
    assert res.exit_code == 0, res.output
    checks = {c["kind"]: c for c in json.loads(res.stdout)["cases"][0]["checks"]}
    strength = checks["strength"]
    assert (strength["demand"], strength["capacity"], strength["unit"]) == (
        pytest.approx(10.0, rel=1e-9), 250.0, "MPa")
    disp = checks["displacement"]
    assert "demand" not in disp and disp["unit"] == "mm"
    assert (disp["required"], disp["actual"], disp["margin"]) == (
        pytest.approx(0.1), pytest.approx(0.05, rel=1e-9), pytest.approx(0.05, rel=1e-9))
    gap = checks["gap"]
    assert (gap["required"], gap["actual"], gap["margin"]) == (
        pytest.approx(0.02), pytest.approx(0.05, rel=1e-9), pytest.approx(0.03, rel=1e-9))
    for command in (("check", path, "-f", "csv"), ("solve", path, "-f", "csv")):
        rows = [r for r in csv.reader(io.StringIO(cli(*command).stdout)) if r[1] == "check"]
        by = {(r[2], r[3]): (r[5], r[6]) for r in rows}
        assert by[("rod", "strength capacity")] == ("250.0", "MPa")
        assert by[("rod", "strength result")] == ("pass", "")
        assert float(by[("tip", "displacement margin")][0]) == pytest.approx(0.05, rel=1e-9)
        assert by[("stop", "gap required")][1] == "mm"
        assert float(by[("stop", "gap utilization")][0]) == pytest.approx(0.4, rel=1e-9)
    solved = json.loads(cli("solve", path, "-f", "json").stdout)
    assert solved["cases"][0]["checks"][0]["capacity"] == 250.0


def test_a_closed_gap_limit_has_a_negative_margin():
    from axialfe.checks.entries import CheckEntry
    from axialfe.units import OutputUnits

    entry = CheckEntry("gap", "stop", "base", None, False, "closed", "displacement", 2e-5, 0.0)
    assert entry.amounts(OutputUnits()) == {"required": pytest.approx(0.02), "actual": 0.0,
                                            "margin": pytest.approx(-0.02), "unit": "mm"}
