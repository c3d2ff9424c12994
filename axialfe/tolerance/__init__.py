"""Tolerance studies: worst case and Monte Carlo over toleranced inputs.

- ``batch``: many samples of one model solved at once, as stacked arrays (the
  topology is fixed; gap states by a vectorised active-set iteration);
- ``study``: the worst case (box vertices, then a bounded local search) and the
  Monte Carlo statistics and event probabilities, the checks of every sample;
- ``parameters``: the affine map from a joint or fit file's inputs to its
  workflow's named parameters;
- ``closed``: the study of a workflow evaluated by closed forms on arrays, with
  ``jointstudy`` (bolted joints) and ``fitstudy`` (press fits).

The toleranced value forms and their types (:class:`Tolerance`,
:class:`Toleranced`, :func:`parse_tolerance`) live in
:mod:`axialfe.model.tolerances`, below the readers that record them; they are
re-exported here.

A workflow floor: it uses the model, the mechanics, the engine, the checks and the
joint and fit workflows, and never
imports ``io``, ``output`` or ``cli`` (the command hands it a function that
builds one sample's model, for the samples the batch cannot certify).
"""

from ..model.tolerances import Tolerance, Toleranced, parse_tolerance

__all__ = ["Tolerance", "Toleranced", "parse_tolerance"]
