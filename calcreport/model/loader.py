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

One reader a part of the input in :mod:`calcreport.model.sections`: ``reader`` (the line map
and the reader that collects problems), ``project``, ``fluid``, ``vessels``, ``pump``,
``pipes`` and ``operation`` (operation, duty profile, envelope, surge, criteria).
"""

from __future__ import annotations

import hashlib
import re
import tomllib
from dataclasses import replace
from pathlib import Path
from typing import Any

from calcreport import catalog
from calcreport.errors import FileReadError, InputError, Problem
from calcreport.files import read_bounded
from calcreport.model.schema import (
    Model,
    Site,
)
from calcreport.model.sections.fluid import _fluid, _physical_checks
from calcreport.model.sections.operation import _criteria, _envelope, _operation, _surge
from calcreport.model.sections.pipes import FITTINGS_METHODS, FRICTION_METHODS, _components, _pipes
from calcreport.model.sections.project import _project
from calcreport.model.sections.pump import MOTOR_CLASSES, _pump
from calcreport.model.sections.reader import _Lines, _Reader
from calcreport.model.sections.study import _study
from calcreport.model.sections.vessels import _flow_range, _vessel
from calcreport.units import as_written

__all__ = ["load", "loads"]


FORMAT = 1

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
    "study",
}
# Bounds on what one input may hold: far beyond any real system, small enough that a
# pasted or generated file cannot make a run take minutes or the report thousands of pages.
MAX_FILE_BYTES = 2_000_000
MAX_DEPTH = 16  # the format nests tables and arrays four deep at most


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
    model = _build(reader, data, text, raw, path)
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


def _build(r: _Reader, data: dict[str, Any], text: str, raw: bytes, path: str) -> Model | None:
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
    study = None
    if (
        "study" in data
        and pump is not None
        and pump_data is not None
        and source is not None
        and destination is not None
        and not r.count("pump")
    ):
        study_data = r.table(data, "study", "study", required=True)
        if study_data is not None:
            study = _study(r, study_data, pump_data, pump, operation, pipes, source, destination)
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
        sha256=hashlib.sha256(raw).hexdigest(),
        text=text,
        raw=raw,
        files=tuple(r.files),
        file_bytes=tuple(r.file_bytes),
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
        study=study,
    )
