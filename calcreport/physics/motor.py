"""Motor sizing: the next standard rating at or above the power the pump can demand.

Rating
    standard_rating, derated_requirement
Loading
    loading
"""

from __future__ import annotations

from typing import Any

from calcreport.physics.equation import equation

__all__ = [
    "RATING_SERIES",
    "SERVICE_STANDARDS",
    "derated_requirement",
    "loading",
    "standard_rating",
]

# The standard each series of ratings comes from, and those that set usual service conditions.
RATING_SERIES = {"IEC": "IEC 60072-1", "NEMA": "NEMA MG 1"}
SERVICE_STANDARDS = "IEC 60034-1, NEMA MG 1"


def _ratings_text(values: dict[str, Any], result: float, write: Any) -> str:
    below = [r for r in values["ratings"] if r < result]
    shown = f"{write(below[-1], 'W')} < " if below else ""
    return (
        f"smallest standard rating ≥ {write(values['P'], 'W')} in the series: "
        f"{shown}{write(values['P'], 'W')} ≤ {write(result, 'W')}"
    )


@equation(
    symbol="P_motor",
    text="P_motor = min{P_r ∈ series : P_r ≥ P_required}",
    latex=r"P_{motor} = \min\{P_r \in \mathrm{series} : P_r \geq P_{req}\}",
    substitute=_ratings_text,
    reference="iec_60072",
    units="display",
)
def standard_rating(P: Any, ratings: Any) -> Any:
    r"""The smallest standard motor rating not below a required output.

    .. math:: P_{motor} = \min\{P_r \in \mathrm{series} : P_r \geq P_{req}\}

    Parameters
    ----------
    P : float
        Required motor output (shaft power with any margin) [W]
    ratings : list of float
        Standard ratings of the series, ascending [W]

    Returns
    -------
    P_motor : float
        Selected rating [W]

    Notes
    -----
    Raises ValueError when the requirement exceeds the largest rating of
    the series: such a drive is outside this catalogue.

    Examples
    --------
    >>> standard_rating(10.6e3, [7.5e3, 11e3, 15e3])
    11000.0

    References
    ----------
    1. IEC 60072-1 (kW series); NEMA MG 1 (hp series).
    """
    for rating in ratings:
        if rating >= P:
            return float(rating)
    raise ValueError(
        f"a motor of {P / 1e3:.4g} kW exceeds the largest standard rating listed "
        f"({ratings[-1] / 1e3:.4g} kW)"
    )


@equation(
    symbol="P_req",
    text="P_req = P/k",
    latex=r"P_{req} = \frac{P}{k}",
    substitute="{P} / {k}",
    reference="iec_60034_1",
)
def derated_requirement(P: Any, k: Any) -> Any:
    r"""Nameplate output a motor needs when its site derates it.

    .. math:: P_{req} = \frac{P}{k}

    Parameters
    ----------
    P : float
        Largest shaft power the motor must deliver [W]
    k : float
        Derating factor for the site's altitude and ambient temperature, from the
        motor manufacturer [-]

    Returns
    -------
    P_req : float
        Required rated output [W]

    Examples
    --------
    >>> derated_requirement(9000.0, 0.9)
    10000.0

    References
    ----------
    1. IEC 60034-1, Rotating electrical machines - Part 1: Rating and performance
       (rated output holds up to 1000 m altitude and 40 °C coolant; beyond, the
       manufacturer's derating applies).
    """
    return P / k


@equation(
    symbol="λ",
    text="λ = P_s/P_motor",
    latex=r"\lambda = \frac{P_s}{P_{motor}}",
    substitute="{P} / {P_rated}",
    reference="karassik_2008",
)
def loading(P: Any, P_rated: Any) -> Any:
    r"""Motor loading: the shaft power it delivers over its rated output.

    .. math:: \lambda = \frac{P_s}{P_{motor}}

    Parameters
    ----------
    P : float
        Shaft power of the pump the motor drives [W]
    P_rated : float
        Rated output of the motor [W]

    Returns
    -------
    loading : float
        Fraction of the rated output [-]

    Examples
    --------
    >>> loading(11000.0, 15000.0)
    0.7333333333333333

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (driver selection: the driver's rating against the pump's power).
    """
    return P / P_rated
