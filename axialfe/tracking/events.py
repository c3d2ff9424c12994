"""Event sources of the tracker: where a measure reaches zero on an interval of fixed state.

Each source gives, on an interval where the gap state is fixed, a measure of
its items and where it first reaches zero ahead:

- gaps (:func:`affine_roots`): a closed gap's force or an open gap's opening,
  affine in the parameter, given as value and slope;
- yield (:func:`yield_excess`, :func:`yield_roots`): the peak of |sigma| along
  each segment less its yield strength, convex in the parameter (a largest
  magnitude of affine functions), bracketed and solved to rounding.

Later sources (breakpoints of temperature tables, a segment's plastic limit)
add a function here.
"""

from __future__ import annotations

import numpy as np

__all__ = ["GAP_EVENTS", "affine_roots", "yield_excess", "yield_roots"]

# the event of a gap of each kind (contact, slack link) closing (True) or opening (False)
GAP_EVENTS = {("contact", True): "closes", ("contact", False): "opens",
              ("slack", True): "taut", ("slack", False): "slack"}


def affine_roots(value, slope, s, direction, margin):
    """Roots ``-value/slope`` of affine measures, and which lie ahead of ``s`` by ``margin``.

    ``direction`` is +1 or -1 (the way the parameter moves).  A measure with no
    slope has no root (inf).
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        root = np.where(slope != 0, -value / slope, np.inf)
    return root, (root - s) * direction > margin


def yield_excess(f0, f1, s, yield_strength):
    """max over each segment of |sigma| at parameter ``s``, less the yield strength.

    ``f0`` and ``f1`` are the fields at s = 0 and 1 of a state affine in s; ``s``
    is one value or one per segment.  The result is convex in s (a largest
    magnitude of affine functions), which :func:`yield_roots` relies on.
    """
    peak, _ = f0.interpolate(f1, s).stress_peak()
    return np.abs(peak) - yield_strength


def yield_roots(f0, f1, s_from, s_to, yield_strength, watch):
    """The first parameter in (s_from, s_to] where each watched segment reaches yield.

    Where the stress peak moves along a segment as the parameter changes (a
    taper), the peak is not affine in the parameter, but it is convex: below
    yield at ``s_from`` and at or above it at ``s_to`` means one root between,
    found by bisection to rounding; below at both ends means none.  NaN where
    there is no root.
    """
    out = np.full(len(yield_strength), np.nan)
    fy = yield_strength
    rows = np.flatnonzero(watch & np.isfinite(fy))
    if not len(rows):
        return out
    f0, f1, fy = f0.take(rows), f1.take(rows), fy[rows]
    below = yield_excess(f0, f1, s_from, fy) < 0
    above = yield_excess(f0, f1, s_to, fy) >= 0
    pick = below & above
    rows, f0, f1, fy = rows[pick], f0.take(pick), f1.take(pick), fy[pick]
    lo, hi = np.full(len(rows), float(s_from)), np.full(len(rows), float(s_to))
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if np.all((mid == lo) | (mid == hi)):
            break
        up = yield_excess(f0, f1, mid, fy) >= 0
        hi, lo = np.where(up, mid, hi), np.where(up, lo, mid)
    out[rows] = hi
    return out
