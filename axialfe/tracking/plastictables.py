"""The legs of an elastic-plastic path that move temperatures through tables of properties.

With E(T), f_y(T) and the free thermal strain from tables, the response is
no longer affine along a leg that changes the temperature, but in one
dimension it stays algebraic: for a fixed set of active constraints (which
segments flow and at which bound, which gaps are closed) the state at a
value t of the leg's parameter is the solution of one linear system,

    N_j(t) - h_j*p_j = +f_t,j(T)*A_j or -f_c,j(T)*A_j   (the flowing segments),
    opening_g(t) = 0                                      (the closed gaps),

with the other segments' plastic elongations frozen and the open gaps'
forces zero; the forces and openings are those of the tracker of
:mod:`axialfe.tracking.plastic` built on the model with each segment's
properties at its temperature (:func:`axialfe.model.temperature.at_temperature`),
so ``sigma = E(T)*(eps - eps_th(T) - eps_p)`` holds in every segment.

A leg is cut where any segment's temperature passes a table entry (the
properties are smooth between entries).  On each piece the event measures of
the current set (an elastic segment's distance from its bounds, a flowing
segment's plastic rate, a closed gap's force, an open gap's opening) are
sampled at ``SAMPLES`` points to bracket their first sign change, and the
root is found by :func:`scipy.optimize.brentq` to rounding; a measure above
zero at two samples that falls after the first and rises before the second
and whose tangents there both reach zero inside has its least value found in
between (the root of its slope), so a dip below zero between samples is not
missed where the measure is convex between them.  A flowing
segment whose plastic rate reaches zero inside a piece (its yield strength
falling slower than its force, or rising faster) is released there and the
tracker's rate problem says whether it ``unloads``.

The rates the rate problem needs (the change of the elastic response and of
the bounds with t at fixed plastic strain) are second-order one-sided
differences inside the piece; the plastic rate of the unloading measure a
central difference.  Both are accurate to about 1e-8 of their scale, which is
the rounding bound the decisions then use (``tol``).

Not followed: a measure that dips below zero and back between two samples
while it falls at both (it would need two turns within 1/``SAMPLES`` of a table
interval; between entries the properties are linear or quadratic in T).
"""

from __future__ import annotations

import numpy as np

from ..model.temperature import at_temperature

__all__ = ["SAMPLES", "TabledCourse", "temperatures_at", "tracker_at"]

# Samples a piece between table entries to bracket the first sign change of each measure.
SAMPLES = 8
# The relative step of the differences, of a piece's length.
_STEP = 1e-5
# How far (a share of its yield force) a segment held at its bound without flow may pass it
# before the rate problem is asked again: rounding of the differences stays far below.
_BAND = 1e-8


def temperatures_at(model, base, lam, thermal, context):
    """The model of ``base`` with each segment's properties at its temperature at a point.

    ``context`` says where the path stands ("on leg 3 of the path") in the
    error of a temperature outside a table.
    """
    from .plastic import point_state

    return at_temperature(model, point_state(base, lam, thermal),
                          f"{context} (case '{base.name}')")


def tracker_at(model, base, lam, thermal, context):
    """The path tracker of ``base`` at a point, with the properties at its temperatures."""
    from .plastic import _Tracker

    return _Tracker(temperatures_at(model, base, lam, thermal, context), base)


class TabledCourse:
    """A leg that changes temperatures over tables: the interface of ``_AffineCourse``."""

    tol = 1e-7      # the rounding bound of rates found by differences

    def __init__(self, model, base, at, leg):
        self.model, self.base, self.at, self.leg = model, base, at, leg
        self._cache = {}
        self.samples = []
        where = f"on leg {leg.index} of the path"
        self.context = where
        self.breaks = self._breaks()

    # --- the model at a point --------------------------------------------------------
    def between(self):
        """``(t, N, gap forces)`` at the samples inside the last step, for the plot."""
        out, self.samples = self.samples, []
        return out

    def clean(self, z, dX_el, tr):
        """Plastic rates below the rounding bound (``tol`` of the elastic rate of elongation,
        force rate over stiffness) are no flow; a segment at its bound with no flow is
        watched by its band."""
        from .plastic import _AffineCourse

        return _AffineCourse.clean(self, z, dX_el, tr)

    def tracker(self, t):
        t = float(t)
        tr = self._cache.get(t)
        if tr is None:
            if len(self._cache) > 4096:
                self._cache.clear()
            tr = self._cache[t] = tracker_at(self.model, self.base, *self.at(t), self.context)
        return tr

    def _breaks(self):
        """The values of t in (0, 1) where some segment's temperature passes a table entry."""
        T0 = self.model.reference_temperature
        from .plastic import point_state

        dT0 = point_state(self.base, *self.at(0.0)).dT
        dT1 = point_state(self.base, *self.at(1.0)).dT
        out = set()
        for i, seg in enumerate(self.model.segments):
            mat = seg.material
            if dT1[i] == dT0[i]:
                continue
            for table in (mat.modulus_table, mat.yield_table, mat.expansion_table):
                for T in (() if table is None else table.temperatures):
                    s = (T - T0 - dT0[i]) / (dT1[i] - dT0[i])
                    if 1e-12 < s < 1 - 1e-12:
                        out.add(float(s))
        return sorted(out) + [1.0]

    def _end(self, t):
        """The end of the piece that starts at ``t``."""
        return next(b for b in self.breaks if b > t + 1e-12) if t < 1.0 - 1e-12 else 1.0

    def _response(self, s, p, gl):
        tr = self.tracker(s)
        return tr.response(*self.at(s), p, gl), tr.Nt, tr.Nc

    # --- the rate problem's input ------------------------------------------------------
    def rate(self, t, side, p, gl):
        """d/dt of the elastic response at fixed p and gaps, less each bound's own rate."""
        end = self._end(t)
        d = _STEP * (end - t) if end - t > 1e-9 else _STEP
        pts = [self._response(t + k * d, p, gl) for k in range(3)]
        X = [np.concatenate(r[0]) for r in pts]
        dX = (-3 * X[0] + 4 * X[1] - X[2]) / (2 * d)
        nP = len(side)
        bound = [np.where(side > 0, r[1], -r[2]) for r in pts]
        d_bound = (-3 * bound[0] + 4 * bound[1] - bound[2]) / (2 * d)
        dX[:nP] -= np.where(side != 0, d_bound, 0.0)
        return dX

    # --- the state of a fixed active set -------------------------------------------
    def _settle(self, s, side, F, Cl, p, gl):
        """(p, gl, N, o, Nt, Nc) at ``s`` with ``F`` flowing and ``Cl`` closed, from (p, gl) at the start."""
        tr = self.tracker(s)
        lam, thermal = self.at(s)
        nP = len(side)
        p_f = np.where(F, 0.0, p)
        g_f = np.zeros_like(gl)
        Xf = np.concatenate(tr.response(lam, thermal, p_f, g_f))
        Fi, Ci = np.flatnonzero(F), np.flatnonzero(Cl)
        rows = np.concatenate([Fi, nP + Ci])
        if len(rows):
            A = np.hstack([tr.A_p[:, Fi], tr.A_g[:, Ci]])[rows]
            A[:len(Fi), :len(Fi)] -= np.diag(tr.h[Fi])
            bound = np.where(side[Fi] > 0, tr.Nt[Fi], -tr.Nc[Fi])
            rhs = np.concatenate([bound - Xf[Fi], -Xf[nP + Ci]])
            y0 = np.concatenate([p[Fi], gl[Ci]])
            diag = np.abs(np.diag(tr.M))
            g_scale = 1.0 / np.sqrt(np.maximum(diag[Ci], 1e-12 * max(diag.max(initial=0.0),
                                                                     1e-300)))
            rows_s = np.concatenate([1.0 / np.sqrt(tr.k[Fi]), g_scale])
            # the least increment from the start: the split among perfectly plastic segments
            # yielding together in series is not unique, and the least one (in plain plastic
            # elongations, as the rate problem's least-norm rates, so one scale for all of
            # them) shares it alike
            cols = np.concatenate([np.full(len(Fi), 1.0 / np.sqrt(tr.k[Fi].max(initial=1.0))),
                                   g_scale])
            dy = cols * np.linalg.lstsq(rows_s[:, None] * A * cols[None, :],
                                        rows_s * (rhs - A @ y0), rcond=1e-9)[0]
            y = y0 + dy
            p_f[Fi] = y[:len(Fi)]
            g_f[Ci] = y[len(Fi):]
        N, o = tr.response(lam, thermal, p_f, g_f)
        return p_f, g_f, N, o, tr.Nt, tr.Nc

    def step(self, t, side, z, dg, v, closed, touching, p, gl, N, o):
        """``(t_next, hit, tension, release, g_hit, p, gl)`` at the next event of the piece."""
        from scipy.optimize import brentq

        nP = len(side)
        tr = self.tracker(t)
        F = (side != 0) & (z > 0)
        elastic = side == 0
        held = (side != 0) & ~F          # at a bound with no flow: watched beyond a band
        over_up = _BAND + np.maximum(N - tr.h * p - tr.Nt, 0.0) / np.maximum(tr.Nt, 1e-300)
        over_dn = _BAND + np.maximum(-tr.Nc - (N - tr.h * p), 0.0) / np.maximum(tr.Nc, 1e-300)
        open_ = ~closed & ~touching
        end = self._end(t)
        hardening = tr.h
        force_scale = np.maximum(np.maximum(tr.Nt, tr.Nc), 1e-300)
        g_scale = max(force_scale.max(initial=0.0), np.abs(gl).max(initial=0.0), 1e-300)
        o_scale = max(np.abs(o).max(initial=0.0), np.abs(tr.system.clearance).max(initial=0.0),
                      1e-300)
        z_scale = np.maximum(np.abs(z), 1e-300)
        args = (side, F, closed, p, gl)

        def plastic_rate(s):
            lo, hi = max(t, s - _STEP * (end - t)), min(end, s + _STEP * (end - t))
            return (self._settle(hi, *args)[0] - self._settle(lo, *args)[0]) / (hi - lo)

        def measures(s):
            p_s, g_s, N_s, o_s, Nt, Nc = self._settle(s, *args)
            excess = N_s - hardening * p_s
            rate = side * plastic_rate(s) if F.any() else np.zeros(nP)
            return np.concatenate([
                np.where(elastic, (Nt - excess) / force_scale,
                         np.where(held & (side > 0), (Nt - excess) / force_scale + over_up,
                                  np.inf)),
                np.where(elastic, (excess + Nc) / force_scale,
                         np.where(held & (side < 0), (excess + Nc) / force_scale + over_dn,
                                  np.inf)),
                np.where(F, rate / z_scale, np.inf),
                np.where(closed, g_s / g_scale, np.inf),
                np.where(open_, o_s / o_scale, np.inf)])

        grid = np.linspace(t, end, SAMPLES + 1)
        if end - t <= 1e-9:     # a sliver up to a table entry: no event can fit in it
            t_next, first = end, np.zeros(0, dtype=int)
        else:
            m0 = measures(t)
            start = m0.copy()
            flat = np.isfinite(m0) & (m0 <= 1e-9)   # at zero already: the sign just ahead
            if flat.any():
                start[flat] = measures(t + 1e-6 * (end - t))[flat]
            prev, t_next, first = start, end, np.zeros(0, dtype=int)
            if (start[flat] <= 0).any():     # it crosses at once: decide again just ahead
                t_next = t + 1e-6 * (end - t)
                first = np.flatnonzero(flat & (start <= 0))
            else:
                eps = 1e-6 * (end - t)

                def slope(x, mx):         # one-sided, inside the piece (NaN for no measure)
                    other = measures(x + eps) if x + eps <= end else measures(x - eps)
                    with np.errstate(invalid="ignore"):
                        return (other - mx) / eps if x + eps <= end else (mx - other) / eps

                s_prev = slope(t, m0)
                for a, b in zip(grid, grid[1:]):
                    mb = measures(b)
                    s_b = slope(b, mb)
                    live = np.isfinite(prev) & (prev > 0)
                    upper = {int(k): b for k in np.flatnonzero(live & (mb <= 0))}
                    # a measure above zero at both samples that falls, then rises, between
                    # them, and whose tangents at both reach zero inside (so that it can,
                    # where it is convex there): its least value decides whether it dips
                    # below zero
                    width = b - a
                    with np.errstate(invalid="ignore"):
                        dips = (live & (mb > 0) & (s_prev < 0) & (s_b > 0)
                                & (prev + s_prev * width < 0) & (mb - s_b * width < 0))
                    for k in np.flatnonzero(dips):
                        x_min = brentq(lambda x, k=k: slope(x, measures(x))[k], a, b,
                                       xtol=1e-14, maxiter=200)
                        if measures(x_min)[k] <= 0:
                            upper[int(k)] = x_min
                    if upper:
                        cross = np.array(sorted(upper))
                        roots = []
                        for k in cross:
                            lo = a if a > t else t + 1e-6 * (end - t) if flat[k] else t
                            roots.append(brentq(lambda x, k=k: measures(x)[k], lo, upper[k],
                                                xtol=1e-15, rtol=4 * np.finfo(float).eps,
                                                maxiter=200))
                        roots = np.array(roots)
                        t_next = float(roots.min())
                        first = cross[roots <= t_next + 1e-12 * max(1.0, end - t)]
                        break
                    prev, s_prev = mb, s_b
        if t_next >= 1.0 - 1e-12:
            t_next = 1.0
        p_n, g_n, *_ = self._settle(t_next, *args)
        # the states at the samples passed, for the plot (the response is curved there)
        self.samples = []
        for x in grid[1:-1]:
            if x < t_next:
                _, g_x, N_x, *_ = self._settle(x, *args)
                self.samples.append((float(x), N_x, g_x))
        g = len(gl)
        hit_k = np.zeros(3 * nP + 2 * g, dtype=bool)
        hit_k[first] = True
        up, down, rel = hit_k[:nP], hit_k[nP:2 * nP], hit_k[2 * nP:3 * nP]
        g_hit = hit_k[3 * nP:3 * nP + g] | hit_k[3 * nP + g:]
        g_n = np.where(g_hit & closed, 0.0, np.maximum(g_n, 0.0))
        return t_next, up | down, up, rel, g_hit, p_n, g_n
