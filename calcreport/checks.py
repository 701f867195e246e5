"""Design checks: each result against its criterion, with the criterion's basis.

Limits come from ``catalog/criteria.toml`` unless the input's ``[criteria]``
overrides them. A default limit marked common practice is a rule of thumb:
exceeding it asks for review. A limit the project sets itself is a
requirement of that project: exceeding it fails. Physical impossibilities
(no NPSH available at all) fail whatever the criteria.
"""

from __future__ import annotations

import re
from typing import Any

from calcreport import catalog
from calcreport.model.schema import Model
from calcreport.trace import Check

__all__ = ["evaluate"]

_EXIT = re.compile(r"\bexit\b|\boutlet\b|discharge into", re.IGNORECASE)


def evaluate(model: Model, results: dict[str, Any], case: str) -> list[Check]:
    """All design checks of one case's results."""
    found: list[Check] = []
    for pipe in model.pipes:
        found += _velocity(model, results["pipes"][pipe.id], pipe.id, pipe.side, case)
        found.append(_regime(results["pipes"][pipe.id], pipe.id, case))
    found += _npsh(results, case)
    exit_check = _exit_item(model, case)
    if exit_check:
        found.append(exit_check)
    return found


def _limit(model: Model, name: str) -> tuple[float, str, str, bool]:
    """Limit value (SI), basis, reference key, and whether the project set it."""
    from calcreport.units import parse

    default = catalog.criteria()[name]
    given = model.criteria.given.get(name)
    if given is not None:
        return given.value, f"Project criterion criteria.{name}", "input", True
    value = parse(default["value"], default["kind"])
    return value, default["basis"], default["reference"], False


def _status(ok: bool, project_set: bool) -> str:
    if ok:
        return "pass"
    return "fail" if project_set else "review"


def _velocity(
    model: Model, pipe: dict[str, Any], pipe_id: str, side: str, case: str
) -> list[Check]:
    v = pipe["velocity"]["value"]
    name = f"{side}_velocity_max"
    limit, basis, ref, project = _limit(model, name)
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
            message="" if v <= limit else f"{v:.3g} m/s exceeds the {side} limit {limit:.3g} m/s",
        )
    ]
    low, basis, ref, project = _limit(model, "velocity_min")
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
            message="" if v >= low else f"{v:.3g} m/s is below {low:.3g} m/s",
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


def _npsh(results: dict[str, Any], case: str) -> list[Check]:
    npsha = results["npsh_available"]["value"]
    positive = Check(
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
        message="" if npsha > 0.0 else f"NPSHa = {npsha:.3g} m: reduce suction lift or losses",
    )
    margin = Check(
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
        message="open item: pump not selected",
    )
    return [positive, margin]


def _exit_item(model: Model, case: str) -> Check | None:
    if model.destination.inlet != "submerged":
        return None
    has_exit = any(
        ft.kind == "exit" or _EXIT.search(ft.note) for pipe in model.pipes for ft in pipe.fittings
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
