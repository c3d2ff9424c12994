"""Text forms of a review of stated values: the terminal table, JSON, Markdown and HTML.

Everything here reads a :class:`~axialfe.review.Review` and writes text; it
computes nothing new.  Values are shown in the output units of their kind
(forces, stresses, displacements), with the unit beside each number.
"""

from __future__ import annotations

import html
import json

from ..formatting import number
from ..review.claims import DISPLAY
from ..units import OutputUnits

__all__ = ["REVIEW_TITLE", "REVIEW_CAUTION", "review_rows", "review_csv_rows", "review_lines", "review_table", "review_json",
           "review_markdown", "review_html"]

REVIEW_TITLE = "review of the stated values"
REVIEW_CAUTION = ("A slip listed here reproduces a stated value: it is the likely cause to look for "
                  "in the calculation, not a proof of it. A value that agrees shows only that the "
                  "calculation and this model give the same number: the model must still describe "
                  "the job.")
_HEADERS = ("claim", "quantity", "at", "case", "claimed", "computed", "difference", "relative",
            "tolerance", "verdict", "source")


def _label(item) -> str:
    end = f" ({item['end']})" if item["end"] not in (None, "max") else ""
    return item["what"].replace("_", " ") + end


def review_rows(review, units: OutputUnits) -> list[list[str]]:
    """One row of cells per claim, in display units."""
    rows = []
    for n, item in enumerate(review.to_dict(units)["claims"], 1):
        unit = getattr(units, DISPLAY[item["what"]])
        rel = item["relative_difference"]
        rows.append([str(n), _label(item), item["at"], item["case"],
                     f"{number(item['claimed'])} {unit}", f"{number(item['computed'])} {unit}",
                     f"{number(item['difference'])} {unit}",
                     "-" if rel is None else f"{number(rel * 100)} %",
                     item["tolerance"], item["verdict"], item["source"] or ""])
    return rows


def review_csv_rows(review, units: OutputUnits) -> list[list[str]]:
    """Rows of the long CSV table of a solution: for each claim its claimed and computed
    value, its verdict, and each slip found (item ``claim``, name = where it is stated)."""
    rows = []
    for item in review.to_dict(units)["claims"]:
        unit = getattr(units, DISPLAY[item["what"]])
        end = item["end"] or ""
        rows += [[item["case"], "claim", item["at"], f"{item['what']} claimed", end,
                  repr(item["claimed"]), unit],
                 [item["case"], "claim", item["at"], f"{item['what']} computed", end,
                  repr(item["computed"]), unit],
                 [item["case"], "claim", item["at"], f"{item['what']} verdict", end,
                  item["verdict"], item["tolerance"]]]
        rows += [[item["case"], "claim", item["at"], f"{item['what']} slip {s['slip']}", end,
                  repr(s["value"]), unit] for s in item["slips"]]
    return rows


def _slip_lines(review, units: OutputUnits) -> list[str]:
    """For each claim that differs: the slips that reproduce it, or that none does."""
    out = []
    for n, item in enumerate(review.to_dict(units)["claims"], 1):
        if item["verdict"] == "agrees" and not item["note"]:
            continue
        unit = getattr(units, DISPLAY[item["what"]])
        head = (f"claim {n}, {_label(item)} at '{item['at']}': claimed "
                f"{number(item['claimed'])} {unit}, computed {number(item['computed'])} {unit}")
        lines = [f"- {s['slip']}: {s['text']} (gives {number(s['value'])} {unit})"
                 for s in item["slips"]]
        if item["note"]:
            lines.append(f"- note: {item['note']}")
        out.append((head, lines))
    return out


def _summary(review) -> str:
    def count(n, verb):
        return f"{n} {verb}" + ("s" if n == 1 else "")

    return (f"claims: {count(review.agree, 'agree')}, {count(review.differ, 'differ')}"
            + ("" if review.differ else " (every stated value agrees)"))


def review_lines(review, units: OutputUnits, width=None) -> list[str]:
    """The review as terminal lines: the table, the slips found, the counts (with ``width``,
    the table split and the text wrapped to fit it)."""
    from .text import _grid, _wrapped

    def text(line, first="", rest="   "):
        return [first + line] if width is None else _wrapped(line, width, first, rest)

    out = text(f"{REVIEW_TITLE} (difference = claimed - computed; agrees when |difference| is "
               "at most the tolerance)", " ")
    out += _grid(list(_HEADERS), review_rows(review, units), width=width)
    slips = _slip_lines(review, units)
    if slips:
        out += [""] + text("likely slips behind the values that differ (each reproduces the "
                           "claimed value within its tolerance)", " ")
        for head, lines in slips:
            out += text(head, "  ", "      ")
            out += [part for line in lines for part in text(line, "    ", "      ")]
    out += [""] + text(_summary(review)) + text(f"note: {REVIEW_CAUTION}", "", "  ")
    return out


def review_table(review, units: OutputUnits | None = None) -> str:
    """The whole terminal output of ``axialfe verify``."""
    from .text import CAUTIONS, caution_lines, fitted, terminal_width

    units = units or review.model.units
    out = [f"axialfe verify: {review.model.title}",
           "units: " + ", ".join(f"{k} {v}" for k, v in units.as_dict().items()),
           "signs: forces + toward +x; axial force and stress + in tension; a reaction is the "
           "force of the support on the bar", ""]
    out += review_lines(review, units, width=terminal_width())
    out += [""] + caution_lines(CAUTIONS)
    return fitted(out)


def review_json(review, units: OutputUnits | None = None) -> str:
    """The JSON of ``axialfe verify --format json``."""
    from .text import CAUTIONS

    data = review.to_dict(units)
    data["cautions"] = [REVIEW_CAUTION, *CAUTIONS]
    return json.dumps(data, indent=2) + "\n"


def _md(text) -> str:
    text = html.escape(str(text), quote=False)  # names and sources come from the model file
    for ch in "\\`*_[]#|":
        text = text.replace(ch, "\\" + ch)
    return text


def review_markdown(review, units: OutputUnits, heading: str = "##") -> list[str]:
    """Markdown lines of the review: a table and the slips found."""
    out = [f"{heading} {REVIEW_TITLE[0].upper()}{REVIEW_TITLE[1:]}", "",
           "Difference = claimed \u2212 computed; a claim agrees when |difference| is at most its "
           "tolerance.", "",
           "| " + " | ".join(_HEADERS) + " |", "|" + "|".join("---" for _ in _HEADERS) + "|"]
    out += ["| " + " | ".join(_md(c) for c in row) + " |" for row in review_rows(review, units)]
    out.append("")
    for head, lines in _slip_lines(review, units):
        out += [f"**{_md(head)}**", ""] + [f"- {_md(line[2:])}" for line in lines] + [""]
    out += [_summary(review) + ".", "", _md(REVIEW_CAUTION), ""]
    return out


def review_html(review, units: OutputUnits) -> str:
    """The review as an HTML fragment (a table, the slips found and the counts)."""
    e = html.escape
    rows = review_rows(review, units)
    verdict = _HEADERS.index("verdict")
    body = ["<table><thead><tr>" + "".join(f"<th>{e(h)}</th>" for h in _HEADERS)
            + "</tr></thead><tbody>"]
    for row in rows:
        cells = []
        for i, c in enumerate(row):
            cls = (' class="pass"' if c == "agrees" else ' class="fail"') if i == verdict else ""
            cells.append(f"<td{cls}>{e(c)}</td>")
        body.append("<tr>" + "".join(cells) + "</tr>")
    body.append("</tbody></table>")
    for head, lines in _slip_lines(review, units):
        body.append(f"<p><strong>{e(head)}</strong></p><ul>"
                    + "".join(f"<li>{e(line[2:])}</li>" for line in lines) + "</ul>")
    body.append(f"<p>{e(_summary(review))}.</p>")
    body.append(f"<p>{e(REVIEW_CAUTION)}</p>")
    return "\n".join(body)
