"""A model's tables against temperature, evaluated at each segment's temperature in a case.

A material may give its modulus, yield strength and expansion as tables
against temperature (:class:`~axialfe.model.parts.PropertyTable`).  The
solvers work with constant properties; for one load state this module gives
the model whose segments carry, each, the properties at that segment's
temperature T = T0 + dT: E(T) (or E(T0) with ``modulus_at = "reference"``),
f_y(T), and the expansion coefficient whose product with dT is the free
thermal strain of :func:`axialfe.mechanics.thermal.free_strain` (the secant
from T0).  A temperature outside a table's range is one located error.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from ..errors import ModelError
from ..mechanics.thermal import free_strain, interpolate, outside
from ..units import kelvin_to_temperature

__all__ = ["has_tables", "at_temperature", "basis_note", "refuse_tables",
           "refuse_tabled_preloads", "constant_compression_note"]


def has_tables(model) -> bool:
    """Whether any segment's material gives a property against temperature."""
    if getattr(model.segments, "constant_properties", False):
        return False   # a model from arrays: plain values, and no object made per segment
    return any(seg.material.tabled for seg in model.segments)


def refuse_tables(model, what: str, instead: str) -> None:
    """Refuse a model with tables against temperature where ``what`` cannot follow them."""
    tabled = [seg.material.name for seg in model.segments if seg.material.tabled]
    if tabled:
        raise ModelError(f"{what} takes constant properties, and material '{tabled[0]}' gives "
                         f"them against temperature: {instead}", file=model.source,
                         line=model.line_of(f"materials.{tabled[0]}"),
                         place=f"materials.{tabled[0]}")


def refuse_tabled_preloads(model) -> None:
    """Refuse a preload (a force) in a model with tables: its misfit is not searched for there."""
    preloaded = [model.segments[i].name for i in np.flatnonzero(~np.isnan(model.arrays.preload))]
    if preloaded and has_tables(model):
        raise ModelError("a preload in a model with properties against temperature is not "
                         "solved: give the misfit instead, or constant properties",
                         file=model.source, line=model.line_of(f"segments.{preloaded[0]}"),
                         place=f"segments ('{preloaded[0]}')")


def constant_compression_note(model):
    """A note where a yield strength follows a table but the compressive one is a constant."""
    names = sorted({seg.material.name for seg in model.segments
                    if seg.material.yield_table is not None
                    and seg.material.compressive_yield_strength is not None})
    if not names:
        return None
    return ("the compressive yield strength of " + ", ".join(f"'{n}'" for n in names)
            + " is a constant and does not follow the yield strength's table against "
            "temperature: give the value at the temperature of interest")


def basis_note(model) -> str:
    """Which temperature each tabled property is taken at (for the output)."""
    T0 = model.reference_temperature
    where = (f"E at the reference temperature {_degc(T0)} (settings.modulus_at = \"reference\")"
             if model.modulus_at == "reference" else "E at each segment's temperature")
    return (f"properties from tables against temperature: {where}, f_y at each segment's "
            f"temperature, thermal strain from {_degc(T0)} by the tables' own reference")


def _degc(T):
    return f"{float(kelvin_to_temperature(T, 'degC')):.6g} degC"


def _table_value(model, seg, table, key, T, context):
    if outside(table.temperatures, T):
        lo, hi = table.span
        where = (f"the reference temperature is {_degc(T)}"
                 if T == model.reference_temperature else
                 f"segment '{seg.name}' is at {_degc(T)} {context}")
        raise ModelError(f"{key}: the table covers {_degc(lo)} to {_degc(hi)}, but {where}: "
                         "extend the table or check the temperature", file=model.source,
                         line=(model.line_of(f"materials.{seg.material.name}.{key}")
                               or model.line_of(f"materials.{seg.material.name}")),
                         place=f"materials.{seg.material.name}")
    return float(interpolate(table.temperatures, table.values, T))


def at_temperature(model, state, context=None):
    """The model with each tabled segment's properties at its temperature in ``state``.

    Parameters
    ----------
    model : Model
    state : LoadState
        Its ``dT`` gives each segment's temperature change from the reference.
    context : str, optional
        Where the state stands, for the error of a temperature outside a table
        (default ``"in case 'NAME'"``).

    Returns
    -------
    Model
        ``model`` itself when nothing is tabled.

    Raises
    ------
    ModelError
        When a segment's temperature (or the reference) lies outside a table.
    """
    if not has_tables(model):
        return model
    T0 = model.reference_temperature
    context = context or f"in case '{state.name}'"
    segments = []
    for i, seg in enumerate(model.segments):
        mat = seg.material
        if not mat.tabled:
            segments.append(seg)
            continue
        dT = float(state.dT[i])
        T = T0 + dT
        changes = {}
        if mat.expansion_table is not None:   # first: it is read at the reference too
            table = mat.expansion_table
            key = ("mean_thermal_expansion" if mat.expansion_kind == "mean"
                   else "thermal_expansion_total")
            for at in (T0, T):
                _table_value(model, seg, table, key, at, context)
            strain = float(free_strain(mat.expansion_kind, table.temperatures, table.values,
                                       table.reference, T0, T))
            changes["thermal_expansion"] = strain / dT if dT != 0 else 0.0
        if mat.modulus_table is not None:
            changes["elastic_modulus"] = _table_value(
                model, seg, mat.modulus_table, "elastic_modulus",
                T0 if model.modulus_at == "reference" else T, context)
        if mat.yield_table is not None:
            changes["yield_strength"] = _table_value(model, seg, mat.yield_table,
                                                     "yield_strength", T, context)
        segments.append(dataclasses.replace(seg, material=dataclasses.replace(mat, **changes)))
    return dataclasses.replace(model, segments=tuple(segments))

