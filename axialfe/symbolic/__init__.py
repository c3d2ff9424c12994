"""Closed forms: the whitelist parser of symbolic values and the exact solve.

- ``expressions``: the parser of symbolic model values (numbers, declared symbols,
  units, ``+ - * / ^``, parentheses), building sympy objects directly;
- ``closed_form``: the same model assembled and solved exactly with sympy.

sympy is heavy: nothing here is imported until a closed form is asked for.
"""
