"""The joint-file reader: a JOINT.toml in, a checked :class:`~axialfe.joints.joint.Joint` out.

A joint file is untrusted input, parsed with :mod:`tomllib` and read as data.
Units, materials and located errors come from the model-file reader
(:mod:`axialfe.io.modelfile`), so a joint file speaks the same language as a
model file: every error is one line naming the file, the line and the place.
"""

from __future__ import annotations

import re
import tomllib
from pathlib import Path

from ..errors import ModelError, UnitError, suggest
from ..formatting import number
from ..io.modelfile import _Reader, builtin_materials
from ..io.source import decode, read_text
from ..model.tolerances import Toleranced, is_toleranced
from ..units import OutputUnits, split_quantity, unit_base
from .grades import bolting_steel, iso_class, sae_grade
from .joint import ASSEMBLY, BOLT, Joint, Part, Service
from .threads import thread

__all__ = ["read_joint", "parse_joint", "is_joint_file", "read_joint_toleranced", "NUT_FACTOR"]

NUT_FACTOR = 0.2  # Shigley, 10th ed., Table 8-15: K = 0.2 for a bolt as received (from memory)

_TOP = ("title", "units", "materials", "bolt", "clamped", "assembly", "service", "checks")
_KEYS = {
    "bolt": ("size", "property_class", "grade", "material", "length", "thread_length", "into"),
    "clamped": ("name", "material", "thickness"),
    "assembly": ("preload", "torque", "nut_factor", "temperature"),
    "service": ("name", "temperature", "temperatures", "external_load"),
    "checks": ("safety_factor", "minimum_clamp_force"),
    "units": ("system", "force", "length", "stress"),
}
_TORQUE_DIMS = {"[length]": 2, "[mass]": 1, "[time]": -2}
# the (table, key) pairs of a joint file whose values may carry a tolerance
_TOLERABLE = {("bolt", "length"), ("bolt", "thread_length"), ("clamped", "thickness"),
              ("assembly", "preload"), ("assembly", "torque"), ("assembly", "nut_factor"),
              ("assembly", "temperature"), ("service", "temperature"),
              ("service", "temperatures"), ("service", "external_load"),
              ("checks", "minimum_clamp_force"), ("materials", "elastic_modulus"),
              ("materials", "thermal_expansion")}
# toleranced keys whose draws must stay above zero (absolute temperatures: above 0 K)
_POSITIVE = ("length", "thread_length", "thickness", "preload", "torque", "nut_factor",
             "minimum_clamp_force", "elastic_modulus", "temperature", "temperatures")


def is_joint_file(path) -> bool:
    """True for a TOML file with a ``[bolt]`` table (a joint file, not a model file)."""
    try:
        data = tomllib.loads(Path(path).read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError):
        return False
    return isinstance(data.get("bolt"), dict)


class _JointReader(_Reader):
    """The model-file reader's methods, applied to the tables of a joint file."""

    def table(self, key, required=True):
        entry = self.data.get(key)
        if entry is None:
            if required:
                self.fail(f"a joint file needs a [{key}] table", place="top level")
            return {}
        self.keys(entry, _KEYS[key], key, place=key)
        return entry

    def need(self, entry, key, table, index=None, place=None):
        if key not in entry:
            self.fail(f"'{key}' is missing", table, index, place=place or table)
        return entry[key]

    TAKERS = ("a joint file takes one on the bolt's length and thread_length, the clamped "
              "parts' thickness, the assembly's preload, torque, nut_factor and temperature, "
              "the service states' temperatures and external_load, minimum_clamp_force, and "
              "its own materials' elastic_modulus and thermal_expansion")

    def may_tolerance(self, table, key) -> bool:
        return ((table or "").split(".")[0], key) in _TOLERABLE

    POSITIVE = _POSITIVE

    def _tolerance_path(self, table, index, key, place, item):
        """``bolt.length``, ``clamped.<name>.thickness``, ``service.<name>.external_load``,
        ``service.<name>.temperatures.<part>``, ``materials.<name>.elastic_modulus``."""
        top = table.split(".")[0]
        if top in ("clamped", "service"):
            entry = self.data[top][index - 1]
            name = entry.get("name") if isinstance(entry.get("name"), str) else f"{top}-{index}"
            return f"{top}.{name}.{key}" + (f".{item}" if item is not None else "")
        return f"{table}.{key}"

    def number(self, value, *, table=None, index=None, key=None, place=None):
        """A plain number, or a toleranced one where a joint file allows it (the nut factor)."""
        if not is_toleranced(value):
            return super().number(value, table=table, index=index, key=key, place=place)
        return self.toleranced(value, None, table, index, key, place)

    def torque(self, value, table, key):
        """A torque in N*m, checked for its dimension (e.g. '50 N*m', '30 lbf*ft')."""
        if is_toleranced(value):
            return self.toleranced(value, "torque", table, None, key, table)
        parts = split_quantity(value) if isinstance(value, str) else None
        if parts is None or not parts[1]:
            self.fail(f"{key}: expected a torque with its unit, e.g. '50 N*m': got {value!r}",
                      table, None, key, place=table)
        try:
            scale, dims = unit_base(parts[1])
        except UnitError as exc:
            self.fail(f"{key}: {exc.message}", table, None, key, place=table)
        if {k: v for k, v in dims.items() if v} != _TORQUE_DIMS:
            self.fail(f"{key}: '{parts[1]}' is not a unit of torque, e.g. '50 N*m'", table, None,
                      key, place=table)
        return float(parts[0]) * scale

    def own_materials(self):
        own = self.data.get("materials", {})
        self.keys(own, tuple(own), "materials", place="materials")
        proof = {}
        materials = {}
        for name, entry in own.items():
            if isinstance(entry, dict) and "proof_strength" in entry:
                entry = dict(entry)
                proof[name] = self.quantity(entry.pop("proof_strength"), "stress",
                                            table=f"materials.{name}", key="proof_strength",
                                            place=f"materials.{name}")
            materials[name] = self.material(name, entry)
        return materials, proof

    def find_material(self, name, materials, table, index, place):
        name = self.text(name, table=table, index=index, key="material", place=place)
        if name in materials:
            mat = materials[name]
        else:
            builtins = builtin_materials()
            if name not in builtins:
                self.fail(f"unknown material '{name}'", table, index, "material", place=place,
                          hint=suggest(name, [*materials, *builtins]),
                          options=[*materials, *builtins])
            mat = builtins[name]
        if mat.tabled:
            self.fail(f"material '{name}' gives properties against temperature; a joint takes "
                      "constant properties: give its values as constants", table, index,
                      "material", place=place)
        return mat

    def joint(self) -> Joint:
        data = self.data
        for key in data:
            if key not in _TOP:
                self.fail(f"unknown key '{key}'", key if isinstance(data[key], (dict, list))
                          else None, key=key, place="top level", hint=suggest(key, _TOP),
                          options=_TOP)
        title = data.get("title", Path(self.source).stem if self.source else "bolted joint")
        units_entry = self.table("units", required=False)
        try:
            units = OutputUnits.system(units_entry.get("system", "SI"),
                                       **{k: v for k, v in units_entry.items() if k != "system"})
            if "length" in units_entry:
                units = OutputUnits(units.force, units.length, units_entry["length"], units.stress)
        except ModelError as exc:
            self.fail(exc.message, "units", place="units", options=exc.options)
        materials, proof = self.own_materials()

        bolt = self.table("bolt")
        q = lambda entry, key, kind, table, index=None, place=None: self.quantity(  # noqa: E731
            entry[key], kind, table=table, index=index, key=key, place=place or table)
        size = self.text(self.need(bolt, "size", "bolt"), table="bolt", key="size", place="bolt")
        try:
            th = thread(size)
        except ModelError as exc:
            self.fail(f"size: {exc.message}", "bolt", None, "size", place="bolt", hint=exc.hint,
                      options=exc.options)
        given = [k for k in ("property_class", "grade", "material") if k in bolt]
        if len(given) != 1:
            self.fail("give one of 'property_class' (ISO 898-1), 'grade' (SAE J429) or "
                      "'material'" + (f": got {', '.join(given)}" if given else ""), "bolt",
                      None, given[-1] if given else None, place="bolt")
        key = given[0]
        value = self.text(bolt[key], table="bolt", key=key, place="bolt")
        if key == "material":
            mat = self.find_material(value, materials, "bolt", None, "bolt")
            if value in proof:
                strength, basis = proof[value], f"proof_strength of material '{value}'"
            elif mat.yield_strength is not None:
                strength = mat.yield_strength
                basis = (f"material '{value}' gives no proof_strength: its yield strength "
                         f"{number(strength / 1e6)} MPa is used in its place")
            else:
                strength, basis = None, f"material '{value}' gives no proof or yield strength"
        else:
            if (th.system == "metric") != (key == "property_class"):
                self.fail(f"{key}: a {'metric' if th.system == 'metric' else 'unified inch'} "
                          f"bolt takes {'property_class' if th.system == 'metric' else 'grade'}",
                          "bolt", None, key, place="bolt")
            try:
                grade = (iso_class if key == "property_class" else sae_grade)(
                    value, th.nominal_diameter)
            except ModelError as exc:
                self.fail(f"{key}: {exc.message}", "bolt", None, key, place="bolt",
                          hint=exc.hint, options=exc.options)
            mat = bolting_steel(grade.name)
            strength, basis = grade.proof_strength, grade.source
        length = q(bolt, "length", "length", "bolt") if "length" in bolt else self.need(
            bolt, "length", "bolt")
        thread_length = q(bolt, "thread_length", "length", "bolt") if "thread_length" in bolt else None
        into = (self.text(bolt["into"], table="bolt", key="into", place="bolt")
                if "into" in bolt else None)

        items = data.get("clamped", [])
        if not isinstance(items, list) or not items:
            self.fail("a joint needs [[clamped]] parts, from under the head to the nut",
                      "clamped" if "clamped" in data else None, place="clamped")
        parts = []
        for i, entry in enumerate(items, 1):
            place = f"clamped[{i}]" + (f" ('{entry['name']}')" if isinstance(entry, dict)
                                       and isinstance(entry.get("name"), str) else "")
            self.keys(entry, _KEYS["clamped"], "clamped", i, place)
            for k in ("name", "material", "thickness"):
                self.need(entry, k, "clamped", i, place)
            name = self.text(entry["name"], table="clamped", index=i, key="name", place=place)
            mat_p = self.find_material(entry["material"], materials, "clamped", i, place)
            t = q(entry, "thickness", "length", "clamped", i, place)
            parts.append(self.build(Part, {"name": name, "material": mat_p, "thickness": t},
                                    "clamped", i, place, raw=entry))
        if into is not None and into not in [p.name for p in parts]:
            self.fail(f"into: unknown part '{into}'", "bolt", None, "into", place="bolt",
                      hint=suggest(into, [p.name for p in parts]))

        asm = self.table("assembly")
        if ("preload" in asm) == ("torque" in asm):
            self.fail("give 'preload' or 'torque' (with 'nut_factor'), one of them", "assembly",
                      place="assembly")
        if "preload" in asm:
            if "nut_factor" in asm:
                self.fail("'nut_factor' belongs to a 'torque'", "assembly", None, "nut_factor",
                          place="assembly")
            preload = q(asm, "preload", "force", "assembly")
            if not preload > 0:
                self.fail(f"preload must be positive (a tension): got '{asm['preload']}'",
                          "assembly", None, "preload", place="assembly")
            preload_basis = "given"
            torque = K = None
        else:
            torque = self.torque(asm["torque"], "assembly", "torque")
            K = (self.number(asm["nut_factor"], table="assembly", key="nut_factor",
                             place="assembly") if "nut_factor" in asm else NUT_FACTOR)
            if not K > 0:
                self.fail(f"nut_factor must be positive: got {K:g}", "assembly", None,
                          "nut_factor", place="assembly")
            preload = torque / (K * th.nominal_diameter)
            preload_basis = (f"from the tightening torque {number(torque)} N*m with nut factor "
                             f"K = {K:g}"
                             + (" (default)" if "nut_factor" not in asm else "")
                             + ": F_i = T/(K*d) (Shigley, 10th ed., eq. 8-27, from memory); the "
                             "nut factor scatters widely with lubrication and finish")
        if "temperature" not in asm:
            self.fail("'temperature' is missing (the assembly temperature, e.g. '20 degC')",
                      "assembly", place="assembly")
        t_asm = q(asm, "temperature", "temperature", "assembly")

        names = [BOLT, *(p.name for p in parts)]
        services = []
        entries = data.get("service", [])
        if not isinstance(entries, list):
            self.fail("'service' must be an array of tables ([[service]])", "service",
                      place="service")
        for i, entry in enumerate(entries, 1):
            place = f"service[{i}]" + (f" ('{entry['name']}')" if isinstance(entry, dict)
                                       and isinstance(entry.get("name"), str) else "")
            self.keys(entry, _KEYS["service"], "service", i, place)
            name = self.text(self.need(entry, "name", "service", i, place), table="service",
                             index=i, key="name", place=place)
            if name == ASSEMBLY:
                self.fail("'assembly' names the installed state; give the service state a name "
                          "of its own", "service", i, "name", place=place)
            if name in [s.name for s in services]:
                self.fail(f"two service states are named '{name}'", "service", i, "name",
                          place=place)
            temp = (q(entry, "temperature", "temperature", "service", i, place)
                    if "temperature" in entry else None)
            own = entry.get("temperatures", {})
            if not isinstance(own, dict):
                self.fail("temperatures: expected a table, e.g. { bolt = \"90 degC\" }",
                          "service", i, "temperatures", place=place)
            temps = []
            for part_name, value in own.items():
                if part_name not in names:
                    self.fail(f"temperatures: unknown part '{part_name}'", "service", i,
                              "temperatures", place=place, hint=suggest(part_name, names),
                              options=names)
                temps.append((part_name, self.quantity(value, "temperature", table="service",
                                                       index=i, key="temperatures", place=place,
                                                       item=part_name)))
            load = (q(entry, "external_load", "force", "service", i, place)
                    if "external_load" in entry else 0.0)
            services.append(self.build(Service, {"name": name, "temperature": temp,
                                                 "temperatures": tuple(temps),
                                                 "external_load": load}, "service", i, place))

        checks = self.table("checks", required=False)
        sf = (self.number(checks["safety_factor"], table="checks", key="safety_factor",
                          place="checks") if "safety_factor" in checks else 1.0)
        cmin = (q(checks, "minimum_clamp_force", "force", "checks")
                if "minimum_clamp_force" in checks else None)
        kwargs = {"title": str(title), "thread": th, "bolt_material": mat,
                  "proof_strength": strength, "proof_basis": basis, "length": length,
                  "parts": tuple(parts), "preload": preload, "assembly_temperature": t_asm,
                  "services": tuple(services), "thread_length": thread_length, "into": into,
                  "preload_basis": preload_basis, "safety_factor": sf,
                  "minimum_clamp_force": cmin, "units": units, "source": self.source,
                  "torque": torque, "nut_factor": K}
        try:
            return Joint(**kwargs)
        except ModelError as exc:
            m = re.match(r"(\w+)(?:\[(\d+)\])?", exc.place or "")
            table = m.group(1) if m and m.group(1) in _KEYS else None
            index = int(m.group(2)) if m and m.group(2) else None
            key = next((k for k in ("thread_length", "length", "into", "preload",
                                    "safety_factor", "minimum_clamp_force")
                        if exc.message.startswith(k)), None)
            raise ModelError(exc.message, place=exc.place, file=self.source,
                             line=self.line(table, index, key) if table else None,
                             hint=exc.hint, options=exc.options) from exc


def parse_joint(text: str, source: str | None = None, overrides: dict | None = None) -> Joint:
    """Read a joint from TOML text (see README, "Bolted joints").

    Raises
    ------
    ModelError
        For malformed TOML, unknown keys, sizes, classes or names, wrong units,
        and a geometry that cannot be assembled.
    """
    return _JointReader(decode(text, source), source, text, overrides=overrides).joint()


def read_joint(path) -> Joint:
    """Read a joint file; see :func:`parse_joint`."""
    path = Path(path)
    return parse_joint(read_text(path, "joint file"), str(path))


def read_joint_toleranced(path):
    """Read a joint file for a tolerance study.

    Returns
    -------
    joint : Joint
        The joint at the nominal values.
    found : tuple of Toleranced
        Its toleranced inputs, by path (``assembly.nut_factor``, ``bolt.length``, ...).
    build : callable
        ``build({path: value})``: the joint read again with those inputs moved.
    """
    path = Path(path)
    text, source = read_text(path, "joint file"), str(path)
    reader = _JointReader(decode(text, source), source, text)
    joint = reader.joint()
    return (joint, tuple(reader.tolerances.values()),
            lambda values: parse_joint(text, source, overrides=values))
