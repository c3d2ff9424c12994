"""The two-node bar element: stiffness, load integrals, end forces and nodal loads.

In the element's own coordinate s, from its ``from`` station (s = 0) to its
``to`` station (s = L), with ``t = s/L``, the axial force is

    N(s) = N_from - Q(s),   Q(s) = q*s + rho*g*V(s),

``q`` the distributed load per length and ``V(s)`` the volume from the ``from``
end, both along the element's own direction.  Compatibility gives

    N_from = k*(du - delta0) + k*G,   N_to = N_from - W,

with ``du`` the change of length, ``delta0 = alpha*dT*L + misfit`` the free
change of length, ``k = 1/integral(ds/(E*A))``, ``G = integral(Q/(E*A) ds)``
and ``W = Q(L)`` (Gere and Goodno, Mechanics of Materials, bars with varying
loads and dimensions; from memory).

The arithmetic is written once and runs unchanged on numpy arrays (one entry
per segment) and on sympy scalars (the closed form).  The few operations that
must differ, the flexibility of a taper (a logarithm of a ratio, exactly, or
``log1p`` numerically) and the integral of a polynomial over the area (partial
fractions, or Gauss-Legendre quadrature), come from a backend:
:data:`~axialfe.mechanics.backends.NUMERIC` or
:func:`~axialfe.mechanics.backends.exact`.
"""

from __future__ import annotations

from dataclasses import dataclass

from .sections import area_coefficients

__all__ = ["ElementTerms", "element_terms", "force_coefficients", "end_forces", "load_terms",
           "nodal_loads"]


@dataclass(frozen=True)
class ElementTerms:
    """The load-independent terms of an element (scalars or arrays over segments).

    Attributes
    ----------
    stiffness : k = 1/integral(ds/(E*A))
    area_from, area_to : the area at each end
    g_unit_q : integral(s/(E*A) ds), the compatibility term of a unit load per length
    w_self, g_self : the total self-weight W along the element and its term G
    """

    stiffness: object
    area_from: object
    area_to: object
    g_unit_q: object
    w_self: object
    g_self: object


def _uniform(c, p1, q1, p2, q2, L, E, rho_g, bk):
    a = c * p1 * q1
    return (E * a / L, a, a, L**2 / (2 * E * a), rho_g * a * L, rho_g * L**2 / (2 * E))


def _taper(c, p1, q1, p2, q2, L, E, rho_g, bk):
    a0, a1, a2 = area_coefficients(1, p1, q1, p2, q2)
    k = E / bk.taper_flexibility(c, p1, q1, p2, q2, L)
    # integral(s/A ds) with s = L*t, and the volume V(t) = c*L*(a0*t + a1*t^2/2 + a2*t^3/3)
    g_unit_q = bk.area_integral((0, L), c, p1, q1, p2, q2, L) / E
    volume = (0, c * L * a0, c * L * a1 / 2, c * L * a2 / 3)
    w_self = rho_g * sum(volume)
    g_self = (0 * w_self if bk.is_zero(rho_g)
              else rho_g * bk.area_integral(volume, c, p1, q1, p2, q2, L) / E)
    return k, c * p1 * q1, c * p2 * q2, g_unit_q, w_self, g_self


def element_terms(c, p1, q1, p2, q2, L, E, rho_g, bk) -> ElementTerms:
    """Stiffness and load integrals of elements with area ``c*P(t)*Q(t)``.

    Parameters
    ----------
    c, p1, q1, p2, q2 : section factors at the ``from`` (1) and ``to`` (2) ends
        (see :func:`axialfe.mechanics.sections.factors`).
    L, E : length and elastic modulus.
    rho_g : density times the gravity component along the element's direction.
    bk : backend

    Examples
    --------
    A cone from 40 mm to 10 mm over 1 m has k = E*pi*d1*d2/(4*L) (Gere and
    Goodno, Mechanics of Materials, tapered bars; from memory):

    >>> import math
    >>> import numpy as np
    >>> from axialfe.mechanics.backends import NUMERIC
    >>> t = element_terms(math.pi / 4, np.array([0.04]), np.array([0.04]), np.array([0.01]),
    ...                   np.array([0.01]), np.array([1.0]), np.array([200e9]), np.array([0.0]), NUMERIC)
    >>> float(t.stiffness[0] / (200e9 * math.pi * 0.04 * 0.01 / 4))  # should be 1
    1.0
    """
    args = (c, p1, q1, p2, q2, L, E, rho_g)
    return ElementTerms(*bk.branch(bk.is_uniform(p1, q1, p2, q2), _uniform, _taper, args))


def force_coefficients(n_from, q, rho_g, c, p1, q1, p2, q2, L):
    """Coefficients ``(f0, f1, f2, f3)`` of ``N(t) = f0 + f1*t + f2*t^2 + f3*t^3``.

    ``q`` and ``rho_g`` act along the element's own direction (from ``from`` to ``to``).
    """
    a0, a1, a2 = area_coefficients(1, p1, q1, p2, q2)
    w = rho_g * c * L
    return n_from, -q * L - w * a0, -w * a1 / 2, -w * a2 / 3


def end_forces(terms: ElementTerms, du, delta0, G, W):
    """``(N_from, N_to)`` from the change of length ``du`` and the load terms."""
    n_from = terms.stiffness * (du - delta0) + terms.stiffness * G
    return n_from, n_from - W


def load_terms(terms: ElementTerms, q, dT, alpha, L, misfit):
    """``(delta0, G, W)`` of a load state: free change of length, its G and its total load."""
    delta0 = alpha * dT * L + misfit
    return delta0, q * terms.g_unit_q + terms.g_self, q * L + terms.w_self


def nodal_loads(terms: ElementTerms, delta0, G, W):
    """Equivalent end forces ``(f_from, f_to)`` along the element's direction.

    They are the forces that hold the element with both ends fixed, reversed:
    ``f_from = -k*delta0 + k*G`` and ``f_to = k*delta0 + W - k*G``.
    """
    k = terms.stiffness
    kd, kG = k * delta0, k * G
    return kG - kd, kd + W - kG
