"""Other liquids (CoolProp) against handbook values, and their use in a solve."""

import pytest

from calcreport.errors import InputError
from calcreport.model.loader import loads
from calcreport.physics import liquids
from calcreport.solver import solve
from tests.solver.test_calc import CASE

pytest.importorskip("CoolProp")

T25 = 298.15
ATM = 101325.0

# Liquids at 25 degC and 1 atm: density kg/m^3, viscosity mPa s, vapour pressure kPa.
# CRC Handbook of Chemistry and Physics, tables of liquid density, viscosity and vapour
# pressure of organic compounds (values from memory, not looked up): tolerances 0.3 %
# on density, 3 % on viscosity and vapour pressure.
HANDBOOK = {
    "methanol": (786.6, 0.544, 16.9),
    "ethanol": (785.1, 1.074, 7.87),
    "toluene": (862.3, 0.560, 3.79),
    "benzene": (873.6, 0.604, 12.7),
    "n_hexane": (655.0, 0.300, 20.2),
    "n_heptane": (679.5, 0.387, 6.09),
}


@pytest.mark.parametrize("kind", sorted(HANDBOOK))
def test_pure_liquids_against_handbook(kind):
    rho, mu, p_v = HANDBOOK[kind]
    f = liquids.property_function
    assert f(kind, "density")(T25, ATM) == pytest.approx(rho, rel=3e-3)
    assert f(kind, "viscosity")(T25, ATM) * 1e3 == pytest.approx(mu, rel=3e-2)
    assert f(kind, "vapor_pressure")(T25) / 1e3 == pytest.approx(p_v, rel=3e-2)


def test_seawater_against_the_review():
    # Sharqawy, Lienhard & Zubair (2010), seawater of salinity 35 g/kg at 25 degC:
    # density 1023.3 kg/m^3, viscosity 0.96 mPa s (values from memory of its tables).
    f = liquids.property_function
    assert f("seawater", "density")(T25, 0.035) == pytest.approx(1023.3, rel=1e-3)
    assert f("seawater", "viscosity")(T25, 0.035) * 1e3 == pytest.approx(0.96, rel=2e-2)


def test_methanol_transfer_solves_with_its_own_properties():
    text = CASE.replace(
        '[fluid]\ntemperature = "20 degC"', '[fluid]\nkind = "methanol"\ntemperature = "25 degC"'
    )
    t = solve(loads(text.encode()))
    fluid = t.results["fluid"]
    assert fluid["density"]["value"] == pytest.approx(786.6, rel=3e-3)
    assert t.step("fluid.density").function == "liquids.methanol_density"
    assert t.step("fluid.vapor_pressure").function == "liquids.methanol_vapor_pressure"
    # NPSH available drops by the vapour pressure head of methanol (16.9 kPa at 25 degC).
    rho = fluid["density"]["value"]
    npsha = t.results["npsh_available"]["value"]
    expected = (101325.0 - fluid["vapor_pressure"]["value"]) / (rho * 9.80665) + 2.0
    assert npsha == pytest.approx(expected - t.results["suction_loss"]["value"], rel=1e-12)


def test_seawater_needs_its_salinity_and_liquid_ranges_are_checked():
    text = CASE.replace("[fluid]\n", '[fluid]\nkind = "seawater"\n')
    with pytest.raises(InputError) as err:
        loads(text.encode())
    assert "fluid.mass_fraction" in {p.key for p in err.value.problems}
    text = CASE.replace(
        '[fluid]\ntemperature = "20 degC"', '[fluid]\nkind = "benzene"\ntemperature = "2 degC"'
    )
    with pytest.raises(InputError) as err:
        loads(text.encode())
    assert "fluid.temperature" in {p.key for p in err.value.problems}
