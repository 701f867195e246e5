"""Quantity parsing: input strings to SI floats, and the messages for bad ones.

Check values are the unit definitions themselves; each names its source.

[SP811] NIST Special Publication 811 (2008 edition), Guide for the Use of
        the International System of Units (SI), Appendix B.8 and B.9
        (factors for units listed alphabetically and by kind of quantity).
        Factors printed there in bold are exact by definition.
[SI]    BIPM, The International System of Units (SI Brochure), 9th edition
        (2019), Table 8 (non-SI units accepted for use with the SI) and
        section 2.3.1 (the kelvin and the degree Celsius).
"""

from __future__ import annotations

import math
import re

import pytest

from calcreport import units
from calcreport.units import KINDS, UnitProblem, as_written, display_unit, parse, to_display

# Exact definitions from which the check values are built.
INCH = 0.0254  # m; [SP811] B.8 "inch": exact by definition
FOOT = 12 * INCH  # m; [SP811] B.8 "foot": 0.3048 m, exact by definition
POUND = 0.45359237  # kg; [SP811] B.8 "pound (avoirdupois)": exact by definition
G_N = 9.80665  # m/s^2; [SP811] B.8 footnote, standard acceleration of gravity, exact
US_GALLON = 3.785411784e-3  # m^3; [SP811] B.8 "gallon (U.S.)": exact by definition
MINUTE = 60.0  # s; [SI] Table 8: exact
PSI = POUND * G_N / INCH**2  # Pa; [SP811] B.8 "pound-force per square inch": 6.894757 E+03


@pytest.mark.parametrize(
    ("text", "kind", "si", "source"),
    [
        ("30 L/s", "flow", 0.030, "[SI] Table 8: 1 L = 1 dm^3 = 1e-3 m^3, exact"),
        (
            "250 gpm",
            "flow",
            250 * 6.30901964e-5,
            "[SP811] B.8 gallon (U.S.) per minute = 6.30901964e-5 m^3/s, exact by definition",
        ),
        (
            "250 gpm",
            "flow",
            250 * US_GALLON / MINUTE,
            "[SP811] B.8 gallon (U.S.) = 3.785411784e-3 m^3, exact by definition; [SI] min = 60 s",
        ),
        ("80 m^3/h", "flow", 80 / 3600, "[SI] Table 8: 1 h = 3600 s, exact"),
        ("15 degC", "temperature", 288.15, "[SI] 2.3.1: T/K = t/degC + 273.15, exact"),
        (
            "68 degF",
            "temperature",
            293.15,
            "[SP811] B.9 temperature: T/K = (t/degF + 459.67)/1.8, exact by definition",
        ),
        ("35 kPa", "pressure", 35e3, "[SI] prefix kilo = 1e3; Pa = N/m^2"),
        ("0.0015 in", "roughness", 3.81e-5, "[SP811] B.8 inch = 0.0254 m, exact by definition"),
        ("6.065 in", "diameter", 0.154051, "[SP811] B.8 inch = 0.0254 m, exact by definition"),
        ("20 ft", "length", 6.096, "[SP811] B.8 foot = 0.3048 m, exact by definition"),
        (
            "5 psig",
            "pressure",
            5 * 6894.757293,
            "[SP811] B.8 psi = 6.894757 E+03 Pa; to 10 digits from the exact pound and g_n",
        ),
        (
            "5 psi",
            "pressure",
            5 * PSI,
            "[SP811] B.8 lbf/in^2 from pound = 0.45359237 kg and g_n = 9.80665 m/s^2, exact",
        ),
        ("1.2 cP", "viscosity", 1.2e-3, "[SP811] B.8 centipoise = 1e-3 Pa*s, exact by definition"),
        ("880 kg/m^3", "density", 880.0, "SI coherent unit"),
        (
            "62.3 lb/ft^3",
            "density",
            62.3 * POUND / FOOT**3,
            "[SP811] B.8 pound and foot, exact by definition",
        ),
        ("0.5 bar", "pressure", 0.5e5, "[SP811] B.8 bar = 1e5 Pa, exact by definition"),
        ("1.8 m/s", "velocity", 1.8, "SI coherent unit"),
        (
            "2950 rpm",
            "speed",
            2950 / MINUTE,
            "revolutions per second; [SI] Table 8: min = 60 s, exact",
        ),
        ("72 %", "dimensionless", 0.72, "[SI] 5.4.7: % = 0.01"),
        ("72%", "dimensionless", 0.72, "[SI] 5.4.7: % = 0.01"),
        (0.72, "dimensionless", 0.72, "a bare number where the value is dimensionless"),
        (3, "dimensionless", 3.0, "a bare integer count"),
        ("0.72", "dimensionless", 0.72, "a number in a string, dimensionless"),
        ("-50 kPa", "pressure", -50e3, "gauge vacuum; [SI] prefix kilo"),
        ("  1.5e1 m ", "length", 15.0, "exponent and surrounding blanks"),
    ],
)
def test_parse(text, kind, si, source):
    assert source  # every check value names where it comes from
    # 1e-10: the 10-digit psi value; every other value agrees to rounding error.
    assert parse(text, kind) == pytest.approx(si, rel=1e-10, abs=0.0)


def test_psi_to_ten_digits():
    """[SP811] B.8 lists psi as 6.894 757 E+03 Pa; the exact value to 10 digits is 6894.757293."""
    assert PSI == pytest.approx(6894.757293, abs=5e-7)
    assert parse("1 psi", "pressure") == pytest.approx(6894.757293, abs=5e-7)


def test_gauge_spellings_equal_their_absolute_twins():
    """units.txt: psig, barg and kPag are gauge readings of the same size as psi, bar, kPa."""
    assert parse("5 psig", "pressure") == parse("5 psi", "pressure")
    assert parse("2 barg", "pressure") == parse("2 bar", "pressure")
    assert parse("35 kPag", "pressure") == parse("35 kPa", "pressure")


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_the_examples_in_every_message_parse(kind):
    """The examples a message offers are themselves valid values of their kind."""
    examples = re.findall(r'"([^"]+)"', KINDS[kind].examples)
    unquoted = re.sub(r'"[^"]*"', "", KINDS[kind].examples)
    bare = re.findall(r"\d+(?:\.\d+)?", unquoted)
    assert examples or bare
    for example in examples:
        parse(example, kind)
    for number in bare:
        parse(float(number), kind)


# ---- rejections ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("value", "kind", "says"),
    [
        ("30", "flow", "has no unit"),
        (30, "flow", "bare number 30 has no unit"),
        (30.5, "length", "bare number 30.5 has no unit"),
        ("30 m", "flow", "is a length, not a flow"),
        ("20 L/s", "length", "is a flow, not a length"),
        ("15 degC", "pressure", "is a temperature, not a pressure"),
        ("20 m", "dimensionless", "is a length, not a plain number"),
        ("3 m m", "length", "dimension"),
        ("3 furlongz", "length", '"furlongz"'),
        ("5 psia", "pressure", "gauge"),
        ("15 C", "temperature", "degC"),
        ("60 F", "temperature", "degF"),
        ("20 delta_degC", "temperature", "temperature difference"),
        ("1,000 L/s", "flow", "thousands separators"),
        ("20 L/s/", "flow", '"L/s/"'),
        ("nan L/s", "flow", "not a finite number"),
        ("NaN", "dimensionless", "not a finite number"),
        ("inf m", "length", "not a finite number"),
        ("-inf m", "length", "not a finite number"),
        ("1e400 m", "length", "not a finite number"),
        ("1e308 km", "length", "out of range"),
        (math.nan, "dimensionless", "nan is not a finite number"),
        (math.inf, "dimensionless", "inf is not a finite number"),
        (math.nan, "length", "not a finite number"),
        (True, "dimensionless", "boolean true"),
        (False, "flow", "boolean false"),
        (["30 L/s"], "flow", 'an array ["30 L/s"]'),
        ([0.7, 0.8], "dimensionless", "an array [0.7, 0.8]"),
        ({"unit": "L/s", "values": [1]}, "flow", "a table"),
        ("", "length", "does not start with a number"),
        ("abc", "length", "does not start with a number"),
        ("m 30", "length", "does not start with a number"),
    ],
)
def test_rejected(value, kind, says):
    with pytest.raises(UnitProblem) as info:
        parse(value, kind)
    message = str(info.value)
    assert says in message, message
    # A full sentence that says what was expected, with no Python repr noise.
    assert message[:1].isupper() and message.endswith("."), message
    assert KINDS[kind].examples.split(",")[0].split(" or ")[0] in message, message
    assert not re.search(r"'[^']*'", message), message
    for noise in ("<class", "True", "False", "Quantity(", "UndefinedUnitError", "dict", "list"):
        assert noise not in message, (noise, message)


def test_unit_problem_is_a_value_error():
    with pytest.raises(ValueError):
        parse("3 furlongz", "length")


# ---- how values are echoed in messages ----------------------------------------------------


@pytest.mark.parametrize(
    ("value", "written"),
    [
        ("20 m", '"20 m"'),
        ('say "hi"', '"say \\"hi\\""'),
        (True, "true"),
        (False, "false"),
        (3, "3"),
        (0.5, "0.5"),
        (math.nan, "nan"),
        (-math.inf, "-inf"),
        (["0 L/s", 2], '["0 L/s", 2]'),
        ({"K": 0.5}, "{ K = 0.5 }"),
        ({}, "{}"),
    ],
)
def test_as_written(value, written):
    assert as_written(value) == written


# ---- display -----------------------------------------------------------------------------


def test_display_units():
    assert display_unit("flow", "SI") == "L/s"
    assert display_unit("flow", "US") == "gpm"
    assert display_unit("pressure", "US") == "psi"


def test_to_display_inverts_parse():
    assert to_display(parse("250 gpm", "flow"), "m^3/s", "gpm") == pytest.approx(250.0)
    assert to_display(parse("22 L/s", "flow"), "m^3/s", "L/s") == pytest.approx(22.0)
    assert to_display(parse("2950 rpm", "speed"), "1/s", "rpm") == pytest.approx(2950.0)
    assert to_display(288.15, "K", "degC") == pytest.approx(15.0)
    assert to_display(0.154051, "m", "in") == pytest.approx(6.065)


@pytest.mark.parametrize("unit", sorted(units._FAST))
def test_fast_conversions_equal_pint(unit):
    # The exact table of common units must agree with pint's definitions
    # (NIST SP 811 values) to the last bits, both ways.
    kind = units._FAST[unit][0]
    ureg = units.registry()
    q = ureg.Quantity(12.5, unit)
    si = KINDS_SI[kind]
    expected = q.to("turn / second" if kind == "speed" else si or "dimensionless").magnitude
    assert units.parse(f"12.5 {unit}".replace("percent", "%"), kind) == pytest.approx(
        expected, rel=1e-14
    )
    assert units.to_display(expected, units.KINDS[kind].si, unit) == pytest.approx(12.5, rel=1e-13)


KINDS_SI = {name: spec.si for name, spec in units.KINDS.items()}


# Coherent British gravitational units, built from the exact definitions above: the slug
# is the mass a pound-force accelerates at 1 ft/s² ([SP811] B.8 "slug": 14.59390 kg).
POUND_FORCE = POUND * G_N  # N; [SP811] B.8 "pound-force": 4.448222 N
SLUG = POUND_FORCE / FOOT  # kg


@pytest.mark.parametrize(
    ("si", "printed", "size"),
    [
        ("m", "ft", FOOT),
        ("m^3/s", "ft³/s", FOOT**3),
        ("m/s^2", "ft/s²", FOOT),
        ("kg/m^3", "slug/ft³", SLUG / FOOT**3),
        ("Pa", "lbf/ft²", POUND_FORCE / FOOT**2),
        ("Pa*s", "lbf·s/ft²", POUND_FORCE / FOOT**2),
        ("W", "ft·lbf/s", POUND_FORCE * FOOT),
        ("J", "ft·lbf", POUND_FORCE * FOOT),
        ("K", "°R", 5 / 9),  # [SP811] B.8 "degree Rankine": T/K = (T/°R)/1.8
        ("s", "s", 1.0),
        ("1/s", "1/s", 1.0),
    ],
)
def test_coherent_us_units_are_the_british_gravitational_ones(si, printed, size):
    assert units.coherent_us(si) == (printed, pytest.approx(size, rel=1e-12))


def test_slug_against_the_published_factor():
    # [SP811] B.8: 1 slug = 1.459390 E+01 kg; 1 lbf = 4.448222 E+00 N.
    assert units.coherent_us("kg/m^3")[1] * FOOT**3 == pytest.approx(14.59390, rel=1e-6)
    assert units.coherent_us("Pa")[1] * FOOT**2 == pytest.approx(4.448222, rel=1e-6)


def test_the_british_gravitational_units_are_coherent():
    # Coherent: density × acceleration × length is a pressure with no factor, as in SI
    # (lbf = slug·ft/s²), so ρ·g·h multiplies out in either system.
    (_, rho), (_, g), (_, m), (_, p) = (
        units.coherent_us(u) for u in ("kg/m^3", "m/s^2", "m", "Pa")
    )
    assert rho * g * m == pytest.approx(p, rel=1e-12)
    (_, mu), (_, v) = units.coherent_us("Pa*s"), units.coherent_us("m/s")
    assert rho * v * m / mu == pytest.approx(1.0, rel=1e-12)  # a Reynolds number is unchanged


def test_a_substituted_line_in_us_units_works_out_by_hand():
    from calcreport.physics.equation import lookup
    from calcreport.trace import substitute

    # Hydraulic power of 998.2 kg/m³ water, 0.05 m³/s against 30 m (values of our own).
    eq = lookup("power.hydraulic_power")
    values = {"rho": 998.2, "Q": 0.05, "H": 30.0}
    P = eq(**values)
    line = substitute(eq, values, P, "US")
    assert line.startswith("P_h = 1.9368 slug/ft³ × 32.174 ft/s² × 1.7657 ft³/s × 98.425 ft")
    # 998.2 / 515.38 = 1.9368 slug/ft³; 1.9368 × 32.174 × 1.7657 × 98.425 = 10,830 ft·lbf/s
    # by hand; 1 hp = 550 ft·lbf/s ([SP811] B.8 "horsepower (550 ft·lbf/s)") gives 19.69 hp.
    assert line.endswith("= 10830 ft·lbf/s")
    assert P / (550 * POUND_FORCE * FOOT) == pytest.approx(19.69, rel=1e-3)
    assert substitute(eq, values, P) == (
        "P_h = 998.20 kg/m³ × 9.80665 m/s² × 0.050000 m³/s × 30.000 m = 14683 W"
    )
