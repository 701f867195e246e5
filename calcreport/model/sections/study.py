"""The [study] table: candidate pumps ([[study.candidate]], each the [pump] table with its
own keys, its initial and maintenance costs) and the one selected for the full calculation.
"""

from __future__ import annotations

import re
from dataclasses import fields, replace
from typing import Any

from calcreport.model.schema import Candidate, Operation, Pump, Study
from calcreport.model.sections.pump import _PROVENANCE_KEYS, _pump
from calcreport.model.sections.reader import _Reader
from calcreport.units import as_written

MAX_CANDIDATES = 10
_STUDY_KEYS = {"candidate", "selected"}
_COST_KEYS = {"id", "title", "capital_cost", "annual_maintenance"}
_ID = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_-]{0,15}$")
# The input key of each pump field a candidate may set (the rest carry over from [pump]).
_FIELD_KEYS = {f.name: (f.name,) for f in fields(Pump)} | {"provenance": _PROVENANCE_KEYS}


def _study(
    r: _Reader, data: dict[str, Any], pump_data: dict[str, Any], base: Pump, op: Operation
) -> Study | None:
    """The study of ``data`` (the [study] table); each candidate's pump is ``base`` with the
    fields its own keys set, read as ``study.candidate[n].<key>``."""
    r.known_keys(data, "study", _STUDY_KEYS)
    rows = data.get("candidate")
    if not isinstance(rows, list) or not rows or not all(isinstance(x, dict) for x in rows):
        r.problem(
            "study.candidate",
            "Give each pump offered as a [[study.candidate]] table with its id, "
            "capital_cost and the [pump] keys it changes (its curve, speed, count...).",
        )
        return None
    if len(rows) > MAX_CANDIDATES:
        r.problem("study.candidate", f"At most {MAX_CANDIDATES} candidates; got {len(rows)}.")
        return None
    missing = [
        key
        for key, value in (
            ("operation.energy_price", op.energy_price),
            ("operation.life_years", op.life_years),
            ("operation.discount_rate", op.discount_rate),
        )
        if value is None
    ]
    if missing or not (op.hours_per_year or op.profile or op.annual_volume):
        basis = missing + ([] if op.hours_per_year or op.profile or op.annual_volume else [
            "operation.hours_per_year (or a profile or annual volume)"
        ])  # fmt: skip
        r.problem(
            "study",
            "Candidates are ranked by life-cycle cost, which needs " + ", ".join(basis) + ".",
        )
    candidates: list[Candidate] = []
    seen: set[str] = set()
    for n, row in enumerate(rows, start=1):
        where = f"study.candidate[{n}]"
        ident = r.text(row, "id", where, "")
        if not _ID.match(ident):
            r.problem(
                f"{where}.id",
                "Give the candidate a short id of letters, digits, - or _ (at most 16), "
                f'such as "A" or "offer-2"; got {as_written(row.get("id"))}.',
            )
        elif ident in seen:
            r.problem(f"{where}.id", f'The id "{ident}" is given to two candidates.')
        seen.add(ident)
        title = r.text(row, "title", where, "")
        capital = r.quantity(row, "capital_cost", where, "dimensionless", required=True)
        upkeep = r.quantity(row, "annual_maintenance", where, "dimensionless")
        for key, cost in (("capital_cost", capital), ("annual_maintenance", upkeep)):
            if cost is not None and cost.value < 0.0:
                r.problem(f"{where}.{key}", "A cost cannot be negative.")
        own = {key: value for key, value in row.items() if key not in _COST_KEYS}
        merged = {k: v for k, v in pump_data.items() if k not in own} | own
        pump = _pump(r, merged, where)
        if pump is None or capital is None:
            continue
        # What the candidate does not set is the [pump] table's, named as it was entered.
        carried = {
            name: getattr(base, name)
            for name, keys in _FIELD_KEYS.items()
            if not any(key in own for key in keys)
        }
        candidates.append(Candidate(ident, title, replace(pump, **carried), capital, upkeep))
    selected = r.text(data, "selected", "study", "")
    if selected and selected not in seen:
        r.problem(
            "study.selected",
            f'"{selected}" is no candidate id; give one of {", ".join(sorted(seen))}.',
        )
    if r.count("study"):
        return None
    return Study(tuple(candidates), selected)
