"""Hydraulics of a case: each pipe's velocity, Reynolds number, friction factor, friction
and fitting losses, the system heads and TDH.

Written once and run by two evaluators: :class:`~calcreport.trace.TraceBuilder` records each
step at the case's flow, :class:`_Sweep` evaluates the same equations on an array of flows for
the system curve, so the curve passes exactly through the recorded duty point.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from calcreport import catalog
from calcreport.model.schema import Fitting, Given, Model, Pipe
from calcreport.physics import fittings, friction, head, losses, pump
from calcreport.solver import route_pressure
from calcreport.solver.states import (
    Case,
    CaseHydraulics,
    Evaluator,
    FittingLoss,
    Liquid,
    PipeHydraulics,
    Surfaces,
)


class _Sweep:
    """Evaluates the equations on arrays without recording steps."""

    records = False

    def step(self, step_id: str, title: str, func: Any, case: str = "", **args: Any) -> Given:
        values = {
            name: [a.value for a in arg] if isinstance(arg, list) else arg.value
            for name, arg in args.items()
        }
        if func is friction.colebrook:
            func = _friction_factor_array
        if "Re" in values:  # at zero flow: the laminar terms vanish with the velocity head
            values["Re"] = np.maximum(values["Re"], 1e-12)
        return Given(func(**values), "", step_id)

    def datum(self, key: str, value: float, unit: str) -> Given:
        return Given(value, unit, key)

    def assume(self, text: str, value: float, unit: str) -> Given:
        return Given(value, unit, "assumption")


def _friction_factor_array(Re: Any, eD: Any) -> Any:
    Re = np.maximum(Re, 1e-12)
    laminar = Re < friction.LAMINAR_LIMIT
    f = np.where(laminar, 64.0 / Re, 0.0)
    if np.any(~laminar):
        f[~laminar] = friction.colebrook(Re[~laminar], np.broadcast_to(eD, Re.shape)[~laminar])
    return f


def _diameter_change_k(ev: Evaluator, case: Case, pipe: Pipe, ft: Fitting, index: int) -> Given:
    """K of an expander or reducer (Crane TP-410), referred to this pipe's velocity."""
    assert ft.other_diameter is not None
    here, other = pipe.inner_diameter, ft.other_diameter
    small, large = (here, other) if here.value <= other.value else (other, here)
    angle = ft.angle or ev.assume(
        "An expander or reducer without an angle is sudden (180 deg).", math.pi, "rad"
    )
    law = fittings.expansion if ft.kind == "expander" else fittings.contraction
    sid = case.sid(f"pipe.{pipe.id}.fitting[{index}]")
    K = ev.step(
        f"{sid}.K_small",
        f"Coefficient of the {ft.kind} in {pipe.id} (on the smaller diameter)",
        law,
        case.id,
        d=small,
        D=large,
        angle=angle,
    )
    if here.value <= other.value:
        return K
    return ev.step(
        f"{sid}.K",
        f"Coefficient of the {ft.kind}, referred to {pipe.id}",
        fittings.refer_to_pipe,
        case.id,
        K_d=K,
        d=small,
        D_pipe=here,
    )


def _catalog_k(
    ev: Evaluator,
    case: Case,
    pipe: Pipe,
    kind: str,
    label: str,
    index: int,
    Re: Given,
    method: str = "two_k",
) -> Given:
    """K of a named fitting: a catalogue constant, or the project's method (Hooper's
    two-K or Darby's three-K) at the pipe's Re and size."""
    entry = catalog.fittings()[kind]
    base = f"catalog.fittings.{kind}"
    if entry["method"] == "constant":
        return ev.datum(f"{base}.K", entry["K"], "")
    if entry["method"] == "crane":
        return ev.step(
            case.sid(f"pipe.{pipe.id}.fitting[{index}].K"),
            f"Coefficient of {label} in {pipe.id} (K = n·f_T)",
            fittings.crane_k,
            case.id,
            n=ev.datum(f"{base}.n", entry["n"], ""),
            D=pipe.inner_diameter,
        )
    three = catalog.fittings_three_k()
    if method == "three_k" and kind in three:  # the loader refused kinds it lacks
        base = f"catalog.fittings_darby_3k.{kind}"
        return ev.step(
            case.sid(f"pipe.{pipe.id}.fitting[{index}].K"),
            f"Coefficient of {label} in {pipe.id} (three-K method)",
            fittings.three_k,
            case.id,
            K1=ev.datum(f"{base}.K1", three[kind]["K1"], ""),
            Ki=ev.datum(f"{base}.Ki", three[kind]["Ki"], ""),
            Kd=ev.datum(f"{base}.Kd", three[kind]["Kd"], ""),
            Re=Re,
            D=pipe.inner_diameter,
        )
    return ev.step(
        case.sid(f"pipe.{pipe.id}.fitting[{index}].K"),
        f"Coefficient of {label} in {pipe.id} (two-K method)",
        fittings.two_k,
        case.id,
        K1=ev.datum(f"{base}.K1", entry["K1"], ""),
        K_inf=ev.datum(f"{base}.K_inf", entry["K_inf"], ""),
        Re=Re,
        D=pipe.inner_diameter,
    )


def _pipe(
    ev: Evaluator,
    case: Case,
    pipe: Pipe,
    flow: Given,
    liquid: Liquid,
    method: str = "darcy_weisbach",
    water_liquid: bool = True,
    fittings_method: str = "two_k",
) -> tuple[PipeHydraulics, list[FittingLoss]]:
    """Velocity, Reynolds number, friction factor, friction and minor losses of one pipe,
    with the loss of each fitting item (where along the pipe it is taken is the route's)."""
    sid = case.sid
    name = f"pipe.{pipe.id}"
    D = pipe.inner_diameter
    v = ev.step(
        sid(f"{name}.velocity"),
        f"Mean velocity in {pipe.id}",
        losses.velocity,
        case.id,
        Q=flow,
        D=D,
    )
    Re = ev.step(
        sid(f"{name}.reynolds"),
        f"Reynolds number in {pipe.id}",
        friction.reynolds,
        case.id,
        rho=liquid.density,
        v=v,
        D=D,
        mu=liquid.viscosity,
    )
    eD = ev.step(
        sid(f"{name}.relative_roughness"),
        f"Relative roughness of {pipe.id}",
        friction.relative_roughness,
        case.id,
        roughness=pipe.roughness,
        D=D,
    )
    out = PipeHydraulics(velocity=v, reynolds=Re, relative_roughness=eD)
    title = f"Darcy friction factor in {pipe.id}"
    if ev.records and Re.value < friction.LAMINAR_LIMIT:
        f = ev.step(
            sid(f"{name}.friction_factor"), title + " (laminar)", friction.laminar, case.id, Re=Re
        )
    else:
        if ev.records:
            out["friction_factor_explicit"] = ev.step(
                sid(f"{name}.friction_factor_explicit"),
                f"Explicit friction factor in {pipe.id} (cross-check)",
                friction.swamee_jain,
                case.id,
                Re=Re,
                eD=eD,
            )
        f = ev.step(
            sid(f"{name}.friction_factor"),
            title + " (Colebrook)",
            friction.colebrook,
            case.id,
            Re=Re,
            eD=eD,
        )
    out["friction_factor"] = f
    hazen = method == "hazen_williams"
    out["friction_loss"] = ev.step(
        sid(f"{name}.friction_loss_darcy_weisbach" if hazen else f"{name}.friction_loss"),
        f"Friction loss in {pipe.id} (Darcy-Weisbach" + (", cross-check)" if hazen else ")"),
        losses.darcy_weisbach,
        case.id,
        f=f,
        L=pipe.length,
        D=D,
        v=v,
    )
    if pipe.hazen_williams_c is not None and water_liquid:
        hw = ev.step(
            sid(f"{name}.friction_loss" if hazen else f"{name}.friction_loss_hazen_williams"),
            f"Friction loss in {pipe.id} (Hazen-Williams" + (")" if hazen else ", cross-check)"),
            friction.hazen_williams,
            case.id,
            L=pipe.length,
            Q=flow,
            C=pipe.hazen_williams_c,
            D=D,
        )
        out["friction_loss_hazen_williams"] = hw
        if hazen:
            out["friction_loss_darcy_weisbach"] = out["friction_loss"]
            out["friction_loss"] = hw
    coefficients: list[Given] = []
    counts: list[Given] = []
    by_fitting: dict[int, Given] = {}  # K of each fitting item, by its index
    for i, ft in enumerate(pipe.fittings, start=1):
        if ft.K is not None:
            by_fitting[i] = ft.K
        elif ft.other_diameter is not None:
            by_fitting[i] = _diameter_change_k(ev, case, pipe, ft, i)
        elif ft.kind:
            by_fitting[i] = _catalog_k(ev, case, pipe, ft.kind, ft.label, i, Re, fittings_method)
        else:
            continue
        coefficients.append(by_fitting[i])
        counts.append(ft.count)
    lift = catalog.check_valve_lift()
    for i, ft in enumerate(pipe.fittings, start=1):
        if ev.records and ft.kind in lift and ft.K is None:
            out["check_valve_min_velocity"] = ev.step(
                sid(f"{name}.fitting[{i}].full_lift_velocity"),
                f"Velocity for full disc lift of the {ft.label} in {pipe.id}",
                fittings.full_lift_velocity,
                case.id,
                c=ev.datum(f"catalog.check_valve_full_lift.{ft.kind}.c", lift[ft.kind][0], ""),
                rho=liquid.density,
            )
            break  # one valve of a kind per pipe sets the limit
    K = ev.step(
        sid(f"{name}.k_total"),
        f"Sum of fitting coefficients of {pipe.id}",
        losses.k_total,
        case.id,
        K=coefficients,
        count=counts,
    )
    out["k_total"] = K
    out["fitting_loss"] = ev.step(
        sid(f"{name}.fitting_loss"),
        f"Fitting losses in {pipe.id}",
        losses.minor_loss,
        case.id,
        K_total=K,
        v=v,
    )
    heads = {
        i: ev.step(
            sid(f"{name}.equipment[{i}]"),
            f"Loss of {ft.label} in {pipe.id}",
            losses.rated_loss,
            case.id,
            dp=ft.dp,
            Q=flow,
            Q_rated=ft.at_flow,
            rho=liquid.density,
        )
        for i, ft in enumerate(pipe.fittings, start=1)
        if ft.dp is not None
    }
    rated = list(heads.values())
    items = [
        FittingLoss(ft, by_fitting.get(i), heads.get(i))
        for i, ft in enumerate(pipe.fittings, start=1)
    ]
    if rated:
        out["equipment_loss"] = ev.step(
            sid(f"{name}.equipment_loss"),
            f"Equipment losses in {pipe.id}",
            losses.head_sum,
            case.id,
            h=rated,
        )
        out["minor_loss"] = ev.step(
            sid(f"{name}.minor_loss"),
            f"Minor losses in {pipe.id} (fittings and equipment)",
            losses.head_sum,
            case.id,
            h=[out["fitting_loss"], out["equipment_loss"]],
        )
    else:
        out["minor_loss"] = out["fitting_loss"]
    return out, items


def _hydraulics(
    ev: Evaluator,
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: Surfaces,
    flow: Given | None = None,
) -> CaseHydraulics:
    """Pipes, heads, TDH and NPSHa of one case at ``flow`` (default: the case's).

    ``surfaces`` holds the barometric pressure, the gauge pressures on the
    source and destination surfaces and the outlet velocity head (None for
    a free discharge, whose velocity head depends on the flow).
    """
    p_baro, p_source, p_dest, exit_head = surfaces
    Q = flow or case.flow
    sid = case.sid
    water_liquid = model.fluid.kind == "water"
    q_branch = Q
    if any(p.branch for p in model.pipes) and case.running.value > 1:
        if model.pump.arrangement == "parallel":
            q_branch = ev.step(
                sid("pump.branch_flow"),
                "Flow in each pump's own branch",
                pump.per_pump_flow,
                case.id,
                Q=Q,
                n_run=case.running,
            )
    solved = {
        p.id: _pipe(
            ev,
            case,
            p,
            q_branch if p.branch else Q,
            liquid,
            model.friction_method,
            water_liquid,
            model.fittings_method,
        )
        for p in model.pipes
    }
    pipes = {ident: values for ident, (values, _) in solved.items()}
    out = CaseHydraulics(
        pipes=pipes,
        fittings={ident: items for ident, (_, items) in solved.items()},
        branch_flow=q_branch,
    )
    if case.crest is not None:
        out.update(_crest_heads(ev, model, case, liquid, p_source, out))
    else:
        out.update(_system_heads(ev, model, case, liquid, p_dest, p_source, exit_head, pipes))
    suction = [
        pipes[p.id][key] for p in model.suction_pipes for key in ("friction_loss", "minor_loss")
    ]
    out["suction_loss"] = ev.step(
        sid("npsh.suction_loss"),
        "Head loss of the suction side",
        losses.head_sum,
        case.id,
        h=suction,
    )
    out["npsh_available"] = ev.step(
        sid("npsh.available"),
        "NPSH available",
        head.npsh_available,
        case.id,
        p_baro=p_baro,
        p_s=p_source,
        rho=liquid.density,
        z_s=case.npsh_level,
        z_p=model.pump.elevation,
        h_L=out["suction_loss"],
        p_v=liquid.vapor_pressure,
    )
    return out


def _system_heads(
    ev: Evaluator,
    model: Model,
    case: Case,
    liquid: Liquid,
    p_dest: Given,
    p_source: Given,
    exit_head: Given | None,
    pipes: dict[str, PipeHydraulics],
) -> CaseHydraulics:
    """Static and pressure heads, the losses and the TDH from surface to surface."""
    sid = case.sid
    out = CaseHydraulics()
    out["static_head"] = ev.step(
        sid("system.static_head"),
        "Static head",
        head.static_head,
        case.id,
        z_d=case.destination_level,
        z_s=case.source_level,
    )
    out["pressure_head"] = ev.step(
        sid("system.pressure_head"),
        "Pressure head",
        head.pressure_head,
        case.id,
        p_d=p_dest,
        p_s=p_source,
        rho=liquid.density,
    )
    out["friction_loss"] = ev.step(
        sid("system.friction_loss"),
        "Friction loss of all pipes",
        losses.head_sum,
        case.id,
        h=[p["friction_loss"] for p in pipes.values()],
    )
    out["minor_loss"] = ev.step(
        sid("system.minor_loss"),
        "Minor and equipment losses of all pipes",
        losses.head_sum,
        case.id,
        h=[p["minor_loss"] for p in pipes.values()],
    )
    if exit_head is None:
        last = model.pipes[-1]
        exit_head = ev.step(
            sid("system.outlet_velocity_head"),
            f"Velocity head leaving the free discharge of {last.id}",
            losses.velocity_head,
            case.id,
            v=pipes[last.id]["velocity"],
        )
    out["outlet_velocity_head"] = exit_head
    out["tdh"] = ev.step(
        sid("system.total_dynamic_head"),
        "Total dynamic head",
        head.total_dynamic_head,
        case.id,
        H_s=out["static_head"],
        H_p=out["pressure_head"],
        h_f=out["friction_loss"],
        h_m=out["minor_loss"],
        h_v_out=exit_head,
    )
    return out


def _crest_heads(
    ev: Evaluator, model: Model, case: Case, liquid: Liquid, p_source: Given, h: CaseHydraulics
) -> CaseHydraulics:
    """The heads of a state whose crest controls the flow: the pump lifts to the crest,
    held at atmospheric pressure; the line beyond it runs part-full."""
    assert case.crest is not None
    sid = case.sid
    ident, station, x, name = case.crest
    index = next(i for i, p in enumerate(model.pipes) if p.id == ident)
    pipe = model.pipes[index]
    z_c = pipe.elevation_start if x <= 0.0 else pipe.elevation_end
    assert z_c is not None
    node = {"pipe": ident, "station": station, "x": x, "name": name}
    h_L = route_pressure.head_loss_to(ev, model, case, h, index, node, "system.crest")
    at_crest = ev.assume(
        "Where the crest controls the flow its pressure is the atmosphere's (an air valve, "
        "or the break of the liquid column); beyond it the line runs part-full.",
        0.0,
        "Pa",
    )
    v = h["pipes"][ident]["velocity"]
    return {
        "static_head": ev.step(sid("system.static_head"), f"Static head to the crest at {name}",
                               head.static_head, case.id, z_d=z_c, z_s=case.source_level),
        "pressure_head": ev.step(sid("system.pressure_head"), "Pressure head to the crest",
                                 head.pressure_head, case.id, p_d=at_crest, p_s=p_source,
                                 rho=liquid.density),
        "friction_loss": h_L,
        "minor_loss": ev.assume("The minor losses to the crest are in the head lost to it.",
                                0.0, "m"),
        "outlet_velocity_head": ev.step(sid("system.outlet_velocity_head"),
                                        f"Velocity head at the crest at {name}",
                                        losses.velocity_head, case.id, v=v),
        "tdh": ev.step(sid("system.total_dynamic_head"),
                       f"Total dynamic head (the crest at {name} controls)", head.crest_head,
                       case.id, z_c=z_c, z_s=case.source_level, p_s=p_source,
                       rho=liquid.density, h_L=h_L, v=v),
    }  # fmt: skip
