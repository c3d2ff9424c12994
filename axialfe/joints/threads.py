"""Screw threads: ISO metric coarse and fine, unified inch (UNC, UNF), with stress areas.

A designation in, a :class:`Thread` out: nominal (major) diameter, pitch, and
the tensile stress area

- ISO metric: A_t = (pi/4)*(d - 0.9382*P)^2 (ISO 898-1, the stress area of the
  mean of pitch and minor diameter);
- unified inch: A_t = (pi/4)*(d - 0.9743/n)^2, n threads per inch (ASME B1.1;
  the same formula as Shigley's Mechanical Engineering Design, 10th ed., Table 8-2);

and the shank area A_d = (pi/4)*d^2.

Data (from memory, to be checked against the standards): ISO metric coarse
pitches of ISO 261 for M3 to M64; fine pitches of ISO 261's series (any of
0.2 to 4 mm finer than the coarse pitch of the size); unified coarse and fine
threads per inch of ASME B1.1 for #4 to 1 1/2 in.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from ..errors import ModelError, suggest

__all__ = ["Thread", "thread", "METRIC_COARSE", "UNIFIED"]

INCH = 0.0254

# ISO 261 coarse pitch (mm) by nominal diameter (mm), from memory
METRIC_COARSE = {
    3: 0.5, 3.5: 0.6, 4: 0.7, 5: 0.8, 6: 1.0, 7: 1.0, 8: 1.25, 10: 1.5, 12: 1.75, 14: 2.0,
    16: 2.0, 18: 2.5, 20: 2.5, 22: 2.5, 24: 3.0, 27: 3.0, 30: 3.5, 33: 3.5, 36: 4.0, 39: 4.0,
    42: 4.5, 45: 4.5, 48: 5.0, 52: 5.0, 56: 5.5, 60: 5.5, 64: 6.0,
}
# the pitches of ISO 261's fine series (mm), from memory
METRIC_FINE_PITCHES = (0.2, 0.25, 0.35, 0.5, 0.75, 1.0, 1.25, 1.5, 2.0, 3.0, 4.0)

# ASME B1.1 threads per inch: size -> (basic major diameter in inches, UNC, UNF), from memory
UNIFIED = {
    "#4": (0.112, 40, 48), "#5": (0.125, 40, 44), "#6": (0.138, 32, 40), "#8": (0.164, 32, 36),
    "#10": (0.190, 24, 32), "#12": (0.216, 24, 28),
    "1/4": (0.250, 20, 28), "5/16": (0.3125, 18, 24), "3/8": (0.375, 16, 24),
    "7/16": (0.4375, 14, 20), "1/2": (0.500, 13, 20), "9/16": (0.5625, 12, 18),
    "5/8": (0.625, 11, 18), "3/4": (0.750, 10, 16), "7/8": (0.875, 9, 14), "1": (1.000, 8, 12),
    "1 1/8": (1.125, 7, 12), "1 1/4": (1.250, 7, 12), "1 3/8": (1.375, 6, 12),
    "1 1/2": (1.500, 6, 12),
}

_METRIC = re.compile(r"^M(\d+(?:\.\d+)?)(?:\s*[xX×]\s*(\d+(?:\.\d+)?))?$")
_INCH = re.compile(r"^(#\d+|\d+(?:\s+\d+/\d+)?|\d+/\d+)\s*-\s*(\d+)\s+(UNC|UNF)$")


@dataclass(frozen=True)
class Thread:
    """One thread: sizes in m, areas in m^2.

    Attributes
    ----------
    designation : str
        As given, e.g. ``'M10'``, ``'M10x1.25'``, ``'3/8-16 UNC'``.
    system : {'metric', 'inch'}
    nominal_diameter, pitch : float
        d and P (for inch threads P = 1/n).
    threads_per_inch : int or None
    """

    designation: str
    system: str
    nominal_diameter: float
    pitch: float
    threads_per_inch: int | None = None

    def __post_init__(self):
        if not (self.nominal_diameter > 0 and 0 < self.pitch < self.nominal_diameter):
            raise ModelError(f"thread '{self.designation}': impossible diameter and pitch")

    @property
    def tensile_stress_area(self) -> float:
        """A_t: ISO 898-1 for metric threads, ASME B1.1 for unified ones."""
        d = self.nominal_diameter
        if self.system == "metric":
            return math.pi / 4 * (d - 0.9382 * self.pitch) ** 2
        return math.pi / 4 * (d - 0.9743 * INCH / self.threads_per_inch) ** 2

    @property
    def shank_area(self) -> float:
        """A_d = pi*d^2/4, the area of the unthreaded shank."""
        return math.pi / 4 * self.nominal_diameter ** 2


def thread(designation: str) -> Thread:
    """Read a thread designation.

    Examples
    --------
    >>> t = thread("M10")
    >>> t.pitch, round(t.tensile_stress_area * 1e6, 2)  # ISO 898-1: 58.0 mm^2
    (0.0015, 57.99)
    >>> round(thread("1/2-13 UNC").tensile_stress_area / 0.0254**2, 4)  # Shigley Table 8-2: 0.1419
    0.1419

    Raises
    ------
    ModelError
        For a designation that is not one of the sizes above.
    """
    text = " ".join(str(designation).split())
    m = _METRIC.match(text)
    if m:
        d = float(m.group(1))
        key = int(d) if d == int(d) else d
        if key not in METRIC_COARSE:
            near = sorted(METRIC_COARSE, key=lambda k: (abs(k - d), k))[:2]
            a, b = sorted(near)
            raise ModelError(f"unknown metric size 'M{m.group(1)}' (ISO 261 coarse M3 to M64); "
                             f"the nearest sizes are 'M{a:g}' and 'M{b:g}'")
        coarse = METRIC_COARSE[key]
        if m.group(2) is None:
            return Thread(text, "metric", d * 1e-3, coarse * 1e-3)
        pitch = float(m.group(2))
        if pitch >= coarse or pitch not in METRIC_FINE_PITCHES:
            fine = [f"M{m.group(1)}x{p:g}" for p in METRIC_FINE_PITCHES if p < coarse]
            raise ModelError(f"'{text}' is not a fine thread: a fine pitch of M{m.group(1)} is "
                             f"one of ISO 261's series below its coarse pitch {coarse:g} mm",
                             options=fine[-4:])
        return Thread(text, "metric", d * 1e-3, pitch * 1e-3)
    m = _INCH.match(text)
    if m:
        size, n, series = m.group(1), int(m.group(2)), m.group(3)
        if size not in UNIFIED:
            raise ModelError(f"unknown unified size '{size}' (ASME B1.1, #4 to 1 1/2)",
                             hint=suggest(size, UNIFIED))
        d_in, unc, unf = UNIFIED[size]
        want = unc if series == "UNC" else unf
        if n != want:
            raise ModelError(f"'{text}': {size} {series} has {want} threads per inch",
                             hint=f"{size}-{want} {series}")
        return Thread(text, "inch", d_in * INCH, INCH / n, n)
    raise ModelError(f"cannot read the thread size '{designation}': give e.g. 'M10', "
                     "'M10x1.25' or '3/8-16 UNC'")

