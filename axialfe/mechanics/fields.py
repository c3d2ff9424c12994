"""The fields inside segments: N(t), A(t), sigma(t), u(t) and the extremes of |sigma|.

Along a segment, ``t = s/L`` runs from 0 at its ``from`` station to 1 at its
``to`` station.  The axial force is a cubic in t (linear without self-weight on
a taper), the area a quadratic (constant for a prismatic segment), so the
stress ``N/A`` is rational and its extremes inside a segment are among the
roots of ``N'*A - N*A'``, a polynomial of degree at most four.  Everything is
vectorised over segments; the strength check, yield events of sweeps, the
diagrams and the report all read the fields from here.

Examples
--------
A round taper from 40 mm to 10 mm over 1 m, fixed at the wide end, under a
distributed load of -30 kN/m: N(s) = q*(L - s) and the stress peaks where the
diameter is twice the narrow end's, at s = 2L/3, with 10^8/pi Pa (Gere and
Goodno, Mechanics of Materials, nonuniform bars; the closed form
d/ds[(L - s)/d(s)^2] = 0 gives d = 2*d_narrow):

>>> import math
>>> import numpy as np
>>> f = Fields.of(n_from=np.array([-30e3]), q=np.array([-30e3]), rho_g=np.zeros(1),
...               c=math.pi / 4, p1=np.array([0.04]), q1=np.array([0.04]), p2=np.array([0.01]),
...               q2=np.array([0.01]), length=np.array([1.0]), modulus=np.array([200e9]))
>>> value, t = f.stress_peak()
>>> round(float(value[0] / (-1e8 / math.pi)), 12), round(float(t[0]), 12)  # should be 1, 2/3
(1.0, 0.666666666667)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .element import force_coefficients
from .sections import area_coefficients

__all__ = ["Fields"]

_GAUSS8 = np.polynomial.legendre.leggauss(8)


def _polyval(coeffs, t):
    """Evaluate polynomials (rows of ``coeffs``, lowest power first) at ``t``.

    ``t`` has shape (k,) (the same points for every row) or (m, k); the result (m, k).
    """
    t = np.asarray(t, dtype=float)
    out = coeffs[:, -1:] + 0 * t
    for j in range(coeffs.shape[1] - 2, -1, -1):
        out = out * t + coeffs[:, j:j + 1]
    return out


def _real_roots_in_unit(coeffs):
    """Real roots in (0, 1) of each row's polynomial; shape (m, degree), NaN where none."""
    m, width = coeffs.shape
    out = np.full((m, width - 1), np.nan)
    scale = np.abs(coeffs).max(axis=1)
    significant = np.abs(coeffs) > 1e-13 * scale[:, None]
    degree = np.where(significant.any(axis=1),
                      width - 1 - np.argmax(significant[:, ::-1], axis=1), 0)
    for d in range(1, width):
        rows = np.flatnonzero(degree == d)
        if not len(rows):
            continue
        c = coeffs[rows, :d + 1] / coeffs[rows, d:d + 1]
        companion = np.zeros((len(rows), d, d))
        companion[:, 0, :] = -c[:, d - 1::-1]
        if d > 1:
            companion[:, np.arange(1, d), np.arange(d - 1)] = 1.0
        roots = np.linalg.eigvals(companion)
        real = np.abs(roots.imag) <= 1e-9 * (1 + np.abs(roots.real))
        inside = real & (roots.real > 0) & (roots.real < 1)
        out[rows, :d] = np.where(inside, roots.real, np.nan)
    return out


@dataclass(frozen=True)
class Fields:
    """N(t) and A(t) of every segment as polynomials in ``t = s/L`` (SI units).

    Attributes
    ----------
    force : ndarray, shape (m, 4)
        Coefficients of N(t), lowest power first.
    area : ndarray, shape (m, 3)
        Coefficients of A(t).
    length, modulus : ndarray, shape (m,)
    end_force : ndarray, shape (m, 2), optional
        The recovered end forces; when given they replace N(0) and N(1), so the
        fields agree with the results to the last bit at the ends.
    x_from, x_to : ndarray, shape (m,), optional
        Positions of the ends along the axis, for :meth:`position`.
    """

    force: np.ndarray
    area: np.ndarray
    length: np.ndarray
    modulus: np.ndarray
    end_force: np.ndarray | None = None
    x_from: np.ndarray | None = None
    x_to: np.ndarray | None = None

    def __post_init__(self):
        for key in ("force", "area", "length", "modulus", "end_force", "x_from", "x_to"):
            value = getattr(self, key)
            if value is not None:
                # a float array is kept as a read-only view (the engine's arrays are
                # never written after they are made); anything else becomes one
                value = (value.view() if isinstance(value, np.ndarray) and value.dtype == float
                         else np.array(value, dtype=float))
                value.setflags(write=False)
                object.__setattr__(self, key, value)

    @classmethod
    def of(cls, n_from, q, rho_g, c, p1, q1, p2, q2, length, modulus, end_force=None,
           x_from=None, x_to=None, area=None):
        """The fields from the end force ``N_from``, the loads along the segment and its
        section factors (see :func:`axialfe.mechanics.element.force_coefficients`).

        ``area``, the table :meth:`area_table` gives for the same factors, may be
        passed when it is at hand (it does not change between load states).
        """
        force = np.column_stack(np.broadcast_arrays(
            *force_coefficients(n_from, q, rho_g, c, p1, q1, p2, q2, length)))
        if area is None:
            area = cls.area_table(c, p1, q1, p2, q2)
        return cls(force.astype(float, copy=False), area, length, modulus, end_force, x_from, x_to)

    @staticmethod
    def area_table(c, p1, q1, p2, q2):
        """The coefficients of A(t) of each segment, shape (m, 3) (see :meth:`of`)."""
        return np.column_stack(np.broadcast_arrays(
            *(np.multiply(c, a) for a in area_coefficients(1, p1, q1, p2, q2)))).astype(float)

    def interpolate(self, other: "Fields", s) -> "Fields":
        """The fields at ``self + s*(other - self)``, for a state affine in ``s``.

        ``s`` is one number, or one per segment.
        """
        s = np.asarray(s, dtype=float)[..., None]
        ends = (None if self.end_force is None or other.end_force is None
                else self.end_force + s * (other.end_force - self.end_force))
        return Fields(self.force + s * (other.force - self.force), self.area, self.length,
                      self.modulus, ends, self.x_from, self.x_to)

    def take(self, rows) -> "Fields":
        """The fields of the segments ``rows`` (an index array or a slice)."""
        pick = lambda v: None if v is None else v[rows]  # noqa: E731
        return Fields(self.force[rows], self.area[rows], self.length[rows], self.modulus[rows],
                      pick(self.end_force), pick(self.x_from), pick(self.x_to))

    def position(self, t):
        """The position x of fractions ``t`` along each segment (needs ``x_from``, ``x_to``)."""
        t = np.asarray(t, dtype=float)
        return self.x_from + (self.x_to - self.x_from) * t

    # --- values along the segments ------------------------------------------
    def axial_force(self, t):
        """N at fractions ``t``: shape (m, k) for t of shape (k,) or (m, k)."""
        n = _polyval(self.force, t)
        if self.end_force is not None:
            t = np.broadcast_to(np.asarray(t, dtype=float), n.shape)
            n = np.where(t == 0, self.end_force[:, :1], np.where(t == 1, self.end_force[:, 1:], n))
        return n

    def area_at(self, t):
        return _polyval(self.area, t)

    def stress(self, t):
        return self.axial_force(t) / self.area_at(t)

    def elastic_elongation(self, t):
        """integral of N/(E*A) from 0 to each t (t increasing, shape (k,), from 0)."""
        t = np.asarray(t, dtype=float)
        x, w = 0.5 * (_GAUSS8[0] + 1), 0.5 * _GAUSS8[1]
        a, b = t[:-1], t[1:]
        pts = (a[:, None] + (b - a)[:, None] * x).ravel()             # (k-1)*8 points
        strain = _polyval(self.force, pts) / (self.modulus[:, None] * _polyval(self.area, pts))
        parts = (strain.reshape(len(self.length), len(a), len(x)) * w).sum(axis=2) * (b - a)
        return self.length[:, None] * np.concatenate(
            [np.zeros((len(self.length), 1)), np.cumsum(parts, axis=1)], axis=1)

    # --- extremes -----------------------------------------------------------
    def force_peak(self):
        """The axial force of largest magnitude in each segment and where it is (as
        :meth:`stress_peak`): the ends, or a root of N'(t) inside."""
        return self._peak(*self._force_turns())

    def force_range(self):
        """The least and the largest (signed) axial force in each segment and where they are.

        Returns
        -------
        low, t_low, high, t_high : ndarray, shape (m,)
            The extremes among the ends and the turning points inside (roots of
            N'(t)), each with its place as a fraction from the ``from`` end (the
            least x where several places tie).
        """
        return self._range(*self._force_turns())

    def stress_range(self):
        """The least and the largest (signed) stress in each segment and where they are
        (as :meth:`force_range`; the turning points are the roots of N'A - NA')."""
        return self._range(*self._stress_turns())

    def _force_turns(self):
        f = self.force
        num = np.column_stack([f[:, 1], 2 * f[:, 2], 3 * f[:, 3], np.zeros(len(f)), np.zeros(len(f))])
        return num, (f[:, 2] != 0) | (f[:, 3] != 0), self.axial_force

    def stress_peak(self):
        """The stress of largest magnitude in each segment and where it is.

        Where the largest magnitude is reached at several places (a uniform
        stretch), the one of least x is given (of least t without positions).

        Returns
        -------
        value : ndarray, shape (m,)
            The signed stress whose magnitude is largest along the segment.
        t : ndarray, shape (m,)
            Its place as a fraction from the ``from`` end.
        """
        return self._peak(*self._stress_turns())

    def _stress_turns(self):
        m = len(self.length)
        f, a = self.force, self.area
        # N'*A - N*A' (degree <= 4), lowest power first
        dn = np.column_stack([f[:, 1], 2 * f[:, 2], 3 * f[:, 3]])
        da = np.column_stack([a[:, 1], 2 * a[:, 2]])
        num = np.zeros((m, 5))
        for i in range(3):
            for j in range(3):
                num[:, i + j] += dn[:, i] * a[:, j]
        for i in range(4):
            for j in range(2):
                num[:, i + j] -= f[:, i] * da[:, j]
        varying = (a[:, 1] != 0) | (a[:, 2] != 0) | (f[:, 2] != 0) | (f[:, 3] != 0)
        return num, varying, self.stress

    def _candidates(self, num, varying, values):
        """The places (ends and roots in (0, 1) of the polynomials ``num``, rows where
        ``varying``), the values there, their positions x, and which are real candidates."""
        m = len(self.length)
        candidates = np.full((m, 6), np.nan)
        candidates[:, 0], candidates[:, 1] = 0.0, 1.0
        if varying.any():
            candidates[varying, 2:] = _real_roots_in_unit(num[varying])
        real = ~np.isnan(candidates)
        t = np.where(real, candidates, 0.0)
        value = np.where(real, values(t), 0.0)
        x = t if self.x_from is None else self.x_from[:, None] + (self.x_to - self.x_from)[:, None] * t
        return t, value, x, real

    def _peak(self, num, varying, values):
        """The value of ``values(t)`` of largest magnitude over the ends and the roots in
        (0, 1) of the polynomials ``num`` (rows where ``varying``)."""
        t, sigma, x, real = self._candidates(num, varying, values)
        size = np.abs(sigma)
        best = size.max(axis=1)
        # of the candidates within rounding of the largest magnitude, the one of least x
        first = np.argmin(np.where(size >= best[:, None] * (1 - 1e-12), x, np.inf), axis=1)
        rows = np.arange(len(self.length))
        return sigma[rows, first], t[rows, first]

    def _range(self, num, varying, values):
        """The least and the largest value of ``values(t)`` over the same places as
        :meth:`_peak`, each with its place (the least x among exact ties)."""
        t, value, x, real = self._candidates(num, varying, values)
        rows = np.arange(len(self.length))
        out = []
        for sign in (1.0, -1.0):                   # the least, then the largest
            v = np.where(real, sign * value, np.inf)
            best = v.min(axis=1)
            pick = np.argmin(np.where(v == best[:, None], x, np.inf), axis=1)
            out += [value[rows, pick], t[rows, pick]]
        return tuple(out)
