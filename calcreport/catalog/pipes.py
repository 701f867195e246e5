"""Pipe dimensions by family, nominal size and schedule, each value with its source.

Families (data files in this folder, described in ``sources.toml``):

``steel``      ASME B36.10M welded and seamless wrought steel pipe, NPS 1/8-36
``stainless``  ASME B36.19M stainless steel pipe, schedules 5S, 10S, 40S, 80S
``copper``     ASTM B88 copper water tube, types K, L, M
``pvc``        ASTM D1785 PVC pipe, schedules 40 and 80 (minimum walls tabulated)
``pe``         ISO 4427-2 / EN 12201-2 polyethylene pipe, metric OD series by SDR

>>> pipe = resolve("NPS 6", "Sch 40")
>>> round(pipe.inner_diameter * 1000, 2), pipe.table
(154.05, 'asme_b36_10m_steel.csv')
>>> resolve("DN 50", "10S").family
'stainless'

Lengths are returned in metres. Inner diameter is outside diameter minus twice the wall, computed
here from the table's millimetre columns (the standard's own SI values for B36.10M/B36.19M, exact
conversions of the inch values for B88 and D1785). The plastics standards tabulate a minimum
wall, whose bore is the largest the standard allows and so understates the head: for PVC and PE
the bore is taken with the mean wall, the minimum plus half the standard's wall tolerance
(:func:`_mean_wall_mm`), and that wall is the one returned; the minimum is kept beside it.
Unknown names raise
:class:`CatalogLookupError`, a :class:`LookupError` whose message is a full sentence naming the
value, the close matches and the valid choices.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from fractions import Fraction
from functools import cache

from calcreport.catalog import _table, rows
from calcreport.catalog.lookup import (
    CatalogLookupError,
    close_matches,
    metres,
    sentence,
)

__all__ = [
    "CatalogLookupError",
    "PipeSize",
    "families",
    "resolve",
    "schedules",
    "sizes",
]


@dataclass(frozen=True)
class PipeSize:
    """One pipe size: lengths in metres, ``source`` the row's citation, ``table`` its data file."""

    family: str
    nominal_size: str
    schedule: str
    outside_diameter: float
    wall_thickness: float
    inner_diameter: float
    source: str
    table: str
    # The tabulated minimum wall where the standard gives one (PVC, PE), and how the bore follows.
    min_wall_thickness: float | None = None
    bore_basis: str = "outside diameter and wall as tabulated"
    # The primary published source as the report prints it (``source`` also names the
    # reproductions a value was read in, for the catalog's maintainers).
    published: str = ""


@dataclass(frozen=True)
class _Family:
    name: str
    table: str
    noun: str
    size_column: str
    size_kind: str  # "nps" (inch nominal, fractions) or "dn_mm" (metric nominal OD)
    od_column: str
    wall_column: str
    schedule_column: str
    dn_column: str | None = None
    schedule_prefix: str = ""


_FAMILIES: dict[str, _Family] = {
    "steel": _Family(
        "steel",
        "asme_b36_10m_steel.csv",
        "steel pipe (ASME B36.10M)",
        "nps",
        "nps",
        "outside_diameter_in",
        "wall_thickness_in",
        "schedule",
        dn_column="dn",
    ),
    "stainless": _Family(
        "stainless",
        "asme_b36_19m_stainless.csv",
        "stainless steel pipe (ASME B36.19M)",
        "nps",
        "nps",
        "outside_diameter_in",
        "wall_thickness_in",
        "schedule",
        dn_column="dn",
    ),
    "copper": _Family(
        "copper",
        "astm_b88_copper.csv",
        "copper tube (ASTM B88)",
        "nominal_size_in",
        "nps",
        "outside_diameter_in",
        "wall_thickness_in",
        "type",
    ),
    "pvc": _Family(
        "pvc",
        "astm_d1785_pvc.csv",
        "PVC pipe (ASTM D1785)",
        "nps",
        "nps",
        "outside_diameter_in",
        "min_wall_thickness_in",
        "schedule",
    ),
    "pe": _Family(
        "pe",
        "hdpe_dr_iso4427.csv",
        "PE pipe (ISO 4427-2 / EN 12201-2)",
        "dn_mm",
        "dn_mm",
        "outside_diameter_mm",
        "wall_thickness_mm",
        "sdr",
        schedule_prefix="SDR",
    ),
}

_FAMILY_ALIASES = {
    "steel": "steel",
    "carbon steel": "steel",
    "cs": "steel",
    "b36.10m": "steel",
    "asme b36.10m": "steel",
    "stainless": "stainless",
    "stainless steel": "stainless",
    "ss": "stainless",
    "b36.19m": "stainless",
    "asme b36.19m": "stainless",
    "copper": "copper",
    "cu": "copper",
    "b88": "copper",
    "astm b88": "copper",
    "pvc": "pvc",
    "upvc": "pvc",
    "d1785": "pvc",
    "astm d1785": "pvc",
    "pe": "pe",
    "hdpe": "pe",
    "polyethylene": "pe",
    "pe100": "pe",
    "pe 100": "pe",
    "pe80": "pe",
    "pe 80": "pe",
    "iso 4427": "pe",
    "en 12201": "pe",
}

_SCHEDULE_ALIASES = {
    "STANDARD": "STD",
    "STANDARDWEIGHT": "STD",
    "STD.": "STD",
    "XH": "XS",
    "XSTRONG": "XS",
    "EXTRASTRONG": "XS",
    "XXH": "XXS",
    "XXSTRONG": "XXS",
    "DOUBLEEXTRASTRONG": "XXS",
}

_UNICODE_FRACTIONS = {"½": "1/2", "¼": "1/4", "¾": "3/4", "⅛": "1/8", "⅜": "3/8", "⅝": "5/8"}
_SIZE_PREFIX = re.compile(r"^(nps|dn|od)(?=[\s\d.])\s*", re.IGNORECASE)
_SIZE_UNIT = re.compile(r"\s*(\"|''|in\.?|inch|inches|mm)$", re.IGNORECASE)
_SIZE_NUMBER = re.compile(r"^(?:(\d+)(?:\s+|-))?(\d+)/(\d+)$|^(\d+(?:\.\d*)?|\.\d+)$")
_SDR = re.compile(r"^S?DR\s*(\d+(?:\.\d+)?)$")


# --- tables ---------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Index:
    rows: dict[tuple[str, str], dict[str, str]]  # (canonical size, canonical schedule) -> row
    sizes: tuple[str, ...]  # canonical sizes in table order (ascending)
    by_value: dict[Fraction, str]  # size value (inch or mm) -> canonical size
    by_dn: dict[int, str]  # DN -> canonical size (B36 families only)
    schedules: dict[str, tuple[str, ...]]  # canonical size -> schedules in table order


@cache
def _index(family: str) -> _Index:
    fam = _FAMILIES[family]
    by_key: dict[tuple[str, str], dict[str, str]] = {}
    sizes: list[str] = []
    by_value: dict[Fraction, str] = {}
    by_dn: dict[int, str] = {}
    schedules: dict[str, list[str]] = {}
    for row in rows(fam.table):
        size = row[fam.size_column]
        schedule = fam.schedule_prefix + row[fam.schedule_column]
        if size not in schedules:
            sizes.append(size)
            schedules[size] = []
            by_value[_number(size)] = size
            if fam.dn_column:
                by_dn[int(row[fam.dn_column])] = size
        schedules[size].append(schedule)
        by_key[(size, schedule)] = row
    return _Index(
        by_key, tuple(sizes), by_value, by_dn, {k: tuple(v) for k, v in schedules.items()}
    )


# --- parsing --------------------------------------------------------------------------------


def _number(text: str) -> Fraction:
    """Parse ``6``, ``1.5``, ``3/4``, ``1-1/2`` or ``1 1/2``; raise ValueError otherwise."""
    match = _SIZE_NUMBER.match(text.strip())
    if not match:
        raise ValueError(text)
    whole, num, den, plain = match.groups()
    if plain is not None:
        return Fraction(plain)
    if int(den) == 0:
        raise ValueError(text)
    return Fraction(int(whole or 0)) + Fraction(int(num), int(den))


def _split_size(text: str) -> tuple[str | None, str | None, Fraction]:
    """(prefix, unit, value) of a nominal size; prefix ``nps``/``dn``/``od``, unit ``in``/``mm``."""
    rest = str(text).strip()
    for char, frac in _UNICODE_FRACTIONS.items():
        rest = rest.replace(char, " " + frac)
    rest = rest.strip()
    prefix = None
    match = _SIZE_PREFIX.match(rest)
    if match:
        prefix = match.group(1).lower()
        rest = rest[match.end() :]
    unit = None
    match = _SIZE_UNIT.search(rest)
    if match:
        unit = "mm" if match.group(1).lower() == "mm" else "in"
        rest = rest[: match.start()]
    return prefix, unit, _number(rest)


def _normalize_schedule(text: str) -> str:
    """Upper-case schedule designation without ``Sch``/``Type`` and spaces; SDR as ``SDR11``."""
    raw = str(text).strip().upper()
    raw = re.sub(r"^(SCHEDULE|SCHED\.?|SCH\.?)\s*", "", raw)
    raw = re.sub(r"^TYPE\s+", "", raw)
    compact = re.sub(r"[\s_-]+", "", raw)
    compact = _SCHEDULE_ALIASES.get(compact, compact)
    if re.fullmatch(r"\d+\.0+", compact):  # 40.0 from a TOML float
        compact = compact.split(".")[0]
    match = _SDR.match(compact)
    if match:
        return "SDR" + _format_ratio(match.group(1))
    return compact


def _format_ratio(text: str) -> str:
    value = Fraction(text)
    return str(value.numerator) if value.denominator == 1 else str(float(value))


def _normalize_family(text: str) -> str:
    return re.sub(r"[\s_-]+", " ", str(text).strip().lower())


# --- messages -------------------------------------------------------------------------------


def _as_number(text: str, prefix: str = "") -> float | None:
    text = text.strip()
    if prefix and text.upper().startswith(prefix):
        text = text[len(prefix) :].strip()
    try:
        return float(_number(text))
    except ValueError:
        return None


def _bracket(target: float | None, choices: tuple[str, ...], prefix: str = "") -> list[str]:
    """The nearest numeric choices below and above ``target`` (the two nearest if at an end)."""
    if target is None:
        return []
    numeric = [(value, c) for c in choices if (value := _as_number(c, prefix)) is not None]
    below = [c for value, c in sorted(numeric) if value < target][-1:]
    above = [c for value, c in sorted(numeric) if value > target][:1]
    return below + above


def _suggest(
    value: str, choices: tuple[str, ...], target: float | None = None, prefix: str = ""
) -> tuple[str, ...]:
    return tuple(_bracket(target, choices, prefix)[:3]) or close_matches(value, choices)


def _size_phrase(family: _Family, size: str) -> str:
    if family.size_kind == "dn_mm":
        return f"dn {size} mm"
    if family.name == "copper":
        return f"{size} in nominal"
    return f"NPS {size}"


# --- pipes ----------------------------------------------------------------------------------


def families() -> tuple[str, ...]:
    """Names of the pipe families, for messages and input validation."""
    return tuple(_FAMILIES)


def _family(name: str | None, schedule: str) -> _Family:
    if name is None:
        if re.fullmatch(r"\d+S", schedule):
            return _FAMILIES["stainless"]
        if schedule in ("K", "L", "M"):
            return _FAMILIES["copper"]
        if schedule.startswith("SDR"):
            return _FAMILIES["pe"]
        return _FAMILIES["steel"]
    key = _FAMILY_ALIASES.get(_normalize_family(name))
    if key is None:
        choices = families()
        suggestions = _suggest(_normalize_family(name), tuple(_FAMILY_ALIASES))
        suggestions = tuple(dict.fromkeys(_FAMILY_ALIASES[s] for s in suggestions))
        message = sentence(
            f"'{name}' is not a pipe family", suggestions, f"Defined: {', '.join(choices)}"
        )
        raise CatalogLookupError(
            message, kind="family", value=str(name), suggestions=suggestions, choices=choices
        )
    return _FAMILIES[key]


def sizes(family: str = "steel") -> tuple[str, ...]:
    """Nominal sizes of ``family`` in ascending order (NPS as ``1-1/2``, PE as dn in mm)."""
    return _index(_family(family, "").name).sizes


def _size(fam: _Family, nominal_size: str) -> str:
    index = _index(fam.name)
    text = str(nominal_size)
    try:
        prefix, unit, value = _split_size(text)
    except ValueError:
        prefix, unit, value = None, None, None
    if value is not None:
        if fam.size_kind == "dn_mm":
            if prefix in (None, "dn", "od") and unit in (None, "mm") and value in index.by_value:
                return index.by_value[value]
        elif prefix == "dn":
            if value.denominator == 1 and int(value) in index.by_dn:
                return index.by_dn[int(value)]
            if fam.dn_column:
                dns = tuple(f"DN {dn}" for dn in index.by_dn)
                suggestions = _suggest(text, dns, float(value), prefix="DN")
                message = sentence(
                    f"'{text}' is not a DN of {fam.noun}",
                    suggestions,
                    f"Defined: {', '.join(dns)}",
                )
                raise CatalogLookupError(
                    message, kind="nominal_size", value=text, suggestions=suggestions, choices=dns
                )
        elif unit != "mm" and prefix != "od" and value in index.by_value:
            return index.by_value[value]
    choices = index.sizes
    if prefix == "dn" and fam.size_kind == "nps":
        message = (
            f"'{text}' is not a nominal size of {fam.noun}: the table has no DN designations; "
            f"give the nominal size in inches, one of {', '.join(choices)}."
        )
        raise CatalogLookupError(message, kind="nominal_size", value=text, choices=choices)
    target = None if value is None else float(value)
    smallest = min((v for c in choices if (v := _as_number(c)) is not None), default=None)
    inches = fam.size_kind == "dn_mm" and target is not None and smallest and target < smallest
    if inches:  # below every dn in mm: most likely a nominal size in inches
        assert target is not None
        target *= 25.4
    suggestions = _suggest(text.strip(), choices, target)
    if fam.size_kind == "dn_mm":
        defined = f"Defined (dn, mm): {', '.join(choices)}"
        head = f"'{text}' is not a nominal outside diameter of {fam.noun}"
        if inches:
            head += (
                f", whose sizes are outside diameters in mm ({text.strip()} in is {target:.4g} mm)"
            )
    else:
        defined = f"Defined (nominal inches): {', '.join(choices)}"
        if fam.dn_column:
            defined += f", or DN {next(iter(index.by_dn))} to DN {list(index.by_dn)[-1]}"
        head = f"'{text}' is not a nominal size of {fam.noun}"
    raise CatalogLookupError(
        sentence(head, suggestions, defined),
        kind="nominal_size",
        value=text,
        suggestions=suggestions,
        choices=choices,
    )


def schedules(family: str, nominal_size: str) -> tuple[str, ...]:
    """Schedules (types, SDRs) defined at ``nominal_size`` in ``family``, in table order."""
    fam = _family(family, "")
    return _index(fam.name).schedules[_size(fam, nominal_size)]


def resolve(nominal_size: str, schedule: str, family: str | None = None) -> PipeSize:
    """Dimensions of one pipe: ``resolve("6", "40")``, ``resolve("DN 150", "Sch 80")``,
    ``resolve("1-1/2", "10S")``, ``resolve("3/4", "L")``, ``resolve("4", "80", "pvc")``,
    ``resolve("110", "SDR11", "pe")``.

    Without ``family``: S schedules are stainless (ASME B36.19M), K/L/M copper, SDR/DR values
    polyethylene, anything else steel (ASME B36.10M). PVC needs ``family="pvc"``. Numbers are
    accepted as well as text (``resolve(6, 40)``, ``resolve(110, 11, "pe")``), as a TOML input
    file gives them.
    """
    normalized = _normalize_schedule(schedule)
    fam = _family(family, normalized)
    if fam.schedule_prefix and re.fullmatch(r"\d+(\.\d+)?", normalized):
        normalized = fam.schedule_prefix + _format_ratio(normalized)
    size = _size(fam, nominal_size)
    return _lookup(fam.name, size, normalized, str(schedule))


@cache
def _lookup(family: str, size: str, schedule: str, given: str) -> PipeSize:
    fam = _FAMILIES[family]
    index = _index(family)
    row = index.rows.get((size, schedule))
    if row is None:
        raise _schedule_error(fam, size, schedule, given)
    # Inch-series tables are dimensioned in inches (the mm columns are rounded
    # conversions): 1 in = 25.4 mm exactly, so NPS 6 Sch 40 is 6.065 in = 154.051 mm.
    scale = Fraction(254, 10) if fam.od_column.endswith("_in") else Fraction(1)
    od_mm = Fraction(row[fam.od_column]) * scale
    tabulated_mm = Fraction(row[fam.wall_column]) * scale
    mean = _MEAN_WALL.get(family)
    wall_mm = tabulated_mm if mean is None else mean[0](tabulated_mm)
    return PipeSize(
        family=family,
        nominal_size=size,
        schedule=schedule,
        outside_diameter=metres(od_mm),
        wall_thickness=metres(wall_mm),
        inner_diameter=metres(od_mm - 2 * wall_mm),
        source=row["source"],
        table=fam.table,
        min_wall_thickness=None if mean is None else metres(tabulated_mm),
        bore_basis="outside diameter and wall as tabulated" if mean is None else mean[1],
        published=_printed(fam.table)
        + (
            "; this wall by the rule of ISO 4065, e_min = dn/(2S + 1), not read from the table"
            if row.get("basis") == "rule"
            else ""
        ),
    )


def _printed(table: str) -> str:
    """The primary source of ``table`` as the report prints it (sources.toml ``printed``)."""
    return str(_table("sources.toml")["files"][table]["printed"])


def _d1785_mean_wall(minimum_mm: Fraction) -> Fraction:
    """ASTM D1785 Table 2: the wall may exceed its minimum by 12 % of it, at least 0.020 in
    (the tabulated tolerance, to 0.001 in); the mean wall is the minimum plus half of that."""
    inch = Fraction(254, 10)
    tolerance_in = max(Fraction(20, 1000), round(minimum_mm / inch * Fraction(12, 100), 3))
    return minimum_mm + tolerance_in * inch / 2


def _iso_mean_wall(minimum_mm: Fraction) -> Fraction:
    """ISO 4427-2 / EN 12201-2 walls take the grade V tolerance of ISO 11922-1: 0.1 e_min +
    0.1 mm, rounded up to 0.1 mm; the mean wall is the minimum plus half of that."""
    tolerance_tenths = math.ceil(minimum_mm + 1 - Fraction(1, 10**9))  # (0.1 e + 0.1) in 0.1 mm
    return minimum_mm + Fraction(tolerance_tenths, 10) / 2


# family -> (mean wall from the tabulated minimum, in mm; how the report states the bore)
_MEAN_WALL = {
    "pvc": (
        _d1785_mean_wall,
        "bore from the average outside diameter and the mean wall: the minimum wall plus half "
        "the D1785 tolerance (12 % of the minimum, at least 0.020 in), so the head is not "
        "understated by the largest bore",
    ),
    "pe": (
        _iso_mean_wall,
        "bore from the nominal outside diameter (the least mean OD) and the mean wall: e_min "
        "plus half the grade V tolerance of ISO 11922-1 (0.1 e_min + 0.1 mm, rounded up to "
        "0.1 mm; from memory), so the head is not understated by the largest bore",
    ),
}


def _schedule_error(fam: _Family, size: str, schedule: str, given: str) -> CatalogLookupError:
    index = _index(fam.name)
    choices = index.schedules[size]
    prefix = fam.schedule_prefix
    suggestions = _suggest(schedule, choices, _as_number(schedule, prefix), prefix)
    head = f"'{given}' is not a schedule of {_size_phrase(fam, size)} {fam.noun}"
    elsewhere = [s for s in index.sizes if schedule in index.schedules[s]]
    if elsewhere:
        head += (
            f" ({schedule} is tabulated for {_size_phrase(fam, elsewhere[0])} to "
            f"{elsewhere[-1]} but not at this size)"
        )
    else:
        others = [
            other.noun
            for other in _FAMILIES.values()
            if other is not fam
            and any(schedule in scheds for scheds in _index(other.name).schedules.values())
        ]
        if others:
            head += f" ({schedule} is a designation of {' and '.join(others)})"
    defined = f"Defined for {_size_phrase(fam, size)}: {', '.join(choices)}"
    return CatalogLookupError(
        sentence(head, suggestions, defined),
        kind="schedule",
        value=given,
        suggestions=suggestions,
        choices=choices,
    )


# --- roughness ------------------------------------------------------------------------------
