"""Report appearance as data: page sizes, margins, fonts and paragraph styles.

Fonts are the DejaVu family kept in the repository's top-level ``fonts/`` (Bitstream Vera
licence, ``LICENSE-DejaVu.txt``), installed as the data package ``calcreport.fonts``,
registered once and embedded in every PDF.
"""

from __future__ import annotations

import importlib.util
from functools import cache
from pathlib import Path
from typing import Any

from reportlab import platypus
from reportlab.lib import colors
from reportlab.lib.enums import TA_CENTER, TA_LEFT
from reportlab.lib.pagesizes import A4, LETTER
from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm

__all__ = ["PAGE", "Styles", "page_size", "register_fonts", "styles"]


def _fonts_folder() -> Path:
    """Where the fonts are: the installed data package, or ``fonts/`` of a source tree run
    without installing."""
    spec = importlib.util.find_spec("calcreport.fonts")
    if spec is not None and spec.submodule_search_locations:
        return Path(next(iter(spec.submodule_search_locations))).resolve()
    return Path(__file__).resolve().parents[2] / "fonts"


FONTS = _fonts_folder()
# reportlab font name -> file in FONTS
FACES = {
    "DejaVu": "DejaVuSans.ttf",
    "DejaVu-Bold": "DejaVuSans-Bold.ttf",
    "DejaVu-Oblique": "DejaVuSans-Oblique.ttf",
    "DejaVuMono": "DejaVuSansMono.ttf",
}

PAGE = {
    "margin_left": 20 * mm,
    "margin_right": 18 * mm,
    "margin_top": 30 * mm,  # room for the title block
    "margin_bottom": 18 * mm,
    "title_block_height": 16 * mm,
}

INK = colors.HexColor("#1a1a1a")
LINK = "#1f4e8c"  # a link to the step a number comes from (dark blue, prints as dark grey)
RULE = colors.HexColor("#7a7a7a")
SHADE = colors.HexColor("#ececec")
SHADE_DARK = colors.HexColor("#c8c8c8")

STATUS_FILL = {
    "fail": colors.HexColor("#3a3a3a"),
    "review": colors.HexColor("#bdbdbd"),
    "pass": colors.white,
}
STATUS_INK = {"fail": colors.white, "review": INK, "pass": INK}


def page_size(system: str) -> tuple[float, float]:
    """A4 for SI reports, US Letter for US customary reports."""
    return LETTER if system == "US" else A4


@cache
def register_fonts() -> None:
    """Register the embedded DejaVu fonts with reportlab (once per process)."""
    from reportlab.lib.fonts import addMapping
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    for name, file in FACES.items():
        pdfmetrics.registerFont(TTFont(name, str(FONTS / file)))
    addMapping("DejaVu", 0, 0, "DejaVu")
    addMapping("DejaVu", 1, 0, "DejaVu-Bold")
    addMapping("DejaVu", 0, 1, "DejaVu-Oblique")
    addMapping("DejaVu", 1, 1, "DejaVu-Bold")


class Styles:
    """The paragraph styles, each inheriting from ``body``."""

    def __init__(self) -> None:
        register_fonts()
        body = ParagraphStyle(
            "body",
            fontName="DejaVu",
            fontSize=9,
            leading=12.2,
            textColor=INK,
            alignment=TA_LEFT,
            spaceAfter=4,
        )
        self.body = body
        self.small = ParagraphStyle("small", parent=body, fontSize=7.6, leading=9.6, spaceAfter=2)
        self.cell = ParagraphStyle("cell", parent=body, fontSize=7.8, leading=9.6, spaceAfter=0)
        self.cell_bold = ParagraphStyle("cell_bold", parent=self.cell, fontName="DejaVu-Bold")
        self.mono = ParagraphStyle(
            "mono", parent=body, fontName="DejaVuMono", fontSize=7.2, leading=9.0, spaceAfter=0
        )
        self.substituted = ParagraphStyle(
            "substituted", parent=body, fontSize=8.4, leading=11, leftIndent=18, spaceAfter=1
        )
        # A paragraph that introduces the table or list after it: kept on its page.
        self.lead = ParagraphStyle("lead", parent=body, keepWithNext=1)
        self.h1 = ParagraphStyle(
            "h1",
            parent=body,
            fontName="DejaVu-Bold",
            fontSize=13.5,
            leading=17,
            spaceBefore=6,
            spaceAfter=8,
            keepWithNext=1,
        )
        self.h2 = ParagraphStyle(
            "h2",
            parent=body,
            fontName="DejaVu-Bold",
            fontSize=10.5,
            leading=14,
            spaceBefore=8,
            spaceAfter=4,
            keepWithNext=1,
        )
        self.step_head = ParagraphStyle(
            "step_head",
            parent=body,
            fontName="DejaVu-Bold",
            fontSize=8.8,
            leading=11.5,
            spaceBefore=5,
            spaceAfter=1,
            keepWithNext=1,
        )
        self.caption = ParagraphStyle(
            "caption",
            parent=body,
            fontSize=8.2,
            leading=10.5,
            alignment=TA_CENTER,
            spaceBefore=3,
            spaceAfter=10,
        )
        self.cover_title = ParagraphStyle(
            "cover_title",
            parent=body,
            fontName="DejaVu-Bold",
            fontSize=20,
            leading=25,
            spaceAfter=6,
        )
        self.cover_sub = ParagraphStyle(
            "cover_sub", parent=body, fontSize=11.5, leading=15, spaceAfter=4
        )
        self.status = ParagraphStyle(
            "status",
            parent=body,
            fontName="DejaVu-Bold",
            fontSize=11,
            leading=14,
            alignment=TA_CENTER,
        )
        self.toc = [
            ParagraphStyle("toc1", parent=body, fontSize=9.5, leading=14, leftIndent=0),
            ParagraphStyle("toc2", parent=body, fontSize=8.6, leading=12, leftIndent=14),
        ]


@cache
def styles() -> Styles:
    """The one set of styles (fonts registered on first use)."""
    return Styles()


class Table(platypus.Table):
    """A platypus table whose cells start in the embedded face: platypus sets each cell's
    font before drawing it, by default base-14 Helvetica, which an archival PDF may not
    reference (every font must be embedded)."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        if "cellStyles" not in kwargs:  # a split's pieces keep the cells' styles they had
            self.setStyle(platypus.TableStyle([("FONTNAME", (0, 0), (-1, -1), "DejaVu")]))
