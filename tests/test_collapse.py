"""Limit analysis (axialfe collapse): the static theorem as a linear programme, against closed forms."""

from __future__ import annotations

import json
import math

import pytest

from axialfe import Gap, Load, Model, ModelError, Segment, SolveError, Station, Support
from axialfe.model import CheckSettings
from axialfe.plastic import collapse

from conftest import area, assert_close, steel

FY = 250e6


def fixed_fixed(a1=3e-4, a2=1e-4, a=0.4, L=1.0, P=1000.0, **kw):
    """A bar fixed at both ends with a load P at an interior point C (parts AC and CB)."""
    mat = steel(yield_strength=FY)
    return Model([Station("A", 0.0), Station("C", a, braced=True), Station("B", L)],
                 [Segment("AC", "A", "C", mat, area("s1", a1)),
                  Segment("CB", "C", "B", mat, kw.pop("second", area("s2", a2)))],
                 [Support("A"), Support("B")], [Load("C", P)], **kw)


def test_fixed_bar_interior_load_plastic_load():
    # Gere & Goodno, Mechanics of Materials, sec. 2.12 "Elastoplastic analysis" (from
    # memory): the bar fixed at both ends collapses when both parts yield, P_P = f_y*(A1 + A2)
    result = collapse(fixed_fixed())
    assert_close(result.load_factor * 1000.0, FY * 4e-4)
    assert result.mechanism == ("AC", "CB")
    assert result.limit_sides == ("tension", "compression")
    assert_close(result.axial_force[:, 0], [FY * 3e-4, -FY * 1e-4])


def test_three_parallel_bars_share_a_rigid_load():
    # Gere & Goodno, sec. 2.12 (from memory): three bars of area A share a rigid load; P_P =
    # 3*f_y*A whatever their lengths (the middle bar shorter here)
    mat = steel(yield_strength=FY)
    A, L1, L2 = 2e-4, 1.5, 1.0
    model = Model([Station("O1", 0.0), Station("M", L1 - L2), Station("plate", L1)],
                  [Segment("left", "O1", "plate", mat, area("a", A)),
                   Segment("middle", "M", "plate", mat, area("a", A)),
                   Segment("right", "O1", "plate", mat, area("a", A))],
                  [Support("O1"), Support("M")], [Load("plate", 10e3)])
    result = collapse(model)
    assert_close(result.load_factor * 10e3, 3 * FY * A)
    assert result.mechanism == ("left", "middle", "right")


def test_compressive_yield_strength_bounds_the_compressed_part():
    mat = steel(yield_strength=FY, compressive_yield_strength=150e6)
    model = Model([Station("A", 0.0), Station("C", 0.5), Station("B", 1.0)],
                  [Segment("AC", "A", "C", mat, area("s", 1e-4)),
                   Segment("CB", "C", "B", mat, area("s", 1e-4))],
                  [Support("A"), Support("B")], [Load("C", 1.0)])
    assert_close(collapse(model).load_factor, (FY + 150e6) * 1e-4)


def test_buckling_caps_a_slender_compressed_part():
    # Euler load pi^2 E I / (K L)^2 (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed.,
    # sec. 2.1); the compressed part CB (0.6 m, I = 1e-10 m^4) buckles long before it yields
    I = 1e-10
    model = fixed_fixed(second=area("s2", 1e-4, I), checks=CheckSettings(column_curve="euler-only"))
    result = collapse(model)
    p_euler = math.pi ** 2 * 200e9 * I / 0.6 ** 2
    assert p_euler < FY * 1e-4
    assert_close(result.load_factor * 1000.0, FY * 4e-4)
    assert_close(result.buckling_capped_load_factor * 1000.0, FY * 3e-4 + p_euler, rel=1e-8)
    assert any("buckling before it yields: 'CB'" in n for n in result.notes)


def test_undecided_buckling_gives_no_cap_and_says_so():
    result = collapse(fixed_fixed())          # no second moment of area: undecided
    assert result.buckling_capped_load_factor is None
    assert ("'CB' is compressed in the mechanism and its buckling capacity is undecided (second "
            "moment of area missing): the collapse factor assumes it reaches its yield force, "
            "which the tool cannot confirm") in result.notes


def test_gaps_are_refused_pointing_to_path():
    model = fixed_fixed(gaps=(Gap("g", ("B",), side="+x", clearance=1e-4),))
    with pytest.raises(ModelError) as exc:
        collapse(model)
    assert str(exc.value) == ("gaps: limit analysis cannot follow gaps (the clearances decide "
                              "which parts carry the load): track the loading with 'axialfe "
                              "path' instead")


def test_a_load_on_a_support_never_collapses():
    model = fixed_fixed()
    model = Model(model.stations, model.segments, model.supports, [Load("A", 5.0)])
    with pytest.raises(SolveError) as exc:
        collapse(model)
    assert str(exc.value) == ("the loads of case 'base' never collapse the model: a path of "
                              "unlimited strength (a support, a spring or a segment without a "
                              "yield strength) carries them")


MODEL = """
title = "stepped bar"
[materials.s]
elastic_modulus = "200 GPa"
yield_strength = "250 MPa"
[sections.big]
shape = "area"
area = "300 mm^2"
[sections.small]
shape = "area"
area = "100 mm^2"
[stations]
A = "0 mm"
C = "400 mm"
B = "1000 mm"
[[segments]]
name = "AC"
from = "A"
to = "C"
material = "s"
section = "big"
[[segments]]
name = "CB"
from = "C"
to = "B"
material = "s"
section = "small"
[[supports]]
at = "A"
[[supports]]
at = "B"
[[loads]]
at = "C"
force = "10 kN"
"""


def test_collapse_command_json_and_table(tmp_path, cli):
    path = tmp_path / "bar.toml"
    path.write_text(MODEL, encoding="utf-8")
    out = cli("collapse", path, "--format", "json")
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    assert set(data) >= {"title", "case", "load_factor", "mechanism", "segments",
                         "buckling_capped_load_factor"}
    assert_close(data["load_factor"], 250e6 * 4e-4 / 10e3)
    assert data["mechanism"] == ["AC", "CB"]
    assert data["segments"][0]["name"] == "AC"
    table = cli("collapse", path)
    assert table.exit_code == 0
    assert "collapse load factor: 10" in table.stdout
    bad = cli("collapse", path, "--case", "wind")
    assert bad.exit_code == 2
    assert bad.stderr.strip() == "error: --case: unknown case 'wind'; expected one of: 'base'"


# --- yield strengths from tables against temperature ------------------------------------------
def _hot_bar(temperatures, fy_table=None, fy=None):
    """The fixed bar of the tests above, its parts at their own temperatures in one case.

    ``fy_table`` (temperatures, values): one material with a yield table; ``fy``: one
    constant material per part.
    """
    from axialfe.model import Case, Material, PropertyTable

    if fy_table is not None:
        mats = [Material("hot", 200e9, 12e-6, fy_table[1][0], behaviour="elastic-plastic",
                         yield_table=PropertyTable(*fy_table))] * 2
    else:
        mats = [Material(f"hot{i}", 200e9, 12e-6, f, behaviour="elastic-plastic")
                for i, f in enumerate(fy)]
    return Model([Station("A", 0.0), Station("C", 0.4), Station("B", 1.0)],
                 [Segment("AC", "A", "C", mats[0], area("s1", 3e-4)),
                  Segment("CB", "C", "B", mats[1], area("s2", 1e-4))],
                 [Support("A"), Support("B")],
                 cases=[Case("hot", loads=(Load("C", 1000.0),),
                             temperature_change=(("AC", temperatures[0]),
                                                 ("CB", temperatures[1])))],
                 reference_temperature=293.15)


def test_collapse_over_tables_takes_the_yield_strength_at_each_segments_temperature():
    # the static theorem: temperature stresses are self-equilibrated and leave the limit
    # load of perfect plasticity unchanged (Gere & Goodno, sec. 2.12, from memory; common
    # practice), so the factor over tables is that of the constants f_y(T_i), interpolated
    # here by hand: f_y = 250 MPa at 20 degC, 170 MPa at 420 degC, linear between
    table = ((293.15, 693.15), (250e6, 170e6))
    dT = (150.0, 330.0)
    fy = tuple(250e6 - 80e6 * d / 400.0 for d in dT)       # 220 MPa and 184 MPa
    tabled = collapse(_hot_bar(dT, fy_table=table))
    constant = collapse(_hot_bar(dT, fy=fy))
    assert_close(tabled.load_factor, constant.load_factor, rel=1e-12)
    assert_close(tabled.load_factor * 1000.0, fy[0] * 3e-4 + fy[1] * 1e-4)
    assert tabled.mechanism == ("AC", "CB")
    assert any("f_y at each segment's temperature" in n and "case 'hot'" in n
               for n in tabled.notes)
    assert "the temperature enters only through the yield strengths" in tabled.notes[-1]
