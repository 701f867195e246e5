"""Duty-profile states: under throttled or variable-speed control each profile point is a
state of its own, solved at its speed like a case.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import numpy as np

from calcreport.model.schema import Given, Model
from calcreport.physics import power, pump
from calcreport.solver import route_pressure
from calcreport.solver.energy import _electrical, _per_pump_power
from calcreport.solver.hydraulics import _hydraulics
from calcreport.solver.operating import _commissioning, _curve_values, _intake
from calcreport.solver.results import _results
from calcreport.solver.states import Case, CurvePoints
from calcreport.trace import TraceBuilder
from calcreport.trace import bound as _q  # a result naming its source


def _profile_states(
    b: TraceBuilder,
    model: Model,
    design: route_pressure.State,
    curve: CurvePoints | None,
    eta_drive: Given,
    states: dict[str, route_pressure.State],
) -> dict[str, dict[str, Any]]:
    """The duty profile's points as operating states, each a result of the shape of a case.

    Under throttled or variable-speed control the pump runs at every profile flow (on-off
    control runs it at its operating point only): each point is solved at the design
    case's levels and pump count, at its own flow and, for variable speed, its own speed.
    """
    op = model.operation
    if not op.profile or op.control == "on_off" or curve is None:
        return {}
    return {
        f"P{i}": _profile_state(
            b,
            model,
            replace(design.case, id=f"P{i}", title=f"Duty profile point P{i}", flow=q),
            design,
            curve,
            eta_drive,
            states,
        )
        for i, (q, _) in enumerate(op.profile, start=1)
    }


def _crest_title(title: str, crest: tuple[str, str, float, str]) -> str:
    return f"{title}; the crest at {crest[3]} controls (part-full beyond it)"


def _profile_state(
    b: TraceBuilder,
    model: Model,
    point: Case,
    design: route_pressure.State,
    curve: CurvePoints,
    eta_drive: Given,
    states: dict[str, route_pressure.State],
) -> dict[str, Any]:
    """Hydraulics, pump state, NPSH and power of one profile point (its state kept in
    ``states``); ``unserved`` says why when the pump cannot run there."""
    sid, pid = point.sid, point.id
    liquid, surfaces = design.liquid, design.surfaces
    h = _hydraulics(b, model, point, liquid, surfaces)
    result = _results(h, liquid, surfaces.barometric, model, point.flow)
    submergence = _intake(b, model, point, h)
    if submergence:
        result["intake"] = submergence
    result.update(
        required_flow=_q(point.flow),
        pumps_running=_q(point.running),
        duty_case=True,
        state_kind="profile",
    )
    n = point.running.value
    parallel = model.pump.arrangement == "parallel"
    Q = point.flow
    if n > 1 and parallel:
        Q = b.step(sid("pump.flow_per_pump"), "Flow of each pump", pump.per_pump_flow, pid,
                   Q=point.flow, n_run=point.running)  # fmt: skip
    H_sys = h["tdh"]
    flows = curve.values("flow")
    lift = n if n > 1 and not parallel else 1.0  # pumps in series share the head
    found: dict[str, Any] = {"flow": _q(point.flow), "pumps_running": _q(point.running)}
    if n > 1:
        found["flow_per_pump"] = _q(Q)
    H_pump = H = H_sys
    eta: Given | None = None
    h_thr: Given | None = None
    if model.operation.control == "throttled":
        b.assume(
            "Throttled control: the throttling valve is taken just downstream of the pump, so "
            "the pump's discharge flange sees the pump's own head and the line beyond the "
            "valve the system's (its lowest pressures)."
        )
        if not flows[0] <= Q.value <= flows[-1]:
            result["unserved"] = "its flow is outside the pump curve"
        else:
            H = b.step(sid("pump.head"), "Pump head at the profile flow (fixed speed)",
                       pump.head_at, pid, Q=Q, flow=curve.flow, head=curve.head)  # fmt: skip
            if lift > 1:
                H = b.step(sid("pump.series_head"), "Head of the pumps in series",
                           pump.series_head, pid, H1=H, n_run=point.running)  # fmt: skip
            if H.value < H_sys.value:
                result["unserved"] = "at fixed speed the pump's head is below the system head"
            else:
                H_pump = H
                h_thr = b.step(sid("energy.throttling_loss"), "Head burnt in the throttling valve",
                               pump.throttling_loss, pid, H_pump=H, H_system=H_sys)  # fmt: skip
                found["throttling_loss"] = _q(h_thr)
                eta = _curve_values(b, point, curve, Q, h["npsh_available"], found)
    else:
        speed = _profile_speed(b, model, point, curve, Q, H_sys, lift)
        if isinstance(speed, str):
            result["unserved"] = speed
        else:
            n0 = model.pump.speed or model.pump.curve.speed  # type: ignore[union-attr]
            assert n0 is not None
            point = replace(point, speed=speed)
            found["speed"] = _q(speed)
            Q0 = b.step(sid("pump.curve_flow"), "Corresponding flow on the curve's speed",
                        pump.affinity_flow, pid, Q0=Q, n=n0, n0=speed)  # fmt: skip
            found["curve_flow"] = _q(Q0)
            H0 = b.step(sid("pump.curve_head"), "Curve head at the corresponding flow",
                        pump.head_at, pid, Q=Q0, flow=curve.flow, head=curve.head)  # fmt: skip
            H = b.step(sid("pump.head"), "Pump head at the profile speed", pump.affinity_head,
                       pid, H0=H0, n=speed, n0=n0)  # fmt: skip
            if lift > 1:
                H = b.step(sid("pump.series_head"), "Head of the pumps in series",
                           pump.series_head, pid, H1=H, n_run=point.running)  # fmt: skip
            b.step(sid("pump.head_balance"), "Head balance at the profile point (zero)",
                   pump.head_balance, pid, H_pump=H, H_system=H_sys)  # fmt: skip
            eta = _curve_values(b, point, curve, Q0, h["npsh_available"], found, (speed, n0))
    # Throttled, the valve is taken just past the pump: its flange sees the pump's own head.
    throttled = H_pump is not H_sys
    result["profile"] = route_pressure.profile(
        model,
        point,
        liquid,
        h,
        surfaces.source,
        surfaces.destination,
        H_pump if throttled else None,
    )
    states[pid] = route_pressure.State(
        point, liquid, surfaces, h, result["profile"], H_pump if throttled else None
    )
    if "unserved" in result:
        return result
    found["head"] = _q(H)
    result["operating_point"] = found
    eta = eta or model.pump.efficiency
    assert eta is not None
    # Throttled, the pump gives its own head (the valve burns the excess); at speed, the
    # system's.
    P_h = b.step(sid("power.hydraulic"), "Hydraulic power", power.hydraulic_power, pid,
                 rho=liquid.density, Q=point.flow, H=H_pump)  # fmt: skip
    result["hydraulic_power"] = _q(P_h)
    P_s, P_e = _electrical(b, model, point, P_h, eta, eta_drive)
    if P_s is not None:
        result["shaft_power"] = _q(P_s)
        _per_pump_power(b, point, P_s, result)
    if P_e is not None:
        result["electrical_power"] = _q(P_e)
        if h_thr is not None:
            P_thr = b.step(sid("energy.throttling_power"), "Input power burnt in the valve",
                           power.throttling_power, pid, P_e=P_e, h_thr=h_thr, H=H)  # fmt: skip
            result["throttling_power"] = _q(P_thr)
    result["commissioning"] = _commissioning(b, model, point, liquid, surfaces, h, None, H_pump)
    return result


def _profile_speed(
    b: TraceBuilder,
    model: Model,
    point: Case,
    curve: CurvePoints,
    Q: Given,
    H_sys: Given,
    lift: float,
) -> Given | str:
    """The speed at which the affinity-moved curve meets the system head at each pump's flow
    ``Q`` (or why there is none); the drive is held to the top speed."""
    speed = _meeting_speed(model, curve, Q.value, H_sys.value, lift)
    if speed is None:
        return f"it needs more than the top speed of {_speeds(model)[1] * 60:.5g} rpm"
    found = b.solution(point.sid("solver.speed"), speed, "1/s",
                       "bracketed root of H_pump(n, Q) − H_system(Q), Illinois method")  # fmt: skip
    return b.step(point.sid("pump.speed"), "Speed that meets the system head at the profile flow",
                  pump.solved_speed, point.id, n=found)  # fmt: skip


def _speeds(model: Model) -> tuple[float, float]:
    """The curve's speed n0 and the drive's top speed [1/s] (n0 without a speed range)."""
    assert model.pump.curve is not None
    n0 = model.pump.speed or model.pump.curve.speed
    assert n0 is not None
    return n0.value, model.pump.speed_range[1].value if model.pump.speed_range else n0.value


def _meeting_speed(
    model: Model, curve: CurvePoints, Q: float, H_sys: float, lift: float
) -> float | None:
    """The speed [1/s] at which ``lift`` pumps in series (1: one pump, or each of several in
    parallel), on the curve moved by the affinity laws, give the system head ``H_sys`` [m]
    at each pump's flow ``Q`` [m^3/s]; None when it needs more than the top speed.

    (n/n0)²·H0(Q·n0/n) = H_system, Karassik, Pump Handbook, 4th ed., 2008 (affinity laws).
    """
    n0, top = _speeds(model)
    q0, h0 = curve.values("flow"), curve.values("head")

    def difference(speeds: np.ndarray) -> np.ndarray:
        at = Q * n0 / speeds
        inside = at <= q0[-1]
        head = np.where(inside, pump.monotone_cubic(q0, h0, np.minimum(at, q0[-1])), -1e9)
        return lift * (speeds / n0) ** 2 * head - H_sys

    low = max(Q * n0 / q0[-1], 1e-6 * n0)
    return pump.operating_point(difference, low, top) if low < top else None
