"""Output of limit analysis and elastic-plastic paths: terminal tables and JSON."""

from __future__ import annotations

import json

from .text import _g, _grid

__all__ = ["collapse_table", "collapse_json", "PLASTIC_CAUTIONS"]

PLASTIC_CAUTIONS = (
    "Small-displacement, one-dimensional plasticity of axial members: every segment yields over "
    "its whole length at one force; no necking, no fracture, no large deformation, no bending.",
    "A collapse load is the load at which the model can deform without limit; the applicable "
    "design code sets the factors between it and an allowable load.",
    "These results support checking and design; they do not replace the applicable design "
    "codes and standards, or review by a licensed professional engineer.",
)


def collapse_json(result, units) -> str:
    return json.dumps(result.to_dict(units), indent=2) + "\n"


def collapse_table(result, units) -> str:
    m = result.model
    fF = units.factor("force")
    out = [f"axialfe collapse: {m.title}",
           f"case '{result.case}': limit analysis by the static theorem (perfectly plastic)",
           f"units: force {units.force}", "",
           f"collapse load factor: {_g(result.load_factor, 9)} (on the case's point and "
           "distributed loads)"]
    if result.buckling_capped_load_factor is not None:
        out.append(f"with compression capped at the buckling capacity: "
                   f"{_g(result.buckling_capped_load_factor, 9)}")
    sides = dict(zip(result.mechanism, result.limit_sides))
    out += ["", f" segment forces at collapse [{units.force}] (+ in tension)"]
    rows = [[s.name, _g(result.axial_force[i, 0] / fF), _g(result.axial_force[i, 1] / fF),
             f"at its {sides[s.name]} limit" if s.name in sides else "-"]
            for i, s in enumerate(m.segments)]
    out += _grid(["segment", "N from", "N to", "mechanism"], rows)
    out.append("  (outside the mechanism the forces are one admissible set of many)")
    for note in result.notes:
        out.append(f" note: {note}")
    out += ["", "cautions:"] + [f" - {c}" for c in PLASTIC_CAUTIONS]
    return "\n".join(out) + "\n"
