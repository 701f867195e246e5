"""The closing chapters: design checks, charts, cautions and code deferral, references, and
the appendices (full step listing, friction-factor chart, files read and the input).
"""

from __future__ import annotations

from typing import Any

from reportlab.lib.units import mm
from reportlab.platypus import CondPageBreak, Flowable, PageBreak, Paragraph, TableStyle

from calcreport.report import style
from calcreport.report.sections.common import _lines, text
from calcreport.report.style import Table
from calcreport.units import KIND_OF_SI_UNIT, pretty_unit

# Passing checks of one kind in more pipes than this print as one row (the pipe nearest
# its limit); a design check that does not pass always has its own row.
GROUP_PIPE_CHECKS = 8
MAX_ECHO_LINES = 400  # a longer input is attached, not echoed (four pages in two columns)


class ClosingSections:
    """Design checks, charts, cautions, references and the appendices."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    def check_table(self, checks: list[dict[str, Any]], basis: bool = True) -> Table:
        """The checks with their values and limits; with ``basis``, each criterion's basis
        and source (the summary leaves them to the design-checks section)."""
        rows = [["Status", "Check", "Case", "Value", "Limit", "Basis"][: 6 if basis else 5]]
        extra: list[tuple[Any, ...]] = []
        stated: dict[str, str] = {}  # a basis printed in full -> the check that states it
        for n, c in enumerate(checks, start=1):
            unit = (c["value"] or c["limit"] or {"unit": ""})["unit"]
            kind = KIND_OF_SI_UNIT.get(unit)
            gauge = "(g)" if kind == "pressure" else ""  # checked pressures are gauge
            value = self.q(c["value"], kind) + gauge if c["value"] else "—"
            if c["value"] and not kind:  # a ratio, or a unit the report has no kind for
                unit = pretty_unit(c["value"]["unit"])
                value = f"{c['value']['value']:.4g} {unit}".strip()
            if c.get("step"):  # the number links to the step it comes from
                value = self.link(c["step"], value)
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
            # A basis shared by several checks (one criterion on every pipe) is stated
            # once; the later rows name the check that states it.
            said = f"{text(c['basis'])} ({source})"
            first = stated.setdefault(said, c["title"])
            said = said if first == c["title"] else f"As for {text(first)}."
            rows.append(
                [
                    c["status"].upper(),
                    text(c["title"]) + message,
                    text(c["case"]),
                    value,
                    limit,
                    said,
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
        checks, grouped = self.grouped_checks(self.t["checks"])
        if grouped:
            out.append(
                self.p(
                    "Where more than "
                    f"{GROUP_PIPE_CHECKS} pipes pass one check against one limit, the check "
                    "is one row: the pipe nearest its limit, with the count of pipes; each "
                    "pipe's check is in the trace and the attached listing.",
                    self.s.small,
                )
            )
        out.append(self.check_table(checks))
        return out

    def grouped_checks(self, checks: list[dict[str, Any]]) -> tuple[list[dict[str, Any]], bool]:
        """The checks with each family of passing per-pipe checks (one check id less its
        pipe, one limit and comparison) of more than GROUP_PIPE_CHECKS pipes as one row:
        the member with the least margin, titled with the count of pipes. Checks that do
        not pass stay one row each."""
        pipes = set(self.r.get("pipes", {}))
        families: dict[tuple[Any, ...], list[dict[str, Any]]] = {}
        for c in checks:
            family, _, pipe = c["id"].rpartition(".")
            if c["status"] == "pass" and pipe in pipes and family:
                limit = c["limit"]["value"] if isinstance(c["limit"], dict) else c["limit"]
                families.setdefault((family, limit, c["comparison"]), []).append(c)
        big = {id(c): key for key, members in families.items()
               if len(members) > GROUP_PIPE_CHECKS for c in members}  # fmt: skip
        out: list[dict[str, Any]] = []
        done: set[tuple[Any, ...]] = set()
        for c in checks:
            key = big.get(id(c))
            if key is None:
                out.append(c)
                continue
            if key in done:
                continue
            done.add(key)
            members = families[key]
            nearest = min(members, key=lambda m: (m["margin"] is None, m["margin"] or 0.0))
            pipe = nearest["id"].rpartition(".")[2]
            out.append(
                {
                    **nearest,
                    "title": f"{nearest['title']}: {len(members)} pipes pass, {pipe} "
                    "nearest its limit",
                }
            )
        return out, bool(done)

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
        """Appendix A (the friction chart), B (files and the input) and, when the listing is
        printed, C (every step of every state)."""
        out: list[Flowable] = [
            self.heading("Appendix A — Darcy friction factor chart", numbered=False)
        ]
        out += self.figure("friction_factor")
        out += [CondPageBreak(110 * mm)] + self.files_appendix()
        if self.listing == "full":
            out += [PageBreak()] + self.listing_appendix()
        return out

    def listing_appendix(self) -> list[Flowable]:
        out: list[Flowable] = [self.heading("Appendix C — Full step listing", numbered=False)]
        out.append(
            self.p(
                "Every step of every case, in the order computed: its substituted equation, "
                "result and inputs. Each equation is typeset once, with its first worked step "
                "(in the calculation section, or here)."
            )
        )
        for st in self.t["steps"]:
            out += self.step_block(st, typeset=st["function"] not in self.typeset)
        return out

    def files_appendix(self) -> list[Flowable]:
        out: list[Flowable] = [
            self.heading("Appendix B — Files read and the input as entered", numbered=False)
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

        mono = "<font name='DejaVuMono'>"
        if self.attached:
            out.append(
                self.p(
                    "<b>Files attached to this PDF.</b> The report carries the files it was "
                    "made from (PDF/A-3 associated files; a PDF reader lists them under "
                    "attachments), each with its SHA-256, also stated in its description:",
                    self.s.small,
                )
            )
            rows = [["Attached file", "Content", "SHA-256"]] + [
                [
                    self.p(text(a.name), self.s.small),
                    self.p(text(a.description), self.s.small),
                    self.p(text(a.sha256), self.s.mono),
                ]
                for a in self.attached
            ]
            out.append(self.table(rows, [self.width * 0.26, self.width * 0.26, self.width * 0.48]))
            where = (
                f"The attached trace can be rechecked from this PDF alone with "
                f"{mono}calcreport recheck REPORT.pdf</font>, which first confirms its SHA-256."
            )
        else:
            where = (
                f"The trace file written beside this report can be rechecked with "
                f"{mono}calcreport recheck</font>."
            )
        out.append(
            self.p(
                f"<b>Checking this calculation by machine.</b> {where} "
                f"{text(SCOPE)} Catalog data version (SHA-256) "
                f"{text(sw.get('catalog_sha256', '—'))}.",
                self.s.small,
            )
        )
        lines = self.input_text.splitlines() or [""]
        if len(lines) > MAX_ECHO_LINES:  # a raw listing of many pages: attached, not printed
            out.append(
                self.p(
                    f"The input ({len(lines)} lines, SHA-256 {text(inp['sha256'])}) is "
                    "attached to this PDF verbatim and not echoed in print; its values stand "
                    "in the tables of the system and of the inputs as used.",
                    self.s.small,
                )
            )
            return out
        out.append(self.p(f"Input echoed verbatim (SHA-256 {text(inp['sha256'])}):", self.s.small))
        # A monospaced line holds a fixed count of characters: longer lines are cut into
        # pieces of that count (each ending in ↩), so layout time stays linear in the input.
        from reportlab.pdfbase.pdfmetrics import stringWidth

        # A long input is set in two balanced columns: half the pages, the same lines.
        mono = self.s.mono
        columns = 2 if len(lines) > 60 else 1
        gap = 12.0
        column = (self.width - gap * (columns - 1)) / columns
        # less the ↩ and the columns' own padding
        per_line = max(
            20, int((column - 2 * gap) / stringWidth("M", mono.fontName, mono.fontSize)) - 2
        )
        echo: list[Flowable] = []
        for line in lines:
            pieces = [line[i : i + per_line] for i in range(0, len(line), per_line)] or [""]
            for n, piece in enumerate(pieces, start=1):
                shown = text(piece).replace(" ", "&nbsp;") + ("↩" if n < len(pieces) else "")
                echo.append(Paragraph(shown or "&nbsp;", mono))
        if columns == 1:
            return out + echo
        from reportlab.platypus.flowables import BalancedColumns

        return out + [BalancedColumns(echo, nCols=columns, spaceBefore=2, innerPadding=gap / 2)]
