"""Review of a hand calculation: the values it states, their verdicts, the likely slips.

- ``claims``: a stated value (:class:`Claim`), checked for itself and against a
  model, and the arithmetic of its verdict (``agrees`` or ``differs``);
- ``slips``: the common slips, one small function each, in the documented order;
- ``verify``: every claim against the solved model, and the slips that
  reproduce a value that differs (:func:`verify`).

This workflow sits above the engine and the results and below ``io`` (which
reads claims from files), ``output`` and ``cli``.
"""

from .claims import Claim, Tolerance
from .verify import ClaimReview, Review, SlipFound, verify

__all__ = ["Claim", "Tolerance", "verify", "Review", "ClaimReview", "SlipFound"]
