"""Check entries, the checks of one case, and the report over all cases."""

from __future__ import annotations

from dataclasses import dataclass

from ..formatting import note_text, quantity_text  # noqa: F401 - re-exported for the checks
from ..model import CheckSettings
from ..units import OutputUnits

__all__ = ["CheckEntry", "CaseChecks", "CheckReport", "KINDS", "quantity_text", "note_text"]

KINDS = ("strength", "buckling", "displacement", "gap")
# deformation limits: which of an entry's demand and capacity is required and which actual
_DEFORMATION = {"displacement": ("capacity", "demand"), "gap": ("demand", "capacity")}
LIMIT_KINDS = frozenset(_DEFORMATION)   # the kinds whose amounts are required, actual, margin


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
    curve : str or None
        The column curve used (buckling entries only).
    relative_slenderness : float or None
        lambda = sqrt(A*f_y/N_cr) of the EN 1993 curves (None for the others).
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
    curve: str | None = None
    relative_slenderness: float | None = None
    at: float | None = None

    def amounts(self, units: OutputUnits) -> dict:
        """The amounts behind the utilisation, in ``units``, with their ``unit``.

        Strength and buckling give ``demand`` (without the safety factor) and
        ``capacity``; a deformation limit gives ``required`` (the allowable
        displacement, or the least opening), ``actual`` (|u|, or the opening
        left) and ``margin`` (how far the actual value is inside the required
        one: negative when the limit is not met).  None where not known.
        """
        f = units.factor(self.quantity)
        value = {"demand": self.demand, "capacity": self.capacity}
        value = {k: None if v is None else float(v) / f for k, v in value.items()}
        out = {"unit": getattr(units, self.quantity)}
        if self.kind in _DEFORMATION:
            required, actual = (value[k] for k in _DEFORMATION[self.kind])
            margin = None if None in (required, actual) else (
                required - actual if self.kind == "displacement" else actual - required)
            return {"required": required, "actual": actual, "margin": margin, **out}
        return {"demand": value["demand"], "capacity": value["capacity"], **out}

    def note_in(self, units: OutputUnits) -> str | None:
        """The note with its quantities in ``units``."""
        return note_text(self.note, units)

    @property
    def verdict(self) -> str:
        """``'pass'``, ``'FAIL'`` or ``'review'`` (undecided)."""
        return {True: "pass", False: "FAIL", None: "review"}[self.ok]

    def to_dict(self, units: OutputUnits | None = None) -> dict:
        """The JSON form: kind, name, utilization, ok, note.

        A strength entry adds ``at``; a buckling entry adds curve, buckling_length,
        effective_length_factor, slenderness and relative_slenderness.  Lengths are
        in the length unit of ``units`` (default: the default output units).
        """
        units = units or OutputUnits()
        out = {"kind": self.kind, "name": self.name,
               "utilization": None if self.utilization is None else float(self.utilization),
               "ok": self.ok, "note": self.note_in(units)}
        if self.kind == "strength":
            out["at"] = self.at / units.factor("length")
        if self.kind == "buckling":
            out.update({"curve": self.curve,
                        "buckling_length": self.buckling_length / units.factor("length"),
                        "effective_length_factor": self.k_factor,
                        "slenderness": self.slenderness,
                        "relative_slenderness": self.relative_slenderness})
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
        curve_default = " (default)" if s.column_curve == "johnson" else ""
        return (f"safety factor {s.safety_factor:g}{sf_default} on strength and buckling, none on "
                "deformation limits; buckling over braced runs: L = the distance between the "
                "nearest braced stations at or beyond a segment's ends (stations marked braced, "
                "and stations with a support of any kind, which is assumed to hold them "
                "laterally; gaps brace nothing and end a run; a free end where no braced station "
                f"follows), K = {s.effective_length_factor:g}{k_default} for a run braced at both "
                "ends and 2 for a run with a free end, unless a segment sets buckling_length or "
                "effective_length_factor; a run braced at neither end is undecided; column curve "
                f"{s.column_curve}{curve_default}: {_CURVE_BASIS[s.column_curve]}"
                + ("; strength NOT checked (no yield strength given): "
                   + ", ".join(f"'{n}'" for n in self.unchecked) if self.unchecked else ""))


_EN1993 = ("EN 1993-1-1:2005 buckling curve {} (alpha = {}, eq. 6.49, chi at most 1) with "
           "the safety factor as gamma_M1, capacity chi*A*f_y")
_CURVE_BASIS = {
    "johnson": "Johnson's parabola f_y - (f_y/(2*pi))^2*(K*L/r)^2/E below the tangency "
               "K*L/r = sqrt(2*pi^2*E/f_y), Euler's pi^2*E/(K*L/r)^2 above it, capacity at most "
               "A*f_y",
    **{f"en1993-{c}": _EN1993.format(c, a) for c, a in
       (("a0", 0.13), ("a", 0.21), ("b", 0.34), ("c", 0.49), ("d", 0.76))},
    "aisc360": "ANSI/AISC 360-16 E3, F_cr = 0.658^(F_y/F_e)*F_y for F_y/F_e <= 2.25, else "
               "0.877*F_e, with the safety factor as given, capacity at most A*f_y",
    "euler-only": "Euler's load pi^2*E*I/(K*L)^2 only; members with K*L/r below pi*sqrt(E/f_y) "
                  "are left undecided",
}


