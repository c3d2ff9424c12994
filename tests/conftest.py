"""Shared test helpers: small model builders and an assertion that shows the case."""

from __future__ import annotations

import os

import numpy as np
import pytest
from hypothesis import settings

from axialfe.model import Material, Section

# the unit table kept between runs stays off in tests (tests/test_startup.py turns it on)
os.environ.setdefault("AXIALFE_CACHE_DIR", "")

settings.register_profile("axialfe", max_examples=40, derandomize=True, deadline=None)
# a longer, randomised search for local runs: AXIALFE_HYPOTHESIS=thorough python -m pytest
settings.register_profile("thorough", max_examples=500, deadline=None)
PROFILE = os.environ.get("AXIALFE_HYPOTHESIS", "axialfe")
settings.load_profile(PROFILE)
THOROUGH_FACTOR = 10  # how many times more examples the thorough profile draws


def examples(n: int) -> int:
    """Return the number of examples for a test that needs fewer (or more) than the profile's.

    ``n`` in the default profile, ``THOROUGH_FACTOR * n`` in the thorough one: a test
    never fixes ``max_examples`` itself, so the thorough profile reaches every test.
    Use it as ``@settings(max_examples=examples(12))``; the other settings
    (derandomisation, deadline) come from the loaded profile.
    """
    return n * THOROUGH_FACTOR if PROFILE == "thorough" else n

EXAMPLES = os.path.join(os.path.dirname(__file__), os.pardir, "examples")


def area(name, a, second_moment=None):
    dims = (("area", a),) + ((("second_moment", second_moment),) if second_moment else ())
    return Section(name, "area", dims)


def steel(name="steel", E=200e9, alpha=12e-6, **kw):
    return Material(name, E, alpha, **kw)


def assert_close(actual, expected, rel=1e-9, abs_=0.0, what=""):
    """np.testing.assert_allclose with the quantity named in the failure text."""
    np.testing.assert_allclose(actual, expected, rtol=rel, atol=abs_, err_msg=what)


@pytest.fixture
def cli():
    from typer.testing import CliRunner

    from axialfe.cli import app

    runner = CliRunner()

    def run(*args):
        return runner.invoke(app, [str(a) for a in args])

    return run
