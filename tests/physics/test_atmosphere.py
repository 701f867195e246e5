"""Tests of calcreport.physics.atmosphere against the US Standard Atmosphere 1976.

Labels beside each check value: [V] computed with a reference library,
[S] seen in a published table, [M] from memory not confirmed, [M✓] from
memory and reproduced by a library.
"""

from __future__ import annotations

import itertools
import math

import pytest

from calcreport.physics import atmosphere, equation

R0 = 6356766.0  # [m], US Standard Atmosphere 1976


def _geometric(H: float) -> float:
    """Geometric elevation of a geopotential height (inverse of H = r0 z/(r0 + z))."""
    return R0 * H / (R0 - H)


def _fmt(x: float) -> str:
    # Stand-in for the trace's number formatter: five significant digits.
    return f"{x:.5g}"


@pytest.mark.parametrize(
    ("z", "p"),
    [
        (0.0, 101325.0),  # fluids 1.3.1 ATMOSPHERE_1976(0).P, rounded to 0.1 Pa [V]
        (300.0, 97772.7),  # fluids 1.3.1 ATMOSPHERE_1976(300).P, rounded [V]
        (500.0, 95461.3),  # fluids 1.3.1 ATMOSPHERE_1976(500).P, rounded [V]
        (1000.0, 89876.3),  # fluids 1.3.1 ATMOSPHERE_1976(1000).P, rounded [V]
        (1500.0, 84559.7),  # fluids 1.3.1 ATMOSPHERE_1976(1500).P, rounded [V]
        (2000.0, 79501.4),  # fluids 1.3.1 ATMOSPHERE_1976(2000).P, rounded [V]
        (3000.0, 70121.2),  # fluids 1.3.1 ATMOSPHERE_1976(3000).P, rounded [V]
    ],
)
def test_pressure_table(z: float, p: float) -> None:
    # 0.1 Pa: the printed precision of the values (same constants, R* = 8.31432).
    assert atmosphere.pressure(z) == pytest.approx(p, abs=0.1)


_GRID = [-1000.0 + 250.0 * k for k in range(85)]  # -1000 m ... 20000 m


@pytest.mark.parametrize("z", _GRID)
def test_pressure_against_fluids(z: float) -> None:
    fluids_atmosphere = pytest.importorskip("fluids.atmosphere")
    # fluids 1.3.1, ATMOSPHERE_1976(z).P, computed here [V]
    ref = fluids_atmosphere.ATMOSPHERE_1976(z).P
    assert atmosphere.pressure(z) == pytest.approx(ref, rel=1e-6)


@pytest.mark.parametrize("z", [-5000.0, *range(21000, 86001, 5000), 86000.0])
def test_upper_layers_against_fluids(z: float) -> None:
    fluids_atmosphere = pytest.importorskip("fluids.atmosphere")
    # fluids 1.3.1, ATMOSPHERE_1976(z).P and .T, computed here [V]
    ref = fluids_atmosphere.ATMOSPHERE_1976(z)
    assert atmosphere.pressure(z) == pytest.approx(ref.P, rel=1e-9)
    # fluids returns the rounded 186.946 K exactly at 86 km; 1e-6 allows for it.
    assert atmosphere.temperature(z) == pytest.approx(ref.T, rel=1e-6)


@pytest.mark.parametrize("z", [-5000.0, -500.0, 0.0, 420.0, 1000.0, 2500.0, 5000.0, 10999.0])
def test_troposphere_closed_form(z: float) -> None:
    H = R0 * z / (R0 + z)
    # The standard's troposphere formula with its rounded exponent 5.25588 [M✓]
    # (g0 M0/(R* 0.0065 K/m) = 5.255877 with the standard's constants).
    closed = 101325.0 * (1.0 - 0.0065 * H / 288.15) ** 5.25588
    assert atmosphere.pressure(z) == pytest.approx(closed, abs=1.0)


def test_tropopause_pressure() -> None:
    # 22632 Pa at 11 km geopotential = 11019.07 m geometric: US Standard Atmosphere 1976
    # table value 2.2632E+04 Pa, from memory; fluids 1.3.1 gives 22631.95 Pa at 11019.1 m
    # and 22632.064 Pa at the layer base [M✓].
    assert atmosphere.pressure(11019.1) == pytest.approx(22632.06, abs=1.0)
    # fluids 1.3.1 P_std[1] = 22632.06397346291 Pa, computed from the same constants [V]
    assert atmosphere.pressure(_geometric(11000.0)) == pytest.approx(22632.06397, abs=1e-3)


@pytest.mark.parametrize(
    ("H", "T"),
    [
        (0.0, 288.15),  # US Standard Atmosphere 1976 Table 4 base temperature [M✓]
        (11000.0, 216.65),  # Table 4 base temperature, from memory, fluids 1.3.1 [M✓]
        (20000.0, 216.65),  # Table 4 base temperature, from memory, fluids 1.3.1 [M✓]
        (32000.0, 228.65),  # Table 4 base temperature, from memory, fluids 1.3.1 [M✓]
        (47000.0, 270.65),  # Table 4 base temperature, from memory, fluids 1.3.1 [M✓]
        (51000.0, 270.65),  # Table 4 base temperature, from memory, fluids 1.3.1 [M✓]
        (71000.0, 214.65),  # Table 4 base temperature, from memory, fluids 1.3.1 [M✓]
        (84852.0, 186.946),  # Table 4 top of the model, from memory, fluids 1.3.1 [M✓]
    ],
)
def test_layer_base_temperatures(H: float, T: float) -> None:
    assert atmosphere.temperature(_geometric(H)) == pytest.approx(T, abs=1e-6)


@pytest.mark.parametrize("H", [11000.0, 20000.0, 32000.0, 47000.0, 51000.0, 71000.0])
def test_pressure_continuous_at_layer_bases(H: float) -> None:
    # Each layer's base pressure is the top pressure of the layer below.
    z = _geometric(H)
    below, above = atmosphere.pressure(z - 1e-3), atmosphere.pressure(z + 1e-3)
    assert below == pytest.approx(above, rel=1e-6)
    assert below > above


def test_temperature_1000_m() -> None:
    # fluids 1.3.1 ATMOSPHERE_1976(1000).T = 281.6510 K [V]
    assert atmosphere.temperature(1000.0) == pytest.approx(281.6510224, abs=1e-6)


def test_pressure_decreases_with_elevation() -> None:
    values = [atmosphere.pressure(z) for z in range(-5000, 86001, 500)]
    assert all(a > b for a, b in itertools.pairwise(values))


@pytest.mark.parametrize("func", [atmosphere.pressure, atmosphere.temperature])
@pytest.mark.parametrize("z", [-5000.1, 86000.1, 1.0e6, math.nan, math.inf])
def test_out_of_range(func, z: float) -> None:
    with pytest.raises(ValueError, match=r"-5000 m <= z <= 86000 m") as info:
        func(z)
    assert repr(z) in str(info.value)


@pytest.mark.parametrize("z", [atmosphere.Z_MIN, atmosphere.Z_MAX])
def test_range_is_closed(z: float) -> None:
    assert atmosphere.pressure(z) > 0.0
    assert atmosphere.temperature(z) > 0.0


# --- registration and the printed substitution --------------------------------------


def test_pressure_is_registered() -> None:
    eq = equation.lookup("atmosphere.pressure")
    assert eq.func is atmosphere.pressure
    assert eq.params == {"z": "m"}
    assert eq.unit == "Pa"
    assert eq.symbol == "p_baro"
    assert eq.reference == "us_standard_atmosphere_1976"
    assert callable(eq.substitute)
    assert {n for n in equation.registered() if n.startswith("atmosphere.")} == {
        "atmosphere.pressure"
    }


def test_substitute_troposphere() -> None:
    eq = equation.lookup("atmosphere.pressure")
    z = 420.0
    text = eq.substitute({"z": z}, atmosphere.pressure(z), _fmt)
    assert text == (
        "H = 6356766 m × 420 m / (6356766 m + 420 m) = 419.97 m; "
        "p = 101325 Pa × [(288.15 K − 0.0065 K/m × 419.97 m) / 288.15 K]^5.2559 = 96380 Pa"
    )


def test_substitute_below_sea_level() -> None:
    eq = equation.lookup("atmosphere.pressure")
    text = eq.substitute({"z": -1000.0}, atmosphere.pressure(-1000.0), _fmt)
    assert text.startswith("H = 6356766 m × (-1000 m) / (6356766 m − 1000 m) = -1000.2 m; ")
    assert "× (-1000.2 m)) / 288.15 K]^5.2559 = 1.1393e+05 Pa" in text


def test_substitute_isothermal_layer() -> None:
    eq = equation.lookup("atmosphere.pressure")
    z = 15000.0
    text = eq.substitute({"z": z}, atmosphere.pressure(z), _fmt)
    assert text.endswith(
        "p = 22632 Pa × exp(−0.034163 K/m × (14965 m − 11000 m) / 216.65 K) = 12112 Pa"
    )


def test_substitute_gradient_layer_numbers_recompute() -> None:
    # The printed numbers, put back into the printed formula, give the printed result.
    eq = equation.lookup("atmosphere.pressure")
    z = 40000.0
    text = eq.substitute({"z": z}, atmosphere.pressure(z), lambda x: repr(float(x)))
    formula = text.split("; p = ")[1]
    lhs, result = formula.rsplit(" = ", 1)
    python = (
        lhs.replace(" Pa", "")
        .replace(" K/m", "")
        .replace(" K", "")
        .replace(" m", "")
        .replace("×", "*")
        .replace("−", "-")
        .replace("[", "(")
        .replace("]^", ")**")
    )
    assert eval(python) == pytest.approx(float(result.removesuffix(" Pa")), rel=1e-12)
    assert float(result.removesuffix(" Pa")) == atmosphere.pressure(z)
