"""Properties against temperature: tables of E, f_y and the expansion, and the thermal strain.

The checks are hand computations with linear interpolation in the tables, and
the closed form of a bar restrained between rigid walls, sigma = -E*eps_th
(Timoshenko, Strength of Materials, Part I, thermal stresses; from memory).
"""

from __future__ import annotations

import json

import pytest

from axialfe import parse_model, solve
from axialfe.mechanics.thermal import free_strain
from axialfe.model import PropertyTable
from axialfe.errors import ModelError

C = 273.15

BAR = """
title = "restrained bar with tables"
[settings]
reference_temperature = "{ref}"
{settings}
[materials.hot]
elastic_modulus = {{ "20 degC" = "203 GPa", "200 degC" = "191 GPa", "400 degC" = "178 GPa" }}
yield_strength = {{ "20 degC" = "250 MPa", "400 degC" = "180 MPa" }}
{expansion}
[sections.r]
shape = "area"
area = "100 mm^2"
[stations]
a = "0 m"
b = "1 m"
[[segments]]
name = "bar"
from = "a"
to = "b"
material = "hot"
section = "r"
temperature = "{T}"
[[supports]]
at = "a"
[[supports]]
at = "b"
"""
MEAN = ('mean_thermal_expansion = { reference = "20 degC", "20 degC" = "11.5e-6 /K", '
        '"200 degC" = "12.2e-6 /K", "400 degC" = "13.0e-6 /K" }')
TOTAL = ('thermal_expansion_total = { reference = "20 degC", "20 degC" = "0 mm/m", '
         '"200 degC" = "2.1 mm/m", "400 degC" = "4.7 mm/m" }')


def bar(T="300 degC", ref="20 degC", expansion=MEAN, settings=""):
    return parse_model(BAR.format(T=T, ref=ref, expansion=expansion, settings=settings))


def stress(model):
    return float(solve(model)["base"].stress[0, 0])


def lerp(x, x0, x1, y0, y1):
    return y0 + (y1 - y0) * (x - x0) / (x1 - x0)


def test_restrained_bar_at_300_degC_takes_the_interpolated_modulus_and_expansion():
    # E(300 degC) = 184.5 GPa and alpha_m(300 degC) = 12.6e-6 /K by linear interpolation;
    # restrained: sigma = -E*alpha_m*(300 - 20) K (hand computation, the closed form above)
    E = lerp(300, 200, 400, 191e9, 178e9)
    alpha = lerp(300, 200, 400, 12.2e-6, 13.0e-6)
    assert stress(bar()) == pytest.approx(-E * alpha * 280.0, rel=1e-12)


def test_mean_coefficients_convert_between_the_table_and_the_model_reference():
    # Model installed at 100 degC, table from 20 degC: the free strain to 300 degC is
    # alpha_m(300)*(300 - 20) - alpha_m(100)*(100 - 20), not alpha_m(300)*(300 - 100)
    # (hand computation; the conversion piping tables call for, common practice).
    a300 = lerp(300, 200, 400, 12.2e-6, 13.0e-6)
    a100 = lerp(100, 20, 200, 11.5e-6, 12.2e-6)
    strain = a300 * 280.0 - a100 * 80.0
    assert strain != pytest.approx(a300 * 200.0, rel=1e-3)      # the slip it guards against
    E = lerp(300, 200, 400, 191e9, 178e9)
    assert stress(bar(ref="100 degC")) == pytest.approx(-E * strain, rel=1e-12)
    assert float(free_strain("mean", (20 + C, 200 + C, 400 + C), (11.5e-6, 12.2e-6, 13.0e-6),
                             20 + C, 100 + C, 300 + C)) == pytest.approx(strain, rel=1e-12)


def test_total_expansion_is_interpolated_in_strain():
    # eps(300 degC) = 2.1 + (4.7 - 2.1)/2 = 3.4 mm/m from 20 degC (hand computation)
    E = lerp(300, 200, 400, 191e9, 178e9)
    assert stress(bar(expansion=TOTAL)) == pytest.approx(-E * 3.4e-3, rel=1e-12)
    # from a model reference of 200 degC: 3.4 - 2.1 = 1.3 mm/m
    assert stress(bar(expansion=TOTAL, ref="200 degC")) == pytest.approx(-E * 1.3e-3, rel=1e-12)


def test_modulus_at_the_reference_temperature_and_the_note_says_so():
    model = bar(settings='modulus_at = "reference"')
    alpha = lerp(300, 200, 400, 12.2e-6, 13.0e-6)
    case = solve(model)["base"]
    assert float(case.stress[0, 0]) == pytest.approx(-203e9 * alpha * 280.0, rel=1e-12)
    assert case.notes[0] == ("properties from tables against temperature: E at the reference "
                             "temperature 20 degC (settings.modulus_at = \"reference\"), f_y at "
                             "each segment's temperature, thermal strain from 20 degC by the "
                             "tables' own reference")
    assert solve(bar())["base"].notes[0].startswith(
        "properties from tables against temperature: E at each segment's temperature")


def test_the_strength_check_takes_the_yield_strength_at_temperature():
    from axialfe.checks import check_solution

    fy = lerp(300, 20, 400, 250e6, 180e6)
    report = check_solution(solve(bar()))
    entry = next(e for e in report.cases[0].entries if e.kind == "strength")
    assert entry.capacity == pytest.approx(fy, rel=1e-12)


def test_a_temperature_outside_a_table_is_one_located_error(tmp_path, cli):
    path = tmp_path / "bar.toml"
    path.write_text(BAR.format(T="450 degC", ref="20 degC", expansion=MEAN, settings=""),
                    encoding="utf-8")
    out = cli("solve", path)
    assert out.exit_code == 2
    assert out.stderr == (f"error: {path}:9: materials.hot: mean_thermal_expansion: the table "
                          "covers 20 degC to 400 degC, but segment 'bar' is at 450 degC in case "
                          "'base': extend the table or check the temperature\n")


@pytest.mark.parametrize("command, what", [
    (("closed-form",), "the closed form"),
])
def test_commands_that_need_constant_properties_say_so(tmp_path, cli, command, what):
    path = tmp_path / "bar.toml"
    path.write_text(BAR.format(T="300 degC", ref="20 degC", expansion=MEAN, settings=""),
                    encoding="utf-8")
    out = cli(command[0], path, *command[1:])
    assert out.exit_code == 2
    assert out.stderr.startswith(f"error: {path}:6: materials.hot: {what} takes constant "
                                 "properties, and material 'hot' gives them against "
                                 "temperature: ")
    assert len(out.stderr.splitlines()) == 1


def test_a_table_checks_itself():
    with pytest.raises(ModelError, match="must not give one temperature twice"):
        PropertyTable((300.0, 300.0), (1.0, 2.0))
    with pytest.raises(ModelError, match="at least two entries"):
        PropertyTable((300.0,), (1.0,))


def test_built_in_tables_read_with_their_sources():
    # ASME B31.3 Appendix C Table C-6, carbon steel at 300 degF: 28.3e6 psi (from memory);
    # Table C-1, 0.99 in/100 ft from 70 degF to 200 degF = 0.825 mm/m (from memory)
    from axialfe.io.modelfile import builtin_materials

    mats = builtin_materials()
    steel = mats["carbon-steel-hot"]
    T300F = (300 - 32) / 1.8 + C
    i = steel.modulus_table.temperatures.index(pytest.approx(T300F))
    assert steel.modulus_table.values[i] == pytest.approx(28.3e6 * 6894.757293168, rel=1e-9)
    assert steel.expansion_kind == "total"
    assert steel.expansion_table.values[1] == pytest.approx(0.825e-3)
    for name in ("carbon-steel-hot", "stainless-304-hot", "aluminium-6061-hot"):
        assert "from memory" in mats[name].source and mats[name].tabled


def test_json_of_a_tabled_solve_carries_the_note(tmp_path, cli):
    path = tmp_path / "bar.toml"
    path.write_text(BAR.format(T="300 degC", ref="20 degC", expansion=MEAN, settings=""),
                    encoding="utf-8")
    out = cli("solve", path, "--format", "json")
    assert out.exit_code == 0, out.output
    notes = json.loads(out.stdout)["cases"][0]["notes"]
    assert notes[0].startswith("properties from tables against temperature")


def test_the_bolt_example_against_its_hand_solution(cli):
    # The hand solution in the example's comments, from the built-in table entries at
    # 300 degF and 400 degF (ASME B31.3 Table C-6 and C-1, Section II Part D TE-2, from
    # memory): 150 degC = 302 degF lies 2 % of the way between them.
    from pathlib import Path

    psi, f = 6894.757293168, 0.02
    E_b = (28.3e6 + f * (27.7e6 - 28.3e6)) * psi
    E_h = (9.2e6 + f * (8.7e6 - 9.2e6)) * psi
    eps_b = (1.517 + f * (2.250 - 1.517)) * 1e-3
    eps_h = (23.8e-6 + f * (24.1e-6 - 23.8e-6)) * (150.0 - (70 - 32) / 1.8)
    L, A_b, A_h, delta = 0.06, 84.3e-6, 300e-6, 0.05e-3
    F = (delta + (eps_h - eps_b) * L) / (L / (E_b * A_b) + L / (E_h * A_h))
    example = Path(__file__).resolve().parent.parent / "examples" / "bolt-hot-housing-tables.toml"
    out = cli("solve", example, "--format", "json", "--force-unit", "N")
    assert out.exit_code == 0, out.output
    hot = json.loads(out.stdout)["cases"][1]
    assert hot["segments"][0]["axial_force"][0] == pytest.approx(F, rel=1e-9)
    fy = (31.0 + f * (30.0 - 31.0)) * 6894.757293168e3        # ksi to Pa
    assert any(f"beyond its yield strength {fy / 1e6:.4g} MPa" in n for n in hot["notes"])


STOP = """
[[gaps]]
name = "stop"
at = "b"
side = "+x"
clearance = "1 mm"
"""


def test_sweep_over_tables_finds_the_gap_and_yield_events_by_bracketing():
    # The bar of the tests above, free at 'b' with a stop 1 mm away.  Free strain from
    # 20 degC with alpha_m linear between 20 and 200 degC: alpha_m(T) = a0 + k*x, x = T - 20,
    # so the stop closes where (a0 + k*x)*x*L = c, a quadratic (hand computation).  Then
    # restrained: E(T)*(eps(T) - c/L) = f_y(T), a root found here by scipy's brentq from
    # the interpolated tables, independently of the tool's bisection.
    from scipy.optimize import brentq

    from axialfe.tracking.sweep import sweep

    text = BAR.format(T="20 degC", ref="20 degC", expansion=MEAN, settings="")
    text = text.replace('[[supports]]\nat = "b"\n', "") + STOP
    model = parse_model(text)
    a0, k, c = 11.5e-6, 0.7e-6 / 180, 1e-3
    x_c = (-a0 + (a0 ** 2 + 4 * k * c) ** 0.5) / (2 * k)

    def alpha(T):
        return (lerp(T, 20, 200, 11.5e-6, 12.2e-6) if T <= 200
                else lerp(T, 200, 400, 12.2e-6, 13.0e-6))

    def E(T):
        return lerp(T, 20, 200, 203e9, 191e9) if T <= 200 else lerp(T, 200, 400, 191e9, 178e9)

    T_y = brentq(lambda T: E(T) * (alpha(T) * (T - 20) - c) - lerp(T, 20, 400, 250e6, 180e6),
                 20 + x_c, 400, xtol=1e-12)
    result = sweep(model, "temperature", 20.0, 300.0, 15, "degC")
    assert [(e.name, e.event) for e in result.events] == [("stop", "closes"), ("bar", "yields")]
    assert result.events[0].value == pytest.approx(20 + x_c, rel=1e-10)
    assert result.events[1].value == pytest.approx(T_y, rel=1e-10)
    hot = result.results[-1]
    assert float(hot.stress[0, 0]) == pytest.approx(-E(300) * (alpha(300) * 280 - c), rel=1e-12)


def test_a_load_sweep_over_tables_takes_the_case_temperatures():
    from axialfe.tracking.sweep import sweep

    model = bar()                                  # restrained at 300 degC
    result = sweep(model, "load_factor", 0.0, 1.0, 3)
    E = lerp(300, 200, 400, 191e9, 178e9)
    alpha = lerp(300, 200, 400, 12.2e-6, 13.0e-6)
    assert float(result.results[0].stress[0, 0]) == pytest.approx(-E * alpha * 280, rel=1e-12)
