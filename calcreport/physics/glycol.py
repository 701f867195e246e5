"""Aqueous ethylene- and propylene-glycol solutions: density, viscosity, vapour pressure.

Properties
    ethylene_glycol_density, ethylene_glycol_viscosity,
    propylene_glycol_density, propylene_glycol_viscosity
Vapour pressure
    raoult_vapor_pressure

Density and viscosity come from the incompressible-liquid fits of CoolProp
(``INCOMP::MEG`` and ``INCOMP::MPG``, after Melinder, *Properties of Secondary
Working Fluids for Indirect Systems*, IIR 2010), imported only when a glycol is
pumped: CoolProp takes seconds to load. CoolProp gives no saturation pressure
below 100 °C, so the vapour pressure is Raoult's law on the water's mole
fraction (common practice, no published source: the glycol itself is far less
volatile than water).
"""

from __future__ import annotations

from functools import cache
from typing import Any

from calcreport.physics import water
from calcreport.physics.equation import equation

__all__ = [
    "ethylene_glycol_density",
    "ethylene_glycol_viscosity",
    "propylene_glycol_density",
    "propylene_glycol_viscosity",
    "raoult_vapor_pressure",
]

M_WATER = 18.015  # g/mol
MOLAR_MASS = {"MEG": 62.068, "MPG": 76.094}  # ethylene and propylene glycol, g/mol
CODE = {"ethylene_glycol": "MEG", "propylene_glycol": "MPG"}  # fluid.kind -> CoolProp name
MAX_FRACTION = 0.6
# Temperatures [K] at which glycol solutions are computed: inside the fits, liquid and unfrozen
# service.
T_RANGE = (253.15, 373.15)
_T_MIN_SAT = 273.16  # water's saturation pressure is taken no colder than its triple point


@cache
def _props() -> Any:
    from CoolProp.CoolProp import PropsSI

    return PropsSI


def valid_range(fluid: str, w: float) -> tuple[float, float]:
    """Temperatures [K] between which the property fit of ``fluid`` ("MEG" or "MPG") at mass
    fraction ``w`` holds: from the solution's freezing point to the fit's upper limit."""
    props = _props()
    name = f"INCOMP::{fluid}[{w:.6g}]"
    low = float(props("T_freeze", "T", 300.0, "P", 101325.0, name))
    high = float(props("Tmax", "T", 300.0, "P", 101325.0, name))
    return max(low, float(props("Tmin", "T", 300.0, "P", 101325.0, name))), high


def _incomp(output: str, fluid: str, T: float, w: float) -> float:
    if not 0.0 < w <= MAX_FRACTION:
        raise ValueError(f"the glycol mass fraction {w:g} is outside 0 to {MAX_FRACTION:g}")
    try:
        return float(
            _props()(
                "D" if output == "D" else "V", "T", T, "P", 101325.0, f"INCOMP::{fluid}[{w:.6g}]"
            )
        )
    except ValueError as exc:
        raise ValueError(
            f"{fluid} at {T - 273.15:.4g} °C and mass fraction {w:g} is outside "
            f"the property fit: {exc}"
        ) from exc


@equation(
    symbol="ρ",
    text="ρ = ρ(T, w), ethylene glycol–water",
    latex=r"\rho = \rho(T, w)",
    substitute=(
        "Melinder (2010) fit for ethylene glycol–water at T = {T}, glycol mass fraction w = {w}"
    ),
    reference="melinder_2010",
    units="display",
)
def ethylene_glycol_density(T: Any, w: Any) -> Any:
    r"""Density of an aqueous ethylene-glycol solution at atmospheric pressure.

    .. math:: \rho = \rho(T, w)

    Parameters
    ----------
    T : float
        Temperature [K]
    w : float
        Mass fraction of glycol, 0 < w <= 0.6 [-]

    Returns
    -------
    rho : float
        Density [kg/m^3]

    References
    ----------
    1. Melinder, Å., Properties of Secondary Working Fluids for Indirect
       Systems, 2nd ed., International Institute of Refrigeration, 2010,
       as fitted in CoolProp (INCOMP::MEG).
    """
    return _incomp("D", "MEG", T, w)


@equation(
    symbol="μ",
    text="μ = μ(T, w), ethylene glycol–water",
    latex=r"\mu = \mu(T, w)",
    substitute=(
        "Melinder (2010) fit for ethylene glycol–water at T = {T}, glycol mass fraction w = {w}"
    ),
    reference="melinder_2010",
    units="display",
)
def ethylene_glycol_viscosity(T: Any, w: Any) -> Any:
    r"""Dynamic viscosity of an aqueous ethylene-glycol solution.

    .. math:: \mu = \mu(T, w)

    Parameters
    ----------
    T : float
        Temperature [K]
    w : float
        Mass fraction of glycol, 0 < w <= 0.6 [-]

    Returns
    -------
    mu : float
        Dynamic viscosity [Pa*s]

    References
    ----------
    1. Melinder 2010, as fitted in CoolProp (INCOMP::MEG).
    """
    return _incomp("V", "MEG", T, w)


@equation(
    symbol="ρ",
    text="ρ = ρ(T, w), propylene glycol–water",
    latex=r"\rho = \rho(T, w)",
    substitute=(
        "Melinder (2010) fit for propylene glycol–water at T = {T}, glycol mass fraction w = {w}"
    ),
    reference="melinder_2010",
    units="display",
)
def propylene_glycol_density(T: Any, w: Any) -> Any:
    r"""Density of an aqueous propylene-glycol solution at atmospheric pressure.

    .. math:: \rho = \rho(T, w)

    Parameters
    ----------
    T : float
        Temperature [K]
    w : float
        Mass fraction of glycol, 0 < w <= 0.6 [-]

    Returns
    -------
    rho : float
        Density [kg/m^3]

    References
    ----------
    1. Melinder 2010, as fitted in CoolProp (INCOMP::MPG).
    """
    return _incomp("D", "MPG", T, w)


@equation(
    symbol="μ",
    text="μ = μ(T, w), propylene glycol–water",
    latex=r"\mu = \mu(T, w)",
    substitute=(
        "Melinder (2010) fit for propylene glycol–water at T = {T}, glycol mass fraction w = {w}"
    ),
    reference="melinder_2010",
    units="display",
)
def propylene_glycol_viscosity(T: Any, w: Any) -> Any:
    r"""Dynamic viscosity of an aqueous propylene-glycol solution.

    .. math:: \mu = \mu(T, w)

    Parameters
    ----------
    T : float
        Temperature [K]
    w : float
        Mass fraction of glycol, 0 < w <= 0.6 [-]

    Returns
    -------
    mu : float
        Dynamic viscosity [Pa*s]

    References
    ----------
    1. Melinder 2010, as fitted in CoolProp (INCOMP::MPG).
    """
    return _incomp("V", "MPG", T, w)


def _raoult_text(values: dict[str, Any], result: float, fmt: Any) -> str:
    # A correlation in SI (units="fixed"): ``fmt`` writes numbers, the units are literal.
    T, w, M = values["T"], values["w"], values["M_glycol"]
    x = _water_mole_fraction(w, M)
    T_sat = max(T, _T_MIN_SAT)
    at = f"{fmt(T_sat)} K" + (" (its 0.01 °C limit)" if T_sat > T else "")
    return (
        f"x_w = ((1 − {fmt(w)})/{M_WATER}) / ((1 − {fmt(w)})/{M_WATER} + {fmt(w)}/{fmt(M)})"
        f" = {fmt(x)}; p_v = {fmt(x)} × p_sat,water({at}) = {fmt(x)} × "
        f"{fmt(water.saturation_pressure(T_sat))} Pa"
    )


def _water_mole_fraction(w: float, M_glycol: float) -> float:
    n_water = (1.0 - w) / M_WATER
    return n_water / (n_water + w / M_glycol)


@equation(
    symbol="p_v",
    text="p_v = x_w·p_sat,water(T)",
    latex=r"p_v = x_w\, p_{sat,water}(T)",
    substitute=_raoult_text,
    reference="common_practice",
    units="fixed",
)
def raoult_vapor_pressure(T: Any, w: Any, M_glycol: Any) -> Any:
    r"""Vapour pressure of an aqueous glycol solution by Raoult's law on the water.

    .. math:: p_v = x_w\, p_{sat,water}(T)

    Parameters
    ----------
    T : float
        Temperature [K]
    w : float
        Mass fraction of glycol [-]
    M_glycol : float
        Molar mass of the glycol, g/mol (62.068 ethylene, 76.094 propylene) [-]

    Returns
    -------
    p_v : float
        Vapour pressure [Pa]

    Notes
    -----
    Ideal-solution approximation (common practice, no published source):
    the glycol's own vapour pressure is neglected, and aqueous glycols
    deviate from Raoult's law by some per cent; the NPSH margin should
    allow for it. Below 0.01 °C water's saturation pressure is taken at
    0.01 °C (the formulation's lower limit): a higher vapour pressure than
    the liquid's, so the NPSH available is understated, on the safe side.

    Examples
    --------
    >>> round(raoult_vapor_pressure(293.15, 0.3, 62.068))
    2080

    References
    ----------
    1. Raoult's law; water saturation pressure by IAPWS-IF97 region 4.
    """
    return _water_mole_fraction(w, M_glycol) * water.saturation_pressure(max(T, _T_MIN_SAT))
