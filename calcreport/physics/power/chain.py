"""The power chain: hydraulic power, shaft power through the pump's efficiency, electrical
power through the motor's and drive's, the wire-to-water form, each pump's share and the
peak over the curve.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.physics.equation import equation, listed
from calcreport.physics.losses import G


@equation(
    symbol="P_h",
    text="P_h = ρ·g·Q·H",
    latex=r"P_h = \rho\, g\, Q\, H",
    substitute="{rho} × {g} × {Q} × {H}",
    reference="white_fm",
)
def hydraulic_power(rho: Any, Q: Any, H: Any) -> Any:
    r"""Hydraulic (water) power delivered to the liquid.

    .. math:: P_h = \rho g Q H

    Parameters
    ----------
    rho : float
        Density of the liquid [kg/m^3]
    Q : float
        Flow [m^3/s]
    H : float
        Total dynamic head [m]

    Returns
    -------
    P_h : float
        Hydraulic power [W]

    Examples
    --------
    >>> round(hydraulic_power(998.207, 0.020, 32.49768), 1)
    6362.4

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 11.3.
    """
    return rho * G * Q * H


@equation(
    symbol="P_s",
    text="P_s = P_h/η_p",
    latex=r"P_s = \frac{P_h}{\eta_p}",
    substitute="{P_h} / {eta_p}",
    reference="white_fm",
)
def shaft_power(P_h: Any, eta_p: Any) -> Any:
    r"""Shaft (brake) power the pump takes from its driver.

    .. math:: P_s = \frac{P_h}{\eta_p}

    Parameters
    ----------
    P_h : float
        Hydraulic power [W]
    eta_p : float
        Pump efficiency at the operating point [-]

    Returns
    -------
    P_s : float
        Shaft power [W]

    Examples
    --------
    >>> round(shaft_power(6362.44, 0.72), 1)
    8836.7

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011, eq. 11.5.
    """
    return P_h / eta_p


@equation(
    symbol="P_e",
    text="P_e = P_s/(η_m·η_d)",
    latex=r"P_e = \frac{P_s}{\eta_m\, \eta_d}",
    substitute="{P_s} / ({eta_m} × {eta_d})",
    reference="hi_power",
)
def electrical_power(P_s: Any, eta_m: Any, eta_d: Any) -> Any:
    r"""Electrical input power of the motor (and drive, when there is one).

    .. math:: P_e = \frac{P_s}{\eta_m \eta_d}

    Parameters
    ----------
    P_s : float
        Shaft power [W]
    eta_m : float
        Motor efficiency at its load [-]
    eta_d : float
        Variable-speed drive efficiency; 1 without a drive [-]

    Returns
    -------
    P_e : float
        Electrical input power [W]

    Examples
    --------
    >>> round(electrical_power(8836.7, 0.92, 1.0), 1)
    9605.1

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (wire-to-water efficiency).
    """
    return P_s / (eta_m * eta_d)


@equation(
    symbol="P_e",
    text="P_e = P_h/η_ww",
    latex=r"P_e = \frac{P_h}{\eta_{ww}}",
    substitute="{P_h} / {eta_ww}",
    reference="hi_power",
)
def wire_to_water_power(P_h: Any, eta_ww: Any) -> Any:
    r"""Electrical input power from an overall (wire-to-water) efficiency.

    .. math:: P_e = \frac{P_h}{\eta_{ww}}

    Parameters
    ----------
    P_h : float
        Hydraulic power [W]
    eta_ww : float
        Overall efficiency of pump, motor and any drive together [-]

    Returns
    -------
    P_e : float
        Electrical input power [W]

    Examples
    --------
    >>> round(wire_to_water_power(6362.44, 0.65), 1)
    9788.4

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (wire-to-water efficiency).
    """
    return P_h / eta_ww


@equation(
    symbol="P_1",
    text="P_1 = P/n_run",
    latex=r"P_1 = \frac{P}{n_{run}}",
    substitute="{P} / {n_run}",
    reference="karassik_2008",
)
def per_pump_power(P: Any, n_run: Any) -> Any:
    r"""Power of each of identical pumps sharing a duty.

    .. math:: P_1 = \frac{P}{n_{run}}

    Parameters
    ----------
    P : float
        Power of all the pumps running [W]
    n_run : float
        Pumps running [-]

    Returns
    -------
    P1 : float
        Power of one pump [W]

    Examples
    --------
    >>> per_pump_power(24e3, 2.0)
    12000.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008.
    """
    return P / n_run


PEAK_POINTS = 401


def _peak_text(values: dict[str, Any], result: float, write: Any) -> str:
    return (
        f"max over {PEAK_POINTS} flows from {write(values['flow'][0], 'm^3/s')} to "
        f"{write(values['flow'][-1], 'm^3/s')} of {write(values['rho'], 'kg/m^3')} × "
        f"{write.constant('g')} × Q × H_pump(Q) / η_p(Q), curves by monotone cubic"
    )


@equation(
    symbol="P_s,max",
    text="P_s,max = max over the curve of ρ·g·Q·H(Q)/η(Q)",
    latex=r"P_{s,max} = \max_{Q}\ \frac{\rho\, g\, Q\, H(Q)}{\eta(Q)}",
    substitute=_peak_text,
    reference="karassik_2008",
)
def peak_shaft_power(rho: Any, flow: Any, head: Any, efficiency: Any) -> Any:
    r"""Largest shaft power the pump takes anywhere on its curve (non-overloading basis).

    .. math:: P_{s,max} = \max_{Q}\ \frac{\rho g Q H(Q)}{\eta(Q)}

    Parameters
    ----------
    rho : float
        Density of the liquid (the densest case) [kg/m^3]
    flow : list of float
        Flows of the curve points at the operating speed [m^3/s]
    head : list of float
        Heads of the curve points [m]
    efficiency : list of float
        Efficiencies of the curve points [-]

    Returns
    -------
    P_max : float
        Peak shaft power between the curve's first and last point [W]

    Notes
    -----
    Evaluated on 401 evenly spaced flows where the interpolated efficiency
    is at least a tenth of its largest value (at shutoff the efficiency is
    zero and the power is not defined by this ratio; radial pumps take
    their least power there).

    Examples
    --------
    >>> round(peak_shaft_power(1000.0, [0.0, 0.01, 0.02], [40.0, 38.0, 30.0],
    ...                        [0.0, 0.7, 0.65]) / 1e3, 2)
    9.05

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (brake horsepower over the curve; non-overloading selection).
    """
    from calcreport.physics.pump import monotone_cubic

    q = np.linspace(flow[0], flow[-1], PEAK_POINTS)
    eta = monotone_cubic(flow, efficiency, q)
    usable = eta >= 0.1 * np.max(eta)
    power = rho * G * q[usable] * monotone_cubic(flow, head, q[usable]) / eta[usable]
    return float(np.max(power))


@equation(
    symbol="P_max",
    text="P_max = max_i P_e,i",
    latex=r"P_{max} = \max_i P_{e,i}",
    substitute=listed("P", "W", sep=", ", around="max({})"),
    reference="hi_power",
)
def peak_power(P: Any) -> Any:
    r"""Highest input power over a duty profile (the demand).

    .. math:: P_{max} = \max_i P_{e,i}

    Parameters
    ----------
    P : list of float
        Electrical input power at each profile point [W]

    Returns
    -------
    P_max : float
        Peak electrical demand [W]

    Examples
    --------
    >>> peak_power([1000.0, 1500.0])
    1500.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (demand charges).
    """
    return max(P)
