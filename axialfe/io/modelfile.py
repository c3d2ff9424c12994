"""The file reader: a TOML model file in, a checked :class:`~axialfe.model.Model` out.

A model file is untrusted input: it is parsed with :mod:`tomllib` and every value
is read as data, never evaluated.  Every error names the file, the line, the
place in the model and the fix where one is known, e.g.::

    bolt.toml:31: segments[2] ('sleeve'): misfit: '0.05' has no unit: give a length, e.g. '40 mm'
"""

from __future__ import annotations

import dataclasses
import functools
from collections.abc import Mapping
import re
import tomllib
from importlib import resources
from pathlib import Path

from .._gcpause import gc_paused
from ..errors import ModelError, suggest
from ..model.parts import BEHAVIOURS, MODULUS_AT
from ..model import (Case, CheckSettings, Combination, Gap, Limit, Load, Material,
                    Model, Project, Section, Segment, Station, Support)
from ..model.tolerances import Toleranced, is_toleranced, parse_tolerance
from ..units import OutputUnits, parse_quantity, split_quantity
from . import schema
from .physical import check_absolute_temperatures, check_segment_lengths
from .source import decode, read_text
from .tables import expand_tables
from .schema import check_range, check_types, keys_of

__all__ = ["read_model", "parse_model", "builtin_materials", "read_toleranced",
           "tolerance_note"]

# the keys each table allows come from the declarative schema (axialfe.io.schema)
_TOP_KEYS = keys_of(schema.MODEL)
_KEYS = {
    "settings": keys_of(schema.SETTINGS), "units": keys_of(schema.UNITS),
    "material": keys_of(schema.MATERIAL), "section": keys_of(schema.SECTION),
    "segment": keys_of(schema.SEGMENT), "support": keys_of(schema.SUPPORT),
    "load": keys_of(schema.LOAD), "gap": keys_of(schema.GAP), "case": keys_of(schema.CASE),
    "settlement": keys_of(schema.SETTLEMENT), "combination": keys_of(schema.COMBINATION),
    "checks": keys_of(schema.CHECKS), "station": keys_of(schema.STATION),
    "limit": keys_of(schema.LIMIT),
}
# the tables whose keys are names of their own (a dotted name in a header must be quoted)
_NAMED_TABLES = {"materials": set(keys_of(schema.MATERIAL)),
                 "sections": set(keys_of(schema.SECTION))}
_SECTION_KINDS = {"diameter": "length", "outer_diameter": "length", "wall_thickness": "length",
                  "inner_diameter": "length", "width": "length", "height": "length",
                  "area": "area", "second_moment": "second_moment"}


class _Locator:
    """Finds the line of a table, an item of an array of tables, or a key."""

    _HEADER = re.compile(r"^\s*\[(\[?)\s*([^\[\]]+?)\s*\]\]?\s*(#.*)?$")

    def __init__(self, text: str):
        self.lines = text.split("\n")   # lines as TOML counts them: only "\n" ends one
        self.headers = []  # (0-based line, name, is_array)
        self.raw_headers = []  # (0-based line, the header's text between the brackets)
        for i in self._bracketed(text):
            m = self._HEADER.match(self.lines[i])
            if m:
                name = re.sub(r"\s*\.\s*", ".", m.group(2).replace('"', "").replace("'", ""))
                self.headers.append((i, name, bool(m.group(1))))
                self.raw_headers.append((i, m.group(2)))
        self._by_name = {}  # name -> positions in headers, in file order (one pass, so
        for h, (_, name, _) in enumerate(self.headers):   # locating is linear overall)
            self._by_name.setdefault(name, []).append(h)

    _BRACKET = re.compile(r"^[^\S\n]*\[", re.MULTILINE)

    @classmethod
    def _bracketed(cls, text):
        """The 0-based numbers of the lines whose first character after white space is '[',
        the only lines a header can be (found by one scan of the text)."""
        line, at = 0, 0
        for m in cls._BRACKET.finditer(text):
            line += text.count("\n", at, m.start())
            at = m.start()
            yield line

    def _span(self, table, index):
        """Return the (start, stop) lines of table ``table`` (its ``index``-th item)."""
        found = self._by_name.get(table)
        if not found or (index is not None and not 1 <= index <= len(found)):
            return None
        h = found[0 if index is None else index - 1]
        stop = self.headers[h + 1][0] if h + 1 < len(self.headers) else len(self.lines)
        return self.headers[h][0], stop

    def find(self, table=None, index=None, key=None) -> int | None:
        """Return the 1-based line, or None when it cannot be found."""
        span = self._span(table, index) if table else (0, len(self.lines))
        if span is None and table and "." in table:  # a key of a parent table
            parent, _, child = table.rpartition(".")
            line = self.find(parent, None, child)
            if key is None or line is None:
                return line
            # an inline table stands on one line: the key is there, or the child is
            return self._key_line(line - 1, line, key) or line
        if span is None and table:  # a sub-table of it, e.g. [material.m] for 'material'
            for line, name, _ in self.headers:
                if name.startswith(table + "."):
                    return line + 1
        if span is None:
            top = table.split(".")[0] if table else None
            return self._key_line(0, len(self.lines), top) if top else None
        start, stop = span
        if key is not None:
            found = self._key_line(start, stop, key)
            if found:
                return found
        return start + 1

    _PART = re.compile(r"\s*(\"[^\"]*\"|'[^']*'|[^.\"']+?)\s*(?:\.|$)")

    def dotted_name(self, tables) -> tuple[int, str, list[str]] | None:
        """The first header ``[TABLE.a.b]`` of one of ``tables`` (a map of named entries) whose
        third part is none of ``tables[TABLE]`` (its entries' keys): a name with a dot in it,
        unquoted.  Returns (1-based line, table, the parts after it), or None."""
        for i, raw in self.raw_headers:
            parts = self._PART.findall(raw)
            if (len(parts) > 2 and parts[0] in tables and not parts[1][:1] in "\"'"
                    and parts[2] not in tables[parts[0]]):
                return i + 1, parts[0], parts[1:]
        return None

    def table_keys(self, table) -> dict:
        """The 1-based line of every key of table ``table``, in one pass."""
        span = self._span(table, None)
        if span is None:
            return {}
        pattern = re.compile(r"^\s*[\"']?([^\"'=]+?)[\"']?\s*=")
        out = {}
        for i in range(span[0] + 1, span[1]):
            m = pattern.match(self.lines[i])
            if m:
                out.setdefault(m.group(1).strip(), i + 1)
        return out

    def _key_line(self, start, stop, key):
        pattern = re.compile(r"^\s*[\"']?" + re.escape(str(key)) + r"[\"']?\s*=")
        inline = re.compile(r"[{,]\s*[\"']?" + re.escape(str(key)) + r"[\"']?\s*=")
        for i in range(start, stop):
            if pattern.match(self.lines[i]):
                return i + 1
        for i in range(start, stop):
            if inline.search(self.lines[i]):
                return i + 1
        return None


@functools.lru_cache(maxsize=1)
def _builtin_table():
    text = resources.files("axialfe.materials").joinpath("library.toml").read_text(encoding="utf-8")
    return tomllib.loads(text)


class _BuiltinMaterials(Mapping):
    """The built-in materials by name, each read when first asked for (a table against
    temperature in degF needs pint, which a model naming other materials never loads)."""

    def __init__(self):
        self._table = _builtin_table()
        self._read = {}

    def __getitem__(self, name):
        if name not in self._read:
            entry = self._table[name]                  # KeyError for an unknown name
            self._read[name] = _Reader({}, None, None).material(name, entry, builtin=True)
        return self._read[name]

    def __contains__(self, name):
        return name in self._table

    def __iter__(self):
        return iter(self._table)

    def __len__(self):
        return len(self._table)


def builtin_materials() -> Mapping:
    """Return the built-in materials by name (values in SI, each with its source)."""
    return _BuiltinMaterials()


class _Reader:
    """Turns the parsed TOML tables into model objects, locating every error."""

    def __init__(self, data: dict, source: str | None, text: str | None, symbolic: bool = False,
                 rows: dict | None = None, overrides: dict | None = None):
        self.data = data
        # toleranced values read (path -> Toleranced), and the values a tolerance study
        # puts in their place (path -> SI value)
        self.tolerances = {}
        self.overrides = overrides or {}
        self.source = source
        # entries born from table files (axialfe.io.tables): where each stands
        self.rows = rows or {}
        self.locator = _Locator(text) if text is not None else None
        # closed form: declared symbols (name -> SymbolDef); with ``symbolic`` every
        # value becomes an exact sympy expression instead of a float
        self.symbolic = symbolic
        self.symbols = {}
        self.sympy_symbols = {}

    # --- errors ---------------------------------------------------------
    def fail(self, message, table=None, index=None, key=None, place=None, hint=None, options=None):
        file, line, place = self.where(table, index, key, place)
        raise ModelError(message, place=place, file=file, line=line, hint=hint, options=options)

    def where(self, table, index, key, place):
        """``(file, line, place)`` of a key: in the model file, or in the row of a table
        file the entry came from (the place is then the key's column)."""
        if self.rows:
            row = self.rows.get((table, key if table == "stations" else index))
            if row is None and table and table.startswith("stations."):
                row = self.rows.get((table, None))   # a station with a braced cell
            if row is not None:
                return row.file, row.line, row.columns.get(key, place)
        return self.source, self.line(table, index, key), place

    def _schema_fail(self, message, table, index, key, place, hint=None, options=None):
        self.fail(message, table, index, key, place=place, hint=hint, options=options)

    def line(self, table=None, index=None, key=None):
        return self.locator.find(table, index, key) if self.locator else None

    def keys(self, entry, allowed, table, index=None, place=None):
        if not isinstance(entry, dict):
            self.fail(f"expected a table: got {type(entry).__name__}", table, index, place=place)
        for key in entry:
            if key not in allowed:
                self.fail(f"unknown key '{key}'", table, index, key, place=place,
                          hint=suggest(key, allowed), options=allowed)

    def quantity(self, value, kind, *, table=None, index=None, key=None, place=None, item=None):
        """Convert one value to SI, locating any unit error at ``key``."""
        if is_toleranced(value):
            return self.toleranced(value, kind, table, index, key, place, item)
        try:
            if self.symbolic or (isinstance(value, str) and self._is_expression(value)):
                si = self.expression(value, kind)
            else:
                si = parse_quantity(value, kind)
        except ModelError as exc:
            file, line, place = self.where(table, index, key, place)
            raise type(exc)(f"{key}: {exc.message}", place=place, file=file, line=line,
                            hint=exc.hint, options=exc.options) from exc
        self.in_range(si, table, index, key, place, value)
        return si

    # --- toleranced values ------------------------------------------------
    def parse_toleranced(self, value, kind, table, index, key, place):
        """``value`` read as a tolerance of ``kind`` (None: a plain number), with its line;
        a malformed one is an error located at its key."""
        line = self.line(table, index, key)
        try:
            return parse_tolerance(value, kind), line
        except ModelError as exc:
            raise type(exc)(f"{key}: {exc.message}", place=place, file=self.source, line=line,
                            hint=exc.hint, options=exc.options) from exc

    # which keys of the file may carry a tolerance, and the words that say so in an error
    TAKERS = ("positions, clearances, misfits, preloads, temperatures, loads, moduli, "
              "expansion, section sizes and supports take one")

    def may_tolerance(self, table, key) -> bool:
        """Whether ``key`` of ``table`` may carry a tolerance (a model file's keys)."""
        top = (table or "").split(".")[0]
        return (top, key) in _TOLERABLE or (top == "stations" and table == "stations")

    # toleranced keys whose draws must stay above zero (absolute temperatures: above 0 K),
    # beyond the schema's ranges; the joint and fit readers name theirs
    POSITIVE: tuple[str, ...] = ()

    def tolerance_problem(self, tol, table, key) -> str | None:
        """Why a study must refuse this tolerance before it samples (a draw outside the
        key's physical range), or None."""
        problem = None
        for end in tol.spread:
            problem = problem or check_range(float(end), table, key)
        if problem is None and key in self.POSITIVE and tol.spread[0] <= 0:
            problem = (f"{key} could fall to or below absolute zero" if "temperature" in key
                       else f"{key} could fall to zero or below")
        if problem is None and key == "clearance" and tol.spread[0] < 0:
            problem = "clearance could fall below zero"
        return problem

    def toleranced(self, value, kind, table, index, key, place, item=None):
        """A toleranced value: recorded by its path, its nominal (or the study's value) returned."""
        if not self.may_tolerance(table, key):
            self.fail(f"{key}: a tolerance is not allowed here ({self.TAKERS})", table, index,
                      key, place=place)
        tol, line = self.parse_toleranced(value, kind, table, index, key, place)
        self.in_range(tol.nominal, table, index, key, place, tol.nominal)
        path = self._tolerance_path(table, index, key, place, item)
        self.tolerances[path] = Toleranced(path, tol, line, self.tolerance_problem(tol, table, key))
        if self.symbolic:   # the closed form takes the nominal value, exactly as written
            return _rational(_expr().exact_decimal(tol.nominal))
        return float(self.overrides.get(path, tol.nominal))

    def _tolerance_path(self, table, index, key, place, item):
        """The name of a toleranced input: ``gaps.end-float.clearance``, ``stations.cover``."""
        top = table.split(".")[0]
        if top == "stations":
            return f"stations.{key if table == 'stations' else table.split('.', 1)[1]}"
        if top in ("materials", "sections", "settings"):
            return f"{table}.{key}"
        if top in ("segments", "gaps", "cases"):
            entry = self.data[top][index - 1]
            name = entry.get("name")
            if not isinstance(name, str):
                name = (f"{entry.get('from')}-{entry.get('to')}" if top == "segments"
                        else f"gap-{index}")
            path = f"{top}.{name}"
            load = re.search(r"loads\[(\d+)\]", place or "")
            if top == "cases" and load:
                path += f".loads[{load.group(1)}]"
            return f"{path}.{key}" + (f".{item}" if item is not None else "")
        return f"{top}[{index}].{key}"

    def in_range(self, si, table, index, key, place, raw=None):
        """Refuse a value outside the physical range the schema gives its key."""
        problem = check_range(si, table, key)
        if problem is not None:
            if isinstance(raw, str):
                problem = problem.rsplit(": got ", 1)[0] + f": got '{raw}'"
            self.fail(problem, table, index, key, place=place)

    # --- closed form: symbols and expressions ------------------------------
    _OPERATOR = re.compile(r"[-+*()]")

    def _is_expression(self, value: str) -> bool:
        """True for a value the expression parser reads: one naming a declared symbol,
        or one with operators; plain "number unit" strings keep the fast path."""
        if self.symbols and not self.symbols.keys().isdisjoint(_expr().NAME.findall(value)):
            return True
        parts = split_quantity(value)
        if parts is None:
            return bool(self.symbols) or bool(self._OPERATOR.search(value))
        return bool(self._OPERATOR.search(parts[1]))

    def expression(self, value, kind):
        """A value through the expression parser: a float, or sympy when symbolic."""
        ex = _expr()
        if kind == "temperature":
            if isinstance(value, str) and self._is_expression(value):
                raise ModelError(f"'{value}': an absolute temperature cannot be an expression "
                                 "or a symbol; use 'temperature_change' for a symbolic change")
            t = parse_quantity(value, kind)
            return _rational(ex.exact_decimal(t)) if self.symbolic else t
        if not isinstance(value, str) or not self._is_expression(value):
            parse_quantity(value, kind)  # the plain path's checks and messages
        dims = {name: sym.dims for name, sym in self.symbols.items()}
        parsed = ex.parse_expression(value, dims, kind)
        if self.symbolic:
            return parsed.sympy(self.sympy_symbols)
        missing = [n for n in sorted(parsed.names) if self.symbols[n].value is None]
        if missing:
            raise ModelError(f"symbol '{missing[0]}' has no value: give it one in [symbols] to "
                             "solve numerically, or see its closed form with 'axialfe closed-form'")
        return float(parsed.value({n: self.symbols[n].value for n in parsed.names}))

    def read_symbols(self):
        """Read ``[symbols]``: name = "18 kN" or name = { unit = "mm" }."""
        table = self.data.get("symbols", {})
        if not isinstance(table, dict):
            self.fail("[symbols] must be a table of name = \"value unit\"", "symbols",
                      place="symbols")
        if not table:
            return
        ex = _expr()
        for name, entry in table.items():
            try:
                self.symbols[name] = ex.read_symbol(name, entry)
            except ModelError as exc:
                raise ModelError(f"{name}: {exc.message}", place="symbols", file=self.source,
                                 line=self.line("symbols", None, name), hint=exc.hint,
                                 options=exc.options) from exc
        if self.symbolic:
            import sympy

            self.sympy_symbols = {name: sympy.Symbol(name, real=True) for name in self.symbols}

    def number(self, value, *, table=None, index=None, key=None, place=None):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            self.fail(f"{key}: expected a plain number: got {value!r}", table, index, key, place=place)
        self.in_range(float(value), table, index, key, place)
        return float(value)

    def text(self, value, *, table=None, index=None, key=None, place=None):
        if not isinstance(value, str):
            self.fail(f"{key}: expected a name in quotes: got {value!r}", table, index, key, place=place)
        return value

    def build(self, cls, kwargs, table=None, index=None, place=None, raw=None):
        """Construct a model object, locating the errors its own checks raise.

        ``raw`` is the file's entry: a range error then quotes the value as written
        (``'-70 GPa'``) rather than its SI float.
        """
        try:
            return cls(**kwargs)
        except ModelError as exc:
            key = _key_in(exc.message, [_FILE_KEY.get(k, k) for k in kwargs]
                          + [k for k, _ in kwargs.get("dimensions", ())])
            message = exc.message
            if raw is not None and isinstance(raw.get(key), str):
                message = _RANGE_GOT.sub(lambda m: f"{m.group(1)}: got '{raw[key]}'", message)
            file, line, place = self.where(table, index, key, place or exc.place)
            raise ModelError(message, place=place, file=file, line=line, hint=exc.hint,
                             options=exc.options) from exc

    # --- pieces ---------------------------------------------------------
    def material(self, name, entry, builtin=False):
        table = f"materials.{name}"
        place = f"built-in material '{name}'" if builtin else table
        self.keys(entry, _KEYS["material"], table, place=place)
        kinds = {"elastic_modulus": "stress", "thermal_expansion": "thermal_expansion",
                 "yield_strength": "stress", "density": "density",
                 "compressive_yield_strength": "stress", "hardening_modulus": "stress"}
        if "elastic_modulus" not in entry:
            self.fail("a material needs 'elastic_modulus'", table, place=place)
        kwargs = {k: self.quantity(entry[k], kind, table=table, key=k, place=place)
                  for k, kind in kinds.items() if k in entry and not _against_temperature(entry[k])}
        kwargs.update(self.property_tables(entry, table, place))
        for k in ("proof_strength", "tensile_strength"):  # stated for the record, checked only
            if k in entry:
                self.quantity(entry[k], "stress", table=table, key=k, place=place)
        if "source" in entry:
            kwargs["source"] = self.text(entry["source"], table=table, key="source", place=place)
        if "behaviour" in entry:
            kwargs["behaviour"] = self.text(entry["behaviour"], table=table, key="behaviour",
                                            place=place)
        if "poissons_ratio" in entry:
            kwargs["poissons_ratio"] = self.number(entry["poissons_ratio"], table=table,
                                                   key="poissons_ratio", place=place)
        return self.build(Material, {"name": name, **kwargs}, table, place=place, raw=entry)

    def property_tables(self, entry, table, place):
        """Material properties given against temperature, as ``Material`` keywords.

        ``elastic_modulus`` and ``yield_strength`` as ``{ "20 degC" = "203 GPa", ... }``;
        the expansion as ``mean_thermal_expansion`` (mean coefficients) or
        ``thermal_expansion_total`` (total strains), each with ``reference``.
        """
        out = {}
        for key, field, kind in (("elastic_modulus", "modulus_table", "stress"),
                                 ("yield_strength", "yield_table", "stress")):
            if _against_temperature(entry.get(key)):
                tab = self.property_table(entry[key], kind, table, key, place, False)
                out[field] = tab
                out[key] = tab.values[0]
        given = [k for k in ("thermal_expansion", "mean_thermal_expansion",
                             "thermal_expansion_total") if k in entry]
        if len(given) > 1:
            self.fail(f"give the expansion once: '{given[0]}' or '{given[1]}'", table,
                      key=given[1], place=place)
        for key, kind, unit in (("mean_thermal_expansion", "mean", "thermal_expansion"),
                                ("thermal_expansion_total", "total", "strain")):
            if key in entry:
                out["expansion_table"] = self.property_table(entry[key], unit, table, key, place,
                                                             True)
                out["expansion_kind"] = kind
        return out

    def property_table(self, value, kind, table, key, place, with_reference):
        """One table against temperature (temperatures as keys), located at ``key``."""
        from ..model import PropertyTable

        rows, reference = [], None
        for name, item in value.items():
            if name == "reference":
                if not with_reference:
                    self.fail(f"{key}: only an expansion table has a 'reference'", table, key=key,
                              place=place)
                reference = self.table_temperature(item, table, key, place)
                continue
            T = self.table_temperature(name, table, key, place)
            v = self.quantity(item, kind, table=table, key=key, place=place)
            rows.append((T, v))
        if with_reference and reference is None:
            self.fail(f"{key}: give the table's 'reference' temperature (its values count from "
                      "there), e.g. reference = \"20 degC\"", table, key=key, place=place)
        rows.sort()
        try:
            return PropertyTable(tuple(r[0] for r in rows), tuple(r[1] for r in rows), reference)
        except ModelError as exc:
            self.fail(f"{key}: {exc.message}", table, key=key, place=place)

    def table_temperature(self, value, table, key, place):
        """A temperature of a table (a key of it, or its reference), located at ``key``."""
        try:
            T = parse_quantity(value, "temperature")
        except ModelError as exc:
            self.fail(f"{key}: {exc.message}", table, key=key, place=place)
        if not 0 < T <= 1e5:
            self.fail(f"{key}: a temperature must lie above absolute zero and at most 100000 K: "
                      f"got '{value}'", table, key=key, place=place)
        return T

    def section(self, name, entry):
        table = f"sections.{name}"
        self.keys(entry, _KEYS["section"], table, place=table)
        shape = entry.get("shape")
        if shape is None:
            self.fail("a section needs 'shape'", table, place=table,
                      options=("round", "tube", "rectangle", "area"))
        dims = {k: self.quantity(v, _SECTION_KINDS[k], table=table, key=k, place=table)
                for k, v in entry.items() if k != "shape"}
        if shape == "tube":
            if ("wall_thickness" in dims) == ("inner_diameter" in dims):
                self.fail("a tube needs 'outer_diameter' and one of 'wall_thickness' or "
                          "'inner_diameter'", table, place=table)
            if "wall_thickness" in dims and "outer_diameter" in dims:
                dims["inner_diameter"] = dims["outer_diameter"] - 2 * dims.pop("wall_thickness")
                if _surely_negative(dims["inner_diameter"]):
                    self.fail("wall_thickness is more than half the outer diameter", table,
                              key="wall_thickness", place=table)
        allowed = {"round": ("diameter",), "tube": ("outer_diameter", "inner_diameter"),
                   "rectangle": ("width", "height"), "area": ("area", "second_moment")}
        for key in dims:
            if shape in allowed and key not in allowed[shape]:
                self.fail(f"'{key}' does not belong to a {shape} section", table, key=key,
                          place=table, options=allowed[shape])
        return self.build(Section, {"name": name, "shape": shape, "dimensions": tuple(dims.items())},
                          table, place=table, raw=entry)

    def station(self, name, value):
        """A station: ``name = "150 mm"`` or ``name = { x = "150 mm", braced = true }``."""
        if not isinstance(value, dict) or is_toleranced(value):
            x = self.quantity(value, "length", table="stations", key=name, place="stations")
            return Station(name, x)
        place = f"stations.{name}"
        self.keys(value, _KEYS["station"], f"stations.{name}", place=place)
        if "x" not in value:
            self.fail("a station given as a table needs 'x' (its position)", f"stations.{name}",
                      place=place)
        x = self.quantity(value["x"], "length", table=f"stations.{name}", key="x", place=place)
        braced = value.get("braced", False)
        if not isinstance(braced, bool):
            self.fail(f"braced: expected true or false: got {braced!r}", f"stations.{name}",
                      key="braced", place=place)
        return Station(name, x, braced)

    def temperature_pair(self, entry, reference, table, index, place):
        """Return the temperature change of an entry with ``temperature_change`` or
        ``temperature`` (absolute, against the reference), or None."""
        if "temperature_change" in entry and "temperature" in entry:
            self.fail("give 'temperature_change' or 'temperature', not both", table, index,
                      "temperature", place=place)
        if "temperature_change" in entry:
            return self.quantity(entry["temperature_change"], "temperature_difference",
                                 table=table, index=index, key="temperature_change", place=place)
        if "temperature" in entry:
            t = self.quantity(entry["temperature"], "temperature", table=table, index=index,
                              key="temperature", place=place)
            if reference is None:
                self.fail("an absolute 'temperature' needs settings.reference_temperature", table,
                          index, "temperature", place=place)
            return t - reference
        return None

    def array(self, name):
        items = self.data.get(name, [])
        if not isinstance(items, list):
            self.fail(f"'{name}' must be an array of tables ([[{name}]])", name)
        return items

    def name_ref(self, value, options, what, table, index, key, place):
        value = self.text(value, table=table, index=index, key=key, place=place)
        if value not in options:
            self.fail(f"unknown {what} '{value}'", table, index, key, place=place,
                      hint=suggest(value, options))
        return value

    def dotted_names(self):
        """Refuse a dotted name in a table header (``[materials.bolt-8.8]``), which TOML reads
        as nested tables: one located line that says to quote the name."""
        found = self.locator.dotted_name(_NAMED_TABLES) if self.locator else None
        if found is not None:
            line, table, parts = found
            name = ".".join(parts)
            raise ModelError(f"the header [{table}.{name}] reads as nested tables "
                             + " and ".join(f"'{p}'" for p in parts) + ": a name with a dot "
                             f'must be quoted, [{table}."{name}"]', place=table,
                             file=self.source, line=line)

    # --- the whole model ------------------------------------------------
    def model(self) -> Model:
        data = self.data
        if isinstance(data.get("bolt"), dict):  # axialfe.joints reads these
            self.fail("this is a bolted-joint file (it has a [bolt] table): run 'axialfe "
                      "joint' on it", "bolt", place="top level")
        self.dotted_names()
        check_types(data, self._schema_fail)
        for key in data:
            if key not in _TOP_KEYS:
                self.fail(f"unknown key '{key}'", key if isinstance(data[key], (dict, list))
                          else None, key=key, place="top level", hint=suggest(key, _TOP_KEYS))
        title = data.get("title", Path(self.source).stem if self.source else "axial model")
        project = self.project(data["project"]) if "project" in data else None
        self.read_symbols()
        settings = data.get("settings", {})
        self.keys(settings, _KEYS["settings"], "settings", place="settings")
        q = functools.partial(self.quantity, table="settings", place="settings")
        reference = (q(settings["reference_temperature"], "temperature", key="reference_temperature")
                     if "reference_temperature" in settings else None)
        default_dt = self.temperature_pair(settings, reference, "settings", None, "settings")
        gravity = q(settings["gravity"], "acceleration", key="gravity") if "gravity" in settings else 0.0
        modulus_at = settings.get("modulus_at", "temperature")
        if modulus_at not in MODULUS_AT:
            self.fail(f"unknown modulus_at '{modulus_at}'", "settings", key="modulus_at",
                      place="settings", hint=suggest(str(modulus_at), MODULUS_AT),
                      options=MODULUS_AT)
        behaviour = settings.get("behaviour")
        if behaviour is not None and behaviour not in BEHAVIOURS:
            self.fail(f"unknown behaviour '{behaviour}'", "settings", key="behaviour",
                      place="settings", hint=suggest(str(behaviour), BEHAVIOURS),
                      options=BEHAVIOURS)

        units_entry = data.get("units", {})
        self.keys(units_entry, _KEYS["units"], "units", place="units")
        try:
            units = OutputUnits.system(units_entry.get("system", "SI"),
                                       **{k: v for k, v in units_entry.items() if k != "system"})
        except ModelError as exc:
            key = next((k for k, v in units_entry.items() if k != "system"
                        and not _unit_ok(units_entry.get("system", "SI"), k, v)),
                       "system" if "system" in units_entry else None)
            raise type(exc)(f"{key}: {exc.message}" if key else exc.message, place="units",
                            file=self.source, line=self.line("units", None, key), hint=exc.hint,
                            options=exc.options) from exc

        materials = {}
        own = data.get("materials", {})
        self.keys(own, tuple(own), "materials", place="materials")
        for name, entry in own.items():
            materials[name] = self.material(name, entry)
        sections = {}
        for name, entry in data.get("sections", {}).items():
            sections[name] = self.section(name, entry)

        stations = []
        st_table = data.get("stations", {})
        if not isinstance(st_table, dict) or not st_table:
            self.fail("a model needs a [stations] table of names and positions, e.g. left = \"0 mm\"",
                      "stations", place="stations")
        for name, value in st_table.items():
            stations.append(self.station(name, value))
        station_names = dict.fromkeys(st_table)  # ordered, with O(1) look-ups

        builtins = None
        segments = []
        for i, entry in enumerate(self.array("segments"), 1):
            table = "segments"
            place = f"segments[{i}]" + (f" ('{entry['name']}')" if isinstance(entry, dict)
                                        and isinstance(entry.get("name"), str) else "")
            self.keys(entry, _KEYS["segment"], table, i, place)
            for key in ("from", "to", "material", "section"):
                if key not in entry:
                    self.fail(f"a segment needs '{key}'", table, i, place=place)
            start = self.name_ref(entry["from"], station_names, "station", table, i, "from", place)
            end = self.name_ref(entry["to"], station_names, "station", table, i, "to", place)
            mat_name = self.text(entry["material"], table=table, index=i, key="material", place=place)
            if mat_name not in materials:
                if builtins is None:
                    builtins = builtin_materials()
                if mat_name not in builtins:
                    self.fail(f"unknown material '{mat_name}'", table, i, "material", place=place,
                              hint=suggest(mat_name, [*materials, *builtins]),
                              options=[*materials, *builtins])
                materials[mat_name] = builtins[mat_name]
            sec = self.name_ref(entry["section"], sections, "section", table, i, "section", place)
            end_sec = (self.name_ref(entry["end_section"], sections, "section", table, i,
                                     "end_section", place) if "end_section" in entry else None)
            qs = functools.partial(self.quantity, table=table, index=i, place=place)
            kwargs = {
                "name": entry.get("name", f"{start}-{end}"),
                "start": start, "end": end, "material": materials[mat_name],
                "section": sections[sec],
                "end_section": sections[end_sec] if end_sec else None,
                "temperature_change": self.temperature_pair(entry, reference, table, i, place),
                "misfit": qs(entry["misfit"], "length", key="misfit") if "misfit" in entry else 0.0,
                "distributed_load": (qs(entry["distributed_load"], "force_per_length",
                                        key="distributed_load") if "distributed_load" in entry else 0.0),
                "buckling_length": (qs(entry["buckling_length"], "length", key="buckling_length")
                                    if "buckling_length" in entry else None),
                "effective_length_factor": (
                    self.number(entry["effective_length_factor"], table=table, index=i,
                                key="effective_length_factor", place=place)
                    if "effective_length_factor" in entry else None),
            }
            if "preload" in entry:  # a force; the solver turns it into a misfit
                if "misfit" in entry:
                    self.fail("give 'misfit' or 'preload', not both", table, i, "preload",
                              place=place)
                if self.symbolic:
                    self.fail("preload: the closed form takes a 'misfit', not a preload", table,
                              i, "preload", place=place)
                kwargs["preload"] = qs(entry["preload"], "force", key="preload")
            if not isinstance(kwargs["name"], str):
                self.fail("name: expected a name in quotes", table, i, "name", place=place)
            if (gravity and materials[mat_name].density is None):
                self.fail(f"self-weight needs a density for material '{mat_name}'", table, i,
                          "material", place=place)
            if behaviour == "elastic-plastic" and kwargs["material"].yield_strength is not None:
                kwargs["material"] = dataclasses.replace(kwargs["material"],
                                                         behaviour="elastic-plastic")
            segments.append(self.build(Segment, kwargs, table, i, place, raw=entry))

        supports = []
        for i, entry in enumerate(self.array("supports"), 1):
            place = f"supports[{i}]"
            self.keys(entry, _KEYS["support"], "supports", i, place)
            if "at" not in entry:
                self.fail("a support needs 'at'", "supports", i, place=place)
            at = self.name_ref(entry["at"], station_names, "station", "supports", i, "at", place)
            qs = functools.partial(self.quantity, table="supports", index=i, place=place)
            kwargs = {"at": at, "kind": entry.get("kind", "fixed")}
            if "stiffness" in entry:
                kwargs["stiffness"] = qs(entry["stiffness"], "stiffness", key="stiffness")
            if "displacement" in entry:
                kwargs["displacement"] = qs(entry["displacement"], "length", key="displacement")
            if kwargs["kind"] == "settlement" and "displacement" not in entry:
                self.fail("a settlement support needs 'displacement'", "supports", i, place=place)
            supports.append(self.build(Support, kwargs, "supports", i, place, raw=entry))

        loads = self.loads(self.array("loads"), station_names, "loads", None, "loads")

        gaps = []
        for i, entry in enumerate(self.array("gaps"), 1):
            place = f"gaps[{i}]" + (f" ('{entry['name']}')" if isinstance(entry, dict)
                                    and isinstance(entry.get("name"), str) else "")
            self.keys(entry, _KEYS["gap"], "gaps", i, place)
            sides = [k for k in ("minus_side", "plus_side") if k in entry]
            if sides:  # the two stations by their side: between = [minus_side, plus_side]
                if "between" in entry or "at" in entry:
                    self.fail(f"'{sides[0]}' names a station of a gap between two; give it "
                              "instead of 'between' or 'at', not with them", "gaps", i, sides[0],
                              place=place)
                if len(sides) == 1:
                    other = "plus_side" if sides[0] == "minus_side" else "minus_side"
                    self.fail(f"a gap with '{sides[0]}' needs '{other}' too (the stations on the "
                              "-x and the +x side of the gap)", "gaps", i, sides[0], place=place)
                entry = {**entry, "between": [entry["minus_side"], entry["plus_side"]]}
            if ("between" in entry) == ("at" in entry):
                self.fail("a gap needs either 'between' (two stations), 'minus_side' and "
                          "'plus_side', or 'at' (one station against ground)", "gaps", i,
                          place=place)
            if "clearance" not in entry:
                self.fail("a gap needs 'clearance' (it may be '0 mm')", "gaps", i, place=place)
            if "between" in entry:
                pair = entry["between"]
                if not isinstance(pair, list) or len(pair) != 2:
                    self.fail("'between' takes two station names", "gaps", i, "between", place=place)
                keys = ("minus_side", "plus_side") if sides else ("between", "between")
                names = tuple(self.name_ref(s, station_names, "station", "gaps", i, k, place)
                              for s, k in zip(pair, keys))
            else:
                names = (self.name_ref(entry["at"], station_names, "station", "gaps", i, "at", place),)
                if "side" not in entry:
                    self.fail("a gap 'at' one station needs 'side' = \"+x\" or \"-x\" (where the "
                              "stop lies)", "gaps", i, place=place)
            kwargs = {"name": entry.get("name", f"gap-{i}"), "stations": names,
                      "clearance": self.quantity(entry["clearance"], "length", table="gaps",
                                                 index=i, key="clearance", place=place),
                      "kind": entry.get("kind", "contact"), "side": entry.get("side")}
            gaps.append(self.build(Gap, kwargs, "gaps", i, place, raw=entry))

        cases = []
        for i, entry in enumerate(self.array("cases"), 1):
            place = f"cases[{i}]" + (f" ('{entry['name']}')" if isinstance(entry, dict)
                                     and isinstance(entry.get("name"), str) else "")
            self.keys(entry, _KEYS["case"], "cases", i, place)
            if "name" not in entry:
                self.fail("a case needs 'name'", "cases", i, place=place)
            case_loads = self.loads(entry.get("loads", []), station_names, "cases", i, place)
            temps = self.case_temperatures(entry, reference, i, place)
            seg_names = {seg.name for seg in segments}
            for name, _ in temps:
                if name != "all" and name not in seg_names:
                    key = "temperature" if "temperature" in entry else "temperature_change"
                    self.fail(f"unknown segment '{name}' in {key}", "cases", i, key, place=place,
                              hint=suggest(name, seg_names))
            settled = sorted({sp.at for sp in supports if sp.kind == "settlement"})
            settlements = []
            for s in entry.get("settlements", []):
                if not isinstance(s, dict):
                    self.fail("settlements: expected tables like { at = \"right\", displacement = "
                              "\"0.05 mm\" }", "cases", i, "settlements", place=place)
                self.keys(s, _KEYS["settlement"], "cases", i, place=f"{place} settlements")
                if "at" not in s or "displacement" not in s:
                    self.fail("a settlement needs 'at' and 'displacement'", "cases", i,
                              "settlements", place=place)
                st = self.name_ref(s["at"], station_names, "station", "cases", i, "settlements", place)
                if st not in settled:
                    self.fail(f"station '{st}' has no settlement support to move", "cases", i,
                              "settlements", place=f"{place} settlements",
                              hint=suggest(st, settled), options=settled or None)
                settlements.append((st, self.quantity(s["displacement"], "length", table="cases",
                                                      index=i, key="settlements", place=place,
                                                      item=st)))
            cases.append(self.build(Case, {"name": self.text(entry["name"], table="cases", index=i,
                                                             key="name", place=place),
                                           "loads": case_loads, "temperature_change": temps,
                                           "settlements": tuple(settlements)}, "cases", i, place))
        combinations = []
        for i, entry in enumerate(self.array("combinations"), 1):
            place = f"combinations[{i}]"
            self.keys(entry, _KEYS["combination"], "combinations", i, place)
            if "name" not in entry or "factors" not in entry:
                self.fail("a combination needs 'name' and 'factors'", "combinations", i, place=place)
            factors = entry["factors"]
            if not isinstance(factors, dict):
                self.fail("factors: expected a table of case = factor", "combinations", i,
                          "factors", place=place)
            combinations.append(self.build(Combination, {
                "name": entry["name"],
                "factors": tuple((c, self.number(f, table="combinations", index=i, key="factors",
                                                 place=place)) for c, f in factors.items())},
                "combinations", i, place))

        checks_entry = data.get("checks", {})
        self.keys(checks_entry, _KEYS["checks"], "checks", place="checks")
        checks = self.build(CheckSettings, {k: (self.text if k == "column_curve" else self.number)(
            v, table="checks", key=k, place="checks") for k, v in checks_entry.items()}, "checks")
        limits = []
        for i, entry in enumerate(self.array("limits"), 1):
            place = f"limits[{i}]"
            self.keys(entry, _KEYS["limit"], "limits", i, place)
            kwargs = {k: entry[k] for k in ("at", "gap") if k in entry}
            for k in ("displacement", "min_opening"):
                if k in entry:
                    kwargs[k] = self.quantity(entry[k], "length", table="limits", index=i, key=k,
                                              place=place)
            limits.append(self.build(Limit, kwargs, "limits", i, place))

        try:
            model = Model(stations=tuple(stations), segments=tuple(segments),
                         supports=tuple(supports), loads=loads, gaps=tuple(gaps),
                         cases=tuple(cases), combinations=tuple(combinations),
                         temperature_change=default_dt, gravity=gravity,
                         reference_temperature=reference, modulus_at=modulus_at,
                         units=units, title=str(title),
                         source=self.source, checks=checks, limits=tuple(limits),
                         symbols=tuple(self.symbols.values()), lines=self.name_lines(),
                         project=project, tolerances=tuple(self.tolerances.values()))
        except ModelError as exc:
            m = re.match(r"segments\[(\d+)\]", exc.place or "")
            row = self.rows.get(("segments", int(m.group(1)))) if m else None
            if row is not None:
                raise exc.located(file=row.file, line=row.line) from exc
            raise exc.located(file=self.source, line=self._line_of_place(exc.place)) from exc
        check_segment_lengths(model, self._line_of_place)
        check_absolute_temperatures(model, self._line_of_place)
        return model

    def project(self, entry) -> Project:
        """The ``[project]`` table (types checked by the schema): text as written, a TOML
        date in ISO form."""
        return Project(**{k: v if isinstance(v, str) else v.isoformat() for k, v in entry.items()})

    def name_lines(self) -> dict:
        """The lines of ``'stations.<name>'``, ``'materials.<name>'``, ``'gaps.<name>'`` and ``'segments.<name>'``
        (for solver messages), found in one pass over each table."""
        if self.locator is None:
            return {}
        lines = {f"stations.{k}": v for k, v in self.locator.table_keys("stations").items()}
        if self.rows:  # stations from a table file: the line that names the file
            named = self.line("stations", None, "file")
            lines.update({f"stations.{k}": named for t, k in self.rows if t == "stations"})
        for key in ("claims", "claims_file"):  # so that a file stating none is not read twice
            if key in self.data:
                lines[key] = self.line(None, None, key)
        materials = self.data.get("materials")
        for name in (materials if isinstance(materials, dict) else {}):
            line = self.line(f"materials.{name}")
            if line is not None:
                lines[f"materials.{name}"] = line
            entry = materials[name]
            for key in (entry if isinstance(entry, dict) else {}):
                if isinstance(entry[key], dict):   # a table against temperature
                    lines[f"materials.{name}.{key}"] = self.line(f"materials.{name}", None, key)
        for table in ("gaps", "segments"):
            entries = self.data.get(table, [])
            # entries from a table file: the line that names the file, found once
            named = self.line(table, None, "file") if (table, 1) in self.rows else None
            for i, entry in enumerate(entries if isinstance(entries, list) else [], 1):
                if isinstance(entry, dict):
                    name = entry.get("name", f"{entry.get('from')}-{entry.get('to')}")
                    if isinstance(name, str):
                        lines.setdefault(f"{table}.{name}",
                                         named if named is not None else self.line(table, i))
        return lines

    def _line_of_place(self, place):
        if not place:
            return None
        m = re.match(r"(\w+)(?:\[(\d+)\])?", place)
        if not m:
            return None
        return self.line(m.group(1), int(m.group(2)) if m.group(2) else None)

    def loads(self, items, station_names, table, index, place):
        out = []
        if not isinstance(items, list):
            self.fail("loads: expected an array of tables", table, index, "loads", place=place)
        for j, entry in enumerate(items, 1):
            where = f"{place}[{j}]" if index is None else f"{place} loads[{j}]"
            idx = j if index is None else index
            self.keys(entry, _KEYS["load"], table, idx, where)
            if "at" not in entry or "force" not in entry:
                self.fail("a load needs 'at' and 'force'", table, idx, place=where)
            at = self.name_ref(entry["at"], station_names, "station", table, idx, "at", where)
            out.append(Load(at, self.quantity(entry["force"], "force", table=table, index=idx,
                                              key="force", place=where)))
        return tuple(out)

    def case_temperatures(self, entry, reference, i, place):
        if "temperature_change" in entry and "temperature" in entry:
            self.fail("give 'temperature_change' or 'temperature', not both", "cases", i,
                      "temperature", place=place)
        for key, kind in (("temperature_change", "temperature_difference"),
                          ("temperature", "temperature")):
            if key not in entry:
                continue
            value = entry[key]
            table = (value if isinstance(value, dict) and not is_toleranced(value)
                     else {"all": value})
            if kind == "temperature" and reference is None:
                self.fail("an absolute 'temperature' needs settings.reference_temperature",
                          "cases", i, key, place=place)
            out = []
            for name, v in table.items():
                t = self.quantity(v, kind, table="cases", index=i, key=key, place=place,
                                  item=name)
                out.append((name, t - reference if kind == "temperature" else t))
            return tuple(out)
        return ()


# the (table, key) pairs whose values may carry a tolerance
_TOLERABLE = {("stations", "x"), ("gaps", "clearance"), ("segments", "misfit"),
              ("segments", "preload"), ("segments", "temperature"),
              ("segments", "temperature_change"), ("segments", "distributed_load"),
              ("settings", "temperature"), ("settings", "temperature_change"), ("loads", "force"),
              ("cases", "force"), ("cases", "temperature"), ("cases", "temperature_change"),
              ("cases", "settlements"), ("materials", "elastic_modulus"),
              ("materials", "thermal_expansion"), ("supports", "stiffness"),
              ("supports", "displacement"),
              *(("sections", k) for k in ("diameter", "outer_diameter", "wall_thickness",
                                          "inner_diameter", "width", "height", "area"))}
_RANGE_GOT = re.compile(r"^(\w+ must (?:be positive|not be negative|be a finite number)): got .*$")
_FILE_KEY = {"start": "from", "end": "to", "stations": "between"}


def _against_temperature(value) -> bool:
    """Whether a material property is written as a table against temperature (a table
    that is not a toleranced value)."""
    return isinstance(value, dict) and not is_toleranced(value)


def _key_in(message: str, keys) -> str | None:
    """The file key that a validation message speaks of (the first one it names)."""
    found = [(m.start(), k) for k in keys if k and (m := re.search(rf"\b{re.escape(k)}\b", message))]
    return min(found)[1] if found else None


def _unit_ok(system, key, value) -> bool:
    """Whether one output unit of ``[units]`` is good on its own (to locate an error)."""
    try:
        OutputUnits.system(system if system in ("SI", "US") else "SI", **{key: value})
    except ModelError:
        return False
    return True


def _expr():
    """The expression parser, imported when a model needs it."""
    from ..symbolic import expressions

    return expressions


def _rational(fraction):
    import sympy

    return sympy.Rational(fraction.numerator, fraction.denominator)


def _surely_negative(value) -> bool:
    try:
        return bool(value < 0)
    except TypeError:  # a symbolic value whose sign is open
        return False


def parse_model(text: str, source: str | None = None, symbolic: bool = False,
                overrides: dict | None = None) -> Model:
    """Read a model from TOML text.

    Parameters
    ----------
    text : str
        The model file's contents.
    source : str, optional
        The file name shown in error messages.
    symbolic : bool
        Keep every value as an exact sympy expression of the declared
        ``[symbols]`` (for :func:`axialfe.symbolic.solve_symbolic`) instead of
        a float.  Without it, symbols are replaced by their values, and a
        symbol without a value is an error where it is used.
    overrides : dict, optional
        Values (SI) for toleranced inputs, by path (``'gaps.end-float.clearance'``),
        in place of their nominal values: one sample of a tolerance study.

    Raises
    ------
    ModelError
        For malformed TOML, unknown keys or names, wrong units and invalid values.
    """
    text = text[1:] if text.startswith("\ufeff") else text  # a byte-order mark is no content
    data = decode(text, source)
    with gc_paused():
        reader = _Reader(data, source, text, symbolic, overrides=overrides)
        # [stations] file = ... and [segments] file = ...: the tables they name, as entries
        reader.rows = expand_tables(data, source, lambda table, key: reader.line(table, None, key))
        return reader.model()


def states_claims(model: Model, path) -> bool:
    """False when ``model`` was read from ``path`` and its reader saw no ``claims`` or
    ``claims_file`` there (the file then need not be read again for them)."""
    return not (model.source == str(path) and model.lines
                and not {"claims", "claims_file"} & model.lines.keys())


def read_model(path, symbolic: bool = False) -> Model:
    """Read a model file (TOML); see :func:`parse_model`."""
    return parse_model(_read_text(path), str(Path(path)), symbolic)


def read_toleranced(path):
    """Read a model file for a tolerance study: the nominal model, and a function
    ``build({path: SI value})`` that reads it again with those toleranced inputs moved."""
    text, source = _read_text(path), str(Path(path))
    return parse_model(text, source), lambda values: parse_model(text, source, overrides=values)


def tolerance_note(found, what: str = "model") -> str | None:
    """The one stderr line of a command run on a file with toleranced inputs (``found``,
    the model's ``tolerances``), or None.  ``what`` names the file: model or joint."""
    if not found:
        return None
    one_sided = sum(t.tolerance.one_sided for t in found)
    text = (f"note: the {what} has {len(found)} toleranced input{'s' if len(found) > 1 else ''}; "
            "solved at the stated values")
    if one_sided:
        text += (f" ({one_sided} at the midpoint of limits that lie on one side of the stated "
                 "value)")
    return text + "; 'axialfe tolerance' studies them"


def _read_text(path) -> str:
    path = Path(path)
    return read_text(path, "model file")
