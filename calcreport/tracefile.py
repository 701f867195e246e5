"""Trace files: read one strictly and check its shape (used by recheck, diff and build).

A trace is JSON of format :data:`FORMAT`. :func:`read_trace` reads at most
:data:`MAX_TRACE_BYTES`, refuses what is not UTF-8 JSON, any non-finite or oversized number
and nesting too deep to be a trace, then :func:`validate` checks the top-level shape and
that step ids are unique. A file that is not a trace raises :class:`TraceError` naming it.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any

from calcreport.errors import FileReadError, TraceError
from calcreport.files import read_bounded
from calcreport.trace import FORMAT

__all__ = ["FORMAT", "MAX_TRACE_BYTES", "read_trace", "validate"]

# A trace of thousands of pipes runs to tens of MB; anything far larger is not one.
MAX_TRACE_BYTES = 256 * 1024 * 1024


def read_trace(path: str | Path) -> dict[str, Any]:
    """Read a trace JSON file; raise :class:`TraceError` when it is not one."""
    name = str(path)
    try:
        data = read_bounded(path, MAX_TRACE_BYTES)
    except FileReadError as exc:
        raise TraceError(name, exc.reason) from None
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise TraceError(
            name, f"it is not UTF-8 text (byte {exc.start} cannot be decoded)."
        ) from None
    try:
        trace = json.loads(
            text, parse_constant=_no_constant, parse_float=_finite_float, parse_int=_whole
        )
    except json.JSONDecodeError as exc:
        raise TraceError(
            name, f"it is not JSON ({exc.msg} at line {exc.lineno}, column {exc.colno})."
        ) from None
    except _NotFinite as exc:
        raise TraceError(name, f"it holds {exc}: a trace records finite numbers only.") from None
    except RecursionError:
        raise TraceError(name, "its values are nested too deeply to be a trace.") from None
    validate(trace, name)
    return trace


class _NotFinite(ValueError):
    """A number in a trace file that is no finite float (NaN, Infinity, 1e400)."""


def _no_constant(token: str) -> float:
    raise _NotFinite(f"the non-number {token}")


def _finite_float(token: str) -> float:
    value = float(token)
    if not math.isfinite(value):
        raise _NotFinite(f"the number {token[:40]}, beyond the range of a float")
    return value


def _whole(token: str) -> int | float:
    """Integers as Python reads them, but none a float cannot hold."""
    if len(token.lstrip("-")) > 300:
        raise _NotFinite(f"an integer of {len(token)} digits")
    return int(token)


def validate(trace: Any, path: str = "trace") -> None:
    """Raise :class:`TraceError` unless ``trace`` has the shape of a trace JSON."""
    if not isinstance(trace, dict):
        raise TraceError(path, f"it holds a JSON {_kind(trace)}, not an object with a format key.")
    fmt = trace.get("format")
    if fmt != FORMAT:
        found = "no format key" if fmt is None else f"format {fmt!r}"
        raise TraceError(path, f"it has {found}; a trace has format {FORMAT!r}.")
    for key, kind in (("steps", list), ("given", dict), ("solutions", dict)):
        if key in trace and not isinstance(trace[key], kind):
            raise TraceError(
                path, f"its {key!r} is a JSON {_kind(trace[key])}, not a {_kind(kind())}."
            )
    if "steps" not in trace:
        raise TraceError(path, "it has no 'steps' list.")
    for key in ("results",):
        if key in trace and not isinstance(trace[key], dict):
            raise TraceError(path, f"its {key!r} is a JSON {_kind(trace[key])}, not an object.")
    if "checks" in trace and not isinstance(trace["checks"], list):
        raise TraceError(path, f"its 'checks' is a JSON {_kind(trace['checks'])}, not an array.")
    if "assumptions" in trace and not isinstance(trace["assumptions"], list):
        raise TraceError(path, "its 'assumptions' is not an array.")
    seen: set[str] = set()
    for index, step in enumerate(trace["steps"], start=1):
        if not isinstance(step, dict) or not isinstance(step.get("id"), str) or not step["id"]:
            raise TraceError(path, f"step {index} of {len(trace['steps'])} has no id.")
        if step["id"] in seen:
            raise TraceError(
                path, f"the step id {step['id']!r} appears more than once; step ids are unique."
            )
        seen.add(step["id"])


def _kind(value: Any) -> str:
    if isinstance(value, dict):
        return "object"
    if isinstance(value, list):
        return "array"
    if isinstance(value, str):
        return "string"
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "boolean"
    return "number"
