"""The system-curve chart: system curves of every case against the pump curve, the operating
and duty points, the preferred and allowable regions.
"""

from __future__ import annotations

import itertools
from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    BLUE,
    GREY,
    INK,
    LIGHT,
    RUST,
    _arrangement,
    _Display,
    _legend_above,
    _new_figure,
    _num,
    _results,
    _style_axes,
)
from calcreport.report.charts.npsh_chart import _operating_marker
from calcreport.report.charts.placement import _Placer
from calcreport.trace import DESIGN_CASE

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
    dashes = [(0, (5, 2)), (0, (1, 1.5)), (0, (6, 2, 1, 2))]
    styles = itertools.cycle([(GREY, dash) for dash in dashes])
    titles = {c.get("id"): c.get("title", c.get("id")) for c in trace.get("cases", []) or []}
    shown_cases: list[str] = []
    other_lines = []
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
        other_lines.append(line)

    # Pump curve and operating point, when the trace has them. With several pumps running,
    # the operating point lies on their combined curve, drawn as the pump curve; one pump's
    # curve, lighter, lies within its flows and heads.
    pump = r.get("pump_curve")
    combined = one = None
    if isinstance(pump, dict) and "flow" in pump and "head" in pump:
        combined = pump.get("combined")
        if combined:
            (one,) = ax.plot(
                d(pump["flow"], "flow"),
                d(pump["head"], "length"),
                color=GREY,
                lw=0.8,
                ls=_PUMP_DASH,
                label="one pump",
            )
            _curve_end(ax, one, GREY)
        main = combined or pump
        (line,) = ax.plot(
            d(main["flow"], "flow"),
            d(main["head"], "length"),
            color=INK,
            lw=1.3,
            ls=_PUMP_DASH,
            label=_arrangement(combined) if combined else "pump curve",
        )
        # The curve is never extended: its last point is a limit of the pump data.
        end = _curve_end(ax, line, INK)
        handles += [h for h in (line, one, end) if h is not None]
        ymax = max(ymax, float(np.max(line.get_ydata())))
        xmax = max(xmax, float(np.max(line.get_xdata())))

    # A case's curve runs on to the end of its own pumps' curve (more pumps running, further
    # out): the heads that count are those within the flows shown.
    for line in other_lines:
        x, y = line.get_xdata(), line.get_ydata()
        ymax = max(ymax, float(np.max(y[x <= xmax * 1.02], initial=ymax)))

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
            if cid != DESIGN_CASE and isinstance(c, dict) and "operating_point" in c
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
    region = r.get("operating_region")
    handles += _regions(ax, d, region and region.get("combined", region))

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
    if op_xy is not None and combined:
        title += (
            f", with the combined curve of the {_arrangement(combined)}, one pump's curve "
            "(grey) and the operating point"
        )
    elif op_xy is not None:
        title += ", with the pump curve and the operating point"
    if shown_cases:
        title += "; " + "; ".join(shown_cases)
    return fig, title


_PUMP_DASH = (0, (7, 2, 1.5, 2))  # a pump curve, dash-dot


def _curve_end(ax: Any, line: Any, color: str) -> Any:
    """The bar at the last point of a pump curve (the curve is never extended)."""
    (end,) = ax.plot(
        line.get_xdata()[-1:],
        line.get_ydata()[-1:],
        ls="none",
        marker="|",
        ms=11,
        mew=1.6,
        color=color,
        label="end of pump curve",
    )
    return end


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
