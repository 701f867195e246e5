"""Charts of the calculation report, drawn from a solved trace.

Every public function takes a trace (the ``calcreport-trace/1`` JSON as a
dict) and returns a :class:`Figure`: one page of vector PDF of a fixed size
and a one-line caption. The charts plot values of the trace and convert
units for display; they compute no engineering numbers (the one exception is
the background of the friction-factor chart, the laminar and Colebrook lines
of constant relative roughness, drawn with :mod:`calcreport.physics.friction`).

matplotlib is imported lazily, inside the functions, and only through its
object API (no pyplot), so solving never loads it and no global state is
left behind. The same trace gives the same PDF bytes.

Charts
------
- :func:`system_curve` -- system head against flow with the duty point
- :func:`npsh` -- NPSH available against flow
- :func:`profile` -- energy and hydraulic grade lines along the route
- :func:`loss_breakdown` -- the parts of the total dynamic head
- :func:`friction_factor` -- Darcy friction factor against Reynolds number
- :func:`sketch` -- a single-line schematic of the system with its elevations
- :func:`route_pressure` -- grade lines against the pipe, ratings and high points
- :func:`energy` -- input power and running cost at each point of the duty profile

Helpers
-------
- :class:`Figure` -- the PDF bytes, page size and caption of one chart
- :data:`FIGURES` -- the names of the chart functions, in report order
"""

from __future__ import annotations

import io
import itertools
import math
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from calcreport.units import display_unit, fmt, pretty_unit, to_display

__all__ = [
    "FIGURES",
    "Drawn",
    "Figure",
    "applies",
    "drawn",
    "energy",
    "friction_factor",
    "loss_breakdown",
    "npsh",
    "profile",
    "route_pressure",
    "sketch",
    "system_curve",
]


@dataclass(frozen=True)
class Figure:
    """One chart: a one-page vector PDF, its page size and its caption.

    ``title`` is the caption text without the "Figure N —" prefix, which
    the document adds. ``figure`` is the drawn matplotlib Figure itself, for
    a document that draws the chart on its own canvas rather than embedding
    ``pdf``; it takes no part in comparisons.
    """

    pdf: bytes
    width_pt: float
    height_pt: float
    title: str
    figure: Any = field(default=None, compare=False, repr=False)

    def __post_init__(self) -> None:
        if not self.pdf.startswith(b"%PDF"):
            raise ValueError("Figure.pdf must hold a PDF document.")
        if not (self.width_pt > 0 and self.height_pt > 0):
            raise ValueError("Figure width and height must be positive.")
        if not self.title:
            raise ValueError("Figure.title must not be empty.")


# --------------------------------------------------------------------------
# Appearance: one place for sizes, palette and matplotlib settings.

WIDTH_IN = 6.3  # fits the text width of A4 and Letter
FONT_PT = 8.0  # annotations and ticks
LABEL_PT = 8.5  # axis labels

INK = "#222222"
BLUE = "#1f4e79"  # primary line
RUST = "#b0502a"  # second line, duty point
GREY = "#808080"
LIGHT = "#d0d0d0"
LIQUID = "#dce6ef"

_RC: dict[str, Any] = {
    "font.family": "DejaVu Sans",
    "font.size": FONT_PT,
    "axes.labelsize": LABEL_PT,
    "axes.titlesize": LABEL_PT,
    "xtick.labelsize": FONT_PT,
    "ytick.labelsize": FONT_PT,
    "legend.fontsize": FONT_PT,
    "mathtext.fontset": "dejavusans",
    # Labels carry the input's own words (pipe ids, notes): never read "$...$" as math.
    "text.parse_math": False,
    "text.color": INK,
    "axes.labelcolor": INK,
    "axes.edgecolor": "#555555",
    "axes.linewidth": 0.6,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.axisbelow": True,
    "axes.grid": False,
    "axes.formatter.useoffset": False,
    "axes.formatter.use_mathtext": False,
    "axes.unicode_minus": True,
    "xtick.color": "#555555",
    "ytick.color": "#555555",
    "xtick.labelcolor": INK,
    "ytick.labelcolor": INK,
    "xtick.major.width": 0.6,
    "ytick.major.width": 0.6,
    "xtick.minor.width": 0.4,
    "ytick.minor.width": 0.4,
    "xtick.major.size": 3.0,
    "ytick.major.size": 3.0,
    "xtick.minor.size": 1.8,
    "ytick.minor.size": 1.8,
    "grid.color": "#e4e4e4",
    "grid.linewidth": 0.5,
    "lines.linewidth": 1.3,
    "lines.solid_capstyle": "butt",
    "hatch.linewidth": 0.5,
    "legend.frameon": False,
    "legend.handlelength": 2.3,
    "legend.borderaxespad": 0.0,
    "legend.columnspacing": 1.3,
    "figure.dpi": 72,
    "savefig.dpi": 72,
    "pdf.fonttype": 42,  # embed TrueType, text stays text
    "ps.fonttype": 42,  # matplotlib sizes the PDF font subsets by this one
    "pdf.compression": 6,
    "svg.hashsalt": "calcreport",
    "path.simplify": False,
}

_PDF_METADATA = {"Creator": None, "Producer": None, "CreationDate": None}


# --------------------------------------------------------------------------
# Public charts


def system_curve(trace: dict[str, Any]) -> Figure:
    """System head against flow with the duty point and the static head."""
    return _render(_draw_system_curve, trace)


def npsh(trace: dict[str, Any]) -> Figure:
    """NPSH available against flow with the duty flow marked."""
    return _render(_draw_npsh, trace)


def profile(trace: dict[str, Any]) -> Figure:
    """Energy and hydraulic grade lines along the route, source to destination."""
    return _render(_draw_profile, trace)


def loss_breakdown(trace: dict[str, Any]) -> Figure:
    """The parts of the total dynamic head as horizontal bars."""
    return _render(_draw_loss_breakdown, trace)


def friction_factor(trace: dict[str, Any]) -> Figure:
    """Darcy friction factor against Reynolds number with this system's pipes."""
    return _render(_draw_friction_factor, trace)


def sketch(trace: dict[str, Any]) -> Figure:
    """A single-line schematic of the system with its elevations to scale."""
    return _render(_draw_sketch, trace)


def route_pressure(trace: dict[str, Any]) -> Figure:
    """Grade lines along the route against the pipe, the ratings and the high points."""
    return _render(_draw_route_pressure, trace)


def energy(trace: dict[str, Any]) -> Figure:
    """Input power and running cost at each point of the duty profile."""
    return _render(_draw_energy, trace)


FIGURES = (
    "sketch",
    "system_curve",
    "npsh",
    "profile",
    "loss_breakdown",
    "friction_factor",
    "route_pressure",
    "energy",
)


def applies(name: str, trace: dict[str, Any]) -> bool:
    """Whether the trace holds what chart ``name`` plots (some depend on optional input)."""
    results = trace.get("results", {})
    if name == "route_pressure":
        nodes = results.get("route", {}).get("nodes", [])
        # A profile needs two points along the pipes; the pump's flanges alone are not one.
        return sum(1 for n in nodes if "min_grade" in n and n.get("station") != "flange") >= 2
    if name == "energy":
        rows = results.get("energy", {}).get("profile", [])
        return bool(rows) and all("electrical_power" in r for r in rows)
    return True


# --------------------------------------------------------------------------
# Rendering


def _render(draw: Callable[[dict[str, Any]], tuple[Any, str]], trace: dict[str, Any]) -> Figure:
    """Draw a chart under the package's settings and save it as PDF bytes."""
    import matplotlib

    with matplotlib.rc_context(_RC):
        fig, title = draw(trace)
        _plain_glyphs(fig)
        buffer = io.BytesIO()
        fig.savefig(buffer, format="pdf", metadata=_PDF_METADATA)
    width, height = fig.get_size_inches()
    return Figure(
        pdf=buffer.getvalue(),
        width_pt=float(width) * 72.0,
        height_pt=float(height) * 72.0,
        title=title,
        figure=fig,
    )


@dataclass(frozen=True)
class Drawn:
    """A chart drawn but not saved: the matplotlib figure and its caption."""

    figure: Any
    title: str


def drawn(name: str, trace: dict[str, Any]) -> Drawn:
    """Chart ``name`` of :data:`FIGURES` as a matplotlib figure, for a document to draw."""
    return Drawn(*_draw_only(name, trace))


def _draw_only(name: str, trace: dict[str, Any]) -> tuple[Any, str]:
    """The matplotlib figure and caption of chart ``name``, without saving a PDF."""
    import matplotlib

    with matplotlib.rc_context(_RC):
        fig, title = globals()[f"_draw_{name}"](trace)
        _plain_glyphs(fig)
    return fig, title


def _new_figure(height_in: float) -> Any:
    from matplotlib.figure import Figure as MplFigure

    fig = MplFigure(figsize=(WIDTH_IN, height_in), dpi=72, layout="constrained")
    fig.get_layout_engine().set(w_pad=4 / 72, h_pad=4 / 72, wspace=0.0, hspace=0.0)
    return fig


def _freeze_layout(fig: Any) -> None:
    """Run the constrained layout once and keep it: later draws reuse its positions.

    The layout runs without a draw of the figure. Only the legends, which
    set out their entries when drawn, are drawn (without rendering), so
    every text already stands where the chart will show it.
    """
    _plain_glyphs(fig)
    fig.get_layout_engine().execute(fig)
    fig.set_layout_engine("none")
    renderer = fig._get_renderer()
    with renderer._draw_disabled():
        for ax in fig.axes:
            legend = ax.get_legend()
            if legend is not None:
                legend.draw(renderer)
    _plain_glyphs(fig)  # the tick labels that the layout created


def _plain_glyphs(fig: Any) -> None:
    """Set every text without ligatures: one glyph a character, one font subset a page."""
    from matplotlib.text import Text

    if not hasattr(Text, "set_fontfeatures"):  # matplotlib before 3.11 sets no ligatures
        return
    texts = list(fig.texts)
    for ax in fig.axes:
        texts += [*ax.texts, ax.xaxis.label, ax.yaxis.label, ax.title]
        legend = ax.get_legend()
        if legend is not None:
            texts += legend.get_texts()
        for axis in (ax.xaxis, ax.yaxis):
            for tick in axis.majorTicks + axis.minorTicks:
                texts += [tick.label1, tick.label2]
    for text in texts:
        if text.get_fontfeatures() is None:
            text.set_fontfeatures(("-liga",))


def _style_axes(ax: Any, grid: str = "both") -> None:
    ax.grid(True, which="major", axis=grid)
    ax.tick_params(which="both", direction="out")


def _legend_above(
    ax: Any, handles: Sequence[Any] | None = None, ncols: int | None = None, reserve: float = 0.0
) -> None:
    """A frameless legend in one row above the axes, in more rows when it is too wide."""
    if handles is None:
        handles, _ = ax.get_legend_handles_labels()
    if not handles:
        return
    room = ax.figure.bbox.width - 60.0 - reserve
    columns = min(ncols or len(handles), len(handles))
    while True:
        legend = ax.legend(
            handles=list(handles),
            loc="lower left",
            bbox_to_anchor=(0.0, 1.02),
            ncols=columns,
            handletextpad=0.6,
        )
        if columns == 1 or legend.get_window_extent().width <= room:
            return
        columns -= 1


# --------------------------------------------------------------------------
# Trace access and display units


class _Display:
    """Unit conversion for display in the report's unit system."""

    def __init__(self, trace: dict[str, Any]) -> None:
        units = str(trace.get("project", {}).get("units", "SI")).upper()
        self.system = "US" if units == "US" else "SI"
        self._linear: dict[tuple[str, str], tuple[float, float]] = {}

    def unit(self, kind: str) -> str:
        return display_unit(kind, self.system)

    def label(self, kind: str) -> str:
        return pretty_unit(self.unit(kind))

    def __call__(self, q: dict[str, Any], kind: str) -> Any:
        """The quantity ``q`` ({"value", "unit"}, scalar or list) in display units."""
        unit = self.unit(kind)
        value = q["value"]
        if isinstance(value, list | tuple | np.ndarray):
            offset, scale = self._line(q.get("unit", ""), unit)
            return np.asarray(value, dtype=float) * scale + offset
        return to_display(float(value), q.get("unit", ""), unit)

    def series(self, q: dict[str, Any], kind: str, n: int) -> Any:
        """A curve's values as an array of ``n`` (a constant may be stored as one number)."""
        values = np.asarray(self(q, kind), dtype=float)
        return np.broadcast_to(values, (n,)) if values.ndim == 0 else values

    def raw(self, value: float, si_unit: str, kind: str) -> float:
        return to_display(float(value), si_unit, self.unit(kind))

    def _line(self, si_unit: str, unit: str) -> tuple[float, float]:
        key = (si_unit, unit)
        if key not in self._linear:
            offset = to_display(0.0, si_unit, unit)
            self._linear[key] = (offset, to_display(1.0, si_unit, unit) - offset)
        return self._linear[key]


def _results(trace: dict[str, Any], *keys: str) -> dict[str, Any]:
    results = trace.get("results")
    if not isinstance(results, dict):
        raise ValueError("The trace has no results table; solve the input first.")
    missing = [k for k in keys if k not in results]
    if missing:
        raise ValueError(f"The trace results lack {', '.join(missing)}, which this chart plots.")
    return results


def _num(x: float, sig: int = 3) -> str:
    """A result for a chart label: ``sig`` significant figures."""
    if x == 0 or not math.isfinite(x):
        return "0" if x == 0 else str(x)
    return fmt(x, sig).replace("-", "−")


def _plain(x: float) -> str:
    """An input value as entered: up to four significant figures, no trailing zeros."""
    if x == 0:
        return "0"
    text = f"{x:.0f}" if abs(x) >= 1000 else f"{x:.4g}"
    return text.replace("-", "−")


def _given(trace: dict[str, Any], key: str) -> dict[str, Any] | None:
    value = trace.get("given", {}).get(key)
    return value if isinstance(value, dict) and "value" in value else None


def _pipe_items(results: dict[str, Any]) -> list[tuple[str, dict[str, Any]]]:
    pipes = results.get("pipes", {})
    return [(str(k), v) for k, v in pipes.items() if isinstance(v, dict)]


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


# --------------------------------------------------------------------------
# 1. System curve


def _draw_system_curve(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "system_curve", "flow", "total_dynamic_head")
    d = _Display(trace)
    curve = r["system_curve"]
    q = d(curve["flow"], "flow")
    h = d.series(curve["head"], "length", len(q))
    duty_point = r.get("duty_point", {"flow": r["flow"], "head": r["total_dynamic_head"]})
    q_duty = d(duty_point["flow"], "flow")
    h_duty = d(duty_point["head"], "length")
    qu, hu = d.label("flow"), d.label("length")

    fig = _new_figure(3.4)
    ax = fig.add_subplot()
    _style_axes(ax)
    handles = []
    (line,) = ax.plot(q, h, color=BLUE, lw=1.6, label="system curve, C1 (design)")
    handles.append(line)
    ymax = float(np.max(h))
    xmax = float(np.max(q))

    # Other operating cases that carry their own curve.
    styles = iter([(GREY, (0, (5, 2))), (GREY, (0, (1, 1.5))), (GREY, (0, (6, 2, 1, 2)))] * 4)
    titles = {c.get("id"): c.get("title", c.get("id")) for c in trace.get("cases", []) or []}
    shown_cases: list[str] = []
    for case_id, case in (r.get("cases") or {}).items():
        other = case.get("system_curve") if isinstance(case, dict) else None
        if not other or other == curve:
            continue
        color, dash = next(styles)
        (line,) = ax.plot(
            d(other["flow"], "flow"),
            d(other["head"], "length"),
            color=color,
            lw=1.0,
            ls=dash,
            label=f"system curve, {case_id}",
        )
        handles.append(line)
        shown_cases.append(f"{case_id}: {titles.get(case_id, case_id)}")
        ymax = max(ymax, float(np.max(line.get_ydata())))

    # Pump curve and operating point, when the trace has them.
    pump = r.get("pump_curve")
    if isinstance(pump, dict) and "flow" in pump and "head" in pump:
        (line,) = ax.plot(
            d(pump["flow"], "flow"),
            d(pump["head"], "length"),
            color=INK,
            lw=1.3,
            ls=(0, (7, 2, 1.5, 2)),
            label="pump curve",
        )
        handles.append(line)
        # The curve is never extended: its last point is a limit of the pump data.
        (end,) = ax.plot(
            line.get_xdata()[-1:],
            line.get_ydata()[-1:],
            ls="none",
            marker="|",
            ms=11,
            mew=1.6,
            color=INK,
            label="end of pump curve",
        )
        handles.append(end)
        ymax = max(ymax, float(np.max(line.get_ydata())))
        xmax = max(xmax, float(np.max(line.get_xdata())))

    # Static head: the elevation and surface-pressure parts of TDH.
    static = r.get("static_head")
    pressure = r.get("pressure_head")
    static_line = None
    if static is not None:
        h_static = d(static, "length") + (d(pressure, "length") if pressure else 0.0)
        has_pressure = bool(pressure) and pressure["value"] != 0
        name = "static head"
        (static_line,) = ax.plot(
            [0, xmax], [h_static, h_static], color=GREY, lw=1.0, ls=(0, (4, 2)), label=name
        )
        handles.append(static_line)

    (duty,) = ax.plot(
        [q_duty], [h_duty], ls="none", marker="o", ms=6, mfc=RUST, mec=INK, mew=0.6, zorder=5
    )
    duty.set_label("duty point")
    handles.append(duty)

    op = r.get("operating_point")
    op_xy = None
    if isinstance(op, dict) and "flow" in op and "head" in op:
        op_xy = (d(op["flow"], "flow"), d(op["head"], "length"))
        handles.append(_operating_marker(ax, *op_xy))
        others = [
            (d(c["operating_point"]["flow"], "flow"), d(c["operating_point"]["head"], "length"))
            for cid, c in (r.get("cases") or {}).items()
            if cid != "C1" and isinstance(c, dict) and "operating_point" in c
        ]
        if others:
            (om,) = ax.plot(
                *zip(*others, strict=True),
                ls="none",
                marker="D",
                ms=4.0,
                mfc=LIGHT,
                mec=INK,
                mew=0.5,
                zorder=6,
            )
            om.set_label("operating points, other cases")
            handles.append(om)
    handles += _regions(ax, d, r.get("operating_region"))

    # Head from zero, or from below zero where the curve or static head is negative.
    ymin = min(0.0, float(np.min(h)), h_static if static_line is not None else 0.0, h_duty)
    ymax = max(ymax, h_duty)
    span = max(ymax - ymin, 1e-9)
    ax.set_xlim(0, xmax * 1.02)
    ax.set_ylim(ymin - (0.08 * span if ymin < 0 else 0.0), ymax + 0.12 * span)
    if ymin < 0:
        ax.axhline(0.0, color="#555555", lw=0.6, zorder=1)
    drop = {"color": RUST, "lw": 0.7, "ls": (0, (1, 1.5)), "zorder": 1}
    ax.plot([q_duty, q_duty], [ax.get_ylim()[0], h_duty], **drop)
    ax.plot([0, q_duty], [h_duty, h_duty], **drop)
    ax.set_xlabel(f"Flow [{qu}]")
    ax.set_ylabel(f"Head [{hu}]")
    _legend_above(ax, handles)

    placer = _Placer(fig, ax)
    placer.add_lines()
    placer.place(
        f"duty point\n{_num(q_duty)} {qu}, TDH {_num(h_duty)} {hu}",
        (q_duty, h_duty),
        [(-14, 16), (-24, 26), (14, -16), (16, -28), (-34, 6), (12, 20)],
        leader_from=4,
        multialignment="left",
    )
    if op_xy is not None:
        placer.place(
            f"operating point\n{_num(op_xy[0])} {qu}, {_num(op_xy[1])} {hu}",
            op_xy,
            [(14, -16), (16, -28), (-14, 16), (20, 6), (-24, -20)],
            leader_from=4,
        )
    if static_line is not None:
        text = f"static head {_num(h_static)} {hu}"
        if has_pressure:
            text += (
                f" = elevation {_num(d(static, 'length'))} {hu}"
                f" + pressure {_num(d(pressure, 'length'))} {hu}"
            )
        placer.place(
            text,
            (xmax * 0.01, h_static),
            [(2, -3), (2, 3)],
            also=[((xmax, h_static), (-2, 3)), ((xmax, h_static), (-2, -3))],
            leader_from=99,
        )

    title = (
        f"System curve at the design case: head against flow, duty point "
        f"{_num(q_duty)} {qu} at TDH {_num(h_duty)} {hu}"
    )
    if op_xy is not None:
        title += ", with the pump curve and the operating point"
    if shown_cases:
        title += "; " + "; ".join(shown_cases)
    return fig, title


def _regions(ax: Any, d: Any, regions: dict[str, Any] | None) -> list[Any]:
    """Shade the preferred and allowable operating regions; mark BEP and minimum flow."""
    if not regions:
        return []
    handles = []
    if "allowable" in regions:
        lo, hi = (d(q, "flow") for q in regions["allowable"])
        handles.append(
            ax.axvspan(lo, hi, color="#f1f1f1", zorder=0, lw=0, label="allowable operating region")
        )
    lo, hi = (d(q, "flow") for q in regions["preferred"])
    handles.append(
        ax.axvspan(lo, hi, facecolor="#e2e9f0", lw=0, zorder=0, label="preferred operating region")
    )
    bep = d(regions["bep_flow"], "flow")
    handles.append(ax.axvline(bep, color=BLUE, lw=0.8, ls=(0, (2, 2)), zorder=1, label="BEP flow"))
    if "min_continuous_flow" in regions:
        q_min = d(regions["min_continuous_flow"], "flow")
        handles.append(
            ax.axvline(
                q_min,
                color=RUST,
                lw=0.8,
                ls=(0, (4, 1, 1, 1)),
                zorder=1,
                label="minimum continuous flow",
            )
        )
    return handles


# --------------------------------------------------------------------------
# 2. NPSH


def _draw_npsh(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "system_curve", "flow", "npsh_available")
    d = _Display(trace)
    curve = r["system_curve"]
    if "npsh_available" not in curve:
        raise ValueError("The trace's system curve has no npsh_available, which this chart plots.")
    q = d(curve["flow"], "flow")
    a = d.series(curve["npsh_available"], "length", len(q))
    duty_point = r.get("duty_point", {"flow": r["flow"], "npsh_available": r["npsh_available"]})
    q_duty = d(duty_point["flow"], "flow")
    a_duty = d(duty_point["npsh_available"], "length")
    qu, hu = d.label("flow"), d.label("length")
    pump = r.get("pump_curve") if isinstance(r.get("pump_curve"), dict) else {}
    op = r.get("operating_point") if isinstance(r.get("operating_point"), dict) else {}

    # With the pump's efficiency, a panel above shares the flow axis.
    with_efficiency = "flow" in pump and "efficiency" in pump
    fig = _new_figure(4.9 if with_efficiency else 3.2)
    if with_efficiency:
        top, ax = fig.subplots(2, 1, sharex=True, gridspec_kw={"height_ratios": [1.0, 1.6]})
    else:
        top, ax = None, fig.add_subplot()
    _style_axes(ax)
    handles = []
    basis = " at the lowest source level" if _given(trace, "source.level_low") else ""
    (line,) = ax.plot(q, a, color=BLUE, lw=1.6, label=f"NPSH available{basis}")
    handles.append(line)
    ymax = float(np.max(a))
    xmax = float(np.max(q))

    if "flow" in pump and "npsh_required" in pump:
        pq = d(pump["flow"], "flow")
        (line,) = ax.plot(
            pq,
            d(pump["npsh_required"], "length"),
            color=RUST,
            lw=1.3,
            ls=(0, (5, 2)),
            marker="s",
            ms=3.5,
            mfc="white",
            label="NPSH required (pump data)",
        )
        handles.append(line)
        ymax = max(ymax, float(np.max(line.get_ydata())))
        xmax = max(xmax, float(np.max(pq)))
        if "npsh_needed" in pump:
            (line,) = ax.plot(
                pq,
                d(pump["npsh_needed"], "length"),
                color=RUST,
                lw=0.9,
                ls=(0, (1, 1.2)),
                label="NPSH required with the margin criterion",
            )
            handles.append(line)
            ymax = max(ymax, float(np.max(line.get_ydata())))

    (duty,) = ax.plot(
        [q_duty], [a_duty], ls="none", marker="o", ms=6, mfc=RUST, mec=INK, mew=0.6, zorder=5
    )
    duty.set_label("duty flow")
    handles.append(duty)
    ax.axvline(q_duty, color=RUST, lw=0.7, ls=(0, (1, 1.5)), zorder=1)

    if "flow" in op and "npsh_required" in op:
        handles.append(
            _operating_marker(ax, d(op["flow"], "flow"), d(op["npsh_required"], "length"))
        )

    if top is not None:
        handles += _efficiency_panel(top, d, pump, op, r.get("operating_region"), q_duty)
    ax.set_xlim(0, xmax * 1.02)
    ax.set_ylim(0, ymax * 1.3)
    ax.set_xlabel(f"Flow [{qu}]")
    ax.set_ylabel(f"NPSH [{hu}]")
    _legend_above(top if top is not None else ax, _unique(handles))

    placer = _Placer(fig, ax)
    placer.add_lines()
    placer.place(
        f"duty {_num(q_duty)} {qu}\nNPSHa {_num(a_duty)} {hu}",
        (q_duty, a_duty),
        [(7, 8), (-7, 8), (7, -8), (-7, -8), (14, 20), (-14, 20)],
        leader_from=99,
    )
    title = (
        f"NPSH available against flow at the design case; at the duty flow "
        f"{_num(q_duty)} {qu}, NPSHa = {_num(a_duty)} {hu}"
    )
    if "npsh_needed" in pump:
        title += "; the dotted line is the NPSH available the margin criterion asks for"
    if top is not None:
        title = "Pump efficiency (above) and " + title
    return fig, title


def _efficiency_panel(
    ax: Any,
    d: Any,
    pump: dict[str, Any],
    op: dict[str, Any],
    regions: dict[str, Any] | None,
    q_duty: float,
) -> list[Any]:
    """The pump's efficiency against flow, in percent, with BEP and the operating point."""
    _style_axes(ax)
    eta = np.asarray(pump["efficiency"]["value"], dtype=float) * 100.0
    (line,) = ax.plot(
        d(pump["flow"], "flow"),
        eta,
        color=INK,
        lw=1.3,
        ls=(0, (7, 2, 1.5, 2)),
        label="pump efficiency",
    )
    handles = [line]
    if "flow" in op and "efficiency" in op:
        handles.append(
            _operating_marker(ax, d(op["flow"], "flow"), op["efficiency"]["value"] * 100)
        )
    if regions and "bep_flow" in regions:
        bep = d(regions["bep_flow"], "flow")
        handles.append(
            ax.axvline(bep, color=BLUE, lw=0.8, ls=(0, (2, 2)), zorder=1, label="BEP flow")
        )
    ax.axvline(q_duty, color=RUST, lw=0.7, ls=(0, (1, 1.5)), zorder=1)
    ax.set_ylim(0, 100)
    ax.set_ylabel("Efficiency [%]")
    ax.tick_params(labelbottom=False)
    return handles


def _operating_marker(ax: Any, x: float, y: float) -> Any:
    """The open diamond that marks the operating point on every chart."""
    (marker,) = ax.plot(
        [x],
        [y],
        ls="none",
        marker="D",
        ms=5.5,
        mfc="white",
        mec=INK,
        zorder=6,
        label="operating point",
    )
    return marker


def _unique(handles: list[Any]) -> list[Any]:
    """Legend handles with one entry for each label (the first drawn)."""
    seen: set[str] = set()
    out = []
    for h in handles:
        if h.get_label() not in seen:
            seen.add(h.get_label())
            out.append(h)
    return out


# --------------------------------------------------------------------------
# 3. Route profile


def _surface_marker() -> Any:
    """The liquid-surface symbol: a downward triangle on the surface, two bars below."""
    from matplotlib.path import Path

    verts = [
        (-0.55, 1.0), (0.55, 1.0), (0.0, 0.0), (-0.55, 1.0),
        (-0.45, -0.3), (0.45, -0.3),
        (-0.25, -0.6), (0.25, -0.6),
    ]  # fmt: skip
    codes = [Path.MOVETO, Path.LINETO, Path.LINETO, Path.CLOSEPOLY]
    codes += [Path.MOVETO, Path.LINETO, Path.MOVETO, Path.LINETO]
    return Path(verts, codes)


def _draw_profile(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "profile")
    d = _Display(trace)
    prof = r["profile"]
    nodes = prof.get("nodes", [])
    if len(nodes) < 2:
        raise ValueError("The trace's profile has fewer than two nodes.")
    si = prof.get("unit", "m")

    def conv(v: float) -> float:
        return d.raw(v, si, "length")

    hu = d.label("length")
    x = np.array([conv(n["distance"]) for n in nodes])
    egl = np.array([conv(n["egl"]) for n in nodes])
    hgl = np.array([conv(n["hgl"]) for n in nodes])
    names = [str(n.get("name", "")) for n in nodes]
    last = len(nodes) - 1

    fig = _new_figure(3.5)
    ax = fig.add_subplot()
    _style_axes(ax)
    handles = []
    (egl_line,) = ax.plot(x, egl, color=BLUE, lw=1.5, label="EGL")
    (hgl_line,) = ax.plot(x, hgl, color=RUST, lw=1.1, ls=(0, (5, 2)), label="HGL")
    handles += [egl_line, hgl_line]
    ys = [egl, hgl]

    # Pipe centreline where the input gives node elevations (not the two surfaces).
    centre = np.array(
        [
            conv(n["elevation"]) if n.get("elevation") is not None and 0 < i < last else np.nan
            for i, n in enumerate(nodes)
        ]
    )
    if np.any(np.isfinite(centre)):
        (pipe_line,) = ax.plot(
            x, centre, color="#555555", lw=2.4, marker="o", ms=2.5, zorder=2,
            label="pipe centreline (given)",
        )  # fmt: skip
        handles.append(pipe_line)
        ys.append(centre[np.isfinite(centre)])

    # The liquid surfaces; a pressurised surface's grade line stands above it.
    surfaces = []
    for i, grade in ((0, egl[0]), (last, hgl[last])):
        level = nodes[i].get("elevation")
        y = conv(level) if level is not None else grade
        surfaces.append((x[i], y, grade))
        if abs(grade - y) > 1e-9:
            ax.plot([x[i], x[i]], [y, grade], color=GREY, lw=0.8, ls=(0, (1, 1.5)), zorder=1)
    ys.append(np.array([s[1] for s in surfaces]))

    # The pipes: their spans along the route, from the "<id> start/end" nodes.
    spans: list[tuple[str, int, int]] = []
    for pid, _ in _pipe_items(r):
        if f"{pid} start" in names and f"{pid} end" in names:
            spans.append((pid, names.index(f"{pid} start"), names.index(f"{pid} end")))
    for _pid, _i0, i1 in spans[:-1]:
        ax.axvline(x[i1], color=LIGHT, lw=0.5, ls=(0, (2, 2)), zorder=0)

    # Where the EGL jumps: the pump, after the last suction pipe.
    pump_after = prof.get("pump_after")
    jump: int | None
    if pump_after and f"{pump_after} end" in names:
        jump = names.index(f"{pump_after} end")
    else:
        rise = np.diff(egl)
        jump = int(np.argmax(rise)) if rise.size and np.max(rise) > 0 else None

    lo = float(min(np.nanmin(y) for y in ys))
    hi = float(max(np.nanmax(y) for y in ys))
    span = max(hi - lo, 1.0)
    length = max(float(x[-1] - x[0]), 1e-9)
    ax.set_xlim(x[0] - 0.02 * length, x[-1] + 0.025 * length)
    ax.set_ylim(lo - 0.16 * span, hi + 0.14 * span)
    ax.set_xlabel(f"Distance along route [{hu}]")
    ax.set_ylabel(f"Elevation [{hu}]")

    free = _given(trace, "destination.outlet_elevation") is not None
    liquid = surfaces[:1] if free else surfaces
    (surf,) = ax.plot(
        [s[0] for s in liquid], [s[1] for s in liquid], ls="none", marker=_surface_marker(),
        ms=9, mfc="white", mec=INK, mew=0.8, zorder=6, label="liquid surface",
    )  # fmt: skip
    handles.append(surf)
    if free:
        (outlet,) = ax.plot(
            [surfaces[1][0]], [surfaces[1][1]], ls="none", marker="o", ms=5, mfc="white",
            mec=INK, mew=0.8, zorder=6, label="free outlet",
        )  # fmt: skip
        handles.append(outlet)
    _legend_above(ax, handles)

    placer = _Placer(fig, ax)
    placer.add_lines()
    roles = (("source surface", 1), ("free outlet" if free else "destination surface", -1))
    for (xs, y, grade), (role, sign) in zip(surfaces, roles, strict=True):
        text = f"{role} {_plain(y)} {hu}"
        if abs(grade - y) > 1e-9:
            which = "EGL" if sign > 0 else "HGL"
            text += f"\n{which} {_plain(grade)} {hu} with the surface pressure"
        near = [(sign * 8, -4), (sign * 8, 4), (sign * 8, 0), (0, -10), (0, 12), (-sign * 8, -4)]
        placer.place(text, (xs, y), near + _ring((16, 26, 36)), leader_from=14)
    tdh = r.get("total_dynamic_head")
    if jump is not None and jump + 1 < len(nodes):
        xj = x[jump + 1]
        yj = 0.5 * (egl[jump] + egl[jump + 1])
        text = "pump" + (f"\nTDH {_num(d(tdh, 'length'))} {hu}" if tdh else "")
        cands = [(8, 0), (-8, 0), (16, 10), (-16, 10)] + _ring((20, 32, 44))
        placer.place(text, (xj, yj), cands, leader_from=12)
    for pid, i0, i1 in spans:
        xm = 0.5 * (x[i0] + x[i1])
        ym = 0.5 * (egl[i0] + egl[i1])
        placer.place(pid, (xm, ym), [(0, 5), (0, -8)] + _ring((12, 20, 30)), leader_from=10)

    pump_text = f" after {pump_after}" if pump_after else ""
    title = (
        "Route profile at the design flow: energy grade line (EGL) and hydraulic grade line "
        "(HGL) from the source "
        f"surface to the destination surface, the pump{pump_text} adding TDH; friction is lost "
        "along each pipe and fitting losses are drawn as steps where they are taken"
    )
    return fig, title


# --------------------------------------------------------------------------
# 4. Head-loss breakdown


def _draw_loss_breakdown(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "total_dynamic_head")
    d = _Display(trace)
    hu = d.label("length")
    tdh = d(r["total_dynamic_head"], "length")

    # Rows of (label, [(value, part)]) top to bottom.
    rows: list[tuple[str, list[tuple[float, str]]]] = []
    if r.get("static_head") is not None:
        rows.append(("static head", [(d(r["static_head"], "length"), "static")]))
    if r.get("pressure_head") is not None:
        rows.append(("pressure head", [(d(r["pressure_head"], "length"), "pressure")]))
    outlet = r.get("outlet_velocity_head")
    if outlet is not None and outlet["value"] != 0:
        rows.append(("outlet velocity head", [(d(outlet, "length"), "outlet")]))
    for pid, p in _pipe_items(r):
        parts: list[tuple[float, str]] = []
        if p.get("friction_loss") is not None:
            parts.append((d(p["friction_loss"], "length"), "friction"))
        if p.get("fitting_loss") is not None:
            parts.append((d(p["fitting_loss"], "length"), "fittings"))
            if p.get("equipment_loss") is not None and p["equipment_loss"]["value"] != 0:
                parts.append((d(p["equipment_loss"], "length"), "equipment"))
        elif p.get("minor_loss") is not None:
            parts.append((d(p["minor_loss"], "length"), "minor"))
        side = p.get("side", "")
        rows.append((f"{pid} ({side})" if side else pid, parts))

    style = {
        "static": {"color": "#9a9a9a", "hatch": None},
        "pressure": {"color": "#c8c8c8", "hatch": None},
        "outlet": {"color": "#c8c8c8", "hatch": "...."},
        "friction": {"color": BLUE, "hatch": None},
        "fittings": {"color": "#e7c3a8", "hatch": "////"},
        "equipment": {"color": "#c8dbb8", "hatch": "xxxx"},
        "minor": {"color": "#e7c3a8", "hatch": "////"},
    }
    n = len(rows)
    fig = _new_figure(min(3.8, max(3.2, 1.2 + 0.24 * n)))
    ax = fig.add_subplot()
    ax.grid(True, axis="x")
    ax.tick_params(axis="y", length=0)
    ax.spines["left"].set_visible(False)

    from matplotlib.patches import Patch

    used: dict[str, Any] = {}
    ends: list[tuple[int, float, str]] = []
    bars: list[tuple[int, float, float, dict[str, Any]]] = []  # row, value, start, style
    for i, (_label, parts) in enumerate(rows):
        left_pos = 0.0
        left_neg = 0.0
        for value, part in parts:
            st = style[part]
            start = left_pos if value >= 0 else left_neg
            bars.append((i, value, start, st))
            if value >= 0:
                left_pos += value
            else:
                left_neg += value
            if part in ("friction", "fittings", "equipment", "minor") and part not in used:
                used[part] = Patch(
                    facecolor=st["color"],
                    hatch=st["hatch"],
                    edgecolor=INK if st["hatch"] else "none",
                    linewidth=0.4,
                    label={"minor": "minor losses"}.get(part, part),
                )
        if len(parts) == 1 or not parts:
            text = f"{_num(parts[0][0])} {hu}" if parts else "not given"
        else:
            text = ",  ".join(f"{name} {_num(v)} {hu}" for v, name in parts)
        end = left_pos if left_pos != 0 or left_neg == 0 else left_neg
        ends.append((i, end, text))
    if bars:  # one call for all the bars: matplotlib's cost is per call, not per bar
        at, values, starts, styles = zip(*bars, strict=True)
        ax.barh(
            at,
            values,
            left=starts,
            height=0.46,
            color=[st["color"] for st in styles],
            hatch=[st["hatch"] for st in styles],
            edgecolor=[INK if st["hatch"] else "none" for st in styles],
            linewidth=0.4,
            zorder=3,
        )

    heads = sum(1 for _, parts in rows if parts and parts[0][1] in ("static", "pressure", "outlet"))
    if 0 < heads < n:
        ax.axhline(heads - 0.5, color=LIGHT, lw=0.6, zorder=1)
    ax.set_yticks(range(n), [label for label, _ in rows])
    ax.set_ylim(n - 0.45, -0.55)
    ax.axvline(0, color="#555555", lw=0.6, zorder=4)
    ax.set_xlabel(f"Head [{hu}]")
    handles = [used[k] for k in ("friction", "fittings", "equipment", "minor") if k in used]
    _legend_above(ax, handles)
    ax.text(
        1.0,
        1.02,
        f"TDH = {_num(tdh)} {hu} (the sum of the bars)",
        transform=ax.transAxes,
        ha="right",
        va="bottom",
    )

    # Room for the value labels at the bar ends.
    lo = min(0.0, *(e for _, e, _ in ends))
    hi = max(0.0, *(e for _, e, _ in ends))
    hi = hi if hi > 0 else 1.0
    ax.set_xlim(lo * 1.05 if lo < 0 else 0.0, hi * 1.05)
    _freeze_layout(fig)
    renderer = fig._get_renderer()
    labels = []
    for i, end, text in ends:
        right = end >= 0
        t = ax.annotate(
            text,
            xy=(end, i),
            xytext=(4 if right else -4, 0),
            textcoords="offset points",
            ha="left" if right else "right",
            va="center",
            annotation_clip=False,
        )
        t.set_in_layout(False)
        labels.append((t, right))
    for _ in range(3):
        frame = ax.get_window_extent()
        x0, x1 = ax.get_xlim()
        need_hi, need_lo = x1, x0
        for t, right in labels:
            bb = t.get_window_extent(renderer)
            scale = (x1 - x0) / frame.width
            if right and bb.x1 > frame.x1 - 2:
                need_hi = max(need_hi, x1 + (bb.x1 - frame.x1 + 4) * scale)
            if not right and bb.x0 < frame.x0 + 2:
                need_lo = min(need_lo, x0 - (frame.x0 - bb.x0 + 4) * scale)
        if (need_hi, need_lo) == (x1, x0):
            break
        ax.set_xlim(need_lo, need_hi)

    title = (
        f"Head-loss breakdown at the design flow: static head, pressure head and each pipe's "
        f"friction, fitting and equipment losses; total TDH = {_num(tdh)} {hu}"
    )
    return fig, title


# --------------------------------------------------------------------------
# 5. Friction factor against Reynolds number

ROUGHNESS_LINES = (0.0, 1e-5, 5e-5, 1e-4, 2e-4, 5e-4, 1e-3, 2e-3, 5e-3, 1e-2, 2e-2, 5e-2)
RE_SPAN = (600.0, 1e8)
F_SPAN = (0.008, 0.1)


def _roughness_text(e: float) -> str:
    if e == 0:
        return "smooth"
    if e >= 1e-4:
        return f"{e:.6f}".rstrip("0")
    exponent = math.floor(math.log10(e))
    mantissa = e / 10**exponent
    superscript = str(exponent).translate(_SUPERSCRIPT)
    return f"{mantissa:.0f}×10{superscript}"


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _power_of_ten(v: float) -> str:
    """A decade tick as plain text, "10³", so the chart needs no mathtext font."""
    if v <= 0:
        return ""
    exponent = round(math.log10(v))
    return f"10{str(exponent).translate(_SUPERSCRIPT)}"


def _draw_friction_factor(trace: dict[str, Any]) -> tuple[Any, str]:
    from matplotlib.ticker import FixedLocator, FuncFormatter, LogLocator, NullFormatter

    from calcreport.physics import friction

    r = _results(trace, "pipes")

    # The system's pipes, in route order: (id, side, Re, f).
    points: list[tuple[str, str, float, float]] = []
    for pid, p in _pipe_items(r):
        if p.get("reynolds") is None or p.get("friction_factor") is None:
            continue
        side = "suction" if str(p.get("side", "")).startswith("suction") else "discharge"
        points.append(
            (pid, side, float(p["reynolds"]["value"]), float(p["friction_factor"]["value"]))
        )
    # The fixed span, widened (never narrowed) to show every pipe of this system.
    re_lo, re_hi = RE_SPAN
    f_lo, f_hi = F_SPAN
    usable = [(x, f) for _, _, x, f in points if x > 0 and f > 0]
    if usable:
        re_lo = min(re_lo, min(x for x, _ in usable) / 1.6)
        re_hi = max(re_hi, max(x for x, _ in usable) * 1.6)
        f_lo = min(f_lo, min(f for _, f in usable) / 1.15)
        f_hi = max(f_hi, max(f for _, f in usable) * 1.2)

    fig = _new_figure(3.8)
    ax = fig.add_subplot()
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlim(re_lo, re_hi)
    ax.set_ylim(f_lo, f_hi)
    ax.spines["top"].set_visible(True)
    ax.spines["right"].set_visible(True)
    ax.grid(True, which="major", color="#dedede", lw=0.5)
    ax.grid(True, which="minor", color="#efefef", lw=0.4)

    lam_limit = float(getattr(friction, "LAMINAR_LIMIT", 2000.0))
    ax.axvspan(lam_limit, 4000.0, color="#f0f0f0", lw=0, zorder=0)
    ax.text(
        math.sqrt(lam_limit * 4000.0),
        f_lo * 1.18,
        "transition",
        rotation=90,
        ha="center",
        va="bottom",
        color="#555555",
        fontsize=FONT_PT - 0.5,
    )
    re_lam = np.geomspace(re_lo, lam_limit, 40)
    (lam,) = ax.plot(re_lam, friction.laminar(re_lam), color=INK, lw=1.4, label="laminar, 64/Re")

    re = np.geomspace(lam_limit, re_hi, 160)
    smooth = None
    col = None
    # Right-end labels at least 8 pt apart (about 290 pt of plot height).
    per_decade = 290.0 / math.log10(f_hi / f_lo)
    last_label = math.inf
    for e in sorted(ROUGHNESS_LINES, reverse=True):
        f = friction.colebrook(re, np.full_like(re, e))
        (col,) = ax.plot(re, f, color="#7a8ea3", lw=0.8, zorder=2)
        if e == 0:
            smooth = (re, f)
        height = math.log10(f[-1]) * per_decade if f[-1] > 0 else -math.inf
        if f[-1] >= f_lo and last_label - height >= 8.0:
            last_label = height
            ax.annotate(
                _roughness_text(e),
                xy=(re_hi, float(f[-1])),
                xytext=(3, 0),
                textcoords="offset points",
                ha="left",
                va="center",
                fontsize=FONT_PT - 0.5,
                annotation_clip=False,
            )
    assert col is not None
    col.set_label("Colebrook, ε/D at right")
    ax.annotate(
        "ε/D",
        xy=(1.0, 1.0),
        xycoords="axes fraction",
        xytext=(3, 2),
        textcoords="offset points",
        ha="left",
        va="bottom",
        fontsize=FONT_PT - 0.5,
    )

    handles: list[Any] = [lam, col]
    for side, mk, face in (("suction", "o", "white"), ("discharge", "s", RUST)):
        mine = [(x, f) for _, s_, x, f in points if s_ == side]
        if mine:
            (pts,) = ax.plot(
                *zip(*mine, strict=True), ls="none", marker=mk, ms=5.5, mfc=face, mec=INK,
                mew=0.8, zorder=6, label=f"{side} pipe",
            )  # fmt: skip
            handles.append(pts)

    ax.xaxis.set_major_locator(LogLocator(base=10, numticks=12))
    ax.xaxis.set_minor_locator(LogLocator(base=10, subs=(2, 3, 4, 5, 6, 7, 8, 9), numticks=12))
    ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: _power_of_ten(v)))
    ax.xaxis.set_minor_formatter(NullFormatter())
    if math.log10(f_hi / f_lo) <= 1.3:
        y_ticks = [0.008, 0.01, 0.015, 0.02, 0.025, 0.03, 0.04, 0.05, 0.06, 0.08, 0.1]
        y_minor = [0.009, 0.035, 0.045, 0.07, 0.09]
    else:
        y_ticks = [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10]
        y_minor = [k * 10.0**n for n in range(-3, 1) for k in (3, 4, 6, 7, 8, 9)]
        y_minor += [0.015, 0.025, 0.15, 0.25]
    ax.yaxis.set_major_locator(FixedLocator(y_ticks))
    ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
    ax.yaxis.set_minor_locator(FixedLocator(y_minor))
    ax.yaxis.set_minor_formatter(NullFormatter())
    ax.set_xlabel("Reynolds number Re [–]")
    ax.set_ylabel("Darcy friction factor f [–]")
    _legend_above(ax, handles, reserve=40.0)

    placer = _Placer(fig, ax)
    placer.add_lines([lam, *handles[2:]])  # the points; labels may cross the background lines
    if smooth is not None:
        re_s, f_s = smooth
        k = int(np.argmin(np.abs(f_s - f_lo * 1.28)))
        ax.annotate(
            "smooth",
            xy=(re_s[k], f_s[k]),
            xytext=(-2, -3),
            textcoords="offset points",
            ha="right",
            va="top",
            fontsize=FONT_PT - 0.5,
        ).set_in_layout(False)

    # Pipes whose markers overlap share one label, so no label is ambiguous.
    groups = _clusters(ax, [(x, f) for _, _, x, f in points], 6.0)
    anchors = []
    for members in groups:
        ids = [points[i][0] for i in members]
        lines = [", ".join(ids[k : k + 5]) for k in range(0, len(ids), 5)]
        x = math.exp(sum(math.log(points[i][2]) for i in members) / len(members))
        f = math.exp(sum(math.log(points[i][3]) for i in members) / len(members))
        anchors.append(("\n".join(lines), x, f))
    for text, x, f in anchors:
        placer.place(
            text,
            (x, f),
            _ring((7, 12, 20, 28, 38)),
            rivals=[(x2, f2) for t2, x2, f2 in anchors if t2 != text],
            leader_from=11,
            bbox={"boxstyle": "square,pad=0.15", "fc": "white", "ec": "none", "alpha": 0.85},
        )

    title = (
        "Darcy friction factor against Reynolds number: laminar line (Re < 2000), "
        "Colebrook lines of constant relative roughness ε/D, and this system's pipes"
    )
    return fig, title


# --------------------------------------------------------------------------
# 6. System sketch


def _draw_sketch(trace: dict[str, Any]) -> tuple[Any, str]:
    from matplotlib.patches import Rectangle

    r = _results(trace)
    d = _Display(trace)
    hu = d.label("length")
    pipes = _pipe_items(r)
    nodes = (r.get("profile") or {}).get("nodes") or []

    def elev(key: str) -> float | None:
        q = _given(trace, key)
        return d(q, "length") if q else None

    def node_elev(i: int) -> float | None:
        if nodes and nodes[i].get("elevation") is not None:
            unit = (r.get("profile") or {}).get("unit", "m")
            return d.raw(nodes[i]["elevation"], unit, "length")
        return None

    level_s = elev("source.level")
    level_s = level_s if level_s is not None else node_elev(0)
    level_d = elev("destination.level")
    level_d = level_d if level_d is not None else node_elev(-1)
    if level_s is None or level_d is None:
        raise ValueError(
            "The trace gives neither the vessel levels (given) nor the profile's surface "
            "elevations, which the sketch draws."
        )
    datum = elev("pump.elevation")
    pump_y = datum if datum is not None else min(level_s, level_d)
    free_outlet = elev("destination.outlet_elevation")

    suction = [(pid, p) for pid, p in pipes if str(p.get("side", "")).startswith("suction")]
    discharge = [(pid, p) for pid, p in pipes if not str(p.get("side", "")).startswith("suction")]

    def pipe_elev(p: dict[str, Any], key: str) -> float | None:
        q = p.get(key)
        return d(q, "length") if isinstance(q, dict) else None

    known = [level_s, level_d, pump_y]
    for _, p in pipes:
        known += [v for v in (pipe_elev(p, "elevation_start"), pipe_elev(p, "elevation_end")) if v]
    for key in ("source.level_low", "source.level_high", "destination.level_low",
                "destination.level_high"):  # fmt: skip
        v = elev(key)
        if v is not None:
            known.append(v)
    if free_outlet is not None:
        known.append(free_outlet)
    lo, hi = min(known), max(known)
    min_span = d.raw(4.0, "m", "length")
    span = max(hi - lo, min_span)
    tank_h = 0.28 * span

    # Horizontal layout in axes units (0..1); the vertical axis is elevation.
    src_x0, src_x1 = 0.05, 0.16
    dst_x0, dst_x1 = 0.84, 0.95
    n_s, n_d = len(suction), len(discharge)
    width = (dst_x0 - src_x1) / max(n_s + n_d, 1)
    pump_x = src_x1 + (n_s * width if n_s else 0.06)
    if n_s == 0:
        width = (dst_x0 - pump_x) / max(n_d, 1)
        d_width = width
    else:
        d_width = (dst_x0 - pump_x) / max(n_d, 1)

    # Source vessel.
    lows = [v for v in (elev("source.level_low"),) if v is not None]
    lift = pump_y >= level_s
    src_bottom = level_s - 0.7 * tank_h
    if not lift:
        src_bottom = min(src_bottom, max(pump_y - 0.12 * tank_h, level_s - 1.6 * tank_h))
    if lows:
        src_bottom = min(src_bottom, min(lows) - 0.12 * tank_h)
    src_top = level_s + 0.3 * tank_h
    if elev("source.level_high") is not None:
        src_top = max(src_top, elev("source.level_high") + 0.15 * tank_h)  # type: ignore[operator]

    # Destination vessel.
    first_end = pipe_elev(discharge[-1][1], "elevation_end") if discharge else None
    dst_bottom = level_d - 0.7 * tank_h
    dst_top = level_d + 0.3 * tank_h
    if free_outlet is not None:
        inlet_y = free_outlet
        dst_top = max(dst_top, free_outlet + 0.35 * tank_h)
        dst_bottom = min(dst_bottom, level_d - 0.7 * tank_h)
    elif first_end is not None:
        inlet_y = first_end
        dst_bottom = min(dst_bottom, first_end - 0.12 * tank_h)
    else:
        inlet_y = dst_bottom + 0.18 * tank_h
    if elev("destination.level_high") is not None:
        dst_top = max(dst_top, elev("destination.level_high") + 0.15 * tank_h)  # type: ignore[operator]
    if elev("destination.level_low") is not None:
        dst_bottom = min(dst_bottom, elev("destination.level_low") - 0.12 * tank_h)  # type: ignore[operator]

    # Route: joint elevations, interpolated between known points by pipe index.
    def route(
        items: list[tuple[str, dict[str, Any]]], y_start: float, y_end: float
    ) -> list[tuple[float, float]]:
        n = len(items)
        joints = np.full(n + 1, np.nan)
        joints[0], joints[-1] = y_start, y_end
        for i, (_, p) in enumerate(items):
            s, e = pipe_elev(p, "elevation_start"), pipe_elev(p, "elevation_end")
            if s is not None and i > 0:
                joints[i] = s
            if e is not None and i < n - 1:
                joints[i + 1] = e
        idx = np.arange(n + 1)
        ok = np.isfinite(joints)
        joints = np.interp(idx, idx[ok], joints[ok])
        ends = []
        for i, (_, p) in enumerate(items):
            s, e = pipe_elev(p, "elevation_start"), pipe_elev(p, "elevation_end")
            ends.append((s if s is not None else joints[i], e if e is not None else joints[i + 1]))
        return ends

    src_out_y = pump_y if lift else max(pump_y, src_bottom + 0.12 * tank_h)
    s_ends = route(suction, src_out_y, pump_y)
    d_ends = route(discharge, pump_y, inlet_y)

    # Vertical limits and figure.
    all_y = [src_bottom, src_top, dst_bottom, dst_top, pump_y]
    all_y += [v for e in s_ends + d_ends for v in e]
    y_lo, y_hi = min(all_y), max(all_y)
    y_span = max(y_hi - y_lo, min_span)
    fig = _new_figure(3.6)
    ax = fig.add_subplot()
    ax.set_xlim(0, 1)
    ax.set_ylim(y_lo - 0.15 * y_span, y_hi + 0.12 * y_span)
    ax.spines["bottom"].set_visible(False)
    ax.set_xticks([])
    ax.set_ylabel(f"Elevation [{hu}]")
    ax.grid(True, axis="y", color="#efefef")

    pipe_kw = {"color": INK, "lw": 1.8, "solid_capstyle": "butt", "zorder": 3}
    joint_kw = {"ls": "none", "marker": "o", "ms": 3.0, "mfc": "white", "mec": INK, "mew": 0.8}

    def vessel(x0: float, x1: float, bottom: float, top: float, level: float, closed: bool) -> None:
        ax.add_patch(
            Rectangle((x0, bottom), x1 - x0, level - bottom, facecolor=LIQUID, lw=0, zorder=1)
        )
        xs = [x0, x0, x1, x1] + ([x0] if closed else [])
        ys = [top, bottom, bottom, top] + ([top] if closed else [])
        ax.plot(xs, ys, color=INK, lw=1.2, zorder=2, solid_joinstyle="miter")
        ax.plot([x0, x1], [level, level], color=BLUE, lw=0.8, zorder=2)

    p_src = _given(trace, "source.pressure")
    p_dst = _given(trace, "destination.pressure")
    vessel(src_x0, src_x1, src_bottom, src_top, level_s, bool(p_src and p_src["value"] != 0))
    vessel(dst_x0, dst_x1, dst_bottom, dst_top, level_d, bool(p_dst and p_dst["value"] != 0))
    for key, (x0, x1) in (
        ("source.level_low", (src_x0, src_x1)),
        ("source.level_high", (src_x0, src_x1)),
        ("destination.level_low", (dst_x0, dst_x1)),
        ("destination.level_high", (dst_x0, dst_x1)),
    ):
        v = elev(key)
        if v is not None:
            ax.plot([x0 + 0.01, x1 - 0.01], [v, v], color=BLUE, lw=0.6, ls=(0, (2, 1.5)), zorder=2)

    # Pipes, suction then discharge.
    dip_x = src_x0 + 0.68 * (src_x1 - src_x0)  # a suction lift draws from the liquid
    if not suction:  # the pump sits at the source vessel's nozzle
        nozzle = [(src_x1, src_out_y), (pump_x, pump_y)]
        if lift:
            nozzle = [(dip_x, src_bottom + 0.2 * tank_h), (dip_x, pump_y), (pump_x, pump_y)]
        ax.plot(*zip(*nozzle, strict=True), **pipe_kw)
    y_scale = 0.5 / max(y_hi - y_lo, min_span)  # axes units, about the chart's aspect

    def main_leg(pts: list[tuple[float, float]]) -> tuple[tuple[float, float], ...]:
        def size(g: tuple[tuple[float, float], ...]) -> float:
            return math.hypot(g[1][0] - g[0][0], (g[1][1] - g[0][1]) * y_scale)

        return max(itertools.pairwise(pts), key=size)

    segments: list[tuple[str, dict[str, Any], list[tuple[float, float]]]] = []
    x = src_x1
    for i, ((pid, p), (ys, ye)) in enumerate(zip(suction, s_ends, strict=True)):
        pts = [(x, ys), (x + width, ye)]
        if i == 0 and lift:
            pts = [(dip_x, src_bottom + 0.2 * tank_h), (dip_x, ys), (x + width, ye)]
        segments.append((pid, p, pts))
        x += width
    x = pump_x
    prev_y = pump_y
    for (pid, p), (ys, ye) in zip(discharge, d_ends, strict=True):
        pts = [(x, ys), (x + d_width, ye)]
        if abs(ys - prev_y) > 1e-9:
            pts.insert(0, (x, prev_y))
        prev_y = ye
        segments.append((pid, p, pts))
        x += d_width
    if free_outlet is not None and segments:
        pid, p, pts = segments[-1]
        pts.append((dst_x0 + 0.3 * (dst_x1 - dst_x0), pts[-1][1]))
    elif segments and discharge:
        pid, p, pts = segments[-1]
        if abs(pts[-1][1] - inlet_y) > 1e-9:
            pts.append((dst_x0, inlet_y))
    for _pid, _p, pts in segments:
        xs, ys = zip(*pts, strict=True)
        ax.plot(xs, ys, **pipe_kw)
        (x0, y0), (x1, y1) = main_leg(pts)
        t0, t1 = 0.74, 0.78
        ax.annotate(
            "",
            xy=(x0 + t1 * (x1 - x0), y0 + t1 * (y1 - y0)),
            xytext=(x0 + t0 * (x1 - x0), y0 + t0 * (y1 - y0)),
            arrowprops={
                "arrowstyle": "-|>,head_length=0.5,head_width=0.22",
                "color": INK,
                "lw": 0.8,
                "shrinkA": 0,
                "shrinkB": 0,
            },
            zorder=4,
        ).set_in_layout(False)
    joints = [seg[2][-1] for seg in segments[:-1]]
    joints = [j for j in joints if abs(j[0] - pump_x) > 1e-9]
    if joints:
        ax.plot(*zip(*joints, strict=True), zorder=4, **joint_kw)
    if free_outlet is not None and segments:
        end = segments[-1][2][-1]
        ax.plot([end[0], end[0]], [end[1], level_d], color=BLUE, lw=0.8, ls=(0, (1.5, 1.5)))

    # Pump symbol: a circle with a triangle pointing downstream.
    ax.plot([pump_x], [pump_y], marker="o", ms=15, mfc="white", mec=INK, mew=1.2, zorder=5)
    ax.plot([pump_x], [pump_y], marker=">", ms=6, mfc=INK, mec=INK, zorder=6)

    # Surface symbols and the reference lines to the elevation scale.
    marker = _surface_marker()
    cs, cd = 0.5 * (src_x0 + src_x1), 0.5 * (dst_x0 + dst_x1)
    if lift:
        cs = src_x0 + 0.32 * (src_x1 - src_x0)
    ax.plot([cs, cd], [level_s, level_d], ls="none", marker=marker, ms=8, mfc="white",
            mec=INK, mew=0.8, zorder=6)  # fmt: skip
    ref = {"color": GREY, "lw": 0.5, "ls": (0, (1, 2)), "zorder": 0}
    ax.plot([0, src_x0], [level_s, level_s], **ref)
    ax.plot([0, pump_x - 0.015], [pump_y, pump_y], **ref)
    ax.plot([0, dst_x0], [level_d, level_d], **ref)

    placer = _Placer(fig, ax)
    placer.add_lines()
    pump_box = ax.transData.transform([(pump_x, pump_y)])[0]
    placer.boxes.append((pump_box[0] - 9, pump_box[1] - 9, pump_box[0] + 9, pump_box[1] + 9))

    def pressure_text(q: dict[str, Any] | None) -> str:
        if not q or q["value"] == 0:
            return ""
        unit = d.unit("pressure")
        gauge = "psig" if unit == "psi" else f"{pretty_unit(unit)}(g)"
        return f"\n{_num(d(q, 'pressure'))} {gauge}"

    for level, top, xc in ((level_s, src_top, cs), (level_d, dst_top, cd)):
        placer.place(f"level {_plain(level)} {hu}", (xc, top), [(0, 3), (0, 10)], leader_from=99)
    placer.place(
        "source" + pressure_text(p_src),
        (cs, src_bottom),
        [(0, -4), (0, -12)],
        leader_from=99,
    )
    placer.place(
        "destination" + pressure_text(p_dst),
        (cd, dst_bottom),
        [(0, -4), (0, -12)],
        leader_from=99,
    )
    datum_text = f"pump\ndatum {_plain(pump_y)} {hu}" if datum is not None else "pump"
    placer.place(datum_text, (pump_x, pump_y), [(0, -11), (0, 11), (10, -10), (-10, -10),
                 (10, 10), (-10, 10)], leader_from=99)  # fmt: skip

    lu, du = d.label("length"), d.label("diameter")
    for pid, p, pts in segments:
        size = []
        if p.get("length") is not None:
            size.append(f"L {_plain(d(p['length'], 'length'))} {lu}")
        if p.get("inner_diameter") is not None:
            size.append(f"ID {_plain(d(p['inner_diameter'], 'diameter'))} {du}")
        if len(pid) > 6:  # a long id gets a line of its own
            text = "\n".join([pid, ", ".join(size)] if size else [pid])
        else:
            text = "\n".join([f"{pid}  {size[0]}", *size[1:]] if size else [pid])
        (x0, y0), (x1, y1) = main_leg(pts)
        xm, ym = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
        a, b = ax.transData.transform([(x0, y0), (x1, y1)])
        dx, dy = b - a
        length = math.hypot(dx, dy) or 1.0
        nx, ny = -dy / length, dx / length  # normal, to the upper left of the flow
        cands = []
        for dist in (5, 10, 18, 28, 40):
            cands.append((-nx * dist, -ny * dist))
            cands.append((nx * dist, ny * dist))
        cands += _ring((24, 36, 50))
        placer.place(text, (xm, ym), cands, leader_from=16, multialignment="center")

    title = (
        "System sketch from the input: vessels, pipes in flow order with length L and inner "
        f"diameter ID, pump; liquid levels (dashed: low and high levels where given) and the "
        f"pump datum to the elevation scale at the left in {hu}; pipe runs not to horizontal "
        "scale, vessel outlines schematic"
    )
    return fig, title


# --------------------------------------------------------------------------
# 7. Pressure along the route


def _draw_route_pressure(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "route", "profile")
    d = _Display(trace)
    route = r["route"]
    nodes = [n for n in route["nodes"] if "min_grade" in n]
    hu = d.label("length")

    def series(key: str) -> Any:
        return np.array([d(n[key], "length") if key in n else np.nan for n in nodes])

    x = series("distance")
    centre = series("elevation")
    fig = _new_figure(3.8)
    ax = fig.add_subplot()
    _style_axes(ax)
    handles = []
    (pipe,) = ax.plot(x, centre, color="#555555", lw=2.4, zorder=2, label="pipe centreline")
    handles.append(pipe)
    shown = [centre, series("max_grade")]
    grade_cases = ["C1"]
    low_case = route.get("min_pressure_case")
    if low_case and low_case != "C1":
        grade_cases.append(low_case)
    styles = {0: (BLUE, "-", 1.3), 1: (BLUE, (0, (5, 2)), 1.0)}
    for i, cid in enumerate(grade_cases):
        states = {**r.get("cases", {}), **r.get("profile_states", {})}
        profile = r["profile"] if cid == "C1" else states[cid]["profile"]
        pts = [n for n in profile["nodes"] if "pressure_head" in n]
        xs = np.array([d.raw(n["distance"], "m", "length") for n in pts])
        hs = np.array([d.raw(n["hgl"], "m", "length") for n in pts])
        color, ls, lw = styles[i]
        label = "HGL, design case C1" if cid == "C1" else f"HGL, state {cid} (lowest pressure)"
        (line,) = ax.plot(xs, hs, color=color, ls=ls, lw=lw, label=label, zorder=4)
        handles.append(line)
        shown.append(hs)
    # Drawn under the HGL: without a pump curve the highest grade line is the highest HGL.
    (top,) = ax.plot(x, series("max_grade"), color=RUST, lw=2.0, label="highest grade line")
    handles.append(top)
    rating = series("rating_grade")
    if np.any(np.isfinite(rating)):
        (rated,) = ax.plot(
            x, rating, color="#8a1c1c", lw=1.0, ls=(0, (1, 1.2)), label="rating, as a grade line"
        )
        handles.append(rated)
        shown.append(rating[np.isfinite(rating)])
    vapour = series("vapour_grade")
    floor = float(np.nanmin(vapour)) if np.any(np.isfinite(vapour)) else float(np.nanmin(centre))
    if np.any(np.isfinite(vapour)):
        (vap,) = ax.plot(x, vapour, color=GREY, lw=0.8, ls=(0, (3, 2)), label="vapour pressure")
        handles.append(vap)
    down = series("downsurge_grade")
    if np.any(np.isfinite(down)):
        parted = any(n.get("column_separation") for n in nodes)
        label = "downsurge, pump trip" + (" (column parts)" if parted else "")
        (dl,) = ax.plot(x, down, color=BLUE, lw=1.0, ls=":", label=label)
        handles.append(dl)
    highs = route.get("high_points", [])
    if highs:
        (hp,) = ax.plot(
            [d(h["distance"], "length") for h in highs],
            [d(h["elevation"], "length") for h in highs],
            ls="none", marker="^", ms=7, mfc="white", mec=INK, mew=0.9, zorder=6,
            label="high point (air valve)",
        )  # fmt: skip
        handles.append(hp)
    lo = min(floor, float(np.nanmin(centre)))
    hi = max(float(np.nanmax(y)) for y in shown)
    span = max(hi - lo, 1.0)
    length = max(float(np.nanmax(x) - np.nanmin(x)), 1e-9)
    ax.set_xlim(float(np.nanmin(x)) - 0.02 * length, float(np.nanmax(x)) + 0.02 * length)
    ax.set_ylim(lo - 0.08 * span, hi + 0.08 * span)
    ax.set_xlabel(f"Distance along route [{hu}]")
    ax.set_ylabel(f"Elevation [{hu}]")
    _legend_above(ax, handles)
    lines = ["the hydraulic grade line of the design case"]
    if len(grade_cases) > 1:
        lines[0] = "the hydraulic grade lines of the design case and of the lowest-pressure case"
    lines.append(
        "the highest grade line (the pump's highest head against a closed line, or the "
        "screened upsurge)"
        if any(n["basis"] != "operating" for n in nodes)
        else "the highest grade line (the highest operating HGL: no pump curve is given)"
    )
    if np.any(np.isfinite(rating)):
        lines.append("the ratings as grade lines")
    if np.any(np.isfinite(down)):
        lines.append("the downsurge of a pump trip")
    if np.any(np.isfinite(vapour)):
        lines.append("the vapour-pressure line")
    title = (
        f"Pressure along the route: the pipe centreline against {', '.join(lines)}; the "
        "pressure head at a point is the height of a grade line above the pipe"
    )
    return fig, title


# --------------------------------------------------------------------------
# 8. Energy over the duty profile


def _draw_energy(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "energy")
    d = _Display(trace)
    rows = r["energy"]["profile"]
    labels = [f"{row['point']}\n{_num(d(row['flow'], 'flow'))} {d.label('flow')}" for row in rows]
    power = np.array([d(row["electrical_power"], "power") for row in rows])
    hours = [row["hours"] for row in rows]
    fig = _new_figure(3.2)
    ax = fig.add_subplot()
    _style_axes(ax, grid="y")
    pos = np.arange(len(rows))
    bars = ax.bar(pos, power, width=0.55, color=BLUE, label=f"input power [{d.label('power')}]")
    ax.set_xticks(pos, labels)
    ax.set_ylabel(f"Input power [{d.label('power')}]")
    ax.set_ylim(0, float(power.max()) * 1.25)
    for bar, h in zip(bars, hours, strict=True):  # inside the bar, clear of the cost line
        ax.annotate(
            f"{h:,.0f} h/yr", (bar.get_x() + bar.get_width() / 2, bar.get_height()),
            xytext=(0, -4), textcoords="offset points", ha="center", va="top", color="white",
        )  # fmt: skip
    handles = [bars]
    costs = [row.get("annual_cost") for row in rows]
    if all(costs):
        currency = str(costs[0]["unit"])  # type: ignore[index]
        twin = ax.twinx()
        values = [float(c["value"]) for c in costs]  # type: ignore[index]
        (line,) = twin.plot(
            pos, values, color=RUST, marker="o", ms=5, lw=1.2,
            label=f"running cost a year [{currency}]",
        )  # fmt: skip
        twin.set_ylim(0, max(values) * 1.25)
        twin.set_ylabel(f"Running cost a year [{currency}]")
        handles.append(line)
    _legend_above(ax, handles)
    control = str(r["energy"].get("control", "")).replace("_", "-")
    title = (
        f"Duty profile ({control} control): electrical input power at each point, with the "
        "hours a year spent there, and each point's share of the annual energy cost"
    )
    return fig, title
