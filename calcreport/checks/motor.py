"""Checks of the motor: its loading over every state and its site (altitude and ambient
temperature against the usual service conditions).
"""

from __future__ import annotations

from typing import Any

from calcreport.model.schema import Model
from calcreport.physics.motor import SERVICE_STANDARDS
from calcreport.trace import Check


def _motor_loading(motor: dict[str, Any]) -> Check:
    """The most loaded state: each pump's shaft power within the motor's rated output."""
    loading = motor["loading"]
    state = max(loading, key=lambda k: loading[k]["value"])
    value = loading[state]["value"]
    limit = motor.get("derating", {"value": 1.0})["value"]
    ok = value <= limit
    return Check(
        id="motor_loading",
        title="Motor loading in every operating state",
        status="pass" if ok else "fail",
        value=value,
        unit="",
        limit=limit,
        comparison="<=",
        basis="Each pump's shaft power in every case and duty-profile point, over the motor "
        "rating (times the site derating, where given), at most 1 at service factor 1.0",
        reference="karassik_2008",
        case=state,
        step=loading[state].get("from", ""),
        message=f"most loaded in {state}" + ("" if ok else ": the motor is overloaded"),
        margin=limit - value,
    )


# IEC 60034-1 and NEMA MG 1 rate motors for sites up to 1000 m and 40 degC coolant.
MOTOR_ALTITUDE_MAX = 1000.0
MOTOR_AMBIENT_MAX = 313.15


def _motor_site(model: Model, motor: dict[str, Any]) -> Check | None:
    """A site beyond the motor standard's usual conditions needs the maker's derating."""
    if "rated_power" not in motor:
        return None
    high = model.site.elevation is not None and model.site.elevation.value > MOTOR_ALTITUDE_MAX
    hot = model.motor_ambient is not None and model.motor_ambient.value > MOTOR_AMBIENT_MAX
    if not (high or hot):
        return None
    derated = model.motor_derating is not None
    beyond = " and ".join(
        w for w, on in (("above 1000 m", high), ("above 40 °C ambient", hot)) if on
    )
    return Check(
        id="motor_site_derating",
        title="Motor derated for its site",
        status="pass" if derated else "review",
        value=model.motor_derating.value if derated else None,
        unit="",
        limit=None,
        comparison="given",
        basis="Rated output holds up to 1000 m altitude and 40 °C coolant "
        f"({SERVICE_STANDARDS} usual service conditions); beyond them the manufacturer's "
        "derating factor (motor.derating) applies",
        reference="iec_60034_1",
        case="all",
        message=f"site {beyond}"
        + ("; derating applied" if derated else ": give motor.derating from the motor maker"),
    )
