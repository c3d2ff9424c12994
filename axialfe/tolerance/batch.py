"""Many samples of one model solved at once: stacked arrays over a fixed topology.

A tolerance study changes values, never the topology: which stations the
segments join, which are supported, which gaps act between which stations.
So every sample's stiffness has the same band; :class:`Batch` writes the
per-sample inputs as arrays of shape (samples, ...), computes the element
terms of all samples in one call of :mod:`axialfe.mechanics`, factorises the
stacked bands by a Cholesky whose loops run over the band (each step one
numpy operation over all samples), and finds the gap states by a vectorised
active-set iteration in gap space (``opening = o0 + M @ force``, ``M = B K^-1
B^T`` per sample), re-solving only the samples whose state changed.

Every input a study tolerances enters the model's array form affinely (a
station's x, a modulus, the section factors ``p``, ``q`` of a diameter or a
side, a misfit, a temperature change, a force, a clearance, a settlement, a
spring stiffness): the map from input values to the arrays is found once by
solving nothing, from the arrays of models built with each input moved, and
checked on a model with all of them moved at once.

Each sample is certified as the single solver certifies a result: its station
balance recomputed from the recovered segment forces, the complementarity of
every gap.  A sample that fails, and every sample of a model the batch does
not cover (preloads, parts held only by gaps), is solved by
:func:`axialfe.solve` on that sample's model, made by the ``build`` function
the caller gives.
"""

from __future__ import annotations

import numpy as np

from ..errors import SolveError
from ..mechanics import NUMERIC, Fields, element_terms, load_terms, nodal_loads
from ..model.cases import load_states
from ..engine.system import System, solve as solve_model

__all__ = ["Batch", "MEMORY_BUDGET"]

MEMORY_BUDGET = 256e6      # bytes of working arrays per batch of samples
_EPS = np.finfo(float).eps
_RESIDUAL = 1e-9           # as the single solver's certificate
_DENSE_BAND = 8            # wider bands are solved as stacked dense systems
_ARRAY_FIELDS = ("x", "c", "p1", "q1", "p2", "q2", "elastic_modulus", "thermal_expansion",
                 "misfit", "distributed_load")


class Batch:
    """The samples of one model's toleranced inputs, solved in stacked batches.

    Parameters
    ----------
    model : Model
        The nominal model.
    paths : sequence of str
        The toleranced inputs, in the order of the columns of the values.
    nominal : ndarray, shape (k,)
        Their nominal values (SI).
    steps : ndarray, shape (k,)
        A move of each input that stays inside its range (half its box).
    build : callable
        ``build({path: value})`` returns the model with those inputs moved.

    Attributes
    ----------
    loop : str or None
        Why every sample is solved one by one (None: the batch covers the model).
    fallbacks : int
        Samples solved one by one so far.
    """

    def __init__(self, model, paths, nominal, steps, build):
        self.model, self.paths, self.build = model, tuple(paths), build
        self.nominal = np.asarray(nominal, dtype=float)
        self.states = [s.name for s in load_states(model)]
        self.fallbacks = 0
        self.loop = None
        if any(getattr(seg, "preload", None) is not None for seg in model.segments):
            self.loop = "the model has preloads (found by solving each sample)"
            return
        self.system = system = System(model)
        if system.n_parts:
            self.loop = "some parts are held only by gaps"
            return
        self._layout(model)
        theta0 = self._theta(model)
        k = len(self.paths)
        D = np.zeros((k, len(theta0)))
        for i, (path, h) in enumerate(zip(self.paths, steps)):
            moved = self._theta(build({path: self.nominal[i] + h}))
            D[i] = (moved - theta0) / h
        # all inputs moved at once must give the sum of the single moves (affine arrays)
        signs = np.where(np.arange(k) % 2, -1.0, 1.0)
        both = self._theta(build({p: v + s * h for p, v, s, h
                                  in zip(self.paths, self.nominal, signs, steps)}))
        expect = theta0 + (signs * np.asarray(steps)) @ D
        scale = np.abs(theta0) + np.abs(both) + 1e-300
        if k and np.max(np.abs(both - expect) / scale) > 1e-9:
            self.loop = "the inputs do not enter the model's arrays affinely"
            return
        self.theta0, self.D = theta0, D
        # the inputs that move each block
        self.reach = {name: np.flatnonzero(D[:, sl].any(axis=1)) for name, sl in self.slices.items()}
        # segments whose |stress| peaks at an end in every sample: uniform, nothing along them
        sl = self.slices
        same = lambda a, b: (theta0[sl[a]] == theta0[sl[b]]) & (D[:, sl[a]] == D[:, sl[b]]).all(0)  # noqa: E731
        unloaded = (theta0[sl["distributed_load"]] == 0) & (D[:, sl["distributed_load"]] == 0).all(0)
        self.end_valued = same("p1", "p2") & same("q1", "q2") & unloaded & (self.rho_g == 0)

    # --- the per-sample inputs as one flat vector -------------------------
    def _layout(self, model):
        sy = self.system
        arr = model.arrays
        n, m, g = len(arr.x), len(arr.start), len(model.gaps)
        sizes = [(f, n if f == "x" else m) for f in _ARRAY_FIELDS]
        sizes += [("spring", len(sy.spring_at)), ("clearance", g)]
        for s, _ in enumerate(self.states):
            sizes += [(("forces", s), n), (("dT", s), m), (("settlement", s), len(model.supports))]
        self.slices, at = {}, 0
        for name, size in sizes:
            self.slices[name] = slice(at, at + size)
            at += size
        self.width = at
        self.n, self.m, self.g = n, m, g
        start, end = arr.start, arr.end
        self.start, self.end = start, end
        dx = arr.x[end] - arr.x[start]
        self.direction = np.sign(dx)
        self.rho_g = arr.density * model.gravity * self.direction
        # the band: free stations numbered by x
        free = sy.free
        order = np.argsort(arr.x[free], kind="stable")
        pos = np.full(n, -1)
        pos[free[order]] = np.arange(len(free))
        self.pos, self.nf = pos, len(free)
        ps, pe = pos[start], pos[end]
        both = (ps >= 0) & (pe >= 0)
        self.bw = bw = int(np.max(np.abs(ps - pe)[both], initial=0))
        import scipy.sparse as sp

        nb = (bw + 1) * self.nf
        rows, cols, vals = [], [], []
        for e in range(m):
            for p in (ps[e], pe[e]):
                if p >= 0:
                    rows.append(e), cols.append(p), vals.append(1.0)   # diagonal, d = 0
            if both[e]:
                lo, d = min(ps[e], pe[e]), abs(ps[e] - pe[e])
                rows.append(e), cols.append(d * self.nf + lo), vals.append(-1.0)
        self.k_to_band = sp.csr_matrix((vals, (rows, cols)), shape=(m, nb))
        sp_pos = pos[sy.spring_at]
        self.spring_to_band = sp.csr_matrix(
            (np.ones(len(sp_pos)), (np.arange(len(sp_pos)), sp_pos)), shape=(len(sp_pos), nb))
        self.at_start = sp.csr_matrix((np.ones(m), (np.arange(m), start)), shape=(m, n))
        self.at_end = sp.csr_matrix((np.ones(m), (np.arange(m), end)), shape=(m, n))
        self.free_stations = free[order]
        cons = sy.cons
        self.B = cons.B.toarray()                       # (g, n)
        self.force_sign = cons.force_sign
        self.Bf = self.B[:, self.free_stations]        # (g, nf), in band order
        self.presc, self.presc_support = sy.presc, sy.presc_support
        self.spring_at, self.spring_support = sy.spring_at, sy.spring_support
        self.n_supports = len(model.supports)

    def _theta(self, model) -> np.ndarray:
        """The flat per-sample inputs of one model (its arrays, springs, gaps, load states)."""
        arr = model.arrays
        parts = [np.asarray(getattr(arr, f), dtype=float) for f in _ARRAY_FIELDS]
        spring = [s.stiffness for s in model.supports if s.kind == "spring"]
        parts += [np.array(spring, dtype=float),
                  np.array([gp.clearance for gp in model.gaps], dtype=float)]
        for state in load_states(model):
            parts += [state.forces, state.dT, state.settlement]
        return np.concatenate(parts)

    # --- solving ------------------------------------------------------------
    def _closure(self, u):
        """``B u`` of every sample: each gap's closure from its stations (shape (S, g))."""
        cons = self.system.cons
        out = cons.s1 * u[:, cons.a]
        two = cons.b >= 0
        if two.any():
            out[:, two] += cons.s2[two] * u[:, cons.b[two]]
        return out

    def batch_size(self) -> int:
        per_sample = 8 * (3 * self.width + 8 * (self.bw + 2 + self.g) * max(self.nf, 1)
                          + 40 * self.m + 8 * self.n)
        return int(max(1, min(50_000, MEMORY_BUDGET // per_sample)))

    def solve(self, values, outputs, progress=None):
        """The chosen outputs of every sample.

        Parameters
        ----------
        values : ndarray, shape (S, k)
            The input values of each sample (SI), columns in the order of ``paths``.
        outputs : OutputSet
            What to keep (see :class:`OutputSet`).
        progress : callable, optional
            Called with the number of samples done.

        Returns
        -------
        dict
            ``(state index, output name) -> ndarray (S,)``, and
            ``(state index, 'closed') -> bool ndarray (S, g)``.
        """
        values = np.atleast_2d(np.asarray(values, dtype=float))
        S = len(values)
        out = {}
        size = self.batch_size() if self.loop is None else 1
        for lo in range(0, S, size):
            part = values[lo:lo + size]
            got = self._loop(part, outputs) if self.loop else self._stacked(part, outputs)
            for key, v in got.items():
                if key not in out:
                    out[key] = np.empty((S,) + v.shape[1:], dtype=v.dtype)
                out[key][lo:lo + len(part)] = v
            if progress is not None:
                progress(min(S, lo + size))
        return out

    def _loop(self, values, outputs):
        """Each sample solved by :func:`axialfe.solve` of its own model."""
        rows = []
        for row in values:
            solution = solve_model(self.build(dict(zip(self.paths, row.tolist()))))
            rows.append([outputs.of_result(case) for case in solution])
            self.fallbacks += 1
        out = {}
        for s in range(len(self.states)):
            for key in rows[0][s]:
                out[(s, key)] = np.array([r[s][key] for r in rows])
        return out

    def _stacked(self, values, outputs):
        S = len(values)
        theta = _Inputs(self, values - self.nominal)
        take = lambda f: theta[f].reshape(-1)                             # noqa: E731
        start, end = self.start, self.end
        x = theta["x"]
        dx = x[:, end] - x[:, start]
        if np.any(np.sign(dx) != self.direction):
            raise SolveError("two stations change order in a sample: narrow the tolerance of "
                             "their positions", file=self.model.source)
        length = np.abs(dx)
        E = take("elastic_modulus")
        rho_g = np.broadcast_to(self.rho_g, (S, self.m)).reshape(-1)
        terms = element_terms(take("c"), take("p1"), take("q1"), take("p2"), take("q2"),
                              length.reshape(-1), E, rho_g, NUMERIC)
        k = terms.stiffness.reshape(S, self.m)
        band = k @ self.k_to_band
        spring = theta["spring"]
        if spring.shape[1]:
            band = band + spring @ self.spring_to_band
        factor, ok = _factorise(band.reshape(S, self.bw + 1, self.nf).transpose(1, 2, 0),
                                dense=self.bw > _DENSE_BAND)
        clearance = theta["clearance"]
        Z = _solve(factor, np.broadcast_to(self.Bf.T[:, None, :], (self.nf, S, self.g)),
                   self.bw > _DENSE_BAND) if self.g else None
        M = np.einsum("gi,isk->sgk", self.Bf, Z) if self.g else None
        alpha, misfit = take("thermal_expansion"), take("misfit")
        q = theta["distributed_load"] * self.direction
        out, failed = {}, ~ok
        e = self.direction
        for s, _ in enumerate(self.states):
            dT = theta[("dT", s)].reshape(-1)
            delta0, G, W = load_terms(terms, q.reshape(-1), dT, alpha, length.reshape(-1), misfit)
            f_from, f_to = nodal_loads(terms, delta0, G, W)
            forces = theta[("forces", s)]
            F = forces + ((e * f_from.reshape(S, -1)) @ self.at_start
                                             + (e * f_to.reshape(S, -1)) @ self.at_end)
            u = np.zeros((S, self.n))
            u[:, self.presc] = theta[("settlement", s)][:, self.presc_support]
            # K_fr u_r: the prescribed displacements moved to the loads
            t = k * (u[:, end] - u[:, start])
            Ku_r = t @ self.at_end - t @ self.at_start
            rhs = (F - Ku_r)[:, self.free_stations]
            u_free = _solve(factor, rhs.T[:, :, None], self.bw > _DENSE_BAND)[:, :, 0].T
            lam = np.zeros((S, self.g))
            closed = np.zeros((S, self.g), dtype=bool)
            if self.g:
                u[:, self.free_stations] = u_free
                o0 = clearance - self._closure(u)
                lam, closed, bad = _gap_states(M, o0, clearance)
                failed |= bad
                for j in range(self.g):
                    u_free = u_free - Z[:, :, j].T * lam[:, j:j + 1]
            u[:, self.free_stations] = u_free
            du = e * (u[:, end] - u[:, start])
            n_from = k * (du - delta0.reshape(S, -1)) + k * G.reshape(S, -1)
            # rounding of N as the single solver bounds it: du is a difference of two
            # displacements, its error scales with their size
            noise = 1e3 * _EPS * (k * (np.abs(u[:, start]) + np.abs(u[:, end])
                                       + np.abs(delta0.reshape(S, -1)) + np.abs(G.reshape(S, -1)))
                                  + np.abs(W.reshape(S, -1)))
            n_from = np.where(np.abs(n_from) < noise, 0.0, n_from)
            n_to = n_from - W.reshape(S, -1)
            n_to = np.where(np.abs(n_to) < noise, 0.0, n_to)
            t = k * (u[:, end] - u[:, start])
            Ku = t @ self.at_end - t @ self.at_start
            if spring.shape[1]:
                np.add.at(Ku, (slice(None), self.spring_at), spring * u[:, self.spring_at])
            gap_nodal = lam @ self.B
            R_station = Ku - F + gap_nodal
            reactions = np.zeros((S, self.n_supports))
            reactions[:, self.presc_support] = R_station[:, self.presc]
            spring_force = -spring * u[:, self.spring_at]
            reactions[:, self.spring_support] = spring_force
            # the certificate: station balance from the recovered segment forces
            balance = (forces + (e * n_from) @ self.at_start
                       - (e * n_to) @ self.at_end - gap_nodal)
            if spring.shape[1]:
                np.add.at(balance, (slice(None), self.spring_at), spring_force)
            balance = balance[:, self.free_stations]
            scale = np.maximum.reduce([
                np.abs(forces).max(axis=1, initial=0),
                np.abs(reactions).max(axis=1, initial=0),
                np.abs(n_from).max(axis=1, initial=0), np.abs(n_to).max(axis=1, initial=0),
                np.abs(lam).max(axis=1, initial=0),
                np.abs(k * delta0.reshape(S, -1)).max(axis=1, initial=0),
                np.abs(k * G.reshape(S, -1)).max(axis=1, initial=0),
                np.abs(W.reshape(S, -1)).max(axis=1, initial=0)])
            residual = np.abs(balance).max(axis=1, initial=0) / np.where(scale > 0, scale, 1)
            failed |= ~(residual <= _RESIDUAL)
            opening = clearance - self._closure(u) if self.g else np.zeros((S, 0))
            opening = np.where(closed, 0.0, opening)
            fields = _Fields(n_from, n_to, q, rho_g.reshape(S, -1), theta, length,
                             self.end_valued)
            got = outputs.of_arrays(u=u, stress=fields, reactions=reactions, opening=opening,
                                    force=self.force_sign * lam, closed=closed)
            for key, v in got.items():
                out[(s, key)] = v
        if failed.any():   # solve these samples one by one, as the single solver does
            rows = np.flatnonzero(failed)
            again = self._loop(values[rows], outputs)
            for key, v in again.items():
                out[key][rows] = v
        return out


class _Inputs:
    """The per-sample inputs of a batch, one block at a time: ``inputs['x']`` is (S, n).

    A block no input moves is the nominal row, broadcast; a moved one is the
    nominal row plus the moves of the inputs that reach it.
    """

    def __init__(self, batch, moves):
        self.batch, self.moves, self.cache = batch, moves, {}

    def __getitem__(self, name):
        if name not in self.cache:
            b = self.batch
            sl = b.slices[name]
            rows = b.reach[name]
            row = b.theta0[sl]
            if len(rows):
                self.cache[name] = row + self.moves[:, rows] @ b.D[rows, sl]
            else:
                self.cache[name] = np.broadcast_to(row, (len(self.moves), len(row)))
        return self.cache[name]


class _Fields:
    """The largest |stress| of each segment, made when an output asks for it."""

    def __init__(self, n_from, n_to, q, rho_g, theta, length, end_valued):
        self.args = (n_from, n_to, q, rho_g, theta, length)
        self.end_valued = end_valued
        self.n_from, self.n_to = n_from, n_to

    def peak(self, rows):
        """The stress of largest magnitude along segments ``rows`` (signed): (S, len(rows)).

        A uniform segment with nothing along it has one stress; any other is read
        from its fields (:meth:`axialfe.mechanics.Fields.stress_peak`).
        """
        n_from, n_to, q, rho_g, theta, length = self.args
        S = len(n_from)
        rows = np.asarray(rows)
        out = np.empty((S, len(rows)))
        simple = self.end_valued[rows]
        if simple.any():
            r = rows[simple]
            area = theta["c"][:, r] * theta["p1"][:, r] * theta["q1"][:, r]
            out[:, simple] = n_from[:, r] / area
        if (~simple).any():
            r = rows[~simple]
            cut = lambda f: theta[f][:, r].reshape(-1)                      # noqa: E731
            fields = Fields.of(n_from[:, r].reshape(-1), q[:, r].reshape(-1),
                               rho_g[:, r].reshape(-1), cut("c"), cut("p1"), cut("q1"),
                               cut("p2"), cut("q2"), length[:, r].reshape(-1),
                               cut("elastic_modulus"),
                               end_force=np.column_stack([n_from[:, r].reshape(-1),
                                                          n_to[:, r].reshape(-1)]))
            value, _ = fields.stress_peak()
            out[:, ~simple] = value.reshape(S, len(r))
        return out


def _factorise(A, dense=False):
    """Cholesky of stacked symmetric bands ``A[d, i, s] = K_s[i + d, i]``, in place.

    Returns the factor and a mask of the samples whose stiffness was positive definite.
    """
    bw1, nf, S = A.shape
    if dense:
        K = np.zeros((S, nf, nf))
        for d in range(bw1):
            idx = np.arange(nf - d)
            K[:, idx + d, idx] = A[d, :nf - d].T
            K[:, idx, idx + d] = A[d, :nf - d].T
        ok = np.ones(S, dtype=bool)
        try:
            L = np.linalg.cholesky(K)
        except np.linalg.LinAlgError:
            L = np.zeros_like(K)
            for s in range(S):
                try:
                    L[s] = np.linalg.cholesky(K[s])
                except np.linalg.LinAlgError:
                    ok[s] = False
                    L[s] = np.eye(nf)
        return L, ok
    L = A.copy()
    bw = bw1 - 1
    ok = np.ones(S, dtype=bool)
    for j in range(nf):
        diag = L[0, j].copy()
        for kk in range(max(0, j - bw), j):
            diag -= L[j - kk, kk] ** 2
        ok &= diag > 0
        root = np.sqrt(np.where(diag > 0, diag, 1.0))
        L[0, j] = root
        for i in range(j + 1, min(nf, j + bw + 1)):
            t = L[i - j, j].copy()
            for kk in range(max(0, i - bw), j):
                t -= L[i - kk, kk] * L[j - kk, kk]
            L[i - j, j] = t / root
    return L, ok


def _solve(L, rhs, dense=False):
    """Solve with the stacked factor for ``rhs`` of shape (nf, S, r)."""
    if dense:
        r = np.moveaxis(rhs, 0, 1)                                   # (S, nf, r)
        y = np.linalg.solve(L, r)
        x = np.linalg.solve(np.swapaxes(L, 1, 2), y)
        return np.moveaxis(x, 1, 0)
    bw1, nf, S = L.shape
    bw = bw1 - 1
    y = np.array(rhs, dtype=float)
    for i in range(nf):
        for kk in range(max(0, i - bw), i):
            y[i] -= L[i - kk, kk][:, None] * y[kk]
        y[i] /= L[0, i][:, None]
    for i in range(nf - 1, -1, -1):
        for kk in range(i + 1, min(nf, i + bw + 1)):
            y[i] -= L[kk - i, i][:, None] * y[kk]
        y[i] /= L[0, i][:, None]
    return y


def _gap_states(M, o0, clearance, max_iterations=50):
    """Gap forces by a vectorised primal-dual active-set iteration in gap space.

    ``opening = o0 + M @ force >= 0``, ``force >= 0``, complementary.  Each
    iteration solves the closed gaps' rows of the samples whose state changed;
    a sample that does not settle, or whose system is singular, is returned as
    failed (the caller solves it one by one).
    """
    S, g = o0.shape
    scale_o = np.maximum(np.abs(o0).max(axis=1), np.abs(clearance).max(axis=1)) + 1e-300
    diag = np.abs(np.einsum("sii->si", M)).max(axis=1) + 1e-300
    tol_o = 1e-10 * scale_o
    tol_f = 1e-10 * scale_o / diag
    closed = o0 < -tol_o[:, None]
    lam = np.zeros((S, g))
    failed = np.zeros(S, dtype=bool)
    active = np.ones(S, dtype=bool)
    eye = np.eye(g)
    for _ in range(max_iterations):
        rows = np.flatnonzero(active)
        if not len(rows):
            break
        c = closed[rows]
        both = c[:, :, None] & c[:, None, :]
        A = np.where(both, M[rows], 0.0) + np.where(c, 0.0, 1.0)[:, :, None] * eye
        b = np.where(c, -o0[rows], 0.0)
        f, good = _small_solve(A, b)
        w = o0[rows] + np.einsum("sij,sj->si", M[rows], f)
        lam[rows] = np.where(c, f, 0.0)
        bad_closed = c & (f < -tol_f[rows, None])
        bad_open = ~c & (w < -tol_o[rows, None])
        flip = bad_closed | bad_open
        changed = flip.any(axis=1) & good
        failed[rows[~good]] = True
        closed[rows] = c ^ flip
        active[:] = False
        active[rows[changed]] = True
    failed |= active
    lam = np.maximum(lam, 0.0)
    return lam, closed, failed


def _small_solve(A, b):
    """Solve stacked small systems; samples whose matrix is singular are flagged."""
    try:
        f = np.linalg.solve(A, b[..., None])[..., 0]
    except np.linalg.LinAlgError:
        f = np.einsum("sij,sj->si", np.linalg.pinv(A), b)
    res = np.abs(np.einsum("sij,sj->si", A, f) - b).max(axis=1, initial=0)
    size = np.abs(b).max(axis=1, initial=0) + 1e-300
    good = np.isfinite(f).all(axis=1) & (res <= 1e-8 * size)
    return np.where(good[:, None], f, 0.0), good
