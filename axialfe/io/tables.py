"""Tables of a model kept in CSV files: ``[stations] file = ...``, ``[segments] file = ...``.

A big model may keep its stations and segments in CSV files beside the model
file instead of in TOML, which is slow to parse at tens of thousands of
entries::

    [stations]
    file = "stations.csv"      # columns: name, x [mm], and optional braced (true or false)

    [segments]
    file = "segments.csv"      # columns: from, to, material, section, and optional
                               # name, end_section and value columns, e.g. misfit [mm]

A value column names its unit in the header, in brackets, once; its cells are
plain numbers, and an empty cell leaves the key out of that row.  This module
turns each row into the very entry the TOML form would hold (the cell's number
followed by the header's unit), so the model reader checks and converts both
forms by the same code and reads them to the same model.

A table file is untrusted input like the model file: it must lie in the model
file's folder or below it (an absolute path, or one that leaves the folder
through ``..`` or a link, is refused), it is a regular file within the size
limit (:mod:`axialfe.io.source`), and nothing in it is evaluated.  Errors are
located as ``FILE.csv:LINE: column: message``.
"""

from __future__ import annotations

import csv
import re
from dataclasses import dataclass, field
from pathlib import Path, PurePath

from ..errors import ModelError, suggest
from ..units import parse_quantity
from .schema import FILE_TABLE, SEGMENT, STATION, check_types
from .source import read_text

__all__ = ["Row", "expand_tables"]

_HEADER = re.compile(r"^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[\s*([^\[\]]*?)\s*\])?\s*$")
_NUMBER = re.compile(r"^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$")
# the columns each table reads: text columns, and value columns (a quantity of a kind
# with its unit in the header, or a plain number)
_TEXT = {"stations": ("name", "braced"),
         "segments": ("name", "from", "to", "material", "section", "end_section")}
_REQUIRED = {"stations": ("name", "x"), "segments": ("from", "to", "material", "section")}
_SCHEMA = {"stations": STATION, "segments": SEGMENT}


@dataclass(frozen=True)
class Row:
    """Where an entry born from a table file stands: the file, its line, its columns."""

    file: str
    line: int
    columns: dict = field(default_factory=dict)   # the entry's key -> the column header


def _value_columns(table):
    """``{key: Key}`` of the quantity and number columns a table reads."""
    keys = _SCHEMA[table].keys
    return {k: spec for k, spec in keys.items()
            if spec.type in ("quantity", "number") and k != "braced"}


def _locate(name: str, model_source: str | None, line: int | None) -> Path:
    """The table file ``name`` as a path inside the model file's folder (or a located error)."""
    where = dict(file=model_source, line=line, place="file")
    if model_source is None:
        raise ModelError("a table file is read beside its model file; read the model from a "
                         "file", **where)
    if not name.strip():
        raise ModelError("expected a file name in quotes: got ''", **where)
    if any(ord(c) < 32 or ord(c) == 127 for c in name):
        raise ModelError("a file name holds no control characters", **where)
    pure = PurePath(name)
    if pure.is_absolute() or pure.drive or name.startswith(("/", "\\")):
        raise ModelError(f"'{name}' is an absolute path: name a file in the model's folder, "
                         "relative to it", **where)
    folder = Path(model_source).parent
    path = folder / pure
    try:
        inside = path.resolve().is_relative_to(folder.resolve())
    except (OSError, RuntimeError, ValueError):  # a loop of links, a name the system refuses
        inside = False
    if ".." in pure.parts or not inside:
        raise ModelError(f"'{name}' leaves the model's folder: a table file must lie in it or "
                         "below it", **where)
    return path


def _header(cells, table, shown):
    """The columns of a header row: ``[(key, unit or None, header text)]``."""
    values = _value_columns(table)
    known = [*_TEXT[table], *values]
    columns, seen = [], set()
    for text in cells:
        m = _HEADER.match(text)
        if m is None:
            raise ModelError("expected a column name, with its unit in brackets for a value "
                             "(e.g. 'x [mm]')", file=shown, line=1, place=f"column '{text}'")
        key, unit = m.group(1), m.group(2)
        if key not in known:
            raise ModelError(f"unknown column '{key}'", file=shown, line=1, place=text.strip(),
                             hint=suggest(key, known), options=known)
        if key in seen:
            raise ModelError(f"the column '{key}' appears twice", file=shown, line=1,
                             place=text.strip())
        seen.add(key)
        spec = values.get(key)
        if spec is not None and spec.type == "quantity":
            if not unit:
                raise ModelError(f"a value column names its unit in brackets, e.g. '{key} "
                                 f"[{_EXAMPLE_UNIT.get(spec.kind, 'unit')}]'", file=shown,
                                 line=1, place=text.strip())
            try:
                parse_quantity(f"1 {unit}", spec.kind)
            except ModelError as exc:
                raise ModelError(exc.message, file=shown, line=1, place=text.strip(),
                                 hint=exc.hint, options=exc.options) from None
        elif unit is not None:
            raise ModelError(f"the column '{key}' takes no unit", file=shown, line=1,
                             place=text.strip())
        columns.append((key, unit, text.strip()))
    missing = [k for k in _REQUIRED[table] if k not in seen]
    if missing:
        raise ModelError(f"a {table} table file needs the column '{missing[0]}'", file=shown,
                         line=1, place="header")
    return columns


_EXAMPLE_UNIT = {"length": "mm", "temperature_difference": "K", "temperature": "degC",
                 "force": "kN", "force_per_length": "kN/m"}


def read_table(path: Path, table: str, shown: str, model_source=None, line=None):
    """The rows of a table file as ``[(entry, Row)]``, the entries as the TOML form holds them.

    ``model_source`` and ``line`` locate the key that names the file (for a file
    that cannot be read).
    """
    text = read_text(path, f"table file '{path}'", file=model_source, line=line, place="file")
    lines = text.splitlines()
    reader = csv.reader(lines, strict=True)
    try:
        header = next(reader, None)
    except csv.Error as exc:
        raise ModelError(f"not valid CSV: {exc}", file=shown, line=1) from None
    if header is None:
        raise ModelError("the table file is empty: it needs a header row", file=shown, line=1)
    columns = _header(header, table, shown)
    required = _REQUIRED[table]
    values = _value_columns(table)
    out = []
    while True:
        try:
            cells = next(reader)
        except StopIteration:
            break
        except csv.Error as exc:
            raise ModelError(f"not valid CSV: {exc}", file=shown, line=reader.line_num) from None
        line = reader.line_num
        if not cells or all(not c.strip() for c in cells):
            continue  # a blank line
        if len(cells) != len(columns):
            raise ModelError(f"expected {len(columns)} cells, as the header has: got "
                             f"{len(cells)}", file=shown, line=line, place="row")
        entry, names = {}, {}
        for (key, unit, head), cell in zip(columns, cells):
            cell = cell.strip()
            if not cell:
                if key in required:
                    raise ModelError("an empty cell: every row needs one", file=shown,
                                     line=line, place=head)
                continue
            spec = values.get(key)
            if key == "braced":
                if cell.lower() not in ("true", "false"):
                    raise ModelError(f"expected true or false: got '{cell}'", file=shown,
                                     line=line, place=head)
                entry[key] = cell.lower() == "true"
            elif spec is None:
                entry[key] = cell
            elif not _NUMBER.match(cell):
                raise ModelError(f"expected a plain number (the unit is in the header): got "
                                 f"'{cell}'", file=shown, line=line, place=head)
            elif spec.type == "quantity":
                entry[key] = f"{cell} {unit}"
            else:
                entry[key] = float(cell)
            names[key] = head
        out.append((entry, Row(shown, line, names)))
    return out


def expand_tables(data: dict, source: str | None, line_of) -> dict:
    """Replace ``[stations] file`` and ``[segments] file`` of ``data`` by the tables they name.

    ``line_of(table, key)`` gives the model file's line of a key.  Returns where
    each entry born from a table file stands: ``{('stations', name): Row,
    ('segments', index): Row}`` (index 1-based, as the reader counts).  ``data``
    is changed in place.

    Raises
    ------
    ModelError
        For a file that cannot be used, a bad header or a bad cell, located in
        the model file or the table file.
    """
    rows = {}
    for table in ("stations", "segments"):
        spec = data.get(table)
        # [stations] is a table of stations unless it names a file; [[segments]] is an
        # array, and a table there names a file (or misspells 'file': said so)
        if not isinstance(spec, dict) or "file" not in spec and (
                table == "stations" or not any(suggest(k, ("file",)) for k in spec)):
            continue

        def fail(message, t, index, key, place, hint=None, options=None, _table=table):
            raise ModelError(message, place=_table, file=source, line=line_of(_table, key),
                             hint=hint, options=options)

        if table == "stations" and len(spec) > 1:
            other = next(k for k in spec if k != "file")
            fail(f"a [stations] table that names a file holds no stations of its own: got "
                 f"'{other}'", table, None, other, table)
        check_types(spec, fail, FILE_TABLE)
        name = spec["file"]
        line = line_of(table, "file")
        path = _locate(name, source, line)
        shown = str(path)
        found = read_table(path, table, shown, source, line)
        if table == "stations":
            stations = {}
            for entry, row in found:
                st = entry["name"]
                if st in stations:
                    raise ModelError(f"station '{st}' is defined twice", file=shown,
                                     line=row.line, place="name")
                if "braced" in entry:   # the table form of a station, as TOML writes it
                    stations[st] = {"x": entry["x"], "braced": entry["braced"]}
                    rows[(f"stations.{st}", None)] = Row(shown, row.line, row.columns)
                else:
                    stations[st] = entry["x"]
                rows[("stations", st)] = Row(shown, row.line, {st: row.columns["x"]})
            data[table] = stations
        else:
            data[table] = [entry for entry, _ in found]
            for i, (_, row) in enumerate(found, 1):
                rows[("segments", i)] = row
    return rows
