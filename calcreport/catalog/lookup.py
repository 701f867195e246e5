"""What the catalog's name lookups share: the error for a name it does not hold, the sentence
that names the close matches and the valid choices, and millimetres to metres."""

from __future__ import annotations

import difflib
from fractions import Fraction

__all__ = ["CatalogLookupError", "close_matches", "metres", "quote_list", "sentence"]


class CatalogLookupError(LookupError):
    """A family, nominal size, schedule or material the catalogs do not hold.

    ``kind`` is ``"family"``, ``"nominal_size"``, ``"schedule"`` or ``"material"``; ``value``
    is the text given; ``suggestions`` the close matches; ``choices`` the valid names.
    """

    def __init__(
        self,
        message: str,
        *,
        kind: str,
        value: str,
        suggestions: tuple[str, ...] = (),
        choices: tuple[str, ...] = (),
    ) -> None:
        super().__init__(message)
        self.kind = kind
        self.value = value
        self.suggestions = suggestions
        self.choices = choices


def quote_list(items: tuple[str, ...] | list[str]) -> str:
    """``'a', 'b' or 'c'``."""
    quoted = [f"'{item}'" for item in items]
    if len(quoted) <= 1:
        return "".join(quoted)
    return ", ".join(quoted[:-1]) + " or " + quoted[-1]


def close_matches(value: str, choices: tuple[str, ...]) -> tuple[str, ...]:
    """Up to three choices spelled like ``value``."""
    return tuple(difflib.get_close_matches(value, choices, n=3, cutoff=0.5))


def sentence(head: str, suggestions: tuple[str, ...], defined: str) -> str:
    """The message of a failed lookup: what was not found, the close matches, the choices."""
    if suggestions:
        return f"{head}; did you mean {quote_list(suggestions)}? {defined}."
    return f"{head}; {defined[0].lower()}{defined[1:]}."


def metres(millimetres: Fraction) -> float:
    """Millimetres (exact decimal from the table) to the nearest float in metres."""
    return float(millimetres / 1000)
