"""Notes where a result leaves the assumptions of a linear-elastic solve of straight bars."""

from __future__ import annotations

import json
import math
import os

import pytest

from axialfe import Case, Gap, Load, Material, Model, Section, Segment, Station, Support, solve
from axialfe.checks.assumptions import NOT_ELASTIC, assumption_notes
from axialfe.checks.entries import note_text
from axialfe.units import OutputUnits

from conftest import EXAMPLES, area

SI = OutputUnits()


def shown(solution):
    return {name: [note_text(n, SI) for n in notes]
            for name, notes in assumption_notes(solution).items()}


def test_yield_note_and_the_compressive_yield_strength():
    # Between walls, sigma = -E*alpha*dT (Gere and Goodno, Mechanics of Materials, sec. 2.5):
    # 200 GPa * 12e-6 /K * 150 K = 360 MPa in compression.  A material that gives a
    # compressive yield strength of 400 MPa is not beyond it; one of 240 MPa in both is.
    hot = (("all", 150.0),)
    cases = (Case("hot", temperature_change=hot), Case("cold", temperature_change=(("all", -150.0),)))

    def model(material):
        return Model((Station("a", 0.0), Station("b", 1.0)),
                     (Segment("bar", "a", "b", material, area("s", 1e-4)),),
                     (Support("a"), Support("b")), cases=cases)

    plain = shown(solve(model(Material("m", 200e9, 12e-6, yield_strength=240e6))))
    assert plain["hot"] == [f"segment 'bar' reaches -360 MPa (at x = 0 mm), beyond its yield "
                            f"strength 240 MPa: {NOT_ELASTIC}"]
    assert plain["cold"] == [f"segment 'bar' reaches 360 MPa (at x = 0 mm), beyond its yield "
                             f"strength 240 MPa: {NOT_ELASTIC}"]
    strong = shown(solve(model(Material("m", 200e9, 12e-6, yield_strength=240e6,
                                        compressive_yield_strength=400e6))))
    assert strong["hot"] == [] and len(strong["cold"]) == 1
    assert NOT_ELASTIC == "linear-elastic results are not valid beyond first yield"


def test_buckling_note_uses_the_checks_capacity():
    # A pinned-pinned 20 mm steel rod, 1 m long: K*L/r = 200, above Johnson's tangency, so the
    # capacity is Euler's load pi^2*E*I/L^2 = 15.50 kN (Timoshenko and Gere, Theory of Elastic
    # Stability, sec. 2.2; Shigley, Mechanical Engineering Design, 9th ed., sec. 4-12).
    rod = Section("d20", "round", (("diameter", 0.020),))
    steel = Material("steel", 200e9, 12e-6, yield_strength=250e6)
    p_cr = math.pi ** 2 * 200e9 * (math.pi * 0.020 ** 4 / 64)
    assert p_cr == pytest.approx(15503.1, rel=1e-5)
    m = Model((Station("a", 0.0), Station("b", 1.0, braced=True)),
              (Segment("strut", "a", "b", steel, rod),), (Support("a"),),
              cases=(Case("light", loads=(Load("b", -15e3),)), Case("heavy", loads=(Load("b", -20e3),))))
    notes = shown(solve(m))
    assert notes["light"] == []
    assert notes["heavy"] == ["segment 'strut' carries a compression of 20000 N, beyond its buckling "
                              "capacity 15500 N (column curve johnson over its braced run, no safety "
                              "factor): the member would buckle, which a solve of straight bars does "
                              "not follow"]


def test_crushing_note_of_a_closed_contact():
    # A rod fixed at one end (E*A = 2e7 N, 100 mm^2, L = 1 m) against a stop 0.1 mm beyond its
    # tip, pushed by 5 kN: the rod takes E*A*c/L = 2 kN (20 MPa), the stop 3 kN, which over the
    # rod's end area of 100 mm^2 bears at 30 MPa: beyond a yield strength of 25 MPa, while the
    # rod's own 20 MPa is not (Gere and Goodno, sec. 2.4, a bar with a gap).
    soft = Material("soft", 200e9, 0.0, yield_strength=25e6)
    m = Model((Station("wall", 0.0), Station("tip", 1.0)),
              (Segment("rod", "wall", "tip", soft, area("s", 1e-4)),), (Support("wall"),),
              gaps=(Gap("stop", ("tip",), 1e-4, side="+x"),),
              cases=(Case("small", loads=(Load("tip", 1e3),)), Case("large", loads=(Load("tip", 5e3),))))
    notes = shown(solve(m))
    assert notes["small"] == []
    assert notes["large"] == ["gap 'stop' is closed with 3000 N: over the end area of the part at "
                              "'tip' that is a contact stress of 30 MPa, beyond the yield strength "
                              "of 'rod' (25 MPa): the contact would crush it, which a linear-elastic "
                              "solve does not follow"]


def bolt_and_sleeve(pulls):
    # The joint constant C = k_b/(k_b + k_m): bolt force F_i + C*P, clamped parts
    # -F_i + (1 - C)*P (Shigley, Mechanical Engineering Design, 9th ed., sec. 8-7, from memory
    # of the section).  Equal areas, steel 200 GPa and aluminium 70 GPa: 1 - C = 70/270, so a
    # bonded sleeve goes into tension once P > 20 kN * 270/70 = 77.1 kN.
    steel, alu = Material("steel", 200e9), Material("alu", 70e9)
    a = area("a", 1e-4)
    return Model((Station("head", 0.0), Station("nut", 0.05)),
                 (Segment("bolt", "head", "nut", steel, a, preload=20e3),
                  Segment("sleeve", "head", "nut", alu, a)), (Support("head"),),
                 cases=tuple(Case(f"P={p:g}", loads=(Load("nut", p),)) for p in pulls))


def test_clamped_note_for_a_bonded_sleeve():
    sol = solve(bolt_and_sleeve([50e3, 100e3]))
    assert sol["P=100000"].force("sleeve")[0] == pytest.approx(-20e3 + 100e3 * 70 / 270, rel=1e-9)
    notes = shown(sol)
    assert notes["P=50000"] == []
    tension = -20e3 + 100e3 * 70 / 270
    assert notes["P=100000"] == [
        f"segment 'sleeve' carries a tension of {tension:.4g} N although the preload of 'bolt' "
        "clamps it, and no contact gap lets its stations 'head' and 'nut' part: likely an "
        "unmodelled clamped interface (a real one would open); model the interface as a contact "
        "gap of zero clearance"]


def test_the_examples_modelled_right_get_no_clamped_note():
    from axialfe.io.modelfile import read_model

    sol = solve(read_model(os.path.join(EXAMPLES, "bolt-and-sleeve-heated.toml")))
    assert all(not notes for notes in assumption_notes(sol).values())


def test_notes_reach_json_and_the_table(cli, tmp_path):
    path = tmp_path / "hot.toml"
    path.write_text("""title = "hot bar"
[materials.m]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
yield_strength = "240 MPa"
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
temperature_change = "150 K"
[[supports]]
at = "a"
[[supports]]
at = "b"
""", encoding="utf-8")
    note = f"segment 'a-b' reaches -360 MPa (at x = 0 mm), beyond its yield strength 240 MPa: {NOT_ELASTIC}"
    data = json.loads(cli("solve", path, "-f", "json").stdout)
    assert data["cases"][0]["notes"] == [note]
    table = cli("solve", path, "--stress-unit", "ksi").stdout
    assert ("\n notes:\n   1. segment 'a-b' reaches -52.21 ksi (at x = 0 mm), beyond its yield "
            "strength 34.81 ksi:\n      linear-elastic results are not valid beyond first yield\n"
            ) in table
    md = cli("solve", path, "-f", "markdown").stdout
    assert f"- Note: {note}" in md
