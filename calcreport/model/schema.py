"""The validated model of an input file: frozen dataclasses of SI floats.

Every quantity is a float in the SI unit of its kind (m, m^3/s, Pa, K,
kg/m^3, Pa*s). ``Given`` pairs a value with the input key it came from, so
the trace can name the key as the source of each argument. :data:`EXIT_NOTE` and
:data:`ENTRANCE_NOTE` read a fitting's note as the exit or entrance of its pipe where it
names no kind.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

__all__ = [
    "Component",
    "Criteria",
    "Envelope",
    "Fitting",
    "Fluid",
    "Given",
    "Model",
    "Operation",
    "Pipe",
    "Project",
    "Pump",
    "PumpCurve",
    "Site",
    "Surge",
    "Vessel",
]


@dataclass(frozen=True)
class Given:
    """A value read from the input: SI float, its SI unit and its key path."""

    value: float
    unit: str
    key: str


@dataclass(frozen=True)
class Project:
    title: str = "Untitled pump-system calculation"
    client: str = ""
    calc_id: str = ""
    revision: str = ""
    date: str = ""
    prepared_by: str = ""
    checked_by: str = ""
    units: str = "SI"
    purpose: str = ""
    exclusions: tuple[str, ...] = ()
    cautions: tuple[str, ...] = ()
    revisions: tuple[dict[str, str], ...] = ()


@dataclass(frozen=True)
class Fluid:
    kind: str
    temperature: Given
    density: Given | None = None
    viscosity: Given | None = None
    vapor_pressure: Given | None = None
    name: str = ""
    mass_fraction: Given | None = None  # glycol solutions
    bulk_modulus: Given | None = None  # surge screening: overrides the formulation's


@dataclass(frozen=True)
class Site:
    elevation: Given | None = None
    station_pressure: Given | None = None


@dataclass(frozen=True)
class Vessel:
    """A liquid surface: the source (suction) or destination vessel."""

    role: str
    level: Given
    level_low: Given | None = None
    level_high: Given | None = None
    pressure: Given | None = None  # gauge; None with saturation=True
    saturation: bool = False
    inlet: str = "submerged"  # destination only: submerged | free
    outlet_elevation: Given | None = None
    intake_diameter: Given | None = None  # source only: inlet (bell) diameter, submergence


# A fitting noted as the exit (or entrance) of its pipe, when it names no kind.
EXIT_NOTE = re.compile(r"\bexit\b|\boutlet\b|discharge into", re.IGNORECASE)
ENTRANCE_NOTE = re.compile(r"\bentrance\b|\bbell ?mouth\b", re.IGNORECASE)


@dataclass(frozen=True)
class Fitting:
    """One fitting item of a pipe: a resistance coefficient or a rated loss."""

    key: str
    count: Given
    K: Given | None = None
    dp: Given | None = None
    at_flow: Given | None = None
    kind: str = ""
    note: str = ""
    other_diameter: Given | None = None  # expander / reducer: the diameter on the other side
    angle: Given | None = None  # expander / reducer: included cone angle (None: sudden)
    at: str = ""  # where its loss is taken: "start", "end", "along" (at distance); "": default
    distance: Given | None = None  # with at = "along": distance from the pipe's start

    @property
    def label(self) -> str:
        return self.note or self.kind or ("rated loss" if self.dp else "fitting")


@dataclass(frozen=True)
class Pipe:
    key: str
    id: str
    side: str
    length: Given
    inner_diameter: Given
    roughness: Given
    fittings: tuple[Fitting, ...] = ()
    elevation_start: Given | None = None
    elevation_end: Given | None = None
    sources: dict[str, str] = field(default_factory=dict)  # catalog values: their source
    hazen_williams_c: Given | None = None
    # Pressure safety and surge screening (None: not given and not in the catalog)
    wall_thickness: Given | None = None
    elastic_modulus: Given | None = None
    poisson_ratio: Given | None = None
    pressure_rating: Given | None = None  # gauge, at the design temperature
    restraint: str = ""  # anchored | upstream_anchor | expansion_joints; "" not given

    @property
    def line(self) -> str:
        """The side of the pump the pipe is on: "suction" or "discharge"."""
        return "suction" if self.side.startswith("suction") else "discharge"

    @property
    def branch(self) -> bool:
        """A pump's own branch: it carries one pump's flow, not the header's."""
        return self.side.endswith("_branch")


@dataclass(frozen=True)
class Component:
    """An item on a pipe with its own pressure rating (a valve, a meter, a flange class)."""

    key: str
    id: str
    at: str  # pipe id
    pressure_rating: Given
    note: str = ""


@dataclass(frozen=True)
class Surge:
    """The event screened for surge: a pump trip or a valve closure."""

    event: str = "pump_trip"  # pump_trip | valve_closure
    closure_time: Given | None = None
    # How long a pump trip takes to stop the flow (pump and motor inertia); None: at once.
    pump_stop_time: Given | None = None


@dataclass(frozen=True)
class PumpCurve:
    """Vendor curve points at the curve's own speed (None: the operating speed)."""

    speed: Given | None
    flow: tuple[Given, ...]
    head: tuple[Given, ...]
    efficiency: tuple[Given, ...] = ()
    npsh_required: tuple[Given, ...] = ()
    power: tuple[Given, ...] = ()  # shaft power points, as vendors print them (SG 1.0)


@dataclass(frozen=True)
class Pump:
    elevation: Given
    efficiency: Given | None = None
    speed: Given | None = None
    curve: PumpCurve | None = None
    preferred_range: tuple[Given, Given] | None = None
    allowable_range: tuple[Given, Given] | None = None
    min_continuous_flow: Given | None = None
    provenance: dict[str, str] = field(default_factory=dict)
    count: Given = field(default_factory=lambda: Given(1.0, "", "pump.count"))
    standby: Given = field(default_factory=lambda: Given(0.0, "", "pump.standby"))
    arrangement: str = "parallel"
    speed_range: tuple[Given, Given] | None = None
    efficiency_basis: str = "pump"  # pump | overall (wire-to-water)
    pressure_rating: Given | None = None  # casing allowable working pressure, gauge
    stages: Given | None = None  # stages of a multistage pump (viscous correction)
    impeller: str = "single_suction"  # single_suction | double_suction (viscous correction)
    trim: Given | None = None  # impeller diameter over the curve's (affinity for diameter)


@dataclass(frozen=True)
class Candidate:
    """A pump offered for the duty: the [pump] table with the candidate's own keys, its
    initial cost (its price, when given) and its annual maintenance cost (project
    currency)."""

    id: str
    title: str
    pump: Pump
    capital_cost: Given | None = None
    annual_maintenance: Given | None = None
    drive_efficiency: Given | None = None  # its own variable-speed drive (else [drive]'s)


@dataclass(frozen=True)
class PipeSize:
    """One size a group of pipes may take: its bore (and wall), its cost per length."""

    label: str  # as a reader names it: "NPS 6, 40" or "202.7 mm"
    inner_diameter: Given
    cost_per_length: Given  # project currency per metre
    wall_thickness: Given | None = None
    sources: dict[str, str] = field(default_factory=dict)


@dataclass(frozen=True)
class SizeStudy:
    """Sizes for pipes that change together (a main), each priced per length."""

    pipes: tuple[str, ...]
    sizes: tuple[PipeSize, ...]


@dataclass(frozen=True)
class Sensitivity:
    """The stated uncertainties whose effect on the design's results is shown: an aged
    roughness, a liquid temperature range, the level ranges, the pump's acceptance grade."""

    roughness: Given | None = None  # every pipe at least this rough, on the high side
    temperature: tuple[Given, Given] | None = None  # coldest, warmest
    levels: bool = False  # the static head from lowest to highest, by the level ranges
    pump_grade: str = ""  # an ISO 9906 grade: curve head and efficiency within it
    fitting_k: Given | None = None  # every fitting's K low and high by this fraction


@dataclass(frozen=True)
class Study:
    """Candidate pumps to rank by life-cycle cost (``selected``, a candidate id, or "" for
    the best that passes, gets the full calculation), and pipe sizes to price against the
    energy they cost over the life."""

    candidates: tuple[Candidate, ...]
    selected: str = ""
    pipe_sizes: tuple[SizeStudy, ...] = ()
    sensitivity: Sensitivity | None = None


@dataclass(frozen=True)
class Operation:
    hours_per_year: Given | None = None
    energy_price: Given | None = None
    currency: str = ""
    annual_volume: Given | None = None  # fill duty: the hours follow from the flow
    demand_charge: Given | None = None  # per kW of electrical demand per month
    life_years: Given | None = None
    discount_rate: Given | None = None
    control: str = "on_off"  # on_off | throttled | variable_speed
    profile: tuple[tuple[Given, Given], ...] = ()  # (flow, hours per year) points


@dataclass(frozen=True)
class Criteria:
    """Design limits given in ``[criteria]``; absent keys take the defaults."""

    given: dict[str, Given] = field(default_factory=dict)


@dataclass(frozen=True)
class Envelope:
    """Ranges the operating cases are built from (empty: none given)."""

    temperatures: tuple[Given, ...] = ()
    flows: tuple[Given, ...] = ()
    roughness: Given | None = None  # aged-pipe case: absolute roughness of aged pipe
    strainer_dirty_dp: Given | None = None  # dirty-strainer case: its loss at the duty flow


@dataclass(frozen=True)
class Model:
    path: str
    sha256: str
    text: str
    project: Project
    fluid: Fluid
    flow: Given
    flow_range: tuple[Given, Given] | None
    site: Site
    source: Vessel
    destination: Vessel
    pump: Pump
    motor_efficiency: Given | None
    drive_efficiency: Given | None
    operation: Operation
    pipes: tuple[Pipe, ...]
    criteria: Criteria
    envelope: Envelope = field(default_factory=Envelope)
    friction_method: str = "darcy_weisbach"
    fittings_method: str = "two_k"  # two_k (Hooper) | three_k (Darby), for named fittings
    files: tuple[dict[str, str], ...] = ()  # other files read (curve CSV): path, SHA-256
    # The bytes read, for the report to carry: the input's and each of ``files``' in order.
    raw: bytes = field(default=b"", repr=False, compare=False)
    file_bytes: tuple[bytes, ...] = field(default=(), repr=False, compare=False)
    motor_class: str = ""  # IE2 | IE3: motor efficiency from the class table at its rating
    motor_derating: Given | None = None  # site derating factor of the motor's output
    motor_ambient: Given | None = None  # ambient (coolant) temperature at the motor
    components: tuple[Component, ...] = ()
    surge: Surge | None = None  # None: no surge screening asked for
    study: Study | None = None  # None: one design, checked

    @property
    def suction_pipes(self) -> tuple[Pipe, ...]:
        return tuple(p for p in self.pipes if p.line == "suction")
