"""Compare two traces: what changed in the inputs, results, checks, steps and project.

:func:`diff` takes two traces in their JSON form and returns a
:class:`DiffReport`; :func:`diff_files` reads them first (a file that is
not a trace raises :class:`calcreport.errors.TraceError`). Nothing here
prints: :func:`render_text` gives the readable form and
:meth:`DiffReport.to_json` the structured one.

The readable form prints numbers in the units of the newer trace's report (kWh, kPa or
psi, marked gauge or absolute) with the report's rounding of results; the JSON form keeps
the SI values of the traces.

Numbers compare to a relative threshold (:data:`THRESHOLD`) so that float
noise is not reported as a change. Quantities whose value is a list (the
system curve, a pump curve) are summarised in one row, "curve changed",
with the number of points and the largest change; a list of other items
longer than :data:`SHORT_LIST` (the route profile's nodes) likewise.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from calcreport.tracefile import read_trace, validate
from calcreport.units import show_keyed

__all__ = [
    "REPORT_FORMAT",
    "SHORT_LIST",
    "THRESHOLD",
    "Change",
    "CheckChange",
    "DiffReport",
    "diff",
    "diff_files",
    "render_text",
]

REPORT_FORMAT = "calcreport-diff/1"
THRESHOLD = 1e-9
SHORT_LIST = 4


@dataclass(frozen=True)
class Change:
    """One input, result or project item that differs.

    ``kind`` is ``added``, ``removed``, ``changed`` or, for a list summarised
    in one row, ``curve changed`` / ``list changed``; ``change_percent`` is
    (new − old)/|old| in per cent when both are numbers and old is not zero
    (for a curve: the largest change of any point).
    """

    key: str
    kind: str
    old: Any
    new: Any
    unit: str = ""
    old_unit: str | None = None
    change_percent: float | None = None
    note: str = ""

    def to_json(self) -> dict[str, Any]:
        out = {
            "key": self.key,
            "kind": self.kind,
            "old": self.old,
            "new": self.new,
            "unit": self.unit,
            "change_percent": self.change_percent,
        }
        if self.old_unit is not None:
            out["old_unit"] = self.old_unit
        if self.note:
            out["note"] = self.note
        return out


@dataclass(frozen=True)
class CheckChange:
    """A design check that was added, removed, or whose status, value or limit changed."""

    id: str
    case: str
    kind: str
    old_status: str | None
    new_status: str | None
    old_value: float | None = None
    new_value: float | None = None
    unit: str = ""
    old_limit: float | None = None
    new_limit: float | None = None
    title: str = ""

    def to_json(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "case": self.case,
            "title": self.title,
            "kind": self.kind,
            "old_status": self.old_status,
            "new_status": self.new_status,
            "old_value": self.old_value,
            "new_value": self.new_value,
            "old_limit": self.old_limit,
            "new_limit": self.new_limit,
            "unit": self.unit,
        }


@dataclass(frozen=True)
class DiffReport:
    """Everything that differs between two traces."""

    old: dict[str, Any]
    new: dict[str, Any]
    inputs: tuple[Change, ...] = ()
    results: tuple[Change, ...] = ()
    checks: tuple[CheckChange, ...] = ()
    steps_added: tuple[str, ...] = ()
    steps_removed: tuple[str, ...] = ()
    steps_changed: tuple[str, ...] = ()
    project: tuple[Change, ...] = ()
    notes: tuple[str, ...] = field(default_factory=tuple)

    @property
    def identical(self) -> bool:
        return not (
            self.inputs
            or self.results
            or self.checks
            or self.steps_added
            or self.steps_removed
            or self.steps_changed
            or self.project
        )

    @property
    def verdict(self) -> str:
        if self.identical:
            return "diff: no differences in inputs, results, checks, steps or project details"
        parts = []
        for count, noun in (
            (len(self.inputs), "input"),
            (len(self.results), "result"),
            (len(self.checks), "check"),
            (len(self.steps_added) + len(self.steps_removed), "step added or removed"),
            (len(self.steps_changed), "step value"),
            (len(self.project), "project detail"),
        ):
            if count:
                parts.append(f"{count} {_plural(noun, count)}")
        return "diff: changed " + ", ".join(parts)

    def to_json(self) -> dict[str, Any]:
        return {
            "format": REPORT_FORMAT,
            "old": self.old,
            "new": self.new,
            "threshold": THRESHOLD,
            "identical": self.identical,
            "verdict": self.verdict,
            "inputs": [c.to_json() for c in self.inputs],
            "results": [c.to_json() for c in self.results],
            "checks": [c.to_json() for c in self.checks],
            "steps": {
                "added": list(self.steps_added),
                "removed": list(self.steps_removed),
                "value_changed": list(self.steps_changed),
            },
            "project": [c.to_json() for c in self.project],
            "notes": list(self.notes),
        }


def _plural(noun: str, count: int) -> str:
    if count == 1:
        return noun
    if noun == "step added or removed":
        return "steps added or removed"
    return noun + "s"


# ---- comparing -------------------------------------------------------------------------


def diff_files(old: str | Path, new: str | Path) -> DiffReport:
    """Read two trace files and compare them."""
    return diff(read_trace(old), read_trace(new), str(old), str(new))


def diff(
    old: dict[str, Any], new: dict[str, Any], old_path: str = "old", new_path: str = "new"
) -> DiffReport:
    """Compare two traces (their JSON form); see the module docstring."""
    validate(old, old_path)
    validate(new, new_path)
    notes = []
    if old.get("software") != new.get("software"):
        notes.append(
            f"The traces were written by different software: {_software(old)} and {_software(new)}."
        )
    old_steps = {s["id"]: s for s in old["steps"]}
    new_steps = {s["id"]: s for s in new["steps"]}
    changed_steps = tuple(
        ident
        for ident, step in new_steps.items()
        if ident in old_steps and not _same(old_steps[ident].get("value"), step.get("value"))
    )
    return DiffReport(
        old=_identity(old, old_path),
        new=_identity(new, new_path),
        inputs=tuple(_diff_inputs(old.get("given") or {}, new.get("given") or {})),
        results=tuple(_walk(old.get("results") or {}, new.get("results") or {}, "")),
        checks=tuple(_diff_checks(old.get("checks") or [], new.get("checks") or [])),
        steps_added=tuple(i for i in new_steps if i not in old_steps),
        steps_removed=tuple(i for i in old_steps if i not in new_steps),
        steps_changed=changed_steps,
        project=tuple(_diff_project(old.get("project") or {}, new.get("project") or {})),
        notes=tuple(notes),
    )


def _software(trace: dict[str, Any]) -> str:
    software = trace.get("software")
    if isinstance(software, dict):
        return f"{software.get('name', '?')} {software.get('version', '?')}"
    return "unknown software"


def _identity(trace: dict[str, Any], path: str) -> dict[str, Any]:
    source = trace.get("input") if isinstance(trace.get("input"), dict) else {}
    project = trace.get("project") if isinstance(trace.get("project"), dict) else {}
    return {
        "path": path,
        "input": {"path": source.get("path"), "sha256": source.get("sha256")},
        "software": trace.get("software"),
        "calc_id": project.get("calc_id"),
        "revision": project.get("revision"),
        "date": project.get("date"),
        "units": "US" if project.get("units") == "US" else "SI",
    }


def _is_number(value: Any) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def _close(a: float, b: float) -> bool:
    """Equal to the threshold; a change to or from a non-finite value is always a change
    (inf − 1 ≤ threshold × inf would call them equal)."""
    if not (math.isfinite(a) and math.isfinite(b)):
        return False
    return a == b or abs(a - b) <= THRESHOLD * max(abs(a), abs(b))


def _same(a: Any, b: Any) -> bool:
    """Deep equality with numbers compared to the threshold."""
    if _is_number(a) and _is_number(b):
        return _close(a, b)
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b, strict=True))
    return type(a) is type(b) and a == b


def _percent(old: Any, new: Any) -> float | None:
    if _is_number(old) and _is_number(new) and old != 0 and math.isfinite(old):
        return (new - old) / abs(old) * 100.0
    return None


def _is_quantity(node: Any) -> bool:
    return isinstance(node, dict) and "value" in node and "unit" in node


def _diff_inputs(old: dict[str, Any], new: dict[str, Any]) -> list[Change]:
    out = []
    for key in _keys(old, new):
        a, b = old.get(key), new.get(key)
        if a is None:
            out.append(Change(key, "added", None, _value(b), _unit(b)))
        elif b is None:
            out.append(Change(key, "removed", _value(a), None, _unit(a)))
        else:
            out.extend(_compare_quantity(key, a, b))
    return out


def _keys(old: dict[str, Any], new: dict[str, Any]) -> list[str]:
    return list(old) + [k for k in new if k not in old]


def _value(q: Any) -> Any:
    return q.get("value") if isinstance(q, dict) else q


def _unit(q: Any) -> str:
    unit = q.get("unit") if isinstance(q, dict) else ""
    return unit if isinstance(unit, str) else ""


def _compare_quantity(path: str, a: Any, b: Any) -> list[Change]:
    va, vb = _value(a), _value(b)
    ua, ub = _unit(a), _unit(b)
    if isinstance(va, list) or isinstance(vb, list):
        if ua == ub and _same(va, vb):
            return []
        return [_curve(path, va, vb, ub, ua)]
    if ua == ub and _same(va, vb):
        return []
    return [
        Change(
            path,
            "changed",
            va,
            vb,
            ub,
            old_unit=None if ua == ub else ua,
            change_percent=_percent(va, vb) if ua == ub else None,
            note="" if ua == ub else f"unit changed from {ua!r} to {ub!r}",
        )
    ]


def _curve(path: str, old: Any, new: Any, unit: str, old_unit: str) -> Change:
    a = old if isinstance(old, list) else [old]
    b = new if isinstance(new, list) else [new]
    largest = None
    if len(a) == len(b):
        for x, y in zip(a, b, strict=True):
            p = _percent(x, y)
            if p is not None and (largest is None or abs(p) > abs(largest)):
                largest = p
        note = f"{len(b)} points; change % is the largest of any point"
    else:
        note = f"{len(a)} points, now {len(b)}"
    if old_unit != unit:
        note += f"; unit changed from {old_unit!r} to {unit!r}"
    return Change(
        path,
        "curve changed",
        f"[{len(a)} points]",
        f"[{len(b)} points]",
        unit,
        old_unit=None if old_unit == unit else old_unit,
        change_percent=largest,
        note=note,
    )


def _walk(old: Any, new: Any, path: str) -> list[Change]:
    """Changes between two result trees, quantity by quantity."""
    if _is_quantity(old) and _is_quantity(new):
        return _compare_quantity(path, old, new)
    if (
        isinstance(old, dict)
        and isinstance(new, dict)
        and not (_is_quantity(old) or _is_quantity(new))
    ):
        out = []
        for key in _keys(old, new):
            sub = f"{path}.{key}" if path else key
            if key not in new:
                out.extend(_one_side(old[key], sub, "removed"))
            elif key not in old:
                out.extend(_one_side(new[key], sub, "added"))
            else:
                out.extend(_walk(old[key], new[key], sub))
        return out
    if isinstance(old, list) and isinstance(new, list):
        if len(old) == len(new) and len(old) <= SHORT_LIST:
            out = []
            for i, (a, b) in enumerate(zip(old, new, strict=True)):
                out.extend(_walk(a, b, f"{path}[{i}]"))
            return out
        if _same(old, new):
            return []
        return [
            Change(
                path,
                "list changed",
                f"[{len(old)} items]",
                f"[{len(new)} items]",
                note=f"{len(old)} items, now {len(new)}" if len(old) != len(new) else "",
            )
        ]
    if _same(old, new):
        return []
    return [
        Change(
            path,
            "changed",
            _value(old) if _is_quantity(old) else old,
            _value(new) if _is_quantity(new) else new,
            _unit(new),
            change_percent=_percent(_value(old), _value(new)),
        )
    ]


def _one_side(node: Any, path: str, kind: str) -> list[Change]:
    """An added or removed result: each quantity under it, or the node itself."""
    if _is_quantity(node):
        value = _value(node)
        shown = f"[{len(value)} points]" if isinstance(value, list) else value
        old, new = (None, shown) if kind == "added" else (shown, None)
        return [Change(path, kind, old, new, _unit(node))]
    if isinstance(node, dict):
        out = []
        for key, value in node.items():
            out.extend(_one_side(value, f"{path}.{key}", kind))
        return out
    shown = f"[{len(node)} items]" if isinstance(node, list) else node
    old, new = (None, shown) if kind == "added" else (shown, None)
    return [Change(path, kind, old, new)]


def _check_key(check: dict[str, Any]) -> tuple[str, str]:
    return (str(check.get("id", "")), str(check.get("case", "")))


def _diff_checks(old: list[Any], new: list[Any]) -> list[CheckChange]:
    a = {_check_key(c): c for c in old if isinstance(c, dict)}
    b = {_check_key(c): c for c in new if isinstance(c, dict)}
    out = []
    for key in list(a) + [k for k in b if k not in a]:
        ca, cb = a.get(key), b.get(key)
        either = cb if cb is not None else ca
        if either is None:
            continue
        unit = _unit(either.get("value") or either.get("limit") or {})
        title = str(either.get("title", ""))
        if ca is None or cb is None:
            kind = "added" if ca is None else "removed"
            out.append(
                CheckChange(
                    key[0],
                    key[1],
                    kind,
                    None if ca is None else ca.get("status"),
                    None if cb is None else cb.get("status"),
                    None if ca is None else _value(ca.get("value")),
                    None if cb is None else _value(cb.get("value")),
                    unit,
                    None if ca is None else _value(ca.get("limit")),
                    None if cb is None else _value(cb.get("limit")),
                    title,
                )
            )
            continue
        va, vb = _value(ca.get("value")), _value(cb.get("value"))
        la, lb = _value(ca.get("limit")), _value(cb.get("limit"))
        status_same = ca.get("status") == cb.get("status")
        if status_same and _same(va, vb) and _same(la, lb):
            continue
        kinds = []
        if not status_same:
            kinds.append("status")
        if not _same(va, vb):
            kinds.append("value")
        if not _same(la, lb):
            kinds.append("limit")
        out.append(
            CheckChange(
                key[0],
                key[1],
                " and ".join(kinds) + " changed",
                ca.get("status"),
                cb.get("status"),
                va,
                vb,
                unit,
                la,
                lb,
                title,
            )
        )
    return out


def _diff_project(old: dict[str, Any], new: dict[str, Any]) -> list[Change]:
    out = []
    for key in _keys(old, new):
        a, b = old.get(key), new.get(key)
        if key not in new:
            out.append(Change(key, "removed", a, None))
        elif key not in old:
            out.append(Change(key, "added", None, b))
        elif not _same(a, b):
            out.append(Change(key, "changed", a, b))
    return out


# ---- the readable form -----------------------------------------------------------------


def _show(value: Any, unit: str = "", key: str = "", system: str = "SI") -> str:
    """A value as the terminal prints it: a number in the report's units and rounding."""
    if value is None:
        return "—"
    if isinstance(value, bool):
        return str(value).lower()
    if _is_number(value):
        return show_keyed(float(value), unit, key, system)
    if isinstance(value, str):
        return value if len(value) <= 40 else value[:37] + "..."
    if isinstance(value, list):
        return f"[{len(value)} items]"
    return "{...}"


def _pct(value: float | None) -> str:
    return "" if value is None else f"{value:+.4g} %"


def _table(header: tuple[str, ...], rows: list[tuple[str, ...]], limit: int) -> list[str]:
    shown = rows[:limit]
    widths = [min(max(len(r[i]) for r in [*shown, header]), 48) for i in range(len(header))]
    lines = ["  " + "  ".join(h.ljust(w) for h, w in zip(header, widths, strict=True)).rstrip()]
    lines.append("  " + "  ".join("-" * w for w in widths))
    for row in shown:
        lines.append(
            "  " + "  ".join(c.ljust(w) for c, w in zip(row, widths, strict=True)).rstrip()
        )
    if len(rows) > limit:
        lines.append(f"  ... and {len(rows) - limit} more (use --json for all).")
    return lines


def _change_rows(changes: tuple[Change, ...], system: str) -> list[tuple[str, ...]]:
    rows = []
    for c in changes:
        kind = c.kind if not c.note else f"{c.kind} ({c.note})"
        old = _show(c.old, c.old_unit or c.unit, c.key, system)
        rows.append((c.key, kind, old, _show(c.new, c.unit, c.key, system), _pct(c.change_percent)))
    return rows


def render_text(report: DiffReport, limit: int = 60) -> str:
    """The readable comparison: one table a section, then the verdict line."""
    lines = [f"Comparison of {report.old['path']} (old) and {report.new['path']} (new)"]
    for side in ("old", "new"):
        ident = getattr(report, side)
        sha = ident["input"].get("sha256") or ""
        rev = f", revision {ident['revision']}" if ident.get("revision") else ""
        date = f", {ident['date']}" if ident.get("date") else ""
        calc = ident.get("calc_id") or "(no calc id)"
        lines.append(f"  {side}: {calc}{rev}{date}; input sha256 {sha[:12] or '—'}")
    system = report.new.get("units", "SI")
    header = ("key", "change", "old", "new", "change %")
    if report.project:
        lines += ["", "Project details:"]
        rows = [r[:4] for r in _change_rows(report.project, system)]
        lines += _table(header[:4], rows, limit)
    if report.inputs:
        lines += ["", "Inputs:"]
        lines += _table(header, _change_rows(report.inputs, system), limit)
    if report.results:
        lines += ["", "Results that moved:"]
        lines += _table(("result", *header[1:]), _change_rows(report.results, system), limit)
    if report.checks:
        rows = []
        for c in report.checks:
            status = f"{c.old_status or '—'} → {c.new_status or '—'}"
            old = _show(c.old_value, c.unit, c.id, system)
            new = _show(c.new_value, c.unit, c.id, system)
            rows.append((c.id, c.case, c.kind, status, old, new))
        lines += ["", "Checks:"]
        lines += _table(("check", "case", "change", "status", "old", "new"), rows, limit)
    if report.steps_added or report.steps_removed:
        lines += ["", "Steps:"]
        for label, ids in (("added", report.steps_added), ("removed", report.steps_removed)):
            if ids:
                more = f" ... and {len(ids) - limit} more" if len(ids) > limit else ""
                lines.append(f"  {label} ({len(ids)}): {', '.join(ids[:limit])}{more}")
    if report.steps_changed:
        lines += ["", f"Steps whose value changed: {len(report.steps_changed)}."]
    for note in report.notes:
        lines.append(f"Note: {note}")
    lines += ["", report.verdict]
    return "\n".join(lines) + "\n"
