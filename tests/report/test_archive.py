"""The report as an archival PDF: PDF/A-3b metadata, an sRGB output intent, every font
embedded, the files it was made from attached, and a recheck from the PDF alone.

The requirements are those of ISO 19005-3:2012 (PDF/A-3), conformance level B, with the
associated files of its annex E; the objects are read back with pikepdf (a binding of
qpdf) rather than by trusting the code that wrote them.
"""

from __future__ import annotations

import hashlib
import json
import shutil
import subprocess

import pytest

from calcreport.cli import main
from tests.model.test_curve_file import CSV, _with_file

pikepdf = pytest.importorskip("pikepdf")

# The base-14 fonts a PDF may name without embedding (ISO 32000-1, 9.6.2.2); PDF/A forbids
# referencing any of them unembedded (ISO 19005-3, 6.2.11.4.1).
BASE_14 = (
    "Times",
    "Helvetica",
    "Courier",
    "Symbol",
    "ZapfDingbats",
)


@pytest.fixture(scope="module")
def curve_build(tmp_path_factory):
    """An input whose pump curve is read from a CSV beside it, built once."""
    folder = tmp_path_factory.mktemp("curve_build")
    path = _with_file(folder)
    assert main(["build", str(path)]) == 0
    return folder


def _open(path):
    return pikepdf.open(path)


def _fonts(pdf):
    for page in pdf.pages:
        resources = page.obj.get("/Resources", {})
        for font in resources.get("/Font", {}).values():
            yield font
        for xobject in resources.get("/XObject", {}).values():
            for font in xobject.get("/Resources", {}).get("/Font", {}).values():
                yield font


def test_the_metadata_declares_pdfa_3b_and_repeats_the_document_information(built_examples):
    with _open(built_examples["reservoir_fill_si"] / "reservoir_fill_si.pdf") as pdf:
        assert pdf.pdf_version >= "1.7"
        with pdf.open_metadata() as meta:
            assert meta["pdfaid:part"] == "3"
            assert meta["pdfaid:conformance"] == "B"
            assert meta["dc:title"] == str(pdf.docinfo["/Title"])
            assert meta["pdf:Producer"] == str(pdf.docinfo["/Producer"]) == "calcreport"
        # The project's date is the document's date (none of the machine's clock).
        trace = json.loads(
            (built_examples["reservoir_fill_si"] / "reservoir_fill_si.trace.json").read_text()
        )
        day = trace["project"]["date"].replace("-", "")
        assert str(pdf.docinfo["/CreationDate"]).startswith(f"D:{day}")


def test_the_output_intent_is_srgb_with_its_profile(built_examples):
    with _open(built_examples["check_case"] / "check_case.pdf") as pdf:
        (intent,) = pdf.Root.OutputIntents
        assert intent.S == "/GTS_PDFA1"
        profile = intent.DestOutputProfile.read_bytes()
        assert profile[36:40] == b"acsp"  # the ICC profile signature (ICC.1:2010, 7.2.9)
        assert profile[16:20] == b"RGB "  # colour space of the data
        assert int(intent.DestOutputProfile.N) == 3


@pytest.mark.parametrize(
    "name", ["reservoir_fill_si", "process_transfer_us", "cooling_water_selected_pump"]
)
def test_every_font_is_embedded_and_none_is_a_base_14_font(built_examples, name):
    with _open(built_examples[name] / f"{name}.pdf") as pdf:
        fonts = list(_fonts(pdf))
        assert fonts
        for font in fonts:
            base = str(font.BaseFont)
            assert not any(base.lstrip("/").startswith(b) for b in BASE_14), base
            descriptor = font.get("/FontDescriptor")
            if descriptor is None:  # a composite font carries it in its descendant
                descriptor = font.DescendantFonts[0].FontDescriptor
            assert any(k in descriptor for k in ("/FontFile", "/FontFile2", "/FontFile3")), base


def test_the_input_curve_file_and_trace_are_attached_with_their_hashes(curve_build):
    with _open(curve_build / "system.pdf") as pdf:
        files = {name: spec for name, spec in pdf.attachments.items()}
        assert set(files) == {"system.toml", "curve.csv", "system.trace.json", "system.steps.txt"}
        listing = files.pop("system.steps.txt")
        assert str(listing.obj.AFRelationship) == "/Supplement"
        expected = {
            "system.toml": (curve_build / "system.toml").read_bytes(),
            "curve.csv": CSV.encode("utf-8"),
            "system.trace.json": (curve_build / "system.trace.json").read_bytes(),
        }
        for name, spec in files.items():
            data = spec.get_file().read_bytes()
            assert data == expected[name], name
            assert hashlib.sha256(data).hexdigest() in str(spec.description), name
        relationships = {name: str(spec.obj.AFRelationship) for name, spec in files.items()}
        assert relationships == {
            "system.toml": "/Source",
            "curve.csv": "/Source",
            "system.trace.json": "/Data",
        }
        mimes = {name: str(spec.get_file().mime_type) for name, spec in files.items()}
        assert mimes["system.trace.json"] == "application/json"
        # Associated files of the document (ISO 19005-3, annex E): the catalog's /AF.
        associated = {str(f.UF) for f in pdf.Root.AF}
        assert associated == {*files, "system.steps.txt"}


def test_the_attached_listing_holds_every_step_with_its_recorded_result(curve_build):
    trace = json.loads((curve_build / "system.trace.json").read_text(encoding="utf-8"))
    with _open(curve_build / "system.pdf") as pdf:
        text = pdf.attachments["system.steps.txt"].get_file().read_bytes().decode("utf-8")
    blocks = {
        block.split("]  ", 1)[0][1:]: block for block in text.split("\n\n") if block.startswith("[")
    }
    assert list(blocks) == [st["id"] for st in trace["steps"]]
    for st in trace["steps"]:
        block = blocks[st["id"]]
        assert f"substituted: {st['substituted']}" in block
        # The result at the trace's full precision: it reads back as the same float.
        shown = block.split("result:", 1)[1].split("=", 1)[1].split()[0]
        assert float(shown) == st["value"], st["id"]


def test_appendix_c_lists_the_attached_files_and_how_to_recheck_them(curve_build):
    pypdf = pytest.importorskip("pypdf")
    reader = pypdf.PdfReader(curve_build / "system.pdf")
    tail = " ".join(p.extract_text() for p in reader.pages[-4:])
    words = " ".join(tail.split())
    assert "Files attached to this PDF" in words
    trace_sha = hashlib.sha256((curve_build / "system.trace.json").read_bytes()).hexdigest()
    assert trace_sha in words.replace(" ", "") or trace_sha[:32] in words
    assert "calcreport recheck REPORT.pdf" in words


def test_the_pdf_passes_the_pdfa_3b_checks(built_examples):
    pdfa = pytest.importorskip("pikepdf.pdfa")
    for name, folder in built_examples.items():
        with _open(folder / f"{name}.pdf") as pdf:
            report = pdfa.check(pdf, "3b")
            assert not report.findings, (name, report.findings)


def test_qpdf_finds_no_structural_error(built_examples):
    qpdf = shutil.which("qpdf")
    if qpdf is None:
        pytest.skip("qpdf is not installed")
    for name, folder in built_examples.items():
        run = subprocess.run(
            [qpdf, "--check", str(folder / f"{name}.pdf")], capture_output=True, text=True
        )
        assert run.returncode == 0, (name, run.stdout, run.stderr)
        assert "No syntax or stream encoding errors" in run.stdout


def test_the_outline_has_a_bookmark_per_section(built_examples):
    with _open(built_examples["reservoir_fill_si"] / "reservoir_fill_si.pdf") as pdf:
        with pdf.open_outline() as outline:
            titles = [item.title for item in outline.root]
    assert len(titles) >= 8
    assert any("Design checks" in t for t in titles), titles
    assert any(t.startswith("Appendix B") for t in titles), titles


def test_a_rebuild_gives_the_same_bytes(curve_build, tmp_path):
    again = tmp_path / "again"
    again.mkdir()
    for name in ("system.toml", "curve.csv"):
        shutil.copy(curve_build / name, again / name)
    assert main(["build", str(again / "system.toml")]) == 0
    assert (again / "system.pdf").read_bytes() == (curve_build / "system.pdf").read_bytes()


def test_recheck_reads_the_trace_attached_to_the_pdf(curve_build, capsys):
    assert main(["recheck", str(curve_build / "system.pdf")]) == 0
    out = capsys.readouterr().out
    assert "confirmed" in out


def _replace_trace(source, target, data):
    with pikepdf.open(source) as pdf:
        spec = pdf.attachments["system.trace.json"]
        description = str(spec.description)
        del pdf.attachments["system.trace.json"]
        pdf.attachments["system.trace.json"] = pikepdf.AttachedFileSpec(
            pdf, data, description=description, filename="system.trace.json"
        )
        pdf.save(target)


def test_an_altered_attached_trace_is_refused(curve_build, tmp_path, capsys):
    trace = json.loads((curve_build / "system.trace.json").read_text(encoding="utf-8"))
    trace["results"]["total_dynamic_head"]["value"] *= 1.1
    altered = tmp_path / "altered.pdf"
    _replace_trace(curve_build / "system.pdf", altered, json.dumps(trace).encode())
    assert main(["recheck", str(altered)]) == 2
    err = capsys.readouterr().err
    assert "system.trace.json" in err and "altered" in err
    assert "Traceback" not in err


def test_a_pdf_without_a_trace_is_named_as_such(curve_build, tmp_path, capsys):
    bare = tmp_path / "bare.pdf"
    with pikepdf.open(curve_build / "system.pdf") as pdf:
        del pdf.attachments["system.trace.json"]
        pdf.save(bare)
    assert main(["recheck", str(bare)]) == 2
    err = capsys.readouterr().err
    assert "without a trace attached" in err


def test_a_damaged_pdf_is_a_clear_error(tmp_path, capsys):
    broken = tmp_path / "broken.pdf"
    broken.write_bytes(b"%PDF-1.7\nnot a pdf at all")
    assert main(["recheck", str(broken)]) == 2
    err = capsys.readouterr().err
    assert "cannot be read" in err and "Traceback" not in err
