"""The report of a bolted joint: one self-contained HTML (or Markdown) document.

The job and its basis, the input, the bolt and clamped-part stiffness, every
state, the checks with the governing one, the joint diagram and the axial-force
diagrams of the model the joint built, and the cautions.  It reads a solved
:class:`~axialfe.joints.JointResult` and computes nothing new but the figures.
"""

from __future__ import annotations

import datetime
from pathlib import Path

from ..errors import ModelError
from ..formatting import number
from ..units import OutputUnits
from .jointtext import JOINT_CAUTIONS, joint_dict
from .report import (_CSS, _e, _html_table, _md, _md_table, md_figure, report_format,
                     svg_text, write_markdown_with_figures)
from .text import _check_cells, _governing_text

__all__ = ["build_joint_html", "build_joint_markdown", "write_joint_report"]

_VERDICT = {"pass": "pass", "FAIL": "fail", "review": "review"}


def _captions(result):
    return (["Joint diagram: bolt and clamp force against the external load, each state."]
            + [f"Axial force along the built model (the bolt in tension, the clamped parts in "
               f"compression), state \u201c{case.name}\u201d." for case in result.solution.cases])


def _figures(result, units):
    """(caption, figure) of the joint diagram and of each state's axial forces."""
    from .jointplot import plot_joint
    from .plot import plot_case

    figures = [plot_joint(result, None, units)] + [plot_case(case, "force", None, units)
                                                   for case in result.solution.cases]
    return list(zip(_captions(result), figures))


def _tables(result, units):
    """(title, headers, rows) of the input and the results."""
    d = joint_dict(result, units)
    u = d["units"]
    F, L, S, K = u["force"], u["length"], u["stress"], u["stiffness"]
    b = d["bolt"]
    joint = result.joint
    yield ("Bolt", ["quantity", "value"], [
        ["size", b["size"]], [f"nominal diameter d [{L}]", number(b["nominal_diameter"])],
        ["pitch" if not b["threads_per_inch"] else "threads per inch",
         number(b["pitch"]) + f" {L}" if not b["threads_per_inch"] else b["threads_per_inch"]],
        [f"tensile stress area A_t [{L}^2]", number(b["tensile_stress_area"])],
        [f"shank area A_d [{L}^2]", number(b["shank_area"])],
        [f"length under the head [{L}]", number(b["length"])],
        [f"thread length L_T [{L}]", number(b["thread_length"])
         + (" (the default rule)" if b["thread_length_default"] else "")],
        [f"shank l_d and thread l_t in the grip [{L}]",
         f"{number(b['shank_length_in_grip'])}, {number(b['thread_length_in_grip'])}"],
        [f"grip [{L}]", number(b["grip"])],
        ["material", f"{b['material']}: E = {number(b['elastic_modulus'])} {S}, alpha = "
                     f"{number(b['thermal_expansion'])} /K"],
        [f"proof strength [{S}]", "unknown" if b["proof_strength"] is None
         else number(b["proof_strength"])], ["proof strength basis", b["proof_basis"]],
        [f"bolt stiffness k_b = A_d*A_t*E/(A_d*l_t + A_t*l_d) [{K}]", number(b["stiffness"])]])
    yield ("Clamped parts, head to nut", ["part", "material", f"thickness [{L}]",
                                          f"in the grip [{L}]", f"stiffness [{K}]"],
           [[p["name"], p["material"], number(p["thickness"]), number(p["thickness_in_grip"]),
             number(p["stiffness"])] for p in d["clamped"]["parts"]]
           + [["stack", "", "", number(b["grip"]), number(d["clamped"]["stiffness"])]])
    yield ("Assembly", ["quantity", "value"], [
        [f"preload F_i [{F}]", number(d["preload"])], ["preload basis", d["preload_basis"]],
        ["assembly temperature [degC]", number(d["assembly_temperature"])],
        ["joint constant C = k_b/(k_b + k_m)", f"{d['joint_constant']:.4f}"]])
    rows = []
    for s in joint.services:
        own = ", ".join(f"{k} {number(v - 273.15)}" for k, v in s.temperatures)
        rows.append([s.name, "-" if s.temperature is None else number(s.temperature - 273.15),
                     own or "-", number(s.external_load / units.factor("force"))])
    yield ("Service states", ["state", "temperature [degC]", "own temperatures [degC]",
                              f"external load [{F}]"], rows)
    yield ("States", ["state", "bolt T [degC]", f"P [{F}]", f"dF_th [{F}]", f"F_bolt [{F}]",
                      f"F_clamp [{F}]", f"bolt stress [{S}]", "separated",
                      f"separation load [{F}]"],
           [[s["name"], number(s["temperature"]), number(s["external_load"]),
             number(s["thermal_change"]), number(s["bolt_force"]), number(s["clamp_force"]),
             number(s["bolt_stress"]), "yes" if s["separated"] else "no",
             number(s["separation_load"])] for s in d["states"]])


def _check_rows(result, units):
    rows, classes = [], []
    for e in result.checks.entries:
        c = _check_cells(e, units)
        rows.append([c[0], c[1], e.case, *c[2:]])
        classes.append([None] * 6 + [_VERDICT[e.verdict], None])
    return ["check", "name", "state", "demand", "capacity", "utilization", "result",
            "note"], rows, classes


def _job(result) -> str:
    j = result.joint
    return (f"One {j.thread.designation} bolt clamping {len(j.parts)} part(s) ("
            + ", ".join(f"'{p.name}'" for p in j.parts) + f"), preloaded to "
            f"{number(j.preload / j.units.factor('force'))} {j.units.force} at "
            f"{number(j.assembly_temperature - 273.15)} degC, in {len(j.services)} service "
            "state(s). The bolt's shank and threaded length act in series; the clamped parts, "
            "each with its frustum stiffness, act in series with one another and parallel to "
            "the bolt; their interface with the nut is a contact that opens when the joint "
            "separates. Each state is solved by the axial engine.")


def _assumptions(result) -> list[str]:
    d = joint_dict(result)
    return [f"Clamped-part stiffness: {d['clamped']['method']}.",
            f"Bolt material: {d['bolt']['material_source'] or d['bolt']['material']}.",
            "The external load acts at the head and the nut faces (Shigley's joint diagram); "
            "a load introduced inside the clamped parts would give a smaller joint constant.",
            f"Check basis: {d['check_basis']}."]


def build_joint_html(result, units: OutputUnits | None = None, date: str | None = None) -> str:
    """The joint report as one self-contained HTML document."""
    units = units or result.joint.units
    date = date or datetime.date.today().isoformat()
    title = result.joint.title
    out = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
           '<meta name="viewport" content="width=device-width, initial-scale=1">',
           f"<title>{_e(title)}</title>", f"<style>{_CSS}</style>", "</head>", "<body>",
           f"<h1>{_e(title)}</h1>",
           f'<p class="meta">Bolted joint report, <time datetime="{_e(date)}">{_e(date)}</time>'
           "</p>",
           '<section id="job"><h2>The job</h2>', f"<p>{_e(_job(result))}</p></section>",
           '<section id="assumptions"><h2>Assumptions</h2><ul>'
           + "".join(f"<li>{_e(a)}</li>" for a in _assumptions(result)) + "</ul></section>",
           '<section id="results"><h2>Input and results</h2>']
    for name, headers, rows in _tables(result, units):
        out.append(f"<h3>{_e(name)}</h3>" + _html_table(headers, rows))
    out.append("</section>")
    headers, rows, classes = _check_rows(result, units)
    out += ['<section id="checks"><h2>Checks</h2>', _html_table(headers, rows, classes),
            f'<p id="governing"><strong>Governing check:</strong> '
            f"{_e(_governing_text(result.checks))}. Overall: {_e(result.checks.status)}.</p>",
            "</section>", '<section id="diagrams"><h2>Diagrams</h2>']
    for n, (caption, fig) in enumerate(_figures(result, units)):
        out.append(f'<figure id="diagram-{n}">{svg_text(fig)}<figcaption>{_e(caption)}'
                   "</figcaption></figure>")
    out += ["</section>", '<section id="cautions"><h2>Cautions</h2><ul>'
            + "".join(f"<li>{_e(c)}</li>" for c in JOINT_CAUTIONS) + "</ul></section>",
            "</body>", "</html>"]
    return "\n".join(out) + "\n"


def build_joint_markdown(result, units: OutputUnits | None = None, date: str | None = None,
                         figures=None) -> str:
    """The joint report as one Markdown document, linking its diagrams ``figures`` (file
    names, one per figure: the joint diagram, then each state's forces) that
    :func:`write_joint_report` writes beside it."""
    units = units or result.joint.units
    date = date or datetime.date.today().isoformat()
    out = [f"# {_md(result.joint.title)}", "", f"Bolted joint report, {date}", "",
           "## The job", "", _md(_job(result)), "", "## Assumptions", ""]
    out += [f"- {_md(a)}" for a in _assumptions(result)] + ["", "## Input and results", ""]
    for name, headers, rows in _tables(result, units):
        out += [f"### {_md(name)}", ""] + _md_table(headers, rows)
    headers, rows, _ = _check_rows(result, units)
    out += ["## Checks", ""] + _md_table(headers, rows)
    out += [f"**Governing check:** {_md(_governing_text(result.checks))}. Overall: "
            f"{result.checks.status}.", "", "## Diagrams", ""]
    captions = _captions(result)
    for n, caption in enumerate(captions):
        text = f"figure {n + 1}: {_md(caption)}"
        out += [md_figure(text, figures[n]) if figures else
                f"{text} (drawn by `axialfe joint JOINT --plot FILE`)", ""]
    out += ["## Cautions", ""] + [f"- {_md(c)}" for c in JOINT_CAUTIONS]
    return "\n".join(out) + "\n"


def write_joint_report(result, path, fmt: str | None = None, units: OutputUnits | None = None,
                       date: str | None = None) -> Path:
    """Write the joint report to ``path`` (UTF-8) as ``fmt`` (by the suffix when None); a
    Markdown report's diagrams go beside it (:func:`axialfe.output.report.figure_names`)."""
    path = Path(path)
    fmt = report_format(path, fmt)
    if fmt == "markdown":  # its diagrams are PNG files beside it
        return write_markdown_with_figures(
            path, lambda names: build_joint_markdown(result, units, date, names),
            [fig for _, fig in _figures(result, units or result.joint.units)])
    from ..io.files import write_text

    try:
        write_text(path, build_joint_html(result, units, date))  # atomic
    except OSError as exc:
        raise ModelError(f"cannot write the report: {exc}", file=str(path)) from exc
    return path
