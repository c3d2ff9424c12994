"""Contact on the full banded system: a primal-dual active-set iteration over gaps to ground.

Where every gap holds one free station against ground, a closed gap is a
prescribed displacement of its station (``u[a] = clearance / sign``), so each
iteration of the primal-dual active-set (semismooth Newton) method is one
banded factorisation of the stiffness with the closed gaps' stations
prescribed: positive definite, of the band's own width, and O(n w^2) however
many gaps there are.  The iteration is block principal pivoting on the full
system, without ever forming the dense gaps x gaps matrix of
:mod:`axialfe.engine.contact`:

    closed gap:  force = s * (b - K u)[a] / s^2,  must be >= 0
    open gap:    opening = clearance - s * u[a],  must be >= 0

Gaps that break their condition change state; only their rows and columns of
the band are rewritten.  The iteration returns a status, like
:mod:`axialfe.engine.pivoting`: ``'solved'`` once every gap meets its
condition to the same tolerances as the exact search, or ``'cycled'`` when a
closed set comes back (or the iteration limit is reached), and then the caller
falls back to the exact LCP.
"""

from __future__ import annotations

import numpy as np

from .factor import Band, BandedCholesky
from .pivoting import SOLVED

__all__ = ["CYCLED", "ground_gaps", "active_set", "linked_gaps", "active_set_linked"]

CYCLED = "cycled"


def ground_gaps(cons, free_index, order_pos):
    """The gaps' band positions, or None where the iteration does not apply.

    It applies when every gap holds one free station against ground, with one
    gap at most at a station.  ``free_index`` maps stations to free unknowns
    (-1 elsewhere), ``order_pos`` free unknowns to band positions (None: the
    same).
    """
    if not len(cons) or np.any(cons.b >= 0) or np.any(cons.s1 == 0):
        return None
    at = free_index[cons.a]
    if np.any(at < 0):
        return None
    if order_pos is not None:
        at = order_pos[at]
    if len(np.unique(at)) != len(at):
        return None
    return at


def _repeated(seen, closed) -> bool:
    """Whether the closed set was met before (a cycle); it is recorded as met."""
    key = np.packbits(closed).tobytes()
    if key in seen:
        return True
    seen.add(key)
    return False


def _broken(closed, force, opening, tol_z, tol_w):
    """The gaps that break their state's condition: a closed gap that pulls (a contact)
    or pushes (a link), an open gap that overlaps."""
    return (closed & (force < -tol_z)) | (~closed & (opening < -tol_w))


def _prescribe(ab, cols, w):
    """Rows and columns ``cols`` of a lower band set to those of the identity."""
    if not len(cols):
        return
    ab[0, cols] = 1.0
    for d in range(1, w + 1):
        ab[d, cols] = 0.0            # column below the diagonal (ab[d, j] = A[j+d, j])
        left = cols[cols >= d] - d
        ab[d, left] = 0.0            # row left of the diagonal (A[j, j-d] at ab[d, j-d])


def active_set(band: Band, at, sign, clearance, b, closed, scale_q, max_iter=200):
    """The gap forces of ``K u = b - B^T force`` by the primal-dual active-set method.

    Parameters
    ----------
    band : Band
        The free-free stiffness (positive definite) in band numbering.
    at, sign, clearance : ndarray, shape (g,)
        Each gap's band position, the sign of its closure ``sign * u[at]`` and
        its clearance.
    b : ndarray, shape (n,)
        The loads on the free unknowns (prescribed values moved over), in band
        numbering.
    closed : ndarray of bool
        The closed set to start from.
    scale_q : float
        The size of the openings, for the tolerances.

    Returns
    -------
    force, closed : ndarray
        The gap forces (>= 0) and the closed set (None unless solved).
    status : str
        ``'solved'`` or ``'cycled'``.
    iterations : int
        The factorisations made.
    """
    n, w = band.size, band.width
    ab0 = band.ab
    tol_w = 1e-11 * scale_q
    # the exact search scales its force tolerance by 1/diag(M); diag(M) >= 1/K_aa
    tol_z = 1e-11 * scale_q * float(ab0[0, at].max(initial=0.0))
    ab = ab0.copy()
    closed = np.asarray(closed, dtype=bool).copy()
    shown = np.zeros_like(closed)            # the state the working band shows
    seen = set()
    for it in range(1, max_iter + 1):
        if _repeated(seen, closed):
            return None, None, CYCLED, it - 1
        opened = np.flatnonzero(shown & ~closed)
        if len(opened):                     # restore the rows and columns of opened gaps
            cols = at[opened]
            ab[:, cols] = ab0[:, cols]
            for d in range(1, w + 1):
                left = cols[cols >= d] - d
                ab[d, left] = ab0[d, left]
        cc = at[closed]
        _prescribe(ab, cc, w)               # (again for all closed: a restored row may touch them)
        shown = closed.copy()
        v = np.zeros(n)
        v[cc] = clearance[closed] / sign[closed]
        rhs = b - band.matvec(v)
        rhs[cc] = v[cc]
        u = BandedCholesky(Band(ab)).solve(rhs)
        r = b - band.matvec(u)
        force = np.zeros(len(at))
        force[closed] = r[cc] / sign[closed]
        opening = clearance - sign * u[at]
        bad = _broken(closed, force, opening, tol_z, tol_w)
        if not bad.any():
            return np.where(closed, np.maximum(force, 0.0), 0.0), closed, SOLVED, it
        closed = closed ^ bad
    return None, None, CYCLED, max_iter


# --- gaps between two stations: closed gaps as multiplier rows inside the band -----------

# a pivot of the multiplier system this small against the largest is a dependent set of
# closed gaps: the iteration gives way to the exact search, which names them
_DEPENDENT_PIVOT = 1e-10


def linked_gaps(cons, free_index, order_pos):
    """The gaps as the multiplier iteration takes them, or None where it does not apply.

    Returns ``(a, b, sign_a, sign_b, held, sign_held)``: the band positions of each
    gap's free stations (``b`` -1 against ground) with the coefficients of its closure
    on them, and the station held by a support that a gap may join to a free one
    (-1 where none) with its coefficient: its prescribed displacement moves that gap's
    clearance, and the gap is then one to ground.  It applies when every gap has a
    free station (and every part a support: the caller sees to that).
    ``free_index`` and ``order_pos`` as in :func:`ground_gaps`.
    """
    if not len(cons) or np.any(cons.s1 == 0):
        return None
    two = cons.b >= 0
    if np.any(two & (cons.s2 == 0)):
        return None
    a = free_index[cons.a]
    b = np.where(two, free_index[np.where(two, cons.b, 0)], -1)
    held_a, held_b = a < 0, two & (b < 0)
    if np.any(held_a & (held_b | ~two)):
        return None                       # a gap with no free station
    # a held first station: the second takes its place
    sign_a = np.where(held_a, cons.s2, cons.s1)
    sign_b = np.where(held_a | held_b, 0.0, cons.s2)
    held = np.where(held_a, cons.a, np.where(held_b, cons.b, -1))
    sign_held = np.where(held_a, cons.s1, np.where(held_b, cons.s2, 0.0))
    a, b = np.where(held_a, b, a), np.where(held_a | held_b, -1, b)
    if order_pos is not None:
        a = order_pos[a]
        b = np.where(b >= 0, order_pos[np.maximum(b, 0)], -1)
    return a, b, sign_a, sign_b, held, sign_held


def _band_entries(ab):
    """(rows, cols, values) of the symmetric matrix of a lower band, both triangles."""
    n, w = ab.shape[1], ab.shape[0] - 1
    rows, cols, vals = [np.arange(n)], [np.arange(n)], [ab[0]]
    for d in range(1, w + 1):
        j = np.arange(n - d)
        v = ab[d, :n - d]
        keep = v != 0
        rows += [j[keep] + d, j[keep]]
        cols += [j[keep], j[keep] + d]
        vals += [v[keep], v[keep]]
    return np.concatenate(rows), np.concatenate(cols), np.concatenate(vals)


def active_set_linked(band: Band, at_a, at_b, sign_a, sign_b, clearance, b, closed, scale_q,
                      max_iter=200):
    """The gap forces of ``K u = b - B^T force`` by the primal-dual active-set method, for
    gaps to ground and between two free stations alike.

    Each closed gap adds its constraint ``sign_a*u[a] + sign_b*u[b] = clearance`` as a row
    and a multiplier (its force) placed beside the later of its stations, so the system
    stays banded: symmetric but indefinite, factorised by LAPACK's banded LU (``dgbtrf``)
    each iteration.  The states, tolerances, cycle test and returns are those of
    :func:`active_set`; a closed set whose constraints are dependent (a negligible pivot)
    returns ``'cycled'`` too, and the caller's exact search names the gaps.

    Parameters
    ----------
    at_a, at_b : ndarray of int, shape (g,)
        Band positions of each gap's stations (``at_b`` -1 against ground).
    sign_a, sign_b : ndarray, shape (g,)
        Coefficients of the closure ``sign_a*u[a] + sign_b*u[b]``.
    Other parameters as :func:`active_set`.
    """
    from scipy.linalg.lapack import dgbtrf, dgbtrs

    n = band.size
    ab0 = band.ab
    two = at_b >= 0
    at_b0 = np.where(two, at_b, 0)
    rows, cols, vals = _band_entries(ab0)
    beta = float(ab0[0].max(initial=1.0))     # constraint rows on the scale of K's rows
    tol_w = 1e-11 * scale_q
    tol_z = 1e-11 * scale_q * float(np.maximum(ab0[0, at_a], np.where(two, ab0[0, at_b0], 0.0))
                                    .max(initial=0.0))
    g = len(at_a)
    closed = np.asarray(closed, dtype=bool).copy()
    seen = set()
    for it in range(1, max_iter + 1):
        if _repeated(seen, closed):
            return None, None, CYCLED, it - 1
        c = np.flatnonzero(closed)
        anchor = np.maximum(at_a[c], at_b[c])
        by = np.argsort(anchor, kind="stable")
        c, anchor = c[by], anchor[by]
        count = np.bincount(anchor, minlength=n)
        ends = np.cumsum(count)
        place = np.arange(n) + ends - count    # each unknown after the multipliers before it
        group = (ends - count)[anchor]          # the first multiplier of the same anchor
        mult = place[anchor] + 1 + np.arange(len(c)) - group
        size = n + len(c)
        ca, cb, tw = at_a[c], at_b0[c], two[c]
        R = np.concatenate([place[rows], mult, place[ca], mult[tw], place[cb[tw]]])
        C = np.concatenate([place[cols], place[ca], mult, place[cb[tw]], mult[tw]])
        V = np.concatenate([vals, beta * sign_a[c], beta * sign_a[c],
                            beta * sign_b[c][tw], beta * sign_b[c][tw]])
        W = int(np.abs(R - C).max(initial=0))
        lu = np.zeros((3 * W + 1, size))        # dgbtrf's storage: W rows of room on top
        lu[2 * W + R - C, C] = V
        lu, piv, info = dgbtrf(lu, W, W, overwrite_ab=1)
        pivots = np.abs(lu[2 * W])
        if info or pivots.min(initial=1.0) <= _DEPENDENT_PIVOT * pivots.max(initial=0.0):
            return None, None, CYCLED, it
        rhs = np.empty(size)
        rhs[place] = b
        rhs[mult] = beta * clearance[c]
        x, info = dgbtrs(lu, W, W, rhs, piv)
        if info or not np.all(np.isfinite(x)):
            return None, None, CYCLED, it
        u = x[place]
        force = np.zeros(g)
        force[c] = beta * x[mult]
        opening = clearance - sign_a * u[at_a] - np.where(two, sign_b * u[at_b0], 0.0)
        bad = _broken(closed, force, opening, tol_z, tol_w)
        if not bad.any():
            return np.where(closed, np.maximum(force, 0.0), 0.0), closed, SOLVED, it
        closed = closed ^ bad
    return None, None, CYCLED, max_iter
