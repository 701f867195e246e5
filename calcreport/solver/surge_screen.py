"""Surge screening of every pumped line: a pump trip always, plus the event the input names,
over every operating state (Joukowsky head change of the line's pipes in series with the
Korteweg wave speed; Michaud's estimate where the event is slower than the pipe period).

:class:`SurgeScreening` is the part of :class:`~calcreport.solver.route_pressure.Route`
that screens; the route's pressures take its head changes as upsurge and downsurge.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from calcreport.model.schema import Given, Model, Pipe, Surge
from calcreport.physics import head, surge, water
from calcreport.solver.states import Notes
from calcreport.trace import TraceBuilder
from calcreport.trace import bound as _q  # a result naming its source

if TYPE_CHECKING:
    from calcreport.solver.route_pressure import State

__all__ = ["SurgeScreening", "line_nodes"]


def line_nodes(model: Model, nodes: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """Points of the pressurised (discharge) line with an elevation, outlet excluded:
    the outlet's pressure is the destination's, not the line's."""
    last = model.pipes[-1]
    return [
        n
        for n in nodes
        if n.get("side") == "discharge"
        and "pressure_head" in n
        and not n.get("part_full")
        and not (n["pipe"] == last.id and n["station"] != "flange" and n["x"] >= last.length.value)
    ]


class SurgeScreening:
    """Surge screening steps of one solve (mixed into the route, whose node heads it reads)."""

    b: TraceBuilder
    model: Model
    rises: dict[tuple[str, str], dict[str, Given]]
    downsurge: str
    _restraint: dict[tuple[str, str], Given]

    def surge_screening(self, states: dict[str, State], notes: Notes) -> dict[str, Any] | None:
        """Every credible event screened over every state: a pump trip always (power can
        fail on any pumped line), and the event that [surge] names.

        The line (pump to destination) is screened as the pipes in series it is: its head
        change is that of the equivalent pipe, and a pipe whose own period is short
        against the event does not set it by its own a·v/g. The suction pipes form their
        own line. The result holds each event; its verdict is the worst.
        """
        model, b = self.model, self.b
        stop = model.surge.pump_stop_time if model.surge else None
        events = [Surge("pump_trip", stop, stop)]
        if model.surge is not None and model.surge.event != "pump_trip":
            events.append(model.surge)
        elif model.surge is None:
            b.assume(
                "A pump trip (power failure) is screened on every pumped line, whether or not "
                "the input names a surge event."
            )
        base = max(states.values(), key=lambda s: s.case.flow.value)
        case, sid = base.case, base.case.sid
        K = self._bulk_modulus(base)
        if K is None:
            notes.append(
                "Surge is not screened: the liquid's bulk modulus is not known; give "
                "fluid.bulk_modulus."
            )
            return {
                "event": events[-1].event,
                "case": case.id,
                "screened": False,
                "verdict": "not screened: give fluid.bulk_modulus",
                "events": {},
            }
        pipes: dict[str, dict[str, Any]] = {}
        speeds: dict[str, Given] = {}
        periods: dict[str, Given] = {}
        for pipe in model.pipes:
            a = self._wave_speed(base, pipe, K)
            periods[pipe.id] = b.step(
                sid(f"surge.{pipe.id}.period"),
                f"Pipe period of {pipe.id}",
                surge.pipe_period,
                case.id,
                L=pipe.length,
                a=a,
            )
            own = b.step(
                sid(f"surge.{pipe.id}.joukowsky_head"),
                f"Joukowsky head change in {pipe.id} alone (its flow stopped at once)",
                surge.joukowsky_head,
                case.id,
                a=a,
                dv=base.h["pipes"][pipe.id]["velocity"],
            )
            speeds[pipe.id] = a
            pipes[pipe.id] = {
                "wave_speed": _q(a),
                "period": _q(periods[pipe.id]),
                "joukowsky_head": _q(own),
            }
        line = [p for p in model.pipes if p.line == "discharge"] or list(model.pipes)
        suction = [p for p in model.suction_pipes if p not in line]
        # Each part of the system in series, with its period: the line, the suction pipes.
        spans = {
            part: (
                pipes,
                b.step(
                    sid(f"surge.{key}"),
                    title,
                    surge.line_period,
                    case.id,
                    L=[p.length for p in pipes],
                    a=[speeds[p.id] for p in pipes],
                ),
            )
            for part, pipes, key, title in (
                ("line", line, "line_period", "Period of the pumped line (pump to destination)"),
                (
                    "suction",
                    suction,
                    "suction_period",
                    "Period of the suction pipes (source to pump)",
                ),
            )
            if pipes
        }
        T_line = spans["line"][1]
        # The pipe that holds most of the line's travel time: its impedance governs.
        governing = max(line, key=lambda p: p.length.value / speeds[p.id].value)
        screened = {
            event.event: self._screen_event(event, states, speeds, periods, spans)
            for event in events
        }
        for ev in screened.values():
            ev["governing_pipe"] = governing.id
            ev["verdict"] = _verdict(ev, model.project.units)
            rises = self.rises[(ev["event"], ev["case"])]
            ev["pipes"] = {p.id: {"head_change": _q(rises[p.id])} for p in model.pipes}
        worst = min(screened.values(), key=_severity)
        key = (worst["event"], worst["case"])
        for pipe in model.pipes:
            pipes[pipe.id]["head_change"] = _q(self.rises[key][pipe.id])
        out: dict[str, Any] = {
            **{k: v for k, v in worst.items() if k != "pipes"},
            "bulk_modulus": _q(K),
            "line_period": _q(T_line),
            "wave_speed": _q(speeds[governing.id]),
            "period": pipes[governing.id]["period"],
            "pipes": pipes,
            "events": screened,
            "method": "pipes in series as one line (equivalent pipe of the same travel time and "
            "inertia); Joukowsky for a change within the line period, Michaud's estimate for a "
            "slower valve closure",
        }
        if len(screened) > 1:
            out["verdict"] = " ".join(ev["verdict"] for ev in screened.values())
        return out

    def _screen_event(
        self,
        event: Surge,
        states: dict[str, State],
        speeds: dict[str, Given],
        periods: dict[str, Given],
        spans: dict[str, tuple[list[Pipe], Given]],
    ) -> dict[str, Any]:
        """One event in every state: the head change of the line and of the suction pipes,
        each pipe's rise kept in ``self.rises`` by (event, state); the downsurge of a trip.

        Each part (the line, the suction pipes) takes its full series change when the event
        is within its period, Michaud's estimate when slower; a trip with no stop time stops
        the flow within the line's period, so the suction pipes see it as slow.
        """
        b = self.b
        name = event.event
        line, T_line = spans["line"]
        out: dict[str, Any] = {"event": name, "line_period": _q(T_line)}
        # A trip stops the flow in pump_stop_time (the screened event's closure_time here).
        if name == "pump_trip" and event.closure_time is None:
            b.assume(
                "Pump trip: with no surge.pump_stop_time the pump's flow is taken to stop "
                "within the line's period 2·Σ(L/a) (the upper bound), so the head change is "
                "that of the line's pipes in series; a pipe whose own period is shorter does "
                "not set it by its own a·v/g."
            )
        duration = event.closure_time or T_line
        slow = duration.value > T_line.value
        if event.closure_time is not None:
            out["closure_time"] = _q(event.closure_time)
        tag = name.replace("_", "")
        for st in states.values():
            sid, cid, h = st.case.sid, st.case.id, st.h
            rises: dict[str, Given] = {}
            for part, (pipes, period) in spans.items():
                label = "pumped line" if part == "line" else "suction pipes"
                dH = b.step(
                    sid(f"surge.{tag}.{part}_head"),
                    f"Head change of the {label} in series ({name.replace('_', ' ')})",
                    surge.series_joukowsky_head,
                    cid,
                    L=[p.length for p in pipes],
                    v=[h["pipes"][p.id]["velocity"] for p in pipes],
                    a=[speeds[p.id] for p in pipes],
                )
                if duration.value > period.value:
                    how = "closure" if name == "valve_closure" else "stop"
                    dH = b.step(
                        sid(f"surge.{tag}.{part}_head_change"),
                        f"Head change of the {label} for a {how} in {duration.value:.4g} s",
                        surge.slow_closure_head,
                        cid,
                        dH_J=dH,
                        T_r=period,
                        t_c=duration,
                    )
                for p in pipes:
                    rises[p.id] = dH
            if event.closure_time is not None and not slow:
                # A change within a pipe's own period gives that pipe its own a·v/g.
                for p in line:
                    if event.closure_time.value <= periods[p.id].value:
                        own = b.step(
                            sid(f"surge.{tag}.{p.id}.own_head"),
                            f"Joukowsky head change in {p.id} (closure within its period)",
                            surge.joukowsky_head,
                            cid,
                            a=speeds[p.id],
                            dv=h["pipes"][p.id]["velocity"],
                        )
                        if own.value > rises[p.id].value:
                            rises[p.id] = own
            self.rises[(name, cid)] = rises
        largest = max(states.values(), key=lambda st: self._line_rise(name, st, line))
        out["case"] = largest.case.id
        out["head_rise"] = _q(self._line_rise_given(name, largest, line))
        if name == "pump_trip":
            low = [
                (st, n)
                for st in states.values()
                for n in line_nodes(self.model, st.profile["nodes"])
            ]
            if low:
                st, node = min(
                    low,
                    key=lambda sn: (
                        sn[1]["pressure_head"]
                        - self.rises[(name, sn[0].case.id)][sn[1]["pipe"]].value
                    ),
                )
                h_down = b.step(
                    st.case.sid(f"{self._where(node)}.downsurge_head"),
                    f"Pressure head at {node['name']} during the downsurge",
                    surge.transient_pressure_head,
                    st.case.id,
                    h=self.node_head(st, node),
                    dH=self.rises[(name, st.case.id)][node["pipe"]],
                    s=b.assume("A downsurge takes the head change away (s = −1).", -1.0, ""),
                )
                self.downsurge = st.case.id
                out.update(
                    case=st.case.id,
                    head_rise=_q(self.rises[(name, st.case.id)][node["pipe"]]),
                    min_transient_pressure_head=_q(h_down),
                    min_transient_node=node["name"],
                    vapour_head=_q(self.vapour_head(st)),
                )
        return out

    def _line_rise_given(self, event: str, st: State, line: list[Pipe]) -> Given:
        rises = self.rises[(event, st.case.id)]
        return max((rises[p.id] for p in line), key=lambda g: g.value)

    def _line_rise(self, event: str, st: State, line: list[Pipe]) -> float:
        return float(self._line_rise_given(event, st, line).value)

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
            p_baro=st.surfaces.barometric,
            p_g=st.surfaces.source,
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
            # For 0 ≤ ν ≤ 0.5, 1 − ν/2 is the smallest of the three factors: the highest
            # wave speed, the screening's safe side. Without ν its bound 0.5 is taken.
            nu = pipe.poisson_ratio or b.assume(
                "A wall without a known Poisson's ratio takes its upper bound, 0.5, in the "
                "restraint factor (the lowest factor, the highest wave speed).",
                0.5,
                "",
            )
            b.assume(
                "Pipe restraint not given: the restraint factor that gives the highest wave "
                "speed, c1 = 1 − ν/2 (anchored at its upstream end only), is taken for the "
                "screening; give restraint to use the pipe's own."
            )
            # One step for each Poisson's ratio: pipes of one wall material share it.
            known = self._restraint.get((case.id, nu.key))
            c1 = known or b.step(
                sid(f"surge.{pipe.id}.restraint_factor"),
                f"Restraint factor where the restraint is not given (ν of {pipe.id}: the "
                "highest wave speed)",
                surge.upstream_anchor_restraint_factor,
                case.id,
                nu=nu,
            )
            self._restraint[(case.id, nu.key)] = c1
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


def _severity(out: dict[str, Any]) -> tuple[int, float]:
    """How bad a screened event is: column separation, then a trip of the screening
    (sub-atmospheric, a closure within the period, no route to set it against), then a
    pass; between equals the larger head change."""
    rise = -float(out["head_rise"]["value"])
    if "min_transient_pressure_head" in out:
        h = out["min_transient_pressure_head"]["value"]
        if h <= out["vapour_head"]["value"]:
            return 0, rise
        return (1 if h < 0.0 else 2), rise
    if out["event"] == "valve_closure":
        return (1 if out["closure_time"]["value"] <= out["line_period"]["value"] else 2), rise
    return 1, rise


def _verdict(out: dict[str, Any], system: str) -> str:
    """One sentence: what the screening found and what it asks for (heads in ``system``'s
    units)."""
    from calcreport.units import show

    def m(value: float) -> str:
        return show({"value": value, "unit": "m"}, "length", system)

    rise = out["head_rise"]["value"]
    pipe = f"the line, governed by pipe {out['governing_pipe']}"
    if out["event"] == "valve_closure":
        t_c, T = out["closure_time"]["value"], out["line_period"]["value"]
        if t_c <= T:
            return (
                f"Valve closure in {t_c:g} s is within the line period {T:.3g} s: the full "
                f"Joukowsky rise of {m(rise)} applies ({pipe}). A detailed transient "
                "analysis is required."
            )
        return (
            f"Valve closure in {t_c:g} s is slower than the line period {T:.3g} s: an "
            f"estimated rise of {m(rise)} ({pipe}). The estimate assumes a linear "
            "effective closure; confirm with the valve's characteristic."
        )
    trip = (
        f"Pump trip (flow stopped in {out['closure_time']['value']:g} s)"
        if "closure_time" in out
        else "Pump trip (flow stopped at once)"
    )
    if "min_transient_pressure_head" not in out:
        return (
            f"{trip}: a head change of up to {m(rise)} ({pipe}); the downsurge is "
            "not set against the route (no pipe elevations given)."
        )
    h = out["min_transient_pressure_head"]["value"]
    node = out["min_transient_node"]
    if h <= out["vapour_head"]["value"]:
        return (
            f"{trip}: the downsurge of up to {m(rise)} ({pipe}) takes {node} to vapour "
            "pressure: "
            "column separation is likely. A detailed transient analysis and surge protection "
            "are required."
        )
    if h < 0.0:
        return (
            f"{trip}: the downsurge takes {node} below atmospheric pressure "
            f"({m(h)} gauge): air valves would admit air. A detailed transient analysis "
            "is required."
        )
    return (
        f"{trip}: the downsurge of up to {m(rise)} keeps every pipe end above "
        f"atmospheric pressure (lowest {m(h)} gauge at {node}). Screening passes; it "
        "neglects friction and reflections"
        + ("." if "closure_time" in out else ", and the pump's inertia (the upper bound).")
    )
