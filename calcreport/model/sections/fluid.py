"""The [fluid] table: the liquid's kind and temperature (with the range of each property
formulation), a glycol's mass fraction, a custom liquid's properties; and the physical
checks that need the liquid, the site and the vessels together.
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import (
    Fluid,
    Site,
    Vessel,
)
from calcreport.model.sections.reader import _Reader
from calcreport.physics import glycol, liquids, water
from calcreport.units import as_written

GLYCOLS = tuple(glycol.CODE)
FLUID_KINDS = ("water", *GLYCOLS, *liquids.T_RANGE, "custom")


def computed_range(kind: str) -> tuple[float, float] | None:
    """Temperatures [K] at which the properties of a liquid ``kind`` are computed, or None
    for a custom liquid (its properties are given, not computed)."""
    if kind == "water":
        return water.T_RANGE
    if kind in GLYCOLS:
        return glycol.T_RANGE
    return liquids.T_RANGE.get(kind)


def _within(value: float, bounds: tuple[float, float]) -> bool:
    return bounds[0] <= value <= bounds[1]


def range_text(low: float, high: float) -> str:
    """A temperature range [K] as the loader's messages print it."""
    return f"{low - 273.15:.4g} degC to {high - 273.15:.4g} degC"


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


def _fluid(r: _Reader, data: dict[str, Any] | None) -> Fluid | None:
    if data is None:
        return None
    r.known_keys(data, "fluid", _FLUID_KEYS)
    kind = r.text(data, "kind", "fluid", "water", FLUID_KINDS)
    temperature = r.quantity(data, "temperature", "fluid", "temperature", required=True)
    if temperature and kind == "water" and not _within(temperature.value, water.T_RANGE):
        r.problem(
            "fluid.temperature",
            f"Liquid water is computed from {range_text(*water.T_RANGE)}; got "
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
    if kind in liquids.T_RANGE and temperature:
        if not _within(temperature.value, liquids.T_RANGE[kind]):
            r.problem(
                "fluid.temperature",
                f"{kind.replace('_', '-').capitalize()} is computed from "
                f"{range_text(*liquids.T_RANGE[kind])}; got {as_written(data['temperature'])}.",
            )
    if kind == "seawater":
        fraction = r.quantity(
            data, "mass_fraction", "fluid", "dimensionless", required=True, positive=True
        )
        if fraction and fraction.value > liquids.SALINITY_MAX:
            r.problem(
                "fluid.mass_fraction",
                f"The salinity (mass fraction) must be at most {liquids.SALINITY_MAX:g}, the "
                "range of the "
                "seawater fit; ocean water is about 0.035.",
            )
            fraction = None
        if fraction is None:
            return None
    elif kind in GLYCOLS:
        fraction = r.quantity(
            data, "mass_fraction", "fluid", "dimensionless", required=True, positive=True
        )
        if fraction and fraction.value > glycol.MAX_FRACTION:
            r.problem(
                "fluid.mass_fraction",
                f"The glycol mass fraction must be at most {glycol.MAX_FRACTION:g} "
                f"({glycol.MAX_FRACTION * 100:g} %), the range of the property fits.",
            )
            fraction = None
        if temperature and not _within(temperature.value, glycol.T_RANGE):
            r.problem(
                "fluid.temperature",
                f"Glycol solutions are computed from {range_text(*glycol.T_RANGE)}; got "
                f"{as_written(data['temperature'])}.",
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


def _physical_checks(r: _Reader, fluid: Fluid, site: Site, vessels: list[Vessel]) -> None:
    """Checks that need the barometric pressure and the liquid's vapour pressure."""
    from calcreport.physics import atmosphere

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
    elif fluid.kind in liquids.T_RANGE:
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
