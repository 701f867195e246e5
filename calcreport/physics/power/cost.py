"""Cost: energy and demand charges, their sum, and the present value of a yearly cost."""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation, listed
from calcreport.physics.power.energy import JOULES_PER_KWH


@equation(
    symbol="C",
    text="C = E/(3.6 MJ/kWh)·c_e",
    latex=r"C = \frac{E}{3.6\ \mathrm{MJ/kWh}}\, c_e",
    substitute="{E:kWh} × {price} /kWh",
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
    symbol="C_d",
    text="C_d = P_e/(1000 W/kW)·c_d·12",
    latex=r"C_d = \frac{P_e}{1000\ \mathrm{W/kW}}\, c_d \times 12",
    substitute="{P_e:kW} × {rate} /kW/month × 12 months",
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
    symbol="LCC",
    text="LCC = C_ic + (C_e + C_m)·[1 − (1 + i)^−n]/i",
    latex=r"LCC = C_{ic} + (C_e + C_m)\, \frac{1 - (1 + i)^{-n}}{i}",
    substitute="{capital} + ({energy} + {maintenance}) × [1 − (1 + {rate})^−{years}] / {rate}",
    reference="hi_lcc",
)
def life_cycle_cost(capital: Any, energy: Any, maintenance: Any, rate: Any, years: Any) -> Any:
    r"""Life-cycle cost of a pump offer: its initial cost and the present value of its annual
    energy and maintenance costs over the life.

    .. math:: LCC = C_{ic} + (C_e + C_m) \frac{1 - (1 + i)^{-n}}{i}

    The other elements of the guide's sum (installation, operation, down time,
    environment, disposal) are taken equal between offers unless given in the capital
    cost.

    Parameters
    ----------
    capital : float
        Initial cost of the offer, in the project currency [-]
    energy : float
        Annual energy cost, in the project currency [-]
    maintenance : float
        Annual maintenance cost, in the project currency [-]
    rate : float
        Discount rate per year; zero gives the plain sum over the life [-]
    years : float
        Life in years [-]

    Returns
    -------
    LCC : float
        Life-cycle cost, in the project currency [-]

    Examples
    --------
    >>> round(life_cycle_cost(10000.0, 1000.0, 200.0, 0.05, 20.0), 2)
    24954.65

    References
    ----------
    1. Hydraulic Institute and Europump, Pump Life Cycle Costs: A Guide to LCC
       Analysis for Pumping Systems, 2001 (LCC = Cic + Cin + Ce + Co + Cm + Cs + Cenv +
       Cd, recurring costs at their present value).
    """
    return capital + present_value(energy + maintenance, rate, years)


def _length_text(values: dict[str, Any], result: float, write: Any) -> str:
    lengths = " + ".join(write(length, "m") for length in values["L"])
    return f"{write(values['c'], '1/m')} × ({lengths})"


@equation(
    symbol="C_pipe",
    text="C_pipe = c_L·ΣL_i",
    latex=r"C_{pipe} = c_L \sum_i L_i",
    substitute=_length_text,
    reference="hi_lcc",
)
def length_cost(c: Any, L: Any) -> Any:
    r"""Initial cost of pipes priced by length.

    .. math:: C_{pipe} = c_L \sum_i L_i

    Parameters
    ----------
    c : float
        Installed cost per metre of pipe, in the project currency [1/m]
    L : list of float
        Length of each pipe [m]

    Returns
    -------
    C_pipe : float
        Initial cost of the pipes, in the project currency [-]

    Examples
    --------
    >>> length_cost(120.0, [60.0, 85.0])
    17400.0

    References
    ----------
    1. Hydraulic Institute and Europump, Pump Life Cycle Costs: A Guide to LCC
       Analysis for Pumping Systems, 2001 (initial costs of the system, piping included).
    """
    return c * sum(L)
