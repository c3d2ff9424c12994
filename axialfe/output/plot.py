"""Diagrams: axial force, stress and displacement along x, a sketch of the bar, sweeps.

The curves come from :func:`diagram_data` (plain arrays, in display units) and
are drawn with matplotlib's object interface (no pyplot, no global state) on
the Agg canvas, so plotting works without a display.  The file's suffix picks
the format: ``.png`` (raster, 150 dpi or more) or ``.svg`` (vector).

Layout: a sketch strip of the bar on top (segments as blocks whose height
follows their area, supports, gaps and the loads of the case), then the chosen
diagrams stacked over a shared x axis.  Segments that overlap along x
(parallel parts such as a bolt inside a sleeve) go to separate *lanes*; each
lane is one labelled line, series segments continue one another, and a jump of
the value at a station shows as a vertical step.  Tension is shaded above the
axis, compression below, in two colours of their own.  The stress diagram
carries each segment's yield strength as a line over its length, and marks the
segments whose stress goes beyond it.  The sketch writes each gap's state and
force, and draws each load on the part it acts on.

No label overlaps another label or a curve: every value label is placed by
:func:`declutter` at the first of a few positions around its point where its
box, measured by the renderer, is clear of the labels already placed and of
the diagram's curves, and is left out where none is (the tables have every
value).  Text in an SVG stays text (``svg.fonttype = "none"``), so a diagram can
be edited.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import ModelError
from ..formatting import number
from ..results import CaseResult
from ..units import OutputUnits

__all__ = ["WHAT", "FIGURE_SUFFIXES", "Curve", "lanes", "diagram_data", "plot_case",
           "plot_sweep", "save_figure", "declutter", "Diagram"]

WHAT = ("force", "stress", "displacement", "all")
FIGURE_SUFFIXES = (".png", ".svg")
DPI = 150

# The project's own restrained palette: ink, slate-teal tension, ochre compression.
INK = "#27303a"
MUTED = "#8a939c"
TENSION = "#3b7f86"
COMPRESSION = "#b7842f"
LANE_COLOURS = ("#27303a", "#6a4f8c", "#3d7a4e", "#9a4a3f", "#4a6a9a", "#7a6a2a")
LANE_STYLES = ("-", "--", "-.", ":", (0, (5, 1, 1, 1)), (0, (1, 1)))
BLOCK_FACE = "#dfe3e6"
SUPPORT_COLOUR = "#4d565e"
YIELD = "#a2342a"          # the yield strength, and the segments beyond it

_QUANTITY = {"force": ("axial force", "force"), "stress": ("stress", "stress"),
             "displacement": ("displacement", "displacement")}
_LABEL_LIMIT = 30      # beyond this many segments only the extremes are labelled
_SAMPLES = 81          # points along a segment whose curve is not a straight line


@dataclass(frozen=True)
class Curve:
    """The curve of one segment: ``x`` (length unit) and ``y`` (display unit), x increasing."""

    segment: str
    index: int
    lane: int
    x: np.ndarray
    y: np.ndarray


def _text(value) -> str:
    """Model text made safe for matplotlib (no math mode from a '$' in a name)."""
    return str(value).replace("$", r"\$")


def lanes(model) -> np.ndarray:
    """Assign each segment a lane so that segments of one lane do not overlap along x.

    Series segments share lane 0; a segment parallel to another goes to the
    next free lane (greedy interval colouring in order of position).

    Returns
    -------
    ndarray of int, shape (n_segments,)
    """
    xs = np.array([st.x for st in model.stations])
    idx = model._station_index
    a = np.array([xs[idx[s.start]] for s in model.segments])
    b = np.array([xs[idx[s.end]] for s in model.segments])
    lo, hi = np.minimum(a, b), np.maximum(a, b)
    tol = 1e-12 * max(float(np.ptp(xs)), 1e-300)
    order = np.lexsort((hi, lo))
    lane = np.zeros(len(model.segments), dtype=int)
    ends: list[float] = []
    for i in order:
        for k, end in enumerate(ends):
            if end <= lo[i] + tol:
                lane[i], ends[k] = k, hi[i]
                break
        else:
            lane[i] = len(ends)
            ends.append(hi[i])
    return lane


def _overlapping(model, lane) -> np.ndarray:
    """True for segments that share some length of x with a segment of another lane."""
    xs = np.array([st.x for st in model.stations])
    idx = model._station_index
    a = np.array([xs[idx[s.start]] for s in model.segments])
    b = np.array([xs[idx[s.end]] for s in model.segments])
    lo, hi = np.minimum(a, b), np.maximum(a, b)
    out = np.zeros(len(lo), dtype=bool)
    if lane.max(initial=0) == 0:
        return out
    order = np.argsort(lo)
    active: list[int] = []
    for i in order:
        active = [j for j in active if hi[j] > lo[i]]
        for j in active:
            if min(hi[i], hi[j]) > max(lo[i], lo[j]):
                out[i] = out[j] = True
        active.append(i)
    return out


def diagram_data(result: CaseResult, what: str, units: OutputUnits | None = None) -> list[Curve]:
    """The curve of each segment for diagram ``what`` in display units.

    The curves are the fields inside each segment (:mod:`axialfe.mechanics.fields`):
    the axial force (linear, or cubic for self-weight on a taper), the stress
    N/A (sampled where either varies) and the displacement, the station
    displacements joined by the integral of the strain.  Where a segment's
    stress peaks inside it, the peak is one of the points.  The end values
    equal the results exactly.

    Parameters
    ----------
    result : CaseResult
    what : {'force', 'stress', 'displacement'}
    units : OutputUnits, optional
        Default: the model's.

    Returns
    -------
    list of Curve, one per segment in model order
    """
    if what not in _QUANTITY:
        raise ModelError(f"unknown diagram '{what}'", options=WHAT[:3])
    model = result.model
    units = units or model.units
    fx = units.factor("length")
    fy = units.factor(_QUANTITY[what][1])
    idx = model._station_index
    lane = lanes(model)
    fields = result.fields
    f, a = fields.force, fields.area
    curved_force = (f[:, 2] != 0) | (f[:, 3] != 0)
    curved = curved_force | (a[:, 1] != 0) | (a[:, 2] != 0)
    grid = np.linspace(0.0, 1.0, _SAMPLES)
    peak_t = fields.stress_peak()[1]
    curves = []
    for i, seg in enumerate(model.segments):
        ia, ib = idx[seg.start], idx[seg.end]
        xa, xb = model.stations[ia].x, model.stations[ib].x
        # a straight line unless the quantity varies otherwise (a linear N gives a
        # parabola of displacement)
        bent = {"force": curved_force[i], "stress": curved[i],
                "displacement": curved[i] or f[i, 1] != 0}[what]
        s = np.union1d(grid, [peak_t[i]]) if bent else np.array([0.0, 1.0])
        one = fields.take(slice(i, i + 1))
        if what == "force":
            y = one.axial_force(s)[0] if bent else result.axial_force[i]
        elif what == "stress":
            y = one.stress(s)[0] if bent else result.stress[i]
        else:
            ua, ub = result.u[ia], result.u[ib]
            if bent:
                e = one.elastic_elongation(s)[0]
                ee = float(result.elastic_elongation[i])
                e += (ee - e[-1]) * s            # the integral hits the exact elastic part
                direction = 1.0 if xb > xa else -1.0
                y = ua + (ub - ua) * s + direction * (e - ee * s)
                y[0], y[-1] = ua, ub
            else:
                y = np.array([ua, ub])
        y = np.array(y, dtype=float)
        if what != "displacement":
            y[0], y[-1] = (result.axial_force if what == "force" else result.stress)[i]
        x = xa + (xb - xa) * s
        if xb < xa:
            x, y = x[::-1], y[::-1]
        curves.append(Curve(seg.name, i, int(lane[i]), x / fx, y / fy))
    return curves


def _lane_polylines(curves):
    """Join the curves of each lane into one polyline (NaN where the lane has a hole)."""
    by_lane: dict[int, list[Curve]] = {}
    for c in curves:
        by_lane.setdefault(c.lane, []).append(c)
    out = {}
    for k, items in sorted(by_lane.items()):
        items.sort(key=lambda c: (c.x[0], c.x[-1]))
        xs, ys = [], []
        for j, c in enumerate(items):
            if j and not math.isclose(items[j - 1].x[-1], c.x[0], rel_tol=1e-12, abs_tol=1e-12):
                xs.append([np.nan])
                ys.append([np.nan])
            xs.append(c.x)
            ys.append(c.y)
        out[k] = (np.concatenate(xs), np.concatenate(ys), items)
    return out


def _with_crossings(x, y):
    """The polyline with its zero crossings inserted, so that clipping at 0 is exact."""
    with np.errstate(invalid="ignore"):
        flip = (y[:-1] * y[1:] < 0) & (x[1:] != x[:-1])
    k = np.flatnonzero(flip)
    if not len(k):
        return x, y
    t = y[k] / (y[k] - y[k + 1])
    xz = x[k] + t * (x[k + 1] - x[k])
    return np.insert(x, k + 1, xz), np.insert(y, k + 1, 0.0)


def _style_axes(ax):
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    for side in ("left", "bottom"):
        ax.spines[side].set_color(MUTED)
    ax.tick_params(colors=INK, labelsize=8, length=3)
    ax.grid(True, color="#e6e8ea", linewidth=0.6, linestyle=(0, (2, 2)))
    ax.set_axisbelow(True)


def _fmt(value):
    return number(value, plain=False)


def _lane_label(items, parallel):
    names = list(dict.fromkeys(c.segment for c in items))  # every segment of the lane, in order
    text = ", ".join(names[:3]) + (f" and {len(names) - 3} more" if len(names) > 3 else "")
    return _text(text)


def _rank(artist, rank: int):
    """Mark a label with its rank for :func:`declutter` (lower places first)."""
    artist._axialfe_rank = rank
    artist.set_in_layout(False)
    return artist


def _draw_diagram(ax, result, what, units, station_x):
    curves = diagram_data(result, what, units)
    model = result.model
    lane = np.array([c.lane for c in curves])
    parallel = _overlapping(model, lane)
    polys = _lane_polylines(curves)
    several = len(polys) > 1
    ax.axhline(0.0, color=MUTED, linewidth=0.8)
    if len(station_x) <= 400:
        ax.vlines(station_x, 0.0, 1.0, transform=ax.get_xaxis_transform(), colors="#d3d7db",
                  linewidth=0.6, zorder=0)
    label_all = len(curves) <= _LABEL_LIMIT
    seen: list[tuple[float, float]] = []      # values labelled already (coinciding lanes)
    for k, (x, y, items) in polys.items():
        colour = LANE_COLOURS[k % len(LANE_COLOURS)]
        style = LANE_STYLES[k % len(LANE_STYLES)]
        if what != "displacement":
            xc, yc = _with_crossings(x, y)
            alpha = 0.28 if not several else 0.18
            ax.fill_between(xc, np.maximum(yc, 0.0), 0.0, color=TENSION, alpha=alpha, linewidth=0)
            ax.fill_between(xc, np.minimum(yc, 0.0), 0.0, color=COMPRESSION, alpha=alpha,
                            linewidth=0)
        line, = ax.plot(x, y, color=colour, linestyle=style, linewidth=1.4,
                        label=_lane_label(items, parallel) if several else None)
        line.set_gid(f"{what}-lane-{k}")
        _label_values(ax, items, colour, label_all, seen)
        if several:
            for c in items:
                if parallel[c.index]:
                    m = len(c.x) // 2
                    _rank(ax.annotate(_text(c.segment), (0.5 * (c.x[0] + c.x[-1]), c.y[m]),
                                      xytext=(0, 6 + 9 * k), textcoords="offset points",
                                      ha="center", fontsize=7, color=colour, style="italic"), 1)
    if what == "stress":
        _draw_yield(ax, result, curves, units, label_all)
    name, key = _QUANTITY[what]
    sense = "" if what == "displacement" else ", tension +"
    ax.set_ylabel(f"{name} [{getattr(units, key)}]{sense}", fontsize=8, color=INK)
    if several or what == "stress" and ax.get_legend_handles_labels()[0]:
        ax.legend(fontsize=7, frameon=False, loc="upper left", bbox_to_anchor=(1.0, 1.0))
    ymin, ymax = ax.get_ylim()
    pad = 0.12 * max(ymax - ymin, 1e-300)
    ax.set_ylim(ymin - pad, ymax + pad)
    _style_axes(ax)
    return curves


def _draw_yield(ax, result, curves, units, label_all):
    """Each segment's yield strength as a line over its length (in tension above the axis,
    in compression below, where the segment's stress has that sign), and the segments
    whose stress goes beyond it marked."""
    fS = units.factor("stress")
    drawn = False
    for c in curves:
        mat = result.model.segments[c.index].material
        if mat.yield_strength is None:
            continue
        fy_t = mat.yield_strength / fS
        fy_c = (mat.compressive_yield_strength or mat.yield_strength) / fS
        for sign, fy in ((1.0, fy_t), (-1.0, fy_c)):
            if not np.any(sign * c.y > 0):
                continue
            line, = ax.plot([c.x[0], c.x[-1]], [sign * fy, sign * fy], color=YIELD,
                            linewidth=0.9, linestyle=(0, (6, 2, 1, 2)),
                            label=None if drawn else "yield strength")
            line.set_gid(f"yield-{c.index}-{'t' if sign > 0 else 'c'}")
            drawn = True
            beyond = sign * c.y > fy
            if np.any(beyond):
                over = np.where(beyond, c.y, np.nan)
                mark, = ax.plot(c.x, over, color=YIELD, linewidth=3.0, alpha=0.8,
                                solid_capstyle="butt")
                mark.set_gid(f"beyond-yield-{c.index}")
                j = int(np.nanargmax(np.abs(over)))
                _rank(ax.annotate(_text(f"{c.segment}: beyond yield"), (c.x[j], c.y[j]),
                                  xytext=(0, 8 if sign > 0 else -14), textcoords="offset points",
                                  ha="center", fontsize=7, color=YIELD, weight="bold"), 0)


def _label_values(ax, items, colour, label_all, seen):
    """Label the value at each station end of each curve (both sides where it jumps).

    A value already labelled at the same point (by a coinciding lane) is not repeated.
    The extremes rank before the other values, so that :func:`declutter` keeps them.
    """
    def fresh(point):
        for px, py in seen:
            if (math.isclose(px, point[0], rel_tol=1e-9, abs_tol=1e-12)
                    and math.isclose(py, point[1], rel_tol=1e-6, abs_tol=1e-12)):
                return False
        seen.append(point)
        return True

    ys = np.concatenate([c.y for c in items])
    xs = np.concatenate([c.x for c in items])
    extremes = {float(np.nanmax(ys)), float(np.nanmin(ys))}

    def label(point, dx, ha):
        rank = 2 if point[1] in extremes else 3
        _rank(ax.annotate(_fmt(point[1]), point, xytext=(dx, 4 if point[1] >= 0 else -10),
                          textcoords="offset points", ha=ha, fontsize=7, color=colour), rank)

    if not label_all:
        for j in {int(np.nanargmax(ys)), int(np.nanargmin(ys))}:
            label((xs[j], ys[j]), 0, "center")
        return
    prev = None
    for c in items:
        left, right = (c.x[0], c.y[0]), (c.x[-1], c.y[-1])
        joined = prev is not None and math.isclose(prev[0], left[0], rel_tol=1e-12, abs_tol=1e-12)
        same = joined and math.isclose(prev[1], left[1], rel_tol=1e-6, abs_tol=1e-12)
        if not same and fresh(left):
            label(left, 3, "left")
        if fresh(right):
            label(right, -3, "right")
        # a peak inside the segment (a taper) beyond both end values is labelled too
        inner = int(np.argmax(np.abs(c.y)))
        if 0 < inner < len(c.y) - 1 and abs(c.y[inner]) > max(abs(c.y[0]), abs(c.y[-1])) * (1 + 1e-9):
            peak = (c.x[inner], c.y[inner])
            if fresh(peak):
                label(peak, 0, "center")
        prev = right


# --- labels clear of one another and of the curves ----------------------------
_OFFSETS = ((0, 5), (0, -11), (5, 4), (-5, 4), (5, -10), (-5, -10), (0, 14), (0, -20),
            (9, 13), (-9, 13), (9, -19), (-9, -19), (0, 24), (0, -30))
# of a plain text: by (widths, heights), sideways and up or down
_SHIFTS = ((0, 0), (0, -1), (0, 1), (-0.55, 0), (0.55, 0), (-0.55, -1), (0.55, -1), (0, -2),
           (-0.55, 1), (0.55, 1), (0, 2), (-1.1, 0), (1.1, 0))


def _curve_segments(ax):
    """The line segments (display coordinates) of every curve of an axes: its Line2D
    artists, the zero line and the lines of the sketch included."""
    parts = []
    for line in ax.lines:
        if not line.get_visible():
            continue
        xy = line.get_transform().transform(np.asarray(line.get_xydata(), dtype=float))
        if len(xy) < 2:
            continue
        a, b = xy[:-1], xy[1:]
        ok = np.all(np.isfinite(a), axis=1) & np.all(np.isfinite(b), axis=1)
        parts.append(np.hstack([a[ok], b[ok]]))
    return np.vstack(parts) if parts else np.zeros((0, 4))


def _crosses(box, segs) -> bool:
    """Whether any segment (x0, y0, x1, y1 rows) meets the box (Liang-Barsky clipping)."""
    if not len(segs):
        return False
    x0, y0, x1, y1 = segs.T
    dx, dy = x1 - x0, y1 - y0
    t0, t1 = np.zeros(len(x0)), np.ones(len(x0))
    keep = np.ones(len(x0), dtype=bool)
    for p, q in ((-dx, x0 - box.x0), (dx, box.x1 - x0), (-dy, y0 - box.y0), (dy, box.y1 - y0)):
        flat = p == 0
        keep &= ~(flat & (q < 0))
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.where(flat, 0.0, q / np.where(flat, 1.0, p))
        t0 = np.where(~flat & (p < 0), np.maximum(t0, t), t0)
        t1 = np.where(~flat & (p > 0), np.minimum(t1, t), t1)
    return bool(np.any(keep & (t0 <= t1)))


def _moves(text):
    """Ways to place ``text``: offsets of an annotation, vertical shifts of a plain text."""
    from matplotlib.text import Annotation

    if isinstance(text, Annotation) and text.anncoords == "offset points":
        base = text.xyann

        def offset(dx, dy):
            def move():
                text.xyann = (dx, dy) if (dx, dy) != (0, 0) else base
                text.set_ha("center" if dx == 0 else "left" if dx > 0 else "right")
                text.set_va("bottom" if dy > 0 else "top" if dy < 0 else "center")
            return move

        first = [lambda: None]
        return first + [offset(dx, dy) for dx, dy in _OFFSETS]
    x, y = text.get_position()
    transform = text.get_transform()
    origin = transform.transform((x, y))

    def shift(kx, ky):
        def move():
            box = text.get_window_extent(text.figure.canvas.get_renderer())
            step = np.array([kx * box.width, ky * box.height * 1.15])
            text.set_position(transform.inverted().transform(origin + step))
        return move

    return [shift(kx, ky) for kx, ky in _SHIFTS]


def declutter(fig) -> int:
    """Place every label of ``fig`` clear of the other labels and of the curves.

    Labels are the non-empty texts of each axes, placed in order of their rank
    (see ``_rank``; unranked texts first, as they come): each at the first of its
    positions whose box, as the renderer measures it, stays inside the axes and
    meets no label placed before and no curve (:class:`~matplotlib.lines.Line2D`)
    of the axes.  A label with no such position is hidden.  The layout is frozen
    afterwards, so the boxes stay where they were measured.

    Returns
    -------
    int
        The number of labels hidden.
    """
    fig.draw_without_rendering()
    renderer = fig.canvas.get_renderer()
    hidden = 0
    for ax in fig.axes:
        segs = _curve_segments(ax)
        frame = ax.get_window_extent(renderer)
        placed = []
        texts = [t for t in ax.texts if t.get_visible() and t.get_text().strip()]
        texts.sort(key=lambda t: getattr(t, "_axialfe_rank", -1))
        for text in texts:
            for move in _moves(text):
                move()
                box = text.get_window_extent(renderer)
                if (box.x0 >= frame.x0 and box.x1 <= frame.x1 and box.y0 >= frame.y0
                        and box.y1 <= frame.y1 and not any(box.overlaps(b) for b in placed)
                        and not _crosses(box, segs)):
                    placed.append(box)
                    break
            else:
                text.set_visible(False)
                hidden += 1
    fig.set_layout_engine("none")
    return hidden


def _draw_sketch(ax, result, units):
    """The bar itself: blocks by area, supports, gaps and the loads of the case."""
    from matplotlib.collections import PolyCollection

    model = result.model
    fx = units.factor("length")
    xs = np.array([st.x for st in model.stations]) / fx
    idx = model._station_index
    lane = lanes(model)
    n_lanes = int(lane.max(initial=0)) + 1
    areas = np.array([max(s.area for s in seg.sections) for seg in model.segments])
    a_max = areas.max()
    span = float(np.ptp(xs)) or 1.0
    band = 1.0 / n_lanes
    few = len(model.segments) <= 20
    blocks, edges = [], []
    for i, seg in enumerate(model.segments):
        xa, xb = xs[idx[seg.start]], xs[idx[seg.end]]
        h0 = max(seg.section.area / a_max, 0.08) * 0.7 * band
        h1 = max((seg.end_section or seg.section).area / a_max, 0.08) * 0.7 * band
        centre = 0.5 - (lane[i] - (n_lanes - 1) / 2) * band
        blocks.append([(xa, centre - h0 / 2), (xb, centre - h1 / 2), (xb, centre + h1 / 2),
                       (xa, centre + h0 / 2)])
        edges.append(LANE_COLOURS[lane[i] % len(LANE_COLOURS)])
        if few:
            _rank(ax.text(0.5 * (xa + xb), centre, _text(seg.name), ha="center", va="center",
                          fontsize=7, color=INK, clip_on=True), 0)
    ax.add_collection(PolyCollection(blocks, closed=True, facecolors=BLOCK_FACE, edgecolors=edges,
                                     linewidths=0.9 if len(blocks) <= 400 else 0.0))
    lo, hi = xs.min(), xs.max()
    centres = 0.5 - (lane - (n_lanes - 1) / 2) * band
    for sup in model.supports:
        x = xs[idx[sup.at]]
        side = -1.0 if x <= lo + 0.5 * span else 1.0   # the wall stands outside the bar
        wall = x + side * (0.035 * span if sup.kind == "spring" else 0.0)
        # the wall spans only the lanes of the segments it holds, so a support of one
        # part is not drawn across a parallel part that passes the same x
        held = [c for c, seg in zip(centres, model.segments) if sup.at in (seg.start, seg.end)]
        y_lo, y_hi = ((min(held) - 0.4 * band, max(held) + 0.4 * band) if held else (0.1, 0.9))
        ax.plot([wall, wall], [y_lo, y_hi], color=SUPPORT_COLOUR, linewidth=2.0)
        n_hatch = max(3, int(round(7 * (y_hi - y_lo) / 0.8)))
        for y in np.linspace(y_lo + 0.02, y_hi - 0.08, n_hatch):
            ax.plot([wall, wall + side * 0.012 * span], [y, y + 0.06], color=SUPPORT_COLOUR,
                    linewidth=0.8)
        if sup.kind == "spring":
            zx = np.linspace(x, wall, 11)
            zy = 0.5 * (y_lo + y_hi) + 0.06 * np.array([0, 1, -1, 1, -1, 1, -1, 1, -1, 1, 0])
            ax.plot(zx, zy, color=SUPPORT_COLOUR, linewidth=0.9)
        if sup.kind == "settlement":
            ax.annotate("", (wall + side * 0.03 * span, 0.95), (wall, 0.95),
                        arrowprops={"arrowstyle": "->", "color": SUPPORT_COLOUR, "lw": 0.8})
    fF, fD = units.factor("force"), units.factor("displacement")
    for j, gap in enumerate(model.gaps):
        x = xs[idx[gap.stations[0]]]
        if len(gap.stations) == 2:
            xo = xs[idx[gap.stations[1]]]
            ax.plot([x, x], [0.02, 0.98], color=INK, linewidth=0.8, linestyle=(0, (1, 1.5)))
            ax.plot([xo, xo], [0.02, 0.98], color=INK, linewidth=0.8, linestyle=(0, (1, 1.5)))
        else:
            off = (0.02 if gap.side == "+x" else -0.02) * span
            ax.plot([x + off, x + off], [0.15, 0.85], color=INK, linewidth=2.4)
        state = (f"closed, {_fmt(result.gap_force[j] / fF)} {units.force}"
                 if result.gap_closed[j] else
                 f"open {_fmt(result.gap_opening[j] / fD)} {units.displacement}")
        _rank(ax.text(x, 1.02, _text(f"{gap.name} ({gap.kind}): {state}"), ha="center",
                      va="bottom", fontsize=6.5, color=INK), 1)
    for j, force in enumerate(result.applied):
        if force == 0:
            continue
        x = xs[j]
        # on the part it acts on: the lane of a segment that ends at the station
        on = [c for c, seg in zip(centres, model.segments)
              if model.stations[j].name in (seg.start, seg.end)]
        y = on[0] if on else 0.5
        d = 0.06 * span * (1.0 if force > 0 else -1.0)
        ax.annotate("", (x + d, y), (x, y),
                    arrowprops={"arrowstyle": "-|>", "color": INK, "lw": 1.4,
                                "mutation_scale": 9})
        _rank(ax.annotate(f"{_fmt(force / fF)} {units.force}", (x + d, y), xytext=(0, 6),
                          textcoords="offset points", ha="center", va="bottom", fontsize=7,
                          color=INK), 1)
    if len(model.stations) <= _LABEL_LIMIT:
        at: dict[float, list[str]] = {}
        for st, x in zip(model.stations, xs):
            at.setdefault(float(x), []).append(st.name)
        for x, names in at.items():
            _rank(ax.text(x, -0.04, _text(", ".join(names)), ha="center", va="top",
                          fontsize=6.5, color=MUTED), 2)
    # room above the bar for a row of gap labels per gap beyond the first (up to three rows)
    ax.set_ylim(-0.2, 1.15 + 0.14 * min(max(len(model.gaps) - 1, 0), 2))
    ax.set_xlim(lo - 0.08 * span, hi + 0.08 * span)
    ax.set_yticks([])
    for side in ("top", "right", "left", "bottom"):
        ax.spines[side].set_visible(False)
    ax.tick_params(labelbottom=False, length=0)


def plot_case(result: CaseResult, what: str = "all", path=None, units: OutputUnits | None = None,
              dpi: int = DPI):
    """Draw the diagrams of one case, and write them to ``path`` when given.

    Parameters
    ----------
    result : CaseResult
    what : {'force', 'stress', 'displacement', 'all'}
    path : str or Path, optional
        A ``.png`` or ``.svg`` file.
    units : OutputUnits, optional
    dpi : int
        Resolution of a PNG (at least 150).

    Returns
    -------
    matplotlib.figure.Figure
        12 x 10 in for ``all`` (1800 x 1500 px at 150 dpi), 10 x 6.5 in otherwise.
    """
    from matplotlib.figure import Figure

    if what not in WHAT:
        raise ModelError(f"unknown diagram '{what}'", options=WHAT)
    if path is not None:
        _suffix(path)
    model = result.model
    units = units or model.units
    kinds = list(_QUANTITY) if what == "all" else [what]
    size = (12.0, 10.0) if what == "all" else (10.0, 6.5)
    fig = Figure(figsize=size, dpi=dpi, layout="constrained")
    ratios = [0.9] + [2.0] * len(kinds)
    axes = fig.subplots(len(kinds) + 1, 1, sharex=True, height_ratios=ratios)
    _draw_sketch(axes[0], result, units)
    station_x = [st.x / units.factor("length") for st in model.stations]
    for ax, kind in zip(axes[1:], kinds):
        _draw_diagram(ax, result, kind, units, station_x)
    axes[-1].set_xlabel(f"x [{units.length}]", fontsize=8, color=INK)
    axes[-1].tick_params(labelbottom=True)
    title = {"all": "axial force, stress and displacement", "force": "axial force",
             "stress": "stress", "displacement": "displacement"}[what]
    fig.suptitle(_text(f"{model.title}: {title}, case '{result.name}'"), fontsize=10, color=INK,
                 x=0.01, ha="left")
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    FigureCanvasAgg(fig)
    declutter(fig)
    if path is not None:
        save_figure(fig, path, dpi)
    return fig


class Diagram:
    """The diagrams of one case, for a notebook: Jupyter shows it inline as PNG.

    Parameters
    ----------
    result : CaseResult
    what : {'force', 'stress', 'displacement', 'all'}
    units : OutputUnits, optional

    Attributes
    ----------
    figure : matplotlib.figure.Figure
        The figure :func:`plot_case` draws (no pyplot, no global state).

    Examples
    --------
    In a notebook, ``Diagram(solution["base"])`` as the last line of a cell draws
    it; ``Diagram(case, "stress").save("stress.svg")`` writes it.
    """

    def __init__(self, result: CaseResult, what: str = "all", units: OutputUnits | None = None):
        self.figure = plot_case(result, what, None, units)

    def _repr_png_(self) -> bytes:
        import io

        buf = io.BytesIO()
        self.figure.savefig(buf, format="png", dpi=100)
        return buf.getvalue()

    def save(self, path, dpi: int = DPI):
        """Write the diagram as PNG or SVG by the suffix of ``path``."""
        save_figure(self.figure, path, dpi)

    def __repr__(self) -> str:
        return f"<Diagram: {self.figure._suptitle.get_text()}>"


def _suffix(path) -> str:
    suffix = Path(path).suffix.lower()
    if suffix not in FIGURE_SUFFIXES:
        raise ModelError(f"cannot write a figure as '{suffix or Path(path).name}'",
                         file=str(path), options=FIGURE_SUFFIXES)
    return suffix


def save_figure(fig, path, dpi: int = DPI):
    """Write ``fig`` as PNG or SVG by the suffix of ``path``."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    suffix = _suffix(path)
    FigureCanvasAgg(fig)
    fmt = suffix[1:]
    meta = {"Date": None} if fmt == "svg" else {}
    from ..io.files import atomic_path

    import matplotlib

    try:
        with atomic_path(path) as tmp, matplotlib.rc_context({"svg.fonttype": "none"}):
            # a failing write leaves no partial figure; SVG text stays text, to be edited
            fig.savefig(tmp, format=fmt, dpi=max(dpi, DPI), metadata=meta)
    except OSError as exc:
        raise ModelError(f"cannot write the figure: {exc}", file=str(path)) from exc


def plot_sweep(sweep, path=None, units: OutputUnits | None = None, dpi: int = DPI):
    """Plot each gap's force and each segment's stress against the swept parameter.

    Parameters
    ----------
    sweep : SweepResult
        With ``parameter``, ``unit``, ``values`` (in the sweep unit), ``results``
        (one CaseResult per value) and ``events`` (``name``, ``event``, ``value``).
    path : str or Path, optional
        A ``.png`` or ``.svg`` file.
    units : OutputUnits, optional

    Returns
    -------
    matplotlib.figure.Figure
        The stress of a segment is the one at its end of larger magnitude.
    """
    from matplotlib.figure import Figure

    if path is not None:
        _suffix(path)
    results = tuple(sweep.results)
    if not results:
        raise ModelError("the sweep has no results to plot")
    model = results[0].model
    units = units or model.units
    values = np.asarray(sweep.values, dtype=float)
    if getattr(sweep, "exact", None) is not None and sweep.events:
        # the response is linear between events: drawing the events' own points puts
        # every kink exactly where it is, not at the nearest grid values
        extra = sorted({float(e.value) for e in sweep.events} - set(values.tolist()))
        merged = np.concatenate([values, extra])
        order = np.argsort(merged * (1.0 if values[-1] >= values[0] else -1.0), kind="stable")
        results = tuple((results + tuple(sweep.result_at(v) for v in extra))[i] for i in order)
        values = merged[order]
    n_gaps = len(model.gaps)
    rows = 2 if n_gaps else 1
    fig = Figure(figsize=(10.0, 3.6 * rows + 0.8), dpi=dpi, layout="constrained")
    axes = np.atleast_1d(fig.subplots(rows, 1, sharex=True))
    fF, fS = units.factor("force"), units.factor("stress")
    legend_ok = len(model.segments) <= 12
    if n_gaps:
        gap_force = np.array([r.gap_force for r in results]) / fF
        for j, gap in enumerate(model.gaps):
            k = j % len(LANE_COLOURS)
            line, = axes[0].plot(values, gap_force[:, j], color=LANE_COLOURS[k],
                                 linestyle=LANE_STYLES[k], linewidth=1.3,
                                 label=_text(gap.name) if n_gaps <= 12 else None)
            line.set_gid(f"sweep-gap-{j}")
        axes[0].set_ylabel(f"gap force [{units.force}]", fontsize=8, color=INK)
        if n_gaps <= 12:
            axes[0].legend(fontsize=7, frameon=False)
    stress = np.array([r.stress for r in results])          # (steps, segments, 2)
    pick = np.argmax(np.abs(stress), axis=2)
    signed = np.take_along_axis(stress, pick[..., None], axis=2)[..., 0] / fS
    ax = axes[-1]
    for i, seg in enumerate(model.segments):
        k = i % len(LANE_COLOURS)
        line, = ax.plot(values, signed[:, i], color=LANE_COLOURS[k], linestyle=LANE_STYLES[k],
                        linewidth=1.2, label=_text(seg.name) if legend_ok else None)
        line.set_gid(f"sweep-segment-{i}")
    ax.set_ylabel(f"stress [{units.stress}]", fontsize=8, color=INK)
    if legend_ok:
        ax.legend(fontsize=7, frameon=False)
    events = tuple(sweep.events)
    for a in axes:
        a.axhline(0.0, color=MUTED, linewidth=0.8)
        for n, ev in enumerate(events):
            line = a.axvline(ev.value, color=COMPRESSION, linewidth=0.9, linestyle=(0, (3, 2)))
            line.set_gid(f"sweep-event-{n}")
        _style_axes(a)
    for n, ev in enumerate(events[:16]):
        axes[0].annotate(_text(f"{ev.name} {ev.event} at {ev.value:.4g} {sweep.unit}"),
                         (ev.value, 1.0), xycoords=("data", "axes fraction"), rotation=90,
                         ha="right", va="top", fontsize=6.5, color=COMPRESSION,
                         xytext=(-2, -2), textcoords="offset points")
    ax.set_xlabel(_text(f"{sweep.parameter.replace('_', ' ')} [{sweep.unit}]"), fontsize=8,
                  color=INK)
    fig.suptitle(_text(f"{model.title}: sweep of {sweep.parameter.replace('_', ' ')}"),
                 fontsize=10, color=INK, x=0.01, ha="left")
    if path is not None:
        save_figure(fig, path, dpi)
    return fig
