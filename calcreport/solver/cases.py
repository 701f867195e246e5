"""The operating cases: the design case and every case the input's ranges and envelope call
for (levels, temperatures, aged pipe, speeds, pumps running), each with its own liquid.
"""

from __future__ import annotations

from dataclasses import replace

from calcreport.model.schema import Fitting, Given, Model, Pipe
from calcreport.physics import pump
from calcreport.solver.liquid import _destination_elevation
from calcreport.solver.states import Case
from calcreport.trace import TraceBuilder


def _cases(b: TraceBuilder, model: Model) -> list[Case]:
    """The design case, the static-head extremes when level ranges are given, and with
    several pumps the cases of every pump running and of one duty pump out."""
    src, dst = model.source, model.destination
    npsh_level = src.level_low or src.level
    count, standby = model.pump.count, model.pump.standby
    duty = count
    if standby.value > 0:
        duty = b.step(
            "pump.duty_pumps",
            "Duty pumps (standby out of service)",
            pump.pumps_running,
            n=count,
            n_out=standby,
        )
    high = (src.level_low or src.level, dst.level_high or dst.level)
    low = (src.level_high or src.level, dst.level_low or dst.level)
    cases: list[Case] = []

    def case(
        title: str,
        levels: tuple[Given, Given],
        running: Given,
        needed: bool = True,
        flow: Given | None = None,
        temperature: Given | None = None,
        speed: Given | None = None,
        pipes: tuple[Pipe, ...] | None = None,
    ) -> None:
        cases.append(
            Case(
                id=f"C{len(cases) + 1}",
                title=title,
                flow=flow or model.flow,
                temperature=temperature,
                speed=speed,
                pipes=pipes,
                source_level=levels[0],
                npsh_level=npsh_level,
                destination_level=_destination_elevation(model, levels[1]),
                running=running,
                duty=needed,
            )
        )

    pumps = "" if count.value == 1 else f", {duty.value:g} of {count.value:g} pumps running"
    case(f"Design: normal levels, new pipe{pumps}", (src.level, dst.level), duty)

    def extremes(source: str | None, destination: str | None) -> str:
        """Which levels a static-head case moves: only those the input gives a range of."""
        return ", ".join(
            f"{vessel} {level}"
            for vessel, level in (("source", source), ("destination", destination))
            if level
        )

    if src.level_low or dst.level_high:
        moved = extremes("low" if src.level_low else None, "high" if dst.level_high else None)
        case(f"Highest static head: {moved}{pumps}", high, duty)
    if src.level_high or dst.level_low:
        moved = extremes("high" if src.level_high else None, "low" if dst.level_low else None)
        case(f"Lowest static head: {moved}{pumps}", low, duty)
    flows = sorted(model.envelope.flows, key=lambda q: q.value)
    if flows:
        peak, least = flows[-1], flows[0]
        case(
            f"Peak required flow {peak.value * 1e3:.4g} L/s, highest static head{pumps}",
            high,
            duty,
            flow=peak,
        )
        if model.pump.curve is None and least.value < model.flow.value:
            case(
                f"Least required flow {least.value * 1e3:.4g} L/s, lowest static head",
                low,
                duty,
                flow=least,
            )
    temperatures = model.envelope.temperatures
    if temperatures:
        cold, hot = temperatures
        case(
            f"Coldest liquid {cold.value - 273.15:.4g} °C (most viscous), highest static head",
            high,
            duty,
            temperature=cold,
        )
        case(
            f"Warmest liquid {hot.value - 273.15:.4g} °C (least NPSH), lowest static head",
            low,
            duty,
            temperature=hot,
        )
    aged = model.envelope.roughness
    if aged:
        b.assume(
            f"Aged pipe: every pipe smoother than {aged.value * 1e3:.4g} mm (envelope.roughness, "
            "the project's stated basis) takes that roughness in the aged-pipe case."
        )
        rough = tuple(
            replace(
                p, roughness=aged, sources={k: v for k, v in p.sources.items() if k != "roughness"}
            )
            if p.roughness.value < aged.value
            else p
            for p in model.pipes
        )
        case(f"Aged pipe (roughness {aged.value * 1e3:.4g} mm), highest static head{pumps}",
             high, duty, pipes=rough)  # fmt: skip
    dirty = model.envelope.strainer_dirty_dp
    if dirty:
        b.assume(
            "Dirty suction strainer: its loss envelope.strainer_dirty_dp at the duty flow, "
            "scaled with (Q/Q_duty)², is added at the pump end of the last suction pipe."
        )
        last = model.suction_pipes[-1]
        strainer = Fitting(
            key="envelope.strainer_dirty_dp",
            count=Given(1.0, "", "envelope.strainer_dirty_dp"),
            dp=dirty,
            at_flow=model.flow,
            note="suction strainer, dirty",
        )
        fouled = tuple(
            replace(p, fittings=(*p.fittings, strainer)) if p is last else p for p in model.pipes
        )
        case(f"Dirty suction strainer ({dirty.value / 1e3:.4g} kPa at the duty flow), lowest "
             f"source level{pumps}", high, duty, pipes=fouled)  # fmt: skip
    # The envelope's extremes at once: each alone is a case above, but the system also
    # runs with an aged pipe in cold weather at the peak demand.
    worst = [
        part
        for part, on in (
            ("aged pipe", aged),
            ("coldest liquid", temperatures),
            ("peak required flow", flows),
        )
        if on
    ]
    if len(worst) >= 2:
        case(
            f"Combined worst: {', '.join(worst)}, highest static head{pumps}",
            high,
            duty,
            flow=flows[-1] if flows else None,
            temperature=temperatures[0] if temperatures else None,
            pipes=rough if aged else None,
        )
    if model.pump.speed_range:
        slow, fast = model.pump.speed_range
        case(
            f"Top speed {fast.value * 60:.5g} rpm, lowest static head", low, duty, False, speed=fast
        )
        case(
            f"Minimum speed {slow.value * 60:.5g} rpm, highest static head",
            high,
            duty,
            False,
            speed=slow,
        )
    if standby.value > 0:
        case(f"All {count.value:g} pumps running, highest static head", high, count, False)
    if duty.value > 1:
        out = b.assume(
            "One duty pump is taken out of service in the reduced case "
            + (
                "(the running pumps move to higher flows)."
                if model.pump.arrangement == "parallel"
                else "(the running pumps give less head: the flow falls)."
            ),
            1.0,
            "",
        )
        fewer = b.step(
            f"C{len(cases) + 1}.pump.pumps_running",
            "Pumps running, one duty pump out",
            pump.pumps_running,
            f"C{len(cases) + 1}",
            n=duty,
            n_out=out,
        )
        case(f"One duty pump out: {fewer.value:g} running, lowest static head", low, fewer, False)
    return cases
