"""Draw a matplotlib figure straight onto the report's PDF canvas, as vectors.

A small matplotlib renderer turns every path the figure draws (lines,
markers, patches, and text laid out as glyph outlines) into reportlab path
operators, so charts stay sharp at any zoom, use the report's own font
outlines, and come out byte-identical from run to run. Images (rare in our
charts) are drawn as embedded rasters.
"""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable

__all__ = ["ChartFlowable"]


def _renderer_class() -> Any:
    from matplotlib.backend_bases import GraphicsContextBase, RendererBase
    from matplotlib.path import Path as MplPath

    class ReportlabRenderer(RendererBase):
        def __init__(self, canvas: Any, width: float, height: float) -> None:
            super().__init__()
            self.canvas = canvas
            self.width = width
            self.height = height

        def get_canvas_width_height(self) -> tuple[float, float]:
            return self.width, self.height

        def points_to_pixels(self, points: float) -> float:
            return points  # 72 dpi: one pixel is one point

        def new_gc(self) -> Any:
            return GraphicsContextBase()

        def option_image_nocomposite(self) -> bool:
            return True

        def _clip(self, gc: Any) -> None:
            rect = gc.get_clip_rectangle()
            clip_path, clip_transform = gc.get_clip_path()
            if rect is None and clip_path is None:
                return
            path = self.canvas.beginPath()
            if rect is not None:
                x0, y0, w, h = rect.bounds
                path.rect(x0, y0, w, h)
            else:
                self._trace(path, clip_path, clip_transform)
            self.canvas.clipPath(path, stroke=0, fill=0)

        def _trace(self, path: Any, mpl_path: Any, transform: Any) -> None:
            last = (0.0, 0.0)
            for vertices, code in mpl_path.iter_segments(
                transform, remove_nans=True, simplify=False
            ):
                if code == MplPath.MOVETO:
                    path.moveTo(*vertices)
                elif code == MplPath.LINETO:
                    path.lineTo(*vertices)
                elif code == MplPath.CURVE3:  # quadratic Bezier as the equivalent cubic
                    qx, qy, x3, y3 = vertices
                    x0, y0 = last
                    path.curveTo(
                        x0 + 2 / 3 * (qx - x0),
                        y0 + 2 / 3 * (qy - y0),
                        x3 + 2 / 3 * (qx - x3),
                        y3 + 2 / 3 * (qy - y3),
                        x3,
                        y3,
                    )
                elif code == MplPath.CURVE4:
                    path.curveTo(*vertices)
                elif code == MplPath.CLOSEPOLY:
                    path.close()
                    continue
                last = (vertices[-2], vertices[-1])

        def draw_path(self, gc: Any, path: Any, transform: Any, rgbFace: Any = None) -> None:
            canvas = self.canvas
            canvas.saveState()
            self._clip(gc)
            rl_path = canvas.beginPath()
            self._trace(rl_path, path, transform)
            stroke = gc.get_linewidth() > 0 and gc.get_rgb()[3] > 0
            if stroke:
                r, g, b, a = gc.get_rgb()
                alpha = gc.get_alpha() if gc.get_forced_alpha() else a
                canvas.setStrokeColorRGB(r, g, b, alpha=alpha)
                canvas.setLineWidth(gc.get_linewidth())
                canvas.setLineCap({"butt": 0, "round": 1, "projecting": 2}[gc.get_capstyle()])
                canvas.setLineJoin({"miter": 0, "round": 1, "bevel": 2}[gc.get_joinstyle()])
                offset, dashes = gc.get_dashes()
                if dashes:
                    canvas.setDash([float(d) for d in dashes], float(offset or 0))
            fill = rgbFace is not None and (len(rgbFace) < 4 or rgbFace[3] > 0)
            if fill:
                alpha = rgbFace[3] if len(rgbFace) > 3 else 1.0
                if gc.get_forced_alpha():
                    alpha = gc.get_alpha()
                canvas.setFillColorRGB(rgbFace[0], rgbFace[1], rgbFace[2], alpha=alpha)
            if stroke or fill:
                canvas.drawPath(
                    rl_path, stroke=1 if stroke else 0, fill=1 if fill else 0, fillMode=1
                )
            canvas.restoreState()

        def draw_image(self, gc: Any, x: float, y: float, im: Any) -> None:
            from PIL import Image
            from reportlab.lib.utils import ImageReader

            height, width = im.shape[:2]
            image = Image.fromarray(im[::-1], "RGBA")
            self.canvas.saveState()
            self._clip(gc)
            self.canvas.drawImage(ImageReader(image), x, y, width, height, mask="auto")
            self.canvas.restoreState()

    return ReportlabRenderer


class ChartFlowable(Flowable):
    """A matplotlib figure placed in the report at its own size (scaled to fit)."""

    def __init__(self, figure: Any) -> None:
        super().__init__()
        self.figure = figure
        width_in, height_in = figure.get_size_inches()
        self.fig_width = width_in * 72.0
        self.fig_height = height_in * 72.0

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        self.scale = min(1.0, available_width / self.fig_width)
        return self.fig_width * self.scale, self.fig_height * self.scale

    def draw(self) -> None:
        figure = self.figure
        dpi = figure.dpi
        figure.set_dpi(72.0)
        renderer = _renderer_class()(self.canv, self.fig_width, self.fig_height)
        self.canv.saveState()
        self.canv.scale(self.scale, self.scale)
        try:
            figure.draw(renderer)
        finally:
            self.canv.restoreState()
            figure.set_dpi(dpi)
