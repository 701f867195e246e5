"""Recheck a trace: recompute every recorded step from its recorded arguments.

:func:`recheck` takes a trace in its JSON form (``calcreport-trace/1``) and
returns a :class:`RecheckReport`; :func:`read_trace` reads one from a file.
Nothing here prints: :func:`render_text` gives the readable form and
:meth:`RecheckReport.to_json` the structured one, and the command line
(``calcreport recheck``) shows them.

For every step the recheck confirms that

- the registered equation the step names, evaluated on the step's recorded
  argument values, gives the step's recorded value (to a relative
  tolerance, with an absolute floor for values near zero);
- every argument value equals the recorded value of the source it names: an
  earlier step, an input or catalogue value (``given``), a solver value
  (``solutions``), or a numbered assumption (whose printed value it must
  agree with to the printed digits);
- the units of the step and of each argument are those the equation's
  docstring declares (``-`` there is ``""`` in the trace);
- the step's ``inputs`` list is the sources of its arguments;
- when the trace was written by this version of calcreport, the printed
  symbol, equation, reference and substituted line are what the equation
  prints for the recorded values.

Solver values are not recomputed; the steps that use them confirm them
(``pump.head_balance`` ≈ 0), and the report gives the largest balance.
"""

from __future__ import annotations

import json
import math
import re
import warnings
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from calcreport import __version__
from calcreport.tracefile import read_trace, validate

__all__ = [
    "ABSOLUTE_FLOOR",
    "DEFAULT_TOLERANCE",
    "REPORT_FORMAT",
    "SCOPE",
    "Finding",
    "RecheckReport",
    "StepResult",
    "recheck",
    "recheck_file",
    "render_text",
]

REPORT_FORMAT = "calcreport-recheck/1"
DEFAULT_TOLERANCE = 1e-9
ABSOLUTE_FLOOR = 1e-12

SCOPE = (
    "A passing recheck proves that every recorded step is arithmetically consistent with "
    "its recorded inputs (the named equation, evaluated on the recorded arguments, gives the "
    "recorded result, in the units the equation declares) and that no value was altered "
    "after the calculation (every argument is the recorded value of the step, input, "
    "solution or assumption it names; every result holds the value of the source it names, "
    "each state's results their own steps; no check's status contradicts its value, limit "
    "and comparison; the status is the one its checks give). It does not prove that the "
    "method, the inputs or the model are right: for that, use the independent checks the "
    "report prints, such as the explicit friction factor beside the Colebrook value, and "
    "the substituted lines, which can be recomputed by hand."
)

_STEP_KEYS = ("value", "unit", "arguments", "function")
_PRINTED = ("symbol", "equation", "latex", "reference")
_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)")


# ---- the report ------------------------------------------------------------------------


@dataclass(frozen=True)
class Finding:
    """One thing about a step that does not hold.

    ``what`` names the item (``value``, ``unit``, ``argument Re``,
    ``argument Re unit``, ``function``, ``inputs``, ``substituted``, ...);
    ``recorded`` is what the trace holds, ``expected`` what the recheck
    finds it should be (``None`` when there is nothing to compare with);
    ``reason`` is a full sentence.
    """

    what: str
    recorded: Any
    expected: Any
    reason: str

    def to_json(self) -> dict[str, Any]:
        return {
            "what": self.what,
            "recorded": self.recorded,
            "expected": self.expected,
            "reason": self.reason,
        }


@dataclass(frozen=True)
class StepResult:
    """The recheck of one step: confirmed when it has no finding."""

    id: str
    function: str
    recorded: Any
    recomputed: float | None
    unit: Any
    findings: tuple[Finding, ...] = ()

    @property
    def status(self) -> str:
        return "mismatch" if self.findings else "confirmed"

    def to_json(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "function": self.function,
            "status": self.status,
            "recorded": self.recorded,
            "recomputed": self.recomputed,
            "unit": self.unit,
            "findings": [f.to_json() for f in self.findings],
        }


@dataclass(frozen=True)
class RecheckReport:
    """The recheck of a whole trace."""

    path: str
    tolerance: float
    trace: dict[str, Any]
    steps: tuple[StepResult, ...]
    solutions: tuple[dict[str, Any], ...] = ()
    head_balance: dict[str, Any] | None = None
    untraced_results: tuple[str, ...] = ()
    untraced_checks: tuple[str, ...] = ()
    printed_compared: bool = True
    notes: tuple[str, ...] = field(default_factory=tuple)
    # Results that do not hold the value of the source they name, checks whose status their
    # own value, limit and comparison contradict, and a status the checks do not give.
    bound: tuple[Finding, ...] = ()

    @property
    def mismatches(self) -> tuple[StepResult, ...]:
        return tuple(s for s in self.steps if s.findings)

    @property
    def ok(self) -> bool:
        return not self.mismatches and not self.bound

    @property
    def verdict(self) -> str:
        total = len(self.steps)
        bad = self.mismatches
        if bad:
            verb = "does" if len(bad) == 1 else "do"
            return f"recheck: {len(bad)} of {total} steps {verb} not match (first: {bad[0].id})"
        if self.bound:
            count = len(self.bound)
            noun = "result, check or status" if count == 1 else "results, checks or status"
            return (
                f"recheck: {total} of {total} steps confirmed, but {count} {noun} do not "
                f"hold (first: {self.bound[0].what})"
            )
        return f"recheck: {total} of {total} steps confirmed, with the results, checks and status"

    def to_json(self) -> dict[str, Any]:
        bad = self.mismatches
        return {
            "format": REPORT_FORMAT,
            "trace": self.trace,
            "tolerance": {"relative": self.tolerance, "absolute": ABSOLUTE_FLOOR},
            "scope": SCOPE,
            "ok": self.ok,
            "verdict": self.verdict,
            "summary": {
                "steps": len(self.steps),
                "confirmed": len(self.steps) - len(bad),
                "mismatched": len(bad),
                "first_mismatch": bad[0].id if bad else None,
            },
            "solutions": list(self.solutions),
            "head_balance": self.head_balance,
            "printed_text_compared": self.printed_compared,
            "not_covered": {
                "results": list(self.untraced_results),
                "checks": list(self.untraced_checks),
            },
            "not_holding": [f.to_json() for f in self.bound],
            "notes": list(self.notes),
            "steps": [s.to_json() for s in self.steps],
        }


# ---- the recheck -----------------------------------------------------------------------


def recheck_file(path: str | Path, tolerance: float = DEFAULT_TOLERANCE) -> RecheckReport:
    """Read the trace at ``path`` and recheck it."""
    return recheck(read_trace(path), tolerance, path=str(path))


def recheck(
    trace: dict[str, Any], tolerance: float = DEFAULT_TOLERANCE, path: str = "trace"
) -> RecheckReport:
    """Recheck every step of ``trace`` (its JSON form); see the module docstring."""
    if not (isinstance(tolerance, float | int) and math.isfinite(tolerance) and tolerance >= 0):
        raise ValueError(f"the tolerance must be a finite number ≥ 0, not {tolerance!r}")
    validate(trace, path)
    from calcreport.physics.equation import registered

    registry = registered()
    steps: list[dict[str, Any]] = trace["steps"]
    given = _table(trace.get("given", {}))
    solutions = _table(trace.get("solutions", {}))
    assumptions = {
        a["id"]: a for a in trace.get("assumptions", []) if isinstance(a, dict) and "id" in a
    }
    position = {s["id"]: i for i, s in enumerate(steps)}
    software = trace.get("software") or {}
    printed = (
        isinstance(software, dict)
        and software.get("name") == "calcreport"
        and software.get("version") == __version__
    )
    substitute = None
    if printed:
        from calcreport.trace import substitute

    context = _Context(
        registry=registry,
        steps=steps,
        position=position,
        given=given,
        solutions=solutions,
        assumptions=assumptions,
        tolerance=float(tolerance),
        substitute=substitute,
    )
    sources = [_sources(step) for step in steps]
    results = []
    with warnings.catch_warnings():
        # A numerical warning while recomputing (overflow, division by zero) is a
        # finding of that step, not a message on the console.
        warnings.simplefilter("error")
        for index, step in enumerate(steps):
            results.append(_recheck_step(step, index, sources[index], context))

    used_by: dict[str, list[str]] = {key: [] for key in solutions}
    for step, named in zip(steps, sources, strict=True):
        for source in named:
            if source in used_by and step["id"] not in used_by[source]:
                used_by[source].append(step["id"])
    solution_rows = []
    notes = []
    for key, entry in solutions.items():
        solution_rows.append(
            {
                "key": key,
                "value": entry.get("value"),
                "unit": entry.get("unit"),
                "method": entry.get("method", ""),
                "used_by": used_by[key],
            }
        )
        if not used_by[key]:
            notes.append(
                f"The solver value {key} is used by no step, so nothing in the trace confirms it."
            )
    if not printed:
        writer = "unknown software"
        if isinstance(software, dict) and software.get("name"):
            writer = f"{software['name']} {software.get('version', '')}".strip()
        notes.append(
            f"The printed equations and substituted lines were not compared: the trace was "
            f"written by {writer} and this is calcreport {__version__}."
        )

    known = _known_values(steps, given, solutions)
    untraced = tuple(_untraced(trace.get("results", {}), "results", known))
    untraced_checks = tuple(
        f"{c.get('id')} ({c.get('case')})"
        for c in trace.get("checks", [])
        if isinstance(c, dict)
        and isinstance(c.get("value"), dict)
        and _is_number(c["value"].get("value"))
        and c["value"]["value"] not in known
    )
    return RecheckReport(
        path=path,
        tolerance=float(tolerance),
        trace=_identity(trace, path),
        steps=tuple(results),
        solutions=tuple(solution_rows),
        head_balance=_head_balance(steps),
        untraced_results=untraced,
        untraced_checks=untraced_checks,
        printed_compared=printed,
        notes=tuple(notes),
        bound=tuple(
            _bound_results(trace.get("results", {}), "results", context)
            + _bound_checks(trace.get("checks", []))
            + _bound_status(trace)
        ),
    )


# ---- results, checks and status bound to the steps ---------------------------------------

# Where each state's contract results come from: its own step of that name.
_STATE_SOURCES = {
    "total_dynamic_head": "system.total_dynamic_head",
    "static_head": "system.static_head",
    "pressure_head": "system.pressure_head",
    "npsh_available": "npsh.available",
    "hydraulic_power": "power.hydraulic",
    "shaft_power": "power.shaft",
    "electrical_power": "power.electrical",
}
_PIPE_SOURCES = ("velocity", "reynolds", "friction_factor", "friction_loss", "k_total")


def _recorded(source: str, ctx: _Context) -> float | None:
    if source in ctx.position:
        return ctx.steps[ctx.position[source]].get("value")
    for table in (ctx.given, ctx.solutions):
        if source in table:
            return table[source].get("value")
    if source in ctx.assumptions:
        return ctx.assumptions[source].get("quantity", {}).get("value")
    return None


def _bound_results(node: Any, path: str, ctx: _Context) -> list[Finding]:
    """Every result that names its source holds that source's recorded value, and each
    state's contract results name the state's own step."""
    out: list[Finding] = []
    if isinstance(node, dict):
        if "value" in node and isinstance(node.get("from"), str):
            source = node["from"]
            expected = _recorded(source, ctx)
            if expected is None:
                out.append(
                    Finding(
                        path,
                        node["value"],
                        None,
                        f"It names {source!r}, which the trace does not record.",
                    )
                )
            elif not (_is_number(node["value"]) and _close(node["value"], expected,
                                                           ctx.tolerance)):  # fmt: skip
                out.append(
                    Finding(
                        path,
                        node["value"],
                        expected,
                        f"It is {node['value']!r}, but {source} is recorded as {expected!r}.",
                    )
                )
            return out
        out += _state_sources(node, path)
        for key, value in node.items():
            out += _bound_results(value, f"{path}.{key}", ctx)
    elif isinstance(node, list):
        for i, value in enumerate(node):
            if isinstance(value, dict):
                out += _bound_results(value, f"{path}[{i}]", ctx)
    return out


def _state_sources(node: dict[str, Any], path: str) -> list[Finding]:
    """A state's results (the design case's at the top, each case's and each profile
    point's) must come from the steps of that state, not from another step."""
    parts = path.split(".")
    if path == "results":
        prefix = ""
    elif len(parts) == 3 and parts[1] in ("cases", "profile_states"):
        prefix = "" if parts[2] == "C1" else f"{parts[2]}."
    else:
        return []
    out = []
    wanted = {key: prefix + step for key, step in _STATE_SOURCES.items()}
    for ident in node.get("pipes", {}) if isinstance(node.get("pipes"), dict) else {}:
        for key in _PIPE_SOURCES:
            wanted[f"pipes.{ident}.{key}"] = f"{prefix}pipe.{ident}.{key}"
    for key, step in wanted.items():
        entry: Any = node
        for part in key.split("."):
            entry = entry.get(part) if isinstance(entry, dict) else None
        if isinstance(entry, dict) and "from" in entry and entry["from"] != step:
            out.append(
                Finding(
                    f"{path}.{key}",
                    entry["from"],
                    step,
                    f"It names {entry['from']!r}; this result is the step {step}.",
                )
            )
    return out


_RANGE = re.compile(r"^\s*([-+\d.eE]+)\s*[–-]\s*([-+\d.eE]+)")


def _holds(value: float, limit: float | None, comparison: str) -> bool | None:
    """Whether ``value`` meets ``limit`` by ``comparison`` (None: not a comparison of numbers)."""
    if comparison.startswith("not in "):
        found = _RANGE.match(comparison[7:])
        return None if not found else not float(found[1]) <= value <= float(found[2])
    found = _RANGE.match(comparison)
    if found and "×" in comparison:
        return float(found[1]) <= value <= float(found[2])
    if limit is None:
        return None
    compare = {"<=": value <= limit, ">=": value >= limit, "<": value < limit,
               ">": value > limit}  # fmt: skip
    return compare.get(comparison.strip())


def _bound_checks(checks: Any) -> list[Finding]:
    """A check passes only when its value meets its limit, and fails only when it does not."""
    out = []
    for c in checks if isinstance(checks, list) else []:
        if not isinstance(c, dict) or not isinstance(c.get("value"), dict):
            continue
        value = c["value"].get("value")
        limit = c["limit"].get("value") if isinstance(c.get("limit"), dict) else None
        if not _is_number(value) or not (limit is None or _is_number(limit)):
            continue
        holds = _holds(value, limit, str(c.get("comparison", "")))
        name = f"check {c.get('id')} ({c.get('case')})"
        if holds is False and c.get("status") == "pass":
            out.append(Finding(name, "pass", "review or fail",
                               f"Its value {value!r} does not meet {c.get('comparison')} "
                               f"{limit!r}, yet it is marked pass."))  # fmt: skip
        elif holds is True and c.get("status") == "fail":
            out.append(Finding(name, "fail", "pass or review",
                               f"Its value {value!r} meets {c.get('comparison')} {limit!r}, "
                               "yet it is marked fail."))  # fmt: skip
    return out


def _bound_status(trace: dict[str, Any]) -> list[Finding]:
    """The status the checks give: preliminary without a pump curve, does not comply with a
    failing check, not feasible without the design operating point, else for checking."""
    status = trace.get("status")
    if not isinstance(status, dict):
        return []
    given: dict[str, Any] = trace["given"] if isinstance(trace.get("given"), dict) else {}
    results: dict[str, Any] = trace["results"] if isinstance(trace.get("results"), dict) else {}
    checks: list[Any] = trace["checks"] if isinstance(trace.get("checks"), list) else []
    curve = any(str(k).startswith("pump.curve.flow[") for k in given)
    fails = any(isinstance(c, dict) and c.get("status") == "fail" for c in checks)
    if curve and "operating_point" not in results:
        expected = "not feasible"
    elif not curve:
        expected = "preliminary"
    else:
        expected = "does not comply" if fails else "for checking"
    if status.get("value") != expected:
        return [Finding("status", status.get("value"), expected,
                        f"The checks give the status {expected!r}.")]  # fmt: skip
    return []


@dataclass(frozen=True)
class _Context:
    registry: dict[str, Any]
    steps: list[dict[str, Any]]
    position: dict[str, int]
    given: dict[str, dict[str, Any]]
    solutions: dict[str, dict[str, Any]]
    assumptions: dict[str, dict[str, Any]]
    tolerance: float
    substitute: Any


def _table(table: Any) -> dict[str, dict[str, Any]]:
    return {k: v if isinstance(v, dict) else {} for k, v in table.items()}


def _identity(trace: dict[str, Any], path: str) -> dict[str, Any]:
    project = trace.get("project") if isinstance(trace.get("project"), dict) else {}
    source = trace.get("input") if isinstance(trace.get("input"), dict) else {}
    return {
        "path": path,
        "software": trace.get("software"),
        "input": {"path": source.get("path"), "sha256": source.get("sha256")},
        "project": {k: project.get(k) for k in ("title", "calc_id", "revision", "date")},
    }


def _is_number(value: Any) -> bool:
    kind = type(value)
    return kind is float or kind is int or (kind is not bool and isinstance(value, int | float))


def _finite(value: Any) -> bool:
    return _is_number(value) and math.isfinite(value)


def _close(a: float, b: float, rel: float) -> bool:
    return a == b or abs(a - b) <= max(rel * max(abs(a), abs(b)), ABSOLUTE_FLOOR)


def _as_list(value: Any) -> list[Any]:
    return value if isinstance(value, list) else [value]


def _sources(step: dict[str, Any]) -> list[str]:
    out: list[str] = []
    arguments = step.get("arguments")
    if not isinstance(arguments, dict):
        return out
    for arg in arguments.values():
        if isinstance(arg, dict):
            for source in _as_list(arg.get("from")):
                if isinstance(source, str) and source not in out:
                    out.append(source)
    return out


def _doc_unit(unit: str) -> str:
    return "" if unit in ("-", "") else unit


def _recheck_step(
    step: dict[str, Any], index: int, sources: list[str], ctx: _Context
) -> StepResult:
    ident = step["id"]
    findings: list[Finding] = []
    function = step.get("function")
    recorded = step.get("value")
    unit = step.get("unit")

    missing = [k for k in _STEP_KEYS if k not in step]
    if missing:
        keys = ", ".join(missing)
        findings.append(
            Finding("step", None, None, f"The step lacks {keys}, so it cannot be recomputed.")
        )
        return StepResult(ident, str(function or ""), recorded, None, unit, tuple(findings))

    if not _finite(recorded):
        findings.append(
            Finding("value", recorded, None, "The recorded value is not a finite number.")
        )
    if ident in ctx.given or ident in ctx.solutions or ident in ctx.assumptions:
        findings.append(
            Finding(
                "id",
                ident,
                None,
                "The step id is also an input, solution or assumption key, so a source naming "
                "it is ambiguous.",
            )
        )

    eq = ctx.registry.get(function) if isinstance(function, str) else None
    if eq is None:
        findings.append(
            Finding(
                "function",
                function,
                None,
                f"No registered equation is named {function!r}, so the step cannot be recomputed.",
            )
        )

    arguments = step["arguments"]
    if not isinstance(arguments, dict):
        findings.append(Finding("arguments", None, None, "The arguments are not a JSON object."))
        return StepResult(ident, str(function), recorded, None, unit, tuple(findings))

    values: dict[str, Any] = {}
    for name, arg in arguments.items():
        findings.extend(_check_argument(name, arg, index, ctx, values))

    recomputed: float | None = None
    if eq is not None:
        expected_unit = _doc_unit(eq.unit)
        if unit != expected_unit:
            findings.append(
                Finding(
                    "unit",
                    unit,
                    expected_unit,
                    f"The step's unit is {unit!r}; {eq.name} gives {expected_unit!r}.",
                )
            )
        for name, arg in arguments.items():
            if name in eq.params and isinstance(arg, dict):
                declared = _doc_unit(eq.params[name])
                if arg.get("unit") != declared:
                    findings.append(
                        Finding(
                            f"argument {name} unit",
                            arg.get("unit"),
                            declared,
                            f"The argument {name} is recorded in {arg.get('unit')!r}; "
                            f"{eq.name} takes it in {declared!r}.",
                        )
                    )
        if set(arguments) != set(eq.params):
            findings.append(
                Finding(
                    "arguments",
                    sorted(arguments),
                    sorted(eq.params),
                    f"{eq.name} takes the arguments {', '.join(sorted(eq.params))}; the step "
                    f"gives {', '.join(sorted(arguments)) or 'none'}.",
                )
            )
        elif len(values) == len(arguments):
            recomputed, finding = _recompute(eq, values)
            if finding is not None:
                findings.append(finding)
            elif _finite(recorded) and not _close(recorded, recomputed, ctx.tolerance):
                findings.append(
                    Finding(
                        "value",
                        recorded,
                        recomputed,
                        f"{eq.name} on the recorded arguments gives {recomputed!r}, not the "
                        f"recorded {recorded!r}.",
                    )
                )
            if ctx.substitute is not None and not findings:
                findings.extend(_check_printed(step, eq, values, recorded, ctx))

    inputs = step.get("inputs")
    if inputs != sources:
        findings.append(
            Finding(
                "inputs",
                inputs,
                sources,
                "The step's inputs list is not the list of the sources its arguments name.",
            )
        )
    return StepResult(ident, str(function), recorded, recomputed, unit, tuple(findings))


def _check_argument(
    name: str, arg: Any, index: int, ctx: _Context, values: dict[str, Any]
) -> list[Finding]:
    """Check one argument against the sources it names; fill ``values`` when usable."""
    what = f"argument {name}"
    if not isinstance(arg, dict) or "value" not in arg or "from" not in arg:
        return [Finding(what, None, None, f"The argument {name} lacks its value or source.")]
    value, source = arg["value"], arg["from"]
    if isinstance(value, list) != isinstance(source, list) or (
        isinstance(value, list) and len(value) != len(source)
    ):
        return [
            Finding(
                what,
                value,
                None,
                f"The argument {name} does not pair its values with its sources "
                "(a list of values needs one source for each).",
            )
        ]
    elements = _as_list(value)
    bad = [v for v in elements if not _finite(v)]
    if bad:
        return [
            Finding(what, value, None, f"The argument {name} holds a value that is not finite.")
        ]
    findings = []
    for i, (v, src) in enumerate(zip(elements, _as_list(source), strict=True)):
        label = f"{what}[{i + 1}]" if isinstance(value, list) else what
        finding = _check_source(label, name, v, src, index, ctx)
        if finding is not None:
            findings.append(finding)
    values[name] = value
    return findings


def _check_source(
    what: str, name: str, value: float, source: Any, index: int, ctx: _Context
) -> Finding | None:
    if not isinstance(source, str):
        return Finding(what, value, None, f"The argument {name} names no source.")
    if source in ctx.position:
        at = ctx.position[source]
        if at >= index:
            return Finding(
                what,
                value,
                None,
                f"The argument {name} names the step {source}, which does not come before it.",
            )
        expected = ctx.steps[at].get("value")
        kind = f"the step {source}"
    elif source in ctx.given:
        expected = ctx.given[source].get("value")
        kind = f"the input {source}"
    elif source in ctx.solutions:
        expected = ctx.solutions[source].get("value")
        kind = f"the solver value {source}"
    elif source in ctx.assumptions:
        return _check_assumption(what, name, value, ctx.assumptions[source])
    else:
        return Finding(
            what,
            value,
            None,
            f"The argument {name} names {source!r}, which is no step, input, solution or "
            "assumption of this trace.",
        )
    if not _finite(expected):
        return Finding(
            what,
            value,
            expected,
            f"The argument {name} comes from {kind}, which has no finite recorded value.",
        )
    if not _close(value, expected, ctx.tolerance):
        return Finding(
            what,
            value,
            expected,
            f"The argument {name} is {value!r}, but {kind} is recorded as {expected!r}.",
        )
    return None


def _check_assumption(
    what: str, name: str, value: float, assumption: dict[str, Any]
) -> Finding | None:
    """An assumption's value must be the argument: exactly where the trace records the
    number (``quantity``), and to the printed digits (``"0 m"``, ``"1.0000"``)."""
    recorded = assumption.get("quantity")
    if (
        isinstance(recorded, dict)
        and isinstance(recorded.get("value"), int | float)
        and not _close(value, float(recorded["value"]), 0.0)
    ):
        return Finding(
            what,
            value,
            float(recorded["value"]),
            f"The argument {name} is {value!r}, but assumption {assumption.get('id')} "
            f"records {recorded['value']!r}.",
        )
    text = assumption.get("value")
    if not isinstance(text, str):
        return None
    match = _NUMBER.match(text)
    if match is None:
        return None
    number = match.group(1)
    printed = float(number)
    mantissa = number.lower().split("e")[0]
    exponent = int(number.lower().split("e")[1]) if "e" in number.lower() else 0
    decimals = len(mantissa.split(".")[1]) if "." in mantissa else 0
    half = 0.5 * 10.0 ** (exponent - decimals)
    if abs(value - printed) <= half * (1 + 1e-9) + ABSOLUTE_FLOOR:
        return None
    return Finding(
        what,
        value,
        printed,
        f"The argument {name} is {value!r}, but assumption {assumption.get('id')} states {text!r}.",
    )


def _recompute(eq: Any, values: dict[str, Any]) -> tuple[float | None, Finding | None]:
    try:
        result = float(eq.func(**values))
    except Exception as exc:  # any failure of the equation on these values is a finding
        return None, Finding(
            "value",
            None,
            None,
            f"{eq.name} cannot be evaluated on the recorded arguments "
            f"({type(exc).__name__}: {exc}).",
        )
    if not math.isfinite(result):
        return result, Finding(
            "value", None, result, f"{eq.name} on the recorded arguments is not finite."
        )
    return result, None


def _check_printed(
    step: dict[str, Any], eq: Any, values: dict[str, Any], result: float, ctx: _Context
) -> list[Finding]:
    """The printed texts of a step against what its equation prints for its recorded values.

    A string comparison: the substituted line must be the recorded numbers as printed,
    whatever the tolerance of the arithmetic.
    """
    findings = []
    for key in _PRINTED:
        expected = getattr(eq, "text" if key == "equation" else key)
        if step.get(key) != expected:
            findings.append(
                Finding(
                    key,
                    step.get(key),
                    expected,
                    f"The printed {key} is not the one {eq.name} defines.",
                )
            )
    shown = {k: tuple(v) if isinstance(v, list) else v for k, v in values.items()}
    try:
        expected = ctx.substitute(eq, shown, result)
    except Exception:  # an unprintable set of values is already a finding elsewhere
        return findings
    if step.get("substituted") != expected:
        findings.append(
            Finding(
                "substituted",
                step.get("substituted"),
                expected,
                "The substituted line is not what the recorded values print.",
            )
        )
    return findings


def _head_balance(steps: list[dict[str, Any]]) -> dict[str, Any] | None:
    worst = None
    for step in steps:
        if step.get("function") == "pump.head_balance" and _finite(step.get("value")):
            if worst is None or abs(step["value"]) > abs(worst["value"]):
                worst = {"step": step["id"], "value": step["value"], "unit": step.get("unit")}
    return worst


def _known_values(
    steps: list[dict[str, Any]], given: dict[str, Any], solutions: dict[str, Any]
) -> set[float]:
    known = {s.get("value") for s in steps if _is_number(s.get("value"))}
    for table in (given, solutions):
        for entry in table.values():
            for v in _as_list(entry.get("value")):
                if _is_number(v):
                    known.add(v)
    return known


def _untraced(node: Any, path: str, known: set[float]) -> list[str]:
    """Paths of scalar result quantities whose value no step, input or solution records."""
    out: list[str] = []
    if isinstance(node, dict):
        if "value" in node and "unit" in node:
            if _is_number(node["value"]) and node["value"] not in known:
                out.append(path)
            return out
        for key, value in node.items():
            out.extend(_untraced(value, f"{path}.{key}", known))
    elif isinstance(node, list):
        for i, value in enumerate(node):
            if isinstance(value, dict) and "value" in value and "unit" in value:
                out.extend(_untraced(value, f"{path}[{i}]", known))
    return out


# ---- the readable form -----------------------------------------------------------------


def _show(value: Any) -> str:
    if value is None:
        return "—"
    if isinstance(value, bool):
        return str(value).lower()
    if _is_number(value):
        return f"{value:.12g}"
    if isinstance(value, list):
        if len(value) > 4:
            return f"[{len(value)} values]"
        return "[" + ", ".join(_show(v) for v in value) + "]"
    text = str(value) if isinstance(value, str) else json.dumps(value)
    return repr(text) if len(text) <= 40 else repr(text[:37] + "...")


def render_text(report: RecheckReport, limit: int = 50) -> str:
    """The readable report: the mismatches as a table, notes, and the verdict line."""
    lines = [f"Recheck of {report.path}"]
    project = report.trace.get("project", {})
    named = " ".join(str(project[k]) for k in ("calc_id", "title") if project.get(k))
    if named:
        rev = f", revision {project['revision']}" if project.get("revision") else ""
        lines.append(f"  {named}{rev}")
    lines.append(
        f"  tolerance: relative {report.tolerance:g}, absolute {ABSOLUTE_FLOOR:g} near zero"
    )
    rows = [
        (s.id, f.what, _show(f.recorded), _show(f.expected), f.reason)
        for s in report.mismatches
        for f in s.findings
    ]
    if rows:
        lines.append("")
        lines.append("Mismatches:")
        shown = rows[:limit]
        header = ("step", "what", "recorded", "recomputed / expected")
        widths = [min(max(len(r[i]) for r in [*shown, header]), 44) for i in range(len(header))]
        lines.append("  " + "  ".join(h.ljust(w) for h, w in zip(header, widths, strict=True)))
        lines.append("  " + "  ".join("-" * w for w in widths))
        for row in shown:
            cells = "  ".join(c.ljust(w) for c, w in zip(row[:4], widths, strict=True))
            lines.append(f"  {cells}".rstrip())
            lines.append(f"      {row[4]}")
        if len(rows) > limit:
            lines.append(f"  ... and {len(rows) - limit} more findings (use --json for all).")
    if report.head_balance is not None:
        hb = report.head_balance
        unit = f" {hb['unit']}" if hb.get("unit") else ""
        lines.append("")
        lines.append("Solver values are confirmed by the steps that use them; the largest")
        lines.append(f"pump head balance is {hb['value']:.3g}{unit} ({hb['step']}).")
    elif report.solutions:
        lines.append("")
        lines.append("Solver values are confirmed by the steps that use them.")
    if report.untraced_results or report.untraced_checks:
        lines.append("")
        parts = []
        for count, noun in (
            (len(report.untraced_results), "result value"),
            (len(report.untraced_checks), "check value"),
        ):
            if count:
                parts.append(f"{count} {noun}" + ("s" if count > 1 else ""))
        first = (report.untraced_results or report.untraced_checks)[0]
        total = len(report.untraced_results) + len(report.untraced_checks)
        verb, pronoun = ("is", "it") if total == 1 else ("are", "them")
        lines.append(
            f"Not covered: {' and '.join(parts)} {verb} not the recorded value of any step, "
            f"input or solution (first: {first}), so this recheck does not confirm {pronoun}."
        )
    if report.bound:
        lines.append("")
        lines.append("Results, checks and status that do not hold:")
        for f in report.bound[:limit]:
            lines.append(f"  {f.what}: {f.reason}")
        if len(report.bound) > limit:
            lines.append(f"  ... and {len(report.bound) - limit} more (use --json for all).")
    for note in report.notes:
        lines.append(f"Note: {note}")
    lines.append("")
    lines.append(report.verdict)
    return "\n".join(lines) + "\n"
