"""Control valves for liquids: the flow coefficient a duty needs (IEC 60534-2-1, turbulent
flow of an incompressible fluid), the pressure drop at which the flow chokes, and the
valve's authority in its circuit.
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation

RHO_WATER_15C = 999.1  # kg/m^3: the reference density ρ0 of the coefficients (water, 15 °C)
BAR = 1e5  # Pa


@equation(
    symbol="K_v",
    text="K_v = Q·√((ρ/ρ0)/Δp), Q in m³/h, Δp in bar",
    latex=r"K_v = Q\,\sqrt{\frac{\rho/\rho_0}{\Delta p}}",
    substitute="{Q:m^3/h} × √(({rho} / 999.1 kg/m³) / {dp:bar})",
    reference="iec_60534_2_1",
    units="fixed",  # a coefficient defined in m³/h and bar
)
def flow_coefficient(Q: Any, rho: Any, dp: Any) -> Any:
    r"""Flow coefficient K_v of a valve passing a liquid in turbulent, non-choked flow.

    .. math:: K_v = \frac{Q}{N_1}\sqrt{\frac{\rho_1/\rho_0}{\Delta p}}

    with N1 = 1 for K_v, Q in m³/h and Δp in bar.

    Parameters
    ----------
    Q : float
        Volume flow through the valve [m^3/s]
    rho : float
        Liquid density at the valve inlet [kg/m^3]
    dp : float
        Pressure drop across the valve [Pa]

    Returns
    -------
    Kv : float
        Flow coefficient, in m³/h of water at 1 bar [-]

    Examples
    --------
    >>> round(flow_coefficient(0.01, 999.1, 1e5), 6)
    36.0

    References
    ----------
    1. IEC 60534-2-1:2011, equation for incompressible fluids in turbulent non-choked flow
       (N1 = 1 for K_v in m³/h with Δp in bar; from memory).
    """
    return Q * 3600.0 * math.sqrt((rho / RHO_WATER_15C) / (dp / BAR))


@equation(
    symbol="Δp_ch",
    text="Δp_ch = F_L²·(p1 − F_F·p_v), F_F = 0.96 − 0.28·√(p_v/p_c)",
    latex=r"\Delta p_{ch} = F_L^2\left(p_1 - F_F\, p_v\right),\ "
    r"F_F = 0.96 - 0.28\sqrt{p_v/p_c}",
    substitute="({FL})² × ({p1} − (0.96 − 0.28 × √({pv} / {pc})) × {pv})",
    reference="iec_60534_2_1",
)
def choked_pressure_drop(FL: Any, p1: Any, pv: Any, pc: Any) -> Any:
    r"""Pressure drop at which a liquid's flow through a valve chokes (flashing or
    cavitation limits it).

    .. math:: \Delta p_{ch} = F_L^2 \left(p_1 - F_F\, p_v\right),\qquad
        F_F = 0.96 - 0.28\sqrt{\frac{p_v}{p_c}}

    Parameters
    ----------
    FL : float
        Liquid pressure recovery factor of the valve (manufacturer's) [-]
    p1 : float
        Absolute pressure at the valve inlet [Pa]
    pv : float
        Vapour pressure of the liquid at the inlet temperature [Pa]
    pc : float
        Critical pressure of the liquid (22.064 MPa for water) [Pa]

    Returns
    -------
    dp_choked : float
        The largest effective pressure drop, beyond which the flow no longer grows [Pa]

    Examples
    --------
    >>> round(choked_pressure_drop(0.9, 5e5, 2339.0, 22.064e6) / 1e3, 2)
    403.19

    References
    ----------
    1. IEC 60534-2-1:2011, choked flow of incompressible fluids and the liquid critical
       pressure ratio factor F_F (from memory).
    """
    FF = 0.96 - 0.28 * math.sqrt(pv / pc)
    return FL**2 * (p1 - FF * pv)


@equation(
    symbol="N_v",
    text="N_v = Δp_valve/(Δp_valve + Δp_rest)",
    latex=r"N_v = \frac{\Delta p_{valve}}{\Delta p_{valve} + \Delta p_{rest}}",
    substitute="{dp_valve} / ({dp_valve} + {dp_rest})",
    reference="common_practice",
)
def valve_authority(dp_valve: Any, dp_rest: Any) -> Any:
    r"""Authority of a control valve: its share of the pressure drop of the circuit it
    controls, fully open at the design flow.

    .. math:: N_v = \frac{\Delta p_{valve}}{\Delta p_{valve} + \Delta p_{rest}}

    Parameters
    ----------
    dp_valve : float
        Pressure drop across the valve at the design flow [Pa]
    dp_rest : float
        Pressure drop of the rest of the controlled circuit at that flow [Pa]

    Returns
    -------
    authority : float
        The valve's authority, 0 to 1 [-]

    Examples
    --------
    >>> valve_authority(50e3, 50e3)
    0.5

    References
    ----------
    1. Common practice in the control of hydronic circuits (an authority of about 0.5 is
       usually sought; no published source here).
    """
    return dp_valve / (dp_valve + dp_rest)
