"""Factorisations of the free-free stiffness behind one small protocol.

A factorisation is made once per model and reused for every case, every gap
iteration and every sweep step.  It offers ``solve(rhs)`` for one right-hand
side (n,) or a block (n, k), and says its ``method``.  The method is chosen by
name in :func:`factorise`:

``"banded"``
    The unknowns numbered by x, the stiffness written as a symmetric band
    straight from the segment arrays (:func:`band_of`) and factorised by
    LAPACK's banded Cholesky (``scipy.linalg.cholesky_banded``).  Every axial
    model numbered by x is banded: its bandwidth is the widest span, in
    stations, of any segment, so a chain has bandwidth 1 and parallel parts or
    short spans a few.  A band of width one (a chain) is factorised by LAPACK's
    tridiagonal ``dpttrf``, the same factor several times quicker, and a band
    of a few unknowns whole, by numpy's Cholesky.
``"sparse-lu"``
    SuperLU of the sparse matrix, for wide bands.
``"auto"``
    The band where it is narrow (:data:`BAND_LIMIT`, or small enough to hold
    whole), the sparse LU otherwise, and the sparse LU where the band is not
    positive definite (the reason is kept in ``fallback``).

Each factorisation made is counted (:func:`made`), so tests can see that cases
share one.
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError, SolveError, suggest

__all__ = ["METHODS", "BAND_LIMIT", "Band", "BandedCholesky", "SparseLU", "band_of",
           "band_of_run", "factorise", "made"]

METHODS = ("auto", "banded", "sparse-lu")
BAND_LIMIT = 64             # "auto" takes the band up to this half-bandwidth ...
_BAND_WHOLE = 1 << 20       # ... or at any width while the band holds at most this many numbers
_WHOLE = 16                 # a band of at most this many unknowns is factorised whole
_MADE = [0]


def made() -> int:
    """How many factorisations this process has made."""
    return _MADE[0]


class Band:
    """A symmetric matrix in LAPACK's lower band form, over unknowns numbered by x.

    Attributes
    ----------
    ab : ndarray, shape (w + 1, n)
        ``ab[d, j] = A[j + d, j]`` in the band numbering.
    order : ndarray of int or None
        ``order[p]`` is the caller's index of band position ``p`` (None: the
        caller's numbering is already by x).
    """

    def __init__(self, ab, order=None):
        self.ab = ab
        self.order = order

    width = property(lambda self: self.ab.shape[0] - 1)
    size = property(lambda self: self.ab.shape[1])

    def dense(self):
        """The whole symmetric matrix (for small bands)."""
        n, w = self.size, self.width
        out = np.diag(self.ab[0])
        for d in range(1, w + 1):
            i = np.arange(n - d)
            out[i + d, i] = out[i, i + d] = self.ab[d, :n - d]
        return out

    def matvec(self, v):
        """``A @ v`` in the band numbering, for v of shape (n,) or (n, k)."""
        ab, w = self.ab, self.width
        if v.ndim == 2:
            ab = ab[:, :, None]
        out = ab[0] * v
        for d in range(1, w + 1):
            out[d:] += ab[d, :-d] * v[:-d]
            out[:-d] += ab[d, :-d] * v[d:]
        return out


def band_of(n, pos, start, end, stiffness, diagonal, held=None, ends=None):
    """The free-free stiffness as a :class:`Band`, written straight from the segment arrays.

    Parameters
    ----------
    n : int
        The number of unknowns.
    pos : ndarray of int, shape (n_stations,)
        The band position of each station, -1 where it is not an unknown
        (prescribed or anchored).
    start, end, stiffness : ndarray, shape (m,)
        The segments' end stations and axial stiffnesses.
    diagonal : ndarray, shape (n_stations,)
        What stands on the diagonal besides the segments (springs).
    held : ndarray of int, optional
        The segments with an end that is not an unknown (found here when not given;
        a caller that knows them spares a pass).
    ends : callable, optional
        ``ends(v)`` gives ``(v[start], v[end])`` (:meth:`Assembly.ends`, which reads a
        chain's ends as slices).

    Notes
    -----
    Each segment adds ``k`` at its two unknowns on the diagonal and ``-k`` between
    them; the sums are three ``np.bincount`` calls, with no loop over segments.
    """
    p = np.where(pos < 0, n, pos)          # one spare slot, n, collects what is not an unknown
    i, j = ends(p) if ends is not None else (p[start], p[end])
    if held is None:
        held = np.flatnonzero((i == n) | (j == n))
    diag = np.bincount(i, stiffness, minlength=n + 1).astype(float, copy=False)
    diag += np.bincount(j, stiffness, minlength=n + 1)
    springs = np.flatnonzero(diagonal)
    diag[p[springs]] += diagonal[springs]
    span = np.subtract(j, i)
    np.abs(span, out=span)
    span[held] = 0                          # a held end: nothing off the diagonal
    w = int(span.max(initial=0))
    ab = np.empty((w + 1, n))
    ab[0] = diag[:n]
    if w:
        # the off-diagonal sums at (span, lower end); the held segments fall in the
        # diagonal row of the count, which is not read
        span *= n
        span += np.minimum(i, j)
        span[held] = 0
        off = np.bincount(span, stiffness, minlength=(w + 1) * n)
        np.subtract(0.0, off[n:(w + 1) * n], out=ab.reshape(-1)[n:])
    return Band(ab)


def band_of_run(first, stop, stiffness, diagonal):
    """The free-free stiffness of a chain as a :class:`Band`, when its unknowns are the
    stations ``first, ..., stop - 1`` (one run, in order; segment i joins stations i and
    i + 1).  The same band as :func:`band_of`, written from slices of the segment arrays.
    """
    n = stop - first
    sums = np.zeros(len(diagonal))
    sums[:-1] += stiffness
    sums[1:] += stiffness               # each station's segments, as band_of sums them
    springs = np.flatnonzero(diagonal)
    sums[springs] += diagonal[springs]
    ab = np.empty((2 if n > 1 else 1, n))
    ab[0] = sums[first:stop]
    if n > 1:
        np.subtract(0.0, stiffness[first:stop - 1], out=ab[1, :-1])
        ab[1, -1] = 0.0
    return Band(ab)


class BandedCholesky:
    """Banded Cholesky of a symmetric positive definite :class:`Band`.

    With ``overwrite``, a tridiagonal band is factorised in its own memory (its
    ``ab`` is then gone: set to None), for a caller that reads it no more.

    Raises
    ------
    SolveError
        When the band is not positive definite; ``.reason`` says where.
    """

    method = "banded"

    def __init__(self, band: Band, source=None, overwrite=False):
        self.order = band.order
        self.width = band.width
        self._cb = self._tri = self._whole = None
        try:
            if band.size <= _WHOLE:
                # a few unknowns: the band is the whole matrix, factorised by numpy's
                # Cholesky (the same factor; it spares loading scipy's linear algebra)
                self._whole = np.linalg.cholesky(band.dense())
            elif band.width == 1:
                # a tridiagonal band (a chain): LAPACK's own L*D*L^T of it, several times
                # quicker than the general banded Cholesky for the same factor
                from scipy.linalg.lapack import dpttrf

                d, e, info = dpttrf(band.ab[0], band.ab[1, :-1], overwrite_d=overwrite,
                                    overwrite_e=overwrite)
                if overwrite:
                    band.ab = None
                if info:
                    raise np.linalg.LinAlgError("not positive definite")
                self._tri = (d, e)
            else:
                from scipy.linalg import cholesky_banded

                self._cb = cholesky_banded(band.ab, lower=True, check_finite=False)
        except np.linalg.LinAlgError as exc:
            err = SolveError("the stiffness matrix is not positive definite; check for "
                             "segments of vanishing stiffness, or use method 'sparse-lu'",
                             file=source)
            err.reason = "not positive definite"
            raise err from exc
        _MADE[0] += 1

    def _solve(self, rhs):
        if self._whole is not None:
            L = self._whole
            return np.linalg.solve(L.T, np.linalg.solve(L, rhs))
        if self._tri is not None:
            from scipy.linalg.lapack import dpttrs

            x, info = dpttrs(*self._tri, rhs)
            return x
        from scipy.linalg import cho_solve_banded

        return cho_solve_banded((self._cb, True), rhs, check_finite=False)

    def solve(self, rhs):
        rhs = np.asarray(rhs, dtype=float)
        if self.order is None:
            return self._solve(rhs)
        out = np.empty_like(rhs)
        out[self.order] = self._solve(rhs[self.order])
        return out


class SparseLU:
    """SuperLU of a sparse matrix (``scipy.sparse.linalg.splu``)."""

    method = "sparse-lu"

    def __init__(self, K_ff, source=None):
        from scipy.sparse.linalg import splu

        try:
            self._lu = splu(K_ff.tocsc())
        except RuntimeError as exc:
            raise SolveError(f"the stiffness matrix is singular ({exc}); check for "
                             "segments of vanishing stiffness", file=source) from exc
        _MADE[0] += 1

    def solve(self, rhs):
        return self._lu.solve(np.ascontiguousarray(rhs))


def _narrow(band: Band) -> bool:
    return band.width <= BAND_LIMIT or (band.width + 1) * band.size <= _BAND_WHOLE


def factorise(K_ff, method: str = "auto", source=None, band=None, overwrite_band=False):
    """Factorise the free-free stiffness by ``method``.

    Parameters
    ----------
    K_ff : sparse matrix or callable
        The matrix, or a function that builds it (called only when the sparse
        LU is used).
    method : {'auto', 'banded', 'sparse-lu'}
    source : str, optional
        The model file, for messages.
    band : Band or callable, optional
        The same matrix in band form (or a function that builds it); needed
        for ``'banded'``, and lets ``'auto'`` choose it.
    overwrite_band : bool
        The band is read no more after this: it may be factorised in place.

    Returns
    -------
    BandedCholesky or SparseLU
        With ``fallback`` set to the reason when ``'auto'`` wanted the band
        but could not use it.

    Raises
    ------
    ModelError
        For an unknown method name (the names are listed).
    SolveError
        When the matrix is singular (or, for ``'banded'``, not positive definite).
    """
    if method not in METHODS:
        raise ModelError(f"unknown solver method '{method}'", place="method",
                         hint=suggest(method, METHODS), options=METHODS)
    fallback = None
    if method != "sparse-lu" and band is not None:
        band = band() if callable(band) else band
        if method == "banded" or _narrow(band):
            try:
                out = BandedCholesky(band, source, overwrite=overwrite_band)
                out.fallback = None
                return out
            except SolveError as exc:
                if method == "banded":
                    raise
                fallback = f"the band is {exc.reason}"
        else:
            fallback = f"the band is wide ({band.width} > {BAND_LIMIT})"
    elif method == "banded":
        raise ModelError("the banded method needs the band of the stiffness", place="method")
    out = SparseLU(K_ff() if callable(K_ff) else K_ff, source)
    out.fallback = fallback
    return out
