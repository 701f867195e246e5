"""The contents, the system at a glance (sketch, profile, pipe table) and the basis of the
calculation: conventions, assumptions, design criteria, inputs as entered and as used.
"""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable, Paragraph, TableStyle

from calcreport.report import style
from calcreport.report.columns import TwoColumns
from calcreport.report.sections.common import (
    LONG_ROUTE_PIPES,
    MAX_FITTINGS_LISTED,
    _ContentsMark,
    _key_runs,
    _lines,
    runs,
    text,
)
from calcreport.report.style import Table
from calcreport.units import KIND_OF_SI_UNIT, fmt, pretty_unit, show

INPUT_ROWS_ONE_COLUMN = 40  # a longer table of inputs is set in two columns
MAX_PIPE_INPUT_ROWS = 300  # more pipe inputs than this: the pipes' table stands for them


class BasisSection:
    """The contents, the system at a glance and the basis of the calculation."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    def contents(self, height: float) -> list[Flowable]:
        """The contents heading and the room (``height``) its list takes."""
        return [Paragraph("Contents", self.s.h1), _ContentsMark(height)]

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
        long_route = len(self.r["pipes"]) > LONG_ROUTE_PIPES
        if long_route:
            rows = [rows[0], *runs(rows[1:])]
        out.append(self.table(rows, [w * 0.1, w * 0.1, w * 0.12, w * 0.14, w * 0.12, w * 0.42]))
        sources = [
            [text(ident), f"{what.replace('_', ' ')} from the catalog: {text(source)}"]
            for ident, p in self.r["pipes"].items()
            for what, source in p.get("sources", {}).items()
        ]
        if long_route:  # one line a run of pipes of one source
            by_what: dict[str, list[list[Any]]] = {}
            for ident, said in sources:
                by_what.setdefault(said, []).append([ident, said])
            sources = [row for group in by_what.values() for row in runs(group)]
        for ident, said in sources:
            out.append(self.p(f"{ident} {said}", self.s.small))
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
        given = self.t["given"]
        for key, q in given.items():
            if key.startswith("catalog."):
                continue
            entered = self.entered_value(key)
            si = f"{q['value']:.6g} {pretty_unit(q['unit'])}".strip()
            if "pressure" in key and q["unit"] == "Pa":
                si += "(abs)" if key == "site.station_pressure" else "(g)"
            rows.append([key, entered, si])
        pipes = [row for row in rows[1:] if row[0].startswith("pipe[")]
        if len(pipes) > MAX_PIPE_INPUT_ROWS:  # a long route: its pipes are tabled in section 2
            rows = [row for row in rows if not row[0].startswith("pipe[")]
            out.append(
                self.p(
                    f"The {len(pipes)} inputs of the {len(self.r['pipes'])} pipes are not "
                    "listed here: each pipe's length, diameter, roughness and fittings stand "
                    "in the table of section 2, and every value as entered in the input "
                    "attached to this PDF.",
                    self.s.small,
                )
            )
        if len(rows) <= INPUT_ROWS_ONE_COLUMN:
            out.append(self.plain_table(rows, [w * 0.42, w * 0.3, w * 0.28], mono=(0,)))
        else:  # a long table in two columns: half the pages, the same rows
            gap = 12.0
            half = (w - gap) / 2
            widths = [half * 0.52, half * 0.22, half * 0.26]
            out.append(
                TwoColumns(lambda part: self.plain_table(part, widths, mono=(0,)), rows, gap)
            )
        out += self.catalog_data_used()
        return out

    def catalog_data_used(self) -> list[Flowable]:
        """The catalog's values the steps used (not inputs): a run of a table's rows, such as
        a rating series, as one line."""
        given = {k: q for k, q in self.t["given"].items() if k.startswith("catalog.")}
        if not given:
            return []
        rows = [["Catalog datum", "Value used"]]
        for run in _key_runs(list(given)):
            if "–" in run:
                name, span = run[:-1].rsplit("[", 1)
                first, last = (int(i) for i in span.split("–"))
                low, high = given[f"{name}[{first}]"], given[f"{name}[{last}]"]
                value = f"{last - first + 1} values, {self._datum(low)} to {self._datum(high)}"
            else:
                value = self._datum(given[run])
            rows.append([self.p(text(run), self.s.mono), value])
        w = self.width
        return [
            self.heading("Catalog data used", 2),
            self.p(
                "Values the steps take from the tool's catalog (each table names its source; "
                "see References), in the report's units.",
                self.s.lead,
            ),
            self.table(rows, [w * 0.5, w * 0.5]),
        ]

    def _datum(self, quantity: dict[str, Any]) -> str:
        """A catalog value in the report's units, with the SI value beside it in a US report."""
        kind = KIND_OF_SI_UNIT.get(quantity["unit"])
        if kind is None:
            return f"{fmt(quantity['value'], 6)} {pretty_unit(quantity['unit'])}".strip()
        shown = self.q(quantity, kind)
        si = show(quantity, kind, "SI")
        return shown if shown == si else f"{shown} ({si} in SI)"
