"""The report document: sections, diagrams, escaping, the calculation sheet, `axialfe report`."""

import base64
import html
import math
import re
from html.parser import HTMLParser
from pathlib import Path

import pytest

from axialfe.checks import check_solution
from typer.testing import CliRunner

from axialfe import ModelError, parse_model, read_model, solve
from axialfe.cli import app
from axialfe.output.text import CAUTIONS
from axialfe.output.report import (SECTIONS, build_html, build_markdown, calculation_rows,
                            report_format, station_words, write_report)

runner = CliRunner()
ROOT = Path(__file__).parent.parent
EXAMPLES = sorted((ROOT / "examples").glob("*.toml")) + sorted((ROOT / "docs").glob("*.toml"))

HOSTILE = '<script>alert("x")</script> & co'

# A scenario of our own with text that must be escaped, parallel parts, a taper, a gap,
# misfit, a distributed load, two cases and a combination (invented numbers).
MODEL = f"""
title = '{HOSTILE}'
[settings]
temperature_change = "25 K"
[units]
force = "kN"
[checks]
safety_factor = 1.25
[materials."<b>alloy</b>"]
elastic_modulus = "70 GPa"
thermal_expansion = "23e-6 /K"
yield_strength = "200 MPa"
[sections.rod]
shape = "round"
diameter = "16 mm"
[sections.tube]
shape = "tube"
outer_diameter = "30 mm"
inner_diameter = "20 mm"
[sections.small]
shape = "round"
diameter = "10 mm"
[stations]
wall = "0 mm"
collar = "0 mm"
nut = "120 mm"
tip = "300 mm"
[[segments]]
name = "bolt<i>"
from = "wall"
to = "nut"
material = "structural-steel"
section = "rod"
misfit = "-0.05 mm"
[[segments]]
name = "sleeve"
from = "collar"
to = "nut"
material = "<b>alloy</b>"
section = "tube"
[[segments]]
name = "stem"
from = "tip"
to = "nut"
material = "structural-steel"
section = "rod"
end_section = "small"
[[segments]]
name = "tail"
from = "tip"
to = "tail-end"
material = "structural-steel"
section = "small"
distributed_load = "5 kN/m"
[[supports]]
at = "wall"
[[supports]]
at = "collar"
[[gaps]]
name = "stop"
at = "tail-end"
side = "+x"
clearance = "0.3 mm"
[[limits]]
at = "tip"
displacement = "0.4 mm"
[[cases]]
name = "hot"
loads = [{{ at = "tip", force = "2 kN" }}]
[[cases]]
name = "pull"
temperature_change = "0 K"
loads = [{{ at = "tail-end", force = "8 kN" }}]
[[combinations]]
name = "both"
factors = {{ hot = 1.0, pull = 1.5 }}
""".replace('nut = "120 mm"\ntip = "300 mm"', 'nut = "120 mm"\ntip = "300 mm"\n"tail-end" = "400 mm"')


@pytest.fixture(scope="module")
def solution():
    return solve(parse_model(MODEL, "job.toml"))


@pytest.fixture(scope="module")
def page(solution):
    return build_html(solution, date="2024-05-17", checks=check_solution(solution))


class Collector(HTMLParser):
    """Records tags, ids, the tag stack at each id, and all text."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.stack, self.ids, self.tags, self.text = [], {}, [], []
        self.meta_charset = None
        self.svg_in = {}

    def handle_starttag(self, tag, attrs):
        attrs = dict(attrs)
        self.tags.append(tag)
        if tag == "meta" and "charset" in attrs:
            self.meta_charset = attrs["charset"]
        if tag == "svg":
            for t, i in self.stack:
                if i and i.startswith("diagram-"):
                    self.svg_in[i] = self.svg_in.get(i, 0) + 1
        if tag not in ("meta", "link", "br", "img", "input", "hr"):
            self.stack.append((tag, attrs.get("id")))
        if attrs.get("id"):
            self.ids[attrs["id"]] = tag

    def handle_startendtag(self, tag, attrs):
        self.tags.append(tag)
        if tag == "meta" and dict(attrs).get("charset"):
            self.meta_charset = dict(attrs)["charset"]

    def handle_endtag(self, tag):
        for k in range(len(self.stack) - 1, -1, -1):
            if self.stack[k][0] == tag:
                del self.stack[k:]
                break

    def handle_data(self, data):
        self.text.append(data)


def parse(text):
    p = Collector()
    p.feed(text)
    p.close()
    return p


def test_html_has_every_section_and_diagram(solution, page):
    text = page
    p = parse(text)
    assert p.meta_charset == "utf-8"
    for key in SECTIONS:
        assert p.ids.get(key) == "section", key
    n = len(solution.cases)
    assert n == 3
    for k in range(n):
        assert p.ids[f"diagram-{k}"] == "figure"
        assert p.svg_in[f"diagram-{k}"] >= 1          # an inline SVG in each figure
        assert p.ids[f"results-{k}"] == "h3"
        assert p.ids[f"calculation-{k}"] == "h3"
        assert p.ids[f"checks-{k}"] == "h3"
    assert p.ids["governing"] == "p"
    body = "".join(p.text)
    assert "2024-05-17" in body
    for caution in CAUTIONS:
        assert caution in body
    # self-contained: no external resource of any kind
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:|//)""", text)
    assert "<link" not in text and "<img" not in text


def test_model_text_is_escaped(page):
    text = page
    p = parse(text)
    assert "script" not in p.tags and "b" not in p.tags and "i" not in p.tags
    body = "".join(p.text)
    assert HOSTILE in body                      # shown literally, as text
    assert "<b>alloy</b>" in body and "bolt<i>" in body
    assert html.escape(HOSTILE) in text


def test_input_echo(page):
    body = "".join(parse(page).text)
    for word in ("stations", "materials", "segments", "supports", "point loads", "gaps",
                 "temperatures and self-weight", "combinations", "deformation limits",
                 "tail-end", "stop on the +x side", "1.5 \u00d7 pull", "ASTM A36"):
        assert word in body, word


def test_calculation_sheet_sums_to_relative_displacement(solution):
    for case in solution.cases:
        rows = calculation_rows(case, case.model.units)
        scale = max(abs(r["relative"]) for r in rows)
        for i, (row, seg) in enumerate(zip(rows, case.model.segments)):
            assert row["sum"] == pytest.approx(row["elastic"] + row["thermal"] + row["misfit"])
            assert abs(row["closure"]) <= 1e-9 * scale
            assert row["elastic"] == pytest.approx(case.elastic_elongation[i] / 1e-3, rel=1e-9,
                                                   abs=1e-12)
            assert row["thermal"] == pytest.approx(case.thermal_elongation[i] / 1e-3, rel=1e-12,
                                                   abs=1e-15)


def test_calculation_sheet_hand_values():
    # Uniform bar, constant force: elastic part N*L/(E*A) (the textbook sum, e.g. Gere and
    # Goodno, Mechanics of Materials, changes in lengths of axially loaded members; from
    # memory); free thermal part alpha*dT*L.
    model = parse_model("""
[settings]
temperature_change = "50 K"
[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = "800 mm"
[[segments]]
name = "bar"
from = "a"
to = "b"
material = "structural-steel"
section = "s"
misfit = "0.1 mm"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "15 kN"
""")
    case = solve(model)["base"]
    row, = calculation_rows(case, model.units)
    A = math.pi * 0.02 ** 2 / 4
    assert row["elastic"] == pytest.approx(15e3 * 0.8 / (200e9 * A) * 1e3, rel=1e-12)
    assert row["thermal"] == pytest.approx(11.7e-6 * 50 * 800, rel=1e-12)
    assert row["misfit"] == pytest.approx(0.1)
    assert row["relative"] == pytest.approx(case.u[1] * 1e3, rel=1e-12)
    assert row["elastic_text"] == ("N\u00b7L/(E\u00b7A) = 15000 N \u00d7 800 mm / (200000 MPa "
                                   "\u00d7 314.2 mm\u00b2)")


def test_station_words():
    assert station_words(-0.000142, "mm", 1e-3) == "0.142 mm toward \u2212x"
    assert station_words(2.5e-4, "in", 0.0254) == "0.009843 in toward +x"
    assert station_words(0.0, "mm", 1e-3) == "0 mm (does not move)"
    assert station_words(1e-20, "mm", 1e-3, scale=1e-3) == "0 mm (does not move)"


def test_station_words_in_report(page):
    body = "".join(parse(page).text)
    assert "wall" in body and "0 mm (does not move)" in body
    assert re.search(r"\d mm toward (\+x|\u2212x)", body)


def test_checks_and_governing_in_report(solution, page):
    from axialfe.checks import check_solution

    report = check_solution(solution)
    g = report.governing
    body = "".join(parse(page).text)
    assert f"Governing check: {g.kind} of '{g.name}' in case '{g.case}'" in body
    assert "safety factor 1.25" in body


def test_markdown_report(solution):
    text = build_markdown(solution, date="2024-05-17", checks=check_solution(solution))
    for title in ("## The job", "## Assumptions", "## Input", "## Results", "## Calculation sheet",
                  "## Design checks", "## Diagrams", "## Cautions"):
        assert title in text
    assert "<script>" not in text and "&lt;script&gt;" in text
    images = re.findall(r"\(data:image/png;base64,([A-Za-z0-9+/=]+)\)", text)
    assert len(images) == len(solution.cases)
    for data in images:
        assert base64.b64decode(data)[:8] == b"\x89PNG\r\n\x1a\n"


def test_report_format_by_suffix():
    assert report_format("r.html") == "html"
    assert report_format("r.md") == "markdown"
    assert report_format("r.htm", "html") == "html"
    with pytest.raises(ModelError) as err:
        report_format("r.pdf")
    assert str(err.value) == ("r.pdf: cannot write a report as '.pdf'; expected one of: "
                              "'.html', '.htm', '.md', '.markdown'")
    with pytest.raises(ModelError) as err:
        report_format("r.html", "markdown")
    assert str(err.value) == ("r.html: cannot write a Markdown report as '.html'; expected "
                              "one of: '.md', '.markdown'")


SMALL = """
title = "small \u00e9t\u00e9 <rod>"
[sections.s]
shape = "round"
diameter = "20 mm"
[stations]
a = "0 mm"
b = "500 mm"
[[segments]]
from = "a"
to = "b"
material = "structural-steel"
section = "s"
[[supports]]
at = "a"
[[loads]]
at = "b"
force = "4 kN"
"""


def test_write_report_utf8(tmp_path):
    solution = solve(parse_model(SMALL))
    path = write_report(solution, tmp_path / "r.html", date="2024-05-17",
                        checks=check_solution(solution))
    raw = path.read_bytes()
    assert "small \u00e9t\u00e9 &lt;rod&gt;" in raw.decode("utf-8")
    assert b'<meta charset="utf-8">' in raw


def test_cli_report(tmp_path):
    model = tmp_path / "job.toml"
    model.write_text(SMALL, encoding="utf-8")
    out = tmp_path / "report.html"
    result = runner.invoke(app, ["report", str(model), "-o", str(out)])
    assert result.exit_code == 0, result.output
    assert parse(out.read_text(encoding="utf-8")).ids["diagrams"] == "section"
    out = tmp_path / "report.md"
    result = runner.invoke(app, ["report", str(model), "-o", str(out), "--format", "markdown"])
    assert result.exit_code == 0, result.output
    assert out.read_text(encoding="utf-8").startswith("# small \u00e9t\u00e9 &lt;rod&gt;")
    bad = tmp_path / "report.txt"
    result = runner.invoke(app, ["report", str(model), "-o", str(bad)])
    assert result.exit_code == 2
    assert result.stderr.strip().splitlines() == [
        f"error: {bad}: cannot write a report as '.txt'; expected one of: '.html', '.htm', "
        "'.md', '.markdown'"]


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.name for p in EXAMPLES])
def test_every_example_checks_plots_and_reports(tmp_path, path):
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code in (0, 1, 3), result.output
    out = tmp_path / "r.html"
    result = runner.invoke(app, ["report", str(path), "-o", str(out)])
    assert result.exit_code == 0, result.output
    p = parse(out.read_text(encoding="utf-8"))
    assert all(p.ids.get(k) == "section" for k in SECTIONS)
    n = len(solve(read_model(path)).cases)
    assert all(p.svg_in.get(f"diagram-{k}") for k in range(n))
