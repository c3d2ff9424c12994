"""Layering: every module of ``axialfe`` imports only the floors below its own.

The floors are those of DEVELOPERS.md ("Layout: the stages as floors"), written
once here as ``FLOORS``.  Each module is parsed with ``ast`` (never imported or
run), and every import of ``axialfe`` it holds is collected: absolute and
relative, at the top or inside a function (a lazy import obeys the floors too).
A module may import its own floor's package (``engine`` within ``engine``) and
any floor strictly below; names on one floor do not import each other (the
workflows joints, fits, review and plastic are peers; ``tolerance`` sits above
them).  DEVELOPERS.md draws ``results`` above the engine; the engine builds
results, so here it is below, with ``envelope`` and ``supports`` (which read
results only) between the two.
"""

from __future__ import annotations

import ast
from pathlib import Path

PACKAGE = Path(__file__).resolve().parent.parent / "axialfe"

# Lowest first.  A name is the first part of a module's path below axialfe
# (a folder or a top-level module); "axialfe" is the package index itself.
FLOORS = (
    ("errors", "_gcpause"),
    ("units", "formatting"),
    ("mechanics",),
    ("model",),
    ("materials",),
    ("results",),                          # the result types the engine fills: below the engine
    ("envelope", "supports"),              # readers of results alone
    ("engine",),
    ("tracking",),
    ("symbolic",),
    ("checks",),
    ("joints", "fits", "review", "plastic"),
    ("tolerance",),
    ("io",),
    ("output",),
    ("axialfe",),                          # the package index: re-exports the public API
    ("cli",),
    ("__main__",),
)

RANK = {name: rank for rank, names in enumerate(FLOORS) for name in names}

# (importing module, imported module): the reason it is allowed for now.
WHITELIST = {
    ("axialfe.joints.reader", "axialfe.io.modelfile"):
        "the joint file reader subclasses the model reader _Reader (to move into io/)",
    ("axialfe.joints.reader", "axialfe.io.source"):
        "the joint file reader reads its file the one way io.source reads every input",
    ("axialfe.fits.reader", "axialfe.io.modelfile"):
        "the fit file reader subclasses the model reader _Reader (to move into io/)",
    ("axialfe.fits.reader", "axialfe.io.source"):
        "the fit file reader reads its file the one way io.source reads every input",
    ("axialfe.fits.reader", "axialfe.io.limits"):
        "the fit file reader bounds its input with the limits every reader applies",
}


def module_name(path: Path, root: Path) -> tuple[str, bool]:
    """The dotted name of the module at ``path`` below the package folder ``root``,
    and whether it is a package's ``__init__``."""
    parts = list(path.relative_to(root.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        return ".".join(parts[:-1]), True
    return ".".join(parts), False


def imports_of(path: Path, root: Path) -> list[tuple[int, str]]:
    """Every import of the package in the module at ``path``: (line, module imported),
    relative imports resolved, imports inside functions and classes included."""
    top = root.name
    name, is_package = module_name(path, root)
    package = name.split(".") if is_package else name.split(".")[:-1]
    found = []
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"), filename=str(path))):
        if isinstance(node, ast.Import):
            found += [(node.lineno, alias.name) for alias in node.names
                      if alias.name.split(".")[0] == top]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package[:len(package) - (node.level - 1)]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            if target.split(".")[0] != top:
                continue
            if target == top:
                # from axialfe import x: the module x where there is one, else the index
                for alias in node.names:
                    sub = root / alias.name
                    is_module = sub.is_dir() or sub.with_suffix(".py").is_file()
                    found.append((node.lineno, f"{top}.{alias.name}" if is_module else top))
            else:
                found.append((node.lineno, target))
    return found


def floor_of(name: str) -> str:
    """The floor name of a dotted module name: its first part below the package."""
    parts = name.split(".")
    return parts[1] if len(parts) > 1 else parts[0]


def violations(root: Path, whitelist=None) -> list[str]:
    """One line per import that goes to the same floor's other package or upward,
    and per module whose floor is not in ``FLOORS``."""
    whitelist = WHITELIST if whitelist is None else whitelist
    out = []
    for path in sorted(root.rglob("*.py")):
        name, _ = module_name(path, root)
        own = floor_of(name)
        where = path.relative_to(root.parent)
        if own not in RANK:
            out.append(f"{where}: the module's floor {own!r} is not in FLOORS")
            continue
        for line, target in imports_of(path, root):
            other = floor_of(target)
            if other == own or (name, target) in whitelist:
                continue
            if other not in RANK:
                out.append(f"{where}:{line}: imports {target}, whose floor {other!r} is not in FLOORS")
            elif RANK[other] >= RANK[own]:
                kind = "a peer on its own floor" if RANK[other] == RANK[own] else "a higher floor"
                out.append(f"{where}:{line}: {own} imports {target} ({kind}: {other})")
    return out


def test_every_import_goes_down_the_floors():
    found = violations(PACKAGE)
    assert not found, "imports against the floors of DEVELOPERS.md:\n" + "\n".join(found)


def test_the_whitelist_holds_only_imports_that_exist():
    # An entry whose import was removed must go, so the whitelist never outgrows its reasons.
    present = set()
    for path in PACKAGE.rglob("*.py"):
        name, _ = module_name(path, PACKAGE)
        present |= {(name, target) for _, target in imports_of(path, PACKAGE)}
    assert set(WHITELIST) <= present, sorted(set(WHITELIST) - present)


def _tree(tmp_path, files):
    root = tmp_path / "axialfe"
    for rel, text in files.items():
        path = root / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")
    return root


def test_the_checker_reports_each_kind_of_violation(tmp_path):
    root = _tree(tmp_path, {
        "__init__.py": "from .engine import solve\n",
        "errors.py": "",
        "model/__init__.py": "from .parts import Model\n",
        "model/parts.py": "from ..errors import ModelError\n\n"
                          "def late():\n    from ..engine.system import solve\n",
        "engine/__init__.py": "from axialfe.model import Model\n",
        "engine/system.py": "import axialfe.io.modelfile\nfrom .. import errors\n",
        "io/__init__.py": "",
        "io/modelfile.py": "",
        "joints/joint.py": "from ..fits import fit\n",
        "fits/fit.py": "",
        "cli/app.py": "from .. import __version__\nfrom axialfe import io\n",
        "gadgets/thing.py": "",
    })
    found = violations(root, whitelist={})
    assert found == [
        "axialfe/engine/system.py:1: engine imports axialfe.io.modelfile (a higher floor: io)",
        "axialfe/gadgets/thing.py: the module's floor 'gadgets' is not in FLOORS",
        "axialfe/joints/joint.py:1: joints imports axialfe.fits (a peer on its own floor: fits)",
        "axialfe/model/parts.py:4: model imports axialfe.engine.system (a higher floor: engine)",
    ]
    # The same tree with the upward imports whitelisted reports the rest only.
    allowed = {("axialfe.model.parts", "axialfe.engine.system"): "test"}
    assert len(violations(root, whitelist=allowed)) == 3


def test_relative_imports_resolve_from_modules_and_packages(tmp_path):
    root = _tree(tmp_path, {
        "results.py": "",
        "checks/__init__.py": "from . import strength\nfrom .. import results\n",
        "checks/strength.py": "from . import entries\nfrom ..model.parts import Model\n",
    })
    assert imports_of(root / "checks" / "__init__.py", root) == [
        (1, "axialfe.checks"), (2, "axialfe.results")]
    assert imports_of(root / "checks" / "strength.py", root) == [
        (1, "axialfe.checks"), (2, "axialfe.model.parts")]
