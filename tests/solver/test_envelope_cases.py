"""Aged-pipe and dirty-strainer cases, on the end-to-end check case of test_calc."""

import pytest

from calcreport.errors import InputError
from calcreport.model.loader import loads
from calcreport.solver import solve
from tests.solver.test_calc import CASE

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


def test_power_curve_gives_the_efficiency_of_the_efficiency_curve():
    # The section-11 pump given by its shaft power at SG 1.0 instead of its efficiency:
    # P_i = 1000 g Q_i H_i / eta_i (5 kW at shutoff). The operating point is unchanged
    # (computed with fluids 1.3.1 and IAPWS-95 water: eta 0.7772, brake power 10 514.1 W).
    qs = [i * 0.5 for i in range(81)]
    heads = [42 + 0.2 * q - 0.02 * q * q for q in qs]
    effs = [0.78 * (1 - ((q - 22) / 22) ** 2) for q in qs]
    powers = [
        1000 * G * q * 1e-3 * h / e if q > 0 and e > 0 else 5000.0
        for q, h, e in zip(qs, heads, effs, strict=True)
    ]
    keep = [i for i, (q, e) in enumerate(zip(qs, effs, strict=True)) if q == 0 or e > 0]
    curve = (
        "\n[pump.curve]\n"
        f'flow = {{ unit = "L/s", values = {[qs[i] for i in keep]} }}\n'
        f'head = {{ unit = "m", values = {[heads[i] for i in keep]} }}\n'
        f'power = {{ unit = "W", values = {[powers[i] for i in keep]} }}\n'
    )
    t = solve(loads((CASE.replace("efficiency = 0.78\n", "") + curve).encode()))
    op = t.results["operating_point"]
    assert op["efficiency"]["value"] == pytest.approx(0.7772, rel=2e-4)
    assert t.results["shaft_power"]["value"] == pytest.approx(10514.1, rel=2e-4)
    assert t.step("pump.curve_efficiency[2]").function == "pump.efficiency_from_power"
    assert any("specific gravity 1.0" in a["text"] for a in t.assumptions)


def test_power_and_efficiency_together_are_refused():
    text = CASE.replace("efficiency = 0.78\n", "") + (
        '\n[pump.curve]\nflow = ["0 L/s", "10 L/s", "20 L/s"]\nhead = ["40 m", "38 m", "33 m"]\n'
        'efficiency = [0.0, 0.6, 0.75]\npower = ["3 kW", "6 kW", "8.6 kW"]\n'
    )
    with pytest.raises(InputError) as err:
        loads(text.encode())
    assert "pump.curve.power" in {p.key for p in err.value.problems}


def test_submergence_against_hi_9_8():
    # ANSI/HI 9.8-1998 eq. 9.8-1: S = D(1 + 2.3 F_D), F_D = v / sqrt(g D), at the inlet.
    # Inlet 1.6 m below the source level (level 2.0 m, inlet at 0.4 m), 20 L/s.
    text = CASE.replace(
        'fittings = [{ K = 0.5, note = "entrance" }',
        'elevation_start = "0.4 m"\nelevation_end = "0 m"\n'
        'fittings = [{ K = 0.5, note = "entrance" }',
    )
    r = solve(loads(text.encode())).results
    D = 0.154051
    v = 0.020 / (3.141592653589793 * D * D / 4)
    assert r["intake"]["submergence"]["value"] == pytest.approx(1.6)
    assert r["intake"]["minimum_submergence"]["value"] == pytest.approx(
        D * (1 + 2.3 * v / (G * D) ** 0.5), rel=1e-12
    )
    # A bell of 0.30 m lowers the velocity but raises D; 0.2 m of submergence is too little.
    shallow = text.replace('level = "2.0 m"', 'level = "0.6 m"').replace(
        "[source]\n", '[source]\nintake_diameter = "300 mm"\n'
    )
    t = solve(loads(shallow.encode()))
    check = next(c for c in t.checks if c.id == "submergence")
    vb = 0.020 / (3.141592653589793 * 0.3**2 / 4)
    assert check.limit == pytest.approx(0.3 * (1 + 2.3 * vb / (G * 0.3) ** 0.5), rel=1e-12)
    assert check.status == "review" and check.value == pytest.approx(0.2)


def test_swing_check_below_full_lift_velocity_is_flagged():
    # Crane TP-410: full disc lift of a swing check at v_min = 35 sqrt(v_bar) ft/s, v_bar in
    # ft^3/lb (constant from memory): 1.351 m/s for water at 20 degC. At 20 L/s the NPS 4
    # line runs at 2.435 m/s (section 11) and the NPS 6 suction at 1.073 m/s.
    text = CASE.replace(
        'fittings = [{ K = 0.5, note = "entrance" }, { K = 0.57 }]',
        'fittings = [{ K = 0.5, note = "entrance" }, { kind = "swing_check_valve" }]',
    ).replace("{ K = 3.0, count = 1 }", '{ kind = "swing_check_valve" }')
    t = solve(loads(text.encode()))
    rho = t.results["fluid"]["density"]["value"]
    v_min = 35 * (1 / (rho / 16.0185)) ** 0.5 * 0.3048
    checks = {c.id: c for c in t.checks}
    assert checks["check_valve_lift.D1"].status == "pass"
    low = checks["check_valve_lift.S1"]
    assert low.status == "review" and low.limit == pytest.approx(v_min, rel=1e-12)
    assert low.value == pytest.approx(1.07303, rel=1e-4)


def test_duty_margin_is_an_explicit_project_criterion():
    curve = (
        '\n[pump.curve]\nflow = { unit = "L/s", values = [0, 10, 20, 30, 40] }\n'
        'head = { unit = "m", values = [42.0, 42.0, 38.0, 30.0, 18.0] }\n'
    )
    base = (
        CASE.replace("efficiency = 0.78\n", 'efficiency = 0.78\nacceptance_grade = "2B"\n') + curve
    )
    t = solve(loads(base.encode()))
    duty = next(c for c in t.checks if c.id == "duty_flow")
    assert duty.status == "pass" and duty.limit == pytest.approx(0.020)
    assert "grade 2B" in duty.basis and "not deducted" in duty.basis
    q = duty.value
    margin = (q / 0.020 - 1) * 1.5  # a margin the operating point does not cover
    t = solve(loads((base + f"[criteria]\nduty_flow_margin = {margin}\n").encode()))
    duty = next(c for c in t.checks if c.id == "duty_flow")
    assert duty.status == "fail" and duty.limit == pytest.approx(0.020 * (1 + margin))


def test_motor_efficiency_from_its_class_at_the_selected_rating():
    # IEC 60034-30-1 IE3, 4-pole 50 Hz (from memory): 30 kW 93.6 %.
    from tests.solver.test_calc import _analytic_curve

    text = CASE.replace("efficiency = 0.78\n", "").replace(
        "[motor]\nefficiency = 0.92", '[motor]\nefficiency_class = "IE3"'
    )
    t = solve(loads((text + _analytic_curve()).encode()))
    r = t.results
    rated = r["motor"]["rated_power"]["value"]
    # The curve runs out to 40 L/s at a low efficiency: its peak shaft power needs 30 kW.
    assert rated == 30e3 and 22e3 < r["motor"]["peak_shaft_power"]["value"] <= 30e3
    assert r["electrical_power"]["value"] == pytest.approx(r["shaft_power"]["value"] / 0.936)
    assert "loading" in r["motor"]
    text_us = text.replace("[fluid]", '[project]\nunits = "US"\n[fluid]')
    with pytest.raises(InputError) as err:
        loads((text_us + _analytic_curve()).encode())
    assert "motor.efficiency_class" in {p.key for p in err.value.problems}


def test_motor_derated_for_a_high_site():
    # IEC 60034-1: rated output up to 1000 m and 40 degC. At 1500 m without a derating the
    # check asks for one; with k = 0.8 the rating must cover P_peak / 0.8.
    from tests.solver.test_calc import _analytic_curve

    base = CASE.replace("efficiency = 0.78\n", "").replace(
        "[source]", '[site]\nelevation = "1500 m"\n[source]'
    )
    t = solve(loads((base + _analytic_curve()).encode()))
    site = next(c for c in t.checks if c.id == "motor_site_derating")
    assert site.status == "review" and "1000 m" in site.message
    derated = base.replace(
        "[motor]\nefficiency = 0.92", "[motor]\nefficiency = 0.92\nderating = 0.8"
    )
    t = solve(loads((derated + _analytic_curve()).encode()))
    motor = t.results["motor"]
    peak = motor["peak_shaft_power"]["value"]
    assert t.step("motor.required_output").value == pytest.approx(peak / 0.8)
    assert motor["rated_power"]["value"] * 0.8 >= peak
    assert next(c for c in t.checks if c.id == "motor_site_derating").status == "pass"
    check = next(c for c in t.checks if c.id == "motor_non_overloading")
    assert check.status == "pass" and check.limit == pytest.approx(
        motor["rated_power"]["value"] * 0.8
    )


def test_thermal_minimum_flow_where_the_rise_reaches_the_limit():
    # Temperature rise through the pump, all losses to the liquid (Karassik, Pump Handbook):
    # dT = g H (1 - eta) / (c_p eta). On the section-11 curve, the flow where dT = 8 K
    # (default, common practice) and, with a 0.05 K project limit, a higher one that the
    # lowest operating flow must still clear.
    from tests.solver.test_calc import _analytic_curve

    text = CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()
    t = solve(loads(text.encode()))
    thermal = t.results["thermal_min_flow"]
    q = thermal["flow"]["value"] * 1e3
    H = 42 + 0.2 * q - 0.02 * q * q
    eta = 0.78 * (1 - ((q - 22) / 22) ** 2)
    cp = t.step("pump.thermal.heat_capacity").value
    assert G * H * (1 - eta) / (cp * eta) == pytest.approx(8.0, rel=2e-3)
    assert next(c for c in t.checks if c.id == "thermal_min_flow").status == "pass"
    strict = solve(loads((text + '[criteria]\ntemperature_rise_max = "0.05 K"\n').encode()))
    q_strict = strict.results["thermal_min_flow"]["flow"]["value"]
    assert q_strict > thermal["flow"]["value"]
    with pytest.raises(InputError):
        loads((text + '[criteria]\ntemperature_rise_max = "8 degC"\n').encode())


def test_each_pumps_branch_carries_its_own_flow():
    # Two identical pumps in parallel, each with its own discharge branch (NPS 4, 5 m,
    # K 2.5) ahead of the common line: the branch carries Q/2 and adds its loss at that
    # flow to the head each pump must give (Darcy-Weisbach with fluids' Colebrook).
    from tests.solver.test_calc import _analytic_curve

    branch = (
        '[[pipe]]\nid = "B1"\nside = "discharge_branch"\nlength = "5 m"\n'
        'inner_diameter = "102.26 mm"\nroughness = "0.045 mm"\n'
        'fittings = [{ K = 2.5, note = "check and isolating valves" }]\n'
    )
    text = CASE.replace("efficiency = 0.78\n", "count = 2\n").replace(
        '[[pipe]]\nid = "D1"', branch + '[[pipe]]\nid = "D1"'
    )
    t = solve(loads((text + _analytic_curve()).encode()))
    r = t.results
    Q = r["flow"]["value"]
    b1 = r["pipes"]["B1"]
    D = 0.10226
    v = (Q / 2) / (3.141592653589793 * D * D / 4)
    assert b1["velocity"]["value"] == pytest.approx(v, rel=1e-12)
    f = fluids.friction.Colebrook(b1["reynolds"]["value"], 0.045e-3 / D)
    h_branch = (f * 5 / D + 2.5) * v * v / (2 * G)
    assert b1["friction_loss"]["value"] + b1["minor_loss"]["value"] == pytest.approx(
        h_branch, rel=1e-9
    )
    # Each pump's head at its own flow meets the system head with the branch in it.
    assert r["operating_point"]["flow_per_pump"]["value"] == pytest.approx(Q / 2)
    assert abs(t.step("pump.head_balance").value) < 1e-8


def test_each_pumps_own_intake_carries_its_own_flow():
    # Two pumps in parallel, each drawing from the sump through its own suction branch
    # with a 300 mm bell: each bell carries Q/2. ANSI/HI 9.8-1998 eq. 9.8-1 as above.
    from tests.solver.test_calc import _analytic_curve

    text = (
        CASE.replace("efficiency = 0.78\n", "count = 2\n")
        .replace('side = "suction"', 'side = "suction_branch"')
        .replace("[source]\n", '[source]\nintake_diameter = "300 mm"\n')
        .replace(
            'fittings = [{ K = 0.5, note = "entrance" }',
            'elevation_start = "0.4 m"\nelevation_end = "0 m"\n'
            'fittings = [{ K = 0.5, note = "entrance" }',
        )
    )
    t = solve(loads((text + _analytic_curve()).encode()))
    Q = t.results["flow"]["value"]
    vb = (Q / 2) / (3.141592653589793 * 0.3**2 / 4)
    assert t.step("intake.velocity").value == pytest.approx(vb, rel=1e-12)
    assert t.results["intake"]["minimum_submergence"]["value"] == pytest.approx(
        0.3 * (1 + 2.3 * vb / (G * 0.3) ** 0.5), rel=1e-12
    )


def test_branches_must_follow_flow_order():
    # A branch after the discharge line it feeds.
    text = CASE.replace('side = "discharge"', 'side = "discharge_branch"').replace(
        'side = "suction"', 'side = "discharge"'
    )
    with pytest.raises(InputError) as err:
        loads(text.encode())
    assert any("flow order" in p.message for p in err.value.problems)


def test_viscous_liquid_corrects_the_water_curve():
    # ANSI/HI 9.6.7-2010 (equations from memory): B from the water BEP in US units,
    # B = 26.6 nu^0.5 H^0.0625 / (Q^0.375 N^0.25) (cSt, ft, gpm, rpm), then
    # C_Q = 2.71^(-0.165 (log B)^3.15), C_eta = B^(-0.0547 B^0.69). A custom oil of
    # 0.1 Pa s and 880 kg/m^3 on the section-11 pump at 2900 rpm.
    import math

    from tests.solver.test_calc import _analytic_curve

    oil = CASE.replace(
        '[fluid]\ntemperature = "20 degC"',
        '[fluid]\nkind = "custom"\ntemperature = "20 degC"\ndensity = "880 kg/m^3"\n'
        'viscosity = "0.1 Pa*s"\nvapor_pressure = "1 kPa"',
    ).replace("efficiency = 0.78\n", "")
    t = solve(loads((oil + _analytic_curve(speed='speed = "2900 rpm"\n')).encode()))
    corr = t.results["viscous_correction"]
    assert corr["applied"]
    nu_cst = 0.1 / 880 * 1e6
    q_bep, h_bep = 22.0, 42 + 0.2 * 22 - 0.02 * 22 * 22  # the efficiency peaks at 22 L/s
    B_us = (
        26.6
        * nu_cst**0.5
        * (h_bep / 0.3048) ** 0.0625
        / ((q_bep * 1e-3 / 6.30901964e-5) ** 0.375 * 2900**0.25)
    )
    B = corr["parameter"]["value"]
    assert B == pytest.approx(B_us, rel=6e-3)  # the SI and US constants are rounded
    assert corr["flow_factor"]["value"] == pytest.approx(
        2.71 ** (-0.165 * math.log10(B) ** 3.15), rel=1e-12
    )
    assert corr["efficiency_factor"]["value"] == pytest.approx(B ** (-0.0547 * B**0.69))
    # The corrected curve gives less head at a lower efficiency: the oil's operating flow is
    # below the water's on the same system, and its efficiency below the water curve's.
    water = solve(
        loads(
            (
                CASE.replace("efficiency = 0.78\n", "")
                + _analytic_curve(speed='speed = "2900 rpm"\n')
            ).encode()
        )
    )
    assert "viscous_correction" not in water.results
    oil_op, water_op = t.results["operating_point"], water.results["operating_point"]
    assert oil_op["efficiency"]["value"] < water_op["efficiency"]["value"]
    assert oil_op["efficiency"]["value"] == pytest.approx(
        corr["efficiency_factor"]["value"]
        * 0.78
        * (1 - ((oil_op["flow"]["value"] * 1e3 / corr["flow_factor"]["value"] - 22) / 22) ** 2),
        rel=1e-3,
    )
    review = next(c for c in t.checks if c.id == "viscous_correction")
    assert review.status == "review" and "ANSI/HI 9.6.7" in review.message


def test_water_needs_no_viscosity_correction():
    from tests.solver.test_calc import _analytic_curve

    t = solve(loads((CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()).encode()))
    assert "viscous_correction" not in t.results
    assert all(c.id != "viscous_correction" for c in t.checks)


def test_cold_glycol_below_freezing_water_solves():
    # 50 % propylene glycol at -10 degC: water's saturation pressure is taken at its
    # 0.01 degC limit for Raoult's law (a higher vapour pressure: the safe side).
    text = CASE.replace(
        '[fluid]\ntemperature = "20 degC"',
        '[fluid]\nkind = "propylene_glycol"\nmass_fraction = 0.5\ntemperature = "-10 degC"',
    )
    t = solve(loads(text.encode()))
    assert 0 < t.results["fluid"]["vapor_pressure"]["value"] < 611.7


def test_motor_is_sized_on_the_viscous_curve():
    from tests.solver.test_calc import _analytic_curve

    curve = _analytic_curve(speed='speed = "2900 rpm"\n')
    water = solve(loads((CASE.replace("efficiency = 0.78\n", "") + curve).encode()))
    oil = CASE.replace(
        '[fluid]\ntemperature = "20 degC"',
        '[fluid]\nkind = "custom"\ntemperature = "20 degC"\ndensity = "998 kg/m^3"\n'
        'viscosity = "0.1 Pa*s"\nvapor_pressure = "1 kPa"',
    ).replace("efficiency = 0.78\n", "")
    viscous = solve(loads((oil + curve).encode()))
    peak_w = water.results["motor"]["peak_shaft_power"]["value"]
    peak_v = viscous.results["motor"]["peak_shaft_power"]["value"]
    assert peak_v > 1.05 * peak_w  # the corrected curve takes more power at equal density


def test_the_combined_worst_state_is_a_case_every_check_sees():
    from calcreport.recheck import recheck

    envelope = (
        '[envelope]\nroughness = "0.5 mm"\ntemperature = ["5 degC", "30 degC"]\n'
        'flow_required = ["20 L/s", "27 L/s"]\n'
    )
    t = solve(loads((CASE + envelope).encode()))
    worst = _case("Combined worst", t)
    alone = {k: t.results["cases"][_case(k, t)] for k in ("Aged pipe", "Coldest", "Peak")}
    combined = t.results["cases"][worst]
    # Aged roughness, cold liquid and the peak flow at once, at the highest static head.
    assert all(p["roughness"]["value"] == 0.5e-3 for p in combined["pipes"].values())
    assert combined["fluid"]["density"]["value"] == alone["Coldest"]["fluid"]["density"]["value"]
    assert combined["required_flow"]["value"] == pytest.approx(0.027)
    assert combined["static_head"]["value"] == alone["Aged pipe"]["static_head"]["value"]
    # Its head is above each extreme alone (rougher, colder and faster at once).
    for case in alone.values():
        assert combined["total_dynamic_head"]["value"] > case["total_dynamic_head"]["value"]
    assert recheck(t.to_json()).ok
    # One extreme alone: no combined state (it would repeat that case).
    single = solve(loads((CASE + '[envelope]\nroughness = "0.5 mm"\n').encode()))
    assert not any(c["title"].startswith("Combined worst") for c in single.cases)
