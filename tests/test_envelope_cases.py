"""Aged-pipe and dirty-strainer cases, on the CHECK-VALUES.md section 11 case."""

import pytest
from test_calc import CASE

from calcreport.calc import solve
from calcreport.errors import InputError
from calcreport.model.loader import loads

fluids = pytest.importorskip("fluids")

G = 9.80665


def _case(title_start, t):
    return next(c["id"] for c in t.cases if c["title"].startswith(title_start))


def test_aged_pipe_case_against_fluids_colebrook():
    t = solve(loads((CASE + '[envelope]\nroughness = "0.5 mm"\n').encode()))
    aged = t.results["cases"][_case("Aged pipe", t)]
    # Independent: Colebrook by fluids (fluids.friction.Colebrook) at the case's Re and
    # eps/D = 0.5 mm / D, Darcy-Weisbach and the fitting K of section 11.
    tdh = 23.0
    for ident, K in (("S1", 1.07), ("D1", 4.366)):
        p = aged["pipes"][ident]
        D, v, Re = p["inner_diameter"]["value"], p["velocity"]["value"], p["reynolds"]["value"]
        assert p["roughness"]["value"] == 0.5e-3
        f = fluids.friction.Colebrook(Re, 0.5e-3 / D)
        assert p["friction_factor"]["value"] == pytest.approx(f, rel=1e-9)
        L = p["length"]["value"]
        tdh += (f * L / D + K) * v * v / (2 * G)
    assert aged["total_dynamic_head"]["value"] == pytest.approx(tdh, rel=1e-9)
    # New pipe: the design case keeps its section-11 TDH.
    assert t.results["total_dynamic_head"]["value"] == pytest.approx(32.49768, rel=1e-5)
    assert any("Aged pipe" in a["text"] for a in t.assumptions)


def test_dirty_strainer_takes_its_loss_from_npsh_available():
    t = solve(loads((CASE + '[envelope]\nstrainer_dirty_dp = "15 kPa"\n').encode()))
    dirty = t.results["cases"][_case("Dirty suction strainer", t)]
    rho = t.results["fluid"]["density"]["value"]
    # At the duty flow the strainer's rated loss is exactly 15 kPa of head.
    expected = t.results["npsh_available"]["value"] - 15e3 / (rho * G)
    assert dirty["npsh_available"]["value"] == pytest.approx(expected, rel=1e-12)
    assert dirty["total_dynamic_head"]["value"] == pytest.approx(
        t.results["total_dynamic_head"]["value"] + 15e3 / (rho * G), rel=1e-12
    )


def test_aged_needs_a_stated_value():
    with pytest.raises(InputError) as err:
        loads((CASE + '[envelope]\nroughness = "aged"\n').encode())
    problem = err.value.problems[0]
    assert problem.key == "envelope.roughness" and "as a length" in problem.message
