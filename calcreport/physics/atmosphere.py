"""Standard atmosphere: barometric pressure and temperature at a site's elevation.

US Standard Atmosphere 1976, lower atmosphere (-5 km to 86 km geometric)
    pressure, temperature
Limits of the model
    Z_MIN, Z_MAX

The model works in geopotential height H = r0*z/(r0 + z), in seven
layers of constant temperature gradient (base heights 0, 11, 20, 32, 47,
51 and 71 km geopotential). The base temperature and pressure of each
layer are computed once, at import, from the standard's defining
constants; none is typed in rounded.
"""

from __future__ import annotations

import math
from typing import Any

from calcreport.physics.equation import equation

__all__ = ["Z_MAX", "Z_MIN", "pressure", "temperature"]

Z_MIN = -5000.0  # lowest geometric elevation of the 1976 tables [m]
Z_MAX = 86000.0  # top of the lower atmosphere (84 852 m geopotential) [m]

# Defining constants of the US Standard Atmosphere 1976 (section 1.2, Tables 2 and 4).
_R0 = 6356766.0  # effective Earth radius for geopotential height [m]
_G0 = 9.80665  # standard gravity [m/s^2]
_M0 = 0.0289644  # sea-level mean molar mass of air [kg/mol]
_R_STAR = 8.31432  # universal gas constant as adopted by the standard [J/(mol*K)]
_T0 = 288.15  # sea-level temperature [K]
_P0 = 101325.0  # sea-level pressure [Pa]

_GMR = _G0 * _M0 / _R_STAR  # hydrostatic constant [K/m]

# Base geopotential heights [m] and temperature gradients [K/m] (Table 4).
_H_BASE = (0.0, 11000.0, 20000.0, 32000.0, 47000.0, 51000.0, 71000.0)
_LAPSE = (-0.0065, 0.0, 0.001, 0.0028, 0.0, -0.0028, -0.002)


def _layer_bases() -> tuple[tuple[float, ...], tuple[float, ...]]:
    temps = [_T0]
    pressures = [_P0]
    for k in range(len(_H_BASE) - 1):
        dh = _H_BASE[k + 1] - _H_BASE[k]
        t_b, p_b, lapse = temps[k], pressures[k], _LAPSE[k]
        t_top = t_b + lapse * dh
        if lapse == 0.0:
            p_top = p_b * math.exp(-_GMR * dh / t_b)
        else:
            p_top = p_b * (t_b / t_top) ** (_GMR / lapse)
        temps.append(t_top)
        pressures.append(p_top)
    return tuple(temps), tuple(pressures)


_T_BASE, _P_BASE = _layer_bases()


def _check(z: float) -> None:
    if not Z_MIN <= z <= Z_MAX:
        raise ValueError(
            f"Elevation z = {z!r} m is outside the range of the US Standard Atmosphere "
            f"1976 as used here, {Z_MIN:.0f} m <= z <= {Z_MAX:.0f} m."
        )


def _layer(H: float) -> int:
    k = len(_H_BASE) - 1
    while k > 0 and H < _H_BASE[k]:
        k -= 1
    return k


def temperature(z: float) -> float:
    r"""Standard air temperature at a geometric elevation (US Standard Atmosphere 1976).

    .. math:: T = T_b + L_b (H - H_b), \quad H = \frac{r_0\, z}{r_0 + z}

    Parameters
    ----------
    z : float
        Geometric elevation above mean sea level [m]

    Returns
    -------
    T : float
        Standard (molecular-scale) temperature [K]

    Notes
    -----
    Valid for -5000 m <= z <= 86000 m; below 80 km the molecular-scale
    temperature equals the kinetic temperature. T_b, L_b and H_b are the
    base temperature, temperature gradient and base geopotential height
    of the layer that contains H.

    Examples
    --------
    >>> round(temperature(1000.0), 3)
    281.651

    References
    ----------
    1. U.S. Standard Atmosphere, 1976, NOAA-S/T 76-1562, NOAA, NASA and
       USAF, Washington D.C., October 1976, eq. 23 and Table 4.
    """
    _check(z)
    H = _R0 * z / (_R0 + z)
    k = _layer(H)
    return _T_BASE[k] + _LAPSE[k] * (H - _H_BASE[k])


def _exact(x: float) -> str:
    # Defining constants of the standard are printed exactly, not rounded by fmt.
    return format(x, ".12g")


def _signed(x: float, text: str) -> str:
    return f"({text})" if x < 0 else text


def _pressure_steps(values: dict[str, float], p: float, fmt: Any) -> str:
    z = values["z"]
    H = _R0 * z / (_R0 + z)
    k = _layer(H)
    r0 = _exact(_R0)
    z_s = f"{fmt(abs(z))} m"
    plus = f"− {z_s}" if z < 0 else f"+ {z_s}"
    steps = [
        f"H = {r0} m × {_signed(z, f'{fmt(z)} m')} / ({r0} m {plus}) = {fmt(H)} m",
    ]
    t_b, p_b, lapse, h_b = _T_BASE[k], _P_BASE[k], _LAPSE[k], _H_BASE[k]
    if k == 0:
        # Troposphere: exact sea-level constants, H measured from 0.
        dh = _signed(H, f"{fmt(H)} m")
        base_p = f"{_exact(p_b)} Pa"
        base_t = f"{_exact(t_b)} K"
    else:
        dh = f"({fmt(H)} m − {_exact(h_b)} m)"
        base_p = f"{fmt(p_b)} Pa"
        base_t = f"{_exact(t_b)} K"
    if lapse == 0.0:
        steps.append(f"p = {base_p} × exp(−{fmt(_GMR)} K/m × {dh} / {base_t}) = {fmt(p)} Pa")
    else:
        sign = "−" if lapse < 0 else "+"
        steps.append(
            f"p = {base_p} × [({base_t} {sign} {_exact(abs(lapse))} K/m × {dh}) / {base_t}]"
            f"^{fmt(-_GMR / lapse)} = {fmt(p)} Pa"
        )
    return "; ".join(steps)


@equation(
    symbol="p_baro",
    text="H = r0·z/(r0 + z); p = p_b·[(T_b + L_b·(H − H_b))/T_b]^(−g0·M0/(R*·L_b)),"
    " or p = p_b·exp(−g0·M0·(H − H_b)/(R*·T_b)) where L_b = 0 (US Standard Atmosphere 1976)",
    latex=r"p = p_b \left[\frac{T_b + L_b (H - H_b)}{T_b}\right]^{-g_0 M_0 / (R^* L_b)},"
    r"\ H = \frac{r_0\, z}{r_0 + z}",
    substitute=_pressure_steps,
    reference="us_standard_atmosphere_1976",
    units="fixed",
)
def pressure(z: float) -> float:
    r"""Standard barometric pressure at a geometric elevation (US Standard Atmosphere 1976).

    .. math:: p = p_b \left[\frac{T_b}{T_b + L_b (H - H_b)}\right]^{\frac{g_0 M_0}{R^* L_b}}
        \ (L_b \ne 0), \qquad
        p = p_b \exp\left[-\frac{g_0 M_0 (H - H_b)}{R^* T_b}\right] \ (L_b = 0),
        \qquad H = \frac{r_0\, z}{r_0 + z}

    Parameters
    ----------
    z : float
        Geometric elevation above mean sea level [m]

    Returns
    -------
    p : float
        Standard atmospheric pressure (absolute) [Pa]

    Notes
    -----
    Valid for -5000 m <= z <= 86000 m. Constants of the standard: r0 =
    6 356 766 m, g0 = 9.80665 m/s^2, M0 = 0.0289644 kg/mol, R* = 8.31432
    J/(mol K) (the standard's value, not the current CODATA one), T0 =
    288.15 K, p0 = 101 325 Pa; layer bases at 0, 11, 20, 32, 47, 51 and
    71 km geopotential with gradients -6.5, 0, +1.0, +2.8, 0, -2.8 and
    -2.0 K/km. In the troposphere (z < 11 019 m) this is
    p = 101325 Pa (1 - 0.0065 K/m H / 288.15 K)^5.25588. The actual
    pressure at a site varies with the weather by a few percent about
    this value.

    Examples
    --------
    >>> round(pressure(420.0))
    96380

    References
    ----------
    1. U.S. Standard Atmosphere, 1976, NOAA-S/T 76-1562, NOAA, NASA and
       USAF, Washington D.C., October 1976, eqs. 33a and 33b, Tables 2 and 4.
    """
    _check(z)
    H = _R0 * z / (_R0 + z)
    k = _layer(H)
    t_b, p_b, lapse = _T_BASE[k], _P_BASE[k], _LAPSE[k]
    dh = H - _H_BASE[k]
    if lapse == 0.0:
        return p_b * math.exp(-_GMR * dh / t_b)
    return p_b * (t_b / (t_b + lapse * dh)) ** (_GMR / lapse)
