"""A preload is a force: the misfit that gives it, found from the model's own response."""

import json
import math

import pytest
from typer.testing import CliRunner

import axialfe
from axialfe.cli import app
from axialfe.errors import ModelError
from axialfe.io.modelfile import parse_model

runner = CliRunner()

Eb, ab, Es, a_s = 200e9, 11.7e-6, 68.9e9, 23.6e-6  # built-in structural-steel and aluminium-alloy
A_SHANK, A_THREAD = math.pi * 0.016**2 / 4, 157e-6
A_SLEEVE = math.pi * (0.030**2 - 0.017**2) / 4
K_B = 1 / (0.040 / (Eb * A_SHANK) + 0.024 / (Eb * A_THREAD))
K_S = Es * A_SLEEVE / 0.064


def bolt_and_sleeve(preload="25 kN", gap=None, extra="", sleeve_to="nut", settings=""):
    """The bolt and sleeve of examples/bolt-and-sleeve-heated.toml with a preload."""
    stations = 'head = "0 mm"\nthread-start = "40 mm"\nnut = "64 mm"\n'
    if sleeve_to != "nut":
        stations += f'{sleeve_to} = "64 mm"\n'
    text = f"""
title = "preloaded bolt and sleeve"
{settings}
[sections.shank]
shape = "round"
diameter = "16 mm"
[sections.thread]
shape = "area"
area = "157 mm^2"
[sections.sleeve]
shape = "tube"
outer_diameter = "30 mm"
inner_diameter = "17 mm"
[stations]
{stations}
[[segments]]
name = "bolt-shank"
from = "head"
to = "thread-start"
material = "structural-steel"
section = "shank"
[[segments]]
name = "bolt-thread"
from = "thread-start"
to = "nut"
material = "structural-steel"
section = "thread"
preload = "{preload}"
[[segments]]
name = "sleeve"
from = "head"
to = "{sleeve_to}"
material = "aluminium-alloy"
section = "sleeve"
[[supports]]
at = "head"
{gap or ""}
{extra}
"""
    return parse_model(text, "bolt.toml")


CONTACT = """[[gaps]]
name = "interface"
between = ["sleeve-end", "nut"]
clearance = "{c}"
"""


def test_bolt_and_sleeve_preload_misfit():
    # two parallel springs closed in a loop: F = -misfit / (1/k_b + 1/k_s), so the misfit of a
    # preload F is -F*(1/k_b + 1/k_s), the bolt made short (Gere and Goodno, 8th ed., 2.5,
    # bolt and sleeve; 1/k_b the series sum of L/(E*A) of shank and thread)
    F = 25e3
    solution = axialfe.solve(bolt_and_sleeve())
    case = solution["base"]
    assert case.force("bolt-thread") == pytest.approx([F, F], rel=1e-9)
    assert case.force("sleeve") == pytest.approx([-F, -F], rel=1e-9)
    misfit = solution.model.segments[1].misfit
    assert misfit == pytest.approx(-F * (1 / K_B + 1 / K_S), rel=1e-9)
    seg = {s["name"]: s for s in case.to_dict()["segments"]}
    assert seg["bolt-thread"]["preload_misfit"] == pytest.approx(misfit * 1e3, rel=1e-12)  # mm
    assert "preload_misfit" not in seg["sleeve"]


def test_preload_changes_under_heating_by_the_closed_form():
    # thermal change of preload, dF = (alpha_s - alpha_b)*dT*L * k_b*k_s/(k_b + k_s)
    # (Shigley's Mechanical Engineering Design, 10th ed., 8-7, the bolt and member springs
    # in series carrying the free mismatch; from memory)
    dT, L, F = 70.0, 0.064, 25e3
    model = bolt_and_sleeve(settings='[settings]\ntemperature_change = "70 K"')
    case = axialfe.solve(model)["base"]
    dF = (a_s - ab) * dT * L * K_B * K_S / (K_B + K_S)
    assert case.force("bolt-thread")[0] == pytest.approx(F + dF, rel=1e-9)
    # the preload holds in the installed state, not in the heated one
    assert abs(case.force("bolt-thread")[0] - F) > 1e3


def test_preload_across_a_contact_interface():
    F = 25e3
    for c, extra in (("0 mm", 0.0), ("0.05 mm", 0.05e-3)):
        model = bolt_and_sleeve(gap=CONTACT.format(c=c), sleeve_to="sleeve-end")
        solution = axialfe.solve(model)
        case = solution["base"]
        assert case.force("bolt-thread")[0] == pytest.approx(F, rel=1e-9)
        assert case.gap("interface")["state"] == "closed"
        # a clearance is taken up first: the bolt is made shorter by it as well
        assert solution.model.segments[1].misfit == pytest.approx(
            -F * (1 / K_B + 1 / K_S) - extra, rel=1e-9)


def test_a_separated_contact_leaves_the_bolt_the_whole_load():
    # a pull beyond the separation load F/(1 - C) opens the interface: the sleeve carries
    # nothing and the bolt the whole load (the bonded model would put tension in the sleeve)
    F, P = 25e3, 200e3
    C = K_B / (K_B + K_S)
    assert P > F / (1 - C)
    load = '[[loads]]\nat = "nut"\nforce = "200 kN"'
    model = bolt_and_sleeve(gap=CONTACT.format(c="0 mm"), sleeve_to="sleeve-end", extra=load)
    case = axialfe.solve(model)["base"]
    assert case.gap("interface")["state"] == "open"
    assert case.force("sleeve")[0] == 0.0
    assert case.force("bolt-thread")[0] == pytest.approx(P, rel=1e-9)
    # bonded, the sleeve would hold the opened joint in tension and the bolt look safer
    bonded = axialfe.solve(bolt_and_sleeve(extra=load))["base"]
    assert bonded.force("sleeve")[0] > 0
    assert bonded.force("bolt-thread")[0] == pytest.approx(F + C * P, rel=1e-9)
    assert bonded.force("bolt-thread")[0] < 0.7 * P  # 130 kN against the true 200 kN
    # below it, the joint diagram: F_b = F + C*P, F_m = F - (1 - C)*P
    load = '[[loads]]\nat = "nut"\nforce = "10 kN"'
    model = bolt_and_sleeve(gap=CONTACT.format(c="0 mm"), sleeve_to="sleeve-end", extra=load)
    case = axialfe.solve(model)["base"]
    assert case.force("bolt-thread")[0] == pytest.approx(F + C * 10e3, rel=1e-9)
    assert case.force("sleeve")[0] == pytest.approx(-(F - (1 - C) * 10e3), rel=1e-9)


def test_two_preloads_are_found_together():
    text = """
[sections.a]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
b = "50 mm"
[[segments]]
name = "bolt-1"
from = "a"
to = "b"
material = "structural-steel"
section = "a"
preload = "10 kN"
[[segments]]
name = "bolt-2"
from = "a"
to = "b"
material = "structural-steel"
section = "a"
preload = "5 kN"
[[segments]]
name = "sleeve"
from = "a"
to = "b"
material = "aluminium-alloy"
section = "a"
[[supports]]
at = "a"
"""
    case = axialfe.solve(parse_model(text, "two.toml"))["base"]
    assert case.force("bolt-1")[0] == pytest.approx(10e3, rel=1e-9)
    assert case.force("bolt-2")[0] == pytest.approx(5e3, rel=1e-9)
    assert case.force("sleeve")[0] == pytest.approx(-15e3, rel=1e-9)


def test_an_unrestrained_preload_is_one_located_error():
    text = """[sections.a]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
b = "50 mm"
[[segments]]
name = "hanger"
from = "a"
to = "b"
material = "structural-steel"
section = "a"
preload = "10 kN"
[[supports]]
at = "a"
"""
    with pytest.raises(ModelError) as err:
        axialfe.solve(parse_model(text, "hang.toml"))
    assert str(err.value) == (
        "hang.toml:7: segments[1] ('hanger'): preload: no closed loop restrains this segment "
        "(its force does not change with its length), so no misfit gives it 10000 N; clamp it "
        "between parts that hold both its ends, or give 'misfit' instead")


def test_preload_held_open_by_a_gap_that_never_closes_is_refused():
    # a slack link in the loop never takes compression: a compressive preload cannot be met
    model = bolt_and_sleeve(preload="-5 kN", gap=CONTACT.format(c="0 mm"), sleeve_to="sleeve-end")
    with pytest.raises(ModelError, match=r"^bolt.toml:\d+: segments\[2\] \('bolt-thread'\): "
                                         r"preload: no closed loop restrains"):
        axialfe.solve(model)


def test_misfit_and_preload_together_are_refused():
    text = """[sections.a]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
b = "50 mm"
[[segments]]
from = "a"
to = "b"
material = "structural-steel"
section = "a"
misfit = "-0.1 mm"
preload = "10 kN"
"""
    with pytest.raises(ModelError) as err:
        parse_model(text, "both.toml")
    assert str(err.value) == "both.toml:13: segments[1]: give 'misfit' or 'preload', not both"


def test_preload_needs_a_force_unit():
    model = None
    with pytest.raises(ModelError) as err:
        model = bolt_and_sleeve(preload="25 mm")
    assert model is None
    assert str(err.value) == ("bolt.toml:31: segments[2] ('bolt-thread'): preload: 'mm' is a "
                              "unit of length, not of force, e.g. '12 kN'")


def test_cli_json_reports_the_preload_misfit(tmp_path):
    path = tmp_path / "bolt.toml"
    path.write_text(EXAMPLE_TEXT, encoding="utf-8")
    result = runner.invoke(app, ["solve", str(path), "--format", "json"])
    assert result.exit_code == 0, result.output
    seg = {s["name"]: s for s in json.loads(result.stdout)["cases"][0]["segments"]}
    assert seg["bolt"]["preload_misfit"] == pytest.approx(
        -10e3 * (0.05 / (200e9 * 1e-4) + 0.05 / (68.9e9 * 1e-4)) * 1e3, rel=1e-9)
    assert seg["bolt"]["axial_force"] == pytest.approx([10e3, 10e3], rel=1e-9)


EXAMPLE_TEXT = """[sections.a]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
b = "50 mm"
[[segments]]
name = "bolt"
from = "a"
to = "b"
material = "structural-steel"
section = "a"
preload = "10 kN"
[[segments]]
name = "sleeve"
from = "a"
to = "b"
material = "aluminium-alloy"
section = "a"
[[supports]]
at = "a"
"""


def test_closed_form_refuses_a_preload():
    with pytest.raises(ModelError) as err:
        parse_model(EXAMPLE_TEXT, "cf.toml", symbolic=True)
    assert str(err.value) == ("cf.toml:13: segments[1] ('bolt'): preload: the closed form takes "
                              "a 'misfit', not a preload")


def test_closed_form_of_a_model_built_in_code_refuses_a_preload():
    model = parse_model(EXAMPLE_TEXT, "cf.toml")
    with pytest.raises(ModelError) as err:
        axialfe.solve_symbolic(model)
    assert str(err.value) == "segments: the closed form takes a 'misfit', not a preload"


# --- property: any preload through gaps is met exactly --------------------------------
from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

from axialfe.model import Gap, Material, Model, Section, Segment, Station, Support  # noqa: E402


@settings(max_examples=25)
@given(F=st.floats(1e2, 2e5), c1=st.floats(0.0, 2e-4), c2=st.floats(0.0, 2e-4),
       E2=st.floats(20e9, 400e9), k_spring=st.floats(1e6, 1e10), split=st.floats(0.2, 0.8))
def test_a_preload_through_two_clearances_and_springs_is_met(F, c1, c2, E2, k_spring, split):
    # a bolt clamping two sleeves in series, each face with its own clearance, the nut end
    # held by a spring and the second sleeve by a soft one: the force is piecewise linear in
    # the misfit, with up to four pieces
    a = Section("a", "area", (("area", 1e-4),))
    steel, other = Material("steel", 200e9), Material("other", E2)
    L = 0.06
    model = Model(
        [Station("head", 0.0), Station("mid-a", L * split), Station("mid-b", L * split),
         Station("end", L), Station("nut", L)],
        [Segment("bolt", "head", "nut", steel, a, preload=F),
         Segment("sleeve-1", "head", "mid-a", other, a),
         Segment("sleeve-2", "mid-b", "end", steel, a)],
        [Support("head"), Support("nut", "spring", stiffness=k_spring),
         Support("mid-b", "spring", stiffness=1e5)],
        gaps=[Gap("g1", ("mid-a", "mid-b"), c1), Gap("g2", ("end", "nut"), c2)])
    case = axialfe.solve(model)["base"]
    assert case.force("bolt")[0] == pytest.approx(F, rel=1e-8)


def test_a_spacer_held_only_by_two_contacts_takes_a_preload():
    # the spacer touches nothing but the two contact faces: the engine's search for a part
    # held only by gaps must find the clamped state
    a = Section("a", "area", (("area", 1e-4),))
    steel = Material("steel", 200e9)
    model = Model(
        [Station("head", 0.0), Station("mid-a", 0.02), Station("mid-b", 0.02),
         Station("end", 0.06), Station("nut", 0.06)],
        [Segment("bolt", "head", "nut", steel, a, preload=20e3),
         Segment("sleeve-1", "head", "mid-a", steel, a),
         Segment("spacer", "mid-b", "end", steel, a)],
        [Support("head")],
        gaps=[Gap("g1", ("mid-a", "mid-b"), 0.0), Gap("g2", ("end", "nut"), 0.0)])
    case = axialfe.solve(model)["base"]
    assert case.force("bolt")[0] == pytest.approx(20e3, rel=1e-9)
    assert case.force("spacer")[0] == pytest.approx(-20e3, rel=1e-9)


def test_a_spacer_held_only_by_two_contacts_is_clamped_by_a_moving_support():
    # the nut face settles 0.1 mm toward the head: the spacer between the two contact faces
    # takes N = -E*A*0.1 mm/(L_1 + L_2) with the sleeve in series (Gere and Goodno, 8th ed.,
    # 2.4, bars in series; the openings in m and forces in N must not upset the pivoting)
    a = Section("a", "area", (("area", 1e-4),))
    steel = Material("steel", 200e9)
    model = Model(
        [Station("head", 0.0), Station("mid-a", 0.02), Station("mid-b", 0.02),
         Station("end", 0.06), Station("nut", 0.06)],
        [Segment("sleeve", "head", "mid-a", steel, a), Segment("spacer", "mid-b", "end", steel, a)],
        [Support("head"), Support("nut", "settlement", displacement=-1e-4)],
        gaps=[Gap("g1", ("mid-a", "mid-b"), 0.0), Gap("g2", ("end", "nut"), 0.0)])
    case = axialfe.solve(model)["base"]
    N = -200e9 * 1e-4 * 1e-4 / 0.06
    assert case.force("spacer")[0] == pytest.approx(N, rel=1e-9)
    assert case.force("sleeve")[0] == pytest.approx(N, rel=1e-9)


def test_the_table_states_the_misfit_of_a_preload(tmp_path):
    path = tmp_path / "bolt.toml"
    path.write_text(EXAMPLE_TEXT, encoding="utf-8")
    result = runner.invoke(app, ["solve", str(path)])
    assert result.exit_code == 0, result.output
    misfit = -10e3 * (0.05 / (200e9 * 1e-4) + 0.05 / (68.9e9 * 1e-4)) * 1e3
    assert (f" preload: 'bolt' has the misfit {misfit:.6g} mm, found to give its preload when "
            "installed"
            in result.stdout.splitlines())
