"""axialfe: axially loaded members by the direct stiffness method.

The package is laid out by stage; a floor imports only the floors below it
(anything not in ``axialfe.__all__`` is internal and may change):

- ``errors``, ``units``, ``formatting``: the exception family; the only module that
  imports pint; the one formatter of numbers, names and notes;
- ``model/``: the input concepts (frozen, self-checking, SI floats) and the one
  rule of what cases and combinations put on a model;
- ``materials/``: the built-in material library;
- ``mechanics/``: the bar element: sections, flexibility, load integrals and the
  fields N(s), sigma(s), u(s) inside a segment, generic over numpy and sympy;
- ``engine/``: assembly, connectivity, factorisation, the gap search, recovery;
- ``results``: frozen result objects with named, read-only arrays; ``envelope``: the least
  and largest of each result over the cases;
- ``tracking/``: sweeps with exact events;
- ``symbolic/``: the whitelist expression parser and the closed-form solve;
- ``checks/``: design checks of solved cases;
- ``fits/``: press and shrink fits (ISO 286 limits, Lamé's cylinders, ``axialfe fit``);
- ``joints/``: one bolted joint built into an axial model, its states, checks and sweep;
- ``review/``: hand-calculation review (stated values, likely slips, the calculation sheet);
- ``plastic/``: limit analysis (``axialfe collapse``) and the notes of a linear solve of
  elastic-plastic materials (the elastic-plastic path itself is in ``tracking/``);
- ``tolerance/``: toleranced inputs, batched worst-case and Monte Carlo studies;
- ``io/``: the readers (model files, CSV tables, claims, joint and fit files share them);
- ``output/``: terminal tables, JSON, CSV, diagrams and the report;
- ``cli/``: the typer command line.
"""

from importlib.metadata import PackageNotFoundError, version

from .errors import AxialfeError, ModelError, SolveError, UnitError
from .model import (Case, Combination, Gap, Load, Material, Model, Section, Segment, Station,
                    Support)
from .io.modelfile import builtin_materials, parse_model, read_model
from .results import CaseResult, Solution
from .engine.system import solve

try:
    __version__ = version("axialfe")
except PackageNotFoundError:  # pragma: no cover - running from a source tree
    __version__ = "0.0.0"

__all__ = [
    "AxialfeError", "ModelError", "SolveError", "UnitError",
    "Material", "Section", "Station", "Segment", "Support", "Load", "Gap", "Case",
    "Combination", "Model",
    "read_model", "parse_model", "builtin_materials",
    "solve", "Solution", "CaseResult",
    "solve_symbolic",
    "__version__",
]


def __getattr__(name):
    # solve_symbolic needs sympy: imported on first use, so `axialfe solve` starts fast
    if name == "solve_symbolic":
        from .symbolic.closed_form import solve_symbolic

        return solve_symbolic
    raise AttributeError(f"module 'axialfe' has no attribute '{name}'")
