"""The choice of pump: the offers ranked by life-cycle cost, each checked at every state, the
choice and why, and the offers' curves over the system curve."""

from __future__ import annotations

from typing import Any

from reportlab.platypus import Flowable

from calcreport.report.sections.common import text


class StudySection:
    """The chapter of a study of candidate pumps (``results.study``)."""

    # The builder's own attributes and helpers (see calcreport.report.document._Report).
    t: dict[str, Any]
    r: dict[str, Any]
    s: Any
    system: str

    def choice(self) -> list[Flowable]:
        study = self.r.get("study")
        if not study:
            return []
        offers = study.get("candidates", [])
        sizes = study.get("pipe_sizes", [])
        if not offers and not sizes:
            return self.sensitivity_chapter(study)
        basis = study["basis"]
        years = f"{basis['life']['value']:g}" if "life" in basis else "—"
        rate = f"{basis['discount_rate']['value']:.3g}" if "discount_rate" in basis else "—"
        what = " and main size" if offers and sizes else ""
        out: list[Flowable] = [
            self.heading(f"Choice of pump{what}" if offers else "Choice of main size")
        ]
        things = " and ".join(
            t for t, on in (("offer", offers), ("pipe size", sizes)) if on
        )  # fmt: skip
        out.append(
            self.p(
                f"Each {things} was calculated in full, as the rest of this report "
                "calculates the design: every operating state (cases, duty-profile points, "
                "the rated duty) with every design check. One passes when no check fails; "
                "reviews are listed. Those that pass are ranked by life-cycle cost over "
                f"{years} years at a discount rate of {rate} a year "
                f"{self.ref(basis['reference'])}: {text(basis['method'])}.",
                self.s.lead,
            )
        )
        if offers:
            out.append(self.p(self._why(study)))
            out += self.kept([self.offers_table(offers), *self.figure("candidates")])
        if sizes:
            out += self.sizes_part(study)
        if study.get("sensitivity"):
            out += self.sensitivity_part(study["sensitivity"])
        out.append(
            self.p(
                "The chapters that follow are the full calculation of the design"
                + (f" with offer {text(study['selected'])}" if offers else "")
                + "; each life-cycle cost is worked in the section Life-cycle cost of the "
                "offers.",
                self.s.small,
            )
        )
        return out

    def sensitivity_chapter(self, study: dict[str, Any]) -> list[Flowable]:
        """A study of the uncertainties alone: its own chapter."""
        return [
            self.heading("Sensitivity of the design"),
            *self.sensitivity_part(study["sensitivity"]),
        ]

    def sensitivity_part(self, rows: list[dict[str, Any]]) -> list[Flowable]:
        """Each uncertainty at its low and high setting and what it moves, as a table and a
        tornado chart."""
        kinds = {
            "total_dynamic_head": ("TDH", "length"),
            "operating_flow": ("Flow", "flow"),
            "npsh_margin": ("NPSH margin", "length"),
            "shaft_power": ("Shaft power", "power"),
        }
        shown = [k for k in kinds if any(k in row["effects"] for row in rows)]
        out: list[Flowable] = [
            self.p(
                "How sure the design is: each stated uncertainty is tried at its low and its "
                "high setting, the rest as designed, and the design solved in full at each "
                "(every state and check); the table gives the design's own value and the two "
                "others. The combined worst state, where the input gives its parts, is a case "
                "of the calculation that every check sees.",
                self.s.lead,
            )
        ]
        header = ["Uncertainty", "Low", "High"] + [kinds[k][0] for k in shown]
        table: list[list[Any]] = [header]
        for row in rows:
            cells = [text(row["label"]), text(row["low"]), text(row["high"])]
            for k in shown:
                e = row["effects"].get(k)
                cells.append(
                    "—"
                    if e is None
                    else f"{self.q(e['low'], kinds[k][1])} / {self.q(e['design'], kinds[k][1])}"
                    f" / {self.q(e['high'], kinds[k][1])}"
                )
            table.append(cells)
        w = self.width
        widths = [w * 0.16, w * 0.14, w * 0.14] + [w * 0.56 / len(shown)] * len(shown)
        out += self.kept(
            [
                self.table(table, widths),
                self.p(
                    "Each result: at the low setting / as designed / at the high setting.",
                    self.s.small,
                ),
                *self.figure("tornado"),
            ]
        )
        return out

    def sizes_part(self, study: dict[str, Any]) -> list[Flowable]:
        """The sizes of each main: the lowest life-cycle cost and where the design stands."""
        rows = study["pipe_sizes"]
        pump = f" with offer {text(study['selected'])}" if study.get("candidates") else ""
        out: list[Flowable] = []
        for main in dict.fromkeys(tuple(row["pipes"]) for row in rows):
            group = [row for row in rows if tuple(row["pipes"]) == main]
            names = ", ".join(text(p) for p in main)
            lowest = next((row for row in group if row["lowest"]), None)
            design = next((row for row in group if row["as_designed"]), None)
            said = f"The main {names} in {len(group)} sizes{pump}, each priced by length. "
            if lowest is None:
                said += "No size passes every check."
            elif design is lowest:
                said += (
                    f"<b>{text(lowest['size'])}</b>, the design's own size, has the lowest "
                    "life-cycle cost of the sizes that pass."
                )
            else:
                said += (
                    f"<b>{text(lowest['size'])}</b> has the lowest life-cycle cost of the "
                    "sizes that pass"
                )
                if design is not None and "life_cycle_cost" in design:
                    said += (
                        f"; the design's {text(design['size'])} costs "
                        f"{self._money(design['life_cycle_cost'])} over the life against "
                        f"{self._money(lowest['life_cycle_cost'])}"
                    )
                said += "."
            out.append(self.p(said))
            out += self.kept([self.sizes_table(group), *self.figure("pipe_sizes")])
        return out

    def sizes_table(self, group: list[dict[str, Any]]) -> Any:
        rows: list[list[Any]] = [
            [
                "Size",
                "Bore",
                "Velocity",
                "TDH",
                "Status",
                "Checks failing / for review",
                "Pipes' cost",
                "Energy a year",
                "Life-cycle cost",
            ]
        ]
        for row in group:
            marks = [
                m
                for m, on in (("lowest", row["lowest"]), ("as designed", row["as_designed"]))
                if on
            ]
            rows.append(
                [
                    f"<b>{text(row['size'])}</b>" + (f" ({', '.join(marks)})" if marks else ""),
                    self.q(row["inner_diameter"], "diameter"),
                    self.q(row["velocity"], "velocity"),
                    self.q(row["total_dynamic_head"], "length"),
                    row["status"].upper(),
                    self._checks(row),
                    self._linked(row["capital_cost"]),
                    self._money(row.get("annual_energy_cost")),
                    self._linked(row.get("life_cycle_cost")),
                ]
            )
        w = self.width
        return self.table(
            rows, [w * f for f in (0.15, 0.09, 0.09, 0.08, 0.08, 0.2, 0.1, 0.1, 0.11)]
        )

    def _why(self, study: dict[str, Any]) -> str:
        """The sentence naming the choice and its reason."""
        offers = study["candidates"]
        chosen = next(o for o in offers if o["id"] == study["selected"])
        name = f"<b>Offer {text(chosen['id'])}</b>"
        if study["selected_by"] == "input":
            why = (
                f"{name} is selected in the input (study.selected); it ranks "
                f"{chosen['rank']} of {len(offers)}."
            )
        elif chosen["status"] == "fail":
            why = f"No offer passes every check; {name} ranks first by life-cycle cost."
        else:
            why = f"{name} is selected: the lowest life-cycle cost among the offers that pass."
        cost = chosen.get("life_cycle_cost", {}).get("value")
        cheaper = [
            o
            for o in offers
            if o is not chosen
            and o["status"] == "fail"
            and cost is not None
            and o.get("life_cycle_cost", {}).get("value", cost) < cost
        ]
        for o in cheaper:
            why += (
                f" Offer {text(o['id'])} would cost less over the life "
                f"({self._money(o.get('life_cycle_cost'))}) but fails "
                f"{', '.join(text(c) for c in o['failing'])}."
            )
        return why

    def _money(self, q: dict[str, Any] | None) -> str:
        if not q:
            return "—"
        return f"{q['value']:,.0f} {text(q['unit'])}".strip()

    def _linked(self, q: dict[str, Any] | None) -> str:
        """A sum of money linked to the step it comes from (its life-cycle cost step)."""
        return self.link(q["from"], self._money(q)) if q else "—"

    @staticmethod
    def _checks(row: dict[str, Any]) -> str:
        """An alternative's failing check ids (bold), then those for review."""
        ids = [f"<b>{text(c)}</b>" for c in row["failing"]] + [text(c) for c in row["review"]]
        return ", ".join(ids) or "—"

    def offers_table(self, offers: list[dict[str, Any]]) -> Any:
        rows: list[list[Any]] = [
            [
                "Rank",
                "Offer",
                "Status",
                "Checks failing / for review",
                "Initial cost",
                "Energy a year",
                "Upkeep a year",
                "Life-cycle cost",
                "Operating point",
            ]
        ]
        for o in offers:
            point = o.get("operating_point")
            at = (
                f"{self.q(point['flow'], 'flow')}, {self.q(point['head'], 'length')}"
                if point
                else "none"
            )
            rows.append(
                [
                    str(o["rank"]),
                    f"<b>{text(o['id'])}</b> {text(o['title'])}",
                    o["status"].upper(),
                    self._checks(o),
                    self._money(o.get("capital_cost")),
                    self._money(o.get("annual_energy_cost")),
                    self._money(o.get("annual_maintenance_cost")),
                    self._linked(o.get("life_cycle_cost")),
                    at,
                ]
            )
        w = self.width
        return self.table(
            rows,
            [w * f for f in (0.06, 0.17, 0.08, 0.21, 0.09, 0.09, 0.09, 0.1, 0.11)],
        )
