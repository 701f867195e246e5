"""The operating region: flow against the best efficiency point, the region's flows, and
the liquid's temperature rise through the pump with the flow at which it reaches a limit.
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation
from calcreport.physics.losses import G


def _thermal_text(values: dict[str, Any], result: float, write: Any) -> str:
    return (
        f"Q = {write(values['Q'], 'm^3/s')}, the flow between the first curve point and the BEP "
        "where ΔT(Q) = ΔT_max, bracketed and refined by the Illinois method; confirmed by "
        "the temperature-rise step at that flow"
    )


@equation(
    symbol="Q_th",
    text="Q_th: ΔT(Q_th) = ΔT_max",
    latex=r"\Delta T(Q_{th}) = \Delta T_{max}",
    substitute=_thermal_text,
    reference="karassik_2008",
    units="display",
)
def thermal_flow(Q: Any) -> Any:
    r"""The thermal minimum flow found by the root finder, recorded as a step.

    .. math:: \Delta T(Q_{th}) = \Delta T_{max}

    Parameters
    ----------
    Q : float
        Flow returned by the root finder [m^3/s]

    Returns
    -------
    Q_th : float
        Thermal minimum flow [m^3/s]

    Notes
    -----
    The value is the solver's; the temperature-rise step at this flow, whose
    result is the limit, proves it.

    Examples
    --------
    >>> thermal_flow(0.004)
    0.004

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (temperature rise through a pump at low flow).
    """
    return Q


@equation(
    symbol="Q/Q_BEP",
    text="Q/Q_BEP = Q / Q_BEP",
    latex=r"\frac{Q}{Q_{BEP}} = \frac{Q}{Q_{BEP}}",
    substitute="{Q} / {Q_bep}",
    reference="hi_por",
)
def flow_ratio(Q: Any, Q_bep: Any) -> Any:
    r"""A pump's flow as a fraction of its best-efficiency flow (operating regions).

    .. math:: r = \frac{Q}{Q_{BEP}}

    Parameters
    ----------
    Q : float
        Flow of the pump, at the speed its BEP flow is given for [m^3/s]
    Q_bep : float
        Best-efficiency flow at the same speed [m^3/s]

    Returns
    -------
    r : float
        Flow ratio [-]

    Notes
    -----
    At another speed both flows move in proportion (affinity laws), so the
    ratio at corresponding points is the same at any speed.

    Examples
    --------
    >>> round(flow_ratio(0.018, 0.024), 6)
    0.75

    References
    ----------
    1. ANSI/HI 9.6.3, Rotodynamic Pumps - Guideline for Operating Regions
       (regions as fractions of the BEP flow).
    """
    return Q / Q_bep


@equation(
    symbol="Q_r",
    text="Q_r = r·Q_BEP",
    latex=r"Q_r = r\, Q_{BEP}",
    substitute="{r} × {Q_bep}",
    reference="hi_por",
)
def region_flow(r: Any, Q_bep: Any) -> Any:
    r"""The flow at a bound of an operating region given as a fraction of the BEP flow.

    .. math:: Q_r = r\, Q_{BEP}

    Parameters
    ----------
    r : float
        The bound as a fraction of the best-efficiency flow [-]
    Q_bep : float
        Best-efficiency flow [m^3/s]

    Returns
    -------
    Q_r : float
        Flow at the bound [m^3/s]

    Examples
    --------
    >>> round(region_flow(0.7, 0.024), 6)
    0.0168

    References
    ----------
    1. ANSI/HI 9.6.3, Rotodynamic Pumps - Guideline for Operating Regions.
    """
    return r * Q_bep


@equation(
    symbol="ΔT",
    text="ΔT = g·H·(1 − η)/(c_p·η)",
    latex=r"\Delta T = \frac{g H (1 - \eta)}{c_p\, \eta}",
    substitute="{g} × {H} × (1 − {eta}) / ({cp} × {eta})",
    reference="karassik_2008",
)
def temperature_rise(H: Any, eta: Any, cp: Any) -> Any:
    r"""Temperature rise of the liquid through a pump whose losses all go into it.

    .. math:: \Delta T = \frac{g H (1 - \eta)}{c_p \eta}

    Parameters
    ----------
    H : float
        Pump head at the flow [m]
    eta : float
        Pump efficiency at the flow [-]
    cp : float
        Specific heat capacity of the liquid [J/(kg*K)]

    Returns
    -------
    dT : float
        Temperature rise from suction to discharge (a difference) [delta_degC]

    Notes
    -----
    The rise grows without bound toward shutoff, where the efficiency goes to
    zero: the thermal minimum flow is where it reaches the allowed rise.

    Examples
    --------
    >>> round(temperature_rise(40.0, 0.2, 4182.0), 4)
    0.3752

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (temperature rise and thermal minimum flow of centrifugal pumps).
    """
    return G * H * (1.0 - eta) / (cp * eta)
