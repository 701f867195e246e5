"""Pressure along the route, ratings at shutoff and surge screening, end to end.

The hand values use the intermediate results of the end-to-end check case of test_calc,
computed with fluids 1.3.1 (Colebrook) and IAPWS-95 water properties (water 20 degC,
open tanks at sea level, Q 20 L/s): suction loss 0.13180 m, discharge friction
8.04585 m over 150 m of NPS 4 Sch 40 (D 0.102260 m), discharge minor loss 1.32003 m
(sum K 4.3660), v 2.43515 m/s, TDH 32.49768 m.
Here the discharge runs over a crest: D1 (100 m, all the fittings) rises to
the crest, D2 (50 m, the exit only) falls to the outlet. Each loss is taken
where it happens: D1's fittings at its start, friction along the pipes, the
exit as the liquid leaves D2.
"""

import pytest

from calcreport.errors import InputError
from calcreport.model.loader import loads
from calcreport.solver import solve

G = 9.80665
V = 2.43515
HV = V**2 / (2 * G)
TDH = 32.49768

ROUTE = """
format = 1
[fluid]
temperature = "20 degC"
[duty]
flow = "20 L/s"
[source]
level = "2.0 m"
[destination]
level = "25.0 m"
[pump]
elevation = "0 m"
efficiency = 0.78
[[pipe]]
id = "S1"
side = "suction"
length = "10 m"
inner_diameter = "154.051 mm"
roughness = "0.045 mm"
elevation_start = "0 m"
elevation_end = "0 m"
fittings = [{ K = 0.5, note = "entrance" }, { K = 0.57 }]
[[pipe]]
id = "D1"
side = "discharge"
length = "100 m"
nominal_size = "4"
schedule = "40"
roughness = "0.045 mm"
elevation_start = "0 m"
elevation_end = "CREST m"
fittings = [{ K = 0.366 }, { K = 3.0 }]
[[pipe]]
id = "D2"
side = "discharge"
length = "50 m"
nominal_size = "4"
schedule = "40"
roughness = "0.045 mm"
elevation_start = "CREST m"
elevation_end = "24 m"
fittings = [{ K = 1.0, note = "exit" }]
"""


# A pump trip is screened on every pumped line; tests of the steady route let it stop the
# flow slowly (a small head change) unless they name a surge event of their own.
QUIET = '[surge]\npump_stop_time = "600 s"\n'


def _quiet(extra: str) -> str:
    return extra if "[surge]" in extra else extra + QUIET


def _solve(crest: float, extra: str = ""):
    return solve(loads((ROUTE.replace("CREST", f"{crest}") + _quiet(extra)).encode()))


D1_FITTINGS = 3.366 * HV  # D1's own fittings (the exit, K = 1, is D2's)
CREST_NODES = ("D1 end", "D2 start")  # one point: D1 ends where D2 starts


def _crest_head(crest: float) -> float:
    """Hand calculation: EGL after the pump, less every loss up to the crest, less v^2/2g."""
    egl = 2.0 + TDH - 0.13180 - D1_FITTINGS - 8.04585 * 100 / 150
    return egl - HV - crest


def _check(t, ident):
    return next(c for c in t.checks if c.id == ident)


def test_grade_line_at_the_crest_against_hand_calculation():
    t = _solve(26.0)
    r = t.results
    assert r["total_dynamic_head"]["value"] == pytest.approx(TDH, rel=1e-5)
    node = r["route"]["min_pressure_node"]
    assert node in CREST_NODES
    assert r["route"]["min_pressure_head"]["value"] == pytest.approx(_crest_head(26.0), abs=2e-4)
    # The step the check relies on is the same value, with its equation.
    pipe, end = node.split()
    step = t.step(f"route.{pipe}.{end}.pressure_head")
    assert step.value == pytest.approx(r["route"]["min_pressure_head"]["value"], abs=1e-12)
    assert step.function == "route.node_pressure_head"
    # 1.51 m is positive but under the default 2 m: a review, naming the node.
    check = _check(t, "min_pressure")
    assert check.status == "review"
    assert node in check.message


def test_pump_outlet_nodes_against_hand_calculation():
    t = _solve(26.0)
    nodes = {n["name"]: n for n in t.results["profile"]["nodes"]}
    # At the discharge flange, before any discharge fitting: 2 + TDH - h_s - v^2/2g at z = 0.
    flange = 2.0 + TDH - 0.13180 - HV
    assert nodes["pump discharge flange"]["pressure_head"] == pytest.approx(flange, abs=2e-4)
    assert nodes["D1 start"]["pressure_head"] == pytest.approx(flange, abs=2e-4)
    # Past D1's fittings (K 0.366 and 3.0 at its start): less 3.366 v^2/2g.
    after = nodes["D1 start, after fittings"]["pressure_head"]
    assert after == pytest.approx(flange - D1_FITTINGS, abs=2e-4)
    # The suction flange: the source head less the suction loss and the velocity head.
    assert nodes["pump suction flange"]["pressure_head"] == pytest.approx(
        2.0 - 0.13180 - 1.07303**2 / (2 * G), abs=2e-4
    )


def test_flange_pressure_is_the_commissioning_gauge_pressure():
    t = _solve(26.0)
    rho = t.results["fluid"]["density"]["value"]
    gauge = t.results["commissioning"]["discharge_pressure"]["value"]
    nodes = {n["name"]: n for n in t.results["profile"]["nodes"]}
    assert nodes["pump discharge flange"]["pressure_head"] * rho * G == pytest.approx(
        gauge, rel=1e-9
    )


def test_a_rating_between_the_flange_and_the_after_fittings_pressure_fails():
    """No pump curve: the operating pressure at the flange alone is over the valve's rating,
    while the pressure past D1's fittings is under it. Operation over a rating fails."""
    t = _solve(26.0)
    rho = t.results["fluid"]["density"]["value"]
    flange = rho * G * (2.0 + TDH - 0.13180 - HV)
    after = flange - rho * G * D1_FITTINGS
    rating = (flange + after) / 2
    extra = f'[[component]]\nid = "V-1"\nat = "D1"\npressure_rating = "{rating} Pa"\n'
    t = _solve(26.0, extra)
    check = _check(t, "pressure_rating.V-1")
    assert check.status == "fail"
    assert "pump discharge flange" in check.message
    # In operation already (the slow trip's upsurge adds a little on top).
    operating = t.step("route.pump_discharge_flange.pressure_head").value * rho * G
    assert operating == pytest.approx(flange, rel=1e-5)
    assert check.value >= operating > rating


def test_every_item_over_its_rating_is_named():
    extra = (
        '[[component]]\nid = "V-1"\nat = "D1"\npressure_rating = "200 kPa"\n'
        '[[component]]\nid = "AV-1"\nat = "D2"\npressure_rating = "10 kPa"\n'
    )
    t = _solve(26.0, extra)
    failing = {c.id for c in t.checks if c.status == "fail"}
    assert {"pressure_rating.V-1", "pressure_rating.AV-1"} <= failing


def test_sub_atmospheric_crest_fails_naming_the_node():
    t = _solve(30.0)
    assert _crest_head(30.0) < 0
    check = _check(t, "min_pressure")
    assert check.status == "fail"
    assert any(n in check.message for n in CREST_NODES) and "sub-atmospheric" in check.message
    assert t.results["route"]["crest"]["node"] in CREST_NODES
    assert t.results["route"]["crest"]["above_destination"]["value"] == pytest.approx(5.0)
    # No pump curve: still preliminary, the failure said in the reason.
    assert (
        t.status["value"] == "preliminary" and "1 design check already fails" in t.status["reason"]
    )


def test_high_point_is_listed():
    t = _solve(26.0)
    points = t.results["route"]["high_points"]
    assert [p["node"] for p in points] == ["D1 end"]
    assert points[0]["distance"]["value"] == pytest.approx(110.0)


def test_project_criterion_fails_when_not_met():
    t = _solve(26.0, '[criteria]\nmin_pressure_head = "1 m"\n')
    assert _check(t, "min_pressure").status == "pass"
    t = _solve(26.0, '[criteria]\nmin_pressure_head = "3 m"\n')
    assert _check(t, "min_pressure").status == "fail"


# The check case's own pump curve H = 42 + 0.2q - 0.02q^2 (q in L/s): it
# droops, with its highest head 42.5 m at 5 L/s.
CURVE = """
[pump.curve]
flow = { unit = "L/s", values = [0, 5, 10, 20, 30, 40] }
head = { unit = "m", values = [42.0, 42.5, 42.0, 38.0, 30.0, 18.0] }
"""


def _with_curve(rating_text: str, crest: float = 26.0, extra: str = ""):
    text = ROUTE.replace("CREST", f"{crest}").replace(
        'elevation = "0 m"\nefficiency = 0.78\n',
        'elevation = "0 m"\nefficiency = 0.78\n' + rating_text,
    )
    return solve(loads((text + CURVE + _quiet(extra)).encode()))


def test_highest_pressure_is_the_curve_peak_over_the_highest_source_level():
    t = _with_curve('pressure_rating = "500 kPa"\n')
    r = t.results
    rho = r["fluid"]["density"]["value"]
    assert t.step("route.pump_max_head").value == pytest.approx(42.5)
    # Pump discharge at z = 0: rho g (2.0 + 42.5); the casing rating is the only rating.
    expected = rho * G * (2.0 + 42.5)
    step = t.step("route.pump_discharge_flange.max_static_pressure")
    assert step.value == pytest.approx(expected)
    assert r["route"]["max_pressure_node"] == "pump discharge flange"
    check = _check(t, "pressure_rating.casing")
    assert check.status == "pass"
    assert check.value == pytest.approx(expected)
    assert check.limit == 500e3


def test_component_rating_failure_names_the_item_and_node():
    extra = (
        '[[component]]\nid = "V-2"\nat = "D1"\npressure_rating = "400 kPa"\nnote = "air valve"\n'
    )
    t = _with_curve("", extra=extra)
    check = _check(t, "pressure_rating.V-2")
    rho = t.results["fluid"]["density"]["value"]
    assert check.status == "fail"
    # The valve is somewhere on D1: it sees D1's highest pressure, at the flange D1 starts from.
    assert "V-2" in check.title and "pump discharge flange" in check.message
    assert check.value == pytest.approx(rho * G * (2.0 + 42.5))


def test_no_curve_ratings_are_checked_on_operating_pressure_for_review():
    text = ROUTE.replace("CREST", "26.0").replace(
        'id = "D1"\n', 'id = "D1"\npressure_rating = "1000 kPa"\n'
    )
    t = solve(loads((text + QUIET).encode()))
    check = _check(t, "pressure_rating.pipe.D1")
    assert check.status == "review"
    assert "shutoff" in check.message


SURGE = '[surge]\nevent = "pump_trip"\n'


def test_surge_screening_of_a_pump_trip():
    t = _with_curve("", extra=SURGE)
    s = t.results["surge"]
    rho = t.results["fluid"]["density"]["value"]
    K = t.step(s["case"] + ".surge.bulk_modulus" if s["case"] != "C1" else "surge.bulk_modulus")
    # Korteweg with the catalog wall of NPS 4 Sch 40 (0.237 in = 6.0198 mm), E 207 GPa
    # (catalog); the restraint not given, c1 = 1 − ν/2 (the highest wave speed, Wylie &
    # Streeter 1993 sec. 2.3) with the catalog's ν = 0.30 for steel: c1 = 0.85.
    D, e = 4.026 * 0.0254, 0.237 * 0.0254
    prefix = "" if s["case"] == "C1" else f"{s['case']}."
    c1 = t.step(f"{prefix}surge.D1.restraint_factor").value
    assert c1 == pytest.approx(0.85)
    a = (K.value / rho / (1 + c1 * K.value * D / (207e9 * e))) ** 0.5
    assert s["pipes"]["D1"]["wave_speed"]["value"] == pytest.approx(a, rel=1e-9)
    v = t.results["cases"][s["case"]]["pipes"]["D1"]["velocity"]["value"]
    assert s["pipes"]["D1"]["joukowsky_head"]["value"] == pytest.approx(a * v / G, rel=1e-9)
    # The suction pipe has no wall given: taken as rigid, the upper bound.
    assert s["pipes"]["S1"]["wave_speed"]["value"] == pytest.approx((K.value / rho) ** 0.5)
    assert s["line_period"]["value"] == pytest.approx(2 * 150 / a, rel=1e-9)
    # A sudden stop from ~2.5 m/s in steel: about 350 m of downsurge, far below vapour.
    check = _check(t, "surge.pump_trip")
    assert check.status == "fail"
    assert "transient analysis" in check.message
    assert t.results["route"]["max_pressure_basis"] == "surge"


def test_slow_valve_closure_passes_the_period_test():
    extra = '[surge]\nevent = "valve_closure"\nclosure_time = "30 s"\npump_stop_time = "600 s"\n'
    # Slower than 2L/a, and the estimated rise is set against a rating (the casing's).
    t = _with_curve('pressure_rating = "5000 kPa"\n', extra=extra)
    s = t.results["surge"]["events"]["valve_closure"]
    assert s["closure_time"]["value"] == 30.0
    T = s["line_period"]["value"]
    jouk = t.results["surge"]["pipes"]["D1"]["joukowsky_head"]["value"]
    # D1 and D2 are one size: the line in series has D1's own Joukowsky value.
    assert s["pipes"]["D1"]["head_change"]["value"] == pytest.approx(jouk * T / 30.0)
    assert _check(t, "surge.valve_closure").status == "pass"
    # With no rating anywhere the rise is checked against nothing: review.
    assert _check(_with_curve("", extra=extra), "surge.valve_closure").status == "review"
    fast = _with_curve("", extra=extra.replace('closure_time = "30 s"', 'closure_time = "0.1 s"'))
    assert _check(fast, "surge.valve_closure").status == "review"
    closure = fast.results["surge"]["events"]["valve_closure"]
    assert closure["head_rise"]["value"] == pytest.approx(
        fast.results["surge"]["pipes"]["D1"]["joukowsky_head"]["value"]
    )


def test_anchored_pipe_uses_the_catalog_poisson_ratio():
    text = (
        ROUTE.replace("CREST", "26.0")
        .replace(
            'id = "D1"\n', 'id = "D1"\nmaterial = "commercial_steel"\nrestraint = "anchored"\n'
        )
        .replace(
            'roughness = "0.045 mm"\nelevation_start = "0 m"\nelevation_end = "26.0 m"',
            'elevation_start = "0 m"\nelevation_end = "26.0 m"',
        )
    )
    t = solve(loads((text + SURGE).encode()))
    c1 = [s for s in t.steps if s.id.endswith("surge.D1.restraint_factor")]
    assert len(c1) == 1 and c1[0].value == pytest.approx(1 - 0.30**2)


def test_input_problems_of_the_route_keys():
    text = ROUTE.replace("CREST", "26.0") + (
        '[[component]]\nid = "V-9"\nat = "D9"\npressure_rating = "1 MPa"\n'
        '[surge]\nevent = "valve_closure"\n'
    )
    text = text.replace('id = "D2"\n', 'id = "D2"\nrestraint = "anchord"\n')
    with pytest.raises(InputError) as err:
        loads(text.encode())
    keys = {p.key for p in err.value.problems}
    assert {"component[1].at", "surge.closure_time", "pipe[3].restraint"} <= keys
    messages = " ".join(p.message for p in err.value.problems)
    assert '"D1"' in messages or '"D2"' in messages  # a suggestion for the pipe id
    assert '"anchored"' in messages


def test_crest_says_when_it_controls_the_flow():
    over = _solve(30.0).results["route"]["crest"]
    assert over["controls_flow"] and over["cases_below_atmospheric"] == ["C1"]
    assert not _solve(26.0).results["route"]["crest"]["controls_flow"]


def test_suction_line_may_run_below_atmospheric_but_not_to_vapour():
    def lift(z_pump: float):
        text = (
            ROUTE.replace("CREST", "26.0")
            .replace('[pump]\nelevation = "0 m"', f'[pump]\nelevation = "{z_pump} m"')
            .replace(
                'elevation_start = "0 m"\nelevation_end = "0 m"',
                f'elevation_start = "0 m"\nelevation_end = "{z_pump} m"',
            )
            .replace(
                'elevation_start = "0 m"\nelevation_end = "26.0 m"',
                f'elevation_start = "{z_pump} m"\nelevation_end = "26.0 m"',
            )
        )
        t = solve(loads(text.encode()))
        return t, _check(t, "suction_pressure")

    t, check = lift(6.0)  # a 4 m suction lift: about -4.4 m gauge at the pump, above vapour
    h = t.results["cases"]["C1"]["route"]["suction_min_pressure_head"]["value"]
    assert check.status == "pass" and -5.0 < h < -4.0
    # S1 ends at the pump: its end and the suction flange are one point.
    low = t.results["cases"]["C1"]["route"]["suction_min_pressure_node"]
    assert low in ("S1 end", "pump suction flange")
    _, check = lift(12.0)  # a 10 m lift at 20 degC: below the vapour head (-10.1 m)
    assert check.status == "fail" and "boils" in check.message


def test_a_rating_on_a_pipe_without_elevations_is_not_silently_passed():
    text = ROUTE.replace("CREST", "26.0") + CURVE
    text = text.replace(
        'id = "D2"\nside = "discharge"\nlength = "50 m"\nnominal_size = "4"\nschedule = "40"\n'
        'roughness = "0.045 mm"\nelevation_start = "26.0 m"\nelevation_end = "24 m"\n',
        'id = "D2"\nside = "discharge"\nlength = "50 m"\nnominal_size = "4"\nschedule = "40"\n'
        'roughness = "0.045 mm"\npressure_rating = "200 kPa"\n',
    ).replace(
        '[pump]\nelevation = "0 m"\n', '[pump]\nelevation = "0 m"\npressure_rating = "2 MPa"\n'
    )
    t = solve(loads(text.encode()))
    check = _check(t, "pressure_rating.pipe.D2")
    assert check.status == "review" and "no elevations" in check.message
    assert any("not checked" in n and "pipe D2" in n for n in t.notes)
