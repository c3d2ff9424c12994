"""Closed-form speed: 12 segments in series, 3 supports, 8 symbols.

A stepped chain of two materials between three fixed supports, with two point
loads and a temperature change, every value a symbol.  The target is closed
forms for every reaction, displacement, force and stress in a few seconds.

    python benchmarks/bench_closed_form.py
"""

import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # run from a source tree

SEGMENTS = 12


def model_text(n=SEGMENTS):
    lines = ['title = "closed-form benchmark chain"', "[symbols]",
             'E_1 = "205 GPa"', 'E_2 = "110 GPa"', 'A_1 = "400 mm^2"', 'A_2 = "250 mm^2"',
             'a = "150 mm"', 'P = "12 kN"', 'Q = "-5 kN"', 'dT = "40 K"',
             "[materials.m1]", 'elastic_modulus = "E_1"', 'thermal_expansion = "12e-6 /K"',
             "[materials.m2]", 'elastic_modulus = "E_2"', 'thermal_expansion = "18e-6 /K"',
             "[sections.s1]", 'shape = "area"', 'area = "A_1"',
             "[sections.s2]", 'shape = "area"', 'area = "A_2"',
             "[settings]", 'temperature_change = "dT"', "[stations]"]
    lines += [f's{i} = "{i}*a"' if i else 's0 = "0 mm"' for i in range(n + 1)]
    for i in range(n):
        m = 1 + (i // 3) % 2
        lines += ["[[segments]]", f'from = "s{i}"', f'to = "s{i + 1}"', f'material = "m{m}"',
                  f'section = "s{m}"']
    for at in (0, n // 2, n):
        lines += ["[[supports]]", f'at = "s{at}"']
    lines += ["[[loads]]", 'at = "s3"', 'force = "P"', "[[loads]]", f'at = "s{n - 3}"', 'force = "Q"']
    return "\n".join(lines) + "\n"


def main():
    t0 = time.perf_counter()
    import sympy  # noqa: F401  (import cost counted apart)

    from axialfe.io.modelfile import parse_model
    from axialfe.engine.system import solve
    from axialfe.symbolic.closed_form import closed_form_dict, numeric_model, solve_symbolic

    t1 = time.perf_counter()
    model = parse_model(model_text(), "bench.toml", symbolic=True)
    t2 = time.perf_counter()
    cf = solve_symbolic(model)
    t3 = time.perf_counter()
    numeric = solve(numeric_model(model))["base"]
    data = closed_form_dict(cf, numeric)
    t4 = time.perf_counter()
    worst = max(e["relative_difference"] for g in ("reactions", "displacements", "axial_forces",
                                                  "stresses") for e in data[g].values())
    print(f"imports {t1 - t0:.2f} s, read {t2 - t1:.2f} s, closed form {t3 - t2:.2f} s, "
          f"evaluate and compare {t4 - t3:.2f} s; total {t4 - t0:.2f} s")
    print(f"{len(model.segments)} segments, {len(model.supports)} supports, "
          f"{len(model.symbols)} symbols; worst relative difference {worst:.1e}")
    print("left reaction:", data["reactions"]["s0"]["expression"])


if __name__ == "__main__":
    main()
