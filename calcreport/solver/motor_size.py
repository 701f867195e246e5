"""Motor: the rating selected from the standard series, its loading over every state and the
efficiency class of the standard.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from calcreport import catalog
from calcreport.model.schema import Model
from calcreport.physics import motor, power
from calcreport.solver.states import CurvePoints, Liquid, Notes
from calcreport.trace import DESIGN_CASE, TraceBuilder, source_of
from calcreport.trace import bound as _q  # a result naming its source


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
        prefix = "" if cid == DESIGN_CASE else f"{cid}."
        P = source_of(r.get("shaft_power_per_pump", r["shaft_power"]))
        loading[cid] = _q(b.step(f"{prefix}motor.loading", "Motor loading", motor.loading,
                                 cid, P=P, P_rated=rated))  # fmt: skip
    return {**selected, "loading": loading}


def _class_efficiency(
    b: TraceBuilder, model: Model, motor_rating: dict[str, Any], notes: Notes
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
