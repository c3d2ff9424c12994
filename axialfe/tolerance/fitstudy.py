"""A tolerance study of a press-fit file: each state's pressure and holding force over its
toleranced inputs.

A fit given by an ISO 286 designation (or by ``shaft`` and ``bore`` limits)
has the inputs ``fit.bore`` and ``fit.shaft``, each part's diameter between
its limits (normal with the limits at +-3 sigma about their midpoint, common
practice, or uniform with ``distribution = "uniform"`` in ``[fit]``); a
sample's diametral interference is shaft - bore.  Any other value written
with a tolerance is an input too: diameters, a single interference, length,
friction, temperatures, loads, the moduli, Poisson's ratios and expansion
coefficients of the file's own materials.  Every sample is evaluated at once
by :func:`axialfe.fits.fit.fit_states`, the fit's own Lamé formulas on arrays.
The outputs are monotone in the interference, friction, temperatures and
loads, so the vertices give their worst case exactly (the least and greatest
interference are the limits of the designation); diameters and moduli are
polished by the model study's local search.
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError, suggest
from ..fits.fit import fit_parameters, fit_states, solve_fit
from ..units import OutputUnits
from .closed import ClosedBatch, refuse_problems, run_closed_study

__all__ = ["run_fit_study", "FIT_OUTPUTS"]

FIT_OUTPUTS = ("pressure", "holding_force")
_KINDS = {"pressure": "stress", "holding_force": "force"}
# inputs in which every output is monotone (the vertices give the worst case)
_MONOTONE = ("bore", "shaft", "interference", "friction", "length", "temperature",
             "shaft_temperature", "hub_temperature", "assembly_temperature", "axial_load",
             "torque", "thermal_expansion")
# slips: the fit's own holding checks at a safety factor of 1
_SLIP_CHECKS = ("holding-force", "torque-capacity", "combined-slip")


class _Fits(ClosedBatch):
    """Many samples of one fit: outputs, looseness, slipping and check verdicts on arrays."""

    def __init__(self, fit, found, build, source):
        super().__init__(fit_parameters, build, found, source)
        self.fit = fit

        def valid(p):
            return ((np.asarray(p["outer_diameter"]) > p["diameter"])
                    & (np.asarray(p["inner_diameter"]) < p["diameter"]))

        self.refuse_geometry(("diameter", "outer_diameter", "inner_diameter"), valid,
                             "the hub's outer diameter could fall to the fit diameter, or the "
                             "shaft's bore reach it")

    def chunk(self, rows):
        n = len(rows)
        states, verdicts = fit_states(self.fit, self.map.at(rows))
        b = lambda v: np.array(np.broadcast_to(v, n))  # noqa: E731
        out, flags, undecided = {}, {}, 0
        for st in states:
            for o in FIT_OUTPUTS:
                out[f"{st.name}:{o}"] = b(getattr(st, o)[0])
            flags[(st.name, "loosens", st.name)] = b(st.loose[0])
            # it slips where the holding force falls short of the axial load, the torque
            # capacity of the torque, or, with both, mu*p*pi*d*L of sqrt(F^2 + (2T/d)^2):
            # the fit's holding checks with no safety factor
            force, torque = np.abs(b(st.axial_load)), np.abs(b(st.torque))
            holding, capacity = b(st.holding_force[0]), b(st.torque_capacity[0])
            d = b(self.map.at(rows)["diameter"])
            slips = ((force > 0) & (holding < force)) | ((torque > 0) & (capacity < torque))
            slips |= (force > 0) & (torque > 0) & (holding < np.hypot(force, 2 * torque / d))
            flags[(st.name, "slips", st.name)] = slips
        for st in states:
            fails = np.zeros(n, dtype=bool)
            for (state, kind), ok in verdicts.items():
                if state == st.name:
                    ok = b(ok)
                    flags[(kind, "check-fails", state)] = ok == 0
                    fails |= ok == 0
                    undecided += int(np.count_nonzero(ok == -1))
            flags[("checks", "check-fails", st.name)] = fails
        return out, flags, undecided


def run_fit_study(fit, found, build, samples=10_000, seed=1, outputs=None, source=None,
                  progress=None):
    """Study a fit over its toleranced inputs (see :func:`axialfe.tolerance.study.run_study`
    for the fields of the result).

    Parameters
    ----------
    fit : PressFit
        The fit at its nominal values (:func:`axialfe.fits.reader.read_fit_toleranced`).
    found : sequence of Toleranced
    build : callable
        ``build({path: SI value})``: the fit read again with those inputs moved.

    Outputs are ``<state>:pressure`` and ``<state>:holding_force``; events
    ``loosens`` (no interference left), ``slips`` (a load beyond what the fit holds,
    no safety factor) and ``check-fails`` (one per check of each state, and
    ``checks`` for any of them).
    """
    refuse_problems(found, source, "the fit has no toleranced input: give it by an ISO 286 "
                    "designation (iso = \"50 H7/p6\"), by 'shaft' and 'bore' limits, or write a "
                    "value with its tolerance, e.g. friction = \"0.12 ±0.02\"")
    nominal = solve_fit(build({t.path: t.tolerance.nominal for t in found}))
    values = {f"{s.name}:{o}": (s.name, _KINDS[o], getattr(s, o)[0]) for s in nominal.states
              for o in FIT_OUTPUTS}
    for name in outputs or ():
        if name not in values:
            raise ModelError(f"unknown output '{name}'", place="--output",
                             hint=suggest(name, list(values)), options=list(values))
    batch = _Fits(fit, found, build, source)
    monotone = all(p.rsplit(".", 1)[-1] in _MONOTONE for p in batch.paths)
    notes = ["each sample by the fit's own Lamé formulas on arrays (Shigley, 9th ed., eq. 3-56, "
             "from memory); a sample's interference is shaft - bore where the limits give the "
             "diameters",
             "slips: the holding force mu*p*pi*d*L is below the axial load, the torque capacity "
             "below the torque, or, with both, mu*p*pi*d*L below sqrt(F^2 + (2T/d)^2): the "
             "fit's holding checks with no safety factor; loosens: no interference left"]
    u = fit.units
    return run_closed_study(batch, fit.title, OutputUnits(u.force, u.length, u.length, u.stress),
                            values, list(dict.fromkeys(outputs)) if outputs else list(values),
                            samples, seed, monotone, notes, progress)
