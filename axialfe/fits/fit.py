"""Press and shrink fits: the fit described, its states under temperature, and its checks.

A :class:`PressFit` holds a shaft (solid or hollow) in a hub with a diametral
interference known between two limits (equal for a single value).  Each state
(``assembly`` and every service state) is computed at both limits with Lamé's
thick-walled cylinders (:mod:`axialfe.fits.lame`): the least interference
gives the holding capacity, the greatest the stresses.  Temperature changes
the interference by (alpha_shaft dT_shaft - alpha_hub dT_hub) d; a state whose
interference is not positive has no pressure and is loose.

Checks (one :class:`~axialfe.checks.CheckEntry` per item and state, the same
``ok`` True / False / None as ``axialfe check``):

- ``hub-stress``, ``shaft-stress``: the largest von Mises stress in the part
  (at the hub's bore; at the shaft's fit surface, or at its bore when hollow)
  times the safety factor against the yield strength; undecided without one;
- ``holding-force``, ``torque-capacity``: the axial load and the torque times
  the safety factor against mu p pi d L and mu p pi d^2 L / 2 at the least
  interference;
- ``combined-slip``: sqrt(F^2 + (2T/d)^2) times the safety factor against
  mu p pi d L, where a state has both;
- ``loosening``: in each service state, the interference lost to temperature
  against the least interference at assembly; a state left without
  interference fails.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from types import SimpleNamespace

import numpy as np

from ..checks.entries import CaseChecks, CheckEntry, CheckReport
from ..errors import ModelError
from ..model import CheckSettings, Material
from ..units import unit_factor
from . import lame

__all__ = ["FitUnits", "ServiceState", "PressFit", "FitState", "FitResult", "solve_fit", "state_at",
           "fit_parameters", "fit_states",
           "ASSEMBLY", "FIT_CHECK_KINDS", "DEFAULT_CLEARANCE_RATIO"]

ASSEMBLY = "assembly"
FIT_CHECK_KINDS = ("hub-stress", "shaft-stress", "holding-force", "torque-capacity",
                   "combined-slip", "loosening")
# the clearance a heated hub should have over the shaft when it is slid on, as a
# fraction of the fit diameter: common practice (about 1 um per mm), no standard
DEFAULT_CLEARANCE_RATIO = 0.001
DEFAULT_TEMPERATURE = 293.15  # K, 20 degC
_HOT_HUB = 573.15  # K: heating a steel hub beyond about 300 degC is avoided (common practice)

_FIT_KINDS = {"force": "force", "length": "length", "stress": "stress", "torque": "torque"}
_FIT_SYSTEMS = {"SI": {"force": "N", "length": "mm", "stress": "MPa", "torque": "N*m"},
                "US": {"force": "lbf", "length": "in", "stress": "psi", "torque": "lbf*in"}}


@dataclass(frozen=True)
class FitUnits:
    """The units a fit is reported in (temperatures always in degC)."""

    force: str = "N"
    length: str = "mm"
    stress: str = "MPa"
    torque: str = "N*m"

    def __post_init__(self):
        for key, kind in _FIT_KINDS.items():
            unit_factor(getattr(self, key), kind)

    @classmethod
    def system(cls, name: str = "SI", **overrides) -> "FitUnits":
        """The units of system ``"SI"`` or ``"US"`` with any overrides."""
        if name not in _FIT_SYSTEMS:
            raise ModelError(f"unknown unit system '{name}'", options=tuple(_FIT_SYSTEMS))
        return cls(**{**_FIT_SYSTEMS[name], **{k: v for k, v in overrides.items() if v}})

    def factor(self, key: str) -> float:
        """The SI value of one ``key`` unit (force, length, stress, torque)."""
        return unit_factor(getattr(self, key), _FIT_KINDS[key])

    def as_dict(self) -> dict[str, str]:
        return {k: getattr(self, k) for k in _FIT_KINDS}


def _positive(value, what, place):
    if not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0):
        raise ModelError(f"{what} must be positive: got {value:g}", place=place)


@dataclass(frozen=True)
class ServiceState:
    """One service state: part temperatures (K) and the loads the fit must hold.

    Parameters
    ----------
    name : str
    shaft_temperature, hub_temperature : float
        Absolute temperatures in K.
    axial_load : float
        Axial force on the fit in N (its sign does not matter).
    torque : float
        Torque on the fit in N*m (its sign does not matter).
    """

    name: str
    shaft_temperature: float
    hub_temperature: float
    axial_load: float = 0.0
    torque: float = 0.0

    def __post_init__(self):
        place = f"service ('{self.name}')"
        if not isinstance(self.name, str) or not self.name:
            raise ModelError("a service state needs a name", place="service")
        for key in ("shaft_temperature", "hub_temperature", "axial_load", "torque"):
            value = getattr(self, key)
            if not math.isfinite(value):
                raise ModelError(f"{key} must be a finite number: got {value}", place=place)
        for key in ("shaft_temperature", "hub_temperature"):
            if getattr(self, key) < 0:
                raise ModelError(f"{key} lies below absolute zero", place=place)


@dataclass(frozen=True)
class PressFit:
    """A shaft held in a hub by interference.

    Parameters
    ----------
    shaft, hub : Material
        Each needs ``poissons_ratio``; the yield strength enables the stress checks.
    diameter : float
        The fit diameter d (m).
    outer_diameter : float
        The hub's outer diameter (m), more than d.
    length : float
        Length of the fit along the axis (m).
    friction : float
        Coefficient of friction at the fit surface.
    interference : tuple of float
        (least, greatest) diametral interference at the assembly temperature
        (m); negative values are clearances.  Given in either order.
    inner_diameter : float
        The shaft's bore (m), 0 for a solid shaft.
    assembly_temperature : float, optional
        Temperature of both parts when the fit is made (K); default 20 degC,
        stated in the notes.
    assembly_clearance : float, optional
        Clearance wanted when a heated hub is slid on (m); default
        0.001 d (common practice).
    services : tuple of ServiceState
    safety_factor : float
        On stresses and on the holding capacities (not on loosening).
    title, designation : str, optional
        ``designation`` is the ISO 286 fit it came from, e.g. ``"50 H7/p6"``.
    bore_limits, shaft_limits : tuple of float, optional
        (least, greatest) diameters of the bore and of the shaft, when known (m).
    units : FitUnits
    """

    shaft: Material
    hub: Material
    diameter: float
    outer_diameter: float
    length: float
    friction: float
    interference: tuple[float, float]
    inner_diameter: float = 0.0
    assembly_temperature: float | None = None
    assembly_clearance: float | None = None
    services: tuple[ServiceState, ...] = ()
    safety_factor: float = 1.0
    title: str = "press fit"
    designation: str | None = None
    bore_limits: tuple[float, float] | None = None
    shaft_limits: tuple[float, float] | None = None
    units: FitUnits = field(default_factory=FitUnits)

    def __post_init__(self):
        for key in ("diameter", "outer_diameter", "length", "friction"):
            _positive(getattr(self, key), key, "fit")
        _positive(self.safety_factor, "safety_factor", "checks")
        d = self.diameter
        if not self.outer_diameter > d:
            raise ModelError("the hub's outer diameter must be larger than the fit diameter: "
                             f"got {self.outer_diameter * 1e3:g} mm around {d * 1e3:g} mm",
                             place="hub")
        if not (math.isfinite(self.inner_diameter) and 0 <= self.inner_diameter < d):
            raise ModelError("the shaft's inner diameter must lie between 0 and the fit diameter:"
                             f" got {self.inner_diameter * 1e3:g} mm inside {d * 1e3:g} mm",
                             place="shaft")
        pair = tuple(sorted(float(x) for x in self.interference))
        if len(pair) != 2 or not all(math.isfinite(x) for x in pair):
            raise ModelError("interference takes two finite limits", place="fit")
        if pair[0] <= -d or pair[1] >= d:
            worst = pair[1] if pair[1] >= d else pair[0]
            raise ModelError(f"interference must be much smaller than the fit diameter: got "
                             f"{worst * 1e3:g} mm at {d * 1e3:g} mm", place="fit")
        object.__setattr__(self, "interference", pair)
        object.__setattr__(self, "services", tuple(self.services))
        for role, mat in (("shaft", self.shaft), ("hub", self.hub)):
            if mat.poissons_ratio is None:
                raise ModelError(f"material '{mat.name}' needs 'poissons_ratio' for a fit",
                                 place=role)
        if self.assembly_clearance is not None and not (
                math.isfinite(self.assembly_clearance) and self.assembly_clearance >= 0):
            raise ModelError("assembly_clearance must not be negative", place="fit")
        if self.assembly_temperature is not None and not (
                math.isfinite(self.assembly_temperature) and self.assembly_temperature >= 0):
            raise ModelError("assembly_temperature lies below absolute zero", place="fit")
        names = [ASSEMBLY]
        for s in self.services:
            if s.name in names:
                raise ModelError(f"the state name '{s.name}' is used twice"
                                 + (" ('assembly' is the state the fit is made in)"
                                    if s.name == ASSEMBLY else ""), place="service")
            names.append(s.name)

    @property
    def clearance(self) -> float:
        """The assembly clearance in m (the default when none is given)."""
        if self.assembly_clearance is not None:
            return self.assembly_clearance
        return DEFAULT_CLEARANCE_RATIO * self.diameter

    @property
    def temperature(self) -> float:
        """The assembly temperature in K (20 degC when none is given)."""
        return DEFAULT_TEMPERATURE if self.assembly_temperature is None else self.assembly_temperature

    @property
    def states(self) -> tuple[ServiceState, ...]:
        """The assembly state, then the service states."""
        t = self.temperature
        return (ServiceState(ASSEMBLY, t, t), *self.services)


@dataclass(frozen=True)
class FitState:
    """One state of the fit at (least, greatest) interference; SI units, temperatures in K.

    Every pair is (at the least interference, at the greatest).  Stresses are
    tension positive; ``shaft_bore_hoop_stress`` is at the bore of a hollow
    shaft (at the centre of a solid one); the equivalent stresses are the
    largest in each part.
    """

    name: str
    shaft_temperature: float
    hub_temperature: float
    axial_load: float
    torque: float
    interference: tuple[float, float]
    pressure: tuple[float, float]
    hub_hoop_stress: tuple[float, float]
    shaft_hoop_stress: tuple[float, float]
    shaft_bore_hoop_stress: tuple[float, float]
    hub_equivalent_stress: tuple[float, float]
    shaft_equivalent_stress: tuple[float, float]
    holding_force: tuple[float, float]
    torque_capacity: tuple[float, float]
    loose: tuple[bool, bool]


@dataclass(frozen=True)
class FitResult:
    """The solved fit: its states, the loosening and shrink temperatures, the checks.

    Attributes
    ----------
    fit : PressFit
    states : tuple of FitState
    loosening_temperature : float or None
        Uniform temperature (K) at which the least interference reaches zero;
        None when both parts expand alike.
    shrink_temperature : float or None
        Hub temperature (K) at which its bore clears the greatest-interference
        shaft (at the assembly temperature) by the assembly clearance; None
        when the hub does not expand on heating.
    checks : CheckReport
    notes : tuple of str
        The assumptions and defaults used, stated.
    """

    fit: PressFit
    states: tuple[FitState, ...]
    loosening_temperature: float | None
    shrink_temperature: float | None
    checks: CheckReport
    notes: tuple[str, ...]

    def state(self, name: str) -> FitState:
        for s in self.states:
            if s.name == name:
                return s
        raise KeyError(name)


def _state(fit: PressFit, service: ServiceState) -> FitState:
    d, do, di = fit.diameter, fit.outer_diameter, fit.inner_diameter
    sh, hb = fit.shaft, fit.hub
    t0 = fit.temperature
    change = lame.interference_change(d, sh.thermal_expansion, service.shaft_temperature - t0,
                                      hb.thermal_expansion, service.hub_temperature - t0)
    delta = tuple(x + change for x in fit.interference)
    pressure = tuple(_larger(0.0, lame.contact_pressure(x, d, do, hb.elastic_modulus,
                                                        hb.poissons_ratio, sh.elastic_modulus,
                                                        sh.poissons_ratio, di)) for x in delta)
    hub_t = tuple(lame.hub_hoop_stress(p, d, do) for p in pressure)
    shaft_t = tuple(lame.shaft_hoop_stress(p, d, di) for p in pressure)
    bore_t = tuple(lame.shaft_bore_hoop_stress(p, d, di) for p in pressure)
    hub_eq = tuple(lame.equivalent_stress(s, -p) for s, p in zip(hub_t, pressure))
    # the shaft's largest equivalent stress: at its bore when hollow (radial stress 0
    # there, hoop stress largest), else uniform
    shaft_eq = tuple(_larger(lame.equivalent_stress(s, -p),
                             lame.equivalent_stress(b, _plain(np.where(np.greater(di, 0), 0.0, -p))))
                     for s, b, p in zip(shaft_t, bore_t, pressure))
    mu, length = fit.friction, fit.length
    return FitState(service.name, service.shaft_temperature, service.hub_temperature,
                    service.axial_load, service.torque, delta, pressure, hub_t, shaft_t, bore_t,
                    hub_eq, shaft_eq,
                    tuple(lame.holding_force(mu, p, d, length) for p in pressure),
                    tuple(lame.torque_capacity(mu, p, d, length) for p in pressure),
                    tuple(_plain(np.less_equal(x, 0)) for x in delta))


def _plain(value):
    """A Python float or bool for a 0-d result, the array otherwise."""
    if np.ndim(value):
        return value
    return bool(value) if np.asarray(value).dtype == bool else float(value)


def _larger(a, b):
    return _plain(np.maximum(a, b))


def state_at(fit: PressFit, shaft_temperature: float, hub_temperature: float | None = None,
             name: str = "at") -> FitState:
    """The fit at given part temperatures (K; the hub's defaults to the shaft's), no loads.

    >>> steel = Material("steel", 200e9, 12e-6, yield_strength=250e6, poissons_ratio=0.3)
    >>> brass = Material("brass", 110e9, 20e-6, poissons_ratio=0.34)
    >>> fit = PressFit(brass, steel, 0.05, 0.1, 0.04, 0.12, (20e-6, 40e-6))
    >>> t = 293.15 - 20e-6 / (8e-6 * 0.05)   # the least interference is gone here
    >>> state_at(fit, t - 1.0).loose, state_at(fit, t + 1.0).loose
    ((True, False), (False, False))
    """
    hub = shaft_temperature if hub_temperature is None else hub_temperature
    return _state(fit, ServiceState(name, shaft_temperature, hub))


# --- many fits at once: the same states on arrays --------------------------
def fit_parameters(fit: PressFit) -> dict[str, float]:
    """The fit's scalar inputs by name: what a tolerance study moves.  :func:`fit_states`
    turns arrays of them into each state's values and check verdicts."""
    p = {"diameter": fit.diameter, "outer_diameter": fit.outer_diameter,
         "inner_diameter": fit.inner_diameter, "length": fit.length, "friction": fit.friction,
         "interference:least": fit.interference[0],
         "interference:greatest": fit.interference[1],
         "assembly_temperature": fit.temperature}
    for role in ("shaft", "hub"):
        mat = getattr(fit, role)
        p[f"{role}:modulus"] = mat.elastic_modulus
        p[f"{role}:poisson"] = mat.poissons_ratio
        p[f"{role}:expansion"] = mat.thermal_expansion
    for st in fit.states:
        for key in ("shaft_temperature", "hub_temperature", "axial_load", "torque"):
            p[f"state:{st.name}:{key}"] = getattr(st, key)
    return p


def fit_states(fit: PressFit, p: dict):
    """The states of the fits whose inputs are the arrays ``p`` (the names of
    :func:`fit_parameters`; ``fit`` gives the fixed rest: materials' strengths, states,
    safety factor): ``(states, verdicts)``, the :class:`FitState` of each state with arrays
    in place of floats, and ``{(state, check kind): ok}`` with ok 1 passes, 0 fails,
    -1 undecided, as :func:`solve_fit`'s checks judge each fit.

    The states are :func:`solve_fit`'s own (the same Lamé formulas, on arrays).
    """
    def material(role):
        return SimpleNamespace(elastic_modulus=p[f"{role}:modulus"],
                               poissons_ratio=p[f"{role}:poisson"],
                               thermal_expansion=p[f"{role}:expansion"])

    shape = np.broadcast(*[np.asarray(v) for v in p.values()]).shape
    many = SimpleNamespace(diameter=p["diameter"], outer_diameter=p["outer_diameter"],
                           inner_diameter=p["inner_diameter"], length=p["length"],
                           friction=p["friction"], temperature=p["assembly_temperature"],
                           interference=(p["interference:least"], p["interference:greatest"]),
                           shaft=material("shaft"), hub=material("hub"))
    states = []
    for st in fit.states:
        service = SimpleNamespace(name=st.name, **{
            k: p[f"state:{st.name}:{k}"]
            for k in ("shaft_temperature", "hub_temperature", "axial_load", "torque")})
        states.append(_state(many, service))
    b = lambda v: np.broadcast_to(v, shape)  # noqa: E731
    sf = fit.safety_factor
    verdicts = {}
    least0 = b(states[0].interference[0])
    for st in states:
        for kind, mat, eq in (("hub-stress", fit.hub, st.hub_equivalent_stress[1]),
                              ("shaft-stress", fit.shaft, st.shaft_equivalent_stress[1])):
            verdicts[(st.name, kind)] = (np.full(shape, -1) if mat.yield_strength is None else
                                         b(np.where(eq * sf / mat.yield_strength <= 1.0, 1, 0)))
        force, torque = np.abs(b(st.axial_load)), np.abs(b(st.torque))
        d = b(many.diameter)

        def capacity(demand, cap):
            return np.where(cap <= 0, 0, np.where(demand * sf / np.where(cap > 0, cap, 1.0)
                                                  <= 1.0, 1, 0))

        holding, capacity_t = b(st.holding_force[0]), b(st.torque_capacity[0])
        # a check is made where its load is given (the same in every sample of the state)
        # a check is made where its load is given: none in a sample without it passes
        if np.any(force > 0):
            verdicts[(st.name, "holding-force")] = np.where(force > 0,
                                                            capacity(force, holding), 1)
        if np.any(torque > 0):
            verdicts[(st.name, "torque-capacity")] = np.where(torque > 0,
                                                              capacity(torque, capacity_t), 1)
        if np.any(force > 0) and np.any(torque > 0):
            verdicts[(st.name, "combined-slip")] = np.where(
                (force > 0) & (torque > 0), capacity(np.hypot(force, 2.0 * torque / d), holding),
                1)
        if st.name != ASSEMBLY:
            verdicts[(st.name, "loosening")] = np.where((least0 > 0) & (b(st.interference[0]) > 0),
                                                        1, 0)
    return states, verdicts


def _stress_entry(kind, part, material: Material, demand, state, sf, where=None):
    if material.yield_strength is None:
        return CheckEntry(kind, part, state, None, None,
                          f"material '{material.name}' gives no yield strength: judge the "
                          "stress against the material's own limit", "stress", demand, None)
    util = demand * sf / material.yield_strength
    note = where
    if util > 1:
        note = ((where + "; " if where else "")
                + "above yield: the elastic (Lamé) pressure and stresses no longer hold")
    return CheckEntry(kind, part, state, util, util <= 1.0, note, "stress", demand,
                      material.yield_strength)


def _capacity_entry(kind, name, state, demand, capacity, sf, quantity):
    if capacity <= 0:
        return CheckEntry(kind, name, state, None, False,
                          "the fit is loose at its least interference: it holds nothing",
                          quantity, demand, 0.0)
    util = demand * sf / capacity
    return CheckEntry(kind, name, state, util, util <= 1.0, None, quantity, demand, capacity)


def _checks(fit: PressFit, states) -> CheckReport:
    sf = fit.safety_factor
    assembly_least = states[0].interference[0]
    cases = []
    for st in states:
        out = [_stress_entry("hub-stress", "hub", fit.hub, st.hub_equivalent_stress[1],
                             st.name, sf),
               _stress_entry("shaft-stress", "shaft", fit.shaft, st.shaft_equivalent_stress[1],
                             st.name, sf, "at the shaft's bore" if fit.inner_diameter else None)]
        force, torque = abs(st.axial_load), abs(st.torque)
        if force > 0:
            out.append(_capacity_entry("holding-force", "fit", st.name, force,
                                       st.holding_force[0], sf, "force"))
        if torque > 0:
            out.append(_capacity_entry("torque-capacity", "fit", st.name, torque,
                                       st.torque_capacity[0], sf, "torque"))
        if force > 0 and torque > 0:
            combined = math.hypot(force, 2.0 * torque / fit.diameter)
            out.append(_capacity_entry("combined-slip", "fit", st.name, combined,
                                       st.holding_force[0], sf, "force"))
        if st.name != ASSEMBLY:
            lost = assembly_least - st.interference[0]
            if assembly_least <= 0:
                out.append(CheckEntry("loosening", "fit", st.name, None, False,
                                      "the least interference is not positive at assembly: "
                                      "the fit is loose before service", "length",
                                      lost, assembly_least))
            else:
                util = max(lost, 0.0) / assembly_least
                note = ("the fit is loose in this state" if st.interference[0] <= 0 else
                        "the interference grows in this state" if lost < 0 else None)
                out.append(CheckEntry("loosening", "fit", st.name, util,
                                      st.interference[0] > 0, note, "length", lost,
                                      assembly_least))
        cases.append(CaseChecks(st.name, tuple(out)))
    governing = None
    for c in cases:
        for e in c.entries:
            if e.utilization is not None and (governing is None
                                              or e.utilization > governing.utilization):
                governing = e
    return CheckReport(CheckSettings(safety_factor=sf), tuple(cases), governing, ())


def solve_fit(fit: PressFit) -> FitResult:
    """Compute every state of a press or shrink fit and check it.

    Parameters
    ----------
    fit : PressFit

    Returns
    -------
    FitResult

    Examples
    --------
    A steel hub on a steel shaft, 50 mm in a 100 mm hub, 0.05 mm interference:
    p = E delta (d_o^2 - d^2) / (2 d d_o^2) = 75 MPa (same material, solid shaft).

    >>> steel = Material("steel", 200e9, 12e-6, yield_strength=250e6, poissons_ratio=0.3)
    >>> r = solve_fit(PressFit(steel, steel, 0.05, 0.1, 0.04, 0.12, (50e-6, 50e-6)))
    >>> [round(p / 1e6, 9) for p in r.state("assembly").pressure]
    [75.0, 75.0]
    >>> r.loosening_temperature is None   # both parts expand alike
    True
    """
    states = tuple(_state(fit, s) for s in fit.states)
    d, t0 = fit.diameter, fit.temperature
    a_s, a_h = fit.shaft.thermal_expansion, fit.hub.thermal_expansion
    least, greatest = fit.interference
    loosening = None if a_s == a_h else t0 - least / ((a_s - a_h) * d)
    need = greatest + fit.clearance
    if need <= 0:
        shrink = t0
    else:
        shrink = t0 + need / (a_h * d) if a_h > 0 else None
    notes = [
        "contact pressure by Lamé's thick-walled cylinders (plane stress, linear-elastic, "
        "parts of equal length; the stress concentration at the hub's ends is not included)",
        "each state at the least and at the greatest interference: holding capacity from the "
        "least, stresses from the greatest",
        "temperature changes the interference by (alpha_shaft*dT_shaft - alpha_hub*dT_hub)*d "
        "(free growth, moduli at room temperature, no temperature gradient in the parts)",
        f"safety factor {fit.safety_factor:g}" + (" (default)" if fit.safety_factor == 1.0
                                                  else "")
        + " on the equivalent stresses (against yield) and on the holding capacities; none on "
          "loosening",
    ]
    clearance_mm = f"{fit.clearance * 1e3:g} mm"
    if fit.assembly_temperature is None:
        notes.append("assembly temperature 20 degC (default)")
    if fit.assembly_clearance is None:
        notes.append(f"assembly clearance {clearance_mm} = 0.001*d (default, common practice) "
                     "for the shrink temperature")
    if least <= 0:
        notes.append("the least interference is not positive at the assembly temperature: the "
                     "fit can be loose as made")
    if need <= 0:
        notes.append("the parts clear each other by the assembly clearance at the assembly "
                     "temperature: no heating is needed")
    if loosening is not None and loosening < 0:
        notes.append("the loosening temperature lies below absolute zero: temperature alone "
                     "does not loosen this fit")
    if shrink is not None and shrink > _HOT_HUB:
        notes.append("the shrink temperature is above about 300 degC, where a hardened or "
                     "tempered steel hub may lose strength (common practice): consider "
                     "cooling the shaft as well, or a press fit")
    return FitResult(fit, states, loosening, shrink, _checks(fit, states), tuple(notes))
