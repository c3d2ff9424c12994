"""Stations and segments kept in CSV files: the same model as the TOML form, every bad cell located.

The CSV form is read into the entries the TOML form holds, so a model written
both ways must read to the same arrays and solve to the same numbers, bit for
bit.  The models are invented data.
"""

from __future__ import annotations

import os

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from axialfe.engine.system import solve
from axialfe.errors import ModelError
from axialfe.io.modelfile import read_model

from conftest import examples

HEAD = """title = "bar in two forms"
[materials.st]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
[sections.r20]
shape = "round"
diameter = "20 mm"
[sections.r30]
shape = "round"
diameter = "30 mm"
"""
TAIL = """
[[supports]]
at = "s0"

[[supports]]
at = "{last}"

[[loads]]
at = "s1"
force = "12 kN"
"""


def write_both(folder, xs, rows):
    """The model as TOML alone, and with its stations and segments in CSV files."""
    last = f"s{len(xs) - 1}"
    toml = HEAD + "[stations]\n" + "".join(f's{i} = "{x} mm"\n' for i, x in enumerate(xs))
    columns = ("name", "from", "to", "material", "section", "end_section",
               "temperature_change [K]", "misfit [mm]", "effective_length_factor")
    lines = [",".join(columns)]
    for row in rows:
        toml += "\n[[segments]]\n"
        cells = []
        for col in columns:
            key = col.split(" ")[0]
            value = row.get(key)
            cells.append("" if value is None else str(value))
            if value is None:
                continue
            if "[" in col:
                toml += f'{key} = "{value} {col.split("[")[1][:-1]}"\n'
            elif key == "effective_length_factor":
                toml += f"{key} = {value}\n"
            else:
                toml += f'{key} = "{value}"\n'
        lines.append(",".join(cells))
    toml += TAIL.format(last=last)
    a = folder / "whole.toml"
    a.write_text(toml, encoding="utf-8")
    (folder / "st.csv").write_text("name,x [mm]\n" + "".join(
        f"s{i},{x}\n" for i, x in enumerate(xs)), encoding="utf-8")
    (folder / "seg.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    b = folder / "split.toml"
    b.write_text(HEAD + '[stations]\nfile = "st.csv"\n[segments]\nfile = "seg.csv"\n'
                 + TAIL.format(last=last), encoding="utf-8")
    return a, b


def same_model(a, b):
    ma, mb = read_model(a), read_model(b)
    assert ma.stations == mb.stations and ma.segments == mb.segments
    for key in ma.arrays.__dataclass_fields__:
        np.testing.assert_array_equal(getattr(ma.arrays, key), getattr(mb.arrays, key))
    ra, rb = solve(ma)["base"], solve(mb)["base"]
    np.testing.assert_array_equal(ra.u, rb.u)
    np.testing.assert_array_equal(ra.axial_force, rb.axial_force)
    np.testing.assert_array_equal(ra.reactions, rb.reactions)


def test_a_stepped_bar_in_csv_files_is_the_same_model_as_in_toml(tmp_path):
    xs = ["0", "150.5", "400", "1e3"]
    rows = [{"from": "s0", "to": "s1", "material": "st", "section": "r20",
             "temperature_change": "40", "effective_length_factor": "0.7"},
            {"name": "taper", "from": "s1", "to": "s2", "material": "st", "section": "r20",
             "end_section": "r30", "misfit": "-0.05"},
            {"from": "s2", "to": "s3", "material": "structural-steel", "section": "r30",
             "temperature_change": "-12.5", "misfit": "+1.5e-2"},
            {"name": "parallel", "from": "s1", "to": "s2", "material": "st", "section": "r30"}]
    same_model(*write_both(tmp_path, xs, rows))


@settings(max_examples=examples(10))
@given(st.lists(st.tuples(st.floats(1.0, 500.0), st.floats(-80.0, 80.0).map(lambda v: round(v, 9)),
                          st.sampled_from(["r20", "r30"]), st.booleans()), min_size=1, max_size=8))
def test_random_chains_read_alike_in_both_forms(tmp_path_factory, spec):
    folder = tmp_path_factory.mktemp("forms")
    xs = [0.0]
    for length, *_ in spec:
        xs.append(xs[-1] + length)
    rows = [{"from": f"s{i}", "to": f"s{i + 1}", "material": "st", "section": sec,
             "temperature_change": repr(dt) if hot else None}
            for i, (_, dt, sec, hot) in enumerate(spec)]
    same_model(*write_both(folder, [repr(x) for x in xs], rows))


MODEL = HEAD + '[stations]\nfile = "st.csv"\n[segments]\nfile = "seg.csv"\n' + TAIL.format(last="s2")
STATIONS = "name,x [mm]\ns0,0\ns1,250\ns2,600\n"
SEGMENTS = "from,to,material,section\ns0,s1,st,r20\ns1,s2,st,r30\n"

BAD = [
    # (which file, its text, the error line after 'error: ')
    ("seg.csv", "from,to,material,section,temperature_change [K]\ns0,s1,st,r20,4x0\ns1,s2,st,r30,\n",
     "seg.csv:2: temperature_change [K]: expected a plain number (the unit is in the header): "
     "got '4x0'"),
    ("seg.csv", "from,to,material,section,temperature_change [kN]\ns0,s1,st,r20,40\n",
     "seg.csv:1: temperature_change [kN]: 'kN' is a unit of force, not of temperature "
     "difference, e.g. '60 K'"),
    ("seg.csv", "from,to,material,section,misfit\ns0,s1,st,r20,1\n",
     "seg.csv:1: misfit: a value column names its unit in brackets, e.g. 'misfit [mm]'"),
    ("seg.csv", "from,to,material,section,mishit [mm]\ns0,s1,st,r20,1\n",
     "seg.csv:1: mishit [mm]: unknown column 'mishit'; did you mean 'misfit'?"),
    ("seg.csv", "from,to,material,section,from\n",
     "seg.csv:1: from: the column 'from' appears twice"),
    ("seg.csv", "from,to,material [kg],section\n",
     "seg.csv:1: material [kg]: the column 'material' takes no unit"),
    ("seg.csv", "from,to,material\ns0,s1,st\n",
     "seg.csv:1: header: a segments table file needs the column 'section'"),
    ("seg.csv", "", "seg.csv:1: the table file is empty: it needs a header row"),
    ("seg.csv", SEGMENTS + "s1,s9,st,r20\n", "seg.csv:4: to: unknown station 's9'"),
    ("seg.csv", SEGMENTS.replace("st,r30", "stel,r30"),
     "seg.csv:3: material: unknown material 'stel'; did you mean 'st'?"),
    ("seg.csv", SEGMENTS.replace("st,r30", "st,r31"),
     "seg.csv:3: section: unknown section 'r31'; did you mean 'r30'?"),
    ("seg.csv", SEGMENTS + "s1,s2,st\n", "seg.csv:4: row: expected 4 cells, as the header has: "
     "got 3"),
    ("seg.csv", SEGMENTS + ",s2,st,r20\n", "seg.csv:4: from: an empty cell: every row needs one"),
    ("seg.csv", "from,to,material,section,misfit [mm]\ns0,s1,st,r20,-5e5\ns1,s2,st,r30,\n",
     "seg.csv:2: misfit [mm]: misfit must lie between -100 and 100 m: got '-5e5 mm'"),
    ("seg.csv", "from,to,material,section,misfit [mm],preload [kN]\ns0,s1,st,r20,1,5\n"
     "s1,s2,st,r30,,\n", "seg.csv:2: preload [kN]: give 'misfit' or 'preload', not both"),
    ("seg.csv", SEGMENTS + "s0,s1,st,r20\n", "seg.csv:4: segments[3] ('s0-s1'): two segments "
     "are named 's0-s1'; parallel segments need their own names"),
    ("seg.csv", SEGMENTS + 's1,"s2,st,r20\n', "seg.csv:4: not valid CSV: unexpected end of data"),
    ("st.csv", STATIONS + "s1,700\n", "st.csv:5: name: station 's1' is defined twice"),
    ("st.csv", "name,x [mm],braced\ns0,0,true\ns1,250,yes\ns2,600,\n",
     "st.csv:3: braced: expected true or false: got 'yes'"),
    ("st.csv", "name,x [mm],braced\ns0,0,true\ns1,-2e8,false\ns2,600,\n",
     "st.csv:3: x [mm]: x must lie between -100000 and 100000 m: got '-2e8 mm'"),
    ("st.csv", "name,x\ns0,0\n", "st.csv:1: x: a value column names its unit in brackets, e.g. "
     "'x [mm]'"),
    ("st.csv", STATIONS.replace("250", "nan"), "st.csv:3: x [mm]: expected a plain number (the "
     "unit is in the header): got 'nan'"),
    ("st.csv", STATIONS.replace("250", "1e12"), "st.csv:3: x [mm]: s1 must lie between -100000 "
     "and 100000 m: got '1e12 mm'"),
    ("st.csv", STATIONS.replace("250", "600"), "seg.csv:3: segments[2] ('s1-s2'): stations 's1' "
     "and 's2' stand at the same position; a segment needs a length"),
    ("st.csv", b"name,x [mm]\ns0,0\n\xff\n", "m.toml:12: cannot read the table file 'st.csv': "
     "UnicodeDecodeError: 'utf-8' codec can't decode byte 0xff in position 17: invalid start byte"),
]


@pytest.mark.parametrize("which,text,expected", BAD, ids=[e for _, _, e in BAD])
def test_a_bad_table_file_gives_one_line_at_its_row_and_column(tmp_path, monkeypatch, which,
                                                               text, expected):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.toml").write_text(MODEL, encoding="utf-8")
    (tmp_path / "st.csv").write_text(STATIONS, encoding="utf-8")
    (tmp_path / "seg.csv").write_text(SEGMENTS, encoding="utf-8")
    if isinstance(text, bytes):
        (tmp_path / which).write_bytes(text)
    else:
        (tmp_path / which).write_text(text, encoding="utf-8")
    with pytest.raises(ModelError) as info:
        read_model("m.toml")
    assert str(info.value) == expected


PATHS = [
    ('file = "../st.csv"', "m.toml:14: file: '../st.csv' leaves the model's folder: a table "
     "file must lie in it or below it"),
    ('file = "/etc/hostname"', "m.toml:14: file: '/etc/hostname' is an absolute path: name a "
     "file in the model's folder, relative to it"),
    ('file = "link.csv"', "m.toml:14: file: 'link.csv' leaves the model's folder: a table file "
     "must lie in it or below it"),
    ('file = "none.csv"', "m.toml:14: file: the table file 'none.csv' does not exist"),
    ('file = "sub"', "m.toml:14: file: this is a folder, not a table file 'sub'"),
]


@pytest.mark.parametrize("key,expected", PATHS, ids=[k for k, _ in PATHS])
def test_a_table_file_outside_the_model_folder_is_refused(tmp_path, monkeypatch, key, expected):
    inner = tmp_path / "model"
    inner.mkdir()
    (inner / "sub").mkdir()
    (tmp_path / "st.csv").write_text(STATIONS, encoding="utf-8")
    (inner / "seg.csv").write_text(SEGMENTS, encoding="utf-8")
    (inner / "st.csv").write_text(STATIONS, encoding="utf-8")
    os.symlink(tmp_path / "st.csv", inner / "link.csv")
    (inner / "m.toml").write_text(MODEL.replace('file = "seg.csv"', key), encoding="utf-8")
    monkeypatch.chdir(inner)
    with pytest.raises(ModelError) as info:
        read_model("m.toml")
    assert str(info.value) == expected


def test_a_table_file_in_a_subfolder_is_read(tmp_path):
    (tmp_path / "data").mkdir()
    (tmp_path / "data" / "st.csv").write_text(STATIONS, encoding="utf-8")
    (tmp_path / "seg.csv").write_text(SEGMENTS, encoding="utf-8")
    path = tmp_path / "m.toml"
    path.write_text(MODEL.replace('"st.csv"', '"data/st.csv"'), encoding="utf-8")
    assert [s.name for s in read_model(path).stations] == ["s0", "s1", "s2"]


def test_braced_stations_in_a_table_file_are_the_table_form_of_toml(tmp_path):
    (tmp_path / "st.csv").write_text("name,x [mm],braced\ns0,0,true\ns1,250,FALSE\ns2,600,\n",
                                     encoding="utf-8")
    (tmp_path / "seg.csv").write_text(SEGMENTS, encoding="utf-8")
    (tmp_path / "m.toml").write_text(MODEL, encoding="utf-8")
    whole = MODEL.replace('[stations]\nfile = "st.csv"\n', '[stations]\ns0 = { x = "0 mm", braced '
                          '= true }\ns1 = { x = "250 mm", braced = false }\ns2 = "600 mm"\n')
    (tmp_path / "whole.toml").write_text(whole, encoding="utf-8")
    same_model(tmp_path / "whole.toml", tmp_path / "m.toml")
    assert [s.braced for s in read_model(tmp_path / "m.toml").stations] == [True, False, False]
