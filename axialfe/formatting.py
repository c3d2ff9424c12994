"""The one formatter of numbers for text meant to be read: notes, tables, reports."""

__all__ = ["number"]


def number(value: float) -> str:
    """Four significant digits, in plain digits where that stays short.

    >>> number(0.000123456), number(1234567.0), number(2.5e-7)
    ('0.0001235', '1235000', '2.5e-07')
    """
    text = f"{value:.4g}"
    if "e" in text and 1e-4 <= abs(value) < 1e7:
        text = f"{float(text):.10f}".rstrip("0").rstrip(".")
    return text
