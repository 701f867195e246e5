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
import warnings
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from calcreport import __version__
from calcreport.recheck.bound import (
    _bound_checks,
    _bound_governing,
    _bound_results,
    _bound_status,
)
from calcreport.recheck.common import (
    ABSOLUTE_FLOOR,
    Finding,
    StepResult,
    _as_list,
    _Context,
    _finite,
    _is_number,
    _sources,
    _table,
)
from calcreport.recheck.steps import _recheck_step
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
            + _bound_governing(trace)
            + _bound_status(trace)
        ),
    )


def _identity(trace: dict[str, Any], path: str) -> dict[str, Any]:
    project = trace.get("project") if isinstance(trace.get("project"), dict) else {}
    source = trace.get("input") if isinstance(trace.get("input"), dict) else {}
    return {
        "path": path,
        "software": trace.get("software"),
        "input": {"path": source.get("path"), "sha256": source.get("sha256")},
        "project": {k: project.get(k) for k in ("title", "calc_id", "revision", "date")},
    }


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
