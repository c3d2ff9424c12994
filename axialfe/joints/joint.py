"""One bolted joint: its geometry and stiffness, the axial model it builds, states and checks.

A :class:`Joint` holds one bolt and its clamped stack (SI floats, checked on
construction).  :func:`solve_joint` builds the axial model (the bolt's shank and
threaded length in series; the clamped parts, each with its frustum stiffness,
in series with one another and parallel to the bolt; their interface with the
nut a contact gap of zero clearance that opens when the joint separates; the
preload a ``preload`` on the bolt), solves every state with the engine and
checks them.  Before separation the model gives the joint-diagram relations

    F_b = F_i + dF_th + C*P,   F_m = F_i + dF_th - (1 - C)*P,

with C = k_b/(k_b + k_m) and the thermal change of preload
dF_th = delta*k_b*k_m/(k_b + k_m) from the free mismatch
delta = sum(alpha_i*t_i*dT_i) - alpha_b*l_g*dT_b; after separation the bolt
carries P alone (Shigley's Mechanical Engineering Design, 10th ed., 8-7, eq. 8-24
and 8-25, from memory).  The states report those closed forms' inputs and the
model's forces; the tests hold one against the other.

:func:`sweep_joint` sweeps the temperature of one state; its events (the joint
separates, the clamp force reaches its minimum, the bolt reaches its proof
strength) are roots of these affine relations, never read off a grid.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np

from ..checks import CheckEntry, CheckReport, CaseChecks
from ..errors import ModelError, suggest
from ..formatting import number
from ..model import (Case, CheckSettings, Gap, Load, Material, Model, Section, Segment, Station,
                     Support)
from ..units import OutputUnits
from .stiffness import METHOD, bolt_stiffness, member_stiffness
from .threads import INCH, Thread

__all__ = ["Part", "Service", "Joint", "JointState", "JointResult", "JointSweep", "solve_joint",
           "DiagramLine", "diagram_lines",
           "sweep_joint", "build_model", "joint_parameters", "closed_states", "ClosedStates",
           "ASSEMBLY", "EVENTS", "CHECK_KINDS"]

ASSEMBLY = "assembly"
EVENTS = ("separates", "clamp-below-minimum", "reaches-proof")
CHECK_KINDS = ("bolt-proof", "clamp-force", "separation")
GAP = "interface"
BOLT = "bolt"


def default_thread_length(thread: Thread, length: float) -> float:
    """L_T of a hex bolt: ISO 4014 as tabulated in Shigley, 10th ed., eq. 8-14 (from memory).

    Metric: 2d + 6 mm for L <= 125 mm, 2d + 12 mm up to 200 mm, 2d + 25 mm above;
    inch: 2d + 1/4 in up to 6 in, 2d + 1/2 in above.
    """
    d = thread.nominal_diameter
    if thread.system == "metric":
        extra = np.where(np.less_equal(length, 0.125 + 1e-12), 0.006,
                         np.where(np.less_equal(length, 0.200 + 1e-12), 0.012, 0.025))
    else:
        extra = np.where(np.less_equal(length, 6 * INCH + 1e-12), 0.25, 0.5) * INCH
    return 2 * d + (float(extra) if np.ndim(extra) == 0 else extra)


@dataclass(frozen=True)
class Part:
    """One clamped part (a washer counts as one), from under the head toward the nut."""

    name: str
    material: Material
    thickness: float

    def __post_init__(self):
        if not (self.thickness > 0 and math.isfinite(self.thickness)):
            raise ModelError(f"thickness must be positive: got {self.thickness:g}",
                             place=f"clamped ('{self.name}')")


@dataclass(frozen=True)
class Service:
    """A service state: temperatures (K, absolute) and the external load (N, + pulls apart).

    ``temperature`` applies to every part not named in ``temperatures`` (None:
    the assembly temperature); ``temperatures`` maps ``'bolt'`` or a part's name
    to its own.
    """

    name: str
    temperature: float | None = None
    temperatures: tuple[tuple[str, float], ...] = ()
    external_load: float = 0.0

    def __post_init__(self):
        object.__setattr__(self, "temperatures", tuple(self.temperatures))
        if not math.isfinite(self.external_load):
            raise ModelError("external_load must be a finite number", place=f"service ('{self.name}')")


@dataclass(frozen=True)
class Joint:
    """One bolt and its clamped stack (SI floats).

    Parameters
    ----------
    thread : Thread
    bolt_material : Material
    proof_strength : float or None
        Pa; None when no strength is known (the proof check is then undecided).
    proof_basis : str
        Where the proof strength comes from.
    length : float
        Bolt length under the head.
    parts : tuple of Part
        From under the head to the nut, washers included.
    preload : float
        The installed preload F_i (N).
    assembly_temperature : float
        K.
    services : tuple of Service
    thread_length : float, optional
        Default by :func:`default_thread_length`.
    into : str, optional
        The tapped last part of a cap screw.
    torque, nut_factor : float, optional
        The tightening torque (N*m) and nut factor the preload came from, F_i =
        T/(K*d), when it was given so (a tolerance study draws them).
    """

    title: str
    thread: Thread
    bolt_material: Material
    proof_strength: float | None
    proof_basis: str
    length: float
    parts: tuple[Part, ...]
    preload: float
    assembly_temperature: float
    services: tuple[Service, ...] = ()
    thread_length: float | None = None
    into: str | None = None
    preload_basis: str = "given"
    safety_factor: float = 1.0
    minimum_clamp_force: float | None = None
    units: OutputUnits = field(default_factory=OutputUnits)
    source: str | None = None
    torque: float | None = None
    nut_factor: float | None = None

    def __post_init__(self):
        object.__setattr__(self, "parts", tuple(self.parts))
        object.__setattr__(self, "services", tuple(self.services))
        if not self.parts:
            raise ModelError("a joint needs at least one [[clamped]] part", place="clamped")
        names = [p.name for p in self.parts]
        for i, name in enumerate(names):
            if name in names[:i]:
                raise ModelError(f"two clamped parts are named '{name}'", place=f"clamped[{i + 1}]")
            if name in (BOLT, "bolt-shank", "bolt-thread", "all"):
                raise ModelError(f"'{name}' is reserved for the bolt; name the part otherwise",
                                 place=f"clamped[{i + 1}]")
        if self.into is not None and self.into != names[-1]:
            raise ModelError(f"into: the tapped part must be the last clamped part "
                             f"('{names[-1]}'): got '{self.into}'", place="bolt",
                             hint=suggest(self.into, names[-1:]))
        if not (self.length > 0 and math.isfinite(self.length)):
            raise ModelError("length must be positive", place="bolt")
        if self.thread_length is not None and not self.thread_length > 0:
            raise ModelError("thread_length must be positive", place="bolt")
        if not (self.preload > 0 and math.isfinite(self.preload)):
            raise ModelError(f"preload must be positive: got {self.preload:g} N", place="assembly")
        if not self.safety_factor > 0:
            raise ModelError("safety_factor must be positive", place="checks")
        if self.minimum_clamp_force is not None and not self.minimum_clamp_force > 0:
            raise ModelError("minimum_clamp_force must be positive", place="checks")
        seen = set()
        for s in self.services:
            if s.name in seen or s.name == ASSEMBLY:
                raise ModelError(f"the state name '{s.name}' is taken", place="service")
            seen.add(s.name)
            for key, _ in s.temperatures:
                if key != BOLT and key not in names:
                    raise ModelError(f"temperatures: unknown part '{key}'",
                                     place=f"service ('{s.name}')",
                                     hint=suggest(key, [BOLT, *names]), options=[BOLT, *names])
        if self.into is None and self.length <= self.grip:
            raise ModelError(f"length: a bolt of {_mm(self.length)} does not pass through a grip "
                             f"of {_mm(self.grip)}", place="bolt")
        if self.into is not None and self.length <= self.above_tapped:
            raise ModelError(f"length: a screw of {_mm(self.length)} does not reach the tapped "
                             f"part under {_mm(self.above_tapped)} of clamped parts", place="bolt")
        # the plain shank must end within the grip (nut) or above the tapped part (cap screw)
        shank_limit = self.grip if self.into is None else self.above_tapped
        if self.shank_in_grip > shank_limit * (1 + 1e-12):
            raise ModelError(f"thread_length: the thread starts {_mm(self.length - self.thread_len)}"
                             f" under the head, beyond the grip of {_mm(self.grip)}, so the nut "
                             "cannot be tightened onto it" if self.into is None else
                             f"thread_length: the thread starts {_mm(self.length - self.thread_len)}"
                             " under the head, so the plain shank would enter the tapped hole",
                             place="bolt")

    # --- geometry --------------------------------------------------------
    @property
    def above_tapped(self) -> float:
        """h: the thickness of the parts above a tapped one (cap screw)."""
        return sum(p.thickness for p in self.parts[:-1])

    @property
    def engaged(self) -> tuple[float, ...]:
        """Each part's thickness within the grip: the tapped part counts with its share."""
        t = [p.thickness for p in self.parts]
        if self.into is not None:
            d, t2 = self.thread.nominal_diameter, t[-1]
            t[-1] = t2 / 2 if t2 < d else d / 2  # Shigley, 10th ed., 8-4: l' = h + t2/2 or h + d/2
        return tuple(t)

    @property
    def grip(self) -> float:
        """l_g = sum of the thicknesses, or l' of a cap screw."""
        return sum(self.engaged)

    @property
    def thread_len(self) -> float:
        """L_T, given or by the standard rule."""
        return (self.thread_length if self.thread_length is not None
                else default_thread_length(self.thread, self.length))

    @property
    def shank_in_grip(self) -> float:
        """l_d: the unthreaded length L - L_T (0 when threaded over the grip or the whole bolt)."""
        return max(self.length - self.thread_len, 0.0)

    @property
    def thread_in_grip(self) -> float:
        """l_t = grip - l_d."""
        return max(self.grip - self.shank_in_grip, 0.0)

    @property
    def bolt_stiffness(self) -> float:
        t = self.thread
        return bolt_stiffness(t.shank_area, t.tensile_stress_area,
                              self.bolt_material.elastic_modulus, self.shank_in_grip,
                              self.thread_in_grip)

    @property
    def part_stiffness(self) -> tuple[float, ...]:
        k, _ = member_stiffness([(p.material.elastic_modulus, t)
                                 for p, t in zip(self.parts, self.engaged)],
                                self.thread.nominal_diameter)
        return tuple(k)

    @property
    def member_stiffness(self) -> float:
        return 1 / sum(1 / k for k in self.part_stiffness)

    @property
    def joint_constant(self) -> float:
        """C = k_b/(k_b + k_m)."""
        kb, km = self.bolt_stiffness, self.member_stiffness
        return kb / (kb + km)

    @property
    def method(self) -> str:
        text = METHOD
        if self.into is not None:
            text += ("; cap screw into the tapped part with Shigley's effective grip l' = h + t2/2"
                     " for t2 < d, h + d/2 otherwise")
        return text

    # --- states ----------------------------------------------------------
    def temperatures_of(self, service: Service | None) -> dict[str, float]:
        """The absolute temperature (K) of the bolt and of every part in a state."""
        names = [BOLT, *(p.name for p in self.parts)]
        if service is None:
            return dict.fromkeys(names, self.assembly_temperature)
        base = self.assembly_temperature if service.temperature is None else service.temperature
        own = dict(service.temperatures)
        return {n: own.get(n, base) for n in names}

    def mismatch(self, temperatures: dict[str, float]) -> float:
        """delta = sum(alpha_i*t_i*dT_i) - alpha_b*l_g*dT_b (m)."""
        t0 = self.assembly_temperature
        parts = sum(p.material.thermal_expansion * t * (temperatures[p.name] - t0)
                    for p, t in zip(self.parts, self.engaged))
        return parts - self.bolt_material.thermal_expansion * self.grip * (temperatures[BOLT] - t0)

    @property
    def series_stiffness(self) -> float:
        """k_b*k_m/(k_b + k_m): what a free mismatch meets."""
        kb, km = self.bolt_stiffness, self.member_stiffness
        return kb * km / (kb + km)


def _mm(value: float) -> str:
    return f"{number(value * 1e3)} mm"


# --- the axial model --------------------------------------------------------
def _bolt_segments(joint: Joint):
    ld, lt = joint.shank_in_grip, joint.thread_in_grip
    segs = []
    if ld > 0:
        segs.append(("bolt-shank", ld, Section("bolt-shank", "round",
                                                (("diameter", joint.thread.nominal_diameter),))))
    if lt > 0:
        segs.append(("bolt-thread", lt, Section("bolt-thread", "area",
                                                 (("area", joint.thread.tensile_stress_area),))))
    return segs


def build_model(joint: Joint, cases=None) -> Model:
    """The axial model of a joint, with one case per state (or the given ``cases``).

    Stations run from the head (x = 0, held) to the nut (or the tapped thread)
    at the grip; the bolt's end station and the stack's last one share a
    position and meet through the contact gap ``interface`` of zero clearance.
    """
    end = "nut" if joint.into is None else "tapped-thread"
    stations = [Station("head", 0.0)]
    segments = []
    x = 0.0
    bolt = _bolt_segments(joint)
    for i, (name, length, section) in enumerate(bolt):
        start = stations[0].name if i == 0 else "shank-end"
        x += length
        stop = end if i == len(bolt) - 1 else "shank-end"
        if stop != end:
            stations.append(Station(stop, x))
        segments.append(Segment(name, start, stop, joint.bolt_material, section,
                                preload=joint.preload if i == len(bolt) - 1 else None))
    stations.append(Station(end, joint.grip))
    z, prev = 0.0, "head"
    for i, (part, t, k) in enumerate(zip(joint.parts, joint.engaged, joint.part_stiffness)):
        z += t
        stop = "stack-end" if i == len(joint.parts) - 1 else f"{part.name}/{joint.parts[i + 1].name}"
        stations.append(Station(stop, joint.grip if stop == "stack-end" else z))
        area = k * t / part.material.elastic_modulus  # the area that gives the frustum stiffness
        segments.append(Segment(part.name, prev, stop, part.material,
                                Section(part.name, "area", (("area", area),))))
        prev = stop
    if cases is None:
        cases = [state_case(joint, None)] + [state_case(joint, s) for s in joint.services]
    return Model(stations=tuple(stations), segments=tuple(segments), supports=(Support("head"),),
                 gaps=(Gap(GAP, ("stack-end", end), 0.0, "contact"),), cases=tuple(cases),
                 units=joint.units, title=joint.title, source=joint.source,
                 checks=CheckSettings(joint.safety_factor))


def state_case(joint: Joint, service: Service | None, name: str | None = None) -> Case:
    """The load case of one state: every segment's temperature change and the pull P at the nut."""
    temps = joint.temperatures_of(service)
    t0 = joint.assembly_temperature
    dT = [(seg, temps[BOLT] - t0) for seg, _, _ in _bolt_segments(joint)]
    dT += [(p.name, temps[p.name] - t0) for p in joint.parts]
    P = service.external_load if service is not None else 0.0
    end = "nut" if joint.into is None else "tapped-thread"
    return Case(name or (service.name if service else ASSEMBLY),
                loads=(Load(end, P),) if P else (), temperature_change=tuple(dT))


# --- results ----------------------------------------------------------------
@dataclass(frozen=True)
class JointState:
    """One solved state (SI): forces from the model, the closed-form terms beside them."""

    name: str
    temperatures: tuple[tuple[str, float], ...]
    external_load: float
    thermal_change: float
    bolt_force: float
    clamp_force: float
    bolt_stress: float
    separated: bool
    separation_load: float

    @property
    def bolt_temperature(self) -> float:
        return dict(self.temperatures)[BOLT]

    def to_dict(self, units: OutputUnits) -> dict:
        fF, fS = units.factor("force"), units.factor("stress")
        return {"name": self.name, "temperature": self.bolt_temperature - 273.15,
                "temperatures": {k: v - 273.15 for k, v in self.temperatures},
                "external_load": self.external_load / fF,
                "thermal_change": self.thermal_change / fF,
                "bolt_force": self.bolt_force / fF, "clamp_force": self.clamp_force / fF,
                "bolt_stress": self.bolt_stress / fS, "separated": bool(self.separated),
                "separation_load": self.separation_load / fF}


@dataclass(frozen=True)
class JointResult:
    """A solved joint: its states, the axial solution they came from, and the checks."""

    joint: Joint
    states: tuple[JointState, ...]
    solution: object
    checks: CheckReport

    def state(self, name: str) -> JointState:
        for s in self.states:
            if s.name == name:
                return s
        names = [s.name for s in self.states]
        raise ModelError(f"unknown state '{name}'", hint=suggest(name, names), options=names)


def _states(joint: Joint, solution, services) -> list[JointState]:
    bolt_seg = _bolt_segments(joint)[-1][0]
    first = joint.parts[0].name
    C, kk = joint.joint_constant, joint.series_stiffness
    out = []
    for case, service in zip(solution.cases, services):
        temps = joint.temperatures_of(service)
        dF = joint.mismatch(temps) * kk
        Fb = float(case.force(bolt_seg)[0])
        Fm = -float(case.force(first)[0])
        P = service.external_load if service is not None else 0.0
        separated = (not bool(case.gap_closed[0])) or Fm <= 0.0
        sep_load = max((joint.preload + dF) / (1 - C), 0.0)
        out.append(JointState(case.name, tuple(temps.items()), P, dF, Fb, Fm if Fm > 0 else 0.0,
                              Fb / joint.thread.tensile_stress_area, separated, sep_load))
    return out


def _checks(joint: Joint, states) -> CheckReport:
    units = joint.units
    force = units.force
    cases = []
    for s in states:
        entries = []
        if s.bolt_force <= 0:
            # a pressed-together joint that unloads the bolt entirely: the nut would lift off
            # its face, which the joint model does not describe
            entries.append(CheckEntry("bolt-proof", BOLT, s.name, None, None,
                                      "the bolt is not in tension: the external load presses the "
                                      "parts together beyond the preload, which this joint model "
                                      "does not describe", "stress", s.bolt_stress,
                                      joint.proof_strength))
        elif joint.proof_strength is None:
            entries.append(CheckEntry("bolt-proof", BOLT, s.name, None, None,
                                      "no proof or yield strength is known for the bolt",
                                      "stress", s.bolt_stress, None))
        else:
            u = s.bolt_stress * joint.safety_factor / joint.proof_strength
            entries.append(CheckEntry("bolt-proof", BOLT, s.name, u, bool(u <= 1.0), None,
                                      "stress", s.bolt_stress, joint.proof_strength))
        if joint.minimum_clamp_force is not None:
            need = joint.minimum_clamp_force
            if s.clamp_force > 0:
                u = need / s.clamp_force
                entries.append(CheckEntry("clamp-force", "clamped parts", s.name, u,
                                          bool(u <= 1.0), None, "force", need, s.clamp_force))
            else:
                entries.append(CheckEntry("clamp-force", "clamped parts", s.name, None, False,
                                          "the joint has separated: no clamp force is left",
                                          "force", need, 0.0))
        P = max(s.external_load, 0.0)
        if s.separation_load > 0:
            u = P / s.separation_load
            # at the separation load itself the clamp force is zero: the joint has opened
            entries.append(CheckEntry("separation", "joint", s.name, u,
                                      bool(u < 1.0 and not s.separated), None, "force", P,
                                      s.separation_load))
        else:
            entries.append(CheckEntry(
                "separation", "joint", s.name, None, False,
                f"the preload is lost at these temperatures (thermal change "
                f"{number(s.thermal_change / units.factor('force'))} {force}): the joint is open "
                "with no external load", "force", P, 0.0))
        cases.append(CaseChecks(s.name, tuple(entries)))
    governing = None
    for c in cases:
        for e in c.entries:
            if e.utilization is not None and (governing is None
                                              or e.utilization > governing.utilization):
                governing = e
    return CheckReport(CheckSettings(joint.safety_factor), tuple(cases), governing)


def check_basis(joint: Joint) -> str:
    """One line stating the basis of the joint's checks."""
    sf = f"{joint.safety_factor:g}" + (" (default)" if joint.safety_factor == 1.0 else "")
    text = (f"bolt-proof: bolt stress F_b/A_t x safety factor {sf} against the proof strength "
            f"({joint.proof_basis}); separation: external load against the separation load "
            "(F_i + dF_th)/(1 - C), no safety factor (a joint at its separation load fails)")
    if joint.minimum_clamp_force is not None:
        text += "; clamp-force: the minimum clamp force against the clamp force left"
    return text


def solve_joint(joint: Joint) -> JointResult:
    """Build the axial model of a joint, solve every state and check it.

    Returns
    -------
    JointResult
    """
    from ..engine.system import solve

    services = [None, *joint.services]
    solution = solve(build_model(joint))
    states = _states(joint, solution, services)
    return JointResult(joint, tuple(states), solution, _checks(joint, states))


# --- many joints at once: the closed forms on arrays -------------------------
def joint_parameters(joint: Joint) -> dict[str, float]:
    """The joint's scalar inputs by name (NaN where not given): what a tolerance study
    moves.  :func:`closed_states` turns arrays of them into each state's forces."""
    nan = float("nan")
    p = {"length": joint.length,
         "thread_length": nan if joint.thread_length is None else joint.thread_length,
         "preload": joint.preload if joint.torque is None else nan,
         "torque": nan if joint.torque is None else joint.torque,
         "nut_factor": nan if joint.nut_factor is None else joint.nut_factor,
         "assembly_temperature": joint.assembly_temperature,
         "bolt:modulus": joint.bolt_material.elastic_modulus,
         "bolt:expansion": joint.bolt_material.thermal_expansion,
         "minimum_clamp_force": (nan if joint.minimum_clamp_force is None
                                 else joint.minimum_clamp_force)}
    for i, part in enumerate(joint.parts):
        p[f"part:{i}:thickness"] = part.thickness
        p[f"part:{i}:modulus"] = part.material.elastic_modulus
        p[f"part:{i}:expansion"] = part.material.thermal_expansion
    for service in (None, *joint.services):
        name = service.name if service is not None else ASSEMBLY
        for who, T in joint.temperatures_of(service).items():
            p[f"state:{name}:temperature:{who}"] = T
        p[f"state:{name}:load"] = service.external_load if service is not None else 0.0
    return p


@dataclass(frozen=True)
class ClosedStates:
    """Each state's forces and checks of many joints (arrays over the joints), from the
    joint-diagram closed forms; ``unsure`` marks the joints these do not describe (a
    state that separates under no pull), which must be solved on their own."""

    bolt_force: dict
    clamp_force: dict
    separated: dict
    checks: dict          # (state, check kind) -> ok: 1 passes, 0 fails, -1 undecided
    unsure: np.ndarray
    assembles: np.ndarray  # the geometry a Joint accepts: the bolt passes the grip, the
                           # thread starts within it (or above the tapped part)


def closed_states(joint: Joint, p: dict) -> ClosedStates:
    """The states of the joints whose inputs are the arrays ``p`` (the names of
    :func:`joint_parameters`; ``joint`` gives the fixed rest: thread, parts, states).

    Before separation F_b = F_i + dF_th + C*P and F_m = F_i + dF_th - (1 - C)*P; once
    F_m would fall to zero the joint is open and the bolt carries P alone (Shigley,
    10th ed., eqs. 8-24, 8-25, from memory), as :func:`solve_joint`'s model gives it.
    The preload is T/(K*d) where a torque is given (eq. 8-27).  The geometry and
    stiffness are the :class:`Joint`'s own formulas on arrays.
    """
    th = joint.thread
    d = th.nominal_diameter
    n = np.broadcast(*[np.asarray(v) for v in p.values()]).shape
    length = np.asarray(p["length"], dtype=float)
    thick = [np.asarray(p[f"part:{i}:thickness"], dtype=float) for i in range(len(joint.parts))]
    engaged = list(thick)
    if joint.into is not None:
        t2 = thick[-1]
        engaged[-1] = np.where(t2 < d, t2 / 2, d / 2)
    grip = sum(engaged)
    given = np.asarray(p["thread_length"], dtype=float)
    thread_len = np.where(np.isnan(given), default_thread_length(th, length), given)
    shank = np.maximum(length - thread_len, 0.0)
    in_thread = np.maximum(grip - shank, 0.0)
    kb = bolt_stiffness(th.shank_area, th.tensile_stress_area, np.asarray(p["bolt:modulus"]),
                        shank, in_thread)
    _, km = member_stiffness([(p[f"part:{i}:modulus"], t) for i, t in enumerate(engaged)], d)
    C, kk = kb / (kb + km), kb * km / (kb + km)
    preload = np.asarray(p["preload"], dtype=float)
    preload = np.where(np.isnan(preload), np.asarray(p["torque"]) / (np.asarray(p["nut_factor"]) * d),
                       preload)
    t0 = np.asarray(p["assembly_temperature"])
    Fmin = np.asarray(p["minimum_clamp_force"], dtype=float)
    bolt_f, clamp_f, sep, checks = {}, {}, {}, {}
    unsure = np.zeros(n, dtype=bool)
    for service in (None, *joint.services):
        name = service.name if service is not None else ASSEMBLY
        T = lambda who: np.asarray(p[f"state:{name}:temperature:{who}"])  # noqa: E731
        delta = sum(np.asarray(p[f"part:{i}:expansion"]) * t * (T(part.name) - t0)
                    for i, (part, t) in enumerate(zip(joint.parts, engaged)))
        delta = delta - np.asarray(p["bolt:expansion"]) * grip * (T(BOLT) - t0)
        dF = delta * kk
        P = np.asarray(p[f"state:{name}:load"], dtype=float)
        fm = preload + dF - (1 - C) * P
        open_ = np.broadcast_to(fm <= 0.0, n)
        unsure |= open_ & (P <= 0.0)
        bolt = np.broadcast_to(np.where(open_, P, preload + dF + C * P), n).astype(float)
        clamp = np.broadcast_to(np.where(open_, 0.0, fm), n).astype(float)
        bolt_f[name], clamp_f[name], sep[name] = bolt, clamp, open_.copy()
        # the checks of _checks, on arrays (tests hold the two together)
        stress = bolt / th.tensile_stress_area
        if joint.proof_strength is None:
            proof = np.full(n, -1)
        else:
            proof = np.where(stress * joint.safety_factor / joint.proof_strength <= 1.0, 1, 0)
        checks[(name, "bolt-proof")] = np.where(bolt <= 0, -1, proof)
        if joint.minimum_clamp_force is not None:
            checks[(name, "clamp-force")] = np.where((clamp > 0) & (Fmin <= clamp), 1, 0)
        sep_load = np.maximum((preload + dF) / (1 - C), 0.0)
        load = np.maximum(P, 0.0)
        checks[(name, "separation")] = np.where(
            (sep_load > 0) & (load < sep_load) & ~open_, 1, 0)
    limit = grip if joint.into is None else sum(thick[:-1])
    assembles = np.broadcast_to((length > limit) & (shank <= limit * (1 + 1e-12)), n)
    return ClosedStates(bolt_f, clamp_f, sep, checks, unsure, assembles)


# --- temperature sweep -----------------------------------------------------
@dataclass(frozen=True)
class JointSweep:
    """A swept temperature: values in ``unit``, one state per value, the exact events."""

    joint: Joint
    state: str
    part: str | None
    unit: str
    values: tuple[float, ...]
    states: tuple[JointState, ...]
    events: tuple[tuple[str, str, float], ...]
    notes: tuple[str, ...] = ()

    def to_dict(self, units: OutputUnits | None = None) -> dict:
        units = units or self.joint.units
        return {"parameter": "temperature", "unit": self.unit, "state": self.state,
                "part": self.part or "all",
                "values": list(self.values),
                "events": [{"name": n, "event": e, "value": v} for n, e, v in self.events],
                "states": [s.to_dict(units) for s in self.states], "notes": list(self.notes)}


def sweep_joint(joint: Joint, start: float, stop: float, steps: int, *, unit: str = "degC",
                state: str | None = None, part: str | None = None) -> JointSweep:
    """Sweep the temperature of one service state (all parts, or one) from ``start`` to ``stop``.

    Parameters
    ----------
    start, stop : float
        In ``unit`` (an absolute temperature unit).
    steps : int
        Grid points, both ends included.
    state : str, optional
        The service state (default: the first); its external load is held.
    part : str, optional
        ``'bolt'`` or a clamped part's name: only it is swept, the others keep
        the state's temperatures.

    Returns
    -------
    JointSweep
        Events ``separates``, ``clamp-below-minimum`` and ``reaches-proof`` at the
        exact temperatures where the affine relations reach their thresholds.
    """
    from ..units import kelvin_to_temperature, temperature_to_kelvin
    from ..engine.system import solve

    if not joint.services:
        raise ModelError("a sweep needs a [[service]] state to sweep", place="--sweep")
    names = [s.name for s in joint.services]
    if state is None:
        service = joint.services[0]
    elif state in names:
        service = joint.services[names.index(state)]
    else:
        raise ModelError(f"unknown state '{state}'", place="--state", hint=suggest(state, names),
                         options=names)
    parts = [BOLT, *(p.name for p in joint.parts)]
    if part is not None and part not in parts:
        raise ModelError(f"unknown part '{part}'", place="--part", hint=suggest(part, parts),
                         options=parts)
    if steps < 2:
        raise ModelError(f"must be at least 2 (both ends of the range): got {steps}",
                         place="--steps")
    values = np.linspace(start, stop, steps)
    kelvin = [temperature_to_kelvin(float(v), unit) for v in values]
    swept = parts if part is None else [part]

    def at(T):
        base = joint.temperatures_of(service)
        base.update({n: T for n in swept})
        return replace(service, temperature=None, temperatures=tuple(base.items()))

    services = [at(T) for T in kelvin]
    cases = [state_case(joint, s, name=f"{service.name} step {i}") for i, s in enumerate(services)]
    solution = solve(build_model(joint, cases))
    states = [replace(s, name=service.name) for s in _states(joint, solution, services)]

    # the affine relations before separation: F = F0 + slope*(T - T_ref)
    C, kk, P = joint.joint_constant, joint.series_stiffness, service.external_load
    T_ref = kelvin[0]
    delta0 = joint.mismatch(dict(at(T_ref).temperatures))
    slope_delta = sum(p.material.thermal_expansion * t for p, t in zip(joint.parts, joint.engaged)
                      if p.name in swept)
    if BOLT in swept:
        slope_delta -= joint.bolt_material.thermal_expansion * joint.grip
    fm0 = joint.preload + kk * delta0 - (1 - C) * P
    fb0 = joint.preload + kk * delta0 + C * P
    slope = kk * slope_delta
    lo, hi = min(kelvin[0], kelvin[-1]), max(kelvin[0], kelvin[-1])
    found = []

    def root(f0, target):
        if slope == 0:
            return None
        T = T_ref + (target - f0) / slope
        return T if lo <= T <= hi else None

    T = root(fm0, 0.0)
    if T is not None:
        found.append((GAP, "separates", T))
    if joint.minimum_clamp_force is not None:
        T = root(fm0, joint.minimum_clamp_force)
        if T is not None:
            found.append((GAP, "clamp-below-minimum", T))
    if joint.proof_strength is not None:
        F_proof = joint.proof_strength * joint.thread.tensile_stress_area / joint.safety_factor
        T = root(fb0, F_proof)
        # past separation the bolt carries P alone: the line holds only while the joint is closed
        if T is not None and fm0 + slope * (T - T_ref) > 0:
            found.append((BOLT, "reaches-proof", T))
    found.sort(key=lambda e: e[2] if stop >= start else -e[2])
    events = tuple((n, e, float(kelvin_to_temperature(T, unit))) for n, e, T in found)
    notes = ()
    if part is not None:
        notes = (f"only '{part}' is swept; the other parts keep the temperatures of state "
                 f"'{service.name}'",)
    return JointSweep(joint, service.name, part, unit, tuple(float(v) for v in values),
                      tuple(states), events, notes)


# --- the joint diagram -----------------------------------------------------
@dataclass(frozen=True)
class DiagramLine:
    """Bolt and clamp force of one state against the external load (N), from the built model.

    ``loads`` runs 0, the separation load, and a load beyond it: the forces are
    straight between these points (the contact state changes only at the
    separation load), so these three solves draw the whole diagram.
    """

    state: str
    loads: tuple[float, ...]
    bolt: tuple[float, ...]
    clamp: tuple[float, ...]
    external_load: float
    bolt_force: float
    clamp_force: float


def diagram_lines(result: JointResult) -> tuple[DiagramLine, ...]:
    """The joint diagram of every state: bolt and clamp force against the external load."""
    from ..engine.system import solve

    joint = result.joint
    top = 1.3 * max([s.separation_load for s in result.states]
                    + [abs(s.external_load) for s in result.states] + [joint.preload])
    services = [None, *joint.services]
    cases, plan = [], []
    for s, service in zip(result.states, services):
        loads = sorted({0.0, s.separation_load, top})
        plan.append(loads)
        base = service or Service(ASSEMBLY)
        for i, P in enumerate(loads):
            cases.append(state_case(joint, replace(base, external_load=P),
                                    name=f"{s.name} load {i}"))
    solution = solve(build_model(joint, cases))
    bolt_seg, first = _bolt_segments(joint)[-1][0], joint.parts[0].name
    out, k = [], 0
    for s, loads in zip(result.states, plan):
        rows = solution.cases[k:k + len(loads)]
        k += len(loads)
        out.append(DiagramLine(s.name, tuple(loads),
                               tuple(float(r.force(bolt_seg)[0]) for r in rows),
                               tuple(-float(r.force(first)[0]) if r.force(first)[0] < 0 else 0.0
                                     for r in rows),
                               s.external_load, s.bolt_force, s.clamp_force))
    return tuple(out)
