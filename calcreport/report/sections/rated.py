"""The rated-duty sheet: one page after the cover with the point for the pump data sheet and
the motor, read from ``results.rated_duty`` (the renderer only formats it).
"""

from __future__ import annotations

from typing import Any

from reportlab.lib.units import mm
from reportlab.platypus import Flowable, Spacer

from calcreport.report.sections.common import text
from calcreport.units import fmt

# The sheet's pump rows: (label, key in a column, display kind; None for a ratio).
_PUMP_ROWS = (
    ("Flow (system)", "flow", "flow"),
    ("Flow of each pump", "flow_per_pump", "flow"),
    ("Total dynamic head (system)", "total_dynamic_head", "length"),
    ("Pump head", "head", "length"),
    ("Head of each pump", "head_per_pump", "length"),
    ("Speed", "speed", "speed"),
    ("Pump efficiency", "efficiency", None),
    ("Flow over BEP flow, Q/Q_BEP", "flow_ratio_bep", None),
    ("NPSH available", "npsh_available", "length"),
    ("NPSH required (NPSH3)", "npsh_required", "length"),
    ("NPSH margin, NPSHa − NPSHr", "npsh_margin", "length"),
    ("Hydraulic power", "hydraulic_power", "power"),
    ("Shaft power", "shaft_power", "power"),
    ("Shaft power of each pump", "shaft_power_per_pump", "power"),
    ("Electrical input power", "electrical_power", "power"),
)


class RatedDutySheet:
    """The rated-duty sheet."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    def rated_duty_sheet(self) -> list[Flowable]:
        rated = self.r.get("rated_duty")
        if not rated:
            return []
        out: list[Flowable] = [self.heading("Rated duty", numbered=False)]
        out.append(self.p(self._rated_intro(rated)))
        w = self.width
        liquid = [
            ["Liquid", text(rated["liquid"])],
            ["Temperature", self.q(rated["temperature"], "temperature")],
            ["Density", self.q(rated["density"], "density")],
            ["Viscosity (dynamic)", self.q(rated["viscosity"], "viscosity")],
            ["Vapour pressure", self.q(rated["vapor_pressure"], "pressure") + " (abs.)"],
        ]
        running = int(rated["pumps_running"]["value"])
        standby = int(rated["pumps_standby"]["value"])
        together = {"parallel": " in parallel", "series": " in series"}
        liquid.append(
            [
                "Pumps",
                f"{running} running{together.get(rated['arrangement'], '')}, {standby} standby",
            ]
        )
        out.append(self.table(liquid, [w * 0.35, w * 0.65], header=False))
        out.append(Spacer(1, 3 * mm))
        out.append(self._rated_pump_table(rated))
        out.append(Spacer(1, 3 * mm))
        out.append(self._rated_motor_table(rated))
        out.append(Spacer(1, 3 * mm))
        governing = [self.view.check(cid) for cid in rated.get("governing", {})]
        governing = [c for c in governing if c is not None]
        if governing:
            lead = self.p(
                "<b>Governing states.</b> Each limit of the pump and motor is checked in "
                "every state the system runs in; the state named is the one nearest its limit.",
                self.s.lead,
            )
            out += [lead, self.check_table(governing, basis=False)]
        return out

    def _rated_intro(self, rated: dict[str, Any]) -> str:
        duty = rated["duty"]["state"]
        title = self._state_title(duty)
        if "top" not in rated:
            return (
                "The point for the pump data sheet and the motor: the required flow at the "
                f"head the system needs there (state {text(duty)}, {text(title)}). No pump is "
                "selected yet, so the speed, the NPSH required and the motor follow from the "
                "offer; the values below are those the offers must meet."
            )
        if rated["control"] == "variable_speed":
            return (
                "The point for the pump data sheet and the motor. Under variable-speed control "
                f"the pump meets the required flow at a reduced speed (state {text(duty)}, "
                f"{text(title)}); at its design speed it runs out to where its curve meets "
                "the design system curve (the design case C1). The motor is sized on the "
                "peak power over the fastest curve."
            )
        return (
            "The point for the pump data sheet and the motor: the required flow at the head "
            f"the system needs there (state {text(duty)}, the rated point), and where the "
            "selected pump runs at its fixed speed (the design case C1, the operating point). "
            "The pump's own values (efficiency, NPSH required, power) are those of its "
            "operating point."
        )

    def _state_title(self, state: str) -> str:
        titles = {c["id"]: c["title"] for c in self.t["cases"]}
        if state in titles:
            return titles[state]
        if state.startswith("P"):
            return f"duty profile point {state}"
        return "the required flow"

    def _rated_pump_table(self, rated: dict[str, Any]) -> Flowable:
        duty, top = rated["duty"], rated.get("top")
        columns = [duty] + ([top] if top else [])
        if top is None:
            heads = ["At the required flow"]
        elif rated["control"] == "variable_speed":
            heads = ["Rated duty (reduced speed)", "Design speed (run-out)"]
        else:
            heads = ["Rated point (data sheet)", "Operating point"]
        header = ["Pump"] + [
            f"{h}<br/>state {text(c['state'])}" for h, c in zip(heads, columns, strict=True)
        ]
        rows = [header]
        for label, key, kind in _PUMP_ROWS:
            if not any(key in c for c in columns):
                continue
            rows.append([label] + [self._rated_cell(c.get(key), kind) for c in columns])
        w = self.width
        widths = [w * 0.34] + [w * 0.66 / len(columns)] * len(columns)
        return self.table(rows, widths)

    def _rated_cell(self, quantity: dict[str, Any] | None, kind: str | None) -> str:
        """A value in the report's units with the step (or input) it comes from."""
        if quantity is None:
            return "—"
        shown = fmt(quantity["value"], 4) if kind is None else self.q(quantity, kind)
        origin = quantity.get("from")
        return (
            f"{shown} <font size='6.5' color='#555555'>{text(origin)}</font>" if origin else shown
        )

    def _rated_motor_table(self, rated: dict[str, Any]) -> Flowable:
        asked = rated["npsh_margin_asked"]
        minimum = self.q(asked["minimum"], "length")
        rows = [
            ["Motor and drive, NPSH margin asked", ""],
            [
                "Motor rating"
                + (f" ({text(rated['motor_series'])} series)" if "motor_series" in rated else ""),
                self._rated_cell(rated.get("motor_rated_power"), "power")
                if "motor_rated_power" in rated
                else "to be selected with the pump",
            ],
            ["Motor efficiency", self._rated_cell(rated.get("motor_efficiency"), None)],
            [
                "Drive",
                "variable-speed drive, efficiency "
                + self._rated_cell(rated["drive_efficiency"], None)
                if "drive_efficiency" in rated
                else "none (fixed speed)",
            ],
            [
                "NPSH margin asked",
                f"NPSHa at least the greater of {fmt(asked['ratio']['value'], 3)} × NPSHr and "
                f"NPSHr + {minimum} {self.ref(asked['reference'])}",
            ],
        ]
        if "motor_peak_shaft_power" in rated:
            peak = self._rated_cell(rated["motor_peak_shaft_power"], "power")
            rows.insert(1, ["Peak shaft power over the pump curve (top speed)", peak])
        w = self.width
        return self.table(rows, [w * 0.45, w * 0.55])
