"""Text forms of a solved press or shrink fit: the terminal table and the JSON.

Everything here reads a :class:`~axialfe.fits.fit.FitResult` and writes text;
it computes nothing new.  Values are shown in the fit's units (force, length,
stress, torque); temperatures always in degC.  Pairs are [at the least
interference, at the greatest].
"""

from __future__ import annotations

import json

from ..fits.fit import FitResult, FitUnits
from ..formatting import number
from .text import CAUTIONS, _fit_grid as _grid, caution_lines, fitted

__all__ = ["FIT_CAUTIONS", "fit_dict", "fit_json", "fit_table", "fit_check_cells",
           "FIT_CHECK_HEADERS", "fit_tables", "fit_summary_lines", "fit_governing_text"]

_KELVIN = 273.15

FIT_CAUTIONS = (
    "Lamé's thick-walled cylinders: linear-elastic, plane stress, parts of equal length. Not "
    "included: the stress concentration at the hub's ends, the loss of interference to surface "
    "roughness when the parts are pressed together, loosening by rotation, temperature "
    "gradients within the parts, and fretting under alternating loads.",
    "ISO 286 limits and built-in material values are tabulated data; verify them against the "
    "standard, the drawing and the material certificates.",
    CAUTIONS[-1],
)

FIT_CHECK_HEADERS = ("check", "state", "name", "demand", "capacity", "utilization", "result",
                     "note")


def _celsius(kelvin):
    return None if kelvin is None else round(kelvin - _KELVIN, 9)  # no 1e-14 K of rounding noise


def _material(mat, units: FitUnits):
    s = units.factor("stress")
    return {"name": mat.name, "elastic_modulus": mat.elastic_modulus / s,
            "poissons_ratio": mat.poissons_ratio, "thermal_expansion": mat.thermal_expansion,
            "yield_strength": None if mat.yield_strength is None else mat.yield_strength / s}


def fit_dict(result: FitResult, units: FitUnits | None = None) -> dict:
    """The JSON layout of ``axialfe fit --format json`` as a dict."""
    fit = result.fit
    units = units or fit.units
    L, F, S, T = (units.factor(k) for k in ("length", "force", "stress", "torque"))

    def pair(values, scale):
        return [float(v) / scale for v in values]

    states = []
    for st in result.states:
        states.append({
            "name": st.name, "shaft_temperature": _celsius(st.shaft_temperature),
            "hub_temperature": _celsius(st.hub_temperature),
            "axial_load": st.axial_load / F, "torque": st.torque / T,
            "interference": pair(st.interference, L), "pressure": pair(st.pressure, S),
            "hub_hoop_stress": pair(st.hub_hoop_stress, S),
            "shaft_hoop_stress": pair(st.shaft_hoop_stress, S),
            "shaft_bore_hoop_stress": pair(st.shaft_bore_hoop_stress, S),
            "hub_equivalent_stress": pair(st.hub_equivalent_stress, S),
            "shaft_equivalent_stress": pair(st.shaft_equivalent_stress, S),
            "holding_force": pair(st.holding_force, F),
            "torque_capacity": pair(st.torque_capacity, T),
            "loose": [bool(x) for x in st.loose]})
    checks = []
    for e in result.checks.entries:
        entry = e.to_dict()
        entry["case"] = e.case
        checks.append(entry)
    return {
        "title": fit.title, "units": units.as_dict(),
        "fit": {"diameter": fit.diameter / L, "inner_diameter": fit.inner_diameter / L,
                "outer_diameter": fit.outer_diameter / L, "length": fit.length / L,
                "friction": fit.friction, "designation": fit.designation,
                "bore_limits": None if fit.bore_limits is None else pair(fit.bore_limits, L),
                "shaft_limits": None if fit.shaft_limits is None else pair(fit.shaft_limits, L),
                "assembly_temperature": _celsius(fit.temperature),
                "assembly_clearance": fit.clearance / L, "safety_factor": fit.safety_factor,
                "shaft": _material(fit.shaft, units), "hub": _material(fit.hub, units)},
        "interference_limits": pair(fit.interference, L),
        "states": states,
        "loosening_temperature": _celsius(result.loosening_temperature),
        "shrink_temperature": _celsius(result.shrink_temperature),
        "checks": checks, "governing": result.checks.governing_dict(),
        "status": result.checks.status, "notes": list(result.notes),
        "cautions": list(FIT_CAUTIONS)}


def fit_json(result: FitResult, units: FitUnits | None = None) -> str:
    """``axialfe fit --format json``."""
    return json.dumps(fit_dict(result, units), indent=2) + "\n"


def _q(value, key, units: FitUnits):
    return f"{number(value / units.factor(key))} {getattr(units, key)}"


def fit_check_cells(entry, units: FitUnits):
    """The cells of one check row: check, state, name, demand, capacity, utilization, ..."""
    def value(v):
        return "-" if v is None else _q(v, entry.quantity, units)

    util = "-" if entry.utilization is None else f"{entry.utilization:.3f}"
    return [entry.kind, entry.case, entry.name, value(entry.demand), value(entry.capacity), util,
            entry.verdict, entry.note_in(units) or ""]


def _temperature(kelvin):
    return "none" if kelvin is None else f"{number(kelvin - _KELVIN)} degC"


def fit_summary_lines(result: FitResult, units: FitUnits) -> list[str]:
    """The description of the fit and its two temperatures, as lines."""
    fit = result.fit
    q = lambda v, k="length": _q(v, k, units)  # noqa: E731

    def limit(v):  # limits and interferences to the micrometre: more digits than number()
        return f"{v / units.factor('length'):.6g} {units.length}"

    lo, hi = fit.interference
    out = [f"  fit diameter       {q(fit.diameter)}"
           + (f" ({fit.designation}, ISO 286)" if fit.designation else "")]
    if fit.bore_limits is not None:
        out.append(f"  bore limits        {limit(fit.bore_limits[0])} to {limit(fit.bore_limits[1])}")
        out.append(f"  shaft limits       {limit(fit.shaft_limits[0])} to "
                   f"{limit(fit.shaft_limits[1])}")
    out.append(f"  interference       {limit(lo)} to {limit(hi)} at assembly"
               + (" (negative: a clearance)" if lo < 0 else ""))
    for role, mat, size in (("shaft", fit.shaft, ("bore", fit.inner_diameter)),
                            ("hub", fit.hub, ("outer diameter", fit.outer_diameter))):
        yield_text = (q(mat.yield_strength, "stress") if mat.yield_strength is not None
                      else "not given")
        out.append(f"  {role:18s} {mat.name}, {size[0]} {q(size[1])}; E {q(mat.elastic_modulus, 'stress')}"
                   f", nu {mat.poissons_ratio:g}, alpha {mat.thermal_expansion:g} /K, yield "
                   f"{yield_text}")
    out.append(f"  length, friction   {q(fit.length)}, mu = {fit.friction:g}")
    out.append(f"  loosening temperature (uniform; least interference reaches zero): "
               f"{_temperature(result.loosening_temperature)}"
               + (" (both parts expand alike)" if result.loosening_temperature is None else ""))
    out.append(f"  shrink temperature of the hub (greatest interference + {q(fit.clearance)} "
               f"clearance, shaft at {_temperature(fit.temperature)}): "
               f"{_temperature(result.shrink_temperature)}"
               + (" (the hub does not grow when heated)" if result.shrink_temperature is None
                  else ""))
    return out


def fit_tables(result: FitResult, units: FitUnits):
    """Yield (title, headers, rows) of the states and of their results, as text cells."""
    u = units.as_dict()
    S, L, F, T = (units.factor(k) for k in ("stress", "length", "force", "torque"))
    yield ("states", ["state", "shaft [degC]", "hub [degC]", f"axial load [{u['force']}]",
                      f"torque [{u['torque']}]"],
           [[s.name, number(s.shaft_temperature - _KELVIN), number(s.hub_temperature - _KELVIN),
             number(s.axial_load / F), number(s.torque / T)] for s in result.states])
    rows = []
    for s in result.states:
        for j, at in enumerate(("least", "greatest")):
            rows.append([s.name if j == 0 else "", at, number(s.interference[j] / L),
                         number(s.pressure[j] / S), number(s.hub_hoop_stress[j] / S),
                         number(s.shaft_hoop_stress[j] / S),
                         number(s.hub_equivalent_stress[j] / S),
                         number(s.shaft_equivalent_stress[j] / S),
                         number(s.holding_force[j] / F), number(s.torque_capacity[j] / T),
                         "yes" if s.loose[j] else "no"])
    yield ("results at the least and at the greatest interference (stress + in tension; "
           "equivalent = largest von Mises stress in the part)",
           ["state", "at", f"interference [{u['length']}]", f"pressure [{u['stress']}]",
            f"hub hoop [{u['stress']}]", f"shaft hoop [{u['stress']}]",
            f"hub equiv. [{u['stress']}]", f"shaft equiv. [{u['stress']}]",
            f"holding [{u['force']}]", f"torque cap. [{u['torque']}]", "loose"], rows)


def fit_governing_text(result: FitResult) -> str:
    """The governing check in words, naming any failure without a utilisation."""
    entries = result.checks.entries
    g = result.checks.governing
    text = ("none (no check has a utilization)" if g is None else
            f"{g.kind} of '{g.name}' in state '{g.case}', utilization "
            f"{g.utilization:.3f} ({g.verdict})")
    failing = [e for e in entries if e.ok is False and e.utilization is None]
    if failing:
        text += "; FAILING without a utilization: " + ", ".join(
            f"{e.kind} in state '{e.case}'" for e in failing)
    return text


def fit_table(result: FitResult, units: FitUnits | None = None) -> str:
    """The terminal report of ``axialfe fit``."""
    fit = result.fit
    units = units or fit.units
    out = [f"axialfe fit: {fit.title}",
           "units: " + ", ".join(f"{k} {v}" for k, v in units.as_dict().items())
           + ", temperature degC", "", " fit"]
    out += fit_summary_lines(result, units)
    for title, headers, rows in fit_tables(result, units):
        out += ["", f" {title}"] + _grid(headers, rows)
    out += ["", " checks (utilization = demand x safety factor / capacity; pass, FAIL, or "
                "review where the tool cannot decide)"]
    entries = result.checks.entries
    if entries:
        out += _grid(list(FIT_CHECK_HEADERS), [fit_check_cells(e, units) for e in entries])
    else:
        out.append("  (no checks)")
    counts = {"pass": 0, "FAIL": 0, "review": 0}
    for e in entries:
        counts[e.verdict] += 1
    out += ["", f"governing check: {fit_governing_text(result)}",
            f"checks: {counts['pass']} pass, {counts['FAIL']} fail, {counts['review']} need "
            f"review (overall: {result.checks.status})", "", "basis:"]
    out += [f" - {n}" for n in result.notes]
    out += [""] + caution_lines(FIT_CAUTIONS)
    return fitted(out)
