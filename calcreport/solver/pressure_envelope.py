"""The highest pressure at every point of the route over every state: the pump at its highest
head against a closed line, each state's operating pressure and the upsurge of every screened
event, set against the ratings of the pipes, the listed components and the pump casing.

:class:`PressureEnvelope` is the part of :class:`~calcreport.solver.route_pressure.Route`
that finds them; the functions below read a node's head across states.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from calcreport.model.schema import Given, Model, Pipe
from calcreport.physics import head, losses, pump, route, surge
from calcreport.solver.states import DISCHARGE_FLANGE, SUCTION_FLANGE, CurvePoints, Notes
from calcreport.solver.surge_screen import line_nodes
from calcreport.trace import DESIGN_CASE, TraceBuilder, quantity
from calcreport.trace import bound as _q  # a result naming its source

if TYPE_CHECKING:
    from calcreport.solver.route_pressure import State

__all__ = ["PressureEnvelope"]


class PressureEnvelope:
    """Highest-pressure steps of one solve (mixed into the route, whose node heads it reads)."""

    b: TraceBuilder
    model: Model
    rises: dict[tuple[str, str], dict[str, Given]]
    downsurge: str

    def envelope(
        self,
        states: dict[str, State],
        curve: CurvePoints | None,
        notes: Notes,
    ) -> dict[str, Any]:
        """Highest and lowest pressures over every state, ratings, high points and crest."""
        model = self.model
        design = states[DESIGN_CASE]
        nodes = [n for n in design.profile["nodes"] if "pressure_head" in n]
        out: dict[str, Any] = {"high_points": _high_points(design.profile["nodes"])}
        line = line_nodes(model, design.profile["nodes"])
        if line:
            every = [
                (st, n) for st in states.values() for n in line_nodes(model, st.profile["nodes"])
            ]
            low = min(every, key=lambda sn: sn[1]["pressure_head"])
            h_low = self.node_head(*low)
            out["min_pressure_head"] = _q(h_low)
            out["min_pressure_node"] = low[1]["name"]
            out["min_pressure_case"] = low[0].case.id
            crest = max(line, key=lambda n: n["elevation"])
            if crest["elevation"] > design.case.destination_level.value:
                above = self.b.step(
                    "route.crest.above_destination",
                    f"Height of the crest at {crest['name']} above the destination surface",
                    head.static_head,
                    z_d=self.elevation(crest),
                    z_s=design.case.destination_level,
                ).value
                # Full-pipe flow over the crest needs a positive head there in every state;
                # where it is negative the crest, not the destination, sets the lift.
                below = [
                    st.case.id
                    for st in states.values()
                    if st.case.crest is None and _head_at(st, crest["name"]) < 0.0
                ]
                out["crest"] = {
                    "node": crest["name"],
                    "elevation": quantity(crest["elevation"], "m"),
                    "above_destination": quantity(above, "m"),
                    "controls_flow": bool(below),
                    "cases_below_atmospheric": below,
                }
                if below:
                    notes.append(
                        f"The crest at {crest['name']} controls the flow in state(s) "
                        f"{', '.join(below)}: its grade line falls below the pipe, so beyond it "
                        "the line runs part-full, or as a siphon only if primed and kept free of "
                        "air; the pump must lift to the crest, not to the destination: state(s) "
                        f"{', '.join(f'{c}x' for c in below)} solve it so, and the energy of a "
                        "duty-profile point is theirs."
                    )
        densest = max(states.values(), key=lambda st: st.liquid.density.value)
        H_max, basis = self._max_head(curve, notes)
        z_s = model.source.level_high or model.source.level
        p_s = design.surfaces.source
        rho = densest.liquid.density

        def static(z: float, side: str) -> float:
            lift = H_max.value if H_max is not None and side == "discharge" else 0.0
            return float(route.static_pressure(p_s.value, rho.value, z_s.value, lift, z))

        points: list[dict[str, Any]] = []
        for n in nodes:
            entry: dict[str, Any] = {"node": n["name"], "elevation": n["elevation"]}
            if H_max is not None or n["side"] == "suction":
                entry["static"] = static(n["elevation"], n["side"])
            entry["operating"] = max(
                st.liquid.density.value * losses.G * _head_at(st, n["name"])
                for st in states.values()
            )
            if self.rises:
                key = max(self.rises, key=lambda k: self._upsurge(states, k, n))
                entry["surge"], entry["surge_key"] = self._upsurge(states, key, n), key
            candidates = {k: entry[k] for k in ("static", "surge", "operating") if k in entry}
            entry["basis"] = max(candidates, key=lambda k: candidates[k])
            entry["max"] = candidates[entry["basis"]]
            entry["ratings"] = self._ratings_at(n)
            points.append(entry)
        if not points:
            return out
        top = max(points, key=lambda p: p["max"])
        out["max_pressure_node"] = top["node"]
        out["max_pressure_basis"] = top["basis"]
        out["shutoff_basis"] = basis
        out["pressure_case"] = (
            "the highest curve head at the top speed (the curve's first point, which may be "
            "below the shutoff head), highest source level"
            if basis == "first curve point"
            else "shutoff at the top speed, highest source level"
            if H_max is not None
            else "the operating states only, no pump curve being given"
        )

        recorded: dict[str, Given] = {}

        def record(point: dict[str, Any]) -> Given:
            if point["node"] not in recorded:
                recorded[point["node"]] = self._pressure_step(states, point, H_max, rho, z_s, p_s)
            return recorded[point["node"]]

        placed = {p.id for p in model.pipes if p.elevation_start and p.elevation_end}
        unplaced: list[dict[str, Any]] = [
            {"id": f"pipe.{p.id}", "item": f"pipe {p.id}", "at": p.id, "rating": p.pressure_rating}
            for p in model.pipes
            if p.pressure_rating and p.id not in placed
        ] + [
            {"id": c.id, "item": c.id, "at": c.at, "rating": c.pressure_rating}
            for c in model.components
            if c.at not in placed
        ]
        if unplaced:
            notes.append(
                "Ratings not checked because their pipes have no elevations: "
                f"{', '.join(u['item'] for u in unplaced)}; give elevation_start and "
                "elevation_end."
            )
        # Each rated item at the point where its pressure comes closest to its rating.
        worst: dict[str, tuple[dict[str, Any], dict[str, Any]]] = {}
        for p in points:
            for item in p["ratings"]:
                held = worst.get(item["id"])
                if held is None or item["rating"] - p["max"] < held[1]["rating"] - held[0]["max"]:
                    worst[item["id"]] = (p, item)
        ratings = []
        for point, item in worst.values():
            ratings.append(
                {
                    "id": item["id"],
                    "item": item["item"],
                    "node": point["node"],
                    "rating": quantity(item["rating"], "Pa"),
                    "pressure": _q(record(point)),
                    "basis": point["basis"],
                    "case": self._basis_state(states, point),
                    "shutoff_known": basis == "shutoff",
                }
            )
        ratings += [
            {
                "id": u["id"],
                "item": u["item"],
                "node": "",
                "rating": _q(u["rating"]),
                "basis": "not placed",
                "case": "all",
                "pipe": u["at"],
            }
            for u in unplaced
        ]
        if ratings:
            out["ratings"] = ratings
            checked = [r for r in ratings if "pressure" in r]
            if checked:
                out["rating_check"] = min(
                    checked, key=lambda r: r["rating"]["value"] - r["pressure"]["value"]
                )
        out["max_pressure"] = _q(record(top))
        flange = next((p for p in points if p["node"] == DISCHARGE_FLANGE), None)
        if H_max is not None and flange is not None and flange["basis"] == "static":
            record(flange)  # the pump discharge at shutoff: the casing's pressure
        out["nodes"] = [self._node_entry(states, p, rho.value) for p in points]
        if not ratings:
            notes.append(
                "No pressure rating is given (pipe pressure_rating, [[component]], "
                "pump.pressure_rating): the maximum pressures are reported but not checked."
            )
        return out

    def _upsurge(
        self, states: dict[str, State], key: tuple[str, str], node: dict[str, Any]
    ) -> float:
        """The pressure at ``node`` when the upsurge of (event, state) ``key`` passes it."""
        st = states[key[1]]
        rise = self.rises[key][node["pipe"]].value
        return float(st.liquid.density.value * losses.G * (_head_at(st, node["name"]) + rise))

    def _basis_state(self, states: dict[str, State], point: dict[str, Any]) -> str:
        """The state that sets a point's highest pressure ("all" for the no-flow static)."""
        if point["basis"] == "surge":
            return str(point["surge_key"][1])
        if point["basis"] == "operating":
            return self._operating_state(states, point["node"]).case.id
        return "all"

    @staticmethod
    def _operating_state(states: dict[str, State], name: str) -> State:
        return max(states.values(), key=lambda s: s.liquid.density.value * _head_at(s, name))

    def _node_entry(
        self, states: dict[str, State], p: dict[str, Any], rho: float
    ) -> dict[str, Any]:
        """One point of the route for the trace: pressures, and as grade-line elevations
        (elevation plus pressure head at the densest liquid) for the profile chart."""
        z = p["elevation"]
        design = states[DESIGN_CASE]
        node = _node(design, p["node"])
        assert node is not None
        entry: dict[str, Any] = {
            "node": p["node"],
            "station": node["station"],
            "distance": quantity(node["distance"], "m"),
            "elevation": quantity(z, "m"),
            "max_pressure": quantity(p["max"], "Pa"),
            "max_grade": quantity(z + p["max"] / (rho * losses.G), "m"),
            "basis": p["basis"],
        }
        low = _min_head(states, p["node"])
        entry["min_pressure_head"] = quantity(low, "m")
        entry["min_grade"] = quantity(z + low, "m")
        vapour = self._vapour.get(DESIGN_CASE)
        if vapour is not None:
            entry["vapour_grade"] = quantity(z + vapour.value, "m")
        if self.downsurge and node["side"] == "discharge":
            rise = self.rises[("pump_trip", self.downsurge)][node["pipe"]].value
            down = _head_at(states[self.downsurge], p["node"]) - rise
            # The liquid cannot fall below its vapour pressure: there the column parts.
            if vapour is not None and down <= vapour.value:
                down, entry["column_separation"] = vapour.value, True
            entry["downsurge_grade"] = quantity(z + down, "m")
        if p["ratings"]:
            rating = min(i["rating"] for i in p["ratings"])
            entry["rating"] = quantity(rating, "Pa")
            entry["rating_grade"] = quantity(z + rating / (rho * losses.G), "m")
        return entry

    def _max_head(self, curve: CurvePoints | None, notes: Notes) -> tuple[Given | None, str]:
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
        """The rated items that see a node's pressure: its pipe and the components on it,
        and at the discharge flange the pump casing (the first discharge pipe starts there)."""
        model = self.model
        pipe: Pipe = self.pipes[node["pipe"]][1]
        found = []
        if model.pump.pressure_rating and node["name"] == DISCHARGE_FLANGE:
            found.append(
                {"id": "casing", "item": "pump casing", "rating": model.pump.pressure_rating.value}
            )
        if node["name"] == SUCTION_FLANGE:
            return found  # the pump's suction nozzle: the casing is rated for its discharge
        if pipe.pressure_rating:
            found.append(
                {
                    "id": f"pipe.{pipe.id}",
                    "item": f"pipe {pipe.id}",
                    "rating": pipe.pressure_rating.value,
                }
            )
        for c in model.components:
            if c.at == pipe.id:
                label = f"{c.id}" + (f" ({c.note})" if c.note else "")
                found.append({"id": c.id, "item": label, "rating": c.pressure_rating.value})
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
        node = _node(states[DESIGN_CASE], name)
        assert node is not None
        where = self._where(node)
        if point["basis"] == "static":
            lift = H_max
            if lift is None or node["side"] == "suction":
                lift = b.assume("No pump head is added upstream of the pump.", 0.0, "m")
            return b.step(
                f"{where}.max_static_pressure",
                f"Highest steady pressure at {name} (gauge), no flow",
                route.static_pressure,
                p_s=p_s,
                rho=rho,
                z_s=z_s,
                H_max=lift,
                z=self.elevation(node),
            )
        if point["basis"] == "surge":
            event, state = point["surge_key"]
            st = states[state]
            h_up = b.step(
                st.case.sid(f"{where}.upsurge_head"),
                f"Pressure head at {name} during the upsurge ({event.replace('_', ' ')})",
                surge.transient_pressure_head,
                st.case.id,
                h=self.node_head(st, node),
                dH=self.rises[point["surge_key"]][node["pipe"]],
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
        st = self._operating_state(states, name)
        return b.step(
            st.case.sid(f"{where}.operating_pressure"),
            f"Operating pressure at {name} (gauge)",
            route.head_to_pressure,
            st.case.id,
            rho=st.liquid.density,
            h=self.node_head(st, node),
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
