"""The declarative schema of the input files: every table and key, its type, its range.

One entry per key says what the key holds (:class:`Key`): its type, whether it
is required, its default and, for quantities and plain numbers, the physical
range of its SI value.  The reader runs :func:`check_types` over the parsed
TOML before any value is used, so a wrong type is always one located error
naming the key and the type expected (``from: expected a name in quotes: got
5``), and nothing downstream ever sees a value of the wrong type; names are
strings, always.  :func:`check_range` then bounds each converted value.

The model file's schema is :data:`MODEL`.  Adding a key is one entry in the
table it belongs to (see DEVELOPERS.md); the reader still decides what the key
means.
"""

from __future__ import annotations

import datetime
import math
from dataclasses import dataclass, field

from ..errors import suggest

__all__ = ["Key", "Table", "Range", "MODEL", "FILE_TABLE", "check_types", "check_range", "keys_of",
           "range_of", "MAX_NAME_LENGTH"]

MAX_NAME_LENGTH = 200
MIN_MAGNITUDE = 1e-100   # the smallest size of a non-zero value in SI (subnormals break rounding)


@dataclass(frozen=True)
class Range:
    """The physical range of a value in SI units: ``low <(=) value <(=) high``."""

    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False
    unit: str = ""     # SI unit shown in messages

    def text(self) -> str:
        u = f" {self.unit}" if self.unit else ""
        if self.low is not None and self.high is not None:
            lo = "above" if self.low_open else "from"
            hi = "below" if self.high_open else "up to"
            if self.low_open == self.high_open:
                return f"between {self.low:g} and {self.high:g}{u}"
            return f"{lo} {self.low:g}{u} {hi} {self.high:g}{u}"
        if self.high is not None:
            return f"{'below' if self.high_open else 'at most'} {self.high:g}{u}"
        return f"{'above' if self.low_open else 'at least'} {self.low:g}{u}"

    def holds(self, v: float) -> bool:
        if not math.isfinite(v):
            return False
        if self.low is not None and (v <= self.low if self.low_open else v < self.low):
            return False
        if self.high is not None and (v >= self.high if self.high_open else v > self.high):
            return False
        return True


@dataclass(frozen=True)
class Key:
    """One key of a table.

    Parameters
    ----------
    type : str
        ``"name"`` (a string naming something), ``"text"`` (free text),
        ``"quantity"`` (a number with a unit, of ``kind``), ``"number"`` (a plain
        number), ``"date"`` (text, or a TOML date such as ``2026-03-14``), ``"boolean"``,
        ``"table"`` (keys of ``item``), ``"array"`` (an
        array of tables of ``item``), ``"names"`` (an array of names), ``"map"``
        (a table of user-chosen names, each value described by ``item``, a
        :class:`Key`), ``"quantity_or_table"`` (a quantity, or a table of
        ``item``), ``"quantity_or_map"`` (a quantity, or a table of name =
        quantity), ``"any"`` (read by a parser of its own).
    kind : str, optional
        The kind of quantity (:data:`axialfe.units.KINDS`).
    required : bool
    default : object
        The value when the key is absent (None: the reader decides).
    range : Range, optional
        The physical range of the SI value (quantities and plain numbers).
    item : Table or Key, optional
    missing : str, optional
        The message when a required key is absent.
    """

    type: str
    kind: str | None = None
    required: bool = False
    default: object = None
    range: Range | None = None
    item: object = None
    missing: str | None = None


@dataclass(frozen=True)
class Table:
    """The keys of one table, and the noun of its entries (for messages)."""

    keys: dict = field(default_factory=dict)
    noun: str = "table"


def _q(kind, low=None, high=None, low_open=False, high_open=False, unit="", **kw):
    return Key("quantity", kind=kind, range=Range(low, high, low_open, high_open, unit), **kw)


def _n(low=None, high=None, low_open=False, high_open=False, **kw):
    return Key("number", range=Range(low, high, low_open, high_open), **kw)


# Physical ranges (common practice: generous bounds that no real axial member comes near;
# a value beyond them is a typing mistake, or a unit slip of many orders of magnitude).
_LENGTH = dict(high=1e5, unit="m")            # 100 km
_SIZE = dict(low=1e-6, high=100, unit="m")     # a micrometre to 100 m
_TEMPERATURE = dict(low=0, high=1e5, low_open=True, unit="K")
_CHANGE = dict(low=-1e5, high=1e5, unit="K")
_FORCE = dict(low=-1e12, high=1e12, unit="N")

SETTINGS = Table({
    "reference_temperature": _q("temperature", **_TEMPERATURE),
    "temperature_change": _q("temperature_difference", **_CHANGE),
    "temperature": _q("temperature", **_TEMPERATURE),
    "gravity": _q("acceleration", low=-1e3, high=1e3, unit="m/s^2"),
    "behaviour": Key("name"),
    "modulus_at": Key("name"),
}, "settings")
UNITS = Table({
    "system": Key("name", default="SI"),
    "force": Key("name"), "length": Key("name"), "displacement": Key("name"),
    "stress": Key("name"),
}, "units")
# where each value of a material comes from (the standard, table and edition; "from memory"
# where it was not checked against the text)
SOURCES = Table({k: Key("text") for k in (
    "elastic_modulus", "thermal_expansion", "yield_strength", "density", "poissons_ratio",
    "compressive_yield_strength", "hardening_modulus", "proof_strength", "tensile_strength",
    "mean_thermal_expansion", "thermal_expansion_total")},
    "sources")
MATERIAL = Table({
    # a modulus or a strength: a quantity, or a table against temperature
    "elastic_modulus": Key("quantity_or_map", kind="stress", required=True,
                           range=Range(1e3, 1e13, unit="Pa")),
    "thermal_expansion": _q("thermal_expansion", low=-1e-3, high=1e-3, unit="1/K"),
    "mean_thermal_expansion": Key("map", item=Key("quantity", kind="thermal_expansion"),
                                  range=Range(-1e-3, 1e-3, unit="1/K")),
    "thermal_expansion_total": Key("map", item=Key("quantity", kind="strain"),
                                   range=Range(-0.1, 0.1, unit="")),
    "yield_strength": Key("quantity_or_map", kind="stress", range=Range(1e3, 1e11, unit="Pa")),
    "density": _q("density", low=0, high=1e5, low_open=True, unit="kg/m^3"),
    "source": Key("text"), "description": Key("text"),
    "poissons_ratio": _n(low=0, high=0.5),
    "behaviour": Key("name"),
    "compressive_yield_strength": _q("stress", low=1e3, high=1e11, unit="Pa"),
    "hardening_modulus": _q("stress", low=0, high=1e13, unit="Pa"),
    # stated for the record (bolt classes), not used by the axial checks
    "proof_strength": _q("stress", low=1e3, high=1e11, unit="Pa"),
    "tensile_strength": _q("stress", low=1e3, high=1e11, unit="Pa"),
    "sources": Key("table", item=SOURCES),
}, "material")
SECTION = Table({
    "shape": Key("name"),  # required: the reader says so with the shapes it knows
    "diameter": _q("length", **_SIZE), "outer_diameter": _q("length", **_SIZE),
    "wall_thickness": _q("length", **_SIZE), "inner_diameter": _q("length", high=100, unit="m"),
    "width": _q("length", **_SIZE), "height": _q("length", **_SIZE),
    "area": _q("area", low=1e-12, high=1e4, unit="m^2"),
    "second_moment": _q("second_moment", low=1e-24, high=1e6, unit="m^4"),
}, "section")
STATION = Table({
    "x": _q("length", low=-1e5, **_LENGTH, required=True,
            missing="a station given as a table needs 'x' (its position)"),
    "braced": Key("boolean", default=False),
}, "station")
SEGMENT = Table({
    "name": Key("name"), "from": Key("name", required=True), "to": Key("name", required=True),
    "material": Key("name", required=True), "section": Key("name", required=True),
    "end_section": Key("name"),
    "temperature_change": _q("temperature_difference", **_CHANGE),
    "temperature": _q("temperature", **_TEMPERATURE),
    "misfit": _q("length", low=-100, high=100, unit="m", default=0.0),
    "distributed_load": _q("force_per_length", low=-1e12, high=1e12, unit="N/m", default=0.0),
    "buckling_length": _q("length", low=0, low_open=True, **_LENGTH),
    "effective_length_factor": _n(low=0, high=100, low_open=True),
    "preload": _q("force", **_FORCE),
}, "segment")
SUPPORT = Table({
    "at": Key("name", required=True), "kind": Key("name", default="fixed"),
    "stiffness": _q("stiffness", low=0, high=1e18, low_open=True, unit="N/m"),
    "displacement": _q("length", low=-100, high=100, unit="m"),
}, "support")
LOAD = Table({
    "at": Key("name", required=True, missing="a load needs 'at' and 'force'"),
    "force": _q("force", **_FORCE, required=True, missing="a load needs 'at' and 'force'"),
}, "load")
GAP = Table({
    "name": Key("name"), "between": Key("names"), "at": Key("name"), "side": Key("name"),
    "minus_side": Key("name"), "plus_side": Key("name"),
    "clearance": _q("length", low=-100, high=100, unit="m", required=True,
                    missing="a gap needs 'clearance' (it may be '0 mm')"),
    "kind": Key("name", default="contact"),
}, "gap")
SETTLEMENT = Table({
    "at": Key("name", required=True, missing="a settlement needs 'at' and 'displacement'"),
    "displacement": _q("length", low=-100, high=100, unit="m", required=True,
                       missing="a settlement needs 'at' and 'displacement'"),
}, "settlement")
CASE = Table({
    "name": Key("name", required=True), "loads": Key("array", item=LOAD),
    "temperature_change": Key("quantity_or_map", kind="temperature_difference",
                              range=Range(**_CHANGE)),
    "temperature": Key("quantity_or_map", kind="temperature", range=Range(**_TEMPERATURE)),
    "settlements": Key("array", item=SETTLEMENT),
}, "case")
COMBINATION = Table({
    "name": Key("name", required=True, missing="a combination needs 'name' and 'factors'"),
    "factors": Key("map", item=_n(low=-1e3, high=1e3), required=True,
                   missing="a combination needs 'name' and 'factors'"),
}, "combination")
CHECKS = Table({
    "safety_factor": _n(low=1, high=100, default=1.0),
    "effective_length_factor": _n(low=0, high=100, low_open=True, default=1.0),
    "column_curve": Key("name"),
}, "checks")
LIMIT = Table({
    "at": Key("name"), "displacement": _q("length", low=0, high=100, low_open=True, unit="m"),
    "gap": Key("name"), "min_opening": _q("length", low=0, high=100, low_open=True, unit="m"),
}, "limit")

# ``[stations] file = "stations.csv"`` or ``[segments] file = "segments.csv"``: the table kept
# in a CSV file beside the model (axialfe.io.tables; its columns are the keys of STATION's
# ``x`` and of SEGMENT, value columns with their unit in the header)
FILE_TABLE = Table({
    "file": Key("name", required=True, missing="a table kept in a file needs 'file'"),
}, "table file")

# the job of a report's title block: free text (a TOML date is taken as written)
PROJECT = Table({
    "name": Key("text"), "number": Key("text"), "prepared_by": Key("text"),
    "checked_by": Key("text"), "revision": Key("text"), "date": Key("date"),
}, "project")

MODEL = Table({
    "title": Key("text"),
    "project": Key("table", item=PROJECT),
    "settings": Key("table", item=SETTINGS),
    "units": Key("table", item=UNITS),
    "materials": Key("map", item=Key("table", item=MATERIAL)),
    "sections": Key("map", item=Key("table", item=SECTION)),
    "stations": Key("map", item=Key("quantity_or_table", kind="length", item=STATION,
                                    range=Range(low=-1e5, **_LENGTH))),
    "segments": Key("array", item=SEGMENT),
    "supports": Key("array", item=SUPPORT),
    "loads": Key("array", item=LOAD),
    "gaps": Key("array", item=GAP),
    "cases": Key("array", item=CASE),
    "combinations": Key("array", item=COMBINATION),
    "checks": Key("table", item=CHECKS),
    "limits": Key("array", item=LIMIT),
    "symbols": Key("any"),
    # stated values of a hand calculation: read and checked by axialfe.io.claims
    "claims": Key("any"),
    "claims_file": Key("text"),
}, "model")

# the file's table names against the schema's tables, for ranges and messages
_TABLES = {"settings": SETTINGS, "materials": MATERIAL, "sections": SECTION,
           "stations": STATION, "segments": SEGMENT, "supports": SUPPORT, "loads": LOAD,
           "gaps": GAP, "cases": CASE, "combinations": COMBINATION, "checks": CHECKS,
           "limits": LIMIT}


def keys_of(table: Table) -> tuple[str, ...]:
    """The keys a table allows, in the schema's order."""
    return tuple(table.keys)


def range_of(table: str | None, key: str | None) -> Range | None:
    """The range of ``key`` in the file's table ``table`` (``"segments"``, ``"materials.x"``)."""
    if not table or not key:
        return None
    top = table.split(".")[0]
    if top == "stations":
        return MODEL.keys["stations"].item.range if "." not in table else STATION.keys["x"].range
    schema = _TABLES.get(top)
    if schema is None:
        return None
    if top == "cases" and key == "settlements":
        return SETTLEMENT.keys["displacement"].range
    if top in ("cases", "loads") and key == "force":
        return LOAD.keys["force"].range
    entry = schema.keys.get(key)
    return entry.range if entry is not None else None


def check_range(value, table, key) -> str | None:
    """The message when the SI ``value`` of ``key`` lies outside its range, else None."""
    rng = range_of(table, key)
    if rng is None or not isinstance(value, float):
        return None
    if rng.holds(value) and not 0 < abs(value) < MIN_MAGNITUDE:
        return None
    if not math.isfinite(value):
        return f"{key} must be a finite number: got {value}"
    got = f"got {value:g} {rng.unit}".rstrip()
    if rng.holds(value):  # in range but subnormal: no physical value in SI is this small
        return f"{key} must be 0 or at least {MIN_MAGNITUDE:g}{_u(rng)} in size: {got}"
    if rng.low is not None and value <= 0 and (rng.low > 0 or (rng.low == 0 and rng.low_open)):
        return f"{key} must be positive: {got}"
    if rng.low == 0 and not rng.low_open and value < 0:
        return f"{key} must not be negative: {got}"
    if rng.low is not None and rng.high is not None:
        return f"{key} must lie {rng.text()}: {got}"
    if rng.high is not None and value > rng.high:
        return f"{key} must be at most {rng.high:g}{_u(rng)}: {got}"
    elif rng.low is not None and value < rng.low:
        return f"{key} must be at least {rng.low:g}{_u(rng)}: {got}"
    return f"{key} must lie {rng.text()}: {got}"


def _u(rng):
    return f" {rng.unit}" if rng.unit else ""


# --- the type pass -------------------------------------------------------------
_EXPECTED = {"name": "a name in quotes", "text": "text in quotes", "number": "a plain number",
             "boolean": "true or false", "table": "a table", "names": "an array of names",
             "date": "a date, or text in quotes"}


def _shown(value) -> str:
    text = repr(value)
    return text if len(text) <= 40 else text[:37] + "..."


def _is_number(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _type_ok(key: Key, v) -> bool:
    t = key.type
    if t in ("name", "text"):
        return isinstance(v, str)
    if t == "date":
        return isinstance(v, str) or (isinstance(v, datetime.date)
                                      and not isinstance(v, datetime.datetime))
    if t == "number":
        return _is_number(v)
    if t == "boolean":
        return isinstance(v, bool)
    if t in ("table", "map"):
        return isinstance(v, dict)
    if t == "array":
        return isinstance(v, list)
    if t == "names":
        return isinstance(v, list)
    if t == "quantity":  # a table with 'value' is a toleranced value ({ value = ..., std = ... })
        return isinstance(v, str) or _is_number(v) or (isinstance(v, dict) and "value" in v)
    if t in ("quantity_or_table", "quantity_or_map"):
        return isinstance(v, (str, dict)) or _is_number(v)
    return True


def _expected(key: Key, name: str) -> str:
    from ..units import describe

    if key.type == "quantity":
        kind = describe(key.kind)
        return ("an " if kind[0] in "aeiou" else "a ") + kind
    if key.type in ("quantity_or_table", "quantity_or_map"):
        kind = describe(key.kind)
        return ("an " if kind[0] in "aeiou" else "a ") + kind + ", or a table"
    if key.type == "array":
        return f"an array of tables ([[{name}]])"
    if key.type == "map":
        return "a table"
    return _EXPECTED[key.type]


def check_types(data: dict, fail, schema: Table = MODEL) -> None:
    """Check every key of ``data`` against ``schema`` before any value is read.

    ``fail(message, table, index, key, place, hint=None, options=None)`` raises
    the located error (the reader's :meth:`fail`).  Unknown keys are refused with
    a suggestion; a value of the wrong type names the key and the type expected;
    a required key that is missing says what needs it.
    """
    _table(data, schema, fail, table=None, index=None, place="top level", top=True)


def _table(entry, schema, fail, table, index, place, top=False):
    allowed = keys_of(schema)
    for k, v in entry.items():
        spec = schema.keys.get(k)
        if spec is None:
            t = (k if isinstance(v, (dict, list)) else None) if top else table
            fail(f"unknown key '{k}'", t, index, k, place, hint=suggest(k, allowed),
                 options=allowed)
        _value(k, v, spec, fail, table, index, place, top)
    for k, spec in schema.keys.items():
        if spec.required and k not in entry:
            fail(spec.missing or f"a {schema.noun} needs '{k}'", table, index, None, place)


# the types a string is right for, with nothing inside it to check but a name's length
_TEXT_TYPES = frozenset({"name", "text", "date", "quantity", "quantity_or_table",
                         "quantity_or_map", "any"})


def _value(k, v, spec, fail, table, index, place, top):
    if type(v) is str and spec.type in _TEXT_TYPES:   # most values: the checks below, at once
        if spec.type == "name" and len(v) > MAX_NAME_LENGTH:
            fail(f"{k}: a name of {len(v)} characters is too long (at most {MAX_NAME_LENGTH})",
                 table, index, k, place)
        return
    if (isinstance(v, (datetime.date, datetime.time)) and spec.type not in ("any", "date")
            or spec.type == "date" and isinstance(v, (datetime.datetime, datetime.time))):
        fail(f"{k}: expected {_expected(spec, k)}: got a date or time ({v})",
             table, index, k, place)
    if not _type_ok(spec, v):
        if spec.type == "array" and top:
            fail(f"'{k}' must be an array of tables ([[{k}]])", k, None, None, place)
        fail(f"{k}: expected {_expected(spec, k)}: got {_shown(v)}",
             k if top and isinstance(v, (dict, list)) else table, index, k,
             None if top else place)
    if spec.type in ("name", "text") and len(v) > MAX_NAME_LENGTH and spec.type == "name":
        fail(f"{k}: a name of {len(v)} characters is too long (at most {MAX_NAME_LENGTH})",
             table, index, k, place)
    if spec.type == "table":
        sub = k if top else f"{table}.{k}"
        _table(v, spec.item, fail, sub, None, k if top else f"{place} {k}")
    elif spec.type == "array":
        for i, item in enumerate(v, 1):
            if top:
                where = f"{k}[{i}]" + (f" ('{item['name']}')" if isinstance(item, dict)
                                       and isinstance(item.get("name"), str)
                                       and len(item["name"]) <= MAX_NAME_LENGTH else "")
                t, idx = k, i
            else:
                where, t, idx = f"{place} {k}[{i}]", table, index
            if not isinstance(item, dict):
                fail(f"expected a table: got {type(item).__name__}", t, idx, None if top else k,
                     where)
            _table(item, spec.item, fail, t, idx, where)
    elif spec.type == "names":
        for item in v:
            if not isinstance(item, str):
                fail(f"{k}: expected a name in quotes: got {_shown(item)}", table, index, k, place)
    elif spec.type == "map":
        item_spec = spec.item
        for name, sub in v.items():
            if len(name) > MAX_NAME_LENGTH:
                fail(f"a name of {len(name)} characters is too long (at most {MAX_NAME_LENGTH})",
                     k if top else table, index, None, k if top else place)
            where = f"{k}.{name}" if top else place
            if item_spec.type == "table":
                if not isinstance(sub, dict):
                    fail(f"expected a table: got {type(sub).__name__}", f"{k}.{name}", None,
                         None, where)
                _table(sub, item_spec.item, fail, f"{k}.{name}", None, where)
            else:
                _value(name, sub, item_spec, fail, k if top else table, index,
                       k if top else place, False)
    elif spec.type in ("quantity_or_table", "quantity_or_map") and isinstance(v, dict) \
            and "value" in v:
        pass  # a toleranced value: its own reader checks it
    elif spec.type == "quantity_or_table" and isinstance(v, dict):
        _table(v, spec.item, fail, f"{table or ''}.{k}".lstrip("."), None, f"{place}.{k}")
    elif spec.type == "quantity_or_map" and isinstance(v, dict):
        inner = Key("quantity", kind=spec.kind)
        for name, sub in v.items():
            if not _type_ok(inner, sub) or isinstance(sub, bool):
                fail(f"{k}: expected {_expected(inner, k)} for '{name}': got {_shown(sub)}",
                     table, index, k, place)
