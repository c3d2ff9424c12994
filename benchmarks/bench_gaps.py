"""Benchmark: many gaps in one model, and a long sweep with gaps.

Goal (many gaps in linear time): 10^5 segments with 10^4 stops against ground in at
most 2 s (model building excluded), the cost growing no faster than n^1.3 from
2.5*10^4 : 2.5*10^3 to 10^5 : 10^4.  A sweep (still on the dense gaps x gaps path)
of a 1,000-segment model with 20 gaps over 10,000 temperature steps is timed too.

Run:  python benchmarks/bench_gaps.py
"""

from __future__ import annotations

import time

import numpy as np

from axialfe import Gap, Load, Material, Model, Section, Segment, Station, Support, solve
from axialfe.tracking.sweep import sweep


def chain_with_gaps(n_seg, n_gaps, seed=1, between=False):
    rng = np.random.default_rng(seed)
    x = np.cumsum(np.r_[0.0, rng.uniform(0.05, 0.2, n_seg)])
    stations = [Station(f"s{i}", float(v)) for i, v in enumerate(x)]
    mats = [Material("steel", 200e9, 12e-6, yield_strength=350e6), Material("alu", 70e9, 23e-6)]
    secs = [Section(f"a{k}", "area", (("area", a),)) for k, a in enumerate((1e-4, 2e-4, 4e-4))]
    segments = [Segment(f"e{i}", f"s{i}", f"s{i + 1}", mats[i % 2], secs[i % 3])
                for i in range(n_seg)]
    supports = [Support("s0"), Support(f"s{n_seg}", "spring", stiffness=1e8)]
    at = rng.choice(np.arange(1, n_seg + 1), size=n_gaps, replace=False)
    gaps = [Gap(f"g{j}", (f"s{i}",), float(rng.uniform(0, 2e-3)), "contact",
                "+x" if j % 2 else "-x") for j, i in enumerate(at)]
    if between:   # the stops as gaps from the station two before (off the support at s0)
        at = at[at >= 3]
        gaps = [Gap(f"g{j}", (f"s{i - 2}", f"s{i}"), float(rng.uniform(0, 2e-5)),
                    "contact" if j % 2 else "slack") for j, i in enumerate(at)]
    loads = [Load(f"s{i}", float(rng.uniform(-5e4, 5e4))) for i in rng.choice(n_seg, 50) + 1]
    return Model(stations, segments, supports, loads, gaps=gaps, temperature_change=40.0)


def main():
    import math

    from axialfe.engine.system import System
    from axialfe.model.cases import load_states

    times = {}
    for n_seg in (25_000, 100_000):
        n_gaps = n_seg // 10
        model = chain_with_gaps(n_seg, n_gaps)
        state = load_states(model)[0]
        best = math.inf
        for _ in range(3):
            t = time.perf_counter()
            system = System(model)
            case = system.solve_state(state)
            best = min(best, time.perf_counter() - t)
        times[n_seg] = best
        print(f"many gaps: {n_seg:,} segments, {n_gaps:,} stops: {best * 1e3:7.1f} ms "
              f"(goal <= 2000 ms, ratio {best / 2.0:5.2f}), search {system.last_contact[0]} "
              f"in {system.last_contact[1]} factorisations, {int(case.gap_closed.sum())} closed, "
              f"residual {case.equilibrium_residual:.1e}")
    power = math.log(times[100_000] / times[25_000]) / math.log(4)
    print(f"many gaps: cost grows as n^{power:.2f} from 25,000 to 100,000 segments (goal <= n^1.3)")
    for n_seg in (2_500, 25_000):
        # gaps between two stations: multiplier rows in the band, against the exact search
        model = chain_with_gaps(n_seg, n_seg // 10, between=True)
        state = load_states(model)[0]
        t_band = math.inf
        for _ in range(3):
            t = time.perf_counter()
            system = System(model)
            case = system.solve_state(state)
            t_band = min(t_band, time.perf_counter() - t)
        line = (f"gaps between stations (best of 3): {n_seg:,} segments, {len(model.gaps):,} gaps: "
                f"{t_band * 1e3:7.1f} ms, search {system.last_contact[0]} in "
                f"{system.last_contact[1]} factorisations, {int(case.gap_closed.sum())} closed, "
                f"residual {case.equilibrium_residual:.1e}")
        t_exact = math.inf
        for _ in range(3):
            t = time.perf_counter()
            exact = System(model, method="sparse-lu").solve_state(state)
            t_exact = min(t_exact, time.perf_counter() - t)
        rel = (np.abs(exact.axial_force - case.axial_force).max()
               / np.abs(exact.axial_force).max())
        line += (f"; the exact search (sparse LU, dense gaps x gaps) {t_exact * 1e3:.1f} ms, "
                 f"ratio {t_band / t_exact:.2f}, same forces to {rel:.0e}")
        print(line)
    model = chain_with_gaps(1_000, 20)
    t = time.perf_counter()
    result = sweep(model, "temperature_change", -60.0, 160.0, 10_000)
    t_all = time.perf_counter() - t
    worst = max(r.equilibrium_residual for r in result.results)
    print(f"sweep 1000 segments, 20 gaps, 10000 steps (dense gap path): {t_all:.2f} s "
          f"({len(result.events)} events), worst residual {worst:.1e}")


if __name__ == "__main__":
    main()
