"""Impeller trim: a curve moved to a cut-down impeller by the affinity relation for diameter,
approximate and valid for small trims only (the manufacturer's trimmed curve governs).
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation


@equation(
    symbol="Q_D",
    text="Q_D = Q_0·(D/D_0)",
    latex=r"Q_D = Q_0\,\frac{D}{D_0}",
    substitute="{Q0} × {r}",
    reference="karassik_2008",
)
def trimmed_flow(Q0: Any, r: Any) -> Any:
    r"""Flow of a curve point moved to a trimmed impeller (same speed).

    .. math:: Q_D = Q_0 \frac{D}{D_0}

    Parameters
    ----------
    Q0 : float
        Flow of the full-diameter curve point [m^3/s]
    r : float
        Trim, the diameter ratio D/D0 (at most 1) [-]

    Returns
    -------
    Q : float
        Flow of the trimmed impeller at the corresponding point [m^3/s]

    Notes
    -----
    The affinity relation for diameter holds for geometric similarity, which a trim
    breaks: it is an approximation for small trims, closer for low specific speeds.

    Examples
    --------
    >>> round(trimmed_flow(0.030, 0.95), 12)
    0.0285

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (affinity laws for a change of impeller diameter).
    """
    return Q0 * r


@equation(
    symbol="H_D",
    text="H_D = H_0·(D/D_0)²",
    latex=r"H_D = H_0\left(\frac{D}{D_0}\right)^2",
    substitute="{H0} × ({r})²",
    reference="karassik_2008",
)
def trimmed_head(H0: Any, r: Any) -> Any:
    r"""Head of a curve point moved to a trimmed impeller (same speed).

    .. math:: H_D = H_0 \left(\frac{D}{D_0}\right)^2

    Parameters
    ----------
    H0 : float
        Head of the full-diameter curve point [m]
    r : float
        Trim, the diameter ratio D/D0 (at most 1) [-]

    Returns
    -------
    H : float
        Head of the trimmed impeller at the corresponding point [m]

    Examples
    --------
    >>> round(trimmed_head(30.0, 0.9), 10)
    24.3

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (affinity laws for a change of impeller diameter).
    """
    return H0 * r * r
