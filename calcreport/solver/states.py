"""The states a solution passes between its stages: the liquid, an operating case, the
pump curve points; the flow span of the system curve.
"""

from __future__ import annotations

from dataclasses import dataclass

from calcreport.model.schema import Given, Model, Pipe

CURVE_POINTS = 61
# The profile nodes at the pump's flanges, where the route reads the pump's own pressures.
SUCTION_FLANGE = "pump suction flange"
DISCHARGE_FLANGE = "pump discharge flange"


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


@dataclass(frozen=True)
class CurvePoints:
    """Pump curve points at the operating speed, as trace values."""

    flow: list[Given]
    head: list[Given]
    efficiency: list[Given]
    npsh_required: list[Given]

    def values(self, name: str) -> list[float]:
        return [float(g.value) for g in getattr(self, name)]


def _flow_span(model: Model) -> tuple[float, float]:
    if model.flow_range:
        return model.flow_range[0].value, model.flow_range[1].value
    return 0.0, 1.5 * model.flow.value
