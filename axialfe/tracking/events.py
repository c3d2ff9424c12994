"""Event sources of the tracker: where a measure reaches zero on an interval of fixed state.

Each source gives, on an interval where the gap state is fixed, a measure of
its items and where it first reaches zero ahead:

- gaps (:func:`affine_roots`): a closed gap's force or an open gap's opening,
  affine in the parameter, given as value and slope;
- yield (:func:`yield_excess`, :func:`yield_roots`): the peak of |sigma| along
  each segment less its yield strength, convex in the parameter (a largest
  magnitude of affine functions), bracketed and solved to rounding;
- buckling (:func:`buckle_excess`, :func:`buckle_roots`): the largest
  compression along each segment less its buckling capacity, convex in the
  parameter (a largest of affine functions), found the same way.

Later sources (breakpoints of temperature tables, a segment's plastic limit)
add a function here.
"""

from __future__ import annotations

import numpy as np

__all__ = ["GAP_EVENTS", "affine_roots", "yield_excess", "yield_roots", "buckle_excess",
           "buckle_roots", "convex_roots"]

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


def buckle_excess(f0, f1, s, capacity):
    """max over each segment of its compression -N at parameter ``s``, less ``capacity``.

    As :func:`yield_excess`: convex in s (the largest of affine functions of s).
    """
    low = f0.interpolate(f1, s).force_range()[0]
    return -low - capacity


def yield_roots(f0, f1, s_from, s_to, yield_strength, watch):
    """The first parameter in (s_from, s_to] where each watched segment reaches yield.

    Where the stress peak moves along a segment as the parameter changes (a
    taper), the peak is not affine in the parameter, but it is convex: below
    yield at ``s_from`` and at or above it at ``s_to`` means one root between,
    found by bisection to rounding; below at both ends means none.  NaN where
    there is no root.
    """
    return convex_roots(yield_excess, f0, f1, s_from, s_to, yield_strength, watch)


def buckle_roots(f0, f1, s_from, s_to, capacity, watch):
    """The first parameter in (s_from, s_to] where each watched segment's compression
    reaches its buckling ``capacity`` (N; inf where it has none), as :func:`yield_roots`."""
    return convex_roots(buckle_excess, f0, f1, s_from, s_to, capacity, watch)


def convex_roots(excess, f0, f1, s_from, s_to, bound, watch):
    """Where ``excess(f0, f1, s, bound)``, convex in s, first reaches zero in (s_from, s_to].

    Below zero at ``s_from`` and at or above it at ``s_to`` brackets one root
    (a convex function below zero at one end crosses zero once before the
    other), which bisection finds to rounding; below zero at both ends means
    none on the interval (the convex excess reaches its largest there at an
    end).  NaN where there is no root.
    """
    out = np.full(len(bound), np.nan)
    rows = np.flatnonzero(watch & np.isfinite(bound))
    if not len(rows):
        return out
    f0, f1, fy = f0.take(rows), f1.take(rows), bound[rows]
    below = excess(f0, f1, s_from, fy) < 0
    above = excess(f0, f1, s_to, fy) >= 0
    pick = below & above
    rows, f0, f1, fy = rows[pick], f0.take(pick), f1.take(pick), fy[pick]
    lo, hi = np.full(len(rows), float(s_from)), np.full(len(rows), float(s_to))
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if np.all((mid == lo) | (mid == hi)):
            break
        up = excess(f0, f1, mid, fy) >= 0
        hi, lo = np.where(up, mid, hi), np.where(up, lo, mid)
    out[rows] = hi
    return out
