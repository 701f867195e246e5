"""The route-pressure chart: the pipe centreline against the grade lines, the highest grade
line, ratings and high points.
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
    _results,
    _style_axes,
)
from calcreport.trace import DESIGN_CASE

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
    grade_cases = [DESIGN_CASE]
    low_case = route.get("min_pressure_case")
    if low_case and low_case != DESIGN_CASE:
        grade_cases.append(low_case)
    styles = {0: (BLUE, "-", 1.3), 1: (BLUE, (0, (5, 2)), 1.0)}
    for i, cid in enumerate(grade_cases):
        states = {**r.get("cases", {}), **r.get("profile_states", {})}
        profile = r["profile"] if cid == DESIGN_CASE else states[cid]["profile"]
        pts = [n for n in profile["nodes"] if "pressure_head" in n]
        xs = np.array([d.raw(n["distance"], "m", "length") for n in pts])
        hs = np.array([d.raw(n["hgl"], "m", "length") for n in pts])
        color, ls, lw = styles[i]
        label = (
            f"HGL, design case {cid}"
            if cid == DESIGN_CASE
            else f"HGL, state {cid} (lowest pressure)"
        )
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
