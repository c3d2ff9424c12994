"""The report document of a press or shrink fit: one self-contained HTML or Markdown file.

Sections, in order: the job, the basis (assumptions and defaults), the input
(parts, limits, states), the results at the least and the greatest
interference, the loosening and shrink temperatures, the checks with the
governing one, the diagram (pressure and stresses against a uniform
temperature) and the cautions.  The page style and the table builders are the
model report's (:mod:`axialfe.output.report`); every text from the file is
escaped and the document needs no network and no other file.
"""

from __future__ import annotations

import datetime
from pathlib import Path

from ..errors import ModelError
from ..fits.fit import FitResult, FitUnits
from .fittext import (FIT_CAUTIONS, FIT_CHECK_HEADERS, fit_check_cells, fit_governing_text,
                      fit_summary_lines, fit_tables)
from .report import (_CSS, _e, _html_table, _md, _md_table, md_figure, report_format,
                     svg_text, write_markdown_with_figures)

__all__ = ["build_fit_html", "build_fit_markdown", "write_fit_report"]


def _job(result: FitResult) -> str:
    fit = result.fit
    kind = "hollow shaft" if fit.inner_diameter else "solid shaft"
    how = (f"ISO 286 fit {fit.designation}" if fit.designation else
           "given limits of bore and shaft" if fit.bore_limits else "a given interference")
    return (f"A {kind} of {fit.shaft.name} held by interference in a hub of {fit.hub.name} "
            f"({how}), checked in the assembly state and {len(fit.services)} service "
            "state(s): contact pressure, stresses, holding capacity and loosening under "
            "temperature.")


def _summary_rows(result: FitResult, units: FitUnits):
    rows = []
    for line in fit_summary_lines(result, units):
        text = line.strip()
        if text.startswith(("loosening temperature", "shrink temperature")):
            label, _, value = text.rpartition(": ")
        else:
            label, value = text[:18].strip(), text[18:].strip()
        rows.append([label, value])
    return rows


def _figure(result: FitResult, units: FitUnits) -> str:
    from .fitplot import plot_fit

    return svg_text(plot_fit(result, None, units))


_CAPTION = ("Contact pressure at the least and the greatest interference, and the largest "
            "equivalent stress of each part at the greatest, with both parts at one "
            "temperature; states whose parts share a temperature are marked.")


def build_fit_html(result: FitResult, units: FitUnits | None = None,
                   date: str | None = None) -> str:
    """The fit report as one self-contained HTML document."""
    fit = result.fit
    units = units or fit.units
    date = date or datetime.date.today().isoformat()
    out = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
           '<meta name="viewport" content="width=device-width, initial-scale=1">',
           f"<title>{_e(fit.title)}</title>", f"<style>{_CSS}</style>", "</head>", "<body>",
           f"<h1>{_e(fit.title)}</h1>",
           f'<p class="meta">Press and shrink fit report, <time datetime="{_e(date)}">'
           f"{_e(date)}</time>; units: "
           + _e(", ".join(f"{k} {v}" for k, v in units.as_dict().items()))
           + ", temperatures in degC</p>",
           '<section id="job"><h2>The job</h2>', f"<p>{_e(_job(result))}</p></section>",
           '<section id="assumptions"><h2>Basis</h2><ul>'
           + "".join(f"<li>{_e(n)}</li>" for n in result.notes) + "</ul></section>",
           '<section id="input"><h2>The fit</h2>',
           _html_table(["item", "value"], _summary_rows(result, units)), "</section>",
           '<section id="results"><h2>Results</h2>']
    for title, headers, rows in fit_tables(result, units):
        out.append(f"<p><strong>{_e(title)}</strong></p>" + _html_table(headers, rows))
    out.append("</section>")
    out.append('<section id="checks"><h2>Checks</h2>')
    verdict = {"pass": "pass", "FAIL": "fail", "review": "review"}
    entries = result.checks.entries
    rows = [fit_check_cells(e, units) for e in entries]
    classes = [[None] * 6 + [verdict[e.verdict], None] for e in entries]
    out.append(_html_table(FIT_CHECK_HEADERS, rows, classes) if rows else "<p>No checks.</p>")
    out.append(f'<p id="governing"><strong>Governing check:</strong> '
               f"{_e(fit_governing_text(result))}. Overall: {_e(result.checks.status)}.</p>"
               "</section>")
    out.append('<section id="diagrams"><h2>Diagram</h2>'
               f'<figure id="diagram-0">{_figure(result, units)}'
               f"<figcaption>{_e(_CAPTION)}</figcaption></figure></section>")
    out.append('<section id="cautions"><h2>Cautions</h2><ul>'
               + "".join(f"<li>{_e(c)}</li>" for c in FIT_CAUTIONS) + "</ul></section>")
    out += ["</body>", "</html>"]
    return "\n".join(out) + "\n"


def build_fit_markdown(result: FitResult, units: FitUnits | None = None,
                       date: str | None = None, figures=None) -> str:
    """The fit report as one Markdown document, linking its diagram (``figures``: the one
    file name, which :func:`write_fit_report` writes beside it)."""
    fit = result.fit
    units = units or fit.units
    date = date or datetime.date.today().isoformat()
    out = [f"# {_md(fit.title)}", "",
           f"Press and shrink fit report, {date}; units: "
           + ", ".join(f"{k} {v}" for k, v in units.as_dict().items())
           + ", temperatures in degC", "",
           "## The job", "", _md(_job(result)), "", "## Basis", ""]
    out += [f"- {_md(n)}" for n in result.notes] + ["", "## The fit", ""]
    out += _md_table(["item", "value"], _summary_rows(result, units))
    out += ["## Results", ""]
    for title, headers, rows in fit_tables(result, units):
        out += [f"**{_md(title)}**", ""] + _md_table(headers, rows)
    out += ["## Checks", ""]
    out += _md_table(FIT_CHECK_HEADERS, [fit_check_cells(e, units) for e in result.checks.entries])
    out += [f"**Governing check:** {_md(fit_governing_text(result))}. Overall: "
            f"{result.checks.status}.", "", "## Diagram", "",
            md_figure(_md(_CAPTION), figures[0]) if figures else
            f"{_md(_CAPTION)} (drawn by `axialfe plot FIT`)", "",
            "## Cautions", ""]
    out += [f"- {_md(c)}" for c in FIT_CAUTIONS]
    return "\n".join(out) + "\n"


def write_fit_report(result: FitResult, path, fmt: str | None = None,
                     units: FitUnits | None = None, date: str | None = None) -> Path:
    """Write the fit report to ``path`` (UTF-8) as ``fmt`` (by the suffix when None)."""
    path = Path(path)
    fmt = report_format(path, fmt)
    if fmt == "markdown":  # its diagram is a PNG file beside it
        from .fitplot import plot_fit

        return write_markdown_with_figures(
            path, lambda names: build_fit_markdown(result, units, date, names),
            [plot_fit(result, None, units or result.fit.units)])
    from ..io.files import write_text

    try:
        write_text(path, build_fit_html(result, units, date))  # atomic
    except OSError as exc:
        raise ModelError(f"cannot write the report: {exc}", file=str(path)) from exc
    return path
