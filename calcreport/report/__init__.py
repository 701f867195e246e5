"""The PDF report: charts (matplotlib) and document (reportlab) from a trace.

``render(trace, input_text)`` returns the PDF bytes; it reads only the trace
(JSON form) and the input text it echoes, and computes no engineering
number. Heavy libraries load on first use, so solving never imports them.
"""

from __future__ import annotations

from typing import Any

__all__ = ["render"]


def render(trace: dict[str, Any], input_text: str) -> bytes:
    """The PDF calculation report of ``trace`` (deterministic bytes)."""
    from calcreport.report.document import render_pdf

    return render_pdf(trace, input_text, _figures(trace))


def _figures(trace: dict[str, Any]) -> dict[str, Any]:
    from calcreport.report import charts

    return {name: charts.drawn(name, trace) for name in charts.FIGURES}
