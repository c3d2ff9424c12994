"""The model: parts, cases and combinations, and the design settings.

- ``parts``: the input concepts as frozen, self-checking dataclasses in SI floats
  (materials, sections, stations, segments, supports, loads, gaps, cases,
  combinations, check settings, limits, the project of a title block, the whole
  ``Model``);
- ``cases``: the one rule of what each case and combination puts on the model,
  as arrays (``LoadState``);
- ``temperature``: a model's tables against temperature evaluated at each
  segment's temperature in a case;
- ``tolerances``: the toleranced value forms of an input file, read strictly
  into ``Tolerance``, and ``Toleranced``, what a reader records of one.

This floor imports only ``errors``, ``units`` and ``mechanics``.
"""

from .parts import (BASE_CASE, Case, CheckSettings, Combination, Gap, Limit, Load, Material,
                    Model, Project, PropertyTable, Section, Segment, Station, Support)

__all__ = ["Material", "Section", "Station", "Segment", "Support", "Load", "Gap", "Case",
           "Combination", "CheckSettings", "Limit", "Project", "Model", "PropertyTable", "BASE_CASE"]
