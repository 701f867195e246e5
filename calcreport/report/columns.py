"""A long table of short rows set in two columns, as a newspaper sets them: down the left
column of a page, then down the right, then on to the next page, the header atop each
column. Half the pages of one wide column, read in the same order.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from reportlab.platypus import Flowable, Spacer, TableStyle

from calcreport.report.style import Table  # cells start in the embedded face

__all__ = ["TwoColumns"]

_FLUSH = TableStyle(
    [
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        *[(side, (0, 0), (-1, -1), 0) for side in ("LEFTPADDING", "RIGHTPADDING")],
        *[(side, (0, 0), (-1, -1), 0) for side in ("TOPPADDING", "BOTTOMPADDING")],
    ]
)


class TwoColumns(Flowable):
    """``rows`` (a header and its body rows) in two columns ``gap`` apart; ``make`` builds
    the table of a column from a header and a run of rows, at the column's width."""

    def __init__(
        self, make: Callable[[list[list[Any]]], Table], rows: list[list[Any]], gap: float
    ) -> None:
        super().__init__()
        self.make, self.header, self.body, self.gap = make, rows[0], rows[1:], gap
        self._heights: list[float] | None = None

    def _row_heights(self, width: float) -> tuple[float, list[float]]:
        """The header's height and each body row's, at the column's width."""
        if self._heights is None:
            table = self.make([self.header, *self.body])
            table.wrap(width, 1e9)
            self._heights = list(table._rowHeights)
        return self._heights[0], self._heights[1:]

    def _column(self, aW: float) -> float:
        return (aW - self.gap) / 2

    def _balanced(self, heights: list[float]) -> int:
        """How many rows the left column takes when every row fits on this page: the first
        split point where the left column is at least as tall as the right."""
        total, left = sum(heights), 0.0
        for n, h in enumerate(heights):
            if left >= total - left:
                return n
            left += h
        return len(heights)

    def wrap(self, aW: float, aH: float) -> tuple[float, float]:
        head, heights = self._row_heights(self._column(aW))
        n = getattr(self, "_split_at", None) or self._balanced(heights)
        self.width = aW
        self.height = head + max(sum(heights[:n]), sum(heights[n:]))
        return aW, self.height

    def split(self, aW: float, aH: float) -> list[Flowable]:
        head, heights = self._row_heights(self._column(aW))
        room = aH - head
        counts = []
        start = 0
        for _ in range(2):  # the left column, then the right, each as full as fits
            used, n = 0.0, start
            while n < len(heights) and used + heights[n] <= room:
                used += heights[n]
                n += 1
            counts.append(n - start)
            start = n
        if counts[0] == 0:
            return []  # not one row fits: the whole moves to the next page
        here = self.body[:start]
        rest = self.body[start:]
        page = TwoColumns(self.make, [self.header, *here], self.gap)
        page._heights = [head, *heights[:start]]
        page._split_at = counts[0]  # type: ignore[attr-defined]
        if not rest:
            return [page]
        after = TwoColumns(self.make, [self.header, *rest], self.gap)
        after._heights = [head, *heights[start:]]
        return [page, after]

    def draw(self) -> None:
        column = self._column(self.width)
        _, heights = self._row_heights(column)
        n = getattr(self, "_split_at", None) or self._balanced(heights)
        left = self.make([self.header, *self.body[:n]])
        right = self.make([self.header, *self.body[n:]]) if self.body[n:] else Spacer(0, 0)
        cells = [[left, right]]
        outer = Table(cells, colWidths=[column + self.gap, column], style=_FLUSH)
        outer.wrapOn(self.canv, self.width, self.height)
        outer.drawOn(self.canv, 0, self.height - outer._height)
