"""The tornado chart: how much each stated uncertainty, tried low and high, moves the design's
TDH, operating flow, NPSH margin and shaft power, widest bar first.
"""

from __future__ import annotations

from typing import Any

from calcreport.report.charts.base import BLUE, INK, RUST, _new_figure, _results, _style_axes

_PANELS = (
    ("total_dynamic_head", "TDH"),
    ("operating_flow", "Operating flow"),
    ("npsh_margin", "NPSH margin"),
    ("shaft_power", "Shaft power"),
)


def _draw_tornado(trace: dict[str, Any]) -> tuple[Any, str]:
    rows = _results(trace, "study")["study"]["sensitivity"]
    panels = [(k, t) for k, t in _PANELS if any(k in row["effects"] for row in rows)]
    bands = (len(panels) + 1) // 2  # panels two abreast
    fig = _new_figure(min(5.0, 1.3 + 0.45 * len(rows) * bands))
    grid = fig.subplots((len(panels) + 1) // 2, 2, squeeze=False)
    for ax in grid.flat[len(panels) :]:
        ax.set_visible(False)

    def spread(row: dict[str, Any]) -> float:
        """The widest change an uncertainty makes to any result: the bars' common order."""
        return max(abs(e["high_change"] - e["low_change"]) for e in row["effects"].values())

    shown = sorted(rows, key=spread)  # the widest at the top, in every panel alike
    for n, (ax, (key, title)) in enumerate(zip(grid.flat, panels, strict=False)):
        _style_axes(ax, grid="x")
        for y, row in enumerate(shown):
            effect = row["effects"].get(key)
            if effect is not None:
                ax.barh(y, 100.0 * effect["low_change"], color=BLUE, height=0.6)
                ax.barh(y, 100.0 * effect["high_change"], color=RUST, height=0.6)
        # The uncertainties named once a row of panels, at its left.
        ax.set_yticks(range(len(shown)), [r["label"] if n % 2 == 0 else "" for r in shown])
        ax.axvline(0.0, color=INK, lw=0.8)
        span = max([abs(100.0 * row["effects"][key][side]) for row in shown
                    if key in row["effects"]
                    for side in ("low_change", "high_change")] + [0.5])  # fmt: skip
        ax.set_xlim(-1.15 * span, 1.15 * span)
        ax.set_title(title, fontsize=8.5, loc="left")
        ax.set_xlabel("change from the design [%]")
    from matplotlib.patches import Patch

    fig.legend(
        handles=[Patch(color=BLUE, label="low setting"), Patch(color=RUST, label="high setting")],
        loc="outside upper left",
        ncols=2,
        frameon=False,
    )
    title = (
        "Sensitivity of the design: each stated uncertainty at its low and high setting, and "
        "the change it makes to TDH, operating flow, NPSH margin and shaft power"
    )
    return fig, title
