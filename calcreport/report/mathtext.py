"""Typeset equations in the PDF as real text, laid out by matplotlib's mathtext.

An equation string in matplotlib mathtext (the ``latex`` of a trace step) is
laid out once, by string and size, into glyphs (font, size, character,
position) and rules (fraction bars, radical overbars). A reportlab
:class:`Equation` flowable draws the glyphs as text in those same fonts,
embedded as subsets: sharp, searchable, and light; the text operators of
an equation are made once a canvas and reused wherever the same equation is
printed again (a step repeated for every pipe). The fonts are the ones
matplotlib ships for its ``dejavusans`` mathtext set (DejaVu Sans, with STIX
size variants for tall delimiters; Bitstream Vera and SIL Open Font
licences, in matplotlib's ``mpl-data/fonts``).

Parsing is the costly part (about 10 ms an equation), and a report's equations
are the same from one build to the next, so layouts are also kept in a cache
file under the user's cache folder (``$XDG_CACHE_HOME/calcreport``, else
``~/.cache/calcreport``), one per matplotlib installation and calcreport
version: a rebuild reads them instead of parsing. The cache holds exactly
what the parser returned, so the PDF bytes do not depend on it; any problem
reading or writing it only means parsing again. ``CALCREPORT_CACHE=off``
turns it off.
"""

from __future__ import annotations

import hashlib
import json
import math
import os
from functools import cache
from pathlib import Path
from typing import Any
from weakref import WeakKeyDictionary

from reportlab.platypus import Flowable

__all__ = ["Equation", "save_layouts"]

# Layouts parsed in this run and not yet in the cache file, by cache key.
_PARSED: dict[str, list[Any]] = {}


@cache
def _parser() -> Any:
    from matplotlib.mathtext import MathTextParser

    return MathTextParser("path")


@cache
def _font(path: str) -> str:
    """Register a font file with reportlab once; return its reportlab name.

    A file that is byte for byte one of the report's own DejaVu faces is not loaded
    again: the equation uses the report's font, embedded once.
    """
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    from calcreport.report import style

    own = style.FONTS / Path(path).name
    if Path(path).name in style.FACES.values() and own.is_file():
        if own.read_bytes() == Path(path).read_bytes():
            style.register_fonts()
            return next(n for n, f in style.FACES.items() if f == Path(path).name)
    name = f"math-{Path(path).stem}"
    pdfmetrics.registerFont(TTFont(name, path))
    return name


def _parse(latex: str, size: float) -> list[Any]:
    """matplotlib's layout: width, ascent, depth, glyphs (font file, size, char, x, y)
    and rules (x, y, w, h), as plain lists (the cache file's form)."""
    from matplotlib.font_manager import FontProperties

    prop = FontProperties(family="DejaVu Sans", size=size, math_fontfamily="dejavusans")
    width, height, depth, glyphs, rects = _parser().parse(f"${latex}$", 72, prop)
    placed = [
        [font.fname, float(fontsize), chr(code), float(x), float(y)]
        for font, fontsize, code, _, x, y in glyphs
    ]
    rules = [[float(x), float(y), float(w), float(h)] for x, y, w, h in rects]
    return [float(width), float(height - depth), float(depth), placed, rules]


@cache
def _layout(
    latex: str, size: float
) -> tuple[float, float, float, tuple[Any, ...], tuple[Any, ...]]:
    """Width, ascent, depth, glyphs (font, size, char, x, y) and rules (x, y, w, h)."""
    key = f"{size!r} {latex}"
    raw = _stored().get(key)
    if raw is None:
        raw = _PARSED[key] = _parse(latex, size)
    width, ascent, depth, glyphs, rules = raw
    placed = tuple((_font(path), size_, char, x, y) for path, size_, char, x, y in glyphs)
    return width, ascent, depth, placed, tuple(tuple(rule) for rule in rules)


def _cache_file() -> Path | None:
    if os.environ.get("CALCREPORT_CACHE", "").lower() == "off":
        return None
    import matplotlib

    from calcreport import __version__

    where = f"{matplotlib.__version__}\0{matplotlib.get_data_path()}\0{__version__}"
    name = f"mathtext-{hashlib.sha256(where.encode()).hexdigest()[:16]}.json"
    root = os.environ.get("XDG_CACHE_HOME")
    if not root:
        try:
            root = str(Path.home() / ".cache")
        except (RuntimeError, KeyError):  # no home folder: no cache, the build goes on
            return None
    return Path(root) / "calcreport" / name


@cache
def _stored() -> dict[str, list[Any]]:
    """The layouts of the cache file (none when it is off, absent, unreadable or not of the
    shape this module writes: a wrong file is ignored, and rewritten by the next save)."""
    path = _cache_file()
    try:
        data = json.loads(path.read_text(encoding="utf-8")) if path else {}
    except (OSError, ValueError, RecursionError):
        return {}
    if not _well_formed(data):
        return {}
    fonts = {glyph[0] for layout in data.values() for glyph in layout[3]}
    return data if all(Path(f).is_file() for f in fonts) else {}


def _well_formed(data: Any) -> bool:
    """Whether ``data`` maps keys to [width, ascent, depth, glyphs, rules] as written."""

    def number(v: Any) -> bool:
        return isinstance(v, int | float) and not isinstance(v, bool) and math.isfinite(v)

    if not isinstance(data, dict):
        return False
    for key, layout in data.items():
        if not (isinstance(key, str) and isinstance(layout, list) and len(layout) == 5):
            return False
        if not all(number(v) for v in layout[:3]):
            return False
        glyphs, rules = layout[3], layout[4]
        if not isinstance(glyphs, list) or not isinstance(rules, list):
            return False
        for g in glyphs:
            if not (
                isinstance(g, list)
                and len(g) == 5
                and isinstance(g[0], str)
                and isinstance(g[2], str)
                and all(number(v) for v in (g[1], g[3], g[4]))
            ):
                return False  # fmt: skip
        for r in rules:
            if not (isinstance(r, list) and len(r) == 4 and all(number(v) for v in r)):
                return False
    return True


def save_layouts() -> None:
    """Add the layouts parsed in this run to the cache file (best effort, atomic)."""
    path = _cache_file()
    if not _PARSED or path is None:
        return
    data = {**_stored(), **_PARSED}
    temporary = path.with_name(f"{path.name}.{os.getpid()}.tmp")
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        temporary.write_text(json.dumps(data, ensure_ascii=False), encoding="utf-8")
        os.replace(temporary, path)
    except OSError:
        temporary.unlink(missing_ok=True)
        return
    _stored().update(_PARSED)
    _PARSED.clear()


# The text operators of the equations drawn on each canvas, by string and size. Drawn
# again on that canvas, an equation reuses them: its glyphs are in the canvas's font
# subsets since the first time, so the operators come out the same.
_TEXT: WeakKeyDictionary[Any, dict[tuple[str, float], str]] = WeakKeyDictionary()


class Equation(Flowable):
    """A typeset equation, left-aligned with an indent."""

    def __init__(self, latex: str, size: float = 10.0, indent: float = 18.0) -> None:
        super().__init__()
        self.latex = latex
        self.size = size
        self.indent = indent
        self.width_eq, self.ascent, self.depth, self.glyphs, self.rules = _layout(latex, size)

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        self.scale = min(1.0, (available_width - self.indent) / max(self.width_eq, 1.0))
        return available_width, (self.ascent + self.depth) * self.scale + 6.0

    def draw(self) -> None:
        canvas = self.canv
        canvas.saveState()
        canvas.translate(self.indent, 3.0 + self.depth * self.scale)
        canvas.scale(self.scale, self.scale)
        drawn = _TEXT.setdefault(canvas, {})
        code = drawn.get((self.latex, self.size))
        if code is None:
            text = canvas.beginText()
            face = None
            for font, size, char, x, y in self.glyphs:
                if (font, size) != face:  # a font operator only where the face changes
                    face = font, size
                    text.setFont(font, size)
                text.setTextOrigin(x, y)
                text.textOut(char)
            code = drawn[self.latex, self.size] = text.getCode()
        canvas.addLiteral(code)  # as canvas.drawText does with a text object's code
        for x, y, w, h in self.rules:
            canvas.rect(x, y, w, h, stroke=0, fill=1)
        canvas.restoreState()
