"""Shared fixtures: the shipped examples, built once per test session."""

from __future__ import annotations

from pathlib import Path

import pytest

ROOT = Path(__file__).parent.parent
EXAMPLES = ROOT / "input_examples"


def example_inputs() -> list[Path]:
    """The example inputs shipped in input_examples/, in name order."""
    return sorted(EXAMPLES.glob("*.toml"))


@pytest.fixture(scope="session")
def built_examples(tmp_path_factory) -> dict[str, Path]:
    """Every example built with ``calcreport build``: example name -> its output folder
    (``NAME.pdf``, ``NAME.trace.json``, ``NAME.pages.json``)."""
    from calcreport.cli import main

    out = tmp_path_factory.mktemp("examples")
    folders = {}
    for path in example_inputs():
        folder = out / path.stem
        assert main(["build", str(path), "-o", str(folder)]) == 0, path.name
        folders[path.stem] = folder
    return folders
