"""TOML input → validated :class:`~calcreport.model.schema.Model`.

Loading reads the whole file and reports every problem at once in one
:class:`~calcreport.errors.InputError`: each problem names its key path
(``pipe[2].length``: the second ``[[pipe]]`` table) and, where it can be
found, its line in the file, with a message that is a full sentence. Keys
are checked against the format, with a suggestion for a misspelt one;
quantities against the kind their key expects; values against what is
physically meaningful. A last pass checks what needs physics: the liquid
must not boil at the pressure on an open surface, and a vacuum cannot go
below absolute zero pressure. That pass runs whenever the fluid, the site
and a vessel's pressure were read without a problem, so its findings are
listed with every other problem of the file.
"""

from __future__ import annotations

import datetime as dt
import difflib
import hashlib
import itertools
import math
import re
import tomllib
from dataclasses import replace
from pathlib import Path
from typing import Any

from calcreport import catalog
from calcreport.errors import FileReadError, InputError, Problem
from calcreport.files import read_bounded
from calcreport.model.schema import (
    Component,
    Criteria,
    Envelope,
    Fitting,
    Fluid,
    Given,
    Model,
    Operation,
    Pipe,
    Project,
    Pump,
    PumpCurve,
    Site,
    Surge,
    Vessel,
)
from calcreport.units import KINDS, UnitProblem, as_written, expected, parse

__all__ = ["load", "loads"]

FORMAT = 1
GLYCOLS = ("ethylene_glycol", "propylene_glycol")
# Other liquids from CoolProp (calcreport.physics.liquids), with their lowest and highest
# temperatures: the formulation's lower limit (about the triple point) and a service limit.
LIQUID_RANGES = {
    "methanol": (176.0, 423.15),
    "ethanol": (160.0, 423.15),
    "toluene": (179.0, 423.15),
    "benzene": (279.0, 423.15),
    "n_hexane": (178.0, 423.15),
    "n_heptane": (183.0, 423.15),
    "seawater": (273.15, 393.15),
}
FLUID_KINDS = ("water", *GLYCOLS, *LIQUID_RANGES, "custom")
# Glycol solutions: the property fits' range, kept inside liquid and unfrozen service.
GLYCOL_T_MIN = 253.15
GLYCOL_T_MAX = 373.15
# Flow order: the suction header, each pump's suction branch, its discharge branch, the
# discharge line. A branch carries one pump's flow.
SIDES = ("suction", "suction_branch", "discharge_branch", "discharge")
INLETS = ("submerged", "free")
UNIT_SYSTEMS = ("SI", "US")

# Water is handled by IAPWS-IF97 region 1 from the triple point to 350 degC.
WATER_T_MIN = 273.16
WATER_T_MAX = 623.15

_TOP_KEYS = {
    "format",
    "project",
    "fluid",
    "duty",
    "site",
    "source",
    "destination",
    "pump",
    "motor",
    "drive",
    "operation",
    "pipe",
    "criteria",
    "report",
    "revision",
    "envelope",
    "friction_method",
    "component",
    "surge",
    "fittings_method",
}
_ENVELOPE_KEYS = {"temperature", "flow_required", "roughness", "strainer_dirty_dp"}
_REPORT_KEYS = {"purpose", "exclusions", "cautions"}
_REVISION_KEYS = {"revision", "date", "description", "prepared_by", "checked_by"}
_PROJECT_KEYS = {
    "title",
    "client",
    "calc_id",
    "revision",
    "date",
    "prepared_by",
    "checked_by",
    "units",
}
_FLUID_KEYS = {
    "kind",
    "temperature",
    "mass_fraction",
    "density",
    "viscosity",
    "vapor_pressure",
    "name",
    "bulk_modulus",
}
_VESSEL_KEYS = {"level", "level_low", "level_high", "pressure"}
_DESTINATION_KEYS = _VESSEL_KEYS | {"inlet", "outlet_elevation"}
_PIPE_KEYS = {
    "id",
    "side",
    "length",
    "inner_diameter",
    "roughness",
    "fittings",
    "elevation_start",
    "elevation_end",
    "nominal_size",
    "schedule",
    "material",
    "hazen_williams_c",
    "wall_thickness",
    "elastic_modulus",
    "poisson_ratio",
    "pressure_rating",
    "restraint",
}
RESTRAINTS = ("anchored", "upstream_anchor", "expansion_joints")
_COMPONENT_KEYS = {"id", "at", "pressure_rating", "note"}
SURGE_EVENTS = ("pump_trip", "valve_closure")
_SURGE_KEYS = {"event", "closure_time", "pump_stop_time"}
FRICTION_METHODS = ("darcy_weisbach", "hazen_williams")
FITTINGS_METHODS = ("two_k", "three_k")
_FITTING_KEYS = {"K", "count", "note", "kind", "dp", "at_flow", "other_diameter", "angle", "at"}
# Fittings between two diameters: the coefficient follows from the diameters (Crane TP-410).
DIAMETER_CHANGES = ("expander", "reducer")
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
    *_PROVENANCE_KEYS,
}
_CURVE_KEYS = {"speed", "flow", "head", "efficiency", "npsh_required", "power", "file"}
_CURVE_COLUMNS = ("flow", "head", "efficiency", "npsh_required", "power")
MAX_CSV_BYTES = 200_000
MIN_CURVE_POINTS = 3
# Bounds on what one input may hold: far beyond any real system, small enough that a
# pasted or generated file cannot make a run take minutes or the report thousands of pages.
MAX_FILE_BYTES = 2_000_000
MAX_DEPTH = 16  # the format nests tables and arrays four deep at most
MAX_TEXT = 2_000
MAX_PIPES = 2_000
MAX_FITTINGS = 200
MAX_CURVE_POINTS = 200


class _Lines:
    """Where each key path stands in the TOML text (best effort)."""

    _HEADER = re.compile(r"^\s*(\[\[?)\s*([A-Za-z0-9_.\-]+)\s*\]\]?")
    _KEY = re.compile(r"^\s*([A-Za-z0-9_\-]+)\s*=")
    # Basic and literal strings on one line: blanked before looking for
    # brackets, braces and comments, which may stand inside a string.
    _STRING = re.compile(r'"(?:[^"\\]|\\.)*"|\'[^\']*\'')

    def __init__(self, text: str) -> None:
        self.at: dict[str, int] = {}
        counts: dict[str, int] = {}
        table = ""
        open_array: str | None = None
        element = 0
        for number, line in enumerate(text.splitlines(), start=1):
            code = self._STRING.sub('""', line).split("#", 1)[0]
            header = self._HEADER.match(code)
            if header and open_array is not None and not header.group(2)[:1].isalpha():
                header = None  # an array inside the open array, not a table header
            if header:
                open_array = None
                name = header.group(2)
                if header.group(1) == "[[":
                    counts[name] = counts.get(name, 0) + 1
                    table = f"{name}[{counts[name]}]"
                else:
                    parent, _, leaf = name.rpartition(".")
                    table = f"{self._resolve(parent, counts)}.{leaf}" if parent else name
                self.at.setdefault(table, number)
                continue
            key = self._KEY.match(code)
            if key and open_array is None:
                path = f"{table}.{key.group(1)}" if table else key.group(1)
                self.at.setdefault(path, number)
                rest = code[key.end() :]
                element = 0
                for _ in range(rest.count("{")):
                    element += 1
                    self.at.setdefault(f"{path}[{element}]", number)
                if rest.count("[") > rest.count("]"):
                    open_array = path
                continue
            if open_array is not None:
                for _ in range(code.count("{")):
                    element += 1
                    self.at.setdefault(f"{open_array}[{element}]", number)
                if code.count("]") > code.count("["):
                    open_array = None

    @staticmethod
    def _resolve(name: str, counts: dict[str, int]) -> str:
        return f"{name}[{counts[name]}]" if name in counts else name

    def line(self, path: str) -> int | None:
        while path:
            if path in self.at:
                return self.at[path]
            if f"{path}[1]" in self.at:  # an array of tables where a table belongs
                return self.at[f"{path}[1]"]
            cut = max(path.rfind("."), path.rfind("["))
            path = path[:cut] if cut > 0 else ""
        return None


class _Reader:
    """Reads values from parsed TOML, collecting every problem found."""

    def __init__(self, lines: _Lines, folder: Path | None = None, outside: bool = False) -> None:
        self.lines = lines
        self.problems: list[Problem] = []
        self.folder = folder or Path.cwd()
        self.outside = outside  # files the input names may lie outside its folder
        self.files: list[dict[str, str]] = []  # other files read: path and SHA-256

    def problem(self, key: str, message: str) -> None:
        self.problems.append(Problem(key, message, self.lines.line(key)))

    def count(self, prefix: str) -> int:
        """How many problems so far concern ``prefix`` or a key under it."""
        return sum(
            1
            for p in self.problems
            if p.key == prefix or p.key.startswith((f"{prefix}.", f"{prefix}["))
        )

    def table(
        self, data: dict[str, Any], key: str, path: str, required: bool
    ) -> dict[str, Any] | None:
        """The table at ``key``; None (reported when required) if absent or not a table."""
        value = data.get(key)
        if value is None:
            if required:
                self.problem(path, f"The table [{path}] is required but missing.")
            return None
        if not isinstance(value, dict):
            self.problem(
                path, f"Expected a table [{path}], got {_type(value)} {as_written(value)}."
            )
            return None
        return value

    def known_keys(self, data: dict[str, Any], path: str, allowed: set[str]) -> None:
        for key in data:
            if key in allowed:
                continue
            where = f"{path}.{key}" if path else key
            close = [k for k in sorted(allowed) if k.lower() == key.lower()] or [
                k
                for k in sorted(allowed)
                if k.lower()
                in difflib.get_close_matches(
                    key.lower(), [a.lower() for a in allowed], n=1, cutoff=0.6
                )
            ]
            if not path and isinstance(data[key], dict | list):
                what = f"table [{key}]"
                hint = f"; did you mean [{close[0]}]?" if close else "."
                known = ", ".join(f"[{k}]" for k in sorted(allowed) if k != "format")
                self.problem(where, f"Unknown {what}{hint} The known tables are {known}.")
                continue
            hint = f'; did you mean "{close[0]}"?' if close else "."
            known = ", ".join(sorted(allowed))
            self.problem(where, f'Unknown key "{key}"{hint} The known keys here are {known}.')

    def quantity(
        self,
        data: dict[str, Any],
        key: str,
        path: str,
        kind: str,
        *,
        required: bool = False,
        positive: bool = False,
        fraction: bool = False,
    ) -> Given | None:
        where = f"{path}.{key}"
        if key not in data:
            if required:
                self.problem(where, f"The required key {key} is missing; give {expected(kind)}.")
            return None
        try:
            value = parse(data[key], kind)
        except UnitProblem as exc:
            self.problem(where, f"{exc}")
            return None
        shown = as_written(data[key])
        if positive and value <= 0.0:
            self.problem(where, f"The value must be greater than zero; got {shown}.")
            return None
        if fraction and not 0.0 < value <= 1.0:
            self.problem(
                where,
                f"The value must be a fraction greater than 0 and at most 1 "
                f'(such as 0.72 or "72 %"); got {shown}.',
            )
            return None
        return Given(value, KINDS[kind].si, where)

    def text(
        self,
        data: dict[str, Any],
        key: str,
        path: str,
        default: str,
        choices: tuple[str, ...] | None = None,
    ) -> str:
        where = f"{path}.{key}" if path else key
        value = data.get(key, default)
        if isinstance(value, dt.date | dt.time):
            value = value.isoformat()
        if not isinstance(value, str):
            self.problem(
                where, f"Expected text in double quotes, got {_type(value)} {as_written(value)}."
            )
            return default
        if len(value) > MAX_TEXT:
            self.problem(
                where, f"The text has {len(value):,} characters; at most {MAX_TEXT:,} are accepted."
            )
            return default
        if choices is not None and value not in choices:
            close = difflib.get_close_matches(value, choices, n=1, cutoff=0.5)
            hint = f'; did you mean "{close[0]}"?' if close else "."
            self.problem(
                where, f"The value {as_written(value)} is not one of {_one_of(choices)}{hint}"
            )
            return default
        return value


def load(path: str | Path, files_anywhere: bool = False) -> Model:
    """Read and validate the input file at ``path``; the files it names (a curve file) lie
    in its folder or below it unless ``files_anywhere``."""
    try:
        raw = read_bounded(path, MAX_FILE_BYTES)
    except FileReadError as exc:
        raise InputError(
            [Problem("<file>", f"The input file cannot be read: {exc.reason}")], str(path)
        ) from None
    return loads(raw, str(path), files_anywhere)


def loads(raw: bytes, path: str = "<input>", files_anywhere: bool = False) -> Model:
    """Validate the bytes of an input file; ``path`` names it in messages."""
    if len(raw) > MAX_FILE_BYTES:
        raise InputError(
            [
                Problem(
                    "<file>",
                    f"The file has {len(raw):,} bytes; an input is "
                    f"limited to {MAX_FILE_BYTES:,} bytes.",
                )
            ],
            path,
        )
    try:
        text = raw.decode("utf-8-sig")  # a byte-order mark, as some editors write, is dropped
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise InputError(
            [
                Problem(
                    "<file>",
                    f"The file is not UTF-8 text: byte {exc.start} (0x"
                    f"{raw[exc.start]:02x}) cannot be decoded; save the file as UTF-8.",
                    line,
                )
            ],
            path,
        ) from exc
    try:
        data = tomllib.loads(text)
    except RecursionError:
        raise InputError(
            [Problem("<toml>", f"The file nests arrays or tables more than {MAX_DEPTH} deep.")],
            path,
        ) from None
    except tomllib.TOMLDecodeError as exc:
        found = re.search(r"line (\d+)", str(exc))
        line = int(found.group(1)) if found else None
        reason = str(exc)
        reason = reason[:1].lower() + reason[1:]
        raise InputError(
            [Problem("<toml>", f"The file is not valid TOML: {reason}.", line)], path
        ) from exc
    if _depth(data) > MAX_DEPTH:
        raise InputError(
            [Problem("<toml>", f"The file nests arrays or tables more than {MAX_DEPTH} deep.")],
            path,
        )
    folder = Path(path).parent if path and not path.startswith("<") else None
    reader = _Reader(_Lines(text), folder, files_anywhere)
    model = _build(reader, data, text, hashlib.sha256(raw).hexdigest(), path)
    if reader.problems:
        raise InputError(reader.problems, path)
    assert model is not None
    return model


def _depth(data: Any) -> int:
    """How deep arrays and tables nest in ``data`` (counted without recursion)."""
    deepest, stack = 0, [(data, 1)]
    while stack:
        value, depth = stack.pop()
        deepest = max(deepest, depth)
        if depth > MAX_DEPTH:
            break
        if isinstance(value, dict):
            stack += [(v, depth + 1) for v in value.values()]
        elif isinstance(value, list):
            stack += [(v, depth + 1) for v in value]
    return deepest


def _build(r: _Reader, data: dict[str, Any], text: str, sha: str, path: str) -> Model | None:
    r.known_keys(data, "", _TOP_KEYS)
    fmt = data.get("format", FORMAT)
    if fmt != FORMAT or isinstance(fmt, bool):
        r.problem("format", f"This version reads input format {FORMAT}; got {as_written(fmt)}.")

    project = _project(
        r,
        r.table(data, "project", "project", required=False) or {},
        r.table(data, "report", "report", required=False) or {},
        data.get("revision"),
    )
    fluid = _fluid(r, r.table(data, "fluid", "fluid", required=True))

    duty = r.table(data, "duty", "duty", required=True)
    flow = None
    flow_range = None
    if duty is not None:
        r.known_keys(duty, "duty", {"flow", "flow_range"})
        flow = r.quantity(duty, "flow", "duty", "flow", required=True, positive=True)
        flow_range = _flow_range(r, duty, flow)

    site_data = r.table(data, "site", "site", required=False) or {}
    r.known_keys(site_data, "site", {"elevation", "station_pressure"})
    site = Site(
        elevation=r.quantity(site_data, "elevation", "site", "length"),
        station_pressure=r.quantity(
            site_data, "station_pressure", "site", "pressure", positive=True
        ),
    )
    if site.elevation and site.station_pressure:
        r.problem(
            "site.station_pressure",
            "Give either site.elevation or site.station_pressure, not both.",
        )

    source = _vessel(r, r.table(data, "source", "source", required=True), "source")
    destination = _vessel(
        r, r.table(data, "destination", "destination", required=True), "destination"
    )

    pump_data = r.table(data, "pump", "pump", required=True)
    pump = _pump(r, pump_data) if pump_data is not None else None
    motor = r.table(data, "motor", "motor", required=False) or {}
    r.known_keys(
        motor, "motor", {"efficiency", "efficiency_class", "derating", "ambient_temperature"}
    )
    motor_derating = r.quantity(motor, "derating", "motor", "dimensionless", fraction=True)
    motor_ambient = r.quantity(motor, "ambient_temperature", "motor", "temperature")
    motor_class = (
        r.text(motor, "efficiency_class", "motor", "", MOTOR_CLASSES)
        if ("efficiency_class" in motor)
        else ""
    )
    if motor_class and "efficiency" in motor:
        r.problem(
            "motor.efficiency_class",
            "Give the motor's efficiency or its efficiency class, not both.",
        )
    if motor_class and pump and (pump.curve is None or project.units != "SI"):
        r.problem(
            "motor.efficiency_class",
            "The class table holds IEC ratings: it needs a pump curve (to select the "
            "rating) and an SI report (IEC kW series); otherwise give motor.efficiency.",
        )
    drive = r.table(data, "drive", "drive", required=False) or {}
    r.known_keys(drive, "drive", {"efficiency"})

    operation = _operation(r, r.table(data, "operation", "operation", required=False) or {})
    pipes = _pipes(r, data.get("pipe"))
    criteria = _criteria(r, r.table(data, "criteria", "criteria", required=False) or {})
    envelope = _envelope(r, r.table(data, "envelope", "envelope", required=False) or {}, fluid)
    if operation.control != "on_off" and pump and pump.curve is None:
        r.problem(
            "operation.control",
            f'Control "{operation.control}" moves along the pump curve: give [pump.curve].',
        )
    elif operation.control == "variable_speed" and pump and pump.curve:
        if pump.curve.speed is None:
            r.problem(
                "pump.curve.speed",
                "Variable-speed control scales the curve by the affinity laws: give the "
                "speed of the curve data.",
            )
        if not (pump.curve.efficiency or pump.curve.power) and pump.efficiency is None:
            r.problem(
                "pump.curve.efficiency",
                "Variable-speed energy needs the pump efficiency: give the curve's efficiency.",
            )
    if envelope.strainer_dirty_dp and pipes and not any(p.line == "suction" for p in pipes):
        r.problem(
            "envelope.strainer_dirty_dp",
            "A dirty-strainer case needs a suction pipe to hold the strainer.",
        )
    components = _components(r, data.get("component"), pipes)
    surge = _surge(r, data)
    friction_method = r.text(data, "friction_method", "", "darcy_weisbach", FRICTION_METHODS)
    fittings_method = r.text(data, "fittings_method", "", "two_k", FITTINGS_METHODS)
    if fittings_method == "three_k":
        three = catalog.fittings_three_k()
        for pipe in pipes:
            for ft in pipe.fittings:
                method = catalog.fittings().get(ft.kind, {}).get("method")
                if method == "hooper_2k" and ft.kind not in three:
                    r.problem(
                        f"{ft.key}.kind",
                        f'The fitting "{ft.kind}" has no three-K constants in the source; '
                        'give its K, or use fittings_method = "two_k".',
                    )
    if envelope.roughness and friction_method == "hazen_williams":
        r.problem(
            "envelope.roughness",
            "An aged-pipe case changes the roughness, which the Hazen-Williams method does "
            'not use; use friction_method = "darcy_weisbach".',
        )
    if friction_method == "hazen_williams":
        if fluid is not None and fluid.kind != "water":
            r.problem(
                "friction_method",
                "The Hazen-Williams formula holds for water only; use "
                '"darcy_weisbach" for this liquid.',
            )
        for pipe in pipes:
            if pipe.hazen_williams_c is None:
                r.problem(
                    f"{pipe.key}.hazen_williams_c",
                    "With friction_method = "
                    '"hazen_williams" every pipe needs its C: give hazen_williams_c or a '
                    "material with a tabulated C.",
                )

    motor_efficiency = r.quantity(motor, "efficiency", "motor", "dimensionless", fraction=True)
    drive_efficiency = r.quantity(drive, "efficiency", "drive", "dimensionless", fraction=True)

    # The physical checks need a fluid and a site read without a problem; each vessel
    # is checked when its surface pressure was read without one.
    vessels = [v for v in (source, destination) if v and r.count(f"{v.role}.pressure") == 0]
    if fluid and vessels and r.count("fluid") == 0 and r.count("site") == 0:
        for temperature in (fluid.temperature, *envelope.temperatures):
            _physical_checks(r, replace(fluid, temperature=temperature), site, vessels)

    if r.problems or None in (fluid, flow, source, destination, pump):
        return None
    return Model(
        path=path,
        sha256=sha,
        text=text,
        files=tuple(r.files),
        project=project,
        envelope=envelope,
        friction_method=friction_method,
        fittings_method=fittings_method,
        fluid=fluid,  # type: ignore[arg-type]
        flow=flow,  # type: ignore[arg-type]
        flow_range=flow_range,
        site=site,
        source=source,  # type: ignore[arg-type]
        destination=destination,  # type: ignore[arg-type]
        pump=pump,  # type: ignore[arg-type]
        motor_efficiency=motor_efficiency,
        drive_efficiency=drive_efficiency,
        operation=operation,
        pipes=pipes,
        criteria=criteria,
        components=components,
        surge=surge,
        motor_class=motor_class,
        motor_derating=motor_derating,
        motor_ambient=motor_ambient,
    )


def _envelope(r: _Reader, data: dict[str, Any], fluid: Fluid | None) -> Envelope:
    """Ranges the operating cases are built from: liquid temperature and required flow."""
    r.known_keys(data, "envelope", _ENVELOPE_KEYS)
    roughness = None
    if isinstance(data.get("roughness"), str) and data["roughness"].strip() == "aged":
        r.problem(
            "envelope.roughness",
            'Give the aged roughness as a length, such as "0.5 mm", on the project\'s '
            "stated basis: the catalog holds new-pipe roughness only, with no published "
            "ageing rate to apply.",
        )
    else:
        roughness = r.quantity(data, "roughness", "envelope", "roughness", positive=True)
    dirty = r.quantity(data, "strainer_dirty_dp", "envelope", "pressure", positive=True)
    temperatures = _quantity_list(r, data, "temperature", "envelope", "temperature") or ()
    if temperatures and len(temperatures) != 2:
        r.problem(
            "envelope.temperature",
            "Expected the lowest and the highest liquid "
            'temperature, such as ["5 degC", "30 degC"].',
        )
        temperatures = ()
    if temperatures and temperatures[0].value > temperatures[1].value:
        r.problem("envelope.temperature", "Give the lowest temperature first.")
        temperatures = ()
    if temperatures and fluid is not None and fluid.kind == "custom":
        r.problem(
            "envelope.temperature",
            "A custom liquid has fixed properties; a temperature range needs a liquid "
            "whose properties are computed (water, a glycol or a catalog liquid).",
        )
        temperatures = ()
    if temperatures and fluid is not None and fluid.kind in LIQUID_RANGES:
        low, high = LIQUID_RANGES[fluid.kind]
        for t in temperatures:
            if not low <= t.value <= high:
                r.problem(
                    t.key,
                    f"This liquid is computed from {low - 273.15:.4g} degC to "
                    f"{high - 273.15:.4g} degC.",
                )
                temperatures = ()
    if temperatures and fluid is not None and fluid.kind == "water":
        for t in temperatures:
            if not WATER_T_MIN <= t.value <= WATER_T_MAX:
                r.problem(t.key, "Liquid water is computed from 0.01 degC to 350 degC.")
                temperatures = ()
    flows = _quantity_list(r, data, "flow_required", "envelope", "flow") or ()
    if any(q.value <= 0.0 for q in flows):
        r.problem("envelope.flow_required", "Every required flow must be greater than zero.")
        flows = ()
    return Envelope(
        temperatures=tuple(temperatures),
        flows=tuple(flows),
        roughness=roughness,
        strainer_dirty_dp=dirty,
    )


def _numbers(cells: list[str]) -> list[Any]:
    """CSV cells as TOML would give them: bare numbers as floats, quantities as text."""
    out: list[Any] = []
    for cell in cells:
        try:
            out.append(float(cell))
        except ValueError:
            out.append(cell)
    return out


def _pump(r: _Reader, data: dict[str, Any]) -> Pump | None:
    r.known_keys(data, "pump", _PUMP_KEYS)
    elevation = r.quantity(data, "elevation", "pump", "length", required=True)
    efficiency = r.quantity(data, "efficiency", "pump", "dimensionless", fraction=True)
    speed = r.quantity(data, "speed", "pump", "speed", positive=True)
    curve = None
    if "curve" in data:
        curve_data = r.table(data, "curve", "pump.curve", required=True)
        curve = _curve(r, curve_data) if curve_data is not None else None
    if speed and curve and curve.speed is None:
        r.problem(
            "pump.curve.speed",
            "With pump.speed given, give the speed of the curve "
            "data too, so the curve can be moved by the affinity laws.",
        )
    if speed and not curve:
        r.problem("pump.speed", "pump.speed moves a pump curve; give [pump.curve] as well.")
    ranges = {}
    for key in ("preferred_range", "allowable_range"):
        if key in data:
            ranges[key] = _fraction_pair(r, data[key], f"pump.{key}")
    provenance = {key: r.text(data, key, "pump", "") for key in _PROVENANCE_KEYS if key in data}
    minimum = r.quantity(data, "min_continuous_flow", "pump", "flow", positive=True)
    speed_range = None
    if "speed_range" in data:
        speeds = _quantity_list(r, data, "speed_range", "pump", "speed")
        if speeds is not None and len(speeds) != 2:
            r.problem(
                "pump.speed_range",
                'Give the lowest and the highest speed, such as ["1800 rpm", "2950 rpm"].',
            )
        elif speeds is not None and speeds[0].value >= speeds[1].value:
            r.problem("pump.speed_range", "Give the lowest speed first.")
        elif speeds is not None:
            speed_range = (speeds[0], speeds[1])
            if curve is None or curve.speed is None:
                r.problem(
                    "pump.speed_range",
                    "A speed range moves the pump curve: give [pump.curve] with its speed.",
                )
    basis = r.text(data, "efficiency_basis", "pump", "pump", EFFICIENCY_BASES)
    if basis == "overall" and curve and curve.power:
        r.problem(
            "pump.efficiency_basis",
            "A power curve gives the shaft power, so its efficiency is the pump's own: "
            'use efficiency_basis = "pump" (the default).',
        )
    count = _whole(r, data, "count", 1, MAX_PUMPS)
    standby = _whole(r, data, "standby", 0, MAX_PUMPS - 1)
    arrangement = r.text(data, "arrangement", "pump", "parallel", ARRANGEMENTS)
    if standby and standby.value >= (count.value if count else 1.0):
        r.problem(
            "pump.standby",
            "At least one pump must remain in service: pump.standby must be less than pump.count.",
        )
    if count and count.value > 1 and curve is None:
        r.problem(
            "pump.count",
            "Several pumps need their curve: give [pump.curve] for one "
            "pump, so the combined curve can be built.",
        )
    rating = r.quantity(data, "pressure_rating", "pump", "pressure", positive=True)
    stages = _whole(r, data, "stages", 1, 30)
    impeller = r.text(data, "impeller", "pump", "single_suction", IMPELLERS)
    if elevation is None:
        return None
    return Pump(
        stages=stages,
        impeller=impeller,
        pressure_rating=rating,
        count=count or Given(1.0, "", "pump.count"),
        standby=standby or Given(0.0, "", "pump.standby"),
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


def _whole(r: _Reader, data: dict[str, Any], key: str, low: int, high: int) -> Given | None:
    """A whole number of pumps between ``low`` and ``high``."""
    where = f"pump.{key}"
    if key not in data:
        return None
    raw = data[key]
    if isinstance(raw, bool) or not isinstance(raw, int) or not low <= raw <= high:
        r.problem(where, f"Expected a whole number from {low} to {high}; got {as_written(raw)}.")
        return None
    return Given(float(raw), "", where)


def _fraction_pair(r: _Reader, raw: Any, path: str) -> tuple[Given, Given] | None:
    if not (isinstance(raw, list) and len(raw) == 2):
        r.problem(
            path,
            f"Expected two fractions of the BEP flow, such as [0.7, 1.2]; got {as_written(raw)}.",
        )
        return None
    values = []
    for i, item in enumerate(raw, start=1):
        try:
            values.append(Given(parse(item, "dimensionless"), "", f"{path}[{i}]"))
        except UnitProblem as exc:
            r.problem(f"{path}[{i}]", str(exc))
    if len(values) != 2:
        return None
    if not 0.0 < values[0].value < 1.0 < values[1].value:
        r.problem(
            path,
            "Expected a range around the BEP flow: a lower fraction below 1 and "
            "an upper fraction above 1, such as [0.7, 1.2].",
        )
        return None
    return values[0], values[1]


def _quantity_list(
    r: _Reader, data: dict[str, Any], key: str, path: str, kind: str
) -> tuple[Given, ...] | None:
    """An array of quantities: strings with units, or { unit = "...", values = [...] }."""
    where = f"{path}.{key}"
    raw = data.get(key)
    if raw is None:
        return None
    unit = None
    if isinstance(raw, dict):
        r.known_keys(raw, where, {"unit", "values"})
        unit, raw = raw.get("unit"), raw.get("values")
        if not isinstance(unit, str) and kind != "dimensionless":
            r.problem(
                where, 'Give the unit of the values, such as { unit = "L/s", values = [0, 8, 16] }.'
            )
            return None
    if not isinstance(raw, list) or not raw:
        r.problem(where, f"Expected an array of values; got {as_written(raw)}.")
        return None
    values = []
    for i, item in enumerate(raw, start=1):
        text = (
            f"{item} {unit}"
            if unit and isinstance(item, int | float) and not isinstance(item, bool)
            else item
        )
        try:
            values.append(Given(parse(text, kind), KINDS[kind].si, f"{where}[{i}]"))
        except UnitProblem as exc:
            r.problem(f"{where}[{i}]", str(exc))
    return tuple(values) if len(values) == len(raw) else None


def _curve_file(r: _Reader, name: Any) -> dict[str, list[str]] | None:
    """Curve columns from a CSV file named relative to the input (``flow [L/s]``, ...)."""
    import csv

    where = "pump.curve.file"
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
    return columns


def _curve(r: _Reader, data: dict[str, Any]) -> PumpCurve | None:
    path = "pump.curve"
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
        columns = _curve_file(r, data["file"])
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


def _project(r: _Reader, data: dict[str, Any], report: dict[str, Any], revisions: Any) -> Project:
    r.known_keys(data, "project", _PROJECT_KEYS)
    defaults = Project()
    values = {
        key: r.text(data, key, "project", getattr(defaults, key))
        for key in _PROJECT_KEYS
        if key != "units"
    }
    units = r.text(data, "units", "project", "SI", UNIT_SYSTEMS)
    r.known_keys(report, "report", _REPORT_KEYS)
    lists = {key: _texts(r, report, key) for key in ("exclusions", "cautions")}
    history = []
    if revisions is not None:
        if not isinstance(revisions, list) or not all(isinstance(x, dict) for x in revisions):
            r.problem("revision", "Expected [[revision]] tables, one per issued revision.")
        else:
            for i, row in enumerate(revisions, start=1):
                path = f"revision[{i}]"
                r.known_keys(row, path, _REVISION_KEYS)
                history.append({key: r.text(row, key, path, "") for key in sorted(_REVISION_KEYS)})
    return Project(
        units=units,
        purpose=r.text(report, "purpose", "report", ""),
        revisions=tuple(history),
        **lists,
        **values,
    )


def _texts(r: _Reader, data: dict[str, Any], key: str) -> tuple[str, ...]:
    raw = data.get(key, [])
    if not isinstance(raw, list) or not all(isinstance(item, str) for item in raw):
        r.problem(
            f"report.{key}",
            f'Expected an array of sentences, such as {key} = ["..."]; got {as_written(raw)}.',
        )
        return ()
    return tuple(raw)


def _fluid(r: _Reader, data: dict[str, Any] | None) -> Fluid | None:
    if data is None:
        return None
    r.known_keys(data, "fluid", _FLUID_KEYS)
    kind = r.text(data, "kind", "fluid", "water", FLUID_KINDS)
    temperature = r.quantity(data, "temperature", "fluid", "temperature", required=True)
    if temperature and kind == "water" and not WATER_T_MIN <= temperature.value <= WATER_T_MAX:
        r.problem(
            "fluid.temperature",
            "Liquid water is computed from 0.01 degC to 350 degC; got "
            f"{as_written(data['temperature'])}.",
        )
    custom = {
        key: r.quantity(data, key, "fluid", kind_, required=(kind == "custom"), positive=True)
        for key, kind_ in (
            ("density", "density"),
            ("viscosity", "viscosity"),
            ("vapor_pressure", "pressure"),
        )
    }
    if kind != "custom":
        for key in custom:
            if key in data:
                r.problem(
                    f"fluid.{key}",
                    f"The properties of {kind.replace('_', ' ')} come from its formulation; "
                    f'give fluid.{key} only with kind = "custom".',
                )
    fraction = None
    if kind in LIQUID_RANGES and temperature:
        low, high = LIQUID_RANGES[kind]
        if not low <= temperature.value <= high:
            r.problem(
                "fluid.temperature",
                f"{kind.replace('_', '-').capitalize()} is computed from {low - 273.15:.4g} degC "
                f"to {high - 273.15:.4g} degC; got {as_written(data['temperature'])}.",
            )
    if kind == "seawater":
        fraction = r.quantity(
            data, "mass_fraction", "fluid", "dimensionless", required=True, positive=True
        )
        if fraction and fraction.value > 0.12:
            r.problem(
                "fluid.mass_fraction",
                "The salinity (mass fraction) must be at most 0.12, the range of the "
                "seawater fit; ocean water is about 0.035.",
            )
            fraction = None
        if fraction is None:
            return None
    elif kind in GLYCOLS:
        fraction = r.quantity(
            data, "mass_fraction", "fluid", "dimensionless", required=True, positive=True
        )
        if fraction and fraction.value > 0.6:
            r.problem(
                "fluid.mass_fraction",
                "The glycol mass fraction must be at most 0.6 "
                "(60 %), the range of the property fits.",
            )
            fraction = None
        if temperature and not GLYCOL_T_MIN <= temperature.value <= GLYCOL_T_MAX:
            r.problem(
                "fluid.temperature",
                "Glycol solutions are computed from -20 degC to "
                f"100 degC; got {as_written(data['temperature'])}.",
            )
    elif "mass_fraction" in data:
        r.problem(
            "fluid.mass_fraction",
            'The key mass_fraction applies to kind = "ethylene_glycol", "propylene_glycol" '
            'or "seawater".',
        )
    bulk_modulus = r.quantity(data, "bulk_modulus", "fluid", "modulus", positive=True)
    if temperature is None or (kind in GLYCOLS and fraction is None):
        return None
    return Fluid(
        bulk_modulus=bulk_modulus,
        kind=kind,
        temperature=temperature,
        name=r.text(data, "name", "fluid", ""),
        mass_fraction=fraction,
        **custom,
    )


def _flow_range(r: _Reader, duty: dict[str, Any], flow: Given | None) -> tuple[Given, Given] | None:
    if "flow_range" not in duty:
        return None
    raw = duty["flow_range"]
    if not isinstance(raw, list) or len(raw) != 2:
        r.problem(
            "duty.flow_range",
            f'Expected an array of two flows, such as ["0 L/s", "35 L/s"]; got {as_written(raw)}.',
        )
        return None
    ends = []
    for i, value in enumerate(raw):
        try:
            ends.append(Given(parse(value, "flow"), "m^3/s", f"duty.flow_range[{i + 1}]"))
        except UnitProblem as exc:
            r.problem(f"duty.flow_range[{i + 1}]", str(exc))
    if len(ends) != 2:
        return None
    low, high = ends
    if low.value < 0.0 or high.value <= low.value:
        r.problem(
            "duty.flow_range",
            "The first flow must be zero or more and the second greater than the first.",
        )
        return None
    if flow and not low.value <= flow.value <= high.value:
        r.problem("duty.flow_range", "The range must contain duty.flow.")
        return None
    return low, high


def _vessel(r: _Reader, data: dict[str, Any] | None, role: str) -> Vessel | None:
    if data is None:
        return None
    allowed = _DESTINATION_KEYS if role == "destination" else _VESSEL_KEYS | {"intake_diameter"}
    r.known_keys(data, role, allowed)
    level = r.quantity(data, "level", role, "length", required=True)
    low = r.quantity(data, "level_low", role, "length")
    high = r.quantity(data, "level_high", role, "length")
    if level and low and low.value > level.value:
        r.problem(f"{role}.level_low", f"The lowest level must not be above {role}.level.")
    if level and high and high.value < level.value:
        r.problem(f"{role}.level_high", f"The highest level must not be below {role}.level.")
    saturation = data.get("pressure") == "saturation"
    pressure = None
    if not saturation:
        pressure = r.quantity(data, "pressure", role, "pressure") or Given(
            0.0, "Pa", f"{role}.pressure"
        )
    inlet = r.text(data, "inlet", role, "submerged", INLETS) if role == "destination" else ""
    outlet = r.quantity(data, "outlet_elevation", role, "length") if role == "destination" else None
    if inlet == "free" and outlet is None and "outlet_elevation" not in data:
        r.problem(
            f"{role}.outlet_elevation",
            'A free discharge (inlet = "free") needs the outlet centreline elevation; '
            'give outlet_elevation, such as "24 m".',
        )
    if inlet == "submerged" and outlet is not None:
        r.problem(
            f"{role}.outlet_elevation", 'The key outlet_elevation applies only to inlet = "free".'
        )
    intake = r.quantity(data, "intake_diameter", role, "diameter", positive=True)
    if level is None:
        return None
    return Vessel(
        intake_diameter=intake,
        role=role,
        level=level,
        level_low=low,
        level_high=high,
        pressure=pressure,
        saturation=saturation,
        inlet=inlet or "submerged",
        outlet_elevation=outlet,
    )


_OPERATION_KEYS = {
    "hours_per_year",
    "annual_volume",
    "energy_price",
    "currency",
    "demand_charge",
    "life_years",
    "discount_rate",
    "control",
    "profile",
}
CONTROLS = ("on_off", "throttled", "variable_speed")
MAX_PROFILE_POINTS = 50


def _operation(r: _Reader, data: dict[str, Any]) -> Operation:
    r.known_keys(data, "operation", _OPERATION_KEYS)
    hours = r.quantity(data, "hours_per_year", "operation", "dimensionless", positive=True)
    if hours and hours.value > 8784.0:
        r.problem("operation.hours_per_year", "A year has at most 8784 hours.")
    volume = r.quantity(data, "annual_volume", "operation", "volume", positive=True)
    if hours and volume:
        r.problem(
            "operation.annual_volume",
            "Give hours_per_year (continuous duty) or annual_volume (fill duty), not both.",
        )
    price = r.quantity(data, "energy_price", "operation", "dimensionless")
    if price and price.value < 0.0:
        r.problem("operation.energy_price", "The energy price must not be negative.")
    demand = r.quantity(data, "demand_charge", "operation", "dimensionless")
    if demand and demand.value < 0.0:
        r.problem("operation.demand_charge", "The demand charge must not be negative.")
    life = r.quantity(data, "life_years", "operation", "dimensionless", positive=True)
    rate = r.quantity(data, "discount_rate", "operation", "dimensionless")
    if rate and not 0.0 <= rate.value < 1.0:
        r.problem(
            "operation.discount_rate",
            'Give the discount rate as a fraction per year, such as 0.05 or "5 %".',
        )
    if (life is None) != (rate is None):
        r.problem(
            "operation.life_years",
            "A life-cycle energy cost needs both life_years and discount_rate.",
        )
    control = r.text(data, "control", "operation", "on_off", CONTROLS)
    profile = _profile(r, data.get("profile"))
    if profile and (hours or volume):
        r.problem(
            "operation.profile",
            "A profile sets the hours at each flow; give it instead of hours_per_year or "
            "annual_volume.",
        )
    currency = r.text(data, "currency", "operation", "")
    if (price or demand) and not currency:
        r.problem("operation.currency", 'Give the currency of energy_price, such as "USD".')
    return Operation(
        hours_per_year=hours,
        energy_price=price,
        currency=currency,
        annual_volume=volume,
        demand_charge=demand,
        life_years=life,
        discount_rate=rate,
        control=control,
        profile=profile,
    )


def _profile(r: _Reader, raw: Any) -> tuple[tuple[Given, Given], ...]:
    """operation.profile: flows with the hours a year spent at each."""
    if raw is None:
        return ()
    where = "operation.profile"
    if not isinstance(raw, list) or not raw or not all(isinstance(p, dict) for p in raw):
        r.problem(
            where,
            'Expected a list of points such as [{ flow = "18 L/s", hours = 2000 }, ...].',
        )
        return ()
    if len(raw) > MAX_PROFILE_POINTS:
        r.problem(where, f"At most {MAX_PROFILE_POINTS} profile points are accepted.")
        return ()
    points = []
    for index, data in enumerate(raw, start=1):
        path = f"{where}[{index}]"
        r.known_keys(data, path, {"flow", "hours"})
        flow = r.quantity(data, "flow", path, "flow", required=True, positive=True)
        hours = r.quantity(data, "hours", path, "dimensionless", required=True, positive=True)
        if flow and hours:
            points.append((flow, hours))
    total = sum(h.value for _, h in points)
    if total > 8784.0:
        r.problem(where, f"The profile's hours add to {total:g}; a year has at most 8784.")
    return tuple(points)


def _pipes(r: _Reader, raw: Any) -> tuple[Pipe, ...]:
    if raw is None:
        r.problem("pipe", "At least one [[pipe]] table is required.")
        return ()
    if not isinstance(raw, list) or not all(isinstance(p, dict) for p in raw):
        r.problem("pipe", "Expected [[pipe]] tables, one for each pipe in flow order.")
        return ()
    if not raw:
        r.problem("pipe", "At least one [[pipe]] table is required.")
        return ()
    if len(raw) > MAX_PIPES:
        r.problem(
            "pipe",
            f"The input has {len(raw):,} pipes; at most {MAX_PIPES:,} are "
            "accepted (join segments of the same size and material).",
        )
        return ()
    pipes = []
    seen: dict[str, str] = {}
    for index, data in enumerate(raw, start=1):
        path = f"pipe[{index}]"
        r.known_keys(data, path, _PIPE_KEYS)
        ident = r.text(data, "id", path, f"P{index}")
        if not ident.strip():
            r.problem(f"{path}.id", "The pipe id must not be empty.")
        elif ident in seen:
            r.problem(
                f"{path}.id",
                f'The pipe id "{ident}" is already used by {seen[ident]}; '
                "give each pipe its own id.",
            )
        else:
            seen[ident] = path
        side = r.text(data, "side", path, "discharge", SIDES)
        if "side" not in data:
            r.problem(
                f"{path}.side", 'The required key side is missing; give "suction" or "discharge".'
            )
        length = r.quantity(data, "length", path, "length", required=True, positive=True)
        sources: dict[str, str] = {}
        diameter, catalog_wall = _catalog_diameter(r, data, path, sources)
        if diameter is None and "nominal_size" not in data:
            diameter = r.quantity(
                data, "inner_diameter", path, "diameter", required=True, positive=True
            )
        roughness = _catalog_roughness(r, data, path, sources)
        if roughness is None and "material" not in data:
            roughness = r.quantity(data, "roughness", path, "roughness", required=True)
        if roughness and roughness.value < 0.0:
            r.problem(
                f"{path}.roughness",
                f"The roughness must not be negative; got {as_written(data['roughness'])}.",
            )
            roughness = None
        elif roughness and diameter and roughness.value >= diameter.value:
            r.problem(
                f"{path}.roughness",
                "The roughness must be smaller than the inner "
                f"diameter ({diameter.value * 1e3:.6g} mm); got "
                f"{roughness.value * 1e3:.6g} mm.",
            )
        fittings = _fittings(r, data.get("fittings", []), path, length)
        material = _material_name(data)
        hw_c = r.quantity(data, "hazen_williams_c", path, "dimensionless", positive=True)
        if hw_c is None and material:
            if material in catalog.hazen_williams_c():
                value, source = catalog.hazen_williams_c()[material]
                hw_c = Given(value, "", f"catalog.hazen_williams_c[{material}]")
                sources["hazen_williams_c"] = f"C = {value:g} for {material}: {source}"
        wall, modulus, poisson = _wall(r, data, path, sources, diameter, catalog_wall, material)
        rating = r.quantity(data, "pressure_rating", path, "pressure", positive=True)
        restraint = r.text(data, "restraint", path, "", RESTRAINTS) if "restraint" in data else ""
        if restraint in ("anchored", "upstream_anchor") and poisson is None:
            r.problem(
                f"{path}.poisson_ratio",
                f"A restraint \"{restraint}\" needs the wall's Poisson's ratio: give "
                "poisson_ratio, or a material from the catalog.",
            )
        start = r.quantity(data, "elevation_start", path, "length")
        end = r.quantity(data, "elevation_end", path, "length")
        if ("elevation_start" in data) != ("elevation_end" in data):
            r.problem(
                f"{path}.elevation_end" if "elevation_start" in data else f"{path}.elevation_start",
                "Give both elevation_start and elevation_end, or neither.",
            )
        if length and diameter and roughness and "side" in data:
            pipes.append(
                Pipe(
                    key=path,
                    id=ident,
                    side=side,
                    length=length,
                    inner_diameter=diameter,
                    roughness=roughness,
                    fittings=fittings,
                    elevation_start=start,
                    elevation_end=end,
                    sources={k: v for k, v in sources.items() if k != "family"},
                    hazen_williams_c=hw_c,
                    wall_thickness=wall,
                    elastic_modulus=modulus,
                    poisson_ratio=poisson,
                    pressure_rating=rating,
                    restraint=restraint,
                )
            )
    for before, pipe in itertools.pairwise(pipes):
        if SIDES.index(pipe.side) < SIDES.index(before.side):
            r.problem(
                pipe.key + ".side",
                f'The {pipe.side.replace("_", " ")} pipe "{pipe.id}" is listed after the '
                f'{before.side.replace("_", " ")} pipe "{before.id}"; list the pipes in flow '
                "order: suction, suction branch, discharge branch, discharge.",
            )
    return tuple(pipes)


_MATERIAL_FAMILY = {
    "stainless_steel": "stainless",
    "copper": "copper",
    "drawn_tubing": "copper",
    "pvc": "pvc",
    "hdpe": "pe",
}


def _components(r: _Reader, raw: Any, pipes: tuple[Pipe, ...]) -> tuple[Component, ...]:
    """[[component]] tables: items on a pipe with their own pressure rating."""
    if raw is None:
        return ()
    if not isinstance(raw, list) or not all(isinstance(c, dict) for c in raw):
        r.problem("component", "Expected [[component]] tables, one for each rated item.")
        return ()
    ids = {p.id for p in pipes}
    found = []
    seen: dict[str, str] = {}
    for index, data in enumerate(raw, start=1):
        path = f"component[{index}]"
        r.known_keys(data, path, _COMPONENT_KEYS)
        ident = r.text(data, "id", path, f"item {index}")
        if ident in seen:
            r.problem(
                f"{path}.id",
                f'The component id "{ident}" is already used by {seen[ident]}; give each '
                "rated item an id of its own.",
            )
        elif ident == "casing" or ident.startswith("pipe."):
            r.problem(
                f"{path}.id",
                f'The component id "{ident}" is reserved (the pump casing and the pipes are '
                "rated under their own names); choose another.",
            )
        seen.setdefault(ident, path)
        at = r.text(data, "at", path, "")
        if "at" not in data:
            r.problem(f"{path}.at", 'Name the pipe the item is on, such as at = "D1".')
        elif ids and at not in ids:
            close = difflib.get_close_matches(at, sorted(ids), n=1)
            known = ", ".join(f'"{p.id}"' for p in pipes[:12]) + (", …" if len(pipes) > 12 else "")
            hint = f'; did you mean "{close[0]}"?' if close else f"; the pipes are {known}."
            r.problem(f"{path}.at", f'No pipe has the id "{at}"{hint}')
        rating = r.quantity(data, "pressure_rating", path, "pressure", required=True, positive=True)
        note = r.text(data, "note", path, "")
        if rating and at in ids:
            found.append(Component(path, ident, at, rating, note))
    return tuple(found)


def _surge(r: _Reader, data: dict[str, Any]) -> Surge | None:
    table = r.table(data, "surge", "surge", required=False)
    if table is None:
        return None
    r.known_keys(table, "surge", _SURGE_KEYS)
    event = r.text(table, "event", "surge", "pump_trip", SURGE_EVENTS)
    closure = r.quantity(table, "closure_time", "surge", "time", positive=True)
    if event == "valve_closure" and "closure_time" not in table:
        r.problem(
            "surge.closure_time",
            'A valve closure needs its closing time, such as closure_time = "5 s".',
        )
    if event == "pump_trip" and "closure_time" in table:
        r.problem(
            "surge.closure_time",
            'closure_time applies to event = "valve_closure"; for a pump trip give '
            "pump_stop_time, the time its flow takes to stop.",
        )
    stop = r.quantity(table, "pump_stop_time", "surge", "time", positive=True)
    return Surge(event, closure, stop)


def _material_name(data: dict[str, Any]) -> str:
    """The catalog's name of the pipe's material ("" when none is given or it is unknown:
    the roughness lookup reports that)."""
    from calcreport.catalog.pipes import CatalogLookupError
    from calcreport.catalog.pipes import roughness as _rough

    if not isinstance(data.get("material"), str):
        return ""
    try:
        return _rough(data["material"]).material
    except CatalogLookupError:
        return ""


# Catalog families whose wall material follows from the family alone.
_FAMILY_MATERIAL = {
    "steel": "commercial_steel",
    "stainless": "stainless_steel",
    "copper": "copper",
    "pvc": "pvc",
    "pe": "hdpe",
}


def _wall(
    r: _Reader,
    data: dict[str, Any],
    path: str,
    sources: dict[str, str],
    diameter: Given | None,
    catalog_wall: Given | None,
    material: str,
) -> tuple[Given | None, Given | None, Given | None]:
    """Wall thickness, elastic modulus and Poisson's ratio: as given, else from the catalog
    (by the pipe's catalog material, else its size family's)."""

    wall = r.quantity(data, "wall_thickness", path, "diameter", positive=True)
    if wall and catalog_wall:
        r.problem(
            f"{path}.wall_thickness",
            "The catalog size sets the wall; give wall_thickness only with inner_diameter.",
        )
    wall = wall or catalog_wall
    if wall and diameter and 2.0 * wall.value >= diameter.value:
        r.problem(
            f"{path}.wall_thickness",
            f"The wall ({wall.value * 1e3:.4g} mm) is implausibly thick for an inner diameter "
            f"of {diameter.value * 1e3:.4g} mm; give the wall thickness, not the outside diameter.",
        )
    modulus = r.quantity(data, "elastic_modulus", path, "modulus", positive=True)
    poisson = r.quantity(data, "poisson_ratio", path, "dimensionless", positive=True)
    if poisson and poisson.value >= 0.5:
        r.problem(f"{path}.poisson_ratio", "Poisson's ratio of a solid is below 0.5.")
    material = material or _FAMILY_MATERIAL.get(sources.get("family", ""), "")
    entry = catalog.elastic_moduli().get(material)
    if entry:
        base = f"catalog.pipe_elastic_modulus[{material}]"
        if modulus is None:
            modulus = Given(entry["E"], "Pa", f"{base}.E")
            sources["elastic_modulus"] = f"E = {entry['E'] / 1e9:g} GPa for {material}: "
            sources["elastic_modulus"] += entry["source"]
        if poisson is None:
            poisson = Given(entry["nu"], "", f"{base}.nu")
    return wall, modulus, poisson


def _catalog_diameter(
    r: _Reader, data: dict[str, Any], path: str, sources: dict[str, str]
) -> tuple[Given | None, Given | None]:
    """Inner diameter and wall from nominal_size + schedule (family from the material)."""
    from calcreport.catalog import pipes

    if "nominal_size" not in data and "schedule" not in data:
        return None, None
    if "inner_diameter" in data:
        r.problem(
            f"{path}.inner_diameter",
            "Give inner_diameter, or nominal_size with schedule, not both.",
        )
        return None, None
    if "nominal_size" not in data or "schedule" not in data:
        missing = "schedule" if "nominal_size" in data else "nominal_size"
        r.problem(
            f"{path}.{missing}",
            "A catalog pipe size needs both nominal_size and "
            'schedule, such as nominal_size = "6", schedule = "40".',
        )
        return None, None
    family = _MATERIAL_FAMILY.get(str(data.get("material", "")))
    try:
        size = pipes.resolve(data["nominal_size"], data["schedule"], family)
    except LookupError as exc:
        kind = getattr(exc, "kind", "nominal_size")
        r.problem(f"{path}.{'material' if kind == 'family' else kind}", str(exc))
        return None, None
    key = f"catalog.{size.table.removesuffix('.csv')}[{size.nominal_size} {size.schedule}]"
    minimum = (
        f" (minimum {size.min_wall_thickness * 1e3:.2f} mm)" if size.min_wall_thickness else ""
    )
    sources["inner_diameter"] = (
        f"{size.family} pipe NPS/DN {size.nominal_size}, {size.schedule}: OD "
        f"{size.outside_diameter * 1e3:.2f} mm, wall {size.wall_thickness * 1e3:.2f} mm"
        f"{minimum}; {size.bore_basis}; {size.published}"
    )
    sources["family"] = size.family
    return (
        Given(size.inner_diameter, "m", f"{key}.inner_diameter"),
        Given(size.wall_thickness, "m", f"{key}.wall_thickness"),
    )


def _catalog_roughness(
    r: _Reader, data: dict[str, Any], path: str, sources: dict[str, str]
) -> Given | None:
    from calcreport.catalog import pipes

    if "material" not in data:
        return None
    if "roughness" in data:
        r.problem(f"{path}.roughness", "Give roughness, or material, not both.")
        return None
    material = data["material"]
    if not isinstance(material, str):
        r.problem(f"{path}.material", f"Expected a material name; got {as_written(material)}.")
        return None
    try:
        found = pipes.roughness(material)
    except LookupError as exc:
        r.problem(f"{path}.material", str(exc))
        return None
    sources["roughness"] = f"{found.material} (new): {found.published}"
    return Given(found.value, "m", f"catalog.roughness[{found.material}]")


def _fittings(r: _Reader, raw: Any, pipe_path: str, length: Given | None) -> tuple[Fitting, ...]:
    path = f"{pipe_path}.fittings"
    if not isinstance(raw, list):
        r.problem(
            path,
            "Expected an array of inline tables, such as "
            f"[{{ K = 0.5, count = 1 }}]; got {_type(raw)} {as_written(raw)}.",
        )
        return ()
    if len(raw) > MAX_FITTINGS:
        r.problem(
            path,
            f"The pipe has {len(raw):,} fitting items; at most {MAX_FITTINGS} are "
            "accepted (give repeated fittings once with a count).",
        )
        return ()
    items = []
    for index, data in enumerate(raw, start=1):
        where = f"{path}[{index}]"
        if not isinstance(data, dict):
            r.problem(
                where,
                "Expected an inline table such as { K = 0.5, count = 1 }; got "
                f"{_type(data)} {as_written(data)}.",
            )
            continue
        r.known_keys(data, where, _FITTING_KEYS)
        count = r.quantity(data, "count", where, "dimensionless", positive=True)
        if count and count.value != math.floor(count.value):
            r.problem(
                f"{where}.count",
                f"The count must be a whole number; got {as_written(data['count'])}.",
            )
        K = r.quantity(data, "K", where, "dimensionless")
        if K and K.value < 0.0:
            r.problem(
                f"{where}.K", f"The K value must not be negative; got {as_written(data['K'])}."
            )
        dp = r.quantity(data, "dp", where, "pressure", positive=True)
        at_flow = r.quantity(data, "at_flow", where, "flow", positive=True)
        kind = r.text(data, "kind", where, "")
        kind = catalog.FITTING_ALIASES.get(kind, kind)  # an earlier name of the kind
        given = [name for name in ("K", "dp", "kind") if name in data]
        if len(given) != 1:
            found = f"got {' and '.join(given)}" if given else "got none of them"
            r.problem(where, f"Give exactly one of K, kind, or dp with at_flow; {found}.")
        elif kind in DIAMETER_CHANGES and "other_diameter" not in data:
            r.problem(
                f"{where}.other_diameter",
                f'A "{kind}" needs other_diameter, the inner diameter on its other side.',
            )
        elif kind and kind not in catalog.fittings() and kind not in DIAMETER_CHANGES:
            names = sorted([*catalog.fittings(), *DIAMETER_CHANGES])
            close = difflib.get_close_matches(kind, names, n=2, cutoff=0.5)
            hint = f" Did you mean {_one_of(tuple(close))}?" if close else ""
            r.problem(
                f"{where}.kind",
                f'The fitting kind "{kind}" is not in the fittings catalog.{hint} Known '
                f"kinds: {', '.join(names)}; or give K.",
            )
        if ("dp" in data) != ("at_flow" in data):
            r.problem(
                where,
                "A rated loss needs both dp and at_flow (the flow at which the loss dp was rated).",
            )
        other = r.quantity(data, "other_diameter", where, "diameter", positive=True)
        angle = r.quantity(data, "angle", where, "angle", positive=True)
        if (other or angle) and kind not in DIAMETER_CHANGES:
            r.problem(where, 'other_diameter and angle apply to kind = "expander" or "reducer".')
        if angle and angle.value > math.pi:
            r.problem(f"{where}.angle", "The included angle is at most 180 deg (sudden).")
        at, distance = _fitting_at(r, data, where, length)
        items.append(
            Fitting(
                key=where,
                count=count or Given(1.0, "", f"{where}.count"),
                K=K,
                dp=dp,
                at_flow=at_flow,
                kind=kind,
                note=r.text(data, "note", where, ""),
                other_diameter=other,
                angle=angle,
                at=at,
                distance=distance,
            )
        )
    return tuple(items)


def _fitting_at(
    r: _Reader, data: dict[str, Any], where: str, length: Given | None
) -> tuple[str, Given | None]:
    """Where along its pipe a fitting's loss is taken: "start", "end" or a distance."""
    if "at" not in data:
        return "", None
    raw = data["at"]
    if raw in ("start", "end"):
        return raw, None
    if not isinstance(raw, str) or not re.match(r"\s*[-+.\d]", raw):
        r.problem(
            f"{where}.at",
            f'Give "start", "end" or a distance along the pipe such as "120 m"; got '
            f"{as_written(raw)}.",
        )
        return "", None
    distance = r.quantity(data, "at", where, "length")
    if distance is None:
        return "", None
    if distance.value < 0.0 or (length is not None and distance.value > length.value):
        r.problem(
            f"{where}.at",
            "A fitting's distance along its pipe must lie between 0 and the pipe's length; got "
            f'{as_written(raw)}. Give "start", "end" or a length such as "120 m".',
        )
        return "", None
    return "along", distance


def _criteria(r: _Reader, data: dict[str, Any]) -> Criteria:
    defaults = catalog.criteria()
    r.known_keys(data, "criteria", set(defaults))
    given = {}
    for key in data:
        if key in defaults:
            value = r.quantity(data, key, "criteria", defaults[key]["kind"], positive=True)
            if value:
                given[key] = value
    return Criteria(given)


def _physical_checks(r: _Reader, fluid: Fluid, site: Site, vessels: list[Vessel]) -> None:
    """Checks that need the barometric pressure and the liquid's vapour pressure."""
    from calcreport.physics import atmosphere, water

    if site.station_pressure:
        p_baro = site.station_pressure.value
    else:
        elevation = site.elevation.value if site.elevation else 0.0
        try:
            p_baro = atmosphere.pressure(elevation)
        except ValueError as exc:
            r.problem("site.elevation", str(exc))
            return
    if fluid.kind == "water":
        p_v = water.saturation_pressure(fluid.temperature.value)
    elif fluid.kind in GLYCOLS:
        from calcreport.physics import glycol

        assert fluid.mass_fraction is not None
        low, high = glycol.valid_range(glycol.CODE[fluid.kind], fluid.mass_fraction.value)
        T = fluid.temperature
        if not low <= T.value <= high:
            r.problem(
                T.key,
                f"The {fluid.kind.replace('_', ' ')} solution at mass fraction "
                f"{fluid.mass_fraction.value:g} is computed from its freezing point, "
                f"{low - 273.15:.4g} degC, to {high - 273.15:.4g} degC; got "
                f"{T.value - 273.15:.4g} degC.",
            )
            return
        p_v = glycol.raoult_vapor_pressure(
            fluid.temperature.value,
            fluid.mass_fraction.value,
            glycol.MOLAR_MASS[glycol.CODE[fluid.kind]],
        )
    elif fluid.kind == "seawater":
        p_v = water.saturation_pressure(fluid.temperature.value)
    elif fluid.kind in LIQUID_RANGES:
        from calcreport.physics import liquids

        p_v = liquids.property_function(fluid.kind, "vapor_pressure")(fluid.temperature.value)
    else:
        assert fluid.vapor_pressure is not None
        p_v = fluid.vapor_pressure.value
    for vessel in vessels:
        if vessel.saturation or vessel.pressure is None:
            continue
        absolute = p_baro + vessel.pressure.value
        if absolute <= 0.0:
            r.problem(
                vessel.pressure.key,
                f"A vacuum of {-vessel.pressure.value / 1e3:.4g} kPa is below absolute "
                f"zero at this site, where the barometric pressure is "
                f"{p_baro / 1e3:.4g} kPa (absolute).",
            )
        elif fluid.kind in ("water", "seawater") and absolute > water.P_MAX:
            r.problem(
                vessel.pressure.key,
                f"Liquid water is computed up to {water.P_MAX / 1e6:.4g} MPa (absolute); the "
                f"{vessel.role} surface is at {absolute / 1e6:.4g} MPa.",
            )
        elif p_v > absolute:
            r.problem(
                "fluid.temperature",
                f"The liquid boils at the {vessel.role} surface: its vapour pressure "
                f"{p_v / 1e3:.4g} kPa exceeds the absolute surface pressure "
                f"{absolute / 1e3:.4g} kPa; lower the temperature, raise "
                f'{vessel.pressure.key}, or give pressure = "saturation".',
            )


def _one_of(choices: tuple[str, ...]) -> str:
    quoted = [f'"{c}"' for c in choices]
    return quoted[0] if len(quoted) == 1 else ", ".join(quoted[:-1]) + " or " + quoted[-1]


def _type(value: Any) -> str:
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "an array"
    if isinstance(value, str):
        return "text"
    if isinstance(value, int | float):
        return "a number"
    if isinstance(value, dt.date | dt.time):
        return "a date or time"
    return "a value"
