"""The whitelist parser of model values, and [symbols] in model files."""

from fractions import Fraction

import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from conftest import examples

from axialfe.errors import ModelError, UnitError
from axialfe.symbolic.expressions import parse_expression, read_symbol
from axialfe.io.modelfile import parse_model
from axialfe.engine.system import solve

LENGTH = (("[length]", Fraction(1)),)
FORCE = (("[length]", Fraction(1)), ("[mass]", Fraction(1)), ("[time]", Fraction(-2)))
DIMS = {"a": LENGTH, "L": LENGTH, "P": FORCE, "K": FORCE, "c": LENGTH}


def value(text, kind=None, symbols=DIMS, **values):
    return parse_expression(text, symbols, kind).value({k: Fraction(v) for k, v in values.items()})


# --- exact numbers and units ------------------------------------------------
def test_units_are_exact_fractions():
    # 1 in = 25.4 mm exactly (NIST SP 811, appendix B)
    assert value("0.25 in", "length") == Fraction(635, 100000)
    assert value("50 mm", "length") == Fraction(1, 20)
    assert value("12e-6 /K", "thermal_expansion", symbols={}) == Fraction(12, 10**6)
    assert value("7850 kg/m^3", "density") == 7850
    assert value("1.5 kN/m", "force_per_length") == 1500
    assert value("120 mm^2", "area") == Fraction(120, 10**6)
    assert value("60 degC", "temperature_difference") == 60  # a change of 60 degrees
    # with 'K' declared as a symbol (a force here), '/K' divides by that symbol
    assert parse_expression("12e-6 /K", DIMS).names == {"K"}


def test_precedence_and_forms():
    assert value("L - a", "length", L=3, a=1) == 2
    assert value("-P/2", "force", P=10) == -5
    assert value("2*a", "length", a=Fraction(1, 3)) == Fraction(2, 3)
    assert value("2 (L - a)", "length", L=3, a=1) == 4
    assert value("L/2 + 50 mm", "length", L=1) == Fraction(11, 20)
    assert value("a^2", "area", a=3) == 9
    assert value("a**2", "area", a=3) == 9
    assert value("-a^2", "area", a=3) == -9
    assert value("2^-1 * a", "length", a=1) == Fraction(1, 2)
    assert value("(a^2)^(1/2)", "length", a=4) == pytest.approx(4.0)


def test_a_declared_symbol_wins_over_a_unit():
    # 'a' (annum), 'K' (kelvin) and 'L' (litre) are pint units; declared, they are symbols
    assert parse_expression("a", DIMS, "length").names == {"a"}
    assert parse_expression("2 K", DIMS, "force").names == {"K"}
    # undeclared, 'K' is the kelvin again
    assert parse_expression("25 K", {}, "temperature_difference").value({}) == 25


def test_sympy_objects_are_built_directly():
    syms = {n: sympy.Symbol(n, real=True) for n in DIMS}
    expr = parse_expression("L/2 + 50 mm", DIMS).sympy(syms)
    assert sympy.simplify(expr - (syms["L"] / 2 + sympy.Rational(1, 20))) == 0
    assert parse_expression("-P/2", DIMS).sympy(syms) == -syms["P"] / 2


# --- rejected strings: one line each -------------------------------------------
@pytest.mark.parametrize("text, message", [
    ("__import__('os').system('ls')",
     "'__import__('os').system('ls')': unexpected character \"'\" at position 12; a value may "
     "use numbers, symbol and unit names, + - * / ^ and parentheses"),
    ("a; import os", "'a; import os': unexpected character ';' at position 2; a value may use "
     "numbers, symbol and unit names, + - * / ^ and parentheses"),
    ("lambda: 0", "'lambda: 0': unexpected character ':' at position 7; a value may use "
     "numbers, symbol and unit names, + - * / ^ and parentheses"),
    ("a.__class__", "'a.__class__': unexpected character '.' at position 2; a value may use "
     "numbers, symbol and unit names, + - * / ^ and parentheses"),
    ("L + P", "'L + P': cannot add a force to a length"),
    ("Ll - a", "'Ll - a': unknown name 'Ll': neither a declared symbol nor a unit; did you mean 'L'?"),
    ("L +", "'L +': expected a number, a name or '(' at the end"),
    ("((L)", "'((L)': expected ')' at the end"),
    ("L)", "'L)': unexpected at position 2 (')')"),
    ("2^a", "'2^a': an exponent must be a plain number at position 2 ('^')"),
    ("a^1000", "'a^1000': an exponent of 1000 is out of range (at most 16)"),
    ("1e400 mm", "'1e400 mm': the number 1e400 is out of range"),
    ("1e99999999999 mm", "'1e99999999999 mm': the number 1e99999999999 is out of range"),
    ("", "'': empty value"),
    ("60 degC + a", "'60 degC + a': 'degC' is an offset unit; use a difference unit such as 'K'"),
])
def test_bad_values_are_rejected_with_one_line(text, message):
    with pytest.raises(UnitError) as info:
        parse_expression(text, DIMS)
    assert str(info.value) == message
    assert "\n" not in str(info.value)


def test_wrong_kind_names_both_dimensions():
    with pytest.raises(UnitError) as info:
        parse_expression("P/2", DIMS, "length")
    assert str(info.value) == "'P/2' is a force, but a length is expected here, e.g. '40 mm'"


def test_long_and_deep_values_are_refused():
    with pytest.raises(UnitError, match="too long"):
        parse_expression("a+" * 300 + "a", DIMS)
    with pytest.raises(UnitError, match="nested too deeply"):
        parse_expression("(" * 60 + "a" + ")" * 60, DIMS)
    with pytest.raises(UnitError, match="nested too deeply"):
        parse_expression("-" * 60 + "a", DIMS)


# --- property: the parser agrees with exact arithmetic ---------------------------
def _trees():
    leaf = st.one_of(st.integers(1, 99).map(lambda i: (str(i), Fraction(i))),
                     st.sampled_from([("a", Fraction(3, 7)), ("L", Fraction(5, 2))]))

    def combine(children):
        pair = st.tuples(children, children)
        return st.one_of(
            pair.map(lambda p: (f"({p[0][0]} + {p[1][0]})", p[0][1] + p[1][1])),
            pair.map(lambda p: (f"({p[0][0]} - {p[1][0]})", p[0][1] - p[1][1])),
            pair.map(lambda p: (f"{p[0][0]}*{p[1][0]}", p[0][1] * p[1][1])),
            children.map(lambda c: (f"-{c[0]}", -c[1])),
            children.map(lambda c: (f"({c[0]})^2", c[1] ** 2)))

    return st.recursive(leaf, combine, max_leaves=8)


@settings(max_examples=examples(60))
@given(_trees())
def test_parser_matches_exact_arithmetic(tree):
    text, expected = tree
    dims = {"a": (), "L": ()}  # dimensionless symbols, so any sum is allowed
    parsed = parse_expression(text, dims)
    values = {"a": Fraction(3, 7), "L": Fraction(5, 2)}
    assert parsed.value(values) == expected
    syms = {n: sympy.Symbol(n) for n in dims}
    exact = parsed.sympy(syms).xreplace({syms[n]: sympy.Rational(v.numerator, v.denominator)
                                         for n, v in values.items()})
    assert exact == sympy.Rational(expected.numerator, expected.denominator)


# --- [symbols] entries ---------------------------------------------------------
def test_symbol_entries():
    p = read_symbol("P", "18 kN")
    assert (p.value, p.unit, p.text) == (18000, "kN", "18 kN")
    c = read_symbol("c", {"unit": "mm"})
    assert c.value is None and c.dims == LENGTH
    dt = read_symbol("dT", "25 K")
    assert dt.value == 25
    both = read_symbol("a", {"unit": "mm", "value": "0.2 m"})
    assert both.value == Fraction(1, 5) and both.unit == "mm"


@pytest.mark.parametrize("name, entry, message", [
    ("c", "0.12", "'0.12' has no unit: give one, such as '0.12 mm', or 'dimensionless' for a "
                  "plain number"),
    ("c", 0.12, "a bare number needs a unit: write it like \"0.12 mm\", or declare the symbol "
                "with its unit only: { unit = \"mm\" }"),
    ("c", "a + 1 mm", "'a + 1 mm': a symbol's value is a number with a unit, such as '18 kN' "
                      "(not an expression)"),
    ("c", "2 mm * 3", "'2 mm * 3': a symbol's value is a number with a unit, such as '18 kN' "
                      "(not an expression)"),
    ("c", {"unit": "mmm"}, "unknown unit 'mmm'"),
    ("c", {"unit": "mm", "value": "3 kN"}, "value '3 kN' does not have the dimension of unit 'mm'"),
    ("2c", "1 mm", "'2c' cannot name a symbol: use letters, digits and '_', starting with a "
                   "letter (and no Python keyword)"),
    ("lambda", "1 mm", "'lambda' cannot name a symbol: use letters, digits and '_', starting with "
                       "a letter (and no Python keyword)"),
    ("__x", "1 mm", "'__x' cannot name a symbol: use letters, digits and '_', starting with a "
                    "letter (and no Python keyword)"),
])
def test_bad_symbol_entries(name, entry, message):
    with pytest.raises(UnitError) as info:
        read_symbol(name, entry)
    assert info.value.message == message


# --- in a model file -------------------------------------------------------------
MODEL = """\
title = "rod between walls with a load at a"

[symbols]
P = "18 kN"
a = "200 mm"
L = "500 mm"
K = "25 K"

[materials.steel]
elastic_modulus = "200 GPa"

[sections.rod]
shape = "area"
area = "100 mm^2"

[stations]
left = "0 mm"
mid = "a"
right = "L"

[[segments]]
from = "left"
to = "mid"
material = "steel"
section = "rod"

[[segments]]
from = "mid"
to = "right"
material = "steel"
section = "rod"

[[supports]]
at = "left"

[[supports]]
at = "right"

[[loads]]
at = "mid"
force = "P"
"""


def test_a_model_with_valued_symbols_solves_numerically():
    model = parse_model(MODEL, "rod.toml")
    assert [st.x for st in model.stations] == [0.0, 0.2, 0.5]
    case = solve(model)["base"]
    # fixed-fixed bar, load P at a: R_left = -P*b/L (Timoshenko, Strength of Materials,
    # Part I, statically indeterminate problems in tension and compression; from memory)
    assert case.reaction("left") == pytest.approx(-18000 * 0.3 / 0.5, rel=1e-12)
    assert [d.name for d in model.symbols] == ["P", "a", "L", "K"]


def test_inside_symbols_units_are_units():
    # K is a symbol, but in [symbols] values 'K' is the kelvin: 25 K is a temperature difference
    model = parse_model(MODEL, "rod.toml")
    assert model.symbols[3].value == 25 and model.symbols[3].dims == (("[temperature]", 1),)


def test_plain_values_keep_their_messages():
    text = MODEL.replace('left = "0 mm"', 'left = "0"')
    with pytest.raises(ModelError) as info:
        parse_model(text, "rod.toml")
    assert str(info.value) == "rod.toml:17: stations: left: '0' has no unit: give a length, e.g. '40 mm'"


@pytest.mark.parametrize("old, new, message", [
    ('force = "P"', 'force = "Pp"',
     "rod.toml:41: loads[1]: force: 'Pp': unknown name 'Pp': neither a declared symbol nor a unit; "
     "did you mean 'P'?"),
    ('force = "P"', "force = \"__import__('os').system('ls')\"",
     "rod.toml:41: loads[1]: force: '__import__('os').system('ls')': unexpected character \"'\" "
     "at position 12; a value may use numbers, symbol and unit names, + - * / ^ and parentheses"),
    ('P = "18 kN"', 'P = { unit = "kN" }',
     "rod.toml:41: loads[1]: force: symbol 'P' has no value: give it one in [symbols] to solve "
     "numerically, or see its closed form with 'axialfe closed-form'"),
    ('P = "18 kN"', 'P = "18"',
     "rod.toml:4: symbols: P: '18' has no unit: give one, such as '18 mm', or 'dimensionless' "
     "for a plain number"),
    ('right = "L"', 'right = "L + P"', "rod.toml:19: stations: right: 'L + P': cannot add a force "
                                       "to a length"),
])
def test_model_errors_are_located(old, new, message):
    with pytest.raises(ModelError) as info:
        parse_model(MODEL.replace(old, new), "rod.toml")
    assert str(info.value) == message


def test_expressions_without_symbols():
    text = MODEL.split("[materials.steel]")[1]
    text = "[materials.steel]" + text.replace('"a"', '"250 mm - 50 mm"').replace('"L"', '"0.5 m"')
    text = text.replace('"P"', '"-(2 kN + 16 kN)"')
    model = parse_model(text, "plain.toml")
    assert model.stations[1].x == pytest.approx(0.2, rel=1e-15)
    assert model.loads[0].force == -18000.0


def test_symbolic_reading_is_exact():
    model = parse_model(MODEL, "rod.toml", symbolic=True)
    a = sympy.Symbol("a", real=True)
    assert model.stations[1].x == a
    assert model.segments[0].material.elastic_modulus == 200 * 10**9
    assert isinstance(model.segments[0].section.dimensions[0][1], sympy.Rational)
