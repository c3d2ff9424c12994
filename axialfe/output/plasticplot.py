"""The plot of an elastic-plastic path: forces of the plastic segments and gaps along it, events marked."""

from __future__ import annotations

import numpy as np

from .plot import (COMPRESSION, DPI, INK, LANE_COLOURS, LANE_STYLES, MUTED, _style_axes, _suffix,
                   _text, save_figure)

__all__ = ["plot_path"]


def plot_path(result, path=None, units=None, dpi: int = DPI):
    """Draw each plastic segment's force (and each gap's) against the path.

    When every leg changes the same parameter the abscissa is that parameter
    (a thermal cycle draws its loop); otherwise it is the position along the
    path, leg by leg.  The response is linear between the points drawn (the
    start, every event and every leg end), so the lines are exact.

    Returns
    -------
    matplotlib.figure.Figure
    """
    from matplotlib.figure import Figure

    if path is not None:
        _suffix(path)
    model = result.model
    units = units or model.units
    fF = units.factor("force")
    legs = {g.index: g for g in result.legs}
    one = len({g.parameter for g in result.legs}) == 1
    first = result.legs[0]

    def abscissa(leg, value):
        if leg == 0:
            return first.start if one else 0.0
        g = legs[leg]
        if one:
            return value
        span = g.stop - g.start
        return leg - 1 + ((value - g.start) / span if span else 1.0)

    xs = np.array([abscissa(h[0], h[1]) for h in result.history])
    forces = np.array([h[2] for h in result.history]) / fF
    gap_forces = np.array([h[3] for h in result.history]) / fF
    fig = Figure(figsize=(10.0, 4.4), dpi=dpi, layout="constrained")
    ax = fig.subplots()
    shown = [i for i in range(len(model.segments)) if np.all(np.isfinite(forces[:, i]))]
    for n, i in enumerate(shown[:12]):
        k = n % len(LANE_COLOURS)
        line, = ax.plot(xs, forces[:, i], color=LANE_COLOURS[k], linestyle=LANE_STYLES[k],
                        linewidth=1.3, label=_text(model.segments[i].name))
        line.set_gid(f"path-segment-{i}")
    for j, gap in enumerate(model.gaps[:6]):
        line, = ax.plot(xs, gap_forces[:, j], color=MUTED, linestyle=(0, (1, 1.5)),
                        linewidth=1.3, label=_text(f"{gap.kind} '{gap.name}'"))
        line.set_gid(f"path-gap-{j}")
    ax.axhline(0.0, color=MUTED, linewidth=0.8)
    marks = [(abscissa(e.leg, e.value), e) for e in result.events]
    for n, (x, ev) in enumerate(marks):
        line = ax.axvline(x, color=COMPRESSION, linewidth=0.8, linestyle=(0, (3, 2)))
        line.set_gid(f"path-event-{n}")
    for x, text in _labels(marks, legs, xs)[:12]:
        ax.annotate(_text(text), (x, 1.0), xycoords=("data", "axes fraction"), rotation=90,
                    ha="right", va="top", fontsize=6.5, color=COMPRESSION, xytext=(-2, -2),
                    textcoords="offset points")
    if shown or len(model.gaps):
        ax.legend(fontsize=7, frameon=False)
    ax.set_ylabel(f"axial force [{units.force}]", fontsize=8, color=INK)
    if one:
        unit = "" if first.unit == "1" else f" [{first.unit}]"
        ax.set_xlabel(_text(f"{first.parameter}{unit}"), fontsize=8, color=INK)
    else:
        ax.set_xlabel("position along the path (leg k runs from k-1 to k)", fontsize=8,
                      color=INK)
    _style_axes(ax)
    fig.suptitle(_text(f"{model.title}: elastic-plastic path of case '{result.case}'"),
                 fontsize=10, color=INK, x=0.01, ha="left")
    if path is not None:
        save_figure(fig, path, dpi)
    return fig


def _labels(marks, legs, xs):
    """One label per place on the abscissa: the events there, grouped by leg and kind."""
    span = float(np.ptp(xs)) if len(xs) else 0.0
    places = []                       # [x, {(leg, event, value): [names]}]
    for x, ev in marks:
        place = next((pl for pl in places if abs(x - pl[0]) <= 1e-9 * max(span, 1e-300)), None)
        if place is None:
            place = [x, {}]
            places.append(place)
        place[1].setdefault((ev.leg, ev.event, ev.value), []).append(ev.name)
    out = []
    for x, groups in places:
        parts = []
        for (leg, event, value), names in groups.items():
            unit = "" if legs[leg].unit == "1" else f" {legs[leg].unit}"
            parts.append(f"leg {leg}: {', '.join(names)} {event} at {value:.4g}{unit}")
        out.append((x, "; ".join(parts)))
    return out
