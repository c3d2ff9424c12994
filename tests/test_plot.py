"""Diagrams: valid images of the expected size, plotted data equal to the results, sweeps."""

import math
import xml.etree.ElementTree as ET
from pathlib import Path

import matplotlib.image as mpimg
import numpy as np
import pytest
from typer.testing import CliRunner

from axialfe import ModelError, parse_model, read_model, solve
from axialfe.cli import app
from axialfe.model.cases import load_states
from axialfe.output.plot import diagram_data, lanes, plot_case, plot_sweep
from axialfe.engine.system import System

runner = CliRunner()
ROOT = Path(__file__).parent.parent
EXAMPLES = sorted((ROOT / "examples").glob("*.toml")) + sorted((ROOT / "docs").glob("*.toml"))

# Scenarios of our own for the drawing code (invented numbers, not references).
BOLT = """
title = "bolt $x$ & sleeve"
[settings]
temperature_change = "40 K"
[units]
force = "kN"
[sections.bolt]
shape = "round"
diameter = "12 mm"
[sections.sleeve]
shape = "tube"
outer_diameter = "24 mm"
wall_thickness = "3 mm"
[sections.big]
shape = "round"
diameter = "20 mm"
[sections.small]
shape = "round"
diameter = "14 mm"
[stations]
base = "0 mm"
head = "0 mm"
nut = "80 mm"
tip = "200 mm"
[[segments]]
name = "bolt"
from = "base"
to = "nut"
material = "structural-steel"
section = "bolt"
misfit = "-0.04 mm"
[[segments]]
name = "$leeve"
from = "nut"
to = "head"
material = "aluminium-alloy"
section = "sleeve"
[[segments]]
name = "stem"
from = "nut"
to = "tip"
material = "structural-steel"
section = "big"
end_section = "small"
distributed_load = "-20 kN/m"
[[supports]]
at = "base"
[[supports]]
at = "head"
kind = "spring"
stiffness = "50 kN/mm"
[[loads]]
at = "tip"
force = "-3 kN"
[[gaps]]
name = "end-float"
at = "tip"
side = "+x"
clearance = "0.1 mm"
[[gaps]]
name = "tie"
between = ["head", "tip"]
kind = "slack"
clearance = "1 mm"
"""

STEPPED = """
title = "stepped rod"
[sections.a]
shape = "round"
diameter = "30 mm"
[sections.b]
shape = "rectangle"
width = "20 mm"
height = "10 mm"
[stations]
left = "0 mm"
shoulder = "250 mm"
right = "600 mm"
[[segments]]
from = "left"
to = "shoulder"
material = "structural-steel"
section = "a"
[[segments]]
from = "shoulder"
to = "right"
material = "copper"
section = "b"
temperature_change = "30 K"
[[supports]]
at = "left"
[[supports]]
at = "right"
[[cases]]
name = "push"
loads = [{ at = "shoulder", force = "12 kN" }]
[[cases]]
name = "pull"
loads = [{ at = "shoulder", force = "-12 kN" }]
"""

HANGING = """
title = "hanging rod"
[settings]
gravity = "-9.81 m/s^2"
[sections.s]
shape = "round"
diameter = "10 mm"
[stations]
bottom = "0 m"
top = "20 m"
[[segments]]
name = "rod"
from = "top"
to = "bottom"
material = "structural-steel"
section = "s"
[[supports]]
at = "top"
"""

MODELS = {"bolt": BOLT, "stepped": STEPPED, "hanging": HANGING}
ALL_MODELS = [pytest.param(lambda t=t: parse_model(t, f"{k}.toml"), id=k) for k, t in MODELS.items()]
ALL_MODELS += [pytest.param(lambda p=p: read_model(p), id=p.name) for p in EXAMPLES]


def _lines(fig, prefix):
    return [ln for ax in fig.axes for ln in ax.get_lines() if (ln.get_gid() or "").startswith(prefix)]


def _points(lines):
    pts = set()
    for ln in lines:
        for x, y in zip(*ln.get_data()):
            if np.isfinite(x):
                pts.add((float(x), float(y)))
    return pts


def _has_point(pts, x, y, tol=1e-9):
    return any(abs(px - x) <= tol * max(1, abs(x)) and abs(py - y) <= tol * max(1, abs(y))
               for px, py in pts)


@pytest.mark.parametrize("what, size", [("all", (1800, 1500)), ("force", (1500, 975)),
                                        ("stress", (1500, 975)), ("displacement", (1500, 975))])
def test_png_is_valid_and_of_expected_size(tmp_path, what, size):
    # the figure's size depends on the diagram kind only (12 x 10 in for all, 10 x 6.5 in
    # for one diagram, at 150 dpi), so one model per kind proves it; the richest one here
    # (taper, gaps, a slack link, a spring).  Every example is drawn through the command
    # line in test_every_example_plots, and its plotted data checked in
    # test_plotted_data_equal_the_results.
    case = solve(parse_model(BOLT, "bolt.toml"))["base"]
    path = tmp_path / f"{what}.png"
    plot_case(case, what, path)
    with open(path, "rb") as f:
        assert f.read(8) == b"\x89PNG\r\n\x1a\n"
    img = mpimg.imread(path)
    assert img.shape[:2] == (size[1], size[0])


@pytest.mark.parametrize("make", ALL_MODELS)
def test_plotted_data_equal_the_results(make):
    model = make()
    sol = solve(model)
    units = model.units
    fL, fF, fS, fD = (units.factor(k) for k in ("length", "force", "stress", "displacement"))
    for case in sol.cases:
        fig = plot_case(case, "all")
        force, stress, disp = (_points(_lines(fig, f"{w}-lane-")) for w in
                               ("force", "stress", "displacement"))
        for i, seg in enumerate(model.segments):
            xa = model.stations[model.station_index(seg.start)].x / fL
            xb = model.stations[model.station_index(seg.end)].x / fL
            assert _has_point(force, xa, case.axial_force[i, 0] / fF)
            assert _has_point(force, xb, case.axial_force[i, 1] / fF)
            assert _has_point(stress, xa, case.stress[i, 0] / fS)
            assert _has_point(stress, xb, case.stress[i, 1] / fS)
        for j, st in enumerate(model.stations):
            if any(st.name in (s.start, s.end) for s in model.segments):
                assert _has_point(disp, st.x / fL, case.u[j] / fD)


def test_parallel_segments_are_separate_labelled_lines():
    model = parse_model(BOLT)
    assert list(lanes(model)) == [0, 1, 0]
    fig = plot_case(solve(model)["base"], "force")
    force = _lines(fig, "force-lane-")
    assert len(force) == 2
    labels = [ln.get_label() for ln in force]
    assert labels == ["bolt, stem", r"\$leeve"]    # every segment of a lane; "$" kept literal
    assert force[0].get_linestyle() != force[1].get_linestyle()
    texts = {t.get_text() for ax in fig.axes for t in ax.texts}
    assert "bolt" in texts and r"\$leeve" in texts


def test_series_bar_is_one_line_with_a_jump_at_the_shoulder():
    model = parse_model(STEPPED)
    assert list(lanes(model)) == [0, 0]
    case = solve(model)["push"]
    fig = plot_case(case, "force")
    line, = _lines(fig, "force-lane-")
    x, y = line.get_data()
    # a jump is a vertical step: two points at the shoulder, x = 250 mm
    at = np.flatnonzero(np.isclose(x, 250.0))
    assert len(at) == 2
    assert sorted(y[at]) == pytest.approx(sorted([case.axial_force[0, 1], case.axial_force[1, 0]]))
    # the jump equals the load at the shoulder (free body of the station, common practice)
    assert abs(y[at[1]] - y[at[0]]) == pytest.approx(12.0e3, rel=1e-9)
    # compression is shaded below the axis in its own colour, from the shoulder to the wall
    from matplotlib.colors import to_rgb

    from axialfe.output.plot import COMPRESSION, TENSION

    def shaded(colour):
        out = []
        for c in fig.axes[1].collections:
            faces = c.get_facecolor()
            if len(faces) and np.allclose(faces[0][:3], to_rgb(colour)):
                out += [p.vertices for p in c.get_paths() if len(p.vertices)]
        return out

    below = np.concatenate(shaded(COMPRESSION))
    assert below[:, 1].max() <= 0.0
    deep = below[below[:, 1] < 0]
    assert deep[:, 0].min() == pytest.approx(250.0) and deep[:, 0].max() == pytest.approx(600.0)
    assert deep[:, 1].min() == pytest.approx(case.axial_force[1, 0], rel=1e-12)
    above = np.concatenate(shaded(TENSION))
    assert above[:, 1].min() >= 0.0
    high = above[above[:, 1] > 0]
    assert high[:, 0].min() == pytest.approx(0.0) and high[:, 0].max() == pytest.approx(250.0)


def test_hanging_rod_displacement_curve_is_the_closed_form():
    # A bar hanging under its own weight: u(y) = rho*g/E * (L*y - y^2/2) measured from the
    # support, and the end moves rho*g*L^2/(2E) (Gere and Goodno, Mechanics of Materials,
    # axially loaded members, non-uniform conditions; from memory).
    model = parse_model(HANGING)
    case = solve(model)["base"]
    c, = diagram_data(case, "displacement")
    rho, g, E, L = 7850.0, 9.81, 200e9, 20.0
    x = c.x / 1e3                      # m, 0 at the bottom
    y = L - x                          # distance from the support
    exact = -rho * g / E * (L * y - y ** 2 / 2) / 1e-3   # mm, toward -x
    assert len(c.x) > 2
    assert np.allclose(c.y, exact, rtol=0, atol=1e-3 * abs(exact).max())
    assert c.y[0] == pytest.approx(-rho * g * L ** 2 / (2 * E) / 1e-3, rel=1e-9)
    f, = diagram_data(case, "force")
    area = math.pi * 0.01 ** 2 / 4
    assert f.y.max() == pytest.approx(rho * g * area * L, rel=1e-9)


def test_svg_by_suffix(tmp_path):
    path = tmp_path / "d.svg"
    plot_case(solve(parse_model(BOLT))["base"], "all", path)
    root = ET.parse(path).getroot()
    assert root.tag.endswith("svg")


def test_bad_suffix_and_diagram():
    case = solve(parse_model(STEPPED))["push"]
    with pytest.raises(ModelError) as err:
        plot_case(case, "all", "out.jpg")
    assert str(err.value) == "out.jpg: cannot write a figure as '.jpg'; expected one of: '.png', '.svg'"
    with pytest.raises(ModelError) as err:
        plot_case(case, "forces")
    assert str(err.value) == ("unknown diagram 'forces'; expected one of: 'force', 'stress', "
                              "'displacement', 'all'")


# --- the command line --------------------------------------------------------------
def _write(tmp_path, text):
    path = tmp_path / "m.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_cli_plot_writes_the_chosen_case(tmp_path):
    path = _write(tmp_path, STEPPED)
    out = tmp_path / "pull.png"
    result = runner.invoke(app, ["plot", str(path), "--what", "force", "--case", "pull", "-o", str(out)])
    assert result.exit_code == 0, result.output
    assert mpimg.imread(out).shape[:2] == (975, 1500)


@pytest.mark.parametrize("args, message", [
    (["--what", "forse"], "error: --what: unknown diagram 'forse'; did you mean 'force'?"),
    (["--case", "pul"], "error: --case: unknown case 'pul'; did you mean 'pull'?"),
    (["--case", "zzz"], "error: --case: unknown case 'zzz'; expected one of: 'push', 'pull'"),
])
def test_cli_plot_errors(tmp_path, args, message):
    path = _write(tmp_path, STEPPED)
    result = runner.invoke(app, ["plot", str(path), *args, "-o", str(tmp_path / "a.png")])
    assert result.exit_code == 2
    assert result.stderr.strip().splitlines() == [message]


def test_cli_plot_bad_suffix(tmp_path):
    path = _write(tmp_path, STEPPED)
    out = tmp_path / "a.pdf"
    result = runner.invoke(app, ["plot", str(path), "-o", str(out)])
    assert result.exit_code == 2
    assert result.stderr.strip().splitlines() == [
        f"error: {out}: cannot write a figure as '.pdf'; expected one of: '.png', '.svg'"]


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.name for p in EXAMPLES])
def test_every_example_plots(tmp_path, path):
    out = tmp_path / "all.png"
    result = runner.invoke(app, ["plot", str(path), "-o", str(out)])
    assert result.exit_code == 0, result.output
    assert mpimg.imread(out).shape[:2] == (1500, 1800)


# --- sweeps ---------------------------------------------------------------------------
from axialfe.tracking.sweep import Event, SweepResult, sweep as run_sweep  # noqa: E402


RAIL = """
title = "rail with an expansion gap"
[sections.s]
shape = "area"
area = "7600 mm^2"
[stations]
anchor = "0 m"
end = "12 m"
[[segments]]
name = "rail"
from = "anchor"
to = "end"
material = "structural-steel"
section = "s"
[[supports]]
at = "anchor"
[[gaps]]
name = "joint"
at = "end"
side = "+x"
clearance = "6 mm"
"""


def test_plot_sweep_lines_and_events(tmp_path):
    model = parse_model(RAIL)
    system = System(model)
    state = load_states(model)[0]
    values = np.linspace(0.0, 80.0, 17)
    results = tuple(system.solve_state(state.with_temperature(v)) for v in values)
    # closes when alpha*dT*L reaches the clearance: dT = c/(alpha*L) = 42.74 K (a bar heated
    # against a gap; e.g. Gere and Goodno, Mechanics of Materials, thermal effects; from memory)
    close = 6e-3 / (11.7e-6 * 12.0)
    sweep = SweepResult("temperature_change", "K", values, results,
                        (Event("joint", "closes", close),), (), model, "base")
    out = tmp_path / "sweep.png"
    fig = plot_sweep(sweep, out)
    img = mpimg.imread(out)
    assert img.shape[:2] == (round(8.0 * 150), 1500)
    gap_line, = _lines(fig, "sweep-gap-")
    x, y = gap_line.get_data()
    assert np.array_equal(x, values)
    assert np.allclose(y, [r.gap_force[0] for r in results], rtol=0, atol=1e-9)
    # after closure the rail force is -E*A*alpha*(dT - dT_close)
    expected = [-200e9 * 7600e-6 * 11.7e-6 * max(v - close, 0.0) for v in values]
    assert np.allclose(y, expected, rtol=1e-9, atol=1e-6)
    seg_line, = _lines(fig, "sweep-segment-")
    assert np.allclose(seg_line.get_data()[1], [r.stress[0, 0] / 1e6 for r in results])
    events = _lines(fig, "sweep-event-")
    assert len(events) == 2 and all(ln.get_xdata()[0] == pytest.approx(close) for ln in events)
    texts = [t.get_text() for t in fig.axes[0].texts]
    assert "joint closes at 42.74 K" in texts


def test_shading_changes_sign_where_the_force_crosses_zero():
    # A bar fixed at both ends under a uniform axial load q: the force runs linearly from
    # +qL/2 to -qL/2 and is zero at mid-length (statically indeterminate bar, symmetry;
    # common practice).
    model = parse_model("""
[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = "1000 mm"
[[segments]]
from = "a"
to = "b"
material = "structural-steel"
section = "s"
distributed_load = "10 kN/m"
[[supports]]
at = "a"
[[supports]]
at = "b"
""")
    case = solve(model)["base"]
    assert case.axial_force[0] == pytest.approx([5e3, -5e3], rel=1e-12)
    fig = plot_case(case, "force")
    from matplotlib.colors import to_rgb

    from axialfe.output.plot import TENSION

    verts = np.concatenate([p.vertices for c in fig.axes[1].collections
                            if len(c.get_facecolor())
                            and np.allclose(c.get_facecolor()[0][:3], to_rgb(TENSION))
                            for p in c.get_paths()])
    positive = verts[verts[:, 1] > 0]
    assert positive[:, 0].max() < 500.0 + 1e-9
    assert np.any(np.isclose(verts[:, 0], 500.0) & (verts[:, 1] == 0.0))


def test_plot_sweep_of_a_real_sweep(tmp_path):
    model = parse_model(RAIL)
    result = run_sweep(model, "temperature_change", 0.0, 80.0, 33, unit="K")
    close = 6e-3 / (11.7e-6 * 12.0)          # c/(alpha*L), as above
    assert [(e.name, e.event) for e in result.events] == [("joint", "closes")]
    assert result.events[0].value == pytest.approx(close, rel=1e-9)
    out = tmp_path / "sweep.svg"
    fig = plot_sweep(result, out)
    assert ET.parse(out).getroot().tag.endswith("svg")
    gap_line, = _lines(fig, "sweep-gap-")
    # the curve runs through the grid and through the exact event, where the force is 0
    x, y = gap_line.get_data()
    grid = [i for i, v in enumerate(x) if v in set(result.values.tolist())]
    assert np.allclose(y[grid], [r.gap_force[0] for r in result.results])
    at = int(np.flatnonzero(x == result.events[0].value)[0])
    assert x[at - 1] < x[at] < x[at + 1] and y[at] == pytest.approx(0.0, abs=1e-6)
    assert _lines(fig, "sweep-event-")[0].get_xdata()[0] == pytest.approx(close, rel=1e-9)


# --- labels clear of one another and of the curves -------------------------------------
def _boxes_and_curves(fig):
    """Per axes: the renderer's box of every visible label, and points along every curve."""
    renderer = fig.canvas.get_renderer()
    out = []
    for ax in fig.axes:
        boxes = [(t.get_text(), t.get_window_extent(renderer)) for t in ax.texts
                 if t.get_visible() and t.get_text().strip()]
        points = []
        for line in ax.lines:
            xy = line.get_transform().transform(np.asarray(line.get_xydata(), dtype=float))
            for a, b in zip(xy[:-1], xy[1:]):
                if np.all(np.isfinite(a)) and np.all(np.isfinite(b)):
                    n = int(max(2, np.hypot(*(b - a)) / 0.5))      # a point every half pixel
                    points.append(a + np.linspace(0.0, 1.0, n)[:, None] * (b - a))
        out.append((boxes, np.vstack(points) if points else np.zeros((0, 2))))
    return out


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.name for p in EXAMPLES])
def test_no_label_overlaps_a_label_or_a_curve(path):
    import itertools

    solution = solve(read_model(path))
    for case in solution.cases[:2]:
        fig = plot_case(case, "all")
        for boxes, points in _boxes_and_curves(fig):
            for (ta, a), (tb, b) in itertools.combinations(boxes, 2):
                assert not a.overlaps(b), (case.name, ta, tb)
            for text, box in boxes:
                inside = ((points[:, 0] > box.x0 + 0.5) & (points[:, 0] < box.x1 - 0.5)
                          & (points[:, 1] > box.y0 + 0.5) & (points[:, 1] < box.y1 - 0.5))
                assert not inside.any(), (case.name, text)
        # every gap's state and force stays on the sketch
        gap_labels = [t for t in fig.axes[0].texts if t.get_visible()
                      and any(t.get_text().startswith(f"{g.name} (") for g in case.model.gaps)]
        assert len(gap_labels) == len(case.model.gaps), case.name
        legends = [ax.get_legend() for ax in fig.axes if ax.get_legend() is not None]
        renderer = fig.canvas.get_renderer()
        frames = [ax.get_window_extent(renderer) for ax in fig.axes]
        for legend in legends:
            box = legend.get_window_extent(renderer)
            assert not any(box.overlaps(f) for f in frames)       # beside the diagrams


def test_most_values_keep_their_label():
    # the decluttering hides a label only where no place is free: on the stepped bar every
    # station value is shown
    case = solve(parse_model(STEPPED))["push"]
    fig = plot_case(case, "force")
    shown = [t.get_text() for t in fig.axes[1].texts if t.get_visible() and t.get_text()]
    hidden = [t.get_text() for t in fig.axes[1].texts if not t.get_visible()]
    assert hidden == [] and len(shown) >= 2


def test_yield_strength_line_and_segments_beyond_it():
    # A 20 mm steel rod, 500 mm long (250 MPa, ASTM A36 minimum yield) pulled by 100 kN:
    # 100e3 / 314.16 mm^2 = 318.3 MPa, beyond yield; the line stands at 250 MPa over the rod's
    # length.  Pulled by 4 kN (12.7 MPa) it is not marked.
    from test_report import SMALL        # the same rod, pulled by 4 kN there

    text = SMALL.replace('force = "4 kN"', 'force = "100 kN"')
    assert '"100 kN"' in text
    case = solve(parse_model(text))["base"]
    fig = plot_case(case, "stress")
    ax = fig.axes[1]
    yield_line, = [l for l in ax.lines if (l.get_gid() or "").startswith("yield-")]
    np.testing.assert_allclose(yield_line.get_ydata(), [250.0, 250.0])
    np.testing.assert_allclose(yield_line.get_xdata(), [0.0, 500.0])
    beyond, = [l for l in ax.lines if (l.get_gid() or "").startswith("beyond-yield-")]
    assert np.nanmin(beyond.get_ydata()) == pytest.approx(318.31, rel=1e-4)
    assert "a-b: beyond yield" in [t.get_text() for t in ax.texts if t.get_visible()]
    # within yield, no mark
    calm = solve(parse_model(SMALL))["base"]
    ax = plot_case(calm, "stress").axes[1]
    assert not [l for l in ax.lines if (l.get_gid() or "").startswith("beyond-yield-")]


def test_sketch_writes_gap_state_and_force_and_loads_sit_on_their_part():
    model = read_model(ROOT / "examples" / "shaft-end-float.toml")
    case = solve(model)["base"]
    sketch = plot_case(case, "force").axes[0]
    texts = [t.get_text() for t in sketch.texts if t.get_visible()]
    assert "end-float (contact): closed, -38.88 kN" in texts
    # BOLT: the bolt and the sleeve side by side (two lanes), the stem beyond the nut in the
    # bolt's lane; the load at the tip acts on the stem, so its arrow stands in that lane's
    # middle (0.75 of the sketch's height, the upper of two lanes), not across both
    from matplotlib.text import Annotation

    bolt = solve(parse_model(BOLT))["base"]
    sketch = plot_case(bolt, "force").axes[0]
    arrow, = [t for t in sketch.texts if isinstance(t, Annotation) and not t.get_text()]
    assert arrow.xy == pytest.approx((200.0 - 0.06 * 200.0, 0.75))
    assert list(lanes(bolt.model)) == [0, 1, 0]


def test_svg_text_stays_text(tmp_path):
    path = tmp_path / "d.svg"
    plot_case(solve(parse_model(BOLT))["base"], "all", path)
    svg = path.read_text(encoding="utf-8")
    assert "<text" in svg and "axial force" in svg
