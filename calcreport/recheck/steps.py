"""One step rechecked: its equation found by name and evaluated again on the recorded
arguments, each argument traced to its source, the printed forms compared.
"""

from __future__ import annotations

import math
import re
from typing import Any

from calcreport.recheck.common import (
    ABSOLUTE_FLOOR,
    Finding,
    StepResult,
    _as_list,
    _close,
    _Context,
    _doc_unit,
    _finite,
)

_STEP_KEYS = ("value", "unit", "arguments", "function")
_PRINTED = ("symbol", "equation", "latex", "reference")
_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)")


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
