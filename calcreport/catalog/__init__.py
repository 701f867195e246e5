"""Data tables shipped with calcreport, each entry with its source.

``references.toml``  citations by key, cited by steps and checks
``criteria.toml``    default design criteria with their basis
"""

from __future__ import annotations

import tomllib
from functools import cache
from pathlib import Path
from typing import Any

__all__ = ["criteria", "references"]

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
