"""Liquid water: density, vapour pressure, viscosity, speed of sound and heat capacity.

Density, compressibility and heat capacity (IAPWS-IF97 region 1, compressed liquid)
    density, speed_of_sound, bulk_modulus, heat_capacity
Saturation line (IAPWS-IF97 region 4)
    saturation_pressure, saturation_temperature
Viscosity (IAPWS 2008)
    viscosity

Every function takes and returns SI floats: temperature in K, pressure in
Pa, density in kg/m^3, viscosity in Pa*s, speed in m/s, heat capacity in
J/(kg*K). Inputs outside the range of the formulation raise ``ValueError``;
nothing is extrapolated.
The coefficients are those of the IAPWS releases, typed once here as
tuples at import so that each call is a few microseconds of arithmetic.
"""

from __future__ import annotations

import math

from calcreport.physics.equation import equation

__all__ = [
    "bulk_modulus",
    "density",
    "heat_capacity",
    "saturation_pressure",
    "saturation_temperature",
    "speed_of_sound",
    "viscosity",
]

# --- IAPWS-IF97, general constants (R7-97(2012), eqs. 1 and 2) ---------------

_R = 461.526  # specific gas constant of water [J/(kg*K)]

# --- IAPWS-IF97 region 1 (R7-97(2012), eq. 7, Table 2) -----------------------

_P_STAR_1 = 16.53e6  # [Pa]
_T_STAR_1 = 1386.0  # [K]
_T_MIN_1 = 273.15  # [K]
_T_MAX_1 = 623.15  # [K]
_P_MAX_1 = 100.0e6  # [Pa]
P_MAX = _P_MAX_1  # the highest pressure at which liquid water is computed [Pa]
# Temperatures [K] at which liquid water is computed: from the triple point, where the
# saturation line (region 4) begins, to the upper limit of region 1.
T_RANGE = (273.16, _T_MAX_1)

# (I_i, J_i, n_i), i = 1..34
_REGION1: tuple[tuple[int, int, float], ...] = (
    (0, -2, 0.14632971213167),
    (0, -1, -0.84548187169114),
    (0, 0, -0.37563603672040e1),
    (0, 1, 0.33855169168385e1),
    (0, 2, -0.95791963387872),
    (0, 3, 0.15772038513228),
    (0, 4, -0.16616417199501e-1),
    (0, 5, 0.81214629983568e-3),
    (1, -9, 0.28319080123804e-3),
    (1, -7, -0.60706301565874e-3),
    (1, -1, -0.18990068218419e-1),
    (1, 0, -0.32529748770505e-1),
    (1, 1, -0.21841717175414e-1),
    (1, 3, -0.52838357969930e-4),
    (2, -3, -0.47184321073267e-3),
    (2, 0, -0.30001780793026e-3),
    (2, 1, 0.47661393906987e-4),
    (2, 3, -0.44141845330846e-5),
    (2, 17, -0.72694996297594e-15),
    (3, -4, -0.31679644845054e-4),
    (3, 0, -0.28270797985312e-5),
    (3, 6, -0.85205128120103e-9),
    (4, -5, -0.22425281908000e-5),
    (4, -2, -0.65171222895601e-6),
    (4, 10, -0.14341729937924e-12),
    (5, -8, -0.40516996860117e-6),
    (8, -11, -0.12734301741641e-8),
    (8, -6, -0.17424871230634e-9),
    (21, -29, -0.68762131295531e-18),
    (23, -31, 0.14478307828521e-19),
    (29, -38, 0.26335781662795e-22),
    (30, -39, -0.11947622640071e-22),
    (31, -40, 0.18228094581404e-23),
    (32, -41, -0.93537087292458e-25),
)

# Terms of gamma_pi = sum(-n I (7.1 - pi)^(I-1) (tau - 1.222)^J): (-n*I, I-1, J).
_GAMMA_PI: tuple[tuple[float, int, int], ...] = tuple(
    (-n * i, i - 1, j) for i, j, n in _REGION1 if i != 0
)
# Terms for the second derivatives, as multipliers of n (7.1 - pi)^I (tau - 1.222)^J:
# (n, I, J, -I, I(I-1), J(J-1), -I*J).
_SECOND: tuple[tuple[float, int, int, int, int, int, int], ...] = tuple(
    (n, i, j, -i, i * (i - 1), j * (j - 1), -i * j) for i, j, n in _REGION1
)

# --- IAPWS-IF97 region 4 (R7-97(2012), eqs. 29-31, Table 34) -----------------

_N4 = (
    0.11670521452767e4,
    -0.72421316703206e6,
    -0.17073846940092e2,
    0.12020824702470e5,
    -0.32325550322333e7,
    0.14915108613530e2,
    -0.48232657361591e4,
    0.40511340542057e6,
    -0.23855557567849,
    0.65017534844798e3,
)
_P_STAR_4 = 1.0e6  # [Pa]
_T_MIN_4 = 273.15  # [K]
_T_CRIT = 647.096  # [K]

# --- IAPWS 2008 viscosity (R12-08, eqs. 10-12, Tables 1 and 2) ---------------

_T_STAR_MU = 647.096  # [K]
_RHO_STAR_MU = 322.0  # [kg/m^3]
_MU_STAR = 1.0e-6  # [Pa*s]
_T_MIN_MU = 273.15  # [K]
_T_MAX_MU = 1173.15  # [K]
_H0 = (1.67752, 2.20462, 0.6366564, -0.241605)
# H_ij by i (temperature power), each a 7-tuple over j = 0..6 (density power).
_H1: tuple[tuple[float, ...], ...] = (
    (5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0.0, 0.0),
    (8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0.0, 0.0, 0.0),
    (-1.08374, 1.88797, -7.72479e-1, 0.0, 0.0, 0.0, 0.0),
    (-2.89555e-1, 1.26613, -4.89837e-1, 0.0, 6.98452e-2, 0.0, -4.35673e-3),
    (0.0, 0.0, -2.57040e-1, 0.0, 0.0, 8.72102e-3, 0.0),
    (0.0, 1.20573e-1, 0.0, 0.0, 0.0, 0.0, -5.93264e-4),
)


# --- range checks ---------------------------------------------------------------


def _p_sat(T: float) -> float:
    """IF97 eq. 30 without range check [Pa]."""
    n = _N4
    theta = T + n[8] / (T - n[9])
    a = theta * theta + n[0] * theta + n[1]
    b = n[2] * theta * theta + n[3] * theta + n[4]
    c = n[5] * theta * theta + n[6] * theta + n[7]
    return _P_STAR_4 * (2.0 * c / (-b + math.sqrt(b * b - 4.0 * a * c))) ** 4


# Limits of eq. 31 as the values of eq. 30 at its own limits, so that every
# value of saturation_pressure is accepted back by saturation_temperature.
_P_MIN_4 = _p_sat(_T_MIN_4)  # 611.2127 Pa; the release states 611.213 Pa
_P_MAX_4 = _p_sat(_T_CRIT)  # 22.064 MPa + 0.0003 Pa; the release states 22.064 MPa


def _check_region1(T: float, p: float) -> None:
    if not _T_MIN_1 <= T <= _T_MAX_1:
        raise ValueError(
            f"Temperature T = {T!r} K is outside the range of IAPWS-IF97 region 1 "
            f"(liquid water), {_T_MIN_1} K <= T <= {_T_MAX_1} K."
        )
    if not p <= _P_MAX_1:
        raise ValueError(
            f"Pressure p = {p!r} Pa is outside the range of IAPWS-IF97 region 1 "
            f"(liquid water), p_s(T) <= p <= {_P_MAX_1:.0f} Pa."
        )
    p_s = _p_sat(T)
    if not p >= p_s:
        raise ValueError(
            f"Pressure p = {p!r} Pa is below the saturation pressure p_s = {p_s:.6g} Pa "
            f"at T = {T!r} K, so the water would boil; IAPWS-IF97 region 1 (liquid water) "
            f"needs p_s(T) <= p <= {_P_MAX_1:.0f} Pa."
        )


# --- IAPWS-IF97 region 1 --------------------------------------------------------


@equation(
    symbol="ρ",
    text="ρ = p/(R·T·π·γ_π(π, τ)), π = p/16.53 MPa, τ = 1386 K/T (IAPWS-IF97 region 1)",
    latex=r"\rho = \frac{p}{R\,T\,\pi\,\gamma_\pi(\pi, \tau)},"
    r"\ \pi = \frac{p}{16.53\,\mathrm{MPa}},\ \tau = \frac{1386\,\mathrm{K}}{T}",
    substitute="IAPWS-IF97 region 1 at T = {T}, p = {p}",
    reference="iapws_if97",
    units="display",
)
def density(T: float, p: float) -> float:
    r"""Density of liquid water from IAPWS-IF97 region 1.

    .. math:: \rho = \frac{1}{v}, \quad
        v = \frac{R T}{p} \pi \gamma_\pi, \quad
        \gamma_\pi = \sum_{i=1}^{34} -n_i I_i (7.1 - \pi)^{I_i - 1} (\tau - 1.222)^{J_i},
        \quad \pi = \frac{p}{16.53\ \mathrm{MPa}}, \quad \tau = \frac{1386\ \mathrm{K}}{T}

    Parameters
    ----------
    T : float
        Temperature of the water [K]
    p : float
        Absolute pressure of the water [Pa]

    Returns
    -------
    rho : float
        Density [kg/m^3]

    Notes
    -----
    Valid for 273.15 K <= T <= 623.15 K and p_s(T) <= p <= 100 MPa, where
    p_s is the saturation pressure (:func:`saturation_pressure`). Below
    p_s the water would boil and a ``ValueError`` is raised. At
    101.325 kPa and 1 to 95 °C the result is within 0.015 kg/m^3 of the
    scientific formulation IAPWS-95; R = 0.461526 kJ/(kg K).

    Examples
    --------
    >>> round(density(293.15, 101325.0), 3)
    998.206

    References
    ----------
    1. IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation
       1997 for the Thermodynamic Properties of Water and Steam, section 5.1,
       eq. 7, Tables 2 to 4; verification values Table 5.
    """
    _check_region1(T, p)
    a = 7.1 - p / _P_STAR_1
    b = _T_STAR_1 / T - 1.222
    gamma_pi = 0.0
    for c, i, j in _GAMMA_PI:
        gamma_pi += c * a**i * b**j
    return _P_STAR_1 / (_R * T * gamma_pi)


def speed_of_sound(T: float, p: float) -> float:
    r"""Speed of sound in liquid water from IAPWS-IF97 region 1.

    .. math:: w = \sqrt{R T \frac{\gamma_\pi^2}
        {\dfrac{(\gamma_\pi - \tau \gamma_{\pi\tau})^2}{\tau^2 \gamma_{\tau\tau}}
        - \gamma_{\pi\pi}}}

    Parameters
    ----------
    T : float
        Temperature of the water [K]
    p : float
        Absolute pressure of the water [Pa]

    Returns
    -------
    w : float
        Speed of sound (thermodynamic, unbounded liquid) [m/s]

    Notes
    -----
    Valid for 273.15 K <= T <= 623.15 K and p_s(T) <= p <= 100 MPa, as
    :func:`density`. This is the speed in unbounded water; the wave speed
    in a pipe is lower because the wall stretches. At 101.325 kPa and 1
    to 95 °C it is up to 0.2 % above IAPWS-95 (1483.4 against 1482.3 m/s
    at 20 °C).

    Examples
    --------
    >>> round(speed_of_sound(293.15, 101325.0), 1)
    1483.4

    References
    ----------
    1. IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation
       1997 for the Thermodynamic Properties of Water and Steam, section 5.1,
       Table 3 (speed of sound), Table 4 (derivatives of eq. 7); verification
       values Table 5.
    """
    tau, g_p, g_pp, g_tt, g_pt = _derivatives(T, p)
    w2 = _R * T * g_p * g_p / ((g_p - tau * g_pt) ** 2 / (tau * tau * g_tt) - g_pp)
    return math.sqrt(w2)


def _derivatives(T: float, p: float) -> tuple[float, float, float, float, float]:
    """τ and the derivatives γ_π, γ_ππ, γ_ττ, γ_πτ of region 1's Gibbs energy (Table 4)."""
    _check_region1(T, p)
    tau = _T_STAR_1 / T
    a = 7.1 - p / _P_STAR_1
    b = tau - 1.222
    s_p = s_pp = s_tt = s_pt = 0.0
    for n, i, j, ci, cii, cjj, cij in _SECOND:
        term = n * a**i * b**j
        s_p += ci * term
        s_pp += cii * term
        s_tt += cjj * term
        s_pt += cij * term
    return tau, s_p / a, s_pp / (a * a), s_tt / (b * b), s_pt / (a * b)


@equation(
    symbol="c_p",
    text="c_p = −R·τ²·γ_ττ (IAPWS-IF97 region 1)",
    latex=r"c_p = -R\,\tau^2 \gamma_{\tau\tau}",
    substitute="IAPWS-IF97 region 1 at T = {T}, p = {p}",
    reference="iapws_if97",
    units="display",
)
def heat_capacity(T: float, p: float) -> float:
    r"""Specific isobaric heat capacity of liquid water from IAPWS-IF97 region 1.

    .. math:: c_p = -R \tau^2 \gamma_{\tau\tau}

    Parameters
    ----------
    T : float
        Temperature of the water [K]
    p : float
        Absolute pressure of the water [Pa]

    Returns
    -------
    c_p : float
        Specific isobaric heat capacity [J/(kg*K)]

    Examples
    --------
    >>> round(heat_capacity(300.0, 3e6), 3)
    4173.012

    References
    ----------
    1. IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation
       1997 for the Thermodynamic Properties of Water and Steam, section 5.1,
       Table 3 (isobaric heat capacity); verification values Table 5.
    """
    tau, _, _, g_tt, _ = _derivatives(T, p)
    return -_R * tau * tau * g_tt


@equation(
    symbol="K",
    text="K = ρ·w², w from IAPWS-IF97 region 1",
    latex=r"K = \rho\, w^2",
    substitute="IAPWS-IF97 region 1 density and speed of sound at T = {T}, p = {p}",
    reference="iapws_if97",
    units="display",
)
def bulk_modulus(T: float, p: float) -> float:
    r"""Isentropic bulk modulus of liquid water, ρ·w², from IAPWS-IF97 region 1.

    .. math:: K_s = \rho\, w^2

    Parameters
    ----------
    T : float
        Temperature of the water [K]
    p : float
        Absolute pressure of the water [Pa]

    Returns
    -------
    K : float
        Isentropic bulk modulus [Pa]

    Notes
    -----
    Valid for 273.15 K <= T <= 623.15 K and p_s(T) <= p <= 100 MPa, as
    :func:`density`. Isentropic (adiabatic) modulus, the one that sets the
    speed of a pressure wave; the isothermal modulus is smaller by the
    ratio of specific heats (about 1 % at 20 °C).

    Examples
    --------
    >>> round(bulk_modulus(293.15, 101325.0) / 1e9, 3)
    2.197

    References
    ----------
    1. IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation
       1997 for the Thermodynamic Properties of Water and Steam, section 5.1,
       Table 3 (specific volume and speed of sound).
    """
    return density(T, p) * speed_of_sound(T, p) ** 2


# --- IAPWS-IF97 region 4 --------------------------------------------------------


@equation(
    symbol="p_v",
    text="p_s = 1 MPa·[2C/(−B + √(B² − 4·A·C))]⁴, A, B, C quadratic in ϑ = T + n9/(T − n10)"
    " (IAPWS-IF97 region 4)",
    latex=r"p_s = 1\,\mathrm{MPa} \left[\frac{2C}{-B + \sqrt{B^2 - 4AC}}\right]^4",
    substitute="IAPWS-IF97 region 4 saturation-pressure equation at T = {T}",
    reference="iapws_if97",
    units="display",
)
def saturation_pressure(T: float) -> float:
    r"""Saturation (vapour) pressure of water from IAPWS-IF97 region 4.

    .. math:: \frac{p_s}{1\ \mathrm{MPa}} = \left[\frac{2C}{-B + \sqrt{B^2 - 4AC}}\right]^4,
        \quad A = \vartheta^2 + n_1 \vartheta + n_2, \quad
        B = n_3 \vartheta^2 + n_4 \vartheta + n_5, \quad
        C = n_6 \vartheta^2 + n_7 \vartheta + n_8, \quad
        \vartheta = \frac{T}{1\ \mathrm{K}} + \frac{n_9}{T/(1\ \mathrm{K}) - n_{10}}

    Parameters
    ----------
    T : float
        Temperature [K]

    Returns
    -------
    p_s : float
        Saturation pressure [Pa]

    Notes
    -----
    Valid for 273.15 K <= T <= 647.096 K (the critical temperature).
    Between 1 and 95 °C it is within 0.01 % of the IAPWS-95 saturation
    pressure.

    Examples
    --------
    >>> round(saturation_pressure(293.15), 2)
    2339.21

    References
    ----------
    1. IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation
       1997 for the Thermodynamic Properties of Water and Steam, section 8.1,
       eq. 30, Table 34; verification values Table 35.
    """
    if not _T_MIN_4 <= T <= _T_CRIT:
        raise ValueError(
            f"Temperature T = {T!r} K is outside the range of the IAPWS-IF97 "
            f"saturation-pressure equation, {_T_MIN_4} K <= T <= {_T_CRIT} K."
        )
    return _p_sat(T)


def saturation_temperature(p: float) -> float:
    r"""Saturation (boiling) temperature of water from IAPWS-IF97 region 4.

    .. math:: \frac{T_s}{1\ \mathrm{K}} = \frac{n_{10} + D
        - \sqrt{(n_{10} + D)^2 - 4 (n_9 + n_{10} D)}}{2}, \quad
        D = \frac{2G}{-F - \sqrt{F^2 - 4EG}}, \quad
        E = \beta^2 + n_3 \beta + n_6, \quad
        F = n_1 \beta^2 + n_4 \beta + n_7, \quad
        G = n_2 \beta^2 + n_5 \beta + n_8, \quad
        \beta = \left(\frac{p}{1\ \mathrm{MPa}}\right)^{1/4}

    Parameters
    ----------
    p : float
        Absolute pressure [Pa]

    Returns
    -------
    T_s : float
        Saturation temperature [K]

    Notes
    -----
    Valid for 611.213 Pa <= p <= 22.064 MPa, i.e. from the saturation
    pressure at 273.15 K to the critical pressure; both limits are taken
    as the values of the saturation-pressure equation at 273.15 K and
    647.096 K, so every value of :func:`saturation_pressure` is accepted. This backward equation
    is consistent with :func:`saturation_pressure` to within the
    round-off of the release (no iteration is made).

    Examples
    --------
    >>> round(saturation_temperature(101325.0), 3)
    373.124

    References
    ----------
    1. IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation
       1997 for the Thermodynamic Properties of Water and Steam, section 8.2,
       eq. 31, Table 34; verification values Table 36.
    """
    if not _P_MIN_4 <= p <= _P_MAX_4:
        raise ValueError(
            f"Pressure p = {p!r} Pa is outside the range of the IAPWS-IF97 "
            f"saturation-temperature equation, p_s(273.15 K) = {_P_MIN_4:.6g} Pa <= p "
            f"<= p_c = {_P_MAX_4:.0f} Pa."
        )
    n = _N4
    beta = (p / _P_STAR_4) ** 0.25
    e = beta * beta + n[2] * beta + n[5]
    f = n[0] * beta * beta + n[3] * beta + n[6]
    g = n[1] * beta * beta + n[4] * beta + n[7]
    d = 2.0 * g / (-f - math.sqrt(f * f - 4.0 * e * g))
    return (n[9] + d - math.sqrt((n[9] + d) ** 2 - 4.0 * (n[8] + n[9] * d))) / 2.0


# --- IAPWS 2008 viscosity -------------------------------------------------------


@equation(
    symbol="μ",
    text="μ = 1 μPa·s × μ0(T̄)·μ1(T̄, ρ̄), T̄ = T/647.096 K, ρ̄ = ρ/322 kg/m³ (IAPWS 2008)",
    latex=r"\mu = 1\,\mu\mathrm{Pa\,s} \times \bar\mu_0(\bar T)\,\bar\mu_1(\bar T, \bar\rho)",
    substitute="IAPWS 2008 viscosity at T = {T}, ρ = {rho}",
    reference="iapws_2008_viscosity",
    units="display",
)
def viscosity(T: float, rho: float) -> float:
    r"""Dynamic viscosity of water from the IAPWS 2008 formulation, without critical enhancement.

    .. math:: \mu = \mu^* \bar\mu_0(\bar T)\, \bar\mu_1(\bar T, \bar\rho)\, \bar\mu_2, \quad
        \bar\mu_0 = \frac{100 \sqrt{\bar T}}{\sum_{i=0}^{3} H_i / \bar T^i}, \quad
        \bar\mu_1 = \exp\left[\bar\rho \sum_{i=0}^{5} \left(\frac{1}{\bar T} - 1\right)^i
        \sum_{j=0}^{6} H_{ij} (\bar\rho - 1)^j\right], \quad \bar\mu_2 = 1

    with :math:`\bar T = T / 647.096\ \mathrm{K}`,
    :math:`\bar\rho = \rho / 322\ \mathrm{kg/m^3}` and
    :math:`\mu^* = 1\ \mu\mathrm{Pa\,s}`.

    Parameters
    ----------
    T : float
        Temperature [K]
    rho : float
        Density, e.g. from :func:`density` [kg/m^3]

    Returns
    -------
    mu : float
        Dynamic viscosity [Pa*s]

    Notes
    -----
    The release is valid over the stable fluid region from the melting
    curve to 1173.15 K at pressures up to 300 MPa (and to 1000 MPa at
    lower temperatures); calcreport accepts 273.15 K <= T <= 1173.15 K and
    any positive finite density. The state (T, rho) should lie in that
    region; with rho from :func:`density` it always does. The critical
    enhancement factor mu_2 is set to 1: it is significant only very close
    to the critical point (647.096 K, 322 kg/m^3), far from any liquid a
    pump handles, and the release recommends mu_2 = 1 for industrial use.

    Examples
    --------
    >>> round(viscosity(298.15, 998.0) * 1e6, 6)
    889.7351

    References
    ----------
    1. IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity
       of Ordinary Water Substance, September 2008, eqs. 10 to 12, Tables 1
       and 2; verification values Table 4.
    """
    if not _T_MIN_MU <= T <= _T_MAX_MU:
        raise ValueError(
            f"Temperature T = {T!r} K is outside the range accepted for the IAPWS 2008 "
            f"viscosity formulation, {_T_MIN_MU} K <= T <= {_T_MAX_MU} K."
        )
    if not 0.0 < rho < math.inf:
        raise ValueError(
            f"Density rho = {rho!r} kg/m^3 is not valid for the IAPWS 2008 viscosity "
            f"formulation; it must be a positive finite number."
        )
    t = T / _T_STAR_MU
    d = rho / _RHO_STAR_MU
    h = _H0
    mu0 = 100.0 * math.sqrt(t) / (h[0] + h[1] / t + h[2] / (t * t) + h[3] / (t * t * t))
    x = 1.0 / t - 1.0
    y = d - 1.0
    outer = 0.0
    xi = 1.0
    for row in _H1:
        inner = 0.0
        for coef in reversed(row):
            inner = inner * y + coef
        outer += xi * inner
        xi *= x
    return _MU_STAR * mu0 * math.exp(d * outer)
