"""What the parts of a recheck share: a finding, a step's result, the context of one recheck,
number tests and the sources a step names.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

ABSOLUTE_FLOOR = 1e-12


# ---- the report ------------------------------------------------------------------------


@dataclass(frozen=True)
class Finding:
    """One thing about a step that does not hold.

    ``what`` names the item (``value``, ``unit``, ``argument Re``,
    ``argument Re unit``, ``function``, ``inputs``, ``substituted``, ...);
    ``recorded`` is what the trace holds, ``expected`` what the recheck
    finds it should be (``None`` when there is nothing to compare with);
    ``reason`` is a full sentence.
    """

    what: str
    recorded: Any
    expected: Any
    reason: str

    def to_json(self) -> dict[str, Any]:
        return {
            "what": self.what,
            "recorded": self.recorded,
            "expected": self.expected,
            "reason": self.reason,
        }


@dataclass(frozen=True)
class StepResult:
    """The recheck of one step: confirmed when it has no finding."""

    id: str
    function: str
    recorded: Any
    recomputed: float | None
    unit: Any
    findings: tuple[Finding, ...] = ()

    @property
    def status(self) -> str:
        return "mismatch" if self.findings else "confirmed"

    def to_json(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "function": self.function,
            "status": self.status,
            "recorded": self.recorded,
            "recomputed": self.recomputed,
            "unit": self.unit,
            "findings": [f.to_json() for f in self.findings],
        }


@dataclass(frozen=True)
class _Context:
    registry: dict[str, Any]
    steps: list[dict[str, Any]]
    position: dict[str, int]
    given: dict[str, dict[str, Any]]
    solutions: dict[str, dict[str, Any]]
    assumptions: dict[str, dict[str, Any]]
    tolerance: float
    substitute: Any


def _table(table: Any) -> dict[str, dict[str, Any]]:
    return {k: v if isinstance(v, dict) else {} for k, v in table.items()}


def _is_number(value: Any) -> bool:
    kind = type(value)
    return kind is float or kind is int or (kind is not bool and isinstance(value, int | float))


def _finite(value: Any) -> bool:
    return _is_number(value) and math.isfinite(value)


def _close(a: float, b: float, rel: float) -> bool:
    return a == b or abs(a - b) <= max(rel * max(abs(a), abs(b)), ABSOLUTE_FLOOR)


def _as_list(value: Any) -> list[Any]:
    return value if isinstance(value, list) else [value]


def _sources(step: dict[str, Any]) -> list[str]:
    out: list[str] = []
    arguments = step.get("arguments")
    if not isinstance(arguments, dict):
        return out
    for arg in arguments.values():
        if isinstance(arg, dict):
            for source in _as_list(arg.get("from")):
                if isinstance(source, str) and source not in out:
                    out.append(source)
    return out


def _doc_unit(unit: str) -> str:
    return "" if unit in ("-", "") else unit
