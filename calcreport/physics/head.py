"""System head between two liquid surfaces, and NPSH available.

Heads
    static_head, pressure_head, total_dynamic_head, crest_head, saturation_gauge_pressure
NPSH
    npsh_available
Commissioning
    suction_flange_pressure, discharge_flange_pressure

The energy equation is written from the source surface to the destination
surface; velocities at large free surfaces are zero, entrance and exit
losses are fitting items of their pipes. Pressures on surfaces are gauge;
they convert to head with the liquid's own density and g = 9.80665 m/s^2.
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation
from calcreport.physics.losses import G

__all__ = [
    "absolute_pressure",
    "crest_head",
    "discharge_flange_pressure",
    "npsh_available",
    "pressure_head",
    "saturation_gauge_pressure",
    "static_head",
    "suction_flange_pressure",
    "total_dynamic_head",
]


@equation(
    symbol="H_s",
    text="H_s = z_d − z_s",
    latex=r"H_s = z_d - z_s",
    substitute="{z_d} − {z_s}",
    reference="white_fm",
)
def static_head(z_d: Any, z_s: Any) -> Any:
    r"""Static head: elevation of the discharge surface above the source surface.

    .. math:: H_s = z_d - z_s

    Parameters
    ----------
    z_d : float
        Elevation of the destination liquid surface, or of the outlet
        centreline for a free discharge [m]
    z_s : float
        Elevation of the source liquid surface [m]

    Returns
    -------
    H_s : float
        Static head [m]

    Examples
    --------
    >>> static_head(131.0, 95.0)
    36.0

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.73
       (steady-flow energy equation).
    """
    return z_d - z_s


@equation(
    symbol="H_c",
    text="H_c = z_c − z_s − p_s/(ρ·g) + h_L,c + v_c²/(2·g)",
    latex=r"H_c = z_c - z_s - \frac{p_s}{\rho g} + h_{L,c} + \frac{v_c^2}{2 g}",
    substitute="{z_c} − {z_s} − {p_s} / ({rho} × {g}) + {h_L} + ({v})² / (2 × {g})",
    reference="white_fm",
)
def crest_head(z_c: Any, z_s: Any, p_s: Any, rho: Any, h_L: Any, v: Any) -> Any:
    r"""Pump head that lifts the liquid over a crest held at atmospheric pressure.

    .. math:: H_c = z_c - z_s - \frac{p_s}{\rho g} + h_{L,c} + \frac{v_c^2}{2g}

    The energy equation from the source surface to the crest, where an air
    valve (or the break of the liquid column) holds the pressure at the
    atmosphere's: beyond it the line runs part-full, and its losses there
    do not load the pump.

    Parameters
    ----------
    z_c : float
        Centreline elevation of the crest [m]
    z_s : float
        Elevation of the source surface [m]
    p_s : float
        Gauge pressure on the source surface [Pa]
    rho : float
        Density of the liquid [kg/m^3]
    h_L : float
        Head lost from the source surface to the crest [m]
    v : float
        Mean velocity at the crest [m/s]

    Returns
    -------
    H_c : float
        Pump head with the crest controlling the flow [m]

    Examples
    --------
    >>> round(crest_head(30.0, 2.0, 0.0, 998.2, 4.0, 2.0), 4)
    32.2039

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 3.7
       (energy equation; the grade line may not fall below a pipe running full).
    """
    return z_c - z_s - p_s / (rho * G) + h_L + v**2 / (2.0 * G)


@equation(
    symbol="H_p",
    text="H_p = (p_d − p_s)/(ρ·g)",
    latex=r"H_p = \frac{p_d - p_s}{\rho g}",
    substitute="({p_d} − {p_s}) / ({rho} × {g})",
    reference="white_fm",
)
def pressure_head(p_d: Any, p_s: Any, rho: Any) -> Any:
    r"""Pressure head: difference of the gauge pressures on the two surfaces.

    .. math:: H_p = \frac{p_d - p_s}{\rho g}

    Parameters
    ----------
    p_d : float
        Gauge pressure on the destination surface [Pa]
    p_s : float
        Gauge pressure on the source surface [Pa]
    rho : float
        Density of the pumped liquid [kg/m^3]

    Returns
    -------
    H_p : float
        Pressure head [m]

    Examples
    --------
    >>> round(pressure_head(200e3, 0.0, 998.207), 4)
    20.431

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.73.
    """
    return (p_d - p_s) / (rho * G)


@equation(
    symbol="H",
    text="H = H_s + H_p + Σh_f + Σh_m + h_v,out",
    latex=r"H = H_s + H_p + \Sigma h_f + \Sigma h_m + h_{v,out}",
    substitute="{H_s} + {H_p} + {h_f} + {h_m} + {h_v_out}",
    reference="white_fm",
)
def total_dynamic_head(H_s: Any, H_p: Any, h_f: Any, h_m: Any, h_v_out: Any) -> Any:
    r"""Total dynamic head by the energy equation between the two surfaces.

    .. math:: H = H_s + H_p + \Sigma h_f + \Sigma h_m + h_{v,out}

    Parameters
    ----------
    H_s : float
        Static head [m]
    H_p : float
        Pressure head [m]
    h_f : float
        Friction loss of all pipes [m]
    h_m : float
        Minor and equipment losses of all pipes [m]
    h_v_out : float
        Velocity head leaving a free discharge; zero for a submerged inlet,
        whose exit loss is a fitting item [m]

    Returns
    -------
    H : float
        Total dynamic head of the pump [m]

    Examples
    --------
    >>> round(total_dynamic_head(23.0, 0.0, 8.17765, 1.31983, 0.0), 5)
    32.49748

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.73
       with the pump head h_p.
    """
    return H_s + H_p + h_f + h_m + h_v_out


@equation(
    symbol="p_s",
    text="p_s = p_v − p_baro",
    latex=r"p_s = p_v - p_{baro}",
    substitute="{p_v} − {p_baro}",
    reference="white_fm",
)
def saturation_gauge_pressure(p_v: Any, p_baro: Any) -> Any:
    r"""Gauge pressure on the surface of a liquid at its boiling point.

    .. math:: p_s = p_v - p_{baro}

    Parameters
    ----------
    p_v : float
        Vapour pressure of the liquid at its temperature [Pa]
    p_baro : float
        Barometric pressure at the site [Pa]

    Returns
    -------
    p_s : float
        Gauge pressure on the surface [Pa]

    Examples
    --------
    >>> saturation_gauge_pressure(47414.5, 101325.0)
    -53910.5

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 2.3
       (gauge and absolute pressure).
    """
    return p_v - p_baro


@equation(
    symbol="NPSHa",
    text="NPSHa = (p_baro + p_s)/(ρ·g) + (z_s − z_p) − h_L,s − p_v/(ρ·g)",
    latex=r"NPSH_a = \frac{p_{baro} + p_s}{\rho g} + (z_s - z_p) - h_{L,s}"
    r" - \frac{p_v}{\rho g}",
    substitute="({p_baro} + {p_s}) / ({rho} × {g}) + ({z_s} − {z_p})"
    " − {h_L} − {p_v} / ({rho} × {g})",
    reference="hi_npsh",
)
def npsh_available(p_baro: Any, p_s: Any, rho: Any, z_s: Any, z_p: Any, h_L: Any, p_v: Any) -> Any:
    r"""Net positive suction head available at the pump's datum.

    .. math:: NPSH_a = \frac{p_{baro} + p_s}{\rho g} + (z_s - z_p) - h_{L,s}
        - \frac{p_v}{\rho g}

    Parameters
    ----------
    p_baro : float
        Barometric (station) pressure at the site [Pa]
    p_s : float
        Gauge pressure on the source surface [Pa]
    rho : float
        Density of the liquid at the pumping temperature [kg/m^3]
    z_s : float
        Elevation of the source surface (the lowest level) [m]
    z_p : float
        Elevation of the NPSH datum, the impeller eye as the pump data
        define it [m]
    h_L : float
        Head loss of the suction side at the flow considered [m]
    p_v : float
        Vapour pressure of the liquid at the pumping temperature [Pa]

    Returns
    -------
    NPSHa : float
        NPSH available [m]

    Examples
    --------
    >>> round(npsh_available(101325.0, 0.0, 998.207, 2.0, 0.0, 0.1318, 2339.32), 4)
    11.9801

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin,
       Hydraulic Institute (definition of NPSHA).
    """
    return (p_baro + p_s) / (rho * G) + (z_s - z_p) - h_L - p_v / (rho * G)


@equation(
    symbol="p_abs",
    text="p_abs = p_baro + p_g",
    latex=r"p_{abs} = p_{baro} + p_g",
    substitute="{p_baro} + {p_g}",
    reference="white_fm",
)
def absolute_pressure(p_baro: Any, p_g: Any) -> Any:
    r"""Absolute pressure from a gauge pressure and the barometric pressure.

    .. math:: p_{abs} = p_{baro} + p_g

    Parameters
    ----------
    p_baro : float
        Barometric pressure at the site [Pa]
    p_g : float
        Gauge pressure [Pa]

    Returns
    -------
    p_abs : float
        Absolute pressure [Pa]

    Examples
    --------
    >>> absolute_pressure(101325.0, 35000.0)
    136325.0

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 2.3.
    """
    return p_baro + p_g


@equation(
    symbol="p_in",
    text="p_in = p_s + ρ·g·(z_s − z_p − h_L,s) − ρ·v_in²/2",
    latex=r"p_{in} = p_s + \rho g (z_s - z_p - h_{L,s}) - \frac{\rho v_{in}^2}{2}",
    substitute="{p_s} + {rho} × {g} × ({z_s} − {z_p} − {h_L}) − {rho} × ({v_in})² / 2",
    reference="white_fm",
)
def suction_flange_pressure(p_s: Any, rho: Any, z_s: Any, z_p: Any, h_L: Any, v_in: Any) -> Any:
    r"""Gauge pressure expected at the pump suction flange (commissioning value).

    .. math:: p_{in} = p_s + \rho g (z_s - z_p - h_{L,s}) - \frac{\rho v_{in}^2}{2}

    Parameters
    ----------
    p_s : float
        Gauge pressure on the source surface [Pa]
    rho : float
        Density of the liquid [kg/m^3]
    z_s : float
        Elevation of the source surface [m]
    z_p : float
        Elevation of the suction gauge (the pump datum) [m]
    h_L : float
        Head loss of the suction side [m]
    v_in : float
        Velocity in the suction pipe at the flange [m/s]

    Returns
    -------
    p_in : float
        Gauge pressure at the suction flange [Pa]

    Examples
    --------
    >>> round(suction_flange_pressure(0.0, 998.2, 2.0, 0.0, 0.1318, 1.073))
    17713

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.73
       (energy equation from the source surface to the suction flange).
    """
    return p_s + rho * G * (z_s - z_p - h_L) - rho * v_in**2 / 2.0


@equation(
    symbol="p_out",
    text="p_out = p_in + ρ·g·H − ρ·(v_out² − v_in²)/2",
    latex=r"p_{out} = p_{in} + \rho g H - \frac{\rho (v_{out}^2 - v_{in}^2)}{2}",
    substitute="{p_in} + {rho} × {g} × {H} − {rho} × (({v_out})² − ({v_in})²) / 2",
    reference="white_fm",
)
def discharge_flange_pressure(p_in: Any, rho: Any, H: Any, v_in: Any, v_out: Any) -> Any:
    r"""Gauge pressure expected at the pump discharge flange (commissioning value).

    .. math:: p_{out} = p_{in} + \rho g H - \frac{\rho (v_{out}^2 - v_{in}^2)}{2}

    Parameters
    ----------
    p_in : float
        Gauge pressure at the suction flange [Pa]
    rho : float
        Density of the liquid [kg/m^3]
    H : float
        Pump total head (TDH) [m]
    v_in : float
        Velocity at the suction flange [m/s]
    v_out : float
        Velocity at the discharge flange [m/s]

    Returns
    -------
    p_out : float
        Gauge pressure at the discharge flange [Pa]

    Notes
    -----
    The gauges are taken at the same elevation (the pump datum); a gauge
    above it reads ρ g Δz less.

    Examples
    --------
    >>> round(discharge_flange_pressure(17714.0, 998.2, 32.5, 1.073, 2.435))
    333472

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 11.2
       (pump head from flange pressures and velocities).
    """
    return p_in + rho * G * H - rho * (v_out**2 - v_in**2) / 2.0
