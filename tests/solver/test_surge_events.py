"""Surge: every credible event screened, the line screened as the pipes in series it is.

Independent values: water at 20 degC from CoolProp (IAPWS-95: density, and the isentropic
bulk modulus rho·w²), Korteweg's wave speed a = sqrt((K/rho)/(1 + c1 K D/(E e))) with c1 =
1 − ν/2, ν = 0.5 (no ratio given: the highest wave speed; Wylie & Streeter, Fluid Transients in
Systems, 1993, eq. 2.3.4), and the Joukowsky change of
the equivalent series pipe, sum(L v)/(g sum(L/a)), written out here.
"""

import math

import pytest

from calcreport.model.loader import loads
from calcreport.solver import solve

# A reference library of the test extras, used only to compute check values.
CP = pytest.importorskip("CoolProp.CoolProp")

G = 9.80665
T = 293.15
RHO = CP.PropsSI("D", "T", T, "P", 101325.0, "Water")
K = RHO * CP.PropsSI("A", "T", T, "P", 101325.0, "Water") ** 2

# A short, stiff steel header (NPS 8 Sch 40, ASME B36.10M) at the pump, then a long PE main
# of our own invention (DN 250 SDR 11: 204.6 mm bore, 22.7 mm wall, E 0.8 GPa).
HEADER = (20.0, 0.20272, 0.00818, 207e9)  # L, D, e, E
MAIN = (2000.0, 0.2046, 0.0227, 0.8e9)

LINE = f"""
format = 1
[fluid]
temperature = "20 degC"
[duty]
flow = "40 L/s"
[source]
level = "10 m"
[destination]
level = "40 m"
[pump]
elevation = "9 m"
efficiency = 0.75
[[pipe]]
id = "S1"
side = "suction"
length = "4 m"
inner_diameter = "202.72 mm"
roughness = "0.045 mm"
wall_thickness = "8.18 mm"
elastic_modulus = "207 GPa"
elevation_start = "9 m"
elevation_end = "9 m"
fittings = [{{ K = 0.5, note = "entrance" }}]
[[pipe]]
id = "H1"
side = "discharge"
length = "{HEADER[0]} m"
inner_diameter = "{HEADER[1] * 1e3} mm"
roughness = "0.045 mm"
wall_thickness = "{HEADER[2] * 1e3} mm"
elastic_modulus = "207 GPa"
elevation_start = "9 m"
elevation_end = "10 m"
[[pipe]]
id = "M1"
side = "discharge"
length = "{MAIN[0]} m"
inner_diameter = "{MAIN[1] * 1e3} mm"
roughness = "0.01 mm"
wall_thickness = "{MAIN[2] * 1e3} mm"
elastic_modulus = "0.8 GPa"
elevation_start = "10 m"
elevation_end = "38 m"
fittings = [{{ K = 1.0, note = "exit" }}]
"""


def _a(D: float, e: float, E: float) -> float:
    return math.sqrt((K / RHO) / (1 + 0.75 * K * D / (E * e)))


def _v(D: float) -> float:
    return 0.040 / (math.pi * D * D / 4)


def test_a_short_stiff_header_does_not_govern_the_line():
    t = solve(loads((LINE + '[surge]\nevent = "pump_trip"\n').encode()))
    s = t.results["surge"]
    a_h, a_m = _a(*HEADER[1:3], HEADER[3]), _a(*MAIN[1:3], MAIN[3])
    v_h, v_m = _v(HEADER[1]), _v(MAIN[1])
    # The header alone would give a·v/g of about 170 m; the line in series about 36 m.
    header_alone = a_h * v_h / G
    line = (HEADER[0] * v_h + MAIN[0] * v_m) / (G * (HEADER[0] / a_h + MAIN[0] / a_m))
    assert s["pipes"]["H1"]["wave_speed"]["value"] == pytest.approx(a_h, rel=1e-3)
    assert s["pipes"]["M1"]["wave_speed"]["value"] == pytest.approx(a_m, rel=1e-3)
    assert s["pipes"]["H1"]["joukowsky_head"]["value"] == pytest.approx(header_alone, rel=1e-3)
    assert s["head_rise"]["value"] == pytest.approx(line, rel=1e-3)
    assert s["pipes"]["H1"]["head_change"]["value"] == pytest.approx(line, rel=1e-3)
    assert header_alone > 4 * line
    assert s["governing_pipe"] == "M1"
    # The step says its method and source.
    step = t.step("surge.pumptrip.line_head")
    assert step.function == "surge.series_joukowsky_head"
    assert step.reference == "series_pipes_surge"
    assert "Water Hammer in Steel–Plastic Pipes" in t.references["series_pipes_surge"]


def test_a_pump_trip_is_screened_when_the_input_names_only_a_valve_closure():
    t = solve(loads((LINE + '[surge]\nevent = "valve_closure"\nclosure_time = "60 s"\n').encode()))
    events = t.results["surge"]["events"]
    assert set(events) == {"pump_trip", "valve_closure"}
    ids = {c.id: c for c in t.checks}
    assert {"surge.pump_trip", "surge.valve_closure"} <= set(ids)
    # The closure, slower than the line period, is mild; the trip's change is larger and
    # governs the result; its check names the node of the lowest downsurge.
    T = events["valve_closure"]["line_period"]["value"]
    assert events["valve_closure"]["head_rise"]["value"] == pytest.approx(
        events["pump_trip"]["head_rise"]["value"] * T / 60.0, rel=1e-9
    )
    trip = ids["surge.pump_trip"]
    assert events["pump_trip"]["min_transient_node"] in trip.message
    assert t.results["surge"]["event"] == "pump_trip"


def test_a_pump_trip_is_screened_with_no_surge_table_at_all():
    t = solve(loads(LINE.encode()))
    assert "pump_trip" in t.results["surge"]["events"]
    assert any(c.id == "surge.pump_trip" for c in t.checks)
    assert any("screened on every pumped line" in a["text"] for a in t.assumptions)


def test_a_slower_stop_lowers_the_head_change_by_the_line_period():
    at_once = solve(loads(LINE.encode())).results["surge"]
    slow = solve(loads((LINE + '[surge]\npump_stop_time = "30 s"\n').encode())).results["surge"]
    T = at_once["line_period"]["value"]
    assert T < 30.0
    # Michaud's estimate: the full change times 2L/a over the stopping time.
    assert slow["head_rise"]["value"] == pytest.approx(at_once["head_rise"]["value"] * T / 30.0)


def test_a_restraint_not_given_takes_the_highest_wave_speed():
    def speed(restraint: str) -> float:
        text = LINE.replace('id = "M1"\n', f'id = "M1"\n{restraint}').replace(
            'elastic_modulus = "0.8 GPa"', 'elastic_modulus = "0.8 GPa"\npoisson_ratio = 0.45'
        )
        return solve(loads(text.encode())).results["surge"]["pipes"]["M1"]["wave_speed"]["value"]

    free = speed("")
    for restraint in ('restraint = "anchored"\n', 'restraint = "expansion_joints"\n'):
        assert free >= speed(restraint)
    assert free == pytest.approx(speed('restraint = "upstream_anchor"\n'), rel=1e-12)
