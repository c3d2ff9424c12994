"""The certificate of a solved case: compatibility and the uniqueness of gap forces.

The recovery computes the balance of forces at every station (the equilibrium
residual).  Balance alone can pass a wrong answer: a closed gap whose stations
do not touch, an open gap that carries a force, a contact that pulls.  This
module re-checks what the displacements say against what the result reports:

- each segment's change of length, from its stations' displacements, against
  its free change of length plus the integral of N/EA from the recovered force;
- each closed gap's opening, recomputed from the displacements, is zero;
- each open gap carries no force and does not overlap;
- no contact pulls and no link pushes (gap force magnitudes are not negative).

The worst of these, relative to the size of the numbers it is computed from, is
the compatibility defect; with the equilibrium residual it gives the status.
Gaps whose constraints are dependent (the same constraint twice, or a set
whose sum is fixed) leave their forces without a unique split: the solve is
refused, naming them.
"""

from __future__ import annotations

import numpy as np

from ..errors import SolveError
from ..results import RESIDUAL_BOUND, certify

__all__ = ["compatibility", "check_unique_gaps", "status_of"]

# a dependent set of constraints shows as a Cholesky pivot this small relative to its diagonal
_DEPENDENT = 1e-9


def compatibility(system, u, du, n_from, terms, lam, closed, tol_gap, sizes=None):
    """Return ``(defect, where)``: the worst relative compatibility defect and its place.

    Parameters
    ----------
    system : System
    u : ndarray
        Station displacements.
    du : ndarray
        Each segment's change of length along its own direction.
    n_from : ndarray
        The recovered force at each segment's ``from`` end.
    terms : tuple
        ``(delta0, G, W)`` of the load state.
    lam : ndarray
        Gap force magnitudes (compression of a contact, tension of a link).
    closed : ndarray of bool
    tol_gap : float
        The rounding bound of a gap opening (it sets the length scale).
    sizes : tuple of float, optional
        The largest magnitudes of u, delta0 and G, where the caller knows them.
    """
    delta0, G, _ = terms
    k = system.asm.stiffness
    worst, where = 0.0, None
    names = system.model.segments
    if len(k):
        # elastic part of the elongation from the recovered force: N_from/k - G
        if k.min() > 0:
            stretch = n_from / k
        else:
            with np.errstate(divide="ignore", invalid="ignore"):
                stretch = np.where(k > 0, n_from / k, 0.0)
        # the scale of the terms subtracted: N/k and G cancel where a held bar carries a
        # load with no elastic elongation, and their rounding is no defect
        size_u, size_d0, size_G = (sizes if sizes is not None else
                                   (_largest(u), _largest(delta0), _largest(G)))
        scale = max(size_u, size_d0, _largest(stretch), size_G, 1e-300)
        elastic = stretch
        elastic -= G                     # N_from/k - G, in the array of N_from/k
        seg = du - delta0
        seg -= elastic
        np.abs(seg, out=seg)
        seg /= scale
        i = int(np.argmax(seg))
        if seg[i] > worst:
            worst, where = float(seg[i]), f"segment '{names[i].name}' (elongation)"
    g = len(system.model.gaps)
    if g:
        gaps = system.model.gaps
        length_scale = max(tol_gap * 1e10, 1e-300)
        raw = system.clearance - system.B @ u
        shut = np.where(closed, np.abs(raw), np.maximum(-raw, 0.0)) / length_scale
        j = int(np.argmax(shut))
        if shut[j] > worst:
            state = "closed gap" if closed[j] else "open gap"
            worst, where = float(shut[j]), f"{state} '{gaps[j].name}' (opening)"
        # forces are measured against those the length scale would cause in the stiffest
        # segment, so rounding of a force that is truly zero is no defect
        force_scale = max(np.abs(lam).max(initial=0.0), np.abs(n_from).max(initial=0.0),
                          float(k.max(initial=0.0)) * length_scale * 1e-10, 1e-300)
        bad_force = np.where(closed, np.maximum(-lam, 0.0), np.abs(lam)) / force_scale
        j = int(np.argmax(bad_force))
        if bad_force[j] > worst:
            what = "sign of the force" if closed[j] else "force of an open gap"
            worst, where = float(bad_force[j]), f"gap '{gaps[j].name}' ({what})"
    return worst, where


def _largest(values) -> float:
    """The largest magnitude in ``values`` (0 for none), without an array of magnitudes."""
    return max(float(np.max(values, initial=0.0)), -float(np.min(values, initial=0.0)))


def check_unique_gaps(system, lam, closed, opening, tol_gap, label=""):
    """Refuse a contact state whose gap forces have no unique split.

    The active gaps (closed, or open with an opening at rounding level) must act
    on independent motions: their block of ``M = B K^-1 B^T`` must be positive
    definite.  Two identical gaps, or gaps whose openings sum to a fixed value,
    make it singular; then the total is known but not its split, and the solve
    stops naming them.  A part held only by gaps adds its rigid shifts H: the
    split is unique when no force pattern z has both ``M z = 0`` and
    ``H^T z = 0``, that is when ``M + c H H^T`` is definite on the active gaps.
    """
    if not len(lam):
        return
    active = closed | (np.abs(opening) <= tol_gap)
    if int(active.sum()) < 2 or _independent(system, active):
        return
    if system.n_parts:
        M, H = system.gap_matrix
        sub = M[np.ix_(active, active)]
    else:   # the block of the active gaps alone (the many-gap case never builds all of M)
        H, sub = np.zeros((len(lam), 0)), system.gap_block(np.flatnonzero(active))
    if H.shape[1]:
        Ha = H[active]
        c = max(float(np.abs(np.diag(sub)).max(initial=0.0)), 1e-300) if sub.size else 1.0
        c = c if c > 1e-300 else 1.0
        sub = sub + c * (Ha @ Ha.T)
    index = np.flatnonzero(active)
    dependent = _dependent(sub)
    if dependent is None:
        return
    names = [system.model.gaps[index[i]].name for i in dependent]
    shown = ", ".join(f"'{n}'" for n in names[:8]) + (
        f" and {len(names) - 8} more" if len(names) > 8 else "")
    where = f" in case '{label}'" if label else ""
    model = system.model
    raise SolveError(f"the gap forces{where} are not unique: gaps {shown} act on dependent "
                     "motions (the same constraint twice, or openings whose sum is fixed), so "
                     "only their total is known; remove the redundant gap",
                     file=model.source, line=model.line_of(f"gaps.{names[0]}"))


def _independent(system, active) -> bool:
    """True when the active gaps' constraints are independent by their layout alone.

    Every part has a support, and each gap's row of B over the free stations joins
    its free stations (two, or one against ground, where the other is ground or held
    by a support).  Taken as edges between stations and ground, rows that form a
    forest (no cycle, no gap twice, none on held stations alone) are independent: a
    leaf's row is the only one with its station, and removing it leaves a forest.
    Then ``M = B K^-1 B^T`` is positive definite on them with K, and the dense block
    of M is not needed (the many-gap case, where it would cost gaps x gaps).  This is
    the layout of gaps each on its own free station against ground, and of gaps
    between stations along a chain that close no loop.
    """
    from .dofs import connected_components

    cons = system.cons
    if system.n_parts:
        return False
    rows = np.flatnonzero(active)
    two = cons.b[rows] >= 0
    if np.any(cons.s1[rows] == 0) or np.any(two & (cons.s2[rows] == 0)):
        return False
    n = system.asm.n
    fidx = system._free_index
    a = cons.a[rows]
    b = np.where(two, cons.b[rows], 0)
    a = np.where(fidx[a] >= 0, a, n)                       # a held station is ground
    b = np.where(two & (fidx[b] >= 0), b, n)
    if np.any(a == b):        # a row with no free station, or one station twice
        return False
    count, _ = connected_components(n + 1, a, b)
    return count == n + 1 - len(rows)


def _dependent(sub):
    """The indices of a dependent subset of a PSD matrix's rows, or None if it is definite.

    A pivoted Cholesky: the first pivot that is negligible against its diagonal
    names a row that depends on the rows already taken.
    """
    from scipy.linalg import cho_factor

    n = len(sub)
    A = np.array(sub, dtype=float)
    diag = np.maximum(np.diag(A).copy(), 1e-300)
    try:  # the fast path: a definite block has no negligible pivot
        factor, _ = cho_factor(A, lower=True, check_finite=False)
        if np.all(np.diag(factor) ** 2 > _DEPENDENT * diag):
            return None
    except np.linalg.LinAlgError:
        pass
    taken = []
    L = np.zeros((n, n))
    for i in range(n):
        v = A[i, i] - L[i, :i] @ L[i, :i]
        if v <= _DEPENDENT * diag[i]:
            # row i depends on the rows before it: find the ones that take part
            coeffs = np.linalg.lstsq(A[np.ix_(taken, taken)], A[taken, i], rcond=None)[0] \
                if taken else np.zeros(0)
            part = [taken[t] for t in range(len(taken)) if abs(coeffs[t]) > 1e-6]
            return sorted(part + [i])
        L[i, i] = np.sqrt(v)
        if i + 1 < n:
            L[i + 1:, i] = (A[i + 1:, i] - L[i + 1:, :i] @ L[i, :i]) / L[i, i]
        taken.append(i)
    return None


def status_of(residual, defect, where):
    """The status and message of a result from both parts of its certificate."""
    if residual >= defect or defect <= RESIDUAL_BOUND:
        return certify(residual)
    return "inaccurate", (f"the compatibility defect {defect:.1e} at {where} exceeds "
                          f"{RESIDUAL_BOUND:.0e}: the displacements contradict the reported "
                          "state and the result must not be used; check for a nearly singular "
                          "model")
