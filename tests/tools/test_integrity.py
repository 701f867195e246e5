"""Integrity under attack and carelessness: bounded input, safe files, safe terminal text.

Each test is a reproducer that once hung the tool, exhausted its memory, ended in an
internal error (exit 1) after ``check`` had said the input was valid, or printed control
characters raw. Every one must now end in exit 2 with a message naming the key or file.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from calcreport.cli import main, terminal_safe
from calcreport.errors import InputError
from calcreport.model.loader import load, loads
from calcreport.units import MAX_QUANTITY_CHARS, UnitProblem, parse

EXAMPLES = Path(__file__).parents[2] / "input_examples"
BASE = (EXAMPLES / "check_case.toml").read_text(encoding="utf-8")


def _problems(text: str) -> list[str]:
    with pytest.raises(InputError) as err:
        loads(text.encode())
    return [f"{p.key}: {p.message}" for p in err.value.problems]


def _both(tmp_path: Path, text: str, capsys) -> tuple[int, int, str]:
    """Exit statuses of check and solve on ``text``, and what they printed to stderr."""
    path = tmp_path / "input.toml"
    path.write_text(text, encoding="utf-8")
    checked = main(["check", str(path)])
    solved = main(["solve", str(path)])
    return checked, solved, capsys.readouterr().err


# ---- quantities: our own grammar before the unit library -------------------------------


@pytest.mark.parametrize(
    "value",
    ["1 m * 9**9**9", "1 m**99999", "2 m^(3**3**3)", "3 exp(9)", "4 m; import os", "5 m))"],
)
def test_unit_arithmetic_is_refused_before_the_unit_library(value):
    with pytest.raises(UnitProblem) as info:
        parse(value, "length")
    assert "cannot be read" in str(info.value) or "parentheses" in str(info.value)


def test_a_long_quantity_is_refused_by_its_length():
    value = "1" + " " * 100_000 + "m"
    with pytest.raises(UnitProblem) as info:
        parse(value, "length")
    assert f"at most {MAX_QUANTITY_CHARS}" in str(info.value)


@pytest.mark.parametrize(
    ("value", "kind"),
    [("1e300 L/s", "flow"), ("1e-300 L/s", "flow"), ("1e300 m", "length"), ("1e12 rpm", "speed")],
)
def test_magnitudes_beyond_any_pump_system_are_refused(value, kind):
    with pytest.raises(UnitProblem, match="beyond any real pump system"):
        parse(value, kind)


def test_units_the_trade_writes_still_read():
    assert parse("1.5 m^3/h", "flow") == pytest.approx(1.5 / 3600)
    assert parse("3 kg/m**3", "density") == pytest.approx(3.0)
    assert parse("10 1/s", "speed") == pytest.approx(10 / (2 * 3.141592653589793))
    assert parse("8 delta_degC", "temperature_difference") == pytest.approx(8.0)


# ---- check is solve without the arithmetic ----------------------------------------------


@pytest.mark.parametrize(
    ("edit", "key"),
    [
        (
            lambda t: t.replace(
                'kind = "water"\ntemperature = "20 degC"',
                'kind = "ethylene_glycol"\nmass_fraction = 0.10\ntemperature = "-10 degC"',
            ),
            "fluid.temperature",
        ),
        (lambda t: t.replace("[source]\n", '[source]\npressure = "200 MPa"\n'), "source.pressure"),
        (lambda t: t.replace('flow = "20 L/s"', 'flow = "1e300 L/s"'), "duty.flow"),
        (
            lambda t: t.replace("efficiency = 0.75", "efficiency = 0.75\nstages = " + "9" * 400),
            "pump.stages",
        ),
        (lambda t: t.replace("format = 1", "format = 1\nx = " + "[" * 2000 + "]" * 2000), "<toml>"),
    ],
)
def test_what_check_accepts_solve_can_compute(tmp_path, capsys, edit, key):
    checked, solved, err = _both(tmp_path, edit(BASE), capsys)
    assert (checked, solved) == (2, 2), err
    assert key in err and "internal error" not in err


def test_a_glycol_below_its_freezing_point_names_the_point():
    text = BASE.replace(
        'kind = "water"\ntemperature = "20 degC"',
        'kind = "ethylene_glycol"\nmass_fraction = 0.10\ntemperature = "-10 degC"',
    )
    (problem,) = _problems(text)
    # CoolProp INCOMP::MEG[0.1]: freezing point 269.79 K (-3.36 degC).
    assert "freezing point, -3.357 degC" in problem


def test_a_byte_order_mark_is_accepted(tmp_path):
    path = tmp_path / "bom.toml"
    path.write_bytes(b"\xef\xbb\xbf" + BASE.encode())
    assert load(path).flow.value == pytest.approx(0.020)


def test_duplicate_component_ids_are_refused():
    extra = (
        '[[component]]\nid = "V-1"\nat = "D1"\npressure_rating = "1 MPa"\n'
        '[[component]]\nid = "V-1"\nat = "D1"\npressure_rating = "2 MPa"\n'
        '[[component]]\nid = "casing"\nat = "D1"\npressure_rating = "2 MPa"\n'
    )
    found = " ".join(_problems(BASE + extra))
    assert "already used" in found and "reserved" in found


def test_at_most_fifty_problems_are_listed_then_a_count():
    bad = BASE.replace("[[pipe]]", "[[pipe]]\nnonsense = 1", 1)
    bad += "".join(f'\nunknown_{i} = "x"' for i in range(80))
    with pytest.raises(InputError) as err:
        loads(bad.encode())
    text = str(err.value)
    assert text.count("\n  - ") == 50
    assert "more; mend these and check again" in text


# ---- files: regular files only, never more than a limit ---------------------------------


def test_a_device_a_fifo_and_a_link_loop_are_refused(tmp_path, capsys):
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    loop = tmp_path / "a.toml"
    (tmp_path / "b.toml").symlink_to(loop)
    loop.symlink_to(tmp_path / "b.toml")
    for path, says in (
        ("/dev/zero", "not a regular file"),
        (str(fifo), "not a regular file"),
        (str(loop), "links form a loop"),
        (str(tmp_path), "a folder"),
    ):
        for command in ("check", "recheck", "diff"):
            argv = [command, path] + ([path] if command == "diff" else [])
            assert main(argv) == 2, (command, path)
            assert says in capsys.readouterr().err


def test_a_curve_file_that_is_a_device_is_refused(tmp_path):
    start = BASE.index("[motor]")
    text = BASE[:start] + '[pump.curve]\nspeed = "2900 rpm"\nfile = "/dev/zero"\n\n' + BASE[start:]
    path = tmp_path / "input.toml"
    path.write_text(text, encoding="utf-8")
    # Outside the input's folder: refused unless the user allows files elsewhere.
    with pytest.raises(InputError) as err:
        load(path)
    assert any("outside the input's folder" in p.message for p in err.value.problems)
    with pytest.raises(InputError) as err:
        load(path, files_anywhere=True)
    assert any("not a regular file" in p.message for p in err.value.problems)
    assert main(["check", "--files-anywhere", str(path)]) == 2


def test_previous_trace_that_is_a_device_is_refused(tmp_path, capsys):
    path = tmp_path / "input.toml"
    path.write_text(BASE, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path), "--previous", "/dev/zero"]) == 2
    assert "not a regular file" in capsys.readouterr().err
    assert not (tmp_path / "input.pdf").exists()


# ---- the command line ---------------------------------------------------------------------


def test_new_refuses_to_write_through_a_link(tmp_path, capsys):
    target = tmp_path / "elsewhere.txt"
    target.write_text("keep me", encoding="utf-8")
    link = tmp_path / "starter.toml"
    link.symlink_to(target)
    assert main(["new", str(link), "--force"]) == 2
    assert "symbolic link" in capsys.readouterr().err
    assert target.read_text(encoding="utf-8") == "keep me"


def test_control_characters_are_escaped_on_the_terminal():
    assert terminal_safe("step \x1b[2K\rconfirmed\n") == "step \\x1b[2K\\x0dconfirmed\n"
    assert terminal_safe("tab\tand line\n") == "tab\tand line\n"


def test_interrupt_exits_130_with_one_line(monkeypatch, capsys):
    import calcreport.cli as cli

    def interrupted(args):
        raise KeyboardInterrupt

    monkeypatch.setitem(cli._COMMANDS, "check", interrupted)
    assert main(["check", "anything.toml"]) == 130
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "interrupted" in err and "Traceback" not in err


# ---- the renderer takes anything the loader accepts -------------------------------------


def _build(tmp_path: Path, text: str) -> list[str]:
    pypdf = pytest.importorskip("pypdf")
    path = tmp_path / "input.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path)]) == 0
    return [page.extract_text() for page in pypdf.PdfReader(tmp_path / "input.pdf").pages]


def test_fifty_fittings_on_one_pipe_and_fifty_revisions_build(tmp_path):
    fittings = ", ".join('{ kind = "elbow_90_long_radius" }' for _ in range(50))
    revisions = "".join(
        f'\n[[revision]]\nrevision = "R{i}"\ndate = "2026-01-{i % 28 + 1:02d}"\n'
        f'description = "Revision {i}: {"word " * 12}"\n'
        for i in range(50)
    )
    text = BASE.replace("fittings = [{ K = 3.366 }", f"fittings = [{fittings}, {{ K = 3.366 }}")
    text = text.replace("[fluid]", revisions + "\n[fluid]")
    pages = _build(tmp_path, text)
    flat = " ".join(" ".join(pages).split())
    # The same catalog item fifty times is one entry, counted; the cover shows the latest
    # revisions and says how many earlier ones the input holds.
    assert "× 50" in flat
    assert "46 earlier revisions" in flat and "R49" in pages[0]


def test_math_markup_in_an_id_is_printed_as_written(tmp_path):
    pages = _build(tmp_path, BASE.replace('id = "D1"', 'id = "$\\\\frac$"'))
    assert "$\\frac$" in " ".join(pages)


def test_a_long_input_line_is_echoed_in_pieces(tmp_path):
    pages = _build(tmp_path, "# " + "x" * 20_000 + "\n" + BASE)
    appendix = " ".join(pages[-8:])
    assert appendix.count("↩") >= 100  # 20 000 characters at ~130 a printed line


# ---- all-or-nothing output ----------------------------------------------------------------


def test_a_failed_replacement_puts_the_previous_set_back(tmp_path, monkeypatch):
    import calcreport.output as output

    targets = [tmp_path / "a.pdf", tmp_path / "a.trace.json", tmp_path / "a.pages.json"]
    for path in targets:
        path.write_bytes(b"old " + path.name.encode())
    real = os.replace
    calls = {"n": 0}

    def failing(source, target):
        if str(source).endswith(".part"):
            calls["n"] += 1
            if calls["n"] == 2:
                raise PermissionError(13, "Permission denied")
        return real(source, target)

    monkeypatch.setattr(output.os, "replace", failing)
    with pytest.raises(OSError) as err:
        output.write_all({path: b"new" for path in targets})
    assert err.value.filename == str(targets[1])  # the file asked for, not a temporary
    for path in targets:
        assert path.read_bytes() == b"old " + path.name.encode()
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(p.name for p in targets)


def test_a_rebuild_keeps_file_modes_and_bytes_do_not_depend_on_the_path(tmp_path, monkeypatch):
    path = tmp_path / "case.toml"
    path.write_text(BASE, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path / "a")]) == 0
    pdf = tmp_path / "a" / "case.pdf"
    os.chmod(pdf, 0o640)
    monkeypatch.chdir(tmp_path)
    assert main(["build", "./a/../case.toml", "-o", "a"]) == 0
    assert os.stat(pdf).st_mode & 0o777 == 0o640
    assert main(["build", "case.toml", "-o", "b"]) == 0
    for name in ("case.pdf", "case.trace.json"):
        assert (tmp_path / "a" / name).read_bytes() == (tmp_path / "b" / name).read_bytes()
    assert str(tmp_path) not in (tmp_path / "b" / "case.trace.json").read_text(encoding="utf-8")


# ---- the equation-layout cache -------------------------------------------------------------


@pytest.mark.parametrize("content", ["[1, 2, 3]", '{"k": [1, 2, 3, [["x"]], []]}', "{", "nul\0"])
def test_a_wrong_cache_file_is_ignored_and_rewritten(tmp_path, monkeypatch, content):
    from calcreport.report import mathtext

    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    mathtext._stored.cache_clear()
    path = mathtext._cache_file()
    assert path is not None
    path.parent.mkdir(parents=True)
    path.write_text(content, encoding="utf-8")
    try:
        _build(tmp_path, BASE)
    finally:
        mathtext._stored.cache_clear()
    # A fresh process rewrites the file whole, in the shape this module reads.
    import json
    import subprocess
    import sys

    source = tmp_path / "fresh.toml"
    source.write_text(BASE, encoding="utf-8")
    env = {**os.environ, "XDG_CACHE_HOME": str(tmp_path / "cache")}
    run = subprocess.run(
        [sys.executable, "-m", "calcreport", "build", str(source), "-o", str(tmp_path / "o")],
        env=env, capture_output=True, text=True, timeout=300,
    )  # fmt: skip
    assert run.returncode == 0, run.stderr
    assert mathtext._well_formed(json.loads(path.read_text(encoding="utf-8")))


def test_no_home_folder_turns_the_cache_off(tmp_path, monkeypatch):
    from calcreport.report import mathtext

    def no_home() -> Path:
        raise RuntimeError("Could not determine home directory.")

    monkeypatch.delenv("XDG_CACHE_HOME", raising=False)
    monkeypatch.setattr(mathtext.Path, "home", staticmethod(no_home))
    mathtext._stored.cache_clear()
    try:
        assert mathtext._cache_file() is None
        _build(tmp_path, BASE)
    finally:
        mathtext._stored.cache_clear()


def test_very_long_unbroken_words_build(tmp_path):
    text = BASE.replace('title = "Check case: two open tanks"', 'title = "' + "W" * 1900 + '"')
    text = text.replace('note = "exit"', 'note = "' + "Z" * 1500 + '"')
    pages = _build(tmp_path, text)
    assert len(pages) > 10
