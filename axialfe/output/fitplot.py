"""The diagram of a press or shrink fit: pressure and stresses against a uniform temperature.

Two panels over a shared temperature axis (both parts at the same temperature):
the contact pressure at the least and at the greatest interference, with the
range where the fit is loose shaded and the loosening temperature marked; and
the largest equivalent stress of hub and shaft at the greatest interference
against each part's yield strength over the safety factor.  States whose two
parts share one temperature are marked on the curves.  Drawn with matplotlib's
object interface on the Agg canvas, in the project's palette.
"""

from __future__ import annotations

import numpy as np

from ..fits.fit import FitResult, FitUnits, state_at
from .plot import COMPRESSION, DPI, INK, MUTED, TENSION, _style_axes, _text, save_figure

__all__ = ["plot_fit"]

_KELVIN = 273.15
_SAMPLES = 241


def _range(result: FitResult):
    temps = [t for s in result.states for t in (s.shaft_temperature, s.hub_temperature)]
    if result.loosening_temperature is not None:
        temps.append(result.loosening_temperature)
    lo, hi = min(temps) - _KELVIN, max(temps) - _KELVIN
    pad = max(20.0, 0.15 * (hi - lo))
    return max(lo - pad, -_KELVIN), hi + pad


def plot_fit(result: FitResult, path=None, units: FitUnits | None = None, dpi: int = DPI):
    """Draw the fit's pressure and stresses against a uniform temperature.

    Parameters
    ----------
    result : FitResult
    path : str or Path, optional
        ``.png`` or ``.svg``; without it the figure is returned unsaved.
    units : FitUnits, optional

    Returns
    -------
    matplotlib.figure.Figure
    """
    from matplotlib.figure import Figure

    fit = result.fit
    units = units or fit.units
    stress = units.factor("stress")
    lo, hi = _range(result)
    temps = np.linspace(lo, hi, _SAMPLES)
    if result.loosening_temperature is not None and lo < result.loosening_temperature - _KELVIN < hi:
        temps = np.sort(np.append(temps, result.loosening_temperature - _KELVIN))
    states = [state_at(fit, t + _KELVIN) for t in temps]
    p_least = np.array([s.pressure[0] for s in states]) / stress
    p_most = np.array([s.pressure[1] for s in states]) / stress

    fig = Figure(figsize=(9.0, 6.6), dpi=dpi, layout="constrained")
    top, bottom = fig.subplots(2, 1, sharex=True)
    for ax in (top, bottom):
        _style_axes(ax)
    top.plot(temps, p_most, color=INK, linewidth=1.6, linestyle="--",
             label="at the greatest interference")
    top.plot(temps, p_least, color=TENSION, linewidth=1.8, label="at the least interference")
    loose = p_least <= 0
    if loose.any():
        top.fill_between(temps, 0, 1, where=loose, color=COMPRESSION, alpha=0.12, linewidth=0,
                         transform=top.get_xaxis_transform(),
                         label="loose at the least interference")
    if result.loosening_temperature is not None:
        t = result.loosening_temperature - _KELVIN
        if lo <= t <= hi:
            for ax in (top, bottom):
                ax.axvline(t, color=COMPRESSION, linewidth=1.0, linestyle=":")
            top.annotate(f"loosens at {t:.4g} degC", (t, 1.0), xycoords=("data", "axes fraction"),
                         xytext=(4, -12), textcoords="offset points", color=COMPRESSION,
                         fontsize=8)
    top.set_ylabel(f"contact pressure [{units.stress}]", fontsize=9, color=INK)
    top.set_ylim(0, 1.15 * max(float(p_most.max()), 1e-9))
    top.set_title(_text(fit.title) + " - both parts at one temperature", fontsize=10,
                  color=INK, loc="left")

    parts = (("hub", fit.hub, "hub_equivalent_stress", TENSION),
             ("shaft", fit.shaft, "shaft_equivalent_stress", INK))
    for role, mat, key, colour in parts:
        eq = np.array([getattr(s, key)[1] for s in states]) / stress
        bottom.plot(temps, eq, color=colour, linewidth=1.6, label=f"{role} ({_text(mat.name)})")
        if mat.yield_strength is not None:
            allow = mat.yield_strength / fit.safety_factor / stress
            bottom.axhline(allow, color=colour, linewidth=0.9, linestyle=(0, (6, 3)))
            bottom.annotate(f"{role}: yield / {fit.safety_factor:g} = {allow:.4g}",
                            (temps[-1], allow), xytext=(-2, 3), textcoords="offset points",
                            color=colour, fontsize=7.5, ha="right")
    bottom.set_ylabel(f"largest equivalent stress [{units.stress}]", fontsize=9, color=INK)
    bottom.set_xlabel("temperature of both parts [degC]", fontsize=9, color=INK)
    bottom.set_ylim(bottom=0)

    for s in result.states:
        if s.shaft_temperature != s.hub_temperature:
            continue
        t = s.shaft_temperature - _KELVIN
        if not lo <= t <= hi:
            continue
        top.plot([t, t], [s.pressure[0] / stress, s.pressure[1] / stress], color=MUTED,
                 marker="o", markersize=3.5, linewidth=0.8)
        top.annotate(_text(s.name), (t, s.pressure[1] / stress), xytext=(3, 4),
                     textcoords="offset points", fontsize=7.5, color=MUTED)
    top.legend(fontsize=7.5, frameon=False, loc="lower right")
    bottom.legend(fontsize=7.5, frameon=False, loc="lower right")
    if path is not None:
        save_figure(fig, path, dpi)
    return fig
