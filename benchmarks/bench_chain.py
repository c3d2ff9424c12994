"""Benchmark: a generated chain of 200,000 segments, built in code, assembled and solved.

A long stepped bar between two walls (random sections from a small catalogue, a
few materials, a temperature change on every segment, point loads at every tenth
station, a spring every thousandth) is built as a Model, then each stage of the
engine is timed on its own.  Target: assembly plus solve in a few seconds on two
cores.  Run from the project root:

    python benchmarks/bench_chain.py [n_segments] [--profile]
"""

from __future__ import annotations

import cProfile
import pstats
import sys
import time

from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))  # this checkout's axialfe

from axialfe.engine.assembly import assemble
from axialfe.model.cases import load_states
from axialfe.model import Load, Material, Model, Section, Segment, Station, Support
from axialfe.engine.system import System


def build(n: int, seed: int = 1) -> Model:
    rng = np.random.default_rng(seed)
    mats = [Material("steel", 200e9, 12e-6, density=7850.0),
            Material("alu", 70e9, 23e-6, density=2700.0),
            Material("brass", 105e9, 19e-6, density=8500.0)]
    secs = [Section(f"d{d}", "round", (("diameter", d * 1e-3),)) for d in (16, 20, 25, 32, 40)]
    x = np.concatenate([[0.0], np.cumsum(rng.uniform(0.005, 0.02, n))])
    stations = tuple(Station(f"s{i}", float(v)) for i, v in enumerate(x))
    mi, si = rng.integers(0, len(mats), n), rng.integers(0, len(secs), n)
    dT = rng.uniform(-20.0, 60.0, n)
    segments = tuple(Segment(f"e{i}", f"s{i}", f"s{i + 1}", mats[mi[i]], secs[si[i]],
                             temperature_change=float(dT[i])) for i in range(n))
    supports = (Support("s0"), Support(f"s{n}"),
                *(Support(f"s{i}", "spring", stiffness=5e7) for i in range(1000, n, 1000)))
    loads = tuple(Load(f"s{i}", float(f)) for i, f in zip(range(10, n, 10),
                                                          rng.uniform(-5e3, 5e3, n // 10)))
    return Model(stations, segments, supports, loads)


def timed(label, fn, *args):
    t0 = time.perf_counter()
    out = fn(*args)
    dt = time.perf_counter() - t0
    print(f"  {label:<34s} {dt:8.3f} s")
    return out, dt


def run(n: int):
    print(f"axial chain of {n:,} segments")
    model, t_build = timed("build the Model (input objects)", build, n)
    asm, t_asm = timed("assembly (element terms, sparse K)", assemble, model)
    system, t_fact = timed("connectivity + factorisation", System, model, asm)
    state = load_states(model)[0]
    (F, u_presc, terms), t_load = timed("load vector", system.state_vectors, state)
    u, t_solve = timed("solve (triangular solves)", system.displacements, F, u_presc)
    result, t_rec = timed("recovery (forces, reactions)", system.recover, state, u, F,
                          np.zeros(0), terms)
    total = t_asm + t_fact + t_load + t_solve + t_rec
    print(f"  {'assemble + solve + recover':<34s} {total:8.3f} s")
    print(f"  equilibrium residual {result.equilibrium_residual:.2e}, "
          f"max |N| {np.abs(result.axial_force).max():.4g} N")
    return total


if __name__ == "__main__":
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    n = int(args[0]) if args else 200_000
    if "--profile" in sys.argv:
        prof = cProfile.Profile()
        prof.runcall(run, n)
        pstats.Stats(prof).sort_stats("cumulative").print_stats(25)
    else:
        run(n)
