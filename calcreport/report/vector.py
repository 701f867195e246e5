"""Draw a matplotlib figure onto the report's PDF canvas, as vectors.

A small matplotlib renderer turns every path the figure draws (lines,
markers, patches) into PDF path operators, and its text into text in the
report's embedded DejaVu fonts (the faces matplotlib lays it out with;
mathtext falls back to glyph outlines). The operators are recorded once per figure and replayed on
every pass of the document build, so charts stay sharp at any zoom, use
the report's own font outlines, cost one drawing however many passes the
contents page needs, and come out byte-identical from run to run.
"""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable

__all__ = ["ChartFlowable"]

_CAP = {"butt": 0, "round": 1, "projecting": 2}
_BOLD = ("bold", "heavy", "extra bold", "black", "semibold", "demibold", 600, 700, 800, 900)
# matplotlib's DejaVu faces drawn as text in the report's embedded DejaVu fonts (same files).
_TEXT_FONTS = {
    ("DejaVu Sans", False, False): "DejaVu",
    ("DejaVu Sans", True, False): "DejaVu-Bold",
    ("DejaVu Sans", False, True): "DejaVu-Oblique",
    ("DejaVu Sans Mono", False, False): "DejaVuMono",
}
_JOIN = {"miter": 0, "round": 1, "bevel": 2}


def _n(x: float) -> str:
    """A coordinate or colour component as PDF prints it (three decimals suffice at 72 dpi)."""
    text = f"{x:.3f}".rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def _record(figure: Any) -> list[Any]:
    """The figure's drawing as PDF operator strings and alpha/image events."""
    from matplotlib.backend_bases import GraphicsContextBase, RendererBase
    from matplotlib.path import Path as MplPath

    ops: list[Any] = []
    width_in, height_in = figure.get_size_inches()

    class Recorder(RendererBase):
        def get_canvas_width_height(self) -> tuple[float, float]:
            return width_in * 72.0, height_in * 72.0

        def points_to_pixels(self, points: float) -> float:
            return points  # 72 dpi: one pixel is one point

        def flipy(self) -> bool:
            return False  # PDF's y grows upwards, as matplotlib's display coordinates

        def new_gc(self) -> Any:
            return GraphicsContextBase()

        def option_image_nocomposite(self) -> bool:
            return True

        def _clip(self, gc: Any) -> str:
            rect = gc.get_clip_rectangle()
            if rect is not None:
                x0, y0, w, h = rect.bounds
                return f"{_n(x0)} {_n(y0)} {_n(w)} {_n(h)} re W n\n"
            clip_path, clip_transform = gc.get_clip_path()
            if clip_path is not None:
                return self._trace(clip_path, clip_transform) + "W n\n"
            return ""

        def _trace(self, mpl_path: Any, transform: Any) -> str:
            out = []
            last = (0.0, 0.0)
            for vertices, code in mpl_path.iter_segments(
                transform, remove_nans=True, simplify=False
            ):
                if code == MplPath.MOVETO:
                    out.append(f"{_n(vertices[0])} {_n(vertices[1])} m")
                elif code == MplPath.LINETO:
                    out.append(f"{_n(vertices[0])} {_n(vertices[1])} l")
                elif code == MplPath.CURVE3:  # quadratic Bezier as the equivalent cubic
                    qx, qy, x3, y3 = vertices
                    x0, y0 = last
                    c1 = (x0 + 2 / 3 * (qx - x0), y0 + 2 / 3 * (qy - y0))
                    c2 = (x3 + 2 / 3 * (qx - x3), y3 + 2 / 3 * (qy - y3))
                    out.append(" ".join(_n(v) for v in (*c1, *c2, x3, y3)) + " c")
                elif code == MplPath.CURVE4:
                    out.append(" ".join(_n(v) for v in vertices) + " c")
                elif code == MplPath.CLOSEPOLY:
                    out.append("h")
                    continue
                last = (vertices[-2], vertices[-1])
            return "\n".join(out) + "\n" if out else ""

        def draw_path(self, gc: Any, path: Any, transform: Any, rgbFace: Any = None) -> None:
            shape = self._trace(path, transform)
            if not shape:
                return
            parts = ["q\n", self._clip(gc)]
            stroke_alpha = fill_alpha = 1.0
            r, g, b, a = gc.get_rgb()
            stroke = gc.get_linewidth() > 0 and a > 0
            if stroke:
                stroke_alpha = gc.get_alpha() if gc.get_forced_alpha() else a
                parts.append(
                    f"{_n(r)} {_n(g)} {_n(b)} RG {_n(gc.get_linewidth())} w "
                    f"{_CAP[gc.get_capstyle()]} J {_JOIN[gc.get_joinstyle()]} j\n"
                )
                offset, dashes = gc.get_dashes()
                if dashes:
                    pattern = " ".join(_n(float(d)) for d in dashes)
                    parts.append(f"[{pattern}] {_n(float(offset or 0))} d\n")
            fill = rgbFace is not None and (len(rgbFace) < 4 or rgbFace[3] > 0)
            if fill:
                fill_alpha = rgbFace[3] if len(rgbFace) > 3 else 1.0
                if gc.get_forced_alpha():
                    fill_alpha = gc.get_alpha()
                parts.append(f"{_n(rgbFace[0])} {_n(rgbFace[1])} {_n(rgbFace[2])} rg\n")
            if not (stroke or fill):
                return
            paint = "B" if stroke and fill else ("S" if stroke else "f")
            parts.append(shape + paint + "\nQ\n")
            code = "".join(parts)
            if stroke_alpha < 1.0 or fill_alpha < 1.0:
                ops.append(("alpha", stroke_alpha, fill_alpha, code))
            else:
                ops.append(code)

        def draw_text(
            self,
            gc: Any,
            x: float,
            y: float,
            s: str,
            prop: Any,
            angle: float,
            ismath: Any = False,
            mtext: Any = None,
        ) -> None:
            font = _TEXT_FONTS.get(
                (prop.get_name(), prop.get_weight() in _BOLD, prop.get_style() != "normal")
            )
            if ismath or font is None:  # mathtext, or a face the report does not embed
                super().draw_text(gc, x, y, s, prop, angle, ismath, mtext)
                return
            r, g, b, _ = gc.get_rgb()
            ops.append(
                ("text", x, y, angle, font, prop.get_size_in_points(), (r, g, b), s, self._clip(gc))
            )

        def draw_image(self, gc: Any, x: float, y: float, im: Any) -> None:
            height, width = im.shape[:2]
            ops.append(("image", x, y, width, height, im[::-1].copy(), self._clip(gc)))

    dpi = figure.dpi
    figure.set_dpi(72.0)
    try:
        figure.draw(Recorder())
    finally:
        figure.set_dpi(dpi)
    return ops


class ChartFlowable(Flowable):
    """A matplotlib figure placed in the report at its own size (scaled to fit)."""

    def __init__(self, figure: Any) -> None:
        super().__init__()
        width_in, height_in = figure.get_size_inches()
        self.fig_width = width_in * 72.0
        self.fig_height = height_in * 72.0
        self.ops = _record(figure)

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        self.scale = min(1.0, available_width / self.fig_width)
        return self.fig_width * self.scale, self.fig_height * self.scale

    def draw(self) -> None:
        canvas = self.canv
        canvas.saveState()
        canvas.scale(self.scale, self.scale)
        for op in self.ops:
            if isinstance(op, str):
                canvas.addLiteral(op)
            elif op[0] == "alpha":
                canvas.saveState()
                canvas.setStrokeAlpha(op[1])
                canvas.setFillAlpha(op[2])
                canvas.addLiteral(op[3])
                canvas.restoreState()
            elif op[0] == "text":
                self._text(*op[1:])
            else:
                self._image(*op[1:])
        canvas.restoreState()

    def _text(
        self,
        x: float,
        y: float,
        angle: float,
        font: str,
        size: float,
        rgb: tuple[float, float, float],
        string: str,
        clip: str,
    ) -> None:
        canvas = self.canv
        canvas.saveState()
        if clip:
            canvas.addLiteral(clip)
        canvas.translate(x, y)
        if angle:
            canvas.rotate(angle)
        canvas.setFillColorRGB(*rgb)
        canvas.setFont(font, size)
        canvas.drawString(0, 0, string)
        canvas.restoreState()

    def _image(
        self, x: float, y: float, width: float, height: float, pixels: Any, clip: str
    ) -> None:
        from PIL import Image
        from reportlab.lib.utils import ImageReader

        canvas = self.canv
        canvas.saveState()
        if clip:
            canvas.addLiteral(clip)
        canvas.drawImage(
            ImageReader(Image.fromarray(pixels, "RGBA")), x, y, width, height, mask="auto"
        )
        canvas.restoreState()
