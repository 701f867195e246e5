"""A long table set in two columns: newspaper order, the header atop every column, no row
lost or repeated across pages."""

from __future__ import annotations

import io
import re

import pypdf
from reportlab.lib.pagesizes import A4
from reportlab.platypus import Paragraph, SimpleDocTemplate

from calcreport.report import style
from calcreport.report.columns import TwoColumns


def _pdf(rows: list[list[str]], before: int = 0) -> pypdf.PdfReader:
    style.register_fonts()
    s = style.styles()

    def column(part):
        return style.Table(part, colWidths=[90, 60, 60], repeatRows=1)

    buffer = io.BytesIO()
    doc = SimpleDocTemplate(buffer, pagesize=A4)
    story = [Paragraph(f"line {n}", s.body) for n in range(before)]
    doc.build([*story, TwoColumns(column, rows, 12.0)])
    return pypdf.PdfReader(io.BytesIO(buffer.getvalue()))


def test_rows_read_down_the_left_column_then_the_right_then_on():
    rows = [["Key", "As entered", "As used"]] + [[f"row{n:03d}", "1", "1"] for n in range(150)]
    reader = _pdf(rows, before=10)  # the table starts part-way down the first page
    assert len(reader.pages) >= 2
    seen = []
    for page in reader.pages:
        page_text = page.extract_text()
        numbers = [int(n) for n in re.findall(r"row(\d{3})", page_text)]
        assert numbers == sorted(numbers)  # left column first, then the right
        assert page_text.count("As entered") == 2  # a header atop each column
        seen += numbers
    assert seen == list(range(150))  # every row once, in order


def test_a_short_table_is_balanced_on_one_page():
    rows = [["Key", "As entered", "As used"]] + [[f"row{n:03d}", "1", "1"] for n in range(20)]
    reader = _pdf(rows)
    assert len(reader.pages) == 1
    text = reader.pages[0].extract_text()
    assert [int(n) for n in re.findall(r"row(\d{3})", text)] == list(range(20))
    assert text.count("As entered") == 2
