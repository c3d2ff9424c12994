"""Stated values in files and on the command line: [[claims]], claims_file, axialfe verify.

Bad input gives one located line (file, line, place, what is wrong, the fix);
``axialfe verify`` exits 0 when every claim agrees, 1 when any differs and 2
for bad input, and ``solve`` and ``report`` show the review only when the
model states values.  Line numbers are those of MODEL below (counted by hand).
"""

import json
import math
from pathlib import Path

import pytest
from typer.testing import CliRunner

from axialfe.cli import app
from axialfe.errors import ModelError
from axialfe.io.claims import read_claims
from axialfe.engine.system import solve
from axialfe.io.modelfile import builtin_materials, read_model

runner = CliRunner()

# A bar between walls, 20 kN at C, heated 30 K: R_A = -P*b/L + E*A*alpha*dT = 24 kN
# (Gere and Goodno, Mechanics of Materials, 8th ed., 2.4 and 2.5; from memory)
MODEL = """\
title = "heated bar"

[materials.steel]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"

[sections.a500]
shape = "area"
area = "500 mm^2"

[settings]
temperature_change = "30 K"

[stations]
A = "0 mm"
C = "400 mm"
B = "1000 mm"

[[segments]]
name = "AC"
from = "A"
to = "C"
material = "steel"
section = "a500"

[[segments]]
name = "CB"
from = "C"
to = "B"
material = "steel"
section = "a500"

[[supports]]
at = "A"

[[supports]]
at = "B"

[[loads]]
at = "C"
force = "20 kN"
"""
# MODEL has 41 lines; CLAIM added to it puts [[claims]] on line 43, what 44, at 45, value 46
# and a key appended to it on 47

CLAIM = """
[[claims]]
what = "reaction"
at = "A"
value = "24 kN"
"""


def write(tmp_path, text, name="bar.toml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def error_of(tmp_path, claims_text):
    path = write(tmp_path, MODEL + claims_text)
    with pytest.raises(ModelError) as info:
        read_claims(path, read_model(path))
    return str(info.value).replace(str(path), "bar.toml")


def test_the_model_reader_ignores_claims(tmp_path):
    path = write(tmp_path, 'claims_file = "calc.toml"\n' + MODEL + CLAIM)
    assert read_model(path).title == "heated bar"


def test_claims_are_read_with_units_and_defaults(tmp_path):
    path = write(tmp_path, MODEL + CLAIM + """
[[claims]]
what = "stress"
at = "AC"
value = "-48 MPa"
end = "from"
tolerance = "0.01 MPa"
source = "sheet 3"
""")
    first, second = read_claims(path, read_model(path))
    assert (first.what, first.at, first.value, first.end, first.case) == (
        "reaction", "A", 24000.0, None, "base")
    assert first.tolerance.relative == 0.005 and first.source is None
    assert (second.value, second.end, second.tolerance.absolute, second.source) == (
        -48e6, "from", 1e4, "sheet 3")


def test_claims_file_beside_the_model(tmp_path):
    write(tmp_path, CLAIM.replace("24 kN", "-8 kN").replace('"A"', '"B"'), "calc.toml")
    path = write(tmp_path, 'claims_file = "calc.toml"\n' + MODEL + CLAIM)
    claims = read_claims(path, read_model(path))
    assert [(c.at, c.value) for c in claims] == [("A", 24000.0), ("B", -8000.0)]


@pytest.mark.parametrize("claims_text, message", [
    (CLAIM.replace('"A"', '"a"'), "bar.toml:45: claims[1]: unknown station 'a'; did you mean 'A'?"),
    (CLAIM.replace('"reaction"', '"stress"').replace('"24 kN"', '"1 MPa"'),
     "bar.toml:45: claims[1]: stress is stated at a segment: 'A' is a station; "
     "did you mean 'AC'?"),
    (CLAIM.replace('"A"', '"C"'),
     "bar.toml:45: claims[1]: station 'C' has no support, so it has no reaction; "
     "expected one of: 'A', 'B'"),
    (CLAIM.replace('"24 kN"', '"24 mm"'),
     "bar.toml:46: claims[1]: value: 'mm' is a unit of length, not of force, e.g. '12 kN'"),
    (CLAIM.replace('"24 kN"', '24'),
     "bar.toml:46: claims[1]: value: a bare number needs a unit: give a force, e.g. '12 kN'"),
    (CLAIM + 'case = "hot"\n', "bar.toml:47: claims[1]: unknown case 'hot'; expected one of: 'base'"),
    (CLAIM.replace('"reaction"', '"reactoin"'),
     "bar.toml:44: claims[1]: unknown value 'reactoin'; did you mean 'reaction'?"),
    (CLAIM + 'tolerence = "1 %"\n',
     "bar.toml:47: claims[1]: unknown key 'tolerence'; did you mean 'tolerance'?"),
    (CLAIM + 'tolerance = "1 kN/m"\n',
     "bar.toml:47: claims[1]: tolerance: 'kN/m' is a unit of force per length or stiffness, "
     "not of force, e.g. '12 kN'; or give a relative tolerance such as '1 %'"),
    (CLAIM + 'tolerance = 0.01\n',
     "bar.toml:47: claims[1]: tolerance: expected a relative tolerance such as '1 %' or an "
     "absolute one such as '10 N': got 0.01"),
    (CLAIM + 'tolerance = "-1 %"\n', "bar.toml:47: claims[1]: tolerance must not be negative: got '-1 %'"),
    (CLAIM + 'end = "to"\n',
     "bar.toml:47: claims[1]: 'end' belongs to axial_force and stress, not to reaction"),
    (CLAIM.replace('at = "A"\n', ""), "bar.toml:43: claims[1]: a claim needs 'at'"),
    ("\n[claims]\nwhat = 1\n",
     "bar.toml:43: top level: 'claims' must be an array of tables ([[claims]])"),
])
def test_bad_claims_give_one_located_line(tmp_path, claims_text, message):
    assert error_of(tmp_path, claims_text) == message


def test_several_cases_need_a_case(tmp_path):
    text = MODEL.replace('[[loads]]\nat = "C"\nforce = "20 kN"\n', """\
[[cases]]
name = "cold"
loads = [{ at = "C", force = "20 kN" }]

[[cases]]
name = "hot"
temperature_change = "60 K"
""")
    path = write(tmp_path, text + CLAIM)
    with pytest.raises(ModelError) as info:
        read_claims(path, read_model(path))
    line = (text + CLAIM).splitlines().index("[[claims]]") + 1
    assert str(info.value) == (f"{path}:{line}: claims[1]: the model has several cases: give 'case';"
                               " expected one of: 'cold', 'hot'")


def test_claims_file_errors(tmp_path):
    path = write(tmp_path, 'claims_file = "calc.toml"\n' + MODEL)
    with pytest.raises(ModelError) as info:
        read_claims(path, read_model(path))
    assert str(info.value) == f"{path}:1: claims_file '{tmp_path / 'calc.toml'}': the claims file does not exist"
    other = write(tmp_path, 'title = "calc"\n' + CLAIM, "calc.toml")
    with pytest.raises(ModelError) as info:
        read_claims(path, read_model(path))
    assert str(info.value) == (f"{other}:1: top level: unknown key 'title': a claims file holds "
                               "only [[claims]]")
    write(tmp_path, CLAIM.replace('"A"', '"D"'), "calc.toml")
    with pytest.raises(ModelError) as info:
        read_claims(path, read_model(path))
    assert str(info.value) == (f"{other}:4: claims[1]: unknown station 'D'; expected one of: "
                               "'A', 'C', 'B'")


# --- the command line ---------------------------------------------------------------
def test_verify_agrees_exit_0(tmp_path):
    path = write(tmp_path, MODEL + CLAIM)
    result = runner.invoke(app, ["verify", str(path)])
    assert result.exit_code == 0, result.output
    assert "claims: 1 agrees, 0 differ (every stated value agrees)" in result.output
    assert "      1  reaction  A   base  24000 N  24000 N   0 N         0 %       0.5 %      agrees" \
        in result.output


def test_verify_differs_exit_1_with_the_slip(tmp_path):
    path = write(tmp_path, MODEL + CLAIM.replace("24 kN", "-12 kN"))   # no temperature
    result = runner.invoke(app, ["verify", str(path), "--force-unit", "kN"])
    assert result.exit_code == 1, result.output
    assert ("    - no-temperature: the temperature change is left out (gives -12 kN)"
            in result.output)


def test_verify_json(tmp_path):
    path = write(tmp_path, MODEL + CLAIM.replace("24 kN", "24.1 kN") + 'source = "p. 3"\n')
    result = runner.invoke(app, ["verify", str(path), "--format", "json"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert list(data) == ["title", "units", "claims", "agree", "differ", "cautions"]
    (claim,) = data["claims"]
    assert claim == {"what": "reaction", "at": "A", "end": None, "case": "base",
                     "claimed": 24100.0, "computed": pytest.approx(24000.0, rel=1e-12),
                     "difference": pytest.approx(100.0, rel=1e-9),
                     "relative_difference": pytest.approx(100 / 24000, rel=1e-9),
                     "tolerance": "0.5 %", "verdict": "agrees", "source": "p. 3", "slips": [],
                     "note": None}
    assert (data["agree"], data["differ"]) == (1, 0)


def test_verify_bad_input_exit_2(tmp_path):
    path = write(tmp_path, MODEL + CLAIM.replace('"A"', '"a"'))
    result = runner.invoke(app, ["verify", str(path)])
    assert result.exit_code == 2
    assert result.output == f"error: {path}:45: claims[1]: unknown station 'a'; did you mean 'A'?\n"


def test_verify_without_claims_exit_2(tmp_path):
    path = write(tmp_path, MODEL)
    result = runner.invoke(app, ["verify", str(path)])
    assert result.exit_code == 2
    assert result.output == (f"error: {path}: the model states no values to verify: add "
                             "[[claims]] or claims_file\n")


def test_solve_shows_claims_only_when_there_are_some(tmp_path):
    plain = write(tmp_path, MODEL, "plain.toml")
    stated = write(tmp_path, MODEL + CLAIM, "stated.toml")
    assert "review of the stated values" not in runner.invoke(app, ["solve", str(plain)]).output
    assert "claims" not in json.loads(runner.invoke(app, ["solve", str(plain), "-f", "json"]).output)
    table = runner.invoke(app, ["solve", str(stated)])
    assert table.exit_code == 0 and "review of the stated values" in table.output
    data = json.loads(runner.invoke(app, ["solve", str(stated), "-f", "json"]).output)
    assert data["claims"][0]["verdict"] == "agrees" and (data["agree"], data["differ"]) == (1, 0)
    md = runner.invoke(app, ["solve", str(stated), "-f", "markdown"]).output
    assert "## Review of the stated values" in md
    plain_csv = runner.invoke(app, ["solve", str(plain), "-f", "csv"]).output
    assert ",claim," not in plain_csv
    rows = runner.invoke(app, ["solve", str(stated), "-f", "csv"]).output.splitlines()
    assert [r for r in rows if ",claim," in r] == [
        "base,claim,A,reaction claimed,,24000.0,N",
        f"base,claim,A,reaction computed,,{data['claims'][0]['computed']!r},N",
        "base,claim,A,reaction verdict,,agrees,0.5 %"]


def test_report_has_a_review_section_only_with_claims(tmp_path):
    plain = write(tmp_path, MODEL, "plain.toml")
    stated = write(tmp_path, MODEL + CLAIM.replace("24 kN", "-12 kN"), "stated.toml")
    for path, expected in ((plain, False), (stated, True)):
        out = tmp_path / (path.stem + ".html")
        result = runner.invoke(app, ["report", str(path), "-o", str(out)])
        assert result.exit_code == 0, result.output
        text = out.read_text(encoding="utf-8")
        assert ('<section id="review"><h2>Review of the stated values</h2>' in text) is expected
        if expected:
            assert "no-temperature: the temperature change is left out" in text
            assert text.index('id="review"') < text.index('id="diagrams"')
    out = tmp_path / "stated.md"
    assert runner.invoke(app, ["report", str(stated), "-o", str(out)]).exit_code == 0
    assert "## Review of the stated values" in out.read_text(encoding="utf-8")


# --- the example: a calculation sheet with two slips ----------------------------------
EXAMPLE = Path(__file__).resolve().parent.parent / "examples" / "heated-rod-hand-check.toml"


def test_example_hand_check_against_hand_solution():
    # Gere and Goodno, 8th ed., 2.4 and 2.5 (from memory): parts in series with an elastic
    # support; the held-back thermal growth gives N_T = -growth / (f_1 + f_2 + 1/k) in
    # every part, and the joint load P splits by flexibility: N_rod = N_T + P*(f_2 + 1/k)/f
    mats = builtin_materials()
    al, st = mats["aluminium-alloy"], mats["structural-steel"]
    f1 = 0.6 / (al.elastic_modulus * math.pi * 0.016**2 / 4)
    f2 = 0.2 / (st.elastic_modulus * math.pi * 0.020**2 / 4)
    fk = 1 / 40e6
    growth = 45 * (al.thermal_expansion * 0.6 + st.thermal_expansion * 0.2)
    n_rod = -growth / (f1 + f2 + fk) - 3e3 * (f2 + fk) / (f1 + f2 + fk)
    model = read_model(EXAMPLE)
    case = solve(model)["base"]
    assert case.force("rod").tolist() == pytest.approx([n_rod, n_rod], rel=1e-9)
    assert case.reaction("bracket") == pytest.approx(-n_rod, rel=1e-9)


def test_example_hand_check_finds_both_slips():
    result = runner.invoke(app, ["verify", str(EXAMPLE), "--format", "json"])
    assert result.exit_code == 1, result.output
    data = json.loads(result.output)
    assert [c["verdict"] for c in data["claims"]] == ["agrees", "differs", "differs", "agrees"]
    assert [[s["slip"] for s in c["slips"]] for c in data["claims"]] == [
        [], ["rigid-spring:mount"], ["temperature-sign"], []]
    assert [c["source"] for c in data["claims"]][:2] == ["sheet 1, line 14", "sheet 2, line 3"]


def test_readme_shows_the_example_as_it_runs():
    result = runner.invoke(app, ["verify", str(EXAMPLE)])
    shown = result.output.split("\ncautions:")[0].rstrip()
    readme = (EXAMPLE.parent.parent / "README.md").read_text(encoding="utf-8")
    assert "$ axialfe verify examples/heated-rod-hand-check.toml\n" + shown + "\n```" in readme


def test_text_from_the_file_is_escaped_in_markdown_and_html(tmp_path):
    stated = write(tmp_path, MODEL + CLAIM + 'source = "<b>sheet</b> | 2"\n', "stated.toml")
    out = tmp_path / "r.html"
    assert runner.invoke(app, ["report", str(stated), "-o", str(out)]).exit_code == 0
    assert "&lt;b&gt;sheet&lt;/b&gt; | 2" in out.read_text(encoding="utf-8")
    md = runner.invoke(app, ["solve", str(stated), "-f", "markdown"]).output
    assert "&lt;b&gt;sheet&lt;/b&gt; \\| 2" in md and "<b>" not in md
