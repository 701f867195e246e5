"""Label placement: each annotation put where it overlaps no other label, line or marker,
nearest its point (a vectorised search over candidate offsets).
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Iterable, Sequence
from typing import Any

import numpy as np

from calcreport.report.charts.base import FONT_PT, GREY, _freeze_layout

# --------------------------------------------------------------------------
# Label placement: score all the candidate offsets at once and keep the first
# of the best, at best one that overlaps no line, marker or other label and
# stays inside the axes.


class _Placer:
    """Place annotations where they overlap nothing already drawn."""

    def __init__(self, fig: Any, ax: Any, pad: float = 1.5) -> None:
        _freeze_layout(fig)  # the labels are measured in this layout and saved in it
        self.fig = fig
        self.ax = ax
        self.pad = pad
        frame = ax.get_window_extent()
        self.frame = (frame.x0, frame.y0, frame.x1, frame.y1)
        self.renderer = fig._get_renderer()  # one text-measuring renderer for every label
        self.segments = np.empty((0, 4))
        self.boxes: list[tuple[float, float, float, float]] = []

    # obstacles -----------------------------------------------------------
    def add_lines(self, lines: Iterable[Any] | None = None) -> None:
        for line in self.ax.lines if lines is None else lines:
            xy = line.get_transform().transform(np.asarray(line.get_xydata(), dtype=float))
            if line.get_linestyle() not in ("None", "none", "", " "):
                self.add_polyline(xy, display=True)
            if line.get_marker() not in (None, "None", "", " "):
                size = float(line.get_markersize()) / 2 + 0.5
                for x, y in xy:
                    if np.isfinite(x) and np.isfinite(y):
                        self.boxes.append((x - size, y - size, x + size, y + size))

    def add_polyline(self, xy: Any, display: bool = False) -> None:
        xy = np.asarray(xy, dtype=float)
        if not display:
            xy = self.ax.transData.transform(xy)
        if len(xy) < 2:
            return
        seg = np.hstack([xy[:-1], xy[1:]])
        seg = seg[np.all(np.isfinite(seg), axis=1)]
        self.segments = np.vstack([self.segments, seg])

    # placement -----------------------------------------------------------
    def place(
        self,
        text: str,
        xy: tuple[float, float],
        offsets: Sequence[tuple[float, float]],
        leader_from: float = 9.0,
        inside: bool = True,
        fontsize: float = FONT_PT,
        rivals: Sequence[tuple[float, float]] = (),
        also: Sequence[tuple[tuple[float, float], tuple[float, float]]] = (),
        **kw: Any,
    ) -> Any:
        """Annotate ``xy`` (data) with ``text`` at the best of ``offsets`` (points).

        ``also`` lists further candidates with an anchor of their own, as
        ``(anchor, offset)``, tried after ``offsets``. ``rivals`` are other
        labelled points (data): a place nearer to one of them than to the
        anchor counts against a candidate, so labels stay unambiguous. Of
        the candidates with the lowest score, the first is kept.
        """
        options = [(xy, o) for o in offsets] + list(also)
        ann = self.ax.annotate(
            text,
            xy=xy,
            xytext=offsets[0],
            textcoords="offset points",
            annotation_clip=False,
            fontsize=fontsize,
            **kw,
        )
        ann.set_in_layout(False)
        boxes, anchors = self._candidate_boxes(ann, options)
        scores = self._scores(boxes, inside)
        if len(rivals):
            scores += 2.0 * _nearer_to_rival(boxes, anchors, self.ax.transData.transform(rivals))
        best = int(np.argmin(scores))
        anchor, (dx, dy) = options[best]
        x0, y0, x1, y1 = boxes[best]
        ann.xy = anchor
        self._set_offset(ann, dx, dy)
        if math.hypot(dx, dy) >= leader_from:
            ha, va = ann.get_horizontalalignment(), ann.get_verticalalignment()
            ann.remove()
            ann = self.ax.annotate(
                text,
                xy=anchor,
                xytext=(dx, dy),
                textcoords="offset points",
                annotation_clip=False,
                ha=ha,
                va=va,
                fontsize=fontsize,
                arrowprops={
                    "arrowstyle": "-",
                    "lw": 0.5,
                    "color": GREY,
                    "shrinkA": 1.0,
                    "shrinkB": 1.5,
                },
                **kw,
            )
            ann.set_in_layout(False)
            target = anchors[best]
            self.add_polyline([target, _nearest_point(boxes[best], target)], display=True)
        self.boxes.append((x0 - 0.5, y0 - 0.5, x1 + 0.5, y1 + 0.5))
        return ann

    @staticmethod
    def _set_offset(ann: Any, dx: float, dy: float) -> None:
        ann.xyann = (dx, dy)
        ha, va = _alignment(dx, dy)
        ann.set_horizontalalignment(ha)
        ann.set_verticalalignment(va)

    def _candidate_boxes(
        self, ann: Any, options: Sequence[tuple[tuple[float, float], tuple[float, float]]]
    ) -> tuple[Any, Any]:
        """The text boxes (display) of ``ann`` at each option, and the options' anchors.

        The text is laid out once, aligned left and bottom; aligned otherwise,
        its box is that one shifted by half or all of its width or height, and
        at an option it stands at the anchor plus the offset in points. That
        is matplotlib's own arithmetic, so each box is the one the annotation
        reports there, without a layout for every option.
        """
        ann.set_horizontalalignment("left")
        ann.set_verticalalignment("bottom")
        shape = ann._get_layout(self.renderer)[0].extents
        size = shape[2:] - shape[:2]
        anchors: dict[tuple[float, float], Any] = {}
        at = np.empty((len(options), 2))
        shift = np.empty((len(options), 2))
        for i, (anchor, (dx, dy)) in enumerate(options):
            key = (float(anchor[0]), float(anchor[1]))
            if key not in anchors:
                anchors[key] = self.ax.transData.transform(key)
            at[i] = anchors[key]
            ha, va = _alignment(dx, dy)
            shift[i] = _SHIFT[ha], _SHIFT[va]
        offsets = np.array([offset for _, offset in options], dtype=float)
        position = at + offsets * (self.fig.dpi / 72.0)
        shift *= size
        boxes = np.hstack([shape[:2] - shift + position, shape[2:] - shift + position])
        return boxes, at

    def _scores(self, boxes: Any, inside: bool) -> Any:
        """Each candidate box's score: lines crossed, 10 a box overlapped, 20 outside the axes."""
        p = self.pad
        padded = boxes + (-p, -p, p, p)
        reach = _bounds(padded, 1.0)  # only obstacles near the candidates can touch them
        seg = self.segments
        near = (
            (np.maximum(seg[:, 0], seg[:, 2]) >= reach[0])
            & (np.minimum(seg[:, 0], seg[:, 2]) <= reach[2])
            & (np.maximum(seg[:, 1], seg[:, 3]) >= reach[1])
            & (np.minimum(seg[:, 1], seg[:, 3]) <= reach[3])
        )
        score = np.count_nonzero(_segments_hit(seg[near], padded), axis=1).astype(float)
        if self.boxes:
            others = np.asarray(self.boxes, dtype=float)
            others = others[_overlap(others, reach)]
            score += 10.0 * np.count_nonzero(_overlap(padded[:, None, :], others), axis=1)
        if inside:
            fx0, fy0, fx1, fy1 = self.frame
            out = (
                (boxes[:, 0] < fx0)
                | (boxes[:, 1] < fy0)
                | (boxes[:, 2] > fx1)
                | (boxes[:, 3] > fy1)
            )
            score += 20.0 * out
        return score


# How far a box moves, in its widths and heights, from left and bottom alignment.
_SHIFT = {"left": 0.0, "bottom": 0.0, "center": 0.5, "right": 1.0, "top": 1.0}


def _alignment(dx: float, dy: float) -> tuple[str, str]:
    """The text alignment of a label offset by (dx, dy) from its anchor: away from it."""
    ha = "left" if dx > 0.5 else "right" if dx < -0.5 else "center"
    return ha, "bottom" if dy > 0.5 else "top" if dy < -0.5 else "center"


def _nearest_point(box: Sequence[float], point: Sequence[float]) -> tuple[float, float]:
    """The point of ``box`` (x0, y0, x1, y1) nearest to ``point``."""
    return (min(max(point[0], box[0]), box[2]), min(max(point[1], box[1]), box[3]))


def _nearer_to_rival(boxes: Any, anchors: Any, rivals: Any) -> Any:
    """Which boxes come nearer (by 2 pt) to one of ``rivals`` than to their own anchor."""
    mine = _box_distance(boxes, anchors)
    # A rival farther from every box than any box from its anchor cannot count.
    reach = _bounds(boxes, np.max(mine, where=np.isfinite(mine), initial=0.0) + 3.0)
    rivals = rivals[np.all((rivals >= reach[:2]) & (rivals <= reach[2:]), axis=1)]
    rival = _box_distance(boxes[:, None, :], rivals[None, :, :])
    return np.any(rival < mine[:, None] + 2.0, axis=1)


def _bounds(boxes: Any, margin: float) -> Any:
    """The box (x0, y0, x1, y1) around the finite rows of ``boxes``, grown by ``margin``.

    The margin also covers rounding, so a pre-filter by these bounds drops
    nothing an exact test would keep. Boxes off the scale (at a log axis'
    zero) touch nothing, and no boxes give empty bounds.
    """
    finite = boxes[np.all(np.isfinite(boxes), axis=1)]
    lo = finite[:, :2].min(axis=0, initial=np.inf) - margin
    hi = finite[:, 2:].max(axis=0, initial=-np.inf) + margin
    return np.concatenate([lo, hi])


def _box_distance(boxes: Any, points: Any) -> Any:
    """Distances from boxes (x0, y0, x1, y1) to points (x, y), on the last axes, broadcast."""
    nearest = np.minimum(np.maximum(points, boxes[..., :2]), boxes[..., 2:])
    return np.hypot(*np.moveaxis(nearest - points, -1, 0))


def _overlap(a: Any, b: Any) -> Any:
    """Whether boxes ``a`` and ``b`` (x0, y0, x1, y1 on the last axis) overlap, broadcast."""
    a, b = np.asarray(a), np.asarray(b)
    return (
        (a[..., 0] < b[..., 2])
        & (b[..., 0] < a[..., 2])
        & (a[..., 1] < b[..., 3])
        & (b[..., 1] < a[..., 3])
    )


def _segments_hit(seg: Any, boxes: Any) -> Any:
    """Which segments (rows x0, y0, x1, y1) cross which boxes (rows x0, y0, x1, y1).

    Liang-Barsky clipping of every segment against every box: a boolean
    array of (boxes, segments).
    """
    boxes = np.atleast_2d(np.asarray(boxes, dtype=float))
    if len(seg) == 0:
        return np.zeros((len(boxes), 0), dtype=bool)
    xmin, ymin, xmax, ymax = (edge[:, None] for edge in boxes.T)
    x0, y0, x1, y1 = seg.T
    dx, dy = x1 - x0, y1 - y0
    shape = (len(boxes), len(seg))
    u0 = np.zeros(shape)
    u1 = np.ones(shape)
    ok = np.ones(shape, dtype=bool)
    for p, q in ((-dx, x0 - xmin), (dx, xmax - x0), (-dy, y0 - ymin), (dy, ymax - y0)):
        parallel = p == 0
        ok &= ~(parallel & (q < 0))
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.where(parallel, 0.0, q / np.where(parallel, 1.0, p))
        u0 = np.where(~parallel & (p < 0), np.maximum(u0, t), u0)
        u1 = np.where(~parallel & (p > 0), np.minimum(u1, t), u1)
    return ok & (u0 <= u1)


def _clusters(ax: Any, xy: Sequence[tuple[float, float]], within: float) -> list[list[int]]:
    """Group points (data) lying within ``within`` points of each other on the page.

    Groups come in the order of their first points, each in input order.
    Points are binned in square cells of side ``within``, so each is compared
    only with those of its own and the eight neighbouring cells.
    """
    if not xy:
        return []
    page = ax.transData.transform(np.asarray(xy, dtype=float))
    group = list(range(len(xy)))
    cells: dict[tuple[int, int], list[int]] = {}

    def root(i: int) -> int:
        while group[i] != i:
            i = group[i]
        return i

    for i, (x, y) in enumerate(page):
        if not (math.isfinite(x) and math.isfinite(y)):
            continue  # a point off the scale joins no group
        cx, cy = math.floor(x / within), math.floor(y / within)
        for key in itertools.product((cx - 1, cx, cx + 1), (cy - 1, cy, cy + 1)):
            for j in cells.get(key, ()):
                if math.dist(page[i], page[j]) < within:
                    group[root(i)] = root(j)
        cells.setdefault((cx, cy), []).append(i)
    out: dict[int, list[int]] = {}
    for i in range(len(xy)):
        out.setdefault(root(i), []).append(i)
    return list(out.values())


def _ring(radii: Sequence[float], first: Sequence[tuple[float, float]] = ()) -> list[tuple]:
    """Candidate offsets: ``first``, then sixteen directions at each radius."""
    out = list(first)
    directions = ((1, 1), (-1, 1), (1, -1), (-1, -1), (0, 1), (0, -1), (1, 0), (-1, 0))
    directions += ((1, 2), (1, -2), (-1, 2), (-1, -2), (2, 1), (2, -1), (-2, 1), (-2, -1))
    for r in radii:
        for ux, uy in directions:
            scale = r / math.hypot(ux, uy)
            out.append((ux * scale, uy * scale))
    return out
