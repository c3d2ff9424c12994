"""The start of a small solve: the unit table kept between runs, and parts found without scipy's graph module.

No timings here (they are in benchmarks/bench_startup.py): these tests check
that what the faster start skips gives the same answers as what it replaces.
"""

import json
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
from hypothesis import given
from hypothesis import strategies as st
from test_properties import PROPS

from axialfe.engine.dofs import connected_components

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "stepped-rod-between-walls.toml"


@PROPS
@given(st.integers(1, 40).flatmap(lambda n: st.tuples(
    st.just(n), st.lists(st.tuples(st.integers(0, n - 1), st.integers(0, n - 1)), max_size=60))))
def test_small_graphs_are_split_as_scipy_splits_them(graph):
    import scipy.sparse as sp
    from scipy.sparse.csgraph import connected_components as scipy_components

    n, edges = graph
    a = np.array([e[0] for e in edges], dtype=int)
    b = np.array([e[1] for e in edges], dtype=int)
    count, labels = connected_components(n, a, b)
    ref_count, ref = scipy_components(sp.coo_matrix((np.ones(len(a)), (a, b)), shape=(n, n)),
                                      directed=False)
    assert count == ref_count
    assert labels.tolist() == ref.tolist()


@PROPS
@given(st.integers(1, 30).flatmap(lambda n: st.tuples(
    st.just(n), st.lists(st.integers(0, n - 1), min_size=n - 1, max_size=n - 1),
    st.lists(st.tuples(st.integers(0, n - 1), st.integers(0, n - 1)), max_size=20),
    st.randoms(use_true_random=False))))
def test_graphs_joined_downward_are_one_part_as_scipy_finds(graph):
    # every station but the first tied to one of lower index (a chain, parallel parts
    # numbered along the bar): the shortcut's one part, against scipy's own count
    import scipy.sparse as sp
    from scipy.sparse.csgraph import connected_components as scipy_components

    n, lower, extra, rnd = graph
    edges = [(min(lower[i - 1], i - 1), i) for i in range(1, n)] + list(extra)
    rnd.shuffle(edges)
    edges = [e if rnd.random() < 0.5 else e[::-1] for e in edges]
    a = np.array([e[0] for e in edges], dtype=int)
    b = np.array([e[1] for e in edges], dtype=int)
    count, labels = connected_components(n, a, b)
    ref_count, ref = scipy_components(sp.coo_matrix((np.ones(len(a)), (a, b)), shape=(n, n)),
                                      directed=False)
    assert count == ref_count == 1
    assert labels.tolist() == ref.tolist()


def run(code, cache):
    env = dict(os.environ, AXIALFE_CACHE_DIR=str(cache), PYTHONPATH=str(ROOT))
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env,
                          cwd=ROOT)
    assert done.returncode == 0, done.stderr
    return done.stdout


PARSE = ("import sys, json\n"
         "from axialfe.units import parse_quantity\n"
         "from axialfe.errors import UnitError\n"
         "out = [parse_quantity(v, k) for v, k in (('29000 ksi', 'stress'), ('50 kN/mm', 'stiffness'),"
         " ('6.5e-6 /delta_degF', 'thermal_expansion'), ('15 degC', 'temperature_difference'))]\n"
         "try:\n    parse_quantity('3 kN', 'length')\nexcept UnitError as exc:\n    out.append(str(exc))\n"
         "print(json.dumps([out, 'pint' in sys.modules]))\n")


def test_the_unit_table_gives_the_same_values_and_messages_without_starting_pint(tmp_path):
    first, started = json.loads(run(PARSE, tmp_path))
    assert started
    assert first[4] == "'kN' is a unit of force, not of length, e.g. '40 mm'"
    tables = list(tmp_path.glob("units-pint-*.json"))
    assert len(tables) == 1
    second, started = json.loads(run(PARSE, tmp_path))
    assert not started
    assert second == first


def test_an_unreadable_unit_table_is_ignored(tmp_path):
    first, _ = json.loads(run(PARSE, tmp_path))
    table = next(tmp_path.glob("units-pint-*.json"))
    table.write_text('{"units": {"ksi": [1, 0, "not dimensions"]}', encoding="utf-8")
    again, started = json.loads(run(PARSE, tmp_path))
    assert started and again == first
    json.loads(table.read_text(encoding="utf-8"))       # rewritten whole


def test_a_small_solve_loads_neither_pint_nor_scipys_linear_algebra(tmp_path):
    code = ("import sys, io, contextlib\n"
            "from axialfe.cli import main\n"
            f"sys.argv = ['axialfe', 'solve', {str(EXAMPLE)!r}]\n"
            "with contextlib.redirect_stdout(io.StringIO()):\n"
            "    try:\n        main()\n    except SystemExit:\n        pass\n"
            "print(sorted(m for m in ('pint', 'scipy.linalg', 'scipy.sparse.csgraph', 'sympy',"
            " 'matplotlib') if m in sys.modules))\n")
    run(code, tmp_path)                                 # fills the unit table
    assert run(code, tmp_path).strip() == "[]"
