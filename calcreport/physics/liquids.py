"""Common liquids other than water and glycols: organic solvents and seawater.

Properties
    <kind>_density, <kind>_viscosity, <kind>_vapor_pressure for each pure
    liquid of :data:`PURE`; seawater_density, seawater_viscosity

The pure liquids are CoolProp's reference equations of state (Helmholtz
energy) with its viscosity correlations; seawater is CoolProp's fit
``INCOMP::MITSW`` of the Sharqawy, Lienhard and Zubair review, with the
salinity as a mass fraction. CoolProp is imported only when such a liquid is
pumped. Each property is registered as its own equation, named after the
liquid, so the trace names the correlation it used; the functions are made
by one factory and differ only in the CoolProp fluid they evaluate.
"""

from __future__ import annotations

from collections.abc import Callable
from functools import cache
from typing import Any

from calcreport.physics.equation import equation

__all__ = ["KINDS", "PURE", "SALINITY_MAX", "T_RANGE", "property_function"]

# fluid.kind -> (CoolProp fluid name, name in text)
PURE = {
    "methanol": ("Methanol", "methanol"),
    "ethanol": ("Ethanol", "ethanol"),
    "toluene": ("Toluene", "toluene"),
    "benzene": ("Benzene", "benzene"),
    "n_hexane": ("n-Hexane", "n-hexane"),
    "n_heptane": ("n-Heptane", "n-heptane"),
}
KINDS = (*PURE, "seawater")
SALINITY_MAX = 0.12  # the seawater fit's range of salinity (mass fraction)
# Lowest and highest temperature [K] of each liquid: the formulation's lower limit (about the
# triple point) and a service limit of 150 degC (seawater: the fit's 120 degC).
T_RANGE = {
    "methanol": (176.0, 423.15),
    "ethanol": (160.0, 423.15),
    "toluene": (179.0, 423.15),
    "benzene": (279.0, 423.15),
    "n_hexane": (178.0, 423.15),
    "n_heptane": (183.0, 423.15),
    "seawater": (273.15, 393.15),
}


@cache
def _props() -> Any:
    from CoolProp.CoolProp import PropsSI

    return PropsSI


def _evaluate(output: str, *state: Any, fluid: str) -> float:
    try:
        return float(_props()(output, *state, fluid))
    except ValueError as exc:
        raise ValueError(f"{fluid}: outside the property formulation ({exc})") from exc


_PURE_DOC = """{what} of liquid {name} from CoolProp's reference formulation.

    Parameters
    ----------
{params}
    Returns
    -------
    {symbol} : float
        {what} [{unit}]

    References
    ----------
    1. Bell, I. H., Wronski, J., Quoilin, S., and Lemort, V., "Pure and
       pseudo-pure fluid thermophysical property evaluation and the
       open-source thermophysical property library CoolProp", Industrial &
       Engineering Chemistry Research 53 (6), 2498-2508, 2014 ({fluid}).
    """

_SEAWATER_DOC = """{what} of seawater at atmospheric pressure (CoolProp INCOMP::MITSW).

    Parameters
    ----------
    T : float
        Temperature [K]
    w : float
        Salinity as a mass fraction, 0 < w <= 0.12 [-]

    Returns
    -------
    {symbol} : float
        {what} [{unit}]

    References
    ----------
    1. Sharqawy, M. H., Lienhard V, J. H., and Zubair, S. M., "Thermophysical
       properties of seawater: a review of existing correlations and data",
       Desalination and Water Treatment 16, 354-380, 2010, as fitted in
       CoolProp (INCOMP::MITSW).
    """

_T = "    T : float\n        Temperature [K]\n"
_P = "    p : float\n        Absolute pressure [Pa]\n"
# property -> (name, docstring symbol, unit, printed symbol, mathtext symbol, CoolProp output)
_WHAT = {
    "density": ("Density", "rho", "kg/m^3", "ρ", r"\rho", "D"),
    "viscosity": ("Dynamic viscosity", "mu", "Pa*s", "μ", r"\mu", "V"),
    "vapor_pressure": ("Vapour pressure", "p_v", "Pa", "p_v", "p_v", "P"),
}


def _make(kind: str, prop: str) -> Callable[..., Any]:
    what, symbol, unit, printed, tex, output = _WHAT[prop]
    if kind == "seawater":

        def func(T: Any, w: Any) -> Any:
            if not 0.0 < w <= SALINITY_MAX:
                raise ValueError(f"salinity {w:g} is outside 0 to {SALINITY_MAX:g}")
            return _evaluate(output, "T", T, "P", 101325.0, fluid=f"INCOMP::MITSW[{w:.6g}]")

        doc = _SEAWATER_DOC.format(what=what, symbol=symbol, unit=unit)
        substitute = "Sharqawy et al. (2010) seawater correlations at T = {T}, salinity w = {w}"
        arguments = "T, w"
        reference = "sharqawy_2010"
    else:
        fluid, name = PURE[kind]
        if prop == "vapor_pressure":

            def func(T: Any) -> Any:
                return _evaluate("P", "T", T, "Q", 0.0, fluid=fluid)

            params, arguments = _T, "T"
        else:

            def func(T: Any, p: Any) -> Any:
                return _evaluate(output, "T", T, "P", p, fluid=fluid)

            params, arguments = _T + _P, "T, p"
        doc = _PURE_DOC.format(
            what=what, name=name, params=params, symbol=symbol, unit=unit, fluid=fluid
        )
        substitute = f"reference equation of state of {name} at " + ", ".join(
            f"{a} = {{{a}}}" for a in arguments.split(", ")
        )
        reference = "coolprop_2014"
    func.__name__ = func.__qualname__ = f"{kind}_{prop}"
    func.__doc__ = doc
    func.__module__ = __name__
    label = kind.replace("_", "-")
    return equation(
        symbol=printed,
        text=f"{printed} = {printed}_{label}({arguments})",
        latex=rf"{tex} = {tex[0] if prop == 'vapor_pressure' else tex}"
        rf"_{{{'v,' if prop == 'vapor_pressure' else ''}\mathrm{{{label}}}}}({arguments})",
        substitute=substitute,
        reference=reference,
        units="display",
    )(func)


_FUNCTIONS = {
    (kind, prop): _make(kind, prop)
    for kind in KINDS
    for prop in _WHAT
    if not (kind == "seawater" and prop == "vapor_pressure")
}


def property_function(kind: str, prop: str) -> Callable[..., Any]:
    """The registered function of ``prop`` ("density", "viscosity", "vapor_pressure")."""
    return _FUNCTIONS[(kind, prop)]
