"""The pump's limits of operation: its operating region about the best efficiency point,
the thermal minimum flow, and the lowest speed that lifts the static head.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport import checks
from calcreport.model.schema import Given, Model
from calcreport.physics import losses, pump, water
from calcreport.solver.states import (
    Case,
    CurvePoints,
    Liquid,
    Notes,
)
from calcreport.trace import TraceBuilder, source_of
from calcreport.trace import bound as _q  # a result naming its source


def _regions(b: TraceBuilder, model: Model, Q_bep: Given) -> dict[str, Any]:
    """Flows bounding the preferred (and, from the pump data, allowable) regions."""
    low, high, basis, _ = checks.preferred_range(model)
    if model.pump.preferred_range:
        fractions = list(model.pump.preferred_range)
    else:
        fractions = [
            model.criteria.given.get(name) or b.datum(f"catalog.criteria.{name}", value, "")
            for name, value in (("preferred_flow_low", low), ("preferred_flow_high", high))
        ]

    def bounds(name: str, given: list[Given]) -> list[dict[str, Any]]:
        return [
            _q(
                b.step(
                    f"pump.{name}_region.{end}",
                    f"{end.title()} flow of the {name} region",
                    pump.region_flow,
                    r=r,
                    Q_bep=Q_bep,
                )
            )
            for end, r in zip(("low", "high"), given, strict=True)
        ]

    out: dict[str, Any] = {
        "bep_flow": _q(Q_bep),
        "preferred": bounds("preferred", fractions),
        "preferred_basis": basis,
    }
    if model.pump.allowable_range:
        out["allowable"] = bounds("allowable", list(model.pump.allowable_range))
    if model.pump.min_continuous_flow:
        out["min_continuous_flow"] = _q(model.pump.min_continuous_flow)
    return out


def _thermal_min_flow(
    b: TraceBuilder, model: Model, liquid: Liquid, curve: CurvePoints | None, notes: Notes
) -> dict[str, Any] | None:
    """The least flow at which the pump's losses warm the liquid by no more than the limit.

    Below the best-efficiency flow the temperature rise grows as the efficiency falls;
    the root is sought between the first curve point and the BEP on the design curve.
    """
    if curve is None or not curve.efficiency or model.pump.efficiency_basis == "overall":
        return None
    if liquid.pressure is None or model.fluid.kind != "water":
        notes.append("The thermal minimum flow is computed for water only.")
        return None
    limit, _, _, _ = checks.criterion(model, "temperature_rise_max")
    T = model.fluid.temperature
    cp = b.step(
        "pump.thermal.heat_capacity",
        "Specific heat capacity of water",
        water.heat_capacity,
        T=T,
        p=liquid.pressure,
    )
    flows, heads, effs = curve.values("flow"), curve.values("head"), curve.values("efficiency")
    q_bep, _ = pump.best_efficiency_point(flows, effs)

    def margin(q: np.ndarray) -> np.ndarray:
        eta = np.asarray(pump.monotone_cubic(flows, effs, q))
        head = np.asarray(pump.monotone_cubic(flows, heads, q))
        # Where the efficiency is nil the rise is unbounded: a large finite value keeps the
        # bracketing root finder on finite numbers.
        safe = np.where(eta > 1e-9, eta, 1.0)
        rise = np.where(eta > 1e-9, pump.temperature_rise(head, safe, cp.value), 1e9)
        return limit - rise

    found = pump.operating_point(margin, flows[0], q_bep)
    if found is None:
        notes.append(
            f"The pump warms the liquid by more than {limit:g} K even at its best-efficiency "
            "flow: its losses need another path (a bypass, a cooler); the thermal minimum flow "
            "is not defined on this curve."
        )
        return None
    if margin(np.array([flows[0]]))[0] >= 0.0:
        notes.append(
            "The thermal minimum flow lies below the curve's first point: the rise there is "
            f"within {limit:g} K, and the curve gives no lower flow to find it."
        )
        return None
    Q = b.step(
        "pump.thermal_min_flow",
        "Thermal minimum flow (temperature rise at the limit)",
        pump.thermal_flow,
        Q=b.solution(
            "solver.thermal_min_flow",
            found,
            "m^3/s",
            "bracketed root of ΔT_max − ΔT(Q) between the first curve point and the BEP, "
            "Illinois method",
        ),
    )
    H = b.step("pump.thermal.head", "Pump head at the thermal minimum flow", pump.head_at,
               Q=Q, flow=curve.flow, head=curve.head)  # fmt: skip
    eta = b.step("pump.thermal.efficiency", "Pump efficiency at the thermal minimum flow",
                 pump.efficiency_at, Q=Q, flow=curve.flow, efficiency=curve.efficiency)  # fmt: skip
    rise = b.step("pump.thermal.temperature_rise", "Temperature rise at the thermal minimum flow",
                  pump.temperature_rise, H=H, eta=eta, cp=cp)  # fmt: skip
    given = model.criteria.given.get("temperature_rise_max")
    limit_given = (
        Given(limit, "delta_degC", given.key)  # a difference, not a temperature
        if given
        else b.datum("catalog.criteria.temperature_rise_max", limit, "delta_degC")
    )
    return {
        "flow": _q(Q),
        "temperature_rise": _q(rise),
        "temperature_rise_max": _q(limit_given),
    }


def _lift_speed(
    b: TraceBuilder, model: Model, cases: list[Case], by_case: dict[str, dict[str, Any]]
) -> Given | None:
    """The speed whose shutoff head just lifts the highest static head (with a speed range)."""
    curve = model.pump.curve
    if (
        model.pump.speed_range is None
        or curve is None
        or curve.speed is None
        or curve.flow[0].value != 0.0
    ):
        return None

    def static(c: Case) -> float:
        r = by_case[c.id]
        return r["static_head"]["value"] + r["pressure_head"]["value"]

    worst = max(cases, key=static)
    H = b.step(
        "pump.static_lift",
        f"Highest static head (case {worst.id})",
        losses.head_sum,
        h=[source_of(by_case[worst.id][key]) for key in ("static_head", "pressure_head")],
    )
    H0 = curve.head[0]
    trim = model.pump.trim
    if trim is not None and trim.value != 1.0:  # the trimmed curve's, as its step gave it
        H0 = Given(pump.trimmed_head(H0.value, trim.value), "m", "pump.trimmed.head[1]")
    if model.pump.count.value > 1 and model.pump.arrangement == "series":
        H0 = b.step(
            "pump.shutoff_head_series",
            "Shutoff head of the pumps in series",
            pump.series_head,
            H1=H0,
            n_run=model.pump.count,
        )
    return b.step(
        "pump.minimum_lift_speed",
        "Speed that just lifts the static head",
        pump.lift_speed,
        n0=curve.speed,
        H_static=H,
        H0=H0,
    )
