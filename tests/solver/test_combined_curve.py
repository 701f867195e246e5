"""The running pumps' combined curve in the trace: what the charts draw with several pumps.

Identical pumps in parallel add their flows at equal head; in series they add their heads at
equal flow (Karassik, Pump Handbook, 4th ed., 2008). The trace carries that curve, and the
operating region at its scale, so the charts need compute nothing.
"""

from __future__ import annotations

from typing import Any

import numpy as np
import pytest

from calcreport.model.loader import loads
from calcreport.solver import solve
from tests.solver.test_calc import CASE, _analytic_curve


def _pumps(pump: str, destination: str = "25.0 m", flow: str = "35 L/s") -> dict[str, Any]:
    """The check case with ``pump`` lines in [pump], on its analytic curve, solved."""
    text = CASE.replace("efficiency = 0.78\n", pump) + _analytic_curve()
    text = text.replace('level = "25.0 m"', f'level = "{destination}"')
    text = text.replace('flow = "20 L/s"', f'flow = "{flow}"')
    text = text.replace('flow_range = ["0 L/s", "30 L/s"]', "")
    return solve(loads(text.encode())).results


@pytest.fixture(scope="module")
def parallel() -> dict[str, Any]:
    return _pumps("count = 3\nstandby = 1\n", flow="40 L/s")


@pytest.fixture(scope="module")
def series() -> dict[str, Any]:
    return _pumps('count = 2\narrangement = "series"\n', destination="60.0 m", flow="20 L/s")


def _values(q: dict[str, Any]) -> np.ndarray:
    return np.asarray(q["value"], dtype=float)


def test_parallel_combined_curve_is_the_duty_pumps_flows_added_at_equal_head(parallel):
    one, combined = parallel["pump_curve"], parallel["pump_curve"]["combined"]
    assert combined["pumps"] == 2 and combined["arrangement"] == "parallel"  # 3 less 1 standby
    assert _values(combined["flow"]) == pytest.approx(2 * _values(one["flow"]), rel=1e-15)
    assert _values(combined["head"]).tolist() == _values(one["head"]).tolist()
    assert combined["flow"]["unit"] == "m^3/s" and combined["head"]["unit"] == "m"


def test_series_combined_curve_is_the_pumps_heads_added_at_equal_flow(series):
    one, combined = series["pump_curve"], series["pump_curve"]["combined"]
    assert combined["pumps"] == 2 and combined["arrangement"] == "series"
    assert _values(combined["flow"]).tolist() == _values(one["flow"]).tolist()
    assert _values(combined["head"]) == pytest.approx(2 * _values(one["head"]), rel=1e-15)


@pytest.mark.parametrize("which", ["parallel", "series"])
def test_operating_point_lies_on_the_combined_curve_and_on_the_system_curve(request, which):
    r = request.getfixturevalue(which)
    op, combined, system = r["operating_point"], r["pump_curve"]["combined"], r["system_curve"]
    q, h = op["flow"]["value"], op["head"]["value"]
    # Straight lines between the curve points, as the chart draws them: the pump's points are
    # 0.5 L/s apart on a parabola (error under 2 mm), the system curve's 61 points about
    # 1.3 L/s apart (error about 1 cm).
    assert np.interp(q, _values(combined["flow"]), _values(combined["head"])) == pytest.approx(
        h, abs=2e-3
    )
    assert np.interp(q, _values(system["flow"]), _values(system["head"])) == pytest.approx(
        h, abs=2e-2
    )
    assert op["pumps_running"]["value"] == combined["pumps"]


def test_system_curve_runs_on_to_the_end_of_the_combined_curve(parallel):
    # The curve of the pumps is drawn to its end; the system curve reaches as far.
    end = parallel["pump_curve"]["combined"]["flow"]["value"][-1]
    assert end == pytest.approx(0.080)  # 2 pumps x 40 L/s, the curve's last point
    assert parallel["system_curve"]["flow"]["value"][-1] == pytest.approx(end, rel=1e-12)


def test_operating_region_is_given_at_the_total_flow_of_the_running_pumps(parallel, series):
    region = parallel["operating_region"]
    total = region["combined"]
    assert total["pumps"] == 2 and total["arrangement"] == "parallel"
    assert total["bep_flow"]["value"] == pytest.approx(2 * region["bep_flow"]["value"])
    assert [q["value"] for q in total["preferred"]] == pytest.approx(
        [2 * q["value"] for q in region["preferred"]]
    )
    assert region["bep_flow"]["value"] == pytest.approx(0.022, rel=1e-3)  # the curve's own BEP
    # In series each pump carries the whole flow: the region's flows are the pump's.
    region = series["operating_region"]
    for key in ("bep_flow", "preferred"):
        assert series["operating_region"]["combined"][key] == _unbound(region[key])


def _unbound(q: Any) -> Any:
    """A bound result as a plain quantity (the combined values name no step)."""
    if isinstance(q, list):
        return [_unbound(x) for x in q]
    return {"value": q["value"], "unit": q["unit"]}


def test_each_case_carries_the_curve_of_its_own_pumps_running(parallel):
    cases = parallel["cases"]
    running = {cid: c["pumps_running"]["value"] for cid, c in cases.items()}
    every = next(cid for cid, n in running.items() if n == 3)
    combined = cases[every]["pump_curve"]["combined"]
    assert combined["pumps"] == 3
    op = cases[every]["operating_point"]
    assert np.interp(
        op["flow"]["value"], _values(combined["flow"]), _values(combined["head"])
    ) == pytest.approx(op["head"]["value"], abs=2e-3)
    alone = next(cid for cid, n in running.items() if n == 1)
    assert "combined" not in cases[alone]["pump_curve"]  # one pump: its own curve


def test_a_single_pump_trace_has_no_combined_curve():
    r = solve(loads((CASE.replace("efficiency = 0.78\n", "") + _analytic_curve()).encode()))
    assert "combined" not in r.results["pump_curve"]
    assert "combined" not in r.results["operating_region"]
