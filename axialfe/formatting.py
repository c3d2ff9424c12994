"""The one formatter of numbers and names for text meant to be read: notes, tables, reports.

A note written below the output floor keeps its quantities as SI data
(:func:`quantity_text`) until the output writes it in the reader's units
(:func:`note_text`).
"""

import re

__all__ = ["number", "numbers", "names", "quantity_text", "note_text"]


def number(value, digits: int = 4, plain: bool = True, minus: str = "-") -> str:
    """``value`` to ``digits`` significant digits.

    ``plain`` writes plain digits where that stays short (1e-4 to 1e7);
    ``minus`` is the sign to print (a typographic minus in reports); None
    prints as ``-`` and zero (or a magnitude below 1e-300) as ``0``.

    >>> number(0.000123456), number(1234567.0), number(2.5e-7), number(1234567.0, 6, plain=False)
    ('0.0001235', '1235000', '2.5e-07', '1.23457e+06')
    """
    if value is None:
        return "-"
    if value == 0 or abs(value) < 1e-300:
        return "0"
    text = f"{value:.{digits}g}"
    if plain and "e" in text and 1e-4 <= abs(value) < 1e7:
        text = f"{float(text):.10f}".rstrip("0").rstrip(".")
    return text if minus == "-" else text.replace("-", minus)


def numbers(values, digits: int = 4, plain: bool = True, minus: str = "-") -> list[str]:
    """:func:`number` of each of ``values``, in one pass (a table's column).

    >>> numbers([0.0, 1234567.0, None, -2.5e-7], 6, plain=False)
    ['0', '1.23457e+06', '-', '-2.5e-07']
    """
    spec = f".{digits}g"
    out = ["-" if v is None else "0" if v == 0 or -1e-300 < v < 1e-300 else format(v, spec)
           for v in values]
    if plain or minus != "-":   # the rarer forms: each text that needs it, as number() writes it
        out = [number(v, digits, plain, minus) if ("e" in t and plain) or minus != "-" else t
               for v, t in zip(values, out)]
    return out


def names(items, most: int = 8) -> str:
    """``'a', 'b' and 3 more``: a list of names for a message.

    >>> names(["a", "b", "c"], most=2)
    "'a', 'b' and 1 more"
    """
    quoted = [f"'{n}'" for n in items]
    if len(quoted) > most:
        return ", ".join(quoted[:most]) + f" and {len(quoted) - most} more"
    return ", ".join(quoted)


_QUANTITY = re.compile(
    r"\u27e6(force|length|displacement|stress|temperature)=([-+0-9.eE]+|inf|nan)\u27e7")


def quantity_text(value, key: str) -> str:
    """A quantity in a note: its SI value and its kind (``force``, ``length``,
    ``displacement``, ``stress``, ``temperature`` for a change), kept as data until the
    note is shown in the output's units (:func:`note_text`)."""
    return f"\u27e6{key}={float(value)!r}\u27e7"


def note_text(note, units):
    """A note with its quantities written in ``units`` (an ``OutputUnits``; four
    significant digits).

    >>> from axialfe.units import OutputUnits
    >>> note_text("capacity " + quantity_text(58400.0, "force"), OutputUnits(force="kN"))
    'capacity 58.4 kN'
    >>> note_text("'shaft' " + quantity_text(50.0, "temperature"), OutputUnits(temperature="degF"))
    "'shaft' 90 degF"
    """
    if note is None or "\u27e6" not in note:
        return note

    def shown(m):
        key = m.group(1)
        return f"{number(float(m.group(2)) / units.factor(key))} {getattr(units, key)}"

    return _QUANTITY.sub(shown, note)
