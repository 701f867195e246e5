"""Pressure along the route: grade lines, node pressures and the highest pressures.

Node pressure
    node_pressure_head, vapour_limit_head, elevation_along
Maximum pressure
    static_pressure, head_to_pressure

The energy line starts at the source surface (its elevation plus its
gauge pressure head), gains the pump head between the pump's flanges and
loses each pipe's friction along it, uniformly. A fitting's loss is taken
where it stands: an entrance as the liquid enters the pipe, an exit as it
leaves, any other item at the pipe's start unless the input places it at
the end or at a distance; at a fitting the pressure is read on both sides.
Pressure heads are gauge, in metres of the liquid, with g = 9.80665 m/s^2.
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation
from calcreport.physics.losses import G

__all__ = [
    "elevation_along",
    "head_to_pressure",
    "node_pressure_head",
    "static_pressure",
    "vapour_limit_head",
]


@equation(
    symbol="h_p",
    text="h_p = z_s + p_s/(ρ·g) + H − h_L − v²/(2·g) − z",
    latex=r"h_p = z_s + \frac{p_s}{\rho g} + H - h_L - \frac{v^2}{2 g} - z",
    substitute="{z_s} + {p_s} / ({rho} × {g}) + {H} − {h_L} − ({v})² / (2 × {g}) − {z}",
    reference="white_fm",
)
def node_pressure_head(z_s: Any, p_s: Any, rho: Any, H: Any, h_L: Any, v: Any, z: Any) -> Any:
    r"""Gauge pressure head at a point of the route (hydraulic grade line less elevation).

    .. math:: h_p = z_s + \frac{p_s}{\rho g} + H - h_L - \frac{v^2}{2g} - z

    Parameters
    ----------
    z_s : float
        Elevation of the source surface [m]
    p_s : float
        Gauge pressure on the source surface [Pa]
    rho : float
        Density of the liquid [kg/m^3]
    H : float
        Pump head added upstream of the point (zero on the suction side) [m]
    h_L : float
        Head lost between the source surface and the point [m]
    v : float
        Mean velocity at the point [m/s]
    z : float
        Elevation of the pipe centreline at the point [m]

    Returns
    -------
    h_p : float
        Gauge pressure head at the point [m]

    Examples
    --------
    >>> round(node_pressure_head(2.0, 0.0, 998.2, 32.5, 5.0, 2.4, 20.0), 3)
    9.206

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 3.7
       (energy and hydraulic grade lines).
    """
    return z_s + p_s / (rho * G) + H - h_L - v**2 / (2.0 * G) - z


@equation(
    symbol="z_x",
    text="z_x = z_1 + (z_2 − z_1)·x/L",
    latex=r"z_x = z_1 + (z_2 - z_1)\,\frac{x}{L}",
    substitute="{z_1} + ({z_2} − {z_1}) × {x} / {L}",
    reference="white_fm",
)
def elevation_along(z_1: Any, z_2: Any, x: Any, L: Any) -> Any:
    r"""Centreline elevation at a distance along a straight pipe between its end elevations.

    .. math:: z_x = z_1 + (z_2 - z_1) \frac{x}{L}

    Parameters
    ----------
    z_1 : float
        Centreline elevation at the pipe's start [m]
    z_2 : float
        Centreline elevation at the pipe's end [m]
    x : float
        Distance from the pipe's start [m]
    L : float
        Length of the pipe [m]

    Returns
    -------
    z_x : float
        Centreline elevation at x [m]

    Notes
    -----
    The input gives each pipe's end elevations only: between them the pipe is
    taken as straight (a constant grade).

    Examples
    --------
    >>> elevation_along(100.0, 110.0, 25.0, 100.0)
    102.5

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 3.7
       (grade lines over a pipe profile).
    """
    return z_1 + (z_2 - z_1) * x / L


@equation(
    symbol="h_vap",
    text="h_vap = (p_v − p_baro)/(ρ·g)",
    latex=r"h_{vap} = \frac{p_v - p_{baro}}{\rho g}",
    substitute="({p_v} − {p_baro}) / ({rho} × {g})",
    reference="white_fm",
)
def vapour_limit_head(p_v: Any, p_baro: Any, rho: Any) -> Any:
    r"""Gauge pressure head at which the liquid reaches its vapour pressure.

    .. math:: h_{vap} = \frac{p_v - p_{baro}}{\rho g}

    Parameters
    ----------
    p_v : float
        Vapour pressure of the liquid (absolute) [Pa]
    p_baro : float
        Barometric pressure at the site (absolute) [Pa]
    rho : float
        Density of the liquid [kg/m^3]

    Returns
    -------
    h_vap : float
        Gauge pressure head of vapour pressure (negative) [m]

    Examples
    --------
    >>> round(vapour_limit_head(2339.0, 101325.0, 998.2), 3)
    -10.112

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 2.3
       (gauge and absolute pressure) and sec. 1.9 (vapour pressure).
    """
    return (p_v - p_baro) / (rho * G)


@equation(
    symbol="p_max",
    text="p_max = p_s + ρ·g·(z_s + H_max − z)",
    latex=r"p_{max} = p_s + \rho g (z_s + H_{max} - z)",
    substitute="{p_s} + {rho} × {g} × ({z_s} + {H_max} − {z})",
    reference="white_fm",
)
def static_pressure(p_s: Any, rho: Any, z_s: Any, H_max: Any, z: Any) -> Any:
    r"""Gauge pressure at a point with no flow and the pump at its highest head.

    .. math:: p_{max} = p_s + \rho g (z_s + H_{max} - z)

    Parameters
    ----------
    p_s : float
        Gauge pressure on the source surface [Pa]
    rho : float
        Density of the liquid [kg/m^3]
    z_s : float
        Elevation of the source surface (its highest level) [m]
    H_max : float
        Highest head of the pump(s) on their curve, at the top speed; zero
        upstream of the pump [m]
    z : float
        Elevation of the point [m]

    Returns
    -------
    p_max : float
        Gauge pressure at the point [Pa]

    Notes
    -----
    With no flow there are no losses and the grade line is level at the
    source head plus the pump head: the highest steady pressure a
    rotodynamic pump can impose (against a closed valve).

    Examples
    --------
    >>> round(static_pressure(0.0, 998.2, 2.0, 48.0, 0.0))
    489450

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 2.3
       (hydrostatics) and sec. 11.3 (shutoff head of a pump).
    """
    return p_s + rho * G * (z_s + H_max - z)


@equation(
    symbol="p",
    text="p = ρ·g·h",
    latex=r"p = \rho g h",
    substitute="{rho} × {g} × {h}",
    reference="white_fm",
)
def head_to_pressure(rho: Any, h: Any) -> Any:
    r"""Gauge pressure of a pressure head of the liquid.

    .. math:: p = \rho g h

    Parameters
    ----------
    rho : float
        Density of the liquid [kg/m^3]
    h : float
        Gauge pressure head [m]

    Returns
    -------
    p : float
        Gauge pressure [Pa]

    Examples
    --------
    >>> round(head_to_pressure(998.2, 10.0))
    97890

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 2.3.
    """
    return rho * G * h
