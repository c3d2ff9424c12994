"""Unilateral constraints: contacts and slack links as rows of one matrix B.

Each constraint measures a closure ``g = B u`` and holds ``g <= clearance``
with a force of one sign only: a contact closes and then pushes, a slack link
goes taut and then pulls.  Both are the same kind of constraint here (their
sign sits in B), so the contact search, the sweeps' events and, later, a
segment yielding in tension or compression are one machinery.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..model import Model

__all__ = ["Unilateral", "unilateral"]


@dataclass(frozen=True)
class Unilateral:
    """The unilateral constraints of a model (arrays over constraints).

    Attributes
    ----------
    a, b : ndarray of int
        The stations of each constraint (``b`` is -1 against ground).
    s1, s2 : ndarray
        Coefficients of the closure ``g = s1*u[a] + s2*u[b]``.
    clearance : ndarray
    B, BT : scipy.sparse.csr_matrix
        The closure rows (g, n) and their transpose.
    force_sign : ndarray
        -1 for a contact (it carries compression), +1 for a link (tension).
    """

    a: np.ndarray
    b: np.ndarray
    s1: np.ndarray
    s2: np.ndarray
    clearance: np.ndarray
    B: object
    BT: object
    force_sign: np.ndarray

    def __len__(self):
        return len(self.clearance)


def unilateral(model: Model, n: int) -> Unilateral:
    """The constraints of the model's gaps, over ``n`` stations."""
    import scipy.sparse as sp

    index = model._station_index
    gaps = model.gaps
    g = len(gaps)
    a = np.array([index[gp.stations[0]] for gp in gaps], dtype=int)
    b = np.array([index[gp.stations[1]] if len(gp.stations) == 2 else -1 for gp in gaps],
                 dtype=int)
    signs = np.array([gp.sign for gp in gaps], dtype=float).reshape(g, 2)
    two = b >= 0
    rows = np.concatenate([np.arange(g), np.flatnonzero(two)])
    cols = np.concatenate([a, b[two]])
    vals = np.concatenate([signs[:, 0], signs[:, 1][two]])
    B = sp.csr_matrix((vals, (rows, cols)), shape=(g, n))
    return Unilateral(a, b, signs[:, 0], signs[:, 1],
                      np.array([gp.clearance for gp in gaps], dtype=float), B, B.T.tocsr(),
                      np.array([-1.0 if gp.kind == "contact" else 1.0 for gp in gaps]))
