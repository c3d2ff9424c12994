"""The fit-file reader: a FIT.toml in, a checked :class:`~axialfe.fits.fit.PressFit` out.

A fit file is untrusted input, read as data like a model file, with the model
reader's helpers (:mod:`axialfe.io.modelfile`): the same units, the same
``[materials]`` tables and built-in materials, the same located one-line
errors, e.g.::

    bushing.toml:14: fit: length: '40' has no unit: give a length, e.g. '40 mm'
"""

from __future__ import annotations

import math
import re
import tomllib
from pathlib import Path

from ..errors import ModelError, suggest
from ..io.modelfile import _Reader, builtin_materials
from ..model.tolerances import Tolerance, Toleranced, is_toleranced
from ..units import split_quantity
from . import iso286
from .fit import DEFAULT_TEMPERATURE, FitUnits, PressFit, ServiceState

__all__ = ["read_fit", "parse_fit", "read_fit_toleranced", "is_fit_data", "is_fit_file"]

_TOP = ("title", "shaft", "hub", "fit", "service", "checks", "materials", "units")
_KEYS = {
    "shaft": ("material", "diameter", "inner_diameter"),
    "hub": ("material", "outer_diameter"),
    "fit": ("interference", "iso", "shaft", "bore", "distribution", "length", "friction",
            "assembly_temperature", "assembly_clearance"),
    "service": ("name", "temperature", "shaft_temperature", "hub_temperature", "axial_load",
                "torque"),
    "checks": ("safety_factor",),
    "units": ("system", "force", "length", "stress", "torque"),
}
# explicit limits must lie this close to the fit diameter (a unit slip, not a tolerance)
_NEAR = 0.05


def is_fit_data(data: dict) -> bool:
    """True for parsed TOML that describes a fit (a ``[fit]`` table, no ``[stations]``)."""
    return isinstance(data.get("fit"), dict) and "stations" not in data


# a line that opens a [fit] table or sets a top-level fit key: without one, a file is no
# fit file and is not parsed here (a large model file is read once, by the model reader)
_FIT_LINE = re.compile(r"^[ \t]*(?:\[[ \t]*fit[ \t]*\]|fit[ \t]*=)", re.MULTILINE)


def is_fit_file(path) -> bool:
    """True when ``path`` is a readable TOML file that describes a fit."""
    from ..io.limits import check_text, read_input

    try:
        text = read_input(path)  # a regular file within the size limit, or not a fit
        check_text(text)
        return bool(_FIT_LINE.search(text)) and is_fit_data(tomllib.loads(text))
    except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError, ModelError, RecursionError):
        return False  # the model reader reports it


# the (table, key) pairs of a fit file whose values may carry a tolerance
_TOLERABLE = {("shaft", "diameter"), ("shaft", "inner_diameter"), ("hub", "outer_diameter"),
              ("fit", "interference"), ("fit", "length"), ("fit", "friction"),
              ("fit", "assembly_temperature"), ("service", "temperature"),
              ("service", "shaft_temperature"), ("service", "hub_temperature"),
              ("service", "axial_load"), ("service", "torque"),
              ("materials", "elastic_modulus"), ("materials", "thermal_expansion"),
              ("materials", "poissons_ratio")}
# toleranced keys whose draws must stay above zero (absolute temperatures: above 0 K)
_POSITIVE = ("diameter", "outer_diameter", "length", "friction", "elastic_modulus",
             "temperature", "shaft_temperature", "hub_temperature", "assembly_temperature")
DISTRIBUTIONS = ("normal", "uniform")


class _FitValues(_Reader):
    """The model reader's values, with a fit file's toleranced keys and their names."""

    TAKERS = ("a fit file takes one on the diameters, interference, length, friction, "
              "temperatures, loads and its own materials' elastic_modulus, thermal_expansion "
              "and poissons_ratio; ISO 286 and shaft/bore limits are toleranced by their "
              "limits")

    def may_tolerance(self, table, key) -> bool:
        return ((table or "").split(".")[0], key) in _TOLERABLE

    POSITIVE = _POSITIVE

    def tolerance_problem(self, tol, table, key) -> str | None:
        problem = super().tolerance_problem(tol, table, key)
        if problem is None and key == "inner_diameter" and tol.spread[0] < 0:
            problem = "inner_diameter could fall below zero"
        return problem

    def _tolerance_path(self, table, index, key, place, item):
        """``shaft.diameter``, ``fit.friction``, ``service.<name>.torque``,
        ``materials.<name>.elastic_modulus``."""
        if table == "service":
            entry = self.data["service"][index - 1]
            name = entry.get("name") if isinstance(entry.get("name"), str) else f"service-{index}"
            return f"service.{name}.{key}"
        return f"{table}.{key}"

    def number(self, value, *, table=None, index=None, key=None, place=None):
        if is_toleranced(value):
            return self.toleranced(value, None, table, index, key, place)
        return super().number(value, table=table, index=index, key=key, place=place)


class _FitReader:
    def __init__(self, data, source, text, overrides=None):
        self.r = _FitValues(data, source, text, overrides=overrides)
        self.data = data
        self.source = source

    def table(self, name, required=True):
        entry = self.data.get(name)
        if entry is None:
            if required:
                raise ModelError(f"a fit file needs a [{name}] table", place="top level",
                                 file=self.source)
            entry = {}
        self.r.keys(entry, _KEYS[name], name, place=name)
        return entry

    def need(self, entry, key, table):
        if key not in entry:
            self.r.fail(f"[{table}] needs '{key}'", table, place=table)
        return entry[key]

    def length(self, entry, key, table):
        return self.r.quantity(entry[key], "length", table=table, key=key, place=table)

    def material(self, entry, table, own):
        name = self.r.text(self.need(entry, "material", table), table=table, key="material",
                           place=table)
        if name in own:
            mat = own[name]
        else:
            builtins = builtin_materials()
            if name not in builtins:
                self.r.fail(f"unknown material '{name}'", table, None, "material", place=table,
                            hint=suggest(name, [*own, *builtins]), options=[*own, *builtins])
            mat = builtins[name]
        if mat.tabled:
            self.r.fail(f"material '{name}' gives properties against temperature; a fit takes "
                        "constant properties: give its values as constants", table, None,
                        "material", place=table)
        if mat.poissons_ratio is None:
            self.r.fail(f"material '{name}' needs 'poissons_ratio' for a fit (give it in "
                        f"[materials.{name}])", table, None, "material", place=table)
        return mat

    def limits(self, value, key):
        """Two lengths from ``"50.042 mm 50.026 mm"`` (or ``"50.042 50.026 mm"``, or an
        array of two strings), returned (least, greatest)."""
        example = "'50.042 mm 50.026 mm'"
        if isinstance(value, list) and len(value) == 2:
            pair = [self.r.quantity(v, "length", table="fit", key=key, place="fit") for v in value]
        elif isinstance(value, str):
            items = []
            for token in value.split():
                parts = split_quantity(token)
                if parts is None:  # a unit of the number before it
                    if not items or items[-1][1]:
                        items = None
                        break
                    items[-1][1] = token
                else:
                    items.append([parts[0], parts[1]])
            if not items or len(items) != 2:
                self.r.fail(f"{key}: expected two limits such as {example}: got {value!r}",
                            "fit", None, key, place="fit")
            if not items[0][1]:
                items[0][1] = items[1][1]  # "50.042 50.026 mm": one unit for both
            pair = [self.r.quantity(f"{n} {u}" if u else n, "length", table="fit", key=key,
                                    place="fit") for n, u in items]
        else:
            self.r.fail(f"{key}: expected two limits such as {example}: got {value!r}", "fit",
                        None, key, place="fit")
        return tuple(sorted(pair))

    def limit_inputs(self, fit, bore_limits, shaft_limits, interference):
        """Record the bore and the shaft as toleranced inputs ``fit.bore`` and ``fit.shaft``
        between their limits (normal with the limits at +-3 sigma about their midpoint, or
        ``distribution = "uniform"``); return the interference, or one sample's
        shaft - bore where a study gives the two diameters."""
        r = self.r
        if "shaft.diameter" in r.tolerances:
            r.fail("diameter: a tolerance is not allowed where 'iso' or 'shaft' and 'bore' "
                   "limits give the diameters", "shaft", None, "diameter", place="shaft")
        distribution = fit.get("distribution", "normal")
        if distribution not in DISTRIBUTIONS:
            r.fail(f"distribution: unknown distribution {distribution!r}", "fit", None,
                   "distribution", place="fit", hint=suggest(str(distribution), DISTRIBUTIONS),
                   options=DISTRIBUTIONS)
        key = "iso" if "iso" in fit else None
        for name, (lo, hi) in (("bore", bore_limits), ("shaft", shaft_limits)):
            sigma = (hi - lo) / (6.0 if distribution == "normal" else math.sqrt(12.0))
            tol = Tolerance(0.5 * (lo + hi), lo, hi, distribution, sigma, "length", "mm")
            r.tolerances[f"fit.{name}"] = Toleranced(f"fit.{name}", tol,
                                                     r.line("fit", None, key or name))
        over = r.overrides
        if "fit.bore" in over or "fit.shaft" in over:
            delta = (over.get("fit.shaft", r.tolerances["fit.shaft"].tolerance.centre)
                     - over.get("fit.bore", r.tolerances["fit.bore"].tolerance.centre))
            return (delta, delta)
        return interference

    def read(self) -> PressFit:
        data, r = self.data, self.r
        for key in data:
            if key not in _TOP:
                r.fail(f"unknown key '{key}'", key if isinstance(data[key], (dict, list))
                       else None, key=key, place="top level", hint=suggest(key, _TOP),
                       options=_TOP)
        title = data.get("title", Path(self.source).stem if self.source else "press fit")
        own = data.get("materials", {})
        r.keys(own, tuple(own), "materials", place="materials")
        own = {name: r.material(name, entry) for name, entry in own.items()}

        shaft, hub, fit = self.table("shaft"), self.table("hub"), self.table("fit")
        shaft_mat = self.material(shaft, "shaft", own)
        hub_mat = self.material(hub, "hub", own)
        d = self.length(shaft, "diameter", "shaft") if "diameter" in shaft else None
        d_i = self.length(shaft, "inner_diameter", "shaft") if "inner_diameter" in shaft else 0.0
        self.need(hub, "outer_diameter", "hub")
        d_o = self.length(hub, "outer_diameter", "hub")

        given = [k for k in ("interference", "iso", "shaft") if k in fit]
        if "bore" in fit and "shaft" not in fit:
            r.fail("limits need both 'shaft' and 'bore'", "fit", None, "bore", place="fit")
        if "shaft" in fit and "bore" not in fit:
            r.fail("limits need both 'shaft' and 'bore'", "fit", None, "shaft", place="fit")
        if len(given) != 1:
            r.fail("give the interference one way: 'interference', 'iso' (e.g. \"50 H7/p6\"), "
                   "or 'shaft' and 'bore' limits", "fit", None, given[1] if given[1:] else None,
                   place="fit")
        designation = bore_limits = shaft_limits = None
        if "iso" in fit:
            text = r.text(fit["iso"], table="fit", key="iso", place="fit")
            try:
                iso = iso286.fit_limits(text)
            except ModelError as exc:
                r.fail(f"iso: {exc.message}", "fit", None, "iso", place="fit",
                       hint=exc.hint, options=exc.options)
            if d is None:
                d = iso.size
            elif not math.isclose(d, iso.size, rel_tol=1e-9, abs_tol=1e-12):
                r.fail(f"iso: the designation's size {iso.size * 1e3:g} mm does not agree with "
                       f"[shaft] diameter {d * 1e3:g} mm", "fit", None, "iso", place="fit")
            designation, bore_limits, shaft_limits = iso.designation, iso.bore, iso.shaft
            interference = iso.interference
        elif "shaft" in fit:
            shaft_limits = self.limits(fit["shaft"], "shaft")
            bore_limits = self.limits(fit["bore"], "bore")
            if d is not None:
                for key, pair in (("shaft", shaft_limits), ("bore", bore_limits)):
                    if any(abs(x - d) > _NEAR * d for x in pair):
                        r.fail(f"{key}: the limits lie far from the fit diameter "
                               f"{d * 1e3:g} mm (a unit slip?)", "fit", None, key, place="fit")
            interference = (shaft_limits[0] - bore_limits[1], shaft_limits[1] - bore_limits[0])
        else:
            value = fit["interference"]
            if isinstance(value, str) and len(value.split()) > 2 and not is_toleranced(value):
                interference = self.limits(value, "interference")
            else:
                one = r.quantity(value, "length", table="fit", key="interference", place="fit")
                interference = (one, one)
        if bore_limits is not None:
            interference = self.limit_inputs(fit, bore_limits, shaft_limits, interference)
        elif "distribution" in fit:
            r.fail("distribution: belongs to the limits of 'iso' or of 'shaft' and 'bore'; a "
                   "toleranced interference gives its own", "fit", None, "distribution",
                   place="fit")
        if d is None:
            r.fail("[shaft] needs 'diameter' (or an ISO designation in [fit] iso that names "
                   "it)", "shaft", place="shaft")
        if "inner_diameter" in shaft and not (0 <= d_i < d):
            r.fail(f"inner_diameter must lie between 0 and the fit diameter {d * 1e3:g} mm",
                   "shaft", None, "inner_diameter", place="shaft")
        if not d_o > d:
            r.fail(f"outer_diameter must be larger than the fit diameter {d * 1e3:g} mm",
                   "hub", None, "outer_diameter", place="hub")
        self.need(fit, "length", "fit")
        self.need(fit, "friction", "fit")
        length = self.length(fit, "length", "fit")
        friction = r.number(fit["friction"], table="fit", key="friction", place="fit")
        t0 = (r.quantity(fit["assembly_temperature"], "temperature", table="fit",
                         key="assembly_temperature", place="fit")
              if "assembly_temperature" in fit else None)
        clearance = (self.length(fit, "assembly_clearance", "fit")
                     if "assembly_clearance" in fit else None)
        base = DEFAULT_TEMPERATURE if t0 is None else t0

        services = []
        items = data.get("service", [])
        if not isinstance(items, list):
            r.fail("'service' must be an array of tables ([[service]])", "service",
                   place="service")
        for i, entry in enumerate(items, 1):
            place = f"service[{i}]" + (f" ('{entry['name']}')" if isinstance(entry, dict)
                                       and isinstance(entry.get("name"), str) else "")
            r.keys(entry, _KEYS["service"], "service", i, place)
            if "name" not in entry:
                r.fail("a service state needs 'name'", "service", i, place=place)

            def q(key, kind, default):
                if key not in entry:
                    return default
                return r.quantity(entry[key], kind, table="service", index=i, key=key,
                                  place=place)

            both = q("temperature", "temperature", base)
            kwargs = {"name": r.text(entry["name"], table="service", index=i, key="name",
                                     place=place),
                      "shaft_temperature": q("shaft_temperature", "temperature", both),
                      "hub_temperature": q("hub_temperature", "temperature", both),
                      "axial_load": q("axial_load", "force", 0.0),
                      "torque": q("torque", "torque", 0.0)}
            services.append(r.build(ServiceState, kwargs, "service", i, place))

        checks = data.get("checks", {})
        r.keys(checks, _KEYS["checks"], "checks", place="checks")
        sf = (r.number(checks["safety_factor"], table="checks", key="safety_factor",
                       place="checks") if "safety_factor" in checks else 1.0)
        units_entry = data.get("units", {})
        r.keys(units_entry, _KEYS["units"], "units", place="units")
        try:
            units = FitUnits.system(units_entry.get("system", "SI"),
                                    **{k: v for k, v in units_entry.items() if k != "system"})
        except ModelError as exc:
            key = next((k for k, v in units_entry.items() if f"'{v}'" in exc.message), "system")
            raise type(exc)(f"{key}: {exc.message}", place="units", file=self.source,
                            line=r.line("units", None, key), hint=exc.hint,
                            options=exc.options) from exc
        kwargs = {"shaft": shaft_mat, "hub": hub_mat, "diameter": d, "outer_diameter": d_o,
                  "length": length, "friction": friction, "interference": interference,
                  "inner_diameter": d_i, "assembly_temperature": t0,
                  "assembly_clearance": clearance, "services": tuple(services),
                  "safety_factor": sf, "title": str(title), "designation": designation,
                  "bore_limits": bore_limits, "shaft_limits": shaft_limits, "units": units}
        try:
            return PressFit(**kwargs)
        except ModelError as exc:
            table = (exc.place or "fit").split(" ")[0]
            key = next((k for k in (*_KEYS.get(table, ()), "safety_factor", "friction", "length")
                        if k in exc.message), None)
            if "safety_factor" in exc.message:
                table = "checks"
            raise exc.located(file=self.source, line=r.line(table, None, key)) from exc


def parse_fit(text: str, source: str | None = None) -> PressFit:
    """Read a fit from TOML text.

    Raises
    ------
    ModelError
        For malformed TOML, unknown keys or names, wrong units and invalid values.
    """
    from ..io.source import decode

    return _FitReader(decode(text, source), source, text).read()


def read_fit(path) -> PressFit:
    """Read a fit file (TOML); see :func:`parse_fit`."""
    from ..io.source import read_text

    path = Path(path)
    return parse_fit(read_text(path, "fit file"), str(path))


def read_fit_toleranced(path):
    """Read a fit file for a tolerance study.

    Returns
    -------
    fit : PressFit
        The fit at the nominal values (an ISO 286 or limits fit between its limits).
    found : tuple of Toleranced
        Its toleranced inputs by path: ``fit.bore`` and ``fit.shaft`` of a
        designation or of limits, and every value written with a tolerance
        (``fit.friction``, ``shaft.inner_diameter``, ``service.<name>.torque``, ...).
    build : callable
        ``build({path: SI value})``: the fit read again with those inputs moved (with
        ``fit.bore`` and ``fit.shaft``, its interference is shaft - bore).
    """
    from ..io.source import decode, read_text

    path = Path(path)
    text, source = read_text(path, "fit file"), str(path)
    reader = _FitReader(decode(text, source), source, text)
    fit = reader.read()

    def build(values):
        return _FitReader(decode(text, source), source, text, overrides=values).read()

    return fit, tuple(reader.r.tolerances.values()), build
