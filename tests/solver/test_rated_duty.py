"""The rated duty: the pump data sheet's point and the motor's, from the solved states.

Independent values are those of the end-to-end check case (test_calc), computed with
fluids 1.3.1 (Colebrook) and IAPWS-95 water: the system needs 32.4977 m at the required
20 L/s, and 15 L/s needs 28.4685 m; the pump is H = 42 + 0.2q - 0.02q^2 (q in L/s) at
2900 rpm, moved in speed by the affinity laws (Q ∝ n, H ∝ n^2).
"""

import math

import pytest

from calcreport.model.loader import loads
from calcreport.recheck import recheck
from calcreport.solver import solve
from tests.solver.test_calc import CASE, _analytic_curve
from tests.solver.test_energy import PROFILE, _solve

SYSTEM_AT_DUTY = 32.4977  # m at 20 L/s, fluids 1.3.1 + IAPWS-95 (test_calc)


def _speed_ratio(q: float, H: float) -> float:
    """n/n0 where (n/n0)^2 H0(q n0/n) = H on the quadratic curve (the affinity laws):
    42 r^2 + 0.2 q r - (0.02 q^2 + H) = 0."""
    return (-0.2 * q + math.sqrt((0.2 * q) ** 2 + 4 * 42 * (0.02 * q * q + H))) / (2 * 42)


def test_variable_speed_rated_duty_is_the_profile_point_at_the_required_flow():
    t = _solve("variable_speed")  # the profile holds 20 L/s as its third point
    rated = t.results["rated_duty"]
    assert rated["state"] == "P3" and rated["duty"]["state"] == "P3"
    duty = rated["duty"]
    assert duty["flow"]["value"] == pytest.approx(0.020, rel=1e-12)
    assert duty["total_dynamic_head"]["value"] == pytest.approx(SYSTEM_AT_DUTY, rel=2e-5)
    r = _speed_ratio(20.0, SYSTEM_AT_DUTY)
    assert duty["speed"]["value"] * 60 == pytest.approx(2900 * r, rel=1e-4)
    assert duty["speed"]["from"] == "P3.pump.speed"
    # The top speed is the curve's (no speed range): the design case runs out there.
    top = rated["top"]
    assert top["state"] == "C1" and top["speed"]["value"] * 60 == pytest.approx(2900)
    assert top["flow"]["value"] > duty["flow"]["value"]
    assert duty["shaft_power"]["value"] < top["shaft_power"]["value"]


def test_variable_speed_without_the_duty_on_the_profile_solves_and_checks_state_R():
    t = _solve("variable_speed", [(10.0, 2000.0), (15.0, 3000.0)])
    rated = t.results["rated_duty"]
    assert rated["state"] == "R"
    assert "R" in t.results["profile_states"]
    r = _speed_ratio(20.0, SYSTEM_AT_DUTY)
    assert rated["duty"]["speed"]["value"] * 60 == pytest.approx(2900 * r, rel=1e-4)
    assert rated["duty"]["speed"]["from"] == "R.pump.speed"
    # A state the pump runs in: the motor's loading and the checks see it.
    assert "R" in t.results["motor"]["loading"]
    assert any(s.id.startswith("R.") for s in t.steps)
    assert recheck(t.to_json()).ok


def test_fixed_speed_rated_duty_is_the_required_flow_on_the_system_curve():
    text = CASE.replace("efficiency = 0.78\n", "") + _analytic_curve(speed='speed = "2900 rpm"\n')
    t = solve(loads(text.encode()))
    rated = t.results["rated_duty"]
    assert rated["state"] == "R" and "R" not in t.results.get("profile_states", {})
    duty, top = rated["duty"], rated["top"]
    assert duty["total_dynamic_head"]["value"] == pytest.approx(SYSTEM_AT_DUTY, rel=2e-5)
    assert duty["total_dynamic_head"]["from"] == "R.system.total_dynamic_head"
    # Operating point 23.3282 L/s, 35.7815 m (test_calc, fluids 1.3.1 + IAPWS-95).
    assert top["flow"]["value"] * 1e3 == pytest.approx(23.3282, rel=1e-4)
    assert top["head"]["value"] == pytest.approx(35.7815, rel=1e-4)
    assert duty["speed"]["value"] * 60 == pytest.approx(2900)
    # The pump's own values belong to where it runs, not to the data sheet's point.
    assert "efficiency" not in duty and "efficiency" in top
    assert rated["motor_rated_power"]["from"] == "motor.rated_power"
    assert set(rated["governing"]) >= {"npsh_available", "motor_non_overloading", "duty_flow"}
    for check_id, state in rated["governing"].items():
        assert any(c.id == check_id and c.case == state for c in t.checks)
    assert recheck(t.to_json()).ok


def test_preliminary_rated_duty_is_the_design_case_with_the_assumed_efficiency():
    t = solve(loads(CASE.encode()))
    rated = t.results["rated_duty"]
    assert rated["state"] == "C1" and "top" not in rated
    assert rated["duty"]["efficiency"]["value"] == 0.78
    assert rated["duty"]["total_dynamic_head"]["from"] == "system.total_dynamic_head"
    assert rated["npsh_margin_asked"]["ratio"]["value"] >= 1.0


def test_parallel_rated_duty_gives_each_pump_its_share():
    text = (
        CASE.replace("efficiency = 0.78\n", "count = 2\n")
        .replace('flow = "20 L/s"', 'flow = "40 L/s"')
        .replace('flow_range = ["0 L/s", "30 L/s"]', "")
    )
    t = solve(loads((text + _analytic_curve(speed='speed = "2900 rpm"\n')).encode()))
    rated = t.results["rated_duty"]
    assert rated["arrangement"] == "parallel" and rated["pumps_running"]["value"] == 2
    top = rated["top"]
    assert top["flow_per_pump"]["value"] == pytest.approx(top["flow"]["value"] / 2, rel=1e-12)


def test_design_speed_column_is_the_speed_the_design_case_runs_at():
    # With a speed range the design case runs at the curve's 2900 rpm; the range's top,
    # 3000 rpm, is a case of its own: the column must not name it for the design case.
    points = ", ".join(f'{{ flow = "{q} L/s", hours = {h} }}' for q, h in PROFILE)
    source = CASE.replace(
        "efficiency = 0.78\n", 'speed_range = ["2000 rpm", "3000 rpm"]\n'
    ).replace("hours_per_year = 6000\n", f'control = "variable_speed"\nprofile = [{points}]\n')
    ranged = solve(loads((source + _analytic_curve(speed='speed = "2900 rpm"\n')).encode()))
    top = ranged.results["rated_duty"]["top"]
    assert top["speed"]["value"] * 60 == pytest.approx(2900)
    assert top["flow"] == ranged.results["operating_point"]["flow"]
