"""Candidate pumps: each offer's whole calculation, their ranking by life-cycle cost, and the
selected offer's trace carrying the study.

Each candidate is the model with its own pump, solved like any design: every operating
state, every check. A candidate passes when no check fails (reviews are listed). The
offers that pass are ranked by life-cycle cost, the initial cost and the present value of
the annual energy and maintenance costs over the life (Hydraulic Institute and Europump,
Pump Life Cycle Costs, 2001); the offers that fail follow, by the same cost. The offer the
input names (``study.selected``), else the first in rank, gets the full calculation: its
trace holds a life-cycle cost step for every offer and ``results.study``.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Any

from calcreport.model.schema import Candidate, Given, Model
from calcreport.physics import power
from calcreport.trace import Trace, TraceBuilder, quantity
from calcreport.trace import bound as _q

__all__ = ["solve_study"]

METHOD = (
    "life-cycle cost: initial cost plus the present value of the annual energy and "
    "maintenance costs over the life, LCC = C_ic + (C_e + C_m)·[1 − (1 + i)^−n]/i; the "
    "guide's other elements are taken equal between the offers"
)


@dataclass(frozen=True)
class _Offer:
    """A candidate as its own calculation left it."""

    candidate: Candidate
    trace: Trace
    status: str  # pass | review | fail
    failing: tuple[str, ...]
    review: tuple[str, ...]
    annual_energy_cost: float | None
    life_cycle_cost: float | None


def _offer(model: Model, candidate: Candidate, trace: Trace) -> _Offer:
    fails = tuple(sorted({c.id for c in trace.checks if c.status == "fail"}))
    reviews = tuple(sorted({c.id for c in trace.checks if c.status == "review"}))
    infeasible = trace.status["value"] == "not feasible"
    status = "fail" if fails or infeasible else "review" if reviews else "pass"
    if infeasible and "operating_point" not in fails:
        fails = ("operating_point", *fails)
    cost = trace.results.get("energy", {}).get("annual_cost")
    energy = None if cost is None else float(cost["value"])
    op = model.operation
    lcc = None
    if energy is not None and op.discount_rate is not None and op.life_years is not None:
        upkeep = candidate.annual_maintenance.value if candidate.annual_maintenance else 0.0
        lcc = power.life_cycle_cost(
            candidate.capital_cost.value,
            energy,
            upkeep,
            op.discount_rate.value,
            op.life_years.value,
        )
    return _Offer(candidate, trace, status, fails, reviews, energy, lcc)


def _rank(offers: list[_Offer]) -> list[_Offer]:
    """Those that pass (or pass with reviews) by life-cycle cost, then those that fail;
    an offer with no life-cycle cost (no energy computed) last of its group."""
    return sorted(
        offers,
        key=lambda o: (
            o.status == "fail",
            o.life_cycle_cost is None,
            o.life_cycle_cost or 0.0,
            o.candidate.id,
        ),
    )


def solve_study(model: Model, solve_design: Callable[..., Trace]) -> Trace:
    """The selected candidate's trace with the study of every candidate in it."""
    assert model.study is not None
    offers = [
        _offer(model, c, solve_design(replace(model, pump=c.pump, study=None)))
        for c in model.study.candidates
    ]
    ranked = _rank(offers)
    by_id = {o.candidate.id: o for o in offers}
    chosen = by_id[model.study.selected] if model.study.selected else ranked[0]

    def study(b: TraceBuilder, results: dict[str, Any]) -> dict[str, Any]:
        return _record(b, model, ranked, chosen, results)

    return solve_design(replace(model, pump=chosen.candidate.pump, study=None), study)


def _record(
    b: TraceBuilder,
    model: Model,
    ranked: list[_Offer],
    chosen: _Offer,
    results: dict[str, Any],
) -> dict[str, Any]:
    """``results.study``, with a life-cycle cost step of every offer in the chosen one's
    trace: its own annual cost from its energy step, the others' from their calculations."""
    op = model.operation
    currency = op.currency
    rows = []
    for rank, offer in enumerate(ranked, start=1):
        c = offer.candidate
        row: dict[str, Any] = {
            "id": c.id,
            "title": c.title,
            "rank": rank,
            "status": offer.status,
            "failing": list(offer.failing),
            "review": list(offer.review),
            "capital_cost": {
                **quantity(c.capital_cost.value, currency),
                "from": c.capital_cost.key,
            },
        }
        if c.annual_maintenance is not None:
            row["annual_maintenance_cost"] = {
                **quantity(c.annual_maintenance.value, currency),
                "from": c.annual_maintenance.key,
            }
        if offer is chosen and "annual_cost" in results.get("energy", {}):
            own = results["energy"]["annual_cost"]  # in the currency; the step takes a number
            energy = Given(own["value"], "", own["from"])
        elif offer.annual_energy_cost is not None:
            energy = b.solution(
                f"study.{c.id}.annual_energy_cost",
                offer.annual_energy_cost,
                "",
                f"the annual energy cost of candidate {c.id}'s own calculation (this input "
                f"with its pump, every state and check solved)",
            )
        else:
            energy = None
        if energy is not None:
            row["annual_energy_cost"] = {**quantity(energy.value, currency), "from": energy.key}
        if energy is not None and op.discount_rate is not None and op.life_years is not None:
            upkeep = (
                b.input(c.annual_maintenance)
                if c.annual_maintenance is not None
                else b.assume(
                    f"Candidate {c.id}: no annual maintenance cost given; taken as zero.", 0.0
                )
            )
            lcc = b.step(
                f"study.{c.id}.life_cycle_cost",
                f"Life-cycle cost of candidate {c.id}",
                power.life_cycle_cost,
                capital=b.input(c.capital_cost),
                energy=energy,
                maintenance=upkeep,
                rate=op.discount_rate,
                years=op.life_years,
            )
            row["life_cycle_cost"] = {**quantity(lcc.value, currency), "from": lcc.key}
        point = offer.trace.results.get("operating_point")
        if point is not None:  # from the offer's own calculation: its steps are not here
            row["operating_point"] = {
                key: quantity(point[key]["value"], point[key]["unit"]) for key in ("flow", "head")
            }
        curve = offer.trace.results.get("pump_curve")
        if curve is not None:
            shown = curve.get("combined", curve)
            row["curve"] = {"flow": shown["flow"], "head": shown["head"]}
        rows.append(row)
    out: dict[str, Any] = {
        "candidates": rows,
        "selected": chosen.candidate.id,
        "selected_by": "input" if model.study and model.study.selected else "rank",
        "basis": {"method": METHOD, "reference": "hi_lcc"},
    }
    if op.life_years is not None:
        out["basis"]["life"] = _q(op.life_years)
    if op.discount_rate is not None:
        out["basis"]["discount_rate"] = _q(op.discount_rate)
    return out
