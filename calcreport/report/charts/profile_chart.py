"""The route-profile chart: energy and hydraulic grade lines from the source surface to the
destination surface.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    BLUE,
    GREY,
    INK,
    LIGHT,
    RUST,
    _Display,
    _given,
    _labelled,
    _legend_above,
    _new_figure,
    _num,
    _pipe_items,
    _plain,
    _results,
    _style_axes,
)
from calcreport.report.charts.placement import _Placer, _ring

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
    # The joints between pipes, those of the labelled pipes on a long route (hundreds of
    # lines would grey the chart over).
    for _pid, _i0, i1 in _labelled(spans[:-1]):
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
    for pid, i0, i1 in _labelled(spans):
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
