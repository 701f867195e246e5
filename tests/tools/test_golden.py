"""Golden outputs: the SHA-256 of every example's trace, PDF and page map.

The same input in the same environment gives the same bytes, so a change that was meant to
leave the output alone (a refactor, a speed-up) is held to it here. The hashes were made with
the dependency versions recorded beside them; with other versions the PDF and trace may
differ for reasons of their own (a font subset, a last digit of a solver), and the test says
so and skips rather than failing on them.

Refresh after a change that is meant to change an output, and say why in the commit::

    python -m tests.tools.test_golden --refresh
"""

from __future__ import annotations

import hashlib
import json
import sys
from importlib import metadata
from pathlib import Path

import pytest

GOLDEN = Path(__file__).parents[1] / "golden" / "examples.json"
DEPENDENCIES = (
    "numpy",
    "scipy",
    "matplotlib",
    "reportlab",
    "pint",
    "jinja2",
    "CoolProp",
    "pikepdf",
    "fonttools",
)
OUTPUTS = (".trace.json", ".pdf", ".pages.json")


def environment() -> dict[str, str]:
    """The versions an output's bytes depend on."""
    versions = {"python": ".".join(map(str, sys.version_info[:3]))}
    versions.update({name: metadata.version(name) for name in DEPENDENCIES})
    return versions


def hashes(folders: dict[str, Path]) -> dict[str, str]:
    return {
        f"{name}{suffix}": hashlib.sha256((folder / f"{name}{suffix}").read_bytes()).hexdigest()
        for name, folder in sorted(folders.items())
        for suffix in OUTPUTS
    }


def test_every_example_output_is_byte_for_byte_the_golden_one(built_examples):
    golden = json.loads(GOLDEN.read_text(encoding="utf-8"))
    now = environment()
    if golden["made_with"] != now:
        moved = {k: (golden["made_with"].get(k), v) for k, v in now.items()}
        moved = {k: v for k, v in moved.items() if v[0] != v[1]}
        pytest.skip(f"golden files made with other versions {moved}: refresh to hold them here")
    assert hashes(built_examples) == golden["sha256"]


def _refresh() -> None:
    import tempfile

    from calcreport.cli import main
    from tests.conftest import example_inputs

    with tempfile.TemporaryDirectory() as out:
        folders = {}
        for path in example_inputs():
            folders[path.stem] = Path(out) / path.stem
            if main(["build", str(path), "-o", str(folders[path.stem])]) != 0:
                raise SystemExit(f"{path.name} did not build")
        data = {"made_with": environment(), "sha256": hashes(folders)}
    GOLDEN.write_text(json.dumps(data, indent=2) + "\n", encoding="utf-8")
    print(f"wrote {GOLDEN}")


if __name__ == "__main__":
    if sys.argv[1:] != ["--refresh"]:
        raise SystemExit("usage: python -m tests.tools.test_golden --refresh")
    _refresh()
