"""The built-in materials: a source for every value, the bolt classes and piping steels, the listing."""

from __future__ import annotations

import os

import pytest

from axialfe import builtin_materials
from axialfe.io.modelfile import _builtin_table
from axialfe.joints.grades import ISO_CLASSES
from axialfe.output.materialtext import VALUES

from conftest import EXAMPLES

# A source names a standard, a handbook or a table, or says how it is known.
_KNOWN = ("ISO ", "ASTM ", "ASME ", "EN 1993", "EN 1991", "AISC", "Aluminum Association",
          "from memory", "common practice")


def test_every_value_of_every_material_names_its_source():
    for name, entry in _builtin_table().items():
        sources = entry.get("sources", {})
        for key, _ in VALUES:
            if key in entry:
                assert key in sources, f"{name}: {key} has no source"
                assert any(k in sources[key] for k in _KNOWN), f"{name}: {key}: {sources[key]}"
        assert set(sources) <= {key for key, _ in VALUES} and set(sources) <= set(entry)


def test_bolt_classes_agree_with_the_joint_grades():
    # ISO 898-1 proof stresses, as grades.py has them (Shigley's Mechanical Engineering
    # Design, 10th ed., Table 8-11, tabulates the same values; from memory)
    table = _builtin_table()
    mats = builtin_materials()
    for cls in ("4.6", "5.8", "8.8", "10.9", "12.9"):
        entry = table[f"bolt-{cls}"]
        proof = ISO_CLASSES[cls][0][1] * 1e6
        from axialfe.units import parse_quantity

        assert parse_quantity(entry["proof_strength"], "stress") == pytest.approx(proof)
        # the class name is R_m/100 . R_e/R_m (ISO 898-1, the designation system, from memory)
        nominal_rm = float(cls.split(".")[0]) * 100e6
        ratio = float("0." + cls.split(".")[1])
        rm = parse_quantity(entry["tensile_strength"], "stress")
        assert nominal_rm <= rm <= nominal_rm * 1.05
        assert mats[f"bolt-{cls}"].yield_strength == pytest.approx(
            {"4.6": 240e6, "5.8": 420e6, "8.8": 640e6, "10.9": 940e6, "12.9": 1100e6}[cls])
        assert mats[f"bolt-{cls}"].yield_strength >= ratio * nominal_rm * 0.999


def test_piping_steels():
    mats = builtin_materials()
    # ASTM A106 grade B: 35 ksi yield; ASTM A312 TP304/TP316: 30 ksi (from memory)
    ksi = 6.894757293168e6
    assert mats["carbon-steel-pipe"].yield_strength == pytest.approx(35 * ksi, rel=0.01)
    for name in ("stainless-pipe-304", "stainless-pipe-316"):
        assert mats[name].yield_strength == pytest.approx(30 * ksi, rel=0.01)
        # austenitic steel expands about 1.3 times as much as carbon steel (common practice)
        assert mats[name].thermal_expansion / mats["carbon-steel-pipe"].thermal_expansion == \
            pytest.approx(1.33, rel=0.02)


def test_a_bolt_class_is_used_by_name(tmp_path, cli):
    path = tmp_path / "bolt.toml"
    path.write_text("""[sections.s]
shape = "area"
area = "58 mm^2"
[stations]
head = "0 mm"
nut = "40 mm"
[[segments]]
name = "bolt"
from = "head"
to = "nut"
material = "bolt-8.8"
section = "s"
[[supports]]
at = "head"
[[loads]]
at = "nut"
force = "30 kN"
""", encoding="utf-8")
    res = cli("check", path)
    # 30 kN / 58 mm^2 = 517 MPa against R_p0.2 = 640 MPa: utilisation 0.808
    assert res.exit_code == 0, res.output
    assert "strength  bolt  517.2 MPa  640 MPa         0.808  pass" in res.stdout


def test_materials_listing_in_si_us_and_the_models_units(cli):
    si = cli("materials").stdout
    assert si.startswith("built-in materials (values in MPa, /K;")
    assert "    yield_strength              250 MPa\n" in si
    assert '\nbolt-8.8: Bolt steel, ISO 898-1 property class 8.8' in si
    us = cli("materials", "--system", "US").stdout
    # 250 MPa = 36259.4 psi; 11.7e-6 /K = 6.5e-6 /degF; 7850 kg/m^3 = 0.2836 lb/in^3
    assert "    yield_strength              36259.4 psi\n" in us
    assert "    thermal_expansion           6.5e-06 /degF\n" in us
    assert "    density                     0.2836 lb/in^3\n" in us
    model = cli("materials", os.path.join(EXAMPLES, "pipe-between-anchors.toml")).stdout
    assert model.startswith("built-in materials (values in psi, /degF;")
    assert max(len(line) for line in si.splitlines()) <= 100
    bad = cli("materials", "--system", "CGS")
    assert bad.exit_code == 2
