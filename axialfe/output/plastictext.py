"""Output of limit analysis and elastic-plastic paths: terminal tables and JSON."""

from __future__ import annotations

import json

from .text import _g, _fit_grid as _grid, caution_lines, fitted

__all__ = ["collapse_table", "collapse_json", "path_table", "path_json", "PLASTIC_CAUTIONS"]

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
    out += [""] + caution_lines(PLASTIC_CAUTIONS)
    return fitted(out)


def _shown(unit):
    return "" if unit == "1" else f" {unit}"


def _clean(u, model):
    """A displacement (m) below the rounding of the model's size, shown as 0 (the JSON keeps it)."""
    x = model.arrays.x
    span = float(x.max() - x.min()) if len(x) else 0.0
    return 0.0 if abs(u) <= 1e-13 * span else u


def path_json(result, units) -> str:
    return json.dumps(result.to_dict(units), indent=2) + "\n"


def path_table(result, units) -> str:
    """The path: its legs, the exact events, the state at each leg end, the cycle outcome."""
    m = result.model
    fF, fS, fD = (units.factor(k) for k in ("force", "stress", "displacement"))
    out = [f"axialfe path: {m.title}", f"case '{result.case}', {len(result.legs)} legs",
           "units: " + ", ".join(f"{k} {u}" for k, u in units.as_dict().items()), ""]
    run = {s.leg for s in result.states}
    out.append(" legs")
    out += _grid(["leg", "parameter", "from", "to", "run"],
                 [[g.index, g.parameter, f"{_g(g.start)}{_shown(g.unit)}",
                   f"{_g(g.stop)}{_shown(g.unit)}", "yes" if g.index in run else "not run"]
                  for g in result.legs[:60]])
    if len(result.legs) > 60:
        out.append(f"  ... and {len(result.legs) - 60} more legs (see --format json)")
    out += ["", " events (exact)"]
    legs = {g.index: g for g in result.legs}
    if result.events:
        out += _grid(["leg", "name", "event", "at"],
                     [[e.leg, e.name, e.event, f"{_g(e.value, 9)}{_shown(legs[e.leg].unit)}"]
                      for e in result.events[:200]])
        if len(result.events) > 200:
            out.append(f"  ... and {len(result.events) - 200} more events (see --format json)")
    else:
        out.append("  none: the path stays elastic")
    shown = result.states if len(result.states) <= 8 else (*result.states[:4], *result.states[-4:])
    for st in shown:
        g = legs[st.leg]
        r = st.result
        out += ["", f" state at the end of leg {st.leg} ({g.parameter} = "
                f"{_g(st.value, 9)}{_shown(g.unit)})"]
        out += _grid(["segment", f"N [{units.force}]", f"stress [{units.stress}]",
                      "plastic strain"],
                     [[s.name, _g(r.axial_force[i, 0] / fF), _g(r.stress[i, 0] / fS),
                       _g(st.plastic_strain[i])] for i, s in enumerate(m.segments[:40])])
        out += _grid(["station", f"u [{units.displacement}]",
                      f"plastic u [{units.displacement}]"],
                     [[s.name, _g(_clean(r.u[i], m) / fD),
                       _g(_clean(st.plastic_displacement[i], m) / fD)]
                      for i, s in enumerate(m.stations[:40])])
        if m.gaps:
            out += _grid(["gap", "state", f"opening [{units.displacement}]",
                          f"force [{units.force}]"],
                         [[gp.name, "closed" if r.gap_closed[j] else "open",
                           _g(r.gap_opening[j] / fD), _g(r.gap_force[j] / fF)]
                          for j, gp in enumerate(m.gaps[:40])])
    if len(result.states) > 8:
        out.append(f"\n ({len(result.states) - 8} more leg ends: see --format json)")
    if result.cycles is not None:
        c = result.cycles
        decided = (f", decided at cycle {c['decided_at']}" if c["decided_at"] is not None
                   else ", not decided")
        out += ["", f"cycles: {c['count']} run, outcome {c['outcome']}{decided}"]
    for note in result.notes:
        out.append(f" note: {note}")
    out += [""] + caution_lines(PLASTIC_CAUTIONS)
    return fitted(out)
