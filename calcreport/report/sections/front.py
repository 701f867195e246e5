"""The front matter: the cover with its revision table and signature blocks, the system in a
phrase, and the page of changes since the previous revision.
"""

from __future__ import annotations

from typing import Any
from xml.sax.saxutils import escape

from reportlab.lib.units import mm
from reportlab.platypus import Flowable, Paragraph, Spacer, TableStyle

from calcreport.report import style
from calcreport.report.sections.common import COVER_REVISIONS, _short, _template, text
from calcreport.report.style import Table


class FrontMatter:
    """The cover, the system in a phrase and the page of changes."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

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
                    "input as entered (Appendix B)", "", ""]
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
        pipes = list(self.r["pipes"])
        # A long line's pipes by its first and last: the cover holds one page.
        named = pipes if len(pipes) <= 8 else [*pipes[:3], "…", pipes[-1]]
        source = self.q(self.t["given"]["source.level"], "length")
        destination = self.q(self.t["given"]["destination.level"], "length")
        return (
            f"the transfer of {liquid} at {temperature} from the source surface at "
            f"{source} to the destination surface at {destination} through "
            f"{len(pipes)} pipe{'s' if len(pipes) != 1 else ''} "
            f"({', '.join(text(p) for p in named)})"
        )

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
                f"Steps whose value moved are marked Δ in the calculation"
                f"{' and in Appendix C' if self.listing == 'full' else ''}: "
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
