"""The full step listing as plain text: every step of every state, attached to the report.

The printed report works each equation once per state family; this listing holds every
step as the trace records it — id, title, equation, substituted line, result with its
full precision in SI, the step ids it used and its reference — so that a checker can
search it, diff two revisions of it, or print it. It is written from the trace alone.
"""

from __future__ import annotations

from typing import Any

__all__ = ["listing_name", "step_listing"]


def listing_name(trace: dict[str, Any]) -> str:
    """The file name of the listing attached to the report of ``trace``."""
    stem = trace["input"]["path"].rsplit(".", 1)[0] or "calculation"
    return f"{stem}.steps.txt"


def step_listing(trace: dict[str, Any]) -> str:
    """Every step of ``trace`` in the order computed, as UTF-8 text (one block a step)."""
    project = trace["project"]
    titles = {c["id"]: c.get("title", "") for c in trace.get("cases", [])}
    references = trace.get("references", {})
    steps = trace["steps"]
    lines = [
        f"{project['calc_id']} {project['title']}".strip(),
        f"Revision {project['revision']} of {project['date']}".strip(),
        f"Full step listing: {len(steps)} steps in the order computed. Results are in SI "
        "as the trace records them (full precision); the printed report shows them in its "
        "own units.",
        "",
    ]
    if titles:
        lines.append("Cases:")
        lines += [f"  {ident}  {title}" for ident, title in titles.items()]
        lines.append("")
    for st in steps:
        unit = st["unit"] or "-"
        lines += [
            f"[{st['id']}]  {st['title']}" + (f"  (case {st['case']})" if st.get("case") else ""),
            f"  equation:    {st['equation']}",
            f"  substituted: {st['substituted']}",
            f"  result:      {st['symbol']} = {st['value']!r} {unit}",
            f"  inputs:      {', '.join(st['inputs']) or '-'}",
            f"  reference:   [{st['reference']}] {references.get(st['reference'], '')}".rstrip(),
            "",
        ]
    return "\n".join(lines)
