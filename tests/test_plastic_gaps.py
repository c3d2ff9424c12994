"""Elastic-plastic paths with gaps: a yielding segment and a gap are constraints of one machinery.

Checked against hand computations (closed forms of a bar against a stop) and
against a brute-force incremental solve written here from scratch: small load
steps, each solved exactly by trying every state of the segments (elastic, at
the tension or the compression bound) and of the gaps (open, closed).
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from hypothesis import given, strategies as st

from axialfe import Gap, Load, Model, Segment, Station, Support
from axialfe.model import Material
from axialfe.tracking.plastic import parse_path, track_path

from conftest import area, assert_close

E, ALPHA, FY, A, L = 200e9, 12e-6, 240e6, 1e-4, 1.0
DT_Y = FY / (E * ALPHA)                 # 100 K: first yield of a restrained bar


def plastic(H=0.0):
    return Material("s", E, ALPHA, FY, behaviour="elastic-plastic", hardening_modulus=H)


def bar_against_stop(clearance, H=0.0, load=None, kind="contact", side="+x"):
    """A bar fixed at 'a', its free end 'b' a clearance short of a stop (or a slack link)."""
    return Model([Station("a", 0.0), Station("b", L)],
                 [Segment("bar", "a", "b", plastic(H), area("r", A))], [Support("a")],
                 [Load("b", load)] if load else [],
                 gaps=(Gap("g", ("b",), kind=kind, side=side, clearance=clearance),))


def run(model, text):
    return track_path(model, parse_path(text)[0])


def events(result):
    return [(e.leg, e.name, e.event, pytest.approx(e.value, rel=1e-9)) for e in result.events]


def test_heated_bar_closes_its_gap_yields_and_opens_on_cooling():
    # Free expansion alpha*dT*L closes the clearance c at dT_c = c/(alpha*L) = 50 K; then
    # restrained, sigma = -E*alpha*(dT - dT_c) reaches -f_y at dT_c + dT_y = 150 K (the
    # bar against a stop, Gere & Goodno, Mechanics of Materials, sec. 2.5, from memory).
    # Heated to 200 K it keeps eps_p = -alpha*(200 - 150 K); cooled, its contact force
    # vanishes where alpha*dT = c/L - eps_p, at dT = 200 - dT_y = 100 K (hand computation).
    result = run(bar_against_stop(0.6e-3),
                 "temperature-change 0 K..200 K; temperature-change 200 K..0 K")
    assert events(result) == [(1, "g", "closes", 50.0), (1, "bar", "yields", 150.0),
                              (2, "bar", "unloads", 200.0), (2, "g", "opens", 100.0)]
    hot, cold = result.states
    eps_p = -ALPHA * 50.0
    assert_close(hot.result.stress[0], [-FY, -FY], what="stress at 200 K")
    assert_close(hot.result.gap_force, [-FY * A], what="contact force at 200 K")
    assert_close(cold.plastic_strain, [eps_p], what="plastic strain kept")
    assert_close(cold.plastic_displacement, [0.0, eps_p * L], abs_=1e-18)
    assert_close(cold.result.stress[0], [0.0, 0.0], abs_=1e-3, what="no residual stress")
    assert_close(cold.result.gap_opening, [0.6e-3 - eps_p * L], what="opening after the set")
    assert cold.result.gap_closed.tolist() == [False]


def test_hardening_bar_yields_then_closes_its_gap():
    # Load P at the free end: yield at P_y = f_y*A = 24 kN (factor 1.2 on 20 kN); then the
    # tangent flexibility L/(E*A) + L/(H*A) (linear hardening, Gere & Goodno sec. 2.12,
    # from memory) takes the end to the clearance c at
    # P_c = (c + P_y*L/(H*A)) / (L/(E*A) + L/(H*A)) (hand computation); beyond it the stop
    # carries the rest.
    H, c, P = 20e9, 2e-3, 20e3
    result = run(bar_against_stop(c, H=H, load=P), "load 0..2; load 2..0")
    k, h = E * A / L, H * A / L
    P_c = (c + FY * A / h) / (1 / k + 1 / h)
    assert events(result) == [(1, "bar", "yields", FY * A / P), (1, "g", "closes", P_c / P),
                              (1, "bar", "unloads", P_c / P), (2, "g", "opens", P_c / P)]
    loaded, unloaded = result.states
    assert_close(loaded.result.axial_force[0], [P_c, P_c], what="bar force held at P_c")
    assert_close(loaded.result.gap_force, [-(2 * P - P_c)], what="the stop takes the rest")
    assert_close(unloaded.plastic_strain, [(P_c - FY * A) / h / L])
    assert_close(unloaded.result.axial_force[0], [0.0, 0.0], abs_=1e-6)


def test_perfectly_plastic_bar_flows_until_the_stop_arrests_it():
    # Perfectly plastic: at P_y the bar flows at constant force until the stop takes the
    # load; its plastic elongation is c - P_y*L/(E*A) (hand computation).
    c, P = 2e-3, 20e3
    result = run(bar_against_stop(c, load=P), "load 0..2; load 2..0")
    assert events(result) == [(1, "bar", "yields", 1.2), (1, "g", "closes", 1.2),
                              (1, "bar", "unloads", 1.2), (2, "g", "opens", 1.2)]
    assert result.collapsed_on is None
    loaded, unloaded = result.states
    assert_close(loaded.result.axial_force[0], [FY * A, FY * A])
    assert_close(loaded.result.gap_force, [-(2 * P - FY * A)])
    assert_close(unloaded.plastic_strain, [(c - FY * A * L / (E * A)) / L])


def test_without_a_stop_in_reach_the_bar_collapses():
    result = run(bar_against_stop(2e-3, load=20e3, side="-x"), "load 0..2")
    assert [e.event for e in result.events] == ["yields", "collapses"]
    assert result.collapsed_on == 1


def test_a_slack_link_goes_taut_and_slack():
    # A link anchored on the -x side goes taut when the end has moved c toward +x: the bar
    # pulled by P at P*L/(E*A) = c, i.e. at factor c*E*A/(L*P) = 0.5 (hand computation);
    # then the link holds the end and the bar stays below yield.
    c, P = 0.5e-3, 20e3
    result = run(bar_against_stop(c, load=P, kind="slack", side="-x"), "load 0..2; load 2..0")
    taut = c * E * A / (L * P)
    assert events(result) == [(1, "g", "taut", taut), (2, "g", "slack", taut)]


def test_parts_held_only_by_gaps_are_refused():
    model = Model([Station("a", 0.0), Station("b", L)],
                  [Segment("bar", "a", "b", plastic(), area("r", A))], [],
                  [Load("b", 1e3)],
                  gaps=(Gap("g", ("b",), side="+x", clearance=0.0),))
    with pytest.raises(Exception, match="does not follow parts held only by gaps"):
        run(model, "load 0..1")


# --- brute force: small steps, each solved by trying every state --------------------------
def brute_force(spec, legs, steps):
    """Segment and gap forces at each leg end by an incremental solve of the spec's model."""
    n, segs, fixed, gaps, load_at, load = (spec[k] for k in
                                           ("n", "segs", "fixed", "gaps", "load_at", "load"))
    free = [i for i in range(n) if i not in fixed]
    fi = {s: j for j, s in enumerate(free)}
    m, g = len(segs), len(gaps)
    k = np.array([sg["E"] * sg["A"] / sg["L"] for sg in segs])
    h = np.array([sg["H"] * sg["A"] / sg["L"] for sg in segs])
    Ny = np.array([sg["fy"] * sg["A"] for sg in segs])
    # elongation = G @ u_free
    G = np.zeros((m, len(free)))
    for i, sg in enumerate(segs):
        if sg["b"] in fi:
            G[i, fi[sg["b"]]] += 1
        if sg["a"] in fi:
            G[i, fi[sg["a"]]] -= 1
    Bg = np.zeros((g, len(free)))            # closure = Bg @ u
    for j, gp in enumerate(gaps):
        Bg[j, fi[gp["at"]]] = gp["s"]
    clear = np.array([gp["c"] for gp in gaps])
    F = np.zeros(len(free))
    F[fi[load_at]] = load
    p = np.zeros(m)
    states = [((0,) * m, (0,) * g)]
    out = []

    def solve(lam_f, dT, p_old, combo):
        seg_state, gap_state = combo
        nu = len(free) + m + g
        K = np.zeros((nu, nu))
        r = np.zeros(nu)
        d0 = ALPHA * dT * np.array([sg["L"] for sg in segs])
        # equilibrium: G^T N = F - Bg^T lam with N = k (G u - d0 - p)
        K[:len(free), :len(free)] = G.T @ (k[:, None] * G)
        K[:len(free), len(free):len(free) + m] = -G.T * k
        K[:len(free), len(free) + m:] = Bg.T
        r[:len(free)] = lam_f * F + G.T @ (k * d0)
        for i in range(m):
            row = len(free) + i
            if seg_state[i] == 0:
                K[row, len(free) + i], r[row] = 1.0, p_old[i]
            else:          # N - h p = +-Ny
                K[row, :len(free)] = k[i] * G[i]
                K[row, len(free) + i] = -k[i] - h[i]
                r[row] = seg_state[i] * Ny[i] + k[i] * d0[i]
        for j in range(g):
            row = len(free) + m + j
            if gap_state[j] == 0:
                K[row, row] = 1.0
            else:
                K[row, :len(free)], r[row] = Bg[j], clear[j]
        try:
            x = np.linalg.solve(K, r)
        except np.linalg.LinAlgError:
            return None
        u, pn, lam = x[:len(free)], x[len(free):len(free) + m], x[len(free) + m:]
        N = k * (G @ u - d0 - pn)
        o = clear - Bg @ u
        tol = 1e-9 * Ny.max()
        ok = (np.all(np.abs(N - h * pn) <= Ny + tol)
              and all((sgs == 0) or (sgs * (pn[i] - p_old[i]) >= -1e-15) for i, sgs in
                      enumerate(seg_state))
              and np.all(np.where(np.array(gap_state) == 1, lam >= -tol, o >= -1e-12)))
        return (N, lam, pn) if ok else None

    lam_f = dT = 0.0
    for leg in legs:
        kind, a, b = leg
        for step in range(1, steps + 1):
            v = a + (b - a) * step / steps
            lam_f, dT = (v, dT) if kind == "load" else (lam_f, v)
            found = None
            for combo in [states[-1]] + [c for c in itertools.product(
                    itertools.product((0, 1, -1), repeat=m), itertools.product((0, 1), repeat=g))]:
                found = solve(lam_f, dT, p, combo)
                if found is not None:
                    states.append(combo)
                    break
            assert found is not None, "no state fits the step"
            N, lam, p = found
        out.append((N, lam))
    return out


@st.composite
def specs(draw):
    n_seg = draw(st.integers(1, 3))
    n = n_seg + 1
    lengths = [draw(st.floats(0.5, 2.0)) for _ in range(n_seg)]
    segs = [{"a": i, "b": i + 1, "L": lengths[i], "E": E, "A": draw(st.floats(1e-4, 3e-4)),
             "fy": draw(st.floats(200e6, 400e6)), "H": draw(st.floats(0.02, 0.3)) * E}
            for i in range(n_seg)]
    if n_seg > 1 and draw(st.booleans()):            # a segment in parallel with the chain
        segs.append({"a": 0, "b": n_seg, "L": sum(lengths), "E": E,
                     "A": draw(st.floats(1e-4, 3e-4)), "fy": draw(st.floats(200e6, 400e6)),
                     "H": draw(st.floats(0.02, 0.3)) * E})
    fixed = [0] + ([n - 1] if n > 2 and draw(st.booleans()) else [])
    free = [i for i in range(n) if i not in fixed]
    gap_at = draw(st.lists(st.sampled_from(free), min_size=1, max_size=2, unique=True))
    gaps = [{"at": i, "s": draw(st.sampled_from((1.0, -1.0))), "c": draw(st.floats(0.0, 3e-3)),
             "kind": draw(st.sampled_from(("contact", "slack")))} for i in gap_at]
    return {"n": n, "segs": segs, "fixed": fixed, "gaps": gaps, "load_at": draw(
        st.sampled_from(free)), "load": draw(st.sampled_from((1.0, -1.0))) * draw(
        st.floats(20e3, 80e3)), "a": draw(st.floats(0.5, 2.5)), "b": draw(st.floats(-2.0, 0.5)),
        "dT": draw(st.floats(-150.0, 150.0))}


def spec_model(spec):
    x = np.concatenate([[0.0], np.cumsum([sg["L"] for sg in spec["segs"]])])
    stations = [Station(f"s{i}", float(x[i])) for i in range(spec["n"])]
    segments = [Segment(f"e{i}", f"s{sg['a']}", f"s{sg['b']}",
                        Material(f"m{i}", sg["E"], ALPHA, sg["fy"], behaviour="elastic-plastic",
                                 hardening_modulus=sg["H"]), area(f"r{i}", sg["A"]))
                for i, sg in enumerate(spec["segs"])]
    # closure s*u: a contact on the +x side or a link anchored on the -x side has s = +1
    gaps = [Gap(f"g{j}", (f"s{gp['at']}",), kind=gp["kind"],
                side="+x" if (gp["s"] > 0) == (gp["kind"] == "contact") else "-x",
                clearance=gp["c"]) for j, gp in enumerate(spec["gaps"])]
    return Model(stations, segments, [Support(f"s{i}") for i in spec["fixed"]],
                 [Load(f"s{spec['load_at']}", spec["load"])], gaps=tuple(gaps))


@given(specs())
def test_path_with_gaps_agrees_with_a_brute_force_incremental_solve(spec):
    a, b, dT = spec["a"], spec["b"], spec["dT"]
    text = f"load 0..{a!r}; temperature-change 0 K..{dT!r} K; load {a!r}..{b!r}"
    result = run(spec_model(spec), text)
    assert result.collapsed_on is None                 # hardening: no mechanism
    brute = brute_force(spec, [("load", 0.0, a), ("dT", 0.0, dT), ("load", a, b)], steps=40)
    scale = max(sg["fy"] * sg["A"] for sg in spec["segs"])
    for state, (N, lam) in zip(result.states, brute):
        assert_close(state.result.axial_force[:, 0], N, abs_=2e-2 * scale,
                     what=f"segment forces at the end of leg {state.leg}")
        assert_close(np.abs(state.result.gap_force), lam, abs_=2e-2 * scale,
                     what=f"gap forces at the end of leg {state.leg}")


def test_the_rod_example_closes_yields_and_comes_back_short(cli):
    # the hand solution quoted in the example's comments
    import json
    from pathlib import Path

    example = Path(__file__).resolve().parent.parent / "examples" / "rod-against-stop-heated.toml"
    out = cli("path", example, "--path",
              "temperature-change 0 K..200 K; temperature-change 200 K..0 K", "--format", "json")
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    assert [(e["leg"], e["name"], e["event"], pytest.approx(e["value"], rel=1e-9))
            for e in data["events"]] == [(1, "stop", "closes", 50.0), (1, "rod", "yields", 150.0),
                                         (2, "rod", "unloads", 200.0), (2, "stop", "opens", 100.0)]
    cold = data["states"][1]
    assert cold["segments"][0]["plastic_strain"] == pytest.approx(-0.0006, rel=1e-9)
    assert cold["gaps"][0]["opening"] == pytest.approx(1.2, rel=1e-9)          # mm
    assert cold["stations"][1]["plastic_displacement"] == pytest.approx(-0.6, rel=1e-9)
