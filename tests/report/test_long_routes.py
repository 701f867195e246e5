"""A long route prints as a checker reads it: runs of like pipes as one row, sums over
hundreds of pipes by their first and last terms (the whole line attached), the pipes'
inputs in the table of pipes, a long input attached rather than echoed."""

from __future__ import annotations

import re
import sys
from pathlib import Path

import pypdf

from calcreport.report.sections.calculation import LINE_CHARS, elided
from calcreport.report.sections.common import runs

ROOT = Path(__file__).parent.parent.parent


def test_runs_of_like_rows_become_one_row_naming_the_run():
    rows = [["S1", "8 m"], ["D1", "60 m"], ["D2", "60 m"], ["D3", "60 m"], ["D4", "35 m"]]
    assert runs(rows) == [["S1", "8 m"], ["D1–D3 (3)", "60 m"], ["D4", "35 m"]]
    assert runs(rows[:1]) == rows[:1]
    assert runs([]) == []


def test_a_long_sum_keeps_its_ends_and_counts_the_terms_between():
    terms = [f"{n}.5 m" for n in range(1, 501)]
    line = "Σh = " + " + ".join(terms) + " = 125250 m"
    short = elided(line)
    assert len(short) < len(line) and len(short) <= LINE_CHARS + 120
    kept = re.findall(r"(\d+)\.5 m", short)
    hidden = int(re.search(r"… (\d+) more terms", short).group(1))
    assert len(kept) + hidden == 500  # no term lost from the count
    assert kept[0] == "1" and kept[-1] == "500" and short.endswith("= 125250 m")
    assert elided("Re = 998.2 × 1.5 × 0.1 / 0.001 = 149730") == (
        "Re = 998.2 × 1.5 × 0.1 / 0.001 = 149730"
    )


def test_a_long_rising_main_reads_in_a_few_pages(tmp_path):
    from calcreport.cli import main

    sys.path.insert(0, str(ROOT / "bench"))
    from generate import system  # a rising main of many segments (the benchmark's)

    source = tmp_path / "main.toml"
    source.write_text(system(120), encoding="utf-8")
    assert main(["build", str(source), "-o", str(tmp_path)]) == 0
    reader = pypdf.PdfReader(tmp_path / "main.pdf")
    text = re.sub(r"\s+", " ", " ".join(page.extract_text() for page in reader.pages))
    assert len(reader.pages) <= 24  # about the demo's length for 120 pipes
    assert re.search(r"D\d+–D\d+ \(\d+\)", text)  # like pipes as one row
    assert "more terms (the full line is in the attached listing)" in text
    assert "inputs of the 121 pipes are not listed here" in text
