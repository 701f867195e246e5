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

from calcreport import catalog
from calcreport.model.schema import (
    Candidate,
    Fitting,
    Given,
    Model,
    PipeSize,
    Sensitivity,
    SizeStudy,
)
from calcreport.physics import power
from calcreport.trace import Trace, TraceBuilder, quantity
from calcreport.trace import bound as _q
from calcreport.units import show

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


def _with_offer(model: Model, offer: Candidate) -> Model:
    """The design with the offer's pump (and its own drive, where it has one)."""
    drive = offer.drive_efficiency or model.drive_efficiency
    return replace(model, pump=offer.pump, drive_efficiency=drive, study=None)


def _verdict(trace: Trace) -> tuple[str, tuple[str, ...], tuple[str, ...]]:
    """An alternative's status (fail when a check fails or no operating point exists, review
    when one asks for review, else pass), its failing and its review check ids."""
    fails = tuple(sorted({c.id for c in trace.checks if c.status == "fail"}))
    reviews = tuple(sorted({c.id for c in trace.checks if c.status == "review"}))
    infeasible = trace.status["value"] == "not feasible"
    if infeasible and "operating_point" not in fails:
        fails = ("operating_point", *fails)
    return ("fail" if fails else "review" if reviews else "pass"), fails, reviews


def _costs(
    model: Model, trace: Trace, capital: float, upkeep: float
) -> tuple[float | None, float | None]:
    """An alternative's annual energy cost (its own calculation's) and life-cycle cost."""
    cost = trace.results.get("energy", {}).get("annual_cost")
    energy = None if cost is None else float(cost["value"])
    op = model.operation
    if energy is None or op.discount_rate is None or op.life_years is None:
        return energy, None
    rate, years = op.discount_rate.value, op.life_years.value
    return energy, power.life_cycle_cost(capital, energy, upkeep, rate, years)


def _offer(model: Model, candidate: Candidate, trace: Trace) -> _Offer:
    status, fails, reviews = _verdict(trace)
    upkeep = candidate.annual_maintenance.value if candidate.annual_maintenance else 0.0
    price = candidate.capital_cost.value if candidate.capital_cost else 0.0
    energy, lcc = _costs(model, trace, price, upkeep)
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


def solve_study(
    model: Model, solve_design: Callable[..., Trace], tell: Callable[[str], None]
) -> Trace:
    """The trace of the selected offer (or the [pump] without offers) at the design's pipe
    sizes, with the study of every offer and every pipe size in it; ``tell`` hears each
    calculation as it starts."""
    study = model.study
    assert study is not None
    tried = _uncertainties(model, study.sensitivity) if study.sensitivity else []
    total = len(study.candidates) + sum(len(g.sizes) for g in study.pipe_sizes) + 2 * len(tried) + 1
    done = iter(range(1, total + 1))

    def solved(what: str, variant: Model, *hook: Any) -> Trace:
        tell(f"solving {what} ({next(done)} of {total})")
        # An alternative is read for its results and checks: its steps need not be kept.
        return solve_design(variant, *hook) if hook else solve_design(variant, texts=False)

    offers = [
        _offer(model, c, solved(f"offer {c.id}", _with_offer(model, c))) for c in study.candidates
    ]
    ranked = _rank(offers)
    by_id = {o.candidate.id: o for o in offers}
    chosen = (by_id[study.selected] if study.selected else ranked[0]) if offers else None
    design = _with_offer(model, chosen.candidate) if chosen else replace(model, study=None)
    sized = [
        [_sized(design, n, group, k, size, solved) for k, size in enumerate(group.sizes, 1)]
        for n, group in enumerate(study.pipe_sizes, 1)
    ]

    effects = [
        (
            name,
            label,
            low,
            high,
            solved(f"{label}, low", make(design, "low")),
            solved(f"{label}, high", make(design, "high")),
        )
        for name, label, low, high, make in tried
    ]

    def record(b: TraceBuilder, results: dict[str, Any]) -> dict[str, Any]:
        out = _record(b, model, ranked, chosen, results) if chosen else {}
        if effects:
            out["sensitivity"] = [_effects(results, *row) for row in effects]
        if sized:
            out["pipe_sizes"] = [row for group in sized for row in _record_sizes(b, model, group)]
        out.setdefault("basis", _basis(model))
        return out

    return solved("the selected design", design, record)


@dataclass(frozen=True)
class _Sized:
    """A pipe size as its own calculation left it (the selected pump, every state)."""

    main: int  # the pipe_size group's number
    number: int  # the size's number in its group
    pipes: tuple[str, ...]
    size: PipeSize
    trace: Trace
    status: str
    failing: tuple[str, ...]
    review: tuple[str, ...]
    annual_energy_cost: float | None
    life_cycle_cost: float | None
    as_designed: bool


def _sized(
    design: Model,
    main: int,
    group: SizeStudy,
    number: int,
    size: PipeSize,
    solve_design: Callable[..., Trace],
) -> _Sized:
    """The design with the pipes of ``group`` at ``size``, solved in full."""
    pipes = tuple(
        replace(
            p,
            inner_diameter=size.inner_diameter,
            wall_thickness=size.wall_thickness or p.wall_thickness,
            sources={**p.sources, **size.sources},
        )
        if p.id in group.pipes
        else p
        for p in design.pipes
    )
    trace = solve_design(f"{', '.join(group.pipes)} at {size.label}", replace(design, pipes=pipes))
    status, fails, reviews = _verdict(trace)
    length = sum(p.length.value for p in design.pipes if p.id in group.pipes)
    capital = power.length_cost(size.cost_per_length.value, [length])
    energy, lcc = _costs(design, trace, capital, 0.0)
    # The design's own size, its bore as entered (a catalog bore rounded to 0.1 mm).
    as_designed = all(
        abs(p.inner_diameter.value - size.inner_diameter.value) <= 1e-3 * p.inner_diameter.value
        for p in design.pipes
        if p.id in group.pipes
    )
    return _Sized(
        main, number, group.pipes, size, trace, status, fails, reviews, energy, lcc, as_designed
    )


def _record_sizes(b: TraceBuilder, model: Model, group: list[_Sized]) -> list[dict[str, Any]]:
    """The rows of one main's sizes, each with its capital and life-cycle cost as steps, its
    annual energy cost from its own calculation."""
    op = model.operation
    currency = op.currency
    passing = [s for s in group if s.status != "fail" and s.life_cycle_cost is not None]
    lowest = min(passing, key=lambda s: s.life_cycle_cost or 0.0) if passing else None
    rows = []
    for s in group:
        sid = f"study.main{s.main}.size{s.number}"
        lengths = [p.length for p in model.pipes if p.id in s.pipes]
        capital = b.step(
            f"{sid}.capital_cost",
            f"Cost of the pipes {', '.join(s.pipes)} at {s.size.label}",
            power.length_cost,
            c=b.input(s.size.cost_per_length),
            L=lengths,
        )
        row: dict[str, Any] = {
            "pipes": list(s.pipes),
            "size": s.size.label,
            "inner_diameter": _q(b.input(s.size.inner_diameter)),
            "status": s.status,
            "failing": list(s.failing),
            "review": list(s.review),
            "as_designed": s.as_designed,
            "lowest": s is lowest,
            "capital_cost": _cost(capital, currency),
            "total_dynamic_head": quantity(s.trace.results["total_dynamic_head"]["value"], "m"),
            "velocity": quantity(
                max(s.trace.results["pipes"][p]["velocity"]["value"] for p in s.pipes), "m/s"
            ),
        }
        energy: Given | None = None
        if s.annual_energy_cost is not None:
            energy = b.solution(
                f"{sid}.annual_energy_cost",
                s.annual_energy_cost,
                "",
                f"the annual energy cost of the design with pipes {', '.join(s.pipes)} at "
                f"{s.size.label} (its own calculation, every state and check solved)",
            )
        if energy is not None and op.discount_rate is not None and op.life_years is not None:
            row["annual_energy_cost"] = _cost(energy, currency)
            lcc = b.step(
                f"{sid}.life_cycle_cost",
                f"Life-cycle cost of the pipes {', '.join(s.pipes)} at {s.size.label}",
                power.life_cycle_cost,
                capital=capital,
                energy=energy,
                maintenance=b.assume(
                    "Pipe sizes are compared on their cost and the energy they cost: upkeep "
                    "is taken equal between sizes (zero in the comparison).",
                    0.0,
                ),
                rate=op.discount_rate,
                years=op.life_years,
            )
            row["life_cycle_cost"] = _cost(lcc, currency)
            # The life-cycle cost less the pipes' own: the energy's share, for the chart.
            row["energy_present_value"] = quantity(lcc.value - capital.value, currency)
        row.update(_point(s.trace))
        rows.append(row)
    return rows


def _point(trace: Trace) -> dict[str, Any]:
    """An alternative's design operating point, as plain quantities: it comes from the
    alternative's own calculation, whose steps are not in the selected design's trace."""
    point = trace.results.get("operating_point")
    if point is None:
        return {}
    flow_head = {k: quantity(point[k]["value"], point[k]["unit"]) for k in ("flow", "head")}
    return {"operating_point": flow_head}


def _cost(given: Given, currency: str) -> dict[str, Any]:
    """A sum of money the study records: its value in the project currency and its source."""
    return {**quantity(given.value, currency), "from": given.key}


def _basis(model: Model) -> dict[str, Any]:
    op = model.operation
    out: dict[str, Any] = {"method": METHOD, "reference": "hi_lcc"}
    if op.life_years is not None:
        out["life"] = _q(op.life_years)
    if op.discount_rate is not None:
        out["discount_rate"] = _q(op.discount_rate)
    return out


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
        }
        if c.capital_cost is not None:
            row["capital_cost"] = _cost(c.capital_cost, currency)
        if c.annual_maintenance is not None:
            row["annual_maintenance_cost"] = _cost(c.annual_maintenance, currency)
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
            row["annual_energy_cost"] = _cost(energy, currency)
        if energy is not None and op.discount_rate is not None and op.life_years is not None:
            upkeep = (
                b.input(c.annual_maintenance)
                if c.annual_maintenance is not None
                else b.assume(
                    f"Candidate {c.id}: no annual maintenance cost given; taken as zero.", 0.0
                )
            )
            price = (
                b.input(c.capital_cost)
                if c.capital_cost is not None
                else b.assume(
                    f"Candidate {c.id}: no price given; its initial cost is taken as zero "
                    "(the offers compared on their running costs).",
                    0.0,
                )
            )
            lcc = b.step(
                f"study.{c.id}.life_cycle_cost",
                f"Life-cycle cost of candidate {c.id}",
                power.life_cycle_cost,
                capital=price,
                energy=energy,
                maintenance=upkeep,
                rate=op.discount_rate,
                years=op.life_years,
            )
            row["life_cycle_cost"] = _cost(lcc, currency)
        row.update(_point(offer.trace))
        curve = offer.trace.results.get("pump_curve")
        if curve is not None:
            shown = curve.get("combined", curve)
            row["curve"] = {"flow": shown["flow"], "head": shown["head"]}
        rows.append(row)
    return {
        "candidates": rows,
        "selected": chosen.candidate.id,
        "selected_by": "input" if model.study and model.study.selected else "rank",
        "basis": _basis(model),
    }


def _effect_values(results: dict[str, Any]) -> dict[str, dict[str, Any]]:
    """The design case's TDH, operating flow, NPSH margin and shaft power (those it has)."""
    point = results.get("operating_point", {})
    found = {
        "total_dynamic_head": results.get("total_dynamic_head"),
        "operating_flow": point.get("flow") or results.get("flow"),
        "npsh_margin": point.get("npsh_margin") or results.get("npsh_available"),
        "shaft_power": results.get("shaft_power"),
    }
    return {k: quantity(v["value"], v["unit"]) for k, v in found.items() if v is not None}


def _effects(
    results: dict[str, Any],
    name: str,
    label: str,
    low: str,
    high: str,
    low_trace: Trace,
    high_trace: Trace,
) -> dict[str, Any]:
    """One uncertainty's row: its low and high settings and the design results at each,
    with the change from the design's own as a fraction of it."""
    base = _effect_values(results)
    at_low, at_high = _effect_values(low_trace.results), _effect_values(high_trace.results)
    effects = {}
    for key, q in base.items():
        if key not in at_low or key not in at_high:
            continue
        size = abs(q["value"]) or 1.0
        effects[key] = {
            "design": q,
            "low": at_low[key],
            "high": at_high[key],
            "low_change": (at_low[key]["value"] - q["value"]) / size,
            "high_change": (at_high[key]["value"] - q["value"]) / size,
        }
    return {"parameter": name, "label": label, "low": low, "high": high, "effects": effects}


def _uncertainties(
    model: Model, s: Sensitivity
) -> list[tuple[str, str, str, str, Callable[[Model, str], Model]]]:
    """Each uncertainty: its name, label, the low and high settings as a reader names them,
    and the design at either setting."""
    units = model.project.units
    out: list[tuple[str, str, str, str, Callable[[Model, str], Model]]] = []
    if s.roughness is not None:
        aged = s.roughness

        def rough(m: Model, side: str) -> Model:
            if side == "low":
                return m
            pipes = tuple(
                replace(p, roughness=aged) if p.roughness.value < aged.value else p for p in m.pipes
            )
            return replace(m, pipes=pipes)

        out.append(("roughness", "Pipe roughness", "as new (as designed)",
                    f"aged, {show(_q(aged), 'roughness', units)}", rough))  # fmt: skip
    if s.temperature is not None:
        cold, warm = s.temperature

        def warmth(m: Model, side: str) -> Model:
            return replace(m, fluid=replace(m.fluid, temperature=cold if side == "low" else warm))

        out.append(("temperature", "Liquid temperature", show(_q(cold), "temperature", units),
                    show(_q(warm), "temperature", units), warmth))  # fmt: skip
    if s.levels:

        def levels(m: Model, side: str) -> Model:
            src, dst = m.source, m.destination
            if side == "low":  # least static head: source high, destination low
                return replace(
                    m,
                    source=replace(src, level=src.level_high or src.level),
                    destination=replace(dst, level=dst.level_low or dst.level),
                )
            return replace(
                m,
                source=replace(src, level=src.level_low or src.level),
                destination=replace(dst, level=dst.level_high or dst.level),
            )

        out.append(("levels", "Static head (levels)", "least (source high, destination low)",
                    "most (source low, destination high)", levels))  # fmt: skip
    if s.fitting_k is not None:
        spread = s.fitting_k.value

        def resistance(m: Model, side: str) -> Model:
            # Each fitting's K (its count × K in ΣK) up or down; a rated loss stays.
            factor = 1.0 - spread if side == "low" else 1.0 + spread

            def scaled(f: Fitting) -> Fitting:
                if f.dp is not None:
                    return f
                return replace(f, count=replace(f.count, value=f.count.value * factor))

            pipes = tuple(replace(p, fittings=tuple(map(scaled, p.fittings))) for p in m.pipes)
            return replace(m, pipes=pipes)

        label = "Fitting K values"
        out.append(("fitting_k", label, f"−{spread:.0%}", f"+{spread:.0%}", resistance))
    if s.pump_grade:
        grade = catalog.iso_9906_grades()[s.pump_grade]

        def tested(m: Model, side: str) -> Model:
            curve = m.pump.curve
            assert curve is not None
            if side == "low":  # the pump at the foot of its grade: less head, less efficiency
                head, eta = 1.0 - grade["head_minus"], 1.0 - grade["efficiency_minus"]
            else:
                head, eta = 1.0 + grade["head_plus"], 1.0
            moved = replace(
                curve,
                head=tuple(replace(h, value=h.value * head) for h in curve.head),
                efficiency=tuple(replace(e, value=e.value * eta) for e in curve.efficiency),
            )
            return replace(m, pump=replace(m.pump, curve=moved))

        low = f"head −{grade['head_minus']:.0%}, efficiency −{grade['efficiency_minus']:.0%}"
        out.append(("pump_grade", f"Pump within ISO 9906 grade {s.pump_grade}", low,
                    f"head +{grade['head_plus']:.0%}", tested))  # fmt: skip
    return out
