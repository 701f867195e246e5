"""The pipe-size chart: each size's life-cycle cost against its bore, with the pipes' own
cost and the present value of the energy they cost; the lowest and the design's marked.
"""

from __future__ import annotations

from typing import Any

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
from calcreport.report.charts.placement import _Placer


def _draw_pipe_sizes(trace: dict[str, Any]) -> tuple[Any, str]:
    r = _results(trace, "study")
    d = _Display(trace)
    rows = [row for row in r["study"]["pipe_sizes"] if "life_cycle_cost" in row]
    main = rows[0]["pipes"]
    rows = [row for row in rows if row["pipes"] == main]  # the first main; one chart a main
    currency = rows[0]["life_cycle_cost"]["unit"]
    bores = [d(row["inner_diameter"], "diameter") for row in rows]
    fig = _new_figure(3.2)
    ax = fig.add_subplot()
    _style_axes(ax)
    series = (
        ("life_cycle_cost", "life-cycle cost", INK, "-", "o"),
        ("capital_cost", "pipes' cost", BLUE, (0, (5, 2)), "s"),
        ("energy_present_value", "energy over the life (present value)", RUST, (0, (1, 1.5)), "^"),
    )
    handles = []
    for key, label, color, dash, marker in series:
        (line,) = ax.plot(
            bores, [row[key]["value"] for row in rows], color=color, ls=dash, marker=marker,
            ms=3.5, lw=1.2, label=label,
        )  # fmt: skip
        handles.append(line)
    ax.set_xlabel(f"Inner diameter of {', '.join(main)} [{d.label('diameter')}]")
    ax.set_ylabel(f"Cost [{currency}]".replace(" []", ""))
    ax.set_ylim(0, max(row["life_cycle_cost"]["value"] for row in rows) * 1.15)
    _legend_above(ax, handles)
    placer = _Placer(fig, ax)
    placer.add_lines()
    for bore, row in zip(bores, rows, strict=True):
        marks = [
            m for m, on in (("lowest", row["lowest"]), ("as designed", row["as_designed"])) if on
        ]
        if marks:
            placer.place(
                f"{row['size']}: {' and '.join(marks)}",
                (bore, row["life_cycle_cost"]["value"]),
                [(0, 14), (12, 12), (-12, 14), (14, -14)],
                leader_from=4,
                color=GREY if not row["lowest"] else INK,
            )
    title = (
        f"Life-cycle cost of the main {', '.join(main)} against its bore: the pipes' cost "
        "and the present value of the energy they cost over the life"
    )
    return fig, title
