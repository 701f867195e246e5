"""The rated duty: the point to write on the pump data sheet and the motor's, gathered from
the solved states, with the governing state of each pump and motor limit.

The rated point is the required flow at the system head it needs (design case levels and
liquid). Under variable-speed control the pump runs there at a reduced speed: that state is
a duty-profile point at the required flow when the profile has one, or else a state ``R``
solved like a profile point (and checked like every state). At fixed speed the pump runs
where its curve meets the system curve; the required flow is then only the data sheet's
rated point, and ``R`` holds the system's head and NPSH available there (hydraulics only).
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from calcreport.checks import criterion
from calcreport.model.schema import Given, Model
from calcreport.solver import route_pressure
from calcreport.solver.hydraulics import _hydraulics
from calcreport.solver.profile import _profile_state
from calcreport.solver.states import CurvePoints
from calcreport.trace import DESIGN_CASE, Check, TraceBuilder
from calcreport.trace import bound as _q  # a result naming its source

RATED_STATE = "R"

# The limits a pump data sheet and a motor answer to, in the sheet's order.
PUMP_LIMITS = (
    "duty_flow",
    "npsh_available",
    "npsh_margin",
    "submergence",
    "preferred_operating_region",
    "min_continuous_flow",
    "thermal_min_flow",
    "curve_stability",
    "pressure_rating.casing",
    "motor_non_overloading",
    "motor_loading",
)

# What a state contributes to a column of the sheet: result key → key in the state's map.
_COLUMN = {
    "flow": ("flow",),
    "total_dynamic_head": ("total_dynamic_head",),
    "npsh_available": ("npsh_available",),
    "head": ("operating_point", "head"),
    "flow_per_pump": ("operating_point", "flow_per_pump"),
    "head_per_pump": ("operating_point", "head_per_pump"),
    "speed": ("operating_point", "speed"),
    "efficiency": ("operating_point", "efficiency"),
    "flow_ratio_bep": ("operating_point", "flow_ratio_bep"),
    "npsh_required": ("operating_point", "npsh_required"),
    "npsh_margin": ("operating_point", "npsh_margin"),
    "hydraulic_power": ("hydraulic_power",),
    "shaft_power": ("shaft_power",),
    "shaft_power_per_pump": ("shaft_power_per_pump",),
    "electrical_power": ("electrical_power",),
}


def rated_state(
    b: TraceBuilder,
    model: Model,
    design: route_pressure.State,
    curve: CurvePoints | None,
    eta_drive: Given,
    profile: dict[str, dict[str, Any]],
    states: dict[str, route_pressure.State],
) -> tuple[str, dict[str, Any] | None]:
    """The id of the state that holds the rated duty, and its result when it is a new one:
    under variable speed the running state ``R`` (to be routed, checked and kept with the
    profile states), at fixed speed the system's head and NPSH available at the required
    flow (not a state the pump runs in).

    The profile's point at the required flow serves when there is one (same flow to 1e-9).
    """
    q = model.flow.value
    variable = model.operation.control == "variable_speed" and curve is not None
    if not variable:
        if curve is None:  # no pump curve: the design case runs at the required flow
            return DESIGN_CASE, None
        point = replace(design.case, id=RATED_STATE, title="Rated duty: the required flow",
                        flow=model.flow)  # fmt: skip
        h = _hydraulics(b, model, point, design.liquid, design.surfaces)
        return RATED_STATE, {
            "flow": _q(model.flow),
            "total_dynamic_head": _q(h["tdh"]),
            "npsh_available": _q(h["npsh_available"]),
        }
    for i, (flow, _) in enumerate(model.operation.profile, start=1):
        if abs(flow.value - q) <= 1e-9 * q and f"P{i}" in profile:
            return f"P{i}", None
    assert curve is not None
    point = replace(
        design.case,
        id=RATED_STATE,
        title="Rated duty: the required flow at the speed that meets the system head",
        flow=model.flow,
    )
    return RATED_STATE, _profile_state(b, model, point, design, curve, eta_drive, states)


def rated_duty(
    b: TraceBuilder,
    model: Model,
    results: dict[str, Any],
    state_id: str,
    state: dict[str, Any],
    found: list[Check],
) -> dict[str, Any]:
    """The rated-duty block of the results (values copied from the states that hold them,
    each naming its step): the liquid, the arrangement, the duty column (``state_id``'s
    values) and, with a pump curve, the design case's column (its run-out at its speed,
    at fixed speed the operating point), the NPSH margin asked, the motor and
    the drive, and the governing state of each limit in :data:`PUMP_LIMITS`."""
    fluid = model.fluid
    out: dict[str, Any] = {
        "state": state_id,
        "control": model.operation.control,
        "liquid": "water" if fluid.kind == "water" else (fluid.name or fluid.kind),
        "temperature": _q(fluid.temperature),
        "density": results["fluid"]["density"],
        "viscosity": results["fluid"]["viscosity"],
        "vapor_pressure": results["fluid"]["vapor_pressure"],
        "arrangement": model.pump.arrangement if model.pump.count.value > 1 else "single",
        "pumps_running": results["pumps_running"],
        "pumps_standby": _q(model.pump.standby),
        "required_flow": results["required_flow"],
        "duty": _column(state, state_id),
    }
    # The design case runs at the pump's operating speed (a speed range's top is a case
    # of its own); the motor is sized on the fastest curve's peak power.
    speed = model.pump.speed or (model.pump.curve.speed if model.pump.curve else None)
    if "operating_point" in results:
        top = _column(results, DESIGN_CASE)
        if speed is not None and "speed" not in top:
            top["speed"] = _q(speed)
        out["top"] = top
        duty = out["duty"]
        if state_id == RATED_STATE and "operating_point" not in state:
            # At fixed speed the pump's own values are those of its operating point.
            duty["speed"] = top.get("speed")
        elif "speed" not in duty and speed is not None:
            duty["speed"] = _q(speed)
        out["duty"] = {k: v for k, v in duty.items() if v is not None}
    else:  # no pump curve: the speed and efficiency the design assumes, where given
        for key, given in (("speed", model.pump.speed), ("efficiency", model.pump.efficiency)):
            if given is not None:
                out["duty"][key] = _q(given)
    asked: dict[str, Any] = {}
    for key, name, unit in (
        ("ratio", "npsh_margin_ratio", ""),
        ("minimum", "npsh_margin_min", "m"),
    ):
        value, basis, reference, _ = criterion(model, name)
        given = model.criteria.given.get(name) or b.datum(f"catalog.criteria.{name}", value, unit)
        asked[key] = _q(given)
        asked.setdefault("basis", basis)
        asked.setdefault("reference", reference)
    out["npsh_margin_asked"] = asked
    motor = results.get("motor", {})
    for key in ("peak_shaft_power", "rated_power"):
        if key in motor:
            out[f"motor_{key}"] = motor[key]
    if "series" in motor:
        out["motor_series"] = motor["series"]
    if model.motor_efficiency is not None:
        out["motor_efficiency"] = _q(model.motor_efficiency)
    if model.drive_efficiency is not None:
        out["drive_efficiency"] = _q(model.drive_efficiency)
    by_id = {c.id: c.case for c in found}
    out["governing"] = {cid: by_id[cid] for cid in PUMP_LIMITS if cid in by_id}
    return out


def _column(state: dict[str, Any], state_id: str) -> dict[str, Any]:
    """The sheet's values held by one state (those it has)."""
    column: dict[str, Any] = {"state": state_id}
    for key, path in _COLUMN.items():
        node: Any = state
        for part in path:
            node = node.get(part) if isinstance(node, dict) else None
        if isinstance(node, dict) and "value" in node:
            column[key] = node
    return column
