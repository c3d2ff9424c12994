"""Benchmark: many gaps in one model, and a long sweep with gaps.

Targets (2-core machine): a chain of 20,000 segments with 2,000 gaps solves in a few
seconds; a 1,000-segment model with 20 gaps swept over 10,000 temperature steps (events
found and every step's result recovered) takes seconds, not minutes.

Run:  python benchmarks/bench_gaps.py
"""

from __future__ import annotations

import time

import numpy as np

from axialfe import Gap, Load, Material, Model, Section, Segment, Station, Support, solve
from axialfe.tracking.sweep import sweep


def chain_with_gaps(n_seg, n_gaps, seed=1):
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
    loads = [Load(f"s{i}", float(rng.uniform(-5e4, 5e4))) for i in rng.choice(n_seg, 50) + 1]
    return Model(stations, segments, supports, loads, gaps=gaps, temperature_change=40.0)


def main():
    for n_seg, n_gaps in ((20_000, 200), (20_000, 2_000)):
        model = chain_with_gaps(n_seg, n_gaps)
        t = time.perf_counter()
        case = solve(model)["base"]
        dt = time.perf_counter() - t
        print(f"{n_seg} segments, {n_gaps} gaps: solved in {dt:.2f} s, "
              f"{int(case.gap_closed.sum())} closed, residual {case.equilibrium_residual:.1e}")
    model = chain_with_gaps(1_000, 20)
    t = time.perf_counter()
    result = sweep(model, "temperature_change", -60.0, 160.0, 10_000)
    t_events = time.perf_counter() - t
    worst = max(r.equilibrium_residual for r in result.results)
    t_all = time.perf_counter() - t
    print(f"sweep 1000 segments, 20 gaps, 10000 steps: events in {t_events:.2f} s "
          f"({len(result.events)} events), all steps recovered in {t_all:.2f} s, "
          f"worst residual {worst:.1e}")


if __name__ == "__main__":
    main()
