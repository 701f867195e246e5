"""Design checks: each result against its criterion, with the criterion's basis.

Limits come from ``catalog/criteria.toml`` unless the input's ``[criteria]`` overrides them.
A default limit not met (a rule of thumb marked common practice, or a published guideline)
asks for review; a limit the project sets itself is a requirement of that project, and
exceeding it fails. Physical impossibilities (no NPSH available at all) fail whatever the
criteria.

:func:`evaluate` runs the checks of one operating state, :func:`once` those of the whole
system, :func:`governing` keeps one check per id from the state that governs it. One module
a family: :mod:`~calcreport.checks.criteria` (limits, status, the states checked), :mod:`~.flow`,
:mod:`~.suction`, :mod:`~.operation`, :mod:`~.pressure` and :mod:`~.motor`.
"""

from __future__ import annotations

from typing import Any

from calcreport.checks.criteria import criterion, states
from calcreport.checks.flow import _check_valve, _exit_item, _regime, _velocity
from calcreport.checks.motor import _motor_loading, _motor_site
from calcreport.checks.operation import (
    _curve_stability,
    _duty,
    _operating_region,
    _thermal,
    _trim,
    _viscous,
    preferred_range,
)
from calcreport.checks.pressure import _min_pressure, _pressure_rating, _surge
from calcreport.checks.suction import (
    _npsh_margin,
    _npsh_open_item,
    _npsh_positive,
    _submergence,
    _suction_pressure,
)
from calcreport.model.schema import Model
from calcreport.trace import DESIGN_CASE, Check

__all__ = ["criterion", "evaluate", "governing", "once", "preferred_range", "states"]


_SEVERITY = {"fail": 0, "review": 1, "pass": 2}


def evaluate(model: Model, results: dict[str, Any], case: str) -> list[Check]:
    """The design checks of one operating case's results."""
    found: list[Check] = []
    for pipe in model.pipes:
        found += _velocity(model, results["pipes"][pipe.id], pipe.id, pipe.line, case)
        found.append(_regime(results["pipes"][pipe.id], pipe.id, case))
        if "check_valve_min_velocity" in results["pipes"][pipe.id]:
            found.append(_check_valve(model, results["pipes"][pipe.id], pipe.id, case))
    found.append(_npsh_positive(model, results, case))
    route = results.get("route", {})
    if "min_pressure_head" in route:
        found.append(_min_pressure(model, route, case))
    if "suction_min_pressure_head" in route:
        found.append(_suction_pressure(route, case))
    if "intake" in results:
        found.append(_submergence(model, results["intake"], case))
    if model.pump.curve is None:
        found.append(_npsh_open_item(results, case))
        return found
    point = results.get("operating_point")
    profile_point = results.get("state_kind") == "profile"
    if point is None:
        found.append(
            Check(
                id="operating_point",
                title="Pump and system curves intersect",
                # A case that need not meet the duty (a pump out, a speed extreme) informs.
                status="fail" if results.get("duty_case", True) else "review",
                value=None,
                unit="",
                limit=None,
                comparison="exists",
                basis="The pump runs where its curve meets the system curve; without an "
                "intersection within the curve data the pump cannot serve this case"
                + (" (a duty-profile point must be served at its flow)" if profile_point else ""),
                reference="karassik_2008",
                case=case,
                message=f"the pump cannot run at this profile point: {results['unserved']}"
                if profile_point
                else "no intersection within the curve data; see the notes",
            )
        )
        return found
    # A profile point runs at its own flow by its control: no duty margin to meet there.
    if results.get("duty_case", True) and not profile_point:
        found.append(_duty(model, results, point, case))
    if "npsh_required" in point:
        found.append(_npsh_margin(model, results, point, case))
    else:
        found.append(_npsh_open_item(results, case))
    if "flow_ratio_bep" in point:
        found += _operating_region(model, point, case)
    if model.pump.min_continuous_flow is not None:
        minimum = model.pump.min_continuous_flow.value
        # At another speed, the flow that corresponds to the curve's speed (affinity laws).
        q = point.get("curve_flow", point.get("flow_per_pump", point["flow"]))["value"]
        found.append(
            Check(
                id="min_continuous_flow",
                title="Operating flow above the minimum continuous flow",
                status="pass" if q >= minimum else "fail",
                value=q,
                unit="m^3/s",
                limit=minimum,
                comparison=">=",
                basis="Pump data: minimum continuous stable flow (pump.min_continuous_flow) at "
                "the curve's speed; a state at another speed is compared at its corresponding "
                "flow Q·n0/n (affinity laws)",
                reference="input",
                case=case,
                message="" if q >= minimum else "the pump would run below its minimum flow",
                margin=q - minimum,
            )
        )
    return found


def once(model: Model, results: dict[str, Any]) -> list[Check]:
    """Checks that concern the whole system rather than one case."""
    found = []
    exit_check = _exit_item(model, DESIGN_CASE)
    if exit_check:
        found.append(exit_check)
    if "pump_curve" in results:
        found.append(_curve_stability(model, results))
    if model.pump.trim is not None:
        found.append(_trim(model))
    if "minimum_lift_speed" in results and model.pump.speed_range:
        n_lift = results["minimum_lift_speed"]["value"]
        n_min = model.pump.speed_range[0].value
        found.append(
            Check(
                id="minimum_speed",
                title="Minimum speed above the speed that lifts the static head",
                status="pass" if n_min > n_lift else "fail",
                value=n_min,
                unit="1/s",
                limit=n_lift,
                comparison=">",
                basis="Below this speed the shutoff head is less than the static "
                "head and the pump delivers nothing (affinity laws)",
                reference="karassik_2008",
                case="all",
                step=results["minimum_lift_speed"].get("from", ""),
                margin=n_min - n_lift,
                message="" if n_min > n_lift else "the minimum speed delivers no flow",
            )
        )
    if "thermal_min_flow" in results:
        found.append(_thermal(model, results))
    viscous = [
        (cid, r["viscous_correction"])
        for cid, r in results["cases"].items()
        if "viscous_correction" in r
    ]
    if viscous:
        found.append(_viscous(viscous))
    route = results.get("route", {})
    found += [_pressure_rating(model, rated) for rated in route.get("ratings", [])]
    if "surge" in results:
        events = results["surge"].get("events") or {"": results["surge"]}
        found += [_surge(ev) for ev in events.values()]
    motor = results.get("motor", {})
    site = _motor_site(model, motor)
    if site:
        found.append(site)
    if "rated_power" in motor:
        rated = motor["rated_power"]["value"] * motor.get("derating", {"value": 1.0})["value"]
        peak = motor["peak_shaft_power"]["value"]
        found.append(
            Check(
                id="motor_non_overloading",
                title="Motor rating covers the whole pump curve",
                status="pass" if rated >= peak else "fail",
                value=peak,
                unit="W",
                limit=rated,
                comparison="<=",
                basis="Non-overloading selection: the motor rating at service "
                "factor 1.0 (times the site derating, where given) is not below the largest "
                "shaft power anywhere on the pump curve",
                reference="karassik_2008",
                case="all",
                step=motor["peak_shaft_power"].get("from", ""),
            )
        )
        if motor.get("loading"):
            found.append(_motor_loading(motor))
    elif "peak_shaft_power" in motor:
        found.append(
            Check(
                id="motor_non_overloading",
                title="Motor rating covers the whole pump curve",
                status="fail",
                value=motor["peak_shaft_power"]["value"],
                unit="W",
                limit=None,
                comparison="<=",
                basis="The peak shaft power exceeds the largest standard rating in the catalogue",
                reference="iec_60072",
                case="all",
                step=motor["peak_shaft_power"].get("from", ""),
            )
        )
    return found


def governing(checks: list[Check]) -> list[Check]:
    """One check per id: the one of the case that governs (worst status, then worst value)."""
    best: dict[str, Check] = {}
    for check in checks:
        held = best.get(check.id)
        if held is None or _worse(check, held):
            best[check.id] = check
    return list(best.values())


def _worse(a: Check, b: Check) -> bool:
    if _SEVERITY[a.status] != _SEVERITY[b.status]:
        return _SEVERITY[a.status] < _SEVERITY[b.status]
    if a.margin is None or b.margin is None:
        return False
    return a.margin < b.margin
