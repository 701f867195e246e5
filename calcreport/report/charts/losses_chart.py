"""The head-loss breakdown: the parts of the total dynamic head as bars."""

from __future__ import annotations

from typing import Any

from calcreport.report.charts.base import (
    BLUE,
    INK,
    LIGHT,
    MAX_PIPE_LABELS,
    _Display,
    _freeze_layout,
    _legend_above,
    _new_figure,
    _num,
    _pipe_items,
    _results,
)

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
    pipes = _pipe_items(r)
    whose = "each pipe's friction, fitting and equipment losses"
    if len(pipes) > MAX_PIPE_LABELS:  # a bar a pipe would not be legible: the line's totals
        whose = f"the friction and minor losses of the {len(pipes)} pipes together"
        count = f"{len(pipes)} pipes"
        rows.append((f"friction, {count}", [(d(r["friction_loss"], "length"), "friction")]))
        rows.append((f"minor losses, {count}", [(d(r["minor_loss"], "length"), "minor")]))
        pipes = []
    for pid, p in pipes:
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
        f"Head-loss breakdown at the design flow: static head, pressure head and {whose}; "
        f"total TDH = {_num(tdh)} {hu}"
    )
    return fig, title
