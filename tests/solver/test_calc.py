"""End-to-end solve against an independent calculation, and trace consistency."""

import math
from pathlib import Path

import pytest

from calcreport.model.loader import loads
from calcreport.physics.equation import lookup
from calcreport.solver import solve

EXAMPLES = Path(__file__).parents[2] / "input_examples"

# The project's own end-to-end check case, recomputed independently with fluids 1.3.1
# (Colebrook) and IAPWS-95 water properties: water 20 degC, open tanks at sea level,
# levels +2.0 m and +25.0 m above the pump centreline.
CASE = """
format = 1
[fluid]
temperature = "20 degC"
[duty]
flow = "20 L/s"
flow_range = ["0 L/s", "30 L/s"]
[source]
level = "2.0 m"
[destination]
level = "25.0 m"
[pump]
elevation = "0 m"
efficiency = 0.78
[motor]
efficiency = 0.92
[operation]
hours_per_year = 6000
energy_price = 0.10
currency = "USD"
[[pipe]]
id = "S1"
side = "suction"
length = "10 m"
inner_diameter = "154.051 mm"
roughness = "0.045 mm"
fittings = [{ K = 0.5, note = "entrance" }, { K = 0.57 }]
[[pipe]]
id = "D1"
side = "discharge"
length = "150 m"
inner_diameter = "102.26 mm"
roughness = "0.045 mm"
fittings = [{ K = 0.366 }, { K = 3.0, count = 1 }, { K = 1.0, note = "exit" }]
"""


@pytest.fixture(scope="module")
def trace():
    return solve(loads(CASE.encode()))


def _independent(Q):
    """The same system computed with fluids and iapws only (not calcreport)."""
    fluids = pytest.importorskip("fluids")
    iapws = pytest.importorskip("iapws")
    g = 9.80665
    w = iapws.IAPWS97(T=293.15, P=0.101325)
    rho, mu = w.rho, w.mu
    p_v = iapws.IAPWS97(T=293.15, x=0).P * 1e6
    p_baro = fluids.atmosphere.ATMOSPHERE_1976(0.0).P
    pipes = [(0.154051, 10.0, 1.07), (0.10226, 150.0, 4.366)]
    out = []
    for D, L, K in pipes:
        v = Q / (math.pi * D**2 / 4)
        Re = rho * v * D / mu
        f = fluids.friction.Colebrook(Re, 0.045e-3 / D)
        out.append((v, Re, f, f * L / D * v**2 / (2 * g), K * v**2 / (2 * g)))
    tdh = 23.0 + sum(p[3] + p[4] for p in out)
    npsha = p_baro / (rho * g) + 2.0 - (out[0][3] + out[0][4]) - p_v / (rho * g)
    return rho, out, tdh, npsha


def test_against_independent_calculation(trace):
    rho, pipes, tdh, npsha = _independent(0.020)
    r = trace.results
    assert r["total_dynamic_head"]["value"] == pytest.approx(tdh, rel=1e-5)
    assert r["npsh_available"]["value"] == pytest.approx(npsha, rel=1e-5)
    for ident, (v, Re, f, hf, hm) in zip(("S1", "D1"), pipes, strict=True):
        p = r["pipes"][ident]
        assert p["velocity"]["value"] == pytest.approx(v, rel=1e-12)
        assert p["reynolds"]["value"] == pytest.approx(Re, rel=1e-5)
        assert p["friction_factor"]["value"] == pytest.approx(f, rel=1e-6)
        assert p["friction_loss"]["value"] == pytest.approx(hf, rel=1e-5)
        assert p["minor_loss"]["value"] == pytest.approx(hm, rel=1e-12)
    P_h = rho * 9.80665 * 0.020 * tdh
    assert r["hydraulic_power"]["value"] == pytest.approx(P_h, rel=1e-5)
    assert r["shaft_power"]["value"] == pytest.approx(P_h / 0.78, rel=1e-5)
    assert r["electrical_power"]["value"] == pytest.approx(P_h / 0.78 / 0.92, rel=1e-5)
    energy = r["energy"]
    assert energy["annual_energy"]["value"] == pytest.approx(
        P_h / 0.78 / 0.92 * 6000 * 3600, rel=1e-5
    )
    assert energy["annual_cost"]["value"] == pytest.approx(
        P_h / 0.78 / 0.92 * 6000 / 1000 * 0.10, rel=1e-5
    )
    assert energy["annual_cost"]["unit"] == "USD"


def test_check_values_end_to_end(trace):
    # Computed with fluids 1.3.1 (Colebrook) and IAPWS-95 water properties (IF97 here:
    # 1e-6 in density); tolerance 1e-4 relative with K fixed.
    r = trace.results
    assert r["pipes"]["S1"]["velocity"]["value"] == pytest.approx(1.07303, rel=1e-5)
    assert r["pipes"]["S1"]["reynolds"]["value"] == pytest.approx(164_742, rel=1e-4)
    assert r["pipes"]["S1"]["friction_factor"]["value"] == pytest.approx(0.018102, rel=1e-4)
    suction = r["pipes"]["S1"]["friction_loss"]["value"] + r["pipes"]["S1"]["minor_loss"]["value"]
    assert suction == pytest.approx(0.13180, rel=1e-4)
    assert r["pipes"]["D1"]["velocity"]["value"] == pytest.approx(2.43515, rel=1e-5)
    assert r["pipes"]["D1"]["reynolds"]["value"] == pytest.approx(248_177, rel=1e-4)
    assert r["pipes"]["D1"]["friction_factor"]["value"] == pytest.approx(0.018142, rel=1e-4)
    assert r["pipes"]["D1"]["friction_loss"]["value"] == pytest.approx(8.04585, rel=1e-4)
    assert r["pipes"]["D1"]["minor_loss"]["value"] == pytest.approx(1.32003, rel=1e-4)
    assert r["total_dynamic_head"]["value"] == pytest.approx(32.49768, rel=1e-4)
    assert r["hydraulic_power"]["value"] == pytest.approx(6362.44, rel=1e-4)
    assert r["npsh_available"]["value"] == pytest.approx(11.9801, rel=1e-4)


def test_system_curve_check_values(trace):
    # Computed with fluids 1.3.1 and IAPWS-95 water: H(Q) at 0/5/10/15/20/25/30 L/s.
    curve = trace.results["system_curve"]
    flows = curve["flow"]["value"]
    heads = dict(zip((round(q * 1e3, 6) for q in flows), curve["head"]["value"], strict=True))
    expected = {
        0: 23.0000,
        5: 23.6898,
        10: 25.5289,
        15: 28.4685,
        20: 32.4977,
        25: 37.6122,
        30: 43.8100,
    }
    for q, h in expected.items():
        assert heads[float(q)] == pytest.approx(h, rel=1e-4)


def test_curve_passes_through_duty_point(trace):
    curve = trace.results["system_curve"]
    i = [round(q, 9) for q in curve["flow"]["value"]].index(0.02)
    assert curve["head"]["value"][i] == pytest.approx(
        trace.results["total_dynamic_head"]["value"], rel=1e-13
    )
    assert curve["npsh_available"]["value"][i] == pytest.approx(
        trace.results["npsh_available"]["value"], rel=1e-13
    )


def test_high_site_lowers_npsh_available():
    # Computed with fluids 1.3.1 (US Standard Atmosphere 1976, fluids.atmosphere) and
    # IAPWS-95 water: NPSHa 10.2674 m at 1500 m elevation.
    high = CASE.replace("[source]", '[site]\nelevation = "1500 m"\n[source]')
    r = solve(loads(high.encode())).results
    assert r["npsh_available"]["value"] == pytest.approx(10.2674, rel=1e-4)
    assert r["barometric_pressure"]["value"] == pytest.approx(84559.7, abs=1.0)


def _all_traces():
    yield solve(loads(CASE.encode()))
    yield solve(
        loads(
            (
                CASE.replace("efficiency = 0.78\n", 'speed = "2800 rpm"\n')
                + _analytic_curve(speed='speed = "3000 rpm"\n')
            ).encode()
        )
    )
    for path in sorted(EXAMPLES.glob("*.toml")):
        yield solve(loads(path.read_bytes(), str(path)))


def test_every_step_recomputes_from_its_arguments():
    for trace in _all_traces():
        values = {s.id: s.value for s in trace.steps}
        assumed = {a["id"] for a in trace.assumptions}
        for step in trace.steps:
            eq = lookup(step.function)
            args = {a.name: a.value for a in step.arguments}
            assert eq.func(**args) == pytest.approx(step.value, rel=1e-12), step.id
            # Every argument is the recorded value of the source it names.
            for a in step.arguments:
                sources = a.source if isinstance(a.source, tuple) else (a.source,)
                vals = a.value if isinstance(a.value, tuple) else (a.value,)
                for source, value in zip(sources, vals, strict=True):
                    if source in values:
                        assert value == values[source], (step.id, source)
                    elif source in trace.given:
                        assert value == trace.given[source]["value"], (step.id, source)
                    elif source in trace.solutions:
                        assert value == trace.solutions[source]["value"], (step.id, source)
                    else:
                        assert source in assumed, (step.id, source)


def test_every_step_has_reference_and_unit_text():
    for trace in _all_traces():
        for step in trace.steps:
            assert step.reference in trace.references, step.id
            assert step.substituted and step.equation and step.title
        for check in trace.checks:
            assert check.reference in trace.references, check.id


def test_free_discharge_adds_outlet_velocity_head():
    free = CASE.replace(
        '[destination]\nlevel = "25.0 m"',
        '[destination]\nlevel = "30.0 m"\ninlet = "free"\noutlet_elevation = "25.0 m"',
    )
    free = free.replace(', { K = 1.0, note = "exit" }', "")
    r = solve(loads(free.encode())).results
    v = r["pipes"]["D1"]["velocity"]["value"]
    assert r["static_head"]["value"] == pytest.approx(23.0)
    assert r["outlet_velocity_head"]["value"] == pytest.approx(v**2 / (2 * 9.80665), rel=1e-14)
    # Same energy as the submerged case: an exit K = 1 equals the velocity head.
    submerged = solve(loads(CASE.encode())).results["total_dynamic_head"]["value"]
    assert r["total_dynamic_head"]["value"] == pytest.approx(submerged, rel=1e-12)


def test_pressurised_destination_adds_pressure_head():
    pressurised = CASE.replace('level = "25.0 m"', 'level = "25.0 m"\npressure = "150 kPa"')
    t = solve(loads(pressurised.encode()))
    rho = t.results["fluid"]["density"]["value"]
    assert t.results["pressure_head"]["value"] == pytest.approx(150e3 / (rho * 9.80665), rel=1e-14)


def test_boiling_source_cancels_pressure_terms():
    hot = CASE.replace('temperature = "20 degC"', 'temperature = "80 degC"').replace(
        'level = "2.0 m"', 'level = "2.0 m"\npressure = "saturation"'
    )
    r = solve(loads(hot.encode())).results
    suction = r["pipes"]["S1"]["friction_loss"]["value"] + r["pipes"]["S1"]["minor_loss"]["value"]
    # NPSHa = static suction head - suction losses when the surface is at saturation.
    assert r["npsh_available"]["value"] == pytest.approx(2.0 - suction, rel=1e-9)


def test_equipment_rated_loss_scales_with_flow_squared():
    with_hx = CASE.replace(
        "{ K = 3.0, count = 1 }", '{ K = 3.0, count = 1 }, { dp = "35 kPa", at_flow = "40 L/s" }'
    )
    t = solve(loads(with_hx.encode()))
    rho = t.results["fluid"]["density"]["value"]
    d1 = t.results["pipes"]["D1"]
    expected = 35e3 / (rho * 9.80665) * 0.25
    assert d1["equipment_loss"]["value"] == pytest.approx(expected, rel=1e-14)
    assert d1["minor_loss"]["value"] == pytest.approx(
        d1["fitting_loss"]["value"] + expected, rel=1e-14
    )


def test_laminar_pipe_uses_64_over_re():
    viscous = CASE.replace(
        'temperature = "20 degC"',
        'kind = "custom"\ntemperature = "20 degC"\n'
        'density = "900 kg/m^3"\nviscosity = "0.5 Pa*s"\n'
        'vapor_pressure = "1 kPa"',
    )
    t = solve(loads(viscous.encode()))
    p = t.results["pipes"]["D1"]
    assert p["regime"] == "laminar"
    assert p["friction_factor"]["value"] == pytest.approx(64 / p["reynolds"]["value"], rel=1e-14)
    assert t.step("pipe.D1.friction_factor").function == "friction.laminar"


def test_transition_band_is_flagged_for_review():
    oil = CASE.replace(
        'temperature = "20 degC"',
        'kind = "custom"\ntemperature = "20 degC"\n'
        'density = "900 kg/m^3"\nviscosity = "0.08 Pa*s"\n'
        'vapor_pressure = "1 kPa"',
    )
    t = solve(loads(oil.encode()))
    assert t.results["pipes"]["D1"]["regime"] == "transition"
    check = next(c for c in t.checks if c.id == "flow_regime.D1")
    assert check.status == "review"
    assert t.step("pipe.D1.friction_factor").function == "friction.colebrook"


def test_missing_efficiency_omits_power_with_note():
    bare = CASE.replace("efficiency = 0.78\n", "")
    t = solve(loads(bare.encode()))
    assert "hydraulic_power" in t.results
    assert "shaft_power" not in t.results and "electrical_power" not in t.results
    assert any("pump.efficiency" in n for n in t.notes)


def test_velocity_limit_review_by_default_fail_when_project_sets_it():
    fast = CASE.replace('flow = "20 L/s"', 'flow = "30 L/s"').replace(
        'flow_range = ["0 L/s", "30 L/s"]', ""
    )
    t = solve(loads(fast.encode()))
    d1 = next(c for c in t.checks if c.id == "velocity_max.D1")
    assert d1.status == "review" and d1.reference == "common_practice"
    strict = fast + '[criteria]\ndischarge_velocity_max = "2.5 m/s"\n'
    t = solve(loads(strict.encode()))
    d1 = next(c for c in t.checks if c.id == "velocity_max.D1")
    assert d1.status == "fail" and d1.limit == pytest.approx(2.5)


def test_excessive_suction_lift_fails_npsh_check():
    lift = CASE.replace('level = "2.0 m"', 'level = "-12.0 m"')
    t = solve(loads(lift.encode()))
    check = next(c for c in t.checks if c.id == "npsh_available")
    assert check.status == "fail"


def test_missing_exit_item_asks_for_review():
    no_exit = CASE.replace(', { K = 1.0, note = "exit" }', "")
    t = solve(loads(no_exit.encode()))
    assert next(c for c in t.checks if c.id == "exit_loss_item").status == "review"


def _analytic_curve(step_ls=0.5, top=40.0, speed=""):
    """The check case's own pump: H = 42 + 0.2q - 0.02q^2, eta = 0.78[1 - ((q-22)/22)^2]."""
    n = round(top / step_ls)
    qs = [i * step_ls for i in range(n + 1)]
    heads = [42 + 0.2 * q - 0.02 * q * q for q in qs]
    effs = [max(0.0, 0.78 * (1 - ((q - 22) / 22) ** 2)) for q in qs]
    return (
        f"\n[pump.curve]\n{speed}"
        f'flow = {{ unit = "L/s", values = {qs} }}\n'
        f'head = {{ unit = "m", values = {heads} }}\n'
        f"efficiency = {effs}\n"
    )


def test_operating_point_against_check_values():
    # Computed with fluids 1.3.1 and IAPWS-95 water: operating point q 23.3282 L/s, H 35.7815 m,
    # eta 0.7772, brake power 10 514.1 W; 1e-4 relative with K fixed. The curve is
    # given as points every 0.5 L/s; the monotone cubic reproduces it to ~1e-5.
    text = CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()
    t = solve(loads(text.encode()))
    op = t.results["operating_point"]
    assert op["flow"]["value"] == pytest.approx(0.0233282, rel=1e-4)
    assert op["head"]["value"] == pytest.approx(35.7815, rel=1e-4)
    assert op["efficiency"]["value"] == pytest.approx(0.7772, rel=2e-4)
    assert t.results["shaft_power"]["value"] == pytest.approx(10514.1, rel=2e-4)
    # Pump head equals system head at the operating point.
    assert t.results["total_dynamic_head"]["value"] == pytest.approx(op["head"]["value"], abs=1e-8)
    assert abs(t.step("pump.head_balance").value) < 1e-8


def test_affinity_moves_the_curve_and_finds_a_new_intersection():
    # Computed with fluids 1.3.1 and IAPWS-95 water: at 90 % speed q 18.0178 L/s, H 30.7704 m.
    speeds = 'speed = "3000 rpm"\n'
    text = CASE.replace("efficiency = 0.78\n", 'speed = "2700 rpm"\n') + _analytic_curve(
        speed=speeds
    )
    t = solve(loads(text.encode()))
    op = t.results["operating_point"]
    assert op["flow"]["value"] == pytest.approx(0.0180178, rel=1e-4)
    assert op["head"]["value"] == pytest.approx(30.7704, rel=1e-4)
    assert t.step("pump.at_speed.head[1]").function == "pump.affinity_head"


def test_no_intersection_is_reported_not_crashed():
    weak = CASE.replace("efficiency = 0.78\n", "") + (
        '\n[pump.curve]\nflow = ["0 L/s", "10 L/s", "20 L/s"]\n'
        'head = ["20 m", "18 m", "12 m"]\nefficiency = [0.0, 0.6, 0.7]\n'
    )
    t = solve(loads(weak.encode()))
    assert "operating_point" not in t.results
    check = next(c for c in t.checks if c.id == "operating_point")
    assert check.status == "fail"
    assert any("shutoff head" in n for n in t.notes)
    assert t.status["value"] == "not feasible"


def test_motor_is_next_standard_rating_above_the_peak_power():
    text = CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()
    t = solve(loads(text.encode()))
    motor = t.results["motor"]
    peak = motor["peak_shaft_power"]["value"]
    # IEC 60072-1 output series (from memory).
    iec_kw = [0.75, 1.1, 1.5, 2.2, 3, 4, 5.5, 7.5, 11, 15, 18.5, 22, 30, 37, 45, 55, 75, 90]
    expected = min(k for k in iec_kw if k * 1e3 >= peak) * 1e3
    assert motor["rated_power"]["value"] == pytest.approx(expected)
    assert peak >= t.results["shaft_power"]["value"]


def test_level_ranges_make_cases_and_checks_name_the_governing_case():
    ranged = CASE.replace(
        'level = "2.0 m"', 'level = "2.0 m"\nlevel_low = "0.5 m"\nlevel_high = "3.0 m"'
    ).replace('level = "25.0 m"', 'level = "25.0 m"\nlevel_high = "26.0 m"\nlevel_low = "24.0 m"')
    text = ranged.replace("efficiency = 0.78\n", "") + _analytic_curve()
    t = solve(loads(text.encode()))
    cases = t.results["cases"]
    assert set(cases) == {"C1", "C2", "C3"}
    tdh = {c: cases[c]["total_dynamic_head"]["value"] for c in cases}
    flows = {c: cases[c]["operating_point"]["flow"]["value"] for c in cases}
    assert tdh["C2"] > tdh["C1"] > tdh["C3"]
    assert flows["C2"] < flows["C1"] < flows["C3"]
    duty = next(c for c in t.checks if c.id == "duty_flow")
    assert duty.case == "C2"  # the highest static head governs the duty check
    assert [c.id for c in t.checks].count("duty_flow") == 1


def test_parallel_pumps_share_the_flow_and_meet_the_system_curve():
    # Two identical pumps in parallel: flows add at equal head (Karassik, Pump Handbook,
    # 4th ed.). Independent check: bisection on 2 x pump flow against the system curve
    # of this same case, built from the single-pump analytic curve.
    text = CASE.replace("efficiency = 0.78\n", "count = 2\n") + _analytic_curve()
    text = text.replace('flow = "20 L/s"', 'flow = "35 L/s"').replace(
        'flow_range = ["0 L/s", "30 L/s"]', ""
    )
    t = solve(loads(text.encode()))
    op = t.results["operating_point"]
    q1 = op["flow_per_pump"]["value"]
    assert op["flow"]["value"] == pytest.approx(2 * q1, rel=1e-12)
    head = 42 + 0.2 * q1 * 1e3 - 0.02 * (q1 * 1e3) ** 2
    assert op["head"]["value"] == pytest.approx(head, rel=1e-4)
    assert t.results["total_dynamic_head"]["value"] == pytest.approx(op["head"]["value"], abs=1e-8)
    eta = 0.78 * (1 - ((q1 * 1e3 - 22) / 22) ** 2)
    assert op["efficiency"]["value"] == pytest.approx(eta, rel=2e-4)
    per_pump = t.results["shaft_power_per_pump"]["value"]
    assert per_pump == pytest.approx(t.results["shaft_power"]["value"] / 2, rel=1e-14)
    # The reduced case runs one pump, further out on its curve.
    reduced = next(c for c in t.cases if "One duty pump out" in c["title"])
    single = t.results["cases"][reduced["id"]]["operating_point"]
    assert single["pumps_running"]["value"] == 1
    assert single["flow"]["value"] > q1
    assert single["flow"]["value"] < op["flow"]["value"]


def test_series_pumps_add_head():
    text = CASE.replace("efficiency = 0.78\n", 'count = 2\narrangement = "series"\n')
    text = text.replace('level = "25.0 m"', 'level = "60.0 m"') + _analytic_curve()
    t = solve(loads(text.encode()))
    op = t.results["operating_point"]
    q = op["flow"]["value"] * 1e3
    assert op["head"]["value"] == pytest.approx(2 * (42 + 0.2 * q - 0.02 * q * q), rel=1e-4)
    assert t.step("pump.series_head").function == "pump.series_head"


def test_standby_pump_gives_firm_capacity_and_all_running_cases():
    text = CASE.replace("efficiency = 0.78\n", "count = 3\nstandby = 1\n") + _analytic_curve()
    text = text.replace('flow = "20 L/s"', 'flow = "40 L/s"').replace(
        'flow_range = ["0 L/s", "30 L/s"]', ""
    )
    t = solve(loads(text.encode()))
    assert t.step("pump.duty_pumps").value == 2
    running = {c["id"]: t.results["cases"][c["id"]]["pumps_running"]["value"] for c in t.cases}
    assert running["C1"] == 2 and 3 in running.values() and 1 in running.values()
    duty = next(c for c in t.checks if c.id == "duty_flow")
    assert running[duty.case] == 2  # the required flow is asked of the duty pumps only


def test_specific_energy_is_electrical_power_over_flow():
    t = solve(loads(CASE.encode()))
    e = t.results["energy"]["specific_energy"]
    expected = t.results["electrical_power"]["value"] / 0.020  # J/m^3
    assert e["value"] == pytest.approx(expected, rel=1e-14) and e["unit"] == "J/m^3"


def test_drooping_curve_flagged_for_parallel_service():
    drooping = (
        '\n[pump.curve]\nflow = ["0 L/s", "10 L/s", "20 L/s", "30 L/s", "40 L/s"]\n'
        'head = ["38 m", "41 m", "40 m", "35 m", "26 m"]\n'
        "efficiency = [0.0, 0.55, 0.74, 0.78, 0.70]\n"
    )
    single = solve(loads((CASE.replace("efficiency = 0.78\n", "") + drooping).encode()))
    check = next(c for c in single.checks if c.id == "curve_stability")
    assert check.status == "pass" and "drooping" in check.message
    twin = solve(loads((CASE.replace("efficiency = 0.78\n", "count = 2\n") + drooping).encode()))
    check = next(c for c in twin.checks if c.id == "curve_stability")
    assert check.status == "review" and "parallel" in check.message


def test_temperature_range_gives_cold_and_warm_cases_with_their_own_properties():
    # Water properties per case from IAPWS (iapws, test-only): the warm case has the
    # higher vapour pressure and so less NPSH available; the cold one the higher viscosity.
    iapws = pytest.importorskip("iapws")
    text = CASE + '\n[envelope]\ntemperature = ["5 degC", "60 degC"]\n'
    t = solve(loads(text.encode()))
    titles = {c["id"]: c["title"] for c in t.cases}
    cold = next(i for i, title in titles.items() if title.startswith("Coldest"))
    warm = next(i for i, title in titles.items() if title.startswith("Warmest"))
    mu_cold = t.step(f"{cold}.fluid.viscosity").value
    assert mu_cold == pytest.approx(iapws.IAPWS97(T=278.15, P=0.101325).mu, rel=1e-6)
    p_v_warm = t.step(f"{warm}.fluid.vapor_pressure").value
    assert p_v_warm == pytest.approx(iapws.IAPWS97(T=333.15, x=0).P * 1e6, rel=1e-8)
    cases = t.results["cases"]
    assert cases[warm]["npsh_available"]["value"] < cases["C1"]["npsh_available"]["value"]
    npsh = next(c for c in t.checks if c.id == "npsh_available")
    assert npsh.case == warm  # the least NPSH governs


def test_peak_required_flow_governs_the_duty_check():
    text = (
        CASE.replace("efficiency = 0.78\n", "")
        + _analytic_curve()
        + '\n[envelope]\nflow_required = ["15 L/s", "20 L/s", "25 L/s"]\n'
    )
    t = solve(loads(text.encode()))
    duty = next(c for c in t.checks if c.id == "duty_flow")
    assert duty.limit == pytest.approx(0.025)
    assert duty.status == "fail"  # the pump gives about 23.3 L/s (operating point above)


def test_trace_records_software_and_catalog_versions():
    import calcreport
    from calcreport import catalog

    t = solve(loads(CASE.encode())).to_json()
    assert t["software"]["version"] == calcreport.__version__
    assert t["software"]["catalog_sha256"] == catalog.fingerprint()
    assert len(t["software"]["catalog_sha256"]) == 64


def test_fill_duty_energy_does_not_depend_on_assumed_hours():
    # Fill duty: E = V rho g H / (eta_p eta_m), independent of the hours (issue 9).
    text = CASE.replace("hours_per_year = 6000\n", 'annual_volume = "250000 m^3"\n')
    t = solve(loads(text.encode()))
    r = t.results
    rho = r["fluid"]["density"]["value"]
    expected = 250000 * rho * 9.80665 * r["total_dynamic_head"]["value"] / (0.78 * 0.92)
    assert r["energy"]["annual_energy"]["value"] == pytest.approx(expected, rel=1e-12)
    assert r["energy"]["operating_time"]["value"] == pytest.approx(250000 / 0.020, rel=1e-12)


def test_demand_charge_and_life_cycle_present_value():
    text = CASE.replace(
        'currency = "USD"',
        'currency = "USD"\ndemand_charge = 14.0\nlife_years = 20\ndiscount_rate = 0.05',
    )
    t = solve(loads(text.encode()))
    e = t.results["energy"]
    p_e_kw = t.results["electrical_power"]["value"] / 1e3
    energy_cost = p_e_kw * 6000 * 0.10
    assert e["demand_cost"]["value"] == pytest.approx(p_e_kw * 14.0 * 12, rel=1e-12)
    total = energy_cost + p_e_kw * 14.0 * 12
    assert e["annual_cost"]["value"] == pytest.approx(total, rel=1e-12)
    # Annuity present-value factor at 5 % over 20 years: 12.46221 (standard tables).
    assert e["life_cycle_energy_cost"]["value"] == pytest.approx(total * 12.46221, rel=1e-6)


def test_named_fittings_resolve_to_catalog_coefficients():
    # Hooper 2-K against fluids.fittings.Hooper2K (fluids 1.3.1, test-only) at the pipe's own
    # Reynolds number and inner diameter in inches; entrance/exit constants from Crane TP-410
    # as fluids implements them [V].
    fluids = pytest.importorskip("fluids")
    text = CASE.replace(
        'fittings = [{ K = 0.5, note = "entrance" }, { K = 0.57 }]',
        'fittings = [{ kind = "sharp_edged_entrance" }, { kind = "gate_valve" }]',
    )
    text = text.replace("{ K = 3.0, count = 1 }", '{ kind = "swing_check_valve", count = 2 }')
    t = solve(loads(text.encode()))
    d1 = t.results["pipes"]["D1"]
    re_d1 = d1["reynolds"]["value"]
    swing = fluids.fittings.Hooper2K(Di=0.10226 / 0.0254, Re=re_d1, name="Valve, Check, Swing")
    assert t.step("pipe.D1.fitting[2].K").value == pytest.approx(swing, rel=1e-12)
    s1 = t.results["pipes"]["S1"]
    gate = fluids.fittings.Hooper2K(
        Di=0.154051 / 0.0254,
        Re=s1["reynolds"]["value"],
        name="Valve, Gate, Full line size, Beta = 1",
    )
    entrance = fluids.fittings.entrance_sharp(method="Crane")  # 0.5; Rennels gives 0.57
    assert s1["k_total"]["value"] == pytest.approx(entrance + gate, rel=1e-12)
    assert d1["k_total"]["value"] == pytest.approx(0.366 + 2 * swing + 1.0, rel=1e-12)


def test_unknown_fitting_kind_suggests_close_names():
    from calcreport.errors import InputError

    text = CASE.replace("{ K = 0.57 }", '{ kind = "gate_valv" }')
    with pytest.raises(InputError) as error:
        loads(text.encode())
    message = str(error.value)
    assert "pipe[1].fittings[2].kind" in message and '"gate_valve"' in message


def test_catalog_pipe_sizes_and_materials_solve_without_explicit_values():
    # Issue 5 "done when": NPS 6 schedule 40 resolves to 154.05 mm (6.065 in, ASME B36.10M,
    # from memory, confirmed in fluids.piping 1.3.1); commercial steel 0.045 mm (Moody,
    # Trans. ASME 66, 1944, from memory; White, Fluid Mechanics, Table 6.1, read in a
    # secondary source).
    text = CASE.replace(
        'inner_diameter = "154.051 mm"\nroughness = "0.045 mm"',
        'nominal_size = "NPS 6"\nschedule = "Sch 40"\nmaterial = "commercial_steel"',
    )
    text = text.replace(
        'inner_diameter = "102.26 mm"\nroughness = "0.045 mm"',
        'nominal_size = "4"\nschedule = "40"\nmaterial = "commercial_steel"',
    )
    t = solve(loads(text.encode()))
    s1 = t.results["pipes"]["S1"]
    assert s1["inner_diameter"]["value"] == pytest.approx(0.154051, abs=1e-9)
    assert s1["roughness"]["value"] == pytest.approx(4.5e-5, rel=1e-12)
    assert "B36.10M" in s1["sources"]["inner_diameter"]
    # NPS 4 Sch 40 is 4.026 in = 102.2604 mm: the end-to-end check case exactly, TDH
    # 32.49768 m computed with fluids 1.3.1 and IAPWS-95 water (its tolerance 1e-4 covers
    # IF97 against IAPWS-95).
    assert t.results["total_dynamic_head"]["value"] == pytest.approx(32.49768, rel=1e-5)
    assert "catalog.asme_b36_10m_steel[6 40].inner_diameter" in t.given


def test_commissioning_flange_pressures_by_the_energy_equation():
    # Source surface to the suction flange, then the pump's total head between the flanges
    # (White, Fluid Mechanics, eq. 3.73 and sec. 11.2), computed here by hand.
    text = CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()
    t = solve(loads(text.encode()))
    r = t.results
    rho, g = r["fluid"]["density"]["value"], 9.80665
    s1, d1 = r["pipes"]["S1"], r["pipes"]["D1"]
    v_in, v_out = s1["velocity"]["value"], d1["velocity"]["value"]
    p_in = rho * g * (2.0 - 0.0 - r["suction_loss"]["value"]) - rho * v_in**2 / 2
    p_out = p_in + rho * g * r["total_dynamic_head"]["value"] - rho * (v_out**2 - v_in**2) / 2
    c = r["commissioning"]
    assert c["suction_pressure"]["value"] == pytest.approx(p_in, rel=1e-12)
    assert c["discharge_pressure"]["value"] == pytest.approx(p_out, rel=1e-12)
    # At shutoff: no flow, the curve's head at zero flow, 42 m for this curve.
    assert c["shutoff_discharge_pressure"]["value"] == pytest.approx(
        rho * g * 2.0 + rho * g * 42.0, rel=1e-12
    )


def test_reducer_and_expander_coefficients_follow_crane():
    # Crane TP-410 formulas as implemented in fluids 1.3.1 (contraction_sharp / diffuser_conical,
    # method "Crane"), referred to the smaller pipe, then to this pipe by (D/d)^4.
    fluids = pytest.importorskip("fluids")
    text = CASE.replace("{ K = 0.57 }", '{ kind = "reducer", other_diameter = "102.26 mm" }')
    text = text.replace(
        "{ K = 0.366 }", '{ kind = "expander", other_diameter = "154.051 mm", angle = "30 deg" }'
    )
    t = solve(loads(text.encode()))
    sharp = fluids.fittings.contraction_sharp(0.154051, 0.10226, method="Crane")
    cone = fluids.fittings.diffuser_conical(0.10226, 0.154051, angle=30.0, method="Crane")
    assert t.step("pipe.S1.fitting[2].K_small").value == pytest.approx(sharp, rel=1e-12)
    assert t.step("pipe.S1.fitting[2].K").value == pytest.approx(
        sharp * (0.154051 / 0.10226) ** 4, rel=1e-12
    )
    assert t.step("pipe.D1.fitting[1].K_small").value == pytest.approx(cone, rel=1e-12)


def test_hazen_williams_cross_check_and_method():
    # h_f = 10.67 L Q^1.852 / (C^1.852 D^4.8704) (Williams & Hazen; SI form), by hand.
    def hw(L, Q, C, D):
        return 10.67 * L * Q**1.852 / (C**1.852 * D**4.8704)

    text = CASE.replace(
        'roughness = "0.045 mm"\nfittings = [{ K = 0.366 }',
        'roughness = "0.045 mm"\nhazen_williams_c = 130\nfittings = [{ K = 0.366 }',
    )
    t = solve(loads(text.encode()))
    d1 = t.results["pipes"]["D1"]
    assert d1["friction_loss_hazen_williams"]["value"] == pytest.approx(
        hw(150.0, 0.020, 130.0, 0.10226), rel=1e-12
    )
    assert t.step("pipe.D1.friction_loss").function == "losses.darcy_weisbach"
    chosen = solve(
        loads(
            (
                'friction_method = "hazen_williams"\n'
                + text.replace(
                    'roughness = "0.045 mm"\nfittings = [{ K = 0.5',
                    'roughness = "0.045 mm"\nhazen_williams_c = 130\nfittings = [{ K = 0.5',
                )
            ).encode()
        )
    )
    assert chosen.step("pipe.D1.friction_loss").function == "friction.hazen_williams"
    assert chosen.results["pipes"]["D1"]["friction_loss"]["value"] == pytest.approx(
        hw(150.0, 0.020, 130.0, 0.10226), rel=1e-12
    )


def test_speed_range_cases_use_the_affinity_scaled_curve():
    # Computed with fluids 1.3.1 and IAPWS-95 water: at 90 % speed the operating point is
    # 18.0178 L/s, 30.7704 m
    # (design levels; here the range cases run at the level extremes, which equal the design
    # levels because no level range is given).
    text = CASE.replace(
        "efficiency = 0.78\n", 'speed_range = ["2700 rpm", "3000 rpm"]\n'
    ) + _analytic_curve(speed='speed = "3000 rpm"\n')
    t = solve(loads(text.encode()))
    slow = next(c for c in t.cases if c["title"].startswith("Minimum speed"))
    op = t.results["cases"][slow["id"]]["operating_point"]
    assert op["flow"]["value"] == pytest.approx(0.0180178, rel=1e-4)
    assert op["head"]["value"] == pytest.approx(30.7704, rel=1e-4)
    fast = next(c for c in t.cases if c["title"].startswith("Top speed"))
    assert t.results["cases"][fast["id"]]["operating_point"]["flow"]["value"] == pytest.approx(
        t.results["operating_point"]["flow"]["value"], rel=1e-12
    )


def test_pump_efficiency_input_and_curve_efficiency_together():
    # Regression: the curve's efficiency step took the id of the input key pump.efficiency.
    text = CASE + _analytic_curve()
    t = solve(loads(text.encode()))
    assert t.step("pump.operating_efficiency").function == "pump.efficiency_at"
    assert t.results["operating_point"]["efficiency"]["value"] == pytest.approx(0.7772, rel=2e-4)


def test_foot_valve_by_the_crane_friction_factor_multiple():
    # Crane TP-410: K = 75 f_T for a hinged-disc foot valve with strainer (from memory,
    # confirmed in fluids.fittings.K_foot_valve_Crane, fluids 1.3.1); f_T against
    # fluids.friction.ft_Crane (a smooth fit, within 0.1 %).
    fluids = pytest.importorskip("fluids")
    text = CASE.replace('{ K = 0.5, note = "entrance" }', '{ kind = "foot_valve_strainer" }')
    t = solve(loads(text.encode()))
    K = t.step("pipe.S1.fitting[1].K").value
    assert K == pytest.approx(75 * fluids.friction.ft_Crane(0.154051), rel=1e-3)


def test_minimum_lift_speed_by_the_affinity_law():
    # n_lift = n0 sqrt(H_static / H0): 3000 rpm x sqrt(23 m / 42 m) for this system and curve.
    text = CASE.replace(
        "efficiency = 0.78\n", 'speed_range = ["2000 rpm", "3000 rpm"]\n'
    ) + _analytic_curve(speed='speed = "3000 rpm"\n')
    t = solve(loads(text.encode()))
    expected = 3000 / 60 * (23.0 / 42.0) ** 0.5
    assert t.results["minimum_lift_speed"]["value"] == pytest.approx(expected, rel=1e-12)
    # 2000 rpm is below the 2220 rpm that lifts 23 m: no flow at the minimum speed.
    assert next(c for c in t.checks if c.id == "minimum_speed").status == "fail"
    faster = solve(loads(text.replace('"2000 rpm"', '"2400 rpm"').encode()))
    assert next(c for c in faster.checks if c.id == "minimum_speed").status == "pass"


def test_overall_efficiency_basis_never_divides_by_the_motor_efficiency():
    # efficiency_basis = "overall": P_e = rho g Q H / eta_overall, the motor efficiency unused.
    text = CASE.replace("efficiency = 0.78\n", 'efficiency = 0.65\nefficiency_basis = "overall"\n')
    t = solve(loads(text.encode()))
    r = t.results
    assert "shaft_power" not in r
    assert r["electrical_power"]["value"] == pytest.approx(
        r["hydraulic_power"]["value"] / 0.65, rel=1e-14
    )


def test_check_messages_speak_the_report_units():
    # A US report states a failing check in US units: 1 ft/s = 0.3048 m/s exactly
    # (NIST SP 811), so a project limit of "2 ft/s" prints back as 2.00 ft/s.
    text = (EXAMPLES / "process_transfer_us.toml").read_text()
    text += '\n[criteria]\ndischarge_velocity_max = "2 ft/s"\n'
    t = solve(loads(text.encode()))
    check = next(c for c in t.checks if c.id == "velocity_max.D1")
    assert check.status == "fail"
    assert check.message.endswith("exceeds the discharge limit 2.00 ft/s")
    assert "m/s" not in check.message
