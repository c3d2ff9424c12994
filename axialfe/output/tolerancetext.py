"""Text forms of a tolerance study: the terminal table and the JSON of ``axialfe tolerance``.

Everything here reads a :class:`~axialfe.tolerance.study.Study` and writes
text; it computes nothing new.  Outputs are shown in the model's output units,
inputs in the unit each was written in.
"""

from __future__ import annotations

import json

from ..formatting import number
from ..units import OutputUnits, kelvin_to_temperature, unit_factor
from .text import CAUTIONS, _fit_grid, caution_lines, fitted

__all__ = ["TOLERANCE_CAUTIONS", "study_dict", "study_json", "study_table"]

TOLERANCE_CAUTIONS = CAUTIONS + (
    "A tolerance study is as good as its input distributions: the limits and the "
    "distributions stated are assumptions about manufacture, to be confirmed by measurement. "
    "Monte Carlo probabilities carry their sampling error (the 95 % interval shown); the "
    "worst case other than by vertices is a local search.",
)

_KIND_UNIT = {"force": "force", "displacement": "displacement", "stress": "stress"}


def _in_input_unit(value, entry):
    """An input value in the unit it was written in (12 digits: no conversion noise)."""
    unit, kind = entry["unit"], entry["kind"]
    if unit and kind:
        value = (float(kelvin_to_temperature(value, unit)) if kind == "temperature"
                 else value / unit_factor(unit, kind))
    return float(f"{value:.12g}")


def study_dict(study, units: OutputUnits | None = None) -> dict:
    """The study as plain data in the output units (the JSON of ``axialfe tolerance``)."""
    units = units or study.units or OutputUnits()
    scale = {k: units.factor(_KIND_UNIT[k]) for k in _KIND_UNIT}
    inputs = []
    for entry in study.inputs:
        inputs.append({"name": entry["name"], "unit": entry["unit"],
                       "nominal": _in_input_unit(entry["nominal"], entry),
                       "limits": [_in_input_unit(v, entry) for v in entry["limits"]],
                       "distribution": entry["distribution"]})
    by_path = {e["name"]: e for e in study.inputs}
    outputs = []
    for row in study.outputs:
        f = scale[row["kind"]]
        out = {"name": row["name"], "case": row["case"], "nominal": row["nominal"] / f}
        if "worst_case" in row:
            out["worst_case"] = [v / f for v in row["worst_case"]]
            out["worst_case_inputs"] = [
                {p: _in_input_unit(v, by_path[p]) for p, v in side.items()}
                for side in row["worst_case_inputs"]]
        if "mean" in row:
            out.update(mean=row["mean"] / f, std=row["std"] / f,
                       percentiles={k: v / f for k, v in row["percentiles"].items()})
        outputs.append(out)
    return {"title": study.title, "units": units.as_dict(), "samples": study.samples,
            "seed": study.seed, "worst_case_method": study.worst_case_method,
            "inputs": inputs, "outputs": outputs, "events": [dict(e) for e in study.events],
            **({"check_samples": study.check_samples} if study.check_samples is not None else {}),
            "notes": list(study.notes)}


def study_json(study, units: OutputUnits | None = None) -> str:
    return json.dumps(study_dict(study, units), indent=1) + "\n"


def _g(v):
    return number(v, 6)


def study_table(study, units: OutputUnits | None = None) -> str:
    """The study as a terminal report."""
    units = units or study.units or OutputUnits()
    data = study_dict(study, units)
    unit_of = {"force": units.force, "displacement": units.displacement, "stress": units.stress}
    kinds = {(r["name"], r["case"]): r["kind"] for r in study.outputs}
    lines = [f"{data['title']}: tolerance study", ""]
    lines.append(f" inputs ({len(data['inputs'])})")
    lines += _fit_grid(["name", "nominal", "lower", "upper", "unit", "distribution"],
                   [[e["name"], _g(e["nominal"]), _g(e["limits"][0]), _g(e["limits"][1]),
                     e["unit"] or "-", e["distribution"]] for e in data["inputs"]])
    lines.append("")
    head = f" outputs: worst case by {data['worst_case_method']}"
    if data["samples"]:
        head += f"; Monte Carlo of {data['samples']} samples, seed {data['seed']}"
    lines.append(head)
    headers = ["output", "case", "unit", "nominal", "worst least", "worst greatest"]
    if data["samples"]:
        headers += ["mean", "std", "0.135 %", "50 %", "99.865 %"]
    rows = []
    for r in data["outputs"]:
        row = [r["name"], r["case"], unit_of[kinds[(r["name"], r["case"])]], _g(r["nominal"])]
        row += [_g(v) for v in r.get("worst_case", [None, None])]
        if data["samples"]:
            p = r["percentiles"]
            row += [_g(r["mean"]), _g(r["std"]), _g(p["0.135"]), _g(p["50"]), _g(p["99.865"])]
        rows.append(row)
    lines += _fit_grid(headers, rows)
    if data["events"]:
        lines += ["", " events (probability with its 95 % Wilson score interval)"]
        headers, rows = _event_rows(data, "interval")
        lines += _fit_grid(headers, rows)
    lines += ["", "notes:"] + [f" - {n}" for n in data["notes"]]
    lines += [""] + caution_lines(TOLERANCE_CAUTIONS)
    return fitted(lines)


def _event_rows(data, interval):
    """The events' headers and rows; a column ``of`` (the samples an event counts over)
    where the check-fails events count over fewer samples than the study drew."""
    subset = data.get("check_samples")
    headers = ["name", "event", "case", "count", "probability", interval]
    rows = [[e["name"], e["event"], e["case"], str(e["count"]), _g(e["probability"]),
             f"{_g(e['confidence_interval'][0])} to {_g(e['confidence_interval'][1])}"]
            for e in data["events"]]
    if subset is not None and subset != data["samples"]:
        headers.insert(4, "of")
        for row, e in zip(rows, data["events"]):
            row.insert(4, str(subset if e["event"] == "check-fails" else data["samples"]))
    return headers, rows


def _report_rows(study, units):
    """The rows of a report's tolerance section: inputs, outputs, events, notes (text)."""
    data = study_dict(study, units)
    unit_of = {"force": units.force, "displacement": units.displacement, "stress": units.stress}
    kinds = {(r["name"], r["case"]): r["kind"] for r in study.outputs}
    inputs = (["input", "nominal", "lower", "upper", "unit", "distribution"],
              [[e["name"], _g(e["nominal"]), _g(e["limits"][0]), _g(e["limits"][1]),
                e["unit"] or "-", e["distribution"]] for e in data["inputs"]])
    headers = ["output", "case", "unit", "nominal", "worst least", "worst greatest"]
    if data["samples"]:
        headers += ["mean", "std", "0.135 %", "99.865 %"]
    rows = []
    for r in data["outputs"]:
        row = [r["name"], r["case"], unit_of[kinds[(r["name"], r["case"])]], _g(r["nominal"])]
        row += [_g(v) for v in r.get("worst_case", [None, None])]
        if data["samples"]:
            row += [_g(r["mean"]), _g(r["std"]), _g(r["percentiles"]["0.135"]),
                    _g(r["percentiles"]["99.865"])]
        rows.append(row)
    events = _event_rows(data, "95 % interval")
    intro = (f"Worst case by {data['worst_case_method']}"
             + (f"; Monte Carlo of {data['samples']} samples, seed {data['seed']}"
                if data["samples"] else "") + ".")
    return intro, inputs, (headers, rows), events, data["notes"]


def study_html(study, units: OutputUnits, table) -> str:
    """The tolerance section of the HTML report (``table(headers, rows)`` writes a table)."""
    from html import escape

    intro, inputs, outputs, events, notes = _report_rows(study, units)
    parts = ['<section id="tolerance"><h2>Tolerance study</h2>', f"<p>{escape(intro)}</p>",
             table(*inputs), table(*outputs)]
    if events[1]:
        parts.append(table(*events))
    parts.append("<ul>" + "".join(f"<li>{escape(n)}</li>" for n in notes + [
        TOLERANCE_CAUTIONS[-1]]) + "</ul></section>")
    return "\n".join(parts)


def study_markdown(study, units: OutputUnits, table) -> list[str]:
    """The tolerance section of the Markdown report (``table(headers, rows)`` gives lines)."""
    intro, inputs, outputs, events, notes = _report_rows(study, units)
    out = ["## Tolerance study", "", intro, ""] + table(*inputs) + table(*outputs)
    if events[1]:
        out += table(*events)
    return out + [f"- {n}" for n in notes + [TOLERANCE_CAUTIONS[-1]]] + [""]
