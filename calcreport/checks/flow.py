"""Checks of each pipe's flow: velocity limits, the flow regime, a check valve held open, the
exit loss of a submerged inlet.
"""

from __future__ import annotations

from typing import Any

from calcreport.checks.criteria import _say, _status, criterion
from calcreport.model.schema import EXIT_NOTE, Model
from calcreport.physics.friction import LAMINAR_LIMIT, TURBULENT_LIMIT
from calcreport.trace import Check


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
            step=pipe["velocity"].get("from", ""),
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
            step=pipe["velocity"].get("from", ""),
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
        comparison=f"not in {LAMINAR_LIMIT:g}-{TURBULENT_LIMIT:g}",
        basis=f"Friction factors between Re {LAMINAR_LIMIT:g} and {TURBULENT_LIMIT:g} are "
        "uncertain; Colebrook is used there as the conservative value",
        reference="moody_1944",
        case=case,
        step=pipe["reynolds"].get("from", ""),
        message=f"Re = {Re:.0f}: {regime} flow" + (" (transition band)" if transition else ""),
    )


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
        step=pipe["velocity"].get("from", ""),
        message=""
        if ok
        else f"{_say(model, v, 'm/s')} is below {_say(model, v_min, 'm/s')}: "
        "size the valve smaller or choose another type",
        margin=v - v_min,
    )
