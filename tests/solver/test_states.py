"""Every operating state is checked: the duty-profile points are states like the cases.

A variable-speed rising main crosses a crest 4 m above the destination surface. At the
duty flow the friction beyond the crest holds its pressure above atmospheric; at the
least profile flow it does not. Independent values: water from CoolProp (IAPWS-95), the
Darcy friction factor from fluids' Colebrook, and the hand energy balance written out in
each test.
"""

import math

import pytest

from calcreport.model.loader import loads
from calcreport.solver import solve

# Reference libraries of the test extras, used only to compute check values.
CP = pytest.importorskip("CoolProp.CoolProp")
Colebrook = pytest.importorskip("fluids.friction").Colebrook

G = 9.80665
D = 0.15408  # m, NPS 6 Sch 40 (ASME B36.10M)
EPS = 0.045e-3  # m
T = 288.15  # K
RHO = CP.PropsSI("D", "T", T, "P", 101325.0, "Water")
MU = CP.PropsSI("V", "T", T, "P", 101325.0, "Water")
CURVE_FLOWS = [2.0 * i for i in range(21)]  # L/s, 0..40


def _curve_head(q: float) -> float:
    """The pump of this scenario at 2900 rpm: H = 40 - 0.01 q^2 (q in L/s)."""
    return 40.0 - 0.01 * q * q


def _curve_eta(q: float) -> float:
    return max(0.0, 0.8 * (1.0 - ((q - 26.0) / 26.0) ** 2))


CREST_MAIN = f"""
format = 1
[fluid]
temperature = "15 degC"
[duty]
flow = "30 L/s"
[source]
level = "100 m"
[destination]
level = "110 m"
[pump]
elevation = "99 m"
[pump.curve]
speed = "2900 rpm"
flow = {{ unit = "L/s", values = {CURVE_FLOWS} }}
head = {{ unit = "m", values = {[_curve_head(q) for q in CURVE_FLOWS]} }}
efficiency = {[round(_curve_eta(q), 6) for q in CURVE_FLOWS]}
[motor]
efficiency = 0.93
[drive]
efficiency = 0.97
[operation]
control = "CONTROL"
profile = [
  {{ flow = "30 L/s", hours = 3000 }},
  {{ flow = "20 L/s", hours = 3000 }},
  {{ flow = "8 L/s", hours = 2000 }},
]
[[pipe]]
id = "S1"
side = "suction"
length = "5 m"
inner_diameter = "{D * 1e3} mm"
roughness = "0.045 mm"
elevation_start = "99 m"
elevation_end = "99 m"
fittings = [{{ K = 0.5, note = "entrance" }}]
[[pipe]]
id = "D1"
side = "discharge"
length = "600 m"
inner_diameter = "{D * 1e3} mm"
roughness = "0.045 mm"
elevation_start = "99 m"
elevation_end = "114 m"
[[pipe]]
id = "D2"
side = "discharge"
length = "400 m"
inner_diameter = "{D * 1e3} mm"
roughness = "0.045 mm"
elevation_start = "114 m"
elevation_end = "108 m"
fittings = [{{ K = 1.0, note = "exit" }}]
"""


def _solve(control: str = "variable_speed", extra: str = ""):
    return solve(loads((CREST_MAIN.replace("CONTROL", control) + extra).encode()))


def _friction(q: float, length: float) -> tuple[float, float]:
    """Darcy-Weisbach loss [m] and velocity head [m] of a length of this main at q [L/s]."""
    v = q * 1e-3 / (math.pi * D * D / 4)
    f = Colebrook(RHO * v * D / MU, EPS / D)
    hv = v * v / (2 * G)
    return f * length / D * hv, hv


def _system_head(q: float) -> float:
    """Static 10 m, friction over 1005 m, the entrance (K 0.5) and the exit (K 1.0)."""
    h_f, hv = _friction(q, 1005.0)
    return 10.0 + h_f + 1.5 * hv


def _check(t, ident):
    return next(c for c in t.checks if c.id == ident)


def test_profile_points_are_states_with_the_shape_of_a_case():
    t = _solve()
    states = t.results["profile_states"]
    # P2 and P3 would cross the crest below atmospheric: each has its lifted twin (below).
    assert list(states) == ["P1", "P2", "P3", "P2x", "P3x"]
    for key in ("flow", "total_dynamic_head", "npsh_available", "pipes", "operating_point"):
        assert key in states["P3"]
    # Hand check: (n/n0)^2 (40 - 0.01 (q n0/n)^2) = H_system(q), so (n/n0)^2 = (H + 0.01 q^2)/40.
    for pid, q in (("P1", 30.0), ("P2", 20.0), ("P3", 8.0)):
        H = _system_head(q)
        ratio = math.sqrt((H + 0.01 * q * q) / 40.0)
        point = states[pid]["operating_point"]
        assert states[pid]["total_dynamic_head"]["value"] == pytest.approx(H, rel=1e-5)
        # The curve is a monotone cubic through 21 points of the parabola: 1e-4.
        assert point["speed"]["value"] * 60 == pytest.approx(2900 * ratio, rel=1e-4)
        # The BEP (26 L/s on this curve, a curve point) moves with the speed: Q_BEP r.
        assert point["bep_flow"]["value"] == pytest.approx(26e-3 * ratio, rel=1e-4)
        assert point["flow_ratio_bep"]["value"] == pytest.approx(q / (26.0 * ratio), rel=2e-4)


def test_a_slow_profile_point_taking_the_crest_below_atmospheric_fails():
    t = _solve()
    # At the crest (D2 start) the grade line is the destination's plus D2's friction
    # (the exit loss K = 1 spends D2's velocity head): z_d + h_f,D2 - z_crest.
    for pid, q in (("P1", 30.0), ("P3", 8.0)):
        h_f, _ = _friction(q, 400.0)
        expected = 110.0 + h_f - 114.0
        route = t.results["profile_states"][pid]["route"]
        assert route["min_pressure_head"]["value"] == pytest.approx(expected, abs=2e-4)
    assert 110.0 + _friction(30.0, 400.0)[0] - 114.0 > 0.0  # the duty state passes
    low = _check(t, "min_pressure")
    assert low.status == "fail"
    assert low.case == "P3"
    assert "sub-atmospheric" in low.message


def test_the_design_case_alone_would_have_passed():
    """Without the profile the same main passes the lowest-pressure check: the fail above
    comes from the profile point, not from the design case."""
    text = CREST_MAIN.replace("CONTROL", "variable_speed")
    text = text[: text.index("[operation]")] + text[text.index("[[pipe]]") :]
    t = solve(loads(text.encode()))
    assert _check(t, "min_pressure").status != "fail"
    assert "profile_states" not in t.results


def test_operating_region_is_judged_at_each_point_speed():
    t = _solve()
    region = _check(t, "preferred_operating_region")
    ratios = {
        pid: s["operating_point"]["flow_ratio_bep"]["value"]
        for pid, s in t.results["profile_states"].items()
    }
    worst = min(ratios, key=lambda p: min(ratios[p] - 0.7, 1.2 - ratios[p]))
    if min(ratios.values()) < 0.7:
        assert region.status != "pass"
        assert region.case == worst


def test_throttled_point_beyond_the_curve_is_a_failing_state():
    t = _solve("throttled", extra="").results
    assert "P1" in t["profile_states"]
    text = CREST_MAIN.replace("CONTROL", "throttled").replace('flow = "8 L/s"', 'flow = "45 L/s"')
    trace = solve(loads(text.encode()))
    check = next(c for c in trace.checks if c.id == "operating_point")
    assert check.status == "fail"
    assert check.case == "P3"
    assert "outside the pump curve" in check.message
    assert "energy" not in trace.results


def test_on_off_control_has_no_profile_states():
    t = _solve("on_off")
    assert "profile_states" not in t.results


def test_motor_loading_names_the_most_loaded_state():
    t = _solve()
    check = _check(t, "motor_loading")
    loading = t.results["motor"]["loading"]
    assert set(loading) >= {"C1", "P1", "P2", "P3"}
    assert check.case == max(loading, key=lambda k: loading[k]["value"])
    assert check.status == "pass"


def test_a_crest_that_controls_a_state_solves_it_again_lifting_to_the_crest():
    t = _solve()
    states = t.results["profile_states"]
    # P3 would cross the crest below atmospheric: P3x lifts to the crest, held at the
    # atmosphere's pressure, with the losses up to it (S1 with its entrance, all of D1) and
    # the crest's velocity head: 114 - 100 + h_f(605 m) + 0.5 v^2/2g + v^2/2g.
    assert "P3x" in states and "P1x" not in states
    h_f, hv = _friction(8.0, 605.0)
    lifted = states["P3x"]
    assert lifted["total_dynamic_head"]["value"] == pytest.approx(14.0 + h_f + 1.5 * hv, rel=1e-5)
    assert lifted["total_dynamic_head"]["value"] > states["P3"]["total_dynamic_head"]["value"]
    # At the crest the pressure is atmospheric; beyond it the line runs part-full.
    assert lifted["route"]["min_pressure_head"]["value"] == pytest.approx(0.0, abs=1e-9)
    part = [n for n in lifted["profile"]["nodes"] if n.get("part_full")]
    assert part and all(n["pipe"] == "D2" for n in part)
    # The speed lifts the affinity-moved curve to that head, and the energy takes it.
    ratio = math.sqrt((lifted["total_dynamic_head"]["value"] + 0.01 * 64.0) / 40.0)
    assert lifted["operating_point"]["speed"]["value"] * 60 == pytest.approx(2900 * ratio, rel=1e-4)
    row = next(r for r in t.results["energy"]["profile"] if r["point"] == "P3")
    assert row["electrical_power"] == lifted["electrical_power"]
    assert any("P3x" in n and "crest" in n for n in t.notes)


def test_throttled_point_flange_sees_the_pump_head_and_the_line_the_system_head():
    t = _solve("throttled")
    state = t.results["profile_states"]["P3"]
    nodes = {n["name"]: n for n in state["profile"]["nodes"]}
    # The valve just past the pump: the flange at the pump's own head at 8 L/s on its curve,
    # 40 - 0.01 q^2 (a monotone cubic through 21 points of the parabola: 1e-3 m).
    h_f, hv = _friction(8.0, 5.0)
    flange = 100.0 + _curve_head(8.0) - (h_f + 0.5 * hv) - hv - 99.0
    assert nodes["pump discharge flange"]["pressure_head"] == pytest.approx(flange, abs=1e-3)
    assert state["operating_point"]["head"]["value"] == pytest.approx(_curve_head(8.0), abs=1e-3)
    # Past the valve the line carries the system's head: the crest as in the variable-speed
    # state (the same flow and the same system).
    vs = _solve().results["profile_states"]["P3"]["route"]["min_pressure_head"]["value"]
    assert state["route"]["min_pressure_head"]["value"] == pytest.approx(vs, rel=1e-9)
    assert any("throttling valve is taken just downstream" in a["text"] for a in t.assumptions)


def test_a_drooping_curve_is_judged_at_the_highest_static_head_of_any_case():
    """The drooping curve of tests/test_route.py (42 m at shutoff, 42.5 m at its peak) against
    23 m of static head in the design case passes; a destination range reaching 43 m of static
    head in another case exceeds the shutoff head there: a review naming that case."""
    from tests.solver.test_route import CURVE, QUIET, ROUTE

    base = ROUTE.replace("CREST", "26.0")
    design_only = solve(loads((base + CURVE + QUIET).encode()))
    assert _check(design_only, "curve_stability").status == "pass"
    text = base.replace(
        '[destination]\nlevel = "25.0 m"', '[destination]\nlevel = "25.0 m"\nlevel_high = "45.0 m"'
    )
    ranged = solve(loads((text + CURVE + QUIET).encode()))
    check = _check(ranged, "curve_stability")
    assert check.status == "review" and check.case == "C2"
    assert "static head exceeds the shutoff head" in check.message
