"""Shared parts of the report sections: section map, limits of what is listed, templates
and the escaping of the input's own text.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from functools import cache
from pathlib import Path
from typing import Any
from xml.sax.saxutils import escape

from reportlab.platypus import Flowable

from calcreport.units import show_keyed

TEMPLATES = Path(__file__).parent.parent / "templates"


# Section of each step, by the first part of its id.
SECTIONS = (
    ("site", "Site and liquid properties", ("site.", "fluid.", "source.", "destination.")),
    ("pipes", "Pipe hydraulics", ("pipe.",)),
    ("system", "System head and total dynamic head", ("system.",)),
    ("pump", "Operating point on the pump curve", ("pump.",)),
    ("npsh", "NPSH available, margin and submergence", ("npsh.", "intake.")),
    ("power", "Power and energy", ("power.", "energy.")),
    ("motor", "Motor rating", ("motor.",)),
    ("commissioning", "Gauge pressures for commissioning", ("commissioning.",)),
    ("route", "Pressure along the route", ("route.",)),
    ("surge", "Surge screening", ("surge.",)),
    ("study", "Life-cycle cost of the offers", ("study.",)),
)


# A route of more pipes than this prints each run of like pipes as one row of its tables.
LONG_ROUTE_PIPES = 40


def runs(rows: list[list[Any]]) -> list[list[Any]]:
    """Table rows with each run of consecutive rows alike but for their first cell (the
    pipes of one size along a long main) as one row whose first cell names the run and
    counts it: ``"D1–D499 (499)"``. Nothing is lost: every member's values are the row's."""
    out: list[list[Any]] = []
    start = 0
    for n in range(1, len(rows) + 1):
        if n < len(rows) and rows[n][1:] == rows[start][1:]:
            continue
        first, last = rows[start][0], rows[n - 1][0]
        out.append([first if n - 1 == start else f"{first}–{last} ({n - start})", *rows[start][1:]])
        start = n
    return out


# The anchor of the calculation chapter, and of each of its sections ("sec." + its key):
# where a link to a step not worked in print lands.
CALCULATION_ANCHOR = "sec.calculation"


def stage_anchor(step: dict[str, Any]) -> str:
    """The anchor of the calculation section that works ``step``'s stage (by the first part
    of its id after its case's prefix)."""
    base, case = step["id"], step.get("case") or ""
    if case and base.startswith(f"{case}."):
        base = base[len(case) + 1 :]
    for key, _, prefixes in SECTIONS:
        if base.startswith(prefixes):
            return f"sec.{key}"
    return CALCULATION_ANCHOR


_PROFILE_STEP = re.compile(r"^P\d+\.(pump|power|energy)\.")


# Equations whose result is a sum of money, printed in the input's currency.
_MONEY = frozenset(
    {
        "power.annual_cost",
        "power.cost_sum",
        "power.demand_cost",
        "power.length_cost",
        "power.life_cycle_cost",
        "power.present_value",
    }
)


COVER_REVISIONS = 4  # the latest revisions shown on the cover


MAX_FITTINGS_LISTED = 12  # fitting entries in a pipe's table row


# Longest node table printed in full; a longer route prints its governing nodes.
MAX_NODE_ROWS = 60


@cache
def _jinja() -> Any:
    import jinja2

    return jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(TEMPLATES)),
        autoescape=True,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=False,
    )


def _template(name: str, **values: Any) -> str:
    return str(_jinja().get_template(name).render(**values))


def _lines(name: str, **values: Any) -> list[str]:
    return [line.strip() for line in _template(name, **values).splitlines() if line.strip()]


def _short(value: Any, unit: str, key: str, system: str) -> str:
    """A changed value as the changes page prints it: in the report's units, rounded as its
    results are."""
    if isinstance(value, list):
        return f"{len(value)} values"
    if isinstance(value, dict):
        return "changed"
    if isinstance(value, int | float) and not isinstance(value, bool):
        return show_keyed(float(value), unit, key, system)
    return "—" if value is None else str(value)


def plain(value: Any) -> str:
    """Text from the input with its control characters as spaces (a table's string cell)."""
    return "".join(ch if ch >= " " or ch in "\t" else " " for ch in str(value))


def text(value: Any) -> str:
    """Text from the input, escaped so it prints literally (no markup, no control chars)."""
    return escape(plain(value))


_INDEXED = re.compile(r"^(.*)\[(\d+)\]$")


def _key_runs(keys: Sequence[str]) -> list[str]:
    """Input keys with each run of three or more consecutive indices written as one:
    ``pump.curve.flow[1]``, ``[2]``, … ``[81]`` become ``pump.curve.flow[1–81]``."""
    out: list[str] = []
    run: list[tuple[str, int]] = []

    def close() -> None:
        if len(run) >= 3:
            out.append(f"{run[0][0]}[{run[0][1]}–{run[-1][1]}]")
        else:
            out.extend(f"{name}[{i}]" for name, i in run)
        run.clear()

    for key in keys:
        m = _INDEXED.match(key)
        if m and run and m.group(1) == run[-1][0] and int(m.group(2)) == run[-1][1] + 1:
            run.append((m.group(1), int(m.group(2))))
            continue
        close()
        if m:
            run.append((m.group(1), int(m.group(2))))
        else:
            out.append(key)
    close()
    return out


class _ContentsMark(Flowable):
    """The room of the contents list (``height``); the canvas writes the list there once
    every page is known."""

    def __init__(self, height: float = 0.0) -> None:
        super().__init__()
        self.room = height

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        return available_width, self.room

    def draw(self) -> None:
        x, y = self.canv.absolutePosition(0, self.room)
        self.canv._contents_at = (self.canv.getPageNumber(), x, y)
