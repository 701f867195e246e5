"""Darby's three-K method: the catalog against fluids' transcription, and its use."""

import pytest

from calcreport import catalog
from calcreport.errors import InputError
from calcreport.model.loader import loads
from calcreport.physics import fittings
from calcreport.solver import solve
from tests.solver.test_calc import CASE

fluids = pytest.importorskip("fluids")

# Our kinds and the rows of Darby (1999) Table 1 as fluids 1.3.1 names them.
ROWS = {
    "elbow_90_standard": "Elbow, 90°, flanged, welded, bends, (r/D = 1)",
    "elbow_90_standard_threaded": "Elbow, 90°, threaded, standard, (r/D = 1)",
    "elbow_90_long_radius": "Elbow, 90°, threaded, long radius, (r/D = 1.5)",
    "elbow_45_standard": "Elbow, 45°, threaded standard, (r/D = 1)",
    "elbow_45_long_radius": "Elbow, 45°, long radius, (r/D = 1.5)",
    "bend_180_standard": "Elbow, 180°, flanged, (r/D = 1)",
    "tee_run": "Tee, Run-through, flanged, (r/D = 1)",
    "tee_branch": "Tee, Through-branch, (as elbow), flanged, (r/D = 1)",
    "gate_valve": "Valve, Gate valve, standard, β = 1",
    "ball_valve": "Valve, Ball valve, standard, β = 1",
    "globe_valve": "Valve, Globe valve, standard, β = 1",
    "angle_valve": "Valve, Angle valve, 90°, full line size, β = 1",
    "swing_check_valve": "Valve, Swing check",
    "lift_check_valve": "Valve, Lift check",
}


def test_every_row_agrees_with_fluids_transcription():
    table = catalog.fittings_three_k()
    assert set(table) == set(ROWS)
    for kind, name in ROWS.items():
        row = table[kind]
        assert (row["K1"], row["Ki"], row["Kd"]) == fluids.fittings.Darby[name], kind


@pytest.mark.parametrize("kind", sorted(ROWS))
@pytest.mark.parametrize("Re", [5e2, 1e4, 1e6])
@pytest.mark.parametrize("size_in", [0.5, 2.0, 8.0, 24.0])
def test_three_k_equals_fluids_darby3k(kind, Re, size_in):
    row = catalog.fittings_three_k()[kind]
    K = fittings.three_k(row["K1"], row["Ki"], row["Kd"], Re, size_in * 0.0254)
    assert K == pytest.approx(fluids.fittings.Darby3K(NPS=size_in, Re=Re, name=ROWS[kind]))


def test_project_method_three_k_in_a_solve():
    text = 'fittings_method = "three_k"\n' + CASE.replace(
        "{ K = 3.0, count = 1 }", '{ kind = "swing_check_valve" }'
    )
    t = solve(loads(text.encode()))
    step = t.step("pipe.D1.fitting[2].K")
    assert step.function == "fittings.three_k"
    Re = t.results["pipes"]["D1"]["reynolds"]["value"]
    expected = fluids.fittings.Darby3K(NPS=0.10226 / 0.0254, Re=Re, name="Valve, Swing check")
    assert step.value == pytest.approx(expected, rel=1e-12)


def test_kind_without_three_k_constants_is_refused():
    text = 'fittings_method = "three_k"\n' + CASE.replace(
        "{ K = 3.0, count = 1 }", '{ kind = "butterfly_valve" }'
    )
    with pytest.raises(InputError) as err:
        loads(text.encode())
    problem = err.value.problems[0]
    assert problem.key == "pipe[2].fittings[2].kind" and "three-K" in problem.message
