"""Benchmark (banded factorisation): a chain of 10^6 segments against the arithmetic floor.

A long stepped bar between two walls (random lengths, moduli and areas, a
temperature change on every segment, a load at every tenth station, a spring
every thousandth; invented data) is built with ``Model.from_arrays`` and solved
by ``axialfe.solve``.  Its anchors, in the same run:

- the floor: one ``scipy.linalg.solve_banded`` of the same tridiagonal system
  (springs, thermal loads and point loads included) plus a numpy recovery of
  the segment forces; the answer must agree to 1e-9 relative;
- at 10^5 segments, a plain Python script: a loop filling a
  ``scipy.sparse.lil_matrix``, then ``spsolve``.

Goal: at most 3 times the floor, peak memory (traced) under 1 GB.  Building the
model (``Model.from_arrays``) has the same goal against the same floor, and is shown
beside copying each input array once (the least any array model must do).  The
solve, the engine alone and the floor run in turns, seven times each, and each
shows its best wall-clock time (and the solve and the floor their best CPU time,
which leaves out waiting for a core on a busy machine), with the load average
before and after.  Run from the project root:

    python benchmarks/bench_chain.py [n_segments] [--profile]
"""

from __future__ import annotations

import cProfile
import os
import pstats
import sys
import time
import tracemalloc
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))  # this checkout's axialfe

from axialfe import solve  # noqa: E402
from axialfe.model import Model  # noqa: E402


def data(n: int, seed: int = 1):
    rng = np.random.default_rng(seed)
    L = rng.uniform(0.005, 0.02, n)
    return dict(x=np.concatenate([[0.0], np.cumsum(L)]), E=rng.choice([200e9, 70e9, 105e9], n),
                A=rng.choice([2.0e-4, 3.1e-4, 4.9e-4, 8.0e-4, 1.26e-3], n),
                alpha=rng.choice([12e-6, 23e-6, 19e-6], n), dT=rng.uniform(-20.0, 60.0, n),
                load_at=np.arange(10, n, 10), load=rng.uniform(-5e3, 5e3, len(range(10, n, 10))),
                spring_at=np.arange(1000, n, 1000), spring_k=5e7)


def build(n: int, d) -> Model:
    idx = np.arange(n)
    return Model.from_arrays(d["x"], idx, idx + 1, d["E"], d["A"], d["alpha"], d["dT"],
                             fixed=[0, n], load_at=d["load_at"], load_force=d["load"],
                             spring_at=d["spring_at"],
                             spring_stiffness=np.full(len(d["spring_at"]), d["spring_k"]))


def build_floor(n: int, d):
    """The least any array model must do: copy each input array once."""
    idx = np.arange(n)
    out = [np.array(d[k], dtype=float) for k in ("x", "E", "A", "alpha", "dT", "load")]
    return out + [np.array(idx), idx + 1, np.array(d["load_at"]), np.array(d["spring_at"])]


def floor(n: int, d):
    """One solve_banded of the tridiagonal system and a numpy recovery of the forces."""
    from scipy.linalg import solve_banded

    k = d["E"] * d["A"] / np.diff(d["x"])
    delta0 = d["alpha"] * d["dT"] * np.diff(d["x"])
    F = np.zeros(n + 1)
    F[d["load_at"]] += d["load"]
    F[:-1] -= k * delta0           # thermal loads: -k*delta0 at the from end, +k*delta0 at the to end
    F[1:] += k * delta0
    diag = np.zeros(n + 1)
    diag[:-1] += k
    diag[1:] += k
    diag[d["spring_at"]] += d["spring_k"]
    ab = np.zeros((3, n - 1))
    ab[0, 1:] = -k[1:-1]
    ab[1] = diag[1:-1]
    ab[2, :-1] = -k[1:-1]
    u = np.zeros(n + 1)
    u[1:-1] = solve_banded((1, 1), ab, F[1:-1], check_finite=False)
    return k * (np.diff(u) - delta0)


def plain_python(n: int, d):
    """The same chain by a loop filling a lil_matrix, then spsolve."""
    import scipy.sparse as sp
    from scipy.sparse.linalg import spsolve

    x, E, A, alpha, dT = d["x"], d["E"], d["A"], d["alpha"], d["dT"]
    K = sp.lil_matrix((n + 1, n + 1))
    F = np.zeros(n + 1)
    for i in range(n):
        L = x[i + 1] - x[i]
        k = E[i] * A[i] / L
        K[i, i] += k
        K[i + 1, i + 1] += k
        K[i, i + 1] -= k
        K[i + 1, i] -= k
        F[i] -= k * alpha[i] * dT[i] * L
        F[i + 1] += k * alpha[i] * dT[i] * L
    for i, f in zip(d["load_at"], d["load"]):
        F[i] += f
    for i in d["spring_at"]:
        K[i, i] += d["spring_k"]
    free = np.arange(1, n)
    Kf = K.tocsr()[free][:, free]
    u = np.zeros(n + 1)
    u[free] = spsolve(Kf.tocsc(), F[free])
    L = np.diff(x)
    return E * A / L * (np.diff(u) - alpha * dT * L)


def best(fn, *args, repeat=3):
    times, out = [], None
    for _ in range(repeat):
        t0 = time.perf_counter()
        out = fn(*args)
        times.append(time.perf_counter() - t0)
    return min(times), out


def alternate(fns, repeat=7):
    """The best wall-clock and CPU (process) time of each function, run in turns.

    Run in turns, a load that comes and goes on the machine reaches each alike; the
    CPU time leaves out the time the process waits for a core.
    """
    wall, cpu, outs = [[] for _ in fns], [[] for _ in fns], [None] * len(fns)
    for _ in range(repeat):
        for i, fn in enumerate(fns):
            outs[i] = None             # the previous result is not kept while timing the next
            t0, c0 = time.perf_counter(), time.process_time()
            outs[i] = fn()
            wall[i].append(time.perf_counter() - t0)
            cpu[i].append(time.process_time() - c0)
    return [min(t) for t in wall], [min(t) for t in cpu], outs


def load() -> str:
    return "load average %.2f %.2f %.2f" % os.getloadavg()


def row(label, value, anchor_label, anchor):
    print(f"  {label:<34s} {value * 1e3:9.1f} ms   {anchor_label:<30s} {anchor * 1e3:9.1f} ms"
          f"   ratio {value / anchor:6.2f}")


def run(n: int, small: int = 100_000, repeat: int = 7):
    print(f"banded factorisation: a chain of {n:,} segments")
    d = data(n)
    t_floor, N_floor = best(floor, n, d)
    t_build, model = best(build, n, d)
    t_copy, _ = best(build_floor, n, d)
    row("Model.from_arrays", t_build, "floor (solve_banded + numpy)", t_floor)
    row("Model.from_arrays", t_build, "copy each input once", t_copy)
    from axialfe.engine.system import System
    from axialfe.model.cases import load_states

    state = load_states(model)[0]
    print(f"  (solve, engine and floor run in turns, best of {repeat}; {load()})")
    (t_solve, t_engine, t_floor), (c_solve, c_engine, c_floor), (sol, _, N_floor) = alternate(
        [lambda: solve(model), lambda: System(model).solve_state(state), lambda: floor(n, d)],
        repeat)
    N = sol["base"].axial_force[:, 0]
    rel = np.abs(N - N_floor).max() / np.abs(N_floor).max()
    row("axialfe.solve", t_solve, "floor (solve_banded + numpy)", t_floor)
    row("engine alone (System, one case)", t_engine, "floor (solve_banded + numpy)", t_floor)
    row("axialfe.solve, CPU time", c_solve, "floor, CPU time", c_floor)
    print(f"  ({load()})")
    tracemalloc.start()
    solve(model)
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    print(f"  same answer: max |N - N_floor| / max |N| = {rel:.1e} (goal <= 1e-9); "
          f"peak traced memory of the solve {peak / 1e6:.0f} MB (goal < 1000)")
    d = data(small)
    model = build(small, d)
    t_small, sol = best(lambda: solve(model))
    t_plain, N_plain = best(plain_python, small, d, repeat=1)
    N = sol["base"].axial_force[:, 0]
    rel = np.abs(N - N_plain).max() / np.abs(N_plain).max()
    row(f"axialfe.solve, {small:,} segments", t_small, "plain Python (lil + spsolve)", t_plain)
    print(f"  same answer as the plain script: {rel:.1e}")


if __name__ == "__main__":
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    n = int(args[0]) if args else 1_000_000
    if "--profile" in sys.argv:
        d = data(n)
        model = build(n, d)
        prof = cProfile.Profile()
        prof.runcall(solve, model)
        pstats.Stats(prof).sort_stats("tottime").print_stats(25)
    else:
        run(n)
