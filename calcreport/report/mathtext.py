"""Typeset equations as vector outlines in the PDF.

An equation string in matplotlib mathtext (the ``latex`` of a trace step) is
laid out once by matplotlib's mathtext engine into glyph outlines
(``TextPath``), cached by string and size, and drawn by a reportlab
:class:`Equation` flowable as filled paths: no figure, no raster, no font
substitution at print time.
"""

from __future__ import annotations

from functools import cache
from typing import Any

from reportlab.platypus import Flowable

__all__ = ["Equation"]

_MOVETO, _LINETO, _CURVE3, _CURVE4, _CLOSE = 1, 2, 3, 4, 79


@cache
def _outline(latex: str, size: float) -> tuple[float, float, float, tuple[Any, ...]]:
    """Width, height above the baseline, depth below it, and the path segments."""
    from matplotlib.font_manager import FontProperties
    from matplotlib.textpath import TextPath

    path = TextPath((0, 0), f"${latex}$", size=size, prop=FontProperties(family="DejaVu Sans"))
    extents = path.get_extents()
    segments = []
    verts = path.vertices
    codes = path.codes
    i = 0
    while i < len(codes):
        code = codes[i]
        if code == _CURVE3:
            segments.append(("q", tuple(verts[i - 1]), tuple(verts[i]), tuple(verts[i + 1])))
            i += 2
            continue
        if code == _CURVE4:
            segments.append(("c", tuple(verts[i]), tuple(verts[i + 1]), tuple(verts[i + 2])))
            i += 3
            continue
        segments.append(({_MOVETO: "m", _LINETO: "l", _CLOSE: "z"}[code], tuple(verts[i])))
        i += 1
    return (
        float(extents.x1),
        float(max(extents.y1, 0.0)),
        float(max(-extents.y0, 0.0)),
        tuple(segments),
    )


class Equation(Flowable):
    """A typeset equation, left-aligned with an indent."""

    def __init__(self, latex: str, size: float = 10.0, indent: float = 18.0) -> None:
        super().__init__()
        self.latex = latex
        self.size = size
        self.indent = indent
        self.width_eq, self.height_eq, self.depth_eq, self.segments = _outline(latex, size)

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        self._scale = min(1.0, (available_width - self.indent) / max(self.width_eq, 1.0))
        return available_width, (self.height_eq + self.depth_eq) * self._scale + 6.0

    def draw(self) -> None:
        canvas = self.canv
        scale = self._scale
        canvas.saveState()
        canvas.translate(self.indent, 3.0 + self.depth_eq * scale)
        canvas.scale(scale, scale)
        path = canvas.beginPath()
        for segment in self.segments:
            kind = segment[0]
            if kind == "m":
                path.moveTo(*segment[1])
            elif kind == "l":
                path.lineTo(*segment[1])
            elif kind == "z":
                path.close()
            elif kind == "c":
                (x1, y1), (x2, y2), (x3, y3) = segment[1:]
                path.curveTo(x1, y1, x2, y2, x3, y3)
            else:  # quadratic Bezier as the equivalent cubic
                (x0, y0), (qx, qy), (x3, y3) = segment[1:]
                path.curveTo(
                    x0 + 2 / 3 * (qx - x0),
                    y0 + 2 / 3 * (qy - y0),
                    x3 + 2 / 3 * (qx - x3),
                    y3 + 2 / 3 * (qy - y3),
                    x3,
                    y3,
                )
        canvas.drawPath(path, stroke=0, fill=1, fillMode=1)
        canvas.restoreState()
