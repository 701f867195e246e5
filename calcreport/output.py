"""Writing results to disk all at once, or not at all.

Each file is first written to a temporary file in its target folder and
renamed into place only when every file is complete, so a failed build
never leaves a half-written file and never replaces the last good report.
"""

from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path
from typing import Any

from calcreport.errors import InputError, Problem

__all__ = ["write_all"]


def write_all(files: dict[Path, bytes], protect: Path | None = None) -> None:
    """Write every ``path: content`` pair as one set: all replaced, or none.

    Never writes over ``protect``. A file that exists keeps its permissions; a new one
    takes the umask's. When a replacement fails, the files already replaced are put back,
    and the error names the file the user asked for, not a temporary one.
    """
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
    kept: dict[Path, str] = {}  # the previous file of each target, until all are in place
    try:
        for path, content in files.items():
            path.parent.mkdir(parents=True, exist_ok=True)
            handle, name = tempfile.mkstemp(
                dir=path.parent, prefix=f".{path.name}.", suffix=".part"
            )
            temporary[path] = name
            with os.fdopen(handle, "wb") as out:
                out.write(content)
            os.chmod(name, _mode(path))
        for path in temporary:
            if path.exists():
                backup = f"{temporary[path]}.old"
                _named(_keep, path, backup, path)
                kept[path] = backup
        done: list[Path] = []
        try:
            for path, name in temporary.items():
                _named(os.replace, name, path, path)
                done.append(path)
        except OSError:
            for path in done:  # put the previous set back
                if path in kept:
                    os.replace(kept.pop(path), path)
                else:
                    os.unlink(path)
            raise
        temporary.clear()
    finally:
        for name in [*temporary.values(), *kept.values()]:
            try:
                os.unlink(name)
            except FileNotFoundError:
                pass


def _keep(path: str | Path, backup: str | Path) -> None:
    """A copy of the file at ``path`` to put back: a hard link where the system has them."""
    try:
        os.link(path, backup)
    except OSError:
        shutil.copy2(path, backup)


def _named(operation: Any, source: str | Path, target: str | Path, shown: Path) -> None:
    """Run a file operation; its error names ``shown``, the file the user asked for."""
    try:
        operation(source, target)
    except OSError as exc:
        raise OSError(exc.errno, exc.strerror, str(shown)) from None


def _mode(path: Path) -> int:
    """Permissions for ``path``: those of the file it replaces, or the umask's for a new
    file (mkstemp would leave 0600)."""
    try:
        return os.stat(path).st_mode & 0o7777
    except FileNotFoundError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask
