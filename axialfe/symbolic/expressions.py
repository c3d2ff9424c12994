"""Model values as small expressions: a whitelist parser of symbols, numbers and units.

A model file may declare symbols (``[symbols]``) and write a value as a simple
expression of them: ``"2*a"``, ``"L - a"``, ``"-P/2"``, ``"L/2 + 50 mm"``.  A
model file is untrusted input, so such strings are read by this module's own
tokenizer and recursive-descent parser, which knows only

- numbers (``12``, ``0.5``, ``12e-6``), read exactly as fractions;
- names: a declared symbol, or else a unit that :mod:`axialfe.units` (pint)
  knows; a declared symbol wins over a unit of the same name;
- ``+ - * / ^`` (also ``**``), parentheses, and juxtaposition as
  multiplication (``"50 mm"``, ``"2 (L - a)"``).

Nothing is ever evaluated as code.  Every expression carries its physical
dimension, checked as it is built (no sum of a length and a force), and can be
turned into exact sympy objects (built node by node from ``sympy.Symbol``,
``sympy.Rational``, ``Add``, ``Mul`` and ``Pow``) or evaluated exactly with
fractions.  Internally everything is in SI base units: ``"50 mm"`` is the
number 1/20 (metre), a symbol stands for its quantity in SI base units.
"""

from __future__ import annotations

import keyword
import math
import re
from dataclasses import dataclass, field
from fractions import Fraction

from ..errors import ModelError, UnitError, suggest
from ..units import KINDS, kind_dimensions, split_quantity, unit_base

__all__ = ["SymbolDef", "Expression", "parse_expression", "read_symbol", "describe_dimensions",
           "exact_decimal", "NAME"]

NAME = re.compile(r"[^\W\d]\w*")
_MAX_LENGTH = 400
_MAX_DEPTH = 40
_MAX_POWER = 16
_TOKEN = re.compile(r"""
    (?P<space>\s+)
  | (?P<number>(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)
  | (?P<name>[^\W\d]\w*)
  | (?P<op>\*\*|[-+*/^()])
""", re.VERBOSE)


def exact_decimal(value: float) -> Fraction:
    """Return the fraction of a float's shortest decimal form (0.001 -> 1/1000).

    Unit factors come from pint as floats; their decimal form (15 significant
    digits) is the exact factor for every unit defined by a decimal ratio.
    """
    return Fraction(f"{value:.15g}")


def _dims(mapping) -> tuple[tuple[str, Fraction], ...]:
    return tuple(sorted((k, Fraction(v)) for k, v in mapping.items() if v != 0))


def _dims_mul(a, b, sign=1):
    out = dict(a)
    for k, v in b:
        out[k] = out.get(k, 0) + sign * v
    return _dims(out)


def describe_dimensions(dims) -> str:
    """Name a dimension the way the model file's fields are named: 'a length', 'a force'..."""
    dims = _dims(dict(dims))
    if not dims:
        return "a plain number"
    for kind in KINDS:
        if kind == "temperature":
            continue
        if _dims(kind_dimensions(kind)) == dims:
            name = {"stiffness": "force per length", "force_per_length": "force per length",
                    "temperature_difference": "temperature difference"}.get(kind, kind)
            name = name.replace("_", " ")
            return f"an {name}" if name[0] in "aeiou" else f"a {name}"
    parts = []
    for k, v in dims:
        parts.append(k if v == 1 else f"{k}^{v}")
    return "a quantity of dimension " + "*".join(parts)


@dataclass(frozen=True)
class SymbolDef:
    """A declared symbol: a name standing for a physical quantity.

    Parameters
    ----------
    name : str
    unit : str
        The unit it was declared with (its value's unit, or ``unit = ...``).
    dims : tuple of (str, Fraction)
        Its base dimensions.
    value : Fraction or None
        Its value in SI base units, exact; None when it has none.
    text : str or None
        The value as written in the file (``"18 kN"``), None when it has none.
    """

    name: str
    unit: str
    dims: tuple
    value: Fraction | None = None
    text: str | None = None


@dataclass(frozen=True)
class Expression:
    """A parsed model value: its tree, its dimension and the symbols it uses.

    The tree holds tuples: ``("num", Fraction)``, ``("sym", name)``,
    ``("add", a, b)``, ``("neg", a)``, ``("mul", a, b)``, ``("div", a, b)`` and
    ``("pow", a, Fraction)``.
    """

    text: str
    tree: tuple
    dims: tuple
    names: frozenset = field(default_factory=frozenset)

    def sympy(self, symbols):
        """Return the expression as sympy objects; ``symbols`` maps names to sympy symbols."""
        import sympy

        def build(node):
            op = node[0]
            if op == "num":
                return sympy.Rational(node[1].numerator, node[1].denominator)
            if op == "sym":
                return symbols[node[1]]
            if op == "neg":
                return sympy.Mul(sympy.Integer(-1), build(node[1]))
            if op == "add":
                return sympy.Add(build(node[1]), build(node[2]))
            if op == "mul":
                return sympy.Mul(build(node[1]), build(node[2]))
            if op == "div":
                return sympy.Mul(build(node[1]), sympy.Pow(build(node[2]), sympy.Integer(-1)))
            if op == "pow":
                exp = node[2]
                return sympy.Pow(build(node[1]), sympy.Rational(exp.numerator, exp.denominator))
            raise AssertionError(op)  # pragma: no cover

        return build(self.tree)

    def value(self, values):
        """Evaluate with ``values`` (name -> Fraction); exact unless a root is taken.

        Raises
        ------
        ModelError
            On a division by zero.
        """
        def ev(node):
            op = node[0]
            if op == "num":
                return node[1]
            if op == "sym":
                return values[node[1]]
            if op == "neg":
                return -ev(node[1])
            if op == "add":
                return ev(node[1]) + ev(node[2])
            if op == "mul":
                return ev(node[1]) * ev(node[2])
            if op == "div":
                den = ev(node[2])
                if den == 0:
                    raise ModelError(f"'{self.text}' divides by zero")
                return ev(node[1]) / den
            if op == "pow":
                base, exp = ev(node[1]), node[2]
                if base == 0 and exp < 0:
                    raise ModelError(f"'{self.text}' divides by zero")
                if exp.denominator == 1:
                    return Fraction(base) ** exp.numerator
                if base < 0:
                    raise ModelError(f"'{self.text}' takes a root of a negative number")
                return float(base) ** float(exp)
            raise AssertionError(op)  # pragma: no cover

        return ev(self.tree)


def _power_of(node) -> Fraction:
    """The largest total exponent a subtree raises its leaves to (1 for none)."""
    best, stack = Fraction(1), [(node, Fraction(1))]
    while stack:
        item, factor = stack.pop()
        op = item[0]
        if op == "pow":
            factor = factor * abs(item[2])
            best = max(best, factor)
            stack.append((item[1], factor))
        elif op in ("neg",):
            stack.append((item[1], factor))
        elif op in ("add", "mul", "div"):
            stack.extend(((item[1], factor), (item[2], factor)))
    return best


class _Parser:
    """Recursive descent over the tokens of one value."""

    def __init__(self, text, symbols, difference):
        self.text = text
        self.symbols = symbols
        self.difference = difference
        self.tokens = self._tokenize(text)
        self.pos = 0
        self.depth = 0
        self.names = set()

    def fail(self, message, hint=None):
        raise UnitError(f"'{self.text}': {message}", hint=hint)

    def _tokenize(self, text):
        tokens, i = [], 0
        while i < len(text):
            m = _TOKEN.match(text, i)
            if m is None:
                self.fail(f"unexpected character {text[i]!r} at position {i + 1}; a value may "
                          "use numbers, symbol and unit names, + - * / ^ and parentheses")
            kind = m.lastgroup
            if kind != "space":
                tokens.append((kind, m.group(kind), i))
            i = m.end()
        return tokens

    def peek(self):
        return self.tokens[self.pos] if self.pos < len(self.tokens) else (None, None, len(self.text))

    def take(self):
        tok = self.peek()
        self.pos += 1
        return tok

    def where(self, tok):
        return "at the end" if tok[0] is None else f"at position {tok[2] + 1} ('{tok[1]}')"

    # grammar ----------------------------------------------------------------
    def parse(self):
        if not self.tokens:
            self.fail("empty value")
        node = self.expr()
        if self.pos != len(self.tokens):
            self.fail(f"unexpected {self.where(self.peek())}")
        return node

    def expr(self):
        self.depth += 1
        if self.depth > _MAX_DEPTH:
            self.fail("nested too deeply")
        left = self.term()
        while self.peek()[1] in ("+", "-"):
            op = self.take()[1]
            right = self.term()
            if left[1] != right[1]:
                self.fail(f"cannot {'add' if op == '+' else 'subtract'} "
                          f"{describe_dimensions(right[1])} {'to' if op == '+' else 'from'} "
                          f"{describe_dimensions(left[1])}")
            tree = ("add", left[0], right[0] if op == "+" else ("neg", right[0]))
            left = (tree, left[1])
        self.depth -= 1
        return left

    def term(self):
        left = self.unary()
        while True:
            kind, text, _ = self.peek()
            if text in ("*", "/"):
                self.take()
                right = self.unary()
            elif kind == "name" or text == "(":
                right = self.unary()  # juxtaposition: "50 mm", "2 (L - a)"
                text = "*"
            else:
                return left
            if text == "*":
                left = (("mul", left[0], right[0]), _dims_mul(left[1], right[1]))
            else:
                left = (("div", left[0], right[0]), _dims_mul(left[1], right[1], -1))

    def unary(self):
        if self.peek()[1] in ("+", "-"):
            op = self.take()[1]
            self.depth += 1
            if self.depth > _MAX_DEPTH:
                self.fail("nested too deeply")
            node, dims = self.unary()
            self.depth -= 1
            return (("neg", node) if op == "-" else node), dims
        return self.power()

    def power(self):
        base = self.atom()
        if self.peek()[1] in ("^", "**"):
            tok = self.take()
            sign = 1
            while self.peek()[1] in ("+", "-"):
                sign *= -1 if self.take()[1] == "-" else 1
            exp_node, exp_dims = self.power()
            if exp_dims:
                self.fail(f"an exponent must be a plain number {self.where(tok)}")
            if _has_symbol(exp_node):
                self.fail(f"an exponent must be a number, not a symbol {self.where(tok)}")
            exp = Expression(self.text, exp_node, ()).value({})
            if not isinstance(exp, Fraction):
                self.fail(f"an exponent must be a rational number {self.where(tok)}")
            exp = sign * exp
            if abs(exp) > _MAX_POWER or exp.denominator > _MAX_POWER:
                self.fail(f"an exponent of {exp} is out of range (at most {_MAX_POWER})")
            # the bound holds for the nesting too: ((a^16)^16) is a^256
            total = _power_of(base[0]) * abs(exp)
            if total > _MAX_POWER:
                self.fail(f"powers of powers raise to {total} in total, out of range (at most "
                          f"{_MAX_POWER})")
            dims = _dims({k: v * exp for k, v in base[1]})
            return ("pow", base[0], exp), dims
        return base

    def atom(self):
        tok = self.take()
        kind, text, _ = tok
        if kind == "number":
            return ("num", self.number(text)), ()
        if kind == "name":
            return self.name(text)
        if text == "(":
            node = self.expr()
            close = self.take()
            if close[1] != ")":
                self.fail(f"expected ')' {self.where(close)}")
            return node
        self.fail(f"expected a number, a name or '(' {self.where(tok)}")

    def number(self, text):
        mantissa, _, exponent = text.lower().partition("e")
        if exponent and abs(int(exponent)) > 300:
            self.fail(f"the number {text} is out of range")
        value = float(text)
        if not math.isfinite(value):
            self.fail(f"the number {text} is out of range")
        return Fraction(text)

    def name(self, text):
        if text in self.symbols:
            self.names.add(text)
            return ("sym", text), self.symbols[text]
        try:
            scale, dims = unit_base(text, difference=self.difference)
        except UnitError as exc:
            if "offset unit" in exc.message:
                self.fail(exc.message)
            hint = suggest(text, self.symbols) if self.symbols else None
            what = "a declared symbol nor a unit" if self.symbols else "a unit (and no [symbols] are declared)"
            self.fail(f"unknown name '{text}': neither {what}", hint=hint)
        return ("num", exact_decimal(scale)), _dims(dims)


def _has_symbol(node):
    if node[0] == "sym":
        return True
    return any(isinstance(n, tuple) and _has_symbol(n) for n in node[1:])


def parse_expression(text: str, symbols=None, kind: str | None = None) -> Expression:
    """Parse one model value.

    Parameters
    ----------
    text : str
        The value, e.g. ``"L - a"`` or ``"-P/2"``.
    symbols : mapping of str to dims, optional
        The declared symbols and their dimensions (see :class:`SymbolDef`).
    kind : str, optional
        One of :data:`axialfe.units.KINDS`: the dimension the value must have.

    Raises
    ------
    UnitError
        For any character, name or construction outside the whitelist, and
        for a value of the wrong dimension.

    Examples
    --------
    >>> e = parse_expression("L/2 + 50 mm", {"L": (("[length]", 1),)}, "length")
    >>> e.value({"L": 1})
    Fraction(11, 20)
    """
    if not isinstance(text, str):
        raise UnitError(f"expected a value in quotes: got {text!r}")
    if len(text) > _MAX_LENGTH:
        raise UnitError(f"a value of {len(text)} characters is too long (at most {_MAX_LENGTH})")
    symbols = dict(symbols or {})
    parser = _Parser(text, symbols, difference=(kind == "temperature_difference"))
    tree, dims = parser.parse()
    if kind is not None:
        want = _dims(kind_dimensions(kind))
        if dims != want:
            raise UnitError(f"'{text}' is {describe_dimensions(dims)}, but "
                            f"{describe_dimensions(want)} is expected here, e.g. '{KINDS[kind][1]}'")
    return Expression(text, tree, dims, frozenset(parser.names))


def read_symbol(name: str, entry) -> SymbolDef:
    """Read one entry of ``[symbols]``: ``"18 kN"`` or ``{ unit = "mm" }`` (also with ``value``).

    Inside ``[symbols]`` units are always units: a value is a number and a unit
    read by pint, never an expression of other symbols.

    Raises
    ------
    UnitError
        For a bad name, a missing or unknown unit, or an expression as a value.
    """
    if not NAME.fullmatch(name) or keyword.iskeyword(name) or name.startswith("_"):
        raise UnitError(f"'{name}' cannot name a symbol: use letters, digits and '_', starting "
                        "with a letter (and no Python keyword)")
    text = None
    if isinstance(entry, str):
        text, unit = entry, None
    elif isinstance(entry, dict):
        for key in entry:
            if key not in ("unit", "value", "description"):
                raise UnitError(f"unknown key '{key}'", hint=suggest(key, ("unit", "value")),
                                options=("unit", "value", "description"))
        unit = entry.get("unit")
        text = entry.get("value")
        if unit is None and text is None:
            raise UnitError("a symbol needs a value (\"18 kN\") or a unit ({ unit = \"mm\" })")
        if unit is not None and not isinstance(unit, str):
            raise UnitError(f"unit: expected a unit in quotes: got {unit!r}")
        if text is not None and not isinstance(text, str):
            raise UnitError(f"a bare number needs a unit: write it like \"{text} mm\"")
    else:
        raise UnitError(f"a bare number needs a unit: write it like \"{entry} mm\", or declare "
                        "the symbol with its unit only: { unit = \"mm\" }")
    value = None
    if text is not None:
        parts = split_quantity(text)
        if parts is None or not parts[1]:
            if parts is None:
                raise UnitError(f"'{text}': a symbol's value is a number with a unit, such as "
                                "'18 kN' (not an expression)")
            raise UnitError(f"'{text}' has no unit: give one, such as '{text} mm', or "
                            "'dimensionless' for a plain number")
        number, value_unit = parts
        if re.search(r"[-+*()]", value_unit):
            raise UnitError(f"'{text}': a symbol's value is a number with a unit, such as "
                            "'18 kN' (not an expression)")
        scale, dims = unit_base(value_unit, difference=True)
        if abs(float(number)) == math.inf or (
                "e" in number.lower() and abs(int(number.lower().partition("e")[2])) > 300):
            raise UnitError(f"'{text}' is not a finite number")
        value = Fraction(number) * exact_decimal(scale)
        if unit is not None:
            _, declared = unit_base(unit, difference=True)
            if _dims(declared) != _dims(dims):
                raise UnitError(f"value '{text}' does not have the dimension of unit '{unit}'")
        unit = unit or value_unit
    else:
        _, dims = unit_base(unit, difference=True)
    return SymbolDef(name, unit, _dims(dims), value, text)
