"""The calculation chapter: one numbered section a stage, each equation worked once (in
the design state), the results of the other states as tables, the per-pipe table. Every
step of every state is in the attached listing (and Appendix C when it is printed).
"""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable

from calcreport.physics.equation import lookup
from calcreport.report.mathtext import Equation
from calcreport.report.sections.common import (
    _MONEY,
    CALCULATION_ANCHOR,
    LONG_ROUTE_PIPES,
    SECTIONS,
    _key_runs,
    runs,
    text,
)
from calcreport.report.sections.route import STAGING_STEPS
from calcreport.trace import substitute
from calcreport.units import KIND_OF_SI_UNIT, display_unit, fmt, pretty_unit, to_display

# How a US report writes its substituted lines (the trace's own lines are in SI).
US_LINES = (
    "Each substituted line is written in the coherent British gravitational units (foot, "
    "slug, second, pound-force; 1 lbf = 1 slug·ft/s², g = 32.174 ft/s²), so its numbers "
    "multiply out to its result with no conversion factor; the result is then given in "
    "the report's units. Energy and its cost are worked in kWh. Empirical formulas with "
    "dimensional constants (metric specific speed, Hazen–Williams in SI form, the viscosity "
    "parameter of ANSI/HI 9.6.7, the US Standard Atmosphere) and dimensionless ones are "
    "written in the units they are defined in; property correlations name their state in "
    "the report's units."
)


def printed_substitution(st: dict[str, Any], system: str) -> str:
    """A trace step's substituted line as the report prints it: the trace's own (SI) line,
    or in a US report the same equation written in US units from the step's arguments
    (:func:`calcreport.trace.substitute`); a formula of fixed units keeps the trace's."""
    eq = lookup(st["function"])
    if system != "US" or eq.units == "fixed":
        return str(st["substituted"])
    values = {name: arg["value"] for name, arg in st["arguments"].items()}
    return substitute(eq, values, st["value"], "US")


USERS_LISTED = 3  # steps named as using a step's result (the rest are counted)
INPUTS_LISTED = 12  # a step's inputs named in print (a sum over hundreds of pipes: counted)
LINE_CHARS = 900  # a longer substituted line prints its first and last terms in full


def elided(line: str) -> str:
    """A substituted line of hundreds of terms (a sum over every pipe of a long route) as
    printed: its first and last terms, and the count of those between; the whole line is in
    the attached listing. A line of ``LINE_CHARS`` or fewer prints whole."""
    if len(line) <= LINE_CHARS:
        return line
    for sep in (" + ", ", "):
        head = line.rfind(sep, 0, LINE_CHARS * 2 // 3)
        tail = line.find(sep, len(line) - LINE_CHARS // 3)
        if 0 < head < tail:
            hidden = line[head:tail].count(sep)  # the terms between the two kept ends
            return (
                f"{line[:head]}{sep}… {hidden} more terms (the full line is in the attached "
                f"listing) …{sep}{line[tail + len(sep) :]}"
            )
    return line


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
        title._anchor = self.step_keys[st["id"]]  # type: ignore[attr-defined]
        parts: list[Flowable] = [title]
        if typeset:
            parts.append(Equation(st["latex"], 10.5))
            self.typeset.add(st["function"])
        parts.append(self.p(text(elided(printed_substitution(st, self.system))), s.substituted))
        result = {"value": st["value"], "unit": st["unit"]}
        result_text = f"{text(st['symbol'])} = {self.q_both(result)}"
        if st["function"] in _MONEY:  # a sum of money: in the project's currency
            result_text += f" {text(self.entered_value('operation.currency') or '')}".rstrip()
        named = _key_runs(st["inputs"])
        inputs = ", ".join(self.link(i) for i in named[:INPUTS_LISTED])
        if len(named) > INPUTS_LISTED:
            inputs += f" and {len(named) - INPUTS_LISTED} more"
        users = self.used_by.get(st["id"], [])
        used = ", ".join(self.link(u) for u in users[:USERS_LISTED])
        if len(users) > USERS_LISTED:
            used += f" and {len(users) - USERS_LISTED} more"
        used = f"; used by: {used}" if used else ""
        parts.append(
            self.p(
                f"<b>Result:</b> {result_text}    <font size='7'>inputs: {inputs}{used}</font>",
                s.substituted,
            )
        )
        return self.kept(parts)

    def calculation(self) -> list[Flowable]:
        chapter = self.heading("Calculation")
        chapter._anchor = CALCULATION_ANCHOR  # type: ignore[attr-defined]
        out: list[Flowable] = [chapter]
        others = self.view.other_cases
        intro = (
            "Each step gives the quantity computed, its step id, the equation, the equation "
            "with the values and units substituted, the result and the reference in "
            "brackets. The steps are those of the design case C1"
        )
        if others:
            intro += (
                f"; cases {', '.join(others)} repeat them at their own levels and flows, "
                "and each section ends with a table of their results beside the design "
                "case's"
            )
        where = (
            "Appendix C and the step listing attached to this PDF"
            if self.listing == "full"
            else "the step listing attached to this PDF (see Appendix B)"
        )
        intro += f". Every step of every case, with its full substitution, is in {where}"
        out.append(self.p(intro + "."))
        if self.system == "US":
            out.append(self.p(US_LINES))
        for key, title, prefixes in SECTIONS:
            # The design state is worked in full; every other state is a table of results.
            steps = self.worked_steps(key, prefixes)
            if not steps and not (key == "route" and "route" in self.r):
                continue
            heading = self.heading(title, 2)
            heading._anchor = f"sec.{key}"  # type: ignore[attr-defined]
            out.append(heading)
            if key == "pipes":
                out += self.pipe_section(steps)
            elif key == "route":
                out += self.route_section(steps)
            elif key == "surge":
                out += self.surge_section(steps)
            elif key == "power":
                for st in steps:
                    if not st["id"].startswith(STAGING_STEPS):
                        out += self.step_block(st)
                out += self.profile_section({st["function"] for st in steps})
                out += self.staging_section()
            else:
                for st in steps:
                    out += self.step_block(st)
            out += self.other_states(prefixes, {self.view.design_case})
        return out

    def worked_steps(self, key: str, prefixes: tuple[str, ...]) -> list[dict[str, Any]]:
        """The steps a section works in full: the design case's, and for an equation the
        design case does not reach (a surge event screened in the state that governs it)
        that equation's steps in the first state that does, the governing one first."""
        steps = self.view.steps(prefixes)
        done = {st["function"] for st in steps}
        governing = self.r.get(key, {}).get("case") if isinstance(self.r.get(key), dict) else None
        order = sorted(self.view.other_cases, key=lambda c: c != governing)
        rest = self.view.steps(prefixes, order)
        for case in order:
            found = [
                st for st in rest if self.view.case_of(st) == case and st["function"] not in done
            ]
            steps += found
            done |= {st["function"] for st in found}
        position = {st["id"]: n for n, st in enumerate(self.t["steps"])}
        return sorted(steps, key=lambda st: position[st["id"]])

    def other_states(self, prefixes: tuple[str, ...], shown: set[str]) -> list[Flowable]:
        """The results of the cases not worked in full above, as a table: one row a step,
        one column a case, the design case's value first for comparison."""
        cases = [c for c in self.view.other_cases if c not in shown]
        rows_by_step = self.view.steps_by_case(prefixes, [self.view.design_case, *cases])
        rows_by_step = {k: v for k, v in rows_by_step.items() if set(v) & set(cases)}
        # A step whose result is the design case's in every case (a pipe's friction at one
        # flow under other levels) adds nothing to the table; it is counted, not repeated.
        design = self.view.design_case
        same = [
            k
            for k, v in rows_by_step.items()
            if design in v and len({st["value"] for st in v.values()}) == 1
        ]
        for key in same:
            del rows_by_step[key]
        if not rows_by_step and not same:
            return []
        out: list[Flowable] = []
        if same:
            out.append(
                self.p(
                    f"In cases {', '.join(cases)}, {len(same)} step{'s' if len(same) > 1 else ''}"
                    f" of this section give the design case's result exactly and "
                    f"{'are' if len(same) > 1 else 'is'} not repeated.",
                    self.s.small,
                )
            )
        per_table = 5  # case columns a table holds on a portrait page
        for first in range(0, len(cases) if rows_by_step else 0, per_table):
            group = cases[first : first + per_table]
            columns = [self.view.design_case, *group]
            rows: list[list[Any]] = [["Step", "Unit", *columns]]
            for key, by_case in rows_by_step.items():
                sample = next(iter(by_case.values()))
                kind = KIND_OF_SI_UNIT.get(sample["unit"])
                unit = display_unit(kind, self.system) if kind else sample["unit"]
                cells = [
                    self.num(by_case[c], kind)
                    if kind and c in by_case
                    else fmt(by_case[c]["value"], 4)
                    if c in by_case
                    else "—"
                    for c in columns
                ]
                label = (
                    f"{text(sample['title'])} <font name='DejaVuMono' size='6.5'>"
                    f"[{text(key)}]</font>"
                )
                rows.append([label, pretty_unit(unit) or "–", *cells])
            w = self.width
            share = w * 0.52 / len(columns)
            table = self.table(rows, [w * 0.38, w * 0.1, *([share] * len(columns))])
            names = ", ".join(group)
            caption = self.p(
                f"Results of case{'s' if len(group) > 1 else ''} {names} beside the design "
                f"case {self.view.design_case} (each step worked as above; in full in the "
                "attached listing).",
                self.s.small,
            )
            out += self.kept([caption, table])
        return out

    def num(self, quantity: dict[str, Any], kind: str) -> str:
        """A value in the report's display unit, without the unit (table cells)."""
        unit = display_unit(kind, self.system)
        return fmt(to_display(quantity["value"], quantity["unit"], unit), 4)

    def examples(self, steps: list[dict[str, Any]]) -> list[Flowable]:
        """One worked step of each equation; the rest are in the attached listing."""
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
        if len(self.r["pipes"]) > LONG_ROUTE_PIPES:  # like pipes along a long main: one row
            rows = [rows[0], *runs(rows[1:])]
        out.append(self.table(rows, [w * 0.1] * 10))
        out.append(
            self.p(
                "One worked example of each equation type follows; every step of "
                "every pipe is in the attached step listing.",
                self.s.small,
            )
        )
        return out + self.examples(steps)
