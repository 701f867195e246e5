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
    "KIND_OF_SI_UNIT",
    "Kind",
    "UnitProblem",
    "as_written",
    "coherent_us",
    "display_unit",
    "expected",
    "fmt",
    "kind_of",
    "parse",
    "pretty_unit",
    "registry",
    "show",
    "show_keyed",
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
    # Magnitudes (SI) beyond any real pump system: a nonzero value outside them is refused.
    bounds: tuple[float, float] = (1e-12, 1e12)


KINDS: dict[str, Kind] = {
    k.name: k
    for k in (
        Kind("length", "m", "m", "ft", '"6 m", "20 ft"', (1e-6, 1e6)),
        Kind("diameter", "m", "mm", "in", '"154.1 mm", "6.065 in"', (1e-4, 100.0)),
        Kind("roughness", "m", "mm", "in", '"0.045 mm", "0.0018 in"', (1e-9, 1.0)),
        Kind("flow", "m^3/s", "L/s", "gpm", '"22 L/s", "350 gpm", "80 m^3/h"', (1e-9, 1e4)),
        Kind("pressure", "Pa", "kPa", "psi", '"35 kPa", "5 psi", "0.5 bar"', (1e-3, 1e11)),
        Kind("modulus", "Pa", "GPa", "ksi", '"207 GPa", "30000 ksi"', (1e5, 1e13)),
        Kind("temperature", "K", "degC", "degF", '"15 degC", "68 degF"', (1.0, 5000.0)),
        Kind(
            "temperature_difference",
            "K",
            "K",
            "delta_degF",
            '"8 K", "15 delta_degF"',
            (1e-6, 1000.0),
        ),
        Kind("density", "kg/m^3", "kg/m^3", "lb/ft^3", '"880 kg/m^3", "62.3 lb/ft^3"', (1e-3, 1e5)),
        Kind("viscosity", "Pa*s", "mPa*s", "cP", '"0.25 Pa*s", "1.2 cP"', (1e-7, 1e5)),
        Kind("velocity", "m/s", "m/s", "ft/s", '"1.8 m/s", "6 ft/s"', (1e-6, 1e4)),
        Kind("power", "W", "kW", "hp", '"15 kW", "20 hp"', (1e-3, 1e10)),
        Kind("energy", "J", "kWh", "kWh", '"1200 kWh"', (1e-3, 1e18)),
        Kind("volume", "m^3", "m^3", "gallon", '"250000 m^3", "2 Mgallon"', (1e-9, 1e13)),
        Kind("specific_energy", "J/m^3", "kWh/m^3", "kWh/kgal", '"0.25 kWh/m^3"', (1e-6, 1e12)),
        Kind("speed", "1/s", "rpm", "rpm", '"2950 rpm"', (1e-3, 1e4)),
        Kind("time", "s", "s", "s", '"2 s"', (1e-6, 1e10)),
        Kind("angle", "rad", "deg", "deg", '"30 deg"', (1e-9, 10.0)),
        Kind("dimensionless", "", "", "", '0.72 or "72 %"', (1e-12, 1e6)),
    )
}

_DIMENSION_OF = {
    "length": "[length]",
    "diameter": "[length]",
    "roughness": "[length]",
    "flow": "[length] ** 3 / [time]",
    "pressure": "[mass] / [length] / [time] ** 2",
    "modulus": "[mass] / [length] / [time] ** 2",
    "temperature": "[temperature]",
    "temperature_difference": "[temperature]",
    "density": "[mass] / [length] ** 3",
    "viscosity": "[mass] / [length] / [time]",
    "velocity": "[length] / [time]",
    "power": "[length] ** 2 * [mass] / [time] ** 3",
    "energy": "[length] ** 2 * [mass] / [time] ** 2",
    "volume": "[length] ** 3",
    "specific_energy": "[mass] / [length] / [time] ** 2",
    "speed": "1 / [time]",
    "time": "[time]",
    "angle": "dimensionless",
    "dimensionless": "dimensionless",
}

# A quantity is a number, then a unit expression in our own small grammar, read before
# the unit library sees it (the library would evaluate arithmetic such as "9**9**9"):
# unit names, "*", "/", "·", parentheses, "1" (as in "1/s") and integer exponents.
MAX_QUANTITY_CHARS = 120
_NUMBER = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?")
_UNIT_TOKEN = re.compile(
    r"\s+|[A-Za-z°µΩ_][A-Za-z0-9_°µΩ²³]*|(?:\^|\*\*)[+-]?\d{1,2}(?![\d.])|[*/·()%]|1(?![\d.])"
)
_UNIT_DEPTH = 4  # parentheses
# A leading "nan" or "inf": pint or float() would read these, the input must not.
_NOT_FINITE = re.compile(r"^\s*[+-]?(?:nan|inf(?:inity)?)\b", re.IGNORECASE)

_HINTS = {
    "psia": "surface pressures are read as gauge and station pressure as absolute: write psi",
    "bara": "surface pressures are read as gauge and station pressure as absolute: write bar",
    "C": 'write degrees Celsius as "degC"; C is the coulomb',
    "F": 'write degrees Fahrenheit as "degF"; F is the farad',
    "°C": 'write degrees Celsius as "degC"',
    "°F": 'write degrees Fahrenheit as "degF"',
    "lpm": 'write litres per minute as "L/min"',
}


# Exact conversions of the units an input commonly uses (NIST SP 811), so that
# a typical solve never builds pint's registry; anything else goes to pint.
# unit -> (kind it measures, factor to SI, offset added after the factor).
_INCH = 0.0254
_FOOT = 0.3048
_GALLON = 3.785411784e-3
_POUND_FORCE = 0.45359237 * 9.80665
_PSI = _POUND_FORCE / _INCH**2
_FAST: dict[str, tuple[str, float, float]] = {
    "m": ("length", 1.0, 0.0),
    "mm": ("length", 1e-3, 0.0),
    "cm": ("length", 1e-2, 0.0),
    "km": ("length", 1e3, 0.0),
    "in": ("length", _INCH, 0.0),
    "inch": ("length", _INCH, 0.0),
    "ft": ("length", _FOOT, 0.0),
    "foot": ("length", _FOOT, 0.0),
    "L/s": ("flow", 1e-3, 0.0),
    "l/s": ("flow", 1e-3, 0.0),
    "m^3/s": ("flow", 1.0, 0.0),
    "m^3/h": ("flow", 1.0 / 3600.0, 0.0),
    "m^3/hr": ("flow", 1.0 / 3600.0, 0.0),
    "L/min": ("flow", 1e-3 / 60.0, 0.0),
    "gpm": ("flow", _GALLON / 60.0, 0.0),
    "gal/min": ("flow", _GALLON / 60.0, 0.0),
    "cfs": ("flow", _FOOT**3, 0.0),
    "Pa": ("pressure", 1.0, 0.0),
    "kPa": ("pressure", 1e3, 0.0),
    "MPa": ("pressure", 1e6, 0.0),
    "GPa": ("pressure", 1e9, 0.0),
    "ksi": ("pressure", 1e3 * _PSI, 0.0),
    "bar": ("pressure", 1e5, 0.0),
    "mbar": ("pressure", 1e2, 0.0),
    "psi": ("pressure", _PSI, 0.0),
    "psig": ("pressure", _PSI, 0.0),
    "barg": ("pressure", 1e5, 0.0),
    "kPag": ("pressure", 1e3, 0.0),
    "K": ("temperature", 1.0, 0.0),
    "degC": ("temperature", 1.0, 273.15),
    "degF": ("temperature", 5.0 / 9.0, 459.67 * 5.0 / 9.0),
    "kg/m^3": ("density", 1.0, 0.0),
    "Pa*s": ("viscosity", 1.0, 0.0),
    "mPa*s": ("viscosity", 1e-3, 0.0),
    "cP": ("viscosity", 1e-3, 0.0),
    "m/s": ("velocity", 1.0, 0.0),
    "ft/s": ("velocity", _FOOT, 0.0),
    "W": ("power", 1.0, 0.0),
    "kW": ("power", 1e3, 0.0),
    "hp": ("power", 550.0 * _FOOT * _POUND_FORCE, 0.0),
    "rpm": ("speed", 1.0 / 60.0, 0.0),
    "percent": ("dimensionless", 0.01, 0.0),
    "m^3": ("volume", 1.0, 0.0),
    "kWh": ("energy", 3.6e6, 0.0),
    "J": ("energy", 1.0, 0.0),
    "kWh/m^3": ("specific_energy", 3.6e6, 0.0),
    "kWh/kgal": ("specific_energy", 3.6e6 / (1000.0 * _GALLON), 0.0),
    "s": ("time", 1.0, 0.0),
    "h": ("time", 3600.0, 0.0),
    "deg": ("angle", math.pi / 180.0, 0.0),
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
    give = f"give {expected(kind)}."
    shown = as_written(value)
    if isinstance(value, bool):
        raise UnitProblem(f"Expected {expected(kind)}, got the boolean {shown}.")
    if isinstance(value, int | float):
        if isinstance(value, int) and abs(value) > 10**15:
            raise UnitProblem(f"The number {shown[:30]}… is far too large; {give}")
        if not math.isfinite(value):
            raise UnitProblem(f"The value {shown} is not a finite number; {give}")
        if kind != "dimensionless":
            raise UnitProblem(f"The bare number {shown} has no unit; {give}")
        return _bounded(float(value), kind, shown, give)
    if not isinstance(value, str):
        raise UnitProblem(f"Expected {expected(kind)}, got {_noun(value)} {shown}.")
    if len(value) > MAX_QUANTITY_CHARS:
        raise UnitProblem(
            f"The value {as_written(value[:40])}… has {len(value):,} characters; a quantity "
            f"has at most {MAX_QUANTITY_CHARS}; {give}"
        )
    text = value.strip()
    if _NOT_FINITE.match(text):
        raise UnitProblem(f"The value {shown} is not a finite number; {give}")
    match = _NUMBER.match(text)
    if not match:
        raise UnitProblem(f"The value {shown} does not start with a number; {give}")
    number = float(match.group(0))
    unit = text[match.end() :].strip()
    if kind == "pressure":
        unit = _gauge_unit(unit, shown, give)
    if re.match(r"^[,_]\d", unit):
        raise UnitProblem(
            f"The value {shown} cannot be read (write the number without thousands "
            f"separators); {give}"
        )
    _check_unit_grammar(unit, shown, give)
    unit = unit.replace("%", "percent")
    if not math.isfinite(number):
        raise UnitProblem(f"The value {shown} is not a finite number; {give}")
    if unit == "" and kind != "dimensionless":
        raise UnitProblem(f"The value {shown} has no unit; {give}")
    if unit == "":
        return _bounded(number, kind, shown, give)
    if kind == "temperature_difference" and unit in ("degC", "degF", "°C", "°F"):
        raise UnitProblem(
            f"{shown} reads as a temperature, not a difference of temperatures; write it in "
            f'K, delta_degC or delta_degF, such as "8 K"'
        )
    fast = _FAST.get(unit)
    if fast is not None and _DIMENSION_OF[fast[0]] == _DIMENSION_OF[kind]:
        converted = number * fast[1] + fast[2]
        if not math.isfinite(converted):
            raise UnitProblem(f"The value {shown} is out of range; {give}")
        return _bounded(converted, kind, shown, give)
    ureg = registry()
    import pint

    hint = _HINTS.get(unit, "")
    if re.match(r"^[,_]\d", unit):
        hint = "write the number without thousands separators"
    hint = f" ({hint})" if hint else ""
    try:
        quantity = ureg.Quantity(number, unit)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError) as exc:
        raise UnitProblem(
            f'The unit "{unit}" in {shown} is not a known unit{hint}; {give}'
        ) from exc
    except Exception as exc:  # pint's parser raises several types for garbage
        raise UnitProblem(f'The unit "{unit}" in {shown} cannot be read{hint}; {give}') from exc
    if not _has_kind(quantity, kind):
        raise UnitProblem(
            f"The value {shown} is {_describe(quantity)}, not {_article(kind)}{hint}; {give}"
        )
    if kind == "temperature" and any(
        name.startswith("delta_") for name, _ in quantity.unit_items()
    ):
        raise UnitProblem(
            f"The value {shown} is a temperature difference, not a temperature; {give}"
        )
    if kind == "speed":
        result = quantity.to("turn / second").magnitude
    else:
        result = quantity.to(spec.si or "dimensionless").magnitude
    result = float(result)
    if not math.isfinite(result):
        raise UnitProblem(f"The value {shown} is out of range; {give}")
    return _bounded(result, kind, shown, give)


def _bounded(value: float, kind: str, shown: str, give: str) -> float:
    """``value`` when zero or of a magnitude within the kind's bounds; else a problem."""
    low, high = KINDS[kind].bounds
    if value != 0.0 and not low <= abs(value) <= high:
        si = KINDS[kind].si
        unit = f" {si}" if si else ""
        raise UnitProblem(
            f"The value {shown} is beyond any real pump system: a nonzero {kind.replace('_', ' ')} "
            f"lies between {low:g} and {high:g}{unit} in magnitude; {give}"
        )
    return value


# The marks the report prints on pressures: gauge is what the input takes; an absolute
# value needs the site's barometric pressure taken away first.
_GAUGE_MARK = re.compile(r"^(?P<unit>[A-Za-z]+)\s*\(\s*(?:g|gauge)\s*\)$", re.IGNORECASE)
_ABSOLUTE_MARK = re.compile(
    r"^(?P<unit>[A-Za-z]+?)\s*(?:\(\s*(?:a|abs|absolute)\s*\)|a)$", re.IGNORECASE
)


def _gauge_unit(unit: str, shown: str, give: str) -> str:
    """The pressure unit with a gauge mark taken off; an absolute mark refused, saying why."""
    gauge = _GAUGE_MARK.match(unit)
    if gauge and gauge["unit"] in _FAST:
        return gauge["unit"]
    absolute = _ABSOLUTE_MARK.match(unit)
    if absolute and absolute["unit"] in ("Pa", "kPa", "MPa", "bar", "psi", "mbar"):
        raise UnitProblem(
            f"The value {shown} is an absolute pressure; the input takes pressures on liquid "
            f"surfaces as gauge (site.station_pressure as absolute, without a mark): write "
            f"the gauge value, the absolute less the barometric pressure, in {absolute['unit']} "
            f"with no mark; {give}"
        )
    return unit


def _check_unit_grammar(unit: str, shown: str, give: str) -> None:
    """Refuse a unit expression outside the grammar (linear in its length)."""
    depth = position = 0
    while position < len(unit):
        token = _UNIT_TOKEN.match(unit, position)
        if token is None:
            raise UnitProblem(
                f'The unit "{unit}" in {shown} cannot be read: write unit names joined by * '
                f'and / with whole-number powers, such as "m^3/s" or "kg/m^3"; {give}'
            )
        depth += {"(": 1, ")": -1}.get(token.group(0), 0)
        if not 0 <= depth <= _UNIT_DEPTH:
            raise UnitProblem(f'The parentheses of the unit "{unit}" in {shown} do not match.')
        position = token.end()
    if depth:
        raise UnitProblem(f'The parentheses of the unit "{unit}" in {shown} do not match.')


def as_written(value: Any) -> str:
    """``value`` as it would be written in TOML: ``"20 m"``, ``true``, ``[1, 2]``."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str):
        escaped = value.replace("\\", "\\\\").replace('"', '\\"')
        return f'"{escaped}"'
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, int):
        return str(value)
    if isinstance(value, list):
        return "[" + ", ".join(as_written(v) for v in value) + "]"
    if isinstance(value, dict):
        items = ", ".join(f"{k} = {as_written(v)}" for k, v in value.items())
        return "{ " + items + " }" if items else "{}"
    if hasattr(value, "isoformat"):
        return str(value.isoformat())
    return str(value)


def _noun(value: Any) -> str:
    if isinstance(value, list):
        return "an array"
    if isinstance(value, dict):
        return "a table"
    if hasattr(value, "isoformat"):
        return "a date or time"
    return "the value"


def expected(kind: str) -> str:
    """A phrase saying what a value of ``kind`` looks like, with examples."""
    spec = KINDS[kind]
    head, sep, tail = spec.examples.rpartition(", ")
    examples = f"{head} or {tail}" if sep else spec.examples
    if spec.name == "dimensionless":
        return f"a plain number such as {examples}"
    return f"a {spec.name} with its unit, such as {examples}"


def _article(kind: str) -> str:
    return "a plain number" if kind == "dimensionless" else f"a {kind}"


def _has_kind(quantity: Any, kind: str) -> bool:
    if _DIMENSION_OF[kind] == "dimensionless":  # plain numbers and angles
        return bool(quantity.dimensionless)
    return bool(quantity.check(_DIMENSION_OF[kind]))


def _describe(quantity: Any) -> str:
    for name in _DIMENSION_OF:
        if _has_kind(quantity, name):
            return _article(name)
    return f"a quantity of dimension {quantity.dimensionality}"


def display_unit(kind: str, system: str) -> str:
    """The unit the report prints for ``kind`` in ``system`` ("SI" or "US")."""
    spec = KINDS[kind]
    return spec.us_display if system == "US" else spec.si_display


def to_display(value: float, si_unit: str, unit: str) -> float:
    """Convert an SI float in ``si_unit`` to ``unit`` for display."""
    if si_unit == unit:
        return value
    fast = _FAST.get(unit)
    if fast is not None and KINDS[fast[0]].si == si_unit:
        return (value - fast[2]) / fast[1]
    ureg = registry()
    return float(ureg.Quantity(value, si_unit or "dimensionless").to(unit).magnitude)


# The coherent British gravitational (BG) units of the SI units the equations take: foot,
# slug, second and pound-force (lbf = slug·ft/s²), so that a US substituted line is its own
# arithmetic with no conversion factor hidden in it. Factors from the exact definitions
# 1 ft = 0.3048 m, 1 lb = 0.45359237 kg and g_n = 9.80665 m/s² (NIST SP 811, appendix B):
# BG value = SI value / factor.
_FT, _LBF = _FOOT, _POUND_FORCE  # m, N
_SLUG = _LBF / _FT  # kg (lbf·s²/ft)
_BG = {
    "m": ("ft", _FT),
    "1/m": ("1/ft", 1.0 / _FT),
    "m^2": ("ft²", _FT**2),
    "m^3": ("ft³", _FT**3),
    "m/s": ("ft/s", _FT),
    "m/s^2": ("ft/s²", _FT),
    "m^2/s": ("ft²/s", _FT**2),
    "m^3/s": ("ft³/s", _FT**3),
    "kg/m^3": ("slug/ft³", _SLUG / _FT**3),
    "Pa": ("lbf/ft²", _LBF / _FT**2),
    "Pa*s": ("lbf·s/ft²", _LBF / _FT**2),
    "W": ("ft·lbf/s", _LBF * _FT),
    "J": ("ft·lbf", _LBF * _FT),
    "J/m^3": ("ft·lbf/ft³", _LBF / _FT**2),
    "J/kWh": ("ft·lbf/kWh", _LBF * _FT),
    "J/(kg*K)": ("ft·lbf/(slug·°R)", _LBF * _FT / (_SLUG / 1.8)),
    "K": ("°R", 1.0 / 1.8),
    "delta_degC": ("°F (difference)", 1.0 / 1.8),
}


def coherent_us(si_unit: str) -> tuple[str, float]:
    """The coherent BG unit of ``si_unit`` as printed and its size in ``si_unit``
    (BG value = SI value / size); a unit with no BG counterpart (s, 1/s, rad, none) is its
    own."""
    return _BG.get(si_unit, (pretty_unit(si_unit), 1.0))


# The kind of a trace quantity from its SI unit; a length is a diameter or a roughness and a
# pressure a modulus where its key says so (:func:`kind_of`).
KIND_OF_SI_UNIT = {
    "m": "length",
    "m^3/s": "flow",
    "Pa": "pressure",
    "K": "temperature",
    "delta_degC": "temperature_difference",
    "1/s": "speed",
    "s": "time",
    "kg/m^3": "density",
    "Pa*s": "viscosity",
    "m/s": "velocity",
    "W": "power",
    "J": "energy",
    "J/m^3": "specific_energy",
    "m^3": "volume",
}
_KIND_BY_KEY = (
    ("m", ("diameter", "thickness", "wall"), "diameter"),
    ("m", ("roughness",), "roughness"),
    ("Pa", ("modulus",), "modulus"),
)
# Pressures are gauge except the absolute ones the atmosphere and the liquid give.
_ABSOLUTE_KEYS = ("barometric", "station_pressure", "vapor_pressure", "absolute")


def kind_of(si_unit: str, key: str = "") -> str | None:
    """The kind of a trace quantity in ``si_unit`` whose key is ``key`` (None: no kind)."""
    name = key.rsplit(".", 1)[-1].lower()
    for unit, words, kind in _KIND_BY_KEY:
        if si_unit == unit and any(w in name for w in words):
            return kind
    return KIND_OF_SI_UNIT.get(si_unit)


def show_keyed(value: float, si_unit: str, key: str, system: str, sig: int = 4) -> str:
    """A trace value named by ``key`` as printed in ``system``, pressures marked gauge or
    absolute: ``"45.00 psi(g)"``, ``"119028 kWh"``; a unit of no kind prints as it is."""
    kind = kind_of(si_unit, key)
    if kind is None:
        return f"{fmt(value, sig)} {pretty_unit(si_unit)}".strip()
    out = show({"value": value, "unit": si_unit}, kind, system, sig)
    if kind == "pressure":
        absolute = any(word in key.lower() for word in _ABSOLUTE_KEYS)
        out += ("a" if system == "US" else "(abs)") if absolute else "(g)"
    return out


def fmt(x: float, sig: int = 5) -> str:
    """Format a number to ``sig`` significant figures for a printed substitution.

    Plain notation from 1e-4 to 1e7 (integers of six or seven digits are
    printed whole rather than rounded), scientific notation outside.
    """
    if isinstance(x, bool):
        return str(x)
    if x == 0 or not math.isfinite(x):
        return "0" if x == 0 else str(x)
    magnitude = math.floor(math.log10(abs(x)))
    if magnitude >= sig and magnitude < 7:
        return f"{x:.0f}"
    if -4 <= magnitude < 7:
        decimals = max(0, sig - 1 - magnitude)
        text = f"{x:.{decimals}f}"
        return text
    return f"{x:.{sig - 1}e}"


# A difference of temperatures prints as K in SI (1 K = 1 °C of difference) and as °F of
# difference in US units.
_PRETTY = (
    ("delta_degC", "K"),
    ("delta_degF", "°F (difference)"),
    ("**", "^"),
    ("^3", "³"),
    ("^2", "²"),
    ("*", "·"),
    ("degC", "°C"),
    ("degF", "°F"),
)


@cache
def pretty_unit(unit: str) -> str:
    """A unit string as printed: ``m^3/s`` → ``m³/s``, ``Pa*s`` → ``Pa·s``."""
    if unit in ("", "-", "dimensionless"):
        return ""
    for old, new in _PRETTY:
        unit = unit.replace(old, new)
    return unit


def show(q: dict[str, Any], kind: str, system: str, sig: int = 4) -> str:
    """A trace quantity ``{"value", "unit"}`` as printed in ``system``: ``"32.50 m"``."""
    unit = display_unit(kind, system)
    return f"{fmt(to_display(q['value'], q['unit'], unit), sig)} {pretty_unit(unit)}".strip()
