"""Checks of the suction: NPSH available and its margin over NPSH required, intake
submergence, the suction line above the vapour pressure.
"""

from __future__ import annotations

from typing import Any

from calcreport.checks.criteria import _say, criterion
from calcreport.model.schema import Model
from calcreport.physics import pump
from calcreport.trace import Check


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
        step=results["npsh_available"].get("from", ""),
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
        step=results["npsh_available"].get("from", ""),
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
        step=results["npsh_available"].get("from", ""),
        message=""
        if ok
        else (
            f"NPSHa {_say(model, npsha, 'm')} against NPSHr {_say(model, npshr, 'm')}"
            + (": the pump cavitates" if npsha <= npshr else "")
        ),
        margin=npsha - needed,
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
        step=intake["submergence"].get("from", ""),
        message=""
        if ok
        else f"{_say(model, S, 'm')} of submergence is less than {_say(model, S_min, 'm')}",
        margin=S - S_min,
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
        step=route["suction_min_pressure_head"].get("from", ""),
        message=f"lowest at {node}" + ("" if ok else ": the liquid boils in the suction line"),
        margin=h - h_vap,
    )
