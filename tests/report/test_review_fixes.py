"""Plan-checker review fixes: what a reviewer reads, shown right.

Each test failed before its fix: a temperature rise printed as an absolute temperature, the
thermal minimum flow described as the operating point, a cost without its currency, a case
titled by a level range the input does not give.
"""

import re
from pathlib import Path

import pytest

from calcreport.cli import main
from calcreport.model.loader import load
from calcreport.solver import solve

pypdf = pytest.importorskip("pypdf")
EXAMPLES = Path(__file__).parents[2] / "input_examples"


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
    from calcreport.model.loader import loads
    from tests.solver.test_route import QUIET, ROUTE

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
    root = Path(__file__).parents[2] / "calcreport" / "catalog"
    for path in root.iterdir():
        if path.suffix in (".csv", ".toml"):
            text = path.read_text(encoding="utf-8")
            # No data file points at a notes file (a Markdown document) or a section of one.
            assert not re.search(r"\b[\w-]+\.md\b|§", text), path.name


def test_an_earlier_entrance_name_reads_as_its_new_one():
    from calcreport.model.loader import loads

    text = (EXAMPLES / "reservoir_fill_si.toml").read_text(encoding="utf-8")
    assert 'kind = "sharp_edged_entrance"' in text
    old = solve(loads(text.replace("sharp_edged_entrance", "entrance_sharp").encode()))
    new = solve(loads(text.encode()))
    assert old.results["total_dynamic_head"] == new.results["total_dynamic_head"]
    assert "catalog.fittings.sharp_edged_entrance.K" in old.given


def test_concrete_roughness_is_a_typical_value_with_its_range():
    from calcreport.catalog.materials import roughness

    # Moody (1944): concrete 0.3 to 3 mm; the typical value returned is the range's
    # geometric middle (common practice, no published source), not its low end.
    found = roughness("concrete")
    assert found.value == pytest.approx(1.0e-3)
    assert found.range == pytest.approx((0.3e-3, 3.0e-3))


def test_the_conclusion_names_the_state_the_duty_is_decided_in(tmp_path):
    from tests.solver.test_calc import CASE, _analytic_curve

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
    from calcreport.catalog.lookup import CatalogLookupError
    from calcreport.catalog.pipes import resolve

    # ISO 4427-2 sizes are outside diameters in mm: "6" (inches, 152.4 mm) lies between
    # dn 140 and dn 160, not near dn 20.
    with pytest.raises(CatalogLookupError) as err:
        resolve("6", "SDR 11", "pe")
    assert err.value.suggestions == ("140", "160")
    assert "6 in is 152.4 mm" in str(err.value)


def _us_pair(tmp_path):
    """The US example's trace and one with the destination held at 50 psig instead of 45."""
    import json

    text = (EXAMPLES / "process_transfer_us.toml").read_text(encoding="utf-8")
    assert '"45 psig"' in text
    paths = []
    for name, body in (("old", text), ("new", text.replace('"45 psig"', '"50 psig"'))):
        path = tmp_path / f"{name}.toml"
        path.write_text(body, encoding="utf-8")
        assert main(["build", str(path), "-o", str(tmp_path / name)]) == 0
        paths.append(tmp_path / name / f"{name}.trace.json")
    return paths, [json.loads(p.read_text(encoding="utf-8")) for p in paths]


def test_diff_prints_in_the_report_units_and_keeps_si_in_json(tmp_path):
    from calcreport.diff import diff, render_text

    _, (old, new) = _us_pair(tmp_path)
    report = diff(old, new)
    shown = render_text(report, limit=500)
    assert "45.00 psi(g)" in shown and "50.00 psi(g)" in shown
    assert "kWh" in shown and "USD" in shown
    assert not re.search(r"\de[+-]\d|\bJ\b|\bPa\b", shown)
    assert not re.search(r"\d{6,}\.\d", shown)  # no ten-figure numbers
    given = {c.key: c for c in report.inputs}["destination.pressure"]
    as_json = {c["key"]: c for c in report.to_json()["inputs"]}["destination.pressure"]
    assert as_json["unit"] == "Pa" and as_json["new"] == pytest.approx(given.new)
    assert as_json["new"] == pytest.approx(50 * 6894.757, rel=1e-6)  # psi: NIST SP 811


def test_diff_of_an_si_report_prints_kpa_and_kwh(tmp_path):
    from calcreport.diff import diff, render_text

    text = (EXAMPLES / "reservoir_fill_si.toml").read_text(encoding="utf-8")
    old = solve(load(EXAMPLES / "reservoir_fill_si.toml")).to_json()
    changed = re.sub(r'(\[destination\][^\[]*?level = ")([\d.]+)', r"\g<1>133.0", text, count=1)
    assert changed != text
    path = tmp_path / "new.toml"
    path.write_text(changed, encoding="utf-8")
    shown = render_text(diff(old, solve(load(path)).to_json()), limit=500)
    assert "kWh" in shown and " J" not in shown and "e+1" not in shown
    assert re.search(r"kPa\(g\)", shown)


def test_the_changes_page_of_a_us_report_is_in_us_units(tmp_path):
    (old_trace, _), _ = _us_pair(tmp_path)
    source = tmp_path / "new.toml"
    out = tmp_path / "rev"
    assert main(["build", str(source), "-o", str(out), "--previous", str(old_trace)]) == 0
    reader = pypdf.PdfReader(out / "new.pdf")
    page = next(p.extract_text() for p in reader.pages if "Changes since" in p.extract_text())
    assert "45.00 psi(g)" in page and "50.00 psi(g)" in page
    assert not re.search(r"\d (Pa|J|m³/s|m)\b", page)


def test_default_limits_of_a_us_report_are_customary_values_and_say_so():
    us = solve(load(EXAMPLES / "process_transfer_us.toml"))
    si = solve(load(EXAMPLES / "reservoir_fill_si.toml"))

    def limit(trace, ident):
        check = next(c for c in trace.checks if c.id.startswith(ident))
        return check.limit, check.basis

    value, basis = limit(us, "velocity_max.D")
    assert value == pytest.approx(10 * 0.3048)  # 10 ft/s exactly (1 ft = 0.3048 m, NIST SP 811)
    assert "10 ft/s, a rounded customary value (3.0 m/s in SI)" in basis
    value, basis = limit(si, "velocity_max.D")
    assert value == pytest.approx(3.0) and "US units" not in basis
    value, basis = limit(us, "min_pressure")
    assert value == pytest.approx(7 * 0.3048) and "rounded up" in basis


@pytest.mark.parametrize(
    ("kind", "words"),
    [
        ('kind = "ethylene_glycol"\nmass_fraction = 0.30', "ethylene glycol–water"),
        ('kind = "propylene_glycol"\nmass_fraction = 0.30', "propylene glycol–water"),
        ('kind = "seawater"\nmass_fraction = 0.035', "seawater"),
        ('kind = "methanol"', "methanol"),
    ],
)
def test_working_lines_name_the_liquid_in_words_not_library_codes(kind, words):
    pytest.importorskip("CoolProp")
    from calcreport.model.loader import loads
    from tests.tools.test_integrity import BASE

    assert 'kind = "water"' in BASE
    trace = solve(loads(BASE.replace('kind = "water"', kind).encode())).to_json()
    liquid = [s for s in trace["steps"] if s["id"].startswith("fluid.")]
    printed = " ".join(
        " ".join([s["equation"], s["latex"], s["substituted"], *s["inputs"]]) for s in liquid
    )
    assert words in printed
    for code in ("MEG", "MPG", "INCOMP", "MITSW", "CoolProp", "Methanol"):
        assert code not in printed, code


def _reproduction_keys():
    import tomllib

    root = Path(__file__).parents[2] / "calcreport" / "catalog"
    with (root / "sources.toml").open("rb") as handle:
        return set(tomllib.load(handle)["reproductions"])


def test_printed_catalog_provenance_names_primary_sources_only():
    from calcreport.catalog import materials, pipes

    keys = _reproduction_keys()
    printed = [materials.roughness(m).published for m in materials.materials()]
    for family in pipes.families():
        for size in pipes.sizes(family):
            schedules = pipes.schedules(family, size)
            printed += [pipes.resolve(size, s, family).published for s in schedules]
    for line in printed:
        assert line and "read in" not in line and "sources.toml" not in line, line
        assert not any(key in line for key in keys), line


def test_a_pe_pipe_report_states_the_bore_basis_and_no_reproduction(tmp_path):
    from tests.tools.test_integrity import BASE

    old = 'length = "150 m"\ninner_diameter = "102.26 mm"\nroughness = "0.045 mm"'
    assert old in BASE
    text = BASE.replace(
        old, 'length = "150 m"\nnominal_size = "110"\nschedule = "SDR 11"\nmaterial = "hdpe"'
    )
    assert text != BASE
    path = tmp_path / "pe.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["build", str(path), "-o", str(tmp_path)]) == 0
    reader = pypdf.PdfReader(tmp_path / "pe.pdf")
    flat = " ".join(" ".join(page.extract_text() for page in reader.pages).split())
    assert "mean wall" in flat and "ISO 11922-1" in flat
    assert not any(key in flat for key in _reproduction_keys())


@pytest.fixture(scope="module")
def us_report(tmp_path_factory):
    out = tmp_path_factory.mktemp("us")
    assert main(["build", str(EXAMPLES / "process_transfer_us.toml"), "-o", str(out)]) == 0
    pdf = pypdf.PdfReader(out / "process_transfer_us.pdf")
    return [" ".join(page.extract_text().split()) for page in pdf.pages]


def test_us_assumptions_print_their_values_in_us_units(us_report):
    flat = " ".join(us_report)
    assert "no outlet velocity head is added. (0 ft)" in flat
    assert "(0 m)" not in flat and "(0 m/s)" not in flat


def test_a_value_the_same_in_both_systems_prints_once(us_report):
    flat = " ".join(us_report)
    assert re.search(r"Result: E = \d+ kWh inputs", flat)
    assert not re.search(r"kWh \(\d+ kWh\)", flat)


def test_every_us_page_outside_the_worked_steps_reads_in_us_units(us_report):
    # Worked steps substitute in SI (stated in the conventions) with each result also in US
    # units; every other line of the report is in US units. SI appears only in the inputs
    # table's "as used (SI)" column and beside a default limit's customary value.
    si = re.compile(r"\d ?(kPa|Pa|m³/s|L/s|kg/m³|mm|°C|kW|m/s|m)(\(g\))?(?![\w³²/])")
    for number, page in enumerate(us_report, start=1):
        if "s used (SI)" in page or "Full step listing" in page:  # the table of inputs
            continue
        lines = re.split(r"(?=\[[\w.\[\]]+\])|Result:", page)  # step blocks start with [id]
        for piece in lines:
            if "inputs:" in piece or " = " in piece:
                continue  # a worked step (SI substitution) or its result
            hit = si.search(re.sub(r"\([^()]* in SI\)", "", piece))
            assert hit is None, (number, piece[max(0, hit.start() - 80) : hit.end() + 20])
