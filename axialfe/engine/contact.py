"""The contact search of a model: its gap LCP solved, statuses turned into messages.

The pivoting itself is :mod:`axialfe.engine.pivoting` (pure, model-free); this
module builds the mixed problem of parts held only by gaps, calls it, and
words every outcome that is not a solution as a located :class:`SolveError`.
"""

from __future__ import annotations

import numpy as np

from ..errors import SolveError
from ..formatting import names as names_text
from . import pivoting

__all__ = ["solve_gaps"]


def _not_unique(names, closed):
    return SolveError("the contact state is not unique: gaps "
                      f"{names_text([names[i] for i in np.flatnonzero(closed)])} act together on "
                      "the same stations, so their forces cannot be told apart; remove the "
                      "redundant gap")


def solve_gaps(M, H, o0, f, system, label="", with_state=False):
    """Solve the gap LCP; return (gap forces, rigid shifts of gap-held parts).

    Parameters
    ----------
    M, H : ndarray
        ``B K^-1 B^T`` over the free stations, and ``B E`` (gaps on rigid parts).
    o0, f : ndarray
        Openings with every gap open, and the loads on the gap-held parts.
    system : System
        For the names in messages, the clearances and the parts.
    with_state : bool
        Also return the closed set the pivoting ended with (the gaps whose force
        is a basic variable), which is sharper than any tolerance on the
        openings just past a change of state.
    """
    model = system.model
    names = [gp.name for gp in model.gaps]
    scale_q = max(np.abs(o0).max(initial=0), system.clearance.max(initial=0), 1e-300)
    where = f" in case '{label}'" if label else ""
    if system.n_parts == 0:
        lam, closed, status = pivoting.block_principal_pivoting(M, o0, scale_q)
        if status == pivoting.SEMIDEFINITE:
            # gaps acting on dependent motions: M is only semidefinite here, which
            # Lemke's method handles; the forces are unique only if the gaps the
            # answer closes are independent
            lam, closed, status = pivoting.semidefinite(M, o0, closed)
        if status == pivoting.NOT_UNIQUE:
            raise _not_unique(names, closed)
        if status != pivoting.SOLVED:  # pragma: no cover - finite for positive definite M
            raise SolveError("the contact search did not settle")
        return (lam, np.zeros(0), closed) if with_state else (lam, np.zeros(0))
    g, p = H.shape
    Mb = np.block([[M, -H, H], [H.T, np.zeros((p, 2 * p))], [-H.T, np.zeros((p, 2 * p))]])
    qb = np.concatenate([o0, -f, f])
    # openings (m) against forces (N): scale the opening rows to one size for the pivot tests
    # of Lemke's method (a positive row scale leaves the complementarity problem unchanged)
    big = float(np.max(np.diag(M), initial=0.0))
    Mb[:g], qb[:g] = (Mb[:g] / big, qb[:g] / big) if big > 0 else (Mb[:g], qb[:g])
    z, basic, status = pivoting.lemke(Mb, qb, 100 * (g + 2 * p) + 100)
    stations = [st.name for st in model.stations]
    if status == pivoting.NO_SETTLE:
        raise SolveError("the contact search did not settle within its pivot limit")
    if status == pivoting.RAY:
        parts = _part_text(system, stations)
        touching = [names[j] for j in range(g) if np.any(H[j] != 0)]
        raise SolveError(f"no equilibrium{where}: {parts} held only by gap(s) "
                         f"{names_text(touching)}, and the gaps cannot hold the load on it "
                         "(the part floats while the gap is open)", file=model.source,
                         line=model.line_of(f"gaps.{touching[0]}") if touching else None)
    lam, shift = z[:g], z[g:g + p] - z[g + p:]
    opening = o0 + M @ lam - H @ shift
    closed = opening <= 1e-10 * scale_q
    for c in range(p):
        if not np.any(closed & (H[:, c] != 0)):
            members = [stations[i] for i in np.flatnonzero(system.part_label == c)]
            touching = [names[j] for j in range(g) if H[j, c] != 0]
            raise SolveError(f"the equilibrium{where} is not unique: stations "
                             f"{names_text(members)} are held only by gap(s) "
                             f"{names_text(touching)}, which stay open with no load pressing the "
                             "part against them; add a support or a load", file=model.source,
                             line=model.line_of(f"gaps.{touching[0]}") if touching else None)
    return (lam, shift, basic[:g]) if with_state else (lam, shift)


def _part_text(system, stations):
    parts = []
    for c in range(system.n_parts):
        members = [stations[i] for i in np.flatnonzero(system.part_label == c)]
        parts.append(f"the part with stations {names_text(members)}")
    return " and ".join(parts) + (" is" if len(parts) == 1 else " are")
