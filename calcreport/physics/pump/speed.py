"""Pump speed: the affinity laws, the specific speed, the speed that just lifts the static
head and the speed solved for a duty.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from calcreport.physics.equation import equation


@equation(
    symbol="Q_n",
    text="Q_n = Q_0·(n/n_0)",
    latex=r"Q_n = Q_0\,\frac{n}{n_0}",
    substitute="{Q0} × {n} / {n0}",
    reference="karassik_2008",
)
def affinity_flow(Q0: Any, n: Any, n0: Any) -> Any:
    r"""Flow of a curve point moved to another speed by the affinity law.

    .. math:: Q_n = Q_0 \frac{n}{n_0}

    Parameters
    ----------
    Q0 : float
        Flow at the curve's speed [m^3/s]
    n : float
        Operating speed [1/s]
    n0 : float
        Speed of the curve data [1/s]

    Returns
    -------
    Q : float
        Flow at the operating speed [m^3/s]

    Examples
    --------
    >>> round(affinity_flow(0.020, 45.0, 50.0), 12)
    0.018

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (affinity laws).
    """
    return Q0 * n / n0


@equation(
    symbol="H_n",
    text="H_n = H_0·(n/n_0)²",
    latex=r"H_n = H_0\left(\frac{n}{n_0}\right)^2",
    substitute="{H0} × ({n} / {n0})²",
    reference="karassik_2008",
)
def affinity_head(H0: Any, n: Any, n0: Any) -> Any:
    r"""Head of a curve point moved to another speed by the affinity law.

    .. math:: H_n = H_0 \left(\frac{n}{n_0}\right)^2

    Parameters
    ----------
    H0 : float
        Head (or NPSH required, approximately) at the curve's speed [m]
    n : float
        Operating speed [1/s]
    n0 : float
        Speed of the curve data [1/s]

    Returns
    -------
    H : float
        Head at the operating speed [m]

    Examples
    --------
    >>> round(affinity_head(40.0, 45.0, 50.0), 6)
    32.4

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (affinity laws).
    """
    return H0 * (n / n0) ** 2


@equation(
    symbol="N_s",
    text="N_s = n·√Q/H^0.75 (n in rpm, Q in m³/s, H in m)",
    latex=r"N_s = \frac{n\,\sqrt{Q}}{H^{0.75}}",
    substitute="(60 × {n}) × √{Q} / ({H})^0.75",
    reference="karassik_2008",
    units="fixed",
)
def specific_speed(n: Any, Q: Any, H: Any) -> Any:
    r"""Specific speed at the best-efficiency point, metric (rpm, m^3/s, m).

    .. math:: N_s = \frac{n \sqrt{Q}}{H^{0.75}}

    Parameters
    ----------
    n : float
        Rotational speed [1/s]
    Q : float
        Flow at BEP, per impeller eye [m^3/s]
    H : float
        Head at BEP, per stage [m]

    Returns
    -------
    Ns : float
        Specific speed in rpm, m^3/s and m; multiply by 51.645 for the
        US form (rpm, gpm, ft) [-]

    Examples
    --------
    >>> round(float(specific_speed(2950.0 / 60.0, 0.024, 41.6)), 1)
    27.9

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (specific speed).
    """
    return 60.0 * n * np.sqrt(Q) / H**0.75


@equation(
    symbol="n_lift",
    text="n_lift = n_0·√(H_static/H_0)",
    latex=r"n_{lift} = n_0 \sqrt{\frac{H_{static}}{H_0}}",
    substitute="{n0} × √({H_static} / {H0})",
    reference="karassik_2008",
)
def lift_speed(n0: Any, H_static: Any, H0: Any) -> Any:
    r"""Speed at which the pump's shutoff head just equals the static head (affinity law).

    .. math:: n_{lift} = n_0 \sqrt{\frac{H_{static}}{H_0}}

    Parameters
    ----------
    n0 : float
        Speed of the curve data [1/s]
    H_static : float
        Highest static head of the system, elevation plus pressure [m]
    H0 : float
        Shutoff head of the curve at n0 (per pump in series: of all of them) [m]

    Returns
    -------
    n_lift : float
        Speed below which the pump delivers no flow against the static head [1/s]

    Notes
    -----
    A variable-speed pump should run well above this speed: near it the flow is
    small and unstable.

    Examples
    --------
    >>> round(lift_speed(50.0, 25.0, 36.0), 4)
    41.6667

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (affinity laws; variable-speed operation against static head).
    """
    return n0 * math.sqrt(H_static / H0)


def _speed_text(values: dict[str, Any], result: float, write: Any) -> str:
    return (
        f"n = {write(values['n'], '1/s', 'rpm')}, the speed whose affinity-scaled curve passes "
        "through the system head at this flow (bracketed root, Illinois method); confirmed "
        "by the head-balance step"
    )


@equation(
    symbol="n",
    text="n: (n/n_0)²·H_0(Q·n_0/n) = H_system(Q)",
    latex=r"\left(\frac{n}{n_0}\right)^2 H_0\!\left(Q \frac{n_0}{n}\right) = H_{system}(Q)",
    substitute=_speed_text,
    reference="karassik_2008",
    units="display",
)
def solved_speed(n: Any) -> Any:
    r"""The speed found for a variable-speed duty point, recorded as a step.

    .. math:: \left(\frac{n}{n_0}\right)^2 H_0\left(Q \frac{n_0}{n}\right) = H_{system}(Q)

    Parameters
    ----------
    n : float
        Speed returned by the root finder [1/s]

    Returns
    -------
    n_op : float
        Operating speed [1/s]

    Notes
    -----
    The value is the solver's; the head-balance step that follows proves it.

    Examples
    --------
    >>> solved_speed(45.0)
    45.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (affinity laws; variable-speed operation on the system curve).
    """
    return n
