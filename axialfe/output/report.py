"""The report document: one self-contained HTML (or Markdown) file an engineer can file.

Every page printed carries the title block (the calculation, and the job of the
model's ``[project]`` table: name, number, prepared and checked by, revision,
date).  Sections, in order: a one-page summary (the verdict of the checks, the
governing check and its utilisation, the envelope of the key quantities over the
cases, the notes and the cautions), the job, the assumptions, an echo of the
input, the results of each case, a calculation sheet per case (each segment's
elongation split into N*L/(E*A), alpha*dT*L and misfit, summed and compared with
the relative displacement of its end stations, worked in one unit per quantity;
the thermal and the load-driven part of each force; the compatibility of each
closed gap; the balance of each station; each station's displacement in words),
the design checks with the governing case, the review of the stated values (only
when the model states values, ``[[claims]]``), the diagrams, and the cautions.

The HTML file needs no network and no other file (diagrams as inline SVG); its
print stylesheet lays it out on A4 or Letter.  A Markdown report links its
diagrams, PNG files written beside it.  Every text that comes from the model is
escaped.  The report computes nothing: checks, envelope and the thermal split
arrive as arguments; the sheet's sums come from :mod:`axialfe.review.sheet`.
"""

from __future__ import annotations

import datetime
import html
import io
import re
from pathlib import Path

import numpy as np

from ..errors import ModelError
from ..formatting import number
from .text import CAUTIONS, _case_tables, _data, _governing_text, check_groups
from ..results import CaseResult, Solution
from ..units import OutputUnits

__all__ = ["REPORT_FORMATS", "SECTIONS", "PAPERS", "report_format", "build_html",
           "build_markdown", "write_report", "station_words", "calculation_rows", "worked_units",
           "title_block_rows", "figure_names", "write_markdown_with_figures", "md_figure"]

REPORT_FORMATS = {"html": (".html", ".htm"), "markdown": (".md", ".markdown")}
SECTIONS = ("summary", "job", "assumptions", "input", "results", "calculation", "checks",
            "diagrams", "cautions")
_TITLES = {"summary": "Summary", "job": "The job", "assumptions": "Assumptions",
           "input": "Input", "results": "Results", "calculation": "Calculation sheet", "checks": "Design checks",
           "diagrams": "Diagrams", "cautions": "Cautions"}
_MINUS = "\u2212"


def report_format(path, fmt: str | None = None) -> str:
    """The report format for ``path``: ``fmt`` checked against the suffix, or the suffix's.

    Raises
    ------
    ModelError
        For a suffix that is neither HTML nor Markdown, or one that contradicts ``fmt``.
    """
    suffix = Path(path).suffix.lower()
    by_suffix = next((k for k, v in REPORT_FORMATS.items() if suffix in v), None)
    allowed = REPORT_FORMATS[fmt] if fmt else tuple(s for v in REPORT_FORMATS.values() for s in v)
    if fmt not in (None, *REPORT_FORMATS):
        raise ModelError(f"unknown report format '{fmt}'", options=tuple(REPORT_FORMATS))
    if suffix not in allowed:
        what = {"html": "an HTML report", "markdown": "a Markdown report", None: "a report"}[fmt]
        raise ModelError(f"cannot write {what} as '{suffix or Path(path).name}'",
                         file=str(path), options=allowed)
    return fmt or by_suffix


# --- numbers and words -------------------------------------------------------
def _g(value, digits=4) -> str:
    return number(value, digits, minus=_MINUS)


def station_words(u: float, unit: str, factor: float, scale: float = 0.0) -> str:
    """A displacement in words, e.g. ``'0.142 mm toward \u2212x'``.

    Parameters
    ----------
    u : float
        Displacement in m, positive toward +x.
    unit : str
    factor : float
        SI value of one ``unit``.
    scale : float
        Displacements below 1e-12 * scale count as none.

    Examples
    --------
    >>> station_words(-0.000142, "mm", 1e-3)
    '0.142 mm toward \u2212x'
    >>> station_words(0.0, "mm", 1e-3)
    '0 mm (does not move)'
    """
    if u == 0 or abs(u) <= 1e-12 * scale:
        return f"0 {unit} (does not move)"
    direction = "+x" if u > 0 else f"{_MINUS}x"
    return f"{abs(u) / factor:.4g} {unit} toward {direction}"


def worked_units(units: OutputUnits) -> dict:
    """One unit per quantity for the worked lines, coherent so that each line's arithmetic
    gives its result as written: forces in the force unit, every length (L, A, the
    result) in the displacement unit, E in force per displacement unit squared (the
    stress unit's name where it is that, as MPa is N/mm\u00b2).

    Returns
    -------
    dict
        ``force``, ``length``, ``stress`` (names) and ``fF``, ``fL``, ``fS`` (SI values).

    Examples
    --------
    >>> from axialfe.units import OutputUnits
    >>> w = worked_units(OutputUnits())
    >>> w["force"], w["length"], w["stress"]
    ('N', 'mm', 'MPa')
    >>> worked_units(OutputUnits(force="kN"))["stress"]
    'kN/mm\u00b2'
    """
    fF, fD, fS = units.factor("force"), units.factor("displacement"), units.factor("stress")
    coherent = fF / fD ** 2
    stress = (units.stress if abs(fS - coherent) <= 1e-12 * coherent
              else f"{units.force}/{units.displacement}\u00b2")
    return {"force": units.force, "length": units.displacement, "stress": stress,
            "fF": fF, "fL": fD, "fS": coherent}


def calculation_rows(result: CaseResult, units: OutputUnits) -> list[dict]:
    """The hand-calculation split of each segment's elongation, in display units.

    For a uniform segment the elastic part is computed as a hand calculation
    does, N_mean * L / (E * A) (exact for a force varying linearly along it);
    for a taper it is the integral of N / (E * A(x)) from the solver.  Each row
    holds ``elastic``, ``thermal`` (alpha * dT * L), ``misfit``, their ``sum``,
    ``relative`` (the change of distance between the end stations from their
    displacements) and ``closure`` (sum minus relative), plus the terms as text,
    worked in one unit per quantity (:func:`worked_units`) down to the result.
    """
    model = result.model
    fD = units.factor("displacement")
    w = worked_units(units)
    fF, fL, fS = w["fF"], w["fL"], w["fS"]
    D = units.displacement
    idx = model._station_index
    rows = []
    for i, seg in enumerate(model.segments):
        ia, ib = idx[seg.start], idx[seg.end]
        xa, xb = model.stations[ia].x, model.stations[ib].x
        direction = 1.0 if xb > xa else -1.0
        L = float(result.length[i])
        E = seg.material.elastic_modulus
        n0, n1 = (float(v) for v in result.axial_force[i])
        n_mean = 0.5 * (n0 + n1)
        alpha = seg.material.thermal_expansion
        dT = float(result.temperature_change[i])
        if seg.end_section is None:
            A = seg.section.area
            elastic = n_mean * L / (E * A)
            n_text = "N" if n0 == n1 else "N_mean"
            elastic_text = (f"{n_text}\u00b7L/(E\u00b7A) = {_g(n_mean / fF)} {w['force']} \u00d7 "
                            f"{_g(L / fL)} {w['length']} / ({_g(E / fS, 6)} {w['stress']} \u00d7 "
                            f"{_g(A / fL ** 2)} {w['length']}\u00b2) = {_g(elastic / fD)} {D}")
        else:
            elastic = float(result.elastic_elongation[i])
            elastic_text = ("\u222bN/(E\u00b7A(x))dx over the taper (exact taper stiffness) = "
                            f"{_g(elastic / fD)} {D}")
        thermal = alpha * dT * L
        thermal_text = (f"\u03b1\u00b7\u0394T\u00b7L = {alpha:.4g} /K \u00d7 {_g(dT)} K \u00d7 "
                        f"{_g(L / fL)} {w['length']} = {_g(thermal / fD)} {D}")
        total = elastic + thermal + seg.misfit
        relative = direction * (float(result.u[ib]) - float(result.u[ia]))
        rows.append({"segment": seg.name, "elastic": elastic / fD, "thermal": thermal / fD,
                     "misfit": seg.misfit / fD, "sum": total / fD, "relative": relative / fD,
                     "closure": (total - relative) / fD, "elastic_text": elastic_text,
                     "thermal_text": thermal_text,
                     "relative_text": (f"u({seg.end}) {_MINUS} u({seg.start})" if direction > 0
                                       else f"u({seg.start}) {_MINUS} u({seg.end})")})
    return rows


# --- the input echo ----------------------------------------------------------
def _section_text(sec, units):
    fL = units.factor("length")
    parts = []
    for key, value in sec.dimensions:
        if key == "area":
            parts.append(f"area {_g(value / fL ** 2)} {units.length}\u00b2")
        elif key == "second_moment":
            parts.append(f"I {_g(value / fL ** 4)} {units.length}\u2074")
        else:
            parts.append(f"{key.replace('_', ' ')} {_g(value / fL)} {units.length}")
    return f"{sec.name}: {sec.shape}, " + ", ".join(parts)


def _input_tables(model, units):
    """Yield (title, headers, rows) echoing the model's input."""
    fF, fL, fS = units.factor("force"), units.factor("length"), units.factor("stress")
    L, F, S = units.length, units.force, units.stress
    supported = {s.at for s in model.supports}
    yield ("stations", ["station", f"x [{L}]", "laterally braced"],
           [[st.name, _g(st.x / fL, 6), "yes" if st.braced else
             "by its support (assumed)" if st.name in supported else "no"]
            for st in model.stations])
    mats = {}
    for seg in model.segments:
        mats.setdefault(seg.material.name, seg.material)
    yield ("materials", ["material", f"E [{S}]", "\u03b1 [1/K]", f"yield strength [{S}]",
                         "density [kg/m\u00b3]", "source"],
           [[m.name, _tabled(m.modulus_table, fS) or _g(m.elastic_modulus / fS, 6),
             _tabled(m.expansion_table, 1.0, m.expansion_kind) or _g(m.thermal_expansion),
             _tabled(m.yield_table, fS) or (_g(m.yield_strength / fS) if m.yield_strength
                                            else "not given"),
             _g(m.density) if m.density else "-", m.source or "given in the model"]
            for m in mats.values()])
    seg_rows = []
    for seg in model.segments:
        own = [] if seg.temperature_change is None else [f"\u0394T {_g(seg.temperature_change)} K"]
        if seg.misfit:
            own.append(f"misfit {_g(seg.misfit / fL)} {L}")
        if seg.distributed_load:
            own.append(f"distributed load {_g(seg.distributed_load / fF * fL)} {F}/{L}")
        if seg.buckling_length:
            own.append(f"buckling length {_g(seg.buckling_length / fL)} {L}")
        if seg.effective_length_factor:
            own.append(f"K {_g(seg.effective_length_factor)}")
        section = _section_text(seg.section, units)
        if seg.end_section is not None:
            section += " tapering to " + _section_text(seg.end_section, units)
        area = seg.section.area if seg.end_section is None else None
        seg_rows.append([seg.name, seg.start, seg.end, seg.material.name, section,
                         _g(area / fL ** 2) if area else "tapered", "; ".join(own) or "-"])
    yield ("segments", ["segment", "from", "to", "material", "section", f"A [{L}\u00b2]",
                        "own values"], seg_rows)
    if model.supports:
        rows = []
        for s in model.supports:
            extra = (f"stiffness {_g(s.stiffness / fF * fL)} {F}/{L}" if s.kind == "spring" else
                     f"displacement {_g(s.displacement / units.factor('displacement'))} "
                     f"{units.displacement}" if s.kind == "settlement" else "-")
            rows.append([s.at, s.kind, extra])
        yield ("supports", ["at", "kind", "value"], rows)
    load_rows = []
    for case in model.all_cases:
        for ld in case.loads:
            load_rows.append([case.name, ld.at, _g(ld.force / fF, 6)])
    if load_rows:
        yield ("point loads (+ toward +x)", ["case", "at", f"force [{F}]"], load_rows)
    temp_rows = []
    if model.reference_temperature is not None:
        temp_rows.append(["reference temperature", f"{_g(model.reference_temperature - 273.15, 6)} "
                          "\u00b0C"])
    if model.temperature_change is not None:
        temp_rows.append(["model-wide temperature change", f"{_g(model.temperature_change)} K"])
    for case in model.cases:
        for name, dT in case.temperature_change:
            temp_rows.append([f"case '{case.name}', {'every segment' if name == 'all' else name}",
                              f"{_g(dT)} K"])
    if model.gravity:
        temp_rows.append(["gravity along +x (self-weight)", f"{_g(model.gravity)} m/s\u00b2"])
    if temp_rows:
        yield ("temperatures and self-weight", ["item", "value"], temp_rows)
    if model.gaps:
        rows = []
        for g in model.gaps:
            where = (f"between {g.stations[0]} and {g.stations[1]}" if len(g.stations) == 2
                     else f"at {g.stations[0]}, stop on the {g.side} side")
            rows.append([g.name, g.kind, where,
                         _g(g.clearance / units.factor("displacement"), 6)])
        yield ("gaps", ["gap", "kind", "where", f"clearance [{units.displacement}]"], rows)
    if model.combinations:
        yield ("combinations", ["combination", "factors"],
               [[c.name, ", ".join(f"{f:g} \u00d7 {n}" for n, f in c.factors)]
                for c in model.combinations])
    if model.limits:
        D, fD = units.displacement, units.factor("displacement")
        yield ("deformation limits", ["limit", "value"],
               [[f"|u| at {lim.at}", f"at most {_g(lim.displacement / fD)} {D}"] if lim.at else
                [f"opening of gap {lim.gap}", f"at least {_g(lim.min_opening / fD)} {D}"]
                for lim in model.limits])


def _job_text(model) -> str:
    from .text import summary_line

    src = f" (file {Path(model.source).name})" if model.source else ""
    return (f"Axial analysis of \u201c{model.title}\u201d{src}: {summary_line(model)}. "
            "Every segment is a two-node bar element; the assembly is solved by the direct "
            "stiffness method for the displacements of the stations, from which the axial force "
            "and stress of each segment, the reactions of the supports and the state of each "
            "gap follow. This report echoes the input, lists the results and sets out the "
            "elongation of each segment the way a hand calculation does, so that a reviewer "
            "can follow the arithmetic.")


def _assumptions(report) -> list[str]:
    return [
        "Linear-elastic material, small displacements, axial load only (no bending, no "
        "shear); the stress N/A is uniform over each cross-section.",
        "Signs: x, displacements and external forces are positive toward +x; axial force and "
        "stress are positive in tension; a reaction is the force a support exerts on the bar.",
        "Thermal strain is \u03b1\u00b7\u0394T; a misfit is the length made minus the distance "
        "between the stations; a distributed load and self-weight vary the force linearly "
        "along a segment.",
        "A gap is an exact one-way constraint: a contact carries compression only once closed, a "
        "slack link tension only once taut.",
        "Design checks: " + report.settings_text() + ". Buckling: each compressed segment is "
        "checked with its own section, material and compression over the buckling length of "
        "its braced run (conservative for the weaker parts of a run of mixed sections, not for "
        "its stiffer parts, whose notes name the weaker segment); where "
        "parts lie side by side (a sleeve on a bolt), the one guided by the other may in fact "
        "be supported along its length, which the check does not assume. The column curve "
        "decides stocky members with a capacity of at most A\u00b7f_y; with euler-only, members "
        "with K\u00b7L/r below \u03c0\u221a(E/f_y) are left undecided. The bracing "
        "assumptions, K and the curve must be confirmed against the applicable design code "
        "and by a licensed engineer.",
    ]


# --- diagrams ----------------------------------------------------------------
def svg_text(fig) -> str:
    """A matplotlib figure as inline SVG for an HTML report, its text kept as text."""
    import matplotlib
    from matplotlib.backends.backend_svg import FigureCanvasSVG

    buf = io.BytesIO()
    FigureCanvasSVG(fig)
    with matplotlib.rc_context({"svg.fonttype": "none"}):   # text stays text
        fig.savefig(buf, format="svg", metadata={"Date": None})
    text = buf.getvalue().decode("utf-8")
    text = text[text.index("<svg"):]
    return text.replace("<svg ", '<svg role="img" style="max-width:100%;height:auto" ', 1)


def _svg(result, units) -> str:
    from .plot import plot_case

    return svg_text(plot_case(result, "all", None, units))


# --- the title block and the summary ----------------------------------------
PAPERS = {"a4": "A4", "letter": "letter"}
_VERDICT = {"pass": "PASS", "fail": "FAIL", "undecided": "UNDECIDED"}


def title_block_rows(model, date: str) -> list[list[str]]:
    """The title block: (label, text) rows of the project, the calculation and the date."""
    rows = [["calculation", str(model.title)]]
    project = model.project.items() if model.project is not None else ()
    rows += [[label, text] for label, text in project if label != "date"]
    stated = dict(project).get("date")
    rows.append(["date", stated if stated else date])
    if stated and stated != date:
        rows.append(["printed", date])
    return rows


def _verdict_text(checks) -> str:
    return {"pass": "every check passes", "fail": "at least one check FAILS",
            "undecided": "no check fails, but some cannot be decided by the tool: an engineer "
                         "must review them"}[checks.status]


def _count_text(checks) -> str:
    entries = checks.entries
    n_pass = sum(e.ok is True for e in entries)
    n_fail = sum(e.ok is False for e in entries)
    n_open = sum(e.ok is None for e in entries)
    n_cases = len(checks.cases)
    return (f"{len(entries)} check{'s' if len(entries) != 1 else ''} in {n_cases} "
            f"case{'s' if n_cases != 1 else ''}: {n_pass} pass, {n_fail} fail, "
            f"{n_open} undecided" + (f"; strength not checked for {len(checks.unchecked)} "
                                     "segments (no yield strength)" if checks.unchecked else ""))


def _envelope_parts(env, units, full: bool):
    """The envelope as (kind, ...) blocks: its key rows (the summary), or every table."""
    from .envelopetext import _summary_rows, _title, envelope_tables

    title = _title(env)
    if not full:
        yield ("table", title[0].upper() + title[1:], _ENVELOPE_HEADERS, _summary_rows(env, units))
        return
    yield ("text", None, title[0].upper() + title[1:] + ".")
    for name, headers, rows in envelope_tables(env, units):
        yield ("table", name, headers, rows)


_ENVELOPE_HEADERS = ["quantity", "least", "in case", "at", "largest", "in case", "at"]


def _summary_notes(data) -> list[str]:
    """Every case's notes, each once, with the cases it belongs to."""
    notes: dict[str, list[str]] = {}
    for case in data["cases"]:
        for note in case.get("notes", []):
            notes.setdefault(note, []).append(case["name"])
    return [note + ("" if len(data["cases"]) == 1 else " (case " + ", ".join(
        f"\u2018{c}\u2019" for c in cases) + ")") for note, cases in notes.items()]


# --- the calculation sheet's extra tables ------------------------------------
def _force(value, units) -> str:
    return _g(value / units.factor("force"))


def _gap_rows(result, units):
    from ..review.sheet import gap_compatibility

    fD, D = units.factor("displacement"), units.displacement
    rows = []
    for line in gap_compatibility(result):
        terms = sorted(line.terms, key=lambda t: t[0] < 0)   # the added terms first
        written, numbers = [], []
        for k, (c, name, u) in enumerate(terms):
            sign = (f"{_MINUS} " if c < 0 else "+ ") if k else (_MINUS if c < 0 else "")
            value = _g(u / fD, 6)
            written.append(f"{sign}u({name})")
            numbers.append(sign + (f"({value})" if u < 0 and sign else value))
        rows.append([line.gap, f"{' '.join(written)} = {' '.join(numbers)} {D}",
                     _g(line.closure / fD, 6), _g(line.clearance / fD, 6),
                     _g(line.defect / fD, 2)])
    return rows


def _gap_headers(units):
    D = units.displacement
    return ["gap", "closure from the displacements", f"closure [{D}]", f"clearance [{D}]",
            f"closure {_MINUS} clearance [{D}]"]


def _balance_rows(result, units):
    from ..review.sheet import station_balance

    F = units.force
    rows = []
    for line in station_balance(result):
        terms = "; ".join(f"{what} {_force(f, units)}" for what, f in line.terms) or "nothing"
        rows.append([line.station, terms, _force(line.imbalance, units)])
    return rows


def _balance_headers(units):
    return ["station", f"forces on the station [{units.force}, + toward +x]",
            f"sum [{units.force}]"]


def _split_rows(result, split, units):
    rows = []
    for i, seg in enumerate(result.model.segments):
        n = result.axial_force[i]
        rows.append([seg.name, *(_force(v, units) for v in n),
                     *(_force(v, units) for v in split.thermal[i]),
                     *(_force(v, units) for v in split.other[i])])
    return rows


def _split_headers(units):
    F = units.force
    return ["segment", f"N from [{F}]", f"N to [{F}]", f"thermal from [{F}]",
            f"thermal to [{F}]", f"other from [{F}]", f"other to [{F}]"]


def _split_text(split) -> str:
    if split is None:
        return ("The thermal part of each force was not worked out for this report "
                "(axialfe.review.sheet.thermal_split).")
    if not split.heated:
        return "No temperature change acts in this case: every force is load-driven."
    if not split.separable:
        return ("The thermal part cannot be separated in this case: with the temperature "
                "changes alone, gap " + ", ".join(f"\u2018{g}\u2019" for g in split.changed)
                + " would take another state than it has here, so the force is not the sum "
                "of a thermal part and a load-driven part.")
    return ("Thermal part: the force the temperature changes of this case give alone, with "
            "every gap in the state it has here (self-limiting: it eases as the parts yield "
            "or slip); other: the rest, from loads, self-weight, settlements, misfit and "
            "preload. By linearity they sum to the force.")


def _elongation_headers(units):
    D = units.displacement
    return ["segment", f"N\u00b7L/(E\u00b7A) [{D}]", f"\u03b1\u00b7\u0394T\u00b7L [{D}]",
            f"misfit [{D}]", f"sum [{D}]", f"relative displacement [{D}]", "from",
            f"sum {_MINUS} relative [{D}]"]


def _calc_parts(result, units, split):
    """The calculation sheet of one case as (kind, ...) blocks for either format."""
    rows = calculation_rows(result, units)
    yield ("table", "Elongation of each segment", _elongation_headers(units),
           [[r["segment"], _g(r["elastic"], 6), _g(r["thermal"], 6), _g(r["misfit"], 6),
             _g(r["sum"], 6), _g(r["relative"], 6), r["relative_text"], _g(r["closure"], 2)]
            for r in rows])
    yield ("list", "Worked lines",
           [f"{r['segment']}: {r['elastic_text']}; {r['thermal_text']}" for r in rows])
    yield ("text", "Thermal and load-driven force", _split_text(split))
    if split is not None and split.separable and split.heated:
        yield ("table", None, _split_headers(units), _split_rows(result, split, units))
    gaps = _gap_rows(result, units)
    if result.model.gaps:
        yield ("text", "Compatibility of the closed gaps",
               "Each closed gap's closure, from the displacements of its stations, equals its "
               "clearance." if gaps else "No gap is closed in this case.")
        if gaps:
            yield ("table", None, _gap_headers(units), gaps)
    yield ("text", "Balance of each station",
           "The forces on each station (its load, the pull of each segment end, the "
           "reactions, the gap forces) sum to zero.")
    yield ("table", None, _balance_headers(units), _balance_rows(result, units))
    yield ("table", "Displacement of each station", ["station", "displacement"],
           _station_word_rows(result, units))


def _station_word_rows(result, units):
    fD = units.factor("displacement")
    scale = float(np.abs(result.u).max(initial=0.0))
    model = result.model
    order = sorted(range(len(model.stations)), key=lambda i: model.stations[i].x)
    return [[model.stations[i].name, station_words(float(result.u[i]), units.displacement, fD,
                                                   scale)] for i in order]


def _splits(thermal, solution):
    return {s.case: s for s in thermal} if thermal is not None else {}


# --- HTML --------------------------------------------------------------------
_CSS = """
body { font: 14px/1.45 system-ui, sans-serif; color: #27303a; max-width: 1100px;
       margin: 2em auto; padding: 0 1em; }
h1 { font-size: 1.5em; border-bottom: 2px solid #27303a; padding-bottom: .2em; }
h2 { font-size: 1.2em; margin-top: 2em; border-bottom: 1px solid #c9ced3; }
h3 { font-size: 1em; margin-top: 1.4em; }
table { border-collapse: collapse; margin: .5em 0 1em; font-size: 12.5px; }
th, td { border: 1px solid #d3d7db; padding: .2em .5em; vertical-align: top; }
th { background: #eef0f2; text-align: left; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td { overflow-wrap: break-word; }
.fail { color: #9a3b2f; font-weight: bold; } .review { color: #8a6417; font-weight: bold; }
.pass { color: #2f6f4e; } .meta { color: #6b747c; } figure { margin: 1em 0; }
table.page, table.page > * > tr > td { border: 0; padding: 0; margin: 0; width: 100%; }
table.titleblock { width: 100%; margin: 0 0 .6em; font-size: 11px; }
table.titleblock td { padding: .1em .4em; } table.titleblock td.label { color: #6b747c;
  width: 7em; white-space: nowrap; }
p.verdict { font-size: 1.25em; font-weight: bold; padding: .3em .6em; border: 2px solid;
  display: inline-block; }
ul.worked li { font-size: 12.5px; }
h1, h2, h3, p, li, figcaption { overflow-wrap: anywhere; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 10.5px; }
  table { font-size: 9px; } table.titleblock { font-size: 9px; }
  ul.worked li { font-size: 9px; }
  section { break-before: page; } section#summary { break-before: auto; }
  h2, h3 { break-after: avoid; }
  tr, figure, svg, p.verdict { break-inside: avoid; }
  thead { display: table-header-group; }
  figure svg { max-height: 240mm; }
}
"""


def _page_css(paper: str) -> str:
    if paper not in PAPERS:
        raise ModelError(f"unknown paper size '{paper}'", place="--paper", options=tuple(PAPERS))
    return f"@page {{ size: {PAPERS[paper]} portrait; margin: 12mm 12mm 14mm; }}"


def _e(text) -> str:
    return html.escape(str(text), quote=True)


_LONG = 24      # a run of this many characters with no break gets break opportunities


def _cell(text) -> str:
    """Escaped text for a table cell, a long unbroken run (a long name) given a break
    opportunity every 12 characters, so that no table is wider than the printed page."""
    out = []
    for word in re.split(r"(\s+)", str(text)):
        if len(word) > _LONG:
            out.append("<wbr>".join(_e(word[k:k + 12]) for k in range(0, len(word), 12)))
        else:
            out.append(_e(word))
    return "".join(out)


def _is_num(text: str) -> bool:
    try:
        float(str(text).replace(_MINUS, "-"))
        return True
    except ValueError:
        return False


def _html_table(headers, rows, classes=None, cls=None) -> str:
    head = "".join(f"<th>{_e(h)}</th>" for h in headers)
    body = []
    for r, row in enumerate(rows):
        cells = []
        for c, cell in enumerate(row):
            kind = classes[r][c] if classes and classes[r][c] else ("num" if _is_num(cell) else "")
            cells.append(f'<td class="{kind}">{_cell(cell)}</td>' if kind else
                         f"<td>{_cell(cell)}</td>")
        body.append("<tr>" + "".join(cells) + "</tr>")
    attr = f' class="{cls}"' if cls else ""
    return f"<table{attr}><thead><tr>{head}</tr></thead><tbody>{''.join(body)}</tbody></table>"


def _html_parts(parts) -> str:
    out = []
    for part in parts:
        kind, title = part[0], part[1]
        if title:
            out.append(f"<p><strong>{_e(title)}</strong></p>")
        if kind == "table":
            out.append(_html_table(part[2], part[3]))
        elif kind == "list":
            out.append('<ul class="worked">' + "".join(f"<li>{_e(x)}</li>" for x in part[2])
                       + "</ul>")
        else:
            out.append(f"<p>{_e(part[2])}</p>")
    return "".join(out)


def _title_block_html(model, date) -> str:
    rows = title_block_rows(model, date)
    cells = ["<tr>" + "".join(f'<td class="label">{_e(a)}</td><td>{_cell(b)}</td>' for a, b in pair)
             + "</tr>" for pair in (rows[k:k + 2] for k in range(0, len(rows), 2))]
    return f'<table class="titleblock" id="titleblock"><tbody>{"".join(cells)}</tbody></table>'


def build_html(solution: Solution, units: OutputUnits | None = None, date: str | None = None,
               checks=None, review=None, envelope=None, thermal=None,
               paper: str = "a4", notes=None, tolerance=None) -> str:
    """The report as one self-contained HTML document.

    Parameters
    ----------
    solution : Solution
    units : OutputUnits, optional
        Default: the model's.
    date : str, optional
        ISO date of the report (default: today); the title block shows the
        project's date when ``[project]`` gives one.
    checks : CheckReport
        The design checks (:func:`axialfe.checks.check_solution`): the verdict
        of the summary and the checks section.
    review : Review, optional
        The review of the model's stated values (:mod:`axialfe.review`): a
        section of its own after the checks, when given.
    envelope : Envelope, optional
        The envelope of the results over the cases (:func:`axialfe.envelope.envelope`),
        whose key quantities the summary shows.
    thermal : tuple of ThermalSplit, optional
        The thermal part of each force (:func:`axialfe.review.sheet.thermal_split`),
        for the calculation sheet.
    paper : {'a4', 'letter'}
        The paper the print stylesheet lays the report out on.
    notes : dict, optional
        Each case's notes where its result leaves the assumptions of the solve
        (:func:`axialfe.checks.assumptions.assumption_notes`), shown under the case
        and in the summary.
    tolerance : Study, optional
        A tolerance study of the model (:func:`axialfe.tolerance.study.run_study`):
        a section of its own after the checks, when given.

    Notes
    -----
    Printed, every page carries the title block (the head of the page table,
    repeated by the browser), each section starts a page and no table row is
    cut across pages.
    """

    model = solution.model
    units = units or model.units
    if checks is None:
        raise TypeError("the report needs the checks of the solution "
                        "(axialfe.checks.check_solution): output computes nothing")
    date = date or datetime.date.today().isoformat()
    data = _data(solution, units, notes)
    splits = _splits(thermal, solution)
    out = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
           '<meta name="viewport" content="width=device-width, initial-scale=1">',
           f"<title>{_e(model.title)}</title>", f"<style>{_CSS}{_page_css(paper)}</style>",
           "</head>", "<body>",
           '<table class="page"><thead><tr><td>' + _title_block_html(model, date)
           + "</td></tr></thead><tbody><tr><td>",
           f"<h1>{_e(model.title)}</h1>",
           f'<p class="meta">Axial analysis report, <time datetime="{_e(date)}">{_e(date)}</time>; '
           "units: " + _e(", ".join(f"{k} {v}" for k, v in units.as_dict().items())) + "</p>"]

    def section(key):
        out.append(f'<section id="{key}"><h2>{_TITLES[key]}</h2>')

    section("summary")
    out.append(f'<p class="verdict {_STATUS_CLASS[checks.status]}" id="verdict">Verdict: '
               f"{_VERDICT[checks.status]}</p>")
    verdict = _verdict_text(checks)
    out.append(f"<p>{_e(verdict[0].upper() + verdict[1:])}. {_e(_count_text(checks))}.</p>")
    out.append(f'<p id="summary-governing"><strong>Governing check:</strong> '
               f"{_e(_governing_text(checks))}.</p>")
    if solution.inaccurate:
        out.append("<p><strong>INACCURATE:</strong> " + _e(", ".join(
            c.name for c in solution.inaccurate)) + ": these results must not be used.</p>")
    if envelope is not None:
        out.append(_html_parts(_envelope_parts(envelope, units, full=False)))
    notes = _summary_notes(data)
    if notes:
        out.append("<p><strong>Notes on the results</strong></p><ul>"
                   + "".join(f"<li>{_e(n)}</li>" for n in notes) + "</ul>")
    out.append("<p><strong>Cautions</strong></p><ul>"
               + "".join(f"<li>{_e(c)}</li>" for c in CAUTIONS) + "</ul></section>")
    section("job")
    out.append(f"<p>{_e(_job_text(model))}</p></section>")
    section("assumptions")
    out.append("<ul>" + "".join(f"<li>{_e(a)}</li>" for a in _assumptions(checks)) + "</ul></section>")
    section("input")
    for title, headers, rows in _input_tables(model, units):
        out.append(f"<h3>{_e(title)}</h3>" + _html_table(headers, rows))
    out.append("</section>")
    section("results")
    if envelope is not None and len(solution.cases) > 1:
        out.append('<h3 id="envelope">Envelope</h3>'
                   + _html_parts(_envelope_parts(envelope, units, full=True)))
    for n, case in enumerate(data["cases"]):
        out.append(f'<h3 id="results-{n}">Case \u201c{_e(case["name"])}\u201d</h3>')
        for title, headers, rows in _case_tables(case, data["units"]):
            out.append(f"<p><strong>{_e(title)}</strong></p>" + _html_table(headers, rows))
        out.append(f"<p>Equilibrium residual: {case['equilibrium_residual']:.2e} (largest "
                   "out-of-balance station force over the largest force).</p>")
        if case["status"] != "ok":
            out.append(f"<p><strong>INACCURATE:</strong> {_e(case['message'])}</p>")
        for note in case.get("notes", []):
            out.append(f"<p>Note: {_e(note)}</p>")
    out.append("</section>")
    section("calculation")
    out.append(f"<p>{_e(_CALC_INTRO)}</p>")
    for n, result in enumerate(solution.cases):
        out.append(f'<h3 id="calculation-{n}">Case \u201c{_e(result.name)}\u201d</h3>')
        out.append(_html_parts(_calc_parts(result, units, splits.get(result.name))))
    out.append("</section>")
    section("checks")
    verdict_class = {"pass": "pass", "FAIL": "fail", "review": "review"}
    for n, case in enumerate(checks.cases):
        out.append(f'<h3 id="checks-{n}">Case \u201c{_e(case.case)}\u201d</h3>')
        groups = check_groups(case, units)
        for headers, entries, rows in groups:
            at = headers.index("result")
            classes = [[None] * at + [verdict_class[e.verdict], None] for e in entries]
            out.append(_html_table(headers, rows, classes))
        if not groups:
            out.append("<p>No checks.</p>")
    out.append(f'<p id="governing"><strong>Governing check:</strong> '
               f"{_e(_governing_text(checks))}. Overall: {_e(checks.status)}.</p>")
    out.append(f"<p>Basis: {_e(checks.settings_text())}.</p></section>")
    if review is not None:  # --- stated values (axialfe.review) ---
        from .reviewtext import REVIEW_TITLE, review_html

        out.append(f'<section id="review"><h2>{REVIEW_TITLE[0].upper()}{REVIEW_TITLE[1:]}</h2>'
                   f"{review_html(review, units)}</section>")
    if tolerance is not None:  # --- a tolerance study (axialfe.tolerance) ---
        from .tolerancetext import study_html

        out.append(study_html(tolerance, units, _html_table))
    section("diagrams")
    for n, result in enumerate(solution.cases):
        out.append(f'<figure id="diagram-{n}">{_svg(result, units)}'
                   f"<figcaption>Axial force, stress and displacement along x, case "
                   f"\u201c{_e(result.name)}\u201d.</figcaption></figure>")
    out.append("</section>")
    section("cautions")
    out.append("<ul>" + "".join(f"<li>{_e(c)}</li>" for c in CAUTIONS) + "</ul></section>")
    out += ["</td></tr></tbody></table>", "</body>", "</html>"]
    return "\n".join(out) + "\n"


_STATUS_CLASS = {"pass": "pass", "fail": "fail", "undecided": "review"}
_CALC_INTRO = ("Each segment's elongation is the sum of its elastic part N\u00b7L/(E\u00b7A), its "
               "thermal part \u03b1\u00b7\u0394T\u00b7L and its misfit; the sum must equal the "
               "relative displacement of its end stations (the last column is the difference). "
               "The worked lines keep one unit per quantity, so each can be redone as written. "
               "Then the thermal part of each force, the compatibility of each closed gap and "
               "the balance of each station.")


# --- Markdown ----------------------------------------------------------------
def _md(text) -> str:
    text = html.escape(str(text), quote=False)
    for ch in "\\`*_[]#|":
        text = text.replace(ch, "\\" + ch)
    return text


def _md_table(headers, rows) -> list[str]:
    return (["| " + " | ".join(_md(h) for h in headers) + " |",
             "|" + "|".join("---" for _ in headers) + "|"]
            + ["| " + " | ".join(_md(c) for c in r) + " |" for r in rows] + [""])


def _md_parts(parts) -> list[str]:
    out = []
    for part in parts:
        kind, title = part[0], part[1]
        if title:
            out += [f"**{_md(title)}**", ""]
        if kind == "table":
            out += _md_table(part[2], part[3])
        elif kind == "list":
            out += [f"- {_md(x)}" for x in part[2]] + [""]
        else:
            out += [_md(part[2]), ""]
    return out


def figure_names(path, count: int) -> list[Path]:
    """The diagram files a Markdown report at ``path`` links, beside it:
    ``REPORT-STEM-diagram-1.png``, ``-2.png``, ... (``count`` of them, in order)."""
    path = Path(path)
    return [path.with_name(f"{path.stem}-diagram-{n + 1}.png") for n in range(count)]


def write_markdown_with_figures(path, build, figures) -> Path:
    """Write the diagrams ``figures`` (matplotlib figures) as the PNG files of
    :func:`figure_names` beside ``path``, then ``build(names)`` (the Markdown text that
    links them by name) to ``path``; every file atomically."""
    from ..io.files import write_text
    from .plot import save_figure

    path = Path(path)
    files = figure_names(path, len(figures))
    text = build([f.name for f in files])
    try:
        for fig, file in zip(figures, files):
            save_figure(fig, file)
        write_text(path, text)  # atomic: a failing write leaves no partial report
    except OSError as exc:
        raise ModelError(f"cannot write the report: {exc}", file=str(path)) from exc
    return path


def md_figure(caption: str, name) -> str:
    """A Markdown image linking the file ``name`` (relative to the report)."""
    return f"![{caption}]({_md_link(name)})"


def build_markdown(solution: Solution, units: OutputUnits | None = None, date: str | None = None,
                   checks=None, review=None, envelope=None, thermal=None,
                   figures=None, notes=None, tolerance=None) -> str:
    """The report as one Markdown document.

    ``figures`` are the names (relative to the report) of the diagram files, one per
    case, which the document links; :func:`write_report` writes them beside it.
    Without them the diagrams section says where the diagrams are drawn
    (``axialfe plot``). The other parameters are those of :func:`build_html`.
    """

    model = solution.model
    units = units or model.units
    if checks is None:
        raise TypeError("the report needs the checks of the solution "
                        "(axialfe.checks.check_solution): output computes nothing")
    date = date or datetime.date.today().isoformat()
    data = _data(solution, units, notes)
    splits = _splits(thermal, solution)
    out = [f"# {_md(model.title)}", ""] + _md_table(["item", "value"], title_block_rows(model, date))
    out += [f"Axial analysis report, {date}; units: "
            + ", ".join(f"{k} {v}" for k, v in units.as_dict().items()), ""]
    out += [f"## {_TITLES['summary']}", "",
            f"**Verdict: {_VERDICT[checks.status]}** ({_md(_verdict_text(checks))}). "
            f"{_md(_count_text(checks))}.", "",
            f"**Governing check:** {_md(_governing_text(checks))}.", ""]
    if solution.inaccurate:
        out += ["**INACCURATE:** " + _md(", ".join(c.name for c in solution.inaccurate))
                + ": these results must not be used.", ""]
    if envelope is not None:
        out += _md_parts(_envelope_parts(envelope, units, full=False))
    notes = _summary_notes(data)
    if notes:
        out += ["**Notes on the results**", ""] + [f"- {_md(n)}" for n in notes] + [""]
    out += ["**Cautions**", ""] + [f"- {_md(c)}" for c in CAUTIONS] + [""]
    out += [f"## {_TITLES['job']}", "", _md(_job_text(model)), ""]
    out += [f"## {_TITLES['assumptions']}", ""] + [f"- {_md(a)}" for a in _assumptions(checks)] + [""]
    out += [f"## {_TITLES['input']}", ""]
    for title, headers, rows in _input_tables(model, units):
        out += [f"### {_md(title)}", ""] + _md_table(headers, rows)
    out += [f"## {_TITLES['results']}", ""]
    if envelope is not None and len(solution.cases) > 1:
        out += ["### Envelope", ""] + _md_parts(_envelope_parts(envelope, units, full=True))
    for case in data["cases"]:
        out += [f"### Case \u201c{_md(case['name'])}\u201d", ""]
        for title, headers, rows in _case_tables(case, data["units"]):
            out += [f"**{_md(title)}**", ""] + _md_table(headers, rows)
        out += [f"Equilibrium residual: {case['equilibrium_residual']:.2e}", ""]
        if case["status"] != "ok":
            out += [f"**INACCURATE:** {_md(case['message'])}", ""]
        out += [f"Note: {_md(n)}" for n in case.get("notes", [])]
    out += [f"## {_TITLES['calculation']}", "", _md(_CALC_INTRO), ""]
    for result in solution.cases:
        out += [f"### Case \u201c{_md(result.name)}\u201d", ""]
        out += _md_parts(_calc_parts(result, units, splits.get(result.name)))
    out += [f"## {_TITLES['checks']}", ""]
    for case in checks.cases:
        out += [f"### Case \u201c{_md(case.case)}\u201d", ""]
        for headers, _, rows in check_groups(case, units):
            out += _md_table(headers, rows)
    out += [f"**Governing check:** {_md(_governing_text(checks))}. Overall: {checks.status}.", "",
            f"Basis: {_md(checks.settings_text())}.", ""]
    if review is not None:  # --- stated values (axialfe.review) ---
        from .reviewtext import review_markdown

        out += review_markdown(review, units)
    if tolerance is not None:  # --- a tolerance study (axialfe.tolerance) ---
        from .tolerancetext import study_markdown

        out += study_markdown(tolerance, units, _md_table)
    out += [f"## {_TITLES['diagrams']}", ""]
    for n, result in enumerate(solution.cases):
        caption = f"diagram {n + 1}: axial force, stress and displacement, case {_md(result.name)}"
        if figures is None:
            out += [f"{caption}: draw it with `axialfe plot MODEL --case NAME`.", ""]
        else:
            out += [md_figure(caption, figures[n]), ""]
    out += [f"## {_TITLES['cautions']}", ""] + [f"- {_md(c)}" for c in CAUTIONS]
    return "\n".join(out) + "\n"


def _md_link(name) -> str:
    """A relative file name as a Markdown link target (spaces and brackets escaped)."""
    from urllib.parse import quote

    return quote(str(name), safe="/-_.")


def write_report(solution: Solution, path, fmt: str | None = None,
                 units: OutputUnits | None = None, date: str | None = None,
                 checks=None, review=None, envelope=None, thermal=None,
                 paper: str = "a4", notes=None, tolerance=None) -> Path:
    """Write the report to ``path`` (UTF-8) as ``fmt`` (by the suffix when None).

    ``checks`` (required), ``review``, ``envelope``, ``thermal``, ``paper``,
    ``notes`` and ``tolerance`` are those of :func:`build_html`.  A Markdown report links its diagrams, written
    beside it as PNG files (:func:`figure_names`); every file is written atomically.
    """
    path = Path(path)
    fmt = report_format(path, fmt)
    if fmt == "markdown":
        from .plot import plot_case

        units = units or solution.model.units
        return write_markdown_with_figures(
            path, lambda names: build_markdown(solution, units, date, checks=checks,
                                               review=review, envelope=envelope,
                                               thermal=thermal, figures=names, notes=notes,
                                               tolerance=tolerance),
            [plot_case(result, "all", None, units) for result in solution.cases])
    from ..io.files import write_text

    text = build_html(solution, units, date, checks=checks, review=review,
                      envelope=envelope, thermal=thermal, paper=paper, notes=notes,
                      tolerance=tolerance)
    try:
        write_text(path, text)  # atomic: a failing write leaves no partial report
    except OSError as exc:
        raise ModelError(f"cannot write the report: {exc}", file=str(path)) from exc
    return path


def _tabled(table, factor, kind=None):
    """A property against temperature in one cell: its range of values and temperatures."""
    if table is None:
        return None
    from ..units import kelvin_to_temperature

    t = [float(kelvin_to_temperature(T, "degC")) for T in table.span]
    what = {"mean": "mean coefficient ", "total": "total strain "}.get(kind, "")
    start = (f" from {float(kelvin_to_temperature(table.reference, 'degC')):.4g} degC"
             if table.reference is not None else "")
    return (f"{what}table{start}: {_g(table.values[0] / factor)} to "
            f"{_g(table.values[-1] / factor)} ({t[0]:.4g} to {t[1]:.4g} degC), "
            "at each case's temperatures")
