"""The calculation sequence: validated model → :class:`~calcreport.trace.Trace`.

In order: site (barometric pressure), liquid properties, then for each
operating case the hydraulics of every pipe (velocity, Reynolds number,
friction factor, friction and minor losses), the system heads and TDH, the
NPSH available and the power chain; then the system curve over the flow
range, the design checks and the results.

One module a stage: :mod:`~calcreport.solver.states` (what passes between them),
:mod:`~calcreport.solver.liquid`, :mod:`~calcreport.solver.cases`,
:mod:`~calcreport.solver.hydraulics` (written once, run by the trace builder at a state's
flow and by an array sweep for the system curve), :mod:`~calcreport.solver.pumpcurve`,
:mod:`~calcreport.solver.operating`, :mod:`~calcreport.solver.motor_size`,
:mod:`~calcreport.solver.energy`, :mod:`~calcreport.solver.profile` and
:mod:`~calcreport.solver.results`, :mod:`~calcreport.solver.route_pressure` (pressures
along the route and ratings) and :mod:`~calcreport.solver.surge_screen`; the checks are
:mod:`calcreport.checks`.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import PurePath
from typing import Any

from calcreport import __version__, catalog, checks
from calcreport.model.schema import Model
from calcreport.solver import route_pressure, staging
from calcreport.solver.cases import _cases
from calcreport.solver.energy import _energy
from calcreport.solver.liquid import (
    _barometric,
    _exit_head,
    _liquid,
    _record_inputs,
    _surface_pressure,
)
from calcreport.solver.motor_size import _class_efficiency, _motor, _motor_loading
from calcreport.solver.operating import _solve_case
from calcreport.solver.profile import _crest_title, _profile_state, _profile_states
from calcreport.solver.pump_limits import _lift_speed, _thermal_min_flow
from calcreport.solver.pumpcurve import _pump_curve, _viscous
from calcreport.solver.rated_duty import rated_duty, rated_state
from calcreport.solver.results import _status
from calcreport.solver.states import Case, CurvePoints, Liquid, Notes, Surfaces
from calcreport.trace import DESIGN_CASE, Check, Trace, TraceBuilder, source_of
from calcreport.trace import bound as _q  # a result naming its source

__all__ = ["solve"]


def solve(model: Model, progress: Any = None) -> Trace:
    """Solve the pump system of ``model`` and return its trace: with a study
    (``model.study``), each offer's and pipe size's whole calculation, their ranking by
    life-cycle cost and the selected design's trace (:mod:`calcreport.solver.study`);
    ``progress`` is told each calculation of a study as it starts."""
    if model.study is not None:
        from calcreport.solver.study import solve_study

        return solve_study(model, _solve_design, progress or (lambda stage: None))
    return _solve_design(model)


def _solve_design(model: Model, study: Any = None, texts: bool = True) -> Trace:
    """The trace of the one design ``model`` describes; ``study(b, results)``, when given,
    adds the candidates' study to it (its steps and ``results.study``); without ``texts``
    its steps are evaluated but not recorded (a study's alternative, read for its results
    and checks)."""
    b = TraceBuilder(texts)
    notes = Notes()
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
    surfaces = Surfaces(p_baro, p_source, p_dest, exit_head)
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
    route = route_pressure.Route(b, model)
    states: dict[str, route_pressure.State] = {}
    design_curve = curve

    def checked(state_id: str, result: dict[str, Any]) -> None:
        """A solved running state routed (its pressures along the line) and checked."""
        state_route = route.case_route(states[state_id])
        if state_route:
            result["route"] = state_route
        found.extend(checks.evaluate(model, result, state_id))

    def run(case: Case, case_liquid: Liquid, case_surfaces: Surfaces) -> dict[str, Any]:
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
        checked(case.id, result)
        return result

    def run_point(point: Case) -> None:
        """A state solved like a duty-profile point, routed, checked and kept with them;
        where a crest controls its flow, its twin lifting to the crest too."""
        assert design_curve is not None  # such states exist only with a curve
        result = _profile_state(b, model, point, design, design_curve, eta_drive, states)
        checked(point.id, result)
        profile[point.id] = result
        if point.crest is None:
            crest_twin(point)

    def crest_twin(point: Case) -> None:
        """The twin of the point-like state ``point`` where a crest controls its flow."""
        crest = route_pressure.controlling_crest(model, design, states[point.id])
        if crest is not None:
            title = _crest_title(point.id, crest)
            run_point(replace(point, id=f"{point.id}x", title=title, crest=crest))

    for case in list(cases):
        case_liquid, case_surfaces = liquid, surfaces
        if case.temperature is not None:
            prefix = f"{case.id}."
            case_liquid = _liquid(b, model, p_baro, case.temperature, prefix)
            case_surfaces = Surfaces(
                p_baro,
                _surface_pressure(b, model.source, case_liquid, p_baro, prefix),
                _surface_pressure(b, model.destination, case_liquid, p_baro, prefix),
                exit_head,
            )
        if case.id == DESIGN_CASE:
            design_curve, _ = _viscous(b, model, curve, case, case_liquid, corrected, notes)
        by_case[case.id] = run(case, case_liquid, case_surfaces)
    design = states[DESIGN_CASE]
    profile = _profile_states(b, model, design, design_curve, eta_drive, states)
    for pid, result in profile.items():
        checked(pid, result)
    # A crest the full line would cross below atmospheric controls that state's flow: the
    # state is solved again with the pump lifting to the crest.
    for case in list(cases):
        crest = route_pressure.controlling_crest(model, design, states[case.id])
        if crest is not None:
            lifted = replace(
                case, id=f"{case.id}x", title=_crest_title(case.title, crest), crest=crest
            )
            cases.append(lifted)
            st = states[case.id]
            by_case[lifted.id] = run(lifted, st.liquid, st.surfaces)
    for pid in list(profile):
        crest_twin(states[pid].case)
    rated_id, rated = rated_state(b, model, design, design_curve, eta_drive, profile, states)
    if rated is not None and rated_id in states:  # a running state of its own: checked
        checked(rated_id, rated)
        profile[rated_id] = rated
    staged = None
    if "electrical_power" in by_case[DESIGN_CASE]:
        P_e = source_of(by_case[DESIGN_CASE]["electrical_power"])
        energy = _energy(b, model, states[DESIGN_CASE].case, P_e, profile, notes)
        if energy:
            by_case[DESIGN_CASE]["energy"] = energy
            if staging.applies(model, design_curve, design.case.running):
                assert design_curve is not None
                staged, staged_checks = staging.staging(
                    b, model, design, design_curve, eta_drive, profile, states, energy,
                    run_point, notes,
                )  # fmt: skip
                found += staged_checks
    results = dict(by_case[DESIGN_CASE])
    if staged:
        results["staging"] = staged
    if study is not None:
        results["study"] = study(b, results)
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
    results["rated_duty"] = rated_duty(
        b, model, results, rated_id, (rated or {**by_case, **profile}[rated_id]), found
    )
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
        notes=list(notes),
        given=b.given,
        solutions=b.solutions,
        cases=[{"id": c.id, "title": c.title} for c in cases],
        software={
            "name": "calcreport",
            "version": __version__,
            "catalog_sha256": catalog.fingerprint(),
        },
    )
