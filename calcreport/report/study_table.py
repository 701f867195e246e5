"""The study's table as CSV: one row an offer or a pipe size, as the trace holds them, with
flows and heads in the report's units (a spreadsheet's view of the Choice chapter).
"""

from __future__ import annotations

import csv
import io
from typing import Any

from calcreport.units import display_unit, pretty_unit, to_display

__all__ = ["study_csv"]


def study_csv(trace: dict[str, Any]) -> str:
    """The rows of ``results.study``: offers in rank order, then each main's sizes."""
    study = trace["results"]["study"]
    system = trace["project"]["units"]
    flow_unit, head_unit = display_unit("flow", system), display_unit("length", system)
    bore_unit = display_unit("diameter", system)

    def shown(q: dict[str, Any] | None, unit: str) -> str:
        return "" if q is None else f"{to_display(q['value'], q['unit'], unit):.6g}"

    def money(q: dict[str, Any] | None) -> str:
        return "" if q is None else f"{q['value']:.2f}"

    currency = next(
        (
            q["unit"]
            for row in [*study.get("candidates", []), *study.get("pipe_sizes", [])]
            for q in [row.get("capital_cost")]
            if q
        ),
        "",
    )
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(
        [
            "kind",
            "id or size",
            "pipes",
            "rank",
            "status",
            "failing",
            "for review",
            "selected or as designed",
            f"bore [{pretty_unit(bore_unit)}]",
            f"initial cost [{currency}]",
            f"annual energy cost [{currency}]",
            f"annual maintenance cost [{currency}]",
            f"life-cycle cost [{currency}]",
            f"operating flow [{pretty_unit(flow_unit)}]",
            f"operating head [{pretty_unit(head_unit)}]",
        ]
    )
    for o in study.get("candidates", []):
        point = o.get("operating_point") or {}
        writer.writerow(
            [
                "offer",
                o["id"],
                "",
                o["rank"],
                o["status"],
                " ".join(o["failing"]),
                " ".join(o["review"]),
                "selected" if o["id"] == study["selected"] else "",
                "",
                money(o.get("capital_cost")),
                money(o.get("annual_energy_cost")),
                money(o.get("annual_maintenance_cost")),
                money(o.get("life_cycle_cost")),
                shown(point.get("flow"), flow_unit),
                shown(point.get("head"), head_unit),
            ]
        )
    for s in study.get("pipe_sizes", []):
        point = s.get("operating_point") or {}
        writer.writerow(
            [
                "pipe size",
                s["size"],
                " ".join(s["pipes"]),
                "lowest" if s["lowest"] else "",
                s["status"],
                " ".join(s["failing"]),
                " ".join(s["review"]),
                "as designed" if s["as_designed"] else "",
                shown(s["inner_diameter"], bore_unit),
                money(s["capital_cost"]),
                money(s.get("annual_energy_cost")),
                "",
                money(s.get("life_cycle_cost")),
                shown(point.get("flow"), flow_unit),
                shown(point.get("head"), head_unit),
            ]
        )
    return out.getvalue()
