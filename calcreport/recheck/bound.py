"""Results, checks and status bound to the steps: every result equals the step, input or
solution it names; each check's status follows from its value, limit and comparison; the
report status follows from the checks.
"""

from __future__ import annotations

import re
from typing import Any

from calcreport.recheck.common import Finding, _close, _Context, _is_number
from calcreport.trace import DESIGN_CASE

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
        prefix = "" if parts[2] == DESIGN_CASE else f"{parts[2]}."
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


def _bound_governing(trace: dict[str, Any]) -> list[Finding]:
    """The rated duty's governing state of each limit is the state its check names."""
    results = trace.get("results") if isinstance(trace.get("results"), dict) else {}
    rated = results.get("rated_duty") if isinstance(results, dict) else None
    governing = rated.get("governing") if isinstance(rated, dict) else None
    if not isinstance(governing, dict):
        return []
    checks = trace["checks"] if isinstance(trace.get("checks"), list) else []
    cases = {c.get("id"): c.get("case") for c in checks if isinstance(c, dict)}
    return [
        Finding(
            f"results.rated_duty.governing.{cid}",
            state,
            cases.get(cid),
            f"The check {cid} names state {cases.get(cid)!r}.",
        )
        for cid, state in governing.items()
        if cases.get(cid) != state
    ]


def _bound_status(trace: dict[str, Any]) -> list[Finding]:
    """The status the checks give: preliminary without a pump curve, does not comply with a
    failing check, not feasible without the design operating point, else for checking."""
    status = trace.get("status")
    if not isinstance(status, dict):
        return []
    given: dict[str, Any] = trace["given"] if isinstance(trace.get("given"), dict) else {}
    results: dict[str, Any] = trace["results"] if isinstance(trace.get("results"), dict) else {}
    checks: list[Any] = trace["checks"] if isinstance(trace.get("checks"), list) else []
    # The pump's curve, or a study offer's own (study.candidate[n].curve) when it is selected.
    curve = any(re.match(r"^(pump|study\.candidate\[\d+\])\.curve\.flow\[", str(k)) for k in given)
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
