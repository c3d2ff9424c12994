"""Closed forms checked against textbook formulas, and against the numeric solver."""

import json
from pathlib import Path

import numpy as np
import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from conftest import examples
from typer.testing import CliRunner

from axialfe import solve_symbolic
from axialfe.cli import app
from axialfe.errors import ModelError, SolveError
from axialfe.model import (Case, Combination, Gap, Load, Material, Model, Section, Segment, Station,
                           Support)
from axialfe.io.modelfile import parse_model, read_model
from axialfe.model.temperature import has_tables
from axialfe.engine.system import solve
from axialfe.symbolic.closed_form import numeric_model

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
runner = CliRunner()


def S(name):
    return sympy.Symbol(name, positive=True)


def R(name):
    return sympy.Symbol(name, real=True)


def same(expr, reference):
    return sympy.simplify(expr - reference) == 0


def series(symbols, stations, segments, supports, extra=""):
    """Build a model text from pieces: segments are (from, to, material, section)."""
    lines = ["[symbols]"] + [f"{k} = {v}" for k, v in symbols.items()]
    lines += ["[stations]"] + [f'{k} = "{v}"' for k, v in stations.items()]
    for a, b, mat, sec, *name in segments:
        lines += ["[[segments]]", f'from = "{a}"', f'to = "{b}"', f'material = "{mat}"',
                  f'section = "{sec}"'] + ([f'name = "{name[0]}"'] if name else [])
    for at in supports:
        lines += ["[[supports]]", f'at = "{at}"']
    return "\n".join(lines) + "\n" + extra


ONE_MATERIAL = """
[materials.m]
elastic_modulus = "E"
[sections.s]
shape = "area"
area = "A"
"""


# --- references ------------------------------------------------------------------
def test_fixed_fixed_bar_with_a_load_at_a():
    # Reactions P*b/L and P*a/L, both against P (Timoshenko, Strength of Materials,
    # Part I, statically indeterminate problems in tension; Gere and Goodno, Mechanics
    # of Materials, statically indeterminate axial members; from memory)
    text = series({"P": '{ unit = "kN" }', "a": '{ unit = "mm" }', "L": '{ unit = "mm" }',
                   "E": '{ unit = "GPa" }', "A": '{ unit = "mm^2" }'},
                  {"left": "0 mm", "C": "a", "right": "L"},
                  [("left", "C", "m", "s"), ("C", "right", "m", "s")], ["left", "right"],
                  ONE_MATERIAL + '[[loads]]\nat = "C"\nforce = "P"\n')
    cf = solve_symbolic(parse_model(text, "pab.toml", symbolic=True))
    P, a, L = R("P"), S("a"), R("L")
    b = L - a
    assert same(cf.reaction("left"), -P * b / L)
    assert same(cf.reaction("right"), -P * a / L)
    # the load point moves P*a*b/(E*A*L) (same source)
    assert same(cf.displacement("C"), P * a * b / (S("E") * S("A") * L))
    assert str(cf.reaction("left")) in ("-P*(L - a)/L", "P*(a - L)/L", "P*(-L + a)/L")


def test_two_material_bar_between_walls_heated():
    # R = dT*(alpha_1*L_1 + alpha_2*L_2)/(L_1/(E_1*A_1) + L_2/(E_2*A_2))
    # (Gere and Goodno, Mechanics of Materials, thermal effects in statically
    # indeterminate bars; Timoshenko, Part I; from memory)
    text = series({"E_1": '{ unit = "GPa" }', "A_1": '{ unit = "mm^2" }', "L_1": '{ unit = "mm" }',
                   "alpha_1": '{ unit = "1/K" }', "E_2": '{ unit = "GPa" }',
                   "A_2": '{ unit = "mm^2" }', "L_2": '{ unit = "mm" }',
                   "alpha_2": '{ unit = "1/K" }', "dT": '{ unit = "K" }'},
                  {"left": "0 mm", "joint": "L_1", "right": "L_1 + L_2"},
                  [("left", "joint", "m1", "s1"), ("joint", "right", "m2", "s2")],
                  ["left", "right"], """
[settings]
temperature_change = "dT"
[materials.m1]
elastic_modulus = "E_1"
thermal_expansion = "alpha_1"
[materials.m2]
elastic_modulus = "E_2"
thermal_expansion = "alpha_2"
[sections.s1]
shape = "area"
area = "A_1"
[sections.s2]
shape = "area"
area = "A_2"
""")
    cf = solve_symbolic(parse_model(text, symbolic=True))
    E1, A1, L1, a1, E2, A2, L2, a2 = (S(n) for n in ("E_1", "A_1", "L_1", "alpha_1", "E_2", "A_2",
                                                      "L_2", "alpha_2"))
    reference = R("dT") * (a1 * L1 + a2 * L2) / (L1 / (E1 * A1) + L2 / (E2 * A2))
    assert sympy.simplify(cf.reaction("left") - reference) == 0  # the wall pushes toward +x
    assert sympy.simplify(cf.force("left-joint")[0] + reference) == 0  # compression
    assert sympy.simplify(cf.reaction("right") + reference) == 0


def test_parallel_bars_share_a_load_in_proportion_to_EA():
    # Share of bar 1: E1*A1/(E1*A1 + E2*A2) (Gere and Goodno, Mechanics of Materials,
    # statically indeterminate structures, parallel bars; from memory)
    text = series({"P": '{ unit = "kN" }', "E_1": '{ unit = "GPa" }', "A_1": '{ unit = "mm^2" }',
                   "E_2": '{ unit = "GPa" }', "A_2": '{ unit = "mm^2" }', "L": '{ unit = "mm" }'},
                  {"base": "0 mm", "cap": "L"},
                  [("base", "cap", "m1", "s1", "core"), ("base", "cap", "m2", "s2", "tube")],
                  ["base"], """
[materials.m1]
elastic_modulus = "E_1"
[materials.m2]
elastic_modulus = "E_2"
[sections.s1]
shape = "area"
area = "A_1"
[sections.s2]
shape = "area"
area = "A_2"
[[loads]]
at = "cap"
force = "P"
""")
    cf = solve_symbolic(parse_model(text, symbolic=True))
    E1, A1, E2, A2 = (S(n) for n in ("E_1", "A_1", "E_2", "A_2"))
    assert same(cf.force("core")[0], R("P") * E1 * A1 / (E1 * A1 + E2 * A2))
    assert same(cf.force("tube")[1], R("P") * E2 * A2 / (E1 * A1 + E2 * A2))


GAP_MODEL = series({"P": '"30 kN"', "a": '"200 mm"', "b": '"300 mm"', "E": '"200 GPa"',
                    "A": '"100 mm^2"', "c": '"0.1 mm"'},
                   {"A_end": "0 mm", "C": "a", "B": "a + b"},
                   [("A_end", "C", "m", "s"), ("C", "B", "m", "s")], ["A_end"],
                   ONE_MATERIAL + """
[[loads]]
at = "C"
force = "P"
[[gaps]]
name = "wall"
at = "B"
side = "+x"
clearance = "c"
""")


def test_a_gap_that_closes_condition_and_formula():
    # A bar fixed at A, load P at C (a from A), its free end B a clearance c short of a
    # wall: it closes when P*a/(E*A) >= c, and then the wall takes (P*a - E*A*c)/(a + b)
    # (Gere and Goodno, Mechanics of Materials, statically indeterminate bar with a gap;
    # Hibbeler, Mechanics of Materials, axial load; from memory)
    model = parse_model(GAP_MODEL, "gap.toml", symbolic=True)
    cf = solve_symbolic(model, assume={"wall": True})
    P, a, b, E, A, c = R("P"), S("a"), S("b"), S("E"), S("A"), S("c")
    assert same(cf.gap("wall"), -(P * a - E * A * c) / (a + b))  # compression
    (cond,) = cf.conditions
    assert cond == sympy.Ge(P, A * E * c / a)
    assert same(cf.displacement("B"), c)
    # open: the condition is the reverse, the wall carries nothing
    cf_open = solve_symbolic(model, assume={"wall": False})
    assert cf_open.gap("wall") == 0
    assert cf_open.conditions == (sympy.Le(P, A * E * c / a),)
    # the given values (P*a/(E*A) = 0.3 mm > 0.1 mm) close it: the open state fails, with a note
    assert any("fails for the given values" in note for note in cf_open.notes)
    assert not cf.notes


def test_the_numeric_state_is_used_and_matches():
    model = parse_model(GAP_MODEL, "gap.toml", symbolic=True)
    case = solve(numeric_model(model))["base"]
    cf = solve_symbolic(model, state={"wall": bool(case.gap_closed[0])})
    assert cf.gap_closed == {"wall": True}
    assert cf.evaluate(cf.gap("wall")) == pytest.approx(case.gap("wall")["force"], rel=1e-12)
    assert cf.evaluate(cf.gap("wall")) == pytest.approx(-(30000 * 0.2 - 200e9 * 1e-4 * 1e-4) / 0.5)


def test_an_undecided_state_needs_an_assumption():
    text = GAP_MODEL.replace('c = "0.1 mm"', 'c = { unit = "mm" }')
    model = parse_model(text, "gap.toml", symbolic=True)
    assert text.splitlines()[33] == "[[gaps]]"  # line 34
    with pytest.raises(ModelError) as info:
        solve_symbolic(model)
    assert str(info.value) == ("gap.toml:34: the contact state is undecided while symbol(s) 'c' "
                               "have no value: assume the state of gap(s) 'wall' (e.g. --assume "
                               "wall=closed)")


def test_without_a_state_the_numeric_solver_decides_it():
    # every symbol has a value: the state is the numeric solver's (closed here, as the
    # load moves C by P*a/(E*A) = 0.3 mm > c)
    cf = solve_symbolic(parse_model(GAP_MODEL, "gap.toml", symbolic=True))
    assert cf.gap_closed == {"wall": True}


def located(text, error=SolveError, **kw):
    with pytest.raises(error) as info:
        solve_symbolic(parse_model(text, "m.toml", symbolic=True), **kw)
    return str(info.value)


def test_errors_without_one_place_give_the_line_of_what_they_name():
    lines = GAP_MODEL.splitlines()
    line_a = lines.index('A_end = "0 mm"') + 1
    # stations out of order: the line of the station that does not lie beyond
    swapped = GAP_MODEL.replace('C = "a"\nB = "a + b"', 'B = "a + b"\nC = "a"')
    line_c = swapped.splitlines().index('C = "a"') + 1
    assert located(swapped, ModelError) == (
        f"m.toml:{line_c}: stations with symbolic positions must be listed in "
        "increasing x: 'C' (x = a) does not lie beyond 'B' (x = a + b)")
    # a part that floats in the assumed state: the line of the first station named
    free = GAP_MODEL.replace('[[supports]]\nat = "A_end"\n', "")
    assert located(free, assume={"wall": False}) == (
        f"m.toml:{line_a}: stations 'A_end', 'C', 'B' float in the contact state "
        "('wall' open): no support, spring or closed gap holds them")
    # two closed gaps on one station: the line of the first gap
    second = '[[gaps]]\nname = "stop"\nat = "B"\nside = "+x"\nclearance = "%s"\n'
    gap_line = lines.index("[[gaps]]") + 1
    assert located(GAP_MODEL + second % "c", assume={"wall": True, "stop": True}) == (
        f"m.toml:{gap_line}: the closed gaps 'wall', 'stop' share their force in no unique way in "
        "the contact state ('wall' closed, 'stop' closed): assume one of them open")
    assert located(GAP_MODEL + second % "2*c", assume={"wall": True, "stop": True}) == (
        f"m.toml:{gap_line}: no equilibrium in the contact state ('wall' closed, 'stop' closed): "
        "the closed gaps cannot all close at once")


def test_readable_back_by_sympy():
    model = parse_model(GAP_MODEL, "gap.toml", symbolic=True)
    cf = solve_symbolic(model, assume={"wall": True})
    names = {n: s for n, s in cf.symbols.items()}
    for expr in [*cf.reactions.values(), *cf.displacements.values(), cf.gap("wall")]:
        assert same(sympy.parse_expr(str(expr), local_dict=names), expr)
    for cond in cf.conditions:
        back = sympy.parse_expr(str(cond), local_dict=names)
        assert type(back) is type(cond) and same(back.lhs - back.rhs, cond.lhs - cond.rhs)


# --- property: the closed form of random numeric models equals the sparse solution ---
# Both sides solve the same model, so agreement to rounding proves neither right on
# its own; it proves that the exact elimination (rationals, exact logarithms and
# partial fractions on tapers) and the floating-point path (sparse LU, Gauss-Legendre
# and log1p on tapers, the gap pivoting) build the same system from every kind of part.
# The references of each part are in the tests above.
PRISMS = [Section("a1", "area", (("area", 1e-4),)), Section("r", "round", (("diameter", 0.02),))]
TAPERS = [(Section("a1", "area", (("area", 1e-4),)), Section("a4", "area", (("area", 2.5e-4),))),
          (Section("r", "round", (("diameter", 0.02),)), Section("r12", "round", (("diameter", 0.012),)))]
MATERIALS = [Material("m1", 200e9, 12e-6, density=7850.0), Material("m2", 70e9, 23e-6, density=2700.0)]


@st.composite
def small_models(draw):
    """Small numeric models with every kind of part the closed form handles.

    Point loads, distributed loads, self-weight, tapers, misfits, temperatures,
    springs and settlements, cases with a combination, and gaps: against ground
    or between two stations (an inner stop or link, or a link to a fixed post),
    contact or slack.
    """
    n = draw(st.integers(2, 4))
    xs = sorted(draw(st.lists(st.integers(1, 40), min_size=n - 1, max_size=n - 1, unique=True)))
    stations = [Station("s0", 0.0)] + [Station(f"s{i + 1}", x * 0.025) for i, x in enumerate(xs)]
    segments = []
    for i in range(n - 1):
        for j in range(draw(st.integers(1, 2))):
            if draw(st.integers(0, 2)) == 0:
                section, end_section = draw(st.sampled_from(TAPERS))
                if draw(st.booleans()):
                    section, end_section = end_section, section
            else:
                section, end_section = draw(st.sampled_from(PRISMS)), None
            segments.append(Segment(f"e{i}-{j}", f"s{i}", f"s{i + 1}", draw(st.sampled_from(MATERIALS)),
                                    section, end_section=end_section,
                                    temperature_change=float(draw(st.integers(-40, 80))),
                                    misfit=draw(st.sampled_from([0.0, 1e-5, -2e-5])),
                                    distributed_load=draw(st.sampled_from([0.0, 0.0, -3e3, 5e3]))))
    gravity = draw(st.sampled_from([0.0, -9.80665, 9.81]))
    supports = [Support("s0")]
    last = f"s{n - 1}"
    kind = draw(st.sampled_from(["none", "none", "fixed", "spring", "settlement"]))
    if kind == "fixed":
        supports.append(Support(last))
    elif kind == "spring":
        supports.append(Support(last, "spring", stiffness=draw(st.sampled_from([1e6, 5e7]))))
    elif kind == "settlement":
        supports.append(Support(last, "settlement", displacement=1e-4))
    gaps = []
    clearance = st.sampled_from([2e-5, 0.0, 1e-4, 4e-4])
    held = {0, n - 1} if kind in ("fixed", "settlement") else {0}
    if n > len(held) and draw(st.booleans()):  # an inner stop or link beside the segments
        # not between two stations that cannot move (nothing to solve; it may not fit)
        pair = st.lists(st.integers(0, n - 1), min_size=2, max_size=2, unique=True)
        i, j = sorted(draw(pair.filter(lambda p: not set(p) <= held)))
        gaps.append(Gap("inner", (f"s{i}", f"s{j}"), draw(clearance),
                        kind=draw(st.sampled_from(["contact", "slack"]))))
    # not at a fixed or settled end, whose gap would share its force with the support
    outer = draw(st.sampled_from(["none", "ground", "post"])) if kind in ("none", "spring") else "none"
    if outer == "ground":
        gaps.append(Gap("stop", (last,), draw(clearance), kind=draw(st.sampled_from(["contact", "slack"])),
                        side=draw(st.sampled_from(["+x", "-x"]))))
    elif outer == "post":  # a fixed post beyond the end, reached by a stop or a link
        stations.append(Station("post", stations[-1].x + 0.1))
        supports.append(Support("post"))
        gaps.append(Gap("tie", (last, "post"), draw(clearance),
                        kind=draw(st.sampled_from(["contact", "slack"]))))
    force = st.sampled_from([-20e3, -6e3, 0.0, 9e3, 20e3])
    at = st.integers(1, n - 1).map(lambda k: f"s{k}")
    loads = [Load(draw(at), draw(force))]
    cases, combinations = (), ()
    if draw(st.booleans()):
        heat = Case("heat", temperature_change=(("all", float(draw(st.integers(-30, 60)))),),
                    settlements=(((last, 2e-4),) if kind == "settlement" else ()))
        cases = (Case("dead", tuple(loads)), Case("extra", (Load(draw(at), draw(force)),)), heat)
        combinations = (Combination("combined", (("dead", draw(st.sampled_from([1.0, 1.35]))),
                                                  ("extra", 1.5), ("heat", 0.6))),)
        loads = []
    return Model(stations, segments, supports, loads, gaps, cases, combinations, gravity=gravity)


def scales(model, case):
    """Sizes of the displacements, forces and stresses of a case, for relative tolerances.

    From the movements the parts make (not only the displacements, which rounding
    alone makes of a station that a taut link holds in place) and the forces the
    stiffest part would need to make them.
    """
    areas = [sec.area for seg in model.segments for sec in seg.sections]
    lengths = case.length
    scale_u = max(np.abs(case.u).max(), np.abs(case.elastic_elongation).max(),
                  np.abs(case.thermal_elongation).max(), max(abs(s.misfit) for s in model.segments),
                  max((g.clearance for g in model.gaps), default=0.0), 1e-300)
    stiffest = max(seg.material.elastic_modulus * max(sec.area for sec in seg.sections) / L
                   for seg, L in zip(model.segments, lengths))
    scale_n = max(np.abs(case.axial_force).max(), np.abs(case.reactions).max(initial=0),
                  np.abs(case.gap_force).max(initial=0), stiffest * scale_u)
    return scale_u, scale_n, max(np.abs(case.stress).max(), scale_n / min(areas))


@settings(max_examples=examples(20))
@given(small_models())
def test_closed_form_equals_the_numeric_solution(model):
    solution = solve(model)
    # the combination (or the single case): the combination rule on both sides
    for name in solution.names[-1:]:
        case = solution[name]
        state = {g.name: bool(case.gap_closed[j]) for j, g in enumerate(model.gaps)}
        cf = solve_symbolic(model, case=name, state=state)
        scale_u, scale_n, scale_s = scales(model, case)
        for i, stn in enumerate(model.stations):
            assert abs(cf.evaluate(cf.displacement(stn.name)) - case.u[i]) <= 1e-9 * scale_u, name
        for i, seg in enumerate(model.segments):
            for end in (0, 1):
                assert abs(cf.evaluate(cf.force(seg.name)[end]) - case.axial_force[i][end]) <= 1e-9 * scale_n
                assert abs(cf.evaluate(cf.stresses[seg.name][end]) - case.stress[i][end]) <= 1e-9 * scale_s
        for sup in model.supports:
            assert abs(cf.evaluate(cf.reaction(sup.at)) - case.reaction(sup.at)) <= 1e-9 * scale_n
        for j, g in enumerate(model.gaps):
            assert abs(cf.evaluate(cf.gap(g.name)) - case.gap_force[j]) <= 1e-9 * scale_n


# --- the command -----------------------------------------------------------------
@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.name)
def test_closed_form_runs_on_every_example(path):
    result = runner.invoke(app, ["closed-form", str(path), "--format", "json"])
    if has_tables(read_model(path)):   # properties against temperature: refused in one line
        assert result.exit_code == 2
        assert "the closed form takes constant properties" in result.stderr
        return
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    for key in ("title", "units", "symbols", "reactions", "displacements", "axial_forces", "gaps",
                "conditions"):
        assert key in data
    # every value is compared (the command fails when one differs: see the next test)
    for group in ("reactions", "displacements", "axial_forces", "gaps"):
        for entry in data[group].values():
            assert set(entry) >= {"expression", "latex", "value", "numeric"}
            assert entry["value"] is not None and entry["numeric"] is not None
            assert entry["relative_difference"] is not None


def test_a_closed_form_that_differs_from_the_numeric_solution_is_refused():
    # the comparison the command relies on: numeric values of a model with a 1 % larger
    # load raise, naming the first quantity that differs: the left wall's share of the
    # load, -P*k_1/(k_1 + k_2) with k = E*A/length (springs in parallel between walls;
    # Gere and Goodno, statically indeterminate axial members; from memory), is
    # -24 kN * 490*150/(490*150 + 200*250) = -14.2834 kN, 1 % more with 24.24 kN
    from axialfe.symbolic.closed_form import closed_form_dict

    text = (EXAMPLES / "closed-form-stepped-rod-load.toml").read_text(encoding="utf-8")
    model = parse_model(text, "rod.toml", symbolic=True)
    other = parse_model(text.replace('P = "24 kN"', 'P = "24.24 kN"'), "rod.toml", symbolic=True)
    cf = solve_symbolic(model)
    closed_form_dict(cf, solve(numeric_model(model))["base"])  # its own values pass
    with pytest.raises(SolveError) as info:
        closed_form_dict(cf, solve(numeric_model(other))["base"])
    assert str(info.value) == (
        "rod.toml: the closed form of reaction 'left' (-A_1*P*b/(A_1*b + A_2*a)) gives "
        "-14283.4008097 but the numeric solver -14426.2348178 (relative difference 9.9e-03 > 1e-09)")


def test_closed_form_json_of_the_gap_example():
    path = EXAMPLES / "closed-form-heated-bar-gap.toml"
    data = json.loads(runner.invoke(app, ["closed-form", str(path), "-f", "json"]).output)
    assert data["symbols"]["c"] == "0.12 mm"
    assert data["conditions"] == ["dT >= c/(L_1*alpha_1 + L_2*alpha_2)"]
    # the rod closes the end float when the free expansion dT*(alpha_1*L_1 + alpha_2*L_2)
    # exceeds c, then presses with (dT*(alpha_1*L_1 + alpha_2*L_2) - c)/(L_1/(E_1*A_1) +
    # L_2/(E_2*A_2)) (Gere and Goodno, Mechanics of Materials, thermal effects, bar with a
    # gap; from memory): 32.79 kN from the file's values
    free = 60 * (18e-6 * 0.180 + 12e-6 * 0.240)
    flexibility = 0.180 / (110e9 * 450e-6) + 0.240 / (205e9 * 300e-6)
    assert data["gaps"]["end-float"]["value"] == pytest.approx(-(free - 0.12e-3) / flexibility / 1e3,
                                                               rel=1e-12)  # kN
    assert data["axial_forces"]["sleeve"]["value"] < 0


def test_only_latex_and_assume():
    path = str(EXAMPLES / "closed-form-heated-bar-gap.toml")
    result = runner.invoke(app, ["closed-form", path, "--only", "reactions", "--latex"])
    assert result.exit_code == 0
    assert "\\alpha_{1}" in result.output and "station displacements" not in result.output
    result = runner.invoke(app, ["closed-form", path, "--assume", "end-float=open", "-f", "json"])
    data = json.loads(result.output)
    assert data["gaps"]["end-float"]["expression"] == "0"
    assert data["conditions"] == ["dT <= c/(L_1*alpha_1 + L_2*alpha_2)"]
    assert any("fails for the given values" in n for n in data["notes"])


def test_symbols_without_values_give_null_values(tmp_path):
    text = GAP_MODEL.replace('P = "30 kN"', 'P = { unit = "kN" }')
    path = tmp_path / "gap.toml"
    path.write_text(text)
    result = runner.invoke(app, ["closed-form", str(path), "--assume", "wall=closed", "-f", "json"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["symbols"]["P"] is None
    assert data["reactions"]["A_end"]["value"] is None
    assert data["reactions"]["A_end"]["numeric"] is None
    assert data["displacements"]["B"]["value"] == pytest.approx(0.1)  # = c, known


@pytest.mark.parametrize("args, message", [
    (["--assume", "wal=closed"], "error: --assume: unknown gap 'wal'; did you mean 'wall'?"),
    (["--assume", "wall=shut"], "error: --assume takes GAP=closed or GAP=open: got 'wall=shut'"),
    (["--only", "reaktions"], "error: --only: unknown quantity 'reaktions'; did you mean 'reactions'?"),
])
def test_bad_options_give_one_line(tmp_path, args, message):
    path = tmp_path / "gap.toml"
    path.write_text(GAP_MODEL)
    result = runner.invoke(app, ["closed-form", str(path), *args])
    assert result.exit_code == 2
    assert result.output.strip() == message


# --- tapered segments ------------------------------------------------------------
TAPER = """
[symbols]
P = { unit = "kN" }
L = { unit = "mm" }
E = { unit = "GPa" }
%s
[materials.m]
elastic_modulus = "E"
[sections.wide]
%s
[sections.narrow]
%s
[stations]
wide = "0 mm"
narrow = "L"
[[segments]]
name = "taper"
from = "wide"
to = "narrow"
material = "m"
section = "wide"
end_section = "narrow"
[[supports]]
at = "wide"
[[loads]]
at = "narrow"
force = "P"
"""


def test_solid_cone_in_closed_form():
    # delta = 4*P*L/(pi*E*d1*d2) (Gere and Goodno, Mechanics of Materials, nonuniform
    # bars, tapered bar of circular cross-section; from memory)
    text = TAPER % ('d_1 = { unit = "mm" }\nd_2 = { unit = "mm" }',
                    'shape = "round"\ndiameter = "d_1"', 'shape = "round"\ndiameter = "d_2"')
    cf = solve_symbolic(parse_model(text, "cone.toml", symbolic=True))
    P, L, E, d1, d2 = R("P"), S("L"), S("E"), S("d_1"), S("d_2")
    assert sympy.simplify(cf.displacement("narrow") - 4 * P * L / (sympy.pi * E * d1 * d2)) == 0
    assert str(cf.displacement("narrow")) == "4*L*P/(pi*E*d_1*d_2)"
    # stresses P/A at both ends (equilibrium of a cut; common practice)
    assert same(cf.stresses["taper"][1], 4 * P / (sympy.pi * d2**2))


def test_linearly_tapered_area_in_closed_form():
    # k = E*(A2 - A1)/(L*ln(A2/A1)) (integral of dx/(E*A(x)) with A linear; Gere and
    # Goodno, Mechanics of Materials, nonuniform bars; from memory)
    text = TAPER % ('A_1 = { unit = "mm^2" }\nA_2 = { unit = "mm^2" }',
                    'shape = "area"\narea = "A_1"', 'shape = "area"\narea = "A_2"')
    cf = solve_symbolic(parse_model(text, "taper.toml", symbolic=True))
    P, L, E, A1, A2 = R("P"), S("L"), S("E"), S("A_1"), S("A_2")
    k = E * (A2 - A1) / (L * sympy.log(A2 / A1))
    assert sympy.simplify(sympy.expand_log(cf.displacement("narrow") - P / k)) == 0
    # printed with one logarithm of the ratio, not log(A_1) - log(A_2)
    assert str(cf.displacement("narrow")) == "L*P*log(A_1/A_2)/(E*(A_1 - A_2))"


def test_tapered_bar_between_walls_keeps_one_logarithm():
    # A tapered part (flexibility f1 = a*log(A_1/A_2)/(E*(A_1 - A_2)), as above) and a
    # prismatic part (f2 = b/(E*A_2)) between walls, load P at the joint: the left wall
    # takes -P*f2/(f1 + f2) (compatibility of springs in series between rigid walls;
    # Gere and Goodno, statically indeterminate axial members; from memory)
    text = series({"P": '{ unit = "kN" }', "a": '{ unit = "mm" }', "b": '{ unit = "mm" }',
                   "E": '{ unit = "GPa" }', "A_1": '{ unit = "mm^2" }', "A_2": '{ unit = "mm^2" }'},
                  {"left": "0 mm", "C": "a", "right": "a + b"},
                  [("left", "C", "m", "s1", "taper"), ("C", "right", "m", "s2")], ["left", "right"],
                  '[materials.m]\nelastic_modulus = "E"\n[sections.s1]\nshape = "area"\n'
                  'area = "A_1"\n[sections.s2]\nshape = "area"\narea = "A_2"\n'
                  '[[loads]]\nat = "C"\nforce = "P"\n')
    text = text.replace('name = "taper"', 'name = "taper"\nend_section = "s2"')
    cf = solve_symbolic(parse_model(text, symbolic=True))
    P, a, b, E, A1, A2 = R("P"), S("a"), S("b"), S("E"), S("A_1"), S("A_2")
    f1, f2 = a * sympy.log(A1 / A2) / (E * (A1 - A2)), b / (E * A2)
    assert sympy.simplify(sympy.expand_log(cf.reaction("left") + P * f2 / (f1 + f2))) == 0
    for expr in (*cf.reactions.values(), *cf.displacements.values()):
        assert "log(A_1)" not in str(expr) and "log(A_2)" not in str(expr)


@pytest.mark.parametrize("shape, start, end", [
    ("area", {"area": 4e-4}, {"area": 1e-4}),
    ("round", {"diameter": 0.05}, {"diameter": 0.02}),
    ("tube", {"outer_diameter": 0.06, "inner_diameter": 0.052},
     {"outer_diameter": 0.03, "inner_diameter": 0.018}),
    ("rectangle", {"width": 0.04, "height": 0.01}, {"width": 0.015, "height": 0.02}),
])
def test_tapered_load_integrals_equal_the_numeric_solution(shape, start, end):
    # self-weight and a distributed load on a taper between walls, heated: the closed
    # form (partial fractions, exact logarithms) against the numeric solver's exact taper
    s0 = Section("s0", shape, tuple(start.items()))
    s1 = Section("s1", shape, tuple(end.items()))
    mat = Material("steel", 200e9, 12e-6, density=7850.0)
    model = Model([Station("top", 0.0), Station("mid", 0.7), Station("bottom", 1.2)],
                  [Segment("taper", "top", "mid", mat, s0, end_section=s1, distributed_load=-3e3,
                           temperature_change=25.0),
                   Segment("prism", "mid", "bottom", mat, s1)],
                  [Support("top"), Support("bottom")], [Load("mid", 4e3)], gravity=-9.80665)
    case = solve(model)["base"]
    cf = solve_symbolic(model)
    scale = np.abs(case.axial_force).max()
    for i, seg in enumerate(model.segments):
        for end_ in (0, 1):
            assert abs(cf.evaluate(cf.force(seg.name)[end_]) - case.axial_force[i][end_]) <= 1e-9 * scale
    assert cf.evaluate(cf.displacement("mid")) == pytest.approx(case.displacement("mid"), rel=1e-9)


# --- cases and combinations ----------------------------------------------------------
CASES = series({"P": '"20 kN"', "Q": '"-8 kN"', "dT": '"30 K"', "a": '"200 mm"', "L": '"500 mm"',
                "E": '"200 GPa"', "A": '"300 mm^2"', "alpha": '"12e-6 /K"', "s": '"0.05 mm"'},
               {"left": "0 mm", "C": "a", "right": "L"},
               [("left", "C", "m", "s", "near"), ("C", "right", "m", "s", "far")],
               ["left"], """
[materials.m]
elastic_modulus = "E"
thermal_expansion = "alpha"
[sections.s]
shape = "area"
area = "A"
[[supports]]
at = "right"
kind = "settlement"
displacement = "0 mm"
[[cases]]
name = "dead"
loads = [{ at = "C", force = "P" }]
[[cases]]
name = "live"
loads = [{ at = "C", force = "Q" }]
settlements = [{ at = "right", displacement = "s" }]
[[cases]]
name = "heat"
temperature_change = { all = "dT" }
[[combinations]]
name = "ultimate"
factors = { dead = 1.35, live = 1.5, heat = 0.6 }
""")


def test_a_combination_equals_its_factored_model():
    # superposition of linear-elastic load cases (Gere and Goodno, Mechanics of
    # Materials, principle of superposition; from memory): the combination's closed
    # form is that of one model carrying the factored loads, and the factored sum of
    # the cases' closed forms
    model = parse_model(CASES, "cases.toml", symbolic=True)
    combo = solve_symbolic(model, case="ultimate")
    assert combo.case == "ultimate"
    factored = CASES[:CASES.index("[[cases]]")] + """
[[loads]]
at = "C"
force = "27/20*P + 3/2*Q"
[settings]
temperature_change = "3/5*dT"
"""
    factored = factored.replace('displacement = "0 mm"', 'displacement = "3/2*s"')
    one = solve_symbolic(parse_model(factored, "factored.toml", symbolic=True))
    parts = {c: solve_symbolic(model, case=c) for c in ("dead", "live", "heat")}
    weights = {"dead": sympy.Rational(27, 20), "live": sympy.Rational(3, 2), "heat": sympy.Rational(3, 5)}
    for group in ("reactions", "displacements"):
        for key, expr in getattr(combo, group).items():
            assert same(expr, getattr(one, group)[key])
            assert same(expr, sum(w * getattr(parts[c], group)[key] for c, w in weights.items()))
    for seg, (n_from, n_to) in combo.axial_forces.items():
        assert same(n_from, one.axial_forces[seg][0]) and same(n_to, one.axial_forces[seg][1])


def test_every_case_evaluates_to_the_numeric_solution():
    model = parse_model(CASES, "cases.toml", symbolic=True)
    solution = solve(numeric_model(model))
    assert solution.names == ("dead", "live", "heat", "ultimate")
    for case in solution:
        cf = solve_symbolic(model, case=case.name)
        for stn in model.stations:
            assert cf.evaluate(cf.displacement(stn.name)) == pytest.approx(
                case.displacement(stn.name), rel=1e-12, abs=1e-18)
        for sup in model.supports:
            assert cf.evaluate(cf.reaction(sup.at)) == pytest.approx(case.reaction(sup.at), rel=1e-12)
        for seg in model.segments:
            assert cf.evaluate(cf.force(seg.name)[0]) == pytest.approx(case.force(seg.name)[0], rel=1e-12)


def test_the_case_option_picks_one(tmp_path):
    path = tmp_path / "cases.toml"
    path.write_text(CASES)
    # the left wall's reaction, by superposition (Gere and Goodno, Mechanics of Materials,
    # statically indeterminate axial members and thermal effects; from memory): a load F
    # at C gives -F*b/L, a settlement s of the right wall -E*A*s/L, heating the bar
    # between walls E*A*alpha*dT; with P = 20 kN, Q = -8 kN, b = 300 mm, L = 500 mm,
    # E*A = 6e7 N, s = 0.05 mm, alpha*dT = 3.6e-4
    dead, live, heat = -20e3 * 0.3 / 0.5, 8e3 * 0.3 / 0.5 - 6e7 * 0.05e-3 / 0.5, 6e7 * 3.6e-4
    expected = {"live": live, "ultimate": 1.35 * dead + 1.5 * live + 0.6 * heat}
    for name in ("live", "ultimate"):
        result = runner.invoke(app, ["closed-form", str(path), "--case", name, "-f", "json"])
        assert result.exit_code == 0, result.output
        data = json.loads(result.output)
        assert data["case"] == name
        entry = data["reactions"]["left"]
        assert entry["value"] == pytest.approx(expected[name], rel=1e-12)  # N
        assert entry["numeric"] == pytest.approx(expected[name], rel=1e-9)
    live = json.loads(runner.invoke(app, ["closed-form", str(path), "--case", "live", "-f",
                                          "json"]).output)
    assert "Q" in live["reactions"]["left"]["expression"]
    assert "P" not in live["reactions"]["left"]["expression"]
    result = runner.invoke(app, ["closed-form", str(path), "--case", "lve"])
    assert result.exit_code == 2
    assert result.output.strip() == "error: --case: unknown case 'lve'; did you mean 'live'?"


def test_the_conditions_are_shown_with_any_selection():
    # a formula of a contact state is read with the conditions under which that state holds
    path = str(EXAMPLES / "closed-form-heated-bar-gap.toml")
    text = runner.invoke(app, ["closed-form", path, "--only", "reactions"]).output
    assert "the formulas hold while all of these hold:\n  dT >= c/(L_1*alpha_1 + L_2*alpha_2)\n" in text
    assert "gap forces" not in text
    data = json.loads(runner.invoke(app, ["closed-form", path, "--only", "gaps", "-f", "json"]).output)
    assert data["conditions"] == ["dT >= c/(L_1*alpha_1 + L_2*alpha_2)"]
    assert set(data) & {"reactions", "displacements", "gaps"} == {"gaps"}


def test_a_model_without_symbols_says_how_to_get_formulas():
    text = runner.invoke(app, ["closed-form", str(EXAMPLES / "rail-expansion-joint.toml")]).output
    assert "no [symbols] declared, so each closed form is an exact number" in text
    assert "the contact state holds without a condition left" in text


SLACK = series({"P": '"30 kN"', "L": '"500 mm"', "E": '"200 GPa"', "A": '"100 mm^2"', "c": '"0.2 mm"'},
               {"anchor": "0 mm", "tip": "L", "post": "L + 100 mm"},
               [("anchor", "tip", "m", "s")], ["anchor", "post"], ONE_MATERIAL + """
[[loads]]
at = "tip"
force = "-P"
[[gaps]]
name = "tether"
between = ["tip", "post"]
clearance = "c"
kind = "slack"
""")


def test_a_slack_link_that_goes_taut():
    # A bar fixed at one end, pushed by P at its tip, tied back to a fixed post by a
    # link of slack c: taut when P*L/(E*A) >= c, then the link pulls with P - E*A*c/L and
    # the tip stops at -c (compatibility and equilibrium of the tip, as for a gap that
    # closes; Gere and Goodno, Mechanics of Materials, statically indeterminate bars; from
    # memory)
    model = parse_model(SLACK, "slack.toml", symbolic=True)
    P, L, E, A, c = R("P"), S("L"), S("E"), S("A"), S("c")
    taut = solve_symbolic(model)
    assert taut.gap_closed == {"tether": True}
    assert same(taut.gap("tether"), P - E * A * c / L)  # tension
    assert taut.conditions == (sympy.Ge(P, A * E * c / L),)
    assert same(taut.displacement("tip"), -c)
    slack = solve_symbolic(model, assume={"tether": False})
    assert slack.gap("tether") == 0
    assert slack.conditions == (sympy.Le(P, A * E * c / L),)
    assert any("fails for the given values" in note for note in slack.notes)
    case = solve(numeric_model(model))["base"]
    assert taut.evaluate(taut.gap("tether")) == pytest.approx(case.gap("tether")["force"], rel=1e-12)


def test_assume_on_a_model_without_gaps():
    path = str(EXAMPLES / "stepped-rod-between-walls.toml")
    result = runner.invoke(app, ["closed-form", path, "--assume", "x=open"])
    assert result.exit_code == 2
    assert result.output.strip() == "error: --assume: the model has no gaps (got 'x')"


def test_latex_conditions():
    path = str(EXAMPLES / "closed-form-heated-bar-gap.toml")
    text = runner.invoke(app, ["closed-form", path, "--latex", "--only", "gaps"]).output
    assert "  dT \\geq \\frac{c}{L_{1} \\alpha_{1} + L_{2} \\alpha_{2}}\n" in text
