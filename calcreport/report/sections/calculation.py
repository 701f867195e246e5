"""The calculation chapter: one numbered section a stage, each step worked once per equation
(the rest in Appendix A), the per-pipe table.
"""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable, KeepTogether

from calcreport.report.mathtext import Equation
from calcreport.report.sections.common import (
    _ANY_CASE,
    _MONEY,
    _ROUTE_CHECKS,
    SECTIONS,
    _key_runs,
    text,
)
from calcreport.units import display_unit, fmt, pretty_unit, to_display


class CalculationSection:
    """The calculation chapter, one numbered section a stage."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    @property
    def steps_by_id(self) -> dict[str, dict[str, Any]]:
        if not hasattr(self, "_steps"):
            self._steps = {s["id"]: s for s in self.t["steps"]}
        return self._steps

    def step(self, step_id: str) -> dict[str, Any]:
        return self.steps_by_id[step_id]

    def step_block(self, st: dict[str, Any], typeset: bool = True) -> list[Flowable]:
        """A step: title and id, the typeset equation (when ``typeset``), the substituted
        line, the result and its inputs."""
        s = self.s
        mark = self.marks.get(st["id"], "")
        head = (
            f"{mark}{text(st['title'])} <font name='DejaVuMono' size='7.5'>[{text(st['id'])}]"
            f"</font>  {self.ref(st['reference'])}"
        )
        title = self.p(head, s.step_head)
        title._step = st["id"]  # type: ignore[attr-defined]
        parts: list[Flowable] = [title]
        if typeset:
            parts.append(Equation(st["latex"], 10.5))
            self.typeset.add(st["function"])
        parts.append(self.p(text(st["substituted"]), s.substituted))
        result = {"value": st["value"], "unit": st["unit"]}
        result_text = f"{text(st['symbol'])} = {self.q_both(result)}"
        if st["function"] in _MONEY:  # a sum of money: in the project's currency
            result_text += f" {text(self.entered_value('operation.currency') or '')}".rstrip()
        inputs = ", ".join(text(i) for i in _key_runs(st["inputs"]))
        parts.append(
            self.p(
                f"<b>Result:</b> {result_text}    <font size='7'>inputs: {inputs}</font>",
                s.substituted,
            )
        )
        return [KeepTogether(parts)]

    def calculation(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Calculation")]
        others = self.view.other_cases
        intro = (
            "Each step gives the quantity computed, its step id, the equation, the equation "
            "with the values and units substituted, the result and the reference in "
            "brackets. The steps are those of the design case C1"
        )
        if others:
            intro += (
                f"; cases {', '.join(others)} repeat them at their own levels and flows "
                "and are listed in full in Appendix A"
            )
        out.append(self.p(intro + "."))
        for key, title, prefixes in SECTIONS:
            if key in _ANY_CASE:
                steps = self.view.steps(prefixes, self.governing_cases())
            else:
                steps = self.view.steps(prefixes)
            if not steps and not (key == "route" and "route" in self.r):
                continue
            out.append(self.heading(title, 2))
            if key == "pipes":
                out += self.pipe_section(steps)
            elif key == "pump":
                out += self.examples(steps)
            elif key == "route":
                out += self.route_section(steps)
            elif key == "surge":
                out += self.surge_section(steps)
            elif key == "power":
                for st in steps:
                    out += self.step_block(st)
                out += self.profile_section({st["function"] for st in steps})
            else:
                for st in steps:
                    out += self.step_block(st)
        return out

    def governing_cases(self) -> set[str]:
        """The design case and the cases named by the route and surge checks and results."""
        design = self.view.design_case
        cases = {design, self.r.get("surge", {}).get("case", design)}
        cases.add(self.r.get("route", {}).get("min_pressure_case", design))
        for family in _ROUTE_CHECKS:
            cases |= {c["case"] for c in self.view.checks(family=family)}
        return cases

    def num(self, quantity: dict[str, Any], kind: str) -> str:
        """A value in the report's display unit, without the unit (table cells)."""
        unit = display_unit(kind, self.system)
        return fmt(to_display(quantity["value"], quantity["unit"], unit), 4)

    def examples(self, steps: list[dict[str, Any]]) -> list[Flowable]:
        """One worked step of each equation; the rest are in Appendix A."""
        out: list[Flowable] = []
        shown: set[str] = set()
        for st in steps:
            if st["function"] not in shown:
                shown.add(st["function"])
                out += self.step_block(st)
        return out

    def pipe_section(self, steps: list[dict[str, Any]]) -> list[Flowable]:
        out: list[Flowable] = []
        sym = {
            "length": pretty_unit(display_unit("length", self.system)),
            "diameter": pretty_unit(display_unit("diameter", self.system)),
            "velocity": pretty_unit(display_unit("velocity", self.system)),
        }
        rows = [
            [
                "Pipe",
                f"D [{sym['diameter']}]",
                f"L [{sym['length']}]",
                f"v [{sym['velocity']}]",
                "Re",
                "ε/D",
                "f",
                "ΣK",
                f"h_f [{sym['length']}]",
                f"h_m [{sym['length']}]",
            ]
        ]
        num = self.num
        for ident, p in self.r["pipes"].items():
            rows.append(
                [
                    text(ident),
                    num(p["inner_diameter"], "diameter"),
                    num(p["length"], "length"),
                    num(p["velocity"], "velocity"),
                    f"{p['reynolds']['value']:,.0f}",
                    fmt(p["relative_roughness"]["value"], 3),
                    fmt(p["friction_factor"]["value"], 4),
                    fmt(p["k_total"]["value"], 4),
                    num(p["friction_loss"], "length"),
                    num(p["minor_loss"], "length"),
                ]
            )
        w = self.width
        out.append(self.table(rows, [w * 0.1] * 10))
        out.append(
            self.p(
                "One worked example of each equation type follows; every step of "
                "every pipe is listed in Appendix A.",
                self.s.small,
            )
        )
        return out + self.examples(steps)
