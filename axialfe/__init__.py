"""axialfe: axially loaded members by the direct stiffness method.

Modules, one job each (anything not in ``axialfe.__all__`` is internal):

- ``model``: the input concepts, frozen dataclasses in SI floats that check themselves;
- ``units``: the only module that imports pint; strings with units in, SI floats out;
- ``modelfile``: the TOML reader, with located, one-line errors;
- ``expressions``: the whitelist parser of symbolic model values (symbols, numbers, units);
- ``symbolic``: closed forms, the same system assembled and solved exactly with sympy;
- ``loading``: load states of cases and combinations as arrays;
- ``assemble``: element stiffness, equivalent loads and the sparse global matrix;
- ``solve``: factorisation, the gap search and recovery of forces and reactions;
- ``sweep``: temperature and load-factor sweeps with exact events (``sweepout`` writes them);
- ``results``: frozen result objects with named arrays and look-ups;
- ``output``: tables, JSON, CSV and Markdown for the terminal and files;
- ``checks``: design checks (strength, Euler buckling, deformation limits) of solved cases;
- ``plot``: force, stress and displacement diagrams and sweep plots (matplotlib, Agg);
- ``report``: the self-contained HTML or Markdown report document;
- ``cli``: the thin typer command line;
- ``errors``: the exception family.
"""

from importlib.metadata import PackageNotFoundError, version

from .errors import AxialfeError, ModelError, SolveError, UnitError
from .model import (Case, Combination, Gap, Load, Material, Model, Section, Segment, Station,
                    Support)
from .modelfile import builtin_materials, parse_model, read_model
from .results import CaseResult, Solution
from .solve import System, solve

try:
    __version__ = version("axialfe")
except PackageNotFoundError:  # pragma: no cover - running from a source tree
    __version__ = "0.0.0"

__all__ = [
    "AxialfeError", "ModelError", "SolveError", "UnitError",
    "Material", "Section", "Station", "Segment", "Support", "Load", "Gap", "Case",
    "Combination", "Model",
    "read_model", "parse_model", "builtin_materials",
    "System", "solve", "Solution", "CaseResult",
    "solve_symbolic",
    "__version__",
]


def __getattr__(name):
    # solve_symbolic needs sympy: imported on first use, so `axialfe solve` starts fast
    if name == "solve_symbolic":
        from .symbolic import solve_symbolic

        return solve_symbolic
    raise AttributeError(f"module 'axialfe' has no attribute '{name}'")
