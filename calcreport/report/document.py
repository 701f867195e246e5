"""The PDF calculation report, laid out from a trace (JSON form) alone.

Sections in a reviewer's order: cover, summary, contents, the system at a
glance, conventions / assumptions / criteria / inputs, the calculation,
design checks, charts, cautions, references, appendices (full step listing,
friction-factor chart, files read and the input echoed verbatim). Every
page carries the title block with ``Page N of M``. The renderer converts
units for display and lays out text; it computes no engineering number.
"""

from __future__ import annotations

import io
import re
import tomllib
from collections.abc import Callable, Sequence
from functools import cache
from pathlib import Path
from typing import Any
from xml.sax.saxutils import escape

from reportlab.lib.units import mm
from reportlab.pdfgen import canvas as rl_canvas
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Flowable,
    Frame,
    KeepTogether,
    NextPageTemplate,
    PageBreak,
    PageTemplate,
    Paragraph,
    Spacer,
    Table,
    TableStyle,
)

from calcreport.report import style
from calcreport.report.mathtext import Equation
from calcreport.units import (
    KIND_OF_SI_UNIT,
    display_unit,
    fmt,
    pretty_unit,
    show,
    show_keyed,
    to_display,
)

__all__ = ["render_pdf"]

TEMPLATES = Path(__file__).parent / "templates"

# Section of each step, by the first part of its id.
SECTIONS = (
    ("site", "Site and liquid properties", ("site.", "fluid.", "source.", "destination.")),
    ("pipes", "Pipe hydraulics", ("pipe.",)),
    ("system", "System head and total dynamic head", ("system.",)),
    ("pump", "Operating point on the pump curve", ("pump.",)),
    ("npsh", "NPSH available and margin", ("npsh.",)),
    ("power", "Power and energy", ("power.", "energy.")),
    ("motor", "Motor rating", ("motor.",)),
    ("route", "Pressure along the route", ("route.",)),
    ("surge", "Surge screening", ("surge.",)),
)
# Sections whose steps come from the cases that govern their checks, not only C1.
_ANY_CASE = ("route", "surge")
_CASE_PREFIX = re.compile(r"^C\d+\.")
_PROFILE_STEP = re.compile(r"^P\d+\.(pump|power|energy)\.")
_ROUTE_CHECKS = ("min_pressure", "pressure_rating", "surge")
# Equations whose result is a sum of money, printed in the input's currency.
_MONEY = frozenset(
    {"power.annual_cost", "power.cost_sum", "power.demand_cost", "power.present_value"}
)
COVER_REVISIONS = 4  # the latest revisions shown on the cover
MAX_FITTINGS_LISTED = 12  # fitting entries in a pipe's table row
# Longest node table printed in full; a longer route prints its governing nodes.
MAX_NODE_ROWS = 60


@cache
def _jinja() -> Any:
    import jinja2

    return jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(TEMPLATES)),
        autoescape=True,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=False,
    )


def _template(name: str, **values: Any) -> str:
    return str(_jinja().get_template(name).render(**values))


def _lines(name: str, **values: Any) -> list[str]:
    return [line.strip() for line in _template(name, **values).splitlines() if line.strip()]


def _short(value: Any, unit: str, key: str, system: str) -> str:
    """A changed value as the changes page prints it: in the report's units, rounded as its
    results are."""
    if isinstance(value, list):
        return f"{len(value)} values"
    if isinstance(value, dict):
        return "changed"
    if isinstance(value, int | float) and not isinstance(value, bool):
        return show_keyed(float(value), unit, key, system)
    return "—" if value is None else str(value)


def text(value: Any) -> str:
    """Text from the input, escaped so it prints literally (no markup, no control chars)."""
    cleaned = "".join(ch if ch >= " " or ch in "\t" else " " for ch in str(value))
    return escape(cleaned)


class _Report:
    """Builds the story of one report from a trace."""

    def __init__(
        self,
        trace: dict[str, Any],
        input_text: str,
        figures: dict[str, Any],
        changes: Any = None,
    ) -> None:
        self.changes = changes
        self.marks: dict[str, str] = {}
        if changes is not None:
            self.marks = {i: "<b>Δ changed</b> " for i in changes.steps_changed}
            self.marks.update({i: "<b>Δ new</b> " for i in changes.steps_added})
        self.t = trace
        self.r = trace["results"]
        self.system = trace["project"]["units"]
        self.input_text = input_text
        self.figures = figures
        self.typeset: set[str] = set()  # equations already typeset, by function
        self.s = style.styles()
        self.figure_count = 0
        self.refs = {key: n for n, key in enumerate(trace["references"], start=1)}
        try:
            self.entered = tomllib.loads(input_text)
        except tomllib.TOMLDecodeError:
            self.entered = {}
        self.section_number = 0

    # -- helpers ---------------------------------------------------------------------------
    def p(self, markup: str, st: Any = None) -> Paragraph:
        return Paragraph(markup, st or self.s.body)

    def heading(self, title: str, level: int = 1, numbered: bool = True) -> Paragraph:
        if not numbered:
            label = title
        elif level == 1:
            self.section_number += 1
            self.sub_number = 0
            label = f"{self.section_number}  {title}"
        else:
            self.sub_number += 1
            label = f"{self.section_number}.{self.sub_number}  {title}"
        para = Paragraph(escape(label), self.s.h1 if level == 1 else self.s.h2)
        para._toc = (level - 1, label)  # type: ignore[attr-defined]
        return para

    def q(self, quantity: dict[str, Any] | None, kind: str | None = None, sig: int = 4) -> str:
        if quantity is None:
            return "—"
        unit = quantity["unit"]
        kind = kind or KIND_OF_SI_UNIT.get(unit)
        if kind is None:
            return f"{fmt(quantity['value'], sig)} {pretty_unit(unit)}".strip()
        return show(quantity, kind, self.system, sig)

    def q_both(self, quantity: dict[str, Any], kind: str | None = None) -> str:
        """SI value, and the US value beside it in a US report."""
        kind = kind or KIND_OF_SI_UNIT.get(quantity["unit"])
        si = show(quantity, kind, "SI") if kind else self.q(quantity)
        us = show(quantity, kind, "US") if self.system == "US" and kind else si
        return si if us == si else f"{si} ({us})"  # kWh, rpm and s are the same in both

    def table(
        self,
        rows: list[list[Any]],
        widths: list[float],
        header: bool = True,
        extra: list[tuple[Any, ...]] | None = None,
    ) -> Table:
        cells = [
            [c if isinstance(c, Flowable) else Paragraph(str(c), self.s.cell) for c in row]
            for row in rows
        ]
        table = Table(cells, colWidths=widths, repeatRows=1 if header else 0, hAlign="LEFT")
        commands: list[tuple[Any, ...]] = [
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LINEBELOW", (0, 0), (-1, -1), 0.25, style.RULE),
            ("TOPPADDING", (0, 0), (-1, -1), 2),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
            ("LEFTPADDING", (0, 0), (-1, -1), 3),
            ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ]
        if header:
            commands += [
                ("BACKGROUND", (0, 0), (-1, 0), style.SHADE),
                ("LINEBELOW", (0, 0), (-1, 0), 0.8, style.INK),
            ]
        table.setStyle(TableStyle(commands + (extra or [])))
        return table

    def figure(self, key: str) -> list[Flowable]:
        fig = self.figures.get(key)
        if fig is None:
            return []
        from calcreport.report.vector import ChartFlowable

        self.figure_count += 1
        caption = f"Figure {self.figure_count} — {text(fig.title)}"
        return [KeepTogether([ChartFlowable(fig.figure), self.p(caption, self.s.caption)])]

    def ref(self, key: str) -> str:
        return f"[{self.refs[key]}]" if key in self.refs else f"[{text(key)}]"

    def entered_value(self, key: str) -> str:
        node: Any = self.entered
        for part in re.findall(r"[^.\[\]]+|\[\d+\]", key):
            if part.startswith("["):
                index = int(part[1:-1]) - 1
                if not isinstance(node, list) or index >= len(node):
                    return ""
                node = node[index]
            else:
                if not isinstance(node, dict) or part not in node:
                    return ""
                node = node[part]
        return "" if isinstance(node, dict | list) else str(node)

    @property
    def width(self) -> float:
        page_w, _ = style.page_size(self.system)
        return page_w - style.PAGE["margin_left"] - style.PAGE["margin_right"]

    # -- sections --------------------------------------------------------------------------
    def story(self) -> list[Flowable]:
        story: list[Flowable] = []
        story += self.cover()
        story += [NextPageTemplate("body"), PageBreak()]
        story += self.summary()
        if self.changes is not None:
            story += [PageBreak()] + self.changes_page()
        story += [PageBreak()] + self.contents()
        story += [PageBreak()] + self.at_a_glance()
        story += [PageBreak()] + self.basis()
        story += [PageBreak()] + self.calculation()
        story += [CondPageBreak(80 * mm)] + self.checks()
        story += [PageBreak()] + self.charts()
        story += [CondPageBreak(90 * mm)] + self.cautions()
        story += [CondPageBreak(60 * mm)] + self.references()
        story += [PageBreak()] + self.appendix()
        return story

    def cover(self) -> list[Flowable]:
        pr = self.t["project"]
        s = self.s
        status = self.t["status"]
        out: list[Flowable] = [Spacer(1, 4 * mm)]
        out.append(self.p("PUMP-SYSTEM CALCULATION", s.cover_sub))
        out.append(self.p(text(pr["title"]), s.cover_title))
        if pr["client"]:
            out.append(self.p(f"Client: {text(pr['client'])}", s.cover_sub))
        out.append(Spacer(1, 6 * mm))
        meta = [
            [
                "Calculation no.",
                text(pr["calc_id"] or "—"),
                "Revision",
                text(pr["revision"] or "—"),
            ],
            [
                "Date",
                text(pr["date"] or "—"),
                "Units",
                "SI" if self.system == "SI" else "US customary",
            ],
        ]
        out.append(self.table(meta, [32 * mm, 60 * mm, 25 * mm, 50 * mm], header=False))
        out.append(Spacer(1, 6 * mm))
        label = status["value"].upper()
        banner = Table(
            [
                [Paragraph(f"STATUS: {escape(label)}", s.status)],
                [Paragraph(escape(status["reason"]), s.small)],
            ],
            colWidths=[self.width],
        )
        banner.setStyle(
            TableStyle(
                [
                    ("BOX", (0, 0), (-1, -1), 1.2, style.INK),
                    ("BACKGROUND", (0, 0), (-1, 0), style.SHADE),
                    ("ALIGN", (0, 0), (-1, -1), "CENTER"),
                ]
            )
        )
        out.append(banner)
        out.append(Spacer(1, 6 * mm))
        system = self.system_phrase()
        preliminary = "pump.curve.flow[1]" not in self.t["given"]
        route = self.r.get("route", {})
        surge = self.r.get("surge", {})
        out.append(
            self.p(
                _template(
                    "scope.j2",
                    system=system,
                    preliminary=preliminary,
                    route="min_pressure_head" in route or "max_pressure" in route,
                    ratings="rating_check" in route,
                    surge=str(surge.get("event", "")).replace("_", " ") if surge else "",
                    flow=self.q(self.r.get("duty_point", self.r)["flow"], "flow"),
                    purpose=pr.get("report", {}).get("purpose", ""),
                    exclusions=pr.get("report", {}).get("exclusions", []),
                )
            )
        )
        out.append(Spacer(1, 4 * mm))
        sign = [
            ["", "Name / role", "Signature", "Date"],
            ["Prepared by", text(pr["prepared_by"]), "", text(pr["date"])],
            ["Checked by", text(pr["checked_by"]), "", ""],
            ["Approved by", "", "", ""],
        ]
        table = Table(
            [[Paragraph(str(c), s.cell) for c in row] for row in sign],
            colWidths=[28 * mm, 55 * mm, 55 * mm, 30 * mm],
            rowHeights=[5.5 * mm] + [10 * mm] * 3,
            hAlign="LEFT",
        )
        table.setStyle(
            TableStyle(
                [
                    ("BOX", (0, 0), (-1, -1), 0.6, style.INK),
                    ("INNERGRID", (0, 0), (-1, -1), 0.3, style.RULE),
                    ("BACKGROUND", (0, 0), (-1, 0), style.SHADE),
                    ("VALIGN", (0, 0), (-1, -1), "TOP"),
                ]
            )
        )
        out.append(table)
        out.append(Spacer(1, 5 * mm))
        history = pr.get("revisions") or [
            {
                "revision": pr["revision"] or "—",
                "date": pr["date"],
                "description": "Issued for checking" if preliminary else "Issued",
                "prepared_by": pr["prepared_by"],
                "checked_by": pr["checked_by"],
            }
        ]
        # The cover holds the latest revisions; the input (Appendix C) holds them all.
        earlier = len(history) - COVER_REVISIONS
        revisions = [["Rev.", "Date", "Description", "Prepared", "Checked"]] + [
            [
                text(row[key])
                for key in ("revision", "date", "description", "prepared_by", "checked_by")
            ]
            for row in history[-COVER_REVISIONS:]
        ]
        if earlier > 0:
            revisions.insert(
                1, ["…", "", f"{earlier} earlier revision{'s' if earlier > 1 else ''}: see the "
                    "input as entered (Appendix C)", "", ""]
            )  # fmt: skip
        stamp = Table(
            [[Paragraph("Engineer's seal / stamp", s.small)]],
            colWidths=[45 * mm],
            rowHeights=[32 * mm],
        )
        stamp.setStyle(
            TableStyle(
                [("BOX", (0, 0), (-1, -1), 0.6, style.INK), ("VALIGN", (0, 0), (-1, -1), "TOP")]
            )
        )
        rev = self.table(revisions, [12 * mm, 22 * mm, 40 * mm, 25 * mm, 25 * mm])
        out.append(
            Table(
                [[rev, stamp]],
                colWidths=[self.width - 48 * mm, 48 * mm],
                style=[("VALIGN", (0, 0), (-1, -1), "TOP"), ("LEFTPADDING", (0, 0), (-1, -1), 0)],
            )
        )
        return out

    def system_phrase(self) -> str:
        fluid = self.t["given"].get("fluid.temperature")
        temperature = self.q(fluid, "temperature") if fluid else ""
        kind = self.entered.get("fluid", {}).get("kind", "water")
        liquid = (
            "water"
            if kind == "water"
            else text(self.entered.get("fluid", {}).get("name", "the liquid"))
        )
        pipes = self.r["pipes"]
        source = self.q(self.t["given"]["source.level"], "length")
        destination = self.q(self.t["given"]["destination.level"], "length")
        return (
            f"the transfer of {liquid} at {temperature} from the source surface at "
            f"{source} to the destination surface at {destination} through "
            f"{len(pipes)} pipe{'s' if len(pipes) != 1 else ''} "
            f"({', '.join(text(p) for p in pipes)})"
        )

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
                    self.q(res["flow"], "flow"),
                    self.q(res["total_dynamic_head"], "length"),
                    fmt(eff["value"], 3) if eff else "—",
                    self.q(res["npsh_available"], "length"),
                    self.q(point.get("npsh_required"), "length"),
                    fmt(ratio["value"], 3) if ratio else "—",
                    self.q(res.get("shaft_power"), "power"),
                    self.q(res.get("electrical_power"), "power"),
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
            parts = [f"annual energy {self.q(energy['annual_energy'], 'energy', 5)}{basis}"]
            if "specific_energy" in energy:
                parts.append(f"specific energy {self.q(energy['specific_energy'])}")
            if "annual_cost" in energy:
                cost = energy["annual_cost"]
                parts.append(f"annual energy cost {cost['value']:,.0f} {text(cost['unit'])}")
            out.append(self.p("<b>Energy:</b> " + "; ".join(parts) + "."))
        route, surge = self.r.get("route", {}), self.r.get("surge", {})
        parts = []
        if "min_pressure_head" in route:
            parts.append(
                f"lowest pressure head {self.q(route['min_pressure_head'], 'length')} at "
                f"{text(route['min_pressure_node'])} ({text(route['min_pressure_case'])})"
            )
        if "max_pressure" in route:
            parts.append(
                f"highest pressure {self.q(route['max_pressure'], 'pressure')}(g) at "
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
        if "pump.curve.flow[1]" not in self.t["given"] and not items:
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
        curve = "pump.curve.flow[1]" in given
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
            series = "IEC 60072-1" if motor["series"] == "IEC" else "NEMA MG 1"
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

    def changes_page(self) -> list[Flowable]:
        """What moved since the previous revision's trace (given with build --previous)."""
        c = self.changes
        out: list[Flowable] = [self.heading("Changes since the previous revision")]
        old = c.old
        digest = str(old.get("input", {}).get("sha256", ""))[:16]
        out.append(
            self.p(
                f"Compared with the trace of revision {text(old.get('revision') or '—')} "
                f"(input SHA-256 {text(digest)}…). "
                f"Steps whose value moved are marked Δ in the calculation and in Appendix A: "
                f"{len(c.steps_changed)} changed, {len(c.steps_added)} new, "
                f"{len(c.steps_removed)} removed."
            )
        )

        def rows(changes: Any, limit: int) -> list[list[str]]:
            out_rows = [["Item", "Previous", "Now", "Change"]]
            for ch in list(changes)[:limit]:
                pct = "—" if ch.change_percent is None else f"{ch.change_percent:+.3g} %"
                unit = getattr(ch, "unit", "") or ""
                old_unit = getattr(ch, "old_unit", None) or unit
                out_rows.append(
                    [
                        text(ch.key),
                        text(_short(ch.old, old_unit, ch.key, self.system)),
                        text(_short(ch.new, unit, ch.key, self.system)),
                        pct,
                    ]
                )
            return out_rows

        w = self.width
        widths = [w * 0.46, w * 0.2, w * 0.2, w * 0.14]
        for title, items in (
            ("Inputs", c.inputs),
            ("Project", c.project),
            (
                "Results",
                [
                    r
                    for r in c.results
                    if "." not in r.key.split("[")[0]
                    or r.key.startswith(("energy.", "motor.", "operating_point."))
                ],
            ),
        ):
            if items:
                out.append(self.heading(title, 2))
                out.append(self.table(rows(items, 40), widths))
        if c.checks:
            out.append(self.heading("Design checks", 2))
            check_rows = [["Check", "Case", "Previous", "Now"]]
            for ch in c.checks:
                check_rows.append(
                    [
                        text(ch.id),
                        text(ch.case),
                        text(ch.old_status or "—"),
                        text(ch.new_status or "—"),
                    ]
                )
            out.append(self.table(check_rows, [w * 0.5, w * 0.14, w * 0.18, w * 0.18]))
        return out

    def conclusion(self) -> str:
        fails = [c for c in self.t["checks"] if c["status"] == "fail"]
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
        reviews = [c for c in self.t["checks"] if c["status"] == "review"]
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
        duty = next((c for c in self.t["checks"] if c["id"] == "duty_flow"), None)
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

    def contents(self) -> list[Flowable]:
        return [Paragraph("Contents", self.s.h1), _ContentsMark()]

    def at_a_glance(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("The system at a glance")]
        out += self.figure("sketch")
        out += self.figure("profile")
        rows = [["Pipe", "Side", "Length", "Inner diameter", "Roughness", "Fittings (K × count)"]]
        for ident, p in self.r["pipes"].items():
            fittings = self.fitting_list(ident)
            rows.append(
                [
                    text(ident),
                    p["side"].replace("_", " "),
                    self.q(p["length"], "length"),
                    self.q(p["inner_diameter"], "diameter"),
                    self.q(p["roughness"], "roughness", 3),
                    fittings,
                ]
            )
        w = self.width
        out.append(self.table(rows, [w * 0.08, w * 0.1, w * 0.12, w * 0.14, w * 0.12, w * 0.44]))
        for ident, p in self.r["pipes"].items():
            for what, source in p.get("sources", {}).items():
                out.append(
                    self.p(
                        f"{text(ident)} {what.replace('_', ' ')} from the catalog: {text(source)}",
                        self.s.small,
                    )
                )
        return out

    def fitting_list(self, ident: str) -> str:
        step = self.step(f"pipe.{ident}.k_total")
        parts: list[list[Any]] = []  # [item, count], one per distinct fitting in a run
        args = step["arguments"]
        for K, count_source, count in zip(
            args["K"]["value"], args["count"]["from"], args["count"]["value"], strict=True
        ):
            base = count_source.rsplit(".", 1)[0]
            kind = self.entered_value(f"{base}.kind")
            label = self.entered_value(f"{base}.note") or kind.replace("_", " ") or "item"
            how = f" ({text(kind)}, catalog)" if kind else ""
            item = f"{text(label)}{how}: K {fmt(K, 3)}"
            if parts and parts[-1][0] == item:  # the same item again: one entry, counted
                parts[-1][1] += count
            else:
                parts.append([item, count])
        listed = [f"{item} × {fmt(count, 3)}" for item, count in parts]
        for n in range(1, 100):
            rated = self.steps_by_id.get(f"pipe.{ident}.equipment[{n}]")
            if rated is None:
                break
            listed.append(
                f"{text(rated['title'].replace('Loss of ', ''))}: rated loss "
                f"{self.q_both(rated['arguments']['dp'], 'pressure')} at "
                f"{self.q(rated['arguments']['Q_rated'], 'flow')}"
            )
        if len(listed) > MAX_FITTINGS_LISTED:  # a table row cannot break across pages
            more = len(listed) - MAX_FITTINGS_LISTED
            listed = [*listed[:MAX_FITTINGS_LISTED], f"and {more} more (step pipe.{ident}.k_total)"]
        return "; ".join(listed) or "none"

    @property
    def steps_by_id(self) -> dict[str, dict[str, Any]]:
        if not hasattr(self, "_steps"):
            self._steps = {s["id"]: s for s in self.t["steps"]}
        return self._steps

    def step(self, step_id: str) -> dict[str, Any]:
        return self.steps_by_id[step_id]

    def basis(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Basis of the calculation")]
        out.append(self.heading("Conventions", 2))
        box = [
            [self.p(f"C{n}. {line}", self.s.small)]
            for n, line in enumerate(
                _lines(
                    "conventions.j2",
                    us=self.system == "US",
                    route="max_pressure" in self.r.get("route", {}),
                ),
                1,
            )
        ]
        conventions = Table(box, colWidths=[self.width])
        conventions.setStyle(
            TableStyle(
                [
                    ("BOX", (0, 0), (-1, -1), 0.8, style.INK),
                    ("BACKGROUND", (0, 0), (-1, -1), style.SHADE),
                ]
            )
        )
        out.append(conventions)
        out.append(self.heading("Assumptions", 2))
        for a in self.t["assumptions"]:
            value = f" ({text(a['value'])})" if a.get("value") else ""
            quantity = a.get("quantity")
            if quantity and KIND_OF_SI_UNIT.get(quantity["unit"]):  # in the report's units
                value = f" ({self.q(quantity)})"
            out.append(self.p(f"<b>{a['id']}</b>  {text(a['text'])}{value}"))
        out.append(self.heading("Design criteria", 2))
        rows = [["Criterion", "Limit", "Basis", "Source"]]
        seen = set()
        for c in self.t["checks"]:
            key = (c["id"].split(".")[0], c["limit"]["value"] if c["limit"] else None)
            if key in seen or c["limit"] is None:
                continue
            seen.add(key)
            source = (
                "common practice, no published source"
                if c["reference"] == "common_practice"
                else self.ref(c["reference"])
            )
            rows.append(
                [
                    text(c["title"].split(" in ")[0]),
                    f"{c['comparison']} {self.q(c['limit'])}",
                    text(c["basis"]),
                    source,
                ]
            )
        w = self.width
        out.append(self.table(rows, [w * 0.2, w * 0.14, w * 0.46, w * 0.2]))
        out.append(self.heading("Inputs as entered and as used (SI)", 2))
        rows = [["Input key", "As entered", "As used (SI)"]]
        for key, q in self.t["given"].items():
            entered = self.entered_value(key)
            si = f"{fmt(q['value'], 6)} {pretty_unit(q['unit'])}".strip()
            if "pressure" in key and q["unit"] == "Pa":
                si += " (abs)" if key == "site.station_pressure" else " (gauge)"
            rows.append([self.p(text(key), self.s.mono), text(entered), si])
        out.append(self.table(rows, [w * 0.42, w * 0.3, w * 0.28]))
        return out

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
        others = [c["id"] for c in self.t["cases"] if c["id"] != "C1"]
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
                cases = self.governing_cases()
                steps = [
                    st
                    for st in self.t["steps"]
                    if _CASE_PREFIX.sub("", st["id"]).startswith(prefixes)
                    and (st.get("case") or "C1") in cases
                ]
            else:
                steps = [st for st in self.t["steps"] if st["id"].startswith(prefixes)]
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
        """C1 and the cases named by the route and surge checks and results."""
        cases = {"C1", self.r.get("surge", {}).get("case", "C1")}
        cases.add(self.r.get("route", {}).get("min_pressure_case", "C1"))
        cases |= {c["case"] for c in self.t["checks"] if c["id"].split(".")[0] in _ROUTE_CHECKS}
        return cases

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
        # One worked step of each equation, those of the case that governs the lowest
        # pressure first; every step is listed in Appendix A.
        low = next((c["case"] for c in self.t["checks"] if c["id"] == "min_pressure"), "C1")
        steps = sorted(steps, key=lambda st: (st.get("case") or "C1") != low)
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
        return out + self.examples(steps)

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

    def check_table(self, checks: list[dict[str, Any]], basis: bool = True) -> Table:
        """The checks with their values and limits; with ``basis``, each criterion's basis
        and source (the summary leaves them to the design-checks section)."""
        rows = [["Status", "Check", "Case", "Value", "Limit", "Basis"][: 6 if basis else 5]]
        extra: list[tuple[Any, ...]] = []
        for n, c in enumerate(checks, start=1):
            unit = (c["value"] or c["limit"] or {"unit": ""})["unit"]
            kind = KIND_OF_SI_UNIT.get(unit)
            gauge = "(g)" if kind == "pressure" else ""  # checked pressures are gauge
            value = self.q(c["value"], kind) + gauge if c["value"] else "—"
            if c["value"] and not kind:  # a ratio, or a unit the report has no kind for
                unit = pretty_unit(c["value"]["unit"])
                value = f"{c['value']['value']:.4g} {unit}".strip()
            limit = (
                f"{c['comparison']} {self.q(c['limit'], kind)}{gauge}"
                if c["limit"]
                else text(c["comparison"])
            )
            source = (
                "common practice"
                if c["reference"] == "common_practice"
                else self.ref(c["reference"])
            )
            message = f"<br/><i>{text(c['message'])}</i>" if c["message"] else ""
            rows.append(
                [
                    c["status"].upper(),
                    text(c["title"]) + message,
                    text(c["case"]),
                    value,
                    limit,
                    f"{text(c['basis'])} ({source})",
                ][: 6 if basis else 5]
            )
            extra += [
                ("BACKGROUND", (0, n), (0, n), style.STATUS_FILL[c["status"]]),
                ("TEXTCOLOR", (0, n), (0, n), style.STATUS_INK[c["status"]]),
            ]
        w = self.width
        widths = (
            [w * 0.09, w * 0.25, w * 0.06, w * 0.11, w * 0.12, w * 0.37]
            if basis
            else [w * 0.09, w * 0.55, w * 0.08, w * 0.13, w * 0.15]
        )
        table = self.table(rows, widths)
        for n, c in enumerate(checks, start=1):
            table._cellvalues[n][0] = Paragraph(
                f"<font color='{'white' if c['status'] == 'fail' else 'black'}'><b>"
                f"{c['status'].upper()}</b></font>",
                self.s.cell,
            )
        table.setStyle(TableStyle(extra))
        return table

    def checks(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Design checks")]
        out.append(
            self.p(
                "Sorted fail, review, pass. A limit of common practice is a rule of "
                "thumb for review, not a code requirement; a limit the project sets in "
                "its input fails when exceeded."
            )
        )
        out.append(self.check_table(self.t["checks"]))
        return out

    def charts(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Charts")]
        for key in ("system_curve", "npsh", "loss_breakdown"):
            out += self.figure(key)
        return out

    def cautions(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Exclusions, cautions and code-deferral notes")]
        out.append(self.heading("Cautions from this calculation's results", 2))
        specific = [
            f"{text(c['title'])} ({text(c['case'])}): {c['status']}"
            + (f" — {text(c['message'])}" if c["message"] else "")
            for c in self.t["checks"]
            if c["status"] != "pass"
        ]
        specific += [text(n) for n in self.t["notes"]]
        for a in self.t["assumptions"]:
            if "efficiency" in a["text"].lower():
                specific.append(f"Assumption {a['id']}: {text(a['text'])}")
        if "pump.efficiency" in self.t["given"]:
            specific.append(
                "The pump efficiency is an assumed value until a pump is selected; "
                "shaft and electrical power scale inversely with it."
            )
        for n, item in enumerate(specific or ["None."], start=1):
            out.append(self.p(f"{n}. {item}"))
        out.append(self.heading("Standing cautions and code deferral", 2))
        extra = [text(c) for c in self.t["project"].get("report", {}).get("cautions", [])]
        assessed = "rating_check" in self.r.get("route", {}) or "surge" in self.r
        for n, line in enumerate(_lines("cautions.j2", assessed=assessed) + extra, start=1):
            out.append(self.p(f"{n}. {line}"))
        return out

    def references(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("References")]
        for key, citation in self.t["references"].items():
            out.append(
                self.p(
                    f"[{self.refs[key]}] {text(citation)} "
                    f"<font name='DejaVuMono' size='7'>({text(key)})</font>"
                )
            )
        return out

    def appendix(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Appendix A — Full step listing", numbered=False)]
        out.append(
            self.p(
                "Every step of every case, in the order computed: its substituted equation, "
                "result and inputs. Each equation is typeset once, with its first worked step "
                "(in the calculation section, or here)."
            )
        )
        for st in self.t["steps"]:
            out += self.step_block(st, typeset=st["function"] not in self.typeset)
        out += [
            PageBreak(),
            self.heading("Appendix B — Darcy friction factor chart", numbered=False),
        ]
        out += self.figure("friction_factor")
        out += [
            PageBreak(),
            self.heading("Appendix C — Files read and the input as entered", numbered=False),
        ]
        inp = self.t["input"]
        sw = self.t.get("software", {})
        rows = [
            ["File", "SHA-256"],
            [f"{text(inp['path'])} (input)", self.p(text(inp["sha256"]), self.s.mono)],
        ]
        rows += [
            [
                f"{text(f['path'])} ({text(f.get('role', 'data'))})",
                self.p(text(f["sha256"]), self.s.mono),
            ]
            for f in inp.get("files", [])
        ]
        out.append(self.table(rows, [self.width * 0.4, self.width * 0.6]))
        out.append(
            self.p(
                f"Produced by {text(sw.get('name', 'calcreport'))} "
                f"{text(sw.get('version', ''))}; trace format {text(self.t['format'])}.",
                self.s.small,
            )
        )
        from calcreport.recheck import SCOPE

        out.append(
            self.p(
                f"<b>Checking this calculation by machine.</b> The trace file written beside this "
                f"report can be rechecked with <font name='DejaVuMono'>calcreport recheck</font>. "
                f"{text(SCOPE)} Catalog data version (SHA-256) "
                f"{text(sw.get('catalog_sha256', '—'))}.",
                self.s.small,
            )
        )
        out.append(self.p(f"Input echoed verbatim (SHA-256 {text(inp['sha256'])}):", self.s.small))
        # A monospaced line holds a fixed count of characters: longer lines are cut into
        # pieces of that count (each ending in ↩), so layout time stays linear in the input.
        from reportlab.pdfbase.pdfmetrics import stringWidth

        mono = self.s.mono
        per_line = max(20, int(self.width / stringWidth("M", mono.fontName, mono.fontSize)) - 1)
        for line in self.input_text.splitlines() or [""]:
            pieces = [line[i : i + per_line] for i in range(0, len(line), per_line)] or [""]
            for n, piece in enumerate(pieces, start=1):
                shown = text(piece).replace(" ", "&nbsp;") + ("↩" if n < len(pieces) else "")
                out.append(Paragraph(shown or "&nbsp;", mono))
        return out


class _ContentsMark(Flowable):
    """Where the contents list starts; the canvas writes it once every page is known."""

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        return available_width, 0.0

    def draw(self) -> None:
        x, y = self.canv.absolutePosition(0, 0)
        self.canv._contents_at = (self.canv.getPageNumber(), x, y)


class _Doc(BaseDocTemplate):
    """Collects every heading with its page, for the outline and the contents page."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self.headings: list[tuple[int, str, int, str]] = []
        self.step_pages: dict[str, list[int]] = {}

    def afterFlowable(self, flowable: Flowable) -> None:
        step = getattr(flowable, "_step", None)
        if step is not None:
            pages = self.step_pages.setdefault(step, [])
            if self.page not in pages:
                pages.append(self.page)
        toc = getattr(flowable, "_toc", None)
        if toc is not None:
            level, label = toc
            key = f"h{len(self.headings)}"
            self.canv.bookmarkPage(key)
            self.canv.addOutlineEntry(label, key, level=level, closed=level > 0)
            self.headings.append((level, label, self.page, key))


def _canvas_maker(
    project: dict[str, Any], status: str, headings: list[tuple[int, str, int, str]]
) -> Callable[..., rl_canvas.Canvas]:
    """A canvas that draws, once every page is laid out, the title block with 'Page N of
    M' on each page and the contents list with page numbers: one build pass suffices."""

    class TitleBlockCanvas(rl_canvas.Canvas):
        def __init__(self, *args: Any, **kwargs: Any) -> None:
            kwargs["invariant"] = 1
            super().__init__(*args, **kwargs)
            self._pages: list[dict[str, Any]] = []

        def showPage(self) -> None:
            self._pages.append(dict(self.__dict__))
            self._startPage()

        def save(self) -> None:
            total = len(self._pages)
            contents = self.__dict__.get("_contents_at")
            for state in self._pages:
                self.__dict__.update(state)
                self._title_block(total)
                if contents and contents[0] == self._pageNumber:
                    self._contents(contents[1], contents[2])
                super().showPage()
            super().save()

        def _contents(self, x: float, y: float) -> None:
            width, _ = self._pagesize
            right = width - style.PAGE["margin_right"]
            for level, label, page, key in headings:
                size = 9.5 if level == 0 else 8.6
                indent = 0.0 if level == 0 else 14.0
                y -= 15.0 if level == 0 else 12.5
                font = "DejaVu-Bold" if level == 0 else "DejaVu"
                self.setFont(font, size)
                self.setFillColor(style.INK)
                self.drawString(x + indent, y, label)
                number = str(page)
                start = x + indent + self.stringWidth(label, font, size) + 4
                end = right - self.stringWidth(number, font, size) - 4
                dots = int((end - start) / self.stringWidth(". ", "DejaVu", size))
                if dots > 0:
                    self.setFont("DejaVu", size)
                    self.setFillColor(style.RULE)
                    self.drawRightString(end, y, ". " * dots)
                self.setFont(font, size)
                self.setFillColor(style.INK)
                self.drawRightString(right, y, number)
                self.linkRect("", key, (x, y - 2, right, y + size), relative=0, thickness=0)

        def _title_block(self, total: int) -> None:
            width, height = self._pagesize
            left = style.PAGE["margin_left"]
            right = width - style.PAGE["margin_right"]
            top = height - 10 * mm
            h = style.PAGE["title_block_height"]
            self.saveState()
            self.setStrokeColor(style.INK)
            self.setLineWidth(0.8)
            self.rect(left, top - h, right - left, h)
            col1 = left + (right - left) * 0.55
            col2 = left + (right - left) * 0.78
            self.line(col1, top - h, col1, top)
            self.line(col2, top - h, col2, top)
            self.setFont("DejaVu-Bold", 8.5)
            title = project["title"]
            while self.stringWidth(title, "DejaVu-Bold", 8.5) > col1 - left - 6 and len(title) > 4:
                title = title[:-2]
            if title != project["title"]:
                title = title.rstrip() + "…"
            self.drawString(left + 3, top - 6 * mm, title)
            self.setFont("DejaVu", 7.2)
            self.drawString(left + 3, top - 11 * mm, (project["client"] or "")[:90])
            self.drawString(col1 + 3, top - 6 * mm, f"Calc. {project['calc_id'] or '—'}")
            self.drawString(
                col1 + 3, top - 11 * mm, f"Rev. {project['revision'] or '—'}   {project['date']}"
            )
            self.setFont("DejaVu-Bold", 8.5)
            self.drawString(col2 + 3, top - 6 * mm, f"Page {self._pageNumber} of {total}")
            units = "SI units" if project["units"] == "SI" else "US units"
            basis = f"{units} · {status}"
            size = 7.2  # shrunk, never clipped, to fit the block's last column
            while self.stringWidth(basis, "DejaVu", size) > right - col2 - 6 and size > 5:
                size -= 0.2
            self.setFont("DejaVu", size)
            self.drawString(col2 + 3, top - 11 * mm, basis)
            self.setFont("DejaVu", 6.5)
            self.setFillColor(style.RULE)
            self.drawString(
                left,
                9 * mm,
                "Calculation prepared with calcreport from the input "
                "and trace named in Appendix C. Verify before use.",
            )
            self.restoreState()

    return TitleBlockCanvas


def render_pdf(
    trace: dict[str, Any], input_text: str, figures: dict[str, Any], changes: Any = None
) -> tuple[bytes, dict[str, list[int]]]:
    """The PDF report of ``trace`` (deterministic bytes) and the pages of every step."""
    report = _Report(trace, input_text, figures, changes)
    project = trace["project"]
    size = style.page_size(report.system)
    buffer = io.BytesIO()
    doc = _Doc(
        buffer,
        pagesize=size,
        leftMargin=style.PAGE["margin_left"],
        rightMargin=style.PAGE["margin_right"],
        topMargin=style.PAGE["margin_top"],
        bottomMargin=style.PAGE["margin_bottom"],
        title=f"{project['calc_id']} {project['title']}".strip(),
        author=project["prepared_by"] or "calcreport",
        subject=f"Pump-system calculation, revision {project['revision']}".strip(),
        creator="calcreport",
        invariant=1,
    )
    frame = Frame(doc.leftMargin, doc.bottomMargin, doc.width, doc.height, id="body")
    doc.addPageTemplates([PageTemplate("cover", [frame]), PageTemplate("body", [frame])])
    doc.build(
        report.story(), canvasmaker=_canvas_maker(project, trace["status"]["value"], doc.headings)
    )
    return buffer.getvalue(), doc.step_pages


_INDEXED = re.compile(r"^(.*)\[(\d+)\]$")


def _key_runs(keys: Sequence[str]) -> list[str]:
    """Input keys with each run of three or more consecutive indices written as one:
    ``pump.curve.flow[1]``, ``[2]``, … ``[81]`` become ``pump.curve.flow[1–81]``."""
    out: list[str] = []
    run: list[tuple[str, int]] = []

    def close() -> None:
        if len(run) >= 3:
            out.append(f"{run[0][0]}[{run[0][1]}–{run[-1][1]}]")
        else:
            out.extend(f"{name}[{i}]" for name, i in run)
        run.clear()

    for key in keys:
        m = _INDEXED.match(key)
        if m and run and m.group(1) == run[-1][0] and int(m.group(2)) == run[-1][1] + 1:
            run.append((m.group(1), int(m.group(2))))
            continue
        close()
        if m:
            run.append((m.group(1), int(m.group(2))))
        else:
            out.append(key)
    close()
    return out
