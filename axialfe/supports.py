"""The load on each support: the opposite of its reaction, with its direction in words.

A reaction is the force a support exerts on the bar; the support's designer
needs the force the bar exerts on the support, which is its opposite (Newton's
third law), and which way it acts.  A support at an end of the bar (every
segment at its station lies on one side of it) is pushed when that force points
away from the bar and pulled when it points toward it; one with parts on both
sides is loaded toward +x or -x.

Examples
--------
A bar from a wall at x = 0 to a wall at x = 3 m loaded by +9 kN at x = 1 m: the
left wall holds the bar with -6 kN (R_A = -P*b/L, Gere and Goodno, Mechanics of
Materials, sec. 2.4), so the bar pulls it with +6 kN toward +x.

>>> from axialfe.model import Material, Section, Station, Segment, Support, Load, Model
>>> from axialfe import solve
>>> steel, rod = Material("steel", 200e9), Section("rod", "area", (("area", 1e-4),))
>>> model = Model([Station("A", 0.0), Station("C", 1.0), Station("B", 3.0)],
...               [Segment("AC", "A", "C", steel, rod), Segment("CB", "C", "B", steel, rod)],
...               [Support("A"), Support("B")], [Load("C", 9000.0)])
>>> [(round(s.load, 9), s.words) for s in support_loads(solve(model)["base"])]
[(6000.0, "pulls the support at 'A' toward +x"), (3000.0, "pushes the support at 'B' toward +x")]
"""

from __future__ import annotations

from dataclasses import dataclass

from .results import CaseResult

__all__ = ["SupportLoad", "support_loads", "support_sides"]


@dataclass(frozen=True)
class SupportLoad:
    """The load the bar puts on one support.

    Attributes
    ----------
    at, kind : str
        The support's station and kind.
    load : float
        The force on the support (N, + toward +x): minus the reaction.
    side : {'+x', '-x', 'both', 'none'}
        Where the bar lies from the support.
    words : str
        E.g. ``"pushes the support at 'left' toward -x"``; ``"no load on ..."`` at 0.
    """

    at: str
    kind: str
    load: float
    side: str
    words: str

    @property
    def short(self) -> str:
        """The words without naming the support: ``"pushes it toward -x"``, ``"no load"``."""
        return self.words.replace(f" the support at '{self.at}'", " it").replace("no load on it",
                                                                                  "no load")


def support_sides(model) -> dict[str, str]:
    """Where the segments at each supported station lie: ``'+x'``, ``'-x'``, ``'both'`` or
    ``'none'`` (a station held only through gaps)."""
    x = {st.name: st.x for st in model.stations}
    supported = {s.at for s in model.supports}
    seen: dict[str, set] = {name: set() for name in supported}
    for seg in model.segments:
        for here, there in ((seg.start, seg.end), (seg.end, seg.start)):
            if here in seen:
                seen[here].add("+x" if x[there] > x[here] else "-x")
    return {name: (sides.pop() if len(sides) == 1 else "both" if sides else "none")
            for name, sides in seen.items()}


def _words(at: str, load: float, side: str) -> str:
    where = f"the support at '{at}'"
    if load == 0:
        return f"no load on {where}"
    toward = "+x" if load > 0 else "-x"
    if side in ("+x", "-x"):
        verb = "pulls" if toward == side else "pushes"
        return f"{verb} {where} toward {toward}"
    return f"loads {where} toward {toward}"


def support_loads(result: CaseResult) -> list[SupportLoad]:
    """The load on every support of ``result``, in the order of the model's supports."""
    sides = support_sides(result.model)
    out = []
    for j, s in enumerate(result.model.supports):
        load = -float(result.reactions[j]) + 0.0      # + 0.0: no negative zero
        out.append(SupportLoad(s.at, s.kind, load, sides[s.at], _words(s.at, load, sides[s.at])))
    return out
