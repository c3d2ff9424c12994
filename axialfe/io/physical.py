"""Physical checks of a whole model that no single key can make.

The schema (:mod:`axialfe.io.schema`) bounds each value on its own.  Some
limits only show once the model is assembled: with a reference temperature,
every segment in every case and combination must stay above absolute zero
(a change of -300 K from 20 degC is no temperature at all).
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError

__all__ = ["check_absolute_temperatures"]


def check_absolute_temperatures(model, place_line=None):
    """Refuse a case or combination that takes a segment to or below absolute zero.

    Parameters
    ----------
    model : Model
    place_line : callable, optional
        ``place -> line`` of the file, to locate the message.
    """
    ref = model.reference_temperature
    if ref is None or not isinstance(ref, float) or not model.segments:
        return
    from ..model.cases import load_states

    n_cases = len(model.all_cases)
    for k, state in enumerate(load_states(model)):
        dT = np.asarray(state.dT, dtype=float)
        if not dT.size or float(dT.min()) + ref > 0:
            continue
        j = int(np.argmin(dT))
        if k < n_cases:
            place = (f"cases[{k + 1}] ('{state.name}')" if model.cases
                     else f"segments[{j + 1}] ('{model.segments[j].name}')")
        else:
            place = f"combinations[{k - n_cases + 1}] ('{state.name}')"
        raise ModelError(f"segment '{model.segments[j].name}' would stand at "
                         f"{ref + float(dT[j]):.6g} K, at or below absolute zero (reference "
                         f"{ref:.6g} K, change {float(dT[j]):.6g} K)", place=place,
                         file=model.source, line=place_line(place) if place_line else None)


MAX_SWEEP_CHANGE = 1e5      # K, as the schema's temperature changes
MAX_LOAD_FACTOR = 1e6


def check_sweep_range(model, parameter, start, stop, unit):
    """Refuse a sweep range outside the physical ranges (in the range's own ``unit``)."""
    from ..units import temperature_to_kelvin, unit_factor

    where = f"--{parameter.replace('_', '-')}"
    if parameter in ("load_factor", "temperature_factor"):
        word = parameter.split("_")[0]
        for v in (start, stop):
            if not abs(v) <= MAX_LOAD_FACTOR:
                raise ModelError(f"a {word} factor must lie between {-MAX_LOAD_FACTOR:g} and "
                                 f"{MAX_LOAD_FACTOR:g}: got {v:g}", place=where)
        return
    if parameter == "temperature":
        for v in (start, stop):
            kelvin = temperature_to_kelvin(v, unit)
            if not kelvin <= MAX_SWEEP_CHANGE:
                raise ModelError(f"a temperature must be at most {MAX_SWEEP_CHANGE:g} K: got "
                                 f"{v:g} {unit}", place=where)
        return
    factor = unit_factor(unit, "temperature_difference")
    for v in (start, stop):
        change = v * factor
        if not abs(change) <= MAX_SWEEP_CHANGE:
            raise ModelError(f"a temperature change must lie between {-MAX_SWEEP_CHANGE:g} and "
                             f"{MAX_SWEEP_CHANGE:g} K: got {v:g} {unit}", place=where)
        ref = model.reference_temperature
        if isinstance(ref, float) and ref + change <= 0:
            raise ModelError(f"a change of {v:g} {unit} from the reference {ref:.6g} K is at or "
                             "below absolute zero", place=where)


MIN_SEGMENT_LENGTH = 1e-6   # m: a micrometre
MAX_SEGMENT_LENGTH = 1e5    # m


def check_segment_lengths(model, place_line=None):
    """Refuse a segment shorter than a micrometre or longer than 100 km (stations' distance)."""
    x = {st.name: st.x for st in model.stations}
    for i, seg in enumerate(model.segments):
        a, b = x[seg.start], x[seg.end]
        if not (isinstance(a, float) and isinstance(b, float)):
            continue
        length = abs(b - a)
        if MIN_SEGMENT_LENGTH <= length <= MAX_SEGMENT_LENGTH:
            continue
        place = f"segments[{i + 1}] ('{seg.name}')"
        raise ModelError(f"a length of {length:g} m between '{seg.start}' and '{seg.end}' lies "
                         f"outside {MIN_SEGMENT_LENGTH:g} m to {MAX_SEGMENT_LENGTH:g} m",
                         place=place, file=model.source,
                         line=place_line(place) if place_line else None)
