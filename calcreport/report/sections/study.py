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
        offers = study["candidates"]
        basis = study["basis"]
        years = f"{basis['life']['value']:g}" if "life" in basis else "—"
        rate = f"{basis['discount_rate']['value']:.3g}" if "discount_rate" in basis else "—"
        out: list[Flowable] = [self.heading("Choice of pump")]
        out.append(
            self.p(
                f"{len(offers)} offers were each calculated in full, as the rest of this report "
                "calculates the selected one: every operating state (cases, duty-profile "
                "points, the rated duty) with every design check. An offer passes when no "
                "check fails; reviews are listed. The offers that pass are ranked by "
                f"life-cycle cost over {years} years at a discount rate of {rate} a year "
                f"{self.ref(basis['reference'])}: {text(basis['method'])}. The offers that "
                "fail follow, by the same cost.",
                self.s.lead,
            )
        )
        out.append(self.p(self._why(study)))
        out += self.kept([self.offers_table(offers), *self.figure("candidates")])
        out.append(
            self.p(
                f"The chapters that follow are the full calculation of offer "
                f"{text(study['selected'])}; each offer's life-cycle cost is worked in the "
                "section Life-cycle cost of the offers.",
                self.s.small,
            )
        )
        return out

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
            lcc = o.get("life_cycle_cost")
            ids = [f"<b>{text(c)}</b>" for c in o["failing"]] + [text(c) for c in o["review"]]
            checks = ", ".join(ids)
            rows.append(
                [
                    str(o["rank"]),
                    f"<b>{text(o['id'])}</b> {text(o['title'])}",
                    o["status"].upper(),
                    checks or "—",
                    self._money(o["capital_cost"]),
                    self._money(o.get("annual_energy_cost")),
                    self._money(o.get("annual_maintenance_cost")),
                    self.link(lcc["from"], self._money(lcc)) if lcc else "—",
                    at,
                ]
            )
        w = self.width
        return self.table(
            rows,
            [w * f for f in (0.06, 0.17, 0.08, 0.21, 0.09, 0.09, 0.09, 0.1, 0.11)],
        )
