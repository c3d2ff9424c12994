"""Output: the terminal report and the JSON, CSV and Markdown forms of a solution.

Everything here reads a :class:`~axialfe.results.Solution` and writes text; it
computes nothing new.  Numbers are shown in the model's output units (or the
units given on the command line), with their units in every heading.
"""

from __future__ import annotations

import csv
import io
import json
import re

from ..formatting import number, numbers
from ..results import Solution
from ..units import OutputUnits

__all__ = ["CAUTIONS", "render", "to_json", "to_csv", "to_markdown", "to_table", "FORMATS",
           "checks_table", "checks_markdown", "checks_json", "checks_csv", "check_dict",
           "check_csv_rows", "caution_lines", "check_groups", "fitted"]

FORMATS = ("table", "json", "csv", "markdown")

CAUTIONS = (
    "Linear-elastic, small-displacement analysis of axial members: yielding is not followed "
    "(axialfe path and collapse do that), no large deformation, no bending; buckling is only "
    "checked where a check says so.",
    "Built-in material values are typical values; verify them against the material "
    "certificate and the governing standard.",
    "These results support checking and design; they do not replace the applicable design "
    "codes and standards, or review by a licensed professional engineer.",
)


def _g(value, digits=6):
    return number(value, digits, plain=False)


def _gs(values, digits=6):
    """:func:`_g` of each value: a table's column, formatted in one pass."""
    return numbers(list(values), digits, plain=False)


def _rows(*columns):
    """The rows of a table given by its columns."""
    return [list(r) for r in zip(*columns)]


def terminal_width() -> int:
    """The width tables are fitted to: the terminal's when the output is one, else 100."""
    import shutil
    import sys

    try:
        tty = sys.stdout.isatty()
    except (AttributeError, ValueError):
        tty = False
    return max(shutil.get_terminal_size((100, 24)).columns, 60) if tty else 100


def _grid(headers, rows, indent="  ", width=None):
    """Align a table as text: names left, numbers right.

    A table wider than ``width`` (``"terminal"`` for :func:`terminal_width`; None for
    no limit) is split into blocks of columns that fit, one under the other, each
    repeating the first column (the item's name).
    """
    if width == "terminal":
        width = terminal_width()
    cells = [list(map(str, r)) for r in rows]
    columns_of = list(zip(*cells)) if cells else [()] * len(headers)
    widths = [max(len(h), max(map(len, col), default=0)) for h, col in zip(headers, columns_of)]
    numeric = [bool(col) and _all_numbers(col) for col in columns_of]

    def block(columns):
        # one format per block: numbers right, names left, each in its column's width
        fmt = indent + "  ".join(f"{{{i}:{'>' if numeric[i] else '<'}{widths[i]}}}"
                                 for i in columns)
        out = [fmt.format(*headers).rstrip(), indent + "  ".join("-" * widths[i] for i in columns)]
        return out + [fmt.format(*r).rstrip() for r in cells]

    blocks, current = [], [0]
    for i in range(1, len(headers)):
        wide = len(indent) + sum(widths[j] + 2 for j in current) + widths[i]
        if width is not None and wide > width and len(current) > 1:
            blocks.append(current)
            current = [0]
        current.append(i)
    blocks.append(current)
    out = []
    for n, columns in enumerate(blocks):
        out += ([""] if n else []) + block(columns)
    return out


_OTHER_SPACE = re.compile(r"[\t\n\x0b\x0c\r]")


def _wrapped(text, width, first, rest):
    """``text`` wrapped at its spaces to ``width``, its first line after ``first``, the others
    after ``rest``; a word longer than the line stands alone.  Text whose words are set apart
    by single spaces (every note and message) is filled here, greedily, as ``textwrap`` fills
    it; any other goes to ``textwrap`` itself."""
    if (not text or text[0] == " " or text[-1] == " " or "  " in text
            or _OTHER_SPACE.search(text)):
        import textwrap

        return textwrap.wrap(text, width, initial_indent=first, subsequent_indent=rest,
                             break_on_hyphens=False, break_long_words=False) or [first.rstrip()]
    out, at, indent, end = [], 0, first, len(text)
    while True:
        room = width - len(indent)
        if end - at <= room:                       # the rest fits
            out.append(indent + text[at:])
            return out
        cut = text.rfind(" ", at, at + room + 1)   # the last space that ends a line that fits
        if cut < 0:                                # a word longer than the line stands alone
            cut = text.find(" ", at)
            if cut < 0:
                out.append(indent + text[at:])
                return out
        out.append(indent + text[at:cut])
        at, indent = cut + 1, rest


def _fit_grid(headers, rows, indent="  "):
    """:func:`_grid` fitted to the terminal's width."""
    return _grid(headers, rows, indent, width="terminal")


def fitted(lines, width: int | None = None) -> str:
    """``lines`` as one text, each line longer than ``width`` (the terminal's by default)
    wrapped at its spaces under its own indent (and under the text of a ``- `` or ``1. ``
    item).  Tables split by :func:`_grid` already fit, and a row of one that cannot (its
    columns are set apart by two spaces) is left whole: this wraps the prose around them."""
    width = terminal_width() if width is None else width
    out = []
    for line in lines:
        body = line.lstrip(" ")
        if len(line) <= width or "  " in body:
            out.append(line)
            continue
        lead = line[:len(line) - len(body)]
        item = re.match(r"(- |\d+\. )", body)
        rest = lead + " " * (len(item.group(1)) if item else 2)
        out += _wrapped(body, width, lead, rest)
    return "\n".join(out) + "\n"


def caution_lines(cautions=CAUTIONS, width: int | None = None) -> list[str]:
    """The ``cautions:`` block of a terminal output, each caution wrapped to ``width``
    (the terminal's by default)."""
    width = terminal_width() if width is None else width
    return ["cautions:"] + [line for c in cautions for line in _wrapped(c, width, " - ", "   ")]


def _footnotes(notes, width, title=" notes:"):
    """Notes as numbered footnotes, each wrapped to ``width``."""
    if not notes:
        return []
    out = [title]
    for n, text in enumerate(notes, 1):
        out += _wrapped(text, width, f"  {n:>2}. ", "      ")
    return out


def _all_numbers(texts) -> bool:
    """Whether every text reads as a number (``float`` takes it)."""
    try:
        for _ in map(float, texts):
            pass
        return True
    except ValueError:
        return False


def _case_tables(case: dict, units: dict):
    """Yield (title, headers, rows) for one case in the JSON layout."""
    F, L, D, S = units["force"], units["length"], units["displacement"], units["stress"]
    stations = sorted(case["stations"], key=lambda s: s["x"])   # in order of x
    yield ("stations", ["station", f"x [{L}]", f"displacement [{D}]"],
           _rows([s["name"] for s in stations], _gs(s["x"] for s in stations),
                 _gs(s["displacement"] for s in stations)))
    segs = case["segments"]
    heated = any(s["temperature_change"] for s in segs)
    columns = [[s["name"] for s in segs], [s["from"] for s in segs], [s["to"] for s in segs],
               _gs(s["length"] for s in segs), _gs(s["axial_force"][0] for s in segs),
               _gs(s["axial_force"][1] for s in segs), _gs(s["stress"][0] for s in segs),
               _gs(s["stress"][1] for s in segs), _gs(s["elongation"] for s in segs)]
    if heated:
        columns.append(_gs(s["temperature_change"] for s in segs))
    yield ("segments", ["segment", "from", "to", f"L [{L}]", f"N from [{F}]", f"N to [{F}]",
                        f"stress from [{S}]", f"stress to [{S}]", f"elongation [{D}]"]
           + ([f"dT [{units.get('temperature', 'K')}]"] if heated else []), _rows(*columns))
    if case["reactions"]:
        if "load_on_support" in case["reactions"][0]:   # added by _data
            yield ("reactions (force of the support on the bar, + toward +x; the load on the "
                   "support is its opposite)",
                   ["at", "support", f"force [{F}]", f"load on support [{F}]", "direction"],
                   [[r["at"], r["kind"], _g(r["force"]), _g(r["load_on_support"]),
                     r.get("_direction", r["direction"])] for r in case["reactions"]])
        else:
            yield ("reactions (force of the support on the bar, + toward +x)",
                   ["at", "support", f"force [{F}]"],
                   [[r["at"], r["kind"], _g(r["force"])] for r in case["reactions"]])
    if case["gaps"]:
        yield ("gaps (force + in tension)", ["gap", "kind", "state", f"opening [{D}]", f"force [{F}]"],
               [[g["name"], g["kind"], g["state"], _g(g["opening"]), _g(g["force"])]
                for g in case["gaps"]])


def summary_line(model) -> str:
    def count(n, word):
        return f"{n} {word}" + ("s" if n != 1 else "")

    parts = [count(len(model.stations), "station"), count(len(model.segments), "segment"),
             count(len(model.supports), "support")]
    if model.gaps:
        parts.append(count(len(model.gaps), "gap"))
    parts.append(count(len(model.all_cases) + len(model.combinations), "case"))
    return ", ".join(parts)


def _data(solution: Solution, units: OutputUnits, notes=None, zero_noise=False) -> dict:
    """The solution's plain numbers in ``units``: each case's ``notes`` (from
    :func:`axialfe.checks.assumptions.assumption_notes`) added to its own, and each
    reaction's load on the support with its direction in words
    (:func:`axialfe.supports.support_loads`); with ``zero_noise`` a value below the
    rounding bound of its kind (:func:`axialfe.results.rounding_bounds`) is 0."""
    from ..results import rounding_bounds
    from ..supports import support_loads

    data = solution.to_dict(units)
    f = {k: units.factor(k) for k in ("force", "displacement", "stress")}
    for result, case in zip(solution.cases, data["cases"]):
        if notes:
            from ..checks.entries import note_text

            case["notes"] = case["notes"] + [note_text(n, units) for n in notes.get(case["name"], ())]
        for r, load in zip(case["reactions"], support_loads(result)):
            r["load_on_support"] = load.load / f["force"]
            r["direction"] = load.words
            r["_direction"] = load.short          # the table's column (dropped from JSON)
        if zero_noise:
            bound = {k: v / f[k] for k, v in rounding_bounds(result).items()}

            def clean(value, kind):
                b = bound[kind]
                if isinstance(value, list):
                    return [clean(v, kind) if isinstance(v, list) else 0.0 if -b <= v <= b else v
                            for v in value]
                return 0.0 if abs(value) <= b else value

            for st in case["stations"]:
                st["displacement"] = clean(st["displacement"], "displacement")
            for seg in case["segments"]:
                seg["axial_force"] = clean(seg["axial_force"], "force")
                seg["stress"] = clean(seg["stress"], "stress")
                seg["elongation"] = clean(seg["elongation"], "displacement")
            for r in case["reactions"]:
                r["force"] = clean(r["force"], "force")
                r["load_on_support"] = clean(r["load_on_support"], "force")
            for g in case["gaps"]:
                g["force"] = clean(g["force"], "force")
                g["opening"] = clean(g["opening"], "displacement")
    return data


def _envelope_shown(solution: Solution, envelope, full: bool) -> bool:
    """Whether the envelope is shown: asked for, or the solution has several cases."""
    return envelope is not None and (full or len(solution.cases) > 1)


def _warning_texts(warnings, units):
    from ..checks.entries import note_text

    return [note_text(w, units) for w in warnings or ()]


def to_table(solution: Solution, units: OutputUnits | None = None, checks=None,
             review=None, envelope=None, full_envelope=False, notes=None, brief=False,
             width=None, warnings=None) -> str:
    """The readable terminal report (with the checks of ``checks``, a CheckReport, the
    review of stated values ``review`` and the ``envelope``, an Envelope, when given: its
    short summary after the cases when there are several, every item when
    ``full_envelope``), and each case's ``notes``: where its result leaves the
    assumptions of the solve).

    Tables fit ``width`` columns (default :func:`terminal_width`), notes are numbered
    footnotes under their case, and the cautions close the report once.  ``brief``
    prints only each case's reactions and notes, and the governing check.
    """
    units = units or solution.model.units
    width = width or terminal_width()
    data = _data(solution, units, notes, zero_noise=True)
    model = solution.model

    def grid(headers, rows):
        return _grid(headers, rows, width=width)

    out = [f"axialfe: {data['title']}",
           f"model: {summary_line(model)}",
           "units: " + ", ".join(f"{k} {v}" for k, v in data["units"].items()),
           "signs: x and forces + toward +x; axial force and stress + in tension", ""]
    for case in data["cases"]:
        out.append(f"== case '{case['name']}' ==")
        for title, headers, rows in _case_tables(case, data["units"]):
            if brief and not title.startswith("reactions"):
                continue
            out += _wrapped(title, width, " ", "   ")
            out += grid(headers, rows)
            out.append("")
        if not brief:
            out.append(f" equilibrium residual: {case['equilibrium_residual']:.2e} "
                       "(largest out-of-balance station force / largest force)")
        if case["status"] != "ok":
            out += _wrapped(f"INACCURATE: {case['message']}", width, " ", "   ")
        out += _footnotes(case.get("notes", []), width)
        for seg in case["segments"] if not brief else ():  # --- preloads (axialfe.engine.preload) ---
            if "preload_misfit" in seg:
                out += _wrapped(f"preload: '{seg['name']}' has the misfit "
                                f"{_g(seg['preload_misfit'])} {data['units']['length']}, found to "
                                "give its preload when installed", width, " ", "   ")
        out.append("")
        if checks is not None and not brief:  # --- design checks (axialfe.checks) ---
            out += _check_lines(checks.case(case["name"]), units, width=width)
            out.append("")
    for text in _warning_texts(warnings, units):  # --- model warnings (checks.assumptions) ---
        out += _wrapped(f"warning: {text}", width, "", "  ")
    if warnings:
        out.append("")
    if _envelope_shown(solution, envelope, full_envelope) and not brief:  # --- axialfe.envelope ---
        from .envelopetext import envelope_lines, envelope_summary_lines

        out += (envelope_lines(envelope, units, grid) if full_envelope
                else envelope_summary_lines(envelope, units, grid) + [""])
    if checks is not None:
        lines = _governing_lines(checks, units)
        out += [part for text in (lines[:1] if brief else lines)
                for part in _wrapped(text, width, "", "  ")]
        out.append("")
    if review is not None and not brief:  # --- stated values (axialfe.review) ---
        from .reviewtext import review_lines

        out += review_lines(review, units, width=width) + [""]
    out += caution_lines(width=width)
    return "\n".join(out) + "\n"


def to_json(solution: Solution, units: OutputUnits | None = None, checks=None,
            review=None, envelope=None, full_envelope=False, notes=None, warnings=None) -> str:
    units = units or solution.model.units
    data = _data(solution, units, notes)
    for case in data["cases"]:
        for r in case["reactions"]:
            r.pop("_direction", None)
    if warnings is not None:  # --- model warnings (checks.assumptions) ---
        data["warnings"] = _warning_texts(warnings, units)
    if envelope is not None:  # --- axialfe.envelope: always, for one case too ---
        data["envelope"] = envelope.to_dict(units)
    if checks is not None:  # --- design checks (axialfe.checks) ---
        for case in data["cases"]:
            case["checks"] = [check_dict(e, units) for e in checks.case(case["name"])]
        data["governing"] = checks.governing_dict()
    if review is not None:  # --- stated values (axialfe.review) ---
        reviewed = review.to_dict(units or solution.model.units)
        data.update({k: reviewed[k] for k in ("claims", "agree", "differ")})
    data["cautions"] = list(CAUTIONS)
    return json.dumps(data, indent=2) + "\n"


def check_dict(entry, units: OutputUnits) -> dict:
    """The JSON form of a check entry with the amounts behind its utilisation and their unit."""
    return {**entry.to_dict(units), **entry.amounts(units)}


def check_csv_rows(checks, units: OutputUnits) -> list[list[str]]:
    """CSV rows of the checks in the long table's columns: item ``check``, quantity
    ``KIND AMOUNT`` (demand, capacity; required, actual, margin for deformation limits),
    then ``KIND utilization`` and ``KIND result`` (pass, FAIL or review)."""
    rows = []
    for e in checks.entries:
        amounts = e.amounts(units)
        unit = amounts.pop("unit")
        for key, value in amounts.items():
            rows.append([e.case, "check", e.name, f"{e.kind} {key}", "",
                         "" if value is None else repr(value), unit])
        rows.append([e.case, "check", e.name, f"{e.kind} utilization", "",
                     "" if e.utilization is None else repr(float(e.utilization)), "1"])
        rows.append([e.case, "check", e.name, f"{e.kind} result", "", e.verdict, ""])
    return rows


def to_csv(solution: Solution, units: OutputUnits | None = None, review=None, envelope=None,
           full_envelope=False, checks=None) -> str:
    """One long table: case, item, name, quantity, position, value, unit (with the checks of
    ``checks``, a CheckReport, the stated values of ``review``, a Review, and the rows of
    case ``envelope`` when given and the solution has several cases or ``full_envelope``)."""
    units = units or solution.model.units
    data = _data(solution, units)
    u = data["units"]
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["case", "item", "name", "quantity", "end", "value", "unit"])
    for case in data["cases"]:
        c = case["name"]
        for s in case["stations"]:
            w.writerow([c, "station", s["name"], "x", "", repr(s["x"]), u["length"]])
            w.writerow([c, "station", s["name"], "displacement", "", repr(s["displacement"]),
                        u["displacement"]])
        for s in case["segments"]:
            for q, unit in (("axial_force", u["force"]), ("stress", u["stress"]),
                            ("mechanical_strain", "1")):
                for end, v in zip(("from", "to"), s[q]):
                    w.writerow([c, "segment", s["name"], q, end, repr(v), unit])
            w.writerow([c, "segment", s["name"], "elongation", "", repr(s["elongation"]),
                        u["displacement"]])
            w.writerow([c, "segment", s["name"], "temperature_change", "",
                        repr(s["temperature_change"]), u["temperature"]])
            w.writerow([c, "segment", s["name"], "thermal_strain", "", repr(s["thermal_strain"]), "1"])
        for r in case["reactions"]:
            w.writerow([c, "reaction", r["at"], "force", "", repr(r["force"]), u["force"]])
            w.writerow([c, "reaction", r["at"], "load_on_support", "", repr(r["load_on_support"]),
                        u["force"]])
            w.writerow([c, "reaction", r["at"], "direction", "", r["direction"], ""])
        for g in case["gaps"]:
            w.writerow([c, "gap", g["name"], "kind", "", g["kind"], ""])
            w.writerow([c, "gap", g["name"], "state", "", g["state"], ""])
            w.writerow([c, "gap", g["name"], "opening", "", repr(g["opening"]), u["displacement"]])
            w.writerow([c, "gap", g["name"], "force", "", repr(g["force"]), u["force"]])
        w.writerow([c, "case", c, "equilibrium_residual", "", repr(case["equilibrium_residual"]), "1"])
    if checks is not None:  # --- design checks (axialfe.checks) ---
        w.writerows(check_csv_rows(checks, units))
    if _envelope_shown(solution, envelope, full_envelope):  # --- axialfe.envelope ---
        from .envelopetext import envelope_csv_rows

        w.writerows(envelope_csv_rows(envelope, units))
    if review is not None:  # --- stated values (axialfe.review) ---
        from .reviewtext import review_csv_rows

        w.writerows(review_csv_rows(review, units))
    return buf.getvalue()


def _md_escape(text) -> str:
    return str(text).replace("|", "\\|")


def to_markdown(solution: Solution, units: OutputUnits | None = None, checks=None,
                review=None, envelope=None, full_envelope=False, notes=None,
                warnings=None) -> str:
    units = units or solution.model.units
    data = _data(solution, units, notes, zero_noise=True)
    out = [f"# {_md_escape(data['title'])}", "",
           "Units: " + ", ".join(f"{k} {v}" for k, v in data["units"].items())
           + ". Forces and displacements + toward +x; axial force and stress + in tension.", ""]
    for case in data["cases"]:
        out += [f"## Case `{_md_escape(case['name'])}`", ""]
        for title, headers, rows in _case_tables(case, data["units"]):
            out += [f"**{title}**", "", "| " + " | ".join(headers) + " |",
                    "|" + "|".join("---" for _ in headers) + "|"]
            out += ["| " + " | ".join(_md_escape(c) for c in r) + " |" for r in rows]
            out.append("")
        out += [f"Equilibrium residual: {case['equilibrium_residual']:.2e}", ""]
        if case["status"] != "ok":
            out += [f"**INACCURATE:** {_md_escape(case['message'])}", ""]
        if case["notes"]:
            out += [f"- Note: {_md_escape(n)}" for n in case["notes"]] + [""]
        if checks is not None:  # --- design checks (axialfe.checks) ---
            out += checks_markdown(checks.case(case["name"]), units)
    if warnings:  # --- model warnings (checks.assumptions) ---
        out += [f"**Warning:** {_md_escape(t)}" for t in _warning_texts(warnings, units)] + [""]
    if _envelope_shown(solution, envelope, full_envelope):  # --- axialfe.envelope ---
        from .envelopetext import envelope_markdown

        out += envelope_markdown(envelope, units, _md_escape)
    if checks is not None:
        out += ["**Governing check:** " + _md_escape(_governing_text(checks)), "",
                "Basis: " + checks.settings_text() + ".", ""]
    if review is not None:  # --- stated values (axialfe.review) ---
        from .reviewtext import review_markdown

        out += review_markdown(review, units)
    out += ["## Cautions", ""] + [f"- {c}" for c in CAUTIONS]
    return "\n".join(out) + "\n"


def render(solution: Solution, fmt: str = "table", units: OutputUnits | None = None,
           checks=None, review=None, envelope=None, full_envelope=False, notes=None,
           brief=False, warnings=None) -> str:
    """Return the solution as text in ``fmt`` (one of :data:`FORMATS`).

    The table, JSON and Markdown forms carry the design checks (``checks``, a
    :class:`~axialfe.checks.CheckReport` made by the caller), the review of
    the model's stated values (``review``, an :class:`axialfe.review.Review`)
    and the envelope over the cases (``envelope``, an
    :class:`axialfe.envelope.Envelope`; JSON always, the others when there
    are several cases or ``full_envelope``) and the notes of each case where its
    result leaves the assumptions of the solve (``notes``, from
    :func:`axialfe.checks.assumptions.assumption_notes`; not in CSV), each when
    given: output computes nothing.  ``brief`` (table only) keeps each case's reactions
    and notes and the governing check; ``warnings`` (from
    :func:`axialfe.checks.assumptions.model_warnings`) are about the model as a whole.
    """
    if fmt == "csv":
        return to_csv(solution, units, review=review, envelope=envelope,
                      full_envelope=full_envelope, checks=checks)
    if fmt == "table":
        return to_table(solution, units, checks=checks, review=review, envelope=envelope,
                        full_envelope=full_envelope, notes=notes, brief=brief,
                        warnings=warnings)
    return {"json": to_json, "markdown": to_markdown}[fmt](
        solution, units, checks=checks, review=review, envelope=envelope,
        full_envelope=full_envelope, notes=notes, warnings=warnings)


# --- design checks (axialfe.checks) -----------------------------------------
_CHECK_HEADERS = ("check", "name", "demand", "capacity", "utilization", "result", "note")


def _note_cell(entry, units: OutputUnits, shown: dict | None) -> str:
    """An entry's note in ``units``; ``shown`` keeps each note text written so far (the
    entries of a long member share a few notes)."""
    if shown is None:
        return entry.note_in(units) or ""
    text = shown.get(entry.note)
    if text is None:
        text = shown[entry.note] = entry.note_in(units) or ""
    return text


def _check_cells(entry, units: OutputUnits, shown=None):
    key = entry.quantity
    unit, f = getattr(units, key), units.factor(key)

    def value(v):
        return "-" if v is None else f"{number(v / f)} {unit}"

    util = "-" if entry.utilization is None else f"{entry.utilization:.3f}"
    return [entry.kind, entry.name, value(entry.demand), value(entry.capacity), util,
            entry.verdict, _note_cell(entry, units, shown)]


# A deformation limit is stated as what is required and what the result gives, not as a
# demand against a capacity; its rows go in a table of their own under these headers.
_LIMIT_HEADERS = ("limit", "name", "actual", "required", "margin", "utilization", "result", "note")


def _limit_cells(entry, units: OutputUnits, shown=None):
    a = entry.amounts(units)

    def value(v):
        return "-" if v is None else f"{number(v)} {a['unit']}"

    util = "-" if entry.utilization is None else f"{entry.utilization:.3f}"
    return [entry.kind, entry.name, value(a["actual"]), value(a["required"]), value(a["margin"]),
            util, entry.verdict, _note_cell(entry, units, shown)]


def check_groups(entries, units: OutputUnits):
    """The check tables of ``entries``: ``(headers, entries, rows)`` for strength and
    buckling (demand, capacity), then for deformation limits (actual, required, margin),
    each only when it has a row."""
    from ..checks.entries import LIMIT_KINDS

    entries = list(entries)
    limits = [e for e in entries if e.kind in LIMIT_KINDS]
    others = [e for e in entries if e.kind not in LIMIT_KINDS]
    shown = {}
    groups = [(_CHECK_HEADERS, others, [_check_cells(e, units, shown) for e in others]),
              (_LIMIT_HEADERS, limits, [_limit_cells(e, units, shown) for e in limits])]
    return [g for g in groups if g[1]]


# Lines of the check tables are kept within this width: long notes go under the table.
WIDTH = 120


def _check_lines(case_checks, units: OutputUnits, title=True, width=WIDTH):
    """Lines of the checks table of one case: notes numbered in the table, in full under it,
    every line within ``width``."""
    out = _wrapped(f"checks of case '{case_checks.case}' (utilization = demand x safety factor / "
                   "capacity; review: the tool cannot decide)",
                   width, " ", "   ") if title else []
    if not len(case_checks):
        return out + ["  (no checks)"]
    notes = {}                      # note text -> its number (one number for a repeated note)
    lines = []
    for n, (headers, _, rows) in enumerate(check_groups(case_checks, units)):
        for cells in rows:
            if cells[-1]:
                cells[-1] = str(notes.setdefault(cells[-1], len(notes) + 1))
        lines += ([""] if n else []) + _grid(list(headers), rows, width=width)
    if notes:
        lines.append("  notes:")
        for text, n in notes.items():
            lines += _wrapped(text, width, f"  {n:>2}. ", "      ")
    return out + lines


def _governing_text(checks) -> str:
    g = checks.governing
    text = ("none (no check has a utilization)" if g is None else
            f"{g.kind} of '{g.name}' in case '{g.case}', utilization {g.utilization:.3f} ({g.verdict})")
    # a failure with no utilization (a closed gap that must stay open) never governs by
    # number, so it is named here: the line must not read as a pass while a check fails
    failing = [e for e in checks.entries if e.ok is False and e.utilization is None]
    if failing:
        text += "; FAILING without a utilization: " + ", ".join(
            f"{e.kind} of '{e.name}' in case '{e.case}'" for e in failing[:5])
        if len(failing) > 5:
            text += f" and {len(failing) - 5} more"
    return text


def _governing_lines(checks, units: OutputUnits):
    counts = {"pass": 0, "FAIL": 0, "review": 0}
    for e in checks.entries:
        counts[e.verdict] += 1
    return [f"governing check: {_governing_text(checks)}",
            f"checks: {counts['pass']} pass, {counts['FAIL']} fail, {counts['review']} need review"
            f" (overall: {checks.status})",
            f"check basis: {checks.settings_text()}"]


def checks_json(checks, units: OutputUnits, title: str) -> str:
    """The JSON form of ``axialfe check``: checks per case, governing entry, status."""
    return json.dumps({"title": title, "units": units.as_dict(),
                       "cases": [{"name": c.case, "checks": [check_dict(e, units) for e in c]}
                                 for c in checks.cases],
                       "governing": checks.governing_dict(), "status": checks.status,
                       "cautions": list(CAUTIONS)}, indent=2) + "\n"


def checks_csv(checks, units: OutputUnits) -> str:
    """The CSV form of ``axialfe check``: the long table's columns, the check rows only."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["case", "item", "name", "quantity", "end", "value", "unit"])
    w.writerows(check_csv_rows(checks, units))
    return buf.getvalue()


def checks_table(checks, units: OutputUnits | None = None, title: str | None = None) -> str:
    """The checks of every case, the governing entry and the cautions, as text."""
    units = units or OutputUnits()
    width = terminal_width()
    out = _wrapped(f"axialfe check: {title}", width, "", "  ") if title else []
    if title:
        out.append("units: " + ", ".join(f"{k} {v}" for k, v in units.as_dict().items()))
        out.append("")
    for c in checks.cases:
        out += _check_lines(c, units, width=width)
        out.append("")
    out += [line for text in _governing_lines(checks, units) for line in _wrapped(text, width, "", "  ")]
    out += [""] + caution_lines(width=width)
    return "\n".join(out) + "\n"


def checks_markdown(case_checks, units: OutputUnits) -> list[str]:
    """Markdown lines of the checks table of one case."""
    out = ["**checks** (utilization = demand x safety factor / capacity)", ""]
    for headers, _, rows in check_groups(case_checks, units):
        out += ["| " + " | ".join(headers) + " |", "|" + "|".join("---" for _ in headers) + "|"]
        out += ["| " + " | ".join(_md_escape(c) for c in cells) + " |" for cells in rows]
        out.append("")
    return out
