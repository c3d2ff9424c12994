"""Lamé's thick-walled cylinders for press and shrink fits: pure formulas.

Plane stress, linear-elastic, small strain, both parts of the same length
(the stress concentration at the hub's ends is not modelled).  Diameters are
used throughout: ``d`` the fit diameter, ``d_o`` the hub's outer diameter,
``d_i`` the shaft's inner diameter (0 for a solid shaft), ``delta`` the
diametral interference.  Stresses are positive in tension.  Every function is
plain arithmetic and works on floats and on numpy arrays alike.

Sources: Shigley's Mechanical Engineering Design (9th ed.), ch. 3, section
"Press and Shrink Fits", eq. (3-56), written here with diameters (the radial
interference is half the diametral one), and the general Lamé solution of the
section "Stresses in Pressurized Cylinders", eq. (3-49); Timoshenko, Strength
of Materials, Part II, the chapter on thick-walled cylinders.  Section and
equation numbers from memory.
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["cylinder_stresses", "contact_pressure", "hub_hoop_stress", "shaft_hoop_stress",
           "shaft_bore_hoop_stress", "equivalent_stress", "holding_force", "torque_capacity",
           "interference_change", "radial_displacement"]


def cylinder_stresses(r, r_i, r_o, p_i=0.0, p_o=0.0):
    """Hoop and radial stress at radius ``r`` of a thick cylinder under pressures.

    Parameters
    ----------
    r : float or array
        Radius at which the stresses are wanted, r_i <= r <= r_o.
    r_i, r_o : float
        Inner and outer radius (r_i may be 0 when p_i is 0: a solid cylinder).
    p_i, p_o : float
        Internal and external pressure (positive compresses the wall face).

    Returns
    -------
    (sigma_t, sigma_r) : tuple
        Hoop and radial stress, tension positive (Shigley, eq. 3-49).

    Examples
    --------
    The radial stress equals minus the pressure on each face:

    >>> st, sr = cylinder_stresses(0.02, 0.02, 0.04, p_i=10e6)
    >>> round(sr / 1e6, 9), round(st / 1e6, 6)   # hoop (r_o^2 + r_i^2)/(r_o^2 - r_i^2) * p_i
    (-10.0, 16.666667)
    """
    a, b = r_i * r_i, r_o * r_o
    c1 = (p_i * a - p_o * b) / (b - a)
    c2 = a * b * (p_i - p_o) / (b - a) / (r * r) if a > 0 else 0.0 * r
    return c1 + c2, c1 - c2


def radial_displacement(r, r_i, r_o, E, nu, p_i=0.0, p_o=0.0):
    """Radial displacement at radius ``r`` of a thick cylinder under pressures (plane stress).

    u = r / E * (sigma_t - nu * sigma_r), from Hooke's law and the hoop strain u / r.
    """
    st, sr = cylinder_stresses(r, r_i, r_o, p_i, p_o)
    return r / E * (st - nu * sr)


def contact_pressure(delta, d, d_o, E_o, nu_o, E_i, nu_i, d_i=0.0):
    """Contact pressure of a press or shrink fit (Shigley, eq. 3-56, diametral form).

    p = delta / { d [ (1/E_o) ((d_o^2 + d^2)/(d_o^2 - d^2) + nu_o)
                    + (1/E_i) ((d^2 + d_i^2)/(d^2 - d_i^2) - nu_i) ] }

    Parameters
    ----------
    delta : float or array
        Diametral interference (m); the formula is linear in it, and gives a
        negative number for a clearance (the caller decides what that means).
    d, d_o, d_i : float
        Fit diameter, hub outer diameter, shaft inner diameter (m).
    E_o, nu_o, E_i, nu_i : float
        Modulus (Pa) and Poisson's ratio of the hub (outer member) and of the
        shaft (inner member).

    Examples
    --------
    Same material, solid shaft: p = E delta (d_o^2 - d^2) / (2 d d_o^2).

    >>> p = contact_pressure(50e-6, 0.05, 0.1, 200e9, 0.3, 200e9, 0.3)
    >>> closed = 200e9 * 50e-6 * (0.1**2 - 0.05**2) / (2 * 0.05 * 0.1**2)
    >>> abs(p - closed) / closed < 1e-12   # should be True
    True
    """
    hub = ((d_o * d_o + d * d) / (d_o * d_o - d * d) + nu_o) / E_o
    shaft = ((d * d + d_i * d_i) / (d * d - d_i * d_i) - nu_i) / E_i
    return delta / (d * (hub + shaft))


def hub_hoop_stress(p, d, d_o):
    """Hoop stress at the hub's bore: p (d_o^2 + d^2) / (d_o^2 - d^2), its largest."""
    return p * (d_o * d_o + d * d) / (d_o * d_o - d * d)


def shaft_hoop_stress(p, d, d_i=0.0):
    """Hoop stress at the shaft's fit surface: -p (d^2 + d_i^2) / (d^2 - d_i^2)."""
    return -p * (d * d + d_i * d_i) / (d * d - d_i * d_i)


def shaft_bore_hoop_stress(p, d, d_i=0.0):
    """Hoop stress at a hollow shaft's bore, -2 p d^2 / (d^2 - d_i^2), where the radial
    stress is zero; for a solid shaft the stress at the centre, -p (the state is uniform)."""
    if np.ndim(d_i) == 0 and d_i == 0:
        return -p
    return np.where(np.equal(d_i, 0), -p, -2.0 * p * d * d / (d * d - d_i * d_i))


def equivalent_stress(sigma_t, sigma_r):
    """Von Mises equivalent stress of a plane state (hoop, radial; no axial stress).

    >>> equivalent_stress(-10.0, -10.0)   # equal biaxial compression
    10.0
    """
    return (sigma_t * sigma_t - sigma_t * sigma_r + sigma_r * sigma_r) ** 0.5


def holding_force(friction, p, d, length):
    """Axial force the fit holds before it slips: mu p pi d L."""
    return friction * p * math.pi * d * length


def torque_capacity(friction, p, d, length):
    """Torque the fit holds before it slips: mu p pi d^2 L / 2."""
    return friction * p * math.pi * d * d * length / 2.0


def interference_change(d, alpha_shaft, dT_shaft, alpha_hub, dT_hub):
    """Change of the diametral interference with temperature: (a_s dT_s - a_h dT_h) d.

    Free thermal growth of both parts at the fit diameter; the change of the
    radial stiffness with temperature is neglected.

    >>> round(interference_change(0.05, 17.8e-6, 100.0, 11.7e-6, 100.0) * 1e6, 6)  # um
    30.5
    """
    return (alpha_shaft * dT_shaft - alpha_hub * dT_hub) * d
