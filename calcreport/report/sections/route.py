"""The route and surge sections of the calculation: node pressures and ratings, the
duty-profile states, the surge screening of each event.
"""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable

from calcreport.report.sections.common import _PROFILE_STEP, MAX_NODE_ROWS, text
from calcreport.units import display_unit, fmt, pretty_unit

# The steps of the staging's energy, worked in its own subsection of Power and energy.
STAGING_STEPS = "energy.staging."


class RouteSections:
    """The route and surge sections of the calculation."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    def route_section(self, steps: list[dict[str, Any]]) -> list[Flowable]:
        """Node table, high points and crest, then the steps the pressure checks rely on."""
        route = self.r.get("route", {})
        out: list[Flowable] = []
        nodes = route.get("nodes", [])
        intro = (
            "Pressure heads are gauge, from the hydraulic grade line less the pipe centreline "
            "at each point; each loss is taken where it happens (an entrance as the liquid "
            "enters its pipe, an exit as it leaves, friction along the pipe, other fittings at "
            "the pipe's start unless placed), and the pressure is read on both sides of every "
            "fitting location and at the pump's flanges. The highest pressure at a point is "
            "the greatest of the pump's highest head against a closed line "
            f"({text(route.get('pressure_case', ''))}), the operating pressures of every state "
            "and the upsurge of every screened event."
        )
        out.append(self.p(intro))
        keep = {
            route.get("min_pressure_node"),
            route.get("max_pressure_node"),
            route.get("rating_check", {}).get("node"),
            *(h["node"] for h in route.get("high_points", [])),
        }
        shown = nodes if len(nodes) <= MAX_NODE_ROWS else [n for n in nodes if n["node"] in keep]
        if shown:
            length = pretty_unit(display_unit("length", self.system))
            pressure = pretty_unit(display_unit("pressure", self.system))
            rows = [
                [
                    "Point",
                    f"Elevation [{length}]",
                    f"Lowest pressure head [{length}]",
                    f"Highest pressure [{pressure}(g)]",
                    "Highest from",
                    f"Rating [{pressure}(g)]",
                ]
            ]
            basis = {"static": "no flow, pump at its highest head", "surge": "upsurge"}
            for n in shown:
                rows.append(
                    [
                        text(n["node"]),
                        self.num(n["elevation"], "length"),
                        self.num(n["min_pressure_head"], "length")
                        if "min_pressure_head" in n
                        else "—",
                        self.num(n["max_pressure"], "pressure"),
                        basis.get(n["basis"], "operation"),
                        self.num(n["rating"], "pressure") if "rating" in n else "—",
                    ]
                )
            w = self.width
            out.append(
                self.table(rows, [w * 0.2, w * 0.14, w * 0.17, w * 0.17, w * 0.18, w * 0.14])
            )
            if len(shown) < len(nodes):
                out.append(
                    self.p(
                        f"{len(shown)} of {len(nodes)} points shown (the governing ones); the "
                        "trace lists every point (results.route.nodes).",
                        self.s.small,
                    )
                )
        lines = []
        if "min_pressure_head" in route:
            lines.append(
                f"Lowest pressure head in the discharge line: "
                f"{self.q(route['min_pressure_head'], 'length')} at "
                f"{text(route['min_pressure_node'])} (case {text(route['min_pressure_case'])})."
            )
        if "max_pressure" in route:
            lines.append(
                f"Highest pressure: {self.q(route['max_pressure'], 'pressure')}(g) at "
                f"{text(route['max_pressure_node'])}."
            )
        highs = route.get("high_points", [])
        if highs:
            listed = ", ".join(
                f"{text(h['node'])} ({self.q(h['elevation'], 'length')})" for h in highs
            )
            lines.append(f"High points (air-valve candidates): {listed}.")
        if "crest" in route:
            c = route["crest"]
            verdict = (
                f"in case(s) {text(', '.join(c['cases_below_atmospheric']))} the grade line "
                "falls below the crest: there the crest controls the flow, and the line beyond "
                "runs part-full, or as a siphon only if primed"
                if c.get("controls_flow")
                else "the grade line stays above it in every case, so the line runs full"
            )
            lines.append(
                f"The route rises {self.q(c['above_destination'], 'length')} above the "
                f"destination at {text(c['node'])}: the pump must lift the liquid over this "
                f"crest; {verdict}."
            )
        out += [self.p(line) for line in lines]
        out += self.figure("route_pressure")
        # One worked step of each equation (the table of points holds every point's
        # result); every step of every state is in the attached listing.
        return out + self.examples(steps)

    def profile_section(self, shown: set[str]) -> list[Flowable]:
        """The duty profile: a row per point, then one worked step of each new equation."""
        energy = self.r.get("energy", {})
        rows_in = energy.get("profile", [])
        if not rows_in:
            return []
        control = energy.get("control", "on_off")
        out: list[Flowable] = [self.heading("Duty profile", 2)]
        words = {
            "on_off": "On-off control: the pump runs at its operating point for as long as "
            "the profile's volume needs.",
            "throttled": "Throttled control: the fixed-speed pump is held at each flow by a "
            "valve, which burns the pump's head above the system curve.",
            "variable_speed": "Variable speed: at each flow the pump runs at the speed whose "
            "affinity-scaled curve meets the system curve.",
        }
        out.append(self.p(words[control]))
        length = pretty_unit(display_unit("length", self.system))
        flow = pretty_unit(display_unit("flow", self.system))
        pw = pretty_unit(display_unit("power", self.system))
        rows = [
            [
                "Point",
                f"Flow [{flow}]",
                "Hours a year",
                f"System head [{length}]",
                f"Pump head [{length}]",
                "Speed [rpm]" if control == "variable_speed" else f"Throttled [{length}]",
                "Pump eff.",
                f"Input power [{pw}]",
            ]
        ]
        for r in rows_in:
            dash = "—"
            special = r.get("speed") if control == "variable_speed" else r.get("throttling_loss")
            rows.append(
                [
                    text(r["point"]),
                    self.num(r["flow"], "flow"),
                    f"{r['hours']:,.0f}",
                    self.num(r["system_head"], "length") if "system_head" in r else dash,
                    self.num(r["pump_head"], "length") if "pump_head" in r else dash,
                    (
                        self.num(special, "speed" if control == "variable_speed" else "length")
                        if special
                        else dash
                    ),
                    fmt(r["efficiency"]["value"], 3) if "efficiency" in r else dash,
                    self.num(r["electrical_power"], "power") if "electrical_power" in r else dash,
                ]
            )
        w = self.width
        out.append(self.table(rows, [w * 0.08] + [w * 0.92 / 7] * 7))
        if "throttling_energy" in energy:
            lost = self.q(energy["throttling_energy"], "energy", 5)
            cost = energy.get("throttling_cost")
            money = f", {cost['value']:,.0f} {text(cost['unit'])} a year" if cost else ""
            out.append(self.p(f"Energy burnt in the throttling valve: {lost}{money}."))
        out += self.figure("energy")
        steps = [st for st in self.t["steps"] if _PROFILE_STEP.match(st["id"])]
        fresh = [st for st in steps if st["function"] not in shown]
        out += self.examples(fresh)
        return out

    def staging_section(self) -> list[Flowable]:
        """Staging of parallel pumps: at each profile point the pumps running at the
        design's fixed count and as staged, the counts feasible, the input power of each,
        then the annual energy of both and the saving, with their worked steps."""
        staging = self.r.get("staging")
        if not staging:
            return []
        n = staging["pumps_available"]["value"]
        limits = ", ".join(staging["limits"]) or "the pump curve alone"
        intro = self.p(
            f"At each point of the profile, every count of the {n:g} duty pumps in "
            "parallel is tried at the point's flow, each pump taking an equal share. The "
            "staged count is the count of least electrical input power among those whose "
            "combined curve meets the system at that flow with each pump within its "
            f"operating-region limits ({text(limits)}); on a tie the fewer pumps run. Each "
            "staged count is solved and checked as a state of its own. When to switch "
            "pumps, the control and the minimum run times are for the controls designer."
        )
        flow = pretty_unit(display_unit("flow", self.system))
        pw = pretty_unit(display_unit("power", self.system))
        rows: list[list[Any]] = [
            [
                "Point",
                f"Flow [{flow}]",
                "Hours a year",
                "Pumps, fixed",
                "Pumps, staged",
                "Counts feasible",
                f"Input power, fixed [{pw}]",
                f"Input power, staged [{pw}]",
            ]
        ]
        refused = []
        for row in staging["points"]:
            state = "" if row["state"] == row["state_fixed"] else f" ({text(row['state'])})"
            power = row["electrical_power"]
            rows.append(
                [
                    text(row["point"]),
                    self.num(row["flow"], "flow"),
                    f"{row['hours']:,.0f}",
                    f"{row['pumps_fixed']:d}",
                    f"{row['pumps']:d}{state}",
                    ", ".join(f"{k:d}" for k in row["feasible"]) or "none",
                    self.num(power["fixed"], "power"),
                    self.num(power["staged"], "power"),
                ]
            )
            refused += [
                f"{text(row['point'])} with {c['pumps']:d}: {text(c['reason'])}"
                for c in row["screened"]
                if not c["feasible"]
            ]
        w = self.width
        shares = (0.08, 0.11, 0.1, 0.11, 0.13, 0.13, 0.17, 0.17)
        table = self.table(rows, [w * share for share in shares])
        out: list[Flowable] = [self.heading("Pumps running at each profile point", 2)]
        out += self.kept([intro, table])
        if refused:
            out.append(self.p("Counts not feasible: " + "; ".join(refused) + ".", self.s.small))
        if staging["unstaged"]:
            out.append(
                self.p(
                    f"At {text(', '.join(staging['unstaged']))} no count keeps each pump within "
                    f"its limits: the {n:g} pumps are kept there in the staged energy."
                )
            )
        saving = staging["saving"]
        line = (
            f"Annual energy over the profile: {self.q_linked(staging['energy_fixed'], 'energy', 5)}"
            f" with {n:g} pumps running at every point, "
            f"{self.q_linked(staging['energy_staged'], 'energy', 5)} staged; "
            + ("saved by staging: " if saving["value"] >= 0 else "more when staged: ")
            + f"{self.q_linked({**saving, 'value': abs(saving['value'])}, 'energy', 5)}"
        )
        if "cost_saving" in staging:
            cost = staging["cost_saving"]
            line += f", {abs(cost['value']):,.0f} {text(cost['unit'])} a year"
        out.append(self.p(line + "."))
        steps = self.view.steps((STAGING_STEPS,))
        return out + [flowable for st in steps for flowable in self.step_block(st)]

    def surge_section(self, steps: list[dict[str, Any]]) -> list[Flowable]:
        """Per-pipe wave speed, period and head change; the verdict; one step of each kind."""
        result = self.r.get("surge", {})
        out: list[Flowable] = []
        if "pipes" in result:
            length = pretty_unit(display_unit("length", self.system))
            speed = pretty_unit(display_unit("velocity", self.system))
            events = result.get("events", {})
            rows = [
                [
                    "Pipe",
                    f"Wave speed a [{speed}]",
                    "Period 2L/a [s]",
                    f"Joukowsky a·v/g alone [{length}]",
                    *(
                        f"Head change, {name.replace('_', ' ')} ({ev['case']}) [{length}]"
                        for name, ev in events.items()
                    ),
                ]
            ]
            for ident, p in list(result["pipes"].items())[:MAX_NODE_ROWS]:
                rows.append(
                    [
                        text(ident),
                        self.num(p["wave_speed"], "velocity"),
                        fmt(p["period"]["value"], 4),
                        self.num(p["joukowsky_head"], "length"),
                        *(self.num(ev["pipes"][ident]["head_change"], "length")
                          for ev in events.values()),
                    ]
                )  # fmt: skip
            w = self.width
            n = len(rows[0])
            out.append(self.table(rows, [w * 0.16] + [w * 0.84 / (n - 1)] * (n - 1)))
        for name, ev in (result.get("events") or {"": result}).items():
            event = (name or result.get("event", "")).replace("_", " ")
            out.append(
                self.p(
                    f"<b>Event:</b> {text(event)}, state {text(ev.get('case', ''))}. "
                    f"<b>Verdict:</b> {text(ev.get('verdict', ''))}"
                )
            )
        out.append(
            self.p(
                "A pump trip (a power failure can happen on any pumped line) is screened "
                "always, with any event the input names. The line's pipes are screened in "
                "series as one line (the equivalent pipe of the same travel time and inertia), "
                "so a short, stiff pipe does not set the head change by its own a·v/g; the "
                "flow stops at once, or in surge.pump_stop_time (a valve closing slower than "
                "the line period: linearly over its closing time); friction and wave "
                "reflections are neglected. It is not a transient analysis: where it trips a "
                "limit, a detailed transient analysis is required before the design is "
                "accepted.",
                self.s.small,
            )
        )
        # One worked step of each per-pipe equation (the table above holds every pipe's
        # result); every line-level step (line and suction periods and head changes) in full.
        pipes = set(result.get("pipes", {}))
        worked: set[tuple[str, str]] = set()
        for st in steps:
            if _pipe_of(st) in pipes:
                kind = (self.view.case_of(st), st["function"])
                if kind in worked:
                    continue
                worked.add(kind)
            out += self.step_block(st)
        return out


def _pipe_of(step: dict[str, Any]) -> str:
    """The pipe a surge step belongs to (``surge.D1.period`` -> ``D1``), or ""."""
    parts = step["id"].split(".")
    return parts[-2] if len(parts) >= 3 else ""
