"""The one formatter of numbers and names for text meant to be read: notes, tables, reports."""

__all__ = ["number", "names"]


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


def names(items, most: int = 8) -> str:
    """``'a', 'b' and 3 more``: a list of names for a message.

    >>> names(["a", "b", "c"], most=2)
    "'a', 'b' and 1 more"
    """
    quoted = [f"'{n}'" for n in items]
    if len(quoted) > most:
        return ", ".join(quoted[:most]) + f" and {len(quoted) - most} more"
    return ", ".join(quoted)
