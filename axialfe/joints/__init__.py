"""Bolted joints: one bolt and its clamped stack, built into an axial model and checked.

- ``threads``: ISO metric (coarse and fine) and unified inch thread data, tensile
  stress areas;
- ``grades``: proof strengths of ISO 898-1 property classes and SAE J429 grades,
  and the bolting steel a class or grade stands for;
- ``stiffness``: bolt stiffness and the frustum (cone) stiffness of clamped parts;
- ``joint``: the joint (frozen, self-checking), the axial model it builds, the
  solved states, the checks and the temperature sweep with exact events;
- ``reader``: the JOINT.toml reader, every error located.

This workflow stands above the engine and the checks and below output and the
command line.
"""

from .joint import Joint, JointResult, JointSweep, Part, solve_joint, sweep_joint
from .reader import is_joint_file, parse_joint, read_joint

__all__ = ["Joint", "Part", "JointResult", "JointSweep", "solve_joint", "sweep_joint",
           "read_joint", "parse_joint", "is_joint_file"]
