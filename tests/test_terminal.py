"""The terminal output: width, footnotes, --brief, rounding noise, order, units, small commands."""

from __future__ import annotations

import json
import os

import pytest
from hypothesis import given
from hypothesis import strategies as st

from axialfe import Load, Material, Model, Section, Segment, Station, Support, solve
from axialfe.output.text import to_table
from axialfe.supports import support_loads

from conftest import EXAMPLES

STRUT = os.path.join(EXAMPLES, "strut-load-cases.toml")
PIPE = os.path.join(EXAMPLES, "pipe-between-anchors.toml")


def test_version(cli):
    from axialfe import __version__

    res = cli("--version")
    assert res.exit_code == 0 and res.stdout == f"axialfe {__version__}\n"


@pytest.mark.parametrize("path", sorted(f for f in os.listdir(EXAMPLES) if f.endswith(".toml")))
def test_solve_fits_100_columns_off_a_terminal(cli, path):
    out = cli("solve", os.path.join(EXAMPLES, path), "--envelope").stdout
    cautions = out.index("\ncautions:")          # the cautions are sentences, not tables
    assert max(len(line) for line in out[:cautions].splitlines()) <= 100


def test_a_wide_table_is_split_repeating_its_first_column():
    from axialfe.output.text import _grid

    lines = _grid(["name", "a", "b"], [["x", "1", "2"]], width=11)
    assert lines == ["  name  a", "  ----  -", "  x     1", "", "  name  b", "  ----  -",
                     "  x     2"]
    assert _grid(["name", "a", "b"], [["x", "1", "2"]]) == ["  name  a  b", "  ----  -  -",
                                                            "  x     1  2"]


def test_brief_prints_reactions_governing_check_and_notes(cli):
    out = cli("solve", PIPE, "--brief").stdout
    assert "\n stations\n" not in out and "\n segments\n" not in out
    assert "checks of case" not in out
    assert " reactions (force of the support on the bar" in out
    assert "governing check: buckling of 'run-1' in case 'base', utilization 5.068 (FAIL)" in out
    assert "\n notes:\n   1. segment 'run-1' reaches" in out
    assert out.count("cautions:") == 1


def test_cautions_once_per_command(cli):
    out = cli("solve", STRUT).stdout
    assert out.count("cautions:") == 1 and out.count("These results support checking") == 1


def symmetric():
    # +P and -P at stations placed symmetrically between walls: the middle station does not
    # move (antisymmetry), which the solver gives as 1.7e-21 m of rounding noise.
    m = Material("s", 200e9, 12e-6)
    a, b = Section("a", "area", (("area", 1e-4),)), Section("b", "area", (("area", 3e-4),))
    st = (Station("A", 0.0), Station("B", 0.3), Station("C", 0.7), Station("D", 1.1),
          Station("E", 1.4))
    seg = (Segment("ab", "A", "B", m, a), Segment("bc", "B", "C", m, b),
           Segment("cd", "C", "D", m, b), Segment("de", "D", "E", m, a))
    return Model(st, seg, (Support("A"), Support("E")), (Load("B", 1e3), Load("D", -1e3)))


def test_rounding_noise_prints_as_zero():
    sol = solve(symmetric())
    assert 0 < abs(sol["base"].displacement("C")) < 1e-18      # noise, not a displacement
    lines = [line.split() for line in to_table(sol).splitlines()]
    assert ["C", "700", "0"] in lines
    # JSON keeps the solver's own numbers
    from axialfe.output.text import to_json

    data = json.loads(to_json(sol))
    assert data["cases"][0]["stations"][2]["displacement"] != 0.0


def test_stations_print_in_order_of_x(tmp_path, cli):
    path = tmp_path / "order.toml"
    path.write_text("""[materials.m]
elastic_modulus = "200 GPa"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
tip = "2 m"
root = "0 m"
mid = "1 m"
[[segments]]
from = "root"
to = "mid"
material = "m"
section = "s"
[[segments]]
from = "mid"
to = "tip"
material = "m"
section = "s"
[[supports]]
at = "root"
[[loads]]
at = "tip"
force = "1 kN"
""", encoding="utf-8")
    out = cli("solve", path).stdout.splitlines()
    first = out.index(" stations")
    assert [line.split()[0] for line in out[first + 3:first + 6]] == ["root", "mid", "tip"]


def test_us_output_converts_temperature_changes(cli):
    # 101.111 K is 182 degF of change (1 degF = 5/9 K)
    out = cli("solve", PIPE).stdout
    assert "units: force kip, length ft, displacement in, stress psi, temperature degF" in out
    assert "dT [degF]" in out
    row = next(line.split() for line in out.splitlines() if line.startswith("  run-1  ")
               and "182" in line)
    assert row[-1] == "182"
    data = json.loads(cli("solve", PIPE, "-f", "json", "--temperature-unit", "K").stdout)
    assert data["units"]["temperature"] == "K"
    assert data["cases"][0]["segments"][0]["temperature_change"] == pytest.approx(101.111, rel=1e-5)
    bad = cli("solve", PIPE, "--temperature-unit", "degC")
    assert bad.exit_code == 2 and "degC" in bad.output


def test_support_loads_in_words():
    # Gere and Goodno, sec. 2.4: R_A = -P*b/L and R_B = -P*a/L for P toward +x at a from A
    m = Material("s", 200e9)
    rod = Section("r", "area", (("area", 1e-4),))
    model = Model((Station("A", 0.0), Station("C", 1.0), Station("B", 3.0)),
                  (Segment("AC", "A", "C", m, rod), Segment("CB", "C", "B", m, rod)),
                  (Support("A"), Support("B"), Support("C", "spring", stiffness=1e6)),
                  (Load("C", -9e3),))
    loads = {s.at: s for s in support_loads(solve(model)["base"])}
    assert loads["A"].words == "pushes the support at 'A' toward -x"
    assert loads["B"].words == "pulls the support at 'B' toward -x"
    assert loads["C"].side == "both" and loads["C"].words == "loads the support at 'C' toward -x"
    assert loads["A"].short == "pushes it toward -x"


def test_check_one_case(cli):
    res = cli("check", STRUT, "--case", "dead+snow", "-f", "json")
    assert res.exit_code == 0
    assert [c["name"] for c in json.loads(res.stdout)["cases"]] == ["dead+snow"]
    bad = cli("check", STRUT, "--case", "dead+sno")
    assert bad.exit_code == 2
    assert bad.output.strip() == "error: --case: unknown case 'dead+sno'; did you mean 'dead+snow'?"


# --- model-file conveniences: dotted names, gap sides, an inverted contact ---------------------
INVERTED = """title = "inverted"
[materials.m]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
[sections.s]
shape = "area"
area = "100 mm^2"
[stations]
wall = "0 mm"
end = "1000 mm"
cover = "1000 mm"
wall2 = "1100 mm"
[[segments]]
name = "shaft"
from = "wall"
to = "end"
material = "m"
section = "s"
temperature_change = "50 K"
[[segments]]
name = "cover"
from = "cover"
to = "wall2"
material = "m"
section = "s"
[[supports]]
at = "wall"
[[supports]]
at = "wall2"
[[gaps]]
name = "float"
GAP
clearance = "0.2 mm"
"""


def _file(tmp_path, text, name="m.toml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def test_gap_sides_are_between_in_order(tmp_path, cli):
    # The shaft grows alpha*dT*L = 12e-6 * 50 K * 1 m = 0.6 mm toward the cover: 0.2 mm closes
    # the float and the other 0.4 mm is shared by the shaft and the cover in series
    # (k = E*A/L: 20 kN/mm and 200 kN/mm), so the contact force is 0.4 mm / (1/20 + 1/200) mm/kN
    # = 7.273 kN (common practice: compatibility of a closed gap).
    sides = json.loads(cli("solve", _file(tmp_path, INVERTED.replace(
        "GAP", 'minus_side = "end"\nplus_side = "cover"')), "-f", "json").stdout)
    between = json.loads(cli("solve", _file(tmp_path, INVERTED.replace(
        "GAP", 'between = ["end", "cover"]'), "b.toml"), "-f", "json").stdout)
    force = sides["cases"][0]["gaps"][0]["force"]
    assert force == pytest.approx(-0.4e-3 / (1 / 20e6 + 1 / 200e6), rel=1e-9)
    assert sides["cases"][0]["gaps"] == between["cases"][0]["gaps"]
    assert sides["warnings"] == []


def test_gap_side_errors(tmp_path, cli):
    one = cli("solve", _file(tmp_path, INVERTED.replace("GAP", 'minus_side = "end"')))
    assert one.exit_code == 2
    assert one.output.strip().endswith("gaps[1] ('float'): a gap with 'minus_side' needs "
                                       "'plus_side' too (the stations on the -x and the +x side "
                                       "of the gap)")
    both = cli("solve", _file(tmp_path, INVERTED.replace(
        "GAP", 'minus_side = "end"\nplus_side = "cover"\nbetween = ["end", "cover"]')))
    assert both.exit_code == 2 and both.output.strip().endswith(
        "gaps[1] ('float'): 'minus_side' names a station of a gap between two; give it instead "
        "of 'between' or 'at', not with them")
    typo = cli("solve", _file(tmp_path, INVERTED.replace(
        "GAP", 'minus_side = "edn"\nplus_side = "cover"')))
    assert typo.exit_code == 2 and typo.output.strip().endswith(
        "gaps[1] ('float'): unknown station 'edn'; did you mean 'end'?")


def test_an_inverted_contact_is_warned_of(tmp_path, cli):
    # Given the wrong way round, the float opens by the shaft's 0.6 mm growth: 0.8 mm open,
    # more than the 0.6 mm the stations ever move relative to each other.
    path = _file(tmp_path, INVERTED.replace("GAP", 'between = ["cover", "end"]'))
    data = json.loads(cli("solve", path, "-f", "json").stdout)
    assert data["cases"][0]["gaps"][0]["opening"] == pytest.approx(0.8, rel=1e-9)
    assert data["warnings"] == [
        "gap 'float' is open in every case by more than its stations ever move relative to each "
        "other (at least 0.8 mm open, at most 0.6 mm of movement, always apart): it is likely "
        "inverted; between = ['cover', 'end'] closes as u('cover') - u('end') reaches the "
        "clearance; swap them, or give minus_side and plus_side"]
    assert "\nwarning: gap 'float' is open in every case" in cli("solve", path).stdout


def test_a_dotted_table_name_says_to_quote_it(tmp_path, cli):
    text = INVERTED.replace("[materials.m]", "[materials.bolt-8.8]").replace(
        'material = "m"', 'material = "bolt-8.8"').replace("GAP", 'between = ["end", "cover"]')
    res = cli("solve", _file(tmp_path, text))
    assert res.exit_code == 2
    assert res.output.strip() == (
        f"error: {tmp_path / 'm.toml'}:2: materials: the header [materials.bolt-8.8] reads as "
        "nested tables 'bolt-8' and '8': a name with a dot must be quoted, "
        '[materials."bolt-8.8"]')
    quoted = text.replace("[materials.bolt-8.8]", '[materials."bolt-8.8"]')
    assert cli("solve", _file(tmp_path, quoted, "q.toml")).exit_code == 0


@given(st.lists(st.text(alphabet="abc-'.(xyz", min_size=1, max_size=14), min_size=1, max_size=30),
       st.integers(1, 60), st.sampled_from([("", ""), (" ", "   "), ("  12. ", "      ")]))
def test_notes_wrap_as_textwrap_wraps_them(words, width, indents):
    # the fill of text set apart by single spaces is textwrap's (standard library), word for word
    import textwrap

    from axialfe.output.text import _wrapped

    text = " ".join(words)
    expected = textwrap.wrap(text, width, initial_indent=indents[0], subsequent_indent=indents[1],
                             break_on_hyphens=False, break_long_words=False)
    assert _wrapped(text, width, *indents) == expected
