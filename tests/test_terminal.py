"""The terminal output: width, footnotes, --brief, rounding noise, order, units, small commands."""

from __future__ import annotations

import json
import os

import pytest

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
