"""The ``axialfe collapse`` and ``axialfe path`` commands: beyond linear elastic."""

from __future__ import annotations

from typing import Annotated, Optional

import typer

from .app import CheckFormat, ForceUnit, ModelPath, Output, app, emit, load, user_errors

__all__ = ["collapse"]


@app.command()
def collapse(model: ModelPath,
             case: Annotated[Optional[str], typer.Option(
                 "--case", help="The case (required when there are several).")] = None,
             format: Annotated[CheckFormat, typer.Option("--format", "-f",
                                                         help="Output format.")] = CheckFormat.table,
             output: Output = None, force_unit: ForceUnit = None):
    """The collapse load factor of a case by limit analysis, with its mechanism."""
    from ..output.plastictext import collapse_json, collapse_table
    from ..plastic import collapse as run

    with user_errors():
        m, units = load(model, force_unit)
        result = run(m, case)
        emit(collapse_json(result, units) if format is CheckFormat.json
             else collapse_table(result, units), output)
