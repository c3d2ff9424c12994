"""Beyond linear elastic: limit analysis of a case (:mod:`.collapse`).

The exact elastic-plastic path tracking lives in :mod:`axialfe.tracking.plastic`;
this workflow sits above the engine and the checks (it caps compressed
segments at their buckling capacity) and below output and the command line.
"""

from .collapse import CollapseResult, collapse

__all__ = ["CollapseResult", "collapse"]
