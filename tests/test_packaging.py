"""The wheel carries every data file the package reads (fonts, catalogs, templates)."""

import fnmatch
import tomllib
from pathlib import Path

import calcreport

ROOT = Path(__file__).parent.parent
PACKAGE = Path(calcreport.__file__).parent


def test_every_data_file_is_declared_package_data():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    patterns = config["tool"]["setuptools"]["package-data"]["calcreport"]
    data = [
        p.relative_to(PACKAGE).as_posix()
        for p in PACKAGE.rglob("*")
        if p.is_file() and p.suffix not in (".py", ".pyc") and "__pycache__" not in p.parts
    ]
    assert data, "the package has data files"
    missing = [f for f in data if not any(_glob_match(f, pat) for pat in patterns)]
    assert missing == []


def _glob_match(path: str, pattern: str) -> bool:
    """setuptools' package-data globs: '*' stays within one folder level."""
    parts, pats = path.split("/"), pattern.split("/")
    return len(parts) == len(pats) and all(
        fnmatch.fnmatch(a, b) for a, b in zip(parts, pats, strict=True)
    )


def test_fonts_ship_with_their_licence():
    fonts = PACKAGE / "fonts"
    assert list(fonts.glob("*.ttf"))
    assert (fonts / "LICENSE-DejaVu.txt").is_file()
