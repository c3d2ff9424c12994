"""Benchmark: reviewing a stated value of a large model (many slips, one budget).

A generated chain (see ``bench_chain.py``: every segment heated, loads at every
tenth station) gets one claim that no slip explains, so that every slip that
applies is tried up to the review's budget of slipped solves.  Target: a few
seconds whatever the size, with the number of untried slips stated.  Run from
the project root:

    python benchmarks/bench_verify.py [n_segments ...]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))  # this checkout's axialfe
sys.path.insert(0, str(Path(__file__).resolve().parent))

from bench_chain import build  # noqa: E402

from axialfe.engine.system import solve  # noqa: E402
from axialfe.review import Claim, verify  # noqa: E402


def main(sizes):
    for n in sizes:
        model = build(n)
        solution = solve(model)
        start = time.perf_counter()
        review = verify(model, [Claim("reaction", "s0", 12345.0)], solution)
        took = time.perf_counter() - start
        item = review.claims[0]
        print(f"{n:>8} segments: review {took:6.2f} s, slips found {len(item.slips)}, "
              f"untried {item.untried}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [200, 2000, 20000])
