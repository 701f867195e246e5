"""calcreport: pump-system calculations a reviewer can check.

The pipeline, one function a stage::

    model = calcreport.load("system.toml")     # input TOML → validated model
    trace = calcreport.solve(model)            # model → Trace (steps, results, checks)
    pdf = calcreport.render(trace.to_json(), model.text).pdf   # trace → PDF

Each stage imports its libraries on first use, so ``import calcreport`` is
cheap and solving never loads the report stack.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from pathlib import Path

    from calcreport.model.schema import Model
    from calcreport.trace import Trace

__all__ = ["__version__", "load", "render", "solve"]

__version__ = "0.1.0"


def load(path: str | Path) -> Model:
    """Read and validate an input file (raises InputError listing every problem)."""
    from calcreport.model.loader import load as _load

    return _load(path)


def solve(model: Model) -> Trace:
    """Solve a validated model; the trace holds every step, result and check."""
    from calcreport.solver import solve as _solve

    return _solve(model)


def render(trace: dict[str, Any], input_text: str, previous: dict[str, Any] | None = None) -> Any:
    """The PDF report of a trace (its JSON form) and the input text it echoes: a
    ``Rendered`` with ``.pdf`` bytes and ``.step_pages`` (step id → pages)."""
    from calcreport.report import render as _render

    return _render(trace, input_text, previous)
