"""Checks of pressure along the route: the least pressure head of the pressurised line, each
rated item's highest pressure against its rating, the surge screening of each event.
"""

from __future__ import annotations

from typing import Any

from calcreport.checks.criteria import _shown, _status, criterion
from calcreport.model.schema import Model
from calcreport.trace import Check


def _min_pressure(model: Model, route: dict[str, Any], case: str) -> Check:
    """The lowest pressure of the pressurised line: positive, and above the criterion."""
    h = route["min_pressure_head"]["value"]
    node = route["min_pressure_node"]
    limit, basis, ref, project = criterion(model, "min_pressure_head")
    if h <= route["vapour_head"]["value"]:
        status, message = "fail", f"{node} at vapour pressure: the liquid column separates"
    elif h < 0.0:
        status = "fail"
        message = (
            f"sub-atmospheric at {node} ({_shown(model, h, 'm', 'length')} gauge): air and "
            "groundwater drawn in, or a siphon the flow depends on"
        )
    else:
        status = _status(h >= limit, project)
        message = f"lowest at {node}" + (
            "" if h >= limit else f", below {_shown(model, limit, 'm', 'length')}"
        )
    return Check(
        id="min_pressure",
        title="Lowest pressure head in the discharge line",
        status=status,
        value=h,
        unit="m",
        limit=limit,
        comparison=">=",
        basis=basis,
        reference=ref,
        case=case,
        step=route["min_pressure_head"].get("from", ""),
        message=message,
        margin=h - limit,
    )


def _pressure_rating(model: Model, rc: dict[str, Any]) -> Check:
    """One rated item's highest pressure against its rating, at the point where they come
    closest; an operating pressure above it fails whether or not the pump is selected."""
    rating = rc["rating"]["value"]
    if "pressure" not in rc:
        return Check(
            id=f"pressure_rating.{rc['id']}",
            title=f"Highest pressure on {rc['item']} within its rating",
            status="review",
            value=None,
            unit="Pa",
            limit=rating,
            comparison="<=",
            basis="A rating is checked where the route gives the pipe's end elevations",
            reference="input",
            case="all",
            message=f"{rc['item']}: not checked, pipe {rc['pipe']} having no elevations; give "
            "its elevation_start and elevation_end",
        )
    p = rc["pressure"]["value"]
    within = p <= rating
    when = {
        "static": "with no flow and the pump at its highest curve head (top speed, highest "
        "source level)",
        "surge": f"during the screened surge (state {rc['case']})",
        "operating": f"in operation (state {rc['case']})",
    }[rc["basis"]]
    status = "fail" if not within else ("pass" if rc["shutoff_known"] else "review")
    # The value and the rating stand in the check's own columns.
    message = f"at {rc['node']}, {when}"
    if within and not rc["shutoff_known"]:
        message += "; confirm against the selected pump's shutoff head"
    return Check(
        id=f"pressure_rating.{rc['id']}",
        title=f"Highest pressure on {rc['item']} within its rating",
        status=status,
        value=p,
        unit="Pa",
        limit=rating,
        comparison="<=",
        basis="The highest pressure the item can see, over the pump's highest head against a "
        "closed line, every operating state and the screened surge, must not exceed its "
        "rating (gauge, at the design temperature); ratings and test pressures per the "
        "applicable piping code",
        reference="input",
        case=rc["case"],
        step=rc["pressure"].get("from", ""),
        message=message,
        margin=rating - p,
    )


def _surge(result: dict[str, Any]) -> Check:
    """The surge screening's verdict: a tripped screening asks for a transient analysis."""
    verdict = result["verdict"]
    source: dict[str, Any] = {}  # the result the value is
    if not result.get("screened", True):
        status, value, limit, comparison = "review", None, None, "screened"
    elif result["event"] == "valve_closure":
        source = result["line_period"]  # the closure time is an input
        value, limit = result["closure_time"]["value"], source["value"]
        # A slow closure passes when its estimated rise is set against a rating somewhere.
        comparison = ">"
        status = "pass" if value > limit and result.get("rise_checked") else "review"
    elif "min_transient_pressure_head" in result:
        source = result["min_transient_pressure_head"]
        value = source["value"]
        limit = result["vapour_head"]["value"]
        comparison = ">"
        status = "fail" if value <= limit else ("review" if value < 0.0 else "pass")
    else:
        source = result["head_rise"]
        status, value, limit, comparison = "review", source["value"], None, "known"
    unit = "s" if result["event"] == "valve_closure" and value is not None else "m"
    return Check(
        id=f"surge.{result['event']}",
        title="Surge screening (" + result["event"].replace("_", " ") + ")",
        status=status,
        value=value,
        unit=unit,
        limit=limit,
        comparison=comparison,
        basis="Joukowsky head change of the line's pipes in series with the Korteweg wave "
        "speed; a pump trip is screened on every pumped line; a screening that trips (column "
        "separation, sub-atmospheric downsurge, closure within 2L/a) requires a detailed "
        "transient analysis",
        reference="series_pipes_surge",
        case=result.get("case", "all"),
        step=source.get("from", ""),
        message=verdict,
    )
