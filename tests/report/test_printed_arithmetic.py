"""The printed substituted lines, recomputed by hand: a small parser of the printed
arithmetic (numbers, × / + − ^ √ log10 exp max, the units beside each number dropped)
evaluates the line as a checker with a calculator would and must land on the printed
result. In SI the lines are in SI; in a US report they are in the coherent British
gravitational units (ft, slug, s, lbf), where no conversion factor may hide: the
numbers alone multiply out to the printed result. Every line parsed is also found in
the PDF's own text, so the test reads what a reader reads.
"""

from __future__ import annotations

import json
import math
import re

import pytest

from calcreport.physics.equation import lookup
from calcreport.report.sections.calculation import printed_substitution

# Lines that name a state or a root rather than work arithmetic (property correlations,
# roots found, curve interpolation, a rating picked from a series), and the lines of more
# than one statement (Colebrook's two sides, the standard atmosphere's two steps, the
# mole fraction and vapour pressure of a glycol solution, a fitting's K read at β and θ).
NOT_ARITHMETIC = frozenset(
    {
        "friction.colebrook",
        "atmosphere.pressure",
        "glycol.raoult_vapor_pressure",
        "fittings.contraction",
        "fittings.expansion",
    }
)

_NUMBER = r"\d+(?:\.\d+)?(?:e[+-]?\d+)?"
_ATOM = r"[A-Za-zµ°][A-Za-z°]*(?:[²³⁴]|\^\d+)?"
# A unit written after a number or a bracket: "kg/m³", "lbf·s/ft²", "1/s", "/kWh",
# "months", "cSt/(m²/s)".
_UNIT = rf"(?:1/s|/?{_ATOM}(?:[·/]{_ATOM}|/\({_ATOM}(?:[·/]{_ATOM})*\))*)"
_VALUE = re.compile(rf"({_NUMBER}|\)) {_UNIT}(?![\w])")


def evaluate(expression: str) -> float:
    """The printed arithmetic ``expression`` evaluated on its numbers alone."""
    e = expression.replace("−", "-")
    e = _VALUE.sub(r"\1", e)
    e = re.sub(r"log₁₀ (" + _NUMBER + ")", r"log10(\1)", e)
    e = re.sub(r"√(" + _NUMBER + ")", r"sqrt(\1)", e)
    for old, new in (
        ("√", "sqrt"),
        ("×", "*"),
        ("·", "*"),
        ("[", "("),
        ("]", ")"),
        ("^", "**"),
        ("²", "**2"),
        ("³", "**3"),
        ("⁴", "**4"),
        ("π", "pi"),
    ):
        e = e.replace(old, new)
    words = re.sub(r"\b(sqrt|log10|exp|max|pi)\b|" + _NUMBER, "", e)
    if re.search(r"[A-Za-z_]", words):
        raise ValueError(f"words left in {expression!r}: {e!r}")
    names = {"sqrt": math.sqrt, "log10": math.log10, "exp": math.exp, "max": max, "pi": math.pi}
    return float(eval(e, {"__builtins__": {}}, names))  # the test's own, checked text


def sides(line: str) -> tuple[str, float]:
    """The worked expression of a printed line and the number of its printed result."""
    if " → " in line:
        expression, result = line.split(" → ")
        result = result.split(" = ", 1)[1]
    else:
        parts = line.split(" = ")
        assert len(parts) == 3, f"not 'symbol = expression = result': {line!r}"
        expression, result = parts[1], parts[2]
    number = re.match(r"-?" + _NUMBER, result)
    assert number, f"no printed result in {line!r}"
    return expression, float(number.group(0))


def _flat(line: str) -> str:
    return re.sub(r"\s+", " ", line)


def _numbers(expression: str) -> list[float]:
    return [float(n) for n in re.findall(_NUMBER, expression.replace("−", "-"))]


def _pdf_text(path) -> str:
    from pypdf import PdfReader

    text = " ".join(page.extract_text() or "" for page in PdfReader(str(path)).pages)
    return _flat(text)


def _printed_steps(folder, name):
    trace = json.loads((folder / f"{name}.trace.json").read_text(encoding="utf-8"))
    system = trace["project"]["units"]
    text = _pdf_text(folder / f"{name}.pdf")
    steps = [st for st in trace["steps"] if f"[{st['id']}]" in text]
    return system, text, steps


@pytest.mark.parametrize("name", ["reservoir_fill_si", "process_transfer_us", "check_case"])
def test_every_printed_line_recomputes_to_its_printed_result(built_examples, name):
    system, text, steps = _printed_steps(built_examples[name], name)
    assert steps, "no worked steps found in the PDF"
    checked = 0
    # A step id also labels a row of the other states' tables: a worked step is one whose
    # line is printed, and nearly every step named is worked.
    worked = [st for st in steps if _flat(printed_substitution(st, system)) in text]
    assert len(worked) >= 0.9 * len(steps), f"{len(worked)} of {len(steps)} steps worked"
    for st in worked:
        line = printed_substitution(st, system)
        eq = lookup(st["function"])
        if eq.units == "display" or st["function"] in NOT_ARITHMETIC:
            continue
        expression, printed = sides(line)
        value = evaluate(expression)
        # Five significant figures on every input and on the result; a difference of
        # large terms is held to the size of its terms.
        scale = max([abs(printed), *map(abs, _numbers(expression))])
        assert value == pytest.approx(printed, rel=2e-3, abs=2e-4 * scale), (st["id"], line)
        checked += 1
    assert checked >= 0.8 * len(worked), f"only {checked} of {len(worked)} lines recomputed"


def test_a_us_report_writes_its_lines_in_us_units(built_examples):
    system, _, steps = _printed_steps(built_examples["process_transfer_us"], "process_transfer_us")
    assert system == "US"
    si = re.compile(r"\d (m|m/s|m³/s|m²/s|kg/m³|Pa|Pa·s|W|J|K)(?![\w/²³])")
    worked = 0
    for st in steps:
        if lookup(st["function"]).units == "fixed":
            continue
        line = printed_substitution(st, system)
        assert not si.search(line), f"{st['id']}: an SI unit in a US line: {line}"
        worked += 1
    assert worked > 20


def test_the_parser_reads_a_line_as_a_checker_would():
    # Hand arithmetic: 1.9322 × 3.8868 × 0.50542 / 1.6849e-05 = 225,28x (a calculator).
    assert evaluate(
        "1.9322 slug/ft³ × 3.8868 ft/s × 0.50542 ft / 1.6849e-05 lbf·s/ft²"
    ) == pytest.approx(225278, rel=1e-4)
    assert evaluate("(3.8868 ft/s)² / (2 × 32.174 ft/s²)") == pytest.approx(0.23478, rel=1e-4)
    assert evaluate("√(4.7399e+07 lbf/ft² / 1.9322 slug/ft³)") == pytest.approx(4952.9, rel=1e-4)
    assert evaluate("193596 kWh × 0.12 /kWh") == pytest.approx(23231.5, rel=1e-5)
    assert evaluate("max(30.0 m, 31.5 m, 29.0 m)") == 31.5
    with pytest.raises(ValueError, match="words left"):
        evaluate("f(Re) × 2")
