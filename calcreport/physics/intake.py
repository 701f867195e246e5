"""Pump intakes: submergence against free-surface vortices (ANSI/HI 9.8).

Submergence
    submergence, minimum_submergence
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation
from calcreport.physics.losses import G

__all__ = ["minimum_submergence", "submergence"]


@equation(
    symbol="S",
    text="S = z_l − z_i",
    latex=r"S = z_l - z_i",
    substitute="{z_l} − {z_i}",
    reference="hi_intake",
)
def submergence(z_l: Any, z_i: Any) -> Any:
    r"""Submergence of an intake: the liquid level above the inlet.

    .. math:: S = z_l - z_i

    Parameters
    ----------
    z_l : float
        Elevation of the liquid surface (its lowest level) [m]
    z_i : float
        Elevation of the inlet (the suction pipe's entry) [m]

    Returns
    -------
    S : float
        Submergence [m]

    Examples
    --------
    >>> round(submergence(101.5, 100.2), 6)
    1.3

    References
    ----------
    1. ANSI/HI 9.8-1998, Pump Intake Design, Hydraulic Institute,
       Parsippany NJ, sec. 9.8.6 (submergence above the inlet).
    """
    return z_l - z_i


@equation(
    symbol="S_min",
    text="S_min = D·(1 + 2.3·v/√(g·D))",
    latex=r"S_{min} = D \left(1 + 2.3 \frac{v}{\sqrt{g D}}\right)",
    substitute="{D} × (1 + 2.3 × {v} / √({g} × {D}))",
    reference="hi_intake",
)
def minimum_submergence(v: Any, D: Any) -> Any:
    r"""Minimum submergence of an inlet against air-entraining surface vortices.

    .. math:: S_{min} = D \left(1 + 2.3 F_D\right), \quad F_D = \frac{v}{\sqrt{g D}}

    Parameters
    ----------
    v : float
        Mean velocity at the inlet [m/s]
    D : float
        Diameter of the inlet (the bell's, where it has one) [m]

    Returns
    -------
    S_min : float
        Minimum submergence [m]

    Notes
    -----
    The standard's recommendation for intakes built to its layouts; other
    layouts, and any departure, are for a model study. Sources and sumps
    built otherwise need the manufacturer's or a model study's value.

    Examples
    --------
    >>> round(minimum_submergence(1.2, 0.3), 4)
    0.7827

    References
    ----------
    1. ANSI/HI 9.8-1998, Pump Intake Design, Hydraulic Institute,
       Parsippany NJ, eq. 9.8-1 (S = D + 2.3 F_D D).
    """
    return D * (1.0 + 2.3 * v / math.sqrt(G * D))
