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


def test_calculation_sheet_shows_the_solved_elongations(solution):
    # the rows carry the solver's elongations, and each row's relative displacement is the
    # change of distance between its end stations
    for case in solution.cases:
        rows = calculation_rows(case, case.model.units)
        for i, (row, seg) in enumerate(zip(rows, case.model.segments)):
            assert row["elastic"] == pytest.approx(case.elastic_elongation[i] / 1e-3, rel=1e-9,
                                                   abs=1e-12)
            assert row["thermal"] == pytest.approx(case.thermal_elongation[i] / 1e-3, rel=1e-12,
                                                   abs=1e-15)
            assert row["misfit"] == pytest.approx(seg.misfit / 1e-3, rel=1e-12)
            start, end = (case.model.stations[case.model.station_index(n)].x for n in (seg.start, seg.end))
            moved = case.displacement(seg.end) - case.displacement(seg.start)
            assert row["relative"] == pytest.approx(math.copysign(1.0, end - start) * moved / 1e-3,
                                                    rel=1e-9, abs=1e-12)


def test_calculation_sheet_of_the_heated_bar_with_end_float():
    # A bronze sleeve and a steel rod in series, fixed at the base, heated by dT = 60 K;
    # the free expansion dT*(alpha_1*L_1 + alpha_2*L_2) = 0.3672 mm closes the end float
    # c = 0.12 mm, and the cover then presses with R = (free expansion - c)/(L_1/(E_1*A_1) +
    # L_2/(E_2*A_2)) (Gere and Goodno, Mechanics of Materials, thermal effects, bar with a
    # gap; from memory).  Each part's elastic part is -R*L/(E*A), its thermal part
    # alpha*dT*L, their sum the part's change of length, and the two sum to c (the tip
    # rests on the cover).
    model = read_model(ROOT / "examples" / "closed-form-heated-bar-gap.toml")
    rows = calculation_rows(solve(model)["base"], model.units)
    parts = [("sleeve", 110e9, 450e-6, 0.180, 18e-6), ("rod", 205e9, 300e-6, 0.240, 12e-6)]
    R = (60 * sum(a * L for *_, L, a in parts) - 0.12e-3) / sum(L / (E * A) for _, E, A, L, _ in parts)
    assert R == pytest.approx(32.79e3, rel=1e-4)
    for row, (name, E, A, L, alpha) in zip(rows, parts):
        assert row["segment"] == name
        elastic, thermal = -R * L / (E * A), alpha * 60 * L
        assert row["elastic"] == pytest.approx(elastic * 1e3, rel=1e-12)  # mm
        assert row["thermal"] == pytest.approx(thermal * 1e3, rel=1e-12)
        assert row["misfit"] == 0
        assert row["sum"] == pytest.approx((elastic + thermal) * 1e3, rel=1e-12)
        assert row["relative"] == pytest.approx((elastic + thermal) * 1e3, rel=1e-9)
        assert abs(row["closure"]) <= 1e-9 * abs(row["relative"])
    assert sum(row["relative"] for row in rows) == pytest.approx(0.12, rel=1e-9)


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
    # worked to the result, one unit per quantity: 15000 * 800 / (200000 * 314.16) = 0.1910 mm,
    # 11.7e-6 * 50 * 800 = 0.468 mm
    assert row["elastic_text"] == ("N\u00b7L/(E\u00b7A) = 15000 N \u00d7 800 mm / (200000 MPa "
                                   "\u00d7 314.2 mm\u00b2) = 0.191 mm")
    assert row["thermal_text"] == ("\u03b1\u00b7\u0394T\u00b7L = 1.17e-05 /K \u00d7 50 K \u00d7 "
                                   "800 mm = 0.468 mm")


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


def test_markdown_report(solution, tmp_path):
    text = build_markdown(solution, date="2024-05-17", checks=check_solution(solution),
                          figures=["r-diagram-1.png", "r-diagram-2.png", "r-diagram-3.png"])
    for title in ("## Summary", "## The job", "## Assumptions", "## Input", "## Results",
                  "## Calculation sheet", "## Design checks", "## Diagrams", "## Cautions"):
        assert title in text
    assert "<script>" not in text and "&lt;script&gt;" in text
    assert "base64" not in text                     # the diagrams are files, linked
    assert re.findall(r"\]\((r-diagram-\d\.png)\)", text) == [
        "r-diagram-1.png", "r-diagram-2.png", "r-diagram-3.png"]
    # written: the report and one PNG per case beside it, each linked by its name
    path = write_report(solution, tmp_path / "job report.md", date="2024-05-17",
                        checks=check_solution(solution))
    names = re.findall(r"\]\(([^)]+\.png)\)", path.read_text(encoding="utf-8"))
    assert names == [f"job%20report-diagram-{k}.png" for k in (1, 2, 3)]
    for k in (1, 2, 3):
        data = (tmp_path / f"job report-diagram-{k}.png").read_bytes()
        assert data[:8] == b"\x89PNG\r\n\x1a\n"
    assert len(path.read_bytes()) < 60_000


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
def test_every_example_reports(tmp_path, path):
    # the status of `check` on each example is pinned in test_examples.py (CHECK_STATUS)
    # and, for docs/clamped-spacer.toml, in test_buckling.py
    out = tmp_path / "r.html"
    result = runner.invoke(app, ["report", str(path), "-o", str(out)])
    assert result.exit_code == 0, result.output
    p = parse(out.read_text(encoding="utf-8"))
    assert all(p.ids.get(k) == "section" for k in SECTIONS)
    n = len(solve(read_model(path)).cases)
    assert all(p.svg_in.get(f"diagram-{k}") for k in range(n))


# --- the title block, the summary, the calculation sheet's new parts ------------------
PROJECT = SMALL.replace('title = "small \u00e9t\u00e9 <rod>"', '''title = "small \u00e9t\u00e9 <rod>"
[project]
name = "Conveyor <retrofit>"
number = "J-2291"
prepared_by = "R. Okafor"
checked_by = "M. Lind"
revision = "C"
date = 2026-03-14''')


def test_project_table_is_read_as_plain_text():
    model = parse_model(PROJECT)
    assert model.project.items() == (
        ("project", "Conveyor <retrofit>"), ("number", "J-2291"), ("prepared by", "R. Okafor"),
        ("checked by", "M. Lind"), ("revision", "C"), ("date", "2026-03-14"))
    assert parse_model(SMALL).project is None


def test_title_block_heads_every_printed_page():
    solution = solve(parse_model(PROJECT))
    page = build_html(solution, date="2026-03-20", checks=check_solution(solution))
    # the title block is the head of the page table, which a browser repeats on each page
    head = page[page.index('<table class="page"><thead>'):page.index("</thead>")]
    assert 'id="titleblock"' in head
    body = "".join(parse(head).text)
    for text in ("Conveyor <retrofit>", "J-2291", "prepared by", "R. Okafor", "checked by",
                 "M. Lind", "revision", "2026-03-14", "printed", "2026-03-20"):
        assert text in body, text
    assert "Conveyor &lt;retrofit&gt;" in head
    assert "@page { size: A4 portrait" in page
    letter = build_html(solution, date="2026-03-20", checks=check_solution(solution),
                        paper="letter")
    assert "@page { size: letter portrait" in letter
    md = build_markdown(solution, date="2026-03-20", checks=check_solution(solution))
    assert "| number | J-2291 |" in md and "| checked by | M. Lind |" in md


def test_summary_opens_the_report_with_the_verdict(solution, page):
    p = parse(page)
    assert p.ids["summary"] == "section" and p.ids["verdict"] == "p"
    assert page.index('id="summary"') < page.index('id="job"')
    summary = page[page.index('id="summary"'):page.index('id="job"')]
    text = "".join(parse(summary).text)
    checks = check_solution(solution)
    word = {"pass": "PASS", "fail": "FAIL", "undecided": "UNDECIDED"}[checks.status]
    assert f"Verdict: {word}" in text
    g = checks.governing
    assert f"{g.kind} of '{g.name}' in case '{g.case}', utilization {g.utilization:.3f}" in text
    for caution in CAUTIONS:
        assert caution in text


def test_a_failing_check_reads_as_fail_in_the_summary():
    # 4 kN on a 20 mm rod is 4000 N / 314.16 mm^2 = 12.73 MPa: a material of 10 MPa yield
    # strength (invented) fails the strength check with utilisation 1.273.
    text = SMALL.replace('material = "structural-steel"', 'material = "weak"') + """
[materials.weak]
elastic_modulus = "200 GPa"
yield_strength = "10 MPa"
"""
    solution = solve(parse_model(text))
    checks = check_solution(solution)
    assert checks.status == "fail"
    page = build_html(solution, date="2026-03-20", checks=checks)
    summary = "".join(parse(page[page.index('id="summary"'):page.index('id="job"')]).text)
    assert "Verdict: FAIL" in summary and "At least one check FAILS" in summary
    assert "utilization 1.273 (FAIL)" in summary


def test_calculation_sheet_carries_gaps_balance_and_thermal_part(solution, page):
    from axialfe.review.sheet import thermal_split

    calc = page[page.index('id="calculation"'):page.index('id="checks"')]
    text = "".join(parse(calc).text)
    for words in ("Balance of each station", "Compatibility of the closed gaps",
                  "Thermal and load-driven force"):
        assert words in text
    full = build_html(solution, date="2024-05-17", checks=check_solution(solution),
                      thermal=thermal_split(solution))
    calc = "".join(parse(full[full.index('id="calculation"'):full.index('id="checks"')]).text)
    assert "thermal from [kN]" in calc or "cannot be separated" in calc


def test_cli_plot_and_report_write_beside_the_model_by_default(tmp_path):
    model = tmp_path / "conveyor job.toml"
    model.write_text(PROJECT, encoding="utf-8")
    before = model.read_bytes()
    result = runner.invoke(app, ["plot", str(model)])
    assert result.exit_code == 0, result.output
    assert (tmp_path / "conveyor job.png").read_bytes()[:4] == b"\x89PNG"
    result = runner.invoke(app, ["report", str(model)])
    assert result.exit_code == 0, result.output
    assert result.stderr.strip() == f"wrote {tmp_path / 'conveyor job.html'}"
    assert "J-2291" in (tmp_path / "conveyor job.html").read_text(encoding="utf-8")
    result = runner.invoke(app, ["report", str(model), "--format", "markdown", "--paper", "letter"])
    assert result.exit_code == 0, result.output
    assert (tmp_path / "conveyor job-diagram-1.png").exists()
    assert model.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == [
        "conveyor job-diagram-1.png", "conveyor job.html", "conveyor job.md", "conveyor job.png",
        "conveyor job.toml"]


def test_a_markdown_diagram_may_not_replace_the_model(tmp_path):
    model = tmp_path / "r-diagram-1.png"        # a model file of an odd name
    model.write_text(SMALL, encoding="utf-8")
    before = model.read_bytes()
    result = runner.invoke(app, ["report", str(model), "-o", str(tmp_path / "r.md")])
    assert result.exit_code == 2
    assert result.stderr.strip().splitlines() == [
        f"error: a diagram of the report: '{model}' is an input file of this command; it would "
        "be overwritten: choose another output path"]
    assert model.read_bytes() == before and not (tmp_path / "r.md").exists()


def test_cli_report_refuses_an_unknown_paper(tmp_path):
    import subprocess
    import sys

    model = tmp_path / "m.toml"
    model.write_text(SMALL, encoding="utf-8")
    bad = subprocess.run([sys.executable, "-m", "axialfe", "report", str(model), "--paper", "a3"],
                         capture_output=True, text=True)
    assert bad.returncode == 2
    assert bad.stderr.splitlines() == [
        "error: '--paper': 'a3' is not one of 'a4', 'letter' (see 'axialfe report --help')"]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["m.toml"]


def test_summary_shows_the_envelope_of_the_key_quantities(solution):
    from axialfe.envelope import envelope

    env = envelope(solution)
    page = build_html(solution, date="2024-05-17", checks=check_solution(solution),
                      envelope=env)
    summary = "".join(parse(page[page.index('id="summary"'):page.index('id="job"')]).text)
    assert "Envelope over 3 cases" in summary
    # the most compressive force over every segment and case, and the case that gives it
    low = min((e for e in env.segments if e.quantity == "axial_force"), key=lambda e: e.min)
    assert f"{low.min / 1e3:.6g}" in summary and low.min_case in summary
    results = page[page.index('id="results"'):page.index('id="calculation"')]
    assert 'id="envelope"' in results                 # the full envelope leads the results
    md = build_markdown(solution, date="2024-05-17", checks=check_solution(solution),
                        envelope=env)
    assert "Envelope over 3 cases" in md and "### Envelope" in md


def test_cli_report_carries_the_notes_where_a_result_leaves_its_assumptions(tmp_path):
    # heated 150 K between walls: sigma = -E*alpha*dT = -200 GPa * 11.7e-6 * 150 = -351 MPa,
    # beyond structural steel's 250 MPa (Gere and Goodno, Mechanics of Materials, sec. 2.5)
    text = SMALL.replace("[[loads]]\nat = \"b\"\nforce = \"4 kN\"\n",
                         "[[supports]]\nat = \"b\"\n[settings]\ntemperature_change = \"150 K\"\n")
    model = tmp_path / "hot.toml"
    model.write_text(text, encoding="utf-8")
    result = runner.invoke(app, ["report", str(model)])
    assert result.exit_code == 0, result.output
    page = (tmp_path / "hot.html").read_text(encoding="utf-8")
    summary = "".join(parse(page[page.index('id="summary"'):page.index('id="job"')]).text)
    assert "Notes on the results" in summary and "yield" in summary
