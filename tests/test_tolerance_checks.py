"""The check-fails events of model tolerance studies, against a brute-force loop of the checks.

Each sample's verdicts must be those of ``axialfe check`` on that sample's own
model (the file read again with the sample's values), whether the study
vectorises the checks or runs them one by one on a stated number of samples.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from typer.testing import CliRunner

from axialfe.checks import check_solution
from axialfe.cli import app
from axialfe.engine.system import solve
from axialfe.io.modelfile import parse_model
from axialfe.tolerance.study import CHECK_SAMPLES, _draw, run_study

runner = CliRunner()

# An invented strut between a fixed wall and a stop across a gap, loaded and heated: its
# strength, buckling, displacement and gap checks all lie near their limits.
MODEL = """
title = "strut against a stop"
[materials.steel]
elastic_modulus = "200 GPa"
thermal_expansion = "12e-6 /K"
yield_strength = "250 MPa"
[sections.rod]
shape = "round"
diameter = "DIAMETER"
[stations]
wall = "0 mm"
mid = { x = "400 mm", braced = true }
tip = { x = "800 mm", braced = true }
stop = "800 mm"
[[segments]]
name = "inner"
from = "wall"
to = "mid"
material = "steel"
section = "rod"
temperature_change = "40 K ±15"
[[segments]]
name = "outer"
from = "mid"
to = "tip"
material = "steel"
section = "rod"
[[supports]]
at = "wall"
[[supports]]
at = "stop"
[[gaps]]
name = "end"
between = ["tip", "stop"]
clearance = "0.15 mm ±0.06"
[[loads]]
at = "mid"
force = "-50 kN ±9"
[[limits]]
at = "mid"
displacement = "0.17 mm"
[[limits]]
gap = "end"
min_opening = "0.02 mm"
[checks]
safety_factor = 1.1
"""


def _brute_force(text, samples, seed):
    """Each sample's failing checks by the checks of 'axialfe check' on its own model."""
    model = parse_model(text, "m.toml")
    paths = [t.path for t in model.tolerances]
    x = _draw([t.tolerance for t in model.tolerances], samples, seed)
    counts, any_fails = {}, 0
    for row in x:
        report = check_solution(solve(parse_model(text, "m.toml", overrides=dict(zip(paths, row)))))
        failed = [f"{e.kind}:{e.name}" for e in report.cases[0].entries if e.ok is False]
        for name in failed:
            counts[name] = counts.get(name, 0) + 1
        any_fails += bool(failed)
    return counts, any_fails


def _study(text, samples, seed):
    model = parse_model(text, "m.toml")
    return run_study(model, lambda v: parse_model(text, "m.toml", overrides=v),
                     samples=samples, seed=seed, worst_case=False)


def _counts(study):
    got = {e["name"]: e["count"] for e in study.events if e["event"] == "check-fails"}
    return {k: v for k, v in got.items() if k != "checks"}, got["checks"]


def test_vectorised_check_fails_equal_a_loop_of_the_checks_on_each_sample():
    text = MODEL.replace("DIAMETER", "19 mm")
    study = _study(text, 150, 4)
    counts, any_fails = _counts(study)
    expected, expected_any = _brute_force(text, 150, 4)
    assert study.check_samples == 150
    assert counts == expected and any_fails == expected_any
    # the sample is not trivial: two checks fail in some samples, neither in all
    assert set(expected) == {"buckling:inner", "displacement:mid"}
    assert all(0 < v < 150 for v in expected.values()) and 0 < expected_any < 150


def test_checks_whose_capacity_moves_run_one_by_one_on_a_stated_number_of_samples():
    # a toleranced diameter moves the buckling capacity: the checks run sample by sample
    text = MODEL.replace("DIAMETER", "19 mm ±0.6")
    study = _study(text, 60, 2)
    counts, any_fails = _counts(study)
    expected, expected_any = _brute_force(text, 60, 2)
    assert study.check_samples == 60 <= CHECK_SAMPLES
    assert counts == expected and any_fails == expected_any and 0 < expected_any < 60
    assert any(n.startswith("check-fails: the checks of 'axialfe check' run on each of the "
                            "first 60 samples") for n in study.notes)


def test_the_json_states_the_samples_the_check_events_count_over(tmp_path, monkeypatch):
    from axialfe.tolerance import study

    monkeypatch.setattr(study, "CHECK_SAMPLES", 40)   # the cap, made small for the test
    path = tmp_path / "m.toml"
    path.write_text(MODEL.replace("DIAMETER", "19 mm ±0.6"))
    res = runner.invoke(app, ["tolerance", str(path), "--samples", "90", "--format", "json"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert data["samples"] == 90 and data["check_samples"] == 40
    event = next(e for e in data["events"] if e["event"] == "check-fails")
    assert set(event) == {"name", "event", "case", "count", "probability",
                          "confidence_interval"}
    checks = [e for e in data["events"] if e["name"] == "checks"]
    assert all(e["probability"] == pytest.approx(e["count"] / 40) for e in checks)
    assert any("run on each of the first 40 samples (of 90" in n for n in data["notes"])
    table = runner.invoke(app, ["tolerance", str(path), "--samples", "90"]).stdout
    rows = [line.split() for line in table.splitlines() if " check-fails " in line]
    # the table says over how many samples each event counts
    assert rows and all(r[4] == "40" for r in rows)
    closes = next(line.split() for line in table.splitlines() if " closes " in line)
    assert closes[4] == "90"
