"""New-pipe absolute roughness by material, each value with its source.

>>> round(roughness("commercial steel").value * 1000, 3)
0.045
>>> roughness("PE100").material
'hdpe'
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction
from functools import cache

from calcreport.catalog import rows
from calcreport.catalog.lookup import CatalogLookupError, close_matches, metres, sentence

__all__ = ["ROUGHNESS_TABLE", "Roughness", "materials", "roughness"]

ROUGHNESS_TABLE = "roughness_new_pipe.csv"


@dataclass(frozen=True)
class Roughness:
    """New-pipe absolute roughness in metres; ``range`` (low, high) where the source gives one."""

    material: str
    value: float
    range: tuple[float, float] | None
    description: str
    source: str
    table: str
    published: str = ""


# Names in common use for the tabulated materials.
_MATERIAL_ALIASES = {
    "steel": "commercial_steel",
    "carbon_steel": "commercial_steel",
    "commercial_steel_new": "commercial_steel",
    "galvanized": "galvanized_steel",
    "galvanised": "galvanized_steel",
    "galvanised_steel": "galvanized_steel",
    "galvanized_iron": "galvanized_steel",
    "galvanised_iron": "galvanized_steel",
    "stainless": "stainless_steel",
    "ss": "stainless_steel",
    "ductile_iron_cement_mortar_lined": "ductile_iron_cement_lined",
    "cement_lined_ductile_iron": "ductile_iron_cement_lined",
    "asphalted_iron": "asphalted_cast_iron",
    "pe": "hdpe",
    "polyethylene": "hdpe",
    "pe100": "hdpe",
    "pe80": "hdpe",
    "upvc": "pvc",
}


@cache
def _roughness_rows() -> dict[str, dict[str, str]]:
    return {row["material"]: row for row in rows(ROUGHNESS_TABLE)}


def materials() -> tuple[str, ...]:
    """Materials with a tabulated new-pipe roughness."""
    return tuple(_roughness_rows())


@cache
def roughness(material: str) -> Roughness:
    """Absolute roughness of new pipe of ``material`` (``"commercial_steel"``, ``"pvc"``, ...)."""
    table = _roughness_rows()
    key = re.sub(r"[\s-]+", "_", str(material).strip().lower())
    key = _MATERIAL_ALIASES.get(key, key)
    row = table.get(key)
    if row is None:
        choices = materials()
        suggestions = close_matches(key, choices + tuple(_MATERIAL_ALIASES))
        suggestions = tuple(dict.fromkeys(_MATERIAL_ALIASES.get(s, s) for s in suggestions))
        message = sentence(
            f"'{material}' is not a pipe material with a tabulated roughness",
            suggestions,
            f"Defined: {', '.join(choices)}",
        )
        raise CatalogLookupError(
            message, kind="material", value=str(material), suggestions=suggestions, choices=choices
        )
    low, high = row["range_low_mm"], row["range_high_mm"]
    return Roughness(
        material=key,
        value=metres(Fraction(row["roughness_mm"])),
        range=(metres(Fraction(low)), metres(Fraction(high))) if low and high else None,
        description=row["description"],
        source=row["source"],
        table=ROUGHNESS_TABLE,
        published=row["published"],
    )
