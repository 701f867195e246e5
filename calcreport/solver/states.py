"""The states a solution passes between its stages: the evaluator that runs the equations,
the liquid, the surfaces' pressures, an operating case, the pump curve points, the notes to
the reader; the flow span of the system curve.
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass
from typing import Any, NamedTuple, Protocol, TypedDict

from calcreport.model.schema import Fitting, Given, Model, Pipe
from calcreport.trace import DESIGN_CASE

CURVE_POINTS = 61
# The profile nodes at the pump's flanges, where the route reads the pump's own pressures.
SUCTION_FLANGE = "pump suction flange"
DISCHARGE_FLANGE = "pump discharge flange"


class Evaluator(Protocol):
    """What runs the equations of a stage: the trace builder, which records each step at one
    flow, or the sweep, which evaluates the same equations on an array of flows."""

    records: bool  # each step is kept in the trace (the scalar run), not only evaluated

    def step(self, step_id: str, title: str, func: Any, case: str = "", **args: Any) -> Given:
        """The value of ``func`` at ``args``, as step ``step_id``."""
        ...

    def datum(self, key: str, value: float, unit: str) -> Given:
        """A value from the catalog."""
        ...

    def assume(self, text: str, value: float, unit: str) -> Given:
        """A value the solution assumes, stated in ``text``."""
        ...


class Notes:
    """The solution's notes to the reader, in the order first made, each once."""

    def __init__(self) -> None:
        self._texts: dict[str, None] = {}

    def append(self, text: str) -> None:
        self._texts.setdefault(text)

    def __iter__(self) -> Iterator[str]:
        return iter(self._texts)

    def __len__(self) -> int:
        return len(self._texts)


class Surfaces(NamedTuple):
    """The pressures that bound a case: barometric, gauge on the source and the destination
    surfaces, and the outlet velocity head (None for a free discharge, whose velocity head
    follows the flow)."""

    barometric: Given
    source: Given
    destination: Given
    exit_head: Given | None


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
        return step if self.id == DESIGN_CASE else f"{self.id}.{step}"


@dataclass(frozen=True)
class FittingLoss:
    """One fitting item of a pipe in one state: its coefficient, or its rated head loss."""

    fitting: Fitting
    K: Given | None  # resistance coefficient of one item (None for a rated loss)
    head: Given | None  # head loss of a rated item (None for a coefficient)

    def value(self, hv: float) -> float:
        """Its head loss at velocity head ``hv`` [m]."""
        if self.head is not None:
            return float(self.head.value)
        assert self.K is not None
        return float(self.K.value) * float(self.fitting.count.value) * hv


class PipeHydraulics(TypedDict, total=False):
    """One pipe at a case's flow, each value a trace value (a step's result)."""

    velocity: Given
    reynolds: Given
    relative_roughness: Given
    friction_factor: Given
    friction_factor_explicit: Given  # the explicit cross-check (turbulent, recorded runs)
    friction_loss: Given  # by the project's method
    friction_loss_darcy_weisbach: Given  # the cross-check where Hazen-Williams governs
    friction_loss_hazen_williams: Given
    check_valve_min_velocity: Given
    k_total: Given
    fitting_loss: Given
    equipment_loss: Given
    minor_loss: Given  # fittings and equipment


class CaseHydraulics(TypedDict, total=False):
    """A case's hydraulics: each pipe's, the fitting items by pipe, the system heads, TDH
    and NPSH available."""

    pipes: dict[str, PipeHydraulics]
    fittings: dict[str, list[FittingLoss]]
    branch_flow: Given  # each pump's own branch flow (the line's flow without branches)
    static_head: Given
    pressure_head: Given
    friction_loss: Given
    minor_loss: Given
    outlet_velocity_head: Given
    tdh: Given
    suction_loss: Given
    npsh_available: Given


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
