"""The PDF report: charts (matplotlib) and document (reportlab) from a trace.

``render(trace, input_text)`` returns the PDF bytes and the pages on which
each step is printed; it reads only the trace (JSON form), the input text it
echoes and, for a revision, the previous trace, and computes no engineering
number. The PDF is archival (PDF/A-3b) and carries the files it is given
(the input, curve files, the trace) as attachments, listed in Appendix B.
Heavy libraries load on first use, so solving never imports them.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from calcreport.report.archive import Attachment

__all__ = ["Rendered", "render"]


@dataclass(frozen=True)
class Rendered:
    """A rendered report: the PDF bytes, for every step id the pages it is printed on, and
    for every step linked from the text the page its link lands on."""

    pdf: bytes
    step_pages: dict[str, list[int]]
    links: dict[str, dict[str, Any]]


def render(
    trace: dict[str, Any],
    input_text: str,
    previous: dict[str, Any] | None = None,
    attachments: Sequence[Attachment] = (),
    listing: str = "attached",
    progress: Callable[[str], None] | None = None,
) -> Rendered:
    """The PDF calculation report of ``trace`` (deterministic bytes, PDF/A-3b).

    With ``previous`` (the trace of the last revision) the report gains a page of
    changes and a change mark beside every step whose value moved. ``attachments``
    are embedded as the PDF's associated files, with the full step listing
    (:mod:`calcreport.report.listing`) after them; ``listing="full"`` also prints it.
    ``progress`` is told each stage as it starts (a long build shows it to its user).
    """
    tell = progress or (lambda stage: None)
    from calcreport.report.archive import Attachment, archival
    from calcreport.report.document import document_info, render_pdf
    from calcreport.report.listing import listing_name, step_listing
    from calcreport.report.mathtext import save_layouts

    changes = None
    if previous is not None:
        from calcreport.diff import diff

        changes = diff(previous, trace, "previous", "this revision")
    steps = Attachment(
        listing_name(trace),
        step_listing(trace).encode("utf-8"),
        "text/plain",
        "Supplement",
        "Every step of every state, as the trace records it",
    )
    files = (*attachments, steps)
    tell("drawing the charts")
    figures = _figures(trace)
    tell("laying out the pages")
    pdf, pages, links = render_pdf(trace, input_text, figures, changes, files, listing)
    save_layouts()
    tell("writing the archival PDF")
    info = document_info(trace["project"])
    return Rendered(
        archival(pdf, **info, project_date=trace["project"]["date"], attachments=files),
        pages,
        links,
    )


def _figures(trace: dict[str, Any]) -> dict[str, Any]:
    from calcreport.report import charts

    return {
        name: charts.drawn(name, trace) for name in charts.FIGURES if charts.applies(name, trace)
    }
