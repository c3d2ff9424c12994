"""Load states: what each case and combination puts on the model, as arrays.

A :class:`LoadState` is everything that varies between cases: point forces,
the temperature change of every segment, the displacement of every settlement
support and the factor on distributed loads.  Misfits and self-weight belong to
the parts and are present in every state once.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .parts import Case, Model

__all__ = ["LoadState", "case_state", "load_states"]


@dataclass(frozen=True)
class LoadState:
    """One set of loads on a model (SI units).

    Attributes
    ----------
    name : str
    forces : ndarray, shape (n_stations,)
        Point forces at the stations.
    dT : ndarray, shape (n_segments,)
        Temperature change of each segment.
    settlement : ndarray, shape (n_supports,)
        Prescribed displacement of each support (0 for fixed and spring ones).
    q_factor : float
        Factor on the segments' distributed loads.
    """

    name: str
    forces: np.ndarray
    dT: np.ndarray
    settlement: np.ndarray
    q_factor: float = 1.0

    def with_temperature(self, dT) -> "LoadState":
        return LoadState(self.name, self.forces, np.broadcast_to(np.asarray(dT, float), self.dT.shape).copy(),
                         self.settlement, self.q_factor)

    def scaled_loads(self, factor) -> "LoadState":
        return LoadState(self.name, self.forces * factor, self.dT, self.settlement,
                         self.q_factor * factor)


def _own_temperatures(model: Model) -> np.ndarray:
    return np.array(model.arrays.temperature_change)


def _case_overrides(model: Model, case: Case):
    """Return (values, mask): the case's temperature for each segment it sets."""
    m = len(model.segments)
    values, mask = np.zeros(m), np.zeros(m, dtype=bool)
    table = dict(case.temperature_change)
    if "all" in table:
        values[:], mask[:] = table["all"], True
    for name, dt in table.items():
        if name != "all":
            i = model.segment_index(name)
            values[i], mask[i] = dt, True
    return values, mask


def _case_settlements(model: Model, case: Case):
    values = np.array([s.displacement for s in model.supports], dtype=float)
    mask = np.zeros(len(model.supports), dtype=bool)
    moved = dict(case.settlements)
    for j, s in enumerate(model.supports):
        if s.kind == "settlement" and s.at in moved:
            values[j], mask[j] = moved[s.at], True
    return values, mask


def _case_forces(model: Model, case: Case):
    forces = np.zeros(len(model.stations))
    for load in case.loads:
        forces[model.station_index(load.at)] += load.force
    return forces


def case_state(model: Model, case: Case) -> LoadState:
    """Return the load state of one case."""
    own = _own_temperatures(model)
    values, mask = _case_overrides(model, case)
    settle, _ = _case_settlements(model, case)
    return LoadState(case.name, _case_forces(model, case), np.where(mask, values, own), settle)


def load_states(model: Model) -> list[LoadState]:
    """Return the load states of every case, in file order, then every combination.

    A combination's loads, temperature changes and settlements are the factored
    sums of what its cases give; a segment's own temperature (and a support's
    own settlement) counts once, unfactored, where no combined case sets it.
    """
    cases = {c.name: c for c in model.all_cases}
    states = [case_state(model, c) for c in model.all_cases]
    own_t = _own_temperatures(model)
    own_s = np.array([s.displacement for s in model.supports], dtype=float)
    for comb in model.combinations:
        forces = np.zeros(len(model.stations))
        t_sum, t_set = np.zeros(len(model.segments)), np.zeros(len(model.segments), bool)
        s_sum, s_set = np.zeros(len(model.supports)), np.zeros(len(model.supports), bool)
        for name, factor in comb.factors:
            case = cases[name]
            forces += factor * _case_forces(model, case)
            values, mask = _case_overrides(model, case)
            t_sum += factor * np.where(mask, values, 0.0)
            t_set |= mask
            values, mask = _case_settlements(model, case)
            s_sum += factor * np.where(mask, values, 0.0)
            s_set |= mask
        states.append(LoadState(comb.name, forces, np.where(t_set, t_sum, own_t),
                                np.where(s_set, s_sum, own_s)))
    return states
