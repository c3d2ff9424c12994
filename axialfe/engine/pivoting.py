"""Pivoting for linear complementarity problems: pure functions that return a status.

The unilateral constraints (contacts, slack links) lead to the LCP

    w = q + M z >= 0,  z >= 0,  w * z = 0.

:func:`block_principal_pivoting` solves it for symmetric positive definite M
(every part supported); :func:`lemke` for the mixed problems of parts held only
by gaps and for semidefinite M (redundant gaps).  They know nothing of models:
they return a status (``'solved'``, ``'semidefinite'``, ``'ray'``,
``'not-unique'``, ``'no-settle'``) that the caller turns into a message.
"""

from __future__ import annotations

import numpy as np

__all__ = ["SOLVED", "SEMIDEFINITE", "RAY", "NOT_UNIQUE", "NO_SETTLE",
           "block_principal_pivoting", "semidefinite", "lemke"]

SOLVED, SEMIDEFINITE, RAY, NOT_UNIQUE, NO_SETTLE = (
    "solved", "semidefinite", "ray", "not-unique", "no-settle")


def block_principal_pivoting(M, q, scale_q):
    """Block principal pivoting for the LCP w = q + M z (M symmetric positive definite).

    Falls back to one pivot at a time (Murty's least-index rule, finite for
    P-matrices) when the number of infeasibilities stops falling.

    Returns
    -------
    z, closed : ndarray
        The solution and the set of basic z (None unless solved).
    status : str
        ``'solved'``; ``'semidefinite'`` when a principal block cannot be
        factorised (dependent constraints: use :func:`semidefinite`); or
        ``'no-settle'`` (not reached for positive definite M).
    """
    from scipy.linalg import cho_factor, cho_solve

    n = len(q)
    diag = np.diag(M)
    tol_w = 1e-11 * scale_q
    # a gap between stations that cannot move has a zero diagonal: it sets no force scale
    movable = diag > 0
    tol_z = 1e-11 * np.max(scale_q / diag[movable]) if movable.any() else 0.0
    closed = q < -tol_w
    best, budget = n + 1, 3
    for _ in range(50 * n + 100):
        z = np.zeros(n)
        if closed.any():
            sub = M[np.ix_(closed, closed)]
            try:
                factor = cho_factor(sub, check_finite=False)
            except np.linalg.LinAlgError:
                return None, closed, SEMIDEFINITE
            z[closed] = cho_solve(factor, -q[closed], check_finite=False)
        w = q + M @ z
        bad = (closed & (z < -tol_z)) | (~closed & (w < -tol_w))
        count = int(bad.sum())
        if count == 0:
            return np.where(closed, np.maximum(z, 0.0), 0.0), closed, SOLVED
        if count < best:
            best, budget = count, 3
            closed = closed ^ bad
        elif budget > 0:
            budget -= 1
            closed = closed ^ bad
        else:
            i = int(np.flatnonzero(bad)[-1])
            closed[i] = not closed[i]
    return None, closed, NO_SETTLE


def semidefinite(M, q, tried):
    """The LCP of a semidefinite M (redundant constraints), by Lemke's method.

    Returns ``(z, closed, status)``; ``status`` is ``'not-unique'`` when the
    constraints the answer closes are dependent (their forces cannot be told
    apart), and then ``closed`` names them (or the set ``tried`` before).
    """
    n = len(q)
    z, basic, status = lemke(M, q, 100 * n + 100)
    if status == SOLVED:
        sub = M[np.ix_(basic, basic)]
        if not basic.any() or np.linalg.matrix_rank(sub) == int(basic.sum()):
            return np.where(basic, np.maximum(z, 0.0), 0.0), basic, SOLVED
        tried = basic
    return None, tried, NOT_UNIQUE


def lemke(Mb, qb, max_iter):
    """Lemke's complementary pivoting for ``w = qb + Mb z``.

    Returns ``(z, basic, status)``: ``status`` is ``'solved'``, ``'ray'`` (a secondary
    ray: the problem has no solution, for the matrices met here) or
    ``'no-settle'`` (the pivot limit was reached); ``z`` and ``basic`` are None
    unless solved.
    """
    n = len(qb)
    if np.all(qb >= 0):
        return np.zeros(n), np.zeros(n, dtype=bool), SOLVED
    # tableau columns: w (n), z (n), z0, rhs
    T = np.hstack([np.eye(n), -Mb, -np.ones((n, 1)), qb[:, None]])
    basis = list(range(n))
    r = int(np.argmin(qb))
    entering = 2 * n
    scale = np.abs(T).max()
    for _ in range(max_iter):
        T[r] /= T[r, entering]
        for i in range(n):
            if i != r and T[i, entering] != 0.0:
                T[i] -= T[i, entering] * T[r]
        leaving = basis[r]
        basis[r] = entering
        if leaving == 2 * n:
            z = np.zeros(n)
            in_basis = np.zeros(n, dtype=bool)
            for i, b in enumerate(basis):
                if n <= b < 2 * n:
                    z[b - n] = T[i, -1]
                    in_basis[b - n] = True
            return z, in_basis, SOLVED
        entering = leaving + n if leaving < n else leaving - n
        col = T[:, entering]
        ok = col > 1e-12 * scale
        if not ok.any():
            return None, None, RAY
        ratios = np.full(n, np.inf)
        ratios[ok] = T[ok, -1] / col[ok]
        rmin = ratios.min()
        ties = np.flatnonzero(ratios <= rmin + 1e-12 * max(1.0, abs(rmin)))
        # prefer z0 leaving on a tie, so the search ends as soon as it can
        zrow = [i for i in ties if basis[i] == 2 * n]
        r = int(zrow[0]) if zrow else int(ties[0])
    return None, None, NO_SETTLE
