"""Reading the values a hand calculation states: ``[[claims]]`` and ``claims_file``.

A model file may hold ``[[claims]]`` itself and may name, with ``claims_file``
at its top level, a separate file (relative to the model file) that holds only
``[[claims]]``, so that the calculation under review and the model stay apart.
Claims of both are read, the model file's first.  Every value is data: the
files are parsed with :mod:`tomllib` and nothing in them is evaluated.  Errors
are located like the model reader's::

    hand-calc.toml:12: claims[3]: value: 'mm' is a unit of length, not of force, e.g. '12 kN'
"""

from __future__ import annotations

from pathlib import Path

from ..errors import ModelError, suggest
from ..model import Model
from ..review.claims import ENDS, KIND, WHATS, Claim, Tolerance, check_claim
from ..units import parse_quantity, split_quantity
from .modelfile import _Locator, states_claims
from .source import decode, read_text

__all__ = ["read_claims", "parse_claims"]

_KEYS = ("what", "at", "value", "end", "case", "tolerance", "source")
_PERCENT = ("%", "percent")


class _ClaimReader:
    """Turns the ``claims`` array of one file into checked claims, locating every error."""

    def __init__(self, text: str, source: str | None):
        self.source = source
        self.locator = _Locator(text)

    def fail(self, message, index=None, key=None, place=None, hint=None, options=None):
        line = self.locator.find("claims", index, key) if index is not None else (
            self.locator.find(None, None, key) if key else None)
        raise ModelError(message, place=place, file=self.source, line=line, hint=hint,
                         options=options)

    def text(self, entry, key, index, place):
        value = entry[key]
        if not isinstance(value, str):
            self.fail(f"{key}: expected a name in quotes: got {value!r}", index, key, place)
        return value

    def tolerance(self, value, kind, index, place) -> Tolerance:
        example = "expected a relative tolerance such as '1 %' or an absolute one such as " + (
            {"force": "'10 N'", "length": "'0.01 mm'", "stress": "'1 MPa'"}[kind])
        if not isinstance(value, str):
            self.fail(f"tolerance: {example}: got {value!r}", index, "tolerance", place)
        parts = split_quantity(value)
        if parts is not None and parts[1].strip().lower() in _PERCENT:
            fraction = float(parts[0]) / 100
            if fraction < 0:
                self.fail(f"tolerance must not be negative: got '{value}'", index, "tolerance", place)
            return Tolerance(relative=fraction)
        try:
            absolute = parse_quantity(value, kind)
        except ModelError as exc:
            self.fail(f"tolerance: {exc.message}; or give a relative tolerance such as '1 %'",
                      index, "tolerance", place)
        if absolute < 0:
            self.fail(f"tolerance must not be negative: got '{value}'", index, "tolerance", place)
        return Tolerance(absolute=absolute)

    def claim(self, entry, index, model: Model) -> Claim:
        place = f"claims[{index}]"
        if not isinstance(entry, dict):
            self.fail(f"expected a table: got {type(entry).__name__}", index, place=place)
        for key in entry:
            if key not in _KEYS:
                self.fail(f"unknown key '{key}'", index, key, place, hint=suggest(key, _KEYS),
                          options=_KEYS)
        for key in ("what", "at", "value"):
            if key not in entry:
                self.fail(f"a claim needs '{key}'", index, place=place)
        what = self.text(entry, "what", index, place)
        if what not in WHATS:
            self.fail(f"unknown value '{what}'", index, "what", place, hint=suggest(what, WHATS),
                      options=WHATS)
        kind = KIND[what]
        try:
            value = parse_quantity(entry["value"], kind)
        except ModelError as exc:
            raise ModelError(f"value: {exc.message}", place=place, file=self.source,
                             line=self.locator.find("claims", index, "value"), hint=exc.hint,
                             options=exc.options) from exc
        end = self.text(entry, "end", index, place) if "end" in entry else None
        if end is not None and end not in ENDS:
            self.fail(f"unknown end '{end}'", index, "end", place, hint=suggest(end, ENDS),
                      options=ENDS)
        kwargs = {"what": what, "at": self.text(entry, "at", index, place), "value": value,
                  "end": end, "place": place,
                  "case": self.text(entry, "case", index, place) if "case" in entry else None,
                  "source": self.text(entry, "source", index, place) if "source" in entry else None}
        if "tolerance" in entry:
            kwargs["tolerance"] = self.tolerance(entry["tolerance"], kind, index, place)
        try:
            claim = Claim(**kwargs)
        except ModelError as exc:
            key = next((k for k in ("end", "tolerance", "value", "at") if f"'{k}'" in exc.message
                        or exc.message.startswith(k)), None)
            raise exc.located(file=self.source, line=self.locator.find("claims", index, key)) from exc
        try:
            return check_claim(model, claim)
        except ModelError as exc:
            key = ("case" if "case" in entry else None) if "case" in exc.message else "at"
            raise exc.located(file=self.source, line=self.locator.find("claims", index, key)) from exc

    def claims(self, items, model: Model) -> tuple[Claim, ...]:
        if not isinstance(items, list):
            raise ModelError("'claims' must be an array of tables ([[claims]])",
                             place="top level", file=self.source, line=self.locator.find("claims"))
        return tuple(self.claim(entry, i, model) for i, entry in enumerate(items, 1))


def _read_text(path: Path, what: str, source=None, line=None) -> str:
    return read_text(path, what, file=source, line=line,
                     place=None if source is None else f"claims_file '{path}'")


def parse_claims(text: str, model: Model, source: str | None = None,
                 only_claims: bool = False, data: dict | None = None) -> tuple[Claim, ...]:
    """Read the ``[[claims]]`` of one TOML text and check them against ``model``.

    With ``only_claims`` the text is a claims file: any other top-level key is
    an error.  ``claims_file`` is not followed here (see :func:`read_claims`).
    ``data`` is the text already decoded, when it is at hand.
    """
    data = decode(text, source) if data is None else data
    reader = _ClaimReader(text, source)
    if only_claims:
        for key in data:
            if key != "claims":
                reader.fail(f"unknown key '{key}': a claims file holds only [[claims]]", key=key,
                            place="top level", hint=suggest(key, ("claims",)))
    return reader.claims(data.get("claims", []), model)


def read_claims(path, model: Model) -> tuple[Claim, ...]:
    """The claims of a model file and of the ``claims_file`` it names, in that order.

    Parameters
    ----------
    path : str or Path
        The model file.
    model : Model
        The model read from it, against which every claim is checked.

    Raises
    ------
    ModelError
        One located line for a malformed claim, an unknown name or case, a value
        of the wrong dimension, or a claims file that cannot be read.
    """
    path = Path(path)
    if not states_claims(model, path):
        return ()  # the model's reader saw neither key in this file
    text = _read_text(path, "model file")
    data = decode(text, str(path))
    claims = parse_claims(text, model, str(path), data=data)
    if "claims_file" in data:
        name = data["claims_file"]
        line = _Locator(text).find(None, None, "claims_file")
        if not isinstance(name, str) or not name:
            raise ModelError(f"claims_file: expected a file name in quotes: got {name!r}",
                             place="top level", file=str(path), line=line)
        other = path.parent / name
        claims += parse_claims(_read_text(other, "claims file", str(path), line), model,
                               str(other), only_claims=True)
    return claims
