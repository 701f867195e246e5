"""Head losses in a pipe: velocity, Darcy-Weisbach friction, minor and equipment losses.

Velocity
    velocity, velocity_head
Friction
    darcy_weisbach, friction_share
Minor losses
    k_total, minor_loss, rated_loss, head_sum

Heads are in metres of the flowing liquid; g is the standard acceleration
of gravity, 9.80665 m/s^2 (CGPM 1901, as NIST SP 811).
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation, listed, paired

__all__ = [
    "G",
    "darcy_weisbach",
    "friction_share",
    "head_sum",
    "k_total",
    "minor_loss",
    "rated_loss",
    "velocity",
    "velocity_head",
]

G = 9.80665


@equation(
    symbol="v",
    text="v = 4·Q/(π·D²)",
    latex=r"v = \frac{4\,Q}{\pi D^2}",
    substitute="4 × {Q} / (π × ({D})²)",
    reference="white_fm",
)
def velocity(Q: Any, D: Any) -> Any:
    r"""Mean velocity of a flow filling a circular pipe.

    .. math:: v = \frac{Q}{A} = \frac{4 Q}{\pi D^2}

    Parameters
    ----------
    Q : float
        Volumetric flow [m^3/s]
    D : float
        Inner diameter [m]

    Returns
    -------
    v : float
        Mean velocity [m/s]

    Examples
    --------
    >>> round(velocity(0.020, 0.154051), 5)
    1.07303

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.7.
    """
    return 4.0 * Q / (math.pi * D**2)


@equation(
    symbol="h_v",
    text="h_v = v²/(2·g)",
    latex=r"h_v = \frac{v^2}{2 g}",
    substitute="({v})² / (2 × {g})",
    reference="white_fm",
)
def velocity_head(v: Any) -> Any:
    r"""Velocity head of a mean velocity.

    .. math:: h_v = \frac{v^2}{2 g}

    Parameters
    ----------
    v : float
        Mean velocity [m/s]

    Returns
    -------
    h_v : float
        Velocity head [m]

    Examples
    --------
    >>> round(velocity_head(2.0), 6)
    0.203943

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.75.
    """
    return v**2 / (2.0 * G)


@equation(
    symbol="h_f",
    text="h_f = f·(L/D)·v²/(2·g)",
    latex=r"h_f = f\,\frac{L}{D}\,\frac{v^2}{2 g}",
    substitute="{f} × {L} / {D} × ({v})² / (2 × {g})",
    reference="white_fm",
)
def darcy_weisbach(f: Any, L: Any, D: Any, v: Any) -> Any:
    r"""Friction head loss of a straight pipe by the Darcy-Weisbach equation.

    .. math:: h_f = f \frac{L}{D} \frac{v^2}{2 g}

    Parameters
    ----------
    f : float
        Darcy friction factor [-]
    L : float
        Pipe length [m]
    D : float
        Inner diameter [m]
    v : float
        Mean velocity [m/s]

    Returns
    -------
    h_f : float
        Friction head loss [m]

    Examples
    --------
    >>> round(darcy_weisbach(0.018142, 150.0, 0.10226, 2.43515), 3)
    8.046

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 6.10.
    """
    return f * L / D * v**2 / (2.0 * G)


@equation(
    symbol="h_f,x",
    text="h_f,x = h_f·x/L",
    latex=r"h_{f,x} = h_f\,\frac{x}{L}",
    substitute="{h_f} × {x} / {L}",
    reference="white_fm",
)
def friction_share(h_f: Any, x: Any, L: Any) -> Any:
    r"""Friction loss over the first length x of a uniform pipe.

    .. math:: h_{f,x} = h_f \frac{x}{L}

    In steady flow through a pipe of one diameter and roughness the friction
    gradient is uniform, so the loss grows linearly along it.

    Parameters
    ----------
    h_f : float
        Friction loss of the whole pipe [m]
    x : float
        Distance from the pipe's start [m]
    L : float
        Length of the pipe [m]

    Returns
    -------
    h_fx : float
        Friction loss from the start to x [m]

    Examples
    --------
    >>> friction_share(6.0, 150.0, 600.0)
    1.5

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 6.4
       (fully developed pipe flow: the head falls linearly with distance).
    """
    return h_f * x / L


@equation(
    symbol="ΣK",
    text="ΣK = Σ n_i·K_i",
    latex=r"\Sigma K = \sum_i n_i K_i",
    substitute=paired("count", "", "×", "K", "", empty="0 (no fittings)"),
    reference="crane_tp410",
)
def k_total(K: Any, count: Any) -> Any:
    r"""Sum of the resistance coefficients of a pipe's fittings.

    .. math:: \Sigma K = \sum_i n_i K_i

    Parameters
    ----------
    K : list of float
        Resistance coefficient of each fitting item, referred to the pipe's
        own velocity [-]
    count : list of float
        Number of identical fittings of each item [-]

    Returns
    -------
    K_total : float
        Total resistance coefficient [-]

    Examples
    --------
    >>> k_total([0.5, 0.3], [1, 2])
    1.1

    References
    ----------
    1. Crane Co., Flow of Fluids Through Valves, Fittings and Pipe,
       Technical Paper No. 410, resistance coefficient method.
    """
    return sum(n * k for k, n in zip(K, count, strict=True))


@equation(
    symbol="h_m",
    text="h_m = ΣK·v²/(2·g)",
    latex=r"h_m = \Sigma K\,\frac{v^2}{2 g}",
    substitute="{K_total} × ({v})² / (2 × {g})",
    reference="crane_tp410",
)
def minor_loss(K_total: Any, v: Any) -> Any:
    r"""Head loss of fittings from their total resistance coefficient.

    .. math:: h_m = \Sigma K \frac{v^2}{2 g}

    Parameters
    ----------
    K_total : float
        Total resistance coefficient [-]
    v : float
        Mean velocity in the pipe the coefficients refer to [m/s]

    Returns
    -------
    h_m : float
        Minor head loss [m]

    Examples
    --------
    >>> round(minor_loss(4.366, 2.43515), 5)
    1.32003

    References
    ----------
    1. Crane Co., Flow of Fluids Through Valves, Fittings and Pipe,
       Technical Paper No. 410, resistance coefficient method.
    """
    return K_total * v**2 / (2.0 * G)


@equation(
    symbol="h_eq",
    text="h_eq = Δp_r/(ρ·g)·(Q/Q_r)²",
    latex=r"h_{eq} = \frac{\Delta p_r}{\rho g}\left(\frac{Q}{Q_r}\right)^2",
    substitute="{dp} / ({rho} × {g}) × ({Q} / {Q_rated})²",
    reference="white_fm",
)
def rated_loss(dp: Any, Q: Any, Q_rated: Any, rho: Any) -> Any:
    r"""Head loss of equipment from its rated pressure drop, scaled with flow squared.

    .. math:: h_{eq} = \frac{\Delta p_r}{\rho g}\left(\frac{Q}{Q_r}\right)^2

    Parameters
    ----------
    dp : float
        Rated pressure drop of the item [Pa]
    Q : float
        Flow through the item [m^3/s]
    Q_rated : float
        Flow at which the rated pressure drop applies [m^3/s]
    rho : float
        Density of the liquid [kg/m^3]

    Returns
    -------
    h_eq : float
        Head loss of the item [m]

    Notes
    -----
    The square law holds for fully turbulent flow through the item; a
    rating taken with another liquid should be corrected by the user.

    Examples
    --------
    >>> round(rated_loss(35e3, 0.020, 0.020, 998.207), 4)
    3.5754

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 6.9
       (minor losses proportional to the velocity head).
    """
    return dp / (rho * G) * (Q / Q_rated) ** 2


@equation(
    symbol="Σh",
    text="Σh = h_1 + h_2 + …",
    latex=r"\Sigma h = \sum_i h_i",
    substitute=listed("h", "m", empty="0"),
    reference="white_fm",
)
def head_sum(h: Any) -> Any:
    r"""Sum of head terms.

    .. math:: \Sigma h = \sum_i h_i

    Parameters
    ----------
    h : list of float
        Heads to add [m]

    Returns
    -------
    total : float
        Their sum [m]

    Examples
    --------
    >>> head_sum([1.0, 2.5])
    3.5

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 3.73
       (losses in series add).
    """
    return sum(h)
