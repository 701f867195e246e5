"""The PDF report, opened as a reviewer would: pages, title block, steps, figures, hashes."""

import hashlib
import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from calcreport.cli import main

pypdf = pytest.importorskip("pypdf")

EXAMPLES = Path(__file__).parents[2] / "input_examples"


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    """Every example built once: {stem: (pdf path, trace dict, page texts)}."""
    out = tmp_path_factory.mktemp("reports")
    result = {}
    for path in sorted(EXAMPLES.glob("*.toml")):
        assert main(["build", str(path), "-o", str(out)]) == 0
        pdf = out / f"{path.stem}.pdf"
        trace = json.loads((out / f"{path.stem}.trace.json").read_text(encoding="utf-8"))
        pages = [page.extract_text() for page in pypdf.PdfReader(pdf).pages]
        result[path.stem] = (pdf, trace, pages)
    return result


def test_title_block_on_every_page(built):
    for pdf, trace, pages in built.values():
        total = len(pages)
        assert total >= 10
        for n, page in enumerate(pages, start=1):
            assert f"Page {n} of {total}" in page, (pdf.name, n)
            if trace["project"]["calc_id"]:
                assert f"Calc. {trace['project']['calc_id']}" in page
                assert f"Rev. {trace['project']['revision']}" in page


@pytest.fixture(scope="module")
def built_full(tmp_path_factory):
    """One example built with the listing printed: (pdf path, trace dict, page texts)."""
    out = tmp_path_factory.mktemp("full")
    path = EXAMPLES / "reservoir_fill_si.toml"
    assert main(["build", str(path), "-o", str(out), "--listing", "full"]) == 0
    pdf = out / "reservoir_fill_si.pdf"
    trace = json.loads((out / "reservoir_fill_si.trace.json").read_text(encoding="utf-8"))
    return pdf, trace, [page.extract_text() for page in pypdf.PdfReader(pdf).pages]


def test_every_equation_is_worked_in_print(built):
    # The printed report works each equation at least once; every step of every state
    # is in the attached listing (tests/report/test_archive.py).
    for pdf, trace, pages in built.values():
        text = "\n".join(pages).replace("\n", "")
        printed = {st["function"] for st in trace["steps"] if f"[{st['id']}]" in text}
        missing = {st["function"] for st in trace["steps"]} - printed
        assert not missing, (pdf.name, sorted(missing))


def test_every_design_case_step_is_printed_or_tabulated(built):
    # A design-case step not worked in print still shows in a table of results: the
    # per-pipe tables (hydraulics, surge) name the pipe, the route's table of points the point.
    for pdf, trace, pages in built.values():
        text = "\n".join(pages).replace("\n", "")
        for st in trace["steps"]:
            if st.get("case", "C1") != "C1" or st["id"].startswith("P"):
                continue
            pipe = re.match(r"^(?:pipe|route|surge)\.([^.]+)\.", st["id"])
            assert f"[{st['id']}]" in text or (pipe and pipe.group(1).replace("_", " ") in text), (
                pdf.name,
                st["id"],
            )


def test_the_full_listing_prints_every_step_id(built_full):
    pdf, trace, pages = built_full
    text = "\n".join(pages).replace("\n", "")
    assert "Appendix C — Full step listing" in text
    for step in trace["steps"]:
        assert f"[{step['id']}]" in text, (pdf.name, step["id"])
    sidecar = json.loads((pdf.parent / "reservoir_fill_si.pages.json").read_text("utf-8"))
    assert set(sidecar["steps"]) == {s["id"] for s in trace["steps"]}


def test_the_listing_is_not_printed_by_default(built):
    for pdf, _, pages in built.values():
        text = "\n".join(pages)
        assert "Appendix C" not in text, pdf.name
        assert "attached" in text and "listing" in text


def test_tdh_printed_as_in_trace(built):
    for _, trace, pages in built.values():
        tdh = trace["results"]["total_dynamic_head"]["value"]
        text = "\n".join(pages)
        # The substituted line prints 5 significant figures: of the SI value, or in a US
        # report of the value in feet (0.3048 m exactly, NIST SP 811 appendix B).
        shown, unit = (tdh / 0.3048, "ft") if trace["project"]["units"] == "US" else (tdh, "m")
        assert f"= {shown:.5g} {unit}" in text.replace("\n", " ")


def test_figures_have_numbered_captions(built):
    for pdf, _, pages in built.values():
        text = "\n".join(pages)
        numbers = [int(n) for n in re.findall(r"Figure (\d+) — ", text)]
        assert len(set(numbers)) >= 3, pdf.name
        assert sorted(set(numbers)) == list(range(1, max(numbers) + 1))


def test_input_hash_and_echo_printed(built):
    for stem, (_, trace, pages) in built.items():
        raw = (EXAMPLES / f"{stem}.toml").read_bytes()
        digest = hashlib.sha256(raw).hexdigest()
        assert trace["input"]["sha256"] == digest
        text = "\n".join(pages).replace("\n", "")
        assert digest in text
        first_key = next(line for line in raw.decode().splitlines() if line.startswith("format"))
        assert first_key.replace(" ", "") in text.replace(" ", "").replace("\xa0", "")


def _contents_entries(page: str) -> list[tuple[str, str]]:
    """(title, page number) of each contents line: title, leader dots, number."""
    found = re.findall(r"^(?:\d+(?:\.\d+)?  )?(\S.*?)\n[. ]+\n(\d+)$", page, re.MULTILINE)
    return [(title.strip(), number) for title, number in found]


def test_sections_in_reviewers_order(built):
    # The order a plan checker reads: cover, rated duty, summary, contents, then the body
    # (DEVELOPERS.md).
    order = [
        "Rated duty",
        "Summary",
        "The system at a glance",
        "Basis of the calculation",
        "Calculation",
        "Design checks",
        "Charts",
        "Exclusions, cautions and code-deferral notes",
        "References",
        "Appendix A",
        "Appendix B",
    ]
    for _, _, pages in built.values():
        contents = next(i for i, page in enumerate(pages) if "Contents" in page)
        # The rated duty is page 2 and the summary opens page 3; a design with many open
        # checks may take a second page.
        assert pages[1].startswith("Rated duty")
        assert "1 Summary" in pages[2] and "1.3 Conclusion" in "".join(pages[2 : contents + 1])
        assert contents <= 4
        entries = _contents_entries(pages[contents])
        titles = [t for t, _ in entries]
        found = [next(i for i, t in enumerate(titles) if t.startswith(name)) for name in order]
        assert found == sorted(found)
        numbers = [int(n) for _, n in entries]
        assert numbers == sorted(numbers)


def test_contents_page_numbers_point_at_the_headings(built):
    for _, _, pages in built.values():
        contents = next(i for i, page in enumerate(pages) if "Contents" in page)
        entries = _contents_entries(pages[contents])
        assert len(entries) >= 10
        for title, page in entries:
            assert title.strip() in pages[int(page) - 1].replace("\n", " "), (title, page)


def test_rebuild_is_byte_identical(built, tmp_path):
    for stem, (pdf, _, _) in built.items():
        assert main(["build", str(EXAMPLES / f"{stem}.toml"), "-o", str(tmp_path)]) == 0
        assert (tmp_path / f"{stem}.pdf").read_bytes() == pdf.read_bytes(), stem
        trace_again = (tmp_path / f"{stem}.trace.json").read_bytes()
        assert trace_again == (pdf.parent / f"{stem}.trace.json").read_bytes()


def test_us_report_prints_us_units(built):
    _, trace, pages = built["process_transfer_us"]
    assert trace["project"]["units"] == "US"
    text = "\n".join(pages)
    for unit in ("gpm", " ft", " hp", "psi", "°F"):
        assert unit in text, unit
    summary = next(p for p in pages if "Summary" in p and "Open items" in p)
    assert "L/s" not in summary


def test_metadata_set(built):
    for pdf, trace, _ in built.values():
        meta = pypdf.PdfReader(pdf).metadata
        assert trace["project"]["title"] in meta.title
        assert meta.subject.startswith("Pump-system calculation")


def test_cautions_and_code_deferral_present(built):
    for _, _, pages in built.values():
        text = " ".join(" ".join(pages).split())
        assert "licensed" in text
        assert "manufacturer's certified performance data" in text
        assert "electrical code" in text
        assert "not code requirements" in text


def test_markup_in_input_text_prints_literally(tmp_path):
    source = (EXAMPLES / "check_case.toml").read_text(encoding="utf-8")
    hostile = source.replace(
        'title = "Check case: two open tanks"',
        'title = "<b>bold</b> & <font size=40>big</font> \\u0007bell"',
    )
    path = tmp_path / "hostile.toml"
    path.write_text(hostile, encoding="utf-8")
    assert main(["build", str(path)]) == 0
    text = pypdf.PdfReader(tmp_path / "hostile.pdf").pages[0].extract_text()
    assert "<b>bold</b> & <font size=40>big</font>" in text


def test_failed_build_leaves_previous_report(tmp_path, monkeypatch):
    source = EXAMPLES / "check_case.toml"
    assert main(["build", str(source), "-o", str(tmp_path)]) == 0
    before = {p.name: p.read_bytes() for p in tmp_path.iterdir()}

    def broken(*args, **kwargs):
        raise RuntimeError("renderer failure")

    monkeypatch.setattr("calcreport.report.render", broken)
    monkeypatch.delenv("CALCREPORT_DEBUG", raising=False)
    assert main(["build", str(source), "-o", str(tmp_path)]) == 1
    after = {p.name: p.read_bytes() for p in tmp_path.iterdir()}
    assert after == before


def test_bad_input_writes_nothing(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text('format = 1\n[duty]\nflow = "-3 L/s"\n', encoding="utf-8")
    assert main(["build", str(bad)]) == 2
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bad.toml"]


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="poppler-utils not installed")
def test_pages_render_to_images(built, tmp_path):
    pdf, _, pages = built["reservoir_fill_si"]
    subprocess.run(["pdftoppm", "-r", "20", "-png", str(pdf), str(tmp_path / "p")], check=True)
    assert len(list(tmp_path.glob("p-*.png"))) == len(pages)


def test_revision_history_and_project_texts_from_the_input(built):
    _, trace, pages = built["cooling_water_selected_pump"]
    cover = " ".join(pages[0].split())
    for row in trace["project"]["revisions"]:
        assert row["revision"] in cover and row["date"] in cover
    assert "Selected pump checked on its certified curve" in cover
    assert "heat exchanger's own rating are by others" in cover
    text = " ".join(" ".join(pages).split())
    assert "Confirm the basin low-level alarm setting" in text


def test_selected_pump_report_shows_operating_point_and_motor(built):
    _, trace, pages = built["cooling_water_selected_pump"]
    summary = " ".join(pages[2].split())
    motor = trace["results"]["motor"]["rated_power"]["value"] / 1e3
    assert f"{motor:.2f} kW" in summary
    assert "NPSHr" in summary
    assert "pump.operating_flow" in " ".join("".join(pages).split())


def test_output_files_get_ordinary_permissions(tmp_path):
    import os

    umask = os.umask(0o022)
    try:
        assert main(["build", str(EXAMPLES / "check_case.toml"), "-o", str(tmp_path)]) == 0
    finally:
        os.umask(umask)
    for name in ("check_case.pdf", "check_case.trace.json"):
        assert (tmp_path / name).stat().st_mode & 0o777 == 0o644
    assert not list(tmp_path.glob(".*.part"))


def test_step_page_map_points_at_pages_printing_each_step(built):
    for stem, (pdf, trace, pages) in built.items():
        sidecar = json.loads((pdf.parent / f"{stem}.pages.json").read_text(encoding="utf-8"))
        assert sidecar["format"] == "calcreport-pages/1"
        assert sidecar["pdf_sha256"] == hashlib.sha256(pdf.read_bytes()).hexdigest()
        ids = {s["id"] for s in trace["steps"]}
        assert set(sidecar["steps"]) <= ids
        # Every equation's worked step has its page.
        functions = {s["function"] for s in trace["steps"] if s["id"] in sidecar["steps"]}
        assert functions == {s["function"] for s in trace["steps"]}
        for step_id, numbers in sidecar["steps"].items():
            for n in numbers:
                assert f"[{step_id}]" in pages[n - 1].replace("\n", ""), (stem, step_id, n)


def test_previous_revision_adds_changes_page_and_marks(built, tmp_path):
    _, trace, _ = built["check_case"]
    previous = tmp_path / "previous.trace.json"
    previous.write_text(json.dumps(trace), encoding="utf-8")
    source = (EXAMPLES / "check_case.toml").read_text(encoding="utf-8")
    revised = tmp_path / "revised.toml"
    revised.write_text(source.replace('length = "150 m"', 'length = "175 m"'), encoding="utf-8")
    assert main(["build", str(revised), "--previous", str(previous)]) == 0
    pages = [p.extract_text() for p in pypdf.PdfReader(tmp_path / "revised.pdf").pages]
    text = "\n".join(pages)
    changes = next(p for p in pages if "Changes since the previous revision" in p)
    assert "pipe[2].length" in changes and "total_dynamic_head" in changes
    assert "Δ changed" in text
    assert "[pipe.S1.velocity]" in text  # unchanged steps are printed too, unmarked


def test_missing_previous_trace_is_a_clear_error(tmp_path, capsys):
    code = main(
        [
            "build",
            str(EXAMPLES / "check_case.toml"),
            "-o",
            str(tmp_path),
            "--previous",
            str(tmp_path / "none.trace.json"),
        ]
    )
    assert code == 2
    assert "none.trace.json" in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []


def test_report_says_what_recheck_proves(built):
    for _, trace, pages in built.values():
        text = " ".join(" ".join(pages).split())
        assert "calcreport recheck" in text
        assert "does not prove that the method, the inputs or the model are right" in text
        assert trace["software"]["catalog_sha256"] in text.replace(" ", "")


def test_every_free_text_field_prints_literally(tmp_path):
    # Reportlab paragraph markup, XML entities and control characters in any free-text
    # field must print as typed and must not change the document's structure.
    hostile = "<b>x</b> &amp; <font size=40>y</font> <para>z"
    source = (EXAMPLES / "cooling_water_selected_pump.toml").read_text(encoding="utf-8")
    for key in ("title", "client", "calc_id", "prepared_by", "checked_by"):
        source = re.sub(
            rf'^{key} = ".*"$', f'{key} = "{key}: {hostile}"', source, count=1, flags=re.MULTILINE
        )
    source = source.replace('note = "swing check valve"', f'note = "note: {hostile}"')
    source = source.replace(
        'description = "Heat exchanger loss per vendor data"', f'description = "rev: {hostile}"'
    )
    source = source.replace('cautions = ["', f'cautions = ["caution: {hostile} ', 1)
    source = source.replace('id = "D2"', 'id = "D2<i>"').replace("D2", "D2<i>")
    path = tmp_path / "hostile.toml"
    path.write_text(source, encoding="utf-8")
    assert main(["build", str(path)]) == 0
    pages = [p.extract_text() for p in pypdf.PdfReader(tmp_path / "hostile.pdf").pages]
    text = " ".join(" ".join(pages).split())
    for label in ("title", "client", "prepared_by", "note", "rev", "caution"):
        assert f"{label}: {hostile}" in text, label
    assert "D2<i>" in text


def test_route_pressures_and_surge_are_reported(built):
    # The demo runs over a summit with ratings and a pump-trip screening: the reader finds
    # the route section with its governing points, the surge verdict, and both on the summary.
    _, trace, pages = built["reservoir_fill_si"]
    text = "\n".join(pages)
    route, surge = trace["results"]["route"], trace["results"]["surge"]
    assert "Pressure along the route" in text and "Surge screening" in text
    summary = next(p for p in pages if "Checks that are not a pass" in p)
    assert "Pressure along the route:" in summary and "Surge:" in summary
    assert route["min_pressure_node"] in summary
    for point in route["nodes"]:
        assert point["node"] in text
    assert [h["node"] for h in route["high_points"]] == ["D2 end"]
    assert "air-valve candidates" in text.replace("\n", " ")
    assert "transient analysis" in text
    # Every check the route and surge produced is printed with its status.
    ids = {c["id"]: c for c in trace["checks"]}
    assert {"min_pressure", "surge.pump_trip"} <= set(ids)
    assert f"{surge['head_rise']['value']:.4g} m" in text
    # One entry per rated item, each printed: the valve and the air valve both over theirs.
    rated = {i: c for i, c in ids.items() if i.startswith("pressure_rating.")}
    assert {"pressure_rating.V-2", "pressure_rating.AV-1", "pressure_rating.pipe.D1"} <= set(rated)
    flat = text.replace("\n", " ")
    for c in rated.values():
        assert c["message"].split(":")[0] in flat
    assert rated["pressure_rating.AV-1"]["status"] == "fail"


@pytest.mark.parametrize("flag", [True, False])
def test_template_lines_stay_separate_whatever_the_conditions(flag):
    # A conditional block must not swallow the line break after it (two sentences run
    # together in the cautions once did).
    from calcreport.report.sections.common import _lines

    cautions = _lines("cautions.j2", assessed=flag)
    assert len(cautions) == 6
    assert all(line.endswith(".") and line.count(". M") == 0 for line in cautions)
    conventions = _lines("conventions.j2", us=False, route=flag)
    assert len(conventions) == (10 if flag else 9)
    assert all(line.rstrip().endswith(".") for line in conventions)
    assert not any(".Along" in line or ".Flow" in line for line in conventions)


def test_a_step_on_the_whole_curve_lists_its_points_as_ranges(built):
    # The cooling-water example's curve has 6 points: a step that reads all of them
    # names them pump.curve.flow[1–6], not six keys a line.
    _, trace, pages = built["cooling_water_selected_pump"]
    step = next(s for s in trace["steps"] if s["id"] == "pump.head")
    assert [f"pump.curve.flow[{i}]" for i in range(1, 7)] == [
        k for k in step["inputs"] if k.startswith("pump.curve.flow")
    ]  # the trace keeps every key
    text = "\n".join(pages).replace("\n", " ")
    assert "pump.curve.flow[1–6]" in text and "pump.curve.head[1–6]" in text
    assert "pump.curve.flow[2]," not in text


def test_key_runs_join_consecutive_indices_only():
    from calcreport.report.sections.common import _key_runs

    keys = ["q", "a[1]", "a[2]", "a[3]", "b[1]", "b[2]", "a[5]", "a[6]", "a[7]", "a[9]"]
    assert _key_runs(keys) == ["q", "a[1–3]", "b[1]", "b[2]", "a[5–7]", "a[9]"]


def test_preliminary_conclusion_names_the_case_of_highest_head(built):
    # Without a curve the pump is selected on the worst case, not the design case alone:
    # the US example's C2 (source low, destination high) has the higher TDH.
    _, trace, pages = built["process_transfer_us"]
    cases = trace["results"]["cases"]
    assert cases["C2"]["total_dynamic_head"]["value"] > cases["C1"]["total_dynamic_head"]["value"]
    feet = cases["C2"]["total_dynamic_head"]["value"] / 0.3048  # NIST SP 811
    text = " ".join(pages[2].split())
    conclusion = text[text.index("1.3 Conclusion") :]
    assert f"in the design case and {feet:.1f} ft in C2 (Highest static head" in conclusion
    # One case only: the sentence names no other.
    _, _, single = built["check_case"]
    assert "in the design case and" not in " ".join(single[1].split())


def test_rated_duty_sheet_prints_the_data_sheet_point_with_its_steps(built):
    from calcreport.units import show

    for stem, (_, trace, pages) in built.items():
        rated = trace["results"]["rated_duty"]
        sheet = pages[1].replace("\n", " ")
        units = trace["project"]["units"]
        for column in [rated["duty"], *([rated["top"]] if "top" in rated else [])]:
            assert f"state {column['state']}" in sheet, stem
            for key, kind in (("flow", "flow"), ("total_dynamic_head", "length"),
                              ("npsh_available", "length")):  # fmt: skip
                printed = show(column[key], kind, units)
                assert f"{printed} {column[key]['from']}" in sheet, (stem, key, printed)
        if rated["control"] == "variable_speed":
            # Both speeds: the duty's (reduced) and the design case's (its run-out).
            assert "Rated duty (reduced speed)" in sheet and "Design speed (run-out)" in sheet
            assert show(rated["duty"]["speed"], "speed", units) in sheet
            assert show(rated["top"]["speed"], "speed", units) in sheet
        if "motor_rated_power" in rated:
            assert show(rated["motor_rated_power"], "power", units) in sheet
        for check_id in rated["governing"]:
            title = next(c["title"] for c in trace["checks"] if c["id"] == check_id)
            assert title.split(" (")[0][:30] in sheet, (stem, check_id)


def _outline(reader: pypdf.PdfReader) -> list[tuple[int, str, int]]:
    """(level, title, page index) of every bookmark, in order."""
    out: list[tuple[int, str, int]] = []

    def walk(items: list, level: int) -> None:
        for item in items:
            if isinstance(item, list):
                walk(item, level + 1)
            else:
                out.append((level, item.title, reader.get_destination_page_number(item)))

    walk(reader.outline, 0)
    return out


def test_bookmarks_and_contents_links_open_the_heading_s_page(built):
    # The canvas holds the pages until the last is laid out; a bookmark set while laying
    # out would point at the first page for every heading.
    for stem, (pdf, _, pages) in built.items():
        reader = pypdf.PdfReader(pdf)
        outline = _outline(reader)
        assert len(outline) >= 10
        for _, title, index in outline:
            assert title.split("  ")[-1] in pages[index].replace("\n", " "), (stem, title)
        contents = next(i for i, page in enumerate(pages) if "Contents" in page)
        pages_by_ref = {page.indirect_reference.idnum: i for i, page in enumerate(reader.pages)}
        targets = [
            pages_by_ref[a["/Dest"][0].idnum]
            for a in (x.get_object() for x in reader.pages[contents].get("/Annots", []))
            if "/Dest" in a
        ]
        assert targets == [index for _, _, index in outline], stem


def _body_lines(page: pypdf.PageObject) -> list[tuple[float, str]]:
    """(height on the page, text) of each line of the page's body (below the title block,
    above the footer), lowest last."""
    top = float(page.mediabox.height) - 80
    found: list[tuple[float, str]] = []

    def visit(text, cm, tm, font, size):
        y = tm[5] * cm[3] + cm[5]
        if text.strip() and 30 < y < top:
            found.append((y, text.strip()))

    page.extract_text(visitor_text=visit)
    lines: dict[float, list[str]] = {}
    for y, piece in found:
        key = next((k for k in lines if abs(k - y) < 2), y)
        lines.setdefault(key, []).append(piece)
    return [(y, " ".join(parts)) for y, parts in sorted(lines.items(), reverse=True)]


def test_no_heading_or_bare_table_header_at_the_foot_of_a_page(built):
    for stem, (pdf, _, _) in built.items():
        reader = pypdf.PdfReader(pdf)
        headings = {(index, title.split("  ")[-1]) for _, title, index in _outline(reader)}
        for index, page in enumerate(reader.pages):
            lines = _body_lines(page)
            if not lines:
                continue
            last = lines[-1][1]
            assert not any(i == index and last.endswith(t) for i, t in headings), (stem, index + 1)
            assert not last.startswith("Step Unit"), (stem, index + 1)  # a table's header alone


def test_no_page_under_a_third_full_except_before_a_chapter(built):
    for stem, (pdf, _, _) in built.items():
        reader = pypdf.PdfReader(pdf)
        chapters = {index for level, _, index in _outline(reader) if level == 0}
        height = float(reader.pages[0].mediabox.height) - 110  # the body's height
        for index, page in enumerate(reader.pages[:-1]):
            lines = _body_lines(page)
            used = (float(page.mediabox.height) - 80 - lines[-1][0]) / height if lines else 0
            if index + 1 not in chapters:
                assert used > 1 / 3, (stem, index + 1, round(used, 2))


def test_long_route_groups_passing_pipe_checks_and_thins_chart_labels(tmp_path):
    import sys

    from calcreport.model.loader import loads
    from calcreport.report.charts.base import MAX_PIPE_LABELS, _labelled
    from calcreport.report.document import _Report
    from calcreport.solver import solve

    sys.path.insert(0, str(EXAMPLES.parent / "bench"))
    from generate import system  # a rising main of many segments (the benchmark's)

    route = list(range(500))
    picked = _labelled(route)
    assert len(picked) == MAX_PIPE_LABELS and picked[0] == 0 and picked[-1] == 499
    assert _labelled(route[:5]) == route[:5]
    trace = solve(loads(system(30).encode())).to_json()
    report = _Report(trace, "", {})
    rows, grouped = report.grouped_checks(trace["checks"])
    assert grouped and len(rows) < len(trace["checks"])
    for row in rows:
        if "pipes pass" not in row["title"]:
            continue
        family = row["id"].rpartition(".")[0]
        members = [c for c in trace["checks"] if c["id"].rpartition(".")[0] == family
                   and c["status"] == "pass" and c["comparison"] == row["comparison"]]  # fmt: skip
        same = [c for c in members if c["limit"] == row["limit"]]
        margins = [c["margin"] for c in same if c["margin"] is not None]
        assert row["margin"] == (min(margins) if margins else None)
        assert f"{len(same)} pipes pass" in row["title"]
    # A check that does not pass keeps its own row.
    assert [c for c in trace["checks"] if c["status"] != "pass"] == [
        c for c in rows if c["status"] != "pass"
    ]


def test_a_study_report_names_the_choice_and_why_before_its_calculation(built):
    _, trace, pages = built["pump_offers"]
    text = re.sub(r"\s+", " ", " ".join(pages))
    choice = text.index("Choice of pump", text.index("Contents") + 100)
    assert choice < text.index("The system at a glance", choice)
    assert "Offer B is selected: the lowest life-cycle cost among the offers that pass" in text
    assert "Offer A would cost less over the life" in text and "fails npsh_margin" in text
    # Every offer's row: its rank, status and life-cycle cost as the trace holds them.
    for offer in trace["results"]["study"]["candidates"]:
        assert f"{offer['life_cycle_cost']['value']:,.0f} EUR" in text
    assert "Life-cycle cost of the offers" in text  # each offer's cost, worked
