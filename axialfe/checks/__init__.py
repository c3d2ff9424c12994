"""Design checks of solved cases: strength, buckling, deformation limits.

``core`` holds the entries, the report with its governing entry and status,
and the checks in the order of ``CHECKS``.
"""

from .core import (CHECKS, KINDS, CaseChecks, CheckEntry, CheckReport, buckling_checks,
                   check_case, check_solution, limit_checks, strength_checks)

__all__ = ["CheckEntry", "CaseChecks", "CheckReport", "check_case", "check_solution", "KINDS",
           "CHECKS", "strength_checks", "buckling_checks", "limit_checks"]
