"""Surge (water-hammer) screening: wave speed, pipe period, Joukowsky head rise.

Wave speed
    wave_speed (Korteweg, elastic thin-walled pipe), rigid_wave_speed,
    anchored_restraint_factor, upstream_anchor_restraint_factor
Timing
    pipe_period, line_period
Head change
    joukowsky_head, series_joukowsky_head, slow_closure_head, transient_pressure_head

A screening, not a transient analysis: the flow is taken to stop at once
(Joukowsky) or, for a valve closing more slowly than the line's period,
linearly over the closing time (Michaud's estimate). Pipes in series are
screened as the one line they form: a pipe whose period is short against
the event does not set the head change by its own impedance. Friction, pump
inertia, wave reflections and column separation are not modelled; where
the screening trips a limit a detailed transient analysis is required.
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation, paired
from calcreport.physics.losses import G

__all__ = [
    "anchored_restraint_factor",
    "joukowsky_head",
    "line_period",
    "pipe_period",
    "rigid_wave_speed",
    "series_joukowsky_head",
    "slow_closure_head",
    "transient_pressure_head",
    "upstream_anchor_restraint_factor",
    "wave_speed",
]


@equation(
    symbol="a",
    text="a = √[(K/ρ) / (1 + c₁·K·D/(E·e))]",
    latex=r"a = \sqrt{\frac{K/\rho}{1 + c_1 K D / (E\, e)}}",
    substitute="√[({K} / {rho}) / (1 + {c1} × {K} × {D} / ({E} × {e}))]",
    reference="wylie_streeter_1993",
)
def wave_speed(K: Any, rho: Any, D: Any, E: Any, e: Any, c1: Any) -> Any:
    r"""Pressure-wave speed in a liquid-filled elastic pipe (Korteweg).

    .. math:: a = \sqrt{\frac{K/\rho}{1 + c_1 K D / (E e)}}

    Parameters
    ----------
    K : float
        Bulk modulus of the liquid [Pa]
    rho : float
        Density of the liquid [kg/m^3]
    D : float
        Inner diameter of the pipe [m]
    E : float
        Elastic (Young's) modulus of the pipe wall [Pa]
    e : float
        Wall thickness of the pipe [m]
    c1 : float
        Restraint factor of the pipe against axial movement [-]

    Returns
    -------
    a : float
        Wave speed [m/s]

    Notes
    -----
    Thin-walled pipe (D/e above about 25); for thicker walls the restraint
    factors of the reference's thick-walled forms differ by a few per cent.

    Examples
    --------
    >>> round(wave_speed(2.1934e9, 998.2, 0.10226, 207e9, 0.00602, 1.0), 1)
    1364.6

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 2.5, eq. 2.5.11 (wave speed in thin-walled
       elastic conduits).
    """
    return math.sqrt((K / rho) / (1.0 + c1 * K * D / (E * e)))


@equation(
    symbol="a",
    text="a = √(K/ρ)",
    latex=r"a = \sqrt{K/\rho}",
    substitute="√({K} / {rho})",
    reference="wylie_streeter_1993",
)
def rigid_wave_speed(K: Any, rho: Any) -> Any:
    r"""Pressure-wave speed in a liquid in a rigid pipe: the upper bound of any pipe.

    .. math:: a = \sqrt{K/\rho}

    Parameters
    ----------
    K : float
        Bulk modulus of the liquid [Pa]
    rho : float
        Density of the liquid [kg/m^3]

    Returns
    -------
    a : float
        Wave speed [m/s]

    Examples
    --------
    >>> round(rigid_wave_speed(2.1934e9, 998.2), 1)
    1482.3

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 2.5 (the wall term vanishes for a rigid pipe).
    """
    return math.sqrt(K / rho)


@equation(
    symbol="c₁",
    text="c₁ = 1 − ν²",
    latex=r"c_1 = 1 - \nu^2",
    substitute="1 − ({nu})²",
    reference="wylie_streeter_1993",
)
def anchored_restraint_factor(nu: Any) -> Any:
    r"""Restraint factor of a pipe anchored against axial movement throughout.

    .. math:: c_1 = 1 - \nu^2

    Parameters
    ----------
    nu : float
        Poisson's ratio of the pipe wall [-]

    Returns
    -------
    c1 : float
        Restraint factor [-]

    Examples
    --------
    >>> round(anchored_restraint_factor(0.3), 2)
    0.91

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 2.5, case (b) (pipe anchored throughout).
    """
    return 1.0 - nu**2


@equation(
    symbol="c₁",
    text="c₁ = 1 − ν/2",
    latex=r"c_1 = 1 - \nu/2",
    substitute="1 − {nu} / 2",
    reference="wylie_streeter_1993",
)
def upstream_anchor_restraint_factor(nu: Any) -> Any:
    r"""Restraint factor of a pipe anchored at its upstream end only.

    .. math:: c_1 = 1 - \nu/2

    Parameters
    ----------
    nu : float
        Poisson's ratio of the pipe wall [-]

    Returns
    -------
    c1 : float
        Restraint factor [-]

    Examples
    --------
    >>> upstream_anchor_restraint_factor(0.3)
    0.85

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 2.5, case (a) (anchored at the upstream end).
    """
    return 1.0 - nu / 2.0


@equation(
    symbol="T_r",
    text="T_r = 2·L/a",
    latex=r"T_r = \frac{2 L}{a}",
    substitute="2 × {L} / {a}",
    reference="wylie_streeter_1993",
)
def pipe_period(L: Any, a: Any) -> Any:
    r"""Pipe period: the time a pressure wave takes to travel the pipe and back.

    .. math:: T_r = \frac{2 L}{a}

    Parameters
    ----------
    L : float
        Length of the pipe [m]
    a : float
        Wave speed [m/s]

    Returns
    -------
    T_r : float
        Pipe period [s]

    Examples
    --------
    >>> pipe_period(1200.0, 1200.0)
    2.0

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 1.3 (a closure is sudden if it is faster
       than 2L/a).
    """
    return 2.0 * L / a


@equation(
    symbol="T_r",
    text="T_r = 2·Σ(L_i/a_i)",
    latex=r"T_r = 2 \sum_i \frac{L_i}{a_i}",
    substitute=paired("L", "m", "/", "a", "m/s", around="2 × ({})"),
    reference="wylie_streeter_1993",
)
def line_period(L: Any, a: Any) -> Any:
    r"""Period of pipes in series: twice the travel time of a wave along them.

    .. math:: T_r = 2 \sum_i \frac{L_i}{a_i}

    Parameters
    ----------
    L : list of float
        Lengths of the pipes [m]
    a : list of float
        Wave speeds of the pipes, in the same order [m/s]

    Returns
    -------
    T_r : float
        Period of the line [s]

    Examples
    --------
    >>> line_period([600.0, 300.0], [1200.0, 300.0])
    3.0

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 3.6 (series pipes: travel times add).
    """
    return 2.0 * sum(length / speed for length, speed in zip(L, a, strict=True))


@equation(
    symbol="ΔH",
    text="ΔH = a·Δv/g",
    latex=r"\Delta H = \frac{a\, \Delta v}{g}",
    substitute="{a} × {dv} / {g}",
    reference="wylie_streeter_1993",
)
def joukowsky_head(a: Any, dv: Any) -> Any:
    r"""Joukowsky head change for a sudden change of velocity.

    .. math:: \Delta H = \frac{a \Delta v}{g}

    Parameters
    ----------
    a : float
        Wave speed [m/s]
    dv : float
        Change of the mean velocity, taken positive [m/s]

    Returns
    -------
    dH : float
        Head rise (or fall) of the pressure wave [m]

    Examples
    --------
    >>> round(joukowsky_head(1200.0, 2.0), 2)
    244.73

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 1.3, eq. 1.3.5 (Joukowsky).
    2. Joukowsky, N., "Über den hydraulischen Stoss in Wasserleitungsröhren",
       Mémoires de l'Académie Impériale des Sciences de St.-Pétersbourg, 1900.
    """
    return a * dv / G


def _series_text(values: dict[str, Any], result: float, write: Any) -> str:
    momentum = paired("L", "m", "×", "v", "m/s")(values, result, write)
    travel = paired("L", "m", "/", "a", "m/s")(values, result, write)
    return f"({momentum}) / ({write.constant('g')} × ({travel}))"


@equation(
    symbol="ΔH_line",
    text="ΔH_line = Σ(L_i·v_i) / (g·Σ(L_i/a_i))",
    latex=r"\Delta H_{line} = \frac{\sum_i L_i v_i}{g \sum_i L_i / a_i}",
    substitute=_series_text,
    reference="series_pipes_surge",
)
def series_joukowsky_head(L: Any, v: Any, a: Any) -> Any:
    r"""Joukowsky head change of pipes in series stopped as one line.

    .. math:: \Delta H_{line} = \frac{\sum_i L_i v_i}{g \sum_i L_i / a_i}

    The line is replaced by its equivalent pipe, which keeps the line's wave
    travel time Σ L_i/a_i and its inertia Σ L_i/A_i; its Joukowsky change
    a_e·v_e/g is the expression above. For one pipe it is a·v/g.

    Parameters
    ----------
    L : list of float
        Lengths of the pipes [m]
    v : list of float
        Mean velocities before the event, in the same order [m/s]
    a : list of float
        Wave speeds of the pipes, in the same order [m/s]

    Returns
    -------
    dH : float
        Head change of the line for its flow stopped within its period [m]

    Notes
    -----
    A short, stiff pipe (a pump header, a suction pipe) carries the wave
    back and forth many times while a long main decelerates: its own a·v/g
    applies only to an event faster than its own period 2L/a. The
    equivalent pipe lets the long main's impedance govern, as measured on
    steel pipes joined to plastic mains (ref. 2).

    Examples
    --------
    >>> round(series_joukowsky_head([30.0, 1000.0], [2.0, 1.0], [1300.0, 300.0]), 2)
    32.2

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 3.6 (series pipes; equivalent pipe of the
       same travel time and inertia, from memory).
    2. Kubrak, M., Kodura, A., Malesińska, A., and Urbanowicz, K., "Water
       Hammer in Steel–Plastic Pipes Connected in Series", Water 14(19),
       3107, 2022, doi:10.3390/w14193107.
    """
    momentum = sum(length * speed for length, speed in zip(L, v, strict=True))
    travel = sum(length / wave for length, wave in zip(L, a, strict=True))
    return momentum / (G * travel)


@equation(
    symbol="ΔH",
    text="ΔH = ΔH_J·T_r/t_c  (t_c > T_r)",
    latex=r"\Delta H = \Delta H_J \frac{T_r}{t_c}",
    substitute="{dH_J} × {T_r} / {t_c}",
    reference="wylie_streeter_1993",
)
def slow_closure_head(dH_J: Any, T_r: Any, t_c: Any) -> Any:
    r"""Head rise of a closure slower than the period (Michaud's estimate).

    .. math:: \Delta H = \Delta H_J \frac{T_r}{t_c}

    Parameters
    ----------
    dH_J : float
        Joukowsky head rise of a sudden closure [m]
    T_r : float
        Period of the line, 2L/a [s]
    t_c : float
        Effective closing time, longer than T_r [s]

    Returns
    -------
    dH : float
        Estimated head rise [m]

    Notes
    -----
    Equivalent to ΔH = 2 L v / (g t_c): a linear deceleration over the
    closing time. Valve characteristics make the effective closure of most
    valves much shorter than the stroke time; the estimate is a screening
    value only.

    Examples
    --------
    >>> slow_closure_head(240.0, 2.0, 8.0)
    60.0

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 1.3 (slow closure, head rise with a
       closing time longer than 2L/a).
    """
    return dH_J * T_r / t_c


@equation(
    symbol="h_tr",
    text="h_tr = h + s·ΔH  (s = +1 upsurge, −1 downsurge)",
    latex=r"h_{tr} = h + s\, \Delta H",
    substitute="{h} + ({s}) × {dH}",
    reference="wylie_streeter_1993",
)
def transient_pressure_head(h: Any, dH: Any, s: Any) -> Any:
    r"""Pressure head at a point when a surge of ΔH passes it.

    .. math:: h_{tr} = h + s \Delta H

    Parameters
    ----------
    h : float
        Steady gauge pressure head at the point before the event [m]
    dH : float
        Head change of the pressure wave [m]
    s : float
        +1 for an upsurge, −1 for a downsurge [-]

    Returns
    -------
    h_tr : float
        Gauge pressure head during the surge [m]

    Examples
    --------
    >>> transient_pressure_head(30.0, 45.0, -1.0)
    -15.0

    References
    ----------
    1. Wylie, E. B., and Streeter, V. L., Fluid Transients in Systems,
       Prentice Hall, 1993, sec. 1.3 (the wave adds to or takes from the
       steady head it travels through; friction neglected).
    """
    return h + s * dH
