"""Tolerance studies: toleranced inputs, the batch solve, worst case and Monte Carlo.

Checks against the outside world name their source beside them; "from memory"
where it is, "common practice" for a fact of the trade.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from axialfe.cli import app
from axialfe.engine.system import solve
from axialfe.errors import ModelError
from axialfe.io.modelfile import parse_model
from axialfe.tolerance import parse_tolerance
from axialfe.tolerance.batch import Batch
from axialfe.tolerance.study import OutputSet, _draw, run_study, wilson

from conftest import examples

runner = CliRunner()
EXAMPLES = Path(__file__).resolve().parent.parent / "examples" / "tolerance"


def study_of(text, samples=2000, seed=1, outputs=None):
    model = parse_model(text, "m.toml")
    return run_study(model, lambda v: parse_model(text, "m.toml", overrides=v), samples, seed,
                     outputs)


def row(study, name, case="base"):
    return next(r for r in study.outputs if r["name"] == name and r["case"] == case)


# --- the forms of a toleranced value ---------------------------------------------
def test_string_and_table_forms():
    t = parse_tolerance("0.20 mm +0.05/-0.03", "length")
    assert (t.value, t.distribution) == (0.0002, "normal")
    assert t.lower == pytest.approx(0.17e-3) and t.upper == pytest.approx(0.25e-3)
    assert t.sigma == pytest.approx(0.08e-3 / 6)      # limits at +-3 sigma (common practice)
    assert t.centre == pytest.approx(0.21e-3) and t.nominal == 0.0002
    for text in ("0.20 mm ±0.02", "0.20 mm +-0.02", "0.20 mm +/-0.02"):
        s = parse_tolerance(text, "length")
        assert (s.lower, s.upper) == pytest.approx((0.18e-3, 0.22e-3))
    shaft = parse_tolerance("50 mm -0.025/-0.050", "length")      # both deviations below
    assert shaft.one_sided and shaft.nominal == pytest.approx(49.9625e-3)
    u = parse_tolerance({"value": "0.20 mm", "plus": "0.05 mm", "minus": "0.03 mm",
                         "distribution": "uniform"}, "length")
    assert (u.lower, u.upper, u.distribution) == (pytest.approx(0.17e-3),
                                                  pytest.approx(0.25e-3), "uniform")
    assert u.sigma == pytest.approx(0.08e-3 / math.sqrt(12))
    n = parse_tolerance({"value": "0.20 mm", "std": "0.01 mm"}, "length")
    assert (n.lower, n.upper, n.sigma) == pytest.approx((0.17e-3, 0.23e-3, 1e-5))
    # a tolerance on an absolute temperature is a difference
    hot = parse_tolerance("80 degC ±5", "temperature")
    assert (hot.lower, hot.upper) == pytest.approx((348.15, 358.15))
    assert parse_tolerance("0.2 ±0.03", None).upper == pytest.approx(0.23)


@pytest.mark.parametrize("text, message", [
    ("0.20 mm ±", "'0.20 mm ±': the tolerance needs its deviation after '±', e.g. "
                  "'0.20 mm ±0.02'"),
    ("0.20 mm +0.03/+0.05", "'0.20 mm +0.03/+0.05': the upper deviation comes first and must "
                            "exceed the lower one, e.g. '0.20 mm +0.05/-0.03'"),
    ("0.20 mm ±0.02 mm", "'0.20 mm ±0.02 mm': the deviation must be one positive number in "
                         "the unit of the value, e.g. '0.20 mm ±0.02'"),
    ("0.20 mm ±0", "'0.20 mm ±0': the tolerance has no width"),
    ({"value": "0.2 mm", "sdt": "0.1 mm"}, "unknown key 'sdt' in a toleranced value"),
    ({"value": "0.2 mm", "std": "0.1 mm", "distribution": "uniform"},
     "'std' gives a normal distribution: leave 'distribution' out"),
])
def test_malformed_tolerances_are_refused(text, message):
    with pytest.raises(ModelError) as exc:
        parse_tolerance(text, "length")
    assert exc.value.message == message


BAR = """
title = "heated bar against a stop"
[materials.m]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
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
temperature_change = "{dt}"
[[supports]]
at = "a"
[[gaps]]
name = "stop"
at = "b"
side = "+x"
clearance = {clearance}
"""


def test_reader_records_tolerances_and_solve_uses_the_stated_value():
    text = BAR.format(dt="50 K", clearance='"0.70 mm +0.05/-0.03"')
    model = parse_model(text, "m.toml")
    (t,) = model.tolerances
    assert t.path == "gaps.stop.clearance" and t.line == 24
    assert model.gaps[0].clearance == 0.0007
    moved = parse_model(text, "m.toml", overrides={"gaps.stop.clearance": 0.0005})
    assert moved.gaps[0].clearance == 0.0005


def test_solve_says_the_model_has_toleranced_inputs(tmp_path):
    path = tmp_path / "m.toml"
    path.write_text(BAR.format(dt="50 K", clearance='"0.70 mm +0.05/-0.03"'))
    result = runner.invoke(app, ["solve", str(path)])
    assert result.exit_code == 0
    assert ("note: the model has 1 toleranced input; solved at the stated values; 'axialfe "
            "tolerance' studies them") in result.stderr


def test_malformed_tolerance_in_a_file_is_one_located_line(tmp_path):
    path = tmp_path / "m.toml"
    path.write_text(BAR.format(dt="50 K", clearance='"0.20 mm ±"'))
    result = runner.invoke(app, ["tolerance", str(path)])
    assert result.exit_code == 2
    assert result.stderr.strip() == (
        f"error: {path}:24: gaps[1] ('stop'): clearance: '0.20 mm ±': the tolerance needs its "
        "deviation after '±', e.g. '0.20 mm ±0.02'")


def test_a_clearance_that_could_go_below_zero_is_refused_before_sampling(tmp_path):
    path = tmp_path / "m.toml"
    path.write_text(BAR.format(dt="50 K", clearance='"0.02 mm ±0.015"'))   # -6 sigma < 0
    result = runner.invoke(app, ["tolerance", str(path)])
    assert result.exit_code == 2
    assert result.stderr.strip() == (
        f"error: {path}:24: gaps.stop.clearance: clearance could fall below zero within its "
        "tolerance (the worst-case box or +-6 sigma of a normal); narrow the tolerance")


def test_a_tolerance_where_none_belongs_is_refused(tmp_path):
    text = BAR.format(dt="50 K", clearance='"0.7 mm"').replace(
        'thermal_expansion = "12e-6 /K"', 'thermal_expansion = "12e-6 /K"\n'
        'yield_strength = "250 MPa ±10"')
    with pytest.raises(ModelError, match="yield_strength: a tolerance is not allowed here"):
        parse_model(text, "m.toml")


# --- statistics against closed forms ----------------------------------------------
def test_closure_probability_is_the_normal_tail():
    # One clearance c ~ N(mu, sigma) closed by the free growth alpha*dT*L of a bar: the gap
    # closes when c < alpha*dT*L, with probability Phi((alpha*dT*L - mu)/sigma) (the normal
    # distribution's tail; common practice).
    mu, sigma, growth = 0.62e-3, 0.02e-3, 12e-6 * 50 * 1.0
    text = BAR.format(dt="50 K", clearance='{ value = "0.62 mm", std = "0.02 mm" }')
    exact = 0.5 * math.erfc(-(growth - mu) / sigma / math.sqrt(2))
    widths = []
    for n in (4000, 16000):
        study = study_of(text, samples=n, seed=7, outputs=["gap:stop:opening"])
        (event,) = [e for e in study.events if e["event"] == "closes"]
        assert (event["name"], event["event"]) == ("stop", "closes")
        lo, hi = event["confidence_interval"]
        assert lo <= exact <= hi, (exact, event)
        widths.append(hi - lo)
    # the interval narrows as 1/sqrt(N): four times the samples, half the width
    assert widths[1] / widths[0] == pytest.approx(0.5, rel=0.1)


LINEAR = """
title = "bar between walls"
[materials.m]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 mm"
c = "400 mm"
b = "1000 mm"
[[segments]]
from = "a"
to = "c"
material = "m"
section = "s"
[[segments]]
from = "c"
to = "b"
material = "m"
section = "s"
temperature_change = "30 K ±6"
[[supports]]
at = "a"
[[supports]]
at = "b"
[[loads]]
at = "c"
force = "10 kN ±1.5"
"""


def test_worst_case_of_a_linear_stack_is_the_arithmetic_stack_up_and_rss_the_std():
    # Fixed-fixed bar, P at c: R_a = -P*b/L (Gere and Goodno, statically indeterminate bars;
    # from memory).  Heating part cb by dT pushes both walls: R_a = E*A*alpha*dT*(L_cb/L)
    # (same source).  Arithmetic worst case nominal -+ sum |dy/dx_i|*t_i, and the RSS
    # sqrt(sum (dy/dx_i*sigma_i)^2) as the standard deviation (common practice).
    L, b, EA, alpha = 1.0, 0.6, 200e9 * 1e-4, 12e-6
    d_P, d_T = -b / L, EA * alpha * 0.6 / L
    nominal = d_P * 10e3 + d_T * 30
    half = abs(d_P) * 1.5e3 + abs(d_T) * 6
    rss = math.hypot(d_P * 1.5e3 / 3, d_T * 6 / 3)
    study = study_of(LINEAR, samples=20000, seed=3, outputs=["reaction:a"])
    r = row(study, "reaction:a")
    assert study.worst_case_method == "vertices"
    assert r["nominal"] == pytest.approx(nominal, rel=1e-9)
    assert r["worst_case"] == pytest.approx([nominal - half, nominal + half], rel=1e-9)
    # the sample standard deviation's own error is about sigma/sqrt(2N)
    assert abs(r["std"] - rss) < 4 * rss / math.sqrt(2 * 20000)


def test_draws_do_not_depend_on_the_batch_and_repeat_for_a_seed():
    tols = [parse_tolerance("1 mm ±0.1", "length"),
            parse_tolerance({"value": "2 mm", "plus": "0.1 mm", "minus": "0.1 mm",
                             "distribution": "uniform"}, "length")]
    a, b = _draw(tols, 1000, 5), _draw(tols, 1000, 5)
    assert np.array_equal(a, b)
    assert np.array_equal(_draw(tols, 10, 5), a[:10])
    assert (np.abs(a[:, 0] - 1e-3) <= 6 * tols[0].sigma).all()


def test_wilson_interval():
    # Wilson (1927), J. Am. Stat. Assoc. 22, 209-212: for 10 events in 100 trials and
    # z = 1.96 the interval is 0.0552 to 0.1744 (worked value, from memory)
    lo, hi = wilson(10, 100)
    assert (round(lo, 4), round(hi, 4)) == (0.0552, 0.1744)


# --- every sample agrees with the single solver ------------------------------------
CHAIN = """
title = "chain"
[materials.m]
elastic_modulus = "{E}"
thermal_expansion = "11e-6 /K"
yield_strength = "900 MPa"
[sections.s]
shape = "round"
diameter = "{d}"
[stations]
{stations}
{segments}
[[supports]]
at = "s0"
{far}
[[gaps]]
name = "g1"
at = "s{n}"
side = "+x"
clearance = "{c1}"
[[gaps]]
name = "g2"
between = ["s1", "s{mid}"]
clearance = "{c2}"
kind = "{kind}"
[[loads]]
at = "s{mid}"
force = "{P}"
"""


@st.composite
def chains(draw):
    n = draw(st.integers(3, 7))
    mid = draw(st.integers(2, n - 1))
    stations = "\n".join(f's{i} = "{100 * i} mm"' for i in range(n + 1))
    segs = []
    for i in range(n):
        dt = draw(st.sampled_from(["0 K", "40 K ±10", "-30 K", "20 K +5/-2"]))
        segs.append(f'[[segments]]\nfrom = "s{i}"\nto = "s{i + 1}"\nmaterial = "m"\n'
                    f'section = "s"\ntemperature_change = "{dt}"')
    far = draw(st.sampled_from(["", '[[supports]]\nat = "s{n}"\nkind = "spring"\n'
                                    'stiffness = "20 kN/mm ±4"'.replace("{n}", str(n))]))
    return CHAIN.format(
        E=draw(st.sampled_from(["200 GPa", "200 GPa ±6"])),
        d=draw(st.sampled_from(["10 mm", "10 mm -0.02/-0.05"])),
        stations=stations, segments="\n".join(segs), far=far, n=n, mid=mid,
        c1=draw(st.sampled_from(["0.2 mm ±0.05", "0.08 mm +0.04/-0.02", "0.3 mm"])),
        c2=draw(st.sampled_from(["0.1 mm ±0.03", "0.02 mm +0.02/-0"])),
        kind=draw(st.sampled_from(["contact", "slack"])),
        P=draw(st.sampled_from(["5 kN ±2", "-8 kN ±3", "1 kN"])))


@settings(max_examples=examples(6))
@given(chains(), st.integers(0, 2**16))
def test_every_sample_agrees_with_the_single_solver(text, seed):
    model = parse_model(text, "m.toml")
    if not model.tolerances:
        return
    build = lambda v: parse_model(text, "m.toml", overrides=v)  # noqa: E731
    tols = [t.tolerance for t in model.tolerances]
    paths = [t.path for t in model.tolerances]
    nominal = np.array([t.nominal for t in tols])
    half = np.array([(t.upper - t.lower) / 2 for t in tols])
    values = _draw(tols, 12, seed)
    batch = Batch(model, paths, nominal, np.where(nominal > [t.centre for t in tols], -half, half),
                  build)
    assert batch.loop is None
    chosen = OutputSet(model)
    got = batch.solve(values, chosen)
    for r, sample in enumerate(values):
        for s, case in enumerate(solve(build(dict(zip(paths, sample))))):
            for key, want in chosen.of_result(case).items():
                if key == "closed":
                    assert np.array_equal(got[(s, key)][r], want)
                    continue
                scale = max(abs(w) for k, w in chosen.of_result(case).items()
                            if k.split(":")[0] == key.split(":")[0] and k != "closed"
                            and not k.endswith(":opening")) if not key.endswith(":opening") \
                    else 1e-3
                assert got[(s, key)][r] == pytest.approx(want, abs=1e-9 * (scale + 1e-300)), key


# --- the command -----------------------------------------------------------------
def test_command_json_shape(tmp_path):
    path = tmp_path / "m.toml"
    path.write_text(BAR.format(dt="50 K ±5", clearance='"0.62 mm +0.05/-0.03"'))
    result = runner.invoke(app, ["tolerance", str(path), "--samples", "500", "--seed", "2",
                                 "--format", "json", "--output", "gap:stop:opening"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert set(data) >= {"title", "units", "samples", "seed", "worst_case_method", "inputs",
                         "outputs", "events"}
    assert (data["samples"], data["seed"]) == (500, 2)
    names = [i["name"] for i in data["inputs"]]
    assert names == ["segments.a-b.temperature_change", "gaps.stop.clearance"]
    assert data["inputs"][1]["limits"] == [0.59, 0.67]
    (out,) = data["outputs"]
    assert set(out) >= {"name", "case", "nominal", "worst_case", "mean", "std", "percentiles"}
    assert set(out["percentiles"]) == {"0.135", "50", "99.865"}
    assert data["events"][0]["event"] in ("closes", "opens")


def test_unknown_output_is_one_line(tmp_path):
    path = tmp_path / "m.toml"
    path.write_text(BAR.format(dt="50 K ±5", clearance='"0.62 mm"'))
    result = runner.invoke(app, ["tolerance", str(path), "--output", "gap:stpo:opening"])
    assert result.exit_code == 2
    assert result.stderr.strip() == ("error: --output: unknown output 'gap:stpo:opening'; did "
                                     "you mean 'gap:stop:opening'?")


@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.name)
def test_examples_run_through_the_command(path):
    result = runner.invoke(app, ["tolerance", str(path), "--samples", "300", "--format", "json"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["outputs"] and data["inputs"]


def test_plot_and_report_section(tmp_path):
    path = tmp_path / "m.toml"
    path.write_text(BAR.format(dt="50 K ±5", clearance='"0.62 mm +0.05/-0.03"'))
    png = tmp_path / "h.png"
    result = runner.invoke(app, ["tolerance", str(path), "--samples", "400", "--plot", str(png)])
    assert result.exit_code == 0, result.output
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    report = tmp_path / "r.md"
    result = runner.invoke(app, ["report", str(path), "--tolerance", "--samples", "400",
                                 "-o", str(report)])
    assert result.exit_code == 0, result.output
    text = report.read_text()
    assert "## Tolerance study" in text and "gaps.stop.clearance" in text


def test_least_stress_is_zero_at_a_root_of_the_force():
    # The same stack with a load and a temperature change of either sign: R_a = -P*b/L +
    # E*A*alpha*dT*(L_cb/L) (as above) passes through zero inside the box, so the least
    # |stress| of segment ac is 0, at inputs where R_a = 0.
    text = LINEAR.replace('"10 kN ±1.5"', '"0.5 kN ±1.5"').replace('"30 K ±6"', '"1 K ±6"')
    study = study_of(text, samples=200, outputs=["stress:a-c"])
    r = row(study, "stress:a-c")
    assert r["worst_case"][0] == pytest.approx(0.0, abs=1e-6)
    x = r["worst_case_inputs"][0]
    P, dT = x["loads[1].force"], x["segments.c-b.temperature_change"]
    assert -0.6 * P + 200e9 * 1e-4 * 12e-6 * 0.6 * dT == pytest.approx(0.0, abs=1e-6)
    # the greatest at a vertex: P = 2 kN with dT = -5 K, or P = -1 kN with dT = 7 K
    k_T = 200e9 * 1e-4 * 12e-6 * 0.6
    greatest = max(abs(-0.6 * 2e3 - k_T * 5), abs(0.6 * 1e3 + k_T * 7)) / 1e-4
    assert r["worst_case"][1] == pytest.approx(greatest, rel=1e-9)


def test_readme_shows_the_example_as_it_runs():
    root = EXAMPLES.parent.parent
    command = ("$ axialfe tolerance examples/tolerance/pump-shaft-end-float.toml --samples 100000 "
               "--seed 1 --output gap:end-float:opening --output gap:end-float:force\n")
    readme = (root / "README.md").read_text(encoding="utf-8")
    shown = readme[readme.index(command) + len(command):].split("\n```", 1)[0]
    args = command[2:].split()[1:]
    args[1] = str(root / args[1])
    result = runner.invoke(app, args)
    assert result.exit_code == 0, result.output
    assert shown in result.stdout


def test_more_than_16_inputs_start_the_local_search_from_the_samples():
    # 17 heated parts of a bar between walls: R = E*A*alpha*sum(dT_i*L_i)/L, affine, so the
    # arithmetic stack-up nominal -+ E*A*alpha*sum(t_i*L_i)/L bounds it (common practice;
    # the thermal reaction from Gere and Goodno, statically indeterminate bars, from memory);
    # the local search from the Monte Carlo extremes must reach both corners.
    n = 17
    lines = ["[materials.m]", 'elastic_modulus = "200 GPa"', 'thermal_expansion = "12e-6 /K"',
             "[sections.s]", 'shape = "area"', 'area = "100 mm^2"', "[stations]"]
    lines += [f's{i} = "{100 * i} mm"' for i in range(n + 1)]
    for i in range(n):
        lines += ["[[segments]]", f'from = "s{i}"', f'to = "s{i + 1}"', 'material = "m"',
                  'section = "s"', f'temperature_change = "{10 + i} K ±3"']
    lines += ["[[supports]]", 'at = "s0"', "[[supports]]", f'at = "s{n}"']
    study = study_of("\n".join(lines) + "\n", samples=300, outputs=["reaction:s0"])
    assert study.worst_case_method == "samples+local"
    k = 200e9 * 1e-4 * 12e-6 * 0.1 / 1.7          # dR/d(dT_i), each part 0.1 m of 1.7 m
    nominal = k * sum(10 + i for i in range(n))
    r = row(study, "reaction:s0")
    assert r["nominal"] == pytest.approx(nominal, rel=1e-9)
    assert r["worst_case"] == pytest.approx([nominal - 3 * k * n, nominal + 3 * k * n], rel=1e-6)


def test_long_names_wrap_inside_their_panels_of_the_histograms():
    from matplotlib.text import Text

    from axialfe.output.toleranceplot import plot_study

    long = "end-float-between-the-impeller-shaft-shoulder-and-the-bearing-cover"
    text = (EXAMPLES / "pump-shaft-end-float.toml").read_text().replace("end-float", long)
    text = text.replace('title = "Pump shaft end float at running temperature"',
                        'title = "' + "A pump shaft's end float at its running temperature " * 3
                        + '"')
    for outputs in ([f"gap:{long}:opening"], None):
        fig = plot_study(study_of(text, samples=300, outputs=outputs))
        renderer = fig.canvas.get_renderer()
        shown = [t for t in fig.findobj(Text) if t.get_visible() and t.get_text()]
        titles = [t for t in shown if t.get_text().endswith("(base)")]
        assert len(titles) == (1 if outputs else 5)
        # the names are whole, broken only into lines
        assert any(t.get_text().replace("\n", "") == f"gap:{long}:opening (base)"
                   for t in titles)
        for t in shown:   # every text inside the figure, every panel title over its panel
            box = t.get_window_extent(renderer)
            assert fig.bbox.x0 <= box.x0 and box.x1 <= fig.bbox.x1 and box.y1 <= fig.bbox.y1
            if t in titles:
                frame = t.axes.get_window_extent(renderer)
                assert frame.x0 - 1 <= box.x0 and box.x1 <= frame.x1 + 1, t.get_text()
