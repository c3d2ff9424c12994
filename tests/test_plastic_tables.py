"""Elastic-plastic paths over tables against temperature: events by root-finding, residual stress.

The references: a bar fixed between rigid walls and heated carries
sigma = -E*eps_th until it yields (Gere & Goodno, Mechanics of Materials,
sec. 2.5, thermal effects, sigma = E*alpha*dT, from memory); with properties
against temperature the same equilibrium and compatibility give
E(T)*(eps_th(T) + eps_p) = -sigma at each temperature, which the tests solve
on their own with scipy's brentq on the tables interpolated here by numpy,
not by the tool (common practice for temperature-dependent properties).
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings, strategies as st
from scipy.optimize import brentq

from axialfe import Load, Model, ModelError, Segment, Station, Support
from axialfe.model import Case, Material, PropertyTable
from axialfe.plastic import collapse
from axialfe.tracking.plastic import parse_path, track_path

from conftest import area, assert_close, examples

C = 273.15
T0 = 20 + C                                     # the model's and the tables' reference
TEMPS = np.array([20.0, 200.0, 400.0]) + C
E_TAB = np.array([203e9, 191e9, 178e9])
FY_TEMPS, FY_TAB = np.array([20.0, 400.0]) + C, np.array([250e6, 180e6])
ALPHA_TAB = np.array([11.5e-6, 12.2e-6, 13.0e-6])   # mean coefficients from 20 degC
A = 1e-4


def E_of(T):
    return float(np.interp(T, TEMPS, E_TAB))


def fy_of(T):
    return float(np.interp(T, FY_TEMPS, FY_TAB))


def strain_of(T):
    """The free strain from 20 degC: the mean coefficient at T times (T - 20 degC)."""
    return float(np.interp(T, TEMPS, ALPHA_TAB)) * (T - T0)


def hot_steel(name="hot"):
    return Material(name, E_TAB[0], 0.0, FY_TAB[0], behaviour="elastic-plastic",
                    modulus_table=PropertyTable(TEMPS, E_TAB),
                    yield_table=PropertyTable(FY_TEMPS, FY_TAB),
                    expansion_table=PropertyTable(TEMPS, ALPHA_TAB, reference=T0),
                    expansion_kind="mean")


def restrained(mat=None, **kw):
    mat = mat or hot_steel()
    return Model([Station("a", 0.0), Station("b", 1.0)],
                 [Segment("bar", "a", "b", mat, area("r", A))],
                 [Support("a"), Support("b")], reference_temperature=T0, **kw)


def run(model, text, case=None, cycles=None, cycle_from=None):
    legs, groups = parse_path(text, cycles, cycle_from)
    return track_path(model, legs, case, groups)


def events(result):
    return [(e.leg, e.name, e.event) for e in result.events]


def first_yield():
    """The temperature at which E(T)*eps_th(T) = f_y(T), by brentq on the tables here."""
    return brentq(lambda T: E_of(T) * strain_of(T) - fy_of(T), T0 + 1.0, 400 + C, xtol=1e-13)


def test_heated_restrained_bar_first_yields_at_the_root_of_E_eps_th_equal_f_y():
    T_y = first_yield()
    assert 100 + C < T_y < 200 + C          # inside the first interval of the modulus table
    result = run(restrained(), "temperature 20 degC..300 degC")
    assert events(result) == [(1, "bar", "yields")]
    assert_close(result.events[0].value + C, T_y, rel=1e-11)
    end = result.states[0]
    T = 300 + C
    assert_close(end.result.stress[0, 0], -fy_of(T), rel=1e-10)
    # eps = 0 = eps_th + sigma/E + eps_p at 300 degC
    assert_close(end.plastic_strain[0], -(strain_of(T) - fy_of(T) / E_of(T)), rel=1e-9)


def test_heated_past_yield_and_cooled_back_keeps_the_residual_stress_of_the_tables():
    # heated to 180 degC, then cooled to 20 degC: the plastic strain of 180 degC stays and
    # the bar unloads elastically with E(20 degC): sigma_res = -E(20)*eps_p
    Tm = 180 + C
    eps_p = -(strain_of(Tm) - fy_of(Tm) / E_of(Tm))
    result = run(restrained(), "temperature 20 degC..180 degC; temperature 180 degC..20 degC")
    assert events(result) == [(1, "bar", "yields"), (2, "bar", "unloads")]
    assert result.events[1].value == 180.0
    assert_close(result.states[1].result.stress[0, 0], -E_of(T0) * eps_p, rel=1e-9)
    assert -E_of(T0) * eps_p < fy_of(T0)     # so no yield on the way back
    assert_close(result.states[1].plastic_strain[0], eps_p, rel=1e-9)


def test_heated_to_300_degC_the_bar_yields_again_in_tension_on_cooling():
    # the residual tension of 300 degC, -E(T)*(eps_th(T) + eps_p), reaches f_y(T) on the way
    # down: the root of that equation, found here by brentq
    Tm = 300 + C
    eps_p = -(strain_of(Tm) - fy_of(Tm) / E_of(Tm))
    T_r = brentq(lambda T: -E_of(T) * (strain_of(T) + eps_p) - fy_of(T), T0, Tm - 1.0,
                 xtol=1e-13)
    result = run(restrained(), "temperature 20 degC..300 degC; temperature 300 degC..20 degC")
    assert events(result) == [(1, "bar", "yields"), (2, "bar", "unloads"), (2, "bar", "yields")]
    assert_close(result.events[2].value + C, T_r, rel=1e-11)
    final = result.states[1]
    assert_close(final.result.stress[0, 0], fy_of(T0), rel=1e-10)
    # sigma = E(20 degC)*(0 - eps_th(20 degC) - eps_p) with eps_th(20 degC) = 0
    assert_close(final.plastic_strain[0], -fy_of(T0) / E_of(T0), rel=1e-9)


def test_a_yield_strength_rising_faster_than_the_force_unloads_the_bar_while_heating():
    # f_y falls from 250 MPa to 100 MPa at 200 degC and rises to 580 MPa at 400 degC.  A bar
    # that yields in compression on the way up keeps sigma = -f_y(T), so its plastic strain
    # is eps_p(T) = f_y(T)/E(T) - eps_th(T) (eps = 0 between the walls); past 200 degC f_y
    # rises, and from about 330 degC faster than the restrained stress: eps_p reaches its
    # least value inside the table's interval and the bar
    # unloads while the temperature still rises: at the root of d eps_p/dT = 0.  Between
    # 200 and 400 degC, f_y, E and alpha_m are linear in T (slopes b, e, g), so by hand
    # d eps_p/dT = b/E - f_y*e/E^2 - g*(T - T0) - alpha_m, solved here by brentq
    fy_t, fy_v = np.array([20.0, 200.0, 400.0]) + C, np.array([250e6, 100e6, 580e6])
    mat = Material("dip", E_TAB[0], 0.0, fy_v[0], behaviour="elastic-plastic",
                   modulus_table=PropertyTable(TEMPS, E_TAB),
                   yield_table=PropertyTable(fy_t, fy_v),
                   expansion_table=PropertyTable(TEMPS, ALPHA_TAB, reference=T0),
                   expansion_kind="mean")
    b, e, g = 480e6 / 200, -13e9 / 200, 0.8e-6 / 200

    def eps_p(T):
        return float(np.interp(T, fy_t, fy_v)) / E_of(T) - strain_of(T)

    def rate(T):
        fy, E = float(np.interp(T, fy_t, fy_v)), E_of(T)
        return b / E - fy * e / E ** 2 - g * (T - T0) - float(np.interp(T, TEMPS, ALPHA_TAB))

    T_u = brentq(rate, 250 + C, 380 + C, xtol=1e-12)
    result = run(restrained(mat), "temperature 20 degC..380 degC")
    assert [e.event for e in result.events] == ["yields", "unloads"]
    assert_close(result.events[1].value + C, T_u, rel=1e-9)
    # beyond it the bar is elastic, with the plastic strain of the release
    assert_close(result.states[0].plastic_strain[0], eps_p(T_u), rel=1e-8)


def test_a_brief_yield_between_two_samples_of_a_table_interval_is_found():
    # E falls linearly from 200 GPa at 20 degC to 20 GPa at 400 degC (one table interval),
    # alpha = 12e-6 /K: restrained, |sigma| = alpha*(E0*x + E'*x^2) with x = T - 20 degC
    # peaks at x = -E0/(2E') = 211 K at 253.3 MPa.  With f_y = 253 MPa the bar yields on a
    # band of about 15 K, between two of the samples the path takes of that interval: the
    # first root of the quadratic alpha*(E0*x + E'*x^2) = f_y (by hand), then, holding
    # sigma = -f_y, eps_p = f_y/E - alpha*x, whose rate is zero where E^2 = f_y*|E'|/alpha
    # (by hand): there it unloads, still heating
    from axialfe.tracking.plastictables import SAMPLES

    E0, slope, alpha, fy = 200e9, -180e9 / 380.0, 12e-6, 253e6
    mat = Material("soft", E0, alpha, fy, behaviour="elastic-plastic",
                   modulus_table=PropertyTable((T0, 400 + C), (E0, 20e9)))
    x_y = (-E0 + np.sqrt(E0 ** 2 + 4 * slope * fy / alpha)) / (2 * slope)
    x_u = (np.sqrt(fy * -slope / alpha) - E0) / slope
    samples = np.linspace(0.0, 380.0, SAMPLES + 1)
    assert not np.any((samples > x_y) & (samples < x_u))     # no sample in the band
    result = run(restrained(mat), "temperature 20 degC..400 degC")
    assert events(result) == [(1, "bar", "yields"), (1, "bar", "unloads")]
    assert_close([e.value - 20.0 for e in result.events], [x_y, x_u], rel=1e-9)
    assert_close(result.states[0].plastic_strain[0], fy / (E0 + slope * x_u) - alpha * x_u,
                 rel=1e-8)


def test_a_rod_heated_against_a_stop_over_tables_closes_yields_and_opens_by_hand():
    # a rod 1 m long fixed at one end, 0.6 mm short of a stop; alpha = 12e-6 /K constant,
    # E = 200 GPa to 200 degC then falling to 170 GPa at 400 degC, f_y from 240 MPa at
    # 0 degC to 160 MPa at 400 degC (linear).  By hand: the stop closes at dT = 50 K; then
    # sigma = -E*alpha*(dT - 50 K) reaches f_y(20 degC + dT) where 2.4*(dT - 50) =
    # 236 - 0.2*dT (MPa), dT = 356/2.6 K; at 220 degC, E = 197 GPa and f_y = 196 MPa, so
    # eps_p = 0.6e-3 - alpha*200 K + 196/197000; cooled, the stop opens where the rod is
    # free again: alpha*dT = 0.6e-3 - eps_p
    from axialfe import Gap

    C0 = C
    mat = Material("rod", 200e9, 0.0, 240e6, behaviour="elastic-plastic",
                   modulus_table=PropertyTable((C0, 200 + C0, 400 + C0), (200e9, 200e9, 170e9)),
                   yield_table=PropertyTable((C0, 400 + C0), (240e6, 160e6)),
                   expansion_table=PropertyTable((C0, 400 + C0), (12e-6, 12e-6), reference=T0),
                   expansion_kind="mean")
    model = Model([Station("base", 0.0), Station("end", 1.0)],
                  [Segment("rod", "base", "end", mat, area("r", 1e-4))], [Support("base")],
                  gaps=(Gap("stop", ("end",), side="+x", clearance=0.6e-3),),
                  reference_temperature=T0)
    result = run(model, "temperature-change 0 K..200 K; temperature-change 200 K..0 K")
    assert events(result) == [(1, "stop", "closes"), (1, "rod", "yields"), (2, "rod", "unloads"),
                              (2, "stop", "opens")]
    eps_p = 0.6e-3 - 12e-6 * 200 + 196e6 / 197e9
    assert_close([e.value for e in result.events],
                 [50.0, 356 / 2.6, 200.0, (0.6e-3 - eps_p) / 12e-6], rel=1e-10)
    assert_close(result.states[0].result.stress[0, 0], -196e6, rel=1e-10)
    assert_close(result.states[1].plastic_strain[0], eps_p, rel=1e-9)
    # back at the reference the rod is short by its plastic elongation: the stop stands
    # 0.6 mm - eps_p*L away
    assert_close(result.states[1].result.gap_opening[0], 0.6e-3 - eps_p * 1.0, rel=1e-9)


@pytest.mark.parametrize("top, outcome", [(180.0, "shakedown"), (300.0, "alternating")])
def test_thermal_cycling_over_tables_shakes_down_or_alternates(top, outcome):
    # 180 degC: the residual tension on cooling stays below f_y(T) (test above), so the
    # cycles after the first are elastic; 300 degC: the bar yields both ways every cycle
    result = run(restrained(), f"temperature 20 degC..{top} degC; "
                 f"temperature {top} degC..20 degC", cycles=3)
    assert result.cycles == {"count": 3, "outcome": outcome, "decided_at": 2}


def test_modulus_at_the_reference_temperature_is_said_and_used():
    model = restrained(modulus_at="reference")
    result = run(model, "temperature 20 degC..300 degC")
    T_y = brentq(lambda T: E_of(T0) * strain_of(T) - fy_of(T), T0 + 1.0, 400 + C, xtol=1e-13)
    assert_close(result.events[0].value + C, T_y, rel=1e-11)
    assert any("E at the reference temperature 20 degC" in n for n in result.notes)


def test_the_collapse_of_a_path_over_tables_is_the_limit_load_at_that_temperature():
    # fixed bar with an interior load, both parts at 300 degC: the path heats, then loads to
    # collapse; the static theorem (Gere & Goodno, sec. 2.12, from memory) gives
    # P_P = f_y(300 degC)*(A1 + A2) whatever the thermal stresses
    mat = hot_steel()
    model = Model([Station("A", 0.0), Station("C", 0.4), Station("B", 1.0)],
                  [Segment("AC", "A", "C", mat, area("s1", 3e-4)),
                   Segment("CB", "C", "B", mat, area("s2", 1e-4))],
                  [Support("A"), Support("B")],
                  cases=[Case("hot", loads=(Load("C", 1e3),), temperature_change=(("all", 280.0),))],
                  reference_temperature=T0)
    limit = collapse(model, check_buckling=False).load_factor
    assert_close(limit * 1e3, fy_of(300 + C) * 4e-4)
    result = run(model, "temperature-factor 0..1; load 0..100")
    assert result.collapsed_on == 2
    assert_close(result.events[-1].value, limit, rel=1e-9)


def test_a_temperature_outside_a_table_on_a_path_names_the_leg_and_the_material():
    with pytest.raises(ModelError) as err:
        run(restrained(), "temperature 20 degC..300 degC; temperature 300 degC..450 degC")
    assert str(err.value) == (
        "materials.hot: mean_thermal_expansion: the table covers 20 degC to 400 degC, but "
        "segment 'bar' is at 450 degC on leg 2 of the path (case 'base'): extend the table or "
        "check the temperature")


# --- constant tables give the constant path (hypothesis) -----------------------------------
@st.composite
def heated_series_parallel(draw):
    stages = draw(st.integers(1, 3))
    stations = [Station(f"s{i}", float(i)) for i in range(stages + 1)]
    pairs = []
    for i in range(stages):
        for j in range(draw(st.integers(1, 2))):
            E = draw(st.sampled_from([70e9, 200e9]))
            alpha = draw(st.sampled_from([11e-6, 23e-6]))
            fy = draw(st.sampled_from([200e6, 240e6, 355e6]))
            H = draw(st.sampled_from([0.0, 0.0, 2e9]))
            plain = Material(f"m{i}{j}", E, alpha, fy, behaviour="elastic-plastic",
                             hardening_modulus=H)
            temps = (T0 - 50.0, T0 + 150.0, T0 + 400.0)
            tabled = Material(f"m{i}{j}", E, 0.0, fy, behaviour="elastic-plastic",
                              hardening_modulus=H,
                              modulus_table=PropertyTable(temps, (E,) * 3),
                              yield_table=PropertyTable(temps, (fy,) * 3),
                              expansion_table=PropertyTable(temps, (alpha,) * 3, reference=T0),
                              expansion_kind="mean")
            a = draw(st.sampled_from([1e-4, 2e-4]))
            pairs.append(((f"e{i}{j}", f"s{i}", f"s{i + 1}"), plain, tabled, a))
    loads = (Load(f"s{draw(st.integers(1, stages))}", draw(st.sampled_from([-8e3, 5e3]))),)
    dT = draw(st.sampled_from([120.0, 250.0]))
    lam = draw(st.sampled_from([1.0, 3.0]))

    def build(k):
        return Model(stations, [Segment(*ends, m[k], area(f"a{n}", a))
                                for n, (ends, *m, a) in enumerate(pairs)],
                     [Support("s0"), Support(f"s{stages}")], loads, reference_temperature=T0)

    return build(0), build(1), dT, lam


@settings(max_examples=examples(8))
@given(heated_series_parallel())
def test_constant_valued_tables_give_the_constant_property_path(case):
    plain, tabled, dT, lam = case
    text = (f"temperature-change 0 K..{dT} K; load 0..{lam}; temperature-change {dT} K..0 K; "
            f"load {lam}..0")
    a, b = run(plain, text), run(tabled, text)
    assert events(a) == events(b)
    assert_close([e.value for e in b.events], [e.value for e in a.events], rel=1e-9, abs_=1e-9)
    for sa, sb in zip(a.states, b.states):
        scale = max(np.abs(sa.result.axial_force).max(), 1.0)
        assert_close(sb.result.axial_force, sa.result.axial_force, rel=1e-9, abs_=1e-9 * scale)
        assert_close(sb.plastic_strain, sa.plastic_strain, rel=1e-8, abs_=1e-12)


# --- the command and the example ----------------------------------------------------------
def test_the_hot_housing_example_loses_the_clamp_of_its_hand_solution(cli, tmp_path):
    # The hand solution in the example's comments, from the built-in table entries at
    # 300 degF and 400 degF (ASME B31.3 Table C-6 and C-1, Section II Part D TE-2 and Y-1,
    # from memory): 150 degC = 302 degF lies 2 % of the way between them.
    import json

    from conftest import EXAMPLES

    psi, f = 6894.757293168, 0.02
    E_b = (28.3e6 + f * (27.7e6 - 28.3e6)) * psi
    E_h = (9.2e6 + f * (8.7e6 - 9.2e6)) * psi
    eps_b = (1.517 + f * (2.250 - 1.517)) * 1e-3
    eps_h = (23.8e-6 + f * (24.1e-6 - 23.8e-6)) * (150.0 - (70 - 32) / 1.8)
    fy = (31.0 + f * (30.0 - 31.0)) * psi * 1e3
    L, A_b, A_h, delta = 0.06, 84.3e-6, 300e-6, 0.05e-3
    p = delta + L * (eps_h - eps_b) - fy * A_b * (L / (E_b * A_b) + L / (E_h * A_h))
    F_res = (delta - p) / (L / (29.5e6 * psi * A_b) + L / (10.0e6 * psi * A_h))
    plot = tmp_path / "path.png"
    out = cli("path", f"{EXAMPLES}/bolt-hot-housing-path.toml", "--case", "hot", "--path",
              "temperature 70 degF..302 degF; temperature 302 degF..70 degF", "--format",
              "json", "--force-unit", "N", "--plot", plot)
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    assert [(e["leg"], e["name"], e["event"]) for e in data["events"]] == [
        (1, "bolt", "yields"), (2, "bolt", "unloads")]
    hot, cold = data["states"]
    assert hot["segments"][0]["axial_force"][0] == pytest.approx(fy * A_b, rel=1e-10)
    assert hot["segments"][0]["plastic_strain"] == pytest.approx(p / L, rel=1e-9)
    assert cold["segments"][0]["axial_force"][0] == pytest.approx(F_res, rel=1e-9)
    assert any("f_y at each segment's temperature" in n for n in data["notes"])
    assert plot.stat().st_size > 0
    table = cli("path", f"{EXAMPLES}/bolt-hot-housing-path.toml", "--case", "hot", "--path",
                "temperature 70 degF..302 degF; temperature 302 degF..70 degF")
    assert table.exit_code == 0
    shown = " ".join(table.stdout.split())   # the notes wrap to the terminal's width
    assert "f_y at each segment's temperature" in shown
    assert "bracketed root-finding between the table entries" in shown


def test_the_first_yield_of_the_example_bolt_is_the_root_of_its_clamp_equation(cli):
    # F(T) = f_y(T)*A_b with every property interpolated linearly in the built-in tables
    # (entries in degF, as above), solved here by brentq
    import json

    from conftest import EXAMPLES

    psi = 6894.757293168
    tF = np.array([70.0, 200.0, 300.0, 400.0])
    E_b = np.array([29.5, 28.8, 28.3, 27.7]) * 1e6 * psi
    eb = np.array([0.0, 0.825, 1.517, 2.250]) * 1e-3
    fy_b = np.array([35.0, 31.9, 31.0, 30.0]) * 1e3 * psi
    E_h = np.array([10.0, 9.6, 9.2, 8.7]) * 1e6 * psi
    a_h = np.array([22.9, 23.2, 23.8, 24.1]) * 1e-6
    L, A_b, A_h, delta = 0.06, 84.3e-6, 300e-6, 0.05e-3

    def excess(T):     # degF
        k = L / (np.interp(T, tF, E_b) * A_b) + L / (np.interp(T, tF, E_h) * A_h)
        eps_h = np.interp(T, tF, a_h) * (T - 70.0) / 1.8
        F = (delta + L * (eps_h - np.interp(T, tF, eb))) / k
        return F - np.interp(T, tF, fy_b) * A_b

    T_y = brentq(excess, 200.0, 300.0, xtol=1e-12)
    out = cli("path", f"{EXAMPLES}/bolt-hot-housing-path.toml", "--case", "hot", "--path",
              "temperature 70 degF..302 degF", "--format", "json")
    data = json.loads(out.stdout)
    assert data["events"][0]["value"] == pytest.approx(T_y, rel=1e-11)


# --- tables that vary: against a brute-force incremental solve (hypothesis) ---------------
def incremental(spec, dT_max, steps):
    """Leg-end forces and events of heating by dT_max and cooling back, by small steps.

    The chain of ``spec`` (stages of parallel members between walls, every member with
    linear hardening, so each step's state is unique) is solved at each step by trying
    every state (elastic, or flowing at either bound) with the properties interpolated
    at that step's temperature: backward Euler on the plastic strain, which converges
    to the exact path as the steps shrink (common practice: return mapping).
    """
    from itertools import product

    stages, members = spec["stages"], spec["members"]
    m, n_free = len(members), stages - 1
    L = 1.0
    G = np.zeros((m, n_free))                       # elongation = G @ u_free
    for i, mb in enumerate(members):
        if mb["stage"] < n_free:
            G[i, mb["stage"]] += 1.0
        if mb["stage"] > 0:
            G[i, mb["stage"] - 1] -= 1.0
    p = np.zeros(m)
    flowing = np.zeros(m, dtype=int)
    combo = (0,) * m
    events, ends = [], []
    path = [(1, np.linspace(0.0, dT_max, steps + 1)[1:]),
            (2, np.linspace(dT_max, 0.0, steps + 1)[1:])]
    for leg, values in path:
        for dT in values:
            T = T0 + dT
            E = np.array([np.interp(T, TEMPS, mb["E"]) for mb in members])
            fy = np.array([np.interp(T, TEMPS, mb["fy"]) for mb in members])
            eps = np.array([np.interp(T, TEMPS, mb["alpha"]) * dT for mb in members])
            A = np.array([mb["A"] for mb in members])
            H = np.array([mb["H"] for mb in members])
            k, h, Ny = E * A / L, H * A / L, fy * A
            for trial in [combo] + list(product((0, 1, -1), repeat=m)):
                K = np.zeros((n_free + m, n_free + m))
                r = np.zeros(n_free + m)
                K[:n_free, :n_free] = G.T @ (k[:, None] * G)
                K[:n_free, n_free:] = -G.T * k
                r[:n_free] = G.T @ (k * eps * L)
                for i, s in enumerate(trial):
                    row = n_free + i
                    if s == 0:
                        K[row, n_free + i], r[row] = 1.0, p[i]
                    else:          # k*(G u - eps*L - p) - h*p = s*Ny
                        K[row, :n_free] = k[i] * G[i]
                        K[row, n_free + i] = -k[i] - h[i]
                        r[row] = s * Ny[i] + k[i] * eps[i] * L
                x = np.linalg.solve(K, r)
                pn = x[n_free:]
                N = k * (G @ x[:n_free] - eps * L - pn)
                ok = (np.all(np.abs(N - h * pn) <= Ny * (1 + 1e-12))
                      and all(s == 0 or s * (pn[i] - p[i]) > 0 for i, s in enumerate(trial)))
                if ok:
                    break
            else:
                raise AssertionError("no state found")
            combo = trial
            now = np.array(trial)
            for i in np.flatnonzero((now != 0) & (flowing == 0)):
                events.append((leg, members[i]["name"], "yields", dT))
            for i in np.flatnonzero((now == 0) & (flowing != 0)):
                events.append((leg, members[i]["name"], "unloads", dT))
            flowing, p = now, pn
        ends.append(N.copy())
    return events, ends


@st.composite
def varying_chain(draw):
    stages = draw(st.integers(1, 2))
    members = []
    for stage in range(stages):
        for j in range(draw(st.integers(1, 2))):
            E0 = draw(st.sampled_from([70e9, 200e9]))
            members.append({
                "name": f"e{stage}{j}", "stage": stage,
                "E": E0 * np.array([1.0, draw(st.sampled_from([0.95, 0.8])),
                                    draw(st.sampled_from([0.9, 0.6]))]),
                "fy": draw(st.sampled_from([200e6, 300e6])) * np.array(
                    [1.0, draw(st.sampled_from([0.9, 0.7])), draw(st.sampled_from([0.8, 0.5]))]),
                "alpha": draw(st.sampled_from([11e-6, 23e-6])) * np.array(
                    [1.0, draw(st.sampled_from([1.05, 1.2])), draw(st.sampled_from([1.1, 1.3]))]),
                "A": draw(st.sampled_from([1e-4, 2e-4])),
                "H": draw(st.sampled_from([2e9, 10e9]))})
    return {"stages": stages, "members": members}, draw(st.sampled_from([180.0, 340.0]))


def chain_model(spec):
    stations = [Station(f"s{i}", float(i)) for i in range(spec["stages"] + 1)]
    segments = []
    for mb in spec["members"]:
        mat = Material(mb["name"], mb["E"][0], 0.0, mb["fy"][0], behaviour="elastic-plastic",
                       hardening_modulus=mb["H"],
                       modulus_table=PropertyTable(TEMPS, mb["E"]),
                       yield_table=PropertyTable(TEMPS, mb["fy"]),
                       expansion_table=PropertyTable(TEMPS, mb["alpha"], reference=T0),
                       expansion_kind="mean")
        segments.append(Segment(mb["name"], f"s{mb['stage']}", f"s{mb['stage'] + 1}", mat,
                                area(f"a{mb['name']}", mb["A"])))
    return Model(stations, segments, [Support("s0"), Support(f"s{spec['stages']}")],
                 reference_temperature=T0)


@settings(max_examples=examples(4))
@given(varying_chain())
def test_paths_over_varying_tables_agree_with_a_brute_force_incremental_solve(case):
    spec, dT = case
    steps = 400
    expected, ends = incremental(spec, dT, steps)
    result = run(chain_model(spec), f"temperature-change 0 K..{dT} K; "
                 f"temperature-change {dT} K..0 K")
    got = [(e.leg, e.name, e.event) for e in result.events]
    assert sorted(got) == sorted((leg, name, ev) for leg, name, ev, _ in expected)
    # each event near the brute force's: backward Euler is first order in the step, and an
    # event late on the path carries the error of the plastic strain made before it (a few
    # steps at 400 steps a leg, shrinking with the step)
    for leg, name, ev, value in expected:
        exact = [e.value for e in result.events if (e.leg, e.name, e.event) == (leg, name, ev)]
        assert min(abs(x - value) for x in exact) <= 12 * dT / steps
    for state, forces in zip(result.states, ends):
        scale = np.abs(forces).max()
        assert_close(state.result.axial_force[:, 0], forces, rel=0.0, abs_=2e-3 * scale)


def test_a_constant_compressive_yield_strength_beside_a_table_is_said():
    import dataclasses

    mat = dataclasses.replace(hot_steel(), compressive_yield_strength=240e6)
    result = run(restrained(mat), "temperature 20 degC..300 degC")
    assert result.notes[1] == ("the compressive yield strength of 'hot' is a constant and does "
                               "not follow the yield strength's table against temperature: give "
                               "the value at the temperature of interest")
    # the bound in compression is the constant: sigma = -240 MPa at 300 degC
    assert_close(result.states[0].result.stress[0, 0], -240e6, rel=1e-10)
