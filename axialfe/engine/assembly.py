"""Assembly: the element terms of every segment and the sparse global matrix.

The element itself (stiffness, load integrals, end forces, nodal loads) is
:mod:`axialfe.mechanics.element`; this module gathers the per-segment inputs
into arrays, calls it once for all segments with the numeric backend, and
assembles the global stiffness.  No Python loop runs per element.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np

from ..mechanics import NUMERIC, Fields, element_terms, load_terms, nodal_loads
from ..model import Model

__all__ = ["Assembly", "assemble", "element_loads"]

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
        Area at the ``from`` and ``to`` end (made on first use).
    modulus, expansion : ndarray
        E and alpha of each segment.
    misfit, q : ndarray
        Misfit (m) and distributed load (N/m, global +x) of each segment.
    g_unit_q : ndarray
        integral(s/EA ds): the compatibility term of a unit local load per length.
    w_self, g_self : ndarray
        Total local self-weight W and its compatibility term G.
    sections : tuple of ndarray
        Section factors (c, p1, q1, p2, q2) of each segment (A = c*P*Q).
    factors : ndarray, shape (m, 5)
        The same as one table (made on first use).
    rho_g : ndarray
        Density times the gravity component along each segment's direction.
    terms : ElementTerms
        The element terms as :mod:`axialfe.mechanics` gives them.
    chain : bool
        True when segment i runs from station i to station i + 1 (a chain numbered
        along the bar): :meth:`ends` and :meth:`to_stations` then read and write
        slices instead of gathering and scattering by index.
    K : scipy.sparse.csr_matrix
        Global stiffness of the segments alone (springs not included), built on
        first use (the banded path never needs it).
    """

    n: int
    start: np.ndarray
    end: np.ndarray
    direction: np.ndarray
    length: np.ndarray
    stiffness: np.ndarray
    modulus: np.ndarray
    expansion: np.ndarray
    misfit: np.ndarray
    q: np.ndarray
    g_unit_q: np.ndarray
    w_self: np.ndarray
    g_self: np.ndarray
    sections: tuple
    rho_g: np.ndarray
    terms: object
    chain: bool = False

    def __post_init__(self):
        # shared by every case and result of the model: never written after this
        for name in self.__dataclass_fields__:
            value = getattr(self, name)
            if isinstance(value, np.ndarray):
                value.setflags(write=False)

    def ends(self, values):
        """``(values[start], values[end])``: a station array read at each segment's ends."""
        if self.chain:
            return values[:-1], values[1:]
        return values[self.start], values[self.end]

    def to_stations(self, at_from, at_to, subtract=False, out=None):
        """The station sums of ``at_from`` at each segment's ``from`` station plus (or minus,
        with ``subtract``) ``at_to`` at its ``to`` station, as ``np.bincount`` sums them;
        added into ``out`` (a float station array of the caller's) where it is given."""
        if not self.chain:
            sums = np.bincount(self.start, at_from, minlength=self.n).astype(float, copy=False)
            to = np.bincount(self.end, at_to, minlength=self.n)
            if subtract:
                sums -= to
            else:
                sums += to
            if out is None:
                return sums
            out += sums
            return out
        if out is None:
            out = np.zeros(self.n)
        out[:-1] += at_from
        if subtract:
            out[1:] -= at_to
        else:
            out[1:] += at_to
        return out

    @functools.cached_property
    def area(self):
        """The area at the ``from`` and ``to`` end of each segment, shape (m, 2)."""
        return _read_only(np.column_stack([self.terms.area_from, self.terms.area_to]))

    @functools.cached_property
    def factors(self):
        """The section factors (c, p1, q1, p2, q2) of each segment, shape (m, 5)."""
        c, p1, q1, p2, q2 = self.sections
        return _read_only(np.column_stack([np.broadcast_to(c, self.length.shape), p1, q1, p2, q2]))

    @functools.cached_property
    def forward(self) -> bool:
        """True when every segment runs toward +x (direction +1), as in a chain numbered by x."""
        return bool(np.all(self.direction > 0))

    @functools.cached_property
    def area_table(self):
        """The coefficients of A(t) of each segment (:meth:`Fields.area_table`), shape (m, 3)."""
        table = Fields.area_table(*self.factors.T)
        table.setflags(write=False)
        return table

    @functools.cached_property
    def K(self):
        """Global stiffness of the segments alone (scipy.sparse CSR, built on first use)."""
        import scipy.sparse as sp

        start, end, k = self.start, self.end, self.stiffness
        # each off-diagonal pair in one order, so duplicates sum alike above and below the
        # diagonal and K is symmetric to the last bit
        lo, hi = np.minimum(start, end), np.maximum(start, end)
        rows = np.concatenate([lo, lo, hi, hi])
        cols = np.concatenate([lo, hi, lo, hi])
        data = np.concatenate([k, -k, -k, k])
        return sp.csr_matrix((data, (rows, cols)), shape=(self.n, self.n))


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
    n = len(model.stations)
    arr = model.arrays
    start, end, x = arr.start, arr.end, arr.x
    chain = _is_chain(n, start, end)
    dx = x[1:] - x[:-1] if chain else x[end] - x[start]
    direction = np.sign(dx)
    length = np.abs(dx)
    c, p1, q1, p2, q2 = arr.c, arr.p1, arr.q1, arr.p2, arr.q2
    E, alpha, rho = arr.elastic_modulus, arr.thermal_expansion, arr.density
    rho_g = rho * model.gravity * direction
    terms = element_terms(c, p1, q1, p2, q2, length, E, rho_g, NUMERIC)
    k = terms.stiffness
    misfit, q = arr.misfit, arr.distributed_load
    return Assembly(n=n, start=start, end=end, direction=direction, length=length, stiffness=k,
                    modulus=E, expansion=alpha, misfit=misfit, q=q, g_unit_q=terms.g_unit_q,
                    w_self=terms.w_self, g_self=terms.g_self, sections=(c, p1, q1, p2, q2),
                    rho_g=rho_g, terms=terms, chain=chain)


def _is_chain(n, start, end) -> bool:
    """True when segment i runs from station i to station i + 1."""
    m = len(start)
    if m != n - 1 or not m or start[0] != 0 or end[-1] != m:
        return False
    return bool(np.array_equal(start, np.arange(m)) and np.array_equal(end[:-1], start[1:]))


def _read_only(value):
    value.setflags(write=False)
    return value


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
    q_local = q_factor * asm.q if asm.forward else q_factor * asm.q * asm.direction
    delta0, G, W = load_terms(asm.terms, q_local, dT, asm.expansion, asm.length, asm.misfit)
    f_from, f_to = nodal_loads(asm.terms, delta0, G, W)
    if not asm.forward:                  # along each segment's direction, to global
        f_from, f_to = asm.direction * f_from, asm.direction * f_to
    nodal = asm.to_stations(f_from, f_to)
    return nodal, delta0, G, W
