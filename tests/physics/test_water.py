"""Tests of calcreport.physics.water against the IAPWS verification tables and libraries.

Labels beside each check value: [V] computed with a reference library,
[S] seen in a published table, [M] from memory not confirmed, [M✓] from
memory and reproduced by a library.
"""

from __future__ import annotations

import math
import string
import time

import pytest

from calcreport.physics import equation, water

ATM = 101325.0  # [Pa]
ZERO_C = 273.15  # [K]


# --- IAPWS-IF97 region 1, verification values (R7-97(2012) Table 5) ---------------

# (T [K], p [Pa], v [m^3/kg], w [m/s])
IF97_TABLE5 = [
    # IAPWS-IF97 (2007 revision) Table 5, from memory, reproduced by iapws 1.5.5 [M✓]
    (300.0, 3.0e6, 0.100215168e-2, 0.150773921e4),
    # IAPWS-IF97 (2007 revision) Table 5, from memory, reproduced by iapws 1.5.5 [M✓]
    (300.0, 80.0e6, 0.971180894e-3, 0.163469054e4),
    # IAPWS-IF97 (2007 revision) Table 5, from memory, reproduced by iapws 1.5.5 [M✓]
    (500.0, 3.0e6, 0.120241800e-2, 0.124071337e4),
]


@pytest.mark.parametrize(("T", "p", "v", "w"), IF97_TABLE5)
def test_region1_specific_volume_table5(T: float, p: float, v: float, w: float) -> None:
    assert 1.0 / water.density(T, p) == pytest.approx(v, rel=1e-8)


@pytest.mark.parametrize(("T", "p", "v", "w"), IF97_TABLE5)
def test_region1_speed_of_sound_table5(T: float, p: float, v: float, w: float) -> None:
    assert water.speed_of_sound(T, p) == pytest.approx(w, rel=1e-8)


@pytest.mark.parametrize(("T", "p", "v", "w"), IF97_TABLE5)
def test_bulk_modulus_is_rho_w_squared(T: float, p: float, v: float, w: float) -> None:
    # K_s = rho w^2 from the Table 5 values themselves (IF97 Table 5, [M✓] as above)
    assert water.bulk_modulus(T, p) == pytest.approx(w * w / v, rel=2e-8)


# --- IAPWS-IF97 region 4 (R7-97(2012) Tables 35 and 36) ---------------------------


@pytest.mark.parametrize(
    ("T", "p_s"),
    [
        (300.0, 0.353658941e-2 * 1e6),  # IAPWS-IF97 (2007 revision) Table 35, iapws 1.5.5 [M✓]
        (500.0, 2.63889776 * 1e6),  # IAPWS-IF97 (2007 revision) Table 35, iapws 1.5.5 [M✓]
        (600.0, 12.3443146 * 1e6),  # IAPWS-IF97 (2007 revision) Table 35, iapws 1.5.5 [M✓]
    ],
)
def test_saturation_pressure_table35(T: float, p_s: float) -> None:
    assert water.saturation_pressure(T) == pytest.approx(p_s, rel=1e-8)


@pytest.mark.parametrize(
    ("p", "T_s"),
    [
        (0.1e6, 372.755919),  # IAPWS-IF97 (2007 revision) Table 36, iapws 1.5.5 [M✓]
        (1.0e6, 453.035632),  # IAPWS-IF97 (2007 revision) Table 36, iapws 1.5.5 [M✓]
        (10.0e6, 584.149488),  # IAPWS-IF97 (2007 revision) Table 36, iapws 1.5.5 [M✓]
    ],
)
def test_saturation_temperature_table36(p: float, T_s: float) -> None:
    assert water.saturation_temperature(p) == pytest.approx(T_s, rel=1e-8)


@pytest.mark.parametrize("T", [273.15, 280.0, 300.0, 373.15, 450.0, 550.0, 620.0, 647.0, 647.096])
def test_saturation_equations_are_inverse(T: float) -> None:
    # IF97 eqs. 30 and 31 both solve the quadratic eq. 29, so they agree to round-off.
    assert water.saturation_temperature(water.saturation_pressure(T)) == pytest.approx(T, rel=1e-9)


# --- IAPWS 2008 viscosity (R12-08 Table 4, mu_2 = 1) -------------------------------


@pytest.mark.parametrize(
    ("T", "rho", "mu_micro"),
    [
        # IAPWS R12-08 Table 4, from memory, reproduced by iapws 1.5.5 [M✓]
        (298.15, 998.0, 889.735100),
        # IAPWS R12-08 Table 4, from memory, reproduced by iapws 1.5.5 [M✓]
        (298.15, 1200.0, 1437.649467),
        # IAPWS R12-08 Table 4, from memory, reproduced by iapws 1.5.5 [M✓]
        (373.15, 1000.0, 307.883622),
        # IAPWS R12-08 Table 4, from memory, reproduced by iapws 1.5.5 [M✓]
        (433.15, 1000.0, 217.685358),
        # IAPWS R12-08 Table 4, seen in a third-party reproduction of the table,
        # also reproduced by iapws 1.5.5 [S]
        (433.15, 1.0, 14.5383245),
        # IAPWS R12-08 Table 4, third-party reproduction, also iapws 1.5.5 [S]
        (873.15, 600.0, 77.4301952),
        # IAPWS R12-08 Table 4, third-party reproduction, also iapws 1.5.5 [S]
        (1173.15, 400.0, 64.1546078),
    ],
)
def test_viscosity_table4(T: float, rho: float, mu_micro: float) -> None:
    assert water.viscosity(T, rho) == pytest.approx(mu_micro * 1e-6, rel=1e-8)


# --- against the reference libraries -----------------------------------------------

_IF97_GRID = [
    (T, p)
    for T in (273.15, 280.0, 293.15, 320.0, 360.0, 400.0, 450.0, 500.0, 560.0, 623.15)
    for p in (1.0e5, 1.0e6, 5.0e6, 20.0e6, 50.0e6, 100.0e6)
]


@pytest.mark.parametrize(("T", "p"), _IF97_GRID)
def test_region1_against_iapws_library(T: float, p: float) -> None:
    iapws = pytest.importorskip("iapws")
    p_s = water.saturation_pressure(T)
    if p < p_s:
        with pytest.raises(ValueError, match="would boil"):
            water.density(T, p)
        return
    # iapws 1.5.5, IAPWS97(T, P) region 1, computed here [V]
    ref = iapws.IAPWS97(T=T, P=p / 1e6)
    assert water.density(T, p) == pytest.approx(ref.rho, rel=1e-11)
    assert water.speed_of_sound(T, p) == pytest.approx(ref.w, rel=1e-11)
    assert water.viscosity(T, water.density(T, p)) == pytest.approx(ref.mu, rel=1e-11)


@pytest.mark.parametrize("T", [273.15, 290.0, 330.0, 400.0, 480.0, 560.0, 640.0, 647.096])
def test_saturation_pressure_against_iapws_library(T: float) -> None:
    iapws97 = pytest.importorskip("iapws.iapws97")
    # iapws 1.5.5, IF97 region 4 saturation pressure, computed here [V]
    assert water.saturation_pressure(T) == pytest.approx(iapws97._PSat_T(T) * 1e6, rel=1e-12)


_CELSIUS_GRID = [1, 3, *range(5, 96, 5), 92, 95]


@pytest.mark.parametrize("celsius", _CELSIUS_GRID)
def test_against_coolprop_iapws95_at_one_atmosphere(celsius: int) -> None:
    cp = pytest.importorskip("CoolProp.CoolProp")
    T = ZERO_C + celsius
    # CoolProp 8.0.0, IAPWS-95 equation of state and IAPWS 2008 viscosity [V]
    rho_ref = cp.PropsSI("D", "T", T, "P", ATM, "Water")
    mu_ref = cp.PropsSI("V", "T", T, "P", ATM, "Water")
    p_s_ref = cp.PropsSI("P", "T", T, "Q", 0, "Water")
    rho = water.density(T, ATM)
    # IF97 region 1 differs from IAPWS-95 by up to about 0.015 kg/m^3 here.
    assert rho == pytest.approx(rho_ref, abs=0.02)
    assert water.viscosity(T, rho) == pytest.approx(mu_ref, rel=5e-4)
    assert water.saturation_pressure(T) == pytest.approx(p_s_ref, rel=2e-4)


@pytest.mark.parametrize(
    ("celsius", "rho", "mu", "p_s"),
    [
        # at 101.325 kPa; CoolProp 8.0.0 (IAPWS-95, IAPWS 2008), rounded [V]
        (5.0, 999.967, 1.51817e-3, 0.87258e3),
        (20.0, 998.207, 1.00160e-3, 2.33932e3),
        (25.0, 997.048, 0.89002e-3, 3.1699e3),
        (40.0, 992.216, 0.65273e-3, 7.3849e3),
        (60.0, 983.196, 0.46604e-3, 19.9464e3),
        (80.0, 971.790, 0.35405e-3, 47.4145e3),
    ],
)
def test_table_values_at_one_atmosphere(celsius: float, rho: float, mu: float, p_s: float) -> None:
    T = ZERO_C + celsius
    density = water.density(T, ATM)
    assert density == pytest.approx(rho, abs=0.02)
    assert water.viscosity(T, density) == pytest.approx(mu, rel=5e-4)
    assert water.saturation_pressure(T) == pytest.approx(p_s, rel=2e-4)


def test_speed_of_sound_at_20_celsius() -> None:
    # CoolProp 8.0.0, IAPWS-95, 20 °C and 101.325 kPa [V]; IF97 is 0.07 % above it.
    assert water.speed_of_sound(293.15, ATM) == pytest.approx(1482.35, rel=1e-3)


def test_bulk_modulus_against_coolprop() -> None:
    cp = pytest.importorskip("CoolProp.CoolProp")
    T = 293.15
    # CoolProp 8.0.0, IAPWS-95: rho * w^2 at 20 °C, 101.325 kPa, about 2.19 GPa [V]
    ref = (
        cp.PropsSI("D", "T", T, "P", ATM, "Water") * cp.PropsSI("A", "T", T, "P", ATM, "Water") ** 2
    )
    assert water.bulk_modulus(T, ATM) == pytest.approx(ref, rel=2e-3)


# --- range errors ------------------------------------------------------------------


@pytest.mark.parametrize("func", [water.density, water.speed_of_sound, water.bulk_modulus])
@pytest.mark.parametrize("T", [273.0, 623.2, 700.0, math.nan])
def test_region1_temperature_out_of_range(func, T: float) -> None:
    with pytest.raises(ValueError, match=r"273\.15 K <= T <= 623\.15 K") as info:
        func(T, 1.0e6)
    assert repr(T) in str(info.value)


@pytest.mark.parametrize("func", [water.density, water.speed_of_sound, water.bulk_modulus])
def test_region1_pressure_below_saturation(func) -> None:
    # 100 °C at one standard atmosphere: p_s(373.15 K) = 101.418 kPa > 101.325 kPa.
    with pytest.raises(ValueError, match="would boil") as info:
        func(373.15, ATM)
    message = str(info.value)
    assert "101325.0 Pa" in message
    assert "373.15 K" in message
    assert "p_s(T) <= p <= 100000000 Pa" in message


@pytest.mark.parametrize("p", [100.1e6, math.inf, math.nan])
def test_region1_pressure_above_range(p: float) -> None:
    with pytest.raises(ValueError, match=r"p_s\(T\) <= p <= 100000000 Pa") as info:
        water.density(300.0, p)
    assert repr(p) in str(info.value)


def test_region1_accepts_its_boundaries() -> None:
    # The range is closed: exactly p_s(T) and exactly 100 MPa are liquid region 1.
    p_s = water.saturation_pressure(300.0)
    assert 990.0 < water.density(300.0, p_s) < 1000.0
    assert 1030.0 < water.density(300.0, 100.0e6) < 1045.0
    assert water.density(623.15, 100.0e6) > 0.0


@pytest.mark.parametrize("T", [273.0, 647.1, math.nan])
def test_saturation_pressure_out_of_range(T: float) -> None:
    with pytest.raises(ValueError, match=r"273\.15 K <= T <= 647\.096 K") as info:
        water.saturation_pressure(T)
    assert repr(T) in str(info.value)


@pytest.mark.parametrize("p", [611.2, 22.0641e6, math.nan])
def test_saturation_temperature_out_of_range(p: float) -> None:
    with pytest.raises(ValueError, match=r"611\.213 Pa <= p <= p_c = 22064000 Pa") as info:
        water.saturation_temperature(p)
    assert repr(p) in str(info.value)


@pytest.mark.parametrize("T", [270.0, 1200.0, math.nan])
def test_viscosity_temperature_out_of_range(T: float) -> None:
    with pytest.raises(ValueError, match=r"273\.15 K <= T <= 1173\.15 K") as info:
        water.viscosity(T, 998.0)
    assert repr(T) in str(info.value)


@pytest.mark.parametrize("rho", [0.0, -1.0, math.inf, math.nan])
def test_viscosity_density_not_positive_finite(rho: float) -> None:
    with pytest.raises(ValueError, match="positive finite") as info:
        water.viscosity(300.0, rho)
    assert repr(rho) in str(info.value)


# --- registration with the equation registry --------------------------------------

_DECORATED = {
    "water.density": ({"T": "K", "p": "Pa"}, "kg/m^3", "ρ", "iapws_if97"),
    "water.saturation_pressure": ({"T": "K"}, "Pa", "p_v", "iapws_if97"),
    "water.viscosity": ({"T": "K", "rho": "kg/m^3"}, "Pa*s", "μ", "iapws_2008_viscosity"),
    "water.bulk_modulus": ({"T": "K", "p": "Pa"}, "Pa", "K", "iapws_if97"),
    "water.heat_capacity": ({"T": "K", "p": "Pa"}, "J/(kg*K)", "c_p", "iapws_if97"),
}


@pytest.mark.parametrize("name", sorted(_DECORATED))
def test_decorated_functions_are_registered(name: str) -> None:
    eq = equation.lookup(name)
    params, unit, symbol, reference = _DECORATED[name]
    assert eq.func is getattr(water, name.split(".")[1])
    assert eq.params == params
    assert eq.unit == unit
    assert eq.symbol == symbol
    assert eq.reference == reference
    assert isinstance(eq.substitute, str)
    fields = {f for _, f, _, _ in string.Formatter().parse(eq.substitute) if f}
    assert fields == set(params)


def test_only_the_trace_steps_are_registered() -> None:
    names = {n for n in equation.registered() if n.startswith("water.")}
    assert names == set(_DECORATED)


def test_public_names() -> None:
    assert sorted(water.__all__) == [
        "bulk_modulus",
        "density",
        "heat_capacity",
        "saturation_pressure",
        "saturation_temperature",
        "speed_of_sound",
        "viscosity",
    ]
    for name in water.__all__:
        assert name in (water.__doc__ or "")


# --- speed ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("func", "args"),
    [
        (water.density, (300.0, 3.0e5)),
        (water.speed_of_sound, (300.0, 3.0e5)),
        (water.saturation_pressure, (300.0,)),
        (water.saturation_temperature, (3.0e5,)),
        (water.viscosity, (300.0, 997.0)),
    ],
)
def test_calls_take_microseconds(func, args) -> None:
    # Each call is 1-15 µs on a current machine; 200 µs leaves room for a slow CI host.
    calls = 2000
    best = math.inf
    for _ in range(3):
        start = time.perf_counter()
        for _ in range(calls):
            func(*args)
        best = min(best, (time.perf_counter() - start) / calls)
    assert best < 200e-6


@pytest.mark.parametrize(
    ("T", "p", "cp"),
    [
        # IAPWS R7-97(2012) Table 5, region 1 verification values: c_p in kJ/(kg K).
        (300.0, 3e6, 4.17301218),
        (300.0, 80e6, 4.01008987),
        (500.0, 3e6, 4.65580682),
    ],
)
def test_heat_capacity_if97_table5(T: float, p: float, cp: float) -> None:
    assert water.heat_capacity(T, p) / 1e3 == pytest.approx(cp, rel=1e-8)
