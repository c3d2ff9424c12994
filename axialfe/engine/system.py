"""Solvers: the factorised linear system, the gap (contact) search, and recovery.

:class:`System` factorises the gap-free stiffness of a model once and reuses it
for every case, every gap iteration and every sweep step.  Closed gaps are
exact constraints: their forces are the unknowns of a small linear
complementarity problem (LCP) in gap space,

    opening = o0 + M @ force >= 0,  force >= 0,  opening * force = 0,

with ``M = B K^-1 B^T`` built from the one factorisation.  A model whose parts
all have supports gives a positive definite M, solved by block principal
pivoting with a single-pivot fallback (finite for such M).  A part held only by
gaps adds its rigid-body shift as an unknown and the balance of its loads as a
constraint; that mixed problem is solved by Lemke's method, which either finds
the equilibrium or proves there is none.
"""

from __future__ import annotations

import numpy as np

from ..mechanics import Fields, end_forces
from .assembly import Assembly, assemble, element_loads
from ..errors import SolveError
from ..model.cases import LoadState, load_states
from ..model import Model
from ..results import CaseResult, Solution
from .certificate import check_unique_gaps, compatibility, status_of

__all__ = ["System", "solve"]

_EPS = np.finfo(float).eps


def _names(names, most=8):
    names = [f"'{n}'" for n in names]
    if len(names) > most:
        return ", ".join(names[:most]) + f" and {len(names) - most} more"
    return ", ".join(names)


class System:
    """The factorised, gap-free system of one model.

    Parameters
    ----------
    model : Model
    asm : Assembly, optional
        A ready assembly of ``model``.

    Raises
    ------
    SolveError
        When some stations are held by no support, spring or gap (a mechanism).
    """

    def __init__(self, model: Model, asm: Assembly | None = None):
        import scipy.sparse as sp
        from scipy.sparse.csgraph import connected_components

        self.model = model
        self.asm = asm = asm if asm is not None else assemble(model)
        n = asm.n
        self.x = np.array([st.x for st in model.stations], dtype=float)
        index = model._station_index
        sup = model.supports
        self.presc_support = np.array([j for j, s in enumerate(sup) if s.kind != "spring"], dtype=int)
        self.presc = np.array([index[sup[j].at] for j in self.presc_support], dtype=int)
        self.spring_support = np.array([j for j, s in enumerate(sup) if s.kind == "spring"], dtype=int)
        self.spring_at = np.array([index[sup[j].at] for j in self.spring_support], dtype=int)
        self.spring_k = np.array([sup[j].stiffness for j in self.spring_support], dtype=float)
        self.K = asm.K + sp.diags(np.bincount(self.spring_at, self.spring_k, minlength=n).astype(float),
                                  format="csr")

        gaps = model.gaps
        g = len(gaps)
        self.gap_a = np.array([index[gp.stations[0]] for gp in gaps], dtype=int)
        self.gap_b = np.array([index[gp.stations[1]] if len(gp.stations) == 2 else -1
                               for gp in gaps], dtype=int)
        signs = np.array([gp.sign for gp in gaps], dtype=float).reshape(g, 2)
        self.gap_s1, self.gap_s2 = signs[:, 0], signs[:, 1]
        self.clearance = np.array([gp.clearance for gp in gaps], dtype=float)
        two = self.gap_b >= 0
        rows = np.concatenate([np.arange(g), np.flatnonzero(two)])
        cols = np.concatenate([self.gap_a, self.gap_b[two]])
        vals = np.concatenate([self.gap_s1, self.gap_s2[two]])
        self.B = sp.csr_matrix((vals, (rows, cols)), shape=(g, n))
        self.BT = self.B.T.tocsr()

        # Connectivity, from the model alone, before any factorisation.
        held = np.zeros(n, dtype=bool)
        held[self.presc] = True
        held[self.spring_at] = True
        seg = sp.coo_matrix((np.ones(len(asm.start)), (asm.start, asm.end)), shape=(n, n))
        n_seg, seg_label = connected_components(seg, directed=False)
        gap_edges = sp.coo_matrix((np.ones(int(two.sum())), (self.gap_a[two], self.gap_b[two])),
                                  shape=(n, n))
        n_all, all_label = connected_components(seg + gap_edges, directed=False)
        grounded = held.copy()
        grounded[self.gap_a[~two]] = True
        comp_grounded = np.bincount(all_label, grounded, minlength=n_all) > 0
        names = [st.name for st in model.stations]
        used = np.zeros(n, dtype=bool)
        used[asm.start] = used[asm.end] = True
        used[self.gap_a] = True
        used[self.gap_b[two]] = True
        for c in np.flatnonzero(~comp_grounded):
            members = [names[i] for i in np.flatnonzero(all_label == c)]
            line = model.line_of(f"stations.{members[0]}")
            if len(members) == 1 and not used[all_label == c].any():
                raise SolveError(f"station '{members[0]}' is not connected to any "
                                 "segment or gap and has no support; remove it or connect it",
                                 file=model.source, line=line)
            raise SolveError(f"stations {_names(members)} float: no support, spring or "
                             "gap holds them (a rigid-body mechanism); add a support or connect "
                             "them", file=model.source, line=line)
        comp_held = np.bincount(seg_label, held, minlength=n_seg) > 0
        free_comps = np.flatnonzero(~comp_held)
        # A part held only through gaps: its first station is an anchor, and its
        # rigid shift is solved with the gap forces.
        self.part_label = np.full(n, -1)
        anchors = []
        for p, c in enumerate(free_comps):
            members = np.flatnonzero(seg_label == c)
            self.part_label[members] = p
            anchors.append(members[0])
        self.n_parts = len(free_comps)
        self.anchors = np.array(anchors, dtype=int)
        restrained = np.zeros(n, dtype=bool)
        restrained[self.presc] = True
        restrained[self.anchors] = True
        self.free = np.flatnonzero(~restrained)
        self.restrained = np.flatnonzero(restrained)
        self.E = sp.csr_matrix((np.ones(int((self.part_label >= 0).sum())),
                                (np.flatnonzero(self.part_label >= 0),
                                 self.part_label[self.part_label >= 0])), shape=(n, self.n_parts))
        Kc = self.K.tocsc()
        self.K_fr = Kc[self.free][:, self.restrained].tocsr()
        self._lu = None
        if len(self.free):
            from scipy.sparse.linalg import splu

            K_ff = Kc[self.free][:, self.free].tocsc()
            try:
                self._lu = splu(K_ff)
            except RuntimeError as exc:
                raise SolveError(f"the stiffness matrix is singular ({exc}); check for "
                                 "segments of vanishing stiffness", file=model.source) from exc
        self._M = None
        self._abs_K = abs(self.K)

    # --- linear algebra ---------------------------------------------------
    def _solve_free(self, rhs):
        if self._lu is None:
            return np.zeros_like(rhs)
        x = self._lu.solve(np.ascontiguousarray(rhs))
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
        rhs = F.copy()
        if gap_force is not None and len(self.model.gaps):
            rhs = rhs - self.BT @ gap_force
        u_r = u[self.restrained]
        u[self.free] = self._solve_free(rhs[self.free] - self.K_fr @ u_r)
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
                    M[:, j0:j0 + block] = Bf @ self._solve_free(cols)
            M = 0.5 * (M + M.T)
            H = (self.B @ self.E).toarray() if self.n_parts else np.zeros((g, 0))
            self._M = (M, H)
        return self._M

    # --- one load state ----------------------------------------------------
    def state_vectors(self, state: LoadState):
        """Return (F, u_presc, element terms) of a load state."""
        nodal, delta0, G, W = element_loads(self.asm, state.dT, state.q_factor)
        F = state.forces + nodal
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
        M, H = self.gap_matrix
        return solve_gaps(M, H, o0, f, self, label, with_state=with_state)

    # --- recovery ----------------------------------------------------------
    def recover(self, state: LoadState, u, F, lam, terms, closed=None,
                magnitudes=None) -> CaseResult:
        """Segment forces, stresses, reactions and the equilibrium residual from u.

        ``closed`` is the gap state the search ended with; without it a gap counts
        as closed where its opening is zero to rounding.  ``magnitudes`` bounds the
        size of the numbers u, F, lam and the terms were computed from, as
        (|u|, |F|, |lam|, |delta0|, |G|, |W|), when they come from a sum (a sweep's
        a + s*b) that may have cancelled; it sets the rounding bounds below.
        """
        asm, model = self.asm, self.model
        delta0, G, W = terms
        mu, mF, mlam, md0, mG, mW = magnitudes if magnitudes is not None else (
            np.abs(u), np.abs(F), np.abs(lam), np.abs(delta0), np.abs(G), np.abs(W))
        e = asm.direction
        du = e * (u[asm.end] - u[asm.start])
        k = asm.stiffness
        n_from, _ = end_forces(asm.terms, du, delta0, G, W)
        # rounding bound of N: du is a difference of two displacements, so its error
        # scales with their size, not with du itself
        noise = 1e3 * _EPS * (k * (mu[asm.start] + mu[asm.end] + md0 + mG) + mW)
        n_from = np.where(np.abs(n_from) < noise, 0.0, n_from)
        n_to = n_from - W                     # the element's N_to, from the N_from kept
        n_to = np.where(np.abs(n_to) < noise, 0.0, n_to)
        N = np.column_stack([n_from, n_to])
        x = self.x
        fields = Fields.of(n_from, state.q_factor * asm.q * e, asm.rho_g, *asm.factors.T,
                           asm.length, asm.modulus, end_force=N, x_from=x[asm.start],
                           x_to=x[asm.end])

        g = len(model.gaps)
        gap_nodal = self.BT @ lam if g else np.zeros(asm.n)
        Ku = self.K @ u
        R_station = Ku - F + gap_nodal
        noise_R = 1e3 * _EPS * (self._abs_K @ mu + mF + (abs(self.BT) @ mlam if g else 0.0))
        R_station = np.where(np.abs(R_station) < noise_R, 0.0, R_station)
        reactions = np.zeros(len(model.supports))
        reactions[self.presc_support] = R_station[self.presc]
        spring_force = -self.spring_k * u[self.spring_at]
        reactions[self.spring_support] = spring_force
        # (K includes the springs, so R_station at a prescribed station is already the
        # prescribed support's own share, whatever spring stands beside it)

        # Station balance from the recovered segment forces: an independent check.
        balance = (state.forces + np.bincount(asm.start, e * n_from, minlength=asm.n)
                   - np.bincount(asm.end, e * n_to, minlength=asm.n) - gap_nodal)
        balance += np.bincount(self.spring_at, spring_force, minlength=asm.n)
        sup_at = np.array([model._station_index[s.at] for s in model.supports], dtype=int)
        presc_reac = np.bincount(sup_at[self.presc_support], reactions[self.presc_support],
                                 minlength=asm.n)
        balance += presc_reac
        # out-of-balance at the level of rounding (the same bound that zeroes noise in
        # forces) is no imbalance: it cannot be told from a force that is truly zero
        station_noise = (np.bincount(asm.start, noise, minlength=asm.n)
                         + np.bincount(asm.end, noise, minlength=asm.n) + noise_R)
        balance = np.where(np.abs(balance) <= station_noise, 0.0, balance)
        # the forces the free changes of length and the loads would cause if held count
        # too: free thermal growth has no force of its own to measure rounding against
        scale = max(np.abs(state.forces).max(initial=0), np.abs(reactions).max(initial=0),
                    np.abs(N).max(initial=0), np.abs(lam).max(initial=0),
                    np.abs(k * delta0).max(initial=0), np.abs(k * G).max(initial=0),
                    np.abs(W).max(initial=0))
        residual = float(np.abs(balance).max() / scale) if scale > 0 else 0.0

        opening = self.clearance - self.B @ u if g else np.zeros(0)
        if closed is None:
            closed = opening <= _gap_tol(self, u, delta0, F) if g else np.zeros(0, dtype=bool)
        closed = np.asarray(closed, dtype=bool)
        # the rest of the certificate: compatibility, and gap forces that are unique
        tol_gap = _gap_tol(self, u, delta0, F)
        defect, defect_at = compatibility(self, u, du, n_from, terms, lam, closed, tol_gap)
        check_unique_gaps(self, lam, closed, opening, tol_gap, state.name)
        # an overlap at the level of rounding shows as 0; a real one would stay visible
        tiny = (opening < 0) & (opening >= -_gap_tol(self, u, delta0, F)) if g else closed
        opening = np.where(closed | tiny, 0.0, opening)
        sign = np.array([-1.0 if gp.kind == "contact" else 1.0 for gp in model.gaps])
        gap_force = sign * lam if g else np.zeros(0)
        gap_force = np.where(gap_force == 0, 0.0, gap_force)

        area = asm.area
        stress = N / area
        E = asm.modulus[:, None]
        flex_part = du - delta0  # elastic part of the elongation (N/EA integrated)
        return CaseResult(
            name=state.name, model=model, u=u, axial_force=N, stress=stress,
            mechanical_strain=stress / E, elongation=du,
            elastic_elongation=flex_part, thermal_elongation=asm.expansion * state.dT * asm.length,
            thermal_strain=asm.expansion * state.dT, temperature_change=state.dT,
            length=asm.length, reactions=reactions, applied=state.forces, gap_force=gap_force,
            gap_opening=opening, gap_closed=closed, equilibrium_residual=residual, fields=fields,
            compatibility_defect=defect,
            **dict(zip(("status", "message"), status_of(residual, defect, defect_at))))


def _gap_tol(system, u, delta0=None, F=None):
    """Rounding bound of a gap opening: displacements, clearances, free changes of length
    (thermal strain and misfit) and the stretch the loads could cause set the scale of the
    numbers it is computed from."""
    scale = max(np.abs(u).max(initial=0), system.clearance.max(initial=0),
                0.0 if delta0 is None else np.abs(delta0).max(initial=0),
                0.0 if F is None else np.abs(F).max(initial=0) / system.asm.stiffness.min())
    return 1e-10 * scale + 1e-300


def _bpp(M, q, scale_q, names):
    """Block principal pivoting for the LCP w = q + M z (M symmetric positive definite).

    Returns z.  Falls back to one pivot at a time (Murty's least-index rule,
    finite for P-matrices) when the number of infeasibilities stops falling.
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
                # gaps acting on dependent motions: M is only semidefinite here, which
                # Lemke's method handles; the forces are unique only if the gaps the
                # answer closes are independent
                return _semidefinite(M, q, names, closed)
            z[closed] = cho_solve(factor, -q[closed], check_finite=False)
        w = q + M @ z
        bad = (closed & (z < -tol_z)) | (~closed & (w < -tol_w))
        count = int(bad.sum())
        if count == 0:
            return np.where(closed, np.maximum(z, 0.0), 0.0), closed
        if count < best:
            best, budget = count, 3
            closed = closed ^ bad
        elif budget > 0:
            budget -= 1
            closed = closed ^ bad
        else:
            i = int(np.flatnonzero(bad)[-1])
            closed[i] = not closed[i]
    raise SolveError("the contact search did not settle")  # not reached for PD matrices


def _semidefinite(M, q, names, tried):
    """The LCP of a semidefinite M (redundant gaps), by Lemke's method."""
    n = len(q)
    z, basic = _lemke(M, q, 100 * n + 100)
    if z is not None:
        sub = M[np.ix_(basic, basic)]
        if not basic.any() or np.linalg.matrix_rank(sub) == int(basic.sum()):
            return np.where(basic, np.maximum(z, 0.0), 0.0), basic
        tried = basic
    raise SolveError("the contact state is not unique: gaps "
                     f"{_names([names[i] for i in np.flatnonzero(tried)])} act together on the "
                     "same stations, so their forces cannot be told apart; remove the redundant "
                     "gap")


def _lemke(Mb, qb, max_iter):
    """Lemke's complementary pivoting for w = qb + Mb z; returns z or None (no solution)."""
    n = len(qb)
    if np.all(qb >= 0):
        return np.zeros(n), np.zeros(n, dtype=bool)
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
            return z, in_basis
        entering = leaving + n if leaving < n else leaving - n
        col = T[:, entering]
        ok = col > 1e-12 * scale
        if not ok.any():
            return None, None
        ratios = np.full(n, np.inf)
        ratios[ok] = T[ok, -1] / col[ok]
        rmin = ratios.min()
        ties = np.flatnonzero(ratios <= rmin + 1e-12 * max(1.0, abs(rmin)))
        # prefer z0 leaving on a tie, so the search ends as soon as it can
        zrow = [i for i in ties if basis[i] == 2 * n]
        r = int(zrow[0]) if zrow else int(ties[0])
    raise SolveError("the contact search did not settle within its pivot limit")


def solve_gaps(M, H, o0, f, system, label="", with_state=False):
    """Solve the gap LCP; return (gap forces, rigid shifts of gap-held parts).

    With ``with_state``, also return the closed set the pivoting ended with (the
    gaps whose force is a basic variable), which is sharper than any tolerance on
    the openings just past a change of state.
    """
    model = system.model
    names = [gp.name for gp in model.gaps]
    scale_q = max(np.abs(o0).max(initial=0), system.clearance.max(initial=0), 1e-300)
    where = f" in case '{label}'" if label else ""
    if system.n_parts == 0:
        lam, closed = _bpp(M, o0, scale_q, names)
        return (lam, np.zeros(0), closed) if with_state else (lam, np.zeros(0))
    g, p = H.shape
    Mb = np.block([[M, -H, H], [H.T, np.zeros((p, 2 * p))], [-H.T, np.zeros((p, 2 * p))]])
    qb = np.concatenate([o0, -f, f])
    z, basic = _lemke(Mb, qb, 100 * (g + 2 * p) + 100)
    stations = [st.name for st in model.stations]
    if z is None:
        parts = _part_text(system, stations)
        touching = [names[j] for j in range(g) if np.any(H[j] != 0)]
        raise SolveError(f"no equilibrium{where}: {parts} held only by gap(s) "
                         f"{_names(touching)}, and the gaps cannot hold the load on it "
                         "(the part floats while the gap is open)", file=model.source,
                         line=model.line_of(f"gaps.{touching[0]}") if touching else None)
    lam, shift = z[:g], z[g:g + p] - z[g + p:]
    opening = o0 + M @ lam - H @ shift
    closed = opening <= 1e-10 * scale_q
    for c in range(p):
        if not np.any(closed & (H[:, c] != 0)):
            members = [stations[i] for i in np.flatnonzero(system.part_label == c)]
            touching = [names[j] for j in range(g) if H[j, c] != 0]
            raise SolveError(f"the equilibrium{where} is not unique: stations {_names(members)} "
                             f"are held only by gap(s) {_names(touching)}, which stay open with "
                             "no load pressing the part against them; add a support or a load",
                             file=model.source,
                             line=model.line_of(f"gaps.{touching[0]}") if touching else None)
    return (lam, shift, basic[:g]) if with_state else (lam, shift)


def _part_text(system, stations):
    parts = []
    for c in range(system.n_parts):
        members = [stations[i] for i in np.flatnonzero(system.part_label == c)]
        parts.append(f"the part with stations {_names(members)}")
    return " and ".join(parts) + (" is" if len(parts) == 1 else " are")


def solve(model: Model) -> Solution:
    """Solve every case and combination of a model.

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
    system = System(model)
    return Solution(model, tuple(system.solve_state(s) for s in load_states(model)))
