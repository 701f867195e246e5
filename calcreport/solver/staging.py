"""Staging of parallel pumps over the duty profile: at each profile point, the number of
duty pumps that serves its flow for the least electrical input power with each pump inside
its operating-region limits; that count solved and checked as a running state of its own;
and the annual energy of running so against the design's fixed count.

Identical pumps in parallel share the flow at equal head (Karassik, Pump Handbook, 4th ed.,
2008); which of them to run at each flow is a choice of least input power (Hydraulic
Institute, Europump and US DOE, Variable Speed Pumping: A Guide to Successful Applications,
2004). Each count is screened with the state's own equations run without recording (the
sweep evaluator); the count chosen is then solved as a traced state like a profile point, so
that every check sees it.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from calcreport.checks import criterion, preferred_range
from calcreport.model.schema import Given, Model
from calcreport.physics import power, pump
from calcreport.physics.power.energy import energy_saving
from calcreport.solver import route_pressure
from calcreport.solver.energy import _electrical
from calcreport.solver.hydraulics import _hydraulics, _Sweep
from calcreport.solver.profile import _meeting_speed, _speeds
from calcreport.solver.states import Case, CurvePoints, Notes
from calcreport.trace import Check, TraceBuilder, quantity, source_of
from calcreport.trace import bound as _q  # a result naming its source

STAGED = "s"  # a staged state's id is its point's and this: "P2s" (its crest twin "P2sx")

# Counts whose input powers differ by less than this fraction of them are a tie, and the
# fewer pumps run (a constant pump efficiency under variable speed gives every count one
# power, to rounding).
_TIE = 1e-9


@dataclass(frozen=True)
class Count:
    """One count of duty pumps at a profile point, screened: its electrical input power
    [W] (None where the pumps cannot serve the point's flow) and why it is not feasible
    ("" when it is)."""

    pumps: int
    power: float | None
    reason: str

    @property
    def feasible(self) -> bool:
        return self.power is not None and not self.reason

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {"pumps": self.pumps, "feasible": self.feasible}
        if self.power is not None:
            out["electrical_power"] = quantity(self.power, "W")
        if self.reason:
            out["reason"] = self.reason
        return out


def applies(model: Model, curve: CurvePoints | None, running: Given) -> bool:
    """Staging is a question for more than one duty pump in parallel on a pump curve, over
    a duty profile under throttled or variable-speed control (``running``: the design's
    duty pumps)."""
    op = model.operation
    return (
        curve is not None
        and bool(op.profile)
        and op.control in ("throttled", "variable_speed")
        and model.pump.arrangement == "parallel"
        and running.value > 1
    )


def staging(
    b: TraceBuilder,
    model: Model,
    design: route_pressure.State,
    curve: CurvePoints,
    eta_drive: Given,
    profile: dict[str, dict[str, Any]],
    states: dict[str, route_pressure.State],
    energy: dict[str, Any],
    run: Callable[[Case], None],
    notes: Notes,
) -> tuple[dict[str, Any], list[Check]]:
    """The staging block of the results and a check a point, once the fixed count's energy
    is known (``energy``, over the solved ``profile`` states).

    At each point every count k = 1 … n of the design's n duty pumps is screened
    (:func:`_screen`); the feasible count of least electrical input power (ties: fewer
    pumps) is the staged count. A staged count other than n is solved by ``run`` as state
    ``P<i>s`` (routed, checked and kept with the profile states, with its crest twin). A
    point where no count is feasible keeps the n pumps, and its check asks for review. The
    annual energies of both ways of running, and the saving, are steps.
    """
    op = model.operation
    n = design.case.running
    bep = None
    if curve.efficiency:
        bep = pump.best_efficiency_point(curve.values("flow"), curve.values("efficiency"))[0]
    limits = _limits(model, curve)
    rows, found, unstaged = [], [], []
    staged_powers, times = [], []
    for i, (flow, hours) in enumerate(op.profile, start=1):
        pid = f"P{i}"
        fixed = f"{pid}x" if f"{pid}x" in profile else pid
        # Screened on the state as it runs: where a crest controls it, lifting to the crest.
        counts = [
            _screen(model, states[fixed].case, k, design, curve, eta_drive, bep)
            for k in range(1, int(n.value) + 1)
        ]
        best = _least_power(counts)
        state = fixed
        if best is None:
            unstaged.append(pid)
        elif best.pumps != int(n.value):
            staged = f"{pid}{STAGED}"
            k = b.solution(f"{staged}.solver.pumps_running", float(best.pumps), "",
                           f"the count of duty pumps of least electrical input power among "
                           f"those that serve {pid} within the operating-region limits "
                           "(results.staging)")  # fmt: skip
            run(
                replace(
                    design.case,
                    id=staged,
                    title=f"Duty profile point {pid}, staged: {best.pumps} of "
                    f"{n.value:g} duty pumps running",
                    flow=flow,
                    running=k,
                )
            )
            state = f"{staged}x" if f"{staged}x" in profile else staged
        feasible = [c.pumps for c in counts if c.feasible]
        staged_powers.append(source_of(profile[state]["electrical_power"]))
        times.append(b.recorded(f"{pid}.energy.operating_time"))
        rows.append(
            {
                "point": pid,
                "flow": _q(flow),
                "hours": hours.value,
                "pumps_fixed": int(n.value),
                "state_fixed": fixed,
                "pumps": best.pumps if best else int(n.value),
                "state": state,
                "feasible": feasible,
                "screened": [c.to_json() for c in counts],
                "electrical_power": {
                    "fixed": profile[fixed]["electrical_power"],
                    "staged": profile[state]["electrical_power"],
                },
            }
        )
        found.append(_check(pid, n, feasible, limits))
    if unstaged:
        notes.append(
            f"Staging of the pumps: at {', '.join(unstaged)} no count of duty pumps keeps each "
            f"pump within its operating-region limits; the design's {n.value:g} pumps are kept "
            "there in the staged energy."
        )
    E_fixed = source_of(energy["annual_energy"])
    E = b.step("energy.staging.annual", "Annual energy, the pumps staged at each point",
               power.profile_energy, P=staged_powers, t=times)  # fmt: skip
    dE = b.step("energy.staging.saving", "Annual energy saved by staging the pumps",
                energy_saving, E_ref=E_fixed, E=E)  # fmt: skip
    out: dict[str, Any] = {
        "control": op.control,
        "pumps_available": _q(n),
        "limits": limits,
        "points": rows,
        "unstaged": unstaged,
        "energy_fixed": _q(E_fixed),
        "energy_staged": _q(E),
        "saving": _q(dE),
    }
    if op.energy_price is not None:
        C_fixed = b.recorded("energy.annual_cost")
        C = b.step("energy.staging.cost", "Annual energy cost, the pumps staged",
                   power.annual_cost, E=E, price=op.energy_price)  # fmt: skip
        dC = b.step("energy.staging.saving_cost", "Annual energy cost saved by staging",
                    power.annual_cost, E=dE, price=op.energy_price)  # fmt: skip
        for key, cost in (("cost_fixed", C_fixed), ("cost_staged", C), ("cost_saving", dC)):
            out[key] = {**quantity(cost.value, op.currency), "from": cost.key}
    return out, found


def _least_power(counts: list[Count]) -> Count | None:
    """The feasible count of least power, the fewer pumps on a tie; None when none is."""
    best, least = None, 0.0
    for count in counts:  # in rising order of pumps
        if count.feasible and count.power is not None:
            if best is None or count.power < least * (1.0 - _TIE):
                best, least = count, count.power
    return best


def _screen(
    model: Model,
    point: Case,
    k: int,
    design: route_pressure.State,
    curve: CurvePoints,
    eta_drive: Given,
    bep: float | None,
) -> Count:
    """``k`` pumps at ``point``'s flow, each at 1/k of it: whether their combined curve
    meets the system there (at fixed speed with the valve burning the excess head, or at
    the speed that meets it), each pump's limits and the electrical input power, by the
    same equations as the state (:func:`calcreport.solver.profile._profile_state`) run on
    the sweep evaluator, which records nothing. ``bep``: the curve's BEP flow [m^3/s]."""
    ev = _Sweep()
    case = replace(point, running=Given(float(k), "", "staging"))
    at = Given(np.array([point.flow.value]), "m^3/s", "staging")  # type: ignore[arg-type]
    h = _hydraulics(ev, model, case, design.liquid, design.surfaces, flow=at)
    H_sys, npsha = _scalar(h["tdh"]), _scalar(h["npsh_available"])
    Q = point.flow.value
    q = Q / k
    n0, _ = _speeds(model)
    flows = curve.values("flow")
    if model.operation.control == "throttled":
        if not flows[0] <= q <= flows[-1]:
            return Count(k, None, "each pump's flow is beyond its curve")
        H = float(pump.head_at(q, flows, curve.values("head")))
        if H < H_sys:
            return Count(k, None, "their head at fixed speed is below the system head")
        speed, q0 = n0, q
    else:
        found = _meeting_speed(model, curve, q, H_sys, 1.0)
        if found is None:
            return Count(k, None, "they need more than the top speed")
        H, speed, q0 = H_sys, found, q * n0 / found
    eta = (
        float(pump.efficiency_at(q0, flows, curve.values("efficiency")))
        if curve.efficiency
        else model.pump.efficiency.value  # type: ignore[union-attr]
    )
    P_h = power.hydraulic_power(design.liquid.density.value, Q, H)
    _, P_e = _electrical(
        ev, model, case, Given(P_h, "W", "staging"), Given(eta, "", "staging"), eta_drive
    )
    assert P_e is not None  # staging is asked only where the design's input power is known
    return Count(k, float(P_e.value), _limit_missed(model, curve, q0, speed / n0, npsha, bep))


def _limit_missed(
    model: Model,
    curve: CurvePoints,
    q0: float,
    speed_ratio: float,
    npsha: float,
    bep: float | None,
) -> str:
    """The first limit a pump misses at the flow ``q0`` [m^3/s] on its curve's speed (the
    state's flow moved by the affinity laws), running at ``speed_ratio`` n/n0 [-] with the
    NPSH available ``npsha`` [m]; "" when it is within them all. The same comparisons as
    the checks of every state (:mod:`calcreport.checks`)."""
    if bep is not None:
        ratio = q0 / bep
        low, high, _, _ = preferred_range(model)
        if not low <= ratio <= high:
            return f"Q/Q_BEP = {ratio:.3f}, outside the preferred region {low:g}–{high:g}"
        if model.pump.allowable_range:
            low, high = (g.value for g in model.pump.allowable_range)
            if not low <= ratio <= high:
                return f"Q/Q_BEP = {ratio:.3f}, outside the allowable region {low:g}–{high:g}"
    minimum = model.pump.min_continuous_flow
    if minimum is not None and q0 < minimum.value:
        return "each pump's flow is below its minimum continuous flow"
    if curve.npsh_required:
        # NPSH required moves with the square of the speed, as in the states (affinity laws).
        at_curve = pump.npsh_required_at(q0, curve.values("flow"), curve.values("npsh_required"))
        npshr = float(at_curve) * speed_ratio**2
        ratio_asked, _, _, _ = criterion(model, "npsh_margin_ratio")
        least, _, _, _ = criterion(model, "npsh_margin_min")
        if npsha < float(pump.npsh_needed(npshr, ratio_asked, least)):
            return "the NPSH available is below the margin asked over NPSH required"
    return ""


def _limits(model: Model, curve: CurvePoints) -> list[str]:
    """The limits a count is held to, as the report names them."""
    out = []
    if curve.efficiency:
        low, high, _, _ = preferred_range(model)
        out.append(f"preferred operating region {low:g}–{high:g} × Q_BEP")
        if model.pump.allowable_range:
            low, high = (g.value for g in model.pump.allowable_range)
            out.append(f"allowable operating region {low:g}–{high:g} × Q_BEP")
    if model.pump.min_continuous_flow is not None:
        out.append("minimum continuous flow")
    if curve.npsh_required:
        out.append("NPSH margin")
    return out


def _check(pid: str, n: Given, feasible: list[int], limits: list[str]) -> Check:
    """Some count of the duty pumps is feasible at profile point ``pid``."""
    ok = bool(feasible)
    return Check(
        id="staging_feasible",
        title="A count of duty pumps serves the profile point within the operating limits",
        status="pass" if ok else "review",
        value=float(len(feasible)),
        unit="",
        limit=1.0,
        comparison=">=",
        basis="Counts of duty pumps in parallel that meet the point's flow with each pump "
        "within its operating-region limits (" + (", ".join(limits) or "none given") + "); the "
        "staged count is the one of least electrical input power among them",
        reference="hi_power",
        case=pid,
        message=""
        if ok
        else f"no count of the {n.value:g} duty pumps keeps each pump within its limits at "
        f"{pid}: the {n.value:g} pumps are kept there",
        margin=len(feasible) - 1.0,
    )


def _scalar(value: Given) -> float:
    """A sweep's value at its one flow (a term that does not depend on flow is a scalar)."""
    return float(np.ravel(value.value)[0])
