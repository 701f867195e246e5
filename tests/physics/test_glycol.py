"""Aqueous glycol properties and the Raoult vapour pressure."""

import pytest

from calcreport.model.loader import loads
from calcreport.physics import glycol, water
from calcreport.solver import solve

pytest.importorskip("CoolProp")


@pytest.mark.parametrize(
    ("func", "T", "rho", "mu"),
    # 30 % by mass, computed with CoolProp 8.0.0 INCOMP (MEG, MPG); a second published
    # data set differs by up to 0.7 % (density) and 3 % (viscosity), hence 1 % / 5 %.
    [
        ("ethylene", 278.15, 1043.47, 3.5592e-3),
        ("propylene", 278.15, 1029.89, 5.5694e-3),
        ("ethylene", 293.15, 1038.05, 2.1664e-3),
        ("propylene", 293.15, 1023.78, 2.9650e-3),
    ],
)
def test_density_and_viscosity(func, T, rho, mu):
    density = getattr(glycol, f"{func}_glycol_density")
    viscosity = getattr(glycol, f"{func}_glycol_viscosity")
    assert density(T, 0.3) == pytest.approx(rho, rel=0.01)
    assert viscosity(T, 0.3) == pytest.approx(mu, rel=0.05)
    # and to the digits listed above, since this is the same formulation
    assert density(T, 0.3) == pytest.approx(rho, abs=0.006)


def test_raoult_vapor_pressure_by_hand():
    # x_w = (0.7/18.015) / (0.7/18.015 + 0.3/62.068) for 30 % ethylene glycol; p_sat,water
    # at 20 degC from IAPWS-IF97 (2339.2 Pa, computed with iapws 1.5.5).
    x_w = (0.7 / 18.015) / (0.7 / 18.015 + 0.3 / 62.068)
    expected = x_w * water.saturation_pressure(293.15)
    assert glycol.raoult_vapor_pressure(293.15, 0.3, 62.068) == pytest.approx(expected, rel=1e-14)
    assert 0.88 < x_w < 0.90


def test_glycol_solution_solves_with_its_own_properties():
    text = """
format = 1
[fluid]
kind = "propylene_glycol"
mass_fraction = "30 %"
temperature = "5 degC"
[duty]
flow = "20 L/s"
[source]
level = "2.0 m"
[destination]
level = "25.0 m"
[pump]
elevation = "0 m"
efficiency = 0.75
[[pipe]]
id = "D1"
side = "discharge"
length = "150 m"
inner_diameter = "102.26 mm"
roughness = "0.045 mm"
fittings = [{ kind = "exit" }]
"""
    t = solve(loads(text.encode()))
    rho = t.results["fluid"]["density"]["value"]
    assert rho == pytest.approx(1029.89, rel=1e-5)
    assert t.step("fluid.viscosity").function == "glycol.propylene_glycol_viscosity"
    assert any("Raoult" in a["text"] for a in t.assumptions)


def test_glycol_fraction_out_of_range_is_an_input_problem():
    from calcreport.errors import InputError

    text = (
        'format = 1\n[fluid]\nkind = "ethylene_glycol"\nmass_fraction = 0.8\n'
        'temperature = "5 degC"\n'
    )
    with pytest.raises(InputError, match=r"fluid\.mass_fraction"):
        loads(text.encode())
