"""A fuzzer over the examples: mutants are solved or refused with one located line.

Every example model (``examples/*.toml`` and ``examples/fits/*.toml``) is
mutated by hypothesis (a key deleted, a table duplicated, a value replaced by a
random TOML value of another type, random unicode inserted, the text cut at a
random byte), and random models that look valid are generated.  The property:
the outcome is a solution whose every case is certified (status ok), or one
:class:`~axialfe.errors.AxialfeError` whose message starts with the file's
name; never another exception, and never a hang (a watchdog of
:data:`HANG_SECONDS` per example stops one).

The default profile runs a few examples per file; ``AXIALFE_HYPOTHESIS=thorough``
runs 1,100 per file (over 10,000 in all) before a release.
"""

from __future__ import annotations

import contextlib
import copy
import datetime
import glob
import os
import signal
import sys
import tomllib

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "bad_inputs"))

from corpus import dumps  # noqa: E402

from axialfe.cli.guards import numerics_guarded  # noqa: E402
from axialfe.errors import AxialfeError  # noqa: E402

ROOT = os.path.join(os.path.dirname(__file__), os.pardir, "examples")
EXAMPLES = sorted(glob.glob(os.path.join(ROOT, "*.toml")) + glob.glob(os.path.join(ROOT, "fits", "*.toml")))
THOROUGH = os.environ.get("AXIALFE_HYPOTHESIS") == "thorough"
PER_FILE = 1100 if THOROUGH else 12
HANG_SECONDS = 60   # a hang detector, not a speed target: a mutant solves in milliseconds

_FUZZ = settings(max_examples=PER_FILE, deadline=None, derandomize=not THOROUGH,
                 suppress_health_check=list(HealthCheck), database=None)


class Hang(Exception):
    """An example that ran past the watchdog."""


@contextlib.contextmanager
def watchdog(seconds=HANG_SECONDS):
    def ring(signum, frame):
        raise Hang(f"no outcome within {seconds} s")

    old = signal.signal(signal.SIGALRM, ring)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, old)


def run(text: str, name: str, fit: bool):
    """Read and solve ``text``; return the solution, or raise the tool's one error."""
    with numerics_guarded(name):
        if fit:
            from axialfe.fits.fit import solve_fit
            from axialfe.fits.reader import parse_fit

            return solve_fit(parse_fit(text, name))
        from axialfe.engine.system import solve
        from axialfe.io.modelfile import parse_model

        return solve(parse_model(text, name))


def check_outcome(text: str, name: str = "fuzz.toml", fit: bool = False):
    """The property: a certified solution, or one located AxialfeError."""
    try:
        with watchdog():
            result = run(text, name, fit)
    except AxialfeError as exc:
        line = str(exc)
        # located in the model file, or in a table file it names (beside it, .csv)
        head = line.split(":", 1)[0]
        assert line.startswith(name) or (head.endswith(".csv") and "/" not in head), line
        assert "\n" not in line and "Traceback" not in line
        return "refused"
    if not fit:
        bad = [(c.name, c.message) for c in result.cases if c.status != "ok"]
        assert not bad, bad
    return "solved"


# --- values and mutations -------------------------------------------------------------
_scalars = st.one_of(
    st.integers(min_value=-10**30, max_value=10**30),
    st.floats(allow_nan=True, allow_infinity=True),
    st.text(max_size=12),
    st.sampled_from(["0 mm", "-1 mm", "1e300 mm", "1e-300 m", "20 degC", "-300 degC", "1 kN",
                     "5 GPa", "0 K", "mm^9^9", "(2^16)^16 mm", "nan mm", "1 m/s^2", "2 in"]),
    st.booleans(),
    st.dates(min_value=datetime.date(1, 1, 1), max_value=datetime.date(9999, 12, 31)),
)
_values = st.recursive(_scalars, lambda inner: st.one_of(
    st.lists(inner, max_size=3),
    st.dictionaries(st.text(min_size=1, max_size=6), inner, max_size=3)), max_leaves=6)


def _paths(data, prefix=()):
    """Every path to a value inside ``data``."""
    out = []
    if isinstance(data, dict):
        for k, v in data.items():
            out.append(prefix + (k,))
            out += _paths(v, prefix + (k,))
    elif isinstance(data, list):
        for i, v in enumerate(data):
            out.append(prefix + (i,))
            out += _paths(v, prefix + (i,))
    return out


def _parent(data, path):
    for p in path[:-1]:
        data = data[p]
    return data


@st.composite
def mutant(draw, text):
    """One mutation of a TOML text."""
    kind = draw(st.sampled_from(["delete", "duplicate", "replace", "unicode", "truncate",
                                 "replace", "delete"]))
    if kind == "truncate":
        raw = text.encode("utf-8")
        return raw[:draw(st.integers(0, len(raw)))].decode("utf-8", "ignore")
    if kind == "unicode":
        at = draw(st.integers(0, len(text)))
        return text[:at] + draw(st.text(min_size=1, max_size=4)) + text[at:]
    data = tomllib.loads(text)
    paths = _paths(data)
    if not paths:
        return text
    path = draw(st.sampled_from(paths))
    parent = _parent(data, path)
    if kind == "delete":
        del parent[path[-1]]
    elif kind == "duplicate":
        target = parent[path[-1]]
        if isinstance(parent, list):
            parent.append(copy.deepcopy(target))
        elif isinstance(target, list) and target:
            target.append(copy.deepcopy(target[0]))
        else:
            parent[f"{path[-1]}_2" if isinstance(path[-1], str) else path[-1]] = copy.deepcopy(target)
    else:
        parent[path[-1]] = draw(_values)
    try:
        return dumps(data)
    except (TypeError, ValueError):
        return text


def _example_id(path):
    return os.path.relpath(path, ROOT)


@pytest.mark.parametrize("path", EXAMPLES, ids=_example_id)
def test_mutants_of_every_example_are_solved_or_refused(path, monkeypatch):
    monkeypatch.chdir(os.path.dirname(path))   # where an example's table files are found
    with open(path, encoding="utf-8") as fh:
        text = fh.read()
    fit = "[fit]" in text
    name = os.path.basename(path)
    assert check_outcome(text, name, fit) == "solved"   # the example itself is good

    @_FUZZ
    @given(mutant(text))
    def prop(mutated):
        check_outcome(mutated, name, fit)

    prop()


# --- random models that look valid ------------------------------------------------------
_UNITS = {"length": ["mm", "m", "in"], "force": ["N", "kN", "lbf"], "stress": ["GPa", "MPa", "ksi"]}


@st.composite
def chain_model(draw):
    """A random chain of segments with supports, loads and gaps, in mixed units."""
    n = draw(st.integers(1, 6))
    xs = sorted(set(draw(st.lists(st.floats(-5e3, 5e3, allow_nan=False), min_size=n + 1,
                                  max_size=n + 1))))
    if len(xs) < 2:
        xs = [0.0, 100.0]
    lines = ["[materials.m]",
             f'elastic_modulus = "{draw(st.floats(1e-3, 1e3)):g} GPa"',
             f'thermal_expansion = "{draw(st.floats(-1e-4, 1e-4)):g} /K"', "",
             "[sections.s]", 'shape = "round"', f'diameter = "{draw(st.floats(1e-3, 1e3)):g} mm"',
             "", "[stations]"]
    lines += [f's{i} = "{x:.6g} {draw(st.sampled_from(["mm"]))}"' for i, x in enumerate(xs)]
    for i in range(len(xs) - 1):
        lines += ["", "[[segments]]", f'from = "s{i}"', f'to = "s{i + 1}"', 'material = "m"',
                  'section = "s"',
                  f'temperature_change = "{draw(st.floats(-200, 200)):g} K"']
    ends = draw(st.sampled_from([(0,), (len(xs) - 1,), (0, len(xs) - 1)]))
    for e in ends:
        lines += ["", "[[supports]]", f'at = "s{e}"']
    for _ in range(draw(st.integers(0, 3))):
        at = draw(st.integers(0, len(xs) - 1))
        lines += ["", "[[loads]]", f'at = "s{at}"',
                  f'force = "{draw(st.floats(-1e6, 1e6)):g} {draw(st.sampled_from(_UNITS["force"]))}"']
    for j in range(draw(st.integers(0, 3))):
        at = draw(st.integers(0, len(xs) - 1))
        lines += ["", "[[gaps]]", f'name = "g{j}"', f'at = "s{at}"',
                  f'side = "{draw(st.sampled_from(["+x", "-x"]))}"',
                  f'clearance = "{draw(st.floats(0, 5)):g} mm"']
    return "\n".join(lines) + "\n"


@settings(max_examples=4 * PER_FILE, deadline=None, derandomize=not THOROUGH,
          suppress_health_check=list(HealthCheck), database=None)
@given(chain_model())
def test_random_models_are_solved_or_refused(text):
    check_outcome(text)
