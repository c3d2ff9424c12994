"""Envelopes over the cases: against envelopes worked by hand from closed forms."""

from __future__ import annotations

import csv
import dataclasses
import io
import json
import math
import os

import pytest

from axialfe import Case, Combination, Gap, Load, Model, Section, Segment, Station, Support, solve
from axialfe.envelope import envelope
from axialfe.results import Solution

from conftest import EXAMPLES, area, steel

E, A, ALPHA = 200e9, 1e-4, 12e-6
EA = E * A


def between_walls():
    """A bar A--C--B between two walls, a = 1 m, b = 2 m, 100 mm^2 of steel."""
    m = steel(E=E, alpha=ALPHA)
    s = area("s", A)
    cases = (Case("load", loads=(Load("C", 9e3),)),
             Case("reverse", loads=(Load("C", -4.5e3),)),
             Case("heat", temperature_change=(("all", 50.0),)))
    return Model((Station("A", 0.0), Station("C", 1.0), Station("B", 3.0)),
                 (Segment("AC", "A", "C", m, s), Segment("CB", "C", "B", m, s)),
                 (Support("A"), Support("B")), cases=cases,
                 combinations=(Combination("load/2+heat", (("load", 0.5), ("heat", 1.0))),))


def test_envelope_of_a_bar_between_walls_by_hand():
    # A load P at C between fixed walls: R_A = -P*b/L, N_AC = P*b/L, N_CB = -P*a/L,
    # u_C = P*a*b/(L*E*A) (Gere and Goodno, Mechanics of Materials, sec. 2.4, statically
    # indeterminate bar); uniform heating: N = -E*A*alpha*dT in both parts, u_C = 0
    # (sec. 2.5, thermal effects).  So, in N:
    #   N_AC: load 6000, reverse -3000, heat -12000, load/2+heat 3000 - 12000 = -9000
    #   N_CB: load -3000, reverse 1500, heat -12000, load/2+heat -1500 - 12000 = -13500
    thermal = -EA * ALPHA * 50.0
    assert thermal == pytest.approx(-12e3, rel=1e-12)
    env = envelope(solve(between_walls()))
    assert env.cases == ("load", "reverse", "heat", "load/2+heat") and env.excluded == ()

    def check(item, name, quantity, low, low_case, high, high_case, tol=1e-9):
        e = env.entry(item, name, quantity)
        assert (e.min, e.max) == (pytest.approx(low, rel=tol, abs=1e-9),
                                  pytest.approx(high, rel=tol, abs=1e-9)), (item, name, quantity)
        assert (e.min_case, e.max_case) == (low_case, high_case), (item, name, quantity)

    check("segment", "AC", "axial_force", -12e3, "heat", 6e3, "load")
    check("segment", "CB", "axial_force", -13.5e3, "load/2+heat", 1.5e3, "reverse")
    check("segment", "AC", "stress", -12e3 / A, "heat", 6e3 / A, "load")
    check("segment", "CB", "stress", -13.5e3 / A, "load/2+heat", 1.5e3 / A, "reverse")
    # R_A = -N_AC, R_B = N_CB (the force of each wall on the bar)
    check("reaction", "A", "force", -6e3, "load", 12e3, "heat")
    check("reaction", "B", "force", -13.5e3, "load/2+heat", 1.5e3, "reverse")
    # u_C = P*a*b/(L*E*A): 9000*1*2/(3*2e7) = 0.3 mm; -0.15 mm reversed; 0.15 mm at half load
    check("station", "C", "displacement", -0.15e-3, "reverse", 0.3e-3, "load")
    walls = env.entry("station", "A", "displacement")
    assert (walls.min, walls.max, walls.min_case, walls.max_case) == (0.0, 0.0, "load", "load")


def test_envelope_finds_a_peak_inside_a_taper():
    # A round taper from 40 mm to 10 mm over 1 m, fixed at the wide end, under -30 kN/m:
    # N(s) = q*(L - s) and the stress peaks inside, where the diameter is twice the narrow
    # end's (s = 2L/3), at -10^8/pi Pa (Gere and Goodno, Mechanics of Materials, sec. 2.3,
    # nonuniform bars: d/ds[(L - s)/d(s)^2] = 0 gives d = 2*d_narrow).  With a pull of 30 kN
    # at the tip, N(s) = 30 kN * s/L and the stress N/A grows toward the tip: 30 kN over
    # (pi/4)*(10 mm)^2 = 1.2e9/pi Pa at s = L.
    wide = Section("wide", "round", (("diameter", 0.040),))
    narrow = Section("narrow", "round", (("diameter", 0.010),))
    taper = Segment("taper", "root", "tip", steel(), wide, end_section=narrow,
                    distributed_load=-30e3)
    m = Model((Station("root", 0.0), Station("tip", 1.0)), (taper,), (Support("root"),),
              cases=(Case("own"), Case("pull", loads=(Load("tip", 30e3),))))
    env = envelope(solve(m))
    stress = env.entry("segment", "taper", "stress")
    assert stress.min == pytest.approx(-1e8 / math.pi, rel=1e-9) and stress.min_case == "own"
    assert stress.min_at == pytest.approx(2 / 3, rel=1e-9)
    assert stress.max == pytest.approx(1.2e9 / math.pi, rel=1e-9) and stress.max_case == "pull"
    assert stress.max_at == pytest.approx(1.0, rel=1e-12)
    force = env.entry("segment", "taper", "axial_force")
    assert (force.min, force.min_case, force.min_at) == (pytest.approx(-30e3, rel=1e-9), "own", 0.0)
    assert (force.max, force.max_case) == (pytest.approx(30e3, rel=1e-9), "pull")


def test_envelope_of_a_gap_by_hand():
    # A rod fixed at one end (E*A = 2e7 N, L = 1 m) with a stop 0.1 mm beyond its tip:
    # free tip travel P*L/(E*A) = 0.05 mm at 1 kN (open, 0.05 mm left), 0.25 mm at 5 kN
    # (closed: the rod takes E*A*c/L = 2 kN, the stop the other 3 kN), -0.05 mm at -1 kN
    # (0.15 mm left) (Gere and Goodno, sec. 2.4, a bar with a gap at its end).
    m = Model((Station("wall", 0.0), Station("tip", 1.0)),
              (Segment("rod", "wall", "tip", steel(E=E), area("s", A)),), (Support("wall"),),
              gaps=(Gap("stop", ("tip",), 1e-4, side="+x"),),
              cases=(Case("small", loads=(Load("tip", 1e3),)),
                     Case("large", loads=(Load("tip", 5e3),)),
                     Case("back", loads=(Load("tip", -1e3),))))
    env = envelope(solve(m))
    force = env.entry("gap", "stop", "force")
    assert force.min == pytest.approx(-3e3, rel=1e-9) and force.min_case == "large"
    assert force.max == 0.0 and force.max_case == "small"          # the first of the ties
    opening = env.entry("gap", "stop", "opening")
    assert opening.min == pytest.approx(0.0, abs=1e-15) and opening.min_case == "large"
    assert opening.max == pytest.approx(0.15e-3, rel=1e-9) and opening.max_case == "back"
    rod = env.entry("segment", "rod", "axial_force")
    assert (rod.min, rod.max) == (pytest.approx(-1e3, rel=1e-9), pytest.approx(2e3, rel=1e-9))
    assert [e.quantity for e in env.gaps] == ["force", "opening"]
    assert env.gaps[0].kind == "contact"


def test_an_inaccurate_case_is_left_out_and_named():
    sol = solve(between_walls())
    bad = dataclasses.replace(sol["heat"], status="inaccurate", message="test")
    env = envelope(Solution(sol.model, tuple(bad if c.name == "heat" else c for c in sol.cases)))
    assert env.excluded == ("heat",) and "heat" not in env.cases
    assert env.entry("segment", "AC", "axial_force").min_case == "load/2+heat"
    none = envelope(Solution(sol.model, (bad,)))
    assert none.cases == () and none.entries == ()


def test_unknown_entry_is_a_located_error():
    from axialfe import ModelError

    env = envelope(solve(between_walls()))
    with pytest.raises(ModelError) as err:
        env.entry("segment", "AC2", "stress")
    assert str(err.value) == "envelope: no envelope of stress for segment 'AC2'; did you mean 'AC'?"


def test_stations_are_in_order_of_x():
    m = Model((Station("far", 2.0), Station("near", 0.0), Station("mid", 1.0)),
              (Segment("a", "near", "mid", steel(), area("s", A)),
               Segment("b", "mid", "far", steel(), area("s", A))),
              (Support("near"),), (Load("far", 1e3),))
    assert [e.name for e in envelope(solve(m)).stations] == ["near", "mid", "far"]


STRUT = os.path.join(EXAMPLES, "strut-load-cases.toml")


def test_solve_json_carries_the_envelope(cli):
    res = cli("solve", STRUT, "-f", "json")
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    env = data["envelope"]
    assert set(env) == {"cases", "excluded", "stations", "segments", "reactions", "gaps"}
    assert env["cases"] == [c["name"] for c in data["cases"]]
    for group in ("stations", "segments", "reactions"):
        for e in env[group]:
            assert {"min", "max", "min_case", "max_case", "quantity", "unit"} <= set(e)
    # each envelope value is the least/largest over the cases' own JSON values
    cases = {c["name"]: c for c in data["cases"]}
    floor = next(e for e in env["reactions"] if e["at"] == "floor")
    values = {n: next(r["force"] for r in c["reactions"] if r["at"] == "floor")
              for n, c in cases.items()}
    assert floor["max"] == max(values.values()) and values[floor["max_case"]] == floor["max"]
    assert floor["min"] == min(values.values()) and values[floor["min_case"]] == floor["min"]
    assert floor["unit"] == "kN" and floor["kind"] == "fixed"


def test_solve_table_summary_and_full_envelope(cli):
    out = cli("solve", STRUT).stdout
    assert (" envelope over 5 cases (least and largest with their case; --envelope lists every "
            "item)") in out
    lines = out.splitlines()
    head = lines.index(next(x for x in lines if x.startswith(" envelope over")))
    assert lines[head + 1].split() == ["quantity", "min", "case", "at", "max", "case", "at"]
    assert lines[head + 3].split() == ["displacement", "[mm]", "-0.965689", "dead+snow", "bracket",
                                       "1.21591", "hot-day", "bracket"]
    full = cli("solve", STRUT, "--envelope").stdout
    assert "== envelope over 5 cases (least and largest, with the case that gives each) ==" in full
    assert " segments (along the whole segment, its inside included)" in full
    # one case: no summary unless asked for
    single = os.path.join(EXAMPLES, "stepped-rod-between-walls.toml")
    assert "envelope over" not in cli("solve", single).stdout
    assert "== envelope over 1 case" in cli("solve", single, "--envelope").stdout


def test_solve_csv_envelope_rows(cli):
    res = cli("solve", STRUT, "-f", "csv")
    rows = [r for r in csv.reader(io.StringIO(res.stdout)) if r[0] == "envelope"]
    by = {(r[1], r[2], r[3], r[4]): (r[5], r[6]) for r in rows}
    data = json.loads(cli("solve", STRUT, "-f", "json").stdout)["envelope"]
    floor = next(e for e in data["reactions"] if e["at"] == "floor")
    assert by[("reaction", "floor", "force", "max")] == (repr(floor["max"]), "kN")
    assert by[("reaction", "floor", "force", "max_case")] == (floor["max_case"], "")
    assert ("segment", "upper-tube", "stress", "min") in by
    single = os.path.join(EXAMPLES, "stepped-rod-between-walls.toml")
    assert ",envelope," not in cli("solve", single, "-f", "csv").stdout
    assert "envelope,station," in cli("solve", single, "-f", "csv", "--envelope").stdout


def test_markdown_envelope(cli):
    md = cli("solve", STRUT, "-f", "markdown").stdout
    assert "## Envelope over 5 cases (least and largest, with the case that gives each)" in md
