"""Resistance coefficients of named fittings.

Two-K method
    two_k

A fitting's coefficient applies to the velocity of its own pipe. Entrances and
exits have constant coefficients (catalogue); valves, elbows and tees follow the
two-K method, which accounts for the Reynolds number and the size.
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation

__all__ = ["two_k"]

INCH = 0.0254


@equation(
    symbol="K",
    text="K = K1/Re + K∞·(1 + 1/D_in)",
    latex=r"K = \frac{K_1}{Re} + K_\infty\left(1 + \frac{1}{D_{in}}\right)",
    substitute="{K1} / {Re} + {K_inf} × (1 + 1 / ({D} / 0.0254 m/in))",
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
