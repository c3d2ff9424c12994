"""A tolerance study of a press-fit file: each state's pressure and holding force over the
limits of bore and shaft.

A fit given by an ISO 286 designation (or by ``shaft`` and ``bore`` limits)
has two toleranced inputs, ``fit.bore`` and ``fit.shaft``: each part's
diameter between its limits, normal with the limits at +-3 sigma about their
midpoint (common practice), drawn on its own stream.  A sample's diametral
interference is shaft - bore; the fit is solved at it by
:func:`axialfe.fits.fit.solve_fit`, one sample at a time (the samples are
capped at :data:`MAX_FIT_SAMPLES`).  The worst case evaluates the four
vertices; the pressure and holding force are monotone in each diameter, so
the vertices give them exactly: the least and greatest interference are the
limits of the designation.
"""

from __future__ import annotations

import itertools
from dataclasses import replace

import numpy as np

from ..errors import ModelError, suggest
from ..fits.fit import solve_fit
from ..units import OutputUnits
from .inputs import Tolerance
from .study import Study, _draw, _event, input_rows, vertex_row

__all__ = ["run_fit_study", "MAX_FIT_SAMPLES", "FIT_OUTPUTS"]

MAX_FIT_SAMPLES = 20_000
FIT_OUTPUTS = ("pressure", "holding_force")
_KINDS = {"pressure": "stress", "holding_force": "force"}


def _evaluate(fit, bore, shaft):
    """Each state's outputs, looseness and slipping at each (bore, shaft) pair."""
    values, loose, slips = {}, {}, {}
    for b, s in zip(bore, shaft):
        delta = float(s - b)
        result = solve_fit(replace(fit, interference=(delta, delta)))
        for st in result.states:
            for out in FIT_OUTPUTS:
                values.setdefault((st.name, out), []).append(getattr(st, out)[0])
            loose.setdefault(st.name, []).append(bool(st.loose[0]))
            # it slips where the holding force or torque capacity falls short of the
            # state's own axial load or torque (no safety factor)
            slips.setdefault(st.name, []).append(bool(st.holding_force[0] < st.axial_load
                                                      or st.torque_capacity[0] < st.torque))
    arr = lambda d: {k: np.array(v) for k, v in d.items()}  # noqa: E731
    return arr(values), arr(loose), arr(slips)


def _inputs(fit, source):
    if fit.bore_limits is None or fit.shaft_limits is None:
        raise ModelError("the fit has no toleranced input: give it by an ISO 286 designation "
                         "(iso = \"50 H7/p6\") or by 'shaft' and 'bore' limits", place="fit",
                         file=source)
    out = []
    for name, (lo, hi) in (("fit.bore", fit.bore_limits), ("fit.shaft", fit.shaft_limits)):
        lo, hi = sorted((float(lo), float(hi)))
        out.append((name, Tolerance(0.5 * (lo + hi), lo, hi, "normal", (hi - lo) / 6.0,
                                    "length", "mm")))
    return out


def run_fit_study(fit, samples=10_000, seed=1, outputs=None, source=None) -> Study:
    """Study a fit over the limits of its bore and shaft (see
    :func:`axialfe.tolerance.study.run_study` for the fields of the result).
    Outputs are ``<state>:pressure`` and ``<state>:holding_force``; events
    ``loosens`` (no interference left) and ``slips``; ``source`` names the file in errors."""
    found = _inputs(fit, source)
    if samples > MAX_FIT_SAMPLES:
        raise ModelError(f"a fit is solved once per sample; give at most "
                         f"{MAX_FIT_SAMPLES:,}: got {samples:,}", place="--samples")
    nominal = solve_fit(replace(fit, interference=(found[1][1].nominal - found[0][1].nominal,) * 2))
    states = [s.name for s in nominal.states]
    known = [f"{s}:{o}" for s in states for o in FIT_OUTPUTS]
    for name in outputs or ():
        if name not in known:
            raise ModelError(f"unknown output '{name}'", place="--output",
                             hint=suggest(name, known), options=known)
    chosen = list(dict.fromkeys(outputs)) if outputs else known
    paths = [p for p, _ in found]
    tols = [t for _, t in found]
    lower = np.array([t.lower for t in tols])
    upper = np.array([t.upper for t in tols])
    vertices = lower + np.array(list(itertools.product((0, 1), repeat=2)), float) * (upper - lower)
    at_vertex, _, _ = _evaluate(fit, vertices[:, 0], vertices[:, 1])
    draws, loose, slips = {}, {}, {}
    if samples:
        x = _draw(tols, samples, seed)
        draws, loose, slips = _evaluate(fit, x[:, 0], x[:, 1])
    rows = []
    for name in chosen:
        state, out = name.rsplit(":", 1)
        rows.append(vertex_row(name, state, _KINDS[out], getattr(nominal.state(state), out)[0], at_vertex[(state, out)],
                               vertices, paths, draws[(state, out)] if samples else None))
    events = []
    if samples:
        for state in states:
            events.append(_event(state, "loosens", state, int(np.count_nonzero(loose[state])),
                                 samples))
            events.append(_event(state, "slips", state, int(np.count_nonzero(slips[state])),
                                 samples))
    notes = [f"the fit was solved once per sample ({samples:,} samples and 4 vertices) at the "
             "interference shaft - bore; worst case by vertices: exact, as pressure and "
             "holding force are monotone in each diameter",
             "bore and shaft: normal, their limits at +-3 sigma about their midpoint (common "
             "practice), draws cut at +-6 sigma (a mass of 2e-9)",
             "slips: the holding force is below the state's axial load or the torque "
             "capacity below its torque, with no safety factor"]
    inputs = input_rows(paths, tols)
    u = fit.units
    return Study(title=fit.title, samples=samples, seed=seed, worst_case_method="vertices",
                 inputs=inputs, outputs=tuple(rows), events=tuple(events), notes=tuple(notes),
                 draws={(k[0], f"{k[0]}:{k[1]}"): v for k, v in draws.items()
                        if f"{k[0]}:{k[1]}" in chosen},
                 units=OutputUnits(u.force, u.length, u.length, u.stress))
