"""Trace files: read one strictly and check its shape (used by recheck, diff and build), and
a view of a trace by what its readers ask (used by the report).

A trace is JSON of format :data:`FORMAT`. :func:`read_trace` reads at most
:data:`MAX_TRACE_BYTES`, refuses what is not UTF-8 JSON, any non-finite or oversized number
and nesting too deep to be a trace, then :func:`validate` checks the top-level shape and
that step ids are unique. A file that is not a trace raises :class:`TraceError` naming it.
:class:`TraceView` answers the report's questions (the steps of a section, the states a
check governs in, whether a pump is selected) so that no reader re-derives them from step
ids.
"""

from __future__ import annotations

import json
import math
import re
from collections.abc import Iterable
from pathlib import Path
from typing import Any

from calcreport.errors import FileReadError, TraceError
from calcreport.files import read_bounded
from calcreport.trace import DESIGN_CASE, FORMAT

__all__ = [
    "DESIGN_CASE",
    "FORMAT",
    "MAX_TRACE_BYTES",
    "TraceView",
    "parse_trace",
    "read_trace",
    "validate",
]

# A trace of thousands of pipes runs to tens of MB; anything far larger is not one.
MAX_TRACE_BYTES = 256 * 1024 * 1024


def read_trace(path: str | Path) -> dict[str, Any]:
    """Read a trace JSON file, or the trace attached to a calcreport PDF report (checked
    against the SHA-256 the report records for it); raise :class:`TraceError` when the file
    is neither."""
    name = str(path)
    try:
        data = read_bounded(path, MAX_TRACE_BYTES)
    except FileReadError as exc:
        raise TraceError(name, exc.reason) from None
    if data.startswith(b"%PDF-"):
        return parse_trace(_attached_trace(data, name), f"{name} (attached trace)")
    return parse_trace(data, name)


def _attached_trace(pdf: bytes, name: str) -> bytes:
    """The bytes of the trace attached to a report, after checking them against the
    SHA-256 the report states for them."""
    import hashlib

    from calcreport.report.archive import attached, description_sha256

    try:
        files = attached(pdf)
    except Exception as exc:  # pikepdf raises its own errors for a damaged file
        raise TraceError(name, f"it is a PDF that cannot be read ({type(exc).__name__}).") from None
    traces = [(n, d, desc) for n, (d, desc) in files.items() if n.endswith(".trace.json")]
    if len(traces) != 1:
        raise TraceError(
            name,
            "it is a PDF without a trace attached (a calcreport report carries one, "
            "NAME.trace.json)."
            if not traces
            else "it is a PDF with more than one trace attached.",
        )
    trace_name, data, description = traces[0]
    stated = description_sha256(description)
    actual = hashlib.sha256(data).hexdigest()
    if stated != actual:
        raise TraceError(
            name,
            f"the attached {trace_name} has SHA-256 {actual}, not the {stated or 'none'} the "
            "report records for it: it was altered after the report was made.",
        )
    return data


def parse_trace(data: bytes, name: str = "trace") -> dict[str, Any]:
    """Parse and check the bytes of a trace; raise :class:`TraceError` when they are not
    one (``name`` names them in the message)."""
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


# The prefix of a step of a numbered case other than the design case ("C2.pipe.P1.velocity").
_CASE_PREFIX = re.compile(r"^C\d+\.")


class TraceView:
    """A solved trace as its readers ask of it."""

    def __init__(self, trace: dict[str, Any]) -> None:
        self.trace = trace

    @property
    def design_case(self) -> str:
        return DESIGN_CASE

    @property
    def other_cases(self) -> list[str]:
        """The ids of the cases after the design case, in order."""
        return [c["id"] for c in self.trace["cases"] if c["id"] != DESIGN_CASE]

    @property
    def pump_selected(self) -> bool:
        """A pump curve is given, so the operating point is the curve's."""
        return "pump.curve.flow[1]" in self.trace["given"]

    @staticmethod
    def case_of(item: dict[str, Any]) -> str:
        """The case or state a step or check belongs to (the design case when unnamed)."""
        return item.get("case") or DESIGN_CASE

    def steps(self, prefixes: tuple[str, ...], cases: Iterable[str] | None = None) -> list[dict]:
        """Steps whose id starts with one of ``prefixes``: the design case's, or with
        ``cases`` those of each numbered case named (its step ids less the case prefix)."""
        if cases is None:
            return [st for st in self.trace["steps"] if st["id"].startswith(prefixes)]
        wanted = set(cases)
        return [
            st
            for st in self.trace["steps"]
            if _CASE_PREFIX.sub("", st["id"]).startswith(prefixes) and self.case_of(st) in wanted
        ]

    def steps_by_case(
        self, prefixes: tuple[str, ...], cases: Iterable[str]
    ) -> dict[str, dict[str, dict]]:
        """The steps of ``cases`` whose id less its case prefix starts with one of
        ``prefixes``, as that id -> {case: step}, in the order first computed (the design
        case's step is the one without a prefix)."""
        wanted = set(cases)
        out: dict[str, dict[str, dict]] = {}
        for st in self.trace["steps"]:
            key = _CASE_PREFIX.sub("", st["id"])
            if key.startswith(prefixes) and self.case_of(st) in wanted:
                out.setdefault(key, {})[self.case_of(st)] = st
        return out

    def check(self, check_id: str) -> dict[str, Any] | None:
        """The check ``check_id``, or None when the trace has none."""
        return next((c for c in self.trace["checks"] if c["id"] == check_id), None)

    def checks(self, *, status: str | None = None, family: str | None = None) -> list[dict]:
        """The checks, those of one status or of one family (the id before its first dot)."""
        return [
            c
            for c in self.trace["checks"]
            if (status is None or c["status"] == status)
            and (family is None or c["id"].split(".")[0] == family)
        ]
