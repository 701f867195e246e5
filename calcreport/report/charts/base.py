"""Shared parts of the charts: colours and matplotlib settings, figure set-up and layout,
axes style and legends, the display of trace values in the report's units.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

import numpy as np

from calcreport.units import display_unit, fmt, pretty_unit, to_display

# --------------------------------------------------------------------------
# Appearance: one place for sizes, palette and matplotlib settings.

WIDTH_IN = 6.3  # fits the text width of A4 and Letter
FONT_PT = 8.0  # annotations and ticks
LABEL_PT = 8.5  # axis labels
MAX_HEIGHT_IN = 7.5  # the tallest chart that leaves its caption room on a page

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
    engine = fig.get_layout_engine()
    # No legend taller than its axes: a taller figure. An estimate first, so the layout has
    # room to run, then what the layout leaves short (the legend's gap above the axes grows
    # with them, so a second pass may be needed).
    _grow(fig, _legend_shortfall(fig, laid_out=False))
    engine.execute(fig)
    for _ in range(2):
        if not _grow(fig, _legend_shortfall(fig, laid_out=True)):
            break
        engine.execute(fig)
    fig.set_layout_engine("none")
    renderer = fig._get_renderer()
    with renderer._draw_disabled():
        for ax in fig.axes:
            legend = ax.get_legend()
            if legend is not None:
                legend.draw(renderer)
    _plain_glyphs(fig)  # the tick labels that the layout created


_DECORATIONS_PT = 45.0  # the height of a chart outside its axes and legend: ticks, label, pads


def _legend_shortfall(fig: Any, laid_out: bool) -> float:
    """The height [pt] the figure lacks for no legend to be taller than its axes: as laid
    out, or before the layout, estimated from the figure's height.

    The layout keeps the margins and shares out the rest of the height by the rows' height
    ratios, so an axes with a share s of it grows by s times the figure's growth.
    """
    renderer = fig._get_renderer()
    need = 0.0
    for ax in fig.axes:
        legend = ax.get_legend()
        if legend is None:
            continue
        spec = ax.get_subplotspec()
        grid = spec.get_gridspec()
        ratios = grid.get_height_ratios() or [1.0] * grid.nrows
        share = sum(ratios[i] for i in spec.rowspan) / sum(ratios)
        height = legend.get_window_extent(renderer).height
        room = ax.bbox.height if laid_out else (fig.bbox.height - height - _DECORATIONS_PT) * share
        if height > room:
            need = max(need, (height - room + 1.0) / share)
    return need


def _grow(fig: Any, points: float) -> bool:
    """Make the figure ``points`` taller, up to :data:`MAX_HEIGHT_IN`; whether it grew."""
    height = fig.get_figheight()
    if points <= 0.0 or height >= MAX_HEIGHT_IN:
        return False
    fig.set_figheight(min(height + points / 72.0, MAX_HEIGHT_IN))
    return True


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


def _arrangement(combined: dict[str, Any]) -> str:
    """How the pumps of a combined curve (``pump_curve.combined``) run: "2 pumps in parallel"."""
    return f"{combined['pumps']} pumps in {combined['arrangement']}"


def _given(trace: dict[str, Any], key: str) -> dict[str, Any] | None:
    value = trace.get("given", {}).get(key)
    return value if isinstance(value, dict) and "value" in value else None


def _pipe_items(results: dict[str, Any]) -> list[tuple[str, dict[str, Any]]]:
    pipes = results.get("pipes", {})
    return [(str(k), v) for k, v in pipes.items() if isinstance(v, dict)]


MAX_PIPE_LABELS = 16  # pipe labels a chart holds legibly


def _labelled(items: Sequence[Any], limit: int = MAX_PIPE_LABELS) -> list[Any]:
    """The items (pipes along a route) a chart labels: all of a short route; of a long
    one, evenly spaced items with the first and the last, ``limit`` at most (every label
    of a route of hundreds of pipes would be neither legible nor quick to place)."""
    n = len(items)
    if n <= limit:
        return list(items)
    picks = sorted({round(i * (n - 1) / (limit - 1)) for i in range(limit)})
    return [items[i] for i in picks]
