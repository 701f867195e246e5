"""NPSH margin: available less required, their ratio, and the NPSH available a margin
criterion asks for.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.physics.equation import equation


@equation(
    symbol="NPSHa/NPSHr",
    text="R = NPSHa/NPSHr",
    latex=r"R = \frac{NPSH_a}{NPSH_r}",
    substitute="{npsha} / {npshr}",
    reference="hi_npsh",
)
def npsh_margin_ratio(npsha: Any, npshr: Any) -> Any:
    r"""NPSH margin ratio of NPSH available to NPSH required.

    .. math:: R = \frac{NPSH_a}{NPSH_r}

    Parameters
    ----------
    npsha : float
        NPSH available [m]
    npshr : float
        NPSH required (NPSH3 of the pump data) [m]

    Returns
    -------
    R : float
        NPSH margin ratio [-]

    Examples
    --------
    >>> npsh_margin_ratio(6.0, 4.0)
    1.5

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin.
    """
    return npsha / npshr


@equation(
    symbol="ΔNPSH",
    text="ΔNPSH = NPSHa − NPSHr",
    latex=r"\Delta NPSH = NPSH_a - NPSH_r",
    substitute="{npsha} − {npshr}",
    reference="hi_npsh",
)
def npsh_margin(npsha: Any, npshr: Any) -> Any:
    r"""NPSH margin in head: NPSH available less NPSH required.

    .. math:: \Delta NPSH = NPSH_a - NPSH_r

    Parameters
    ----------
    npsha : float
        NPSH available [m]
    npshr : float
        NPSH required (NPSH3 of the pump data) [m]

    Returns
    -------
    margin : float
        NPSH margin [m]

    Examples
    --------
    >>> npsh_margin(6.0, 4.0)
    2.0

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin.
    """
    return npsha - npshr


def npsh_needed(npshr: Any, ratio: float, minimum: float) -> Any:
    r"""NPSH available that a margin criterion asks for at a given NPSH required.

    .. math:: NPSH_{a,min} = \max(R\, NPSH_r,\; NPSH_r + \Delta_{min})

    Parameters
    ----------
    npshr : float or ndarray
        NPSH required (NPSH3 of the pump data) [m]
    ratio : float
        Margin ratio R the criterion asks for [-]
    minimum : float
        Margin in head the criterion asks for [m]

    Returns
    -------
    needed : float or ndarray
        Lowest NPSH available that meets both parts of the criterion [m]

    Examples
    --------
    >>> float(npsh_needed(4.0, 1.1, 0.6))
    4.6
    >>> npsh_needed(np.array([2.0, 8.0]), 1.1, 0.6).round(3).tolist()
    [2.6, 8.8]

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin: a margin stated
       both as a ratio and in head, the greater governing.
    """
    return np.maximum(ratio * npshr, npshr + minimum)
