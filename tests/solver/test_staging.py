"""Staging of parallel pumps over a duty profile: at each point the count of duty pumps of
least electrical input power with each pump within its operating-region limits, solved and
checked as a state of its own, and the annual energy of that way of running against the
design's fixed count.

The system is the end-to-end check case of test_calc with its discharge main as wide as its
suction (154.051 mm), so that two of its pumps in parallel serve 40 L/s. Independent values:
water from IAPWS-97 (iapws), the Darcy friction factor from fluids' Colebrook; the pump
H = 42 + 0.2q − 0.02q², η = 0.78[1 − ((q − 22)/22)²] (q in L/s, at 2900 rpm, the top
speed: no speed range), moved in speed by the affinity laws (Q ∝ n, H ∝ n², efficiency
unchanged at corresponding points) and identical pumps in parallel sharing the flow at equal
head (Karassik, Pump Handbook, 4th ed., 2008); energy as Σ P·t (Hydraulic Institute,
Europump and US DOE, Variable Speed Pumping, 2004).
"""

from __future__ import annotations

import math
from typing import Any

import pytest

from calcreport import checks
from calcreport.model.loader import loads
from calcreport.recheck import recheck
from calcreport.solver import solve
from tests.solver.test_calc import CASE, _analytic_curve

G = 9.80665
D = 0.154051  # m, both pipes
ETA_M = 0.92  # the case's motor efficiency; no drive (efficiency 1)
PROFILE = [(18.0, 3000.0), (30.0, 2500.0), (40.0, 1500.0)]  # L/s, hours a year
WIDE = "preferred_range = [0.5, 1.3]\n"  # pump data of this test (not a published region)


def text(
    control: str = "variable_speed",
    profile: list[tuple[float, float]] = PROFILE,
    pump: str = "count = 2\n" + WIDE,
) -> str:
    """The check case with ``pump`` lines in [pump], a wide discharge main, 40 L/s required
    and ``profile`` under ``control``, on its analytic curve."""
    points = ", ".join(f'{{ flow = "{q} L/s", hours = {h} }}' for q, h in profile)
    model = (
        CASE.replace("efficiency = 0.78\n", pump)
        .replace('inner_diameter = "102.26 mm"', f'inner_diameter = "{D * 1e3} mm"')
        .replace('flow = "20 L/s"', 'flow = "40 L/s"')
        .replace('flow_range = ["0 L/s", "30 L/s"]\n', "")
        .replace("hours_per_year = 6000\n", f'control = "{control}"\nprofile = [{points}]\n')
    )
    return model + _analytic_curve(speed='speed = "2900 rpm"\n')


def _solve(*args: Any, **kwargs: Any):
    return solve(loads(text(*args, **kwargs).encode()))


@pytest.fixture(scope="module")
def staged():
    return _solve()


def _water() -> tuple[float, float]:
    iapws = pytest.importorskip("iapws")
    w = iapws.IAPWS97(T=293.15, P=0.101325)
    return w.rho, w.mu


def _system_head(q: float) -> float:
    """The system's head [m] at q [L/s]: static 23 m, friction and K over both pipes
    (S1 10 m with K 1.07, D1 150 m with K 4.366, the exit's included)."""
    colebrook = pytest.importorskip("fluids.friction").Colebrook
    rho, mu = _water()
    v = q * 1e-3 / (math.pi * D * D / 4)
    f = colebrook(rho * v * D / mu, 0.045e-3 / D)
    return 23.0 + sum((f * L / D + K) * v * v / (2 * G) for L, K in ((10.0, 1.07), (150.0, 4.366)))


def _head(q: float) -> float:
    return 42 + 0.2 * q - 0.02 * q * q


def _eta(q: float) -> float:
    return 0.78 * (1 - ((q - 22) / 22) ** 2)


def _variable_speed(q: float, k: int) -> tuple[float, float, float]:
    """k pumps at q [L/s] together on the system: each pump's speed ratio n/n0, its flow at
    the curve's speed [L/s] and the electrical input power [W]. (n/n0)² H0(q1 n0/n) = H with
    q1 = q/k: 42 r² + 0.2 q1 r − (0.02 q1² + H) = 0."""
    rho, _ = _water()
    H = _system_head(q)
    q1 = q / k
    r = (-0.2 * q1 + math.sqrt((0.2 * q1) ** 2 + 4 * 42 * (0.02 * q1 * q1 + H))) / (2 * 42)
    q0 = q1 / r
    return r, q0, rho * G * q * 1e-3 * H / (_eta(q0) * ETA_M)


def _point(t, pid: str) -> dict[str, Any]:
    return next(p for p in t.results["staging"]["points"] if p["point"] == pid)


def test_one_pump_serves_the_low_flow_for_less_power_than_two(staged):
    # At 18 L/s both counts meet the system within 0.5–1.3 Q_BEP (BEP 22 L/s, the maximum of
    # the efficiency parabola); one pump nearer its BEP takes less power.
    powers = {}
    for k in (1, 2):
        r, q0, powers[k] = _variable_speed(18.0, k)
        assert r <= 1.0 and 0.5 <= q0 / 22.0 <= 1.3
    assert powers[1] < powers[2]
    p1 = _point(staged, "P1")
    assert p1["feasible"] == [1, 2]
    assert p1["pumps"] == 1 and p1["pumps_fixed"] == 2 and p1["state"] == "P1s"
    assert p1["electrical_power"]["staged"]["value"] == pytest.approx(powers[1], rel=3e-4)
    assert p1["electrical_power"]["fixed"]["value"] == pytest.approx(powers[2], rel=3e-4)
    assert p1["electrical_power"]["staged"]["from"] == "P1s.power.electrical"
    assert p1["electrical_power"]["fixed"]["from"] == "P1.power.electrical"
    # The staged state runs one pump at the speed the affinity laws give.
    state = staged.results["profile_states"]["P1s"]
    assert state["pumps_running"] == {
        "value": 1.0,
        "unit": "",
        "from": "P1s.solver.pumps_running",
    }
    r, _, _ = _variable_speed(18.0, 1)
    assert state["operating_point"]["speed"]["value"] * 60 == pytest.approx(2900 * r, rel=1e-4)


def test_only_both_pumps_serve_the_high_flows(staged):
    # At 30 L/s one pump would run at Q/Q_BEP beyond 1.3; at 40 L/s it would need more than
    # the top speed (the curve's 2900 rpm).
    _, q0, _ = _variable_speed(30.0, 1)
    assert q0 / 22.0 > 1.3
    assert _variable_speed(40.0, 1)[0] > 1.0
    for pid, why in (("P2", "outside the preferred region"), ("P3", "more than the top speed")):
        p = _point(staged, pid)
        assert p["feasible"] == [2] and p["pumps"] == 2 and p["state"] == pid
        one = p["screened"][0]
        assert one["pumps"] == 1 and not one["feasible"] and why in one["reason"]
        assert p["electrical_power"]["staged"] == p["electrical_power"]["fixed"]
    assert "P2s" not in staged.results["profile_states"]


def test_the_saving_is_the_power_difference_over_the_hours(staged):
    s = staged.results["staging"]
    # Σ (P_fixed − P_staged) × hours from the trace's own point powers.
    saving = sum(
        (p["electrical_power"]["fixed"]["value"] - p["electrical_power"]["staged"]["value"])
        * p["hours"]
        * 3600.0
        for p in s["points"]
    )
    assert saving > 0.0
    assert s["saving"]["value"] == pytest.approx(saving, rel=1e-12)
    assert s["saving"]["from"] == "energy.staging.saving"
    assert s["energy_fixed"] == staged.results["energy"]["annual_energy"]
    assert s["energy_staged"]["value"] == pytest.approx(
        s["energy_fixed"]["value"] - saving, rel=1e-12
    )
    # Priced at the case's 0.10 USD/kWh.
    assert s["cost_saving"]["value"] == pytest.approx(saving / 3.6e6 * 0.10, rel=1e-12)
    assert s["cost_saving"]["unit"] == "USD"
    assert s["cost_fixed"]["from"] == "energy.annual_cost"


def test_every_staged_state_is_checked(monkeypatch):
    evaluated: dict[str, list] = {}
    evaluate = checks.evaluate

    def recording(model, results, case):
        evaluated[case] = found = evaluate(model, results, case)
        return found

    monkeypatch.setattr(checks, "evaluate", recording)
    t = _solve()
    assert "P1s" in evaluated
    governing = {c.id: c for c in t.checks}
    severity = {"fail": 0, "review": 1, "pass": 2}
    for own in evaluated["P1s"]:
        held = governing[own.id]  # the one kept of that id governs the staged state's
        assert severity[held.status] <= severity[own.status], own.id
        if held.status == own.status and None not in (held.margin, own.margin):
            assert held.margin <= own.margin, own.id
    assert "P1s" in t.results["motor"]["loading"]
    assert {"P1", "P2", "P3"} <= set(evaluated)
    staging = [c for c in t.checks if c.id == "staging_feasible"]
    assert len(staging) == 1 and staging[0].status == "pass"


def test_the_trace_rechecks(staged):
    report = recheck(staged.to_json())
    assert report.ok, (report.mismatches, report.bound)
    ids = {s.id for s in staged.steps}
    assert {"energy.staging.annual", "energy.staging.saving", "energy.staging.cost"} <= ids
    assert "P1s.power.electrical" in ids and "P2s.power.electrical" not in ids


def test_a_point_no_count_serves_within_the_limits_is_reported():
    # At 8 L/s with the default preferred region, 0.7–1.2 Q_BEP (ANSI/HI 9.6.3, through the
    # criteria's secondary source): one pump runs at Q/Q_BEP below 0.7, two lower still.
    for k in (1, 2):
        assert _variable_speed(8.0, k)[1] / 22.0 < 0.7
    t = _solve(profile=[(8.0, 1000.0), *PROFILE], pump="count = 2\n")
    p = _point(t, "P1")
    assert p["feasible"] == [] and p["pumps"] == 2 and p["state"] == "P1"
    assert t.results["staging"]["unstaged"] == ["P1"]
    check = next(c for c in t.checks if c.id == "staging_feasible")
    assert check.status == "review" and check.case == "P1" and "P1" in check.message
    assert any("Staging" in n and "P1" in n for n in t.notes)
    assert recheck(t.to_json()).ok


def test_throttled_pumps_are_staged_on_their_fixed_speed_curve():
    # At 18 L/s one pump at its curve's 18 L/s, or two at 9 L/s each, throttled to the
    # system: power ρ g Q H(q1) / (η(q1) η_m), each pump's head above the system's.
    rho, _ = _water()
    t = _solve("throttled", pump="count = 2\npreferred_range = [0.4, 1.3]\n")
    p = _point(t, "P1")
    assert _head(9.0) > _head(18.0) > _system_head(18.0)
    assert p["feasible"] == [1, 2] and p["pumps"] == 1
    one = rho * G * 0.018 * _head(18.0) / (_eta(18.0) * ETA_M)
    two = rho * G * 0.018 * _head(9.0) / (_eta(9.0) * ETA_M)
    # The curve is a monotone cubic through points 0.5 L/s apart: 1e-4.
    assert p["electrical_power"]["staged"]["value"] == pytest.approx(one, rel=1e-4)
    assert p["electrical_power"]["fixed"]["value"] == pytest.approx(two, rel=1e-4)
    assert recheck(t.to_json()).ok


def test_a_standby_pump_is_not_staged():
    t = _solve(pump="count = 3\nstandby = 1\n" + WIDE)
    s = t.results["staging"]
    assert s["pumps_available"]["value"] == 2 and s["pumps_available"]["from"] == "pump.duty_pumps"
    assert [c["pumps"] for c in s["points"][0]["screened"]] == [1, 2]


@pytest.mark.parametrize(
    ("control", "pump"),
    [
        ("variable_speed", ""),  # one pump
        ("variable_speed", 'count = 2\narrangement = "series"\n'),
        ("on_off", "count = 2\n"),
    ],
)
def test_no_staging_where_it_does_not_apply(control, pump):
    t = _solve(control, pump=pump)
    assert "staging" not in t.results
    assert not any(s.id.startswith("energy.staging.") for s in t.steps)
    assert not any(c.id == "staging_feasible" for c in t.checks)
