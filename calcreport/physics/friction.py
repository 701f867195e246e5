"""Pipe friction: Reynolds number, flow regime and the Darcy friction factor.

Reynolds number and roughness
    reynolds, relative_roughness, flow_regime
Darcy friction factor
    laminar, colebrook, swamee_jain
Hazen-Williams (water only)
    hazen_williams

Regime rule used throughout calcreport: laminar below Re = 2000, turbulent
above Re = 4000; between them the flow is in transition, the Colebrook
value is used (it is the larger, hence conservative, value there) and the
step is flagged for review.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from calcreport.errors import ConvergenceError
from calcreport.physics.equation import equation

__all__ = [
    "LAMINAR_LIMIT",
    "TURBULENT_LIMIT",
    "colebrook",
    "flow_regime",
    "hazen_williams",
    "laminar",
    "relative_roughness",
    "reynolds",
    "swamee_jain",
]

LAMINAR_LIMIT = 2000.0
TURBULENT_LIMIT = 4000.0

_MAX_ITERATIONS = 50
_TOLERANCE = 1e-14


@equation(
    symbol="Re",
    text="Re = ρ·v·D/μ",
    latex=r"Re = \frac{\rho\, v\, D}{\mu}",
    substitute="{rho} × {v} × {D} / {mu}",
    reference="white_fm",
)
def reynolds(rho: Any, v: Any, D: Any, mu: Any) -> Any:
    r"""Reynolds number of flow in a full circular pipe.

    .. math:: Re = \frac{\rho v D}{\mu}

    Parameters
    ----------
    rho : float
        Density of the liquid [kg/m^3]
    v : float
        Mean velocity in the pipe [m/s]
    D : float
        Inner diameter of the pipe [m]
    mu : float
        Dynamic viscosity of the liquid [Pa*s]

    Returns
    -------
    Re : float
        Reynolds number [-]

    Examples
    --------
    >>> round(reynolds(998.2, 1.0, 0.1, 1.0e-3))
    99820

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 6.2.
    """
    return rho * v * D / mu


@equation(
    symbol="ε/D",
    text="ε/D = ε/D",
    latex=r"\varepsilon / D",
    substitute="{roughness} / {D}",
    reference="moody_1944",
)
def relative_roughness(roughness: Any, D: Any) -> Any:
    r"""Relative roughness of a pipe wall.

    .. math:: \frac{\varepsilon}{D}

    Parameters
    ----------
    roughness : float
        Absolute (equivalent sand-grain) roughness of the wall [m]
    D : float
        Inner diameter of the pipe [m]

    Returns
    -------
    eD : float
        Relative roughness [-]

    Examples
    --------
    >>> relative_roughness(4.5e-5, 0.1)
    0.00045

    References
    ----------
    1. Moody, L. F., "Friction factors for pipe flow", Trans. ASME 66,
       671-684, 1944.
    """
    return roughness / D


def flow_regime(Re: float) -> str:
    """Name the flow regime: ``"laminar"``, ``"transition"`` or ``"turbulent"``.

    Laminar below Re = 2000, turbulent above Re = 4000, transition between
    (common practice; the bounds vary by source between 2000 and 2300 for
    the lower and 3000 and 4000 for the upper).
    """
    if Re < LAMINAR_LIMIT:
        return "laminar"
    if Re <= TURBULENT_LIMIT:
        return "transition"
    return "turbulent"


@equation(
    symbol="f",
    text="f = 64/Re",
    latex=r"f = \frac{64}{Re}",
    substitute="64 / {Re}",
    reference="white_fm",
)
def laminar(Re: Any) -> Any:
    r"""Darcy friction factor of fully developed laminar flow (Hagen-Poiseuille).

    .. math:: f = \frac{64}{Re}

    Parameters
    ----------
    Re : float
        Reynolds number [-]

    Returns
    -------
    f : float
        Darcy friction factor [-]

    Examples
    --------
    >>> laminar(1000.0)
    0.064

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 6.47.
    """
    return 64.0 / Re


@equation(
    symbol="f_SJ",
    text="f = 0.25 / [log10(ε/D/3.7 + 5.74/Re^0.9)]²",
    latex=r"f = \frac{0.25}{\left[\log_{10}\left(\frac{\varepsilon/D}{3.7}"
    r" + \frac{5.74}{Re^{0.9}}\right)\right]^2}",
    substitute="0.25 / [log10({eD}/3.7 + 5.74/{Re}^0.9)]²",
    reference="swamee_jain_1976",
)
def swamee_jain(Re: Any, eD: Any) -> Any:
    r"""Darcy friction factor by the explicit Swamee-Jain approximation.

    .. math:: f = \frac{0.25}{\left[\log_{10}\left(\frac{\varepsilon/D}{3.7}
        + \frac{5.74}{Re^{0.9}}\right)\right]^2}

    Parameters
    ----------
    Re : float
        Reynolds number [-]
    eD : float
        Relative roughness [-]

    Returns
    -------
    f : float
        Darcy friction factor [-]

    Notes
    -----
    Stated range 5e3 <= Re <= 1e8 and 1e-6 <= eD <= 1e-2, within about 1 %
    of Colebrook there by its authors' claim; used here as the starting
    value of the Colebrook iteration and printed as a cross-check.

    Examples
    --------
    >>> round(float(swamee_jain(1e5, 1e-4)), 5)
    0.01845

    References
    ----------
    1. Swamee, P. K., and Jain, A. K., "Explicit equations for pipe-flow
       problems", J. Hydraulics Division ASCE 102 (HY5), 657-664, 1976.
    """
    return 0.25 / np.log10(eD / 3.7 + 5.74 / Re**0.9) ** 2


def _colebrook_sides(values: dict[str, float], f: float, fmt: Any) -> str:
    # Dimensionless throughout: the same line in either system (``fmt`` writes numbers).
    Re, eD = values["Re"], values["eD"]
    root = math.sqrt(f)
    lhs = 1.0 / root
    rhs = -2.0 * math.log10(eD / 3.7 + 2.51 / (Re * root))
    return (
        f"f = {fmt(f)} (converged); "
        f"1/√f = 1/√{fmt(f)} = {fmt(lhs)}; "
        f"−2·log10({fmt(eD)}/3.7 + 2.51/({fmt(Re)}·√{fmt(f)})) = {fmt(rhs)}"
    )


@equation(
    symbol="f",
    text="1/√f = −2·log10(ε/D/3.7 + 2.51/(Re·√f))",
    latex=r"\frac{1}{\sqrt{f}} = -2\,\log_{10}\left(\frac{\varepsilon/D}{3.7}"
    r" + \frac{2.51}{Re\,\sqrt{f}}\right)",
    substitute=_colebrook_sides,
    reference="colebrook_1939",
    units="fixed",  # dimensionless: the same line in either system
)
def colebrook(Re: Any, eD: Any) -> Any:
    r"""Darcy friction factor from the Colebrook-White equation, solved to convergence.

    .. math:: \frac{1}{\sqrt{f}} = -2 \log_{10}\left(\frac{\varepsilon/D}{3.7}
        + \frac{2.51}{Re \sqrt{f}}\right)

    Parameters
    ----------
    Re : float
        Reynolds number, scalar or array [-]
    eD : float
        Relative roughness, scalar or array [-]

    Returns
    -------
    f : float
        Darcy friction factor [-]

    Notes
    -----
    Newton's method on x = 1/sqrt(f), started from the Swamee-Jain value,
    to a relative change below 1e-14 in at most 50 iterations (it takes
    three to five); a ConvergenceError is raised otherwise. The function
    x + 2 log10(eD/3.7 + 2.51 x/Re) is increasing and concave in x, so the
    iteration converges from any positive start. Valid for turbulent and
    transitional flow; for Re < 2000 use ``laminar``.

    Examples
    --------
    >>> round(colebrook(1e5, 1e-4), 6)
    0.018514

    References
    ----------
    1. Colebrook, C. F., "Turbulent flow in pipes, with particular reference
       to the transition region between the smooth and rough pipe laws",
       J. Institution of Civil Engineers 11 (4), 133-156, 1939.
    """
    Re_a = np.asarray(Re, dtype=float)
    eD_a = np.asarray(eD, dtype=float)
    a = eD_a / 3.7
    b = 2.51 / Re_a
    x = 1.0 / np.sqrt(swamee_jain(np.maximum(Re_a, 1.0), eD_a))
    k = 2.0 / math.log(10.0)
    change = np.inf
    for _ in range(_MAX_ITERATIONS):
        inner = a + b * x
        step = (x + 2.0 * np.log10(inner)) / (1.0 + k * b / inner)
        x = x - step
        change = float(np.max(np.abs(step / x)))
        if change <= _TOLERANCE:
            f = 1.0 / x**2
            return float(f) if f.ndim == 0 else f
    raise ConvergenceError("Colebrook friction factor", _MAX_ITERATIONS, change)


@equation(
    symbol="h_f,HW",
    text="h_f = 10.67·L·Q^1.852/(C^1.852·D^4.8704)",
    latex=r"h_f = \frac{10.67\, L\, Q^{1.852}}{C^{1.852}\, D^{4.8704}}",
    substitute="10.67 × {L} × ({Q})^1.852 / (({C})^1.852 × ({D})^4.8704)",
    reference="hazen_williams_1920",
    units="fixed",
)
def hazen_williams(L: Any, Q: Any, C: Any, D: Any) -> Any:
    r"""Friction head loss of water by the Hazen-Williams formula, SI form.

    .. math:: h_f = \frac{10.67 L Q^{1.852}}{C^{1.852} D^{4.8704}}

    Parameters
    ----------
    L : float
        Pipe length [m]
    Q : float
        Flow [m^3/s]
    C : float
        Hazen-Williams coefficient of the pipe [-]
    D : float
        Inner diameter [m]

    Returns
    -------
    h_f : float
        Friction head loss [m]

    Notes
    -----
    Empirical, for water at ordinary temperatures in turbulent flow; not
    for other liquids. calcreport prints it beside Darcy-Weisbach as a
    cross-check, or uses it where ``friction_method = "hazen_williams"``.

    Examples
    --------
    >>> round(float(hazen_williams(150.0, 0.020, 120.0, 0.10226)), 3)
    10.721

    References
    ----------
    1. Williams, G. S., and Hazen, A., Hydraulic Tables, 3rd ed., Wiley,
       New York, 1920 (SI constant 10.67 after conversion).
    """
    return 10.67 * L * Q**1.852 / (C**1.852 * D**4.8704)
