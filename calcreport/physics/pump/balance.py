"""The operating point: where pump head meets system head (bracketed, then refined by the
Illinois method), its head balance, and the head a throttled duty wastes.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import numpy as np

from calcreport.errors import ConvergenceError
from calcreport.physics.equation import equation

_MAX_ITERATIONS = 100


def operating_point(
    difference: Callable[[np.ndarray], np.ndarray], q_min: float, q_max: float
) -> float | None:
    """Flow where pump head equals system head, or None where the curves do not meet.

    Parameters
    ----------
    difference : callable
        Pump head less system head as a function of flow, vectorised [m]
    q_min : float
        Lowest flow of the pump curve [m^3/s]
    q_max : float
        Highest flow of the pump curve (end of curve) [m^3/s]

    Returns
    -------
    Q : float
        Operating flow, the highest root in [q_min, q_max] [m^3/s]

    Notes
    -----
    The difference is sampled on 201 points to bracket the highest sign
    change (a drooping curve may cross a flat system curve twice; the
    higher flow is the stable one), then refined by the Illinois variant
    of regula falsi to 1e-12 relative in flow; a ConvergenceError is
    raised past 100 iterations.
    """
    q = np.linspace(q_min, q_max, 201)
    d = difference(q)
    sign = np.sign(d)
    crossings = np.nonzero(sign[:-1] * sign[1:] <= 0.0)[0]
    if len(crossings) == 0:
        return None
    k = int(crossings[-1])
    a, b = float(q[k]), float(q[k + 1])
    fa, fb = float(d[k]), float(d[k + 1])
    if fb == 0.0:
        return b
    if fa == 0.0:
        return a
    side = 0
    for _ in range(_MAX_ITERATIONS):
        c = (a * fb - b * fa) / (fb - fa)
        fc = float(difference(np.array([c]))[0])
        if abs(b - a) <= 1e-12 * max(abs(c), 1e-12) or abs(fc) <= 1e-11:
            return c
        if fc * fb > 0:
            b, fb = c, fc
            if side == -1:
                fa /= 2.0
            side = -1
        else:
            a, fa = c, fc
            if side == 1:
                fb /= 2.0
            side = 1
    raise ConvergenceError(
        "operating point (pump and system curves)", _MAX_ITERATIONS, abs(b - a) / max(abs(b), 1e-12)
    )


def _solved_text(values: dict[str, Any], result: float, write: Any) -> str:
    return (
        f"Q = {write(values['Q'], 'm^3/s')}, the highest flow on the curve where "
        "H_pump(Q) − H_system(Q) = 0, bracketed on 201 flows and refined by the "
        "Illinois method; confirmed by the head-balance step"
    )


@equation(
    symbol="Q_op",
    text="Q_op: H_pump(Q_op) = H_system(Q_op)",
    latex=r"H_{pump}(Q_{op}) = H_{system}(Q_{op})",
    substitute=_solved_text,
    reference="karassik_2008",
    units="display",
)
def solved_flow(Q: Any) -> Any:
    r"""The operating flow found by :func:`operating_point`, recorded as a step.

    .. math:: H_{pump}(Q_{op}) = H_{system}(Q_{op})

    Parameters
    ----------
    Q : float
        Flow returned by the root finder [m^3/s]

    Returns
    -------
    Q_op : float
        Operating flow [m^3/s]

    Notes
    -----
    The value is the solver's; what proves it is the head-balance step
    (:func:`head_balance`), whose result is zero to solver precision.

    Examples
    --------
    >>> solved_flow(0.0233)
    0.0233

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (operating point at the intersection of pump and system curves).
    """
    return Q


@equation(
    symbol="ΔH",
    text="ΔH = H_pump − H_system",
    latex=r"\Delta H = H_{pump} - H_{system}",
    substitute="{H_pump} − {H_system}",
    reference="karassik_2008",
)
def head_balance(H_pump: Any, H_system: Any) -> Any:
    r"""Pump head less system head at a flow: zero at the operating point.

    .. math:: \Delta H = H_{pump} - H_{system}

    Parameters
    ----------
    H_pump : float
        Pump head from its curve [m]
    H_system : float
        Total dynamic head the system needs [m]

    Returns
    -------
    dH : float
        Head balance [m]

    Examples
    --------
    >>> head_balance(35.5, 35.5)
    0.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008.
    """
    return H_pump - H_system


@equation(
    symbol="h_thr",
    text="h_thr = H_pump − H_system",
    latex=r"h_{thr} = H_{pump} - H_{system}",
    substitute="{H_pump} − {H_system}",
    reference="karassik_2008",
)
def throttling_loss(H_pump: Any, H_system: Any) -> Any:
    r"""Head a throttling valve must burn to hold a fixed-speed pump at a lower flow.

    .. math:: h_{thr} = H_{pump} - H_{system}

    Parameters
    ----------
    H_pump : float
        Pump head at the flow, on its fixed-speed curve [m]
    H_system : float
        System head at the same flow, valve fully open [m]

    Returns
    -------
    h_thr : float
        Head lost in the throttling valve [m]

    Examples
    --------
    >>> throttling_loss(41.0, 33.5)
    7.5

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (throttle control: the valve adds resistance until the curves meet).
    """
    return H_pump - H_system
