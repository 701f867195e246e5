"""Pump curves: interpolation of head, efficiency and NPSH required between the given
points (monotone piecewise-cubic Hermite, Fritsch and Carlson), the best efficiency point,
the curve's highest head and the efficiency of a tested point.
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Callable
from functools import lru_cache
from typing import Any

import numpy as np

from calcreport.physics.equation import equation, listed
from calcreport.physics.losses import G


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


@lru_cache(maxsize=256)
def _cached_slopes(x: bytes, y: bytes) -> np.ndarray:
    """:func:`_slopes` of a curve given by its bytes: a root finder interpolates one curve
    hundreds of times, and the slopes depend on the curve alone (read-only copy)."""
    d = _slopes(np.frombuffer(x), np.frombuffer(y))
    d.setflags(write=False)
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
    if isinstance(xq, float | int) and not isinstance(xq, bool):
        return _at(tuple(map(float, x)), tuple(map(float, y)), float(xq))
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
    d = _cached_slopes(xa.tobytes(), ya.tobytes())
    k = np.clip(np.searchsorted(xa, q, side="right") - 1, 0, len(xa) - 2)
    out = _hermite(q, xa[k], xa[k + 1], ya[k], ya[k + 1], d[k], d[k + 1])
    return float(out) if out.ndim == 0 else out


def _hermite(q: Any, x0: Any, x1: Any, y0: Any, y1: Any, d0: Any, d1: Any) -> Any:
    """The cubic Hermite interpolant on [x0, x1] at q (floats or arrays alike)."""
    h = x1 - x0
    t = (q - x0) / h
    h00 = (1 + 2 * t) * (1 - t) ** 2
    h10 = t * (1 - t) ** 2
    h01 = t**2 * (3 - 2 * t)
    h11 = t**2 * (t - 1)
    return h00 * y0 + h10 * h * d0 + h01 * y1 + h11 * h * d1


def _at(x: tuple[float, ...], y: tuple[float, ...], q: float) -> float:
    """:func:`monotone_cubic` at one flow, in plain floats (a root finder's many calls);
    the same arithmetic as the array form, so the same value to the last bit."""
    tolerance = 1e-12 * (x[-1] - x[0])
    if q < x[0] - tolerance or q > x[-1] + tolerance:
        raise ValueError(
            f"{q:.6g}..{q:.6g} lies outside the curve data {x[0]:.6g}..{x[-1]:.6g}; curves "
            "are not extrapolated"
        )
    q = min(max(q, x[0]), x[-1])
    d = _cached_slopes(np.asarray(x).tobytes(), np.asarray(y).tobytes())
    k = min(max(bisect.bisect_right(x, q) - 1, 0), len(x) - 2)
    return float(_hermite(q, x[k], x[k + 1], y[k], y[k + 1], float(d[k]), float(d[k + 1])))


def _curve_sub(label: str, unit: str) -> Callable[..., str]:
    def text(values: dict[str, Any], result: float, write: Any) -> str:
        flows, points = values["flow"], values[label]
        Q = values["Q"]
        k = max(0, min(len(flows) - 2, int(np.searchsorted(flows, Q, side="right")) - 1))
        return (
            f"monotone cubic through the {len(flows)} curve points at Q = "
            f"{write(Q, 'm^3/s')}, between ({write(flows[k], 'm^3/s')}, "
            f"{write(points[k], unit)}) and ({write(flows[k + 1], 'm^3/s')}, "
            f"{write(points[k + 1], unit)})"
        )

    return text


@equation(
    symbol="H_pump",
    text="H_pump = PCHIP(Q_i, H_i; Q)",
    latex=r"H_{pump} = \mathrm{PCHIP}(Q_i, H_i;\, Q)",
    substitute=_curve_sub("head", "m"),
    reference="fritsch_carlson_1980",
    units="display",
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
    units="display",
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
    substitute=_curve_sub("npsh", "m"),
    reference="fritsch_carlson_1980",
    units="display",
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
    return _bep(tuple(map(float, flow)), tuple(map(float, efficiency)))


@lru_cache(maxsize=256)
def _bep(flow: tuple[float, ...], efficiency: tuple[float, ...]) -> tuple[float, float]:
    """:func:`best_efficiency_point` of one curve (a solve asks for it several times)."""
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
    symbol="η",
    text="η = ρ·g·Q·H/P",
    latex=r"\eta = \frac{\rho g Q H}{P}",
    substitute="{rho} × {g} × {Q} × {H} / {P}",
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
