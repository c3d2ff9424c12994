"""Assembly: element stiffness, equivalent nodal loads and the sparse global matrix.

Each segment is a two-node bar element.  In the element's own coordinate s,
running from its ``from`` station to its ``to`` station over length L, the axial
force is

    N(s) = N_from - Q(s),   Q(s) = integral of the axial load from 0 to s,

and compatibility gives ``N_from = k*(du - delta0) + k*G`` with ``du`` the
change of length, ``delta0 = alpha*dT*L + misfit`` the free (stress-free)
change of length, ``k = 1/integral(ds/EA)`` and ``G = integral(Q/EA ds)``.
Node forces follow from element equilibrium, so internal forces are exact for
uniform and tapered segments alike, with self-weight or a distributed load.

Everything here is vectorised over segments with numpy; no Python loop runs
per element.  Tapered segments use the exact stiffness of a section whose area
is a product of two linear functions of s (cone, tapered tube, tapered
rectangle, linearly tapered area); their load integrals use Gauss-Legendre
quadrature, exact to rounding for the taper ratios met in practice.
"""

from __future__ import annotations

import operator
from dataclasses import dataclass

import numpy as np

from .._gcpause import gc_paused
from ..model import Model

__all__ = ["Assembly", "assemble", "element_loads"]

_GAUSS = np.polynomial.legendre.leggauss(24)


@dataclass(frozen=True)
class Assembly:
    """The assembled, gap-free linear system of a model (SI units, arrays over segments).

    Attributes
    ----------
    start, end : ndarray of int
        Station indices of each segment's ``from`` and ``to`` end.
    direction : ndarray
        +1 where ``to`` lies at larger x than ``from``, -1 otherwise.
    length, stiffness : ndarray
        Segment length L and axial stiffness k.
    area : ndarray, shape (m, 2)
        Area at the ``from`` and ``to`` end.
    modulus, expansion : ndarray
        E and alpha of each segment.
    misfit, q : ndarray
        Misfit (m) and distributed load (N/m, global +x) of each segment.
    g_unit_q : ndarray
        integral(s/EA ds): the compatibility term of a unit local load per length.
    w_self, g_self : ndarray
        Total local self-weight W and its compatibility term G.
    K : scipy.sparse.csr_matrix
        Global stiffness of the segments alone (springs not included).
    """

    n: int
    start: np.ndarray
    end: np.ndarray
    direction: np.ndarray
    length: np.ndarray
    stiffness: np.ndarray
    area: np.ndarray
    modulus: np.ndarray
    expansion: np.ndarray
    misfit: np.ndarray
    q: np.ndarray
    g_unit_q: np.ndarray
    w_self: np.ndarray
    g_self: np.ndarray
    K: object


def _phi(t):
    """log1p(t)/t, accurate near t = 0."""
    t = np.asarray(t, dtype=float)
    small = np.abs(t) < 1e-6
    safe = np.where(small, 1.0, t)
    return np.where(small, 1 - t / 2 + t * t / 3 - t**3 / 4, np.log1p(safe) / safe)


_FIELDS = operator.attrgetter("section", "end_section", "material", "start", "end", "misfit",
                              "distributed_load")


def _by_object(objects, values, width):
    """Rows of ``values(obj)`` per item, computed once per distinct object.

    Segments share a few materials and sections, so the per-segment work is an
    ``id`` and one vectorised ``np.unique``; the rows come by fancy indexing.
    """
    ids = np.fromiter(map(id, objects), dtype=np.int64, count=len(objects))
    uniq, first, codes = np.unique(ids, return_index=True, return_inverse=True)
    table = np.array([values(objects[i]) for i in first], dtype=float).reshape(len(uniq), width)
    return table[codes].T


def _segment_arrays(model: Model):
    """Gather per-segment inputs into arrays (one C-level pass over the segments)."""
    m = len(model.segments)
    sec, end_sec, mat, start, end, misfit, q = zip(*map(_FIELDS, model.segments))
    end_sec = [e if e is not None else s for s, e in zip(sec, end_sec)]
    index = model._station_index
    out = {
        "start": np.fromiter(map(index.__getitem__, start), dtype=np.int64, count=m),
        "end": np.fromiter(map(index.__getitem__, end), dtype=np.int64, count=m),
        "misfit": np.asarray(misfit, dtype=float),
        "q": np.asarray(q, dtype=float),
    }
    out["c"], out["p1"], out["q1"] = _by_object(sec, lambda s: s.factors, 3)
    _, out["p2"], out["q2"] = _by_object(end_sec, lambda s: s.factors, 3)
    out["E"], out["alpha"], out["rho"] = _by_object(
        mat, lambda t: (t.elastic_modulus, t.thermal_expansion, t.density or 0.0), 3)
    return out


def assemble(model: Model) -> Assembly:
    """Assemble the gap-free global stiffness and the per-segment load terms.

    Examples
    --------
    A steel rod, 1 m long, 100 mm^2, fixed at x = 0:

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Model
    >>> steel = Material("steel", 200e9)
    >>> rod = Section("rod", "area", (("area", 1e-4),))
    >>> model = Model((Station("a", 0.0), Station("b", 1.0)),
    ...               (Segment("ab", "a", "b", steel, rod),), (Support("a"),))
    >>> float(assemble(model).stiffness[0])  # E*A/L
    20000000.0
    """
    import scipy.sparse as sp

    n = len(model.stations)
    with gc_paused():
        arr = _segment_arrays(model)
    start, end = arr["start"], arr["end"]
    x = np.fromiter(map(operator.attrgetter("x"), model.stations), dtype=float, count=n)
    dx = x[end] - x[start]
    direction = np.sign(dx)
    length = np.abs(dx)
    c, p1, q1, p2, q2 = (arr[k] for k in ("c", "p1", "q1", "p2", "q2"))
    E, alpha, rho = arr["E"], arr["alpha"], arr["rho"]
    a1, a2 = c * p1 * q1, c * p2 * q2
    dp, dq = (p2 - p1) / length, (q2 - q1) / length
    det = p1 * dq - q1 * dp
    flex = length / (c * q1 * p2) * _phi(length * det / (q1 * p2)) / E
    k = 1.0 / flex

    g_local = model.gravity * direction
    tapered = (p1 != p2) | (q1 != q2)
    g_unit_q = length**2 / (2 * E * a1)
    w_self = rho * g_local * a1 * length
    g_self = rho * g_local * length**2 / (2 * E)
    if np.any(tapered):
        t = np.flatnonzero(tapered)
        s = 0.5 * length[t, None] * (_GAUSS[0][None, :] + 1)
        w = 0.5 * length[t, None] * _GAUSS[1][None, :]
        pp = p1[t, None] + dp[t, None] * s
        qq = q1[t, None] + dq[t, None] * s
        area_s = c[t, None] * pp * qq
        vol_s = c[t, None] * (p1[t, None] * q1[t, None] * s
                              + (p1[t, None] * dq[t, None] + q1[t, None] * dp[t, None]) * s**2 / 2
                              + dp[t, None] * dq[t, None] * s**3 / 3)
        g_unit_q[t] = np.sum(w * s / (E[t, None] * area_s), axis=1)
        vol = c[t] * (p1[t] * q1[t] * length[t] + (p1[t] * dq[t] + q1[t] * dp[t]) * length[t]**2 / 2
                      + dp[t] * dq[t] * length[t]**3 / 3)
        w_self[t] = rho[t] * g_local[t] * vol
        g_self[t] = rho[t] * g_local[t] * np.sum(w * vol_s / (E[t, None] * area_s), axis=1)

    # each off-diagonal pair in one order, so duplicates sum alike above and below the
    # diagonal and K is symmetric to the last bit
    lo, hi = np.minimum(start, end), np.maximum(start, end)
    rows = np.concatenate([lo, lo, hi, hi])
    cols = np.concatenate([lo, hi, lo, hi])
    data = np.concatenate([k, -k, -k, k])
    K = sp.csr_matrix((data, (rows, cols)), shape=(n, n))
    misfit, q = arr["misfit"], arr["q"]
    return Assembly(n=n, start=start, end=end, direction=direction, length=length, stiffness=k,
                    area=np.column_stack([a1, a2]), modulus=E, expansion=alpha, misfit=misfit,
                    q=q, g_unit_q=g_unit_q, w_self=w_self, g_self=g_self, K=K)


def element_loads(asm: Assembly, dT, q_factor=1.0):
    """Return the element terms of one load state.

    Parameters
    ----------
    asm : Assembly
    dT : ndarray
        Temperature change of each segment (K).
    q_factor : float
        Factor on the distributed loads (self-weight is not scaled).

    Returns
    -------
    nodal : ndarray, shape (n,)
        Equivalent nodal forces (global, N) of thermal strain, misfit,
        distributed load and self-weight.
    delta0, G, W : ndarray
        Free change of length, compatibility term and total local load of each
        segment, as used by :func:`axialfe.solve.recover`.
    """
    delta0 = asm.expansion * dT * asm.length + asm.misfit
    q_local = q_factor * asm.q * asm.direction
    G = q_local * asm.g_unit_q + asm.g_self
    W = q_local * asm.length + asm.w_self
    k = asm.stiffness
    f_start = asm.direction * (-k * delta0 + k * G)
    f_end = asm.direction * (k * delta0 + W - k * G)
    nodal = (np.bincount(asm.start, f_start, minlength=asm.n)
             + np.bincount(asm.end, f_end, minlength=asm.n))
    return nodal, delta0, G, W
