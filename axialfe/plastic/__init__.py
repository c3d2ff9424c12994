"""Beyond linear elastic: limit analysis of a case (:mod:`.collapse`), and what a linear
solve of a plastic model must say (:mod:`.notes`).

The exact elastic-plastic path tracking lives in :mod:`axialfe.tracking.plastic`;
this workflow sits above the engine and the checks (it caps compressed
segments at their buckling capacity) and below output and the command line.
"""

from .collapse import CollapseResult, collapse
from .notes import linear_notes

__all__ = ["CollapseResult", "collapse", "linear_notes"]
