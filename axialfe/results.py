"""Results: frozen, named arrays of one solved case, with look-ups and tables.

All arrays are in SI units (m, N, Pa); :meth:`CaseResult.to_dict` converts to a
model's output units for display.  Signs: displacements and external forces
are positive toward +x; axial force, stress and strain are positive in
tension; a reaction is the force a support exerts on the bar.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .errors import ModelError, suggest
from .mechanics import Fields
from .model import Model
from .model.arrays import frozen as _frozen
from .units import OutputUnits

__all__ = ["CaseResult", "Deferred", "Solution", "RESIDUAL_BOUND", "certify", "rounding_bounds", "TABLES"]

# The largest station imbalance, relative to the largest force, a result may have
# and still be called accurate (far above rounding, far below any error that matters).
RESIDUAL_BOUND = 1e-9

_ARRAYS = ("u", "axial_force", "stress", "mechanical_strain", "elongation", "elastic_elongation",
           "thermal_elongation", "thermal_strain", "temperature_change", "length", "reactions",
           "applied", "gap_force", "gap_opening", "gap_closed")


class Deferred:
    """A value of a result made on first use: ``Deferred(function, *args)`` stands for
    ``function(*args)``, computed (and checked) the first time it is read, then kept.

    Recovery defers what only some readers need and what follows from the arrays it
    has checked (the fields inside the segments, stresses and strains), so a solve
    makes them only for the checks, diagrams and envelopes that read them.
    """

    __slots__ = ("function", "args")

    def __init__(self, function, *args):
        self.function, self.args = function, args

    def __call__(self):
        return self.function(*self.args)


class _OnFirstUse:
    """A field of :class:`CaseResult` that may be given as a :class:`Deferred`: it is
    made, checked as the result checks that field, and kept when first read."""

    def __init__(self, check=None, default=None, required=True):
        self.check, self.default, self.required = check, default, required

    def __set_name__(self, owner, name):
        self.name = name

    def __get__(self, obj, owner=None):
        if obj is None:
            # what the dataclass takes for the field's default: none for a required field
            if self.required:
                raise AttributeError(self.name)
            return self.default
        value = obj.__dict__[self.name]
        if isinstance(value, Deferred):
            value = value()
            if self.check is not None:
                value = self.check(obj, self.name, value)
            obj.__dict__[self.name] = value
        return value

    def __set__(self, obj, value):
        obj.__dict__[self.name] = value


def _kept(result, key, value):
    """``value`` as a result keeps an array: read-only, a view where nothing can change it
    (read-only all the way down), a copy otherwise; and finite."""
    arr = value.view() if _frozen(value) else np.array(value)
    arr.setflags(write=False)
    # (the least and the largest are finite only where every value is: NaN spreads)
    if (arr.dtype.kind == "f" and arr.size
            and not (np.isfinite(arr.min()) and np.isfinite(arr.max()))):
        raise FloatingPointError(f"non-finite {key} in case '{result.name}'")
    return arr


# the tables of a result (to_frame, _repr_html_): name, the rows of a to_dict, its columns as
# (heading, key, unit kind or None); the unit is written into the heading
_TABLES = {
    "stations": (("station", "name", None), ("x", "x", "length"),
                 ("displacement", "displacement", "displacement")),
    "segments": (("segment", "name", None), ("from", "from", None), ("to", "to", None),
                 ("length", "length", "length"), ("N from", ("axial_force", 0), "force"),
                 ("N to", ("axial_force", 1), "force"), ("stress from", ("stress", 0), "stress"),
                 ("stress to", ("stress", 1), "stress"),
                 ("elongation", "elongation", "displacement"),
                 ("temperature change", "temperature_change", "K")),
    "reactions": (("at", "at", None), ("kind", "kind", None), ("force", "force", "force")),
    "gaps": (("gap", "name", None), ("kind", "kind", None), ("state", "state", None),
             ("opening", "opening", "displacement"), ("force", "force", "force")),
}
TABLES = tuple(_TABLES)


def _heading(title: str, kind, units: dict) -> str:
    if kind is None:
        return title
    return f"{title} [{'K' if kind == 'K' else units[kind]}]"


def _cell(row: dict, key):
    return row[key[0]][key[1]] if isinstance(key, tuple) else row[key]


def _pandas():
    try:
        import pandas
    except ImportError as exc:  # an optional extra
        raise ImportError("results as DataFrames need pandas: pip install 'axialfe[frames]'") from exc
    return pandas


def _html_tables(data: dict, units: dict, caption: str) -> str:
    """The tables of one case's ``to_dict`` as small HTML (every text escaped)."""
    import html

    from .formatting import number

    out = [f"<div><p><strong>{html.escape(caption)}</strong></p>"]
    for table, columns in _TABLES.items():
        rows = data[table]
        if not rows:
            continue
        head = "".join(f"<th>{html.escape(_heading(t, k, units))}</th>" for t, _, k in columns)
        body = "".join(
            "<tr>" + "".join(
                f"<td>{html.escape(number(v, 6) if isinstance(v, float) else str(v))}</td>"
                for v in (_cell(r, key) for _, key, _ in columns)) + "</tr>" for r in rows)
        out.append(f"<table><caption>{table}</caption><thead><tr>{head}</tr></thead>"
                   f"<tbody>{body}</tbody></table>")
    out.append("</div>")
    return "".join(out)


@dataclass(frozen=True, repr=False)
class CaseResult:
    """The solution of one case (or combination) of a model.

    Attributes
    ----------
    name : str
    model : Model
    u : ndarray, shape (n_stations,)
        Station displacements.
    axial_force, stress, mechanical_strain : ndarray, shape (n_segments, 2)
        At each segment's ``from`` and ``to`` end.
    elongation, thermal_strain, length : ndarray, shape (n_segments,)
        Change of distance between the end stations; alpha*dT; segment length.
    elastic_elongation, thermal_elongation : ndarray, shape (n_segments,)
        The parts of the elongation from force (integral of N/EA) and from
        alpha*dT*L; the misfit is the rest.
    temperature_change : ndarray, shape (n_segments,)
    reactions : ndarray, shape (n_supports,)
        Force each support exerts on the bar (a spring's is -k*u).
    gap_force, gap_opening : ndarray, shape (n_gaps,)
        Force carried by each gap (tension positive) and its remaining clearance.
    gap_closed : ndarray of bool, shape (n_gaps,)
    applied : ndarray, shape (n_stations,)
        Point loads of this case.
    equilibrium_residual : float
        Largest out-of-balance station force relative to the largest applied
        load, reaction, gap or segment force (0 when all are zero).
    notes : tuple of str
    fields : Fields
        N(t), A(t) and sigma(t) inside each segment (:mod:`axialfe.mechanics.fields`).
    status : {'ok', 'inaccurate'}
        ``'inaccurate'`` when the result's own certificate (the equilibrium
        residual) exceeds :data:`RESIDUAL_BOUND`; never only printed.
    message : str or None
        What is wrong and what to do, when the status is not ok.
    compatibility_defect : float
        The worst disagreement of the displacements with the reported state
        (segment elongations, closed gaps' openings, open gaps' forces, contact
        force signs), relative to the numbers it comes from
        (:mod:`axialfe.engine.certificate`); above :data:`RESIDUAL_BOUND` the
        status is ``'inaccurate'``.

    Every array is read-only: an array given read-only, with every array it is a
    view of read-only too, is kept as a view (the engine hands over the arrays
    it has just made that way); any other is copied.  ``fields`` and the arrays
    that follow from the checked ones (stresses, strains, the parts of the
    elongation) may be given as :class:`Deferred`: each is made, kept and checked
    (read-only, finite) when it is first read.
    """

    name: str
    model: Model
    u: np.ndarray
    axial_force: np.ndarray
    stress: np.ndarray = _OnFirstUse(_kept)
    mechanical_strain: np.ndarray = _OnFirstUse(_kept)
    elongation: np.ndarray = _OnFirstUse(_kept)
    elastic_elongation: np.ndarray = _OnFirstUse(_kept)
    thermal_elongation: np.ndarray = _OnFirstUse(_kept)
    thermal_strain: np.ndarray = _OnFirstUse(_kept)
    temperature_change: np.ndarray = _OnFirstUse(_kept)
    length: np.ndarray = _OnFirstUse(_kept)
    reactions: np.ndarray
    applied: np.ndarray
    gap_force: np.ndarray
    gap_opening: np.ndarray
    gap_closed: np.ndarray
    equilibrium_residual: float
    notes: tuple[str, ...] = field(default=())
    fields: Fields | None = _OnFirstUse(required=False)
    status: str = "ok"
    message: str | None = None
    compatibility_defect: float = 0.0

    def __post_init__(self):
        for key in _ARRAYS:
            value = self.__dict__[key]
            if not isinstance(value, Deferred):   # a deferred one is kept when it is made
                object.__setattr__(self, key, _kept(self, key, value))

    # --- look-ups -------------------------------------------------------
    def displacement(self, station: str) -> float:
        """Displacement of ``station`` (m)."""
        return float(self.u[self.model.station_index(station)])

    def force(self, segment: str) -> np.ndarray:
        """Axial force [at from, at to] of ``segment`` (N)."""
        return self.axial_force[self.model.segment_index(segment)]

    def reaction(self, station: str) -> float:
        """Sum of the support reactions at ``station`` (N)."""
        self.model.station_index(station)
        at = [s.at for s in self.model.supports]
        if station not in at:
            raise ModelError(f"station '{station}' has no support", place="reactions",
                             hint=suggest(station, at))
        return float(sum(r for r, a in zip(self.reactions, at) if a == station))

    def gap(self, name: str) -> dict:
        """State, opening (m) and force (N) of gap ``name``."""
        names = [g.name for g in self.model.gaps]
        if name not in names:
            raise ModelError(f"unknown gap '{name}'", place="gaps", hint=suggest(name, names))
        j = names.index(name)
        return {"state": "closed" if self.gap_closed[j] else "open",
                "opening": float(self.gap_opening[j]), "force": float(self.gap_force[j])}

    # --- output ---------------------------------------------------------
    def to_dict(self, units: OutputUnits | None = None) -> dict:
        """Plain numbers in ``units`` (default: the model's), keyed as in the JSON output."""
        units = units or self.model.units
        fF, fL, fD, fS = (units.factor(k) for k in ("force", "length", "displacement", "stress"))
        fT = units.factor("temperature")
        m = self.model
        stations = [{"name": st.name, "x": st.x / fL, "displacement": float(self.u[i] / fD)}
                    for i, st in enumerate(m.stations)]
        segments = [{"name": s.name, "from": s.start, "to": s.end,
                     "length": float(self.length[i] / fL),
                     "axial_force": (self.axial_force[i] / fF).tolist(),
                     "stress": (self.stress[i] / fS).tolist(),
                     "elongation": float(self.elongation[i] / fD),
                     "temperature_change": float(self.temperature_change[i] / fT),
                     "thermal_strain": float(self.thermal_strain[i]),
                     "mechanical_strain": self.mechanical_strain[i].tolist(),
                     # a preload's misfit, as the solver found it (axialfe.engine.preload)
                     **({"preload_misfit": s.misfit / fL} if s.preload is not None else {})}
                    for i, s in enumerate(m.segments)]
        reactions = [{"at": s.at, "kind": s.kind, "force": float(self.reactions[j] / fF)}
                     for j, s in enumerate(m.supports)]
        gaps = [{"name": g.name, "kind": g.kind,
                 "state": "closed" if self.gap_closed[j] else "open",
                 "opening": float(self.gap_opening[j] / fD),
                 "force": float(self.gap_force[j] / fF)} for j, g in enumerate(m.gaps)]
        return {"name": self.name, "stations": stations, "segments": segments,
                "reactions": reactions, "gaps": gaps,
                "equilibrium_residual": float(self.equilibrium_residual),
                "compatibility_defect": float(self.compatibility_defect),
                "status": self.status, "message": self.message,
                "notes": list(self.notes)}

    def __repr__(self) -> str:
        m = self.model
        big = int(np.argmax(np.abs(self.axial_force).max(axis=1))) if len(m.segments) else 0
        return (f"<CaseResult '{self.name}': {len(m.stations)} stations, {len(m.segments)} segments,"
                f" max |N| = {np.abs(self.axial_force).max():.6g} N in '{m.segments[big].name}',"
                f" max |u| = {np.abs(self.u).max():.6g} m,"
                f" residual = {self.equilibrium_residual:.1e}>")

    def _repr_html_(self) -> str:
        """The case as HTML tables, in the model's units (shown by Jupyter)."""
        units = self.model.units
        status = "" if self.status == "ok" else f" \u2014 {self.status.upper()}: {self.message}"
        return _html_tables(self.to_dict(units), units.as_dict(),
                            f"case '{self.name}' of '{self.model.title}' (residual "
                            f"{self.equilibrium_residual:.1e}){status}")

    def to_frame(self, table: str = "segments", units: OutputUnits | None = None):
        """One table of the case as a pandas DataFrame, units in the column names.

        Parameters
        ----------
        table : {'stations', 'segments', 'reactions', 'gaps'}
        units : OutputUnits, optional
            Default: the model's.

        Returns
        -------
        pandas.DataFrame
            One row per station, segment, support or gap, in model order; e.g.
            the columns of ``'segments'``: ``segment``, ``from``, ``to``,
            ``length [mm]``, ``N from [N]``, ``N to [N]``, ``stress from [MPa]``,
            ``stress to [MPa]``, ``elongation [mm]``, ``temperature change [K]``.

        Raises
        ------
        ImportError
            Without pandas (``pip install 'axialfe[frames]'``).
        """
        if table not in _TABLES:
            raise ModelError(f"unknown table '{table}'", hint=suggest(table, TABLES),
                             options=TABLES)
        pandas = _pandas()
        units = units or self.model.units
        u = units.as_dict()
        columns = _TABLES[table]
        rows = self.to_dict(units)[table]
        return pandas.DataFrame([[_cell(r, key) for _, key, _ in columns] for r in rows],
                                columns=[_heading(t, k, u) for t, _, k in columns])


@dataclass(frozen=True, repr=False)
class Solution:
    """The solved cases of one model, in file order, then the combinations."""

    model: Model
    cases: tuple[CaseResult, ...]

    def __getitem__(self, name: str) -> CaseResult:
        for c in self.cases:
            if c.name == name:
                return c
        names = [c.name for c in self.cases]
        raise ModelError(f"unknown case '{name}'", place="cases", hint=suggest(name, names),
                         options=names)

    def __iter__(self):
        return iter(self.cases)

    def __len__(self):
        return len(self.cases)

    @property
    def names(self) -> tuple[str, ...]:
        return tuple(c.name for c in self.cases)

    @property
    def inaccurate(self) -> tuple[CaseResult, ...]:
        """The cases whose status is not ok."""
        return tuple(c for c in self.cases if c.status != "ok")

    def to_dict(self, units: OutputUnits | None = None) -> dict:
        units = units or self.model.units
        return {"title": self.model.title, "units": units.as_dict(),
                "cases": [c.to_dict(units) for c in self.cases]}

    def __repr__(self) -> str:
        return f"<Solution of '{self.model.title}': cases {', '.join(self.names)}>"

    def _repr_html_(self) -> str:
        """Every case as HTML tables, in the model's units (shown by Jupyter)."""
        return "".join(c._repr_html_() for c in self.cases)

    def to_frames(self, units: OutputUnits | None = None, checks=None) -> dict:
        """The results of every case as pandas DataFrames, units in the column names.

        Parameters
        ----------
        units : OutputUnits, optional
            Default: the model's.
        checks : CheckReport, optional
            The design checks (:func:`axialfe.checks.check_solution`), for a
            ``'checks'`` frame: the checks belong to a higher floor, so they are
            passed in.

        Returns
        -------
        dict of str to pandas.DataFrame
            ``'stations'``, ``'segments'``, ``'reactions'``, ``'gaps'`` (each with a
            first column ``case``, the rows of :meth:`CaseResult.to_frame` for every
            case in turn) and, with ``checks``, ``'checks'``: case, check, name,
            demand, capacity, their unit, utilization, result and note.
        """
        pandas = _pandas()
        units = units or self.model.units
        frames = {}
        for table in _TABLES:
            parts = []
            for case in self.cases:
                frame = case.to_frame(table, units)
                frame.insert(0, "case", case.name)
                parts.append(frame)
            frames[table] = pandas.concat(parts, ignore_index=True)
        if checks is not None:
            rows = []
            for case in checks.cases:
                for entry in case:
                    f = units.factor(entry.quantity)
                    rows.append([case.case, entry.kind, entry.name,
                                 None if entry.demand is None else entry.demand / f,
                                 None if entry.capacity is None else entry.capacity / f,
                                 getattr(units, entry.quantity), entry.utilization,
                                 entry.verdict, entry.note_in(units)])
            frames["checks"] = pandas.DataFrame(rows, columns=[
                "case", "check", "name", "demand", "capacity", "unit", "utilization", "result",
                "note"])
        return frames


def certify(residual: float) -> tuple[str, str | None]:
    """The status and message of a result with equilibrium ``residual``."""
    if residual <= RESIDUAL_BOUND:
        return "ok", None
    return "inaccurate", (f"the equilibrium residual {residual:.1e} exceeds {RESIDUAL_BOUND:.0e}: "
                          "the result does not balance and must not be used; check for segments "
                          "of widely different stiffness or a nearly singular model")


# values within this many units of rounding of the largest of their kind are rounding noise
_NOISE_ULPS = 1e3 * float(np.finfo(float).eps)


def rounding_bounds(result: CaseResult) -> dict[str, float]:
    """The magnitude below which a value of each kind is rounding noise in ``result`` (SI).

    The bound is the one the recovery uses for the residual: 1000 units of rounding of
    the largest value of the same kind in the case (displacements with elongations,
    forces with reactions, loads and gap forces, stresses).  Output shows a value
    below it as 0 (a symmetric station that does not move, not 1.7e-21 mm).
    """
    def largest(*arrays):
        return max((float(np.abs(a).max(initial=0.0)) for a in arrays), default=0.0)

    return {"displacement": _NOISE_ULPS * largest(result.u, result.elongation, result.gap_opening),
            "force": _NOISE_ULPS * largest(result.axial_force, result.reactions, result.applied,
                                           result.gap_force),
            "stress": _NOISE_ULPS * largest(result.stress)}
