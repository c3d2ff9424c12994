"""Bolt property classes and grades: proof strengths, and the bolting steel they stand for.

- ISO 898-1 (2013, Table 5 "proof load stress", from memory) for metric bolts
  up to M39: 4.6 225 MPa, 4.8 310, 5.6 280, 5.8 380, 6.8 440, 8.8 580 MPa for
  d <= 16 mm and 600 MPa above, 9.8 650 MPa (d <= 16 mm only), 10.9 830 MPa,
  12.9 970 MPa.  Shigley's Mechanical Engineering Design, 10th ed., Table 8-11,
  tabulates the same values.
- SAE J429 (as tabulated in Shigley, 10th ed., Table 8-9, from memory) for inch
  bolts 1/4 to 1 1/2 in: grade 1 33 kpsi; grade 2 55 kpsi to 3/4 in, 33 kpsi
  above; grade 4 65 kpsi; grade 5 85 kpsi to 1 in, 74 kpsi above; grade 5.2
  85 kpsi to 1 in; grade 7 105 kpsi; grade 8 120 kpsi; grade 8.2 120 kpsi to 1 in.

A class or grade takes bolting steel, E = 205 GPa and alpha = 11.5e-6 /K:
typical room-temperature values of carbon and alloy bolting steel (common
practice in bolt calculations; from memory), reported with the results.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import ModelError, suggest
from ..model import Material

__all__ = ["Grade", "iso_class", "sae_grade", "bolting_steel", "ISO_CLASSES", "SAE_GRADES",
           "BOLTING_STEEL_SOURCE"]

KSI = 6.894757293168e6   # Pa per kpsi (NIST SP 811, 2008, B.8)
INCH = 0.0254

BOLTING_STEEL_SOURCE = ("bolting steel: E = 205 GPa and alpha = 11.5e-6 /K, typical "
                        "room-temperature values of carbon and alloy bolt steels (common "
                        "practice, from memory)")

# class -> ((largest diameter in mm, proof strength in MPa), ...) in increasing size
ISO_CLASSES = {
    "4.6": ((39, 225),), "4.8": ((39, 310),), "5.6": ((39, 280),), "5.8": ((39, 380),),
    "6.8": ((39, 440),), "8.8": ((16, 580), (39, 600)), "9.8": ((16, 650),),
    "10.9": ((39, 830),), "12.9": ((39, 970),),
}
# grade -> ((largest diameter in inches, proof strength in kpsi), ...); smallest size 1/4 in
SAE_GRADES = {
    "1": ((1.5, 33),), "2": ((0.75, 55), (1.5, 33)), "4": ((1.5, 65),),
    "5": ((1.0, 85), (1.5, 74)), "5.2": ((1.0, 85),), "7": ((1.5, 105),), "8": ((1.5, 120),),
    "8.2": ((1.0, 120),),
}


@dataclass(frozen=True)
class Grade:
    """The strength basis of a bolt: its proof strength (Pa) and where it comes from."""

    name: str
    proof_strength: float
    source: str


def bolting_steel(name: str) -> Material:
    """The bolting steel a property class or grade stands for."""
    return Material(f"bolting steel ({name})", 205e9, 11.5e-6, source=BOLTING_STEEL_SOURCE)


def iso_class(name: str, diameter: float) -> Grade:
    """The ISO 898-1 proof strength of class ``name`` for a bolt of ``diameter`` (m).

    >>> iso_class("8.8", 0.016).proof_strength / 1e6, iso_class("8.8", 0.020).proof_strength / 1e6
    (580.0, 600.0)
    """
    if name not in ISO_CLASSES:
        raise ModelError(f"unknown property class '{name}'", hint=suggest(name, ISO_CLASSES),
                         options=ISO_CLASSES)
    d_mm = diameter * 1e3
    for largest, proof in ISO_CLASSES[name]:
        if d_mm <= largest + 1e-9:
            return Grade(f"ISO 898-1 property class {name}", proof * 1e6,
                         f"ISO 898-1, proof load stress of class {name} for d = {d_mm:g} mm "
                         "(from memory)")
    top = ISO_CLASSES[name][-1][0]
    raise ModelError(f"ISO 898-1 gives property class {name} a proof strength only up to "
                     f"{top} mm diameter: got {d_mm:g} mm; give 'material' with a proof_strength")


def sae_grade(name: str, diameter: float) -> Grade:
    """The SAE J429 proof strength of grade ``name`` ('SAE 5' or '5') for ``diameter`` (m).

    >>> round(sae_grade("SAE 5", 0.5 * 0.0254).proof_strength / 6.894757293168e6, 6)
    85.0
    """
    key = name.removeprefix("SAE").strip()
    if key not in SAE_GRADES:
        raise ModelError(f"unknown SAE J429 grade '{name}'",
                         hint=suggest(name, [f"SAE {g}" for g in SAE_GRADES]),
                         options=[f"SAE {g}" for g in SAE_GRADES])
    d_in = diameter / INCH
    if d_in < 0.25 - 1e-9:
        raise ModelError(f"SAE J429 grades start at 1/4 in: got {d_in:g} in; give 'material' "
                         "with a proof_strength")
    for largest, proof in SAE_GRADES[key]:
        if d_in <= largest + 1e-9:
            return Grade(f"SAE J429 grade {key}", proof * KSI,
                         f"SAE J429 grade {key}, minimum proof strength for d = {d_in:g} in "
                         "(from memory, as tabulated in Shigley, 10th ed., Table 8-9)")
    raise ModelError(f"SAE J429 gives grade {key} a proof strength only up to "
                     f"{SAE_GRADES[key][-1][0]:g} in: got {d_in:g} in")
