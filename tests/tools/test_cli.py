"""The command line: exit status, messages on stderr, nothing written on bad input.

Exit status 0 success, 2 bad input or usage, 1 only internal failure; bad
input never shows a traceback. The bulk runs ``calcreport.cli.main`` in
process; a few cases run ``python -m calcreport`` and the installed
``calcreport`` command as a user would.
"""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from calcreport import __version__
from calcreport.cli import main
from tests.model.test_loader import BAD, BAD_IDS, BASE, Bad, line_of, variant

ROOT = Path(__file__).parents[2]
EXAMPLE = ROOT / "input_examples" / "check_case.toml"
STARTER = ROOT / "calcreport" / "templates" / "starter.toml"
VALID = [EXAMPLE, STARTER]
VALID_IDS = ["check_case", "starter"]


def listing(folder: Path) -> dict[str, bytes]:
    """Every file under ``folder`` with its bytes."""
    return {
        str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()
    }


def run(*args: str, cwd: Path | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "calcreport", *args],
        capture_output=True,
        text=True,
        cwd=cwd,
        timeout=120,
        check=False,
    )


@pytest.fixture
def workdir(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """An empty working directory, so anything written by mistake is seen."""
    monkeypatch.chdir(tmp_path)
    return tmp_path


def write(folder: Path, text: str | bytes, name: str = "input.toml") -> Path:
    path = folder / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return path


# ---- bad input, in process --------------------------------------------------------------


@pytest.mark.parametrize("case", BAD, ids=BAD_IDS)
def test_check_rejects_bad_input(case: Bad, workdir: Path, capsys: pytest.CaptureFixture[str]):
    path = write(workdir, case.text)
    before = listing(workdir)
    assert main(["check", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert err.startswith(f"{path}: "), err
    assert f"  - {case.key}" in err, err
    if case.line:
        assert f"{case.key} (line {line_of(case.text, case.line, case.after)}): " in err, err
    assert "Traceback" not in err
    assert listing(workdir) == before


@pytest.mark.parametrize("case", BAD[::7], ids=BAD_IDS[::7])
def test_solve_rejects_bad_input(case: Bad, workdir: Path, capsys: pytest.CaptureFixture[str]):
    path = write(workdir, case.text)
    before = listing(workdir)
    assert main(["solve", "--json", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert case.key in err and "Traceback" not in err
    assert listing(workdir) == before


def test_every_problem_in_one_run(workdir: Path, capsys: pytest.CaptureFixture[str]):
    text = variant(
        ('length = "212 m"', 'lenght = "212 m"'),
        ("efficiency = 0.93", "efficiency = 1.2"),
        ('"18 L/s"', '"18 m"'),
        ('"24 degC"', '"105 degC"'),
        ('elevation = "35 m"', 'elevation = "0 m"'),
    )
    assert main(["check", str(write(workdir, text))]) == 2
    err = capsys.readouterr().err
    for key in ("pipe[3].lenght", "motor.efficiency", "duty.flow", "fluid.temperature"):
        assert f"  - {key} (line " in err, (key, err)
    assert 'did you mean "length"' in err
    assert "problems in the input:" in err


def test_missing_file(workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["check", str(workdir / "absent.toml")]) == 2
    err = capsys.readouterr().err
    assert "absent.toml" in err and "cannot be read" in err
    assert listing(workdir) == {}


def test_directory_as_input(workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["solve", str(workdir)]) == 2
    assert "cannot be read" in capsys.readouterr().err


def test_file_not_utf8(workdir: Path, capsys: pytest.CaptureFixture[str]):
    path = write(workdir, BASE.replace("Cooling-water", "Caf\u00e9 water").encode("latin-1"))
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err
    assert "UTF-8" in err and "(line 4)" in err


def test_invalid_toml_gives_its_line(workdir: Path, capsys: pytest.CaptureFixture[str]):
    text = variant(('inner_diameter = "128.2 mm"', 'inner_diameter = "128.2 mm'))
    assert main(["check", str(write(workdir, text))]) == 2
    err = capsys.readouterr().err
    assert "not valid TOML" in err
    line = line_of(text, 'inner_diameter = "128.2 mm\n')
    assert f"(line {line})" in err, err


# ---- usage -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    "argv",
    [
        [],
        ["frobnicate"],
        ["check"],
        ["solve"],
        ["check", "a.toml", "b.toml"],
        ["solve", "--pdf", "x"],
        ["new", "--overwrite"],
    ],
    ids=[
        "no-command",
        "unknown-command",
        "check-no-input",
        "solve-no-input",
        "two-inputs",
        "unknown-option",
        "new-unknown-option",
    ],
)
def test_usage_errors_exit_2(argv: list[str], workdir: Path, capsys: pytest.CaptureFixture[str]):
    with pytest.raises(SystemExit) as info:
        main(argv)
    assert info.value.code == 2
    err = capsys.readouterr().err
    assert "usage: calcreport" in err and "calcreport: error:" in err
    assert "Traceback" not in err
    assert listing(workdir) == {}


def test_version(capsys: pytest.CaptureFixture[str]):
    with pytest.raises(SystemExit) as info:
        main(["--version"])
    assert info.value.code == 0
    assert capsys.readouterr().out.strip() == f"calcreport {__version__}"


# ---- valid input ------------------------------------------------------------------------


@pytest.mark.parametrize("path", VALID, ids=VALID_IDS)
def test_check_valid(path: Path, workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["check", str(path)]) == 0
    out, err = capsys.readouterr()
    assert out.startswith(f"{path}: valid") and err == ""
    assert listing(workdir) == {}


@pytest.mark.parametrize("path", VALID, ids=VALID_IDS)
def test_solve_summary(path: Path, workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["solve", str(path)]) == 0
    out, err = capsys.readouterr()
    assert "Total dynamic head (TDH)" in out and "NPSH available" in out
    assert err == ""
    assert listing(workdir) == {}


@pytest.mark.parametrize("path", VALID, ids=VALID_IDS)
def test_solve_json(path: Path, workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["solve", "--json", str(path)]) == 0
    trace = json.loads(capsys.readouterr().out)
    assert trace["format"] == "calcreport-trace/1"
    assert trace["input"]["sha256"] == hashlib.sha256(path.read_bytes()).hexdigest()
    assert trace["results"]["total_dynamic_head"]["unit"] == "m"
    assert trace["steps"] and trace["checks"]
    assert listing(workdir) == {}


def test_solve_own_base_input(workdir: Path, capsys: pytest.CaptureFixture[str]):
    """The valid input the bad cases are made from solves too."""
    assert main(["solve", "--json", str(write(workdir, BASE))]) == 0
    trace = json.loads(capsys.readouterr().out)
    assert set(trace["results"]["pipes"]) == {"S1", "D1", "D2"}


def test_new_writes_a_file_that_checks(workdir: Path, capsys: pytest.CaptureFixture[str]):
    target = workdir / "mine.toml"
    assert main(["new", str(target)]) == 0
    assert target.read_bytes() == STARTER.read_bytes()
    assert "mine.toml" in capsys.readouterr().out
    assert main(["check", str(target)]) == 0


def test_new_default_path(workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["new"]) == 0
    assert list(listing(workdir)) == ["pump-system.toml"]
    assert main(["check", "pump-system.toml"]) == 0


def test_new_refuses_to_overwrite(workdir: Path, capsys: pytest.CaptureFixture[str]):
    target = write(workdir, "# my own work\n", "mine.toml")
    assert main(["new", str(target)]) == 2
    err = capsys.readouterr().err
    assert "exists" in err and "--force" in err
    assert target.read_text() == "# my own work\n"
    assert main(["new", "--force", str(target)]) == 0
    assert target.read_bytes() == STARTER.read_bytes()


def test_new_into_a_missing_folder(workdir: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["new", str(workdir / "no-such-folder" / "x.toml")]) == 2
    assert "no-such-folder" in capsys.readouterr().err


# ---- as a user runs it (subprocesses: keep these few) ----------------------------------


def test_subprocess_bad_input_lists_problems(tmp_path: Path):
    text = variant(('"64 m"', '"0 m"'), ('length = "212 m"', 'lenght = "212 m"'))
    path = write(tmp_path, text)
    before = listing(tmp_path)
    result = run("check", str(path), cwd=tmp_path)
    assert result.returncode == 2
    assert result.stdout == ""
    assert "Traceback" not in result.stderr
    line = line_of(text, 'length = "0 m"')
    assert f"pipe[2].length (line {line})" in result.stderr
    assert "pipe[3].lenght" in result.stderr and 'did you mean "length"' in result.stderr
    assert listing(tmp_path) == before


def test_subprocess_missing_file_and_not_utf8(tmp_path: Path):
    result = run("check", "absent.toml", cwd=tmp_path)
    assert (result.returncode, "Traceback" in result.stderr) == (2, False)
    assert "absent.toml" in result.stderr
    write(tmp_path, b'title = "\xff"\n', "latin.toml")
    result = run("solve", "latin.toml", cwd=tmp_path)
    assert (result.returncode, "Traceback" in result.stderr) == (2, False)
    assert "UTF-8" in result.stderr


def test_subprocess_version(tmp_path: Path):
    result = run("--version", cwd=tmp_path)
    assert (result.returncode, result.stdout.strip()) == (0, f"calcreport {__version__}")


def test_subprocess_solve_json(tmp_path: Path):
    result = run("solve", "--json", str(EXAMPLE), cwd=tmp_path)
    assert result.returncode == 0, result.stderr
    assert json.loads(result.stdout)["format"] == "calcreport-trace/1"
    assert listing(tmp_path) == {}


@pytest.mark.skipif(shutil.which("calcreport") is None, reason="console script not on PATH")
def test_installed_command(tmp_path: Path):
    result = subprocess.run(
        ["calcreport", "check", str(EXAMPLE)],
        capture_output=True,
        text=True,
        cwd=tmp_path,
        timeout=120,
        check=False,
        env={**os.environ},
    )
    assert result.returncode == 0, result.stderr
    assert "valid" in result.stdout


def test_solve_summary_shows_route_pressures_and_surge(capsys):
    from calcreport.cli import main

    assert main(["solve", str(ROOT / "input_examples" / "reservoir_fill_si.toml")]) == 0
    out = capsys.readouterr().out
    assert "Lowest pressure head (gauge)" in out and "Highest pressure (gauge)" in out
    assert "Surge" in out and "transient analysis" in out


def test_build_progress_shows_on_an_interactive_terminal_only(tmp_path, monkeypatch, capsys):
    import io

    from calcreport.cli import _progress

    class Terminal(io.StringIO):
        def isatty(self) -> bool:
            return True

    screen = Terminal()
    tell = _progress(screen)
    tell("solving 3 pipes")
    tell("")
    assert "solving 3 pipes" in screen.getvalue()
    assert screen.getvalue().endswith("\r\x1b[K")  # the status line cleared at the end
    piped = io.StringIO()
    _progress(piped)("solving 3 pipes")
    assert piped.getvalue() == ""
    # A build to a pipe (as here, under pytest) writes nothing but its one line.
    example = Path(__file__).parents[2] / "input_examples" / "check_case.toml"
    assert main(["build", str(example), "-o", str(tmp_path)]) == 0
    out, err = capsys.readouterr()
    assert err == "" and out.startswith("wrote ")
