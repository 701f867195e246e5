"""The errors calcreport raises, and their wording.

::

    CalcreportError                 base of everything raised on purpose
    ├── InputError (ValueError)     the input is wrong; the CLI exits 2
    │     carries every Problem found, each naming its key path and line
    ├── ConvergenceError (ArithmeticError)
    │                               an iteration did not converge; exit 1
    ├── TraceError (ValueError)     a trace file is unreadable; exit 2
    └── FileReadError (OSError)     a named file is not a regular file within its
                                    size limit; the reader turns it into one of the above

Errors build their message in ``__str__`` from structured attributes, so
a caller can show the same facts in another form. Only the CLI prints and
exits.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = [
    "CalcreportError",
    "ConvergenceError",
    "FileReadError",
    "InputError",
    "Problem",
    "TraceError",
]


MAX_LISTED = 50  # problems printed; the count says how many more there are


class CalcreportError(Exception):
    """Base class of every error calcreport raises on purpose."""


@dataclass(frozen=True)
class Problem:
    """One thing wrong with the input.

    ``key`` is the path of the offending key (``pipe[2].length`` or
    ``pipe "S1".length``), ``line`` its TOML line when known, ``message``
    a full sentence saying what is wrong and what was expected.
    """

    key: str
    message: str
    line: int | None = None

    def __str__(self) -> str:
        where = f"{self.key} (line {self.line})" if self.line else self.key
        return f"{where}: {self.message}"


class InputError(CalcreportError, ValueError):
    """The input file is wrong; every problem found is listed at once."""

    def __init__(self, problems: list[Problem], path: str | None = None) -> None:
        self.problems = sorted(problems, key=lambda p: (p.line or 0, p.key))
        self.path = path
        super().__init__(str(self))

    def __str__(self) -> str:
        count = len(self.problems)
        head = f"{self.path}: " if self.path else ""
        noun = "problem" if count == 1 else "problems"
        lines = [f"{head}{count} {noun} in the input:"]
        lines += [f"  - {p}" for p in self.problems[:MAX_LISTED]]
        if count > MAX_LISTED:
            lines.append(f"  … and {count - MAX_LISTED:,} more; mend these and check again.")
        return "\n".join(lines)


class ConvergenceError(CalcreportError, ArithmeticError):
    """An iterative solution did not converge within its iteration bound."""

    def __init__(self, what: str, iterations: int, residual: float) -> None:
        self.what = what
        self.iterations = iterations
        self.residual = residual
        super().__init__(str(self))

    def __str__(self) -> str:
        return (
            f"{self.what} did not converge in {self.iterations} iterations "
            f"(last relative change {self.residual:.3g}); check the inputs that feed it."
        )


class TraceError(CalcreportError, ValueError):
    """A trace file cannot be read as a calcreport trace."""

    def __init__(self, path: str, reason: str) -> None:
        self.path = path
        self.reason = reason
        super().__init__(str(self))

    def __str__(self) -> str:
        return f"{self.path}: not a readable calcreport trace: {self.reason}"


class FileReadError(CalcreportError, OSError):
    """A file named by the user cannot be read safely (see :mod:`calcreport.files`)."""

    def __init__(self, path: str, reason: str) -> None:
        self.path = path
        self.reason = reason
        super().__init__(str(self))

    def __str__(self) -> str:
        return f"{self.path}: {self.reason}"
