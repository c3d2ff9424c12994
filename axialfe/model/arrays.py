"""The array form of a model: one struct of arrays that everything downstream reads.

A model built from objects (the file reader, the object API) gathers its
per-segment inputs here once; a model built by :meth:`Model.from_arrays` is
born in this form and never makes an object per segment unless one is asked
for.  Positions, section factors (``A = c*P*Q``, see
:mod:`axialfe.mechanics.sections`) and material values are SI floats.

Per-segment arrays have shape ``(m,)``.  The element arithmetic broadcasts, so
a leading sample axis (``(k, m)``: k variants of one topology, as a tolerance
study draws them) can be carried through the same functions later.
"""

from __future__ import annotations

import math
import operator
from collections.abc import Sequence
from dataclasses import MISSING, dataclass

import numpy as np

from .._gcpause import gc_paused
from ..errors import ModelError

__all__ = ["ModelArrays", "gather", "from_arrays", "frozen"]

_FIELDS = operator.attrgetter("section", "end_section", "material", "start", "end", "misfit",
                              "distributed_load", "temperature_change", "preload")


@dataclass(frozen=True)
class ModelArrays:
    """A model's stations and segments as arrays (SI units, read-only).

    Attributes
    ----------
    x : ndarray, shape (n,)
        Station positions.
    start, end : ndarray of int, shape (m,)
        Station indices of each segment's ``from`` and ``to`` end.
    c, p1, q1, p2, q2 : ndarray, shape (m,)
        Section factors at the two ends.
    elastic_modulus, thermal_expansion, density : ndarray, shape (m,)
        ``density`` is 0 where none is given.
    misfit, distributed_load, temperature_change : ndarray, shape (m,)
        ``temperature_change`` is each segment's own change, the model's
        default filled in (0 without one).
    preload : ndarray, shape (m,)
        Each segment's installed force (N), NaN where it has none.
    load_at, load_force : ndarray, shape (k,)
        The model's own point loads (the case ``base`` of a model without
        cases): station index (int) and force (N, + toward +x) of each, in order.
    """

    x: np.ndarray
    start: np.ndarray
    end: np.ndarray
    c: np.ndarray
    p1: np.ndarray
    q1: np.ndarray
    p2: np.ndarray
    q2: np.ndarray
    elastic_modulus: np.ndarray
    thermal_expansion: np.ndarray
    density: np.ndarray
    misfit: np.ndarray
    distributed_load: np.ndarray
    temperature_change: np.ndarray
    preload: np.ndarray
    load_at: np.ndarray
    load_force: np.ndarray

    def __post_init__(self):
        for name in self.__dataclass_fields__:
            value = getattr(self, name)
            # an array its maker handed over read-only is kept; any other is copied
            value = value.view() if frozen(value) else np.array(value)
            value.setflags(write=False)
            object.__setattr__(self, name, value)


def frozen(value) -> bool:
    """True for an ndarray that is read-only, as is every array it is a view of: nothing
    can write it, so it may be kept without a copy (the model and the results do)."""
    while isinstance(value, np.ndarray):
        if value.flags.writeable:
            return False
        if value.base is None:
            return True
        value = value.base
    return False


def _by_object(objects, values, width):
    """Rows of ``values(obj)`` per item, computed once per distinct object.

    Segments share a few materials and sections, so the per-segment work is an
    ``id`` and one vectorised ``np.unique``; the rows come by fancy indexing.
    """
    ids = np.fromiter(map(id, objects), dtype=np.int64, count=len(objects))
    uniq, first, codes = np.unique(ids, return_index=True, return_inverse=True)
    table = np.array([values(objects[i]) for i in first], dtype=float).reshape(len(uniq), width)
    return table[codes].T


def gather(model) -> ModelArrays:
    """The array form of a model built from objects (one C-level pass over the segments).

    Raises
    ------
    ModelError
        When a value is a sympy symbol (the numeric form needs numbers).
    """
    try:
        with gc_paused():
            return _gather(model)
    except TypeError:  # a sympy symbol cannot become a float
        raise ModelError("the model holds symbolic values; give every symbol a value, or ask "
                         "for the closed form (axialfe closed-form)", file=model.source) from None


def _gather(model) -> ModelArrays:
    m = len(model.segments)
    sec, end_sec, mat, start, end, misfit, q, dT, preload = zip(*map(_FIELDS, model.segments))
    end_sec = [e if e is not None else s for s, e in zip(sec, end_sec)]
    index = model._station_index
    default = model.temperature_change or 0.0
    c, p1, q1 = _by_object(sec, lambda s: s.factors, 3)
    _, p2, q2 = _by_object(end_sec, lambda s: s.factors, 3)
    E, alpha, rho = _by_object(
        mat, lambda t: (t.elastic_modulus, t.thermal_expansion, t.density or 0.0), 3)
    return ModelArrays(
        x=np.fromiter(map(operator.attrgetter("x"), model.stations), dtype=float,
                      count=len(model.stations)),
        start=np.fromiter(map(index.__getitem__, start), dtype=np.int64, count=m),
        end=np.fromiter(map(index.__getitem__, end), dtype=np.int64, count=m),
        c=c, p1=p1, q1=q1, p2=p2, q2=q2, elastic_modulus=E, thermal_expansion=alpha, density=rho,
        misfit=np.asarray(misfit, dtype=float), distributed_load=np.asarray(q, dtype=float),
        temperature_change=np.array([default if v is None else v for v in dT], dtype=float),
        preload=np.array([np.nan if v is None else v for v in preload], dtype=float),
        load_at=model.load_stations, load_force=_load_forces(model.loads))


def _load_forces(loads):
    from .parts import PointLoads

    if isinstance(loads, PointLoads):
        return loads.force
    return np.fromiter(map(operator.attrgetter("force"), loads), dtype=float, count=len(loads))


# --- Model.from_arrays ------------------------------------------------------------

class _Stations(Sequence):
    """The stations of an array model, made on access (named ``s0, s1, ...``)."""

    def __init__(self, x):
        self._x = x

    def __len__(self):
        return len(self._x)

    def __getitem__(self, i):
        from .parts import Station

        if isinstance(i, slice):
            return tuple(self[j] for j in range(*i.indices(len(self))))
        i = range(len(self))[i]
        return Station(f"s{i}", float(self._x[i]))


class _Segments(Sequence):
    """The segments of an array model, made on access (``e0, e1, ...``, each with its
    own material and plain-area section of the same name; a taper's end section is
    ``e0-end``)."""

    constant_properties = True   # materials of plain values: none against temperature

    def __init__(self, arrays, yield_strength, second_moment):
        self._a, self._fy, self._inertia = arrays, yield_strength, second_moment

    def __len__(self):
        return len(self._a.start)

    def __getitem__(self, i):
        from .parts import Material, Section, Segment

        if isinstance(i, slice):
            return tuple(self[j] for j in range(*i.indices(len(self))))
        i = range(len(self))[i]
        a = self._a
        name = f"e{i}"
        fy, rho = self._fy[i], a.density[i]
        material = Material(name, float(a.elastic_modulus[i]), float(a.thermal_expansion[i]),
                            None if math.isnan(fy) else float(fy), float(rho) if rho else None)
        extra = (() if math.isnan(self._inertia[i])
                 else (("second_moment", float(self._inertia[i])),))
        section = Section(name, "area", (("area", float(a.p1[i])),) + extra)
        end_section = (None if a.p2[i] == a.p1[i] else
                       Section(f"{name}-end", "area", (("area", float(a.p2[i])),) + extra))
        preload = float(a.preload[i])
        return Segment(name, f"s{a.start[i]}", f"s{a.end[i]}", material, section, end_section,
                       temperature_change=float(a.temperature_change[i]),
                       misfit=float(a.misfit[i]), distributed_load=float(a.distributed_load[i]),
                       preload=None if math.isnan(preload) else preload)


def _fixed(value, shape):
    """A read-only array of one value: a view of a single number (no memory per segment),
    shared by the fields it fills."""
    one = np.array(float(value))
    one.setflags(write=False)
    return np.broadcast_to(one, shape)


def _value(value, shape, what, allow_nan=False):
    """A per-segment array, or one shared read-only value where a scalar is given."""
    if np.ndim(value) == 0:
        v = float(value)
        if not (math.isfinite(v) or (allow_nan and math.isnan(v))):
            raise ModelError(f"{what}[0] must be finite: got {v:g}", place="from_arrays")
        return _fixed(v, shape)
    return _array(value, shape, what, allow_nan=allow_nan)


def _array(value, shape, what, positive=False, nonnegative=False, allow_nan=False):
    arr = np.array(np.broadcast_to(np.asarray(value, dtype=float), shape), dtype=float)
    bad = ~np.isfinite(arr)
    if allow_nan:
        bad &= ~np.isnan(arr)
    if positive:
        bad |= arr <= 0
    if nonnegative:
        bad |= arr < 0
    if bad.any():
        i = int(np.flatnonzero(bad)[0])
        need = "positive" if positive else "not negative" if nonnegative else "finite"
        raise ModelError(f"{what}[{i}] must be {need}: got {arr.flat[i]:g}", place="from_arrays")
    arr.setflags(write=False)   # a fresh copy: ModelArrays keeps it without another
    return arr


def _indices(value, n, what, unique=False):
    try:
        arr = np.asarray(value)
        if arr.size and (arr.dtype.kind not in "iu" or arr.ndim != 1):
            raise TypeError
        arr = arr.astype(np.int64)   # a copy of its own
        if arr.ndim != 1:
            arr = arr.reshape(-1).copy()
    except (TypeError, ValueError):
        raise ModelError(f"{what} must be a one-dimensional array of station indices",
                         place="from_arrays") from None
    out = (arr < 0) | (arr >= n)
    if out.any():
        i = int(np.flatnonzero(out)[0])
        raise ModelError(f"{what}[{i}] = {arr[i]} is not a station index (0 to {n - 1})",
                         place="from_arrays")
    if unique and len(np.unique(arr)) != len(arr):
        raise ModelError(f"{what} names a station twice", place="from_arrays")
    return arr


def from_arrays(cls, x, start, end, elastic_modulus, area, thermal_expansion=0.0,
                temperature_change=0.0, fixed=(), load_at=(), load_force=(), *,
                yield_strength=None, second_moment=None, density=None, gravity=0.0,
                spring_at=(), spring_stiffness=(), gap_at=(), gap_side=(), gap_clearance=(),
                end_area=None, misfit=0.0, distributed_load=0.0, preload=None,
                title="axial model"):
    """Build a :class:`Model` from arrays (see :meth:`Model.from_arrays`)."""
    from .parts import Gap, PointLoads, Support

    x = _array(x, np.shape(x), "x")
    if x.ndim != 1 or len(x) < 2:
        raise ModelError("x must be a one-dimensional array of at least two positions",
                         place="from_arrays")
    n = len(x)
    start, end = _indices(start, n, "start"), _indices(end, n, "end")
    if len(start) != len(end) or not len(start):
        raise ModelError(f"start and end need one index per segment: got {len(start)} and "
                         f"{len(end)}", place="from_arrays")
    m = (len(start),)
    same = x[start] == x[end]
    if same.any():
        i = int(np.flatnonzero(same)[0])
        raise ModelError(f"segment {i} joins stations at one position ({x[start[i]]:g} m); a "
                         "segment needs a length", place="from_arrays")
    A = _array(area, m, "area", positive=True)
    A2 = A if end_area is None else _array(end_area, m, "end_area", positive=True)
    start.setflags(write=False)   # fresh arrays of this call: the struct keeps them uncopied
    end.setflags(write=False)
    E = _array(elastic_modulus, m, "elastic_modulus", positive=True)
    alpha = _array(thermal_expansion, m, "thermal_expansion")
    rho = _array(0.0 if density is None else density, m, "density", nonnegative=True)
    dT = _array(temperature_change, m, "temperature_change")
    fy = _array(np.nan if yield_strength is None else yield_strength, m, "yield_strength",
                allow_nan=True)
    inertia = _array(np.nan if second_moment is None else second_moment, m, "second_moment",
                     allow_nan=True)
    if (fy <= 0).any() or (inertia <= 0).any():
        raise ModelError("yield_strength and second_moment must be positive", place="from_arrays")
    if not math.isfinite(gravity):
        raise ModelError(f"gravity must be finite: got {gravity:g}", place="from_arrays")
    fixed = _indices(fixed, n, "fixed", unique=True)
    load_at = _indices(load_at, n, "load_at")
    load_force = _array(load_force, load_at.shape, "load_force")
    load_at.setflags(write=False)
    ones = _fixed(1.0, m)
    arrays = ModelArrays(
        x=x, start=start, end=end, c=ones, p1=A, q1=ones, p2=A2, q2=ones,
        elastic_modulus=E, thermal_expansion=alpha, density=rho,
        misfit=_value(misfit, m, "misfit"),
        distributed_load=_value(distributed_load, m, "distributed_load"),
        temperature_change=dT,
        preload=_value(np.nan if preload is None else preload, m, "preload", allow_nan=True),
        load_at=load_at, load_force=load_force)
    spring_at = _indices(spring_at, n, "spring_at")
    spring_k = _array(spring_stiffness, spring_at.shape, "spring_stiffness", positive=True)
    gap_at = _indices(gap_at, n, "gap_at")
    clearance = _array(gap_clearance, gap_at.shape, "gap_clearance", nonnegative=True)
    sides = tuple(np.broadcast_to(np.asarray(gap_side, dtype=object), gap_at.shape))
    supports = (tuple(Support(f"s{i}") for i in fixed)
                + tuple(Support(f"s{i}", "spring", float(k)) for i, k in zip(spring_at, spring_k)))
    gaps = tuple(Gap(f"g{j}", (f"s{i}",), float(c), side=side)
                 for j, (i, c, side) in enumerate(zip(gap_at, clearance, sides)))
    loads = PointLoads(arrays.load_at, arrays.load_force)
    model = object.__new__(cls)
    defaults = {"supports": supports, "loads": loads, "gaps": gaps, "gravity": float(gravity),
                "title": title, "stations": _Stations(x),
                "segments": _Segments(arrays, fy, inertia)}
    for name, fd in cls.__dataclass_fields__.items():
        if name in defaults:
            value = defaults[name]
        elif fd.default_factory is not MISSING:
            value = fd.default_factory()
        else:
            value = fd.default
        object.__setattr__(model, name, value)
    model.__dict__["arrays"] = arrays
    model.__dict__["load_stations"] = arrays.load_at
    object.__setattr__(model, "_station_index", _NameIndex("s", n))
    object.__setattr__(model, "_segment_index", _NameIndex("e", m[0]))
    return model


class _NameIndex(dict):
    """``{'s0': 0, 's1': 1, ...}`` without building it: names parsed on look-up."""

    def __init__(self, prefix, count):
        super().__init__()
        self._prefix, self._count = prefix, count

    def _parse(self, name):
        if isinstance(name, str) and name.startswith(self._prefix) and name[1:].isdigit():
            i = int(name[1:])
            if i < self._count and name == f"{self._prefix}{i}":
                return i
        return None

    def __contains__(self, name):
        return self._parse(name) is not None

    def __getitem__(self, name):
        i = self._parse(name)
        if i is None:
            raise KeyError(name)
        return i

    def get(self, name, default=None):
        i = self._parse(name)
        return default if i is None else i

    def __iter__(self):
        return (f"{self._prefix}{i}" for i in range(self._count))

    def __len__(self):
        return self._count

    def __reduce__(self):
        return (_NameIndex, (self._prefix, self._count))
