"""Pressure along the route: node pressures of every state, highest pressures against ratings.

:func:`calcreport.solver.solve` calls these once its operating states are
solved. For each state, :func:`profile` lays the energy and hydraulic grade
lines over every point where the route's pressure is read (each pipe's
stations, both sides of every fitting location, and the pump's flanges) and
:meth:`Route.case_route` finds the lowest pressure in the pressurised line.
Over all states, :meth:`Route.envelope` (from
:mod:`~calcreport.solver.pressure_envelope`) finds the highest pressure at every
point (the pump at its highest head against a closed line, operation in
every state, and the upsurge of the screened events) and sets it against
the ratings of the pipes, the listed components and the pump casing, one
entry per rated item; :meth:`Route.surge_screening` (from
:mod:`~calcreport.solver.surge_screen`) estimates wave speeds, periods and head
changes. Every value a check relies on is a step.

Where losses happen: an entrance as the liquid enters its pipe, an exit as it
leaves, friction uniformly along the pipe, any other fitting at the pipe's
start unless the input places it (``at = "end"`` or a distance).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING, Any

from calcreport.model.schema import ENTRANCE_NOTE, EXIT_NOTE, Fitting, Given, Model, Pipe
from calcreport.physics import losses, route
from calcreport.solver.pressure_envelope import (
    PressureEnvelope,
    _head_at,
)
from calcreport.solver.states import (
    DISCHARGE_FLANGE,
    SUCTION_FLANGE,
    CaseHydraulics,
    Evaluator,
    FittingLoss,
    Surfaces,
)
from calcreport.solver.surge_screen import SurgeScreening, line_nodes
from calcreport.trace import TraceBuilder
from calcreport.trace import bound as _q  # a result naming its source

if TYPE_CHECKING:
    from calcreport.solver.states import Case, Liquid

__all__ = [
    "FittingLoss",
    "Route",
    "State",
    "Station",
    "controlling_crest",
    "head_loss_to",
    "placement",
    "profile",
]


def placement(ft: Fitting) -> str:
    """Where along its pipe a fitting's loss is taken: "entrance" (as the liquid enters the
    pipe), "start", "along" (at ``ft.distance``), "end" or "exit" (as it leaves)."""
    if ft.at:
        return ft.at
    if ft.kind.endswith("entrance") or (not ft.kind and ENTRANCE_NOTE.search(ft.note)):
        return "entrance"
    if ft.kind == "exit" or (not ft.kind and EXIT_NOTE.search(ft.note)):
        return "exit"
    return "start"


@dataclass(frozen=True)
class Station:
    """A point along a pipe where the route's pressure is read."""

    key: str  # step-id part: start, start.after_fittings, at_120m, end, ...
    name: str  # as printed: "D1 start", "D1 start, after fittings", ...
    x: float  # distance from the pipe's start [m]
    upstream: tuple[FittingLoss, ...]  # the pipe's own fitting losses before the point


def stations(pipe: Pipe, items: list[FittingLoss], label: Any = None) -> list[Station]:
    """The pipe's stations in flow order: its start, both sides of every fitting location
    along it, its end (``label`` prints a distance along the pipe, in metres by default)."""
    L = pipe.length.value
    groups: dict[str, list[FittingLoss]] = {"entrance": [], "start": [], "end": [], "exit": []}
    along: dict[float, list[FittingLoss]] = {}
    for item in items:
        where = placement(item.fitting)
        if where == "along":
            assert item.fitting.distance is not None
            d = item.fitting.distance.value
            if 0.0 < d < L:
                along.setdefault(d, []).append(item)
                continue
            where = "start" if d <= 0.0 else "end"
        groups[where].append(item)
    before = list(groups["entrance"])
    out = [Station("start", f"{pipe.id} start", 0.0, tuple(before))]

    def after(key: str, name: str, x: float, more: list[FittingLoss]) -> None:
        before.extend(more)
        out.append(Station(f"{key}.after_fittings", f"{name}, after fittings", x, tuple(before)))

    if groups["start"]:
        after("start", f"{pipe.id} start", 0.0, groups["start"])
    for d in sorted(along):
        key, name = f"at_{d:.6g}m", f"{pipe.id} at {label(d) if label else f'{d:.6g} m'}"
        out.append(Station(key, name, d, tuple(before)))
        after(key, name, d, along[d])
    out.append(Station("end", f"{pipe.id} end", L, tuple(before)))
    if groups["end"]:
        after("end", f"{pipe.id} end", L, groups["end"])
    return out


@dataclass(frozen=True)
class State:
    """What the route needs of one solved state: the state at its flow, liquid and heads."""

    case: Case
    liquid: Liquid
    surfaces: Surfaces
    h: CaseHydraulics
    profile: dict[str, Any]
    pump_head: Given | None = None  # the pump's own head where a valve burns part of it

    @property
    def lift(self) -> Given:
        """The head the pump adds between its flanges: its own head, or the system's TDH."""
        return self.pump_head or self.h["tdh"]

    @cached_property
    def pipe_nodes(self) -> dict[str, dict[str, Any]]:
        """The profile's pipe and flange nodes by name."""
        return {n["name"]: n for n in self.profile["nodes"] if "pipe" in n}


def _label(model: Model) -> Any:
    """A distance along a pipe as the report prints it."""
    from calcreport.units import show

    return lambda d: show({"value": d, "unit": "m"}, "length", model.project.units)


def profile(
    model: Model,
    case: Case,
    liquid: Liquid,
    h: CaseHydraulics,
    p_source: Given,
    p_dest: Given,
    pump_head: Given | None = None,
) -> dict[str, Any]:
    """Energy and hydraulic grade lines at every station, source to destination.

    Each loss is taken where it happens (see the module's docstring), so the pressure at
    a station follows every loss upstream of it. The pump adds its head between its
    flanges: ``pump_head`` at the discharge flange where a throttling valve just
    downstream burns part of it, the TDH beyond. Where the input gives the pipe's end
    elevations, a station carries its gauge pressure head (HGL less elevation); the
    flanges stand at the pump datum. Elevations in metres on the input's datum.
    """
    rho_g = liquid.density.value * losses.G
    source = case.source_level.value + p_source.value / rho_g
    tdh = h["tdh"].value
    nodes: list[dict[str, Any]] = [
        {
            "name": "source surface",
            "distance": 0.0,
            "egl": source,
            "hgl": source,
            "elevation": case.source_level.value,
        }
    ]
    z_pump = model.pump.elevation.value
    label = _label(model)
    lost = distance = 0.0
    pumped = False
    previous: Pipe | None = None
    beyond = False  # past the crest that controls the flow: the line runs part-full
    for pipe in model.pipes:
        values = h["pipes"][pipe.id]
        hv = float(losses.velocity_head(values["velocity"].value))
        if pipe.line == "discharge" and not pumped:
            pumped = True
            if previous is not None:
                v_in = float(losses.velocity_head(h["pipes"][previous.id]["velocity"].value))
                egl = source - lost
                nodes.append(
                    _flange(SUCTION_FLANGE, previous, "suction", distance, egl, v_in, z_pump)
                )
            egl = source - lost + (pump_head.value if pump_head else tdh)
            nodes.append(_flange(DISCHARGE_FLANGE, pipe, "discharge", distance, egl, hv, z_pump))
        lift = tdh if pumped else 0.0
        f_loss, L = values["friction_loss"].value, pipe.length.value
        for stn in stations(pipe, h["fittings"][pipe.id], label):
            spent = sum(item.value(hv) for item in stn.upstream) + f_loss * stn.x / L
            egl = source + lift - lost - spent
            z = _elevation_value(pipe, stn.x)
            node = {
                "name": stn.name,
                "pipe": pipe.id,
                "station": stn.key,
                "x": stn.x,
                "side": pipe.line,
                "distance": distance + stn.x,
                "egl": egl,
                "hgl": egl - hv,
                "elevation": z,
            }
            if beyond:
                # Part-full: the free surface is at the atmosphere's pressure.
                node.update(part_full=True, egl=(z or 0.0) + hv, hgl=z)
                node["pressure_head"] = 0.0
            elif z is not None:
                node["pressure_head"] = egl - hv - z
            nodes.append(node)
            if case.crest is not None and case.crest[:2] == (pipe.id, stn.key):
                beyond = True
        lost += f_loss + values["minor_loss"].value
        distance += pipe.length.value
        previous = pipe
    final = case.destination_level.value + p_dest.value / rho_g
    nodes.append(
        {
            "name": "destination surface",
            "distance": distance,
            "egl": source + tdh - lost,
            "hgl": final,
            "elevation": case.destination_level.value,
        }
    )
    return {
        "nodes": nodes,
        "unit": "m",
        "pump_after": model.suction_pipes[-1].id if model.suction_pipes else "",
        "losses_at": "where each happens: entrance at a pipe's start, exit at its end, friction "
        "along it, other fittings at the start unless placed",
    }


def _flange(
    name: str, pipe: Pipe, side: str, distance: float, egl: float, hv: float, z: float
) -> dict[str, Any]:
    """A pump flange node: at the pump datum, with the velocity of the pipe it joins."""
    return {
        "name": name,
        "pipe": pipe.id,
        "station": "flange",
        "x": 0.0 if side == "discharge" else pipe.length.value,
        "side": side,
        "distance": distance,
        "egl": egl,
        "hgl": egl - hv,
        "elevation": z,
        "pressure_head": egl - hv - z,
    }


def _distance(pipe: Pipe, x: float) -> Given:
    """The input's distance of the fittings placed at ``x`` along ``pipe``."""
    found = next(ft.distance for ft in pipe.fittings if ft.distance and ft.distance.value == x)
    assert found is not None
    return found


def _elevation_value(pipe: Pipe, x: float) -> float | None:
    z1, z2 = pipe.elevation_start, pipe.elevation_end
    if x <= 0.0:
        return z1.value if z1 else None
    if x >= pipe.length.value:
        return z2.value if z2 else None
    if z1 is None or z2 is None:
        return None
    return float(route.elevation_along(z1.value, z2.value, x, pipe.length.value))


def head_loss_to(
    ev: Evaluator,
    model: Model,
    case: Case,
    h: CaseHydraulics,
    index: int,
    node: dict[str, Any],
    where: str,
    label: Any = None,
) -> Given:
    """The step of the head lost from the source surface to a pipe's station ``node``
    (``index`` the pipe's place in flow order; ``ev`` records steps or sweeps arrays)."""
    pipe = model.pipes[index]
    values = h["pipes"][pipe.id]
    terms: list[Given] = []
    for other in model.pipes[:index]:
        terms += [h["pipes"][other.id]["friction_loss"], h["pipes"][other.id]["minor_loss"]]
    every = h["fittings"][pipe.id]
    stn = next(s for s in stations(pipe, every, label) if s.key == node["station"])
    if len(stn.upstream) == len(every) and every:
        terms.append(values["minor_loss"])
    elif stn.upstream:
        coefficients = [i for i in stn.upstream if i.K is not None]
        if len(coefficients) == sum(1 for i in every if i.K is not None):
            terms.append(values["fitting_loss"])
        elif coefficients:
            K = ev.step(
                case.sid(f"{where}.k_upstream"),
                f"Fitting coefficients of {pipe.id} upstream of {node['name']}",
                losses.k_total,
                case.id,
                K=[i.K for i in coefficients if i.K is not None],
                count=[i.fitting.count for i in coefficients],
            )
            terms.append(
                ev.step(
                    case.sid(f"{where}.fitting_loss"),
                    f"Fitting losses of {pipe.id} upstream of {node['name']}",
                    losses.minor_loss,
                    case.id,
                    K_total=K,
                    v=values["velocity"],
                )
            )
        terms += [i.head for i in stn.upstream if i.head is not None]
    if stn.x >= pipe.length.value:
        terms.append(values["friction_loss"])
    elif stn.x > 0.0:
        terms.append(
            ev.step(
                case.sid(f"{where}.friction_loss"),
                f"Friction loss of {pipe.id} up to {node['name']}",
                losses.friction_share,
                case.id,
                h_f=values["friction_loss"],
                x=_distance(pipe, stn.x),
                L=pipe.length,
            )
        )
    return ev.step(
        case.sid(f"{where}.head_loss"),
        f"Head lost from the source surface to {node['name']}",
        losses.head_sum,
        case.id,
        h=terms,
    )


def controlling_crest(model: Model, design: State, st: State) -> tuple[str, str, float, str] | None:
    """The crest that controls the flow of state ``st``: the line's highest point, above
    the destination surface, where the full line's pressure would fall below atmospheric
    (pipe id, station, distance along the pipe, node name); None where there is none."""
    if st.case.crest is not None:
        return None
    line = [n for n in line_nodes(model, design.profile["nodes"]) if n["station"] != "flange"]
    if not line:
        return None
    crest = max(line, key=lambda n: n["elevation"])
    if crest["elevation"] <= st.case.destination_level.value:
        return None
    if _head_at(st, crest["name"]) >= 0.0:
        return None
    return crest["pipe"], crest["station"], crest["x"], crest["name"]


class Route(PressureEnvelope, SurgeScreening):
    """Steps of the route for one solve: node pressures on demand, each recorded once."""

    def __init__(self, b: TraceBuilder, model: Model) -> None:
        self.b = b
        self.model = model
        self.pipes = {p.id: (i, p) for i, p in enumerate(model.pipes)}
        self.first_discharge = next((p for p in model.pipes if p.line == "discharge"), None)
        self.last_suction = model.suction_pipes[-1] if model.suction_pipes else None
        self._heads: dict[tuple[str, str], Given] = {}
        self._vapour: dict[str, Given] = {}
        self._elevations: dict[str, Given] = {}
        self._restraint: dict[tuple[str, str], Given] = {}  # default c1 by (state, ν source)
        # Surge head change by pipe for each (event, state), once screened.
        self.rises: dict[tuple[str, str], dict[str, Given]] = {}
        self.downsurge = ""  # the state whose pump-trip downsurge is the lowest
        self.label = _label(model)

    # -- one state -----------------------------------------------------------

    def elevation(self, node: dict[str, Any]) -> Given:
        """The elevation of a node: the pump datum, a pipe end, or a step along the pipe."""
        if node["station"] == "flange":
            return self.model.pump.elevation
        pipe = self.pipes[node["pipe"]][1]
        if node["x"] <= 0.0 and pipe.elevation_start is not None:
            return pipe.elevation_start
        if node["x"] >= pipe.length.value and pipe.elevation_end is not None:
            return pipe.elevation_end
        key = f"route.{pipe.id}.at_{node['x']:.6g}m.elevation"
        if key not in self._elevations:
            assert pipe.elevation_start is not None and pipe.elevation_end is not None
            self._elevations[key] = self.b.step(
                key,
                f"Centreline elevation of {pipe.id} at {self.label(node['x'])}",
                route.elevation_along,
                z_1=pipe.elevation_start,
                z_2=pipe.elevation_end,
                x=_distance(pipe, node["x"]),
                L=pipe.length,
            )
        return self._elevations[key]

    def _where(self, node: dict[str, Any]) -> str:
        """The step-id stem of a node."""
        if node["station"] == "flange":
            return f"route.{node['name'].replace(' ', '_')}"
        return f"route.{node['pipe']}.{node['station']}"

    def node_head(self, st: State, node: dict[str, Any]) -> Given:
        """The step of a node's gauge pressure head in state ``st``."""
        key = (st.case.id, node["name"])
        if key in self._heads:
            return self._heads[key]
        b, case, h = self.b, st.case, st.h
        index, pipe = self.pipes[node["pipe"]]
        where = self._where(node)
        velocity = h["pipes"][pipe.id]["velocity"]
        if node["station"] == "flange":
            h_L = h["suction_loss"]
        else:
            h_L = head_loss_to(b, self.model, case, h, index, node, where, self.label)
        if node["side"] == "suction":
            lift = b.assume("No pump head is added upstream of the pump.", 0.0, "m")
        else:
            lift = st.lift if node["station"] == "flange" else h["tdh"]
        value = b.step(
            case.sid(f"{where}.pressure_head"),
            f"Pressure head at {node['name']} (gauge)",
            route.node_pressure_head,
            case.id,
            z_s=case.source_level,
            p_s=st.surfaces.source,
            rho=st.liquid.density,
            H=lift,
            h_L=h_L,
            v=velocity,
            z=self.elevation(node),
        )
        self._heads[key] = value
        return value

    def vapour_head(self, st: State) -> Given:
        """The gauge pressure head at which the liquid of state ``st`` boils."""
        if st.case.id not in self._vapour:
            self._vapour[st.case.id] = self.b.step(
                st.case.sid("route.vapour_head"),
                "Gauge pressure head at the vapour pressure",
                route.vapour_limit_head,
                st.case.id,
                p_v=st.liquid.vapor_pressure,
                p_baro=st.surfaces.barometric,
                rho=st.liquid.density,
            )
        return self._vapour[st.case.id]

    def case_route(self, st: State) -> dict[str, Any] | None:
        """Lowest pressures of the discharge line and of the suction line in one state, as
        steps (the suction may run below atmospheric by design, but not to vapour)."""
        line = line_nodes(self.model, st.profile["nodes"])
        suction = [
            n for n in st.profile["nodes"] if n.get("side") == "suction" and "pressure_head" in n
        ]
        if not line and not suction:
            return None
        out: dict[str, Any] = {"vapour_head": _q(self.vapour_head(st))}
        if line:
            lowest = min(line, key=lambda n: n["pressure_head"])
            out["min_pressure_head"] = _q(self.node_head(st, lowest))
            out["min_pressure_node"] = lowest["name"]
        if suction:
            lowest = min(suction, key=lambda n: n["pressure_head"])
            out["suction_min_pressure_head"] = _q(self.node_head(st, lowest))
            out["suction_min_pressure_node"] = lowest["name"]
        return out

    # -- all states ----------------------------------------------------------

    # -- surge ---------------------------------------------------------------
