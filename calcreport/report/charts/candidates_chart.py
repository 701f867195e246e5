"""The candidates chart: every offered pump's curve (combined where several run) over the
design system curve, each with its operating point; the selected offer drawn strongest.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    BLUE,
    GREY,
    INK,
    RUST,
    _Display,
    _legend_above,
    _new_figure,
    _num,
    _results,
    _style_axes,
)
from calcreport.report.charts.placement import _Placer

_VERDICT = {"pass": "passes", "review": "passes, with reviews", "fail": "fails"}

# Line styles of the offers not selected, in rank order.
_DASHES = ((0, (5, 2)), (0, (1, 1.5)), (0, (6, 2, 1, 2)), (0, (3, 1, 1, 1, 1, 1)))


def _draw_candidates(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "study", "system_curve")
    d = _Display(trace)
    study = r["study"]
    qu, hu = d.label("flow"), d.label("length")
    fig = _new_figure(3.6)
    ax = fig.add_subplot()
    _style_axes(ax)
    curve = r["system_curve"]
    q = d(curve["flow"], "flow")
    (line,) = ax.plot(q, d.series(curve["head"], "length", len(q)), color=BLUE, lw=1.6)
    line.set_label("system curve, design case")
    handles = [line]
    xmax, ymax = float(np.max(q)), float(np.max(line.get_ydata()))
    points = []
    dashes = iter(_DASHES * 3)
    for offer in study["candidates"]:
        if "curve" not in offer:
            continue
        chosen = offer["id"] == study["selected"]
        flows = d(offer["curve"]["flow"], "flow")
        heads = d(offer["curve"]["head"], "length")
        style = {"color": INK, "lw": 1.5} if chosen else {"color": GREY, "lw": 1.0}
        (drawn,) = ax.plot(flows, heads, ls="-" if chosen else next(dashes), **style)
        drawn.set_label(
            f"{offer['id']}{' (selected)' if chosen else ''}: {_VERDICT[offer['status']]}"
        )
        handles.append(drawn)
        xmax = max(xmax, float(np.max(flows)))
        ymax = max(ymax, float(np.max(heads)))
        if "operating_point" in offer:
            xy = (
                d(offer["operating_point"]["flow"], "flow"),
                d(offer["operating_point"]["head"], "length"),
            )
            ax.plot(*xy, "o", ms=4.5 if chosen else 3.5, color=RUST if chosen else GREY, zorder=4)
            points.append((offer["id"], xy))
    ax.set_xlim(0, xmax * 1.02)
    ax.set_ylim(0, ymax * 1.12)
    ax.set_xlabel(f"Flow [{qu}]")
    ax.set_ylabel(f"Head [{hu}]")
    _legend_above(ax, handles)
    placer = _Placer(fig, ax)
    placer.add_lines()
    for ident, xy in points:
        placer.place(
            f"{ident}: {_num(xy[0])} {qu}, {_num(xy[1])} {hu}",
            xy,
            [(10, -14), (-12, 12), (12, 10), (-14, -16), (16, -4)],
            leader_from=4,
        )
    title = (
        f"The offered pumps' curves over the design system curve, each at its operating point; "
        f"offer {study['selected']} selected (black)"
    )
    return fig, title
