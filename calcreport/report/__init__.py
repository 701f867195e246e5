"""The PDF report: charts (matplotlib) and document (reportlab) from a trace.

``render(trace, input_text)`` returns the PDF bytes and the pages on which
each step is printed; it reads only the trace (JSON form), the input text it
echoes and, for a revision, the previous trace, and computes no engineering
number. Heavy libraries load on first use, so solving never imports them.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

__all__ = ["Rendered", "render"]


@dataclass(frozen=True)
class Rendered:
    """A rendered report: the PDF bytes and, for every step id, the pages it is printed on."""

    pdf: bytes
    step_pages: dict[str, list[int]]


def render(
    trace: dict[str, Any], input_text: str, previous: dict[str, Any] | None = None
) -> Rendered:
    """The PDF calculation report of ``trace`` (deterministic bytes).

    With ``previous`` (the trace of the last revision) the report gains a page of
    changes and a change mark beside every step whose value moved.
    """
    from calcreport.report.document import render_pdf
    from calcreport.report.mathtext import save_layouts

    changes = None
    if previous is not None:
        from calcreport.diff import diff

        changes = diff(previous, trace, "previous", "this revision")
    pdf, pages = render_pdf(trace, input_text, _figures(trace), changes)
    save_layouts()
    return Rendered(pdf, pages)


def _figures(trace: dict[str, Any]) -> dict[str, Any]:
    from calcreport.report import charts

    return {
        name: charts.drawn(name, trace) for name in charts.FIGURES if charts.applies(name, trace)
    }
