"""The trace: every step of a calculation, its results and checks; JSON in and out.

The trace is the single source of truth of a calculation: the report prints
only what it holds. A :class:`Step` records one evaluation of a registered
equation (:mod:`calcreport.physics.equation`) with the values, units and
sources of its arguments, so that anybody can recompute it; a
:class:`Check` records one design criterion with its value, limit, basis
and governing case. :class:`TraceBuilder` is what the solver writes with:
``builder.step(...)`` evaluates the equation once and prints the same
values it computed with.

JSON format ``calcreport-trace/1``; every quantity is
``{"value": <float>, "unit": "<pint unit string>"}`` in coherent SI.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from typing import Any

from calcreport.model.schema import Given
from calcreport.physics.equation import Equation, Writer, fill, lookup, registered
from calcreport.units import fmt, pretty_unit

__all__ = [
    "DESIGN_CASE",
    "FORMAT",
    "Argument",
    "Check",
    "Step",
    "Trace",
    "TraceBuilder",
    "quantity",
    "substitute",
]

FORMAT = "calcreport-trace/1"
DESIGN_CASE = "C1"  # the design case's id: its steps have plain ids, other cases' "C2.…"
STATUSES = ("fail", "review", "pass")


def quantity(value: float, unit: str) -> dict[str, Any]:
    """The JSON form of a quantity."""
    return {"value": value, "unit": unit}


def bound(given: Given) -> dict[str, Any]:
    """The JSON form of a result that names where it comes from (``from``: the step, input,
    catalog datum, solver value or assumption of ``given``), so recheck can confirm it."""
    return {"value": float(given.value), "unit": given.unit, "from": given.key}


def source_of(result: dict[str, Any]) -> Given:
    """The value a :func:`bound` result came from, as an argument for a later step."""
    return Given(result["value"], result["unit"], result["from"])


def _unit(doc_unit: str) -> str:
    return "" if doc_unit in ("-", "") else doc_unit


@dataclass(frozen=True)
class Argument:
    """One argument of a step: value, SI unit and source (input key, step id or assumption)."""

    name: str
    value: float | tuple[float, ...]
    unit: str
    source: str | tuple[str, ...]

    def to_json(self) -> dict[str, Any]:
        value = list(self.value) if isinstance(self.value, tuple) else self.value
        source = list(self.source) if isinstance(self.source, tuple) else self.source
        return {"value": value, "unit": self.unit, "from": source}


@dataclass(frozen=True)
class Step:
    """One evaluated equation, with everything needed to print and recompute it."""

    id: str
    title: str
    symbol: str
    equation: str
    latex: str
    substituted: str
    value: float
    unit: str
    inputs: tuple[str, ...]
    arguments: tuple[Argument, ...]
    function: str
    reference: str
    case: str = ""

    def __post_init__(self) -> None:
        if not self.id or not self.function:
            raise ValueError("a step needs an id and the equation it evaluates")
        if not math.isfinite(self.value):
            raise ValueError(f"step {self.id}: result is not finite ({self.value})")

    def to_json(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "title": self.title,
            "symbol": self.symbol,
            "equation": self.equation,
            "latex": self.latex,
            "substituted": self.substituted,
            "value": self.value,
            "unit": self.unit,
            "inputs": list(self.inputs),
            "arguments": {a.name: a.to_json() for a in self.arguments},
            "function": self.function,
            "reference": self.reference,
            "case": self.case,
        }


@dataclass(frozen=True)
class Check:
    """One design check: value against limit, with its basis and governing case."""

    id: str
    title: str
    status: str
    value: float | None
    unit: str
    limit: float | None
    comparison: str
    basis: str
    reference: str
    case: str
    message: str = ""
    margin: float | None = None  # how far inside the limit (negative: outside), in unit
    # The step whose result the check compares (its value, or its limit where the value is
    # an input): where a reader follows the number to its origin; "" when none.
    step: str = ""

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ValueError(f"check {self.id}: status {self.status!r} not in {STATUSES}")

    def to_json(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "title": self.title,
            "status": self.status,
            "value": None if self.value is None else quantity(self.value, self.unit),
            "limit": None if self.limit is None else quantity(self.limit, self.unit),
            "comparison": self.comparison,
            "basis": self.basis,
            "reference": self.reference,
            "case": self.case,
            "message": self.message,
            "margin": self.margin,
            "step": self.step,
        }


@dataclass
class Trace:
    """A solved calculation: steps, results, checks and the references they cite."""

    input: dict[str, Any]
    project: dict[str, Any]
    status: dict[str, str]
    steps: list[Step]
    results: dict[str, Any]
    checks: list[Check]
    references: dict[str, str]
    assumptions: list[dict[str, str]] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    given: dict[str, dict[str, Any]] = field(default_factory=dict)
    cases: list[dict[str, str]] = field(default_factory=list)
    software: dict[str, str] = field(default_factory=dict)
    solutions: dict[str, dict[str, Any]] = field(default_factory=dict)

    def step(self, step_id: str) -> Step:
        for step in self.steps:
            if step.id == step_id:
                return step
        raise KeyError(step_id)

    def to_json(self) -> dict[str, Any]:
        order = {s: i for i, s in enumerate(STATUSES)}
        return {
            "format": FORMAT,
            "software": self.software,
            "input": self.input,
            "project": self.project,
            "status": self.status,
            "cases": self.cases,
            "assumptions": self.assumptions,
            "given": self.given,
            "solutions": self.solutions,
            "steps": [s.to_json() for s in self.steps],
            "results": self.results,
            "checks": [c.to_json() for c in sorted(self.checks, key=lambda c: order[c.status])],
            "notes": self.notes,
            "references": self.references,
        }

    def dumps(self) -> str:
        """The trace as JSON text: stable key order, full float precision.

        One top-level key a line and one step or check a line: readable in a
        diff, and written by the C encoder (an indented dump is ten times slower).
        """
        lines = []
        for key, value in self.to_json().items():
            if isinstance(value, list) and value:
                items = ",\n    ".join(_compact(item) for item in value)
                lines.append(f"  {json.dumps(key)}: [\n    {items}\n  ]")
            else:
                lines.append(f"  {json.dumps(key)}: {_compact(value)}")
        return "{\n" + ",\n".join(lines) + "\n}\n"


# One encoder for every item: json.dumps with options builds a new one each call, and
# JSONEncoder.encode a new C encoder; the C encoder is made once (no circular check:
# the trace is a tree). Neither writes NaN or Infinity, which are not JSON: a trace
# holding one is a defect to report, not a file for others to misread.
_ENCODER = json.JSONEncoder(ensure_ascii=False, separators=(", ", ": "), allow_nan=False)
_C_ENCODER = (
    json.encoder.c_make_encoder(
        None,
        _ENCODER.default,
        json.encoder.encode_basestring,
        None,
        ": ",
        ", ",
        False,
        False,
        False,
    )
    if json.encoder.c_make_encoder is not None
    else None
)


def _compact(value: Any) -> str:
    if _C_ENCODER is None or not isinstance(value, dict | list):
        return _ENCODER.encode(value)
    return "".join(_C_ENCODER(value, 0))


class TraceBuilder:
    """Collects steps as the solver evaluates them; every step id is unique."""

    records = True  # an evaluator of the solver (calcreport.solver.states.Evaluator)

    def __init__(self, texts: bool = True) -> None:
        # Without texts the steps are evaluated and their results kept, but not recorded:
        # the calculation of a study's alternative, read for its results and checks only.
        self.texts = texts
        self.steps: list[Step] = []
        self._results: dict[str, Given] = {}  # each step's result, by its id
        self.assumptions: list[dict[str, str]] = []
        self._assumed: dict[tuple[str, float | None], str] = {}  # (text, value) -> its id
        self.given: dict[str, dict[str, Any]] = {}
        self.solutions: dict[str, dict[str, Any]] = {}
        self._by_func = {eq.func: eq for eq in registered().values()}

    def input(self, given: Given) -> Given:
        """Record an input value so the trace holds what each argument came from."""
        self.given[given.key] = quantity(given.value, given.unit)
        return given

    def datum(self, key: str, value: float, unit: str) -> Given:
        """Record a value taken from the catalogue (``catalog.<table>...``) as a given."""
        self.given[key] = quantity(value, unit)
        return Given(value, unit, key)

    def solution(self, key: str, value: float, unit: str, method: str) -> Given:
        """Record a value found by an iterative solver; steps that follow confirm it."""
        self.solutions[key] = {**quantity(value, unit), "method": method}
        return Given(value, unit, key)

    def assume(self, text: str, value: float | None = None, unit: str = "") -> Given:
        """Number an assumption (A1, A2, …) and return its value as a source; the same
        assumption made again (same text and value) keeps its number."""
        known = self._assumed.get((text, value))
        if known is not None:
            return Given(value if value is not None else math.nan, unit, known)
        ident = self._assumed[text, value] = f"A{len(self.assumptions) + 1}"
        entry: dict[str, Any] = {"id": ident, "text": text}
        if value is not None:
            entry["value"] = f"{fmt(value)} {pretty_unit(unit)}".strip()
            entry["quantity"] = quantity(value, unit)
        self.assumptions.append(entry)
        return Given(value if value is not None else math.nan, unit, ident)

    def step(
        self,
        step_id: str,
        title: str,
        func: Any,
        case: str = "",
        **args: Given | list[Given],
    ) -> Given:
        """Evaluate ``func`` on the arguments, record the step and return its result."""
        if step_id in self._results or step_id in self.given:
            raise ValueError(f"step id {step_id!r} is already a step or an input key")
        eq: Equation = self._by_func[func] if not isinstance(func, str) else lookup(func)
        values = {
            name: tuple(a.value for a in arg) if isinstance(arg, list) else arg.value
            for name, arg in args.items()
        }
        if values.keys() != eq.params.keys():
            raise TypeError(f"{eq.name} takes {sorted(eq.params)}, given {sorted(values)}")
        value = float(eq.func(**values))
        unit = _unit(eq.unit)
        result = self._results[step_id] = Given(value, unit, step_id)
        if not self.texts:
            return result
        arguments = [
            Argument(name, values[name], arg[0].unit if arg else "", tuple(a.key for a in arg))
            if isinstance(arg, list)
            else Argument(name, arg.value, arg.unit, arg.key)
            for name, arg in args.items()
        ]
        inputs: list[str] = []
        for a in arguments:
            for source in a.source if isinstance(a.source, tuple) else (a.source,):
                if source not in inputs:
                    inputs.append(source)
        self.steps.append(
            Step(
                id=step_id,
                title=title,
                symbol=eq.symbol,
                equation=eq.text,
                latex=eq.latex,
                substituted=substitute(eq, values, value),
                value=value,
                unit=unit,
                inputs=tuple(inputs),
                arguments=tuple(arguments),
                function=eq.name,
                reference=eq.reference,
                case=case,
            )
        )
        return result

    def recorded(self, step_id: str) -> Given:
        """The result of the step ``step_id``, recorded earlier, as an argument for a later
        step."""
        return self._results[step_id]


def substitute(eq: Equation, values: dict[str, Any], result: float, system: str = "SI") -> str:
    """The equation with the argument values and units written in, and its result, in the
    units of ``system`` as the equation's ``units`` say (:class:`Writer`): the trace keeps
    the SI line; a US report prints the same line in US units."""
    write = Writer("SI" if eq.units == "fixed" else system, display=eq.units == "display")
    shown = write(result, _unit(eq.unit), eq.shown_in)
    if callable(eq.substitute):
        return f"{eq.substitute(values, result, write)} → {eq.symbol} = {shown}"
    return f"{eq.symbol} = {fill(eq.substitute, values, eq.params, write)} = {shown}"
