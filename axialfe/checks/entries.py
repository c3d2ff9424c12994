"""Check entries, the checks of one case, and the report over all cases."""

from __future__ import annotations

from dataclasses import dataclass

from ..formatting import number
from ..model import CheckSettings
from ..units import OutputUnits

__all__ = ["CheckEntry", "CaseChecks", "CheckReport", "KINDS", "quantity_text"]

KINDS = ("strength", "buckling", "displacement", "gap")


@dataclass(frozen=True)
class CheckEntry:
    """One check of one item in one case.

    Attributes
    ----------
    kind : {'strength', 'buckling', 'displacement', 'gap'}
    name : str
        The segment, station or gap checked.
    case : str
    utilization : float or None
        Demand over capacity (safety factor included where it applies).
    ok : bool or None
        True passes (utilisation at most 1), False fails, None undecided.
    note : str or None
        Why an entry is undecided or fails without a utilisation, or what it assumed.
    quantity : {'stress', 'force', 'displacement'}
        What ``demand`` and ``capacity`` measure.
    demand, capacity : float or None
        In SI units; ``demand`` without the safety factor.  For a gap limit the
        demand is the required opening and the capacity the opening left.
    k_factor, buckling_length, slenderness, slenderness_limit : float or None
        The buckling basis (buckling entries only).
    at : float or None
        Strength entries: the position x (m) of the largest |stress| along the
        segment, inside it included (the least x where a stretch is uniform).
    """

    kind: str
    name: str
    case: str
    utilization: float | None
    ok: bool | None
    note: str | None = None
    quantity: str = "stress"
    demand: float | None = None
    capacity: float | None = None
    k_factor: float | None = None
    buckling_length: float | None = None
    slenderness: float | None = None
    slenderness_limit: float | None = None
    at: float | None = None

    @property
    def verdict(self) -> str:
        """``'pass'``, ``'FAIL'`` or ``'review'`` (undecided)."""
        return {True: "pass", False: "FAIL", None: "review"}[self.ok]

    def to_dict(self, units: OutputUnits | None = None) -> dict:
        """The JSON form: kind, name, utilization, ok, note; strength entries add ``at``
        (in the length unit of ``units``, default SI)."""
        out = {"kind": self.kind, "name": self.name,
               "utilization": None if self.utilization is None else float(self.utilization),
               "ok": self.ok, "note": self.note}
        if self.kind == "strength":
            out["at"] = self.at / (units.factor("length") if units else 1.0)
        return out


@dataclass(frozen=True)
class CaseChecks:
    """The check entries of one case, in the order strength, buckling, limits."""

    case: str
    entries: tuple[CheckEntry, ...]

    def __iter__(self):
        return iter(self.entries)

    def __len__(self):
        return len(self.entries)


@dataclass(frozen=True)
class CheckReport:
    """All checks of a solution, with the governing entry and the overall status.

    Attributes
    ----------
    settings : CheckSettings
    cases : tuple of CaseChecks
    governing : CheckEntry or None
        The entry with the highest utilisation over all cases (None when no
        entry has one).
    unchecked : tuple of str
        Segments whose material gives no yield strength: they get no strength
        entry, and :meth:`settings_text` names them.
    """

    settings: CheckSettings
    cases: tuple[CaseChecks, ...]
    governing: CheckEntry | None
    unchecked: tuple[str, ...] = ()

    @property
    def entries(self) -> tuple[CheckEntry, ...]:
        return tuple(e for c in self.cases for e in c.entries)

    @property
    def status(self) -> str:
        """``'fail'`` if any entry fails, else ``'undecided'`` if any is undecided or a
        segment's strength could not be checked, else ``'pass'``."""
        oks = [e.ok for e in self.entries]
        if any(ok is False for ok in oks):
            return "fail"
        if any(ok is None for ok in oks) or self.unchecked:
            return "undecided"
        return "pass"

    @property
    def exit_code(self) -> int:
        """0 all pass, 1 any fails, 3 none fails but some are undecided."""
        return {"pass": 0, "fail": 1, "undecided": 3}[self.status]

    def case(self, name: str) -> CaseChecks:
        for c in self.cases:
            if c.case == name:
                return c
        raise KeyError(name)

    def governing_dict(self) -> dict | None:
        """The JSON form of the governing entry: kind, name, case, utilization."""
        g = self.governing
        if g is None:
            return None
        return {"kind": g.kind, "name": g.name, "case": g.case, "utilization": float(g.utilization)}

    def settings_text(self) -> str:
        """One line stating the basis of the checks, defaults included."""
        s = self.settings
        k_default = " (default)" if s.effective_length_factor == 1.0 else ""
        sf_default = " (default)" if s.safety_factor == 1.0 else ""
        return (f"safety factor {s.safety_factor:g}{sf_default} on strength and buckling, none on "
                f"deformation limits; buckling: Euler load pi^2*E*I/(K*L)^2 with K = "
                f"{s.effective_length_factor:g}{k_default} and L = the segment length unless a "
                "segment sets effective_length_factor or buckling_length (the default assumes "
                "both end stations of a segment are braced laterally; give buckling_length for "
                "an unbraced run)"
                + ("; strength NOT checked (no yield strength given): "
                   + ", ".join(f"'{n}'" for n in self.unchecked) if self.unchecked else ""))


def quantity_text(value, unit, units: OutputUnits, key):
    """``value`` (SI) in the output unit of quantity ``key``, with the unit."""
    return f"{number(value / units.factor(key))} {unit}"
