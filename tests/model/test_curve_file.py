"""Pump curves read from a CSV file beside the input."""

import hashlib
from pathlib import Path

import pytest

from calcreport.cli import main
from calcreport.errors import InputError
from calcreport.model.loader import load
from calcreport.solver import solve

EXAMPLE = Path(__file__).parents[2] / "input_examples" / "cooling_water_selected_pump.toml"
CSV = """# the example's own curve, as a vendor file
flow [L/s],head [m],efficiency [-],npsh_required [m]
0,36.0,0.0,1.6
10,35.4,0.52,1.8
20,33.6,0.72,2.3
30,30.4,0.80,3.1
40,25.8,0.78,4.3
50,19.6,0.66,6.0
"""


def _with_file(folder: Path, name: str = "curve.csv", csv: str = CSV) -> Path:
    source = EXAMPLE.read_text(encoding="utf-8")
    start, end = source.index("[pump.curve]"), source.index("[motor]")
    text = source[:start] + f'[pump.curve]\nspeed = "1480 rpm"\nfile = "{name}"\n\n' + source[end:]
    (folder / "curve.csv").write_text(csv, encoding="utf-8")
    path = folder / "system.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_csv_curve_equals_the_inline_curve(tmp_path):
    inline = solve(load(EXAMPLE))
    from_file = solve(load(_with_file(tmp_path)))
    a, b = inline.results["operating_point"], from_file.results["operating_point"]
    for key in ("flow", "head", "efficiency", "npsh_required"):
        assert b[key]["value"] == pytest.approx(a[key]["value"], rel=1e-14)
    (entry,) = from_file.input["files"]
    digest = hashlib.sha256(CSV.encode()).hexdigest()
    assert entry == {"path": "curve.csv", "sha256": digest, "role": "pump curve"}


def test_report_lists_the_curve_file_with_its_hash(tmp_path):
    pypdf = pytest.importorskip("pypdf")
    path = _with_file(tmp_path)
    assert main(["build", str(path)]) == 0
    text = "".join(p.extract_text() for p in pypdf.PdfReader(tmp_path / "system.pdf").pages)
    assert hashlib.sha256(CSV.encode()).hexdigest() in text.replace("\n", "")


@pytest.mark.parametrize(
    ("name", "csv", "message"),
    [
        ("../outside.csv", CSV, "outside the input's folder"),
        ("missing.csv", CSV, "cannot be read"),
        ("curve.csv", CSV.replace("flow [L/s]", "flow"), "flow"),
        ("curve.csv", CSV.replace("head [m]", "heads [m]"), "not curve columns"),
        ("curve.csv", CSV.replace("10,35.4,0.52,1.8", "10,35.4,0.52"), "Line 4"),
    ],
)
def test_bad_curve_files_are_input_problems(tmp_path, name, csv, message):
    with pytest.raises(InputError) as error:
        load(_with_file(tmp_path, name, csv))
    assert "pump.curve.file" in str(error.value) or "pump.curve.flow" in str(error.value)
    assert message in str(error.value)
