"""The few operations of the element that differ between numbers and exact algebra.

A backend gives:

- ``pi``;
- ``is_uniform(p1, q1, p2, q2)`` and ``is_zero(x)``: which formulas apply;
- ``branch(mask, uniform, taper, args)``: apply the uniform or the taper formula;
- ``taper_flexibility(c, p1, q1, p2, q2, L)``: ``E * integral(ds/(E*A))`` over a taper;
- ``area_integral(b, c, p1, q1, p2, q2, L)``: ``integral(sum(b_k*t^k)/A ds)`` over ``s`` in
  ``[0, L]``, ``t = s/L``.

:data:`NUMERIC` works on numpy arrays over segments (``log1p`` for the
flexibility, 24-point Gauss-Legendre quadrature for the load integrals, exact
to rounding for the taper ratios met in practice); :func:`exact` returns the
sympy backend (logarithms of ratios and partial fractions), imported only when
a closed form is asked for.
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["NUMERIC", "exact"]

_GAUSS = np.polynomial.legendre.leggauss(24)


def _phi(t):
    """log1p(t)/t, accurate near t = 0."""
    t = np.asarray(t, dtype=float)
    small = np.abs(t) < 1e-6
    safe = np.where(small, 1.0, t)
    return np.where(small, 1 - t / 2 + t * t / 3 - t**3 / 4, np.log1p(safe) / safe)


class _Numeric:
    pi = math.pi

    @staticmethod
    def is_uniform(p1, q1, p2, q2):
        return (p1 == p2) & (q1 == q2)

    @staticmethod
    def is_zero(x):
        return False

    @staticmethod
    def branch(uniform_mask, uniform, taper, args):
        shape = np.broadcast(*args).shape
        args = tuple(np.broadcast_to(np.asarray(a, dtype=float), shape) for a in args)
        tap = np.flatnonzero(~np.broadcast_to(uniform_mask, shape))
        if not len(tap):
            # all uniform: the formulas' own arrays, read-only (no copy; two terms may be
            # one array, as the two end areas are)
            return tuple(np.broadcast_to(np.asarray(v, dtype=float), shape)
                         for v in uniform(*args, NUMERIC))
        out = [np.array(np.broadcast_to(v, shape), dtype=float)
               for v in uniform(*args, NUMERIC)] if np.any(uniform_mask) else None
        if out is None:
            return tuple(np.array(np.broadcast_to(v, shape), dtype=float)
                         for v in taper(*args, NUMERIC))
        if len(tap):
            values = taper(*(a[tap] for a in args), NUMERIC)
            for o, v in zip(out, values):
                o[tap] = v
        return tuple(out)

    @staticmethod
    def taper_flexibility(c, p1, q1, p2, q2, L):
        return L / (c * q1 * p2) * _phi((p1 * q2 - q1 * p2) / (q1 * p2))

    @staticmethod
    def area_integral(b, c, p1, q1, p2, q2, L):
        L = np.asarray(L, dtype=float)
        t = 0.5 * (_GAUSS[0] + 1)                     # points in t, shape (24,)
        w = 0.5 * _GAUSS[1]
        col = lambda a: np.asarray(a, dtype=float)[..., None]  # noqa: E731
        area = col(c) * (col(p1) + col(p2 - p1) * t) * (col(q1) + col(q2 - q1) * t)
        num = sum(col(bk) * t**k for k, bk in enumerate(b))
        return L * np.sum(w * num / area, axis=-1)


NUMERIC = _Numeric()


class _Exact:
    """sympy: the flexibility with one logarithm of each ratio, integrals by partial fractions."""

    def __init__(self):
        import sympy

        self.sympy = sympy
        self.pi = sympy.pi

    def is_uniform(self, p1, q1, p2, q2):
        cancel = self.sympy.cancel
        return cancel(p1 - p2) == 0 and cancel(q1 - q2) == 0

    def is_zero(self, x):
        return x == 0

    def branch(self, uniform_mask, uniform, taper, args):
        return (uniform if uniform_mask else taper)(*args, self)

    def _logs(self, p1, q1, p2, q2):
        """log(p1/p2), log(q1/q2), and a map from the ratios p2/p1, q2/q1 to their logs."""
        cancel, log, zero = self.sympy.cancel, self.sympy.log, self.sympy.Integer(0)
        lp, lq = (log(cancel(x1 / x2)) if cancel(x1 - x2) != 0 else zero
                  for x1, x2 in ((p1, p2), (q1, q2)))
        return lp, lq, {cancel(p2 / p1): -lp, cancel(q2 / q1): -lq}

    def taper_flexibility(self, c, p1, q1, p2, q2, L):
        """``L/(c*p1*p2)`` for a cone (P proportional to Q), otherwise
        ``L*(log(p1/p2) - log(q1/q2))/(c*(p1*q2 - q1*p2))``; for a linear area that is
        ``L*log(A1/A2)/(A1 - A2)`` (Gere and Goodno, Mechanics of Materials, nonuniform
        bars; from memory)."""
        lp, lq, _ = self._logs(p1, q1, p2, q2)
        det = self.sympy.cancel(p1 * q2 - q1 * p2)
        return L / (c * q1 * p2) if det == 0 else L * (lp - lq) / (c * det)

    def area_integral(self, b, c, p1, q1, p2, q2, L):
        sympy = self.sympy
        s = sympy.Dummy("s", positive=True)
        P, Q = p1 + (p2 - p1) / L * s, q1 + (q2 - q1) / L * s
        num = sum(_exact_number(sympy, bk) * (s / L) ** k for k, bk in enumerate(b))
        return self._integral(sympy.expand(num), s, P, Q, L, self._logs(p1, q1, p2, q2)[2]) / c

    def _integral(self, num, s, P, Q, L, logs):
        """Integral of ``num/(P*Q)`` over s from 0 to L (``num`` a polynomial in s).

        By partial fractions in s: polynomial terms integrate to polynomials, a
        term ``a/(b*s + d)**n`` to ``a/b*log((b*L + d)/d)`` (n = 1) or a power; a
        logarithm of a ratio in ``logs`` (ratio -> its logarithm) is written as given.
        """
        sympy = self.sympy
        total = sympy.Integer(0)
        for term in sympy.Add.make_args(sympy.apart(sympy.cancel(num / (P * Q)), s)):
            coeff, part = term.as_independent(s, as_Add=False)
            num_s, den_s = sympy.fraction(sympy.factor(part))
            if not den_s.has(s):
                total += coeff * sympy.integrate(num_s / den_s, (s, 0, L))
                continue
            const, lin = den_s.as_independent(s, as_Add=False)
            base, n = lin.as_base_exp()
            poly = sympy.Poly(base, s)
            if num_s.has(s) or poly.degree() != 1 or not n.is_Integer:  # pragma: no cover
                raise AssertionError(f"unexpected partial fraction {term}")
            bb, d = poly.all_coeffs()
            a = coeff * num_s / const
            end = bb * L + d
            if n == 1:
                ratio = sympy.cancel(end / d)
                total += a / bb * logs.get(ratio, sympy.log(ratio))
            else:
                total += a / bb * (end ** (1 - n) - d ** (1 - n)) / (1 - n)
        return total


def _exact_number(sympy, value):
    """A plain int (a coefficient written as 0 or 1) as a sympy Integer; sympy values as they
    are.  Never a string parser: the values come from the element formulas, not from text."""
    return sympy.Integer(value) if isinstance(value, int) else value


_EXACT = None


def exact():
    """The sympy backend (created on first use)."""
    global _EXACT
    if _EXACT is None:
        _EXACT = _Exact()
    return _EXACT
