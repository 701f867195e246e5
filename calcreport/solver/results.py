"""The results map of a state and the report status."""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import Given, Model
from calcreport.physics import friction
from calcreport.solver.states import CaseHydraulics, Liquid
from calcreport.trace import Check
from calcreport.trace import bound as _q  # a result naming its source


def _status(model: Model, results: dict[str, Any], found: list[Check]) -> dict[str, str]:
    if model.pump.curve is not None and "operating_point" not in results:
        return {
            "value": "not feasible",
            "reason": "the pump curve does not meet the system curve in the design case",
        }
    fails = sum(1 for c in found if c.status == "fail")
    if model.pump.curve is None:  # the report is preliminary while the pump is not selected
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


def _results(
    h: CaseHydraulics, liquid: Liquid, p_baro: Given, model: Model, flow: Given
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
