"""Sweeps: exact events against hand computations, grids, and the command line."""

from __future__ import annotations

import json
import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, strategies as st

from axialfe import Gap, Load, Model, ModelError, Segment, SolveError, Station, Support, solve
from axialfe.formatting import note_text
from axialfe.tracking.sweep import parse_range, sweep
from axialfe.units import OutputUnits

from conftest import area, assert_close, steel
from test_gaps import gap_models

RAIL = """
title = "rail with joint"
[settings]
reference_temperature = "15 degC"
[materials.rail-steel]
elastic_modulus = "205 GPa"
thermal_expansion = "11.5e-6 /K"
yield_strength = "460 MPa"
[sections.r]
shape = "area"
area = "7600 mm^2"
[stations]
a = "0 m"
b = "25 m"
[[segments]]
name = "rail"
from = "a"
to = "b"
material = "rail-steel"
section = "r"
[[supports]]
at = "a"
[[gaps]]
name = "joint"
at = "b"
side = "+x"
clearance = "6 mm"
"""
E_R, ALPHA_R, L_R, C_R, FY_R = 205e9, 11.5e-6, 25.0, 6e-3, 460e6


@pytest.fixture
def rail(tmp_path):
    path = tmp_path / "rail.toml"
    path.write_text(RAIL, encoding="utf-8")
    return path


def test_rail_closing_temperature_and_yield(rail):
    # Expansion gap: closes at dT_c = c/(alpha*L); afterwards sigma = -E*alpha*(dT - dT_c),
    # which reaches the yield strength at dT_c + f_y/(E*alpha) (a restrained bar heated
    # until it first yields, dT_y = f_y/(E*alpha): Gere and Goodno, thermal stress, from memory).
    from axialfe.io.modelfile import read_model

    result = sweep(read_model(rail), "temperature_change", -40.0, 250.0, 30, unit="K")
    dT_c = C_R / (ALPHA_R * L_R)
    assert [(e.name, e.event) for e in result.events] == [("joint", "closes"), ("rail", "yields")]
    assert_close(result.events[0].value, dT_c, rel=1e-12)
    assert_close(result.events[1].value, dT_c + FY_R / (E_R * ALPHA_R), rel=1e-12)
    assert any("linear-elastic" in n for n in result.notes)
    for value, res in zip(result.values, result.results):
        expected = -E_R * ALPHA_R * max(value - dT_c, 0.0)
        assert_close(res.stress[0], [expected, expected], rel=1e-9, abs_=1e-3)
    assert_close(result.values, np.linspace(-40.0, 250.0, 30), rel=0, abs_=0)


def test_decreasing_range_and_absolute_temperature(rail):
    from axialfe.io.modelfile import read_model

    model = read_model(rail)
    down = sweep(model, "temperature_change", 120.0, -40.0, 9, unit="K")
    assert [(e.name, e.event) for e in down.events] == [("joint", "opens")]
    assert_close(down.events[0].value, C_R / (ALPHA_R * L_R), rel=1e-12)
    absolute = sweep(model, "temperature", -20.0, 150.0, 18, unit="degC")
    # closes at the reference (15 degC) plus dT_c
    assert_close(absolute.events[0].value, 15.0 + C_R / (ALPHA_R * L_R), rel=1e-12)
    assert absolute.unit == "degC"


def test_event_on_a_grid_point_is_one_event():
    # dT_c = 1e-3 / (10e-6 * 1.0) = 100 K, exactly a grid value of 0..200 K in 201 steps
    m = Model([Station("a", 0.0), Station("b", 1.0)],
              [Segment("s", "a", "b", steel(alpha=10e-6), area("r", 1e-4))], [Support("a")],
              gaps=[Gap("g", ("b",), 1e-3, side="+x")])
    result = sweep(m, "temperature_change", 0.0, 200.0, 201)
    assert [(e.name, e.event) for e in result.events] == [("g", "closes")]
    assert_close(result.events[0].value, 100.0, rel=1e-12)
    assert result.results[100].gap_force[0] == pytest.approx(0.0, abs=1e-6)


def test_state_held_at_start_is_no_event():
    m = Model([Station("a", 0.0), Station("b", 1.0)],
              [Segment("s", "a", "b", steel(alpha=10e-6), area("r", 1e-4))], [Support("a")],
              gaps=[Gap("g", ("b",), 1e-3, side="+x")])
    assert sweep(m, "temperature_change", 150.0, 300.0, 4).events == ()


def two_walls(c_contact, c_link):
    """A steel bar from the left wall and an aluminium bar from the right wall whose ends meet
    with a contact clearance, tied by a slack link (all values invented for the test)."""
    E1, a1, A1, L1 = 200e9, 12e-6, 4e-4, 0.6
    E2, a2, A2, L2 = 70e9, 23e-6, 6e-4, 0.4
    m = Model([Station("w1", 0.0), Station("e1", L1), Station("e2", L1), Station("w2", L1 + L2)],
              [Segment("steel", "w1", "e1", steel(E=E1, alpha=a1), area("A1", A1)),
               Segment("alu", "w2", "e2", steel("alu", E=E2, alpha=a2), area("A2", A2))],
              [Support("w1"), Support("w2")],
              gaps=[Gap("butt", ("e1", "e2"), c_contact),
                    Gap("tie", ("e1", "e2"), c_link, kind="slack")])
    return m, (E1, a1, A1, L1, E2, a2, A2, L2)


def test_link_and_contact_change_state_in_one_sweep():
    # Hand computation: free ends move u1 = a1*dT*L1 and u2 = -a2*dT*L2, so the ends approach
    # by dT*(a1*L1 + a2*L2). The contact closes at dT = c/(a1*L1 + a2*L2); on cooling the
    # link goes taut at dT = -c_link/(a1*L1 + a2*L2). After closure the force is
    # R = (dT*(a1*L1 + a2*L2) - c)/(L1/(E1*A1) + L2/(E2*A2)) (two-material bar between walls
    # with a gap: Timoshenko, Strength of Materials, Part I, thermal stresses, from memory).
    c, c_link = 0.1e-3, 0.2e-3
    m, (E1, a1, A1, L1, E2, a2, A2, L2) = two_walls(c, c_link)
    s = a1 * L1 + a2 * L2
    result = sweep(m, "temperature_change", -60.0, 80.0, 15)
    assert [(e.name, e.event) for e in result.events] == [("tie", "slack"), ("butt", "closes")]
    assert_close([e.value for e in result.events], [-c_link / s, c / s], rel=1e-12)
    flex = L1 / (E1 * A1) + L2 / (E2 * A2)
    last = result.results[-1]
    assert_close(last.gap_force, [-(80.0 * s - c) / flex, 0.0], rel=1e-9)
    first = result.results[0]
    assert_close(first.gap_force, [0.0, (60.0 * s - c_link) / flex], rel=1e-9)


def test_sweep_agrees_with_direct_solves():
    m, _ = two_walls(0.1e-3, 0.2e-3)
    result = sweep(m, "temperature_change", -60.0, 80.0, 8)
    for value, res in zip(result.values, result.results):
        direct = solve(Model(m.stations, m.segments, m.supports, gaps=m.gaps,
                             temperature_change=float(value)))["base"]
        assert_close(res.u, direct.u, rel=1e-9, abs_=1e-15)
        assert_close(res.gap_force, direct.gap_force, rel=1e-9, abs_=1e-6)
        assert res.equilibrium_residual < 1e-9


def test_load_factor_sweep_closes_at_hand_value():
    # The stop closes when P*a/(EA) = c: at factor c*EA/(P*a).
    E, A, a, c, P = 200e9, 1e-4, 1.5, 1e-3, 100e3
    m = Model([Station("A", 0.0), Station("C", a), Station("B", 2.0)],
              [Segment("AC", "A", "C", steel(), area("s", A)),
               Segment("CB", "C", "B", steel(), area("s", A))],
              [Support("A")], [Load("C", P)], gaps=[Gap("wall", ("B",), c, side="+x")],
              temperature_change=30.0)
    result = sweep(m, "load_factor", 0.0, 2.0, 5)
    # the temperature is held: the bar has grown alpha*dT*L before any load
    growth = 12e-6 * 30.0 * 2.0
    assert_close(result.events[0].value, (c - growth) * E * A / (P * a), rel=1e-12)


def test_lost_equilibrium_names_the_value():
    m = Model([Station("A", 0.0), Station("B", 1.0), Station("C", 1.0), Station("D", 2.0)],
              [Segment("AB", "A", "B", steel(), area("s", 1e-4)),
               Segment("CD", "C", "D", steel(), area("s", 1e-4))],
              [Support("A")], [Load("D", -50e3)], gaps=[Gap("butt", ("B", "C"), 0.0)])
    with pytest.raises(SolveError) as err:
        sweep(m, "load_factor", 1.0, -1.0, 5)
    assert str(err.value).endswith("the part floats while the gap is open) at load_factor = 0")
    assert "'butt'" in str(err.value)


def test_parse_range():
    assert parse_range("-40 K..120 K", "temperature_change") == (-40.0, 120.0, "K")
    assert parse_range("-40 degC..120 degC", "temperature_change") == (-40.0, 120.0, "degC")
    assert parse_range("0..2", "load_factor") == (0.0, 2.0, "1")
    lo, hi, unit = parse_range("-20 degC..302 degF", "temperature")
    assert (lo, unit) == (-20.0, "degC") and hi == pytest.approx(150.0)
    with pytest.raises(ModelError) as err:
        parse_range("-40 K to 120 K", "temperature_change")
    assert str(err.value) == ("--temperature-change: expected a range 'START..STOP', e.g. "
                              "'-40 K..120 K': got '-40 K to 120 K'")
    with pytest.raises(ModelError) as err:
        parse_range("-40..120", "temperature_change")
    assert str(err.value) == "--temperature-change: '-40..120' has no unit: give e.g. '-40 K..120 K'"
    with pytest.raises(ModelError, match="not of temperature difference"):
        parse_range("-40 mm..120 mm", "temperature_change")


def test_cli_sweep_formats(cli, rail, tmp_path):
    res = cli("sweep", rail, "--temperature-change", "-40 K..120 K", "--steps", "161")
    assert res.exit_code == 0, res.output
    assert "joint  closes" in res.output and "cautions:" in res.output
    res = cli("sweep", rail, "--temperature-change=-40 K..120 K", "--steps", "17", "-f", "json")
    data = json.loads(res.output)
    assert {"title", "units", "parameter", "unit", "values", "events", "cases"} <= set(data)
    assert data["parameter"] == "temperature_change" and data["unit"] == "K"
    assert len(data["values"]) == len(data["cases"]) == 17
    assert data["events"] == [{"name": "joint", "event": "closes",
                               "value": pytest.approx(C_R / (ALPHA_R * L_R), rel=1e-12)}]
    assert {g["name"] for g in data["cases"][-1]["gaps"]} == {"joint"}
    out = tmp_path / "sweep.csv"
    res = cli("sweep", rail, "--temperature", "-20 degC..150 degC", "--steps", "5", "-f", "csv",
              "-o", out)
    assert res.exit_code == 0
    lines = out.read_text().splitlines()
    assert lines[0].startswith("temperature [degC],u a [mm],u b [mm]") and len(lines) == 1 + 5 + 3


def test_cli_sweep_errors(cli, rail):
    res = cli("sweep", rail, "--steps", "5")
    assert res.exit_code == 2
    assert ("error: give exactly one of --temperature-change, --temperature, --temperature-factor "
            "or --load-factor") in res.output
    res = cli("sweep", rail, "--load-factor", "0..2", "--case", "hot")
    assert res.exit_code == 2 and "unknown case 'hot'" in res.output


def test_sweep_notes_the_thermal_input_it_replaces():
    m, _ = two_walls(0.1e-3, 0.2e-3)
    m = Model(m.stations, (m.segments[0], replace(m.segments[1], temperature_change=20.0)),
              m.supports, gaps=m.gaps)
    result = sweep(m, "temperature_change", 0.0, 10.0, 3)
    assert note_text(result.notes[0], OutputUnits()) == ("the swept temperature replaces every segment's own thermal input, "
                               "which in case 'base' varies by segment: 'steel' (0 K), 'alu' (20 K)")


def test_load_factor_is_shown_without_a_unit(cli, tmp_path):
    path = tmp_path / "bar.toml"
    path.write_text(RAIL.replace('[[gaps]]', '[[loads]]\nat = "b"\nforce = "-100 kN"\n[[gaps]]'))
    res = cli("sweep", path, "--load-factor", "0..2", "--steps", "3")
    assert res.exit_code == 0
    assert "load_factor from 0 to 2, 3 steps" in res.output
    assert "at 0  " in res.output and " 1 " not in res.output.split("\n")[1]


def test_temperature_below_absolute_zero_is_refused(rail):
    with pytest.raises(ModelError) as err:
        parse_range("-500 degC..20 degC", "temperature")
    assert str(err.value) == "--temperature: '-500.0 degC' lies below absolute zero"


_DT = st.floats(-120.0, 120.0).map(lambda v: round(v, 3))  # no subnormal temperature changes


@given(gap_models(), _DT, _DT)
def test_sweep_equals_direct_solves_on_random_gap_models(model, a, b):
    # the tracked path must agree with an independent solve at every grid value, and each
    # reported event must be a change of state between the values just before and after it
    from hypothesis import assume

    assume(abs(a - b) > 1.0)
    try:
        result = sweep(model, "temperature_change", a, b, 7)
        steps = list(result.results)
    except SolveError:
        return  # a lost equilibrium along the way is reported, and tested elsewhere
    for value, res in zip(result.values, steps):
        direct = solve(Model(model.stations, model.segments, model.supports, model.loads,
                             gaps=model.gaps, temperature_change=float(value)))["base"]
        scale = max(np.abs(direct.u).max(), 1e-5)  # 1e-12 m at the least: rounding, not mechanics
        assert_close(res.u, direct.u, rel=1e-7, abs_=1e-7 * scale)
        assert res.equilibrium_residual <= 1e-9
    span = abs(b - a)
    for event in result.events:
        if event.event == "yields":
            continue
        j = [g.name for g in model.gaps].index(event.name)
        step = 1e-6 * span * (1 if b > a else -1)
        lo, hi = sorted((a, b))
        if lo < event.value - abs(step) and event.value + abs(step) < hi:
            before, after = result.result_at(event.value - step), result.result_at(event.value + step)
            assert before.gap_closed[j] != after.gap_closed[j]


def test_too_few_steps(cli, rail):
    res = cli("sweep", rail, "--temperature-change", "0 K..10 K", "--steps", "1")
    assert res.exit_code == 2
    assert "error: --steps: must be at least 2 (both ends of the range): got 1" in res.output


# --- temperature factor, chosen segments, buckling events, grouped events ---------------------
def _stop_model(own=(50.0, 20.0), clearance=0.3e-3):
    """Two steel bars in series (1 m each) from a wall to a stop ``clearance`` beyond the end."""
    segs = (Segment("first", "wall", "mid", steel(), area("s", 1e-4), temperature_change=own[0]),
            Segment("second", "mid", "end", steel(), area("s", 1e-4), temperature_change=own[1]))
    return Model((Station("wall", 0.0), Station("mid", 1.0), Station("end", 2.0)), segs,
                 (Support("wall"),), gaps=(Gap("stop", ("end",), clearance, side="+x"),))


def test_temperature_factor_scales_the_case_own_field():
    # Free growth alpha*dT*L of each bar: 12e-6 * (50 + 20) K * 1 m = 0.84 mm at factor 1, so the
    # stop 0.3 mm away closes at factor 0.3/0.84 (common practice: free thermal growth).
    res = sweep(_stop_model(), "temperature_factor", 0.0, 1.5, 4)
    assert [(e.name, e.event) for e in res.events] == [("stop", "closes")]
    assert res.events[0].value == pytest.approx(0.3 / 0.84, rel=1e-12)
    assert res.unit == "1"
    assert note_text(res.replaced, OutputUnits()) == ("scales the case's own temperature changes of every segment ('first' "
                            "50 K, 'second' 20 K); replaces none")
    # each step is the case solved with its own temperatures times the factor
    m = _stop_model(own=(25.0, 10.0))
    direct = solve(m)["base"]
    at_half = res.result_at(0.5)
    assert_close(at_half.u, direct.u, rel=1e-12, abs_=1e-18)
    assert_close(at_half.gap_force, direct.gap_force, rel=1e-9, abs_=1e-9)


def test_temperature_sweep_of_chosen_segments():
    # Only 'first' takes the swept change, 'second' keeps its own 20 K: the stop closes when
    # 12e-6 * (dT + 20 K) * 1 m = 0.3 mm, at dT = 5 K.
    res = sweep(_stop_model(), "temperature_change", 0.0, 50.0, 3, unit="K", segments=["first"])
    assert res.events[0].value == pytest.approx(5.0, rel=1e-9)
    assert note_text(res.replaced, OutputUnits()) == ("replaces the thermal input of segments 'first' ('first' 50 K in case "
                            "'base') by the swept change; the others keep the case's own")
    with pytest.raises(ModelError) as err:
        sweep(_stop_model(), "temperature_change", 0.0, 50.0, 3, segments=["frist"])
    assert str(err.value) == "--segments: unknown segment 'frist'; did you mean 'first'?"
    with pytest.raises(ModelError) as err:
        sweep(_stop_model(), "temperature_change", 0.0, 50.0, 3, segments=[])
    assert str(err.value) == "--segments: give at least one segment's name (NAME,NAME,...)"
    with pytest.raises(ModelError) as err:
        sweep(_stop_model(), "load_factor", 0.0, 2.0, 3, segments=["first"])
    assert str(err.value) == ("--segments: chooses the segments of a temperature sweep; a "
                              "load-factor sweep scales the case's loads")


def _walls(n=1, d=0.020, length=1.0, fy=250e6):
    rod = __import__("axialfe").Section("d", "round", (("diameter", d),))
    mat = steel(yield_strength=fy)
    xs = np.linspace(0.0, length, n + 1)
    stations = tuple(Station(f"s{i}", float(x)) for i, x in enumerate(xs))
    segs = tuple(Segment(f"bar{i}", f"s{i}", f"s{i + 1}", mat, rod) for i in range(n))
    return Model(stations, segs, (Support("s0"), Support(f"s{n}")))


def test_buckles_event_at_the_thermal_buckling_temperature():
    # A bar fixed between walls and heated takes N = -E*A*alpha*dT; with Euler's load
    # pi^2*E*I/L^2 (K = 1; slender: K*L/r = 200 lies on Johnson's Euler branch) it buckles at
    # dT = pi^2*I/(L^2*A*alpha) = pi^2*d^2/(16*L^2*alpha) = 20.56 K (Timoshenko and Gere,
    # Theory of Elastic Stability, 2nd ed., sec. 2.1, with N from the restrained growth).
    from axialfe.checks.buckling import buckling_capacities

    m = _walls()
    capacity = [c for c, _ in buckling_capacities(m, m.checks)]
    expected = math.pi ** 2 * 0.020 ** 2 / (16 * 1.0 ** 2 * 12e-6)
    res = sweep(m, "temperature_change", 0.0, 50.0, 3, unit="K", buckling_capacity=capacity)
    assert [(e.name, e.event) for e in res.events] == [("bar0", "buckles")]
    assert res.events[0].value == pytest.approx(expected, rel=1e-12)
    assert expected == pytest.approx(20.562, rel=1e-4)
    # without capacities no buckling event is sought
    assert sweep(m, "temperature_change", 0.0, 50.0, 3, unit="K").events == ()


def test_identical_events_at_one_value_are_one_line(cli, tmp_path):
    # Three equal bars between walls reach yield together at dT = f_y/(E*alpha) = 104.17 K
    # (Gere and Goodno, Mechanics of Materials, sec. 2.5).
    res = sweep(_walls(n=3), "temperature_change", 0.0, 150.0, 3, unit="K")
    assert [e.value for e in res.events] == [pytest.approx(250e6 / (200e9 * 12e-6), rel=1e-12)] * 3
    assert res.grouped_events() == [(("bar0", "bar1", "bar2"), "yields", res.events[0].value)]


def test_cli_temperature_factor_and_no_unit_heading(cli, rail, tmp_path):
    path = tmp_path / "heated.toml"
    path.write_text(RAIL.replace('section = "r"', 'section = "r"\ntemperature_change = "60 K"'),
                    encoding="utf-8")
    res = cli("sweep", path, "--temperature-factor", "0..1.5", "--steps", "4")
    assert res.exit_code == 0, res.output
    lines = res.output.splitlines()
    assert lines[1:3] == ["case 'base', temperature_factor from 0 to 1.5, 4 steps; scales the "
                          "case's own temperature changes of", "  every segment ('rail' 60 K); "
                          "replaces none"]
    assert lines[6].split() == ["name", "event", "temperature_factor"]
    # the joint closes when alpha*dT*L = c: factor 6 mm/(11.5e-6 * 60 K * 25 m) = 0.3478
    assert float(lines[8].split()[-1]) == pytest.approx(C_R / (ALPHA_R * 60 * L_R), rel=1e-8)
    data = json.loads(cli("sweep", path, "--temperature-factor", "0..1.5", "--steps", "3",
                          "-f", "json").stdout)
    assert data["parameter"] == "temperature_factor" and data["unit"] == "1"
    assert data["replaced"].startswith("scales the case's own temperature changes")
    csv_head = cli("sweep", path, "--temperature-factor", "0..1", "--steps", "2", "-f",
                   "csv").stdout.splitlines()[0]
    assert csv_head.startswith("temperature_factor,")
    bad = cli("sweep", path, "--temperature-factor", "0 K..1 K")
    assert bad.exit_code == 2
    assert bad.output.strip() == ("error: --temperature-factor: a temperature factor is a plain "
                                  "number: got '0 K..1 K'")
    both = cli("sweep", path, "--temperature-factor", "0..1", "--load-factor", "0..1")
    assert both.output.strip() == ("error: give exactly one of --temperature-change, --temperature, "
                                   "--temperature-factor or --load-factor")
    seg = cli("sweep", path, "--temperature-change", "0 K..60 K", "--segments", "rial")
    assert seg.exit_code == 2
    assert seg.output.strip() == "error: --segments: unknown segment 'rial'; did you mean 'rail'?"


def test_us_output_writes_the_replaced_temperatures_in_degf():
    # a change of 55 K is 99 degF (1 degF = 5/9 K, the definition of the Fahrenheit degree)
    from typer.testing import CliRunner

    from axialfe.cli import app

    root = Path(__file__).resolve().parent.parent
    out = CliRunner().invoke(app, ["sweep", str(root / "examples" / "shaft-end-float.toml"),
                                   "--temperature-change", "0 K..60 K", "--temperature-unit",
                                   "degF", "-f", "json"]).stdout
    data = json.loads(out)
    assert "'shaft' 99 degF" in data["replaced"] and " K" not in data["replaced"]
    assert "'shaft' (99 degF)" in data["notes"][0]
