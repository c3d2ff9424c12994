"""The system of one model: its degrees of freedom, one factorisation, contact, recovery.

:class:`System` ties the engine's parts together for one model: the assembly
(:mod:`.assembly`), the unilateral constraints (:mod:`.constraints`), the
degrees of freedom and connectivity check (:mod:`.dofs`), one factorisation
behind a small protocol (:mod:`.factor`), reused for every case, every gap
iteration and every sweep step, the contact search (:mod:`.contact` over the
pure pivoting of :mod:`.pivoting`) and recovery (:mod:`.recovery`).  Closed
gaps are exact constraints: their forces are the unknowns of a small linear
complementarity problem in gap space,

    opening = o0 + M @ force >= 0,  force >= 0,  opening * force = 0,

with ``M = B K^-1 B^T`` built from the one factorisation.
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError, SolveError
from ..model import Model
from ..model.cases import LoadState, load_states
from ..model.temperature import at_temperature, basis_note, has_tables, refuse_tabled_preloads
from ..results import CaseResult, Solution
from .active_set import active_set, active_set_linked, ground_gaps, linked_gaps
from .assembly import Assembly, assemble, element_loads
from .constraints import unilateral
from .contact import solve_gaps
from .dofs import degrees_of_freedom
from .factor import band_of, band_of_run, factorise
from .pivoting import SOLVED
from .recovery import recover

__all__ = ["System", "solve"]


class System:
    """The factorised, gap-free system of one model.

    Parameters
    ----------
    model : Model
    asm : Assembly, optional
        A ready assembly of ``model``.
    method : str
        The factorisation (see :data:`axialfe.engine.factor.METHODS`).

    Raises
    ------
    SolveError
        When some stations are held by no support, spring or gap (a mechanism),
        or the stiffness is singular.
    ModelError
        For an unknown method.
    """

    def __init__(self, model: Model, asm: Assembly | None = None, method: str = "auto"):
        import scipy.sparse as sp

        self.model = model
        self.asm = asm = asm if asm is not None else assemble(model)
        n = asm.n
        self.x = model.arrays.x
        self.cons = cons = unilateral(model, n)
        self.dofs = dofs = degrees_of_freedom(model, asm.start, asm.end, cons)
        self.spring_diagonal = np.bincount(dofs.spring_at, dofs.spring_k,
                                           minlength=n).astype(float, copy=False)
        free = dofs.free
        nf = len(free)
        # the stations' places among the unknowns, and the segments that tie a free
        # station to a restrained one (their -k moves prescribed values to the loads)
        self._fidx = None   # (made on first use: self._free_index)
        # the free stations as a slice where they are one run (a bar held at its ends):
        # reading and writing them then copies nothing
        self._free_at = (slice(int(free[0]), int(free[-1]) + 1)
                         if nf and free[-1] - free[0] + 1 == nf else free)
        held = np.zeros(n, dtype=bool)
        held[dofs.restrained] = True
        held_s, held_e = asm.ends(held)
        # the segments with a restrained end: the only ones whose forces reach a reaction
        self.held_segments = hs = np.flatnonzero(held_s | held_e)
        tie_s, tie_e = hs[~held_s[hs]], hs[~held_e[hs]]   # free start, free end
        tie_s, tie_e = tie_s[held_e[tie_s]], tie_e[held_s[tie_e]]
        # (free and restrained are sorted: a station's place among them by bisection)
        place = np.searchsorted
        self.K_fr = sp.csr_matrix(
            (-np.concatenate([asm.stiffness[tie_s], asm.stiffness[tie_e]]),
             (place(free, np.concatenate([asm.start[tie_s], asm.end[tie_e]])),
              place(dofs.restrained, np.concatenate([asm.end[tie_s], asm.start[tie_e]])))),
            shape=(nf, len(dofs.restrained)))
        # the distinct prescribed stations (for their reactions)
        self.presc_stations = np.unique(dofs.presc)
        self.spring_stations = np.unique(dofs.spring_at)
        self._K = self._abs_K = None
        self.band = self._ground = None
        self.last_contact = None   # ('active-set' or 'exact', factorisations) of the last search
        # without gaps nothing reads the band after its factorisation (the active-set
        # search writes its closed gaps into a copy of it)
        self.factor = (factorise(self._K_ff, method, model.source, band=self._band,
                                 overwrite_band=not len(model.gaps)) if nf else None)
        self._M = None

    @property
    def _free_index(self):
        """Each station's place among the unknowns, -1 where it is restrained."""
        if self._fidx is None:
            self._fidx = np.full(self.asm.n, -1)
            self._fidx[self.free] = np.arange(len(self.free))
        return self._fidx

    def presc_place(self, stations):
        """The places of ``stations`` among :attr:`presc_stations`, -1 where not prescribed."""
        ps = self.presc_stations
        if not len(ps):
            return np.full(len(stations), -1)
        at = np.minimum(np.searchsorted(ps, stations), len(ps) - 1)
        return np.where(ps[at] == stations, at, -1)

    def _band(self):
        """The free-free stiffness as a band over the free stations numbered by x."""
        free, asm = self.free, self.asm
        x = self.x
        xf = x[self._free_at]
        # a chain running toward +x has its stations in increasing x
        rising = asm.chain and asm.forward
        ascending = rising or len(xf) < 2 or bool(np.all(xf[1:] >= xf[:-1]))
        # Eliminate from the end away from the supports: back substitution then ends
        # at the supported end, whose small displacements are not computed from the
        # large ones of the far end (an unloaded segment there keeps an exact zero force).
        x_held = x[self.restrained]
        middle = 0.5 * (x[0] + x[-1]) if rising else 0.5 * (x.min() + x.max())
        lower = np.count_nonzero(x_held < middle) if len(xf) else 0
        reverse = 2 * lower > len(x_held)
        if ascending and not reverse:
            order, pos = None, self._free_index if not rising else None
        else:
            order = np.arange(len(xf)) if ascending else np.argsort(xf, kind="stable")
            if reverse:
                order = order[::-1].copy()
            pos = np.full(asm.n, -1)
            pos[free[order]] = np.arange(len(free))
        run = self._free_at
        if asm.chain and order is None and isinstance(run, slice):
            band = band_of_run(run.start, run.stop, asm.stiffness, self.spring_diagonal)
        else:
            pos = self._free_index if pos is None else pos
            band = band_of(len(free), pos, asm.start, asm.end, asm.stiffness,
                           self.spring_diagonal, held=self.held_segments, ends=asm.ends)
        band.order = order
        self.band = band
        return band

    def _K_ff(self):
        free = self.free
        return self.K.tocsc()[free][:, free]

    @property
    def K(self):
        """The global stiffness, springs included (scipy.sparse, built on first use)."""
        if self._K is None:
            import scipy.sparse as sp

            self._K = self.asm.K + sp.diags(self.spring_diagonal, format="csr")
        return self._K

    @property
    def abs_K(self):
        """|K| entrywise (built on first use)."""
        if self._abs_K is None:
            self._abs_K = abs(self.K)
        return self._abs_K

    def stiffness_times(self, u, magnitude=False):
        """``K @ u`` (or ``|K| @ u`` with ``magnitude``) from the segment arrays, for u (n,)."""
        asm = self.asm
        k = asm.stiffness
        if magnitude:
            t = k * (u[asm.start] + u[asm.end])
            return (np.bincount(asm.start, t, minlength=asm.n)
                    + np.bincount(asm.end, t, minlength=asm.n) + self.spring_diagonal * u)
        t = k * (u[asm.end] - u[asm.start])
        return (np.bincount(asm.end, t, minlength=asm.n)
                - np.bincount(asm.start, t, minlength=asm.n) + self.spring_diagonal * u)

    # the parts of the system that recovery, contact and sweeps read
    clearance = property(lambda self: self.cons.clearance)
    B = property(lambda self: self.cons.B)
    BT = property(lambda self: self.cons.BT)
    presc = property(lambda self: self.dofs.presc)
    presc_support = property(lambda self: self.dofs.presc_support)
    spring_support = property(lambda self: self.dofs.spring_support)
    spring_at = property(lambda self: self.dofs.spring_at)
    spring_k = property(lambda self: self.dofs.spring_k)
    free = property(lambda self: self.dofs.free)
    restrained = property(lambda self: self.dofs.restrained)
    n_parts = property(lambda self: self.dofs.n_parts)
    part_label = property(lambda self: self.dofs.part_label)
    E = property(lambda self: self.dofs.E)

    # --- linear algebra ---------------------------------------------------
    def solve_free(self, rhs):
        """Solve the free-free system for ``rhs`` (n_free,) or (n_free, k) by the one factorisation."""
        if self.factor is None:
            return np.zeros_like(rhs)
        x = self.factor.solve(rhs)
        if not np.all(np.isfinite(x)):
            raise SolveError("the linear solve gave non-finite values; the model is singular or "
                             "badly scaled", file=self.model.source)
        return x

    def displacements(self, F, u_presc, gap_force=None, shift=None):
        """Solve K u = F - B^T force with prescribed station values.

        ``F`` may be one vector (n,) or a block (n, k) of right-hand sides.
        """
        F = np.asarray(F, dtype=float)
        u = np.zeros_like(F)
        u[self.presc] = u_presc
        rhs = F
        if gap_force is not None and len(self.model.gaps):
            rhs = rhs - self.BT @ gap_force
        u_r = u[self.restrained]
        b = rhs[self._free_at]
        if np.any(u_r):              # (else K_fr u_r is zero, and b - 0 is b)
            b = b - self.K_fr @ u_r
        u[self._free_at] = self.solve_free(b)
        if shift is not None and self.n_parts:
            u = u + self.E @ shift
        return u

    @property
    def gap_matrix(self):
        """M = B K^-1 B^T over the free stations, and H = B E (rigid parts)."""
        if self._M is None:
            g = len(self.model.gaps)
            Bf = self.B[:, self.free].tocsc()
            M = np.zeros((g, g))
            block = 256
            for j0 in range(0, g, block):
                cols = Bf[j0:j0 + block].toarray().T
                if cols.size:
                    M[:, j0:j0 + block] = Bf @ self.solve_free(cols)
            M = 0.5 * (M + M.T)
            H = (self.B @ self.E).toarray() if self.n_parts else np.zeros((g, 0))
            self._M = (M, H)
        return self._M

    def gap_block(self, rows):
        """``M[rows][:, rows]`` of :attr:`gap_matrix` (rows: indices of gaps), from solves of
        those gaps alone where the whole M has not been built."""
        if self._M is not None:
            return self._M[0][np.ix_(rows, rows)]
        Bf = self.B[rows][:, self.free].tocsc()
        block = Bf @ self.solve_free(Bf.toarray().T) if len(rows) else np.zeros((0, 0))
        return 0.5 * (block + block.T)

    # --- one load state ----------------------------------------------------
    def state_vectors(self, state: LoadState):
        """Return (F, u_presc, element terms) of a load state."""
        nodal, delta0, G, W = element_loads(self.asm, state.dT, state.q_factor)
        F = nodal
        F += state.forces          # (the nodal loads are made here, for F alone)
        return F, state.settlement[self.presc_support], (delta0, G, W)

    def gap_problem(self, F, u_presc):
        """Return (o0, f): openings with all gaps open and the loads on rigid parts."""
        u0 = self.displacements(F, u_presc)
        o0 = self.clearance - self.B @ u0
        f = self.E.T @ F if self.n_parts else np.zeros(0)
        return o0, f

    def solve_state(self, state: LoadState) -> CaseResult:
        """Solve one load state, gaps included."""
        F, u_presc, terms = self.state_vectors(state)
        lam, shift, closed = self.contact(F, u_presc, state.name, with_state=True)
        u = self.displacements(F, u_presc, lam, shift)
        u.setflags(write=False)   # made here for the result alone, which keeps it uncopied
        return self.recover(state, u, F, lam, terms, closed)

    def contact(self, F, u_presc, label="", with_state=False):
        """Find the gap forces (compression or tension magnitudes) and rigid shifts.

        With ``with_state``, also return the closed set the search ended with.
        """
        g = len(self.model.gaps)
        if g == 0:
            none = (np.zeros(0), np.zeros(self.n_parts))
            return none + (np.zeros(0, dtype=bool),) if with_state else none
        o0, f = self.gap_problem(F, u_presc)
        at = self._ground_gaps()
        if at is not None:
            found = self._active_set(at, F, u_presc, o0)
            if found is not None:
                return found if with_state else found[:2]
        M, H = self.gap_matrix
        self.last_contact = ("exact", 0)
        return solve_gaps(M, H, o0, f, self, label, with_state=with_state)

    def _ground_gaps(self):
        """Where the banded active-set search applies (else None): the band positions of
        the gaps, each to ground at its own free station, or ``(a, b)``, the positions of
        every gap's stations (``b`` -1 against ground) when all are free stations."""
        if self._ground is None:
            at = None
            if (self.band is not None and getattr(self.factor, "method", None) == "banded"
                    and self.n_parts == 0):
                order = self.band.order
                inverse = None
                if order is not None:
                    inverse = np.empty_like(order)
                    inverse[order] = np.arange(len(order))
                at = ground_gaps(self.cons, self._free_index, inverse)
                if at is None:
                    at = linked_gaps(self.cons, self._free_index, inverse)
            self._ground = (at,)
        return self._ground[0]

    def _active_set(self, at, F, u_presc, o0):
        """(forces, shifts, closed) by the banded active-set search, or None where it cycles."""
        u = np.zeros(self.asm.n)
        u[self.presc] = u_presc
        b = F[self.free] - self.K_fr @ u[self.restrained]
        if self.band.order is not None:
            b = b[self.band.order]
        scale_q = max(np.abs(o0).max(initial=0), self.clearance.max(initial=0), 1e-300)
        start = o0 < -1e-11 * scale_q
        if isinstance(at, tuple):       # gaps between two stations: multiplier rows
            at_a, at_b, sign_a, sign_b, held, sign_held = at
            # a gap joined to a supported station: its clearance less that station's share
            clearance = self.clearance - sign_held * u[np.maximum(held, 0)] * (held >= 0)
            lam, closed, status, its = active_set_linked(self.band, at_a, at_b, sign_a, sign_b,
                                                         clearance, b, start, scale_q)
        else:
            lam, closed, status, its = active_set(self.band, at, self.cons.s1, self.clearance,
                                                  b, start, scale_q)
        self.last_contact = ("active-set" if status == SOLVED else "exact", its)
        if status != SOLVED:
            return None
        return lam, np.zeros(0), closed

    # --- recovery ----------------------------------------------------------
    def recover(self, state: LoadState, u, F, lam, terms, closed=None,
                magnitudes=None) -> CaseResult:
        """Segment forces, stresses, reactions and the certificate (see :func:`.recovery.recover`)."""
        return recover(self, state, u, F, lam, terms, closed, magnitudes)


def solve(model: Model, method: str = "auto") -> Solution:
    """Solve every case and combination of a model.

    Parameters
    ----------
    model : Model
    method : {'auto', 'banded', 'sparse-lu'}
        The factorisation of the stiffness (one for all cases): the banded
        Cholesky of the unknowns numbered by x, the sparse LU, or ``'auto'``
        (the band where it is narrow).

    Examples
    --------
    A bar between rigid walls with a load P at a third of its length takes
    P*b/L at the left wall and P*a/L at the right one:

    >>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Model
    >>> steel, rod = Material("steel", 200e9), Section("rod", "area", (("area", 1e-4),))
    >>> model = Model([Station("A", 0.0), Station("C", 1.0), Station("B", 3.0)],
    ...               [Segment("AC", "A", "C", steel, rod), Segment("CB", "C", "B", steel, rod)],
    ...               [Support("A"), Support("B")], [Load("C", 9000.0)])
    >>> case = solve(model)["base"]
    >>> [round(case.reaction(s), 9) for s in ("A", "B")]  # -P*b/L, -P*a/L
    [-6000.0, -3000.0]
    """
    from .preload import resolve_preloads  # it solves models itself

    # the array form: an array model makes no object per segment here
    refuse_tabled_preloads(model)
    model = resolve_preloads(model)  # a preload is a force: find its misfit first
    if has_tables(model):
        return Solution(model, tuple(_solve_at_temperature(model, s, method)
                                     for s in load_states(model)))
    system = System(model, method=method)
    return Solution(model, tuple(system.solve_state(s) for s in load_states(model)))


def _solve_at_temperature(model, state, method):
    """One case of a model with tables: its own system at its segments' temperatures."""
    import dataclasses

    result = System(at_temperature(model, state), method=method).solve_state(state)
    return dataclasses.replace(result, notes=result.notes + (basis_note(model),))
