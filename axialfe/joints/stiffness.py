"""Stiffness of a bolted joint: the bolt, and the clamped parts by Shigley's frustum model.

All sizes in m, moduli in Pa, stiffnesses in N/m; references are to Shigley's
Mechanical Engineering Design, 10th ed., section 8-4 and 8-5 (equation numbers
from memory).

- Bolt (eq. 8-17): shank and threaded length in series,
  k_b = A_d*A_t*E/(A_d*l_t + A_t*l_d).
- Clamped parts (eq. 8-20, the stiffness of one frustum of a hollow cone):
  k = pi*E*d*tan(a) / ln[(2*t*tan(a) + D - d)*(D + d) / ((2*t*tan(a) + D + d)*(D - d))],
  with d the hole (bolt) diameter, D the smaller diameter of the frustum and t
  its thickness.  Two cones of half-angle a = 30 degrees start under the head and
  under the nut at the washer-face diameter 1.5*d and meet at mid-grip; each
  part's slice of a cone is one frustum with its own modulus, and all slices
  act in series.
"""

from __future__ import annotations

import math

__all__ = ["bolt_stiffness", "frustum_stiffness", "member_stiffness", "HALF_ANGLE",
           "WASHER_FACTOR", "METHOD"]

HALF_ANGLE = math.radians(30.0)
WASHER_FACTOR = 1.5
METHOD = ("frustum cones (Shigley, Mechanical Engineering Design, 10th ed., eq. 8-20): "
          "30 degree half-angle from a washer face of 1.5*d under head and nut, meeting at "
          "mid-grip, each part's slices in series")


def bolt_stiffness(shank_area, stress_area, modulus, shank_length, thread_length):
    """k_b = A_d*A_t*E/(A_d*l_t + A_t*l_d) (eq. 8-17).

    >>> round(bolt_stiffness(0.1963, 0.1599, 30e6, 0.25, 1.095) / 1e6, 2)  # Shigley Ex. 8-2
    3.69
    """
    return (shank_area * stress_area * modulus
            / (shank_area * thread_length + stress_area * shank_length))


def frustum_stiffness(modulus, d, D, t, half_angle=HALF_ANGLE):
    """Stiffness of one frustum of thickness t, smaller diameter D, hole d (eq. 8-20)."""
    tan = math.tan(half_angle)
    ratio = ((2 * t * tan + D - d) * (D + d)) / ((2 * t * tan + D + d) * (D - d))
    return math.pi * modulus * d * tan / math.log(ratio)


def member_stiffness(parts, d, washer=None, half_angle=HALF_ANGLE):
    """The stiffness of each clamped part and of the stack, by the two frustum cones.

    Parameters
    ----------
    parts : sequence of (modulus, thickness)
        From under the head to the nut (or into the tapped part, with its
        engaged share as thickness).
    d : float
        Bolt (hole) diameter.
    washer : float, optional
        The washer-face diameter where the cones start; default 1.5*d.

    Returns
    -------
    (k_parts, k_m) : (list of float, float)
        A part that straddles mid-grip is two slices in series; its stiffness is
        theirs together.

    Examples
    --------
    One steel part: the two equal cones of eq. 8-22,
    k_m = pi*E*d*tan(a) / (2*ln[(l*tan(a) + D - d)*(D + d)/((l*tan(a) + D + d)*(D - d))]).

    >>> import math
    >>> tan = math.tan(math.radians(30))
    >>> l, d, E = 0.04, 0.012, 200e9
    >>> exact = math.pi*E*d*tan / (2*math.log((l*tan + 0.5*d)*2.5*d/((l*tan + 2.5*d)*0.5*d)))
    >>> abs(member_stiffness([(E, l)], d)[1] / exact - 1) < 1e-12  # should be True
    True
    """
    D0 = WASHER_FACTOR * d if washer is None else washer
    tan = math.tan(half_angle)
    grip = sum(t for _, t in parts)
    mid = grip / 2
    flex_parts = []
    z = 0.0
    for E, t in parts:
        a, b = z, z + t
        flex = 0.0
        if a < mid:  # the cone under the head, depth measured from the head
            top, bottom = a, min(b, mid)
            flex += 1 / frustum_stiffness(E, d, D0 + 2 * top * tan, bottom - top, half_angle)
        if b > mid:  # the cone under the nut, depth measured from the nut
            top, bottom = grip - b, grip - max(a, mid)
            flex += 1 / frustum_stiffness(E, d, D0 + 2 * top * tan, bottom - top, half_angle)
        flex_parts.append(flex)
        z = b
    return [1 / f for f in flex_parts], 1 / sum(flex_parts)
