"""The model file: every kind of bad input gives one located line; good input reads right.

Each bad-input test edits one line of a small valid model and asserts the exact
message: file name, 1-based line number, place in the model, what is wrong and
the suggestion.  Line numbers are those of BASE below (counted by hand).
"""

import glob
import os
import tomllib
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

from axialfe.errors import ModelError, SolveError, UnitError
from axialfe.io.modelfile import builtin_materials, parse_model, read_model
from axialfe.engine.system import solve
from conftest import EXAMPLES

BASE = """\
title = "base"

[settings]
reference_temperature = "20 degC"

[materials.housing-alloy]
elastic_modulus = "70 GPa"
thermal_expansion = "23e-6 /K"

[sections.rod-30]
shape = "round"
diameter = "30 mm"

[stations]
left = "0 mm"
joint = "250 mm"
right = "600 mm"

[[segments]]
name = "sleeve"
from = "left"
to = "joint"
material = "housing-alloy"
section = "rod-30"

[[segments]]
from = "joint"
to = "right"
material = "structural-steel"
section = "rod-30"

[[supports]]
at = "left"
kind = "fixed"

[[loads]]
at = "joint"
force = "-12 kN"
"""
# line numbers of BASE used below
L_MOD, L_ALPHA, L_SHAPE, L_DIAM = 7, 8, 11, 12
L_RIGHT, L_SEG1_SECTION, L_SEG2_FROM, L_SEG2_TO, L_SEG2_MAT, L_SEG2_SECTION = 17, 24, 27, 28, 29, 30
L_SUP_KIND, L_LOAD_AT, L_FORCE = 34, 37, 38


def edit(line, new, text=BASE):
    """Replace 1-based ``line`` of ``text`` by ``new`` (which may hold several lines)."""
    lines = text.split("\n")
    lines[line - 1] = new
    return "\n".join(lines)


def error(text, exc=ModelError):
    """Read and solve ``text`` as 'bar.toml'; return the error message."""
    with pytest.raises(exc) as err:
        solve(parse_model(text, "bar.toml"))
    message = str(err.value)
    assert "\n" not in message
    return message


def test_base_model_reads_and_solves():
    model = parse_model(BASE, "bar.toml")
    assert model.title == "base"
    assert [s.name for s in model.stations] == ["left", "joint", "right"]
    assert [s.name for s in model.segments] == ["sleeve", "joint-right"]  # default name
    assert model.segments[0].material.elastic_modulus == 70e9
    assert model.segments[0].section.area == pytest.approx(3.141592653589793 * 0.015**2, rel=1e-15)
    assert model.reference_temperature == pytest.approx(293.15, rel=1e-15)
    assert model.source == "bar.toml"


def test_read_model_names_the_file(tmp_path):
    path = tmp_path / "rod.toml"
    path.write_text(edit(L_FORCE, 'force = "-12"'), encoding="utf-8")
    with pytest.raises(UnitError) as err:
        read_model(path)
    assert str(err.value) == (f"{path}:38: loads[1]: force: '-12' has no unit: give a force, "
                              "e.g. '12 kN'")


def test_unreadable_file(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_bytes(b"title = \"\xff\xfe\"\n")
    with pytest.raises(ModelError) as err:
        read_model(path)
    assert str(err.value).startswith(f"{path}: cannot read the model file: UnicodeDecodeError")


# --- malformed TOML ----------------------------------------------------------

def test_malformed_toml():
    assert error(edit(L_FORCE, 'force = "-12 kN')) == (
        "bar.toml:38: not valid TOML: Illegal character '\\n' (at line 38, column 16)")


def test_duplicate_key_is_malformed_toml():
    assert error(edit(L_RIGHT, 'right = "600 mm"\nleft = "5 mm"')) == (
        "bar.toml:18: not valid TOML: Cannot overwrite a value (at line 18, column 14)")


# --- unknown keys -------------------------------------------------------------

def test_unknown_top_level_key():
    assert error(edit(2, 'setings = "x"')) == (
        "bar.toml:2: top level: unknown key 'setings'; did you mean 'settings'?")


def test_unknown_segment_key():
    assert error(edit(L_SEG1_SECTION, 'section = "rod-30"\nmisfitt = "1 mm"')) == (
        "bar.toml:25: segments[1] ('sleeve'): unknown key 'misfitt'; did you mean 'misfit'?")


def test_unknown_material_key():
    assert error(edit(L_ALPHA, 'thermal_expanson = "23e-6 /K"')) == (
        "bar.toml:8: materials.housing-alloy: unknown key 'thermal_expanson'; "
        "did you mean 'thermal_expansion'?")


def test_unknown_settings_key():
    assert error(edit(4, 'reference_temprature = "20 degC"')) == (
        "bar.toml:4: settings: unknown key 'reference_temprature'; "
        "did you mean 'reference_temperature'?")


def test_unknown_key_without_close_match_lists_the_options():
    assert error(edit(L_FORCE + 1, 'colour = "red"')) == (
        "bar.toml:39: loads[1]: unknown key 'colour'; expected one of: 'at', 'force'")


# --- unknown names --------------------------------------------------------------

def test_unknown_station():
    assert error(edit(L_SEG2_TO, 'to = "rigth"')) == (
        "bar.toml:28: segments[2]: unknown station 'rigth'; did you mean 'right'?")


def test_unknown_station_of_a_load():
    assert error(edit(L_LOAD_AT, 'at = "jont"')) == (
        "bar.toml:37: loads[1]: unknown station 'jont'; did you mean 'joint'?")


def test_unknown_own_material():
    assert error(edit(L_SEG2_MAT, 'material = "housing-aloy"')) == (
        "bar.toml:29: segments[2]: unknown material 'housing-aloy'; did you mean 'housing-alloy'?")


def test_unknown_builtin_material():
    assert error(edit(L_SEG2_MAT, 'material = "structral-steel"')) == (
        "bar.toml:29: segments[2]: unknown material 'structral-steel'; "
        "did you mean 'structural-steel'?")


def test_unknown_section():
    assert error(edit(L_SEG2_SECTION, 'section = "rod30"')) == (
        "bar.toml:30: segments[2]: unknown section 'rod30'; did you mean 'rod-30'?")


def test_unknown_choice_lists_options():
    assert error(edit(L_SUP_KIND, 'kind = "fixd"')) == (
        "bar.toml:34: supports[1]: unknown support kind 'fixd'; did you mean 'fixed'?")
    assert error(edit(L_SHAPE, 'shape = "rond"')) == (
        "bar.toml:11: sections.rod-30: unknown shape 'rond'; did you mean 'round'?")


# --- units ---------------------------------------------------------------------

def test_bare_number():
    assert error(edit(L_DIAM, "diameter = 30")) == (
        "bar.toml:12: sections.rod-30: diameter: a bare number needs a unit: give a length, "
        "e.g. '40 mm'")


def test_number_string_without_unit():
    assert error(edit(L_SEG1_SECTION, 'section = "rod-30"\nmisfit = "0.05"')) == (
        "bar.toml:25: segments[1] ('sleeve'): misfit: '0.05' has no unit: give a length, "
        "e.g. '40 mm'")


def test_station_without_unit():
    assert error(edit(16, "joint = 250")) == (
        "bar.toml:16: stations: joint: a bare number needs a unit: give a length, e.g. '40 mm'")


def test_wrong_dimension():
    assert error(edit(L_FORCE, 'force = "-12 mm"')) == (
        "bar.toml:38: loads[1]: force: 'mm' is a unit of length, not of force, e.g. '12 kN'")
    assert error(edit(L_MOD, 'elastic_modulus = "70 GN"')) == (
        "bar.toml:7: materials.housing-alloy: elastic_modulus: 'GN' is a unit of force, "
        "not of stress, e.g. '250 MPa'")


def test_unknown_unit():
    assert error(edit(L_DIAM, 'diameter = "30 milimetre"')) == (
        "bar.toml:12: sections.rod-30: diameter: unknown unit 'milimetre'")


def test_output_unit_of_wrong_dimension():
    assert error(edit(2, '[units]\nforce = "kPa"')) == (
        "bar.toml:3: units: force: 'kPa' is a unit of stress, not of force, e.g. '12 kN'")


# --- values out of range -------------------------------------------------------

@pytest.mark.parametrize("value", ["-70 GPa", "0 GPa"])
def test_non_positive_modulus(value):
    assert error(edit(L_MOD, f'elastic_modulus = "{value}"')) == (
        f"bar.toml:7: materials.housing-alloy: elastic_modulus must be positive: got '{value}'")


def test_non_positive_diameter():
    assert error(edit(L_DIAM, 'diameter = "-30 mm"')) == (
        "bar.toml:12: sections.rod-30: diameter must be positive: got '-30 mm'")


def test_non_positive_area():
    assert error(edit(L_SHAPE, 'shape = "area"', edit(L_DIAM, 'area = "0 mm^2"'))) == (
        "bar.toml:12: sections.rod-30: area must be positive: got '0 mm^2'")


def test_negative_density():
    assert error(edit(L_ALPHA, 'thermal_expansion = "23e-6 /K"\ndensity = "-1 kg/m^3"')) == (
        "bar.toml:9: materials.housing-alloy: density must be positive: got '-1 kg/m^3'")


def test_zero_spring_stiffness():
    assert error(edit(L_SUP_KIND, 'kind = "spring"\nstiffness = "0 kN/mm"')) == (
        "bar.toml:35: supports[1]: stiffness must be positive: got '0 kN/mm'")


def test_tube_too_thick():
    text = edit(L_SHAPE, 'shape = "tube"', edit(L_DIAM, 'outer_diameter = "30 mm"\n'
                                                     'wall_thickness = "20 mm"'))
    assert error(text) == (
        "bar.toml:13: sections.rod-30: wall_thickness is more than half the outer diameter")


def test_two_stations_at_one_position_joined_by_a_segment():
    # non-positive length: the segment 'joint-right' would have length 0
    assert error(edit(L_RIGHT, 'right = "250 mm"')) == (
        "bar.toml:26: segments[2] ('joint-right'): stations 'joint' and 'right' stand at the "
        "same position; a segment needs a length")


def test_two_stations_at_one_position_without_segment_are_fine():
    text = edit(L_RIGHT, 'right = "600 mm"\nspare = "600 mm"')
    assert len(parse_model(text, "bar.toml").stations) == 4


def test_missing_required_key():
    assert error(edit(L_SEG2_SECTION, "")) == "bar.toml:26: segments[2]: a segment needs 'section'"
    assert error(edit(L_FORCE, "")) == "bar.toml:36: loads[1]: a load needs 'at' and 'force'"
    assert error(edit(L_MOD, "")) == (
        "bar.toml:6: materials.housing-alloy: a material needs 'elastic_modulus'")


def test_parallel_segments_need_their_own_names():
    assert error(edit(L_SEG2_FROM, 'name = "sleeve"\nfrom = "joint"')) == (
        "bar.toml:26: segments[2] ('sleeve'): two segments are named 'sleeve'; parallel "
        "segments need their own names")


# --- mechanisms ------------------------------------------------------------------

def test_mechanism_names_the_floating_stations():
    text = edit(32, "", edit(33, "", edit(L_SUP_KIND, "")))  # no support at all
    assert error(text, SolveError) == (
        "bar.toml:15: stations 'left', 'joint', 'right' float: no support, spring or gap holds "
        "them (a rigid-body mechanism); add a support or connect them")


def test_mechanism_of_one_detached_part():
    text = edit(L_RIGHT, 'right = "600 mm"\nfar = "900 mm"\nfar2 = "950 mm"')
    text += '\n[[segments]]\nfrom = "far"\nto = "far2"\nmaterial = "copper"\nsection = "rod-30"\n'
    assert error(text, SolveError) == (
        "bar.toml:18: stations 'far', 'far2' float: no support, spring or gap holds them "
        "(a rigid-body mechanism); add a support or connect them")


def test_station_used_by_nothing():
    text = edit(L_RIGHT, 'right = "600 mm"\nspare = "900 mm"')
    assert error(text, SolveError) == (
        "bar.toml:18: station 'spare' is not connected to any segment or gap and has no "
        "support; remove it or connect it")


# --- temperatures -----------------------------------------------------------------

def test_temperature_change_key():
    model = parse_model(edit(L_SEG1_SECTION, 'section = "rod-30"\ntemperature_change = "108 degF"'))
    assert model.segments[0].temperature_change == pytest.approx(60.0, rel=1e-12)
    assert model.segments[1].temperature_change is None


def test_absolute_temperature_key_against_reference():
    # 95 degC against the reference 20 degC is a change of 75 K
    model = parse_model(edit(L_SEG1_SECTION, 'section = "rod-30"\ntemperature = "95 degC"'))
    assert model.segments[0].temperature_change == pytest.approx(75.0, abs=1e-12)
    model = parse_model(edit(L_SEG1_SECTION, 'section = "rod-30"\ntemperature = "368.15 K"'))
    assert model.segments[0].temperature_change == pytest.approx(75.0, abs=1e-12)


def test_model_wide_temperature_keys():
    model = parse_model(edit(4, 'reference_temperature = "68 degF"\ntemperature = "203 degF"'))
    assert model.temperature_change == pytest.approx(75.0, abs=1e-12)
    model = parse_model(edit(4, 'temperature_change = "60 degC"'))
    assert model.temperature_change == pytest.approx(60.0, abs=1e-12)


def test_both_temperature_keys_refused():
    text = edit(L_SEG2_SECTION, 'section = "rod-30"\ntemperature_change = "5 K"\n'
                                'temperature = "30 degC"')
    assert error(text) == (
        "bar.toml:32: segments[2]: give 'temperature_change' or 'temperature', not both")


def test_absolute_temperature_needs_reference():
    text = edit(4, "", edit(L_SEG2_SECTION, 'section = "rod-30"\ntemperature = "95 degC"'))
    assert error(text) == (
        "bar.toml:31: segments[2]: an absolute 'temperature' needs settings.reference_temperature")


def test_reference_must_be_absolute():
    assert error(edit(4, 'reference_temperature = "20 delta_degC"')) == (
        "bar.toml:4: settings: reference_temperature: '20 delta_degC' is a temperature "
        "difference; an absolute temperature is expected here")


# --- materials --------------------------------------------------------------------

BUILTIN_NAMES = ("structural-steel", "stainless-steel", "aluminium-alloy", "copper", "brass",
                 "bronze", "titanium-alloy", "grey-cast-iron")


def test_builtin_materials_present_with_sources():
    mats = builtin_materials()
    for name in BUILTIN_NAMES:
        assert name in mats
        assert mats[name].source and "verify" in mats[name].source
    # common practice: E of structural steel 200 GPa, aluminium alloys about 69-70 GPa
    assert mats["structural-steel"].elastic_modulus == pytest.approx(200e9, rel=0.03)
    assert mats["aluminium-alloy"].elastic_modulus == pytest.approx(70e9, rel=0.03)


def test_own_material_takes_precedence_over_builtin():
    text = BASE.replace("[materials.housing-alloy]", "[materials.structural-steel]\n"
                        'elastic_modulus = "190 GPa"\n\n[materials.housing-alloy]')
    model = parse_model(text, "bar.toml")
    assert model.segments[1].material.elastic_modulus == 190e9
    assert parse_model(BASE).segments[1].material.elastic_modulus == 200e9


def test_unknown_material_without_close_match_lists_the_materials():
    assert error(edit(L_SEG2_MAT, 'material = "steel"')) == (
        "bar.toml:29: segments[2]: unknown material 'steel'; expected one of: 'housing-alloy', "
        "'structural-steel', 'stainless-steel', 'aluminium-alloy', 'copper', 'brass', 'bronze', "
        "'titanium-alloy', 'bolt-4.6', 'bolt-5.8', 'bolt-8.8', 'bolt-10.9', 'bolt-12.9', "
        "'carbon-steel-pipe', 'stainless-pipe-304', 'stainless-pipe-316', 'grey-cast-iron', "
        "'carbon-steel-hot', 'stainless-304-hot', 'aluminium-6061-hot'")


def test_misspelt_table_header_points_at_its_line():
    assert error(edit(32, "[[support]]")) == (
        "bar.toml:32: top level: unknown key 'support'; did you mean 'supports'?")


def test_name_differing_in_case_is_suggested():
    # 'JOINT' and 'joint' share no letter of the same case: the plain ratio finds nothing
    assert error(edit(L_SEG2_FROM, 'from = "JOINT"')) == (
        "bar.toml:27: segments[2]: unknown station 'JOINT'; did you mean 'joint'?")


@pytest.mark.parametrize("char", ["\u2028", "\u2029", "\u0085"])
def test_line_numbers_count_only_newlines(char):
    # TOML ends a line only at "\n" (TOML 1.0, "Newline means LF (0x0A) or CRLF");
    # other separators inside a comment must not shift the line of a later error
    text = edit(1, f'title = "base"  # a comment with {char} inside')
    assert error(edit(L_DIAM, 'diameter = "-30 mm"', text)).startswith(f"bar.toml:{L_DIAM}:")


def test_a_key_of_an_inline_table_is_located():
    # the error of a key in an inline table names the line of that table
    text = ('[materials]\nbrass = { elastic_modulus = "100 GPa" }\nzinc = { elastic_modulus = "-1 GPa" }\n'
            '[sections.s]\nshape = "area"\narea = "100 mm^2"\n[stations]\na = "0 mm"\nb = "1 m"\n'
            '[[segments]]\nfrom = "a"\nto = "b"\nmaterial = "zinc"\nsection = "s"\n[[supports]]\nat = "a"\n')
    assert error(text) == "bar.toml:3: materials.zinc: elastic_modulus must be positive: got '-1 GPa'"


def test_a_read_model_pickles_and_keeps_its_lines():
    # plain data only (no callback into the reader): a model can go to worker processes
    import pickle

    model = parse_model(BASE, "bar.toml")
    again = pickle.loads(pickle.dumps(model))
    assert again == model and again.line_of("stations.right") == L_RIGHT
    assert solve(again)["base"].reaction("left") == pytest.approx(12e3)


# --- the TOML parser ----------------------------------------------------------------
# Where tomli's compiled build is installed, model files are decoded by it (io/source.py):
# it must read every text as the standard library's tomllib reads it (TOML 1.0), the same
# data or the same message, on mutants of every example.
_TEXTS = [Path(f).read_text(encoding="utf-8")
          for f in sorted(glob.glob(os.path.join(EXAMPLES, "**", "*.toml"), recursive=True))]
_EDITS = st.tuples(st.floats(0, 1), st.sampled_from(["insert", "delete", "repeat"]),
                    st.sampled_from(list("[]{}=\"'.,#\n \\\x0c\t\r1e+-_:TZ") + ["\\e", "\n}"]))


@given(st.sampled_from(range(len(_TEXTS))), st.lists(_EDITS, min_size=1, max_size=3))
def test_the_toml_parser_reads_astomllib_reads(which, edits):
    from axialfe.io.source import toml_loads

    if toml_loads is tomllib.loads:
        pytest.skip("the standard library's parser is the one in use")
    text = _TEXTS[which]
    for at, op, piece in edits:
        i = int(at * len(text))
        text = (text[:i] + piece + text[i:] if op == "insert" else
                text[:i] + text[i + 1:] if op == "delete" else text[:i] + text[i:i + 20] * 2
                + text[i + 20:])

    def outcome(loads):
        try:
            return loads(text)
        except Exception as exc:   # the decode error's class differs; its message must not
            return ("error", str(exc))

    assert outcome(toml_loads) == outcome(tomllib.loads)
