"""Factorisations of the free-free stiffness behind one small protocol.

A factorisation is made once per model and reused for every case, every gap
iteration and every sweep step.  It offers ``solve(rhs)`` for one right-hand
side (n,) or a block (n, k), and says its ``method``.  The method is chosen by
name in :func:`factorise`; ``"auto"`` picks the best available (today the
sparse LU; a banded Cholesky for narrow bands joins it later).  Each
factorisation made is counted (:func:`made`), so tests can see that cases
share one.
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError, SolveError, suggest

__all__ = ["METHODS", "SparseLU", "factorise", "made"]

METHODS = ("auto", "sparse-lu")
_MADE = [0]


def made() -> int:
    """How many factorisations this process has made."""
    return _MADE[0]


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


def factorise(K_ff, method: str = "auto", source=None):
    """Factorise the free-free stiffness ``K_ff`` by ``method``.

    Raises
    ------
    ModelError
        For an unknown method name (the names are listed).
    SolveError
        When the matrix is singular.
    """
    if method not in METHODS:
        raise ModelError(f"unknown solver method '{method}'", place="method",
                         hint=suggest(method, METHODS), options=METHODS)
    return SparseLU(K_ff, source)
