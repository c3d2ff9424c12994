"""What a linear solve says about a model with elastic-plastic materials.

``axialfe solve`` and ``axialfe check`` are linear-elastic: they do not follow
yielding.  On a model that asks for plasticity they must say so rather than
ignore it silently, and where a linear stress is beyond a plastic segment's
yield strength the linear result does not hold there.  The wording lives here
alone, so the commands (and any per-case note of the output) share it.
"""

from __future__ import annotations

import numpy as np

from ..formatting import names as names_text, number

__all__ = ["linear_notes"]


def linear_notes(solution, units=None) -> list[str]:
    """The notes a linear solve of a model with elastic-plastic materials owes its reader.

    Parameters
    ----------
    solution : Solution
        A linear solve (:func:`axialfe.engine.system.solve`).
    units : OutputUnits, optional
        For the stresses quoted (default: the model's).

    Returns
    -------
    list of str
        Empty when no material is elastic-plastic.  Otherwise one note that the
        linear solve ignores the behaviour, then one per case and segment whose
        linear stress is beyond the yield strength (tension, or the compressive
        yield strength where given).

    Examples
    --------
    >>> from axialfe.model import Material, Section, Station, Segment, Support, Model
    >>> from axialfe.engine.system import solve
    >>> m = Material("s", 200e9, 12e-6, 240e6, behaviour="elastic-plastic")
    >>> bar = Model([Station("a", 0.0), Station("b", 1.0)],
    ...             [Segment("ab", "a", "b", m, Section("r", "area", (("area", 1e-4),)),
    ...                      temperature_change=150.0)], [Support("a"), Support("b")])
    >>> for note in linear_notes(solve(bar)):
    ...     print(note)
    the linear solve ignores the elastic-plastic behaviour of segment 'ab': follow yielding with 'axialfe path', the collapse load with 'axialfe collapse'
    case 'base': segment 'ab' is beyond its yield strength in the linear result (-360 MPa against -240 MPa): the linear result does not hold there; follow the case with 'axialfe path'
    """
    model = solution.model
    rows = [i for i, seg in enumerate(model.segments) if seg.material.plastic]
    if not rows:
        return []
    units = units or model.units
    f_s, unit = units.factor("stress"), units.stress
    names = [model.segments[i].name for i in rows]
    word = "segment" if len(rows) == 1 else "segments"
    notes = [f"the linear solve ignores the elastic-plastic behaviour of {word} "
             f"{names_text(names)}: follow yielding with 'axialfe path', the collapse load "
             "with 'axialfe collapse'"]
    for case in solution:
        if case.fields is None:
            continue
        peak, _ = case.fields.stress_peak()
        for i in rows:
            mat = case.model.segments[i].material     # at the case's temperatures, if tabled
            bound = mat.yield_strength if peak[i] >= 0 else -(mat.compressive_yield_strength
                                                               or mat.yield_strength)
            if abs(peak[i]) > abs(bound) * (1 + 1e-9):
                notes.append(f"case '{case.name}': segment '{model.segments[i].name}' is beyond "
                             f"its yield strength in the linear result ({_mpa(peak[i], f_s)} "
                             f"{unit} against {_mpa(bound, f_s)} {unit}): the linear result "
                             "does not hold there; follow the case with 'axialfe path'")
    return notes


def _mpa(value, factor):
    return number(float(np.asarray(value)) / factor)
