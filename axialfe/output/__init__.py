"""Output: what the user reads. These modules compute nothing new.

- ``text``: terminal tables, JSON, CSV and Markdown of solutions and checks;
- ``sweeptext``: the same for sweeps;
- ``plot``: diagrams along x and sweep plots (matplotlib, Agg, imported on use);
- ``report``: the self-contained HTML or Markdown report.
"""
