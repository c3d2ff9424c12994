"""The listing of the built-in materials: each value in the output's units with its source.

It reads the library's entries (as written, with units) and converts each value
once for display; it computes nothing else.
"""

from __future__ import annotations

from ..formatting import number
from ..units import OutputUnits, parse_quantity

__all__ = ["materials_text", "VALUES"]

# the values of an entry in the order shown, and the kind of each
VALUES = (("elastic_modulus", "stress"), ("thermal_expansion", "thermal_expansion"),
          ("mean_thermal_expansion", "thermal_expansion"), ("thermal_expansion_total", "strain"),
          ("yield_strength", "stress"), ("compressive_yield_strength", "stress"),
          ("proof_strength", "stress"), ("tensile_strength", "stress"),
          ("density", "density"), ("poissons_ratio", None))

_US_DENSITY = ("lb/in^3", 27679.904710203)   # kg/m^3 in one lb/in^3 (NIST SP 811, 2008, B.8)


def _shown(value, kind, units: OutputUnits) -> str:
    """One library value (text with its unit, or a number) in the output's units."""
    if isinstance(value, dict):       # a table against temperature: its range, as written
        rows = [f"{t} {v}" for t, v in value.items() if t != "reference"]
        start = f"from {value['reference']}: " if "reference" in value else ""
        return f"{start}{rows[0]} ... {rows[-1]} ({len(rows)} entries)"
    if kind is None:
        return number(float(value))
    si = parse_quantity(value, kind) if isinstance(value, str) else float(value)
    if kind == "stress":
        return f"{number(si / units.factor('stress'), 6)} {units.stress}"
    if kind == "thermal_expansion":
        per = "/K" if units.temperature == "K" else "/degF"
        return f"{number(si * units.factor('temperature'), 4)} {per}"
    unit, factor = ("kg/m^3", 1.0) if units.length in ("mm", "m", "cm") else _US_DENSITY
    return f"{number(si / factor, 4)} {unit}"


def materials_text(table: dict, units: OutputUnits, width: int = 100) -> str:
    """The listing of the library ``table`` (name -> entry as in library.toml) in ``units``,
    each value on a line with its source wrapped under it, every line within ``width``."""
    import textwrap

    def wrap(text, first, rest):
        return textwrap.wrap(text, width, initial_indent=first, subsequent_indent=rest,
                             break_on_hyphens=False) or [first.rstrip()]

    out = wrap(f"built-in materials (values in {units.stress}, /{units.temperature}; each with "
               "its source, 'from memory' where it was not checked against the text)", "", "  ")
    for name, entry in table.items():
        out += [""] + wrap(f"{name}: {entry.get('description', '')}", "", "  ")
        sources = entry.get("sources", {})
        for key, kind in VALUES:
            if key not in entry and (key not in ("elastic_modulus", "thermal_expansion",
                                                 "yield_strength", "density")
                                     or key == "thermal_expansion" and any(
                                         k in entry for k in ("mean_thermal_expansion",
                                                              "thermal_expansion_total"))):
                continue
            value = "(not given)" if key not in entry else _shown(entry[key], kind, units)
            out.append(f"    {key:27s} {value}")
            if sources.get(key):
                out += wrap(sources[key], "        ", "        ")
        out += wrap(f"overall: {entry.get('source', '')}", "    ", "        ")
    out += [""] + wrap("A model's own [materials] entry of the same name takes precedence. Values "
                       "are typical or minimum values as their sources say: verify them against "
                       "the material certificate and the governing standard.", "", "")
    return "\n".join(out) + "\n"
