"""Bolted joints: thread data, property classes, stiffness, states, checks and sweeps.

Checks against the outside world name their source beside them; "from memory"
where it is.
"""

import json
import math
from pathlib import Path

import pytest
from typer.testing import CliRunner

from axialfe.cli import app
from axialfe.errors import ModelError
from axialfe.joints import parse_joint, read_joint, solve_joint, sweep_joint
from axialfe.joints.grades import KSI, iso_class, sae_grade
from axialfe.joints.joint import build_model, default_thread_length
from axialfe.joints.stiffness import frustum_stiffness, member_stiffness
from axialfe.joints.threads import thread

runner = CliRunner()
INCH = 0.0254
LBF = 4.4482216152605  # N (NIST SP 811, 2008, B.8)
EXAMPLE = Path(__file__).resolve().parent.parent / "examples" / "joints" / "cover-on-flange-heated.toml"


# --- thread data and property classes ------------------------------------------
@pytest.mark.parametrize("size, area", [("M6", 20.1), ("M8", 36.6), ("M10", 58.0), ("M12", 84.3),
                                        ("M16", 157), ("M20", 245), ("M24", 353)])
def test_iso_898_1_tensile_stress_areas(size, area):
    # ISO 898-1, table of nominal stress areas A_s,nom (coarse threads), as tabulated there
    got = thread(size).tensile_stress_area * 1e6
    digits = 3 - int(math.floor(math.log10(area))) - 1  # the table's three significant digits
    assert round(got, digits) == pytest.approx(area, abs=1e-9)


@pytest.mark.parametrize("size, area", [("1/4-20 UNC", 0.0318), ("3/8-16 UNC", 0.0775),
                                        ("1/2-13 UNC", 0.1419), ("1/2-20 UNF", 0.1599),
                                        ("5/8-11 UNC", 0.226), ("3/4-10 UNC", 0.334),
                                        ("1-8 UNC", 0.606)])
def test_unified_tensile_stress_areas(size, area):
    # Shigley, Mechanical Engineering Design, 10th ed., Table 8-2 (ASME B1.1), from memory
    got = thread(size).tensile_stress_area / INCH**2
    assert got == pytest.approx(area, abs=0.00051 if area < 0.2 else 0.0011)


def test_fine_and_inch_designations():
    assert thread("M10x1.25").pitch == pytest.approx(1.25e-3)
    assert thread("M10x1.25").tensile_stress_area * 1e6 == pytest.approx(61.2, abs=0.05)  # ISO 898-1
    assert thread("1 1/4-7 UNC").nominal_diameter == pytest.approx(1.25 * INCH)
    with pytest.raises(ModelError) as err:
        thread("3/8-24 UNC")
    assert str(err.value) == "'3/8-24 UNC': 3/8 UNC has 16 threads per inch; did you mean '3/8-16 UNC'?"
    with pytest.raises(ModelError) as err:
        thread("M11")
    assert str(err.value) == ("unknown metric size 'M11' (ISO 261 coarse M3 to M64); the nearest "
                              "sizes are 'M10' and 'M12'")


def test_iso_898_1_proof_strengths():
    # ISO 898-1 (2013), proof load stress S_p; also Shigley, 10th ed., Table 8-11 (from memory)
    assert iso_class("8.8", 0.016).proof_strength == 580e6
    assert iso_class("8.8", 0.020).proof_strength == 600e6
    assert iso_class("10.9", 0.012).proof_strength == 830e6
    assert iso_class("12.9", 0.030).proof_strength == 970e6
    assert iso_class("9.8", 0.010).proof_strength == 650e6
    assert iso_class("4.6", 0.020).proof_strength == 225e6
    with pytest.raises(ModelError) as err:
        iso_class("9.8", 0.020)
    assert str(err.value) == ("ISO 898-1 gives property class 9.8 a proof strength only up to 16 mm "
                              "diameter: got 20 mm; give 'material' with a proof_strength")


def test_sae_j429_proof_strengths():
    # SAE J429, as in Shigley, 10th ed., Table 8-9 (from memory)
    assert sae_grade("SAE 5", 1.0 * INCH).proof_strength == pytest.approx(85 * KSI)
    assert sae_grade("SAE 5", 1.25 * INCH).proof_strength == pytest.approx(74 * KSI)
    assert sae_grade("SAE 2", 0.5 * INCH).proof_strength == pytest.approx(55 * KSI)
    assert sae_grade("SAE 2", 1.0 * INCH).proof_strength == pytest.approx(33 * KSI)
    assert sae_grade("SAE 8", 0.75 * INCH).proof_strength == pytest.approx(120 * KSI)
    with pytest.raises(ModelError, match="SAE J429 grades start at 1/4 in"):
        sae_grade("SAE 5", 0.19 * INCH)


def test_default_thread_length():
    # ISO 4014 hex bolts as tabulated in Shigley, 10th ed., eq. 8-14 (from memory)
    m10 = thread("M10")
    assert default_thread_length(m10, 0.050) == pytest.approx(0.026)
    assert default_thread_length(m10, 0.125) == pytest.approx(0.026)
    assert default_thread_length(m10, 0.150) == pytest.approx(0.032)
    assert default_thread_length(m10, 0.250) == pytest.approx(0.045)
    half = thread("1/2-13 UNC")
    assert default_thread_length(half, 2 * INCH) == pytest.approx(1.25 * INCH)
    assert default_thread_length(half, 8 * INCH) == pytest.approx(1.5 * INCH)


# --- stiffness: Shigley's worked examples ---------------------------------------------
def test_shigley_frustum_example():
    # Shigley, 10th ed., Example 8-2 (from memory): 1/2 in bolt, washer face D = 0.75 in; the
    # steel washer and plate together, 0.595 in, give k1 = 30.80 Mlbf/in (eq. 8-20), and the
    # upper slice of the cast iron (E = 14.5 Mpsi), 0.0775 in under D = 1.437 in, k2 = 285.5
    k1 = frustum_stiffness(30e6, 0.5, 0.75, 0.595)
    assert k1 / 1e6 == pytest.approx(30.80, abs=0.005)
    k2 = frustum_stiffness(14.5e6, 0.5, 1.437, 0.6725 - 0.595)
    assert k2 / 1e6 == pytest.approx(285.5, abs=0.5)


def test_identical_parts_give_the_two_cone_closed_form():
    # Shigley, 10th ed., eq. 8-22: one material, two equal cones meeting at mid-grip
    E, d, l = 207e9, 0.012, 0.045
    tan = math.tan(math.radians(30))
    exact = math.pi * E * d * tan / (2 * math.log((l * tan + 0.5 * d) * 2.5 * d
                                                  / ((l * tan + 2.5 * d) * 0.5 * d)))
    # any split into parts gives the same stack stiffness (slices of one cone in series)
    for split in ([l], [0.01, 0.035], [0.02, 0.005, 0.02]):
        k_parts, k_m = member_stiffness([(E, t) for t in split], d)
        assert k_m == pytest.approx(exact, rel=1e-12)


US_JOINT = """
title = "Shigley Example 8-2, 1/2-20 UNF through a steel plate into a cast-iron one"
[units]
system = "US"
[materials.bolt-steel]
elastic_modulus = "30 Mpsi"
thermal_expansion = "6.5e-6 /delta_degF"
proof_strength = "85 kpsi"
[materials.steel]
elastic_modulus = "30 Mpsi"
thermal_expansion = "6.5e-6 /delta_degF"
[materials.cast-iron]
elastic_modulus = "14.5 Mpsi"
thermal_expansion = "6.0e-6 /delta_degF"
[bolt]
size = "1/2-20 UNF"
material = "bolt-steel"
length = "1.5 in"
[[clamped]]
name = "washer"
material = "steel"
thickness = "0.095 in"
[[clamped]]
name = "plate"
material = "steel"
thickness = "0.5 in"
[[clamped]]
name = "base"
material = "cast-iron"
thickness = "0.75 in"
[assembly]
preload = "10 kip"
temperature = "70 degF"
"""


def test_shigley_bolt_stiffness_example():
    # Shigley, 10th ed., Example 8-2 (d) (from memory): L_T = 2d + 1/4 = 1.25 in, l_d = 0.25 in,
    # l_t = 1.345 - 0.25 = 1.095 in, A_d = 0.1963 in^2, A_t = 0.1599 in^2, k_b = 3.69 Mlbf/in
    # (the text works with four-digit areas: its k_b is good to about 0.1 %)
    j = parse_joint(US_JOINT, "ex82.toml")
    assert j.grip / INCH == pytest.approx(1.345)
    assert j.thread_len / INCH == pytest.approx(1.25)
    assert j.shank_in_grip / INCH == pytest.approx(0.25)
    assert j.thread_in_grip / INCH == pytest.approx(1.095)
    assert j.bolt_stiffness * INCH / LBF / 1e6 == pytest.approx(3.69, rel=2e-3)
    # the member: washer and plate in series are the text's k1 (one steel frustum)
    kw, kp, kc = (k * INCH / LBF / 1e6 for k in j.part_stiffness)
    assert 1 / (1 / kw + 1 / kp) == pytest.approx(30.80, abs=0.01)
    # the cast iron is the text's upper slice (285.5) and lower frustum (D = 0.75, 0.6725 in)
    # in series, each by eq. 8-20
    lower = frustum_stiffness(14.5e6, 0.5, 0.75, 0.6725) / 1e6
    assert kc == pytest.approx(1 / (1 / 285.57 + 1 / lower), rel=1e-3)


def test_shigley_joint_load_example_bolt():
    # Shigley, 10th ed., Example 8-4 (from memory): 5/8-11 UNC SAE grade 5, grip 1.50 in,
    # L = 2.25 in: L_T = 2d + 1/4 = 1.50 in, l_d = l_t = 0.75 in, A_t = 0.226 in^2,
    # k_b = 5.21 Mlbf/in; S_p = 85 kpsi and the reusable preload F_i = 0.75*A_t*S_p = 14.4 kip
    # (the stack of parts here is ours: only its grip enters k_b)
    text = US_JOINT.replace('size = "1/2-20 UNF"', 'size = "5/8-11 UNC"').replace(
        'length = "1.5 in"', 'length = "2.25 in"').replace('material = "bolt-steel"\n', 'grade = "SAE 5"\n')
    text = text.replace('thickness = "0.095 in"', 'thickness = "0.25 in"').replace(
        'thickness = "0.5 in"', 'thickness = "0.5 in"').replace('thickness = "0.75 in"', 'thickness = "0.75 in"')
    j = parse_joint(text, "ex84.toml")
    assert j.grip / INCH == pytest.approx(1.5)
    assert (j.shank_in_grip / INCH, j.thread_in_grip / INCH) == pytest.approx((0.75, 0.75))
    assert j.thread.tensile_stress_area / INCH**2 == pytest.approx(0.226, abs=0.0005)
    # the class's bolting steel has 205 GPa; the text uses 30 Mpsi (206.8 GPa)
    assert j.bolt_stiffness * INCH / LBF / 1e6 * (30e6 * 6894.757293168 / 205e9) == pytest.approx(
        5.21, abs=0.01)
    assert j.proof_strength == pytest.approx(85 * KSI)
    assert 0.75 * j.thread.tensile_stress_area * j.proof_strength / (1e3 * LBF) == pytest.approx(
        14.4, abs=0.05)


# --- the states against the closed forms ----------------------------------------------
def closed_form(j, temps, P):
    """Shigley, 10th ed., 8-7 (eq. 8-24, 8-25), with the thermal change of preload."""
    kb, km = j.bolt_stiffness, j.member_stiffness
    C = kb / (kb + km)
    t0 = j.assembly_temperature
    delta = sum(p.material.thermal_expansion * t * (temps[p.name] - t0)
                for p, t in zip(j.parts, j.engaged))
    delta -= j.bolt_material.thermal_expansion * j.grip * (temps["bolt"] - t0)
    dF = delta * kb * km / (kb + km)
    return C, dF, j.preload + dF + C * P, j.preload + dF - (1 - C) * P


def test_states_follow_the_closed_forms():
    j = read_joint(EXAMPLE)
    result = solve_joint(j)
    assert [s.name for s in result.states] == ["assembly", "hot", "cold-start"]
    for s, service in zip(result.states, [None, *j.services]):
        temps = j.temperatures_of(service)
        C, dF, Fb, Fm = closed_form(j, temps, s.external_load)
        assert s.thermal_change == pytest.approx(dF, rel=1e-12, abs=1e-9)
        assert s.bolt_force == pytest.approx(Fb, rel=1e-9)
        assert s.clamp_force == pytest.approx(Fm, rel=1e-9)
        assert s.bolt_stress == pytest.approx(Fb / j.thread.tensile_stress_area, rel=1e-9)
        assert s.separation_load == pytest.approx((j.preload + dF) / (1 - C), rel=1e-12)
        assert not s.separated
    assert result.states[0].bolt_force == pytest.approx(25e3, rel=1e-9)


def test_uniform_heating_thermal_change_closed_form():
    # uniform dT: dF_th = (sum(alpha_i*t_i) - alpha_b*l_g)*dT * k_b*k_m/(k_b + k_m)
    # (Shigley, 10th ed., 8-7 and problem statements on thermal preload change, from memory)
    text = EXAMPLE.read_text().replace('temperatures = { bolt = "95 degC" }\n', "")
    j = parse_joint(text, "j.toml")
    hot = solve_joint(j).state("hot")
    dT = 100.0
    mismatch = (11.7e-6 * 0.002 + 23.6e-6 * 0.012 + 11.7e-6 * 0.016 - 11.5e-6 * 0.030) * dT
    kk = j.bolt_stiffness * j.member_stiffness / (j.bolt_stiffness + j.member_stiffness)
    assert hot.thermal_change == pytest.approx(mismatch * kk, rel=1e-9)
    C = j.joint_constant
    assert hot.bolt_force == pytest.approx(25e3 + mismatch * kk + C * 6e3, rel=1e-9)


def test_beyond_separation_the_bolt_carries_the_load_alone():
    text = EXAMPLE.read_text().replace('external_load = "6 kN"', 'external_load = "60 kN"', 1)
    j = parse_joint(text, "j.toml")
    hot = solve_joint(j).state("hot")
    assert hot.external_load > hot.separation_load
    assert hot.separated
    assert hot.clamp_force == 0.0
    assert hot.bolt_force == pytest.approx(60e3, rel=1e-9)
    checks = {(e.kind, e.case): e for e in solve_joint(j).checks.entries}
    assert checks[("separation", "hot")].ok is False
    assert checks[("clamp-force", "hot")].ok is False
    assert checks[("clamp-force", "hot")].note == "the joint has separated: no clamp force is left"


def test_the_built_model_is_a_bolt_parallel_to_its_stack_with_a_contact_interface():
    j = read_joint(EXAMPLE)
    m = build_model(j)
    assert [s.name for s in m.segments] == ["bolt-shank", "bolt-thread", "washer", "cover", "flange"]
    assert m.segments[1].preload == 25e3
    (gap,) = m.gaps
    assert (gap.name, gap.kind, gap.clearance, gap.stations) == ("interface", "contact", 0.0,
                                                                   ("stack-end", "nut"))
    # each part's segment has the frustum stiffness of its part
    for seg, k in zip(m.segments[2:], j.part_stiffness):
        length = {"washer": 0.002, "cover": 0.012, "flange": 0.016}[seg.name]
        assert seg.material.elastic_modulus * seg.section.area / length == pytest.approx(k, rel=1e-12)


def test_cap_screw_effective_grip():
    # Shigley, 10th ed., 8-4 (from memory): l' = h + t2/2 for t2 < d, h + d/2 for t2 >= d
    text = EXAMPLE.read_text().replace('length = "50 mm"', 'length = "30 mm"\ninto = "flange"')
    j = parse_joint(text, "j.toml")
    assert j.grip == pytest.approx(0.014 + 0.005)        # t2 = 16 mm >= d = 10 mm: h + d/2
    thin = parse_joint(text.replace('thickness = "16 mm"', 'thickness = "8 mm"'), "j.toml")
    assert thin.grip == pytest.approx(0.014 + 0.004)     # t2 = 8 mm < d: h + t2/2
    result = solve_joint(j)
    # the tapped part counts with its engaged share in the thermal mismatch
    C, dF, Fb, Fm = closed_form(j, j.temperatures_of(j.services[0]), 6e3)
    assert result.state("hot").bolt_force == pytest.approx(Fb, rel=1e-9)
    assert result.solution.model.gaps[0].stations == ("stack-end", "tapped-thread")
    assert j.engaged[-1] == pytest.approx(0.005)


def test_a_material_bolt_takes_its_proof_or_its_yield_strength():
    text = EXAMPLE.read_text().replace('property_class = "8.8"', 'material = "stud-steel"')
    with_proof = text + ('[materials.stud-steel]\nelastic_modulus = "200 GPa"\n'
                         'thermal_expansion = "12e-6 /K"\nyield_strength = "640 MPa"\n'
                         'proof_strength = "600 MPa"\n')
    j = parse_joint(with_proof, "j.toml")
    assert (j.proof_strength, j.proof_basis) == (600e6, "proof_strength of material 'stud-steel'")
    assert j.bolt_material.elastic_modulus == 200e9
    j = parse_joint(with_proof.replace('proof_strength = "600 MPa"\n', ""), "j.toml")
    assert j.proof_strength == 640e6
    assert j.proof_basis == ("material 'stud-steel' gives no proof_strength: its yield strength "
                             "640 MPa is used in its place")


def test_fully_threaded_bolt_has_no_shank_in_the_grip():
    text = EXAMPLE.read_text().replace('length = "50 mm"', 'length = "50 mm"\nthread_length = "60 mm"')
    j = parse_joint(text, "j.toml")
    assert j.shank_in_grip == 0.0 and j.thread_in_grip == pytest.approx(0.030)
    assert [s.name for s in build_model(j).segments][:1] == ["bolt-thread"]
    k = j.thread.tensile_stress_area * 205e9 / 0.030
    assert j.bolt_stiffness == pytest.approx(k, rel=1e-12)


def test_torque_gives_the_preload():
    # F_i = T/(K*d) (Shigley, 10th ed., eq. 8-27, from memory); K = 0.2 by default, stated
    text = EXAMPLE.read_text().replace('preload = "25 kN"', 'torque = "50 N*m"')
    j = parse_joint(text, "j.toml")
    assert j.preload == pytest.approx(50 / (0.2 * 0.010))
    assert "nut factor K = 0.2 (default)" in j.preload_basis
    j = parse_joint(text.replace('torque = "50 N*m"', 'torque = "50 N*m"\nnut_factor = 0.15'), "j.toml")
    assert j.preload == pytest.approx(50 / (0.15 * 0.010))


# --- the sweep and its exact events --------------------------------------------
def test_sweep_events_are_exact():
    j = read_joint(EXAMPLE)
    # the bolt heated alone while the parts stay at the cold start's -30 degC: its preload falls
    cold = sweep_joint(j, -30.0, 300.0, 3, unit="degC", state="cold-start", part="bolt")
    assert [e for _, e, _ in cold.events] == ["clamp-below-minimum", "separates"]
    assert all(dict(s.temperatures)["cover"] == pytest.approx(243.15) for s in cold.states)
    # everything heated in the hot state: the preload rises until the bolt reaches proof
    hot = sweep_joint(j, -40.0, 150.0, 5, unit="degC", state="hot")
    assert [e for _, e, _ in hot.events] == ["reaches-proof"]
    for sw, part in ((cold, "bolt"), (hot, None)):
        for name, event, value in sw.events:
            assert value not in sw.values  # found from the linear response, not a grid point
            at = sweep_joint(j, value, value + 1.0, 2, unit="degC", state=sw.state,
                             part=part).states[0]
            if event == "separates":
                assert (name, at.clamp_force) == ("interface", pytest.approx(0.0, abs=1e-6))
            elif event == "clamp-below-minimum":
                assert at.clamp_force == pytest.approx(12e3, rel=1e-9)
            else:
                assert at.bolt_stress * 1.2 == pytest.approx(580e6, rel=1e-9)
    # past separation the bolt carries the external load alone, whatever its temperature
    assert cold.states[-1].separated and cold.states[-1].bolt_force == pytest.approx(6e3, rel=1e-9)


# --- reader errors ---------------------------------------------------------------
@pytest.mark.parametrize("old, new, message", [
    ('size = "M10"', 'size = "M11"', "j.toml:16: bolt: size: unknown metric size 'M11' (ISO 261 "
     "coarse M3 to M64); the nearest sizes are 'M10' and 'M12'"),
    ('property_class = "8.8"', 'property_class = "8.9"',
     "j.toml:17: bolt: property_class: unknown property class '8.9'; did you mean '8.8'?"),
    ('property_class = "8.8"', 'property_class = "8.8"\nmaterial = "structural-steel"',
     "j.toml:18: bolt: give one of 'property_class' (ISO 898-1), 'grade' (SAE J429) or "
     "'material': got property_class, material"),
    ('property_class = "8.8"', 'grade = "SAE 5"', "j.toml:17: bolt: grade: a metric bolt takes "
     "property_class"),
    ('thickness = "12 mm"', 'thickness = "12"', "j.toml:28: clamped[2] ('cover'): thickness: '12' "
     "has no unit: give a length, e.g. '40 mm'"),
    ('temperatures = { bolt = "95 degC" }', 'temperatures = { covr = "95 degC" }',
     "j.toml:42: service[1] ('hot'): temperatures: unknown part 'covr'; did you mean 'cover'?"),
    ('length = "50 mm"', 'length = "25 mm"', "j.toml:18: bolt: length: a bolt of 25 mm does not "
     "pass through a grip of 30 mm"),
    ('length = "50 mm"', 'length = "50 mm"\nthread_length = "12 mm"', "j.toml:19: bolt: "
     "thread_length: the thread starts 38 mm under the head, beyond the grip of 30 mm, so the nut "
     "cannot be tightened onto it"),
    ('preload = "25 kN"', 'torque = "50 N"', "j.toml:36: assembly: torque: 'N' is not a unit of "
     "torque, e.g. '50 N*m'"),
    ('name = "flange"', 'name = "cover"', "j.toml:30: clamped[3]: two clamped parts are named "
     "'cover'"),
    ('material = "aluminium-alloy"', 'material = "aluminum-alloy"', "j.toml:27: clamped[2] "
     "('cover'): unknown material 'aluminum-alloy'; did you mean 'aluminium-alloy'?"),
    ('name = "cover"', 'name = "cover"\nthick = "1 mm"', "j.toml:27: clamped[2] ('cover'): "
     "unknown key 'thick'; did you mean 'thickness'?"),
    ('preload = "25 kN"', 'preload = "25 kN"\ntorque = "50 N*m"', "j.toml:35: assembly: give "
     "'preload' or 'torque' (with 'nut_factor'), one of them"),
    ('preload = "25 kN"', 'preload = "25 kN"\nnut_factor = 0.2', "j.toml:37: assembly: "
     "'nut_factor' belongs to a 'torque'"),
    ('preload = "25 kN"', 'preload = "-25 kN"', "j.toml:36: assembly: preload must be positive "
     "(a tension): got '-25 kN'"),
    ('temperature = "20 degC"\n', '', "j.toml:35: assembly: 'temperature' is missing (the "
     "assembly temperature, e.g. '20 degC')"),
    ('name = "hot"', 'name = "assembly"', "j.toml:40: service[1] ('assembly'): 'assembly' names "
     "the installed state; give the service state a name of its own"),
    ('length = "50 mm"', 'length = "50 mm"\ninto = "flang"', "j.toml:19: bolt: into: unknown "
     "part 'flang'; did you mean 'flange'?"),
    ('size = "M10"', 'size = "M48"', "j.toml:17: bolt: property_class: ISO 898-1 gives property "
     "class 8.8 a proof strength only up to 39 mm diameter: got 48 mm; give 'material' with a "
     "proof_strength"),
    ('size = "M10"', 'size = "M10 coarse"', "j.toml:16: bolt: size: cannot read the thread size "
     "'M10 coarse': give e.g. 'M10', 'M10x1.25' or '3/8-16 UNC'"),
])
def test_bad_joint_files_give_one_located_line(old, new, message):
    text = EXAMPLE.read_text()
    assert old in text
    with pytest.raises(ModelError) as err:
        parse_joint(text.replace(old, new, 1), "j.toml")
    assert str(err.value) == message


# --- the command line ------------------------------------------------------------
def test_joint_command_json_and_exit_code():
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--format", "json"])
    assert result.exit_code == 1, result.output  # the hot state overloads the bolt
    data = json.loads(result.stdout)
    assert data["units"] == {"force": "N", "length": "mm", "stress": "MPa", "stiffness": "N/mm"}
    bolt = data["bolt"]
    assert {"size", "nominal_diameter", "pitch", "tensile_stress_area", "shank_area", "grip",
            "stiffness", "proof_strength", "elastic_modulus", "thermal_expansion"} <= set(bolt)
    assert (bolt["size"], bolt["nominal_diameter"], bolt["pitch"]) == ("M10", 10.0, 1.5)
    assert round(bolt["tensile_stress_area"], 2) == 57.99
    assert round(bolt["shank_area"], 2) == 78.54
    assert bolt["grip"] == pytest.approx(30.0)
    assert (bolt["elastic_modulus"], bolt["thermal_expansion"]) == (205000.0, 11.5e-6)
    assert bolt["proof_strength"] == 580.0
    assert set(data["clamped"]) == {"method", "stiffness", "parts"}
    assert [p["name"] for p in data["clamped"]["parts"]] == ["washer", "cover", "flange"]
    assert 0 < data["joint_constant"] < 1
    state = data["states"][1]
    assert {"name", "temperature", "external_load", "bolt_force", "clamp_force", "bolt_stress",
            "separated", "separation_load", "thermal_change"} <= set(state)
    assert state["temperature"] == pytest.approx(95.0)  # the bolt's
    assert {"kind", "name", "utilization", "ok", "note"} <= set(data["checks"][0])
    assert {c["kind"] for c in data["checks"]} == {"bolt-proof", "clamp-force", "separation"}
    assert data["governing"] == {"kind": "bolt-proof", "name": "bolt", "case": "hot",
                                 "utilization": pytest.approx(data["governing"]["utilization"])}
    assert data["governing"]["utilization"] > 1


def test_joint_command_exit_codes(tmp_path):
    text = EXAMPLE.read_text()
    passing = tmp_path / "pass.toml"
    text = text.replace('preload = "25 kN"', 'preload = "20 kN"').replace("safety_factor = 1.2",
                                                                          "safety_factor = 1.0")
    passing.write_text(text)
    assert runner.invoke(app, ["joint", str(passing)]).exit_code == 0
    undecided = tmp_path / "undecided.toml"
    undecided.write_text(text.replace('property_class = "8.8"', 'material = "bolt-alloy"')
                         + '[materials.bolt-alloy]\nelastic_modulus = "205 GPa"\n'
                         'thermal_expansion = "11.5e-6 /K"\n')
    result = runner.invoke(app, ["joint", str(undecided)])
    assert result.exit_code == 3, result.output
    assert "no proof or yield strength is known for the bolt" in result.stdout
    bad = tmp_path / "bad.toml"
    bad.write_text(text.replace('size = "M10"', 'size = "M10x3"'))
    result = runner.invoke(app, ["joint", str(bad)])
    assert result.exit_code == 2
    assert result.stderr.startswith(f"error: {bad}:16: bolt: size: 'M10x3' is not a fine thread")


def test_joint_sweep_json():
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--sweep", "-40 degC..150 degC",
                                 "--state", "hot", "--format", "json", "--steps", "5"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["parameter"] == "temperature" and data["unit"] == "degC"
    assert data["values"] == [-40.0, 7.5, 55.0, 102.5, 150.0]
    assert len(data["states"]) == 5
    assert [(e["name"], e["event"]) for e in data["events"]] == [("bolt", "reaches-proof")]
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--sweep", "-40 degC..150 degC",
                                 "--part", "lid"])
    assert result.exit_code == 2
    assert result.stderr == ("error: --part: unknown part 'lid'; expected one of: 'bolt', "
                             "'washer', 'cover', 'flange'\n")
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--sweep", "-40..150"])
    assert result.exit_code == 2
    assert result.stderr == "error: --sweep: '-40..150' has no unit: give e.g. '-40 K..120 K'\n"


# --- the joint diagram and the report --------------------------------------------
def test_joint_diagram_lines_are_the_classic_triangle():
    from axialfe.joints.joint import diagram_lines

    j = read_joint(EXAMPLE)
    result = solve_joint(j)
    C = j.joint_constant
    for line, state in zip(diagram_lines(result), result.states):
        P0, Psep, Ptop = line.loads
        assert (P0, Psep) == (0.0, state.separation_load)
        F0 = j.preload + state.thermal_change
        assert line.bolt[0] == pytest.approx(F0, rel=1e-9)
        assert line.clamp[0] == pytest.approx(F0, rel=1e-9)
        # bolt slope C, clamp slope -(1 - C) up to separation; then the bolt carries P alone
        assert line.bolt[1] == pytest.approx(F0 + C * Psep, rel=1e-9)
        assert line.bolt[1] == pytest.approx(Psep, rel=1e-9)
        assert line.clamp[1] == pytest.approx(0.0, abs=1e-6 * F0)
        assert (line.bolt[2], line.clamp[2]) == (pytest.approx(Ptop, rel=1e-9), 0.0)


def test_joint_report_through_the_command_line(tmp_path):
    html_path, md_path, png = tmp_path / "joint.html", tmp_path / "joint.md", tmp_path / "jd.png"
    result = runner.invoke(app, ["report", str(EXAMPLE), "-o", str(html_path)])
    assert result.exit_code == 0, result.output
    text = html_path.read_text()
    for part in ('<section id="checks">', '<section id="diagrams">', "Joint diagram",
                 "Governing check:", "frustum cones", "licensed professional engineer"):
        assert part in text
    assert text.count("<svg") == 1 + 3  # the joint diagram and one force diagram per state
    assert 'src="http' not in text and "<link" not in text and "<script" not in text
    assert runner.invoke(app, ["report", str(EXAMPLE), "-o", str(md_path)]).exit_code == 0
    assert "base64" not in md_path.read_text()    # the diagrams are files beside it, linked
    assert [f"](joint-diagram-{k}.png)" in md_path.read_text() for k in (1, 2, 3, 4)] == [True] * 4
    assert all((tmp_path / f"joint-diagram-{k}.png").read_bytes()[:4] == b"\x89PNG"
               for k in (1, 2, 3, 4))
    from axialfe.output.jointplot import plot_joint

    plot_joint(solve_joint(read_joint(EXAMPLE)), png)
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


@pytest.mark.parametrize("path", sorted(EXAMPLE.parent.glob("*.toml")), ids=lambda p: p.stem)
def test_every_joint_example_runs(path):
    assert path.read_text(encoding="utf-8").lstrip().startswith("#")  # commented
    result = runner.invoke(app, ["joint", str(path)])
    assert result.exit_code in (0, 1, 3), result.output
    assert result.stdout.startswith(f"axialfe joint: {read_joint(path).title}\n")
    assert "cautions:" in result.stdout
    data = json.loads(runner.invoke(app, ["joint", str(path), "--format", "json"]).stdout)
    assert data["states"][0]["name"] == "assembly"


def test_a_cap_screw_shank_may_not_enter_the_tapped_hole():
    text = EXAMPLE.read_text().replace('length = "50 mm"',
                                       'length = "40 mm"\nthread_length = "20 mm"\ninto = "flange"')
    with pytest.raises(ModelError) as err:
        parse_joint(text, "j.toml")  # shank 20 mm under the head, tapped part from 14 mm
    assert str(err.value) == ("j.toml:19: bolt: thread_length: the thread starts 20 mm under the "
                              "head, so the plain shank would enter the tapped hole")


def test_a_bolt_pressed_slack_is_undecided_not_passed():
    text = EXAMPLE.read_text().replace('external_load = "6 kN"', 'external_load = "-200 kN"', 1)
    result = solve_joint(parse_joint(text, "j.toml"))
    entry = next(e for e in result.checks.entries if e.kind == "bolt-proof" and e.case == "hot")
    assert result.state("hot").bolt_force < 0
    assert (entry.ok, entry.utilization) == (None, None)
    assert entry.note.startswith("the bolt is not in tension")


def test_a_model_command_on_a_joint_file_says_what_to_run():
    result = runner.invoke(app, ["solve", str(EXAMPLE)])
    assert result.exit_code == 2
    assert result.stderr == (f"error: {EXAMPLE}:15: top level: this is a bolted-joint file (it has "
                             "a [bolt] table): run 'axialfe joint' on it\n")


def test_joint_plots_through_the_command_line(tmp_path):
    png, svg = tmp_path / "diagram.png", tmp_path / "sweep.svg"
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--plot", str(png)])
    assert result.exit_code == 1  # the checks' code, the figure written all the same
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--sweep", "-40 degC..300 degC",
                                 "--state", "cold-start", "--part", "bolt", "--plot", str(svg)])
    assert result.exit_code == 0, result.output
    assert "<svg" in svg.read_text()
    result = runner.invoke(app, ["joint", str(EXAMPLE), "--plot", str(tmp_path / "x.pdf")])
    assert result.exit_code == 2
    assert result.stderr == (f"error: {tmp_path / 'x.pdf'}: cannot write a figure as '.pdf'; "
                             "expected one of: '.png', '.svg'\n")


SPEC_JOINT = """
title = "Cover bolted to a flange"
[bolt]
size = "M10"
property_class = "8.8"
length = "50 mm"
[[clamped]]
name = "cover"
material = "aluminium-alloy"
thickness = "12 mm"
[[clamped]]
name = "flange"
material = "structural-steel"
thickness = "16 mm"
[assembly]
preload = "25 kN"
temperature = "20 degC"
[[service]]
name = "hot"
temperature = "120 degC"
temperatures = { bolt = "90 degC", cover = "130 degC" }
external_load = "6 kN"
"""


def test_the_m10_geometry_of_a_cover_on_a_flange(tmp_path):
    # M10 coarse: P = 1.5 mm (ISO 261), A_t = 57.99 mm^2 (ISO 898-1 formula), A_d = 78.54 mm^2;
    # L_T = 2*10 + 6 = 26 mm for L = 50 mm, so l_d = 24 mm and l_t = 28 - 24 = 4 mm in the grip
    path = tmp_path / "cover.toml"
    path.write_text(SPEC_JOINT, encoding="utf-8")
    result = runner.invoke(app, ["joint", str(path), "--format", "json"])
    assert result.exit_code in (0, 1), result.output
    data = json.loads(result.stdout)
    b = data["bolt"]
    assert (b["nominal_diameter"], b["pitch"], b["grip"]) == (10.0, 1.5, pytest.approx(28.0))
    assert (round(b["tensile_stress_area"], 2), round(b["shank_area"], 2)) == (57.99, 78.54)
    assert (b["shank_length_in_grip"], b["thread_length_in_grip"]) == pytest.approx((24.0, 4.0))
    assembly, hot = data["states"]
    assert (assembly["bolt_force"], assembly["clamp_force"]) == pytest.approx((25e3, 25e3))
    assert round(assembly["bolt_stress"], 1) == 431.1
    assert hot["temperature"] == pytest.approx(90.0)  # the bolt's
    assert hot["temperatures"] == {"bolt": pytest.approx(90.0), "cover": pytest.approx(130.0),
                                   "flange": pytest.approx(120.0)}
