"""Power and energy: hydraulic, shaft and electrical power of a state, per-pump power, the
annual energy and cost at fixed duty or over the duty profile.
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import Given, Model
from calcreport.physics import power
from calcreport.solver.states import Case, Evaluator, Liquid, Notes
from calcreport.trace import TraceBuilder, quantity, source_of
from calcreport.trace import bound as _q  # a result naming its source


def _electrical(
    b: Evaluator,
    model: Model,
    case: Case,
    P_h: Given,
    eta_pump: Given,
    eta_drive: Given,
    label: str = "",
) -> tuple[Given | None, Given | None]:
    """Shaft and electrical input power from the hydraulic power (None where not known);
    ``b`` records them, or a sweep evaluates them without recording (a count of pumps
    screened, :mod:`calcreport.solver.staging`)."""
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
    notes: Notes,
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
        # In the project's currency, naming its step (a study's life-cycle cost uses it).
        energy["annual_cost"] = {**quantity(total.value, op.currency), "from": total.key}
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
    notes: Notes,
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
