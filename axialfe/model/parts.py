"""The input concepts: immutable, self-checking descriptions of an axial model.

Every value is a float in SI base units (m, N, Pa, K, kg); units are applied by
the file reader (:mod:`axialfe.modelfile`) or by whoever builds a model in code.
Objects check themselves in ``__post_init__``, so an invalid one cannot exist.
Names refer to stations, cases and segments; the model checks that every name
refers to something.
"""

from __future__ import annotations

import functools
import math
import numbers
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from ..errors import ModelError, suggest
from ..mechanics import sections
from ..units import OutputUnits

__all__ = [
    "Material", "Section", "Station", "Segment", "Support", "Load", "Gap",
    "Case", "Combination", "Project", "Model", "PropertyTable", "PointLoads", "BASE_CASE",
    "COLUMN_CURVES", "MODULUS_AT",
]

BASE_CASE = "base"
MODULUS_AT = ("temperature", "reference")   # where tabled moduli are evaluated
SHAPES = sections.SHAPES
SUPPORT_KINDS = ("fixed", "spring", "settlement")
GAP_KINDS = ("contact", "slack")
BEHAVIOURS = ("elastic", "elastic-plastic")


def _symbolic(value) -> bool:
    """A sympy expression: the closed form's values (the numeric solver refuses them)."""
    return type(value).__module__.startswith("sympy")


def _number(value, what, place) -> bool:
    """Check that ``value`` is a real number or a sympy expression; True for a real number.

    Strings (``"200 GPa"``), booleans and other objects are refused: units belong
    to the file reader, the object API takes SI floats.
    """
    if type(value) is float or isinstance(value, numbers.Real) and not isinstance(value, bool):
        return True
    if _symbolic(value):
        return False
    shown = f"'{value}'" if isinstance(value, str) else repr(value)
    raise ModelError(f"{what} must be a real number in SI units: got {shown}", place=place)


def _positive(value, what, place):
    if value is None or not _number(value, what, place):
        return
    if not (value > 0 and math.isfinite(value)):
        raise ModelError(f"{what} must be positive: got {value:g}", place=place)


def _finite(value, what, place):
    if value is not None and _number(value, what, place) and not math.isfinite(value):
        raise ModelError(f"{what} must be a finite number: got {value}", place=place)


def _name(value, what, place):
    if not isinstance(value, str) or not value:
        raise ModelError(f"{what} must be a name (a non-empty string): got {value!r}", place=place)


@dataclass(frozen=True)
class PropertyTable:
    """A property against temperature: ascending temperatures (K) and values (SI).

    ``reference`` (K) is the temperature an expansion table counts from (its
    mean coefficients or total strains are from there); None for a modulus or
    a strength.  Between entries the value is interpolated linearly; outside
    them it is not defined (:mod:`axialfe.mechanics.thermal`).
    """

    temperatures: tuple
    values: tuple
    reference: float | None = None

    def __post_init__(self):
        t, v = tuple(float(x) for x in self.temperatures), tuple(float(x) for x in self.values)
        object.__setattr__(self, "temperatures", t)
        object.__setattr__(self, "values", v)
        if len(t) < 2 or len(t) != len(v):
            raise ModelError("a table against temperature needs at least two entries")
        if not all(math.isfinite(x) for x in t + v) or t[0] <= 0:
            raise ModelError("a table against temperature needs finite values above absolute "
                             "zero")
        if any(b <= a for a, b in zip(t, t[1:])):
            raise ModelError("a table against temperature must not give one temperature twice")
        if self.reference is not None and not (math.isfinite(self.reference)
                                               and self.reference > 0):
            raise ModelError("a table's reference temperature must lie above absolute zero")

    @property
    def span(self):
        """(first, last) temperature of the table, K."""
        return self.temperatures[0], self.temperatures[-1]


@dataclass(frozen=True)
class Material:
    """A linear-elastic material.

    Parameters
    ----------
    name : str
    elastic_modulus : float
        Young's modulus E in Pa.
    thermal_expansion : float
        Linear coefficient alpha in 1/K.
    yield_strength : float, optional
        In Pa; enables strength checks and yield events.
    density : float, optional
        In kg/m^3; needed for self-weight.
    source : str, optional
        Where the values come from.
    poissons_ratio : float, optional
        Poisson's ratio nu, 0 < nu < 0.5; needed for press and shrink fits.
    behaviour : {'elastic', 'elastic-plastic'}
        ``'elastic-plastic'``: perfectly plastic at the yield strength (with
        linear kinematic hardening of slope ``hardening_modulus``), followed by
        :mod:`axialfe.tracking.plastic`; the linear solvers ignore it.
    compressive_yield_strength : float, optional
        In Pa; the yield strength in compression when it differs.
    hardening_modulus : float
        Plastic modulus H in Pa (slope of stress against plastic strain).
    modulus_table, yield_table : PropertyTable, optional
        E and f_y against temperature; ``elastic_modulus`` and ``yield_strength``
        then hold the table's first value (the solvers evaluate the table at each
        segment's temperature, :func:`axialfe.model.temperature.at_temperature`).
    expansion_table : PropertyTable, optional
        The expansion against temperature, from the table's reference:
        ``expansion_kind`` 'mean' (mean coefficients, 1/K) or 'total' (strains).
    """

    name: str
    elastic_modulus: float
    thermal_expansion: float = 0.0
    yield_strength: float | None = None
    density: float | None = None
    source: str | None = None
    poissons_ratio: float | None = None
    behaviour: str = "elastic"
    compressive_yield_strength: float | None = None
    hardening_modulus: float = 0.0
    modulus_table: PropertyTable | None = None
    yield_table: PropertyTable | None = None
    expansion_table: PropertyTable | None = None
    expansion_kind: str = "constant"

    def __post_init__(self):
        _name(self.name, "a material's name", "materials")
        place = f"materials.{self.name}"
        if self.expansion_kind not in ("constant", "mean", "total"):
            raise ModelError(f"unknown expansion kind '{self.expansion_kind}'", place=place,
                             options=("constant", "mean", "total"))
        if (self.expansion_table is None) != (self.expansion_kind == "constant"):
            raise ModelError("an expansion table needs its kind ('mean' or 'total') and a kind "
                             "other than 'constant' needs a table", place=place)
        if self.expansion_table is not None and self.expansion_table.reference is None:
            raise ModelError("an expansion table needs its reference temperature", place=place)
        if self.elastic_modulus is None:
            raise ModelError("elastic_modulus is required", place=place)
        _positive(self.elastic_modulus, "elastic_modulus", place)
        _finite(self.thermal_expansion, "thermal_expansion", place)
        _positive(self.yield_strength, "yield_strength", place)
        _positive(self.density, "density", place)
        nu = self.poissons_ratio
        if isinstance(nu, (int, float)) and not (0.0 < nu < 0.5):
            raise ModelError(f"poissons_ratio must lie between 0 and 0.5: got {nu:g}", place=place)
        if self.behaviour not in BEHAVIOURS:
            raise ModelError(f"unknown behaviour '{self.behaviour}'", place=place,
                             hint=suggest(str(self.behaviour), BEHAVIOURS), options=BEHAVIOURS)
        _positive(self.compressive_yield_strength, "compressive_yield_strength", place)
        _finite(self.hardening_modulus, "hardening_modulus", place)
        if isinstance(self.hardening_modulus, numbers.Real) and self.hardening_modulus < 0:
            raise ModelError(f"hardening_modulus must not be negative: got "
                             f"{self.hardening_modulus:g}", place=place)
        if self.behaviour == "elastic-plastic" and self.yield_strength is None:
            raise ModelError("an elastic-plastic material needs yield_strength", place=place)

    @property
    def plastic(self) -> bool:
        """Whether the material yields (behaviour 'elastic-plastic')."""
        return self.behaviour == "elastic-plastic"

    @property
    def tabled(self) -> bool:
        """Whether a property is given as a table against temperature."""
        return (self.modulus_table is not None or self.yield_table is not None
                or self.expansion_table is not None)


@dataclass(frozen=True)
class Section:
    """A cross-section.

    Parameters
    ----------
    name : str
    shape : {'round', 'tube', 'rectangle', 'area'}
    dimensions : tuple of (str, float)
        The defining sizes in m: ``diameter``; ``outer_diameter`` and
        ``inner_diameter``; ``width`` and ``height``; or ``area`` (m^2) with an
        optional ``second_moment`` (m^4).
    """

    name: str
    shape: str
    dimensions: tuple[tuple[str, float], ...]

    def __post_init__(self):
        _name(self.name, "a section's name", "sections")
        place = f"sections.{self.name}"
        if self.shape not in SHAPES:
            raise ModelError(f"unknown shape '{self.shape}'", place=place,
                             hint=suggest(self.shape, SHAPES), options=SHAPES)
        object.__setattr__(self, "dimensions", tuple(self.dimensions))
        need = sections.REQUIRED[self.shape]
        dims = dict(self.dimensions)
        for key in need:
            if key not in dims:
                raise ModelError(f"a {self.shape} section needs '{key}'", place=place)
        for key, value in self.dimensions:
            if key == "inner_diameter":
                if _number(value, key, place) and not (value >= 0 and math.isfinite(value)):
                    raise ModelError(f"inner_diameter must not be negative: got {value:g}", place=place)
            else:
                _positive(value, key, place)
        if self.shape == "tube":
            do, di = dims["outer_diameter"], dims["inner_diameter"]
            if isinstance(do, float) and isinstance(di, float) and di >= do:
                raise ModelError("the inner diameter must be smaller than the outer diameter:"
                                 f" got {di * 1e3:g} mm inside {do * 1e3:g} mm", place=place)

    def dim(self, key, default=None):
        return dict(self.dimensions).get(key, default)

    # a section is immutable and shared by many segments: its derived values are computed
    # once (kept in the instance's __dict__; equality and pickling see the fields only)
    @functools.cached_property
    def factors(self):
        """Return (c, p, q) with A = c*p*q (see :func:`axialfe.mechanics.sections.factors`)."""
        return sections.factors(self.shape, dict(self.dimensions), math.pi)

    @functools.cached_property
    def area(self) -> float:
        c, p, q = self.factors
        return c * p * q

    @functools.cached_property
    def second_moment(self) -> float | None:
        """The smaller principal second moment of area in m^4, None when unknown."""
        return sections.second_moment(self.shape, dict(self.dimensions), math.pi)


@dataclass(frozen=True)
class Station:
    """A named plane across the axis at position ``x`` (m).

    ``braced`` marks a station held laterally: compression members buckle
    between braced stations (see :mod:`axialfe.checks.bracing`).
    """

    name: str
    x: float
    braced: bool = False

    def __post_init__(self):
        _name(self.name, "a station's name", "stations")
        if self.x is None:
            raise ModelError("position is required", place=f"stations.{self.name}")
        _finite(self.x, "position", f"stations.{self.name}")
        if not isinstance(self.braced, bool):
            raise ModelError(f"braced must be true or false: got {self.braced!r}",
                             place=f"stations.{self.name}")


@dataclass(frozen=True)
class Segment:
    """A two-node bar element between stations ``start`` and ``end``.

    Parameters
    ----------
    name : str
    start, end : str
        Station names (the file's ``from`` and ``to``).
    material : Material
    section : Section
        The section at ``start``.
    end_section : Section, optional
        The section at ``end`` for a taper (same shape as ``section``).
    temperature_change : float, optional
        The segment's own temperature change in K (None: the model default).
    misfit : float
        Length made minus distance between the stations, in m.
    distributed_load : float
        Uniform axial load in N/m, positive toward +x.
    preload : float, optional
        Axial force (N, tension positive) the segment carries in the installed
        state; the solver chooses ``misfit`` to give it (:mod:`axialfe.engine.preload`).
    """

    name: str
    start: str
    end: str
    material: Material
    section: Section
    end_section: Section | None = None
    temperature_change: float | None = None
    misfit: float = 0.0
    distributed_load: float = 0.0
    buckling_length: float | None = None
    effective_length_factor: float | None = None
    preload: float | None = None

    def __post_init__(self):
        _name(self.name, "a segment's name", "segments")
        place = f"segments ('{self.name}')"
        for key in ("start", "end"):
            _name(getattr(self, key), f"its {key} station", place)
        if not isinstance(self.material, Material):
            raise ModelError(f"material must be a Material: got {self.material!r}", place=place)
        for key in ("section", "end_section"):
            value = getattr(self, key)
            if not isinstance(value, Section) and (key == "section" or value is not None):
                raise ModelError(f"{key} must be a Section: got {value!r}", place=place)
        if self.start == self.end:
            raise ModelError(f"a segment needs two different stations: got '{self.start}' twice",
                             place=place)
        if self.end_section is not None and self.end_section.shape != self.section.shape:
            raise ModelError(f"a taper needs the same shape at both ends: got "
                             f"'{self.section.shape}' and '{self.end_section.shape}'", place=place)
        _finite(self.misfit, "misfit", place)
        _finite(self.distributed_load, "distributed_load", place)
        _finite(self.temperature_change, "temperature_change", place)
        _finite(self.preload, "preload", place)
        _positive(self.buckling_length, "buckling_length", place)
        _positive(self.effective_length_factor, "effective_length_factor", place)

    @property
    def sections(self) -> tuple[Section, Section]:
        return self.section, self.end_section or self.section


@dataclass(frozen=True)
class Support:
    """A support at station ``at``: ``fixed``, ``spring`` (``stiffness`` N/m) or
    ``settlement`` (prescribed ``displacement`` m)."""

    at: str
    kind: str = "fixed"
    stiffness: float | None = None
    displacement: float = 0.0

    def __post_init__(self):
        _name(self.at, "a support's station", "supports")
        place = f"supports ('{self.at}')"
        if self.kind not in SUPPORT_KINDS:
            raise ModelError(f"unknown support kind '{self.kind}'", place=place,
                             hint=suggest(self.kind, SUPPORT_KINDS), options=SUPPORT_KINDS)
        if self.kind == "spring":
            if self.stiffness is None:
                raise ModelError("a spring support needs 'stiffness'", place=place)
            _positive(self.stiffness, "stiffness", place)
        elif self.stiffness is not None:
            raise ModelError(f"'stiffness' belongs to a spring support, not a {self.kind} one",
                             place=place)
        _finite(self.displacement, "displacement", place)
        if self.kind != "settlement" and self.displacement:
            raise ModelError(f"'displacement' belongs to a settlement support, not a {self.kind} one",
                             place=place)


@dataclass(frozen=True)
class Load:
    """A point force (N, positive toward +x) at station ``at``."""

    at: str
    force: float

    def __post_init__(self):
        _name(self.at, "a load's station", "loads")
        if self.force is None:
            raise ModelError("force is required", place=f"loads ('{self.at}')")
        _finite(self.force, "force", f"loads ('{self.at}')")


class PointLoads(Sequence):
    """Point loads kept as two arrays, as a model built from arrays holds them.

    ``at`` holds station indices and ``force`` the forces (N, + toward +x); the
    stations are named ``s0, s1, ...``.  Both were checked as arrays by their
    maker (:func:`axialfe.model.arrays.from_arrays`), so a :class:`Load` is made
    only when one is read, and not checked again.  It compares equal to any
    sequence of the same loads.
    """

    def __init__(self, at, force):
        self.at, self.force = at, force

    def __len__(self):
        return len(self.at)

    def __getitem__(self, i):
        if isinstance(i, slice):
            return tuple(self[j] for j in range(*i.indices(len(self))))
        i = range(len(self))[i]
        load = object.__new__(Load)
        object.__setattr__(load, "at", f"s{self.at[i]}")
        object.__setattr__(load, "force", float(self.force[i]))
        return load

    def names(self):
        """The station name of each load, in order."""
        return [f"s{i}" for i in self.at.tolist()]

    def __eq__(self, other):
        if isinstance(other, PointLoads):
            return (np.array_equal(self.at, other.at)
                    and np.array_equal(self.force, other.force))
        return isinstance(other, Sequence) and tuple(self) == tuple(other)

    def __hash__(self):
        return hash(tuple(self))

    def __repr__(self):
        return f"PointLoads({len(self)} loads)"


@dataclass(frozen=True)
class Gap:
    """A clearance that closes (``contact``) or a link that goes taut (``slack``).

    ``stations`` holds two names (the ``between`` form) or one (the ``at`` form,
    against ground on ``side`` '+x' or '-x').  ``clearance`` is in m.
    """

    name: str
    stations: tuple[str, ...]
    clearance: float
    kind: str = "contact"
    side: str | None = None

    def __post_init__(self):
        _name(self.name, "a gap's name", "gaps")
        place = f"gaps ('{self.name}')"
        object.__setattr__(self, "stations", tuple(self.stations))
        for st in self.stations:
            _name(st, "a gap's station", place)
        if self.kind not in GAP_KINDS:
            raise ModelError(f"unknown gap kind '{self.kind}'", place=place,
                             hint=suggest(self.kind, GAP_KINDS), options=GAP_KINDS)
        if len(self.stations) == 2:
            if self.side is not None:
                raise ModelError("'side' belongs to the 'at' form of a gap", place=place)
            if self.stations[0] == self.stations[1]:
                raise ModelError(f"a gap needs two different stations: got '{self.stations[0]}' twice",
                                 place=place)
        elif len(self.stations) == 1:
            if self.side not in ("+x", "-x"):
                raise ModelError(f"'side' must be '+x' or '-x': got {self.side!r}", place=place)
        else:
            raise ModelError("give 'between' two stations, or 'at' one station and 'side'",
                             place=place)
        if self.clearance is None:
            raise ModelError("clearance is required", place=place)
        if _number(self.clearance, "clearance", place) and not (
                self.clearance >= 0 and math.isfinite(self.clearance)):
            raise ModelError(f"clearance must not be negative: got {self.clearance:g}", place=place)

    @property
    def sign(self) -> tuple[float, float]:
        """Coefficients (s_first, s_second) with closure measure g = s1*u1 + s2*u2.

        The gap closes when g reaches the clearance.  For the ``at`` form the
        second coefficient belongs to ground and is 0.
        """
        if len(self.stations) == 2:
            return (1.0, -1.0) if self.kind == "contact" else (-1.0, 1.0)
        toward_stop = 1.0 if self.side == "+x" else -1.0
        return (toward_stop, 0.0) if self.kind == "contact" else (-toward_stop, 0.0)


@dataclass(frozen=True)
class Case:
    """One load case, complete in itself.

    Parameters
    ----------
    name : str
    loads : tuple of Load
    temperature_change : tuple of (str, float)
        Per segment name, or ``'all'`` for every other segment, in K.
    settlements : tuple of (str, float)
        New displacements (m) of ``settlement`` supports at the named stations.
    """

    name: str
    loads: tuple[Load, ...] = ()
    temperature_change: tuple[tuple[str, float], ...] = ()
    settlements: tuple[tuple[str, float], ...] = ()

    def __post_init__(self):
        _name(self.name, "a case's name", "cases")
        place = f"cases ('{self.name}')"
        for key in ("temperature_change", "settlements"):
            object.__setattr__(self, key, tuple(getattr(self, key)))
        if not isinstance(self.loads, PointLoads):   # arrays checked by their maker stay arrays
            object.__setattr__(self, "loads", tuple(self.loads))
            for load in self.loads:
                if not isinstance(load, Load):
                    raise ModelError(f"loads must be Load objects: got {load!r}", place=place)
        for key in ("temperature_change", "settlements"):
            for name, value in getattr(self, key):
                _name(name, f"a name in {key}", place)
                _finite(value, f"{key} of '{name}'", place)


@dataclass(frozen=True)
class Combination:
    """A factored sum of cases, solved as one new case."""

    name: str
    factors: tuple[tuple[str, float], ...]

    def __post_init__(self):
        _name(self.name, "a combination's name", "combinations")
        object.__setattr__(self, "factors", tuple(self.factors))
        for case, factor in self.factors:
            _name(case, "a case in factors", f"combinations ('{self.name}')")
            _finite(factor, f"the factor of '{case}'", f"combinations ('{self.name}')")
        if not self.factors:
            raise ModelError("a combination needs at least one case factor",
                             place=f"combinations ('{self.name}')")


# The column curves of the buckling check (axialfe.checks.columns computes them).
COLUMN_CURVES = ("johnson", "en1993-a0", "en1993-a", "en1993-b", "en1993-c", "en1993-d",
                 "aisc360", "euler-only")


@dataclass(frozen=True)
class CheckSettings:
    """Settings of the design checks: safety factor on strength and buckling,
    the default effective-length factor K of runs braced at both ends, and the
    column curve of the buckling check (one of :data:`COLUMN_CURVES`)."""

    safety_factor: float = 1.0
    effective_length_factor: float = 1.0
    column_curve: str = "johnson"

    def __post_init__(self):
        _positive(self.safety_factor, "safety_factor", "checks")
        _positive(self.effective_length_factor, "effective_length_factor", "checks")
        if self.column_curve not in COLUMN_CURVES:
            raise ModelError(f"column_curve: unknown column curve {self.column_curve!r}",
                             place="checks", hint=suggest(str(self.column_curve), COLUMN_CURVES),
                             options=COLUMN_CURVES)


@dataclass(frozen=True)
class Limit:
    """An allowable displacement at a station, or a minimum opening of a gap (m)."""

    at: str | None = None
    gap: str | None = None
    displacement: float | None = None
    min_opening: float | None = None

    def __post_init__(self):
        if (self.at is None) == (self.gap is None):
            raise ModelError("a limit names either a station ('at') or a gap ('gap')", place="limits")
        if self.at is not None:
            if self.displacement is None:
                raise ModelError(f"a limit at '{self.at}' needs 'displacement'", place="limits")
            _positive(self.displacement, "displacement", "limits")
            if self.min_opening is not None:
                raise ModelError("'min_opening' belongs to a limit on a gap, not at a station",
                                 place="limits")
        else:
            if self.min_opening is None:
                raise ModelError(f"a limit on gap '{self.gap}' needs 'min_opening'", place="limits")
            _positive(self.min_opening, "min_opening", "limits")
            if self.displacement is not None:
                raise ModelError("'displacement' belongs to a limit at a station, not on a gap",
                                 place="limits")


PROJECT_FIELDS = ("name", "number", "prepared_by", "checked_by", "revision", "date")
PROJECT_LABELS = {"name": "project", "number": "number", "prepared_by": "prepared by",
                  "checked_by": "checked by", "revision": "revision", "date": "date"}


@dataclass(frozen=True)
class Project:
    """The job a calculation belongs to, for the title block of a report (plain text).

    Parameters
    ----------
    name, number, prepared_by, checked_by, revision, date : str, optional
        Each is free text as the file gives it (a date included: the report shows it
        as written).

    Examples
    --------
    >>> Project(name="Pump skid", revision="B").items()
    (('project', 'Pump skid'), ('revision', 'B'))
    """

    name: str | None = None
    number: str | None = None
    prepared_by: str | None = None
    checked_by: str | None = None
    revision: str | None = None
    date: str | None = None

    def __post_init__(self):
        for key in PROJECT_FIELDS:
            value = getattr(self, key)
            if value is not None and not isinstance(value, str):
                raise ModelError(f"{key}: expected text: got {type(value).__name__}",
                                 place="project")

    def items(self) -> tuple[tuple[str, str], ...]:
        """The given fields as (label, text) pairs, in the order of the title block."""
        return tuple((PROJECT_LABELS[k], getattr(self, k)) for k in PROJECT_FIELDS
                     if getattr(self, k) is not None)


@dataclass(frozen=True)
class Model:
    """A complete axial model.

    Parameters
    ----------
    stations, segments, supports : tuples of Station, Segment, Support
    loads : tuple of Load
        The loads of the single case ``base`` when ``cases`` is empty.
    gaps : tuple of Gap
    cases, combinations : tuples of Case, Combination
    temperature_change : float, optional
        Model-wide default temperature change in K.
    gravity : float
        Component of gravity along +x in m/s^2 (self-weight).
    reference_temperature : float, optional
        In K, for absolute temperatures (and needed by tables against temperature).
    modulus_at : {'temperature', 'reference'}
        Where a tabled modulus is evaluated: at each segment's temperature in each
        case, or at the reference temperature (as piping codes compute the
        displacement stress range).
    units : OutputUnits
    title : str
    source : str, optional
        The model file's name, for messages.
    lines : dict, optional
        The file line of ``'stations.<name>'`` and ``'gaps.<name>'`` (set by the
        reader): plain data, so a model can be pickled and sent to workers.
    project : Project, optional
        The job the model belongs to (``[project]``), for a report's title block.
    symbols : tuple of SymbolDef
        The symbols declared in the file's ``[symbols]`` (closed form).  A
        model read with ``symbolic=True`` holds sympy expressions of them in
        place of floats; the checks above skip values that are not floats.
    tolerances : tuple of Toleranced
        The toleranced inputs the reader found (:mod:`axialfe.model.tolerances`):
        plain data; the model itself holds their nominal values.

    Raises
    ------
    ModelError
        When a name refers to nothing, two names clash, or a segment joins two
        stations at one position.
    """

    stations: tuple[Station, ...]
    segments: tuple[Segment, ...]
    supports: tuple[Support, ...] = ()
    loads: tuple[Load, ...] = ()
    gaps: tuple[Gap, ...] = ()
    cases: tuple[Case, ...] = ()
    combinations: tuple[Combination, ...] = ()
    temperature_change: float | None = None
    gravity: float = 0.0
    reference_temperature: float | None = None
    modulus_at: str = "temperature"
    units: OutputUnits = field(default_factory=OutputUnits)
    title: str = "axial model"
    source: str | None = None
    checks: CheckSettings = field(default_factory=CheckSettings)
    limits: tuple[Limit, ...] = ()
    lines: dict = field(default_factory=dict, compare=False, repr=False)
    # closed form: the declared symbols (axialfe.expressions.SymbolDef), in file order
    symbols: tuple = ()
    project: Project | None = None
    # toleranced inputs as the reader found them (axialfe.model.tolerances.Toleranced), plain data
    tolerances: tuple = field(default=(), compare=False, repr=False)

    def __post_init__(self):
        for key in ("stations", "segments", "supports", "loads", "gaps", "cases",
                    "combinations", "limits", "symbols", "tolerances"):
            if not (key == "loads" and isinstance(self.loads, PointLoads)):
                object.__setattr__(self, key, tuple(getattr(self, key)))
        index = {}
        for i, st in enumerate(self.stations):
            if st.name in index:
                raise ModelError(f"station '{st.name}' is defined twice", place="stations")
            index[st.name] = i
        object.__setattr__(self, "_station_index", index)  # private: never handed out
        if not self.segments:
            raise ModelError("a model needs at least one segment", place="segments")
        names = {}
        for i, seg in enumerate(self.segments):
            place = f"segments[{i + 1}] ('{seg.name}')"
            if seg.name in names:
                raise ModelError(f"two segments are named '{seg.name}'; parallel segments need "
                                 "their own names", place=place)
            if seg.name == "all":
                raise ModelError("'all' is reserved (it names every segment in a case)", place=place)
            names[seg.name] = i
            for key, st in (("from", seg.start), ("to", seg.end)):
                self._need_station(st, f"{place} {key}")
            x0 = self.stations[index[seg.start]].x
            x1 = self.stations[index[seg.end]].x
            if isinstance(x0, float) and isinstance(x1, float) and x0 == x1:
                raise ModelError(f"stations '{seg.start}' and '{seg.end}' stand at the same "
                                 "position; a segment needs a length", place=place)
        object.__setattr__(self, "_segment_index", names)
        if self.modulus_at not in MODULUS_AT:
            raise ModelError(f"unknown modulus_at '{self.modulus_at}'", place="settings",
                             hint=suggest(str(self.modulus_at), MODULUS_AT), options=MODULUS_AT)
        tabled = [seg.material.name for seg in self.segments if seg.material.tabled]
        if tabled and self.reference_temperature is None:
            raise ModelError(f"material '{tabled[0]}' gives properties against temperature: "
                             "set settings.reference_temperature (the installed temperature)",
                             place="settings")
        kinds_at = {}
        for i, sup in enumerate(self.supports):
            self._need_station(sup.at, f"supports[{i + 1}]")
            prescribed = sup.kind != "spring"
            if prescribed and kinds_at.get(sup.at):
                raise ModelError(f"station '{sup.at}' has two fixed or settlement supports",
                                 place=f"supports[{i + 1}]")
            kinds_at[sup.at] = kinds_at.get(sup.at, False) or prescribed
        at_names = (self.loads.names() if isinstance(self.loads, PointLoads)
                    else [load.at for load in self.loads])
        for i, at in enumerate(at_names):
            self._need_station(at, f"loads[{i + 1}]")
        gap_names = set()
        for i, gap in enumerate(self.gaps):
            if gap.name in gap_names:
                raise ModelError(f"two gaps are named '{gap.name}'", place=f"gaps[{i + 1}]")
            gap_names.add(gap.name)
            for st in gap.stations:
                self._need_station(st, f"gaps[{i + 1}] ('{gap.name}')")
        case_names = set()
        for i, case in enumerate(self.cases):
            place = f"cases[{i + 1}] ('{case.name}')"
            if case.name in case_names:
                raise ModelError(f"two cases are named '{case.name}'", place=place)
            case_names.add(case.name)
            for load in case.loads:
                self._need_station(load.at, f"{place} loads")
            for seg_name, _ in case.temperature_change:
                if seg_name != "all" and seg_name not in names:
                    raise ModelError(f"unknown segment '{seg_name}' in temperature_change",
                                     place=place, hint=suggest(seg_name, names))
            settled = {s.at for s in self.supports if s.kind == "settlement"}
            for st, _ in case.settlements:
                if st not in settled:
                    raise ModelError(f"station '{st}' has no settlement support to move",
                                     place=f"{place} settlements",
                                     hint=suggest(st, settled), options=sorted(settled) or None)
        if self.cases and self.loads:
            raise ModelError("top-level loads are not allowed when the model has cases; "
                             "move them into a case", place="loads")
        comb_names = set()
        for i, comb in enumerate(self.combinations):
            place = f"combinations[{i + 1}] ('{comb.name}')"
            if comb.name in case_names:
                raise ModelError(f"the name '{comb.name}' is already a case", place=place)
            if comb.name in comb_names:
                raise ModelError(f"two combinations are named '{comb.name}'", place=place)
            comb_names.add(comb.name)
            for case_name, _ in comb.factors:
                if case_name not in case_names:
                    raise ModelError(f"unknown case '{case_name}'", place=place,
                                     hint=suggest(case_name, case_names),
                                     options=sorted(case_names) or None)
        for lim in self.limits:
            if lim.at is not None:
                self._need_station(lim.at, "limits")
            elif lim.gap not in gap_names:
                raise ModelError(f"unknown gap '{lim.gap}'", place="limits",
                                 hint=suggest(lim.gap, gap_names))

    def _need_station(self, name, place):
        if name not in self._station_index:
            raise ModelError(f"unknown station '{name}'", place=place,
                             hint=suggest(name, self._station_index))

    @classmethod
    def from_arrays(cls, x, start, end, elastic_modulus, area, thermal_expansion=0.0,
                    temperature_change=0.0, fixed=(), load_at=(), load_force=(), **more):
        """A model straight from arrays, in SI units, with no object per segment.

        Parameters
        ----------
        x : array of float
            Station positions (m); stations are named ``s0, s1, ...``.
        start, end : array of int
            Each segment's end stations, as indices into ``x``; segments are
            named ``e0, e1, ...`` (each with a material and a plain-area
            section of its own name).
        elastic_modulus, area, thermal_expansion, temperature_change : float or array
            Per segment (Pa, m^2, 1/K, K); a scalar applies to every segment.
        fixed : array of int
            Stations held fixed.
        load_at, load_force : arrays
            Point loads (N, + toward +x) of the one case ``base``.
        **more
            ``yield_strength``, ``second_moment``, ``density`` (arrays or scalars,
            SI) with ``gravity`` (m/s^2 along +x); springs ``spring_at`` with
            ``spring_stiffness`` (N/m); gaps against ground ``gap_at``, ``gap_side``
            ('+x' or '-x') and ``gap_clearance`` (m), named ``g0, g1, ...``;
            ``end_area`` (m^2, a taper's area at its ``end`` station), ``misfit``
            (m), ``distributed_load`` (N/m), ``preload`` (N, NaN where none);
            ``title``.

        The arrays are copied.

        Examples
        --------
        A chain of three bars fixed at x = 0 and pulled with 1 kN at its end:

        >>> import numpy as np
        >>> from axialfe import solve
        >>> m = Model.from_arrays(np.array([0.0, 1.0, 2.0, 3.0]), [0, 1, 2], [1, 2, 3],
        ...                       200e9, 1e-4, fixed=[0], load_at=[3], load_force=[1e3])
        >>> round(solve(m)["base"].displacement("s3") / (3 * 1e3 / (200e9 * 1e-4)), 12)  # should be 1
        1.0
        """
        from .arrays import from_arrays

        return from_arrays(cls, x, start, end, elastic_modulus, area, thermal_expansion,
                           temperature_change, fixed, load_at, load_force, **more)

    @functools.cached_property
    def arrays(self):
        """The model as one struct of arrays (:class:`~axialfe.model.arrays.ModelArrays`)."""
        from .arrays import gather

        return gather(self)

    @functools.cached_property
    def load_stations(self):
        """The station index of each of :attr:`loads` (known at once when built from arrays)."""
        index = self._station_index
        names = (self.loads.names() if isinstance(self.loads, PointLoads)
                 else [load.at for load in self.loads])
        at = np.fromiter(map(index.__getitem__, names), dtype=np.int64, count=len(names))
        at.setflags(write=False)
        return at

    # --- look-ups -------------------------------------------------------
    def line_of(self, key: str) -> int | None:
        """The file line of ``'stations.<name>'`` or ``'gaps.<name>'``, when read from a file."""
        return self.lines.get(key)

    def station_index(self, name: str) -> int:
        """Return the position of station ``name`` in :attr:`stations`."""
        self._need_station(name, "stations")
        return self._station_index[name]

    def segment_index(self, name: str) -> int:
        """Return the position of segment ``name`` in :attr:`segments`."""
        if name not in self._segment_index:
            raise ModelError(f"unknown segment '{name}'", place="segments",
                             hint=suggest(name, self._segment_index))
        return self._segment_index[name]

    @property
    def all_cases(self) -> tuple[Case, ...]:
        """The cases to solve: the given ones, or the single case ``base``."""
        return self.cases or (Case(BASE_CASE, self.loads),)
