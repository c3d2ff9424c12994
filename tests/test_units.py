"""Units at the edges: conversion factors against published definitions, temperature
keys, and the exact messages for bare numbers and wrong dimensions."""

import math

import pytest

from axialfe.errors import UnitError
from axialfe.units import OutputUnits, parse_quantity, unit_factor


def close(a, b, rel=1e-12):
    return math.isclose(a, b, rel_tol=rel, abs_tol=0.0)


# --- conversion factors -----------------------------------------------------

def test_inch_is_exactly_25_4_mm():
    # NIST SP 811 (2008), appendix B.8: 1 in = 2.54E-02 m exactly (international inch, 1959)
    assert parse_quantity("1 in", "length") == pytest.approx(0.0254, rel=1e-15)
    assert parse_quantity("0.25 in", "length") == pytest.approx(6.35e-3, rel=1e-15)
    assert parse_quantity("2 ft", "length") == pytest.approx(0.6096, rel=1e-15)  # 1 ft = 12 in


def test_pound_force():
    # NIST SP 811 (2008), appendix B.8: 1 lbf = 4.448 222 E+00 N; exact value from
    # 1 lb = 0.453 592 37 kg and standard gravity 9.806 65 m/s^2 (CGPM 1901)
    assert close(parse_quantity("1 lbf", "force"), 4.4482216152605)
    assert close(unit_factor("kip", "force"), 4448.2216152605)


def test_ksi_and_psi():
    # NIST SP 811 (2008), appendix B.8: 1 ksi = 6.894 757 E+06 Pa, 1 psi = 6.894 757 E+03 Pa
    assert parse_quantity("1 ksi", "stress") == pytest.approx(6.894757e6, rel=1e-7)
    assert parse_quantity("1 psi", "stress") == pytest.approx(6.894757e3, rel=1e-7)
    # exact from 1 lbf / (1 in)^2
    assert close(parse_quantity("1 psi", "stress"), 4.4482216152605 / 0.0254**2)


def test_steel_modulus_in_ksi():
    # common practice: E of steel 200 GPa is quoted as about 29,000 ksi
    assert parse_quantity("29000 ksi", "stress") == pytest.approx(200e9, rel=3e-3)
    assert parse_quantity("200 GPa", "stress") / unit_factor("ksi", "stress") == pytest.approx(
        29007.5, rel=1e-5)


@pytest.mark.parametrize("text, kind, si", [
    ("40 mm", "length", 0.04),
    ("120 mm^2", "area", 120e-6),
    ("0.5 in^2", "area", 0.5 * 0.0254**2),
    ("8000 mm^4", "second_moment", 8000e-12),
    ("12 kN", "force", 12e3),
    ("250 MPa", "stress", 250e6),
    ("12e-6 /K", "thermal_expansion", 12e-6),
    ("12e-6 1/K", "thermal_expansion", 12e-6),
    ("1.5 kN/m", "force_per_length", 1500.0),
    ("7850 kg/m^3", "density", 7850.0),
    ("-9.80665 m/s^2", "acceleration", -9.80665),
    ("50 kN/mm", "stiffness", 5e7),
    ("1000 lbf/in", "stiffness", 1000 * 4.4482216152605 / 0.0254),
    ("-0.05 mm", "length", -5e-5),
    ("+3.5e-1 m", "length", 0.35),
])
def test_values_to_si(text, kind, si):
    # definitions of the SI prefixes and the inch/pound: NIST SP 811 (2008), ch. 4 and app. B
    assert close(parse_quantity(text, kind), si)


def test_expansion_per_degree_fahrenheit():
    # a coefficient per degF is 9/5 of the one per K (size of the degree: NIST SP 811, B.8)
    assert close(parse_quantity("6.5e-6 /delta_degF", "thermal_expansion"), 6.5e-6 * 9 / 5)


# --- temperatures ------------------------------------------------------------

@pytest.mark.parametrize("text", ["60 K", "60 delta_degC", "60 degC", "108 degF",
                                  "108 delta_degF", "108 degR"])
def test_temperature_change_is_a_difference(text):
    # a change of 60 degC is a change of 60 K; 1 degF (and 1 degR, Rankine) is 5/9 K
    # (NIST SP 811 (2008), appendix B.8, "degree Fahrenheit" and "degree Rankine")
    assert close(parse_quantity(text, "temperature_difference"), 60.0)


def test_negative_temperature_change_is_cooling():
    assert close(parse_quantity("-40 degC", "temperature_difference"), -40.0)
    assert close(parse_quantity("-72 degF", "temperature_difference"), -40.0)


@pytest.mark.parametrize("text", ["95 degC", "203 degF", "368.15 K"])
def test_absolute_temperature(text):
    # T/K = t/degC + 273.15; t/degF = 1.8 t/degC + 32 (NIST SP 811 (2008), 4.2.1.1, B.8)
    assert close(parse_quantity(text, "temperature"), 368.15)


def test_temperature_against_reference():
    # 95 degC against a reference of 20 degC is a change of 75 K
    dT = parse_quantity("95 degC", "temperature") - parse_quantity("20 degC", "temperature")
    assert dT == pytest.approx(75.0, abs=1e-12)
    dT = parse_quantity("203 degF", "temperature") - parse_quantity("68 degF", "temperature")
    assert dT == pytest.approx(75.0, abs=1e-12)


def test_difference_refused_as_absolute_temperature():
    with pytest.raises(UnitError) as err:
        parse_quantity("60 delta_degC", "temperature")
    assert str(err.value) == ("'60 delta_degC' is a temperature difference; an absolute "
                              "temperature is expected here")


# --- refusals, exact messages -----------------------------------------------

def test_bare_number_refused():
    with pytest.raises(UnitError) as err:
        parse_quantity(40, "length")
    assert str(err.value) == "a bare number needs a unit: give a length, e.g. '40 mm'"
    with pytest.raises(UnitError) as err:
        parse_quantity(2.5, "stress")
    assert str(err.value) == "a bare number needs a unit: give a stress, e.g. '250 MPa'"


def test_number_in_a_string_without_unit_refused():
    with pytest.raises(UnitError) as err:
        parse_quantity("40", "length")
    assert str(err.value) == "'40' has no unit: give a length, e.g. '40 mm'"


def test_wrong_dimension_names_both():
    with pytest.raises(UnitError) as err:
        parse_quantity("40 kN", "length")
    assert str(err.value) == "'kN' is a unit of force, not of length, e.g. '40 mm'"
    with pytest.raises(UnitError) as err:
        parse_quantity("12 mm", "force")
    assert str(err.value) == "'mm' is a unit of length, not of force, e.g. '12 kN'"
    with pytest.raises(UnitError) as err:
        parse_quantity("3 kN", "stiffness")
    assert str(err.value) == "'kN' is a unit of force, not of stiffness, e.g. '50 kN/mm'"
    with pytest.raises(UnitError) as err:
        parse_quantity("20 degC", "stress")
    assert str(err.value) == "'degC' is a unit of temperature, not of stress, e.g. '250 MPa'"


def test_dimensionless_unit_refused():
    with pytest.raises(UnitError) as err:
        parse_quantity("3 %", "length")
    assert str(err.value) == "'%' is a unit of strain, not of length, e.g. '40 mm'"


def test_unknown_unit_refused():
    with pytest.raises(UnitError) as err:
        parse_quantity("40 foo", "length")
    assert str(err.value) == "unknown unit 'foo'"


@pytest.mark.parametrize("value, message", [
    ("abc", "expected a number with a unit, a length, e.g. '40 mm': got 'abc'"),
    ("", "expected a number with a unit, a length, e.g. '40 mm': got ''"),
    (True, "expected a length, e.g. '40 mm': got True"),
    ([40, "mm"], "expected a length, e.g. '40 mm': got [40, 'mm']"),
    ("1e400 mm", "'1e400 mm' is not a finite number"),
])
def test_malformed_values_refused(value, message):
    with pytest.raises(UnitError) as err:
        parse_quantity(value, "length")
    assert str(err.value) == message


def test_expansion_per_degree_celsius():
    # a coefficient "per degC" is per degree of change: the same number per K
    # (size of the degree Celsius: NIST SP 811 (2008), 4.2.1.1)
    assert close(parse_quantity("12e-6 /degC", "thermal_expansion"), 12e-6)


def test_offset_unit_is_no_factor_of_an_absolute_temperature():
    # unit_factor gives scale factors only; absolute temperatures go through parse_quantity
    with pytest.raises(UnitError) as err:
        unit_factor("degC", "temperature")
    assert str(err.value) == "'degC' is an offset unit; use a difference unit such as 'K'"


def test_unit_error_is_a_value_error():
    with pytest.raises(ValueError):
        parse_quantity("40", "length")


# --- output units ------------------------------------------------------------

def test_output_systems():
    assert OutputUnits.system("SI").as_dict() == {"force": "N", "length": "mm",
                                                 "displacement": "mm", "stress": "MPa",
                                                 "temperature": "K"}
    us = OutputUnits.system("US", force="kip")
    assert us.as_dict() == {"force": "kip", "length": "in", "displacement": "in", "stress": "psi",
                            "temperature": "degF"}
    # a temperature change in degF is 5/9 of one in K
    assert us.factor("temperature") == 5 / 9 and OutputUnits().factor("temperature") == 1.0
    with pytest.raises(UnitError) as err:
        OutputUnits(temperature="degC")
    assert str(err.value) == ("a temperature change is shown in K or degF: got 'degC'; expected "
                              "one of: 'K', 'degF'")
    assert close(us.factor("force"), 4448.2216152605)
    assert close(us.factor("length"), 0.0254)


def test_output_unit_checked():
    with pytest.raises(UnitError) as err:
        OutputUnits(force="mm")
    assert str(err.value) == "'mm' is a unit of length, not of force, e.g. '12 kN'"
    with pytest.raises(UnitError) as err:
        OutputUnits.system("metric")
    assert str(err.value) == "unknown unit system 'metric'; expected one of: 'SI', 'US'"
