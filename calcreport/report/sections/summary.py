"""The one-page summary: system, pump and motor, results by case and duty-profile state,
every check that is not a pass, open items and the conclusion.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from reportlab.lib.units import mm
from reportlab.platypus import Flowable, Spacer

from calcreport.physics.motor import RATING_SERIES
from calcreport.report.sections.common import text
from calcreport.units import display_unit, fmt, pretty_unit


class SummarySection:
    """The one-page summary."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    def summary(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Summary")]
        out.append(self.p(f"This calculation covers {self.system_phrase()}."))
        out.append(self.p(self.equipment_phrase()))
        pump = self.t["given"].get("pump.efficiency")
        rows = [
            [
                "Case",
                "Flow",
                "TDH",
                "Pump eff.",
                "NPSHa",
                "NPSHr",
                "NPSHa / NPSHr",
                "Shaft power",
                "Electrical",
            ]
        ]
        for case in self.t["cases"]:
            res = self.r["cases"][case["id"]]
            point = res.get("operating_point", {})
            eff = point.get("efficiency") or pump
            ratio = point.get("npsh_margin_ratio")
            rows.append(
                [
                    f"<b>{text(case['id'])}</b> {text(case['title'])}",
                    self.q_linked(res["flow"], "flow"),
                    self.q_linked(res["total_dynamic_head"], "length"),
                    fmt(eff["value"], 3) if eff else "—",
                    self.q_linked(res["npsh_available"], "length"),
                    self.q_linked(point.get("npsh_required"), "length"),
                    fmt(ratio["value"], 3) if ratio else "—",
                    self.q_linked(res.get("shaft_power"), "power"),
                    self.q_linked(res.get("electrical_power"), "power"),
                ]
            )
        w = self.width
        out.append(self.table(rows, [w * 0.25] + [w * 0.75 / 8] * 8))
        out.append(Spacer(1, 4 * mm))
        out += self.profile_states_table()
        energy = self.r.get("energy", {})
        if energy:
            control = energy.get("control", "on_off").replace("_", "-")
            basis = f" ({control} control over the duty profile)" if "profile" in energy else ""
            parts = [f"annual energy {self.q_linked(energy['annual_energy'], 'energy', 5)}{basis}"]
            if "specific_energy" in energy:
                parts.append(f"specific energy {self.q_linked(energy['specific_energy'])}")
            if "annual_cost" in energy:
                cost = energy["annual_cost"]
                parts.append(f"annual energy cost {cost['value']:,.0f} {text(cost['unit'])}")
            out.append(self.p("<b>Energy:</b> " + "; ".join(parts) + "."))
        route, surge = self.r.get("route", {}), self.r.get("surge", {})
        parts = []
        if "min_pressure_head" in route:
            parts.append(
                f"lowest pressure head {self.q_linked(route['min_pressure_head'], 'length')} at "
                f"{text(route['min_pressure_node'])} ({text(route['min_pressure_case'])})"
            )
        if "max_pressure" in route:
            parts.append(
                f"highest pressure {self.q_linked(route['max_pressure'], 'pressure')}(g) at "
                f"{text(route['max_pressure_node'])}"
            )
        if parts:
            out.append(self.p("<b>Pressure along the route:</b> " + "; ".join(parts) + "."))
        if surge:
            out.append(self.p(f"<b>Surge:</b> {text(surge.get('verdict', ''))}"))
        out.append(self.heading("Checks that are not a pass", 2))
        open_checks = [c for c in self.t["checks"] if c["status"] != "pass"]
        if open_checks:
            out.append(self.check_table(open_checks, basis=False))
            out.append(
                self.p("The basis and source of each check are in the Design checks section.")
            )
        else:
            out.append(self.p("Every design check passes."))
        out.append(self.heading("Open items", 2))
        reason = self.t["status"]["reason"]
        items = (
            [text(reason[:1].upper() + reason[1:]) + "."]
            if self.t["status"]["value"] == "preliminary"
            else []
        )
        if not self.view.pump_selected and not items:
            items.append(
                "Pump not selected: no pump curve is given, so the operating point, NPSH "
                "required, shutoff pressures and motor rating are not determined."
            )
        items += [text(n) for n in self.t["notes"]]
        reviews = [c for c in open_checks if c["status"] == "review" and c["message"]]
        # Ratings short of a shutoff pressure: one item naming them all.
        unconfirmed = [
            c
            for c in reviews
            if c["id"].startswith("pressure_rating.") and "shutoff" in c["message"]
        ]
        items += [
            f"{text(c['title'])} ({text(c['case'])}): {text(c['message'])}"
            for c in reviews
            if c not in unconfirmed or len(unconfirmed) == 1
        ]
        if len(unconfirmed) > 1:
            names = ", ".join(text(c["title"].split(" on ", 1)[1].rsplit(" within", 1)[0])
                              for c in unconfirmed)  # fmt: skip
            items.append(
                f"Ratings of {names}: within them on the pressures known (see Design checks); "
                "confirm against the selected pump's shutoff head."
            )
        for n, item in enumerate(items or ["None."], start=1):
            out.append(self.p(f"{n}. {item}"))
        out.append(self.heading("Conclusion", 2))
        out.append(self.p(self.conclusion()))
        return out

    def profile_states_table(self) -> list[Flowable]:
        """The duty-profile points as operating states, each checked like a case."""
        states = self.r.get("profile_states", {})
        if not states:
            return []
        length = pretty_unit(display_unit("length", self.system))
        flow = pretty_unit(display_unit("flow", self.system))
        rows = [
            [
                "Point",
                f"Flow [{flow}]",
                f"Head [{length}]",
                "Speed [rpm]",
                "Pump eff.",
                "Q / Q_BEP",
                f"NPSH margin [{length}]",
                f"Lowest pressure head [{length}]",
            ]
        ]
        dash = "—"
        for pid, res in states.items():
            point = res.get("operating_point", {})
            route = res.get("route", {})
            low = route.get("min_pressure_head")
            rows.append(
                [
                    text(pid),
                    self.num(res["flow"], "flow"),
                    self.num(point["head"], "length") if "head" in point else dash,
                    self.num(point["speed"], "speed") if "speed" in point else dash,
                    fmt(point["efficiency"]["value"], 3) if "efficiency" in point else dash,
                    fmt(point["flow_ratio_bep"]["value"], 3) if "flow_ratio_bep" in point else dash,
                    self.num(point["npsh_margin"], "length") if "npsh_margin" in point else dash,
                    (
                        f"{self.num(low, 'length')} at {text(route['min_pressure_node'])}"
                        if low
                        else dash
                    ),
                ]
            )
        w = self.width
        caption = self.p(
            "<b>Duty-profile states.</b> Each point of the duty profile runs at its own flow"
            + (" and speed" if any("speed" in r.get("operating_point", {}) for r in states.values())
               else "")
            + "; every design check is evaluated at each point as at each case."
        )  # fmt: skip
        return [
            caption,
            self.table(rows, [w * 0.08, *([w * 0.11] * 6), w * 0.26]),
            Spacer(1, 4 * mm),
        ]

    def equipment_phrase(self) -> str:
        given = self.t["given"]
        motor = self.r.get("motor", {})
        curve = self.view.pump_selected
        pump_data = self.entered.get("pump", {})
        names = ", ".join(
            text(pump_data[k])
            for k in ("manufacturer", "model", "impeller_diameter")
            if k in pump_data
        )
        if curve:
            pump = f"<b>Pump:</b> selected on its curve{f' ({names})' if names else ''}"
            if "pump.speed" in given:
                pump += f", at {self.q(given['pump.speed'], 'speed')}"
            pump += "."
        elif "pump.efficiency" in given:
            pump = (
                f"<b>Pump:</b> not selected; efficiency "
                f"{fmt(given['pump.efficiency']['value'], 3)} assumed for power."
            )
        else:
            pump = "<b>Pump:</b> not selected; no efficiency given, so shaft power is not computed."
        if "rated_power" in motor:
            loads = ", ".join(
                f"{text(c)} {fmt(v['value'] * 100, 3)} %" for c, v in motor["loading"].items()
            )
            series = RATING_SERIES[motor["series"]]
            text_motor = (
                f" <b>Motor:</b> {self.q(motor['rated_power'], 'power')} ({series} "
                f"series), covering the peak shaft power "
                f"{self.q(motor['peak_shaft_power'], 'power')} anywhere on the curve; "
                f"loading at the operating points {loads}."
            )
        elif "motor.efficiency" in given:
            text_motor = (
                f" <b>Motor:</b> efficiency {fmt(given['motor.efficiency']['value'], 3)}"
                " assumed; rating to be selected with the pump."
            )
        else:
            text_motor = " <b>Motor:</b> not given."
        c = self.r.get("commissioning", {})
        gauges = ""
        if c:
            gauges = (
                f" <b>Commissioning (C1, gauges at the pump datum):</b> suction "
                f"{self.q(c['suction_pressure'], 'pressure')}(g), discharge "
                f"{self.q(c['discharge_pressure'], 'pressure')}(g)"
            )
            if "shutoff_discharge_pressure" in c:
                gauges += (
                    f"; at shutoff {self.q(c['shutoff_discharge_pressure'], 'pressure')}"
                    "(g) at the discharge"
                )
            gauges += "."
        return pump + text_motor + gauges

    def conclusion(self) -> str:
        fails = self.view.checks(status="fail")
        tdh = self.q(self.r["total_dynamic_head"], "length")
        flow = self.q(self.r["flow"], "flow")
        if fails:
            then = (
                "before a pump is selected"
                if "pump.curve.flow[1]" not in self.t["given"]
                else "and rechecked"
            )
            return (
                f"The design does <b>not</b> meet {len(fails)} criteri"
                f"{'on' if len(fails) == 1 else 'a'} (see Design checks): it must be revised "
                f"{then}."
            )
        if self.t["status"]["value"] == "preliminary":
            return (
                f"The pump must deliver {flow} against a total dynamic head of {tdh}"
                f"{self.worst_case('total_dynamic_head', max)}, with NPSH available of "
                f"{self.q(self.r['npsh_available'], 'length')}"
                f"{self.worst_case('npsh_available', min)}; select the pump on its certified "
                "curve for every case and recheck this calculation against it."
            )
        reviews = self.view.checks(status="review")
        sized = self.sizing_state()
        if reviews:
            return (
                f"The selected pump delivers {flow} at {tdh} in the design case and meets "
                f"every criterion that can fail{sized}; {len(reviews)} item"
                f"{'s are' if len(reviews) != 1 else ' is'} marked for review."
            )
        return f"The selected pump delivers {flow} at {tdh}; every criterion is met{sized}."

    def sizing_state(self) -> str:
        """``" (the required flow governs in C2, title)"``: the state the duty check of the
        selected pump is decided in, where the trace has that check."""
        duty = self.view.check("duty_flow")
        if duty is None:
            return ""
        titles = {c["id"]: c.get("title", "") for c in self.t.get("cases", [])}
        title = f", {text(titles[duty['case']])}" if titles.get(duty["case"]) else ""
        return f" (the required flow is met with least margin in {text(duty['case'])}{title})"

    def worst_case(self, key: str, pick: Callable[..., Any]) -> str:
        """``" in the design case and X in Cn (title)"`` where another case's traced head
        ``key`` is the worst (``pick`` is ``max`` or ``min``), with that case's flow when it
        differs; ``""`` when the design case is the worst."""
        every = {**(self.r.get("cases") or {}), **self.r.get("profile_states", {})}
        cases = [(cid, c) for cid, c in every.items() if key in c]
        if not cases:
            return ""
        cid, worst = pick(cases, key=lambda item: item[1][key]["value"])
        if worst[key]["value"] == self.r[key]["value"]:
            return ""
        titles = {c["id"]: c.get("title", "") for c in self.t.get("cases", [])}
        at = (
            f" at {self.q(worst['flow'], 'flow')}"
            if "flow" in worst and worst["flow"]["value"] != self.r["flow"]["value"]
            else ""
        )
        title = f" ({text(titles[cid])})" if titles.get(cid) else ""
        return f" in the design case and {self.q(worst[key], 'length')}{at} in {cid}{title}"
