"""Elastic-plastic paths (axialfe path): exact events, residual stresses, cycles, against closed forms."""

from __future__ import annotations

import json

import numpy as np
import pytest
from hypothesis import given, strategies as st

from axialfe import Load, Model, ModelError, Segment, Station, Support
from axialfe.model import Case, Material
from axialfe.plastic import collapse
from axialfe.tracking.plastic import parse_path, track_path

from conftest import area, assert_close

E, ALPHA, FY = 200e9, 12e-6, 240e6
EPS_Y = FY / E
DT_Y = FY / (E * ALPHA)          # 100 K: the temperature change at first yield of a restrained bar


def plastic(name="s", **kw):
    return Material(name, E, ALPHA, FY, behaviour="elastic-plastic", **kw)


def run(model, text, case=None, cycles=None, cycle_from=None):
    legs, groups = parse_path(text, cycles, cycle_from)
    return track_path(model, legs, case, groups)


def events(result):
    return [(e.leg, e.name, e.event) for e in result.events]


# --- Gere & Goodno, Mechanics of Materials, sec. 2.12 "Elastoplastic analysis" (from memory) ---
A1, A2, a, b, P = 3e-4, 1e-4, 0.4, 0.6, 10e3


def fixed_bar():
    """Fixed at A and B, load P at C; AC (A1, length a) and CB (A2, length b)."""
    mat = plastic()
    return Model([Station("A", 0.0), Station("C", a), Station("B", a + b)],
                 [Segment("AC", "A", "C", mat, area("s1", A1)),
                  Segment("CB", "C", "B", mat, area("s2", A2))],
                 [Support("A"), Support("B")], [Load("C", P)])


def test_fixed_bar_yield_and_plastic_loads_and_displacements():
    # AC (the shorter part) yields first at delta_Y = eps_y*a: P_Y = f_y*(A1 + A2*a/b);
    # both yield at P_P = f_y*(A1 + A2) with delta_P = eps_y*b, and the bar collapses
    p_y, p_p = FY * (A1 + A2 * a / b), FY * (A1 + A2)
    result = run(fixed_bar(), "load 0..12")
    assert events(result) == [(1, "AC", "yields"), (1, "CB", "yields"), (1, "AC, CB", "collapses")]
    assert_close([e.value * P for e in result.events], [p_y, p_p, p_p])
    end = result.states[-1]
    assert_close(end.value * P, p_p)
    assert_close(end.result.displacement("C"), EPS_Y * b)
    assert_close(end.result.axial_force[:, 0], [FY * A1, -FY * A2])
    assert result.collapsed_on == 1
    half = run(fixed_bar(), f"load 0..{p_y / P}")
    assert_close(half.states[-1].result.displacement("C"), EPS_Y * a)


def test_fixed_bar_residual_stress_after_unloading():
    # loaded to P between P_Y and P_P, then unloaded elastically (stiffness k1 + k2):
    # N_res = f_y*A1 - P*k1/(k1 + k2) in both parts; delta_res = delta - P/(k1 + k2)
    k1, k2 = E * A1 / a, E * A2 / b
    lam = 0.5 * (FY * (A1 + A2 * a / b) + FY * (A1 + A2)) / P
    result = run(fixed_bar(), f"load 0..{lam}; load {lam}..0")
    assert events(result) == [(1, "AC", "yields"), (2, "AC", "unloads")]
    n_res = FY * A1 - lam * P * k1 / (k1 + k2)
    final = result.states[-1]
    assert_close(final.result.axial_force[:, 0], [n_res, n_res], rel=1e-9)
    delta = (lam * P - FY * A1) / k2
    delta_res = delta - lam * P / (k1 + k2)
    assert_close(final.result.displacement("C"), delta_res)
    assert_close(final.plastic_displacement[1], delta_res)       # the station C
    # plastic strain of AC: total strain less elastic strain at the peak
    assert_close(final.plastic_strain, [delta / a - EPS_Y, 0.0])


def parallel_bars():
    """Three bars of area A share a rigid plate: the middle one (L2) shorter than the outer (L1)."""
    mat, A, L1, L2 = plastic(), 2e-4, 1.5, 1.0
    model = Model([Station("O", 0.0), Station("M", L1 - L2), Station("plate", L1)],
                  [Segment("left", "O", "plate", mat, area("a", A)),
                   Segment("middle", "M", "plate", mat, area("a", A)),
                   Segment("right", "O", "plate", mat, area("a", A))],
                  [Support("O"), Support("M")], [Load("plate", 10e3)])
    return model, A, L1, L2


def test_three_parallel_bars_yield_plastic_loads_and_residual_stress():
    # Gere & Goodno sec. 2.12 (from memory): P_Y = f_y*A*(1 + 2*L2/L1) at delta_Y = f_y*L2/E,
    # P_P = 3*f_y*A at delta_P = f_y*L1/E; unloading from P leaves the middle bar at
    # f_y*A - P*(1/L2)/(1/L2 + 2/L1) and each outer bar at minus half of that
    model, A, L1, L2 = parallel_bars()
    p_y, p_p = FY * A * (1 + 2 * L2 / L1), 3 * FY * A
    result = run(model, "load 0..20")
    assert [e.event for e in result.events] == ["yields", "yields", "yields", "collapses"]
    assert_close([e.value * 1e4 for e in result.events], [p_y, p_p, p_p, p_p])
    assert_close(result.states[-1].result.displacement("plate"), FY * L1 / E)
    lam = 0.5 * (p_y + p_p) / 1e4
    down = run(model, f"load 0..{lam}; load {lam}..0")
    middle = FY * A - lam * 1e4 * (1 / L2) / (1 / L2 + 2 / L1)
    assert_close(down.states[-1].result.axial_force[:, 0], [-middle / 2, middle, -middle / 2])
    assert_close(down.states[0].result.displacement("plate"),
                 (lam * 1e4 - FY * A) / 2 / (E * A / L1))


# --- the bar between walls, heated and cooled ----------------------------------------------
def restrained(**kw):
    return Model([Station("a", 0.0), Station("b", 2.0)],
                 [Segment("bar", "a", "b", plastic(**kw), area("r", 1e-4))],
                 [Support("a"), Support("b")])


def test_heated_beyond_first_yield_and_cooled_keeps_residual_tension():
    # compression yield at dT_y = f_y/(E*alpha); cooled back from dT (< 2*dT_y) the bar keeps
    # sigma_res = E*alpha*(dT - dT_y) in tension (common practice for thermal cycling)
    result = run(restrained(), "temperature-change 0 K..150 K; temperature-change 150 K..0 K")
    assert events(result) == [(1, "bar", "yields"), (2, "bar", "unloads")]
    assert_close(result.events[0].value, DT_Y)
    assert_close(result.states[0].result.stress[0, 0], -FY)
    assert_close(result.states[0].plastic_strain[0], -ALPHA * (150 - DT_Y))
    assert_close(result.states[1].result.stress[0, 0], E * ALPHA * (150 - DT_Y))
    assert_close(result.states[1].plastic_displacement, [0.0, 0.0], abs_=1e-18)


@pytest.mark.parametrize("dT, outcome, decided", [
    (150.0, "shakedown", 2),      # a range up to 2*dT_y shakes down after the first cycle
    (200.0, "shakedown", 2),      # exactly 2*dT_y: the cooling touches yield and stays elastic
    (250.0, "alternating", 2),    # beyond it the bar yields both ways every cycle
    (80.0, "elastic", 1),
])
def test_thermal_cycling_shakes_down_up_to_twice_the_yield_range(dT, outcome, decided):
    # the 2*sigma_y/(E*alpha) range is the reasoning behind the 3*S_m limit of the ASME
    # pressure-vessel code (from memory)
    result = run(restrained(), f"temperature-change 0 K..{dT} K; temperature-change {dT} K..0 K",
                 cycles=6)
    assert result.cycles == {"count": 6, "outcome": outcome, "decided_at": decided}
    if outcome == "alternating":
        # each half-cycle reverses a plastic strain of alpha*(dT - 2*dT_y)
        strains = [s.plastic_strain[0] for s in result.states]
        assert_close(np.diff(strains[1:]), [(-1) ** (i + 1) * ALPHA * (dT - 2 * DT_Y)
                                            for i in range(len(strains) - 2)], rel=1e-8)


def two_bars():
    """Two equal bars share a rigid plate carrying P (sigma_p = f_y/2 in each); one is heated."""
    mat, A, L = plastic(), 1e-4, 1.0
    return Model([Station("G", 0.0), Station("plate", L)],
                 [Segment("hot", "G", "plate", mat, area("a", A)),
                  Segment("cold", "G", "plate", mat, area("a", A))],
                 [Support("G")], cases=[Case("service", (Load("plate", FY * A),),
                                             (("hot", 250.0),))])


def test_held_load_with_cycling_temperature_ratchets():
    # The two-bar model: with sigma_p held, each cycle to theta_m beyond theta_1 =
    # 4*(f_y - sigma_p)/(E*alpha) = 200 K stretches the plate by alpha*L*(theta_m - theta_1):
    # equilibrium and compatibility of the two bars (the classic two-bar ratchet model, from memory)
    result = run(two_bars(), "load 0..1; temperature-factor 0..1; temperature-factor 1..0",
                 cycles=8, cycle_from=2)
    assert result.cycles["outcome"] == "ratcheting"
    assert result.cycles["decided_at"] == 2
    u = [s.result.displacement("plate") for s in result.states]
    per_cycle = np.diff(u[2::2])[1:]          # from the second cycle on
    assert_close(per_cycle, np.full(len(per_cycle), ALPHA * 1.0 * (250.0 - 200.0)), rel=1e-8)


def test_two_bars_below_the_ratchet_bound_shake_down():
    model = two_bars()
    model = Model(model.stations, model.segments, model.supports,
                  cases=[Case("service", model.cases[0].loads, (("hot", 150.0),))])
    result = run(model, "load 0..1; temperature-factor 0..1; temperature-factor 1..0",
                 cycles=5, cycle_from=2)
    assert result.cycles == {"count": 5, "outcome": "shakedown", "decided_at": 2}


# --- limit analysis against the path (hypothesis) -------------------------------------------
@st.composite
def series_parallel(draw):
    stages = draw(st.integers(2, 4))
    stations = [Station(f"s{i}", float(i)) for i in range(stages + 1)]
    segments = []
    for i in range(stages):
        for j in range(draw(st.integers(1, 3))):
            fy = draw(st.sampled_from([200e6, 240e6, 355e6]))
            fc = draw(st.sampled_from([None, 150e6]))
            mat = Material(f"m{i}{j}", draw(st.sampled_from([70e9, 200e9])), 0.0, fy,
                           behaviour="elastic-plastic", compressive_yield_strength=fc)
            segments.append(Segment(f"e{i}{j}", f"s{i}", f"s{i + 1}", mat,
                                    area(f"a{i}{j}", draw(st.sampled_from([1e-4, 2e-4, 5e-4])))))
    both = draw(st.booleans())
    supports = [Support("s0")] + ([Support(f"s{stages}")] if both else [])
    at = draw(st.lists(st.integers(1, stages - 1 if both else stages), min_size=1, max_size=2,
                       unique=True))
    loads = [Load(f"s{k}", draw(st.sampled_from([-3e3, 2e3, 5e3]))) for k in at]
    return Model(stations, segments, supports, loads)


@given(series_parallel())
def test_limit_load_of_linprog_equals_the_collapse_of_the_path(model):
    limit = collapse(model, check_buckling=False).load_factor
    result = run(model, f"load 0..{2.5 * limit}")
    assert result.collapsed_on == 1, result.events
    assert result.events[-1].event == "collapses"
    assert_close(result.events[-1].value, limit, rel=1e-8)


# --- input errors ------------------------------------------------------------------------------
def test_a_plastic_taper_is_one_error_suggesting_a_split():
    mat = plastic()
    model = Model([Station("a", 0.0), Station("b", 1.0)],
                  [Segment("cone", "a", "b", mat, area("big", 2e-4), area("small", 1e-4))],
                  [Support("a"), Support("b")])
    with pytest.raises(ModelError) as exc:
        run(model, "temperature-change 0 K..10 K")
    assert str(exc.value) == ("segments ('cone'): an elastic-plastic segment must be prismatic "
                              "(a taper yields over part of its length first): split it into "
                              "shorter prismatic segments")


def test_a_distributed_load_on_a_plastic_segment_is_refused():
    model = restrained()
    model = Model(model.stations, [Segment("bar", "a", "b", plastic(), area("r", 1e-4),
                                           distributed_load=100.0)], model.supports)
    with pytest.raises(ModelError, match="cannot carry a distributed load or self-weight"):
        run(model, "load 0..1")


def test_a_leg_must_start_where_the_path_stands():
    with pytest.raises(ModelError) as exc:
        run(restrained(), "temperature-change 0 K..50 K; temperature-change 40 K..0 K")
    assert str(exc.value) == ("--path: leg 2 starts at 40 K, but the temperature change is 50 K "
                              "there: start the leg where the path stands")


def test_unknown_leg_parameter():
    with pytest.raises(ModelError) as exc:
        parse_path("loads 0..1")
    assert str(exc.value) == "--path leg 1: unknown parameter 'loads'; did you mean 'load'?"


# --- the command line ------------------------------------------------------------------------
PIPE = """
title = "restrained bar"
[settings]
behaviour = "elastic-plastic"
[materials.s]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
yield_strength = "240 MPa"
[sections.r]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 m"
b = "2 m"
[[segments]]
name = "bar"
from = "a"
to = "b"
material = "s"
section = "r"
[[supports]]
at = "a"
[[supports]]
at = "b"
[[loads]]
at = "b"
force = "1 kN"
"""


def test_path_command_json(tmp_path, cli):
    path = tmp_path / "bar.toml"
    path.write_text(PIPE, encoding="utf-8")
    out = cli("path", path, "--path", "temperature-change 0 K..150 K; temperature-change 150 K..0 K",
              "--cycles", "3", "--format", "json")
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    assert set(data) >= {"title", "units", "legs", "events", "states", "cycles"}
    assert [leg["index"] for leg in data["legs"]] == list(range(1, 7))
    assert data["legs"][0]["parameter"] == "temperature-change"
    assert data["events"][0] == {"leg": 1, "name": "bar", "event": "yields",
                                 "value": pytest.approx(100.0)}
    assert data["cycles"] == {"count": 3, "outcome": "shakedown", "decided_at": 2}
    seg = data["states"][1]["segments"][0]
    assert seg["plastic_strain"] == pytest.approx(-12e-6 * 50)
    assert "plastic_displacement" in data["states"][1]["stations"][0]
    table = cli("path", path, "--path", "temperature-change 0 K..150 K")
    assert table.exit_code == 0
    assert "    1  bar   yields  100 K" in table.stdout


def test_path_command_stops_at_the_collapse(tmp_path, cli):
    path = tmp_path / "bar.toml"
    path.write_text(PIPE.replace('at = "b"\nforce', 'at = "b"\nforce').replace(
        '[[supports]]\nat = "b"\n', ""), encoding="utf-8")
    out = cli("path", path, "--path", "load 0..30; load 30..0; load 0..1")
    assert out.exit_code == 0, out.output
    assert "the model collapses on leg 1 at 24: no further load can be carried; the path stops " \
           "there (legs 2 to 3 not run)" in " ".join(out.stdout.split())  # wrapped to the width
    plot = tmp_path / "path.svg"
    drawn = cli("path", path, "--path", "load 0..30", "--plot", plot)
    assert drawn.exit_code == 0 and plot.exists()


def test_solve_and_check_say_they_ignore_plasticity_and_flag_linear_yield(tmp_path, cli):
    # the restrained bar heated by 150 K: linear stress -E*alpha*dT = -360 MPa, beyond the
    # 240 MPa yield strength (the closed form of a restrained bar, Gere & Goodno sec. 2.5,
    # from memory)
    path = tmp_path / "bar.toml"
    path.write_text(PIPE.replace('section = "r"\n', 'section = "r"\ntemperature_change = "150 K"\n'),
                    encoding="utf-8")
    ignores = ("note: the linear solve ignores the elastic-plastic behaviour of segment 'bar': "
               "follow yielding with 'axialfe path', the collapse load with 'axialfe collapse'")
    beyond = ("note: case 'base': segment 'bar' is beyond its yield strength in the linear "
              "result (-360 MPa against -240 MPa): the linear result does not hold there; "
              "follow the case with 'axialfe path'")
    for command in ("solve", "check"):
        out = cli(command, path, "--format", "json")
        assert json.loads(out.stdout)            # the notes stay out of the JSON
        assert out.stderr.splitlines() == [ignores, beyond], out.stderr
    cool = tmp_path / "cool.toml"
    cool.write_text(PIPE, encoding="utf-8")      # no heating: the load sits on a support
    assert cli("solve", cool).stderr.splitlines() == [ignores]
    elastic = tmp_path / "elastic.toml"
    elastic.write_text(PIPE.replace('behaviour = "elastic-plastic"\n', ""), encoding="utf-8")
    assert cli("solve", elastic).stderr == ""


def test_linear_kinematic_hardening_of_a_restrained_bar():
    # Past first yield the stress follows the tangent modulus E_t = E*H/(E + H):
    # sigma = -(f_y + E_t*alpha*(dT - dT_y)); with kinematic hardening the reverse yield
    # on cooling comes after a stress change of 2*f_y (common practice: the Bauschinger
    # effect of a kinematic rule)
    H = 20e9
    e_t = E * H / (E + H)
    result = run(restrained(hardening_modulus=H),
                 "temperature-change 0 K..300 K; temperature-change 300 K..0 K")
    peak = -(FY + e_t * ALPHA * (300 - DT_Y))
    assert_close(result.states[0].result.stress[0, 0], peak)
    assert events(result) == [(1, "bar", "yields"), (2, "bar", "unloads"), (2, "bar", "yields")]
    assert_close(result.events[2].value, 300 - 2 * FY / (E * ALPHA))
    # on the way back the tangent is E_t again, from the reverse yield to dT = 0
    assert_close(result.states[1].result.stress[0, 0],
                 peak + 2 * FY + e_t * ALPHA * (300 - 2 * DT_Y))


def test_a_cycle_that_touches_yield_reports_no_event():
    result = run(restrained(), "temperature-change 0 K..150 K; temperature-change 150 K..0 K",
                 cycles=3)
    assert events(result) == [(1, "bar", "yields"), (2, "bar", "unloads")]


def test_reader_keys_of_elastic_plastic_materials(tmp_path):
    from axialfe.io.modelfile import parse_model

    text = PIPE.replace('[settings]\nbehaviour = "elastic-plastic"\n', "").replace(
        'yield_strength = "240 MPa"', 'yield_strength = "240 MPa"\nbehaviour = "elastic-plastic"\n'
        'compressive_yield_strength = "200 MPa"\nhardening_modulus = "2 GPa"')
    mat = parse_model(text).segments[0].material
    assert (mat.behaviour, mat.compressive_yield_strength, mat.hardening_modulus) == (
        "elastic-plastic", 200e6, 2e9)
    assert parse_model(PIPE).segments[0].material.plastic
    with pytest.raises(ModelError) as exc:
        parse_model(PIPE.replace('behaviour = "elastic-plastic"', 'behaviour = "plastic"'), "m.toml")
    assert str(exc.value) == "m.toml:4: settings: unknown behaviour 'plastic'; did you mean 'elastic'?"


def test_the_pipe_example_shakes_down_with_the_hand_residual_stress(cli):
    # the hand solution in the example's comments: residual E*alpha*(dT - dT_y), 2*dT_y > dT
    from conftest import EXAMPLES

    out = cli("path", f"{EXAMPLES}/pipe-anchors-shakedown.toml", "--path",
              "temperature 20 degC..170 degC; temperature 170 degC..20 degC", "--cycles", "4",
              "--format", "json")
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    e_alpha = 200e9 * 11.7e-6
    assert data["events"][0]["value"] == pytest.approx(20 + 250e6 / e_alpha, rel=1e-12)
    assert data["cycles"] == {"count": 4, "outcome": "shakedown", "decided_at": 2}
    residual = data["states"][1]["segments"][0]["stress"][0]
    assert residual == pytest.approx(e_alpha * (150 - 250e6 / e_alpha) / 1e6, rel=1e-9)
    limit = json.loads(cli("collapse", f"{EXAMPLES}/pipe-anchors-shakedown.toml", "--format",
                           "json").stdout)
    area_ = 3.141592653589793 / 4 * (114.3 ** 2 - (114.3 - 2 * 6.02) ** 2) * 1e-6
    assert limit["load_factor"] == pytest.approx(2 * 250e6 * area_ / 60e3, rel=1e-9)
