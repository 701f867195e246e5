"""The [source] and [destination] tables: levels and their ranges, surface pressures, the
destination's inlet; the flow range of the system curve.
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import (
    Given,
    Vessel,
)
from calcreport.model.sections.reader import _Reader
from calcreport.units import UnitProblem, as_written, parse

INLETS = ("submerged", "free")
_VESSEL_KEYS = {"level", "level_low", "level_high", "pressure"}
_DESTINATION_KEYS = _VESSEL_KEYS | {"inlet", "outlet_elevation"}


def _flow_range(r: _Reader, duty: dict[str, Any], flow: Given | None) -> tuple[Given, Given] | None:
    if "flow_range" not in duty:
        return None
    raw = duty["flow_range"]
    if not isinstance(raw, list) or len(raw) != 2:
        r.problem(
            "duty.flow_range",
            f'Expected an array of two flows, such as ["0 L/s", "35 L/s"]; got {as_written(raw)}.',
        )
        return None
    ends = []
    for i, value in enumerate(raw):
        try:
            ends.append(Given(parse(value, "flow"), "m^3/s", f"duty.flow_range[{i + 1}]"))
        except UnitProblem as exc:
            r.problem(f"duty.flow_range[{i + 1}]", str(exc))
    if len(ends) != 2:
        return None
    low, high = ends
    if low.value < 0.0 or high.value <= low.value:
        r.problem(
            "duty.flow_range",
            "The first flow must be zero or more and the second greater than the first.",
        )
        return None
    if flow and not low.value <= flow.value <= high.value:
        r.problem("duty.flow_range", "The range must contain duty.flow.")
        return None
    return low, high


def _vessel(r: _Reader, data: dict[str, Any] | None, role: str) -> Vessel | None:
    if data is None:
        return None
    allowed = _DESTINATION_KEYS if role == "destination" else _VESSEL_KEYS | {"intake_diameter"}
    r.known_keys(data, role, allowed)
    level = r.quantity(data, "level", role, "length", required=True)
    low = r.quantity(data, "level_low", role, "length")
    high = r.quantity(data, "level_high", role, "length")
    if level and low and low.value > level.value:
        r.problem(f"{role}.level_low", f"The lowest level must not be above {role}.level.")
    if level and high and high.value < level.value:
        r.problem(f"{role}.level_high", f"The highest level must not be below {role}.level.")
    saturation = data.get("pressure") == "saturation"
    pressure = None
    if not saturation:
        pressure = r.quantity(data, "pressure", role, "pressure") or Given(
            0.0, "Pa", f"{role}.pressure"
        )
    inlet = r.text(data, "inlet", role, "submerged", INLETS) if role == "destination" else ""
    outlet = r.quantity(data, "outlet_elevation", role, "length") if role == "destination" else None
    if inlet == "free" and outlet is None and "outlet_elevation" not in data:
        r.problem(
            f"{role}.outlet_elevation",
            'A free discharge (inlet = "free") needs the outlet centreline elevation; '
            'give outlet_elevation, such as "24 m".',
        )
    if inlet == "submerged" and outlet is not None:
        r.problem(
            f"{role}.outlet_elevation", 'The key outlet_elevation applies only to inlet = "free".'
        )
    intake = r.quantity(data, "intake_diameter", role, "diameter", positive=True)
    if level is None:
        return None
    return Vessel(
        intake_diameter=intake,
        role=role,
        level=level,
        level_low=low,
        level_high=high,
        pressure=pressure,
        saturation=saturation,
        inlet=inlet or "submerged",
        outlet_elevation=outlet,
    )
