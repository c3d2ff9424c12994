"""ISO 286 limits of size: IT grades, fundamental deviations and fit designations.

Data only, and the look-ups over it.  A designation such as ``"50 H7/p6"`` names
the nominal size in mm, the hole's tolerance class (hole basis: H only) and the
shaft's; :func:`fit_limits` returns the limits of bore and shaft.

Sources.  ISO 286-1:2010, *Geometrical product specifications (GPS) - ISO code
system for tolerances on linear sizes - Part 1: Basis of tolerances, deviations
and fits*, Table 1 (standard tolerance grades IT) and Tables 2 and 3
(fundamental deviations of shafts); ISO 286-2:2010 (tables of limit deviations
of the tolerance classes built from them).  **Every value below is from
memory** of those tables.  The tests cross-check them against the standard's
own formulae (IT5 = 7i, IT6 = 10i, IT7 = 16i, ... with the tolerance factor
i = 0.45 D^(1/3) + 0.001 D; the fundamental deviations f = -5.5 D^0.41,
g = -2.5 D^0.34, k = +0.6 D^(1/3), m = IT7 - IT6, n = +5 D^0.34, p = IT7 + 0 to 5,
r = the geometric mean of p and s, s = IT7 + 0.4 D above 50 mm, u = IT7 + D;
D the geometric mean of the range's bounds, in mm; formulae from memory), and
the limits of a handful of designations against the ISO 286-2 tables.
Verify limits that matter against the standard itself.

Size ranges are "above a, up to and including b" (a nominal size of 10 mm lies
in the range above 6 up to 10, not in the one above 10): each table below is a
tuple of (b, value) pairs, the upper bounds b rising.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ..errors import ModelError, suggest

__all__ = ["GRADES", "SHAFT_LETTERS", "HOLE_LETTERS", "IsoFit", "tolerance", "shaft_deviations",
           "hole_deviations", "fit_limits", "parse_designation"]

MAX_SIZE = 500.0  # mm: the tables here cover nominal sizes up to 500 mm

# --- ISO 286-1 Table 1: standard tolerance grades, in micrometres (from memory) ----------
# main size ranges, upper bounds in mm ("above the previous bound, up to and including")
_MAIN = (3, 6, 10, 18, 30, 50, 80, 120, 180, 250, 315, 400, 500)
_IT = {
    5: (4, 5, 6, 8, 9, 11, 13, 15, 18, 20, 23, 25, 27),
    6: (6, 8, 9, 11, 13, 16, 19, 22, 25, 29, 32, 36, 40),
    7: (10, 12, 15, 18, 21, 25, 30, 35, 40, 46, 52, 57, 63),
    8: (14, 18, 22, 27, 33, 39, 46, 54, 63, 72, 81, 89, 97),
    9: (25, 30, 36, 43, 52, 62, 74, 87, 100, 115, 130, 140, 155),
    10: (40, 48, 58, 70, 84, 100, 120, 140, 160, 185, 210, 230, 250),
    11: (60, 75, 90, 110, 130, 160, 190, 220, 250, 290, 320, 360, 400),
}
GRADES = tuple(_IT)


def _main(values):
    return tuple(zip(_MAIN, values))


# --- ISO 286-1 Tables 2 and 3: fundamental deviations of shafts, micrometres (from memory) --
# f, g: upper deviation es (negative); k to u: lower deviation ei (positive)
_UPPER = {
    "f": _main((-6, -10, -13, -16, -20, -25, -30, -36, -43, -50, -56, -62, -68)),
    "g": _main((-2, -4, -5, -6, -7, -9, -10, -12, -14, -15, -17, -18, -20)),
    "h": _main((0,) * 13),
}
# k: ei for grades IT4 to IT7; for IT3 and finer and for IT8 and coarser ei = 0
_K_IT4_TO_IT7 = _main((0, 1, 1, 1, 2, 2, 2, 3, 3, 4, 4, 4, 5))
# r, s and u have finer sub-ranges: r and s above 50 mm, u above 18 mm
_SUB_50 = (65, 80, 100, 120, 140, 160, 180, 200, 225, 250, 280, 315, 355, 400, 450, 500)
_LOWER = {
    "m": _main((2, 4, 6, 7, 8, 9, 11, 13, 15, 17, 20, 21, 23)),
    "n": _main((4, 8, 10, 12, 15, 17, 20, 23, 27, 31, 34, 37, 40)),
    "p": _main((6, 12, 15, 18, 22, 26, 32, 37, 43, 50, 56, 62, 68)),
    "r": tuple(zip((3, 6, 10, 18, 30, 50) + _SUB_50,
                   (10, 15, 19, 23, 28, 34, 41, 43, 51, 54, 63, 65, 68, 77, 80, 84, 94, 98, 108,
                    114, 126, 132))),
    "s": tuple(zip((3, 6, 10, 18, 30, 50) + _SUB_50,
                   (14, 19, 23, 28, 35, 43, 53, 59, 71, 79, 92, 100, 108, 122, 130, 140, 158, 170,
                    190, 208, 232, 252))),
    "u": tuple(zip((3, 6, 10, 18, 24, 30, 40, 50) + _SUB_50,
                   (18, 23, 28, 33, 41, 48, 60, 70, 87, 102, 124, 144, 170, 190, 210, 236, 258,
                    284, 315, 350, 390, 435, 490, 540))),
}
SHAFT_LETTERS = ("f", "g", "h", "js", "k", "m", "n", "p", "r", "s", "u")
HOLE_LETTERS = ("H",)


def _lookup(table, size: float) -> int:
    """The value of the range that holds ``size`` (above the previous bound, up to and
    including this one)."""
    for bound, value in table:
        if size <= bound:
            return value
    raise ValueError(size)  # callers check the size first


def _check(size: float, grade: int):
    if not (0 < size <= MAX_SIZE):
        raise ModelError(f"ISO 286 limits are tabulated here for nominal sizes above 0 up to "
                         f"{MAX_SIZE:g} mm: got {size:g} mm")
    if grade not in _IT:
        raise ModelError(f"tolerance grade IT{grade} is not tabulated here",
                         options=[f"IT{g}" for g in GRADES])


def tolerance(size: float, grade: int) -> int:
    """The standard tolerance ITn in micrometres (ISO 286-1, Table 1).

    Parameters
    ----------
    size : float
        Nominal size in mm, above 0 up to 500.
    grade : int
        The grade n of ITn, 5 to 11.

    Examples
    --------
    >>> tolerance(50, 7), tolerance(10, 8), tolerance(10.5, 8)   # 10 lies in "above 6 up to 10"
    (25, 22, 27)
    """
    _check(size, grade)
    return _lookup(_main(_IT[grade]), size)


def shaft_deviations(letter: str, grade: int, size: float) -> tuple[float, float]:
    """The (lower, upper) limit deviations of a shaft in micrometres.

    The fundamental deviation comes from ISO 286-1 Tables 2 and 3 (the upper
    deviation es for f, g, h; the lower ei for k to u); the other deviation is
    that one plus or minus ITn.  js is symmetric, +-ITn/2; for js7 to js11 an
    odd ITn is first rounded down to the even number below, as ISO 286-1 does
    so that the deviations are whole micrometres (from memory).

    Examples
    --------
    25 p6: ei = +22 um, IT6 = 13 um (ISO 286-2: 25 p6 is +22/+35).

    >>> shaft_deviations("p", 6, 25)
    (22, 35)
    """
    if letter not in SHAFT_LETTERS:
        raise ModelError(f"shaft tolerance position '{letter}' is not tabulated here",
                         hint=suggest(letter, SHAFT_LETTERS), options=SHAFT_LETTERS)
    it = tolerance(size, grade)
    if letter == "js":
        half = (it - it % 2 if 7 <= grade <= 11 else it) / 2
        return (-half, half)
    if letter in _UPPER:
        es = _lookup(_UPPER[letter], size)
        return (es - it, es)
    if letter == "k":
        ei = _lookup(_K_IT4_TO_IT7, size) if 4 <= grade <= 7 else 0
    else:
        ei = _lookup(_LOWER[letter], size)
    return (ei, ei + it)


def hole_deviations(letter: str, grade: int, size: float) -> tuple[int, int]:
    """The (lower, upper) limit deviations of a hole in micrometres: H has EI = 0, ES = ITn.

    >>> hole_deviations("H", 7, 50)
    (0, 25)
    """
    if letter not in HOLE_LETTERS:
        raise ModelError(f"hole tolerance position '{letter}' is not tabulated here (hole-basis "
                         "fits only)", options=HOLE_LETTERS)
    return (0, tolerance(size, grade))


_DESIGNATION = re.compile(r"^\s*(\d+(?:\.\d+)?)\s*(?:mm)?\s*([A-Za-z]+)\s*(\d+)\s*/\s*"
                          r"([A-Za-z]+)\s*(\d+)\s*$")


def parse_designation(text: str) -> tuple[float, str, int, str, int]:
    """Split ``"50 H7/p6"`` into (50.0, 'H', 7, 'p', 6); the size is in mm.

    Raises
    ------
    ModelError
        When the text is not of that form.
    """
    m = _DESIGNATION.match(text) if isinstance(text, str) else None
    if m is None:
        raise ModelError(f"expected a fit designation such as '50 H7/p6' (size in mm, hole "
                         f"class, shaft class): got {text!r}")
    return float(m.group(1)), m.group(2), int(m.group(3)), m.group(4), int(m.group(5))


@dataclass(frozen=True)
class IsoFit:
    """The limits of one ISO 286 fit, in metres.

    Attributes
    ----------
    designation : str
        As written, e.g. ``"50 H7/p6"``.
    size : float
        The nominal size (m).
    bore, shaft : tuple of float
        (least, greatest) diameter of the hole and of the shaft (m).
    hole_deviations, shaft_deviations : tuple of float
        (lower, upper) deviations in micrometres.
    """

    designation: str
    size: float
    bore: tuple[float, float]
    shaft: tuple[float, float]
    hole_deviations: tuple[float, float]
    shaft_deviations: tuple[float, float]

    @property
    def interference(self) -> tuple[float, float]:
        """(least, greatest) diametral interference (m); negative is a clearance."""
        (lo_h, hi_h), (lo_s, hi_s) = self.hole_deviations, self.shaft_deviations
        return ((lo_s - hi_h) * 1e-6, (hi_s - lo_h) * 1e-6)


def fit_limits(designation: str) -> IsoFit:
    """The limits of bore and shaft of an ISO 286 hole-basis fit.

    Examples
    --------
    50 H7/p6 (ISO 286-2: H7 is 0/+25 um, p6 +26/+42 um at 50 mm): interference
    from 1 um to 42 um.

    >>> fit = fit_limits("50 H7/p6")
    >>> [round(x * 1e6, 3) for x in fit.interference]
    [1.0, 42.0]
    """
    size, hole, hole_grade, shaft, shaft_grade = parse_designation(designation)
    lo_h, hi_h = hole_deviations(hole, hole_grade, size)
    lo_s, hi_s = shaft_deviations(shaft, shaft_grade, size)
    d = size * 1e-3
    return IsoFit(designation.strip(), d, (d + lo_h * 1e-6, d + hi_h * 1e-6),
                  (d + lo_s * 1e-6, d + hi_s * 1e-6), (lo_h, hi_h), (lo_s, hi_s))
