"""The [study] table: candidate pumps ([[study.candidate]], each the [pump] table with its
own keys, its initial and maintenance costs) and the one selected for the full calculation.
"""

from __future__ import annotations

import re
from dataclasses import fields, replace
from typing import Any

from calcreport import catalog
from calcreport.model.schema import (
    Candidate,
    Given,
    Operation,
    Pipe,
    PipeSize,
    Pump,
    Sensitivity,
    SizeStudy,
    Study,
    Vessel,
)
from calcreport.model.sections.pipes import _catalog_diameter
from calcreport.model.sections.pump import _PROVENANCE_KEYS, _pump
from calcreport.model.sections.reader import _quantity_list, _Reader
from calcreport.units import as_written

MAX_CANDIDATES = 10
MAX_SIZES = 12
_STUDY_KEYS = {"candidate", "selected", "pipe_size", "sensitivity"}
_SENSITIVITY_KEYS = {"roughness", "temperature", "levels", "pump_grade", "fitting_k"}
_SIZE_KEYS = {"nominal_size", "schedule", "material", "inner_diameter", "cost_per_length"}
_COST_KEYS = {"id", "title", "capital_cost", "annual_maintenance", "drive_efficiency"}
_ID = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_-]{0,15}$")
# The input key of each pump field a candidate may set (the rest carry over from [pump]).
_FIELD_KEYS = {f.name: (f.name,) for f in fields(Pump)} | {"provenance": _PROVENANCE_KEYS}


def _study(
    r: _Reader,
    data: dict[str, Any],
    pump_data: dict[str, Any],
    base: Pump,
    op: Operation,
    pipes: tuple[Pipe, ...],
    source: Vessel,
    destination: Vessel,
) -> Study | None:
    """The study of ``data`` (the [study] table): the candidate pumps, each ``base`` with
    the fields its own keys set (read as ``study.candidate[n].<key>``), and the pipe
    sizes to price (``study.pipe_size[n]``)."""
    r.known_keys(data, "study", _STUDY_KEYS)
    if not {"candidate", "pipe_size", "sensitivity"} & set(data):
        r.problem(
            "study",
            "A study compares offers or sizes, or shows how sure the design is: give "
            "[[study.candidate]] tables (pumps offered), [[study.pipe_size]] tables (sizes "
            "of a main) or a [study.sensitivity] table (the uncertainties to try).",
        )
        return None
    if {"candidate", "pipe_size"} & set(data):
        _needs_costs(r, op)
    candidates = _candidates(r, data, pump_data, base) if "candidate" in data else ()
    seen = {c.id for c in candidates}
    selected = r.text(data, "selected", "study", "")
    if selected and selected not in seen:
        r.problem(
            "study.selected",
            f'"{selected}" is no candidate id; give one of {", ".join(sorted(seen)) or "none"}.',
        )
    sizes = _pipe_sizes(r, data.get("pipe_size"), pipes) if "pipe_size" in data else ()
    sensitivity = None
    if "sensitivity" in data:
        table = r.table(data, "sensitivity", "study.sensitivity", required=True)
        if table is not None:  # an empty table is a problem of its own
            sensitivity = _sensitivity(r, table, base, source, destination)
    if r.count("study"):
        return None
    return Study(tuple(candidates), selected, sizes, sensitivity)


def _sensitivity(
    r: _Reader, data: dict[str, Any], pump: Pump, source: Vessel, destination: Vessel
) -> Sensitivity | None:
    """``study.sensitivity``: the uncertainties to try, each low and high."""
    where = "study.sensitivity"
    r.known_keys(data, where, _SENSITIVITY_KEYS)
    if not data:
        r.problem(
            where, "Name at least one uncertainty: " + ", ".join(sorted(_SENSITIVITY_KEYS)) + "."
        )
        return None
    roughness = r.quantity(data, "roughness", where, "roughness", positive=True)
    temperature = None
    if "temperature" in data:
        pair = _quantity_list(r, data, "temperature", where, "temperature")
        if pair is not None and (len(pair) != 2 or pair[0].value >= pair[1].value):
            r.problem(
                f"{where}.temperature",
                "Give the coldest and the warmest temperature, in that order.",
            )
        elif pair is not None:
            temperature = (pair[0], pair[1])
    levels = data.get("levels", False)
    if not isinstance(levels, bool):
        r.problem(f"{where}.levels", f"Expected true or false; got {as_written(levels)}.")
        levels = False
    if levels and not (
        source.level_low or source.level_high or destination.level_low or destination.level_high
    ):
        r.problem(
            f"{where}.levels",
            "The static head varies by the level ranges: give source.level_low and level_high "
            "(or the destination's).",
        )
    grade = (
        r.text(data, "pump_grade", where, "", tuple(catalog.iso_9906_grades()))
        if "pump_grade" in data
        else ""
    )
    if grade and pump.curve is None:
        r.problem(
            f"{where}.pump_grade", "The acceptance grade moves the pump curve: give [pump.curve]."
        )
    fitting_k = r.quantity(data, "fitting_k", where, "dimensionless", fraction=True)
    if fitting_k is not None and fitting_k.value >= 1.0:
        r.problem(
            f"{where}.fitting_k",
            "Give the uncertainty of the K values as a fraction below 1, such as 0.2.",
        )
    return Sensitivity(roughness, temperature, bool(levels), grade, fitting_k)


def _needs_costs(r: _Reader, op: Operation) -> None:
    """A study ranks by life-cycle cost: the energy price, hours, life and rate are needed."""
    missing = [
        key
        for key, value in (
            ("operation.energy_price", op.energy_price),
            ("operation.life_years", op.life_years),
            ("operation.discount_rate", op.discount_rate),
        )
        if value is None
    ]
    if not (op.hours_per_year or op.profile or op.annual_volume):
        missing.append("operation.hours_per_year (or a profile or annual volume)")
    if missing:
        r.problem(
            "study",
            "Offers and sizes are ranked by life-cycle cost, which needs "
            + ", ".join(missing)
            + ".",
        )


def _candidates(
    r: _Reader, data: dict[str, Any], pump_data: dict[str, Any], base: Pump
) -> tuple[Candidate, ...]:
    rows = data.get("candidate")
    if not isinstance(rows, list) or not rows or not all(isinstance(x, dict) for x in rows):
        r.problem(
            "study.candidate",
            "Give each pump offered as a [[study.candidate]] table with its id, its "
            "capital_cost (price) and the [pump] keys it changes (its curve, speed, count...).",
        )
        return ()
    if len(rows) > MAX_CANDIDATES:
        r.problem("study.candidate", f"At most {MAX_CANDIDATES} candidates; got {len(rows)}.")
        return ()
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
        capital = r.quantity(row, "capital_cost", where, "dimensionless")
        upkeep = r.quantity(row, "annual_maintenance", where, "dimensionless")
        drive = r.quantity(row, "drive_efficiency", where, "dimensionless", fraction=True)
        for key, cost in (("capital_cost", capital), ("annual_maintenance", upkeep)):
            if cost is not None and cost.value < 0.0:
                r.problem(f"{where}.{key}", "A cost cannot be negative.")
        own = {key: value for key, value in row.items() if key not in _COST_KEYS}
        merged = {k: v for k, v in pump_data.items() if k not in own} | own
        pump = _pump(r, merged, where)
        if pump is None:
            continue
        # What the candidate does not set is the [pump] table's, named as it was entered.
        carried = {
            name: getattr(base, name)
            for name, keys in _FIELD_KEYS.items()
            if not any(key in own for key in keys)
        }
        candidates.append(Candidate(ident, title, replace(pump, **carried), capital, upkeep, drive))
    return tuple(candidates)


def _pipe_sizes(r: _Reader, raw: Any, pipes: tuple[Pipe, ...]) -> tuple[SizeStudy, ...]:
    """``study.pipe_size``: groups of pipes, each with the sizes it may take and their cost."""
    if not isinstance(raw, list) or not raw or not all(isinstance(x, dict) for x in raw):
        r.problem(
            "study.pipe_size",
            'Give each main to size as a [[study.pipe_size]] table: pipes = ["D1", "D2"] and '
            "sizes = [{ nominal_size, schedule (or inner_diameter), cost_per_length }, ...].",
        )
        return ()
    by_id = {p.id: p for p in pipes}
    taken: set[str] = set()
    out = []
    for n, group in enumerate(raw, start=1):
        where = f"study.pipe_size[{n}]"
        r.known_keys(group, where, {"pipes", "sizes"})
        names = group.get("pipes")
        if not isinstance(names, list) or not names or not all(isinstance(x, str) for x in names):
            r.problem(f"{where}.pipes", 'Name the pipes that change together, such as ["D1"].')
            continue
        unknown = [x for x in names if x not in by_id]
        if unknown:
            r.problem(f"{where}.pipes", f"No pipe has the id {', '.join(unknown)}.")
            continue
        again = [x for x in names if x in taken]
        if again:
            r.problem(f"{where}.pipes", f"{', '.join(again)} is already in another size study.")
        taken |= set(names)
        rows = group.get("sizes")
        if (
            not isinstance(rows, list)
            or len(rows) < 2
            or not all(isinstance(x, dict) for x in rows)
        ):
            r.problem(f"{where}.sizes", "Give at least two sizes to compare, each a table.")
            continue
        if len(rows) > MAX_SIZES:
            r.problem(f"{where}.sizes", f"At most {MAX_SIZES} sizes; got {len(rows)}.")
            continue
        sizes = []
        for k, row in enumerate(rows, start=1):
            at = f"{where}.sizes[{k}]"
            r.known_keys(row, at, _SIZE_KEYS)
            sources: dict[str, str] = {}
            # A catalog size of the family its material names (steel by default).
            bore, wall = _catalog_diameter(r, row, at, sources)
            if bore is None and "nominal_size" not in row:
                bore = r.quantity(
                    row, "inner_diameter", at, "diameter", required=True, positive=True
                )
            cost = r.quantity(row, "cost_per_length", at, "dimensionless", required=True)
            if cost is not None and cost.value < 0.0:
                r.problem(f"{at}.cost_per_length", "A cost cannot be negative.")
            elif cost is not None:  # currency per metre of pipe
                cost = Given(cost.value, "1/m", cost.key)
            if bore is None or cost is None:
                continue
            label = (
                f"NPS/DN {row['nominal_size']}, {row['schedule']}"
                if "nominal_size" in row
                else f"{bore.value * 1e3:.1f} mm bore"
            )
            sizes.append(PipeSize(label, bore, cost, wall, sources))
        out.append(SizeStudy(tuple(names), tuple(sizes)))
    return tuple(out)
