"""The [operation], [envelope], [surge] and [criteria] tables: hours, price and control,
the duty profile, the envelope of operating cases, the surge event, project criteria.
"""

from __future__ import annotations

from typing import Any

from calcreport import catalog
from calcreport.model.schema import (
    Criteria,
    Envelope,
    Fluid,
    Given,
    Operation,
    Surge,
)
from calcreport.model.sections.fluid import computed_range, range_text
from calcreport.model.sections.reader import _quantity_list, _Reader

_ENVELOPE_KEYS = {"temperature", "flow_required", "roughness", "strainer_dirty_dp"}
SURGE_EVENTS = ("pump_trip", "valve_closure")
_SURGE_KEYS = {"event", "closure_time", "pump_stop_time"}


def _envelope(r: _Reader, data: dict[str, Any], fluid: Fluid | None) -> Envelope:
    """Ranges the operating cases are built from: liquid temperature and required flow."""
    r.known_keys(data, "envelope", _ENVELOPE_KEYS)
    roughness = None
    if isinstance(data.get("roughness"), str) and data["roughness"].strip() == "aged":
        r.problem(
            "envelope.roughness",
            'Give the aged roughness as a length, such as "0.5 mm", on the project\'s '
            "stated basis: the catalog holds new-pipe roughness only, with no published "
            "ageing rate to apply.",
        )
    else:
        roughness = r.quantity(data, "roughness", "envelope", "roughness", positive=True)
    dirty = r.quantity(data, "strainer_dirty_dp", "envelope", "pressure", positive=True)
    temperatures = _quantity_list(r, data, "temperature", "envelope", "temperature") or ()
    if temperatures and len(temperatures) != 2:
        r.problem(
            "envelope.temperature",
            "Expected the lowest and the highest liquid "
            'temperature, such as ["5 degC", "30 degC"].',
        )
        temperatures = ()
    if temperatures and temperatures[0].value > temperatures[1].value:
        r.problem("envelope.temperature", "Give the lowest temperature first.")
        temperatures = ()
    if temperatures and fluid is not None and fluid.kind == "custom":
        r.problem(
            "envelope.temperature",
            "A custom liquid has fixed properties; a temperature range needs a liquid "
            "whose properties are computed (water, a glycol or a catalog liquid).",
        )
        temperatures = ()
    bounds = computed_range(fluid.kind) if temperatures and fluid is not None else None
    if bounds is not None:
        what = "Liquid water" if fluid.kind == "water" else "This liquid"
        outside = [t for t in temperatures if not bounds[0] <= t.value <= bounds[1]]
        for t in outside:
            r.problem(t.key, f"{what} is computed from {range_text(*bounds)}.")
        if outside:
            temperatures = ()
    flows = _quantity_list(r, data, "flow_required", "envelope", "flow") or ()
    if any(q.value <= 0.0 for q in flows):
        r.problem("envelope.flow_required", "Every required flow must be greater than zero.")
        flows = ()
    return Envelope(
        temperatures=tuple(temperatures),
        flows=tuple(flows),
        roughness=roughness,
        strainer_dirty_dp=dirty,
    )


_OPERATION_KEYS = {
    "hours_per_year",
    "annual_volume",
    "energy_price",
    "currency",
    "demand_charge",
    "life_years",
    "discount_rate",
    "control",
    "profile",
}
CONTROLS = ("on_off", "throttled", "variable_speed")
MAX_PROFILE_POINTS = 50


def _operation(r: _Reader, data: dict[str, Any]) -> Operation:
    r.known_keys(data, "operation", _OPERATION_KEYS)
    hours = r.quantity(data, "hours_per_year", "operation", "dimensionless", positive=True)
    if hours and hours.value > 8784.0:
        r.problem("operation.hours_per_year", "A year has at most 8784 hours.")
    volume = r.quantity(data, "annual_volume", "operation", "volume", positive=True)
    if hours and volume:
        r.problem(
            "operation.annual_volume",
            "Give hours_per_year (continuous duty) or annual_volume (fill duty), not both.",
        )
    price = r.quantity(data, "energy_price", "operation", "dimensionless")
    if price and price.value < 0.0:
        r.problem("operation.energy_price", "The energy price must not be negative.")
    demand = r.quantity(data, "demand_charge", "operation", "dimensionless")
    if demand and demand.value < 0.0:
        r.problem("operation.demand_charge", "The demand charge must not be negative.")
    life = r.quantity(data, "life_years", "operation", "dimensionless", positive=True)
    rate = r.quantity(data, "discount_rate", "operation", "dimensionless")
    if rate and not 0.0 <= rate.value < 1.0:
        r.problem(
            "operation.discount_rate",
            'Give the discount rate as a fraction per year, such as 0.05 or "5 %".',
        )
    if (life is None) != (rate is None):
        r.problem(
            "operation.life_years",
            "A life-cycle energy cost needs both life_years and discount_rate.",
        )
    control = r.text(data, "control", "operation", "on_off", CONTROLS)
    profile = _profile(r, data.get("profile"))
    if profile and (hours or volume):
        r.problem(
            "operation.profile",
            "A profile sets the hours at each flow; give it instead of hours_per_year or "
            "annual_volume.",
        )
    currency = r.text(data, "currency", "operation", "")
    if (price or demand) and not currency:
        r.problem("operation.currency", 'Give the currency of energy_price, such as "USD".')
    return Operation(
        hours_per_year=hours,
        energy_price=price,
        currency=currency,
        annual_volume=volume,
        demand_charge=demand,
        life_years=life,
        discount_rate=rate,
        control=control,
        profile=profile,
    )


def _profile(r: _Reader, raw: Any) -> tuple[tuple[Given, Given], ...]:
    """operation.profile: flows with the hours a year spent at each."""
    if raw is None:
        return ()
    where = "operation.profile"
    if not isinstance(raw, list) or not raw or not all(isinstance(p, dict) for p in raw):
        r.problem(
            where,
            'Expected a list of points such as [{ flow = "18 L/s", hours = 2000 }, ...].',
        )
        return ()
    if len(raw) > MAX_PROFILE_POINTS:
        r.problem(where, f"At most {MAX_PROFILE_POINTS} profile points are accepted.")
        return ()
    points = []
    for index, data in enumerate(raw, start=1):
        path = f"{where}[{index}]"
        r.known_keys(data, path, {"flow", "hours"})
        flow = r.quantity(data, "flow", path, "flow", required=True, positive=True)
        hours = r.quantity(data, "hours", path, "dimensionless", required=True, positive=True)
        if flow and hours:
            points.append((flow, hours))
    total = sum(h.value for _, h in points)
    if total > 8784.0:
        r.problem(where, f"The profile's hours add to {total:g}; a year has at most 8784.")
    return tuple(points)


def _surge(r: _Reader, data: dict[str, Any]) -> Surge | None:
    table = r.table(data, "surge", "surge", required=False)
    if table is None:
        return None
    r.known_keys(table, "surge", _SURGE_KEYS)
    event = r.text(table, "event", "surge", "pump_trip", SURGE_EVENTS)
    closure = r.quantity(table, "closure_time", "surge", "time", positive=True)
    if event == "valve_closure" and "closure_time" not in table:
        r.problem(
            "surge.closure_time",
            'A valve closure needs its closing time, such as closure_time = "5 s".',
        )
    if event == "pump_trip" and "closure_time" in table:
        r.problem(
            "surge.closure_time",
            'closure_time applies to event = "valve_closure"; for a pump trip give '
            "pump_stop_time, the time its flow takes to stop.",
        )
    stop = r.quantity(table, "pump_stop_time", "surge", "time", positive=True)
    return Surge(event, closure, stop)


def _criteria(r: _Reader, data: dict[str, Any]) -> Criteria:
    defaults = catalog.criteria()
    r.known_keys(data, "criteria", set(defaults))
    given = {}
    for key in data:
        if key in defaults:
            value = r.quantity(data, key, "criteria", defaults[key]["kind"], positive=True)
            if value:
                given[key] = value
    return Criteria(given)
