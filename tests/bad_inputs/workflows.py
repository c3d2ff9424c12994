"""The corpus of bad toleranced values in joint and fit files.

Each entry is ``(name, kind, text)``: a joint or fit file (the examples of
``examples/tolerance/`` spoilt in one place) that ``axialfe tolerance`` must
refuse with one located ``error:`` line and exit code 2: malformed
tolerances, tolerances on keys that take none, ranges of draws that leave the
physical range, geometries that cannot be assembled within the box.  The
expected lines live in ``workflows_expected.txt`` beside this file; regenerate
them with ``python tests/bad_inputs/workflows.py`` and review the difference.
"""

from __future__ import annotations

import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
EXPECTED = os.path.join(HERE, "workflows_expected.txt")
_EXAMPLES = os.path.join(HERE, os.pardir, os.pardir, "examples", "tolerance")
FILES = {"joint": "cover-bolt-stack-tolerances.toml", "fit": "gear-hub-shrink-fit-scatter.toml"}

# (name, kind, the text replaced, its replacement)
SPOILS = [
    # joint files
    ("joint:trailing-plus-minus", "joint", 'torque = "40 N*m ±3"', 'torque = "40 N*m ±"'),
    ("joint:deviation-with-unit", "joint", 'torque = "40 N*m ±3"', 'torque = "40 N*m ±3 N*m"'),
    ("joint:deviations-reversed", "joint", 'thickness = "16 mm +0.2/-0.1"',
     'thickness = "16 mm -0.1/+0.2"'),
    ("joint:torque-unit", "joint", 'torque = "40 N*m ±3"', 'torque = "40 mm ±3"'),
    ("joint:nut-factor-with-unit", "joint",
     'nut_factor = { value = 0.2, plus = 0.03, minus = 0.03, distribution = "uniform" }',
     'nut_factor = "0.2 mm ±0.03"'),
    ("joint:nut-factor-table-key", "joint",
     'nut_factor = { value = 0.2, plus = 0.03, minus = 0.03, distribution = "uniform" }',
     'nut_factor = { value = 0.2, plus = 0.03, minsu = 0.03 }'),
    ("joint:nut-factor-distribution", "joint", 'distribution = "uniform" }',
     'distribution = "triangular" }'),
    ("joint:nut-factor-to-zero", "joint",
     'nut_factor = { value = 0.2, plus = 0.03, minus = 0.03, distribution = "uniform" }',
     'nut_factor = { value = 0.2, plus = 0.03, minus = 0.2, distribution = "uniform" }'),
    ("joint:thickness-to-zero", "joint", 'thickness = "12 mm ±0.3"', 'thickness = "12 mm ±7"'),
    ("joint:torque-to-zero", "joint", 'torque = "40 N*m ±3"', 'torque = "40 N*m ±35"'),
    ("joint:modulus-to-zero", "joint", 'elastic_modulus = "70 GPa ±3"',
     'elastic_modulus = "70 GPa ±40"'),
    ("joint:below-absolute-zero", "joint", 'temperature = "-30 degC"',
     'temperature = "-30 degC ±300"'),
    ("joint:bolt-too-long", "joint", 'length = "50 mm"', 'length = "50 mm ±8"'),
    ("joint:bolt-shorter-than-grip", "joint", 'length = "50 mm"', 'length = "32 mm ±1"'),
    ("joint:not-allowed-safety-factor", "joint", 'minimum_clamp_force = "10 kN"',
     'minimum_clamp_force = "10 kN"\nsafety_factor = "1.5 ±0.1"'),
    ("joint:not-allowed-size", "joint", 'size = "M10"', 'size = "M10 ±1"'),
    ("joint:not-allowed-poisson", "joint", "poissons_ratio = 0.33", 'poissons_ratio = "0.33 ±0.01"'),
    # fit files
    ("fit:trailing-plus-minus", "fit", 'friction = "0.14 ±0.03"', 'friction = "0.14 ±"'),
    ("fit:friction-with-unit", "fit", 'friction = "0.14 ±0.03"', 'friction = "0.14 mm ±0.03"'),
    ("fit:friction-to-zero", "fit", 'friction = "0.14 ±0.03"', 'friction = "0.14 ±0.08"'),
    ("fit:outer-diameter-to-fit", "fit", 'outer_diameter = "68 mm ±0.4"',
     'outer_diameter = "68 mm ±15"'),
    ("fit:distribution-unknown", "fit", 'distribution = "uniform" ',
     'distribution = "uniformly" '),
    ("fit:distribution-without-limits", "fit", 'iso = "40 H7/s6"',
     'interference = "0.04 mm ±0.01"'),
    ("fit:diameter-with-iso", "fit", "[shaft]\n", '[shaft]\ndiameter = "40 mm ±0.01"\n'),
    ("fit:deviation-with-unit", "fit", 'length = "24 mm"', 'length = "24 mm ±0.1 mm"'),
    ("fit:length-to-zero", "fit", 'length = "24 mm"', 'length = "24 mm +1/-30"'),
    ("fit:below-absolute-zero", "fit", 'shaft_temperature = "75 degC ±5"',
     'shaft_temperature = "75 degC ±400"'),
    ("fit:torque-table-std", "fit", 'torque = "300 N*m ±40"',
     'torque = { value = "300 N*m", std = "-4 N*m" }'),
    ("fit:not-allowed-safety-factor", "fit", '[[service]]\nname = "start"',
     '[checks]\nsafety_factor = "1.5 ±0.2"\n\n[[service]]\nname = "start"'),
    ("fit:not-allowed-assembly-clearance", "fit", 'assembly_temperature = "20 degC"',
     'assembly_temperature = "20 degC"\nassembly_clearance = "0.04 mm ±0.01"'),
]


def all_cases():
    texts = {}
    for kind, name in FILES.items():
        with open(os.path.join(_EXAMPLES, name), encoding="utf-8") as fh:
            texts[kind] = fh.read()
    out = []
    for name, kind, old, new in SPOILS:
        if old not in texts[kind]:
            raise AssertionError(f"{name}: {old!r} is not in the {kind} example")
        out.append((name, kind, texts[kind].replace(old, new, 1)))
    return out


def outcome(kind, text, folder):
    """The command's exit code and its ``error:`` lines for ``text`` as ``<kind>.toml``."""
    from typer.testing import CliRunner

    from axialfe.cli import app

    path = os.path.join(folder, f"{kind}.toml")
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(text)
    res = CliRunner().invoke(app, ["tolerance", path, "--samples", "20"])
    lines = [s.replace(folder + os.sep, "") for s in res.stderr.splitlines()
             if s.startswith("error:")]
    return res.exit_code, lines


def regenerate():
    import tempfile

    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        for name, kind, text in all_cases():
            code, lines = outcome(kind, text, tmp)
            rows.append(f"{name}\t{code}\t{' | '.join(lines)}")
    with open(EXPECTED, "w", encoding="utf-8") as fh:
        fh.write("\n".join(rows) + "\n")
    print(f"wrote {len(rows)} expected lines to {EXPECTED}")


if __name__ == "__main__":
    sys.path.insert(0, os.path.join(HERE, os.pardir, os.pardir))
    regenerate()
