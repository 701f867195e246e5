"""Surge screening physics against published and recomputed check values."""

import math

import pytest

from calcreport.physics import route, surge

# Korteweg wave speed a = sqrt((K/rho)/(1 + c1 K D/(E e))) (Wylie & Streeter, Fluid
# Transients in Systems, from memory), evaluated independently with K 2.1934 GPa
# (rho c^2 of water at 20 degC, IAPWS-95 in CoolProp 8.0.0), rho 998.2 kg/m^3,
# E 207 GPa (steel), c1 = 1; D the inner diameter of the ASME B36.10M schedule 40 pipe,
# e its wall.
STEEL_SCH40 = [
    # (NPS, inner diameter m, wall m, a m/s)
    ("4", 0.10226, 0.00602, 1364.6),
    ("6", 0.154051, 0.007112, 1336.8),
    ("8", 0.202717, 0.008179, 1319.2),
]
K, RHO = 2.1934e9, 998.2


@pytest.mark.parametrize(("nps", "D", "e", "a"), STEEL_SCH40)
def test_korteweg_steel_schedule_40(nps, D, e, a):
    assert surge.wave_speed(K, RHO, D, 207e9, e, 1.0) == pytest.approx(a, abs=0.05)


def test_korteweg_pvc_sdr21():
    # Korteweg, evaluated independently as above: PVC 4 in SDR 21, E 2.76 GPa -> 369 m/s.
    # OD 4.500 in (ASTM D2241 SDR pipe, iron-pipe-size OD), e = OD/21, D = OD - 2e.
    od = 4.5 * 0.0254
    e = od / 21
    assert surge.wave_speed(K, RHO, od - 2 * e, 2.76e9, e, 1.0) == pytest.approx(369, abs=0.5)


def test_korteweg_hdpe_sdr11():
    # Korteweg, evaluated independently as above: HDPE SDR 11, E 0.8 GPa -> 266 m/s. That value
    # is computed with D/e = SDR = 11 (outside diameter over wall), so the size drops out.
    e = 0.010
    assert surge.wave_speed(K, RHO, 11 * e, 0.8e9, e, 1.0) == pytest.approx(266, abs=0.5)


def test_rigid_pipe_is_the_upper_bound_and_the_elastic_limit():
    rigid = surge.rigid_wave_speed(K, RHO)
    assert rigid == pytest.approx(math.sqrt(K / RHO))
    # A very stiff wall tends to the rigid value; any real wall is slower.
    assert surge.wave_speed(K, RHO, 0.1, 1e18, 0.01, 1.0) == pytest.approx(rigid, rel=1e-7)
    assert surge.wave_speed(K, RHO, 0.1, 207e9, 0.006, 1.0) < rigid


def test_restraint_factors_wylie_streeter():
    # Wylie & Streeter, Fluid Transients in Systems, sec. 2.5: c1 = 1 - nu^2 anchored
    # throughout, 1 - nu/2 anchored upstream only, 1 with expansion joints.
    assert surge.anchored_restraint_factor(0.3) == pytest.approx(0.91)
    assert surge.upstream_anchor_restraint_factor(0.3) == pytest.approx(0.85)
    # Anchoring raises the wave speed (smaller c1): steel NPS 4 from 1364.6 m/s.
    anchored = surge.wave_speed(K, RHO, 0.10226, 207e9, 0.00602, 0.91)
    assert 1364.6 < anchored < 1400


def test_joukowsky_check_value():
    # Joukowsky dp = rho a dv (from memory), evaluated independently: rho 998.2, a 1200 m/s,
    # dv 2 m/s ->
    # dp 2.3957 MPa, dH 244.73 m.
    dH = surge.joukowsky_head(1200.0, 2.0)
    assert dH == pytest.approx(244.73, abs=0.005)
    assert route.head_to_pressure(998.2, dH) == pytest.approx(2.3957e6, rel=5e-5)


def test_slow_closure_is_the_linear_deceleration():
    # Michaud's estimate dH = 2 L v / (g t_c), written as dH_J * (2L/a) / t_c.
    L, a, v, t_c = 1500.0, 1100.0, 1.8, 12.0
    T = surge.pipe_period(L, a)
    dH = surge.slow_closure_head(surge.joukowsky_head(a, v), T, t_c)
    assert dH == pytest.approx(2 * L * v / (9.80665 * t_c), rel=1e-12)


def test_line_period_adds_travel_times():
    # Two pipes in series: travel times add (2 x (600/1200 + 300/300) = 3 s).
    assert surge.line_period([600.0, 300.0], [1200.0, 300.0]) == pytest.approx(3.0)
    assert surge.line_period([800.0], [1000.0]) == surge.pipe_period(800.0, 1000.0)


def test_transient_head_up_and_down():
    assert surge.transient_pressure_head(30.0, 45.0, 1.0) == 75.0
    assert surge.transient_pressure_head(30.0, 45.0, -1.0) == -15.0
