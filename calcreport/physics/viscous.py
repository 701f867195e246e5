"""Viscous liquids: correction of a pump's water performance (ANSI/HI 9.6.7).

Parameter
    kinematic_viscosity, viscosity_parameter
Correction factors
    flow_factor, efficiency_factor, head_factor
Corrected curve points
    viscous_flow, viscous_head, viscous_efficiency

The Hydraulic Institute's method (ANSI/HI 9.6.7-2010) scales the water
curve by factors C_Q, C_H and C_η that depend on one parameter B, a pump
Reynolds number adjusted for specific speed, computed at the water BEP. No
correction applies for B ≤ 1; the method covers B < 40, beyond which a
positive-displacement pump is to be considered. B is taken per stage and,
for a double-suction impeller, per eye. The equations here are as recalled
from the standard (from memory). The tests hold them against the sample of
the Hydraulic Institute's earlier chart method, which they replaced, to
within 0.05 on each factor; the standard's own worked example was not
available to check them: verify against ANSI/HI 9.6.7 before relying on a
viscous selection.
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation

__all__ = [
    "B_MAX",
    "STANDARD",
    "efficiency_factor",
    "flow_factor",
    "head_factor",
    "kinematic_viscosity",
    "viscosity_parameter",
    "viscous_efficiency",
    "viscous_flow",
    "viscous_head",
]

B_MAX = 40.0  # the method's upper limit of B
STANDARD = "ANSI/HI 9.6.7"  # the method's name as the report prints it


@equation(
    symbol="ν",
    text="ν = μ/ρ",
    latex=r"\nu = \frac{\mu}{\rho}",
    substitute="{mu} / {rho}",
    reference="white_fm",
)
def kinematic_viscosity(mu: Any, rho: Any) -> Any:
    r"""Kinematic viscosity of the liquid.

    .. math:: \nu = \frac{\mu}{\rho}

    Parameters
    ----------
    mu : float
        Dynamic viscosity [Pa*s]
    rho : float
        Density [kg/m^3]

    Returns
    -------
    nu : float
        Kinematic viscosity [m^2/s]

    Examples
    --------
    >>> kinematic_viscosity(0.001, 1000.0)
    1e-06

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, sec. 1.7.
    """
    return mu / rho


@equation(
    symbol="B",
    text="B = 16.5·ν^0.5·(H/stages)^0.0625/((Q/eyes)^0.375·N^0.25)  (ν cSt, H m, Q m³/h, N rpm)",
    latex=r"B = 16.5 \frac{\nu^{0.5} (H/i)^{0.0625}}{(Q/e)^{0.375} N^{0.25}}",
    substitute="16.5 × ({nu} × 1e6 cSt/(m²/s))^0.5 × ({H} / {stages})^0.0625 / "
    "(({Q} / {eyes} × 3600 s/h)^0.375 × ({n} × 60 s/min)^0.25)",
    reference="hi_viscous",
    units="fixed",
)
def viscosity_parameter(nu: Any, H: Any, Q: Any, n: Any, stages: Any, eyes: Any) -> Any:
    r"""The Hydraulic Institute's viscosity parameter B at the pump's water BEP.

    .. math:: B = 16.5 \frac{\nu^{0.5} (H_{BEP}/i)^{0.0625}}{(Q_{BEP}/e)^{0.375} N^{0.25}}

    Parameters
    ----------
    nu : float
        Kinematic viscosity of the liquid [m^2/s]
    H : float
        Pump head at the water BEP (all stages) [m]
    Q : float
        Flow at the water BEP (one pump) [m^3/s]
    n : float
        Pump speed [1/s]
    stages : float
        Number of stages i; the head per stage enters [-]
    eyes : float
        Impeller eyes e: 1 for a single-suction, 2 for a double-suction impeller;
        the flow per eye enters [-]

    Returns
    -------
    B : float
        Viscosity parameter [-]

    Notes
    -----
    The constant 16.5 is for ν in cSt, H in m, Q in m³/h and N in rpm; the
    US form's 26.6 (cSt, ft, US gpm, rpm) gives the same B.

    Examples
    --------
    >>> round(viscosity_parameter(100e-6, 40.0, 0.05, 24.2, 1.0, 1.0), 3)
    4.802

    References
    ----------
    1. ANSI/HI 9.6.7-2010, Rotodynamic Pumps - Guideline for Effects of Liquid
       Viscosity on Performance, Hydraulic Institute (equations from memory).
    """
    return (
        16.5
        * (nu * 1e6) ** 0.5
        * (H / stages) ** 0.0625
        / ((Q / eyes * 3600.0) ** 0.375 * (n * 60.0) ** 0.25)
    )


@equation(
    symbol="C_Q",
    text="C_Q = 2.71^(−0.165·(log₁₀ B)^3.15)",
    latex=r"C_Q = 2.71^{-0.165 (\log_{10} B)^{3.15}}",
    substitute="2.71^(−0.165 × (log₁₀ {B})^3.15)",
    reference="hi_viscous",
)
def flow_factor(B: Any) -> Any:
    r"""Flow correction factor of ANSI/HI 9.6.7 (also the head factor at the BEP).

    .. math:: C_Q = 2.71^{-0.165 (\log_{10} B)^{3.15}}

    Parameters
    ----------
    B : float
        Viscosity parameter, 1 < B < 40 [-]

    Returns
    -------
    C_Q : float
        Flow correction factor [-]

    Examples
    --------
    >>> flow_factor(1.0)
    1.0

    References
    ----------
    1. ANSI/HI 9.6.7-2010 (equations from memory).
    """
    return 2.71 ** (-0.165 * math.log10(B) ** 3.15)


@equation(
    symbol="C_η",
    text="C_η = B^(−0.0547·B^0.69)",
    latex=r"C_\eta = B^{-0.0547 B^{0.69}}",
    substitute="{B}^(−0.0547 × {B}^0.69)",
    reference="hi_viscous",
)
def efficiency_factor(B: Any) -> Any:
    r"""Efficiency correction factor of ANSI/HI 9.6.7.

    .. math:: C_\eta = B^{-0.0547 B^{0.69}}

    Parameters
    ----------
    B : float
        Viscosity parameter, 1 < B < 40 [-]

    Returns
    -------
    C_eta : float
        Efficiency correction factor [-]

    Examples
    --------
    >>> efficiency_factor(1.0)
    1.0

    References
    ----------
    1. ANSI/HI 9.6.7-2010 (equations from memory).
    """
    return B ** (-0.0547 * B**0.69)


@equation(
    symbol="C_H",
    text="C_H = 1 − (1 − C_Q)·(Q_W/Q_BEP)^0.75",
    latex=r"C_H = 1 - (1 - C_Q) \left(\frac{Q_W}{Q_{BEP}}\right)^{0.75}",
    substitute="1 − (1 − {C_Q}) × ({Q} / {Q_bep})^0.75",
    reference="hi_viscous",
)
def head_factor(C_Q: Any, Q: Any, Q_bep: Any) -> Any:
    r"""Head correction factor at a water-curve flow (ANSI/HI 9.6.7).

    .. math:: C_H = 1 - (1 - C_Q) \left(\frac{Q_W}{Q_{BEP-W}}\right)^{0.75}

    Parameters
    ----------
    C_Q : float
        Flow correction factor [-]
    Q : float
        Flow of the water-curve point [m^3/s]
    Q_bep : float
        Flow at the water BEP [m^3/s]

    Returns
    -------
    C_H : float
        Head correction factor at the point [-]

    Examples
    --------
    >>> head_factor(0.9, 0.05, 0.05)
    0.9

    References
    ----------
    1. ANSI/HI 9.6.7-2010 (equations from memory): the head factor equals C_Q
       at the BEP and tends to 1 at shutoff.
    """
    return 1.0 - (1.0 - C_Q) * (Q / Q_bep) ** 0.75


@equation(
    symbol="Q_vis",
    text="Q_vis = C_Q·Q_W",
    latex=r"Q_{vis} = C_Q\, Q_W",
    substitute="{C_Q} × {Q}",
    reference="hi_viscous",
)
def viscous_flow(Q: Any, C_Q: Any) -> Any:
    r"""Flow of a curve point on the viscous liquid.

    .. math:: Q_{vis} = C_Q Q_W

    Parameters
    ----------
    Q : float
        Flow of the water-curve point [m^3/s]
    C_Q : float
        Flow correction factor [-]

    Returns
    -------
    Q_vis : float
        Corrected flow [m^3/s]

    Examples
    --------
    >>> round(viscous_flow(0.05, 0.9), 6)
    0.045

    References
    ----------
    1. ANSI/HI 9.6.7-2010 (equations from memory).
    """
    return C_Q * Q


@equation(
    symbol="H_vis",
    text="H_vis = C_H·H_W",
    latex=r"H_{vis} = C_H\, H_W",
    substitute="{C_H} × {H}",
    reference="hi_viscous",
)
def viscous_head(H: Any, C_H: Any) -> Any:
    r"""Head of a curve point on the viscous liquid.

    .. math:: H_{vis} = C_H H_W

    Parameters
    ----------
    H : float
        Head of the water-curve point [m]
    C_H : float
        Head correction factor at the point [-]

    Returns
    -------
    H_vis : float
        Corrected head [m]

    Examples
    --------
    >>> viscous_head(40.0, 0.95)
    38.0

    References
    ----------
    1. ANSI/HI 9.6.7-2010 (equations from memory).
    """
    return C_H * H


@equation(
    symbol="η_vis",
    text="η_vis = C_η·η_W",
    latex=r"\eta_{vis} = C_\eta\, \eta_W",
    substitute="{C_eta} × {eta}",
    reference="hi_viscous",
)
def viscous_efficiency(eta: Any, C_eta: Any) -> Any:
    r"""Efficiency of a curve point on the viscous liquid.

    .. math:: \eta_{vis} = C_\eta \eta_W

    Parameters
    ----------
    eta : float
        Efficiency of the water-curve point [-]
    C_eta : float
        Efficiency correction factor [-]

    Returns
    -------
    eta_vis : float
        Corrected efficiency [-]

    Examples
    --------
    >>> viscous_efficiency(0.8, 0.5)
    0.4

    References
    ----------
    1. ANSI/HI 9.6.7-2010 (equations from memory).
    """
    return C_eta * eta
