"""Reading an input table: the TOML line of every key path, and the reader that checks keys,
quantities and words and collects every problem with its key and line.
"""

from __future__ import annotations

import datetime as dt
import difflib
import re
from pathlib import Path
from typing import Any

from calcreport.errors import Problem
from calcreport.model.schema import (
    Given,
)
from calcreport.units import KINDS, UnitProblem, as_written, expected, parse

MAX_TEXT = 2_000
MAX_CURVE_POINTS = 200


class _Lines:
    """Where each key path stands in the TOML text (best effort)."""

    _HEADER = re.compile(r"^\s*(\[\[?)\s*([A-Za-z0-9_.\-]+)\s*\]\]?")
    _KEY = re.compile(r"^\s*([A-Za-z0-9_\-]+)\s*=")
    # Basic and literal strings on one line: blanked before looking for
    # brackets, braces and comments, which may stand inside a string.
    _STRING = re.compile(r'"(?:[^"\\]|\\.)*"|\'[^\']*\'')

    def __init__(self, text: str) -> None:
        self.at: dict[str, int] = {}
        counts: dict[str, int] = {}
        table = ""
        open_array: str | None = None
        element = 0
        for number, line in enumerate(text.splitlines(), start=1):
            code = self._STRING.sub('""', line).split("#", 1)[0]
            header = self._HEADER.match(code)
            if header and open_array is not None and not header.group(2)[:1].isalpha():
                header = None  # an array inside the open array, not a table header
            if header:
                open_array = None
                name = header.group(2)
                if header.group(1) == "[[":
                    counts[name] = counts.get(name, 0) + 1
                    table = f"{name}[{counts[name]}]"
                else:
                    parent, _, leaf = name.rpartition(".")
                    table = f"{self._resolve(parent, counts)}.{leaf}" if parent else name
                self.at.setdefault(table, number)
                continue
            key = self._KEY.match(code)
            if key and open_array is None:
                path = f"{table}.{key.group(1)}" if table else key.group(1)
                self.at.setdefault(path, number)
                rest = code[key.end() :]
                element = 0
                for _ in range(rest.count("{")):
                    element += 1
                    self.at.setdefault(f"{path}[{element}]", number)
                if rest.count("[") > rest.count("]"):
                    open_array = path
                continue
            if open_array is not None:
                for _ in range(code.count("{")):
                    element += 1
                    self.at.setdefault(f"{open_array}[{element}]", number)
                if code.count("]") > code.count("["):
                    open_array = None

    @staticmethod
    def _resolve(name: str, counts: dict[str, int]) -> str:
        return f"{name}[{counts[name]}]" if name in counts else name

    def line(self, path: str) -> int | None:
        while path:
            if path in self.at:
                return self.at[path]
            if f"{path}[1]" in self.at:  # an array of tables where a table belongs
                return self.at[f"{path}[1]"]
            cut = max(path.rfind("."), path.rfind("["))
            path = path[:cut] if cut > 0 else ""
        return None


class _Reader:
    """Reads values from parsed TOML, collecting every problem found."""

    def __init__(self, lines: _Lines, folder: Path | None = None, outside: bool = False) -> None:
        self.lines = lines
        self.problems: list[Problem] = []
        self.folder = folder or Path.cwd()
        self.outside = outside  # files the input names may lie outside its folder
        self.files: list[dict[str, str]] = []  # other files read: path and SHA-256
        self.file_bytes: list[bytes] = []  # their bytes, in the same order

    def problem(self, key: str, message: str) -> None:
        self.problems.append(Problem(key, message, self.lines.line(key)))

    def count(self, prefix: str) -> int:
        """How many problems so far concern ``prefix`` or a key under it."""
        return sum(
            1
            for p in self.problems
            if p.key == prefix or p.key.startswith((f"{prefix}.", f"{prefix}["))
        )

    def table(
        self, data: dict[str, Any], key: str, path: str, required: bool
    ) -> dict[str, Any] | None:
        """The table at ``key``; None (reported when required) if absent or not a table."""
        value = data.get(key)
        if value is None:
            if required:
                self.problem(path, f"The table [{path}] is required but missing.")
            return None
        if not isinstance(value, dict):
            self.problem(
                path, f"Expected a table [{path}], got {_type(value)} {as_written(value)}."
            )
            return None
        return value

    def known_keys(self, data: dict[str, Any], path: str, allowed: set[str]) -> None:
        for key in data:
            if key in allowed:
                continue
            where = f"{path}.{key}" if path else key
            close = [k for k in sorted(allowed) if k.lower() == key.lower()] or [
                k
                for k in sorted(allowed)
                if k.lower()
                in difflib.get_close_matches(
                    key.lower(), [a.lower() for a in allowed], n=1, cutoff=0.6
                )
            ]
            if not path and isinstance(data[key], dict | list):
                what = f"table [{key}]"
                hint = f"; did you mean [{close[0]}]?" if close else "."
                known = ", ".join(f"[{k}]" for k in sorted(allowed) if k != "format")
                self.problem(where, f"Unknown {what}{hint} The known tables are {known}.")
                continue
            hint = f'; did you mean "{close[0]}"?' if close else "."
            known = ", ".join(sorted(allowed))
            self.problem(where, f'Unknown key "{key}"{hint} The known keys here are {known}.')

    def quantity(
        self,
        data: dict[str, Any],
        key: str,
        path: str,
        kind: str,
        *,
        required: bool = False,
        positive: bool = False,
        fraction: bool = False,
    ) -> Given | None:
        where = f"{path}.{key}"
        if key not in data:
            if required:
                self.problem(where, f"The required key {key} is missing; give {expected(kind)}.")
            return None
        try:
            value = parse(data[key], kind)
        except UnitProblem as exc:
            self.problem(where, f"{exc}")
            return None
        shown = as_written(data[key])
        if positive and value <= 0.0:
            self.problem(where, f"The value must be greater than zero; got {shown}.")
            return None
        if fraction and not 0.0 < value <= 1.0:
            self.problem(
                where,
                f"The value must be a fraction greater than 0 and at most 1 "
                f'(such as 0.72 or "72 %"); got {shown}.',
            )
            return None
        return Given(value, KINDS[kind].si, where)

    def text(
        self,
        data: dict[str, Any],
        key: str,
        path: str,
        default: str,
        choices: tuple[str, ...] | None = None,
    ) -> str:
        where = f"{path}.{key}" if path else key
        value = data.get(key, default)
        if isinstance(value, dt.date | dt.time):
            value = value.isoformat()
        if not isinstance(value, str):
            self.problem(
                where, f"Expected text in double quotes, got {_type(value)} {as_written(value)}."
            )
            return default
        if len(value) > MAX_TEXT:
            self.problem(
                where, f"The text has {len(value):,} characters; at most {MAX_TEXT:,} are accepted."
            )
            return default
        if choices is not None and value not in choices:
            close = difflib.get_close_matches(value, choices, n=1, cutoff=0.5)
            hint = f'; did you mean "{close[0]}"?' if close else "."
            self.problem(
                where, f"The value {as_written(value)} is not one of {_one_of(choices)}{hint}"
            )
            return default
        return value


def _numbers(cells: list[str]) -> list[Any]:
    """CSV cells as TOML would give them: bare numbers as floats, quantities as text."""
    out: list[Any] = []
    for cell in cells:
        try:
            out.append(float(cell))
        except ValueError:
            out.append(cell)
    return out


def _whole(
    r: _Reader, data: dict[str, Any], at: str, key: str, low: int, high: int
) -> Given | None:
    """A whole number of pumps between ``low`` and ``high`` at ``at.key``."""
    where = f"{at}.{key}"
    if key not in data:
        return None
    raw = data[key]
    if isinstance(raw, bool) or not isinstance(raw, int) or not low <= raw <= high:
        r.problem(where, f"Expected a whole number from {low} to {high}; got {as_written(raw)}.")
        return None
    return Given(float(raw), "", where)


def _fraction_pair(r: _Reader, raw: Any, path: str) -> tuple[Given, Given] | None:
    if not (isinstance(raw, list) and len(raw) == 2):
        r.problem(
            path,
            f"Expected two fractions of the BEP flow, such as [0.7, 1.2]; got {as_written(raw)}.",
        )
        return None
    values = []
    for i, item in enumerate(raw, start=1):
        try:
            values.append(Given(parse(item, "dimensionless"), "", f"{path}[{i}]"))
        except UnitProblem as exc:
            r.problem(f"{path}[{i}]", str(exc))
    if len(values) != 2:
        return None
    if not 0.0 < values[0].value < 1.0 < values[1].value:
        r.problem(
            path,
            "Expected a range around the BEP flow: a lower fraction below 1 and "
            "an upper fraction above 1, such as [0.7, 1.2].",
        )
        return None
    return values[0], values[1]


def _quantity_list(
    r: _Reader, data: dict[str, Any], key: str, path: str, kind: str
) -> tuple[Given, ...] | None:
    """An array of quantities: strings with units, or { unit = "...", values = [...] }."""
    where = f"{path}.{key}"
    raw = data.get(key)
    if raw is None:
        return None
    unit = None
    if isinstance(raw, dict):
        r.known_keys(raw, where, {"unit", "values"})
        unit, raw = raw.get("unit"), raw.get("values")
        if not isinstance(unit, str) and kind != "dimensionless":
            r.problem(
                where, 'Give the unit of the values, such as { unit = "L/s", values = [0, 8, 16] }.'
            )
            return None
    if not isinstance(raw, list) or not raw:
        r.problem(where, f"Expected an array of values; got {as_written(raw)}.")
        return None
    values = []
    for i, item in enumerate(raw, start=1):
        text = (
            f"{item} {unit}"
            if unit and isinstance(item, int | float) and not isinstance(item, bool)
            else item
        )
        try:
            values.append(Given(parse(text, kind), KINDS[kind].si, f"{where}[{i}]"))
        except UnitProblem as exc:
            r.problem(f"{where}[{i}]", str(exc))
    return tuple(values) if len(values) == len(raw) else None


def _one_of(choices: tuple[str, ...]) -> str:
    quoted = [f'"{c}"' for c in choices]
    return quoted[0] if len(quoted) == 1 else ", ".join(quoted[:-1]) + " or " + quoted[-1]


def _type(value: Any) -> str:
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "an array"
    if isinstance(value, str):
        return "text"
    if isinstance(value, int | float):
        return "a number"
    if isinstance(value, dt.date | dt.time):
        return "a date or time"
    return "a value"
