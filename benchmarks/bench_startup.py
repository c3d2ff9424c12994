"""Benchmark: the start of ``axialfe solve`` on a small model against the import floor.

Runs, alternately and as whole processes, ``axialfe solve`` of a small example
and ``python -c "import numpy, scipy.sparse"`` (the floor: the libraries the
command cannot do without), and prints the median of each and their ratio.
Goal: at most 2 times the floor.  The unit table kept between runs is warmed
first (one run), as a user's second run finds it.  Run from the project root:

    python benchmarks/bench_startup.py [rounds]
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "stepped-rod-between-walls.toml"
SOLVE = [sys.executable, "-m", "axialfe", "solve", str(EXAMPLE)]
FLOOR = [sys.executable, "-c", "import numpy, scipy.sparse"]


def once(cmd) -> float:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    t0 = time.perf_counter()
    done = subprocess.run(cmd, capture_output=True, text=True, cwd=ROOT, env=env)
    dt = time.perf_counter() - t0
    if done.returncode != 0:
        raise SystemExit(f"{' '.join(cmd)} failed: {done.stderr}")
    return dt


def measure(rounds: int = 15):
    once(SOLVE)  # warms the unit table and the file system cache
    once(FLOOR)
    solve, floor = [], []
    for _ in range(rounds):
        solve.append(once(SOLVE))
        floor.append(once(FLOOR))
    return statistics.median(solve), statistics.median(floor)


def main(rounds: int):
    s, f = measure(rounds)
    print(f"start-up: axialfe solve (small model) {s * 1e3:7.0f} ms   "
          f"import numpy, scipy.sparse {f * 1e3:7.0f} ms   ratio {s / f:5.2f}  (goal <= 2)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 15)
