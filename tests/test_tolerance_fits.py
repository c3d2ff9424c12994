"""Tolerance studies of press-fit files: bore and shaft between their ISO 286 limits.

Checks against the outside world name their source beside them; "from memory"
where it is.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from axialfe.cli import app
from axialfe.fits import lame
from axialfe.fits.reader import read_fit, read_fit_toleranced
from axialfe.tolerance.fitstudy import run_fit_study

runner = CliRunner()
EXAMPLE = Path(__file__).resolve().parent.parent / "examples" / "fits" / "bronze-bushing.toml"


@pytest.fixture(scope="module")
def study():
    return run_fit_study(*read_fit_toleranced(EXAMPLE), samples=2000, seed=2)


def test_worst_case_interference_is_the_iso_286_limits(study):
    # 50 H7/s6: bore 50.000/50.025 mm, shaft 50.043/50.059 mm (ISO 286-2, Tables for
    # H7 and s6 over 30 to 50 mm, from memory): least interference 18 um, greatest 59 um
    fit = read_fit(EXAMPLE)
    row = next(r for r in study.outputs if r["name"] == "assembly:pressure")
    least, greatest = row["worst_case_inputs"]
    assert least["fit.shaft"] - least["fit.bore"] == pytest.approx(18e-6, abs=1e-12)
    assert greatest["fit.shaft"] - greatest["fit.bore"] == pytest.approx(59e-6, abs=1e-12)
    # and the pressures there are Lame's at those interferences
    sh, hb = fit.shaft, fit.hub
    for got, delta in zip(row["worst_case"], (18e-6, 59e-6)):
        p = lame.contact_pressure(delta, fit.diameter, fit.outer_diameter, hb.elastic_modulus,
                                  hb.poissons_ratio, sh.elastic_modulus, sh.poissons_ratio,
                                  fit.inner_diameter)
        assert got == pytest.approx(p, rel=1e-9)


def test_samples_lie_inside_the_worst_case_and_centre_on_the_mid_interference(study):
    for r in study.outputs:
        d = study.draws[(r["case"], r["name"])]
        lo, hi = r["worst_case"]
        # normal draws cut at +-6 sigma may pass the +-3 sigma box, by at most 2x its half-width
        assert d.min() >= lo - (hi - lo) and d.max() <= hi + (hi - lo)
    # pressure is linear in the interference (Lame, e.g. Shigley, 10th ed., eq. 3-56,
    # from memory): its mean is the pressure at the mean interference
    r = next(r for r in study.outputs if r["name"] == "assembly:pressure")
    assert r["mean"] == pytest.approx(0.5 * sum(r["worst_case"]), rel=0.02)


def test_a_fit_that_can_lose_its_interference_loosens_and_slips_in_proportion(tmp_path):
    text = (EXAMPLE.read_text().replace('iso = "50 H7/s6"', 'iso = "50 H7/k6"')
            .replace('temperature = "-25 degC"', 'temperature = "20 degC"'))
    path = tmp_path / "f.toml"
    path.write_text(text)
    study = run_fit_study(*read_fit_toleranced(path), samples=1000, seed=1)
    ev = {(e["case"], e["event"]): e for e in study.events}
    # 50 H7/k6 is a transition fit (k6 +2/+18 um, ISO 286-2, from memory): some assemblies
    # have no interference, and those are loose; loaded (cold-start, here at the
    # assembly temperature, 0.4 kN) they slip,
    # unloaded (assembly) nothing drives them
    loose = ev[("cold-start", "loosens")]
    assert 0 < loose["count"] < 1000
    assert ev[("cold-start", "slips")]["count"] >= loose["count"]
    assert ev[("assembly", "slips")]["count"] == 0
    p = study.draws[("cold-start", "cold-start:pressure")]
    assert np.count_nonzero(p == 0.0) == loose["count"]


def test_cli_json_of_a_fit_file():
    res = runner.invoke(app, ["tolerance", str(EXAMPLE), "--samples", "200", "--format", "json",
                              "--output", "hot-running:holding_force"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert [i["name"] for i in data["inputs"]] == ["fit.bore", "fit.shaft"]
    assert data["inputs"][0]["limits"] == pytest.approx([50.0, 50.025])
    assert [o["name"] for o in data["outputs"]] == ["hot-running:holding_force"]
    assert {e["event"] for e in data["events"]} == {"loosens", "slips", "check-fails"}


def test_a_fit_without_limits_is_one_located_error(tmp_path):
    text = EXAMPLE.read_text().replace('iso = "50 H7/s6"', 'interference = "0.04 mm"')
    path = tmp_path / "f.toml"
    path.write_text(text)
    res = runner.invoke(app, ["tolerance", str(path), "--samples", "10"])
    assert res.exit_code == 2
    lines = [s for s in res.stderr.splitlines() if s.startswith("error:")]
    assert len(lines) == 1 and "no toleranced input" in lines[0], res.stderr
    assert lines[0].startswith(f"error: {path}")


def test_every_output_has_its_draws_under_its_case_and_name(study):
    # the plot and the report read the draws by (case, output name)
    assert all((r["case"], r["name"]) in study.draws for r in study.outputs)


GEAR = (Path(__file__).resolve().parent.parent / "examples" / "tolerance"
        / "gear-hub-shrink-fit-scatter.toml")


def _gear_samples(n=300, seed=4):
    from axialfe.tolerance.fitstudy import _Fits
    from axialfe.tolerance.study import _draw

    fit, found, build = read_fit_toleranced(GEAR)
    fits = _Fits(fit, found, build, str(GEAR))
    x = _draw([t.tolerance for t in found], n, seed)
    return fit, found, build, fits, x, fits.evaluate(x)


def test_every_sample_of_many_toleranced_inputs_agrees_with_the_fit_solver():
    # the limits, friction, a diameter, temperatures and a torque drawn: each sample's
    # outputs, looseness and check verdicts are those of solve_fit on the file read again
    # with the sample's values
    from axialfe.fits.fit import solve_fit

    fit, found, build, fits, x, (out, flags, _) = _gear_samples()
    assert {t.path for t in found} >= {"fit.bore", "fit.shaft", "fit.friction",
                                       "hub.outer_diameter", "service.start.torque"}
    for i in range(0, 300, 13):
        result = solve_fit(build(fits.values(x[i])))
        for st in result.states:
            for o in ("pressure", "holding_force"):
                assert out[f"{st.name}:{o}"][i] == pytest.approx(getattr(st, o)[0], rel=1e-12)
            assert flags[(st.name, "loosens", st.name)][i] == st.loose[0]
        for case in result.checks.cases:
            for e in case.entries:
                assert flags[(e.kind, "check-fails", case.case)][i] == (e.ok is False)
            # slips: the holding checks at a safety factor of 1 (this file has none)
            held = [e for e in case.entries if e.kind in ("holding-force", "torque-capacity",
                                                          "combined-slip")]
            assert flags[(case.case, "slips", case.case)][i] == any(e.ok is False for e in held)


def test_a_toleranced_outer_diameter_gives_lames_pressure_of_each_sample():
    # p = delta / (d [ (d_o^2 + d^2)/(E (d_o^2 - d^2)) + (1 - nu)/E + ... ]) (Shigley,
    # 9th ed., eq. 3-56, from memory) with the sampled d_o and shaft - bore
    fit, found, _, fits, x, (out, _, _) = _gear_samples(n=2000, seed=9)
    col = {t.path: j for j, t in enumerate(found)}
    delta = x[:, col["fit.shaft"]] - x[:, col["fit.bore"]]
    d_o = x[:, col["hub.outer_diameter"]]
    E, nu = fit.hub.elastic_modulus, fit.hub.poissons_ratio
    p = lame.contact_pressure(delta, fit.diameter, d_o, E, nu, E, nu)
    assert np.allclose(out["assembly:pressure"], p, rtol=1e-12, atol=0)
    assert len(np.unique(d_o)) == 2000


def test_uniform_iso_limits_are_drawn_uniformly_and_bound_the_worst_case():
    from scipy import stats

    _, found, _, _, x, _ = _gear_samples(n=4000, seed=2)
    col = {t.path: j for j, t in enumerate(found)}
    # 40 H7/s6: bore 40.000/40.025 mm, shaft 40.043/40.059 mm (ISO 286-2, H7 and s6 over
    # 30 to 40 mm, from memory)
    bore, shaft = x[:, col["fit.bore"]], x[:, col["fit.shaft"]]
    assert stats.kstest(bore, stats.uniform(0.040, 25e-6).cdf).pvalue > 1e-3
    assert stats.kstest(shaft, stats.uniform(0.040043, 16e-6).cdf).pvalue > 1e-3
    study = run_fit_study(*read_fit_toleranced(GEAR), samples=0)
    row = next(r for r in study.outputs if r["name"] == "assembly:pressure")
    least, greatest = row["worst_case_inputs"]
    assert least["fit.shaft"] - least["fit.bore"] == pytest.approx(18e-6, abs=1e-12)
    assert greatest["fit.shaft"] - greatest["fit.bore"] == pytest.approx(59e-6, abs=1e-12)


def test_the_fit_command_uses_the_stated_values_and_says_so():
    res = runner.invoke(app, ["fit", str(GEAR), "--format", "json"])
    assert res.exit_code in (0, 1), res.output
    notes = [s for s in res.stderr.splitlines() if "toleranced input" in s]
    assert len(notes) == 1 and "the fit has 6 toleranced inputs" in notes[0], res.stderr
