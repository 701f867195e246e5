"""``calcreport recheck``: every step recomputed from its recorded arguments.

The traces are solved in process from the worked examples and read back
through their JSON text, as a file would be. Each test tampers with one
thing and asserts that the recheck names the step it touches.
"""

from __future__ import annotations

import copy
import json
import math
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest

from calcreport.cli import main
from calcreport.errors import TraceError
from calcreport.model.loader import load
from calcreport.recheck import SCOPE, recheck, recheck_file, render_text
from calcreport.solver import solve
from calcreport.tracefile import read_trace

ROOT = Path(__file__).parents[2]
EXAMPLES = sorted((ROOT / "input_examples").glob("*.toml"))
PUMP = ROOT / "input_examples" / "cooling_water_selected_pump.toml"


@pytest.fixture(scope="module")
def traces() -> dict[str, dict[str, Any]]:
    """Every example's trace, as its JSON text reads back."""
    return {p.stem: json.loads(solve(load(p)).dumps()) for p in EXAMPLES}


@pytest.fixture
def pump(traces: dict[str, dict[str, Any]]) -> dict[str, Any]:
    """A fresh copy of the example with a pump curve (solver values, list arguments)."""
    return copy.deepcopy(traces[PUMP.stem])


def step(trace: dict[str, Any], ident: str) -> dict[str, Any]:
    return next(s for s in trace["steps"] if s["id"] == ident)


def users(trace: dict[str, Any], source: str) -> set[str]:
    """Ids of the steps with an argument from ``source``."""
    out = set()
    for s in trace["steps"]:
        for arg in s["arguments"].values():
            sources = arg["from"] if isinstance(arg["from"], list) else [arg["from"]]
            if source in sources:
                out.add(s["id"])
    return out


def mismatched(report: Any) -> dict[str, list[str]]:
    """Step id → what its findings name."""
    return {s.id: [f.what for f in s.findings] for s in report.mismatches}


def write(folder: Path, trace: dict[str, Any], name: str = "t.trace.json") -> Path:
    path = folder / name
    path.write_text(json.dumps(trace), encoding="utf-8")
    return path


# ---- a faithful trace confirms ---------------------------------------------------------


@pytest.mark.parametrize("example", EXAMPLES, ids=[p.stem for p in EXAMPLES])
def test_every_example_confirms(example: Path, traces: dict[str, dict[str, Any]]):
    trace = traces[example.stem]
    report = recheck(trace)
    assert report.ok, render_text(report)
    n = len(trace["steps"])
    assert (
        report.verdict
        == f"recheck: {n} of {n} steps confirmed, with the results, checks and status"
    )
    assert {s.status for s in report.steps} == {"confirmed"}
    assert [s.id for s in report.steps] == [s["id"] for s in trace["steps"]]
    assert report.printed_compared
    for result, recorded in zip(report.steps, trace["steps"], strict=True):
        assert result.recomputed == pytest.approx(recorded["value"], rel=1e-9, abs=1e-12)


def test_solver_values_are_confirmed_by_the_head_balance(pump: dict[str, Any]):
    report = recheck(pump)
    assert report.ok
    balances = [s for s in pump["steps"] if s["function"] == "pump.head_balance"]
    assert balances
    worst = max(balances, key=lambda s: abs(s["value"]))
    assert report.head_balance == {"step": worst["id"], "value": worst["value"], "unit": "m"}
    assert abs(report.head_balance["value"]) < 1e-6
    keys = {row["key"] for row in report.solutions}
    assert keys == set(pump["solutions"])
    for row in report.solutions:
        assert row["used_by"], row
        assert set(row["used_by"]) == users(pump, row["key"])
    assert "largest\npump head balance" in render_text(report)


def test_a_trace_without_a_pump_curve_has_no_head_balance(traces: dict[str, dict[str, Any]]):
    report = recheck(traces["check_case"])
    assert report.head_balance is None
    assert report.solutions == ()


def test_report_json_is_structured(pump: dict[str, Any]):
    data = json.loads(json.dumps(recheck(pump, path="p.json").to_json()))
    assert data["format"] == "calcreport-recheck/1"
    assert data["ok"] is True
    assert data["summary"] == {
        "steps": len(pump["steps"]),
        "confirmed": len(pump["steps"]),
        "mismatched": 0,
        "first_mismatch": None,
    }
    assert data["tolerance"] == {"relative": 1e-9, "absolute": 1e-12}
    assert data["scope"] == SCOPE
    assert data["trace"]["path"] == "p.json"
    assert data["trace"]["input"]["sha256"] == pump["input"]["sha256"]
    first = data["steps"][0]
    assert set(first) == {"id", "function", "status", "recorded", "recomputed", "unit", "findings"}
    assert first["status"] == "confirmed" and first["findings"] == []


# ---- tampering is found ----------------------------------------------------------------


def test_tampered_step_value_names_it_and_its_dependants(pump: dict[str, Any]):
    target = "pipe.D1.reynolds"
    step(pump, target)["value"] *= 1.001
    report = recheck(pump)
    found = mismatched(report)
    assert found[target] == ["value"]
    dependants = users(pump, target)
    assert dependants
    for ident in dependants:
        assert found[ident] == ["argument Re"], ident
    assert set(found) == {target} | dependants
    bad = next(s for s in report.steps if s.id == target)
    assert bad.status == "mismatch"
    assert bad.recorded == step(pump, target)["value"]
    assert bad.recomputed == pytest.approx(bad.recorded / 1.001, rel=1e-12)
    assert "not match (first: pipe.D1.reynolds)" in report.verdict


def test_changed_input_that_was_not_propagated(pump: dict[str, Any]):
    key = "pipe[2].length"
    pump["given"][key]["value"] += 1.0
    found = mismatched(recheck(pump))
    assert set(found) == users(pump, key)
    # The friction loss of the design case, two other cases and the three points of the
    # duty profile; the surge screening's pipe and line periods (at the highest-flow case);
    # and the head change of the line in series, in every state, for each event screened.
    friction = [k for k in found if k.endswith("friction_loss")]
    assert len(friction) == 6
    states = ["C1", "C2", "C3", "P1", "P2", "P3"]
    line = {
        f"{'' if s == 'C1' else s + '.'}surge.{event}.line_head"
        for s in states
        for event in ("pumptrip", "valveclosure")
    }
    assert set(found) - set(friction) == {"C3.surge.D1.period", "C3.surge.line_period"} | line
    for k in {"C3.surge.line_period"} | line:
        assert found[k] == ["argument L[1]"]
    assert all(what == ["argument L"] for k, what in found.items() if k not in line
               and k != "C3.surge.line_period")  # fmt: skip


def test_changed_solver_value(pump: dict[str, Any]):
    pump["solutions"]["solver.operating_flow"]["value"] *= 1.01
    found = mismatched(recheck(pump))
    assert set(found) == users(pump, "solver.operating_flow")


def test_tampered_step_unit(pump: dict[str, Any]):
    step(pump, "pipe.S1.velocity")["unit"] = "ft/s"
    report = recheck(pump)
    assert mismatched(report) == {"pipe.S1.velocity": ["unit"]}
    finding = report.mismatches[0].findings[0]
    assert (finding.recorded, finding.expected) == ("ft/s", "m/s")
    assert not report.ok


def test_tampered_argument_unit(pump: dict[str, Any]):
    step(pump, "pipe.S1.reynolds")["arguments"]["mu"]["unit"] = "cP"
    assert mismatched(recheck(pump)) == {"pipe.S1.reynolds": ["argument mu unit"]}


def test_dimensionless_unit_is_empty_in_the_trace(pump: dict[str, Any]):
    step(pump, "pipe.S1.reynolds")["unit"] = "-"
    assert mismatched(recheck(pump)) == {"pipe.S1.reynolds": ["unit"]}


def test_tampered_list_element(pump: dict[str, Any]):
    target = step(pump, "pipe.S1.k_total")
    target["arguments"]["K"]["value"][1] += 0.1
    found = mismatched(recheck(pump))
    assert "argument K[2]" in found["pipe.S1.k_total"]
    assert "value" in found["pipe.S1.k_total"]


def test_unknown_function(pump: dict[str, Any]):
    step(pump, "fluid.density")["function"] = "water.density_of_dreams"
    report = recheck(pump)
    assert mismatched(report) == {"fluid.density": ["function"]}
    assert "No registered equation is named 'water.density_of_dreams'" in (
        report.mismatches[0].findings[0].reason
    )


def test_missing_source(pump: dict[str, Any]):
    target = step(pump, "pipe.S1.velocity")
    old = target["arguments"]["Q"]["from"]
    target["arguments"]["Q"]["from"] = "nowhere"
    target["inputs"] = ["nowhere" if s == old else s for s in target["inputs"]]
    report = recheck(pump)
    assert mismatched(report) == {"pipe.S1.velocity": ["argument Q"]}
    assert report.mismatches[0].findings[0].reason == (
        "The argument Q names 'nowhere', which is no step, input, solution or assumption "
        "of this trace."
    )


def test_source_that_comes_later(pump: dict[str, Any]):
    target = step(pump, "pipe.S1.velocity")
    later = pump["steps"][-1]
    target["arguments"]["Q"]["from"] = later["id"]
    target["arguments"]["Q"]["value"] = later["value"]
    found = mismatched(recheck(pump))
    assert "argument Q" in found["pipe.S1.velocity"]


def test_non_finite_values(pump: dict[str, Any], tmp_path: Path):
    step(pump, "fluid.density")["value"] = math.nan
    step(pump, "pipe.S1.velocity")["arguments"]["D"]["value"] = math.inf
    # In memory, each non-finite value is a mismatch of its step.
    found = mismatched(recheck(pump))
    assert found["fluid.density"] == ["value"]
    assert found["pipe.S1.velocity"] == ["argument D"]
    # A file holding NaN, Infinity or a number beyond a float is not a readable trace.
    path = tmp_path / "nan.json"
    path.write_text(json.dumps(pump), encoding="utf-8")  # NaN and Infinity, as Python writes
    with pytest.raises(TraceError, match="finite numbers only"):
        recheck_file(path)
    big = tmp_path / "big.json"
    big.write_text(json.dumps(pump).replace("NaN", "1e400"), encoding="utf-8")
    with pytest.raises(TraceError, match="beyond the range of a float"):
        recheck_file(big)


def test_a_device_or_a_deep_nest_is_no_trace(tmp_path: Path):
    with pytest.raises(TraceError, match="not a regular file"):
        recheck_file("/dev/zero")
    deep = tmp_path / "deep.json"
    deep.write_text("[" * 100_000 + "]" * 100_000, encoding="utf-8")
    with pytest.raises(TraceError, match="nested too deeply"):
        recheck_file(deep)


def test_equation_that_fails_on_the_recorded_arguments(pump: dict[str, Any]):
    target = step(pump, "pipe.S1.velocity")
    target["arguments"]["D"]["value"] = 0.0
    report = recheck(pump)
    bad = next(s for s in report.mismatches if s.id == "pipe.S1.velocity")
    assert any("cannot be evaluated" in f.reason for f in bad.findings), bad


def test_argument_names_must_be_the_equations(pump: dict[str, Any]):
    target = step(pump, "pipe.S1.velocity")
    target["arguments"]["Q_extra"] = dict(target["arguments"]["Q"])
    assert "arguments" in mismatched(recheck(pump))["pipe.S1.velocity"]


def test_assumption_value_must_agree_with_its_printed_value(pump: dict[str, Any]):
    assumption = next(a for a in pump["assumptions"] if a.get("value") == "1.0000")
    assumption["value"] = "0.9500"
    found = mismatched(recheck(pump))
    assert set(found) == users(pump, assumption["id"])
    assert found


def test_printed_value_rounding_is_accepted(pump: dict[str, Any]):
    # A trace that records only the printed value: rounding to its digits is accepted.
    assumption = next(a for a in pump["assumptions"] if a.get("value") == "1.0000")
    del assumption["quantity"]
    using = users(pump, assumption["id"])
    for ident in using:
        for arg in step(pump, ident)["arguments"].values():
            if arg["from"] == assumption["id"]:
                arg["value"] = 1.00004  # prints as 1.0000
    report = recheck(pump)
    for bad in report.mismatches:
        if bad.id in using:
            assert all(f.reason.find(assumption["id"]) < 0 for f in bad.findings), bad


def test_tampered_substituted_line(pump: dict[str, Any]):
    target = step(pump, "pipe.D1.friction_loss")
    target["substituted"] = target["substituted"].replace("=", "≈", 1)
    assert mismatched(recheck(pump)) == {"pipe.D1.friction_loss": ["substituted"]}


def test_printed_text_is_not_compared_across_versions(pump: dict[str, Any]):
    pump["software"] = {"name": "calcreport", "version": "0.0.1"}
    target = step(pump, "pipe.D1.friction_loss")
    target["substituted"] = "edited"
    report = recheck(pump)
    assert report.ok
    assert not report.printed_compared
    assert any("written by calcreport 0.0.1" in note for note in report.notes)


def test_inputs_list_must_name_the_arguments_sources(pump: dict[str, Any]):
    step(pump, "pipe.S1.velocity")["inputs"].append("duty.flow_extra")
    assert mismatched(recheck(pump)) == {"pipe.S1.velocity": ["inputs"]}


def test_tolerance(pump: dict[str, Any]):
    tiny, small = copy.deepcopy(pump), copy.deepcopy(pump)
    step(tiny, "fluid.density")["value"] *= 1 + 1e-12
    step(small, "fluid.density")["value"] *= 1 + 1e-6
    assert "fluid.density" not in mismatched(recheck(tiny))
    assert "fluid.density" in mismatched(recheck(small))
    assert "fluid.density" not in mismatched(recheck(small, tolerance=1e-5))


def test_values_near_zero_use_an_absolute_floor(traces: dict[str, dict[str, Any]]):
    trace = copy.deepcopy(traces["check_case"])
    zero = next(s for s in trace["steps"] if s["value"] == 0.0)
    zero["value"] = 1e-13
    # The arithmetic agrees; only the printed line, which still says 0, no longer does.
    assert mismatched(recheck(trace)) == {zero["id"]: ["substituted"]}
    zero["value"] = 1e-11
    found = mismatched(recheck(trace))
    assert found[zero["id"]] == ["value"]
    assert set(found) == {zero["id"]} | users(trace, zero["id"])


def test_results_not_derived_from_a_step_are_listed(pump: dict[str, Any]):
    # A result that names its source and no longer holds its value does not recheck.
    pump["results"]["total_dynamic_head"]["value"] = 99.0
    assert not recheck(pump).ok
    # One that names no source is compared with every recorded value: it is listed.
    del pump["results"]["total_dynamic_head"]["from"]
    report = recheck(pump)
    assert report.ok
    assert "results.total_dynamic_head" in report.untraced_results
    assert "Not covered:" in render_text(report)


# ---- unreadable traces -----------------------------------------------------------------


def test_duplicate_step_ids_are_an_error(pump: dict[str, Any]):
    pump["steps"].append(copy.deepcopy(pump["steps"][0]))
    with pytest.raises(TraceError, match="appears more than once"):
        recheck(pump)


@pytest.mark.parametrize(
    ("content", "reason"),
    [
        (b"this is not json", "it is not JSON (Expecting value at line 1, column 1)."),
        (b'{"format": "calcreport-trace/0", "steps": []}', "it has format 'calcreport-trace/0'"),
        (b'{"steps": []}', "it has no format key"),
        (b"[1, 2]", "it holds a JSON array"),
        (b'{"format": "calcreport-trace/1"}', "it has no 'steps' list."),
        (b'{"format": "calcreport-trace/1", "steps": [{"value": 1}]}', "step 1 of 1 has no id"),
        (b"\xff\xfe", "it is not UTF-8 text"),
    ],
    ids=["not-json", "wrong-format", "no-format", "array", "no-steps", "no-id", "not-utf8"],
)
def test_unreadable_files(content: bytes, reason: str, tmp_path: Path):
    path = tmp_path / "bad.json"
    path.write_bytes(content)
    with pytest.raises(TraceError) as info:
        read_trace(path)
    assert str(info.value).startswith(f"{path}: not a readable calcreport trace: ")
    assert reason in str(info.value)


def test_missing_file_and_folder(tmp_path: Path):
    with pytest.raises(TraceError, match="the file does not exist"):
        read_trace(tmp_path / "absent.json")
    with pytest.raises(TraceError, match="it is a folder"):
        read_trace(tmp_path)


# ---- the command line ------------------------------------------------------------------


def test_cli_confirms(pump: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    path = write(tmp_path, pump)
    assert main(["recheck", str(path)]) == 0
    out, err = capsys.readouterr()
    n = len(pump["steps"])
    assert (
        out.rstrip().splitlines()[-1]
        == f"recheck: {n} of {n} steps confirmed, with the results, checks and status"
    )
    assert "Mismatches" not in out
    assert err == ""


def test_cli_mismatch(pump: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    step(pump, "pipe.D1.reynolds")["value"] *= 1.01
    path = write(tmp_path, pump)
    assert main(["recheck", str(path)]) == 1
    out, err = capsys.readouterr()
    n, bad = len(pump["steps"]), 1 + len(users(pump, "pipe.D1.reynolds"))
    assert out.rstrip().splitlines()[-1] == (
        f"recheck: {bad} of {n} steps do not match (first: pipe.D1.reynolds)"
    )
    assert "Mismatches:" in out
    assert "step" in out and "recorded" in out and "recomputed" in out
    row = next(line for line in out.splitlines() if line.strip().startswith("pipe.D1.reynolds"))
    assert "value" in row
    assert err == ""


def test_cli_json(pump: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    step(pump, "pipe.S1.velocity")["unit"] = "ft/s"
    path = write(tmp_path, pump)
    assert main(["recheck", str(path), "--json"]) == 1
    data = json.loads(capsys.readouterr().out)
    assert data["ok"] is False
    assert data["summary"]["first_mismatch"] == "pipe.S1.velocity"
    bad = [s for s in data["steps"] if s["status"] == "mismatch"]
    assert [s["id"] for s in bad] == ["pipe.S1.velocity"]
    assert bad[0]["findings"][0]["what"] == "unit"


def test_cli_tolerance(pump: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    step(pump, "fluid.density")["value"] *= 1 + 1e-6
    for dep in users(pump, "fluid.density"):
        for arg in step(pump, dep)["arguments"].values():
            if arg["from"] == "fluid.density":
                arg["value"] *= 1 + 1e-6
    path = write(tmp_path, pump)
    assert main(["recheck", str(path), "--tolerance", "1e-3"]) == 0
    assert main(["recheck", str(path)]) == 1
    capsys.readouterr()


@pytest.mark.parametrize("value", ["abc", "-1", "2"])
def test_cli_bad_tolerance(value: str, tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    with pytest.raises(SystemExit) as info:
        main(["recheck", str(tmp_path / "t.json"), "--tolerance", value])
    assert info.value.code == 2
    assert "--tolerance" in capsys.readouterr().err


@pytest.mark.parametrize(
    ("content", "words"),
    [
        ("{not json", "it is not JSON"),
        ('{"format": "another-format/3", "steps": []}', "it has format 'another-format/3'"),
    ],
    ids=["not-json", "wrong-format"],
)
def test_cli_unreadable(content: str, words: str, tmp_path: Path, capsys):
    path = tmp_path / "bad.json"
    path.write_text(content, encoding="utf-8")
    assert main(["recheck", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert err == f"calcreport: {path}: not a readable calcreport trace: {err.split(': ', 3)[3]}"
    assert words in err
    assert err.rstrip().endswith(".")
    assert "Traceback" not in err


def test_cli_missing_file(tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    assert main(["recheck", str(tmp_path / "absent.json")]) == 2
    assert "the file does not exist." in capsys.readouterr().err


def test_help_says_what_recheck_proves(capsys: pytest.CaptureFixture[str]):
    with pytest.raises(SystemExit) as info:
        main(["recheck", "--help"])
    assert info.value.code == 0
    out = " ".join(capsys.readouterr().out.split())
    assert "arithmetically consistent with its recorded inputs" in out
    assert "no value was altered after the calculation" in out
    assert "does not prove that the method, the inputs or the model are right" in out
    assert "explicit friction factor beside the Colebrook value" in out


def test_solve_json_then_recheck(tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    example = ROOT / "input_examples" / "process_transfer_us.toml"
    assert main(["solve", str(example), "--json"]) == 0
    trace = tmp_path / "process_transfer_us.trace.json"
    trace.write_text(capsys.readouterr().out, encoding="utf-8")
    assert main(["recheck", str(trace)]) == 0
    assert capsys.readouterr().out.rstrip().endswith("with the results, checks and status")


def test_subprocess_exit_codes(pump: dict[str, Any], tmp_path: Path):
    step(pump, "pipe.S1.velocity")["unit"] = "ft/s"
    path = write(tmp_path, pump)
    done = subprocess.run(
        [sys.executable, "-m", "calcreport", "recheck", str(path)],
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )
    assert done.returncode == 1, done.stderr
    assert done.stdout.rstrip().splitlines()[-1].endswith("(first: pipe.S1.velocity)")
    assert done.stderr == ""


def test_tampered_assumption_number_is_caught(pump: dict[str, Any]):
    # The trace records each assumption's number; the arguments that disagree are named.
    assumption = next(a for a in pump["assumptions"] if a.get("value") == "1.0000")
    assumption["quantity"]["value"] = 0.95
    found = mismatched(recheck(pump))
    assert set(found) == users(pump, assumption["id"])


# ---- results, checks and status are bound to the steps ------------------------------------


def test_every_example_rechecks_with_its_results_checks_and_status(traces):
    for name, trace in traces.items():
        report = recheck(trace)
        assert report.ok, (name, [f.what for f in report.bound])
        assert not report.untraced_results and not report.untraced_checks, name
        assert "with the results, checks and status" in report.verdict


def test_a_result_replaced_by_another_steps_value_is_caught(pump):
    # The forger keeps the source's name: the value no longer is that step's.
    other = step(pump, "pipe.D1.friction_loss")["value"]
    pump["results"]["total_dynamic_head"]["value"] = other
    report = recheck(pump)
    assert not report.ok
    assert report.bound[0].what == "results.total_dynamic_head"
    # ... or names the other step too: a state's TDH is its own TDH step.
    pump["results"]["total_dynamic_head"]["from"] = "pipe.D1.friction_loss"
    report = recheck(pump)
    assert any(
        f.what == "results.total_dynamic_head" and f.expected == "system.total_dynamic_head"
        for f in report.bound
    )


def test_checks_all_set_to_pass_and_the_status_to_complies_are_caught(traces):
    trace = copy.deepcopy(traces["reservoir_fill_si"])
    failing = [c["id"] for c in trace["checks"] if c["status"] == "fail"]
    assert failing  # the demo's pump trip and ratings fail
    for c in trace["checks"]:
        c["status"] = "pass"
    trace["status"] = {"value": "for checking", "reason": "every check passes"}
    report = recheck(trace)
    assert not report.ok
    caught = {f.what.split(" ")[1] for f in report.bound if f.what.startswith("check ")}
    assert set(failing) <= caught
    assert any(f.what == "status" and f.expected == "preliminary" for f in report.bound)


def test_a_forged_trace_exits_1_from_the_command_line(pump, tmp_path, capsys):
    pump["checks"][0]["status"] = "pass"
    for c in pump["checks"]:
        if c["status"] == "review" and c["value"] and c["limit"]:
            c["status"] = "pass"  # a review whose value misses its limit, marked pass
    path = tmp_path / "forged.trace.json"
    path.write_text(json.dumps(pump), encoding="utf-8")
    assert main(["recheck", str(path)]) == 1
    out = capsys.readouterr().out
    assert "do not hold" in out


def test_a_rated_duty_naming_a_state_other_than_its_checks_is_caught(pump):
    governing = pump["results"]["rated_duty"]["governing"]
    assert governing  # the selected pump's limits each name their governing state
    limit = next(iter(governing))
    governing[limit] = "C9"
    report = recheck(pump)
    assert not report.ok
    assert any(f.what == f"results.rated_duty.governing.{limit}" for f in report.bound)
