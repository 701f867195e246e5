"""Candidate pumps: each offer solved in full, ranked by life-cycle cost among those that
pass, the selected one calculated with every offer's life-cycle cost as a step."""

from __future__ import annotations

import copy
from dataclasses import replace
from pathlib import Path

import pytest

from calcreport.cli import main
from calcreport.model.loader import load, loads
from calcreport.physics.power.cost import life_cycle_cost
from calcreport.recheck import recheck
from calcreport.solver import solve

OFFERS = Path(__file__).parents[2] / "input_examples" / "pump_offers.toml"


def test_life_cycle_cost_against_a_hand_present_value():
    # Present value of a uniform annual cost, summed year by year as a hand calculation
    # does (each year's cost discounted by (1 + i)^k): the annuity factor of the guide.
    capital, energy, upkeep, rate, years = 14200.0, 7781.85, 380.0, 0.06, 15
    by_hand = capital + sum((energy + upkeep) / (1 + rate) ** k for k in range(1, years + 1))
    assert life_cycle_cost(capital, energy, upkeep, rate, years) == pytest.approx(
        by_hand, rel=1e-12
    )
    # No discounting: the plain sum over the life.
    assert life_cycle_cost(1000.0, 100.0, 50.0, 0.0, 10) == 2500.0


@pytest.fixture(scope="module")
def study():
    model = load(str(OFFERS))
    return model, solve(model)


def test_the_cheaper_offer_that_fails_npsh_ranks_after_those_that_pass(study):
    _, trace = study
    offers = {o["id"]: o for o in trace.results["study"]["candidates"]}
    a, b, c = offers["A"], offers["B"], offers["C"]
    # A costs least over the life but cavitates at a state it runs in.
    assert a["life_cycle_cost"]["value"] < b["life_cycle_cost"]["value"]
    assert a["status"] == "fail" and "npsh_margin" in a["failing"]
    assert [o["id"] for o in trace.results["study"]["candidates"]] == ["B", "C", "D", "A"]
    assert b["rank"] == 1 and c["rank"] == 2 and a["rank"] == 4
    assert b["life_cycle_cost"]["value"] < c["life_cycle_cost"]["value"]
    assert trace.results["study"]["selected"] == "B"
    assert trace.results["study"]["selected_by"] == "rank"


def test_each_offer_is_checked_at_every_state_as_its_own_calculation(study):
    model, trace = study
    for candidate in model.study.candidates:
        own = solve(replace(model, pump=candidate.pump, study=None))
        row = next(o for o in trace.results["study"]["candidates"] if o["id"] == candidate.id)
        assert row["failing"] == sorted({c.id for c in own.checks if c.status == "fail"})
        assert row["review"] == sorted({c.id for c in own.checks if c.status == "review"})
        # Its checks ran at the cases, the duty-profile points and the rated duty.
        states = {c.case for c in own.checks}
        assert {"P1", "P2", "P3"} & states or "all" in states, candidate.id
        assert row["annual_energy_cost"]["value"] == pytest.approx(
            own.results["energy"]["annual_cost"]["value"], rel=1e-12
        )


def test_the_selected_offer_gets_the_full_calculation_and_recheck_confirms_it(study):
    model, trace = study
    chosen = next(c for c in model.study.candidates if c.id == "B")
    assert trace.results["pump_curve"]["head"]["value"] == [g.value for g in chosen.pump.curve.head]
    steps = {s.id: s for s in trace.steps}
    for offer in trace.results["study"]["candidates"]:
        step = steps[f"study.{offer['id']}.life_cycle_cost"]
        assert step.value == offer["life_cycle_cost"]["value"]
    assert recheck(trace.to_json()).ok
    tampered = copy.deepcopy(trace.to_json())
    row = tampered["results"]["study"]["candidates"][0]
    row["life_cycle_cost"]["value"] *= 0.9
    assert not recheck(tampered).ok


def test_the_offer_named_in_the_input_is_calculated_whatever_its_rank():
    text = OFFERS.read_text(encoding="utf-8").replace('# selected = "D"', 'selected = "C"')
    trace = solve(loads(text.encode(), path=str(OFFERS)))
    study = trace.results["study"]
    assert study["selected"] == "C" and study["selected_by"] == "input"
    # Offer C's curve, its impeller trimmed to 0.94 of the curve's (H ∝ D²).
    assert trace.results["pump_curve"]["head"]["value"][0] == pytest.approx(38.5 * 0.94**2)
    assert recheck(trace.to_json()).ok


def test_bad_study_input_names_every_key_and_writes_nothing(tmp_path, capsys):
    text = OFFERS.read_text(encoding="utf-8")
    text = text.replace('id = "C"', 'id = "B"').replace('# selected = "D"', 'selected = "Z"')
    text = text.replace("discount_rate = 0.06\n", "").replace("life_years = 15\n", "")
    source = tmp_path / "bad.toml"
    source.write_text(text, encoding="utf-8")
    assert main(["build", str(source), "-o", str(tmp_path / "out")]) == 2
    err = capsys.readouterr().err
    assert "study.candidate[3].id" in err and 'The id "B" is given to two candidates' in err
    assert "study.selected" in err and "operation.life_years" in err
    assert not (tmp_path / "out").exists()


def test_each_main_size_is_priced_and_solved_in_full(study):
    model, trace = study
    rows = trace.results["study"]["pipe_sizes"]
    assert [row["size"] for row in rows] == [
        "NPS/DN 5, 40",
        "NPS/DN 6, 40",
        "NPS/DN 8, 40",
        "NPS/DN 10, 40",
    ]
    length = sum(p.length.value for p in model.pipes if p.id in ("D1", "D2"))  # 60 m + 85 m
    rate, years = 0.06, 15
    factor = sum(1 / (1 + rate) ** k for k in range(1, years + 1))  # by hand, year by year
    for row, cost in zip(rows, (95, 120, 165, 230), strict=True):
        assert row["capital_cost"]["value"] == pytest.approx(cost * length)
        expected = row["capital_cost"]["value"] + row["annual_energy_cost"]["value"] * factor
        assert row["life_cycle_cost"]["value"] == pytest.approx(expected, rel=1e-12)
    # A wider bore: slower flow, less head and less energy; the pipes cost more.
    velocity = [row["velocity"]["value"] for row in rows]
    energy = [row["annual_energy_cost"]["value"] for row in rows]
    assert velocity == sorted(velocity, reverse=True) and energy == sorted(energy, reverse=True)
    # NPS 6 is the design's own bore (154.1 mm as entered) and here the lowest.
    assert [row["as_designed"] for row in rows] == [False, True, False, False]
    lowest = min(
        (r for r in rows if r["status"] != "fail"), key=lambda r: r["life_cycle_cost"]["value"]
    )
    assert lowest["lowest"] and sum(r["lowest"] for r in rows) == 1


def test_a_size_is_the_design_with_that_bore_solved_alone(study):
    model, trace = study
    row = trace.results["study"]["pipe_sizes"][0]  # NPS 5
    chosen = next(c for c in model.study.candidates if c.id == trace.results["study"]["selected"])
    bore = 0.128194  # ASME B36.10M NPS 5 Sch 40: OD 141.30 mm, wall 6.55 mm
    pipes = tuple(
        replace(p, inner_diameter=replace(p.inner_diameter, value=bore))
        if p.id in ("D1", "D2")
        else p
        for p in model.pipes
    )
    alone = solve(replace(model, pump=chosen.pump, pipes=pipes, study=None))
    assert row["inner_diameter"]["value"] == pytest.approx(bore, rel=1e-4)
    assert row["total_dynamic_head"]["value"] == pytest.approx(
        alone.results["total_dynamic_head"]["value"], rel=1e-3
    )


def test_the_study_command_writes_the_report_and_the_table(tmp_path, capsys):
    import csv

    assert main(["study", str(OFFERS), "-o", str(tmp_path)]) == 0
    assert "pump_offers.study.csv" in capsys.readouterr().out
    table = (tmp_path / "pump_offers.study.csv").read_text(encoding="utf-8")
    rows = list(csv.DictReader(table.splitlines()))
    offers = [r for r in rows if r["kind"] == "offer"]
    sizes = [r for r in rows if r["kind"] == "pipe size"]
    assert [r["id or size"] for r in offers] == ["B", "C", "D", "A"]
    assert offers[0]["selected or as designed"] == "selected"
    assert offers[3]["failing"] == "npsh_margin"
    assert len(sizes) == 4 and [r["rank"] for r in sizes].count("lowest") == 1
    for name in ("pump_offers.pdf", "pump_offers.trace.json", "pump_offers.pages.json"):
        assert (tmp_path / name).is_file()


def test_the_study_command_refuses_an_input_with_nothing_to_compare(tmp_path, capsys):
    plain = Path(__file__).parents[2] / "input_examples" / "check_case.toml"
    assert main(["study", str(plain), "-o", str(tmp_path / "out")]) == 2
    assert "no [study] table" in capsys.readouterr().err
    assert not (tmp_path / "out").exists()


def test_a_study_tells_each_calculation_as_it_starts():
    heard: list[str] = []
    solve(load(str(OFFERS)), heard.append)
    # Four offers, four sizes, five uncertainties low and high, the selected design: 19.
    assert heard[0] == "solving offer A (1 of 19)"
    assert heard[-1] == "solving the selected design (19 of 19)"
    assert "solving Liquid temperature, low (11 of 19)" in heard
    assert any(h.startswith("solving D1, D2 at NPS/DN 8, 40") for h in heard)


def _design(model):
    chosen = next(c for c in model.study.candidates if c.id == "B")
    return replace(model, pump=chosen.pump, study=None)


def _tdh_flow_power(trace):
    r = trace.results
    return (
        r["total_dynamic_head"]["value"],
        r["operating_point"]["flow"]["value"],
        r["shaft_power"]["value"],
    )


def test_the_tornado_bars_are_the_designs_own_changes_solved_again_in_the_test(study):
    model, trace = study
    rows = {row["parameter"]: row for row in trace.results["study"]["sensitivity"]}
    design = _design(model)
    base = _tdh_flow_power(solve(design))
    # Finite differences, each setting applied here to the selected design and solved.
    cold = replace(design, fluid=replace(design.fluid, temperature=replace(
        design.fluid.temperature, value=273.15 + 12.0)))  # fmt: skip
    aged = replace(design, pipes=tuple(
        replace(p, roughness=replace(p.roughness, value=max(p.roughness.value, 0.5e-3)))
        for p in design.pipes))  # fmt: skip
    curve = design.pump.curve
    weak = replace(
        design,
        pump=replace(
            design.pump,
            curve=replace(
                curve,
                head=tuple(replace(h, value=h.value * 0.95) for h in curve.head),
                efficiency=tuple(replace(e, value=e.value * 0.95) for e in curve.efficiency),
            ),
        ),
    )  # fmt: skip  (ISO 9906 grade 2B: head -5 %, efficiency -5 %, from memory)
    for name, side, variant in (("temperature", "low", cold), ("roughness", "high", aged),
                                ("pump_grade", "low", weak)):  # fmt: skip
        tdh, flow, shaft = _tdh_flow_power(solve(variant))
        effects = rows[name]["effects"]
        assert effects["total_dynamic_head"][side]["value"] == pytest.approx(tdh, rel=1e-12)
        assert effects["operating_flow"][side]["value"] == pytest.approx(flow, rel=1e-12)
        assert effects["shaft_power"][side]["value"] == pytest.approx(shaft, rel=1e-12)
        change = effects["shaft_power"][f"{side}_change"]
        assert change == pytest.approx((shaft - base[2]) / base[2], rel=1e-9)
    # Rougher pipe: more head at the pump, less flow; a weaker pump: less flow.
    assert rows["roughness"]["effects"]["operating_flow"]["high_change"] < 0
    assert rows["pump_grade"]["effects"]["operating_flow"]["low_change"] < 0


def test_sensitivity_input_is_checked_by_key(tmp_path, capsys):
    text = OFFERS.read_text(encoding="utf-8").replace('pump_grade = "2B"', 'pump_grade = "4X"')
    text = text.replace(
        'temperature = ["12 degC", "32 degC"]', 'temperature = ["32 degC", "12 degC"]'
    )
    source = tmp_path / "bad.toml"
    source.write_text(text, encoding="utf-8")
    assert main(["check", str(source)]) == 2
    err = capsys.readouterr().err
    assert "study.sensitivity.pump_grade" in err and "study.sensitivity.temperature" in err


def test_a_trimmed_offer_follows_the_affinity_relation_for_diameter(study):
    model, _ = study
    offer = next(c for c in model.study.candidates if c.id == "C")
    own = solve(replace(model, pump=offer.pump, study=None))
    r = offer.pump.trim.value  # 0.94: 320 mm of the curve's 340 mm
    curve = own.results["pump_curve"]
    # Karassik, Pump Handbook 4th ed., sec. 2.1: Q ∝ D, H ∝ D² at the same speed.
    assert curve["flow"]["value"] == pytest.approx([g.value * r for g in offer.pump.curve.flow])
    assert curve["head"]["value"] == pytest.approx([g.value * r * r for g in offer.pump.curve.head])
    check = next(c for c in own.checks if c.id == "impeller_trim")
    assert check.status == "pass" and check.value == r and check.limit == 0.85
    assert any("trimmed impeller" in a["text"] for a in own.assumptions)
    # A deeper trim than the relation is used for: review (common practice, 0.85).
    deep = replace(offer.pump, trim=replace(offer.pump.trim, value=0.8))
    cut = solve(replace(model, pump=deep, study=None))
    assert next(c for c in cut.checks if c.id == "impeller_trim").status == "review"
    assert recheck(own.to_json()).ok


def test_the_fitting_k_uncertainty_scales_every_minor_loss_and_no_rated_one(study):
    model, trace = study
    row = next(r for r in trace.results["study"]["sensitivity"] if r["parameter"] == "fitting_k")
    design = _design(model)
    # By hand: every K up 20 % (count × K in ΣK), the heat exchanger's rated loss as it is.
    high = replace(design, pipes=tuple(
        replace(p, fittings=tuple(
            f if f.dp is not None else replace(f, count=replace(f.count, value=f.count.value * 1.2))
            for f in p.fittings))
        for p in design.pipes))  # fmt: skip
    alone = solve(high)
    tdh = row["effects"]["total_dynamic_head"]["high"]["value"]
    assert tdh == pytest.approx(alone.results["total_dynamic_head"]["value"], rel=1e-12)
    minor = sum(p["minor_loss"]["value"] for p in alone.results["pipes"].values())
    base = sum(p["minor_loss"]["value"] for p in trace.results["pipes"].values())
    assert minor > base  # the fittings' share grew


def test_an_offer_of_pumps_in_parallel_is_staged_over_the_profile_when_selected():
    text = OFFERS.read_text(encoding="utf-8").replace('# selected = "D"', 'selected = "D"')
    trace = solve(loads(text.encode(), path=str(OFFERS)))
    assert trace.results["study"]["selected"] == "D"
    staging = trace.results["staging"]
    assert [p["point"] for p in staging["points"]] == ["P1", "P2", "P3"]
    # Each point's counts were screened; the staged energy is never above the fixed count's.
    assert all(p["feasible"] for p in staging["points"])
    assert staging["energy_staged"]["value"] <= staging["energy_fixed"]["value"]
    assert recheck(trace.to_json()).ok


def test_an_offer_without_a_price_is_costed_on_its_running_costs():
    text = OFFERS.read_text(encoding="utf-8").replace("capital_cost = 21500\n", "")
    trace = solve(loads(text.encode(), path=str(OFFERS)))
    c = next(o for o in trace.results["study"]["candidates"] if o["id"] == "C")
    assert "capital_cost" not in c
    factor = sum(1 / 1.06**k for k in range(1, 16))  # 6 % over 15 years, year by year
    running = c["annual_energy_cost"]["value"] + c["annual_maintenance_cost"]["value"]
    assert c["life_cycle_cost"]["value"] == pytest.approx(running * factor, rel=1e-12)
    assert any("no price given" in a["text"] for a in trace.assumptions)
    assert recheck(trace.to_json()).ok


def test_an_offer_with_its_own_drive_is_costed_with_it():
    base = OFFERS.read_text(encoding="utf-8")
    own = base.replace("capital_cost = 14200\n", "capital_cost = 14200\ndrive_efficiency = 0.95\n")
    model = loads(own.encode(), path=str(OFFERS))
    trace = solve(replace(model, study=replace(model.study, selected="B")))
    plain = solve(loads(base.encode(), path=str(OFFERS)))
    # P_e = P_s / (η_motor · η_drive): the offer's drive 0.95 against [drive]'s 0.965.
    ratio = trace.results["electrical_power"]["value"] / plain.results["electrical_power"]["value"]
    assert ratio == pytest.approx(0.965 / 0.95, rel=1e-9)
    assert trace.results["shaft_power"]["value"] == plain.results["shaft_power"]["value"]


def test_an_empty_sensitivity_table_is_refused(tmp_path, capsys):
    import re

    text = re.sub(
        r"\[study\.sensitivity\]\n(?:[a-z_]+ = .*\n)+",
        "[study.sensitivity]\n",
        OFFERS.read_text(encoding="utf-8"),
    )
    source = tmp_path / "empty.toml"
    source.write_text(text, encoding="utf-8")
    assert main(["check", str(source)]) == 2
    assert "study.sensitivity" in capsys.readouterr().err
