"""The NPSH chart: NPSH available against NPSH required over flow, the margin, and the
efficiency panel.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    BLUE,
    INK,
    RUST,
    _arrangement,
    _Display,
    _given,
    _legend_above,
    _new_figure,
    _num,
    _results,
    _style_axes,
)
from calcreport.report.charts.placement import _Placer

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
    # NPSH is each pump's, the flow the system's: with several pumps running, each pump's
    # values are drawn at the total flow of the running pumps (pump_curve.combined), where
    # the NPSH available and the operating point (its total flow) stand.
    combined = pump.get("combined")
    region = r.get("operating_region")
    region = region and region.get("combined", region)
    which = ""
    if combined:
        which = " of each pump" if combined["arrangement"] == "parallel" else " of the first pump"

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
        pq = d((combined or pump)["flow"], "flow")
        (line,) = ax.plot(
            pq,
            d(pump["npsh_required"], "length"),
            color=RUST,
            lw=1.3,
            ls=(0, (5, 2)),
            marker="s",
            ms=3.5,
            mfc="white",
            label=f"NPSH required{which} (pump data)",
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
        handles += _efficiency_panel(top, d, pump, op, region, q_duty)
    ax.set_xlim(0, xmax * 1.02)
    ax.set_ylim(0, ymax * 1.3)
    if combined and combined["arrangement"] == "parallel":
        ax.set_xlabel(f"Total flow of the {_arrangement(combined)} [{qu}]")
    elif combined:
        ax.set_xlabel(f"Flow through the {_arrangement(combined)} [{qu}]")
    else:
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
    if combined and "npsh_required" in pump and combined["arrangement"] == "parallel":
        title += (
            f"; each pump's NPSH required is drawn at the total flow of the "
            f"{_arrangement(combined)}, {combined['pumps']} times its own"
        )
    elif combined and "npsh_required" in pump:
        title += "; the NPSH required is the first pump's, which the suction line feeds"
    return fig, title


def _efficiency_panel(
    ax: Any,
    d: Any,
    pump: dict[str, Any],
    op: dict[str, Any],
    regions: dict[str, Any] | None,
    q_duty: float,
) -> list[Any]:
    """The pump's efficiency against flow, in percent, with BEP and the operating point;
    with several pumps running, each pump's efficiency at their total flow."""
    _style_axes(ax)
    eta = np.asarray(pump["efficiency"]["value"], dtype=float) * 100.0
    combined = pump.get("combined")
    (line,) = ax.plot(
        d((combined or pump)["flow"], "flow"),
        eta,
        color=INK,
        lw=1.3,
        ls=(0, (7, 2, 1.5, 2)),
        label="efficiency of each pump" if combined else "pump efficiency",
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
