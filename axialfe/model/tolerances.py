"""Toleranced input values: the string and table forms, read strictly into :class:`Tolerance`.

A toleranced value is written in the unit of its value:

- limits ``"0.20 mm +0.05/-0.03"`` (both deviations may have one sign, as ISO
  shaft limits do: ``"50 mm -0.025/-0.050"``);
- symmetric ``"0.20 mm ±0.02"`` (also ``+-0.02``);
- a table ``{ value = "0.20 mm", plus = "0.05 mm", minus = "0.03 mm",
  distribution = "uniform" }`` (``minus`` is the size of the deviation below);
- ``{ value = "0.20 mm", std = "0.01 mm" }``: a normal distribution of that
  standard deviation, its worst-case box at +-3 sigma.

The string forms are normal by default with the limits at +-3 sigma about
their midpoint (common practice).  A tolerance on an absolute temperature is a
difference.  Nothing is evaluated: each piece is matched by a regular
expression and converted by :func:`axialfe.units.parse_quantity`.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from ..errors import ModelError, suggest
from ..units import parse_quantity, split_quantity

__all__ = ["Tolerance", "Toleranced", "DISTRIBUTIONS", "TABLE_KEYS", "is_toleranced", "parse_tolerance"]

DISTRIBUTIONS = ("normal", "uniform")
TABLE_KEYS = ("value", "plus", "minus", "std", "distribution")
CUT = 6.0   # normal draws are cut at +-6 sigma (a mass of about 2e-9 outside)

_NUM = r"(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_LIMITS = re.compile(rf"^(?P<base>.*?\S)\s+(?P<up>[+-]\s*{_NUM})\s*/\s*(?P<low>[+-]\s*{_NUM})\s*$")
_SYMMETRIC = re.compile(r"^(?P<base>.*?)\s*(?:±|\+/-|\+-)\s*(?P<dev>.*?)\s*$")
_SIGN_SLASH = re.compile(rf"\s[+-]\s*{_NUM}\s*/\s*[+-]")


@dataclass(frozen=True)
class Tolerance:
    """One toleranced input, in SI units.

    Attributes
    ----------
    value : float
        The stated value (the basic size).
    lower, upper : float
        The limits: the worst-case box (for ``std`` given, value -+ 3 sigma).
    distribution : {'normal', 'uniform'}
    sigma : float
        The standard deviation: of the normal, or (upper - lower)/sqrt(12) of the uniform.
    kind : str
        The quantity kind (:data:`axialfe.units.KINDS`).
    unit : str
        The unit the value was written in (for display).
    """

    value: float
    lower: float
    upper: float
    distribution: str = "normal"
    sigma: float = 0.0
    kind: str = "length"
    unit: str = ""

    def __post_init__(self):
        for name in ("value", "lower", "upper", "sigma"):
            if not math.isfinite(getattr(self, name)):
                raise ModelError(f"the tolerance's {name} must be finite")
        if self.distribution not in DISTRIBUTIONS:
            raise ModelError(f"unknown distribution '{self.distribution}'",
                             hint=suggest(self.distribution, DISTRIBUTIONS), options=DISTRIBUTIONS)
        if not self.upper > self.lower:
            raise ModelError("the tolerance has no width: the upper limit must lie above the "
                             "lower one")
        if self.sigma <= 0:
            raise ModelError("the tolerance's standard deviation must be positive")

    @property
    def centre(self) -> float:
        """The midpoint of the limits: the centre of the distribution."""
        return 0.5 * (self.lower + self.upper)

    @property
    def nominal(self) -> float:
        """The value every other command uses: the stated value, or the midpoint where
        both deviations have one sign (the basic size lies outside its own limits)."""
        return self.value if self.lower <= self.value <= self.upper else self.centre

    @property
    def one_sided(self) -> bool:
        return not self.lower <= self.value <= self.upper

    @property
    def spread(self) -> tuple[float, float]:
        """The range draws can take: the limits of a uniform, +-6 sigma of a normal."""
        if self.distribution == "uniform":
            return self.lower, self.upper
        return self.centre - CUT * self.sigma, self.centre + CUT * self.sigma


@dataclass(frozen=True)
class Toleranced:
    """A toleranced input as a reader found it.

    Attributes
    ----------
    path : str
        Its name, e.g. ``'gaps.end-float.clearance'`` or ``'stations.cover'``.
    tolerance : Tolerance
    line : int or None
        Its line in the file.
    problem : str or None
        Why a study must refuse it (its draws could leave the key's physical
        range), or None.
    """

    path: str
    tolerance: Tolerance
    line: int | None = None
    problem: str | None = None


def is_toleranced(value) -> bool:
    """Whether a file value is written as a toleranced value (a table, or a string with
    ``±``, ``+-`` or a pair of signed deviations)."""
    if isinstance(value, dict):
        return "value" in value
    if not isinstance(value, str):
        return False
    return "±" in value or "+-" in value or "+/-" in value or bool(_SIGN_SLASH.search(value))


def _difference_kind(kind):
    return "temperature_difference" if kind == "temperature" else kind


def _deviation(number: float, unit: str, kind) -> float:
    """A deviation written in the unit of the value, in SI (a temperature's is a difference)."""
    if kind is None:
        return number
    if not unit:
        raise ModelError("the value needs a unit for its tolerance")
    return parse_quantity(f"{number!r} {unit}", _difference_kind(kind))


def _plain(text: str, kind):
    """The stated value of a string form: (SI value, unit as written)."""
    parts = split_quantity(text)
    if kind is None:
        if parts is None or parts[1]:
            raise ModelError(f"expected a plain number before the tolerance: got '{text}'")
        return float(parts[0]), ""
    return parse_quantity(text, kind), (parts[1] if parts else "")


def parse_tolerance(value, kind: str | None) -> Tolerance:
    """Read a toleranced value of quantity ``kind`` (None: dimensionless).

    Raises
    ------
    ModelError
        For a malformed tolerance (``'0.20 mm ±'``), deviations in the wrong
        order, no width, unknown table keys or distributions.

    Examples
    --------
    >>> t = parse_tolerance("0.20 mm +0.05/-0.03", "length")
    >>> round(t.lower * 1e3, 12), round(t.upper * 1e3, 12), t.distribution
    (0.17, 0.25, 'normal')
    >>> round(t.sigma * 1e3 * 6, 12)  # the limits lie at +-3 sigma about their midpoint
    0.08
    >>> round(parse_tolerance("50 mm -0.025/-0.050", "length").nominal, 12)  # the midpoint
    0.0499625
    """
    if isinstance(value, dict):
        return _table(value, kind)
    if not isinstance(value, str):
        raise ModelError(f"expected a toleranced value: got {value!r}")
    m = _LIMITS.match(value)
    if m:
        base, unit = _plain(m.group("base"), kind)
        up = float(m.group("up").replace(" ", ""))
        low = float(m.group("low").replace(" ", ""))
        if up <= low:
            raise ModelError(f"'{value}': the upper deviation comes first and must exceed the "
                             "lower one, e.g. '0.20 mm +0.05/-0.03'")
        return _limits(base, _deviation(up, unit, kind), _deviation(low, unit, kind),
                       "normal", None, kind, unit)
    m = _SYMMETRIC.match(value)
    if m is None:
        raise ModelError(f"'{value}' is not a toleranced value: write '0.20 mm +0.05/-0.03' "
                         "or '0.20 mm ±0.02'")
    dev_text = m.group("dev")
    if not dev_text:
        raise ModelError(f"'{value}': the tolerance needs its deviation after '±', e.g. "
                         "'0.20 mm ±0.02'")
    if not re.fullmatch(_NUM, dev_text):
        raise ModelError(f"'{value}': the deviation must be one positive number in the unit "
                         "of the value, e.g. '0.20 mm ±0.02'")
    base, unit = _plain(m.group("base"), kind)
    dev = float(dev_text)
    if dev == 0:
        raise ModelError(f"'{value}': the tolerance has no width")
    d = _deviation(dev, unit, kind)
    return _limits(base, d, -d, "normal", None, kind, unit)


def _limits(base, up, low, distribution, std, kind, unit) -> Tolerance:
    if std is not None:
        return Tolerance(base, base - 3 * std, base + 3 * std, "normal", std, kind or "", unit)
    lower, upper = base + low, base + up
    if not upper > lower:
        raise ModelError("the tolerance has no width")
    sigma = (upper - lower) / (6.0 if distribution == "normal" else math.sqrt(12.0))
    return Tolerance(base, lower, upper, distribution, sigma, kind or "", unit)


def _table(entry: dict, kind) -> Tolerance:
    for key in entry:
        if key not in TABLE_KEYS:
            raise ModelError(f"unknown key '{key}' in a toleranced value",
                             hint=suggest(str(key), TABLE_KEYS), options=TABLE_KEYS)
    if "value" not in entry:
        raise ModelError("a toleranced value needs 'value'")
    text = entry["value"]
    if kind is None:
        if isinstance(text, bool) or not isinstance(text, (int, float)):
            raise ModelError(f"value: expected a plain number: got {text!r}")
        base, unit = float(text), ""
    else:
        if not isinstance(text, str) or is_toleranced(text):
            raise ModelError(f"value: expected one value with its unit: got {text!r}")
        base, unit = _plain(text, kind)
    distribution = entry.get("distribution", "normal")
    if not isinstance(distribution, str) or distribution not in DISTRIBUTIONS:
        raise ModelError(f"unknown distribution {distribution!r}",
                         hint=suggest(str(distribution), DISTRIBUTIONS), options=DISTRIBUTIONS)

    def size(key):
        raw = entry[key]
        if kind is None:
            if isinstance(raw, bool) or not isinstance(raw, (int, float)):
                raise ModelError(f"{key}: expected a plain number: got {raw!r}")
            return float(raw)
        if not isinstance(raw, str):
            raise ModelError(f"{key}: expected a value with its unit, e.g. '0.05 mm': got {raw!r}")
        return parse_quantity(raw, _difference_kind(kind))

    if "std" in entry:
        if "plus" in entry or "minus" in entry:
            raise ModelError("give 'std', or 'plus' and 'minus', not both")
        if distribution != "normal":
            raise ModelError("'std' gives a normal distribution: leave 'distribution' out")
        std = size("std")
        if not std > 0:
            raise ModelError("std must be positive")
        return _limits(base, None, None, "normal", std, kind, unit)
    if "plus" not in entry or "minus" not in entry:
        raise ModelError("a toleranced value needs 'plus' and 'minus', or 'std'")
    up, below = size("plus"), size("minus")
    if not up + below > 0:
        raise ModelError("the tolerance has no width: the limit value + plus must exceed "
                         "value - minus")
    return _limits(base, up, -below, distribution, None, kind, unit)
