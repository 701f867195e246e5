"""The [project] and [report] tables: title block, revisions, the unit system of the report,
the report's own purpose, exclusions and cautions.
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import (
    Project,
)
from calcreport.model.sections.reader import _Reader
from calcreport.units import as_written

UNIT_SYSTEMS = ("SI", "US")
_REPORT_KEYS = {"purpose", "exclusions", "cautions"}
_REVISION_KEYS = {"revision", "date", "description", "prepared_by", "checked_by"}
_PROJECT_KEYS = {
    "title",
    "client",
    "calc_id",
    "revision",
    "date",
    "prepared_by",
    "checked_by",
    "units",
}


def _project(r: _Reader, data: dict[str, Any], report: dict[str, Any], revisions: Any) -> Project:
    r.known_keys(data, "project", _PROJECT_KEYS)
    defaults = Project()
    values = {
        key: r.text(data, key, "project", getattr(defaults, key))
        for key in _PROJECT_KEYS
        if key != "units"
    }
    units = r.text(data, "units", "project", "SI", UNIT_SYSTEMS)
    r.known_keys(report, "report", _REPORT_KEYS)
    lists = {key: _texts(r, report, key) for key in ("exclusions", "cautions")}
    history = []
    if revisions is not None:
        if not isinstance(revisions, list) or not all(isinstance(x, dict) for x in revisions):
            r.problem("revision", "Expected [[revision]] tables, one per issued revision.")
        else:
            for i, row in enumerate(revisions, start=1):
                path = f"revision[{i}]"
                r.known_keys(row, path, _REVISION_KEYS)
                history.append({key: r.text(row, key, path, "") for key in sorted(_REVISION_KEYS)})
    return Project(
        units=units,
        purpose=r.text(report, "purpose", "report", ""),
        revisions=tuple(history),
        **lists,
        **values,
    )


def _texts(r: _Reader, data: dict[str, Any], key: str) -> tuple[str, ...]:
    raw = data.get(key, [])
    if not isinstance(raw, list) or not all(isinstance(item, str) for item in raw):
        r.problem(
            f"report.{key}",
            f'Expected an array of sentences, such as {key} = ["..."]; got {as_written(raw)}.',
        )
        return ()
    return tuple(raw)
