"""Mechanics of the bar element, written once for every consumer.

- ``sections``: section factors (A = c*p*q), second moments, A(t) along a taper;
- ``element``: stiffness, load integrals, end forces and nodal loads, generic over
  the number type (numpy arrays or sympy scalars);
- ``backends``: the few operations that differ between the two (``NUMERIC``, ``exact()``);
- ``fields``: N(t), A(t), sigma(t), u(t) inside segments and the extremes of |sigma|;
- ``thermal``: the free thermal strain (constant, mean or total expansion) and tables
  against temperature.

This floor is pure arithmetic: it imports no other part of axialfe.
"""

from .backends import NUMERIC, exact
from .element import (ElementTerms, element_terms, end_forces, force_coefficients, load_terms,
                      nodal_loads)
from .fields import Fields
from .sections import area_coefficients, factors, second_moment

__all__ = ["NUMERIC", "exact", "ElementTerms", "element_terms", "end_forces",
           "force_coefficients", "load_terms", "nodal_loads", "Fields", "area_coefficients",
           "factors", "second_moment"]
