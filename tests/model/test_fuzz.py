"""Property-based robustness: corrupted inputs end in a result or exit 2, never a defect.

Each example takes a valid input of our own, corrupts it (deletes a line, swaps a value for a
hostile one, duplicates a table header, truncates the file) and runs ``check`` and ``solve``
in-process. The outcome must be exit 0 (still valid) or exit 2 with a message naming a key or
the file, never exit 1 (an internal error) and never a traceback. Seeded (derandomised) and
bounded, so the normal test run stays repeatable and quick.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from calcreport.cli import main

EXAMPLES = sorted((Path(__file__).parents[2] / "input_examples").glob("*.toml"))
SOURCES = [p.read_text(encoding="utf-8") for p in EXAMPLES]
# Every optional block at once, so corruptions reach the interactions between them.
SOURCES.append(
    SOURCES[[p.stem for p in EXAMPLES].index("cooling_water_selected_pump")]
    .replace(
        'elevation = "85.1 m"',
        'elevation = "85.1 m"\nefficiency = 0.75\n'
        'speed = "1450 rpm"\nspeed_range = ["1200 rpm", "1480 rpm"]\ncount = 2\n'
        "standby = 1",
    )
    .replace(
        "[operation]",
        '[envelope]\ntemperature = ["10 degC", "32 degC"]\n'
        'flow_required = ["20 L/s", "30 L/s"]\n\n[operation]',
    )
)

HOSTILE = [
    '"nan m"',
    '"inf m"',
    '"-inf L/s"',
    '"1e308 km"',
    '"1e-300 mm"',
    '""',
    '"\\u0000"',
    "[]",
    "{}",
    "true",
    '"-1 m"',
    '"0 L/s"',
    '"0 mm"',
    f'"{"x" * 5000}"',
    "[[[[[1]]]]]",
    '"3 furlong"',
    '"20 m/s/s"',
    "0",
    "-0.5",
    "1e999",
    '"12,5 m"',
    '"5 psia"',
    '"100 degC"',
    '"-300 degC"',
    '"saturation"',
    '"<b>bold</b> &amp;"',
    '"a\\tb"',
    "1.0e-30",
    '"1 L/s"',
    '"99999 L/s"',
    '"1e6 m"',
    '["1 m", "2 m"]',
    '{ unit = "m", values = [] }',
    # At and beyond the loader's bounds: magnitudes, the quantity grammar, its length cap.
    '"1e-6 m"',
    '"1e-7 m"',
    '"1e6 m"',
    '"1.1e6 m"',
    '"1e4 m^3/s"',
    '"2e4 m^3/s"',
    '"1e11 Pa"',
    '"2e11 Pa"',
    '"5001 K"',
    '"1 m * 9**9**9"',
    '"2 m^99"',
    f'"1{" " * 200}m"',
    "99999999999999999999999999",
]

_ASSIGN = re.compile(r"^(\s*[A-Za-z_][\w-]*\s*=\s*)(.+)$")


def _corrupt(text: str, choice: int, position: int, value: int) -> str:
    lines = text.splitlines()
    assignments = [i for i, line in enumerate(lines) if _ASSIGN.match(line)]
    headers = [i for i, line in enumerate(lines) if line.startswith("[")]
    kind = choice % 5
    if kind == 0 and lines:  # delete a line
        del lines[position % len(lines)]
    elif kind == 1 and assignments:  # a hostile value
        i = assignments[position % len(assignments)]
        lines[i] = _ASSIGN.sub(lambda m: m.group(1) + HOSTILE[value % len(HOSTILE)], lines[i])
    elif kind == 2 and headers:  # a table twice
        lines.append(lines[headers[position % len(headers)]])
    elif kind == 3:  # the file cut short
        cut = position % max(len(text), 1)
        return text[:cut]
    elif assignments:  # two values swapped between keys
        a = assignments[position % len(assignments)]
        b = assignments[value % len(assignments)]
        va, vb = _ASSIGN.match(lines[a]).group(2), _ASSIGN.match(lines[b]).group(2)
        lines[a] = _ASSIGN.sub(lambda m: m.group(1) + vb, lines[a])
        lines[b] = _ASSIGN.sub(lambda m: m.group(1) + va, lines[b])
    return "\n".join(lines) + "\n"


MESSAGES: set[str] = set()
RUNS = [0]


@settings(
    max_examples=250,
    deadline=None,
    derandomize=True,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)
@given(
    source=st.integers(0, len(SOURCES) - 1),
    edits=st.lists(
        st.tuples(st.integers(0, 4), st.integers(0, 10_000), st.integers(0, 10_000)),
        min_size=1,
        max_size=3,
    ),
)
def test_corrupted_inputs_never_crash(tmp_path_factory, capsys, source, edits):
    text = SOURCES[source]
    for choice, position, value in edits:
        text = _corrupt(text, choice, position, value)
    path = tmp_path_factory.mktemp("fuzz") / "input.toml"
    path.write_text(text, encoding="utf-8")
    for command in ("check", "solve"):
        code = main([command, str(path)])
        out = capsys.readouterr()
        RUNS[0] += 1
        assert code in (0, 2), f"{command} exit {code}: {out.err}\n--- input ---\n{text}"
        assert "Traceback" not in out.err and "internal error" not in out.err
        if code == 2:
            assert out.err.strip(), "exit 2 must say why"
            MESSAGES.update(
                re.sub(r"\d", "#", line.split(":", 1)[-1].strip())
                for line in out.err.splitlines()
                if line.startswith("  - ")
            )
        if code != 0:
            break


def test_fuzz_statistics_are_meaningful():
    # Runs after the property test (file order): it exercised both outcomes.
    if RUNS[0] == 0:
        pytest.skip("the property test did not run first")
    assert RUNS[0] >= 250
    assert len(MESSAGES) >= 20


@settings(
    max_examples=8,
    deadline=None,
    derandomize=True,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)
@given(
    source=st.integers(0, len(SOURCES) - 1),
    edit=st.tuples(st.integers(1, 1), st.integers(0, 10_000), st.integers(0, 10_000)),
)
def test_what_the_loader_accepts_the_renderer_builds(tmp_path_factory, capsys, source, edit):
    """A hostile value that still loads goes through the whole build: no exit 1."""
    text = _corrupt(SOURCES[source], *edit)
    folder = tmp_path_factory.mktemp("fuzzbuild")
    path = folder / "input.toml"
    path.write_text(text, encoding="utf-8")
    code = main(["build", str(path), "-o", str(folder)])
    out = capsys.readouterr()
    assert code in (0, 2), f"build exit {code}: {out.err}\n--- input ---\n{text}"
    assert "internal error" not in out.err
