"""Site and liquid: barometric pressure, liquid properties by kind (water, seawater, glycol
solutions, other liquids, a custom liquid) and the surface pressures and heads they set.
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import Given, Model, Vessel
from calcreport.physics import atmosphere, glycol, head, liquids, water
from calcreport.solver.states import Liquid
from calcreport.trace import TraceBuilder


def _record_inputs(b: TraceBuilder, model: Model) -> None:
    def walk(obj: Any) -> None:
        if isinstance(obj, Given):
            b.input(obj)
        elif isinstance(obj, tuple | list):
            for item in obj:
                walk(item)
        elif isinstance(obj, dict):
            for item in obj.values():
                walk(item)
        elif hasattr(obj, "__dataclass_fields__"):
            for name in obj.__dataclass_fields__:
                walk(getattr(obj, name))

    for name in Model.__dataclass_fields__:
        if name not in ("path", "sha256", "text", "files"):
            walk(getattr(model, name))


def _barometric(b: TraceBuilder, model: Model) -> Given:
    if model.site.station_pressure:
        return model.site.station_pressure
    elevation = model.site.elevation or b.assume(
        "Site elevation not given: the source surface is taken at sea level.", 0.0, "m"
    )
    return b.step(
        "site.barometric_pressure",
        "Barometric pressure at the site",
        atmosphere.pressure,
        z=elevation,
    )


def _liquid(
    b: TraceBuilder, model: Model, p_baro: Given, T: Given | None = None, prefix: str = ""
) -> Liquid:
    """Liquid properties at temperature ``T`` (default the fluid's), steps ids prefixed."""
    fluid = model.fluid
    if fluid.kind == "custom":
        assert fluid.density and fluid.viscosity and fluid.vapor_pressure
        return Liquid(fluid.density, fluid.viscosity, fluid.vapor_pressure)
    T = T or fluid.temperature
    if fluid.kind in glycol.CODE:
        return _glycol(b, model, T, prefix)
    at = f" at {T.value - 273.15:.4g} °C" if prefix else ""
    if fluid.kind == "seawater":
        return _seawater(b, model, T, prefix, at)
    name = fluid.kind.replace("_", "-")
    pure = fluid.kind in liquids.PURE
    p_v = b.step(
        f"{prefix}fluid.vapor_pressure",
        f"Vapour pressure of {name}{at}",
        liquids.property_function(fluid.kind, "vapor_pressure")
        if pure
        else water.saturation_pressure,
        T=T,
    )
    if model.source.saturation:
        p = p_v
    else:
        assert model.source.pressure is not None
        p = b.step(
            f"{prefix}fluid.pressure",
            "Absolute pressure on the source surface",
            head.absolute_pressure,
            p_baro=p_baro,
            p_g=model.source.pressure,
        )
    if pure:
        rho = b.step(
            f"{prefix}fluid.density",
            f"Density of {name}{at}",
            liquids.property_function(fluid.kind, "density"),
            T=T,
            p=p,
        )
        mu = b.step(
            f"{prefix}fluid.viscosity",
            f"Dynamic viscosity of {name}{at}",
            liquids.property_function(fluid.kind, "viscosity"),
            T=T,
            p=p,
        )
    else:
        rho = b.step(f"{prefix}fluid.density", f"Density of water{at}", water.density, T=T, p=p)
        mu = b.step(
            f"{prefix}fluid.viscosity",
            f"Dynamic viscosity of water{at}",
            water.viscosity,
            T=T,
            rho=rho,
        )
    if not prefix:
        b.assume(
            "Liquid properties are those at the source surface pressure and the stated "
            "temperature throughout the system."
        )
    return Liquid(rho, mu, p_v, p if fluid.kind == "water" else None)


def _seawater(b: TraceBuilder, model: Model, T: Given, prefix: str, at: str) -> Liquid:
    """Seawater: CoolProp's fit of the seawater review; vapour pressure that of pure water."""
    w = model.fluid.mass_fraction
    assert w is not None
    p_v = b.step(
        f"{prefix}fluid.vapor_pressure",
        f"Vapour pressure (that of pure water){at}",
        water.saturation_pressure,
        T=T,
    )
    rho = b.step(
        f"{prefix}fluid.density",
        f"Density of seawater{at}",
        liquids.property_function("seawater", "density"),
        T=T,
        w=w,
    )
    mu = b.step(
        f"{prefix}fluid.viscosity",
        f"Dynamic viscosity of seawater{at}",
        liquids.property_function("seawater", "viscosity"),
        T=T,
        w=w,
    )
    if not prefix:
        b.assume(
            "Seawater's vapour pressure is taken as pure water's at the same temperature "
            "(dissolved salt lowers it by about 2 %: the NPSH available is slightly "
            "understated); its properties are those at atmospheric pressure."
        )
    return Liquid(rho, mu, p_v)


def _glycol(b: TraceBuilder, model: Model, T: Given, prefix: str) -> Liquid:
    """Properties of an aqueous glycol solution (CoolProp fits; Raoult's law for p_v)."""
    fluid = model.fluid
    assert fluid.mass_fraction is not None
    w = fluid.mass_fraction
    name = fluid.kind.replace("_", " ")
    code = glycol.CODE[fluid.kind]
    density, viscosity = {
        "MEG": (glycol.ethylene_glycol_density, glycol.ethylene_glycol_viscosity),
        "MPG": (glycol.propylene_glycol_density, glycol.propylene_glycol_viscosity),
    }[code]
    M = b.datum(f"catalog.glycol.{fluid.kind}.molar_mass", glycol.MOLAR_MASS[code], "")
    p_v = b.step(
        f"{prefix}fluid.vapor_pressure",
        f"Vapour pressure of the {name} solution (Raoult's law)",
        glycol.raoult_vapor_pressure,
        T=T,
        w=w,
        M_glycol=M,
    )
    rho = b.step(f"{prefix}fluid.density", f"Density of the {name} solution", density, T=T, w=w)
    mu = b.step(
        f"{prefix}fluid.viscosity", f"Dynamic viscosity of the {name} solution", viscosity, T=T, w=w
    )
    if not prefix:
        b.assume(
            f"The {name} solution's vapour pressure follows Raoult's law on the water "
            "fraction (common practice, no published source); its properties are those "
            "at atmospheric pressure."
        )
    return Liquid(rho, mu, p_v)


def _destination_elevation(model: Model, level: Given) -> Given:
    dest = model.destination
    return dest.outlet_elevation if dest.inlet == "free" and dest.outlet_elevation else level


def _exit_head(b: TraceBuilder, model: Model) -> Given | None:
    """None for a free discharge (the velocity head is computed per case)."""
    if model.destination.inlet == "free":
        return None
    return b.assume(
        "Submerged inlet: the exit loss is a fitting item (K = 1); no outlet "
        "velocity head is added.",
        0.0,
        "m",
    )


def _surface_pressure(
    b: TraceBuilder, vessel: Vessel, liquid: Liquid, p_baro: Given, prefix: str = ""
) -> Given:
    if vessel.saturation:
        return b.step(
            f"{prefix}{vessel.role}.pressure",
            f"Gauge pressure on the boiling {vessel.role} surface",
            head.saturation_gauge_pressure,
            p_v=liquid.vapor_pressure,
            p_baro=p_baro,
        )
    assert vessel.pressure is not None
    return vessel.pressure
