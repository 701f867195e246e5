"""The operating point of a case: its hydraulics and NPSH, the intake, the system curve, the
pump curve's intersection with it, the values read off the curve at that flow (efficiency,
BEP ratio, NPSH required and margins), commissioning gauges, thermal minimum flow and the
speed that lifts the static head.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import numpy as np

from calcreport import checks
from calcreport.model.schema import Given, Model
from calcreport.physics import head, intake, losses, pump
from calcreport.solver import route_pressure
from calcreport.solver.energy import _per_pump_power, _power
from calcreport.solver.hydraulics import _hydraulics, _Sweep
from calcreport.solver.pump_limits import _regions
from calcreport.solver.results import _results
from calcreport.solver.states import (
    CURVE_POINTS,
    Case,
    CaseHydraulics,
    CurvePoints,
    Liquid,
    Notes,
    Surfaces,
    _flow_span,
)
from calcreport.trace import DESIGN_CASE, TraceBuilder, quantity, source_of
from calcreport.trace import bound as _q  # a result naming its source


def _solve_case(
    b: TraceBuilder,
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: Surfaces,
    curve: CurvePoints | None,
    eta_drive: Given,
    notes: Notes,
    states: dict[str, route_pressure.State],
) -> dict[str, Any]:
    """Hydraulics, operating point, NPSH and power of one case (its state kept in ``states``)."""
    required = case.flow
    operating = None
    if curve is not None:
        operating = _operating_flow(b, model, case, liquid, surfaces, curve, notes)
        if operating is not None:
            case = replace(case, flow=operating)
    h = _hydraulics(b, model, case, liquid, surfaces)
    results = _results(h, liquid, surfaces.barometric, model, case.flow)
    submergence = _intake(b, model, case, h)
    if submergence:
        results["intake"] = submergence
    results["profile"] = route_pressure.profile(
        model, case, liquid, h, surfaces.source, surfaces.destination
    )
    states[case.id] = route_pressure.State(case, liquid, surfaces, h, results["profile"])
    eta_pump = model.pump.efficiency
    if operating is not None and curve is not None:
        point, eta_curve = _operating_point(b, model, case, curve, h)
        results["operating_point"] = point
        eta_pump = eta_curve or eta_pump
        if "bep_flow" in point and case.id == DESIGN_CASE:  # the design chart's regions
            region = _regions(b, model, source_of(point["bep_flow"]))
            if case.running.value > 1:
                region["combined"] = _combined_region(model, case, region)
            results["operating_region"] = region
    results.update(_power(b, model, case, liquid, h, eta_pump, eta_drive))
    results["required_flow"] = _q(required)
    results["pumps_running"] = _q(case.running)
    results["duty_case"] = case.duty
    if "shaft_power" in results:
        _per_pump_power(b, case, source_of(results["shaft_power"]), results)
    results["system_curve"], duty = _system_curve(model, case, liquid, surfaces, curve)
    if case.id == DESIGN_CASE:  # the required duty on the design system curve, for its chart
        results["duty_point"] = duty
    results["commissioning"] = _commissioning(b, model, case, liquid, surfaces, h, curve)
    if curve is not None:
        results["pump_curve"] = {
            "flow": quantity(curve.values("flow"), "m^3/s"),
            "head": quantity(curve.values("head"), "m"),
            **(
                {"efficiency": quantity(curve.values("efficiency"), "")} if curve.efficiency else {}
            ),
            **(_npsh_curves(model, curve) if curve.npsh_required else {}),
        }
        if case.running.value > 1:
            results["pump_curve"]["combined"] = _combined_curve(model, case, curve)
    return results


def _arrangement(model: Model, case: Case) -> tuple[float, float]:
    """The factors (share, lift) that turn one pump's curve into the running pumps' curve.

    Identical pumps in parallel add their flows at equal head, Q = n_run·Q_1 (share n_run,
    lift 1); in series they add their heads at equal flow, H = n_run·H_1 (share 1, lift
    n_run); one pump running gives (1, 1). Karassik, Pump Handbook, 4th ed., 2008
    (``karassik_2008``). ``case.running`` is n_run [-].
    """
    n = case.running.value
    return (n, 1.0) if model.pump.arrangement == "parallel" else (1.0, n)


def _combined_curve(model: Model, case: Case, curve: CurvePoints) -> dict[str, Any]:
    """The running pumps' curve at one pump's curve points (flow [m^3/s], head [m]), the
    curve whose meeting with the system curve is the operating point (see :func:`_arrangement`).

    Point i is every pump at point i of its own curve: each pump's efficiency and NPSH
    required there are those of ``pump_curve`` at i, which a chart over the total flow draws
    against this curve's flow.
    """
    share, lift = _arrangement(model, case)
    return {
        "flow": quantity((share * np.asarray(curve.values("flow"))).tolist(), "m^3/s"),
        "head": quantity((lift * np.asarray(curve.values("head"))).tolist(), "m"),
        "pumps": int(case.running.value),
        "arrangement": model.pump.arrangement,
    }


def _combined_region(model: Model, case: Case, region: dict[str, Any]) -> dict[str, Any]:
    """The region's flows [m^3/s] as total flows of the running pumps, each pump at the
    bounding flow: n_run times in parallel, unchanged in series (see :func:`_arrangement`)."""
    share, _ = _arrangement(model, case)

    def total(q: dict[str, Any]) -> dict[str, Any]:
        return quantity(share * q["value"], q["unit"])

    out: dict[str, Any] = {"pumps": int(case.running.value), "arrangement": model.pump.arrangement}
    for key in ("bep_flow", "min_continuous_flow"):
        if key in region:
            out[key] = total(region[key])
    for key in ("preferred", "allowable"):
        if key in region:
            out[key] = [total(q) for q in region[key]]
    return out


def _npsh_curves(model: Model, curve: CurvePoints) -> dict[str, Any]:
    """NPSH required at the curve points and the NPSH available its margin criterion asks for."""
    npshr = np.asarray(curve.values("npsh_required"))
    ratio, _, _, _ = checks.criterion(model, "npsh_margin_ratio")
    minimum, _, _, _ = checks.criterion(model, "npsh_margin_min")
    return {
        "npsh_required": quantity(npshr.tolist(), "m"),
        "npsh_needed": quantity(pump.npsh_needed(npshr, ratio, minimum).tolist(), "m"),
    }


def _intake(b: TraceBuilder, model: Model, case: Case, h: CaseHydraulics) -> dict[str, Any] | None:
    """Submergence of the suction inlet at the lowest level against ANSI/HI 9.8's minimum."""
    first = model.pipes[0]
    if first.line != "suction" or first.elevation_start is None:
        return None
    D = model.source.intake_diameter or first.inner_diameter
    v = h["pipes"][first.id]["velocity"]
    if model.source.intake_diameter is not None:
        # Each pump's own suction branch has an intake of its own, carrying that pump's flow.
        v = b.step(
            case.sid("intake.velocity"),
            "Velocity at the intake bell" + (" (each pump's own)" if first.branch else ""),
            losses.velocity,
            case.id,
            Q=h["branch_flow"] if first.branch else case.flow,
            D=D,
        )
    S = b.step(
        case.sid("intake.submergence"),
        f"Submergence of the {first.id} inlet at the lowest source level",
        intake.submergence,
        case.id,
        z_l=case.npsh_level,
        z_i=first.elevation_start,
    )
    S_min = b.step(
        case.sid("intake.minimum_submergence"),
        "Minimum submergence against surface vortices",
        intake.minimum_submergence,
        case.id,
        v=v,
        D=D,
    )
    return {"submergence": _q(S), "minimum_submergence": _q(S_min)}


def _system_curve(
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: Surfaces,
    curve: CurvePoints | None,
) -> tuple[dict[str, Any], dict[str, Any]]:
    """The system curve over the flow range, and the system at the required flow.

    One sweep of the same equations as the steps: the required flow rides along as
    the last point, so the duty point costs no second pass over the pipes.
    """
    low, high = _flow_span(model)
    if curve is not None:  # on to the end of the running pumps' curve
        high = max(high, _arrangement(model, case)[0] * curve.values("flow")[-1])
    flows = np.append(np.linspace(low, high, CURVE_POINTS), model.flow.value)
    sweep = _hydraulics(
        _Sweep(), model, case, liquid, surfaces, flow=Given(flows, "m^3/s", "flow_range")
    )  # type: ignore[arg-type]
    # Terms that do not depend on flow come back as scalars.
    tdh = np.broadcast_to(sweep["tdh"].value, flows.shape)
    npsha = np.broadcast_to(sweep["npsh_available"].value, flows.shape)
    system = {
        "flow": quantity(flows[:-1].tolist(), "m^3/s"),
        "head": quantity(tdh[:-1].tolist(), "m"),
        "npsh_available": quantity(npsha[:-1].tolist(), "m"),
    }
    duty = {
        "flow": _q(model.flow),
        "head": quantity(float(tdh[-1]), "m"),
        "npsh_available": quantity(float(npsha[-1]), "m"),
    }
    return system, duty


def _commissioning(
    b: TraceBuilder,
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: Surfaces,
    h: CaseHydraulics,
    curve: CurvePoints | None,
    H: Given | None = None,
) -> dict[str, Any]:
    """Gauge pressures expected at the pump flanges, at the operating point (the pump giving
    ``H``, default the TDH) and, with a ``curve``, at shutoff."""
    sid = case.sid
    suction = model.suction_pipes
    discharge = [p for p in model.pipes if p.line == "discharge"]
    zero = b.assume(
        "Commissioning gauges are at the pump datum; with no suction pipe, or at "
        "shutoff, the velocity at a flange is zero.",
        0.0,
        "m/s",
    )
    v_in = h["pipes"][suction[-1].id]["velocity"] if suction else zero
    v_out = h["pipes"][discharge[0].id]["velocity"] if discharge else v_in
    z_p = model.pump.elevation
    p_in, p_out = _flange_pair(
        b,
        case,
        liquid,
        surfaces.source,
        z_p,
        "",
        "at the operating point",
        h_L=h["suction_loss"],
        H=H or h["tdh"],
        v_in=v_in,
        v_out=v_out,
    )
    out = {"suction_pressure": _q(p_in), "discharge_pressure": _q(p_out)}
    if curve is not None and curve.flow[0].value == 0.0:
        no_loss = b.assume("At shutoff there is no flow and so no suction loss.", 0.0, "m")
        shutoff_head = curve.head[0]
        if case.running.value > 1 and model.pump.arrangement == "series":
            shutoff_head = b.step(
                sid("commissioning.shutoff_head"),
                "Shutoff head of the pumps in series",
                pump.series_head,
                case.id,
                H1=curve.head[0],
                n_run=case.running,
            )
        p_in0, p_out0 = _flange_pair(
            b,
            case,
            liquid,
            surfaces.source,
            z_p,
            "shutoff_",
            "at shutoff",
            h_L=no_loss,
            H=shutoff_head,
            v_in=zero,
            v_out=zero,
        )
        out["shutoff_suction_pressure"] = _q(p_in0)
        out["shutoff_discharge_pressure"] = _q(p_out0)
    return out


def _flange_pair(
    b: TraceBuilder,
    case: Case,
    liquid: Liquid,
    p_s: Given,
    z_p: Given,
    key: str,
    when: str,
    *,
    h_L: Given,
    H: Given,
    v_in: Given,
    v_out: Given,
) -> tuple[Given, Given]:
    """Suction and discharge flange gauge pressures for one flow state of a case."""
    p_in = b.step(
        case.sid(f"commissioning.{key}suction_pressure"),
        f"Suction flange pressure (gauge) {when}",
        head.suction_flange_pressure,
        case.id,
        p_s=p_s,
        rho=liquid.density,
        z_s=case.source_level,
        z_p=z_p,
        h_L=h_L,
        v_in=v_in,
    )
    p_out = b.step(
        case.sid(f"commissioning.{key}discharge_pressure"),
        f"Discharge flange pressure (gauge) {when}",
        head.discharge_flange_pressure,
        case.id,
        p_in=p_in,
        rho=liquid.density,
        H=H,
        v_in=v_in,
        v_out=v_out,
    )
    return p_in, p_out


def _operating_flow(
    b: TraceBuilder,
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: Surfaces,
    curve: CurvePoints,
    notes: Notes,
) -> Given | None:
    flows, heads = curve.values("flow"), curve.values("head")
    share, lift = _arrangement(model, case)  # combined curve: Q x share, H x lift

    def difference(q: np.ndarray) -> np.ndarray:
        system = _hydraulics(
            _Sweep(), model, case, liquid, surfaces, flow=Given(q, "m^3/s", "solver")
        )  # type: ignore[arg-type]
        pumps = lift * np.asarray(pump.monotone_cubic(flows, heads, q / share))
        return pumps - np.asarray(system["tdh"].value)

    Q = pump.operating_point(difference, flows[0] * share, flows[-1] * share)
    if Q is None:
        ends = difference(np.array([flows[0], flows[-1]]))
        why = (
            "the pump cannot reach the system head anywhere on its curve (shutoff head "
            "below the system head)"
            if ends[0] < 0
            else "the system curve stays below the pump curve up to the end of the curve: the "
            "pump would run out beyond its last curve point"
        )
        notes.append(f"Case {case.id}: no operating point: {why}.")
        return None
    found = b.solution(
        case.sid("solver.operating_flow"),
        Q,
        "m^3/s",
        "bracketed root of H_pump(Q) − H_system(Q), Illinois method",
    )
    return b.step(
        case.sid("pump.operating_flow"),
        "Operating flow (pump and system curves meet)",
        pump.solved_flow,
        case.id,
        Q=found,
    )


def _operating_point(
    b: TraceBuilder, model: Model, case: Case, curve: CurvePoints, h: CaseHydraulics
) -> tuple[dict[str, Any], Given | None]:
    sid = case.sid
    several = case.running.value > 1
    parallel = model.pump.arrangement == "parallel"
    Q = case.flow
    if several and parallel:
        Q = b.step(
            sid("pump.flow_per_pump"),
            "Flow of each pump (in parallel)",
            pump.per_pump_flow,
            case.id,
            Q=case.flow,
            n_run=case.running,
        )
    H = b.step(
        sid("pump.head"),
        "Pump head at the operating flow" + (" (each pump)" if several else ""),
        pump.head_at,
        case.id,
        Q=Q,
        flow=curve.flow,
        head=curve.head,
    )
    H_all = H
    if several and not parallel:
        H_all = b.step(
            sid("pump.series_head"),
            "Head of the pumps in series",
            pump.series_head,
            case.id,
            H1=H,
            n_run=case.running,
        )
    b.step(
        sid("pump.head_balance"),
        "Head balance at the operating point (zero)",
        pump.head_balance,
        case.id,
        H_pump=H_all,
        H_system=h["tdh"],
    )
    point: dict[str, Any] = {
        "flow": _q(case.flow),
        "head": _q(H_all),
        "pumps_running": _q(case.running),
    }
    if several:
        point["flow_per_pump"] = _q(Q)
        point["head_per_pump"] = _q(H)
    eta = _curve_values(b, case, curve, Q, h["npsh_available"], point)
    return point, eta


def _curve_values(
    b: TraceBuilder,
    case: Case,
    curve: CurvePoints,
    Q_curve: Given,
    npsha: Given,
    point: dict[str, Any],
    speed: tuple[Given, Given] | None = None,
) -> Given | None:
    """Efficiency, BEP ratio, NPSH required and margins of a state, read on ``curve`` at each
    pump's flow ``Q_curve``; fills ``point``.

    With ``speed`` = (n, n0) the state runs at n on a curve given at n0 and ``Q_curve`` is
    the corresponding flow Q·n0/n (affinity laws): the efficiency is unchanged, NPSH
    required moves ∝ n² (an approximation) and the BEP flow ∝ n.
    """
    sid = case.sid
    eta = None
    if curve.efficiency:
        eta = b.step(
            sid("pump.operating_efficiency"),
            "Pump efficiency at the operating flow",
            pump.efficiency_at,
            case.id,
            Q=Q_curve,
            flow=curve.flow,
            efficiency=curve.efficiency,
        )
        point["efficiency"] = _q(eta)
        q_bep, _ = pump.best_efficiency_point(curve.values("flow"), curve.values("efficiency"))
        Q_bep = b.solution(
            sid("solver.curve_bep_flow"),
            q_bep,
            "m^3/s",
            "flow of the highest efficiency on the monotone cubic through the curve points",
        )
        eta_bep = b.step(sid("pump.bep_efficiency"), "Best efficiency of the curve",
                         pump.efficiency_at, case.id, Q=Q_bep, flow=curve.flow,
                         efficiency=curve.efficiency)  # fmt: skip
        ratio = b.step(sid("pump.flow_ratio_bep"), "Flow of each pump over its BEP flow",
                       pump.flow_ratio, case.id, Q=Q_curve, Q_bep=Q_bep)  # fmt: skip
        if speed is not None:
            Q_bep = b.step(sid("pump.bep_flow"), "BEP flow at the state's speed",
                           pump.affinity_flow, case.id, Q0=Q_bep, n=speed[0],
                           n0=speed[1])  # fmt: skip
        point["bep_flow"] = _q(Q_bep)
        point["bep_efficiency"] = _q(eta_bep)
        point["flow_ratio_bep"] = _q(ratio)
    if curve.npsh_required:
        npshr = b.step(
            sid("pump.npsh_required" if speed is None else "pump.curve_npsh_required"),
            "NPSH required at the operating flow" + ("" if speed is None else " (curve speed)"),
            pump.npsh_required_at,
            case.id,
            Q=Q_curve,
            flow=curve.flow,
            npsh=curve.npsh_required,
        )
        if speed is not None:
            npshr = b.step(sid("pump.npsh_required"), "NPSH required at the state's speed",
                           pump.affinity_head, case.id, H0=npshr, n=speed[0],
                           n0=speed[1])  # fmt: skip
        ratio = b.step(
            sid("npsh.margin_ratio"),
            "NPSH margin ratio",
            pump.npsh_margin_ratio,
            case.id,
            npsha=npsha,
            npshr=npshr,
        )
        margin = b.step(
            sid("npsh.margin"),
            "NPSH margin",
            pump.npsh_margin,
            case.id,
            npsha=npsha,
            npshr=npshr,
        )
        point["npsh_required"] = _q(npshr)
        point["npsh_margin_ratio"] = _q(ratio)
        point["npsh_margin"] = _q(margin)
    return eta
