"""Output of sweeps: the terminal summary, JSON and CSV tables of a SweepResult."""

from __future__ import annotations

import csv
import io
import json

import numpy as np

from ..formatting import note_text
from .text import CAUTIONS, caution_lines, _footnotes, _g, _grid, _wrapped, terminal_width

__all__ = ["sweep_summary", "sweep_json", "sweep_csv"]


def _steps(result, progress):
    """Iterate over the step results, with a progress bar on stderr when asked."""
    if not progress:
        yield from result.results
        return
    import sys

    import typer

    with typer.progressbar(result.results, label="solving steps", file=sys.stderr) as bar:
        yield from bar


def _heading(result) -> str:
    """The parameter's column heading: with its unit, none for a plain number."""
    return result.parameter if result.unit == "1" else f"{result.parameter} [{result.unit}]"


def sweep_summary(result, units) -> str:
    """A compact terminal summary: range, events, extremes of gaps and segments."""
    m = result.model
    fF, fS = units.factor("force"), units.factor("stress")
    v = result.values
    unit = "" if result.unit == "1" else f" {result.unit}"
    width = terminal_width()

    def grid(headers, rows):
        return _grid(headers, rows, width=width)

    out = [f"axialfe sweep: {m.title}"]
    out += _wrapped(f"case '{result.case}', {result.parameter} from {_g(v[0])} to {_g(v[-1])}"
                    f"{unit}, {len(v)} steps; {note_text(result.replaced, units)}", width, "", "  ")
    out += ["units: " + ", ".join(f"{k} {u}" for k, u in units.as_dict().items()), ""]
    if result.events:
        out.append(" events (exact, not read off the grid; identical events at one value on one line)")
        out += grid(["name", "event", _heading(result)],
                     [[", ".join(names), event, _g(value, 9)]
                      for names, event, value in result.grouped_events()])
    else:
        out.append(" no change of state along the range")
    out.append("")
    n = len(v)
    picks = sorted({0, n // 2, n - 1}) if n > 2 else list(range(n))
    rows_seg, rows_gap = [], []
    results = [result.results[i] for i in picks]
    for j, seg in enumerate(m.segments[:40]):
        rows_seg.append([seg.name] + [_g(r.stress[j][np.argmax(np.abs(r.stress[j]))] / fS)
                                      for r in results])
    for j, gap in enumerate(m.gaps[:40]):
        rows_gap.append([gap.name] + [f"{_g(r.gap_force[j] / fF)} ({'closed' if r.gap_closed[j] else 'open'})"
                                      for r in results])
    heads = [f"at {_g(v[i])}{unit}" for i in picks]
    out.append(f" largest stress of each segment [{units.stress}]")
    out += grid(["segment"] + heads, rows_seg)
    if len(m.segments) > 40:
        out.append(f"  ... and {len(m.segments) - 40} more segments (see --format csv or json)")
    if rows_gap:
        out += ["", f" gap forces [{units.force}] (+ in tension)"]
        out += grid(["gap"] + heads, rows_gap)
    out += _footnotes([note_text(n, units) for n in result.notes], width)
    out += ["", "all steps: use --format csv or --format json with --output FILE"]
    out += caution_lines(width=width)
    return "\n".join(out) + "\n"


def sweep_json(result, units, progress=False) -> str:
    """The JSON form: the keys of :meth:`SweepResult.to_dict` and the cautions."""
    d = result.to_dict(units, steps=_steps(result, progress))
    d["cautions"] = list(CAUTIONS)
    return json.dumps(d) + "\n"


def sweep_csv(result, units, progress=False) -> str:
    """One row per step: the value, then displacements, segment forces and stresses, gaps."""
    m = result.model
    fF, fD, fS = units.factor("force"), units.factor("displacement"), units.factor("stress")
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    head = [_heading(result)]
    head += [f"u {st.name} [{units.displacement}]" for st in m.stations]
    for seg in m.segments:
        head += [f"N {seg.name} from [{units.force}]", f"N {seg.name} to [{units.force}]",
                 f"stress {seg.name} from [{units.stress}]", f"stress {seg.name} to [{units.stress}]"]
    for gap in m.gaps:
        head += [f"gap {gap.name} state", f"gap {gap.name} force [{units.force}]",
                 f"gap {gap.name} opening [{units.displacement}]"]
    head += ["equilibrium_residual"]
    w.writerow(head)
    for value, r in zip(result.values, _steps(result, progress)):
        row = [repr(float(value))] + [repr(x) for x in (r.u / fD).tolist()]
        seg = np.column_stack([r.axial_force / fF, r.stress / fS]).ravel().tolist()
        row += [repr(x) for x in seg]
        for j in range(len(m.gaps)):
            row += ["closed" if r.gap_closed[j] else "open", repr(float(r.gap_force[j] / fF)),
                    repr(float(r.gap_opening[j] / fD))]
        row.append(repr(r.equilibrium_residual))
        w.writerow(row)
    w.writerow([])
    w.writerow(["# events"])
    for e in result.events:
        w.writerow(["# " + e.name, e.event, repr(e.value)])
    return buf.getvalue()
