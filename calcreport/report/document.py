"""The PDF calculation report, laid out from a trace (JSON form) alone.

Sections in a reviewer's order: cover, rated duty, summary, contents, the system at a
glance, conventions / assumptions / criteria / inputs, the calculation,
design checks, charts, cautions, references, appendices (full step listing,
friction-factor chart, files read and the input echoed verbatim). Every
page carries the title block with ``Page N of M``. The renderer converts
units for display and lays out text; it computes no engineering number.

Each part of the story is a mixin of :mod:`calcreport.report.sections` (front matter,
summary, basis, calculation, route and surge, closing chapters); this module composes them
in :class:`_Report`, whose ``story`` gives their order, and holds the shared helpers
(paragraphs, headings, quantities, tables, figures), the page template and the canvas.
"""

from __future__ import annotations

import io
import re
import tomllib
from collections.abc import Callable
from typing import Any
from xml.sax.saxutils import escape

from reportlab.lib.units import mm
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.pdfgen import canvas as rl_canvas
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Flowable,
    Frame,
    KeepTogether,
    NextPageTemplate,
    PageBreak,
    PageTemplate,
    Paragraph,
    TableStyle,
)
from reportlab.platypus.flowables import _listWrapOn

from calcreport.report import style
from calcreport.report.columns import TwoColumns
from calcreport.report.sections.basis import BasisSection
from calcreport.report.sections.calculation import CalculationSection
from calcreport.report.sections.closing import ClosingSections
from calcreport.report.sections.common import CALCULATION_ANCHOR, plain, stage_anchor, text
from calcreport.report.sections.front import FrontMatter
from calcreport.report.sections.rated import RatedDutySheet
from calcreport.report.sections.route import RouteSections
from calcreport.report.sections.study import StudySection
from calcreport.report.sections.summary import SummarySection
from calcreport.report.style import Table
from calcreport.tracefile import TraceView
from calcreport.units import KIND_OF_SI_UNIT, fmt, pretty_unit, show

__all__ = ["document_info", "render_pdf"]


class _Report(
    FrontMatter,
    RatedDutySheet,
    SummarySection,
    StudySection,
    BasisSection,
    CalculationSection,
    RouteSections,
    ClosingSections,
):
    """Builds the story of one report from a trace."""

    def __init__(
        self,
        trace: dict[str, Any],
        input_text: str,
        figures: dict[str, Any],
        changes: Any = None,
        attached: tuple[Any, ...] = (),
        listing: str = "attached",
    ) -> None:
        self.changes = changes
        self.attached = attached
        self.listing = listing  # "attached" (the listing only as a file) or "full" (printed)
        self.marks: dict[str, str] = {}
        if changes is not None:
            self.marks = {i: "<b>Δ changed</b> " for i in changes.steps_changed}
            self.marks.update({i: "<b>Δ new</b> " for i in changes.steps_added})
        self.t = trace
        self.r = trace["results"]
        self.view = TraceView(trace)
        self.system = trace["project"]["units"]
        self.input_text = input_text
        self.figures = figures
        self.typeset: set[str] = set()  # equations already typeset, by function
        self.s = style.styles()
        self.figure_count = 0
        self.refs = {key: n for n, key in enumerate(trace["references"], start=1)}
        try:
            self.entered = tomllib.loads(input_text)
        except tomllib.TOMLDecodeError:
            self.entered = {}
        self.section_number = 0
        # Links: every step has an anchor key; a link to a step not worked in print lands
        # on its stage's section (the linked key -> that section's anchor).
        self.step_keys = {st["id"]: f"st{n}" for n, st in enumerate(trace["steps"])}
        self.linked: dict[str, tuple[str, str]] = {}  # anchor key -> (step id, fallback)
        self.used_by: dict[str, list[str]] = {}
        for st in trace["steps"]:
            for source in st["inputs"]:
                if source in self.step_keys:
                    self.used_by.setdefault(source, []).append(st["id"])

    # -- links -----------------------------------------------------------------------------
    def link(self, step_id: str, label: str | None = None) -> str:
        """Markup of ``label`` (default: the step id) linked to the step ``step_id``: its
        worked block, or where its stage stands when it is not worked in print; text with
        no link when ``step_id`` is no step."""
        shown = text(step_id if label is None else label)
        key = self.step_keys.get(step_id)
        if key is None:
            return shown
        self.linked.setdefault(key, (step_id, stage_anchor(self.steps_by_id[step_id])))
        return f'<a href="#{key}" color="{style.LINK}">{shown}</a>'

    def q_linked(
        self, quantity: dict[str, Any] | None, kind: str | None = None, sig: int = 4
    ) -> str:
        """:meth:`q`, linked to the step the value comes from (its ``from``) when one is."""
        source = quantity.get("from", "") if quantity else ""
        return self.link(source, self.q(quantity, kind, sig))

    # -- helpers ---------------------------------------------------------------------------
    def p(self, markup: str, st: Any = None) -> Paragraph:
        return Paragraph(markup, st or self.s.body)

    def heading(self, title: str, level: int = 1, numbered: bool = True) -> Paragraph:
        if not numbered:
            label = title
        elif level == 1:
            self.section_number += 1
            self.sub_number = 0
            label = f"{self.section_number}  {title}"
        else:
            self.sub_number += 1
            label = f"{self.section_number}.{self.sub_number}  {title}"
        para = Paragraph(escape(label), self.s.h1 if level == 1 else self.s.h2)
        para._toc = (level - 1, label)  # type: ignore[attr-defined]
        return para

    def q(self, quantity: dict[str, Any] | None, kind: str | None = None, sig: int = 4) -> str:
        if quantity is None:
            return "—"
        unit = quantity["unit"]
        kind = kind or KIND_OF_SI_UNIT.get(unit)
        if kind is None:
            return f"{fmt(quantity['value'], sig)} {pretty_unit(unit)}".strip()
        return show(quantity, kind, self.system, sig)

    def q_both(self, quantity: dict[str, Any], kind: str | None = None) -> str:
        """The value in the report's units, and in a US report the SI value beside it (the
        trace's own, for a checker comparing with the attached listing)."""
        kind = kind or KIND_OF_SI_UNIT.get(quantity["unit"])
        si = show(quantity, kind, "SI") if kind else self.q(quantity)
        us = show(quantity, kind, "US") if self.system == "US" and kind else si
        return si if us == si else f"{us} ({si})"  # kWh, rpm and s are the same in both

    def table(
        self,
        rows: list[list[Any]],
        widths: list[float],
        header: bool = True,
        extra: list[tuple[Any, ...]] | None = None,
        plain: bool = False,
    ) -> Table:
        cells = [
            [c if isinstance(c, Flowable) or plain else Paragraph(str(c), self.s.cell) for c in row]
            for row in rows
        ]
        table = Table(cells, colWidths=widths, repeatRows=1 if header else 0, hAlign="LEFT")
        commands: list[tuple[Any, ...]] = [
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LINEBELOW", (0, 0), (-1, -1), 0.25, style.RULE),
            ("TOPPADDING", (0, 0), (-1, -1), 2),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
            ("LEFTPADDING", (0, 0), (-1, -1), 3),
            ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ]
        if header:
            commands += [
                ("BACKGROUND", (0, 0), (-1, 0), style.SHADE),
                ("LINEBELOW", (0, 0), (-1, 0), 0.8, style.INK),
            ]
        table.setStyle(TableStyle(commands + (extra or [])))
        return table

    def plain_table(
        self, rows: list[list[str]], widths: list[float], mono: tuple[int, ...] = ()
    ) -> Table:
        """A table of plain text, as :meth:`table` draws it: a cell whose text fits its
        column is set as a string (no paragraph layout: a long table of inputs costs a
        fraction of the time), a longer one as a wrapped paragraph. The columns in
        ``mono`` (after the header) are set in the monospaced face."""
        cells: list[list[Any]] = [[Paragraph(text(c), self.s.cell) for c in rows[0]]]
        for row in rows[1:]:
            line: list[Any] = []
            for n, value in enumerate(row):
                st = self.s.mono if n in mono else self.s.cell
                room = widths[n] - 6  # the cell's padding
                shown = plain(value)
                fits = stringWidth(shown, st.fontName, st.fontSize) <= room
                line.append(shown if fits else Paragraph(text(value), st))
            cells.append(line)
        extra: list[tuple[Any, ...]] = [
            ("FONT", (0, 0), (-1, -1), self.s.cell.fontName, self.s.cell.fontSize,
             self.s.cell.leading),
            *[("FONT", (n, 1), (n, -1), self.s.mono.fontName, self.s.mono.fontSize,
               self.s.cell.leading) for n in mono],
        ]  # fmt: skip
        return self.table(cells, widths, extra=extra, plain=True)

    def figure(self, key: str) -> list[Flowable]:
        fig = self.figures.get(key)
        if fig is None:
            return []
        from calcreport.report.vector import ChartFlowable

        self.figure_count += 1
        caption = f"Figure {self.figure_count} — {text(fig.title)}"
        return self.kept([ChartFlowable(fig.figure), self.p(caption, self.s.caption)])

    @staticmethod
    def kept(flowables: list[Flowable]) -> list[Flowable]:
        """``flowables`` kept on one page, and with a heading or lead paragraph before them
        (a KeepTogether would let the heading stay behind at the foot of a page)."""
        for f in flowables[:-1]:
            f.keepWithNext = 1  # type: ignore[attr-defined]
        return flowables

    def ref(self, key: str) -> str:
        return f"[{self.refs[key]}]" if key in self.refs else f"[{text(key)}]"

    def entered_value(self, key: str) -> str:
        node: Any = self.entered
        for part in re.findall(r"[^.\[\]]+|\[\d+\]", key):
            if part.startswith("["):
                index = int(part[1:-1]) - 1
                if not isinstance(node, list) or index >= len(node):
                    return ""
                node = node[index]
            else:
                if not isinstance(node, dict) or part not in node:
                    return ""
                node = node[part]
        return "" if isinstance(node, dict | list) else str(node)

    @property
    def width(self) -> float:
        page_w, _ = style.page_size(self.system)
        return page_w - style.PAGE["margin_left"] - style.PAGE["margin_right"]

    # -- sections --------------------------------------------------------------------------
    def story(self) -> list[Flowable]:
        story: list[Flowable] = []
        story += self.cover()
        story += [NextPageTemplate("body"), PageBreak()]
        rated = self.rated_duty_sheet()
        if rated:
            story += rated + [PageBreak()]
        story += self.summary()
        if self.changes is not None:
            story += [PageBreak()] + self.changes_page()
        contents_at = len(story)
        if "study" in self.r:  # the choice between offers, before the chosen one's calculation
            story += [CondPageBreak(CHAPTER_ROOM)] + self.choice()
        # A chapter starts on the page before it when enough of that page is left for its
        # heading and first figure or table: no page left two-thirds empty between them.
        story += [CondPageBreak(CHAPTER_ROOM)] + self.at_a_glance()
        story += [CondPageBreak(CHAPTER_ROOM)] + self.basis()
        story += [CondPageBreak(CHAPTER_ROOM)] + self.calculation()
        story += [CondPageBreak(80 * mm)] + self.checks()
        story += [CondPageBreak(CHAPTER_ROOM)] + self.charts()
        story += [CondPageBreak(90 * mm)] + self.cautions()
        story += [CondPageBreak(60 * mm)] + self.references()
        story += [CondPageBreak(CHAPTER_ROOM)] + self.appendix()
        # The contents list follows the summary on its page when it fits there: the canvas
        # writes one line a heading (chapters 15 pt, sections 12.5 pt) below its mark.
        levels = [f._toc[0] for f in story if getattr(f, "_toc", None) is not None]
        height = sum(15.0 if level == 0 else 12.5 for level in levels) + 6.0
        story[contents_at:contents_at] = [CondPageBreak(height + 40)] + self.contents(height)
        return story


CHAPTER_ROOM = 110 * mm  # room a chapter needs to start on a page already begun


class _KeepWithStart(KeepTogether):
    """A heading or lead paragraph kept with what follows it: the group moves to the next
    page only when it and the start of a table or paragraph after it (``START``) do not fit
    where it stands, not whenever the whole table does not (which would leave most of a
    page empty before every long table)."""

    START = 48.0  # pt: at least three lines of text, or a table's header and first rows
    LONG = 250.0  # pt: what follows is kept whole up to this height (a short table)

    def wrap(self, aW: float, aH: float) -> tuple[float, float]:
        size = super().wrap(aW, aH)
        *lead, last = self._content
        if lead and isinstance(last, Table | Paragraph | TwoColumns):  # these split
            _, h_lead = _listWrapOn(lead, aW, self.canv)
            if self._H - h_lead > self.LONG:
                rows = getattr(last, "_rowHeights", None)  # a table: its header and 2 rows
                start = sum(rows[:3]) if rows else self.START
                self._H = h_lead + max(start, self.START) + 6.0
        return size


class _Doc(BaseDocTemplate):
    """Collects every heading with its page, for the outline and the contents page."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, keepTogetherClass=_KeepWithStart, **kwargs)
        # (level, label, page, bookmark key, top of the heading on its page)
        self.headings: list[tuple[int, str, int, str, float]] = []
        self.step_pages: dict[str, list[int]] = {}
        self.anchors: dict[str, tuple[int, float]] = {}  # link target: (page, top)

    def afterFlowable(self, flowable: Flowable) -> None:
        step = getattr(flowable, "_step", None)
        if step is not None:
            pages = self.step_pages.setdefault(step, [])
            if self.page not in pages:
                pages.append(self.page)
        anchor = getattr(flowable, "_anchor", None)
        if anchor is not None and anchor not in self.anchors:
            self.anchors[anchor] = (self.page, self.frame._y + flowable.height)
        toc = getattr(flowable, "_toc", None)
        if toc is not None:
            level, label = toc
            # The canvas holds every page until the last is laid out (for 'Page N of M'):
            # it sets the bookmark when it writes this page, where the heading stands.
            top = self.frame._y + flowable.height
            self.headings.append((level, label, self.page, f"h{len(self.headings)}", top))


def link_targets(
    anchors: dict[str, tuple[int, float]], linked: dict[str, tuple[str, str]]
) -> dict[str, tuple[int, float]]:
    """Where every link lands (anchor key -> page, top): a step's worked block, else the
    section of its stage, else the calculation chapter; the worked anchors as they are."""
    out = dict(anchors)
    for key, (_, stage) in linked.items():
        if key not in out:
            out[key] = anchors.get(stage) or anchors.get(CALCULATION_ANCHOR) or (1, 0.0)
    return out


def _canvas_maker(
    project: dict[str, Any],
    status: str,
    headings: list[tuple[int, str, int, str, float]],
    targets: Callable[[], dict[str, tuple[int, float]]],
) -> Callable[..., rl_canvas.Canvas]:
    """A canvas that draws, once every page is laid out, the title block with 'Page N of
    M' on each page, the contents list with page numbers and the link targets: one build
    pass suffices."""

    class TitleBlockCanvas(rl_canvas.Canvas):
        def __init__(self, *args: Any, **kwargs: Any) -> None:
            kwargs["invariant"] = 1
            # The embedded face from the first mark on: an archival PDF references no font
            # it does not carry (the canvas would otherwise start in base-14 Helvetica).
            kwargs["initialFontName"] = "DejaVu"
            super().__init__(*args, **kwargs)
            self._pages: list[dict[str, Any]] = []

        def showPage(self) -> None:
            self._pages.append(dict(self.__dict__))
            self._startPage()

        def save(self) -> None:
            total = len(self._pages)
            contents = self.__dict__.get("_contents_at")
            where = targets()
            for state in self._pages:
                # Annotations are numbered by the canvas: links drawn with the pages and
                # those added now (the contents) keep distinct numbers.
                count = self._annotationCount
                self.__dict__.update(state)
                self._annotationCount = max(count, self._annotationCount)
                self._title_block(total)
                if contents and contents[0] == self._pageNumber:
                    self._contents(contents[1], contents[2])
                for level, label, page, key, top in headings:
                    if page == self._pageNumber:
                        self.bookmarkHorizontal(key, 0, top)
                        self.addOutlineEntry(label, key, level=level, closed=level > 0)
                for key, (page, top) in where.items():
                    if page == self._pageNumber:
                        self.bookmarkHorizontal(key, 0, top)
                super().showPage()
            super().save()

        def _contents(self, x: float, y: float) -> None:
            width, _ = self._pagesize
            right = width - style.PAGE["margin_right"]
            for level, label, page, key, _ in headings:
                size = 9.5 if level == 0 else 8.6
                indent = 0.0 if level == 0 else 14.0
                y -= 15.0 if level == 0 else 12.5
                font = "DejaVu-Bold" if level == 0 else "DejaVu"
                self.setFont(font, size)
                self.setFillColor(style.INK)
                self.drawString(x + indent, y, label)
                number = str(page)
                start = x + indent + self.stringWidth(label, font, size) + 4
                end = right - self.stringWidth(number, font, size) - 4
                dots = int((end - start) / self.stringWidth(". ", "DejaVu", size))
                if dots > 0:
                    self.setFont("DejaVu", size)
                    self.setFillColor(style.RULE)
                    self.drawRightString(end, y, ". " * dots)
                self.setFont(font, size)
                self.setFillColor(style.INK)
                self.drawRightString(right, y, number)
                self.linkRect("", key, (x, y - 2, right, y + size), relative=0, thickness=0)

        def _title_block(self, total: int) -> None:
            width, height = self._pagesize
            left = style.PAGE["margin_left"]
            right = width - style.PAGE["margin_right"]
            top = height - 10 * mm
            h = style.PAGE["title_block_height"]
            self.saveState()
            self.setStrokeColor(style.INK)
            self.setLineWidth(0.8)
            self.rect(left, top - h, right - left, h)
            col1 = left + (right - left) * 0.55
            col2 = left + (right - left) * 0.78
            self.line(col1, top - h, col1, top)
            self.line(col2, top - h, col2, top)
            self.setFont("DejaVu-Bold", 8.5)
            title = project["title"]
            while self.stringWidth(title, "DejaVu-Bold", 8.5) > col1 - left - 6 and len(title) > 4:
                title = title[:-2]
            if title != project["title"]:
                title = title.rstrip() + "…"
            self.drawString(left + 3, top - 6 * mm, title)
            self.setFont("DejaVu", 7.2)
            self.drawString(left + 3, top - 11 * mm, (project["client"] or "")[:90])
            self.drawString(col1 + 3, top - 6 * mm, f"Calc. {project['calc_id'] or '—'}")
            self.drawString(
                col1 + 3, top - 11 * mm, f"Rev. {project['revision'] or '—'}   {project['date']}"
            )
            self.setFont("DejaVu-Bold", 8.5)
            self.drawString(col2 + 3, top - 6 * mm, f"Page {self._pageNumber} of {total}")
            units = "SI units" if project["units"] == "SI" else "US units"
            basis = f"{units} · {status}"
            size = 7.2  # shrunk, never clipped, to fit the block's last column
            while self.stringWidth(basis, "DejaVu", size) > right - col2 - 6 and size > 5:
                size -= 0.2
            self.setFont("DejaVu", size)
            self.drawString(col2 + 3, top - 11 * mm, basis)
            self.setFont("DejaVu", 6.5)
            self.setFillColor(style.RULE)
            self.drawString(
                left,
                9 * mm,
                "Calculation prepared with calcreport from the input "
                "and trace named in Appendix B. Verify before use.",
            )
            self.restoreState()

    return TitleBlockCanvas


def document_info(project: dict[str, Any]) -> dict[str, str]:
    """The PDF's document information (title, author, subject) from the trace's project."""
    return {
        "title": f"{project['calc_id']} {project['title']}".strip(),
        "author": project["prepared_by"] or "calcreport",
        "subject": f"Pump-system calculation, revision {project['revision']}".strip(),
    }


def render_pdf(
    trace: dict[str, Any],
    input_text: str,
    figures: dict[str, Any],
    changes: Any = None,
    attached: tuple[Any, ...] = (),
    listing: str = "attached",
) -> tuple[bytes, dict[str, list[int]], dict[str, dict[str, Any]]]:
    """The PDF report of ``trace`` (deterministic bytes), the pages of every printed
    step and where each link to a step lands (step id -> its page, and ``at``: "step"
    for its worked block, else the section anchor of its stage). ``attached``
    (:class:`~calcreport.report.archive.Attachment`) are listed in Appendix B as the files
    the PDF carries; ``listing="full"`` prints every step of every state as Appendix C."""
    report = _Report(trace, input_text, figures, changes, attached, listing)
    project = trace["project"]
    size = style.page_size(report.system)
    buffer = io.BytesIO()
    doc = _Doc(
        buffer,
        pagesize=size,
        leftMargin=style.PAGE["margin_left"],
        rightMargin=style.PAGE["margin_right"],
        topMargin=style.PAGE["margin_top"],
        bottomMargin=style.PAGE["margin_bottom"],
        **document_info(project),
        creator="calcreport",
        invariant=1,
    )
    frame = Frame(doc.leftMargin, doc.bottomMargin, doc.width, doc.height, id="body")
    doc.addPageTemplates([PageTemplate("cover", [frame]), PageTemplate("body", [frame])])
    doc.build(
        report.story(),
        canvasmaker=_canvas_maker(
            project,
            trace["status"]["value"],
            doc.headings,
            lambda: link_targets(doc.anchors, report.linked),
        ),
    )
    where = link_targets(doc.anchors, report.linked)
    links = {
        step_id: {"page": where[key][0], "at": "step" if key in doc.anchors else stage}
        for key, (step_id, stage) in sorted(report.linked.items(), key=lambda kv: kv[1][0])
    }
    return buffer.getvalue(), doc.step_pages, links
