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

Every function takes floats or numpy arrays alike (a tolerance study evaluates
many joints at once); floats in, floats out.
"""

from __future__ import annotations

import math

import numpy as np

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
    return _plain(math.pi * modulus * d * tan / np.log(ratio))


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
        # the cone under the head, depth measured from the head (where the part starts
        # above mid-grip), and the cone under the nut, depth measured from the nut
        head, nut = np.less(a, mid), np.greater(b, mid)
        top1, bottom1 = a, np.minimum(b, mid)
        top2, bottom2 = grip - b, grip - np.maximum(a, mid)
        flex = (np.where(head, 1 / frustum_stiffness(E, d, D0 + 2 * top1 * tan,
                                                     np.where(head, bottom1 - top1, 1.0),
                                                     half_angle), 0.0)
                + np.where(nut, 1 / frustum_stiffness(E, d, D0 + 2 * top2 * tan,
                                                      np.where(nut, bottom2 - top2, 1.0),
                                                      half_angle), 0.0))
        flex_parts.append(_plain(flex))
        z = b
    return [_plain(1 / f) for f in flex_parts], _plain(1 / sum(flex_parts))


def _plain(value):
    """A float for a 0-d result, the array otherwise."""
    return float(value) if np.ndim(value) == 0 else value
