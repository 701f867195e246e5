"""The one unit registry, quantity parsing for input keys, display units.

Input quantities are strings such as ``"30 L/s"``, ``"250 gpm"``,
``"15 degC"`` or ``"0.0015 in"``. :func:`parse` turns one into an SI float
after checking it against the kind of quantity its key expects; physics
never sees pint. :data:`KINDS` lists the kinds with their SI unit and the
units the SI and US customary reports print.

The registry is built once, on first use, from pint's default definitions
plus the few trade units in ``units.txt``.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache
from pathlib import Path
from typing import Any

__all__ = [
    "KINDS",
    "Kind",
    "UnitProblem",
    "display_unit",
    "expected",
    "parse",
    "registry",
    "to_display",
]


@dataclass(frozen=True)
class Kind:
    """A kind of quantity: its SI unit and the units each report prints."""

    name: str
    si: str
    si_display: str
    us_display: str
    examples: str


KINDS: dict[str, Kind] = {
    k.name: k
    for k in (
        Kind("length", "m", "m", "ft", '"6 m", "20 ft"'),
        Kind("diameter", "m", "mm", "in", '"154.1 mm", "6.065 in"'),
        Kind("roughness", "m", "mm", "in", '"0.045 mm", "0.0018 in"'),
        Kind("flow", "m^3/s", "L/s", "gpm", '"22 L/s", "350 gpm", "80 m^3/h"'),
        Kind("pressure", "Pa", "kPa", "psi", '"35 kPa", "5 psi", "0.5 bar"'),
        Kind("temperature", "K", "degC", "degF", '"15 degC", "68 degF"'),
        Kind("density", "kg/m^3", "kg/m^3", "lb/ft^3", '"880 kg/m^3", "62.3 lb/ft^3"'),
        Kind("viscosity", "Pa*s", "mPa*s", "cP", '"0.25 Pa*s", "1.2 cP"'),
        Kind("velocity", "m/s", "m/s", "ft/s", '"1.8 m/s", "6 ft/s"'),
        Kind("power", "W", "kW", "hp", '"15 kW", "20 hp"'),
        Kind("energy", "J", "kWh", "kWh", '"1200 kWh"'),
        Kind("volume", "m^3", "m^3", "gallon", '"250000 m^3", "2 Mgallon"'),
        Kind("speed", "1/s", "rpm", "rpm", '"2950 rpm"'),
        Kind("time", "s", "s", "s", '"2 s"'),
        Kind("dimensionless", "", "", "", "0.72 or \"72 %\""),
    )
}

_DIMENSION_OF = {
    "length": "[length]",
    "diameter": "[length]",
    "roughness": "[length]",
    "flow": "[length] ** 3 / [time]",
    "pressure": "[mass] / [length] / [time] ** 2",
    "temperature": "[temperature]",
    "density": "[mass] / [length] ** 3",
    "viscosity": "[mass] / [length] / [time]",
    "velocity": "[length] / [time]",
    "power": "[length] ** 2 * [mass] / [time] ** 3",
    "energy": "[length] ** 2 * [mass] / [time] ** 2",
    "volume": "[length] ** 3",
    "speed": "1 / [time]",
    "time": "[time]",
    "dimensionless": "dimensionless",
}

# A leading number, then the unit expression (may be empty).
_NUMBER = re.compile(r"^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")

_HINTS = {
    "psia": "surface pressures are read as gauge and station pressure as absolute: write psi",
    "bara": "surface pressures are read as gauge and station pressure as absolute: write bar",
    "C": 'write degrees Celsius as "degC"',
    "F": 'write degrees Fahrenheit as "degF" (F is the farad)',
    "°C": 'write degrees Celsius as "degC"',
    "°F": 'write degrees Fahrenheit as "degF"',
    "lpm": 'write litres per minute as "L/min"',
}


@cache
def registry() -> Any:
    """The package's pint UnitRegistry, built on first use."""
    import pint

    ureg = pint.UnitRegistry(cache_folder=None)
    ureg.load_definitions(str(Path(__file__).with_name("units.txt")))
    return ureg


class UnitProblem(ValueError):
    """A quantity string that cannot be read for its key (message says why)."""


def parse(value: Any, kind: str) -> float:
    """Parse an input value of ``kind`` to a float in the kind's SI unit.

    Strings carry a number and a unit (``"30 L/s"``); a bare number is
    accepted only for dimensionless kinds, and a dimensionless string may
    be a percentage (``"72 %"``). Raises :class:`UnitProblem` with a full
    sentence when the value is not a finite quantity of the expected kind.
    """
    spec = KINDS[kind]
    if isinstance(value, bool):
        raise UnitProblem(f"expected {expected(kind)}, got the boolean {value!r}")
    if isinstance(value, int | float):
        if kind != "dimensionless":
            raise UnitProblem(
                f"a bare number ({value!r}) has no unit; expected {expected(kind)}"
            )
        number = float(value)
        unit = ""
    elif isinstance(value, str):
        match = _NUMBER.match(value)
        if not match:
            raise UnitProblem(
                f"{value!r} does not start with a number; expected {expected(kind)}"
            )
        number = float(match.group(1))
        unit = match.group(2).replace("%", "percent")
    else:
        raise UnitProblem(f"expected {expected(kind)}, got {type(value).__name__} {value!r}")
    if not math.isfinite(number):
        raise UnitProblem(f"{value!r} is not a finite number")
    if unit == "" and kind != "dimensionless":
        raise UnitProblem(f"{value!r} has no unit; expected {expected(kind)}")
    if unit == "":
        return number
    ureg = registry()
    import pint

    try:
        quantity = ureg.Quantity(number, unit)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError) as exc:
        hint = _HINTS.get(unit, "")
        raise UnitProblem(
            f"unknown unit {unit!r} in {value!r}" + (f" ({hint})" if hint else "")
            + f"; expected {expected(kind)}"
        ) from exc
    except Exception as exc:  # pint's parser raises several types for garbage
        raise UnitProblem(f"cannot read the unit {unit!r} in {value!r}") from exc
    if not _has_kind(quantity, kind):
        raise UnitProblem(
            f"{value!r} is a {_describe(quantity)}, not a {kind}; expected {expected(kind)}"
        )
    if kind == "speed":
        result = quantity.to("turn / second").magnitude
    else:
        result = quantity.to(spec.si or "dimensionless").magnitude
    result = float(result)
    if not math.isfinite(result):
        raise UnitProblem(f"{value!r} is out of range")
    return result


def expected(kind: str) -> str:
    """A phrase saying what a value of ``kind`` looks like, with examples."""
    spec = KINDS[kind]
    if spec.name == "dimensionless":
        return f"a plain number such as {spec.examples}"
    return f"a {spec.name} with its unit, such as {spec.examples}"


def _has_kind(quantity: Any, kind: str) -> bool:
    if kind == "dimensionless":
        return bool(quantity.dimensionless)
    return bool(quantity.check(_DIMENSION_OF[kind]))


def _describe(quantity: Any) -> str:
    for name in _DIMENSION_OF:
        if _has_kind(quantity, name):
            return name
    return f"quantity of dimension {quantity.dimensionality}"


def display_unit(kind: str, system: str) -> str:
    """The unit the report prints for ``kind`` in ``system`` ("SI" or "US")."""
    spec = KINDS[kind]
    return spec.us_display if system == "US" else spec.si_display


def to_display(value: float, si_unit: str, unit: str) -> float:
    """Convert an SI float in ``si_unit`` to ``unit`` for display."""
    if si_unit == unit:
        return value
    ureg = registry()
    if si_unit == "1/s" and unit == "rpm":
        return value * 60.0
    return float(ureg.Quantity(value, si_unit or "dimensionless").to(unit).magnitude)
