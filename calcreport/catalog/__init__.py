"""Data tables shipped with calcreport, each entry with its source.

``references.toml``  citations by key, cited by steps and checks
``criteria.toml``    default design criteria with their basis
``motor_ratings.csv`` standard motor ratings, IEC kW and NEMA hp series
``motor_efficiency_iec.csv``   IE2/IE3 full-load efficiency limits, 4-pole 50 Hz
``fittings_hooper_2k.csv``     two-K coefficients of fittings (Hooper 1981)
``fittings_entrance_exit.csv`` entrance and exit coefficients (Crane TP-410)
``fittings_crane_ft.csv``      fittings as multiples of f_T (Crane TP-410)
``fittings_darby_3k.csv``      three-K coefficients of fittings (Darby 1999), by choice
``hazen_williams_c.csv``       Hazen-Williams C by material (typical values)
``pipe_elastic_modulus.csv``   wall modulus and Poisson's ratio by material (surge)
``check_valve_full_lift.csv``  check valves: velocity for full disc lift (Crane TP-410)
``iso_9906_tolerances.csv``    acceptance grades' tolerances on flow, head, efficiency
"""

from __future__ import annotations

import csv
import tomllib
from functools import cache
from pathlib import Path
from typing import Any

__all__ = [
    "FITTING_ALIASES",
    "check_valve_lift",
    "criteria",
    "elastic_moduli",
    "fingerprint",
    "fittings",
    "fittings_three_k",
    "hazen_williams_c",
    "iso_9906_grades",
    "motor_efficiency",
    "motor_ratings",
    "references",
    "rows",
]

_HERE = Path(__file__).parent


@cache
def _table(name: str) -> dict[str, Any]:
    with (_HERE / name).open("rb") as handle:
        return tomllib.load(handle)


def references() -> dict[str, str]:
    """Full citation of every reference key."""
    return {key: entry["citation"] for key, entry in _table("references.toml").items()}


def criteria() -> dict[str, dict[str, str]]:
    """Default design criteria: kind, value (with unit), basis and reference key."""
    return _table("criteria.toml")


@cache
def motor_ratings(series: str) -> tuple[float, ...]:
    """Standard motor ratings of ``series`` ("IEC" or "NEMA") in watts, ascending."""
    from calcreport.units import parse

    with (_HERE / "motor_ratings.csv").open(encoding="utf-8") as handle:
        rows = csv.DictReader(line for line in handle if not line.startswith("#"))
        values = [
            parse(f"{row['rating']} {row['unit']}", "power")
            for row in rows
            if row["series"] == series
        ]
    return tuple(sorted(values))


@cache
def fingerprint() -> str:
    """SHA-256 over every data file of the catalogue, by name: the catalog data version."""
    import hashlib

    digest = hashlib.sha256()
    for path in sorted(_HERE.iterdir()):
        if path.suffix in (".toml", ".csv"):
            digest.update(path.name.encode() + b"\0" + path.read_bytes() + b"\0")
    return digest.hexdigest()


@cache
def rows(name: str) -> tuple[dict[str, str], ...]:
    """The rows of the CSV table ``name`` of this folder, skipping ``#`` comment lines."""
    with (_HERE / name).open(encoding="utf-8", newline="") as handle:
        reader = csv.DictReader(line for line in handle if not line.startswith("#"))
        return tuple(dict(row) for row in reader)


# Fitting kinds renamed in plain trade words; the earlier names are read as these.
FITTING_ALIASES = {
    "entrance_sharp": "sharp_edged_entrance",
    "entrance_projecting": "projecting_entrance",
    "entrance_rounded": "rounded_entrance",
}


@cache
def fittings() -> dict[str, dict[str, Any]]:
    """Named fittings: ``{"kind": {"method", "K" or "K1"/"K_inf", "description", "source"}}``."""
    table: dict[str, dict[str, Any]] = {}
    for row in rows("fittings_hooper_2k.csv"):
        table[row["kind"]] = {
            "method": "hooper_2k",
            "K1": float(row["K1"]),
            "K_inf": float(row["K_inf"]),
            "description": row["description"],
            "source": row["source"],
            "reference": "hooper_1981",
        }
    for row in rows("fittings_crane_ft.csv"):
        table[row["kind"]] = {
            "method": "crane",
            "n": float(row["n"]),
            "description": row["description"],
            "source": row["source"],
            "reference": "crane_tp410",
        }
    for row in rows("fittings_entrance_exit.csv"):
        table[row["kind"]] = {
            "method": "constant",
            "K": float(row["K"]),
            "description": row["description"],
            "source": row["source"],
            "reference": "crane_tp410",
        }
    return table


@cache
def hazen_williams_c() -> dict[str, tuple[float, str]]:
    """Hazen-Williams C of new pipe by material name, with its source."""
    return {
        row["material"]: (float(row["C"]), row["source"]) for row in rows("hazen_williams_c.csv")
    }


@cache
def iso_9906_grades() -> dict[str, dict[str, Any]]:
    """Tolerance factors of each ISO 9906 acceptance grade, as fractions, with the source:
    ``{"2B": {"head_minus": 0.05, ..., "source": ...}}``."""
    keys = ("flow_minus", "flow_plus", "head_minus", "head_plus", "efficiency_minus")
    return {
        row["grade"]: {**{k: float(row[k]) / 100.0 for k in keys}, "source": row["source"]}
        for row in rows("iso_9906_tolerances.csv")
    }


@cache
def elastic_moduli() -> dict[str, dict[str, Any]]:
    """Wall material by name: ``{"E": Pa, "nu": Poisson's ratio, "description", "source"}``."""
    return {
        row["material"]: {
            "E": float(row["elastic_modulus_gpa"]) * 1e9,
            "nu": float(row["poisson_ratio"]),
            "description": row["description"],
            "source": row["source"],
        }
        for row in rows("pipe_elastic_modulus.csv")
    }


@cache
def fittings_three_k() -> dict[str, dict[str, Any]]:
    """Fittings with Darby's three-K constants: ``{"kind": {"K1", "Ki", "Kd", ...}}``."""
    return {
        row["kind"]: {
            "method": "darby_3k",
            "K1": float(row["K1"]),
            "Ki": float(row["Ki"]),
            "Kd": float(row["Kd"]),
            "description": row["description"],
            "source": row["source"],
            "reference": "darby_1999",
        }
        for row in rows("fittings_darby_3k.csv")
    }


@cache
def check_valve_lift() -> dict[str, tuple[float, str]]:
    """Check valve kinds: the constant of their full-lift velocity, with its source."""
    return {
        row["kind"]: (float(row["c"]), row["source"]) for row in rows("check_valve_full_lift.csv")
    }


@cache
def motor_efficiency(efficiency_class: str) -> dict[float, tuple[float, str]]:
    """Full-load efficiency limit by IEC rating (W) of an efficiency class, with its source."""
    return {
        float(row["rating_kw"]) * 1e3: (
            round(float(row["efficiency_percent"]) / 100.0, 6),
            row["source"],
        )
        for row in rows("motor_efficiency_iec.csv")
        if row["class"] == efficiency_class
    }
