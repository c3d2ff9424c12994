"""A tolerance study: the worst case over the tolerance box and Monte Carlo statistics.

- **Worst case.**  Every vertex of the box is solved (batched; up to
  :data:`MAX_VERTEX_INPUTS` inputs).  At each output's least and greatest
  vertex the one-sided slopes towards the inside of the box are measured; a
  vertex whose slopes all point out of the box is a local extreme (the
  Karush-Kuhn-Tucker conditions of a box), any other is polished by a bounded
  local search (``scipy.optimize.minimize``, L-BFGS-B, its gradient by forward
  differences solved as one batch).  With more inputs the search starts from
  the Monte Carlo extremes.  The method is ``vertices`` when the response is
  affine in the inputs (load-type inputs and no gaps: exact), else
  ``vertices+local`` or ``samples+local`` (local extremes: exact only for outputs
  monotone in each input).
- **Statistics.**  One random stream per input, spawned from the seed by
  numpy's ``SeedSequence`` (the draws do not depend on the batch size);
  normal draws cut at +-6 sigma; mean, standard deviation and the 0.135 %,
  50 % and 99.865 % percentiles of every output; each event's probability with
  its 95 % Wilson score interval.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, field

import numpy as np

from ..errors import ModelError
from ..engine.system import solve as solve_model
from ..model.tolerances import CUT
from .batch import Batch

__all__ = ["OutputSet", "Study", "run_study", "wilson", "MAX_VERTEX_INPUTS", "PERCENTILES"]

MAX_VERTEX_INPUTS = 16
PERCENTILES = (0.135, 50.0, 99.865)
_Z95 = 1.959963984540054          # the 97.5 % point of the standard normal
# inputs through which the response is affine while no gap changes state
_LOAD_TYPE = ("clearance", "misfit", "temperature", "temperature_change", "force",
              "settlements", "displacement", "distributed_load")


def wilson(count: int, n: int, z: float = _Z95) -> tuple[float, float]:
    """The Wilson score interval of a probability from ``count`` events in ``n`` trials.

    Examples
    --------
    No event in 100 trials still leaves up to 3.7 % (Wilson, J. Am. Stat. Assoc.
    22, 1927; the interval with z = 1.96):

    >>> [round(v, 4) for v in wilson(0, 100)]
    [0.0, 0.037]
    """
    if n <= 0:
        return 0.0, 1.0
    p = count / n
    d = 1 + z * z / n
    centre = (p + z * z / (2 * n)) / d
    half = z / d * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n))
    return (0.0 if count == 0 else max(0.0, centre - half),
            1.0 if count == n else min(1.0, centre + half))


class OutputSet:
    """The outputs of a study, by name, and how to read them from a solved sample.

    Names: ``reaction:<station>``, ``displacement:<station>``, ``stress:<segment>``
    (the largest |stress| along it), ``gap:<name>:opening``, ``gap:<name>:force``.
    """

    def __init__(self, model, names=None, checks=False):
        self.model = model
        # with ``checks``: each segment's largest compression and every station's
        # displacement, for the checks of each sample (:func:`_check_events`)
        self.checks = checks
        stations = [s.name for s in model.stations]
        supported = list(dict.fromkeys(s.at for s in model.supports))
        segments = [s.name for s in model.segments]
        gaps = [g.name for g in model.gaps]
        default = ([f"reaction:{s}" for s in supported]
                   + [f"gap:{g}:{w}" for g in gaps for w in ("opening", "force")]
                   + [f"stress:{s}" for s in segments])
        known = (default + [f"displacement:{s}" for s in stations])
        if names:
            for name in names:
                if name not in known:
                    from ..errors import suggest

                    raise ModelError(f"unknown output '{name}'", place="--output",
                                     hint=suggest(name, known))
        self.names = tuple(dict.fromkeys(names)) if names else tuple(default)
        self.station_index = {s: i for i, s in enumerate(stations)}
        self.segment_index = {s: i for i, s in enumerate(segments)}
        self.gap_index = {g: i for i, g in enumerate(gaps)}
        self.supports_at = {s: [j for j, sp in enumerate(model.supports) if sp.at == s]
                            for s in supported}
        self.yield_strength = {i: seg.material.yield_strength
                               for i, seg in enumerate(model.segments)
                               if seg.material.yield_strength is not None}
        wanted = {self.segment_index[n.split(":", 1)[1]] for n in self.names
                  if n.startswith("stress:")}
        self.stress_rows = np.array(sorted(wanted | set(self.yield_strength)), dtype=int)
        self.segments = segments

    def of_arrays(self, u, stress, reactions, opening, force, closed):
        """The outputs of a batch of samples (arrays over samples)."""
        out = {"closed": closed}
        if self.checks:
            out["compression"] = np.maximum(-stress.n_from, -stress.n_to)
            out["u"], out["opening:all"] = u, opening
        if len(self.stress_rows):
            peaks = stress.peak(self.stress_rows)
            for j, i in enumerate(self.stress_rows):
                out[f"stress:{self.segments[i]}"] = np.abs(peaks[:, j])
                out[f"signed:{self.segments[i]}"] = peaks[:, j]
        for name in self.names:
            kind, _, rest = name.partition(":")
            if kind == "reaction":
                out[name] = reactions[:, self.supports_at[rest]].sum(axis=1)
            elif kind == "displacement":
                out[name] = u[:, self.station_index[rest]]
            elif kind == "gap":
                gap, _, what = rest.rpartition(":")
                out[name] = (opening if what == "opening" else force)[:, self.gap_index[gap]]
        return out

    def of_result(self, case):
        """The same outputs of one solved case (:class:`axialfe.results.CaseResult`)."""
        out = {"closed": np.asarray(case.gap_closed, dtype=bool)}
        if self.checks:
            out["compression"] = np.maximum(-case.axial_force[:, 0], -case.axial_force[:, 1])
            out["u"], out["opening:all"] = np.asarray(case.u), np.asarray(case.gap_opening)
        if len(self.stress_rows):
            value, _ = case.fields.stress_peak()
            for i in self.stress_rows:
                out[f"stress:{self.segments[i]}"] = abs(float(value[i]))
                out[f"signed:{self.segments[i]}"] = float(value[i])
        for name in self.names:
            kind, _, rest = name.partition(":")
            if kind == "reaction":
                out[name] = float(case.reaction(rest))
            elif kind == "displacement":
                out[name] = float(case.displacement(rest))
            elif kind == "gap":
                gap, _, what = rest.rpartition(":")
                j = self.gap_index[gap]
                out[name] = float((case.gap_opening if what == "opening" else case.gap_force)[j])
        return out


@dataclass(frozen=True)
class Study:
    """The result of a tolerance study (SI values).

    Attributes
    ----------
    inputs : tuple of dict
        ``name, nominal, limits, distribution, sigma, kind, unit`` of each input.
    outputs : tuple of dict
        ``name, case, nominal, worst_case, worst_case_inputs, mean, std,
        percentiles, kind`` of each output and case.
    events : tuple of dict
        ``name, event, case, count, probability, confidence_interval``.
    draws : dict
        ``(case, output name) -> ndarray`` of the Monte Carlo values.
    """

    title: str
    samples: int
    seed: int
    worst_case_method: str
    inputs: tuple
    outputs: tuple
    events: tuple
    notes: tuple
    draws: dict = field(repr=False, compare=False, default_factory=dict)
    units: object = None
    check_samples: int | None = None   # the samples the check-fails events count over


def _draw(tolerances, samples, seed):
    """The Monte Carlo input values, one stream per input (shape (samples, k))."""
    streams = np.random.SeedSequence(seed).spawn(len(tolerances))
    cols = []
    for tol, stream in zip(tolerances, streams):
        rng = np.random.default_rng(stream)
        if tol.distribution == "uniform":
            cols.append(tol.lower + (tol.upper - tol.lower) * rng.random(samples))
            continue
        z = rng.standard_normal(samples)
        outside = np.abs(z) > CUT
        while outside.any():   # cut at +-6 sigma: redraw the few beyond it, in order
            z[outside] = rng.standard_normal(int(outside.sum()))
            outside = np.abs(z) > CUT
        cols.append(tol.centre + tol.sigma * z)
    return np.column_stack(cols) if cols else np.zeros((samples, 0))


def _kind_of(name):
    kind = name.split(":", 1)[0]
    return {"reaction": "force", "displacement": "displacement", "stress": "stress"}.get(
        kind, "displacement" if name.endswith(":opening") else "force")


def run_study(model, build, samples=10_000, seed=1, outputs=None, progress=None,
              worst_case=True) -> Study:
    """Study a model over its toleranced inputs.

    Parameters
    ----------
    model : Model
        The nominal model (its ``tolerances`` give the inputs).
    build : callable
        ``build({path: SI value})``: the model with those inputs moved (a
        sample's model, for the samples the batch cannot certify).
    samples : int
        Monte Carlo samples (0: the worst case only).
    seed : int
    outputs : sequence of str, optional
        Output names (see :class:`OutputSet`); default every reaction, gap
        opening and force and the largest |stress| of each segment.
    progress : callable, optional
        ``progress(done, total)``.

    Raises
    ------
    ModelError
        When the model has no toleranced input, or an input's range of draws
        leaves its physical range (before anything is sampled).
    """
    found = model.tolerances
    if not found:
        raise ModelError("the model has no toleranced inputs: write a value with its "
                         "tolerance, e.g. clearance = \"0.20 mm +0.05/-0.03\"", file=model.source)
    for t in found:
        if t.problem:
            raise ModelError(f"{t.path}: {t.problem} within its tolerance (the worst-case box "
                             "or +-6 sigma of a normal); narrow the tolerance",
                             file=model.source, line=t.line)
    if samples < 0 or seed < 0:
        raise ModelError("--samples and --seed must not be negative")
    tols = [t.tolerance for t in found]
    paths = [t.path for t in found]
    nominal = np.array([t.nominal for t in tols])
    half = np.array([0.5 * (t.upper - t.lower) for t in tols])
    centre = np.array([t.centre for t in tols])
    steps = np.where(nominal > centre, -half, half)
    _check_order(model, build, paths, nominal, tols)
    batch = Batch(model, paths, nominal, steps, build)
    checked = _Checked(model, paths)
    chosen = OutputSet(model, outputs, checks=checked.vectorised)
    states = batch.states
    nominal_solution = solve_model(model)
    nominal_out = [chosen.of_result(case) for case in nominal_solution]
    k = len(tols)
    lower = np.array([t.lower for t in tols])
    upper = np.array([t.upper for t in tols])
    total = samples + (2 ** k if k <= MAX_VERTEX_INPUTS and worst_case else 0)
    done = [0]

    def tick(n):
        if progress is not None:
            progress(done[0] + n, total)

    draws = {}
    values = None
    if samples:
        values = _draw(tols, samples, seed)
        draws = batch.solve(values, chosen, tick)
        done[0] += samples
    notes = []
    affine = not model.gaps and all(p.rsplit(".", 1)[-1] in _LOAD_TYPE
                                    or p.split(".")[-2] in _LOAD_TYPE for p in paths)
    worst, method = {}, None
    if worst_case:
        worst, method = _worst_case(batch, chosen, states, lower, upper, values, draws, affine,
                                    tick)
    # the outputs
    rows = []
    for s, state in enumerate(states):
        for name in chosen.names:
            row = {"name": name, "case": state, "kind": _kind_of(name),
                   "nominal": float(nominal_out[s][name])}
            if worst:
                (lo_v, lo_x), (hi_v, hi_x) = worst[(s, name)]
                row["worst_case"] = [lo_v, hi_v]
                row["worst_case_inputs"] = [dict(zip(paths, lo_x.tolist())),
                                            dict(zip(paths, hi_x.tolist()))]
            if samples:
                row.update(statistics(draws[(s, name)]))
            rows.append(row)
    events, check_samples = [], None
    if samples:
        events = _events(model, chosen, states, draws, nominal_out, samples)
        check_events, check_samples, check_notes = checked.events(states, draws, values, build)
        events += check_events
        notes += check_notes
    shared = {}
    for t in found:
        if t.path.startswith("materials."):
            mat = t.path.split(".")[1]
            users = [seg.name for seg in model.segments if seg.material.name == mat]
            if len(users) > 1:
                shared[t.path] = users
    for path, users in shared.items():
        notes.append(f"{path} is drawn once per material: segments {', '.join(users)} share "
                     "each draw")
    notes += input_notes(tols)
    if method and method != "vertices":
        notes.append(f"worst case by {method}: the extremes found are local ones; they are "
                     "exact for outputs monotone in each input")
    elif method:
        notes.append("worst case by vertices: exact (the response is affine in these inputs)")
    if batch.loop:
        notes.append(f"every sample was solved on its own: {batch.loop}")
    elif batch.fallbacks:
        notes.append(f"{batch.fallbacks} samples were solved on their own (the batch could not "
                     "certify them)")
    inputs = input_rows(paths, tols)
    return Study(title=model.title, samples=samples, seed=seed,
                 worst_case_method=method or "none", inputs=inputs, outputs=tuple(rows),
                 events=tuple(events), notes=tuple(notes),
                 draws={(states[s], n): v for (s, n), v in draws.items()
                        if n not in ("closed", "compression", "u", "opening:all")},
                 units=model.units, check_samples=check_samples)


def input_rows(paths, tols) -> tuple[dict, ...]:
    """The ``inputs`` of a study: each toleranced input by its path, as JSON shows it."""
    return tuple({"name": p, "nominal": t.nominal, "limits": [t.lower, t.upper],
                  "distribution": t.distribution, "sigma": t.sigma, "kind": t.kind,
                  "unit": t.unit} for p, t in zip(paths, tols))


def input_notes(tols) -> list[str]:
    """What a study's reader must know of its inputs' distributions."""
    notes = []
    if any(t.distribution == "normal" for t in tols):
        notes.append("normal inputs: limits at +-3 sigma about their midpoint (common "
                     "practice; a 'std' gives sigma itself), draws cut at +-6 sigma (a mass "
                     "of 2e-9)")
    if any(t.one_sided for t in tols):
        notes.append("inputs whose deviations both have one sign are used at the midpoint of "
                     "their limits as the nominal")
    return notes


def statistics(v) -> dict:
    """The mean, standard deviation and percentiles of one output's Monte Carlo values."""
    return {"mean": float(v.mean()), "std": float(v.std(ddof=1)) if len(v) > 1 else 0.0,
            "percentiles": {_pct(p): float(q) for p, q
                            in zip(PERCENTILES, np.percentile(v, PERCENTILES))}}


def vertex_row(name, case, kind, nominal, at_vertex, vertices, paths, draws=None) -> dict:
    """One output's row from its values at the vertices of the box (and its draws, if any)."""
    i, j = int(np.argmin(at_vertex)), int(np.argmax(at_vertex))
    row = {"name": name, "case": case, "kind": kind, "nominal": float(nominal),
           "worst_case": [float(at_vertex[i]), float(at_vertex[j])],
           "worst_case_inputs": [dict(zip(paths, vertices[i].tolist())),
                                 dict(zip(paths, vertices[j].tolist()))]}
    if draws is not None:
        row.update(statistics(draws))
    return row


def _pct(p):
    return f"{p:g}"


def _check_order(model, build, paths, nominal, tols):
    """Refuse station positions whose ranges of draws could change the order of two stations."""
    moved = [(i, p) for i, p in enumerate(paths) if p.startswith("stations.")]
    if not moved:
        return
    x = {s.name: s.x for s in model.stations}
    spread = {p.split(".", 1)[1]: tols[i].spread for i, p in moved}
    for seg in model.segments:
        a = spread.get(seg.start, (x[seg.start],) * 2)
        b = spread.get(seg.end, (x[seg.end],) * 2)
        if max(a) >= min(b) and max(b) >= min(a):
            name = seg.start if seg.start in spread else seg.end
            t = next(t for t in model.tolerances if t.path == f"stations.{name}")
            raise ModelError(f"stations.{name}: stations '{seg.start}' and '{seg.end}' of "
                             f"segment '{seg.name}' could change order within the tolerance "
                             "(the worst-case box or +-6 sigma of a normal); narrow it",
                             file=model.source, line=t.line)


def _worst_case(batch, chosen, states, lower, upper, values, draws, affine, tick):
    """Least and greatest value of every output over the box, with the inputs of each."""
    k = len(lower)
    names = [(s, n) for s in range(len(states)) for n in chosen.names]
    if k <= MAX_VERTEX_INPUTS:
        corners = np.array(list(itertools.product((0, 1), repeat=k)), dtype=float)
        points = lower + corners * (upper - lower)
        got = batch.solve(points, chosen, tick)
        method = "vertices" if affine else "vertices+local"
    else:
        points = values
        got = draws
        method = "samples+local"
    found = {}
    for key in names:
        v = got[key]
        i, j = int(np.argmin(v)), int(np.argmax(v))
        found[key] = [[float(v[i]) + 0.0, points[i].copy()], [float(v[j]) + 0.0, points[j].copy()]]
    # |stress| whose signed value changes sign over the box: its least is 0, at a root
    # of the force on the line between the vertices of either sign
    rooted = set()
    crossing = []
    for key in names:
        s, name = key
        if name.startswith("stress:"):
            signed = got[(s, "signed:" + name.split(":", 1)[1])]
            if signed.min() < 0 < signed.max():
                crossing.append((key, points[int(np.argmin(signed))], points[int(np.argmax(signed))]))
    if crossing:
        for (key, _, _), (value, x) in zip(crossing, _roots(batch, chosen, crossing)):
            found[key][0] = [value, x]
            rooted.add(key)
    if method == "vertices" and all(n.startswith("stress:") and (s, n) in rooted or
                                    not n.startswith("stress:") for s, n in names):
        return {key: tuple(map(tuple, val)) for key, val in found.items()}, method
    # one-sided slopes towards the inside of the box at each extreme, in one batch
    width = upper - lower
    h = 1e-6 * width
    starts = [(key, side) for key in names for side in (0, 1)
              if not (side == 0 and key in rooted)]
    base = np.array([found[key][side][1] for key, side in starts])
    inward = np.where(np.isclose(base, upper), -1.0, 1.0)         # (P, k)
    probes = [base]
    for i in range(k):
        p = base.copy()
        p[:, i] += inward[:, i] * h[i]
        probes.append(p)
    got = batch.solve(np.concatenate(probes), chosen)
    P = len(starts)
    for row, (key, side) in enumerate(starts):
        v = got[key][row::P]
        change = v[1:] - v[0]
        # a least value needs no decrease inward, a greatest no increase (beyond rounding)
        spread = abs(found[key][1][0] - found[key][0][0]) + abs(v[0])
        improves = change < -1e-9 * spread if side == 0 else change > 1e-9 * spread
        at_vertex = np.isclose(base[row], lower) | np.isclose(base[row], upper)
        if method == "vertices" or (not improves.any() and at_vertex.all()):
            continue
        found[key][side] = _polish(batch, chosen, key, side, base[row], lower, upper,
                                   found[key][side])
    return {key: tuple(map(tuple, val)) for key, val in found.items()}, method


def _roots(batch, chosen, crossing, iterations=30):
    """Roots of the signed stress on the lines between two vertices, all at once (Illinois
    regula falsi: each iteration one batch of one point per line).  Returns (|stress|, x)."""
    a = np.array([lo for _, lo, _ in crossing])
    b = np.array([hi for _, _, hi in crossing])
    keys = [(key[0], "signed:" + key[1].split(":", 1)[1]) for key, _, _ in crossing]

    def signed(points):
        got = batch.solve(points, chosen)
        return np.array([got[k][i] for i, k in enumerate(keys)])

    t0, t1 = np.zeros(len(a)), np.ones(len(a))
    f0, f1 = signed(a), signed(b)
    t, f = t0.copy(), f0.copy()
    for _ in range(iterations):
        t = np.where(f1 != f0, t0 - f0 * (t1 - t0) / (f1 - f0), 0.5 * (t0 + t1))
        t = np.clip(t, np.minimum(t0, t1), np.maximum(t0, t1))
        f = signed(a + t[:, None] * (b - a))
        left = np.sign(f) == np.sign(f0)          # the root lies between t and t1
        # Illinois: the end that stays has its value halved
        t0, f0, t1, f1 = (np.where(left, t, t0), np.where(left, f, 0.5 * f0),
                          np.where(left, t1, t), np.where(left, 0.5 * f1, f))
        if np.all(np.abs(f) <= 1e-9 * np.maximum(np.abs(f0), np.abs(f1)) + 1e-300):
            break
    return [(abs(float(v)), a[i] + t[i] * (b[i] - a[i])) for i, v in enumerate(f)]


def _polish(batch, chosen, key, side, x0, lower, upper, best):
    """A bounded local search (L-BFGS-B) from ``x0`` for the least (side 0) or greatest value."""
    from scipy.optimize import minimize

    width = upper - lower
    sign = 1.0 if side == 0 else -1.0
    k = len(x0)
    h = 1e-7

    def f(z):
        z = np.clip(z, 0.0, 1.0)
        pts = [lower + z * width]
        for i in range(k):
            zi = z.copy()
            zi[i] = zi[i] + h if zi[i] + h <= 1 else zi[i] - h
            pts.append(lower + zi * width)
        v = batch.solve(np.array(pts), chosen)[key] * sign
        dz = np.array([h if z[i] + h <= 1 else -h for i in range(k)])
        return float(v[0]), (v[1:] - v[0]) / dz

    z0 = np.clip((x0 - lower) / width, 0, 1)
    res = minimize(f, z0, jac=True, method="L-BFGS-B", bounds=[(0, 1)] * k,
                   options={"maxiter": 8, "maxfun": 15})
    x = lower + np.clip(res.x, 0, 1) * width
    value = float(batch.solve(x[None, :], chosen)[key][0])
    if sign * value < sign * best[0]:
        return [value, x]
    return best


def _events(model, chosen, states, draws, nominal_out, samples):
    """Each gap's change of state and each segment's yielding, with Wilson intervals."""
    out = []
    for s, state in enumerate(states):
        closed = draws[(s, "closed")]
        for j, gap in enumerate(model.gaps):
            was = bool(nominal_out[s]["closed"][j])
            link = gap.kind != "contact"
            event = (("slack" if link else "opens") if was else ("taut" if link else "closes"))
            count = int(np.count_nonzero(closed[:, j] != was))
            out.append(_event(gap.name, event, state, count, samples))
        for i, fy in chosen.yield_strength.items():
            name = chosen.segments[i]
            count = int(np.count_nonzero(draws[(s, f"stress:{name}")] >= fy))
            out.append(_event(name, "yields", state, count, samples))
    return out


CHECK_SAMPLES = 400   # samples checked one by one where the checks cannot be vectorised


class _Checked:
    """The model's checks (``axialfe check``: strength, buckling, limits) of every sample.

    Vectorised over the batch where each check's capacity is the same in every
    sample: strength (the largest |stress| against a constant yield strength),
    buckling where no toleranced input moves a capacity (load-type inputs only, or no
    segment with a decidable capacity), and the limits.  Otherwise (tables against
    temperature, a capacity moved by a size, a modulus or a position) the checks of
    :func:`axialfe.checks.check_solution` run on each of the first
    :data:`CHECK_SAMPLES` samples, and the study says so.
    """

    def __init__(self, model, paths):
        from ..checks.buckling import buckling_capacities

        self.model = model
        self.settings = model.checks
        self.capacities = buckling_capacities(model, self.settings)
        load_type = all(p.rsplit(".", 1)[-1] in _LOAD_TYPE or p.split(".")[-2] in _LOAD_TYPE
                        for p in paths)
        tabled = any(seg.material.tabled for seg in model.segments)
        decidable = any(c is not None for c, _ in self.capacities)
        euler = self.settings.column_curve == "euler-only"
        self.vectorised = not tabled and (load_type or not (decidable or euler))
        # whether any check can give a verdict: a yield strength, a capacity, a limit
        self.decides = (decidable or euler or bool(model.limits)
                        or any(seg.material.yield_strength is not None or seg.material.tabled
                               for seg in model.segments))

    def events(self, states, draws, values, build):
        """The ``check-fails`` events: one for each check that fails in some sample
        (named ``<kind>:<item>``, e.g. ``strength:shaft``) and ``checks`` (any check of
        the case) always; the number of samples counted; the notes."""
        if not self.decides:
            return [], None, ["check-fails: no check of 'axialfe check' can decide in this model "
                              "(no yield strength, no buckling capacity, no limits), so there is "
                              "no check-fails event"]
        if self.vectorised:
            n = len(values)
            fails, undecided = self._vectorised(states, draws)
            note = ("check-fails: the checks of 'axialfe check' (strength, buckling, limits) "
                    "of every sample, vectorised")
        else:
            n = min(len(values), CHECK_SAMPLES)
            fails, undecided = self._one_by_one(states, values[:n], build)
            note = (f"check-fails: the checks of 'axialfe check' run on each of the first {n:,} "
                    f"samples (of {len(values):,}; a capacity or a yield strength differs from "
                    "sample to sample, so the checks are not vectorised): its probabilities "
                    f"and intervals are over these {n:,}")
        out = []
        for s, state in enumerate(states):
            any_fails = np.zeros(n, dtype=bool)
            for name, flag in fails[s].items():
                any_fails |= flag
                if flag.any():
                    out.append(_event(name, "check-fails", state, int(np.count_nonzero(flag)), n))
            out.append(_event("checks", "check-fails", state, int(np.count_nonzero(any_fails)),
                              n))
        note += ("; listed are the checks that fail in some sample (as <kind>:<item>) and "
                 "'checks', any check of the case")
        if undecided:
            note += f"; {undecided:,} undecided verdicts are not counted as failures"
        return out, n, [note]

    def _vectorised(self, states, draws):
        model, sf = self.model, self.settings.safety_factor
        fails, undecided = [], 0
        index = {st.name: i for i, st in enumerate(model.stations)}
        gaps = [g.name for g in model.gaps]
        for s in range(len(states)):
            got = {}
            for i, seg in enumerate(model.segments):
                fy = seg.material.yield_strength
                if fy is not None:
                    got[f"strength:{seg.name}"] = ~(draws[(s, f"stress:{seg.name}")] * sf / fy
                                                    <= 1.0)
            compression = draws[(s, "compression")]
            for i, (seg, (cap, _)) in enumerate(zip(model.segments, self.capacities)):
                noise = 1e-12 * seg.material.elastic_modulus * min(x.area for x in seg.sections)
                pressed = compression[:, i] > noise
                if cap is None:
                    undecided += int(np.count_nonzero(pressed))
                else:
                    got[f"buckling:{seg.name}"] = pressed & ~(compression[:, i] * sf / cap <= 1.0)
            for lim in model.limits:
                if lim.at is not None:
                    u = np.abs(draws[(s, "u")][:, index[lim.at]])
                    got[f"displacement:{lim.at}"] = ~(u / lim.displacement <= 1.0)
                else:
                    j = gaps.index(lim.gap)
                    closed = draws[(s, "closed")][:, j]
                    opening = draws[(s, "opening:all")][:, j]
                    got[f"gap:{lim.gap}"] = closed | ~(lim.min_opening / np.where(
                        closed, 1.0, opening) <= 1.0)
            fails.append(got)
        return fails, undecided

    def _one_by_one(self, states, values, build):
        from ..checks import check_solution

        paths = [t.path for t in self.model.tolerances]
        fails = [dict() for _ in states]
        undecided = 0
        for row, x in enumerate(values):
            report = check_solution(solve_model(build(dict(zip(paths, x.tolist())))))
            for s, case in enumerate(report.cases):
                for e in case.entries:
                    key = f"{e.kind}:{e.name}"
                    flags = fails[s].setdefault(key, np.zeros(len(values), dtype=bool))
                    flags[row] = e.ok is False
                    undecided += e.ok is None
        return fails, undecided


def _event(name, event, case, count, n):
    lo, hi = wilson(count, n)
    return {"name": name, "event": event, "case": case, "count": count,
            "probability": count / n, "confidence_interval": [lo, hi]}
