"""Power and energy of a pump: hydraulic, shaft and electrical; energy and cost.

Power
    hydraulic_power, shaft_power, electrical_power, wire_to_water_power, peak_shaft_power,
    per_pump_power
Energy
    hours_to_seconds, fill_time, annual_energy, specific_energy
Duty profile
    profile_energy, profile_volume, energy_per_volume, throttling_power, peak_power, time_sum
Cost
    annual_cost, demand_cost, cost_sum, present_value
"""

from __future__ import annotations

from typing import Any

import numpy as np

from calcreport.physics.equation import equation, listed, paired
from calcreport.physics.losses import G

__all__ = [
    "annual_cost",
    "annual_energy",
    "cost_sum",
    "demand_cost",
    "electrical_power",
    "energy_per_volume",
    "fill_time",
    "hours_to_seconds",
    "hydraulic_power",
    "peak_power",
    "peak_shaft_power",
    "per_pump_power",
    "present_value",
    "profile_energy",
    "profile_volume",
    "shaft_power",
    "specific_energy",
    "throttling_power",
    "time_sum",
    "wire_to_water_power",
]

JOULES_PER_KWH = 3.6e6


@equation(
    symbol="P_h",
    text="P_h = ρ·g·Q·H",
    latex=r"P_h = \rho\, g\, Q\, H",
    substitute="{rho} × 9.80665 m/s² × {Q} × {H}",
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
    symbol="t",
    text="t = hours × 3600 s/h",
    latex=r"t = n_h \times 3600\ \mathrm{s/h}",
    substitute="{hours} × 3600 s/h",
    reference="nist_sp811",
)
def hours_to_seconds(hours: Any) -> Any:
    r"""Operating time in seconds from a number of hours.

    .. math:: t = n_h \times 3600\ \mathrm{s/h}

    Parameters
    ----------
    hours : float
        Operating hours per year [-]

    Returns
    -------
    t : float
        Operating time per year [s]

    Examples
    --------
    >>> hours_to_seconds(2.0)
    7200.0

    References
    ----------
    1. NIST Special Publication 811, 2008, Appendix B (1 h = 3600 s).
    """
    return hours * 3600.0


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
    symbol="E",
    text="E = P_e·t",
    latex=r"E = P_e\, t",
    substitute="{P_e} × {t}",
    reference="hi_power",
)
def annual_energy(P_e: Any, t: Any) -> Any:
    r"""Energy taken in a year of operation at constant input power.

    .. math:: E = P_e t

    Parameters
    ----------
    P_e : float
        Electrical input power [W]
    t : float
        Operating time per year [s]

    Returns
    -------
    E : float
        Annual energy [J]

    Examples
    --------
    >>> annual_energy(1000.0, 3600.0) / 3.6e6
    1.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004.
    """
    return P_e * t


@equation(
    symbol="C",
    text="C = E/(3.6 MJ/kWh)·c_e",
    latex=r"C = \frac{E}{3.6\ \mathrm{MJ/kWh}}\, c_e",
    substitute="{E} / (3.6e6 J/kWh) × {price} /kWh",
    reference="hi_power",
)
def annual_cost(E: Any, price: Any) -> Any:
    r"""Annual energy cost at a flat price per kWh.

    .. math:: C = \frac{E}{3.6\ \mathrm{MJ/kWh}} c_e

    Parameters
    ----------
    E : float
        Annual energy [J]
    price : float
        Energy price per kWh, in the project currency [-]

    Returns
    -------
    C : float
        Annual energy cost, in the project currency [-]

    Examples
    --------
    >>> annual_cost(3.6e9, 0.14)
    140.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004.
    """
    return E / JOULES_PER_KWH * price


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


def _peak_text(values: dict[str, Any], result: float, fmt: Any) -> str:
    return (
        f"max over {PEAK_POINTS} flows from {fmt(values['flow'][0])} to "
        f"{fmt(values['flow'][-1])} m³/s of {fmt(values['rho'])} kg/m³ × 9.80665 m/s² × "
        f"Q × H_pump(Q) / η_p(Q), curves by monotone cubic"
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
    symbol="e_V",
    text="e_V = P_e/Q",
    latex=r"e_V = \frac{P_e}{Q}",
    substitute="{P_e} / {Q}",
    reference="hi_power",
)
def specific_energy(P_e: Any, Q: Any) -> Any:
    r"""Electrical energy per volume pumped.

    .. math:: e_V = \frac{P_e}{Q}

    Parameters
    ----------
    P_e : float
        Electrical input power [W]
    Q : float
        Flow delivered [m^3/s]

    Returns
    -------
    e_V : float
        Specific energy; 1 kWh/m^3 = 3.6e6 J/m^3 [J/m^3]

    Examples
    --------
    >>> specific_energy(3600.0, 0.01) / 3.6e6
    0.1

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (specific energy).
    """
    return P_e / Q


@equation(
    symbol="t",
    text="t = V/Q",
    latex=r"t = \frac{V}{Q}",
    substitute="{V} / {Q}",
    reference="hi_power",
)
def fill_time(V: Any, Q: Any) -> Any:
    r"""Pumping time per year of a fill duty: the annual volume at the operating flow.

    .. math:: t = \frac{V}{Q}

    Parameters
    ----------
    V : float
        Volume to be pumped per year [m^3]
    Q : float
        Operating flow [m^3/s]

    Returns
    -------
    t : float
        Operating time per year [s]

    Notes
    -----
    The energy of a fill duty, V ρ g H / η, then does not depend on an assumed
    number of hours.

    Examples
    --------
    >>> fill_time(3600.0, 0.02) / 3600.0
    50.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004.
    """
    return V / Q


@equation(
    symbol="C_d",
    text="C_d = P_e/(1000 W/kW)·c_d·12",
    latex=r"C_d = \frac{P_e}{1000\ \mathrm{W/kW}}\, c_d \times 12",
    substitute="{P_e} / (1000 W/kW) × {rate} /kW/month × 12 months",
    reference="hi_power",
)
def demand_cost(P_e: Any, rate: Any) -> Any:
    r"""Annual demand charge on the electrical input power, billed monthly.

    .. math:: C_d = \frac{P_e}{1000\ \mathrm{W/kW}}\, c_d \times 12

    Parameters
    ----------
    P_e : float
        Electrical input power (the demand) [W]
    rate : float
        Demand charge per kW per month, in the project currency [-]

    Returns
    -------
    C_d : float
        Annual demand charge, in the project currency [-]

    Examples
    --------
    >>> demand_cost(10e3, 14.0)
    1680.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (demand charges).
    """
    return P_e / 1000.0 * rate * 12.0


@equation(
    symbol="C",
    text="C = ΣC_i",
    latex=r"C = \sum_i C_i",
    substitute=listed("costs"),
    reference="hi_power",
)
def cost_sum(costs: Any) -> Any:
    r"""Sum of annual cost items.

    .. math:: C = \sum_i C_i

    Parameters
    ----------
    costs : list of float
        Annual costs, in the project currency [-]

    Returns
    -------
    C : float
        Their sum [-]

    Examples
    --------
    >>> cost_sum([1200.0, 300.0])
    1500.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004.
    """
    return sum(costs)


@equation(
    symbol="PV",
    text="PV = C·[1 − (1 + i)^−n]/i",
    latex=r"PV = C\, \frac{1 - (1 + i)^{-n}}{i}",
    substitute="{C} × [1 − (1 + {rate})^−{years}] / {rate}",
    reference="hi_lcc",
)
def present_value(C: Any, rate: Any, years: Any) -> Any:
    r"""Present value of a constant annual cost over a life, at a discount rate.

    .. math:: PV = C \frac{1 - (1 + i)^{-n}}{i}

    Parameters
    ----------
    C : float
        Annual cost, in the project currency [-]
    rate : float
        Discount rate per year; zero gives C·n [-]
    years : float
        Life in years [-]

    Returns
    -------
    PV : float
        Present value, in the project currency [-]

    Examples
    --------
    >>> round(present_value(1000.0, 0.05, 20.0), 2)
    12462.21

    References
    ----------
    1. Hydraulic Institute and Europump, Pump Life Cycle Costs: A Guide to LCC
       Analysis for Pumping Systems, 2001 (present value of energy cost).
    """
    if rate == 0:
        return C * years
    return C * (1.0 - (1.0 + rate) ** -years) / rate


@equation(
    symbol="E",
    text="E = Σ P_e,i·t_i",
    latex=r"E = \sum_i P_{e,i}\, t_i",
    substitute=paired("P", "W", "×", "t", "s", empty="0 J"),
    reference="hi_power",
)
def profile_energy(P: Any, t: Any) -> Any:
    r"""Energy of a duty profile: each point's input power for its time.

    .. math:: E = \sum_i P_{e,i} t_i

    Parameters
    ----------
    P : list of float
        Electrical input power at each profile point [W]
    t : list of float
        Time a year at each point, in the same order [s]

    Returns
    -------
    E : float
        Annual energy [J]

    Examples
    --------
    >>> profile_energy([1000.0, 500.0], [3600.0, 7200.0]) / 3.6e6
    2.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (energy over a duty cycle).
    """
    return sum(p * s for p, s in zip(P, t, strict=True))


@equation(
    symbol="V",
    text="V = Σ Q_i·t_i",
    latex=r"V = \sum_i Q_i\, t_i",
    substitute=paired("Q", "m³/s", "×", "t", "s", empty="0 m³"),
    reference="hi_power",
)
def profile_volume(Q: Any, t: Any) -> Any:
    r"""Volume pumped in a year over a duty profile.

    .. math:: V = \sum_i Q_i t_i

    Parameters
    ----------
    Q : list of float
        Flow at each profile point [m^3/s]
    t : list of float
        Time a year at each point, in the same order [s]

    Returns
    -------
    V : float
        Annual volume [m^3]

    Examples
    --------
    >>> profile_volume([0.02, 0.01], [3600.0, 3600.0])
    108.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (duty cycle).
    """
    return sum(q * s for q, s in zip(Q, t, strict=True))


@equation(
    symbol="e_V",
    text="e_V = E/V",
    latex=r"e_V = \frac{E}{V}",
    substitute="{E} / {V}",
    reference="hi_power",
)
def energy_per_volume(E: Any, V: Any) -> Any:
    r"""Specific energy: energy taken per volume pumped.

    .. math:: e_V = \frac{E}{V}

    Parameters
    ----------
    E : float
        Annual energy [J]
    V : float
        Annual volume pumped [m^3]

    Returns
    -------
    e_V : float
        Specific energy [J/m^3]

    Examples
    --------
    >>> energy_per_volume(3.6e6, 10.0) / 3.6e6
    0.1

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (specific energy).
    """
    return E / V


@equation(
    symbol="P_thr",
    text="P_thr = P_e·h_thr/H",
    latex=r"P_{thr} = P_e \frac{h_{thr}}{H}",
    substitute="{P_e} × {h_thr} / {H}",
    reference="hi_power",
)
def throttling_power(P_e: Any, h_thr: Any, H: Any) -> Any:
    r"""Part of the input power spent across a throttling valve.

    .. math:: P_{thr} = P_e \frac{h_{thr}}{H}

    Parameters
    ----------
    P_e : float
        Electrical input power at the point [W]
    h_thr : float
        Head burnt in the throttling valve [m]
    H : float
        Head the pump delivers [m]

    Returns
    -------
    P_thr : float
        Input power spent on throttling [W]

    Examples
    --------
    >>> throttling_power(10000.0, 5.0, 40.0)
    1250.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (throttling losses: the
       pump's head above the system's is dissipated in the valve).
    """
    return P_e * h_thr / H


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


@equation(
    symbol="t",
    text="t = Σ t_i",
    latex=r"t = \sum_i t_i",
    substitute=listed("t", "s"),
    reference="hi_power",
)
def time_sum(t: Any) -> Any:
    r"""Operating time a year over a duty profile.

    .. math:: t = \sum_i t_i

    Parameters
    ----------
    t : list of float
        Time a year at each profile point [s]

    Returns
    -------
    t_total : float
        Operating time a year [s]

    Examples
    --------
    >>> time_sum([3600.0, 7200.0])
    10800.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (duty cycle).
    """
    return sum(t)
