"""Limits of the checks: the default or project criterion in SI with its basis and source,
a US report's customary value, the status a limit gives (review or fail), and the
operating states a check runs over.
"""

from __future__ import annotations

from functools import cache
from typing import Any

from calcreport import catalog
from calcreport.model.schema import Model
from calcreport.units import KIND_OF_SI_UNIT, parse, pretty_unit, show


def criterion(model: Model, name: str) -> tuple[float, str, str, bool]:
    """Limit value (SI), basis, reference key, and whether the project set it."""
    given = model.criteria.given.get(name)
    if given is not None:
        return given.value, f"Project criterion criteria.{name}", "input", True
    default = catalog.criteria()[name]
    system = model.project.units if "us_value" in default else "SI"
    basis = default["basis"]
    if system == "US":
        number, unit = default["us_value"].split(" ", 1)
        basis += (
            f". In US units the limit is {number} {pretty_unit(unit)}, {default['us_basis']} "
            f"({default['value']} in SI)"
        )
    return _default_value(name, system), basis, default["reference"], False


@cache
def _default_value(name: str, system: str) -> float:
    """A default limit in SI: in a US report its customary value where the table gives one."""
    default = catalog.criteria()[name]
    return parse(default["us_value" if system == "US" else "value"], default["kind"])


def _say(model: Model, value: float, si_unit: str) -> str:
    """A value for a check's message, in the report's units (``"4.92 ft/s"``)."""
    return show({"value": value, "unit": si_unit}, KIND_OF_SI_UNIT[si_unit], model.project.units, 3)


def _status(ok: bool, project_set: bool) -> str:
    if ok:
        return "pass"
    return "fail" if project_set else "review"


def _shown(model: Model, value: float, si_unit: str, kind: str) -> str:
    """A value for a check's message, in the report's units."""
    from calcreport.units import show

    return show({"value": value, "unit": si_unit}, kind, model.project.units)


def states(results: dict[str, Any]) -> dict[str, dict[str, Any]]:
    """Every operating state of a solve's results: the cases, then the duty-profile points."""
    return {**results["cases"], **results.get("profile_states", {})}
