"""Resistance coefficients of named fittings.

Two-K method
    two_k
Friction-factor multiple (Crane)
    crane_k
Reducers and enlargements
    expansion, contraction, refer_to_pipe

A fitting's coefficient applies to the velocity of its own pipe. Entrances and
exits have constant coefficients (catalogue); valves, elbows and tees follow the
two-K method, which accounts for the Reynolds number and the size.
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation

__all__ = [
    "contraction",
    "crane_k",
    "expansion",
    "full_lift_velocity",
    "refer_to_pipe",
    "three_k",
    "two_k",
]

INCH = 0.0254


@equation(
    symbol="K",
    text="K = K1/Re + K∞·(1 + 1/D_in)",
    latex=r"K = \frac{K_1}{Re} + K_\infty\left(1 + \frac{1}{D_{in}}\right)",
    substitute="{K1} / {Re} + {K_inf} × (1 + 1 / ({D} / {inch}))",
    reference="hooper_1981",
)
def two_k(K1: Any, K_inf: Any, Re: Any, D: Any) -> Any:
    r"""Resistance coefficient of a fitting by Hooper's two-K method.

    .. math:: K = \frac{K_1}{Re} + K_\infty\left(1 + \frac{1}{D_{in}}\right)

    Parameters
    ----------
    K1 : float
        Coefficient of the laminar term [-]
    K_inf : float
        Coefficient of the fully turbulent term for a 1-inch fitting [-]
    Re : float
        Reynolds number in the pipe [-]
    D : float
        Inner diameter of the pipe; the method takes it in inches [m]

    Returns
    -------
    K : float
        Resistance coefficient, referred to the pipe velocity [-]

    Notes
    -----
    Hooper states the method for Re from laminar flow up and sizes of about
    1/2 to 24 in; accuracy about 10 % in the turbulent range.

    Examples
    --------
    >>> round(two_k(1500.0, 4.0, 1e4, 2.0 * 0.0254), 4)
    6.15

    References
    ----------
    1. Hooper, W. B., "The two-K method predicts head losses in pipe
       fittings", Chemical Engineering, 24 August 1981, 96-100.
    """
    return K1 / Re + K_inf * (1.0 + INCH / D)


@equation(
    symbol="K",
    text="K = K1/Re + Ki·(1 + Kd/D_in^0.3)",
    latex=r"K = \frac{K_1}{Re} + K_i\left(1 + \frac{K_d}{D_{in}^{0.3}}\right)",
    substitute="{K1} / {Re} + {Ki} × (1 + {Kd} / ({D} / {inch})^0.3)",
    reference="darby_1999",
)
def three_k(K1: Any, Ki: Any, Kd: Any, Re: Any, D: Any) -> Any:
    r"""Resistance coefficient of a fitting by Darby's three-K method.

    .. math:: K = \frac{K_1}{Re} + K_i\left(1 + \frac{K_d}{D_{in}^{0.3}}\right)

    Parameters
    ----------
    K1 : float
        Coefficient of the laminar term [-]
    Ki : float
        Coefficient of the turbulent term [-]
    Kd : float
        Size coefficient, with the diameter in inches [-]
    Re : float
        Reynolds number in the pipe [-]
    D : float
        Diameter of the pipe; the method takes it in inches (its nominal
        size; the inner diameter is used here) [m]

    Returns
    -------
    K : float
        Resistance coefficient, referred to the pipe velocity [-]

    Notes
    -----
    Darby fitted the constants to data for all Reynolds numbers and sizes;
    the inner diameter stands in for the nominal size, which changes K by
    about 1 % at NPS 2 and less above.

    Examples
    --------
    >>> round(three_k(800.0, 0.071, 4.2, 1e5, 4.026 * 0.0254), 4)
    0.2754

    References
    ----------
    1. Darby, R., "Correlate pressure drops through fittings", Chemical
       Engineering 106 (7), 101-104, July 1999.
    """
    return K1 / Re + Ki * (1.0 + Kd / (D / INCH) ** 0.3)


@equation(
    symbol="K",
    text="K = 2.6·sin(θ/2)·(1 − β²)² (θ ≤ 45°), (1 − β²)² (θ > 45°), β = d/D",
    latex=r"K = 2.6 \sin\frac{\theta}{2}\,(1 - \beta^2)^2,\ \ \beta = \frac{d}{D}",
    substitute="β = {d} / {D}, θ = {angle}",
    reference="crane_tp410",
)
def expansion(d: Any, D: Any, angle: Any) -> Any:
    r"""Resistance coefficient of an enlargement, referred to the smaller pipe's velocity.

    .. math:: K = 2.6 \sin\frac{\theta}{2}(1 - \beta^2)^2 \quad (\theta \le 45^\circ),
        \qquad K = (1 - \beta^2)^2 \quad (\theta > 45^\circ)

    Parameters
    ----------
    d : float
        Inner diameter of the smaller (upstream) pipe [m]
    D : float
        Inner diameter of the larger (downstream) pipe [m]
    angle : float
        Included angle of the cone; pi for a sudden enlargement [rad]

    Returns
    -------
    K : float
        Resistance coefficient referred to the smaller pipe [-]

    Notes
    -----
    The sudden enlargement is the Borda-Carnot loss (1 - β²)².

    Examples
    --------
    >>> round(expansion(0.1, 0.2, 3.141592653589793), 4)
    0.5625

    References
    ----------
    1. Crane Co., Technical Paper No. 410, "Sudden and gradual enlargement"
       (formula 4 and 5), resistance coefficient K1 on the small diameter.
    """
    beta2 = (d / D) ** 2
    if angle <= math.radians(45.0):
        return 2.6 * math.sin(angle / 2.0) * (1.0 - beta2) ** 2
    return (1.0 - beta2) ** 2


@equation(
    symbol="K",
    text="K = 0.8·sin(θ/2)·(1 − β²) (θ ≤ 45°), 0.5·√sin(θ/2)·(1 − β²) (θ > 45°)",
    latex=r"K = 0.8 \sin\frac{\theta}{2}\,(1 - \beta^2),\ \ \beta = \frac{d}{D}",
    substitute="β = {d} / {D}, θ = {angle}",
    reference="crane_tp410",
)
def contraction(d: Any, D: Any, angle: Any) -> Any:
    r"""Resistance coefficient of a reduction, referred to the smaller pipe's velocity.

    .. math:: K = 0.8 \sin\frac{\theta}{2}(1 - \beta^2) \quad (\theta \le 45^\circ),
        \qquad K = 0.5 \sqrt{\sin\frac{\theta}{2}}(1 - \beta^2) \quad (\theta > 45^\circ)

    Parameters
    ----------
    d : float
        Inner diameter of the smaller (downstream) pipe [m]
    D : float
        Inner diameter of the larger (upstream) pipe [m]
    angle : float
        Included angle of the cone; pi for a sudden contraction [rad]

    Returns
    -------
    K : float
        Resistance coefficient referred to the smaller pipe [-]

    Examples
    --------
    >>> round(contraction(0.1, 0.2, 3.141592653589793), 4)
    0.375

    References
    ----------
    1. Crane Co., Technical Paper No. 410, "Sudden and gradual contraction"
       (formula 1 and 2), resistance coefficient K1 on the small diameter.
    """
    beta2 = (d / D) ** 2
    if angle <= math.radians(45.0):
        return 0.8 * math.sin(angle / 2.0) * (1.0 - beta2)
    return 0.5 * math.sqrt(math.sin(angle / 2.0)) * (1.0 - beta2)


@equation(
    symbol="K_pipe",
    text="K_pipe = K_d·(D_pipe/d)⁴",
    latex=r"K_{pipe} = K_d \left(\frac{D_{pipe}}{d}\right)^4",
    substitute="{K_d} × ({D_pipe} / {d})⁴",
    reference="crane_tp410",
)
def refer_to_pipe(K_d: Any, d: Any, D_pipe: Any) -> Any:
    r"""A coefficient referred to diameter d, referred to another pipe's velocity instead.

    .. math:: K_{pipe} = K_d \left(\frac{D_{pipe}}{d}\right)^4

    Parameters
    ----------
    K_d : float
        Coefficient referred to the velocity in diameter d [-]
    d : float
        Diameter the coefficient refers to [m]
    D_pipe : float
        Inner diameter of the pipe whose velocity is used [m]

    Returns
    -------
    K : float
        Coefficient referred to the pipe's own velocity [-]

    Examples
    --------
    >>> refer_to_pipe(0.5, 0.1, 0.2)
    8.0

    References
    ----------
    1. Crane Co., Technical Paper No. 410 (K2 = K1/β⁴).
    """
    return K_d * (D_pipe / d) ** 4


@equation(
    symbol="K",
    text="K = n·f_T, f_T = 0.25/[log10(ε_cs/(3.7·D))]², ε_cs = 0.045 mm",
    latex=r"K = n\, f_T,\ \ f_T = \frac{0.25}"
    r"{\left[\log_{10}\frac{\varepsilon_{cs}}{3.7 D}\right]^2}",
    substitute="{n} × 0.25 / [log10({e_crane} / (3.7 × {D}))]²",
    reference="crane_tp410",
)
def crane_k(n: Any, D: Any) -> Any:
    r"""Resistance coefficient by the friction-factor-multiple method of Crane TP-410.

    .. math:: K = n f_T, \qquad f_T = \frac{0.25}{\left[\log_{10}
        \frac{\varepsilon_{cs}}{3.7 D}\right]^2}

    Parameters
    ----------
    n : float
        Multiple of the fully turbulent friction factor for the fitting (Crane's
        L/D) [-]
    D : float
        Inner diameter of the pipe [m]

    Returns
    -------
    K : float
        Resistance coefficient, referred to the pipe velocity [-]

    Notes
    -----
    f_T is the fully rough Colebrook value of clean commercial steel
    (ε = 0.045 mm) at the pipe's diameter, the basis of Crane's tabulated f_T.

    Examples
    --------
    >>> round(crane_k(75.0, 0.1541), 3)
    1.114

    References
    ----------
    1. Crane Co., Flow of Fluids Through Valves, Fittings and Pipe,
       Technical Paper No. 410, "Representative resistance coefficients K".
    """
    f_T = 0.25 / math.log10(4.5e-5 / (3.7 * D)) ** 2
    return n * f_T


@equation(
    symbol="v_min",
    text="v_min = c·√(v̄) ft/s, v̄ = 1/ρ in ft³/lb",
    latex=r"v_{min} = c \sqrt{\bar{v}}\ \mathrm{ft/s},\ \ "
    r"\bar{v} = \frac{1}{\rho}\ \mathrm{ft^3/lb}",
    substitute="{c} × √(16.0185 / {rho}) ft/s × 0.3048 m/ft",
    reference="crane_tp410",
    units="fixed",
)
def full_lift_velocity(c: Any, rho: Any) -> Any:
    r"""Least pipe velocity that holds a check valve's disc fully open (Crane TP-410).

    .. math:: v_{min} = c \sqrt{\bar{v}}, \quad \bar{v} = 1/\rho \ \text{in ft}^3/\text{lb}

    Parameters
    ----------
    c : float
        The valve type's constant, for v in ft/s and v̄ in ft³/lb [-]
    rho : float
        Density of the liquid [kg/m^3]

    Returns
    -------
    v_min : float
        Least velocity for full disc lift [m/s]

    Notes
    -----
    Below it the disc floats part-open: it chatters and wears, and the
    valve's loss exceeds its fully-open K.

    Examples
    --------
    >>> round(full_lift_velocity(35.0, 998.2), 3)
    1.351

    References
    ----------
    1. Crane Co., Flow of Fluids Through Valves, Fittings and Pipe,
       Technical Paper No. 410, resistance of valves and fittings (check
       valves: minimum velocity for full disc lift); constants from memory.
    """
    return c * (16.0185 / rho) ** 0.5 * 0.3048
