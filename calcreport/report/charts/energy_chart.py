"""The energy chart: input power and running cost at each point of the duty profile."""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    BLUE,
    RUST,
    _Display,
    _legend_above,
    _new_figure,
    _num,
    _results,
    _style_axes,
)

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
