"""One definition per equation: the function, its printed form and its units.

A physics function is a plain function on SI floats (or numpy arrays).
The ``@equation`` decorator attaches what the trace needs to print and to
recompute it, without changing the function:

- ``symbol``: the quantity computed, e.g. ``"Re"``;
- ``text``: the equation in plain Unicode, e.g. ``"Re = ρ·v·D/μ"``;
- ``latex``: the same in matplotlib mathtext, for the PDF;
- ``substitute``: the right-hand side with ``{name}`` placeholders that the
  trace fills with the argument values and units, or a callable
  ``(values, result, fmt) -> str`` for equations that print more than one line
  (Colebrook prints both sides of the implicit equation);
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
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

__all__ = ["Equation", "equation", "listed", "lookup", "paired", "registered"]

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
) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Register a physics function as a printable, recomputable equation."""

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
        )
        return func

    return register


def listed(
    name: str, unit: str = "", *, sep: str = " + ", around: str = "{}", empty: str | None = None
) -> Callable[..., str]:
    """A substitution printing the values of the list argument ``name``, each with ``unit``,
    joined by ``sep`` and put in ``around``; ``empty`` stands for no values (when given)."""

    def text(values: dict[str, Any], result: float, fmt: Any) -> str:
        items = values[name]
        if not items and empty is not None:
            return empty
        return around.format(sep.join(f"{fmt(v)} {unit}".strip() for v in items))

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
) -> Callable[..., str]:
    """A substitution printing two list arguments element by element, ``a op b``, joined
    by " + " and put in ``around``; ``empty`` stands for no values (when given)."""

    def text(values: dict[str, Any], result: float, fmt: Any) -> str:
        pairs = list(zip(values[first], values[second], strict=True))
        if not pairs and empty is not None:
            return empty
        terms = (
            f"{f'{fmt(a)} {first_unit}'.strip()} {op} {f'{fmt(b)} {second_unit}'.strip()}"
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
        viscous,
        water,
    )
