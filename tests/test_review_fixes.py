"""Plan-checker review fixes: what a reviewer reads, shown right.

Each test failed before its fix: a temperature rise printed as an absolute temperature, the
thermal minimum flow described as the operating point, a cost without its currency, a case
titled by a level range the input does not give.
"""

import re
from pathlib import Path

import pytest

from calcreport.calc import solve
from calcreport.cli import main
from calcreport.model.loader import load

pypdf = pytest.importorskip("pypdf")
EXAMPLES = Path(__file__).parent.parent / "input_examples"


@pytest.fixture(scope="module")
def cooling(tmp_path_factory):
    out = tmp_path_factory.mktemp("cooling")
    assert main(["build", str(EXAMPLES / "cooling_water_selected_pump.toml"), "-o", str(out)]) == 0
    pdf = pypdf.PdfReader(out / "cooling_water_selected_pump.pdf")
    return " ".join(" ".join(page.extract_text() for page in pdf.pages).split())


def test_a_temperature_rise_prints_as_a_difference(cooling):
    # 8 K of rise (the default limit, common practice) is neither 8 degC nor -265.1 degC.
    assert "Result: ΔT = 8.000 K" in cooling
    assert "-265" not in cooling and "−265" not in cooling


def test_the_thermal_minimum_flow_says_what_it_solves(cooling):
    start = cooling.index("[pump.thermal_min_flow]")
    line = cooling[start : start + 400]
    assert "ΔT(Q) = ΔT_max" in line and "H_pump(Q) − H_system(Q)" not in line


def test_a_cost_prints_with_its_currency(cooling):
    assert "Result: C = 7782 EUR" in cooling


def test_a_case_names_only_the_level_ranges_given():
    t = solve(load(EXAMPLES / "process_transfer_us.toml"))  # source range only
    titles = [c["title"] for c in t.cases]
    assert "Highest static head: source low" in titles
    assert not any("destination" in title for title in titles)


def _route(extra_pump: str = "", extra: str = ""):
    from test_route import QUIET, ROUTE

    from calcreport.model.loader import loads

    text = ROUTE.replace("CREST", "26.0").replace('[pump]\nelevation = "0 m"', extra_pump)
    return solve(loads((text + QUIET + extra).encode()))


def test_a_suction_lift_asks_for_priming():
    lifted = _route('[pump]\nelevation = "4 m"')
    note = next(n for n in lifted.notes if n.startswith("Suction lift"))
    assert "2.000 m above the lowest source level" in note and "primed" in note
    flooded = _route('[pump]\nelevation = "0 m"')
    assert not any(n.startswith("Suction lift") for n in flooded.notes)


def test_an_open_item_asks_for_an_aged_pipe_state():
    new_only = _route('[pump]\nelevation = "0 m"')
    assert any("No aged-pipe state" in n for n in new_only.notes)
    aged = _route('[pump]\nelevation = "0 m"', '[envelope]\nroughness = "0.5 mm"\n')
    assert not any("No aged-pipe state" in n for n in aged.notes)


@pytest.mark.parametrize(
    ("value", "pa"),
    [("45 psi(g)", 45 * 6894.757293168361), ("310 kPa(g)", 310e3), ("2 bar (gauge)", 2e5)],
)
def test_the_gauge_mark_the_report_prints_is_read(value, pa):
    from calcreport.units import parse

    # NIST SP 811: 1 psi = 6894.757293168 Pa.
    assert parse(value, "pressure") == pytest.approx(pa, rel=1e-12)


@pytest.mark.parametrize("value", ["14.7 psia", "101 kPa(a)", "1 bara", "3 MPa(abs)"])
def test_an_absolute_mark_is_refused_saying_what_to_write(value):
    from calcreport.units import UnitProblem, parse

    with pytest.raises(UnitProblem) as err:
        parse(value, "pressure")
    assert "absolute pressure" in str(err.value) and "gauge value" in str(err.value)


def test_a_us_report_prints_check_speeds_in_rpm_and_times_with_their_unit(tmp_path):
    text = (EXAMPLES / "cooling_water_selected_pump.toml").read_text(encoding="utf-8")
    text = text.replace('units = "SI"', 'units = "US"').replace(
        'pressure_rating = "1600 kPa"',
        'pressure_rating = "1600 kPa"\nspeed_range = ["600 rpm", "1480 rpm"]',
    )
    path = tmp_path / "us.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path)]) == 0
    reader = pypdf.PdfReader(tmp_path / "us.pdf")
    flat = " ".join(" ".join(page.extract_text() for page in reader.pages).split())
    start = flat.index("Minimum speed above the speed that lifts the static head")
    assert "rpm" in flat[start : start + 300] and "1/s" not in flat[start : start + 300]
    assert "in feet of the pumped liquid" in flat
    # The check's value, the closing time, with its unit (section Design checks).
    assert re.search(r"\b20(?:\.0+)? s > 0\.\d+ s\b", flat)


def test_every_iec_rating_has_its_class_efficiency():
    """IEC 60034-30-1 runs to 1000 kW: every rating of the catalog's IEC 60072-1 series
    (to 400 kW) has an IE2 and an IE3 efficiency, so no motor loses its electrical power to
    a gap in the table (values from memory, see the catalog file)."""
    from calcreport import catalog

    ratings = catalog.motor_ratings("IEC")
    for cls in ("IE2", "IE3"):
        table = catalog.motor_efficiency(cls)
        assert set(ratings) <= set(table), cls
        efficiencies = [table[r][0] for r in sorted(table)]
        assert efficiencies == sorted(efficiencies)  # never lower for a larger motor


def test_catalog_provenance_cites_no_notes_outside_the_project():
    root = Path(__file__).parent.parent / "calcreport" / "catalog"
    for path in root.iterdir():
        if path.suffix in (".csv", ".toml"):
            text = path.read_text(encoding="utf-8")
            assert "CHECK-VALUES" not in text and "triton" not in text, path.name


def test_an_earlier_entrance_name_reads_as_its_new_one():
    from calcreport.model.loader import loads

    text = (EXAMPLES / "reservoir_fill_si.toml").read_text(encoding="utf-8")
    assert 'kind = "sharp_edged_entrance"' in text
    old = solve(loads(text.replace("sharp_edged_entrance", "entrance_sharp").encode()))
    new = solve(loads(text.encode()))
    assert old.results["total_dynamic_head"] == new.results["total_dynamic_head"]
    assert "catalog.fittings.sharp_edged_entrance.K" in old.given


def test_concrete_roughness_is_a_typical_value_with_its_range():
    from calcreport.catalog.pipes import roughness

    # Moody (1944): concrete 0.3 to 3 mm; the typical value returned is the range's
    # geometric middle (common practice, no published source), not its low end.
    found = roughness("concrete")
    assert found.value == pytest.approx(1.0e-3)
    assert found.range == pytest.approx((0.3e-3, 3.0e-3))


def test_the_conclusion_names_the_state_the_duty_is_decided_in(tmp_path):
    from test_calc import CASE, _analytic_curve

    text = CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()
    text += '[surge]\npump_stop_time = "600 s"\n'  # a slow trip: a pass, so a conclusion of it
    path = tmp_path / "selected.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path)]) == 0
    reader = pypdf.PdfReader(tmp_path / "selected.pdf")
    flat = " ".join(" ".join(page.extract_text() for page in reader.pages[:4]).split())
    conclusion = flat[flat.index("1.3 Conclusion") :][:500]
    assert "The selected pump delivers" in conclusion
    assert "the required flow is met with least margin in C1" in conclusion


def test_a_pe_size_in_inches_is_answered_with_the_nearest_sizes_by_diameter():
    from calcreport.catalog.pipes import CatalogLookupError, resolve

    # ISO 4427-2 sizes are outside diameters in mm: "6" (inches, 152.4 mm) lies between
    # dn 140 and dn 160, not near dn 20.
    with pytest.raises(CatalogLookupError) as err:
        resolve("6", "SDR 11", "pe")
    assert err.value.suggestions == ("140", "160")
    assert "6 in is 152.4 mm" in str(err.value)
