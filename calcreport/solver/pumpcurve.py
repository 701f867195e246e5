"""The pump curve as used: points at the operating speed, a viscous-liquid correction, the
efficiency from a power curve.
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import Given, Model
from calcreport.physics import pump, viscous
from calcreport.solver.states import Case, CurvePoints, Liquid, Notes
from calcreport.trace import TraceBuilder
from calcreport.trace import bound as _q  # a result naming its source


def _pump_curve(
    b: TraceBuilder,
    model: Model,
    speed: Given | None = None,
    prefix: str = "",
    efficiency: list[Given] | None = None,
) -> CurvePoints | None:
    """The curve points at ``speed`` (default the operating speed), moved by affinity.

    ``efficiency`` is that of the base curve when already found (from a power curve).
    """
    curve = model.pump.curve
    if curve is None:
        return None
    flow, head, npsh = list(curve.flow), list(curve.head), list(curve.npsh_required)
    if efficiency is None:
        efficiency = list(curve.efficiency) or _efficiency_from_power(b, model)
    trim = model.pump.trim
    if trim is not None and trim.value != 1.0:
        b.assume(
            "The trimmed impeller's curve follows the affinity relation for diameter (Q ∝ D, "
            "H ∝ D²) at corresponding points, with efficiency and NPSH required unchanged "
            "there: an approximation for small trims; the manufacturer's curve of the "
            "trimmed impeller governs (its efficiency is usually lower, its NPSH required "
            "higher)."
        )
        flow = [
            b.step(f"{prefix}pump.trimmed.flow[{i}]", f"Curve flow {i}, trimmed impeller",
                   pump.trimmed_flow, Q0=q, r=trim)
            for i, q in enumerate(flow, 1)
        ]  # fmt: skip
        head = [
            b.step(f"{prefix}pump.trimmed.head[{i}]", f"Curve head {i}, trimmed impeller",
                   pump.trimmed_head, H0=h, r=trim)
            for i, h in enumerate(head, 1)
        ]  # fmt: skip
    n = speed or model.pump.speed
    if n is not None and curve.speed is not None and n.value != curve.speed.value:
        b.assume(
            "The pump curve is moved to the operating speed by the affinity laws "
            "(Q ∝ n, H ∝ n²); efficiency is taken unchanged at corresponding points; "
            "NPSH required ∝ n² is an approximation."
        )

        def scaled(points: list[Given], name: str, label: str, law: Any, arg: str) -> list[Given]:
            return [
                b.step(
                    f"{prefix}pump.at_speed.{name}[{i}]",
                    f"Curve {label} {i} at {n.value * 60:.5g} rpm",
                    law,
                    **{arg: point, "n": n, "n0": curve.speed},
                )
                for i, point in enumerate(points, 1)
            ]

        flow = scaled(flow, "flow", "flow", pump.affinity_flow, "Q0")
        head = scaled(head, "head", "head", pump.affinity_head, "H0")
        npsh = scaled(npsh, "npsh_required", "NPSHr", pump.affinity_head, "H0")
    return CurvePoints(flow, head, efficiency, npsh)


def _viscous(
    b: TraceBuilder,
    model: Model,
    curve: CurvePoints | None,
    case: Case,
    liquid: Liquid,
    done: dict[tuple[str, float], tuple[CurvePoints, dict[str, Any]]],
    notes: Notes,
) -> tuple[CurvePoints | None, dict[str, Any] | None]:
    """The water curve corrected for the liquid's viscosity (ANSI/HI 9.6.7) where B > 1.

    One correction for each liquid and speed, kept in ``done``; NPSH required is left as
    the water curve's (the method does not correct it).
    """
    speed = case.speed or model.pump.speed or (model.pump.curve.speed if model.pump.curve else None)
    if curve is None or not curve.efficiency or model.fluid.kind == "water":
        return curve, None
    if speed is None:
        notes.append(
            f"The viscosity correction of the pump curve ({viscous.STANDARD}) needs the pump "
            "speed: "
            "give pump.curve.speed."
        )
        return curve, None
    key = (liquid.viscosity.key, speed.value)
    if key in done:
        return done[key]
    nu = b.step(
        case.sid("pump.viscous.kinematic_viscosity"),
        "Kinematic viscosity of the liquid",
        viscous.kinematic_viscosity,
        case.id,
        mu=liquid.viscosity,
        rho=liquid.density,
    )
    q_bep, _ = pump.best_efficiency_point(curve.values("flow"), curve.values("efficiency"))
    Q_bep = b.solution(
        case.sid("solver.bep_flow"),
        q_bep,
        "m^3/s",
        "flow of the highest efficiency on the monotone cubic through the points",
    )
    H_bep = b.step(
        case.sid("pump.viscous.bep_head"),
        "Water head at the BEP",
        pump.head_at,
        case.id,
        Q=Q_bep,
        flow=curve.flow,
        head=curve.head,
    )
    stages = model.pump.stages or b.assume("A single-stage pump (pump.stages not given).", 1.0, "")
    eyes = (
        b.assume("A double-suction impeller: the BEP flow per eye enters B.", 2.0, "")
        if model.pump.impeller == "double_suction"
        else b.assume(
            'A single-suction impeller (pump.impeller = "single_suction", the default): '
            "the whole BEP flow enters B.",
            1.0,
            "",
        )
    )
    B = b.step(
        case.sid("pump.viscous.parameter"),
        f"Viscosity parameter B ({viscous.STANDARD})",
        viscous.viscosity_parameter,
        case.id,
        nu=nu,
        H=H_bep,
        Q=Q_bep,
        n=speed,
        stages=stages,
        eyes=eyes,
    )
    out: dict[str, Any] = {"parameter": _q(B), "applied": False}
    if B.value <= 1.0:
        done[key] = (curve, out)
        return done[key]
    if B.value >= viscous.B_MAX:
        out["beyond_range"] = True
        notes.append(
            f"The liquid is too viscous for the pump's correction (B = {B.value:.3g} ≥ "
            f"{viscous.B_MAX:g}, beyond {viscous.STANDARD}): consider a positive-displacement "
            "pump; the water curve is used unchanged."
        )
        done[key] = (curve, out)
        return done[key]
    C_Q = b.step(
        case.sid("pump.viscous.flow_factor"),
        "Flow correction factor",
        viscous.flow_factor,
        case.id,
        B=B,
    )
    C_eta = b.step(
        case.sid("pump.viscous.efficiency_factor"),
        "Efficiency correction factor",
        viscous.efficiency_factor,
        case.id,
        B=B,
    )
    flow, head, eff = [], [], []
    for i, (q, h, e) in enumerate(zip(curve.flow, curve.head, curve.efficiency, strict=True), 1):
        C_H = b.step(
            case.sid(f"pump.viscous.head_factor[{i}]"),
            f"Head correction factor, point {i}",
            viscous.head_factor,
            case.id,
            C_Q=C_Q,
            Q=q,
            Q_bep=Q_bep,
        )
        for name, label, law, args, points in (
            ("flow", "Viscous flow", viscous.viscous_flow, {"Q": q, "C_Q": C_Q}, flow),
            ("head", "Viscous head", viscous.viscous_head, {"H": h, "C_H": C_H}, head),
            (
                "efficiency",
                "Viscous efficiency",
                viscous.viscous_efficiency,
                {"eta": e, "C_eta": C_eta},
                eff,
            ),
        ):
            points.append(
                b.step(
                    case.sid(f"pump.viscous.{name}[{i}]"),
                    f"{label}, point {i}",
                    law,
                    case.id,
                    **args,
                )
            )
    b.assume(
        f"The pump curve is corrected for viscosity by {viscous.STANDARD} (equations as "
        "recalled, "
        "to be verified against the standard); NPSH required is the water curve's."
    )
    out.update(applied=True, flow_factor=_q(C_Q), efficiency_factor=_q(C_eta))
    done[key] = (CurvePoints(flow, head, eff, list(curve.npsh_required)), out)
    return done[key]


def _efficiency_from_power(b: TraceBuilder, model: Model) -> list[Given]:
    """Efficiency of each curve point from its shaft power (none without a power curve)."""
    curve = model.pump.curve
    if curve is None or not curve.power:
        return []
    rho = b.assume(
        "The curve's power points are for water of specific gravity 1.0 (1000 kg/m³), as "
        "pump curves are commonly drawn; the efficiency follows from them.",
        1000.0,
        "kg/m^3",
    )
    return [
        b.step(
            f"pump.curve_efficiency[{i}]",
            f"Pump efficiency at curve point {i} (from its power)",
            pump.efficiency_from_power,
            rho=rho,
            Q=q,
            H=h,
            P=p,
        )
        for i, (q, h, p) in enumerate(zip(curve.flow, curve.head, curve.power, strict=True), 1)
    ]
