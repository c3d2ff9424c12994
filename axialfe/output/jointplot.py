"""The joint diagram: bolt and clamp force against the external load, in the project's style.

For each state the bolt force rises with slope C from its preload and the
clamp force falls with slope 1 - C until the joint separates; from there the
bolt carries the load alone (slope 1) and the clamp force is zero.  The lines
come from the axial model the joint built (:func:`axialfe.joints.joint.diagram_lines`);
the states' own loads are marked, with the bolt's proof load (over the safety
factor) and the minimum clamp force as limits.  Drawn on matplotlib's Agg
canvas without pyplot, with the palette of :mod:`axialfe.output.plot`
(tension colour for the bolt, compression colour for the clamped parts).
"""

from __future__ import annotations

from ..units import OutputUnits
from .plot import (COMPRESSION, DPI, INK, LANE_STYLES, MUTED, TENSION, _style_axes, _suffix,
                   _text, save_figure)

__all__ = ["plot_joint", "plot_joint_sweep"]


def plot_joint(result, path=None, units: OutputUnits | None = None, dpi: int = DPI):
    """Draw the joint diagram of a solved joint, and write it to ``path`` when given.

    Parameters
    ----------
    result : JointResult
    path : str or Path, optional
        A ``.png`` or ``.svg`` file.
    units : OutputUnits, optional

    Returns
    -------
    matplotlib.figure.Figure
    """
    from matplotlib.figure import Figure

    from ..joints.joint import diagram_lines

    if path is not None:
        _suffix(path)
    joint = result.joint
    units = units or joint.units
    fF = units.factor("force")
    fig = Figure(figsize=(10.0, 6.5), dpi=dpi, layout="constrained")
    ax = fig.subplots()
    _style_axes(ax)
    lines = diagram_lines(result)
    for i, line in enumerate(lines):
        style = LANE_STYLES[i % len(LANE_STYLES)]
        P = [p / fF for p in line.loads]
        ax.plot(P, [f / fF for f in line.bolt], color=TENSION, linestyle=style, linewidth=1.6,
                label=_text(f"bolt, {line.state}"))
        ax.plot(P, [f / fF for f in line.clamp], color=COMPRESSION, linestyle=style,
                linewidth=1.6, label=_text(f"clamped parts, {line.state}"))
        if line.state != "assembly" or line.external_load:
            x = line.external_load / fF
            for y, colour in ((line.bolt_force, TENSION), (line.clamp_force, COMPRESSION)):
                ax.plot([x], [y / fF], marker="o", markersize=5, color=colour,
                        markeredgecolor=INK, markeredgewidth=0.6, linestyle="none")
            ax.annotate(_text(line.state), (x, line.bolt_force / fF), textcoords="offset points",
                        xytext=(5, 5), fontsize=7.5, color=INK)
        sep = line.loads[1] if len(line.loads) == 3 else None
        if sep:
            ax.plot([sep / fF], [0.0], marker="v", markersize=6, color=INK, linestyle="none")
    if joint.proof_strength is not None:
        proof = joint.proof_strength * joint.thread.tensile_stress_area / joint.safety_factor
        ax.axhline(proof / fF, color=MUTED, linestyle=(0, (6, 3)), linewidth=1.0)
        ax.annotate(f"bolt proof load / safety factor {joint.safety_factor:g}", (0, proof / fF),
                    textcoords="offset points", xytext=(4, 3), fontsize=7.5, color=MUTED)
    if joint.minimum_clamp_force is not None:
        ax.axhline(joint.minimum_clamp_force / fF, color=MUTED, linestyle=(0, (1, 2)),
                   linewidth=1.0)
        ax.annotate("minimum clamp force", (0, joint.minimum_clamp_force / fF),
                    textcoords="offset points", xytext=(4, 3), fontsize=7.5, color=MUTED)
    ax.set_xlim(left=0)
    ax.set_ylim(bottom=0)
    ax.set_xlabel(f"external load P, pulling the parts apart [{units.force}]", fontsize=8,
                  color=INK)
    ax.set_ylabel(f"force [{units.force}]", fontsize=8, color=INK)
    ax.legend(fontsize=7.5, frameon=False, loc="upper left", ncol=2)
    fig.suptitle(_text(f"{joint.title}: joint diagram (C = {joint.joint_constant:.3f}; "
                       "triangles mark the separation loads)"), fontsize=10, color=INK,
                 x=0.01, ha="left")
    if path is not None:
        save_figure(fig, path, dpi)
    return fig


def plot_joint_sweep(sweep, path=None, units: OutputUnits | None = None, dpi: int = DPI):
    """Draw bolt and clamp force against the swept temperature, the exact events marked.

    Parameters
    ----------
    sweep : JointSweep
    path : str or Path, optional
        A ``.png`` or ``.svg`` file.

    Returns
    -------
    matplotlib.figure.Figure
    """
    from matplotlib.figure import Figure

    if path is not None:
        _suffix(path)
    joint = sweep.joint
    units = units or joint.units
    fF = units.factor("force")
    fig = Figure(figsize=(10.0, 6.5), dpi=dpi, layout="constrained")
    ax = fig.subplots()
    _style_axes(ax)
    from ..joints.joint import sweep_joint

    # the grid, with the states at the events themselves, so that a kink is drawn where it is
    points = list(zip(sweep.values, sweep.states))
    for _, _, value in sweep.events:
        at = sweep_joint(joint, value, value, 2, unit=sweep.unit, state=sweep.state,
                         part=sweep.part).states[0]
        points.append((value, at))
    points.sort(key=lambda p: p[0])
    x = [p[0] for p in points]
    ax.plot(x, [p[1].bolt_force / fF for p in points], color=TENSION, linewidth=1.6,
            label="bolt force")
    ax.plot(x, [p[1].clamp_force / fF for p in points], color=COMPRESSION, linewidth=1.6,
            label="clamp force")
    ax.plot(sweep.values, [s.bolt_force / fF for s in sweep.states], color=TENSION, marker=".",
            linestyle="none")
    ax.plot(sweep.values, [s.clamp_force / fF for s in sweep.states], color=COMPRESSION,
            marker=".", linestyle="none")
    if joint.proof_strength is not None:
        proof = joint.proof_strength * joint.thread.tensile_stress_area / joint.safety_factor
        ax.axhline(proof / fF, color=MUTED, linestyle=(0, (6, 3)), linewidth=1.0,
                   label=f"bolt proof load / safety factor {joint.safety_factor:g}")
    if joint.minimum_clamp_force is not None:
        ax.axhline(joint.minimum_clamp_force / fF, color=MUTED, linestyle=(0, (1, 2)),
                   linewidth=1.0, label="minimum clamp force")
    for name, event, value in sweep.events:
        ax.axvline(value, color=INK, linewidth=0.8, linestyle=(0, (3, 2)))
        ax.annotate(_text(f"{event} {value:.4g}"), (value, 0), xycoords=("data", "axes fraction"),
                    textcoords="offset points", xytext=(3, 4), rotation=90, fontsize=7.5,
                    color=INK)
    what = "all parts" if sweep.part is None else f"'{sweep.part}'"
    ax.set_xlabel(_text(f"temperature of {what} in state '{sweep.state}' [{sweep.unit}]"),
                  fontsize=8, color=INK)
    ax.set_ylabel(f"force [{units.force}]", fontsize=8, color=INK)
    ax.set_ylim(bottom=0)
    ax.legend(fontsize=7.5, frameon=False)
    fig.suptitle(_text(f"{joint.title}: temperature sweep (events exact, not read off the "
                       "grid)"), fontsize=10, color=INK, x=0.01, ha="left")
    if path is not None:
        save_figure(fig, path, dpi)
    return fig
