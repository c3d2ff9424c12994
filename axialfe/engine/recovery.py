"""Recovery: segment forces, stresses, fields, reactions and the certificate of a solution.

From the displacements of a load state, the element's own relations
(:mod:`axialfe.mechanics.element`) give each segment's end forces, and the
fields inside it; reactions come from the restrained rows; the equilibrium
residual is recomputed independently from the recovered segment forces at
every station, and it sets the result's status.
"""

from __future__ import annotations

import numpy as np

from ..mechanics import Fields, end_forces
from ..model.cases import LoadState
from ..results import CaseResult
from .certificate import check_unique_gaps, compatibility, status_of

__all__ = ["recover", "gap_tolerance"]

_EPS = np.finfo(float).eps


def recover(system, state: LoadState, u, F, lam, terms, closed=None,
            magnitudes=None) -> CaseResult:
    """Segment forces, stresses, reactions and the equilibrium residual from u.

    ``closed`` is the gap state the search ended with; without it a gap counts
    as closed where its opening is zero to rounding.  ``magnitudes`` bounds the
    size of the numbers u, F, lam and the terms were computed from, as
    (|u|, |F|, |lam|, |delta0|, |G|, |W|), when they come from a sum (a sweep's
    a + s*b) that may have cancelled; it sets the rounding bounds below.
    """
    asm, model = system.asm, system.model
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
    x = system.x
    fields = Fields.of(n_from, state.q_factor * asm.q * e, asm.rho_g, *asm.factors.T,
                       asm.length, asm.modulus, end_force=N, x_from=x[asm.start],
                       x_to=x[asm.end], area=asm.area_table)

    g = len(model.gaps)
    gap_nodal = system.BT @ lam if g else np.zeros(asm.n)
    Ku = system.stiffness_times(u)
    R_station = Ku - F + gap_nodal
    noise_R = 1e3 * _EPS * (system.stiffness_times(mu, magnitude=True) + mF + (abs(system.BT) @ mlam if g else 0.0))
    R_station = np.where(np.abs(R_station) < noise_R, 0.0, R_station)
    reactions = np.zeros(len(model.supports))
    reactions[system.presc_support] = R_station[system.presc]
    spring_force = -system.spring_k * u[system.spring_at]
    reactions[system.spring_support] = spring_force
    # (K includes the springs, so R_station at a prescribed station is already the
    # prescribed support's own share, whatever spring stands beside it)

    # Station balance from the recovered segment forces: an independent check.
    balance = (state.forces + np.bincount(asm.start, e * n_from, minlength=asm.n)
               - np.bincount(asm.end, e * n_to, minlength=asm.n) - gap_nodal)
    balance += np.bincount(system.spring_at, spring_force, minlength=asm.n)
    sup_at = np.array([model._station_index[s.at] for s in model.supports], dtype=int)
    presc_reac = np.bincount(sup_at[system.presc_support], reactions[system.presc_support],
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

    opening = system.clearance - system.B @ u if g else np.zeros(0)
    if closed is None:
        closed = opening <= gap_tolerance(system, u, delta0, F) if g else np.zeros(0, dtype=bool)
    closed = np.array(closed, dtype=bool)  # its own: the search may keep its set
    # the rest of the certificate: compatibility, and gap forces that are unique
    tol_gap = gap_tolerance(system, u, delta0, F)
    defect, defect_at = compatibility(system, u, du, n_from, terms, lam, closed, tol_gap)
    check_unique_gaps(system, lam, closed, opening, tol_gap, state.name)
    # an overlap at the level of rounding shows as 0; a real one would stay visible
    tiny = (opening < 0) & (opening >= -gap_tolerance(system, u, delta0, F)) if g else closed
    opening = np.where(closed | tiny, 0.0, opening)
    gap_force = system.cons.force_sign * lam if g else np.zeros(0)
    gap_force = np.where(gap_force == 0, 0.0, gap_force)

    area = asm.area
    stress = N / area
    E = asm.modulus[:, None]
    flex_part = du - delta0  # elastic part of the elongation (N/EA integrated)
    thermal_strain = asm.expansion * state.dT
    made = dict(axial_force=N, stress=stress, mechanical_strain=stress / E, elongation=du,
                elastic_elongation=flex_part, thermal_elongation=thermal_strain * asm.length,
                thermal_strain=thermal_strain, reactions=reactions, gap_force=gap_force,
                gap_opening=opening, gap_closed=closed, length=asm.length.copy())
    for value in made.values():
        # made here and referenced nowhere else: the result keeps them without a copy
        value.setflags(write=False)
    return CaseResult(
        name=state.name, model=model, u=u, temperature_change=state.dT,
        applied=state.forces, equilibrium_residual=residual, fields=fields,
        compatibility_defect=defect, **made,
        **dict(zip(("status", "message"), status_of(residual, defect, defect_at))))


def gap_tolerance(system, u, delta0=None, F=None):
    """Rounding bound of a gap opening: displacements, clearances, free changes of length
    (thermal strain and misfit) and the stretch the loads could cause set the scale of the
    numbers it is computed from."""
    scale = max(np.abs(u).max(initial=0), system.clearance.max(initial=0),
                0.0 if delta0 is None else np.abs(delta0).max(initial=0),
                0.0 if F is None else np.abs(F).max(initial=0) / system.asm.stiffness.min())
    return 1e-10 * scale + 1e-300
