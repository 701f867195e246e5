"""The calculation sequence: validated model → :class:`~calcreport.trace.Trace`.

In order: site (barometric pressure), liquid properties, then for each
operating case the hydraulics of every pipe (velocity, Reynolds number,
friction factor, friction and minor losses), the system heads and TDH, the
NPSH available and the power chain; then the system curve over the flow
range, the design checks and the results.

The hydraulics of a case are written once, in :func:`_hydraulics`, and run
by two evaluators: :class:`~calcreport.trace.TraceBuilder` records each step
at the case's flow, :class:`_Sweep` evaluates the same equations on an
array of flows for the system curve. The curve therefore passes exactly
through the recorded duty point.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from pathlib import PurePath
from typing import Any

import numpy as np

from calcreport import __version__, catalog, checks, safety
from calcreport.model.schema import Fitting, Given, Model, Pipe, Vessel
from calcreport.physics import (
    atmosphere,
    fittings,
    friction,
    glycol,
    head,
    intake,
    liquids,
    losses,
    motor,
    power,
    pump,
    viscous,
    water,
)
from calcreport.trace import Check, Trace, TraceBuilder, quantity, source_of
from calcreport.trace import bound as _q  # a result naming its source

__all__ = ["solve"]

CURVE_POINTS = 61


@dataclass(frozen=True)
class Liquid:
    """Liquid properties as trace values (value, unit, source)."""

    density: Given
    viscosity: Given
    vapor_pressure: Given
    pressure: Given | None = None  # absolute pressure the properties are taken at (water)


@dataclass(frozen=True)
class Case:
    """An operating case: its id, description and what it varies."""

    id: str
    title: str
    flow: Given
    source_level: Given
    npsh_level: Given
    destination_level: Given
    running: Given  # identical pumps running in this case
    duty: bool = True  # the required flow must be met in this case
    temperature: Given | None = None  # liquid temperature, when not the fluid's own
    speed: Given | None = None  # pump speed, when not the operating speed
    pipes: tuple[Pipe, ...] | None = None  # the pipes as in this case (aged, dirty strainer)
    # The crest that controls the flow in this state: (pipe id, station, distance, node name);
    # the pump lifts to it, the line beyond runs part-full.
    crest: tuple[str, str, float, str] | None = None

    def sid(self, step: str) -> str:
        """Step id within this case (the design case C1 has plain ids)."""
        return step if self.id == "C1" else f"{self.id}.{step}"


class _Sweep:
    """Evaluates the equations on arrays without recording steps."""

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


def solve(model: Model) -> Trace:
    """Solve the pump system of ``model`` and return its trace."""
    b = TraceBuilder()
    notes: list[str] = []
    _record_inputs(b, model)
    b.assume("Velocity at the source and destination liquid surfaces is zero (large vessels).")
    b.assume("Flow is steady, incompressible and isothermal; pipes run full.")
    p_baro = _barometric(b, model)
    liquid = _liquid(b, model, p_baro)
    if model.source.level_low:
        b.assume("NPSH available is taken at the lowest source level, source.level_low.")
    if model.envelope.roughness is None:
        example = '"0.02 in"' if model.project.units == "US" else '"0.5 mm"'
        notes.append(
            "No aged-pipe state is given: the heads use new-pipe roughness, which understates "
            "them as the pipe ages (common practice, no published source, is to check an aged "
            f"state): give envelope.roughness, such as {example}, on the project's basis."
        )
    lowest = model.source.level_low or model.source.level
    if model.pump.elevation.value > lowest.value:
        from calcreport.units import show

        height = show(
            {"value": model.pump.elevation.value - lowest.value, "unit": "m"},
            "length",
            model.project.units,
        )
        notes.append(
            f"Suction lift: the pump stands {height} above the lowest source level. It must be "
            "primed before it starts and kept primed (a foot valve, a priming system or a "
            "self-priming pump), and the suction line must be free of air leaks; the practical "
            "lift is well below the barometric limit, and the NPSH margin here decides it."
        )
    exit_head = _exit_head(b, model)
    p_source = _surface_pressure(b, model.source, liquid, p_baro)
    p_dest = _surface_pressure(b, model.destination, liquid, p_baro)
    eta_drive = (
        model.drive_efficiency
        if model.drive_efficiency
        else b.assume("No variable-speed drive: drive efficiency 1.", 1.0, "")
    )
    curve = _pump_curve(b, model)
    surfaces = (p_baro, p_source, p_dest, exit_head)
    cases = _cases(b, model)
    by_case: dict[str, dict[str, Any]] = {}
    found: list[Check] = []
    # Curves of the cases at their own speeds, then the motor: non-overloading at the top
    # speed, the fastest curve of any case; its rating sets a class efficiency.
    case_curves = {
        case.id: _pump_curve(b, model, case.speed, f"{case.id}.", curve.efficiency)
        for case in cases
        if case.speed is not None and curve is not None
    }
    fastest = max(
        (c for c in cases if c.id in case_curves),
        key=lambda c: c.speed.value if c.speed else 0.0,
        default=None,
    )
    top_curve = case_curves[fastest.id] if fastest else curve
    corrected: dict[tuple[str, float], tuple[CurvePoints, dict[str, Any]]] = {}
    motor_rating = None
    if curve is not None and model.pump.efficiency_basis == "overall":
        notes.append(
            "The motor rating is not selected: with a wire-to-water efficiency the "
            "shaft power is unknown; size the motor on the pump's own curve."
        )
    elif top_curve is not None:
        # On the curve as the liquid makes it (ANSI/HI 9.6.7 raises the power of a viscous one).
        motor_curve, _ = _viscous(
            b, model, top_curve, fastest or cases[0], liquid, corrected, notes
        )
        motor_rating = _motor(b, model, liquid, motor_curve or top_curve)
        if motor_rating and model.motor_class:
            model = _class_efficiency(b, model, motor_rating, notes)
    route = safety.Route(b, model)
    states: dict[str, safety.State] = {}
    design_curve = curve

    def run(case: Case, case_liquid: Liquid, case_surfaces: Any) -> dict[str, Any]:
        """One case solved, routed and checked (its state kept in ``states``)."""
        case_model = replace(model, pipes=case.pipes) if case.pipes else model
        case_curve, correction = _viscous(
            b, model, case_curves.get(case.id, curve), case, case_liquid, corrected, notes
        )
        result = _solve_case(
            b, case_model, case, case_liquid, case_surfaces, case_curve, eta_drive, notes, states
        )
        if correction:
            result["viscous_correction"] = correction
        case_route = route.case_route(states[case.id])
        if case_route:
            result["route"] = case_route
        found.extend(checks.evaluate(model, result, case.id))
        return result

    for case in list(cases):
        case_liquid, case_surfaces = liquid, surfaces
        if case.temperature is not None:
            prefix = f"{case.id}."
            case_liquid = _liquid(b, model, p_baro, case.temperature, prefix)
            case_surfaces = (
                p_baro,
                _surface_pressure(b, model.source, case_liquid, p_baro, prefix),
                _surface_pressure(b, model.destination, case_liquid, p_baro, prefix),
                exit_head,
            )
        if case.id == "C1":
            design_curve, _ = _viscous(b, model, curve, case, case_liquid, corrected, notes)
        by_case[case.id] = run(case, case_liquid, case_surfaces)
    profile = _profile_states(b, model, states["C1"], design_curve, eta_drive, states)
    for pid, result in profile.items():
        state_route = route.case_route(states[pid])
        if state_route:
            result["route"] = state_route
        found += checks.evaluate(model, result, pid)
    # A crest the full line would cross below atmospheric controls that state's flow: the
    # state is solved again with the pump lifting to the crest.
    design = states["C1"]
    for case in list(cases):
        crest = safety.controlling_crest(model, design, states[case.id])
        if crest is not None:
            lifted = replace(
                case, id=f"{case.id}x", title=_crest_title(case.title, crest), crest=crest
            )
            cases.append(lifted)
            st = states[case.id]
            by_case[lifted.id] = run(lifted, st.liquid, st.surfaces)
    for pid in list(profile):
        crest = safety.controlling_crest(model, design, states[pid])
        if crest is not None:
            q = model.operation.profile[int(pid[1:]) - 1][0]
            point = replace(design.case, id=f"{pid}x", title=_crest_title(pid, crest), flow=q,
                            crest=crest)  # fmt: skip
            assert design_curve is not None  # profile states exist only with a curve
            lifted_point = _profile_state(b, model, point, design, design_curve, eta_drive, states)
            state_route = route.case_route(states[point.id])
            if state_route:
                lifted_point["route"] = state_route
            found += checks.evaluate(model, lifted_point, point.id)
            profile[point.id] = lifted_point
    if "electrical_power" in by_case["C1"]:
        P_e = source_of(by_case["C1"]["electrical_power"])
        energy = _energy(b, model, states["C1"].case, P_e, profile, notes)
        if energy:
            by_case["C1"]["energy"] = energy
    results = dict(by_case["C1"])
    # The highest pressures: the pump's highest head on its fastest curve.
    surge = route.surge_screening(states, notes)
    if surge:
        results["surge"] = surge
    results["route"] = route.envelope(states, top_curve, notes)
    if surge:
        for event in [surge, *surge.get("events", {}).values()]:
            event["rise_checked"] = "rating_check" in results["route"]
    if motor_rating:
        results["motor"] = _motor_loading(b, motor_rating, {**by_case, **profile})
    thermal = _thermal_min_flow(b, model, liquid, curve, notes)
    if thermal:
        results["thermal_min_flow"] = thermal
    lift = _lift_speed(b, model, cases, by_case)
    if lift is not None:
        results["minimum_lift_speed"] = _q(lift)
    results["cases"] = by_case
    if profile:
        results["profile_states"] = profile
    found = checks.governing(found) + checks.once(model, results)
    status = _status(model, results, found)
    if "shaft_power" not in results:
        notes.append(
            "Shaft power is not computed: no pump efficiency is given (pump.efficiency "
            "or the curve's efficiency)."
        )
    if "electrical_power" not in results and "shaft_power" in results:
        notes.append("Electrical power is not computed: motor.efficiency is not given.")
    used = {s.reference for s in b.steps} | {c.reference for c in found} | {"input"}
    references = {k: v for k, v in catalog.references().items() if k in used}
    return Trace(
        # The file's name only: the trace and report bytes do not depend on how the path
        # was spelt, and record no folder of the machine that built them.
        input={
            "path": PurePath(model.path).name or model.path,
            "sha256": model.sha256,
            "files": list(model.files),
        },
        project={
            "title": model.project.title,
            "client": model.project.client,
            "calc_id": model.project.calc_id,
            "revision": model.project.revision,
            "date": model.project.date,
            "prepared_by": model.project.prepared_by,
            "checked_by": model.project.checked_by,
            "units": model.project.units,
            "revisions": list(model.project.revisions),
            "report": {
                "purpose": model.project.purpose,
                "exclusions": list(model.project.exclusions),
                "cautions": list(model.project.cautions),
            },
        },
        status=status,
        steps=b.steps,
        results=results,
        checks=found,
        references=dict(sorted(references.items())),
        assumptions=b.assumptions,
        notes=list(dict.fromkeys(notes)),
        given=b.given,
        solutions=b.solutions,
        cases=[{"id": c.id, "title": c.title} for c in cases],
        software={
            "name": "calcreport",
            "version": __version__,
            "catalog_sha256": catalog.fingerprint(),
        },
    )


def _status(model: Model, results: dict[str, Any], found: list[Check]) -> dict[str, str]:
    if model.pump.curve is not None and "operating_point" not in results:
        return {
            "value": "not feasible",
            "reason": "the pump curve does not meet the system curve in the design case",
        }
    fails = sum(1 for c in found if c.status == "fail")
    if model.pump.curve is None:  # DESIGN.md: preliminary while the pump is not selected
        return {
            "value": "preliminary",
            "reason": "pump not selected: no pump curve is given, so the operating point, "
            "NPSH required and motor rating are not determined"
            + (
                f"; {fails} design check{'s already fail' if fails != 1 else ' already fails'}"
                if fails
                else ""
            ),
        }
    if fails:
        return {"value": "does not comply", "reason": "one or more design checks fail"}
    return {
        "value": "for checking",
        "reason": "pump curve given; every check is a pass or marked for review",
    }


def _cases(b: TraceBuilder, model: Model) -> list[Case]:
    """The design case, the static-head extremes when level ranges are given, and with
    several pumps the cases of every pump running and of one duty pump out."""
    src, dst = model.source, model.destination
    npsh_level = src.level_low or src.level
    count, standby = model.pump.count, model.pump.standby
    duty = count
    if standby.value > 0:
        duty = b.step(
            "pump.duty_pumps",
            "Duty pumps (standby out of service)",
            pump.pumps_running,
            n=count,
            n_out=standby,
        )
    high = (src.level_low or src.level, dst.level_high or dst.level)
    low = (src.level_high or src.level, dst.level_low or dst.level)
    cases: list[Case] = []

    def case(
        title: str,
        levels: tuple[Given, Given],
        running: Given,
        needed: bool = True,
        flow: Given | None = None,
        temperature: Given | None = None,
        speed: Given | None = None,
        pipes: tuple[Pipe, ...] | None = None,
    ) -> None:
        cases.append(
            Case(
                id=f"C{len(cases) + 1}",
                title=title,
                flow=flow or model.flow,
                temperature=temperature,
                speed=speed,
                pipes=pipes,
                source_level=levels[0],
                npsh_level=npsh_level,
                destination_level=_destination_elevation(model, levels[1]),
                running=running,
                duty=needed,
            )
        )

    pumps = "" if count.value == 1 else f", {duty.value:g} of {count.value:g} pumps running"
    case(f"Design: normal levels, new pipe{pumps}", (src.level, dst.level), duty)

    def extremes(source: str | None, destination: str | None) -> str:
        """Which levels a static-head case moves: only those the input gives a range of."""
        return ", ".join(
            f"{vessel} {level}"
            for vessel, level in (("source", source), ("destination", destination))
            if level
        )

    if src.level_low or dst.level_high:
        moved = extremes("low" if src.level_low else None, "high" if dst.level_high else None)
        case(f"Highest static head: {moved}{pumps}", high, duty)
    if src.level_high or dst.level_low:
        moved = extremes("high" if src.level_high else None, "low" if dst.level_low else None)
        case(f"Lowest static head: {moved}{pumps}", low, duty)
    flows = sorted(model.envelope.flows, key=lambda q: q.value)
    if flows:
        peak, least = flows[-1], flows[0]
        case(
            f"Peak required flow {peak.value * 1e3:.4g} L/s, highest static head{pumps}",
            high,
            duty,
            flow=peak,
        )
        if model.pump.curve is None and least.value < model.flow.value:
            case(
                f"Least required flow {least.value * 1e3:.4g} L/s, lowest static head",
                low,
                duty,
                flow=least,
            )
    temperatures = model.envelope.temperatures
    if temperatures:
        cold, hot = temperatures
        case(
            f"Coldest liquid {cold.value - 273.15:.4g} °C (most viscous), highest static head",
            high,
            duty,
            temperature=cold,
        )
        case(
            f"Warmest liquid {hot.value - 273.15:.4g} °C (least NPSH), lowest static head",
            low,
            duty,
            temperature=hot,
        )
    aged = model.envelope.roughness
    if aged:
        b.assume(
            f"Aged pipe: every pipe smoother than {aged.value * 1e3:.4g} mm (envelope.roughness, "
            "the project's stated basis) takes that roughness in the aged-pipe case."
        )
        rough = tuple(
            replace(
                p, roughness=aged, sources={k: v for k, v in p.sources.items() if k != "roughness"}
            )
            if p.roughness.value < aged.value
            else p
            for p in model.pipes
        )
        case(f"Aged pipe (roughness {aged.value * 1e3:.4g} mm), highest static head{pumps}",
             high, duty, pipes=rough)  # fmt: skip
    dirty = model.envelope.strainer_dirty_dp
    if dirty:
        b.assume(
            "Dirty suction strainer: its loss envelope.strainer_dirty_dp at the duty flow, "
            "scaled with (Q/Q_duty)², is added at the pump end of the last suction pipe."
        )
        last = model.suction_pipes[-1]
        strainer = Fitting(
            key="envelope.strainer_dirty_dp",
            count=Given(1.0, "", "envelope.strainer_dirty_dp"),
            dp=dirty,
            at_flow=model.flow,
            note="suction strainer, dirty",
        )
        fouled = tuple(
            replace(p, fittings=(*p.fittings, strainer)) if p is last else p for p in model.pipes
        )
        case(f"Dirty suction strainer ({dirty.value / 1e3:.4g} kPa at the duty flow), lowest "
             f"source level{pumps}", high, duty, pipes=fouled)  # fmt: skip
    if model.pump.speed_range:
        slow, fast = model.pump.speed_range
        case(
            f"Top speed {fast.value * 60:.5g} rpm, lowest static head", low, duty, False, speed=fast
        )
        case(
            f"Minimum speed {slow.value * 60:.5g} rpm, highest static head",
            high,
            duty,
            False,
            speed=slow,
        )
    if standby.value > 0:
        case(f"All {count.value:g} pumps running, highest static head", high, count, False)
    if duty.value > 1:
        out = b.assume(
            "One duty pump is taken out of service in the reduced case "
            + (
                "(the running pumps move to higher flows)."
                if model.pump.arrangement == "parallel"
                else "(the running pumps give less head: the flow falls)."
            ),
            1.0,
            "",
        )
        fewer = b.step(
            f"C{len(cases) + 1}.pump.pumps_running",
            "Pumps running, one duty pump out",
            pump.pumps_running,
            f"C{len(cases) + 1}",
            n=duty,
            n_out=out,
        )
        case(f"One duty pump out: {fewer.value:g} running, lowest static head", low, fewer, False)
    return cases


@dataclass(frozen=True)
class CurvePoints:
    """Pump curve points at the operating speed, as trace values."""

    flow: list[Given]
    head: list[Given]
    efficiency: list[Given]
    npsh_required: list[Given]

    def values(self, name: str) -> list[float]:
        return [float(g.value) for g in getattr(self, name)]


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
    notes: list[str],
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
            "The viscosity correction of the pump curve (ANSI/HI 9.6.7) needs the pump speed: "
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
        "Viscosity parameter B (ANSI/HI 9.6.7)",
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
            f"The liquid is too viscous for the pump's correction (B = {B.value:.3g} ≥ 40, "
            "beyond ANSI/HI 9.6.7): consider a positive-displacement pump; the water curve "
            "is used unchanged."
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
        "The pump curve is corrected for viscosity by ANSI/HI 9.6.7 (equations as recalled, "
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


def _solve_case(
    b: TraceBuilder,
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: tuple[Given, Given, Given, Given | None],
    curve: CurvePoints | None,
    eta_drive: Given,
    notes: list[str],
    states: dict[str, safety.State],
) -> dict[str, Any]:
    """Hydraulics, operating point, NPSH and power of one case (its state kept in ``states``)."""
    required = case.flow
    operating = None
    if curve is not None:
        operating = _operating_flow(b, model, case, liquid, surfaces, curve, notes)
        if operating is not None:
            case = replace(case, flow=operating)
    h = _hydraulics(b, model, case, liquid, surfaces)
    results = _results(h, liquid, surfaces[0], model, case.flow)
    submergence = _intake(b, model, case, h)
    if submergence:
        results["intake"] = submergence
    results["profile"] = safety.profile(model, case, liquid, h, surfaces[1], surfaces[2])
    states[case.id] = safety.State(case, liquid, surfaces, h, results["profile"])
    eta_pump = model.pump.efficiency
    if operating is not None and curve is not None:
        point, eta_curve = _operating_point(b, model, case, curve, h)
        results["operating_point"] = point
        eta_pump = eta_curve or eta_pump
        if "bep_flow" in point and case.id == "C1":  # the design chart's regions
            results["operating_region"] = _regions(b, model, source_of(point["bep_flow"]))
    results.update(_power(b, model, case, liquid, h, eta_pump, eta_drive))
    results["required_flow"] = _q(required)
    results["pumps_running"] = _q(case.running)
    results["duty_case"] = case.duty
    if "shaft_power" in results:
        _per_pump_power(b, case, source_of(results["shaft_power"]), results)
    results["system_curve"], duty = _system_curve(model, case, liquid, surfaces, curve)
    if case.id == "C1":  # the required duty on the design system curve, for its chart
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
    return results


def _npsh_curves(model: Model, curve: CurvePoints) -> dict[str, Any]:
    """NPSH required at the curve points and the NPSH available its margin criterion asks for."""
    npshr = np.asarray(curve.values("npsh_required"))
    ratio, _, _, _ = checks.criterion(model, "npsh_margin_ratio")
    minimum, _, _, _ = checks.criterion(model, "npsh_margin_min")
    return {
        "npsh_required": quantity(npshr.tolist(), "m"),
        "npsh_needed": quantity(pump.npsh_needed(npshr, ratio, minimum).tolist(), "m"),
    }


def _intake(b: TraceBuilder, model: Model, case: Case, h: dict[str, Any]) -> dict[str, Any] | None:
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
    surfaces: tuple[Given, Given, Given, Given | None],
    curve: CurvePoints | None,
) -> tuple[dict[str, Any], dict[str, Any]]:
    """The system curve over the flow range, and the system at the required flow.

    One sweep of the same equations as the steps: the required flow rides along as
    the last point, so the duty point costs no second pass over the pipes.
    """
    low, high = _flow_span(model)
    if curve is not None:
        high = max(high, curve.values("flow")[-1])
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
    surfaces: tuple[Given, Given, Given, Given | None],
    h: dict[str, Any],
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
        surfaces[1],
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
            surfaces[1],
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
    surfaces: tuple[Given, Given, Given, Given | None],
    curve: CurvePoints,
    notes: list[str],
) -> Given | None:
    flows, heads = curve.values("flow"), curve.values("head")
    n = case.running.value
    parallel = model.pump.arrangement == "parallel"
    share, lift = (n, 1.0) if parallel else (1.0, n)  # combined curve: Q x share, H x lift

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
    b: TraceBuilder, model: Model, case: Case, curve: CurvePoints, h: dict[str, Any]
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


def _regions(b: TraceBuilder, model: Model, Q_bep: Given) -> dict[str, Any]:
    """Flows bounding the preferred (and, from the pump data, allowable) regions."""
    low, high, basis, _ = checks.preferred_range(model)
    if model.pump.preferred_range:
        fractions = list(model.pump.preferred_range)
    else:
        fractions = [
            model.criteria.given.get(name) or b.datum(f"catalog.criteria.{name}", value, "")
            for name, value in (("preferred_flow_low", low), ("preferred_flow_high", high))
        ]

    def bounds(name: str, given: list[Given]) -> list[dict[str, Any]]:
        return [
            _q(
                b.step(
                    f"pump.{name}_region.{end}",
                    f"{end.title()} flow of the {name} region",
                    pump.region_flow,
                    r=r,
                    Q_bep=Q_bep,
                )
            )
            for end, r in zip(("low", "high"), given, strict=True)
        ]

    out: dict[str, Any] = {
        "bep_flow": _q(Q_bep),
        "preferred": bounds("preferred", fractions),
        "preferred_basis": basis,
    }
    if model.pump.allowable_range:
        out["allowable"] = bounds("allowable", list(model.pump.allowable_range))
    if model.pump.min_continuous_flow:
        out["min_continuous_flow"] = _q(model.pump.min_continuous_flow)
    return out


def _thermal_min_flow(
    b: TraceBuilder, model: Model, liquid: Liquid, curve: CurvePoints | None, notes: list[str]
) -> dict[str, Any] | None:
    """The least flow at which the pump's losses warm the liquid by no more than the limit.

    Below the best-efficiency flow the temperature rise grows as the efficiency falls;
    the root is sought between the first curve point and the BEP on the design curve.
    """
    if curve is None or not curve.efficiency or model.pump.efficiency_basis == "overall":
        return None
    if liquid.pressure is None or model.fluid.kind != "water":
        notes.append("The thermal minimum flow is computed for water only.")
        return None
    limit, _, _, _ = checks.criterion(model, "temperature_rise_max")
    T = model.fluid.temperature
    cp = b.step(
        "pump.thermal.heat_capacity",
        "Specific heat capacity of water",
        water.heat_capacity,
        T=T,
        p=liquid.pressure,
    )
    flows, heads, effs = curve.values("flow"), curve.values("head"), curve.values("efficiency")
    q_bep, _ = pump.best_efficiency_point(flows, effs)

    def margin(q: np.ndarray) -> np.ndarray:
        eta = np.asarray(pump.monotone_cubic(flows, effs, q))
        head = np.asarray(pump.monotone_cubic(flows, heads, q))
        # Where the efficiency is nil the rise is unbounded: a large finite value keeps the
        # bracketing root finder on finite numbers.
        safe = np.where(eta > 1e-9, eta, 1.0)
        rise = np.where(eta > 1e-9, pump.temperature_rise(head, safe, cp.value), 1e9)
        return limit - rise

    found = pump.operating_point(margin, flows[0], q_bep)
    if found is None:
        notes.append(
            f"The pump warms the liquid by more than {limit:g} K even at its best-efficiency "
            "flow: its losses need another path (a bypass, a cooler); the thermal minimum flow "
            "is not defined on this curve."
        )
        return None
    if margin(np.array([flows[0]]))[0] >= 0.0:
        notes.append(
            "The thermal minimum flow lies below the curve's first point: the rise there is "
            f"within {limit:g} K, and the curve gives no lower flow to find it."
        )
        return None
    Q = b.step(
        "pump.thermal_min_flow",
        "Thermal minimum flow (temperature rise at the limit)",
        pump.thermal_flow,
        Q=b.solution(
            "solver.thermal_min_flow",
            found,
            "m^3/s",
            "bracketed root of ΔT_max − ΔT(Q) between the first curve point and the BEP, "
            "Illinois method",
        ),
    )
    H = b.step("pump.thermal.head", "Pump head at the thermal minimum flow", pump.head_at,
               Q=Q, flow=curve.flow, head=curve.head)  # fmt: skip
    eta = b.step("pump.thermal.efficiency", "Pump efficiency at the thermal minimum flow",
                 pump.efficiency_at, Q=Q, flow=curve.flow, efficiency=curve.efficiency)  # fmt: skip
    rise = b.step("pump.thermal.temperature_rise", "Temperature rise at the thermal minimum flow",
                  pump.temperature_rise, H=H, eta=eta, cp=cp)  # fmt: skip
    given = model.criteria.given.get("temperature_rise_max")
    limit_given = (
        Given(limit, "delta_degC", given.key)  # a difference, not a temperature
        if given
        else b.datum("catalog.criteria.temperature_rise_max", limit, "delta_degC")
    )
    return {
        "flow": _q(Q),
        "temperature_rise": _q(rise),
        "temperature_rise_max": _q(limit_given),
    }


def _lift_speed(
    b: TraceBuilder, model: Model, cases: list[Case], by_case: dict[str, dict[str, Any]]
) -> Given | None:
    """The speed whose shutoff head just lifts the highest static head (with a speed range)."""
    curve = model.pump.curve
    if (
        model.pump.speed_range is None
        or curve is None
        or curve.speed is None
        or curve.flow[0].value != 0.0
    ):
        return None

    def static(c: Case) -> float:
        r = by_case[c.id]
        return r["static_head"]["value"] + r["pressure_head"]["value"]

    worst = max(cases, key=static)
    H = b.step(
        "pump.static_lift",
        f"Highest static head (case {worst.id})",
        losses.head_sum,
        h=[source_of(by_case[worst.id][key]) for key in ("static_head", "pressure_head")],
    )
    H0 = curve.head[0]
    if model.pump.count.value > 1 and model.pump.arrangement == "series":
        H0 = b.step(
            "pump.shutoff_head_series",
            "Shutoff head of the pumps in series",
            pump.series_head,
            H1=curve.head[0],
            n_run=model.pump.count,
        )
    return b.step(
        "pump.minimum_lift_speed",
        "Speed that just lifts the static head",
        pump.lift_speed,
        n0=curve.speed,
        H_static=H,
        H0=H0,
    )


def _motor(
    b: TraceBuilder, model: Model, liquid: Liquid, curve: CurvePoints
) -> dict[str, Any] | None:
    """Peak shaft power over ``curve`` and the standard rating that covers it."""
    if not curve.efficiency:
        return None
    peak = b.step(
        "motor.peak_shaft_power",
        "Peak shaft power over the pump curve",
        power.peak_shaft_power,
        rho=liquid.density,
        flow=curve.flow,
        head=curve.head,
        efficiency=curve.efficiency,
    )
    required = peak
    if model.motor_derating is not None:
        required = b.step(
            "motor.required_output",
            "Rated output needed with the site derating",
            motor.derated_requirement,
            P=peak,
            k=model.motor_derating,
        )
    series, unit = ("NEMA", "hp") if model.project.units == "US" else ("IEC", "kW")
    ratings = [
        b.datum(f"catalog.motor_ratings.{series}[{i}]", value, "W")
        for i, value in enumerate(catalog.motor_ratings(series), start=1)
    ]
    try:
        rated = b.step(
            "motor.rated_power",
            f"Motor rating ({series} series, {unit})",
            motor.standard_rating,
            P=required,
            ratings=ratings,
        )
    except ValueError:
        return {"peak_shaft_power": _q(peak)}
    out = {"peak_shaft_power": _q(peak), "rated_power": _q(rated), "series": series}
    if model.motor_derating is not None:
        out["derating"] = _q(model.motor_derating)
    return out


def _motor_loading(
    b: TraceBuilder, selected: dict[str, Any], by_state: dict[str, dict[str, Any]]
) -> dict[str, Any]:
    """The motor with its loading (shaft power per pump over the rating) in every state."""
    if "rated_power" not in selected:
        return selected
    rated = source_of(selected["rated_power"])
    loading = {}
    for cid, r in by_state.items():
        if "shaft_power" not in r:
            continue
        prefix = "" if cid == "C1" else f"{cid}."
        P = source_of(r.get("shaft_power_per_pump", r["shaft_power"]))
        loading[cid] = _q(b.step(f"{prefix}motor.loading", "Motor loading", motor.loading,
                                 cid, P=P, P_rated=rated))  # fmt: skip
    return {**selected, "loading": loading}


def _class_efficiency(
    b: TraceBuilder, model: Model, motor_rating: dict[str, Any], notes: list[str]
) -> Model:
    """The model with the motor efficiency of its class at the selected rating."""
    table = catalog.motor_efficiency(model.motor_class)
    rated = motor_rating.get("rated_power", {}).get("value")
    if rated not in table:
        notes.append(
            f"Electrical power is not computed: the {model.motor_class} table has no "
            "efficiency for the selected rating; give motor.efficiency."
        )
        return model
    value, _ = table[rated]
    b.assume(
        f"Motor efficiency: the {model.motor_class} full-load limit of IEC 60034-30-1 (4-pole, "
        "50 Hz) at the selected rating, taken at every load."
    )
    eta = b.datum(
        f"catalog.motor_efficiency_iec.{model.motor_class}[{rated / 1e3:g} kW]", value, ""
    )
    return replace(model, motor_efficiency=eta)


def _record_inputs(b: TraceBuilder, model: Model) -> None:
    def walk(obj: Any) -> None:
        if isinstance(obj, Given):
            b.input(obj)
        elif isinstance(obj, tuple | list):
            for item in obj:
                walk(item)
        elif isinstance(obj, dict):
            for item in obj.values():
                walk(item)
        elif hasattr(obj, "__dataclass_fields__"):
            for name in obj.__dataclass_fields__:
                walk(getattr(obj, name))

    for name in Model.__dataclass_fields__:
        if name not in ("path", "sha256", "text", "files"):
            walk(getattr(model, name))


def _barometric(b: TraceBuilder, model: Model) -> Given:
    if model.site.station_pressure:
        return model.site.station_pressure
    elevation = model.site.elevation or b.assume(
        "Site elevation not given: the source surface is taken at sea level.", 0.0, "m"
    )
    return b.step(
        "site.barometric_pressure",
        "Barometric pressure at the site",
        atmosphere.pressure,
        z=elevation,
    )


def _liquid(
    b: TraceBuilder, model: Model, p_baro: Given, T: Given | None = None, prefix: str = ""
) -> Liquid:
    """Liquid properties at temperature ``T`` (default the fluid's), steps ids prefixed."""
    fluid = model.fluid
    if fluid.kind == "custom":
        assert fluid.density and fluid.viscosity and fluid.vapor_pressure
        return Liquid(fluid.density, fluid.viscosity, fluid.vapor_pressure)
    T = T or fluid.temperature
    if fluid.kind in glycol.CODE:
        return _glycol(b, model, T, prefix)
    at = f" at {T.value - 273.15:.4g} °C" if prefix else ""
    if fluid.kind == "seawater":
        return _seawater(b, model, T, prefix, at)
    name = fluid.kind.replace("_", "-")
    pure = fluid.kind in liquids.PURE
    p_v = b.step(
        f"{prefix}fluid.vapor_pressure",
        f"Vapour pressure of {name}{at}",
        liquids.property_function(fluid.kind, "vapor_pressure")
        if pure
        else water.saturation_pressure,
        T=T,
    )
    if model.source.saturation:
        p = p_v
    else:
        assert model.source.pressure is not None
        p = b.step(
            f"{prefix}fluid.pressure",
            "Absolute pressure on the source surface",
            head.absolute_pressure,
            p_baro=p_baro,
            p_g=model.source.pressure,
        )
    if pure:
        rho = b.step(
            f"{prefix}fluid.density",
            f"Density of {name}{at}",
            liquids.property_function(fluid.kind, "density"),
            T=T,
            p=p,
        )
        mu = b.step(
            f"{prefix}fluid.viscosity",
            f"Dynamic viscosity of {name}{at}",
            liquids.property_function(fluid.kind, "viscosity"),
            T=T,
            p=p,
        )
    else:
        rho = b.step(f"{prefix}fluid.density", f"Density of water{at}", water.density, T=T, p=p)
        mu = b.step(
            f"{prefix}fluid.viscosity",
            f"Dynamic viscosity of water{at}",
            water.viscosity,
            T=T,
            rho=rho,
        )
    if not prefix:
        b.assume(
            "Liquid properties are those at the source surface pressure and the stated "
            "temperature throughout the system."
        )
    return Liquid(rho, mu, p_v, p if fluid.kind == "water" else None)


def _seawater(b: TraceBuilder, model: Model, T: Given, prefix: str, at: str) -> Liquid:
    """Seawater: CoolProp's fit of the seawater review; vapour pressure that of pure water."""
    w = model.fluid.mass_fraction
    assert w is not None
    p_v = b.step(
        f"{prefix}fluid.vapor_pressure",
        f"Vapour pressure (that of pure water){at}",
        water.saturation_pressure,
        T=T,
    )
    rho = b.step(
        f"{prefix}fluid.density",
        f"Density of seawater{at}",
        liquids.property_function("seawater", "density"),
        T=T,
        w=w,
    )
    mu = b.step(
        f"{prefix}fluid.viscosity",
        f"Dynamic viscosity of seawater{at}",
        liquids.property_function("seawater", "viscosity"),
        T=T,
        w=w,
    )
    if not prefix:
        b.assume(
            "Seawater's vapour pressure is taken as pure water's at the same temperature "
            "(dissolved salt lowers it by about 2 %: the NPSH available is slightly "
            "understated); its properties are those at atmospheric pressure."
        )
    return Liquid(rho, mu, p_v)


def _glycol(b: TraceBuilder, model: Model, T: Given, prefix: str) -> Liquid:
    """Properties of an aqueous glycol solution (CoolProp fits; Raoult's law for p_v)."""
    fluid = model.fluid
    assert fluid.mass_fraction is not None
    w = fluid.mass_fraction
    name = fluid.kind.replace("_", " ")
    code = glycol.CODE[fluid.kind]
    density, viscosity = {
        "MEG": (glycol.ethylene_glycol_density, glycol.ethylene_glycol_viscosity),
        "MPG": (glycol.propylene_glycol_density, glycol.propylene_glycol_viscosity),
    }[code]
    M = b.datum(f"catalog.glycol.{fluid.kind}.molar_mass", glycol.MOLAR_MASS[code], "")
    p_v = b.step(
        f"{prefix}fluid.vapor_pressure",
        f"Vapour pressure of the {name} solution (Raoult's law)",
        glycol.raoult_vapor_pressure,
        T=T,
        w=w,
        M_glycol=M,
    )
    rho = b.step(f"{prefix}fluid.density", f"Density of the {name} solution", density, T=T, w=w)
    mu = b.step(
        f"{prefix}fluid.viscosity", f"Dynamic viscosity of the {name} solution", viscosity, T=T, w=w
    )
    if not prefix:
        b.assume(
            f"The {name} solution's vapour pressure follows Raoult's law on the water "
            "fraction (common practice, no published source); its properties are those "
            "at atmospheric pressure."
        )
    return Liquid(rho, mu, p_v)


def _destination_elevation(model: Model, level: Given) -> Given:
    dest = model.destination
    return dest.outlet_elevation if dest.inlet == "free" and dest.outlet_elevation else level


def _exit_head(b: TraceBuilder, model: Model) -> Given | None:
    """None for a free discharge (the velocity head is computed per case)."""
    if model.destination.inlet == "free":
        return None
    return b.assume(
        "Submerged inlet: the exit loss is a fitting item (K = 1); no outlet "
        "velocity head is added.",
        0.0,
        "m",
    )


def _surface_pressure(
    b: TraceBuilder, vessel: Vessel, liquid: Liquid, p_baro: Given, prefix: str = ""
) -> Given:
    if vessel.saturation:
        return b.step(
            f"{prefix}{vessel.role}.pressure",
            f"Gauge pressure on the boiling {vessel.role} surface",
            head.saturation_gauge_pressure,
            p_v=liquid.vapor_pressure,
            p_baro=p_baro,
        )
    assert vessel.pressure is not None
    return vessel.pressure


def _diameter_change_k(ev: Any, case: Case, pipe: Pipe, ft: Fitting, index: int) -> Given:
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
    ev: Any,
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
    ev: Any,
    case: Case,
    pipe: Pipe,
    flow: Given,
    liquid: Liquid,
    method: str = "darcy_weisbach",
    water_liquid: bool = True,
    fittings_method: str = "two_k",
) -> tuple[dict[str, Given], list[safety.FittingLoss]]:
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
    out = {"velocity": v, "reynolds": Re, "relative_roughness": eD}
    title = f"Darcy friction factor in {pipe.id}"
    if isinstance(ev, TraceBuilder) and Re.value < friction.LAMINAR_LIMIT:
        f = ev.step(
            sid(f"{name}.friction_factor"), title + " (laminar)", friction.laminar, case.id, Re=Re
        )
    else:
        if isinstance(ev, TraceBuilder):
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
        if isinstance(ev, TraceBuilder) and ft.kind in lift and ft.K is None:
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
        safety.FittingLoss(ft, by_fitting.get(i), heads.get(i))
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
    ev: Any,
    model: Model,
    case: Case,
    liquid: Liquid,
    surfaces: tuple[Given, Given, Given, Given | None],
    flow: Given | None = None,
) -> dict[str, Any]:
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
    out: dict[str, Any] = {
        "pipes": pipes,
        "fittings": {ident: items for ident, (_, items) in solved.items()},
        "branch_flow": q_branch,
    }
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
    ev: Any,
    model: Model,
    case: Case,
    liquid: Liquid,
    p_dest: Given,
    p_source: Given,
    exit_head: Given | None,
    pipes: dict[str, dict[str, Given]],
) -> dict[str, Given]:
    """Static and pressure heads, the losses and the TDH from surface to surface."""
    sid = case.sid
    out: dict[str, Given] = {}
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
    ev: Any, model: Model, case: Case, liquid: Liquid, p_source: Given, h: dict[str, Any]
) -> dict[str, Given]:
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
    h_L = safety.head_loss_to(ev, model, case, h, index, node, "system.crest")
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


def _electrical(
    b: TraceBuilder,
    model: Model,
    case: Case,
    P_h: Given,
    eta_pump: Given,
    eta_drive: Given,
    label: str = "",
) -> tuple[Given | None, Given | None]:
    """Shaft and electrical input power from the hydraulic power (None where not known)."""
    sid = case.sid
    if model.pump.efficiency_basis == "overall":
        # Wire-to-water efficiency: electrical input directly; the shaft power is unknown,
        # and no motor efficiency is applied (it is inside the overall value).
        P_e = b.step(
            sid("power.electrical"),
            f"Electrical input power{label} (wire-to-water efficiency)",
            power.wire_to_water_power,
            case.id,
            P_h=P_h,
            eta_ww=eta_pump,
        )
        return None, P_e
    P_s = b.step(
        sid("power.shaft"),
        f"Shaft power{label}",
        power.shaft_power,
        case.id,
        P_h=P_h,
        eta_p=eta_pump,
    )
    if model.motor_efficiency is None:
        return P_s, None
    P_e = b.step(
        sid("power.electrical"),
        f"Electrical input power{label}",
        power.electrical_power,
        case.id,
        P_s=P_s,
        eta_m=model.motor_efficiency,
        eta_d=eta_drive,
    )
    return P_s, P_e


def _power(
    b: TraceBuilder,
    model: Model,
    case: Case,
    liquid: Liquid,
    hydraulics: dict[str, Any],
    eta_pump: Given | None,
    eta_drive: Given,
) -> dict[str, Any]:
    sid = case.sid
    out: dict[str, Any] = {}
    P_h = b.step(
        sid("power.hydraulic"),
        "Hydraulic power",
        power.hydraulic_power,
        case.id,
        rho=liquid.density,
        Q=case.flow,
        H=hydraulics["tdh"],
    )
    out["hydraulic_power"] = _q(P_h)
    if eta_pump is None:
        return out
    P_s, P_e = _electrical(b, model, case, P_h, eta_pump, eta_drive)
    if P_s is not None:
        out["shaft_power"] = _q(P_s)
    if P_e is not None:
        out["electrical_power"] = _q(P_e)
    return out


def _energy(
    b: TraceBuilder,
    model: Model,
    case: Case,
    P_e: Given,
    profile: dict[str, dict[str, Any]],
    notes: list[str],
) -> dict[str, Any] | None:
    """Annual energy and cost on the basis of the duty: continuous, fill, or a profile
    (``profile``: the solved states of its points, for throttled or variable-speed control)."""
    op = model.operation
    energy: dict[str, Any] = {"control": op.control}
    demand, burnt = P_e, None
    if op.profile:
        found = _duty_profile(b, model, case, P_e, profile, notes)
        if found is None:
            return None
        E, hours, e_v, demand, burnt, extra = found
        energy.update(extra)
    else:
        if op.hours_per_year is not None:
            hours = b.step(
                "energy.operating_time",
                "Operating time per year",
                power.hours_to_seconds,
                hours=op.hours_per_year,
            )
        elif op.annual_volume is not None:
            hours = b.step(
                "energy.operating_time",
                "Operating time per year (fill duty)",
                power.fill_time,
                V=op.annual_volume,
                Q=case.flow,
            )
        else:
            notes.append(
                "Annual energy is not computed: give operation.hours_per_year "
                "(continuous duty), operation.annual_volume (fill duty) or operation.profile."
            )
            return None
        E = b.step("energy.annual", "Annual energy", power.annual_energy, P_e=P_e, t=hours)
        e_v = b.step(
            "energy.specific",
            "Specific energy (per volume pumped)",
            power.specific_energy,
            P_e=P_e,
            Q=case.flow,
        )
    energy.update(annual_energy=_q(E), specific_energy=_q(e_v), operating_time=_q(hours))
    costs = []
    if op.energy_price is not None:
        costs.append(
            b.step(
                "energy.annual_cost",
                "Annual energy cost",
                power.annual_cost,
                E=E,
                price=op.energy_price,
            )
        )
        if burnt is not None:
            C_thr = b.step(
                "energy.throttling_cost",
                "Annual cost of the energy burnt in throttling",
                power.annual_cost,
                E=burnt,
                price=op.energy_price,
            )
            energy["throttling_cost"] = quantity(C_thr.value, op.currency)
    if op.demand_charge is not None:
        D = b.step(
            "energy.demand_cost",
            "Annual demand charge",
            power.demand_cost,
            P_e=demand,
            rate=op.demand_charge,
        )
        energy["demand_cost"] = quantity(D.value, op.currency)
        costs.append(D)
    if costs:
        total = (
            costs[0]
            if len(costs) == 1
            else b.step(
                "energy.total_cost",
                "Annual energy and demand cost",
                power.cost_sum,
                costs=costs,
            )
        )
        energy["annual_cost"] = quantity(total.value, op.currency)
        if op.life_years is not None and op.discount_rate is not None:
            pv = b.step(
                "energy.life_cycle_cost",
                "Present value of the energy cost over the life",
                power.present_value,
                C=total,
                rate=op.discount_rate,
                years=op.life_years,
            )
            energy["life_cycle_energy_cost"] = quantity(pv.value, op.currency)
    return energy


def _duty_profile(
    b: TraceBuilder,
    model: Model,
    case: Case,
    P_e: Given,
    profile: dict[str, dict[str, Any]],
    notes: list[str],
) -> tuple[Given, Given, Given, Given, Given | None, dict[str, Any]] | None:
    """Energy over operation.profile: annual energy, time, specific energy, demand, the
    energy burnt throttling (None for other controls) and the rows.

    On-off control runs the pump at its operating point (``case``, power ``P_e``) for as
    long as the profile's volume needs; throttled and variable-speed control take each
    point's electrical power from its solved state in ``profile``.
    """
    op = model.operation
    times = [
        b.step(
            f"P{i}.energy.operating_time",
            f"Time a year at profile point P{i}",
            power.hours_to_seconds,
            f"P{i}",
            hours=hours,
        )
        for i, (_, hours) in enumerate(op.profile, start=1)
    ]
    flows = [q for q, _ in op.profile]
    V = b.step(
        "energy.annual_volume",
        "Volume pumped a year over the profile",
        power.profile_volume,
        Q=flows,
        t=times,
    )
    rows: list[dict[str, Any]] = [
        {"point": f"P{i}", "flow": _q(q), "hours": h.value}
        for i, (q, h) in enumerate(op.profile, start=1)
    ]
    extra: dict[str, Any] = {"annual_volume": _q(V), "profile": rows}
    E_thr = None
    if op.control == "on_off":
        hours = b.step(
            "energy.operating_time",
            "Operating time per year (on-off: the profile's volume at the operating flow)",
            power.fill_time,
            V=V,
            Q=case.flow,
        )
        E = b.step("energy.annual", "Annual energy", power.annual_energy, P_e=P_e, t=hours)
        demand = P_e
    else:
        powers, lost = [], []
        for row, t in zip(rows, times, strict=True):
            pid = row["point"]
            # Where a crest controls the point, the pump lifts to it: that state's power.
            state = profile.get(f"{pid}x", profile[pid])
            point = state.get("operating_point", {})
            row["system_head"] = state["total_dynamic_head"]
            if "electrical_power" not in state:
                notes.append(
                    f"Annual energy is not computed: profile point {pid} cannot be served "
                    f"({state.get('unserved', 'no electrical power')})."
                )
                return None
            row.update(
                {k: point[k] for k in ("speed", "efficiency") if k in point},
                pump_head=point["head"],
                electrical_power=state["electrical_power"],
            )
            powers.append(source_of(state["electrical_power"]))
            if "throttling_loss" in point:
                row["throttling_loss"] = point["throttling_loss"]
                lost.append(source_of(state["throttling_power"]))
            # Each point's share of the year, for the energy chart (the total is a step).
            row["annual_energy"] = quantity(powers[-1].value * t.value, "J")
            if op.energy_price is not None:
                cost = float(
                    power.annual_cost(row["annual_energy"]["value"], op.energy_price.value)
                )
                row["annual_cost"] = quantity(cost, op.currency)
        E = b.step("energy.annual", "Annual energy over the profile", power.profile_energy,
                   P=powers, t=times)  # fmt: skip
        hours = b.step("energy.operating_time", "Operating time per year", power.time_sum, t=times)
        demand = b.step("energy.peak_power", "Peak electrical demand over the profile",
                        power.peak_power, P=powers)  # fmt: skip
        if op.control == "throttled":
            E_thr = b.step(
                "energy.throttling",
                "Annual energy burnt in the throttling valve",
                power.profile_energy,
                P=lost,
                t=times,
            )
            extra["throttling_energy"] = _q(E_thr)
    e_v = b.step(
        "energy.specific",
        "Specific energy (per volume pumped)",
        power.energy_per_volume,
        E=E,
        V=V,
    )
    return E, hours, e_v, demand, E_thr, extra


def _profile_states(
    b: TraceBuilder,
    model: Model,
    design: safety.State,
    curve: CurvePoints | None,
    eta_drive: Given,
    states: dict[str, safety.State],
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
    design: safety.State,
    curve: CurvePoints,
    eta_drive: Given,
    states: dict[str, safety.State],
) -> dict[str, Any]:
    """Hydraulics, pump state, NPSH and power of one profile point (its state kept in
    ``states``); ``unserved`` says why when the pump cannot run there."""
    sid, pid = point.sid, point.id
    liquid, surfaces = design.liquid, design.surfaces
    h = _hydraulics(b, model, point, liquid, surfaces)
    result = _results(h, liquid, surfaces[0], model, point.flow)
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
    result["profile"] = safety.profile(
        model, point, liquid, h, surfaces[1], surfaces[2], H_pump if throttled else None
    )
    states[pid] = safety.State(
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
    assert model.pump.curve is not None
    n0 = model.pump.speed or model.pump.curve.speed
    assert n0 is not None
    top = model.pump.speed_range[1].value if model.pump.speed_range else n0.value
    q0, h0 = curve.values("flow"), curve.values("head")

    def difference(speeds: np.ndarray) -> np.ndarray:
        at = Q.value * n0.value / speeds
        inside = at <= q0[-1]
        head = np.where(inside, pump.monotone_cubic(q0, h0, np.minimum(at, q0[-1])), -1e9)
        return lift * (speeds / n0.value) ** 2 * head - H_sys.value

    low = max(Q.value * n0.value / q0[-1], 1e-6 * n0.value)
    speed = pump.operating_point(difference, low, top) if low < top else None
    if speed is None:
        return f"it needs more than the top speed of {top * 60:.5g} rpm"
    found = b.solution(point.sid("solver.speed"), speed, "1/s",
                       "bracketed root of H_pump(n, Q) − H_system(Q), Illinois method")  # fmt: skip
    return b.step(point.sid("pump.speed"), "Speed that meets the system head at the profile flow",
                  pump.solved_speed, point.id, n=found)  # fmt: skip


def _per_pump_power(b: TraceBuilder, case: Case, P_s: Given, results: dict[str, Any]) -> None:
    """Each pump's share of the shaft power when several run."""
    if case.running.value > 1:
        per_pump = b.step(
            case.sid("power.shaft_per_pump"),
            "Shaft power of each pump",
            power.per_pump_power,
            case.id,
            P=P_s,
            n_run=case.running,
        )
        results["shaft_power_per_pump"] = _q(per_pump)


def _results(
    h: dict[str, Any], liquid: Liquid, p_baro: Given, model: Model, flow: Given
) -> dict[str, Any]:
    pipes = {}
    for pipe in model.pipes:
        values = h["pipes"][pipe.id]
        entry = {
            "inner_diameter": _q(pipe.inner_diameter),
            "length": _q(pipe.length),
            "roughness": _q(pipe.roughness),
            "side": pipe.side,
            "regime": friction.flow_regime(values["reynolds"].value),
        }
        entry.update({key: _q(value) for key, value in values.items()})
        if pipe.sources:
            entry["sources"] = dict(pipe.sources)
        if pipe.elevation_start and pipe.elevation_end:
            entry["elevation_start"] = _q(pipe.elevation_start)
            entry["elevation_end"] = _q(pipe.elevation_end)
        pipes[pipe.id] = entry
    return {
        "flow": _q(flow),
        "static_head": _q(h["static_head"]),
        "pressure_head": _q(h["pressure_head"]),
        "friction_loss": _q(h["friction_loss"]),
        "minor_loss": _q(h["minor_loss"]),
        "outlet_velocity_head": _q(h["outlet_velocity_head"]),
        "total_dynamic_head": _q(h["tdh"]),
        "suction_loss": _q(h["suction_loss"]),
        "npsh_available": _q(h["npsh_available"]),
        "barometric_pressure": _q(p_baro),
        "fluid": {
            "density": _q(liquid.density),
            "viscosity": _q(liquid.viscosity),
            "vapor_pressure": _q(liquid.vapor_pressure),
        },
        "pipes": pipes,
    }


def _flow_span(model: Model) -> tuple[float, float]:
    if model.flow_range:
        return model.flow_range[0].value, model.flow_range[1].value
    return 0.0, 1.5 * model.flow.value
