"""Checks of the pump's operation: the duty met, the preferred and allowable regions about
the BEP, a stable curve, the thermal minimum flow, a viscous-liquid correction in range.
"""

from __future__ import annotations

from typing import Any

from calcreport.checks.criteria import _say, _status, criterion, states
from calcreport.model.schema import Model
from calcreport.physics import viscous
from calcreport.trace import DESIGN_CASE, Check


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
    # A drooping curve is acceptable for a single pump whose static head stays below the
    # shutoff head: the check then states that comparison, the one it passes on.
    accepted = drooping and not risky
    return Check(
        id="curve_stability",
        title="Head curve rises steadily to shutoff",
        status="review" if risky else "pass",
        value=static if accepted else peak - shutoff,
        unit="m",
        limit=shutoff if accepted else 0.0,
        comparison="<" if accepted else "<=",
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
        margin=shutoff - static if accepted else shutoff - peak,
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
        step=point["flow"].get("from", ""),
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
            step=point["flow_ratio_bep"].get("from", ""),
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
                step=point["flow_ratio_bep"].get("from", ""),
                message=f"Q/Q_BEP = {ratio:.3f}",
                margin=min(ratio - low, high - ratio),
            )
        )
    return found


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
        flows = {DESIGN_CASE: results["flow"]["value"]}
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
        "review": "the water curve is corrected; verify the factors against "
        f"{viscous.STANDARD} "
        "(equations as recalled)",
        "pass": "no correction needed (B at most 1)",
    }[status]
    return Check(
        id="viscous_correction",
        title="Viscosity correction of the pump curve",
        status=status,
        value=B,
        unit="",
        limit=viscous.B_MAX,
        comparison="<",
        basis=f"{viscous.STANDARD} corrects water performance for a viscous liquid from the "
        f"parameter B: none for B up to 1, the method's range ends at B = {viscous.B_MAX:g}",
        reference="hi_viscous",
        case=case,
        step=worst["parameter"].get("from", ""),
        message=message,
        margin=viscous.B_MAX - B,
    )


def _trim(model: Model) -> Check:
    """The impeller trim within the range the affinity relation for diameter is used over."""
    assert model.pump.trim is not None
    r = model.pump.trim.value
    limit, basis, ref, project = criterion(model, "impeller_trim_min")
    ok = r >= limit
    return Check(
        id="impeller_trim",
        title="Impeller trim within the range of the affinity relation",
        status=_status(ok, project),
        value=r,
        unit="",
        limit=limit,
        comparison=">=",
        basis=basis,
        reference=ref,
        case="all",
        message=f"D/D0 = {r:.3f}"
        + ("" if ok else ": beyond the relation's range; use the manufacturer's trimmed curve"),
        margin=r - limit,
    )
