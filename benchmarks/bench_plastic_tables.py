"""Benchmark: an elastic-plastic path over tables against temperature, by chain length.

A chain of n prismatic segments between two walls (invented data: every segment
with E, f_y and the mean expansion from tables at 20, 200 and 400 degC, linear
hardening, areas and strengths varied so that the segments yield one by one) is
heated by 300 K and cooled back with ``axialfe path``'s tracker.  Each leg is cut
at the table entries and every event is found by bracketed root-finding on the
model rebuilt at each point's temperatures (``tracking/plastictables.py``), so
the cost grows with the events (about one per segment) times the points per
event times one rebuild (a factorisation and the plastic-strain influence
matrix, n x n).  Shown: wall-clock time and events per n; the constant-property
path of the same chain (its properties at 20 degC) beside it.  No goal is set
yet: this is the measure to improve against.  Run from the project root:

    python benchmarks/bench_plastic_tables.py [n ...] [--profile]
"""

from __future__ import annotations

import cProfile
import pstats
import sys
import time

import numpy as np

from axialfe import Model, Segment, Station, Support
from axialfe.model import Material, PropertyTable, Section
from axialfe.tracking.plastic import parse_path, track_path

C = 273.15
T0 = 20 + C
TEMPS = np.array([20.0, 200.0, 400.0]) + C


def chain(n, tables=True):
    mats = []
    for i in range(n):
        fy = 250e6 * (1 + 0.01 * (i % 5))
        kw = dict(behaviour="elastic-plastic", hardening_modulus=2e9)
        if tables:
            kw.update(modulus_table=PropertyTable(TEMPS, (203e9, 191e9, 178e9)),
                      yield_table=PropertyTable(TEMPS, (fy, 0.88 * fy, 0.72 * fy)),
                      expansion_table=PropertyTable(TEMPS, (11.5e-6, 12.2e-6, 13e-6),
                                                    reference=T0),
                      expansion_kind="mean")
            mats.append(Material(f"m{i}", 203e9, 0.0, fy, **kw))
        else:
            mats.append(Material(f"m{i}", 203e9, 11.5e-6, fy, **kw))
    stations = [Station(f"s{i}", i * 0.1) for i in range(n + 1)]
    segments = [Segment(f"e{i}", f"s{i}", f"s{i + 1}", mats[i],
                        Section(f"a{i}", "area", (("area", 1e-4 * (1 + 0.1 * (i % 3))),)))
                for i in range(n)]
    return Model(stations, segments, [Support("s0"), Support(f"s{n}")],
                 reference_temperature=T0)


def timed(model):
    legs, _ = parse_path("temperature-change 0 K..300 K; temperature-change 300 K..0 K")
    start = time.perf_counter()
    result = track_path(model, legs)
    return time.perf_counter() - start, len(result.events)


if __name__ == "__main__":
    sizes = [int(a) for a in sys.argv[1:] if not a.startswith("--")] or [10, 50, 100]
    if "--profile" in sys.argv:
        prof = cProfile.Profile()
        prof.runcall(timed, chain(sizes[0]))
        pstats.Stats(prof).sort_stats("tottime").print_stats(25)
    else:
        for n in sizes:
            t_tab, e_tab = timed(chain(n))
            t_con, e_con = timed(chain(n, tables=False))
            print(f"{n:5d} segments: over tables {t_tab:7.2f} s ({e_tab} events); "
                  f"constant properties {t_con:6.2f} s ({e_con} events)")
