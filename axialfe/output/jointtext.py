"""Text forms of a bolted joint: the terminal table and the JSON of ``axialfe joint``.

Everything here reads a :class:`~axialfe.joints.JointResult` or
:class:`~axialfe.joints.JointSweep` and writes text; it computes nothing new.
"""

from __future__ import annotations

import json

from ..formatting import number
from ..units import OutputUnits
from .text import (CAUTIONS, _check_cells, _governing_text, _fit_grid as _grid, caution_lines,
                   fitted)

__all__ = ["JOINT_CAUTIONS", "joint_dict", "joint_json", "joint_table", "sweep_dict",
           "sweep_json", "sweep_table", "joint_units"]

JOINT_CAUTIONS = CAUTIONS + (
    "The clamped-part stiffness is a model (frustum cones) and the preload scatters with the "
    "tightening method: a torque-tightened preload may differ from its nominal value by 25 % "
    "or more. Fatigue, embedment, thread stripping and the strength of the clamped parts are "
    "not checked.",
)


def joint_units(units: OutputUnits) -> dict:
    """The units of a joint's output: force, length, stress and stiffness (force per length)."""
    return {"force": units.force, "length": units.length, "stress": units.stress,
            "stiffness": f"{units.force}/{units.length}"}


def _bolt_dict(joint, units):
    fL, fS = units.factor("length"), units.factor("stress")
    fK = units.factor("force") / fL
    t = joint.thread
    mat = joint.bolt_material
    return {"size": t.designation, "nominal_diameter": t.nominal_diameter / fL,
            "pitch": t.pitch / fL, "threads_per_inch": t.threads_per_inch,
            "tensile_stress_area": t.tensile_stress_area / fL**2,
            "shank_area": t.shank_area / fL**2, "length": joint.length / fL,
            "thread_length": joint.thread_len / fL,
            "thread_length_default": joint.thread_length is None,
            "shank_length_in_grip": joint.shank_in_grip / fL,
            "thread_length_in_grip": joint.thread_in_grip / fL,
            "grip": joint.grip / fL, "stiffness": joint.bolt_stiffness / fK,
            "proof_strength": None if joint.proof_strength is None else joint.proof_strength / fS,
            "proof_basis": joint.proof_basis, "material": mat.name,
            "elastic_modulus": mat.elastic_modulus / fS,
            "thermal_expansion": mat.thermal_expansion, "material_source": mat.source,
            "into": joint.into}


def joint_dict(result, units: OutputUnits | None = None) -> dict:
    """The JSON layout of a solved joint (see README, "Bolted joints")."""
    joint = result.joint
    units = units or joint.units
    fF, fL = units.factor("force"), units.factor("length")
    fK = fF / fL
    parts = [{"name": p.name, "material": p.material.name, "thickness": p.thickness / fL,
              "thickness_in_grip": t / fL, "stiffness": k / fK}
             for p, t, k in zip(joint.parts, joint.engaged, joint.part_stiffness)]
    entries = [dict(e.to_dict(), case=e.case) for e in result.checks.entries]
    return {"title": joint.title, "units": joint_units(units),
            "bolt": _bolt_dict(joint, units),
            "clamped": {"method": joint.method, "stiffness": joint.member_stiffness / fK,
                        "parts": parts},
            "joint_constant": joint.joint_constant,
            "preload": joint.preload / fF, "preload_basis": joint.preload_basis,
            "assembly_temperature": joint.assembly_temperature - 273.15,
            "states": [s.to_dict(units) for s in result.states],
            "checks": entries, "governing": result.checks.governing_dict(),
            "status": result.checks.status, "check_basis": _basis(joint),
            "cautions": list(JOINT_CAUTIONS)}


def _basis(joint):
    from ..joints.joint import check_basis

    return check_basis(joint)


def joint_json(result, units: OutputUnits | None = None) -> str:
    return json.dumps(joint_dict(result, units), indent=2) + "\n"


def _n(value):
    return "-" if value is None else number(value)


def _state_rows(states, F, S):
    return [[s["name"], _n(s["temperature"]), _n(s["external_load"]), _n(s["thermal_change"]),
             _n(s["bolt_force"]), _n(s["clamp_force"]), _n(s["bolt_stress"]),
             "yes" if s["separated"] else "no", _n(s["separation_load"])] for s in states]


def _state_headers(F, S, T="degC"):
    return ["state", f"bolt T [{T}]", f"P [{F}]", f"dF_th [{F}]", f"F_bolt [{F}]",
            f"F_clamp [{F}]", f"bolt stress [{S}]", "separated", f"separation load [{F}]"]


def joint_table(result, units: OutputUnits | None = None) -> str:
    """The terminal report of a solved joint."""
    joint = result.joint
    units = units or joint.units
    d = joint_dict(result, units)
    u = d["units"]
    F, L, S, K = u["force"], u["length"], u["stress"], u["stiffness"]
    b = d["bolt"]
    out = [f"axialfe joint: {d['title']}",
           "units: " + ", ".join(f"{k} {v}" for k, v in u.items()),
           "signs: external load + pulls the parts apart; bolt force + in tension, clamp force "
           "+ in compression", ""]
    pitch = (f"{b['threads_per_inch']} threads per inch" if b["threads_per_inch"]
             else f"pitch {number(b['pitch'])} {L}")
    out += [" bolt",
            f"  {b['size']}: d = {number(b['nominal_diameter'])} {L}, {pitch}, "
            f"A_t = {number(b['tensile_stress_area'])} {L}^2, A_d = {number(b['shank_area'])} {L}^2",
            f"  length {number(b['length'])} {L}, thread length {number(b['thread_length'])} {L}"
            + (" (the default rule)" if b["thread_length_default"] else "")
            + f"; in the grip: shank l_d = {number(b['shank_length_in_grip'])} {L}, thread "
            f"l_t = {number(b['thread_length_in_grip'])} {L}",
            f"  {b['material']}: E = {number(b['elastic_modulus'])} {S}, alpha = "
            f"{number(b['thermal_expansion'])} /K",
            "  proof strength: " + (f"{number(b['proof_strength'])} {S}"
                                     if b["proof_strength"] is not None else "unknown")
            + f" ({b['proof_basis']})",
            f"  grip {number(b['grip'])} {L}, bolt stiffness k_b = {number(b['stiffness'])} {K}",
            "", " clamped parts (head to nut)"]
    rows = [[p["name"], p["material"], number(p["thickness"]), number(p["thickness_in_grip"]),
             number(p["stiffness"])] for p in d["clamped"]["parts"]]
    out += _grid(["part", "material", f"thickness [{L}]", f"in grip [{L}]", f"stiffness [{K}]"],
                 rows)
    out += [f"  member stiffness k_m = {number(d['clamped']['stiffness'])} {K}; joint constant "
            f"C = k_b/(k_b + k_m) = {d['joint_constant']:.4f}",
            f"  method: {d['clamped']['method']}",
            f"  preload F_i = {number(d['preload'])} {F} at {number(d['assembly_temperature'])} "
            f"degC ({d['preload_basis']})", "", " states"]
    out += _grid(_state_headers(F, S), _state_rows(d["states"], F, S))
    per_part = [s for s in d["states"] if len(set(s["temperatures"].values())) > 1]
    for s in per_part:
        out.append(f"  '{s['name']}' temperatures [degC]: "
                   + ", ".join(f"{k} {number(v)}" for k, v in s["temperatures"].items()))
    out += ["", " checks (utilization = demand x safety factor / capacity; result pass, FAIL, "
                "or review where the tool cannot decide)"]
    rows = [[c[0], c[1], e.case, *c[2:]] for e in result.checks.entries
            for c in [_check_cells(e, units)]]
    headers = ["check", "name", "state", "demand", "capacity", "utilization", "result", "note"]
    out += _grid(headers, rows)
    out += ["", f"governing check: {_governing_text(result.checks)}",
            f"overall: {result.checks.status}", f"check basis: {d['check_basis']}", "",
            ""] + caution_lines(JOINT_CAUTIONS)
    return fitted(out)


def sweep_dict(sweep, units: OutputUnits | None = None) -> dict:
    units = units or sweep.joint.units
    data = {"title": sweep.joint.title, "units": joint_units(units)}
    data.update(sweep.to_dict(units))
    data["cautions"] = list(JOINT_CAUTIONS)
    return data


def sweep_json(sweep, units: OutputUnits | None = None) -> str:
    return json.dumps(sweep_dict(sweep, units), indent=2) + "\n"


def sweep_table(sweep, units: OutputUnits | None = None) -> str:
    """The events of a joint sweep (exact), then the states along the grid."""
    units = units or sweep.joint.units
    d = sweep_dict(sweep, units)
    u = d["units"]
    F, S = u["force"], u["stress"]
    what = "all parts" if sweep.part is None else f"'{sweep.part}'"
    out = [f"axialfe joint sweep: {d['title']}",
           f"temperature of {what} in state '{sweep.state}' from {number(d['values'][0])} to "
           f"{number(d['values'][-1])} {sweep.unit}, external load held", "",
           " events (exact, not read off the grid)"]
    if d["events"]:
        out += _grid(["name", "event", f"temperature [{sweep.unit}]"],
                     [[e["name"], e["event"], f"{e['value']:.6f}"] for e in d["events"]])
    else:
        out.append("  (none in this range)")
    out += ["", " states"]
    rows = _state_rows(d["states"], F, S)
    for row, v in zip(rows, d["values"]):
        row[0] = number(v)
    headers = _state_headers(F, S)
    headers[0] = f"swept T [{sweep.unit}]"
    out += _grid(headers, rows)
    for note in d["notes"]:
        out.append(f" note: {note}")
    out += [""] + caution_lines(JOINT_CAUTIONS)
    return fitted(out)
