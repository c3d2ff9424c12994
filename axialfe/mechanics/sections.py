"""Section factors: the area as a product of two linear functions along a taper.

A section's area is written ``A = c*p*q``: for a round bar ``p = q = d`` and
``c = pi/4``; for a tube ``p = D - d``, ``q = D + d`` (so ``c*p*q`` is the ring
area); for a rectangle ``p, q = width, height``; for a plain area ``p = A``,
``q = 1``.  Along a taper both ``p`` and ``q`` vary linearly with the distance
from the segment's ``from`` end, so ``A(t)`` is quadratic in ``t = s/L``.

The functions take a shape name and a mapping of its sizes, and a value of pi,
so that they serve floats, numpy arrays and sympy scalars alike.
"""

from __future__ import annotations

__all__ = ["SHAPES", "REQUIRED", "factors", "second_moment", "area_coefficients"]

SHAPES = ("round", "tube", "rectangle", "area")
REQUIRED = {"round": ("diameter",), "tube": ("outer_diameter", "inner_diameter"),
            "rectangle": ("width", "height"), "area": ("area",)}


def factors(shape: str, dims, pi):
    """Return ``(c, p, q)`` with ``A = c*p*q`` for a section of ``shape``.

    Examples
    --------
    >>> import math
    >>> c, p, q = factors("tube", {"outer_diameter": 0.05, "inner_diameter": 0.04}, math.pi)
    >>> round(c * p * q / (math.pi / 4 * (0.05**2 - 0.04**2)), 12)  # should be 1
    1.0
    """
    if shape == "round":
        return pi / 4, dims["diameter"], dims["diameter"]
    if shape == "tube":
        do, di = dims["outer_diameter"], dims["inner_diameter"]
        return pi / 4, do - di, do + di
    if shape == "rectangle":
        return 1, dims["width"], dims["height"]
    return 1, dims["area"], 1


def second_moment(shape: str, dims, pi):
    """The smaller principal second moment of area, or None when the shape gives none.

    Round ``pi*d^4/64``, tube ``pi*(D^4 - d^4)/64``, rectangle ``min(w*h^3, h*w^3)/12``
    (Roark's Formulas for Stress and Strain, table of section properties; common
    practice); a plain area has one only when ``second_moment`` is given.
    """
    if shape == "round":
        return pi * dims["diameter"] ** 4 / 64
    if shape == "tube":
        return pi * (dims["outer_diameter"] ** 4 - dims["inner_diameter"] ** 4) / 64
    if shape == "rectangle":
        w, h = dims["width"], dims["height"]
        return min(w * h**3, h * w**3) / 12
    return dims.get("second_moment")


def area_coefficients(c, p1, q1, p2, q2):
    """Coefficients ``(a0, a1, a2)`` of ``A(t) = c*(a0 + a1*t + a2*t^2)``, ``t = s/L``.

    Works elementwise on arrays.
    """
    dp, dq = p2 - p1, q2 - q1
    return p1 * q1, p1 * dq + q1 * dp, dp * dq
