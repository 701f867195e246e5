"""Several pumps: the pumps running, each one's flow in parallel and the head of pumps in
series.
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation


@equation(
    symbol="n_run",
    text="n_run = n − n_out",
    latex=r"n_{run} = n - n_{out}",
    substitute="{n} − {n_out}",
    reference="karassik_2008",
)
def pumps_running(n: Any, n_out: Any) -> Any:
    r"""Number of identical pumps running when some are out of service.

    .. math:: n_{run} = n - n_{out}

    Parameters
    ----------
    n : float
        Pumps available [-]
    n_out : float
        Pumps out of service (standby, or one taken out for the case) [-]

    Returns
    -------
    n_run : float
        Pumps running [-]

    Examples
    --------
    >>> pumps_running(3.0, 1.0)
    2.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (firm capacity with the standby pump out of service).
    """
    return n - n_out


@equation(
    symbol="Q_1",
    text="Q_1 = Q/n_run",
    latex=r"Q_1 = \frac{Q}{n_{run}}",
    substitute="{Q} / {n_run}",
    reference="karassik_2008",
)
def per_pump_flow(Q: Any, n_run: Any) -> Any:
    r"""Flow of each of identical pumps running in parallel.

    .. math:: Q_1 = \frac{Q}{n_{run}}

    Parameters
    ----------
    Q : float
        Total flow of the pumps in parallel [m^3/s]
    n_run : float
        Pumps running [-]

    Returns
    -------
    Q1 : float
        Flow of one pump, at the common head [m^3/s]

    Examples
    --------
    >>> per_pump_flow(0.06, 2.0)
    0.03

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (identical pumps in parallel: flows add at equal head).
    """
    return Q / n_run


@equation(
    symbol="H_pumps",
    text="H_pumps = n_run·H_1",
    latex=r"H_{pumps} = n_{run}\, H_1",
    substitute="{n_run} × {H1}",
    reference="karassik_2008",
)
def series_head(H1: Any, n_run: Any) -> Any:
    r"""Head of identical pumps running in series.

    .. math:: H_{pumps} = n_{run} H_1

    Parameters
    ----------
    H1 : float
        Head of one pump at the common flow [m]
    n_run : float
        Pumps running in series [-]

    Returns
    -------
    H : float
        Head of the pumps together [m]

    Examples
    --------
    >>> series_head(30.0, 2.0)
    60.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (identical pumps in series: heads add at equal flow).
    """
    return n_run * H1
