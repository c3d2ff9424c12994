"""Results in a notebook: HTML tables, LaTeX closed forms, inline diagrams, DataFrames."""

import math
from html.parser import HTMLParser
from pathlib import Path

import pytest

from axialfe import parse_model, read_model, solve, solve_symbolic
from axialfe.checks import check_solution
from axialfe.output.plot import Diagram

ROOT = Path(__file__).parent.parent

# A steel rod 500 mm long, 20 mm diameter, fixed at one end and pulled by 4 kN (invented):
# u = P*L/(E*A) = 4000 * 0.5 / (200e9 * pi * 0.01^2) = 0.03183 mm (Gere and Goodno,
# Mechanics of Materials, 7th ed., eq. 2-3).
ROD = """
title = "rod <&> pulled"
[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
wall = "0 mm"
tip = "500 mm"
[[segments]]
name = "rod_1"
from = "wall"
to = "tip"
material = "structural-steel"
section = "s"
[[supports]]
at = "wall"
[[loads]]
at = "tip"
force = "4 kN"
"""
U_TIP_MM = 4000 * 0.5 / (200e9 * math.pi * 0.01 ** 2) * 1e3


class _Cells(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags, self.text = [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)

    def handle_data(self, data):
        self.text.append(data)


def test_case_and_solution_show_as_html_tables():
    solution = solve(parse_model(ROD))
    page = solution["base"]._repr_html_()
    p = _Cells()
    p.feed(page)
    assert p.tags.count("table") == 3                  # stations, segments, reactions
    assert "script" not in p.tags and "rod <&> pulled" in "".join(p.text)
    assert "displacement [mm]" in p.text and f"{U_TIP_MM:.6g}" in p.text
    assert solution._repr_html_() == page              # one case


def test_frames_carry_units_in_their_column_names():
    pandas = pytest.importorskip("pandas")
    solution = solve(parse_model(ROD))
    case = solution["base"]
    stations = case.to_frame("stations")
    assert list(stations.columns) == ["station", "x [mm]", "displacement [mm]"]
    assert stations.loc[stations["station"] == "tip", "displacement [mm]"].item() == \
        pytest.approx(U_TIP_MM, rel=1e-9)
    segments = case.to_frame()
    assert segments["N from [N]"].item() == pytest.approx(4000.0, rel=1e-12)
    frames = solution.to_frames(checks=check_solution(solution))
    assert set(frames) == {"stations", "segments", "reactions", "gaps", "checks"}
    assert all(isinstance(f, pandas.DataFrame) for f in frames.values())
    assert frames["reactions"]["force [N]"].item() == pytest.approx(-4000.0, rel=1e-12)
    checks = frames["checks"]
    strength = checks[checks["check"] == "strength"].iloc[0]
    # 4000 N / 314.16 mm^2 = 12.73 MPa against 250 MPa (ASTM A36 minimum yield)
    assert strength["demand"] == pytest.approx(12.732, rel=1e-4) and strength["unit"] == "MPa"
    assert strength["capacity"] == pytest.approx(250.0) and strength["result"] == "pass"
    from axialfe.units import OutputUnits

    us = case.to_frame("stations", OutputUnits.system("US"))
    assert list(us.columns) == ["station", "x [in]", "displacement [in]"]


def test_to_frame_refuses_an_unknown_table():
    pytest.importorskip("pandas")
    from axialfe import ModelError

    case = solve(parse_model(ROD))["base"]
    with pytest.raises(ModelError) as err:
        case.to_frame("segment")
    assert str(err.value) == "unknown table 'segment'; did you mean 'segments'?"


def test_closed_form_shows_as_latex():
    model = read_model(ROOT / "examples" / "closed-form-stepped-rod-load.toml", symbolic=True)
    latex = solve_symbolic(model)._repr_latex_()
    assert latex.startswith("$$\\begin{aligned}") and latex.endswith("\\end{aligned}$$")
    assert "R_{\\text{" in latex and "u_{\\text{" in latex and "&=" in latex


def test_diagram_shows_inline_as_png(tmp_path):
    case = solve(parse_model(ROD))["base"]
    diagram = Diagram(case, "force")
    png = diagram._repr_png_()
    assert png[:8] == b"\x89PNG\r\n\x1a\n"
    diagram.save(tmp_path / "d.svg")
    assert "<svg" in (tmp_path / "d.svg").read_text(encoding="utf-8")
