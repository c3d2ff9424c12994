"""The engine: assembly, degrees of freedom, factorisation, contact and recovery.

- ``assembly``: the global stiffness and the element terms of each load state;
- ``system``: connectivity, the factorised system, the gap search and recovery.

It imports the model and the mechanics, never the floors above it.
"""

from .system import System, solve

__all__ = ["System", "solve"]
