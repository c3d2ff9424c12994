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

__all__ = ["plot_study", "MOST"]

MOST = 12
_KIND_UNIT = {"force": "force", "displacement": "displacement", "stress": "stress"}


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
        ax.set_title(_text(f"{row['name']} ({row['case']})"), fontsize=8, color=INK, loc="left")
        ax.set_xlabel(f"[{unit}]", fontsize=7, color=INK)
        ax.set_yticks([])
        ax.tick_params(labelsize=7, colors=INK)
        for side in ("top", "right", "left"):
            ax.spines[side].set_visible(False)
    handles, labels = axes.flat[0].get_legend_handles_labels()
    fig.legend(handles, labels, loc="lower center", ncol=4, fontsize=7, frameon=False)
    fig.suptitle(_text(f"{study.title}: {study.samples} samples, seed {study.seed}, worst case "
                       f"by {study.worst_case_method}"), fontsize=9, color=INK, x=0.01,
                 ha="left")
    fig.subplots_adjust(left=0.04, right=0.98, top=1 - 0.45 / (2.5 * lines + 0.6) - 0.04,
                        bottom=0.55 / (2.5 * lines + 0.6) + 0.08, hspace=0.9, wspace=0.12)
    if path is not None:
        save_figure(fig, path, dpi)
    return fig

