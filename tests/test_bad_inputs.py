"""Bad input never crashes, hangs, passes silently or overwrites.

The corpus (``tests/bad_inputs/``) holds a full valid model spoilt in hundreds
of ways: a wrong type, a missing required key and an out-of-range value for
every key of the schema, and hostile inputs written by hand.  Each must give
exactly its expected ``error:`` line, in-process.  The command-line tests below
check the promises about files: an output that is an input is refused, a
failing write leaves the folder as it was, options are checked before anything
is written.
"""

from __future__ import annotations

import os
import sys

import pytest

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "bad_inputs"))

import corpus  # noqa: E402

from axialfe.io import schema  # noqa: E402

with open(corpus.EXPECTED, encoding="utf-8") as _fh:
    _EXPECTED = dict(line.split("\t", 1) for line in _fh.read().split("\n") if line)
_CASES = corpus.all_cases()


def test_the_corpus_is_large_and_every_entry_has_its_expected_line():
    assert len(_CASES) >= 300
    assert sorted(name for name, _ in _CASES) == sorted(_EXPECTED)


def test_the_base_model_of_the_corpus_solves():
    assert corpus.outcome(corpus.dumps(corpus.BASE)) == "solved"


def test_every_key_of_the_schema_is_spoilt_by_some_entry():
    labels = {name.split(":")[1].split(".")[-1] for name, _ in _CASES if ":" in name}
    tables = (schema.SETTINGS, schema.UNITS, schema.MATERIAL, schema.SECTION, schema.STATION,
              schema.SEGMENT, schema.SUPPORT, schema.LOAD, schema.GAP, schema.SETTLEMENT,
              schema.CASE, schema.COMBINATION, schema.CHECKS, schema.LIMIT, schema.PROJECT)
    keys = {k for t in tables for k in t.keys} | set(schema.MODEL.keys)
    # keys the base model cannot hold at once (alternatives of another key) are spoilt by hand
    by_hand = {"temperature", "inner_diameter", "between", "at", "side", "symbols", "loads",
               "segments", "supports", "gaps", "cases", "combinations", "limits", "stations",
               "materials", "sections", "settings", "units", "checks", "x", "braced",
               "project",   # the table itself: project:not-a-table, project:misspelt-key
               # spoilt in their own suites: tests/test_preload.py, tests/test_claims.py
               "preload", "claims", "claims_file",
               # tests/test_plastic.py
               "behaviour", "compressive_yield_strength", "hardening_modulus"}
    assert keys - labels - by_hand == set()


@pytest.mark.parametrize("name,text", _CASES, ids=[n for n, _ in _CASES])
def test_bad_input_gives_its_one_located_line(name, text):
    line = corpus.outcome(text, name)
    assert line == _EXPECTED[name]
    assert line.startswith("error: m.toml") and "\n" not in line
    if not name.startswith(("toml:empty", "toml:only-comment")):
        assert line.startswith("error: m.toml:"), "every error but an empty file names a line"


# --- joint and fit files: their toleranced values ------------------------------------
import workflows  # noqa: E402

with open(workflows.EXPECTED, encoding="utf-8") as _fh:
    _WORKFLOWS = {name: (int(code), line) for name, code, line in
                  (row.split("\t") for row in _fh.read().split("\n") if row)}
_WORKFLOW_CASES = workflows.all_cases()


def test_every_joint_and_fit_entry_has_its_expected_line():
    assert sorted(name for name, _, _ in _WORKFLOW_CASES) == sorted(_WORKFLOWS)


@pytest.mark.parametrize("name,kind,text", _WORKFLOW_CASES, ids=[n for n, _, _ in _WORKFLOW_CASES])
def test_a_bad_tolerance_of_a_joint_or_fit_file_gives_one_located_line(tmp_path, name, kind, text):
    code, lines = workflows.outcome(kind, text, str(tmp_path))
    assert (code, " | ".join(lines)) == _WORKFLOWS[name]
    assert code == 2 and len(lines) == 1 and lines[0].startswith(f"error: {kind}.toml:")


# --- line numbers as TOML counts them ----------------------------------------------
@pytest.mark.parametrize("sep", ["\u2028", "\u2029", "\u0085"])
def test_unicode_line_separators_do_not_shift_line_numbers(sep):
    from axialfe.errors import ModelError
    from axialfe.io.modelfile import parse_model

    text = f'title = "a{sep}b{sep}c"\n[stations]\na = "0"\n'
    with pytest.raises(ModelError) as err:
        parse_model(text, "m.toml")
    assert str(err.value) == "m.toml:3: stations: a: '0' has no unit: give a length, e.g. '40 mm'"


def test_crlf_and_a_byte_order_mark_keep_the_count():
    from axialfe.errors import ModelError
    from axialfe.io.modelfile import parse_model

    text = '\ufefftitle = "t"\r\n\r\n[stations]\r\na = "0"\r\n'
    with pytest.raises(ModelError) as err:
        parse_model(text, "m.toml")
    assert str(err.value) == "m.toml:4: stations: a: '0' has no unit: give a length, e.g. '40 mm'"


def test_an_error_at_the_end_of_the_document_names_the_last_line():
    from axialfe.errors import ModelError
    from axialfe.io.modelfile import parse_model

    with pytest.raises(ModelError) as err:
        parse_model('title = "t"\n\n[stations]\na = ', "m.toml")
    assert str(err.value) == "m.toml:4: not valid TOML: Invalid value (at end of document)"


# --- files ---------------------------------------------------------------------------
EXAMPLE = os.path.join(os.path.dirname(__file__), os.pardir, "examples", "shaft-end-float.toml")
FIT = os.path.join(os.path.dirname(__file__), os.pardir, "examples", "fits", "bronze-bushing.toml")


@pytest.fixture
def model_copy(tmp_path):
    path = tmp_path / "model.toml"
    with open(EXAMPLE, "rb") as fh:
        path.write_bytes(fh.read())
    return path


@pytest.mark.parametrize("command", [
    ["solve"], ["check"], ["closed-form"], ["plot"], ["report"],
    ["sweep", "--temperature-change", "0 K..90 K", "--steps", "3"],
    ["path", "--path", "load 0..1"], ["collapse"]])
def test_every_command_refuses_to_write_over_its_model(cli, model_copy, command):
    before = model_copy.read_bytes()
    name = model_copy.name
    result = cli(command[0], model_copy, *command[1:], "-o", model_copy)
    assert result.exit_code == 2
    assert result.output.strip().splitlines()[-1] == (
        f"error: --output: '{model_copy}' is an input file of this command; it would be "
        "overwritten: choose another output path")
    assert model_copy.read_bytes() == before and sorted(os.listdir(model_copy.parent)) == [name]


def test_a_path_to_the_same_file_by_another_name_is_refused(cli, model_copy):
    other = model_copy.parent / "sub" / ".." / "model.toml"
    (model_copy.parent / "sub").mkdir()
    result = cli("solve", model_copy, "-o", other)
    assert result.exit_code == 2 and "is an input file of this command" in result.output


def test_the_fit_command_refuses_to_write_over_its_fit_file(cli, tmp_path):
    path = tmp_path / "fit.toml"
    with open(FIT, "rb") as fh:
        original = fh.read()
    path.write_bytes(original)
    result = cli("fit", path, "-o", path)
    assert result.exit_code == 2 and "is an input file of this command" in result.output
    assert path.read_bytes() == original


def test_a_bad_plot_name_is_refused_before_the_json_is_written(cli, model_copy):
    out = model_copy.parent / "out.json"
    result = cli("sweep", model_copy, "--temperature-change", "0 K..90 K", "--steps", "3",
                 "-f", "json", "-o", out, "--plot", model_copy.parent / "bad.bmp")
    assert result.exit_code == 2
    assert result.output.strip() == (f"error: {model_copy.parent / 'bad.bmp'}: cannot write a "
                                     "figure as '.bmp'; expected one of: '.png', '.svg'")
    assert not out.exists()


def test_two_outputs_of_one_command_may_not_share_a_file(cli, model_copy):
    out = model_copy.parent / "out.svg"
    result = cli("sweep", model_copy, "--temperature-change", "0 K..90 K", "--steps", "3",
                 "-o", out, "--plot", out)
    assert result.exit_code == 2
    assert result.output.strip() == (f"error: --plot: '{out}' is also given to --output; give "
                                     "each output its own file")


def test_a_failing_write_leaves_the_folder_as_it_was(tmp_path, monkeypatch):
    from axialfe.errors import ModelError
    from axialfe.io import files

    target = tmp_path / "out.txt"
    target.write_text("the old content", encoding="utf-8")

    def broken_fsync(fd):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(files.os, "fsync", broken_fsync)
    with pytest.raises(ModelError) as err:
        files.write_text(target, "new " * 1000)
    assert str(err.value) == f"{target}: cannot write the file: No space left on device"
    assert target.read_text(encoding="utf-8") == "the old content"
    assert sorted(os.listdir(tmp_path)) == ["out.txt"]


def test_a_failing_figure_leaves_no_partial_file(tmp_path, monkeypatch):
    from axialfe.errors import ModelError
    from axialfe.io import files

    target = tmp_path / "fig.png"
    with pytest.raises(RuntimeError):
        with files.atomic_path(target) as tmp:
            tmp.write_bytes(b"half a figure")
            raise RuntimeError("drawing failed")
    assert os.listdir(tmp_path) == []
    with pytest.raises(ModelError):
        with files.atomic_path(tmp_path / "nodir" / "x.png"):
            pass


def test_init_into_a_missing_folder_is_one_line(cli, tmp_path):
    result = cli("init", tmp_path / "nodir" / "new.toml")
    assert result.exit_code == 2
    assert result.output.strip() == f"error: PATH: the folder '{tmp_path / 'nodir'}' does not exist"


def test_outputs_keep_their_permissions_sane(cli, model_copy):
    out = model_copy.parent / "out.txt"
    assert cli("solve", model_copy, "-o", out).exit_code == 0
    assert out.stat().st_mode & 0o644 == 0o644 and "wrote" in cli("solve", model_copy, "-o", out).output


# --- limits ------------------------------------------------------------------------
def test_a_device_is_not_read(cli):
    result = cli("solve", "/dev/zero")
    assert result.exit_code == 2
    assert result.output.strip() == ("error: /dev/zero: not a regular file (a device, a pipe or "
                                     "a socket): give a model file")


def test_a_fifo_is_not_opened(cli, tmp_path):
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    result = cli("check", fifo)
    assert result.exit_code == 2 and "not a regular file" in result.output


def test_a_file_beyond_the_size_limit_is_refused(tmp_path, monkeypatch):
    from axialfe.errors import ModelError
    from axialfe.io import limits
    from axialfe.io.modelfile import read_model

    monkeypatch.setattr(limits, "MAX_FILE_BYTES", 100)
    path = tmp_path / "big.toml"
    path.write_text("# " + "x" * 200 + "\n", encoding="utf-8")
    with pytest.raises(ModelError) as err:
        read_model(path)
    assert str(err.value) == f"{path}: the file is larger than the limit of 0 MB"


def test_sweep_steps_have_an_upper_bound(cli):
    result = cli("sweep", EXAMPLE, "--temperature-change", "0 K..90 K", "--steps", "10000000",
                 "-f", "json")
    assert result.exit_code == 2
    assert result.output.strip() == "error: --steps: must be at most 100000: got 10000000"


@pytest.mark.parametrize("option,value,message", [
    ("--temperature-change", "-1e308 K..1e308 K", "error: --temperature-change: a temperature "
     "change must lie between -100000 and 100000 K: got -1e+308 K"),
    ("--load-factor", "0..1e300", "error: --load-factor: a load factor must lie between -1e+06 "
     "and 1e+06: got 1e+300"),
    ("--temperature", "20 degC..1e300 degC", "error: --temperature: a temperature must be at "
     "most 100000 K: got 1e+300 degC"),
])
def test_sweep_ranges_are_bounded(cli, option, value, message):
    result = cli("sweep", EXAMPLE, option, value, "--steps", "3")
    assert result.exit_code == 2 and result.output.strip() == message


def test_a_sweep_below_absolute_zero_from_the_reference_is_refused(cli):
    rail = os.path.join(os.path.dirname(EXAMPLE), "rail-expansion-joint.toml")
    result = cli("sweep", rail, "--temperature-change", "-400 K..0 K", "--steps", "3")
    assert result.exit_code == 2
    assert result.output.strip() == ("error: --temperature-change: a change of -400 K from the "
                                     "reference 285.15 K is at or below absolute zero")


@pytest.mark.parametrize("unit", ["9**9**9 kN", "kN^9^9", "(kN^2)^9"])
def test_a_power_tower_as_an_output_unit_is_refused_at_once(cli, unit):
    result = cli("solve", EXAMPLE, "--force-unit", unit)
    assert result.exit_code == 2 and "a power of a power is not accepted" in result.output


def test_the_numerics_raise_instead_of_warning():
    import numpy as np

    from axialfe.cli.guards import numerics_guarded
    from axialfe.errors import SolveError

    with pytest.raises(SolveError) as err:
        with numerics_guarded("m.toml"):
            np.array([1e308]) * 10
    assert str(err.value) == ("m.toml: the arithmetic failed (overflow encountered in multiply): "
                              "some value is so large or so small that the numbers overflow; "
                              "check the sizes of the inputs")
