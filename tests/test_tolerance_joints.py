"""Tolerance studies of bolted joint files: a toleranced nut factor at a given torque.

Checks against the outside world name their source beside them; "from memory"
where it is.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from scipy import stats
from typer.testing import CliRunner

from axialfe.cli import app
from axialfe.errors import ModelError
from axialfe.joints.joint import solve_joint
from axialfe.joints.reader import read_joint_toleranced
from axialfe.tolerance.jointstudy import run_joint_study

runner = CliRunner()
EXAMPLE = (Path(__file__).resolve().parent.parent / "examples" / "tolerance"
           / "pump-foot-bolt-torque-scatter.toml")
T, D = 70.0, 0.012            # the example's torque (N*m) and M12's nominal diameter (m)
K_LO, K_HI = 0.17, 0.23       # its nut factor 0.2 +-0.03, uniform
C_MIN, P_EXT = 16e3, 14e3     # its minimum clamp force and external load (N)


@pytest.fixture(scope="module")
def study():
    joint, found, build = read_joint_toleranced(EXAMPLE)
    return run_joint_study(joint, found, build, samples=20_000, seed=3)


def test_preload_is_torque_over_nut_factor_times_diameter_for_every_sample(study):
    # F_i = T/(K*d) (Shigley, Mechanical Engineering Design, 10th ed., eq. 8-27, from
    # memory): the assembled bolt force of each sample gives back a nut factor inside the
    # limits, and those nut factors are uniform on [0.17, 0.23]
    preload = study.draws[("assembly", "assembly:bolt_force")]
    k = T / (D * preload)
    assert k.min() >= K_LO - 1e-12 and k.max() <= K_HI + 1e-12
    assert stats.kstest(k, stats.uniform(K_LO, K_HI - K_LO).cdf).pvalue > 1e-3
    # the closed joint carries the preload as its clamp force when assembled
    assert np.allclose(study.draws[("assembly", "assembly:clamp_force")], preload, rtol=1e-9)


def test_each_sample_agrees_with_the_joint_solver_of_its_own_file(study):
    joint, found, build = read_joint_toleranced(EXAMPLE)
    preload = study.draws[("assembly", "assembly:bolt_force")]
    for i in (0, 7, 1234, 19_999):
        k = T / (D * preload[i])
        result = solve_joint(build({"assembly.nut_factor": float(k)}))
        for out in ("bolt_force", "clamp_force"):
            got = study.draws[("running", f"running:{out}")][i]
            assert got == pytest.approx(getattr(result.state("running"), out), rel=1e-9)


def test_clamp_below_minimum_matches_the_closed_form_for_a_uniform_nut_factor(study):
    # joint diagram: F_m = F_i - (1 - C)*P (Shigley, 10th ed., eq. 8-25, from memory), so
    # F_m < F_min where K > K* = T/(d*(F_min + (1 - C)*P)); for K uniform on [a, b] the
    # probability is (b - K*)/(b - a)
    joint, _, _ = read_joint_toleranced(EXAMPLE)
    C = joint.joint_constant
    k_star = T / (D * (C_MIN + (1 - C) * P_EXT))
    expected = (K_HI - k_star) / (K_HI - K_LO)
    assert 0.05 < expected < 0.95
    event = next(e for e in study.events
                 if e["event"] == "clamp-below-minimum" and e["case"] == "running")
    lo, hi = event["confidence_interval"]
    assert lo <= expected <= hi
    assert event["count"] == int(np.count_nonzero(
        study.draws[("running", "running:clamp_force")] < C_MIN))


def test_worst_case_is_at_the_limits_of_the_nut_factor(study):
    row = next(r for r in study.outputs if r["name"] == "running:clamp_force")
    C = read_joint_toleranced(EXAMPLE)[0].joint_constant
    # eqs. 8-25 and 8-27 above: least clamp at the greatest nut factor
    assert row["worst_case"][0] == pytest.approx(T / (D * K_HI) - (1 - C) * P_EXT, rel=1e-9)
    assert row["worst_case"][1] == pytest.approx(T / (D * K_LO) - (1 - C) * P_EXT, rel=1e-9)
    assert row["worst_case_inputs"][0]["assembly.nut_factor"] == pytest.approx(K_HI)


def test_a_separating_joint_is_solved_sample_by_sample(tmp_path):
    text = EXAMPLE.read_text().replace('external_load = "14 kN"', 'external_load = "50 kN"')
    path = tmp_path / "j.toml"
    path.write_text(text)
    joint, found, build = read_joint_toleranced(path)
    study = run_joint_study(joint, found, build, samples=300, seed=1)
    sep = next(e for e in study.events if e["event"] == "separates" and e["case"] == "running")
    # 50 kN is above every sample's separation load F_i/(1 - C): each separates, and the
    # bolt then carries the external load alone
    assert sep["count"] == 300
    assert np.allclose(study.draws[("running", "running:bolt_force")], 50e3, rtol=1e-9)
    assert np.all(study.draws[("running", "running:clamp_force")] == 0.0)


def test_cli_json_has_the_study_shape():
    res = runner.invoke(app, ["tolerance", str(EXAMPLE), "--samples", "500", "--seed", "1",
                              "--format", "json", "--output", "running:clamp_force"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert data["worst_case_method"] == "vertices"
    assert [i["name"] for i in data["inputs"]] == ["assembly.nut_factor"]
    assert [o["name"] for o in data["outputs"]] == ["running:clamp_force"]
    assert {e["event"] for e in data["events"]} == {"separates", "clamp-below-minimum",
                                                   "check-fails"}


@pytest.mark.parametrize("line, message", [
    ('nut_factor = "0.2 ±"', "nut_factor: '0.2 ±': the tolerance needs its deviation"),
    ('nut_factor = "0.2 ±0.25"', "could fall to zero or below"),
    ('nut_factor = { value = 0.2, plus = 0.03 }', "needs 'plus' and 'minus'"),
])
def test_bad_nut_factor_tolerances_are_one_located_error(tmp_path, line, message):
    text = EXAMPLE.read_text().replace(
        'nut_factor = { value = 0.2, plus = 0.03, minus = 0.03, distribution = "uniform" }', line)
    path = tmp_path / "j.toml"
    path.write_text(text)
    res = runner.invoke(app, ["tolerance", str(path), "--samples", "10"])
    assert res.exit_code == 2
    lines = [s for s in res.stderr.splitlines() if s.startswith("error:")]
    assert len(lines) == 1 and f"{path}:" in lines[0] and message in lines[0], res.stderr


def test_a_tolerance_elsewhere_in_a_joint_file_is_refused(tmp_path):
    text = EXAMPLE.read_text() + 'safety_factor = "1.5 ±0.1"\n'  
    path = tmp_path / "j.toml"
    path.write_text(text)
    with pytest.raises(ModelError, match="a tolerance is not allowed here"):
        read_joint_toleranced(path)


def test_a_joint_separating_for_some_samples_counts_exactly_those(tmp_path):
    text = EXAMPLE.read_text().replace('external_load = "14 kN"', 'external_load = "40 kN"')
    path = tmp_path / "j.toml"
    path.write_text(text)
    joint, found, build = read_joint_toleranced(path)
    study = run_joint_study(joint, found, build, samples=300, seed=1)
    preload = study.draws[("assembly", "assembly:bolt_force")]
    # separation load F_i/(1 - C) (Shigley, 10th ed., eq. 8-28 rearranged, from memory)
    expected = int(np.count_nonzero(preload / (1 - joint.joint_constant) < 40e3))
    sep = next(e for e in study.events if e["event"] == "separates" and e["case"] == "running")
    assert 0 < expected < 300 and sep["count"] == expected


def test_the_joint_command_solves_at_the_stated_nut_factor_and_says_so():
    res = runner.invoke(app, ["joint", str(EXAMPLE), "--format", "json"])
    assert res.exit_code == 0, res.output
    notes = [s for s in res.stderr.splitlines() if "toleranced input" in s]
    assert len(notes) == 1 and "joint has 1 toleranced input" in notes[0]
    states = json.loads(res.stdout)["states"]
    assembly = next(s for s in states if s["name"] == "assembly")
    # F_i = T/(K*d) at K = 0.2 (Shigley, 10th ed., eq. 8-27, from memory)
    assert assembly["bolt_force"] == pytest.approx(T / (0.2 * D), rel=1e-9)


def test_every_output_has_its_draws_under_its_case_and_name(study):
    # the plot and the report read the draws by (case, output name)
    assert all((r["case"], r["name"]) in study.draws for r in study.outputs)


def test_report_refuses_a_tolerance_section_it_cannot_make(tmp_path):
    # the joint report has no tolerance section: asking for one must not pass in silence
    import subprocess
    import sys

    out = tmp_path / "r.html"
    bad = subprocess.run([sys.executable, "-m", "axialfe", "report", str(EXAMPLE), "-o", str(out),
                          "--tolerance"], capture_output=True, text=True)
    assert bad.returncode == 2 and not out.exists()
    assert bad.stderr == ("error: --tolerance: a report's tolerance section is made for model files "
                          "only: run 'axialfe tolerance' on a joint or fit file\n")


STACK = (Path(__file__).resolve().parent.parent / "examples" / "tolerance"
         / "cover-bolt-stack-tolerances.toml")


def _stack_samples(n=200, seed=5):
    from axialfe.tolerance.jointstudy import _Joints
    from axialfe.tolerance.study import _draw

    joint, found, build = read_joint_toleranced(STACK)
    joints = _Joints(joint, found, build)
    x = _draw([t.tolerance for t in found], n, seed)
    return joint, found, build, joints, x, joints.evaluate(x)


def test_every_sample_of_many_toleranced_inputs_agrees_with_the_joint_solver():
    # torque, nut factor, thicknesses, a modulus, temperatures and loads all drawn: each
    # sample's forces and check verdicts are those of solve_joint on the file read again
    # with the sample's values (the engine's axial model, an independent path)
    joint, found, build, joints, x, (out, flags, _) = _stack_samples()
    assert len(found) == 9
    for i in range(0, 200, 9):
        result = solve_joint(build(dict(zip(joints.paths, x[i].tolist()))))
        for st in result.states:
            for o in ("bolt_force", "clamp_force"):
                assert out[f"{st.name}:{o}"][i] == pytest.approx(getattr(st, o), rel=1e-12)
            assert flags[(st.name, "separates", st.name)][i] == st.separated
        for case in result.checks.cases:
            for e in case.entries:
                assert flags[(e.kind, "check-fails", case.case)][i] == (e.ok is False)
            assert flags[("checks", "check-fails", case.case)][i] == any(
                e.ok is False for e in case.entries)


def test_a_toleranced_torque_gives_the_preload_t_over_k_d_of_each_sample():
    # F_i = T/(K*d) (Shigley, Mechanical Engineering Design, 10th ed., eq. 8-27, from
    # memory) with both the torque and the nut factor drawn, M10: d = 10 mm
    _, found, _, joints, x, (out, _, _) = _stack_samples(n=2000, seed=8)
    col = {t.path: j for j, t in enumerate(found)}
    T, K = x[:, col["assembly.torque"]], x[:, col["assembly.nut_factor"]]
    assert np.allclose(out["assembly:bolt_force"], T / (K * 0.010), rtol=1e-12, atol=0)
    assert T.std() == pytest.approx(1.0, rel=0.1)   # 40 N*m +-3: sigma 1 N*m


def test_a_study_of_the_stack_runs_and_its_worst_case_brackets_the_samples():
    joint, found, build = read_joint_toleranced(STACK)
    study = run_joint_study(joint, found, build, samples=3000, seed=2)
    assert study.worst_case_method == "vertices+local"
    for row in study.outputs:
        d = study.draws[(row["case"], row["name"])]
        lo, hi = row["worst_case"]
        assert lo <= row["nominal"] <= hi
        # normal draws cut at +-6 sigma may pass the +-3 sigma box; the box itself holds
        # most of them (a mass of 0.27 % outside per normal input)
        assert np.mean((d >= lo) & (d <= hi)) > 0.97
    names = {(e["name"], e["case"]) for e in study.events if e["event"] == "check-fails"}
    assert ("checks", "cold-start") in names and ("bolt-proof", "hot") in names


def test_a_state_open_under_no_pull_is_solved_by_the_joint_solver(tmp_path):
    # a light torque and a colder start with no external load: the aluminium cover shrinks
    # more than the steel bolt and the joint opens with nothing pulling it, which the
    # joint-diagram closed forms do not describe; those samples go to solve_joint
    from axialfe.tolerance.jointstudy import _Joints
    from axialfe.tolerance.study import _draw

    text = (STACK.read_text().replace('torque = "40 N*m ±3"', 'torque = "6 N*m ±3"')
            .replace('temperature = "-30 degC"\nexternal_load = "6 kN ±0.5"',
                     'temperature = "-60 degC"'))
    path = tmp_path / "j.toml"
    path.write_text(text)
    joint, found, build = read_joint_toleranced(path)
    joints = _Joints(joint, found, build)
    x = _draw([t.tolerance for t in found], 40, 3)
    out, flags, _ = joints.evaluate(x)
    opened = flags[("cold-start", "separates", "cold-start")]
    assert 0 < joints.alone == int(opened.sum())
    for i in range(0, 40, 3):
        result = solve_joint(build(joints.values(x[i])))
        for st in result.states:
            assert flags[(st.name, "separates", st.name)][i] == st.separated
            for o in ("bolt_force", "clamp_force"):
                assert out[f"{st.name}:{o}"][i] == pytest.approx(getattr(st, o), rel=1e-9,
                                                                 abs=1e-6)
