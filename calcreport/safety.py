"""Pressure safety along the route and surge screening: their part of the solve stage.

:func:`calcreport.calc.solve` calls these once its operating cases are
solved. For each case, :func:`profile` lays the energy and hydraulic grade
lines over every pipe end and :func:`case_route` finds the lowest pressure
in the pressurised line. Over all cases, :func:`envelope` finds the highest
pressure at every point (the pump at its highest head against a closed
line, and the upsurge of the screened event) and sets it against the
ratings of the pipes, the listed components and the pump casing;
:func:`surge_screening` estimates wave speeds, periods and the Joukowsky
head change. Every value a check relies on is a step.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING, Any

from calcreport.model.schema import Given, Model, Pipe
from calcreport.physics import head, losses, pump, route, surge, water
from calcreport.trace import TraceBuilder, quantity

if TYPE_CHECKING:
    from calcreport.calc import Case, CurvePoints, Liquid

__all__ = ["Route", "State", "profile"]


@dataclass(frozen=True)
class State:
    """What the route needs of one solved case: the case at its flow, liquid and heads."""

    case: Case
    liquid: Liquid
    surfaces: tuple[Given, Given, Given, Given | None]
    h: dict[str, Any]
    profile: dict[str, Any]
    pump_head: Given | None = None  # the pump's own head where a valve burns part of it

    @property
    def lift(self) -> Given:
        """The head the pump adds at its flanges: its own head, or the system's TDH."""
        return self.pump_head or self.h["tdh"]

    @cached_property
    def pipe_nodes(self) -> dict[str, dict[str, Any]]:
        """The profile's pipe-end nodes by name."""
        return {n["name"]: n for n in self.profile["nodes"] if "pipe" in n}


def _q(given: Given) -> dict[str, Any]:
    return quantity(float(given.value), given.unit)


def profile(
    model: Model, case: Case, liquid: Liquid, h: dict[str, Any], p_source: Given, p_dest: Given
) -> dict[str, Any]:
    """Energy and hydraulic grade lines at every pipe end, source to destination.

    A pipe's fitting and equipment losses are taken at its upstream end and
    its friction along it, so the pressure at each pipe end follows every
    loss upstream of it; the pump adds the TDH between the last suction pipe
    and the first discharge pipe. Where the input gives the pipe's end
    elevations, a node carries its gauge pressure head (HGL less elevation).
    Elevations in metres on the input's datum.
    """
    rho_g = liquid.density.value * losses.G
    egl = case.source_level.value + p_source.value / rho_g
    nodes: list[dict[str, Any]] = [
        {
            "name": "source surface",
            "distance": 0.0,
            "egl": egl,
            "hgl": egl,
            "elevation": case.source_level.value,
        }
    ]
    distance = 0.0
    pumped = False
    for pipe in model.pipes:
        values = h["pipes"][pipe.id]
        if pipe.line == "discharge" and not pumped:
            egl += h["tdh"].value
            pumped = True
        hv = float(losses.velocity_head(values["velocity"].value))
        egl -= values["minor_loss"].value
        for end, given in (("start", pipe.elevation_start), ("end", pipe.elevation_end)):
            if end == "end":
                distance += pipe.length.value
                egl -= values["friction_loss"].value
            node = {
                "name": f"{pipe.id} {end}",
                "pipe": pipe.id,
                "end": end,
                "side": pipe.line,
                "distance": distance,
                "egl": egl,
                "hgl": egl - hv,
                "elevation": given.value if given else None,
            }
            if given:
                node["pressure_head"] = egl - hv - given.value
            nodes.append(node)
    if not pumped:
        egl += h["tdh"].value
    final = case.destination_level.value + p_dest.value / rho_g
    nodes.append(
        {
            "name": "destination surface",
            "distance": distance,
            "egl": egl,
            "hgl": final,
            "elevation": case.destination_level.value,
        }
    )
    return {
        "nodes": nodes,
        "unit": "m",
        "pump_after": model.suction_pipes[-1].id if model.suction_pipes else "",
        "losses_at": "upstream end of each pipe",
    }


def _line_nodes(model: Model, nodes: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """Pipe ends of the pressurised (discharge) line with an elevation, outlet excluded:
    the outlet's pressure is the destination's, not the line's."""
    last = model.pipes[-1].id
    return [
        n
        for n in nodes
        if n.get("side") == "discharge"
        and "pressure_head" in n
        and not (n["pipe"] == last and n["end"] == "end")
    ]


class Route:
    """Steps of the route for one solve: node pressures on demand, each recorded once."""

    def __init__(self, b: TraceBuilder, model: Model) -> None:
        self.b = b
        self.model = model
        self.pipes = {p.id: (i, p) for i, p in enumerate(model.pipes)}
        self.first_discharge = next((p for p in model.pipes if p.line == "discharge"), None)
        self._heads: dict[tuple[str, str], Given] = {}
        self._vapour: dict[str, Given] = {}
        self.rises: dict[str, Given] = {}  # surge head change by pipe, once screened
        self.surge_case = ""

    # -- one case ------------------------------------------------------------

    def node_head(self, st: State, node: dict[str, Any]) -> Given:
        """The step of a node's gauge pressure head in case ``st``."""
        key = (st.case.id, node["name"])
        if key in self._heads:
            return self._heads[key]
        b, case, h = self.b, st.case, st.h
        index, pipe = self.pipes[node["pipe"]]
        terms: list[Given] = []
        for other in self.model.pipes[:index]:
            terms += [h["pipes"][other.id]["friction_loss"], h["pipes"][other.id]["minor_loss"]]
        terms.append(h["pipes"][pipe.id]["minor_loss"])
        if node["end"] == "end":
            terms.append(h["pipes"][pipe.id]["friction_loss"])
        where = f"route.{pipe.id}.{node['end']}"
        h_L = b.step(
            case.sid(f"{where}.head_loss"),
            f"Head lost from the source surface to {node['name']}",
            losses.head_sum,
            case.id,
            h=terms,
        )
        lift = (
            h["tdh"]
            if pipe.line == "discharge"
            else b.assume("No pump head is added upstream of the pump.", 0.0, "m")
        )
        z = pipe.elevation_start if node["end"] == "start" else pipe.elevation_end
        assert z is not None
        value = b.step(
            case.sid(f"{where}.pressure_head"),
            f"Pressure head at {node['name']} (gauge)",
            route.node_pressure_head,
            case.id,
            z_s=case.source_level,
            p_s=st.surfaces[1],
            rho=st.liquid.density,
            H=lift,
            h_L=h_L,
            v=h["pipes"][pipe.id]["velocity"],
            z=z,
        )
        self._heads[key] = value
        return value

    def vapour_head(self, st: State) -> Given:
        """The gauge pressure head at which the liquid of case ``st`` boils."""
        if st.case.id not in self._vapour:
            self._vapour[st.case.id] = self.b.step(
                st.case.sid("route.vapour_head"),
                "Gauge pressure head at the vapour pressure",
                route.vapour_limit_head,
                st.case.id,
                p_v=st.liquid.vapor_pressure,
                p_baro=st.surfaces[0],
                rho=st.liquid.density,
            )
        return self._vapour[st.case.id]

    def case_route(self, st: State) -> dict[str, Any] | None:
        """Lowest pressures of the discharge line and of the suction line in one case, as
        steps (the suction may run below atmospheric by design, but not to vapour)."""
        line = _line_nodes(self.model, st.profile["nodes"])
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

    # -- all cases -----------------------------------------------------------

    def envelope(
        self,
        states: dict[str, State],
        curve: CurvePoints | None,
        notes: list[str],
    ) -> dict[str, Any]:
        """Highest and lowest pressures over every case, ratings, high points and crest."""
        model = self.model
        design = states["C1"]
        nodes = [n for n in design.profile["nodes"] if "pressure_head" in n]
        out: dict[str, Any] = {"high_points": _high_points(design.profile["nodes"])}
        line = _line_nodes(model, design.profile["nodes"])
        if line:
            every = [
                (st, n) for st in states.values() for n in _line_nodes(model, st.profile["nodes"])
            ]
            low = min(every, key=lambda sn: sn[1]["pressure_head"])
            h_low = self.node_head(*low)
            out["min_pressure_head"] = _q(h_low)
            out["min_pressure_node"] = low[1]["name"]
            out["min_pressure_case"] = low[0].case.id
            crest = max(line, key=lambda n: n["elevation"])
            above = crest["elevation"] - design.case.destination_level.value
            if above > 0.0:
                # Full-pipe flow over the crest needs a positive head there in every case;
                # where it is negative the crest, not the destination, sets the lift.
                below = [st.case.id for st in states.values() if _head_at(st, crest["name"]) < 0.0]
                out["crest"] = {
                    "node": crest["name"],
                    "elevation": quantity(crest["elevation"], "m"),
                    "above_destination": quantity(above, "m"),
                    "controls_flow": bool(below),
                    "cases_below_atmospheric": below,
                }
                if below:
                    notes.append(
                        f"The crest at {crest['name']} controls the flow in case(s) "
                        f"{', '.join(below)}: its grade line falls below the pipe, so beyond it "
                        "the line runs part-full, or as a siphon only if primed and kept free of "
                        "air; the pump must lift to the crest, not to the destination."
                    )
        densest = max(states.values(), key=lambda st: st.liquid.density.value)
        H_max, basis = self._max_head(curve, notes)
        z_s = model.source.level_high or model.source.level
        p_s = design.surfaces[1]
        rho = densest.liquid.density

        def static(z: float, side: str) -> float:
            lift = H_max.value if H_max is not None and side == "discharge" else 0.0
            return float(route.static_pressure(p_s.value, rho.value, z_s.value, lift, z))

        pump_node = {"name": "pump discharge", "side": "discharge", "elevation": None}
        points: list[dict[str, Any]] = []
        for n in [pump_node, *nodes] if H_max is not None else nodes:
            z = model.pump.elevation.value if n is pump_node else n["elevation"]
            entry: dict[str, Any] = {"node": n["name"], "elevation": z}
            if H_max is not None or n["side"] == "suction":
                entry["static"] = static(z, n["side"])
            if n is not pump_node:
                entry["operating"] = max(
                    st.liquid.density.value * losses.G * _head_at(st, n["name"])
                    for st in states.values()
                )
                if self.rises:
                    sst = states[self.surge_case]
                    entry["surge"] = (
                        sst.liquid.density.value
                        * losses.G
                        * (_head_at(sst, n["name"]) + self.rises[n["pipe"]].value)
                    )
            candidates = {k: entry[k] for k in ("static", "surge", "operating") if k in entry}
            entry["basis"] = max(candidates, key=lambda k: candidates[k])
            entry["max"] = candidates[entry["basis"]]
            entry["ratings"] = self._ratings_at(n)
            points.append(entry)
        if not points:
            return out
        top = max(points, key=lambda p: p["max"])
        out["max_pressure"] = quantity(top["max"], "Pa")
        out["max_pressure_node"] = top["node"]
        out["max_pressure_basis"] = top["basis"]
        out["shutoff_basis"] = basis
        out["pressure_case"] = (
            "the highest curve head at the top speed (the curve's first point, which may be "
            "below the shutoff head), highest source level"
            if basis == "first curve point"
            else "shutoff at the top speed, highest source level"
            if H_max is not None
            else "the operating cases only, no pump curve being given"
        )

        recorded: dict[str, Given] = {}

        def record(point: dict[str, Any]) -> Given:
            if point["node"] not in recorded:
                recorded[point["node"]] = self._pressure_step(states, point, H_max, rho, z_s, p_s)
            return recorded[point["node"]]

        rated = [(p, item) for p in points for item in p["ratings"]]
        placed = {p.id for p in model.pipes if p.elevation_start and p.elevation_end}
        unplaced = [f"pipe {p.id}" for p in model.pipes if p.pressure_rating and p.id not in placed]
        unplaced += [c.id for c in model.components if c.at not in placed]
        if unplaced:
            notes.append(
                "Ratings not checked because their pipes have no elevations: "
                f"{', '.join(unplaced)}; give elevation_start and elevation_end."
            )
        if rated:
            gov, item = min(rated, key=lambda pi: pi[1]["rating"] - pi[0]["max"])
            out["rating_check"] = {
                "node": gov["node"],
                "item": item["item"],
                "rating": quantity(item["rating"], "Pa"),
                "pressure": _q(record(gov)),
                "basis": gov["basis"],
                "case": self.surge_case if gov["basis"] == "surge" else "all",
                "shutoff_known": basis == "shutoff",
                "unplaced": unplaced,
            }
        record(top)
        if H_max is not None and points[0]["basis"] == "static":
            record(points[0])  # the pump discharge at shutoff: the casing's pressure
        out["nodes"] = [self._node_entry(states, p, rho.value) for p in points]
        if not rated:
            notes.append(
                "No pressure rating is given (pipe pressure_rating, [[component]], "
                "pump.pressure_rating): the maximum pressures are reported but not checked."
            )
        return out

    def _node_entry(
        self, states: dict[str, State], p: dict[str, Any], rho: float
    ) -> dict[str, Any]:
        """One point of the route for the trace: pressures, and as grade-line elevations
        (elevation plus pressure head at the densest liquid) for the profile chart."""
        z = p["elevation"]
        design = states["C1"]
        node = _node(design, p["node"])
        first = self.first_discharge
        # The pump discharge stands where the first discharge pipe starts.
        at = node or (first and _node(design, f"{first.id} start")) or design.profile["nodes"][-1]
        entry: dict[str, Any] = {
            "node": p["node"],
            "distance": quantity(at["distance"], "m"),
            "elevation": quantity(z, "m"),
            "max_pressure": quantity(p["max"], "Pa"),
            "max_grade": quantity(z + p["max"] / (rho * losses.G), "m"),
            "basis": p["basis"],
        }
        if node is not None:
            low = _min_head(states, p["node"])
            entry["min_pressure_head"] = quantity(low, "m")
            entry["min_grade"] = quantity(z + low, "m")
            vapour = self._vapour.get("C1")
            if vapour is not None:
                entry["vapour_grade"] = quantity(z + vapour.value, "m")
            if self.rises and self.surge_case and node["side"] == "discharge":
                down = _head_at(states[self.surge_case], p["node"]) - self.rises[node["pipe"]].value
                # The liquid cannot fall below its vapour pressure: there the column parts.
                if vapour is not None and down <= vapour.value:
                    down, entry["column_separation"] = vapour.value, True
                entry["downsurge_grade"] = quantity(z + down, "m")
        if p["ratings"]:
            rating = min(i["rating"] for i in p["ratings"])
            entry["rating"] = quantity(rating, "Pa")
            entry["rating_grade"] = quantity(z + rating / (rho * losses.G), "m")
        return entry

    def _max_head(self, curve: CurvePoints | None, notes: list[str]) -> tuple[Given | None, str]:
        """Highest head of the pump(s) on the fastest curve: the shutoff head of a rising curve."""
        if curve is None:
            return None, "no pump curve"
        b, model = self.b, self.model
        H = b.step(
            "route.pump_max_head",
            "Highest head on the pump curve at the top speed",
            pump.curve_max_head,
            head=curve.head,
        )
        if model.pump.count.value > 1 and model.pump.arrangement == "series":
            H = b.step(
                "route.pumps_max_head",
                "Highest head of the pumps in series",
                pump.series_head,
                H1=H,
                n_run=model.pump.count,
            )
        if curve.flow[0].value > 0.0:
            notes.append(
                "The pump curve does not start at zero flow: the highest pressures use the "
                "highest head on the given points, and the true shutoff head may be higher."
            )
            return H, "first curve point"
        return H, "shutoff"

    def _ratings_at(self, node: dict[str, Any]) -> list[dict[str, Any]]:
        model = self.model
        if node["name"] == "pump discharge":
            rating = model.pump.pressure_rating
            return [{"item": "pump casing", "rating": rating.value}] if rating else []
        pipe: Pipe = self.pipes[node["pipe"]][1]
        found = []
        if model.pump.pressure_rating and pipe is self.first_discharge and node["end"] == "start":
            # The casing also sees what the first discharge pipe sees in operation and surge.
            found.append({"item": "pump casing", "rating": model.pump.pressure_rating.value})
        if pipe.pressure_rating:
            found.append({"item": f"pipe {pipe.id}", "rating": pipe.pressure_rating.value})
        for c in model.components:
            if c.at == pipe.id:
                label = f"{c.id}" + (f" ({c.note})" if c.note else "")
                found.append({"item": label, "rating": c.pressure_rating.value})
        return found

    def _pressure_step(
        self,
        states: dict[str, State],
        point: dict[str, Any],
        H_max: Given | None,
        rho: Given,
        z_s: Given,
        p_s: Given,
    ) -> Given:
        """The step of the highest pressure at one point, on the basis that governs it."""
        b, name = self.b, point["node"]
        node = _node(states["C1"], name)
        where = "route.pump_discharge" if node is None else f"route.{node['pipe']}.{node['end']}"
        if point["basis"] == "static":
            if node is None:
                z = self.model.pump.elevation
            else:
                pipe = self.pipes[node["pipe"]][1]
                z = pipe.elevation_start if node["end"] == "start" else pipe.elevation_end
            assert z is not None
            lift = H_max
            if lift is None or (node is not None and node["side"] == "suction"):
                lift = b.assume("No pump head is added upstream of the pump.", 0.0, "m")
            return b.step(
                f"{where}.max_static_pressure",
                f"Highest steady pressure at {name} (gauge), no flow",
                route.static_pressure,
                p_s=p_s,
                rho=rho,
                z_s=z_s,
                H_max=lift,
                z=z,
            )
        assert node is not None
        if point["basis"] == "surge":
            st = states[self.surge_case]
            h_up = b.step(
                st.case.sid(f"{where}.upsurge_head"),
                f"Pressure head at {name} during the upsurge",
                surge.transient_pressure_head,
                st.case.id,
                h=self.node_head(st, node),
                dH=self.rises[node["pipe"]],
                s=b.assume("An upsurge adds the head change (s = +1).", 1.0, ""),
            )
            return b.step(
                st.case.sid(f"{where}.upsurge_pressure"),
                f"Pressure at {name} during the upsurge (gauge)",
                route.head_to_pressure,
                st.case.id,
                rho=st.liquid.density,
                h=h_up,
            )
        st = max(states.values(), key=lambda s: s.liquid.density.value * _head_at(s, name))
        return b.step(
            st.case.sid(f"{where}.operating_pressure"),
            f"Operating pressure at {name} (gauge)",
            route.head_to_pressure,
            st.case.id,
            rho=st.liquid.density,
            h=self.node_head(st, node),
        )

    # -- surge ---------------------------------------------------------------

    def surge_screening(self, states: dict[str, State], notes: list[str]) -> dict[str, Any] | None:
        """Wave speed, period and head change of every pipe for the event in [surge]."""
        model, b = self.model, self.b
        event = model.surge
        if event is None:
            notes.append(
                "Surge is not screened: add a [surge] table (pump_trip or valve_closure) for a "
                "screening of the worst event; a rising main needs a surge assessment."
            )
            return None
        st = max(states.values(), key=lambda s: s.case.flow.value)
        case, sid = st.case, st.case.sid
        out: dict[str, Any] = {"event": event.event, "case": case.id}
        K = self._bulk_modulus(st)
        if K is None:
            notes.append(
                "Surge is not screened: the liquid's bulk modulus is not known; give "
                "fluid.bulk_modulus."
            )
            out["screened"] = False
            out["verdict"] = "not screened: give fluid.bulk_modulus"
            return out
        out["bulk_modulus"] = _q(K)
        pipes: dict[str, dict[str, Any]] = {}
        speeds: dict[str, Given] = {}
        rises: dict[str, Given] = {}
        for pipe in model.pipes:
            a = self._wave_speed(st, pipe, K)
            T = b.step(
                sid(f"surge.{pipe.id}.period"),
                f"Pipe period of {pipe.id}",
                surge.pipe_period,
                case.id,
                L=pipe.length,
                a=a,
            )
            dH = b.step(
                sid(f"surge.{pipe.id}.joukowsky_head"),
                f"Joukowsky head change in {pipe.id} (flow stopped at once)",
                surge.joukowsky_head,
                case.id,
                a=a,
                dv=st.h["pipes"][pipe.id]["velocity"],
            )
            speeds[pipe.id], rises[pipe.id] = a, dH
            pipes[pipe.id] = {"wave_speed": _q(a), "period": _q(T), "joukowsky_head": _q(dH)}
        line = [p for p in model.pipes if p.line == "discharge"] or list(model.pipes)
        T_line = b.step(
            sid("surge.line_period"),
            "Period of the pumped line (pump to destination)",
            surge.line_period,
            case.id,
            L=[p.length for p in line],
            a=[speeds[p.id] for p in line],
        )
        out["line_period"] = _q(T_line)
        if event.event == "valve_closure":
            assert event.closure_time is not None
            out["closure_time"] = _q(event.closure_time)
            if event.closure_time.value > T_line.value:
                for pipe in model.pipes:
                    rises[pipe.id] = b.step(
                        sid(f"surge.{pipe.id}.head_change"),
                        f"Head rise in {pipe.id} for the closure in {event.closure_time.value:g} s",
                        surge.slow_closure_head,
                        case.id,
                        dH_J=rises[pipe.id],
                        T_r=T_line,
                        t_c=event.closure_time,
                    )
        for pipe in model.pipes:
            pipes[pipe.id]["head_change"] = _q(rises[pipe.id])
        governing = max(model.pipes, key=lambda p: rises[p.id].value)
        out.update(
            pipes=pipes,
            governing_pipe=governing.id,
            wave_speed=_q(speeds[governing.id]),
            period=pipes[governing.id]["period"],
            head_rise=_q(rises[governing.id]),
        )
        self.rises, self.surge_case = rises, case.id
        if event.event == "pump_trip":
            line_nodes = _line_nodes(model, st.profile["nodes"])
            if line_nodes:
                low = min(line_nodes, key=lambda n: n["pressure_head"] - rises[n["pipe"]].value)
                where = f"route.{low['pipe']}.{low['end']}"
                h_down = b.step(
                    sid(f"{where}.downsurge_head"),
                    f"Pressure head at {low['name']} during the downsurge",
                    surge.transient_pressure_head,
                    case.id,
                    h=self.node_head(st, low),
                    dH=rises[low["pipe"]],
                    s=b.assume("A downsurge takes the head change away (s = −1).", -1.0, ""),
                )
                out["min_transient_pressure_head"] = _q(h_down)
                out["min_transient_node"] = low["name"]
                out["vapour_head"] = _q(self.vapour_head(st))
        out["verdict"] = _verdict(out, model.project.units)
        return out

    def _bulk_modulus(self, st: State) -> Given | None:
        fluid, b, case = self.model.fluid, self.b, st.case
        if fluid.bulk_modulus is not None:
            return fluid.bulk_modulus
        if fluid.kind != "water":
            return None
        p = b.step(
            case.sid("surge.pressure"),
            "Absolute pressure of the liquid for its bulk modulus (source surface)",
            head.absolute_pressure,
            case.id,
            p_baro=st.surfaces[0],
            p_g=st.surfaces[1],
        )
        return b.step(
            case.sid("surge.bulk_modulus"),
            "Bulk modulus of water (isentropic)",
            water.bulk_modulus,
            case.id,
            T=case.temperature or self.model.fluid.temperature,
            p=p,
        )

    def _wave_speed(self, st: State, pipe: Pipe, K: Given) -> Given:
        b, case = self.b, st.case
        sid = case.sid
        if pipe.elastic_modulus is None or pipe.wall_thickness is None:
            b.assume(
                "A pipe without a known wall thickness and modulus is taken as rigid: the "
                "highest possible wave speed and head change."
            )
            return b.step(
                sid(f"surge.{pipe.id}.wave_speed"),
                f"Wave speed in {pipe.id} (rigid pipe)",
                surge.rigid_wave_speed,
                case.id,
                K=K,
                rho=st.liquid.density,
            )
        if pipe.restraint in ("anchored", "upstream_anchor"):
            assert pipe.poisson_ratio is not None
            law = (
                surge.anchored_restraint_factor
                if pipe.restraint == "anchored"
                else surge.upstream_anchor_restraint_factor
            )
            c1 = b.step(
                sid(f"surge.{pipe.id}.restraint_factor"),
                f"Restraint factor of {pipe.id} ({pipe.restraint.replace('_', ' ')})",
                law,
                case.id,
                nu=pipe.poisson_ratio,
            )
        elif pipe.restraint == "expansion_joints":
            c1 = b.assume(
                "A pipe with expansion joints throughout has the restraint factor c1 = 1.", 1.0, ""
            )
        else:
            c1 = b.assume(
                "Pipe restraint not given: c1 = 1 (expansion joints throughout, the simple "
                "Korteweg form); a pipe anchored throughout has a few per cent higher wave speed.",
                1.0,
                "",
            )
        return b.step(
            sid(f"surge.{pipe.id}.wave_speed"),
            f"Wave speed in {pipe.id} (Korteweg)",
            surge.wave_speed,
            case.id,
            K=K,
            rho=st.liquid.density,
            D=pipe.inner_diameter,
            E=pipe.elastic_modulus,
            e=pipe.wall_thickness,
            c1=c1,
        )


def _node(st: State, name: str) -> dict[str, Any] | None:
    return st.pipe_nodes.get(name)


def _head_at(st: State, name: str) -> float:
    node = _node(st, name)
    assert node is not None and "pressure_head" in node
    return float(node["pressure_head"])


def _min_head(states: dict[str, State], name: str) -> float:
    return min(_head_at(st, name) for st in states.values())


def _high_points(nodes: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """Local summits of each side's centreline (air-valve candidates), ends excluded."""
    found = []
    for side in ("suction", "discharge"):
        points: list[dict[str, Any]] = []
        for n in nodes:
            if n.get("side") != side or n.get("elevation") is None:
                continue
            if points and points[-1]["distance"] == n["distance"]:
                if n["elevation"] > points[-1]["elevation"]:
                    points[-1] = n
                continue
            points.append(n)
        for i in range(1, len(points) - 1):
            z = points[i]["elevation"]
            before = points[i - 1]["elevation"]
            after = next((p["elevation"] for p in points[i + 1 :] if p["elevation"] != z), None)
            if z > before and after is not None and z > after:
                found.append(
                    {
                        "node": points[i]["name"],
                        "side": side,
                        "distance": quantity(points[i]["distance"], "m"),
                        "elevation": quantity(z, "m"),
                    }
                )
    return found


def _verdict(out: dict[str, Any], system: str) -> str:
    """One sentence: what the screening found and what it asks for (heads in ``system``'s
    units)."""
    from calcreport.units import show

    def m(value: float) -> str:
        return show({"value": value, "unit": "m"}, "length", system)

    rise = out["head_rise"]["value"]
    pipe = out["governing_pipe"]
    if out["event"] == "valve_closure":
        t_c, T = out["closure_time"]["value"], out["line_period"]["value"]
        if t_c <= T:
            return (
                f"Valve closure in {t_c:g} s is within the line period {T:.3g} s: the full "
                f"Joukowsky rise of {m(rise)} applies (pipe {pipe}). A detailed transient "
                "analysis is required."
            )
        return (
            f"Valve closure in {t_c:g} s is slower than the line period {T:.3g} s: an "
            f"estimated rise of {m(rise)} (pipe {pipe}). The estimate assumes a linear "
            "effective closure; confirm with the valve's characteristic."
        )
    if "min_transient_pressure_head" not in out:
        return (
            f"Pump trip: a head change of up to {m(rise)} (pipe {pipe}); the downsurge is "
            "not set against the route (no pipe elevations given)."
        )
    h = out["min_transient_pressure_head"]["value"]
    node = out["min_transient_node"]
    if h <= out["vapour_head"]["value"]:
        return (
            f"Pump trip: the downsurge of up to {m(rise)} takes {node} to vapour pressure: "
            "column separation is likely. A detailed transient analysis and surge protection "
            "are required."
        )
    if h < 0.0:
        return (
            f"Pump trip: the downsurge takes {node} below atmospheric pressure "
            f"({m(h)} gauge): air valves would admit air. A detailed transient analysis "
            "is required."
        )
    return (
        f"Pump trip: the downsurge of up to {m(rise)} keeps every pipe end above "
        f"atmospheric pressure (lowest {m(h)} gauge at {node}). Screening passes; it "
        "neglects pump inertia, friction and reflections."
    )
