"""Column curves: the compressive strength of a column from its slenderness.

Pure functions of floats in SI units (Pa), one per curve, and
:func:`column_strength`, which picks one by its ``[checks] column_curve`` name.
Each gives a critical stress at most the yield strength f_y, so a capacity
stress * A never exceeds the squash load A * f_y.

- ``johnson``: Johnson's parabola sigma_cr = f_y - (f_y/(2 pi))^2 (KL/r)^2 / E
  below the tangency slenderness sqrt(2 pi^2 E / f_y), Euler's pi^2 E/(KL/r)^2
  above it (Shigley's Mechanical Engineering Design, 9th ed., sec. 4-13,
  intermediate-length columns with central loading; equation numbers from memory).
- ``en1993-a0`` ... ``en1993-d``: the reduction factor chi of EN 1993-1-1:2005,
  6.3.1.2, eq. (6.49), with the imperfection factors of Table 6.1.
- ``aisc360``: F_cr of ANSI/AISC 360-16, E3, eq. (E3-2) and (E3-3).

``euler-only`` is no column curve: the buckling check keeps Euler's load alone
for it (stocky members stay undecided).

Examples
--------
At the tangency slenderness Johnson's parabola meets Euler's curve at f_y / 2.

>>> import math
>>> E, fy = 200e9, 250e6
>>> t = johnson_tangency(E, fy)
>>> abs(johnson_stress(fy, E, t) - fy / 2) < 1e-6 * fy   # should be True
True
>>> round(en1993_reduction(1.0, IMPERFECTION["en1993-b"]), 4)
0.597
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = ["IMPERFECTION", "ColumnStrength", "euler_stress", "johnson_tangency",
           "johnson_stress", "en1993_reduction", "aisc360_stress", "column_strength",
           "CURVE_NAMES"]

# Imperfection factors alpha of the buckling curves (EN 1993-1-1:2005, Table 6.1).
IMPERFECTION = {"en1993-a0": 0.13, "en1993-a": 0.21, "en1993-b": 0.34, "en1993-c": 0.49,
                "en1993-d": 0.76}

# The names column_strength computes (the model's COLUMN_CURVES less 'euler-only').
CURVE_NAMES = ("johnson", *IMPERFECTION, "aisc360")


def euler_stress(elastic_modulus: float, slenderness: float) -> float:
    """Euler's critical stress pi^2 E / (KL/r)^2 (Pa)."""
    return math.pi ** 2 * elastic_modulus / slenderness ** 2


def johnson_tangency(elastic_modulus: float, yield_strength: float) -> float:
    """The slenderness sqrt(2 pi^2 E / f_y) where Johnson's parabola meets Euler's curve."""
    return math.sqrt(2 * math.pi ** 2 * elastic_modulus / yield_strength)


def johnson_stress(yield_strength: float, elastic_modulus: float, slenderness: float) -> float:
    """Johnson's parabola below the tangency slenderness, Euler's stress above it (Pa)."""
    if slenderness < johnson_tangency(elastic_modulus, yield_strength):
        return (yield_strength
                - (yield_strength * slenderness / (2 * math.pi)) ** 2 / elastic_modulus)
    return euler_stress(elastic_modulus, slenderness)


def en1993_reduction(relative_slenderness: float, imperfection: float) -> float:
    """The reduction factor chi = 1/(Phi + sqrt(Phi^2 - lambda^2)), at most 1.

    Phi = 0.5 [1 + alpha (lambda - 0.2) + lambda^2] (EN 1993-1-1:2005, eq. 6.49).
    """
    lam = relative_slenderness
    phi = 0.5 * (1 + imperfection * (lam - 0.2) + lam ** 2)
    return min(1.0, 1.0 / (phi + math.sqrt(phi ** 2 - lam ** 2)))


def aisc360_stress(yield_strength: float, elastic_stress: float) -> float:
    """F_cr = 0.658^(F_y/F_e) F_y for F_y/F_e <= 2.25, else 0.877 F_e (AISC 360-16, E3-2, E3-3)."""
    ratio = yield_strength / elastic_stress
    if ratio <= 2.25:
        return 0.658 ** ratio * yield_strength
    return 0.877 * elastic_stress


@dataclass(frozen=True)
class ColumnStrength:
    """The strength of a column on one curve.

    Attributes
    ----------
    curve : str
    stress : float
        The critical stress (Pa), at most f_y.
    reduction : float
        ``stress`` / f_y (chi for the EN 1993 curves).
    branch : str
        Which formula gave it: 'parabola' or 'Euler' (johnson), '6.49' (EN 1993),
        'E3-2' or 'E3-3' (AISC 360).
    relative_slenderness : float or None
        lambda = sqrt(A f_y / N_cr) for the EN 1993 curves, else None.
    """

    curve: str
    stress: float
    reduction: float
    branch: str
    relative_slenderness: float | None = None

    def __post_init__(self):
        if self.curve not in CURVE_NAMES:
            raise ValueError(f"unknown column curve {self.curve!r}")


def column_strength(curve: str, elastic_modulus: float, yield_strength: float,
                    slenderness: float) -> ColumnStrength:
    """The critical stress of a column of slenderness K*L/r on ``curve``.

    Parameters
    ----------
    curve : str
        One of :data:`CURVE_NAMES`.
    elastic_modulus, yield_strength : float
        E and f_y in Pa.
    slenderness : float
        K*L/r, positive.

    Returns
    -------
    ColumnStrength
    """
    E, fy = elastic_modulus, yield_strength
    sigma_e = euler_stress(E, slenderness)
    if curve == "johnson":
        branch = "parabola" if slenderness < johnson_tangency(E, fy) else "Euler"
        stress = johnson_stress(fy, E, slenderness)
        return ColumnStrength(curve, stress, stress / fy, branch)
    if curve in IMPERFECTION:
        lam = math.sqrt(fy / sigma_e)            # sqrt(A f_y / N_cr), eq. (6.50)
        chi = en1993_reduction(lam, IMPERFECTION[curve])
        return ColumnStrength(curve, chi * fy, chi, "6.49", lam)
    if curve == "aisc360":
        stress = aisc360_stress(fy, sigma_e)
        branch = "E3-2" if fy / sigma_e <= 2.25 else "E3-3"
        return ColumnStrength(curve, stress, stress / fy, branch)
    raise ValueError(f"unknown column curve {curve!r}")
