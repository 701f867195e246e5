"""Energy over time: hours in seconds, annual energy, energy per volume pumped, fill time,
the duty profile's energy, volume and time, the power lost to throttling, and the energy
one way of running the pumps saves against another.
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation, listed, paired

JOULES_PER_KWH = 3.6e6


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
    symbol="E",
    text="E = P_e·t",
    latex=r"E = P_e\, t",
    substitute="{P_e:kW} × {t:h}",
    reference="hi_power",
    shown_in="kWh",
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
    symbol="E",
    text="E = Σ P_e,i·t_i",
    latex=r"E = \sum_i P_{e,i}\, t_i",
    substitute=paired("P", "W", "×", "t", "s", shown=("kW", "h"), empty="0"),
    reference="hi_power",
    shown_in="kWh",
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
    substitute=paired("Q", "m^3/s", "×", "t", "s", empty="0"),
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


@equation(
    symbol="ΔE",
    text="ΔE = E_ref − E",
    latex=r"\Delta E = E_{ref} - E",
    substitute="{E_ref:kWh} − {E:kWh}",
    reference="hi_power",
    shown_in="kWh",
)
def energy_saving(E_ref: Any, E: Any) -> Any:
    r"""Annual energy saved by one way of running the pumps against another.

    .. math:: \Delta E = E_{ref} - E

    Parameters
    ----------
    E_ref : float
        Annual energy of the reference way of running (the design's pumps) [J]
    E : float
        Annual energy of the way compared with it [J]

    Returns
    -------
    dE : float
        Annual energy saved; negative where the way compared takes more [J]

    Notes
    -----
    Both energies are taken over the same duty profile (the same flows and hours), so the
    difference is the energy the choice of running saves and nothing else.

    Examples
    --------
    >>> energy_saving(7.2e9, 5.4e9) / 3.6e6
    500.0

    References
    ----------
    1. Hydraulic Institute, Europump and US DOE, Variable Speed Pumping:
       A Guide to Successful Applications, 2004 (comparing the energy of ways of
       running the pumps over a duty cycle).
    """
    return E_ref - E
