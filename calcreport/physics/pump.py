"""Pump performance: curve interpolation, affinity laws, operating point, NPSH margin.

Curves
    head_at, efficiency_at, npsh_required_at, best_efficiency_point, monotone_cubic
Speed
    affinity_flow, affinity_head, specific_speed, lift_speed
Operating point
    operating_point, solved_flow, head_balance
Several pumps
    pumps_running, per_pump_flow, series_head
NPSH
    npsh_margin, npsh_margin_ratio

Curves are interpolated by the monotone piecewise-cubic Hermite method of
Fritsch and Carlson (slopes by the weighted harmonic mean of Fritsch and
Butland), which passes through every given point and never overshoots
between them; a curve is never extrapolated past its first or last point.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Any

import numpy as np

from calcreport.errors import ConvergenceError
from calcreport.physics.equation import equation, listed
from calcreport.physics.losses import G

__all__ = [
    "affinity_flow",
    "affinity_head",
    "best_efficiency_point",
    "curve_max_head",
    "efficiency_at",
    "efficiency_from_power",
    "flow_ratio",
    "head_at",
    "head_balance",
    "lift_speed",
    "monotone_cubic",
    "npsh_margin",
    "npsh_margin_ratio",
    "npsh_needed",
    "npsh_required_at",
    "operating_point",
    "per_pump_flow",
    "pumps_running",
    "region_flow",
    "series_head",
    "solved_flow",
    "solved_speed",
    "specific_speed",
    "temperature_rise",
    "thermal_flow",
    "throttling_loss",
]

_MAX_ITERATIONS = 100


def _slopes(x: np.ndarray, y: np.ndarray) -> np.ndarray:
    h = np.diff(x)
    delta = np.diff(y) / h
    n = len(x)
    d = np.zeros(n)
    if n == 2:
        d[:] = delta[0]
        return d
    for k in range(1, n - 1):
        if delta[k - 1] * delta[k] > 0.0:
            w1 = 2.0 * h[k] + h[k - 1]
            w2 = h[k] + 2.0 * h[k - 1]
            d[k] = (w1 + w2) / (w1 / delta[k - 1] + w2 / delta[k])
    for end, (h0, h1, d0, d1) in (
        (0, (h[0], h[1], delta[0], delta[1])),
        (n - 1, (h[-1], h[-2], delta[-1], delta[-2])),
    ):
        slope = ((2.0 * h0 + h1) * d0 - h0 * d1) / (h0 + h1)
        if np.sign(slope) != np.sign(d0):
            slope = 0.0
        elif np.sign(d0) != np.sign(d1) and abs(slope) > abs(3.0 * d0):
            slope = 3.0 * d0
        d[end] = slope
    return d


def monotone_cubic(x: Any, y: Any, xq: Any) -> Any:
    r"""Monotone piecewise-cubic Hermite interpolation (PCHIP) of y(x) at xq.

    .. math:: p(t) = h_{00}(t) y_k + h_{10}(t) \Delta x\, d_k + h_{01}(t) y_{k+1}
        + h_{11}(t) \Delta x\, d_{k+1}

    Parameters
    ----------
    x : list of float
        Abscissae, strictly increasing [-]
    y : list of float
        Ordinates [-]
    xq : float
        Where to interpolate, within [x[0], x[-1]] (scalar or array) [-]

    Returns
    -------
    yq : float
        Interpolated value [-]

    Notes
    -----
    Outside [x[0], x[-1]] a ValueError is raised: a pump curve ends where
    its data end. Agrees with ``scipy.interpolate.PchipInterpolator``.

    Examples
    --------
    >>> round(float(monotone_cubic([0.0, 1.0, 2.0], [0.0, 1.0, 4.0], 1.5)), 4)
    2.1875

    References
    ----------
    1. Fritsch, F. N., and Carlson, R. E., "Monotone piecewise cubic
       interpolation", SIAM J. Numerical Analysis 17 (2), 238-246, 1980.
    2. Fritsch, F. N., and Butland, J., "A method for constructing local
       monotone piecewise cubic interpolants", SIAM J. Sci. Stat. Comput.
       5 (2), 300-304, 1984.
    """
    xa = np.asarray(x, dtype=float)
    ya = np.asarray(y, dtype=float)
    q = np.asarray(xq, dtype=float)
    span = xa[-1] - xa[0]
    tolerance = 1e-12 * span
    if np.any(q < xa[0] - tolerance) or np.any(q > xa[-1] + tolerance):
        raise ValueError(
            f"{float(np.min(q)):.6g}..{float(np.max(q)):.6g} lies outside the curve data "
            f"{xa[0]:.6g}..{xa[-1]:.6g}; curves are not extrapolated"
        )
    q = np.clip(q, xa[0], xa[-1])
    d = _slopes(xa, ya)
    k = np.clip(np.searchsorted(xa, q, side="right") - 1, 0, len(xa) - 2)
    h = xa[k + 1] - xa[k]
    t = (q - xa[k]) / h
    h00 = (1 + 2 * t) * (1 - t) ** 2
    h10 = t * (1 - t) ** 2
    h01 = t**2 * (3 - 2 * t)
    h11 = t**2 * (t - 1)
    out = h00 * ya[k] + h10 * h * d[k] + h01 * ya[k + 1] + h11 * h * d[k + 1]
    return float(out) if out.ndim == 0 else out


def _curve_sub(label: str, unit: str) -> Callable[..., str]:
    def text(values: dict[str, Any], result: float, fmt: Any) -> str:
        flows, points = values["flow"], values[label]
        Q = values["Q"]
        k = max(0, min(len(flows) - 2, int(np.searchsorted(flows, Q, side="right")) - 1))
        return (
            f"monotone cubic through the {len(flows)} curve points at Q = {fmt(Q)} m³/s, "
            f"between ({fmt(flows[k])} m³/s, {fmt(points[k])}{unit}) and "
            f"({fmt(flows[k + 1])} m³/s, {fmt(points[k + 1])}{unit})"
        )

    return text


@equation(
    symbol="H_pump",
    text="H_pump = PCHIP(Q_i, H_i; Q)",
    latex=r"H_{pump} = \mathrm{PCHIP}(Q_i, H_i;\, Q)",
    substitute=_curve_sub("head", " m"),
    reference="fritsch_carlson_1980",
)
def head_at(Q: Any, flow: Any, head: Any) -> Any:
    r"""Pump head at a flow, from the curve points.

    .. math:: H_{pump} = \mathrm{PCHIP}(Q_i, H_i;\, Q)

    Parameters
    ----------
    Q : float
        Flow [m^3/s]
    flow : list of float
        Flows of the curve points [m^3/s]
    head : list of float
        Heads of the curve points [m]

    Returns
    -------
    H : float
        Pump head at Q [m]

    Examples
    --------
    >>> round(head_at(0.012, [0.0, 0.008, 0.016], [48.0, 47.4, 45.2]), 3)
    46.557

    References
    ----------
    1. Fritsch and Carlson, SIAM J. Numer. Anal. 17 (2), 1980.
    """
    return monotone_cubic(flow, head, Q)


@equation(
    symbol="η_p",
    text="η_p = PCHIP(Q_i, η_i; Q)",
    latex=r"\eta_p = \mathrm{PCHIP}(Q_i, \eta_i;\, Q)",
    substitute=_curve_sub("efficiency", ""),
    reference="fritsch_carlson_1980",
)
def efficiency_at(Q: Any, flow: Any, efficiency: Any) -> Any:
    r"""Pump efficiency at a flow, from the curve points.

    .. math:: \eta_p = \mathrm{PCHIP}(Q_i, \eta_i;\, Q)

    Parameters
    ----------
    Q : float
        Flow [m^3/s]
    flow : list of float
        Flows of the curve points [m^3/s]
    efficiency : list of float
        Efficiencies of the curve points [-]

    Returns
    -------
    eta : float
        Pump efficiency at Q [-]

    Examples
    --------
    >>> round(efficiency_at(0.016, [0.0, 0.008, 0.016], [0.0, 0.48, 0.70]), 2)
    0.7

    References
    ----------
    1. Fritsch and Carlson, SIAM J. Numer. Anal. 17 (2), 1980.
    """
    return monotone_cubic(flow, efficiency, Q)


@equation(
    symbol="NPSHr",
    text="NPSHr = PCHIP(Q_i, NPSHr_i; Q)",
    latex=r"NPSH_r = \mathrm{PCHIP}(Q_i, NPSH_{r,i};\, Q)",
    substitute=_curve_sub("npsh", " m"),
    reference="fritsch_carlson_1980",
)
def npsh_required_at(Q: Any, flow: Any, npsh: Any) -> Any:
    r"""NPSH required at a flow, from the curve points.

    .. math:: NPSH_r = \mathrm{PCHIP}(Q_i, NPSH_{r,i};\, Q)

    Parameters
    ----------
    Q : float
        Flow [m^3/s]
    flow : list of float
        Flows of the curve points [m^3/s]
    npsh : list of float
        NPSH required at the curve points [m]

    Returns
    -------
    NPSHr : float
        NPSH required at Q [m]

    Examples
    --------
    >>> round(npsh_required_at(0.008, [0.0, 0.008, 0.016], [1.0, 1.4, 2.2]), 2)
    1.4

    References
    ----------
    1. Fritsch and Carlson, SIAM J. Numer. Anal. 17 (2), 1980.
    """
    return monotone_cubic(flow, npsh, Q)


def best_efficiency_point(flow: Any, efficiency: Any) -> tuple[float, float]:
    """Flow and efficiency at the maximum of the interpolated efficiency curve.

    Parameters
    ----------
    flow : list of float
        Flows of the curve points [m^3/s]
    efficiency : list of float
        Efficiencies of the curve points [-]

    Returns
    -------
    bep : tuple of float
        (Q_BEP, eta_BEP) [m^3/s, -]

    Notes
    -----
    The maximum of the monotone cubic lies at a data point or inside one
    interval; it is found on a fine grid refined by golden-section search.
    """
    q = np.linspace(flow[0], flow[-1], 801)
    k = int(np.argmax(monotone_cubic(flow, efficiency, q)))
    lo, hi = q[max(k - 1, 0)], q[min(k + 1, len(q) - 1)]
    ratio = (math.sqrt(5.0) - 1.0) / 2.0
    for _ in range(60):
        a = hi - ratio * (hi - lo)
        b = lo + ratio * (hi - lo)
        if monotone_cubic(flow, efficiency, a) < monotone_cubic(flow, efficiency, b):
            lo = a
        else:
            hi = b
    best = 0.5 * (lo + hi)
    return float(best), float(monotone_cubic(flow, efficiency, best))


@equation(
    symbol="Q_n",
    text="Q_n = Q_0·(n/n_0)",
    latex=r"Q_n = Q_0\,\frac{n}{n_0}",
    substitute="{Q0} × {n} / {n0}",
    reference="karassik_2008",
)
def affinity_flow(Q0: Any, n: Any, n0: Any) -> Any:
    r"""Flow of a curve point moved to another speed by the affinity law.

    .. math:: Q_n = Q_0 \frac{n}{n_0}

    Parameters
    ----------
    Q0 : float
        Flow at the curve's speed [m^3/s]
    n : float
        Operating speed [1/s]
    n0 : float
        Speed of the curve data [1/s]

    Returns
    -------
    Q : float
        Flow at the operating speed [m^3/s]

    Examples
    --------
    >>> round(affinity_flow(0.020, 45.0, 50.0), 12)
    0.018

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (affinity laws).
    """
    return Q0 * n / n0


@equation(
    symbol="H_n",
    text="H_n = H_0·(n/n_0)²",
    latex=r"H_n = H_0\left(\frac{n}{n_0}\right)^2",
    substitute="{H0} × ({n} / {n0})²",
    reference="karassik_2008",
)
def affinity_head(H0: Any, n: Any, n0: Any) -> Any:
    r"""Head of a curve point moved to another speed by the affinity law.

    .. math:: H_n = H_0 \left(\frac{n}{n_0}\right)^2

    Parameters
    ----------
    H0 : float
        Head (or NPSH required, approximately) at the curve's speed [m]
    n : float
        Operating speed [1/s]
    n0 : float
        Speed of the curve data [1/s]

    Returns
    -------
    H : float
        Head at the operating speed [m]

    Examples
    --------
    >>> round(affinity_head(40.0, 45.0, 50.0), 6)
    32.4

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (affinity laws).
    """
    return H0 * (n / n0) ** 2


@equation(
    symbol="N_s",
    text="N_s = n·√Q/H^0.75 (n in rpm, Q in m³/s, H in m)",
    latex=r"N_s = \frac{n\,\sqrt{Q}}{H^{0.75}}",
    substitute="(60 × {n}) × √{Q} / ({H})^0.75",
    reference="karassik_2008",
)
def specific_speed(n: Any, Q: Any, H: Any) -> Any:
    r"""Specific speed at the best-efficiency point, metric (rpm, m^3/s, m).

    .. math:: N_s = \frac{n \sqrt{Q}}{H^{0.75}}

    Parameters
    ----------
    n : float
        Rotational speed [1/s]
    Q : float
        Flow at BEP, per impeller eye [m^3/s]
    H : float
        Head at BEP, per stage [m]

    Returns
    -------
    Ns : float
        Specific speed in rpm, m^3/s and m; multiply by 51.645 for the
        US form (rpm, gpm, ft) [-]

    Examples
    --------
    >>> round(float(specific_speed(2950.0 / 60.0, 0.024, 41.6)), 1)
    27.9

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008,
       sec. 2.1 (specific speed).
    """
    return 60.0 * n * np.sqrt(Q) / H**0.75


@equation(
    symbol="NPSHa/NPSHr",
    text="R = NPSHa/NPSHr",
    latex=r"R = \frac{NPSH_a}{NPSH_r}",
    substitute="{npsha} / {npshr}",
    reference="hi_npsh",
)
def npsh_margin_ratio(npsha: Any, npshr: Any) -> Any:
    r"""NPSH margin ratio of NPSH available to NPSH required.

    .. math:: R = \frac{NPSH_a}{NPSH_r}

    Parameters
    ----------
    npsha : float
        NPSH available [m]
    npshr : float
        NPSH required (NPSH3 of the pump data) [m]

    Returns
    -------
    R : float
        NPSH margin ratio [-]

    Examples
    --------
    >>> npsh_margin_ratio(6.0, 4.0)
    1.5

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin.
    """
    return npsha / npshr


@equation(
    symbol="ΔNPSH",
    text="ΔNPSH = NPSHa − NPSHr",
    latex=r"\Delta NPSH = NPSH_a - NPSH_r",
    substitute="{npsha} − {npshr}",
    reference="hi_npsh",
)
def npsh_margin(npsha: Any, npshr: Any) -> Any:
    r"""NPSH margin in head: NPSH available less NPSH required.

    .. math:: \Delta NPSH = NPSH_a - NPSH_r

    Parameters
    ----------
    npsha : float
        NPSH available [m]
    npshr : float
        NPSH required (NPSH3 of the pump data) [m]

    Returns
    -------
    margin : float
        NPSH margin [m]

    Examples
    --------
    >>> npsh_margin(6.0, 4.0)
    2.0

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin.
    """
    return npsha - npshr


def npsh_needed(npshr: Any, ratio: float, minimum: float) -> Any:
    r"""NPSH available that a margin criterion asks for at a given NPSH required.

    .. math:: NPSH_{a,min} = \max(R\, NPSH_r,\; NPSH_r + \Delta_{min})

    Parameters
    ----------
    npshr : float or ndarray
        NPSH required (NPSH3 of the pump data) [m]
    ratio : float
        Margin ratio R the criterion asks for [-]
    minimum : float
        Margin in head the criterion asks for [m]

    Returns
    -------
    needed : float or ndarray
        Lowest NPSH available that meets both parts of the criterion [m]

    Examples
    --------
    >>> float(npsh_needed(4.0, 1.1, 0.6))
    4.6
    >>> npsh_needed(np.array([2.0, 8.0]), 1.1, 0.6).round(3).tolist()
    [2.6, 8.8]

    References
    ----------
    1. ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin: a margin stated
       both as a ratio and in head, the greater governing.
    """
    return np.maximum(ratio * npshr, npshr + minimum)


def operating_point(
    difference: Callable[[np.ndarray], np.ndarray], q_min: float, q_max: float
) -> float | None:
    """Flow where pump head equals system head, or None where the curves do not meet.

    Parameters
    ----------
    difference : callable
        Pump head less system head as a function of flow, vectorised [m]
    q_min : float
        Lowest flow of the pump curve [m^3/s]
    q_max : float
        Highest flow of the pump curve (end of curve) [m^3/s]

    Returns
    -------
    Q : float
        Operating flow, the highest root in [q_min, q_max] [m^3/s]

    Notes
    -----
    The difference is sampled on 201 points to bracket the highest sign
    change (a drooping curve may cross a flat system curve twice; the
    higher flow is the stable one), then refined by the Illinois variant
    of regula falsi to 1e-12 relative in flow; a ConvergenceError is
    raised past 100 iterations.
    """
    q = np.linspace(q_min, q_max, 201)
    d = difference(q)
    sign = np.sign(d)
    crossings = np.nonzero(sign[:-1] * sign[1:] <= 0.0)[0]
    if len(crossings) == 0:
        return None
    k = int(crossings[-1])
    a, b = float(q[k]), float(q[k + 1])
    fa, fb = float(d[k]), float(d[k + 1])
    if fb == 0.0:
        return b
    if fa == 0.0:
        return a
    side = 0
    for _ in range(_MAX_ITERATIONS):
        c = (a * fb - b * fa) / (fb - fa)
        fc = float(difference(np.array([c]))[0])
        if abs(b - a) <= 1e-12 * max(abs(c), 1e-12) or abs(fc) <= 1e-11:
            return c
        if fc * fb > 0:
            b, fb = c, fc
            if side == -1:
                fa /= 2.0
            side = -1
        else:
            a, fa = c, fc
            if side == 1:
                fb /= 2.0
            side = 1
    raise ConvergenceError(
        "operating point (pump and system curves)", _MAX_ITERATIONS, abs(b - a) / max(abs(b), 1e-12)
    )


def _solved_text(values: dict[str, Any], result: float, fmt: Any) -> str:
    return (
        f"Q = {fmt(values['Q'])} m³/s, the highest flow on the curve where "
        "H_pump(Q) − H_system(Q) = 0, bracketed on 201 flows and refined by the "
        "Illinois method; confirmed by the head-balance step"
    )


def _thermal_text(values: dict[str, Any], result: float, fmt: Any) -> str:
    return (
        f"Q = {fmt(values['Q'])} m³/s, the flow between the first curve point and the BEP "
        "where ΔT(Q) = ΔT_max, bracketed and refined by the Illinois method; confirmed by "
        "the temperature-rise step at that flow"
    )


@equation(
    symbol="Q_th",
    text="Q_th: ΔT(Q_th) = ΔT_max",
    latex=r"\Delta T(Q_{th}) = \Delta T_{max}",
    substitute=_thermal_text,
    reference="karassik_2008",
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
    symbol="Q_op",
    text="Q_op: H_pump(Q_op) = H_system(Q_op)",
    latex=r"H_{pump}(Q_{op}) = H_{system}(Q_{op})",
    substitute=_solved_text,
    reference="karassik_2008",
)
def solved_flow(Q: Any) -> Any:
    r"""The operating flow found by :func:`operating_point`, recorded as a step.

    .. math:: H_{pump}(Q_{op}) = H_{system}(Q_{op})

    Parameters
    ----------
    Q : float
        Flow returned by the root finder [m^3/s]

    Returns
    -------
    Q_op : float
        Operating flow [m^3/s]

    Notes
    -----
    The value is the solver's; what proves it is the head-balance step
    (:func:`head_balance`), whose result is zero to solver precision.

    Examples
    --------
    >>> solved_flow(0.0233)
    0.0233

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (operating point at the intersection of pump and system curves).
    """
    return Q


@equation(
    symbol="ΔH",
    text="ΔH = H_pump − H_system",
    latex=r"\Delta H = H_{pump} - H_{system}",
    substitute="{H_pump} − {H_system}",
    reference="karassik_2008",
)
def head_balance(H_pump: Any, H_system: Any) -> Any:
    r"""Pump head less system head at a flow: zero at the operating point.

    .. math:: \Delta H = H_{pump} - H_{system}

    Parameters
    ----------
    H_pump : float
        Pump head from its curve [m]
    H_system : float
        Total dynamic head the system needs [m]

    Returns
    -------
    dH : float
        Head balance [m]

    Examples
    --------
    >>> head_balance(35.5, 35.5)
    0.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008.
    """
    return H_pump - H_system


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
    symbol="H_max",
    text="H_max = max_i H_i",
    latex=r"H_{max} = \max_i H_i",
    substitute=listed("head", "m", sep=", ", around="max({})"),
    reference="fritsch_carlson_1980",
)
def curve_max_head(head: Any) -> Any:
    r"""Highest head anywhere on a pump curve.

    .. math:: H_{max} = \max_i H_i

    Parameters
    ----------
    head : list of float
        Heads of the curve points [m]

    Returns
    -------
    H_max : float
        Highest head on the curve [m]

    Notes
    -----
    The monotone cubic through the points (:func:`monotone_cubic`) has no
    extremum between points, so the largest point is the curve's maximum:
    the shutoff head of a rising curve, the peak of a drooping one.

    Examples
    --------
    >>> curve_max_head([48.0, 48.6, 45.2])
    48.6

    References
    ----------
    1. Fritsch, F. N., and Carlson, R. E., "Monotone piecewise cubic
       interpolation", SIAM Journal on Numerical Analysis 17 (2), 238-246,
       1980 (the interpolant stays within the data between points).
    """
    return max(head)


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


@equation(
    symbol="n_lift",
    text="n_lift = n_0·√(H_static/H_0)",
    latex=r"n_{lift} = n_0 \sqrt{\frac{H_{static}}{H_0}}",
    substitute="{n0} × √({H_static} / {H0})",
    reference="karassik_2008",
)
def lift_speed(n0: Any, H_static: Any, H0: Any) -> Any:
    r"""Speed at which the pump's shutoff head just equals the static head (affinity law).

    .. math:: n_{lift} = n_0 \sqrt{\frac{H_{static}}{H_0}}

    Parameters
    ----------
    n0 : float
        Speed of the curve data [1/s]
    H_static : float
        Highest static head of the system, elevation plus pressure [m]
    H0 : float
        Shutoff head of the curve at n0 (per pump in series: of all of them) [m]

    Returns
    -------
    n_lift : float
        Speed below which the pump delivers no flow against the static head [1/s]

    Notes
    -----
    A variable-speed pump should run well above this speed: near it the flow is
    small and unstable.

    Examples
    --------
    >>> round(lift_speed(50.0, 25.0, 36.0), 4)
    41.6667

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (affinity laws; variable-speed operation against static head).
    """
    return n0 * math.sqrt(H_static / H0)


def _speed_text(values: dict[str, Any], result: float, fmt: Any) -> str:
    return (
        f"n = {fmt(values['n'] * 60)} rpm, the speed whose affinity-scaled curve passes "
        "through the system head at this flow (bracketed root, Illinois method); confirmed "
        "by the head-balance step"
    )


@equation(
    symbol="n",
    text="n: (n/n_0)²·H_0(Q·n_0/n) = H_system(Q)",
    latex=r"\left(\frac{n}{n_0}\right)^2 H_0\!\left(Q \frac{n_0}{n}\right) = H_{system}(Q)",
    substitute=_speed_text,
    reference="karassik_2008",
)
def solved_speed(n: Any) -> Any:
    r"""The speed found for a variable-speed duty point, recorded as a step.

    .. math:: \left(\frac{n}{n_0}\right)^2 H_0\left(Q \frac{n_0}{n}\right) = H_{system}(Q)

    Parameters
    ----------
    n : float
        Speed returned by the root finder [1/s]

    Returns
    -------
    n_op : float
        Operating speed [1/s]

    Notes
    -----
    The value is the solver's; the head-balance step that follows proves it.

    Examples
    --------
    >>> solved_speed(45.0)
    45.0

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (affinity laws; variable-speed operation on the system curve).
    """
    return n


@equation(
    symbol="h_thr",
    text="h_thr = H_pump − H_system",
    latex=r"h_{thr} = H_{pump} - H_{system}",
    substitute="{H_pump} − {H_system}",
    reference="karassik_2008",
)
def throttling_loss(H_pump: Any, H_system: Any) -> Any:
    r"""Head a throttling valve must burn to hold a fixed-speed pump at a lower flow.

    .. math:: h_{thr} = H_{pump} - H_{system}

    Parameters
    ----------
    H_pump : float
        Pump head at the flow, on its fixed-speed curve [m]
    H_system : float
        System head at the same flow, valve fully open [m]

    Returns
    -------
    h_thr : float
        Head lost in the throttling valve [m]

    Examples
    --------
    >>> throttling_loss(41.0, 33.5)
    7.5

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (throttle control: the valve adds resistance until the curves meet).
    """
    return H_pump - H_system


@equation(
    symbol="η",
    text="η = ρ·g·Q·H/P",
    latex=r"\eta = \frac{\rho g Q H}{P}",
    substitute="{rho} × 9.80665 m/s² × {Q} × {H} / {P}",
    reference="karassik_2008",
)
def efficiency_from_power(rho: Any, Q: Any, H: Any, P: Any) -> Any:
    r"""Pump efficiency at a curve point from the shaft power printed for it.

    .. math:: \eta = \frac{\rho g Q H}{P}

    Parameters
    ----------
    rho : float
        Density of the liquid the power curve is drawn for [kg/m^3]
    Q : float
        Flow of the curve point [m^3/s]
    H : float
        Head of the curve point [m]
    P : float
        Shaft power of the curve point [W]

    Returns
    -------
    eta : float
        Pump efficiency at the point [-]

    Examples
    --------
    >>> round(efficiency_from_power(1000.0, 0.02, 40.0, 10000.0), 4)
    0.7845

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008
       (pump efficiency as hydraulic over shaft power).
    """
    return rho * G * Q * H / P


@equation(
    symbol="ΔT",
    text="ΔT = g·H·(1 − η)/(c_p·η)",
    latex=r"\Delta T = \frac{g H (1 - \eta)}{c_p\, \eta}",
    substitute="9.80665 m/s² × {H} × (1 − {eta}) / ({cp} × {eta})",
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
