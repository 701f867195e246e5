"""One definition per equation: the function, its printed form and its units.

A physics function is a plain function on SI floats (or numpy arrays).
The ``@equation`` decorator attaches what the trace needs to print and to
recompute it, without changing the function:

- ``symbol``: the quantity computed, e.g. ``"Re"``;
- ``text``: the equation in plain Unicode, e.g. ``"Re = ρ·v·D/μ"``;
- ``latex``: the same in matplotlib mathtext, for the PDF;
- ``substitute``: the right-hand side with ``{name}`` placeholders that the
  trace fills with the argument values and units (``{name:unit}`` writes the value in
  ``unit``; ``{g}`` and the other names of :data:`CONSTANTS` write a constant), or a
  callable ``(values, result, write) -> str`` for equations that print more than one
  line (Colebrook prints both sides of the implicit equation), ``write`` being a
  :class:`Writer`;
- ``units``: the units the substituted line is written in. ``"coherent"`` (most
  equations): SI, or in a US report the coherent British gravitational units (ft, slug,
  s, lbf), so that the printed numbers multiply out to the printed result in either
  system; ``"display"``: a line that names values rather than working them (a property
  correlation's state, a root found) prints them in the report's units; ``"fixed"``: an
  empirical formula with dimensional constants (Hazen–Williams, metric specific speed)
  prints in the units it is defined in, in either system;
- ``shown_in``: the unit the result is written in when it is not the SI unit (energy
  in kWh);
- ``reference``: a key of ``catalog/references.toml``.

The unit of each parameter and of the result are read from the numpy-style
docstring (``name : float`` followed by a description ending in ``[unit]``),
so the documentation and the trace cannot drift apart; a function whose
docstring lacks a unit for a parameter is refused at import time.

Registered equations are looked up by ``"<module>.<function>"``, e.g.
``"friction.reynolds"``, which is the name the trace records.
"""

from __future__ import annotations

import inspect
import re
import string
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from calcreport.units import (
    KIND_OF_SI_UNIT,
    coherent_us,
    display_unit,
    fmt,
    pretty_unit,
    to_display,
)

__all__ = [
    "CONSTANTS",
    "Equation",
    "Writer",
    "equation",
    "fill",
    "listed",
    "lookup",
    "paired",
    "registered",
]

UNITS = ("coherent", "display", "fixed")

# Constants a substitution writes by name, in SI (value, unit), converted like any value.
CONSTANTS = {
    "g": (9.80665, "m/s^2"),  # standard gravity (CGPM 1901; NIST SP 811)
    "inch": (0.0254, "m"),  # 1 in, for formulas that take a diameter in inches
    "e_crane": (4.5e-5, "m"),  # Crane TP-410's roughness of clean commercial steel
}

_PARAM_LINE = re.compile(r"^(\w+)\s*:\s*\S.*$")
_UNIT_AT_END = re.compile(r"\[([^\[\]]*)\]\s*$")


@dataclass(frozen=True)
class Equation:
    """Metadata of one registered physics equation."""

    name: str
    func: Callable[..., Any]
    symbol: str
    text: str
    latex: str
    substitute: str | Callable[..., str]
    reference: str
    params: dict[str, str]
    unit: str
    units: str = "coherent"
    shown_in: str = ""

    def __call__(self, **kwargs: Any) -> Any:
        return self.func(**kwargs)


_REGISTRY: dict[str, Equation] = {}


def _docstring_units(func: Callable[..., Any]) -> tuple[dict[str, str], str]:
    """Read ``[unit]`` of each parameter and of the return value."""
    doc = inspect.getdoc(func) or ""
    sections: dict[str, list[str]] = {}
    current = ""
    lines = doc.splitlines()
    for i, line in enumerate(lines):
        nxt = lines[i + 1] if i + 1 < len(lines) else ""
        if nxt.strip() and set(nxt.strip()) == {"-"}:
            current = line.strip()
            sections[current] = []
        elif current and not (line.strip() and set(line.strip()) == {"-"}):
            sections[current].append(line)

    def entries(section: str) -> dict[str, str]:
        found: dict[str, str] = {}
        name = None
        text: list[str] = []
        for line in sections.get(section, []) + [""]:
            match = _PARAM_LINE.match(line)
            if match and not line.startswith(" "):
                if name:
                    found[name] = " ".join(text)
                name, text = match.group(1), []
            elif line.startswith(" ") and name:
                text.append(line.strip())
        if name:
            found[name] = " ".join(text)
        units = {}
        for key, desc in found.items():
            unit = _UNIT_AT_END.search(desc)
            if unit is None:
                raise TypeError(f"{func.__qualname__}: docstring entry {key!r} has no [unit]")
            units[key] = unit.group(1).strip()
        return units

    params = entries("Parameters")
    returns = entries("Returns")
    signature = [
        p.name
        for p in inspect.signature(func).parameters.values()
        if p.kind in (p.POSITIONAL_OR_KEYWORD, p.KEYWORD_ONLY) and p.default is p.empty
    ]
    missing = [p for p in signature if p not in params]
    if missing:
        raise TypeError(f"{func.__qualname__}: docstring lacks parameters {missing}")
    if len(returns) != 1:
        raise TypeError(f"{func.__qualname__}: docstring must name one return value")
    return {p: params[p] for p in signature}, next(iter(returns.values()))


def equation(
    *,
    symbol: str,
    text: str,
    latex: str,
    substitute: str | Callable[..., str],
    reference: str,
    units: str = "coherent",
    shown_in: str = "",
) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Register a physics function as a printable, recomputable equation."""
    if units not in UNITS:
        raise ValueError(f"units {units!r} not in {UNITS}")

    def register(func: Callable[..., Any]) -> Callable[..., Any]:
        # Named by topic: the module under physics, or the package for a topic in several
        # modules (physics.pump.curve.head_at is "pump.head_at").
        parts = func.__module__.split(".")
        topic = parts[parts.index("physics") + 1] if "physics" in parts[:-1] else parts[-1]
        name = f"{topic}.{func.__name__}"
        params, unit = _docstring_units(func)
        _REGISTRY[name] = Equation(
            name=name,
            func=func,
            symbol=symbol,
            text=text,
            latex=latex,
            substitute=substitute,
            reference=reference,
            params=params,
            unit=unit,
            units=units,
            shown_in=shown_in,
        )
        return func

    return register


class Writer:
    """Writes the values of a substituted line: ``write(value, unit)`` gives
    ``"998.21 kg/m³"``, ``write(value)`` the plain number.

    ``unit`` is the value's SI unit. ``system`` "SI" writes it as it is; "US" writes it in
    the coherent British gravitational unit (:func:`calcreport.units.coherent_us`), or with
    ``display`` in the unit the US report prints for its kind. ``shown_in`` names the unit
    to write in, in either system (kWh for an energy). Constants print to six significant
    figures, values to five (:func:`calcreport.units.fmt`).
    """

    def __init__(self, system: str = "SI", display: bool = False) -> None:
        self.us = system == "US"
        self.display = display

    def __call__(self, value: float, unit: str = "", shown_in: str = "") -> str:
        return self._write(value, unit, shown_in, fmt)

    def constant(self, name: str, shown_in: str = "") -> str:
        """The constant ``name`` of :data:`CONSTANTS`, as a substitution writes it."""
        value, unit = CONSTANTS[name]
        return self._write(value, unit, shown_in, lambda x: f"{x:.6g}")

    def _write(self, value: float, unit: str, shown_in: str, number: Callable[..., str]) -> str:
        unit = "" if unit == "-" else unit
        if shown_in:
            value, printed = to_display(value, unit, shown_in), pretty_unit(shown_in)
        elif not (self.us and unit):
            printed = pretty_unit(unit)
        elif self.display and unit in KIND_OF_SI_UNIT:
            shown = display_unit(KIND_OF_SI_UNIT[unit], "US")
            value, printed = to_display(value, unit, shown), pretty_unit(shown)
            if unit == "Pa":  # a state's pressure is absolute (a liquid's, a correlation's)
                printed += "a"
        else:
            printed, size = coherent_us(unit)
            value = value / size
        return f"{number(value)} {printed}".strip()


def fill(template: str, values: dict[str, Any], params: dict[str, str], write: Writer) -> str:
    """``template`` with each ``{name}`` (or ``{name:unit}``) written by ``write``: an
    argument in its docstring unit, or a constant of :data:`CONSTANTS`."""
    out = []
    for literal, name, spec, _ in string.Formatter().parse(template):
        out.append(literal)
        if name is None:
            continue
        if name in values:  # the writer reads "-" as no unit
            out.append(write(values[name], params[name], spec or ""))
        else:
            out.append(write.constant(name, spec or ""))
    return "".join(out)


def listed(
    name: str, unit: str = "", *, sep: str = " + ", around: str = "{}", empty: str | None = None
) -> Callable[..., str]:
    """A substitution writing the values of the list argument ``name`` (SI ``unit``),
    joined by ``sep`` and put in ``around``; ``empty`` stands for no values (when given)."""

    def text(values: dict[str, Any], result: float, write: Writer) -> str:
        items = values[name]
        if not items and empty is not None:
            return empty
        return around.format(sep.join(write(v, unit) for v in items))

    return text


def paired(
    first: str,
    first_unit: str,
    op: str,
    second: str,
    second_unit: str,
    *,
    around: str = "{}",
    empty: str | None = None,
    shown: tuple[str, str] = ("", ""),
) -> Callable[..., str]:
    """A substitution writing two list arguments element by element, ``a op b`` (SI units
    ``first_unit``, ``second_unit``, written in the units ``shown`` where given), joined by
    " + " and put in ``around``; ``empty`` stands for no values (when given)."""

    def text(values: dict[str, Any], result: float, write: Writer) -> str:
        pairs = list(zip(values[first], values[second], strict=True))
        if not pairs and empty is not None:
            return empty
        terms = (
            f"{write(a, first_unit, shown[0])} {op} {write(b, second_unit, shown[1])}"
            for a, b in pairs
        )
        return around.format(" + ".join(terms))

    return text


def lookup(name: str) -> Equation:
    """Return the registered equation ``name`` (``"module.function"``)."""
    _import_all()
    try:
        return _REGISTRY[name]
    except KeyError:
        known = ", ".join(sorted(_REGISTRY))
        raise KeyError(f"no equation named {name!r}; known: {known}") from None


def registered() -> dict[str, Equation]:
    """All registered equations, by name."""
    _import_all()
    return dict(_REGISTRY)


def _import_all() -> None:
    # The registry fills as modules import; recheck needs every module.
    from calcreport import physics  # noqa: F401
    from calcreport.physics import (  # noqa: F401
        atmosphere,
        fittings,
        friction,
        glycol,
        head,
        intake,
        liquids,
        losses,
        motor,
        power,
        pump,
        route,
        surge,
        valve,
        viscous,
        water,
    )
