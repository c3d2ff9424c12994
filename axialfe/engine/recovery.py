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
from ..results import CaseResult, Deferred
from .certificate import _largest, check_unique_gaps, compatibility, status_of

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

    The certificate (the station balance, the compatibility defect, the gap
    checks) is computed here for every result; what only some readers need and
    what follows from the checked arrays (the fields inside the segments,
    stresses, strains, the parts of the elongation) is handed to the result as
    :class:`~axialfe.results.Deferred`, made when first read.
    """
    asm, model = system.asm, system.model
    start, end, k, e = asm.start, asm.end, asm.stiffness, asm.direction
    delta0, G, W = terms
    forward = asm.forward
    u_from, u_to = asm.ends(u)
    stretch_u = u_to - u_from            # the change of distance, read once for du and K u
    du = stretch_u if forward else e * stretch_u
    n_from, _ = end_forces(asm.terms, du, delta0, G, W)
    # rounding bound of N: du is a difference of two displacements, so its error
    # scales with their size, not with du itself; with the largest magnitude of each
    # number it is made of (from the magnitudes where they are exact)
    exact = magnitudes is None
    if exact:
        mu, mF, mlam = np.abs(u), np.abs(F), np.abs(lam)
        work = np.abs(delta0)                # |delta0|, then |G|, then |W|, in one array
        size_d0 = float(work.max(initial=0.0))
        noise = _pair(asm, mu)
        noise += work
        size_u, size_F = float(mu.max(initial=0.0)), float(mF.max(initial=0.0))
        for value in (G, W):
            np.abs(value, out=work)
            if value is G:
                size_G = float(work.max(initial=0.0))
                noise += work
                noise *= k
            else:
                size_W = float(work.max(initial=0.0))
                noise += work
    else:
        mu, mF, mlam, md0, mG, mW = magnitudes
        size_u, size_d0, size_G, size_F, size_W = (
            _largest(value) for value in (u, delta0, G, F, W))
        work = np.empty(len(k))
        noise = _pair(asm, mu)
        noise += md0
        noise += mG
        noise *= k
        noise += mW
    noise *= _ULPS
    _zero_below(n_from, noise, work)
    n_to = n_from - W                     # the element's N_to, from the N_from kept
    _zero_below(n_to, noise, work)
    N = np.column_stack([n_from, n_to])

    g = len(model.gaps)
    gap_nodal = system.BT @ lam if g else None
    n = asm.n
    spring = system.spring_diagonal
    # Reactions from the restrained rows, K u - F (K with the springs), at the prescribed
    # stations alone: only the segments with a restrained end reach them (as in
    # System.stiffness_times, from the end displacements read above)
    ps, hs = system.presc_stations, system.held_segments
    at_end, at_start = system.presc_place(end[hs]), system.presc_place(start[hs])
    to_end, to_start = at_end >= 0, at_start >= 0
    t = k[hs] * stretch_u[hs]
    R_station = (_sums(at_end[to_end], t[to_end], len(ps))
                 - _sums(at_start[to_start], t[to_start], len(ps)))
    R_station += spring[ps] * u[ps]
    R_station -= F[ps]
    if g:
        R_station += gap_nodal[ps]
    mu_from, mu_to = asm.ends(mu)
    t = k[hs] * (mu_from[hs] + mu_to[hs])   # |K| |u| there, for the rounding bound
    noise_R = (_sums(at_start[to_start], t[to_start], len(ps))
               + _sums(at_end[to_end], t[to_end], len(ps)))
    noise_R += spring[ps] * mu[ps]
    noise_R += mF[ps]
    if g:
        noise_R += (abs(system.BT) @ mlam)[ps]
    noise_R *= _ULPS
    _zero_below(R_station, noise_R, np.empty(len(ps)))
    reactions = np.zeros(len(model.supports))
    reactions[system.presc_support] = R_station[system.presc_place(system.presc)]
    spring_force = -system.spring_k * u[system.spring_at]
    reactions[system.spring_support] = spring_force
    # (K includes the springs, so R_station at a prescribed station is already the
    # prescribed support's own share, whatever spring stands beside it)

    # Station balance from the recovered segment forces: an independent check.
    balance = asm.to_stations(n_from if forward else e * n_from, n_to if forward else e * n_to,
                              subtract=True)
    balance += state.forces
    if g:
        balance -= gap_nodal
    np.add.at(balance, system.spring_at, spring_force)
    np.add.at(balance, system.presc, reactions[system.presc_support])
    # out-of-balance at the level of rounding (the same bound that zeroes noise in
    # forces, and that of K u - F at every station) is no imbalance: it cannot be told
    # from a force that is truly zero
    t = _pair(asm, mu, out=work)
    t *= k
    t *= _ULPS
    t += noise                           # each segment's share at both its stations
    station_noise = mF if exact else mF.copy()   # (|F| is read no more)
    station_noise *= _ULPS
    if g:
        station_noise += _ULPS * (abs(system.BT) @ mlam)
    sp = system.spring_stations
    station_noise[sp] += _ULPS * (spring[sp] * mu[sp])
    asm.to_stations(t, t, out=station_noise)
    np.abs(balance, out=balance)
    balance *= balance > station_noise
    # the forces the free changes of length and the loads would cause if held count
    # too: free thermal growth has no force of its own to measure rounding against
    scale = max(_largest(state.forces), _largest(reactions), _largest(n_from), _largest(n_to),
                _largest(lam), _largest(np.multiply(k, delta0, out=work)) if size_d0 else 0.0,
                _largest(np.multiply(k, G, out=work)) if size_G else 0.0, size_W)
    residual = float(balance.max(initial=0.0) / scale) if scale > 0 else 0.0

    opening = system.clearance - system.B @ u if g else np.zeros(0)
    tol_gap = _tolerance(system, size_u, size_d0, size_F)
    if closed is None:
        closed = opening <= tol_gap if g else np.zeros(0, dtype=bool)
    closed = np.array(closed, dtype=bool)  # its own: the search may keep its set
    # the rest of the certificate: compatibility, and gap forces that are unique
    defect, defect_at = compatibility(system, u, du, n_from, terms, lam, closed, tol_gap,
                                      sizes=(size_u, size_d0, size_G))
    check_unique_gaps(system, lam, closed, opening, tol_gap, state.name)
    # an overlap at the level of rounding shows as 0; a real one would stay visible
    # (and a touch at that level, open with no force, as touching: the same gap the
    # exact search may call closed with a force of rounding size)
    tiny = np.abs(opening) <= tol_gap if g else closed
    opening = np.where(closed | tiny, 0.0, opening)
    gap_force = system.cons.force_sign * lam if g else np.zeros(0)
    gap_force = np.where(gap_force == 0, 0.0, gap_force)

    made = dict(axial_force=N, elongation=du, reactions=reactions, gap_force=gap_force,
                gap_opening=opening, gap_closed=closed)
    for value in made.values():
        # made here and referenced nowhere else: the result keeps them without a copy
        value.setflags(write=False)
    later = dict(stress=(_stress, N, asm.area), mechanical_strain=(_strain, N, asm.area, asm.modulus),
                 elastic_elongation=(_difference, du, delta0),
                 thermal_strain=(_product, asm.expansion, state.dT),
                 thermal_elongation=(_thermal_elongation, asm.expansion, state.dT, asm.length),
                 length=(_copy, asm.length),
                 fields=(_fields, asm, state.q_factor, n_from, N, system.x))
    return CaseResult(
        name=state.name, model=model, u=u, temperature_change=state.dT,
        applied=state.forces, equilibrium_residual=residual,
        compatibility_defect=defect, **made,
        **{key: Deferred(*how) for key, how in later.items()},
        **dict(zip(("status", "message"), status_of(residual, defect, defect_at))))


_ULPS = 1e3 * _EPS   # values within this many units of rounding of their bound are noise


def _zero_below(values, bound, work):
    """Set to 0, in place, the values whose magnitude is below ``bound`` (rounding noise);
    ``work`` is an array of the same size to compute in."""
    np.abs(values, out=work)
    small = work < bound
    if small.any():
        values[small] = 0.0


def _pair(asm, mu, out=None):
    """|u| at each segment's two ends, summed."""
    mu_from, mu_to = asm.ends(mu)
    return np.add(mu_from, mu_to, out=out)


def _sums(at, values, n):
    """The sums of ``values`` at the places ``at`` (0 to n - 1), always as floats (bincount
    gives integers for no values)."""
    return np.bincount(at, values, minlength=n).astype(float, copy=False)


# --- what a result makes when it is first read (read-only, referenced nowhere else) ----

def _read_only(value):
    value.setflags(write=False)
    return value


def _stress(N, area):
    return _read_only(N / area)


def _strain(N, area, modulus):
    return _read_only(N / area / modulus[:, None])


def _difference(a, b):
    return _read_only(a - b)


def _product(a, b):
    return _read_only(a * b)


def _thermal_elongation(expansion, dT, length):
    return _read_only(expansion * dT * length)


def _copy(value):
    return _read_only(value.copy())


def _fields(asm, q_factor, n_from, N, x):
    """The fields inside the segments (:meth:`Fields.of`) of a recovered state."""
    x_from, x_to = asm.ends(x)
    return Fields.of(n_from, q_factor * asm.q * asm.direction, asm.rho_g, *asm.factors.T,
                     asm.length, asm.modulus, end_force=N, x_from=x_from, x_to=x_to,
                     area=asm.area_table)


def gap_tolerance(system, u, delta0=None, F=None):
    """Rounding bound of a gap opening: displacements, clearances, free changes of length
    (thermal strain and misfit) and the stretch the loads could cause set the scale of the
    numbers it is computed from."""
    return _tolerance(system, np.abs(u).max(initial=0),
                      0.0 if delta0 is None else np.abs(delta0).max(initial=0),
                      0.0 if F is None else np.abs(F).max(initial=0))


def _tolerance(system, size_u, size_delta0, size_F):
    """:func:`gap_tolerance` from the largest magnitudes of u, delta0 and F."""
    scale = max(size_u, system.clearance.max(initial=0), size_delta0,
                size_F / system.asm.stiffness.min() if size_F else 0.0)
    return 1e-10 * scale + 1e-300
