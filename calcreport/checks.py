"""Design checks: each result against its criterion, with the criterion's basis.

Limits come from ``catalog/criteria.toml`` unless the input's ``[criteria]``
overrides them. A default limit marked common practice is a rule of thumb:
exceeding it asks for review. A limit the project sets itself is a
requirement of that project: exceeding it fails. Physical impossibilities
(no NPSH available at all) fail whatever the criteria.
"""

from __future__ import annotations

from functools import cache
from typing import Any

from calcreport import catalog
from calcreport.model.schema import EXIT_NOTE, Model
from calcreport.physics import pump
from calcreport.trace import Check
from calcreport.units import KIND_OF_SI_UNIT, parse, pretty_unit, show

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
    exit_check = _exit_item(model, "C1")
    if exit_check:
        found.append(exit_check)
    if "pump_curve" in results:
        found.append(_curve_stability(model, results))
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
            )
        )
    return found


def _motor_loading(motor: dict[str, Any]) -> Check:
    """The most loaded state: each pump's shaft power within the motor's rated output."""
    loading = motor["loading"]
    state = max(loading, key=lambda k: loading[k]["value"])
    value = loading[state]["value"]
    limit = motor.get("derating", {"value": 1.0})["value"]
    ok = value <= limit
    return Check(
        id="motor_loading",
        title="Motor loading in every operating state",
        status="pass" if ok else "fail",
        value=value,
        unit="",
        limit=limit,
        comparison="<=",
        basis="Each pump's shaft power in every case and duty-profile point, over the motor "
        "rating (times the site derating, where given), at most 1 at service factor 1.0",
        reference="karassik_2008",
        case=state,
        message=f"most loaded in {state}" + ("" if ok else ": the motor is overloaded"),
        margin=limit - value,
    )


def _curve_stability(model: Model, results: dict[str, Any]) -> Check:
    """A head curve that rises from shutoff before falling can hunt between two flows."""
    heads = results["pump_curve"]["head"]["value"]
    shutoff, peak = heads[0], max(heads)
    drooping = peak > shutoff * (1 + 1e-6)
    # The highest static head of any state the pump runs in, not the design case's alone.
    case, static = max(
        (
            (cid, r["static_head"]["value"] + r["pressure_head"]["value"])
            for cid, r in states(results).items()
        ),
        key=lambda item: item[1],
    )
    parallel = model.pump.count.value > 1 and model.pump.arrangement == "parallel"
    risky = drooping and (parallel or static > shutoff)
    why = []
    if parallel:
        why.append("pumps run in parallel")
    if static > shutoff:
        why.append("the static head exceeds the shutoff head")
    return Check(
        id="curve_stability",
        title="Head curve rises steadily to shutoff",
        status="review" if risky else "pass",
        value=peak - shutoff,
        unit="m",
        limit=0.0,
        comparison="<=",
        basis="A drooping curve (head at shutoff below the curve's peak) "
        "can operate at two flows for one head: unstable in parallel operation and against a "
        "high static head",
        reference="karassik_2008",
        case=case,
        message=("drooping curve; " + " and ".join(why))
        if risky
        else (
            "drooping curve, acceptable here: single pump against a lower static head"
            if drooping
            else ""
        ),
        margin=shutoff - peak,
    )


def states(results: dict[str, Any]) -> dict[str, dict[str, Any]]:
    """Every operating state of a solve's results: the cases, then the duty-profile points."""
    return {**results["cases"], **results.get("profile_states", {})}


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


def criterion(model: Model, name: str) -> tuple[float, str, str, bool]:
    """Limit value (SI), basis, reference key, and whether the project set it."""
    given = model.criteria.given.get(name)
    if given is not None:
        return given.value, f"Project criterion criteria.{name}", "input", True
    default = catalog.criteria()[name]
    system = model.project.units if "us_value" in default else "SI"
    basis = default["basis"]
    if system == "US":
        number, unit = default["us_value"].split(" ", 1)
        basis += (
            f". In US units the limit is {number} {pretty_unit(unit)}, {default['us_basis']} "
            f"({default['value']} in SI)"
        )
    return _default_value(name, system), basis, default["reference"], False


@cache
def _default_value(name: str, system: str) -> float:
    """A default limit in SI: in a US report its customary value where the table gives one."""
    default = catalog.criteria()[name]
    return parse(default["us_value" if system == "US" else "value"], default["kind"])


def _say(model: Model, value: float, si_unit: str) -> str:
    """A value for a check's message, in the report's units (``"4.92 ft/s"``)."""
    return show({"value": value, "unit": si_unit}, KIND_OF_SI_UNIT[si_unit], model.project.units, 3)


def _status(ok: bool, project_set: bool) -> str:
    if ok:
        return "pass"
    return "fail" if project_set else "review"


def _velocity(
    model: Model, pipe: dict[str, Any], pipe_id: str, side: str, case: str
) -> list[Check]:
    v = pipe["velocity"]["value"]
    name = f"{side}_velocity_max"
    limit, basis, ref, project = criterion(model, name)
    checks = [
        Check(
            id=f"velocity_max.{pipe_id}",
            title=f"Velocity in {side} pipe {pipe_id}",
            status=_status(v <= limit, project),
            value=v,
            unit="m/s",
            limit=limit,
            comparison="<=",
            basis=basis,
            reference=ref,
            case=case,
            message=""
            if v <= limit
            else f"{_say(model, v, 'm/s')} exceeds the {side} limit {_say(model, limit, 'm/s')}",
            margin=limit - v,
        )
    ]
    low, basis, ref, project = criterion(model, "velocity_min")
    checks.append(
        Check(
            id=f"velocity_min.{pipe_id}",
            title=f"Minimum velocity in pipe {pipe_id}",
            status=_status(v >= low, project),
            value=v,
            unit="m/s",
            limit=low,
            comparison=">=",
            basis=basis,
            reference=ref,
            case=case,
            message=""
            if v >= low
            else f"{_say(model, v, 'm/s')} is below {_say(model, low, 'm/s')}",
            margin=v - low,
        )
    )
    return checks


def _regime(pipe: dict[str, Any], pipe_id: str, case: str) -> Check:
    regime = pipe["regime"]
    Re = pipe["reynolds"]["value"]
    transition = regime == "transition"
    return Check(
        id=f"flow_regime.{pipe_id}",
        title=f"Flow regime in pipe {pipe_id}",
        status="review" if transition else "pass",
        value=Re,
        unit="",
        limit=None,
        comparison="not in 2000-4000",
        basis="Friction factors between Re 2000 and 4000 are uncertain; Colebrook is used "
        "there as the conservative value",
        reference="moody_1944",
        case=case,
        message=f"Re = {Re:.0f}: {regime} flow" + (" (transition band)" if transition else ""),
    )


def _npsh_positive(model: Model, results: dict[str, Any], case: str) -> Check:
    npsha = results["npsh_available"]["value"]
    return Check(
        id="npsh_available",
        title="NPSH available is positive",
        status="pass" if npsha > 0.0 else "fail",
        value=npsha,
        unit="m",
        limit=0.0,
        comparison=">",
        basis="With NPSHa at or below zero the liquid vaporises at the pump "
        "inlet whatever pump is chosen (suction lift beyond what the site allows)",
        reference="hi_npsh",
        case=case,
        message=""
        if npsha > 0.0
        else f"NPSHa = {_say(model, npsha, 'm')}: reduce suction lift or losses",
        margin=npsha,
    )


def _npsh_open_item(results: dict[str, Any], case: str) -> Check:
    npsha = results["npsh_available"]["value"]
    return Check(
        id="npsh_margin",
        title="NPSH margin over NPSH required",
        status="review",
        value=npsha,
        unit="m",
        limit=None,
        comparison=">=",
        basis="NPSH required is not known until a pump is selected; compare NPSHa with the "
        "selected pump's NPSH3 and the margin its application needs",
        reference="hi_npsh",
        case=case,
        message="open item: NPSH required not known",
        margin=npsha,
    )


def _npsh_margin(model: Model, results: dict[str, Any], point: dict[str, Any], case: str) -> Check:
    npsha = results["npsh_available"]["value"]
    npshr = point["npsh_required"]["value"]
    ratio, basis_r, ref, project_r = criterion(model, "npsh_margin_ratio")
    minimum, _, _, project_m = criterion(model, "npsh_margin_min")
    needed = float(pump.npsh_needed(npshr, ratio, minimum))
    ok = npsha >= needed
    status = "pass" if ok else ("fail" if npsha <= npshr or project_r or project_m else "review")
    return Check(
        id="npsh_margin",
        title="NPSH margin over NPSH required",
        status=status,
        value=npsha,
        unit="m",
        limit=needed,
        comparison=">=",
        basis=f"NPSHa at least the greater of {ratio:g} × NPSHr and NPSHr + {minimum:g} m. "
        f"{basis_r}",
        reference=ref,
        case=case,
        message=""
        if ok
        else (
            f"NPSHa {_say(model, npsha, 'm')} against NPSHr {_say(model, npshr, 'm')}"
            + (": the pump cavitates" if npsha <= npshr else "")
        ),
        margin=npsha - needed,
    )


def _duty(model: Model, results: dict[str, Any], point: dict[str, Any], case: str) -> Check:
    q, required = point["flow"]["value"], results["required_flow"]["value"]
    margin, _, _, project = criterion(model, "duty_flow_margin")
    needed = required * (1.0 + margin)
    ok = q >= needed * (1 - 1e-9)
    grade = model.pump.provenance.get("acceptance_grade")
    tolerance = (
        f"the vendor's test tolerance (ISO 9906 acceptance grade {grade}) is "
        + ("covered by the margin" if project else "not deducted")
        if grade
        else "the vendor's test tolerance (ISO 9906 acceptance grade) is not included"
    )
    with_margin = f" plus the project margin of {margin:.3g} (criteria.duty_flow_margin)"
    return Check(
        id="duty_flow",
        title="Operating flow meets the required flow",
        status="pass" if ok else "fail",
        value=q,
        unit="m^3/s",
        limit=needed,
        comparison=">=",
        basis="The operating flow of the selected pump is not below "
        "the case's required flow (duty.flow, or the peak of envelope.flow_required)"
        + (with_margin if project else "")
        + f"; {tolerance}",
        reference="input",
        case=case,
        message=""
        if ok
        else f"delivers {_say(model, q, 'm^3/s')} of the {_say(model, needed, 'm^3/s')} required",
        margin=q - needed,
    )


def preferred_range(model: Model) -> tuple[float, float, str, str]:
    """Preferred operating region as fractions of the BEP flow, with basis and reference."""
    if model.pump.preferred_range:
        low, high = (g.value for g in model.pump.preferred_range)
        return (
            low,
            high,
            "Preferred operating region from the pump data (pump.preferred_range)",
            "input",
        )
    low, basis, ref, _ = criterion(model, "preferred_flow_low")
    high, _, _, _ = criterion(model, "preferred_flow_high")
    return low, high, basis, ref


def _operating_region(model: Model, point: dict[str, Any], case: str) -> list[Check]:
    ratio = point["flow_ratio_bep"]["value"]
    low, high, basis, ref = preferred_range(model)
    inside = low <= ratio <= high
    found = [
        Check(
            id="preferred_operating_region",
            title="Operating flow within the preferred region",
            status="pass" if inside else "review",
            value=ratio,
            unit="",
            limit=None,
            comparison=f"{low:g}–{high:g} × Q_BEP",
            basis=basis,
            reference=ref,
            case=case,
            message=f"Q/Q_BEP = {ratio:.3f}",
            margin=min(ratio - low, high - ratio),
        )
    ]
    if model.pump.allowable_range:
        low, high = (g.value for g in model.pump.allowable_range)
        inside = low <= ratio <= high
        found.append(
            Check(
                id="allowable_operating_region",
                title="Operating flow within the allowable region",
                status="pass" if inside else "fail",
                value=ratio,
                unit="",
                limit=None,
                comparison=f"{low:g}–{high:g} × Q_BEP",
                basis="Allowable operating region from the pump data (pump.allowable_range)",
                reference="input",
                case=case,
                message=f"Q/Q_BEP = {ratio:.3f}",
                margin=min(ratio - low, high - ratio),
            )
        )
    return found


def _exit_item(model: Model, case: str) -> Check | None:
    if model.destination.inlet != "submerged":
        return None
    has_exit = any(
        ft.kind == "exit" or EXIT_NOTE.search(ft.note)
        for pipe in model.pipes
        for ft in pipe.fittings
    )
    return Check(
        id="exit_loss_item",
        title="Exit loss of the submerged inlet is listed",
        status="pass" if has_exit else "review",
        value=None,
        unit="",
        limit=None,
        comparison="present",
        basis="The energy equation is written surface to surface: the exit loss (K = 1) "
        "must be a fitting item of the last pipe",
        reference="calcreport_conventions",
        case=case,
        message=""
        if has_exit
        else "no fitting item is noted as the exit; add "
        '{ K = 1.0, note = "exit" } to the last pipe if it discharges below the surface',
    )


def _min_pressure(model: Model, route: dict[str, Any], case: str) -> Check:
    """The lowest pressure of the pressurised line: positive, and above the criterion."""
    h = route["min_pressure_head"]["value"]
    node = route["min_pressure_node"]
    limit, basis, ref, project = criterion(model, "min_pressure_head")
    if h <= route["vapour_head"]["value"]:
        status, message = "fail", f"{node} at vapour pressure: the liquid column separates"
    elif h < 0.0:
        status = "fail"
        message = (
            f"sub-atmospheric at {node} ({_shown(model, h, 'm', 'length')} gauge): air and "
            "groundwater drawn in, or a siphon the flow depends on"
        )
    else:
        status = _status(h >= limit, project)
        message = f"lowest at {node}" + (
            "" if h >= limit else f", below {_shown(model, limit, 'm', 'length')}"
        )
    return Check(
        id="min_pressure",
        title="Lowest pressure head in the discharge line",
        status=status,
        value=h,
        unit="m",
        limit=limit,
        comparison=">=",
        basis=basis,
        reference=ref,
        case=case,
        message=message,
        margin=h - limit,
    )


def _shown(model: Model, value: float, si_unit: str, kind: str) -> str:
    """A value for a check's message, in the report's units."""
    from calcreport.units import show

    return show({"value": value, "unit": si_unit}, kind, model.project.units)


def _pressure_rating(model: Model, rc: dict[str, Any]) -> Check:
    """One rated item's highest pressure against its rating, at the point where they come
    closest; an operating pressure above it fails whether or not the pump is selected."""
    rating = rc["rating"]["value"]
    if "pressure" not in rc:
        return Check(
            id=f"pressure_rating.{rc['id']}",
            title=f"Highest pressure on {rc['item']} within its rating",
            status="review",
            value=None,
            unit="Pa",
            limit=rating,
            comparison="<=",
            basis="A rating is checked where the route gives the pipe's end elevations",
            reference="input",
            case="all",
            message=f"{rc['item']}: not checked, pipe {rc['pipe']} having no elevations; give "
            "its elevation_start and elevation_end",
        )
    p = rc["pressure"]["value"]
    within = p <= rating
    when = {
        "static": "with no flow and the pump at its highest curve head (top speed, highest "
        "source level)",
        "surge": f"during the screened surge (state {rc['case']})",
        "operating": f"in operation (state {rc['case']})",
    }[rc["basis"]]
    status = "fail" if not within else ("pass" if rc["shutoff_known"] else "review")
    # The value and the rating stand in the check's own columns.
    message = f"at {rc['node']}, {when}"
    if within and not rc["shutoff_known"]:
        message += "; confirm against the selected pump's shutoff head"
    return Check(
        id=f"pressure_rating.{rc['id']}",
        title=f"Highest pressure on {rc['item']} within its rating",
        status=status,
        value=p,
        unit="Pa",
        limit=rating,
        comparison="<=",
        basis="The highest pressure the item can see, over the pump's highest head against a "
        "closed line, every operating state and the screened surge, must not exceed its "
        "rating (gauge, at the design temperature); ratings and test pressures per the "
        "applicable piping code",
        reference="input",
        case=rc["case"],
        message=message,
        margin=rating - p,
    )


def _surge(result: dict[str, Any]) -> Check:
    """The surge screening's verdict: a tripped screening asks for a transient analysis."""
    verdict = result["verdict"]
    if not result.get("screened", True):
        status, value, limit, comparison = "review", None, None, "screened"
    elif result["event"] == "valve_closure":
        value, limit = result["closure_time"]["value"], result["line_period"]["value"]
        # A slow closure passes when its estimated rise is set against a rating somewhere.
        comparison = ">"
        status = "pass" if value > limit and result.get("rise_checked") else "review"
    elif "min_transient_pressure_head" in result:
        value = result["min_transient_pressure_head"]["value"]
        limit = result["vapour_head"]["value"]
        comparison = ">"
        status = "fail" if value <= limit else ("review" if value < 0.0 else "pass")
    else:
        status, value, limit, comparison = "review", result["head_rise"]["value"], None, "known"
    unit = "s" if result["event"] == "valve_closure" and value is not None else "m"
    return Check(
        id=f"surge.{result['event']}",
        title="Surge screening (" + result["event"].replace("_", " ") + ")",
        status=status,
        value=value,
        unit=unit,
        limit=limit,
        comparison=comparison,
        basis="Joukowsky head change of the line's pipes in series with the Korteweg wave "
        "speed; a pump trip is screened on every pumped line; a screening that trips (column "
        "separation, sub-atmospheric downsurge, closure within 2L/a) requires a detailed "
        "transient analysis",
        reference="series_pipes_surge",
        case=result.get("case", "all"),
        message=verdict,
    )


def _submergence(model: Model, intake: dict[str, Any], case: str) -> Check:
    """Submergence of the inlet at the lowest level: the standard's minimum, for review."""
    S, S_min = intake["submergence"]["value"], intake["minimum_submergence"]["value"]
    ok = S >= S_min
    return Check(
        id="submergence",
        title="Submergence of the suction inlet",
        status="pass" if ok else "review",
        value=S,
        unit="m",
        limit=S_min,
        comparison=">=",
        basis="Minimum submergence S = D(1 + 2.3 F_D) against air-entraining surface "
        "vortices at the lowest level (a recommendation for intakes laid out to the standard; "
        "a model study may justify less)",
        reference="hi_intake",
        case=case,
        message=""
        if ok
        else f"{_say(model, S, 'm')} of submergence is less than {_say(model, S_min, 'm')}",
        margin=S - S_min,
    )


def _check_valve(model: Model, pipe: dict[str, Any], pipe_id: str, case: str) -> Check:
    """A swing check valve below its full-lift velocity: its disc floats part-open."""
    v, v_min = pipe["velocity"]["value"], pipe["check_valve_min_velocity"]["value"]
    ok = v >= v_min
    return Check(
        id=f"check_valve_lift.{pipe_id}",
        title=f"Swing check valve in {pipe_id} held fully open",
        status="pass" if ok else "review",
        value=v,
        unit="m/s",
        limit=v_min,
        comparison=">=",
        basis="Below its full-lift velocity a swing check valve's disc floats part-open, "
        "chatters and wears, and its loss exceeds the fully-open K used here (Crane TP-410; "
        "constant from memory)",
        reference="crane_tp410",
        case=case,
        message=""
        if ok
        else f"{_say(model, v, 'm/s')} is below {_say(model, v_min, 'm/s')}: "
        "size the valve smaller or choose another type",
        margin=v - v_min,
    )


def _suction_pressure(route: dict[str, Any], case: str) -> Check:
    """The suction line's lowest pressure: below atmospheric is allowed, vapour is not."""
    h, h_vap = route["suction_min_pressure_head"]["value"], route["vapour_head"]["value"]
    node = route["suction_min_pressure_node"]
    ok = h > h_vap
    return Check(
        id="suction_pressure",
        title="Suction line above vapour pressure",
        status="pass" if ok else "fail",
        value=h,
        unit="m",
        limit=h_vap,
        comparison=">",
        basis="The suction line may run below atmospheric pressure (a suction lift), but where "
        "it reaches the liquid's vapour pressure the liquid boils and the column breaks "
        "before the pump",
        reference="white_fm",
        case=case,
        message=f"lowest at {node}" + ("" if ok else ": the liquid boils in the suction line"),
        margin=h - h_vap,
    )


# IEC 60034-1 and NEMA MG 1 rate motors for sites up to 1000 m and 40 degC coolant.
MOTOR_ALTITUDE_MAX = 1000.0
MOTOR_AMBIENT_MAX = 313.15


def _motor_site(model: Model, motor: dict[str, Any]) -> Check | None:
    """A site beyond the motor standard's usual conditions needs the maker's derating."""
    if "rated_power" not in motor:
        return None
    high = model.site.elevation is not None and model.site.elevation.value > MOTOR_ALTITUDE_MAX
    hot = model.motor_ambient is not None and model.motor_ambient.value > MOTOR_AMBIENT_MAX
    if not (high or hot):
        return None
    derated = model.motor_derating is not None
    beyond = " and ".join(
        w for w, on in (("above 1000 m", high), ("above 40 °C ambient", hot)) if on
    )
    return Check(
        id="motor_site_derating",
        title="Motor derated for its site",
        status="pass" if derated else "review",
        value=model.motor_derating.value if derated else None,
        unit="",
        limit=None,
        comparison="given",
        basis="Rated output holds up to 1000 m altitude and 40 °C coolant (IEC 60034-1, NEMA "
        "MG 1 usual service conditions); beyond them the manufacturer's derating factor "
        "(motor.derating) applies",
        reference="iec_60034_1",
        case="all",
        message=f"site {beyond}"
        + ("; derating applied" if derated else ": give motor.derating from the motor maker"),
    )


def _thermal(model: Model, results: dict[str, Any]) -> Check:
    """Every state's operating flow (each pump's) above the thermal minimum flow (at a reduced
    speed the temperature rise is lower at the same flow: the full-speed limit is on the
    safe side)."""
    q_th = results["thermal_min_flow"]["flow"]["value"]
    flows = {
        cid: r["operating_point"].get("flow_per_pump", r["operating_point"]["flow"])["value"]
        for cid, r in states(results).items()
        if "operating_point" in r
    }
    if not flows:
        flows = {"C1": results["flow"]["value"]}
    case = min(flows, key=lambda c: flows[c])
    q = flows[case]
    _, basis, ref, project = criterion(model, "temperature_rise_max")
    ok = q >= q_th
    return Check(
        id="thermal_min_flow",
        title="Operating flow above the thermal minimum flow",
        status=_status(ok, project),
        value=q,
        unit="m^3/s",
        limit=q_th,
        comparison=">=",
        basis=basis,
        reference=ref,
        case=case,
        message="" if ok else "the liquid warms beyond the limit through the pump",
        margin=q - q_th,
    )


def _viscous(corrections: list[tuple[str, dict[str, Any]]]) -> Check:
    """The viscosity correction: within the method's range, and applied only for review."""
    case, worst = max(corrections, key=lambda c: c[1]["parameter"]["value"])
    B = worst["parameter"]["value"]
    beyond = worst.get("beyond_range", False)
    status = "fail" if beyond else ("review" if worst["applied"] else "pass")
    message = {
        "fail": "too viscous for the method: consider a positive-displacement pump",
        "review": "the water curve is corrected; verify the factors against ANSI/HI 9.6.7 "
        "(equations as recalled)",
        "pass": "no correction needed (B at most 1)",
    }[status]
    return Check(
        id="viscous_correction",
        title="Viscosity correction of the pump curve",
        status=status,
        value=B,
        unit="",
        limit=40.0,
        comparison="<",
        basis="ANSI/HI 9.6.7 corrects water performance for a viscous liquid from the "
        "parameter B: none for B up to 1, the method's range ends at B = 40",
        reference="hi_viscous",
        case=case,
        message=message,
        margin=40.0 - B,
    )
