"""Load states: what each case and combination puts on the model, as arrays.

A :class:`LoadState` is everything that varies between cases: point forces,
the temperature change of every segment, the displacement of every settlement
support and the factor on distributed loads.  Misfits and self-weight belong to
the parts and are present in every state once.
"""

from __future__ import annotations

import operator
from dataclasses import dataclass

import numpy as np

from ..errors import ModelError, suggest
from .parts import Case, Model

__all__ = ["LoadState", "loading", "case_state", "load_states", "pick_state"]

_AT, _FORCE = operator.attrgetter("at"), operator.attrgetter("force")


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

    def scaled_temperature(self, factor) -> "LoadState":
        """The state with every segment's temperature change times ``factor``."""
        return LoadState(self.name, self.forces, self.dT * factor, self.settlement, self.q_factor)

    def scaled_loads(self, factor) -> "LoadState":
        return LoadState(self.name, self.forces * factor, self.dT, self.settlement,
                         self.q_factor * factor)


def _own_temperatures(model: Model, num) -> np.ndarray:
    if num is float:
        return np.array(model.arrays.temperature_change)
    default = num(model.temperature_change) if model.temperature_change is not None else num(0)
    return np.array([default if s.temperature_change is None else num(s.temperature_change)
                     for s in model.segments] or np.zeros(0), dtype=object)


def _case_parts(model: Model, case: Case, num, dtype):
    """What one case sets: point forces, and its temperatures and settlements with masks."""
    n = len(model.stations)
    index = model._station_index  # the model has checked every load's station
    if num is float and case.loads is model.loads:   # the model's own loads, as arrays
        arr = model.arrays
        forces = np.bincount(arr.load_at, arr.load_force, minlength=n)
    elif num is float:
        at = np.fromiter(map(index.__getitem__, map(_AT, case.loads)), dtype=np.int64,
                         count=len(case.loads))
        forces = np.bincount(at, np.fromiter(map(_FORCE, case.loads), dtype=float,
                                             count=len(at)), minlength=n)
    else:
        at = (model.load_stations if case.loads is model.loads else
              np.fromiter(map(index.__getitem__, map(_AT, case.loads)), dtype=np.int64,
                          count=len(case.loads)))
        forces = np.zeros(n, dtype=dtype)
        for i, load in zip(at, case.loads):
            forces[i] += num(load.force)
    m = len(model.segments)
    t_val, t_set = np.zeros(m, dtype=dtype), np.zeros(m, dtype=bool)
    table = dict(case.temperature_change)
    if "all" in table:
        t_val[:], t_set[:] = num(table["all"]), True
    for name, dt in table.items():
        if name != "all":
            i = model.segment_index(name)
            t_val[i], t_set[i] = num(dt), True
    s_val = np.zeros(len(model.supports), dtype=dtype)
    s_set = np.zeros(len(model.supports), dtype=bool)
    moved = dict(case.settlements)
    for j, s in enumerate(model.supports):
        if s.kind == "settlement" and s.at in moved:
            s_val[j], s_set[j] = num(moved[s.at]), True
    return forces, t_val, t_set, s_val, s_set


def loading(model: Model, name: str, num=float):
    """The point forces, temperature changes and settlements of case or combination ``name``.

    The one rule of cases and combinations, for the numeric and the exact solver
    alike (``num`` converts a model value: ``float`` gives float arrays, any other
    converter object arrays of its numbers).  A case is complete in itself; what
    it does not set keeps the model's own value (a segment's temperature, a
    support's settlement).  A combination is the factored sum of its cases'
    forces, temperatures and settlements; a segment's own temperature (and a
    support's own settlement) counts once, unfactored, where no combined case
    sets it.

    Returns
    -------
    forces : ndarray, shape (n_stations,)
    dT : ndarray, shape (n_segments,)
    settlement : ndarray, shape (n_supports,)
    """
    dtype = float if num is float else object
    cases = {c.name: c for c in model.all_cases}
    combos = {c.name: c for c in model.combinations}
    own_t = _own_temperatures(model, num)
    own_s = np.array([num(s.displacement) for s in model.supports] or np.zeros(0), dtype=dtype)
    if name in cases:
        forces, t_val, t_set, s_val, s_set = _case_parts(model, cases[name], num, dtype)
        return forces, np.where(t_set, t_val, own_t), np.where(s_set, s_val, own_s)
    forces = np.zeros(len(model.stations), dtype=dtype)
    t_sum, t_any = np.zeros(len(own_t), dtype=dtype), np.zeros(len(own_t), dtype=bool)
    s_sum, s_any = np.zeros(len(own_s), dtype=dtype), np.zeros(len(own_s), dtype=bool)
    for case_name, factor in combos[name].factors:
        f, t_val, t_set, s_val, s_set = _case_parts(model, cases[case_name], num, dtype)
        k = num(factor)
        forces = forces + k * f
        t_sum, t_any = t_sum + np.where(t_set, k * t_val, 0), t_any | t_set
        s_sum, s_any = s_sum + np.where(s_set, k * s_val, 0), s_any | s_set
    return forces, np.where(t_any, t_sum, own_t), np.where(s_any, s_sum, own_s)


def case_state(model: Model, case: Case) -> LoadState:
    """Return the load state of one case."""
    return _state(model, case.name)


def _state(model: Model, name: str) -> LoadState:
    """The load state of case or combination ``name``; its arrays, made for it alone, are
    read-only (results keep them without a copy)."""
    state = LoadState(name, *loading(model, name))
    for value in (state.forces, state.dT, state.settlement):
        value.setflags(write=False)
    return state


def load_states(model: Model) -> list[LoadState]:
    """Return the load states of every case, in file order, then every combination
    (see :func:`loading` for the rule)."""
    names = [c.name for c in model.all_cases] + [c.name for c in model.combinations]
    return [_state(model, name) for name in names]


def pick_state(model: Model, case: str | None) -> LoadState:
    """The load state of the case or combination named ``case`` (given on the command line
    as ``--case``); ``None`` picks the only one and is refused when there are several."""
    states = load_states(model)
    names = [s.name for s in states]
    if case is None:
        if len(states) > 1:
            raise ModelError("the model has several cases: choose one with --case",
                             place="--case", options=names)
        return states[0]
    if case not in names:
        raise ModelError(f"unknown case '{case}'", place="--case", hint=suggest(case, names),
                         options=names)
    return states[names.index(case)]
