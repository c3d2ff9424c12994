"""Benchmark: a 20,000-segment model *file* solved end to end by ``axialfe solve``.

Writes a generated model (a long stepped bar between two walls, mixed units,
a few materials and sections, a temperature change on every segment, point
loads at every tenth station, springs every thousandth) to a temporary folder,
then times ``python -m axialfe solve`` on it as a user would run it, for the
table and the JSON output, against ``python -c "import numpy, scipy.sparse"`` (the
two taken in turn, best of three each).  The same model with its stations and
segments in CSV files (``[stations] file = ...``) is timed the same way.  It also times the stages in this process (TOML
parse, model reading, solve, rendering) to show where the time goes.  Target:
a few seconds.  Run from the project root:

    python benchmarks/bench_file.py [n_segments] [--profile]

Each ratio is printed for wall time and for CPU time (user + system of the child
process): on a machine shared with other work the wall times of both commands
stretch, the CPU times much less.  ``uptime`` before a run tells the load.
"""

from __future__ import annotations

import cProfile
import os
import pstats
import resource
import subprocess
import sys
import tempfile
import time
import tomllib
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))  # this checkout's axialfe

from axialfe.io.modelfile import read_model  # noqa: E402
from axialfe.output.text import render  # noqa: E402
from axialfe.engine.system import solve  # noqa: E402


def write_model(path: Path, n: int, seed: int = 2, tables: bool = False) -> None:
    """The generated model; with ``tables`` its stations and segments go to CSV files beside it
    (the same numbers, as text, in both forms)."""
    rng = np.random.default_rng(seed)
    lengths = rng.uniform(5.0, 20.0, n)
    x = np.concatenate([[0.0], np.cumsum(lengths)])
    out = ['title = "Generated chain"', "", "[settings]", 'temperature_change = "15 K"', "",
           "[materials.bar-steel]", 'elastic_modulus = "29000 ksi"',
           'thermal_expansion = "6.5e-6 /delta_degF"', ""]
    for d in (16, 20, 25, 32, 40):
        out += [f"[sections.d{d}]", 'shape = "round"', f'diameter = "{d} mm"', ""]
    mats = ("bar-steel", "aluminium-alloy", "brass")
    mi, si = rng.integers(0, 3, n), rng.choice([16, 20, 25, 32, 40], n)
    dT = rng.uniform(-20.0, 60.0, n)
    if tables:
        out += ["[stations]", 'file = "stations.csv"', "", "[segments]",
                'file = "segments.csv"', ""]
        (path.parent / "stations.csv").write_text(
            "name,x [mm]\n" + "".join(f"s{i},{v:.6f}\n" for i, v in enumerate(x)),
            encoding="utf-8")
        (path.parent / "segments.csv").write_text(
            "name,from,to,material,section,temperature_change [K]\n" + "".join(
                f"e{i},s{i},s{i + 1},{mats[mi[i]]},d{si[i]},"
                + (f"{dT[i]:.3f}" if i % 3 == 0 else "") + "\n" for i in range(n)),
            encoding="utf-8")
    else:
        out += ["[stations]"]
        out += [f's{i} = "{v:.6f} mm"' for i, v in enumerate(x)]
        out.append("")
        for i in range(n):
            out += ["[[segments]]", f'name = "e{i}"', f'from = "s{i}"', f'to = "s{i + 1}"',
                    f'material = "{mats[mi[i]]}"', f'section = "d{si[i]}"']
            if i % 3 == 0:
                out.append(f'temperature_change = "{dT[i]:.3f} K"')
            out.append("")
    out += ["[[supports]]", 'at = "s0"', "", "[[supports]]", f'at = "s{n}"', ""]
    for i in range(1000, n, 1000):
        out += ["[[supports]]", f'at = "s{i}"', 'kind = "spring"', 'stiffness = "50 kN/mm"', ""]
    for i in range(10, n, 10):
        out += ["[[loads]]", f'at = "s{i}"', f'force = "{rng.uniform(-5, 5):.4f} kN"', ""]
    path.write_text("\n".join(out), encoding="utf-8")


def _child_cpu() -> float:
    """CPU seconds (user + system) of the finished child processes so far."""
    use = resource.getrusage(resource.RUSAGE_CHILDREN)
    return use.ru_utime + use.ru_stime


def cli_time(path: Path, *args, cpu: bool = False):
    """Wall time of one ``axialfe solve`` (with ``cpu``: and its CPU time, which other work
    on a shared machine stretches less)."""
    env = dict(os.environ, PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    c0, t0 = _child_cpu(), time.perf_counter()
    done = subprocess.run([sys.executable, "-m", "axialfe", "solve", str(path), *args],
                          capture_output=True, text=True, cwd=ROOT, env=env)
    dt, dc = time.perf_counter() - t0, _child_cpu() - c0
    if done.returncode != 0:
        raise SystemExit(f"axialfe solve failed: {done.stderr}")
    return (dt, dc) if cpu else dt


def stages(path: Path):
    t0 = time.perf_counter()
    tomllib.loads(path.read_text(encoding="utf-8"))
    t1 = time.perf_counter()
    model = read_model(path)
    t2 = time.perf_counter()
    sol = solve(model)
    t3 = time.perf_counter()
    text = render(sol, "table")
    t4 = time.perf_counter()
    print(f"  in process: tomllib parse {t1 - t0:.3f} s, read_model (incl. parse) {t2 - t1:.3f} s,"
          f" solve {t3 - t2:.3f} s, table {t4 - t3:.3f} s ({len(text) / 1e6:.1f} MB)")
    print(f"  equilibrium residual {sol['base'].equilibrium_residual:.2e}")


def floor_time():
    """Wall and CPU time of ``python -c "import numpy, scipy.sparse"``."""
    c0, t0 = _child_cpu(), time.perf_counter()
    subprocess.run([sys.executable, "-c", "import numpy, scipy.sparse"], check=True)
    return time.perf_counter() - t0, _child_cpu() - c0


def alternate(path: Path, repeat: int = 3):
    """Best of ``repeat`` runs of ``axialfe solve`` and of the import floor, taken in turn:
    wall times, then CPU times."""
    runs, floors = [], []
    for _ in range(repeat):
        floors.append(floor_time())
        runs.append(cli_time(path, cpu=True))
    return (min(r[0] for r in runs), min(f[0] for f in floors),
            min(r[1] for r in runs), min(f[1] for f in floors))


def main(n: int, profile: bool):
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "chain.toml"
        write_model(path, n)
        (Path(tmp) / "csv").mkdir()
        split = Path(tmp) / "csv" / "chain.toml"
        write_model(split, n, tables=True)
        print(f"model file of {n:,} segments: {path.stat().st_size / 1e6:.1f} MB; with its "
              f"stations and segments in CSV files: "
              f"{sum(p.stat().st_size for p in split.parent.iterdir()) / 1e6:.1f} MB")
        if profile:
            prof = cProfile.Profile()
            prof.runcall(lambda: render(solve(read_model(path)), "table"))
            pstats.Stats(prof).sort_stats("cumulative").print_stats(25)
            return
        a, b = read_model(path).arrays, read_model(split).arrays
        same = all(np.array_equal(getattr(a, k), getattr(b, k), equal_nan=True)
                   for k in a.__dataclass_fields__)
        print(f"  both forms read to the same arrays: {same}")
        stages(path)
        for label, p in (("TOML", path), ("CSV tables", split)):
            t0 = time.perf_counter()
            read_model(p)
            t_read = time.perf_counter() - t0
            table, floor, table_cpu, floor_cpu = alternate(p)
            print(f"  {label:<10s} axialfe solve (table), end to end {table:6.2f} s   "
                  f"import numpy, scipy.sparse {floor:5.2f} s   ratio {table / floor:5.1f} "
                  f"(goal <= 10); read_model in process {t_read:5.2f} s")
            print(f"  {'':<10s} the same in CPU time                {table_cpu:6.2f} s   "
                  f"                           {floor_cpu:5.2f} s   ratio "
                  f"{table_cpu / floor_cpu:5.1f}")
        print(f"  axialfe solve --format json         {cli_time(path, '--format', 'json'):6.2f} s")
        print(f"  axialfe solve --format csv -o file  "
              f"{cli_time(path, '--format', 'csv', '-o', str(Path(tmp) / 'out.csv')):6.2f} s")


if __name__ == "__main__":
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    main(int(args[0]) if args else 20_000, "--profile" in sys.argv)
