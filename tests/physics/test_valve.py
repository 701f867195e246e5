"""Control valves for liquids (IEC 60534-2-1): the flow coefficient a duty needs, the choked
pressure drop and the authority, against hand evaluations and the coefficients' definitions."""

from __future__ import annotations

import math

import pytest

from calcreport.physics.valve import choked_pressure_drop, flow_coefficient, valve_authority

# NIST SP 811, appendix B: 1 gal (US) = 3.785411784 L, 1 psi = 6894.757 Pa, 1 h = 3600 s.
GALLON, PSI = 3.785411784e-3, 6894.757293168361


def test_kv_is_the_flow_of_water_in_m3_per_h_at_one_bar():
    # By the definition of K_v: the valve that passes Q m³/h of water (ρ0) at 1 bar drop.
    assert flow_coefficient(25.0 / 3600, 999.1, 1e5) == pytest.approx(25.0, rel=1e-12)
    # Square-root law: four times the drop, half the coefficient; a denser liquid, more.
    assert flow_coefficient(25.0 / 3600, 999.1, 4e5) == pytest.approx(12.5, rel=1e-12)
    assert flow_coefficient(25.0 / 3600, 1.2 * 999.1, 1e5) == pytest.approx(25.0 * math.sqrt(1.2))


def test_cv_follows_from_kv_by_the_units_of_its_definition():
    # C_v: US gallons a minute of water at 1 psi. The same valve in both: Cv/Kv = 1.156.
    Kv = flow_coefficient(0.01, 999.1, 1e5)
    Q_gpm = 0.01 * 60 / GALLON
    Cv = Q_gpm * math.sqrt(1.0 / (1e5 / PSI))  # gpm at the drop, scaled to 1 psi
    assert Cv / Kv == pytest.approx(1.156, abs=5e-4)  # the factor as the trade quotes it


def test_choked_drop_by_hand():
    # Water at 20 °C: p_v = 2339 Pa (IAPWS-IF97), p_c = 22.064 MPa (IAPWS); F_L = 0.9 and an
    # inlet at 5 bar(abs), values of our own. F_F = 0.96 - 0.28·√(2339/22.064e6) = 0.95712.
    FF = 0.96 - 0.28 * math.sqrt(2339.0 / 22.064e6)
    assert FF == pytest.approx(0.95712, abs=1e-5)
    assert choked_pressure_drop(0.9, 5e5, 2339.0, 22.064e6) == pytest.approx(
        0.81 * (5e5 - FF * 2339.0), rel=1e-12
    )


def test_authority_is_the_valves_share_of_the_circuit_drop():
    assert valve_authority(30e3, 90e3) == pytest.approx(0.25)
    assert valve_authority(1.0, 0.0) == 1.0
