"""The calculation sheet's arithmetic (axialfe.review.sheet): gap compatibility, station
balance, and the thermal part of each force, against closed forms."""


import numpy as np
import pytest

from axialfe import parse_model, read_model, solve
from axialfe.review.sheet import gap_compatibility, station_balance, thermal_split
from pathlib import Path

ROOT = Path(__file__).parent.parent
EXAMPLES = sorted((ROOT / "examples").glob("*.toml"))

E, ALPHA = 200e9, 12e-6
A = 400e-6

# A steel bar 2 m long between rigid walls, loaded at its middle and heated (invented numbers).
STEEL = """
[materials.steel]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
[sections.s]
shape = "area"
area = "400 mm^2"
"""

WALLS = STEEL + """
[stations]
left = "0 m"
mid = "1 m"
right = "2 m"
[[segments]]
name = "a"
from = "left"
to = "mid"
material = "steel"
section = "s"
[[segments]]
name = "b"
from = "mid"
to = "right"
material = "steel"
section = "s"
[[supports]]
at = "left"
[[supports]]
at = "right"
[[cases]]
name = "hot"
temperature_change = "40 K"
loads = [{ at = "mid", force = "30 kN" }]
[[cases]]
name = "cold-load"
loads = [{ at = "mid", force = "30 kN" }]
"""


def test_thermal_part_of_a_bar_between_walls():
    # Between rigid walls the temperature alone gives N = -E*A*alpha*dT everywhere (Gere and
    # Goodno, Mechanics of Materials, 7th ed., sec. 2.5, example of a bar between supports);
    # a load P at the middle adds +P/2 on the near side and -P/2 beyond (statically
    # indeterminate bar, same section), so the load's part is the rest.
    sol = solve(parse_model(WALLS))
    hot, cold = thermal_split(sol)
    assert hot.separable and hot.heated and hot.changed == ()
    n_th = -E * A * ALPHA * 40
    assert n_th == pytest.approx(-38.4e3)
    np.testing.assert_allclose(hot.thermal, [[n_th, n_th], [n_th, n_th]], rtol=1e-12)
    np.testing.assert_allclose(hot.other, [[15e3, 15e3], [-15e3, -15e3]], rtol=1e-9)
    np.testing.assert_allclose(hot.thermal + hot.other, sol["hot"].axial_force, rtol=1e-12)
    assert not cold.heated and cold.separable
    np.testing.assert_array_equal(cold.thermal, 0.0)
    np.testing.assert_array_equal(cold.other, sol["cold-load"].axial_force)


GAPPED = STEEL + """
[stations]
left = "0 m"
tip = "1 m"
[[segments]]
name = "rod"
from = "left"
to = "tip"
material = "steel"
section = "s"
[[supports]]
at = "left"
[[gaps]]
name = "stop"
at = "tip"
side = "+x"
clearance = "0.2 mm"
[[cases]]
name = "pushed"
temperature_change = "5 K"
loads = [{ at = "tip", force = "40 kN" }]
[[cases]]
name = "hot"
temperature_change = "50 K"
"""


def test_a_gap_that_closes_only_under_load_makes_the_parts_inseparable():
    # Free thermal growth alpha*dT*L = 12e-6 * 5 * 1 m = 0.06 mm leaves the 0.2 mm stop open,
    # the load's 40 kN * 1 m / (200 GPa * 400 mm^2) = 0.5 mm closes it: the gap's state
    # differs, so no thermal part is given.  Heated by 50 K alone (0.6 mm) it closes and the
    # force is wholly thermal: -E*A*(alpha*dT*L - c)/L (Gere and Goodno, 7th ed., sec. 2.5,
    # bar with a gap; from memory).
    sol = solve(parse_model(GAPPED))
    pushed, hot = thermal_split(sol)
    assert not pushed.separable and pushed.changed == ("stop",)
    assert pushed.thermal is None and pushed.other is None
    assert hot.separable
    n = -E * A * (ALPHA * 50 * 1.0 - 0.2e-3) / 1.0
    np.testing.assert_allclose(hot.thermal, [[n, n]], rtol=1e-9)
    np.testing.assert_array_equal(hot.other, 0.0)


def test_gap_compatibility_and_balance_of_the_pushed_rod():
    case = solve(parse_model(GAPPED))["pushed"]
    line, = gap_compatibility(case)
    assert line.gap == "stop" and line.terms == ((1.0, "tip", pytest.approx(0.2e-3)),)
    assert line.clearance == 0.2e-3 and line.defect == 0.0
    # the rod carries F - R with R the stop's share: u = c, N = E*A*(c/L - alpha*dT)
    n = E * A * (0.2e-3 - ALPHA * 5)
    balance = {b.station: b for b in station_balance(case)}
    assert [b.station for b in station_balance(case)] == ["left", "tip"]   # in order of x
    tip = dict(balance["tip"].terms)
    assert tip["load"] == 40e3
    assert tip["segment 'rod'"] == pytest.approx(-n, rel=1e-9)
    assert tip["gap 'stop'"] == pytest.approx(-(40e3 - n), rel=1e-9)   # the stop pushes back
    assert balance["tip"].imbalance == 0.0 and balance["left"].imbalance == 0.0


def test_two_station_gaps_read_as_their_sense_says():
    # A contact between [a, b] closes when u(a) - u(b) reaches its clearance; a slack link
    # when u(b) - u(a) does (README, gaps).
    model = read_model(ROOT / "examples" / "shaft-end-float.toml")
    case = solve(model)["base"]
    lines = {g.gap: g for g in gap_compatibility(case)}
    contact = lines["end-float"]
    assert [(c, s) for c, s, _ in contact.terms] == [(1.0, "shaft-end"), (-1.0, "cover")]
    assert contact.closure == pytest.approx(contact.clearance, rel=1e-9)
    link = lines["clevis-slack"]
    assert [(c, s) for c, s, _ in link.terms] == [(-1.0, "tie-end"), (1.0, "housing")]


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.name for p in EXAMPLES])
def test_every_example_balances_and_closes_on_the_sheet(path):
    sol = solve(read_model(path))
    for case in sol.cases:
        for line in station_balance(case):
            scale = max([abs(f) for _, f in line.terms] + [1.0])
            assert abs(line.total) <= 1e-9 * scale, (case.name, line)
        for line in gap_compatibility(case):
            assert abs(line.closure - line.clearance) <= 1e-9 * max(line.clearance, 1e-6)
    for split, case in zip(thermal_split(sol), sol.cases):
        if split.separable:
            np.testing.assert_allclose(split.thermal + split.other, case.axial_force,
                                       rtol=1e-9, atol=1e-9 * max(1.0, np.abs(case.axial_force).max()))
