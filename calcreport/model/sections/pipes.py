"""The [[pipe]] and [[component]] tables: lengths, diameters (given or from the catalog by size
and schedule), roughness, walls and moduli, elevations, ratings, and each pipe's fittings.
"""

from __future__ import annotations

import difflib
import itertools
import math
import re
from typing import Any

from calcreport import catalog
from calcreport.catalog import materials
from calcreport.catalog.lookup import CatalogLookupError
from calcreport.model.schema import (
    Component,
    Fitting,
    Given,
    Pipe,
)
from calcreport.model.sections.reader import _one_of, _Reader, _type
from calcreport.units import as_written

# Flow order: the suction header, each pump's suction branch, its discharge branch, the
# discharge line. A branch carries one pump's flow.
SIDES = ("suction", "suction_branch", "discharge_branch", "discharge")
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
FRICTION_METHODS = ("darcy_weisbach", "hazen_williams")
FITTINGS_METHODS = ("two_k", "three_k")
_FITTING_KEYS = {"K", "count", "note", "kind", "dp", "at_flow", "other_diameter", "angle", "at"}
# Fittings between two diameters: the coefficient follows from the diameters (Crane TP-410).
DIAMETER_CHANGES = ("expander", "reducer")
MAX_PIPES = 2_000
MAX_FITTINGS = 200


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


def _material_name(data: dict[str, Any]) -> str:
    """The catalog's name of the pipe's material ("" when none is given or it is unknown:
    the roughness lookup reports that)."""
    if not isinstance(data.get("material"), str):
        return ""
    try:
        return materials.roughness(data["material"]).material
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
        found = materials.roughness(material)
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
