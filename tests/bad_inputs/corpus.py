"""The corpus of bad model files: a full valid model, and hundreds of ways to spoil it.

Each entry is ``(name, text)``: a TOML text that must be refused with one
located error line.  The entries are built from the declarative schema (a
wrong type, a missing required key and an out-of-range value for every key)
and from a list of hostile inputs written by hand (power towers, deep nesting,
line separators, dates as names, injection strings, duplicates, extremes).
The expected lines live in ``expected.txt`` beside this file; regenerate them
with ``python tests/bad_inputs/corpus.py`` and review the difference.
"""

from __future__ import annotations

import copy
import datetime
import json
import math
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
EXPECTED = os.path.join(HERE, "expected.txt")

# Every table and nearly every key of the model file; the model solves.  (Invented data.)
BASE = {
    "title": "corpus base",
    "settings": {"reference_temperature": "20 degC", "gravity": "-9.81 m/s^2",
                 "modulus_at": "temperature"},
    "units": {"system": "SI", "force": "kN", "length": "mm", "displacement": "mm",
              "stress": "MPa"},
    "materials": {"steel-a": {"elastic_modulus": "200 GPa", "thermal_expansion": "12e-6 /K",
                              "yield_strength": "250 MPa", "density": "7850 kg/m^3",
                              "source": "invented", "description": "demo steel",
                              "poissons_ratio": 0.3, "proof_strength": "230 MPa",
                              "tensile_strength": "400 MPa",
                              "sources": {"yield_strength": "invented"}},
                  "steel-hot": {"elastic_modulus": {"-50 degC": "205 GPa", "400 degC": "180 GPa"},
                                "density": "7850 kg/m^3",
                                "yield_strength": {"-50 degC": "260 MPa", "400 degC": "190 MPa"},
                                "mean_thermal_expansion": {"reference": "20 degC",
                                                           "-50 degC": "11.2e-6 /K",
                                                           "400 degC": "13.1e-6 /K"}},
                  "steel-total": {"elastic_modulus": "200 GPa",
                                  "thermal_expansion_total": {"reference": "20 degC",
                                                              "-50 degC": "-0.8 mm/m",
                                                              "400 degC": "5.0 mm/m"}}},
    "sections": {"rod": {"shape": "round", "diameter": "20 mm"},
                 "pipe": {"shape": "tube", "outer_diameter": "40 mm", "wall_thickness": "4 mm"},
                 "bar": {"shape": "rectangle", "width": "30 mm", "height": "10 mm"},
                 "rod2": {"shape": "round", "diameter": "24 mm"},
                 "plain": {"shape": "area", "area": "300 mm^2", "second_moment": "8000 mm^4"}},
    "stations": {"a": "0 mm", "b": {"x": "300 mm", "braced": True}, "c": "600 mm",
                 "d": "600 mm", "e": "900 mm"},
    "segments": [
        {"name": "s1", "from": "a", "to": "b", "material": "steel-a", "section": "rod",
         "end_section": "rod2", "temperature_change": "10 K", "misfit": "0.01 mm",
         "distributed_load": "1 kN/m", "buckling_length": "300 mm",
         "effective_length_factor": 1.0},
        {"name": "s2", "from": "b", "to": "c", "material": "steel-hot", "section": "bar",
         "temperature": "40 degC"},
        {"name": "s3", "from": "d", "to": "e", "material": "structural-steel",
         "section": "plain"},
    ],
    "supports": [{"at": "a", "kind": "fixed"},
                 {"at": "e", "kind": "spring", "stiffness": "50 kN/mm"},
                 {"at": "e", "kind": "settlement", "displacement": "0 mm"}],
    "gaps": [{"name": "g1", "between": ["c", "d"], "clearance": "0.1 mm", "kind": "contact"},
             {"name": "g2", "at": "b", "side": "+x", "clearance": "2 mm"},
             {"name": "g3", "minus_side": "b", "plus_side": "e", "clearance": "5 mm"}],
    "cases": [{"name": "hot", "loads": [{"at": "b", "force": "5 kN"}],
               "temperature_change": {"s1": "30 K", "s2": "20 K"},
               "settlements": [{"at": "e", "displacement": "0.01 mm"}]},
              {"name": "cold", "temperature": "-10 degC"}],
    "combinations": [{"name": "both", "factors": {"hot": 1.35, "cold": 1.0}}],
    "checks": {"safety_factor": 1.5, "effective_length_factor": 1.0, "column_curve": "johnson"},
    "limits": [{"at": "c", "displacement": "5 mm"}, {"gap": "g2", "min_opening": "0.1 mm"}],
    # last, so that adding it moved no line of the entries before it
    "project": {"name": "corpus job", "number": "C-1", "prepared_by": "A. Writer",
                "checked_by": "B. Reader", "revision": "0", "date": "2026-01-05"},
}

# a path in BASE: ("segments", 0, "misfit")
_TABLE_OF = {"settings": "settings", "units": "units", "checks": "checks"}


def dumps(data) -> str:
    """A small TOML writer for the corpus (tables, arrays of tables, inline values)."""
    out = []
    plain = {k: v for k, v in data.items() if not _is_table(v) and not _is_aot(v)}
    for k, v in plain.items():
        out.append(f"{_key(k)} = {_value(v)}")
    for k, v in data.items():
        if _is_table(v):
            _table(out, [k], v)
        elif _is_aot(v):
            for item in v:
                out.append("")
                out.append(f"[[{_key(k)}]]")
                for kk, vv in item.items():
                    out.append(f"{_key(kk)} = {_value(vv)}")
    return "\n".join(out) + "\n"


def _table(out, path, table):
    simple = {k: v for k, v in table.items() if not _is_table(v)}
    nested = {k: v for k, v in table.items() if _is_table(v)}
    if simple or not nested:
        out.append("")
        out.append("[" + ".".join(_key(p) for p in path) + "]")
        for k, v in simple.items():
            out.append(f"{_key(k)} = {_value(v)}")
    for k, v in nested.items():
        _table(out, path + [k], v)


def _is_table(v):
    return isinstance(v, dict) and not getattr(v, "inline", False)


def _is_aot(v):
    return isinstance(v, list) and v and all(isinstance(i, dict) for i in v)


class Inline(dict):
    inline = True


def _key(k):
    k = str(k)
    return k if k and all(c.isalnum() or c in "-_" for c in k) else json.dumps(k)


def _value(v):
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, (int, float)):
        if isinstance(v, float) and math.isinf(v):
            return "inf" if v > 0 else "-inf"
        if isinstance(v, float) and math.isnan(v):
            return "nan"
        return repr(v)
    if isinstance(v, str):
        return json.dumps(v, ensure_ascii=False)
    if isinstance(v, (datetime.date, datetime.datetime, datetime.time)):
        return v.isoformat()
    if isinstance(v, list):
        return "[" + ", ".join(_value(i) for i in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{_key(k)} = {_value(x)}" for k, x in v.items()) + " }"
    raise TypeError(v)


# --- built from the schema -------------------------------------------------------
def _paths():
    """Every (path, Key) of BASE that the schema describes."""
    from axialfe.io import schema as S

    tops = {"settings": S.SETTINGS, "units": S.UNITS, "checks": S.CHECKS,
            "project": S.PROJECT}
    arrays = {"segments": S.SEGMENT, "supports": S.SUPPORT, "gaps": S.GAP, "cases": S.CASE,
              "combinations": S.COMBINATION, "limits": S.LIMIT}
    for top, table in tops.items():
        for key in BASE[top]:
            yield (top, key), table.keys[key]
    for name, entry in BASE["materials"].items():
        for key in entry:
            yield ("materials", name, key), S.MATERIAL.keys[key]
    for name, entry in BASE["sections"].items():
        for key in entry:
            yield ("sections", name, key), S.SECTION.keys[key]
    yield ("stations", "a"), S.MODEL.keys["stations"].item
    yield ("stations", "b", "x"), S.STATION.keys["x"]
    yield ("stations", "b", "braced"), S.STATION.keys["braced"]
    for top, table in arrays.items():
        for i, entry in enumerate(BASE[top]):
            for key in entry:
                yield (top, i, key), table.keys[key]
    yield ("cases", 0, "loads", 0, "at"), S.LOAD.keys["at"]
    yield ("cases", 0, "loads", 0, "force"), S.LOAD.keys["force"]
    yield ("cases", 0, "settlements", 0, "at"), S.SETTLEMENT.keys["at"]
    yield ("cases", 0, "settlements", 0, "displacement"), S.SETTLEMENT.keys["displacement"]
    yield ("title",), S.MODEL.keys["title"]


def _get(data, path):
    for p in path[:-1]:
        data = data[p]
    return data


_WRONG = {"name": [5, ["x"], "INLINE"], "text": [5, ["x"]], "number": ["1.5", [1]],
          "boolean": ["yes", 1], "quantity": [[20], True, "INLINE"],
          "quantity_or_table": [[20], False], "quantity_or_map": [[1], True],
          "names": [5, "c"], "array": [5], "map": [5, "x"], "table": [5],
          "date": [5, datetime.time(12, 30), datetime.datetime(2026, 1, 5, 9, 0)]}
_OUT = {"length": "m", "area": "m^2", "second_moment": "m^4", "force": "N", "stress": "Pa",
        "thermal_expansion": "1/K", "force_per_length": "N/m", "density": "kg/m^3",
        "acceleration": "m/s^2", "stiffness": "N/m", "temperature_difference": "K",
        "temperature": "K"}


def schema_cases():
    out = []
    for path, key in _paths():
        label = ".".join(str(p) for p in path)
        for j, wrong in enumerate(_WRONG.get(key.type, [])):
            data = copy.deepcopy(BASE)
            _get(data, path)[path[-1]] = Inline({"k": "v"}) if wrong == "INLINE" else wrong
            out.append((f"type:{label}:{j}", dumps(data)))
        if key.required:
            data = copy.deepcopy(BASE)
            del _get(data, path)[path[-1]]
            out.append((f"missing:{label}", dumps(data)))
        rng = key.range
        if rng is not None and (key.type in ("quantity", "number")
                                or key.type == "quantity_or_map" and path[0] == "materials"):
            for side, bound in (("high", rng.high), ("low", rng.low)):
                if bound is None:
                    continue
                if side == "high":
                    beyond = bound * 10 + 1
                elif bound < 0:
                    beyond = bound * 10
                elif bound == 0:
                    beyond = 0.0 if rng.low_open else -1.0
                else:
                    beyond = bound * 0.5
                if key.type == "number":
                    value = float(beyond)
                else:
                    value = f"{beyond:g} {_OUT[key.kind]}"
                data = copy.deepcopy(BASE)
                _get(data, path)[path[-1]] = value
                out.append((f"range:{label}:{side}", dumps(data)))
    return out


def _with(**changes):
    data = copy.deepcopy(BASE)
    for dotted, value in changes.items():
        path = [int(p) if p.isdigit() else p for p in dotted.split("__")]
        _get(data, path)[path[-1]] = value
    return dumps(data)


def _without(*dotted):
    data = copy.deepcopy(BASE)
    for d in dotted:
        path = [int(p) if p.isdigit() else p for p in d.split("__")]
        del _get(data, path)[path[-1]]
    return dumps(data)


def hostile_cases():
    base = dumps(BASE)
    deep = "x = " + "[" * 5000 + "]" * 5000 + "\n"
    deep_table = "x = " + "{a = " * 3000 + "1" + "}" * 3000 + "\n"
    c = []
    add = lambda name, text: c.append((name, text))  # noqa: E731
    # power towers and long values, in units and expressions
    add("tower:unit", _with(segments__0__misfit="20 mm^9^9^9"))
    add("tower:starstar", _with(segments__0__misfit="1 mm**9**9"))
    add("tower:force-unit", _with(units__force="9**9**9 kN"))
    add("tower:output-unit", _with(units__stress="MPa^99"))
    add("tower:nested-expr", _with(segments__0__misfit="(((2**16)**16)**16) mm"))
    add("tower:nested-expr2", _with(segments__0__misfit="((2^2)^8)^2 * 1 mm"))
    add("unit:long", _with(segments__0__misfit="1 " + "m*" * 80 + "m"))
    add("expr:long", _with(segments__0__misfit="1 mm + " * 80 + "1 mm"))
    add("unit:exponent-word", _with(segments__0__misfit="1 mm^x"))
    # nesting
    add("deep:array", deep)
    add("deep:inline", deep_table)
    add("deep:in-value", base + "[extra]\n" + deep)
    # not TOML, or TOML ending abruptly
    add("toml:truncated", base[: base.index("[[segments]]") + 5])
    add("toml:end-no-newline", base + "z = ")
    add("toml:bare", "this is not toml")
    add("toml:empty", "")
    add("toml:only-comment", "# nothing here\n")
    add("toml:nul", base + "\x00")
    add("toml:duplicate-table", base + '\n[settings]\ngravity = "0 m/s^2"\n')
    add("toml:duplicate-key", base.replace('title = "corpus base"',
                                           'title = "a"\ntitle = "b"'))
    # line separators: TOML counts only \n
    for sep, nm in (("\u2028", "u2028"), ("\u2029", "u2029"), ("\u0085", "u0085"),
                    ("\x0c", "formfeed")):
        text = base.replace('title = "corpus base"', f'title = "corpus{sep}base"')
        add(f"lines:{nm}", text.replace('misfit = "0.01 mm"', 'misfit = "0.01"'))
    add("lines:crlf", base.replace("\n", "\r\n").replace('misfit = "0.01 mm"', 'misfit = "0.01"'))
    add("lines:bom", "\ufeff" + base.replace('misfit = "0.01 mm"', 'misfit = "0.01"'))
    # names that are not strings, or odd strings
    add("name:int-gap", _with(gaps__0__name=7))
    add("name:inf-gap", _with(gaps__0__name=math.inf))
    add("name:date-gap", _with(gaps__0__name=datetime.date(2020, 1, 2)))
    add("name:time-case", _with(cases__0__name=datetime.time(12, 30)))
    add("name:int-combination", _with(combinations__0__name=3))
    add("name:list-combination", _with(combinations__0__name=["g"]))
    add("name:table-title", _with(title=Inline({"a": 1})))
    add("project:not-a-table", _with(project="job 12"))
    add("project:misspelt-key", base.replace('checked_by = "B. Reader"', 'checkedby = "B. Reader"'))
    add("name:int-title", _with(title=5))
    add("name:shape-list", _with(sections__rod__shape=["round"]))
    add("name:system-list", _with(units__system=["SI"]))
    add("name:unit-int", _with(units__force=5))
    add("name:limit-at-list", _with(limits__0__at=["b"]))
    add("name:between-ints", _with(gaps__0__between=[1, 2]))
    add("name:between-three", _with(gaps__0__between=["c", "d", "e"]))
    add("name:huge", _with(segments__0__name="n" * 5000))
    add("name:huge-station", dumps(_set(BASE, ("stations", "s" * 300), "1 mm")))
    add("name:unknown-station", _with(segments__0__to="zz"))
    add("name:misspelt-material", _with(segments__0__material="steel-b"))
    add("name:misspelt-section", _with(segments__1__section="bars"))
    # tables and arrays of the wrong shape
    add("shape:materials-int", _with(materials=5))
    add("shape:sections-str", _with(sections="rod"))
    add("shape:settlements-int", _with(cases__0__settlements=5))
    add("shape:settlements-str-items", _with(cases__0__settlements=["e"]))
    add("shape:loads-int", _with(cases__0__loads=5))
    add("shape:factors-list", _with(combinations__0__factors=[1, 2]))
    add("shape:factor-str", _with(combinations__0__factors=Inline({"hot": "x"})))
    add("shape:segments-table", _with(segments=Inline({"a": 1})))
    add("shape:stations-list", _with(stations=["a"]))
    add("shape:stations-empty", _with(stations=Inline({})))
    add("shape:material-int", dumps(_set(BASE, ("materials", "steel-a"), 5)))
    add("shape:symbols-int", dumps({**copy.deepcopy(BASE), "symbols": 5}))
    # tables kept in CSV files (axialfe.io.tables): where the file may be, the table's keys
    add("file:stations-absolute", _with(stations={"file": "/etc/passwd"}))
    add("file:stations-escape", _with(stations={"file": "../../etc/passwd"}))
    add("file:stations-escape-inside", _with(stations={"file": "data/../../m.csv"}))
    add("file:stations-missing", _with(stations={"file": "no-such-stations.csv"}))
    add("file:stations-empty-name", _with(stations={"file": ""}))
    add("file:stations-and-more", _with(stations={"file": "st.csv", "a": "0 mm"}))
    add("file:segments-absolute", _with(segments={"file": "/dev/zero"}))
    add("file:segments-int", _with(segments={"file": 5}))
    add("file:segments-typo", _with(segments={"fil": "segments.csv"}))
    add("file:segments-empty-table", _with(segments={}))
    add("file:stations-nul", _with(stations={"file": "st\x00.csv"}))
    add("file:stations-long", _with(stations={"file": "a/" * 3000 + "x.csv"}))
    # misspelt keys and tables
    add("key:material-singular", base + '\n[material.m]\nelastic_modulus = "1 GPa"\n')
    add("key:segment-typo", base.replace('misfit = "0.01 mm"', 'mistfit = "0.01 mm"'))
    add("key:top-typo", base + 'titel = "x"\n')
    add("key:case-typo", base.replace('name = "cold"', 'name = "cold"\ntemperatur = "1 K"'))
    # injection strings, where values and names belong
    for i, evil in enumerate(("__import__('os').system('true')", "eval('1')", "${HOME}",
                              "'; DROP TABLE x; --", "lambda: 0", "1e999 mm", "nan mm",
                              "inf mm", "-inf mm", "0x10 mm", "1_000 mm", "1,5 mm",
                              "mm", "", " ", "10 mm mm", "10 kg", "10 degC")):
        add(f"inject:misfit:{i}", _with(segments__0__misfit=evil))
    add("inject:symbol", base + '\n[symbols]\nP = "__import__(\'os\')"\n')
    # extreme but typed values
    add("extreme:tiny-segment", _with(stations__b=Inline({"x": "1e-300 m", "braced": True}),
                                      stations__a="0 m"))
    add("extreme:misfit", _with(segments__0__misfit="1e300 mm"))
    add("extreme:temperature", _with(segments__1__temperature="1e300 degC"))
    add("extreme:below-zero-change", dumps(_set(_without_data("cases", "combinations"),
                                                ("segments", 0, "temperature_change"), "-400 K")))
    add("extreme:case-below-zero", _with(cases__0__temperature_change=Inline({"s1": "-350 K"})))
    add("extreme:combination-below-zero", _with(
        cases__0__temperature_change=Inline({"s1": "-200 K"}),
        combinations__0__factors=Inline({"hot": 1.5, "cold": 1.0})))
    add("extreme:safety-1e308", _with(checks__safety_factor=1e308))
    add("extreme:yield-denormal", dumps(_set(BASE, ("materials", "steel-a", "yield_strength"),
                                             "5e-324 MPa")))
    add("extreme:buckling-length", _with(segments__0__buckling_length="1e300 m"))
    add("extreme:modulus-inf", dumps(_set(BASE, ("materials", "steel-a", "elastic_modulus"),
                                          "inf GPa")))
    add("extreme:factor-inf", _with(combinations__0__factors=Inline({"hot": math.inf})))
    add("extreme:factor-nan", _with(combinations__0__factors=Inline({"hot": math.nan})))
    add("extreme:poisson-nan", dumps(_set(BASE, ("materials", "steel-a", "poissons_ratio"),
                                          math.nan)))
    add("extreme:elf-inf", _with(checks__effective_length_factor=math.inf))
    add("extreme:clearance-negative", _with(gaps__0__clearance="-1 mm"))
    add("extreme:stiffness-zero", _with(supports__1__stiffness="0 N/m"))
    # duplicates and conflicts
    add("dup:combination-name", _with(combinations=[
        {"name": "both", "factors": Inline({"hot": 1.0})},
        {"name": "both", "factors": Inline({"cold": 1.0})}]))
    add("dup:combination-is-case", _with(combinations__0__name="hot"))
    add("dup:case-name", _with(cases__1__name="hot"))
    add("dup:gap-name", _with(gaps__1__name="g1"))
    add("dup:segment-name", _with(segments__1__name="s1"))
    add("dup:second-combination-error", _with(combinations=[
        {"name": "ok", "factors": Inline({"hot": 1.0})},
        {"name": "bad", "factors": Inline({"hott": 1.0})}]))
    add("dup:identical-gaps", _with(gaps=[
        {"name": "g1", "between": ["c", "d"], "clearance": "0 mm"},
        {"name": "g2", "between": ["c", "d"], "clearance": "0 mm"}]))
    add("conflict:temperature-both", _with(segments__1__temperature_change="1 K"))
    add("conflict:gap-both", _with(gaps__0__at="c"))
    add("conflict:gap-side-alone", _with(gaps=[
        {"name": "g1", "minus_side": "c", "clearance": "0.1 mm"}]))
    add("conflict:gap-side-and-between", _with(gaps=[
        {"name": "g1", "minus_side": "c", "plus_side": "d", "between": ["c", "d"],
         "clearance": "0.1 mm"}]))
    add("conflict:gap-side-unknown", _with(gaps=[
        {"name": "g1", "minus_side": "c", "plus_side": "dd", "clearance": "0.1 mm"}]))
    add("toml:dotted-material-name", base.replace("[materials.steel-a]", "[materials.steel-a.1]"))
    add("conflict:gap-side-missing", _without("gaps__1__side"))
    add("conflict:tube-both", _with(sections__pipe__inner_diameter="30 mm"))
    add("conflict:wall-too-thick", _with(sections__pipe__wall_thickness="30 mm"))
    add("conflict:round-width", _with(sections__rod__width="3 mm"))
    add("conflict:no-reference", _without("settings__reference_temperature"))
    add("conflict:settlement-unsettled", _with(cases__0__settlements=[
        {"at": "a", "displacement": "1 mm"}]))
    add("conflict:curve-unknown", _with(checks__column_curve="eulerish"))
    add("conflict:kind-unknown", _with(supports__0__kind="glued"))
    add("conflict:gap-kind-unknown", _with(gaps__0__kind="magnet"))
    add("conflict:side-bad", _with(gaps__1__side="up"))
    add("conflict:shape-unknown", _with(sections__rod__shape="hexagon"))
    add("conflict:system-unknown", _with(units__system="CGS"))
    add("conflict:stress-unit-length", _with(units__stress="mm"))
    add("conflict:same-position", _with(stations__c="300 mm"))
    add("conflict:settlement-without-support", _with(supports=[{"at": "c"}]))
    add("conflict:floating", _without("supports", "cases", "combinations", "limits", "gaps"))
    # tables against temperature
    hot = "materials__steel-hot__"
    add("table:outside", _with(cases__1__temperature="450 degC"))
    add("table:reference-outside", _with(settings__reference_temperature="-60 degC"))
    add("table:no-reference", _with(**{hot + "mean_thermal_expansion": {
        "-50 degC": "11.2e-6 /K", "400 degC": "13.1e-6 /K"}}))
    add("table:reference-in-modulus", _with(**{hot + "elastic_modulus": {
        "reference": "20 degC", "-50 degC": "205 GPa", "400 degC": "180 GPa"}}))
    add("table:one-entry", _with(**{hot + "elastic_modulus": {"20 degC": "205 GPa"}}))
    add("table:temperature-key", _with(**{hot + "yield_strength": {
        "hot": "260 MPa", "400 degC": "190 MPa"}}))
    add("table:temperature-key-unit", _with(**{hot + "yield_strength": {
        "20 MPa": "260 MPa", "400 degC": "190 MPa"}}))
    add("table:value-unit", _with(**{hot + "elastic_modulus": {
        "-50 degC": "205 mm", "400 degC": "180 GPa"}}))
    add("table:value-range", _with(**{hot + "elastic_modulus": {
        "-50 degC": "205 TPa", "400 degC": "180 GPa"}}))
    add("table:value-type", _with(**{hot + "elastic_modulus": {
        "-50 degC": 205, "400 degC": "180 GPa"}}))
    add("table:strain-unit", _with(**{"materials__steel-total__thermal_expansion_total": {
        "reference": "20 degC", "-50 degC": "-0.8 MPa", "400 degC": "5.0 mm/m"}}))
    add("table:two-expansions", _with(**{hot + "thermal_expansion": "12e-6 /K"}))
    add("table:no-reference-temperature", _without("settings__reference_temperature",
                                                    "segments__1__temperature",
                                                    "cases__1__temperature"))
    add("table:modulus-at", _with(settings__modulus_at="installed"))
    add("table:preload", _with(segments__2__preload="5 kN"))
    # tables against temperature on an elastic-plastic path (the case and path in PATHS)
    for name in PATHS:
        add(name, base)
    # toleranced values
    add("tolerance:trailing-plus-minus", _with(gaps__0__clearance="0.20 mm ±"))
    add("tolerance:deviations-reversed", _with(segments__0__misfit="0.1 mm -0.02/+0.03"))
    add("tolerance:deviation-with-unit", _with(stations__c="600 mm ±1 mm"))
    add("tolerance:table-key", _with(cases__0__loads__0__force={"value": "2 kN",
                                                                "sd": "0.1 kN"}))
    add("tolerance:table-no-value", _with(gaps__0__clearance={"plus": "0.1 mm",
                                                              "minus": "0.1 mm"}))
    add("tolerance:distribution", _with(**{"materials__steel-a__elastic_modulus": {
        "value": "200 GPa", "plus": "5 GPa", "minus": "5 GPa", "distribution": "triangular"}}))
    add("tolerance:not-allowed", _with(**{"materials__steel-a__yield_strength": "250 MPa ±10"}))
    add("tolerance:std-negative", _with(gaps__0__clearance={"value": "0.2 mm",
                                                            "std": "-0.01 mm"}))
    return c


def _without_data(*keys):
    data = copy.deepcopy(BASE)
    for k in keys:
        del data[k]
    return data


def _set(data, path, value):
    data = copy.deepcopy(data)
    _get(data, path)[path[-1]] = value
    return data


# entries run through `axialfe path` instead of `solve`: name -> (case, path)
PATHS = {
    "path:table-above": ("cold", "temperature-change 0 K..500 K"),
    "path:table-below": ("hot", "temperature 20 degC..-80 degC"),
    "path:table-factor-later-leg": ("cold", "temperature-factor 0..1; temperature-factor 1..2.5"),
}


def all_cases():
    seen, out = set(), []
    for name, text in schema_cases() + hostile_cases():
        if name in seen:
            raise AssertionError(f"two corpus entries named {name}")
        seen.add(name)
        out.append((name, text))
    return out


def outcome(text: str, name: str | None = None) -> str:
    """The one line the tool gives for ``text``: ``error: ...``, or ``solved: ...``.

    An entry named in ``PATHS`` is tracked along its path instead of solved.
    """
    from axialfe.cli.guards import numerics_guarded
    from axialfe.engine.system import solve
    from axialfe.errors import AxialfeError
    from axialfe.io.modelfile import parse_model
    from axialfe.tracking.plastic import parse_path, track_path

    try:
        with numerics_guarded("m.toml"):
            if name in PATHS:
                case, path = PATHS[name]
                legs, groups = parse_path(path)
                track_path(parse_model(text, "m.toml"), legs, case, groups)
                return "tracked"
            solution = solve(parse_model(text, "m.toml"))
    except AxialfeError as exc:
        return f"error: {exc}"
    bad = [c.name for c in solution.inaccurate]
    return "solved" + (f" (inaccurate: {', '.join(bad)})" if bad else "")


def regenerate():
    lines = [f"{name}\t{outcome(text, name)}" for name, text in all_cases()]
    with open(EXPECTED, "w", encoding="utf-8") as fh:
        fh.write("\n".join(lines) + "\n")
    print(f"wrote {len(lines)} expected lines to {EXPECTED}")


if __name__ == "__main__":
    sys.path.insert(0, os.path.join(HERE, os.pardir, os.pardir))
    regenerate()
