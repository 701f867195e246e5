"""The [pump] table and its curve: count, arrangement, speeds, efficiency basis, motor class,
the curve inline or from a CSV file beside the input.
"""

from __future__ import annotations

import hashlib
import itertools
import re
from pathlib import Path
from typing import Any

from calcreport.errors import FileReadError
from calcreport.files import read_bounded
from calcreport.model.schema import (
    Given,
    Pump,
    PumpCurve,
)
from calcreport.model.sections.reader import (
    MAX_CURVE_POINTS,
    _fraction_pair,
    _numbers,
    _quantity_list,
    _Reader,
    _whole,
)
from calcreport.units import as_written

EFFICIENCY_BASES = ("pump", "overall")
MOTOR_CLASSES = ("IE2", "IE3")
ARRANGEMENTS = ("parallel", "series")
IMPELLERS = ("single_suction", "double_suction")
MAX_PUMPS = 12
_PROVENANCE_KEYS = (
    "acceptance_grade",
    "manufacturer",
    "model",
    "impeller_diameter",
    "curve_reference",
    "curve_date",
    "npsh_basis",
)
_PUMP_KEYS = {
    "elevation",
    "efficiency",
    "speed",
    "curve",
    "preferred_range",
    "allowable_range",
    "min_continuous_flow",
    "speed_range",
    "efficiency_basis",
    "count",
    "standby",
    "arrangement",
    "pressure_rating",
    "stages",
    "impeller",
    "trim",
    *_PROVENANCE_KEYS,
}
_CURVE_KEYS = {"speed", "flow", "head", "efficiency", "npsh_required", "power", "file"}
_CURVE_COLUMNS = ("flow", "head", "efficiency", "npsh_required", "power")
MAX_CSV_BYTES = 200_000
MIN_CURVE_POINTS = 3


def _pump(r: _Reader, data: dict[str, Any], where: str = "pump") -> Pump | None:
    """The pump of ``data``, its keys named under ``where`` (``pump``, or a candidate's
    ``candidate[2]``)."""
    r.known_keys(data, where, _PUMP_KEYS)
    elevation = r.quantity(data, "elevation", where, "length", required=True)
    efficiency = r.quantity(data, "efficiency", where, "dimensionless", fraction=True)
    speed = r.quantity(data, "speed", where, "speed", positive=True)
    curve = None
    if "curve" in data:
        curve_data = r.table(data, "curve", f"{where}.curve", required=True)
        curve = _curve(r, curve_data, where) if curve_data is not None else None
    if speed and curve and curve.speed is None:
        r.problem(
            f"{where}.curve.speed",
            "With pump.speed given, give the speed of the curve "
            "data too, so the curve can be moved by the affinity laws.",
        )
    if speed and not curve:
        r.problem(f"{where}.speed", f"{where}.speed moves a pump curve; give its curve as well.")
    ranges = {}
    for key in ("preferred_range", "allowable_range"):
        if key in data:
            ranges[key] = _fraction_pair(r, data[key], f"{where}.{key}")
    provenance = {key: r.text(data, key, where, "") for key in _PROVENANCE_KEYS if key in data}
    minimum = r.quantity(data, "min_continuous_flow", where, "flow", positive=True)
    speed_range = None
    if "speed_range" in data:
        speeds = _quantity_list(r, data, "speed_range", where, "speed")
        if speeds is not None and len(speeds) != 2:
            r.problem(
                f"{where}.speed_range",
                'Give the lowest and the highest speed, such as ["1800 rpm", "2950 rpm"].',
            )
        elif speeds is not None and speeds[0].value >= speeds[1].value:
            r.problem(f"{where}.speed_range", "Give the lowest speed first.")
        elif speeds is not None:
            speed_range = (speeds[0], speeds[1])
            if curve is None or curve.speed is None:
                r.problem(
                    f"{where}.speed_range",
                    "A speed range moves the pump curve: give [pump.curve] with its speed.",
                )
    basis = r.text(data, "efficiency_basis", where, "pump", EFFICIENCY_BASES)
    if basis == "overall" and curve and curve.power:
        r.problem(
            f"{where}.efficiency_basis",
            "A power curve gives the shaft power, so its efficiency is the pump's own: "
            'use efficiency_basis = "pump" (the default).',
        )
    count = _whole(r, data, where, "count", 1, MAX_PUMPS)
    standby = _whole(r, data, where, "standby", 0, MAX_PUMPS - 1)
    arrangement = r.text(data, "arrangement", where, "parallel", ARRANGEMENTS)
    if standby and standby.value >= (count.value if count else 1.0):
        r.problem(
            f"{where}.standby",
            "At least one pump must remain in service: pump.standby must be less than pump.count.",
        )
    if count and count.value > 1 and curve is None:
        r.problem(
            f"{where}.count",
            "Several pumps need their curve: give [pump.curve] for one "
            "pump, so the combined curve can be built.",
        )
    rating = r.quantity(data, "pressure_rating", where, "pressure", positive=True)
    stages = _whole(r, data, where, "stages", 1, 30)
    impeller = r.text(data, "impeller", where, "single_suction", IMPELLERS)
    trim = r.quantity(data, "trim", where, "dimensionless", fraction=True)
    if trim is not None and curve is None:
        r.problem(f"{where}.trim", "A trim moves the pump curve: give the curve as well.")
    if elevation is None:
        return None
    return Pump(
        stages=stages,
        impeller=impeller,
        trim=trim,
        pressure_rating=rating,
        count=count or Given(1.0, "", f"{where}.count"),
        standby=standby or Given(0.0, "", f"{where}.standby"),
        arrangement=arrangement,
        speed_range=speed_range,
        efficiency_basis=basis,
        elevation=elevation,
        efficiency=efficiency,
        speed=speed,
        curve=curve,
        preferred_range=ranges.get("preferred_range"),
        allowable_range=ranges.get("allowable_range"),
        min_continuous_flow=minimum,
        provenance=provenance,
    )


def _curve_file(r: _Reader, name: Any, where: str = "pump") -> dict[str, list[str]] | None:
    """Curve columns from a CSV file named relative to the input (``flow [L/s]``, ...)."""
    import csv

    where = f"{where}.curve.file"
    if not isinstance(name, str) or not name:
        r.problem(where, f"Expected a file name in double quotes; got {as_written(name)}.")
        return None
    given = Path(name)
    target = given if given.is_absolute() else (r.folder / given)
    if not r.outside:
        try:
            target.resolve().relative_to(r.folder.resolve())
        except (ValueError, OSError, RuntimeError):
            r.problem(
                where,
                f'The file "{name}" lies outside the input\'s folder; keep it beside the '
                "input (or in a folder below it), or allow files elsewhere with "
                "--files-anywhere.",
            )
            return None
    try:
        raw = read_bounded(target, MAX_CSV_BYTES)
    except FileReadError as exc:
        r.problem(where, f'The file "{name}" cannot be read: {exc.reason}')
        return None
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        r.problem(where, f'The file "{name}" is not UTF-8 text.')
        return None
    rows, lines = [], []
    for line_number, row in enumerate(csv.reader(text.splitlines()), start=1):
        if row and not row[0].startswith("#"):
            rows.append(row)
            lines.append(line_number)
    if len(rows) < 2:
        r.problem(where, f'The file "{name}" needs a header row and the curve points.')
        return None
    header = [re.match(r"^\s*([A-Za-z_]+)\s*(?:\[([^\]]*)\])?\s*$", h) for h in rows[0]]
    if not all(header):
        r.problem(
            where,
            f'The header of "{name}" must name its columns with units, such as '
            '"flow [L/s],head [m],efficiency [-],npsh_required [m]".',
        )
        return None
    names = [m.group(1) for m in header if m]
    unknown = [n for n in names if n not in _CURVE_COLUMNS]
    if unknown:
        r.problem(
            where,
            f'The columns {", ".join(unknown)} of "{name}" are not curve columns '
            f"({', '.join(_CURVE_COLUMNS)}).",
        )
        return None
    units = [(m.group(2) or "").strip() for m in header if m]
    columns: dict[str, list[str]] = {n: [] for n in names}
    for number, row in zip(lines[1:], rows[1:], strict=True):
        if len(row) != len(names):
            r.problem(
                where,
                f'Line {number} of "{name}" has {len(row)} values; the header has {len(names)}.',
            )
            return None
        for n, unit, cell in zip(names, units, row, strict=True):
            columns[n].append(
                f"{cell.strip()} {unit}".strip() if unit not in ("", "-") else cell.strip()
            )
    r.files.append(
        {"path": str(name), "sha256": hashlib.sha256(raw).hexdigest(), "role": "pump curve"}
    )
    r.file_bytes.append(raw)
    return columns


def _curve(r: _Reader, data: dict[str, Any], where: str = "pump") -> PumpCurve | None:
    path = f"{where}.curve"
    r.known_keys(data, path, _CURVE_KEYS)
    if "file" in data:
        inline = [key for key in _CURVE_COLUMNS if key in data]
        if inline:
            r.problem(
                f"{path}.file",
                "Give the curve points in the file or inline, not both "
                f"(also given inline: {', '.join(inline)}).",
            )
            return None
        columns = _curve_file(r, data["file"], where)
        if columns is None:
            return None
        data = {**data, **{k: _numbers(v) for k, v in columns.items()}}
    speed = r.quantity(data, "speed", path, "speed", positive=True)
    flow = _quantity_list(r, data, "flow", path, "flow")
    head = _quantity_list(r, data, "head", path, "length")
    efficiency = _quantity_list(r, data, "efficiency", path, "dimensionless")
    npsh = _quantity_list(r, data, "npsh_required", path, "length")
    power = _quantity_list(r, data, "power", path, "power")
    if power is not None and efficiency is not None:
        r.problem(
            f"{path}.power",
            "Give the curve's efficiency or its power, not both: the efficiency follows "
            "from the power.",
        )
    if power is not None and any(p.value <= 0.0 for p in power):
        r.problem(
            f"{path}.power",
            "Every power point must be greater than zero (a pump takes power at shutoff too).",
        )
    for key, value in (("flow", flow), ("head", head)):
        if value is None and key not in data:
            r.problem(f"{path}.{key}", f"The pump curve needs {key} points.")
    if flow is None or head is None:
        return None
    count = len(flow)
    if count > MAX_CURVE_POINTS:
        r.problem(
            f"{path}.flow", f"A pump curve is limited to {MAX_CURVE_POINTS} points; got {count}."
        )
        return None
    if count < MIN_CURVE_POINTS:
        r.problem(
            f"{path}.flow", f"A pump curve needs at least {MIN_CURVE_POINTS} points; got {count}."
        )
    for key, series in (
        ("head", head),
        ("efficiency", efficiency),
        ("npsh_required", npsh),
        ("power", power),
    ):
        if series is not None and len(series) != count:
            r.problem(
                f"{path}.{key}",
                f"Expected {count} values, one for each flow point; got {len(series)}.",
            )
    flows = [q.value for q in flow]
    if flows[0] < 0.0 or any(b <= a for a, b in itertools.pairwise(flows)):
        r.problem(
            f"{path}.flow", "The flow points must start at zero or more and increase strictly."
        )
    if any(h.value <= 0.0 for h in head):
        r.problem(f"{path}.head", "Every head point must be greater than zero.")
    if efficiency is not None and any(not 0.0 <= e.value <= 1.0 for e in efficiency):
        r.problem(f"{path}.efficiency", "Every efficiency must lie between 0 and 1.")
    if efficiency is not None and max(e.value for e in efficiency) <= 0.0:
        r.problem(f"{path}.efficiency", "The efficiency curve has no positive value.")
    if npsh is not None and any(n.value <= 0.0 for n in npsh):
        r.problem(f"{path}.npsh_required", "Every NPSH required must be greater than zero.")
    return PumpCurve(
        speed=speed,
        flow=flow,
        head=head,
        efficiency=efficiency or (),
        npsh_required=npsh or (),
        power=power or (),
    )
