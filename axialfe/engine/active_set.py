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

__all__ = ["CYCLED", "ground_gaps", "active_set"]

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
        key = np.packbits(closed).tobytes()
        if key in seen:
            return None, None, CYCLED, it - 1
        seen.add(key)
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
        bad = (closed & (force < -tol_z)) | (~closed & (opening < -tol_w))
        if not bad.any():
            return np.where(closed, np.maximum(force, 0.0), 0.0), closed, SOLVED, it
        closed = closed ^ bad
    return None, None, CYCLED, max_iter
