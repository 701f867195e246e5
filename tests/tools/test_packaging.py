"""The wheel carries every data file the package reads (fonts, catalogs, templates)."""

import fnmatch
import shutil
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest

import calcreport

ROOT = Path(__file__).parents[2]
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
    fonts = ROOT / "fonts"  # top level of the repository, installed as calcreport.fonts
    assert list(fonts.glob("*.ttf"))
    assert (fonts / "LICENSE-DejaVu.txt").is_file()
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))["tool"]
    assert config["setuptools"]["package-dir"]["calcreport.fonts"] == "fonts"
    assert "calcreport.fonts" in config["setuptools"]["packages"]


def test_a_wheel_install_builds_a_report(tmp_path):
    """Not an editable install: the wheel alone, unpacked into a folder of its own, finds its
    fonts, catalogs and templates and writes the same PDF as the source tree."""
    tracked = subprocess.run(
        ["git", "ls-files"], cwd=ROOT, capture_output=True, text=True, check=False
    )
    if tracked.returncode != 0:
        pytest.skip("not a git checkout: the files to build from are not known")
    source = tmp_path / "source"
    for name in tracked.stdout.splitlines():
        (source / name).parent.mkdir(parents=True, exist_ok=True)
        shutil.copy2(ROOT / name, source / name)
    pip = [sys.executable, "-m", "pip", "--disable-pip-version-check", "-q"]
    subprocess.run([*pip, "wheel", "--no-deps", "-w", str(tmp_path), str(source)], check=True)
    (wheel,) = tmp_path.glob("calcreport-*.whl")
    target = tmp_path / "installed"
    subprocess.run([*pip, "install", "--no-deps", "--target", str(target), str(wheel)], check=True)
    out = tmp_path / "out"
    example = ROOT / "input_examples" / "check_case.toml"
    script = (
        f"import sys; sys.path.insert(0, {str(target)!r}); import calcreport; "
        f"assert calcreport.__file__.startswith({str(target)!r}), calcreport.__file__; "
        "from calcreport.report import style; print(style.FONTS); "
        "from calcreport.cli import main; "
        f"raise SystemExit(main(['build', {str(example)!r}, '-o', {str(out)!r}]))"
    )
    run = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    assert run.stdout.splitlines()[0] == str(target / "calcreport" / "fonts")
    here = tmp_path / "here"
    from calcreport.cli import main

    assert main(["build", str(example), "-o", str(here)]) == 0
    assert (out / "check_case.pdf").read_bytes() == (here / "check_case.pdf").read_bytes()


def test_every_package_is_listed_for_the_wheel():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    listed = set(config["tool"]["setuptools"]["packages"])
    found = {
        ".".join(p.parent.relative_to(ROOT).parts)
        for p in (ROOT / "calcreport").rglob("__init__.py")
    }
    assert found <= listed, found - listed


def test_the_solve_function_survives_its_stage_being_imported():
    # The solving stage is the package calcreport.solver, so importing it does not replace
    # the function calcreport.solve with a module.
    import calcreport.solver

    model = calcreport.load(ROOT / "input_examples" / "check_case.toml")
    assert callable(calcreport.solve) and calcreport.solve(model).results
