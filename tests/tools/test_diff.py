"""``calcreport diff``: what changed between two traces of one system."""

from __future__ import annotations

import copy
import json
from pathlib import Path
from typing import Any

import pytest

from calcreport.cli import main
from calcreport.diff import diff, render_text
from calcreport.errors import TraceError
from calcreport.model.loader import loads
from calcreport.solver import solve

ROOT = Path(__file__).parents[2]
EXAMPLE = ROOT / "input_examples" / "reservoir_fill_si.toml"
PUMP = ROOT / "input_examples" / "cooling_water_selected_pump.toml"


def solved(text: str) -> dict[str, Any]:
    return json.loads(solve(loads(text.encode("utf-8"))).dumps())


@pytest.fixture(scope="module")
def base_text() -> str:
    return EXAMPLE.read_text(encoding="utf-8")


@pytest.fixture(scope="module")
def old(base_text: str) -> dict[str, Any]:
    return solved(base_text)


@pytest.fixture(scope="module")
def longer(base_text: str) -> dict[str, Any]:
    """The same system with the long discharge pipe 70 m longer, as revision B."""
    assert base_text.count('length = "600 m"') == 1
    assert base_text.count('revision = "A"') == 1
    text = base_text.replace('length = "600 m"', 'length = "670 m"')
    return solved(text.replace('revision = "A"', 'revision = "B"'))


def write(folder: Path, trace: dict[str, Any], name: str) -> Path:
    path = folder / name
    path.write_text(json.dumps(trace), encoding="utf-8")
    return path


def test_identical_traces(old: dict[str, Any]):
    report = diff(old, copy.deepcopy(old))
    assert report.identical
    assert report.verdict.startswith("diff: no differences")
    assert "no differences" in render_text(report)


def test_changed_pipe_length(old: dict[str, Any], longer: dict[str, Any]):
    report = diff(old, longer)
    assert not report.identical
    changed = {c.key: c for c in report.inputs}
    length = next(c for c in changed.values() if c.key.endswith(".length") and c.old == 600)
    assert (length.kind, length.old, length.new, length.unit) == ("changed", 600.0, 670.0, "m")
    assert length.change_percent == pytest.approx(70 / 600 * 100)
    assert len(report.inputs) == 1
    moved = {c.key: c for c in report.results}
    tdh = moved["total_dynamic_head"]
    assert tdh.new > tdh.old
    assert tdh.unit == "m"
    assert tdh.change_percent == pytest.approx((tdh.new - tdh.old) / tdh.old * 100)
    assert "static_head" not in moved  # unchanged results are not listed
    assert moved["system_curve.head"].kind == "curve changed"
    assert "system_curve.flow" not in moved
    assert [(c.key, c.old, c.new) for c in report.project] == [("revision", "A", "B")]
    assert not report.steps_added and not report.steps_removed
    assert report.steps_changed
    text = render_text(report)
    assert "Inputs:" in text and "Results that moved:" in text
    assert "total_dynamic_head" in text
    assert text.rstrip().splitlines()[-1].startswith("diff: changed 1 input, ")


def test_float_noise_is_not_a_change(old: dict[str, Any]):
    new = copy.deepcopy(old)
    new["results"]["total_dynamic_head"]["value"] *= 1 + 1e-13
    new["given"]["duty.flow"]["value"] *= 1 + 1e-13
    assert diff(old, new).identical


def test_check_status_change(old: dict[str, Any]):
    new = copy.deepcopy(old)
    check = new["checks"][-1]
    before = check["status"]
    check["status"] = "fail" if before != "fail" else "pass"
    report = diff(old, new)
    assert len(report.checks) == 1
    change = report.checks[0]
    assert (change.id, change.case) == (check["id"], check["case"])
    assert (change.old_status, change.new_status) == (before, check["status"])
    assert change.kind == "status changed"
    assert f"{before} → {check['status']}" in render_text(report)


def test_check_value_change_and_added_check(old: dict[str, Any]):
    new = copy.deepcopy(old)
    check = next(c for c in new["checks"] if c["value"] is not None)
    check["value"]["value"] *= 1.1
    added = copy.deepcopy(check)
    added["case"] = "C9"
    new["checks"].append(added)
    kinds = {(c.id, c.case): c.kind for c in diff(old, new).checks}
    assert kinds == {(check["id"], check["case"]): "value changed", (check["id"], "C9"): "added"}


def test_inputs_added_and_removed(old: dict[str, Any]):
    new = copy.deepcopy(old)
    new["given"]["extra.input"] = {"value": 1.0, "unit": "m"}
    removed = next(iter(new["given"]))
    del new["given"][removed]
    kinds = {c.key: c.kind for c in diff(old, new).inputs}
    assert kinds == {"extra.input": "added", removed: "removed"}


def test_unit_change_of_an_input(old: dict[str, Any]):
    new = copy.deepcopy(old)
    new["given"]["duty.flow"]["unit"] = "L/s"
    (change,) = diff(old, new).inputs
    assert change.old_unit == "m^3/s" and change.unit == "L/s"
    assert change.change_percent is None


def test_steps_added_and_removed(old: dict[str, Any]):
    new = copy.deepcopy(old)
    gone = new["steps"].pop(3)
    extra = copy.deepcopy(new["steps"][0])
    extra["id"] = "extra.step"
    new["steps"].append(extra)
    report = diff(old, new)
    assert report.steps_removed == (gone["id"],)
    assert report.steps_added == ("extra.step",)
    text = render_text(report)
    assert f"removed (1): {gone['id']}" in text and "added (1): extra.step" in text


def test_project_date_change(old: dict[str, Any]):
    new = copy.deepcopy(old)
    new["project"]["date"] = "2027-01-15"
    (change,) = diff(old, new).project
    assert (change.key, change.new) == ("date", "2027-01-15")


def test_results_added_and_removed(old: dict[str, Any]):
    new = copy.deepcopy(old)
    new["results"]["extra"] = {"value": 2.0, "unit": "m"}
    del new["results"]["static_head"]
    kinds = {c.key: c.kind for c in diff(old, new).results}
    assert kinds == {"extra": "added", "static_head": "removed"}


def test_pump_curve_traces(longer: dict[str, Any]):
    a = solved(PUMP.read_text(encoding="utf-8"))
    report = diff(a, copy.deepcopy(a))
    assert report.identical
    assert not diff(a, longer).identical  # different systems differ everywhere, without error


def test_json_form(old: dict[str, Any], longer: dict[str, Any]):
    data = json.loads(json.dumps(diff(old, longer, "a.json", "b.json").to_json()))
    assert data["format"] == "calcreport-diff/1"
    assert data["identical"] is False
    assert data["old"]["path"] == "a.json" and data["new"]["revision"] == "B"
    assert {"key", "kind", "old", "new", "unit", "change_percent"} <= set(data["inputs"][0])
    assert any(r["key"] == "total_dynamic_head" for r in data["results"])
    assert set(data["steps"]) == {"added", "removed", "value_changed"}


def test_wrong_format_is_an_error(old: dict[str, Any]):
    with pytest.raises(TraceError, match="a trace has format"):
        diff(old, {"format": "something-else"}, "a", "b")


# ---- the command line ------------------------------------------------------------------


def test_cli_differences(
    old: dict[str, Any], longer: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]
):
    a, b = write(tmp_path, old, "a.trace.json"), write(tmp_path, longer, "b.trace.json")
    assert main(["diff", str(a), str(b)]) == 1
    out, err = capsys.readouterr()
    assert err == ""
    assert "total_dynamic_head" in out and "600" in out and "670" in out
    assert main(["diff", str(a), str(b), "--json"]) == 1
    data = json.loads(capsys.readouterr().out)
    assert data["identical"] is False


def test_cli_identical(old: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    a, b = write(tmp_path, old, "a.trace.json"), write(tmp_path, old, "b.trace.json")
    assert main(["diff", str(a), str(b)]) == 0
    out = capsys.readouterr().out
    assert "no differences" in out.rstrip().splitlines()[-1]
    assert main(["diff", str(a), str(b), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["identical"] is True


def test_cli_unreadable(old: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]):
    good = write(tmp_path, old, "a.trace.json")
    bad = tmp_path / "b.trace.json"
    bad.write_text("{truncated", encoding="utf-8")
    assert main(["diff", str(good), str(bad)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert err.startswith(f"calcreport: {bad}: not a readable calcreport trace: it is not JSON")
    assert "Traceback" not in err
    assert main(["diff", str(good), str(tmp_path / "absent.json")]) == 2
    assert "the file does not exist." in capsys.readouterr().err


def test_a_value_becoming_non_finite_is_a_change(old: dict[str, Any], tmp_path: Path):
    import math

    forged = copy.deepcopy(old)
    forged["results"]["total_dynamic_head"]["value"] = math.inf
    assert not diff(old, forged).identical
    forged["results"]["total_dynamic_head"]["value"] = math.nan
    assert not diff(old, forged).identical
    # From a file, a non-finite value makes the trace unreadable: exit 2.
    path = write(tmp_path, forged, "forged.json")
    assert main(["diff", str(write(tmp_path, old, "old.json")), str(path)]) == 2
