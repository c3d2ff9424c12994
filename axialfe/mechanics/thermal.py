"""Free thermal strain and properties from tables against temperature, written once.

A material's expansion is a constant coefficient, a table of the mean
coefficient from the table's own reference temperature (as piping tables give
it, interpolated linearly in the mean coefficient) or a table of the total
expansion per unit length from that reference (interpolated linearly in the
strain).  With epsilon(T) the strain from the table's reference, the free
thermal strain from the model's reference T0 to T is

    epsilon(T) - epsilon(T0),

which is what a model whose reference differs from the table's must use (the
mean coefficient of the table does not hold from T0).  Pure arithmetic on
floats and arrays; temperatures in kelvin.
"""

from __future__ import annotations

import numpy as np

__all__ = ["EXPANSION_KINDS", "interpolate", "strain_from_reference", "free_strain",
           "outside"]

EXPANSION_KINDS = ("constant", "mean", "total")


def outside(temperatures, T):
    """Which of ``T`` lie outside the table's range [first, last] (rounding allowed)."""
    t = np.asarray(temperatures, float)
    T = np.asarray(T, float)
    slack = 1e-9 * max(abs(t[-1]), 1.0)
    return (T < t[0] - slack) | (T > t[-1] + slack)


def interpolate(temperatures, values, T):
    """Linear interpolation of a table at ``T`` (inside its range; see :func:`outside`)."""
    t = np.asarray(temperatures, float)
    return np.interp(np.clip(T, t[0], t[-1]), t, np.asarray(values, float))


def strain_from_reference(kind, temperatures, values, reference, T):
    """The thermal strain from the table's reference temperature to ``T``.

    ``kind`` 'mean': values are mean coefficients from ``reference``, the strain
    alpha_m(T)*(T - reference); 'total': values are total strains from
    ``reference``; 'constant': ``values`` is the coefficient itself.
    """
    T = np.asarray(T, float)
    if kind == "constant":
        return values * (T - reference)
    if kind == "mean":
        return interpolate(temperatures, values, T) * (T - reference)
    if kind == "total":
        return interpolate(temperatures, values, T)
    raise ValueError(f"unknown expansion kind {kind!r}")


def free_strain(kind, temperatures, values, reference, T0, T):
    """The free thermal strain from the model's reference ``T0`` to ``T``.

    Examples
    --------
    A table of mean coefficients from 20 degC: 11.7e-6 /K at 100 degC and 12.5e-6 /K
    at 300 degC.  From a model reference of 100 degC to 300 degC the strain is
    12.5e-6*280 - 11.7e-6*80 = 2.564e-3, not 12.5e-6*200 = 2.5e-3:

    >>> t = [293.15, 373.15, 573.15]
    >>> a = [11.5e-6, 11.7e-6, 12.5e-6]
    >>> round(float(free_strain("mean", t, a, 293.15, 373.15, 573.15)), 12)  # should be 0.002564
    0.002564
    """
    return (strain_from_reference(kind, temperatures, values, reference, T)
            - strain_from_reference(kind, temperatures, values, reference, T0))
