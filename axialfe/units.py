"""Units at the edges: the only module that imports pint.

Model values arrive as strings such as ``"40 mm"`` or ``"29000 ksi"`` and leave
this module as floats in SI base units (m, N, Pa, K, kg).  Results go back
through :func:`to_unit` for display.  pint stays the authority on what a unit
means; a string is split into number and unit text and each distinct unit text
is converted once and cached, so a large model file does not pay pint's parse
cost per value.
"""

from __future__ import annotations

import functools
import math
import re
from dataclasses import dataclass

from .errors import UnitError

__all__ = ["KINDS", "OutputUnits", "parse_quantity", "unit_factor", "to_unit", "describe",
           "temperature_to_kelvin", "kelvin_to_temperature", "split_quantity",
           "unit_base", "kind_dimensions", "number_and_unit", "check_unit_text",
           "MAX_UNIT_LENGTH", "MAX_UNIT_EXPONENT"]

# Each kind of value, the reference unit that fixes its dimension, and an example
# shown when a unit is missing or wrong.
KINDS: dict[str, tuple[str, str]] = {
    "length": ("m", "40 mm"),
    "area": ("m^2", "120 mm^2"),
    "second_moment": ("m^4", "8000 mm^4"),
    "force": ("N", "12 kN"),
    "stress": ("Pa", "250 MPa"),
    "thermal_expansion": ("1/K", "12e-6 /K"),
    "force_per_length": ("N/m", "1.5 kN/m"),
    "density": ("kg/m^3", "7850 kg/m^3"),
    "acceleration": ("m/s^2", "-9.80665 m/s^2"),
    "stiffness": ("N/m", "50 kN/mm"),
    "temperature_difference": ("K", "60 K"),
    "temperature": ("K", "95 degC"),
    "torque": ("N*m", "100 N*m"),
    "strain": ("m/m", "0.94 mm/m"),
}

_NUMBER = re.compile(r"^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")
# Offset temperature units read as a difference where a difference is meant.
# (Any other offset unit pint knows is read the same way in unit_factor; note
# that pint's 'degR' is the Rankine scale, which has no offset.)
_AS_DIFFERENCE = {
    "degc": "delta_degC", "degf": "delta_degF", "celsius": "delta_degC",
    "fahrenheit": "delta_degF", "°c": "delta_degC", "°f": "delta_degF",
    "degree_celsius": "delta_degC", "degree_fahrenheit": "delta_degF",
}


@functools.lru_cache(maxsize=1)
def _registry():
    import pint

    folder = _cache_folder()
    if folder is not None:  # pint keeps its parsed definitions there (its own cache)
        try:
            return pint.UnitRegistry(autoconvert_offset_to_baseunit=True,
                                     cache_folder=str(folder / "pint"))
        except Exception:  # pragma: no cover - an unusable cache folder: parse afresh
            pass
    return pint.UnitRegistry(autoconvert_offset_to_baseunit=True)


# --- the unit table kept between runs ---------------------------------------
# Each unit text pint has read, with its SI scale, offset and base dimensions, is
# kept as JSON in the user's cache folder (AXIALFE_CACHE_DIR, else
# $XDG_CACHE_HOME/axialfe or ~/.cache/axialfe; an empty AXIALFE_CACHE_DIR turns it
# off), under the version of pint that read it.  A model whose units are all in
# the table is read without starting pint.  The table is data only (numbers and
# names, checked when read); anything unreadable in it is ignored.
_TABLE: dict | None = None


def _cache_folder():
    import os
    from pathlib import Path

    folder = os.environ.get("AXIALFE_CACHE_DIR")
    if folder is None:
        base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
        folder = os.path.join(base, "axialfe")
    return Path(folder) if folder else None


def _table_file():
    folder = _cache_folder()
    if folder is None:
        return None
    try:
        from importlib.metadata import version

        return folder / f"units-pint-{version('pint')}.json"
    except Exception:  # pragma: no cover - pint's metadata missing
        return None


def _dims(items):
    """Base dimensions as a sorted tuple of (name, exponent): hashable and comparable."""
    return tuple(sorted((str(k), int(v) if float(v).is_integer() else float(v))
                        for k, v in dict(items).items()))


def _table() -> dict:
    global _TABLE
    if _TABLE is None:
        _TABLE = {"units": {}, "kinds": {}}
        path = _table_file()
        try:
            import json

            data = json.loads(path.read_text(encoding="utf-8"))
            units = {str(u): (float(a), float(b), _dims(d))
                     for u, (a, b, d) in data["units"].items()}
            kinds = {str(k): _dims(d) for k, d in data["kinds"].items()}
            if set(kinds) == set(KINDS):
                _TABLE = {"units": units, "kinds": kinds}
        except Exception:  # no table yet, or one that cannot be read: start afresh
            pass
    return _TABLE


def _remember(unit: str, entry) -> None:
    table = _table()
    table["units"][unit] = entry
    if not table["kinds"]:
        table["kinds"] = {k: _dims(_registry().parse_units(ref).dimensionality)
                          for k, (ref, _) in KINDS.items()}
    path = _table_file()
    if path is None:
        return
    try:
        import json
        import os
        import tempfile

        path.parent.mkdir(parents=True, exist_ok=True)
        text = json.dumps({"units": {u: [a, b, dict(d)] for u, (a, b, d) in table["units"].items()},
                           "kinds": {k: dict(d) for k, d in table["kinds"].items()}})
        fd, tmp = tempfile.mkstemp(dir=path.parent, suffix=".tmp")
        with os.fdopen(fd, "w", encoding="utf-8") as out:
            out.write(text)
        os.replace(tmp, path)
    except OSError:  # a read-only home: the table stays in memory
        pass


@functools.lru_cache(maxsize=None)
def _dimensionality(kind: str):
    kinds = _table()["kinds"]
    if kind in kinds:
        return kinds[kind]
    return _dims(_registry().parse_units(KINDS[kind][0]).dimensionality)


# Limits on a unit's text, checked before pint sees it: pint evaluates exponents, so a
# power tower ('mm^9^9^9') would run for hours.
MAX_UNIT_LENGTH = 100
MAX_UNIT_EXPONENT = 12
_POWER = re.compile(r"\^|\*\*")
_EXPONENT = re.compile(r"\s*\(?\s*([+-]?\s*(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*\)?")


def check_unit_text(unit: str) -> None:
    """Refuse a unit text that is too long, or whose exponents are not small plain numbers.

    Every exponent must be a number of magnitude at most :data:`MAX_UNIT_EXPONENT`,
    and nothing raised to a power may be raised again (no ``a^2^3``, no
    ``(a^2)^3``): the size of the result is then bounded before it is computed.
    """
    if len(unit) > MAX_UNIT_LENGTH:
        raise UnitError(f"unit '{unit[:20]}...' is longer than {MAX_UNIT_LENGTH} characters")
    depth_power = [False]  # per parenthesis level: does it contain a power already?
    i, n = 0, len(unit)
    last_powered = False   # the operand just before is itself a power
    while i < n:
        ch = unit[i]
        m = _POWER.match(unit, i)
        if m:
            e = _EXPONENT.match(unit, m.end())
            if not e:
                raise UnitError(f"unit '{unit}': an exponent must be a plain number")
            value = float(e.group(1).replace(" ", ""))
            if abs(value) > MAX_UNIT_EXPONENT:
                raise UnitError(f"unit '{unit}': exponent {e.group(1).strip()} is out of range "
                                f"(at most {MAX_UNIT_EXPONENT} in size)")
            if last_powered:
                raise UnitError(f"unit '{unit}': a power of a power is not accepted; write "
                                "one exponent")
            depth_power[-1] = True
            last_powered = True
            i = e.end()
            continue
        if ch == "(":
            depth_power.append(False)
        elif ch == ")":
            inner = depth_power.pop() if len(depth_power) > 1 else False
            last_powered = inner
            i += 1
            continue
        if not ch.isspace():
            last_powered = False
        i += 1


@functools.lru_cache(maxsize=4096)
def _parse_unit(unit: str):
    """Return (scale, offset, dimensions) taking ``unit`` to SI base units."""
    known = _table()["units"].get(unit)
    if known is not None:
        return known
    import pint

    check_unit_text(unit)
    ureg = _registry()
    text = unit.strip()
    if text.startswith("/"):
        text = "1" + text
    try:
        parsed = ureg.parse_units(text)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, ValueError,
            AttributeError, TypeError, SyntaxError) as exc:
        raise UnitError(f"unknown unit '{unit}'") from exc
    except Exception as exc:  # pint raises a few more kinds on odd input
        raise UnitError(f"cannot read unit '{unit}'") from exc
    zero = ureg.Quantity(0.0, parsed).to_base_units()
    one = ureg.Quantity(1.0, parsed).to_base_units()
    entry = (float(one.magnitude - zero.magnitude), float(zero.magnitude),
             _dims(parsed.dimensionality))
    _remember(unit, entry)
    return entry


def _kind_of(dim) -> str | None:
    """Name the kind(s) of value a dimensionality belongs to, for error messages."""
    names = [k for k in KINDS if k != "temperature_difference" and _dimensionality(k) == dim]
    return " or ".join(n.replace("_", " ") for n in names) or None


def describe(kind: str) -> str:
    """Return ``"length, e.g. '40 mm'"`` for error messages."""
    return f"{kind.replace('_', ' ')}, e.g. '{KINDS[kind][1]}'"


def _a(kind: str) -> str:
    """Return ``"a length, e.g. '40 mm'"`` or ``"an area, ..."``."""
    return ("an " if kind[0] in "aeiou" else "a ") + describe(kind)


def _check_dimension(unit: str, dim, kind: str):
    if dim != _dimensionality(kind):
        found = _kind_of(dim)
        if found:
            raise UnitError(f"'{unit}' is a unit of {found}, not of {describe(kind)}")
        raise UnitError(f"'{unit}' is not a unit of {describe(kind)}")


def unit_factor(unit: str, kind: str) -> float:
    """Return the factor that takes a value in ``unit`` to SI base units.

    Raises
    ------
    UnitError
        When the unit is unknown, offset (like degC) or not of ``kind``.
    """
    found = _FACTORS.get((unit, kind))   # a unit of a kind asked once is known
    if found is None:
        found = _FACTORS[unit, kind] = _unit_factor(unit, kind)
    return found


_FACTORS: dict = {}


def _unit_factor(unit: str, kind: str) -> float:
    if kind == "temperature_difference" and unit.strip().lower() in _AS_DIFFERENCE:
        unit = _AS_DIFFERENCE[unit.strip().lower()]
    scale, offset, dim = _parse_unit(unit)
    _check_dimension(unit, dim, kind)
    if offset != 0.0 and kind == "temperature_difference":
        return scale  # a change of that many degrees
    if offset != 0.0:
        raise UnitError(f"'{unit}' is an offset unit; use a difference unit such as 'K'")
    return scale


def parse_quantity(value, kind: str) -> float:
    """Convert a model value such as ``"40 mm"`` to a float in SI base units.

    Parameters
    ----------
    value : str
        A number followed by its unit.  A bare number is refused: the unit is
        the engineer's statement of what the number means.
    kind : str
        One of :data:`KINDS`.  For ``temperature_difference`` an offset unit
        (``"60 degC"``) is read as a change of that many degrees; for
        ``temperature`` it is an absolute temperature, returned in kelvin.

    Examples
    --------
    >>> parse_quantity("0.25 in", "length")  # 0.25 * 25.4 mm
    0.00635
    >>> parse_quantity("95 degC", "temperature") - parse_quantity("20 degC", "temperature")
    75.0
    """
    if isinstance(value, bool) or not isinstance(value, (str, int, float)):
        raise UnitError(f"expected {_a(kind)}: got {value!r}")
    if not isinstance(value, str):
        raise UnitError(f"a bare number needs a unit: give {_a(kind)}")
    match = _NUMBER.match(value)
    if match is None:
        raise UnitError(f"expected a number with a unit, {_a(kind)}: got '{value}'")
    number, unit = float(match.group(1)), match.group(2)
    if not unit:
        raise UnitError(f"'{value}' has no unit: give {_a(kind)}")
    if not math.isfinite(number):
        raise UnitError(f"'{value}' is not a finite number")
    if kind == "temperature":
        scale, offset, dim = _parse_unit(unit)
        _check_dimension(unit, dim, kind)
        if unit.strip().lower().startswith("delta"):
            raise UnitError(f"'{value}' is a temperature difference; an absolute temperature is expected here")
        kelvin = float(_registry().Quantity(number, unit).to("kelvin").magnitude)
        if kelvin < 0:
            raise UnitError(f"'{value}' lies below absolute zero")
        return kelvin
    return number * unit_factor(unit, kind)


# --- helpers of the expression parser (axialfe.expressions) -----------------
def unit_base(unit: str, difference: bool = False) -> tuple[float, dict[str, float]]:
    """Return (scale, dimensions) of one unit name in SI base units.

    ``dimensions`` maps pint's base dimensions (``'[length]'``, ...) to their
    exponents.  With ``difference`` an offset temperature unit (degC) is read
    as a difference of that many degrees; otherwise offset units are refused.

    Examples
    --------
    >>> scale, dims = unit_base("kN")
    >>> scale, sorted(dims.items())
    (1000.0, [('[length]', 1), ('[mass]', 1), ('[time]', -2)])
    """
    if difference and unit.strip().lower() in _AS_DIFFERENCE:
        unit = _AS_DIFFERENCE[unit.strip().lower()]
    scale, offset, dim = _parse_unit(unit)
    if offset != 0.0:
        raise UnitError(f"'{unit}' is an offset unit; use a difference unit such as 'K'")
    return scale, dict(dim)


def kind_dimensions(kind: str) -> dict[str, float]:
    """Return the base dimensions of one of :data:`KINDS` as a plain dict."""
    return dict(_dimensionality(kind))


def split_quantity(text: str) -> tuple[str, str] | None:
    """Split ``"18 kN"`` into ``("18", "kN")``; None when it does not start with a number."""
    match = _NUMBER.match(text)
    return (match.group(1), match.group(2)) if match else None


def to_unit(value, unit: str, kind: str):
    """Convert SI value(s) to ``unit`` (a float or a numpy array)."""
    return value / unit_factor(unit, kind)


_SYSTEMS = {
    "SI": {"force": "N", "length": "mm", "displacement": "mm", "stress": "MPa", "temperature": "K"},
    "US": {"force": "lbf", "length": "in", "displacement": "in", "stress": "psi",
           "temperature": "degF"},
}
# the units of a temperature change in output, and their size in kelvin
TEMPERATURE_UNITS = {"K": 1.0, "degF": 5.0 / 9.0}
_KIND_OF = {"force": "force", "length": "length", "displacement": "length", "stress": "stress"}
_KNOWN = {key: {system[key] for system in _SYSTEMS.values()} for key in _KIND_OF}


@dataclass(frozen=True)
class OutputUnits:
    """The units results are reported in.

    Parameters
    ----------
    force, length, displacement, stress : str
        Unit names that pint understands; each is checked for its dimension.
    temperature : {'K', 'degF'}
        The unit of temperature changes (a difference: 1 degF = 5/9 K).
    """

    force: str = "N"
    length: str = "mm"
    displacement: str = "mm"
    stress: str = "MPa"
    temperature: str = "K"

    def __post_init__(self):
        if self.temperature not in TEMPERATURE_UNITS:
            raise UnitError(f"a temperature change is shown in K or degF: got '{self.temperature}'",
                            options=tuple(TEMPERATURE_UNITS))
        for key, kind in _KIND_OF.items():
            # the units of the two systems are known good: checking them would start
            # pint for every model built in code
            if getattr(self, key) not in _KNOWN[key]:
                unit_factor(getattr(self, key), kind)

    @classmethod
    def system(cls, name: str = "SI", **overrides) -> "OutputUnits":
        """Return the units of system ``"SI"`` or ``"US"`` with any overrides."""
        if name not in _SYSTEMS:
            raise UnitError(f"unknown unit system '{name}'", options=tuple(_SYSTEMS))
        return cls(**{**_SYSTEMS[name], **{k: v for k, v in overrides.items() if v}})

    def factor(self, key: str) -> float:
        """Return the SI value of one ``key`` unit (``force``, ``length``, ..., ``temperature``:
        the size of its degree in kelvin)."""
        found = self._factors.get(key)
        if found is None:
            found = self._factors[key] = (
                TEMPERATURE_UNITS[self.temperature] if key == "temperature"
                else unit_factor(getattr(self, key), _KIND_OF[key]))
        return found

    @functools.cached_property
    def _factors(self) -> dict:
        """The factors asked for so far (a table writes thousands of values in few units)."""
        return {}

    def as_dict(self) -> dict[str, str]:
        return {**{k: getattr(self, k) for k in _KIND_OF}, "temperature": self.temperature}


def temperature_to_kelvin(value: float, unit: str) -> float:
    """An absolute temperature in ``unit`` (degC, degF, K, ...) in kelvin."""
    return float(_registry().Quantity(value, unit).to("kelvin").magnitude)


def kelvin_to_temperature(value, unit: str):
    """Absolute temperature(s) in kelvin expressed in ``unit``."""
    import numpy as np

    q = _registry().Quantity(np.asarray(value, dtype=float), "kelvin").to(unit)
    return q.magnitude


def number_and_unit(text: str) -> tuple[float, str]:
    """Split ``"-40 K"`` into (-40.0, 'K'); the unit may be empty."""
    match = _NUMBER.match(text)
    if match is None:
        raise UnitError(f"expected a number with a unit: got '{text}'")
    return float(match.group(1)), match.group(2)
