"""Cross-links: a number in the report leads to the step that produced it, with a click.

Read from the PDF itself (pikepdf): every link annotation lands on a real page, and the
page map (``NAME.pages.json``) records where each link to a step lands, which must be the
step's own page when the step is worked in print.
"""

from __future__ import annotations

import json

import pikepdf
import pytest

NAMES = ["reservoir_fill_si", "process_transfer_us", "check_case"]


def _load(folder, name):
    trace = json.loads((folder / f"{name}.trace.json").read_text(encoding="utf-8"))
    pages = json.loads((folder / f"{name}.pages.json").read_text(encoding="utf-8"))
    return trace, pages


def _link_pages(path) -> tuple[list[int], int]:
    """The page (1-based) each internal link of the PDF lands on, and the page count."""
    with pikepdf.open(path) as pdf:
        number = {page.objgen: n for n, page in enumerate(pdf.pages, start=1)}
        landed = []
        for page in pdf.pages:
            for annot in page.get("/Annots", []):
                if annot.get("/Subtype") == "/Link" and "/Dest" in annot:
                    landed.append(number[annot.Dest[0].objgen])
        return landed, len(pdf.pages)


@pytest.mark.parametrize("name", NAMES)
def test_every_link_lands_on_a_page_of_the_report(built_examples, name):
    landed, count = _link_pages(built_examples[name] / f"{name}.pdf")
    assert len(landed) > 50  # the inputs of every worked step, the checks, the summary
    assert all(1 <= page <= count for page in landed)
    _, pages = _load(built_examples[name], name)
    # Every page the page map names as a link's landing is one a link in the PDF lands on.
    assert {v["page"] for v in pages["links"].values()} <= set(landed)


@pytest.mark.parametrize("name", NAMES)
def test_a_worked_step_is_where_its_links_land(built_examples, name):
    trace, pages = _load(built_examples[name], name)
    worked = pages["steps"]
    links = pages["links"]
    ids = {st["id"] for st in trace["steps"]}
    for step_id, target in links.items():
        assert step_id in ids
        if target["at"] == "step":
            assert target["page"] == worked[step_id][0], step_id
        else:  # a step not worked in print: its stage's section
            assert step_id not in worked or target["page"] in worked[step_id], step_id
            assert target["at"].startswith("sec."), step_id


@pytest.mark.parametrize("name", NAMES)
def test_step_inputs_checks_and_summary_values_are_links(built_examples, name):
    trace, pages = _load(built_examples[name], name)
    links = pages["links"]
    steps = {st["id"]: st for st in trace["steps"]}
    worked = [steps[i] for i in pages["steps"] if i in steps]
    assert worked
    for st in worked:  # each step id among a worked step's inputs
        for source in st["inputs"]:
            if source in steps:
                assert source in links, (st["id"], source)
    for check in trace["checks"]:  # each check's value, to the step it compares
        if check["step"]:
            assert check["step"] in steps, check["id"]
            assert check["step"] in links, check["id"]
    for case in trace["cases"]:  # the summary's table of results by case
        tdh = trace["results"]["cases"][case["id"]]["total_dynamic_head"]
        assert tdh["from"] in links, case["id"]


def test_a_worked_step_links_back_to_the_steps_that_use_it(built_examples):
    trace, pages = _load(built_examples["reservoir_fill_si"], "reservoir_fill_si")
    users = [st["id"] for st in trace["steps"] if "pipe.S1.reynolds" in st["inputs"]]
    assert "pipe.S1.reynolds" in pages["steps"] and users
    # Its first users are named (and linked) under its result.
    assert all(u in pages["links"] for u in users[:3])
