"""Writing results to disk all at once, or not at all.

Each file is first written to a temporary file in its target folder and
renamed into place only when every file is complete, so a failed build
never leaves a half-written file and never replaces the last good report.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from calcreport.errors import InputError, Problem

__all__ = ["write_all"]


def write_all(files: dict[Path, bytes], protect: Path | None = None) -> None:
    """Write every ``path: content`` pair atomically; never write over ``protect``."""
    if protect is not None:
        for path in files:
            if path.resolve() == protect.resolve():
                raise InputError(
                    [
                        Problem(
                            "output",
                            f"refusing to write over the input file "
                            f"{protect}; choose another output folder",
                        )
                    ]
                )
    temporary: dict[Path, str] = {}
    try:
        for path, content in files.items():
            path.parent.mkdir(parents=True, exist_ok=True)
            handle, name = tempfile.mkstemp(
                dir=path.parent, prefix=f".{path.name}.", suffix=".part"
            )
            temporary[path] = name
            with os.fdopen(handle, "wb") as out:
                out.write(content)
            os.chmod(name, _mode())
        for path, name in temporary.items():
            os.replace(name, path)
        temporary.clear()
    finally:
        for name in temporary.values():
            try:
                os.unlink(name)
            except FileNotFoundError:
                pass


def _mode() -> int:
    """Permissions of a newly created file under the process umask (mkstemp uses 0600)."""
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask
