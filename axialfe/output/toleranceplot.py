"""Histograms of a tolerance study: each output's Monte Carlo draws, its limits and worst case.

One panel per output and case (at most :data:`MOST` panels; the rest are in the
tables): the histogram of the draws, the 0.135 % and 99.865 % percentiles as
thin lines, the nominal value as a dashed line and the worst case as two
heavy lines at the edges.  Drawn with matplotlib's object interface on the
Agg canvas (no pyplot), in the palette of :mod:`axialfe.output.plot`.
"""

from __future__ import annotations

import math

import numpy as np

from ..units import OutputUnits
from .plot import DPI, INK, MUTED, TENSION, YIELD, _text, save_figure

__all__ = ["plot_study", "wrap", "MOST"]

MOST = 12
_KIND_UNIT = {"force": "force", "displacement": "displacement", "stress": "stress"}


_BREAK = ":- (/"   # a long name breaks after one of these, where it can


def wrap(text, width, renderer) -> int:
    """Break the matplotlib ``text`` into lines no wider than ``width`` pixels, after a
    colon, hyphen, space or bracket where it can (anywhere in a run without one);
    return the number of lines."""
    whole = text.get_text()
    if not whole or text.get_window_extent(renderer).width <= width:
        return 1

    def fits(part):
        text.set_text(part)
        return text.get_window_extent(renderer).width <= width

    lines, line = [], ""
    for ch in whole:
        if not line or fits(line + ch):
            line += ch
            continue
        cut = max(line.rfind(b) for b in _BREAK) + 1
        if cut <= 0:                 # no break point: break where it overflows
            lines.append(line)
            line = ch
        else:
            lines.append(line[:cut].rstrip())
            line = line[cut:] + ch
    lines.append(line)
    text.set_text("\n".join(lines))
    return len(lines)


def plot_study(study, path=None, units: OutputUnits | None = None, dpi: int = DPI):
    """Plot the histograms of a study's outputs; write ``path`` (.png or .svg) when given.

    Returns the matplotlib figure.
    """
    from matplotlib.figure import Figure

    units = units or study.units or OutputUnits()
    rows = [r for r in study.outputs if (r["case"], r["name"]) in study.draws][:MOST]
    n = max(1, len(rows))
    cols = 1 if n == 1 else 2
    lines = math.ceil(n / cols)
    fig = Figure(figsize=(4.6 * cols, 2.5 * lines + 0.6))
    axes = fig.subplots(lines, cols, squeeze=False)
    for ax in axes.flat[n:]:
        ax.set_visible(False)
    titles = []
    for ax, row in zip(axes.flat, rows):
        kind = _KIND_UNIT[row["kind"]]
        f = units.factor(kind)
        unit = getattr(units, kind)
        v = np.asarray(study.draws[(row["case"], row["name"])]) / f
        lo, hi = (np.array(row["worst_case"]) / f) if "worst_case" in row else (v.min(), v.max())
        span = max(hi - lo, np.ptp(v), 1e-300)
        edges = np.linspace(min(lo, v.min()) - 0.02 * span, max(hi, v.max()) + 0.02 * span, 61)
        if np.ptp(v) == 0:
            ax.axvline(v[0], color=TENSION, lw=3, label="every sample")
        else:
            ax.hist(v, bins=edges, color=TENSION, alpha=0.8, lw=0)
        p_lo, p_hi = (row["percentiles"]["0.135"] / f, row["percentiles"]["99.865"] / f)
        ax.axvline(p_lo, color=INK, lw=0.8, label="0.135 % and 99.865 %")
        ax.axvline(p_hi, color=INK, lw=0.8)
        ax.axvline(row["nominal"] / f, color=MUTED, lw=1, ls="--", label="nominal")
        if "worst_case" in row:
            ax.axvline(lo, color=YIELD, lw=1.8, label="worst case")
            ax.axvline(hi, color=YIELD, lw=1.8)
        titles.append((ax, ax.set_title(_text(f"{row['name']} ({row['case']})"), fontsize=8,
                                        color=INK, loc="left")))
        ax.set_xlabel(f"[{unit}]", fontsize=7, color=INK)
        ax.set_yticks([])
        ax.tick_params(labelsize=7, colors=INK)
        for side in ("top", "right", "left"):
            ax.spines[side].set_visible(False)
    handles, labels = axes.flat[0].get_legend_handles_labels()
    fig.legend(handles, labels, loc="lower center", ncol=4, fontsize=7, frameon=False)
    head = fig.suptitle(_text(f"{study.title}: {study.samples} samples, seed {study.seed}, worst case "
                       f"by {study.worst_case_method}"), fontsize=9, color=INK, x=0.01,
                 ha="left")
    height = 2.5 * lines + 0.6
    fig.subplots_adjust(left=0.04, right=0.98, top=1 - 0.45 / height - 0.04,
                        bottom=0.55 / height + 0.08, hspace=0.9, wspace=0.12)
    # long names (of outputs, cases, the title) wrap within their panel or the figure
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    renderer = FigureCanvasAgg(fig).get_renderer()
    most = max([wrap(t, ax.get_window_extent(renderer).width, renderer) for ax, t in titles]
               or [1])
    head = wrap(head, 0.97 * fig.bbox.width, renderer)
    if most > 1 or head > 1:
        extra = 0.16 * (head - 1)
        fig.set_figheight(height + extra + 0.16 * (most - 1) * lines)
        height = fig.get_figheight()
        fig.subplots_adjust(top=1 - (0.45 + extra) / height - 0.04,
                            bottom=0.55 / height + 0.08, hspace=0.9 + 0.25 * (most - 1))
    if path is not None:
        save_figure(fig, path, dpi)
    return fig

