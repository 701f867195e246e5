"""The staging of parallel pumps in the report: its table under Power and energy prints the
trace's own values (pumps running, counts feasible, input power of each way of running), the
annual energies and the saving, its worked steps, and what it leaves to the controls
designer. The model is the parallel-pump case of tests/solver/test_staging.py.
"""

from __future__ import annotations

import json
import re

import pypdf
import pytest

from calcreport.cli import main
from calcreport.units import fmt
from tests.solver.test_staging import PROFILE, text

HEADING = "Pumps running at each profile point"


def _build(tmp_path, model: str, name: str):
    path = tmp_path / f"{name}.toml"
    path.write_text(model, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path / "out")]) == 0
    trace = json.loads((tmp_path / "out" / f"{name}.trace.json").read_text(encoding="utf-8"))
    pages = [p.extract_text() for p in pypdf.PdfReader(tmp_path / "out" / f"{name}.pdf").pages]
    # The section in the calculation chapter (the contents list names it too).
    at = next(i for i, page in enumerate(pages) if HEADING in page and "kWh" in page)
    return trace, " ".join(pages[at : at + 2]).replace("\n", " ")


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("staging")
    low = [(8.0, 1000.0), *PROFILE]  # no count within the default region at 8 L/s
    return _build(tmp, text(profile=low, pump="count = 2\n"), "staging")


def test_the_table_prints_each_point_from_the_trace(built):
    trace, page = built
    for row in trace["results"]["staging"]["points"]:
        staged = f"{row['pumps']}" + (
            f" ({row['state']})" if row["state"] != row["state_fixed"] else ""
        )
        feasible = ", ".join(str(k) for k in row["feasible"]) or "none"
        power = row["electrical_power"]
        cells = [
            row["point"],
            fmt(row["flow"]["value"] * 1e3, 4),  # L/s
            f"{row['hours']:,.0f}",
            str(row["pumps_fixed"]),
            staged,
            feasible,
            fmt(power["fixed"]["value"] / 1e3, 4),  # kW
            fmt(power["staged"]["value"] / 1e3, 4),
        ]
        assert " ".join(cells) in page, cells
    assert "P2 18.00 3,000 2 1 (P2s) 1" in page  # one pump at 18 L/s, as solved in the test
    assert "P1 8.000 1,000 2 2 none" in page


def test_the_energies_and_the_saving_are_printed_with_their_steps(built):
    trace, page = built
    s = trace["results"]["staging"]
    for key in ("energy_fixed", "energy_staged", "saving"):
        assert f"{s[key]['value'] / 3.6e6:.5g} kWh" in page, key
    assert f"{s['cost_saving']['value']:,.0f} USD a year" in page
    for step in ("energy.staging.annual", "energy.staging.saving", "energy.staging.cost"):
        assert f"[{step}]" in page
    assert "ΔE = E" in page  # the saving's equation, worked


def test_the_basis_the_infeasible_point_and_the_controls_designer(built):
    _, page = built
    assert "least electrical input power" in page
    assert "preferred operating region 0.7–1.2 × Q_BEP" in page
    assert "controls designer" in page
    assert re.search(r"At P1 no count keeps each pump within its limits", page)
    assert "P1 with 1: Q/Q_BEP" in page  # why each count is refused


def test_a_us_report_prints_the_powers_in_horsepower(tmp_path):
    model = text().replace("format = 1\n", 'format = 1\n[project]\nunits = "US"\n', 1)
    trace, page = _build(tmp_path, model, "staging_us")
    assert "Input power, fixed [hp]" in page and "Flow [gpm]" in page
    row = trace["results"]["staging"]["points"][0]
    # 1 hp = 745.69987 W (NIST SP 811, appendix B).
    assert fmt(row["electrical_power"]["staged"]["value"] / 745.69987158227, 4) in page
