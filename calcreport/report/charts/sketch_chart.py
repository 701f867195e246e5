"""The system sketch: vessels, pipes in flow order, the pump, levels and the pump datum to
scale.
"""

from __future__ import annotations

import itertools
import math
from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    BLUE,
    GREY,
    INK,
    LIQUID,
    _Display,
    _given,
    _labelled,
    _new_figure,
    _num,
    _pipe_items,
    _plain,
    _results,
)
from calcreport.report.charts.placement import _Placer, _ring
from calcreport.report.charts.profile_chart import _surface_marker
from calcreport.units import pretty_unit

# --------------------------------------------------------------------------
# 6. System sketch


def _draw_sketch(trace: dict[str, Any]) -> tuple[Any, str]:
    from matplotlib.patches import Rectangle

    r = _results(trace)
    d = _Display(trace)
    hu = d.label("length")
    pipes = _pipe_items(r)
    nodes = (r.get("profile") or {}).get("nodes") or []

    def elev(key: str) -> float | None:
        q = _given(trace, key)
        return d(q, "length") if q else None

    def node_elev(i: int) -> float | None:
        if nodes and nodes[i].get("elevation") is not None:
            unit = (r.get("profile") or {}).get("unit", "m")
            return d.raw(nodes[i]["elevation"], unit, "length")
        return None

    level_s = elev("source.level")
    level_s = level_s if level_s is not None else node_elev(0)
    level_d = elev("destination.level")
    level_d = level_d if level_d is not None else node_elev(-1)
    if level_s is None or level_d is None:
        raise ValueError(
            "The trace gives neither the vessel levels (given) nor the profile's surface "
            "elevations, which the sketch draws."
        )
    datum = elev("pump.elevation")
    pump_y = datum if datum is not None else min(level_s, level_d)
    free_outlet = elev("destination.outlet_elevation")

    suction = [(pid, p) for pid, p in pipes if str(p.get("side", "")).startswith("suction")]
    discharge = [(pid, p) for pid, p in pipes if not str(p.get("side", "")).startswith("suction")]

    def pipe_elev(p: dict[str, Any], key: str) -> float | None:
        q = p.get(key)
        return d(q, "length") if isinstance(q, dict) else None

    known = [level_s, level_d, pump_y]
    for _, p in pipes:
        known += [v for v in (pipe_elev(p, "elevation_start"), pipe_elev(p, "elevation_end")) if v]
    for key in ("source.level_low", "source.level_high", "destination.level_low",
                "destination.level_high"):  # fmt: skip
        v = elev(key)
        if v is not None:
            known.append(v)
    if free_outlet is not None:
        known.append(free_outlet)
    lo, hi = min(known), max(known)
    min_span = d.raw(4.0, "m", "length")
    span = max(hi - lo, min_span)
    tank_h = 0.28 * span

    # Horizontal layout in axes units (0..1); the vertical axis is elevation.
    src_x0, src_x1 = 0.05, 0.16
    dst_x0, dst_x1 = 0.84, 0.95
    n_s, n_d = len(suction), len(discharge)
    pumps = _PumpSet.of(r)
    half = pumps.half_width()  # the pipes end on either side of the pump set
    width = (dst_x0 - src_x1 - 2 * half) / max(n_s + n_d, 1)
    pump_x = src_x1 + (n_s * width if n_s else 0.06) + half
    if n_s == 0:
        width = (dst_x0 - pump_x - half) / max(n_d, 1)
        d_width = width
    else:
        d_width = (dst_x0 - pump_x - half) / max(n_d, 1)

    # Source vessel.
    lows = [v for v in (elev("source.level_low"),) if v is not None]
    lift = pump_y >= level_s
    src_bottom = level_s - 0.7 * tank_h
    if not lift:
        src_bottom = min(src_bottom, max(pump_y - 0.12 * tank_h, level_s - 1.6 * tank_h))
    if lows:
        src_bottom = min(src_bottom, min(lows) - 0.12 * tank_h)
    src_top = level_s + 0.3 * tank_h
    if elev("source.level_high") is not None:
        src_top = max(src_top, elev("source.level_high") + 0.15 * tank_h)  # type: ignore[operator]

    # Destination vessel.
    first_end = pipe_elev(discharge[-1][1], "elevation_end") if discharge else None
    dst_bottom = level_d - 0.7 * tank_h
    dst_top = level_d + 0.3 * tank_h
    if free_outlet is not None:
        inlet_y = free_outlet
        dst_top = max(dst_top, free_outlet + 0.35 * tank_h)
        dst_bottom = min(dst_bottom, level_d - 0.7 * tank_h)
    elif first_end is not None:
        inlet_y = first_end
        dst_bottom = min(dst_bottom, first_end - 0.12 * tank_h)
    else:
        inlet_y = dst_bottom + 0.18 * tank_h
    if elev("destination.level_high") is not None:
        dst_top = max(dst_top, elev("destination.level_high") + 0.15 * tank_h)  # type: ignore[operator]
    if elev("destination.level_low") is not None:
        dst_bottom = min(dst_bottom, elev("destination.level_low") - 0.12 * tank_h)  # type: ignore[operator]

    # Route: joint elevations, interpolated between known points by pipe index.
    def route(
        items: list[tuple[str, dict[str, Any]]], y_start: float, y_end: float
    ) -> list[tuple[float, float]]:
        n = len(items)
        joints = np.full(n + 1, np.nan)
        joints[0], joints[-1] = y_start, y_end
        for i, (_, p) in enumerate(items):
            s, e = pipe_elev(p, "elevation_start"), pipe_elev(p, "elevation_end")
            if s is not None and i > 0:
                joints[i] = s
            if e is not None and i < n - 1:
                joints[i + 1] = e
        idx = np.arange(n + 1)
        ok = np.isfinite(joints)
        joints = np.interp(idx, idx[ok], joints[ok])
        ends = []
        for i, (_, p) in enumerate(items):
            s, e = pipe_elev(p, "elevation_start"), pipe_elev(p, "elevation_end")
            ends.append((s if s is not None else joints[i], e if e is not None else joints[i + 1]))
        return ends

    src_out_y = pump_y if lift else max(pump_y, src_bottom + 0.12 * tank_h)
    s_ends = route(suction, src_out_y, pump_y)
    d_ends = route(discharge, pump_y, inlet_y)

    # Vertical limits and figure.
    all_y = [src_bottom, src_top, dst_bottom, dst_top, pump_y]
    all_y += [v for e in s_ends + d_ends for v in e]
    y_lo, y_hi = min(all_y), max(all_y)
    y_span = max(y_hi - y_lo, min_span)
    fig = _new_figure(3.6)
    ax = fig.add_subplot()
    ax.set_xlim(0, 1)
    limits = (y_lo - 0.15 * y_span, y_hi + 0.12 * y_span)
    ax.set_ylim(*(pumps.room(pump_y, *limits) if pumps.stacked else limits))
    ax.spines["bottom"].set_visible(False)
    ax.set_xticks([])
    ax.set_ylabel(f"Elevation [{hu}]")
    ax.grid(True, axis="y", color="#efefef")

    pipe_kw = {"color": INK, "lw": 1.8, "solid_capstyle": "butt", "zorder": 3}
    joint_kw = {"ls": "none", "marker": "o", "ms": 3.0, "mfc": "white", "mec": INK, "mew": 0.8}

    def vessel(x0: float, x1: float, bottom: float, top: float, level: float, closed: bool) -> None:
        ax.add_patch(
            Rectangle((x0, bottom), x1 - x0, level - bottom, facecolor=LIQUID, lw=0, zorder=1)
        )
        xs = [x0, x0, x1, x1] + ([x0] if closed else [])
        ys = [top, bottom, bottom, top] + ([top] if closed else [])
        ax.plot(xs, ys, color=INK, lw=1.2, zorder=2, solid_joinstyle="miter")
        ax.plot([x0, x1], [level, level], color=BLUE, lw=0.8, zorder=2)

    p_src = _given(trace, "source.pressure")
    p_dst = _given(trace, "destination.pressure")
    vessel(src_x0, src_x1, src_bottom, src_top, level_s, bool(p_src and p_src["value"] != 0))
    vessel(dst_x0, dst_x1, dst_bottom, dst_top, level_d, bool(p_dst and p_dst["value"] != 0))
    for key, (x0, x1) in (
        ("source.level_low", (src_x0, src_x1)),
        ("source.level_high", (src_x0, src_x1)),
        ("destination.level_low", (dst_x0, dst_x1)),
        ("destination.level_high", (dst_x0, dst_x1)),
    ):
        v = elev(key)
        if v is not None:
            ax.plot([x0 + 0.01, x1 - 0.01], [v, v], color=BLUE, lw=0.6, ls=(0, (2, 1.5)), zorder=2)

    # Pipes, suction then discharge.
    dip_x = src_x0 + 0.68 * (src_x1 - src_x0)  # a suction lift draws from the liquid
    if not suction:  # the pump sits at the source vessel's nozzle
        nozzle = [(src_x1, src_out_y), (pump_x - half, pump_y)]
        if lift:
            nozzle = [(dip_x, src_bottom + 0.2 * tank_h), (dip_x, pump_y), (pump_x - half, pump_y)]
        ax.plot(*zip(*nozzle, strict=True), **pipe_kw)
    y_scale = 0.5 / max(y_hi - y_lo, min_span)  # axes units, about the chart's aspect

    def main_leg(pts: list[tuple[float, float]]) -> tuple[tuple[float, float], ...]:
        def size(g: tuple[tuple[float, float], ...]) -> float:
            return math.hypot(g[1][0] - g[0][0], (g[1][1] - g[0][1]) * y_scale)

        return max(itertools.pairwise(pts), key=size)

    segments: list[tuple[str, dict[str, Any], list[tuple[float, float]]]] = []
    x = src_x1
    for i, ((pid, p), (ys, ye)) in enumerate(zip(suction, s_ends, strict=True)):
        pts = [(x, ys), (x + width, ye)]
        if i == 0 and lift:
            pts = [(dip_x, src_bottom + 0.2 * tank_h), (dip_x, ys), (x + width, ye)]
        segments.append((pid, p, pts))
        x += width
    x = pump_x + half
    prev_y = pump_y
    for (pid, p), (ys, ye) in zip(discharge, d_ends, strict=True):
        pts = [(x, ys), (x + d_width, ye)]
        if abs(ys - prev_y) > 1e-9:
            pts.insert(0, (x, prev_y))
        prev_y = ye
        segments.append((pid, p, pts))
        x += d_width
    if free_outlet is not None and segments:
        pid, p, pts = segments[-1]
        pts.append((dst_x0 + 0.3 * (dst_x1 - dst_x0), pts[-1][1]))
    elif segments and discharge:
        pid, p, pts = segments[-1]
        if abs(pts[-1][1] - inlet_y) > 1e-9:
            pts.append((dst_x0, inlet_y))
    for _pid, _p, pts in segments:
        xs, ys = zip(*pts, strict=True)
        ax.plot(xs, ys, **pipe_kw)
        (x0, y0), (x1, y1) = main_leg(pts)
        t0, t1 = 0.74, 0.78
        ax.annotate(
            "",
            xy=(x0 + t1 * (x1 - x0), y0 + t1 * (y1 - y0)),
            xytext=(x0 + t0 * (x1 - x0), y0 + t0 * (y1 - y0)),
            arrowprops={
                "arrowstyle": "-|>,head_length=0.5,head_width=0.22",
                "color": INK,
                "lw": 0.8,
                "shrinkA": 0,
                "shrinkB": 0,
            },
            zorder=4,
        ).set_in_layout(False)
    joints = [seg[2][-1] for seg in segments[:-1]]
    joints = [j for j in joints if abs(j[0] - (pump_x - half)) > 1e-9]
    if joints:
        ax.plot(*zip(*joints, strict=True), zorder=4, **joint_kw)
    if free_outlet is not None and segments:
        end = segments[-1][2][-1]
        ax.plot([end[0], end[0]], [end[1], level_d], color=BLUE, lw=0.8, ls=(0, (1.5, 1.5)))

    places = pumps.draw(ax, pump_x, pump_y, pipe_kw)

    # Surface symbols and the reference lines to the elevation scale.
    marker = _surface_marker()
    cs, cd = 0.5 * (src_x0 + src_x1), 0.5 * (dst_x0 + dst_x1)
    if lift:
        cs = src_x0 + 0.32 * (src_x1 - src_x0)
    ax.plot([cs, cd], [level_s, level_d], ls="none", marker=marker, ms=8, mfc="white",
            mec=INK, mew=0.8, zorder=6)  # fmt: skip
    ref = {"color": GREY, "lw": 0.5, "ls": (0, (1, 2)), "zorder": 0}
    ax.plot([0, src_x0], [level_s, level_s], **ref)
    ax.plot([0, pump_x - half - 0.015], [pump_y, pump_y], **ref)
    ax.plot([0, dst_x0], [level_d, level_d], **ref)

    placer = _Placer(fig, ax)
    placer.add_lines()
    reach = pumps.size / 2 + 1.5
    for x_p, dy, _ in places:
        at = ax.transData.transform([(x_p, pump_y)])[0] + (0.0, dy)
        placer.boxes.append((at[0] - reach, at[1] - reach, at[0] + reach, at[1] + reach))

    def pressure_text(q: dict[str, Any] | None) -> str:
        if not q or q["value"] == 0:
            return ""
        unit = d.unit("pressure")
        gauge = "psig" if unit == "psi" else f"{pretty_unit(unit)}(g)"
        return f"\n{_num(d(q, 'pressure'))} {gauge}"

    for level, top, xc in ((level_s, src_top, cs), (level_d, dst_top, cd)):
        placer.place(f"level {_plain(level)} {hu}", (xc, top), [(0, 3), (0, 10)], leader_from=99)
    placer.place(
        "source" + pressure_text(p_src),
        (cs, src_bottom),
        [(0, -4), (0, -12)],
        leader_from=99,
    )
    placer.place(
        "destination" + pressure_text(p_dst),
        (cd, dst_bottom),
        [(0, -4), (0, -12)],
        leader_from=99,
    )
    spares = [(x_p, dy) for x_p, dy, spare in places if spare]
    if spares:  # one label by the last standby pump, first: each is dashed alike
        x_p, dy = spares[-1]
        centre, header = ax.transData.transform([(x_p, pump_y), (pump_x + half, pump_y)])
        label_at = tuple(ax.transData.inverted().transform([centre + (0.0, dy)])[0])
        gap = pumps.size / 2 + 3.5
        beyond = header[0] - centre[0] + 3 if pumps.stacked else 0.0  # a parallel header
        clear = max(gap, beyond)
        placer.place("standby", label_at, [(clear, 0), (-clear, 0), (0, -gap), (0, gap)],
                     leader_from=99)  # fmt: skip
    datum_text = pumps.name() + (f"\ndatum {_plain(pump_y)} {hu}" if datum is not None else "")
    low, high = min(dy for _, dy, _ in places), max(dy for _, dy, _ in places)
    placer.place(datum_text, (pump_x, pump_y), [(0, low - 11), (0, high + 11), (10, low - 10),
                 (-10, low - 10), (10, high + 10), (-10, high + 10)], leader_from=99)  # fmt: skip

    lu, du = d.label("length"), d.label("diameter")
    for pid, p, pts in _labelled(segments):
        size = []
        if p.get("length") is not None:
            size.append(f"L {_plain(d(p['length'], 'length'))} {lu}")
        if p.get("inner_diameter") is not None:
            size.append(f"ID {_plain(d(p['inner_diameter'], 'diameter'))} {du}")
        if len(pid) > 6:  # a long id gets a line of its own
            text = "\n".join([pid, ", ".join(size)] if size else [pid])
        else:
            text = "\n".join([f"{pid}  {size[0]}", *size[1:]] if size else [pid])
        (x0, y0), (x1, y1) = main_leg(pts)
        xm, ym = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
        a, b = ax.transData.transform([(x0, y0), (x1, y1)])
        dx, dy = b - a
        length = math.hypot(dx, dy) or 1.0
        nx, ny = -dy / length, dx / length  # normal, to the upper left of the flow
        cands = []
        for dist in (5, 10, 18, 28, 40):
            cands.append((-nx * dist, -ny * dist))
            cands.append((nx * dist, ny * dist))
        cands += _ring((24, 36, 50))
        placer.place(text, (xm, ym), cands, leader_from=16, multialignment="center")

    title = (
        "System sketch from the input: vessels, pipes in flow order with length L and inner "
        f"diameter ID, pump; liquid levels (dashed: low and high levels where given) and the "
        f"pump datum to the elevation scale at the left in {hu}; pipe runs not to horizontal "
        "scale, vessel outlines schematic"
    )
    if pumps.running + pumps.standby > 1:
        title += "; " + pumps.caption()
    return fig, title


class _PumpSet:
    """The pumps the sketch draws: how they are arranged and how many run and stand by,
    from the trace's rated duty (results.rated_duty: arrangement, pumps_running,
    pumps_standby); one pump when the trace does not say."""

    HEADER = 0.035  # axes units from the pumps to a parallel header
    STEP = 0.055  # axes units between pumps in series
    STACK_PT = 100.0  # the tallest stack of parallel pumps
    SPARE_DROP_PT = 22.0  # a series' standby pumps, below the line
    AXES_PT = 240.0  # about the sketch's axes height, a little less

    def __init__(self, arrangement: str, running: int, standby: int) -> None:
        self.arrangement = arrangement
        self.running = running
        self.standby = standby
        total = running + standby
        self.stacked = arrangement == "parallel" and total > 1
        # Parallel pumps one above another, their pitch shrinking for many; a symbol's size.
        self.pitch = min(20.0, self.STACK_PT / total) if self.stacked else 20.0
        self.size = min(15.0, self.pitch - 4.0)

    @classmethod
    def of(cls, results: dict[str, Any]) -> _PumpSet:
        rated = results.get("rated_duty") or {}
        running = rated.get("pumps_running", {}).get("value", 1)
        standby = rated.get("pumps_standby", {}).get("value", 0)
        return cls(str(rated.get("arrangement", "single")), int(running), int(standby))

    def half_width(self) -> float:
        """Half the set's width (axes units): the pipes end this far either side of it."""
        if self.stacked:
            return self.HEADER
        return (self.running - 1) * self.STEP / 2

    def places(self, x: float) -> list[tuple[float, float, bool]]:
        """Each pump's centre as (x in data, offset from the datum [pt], standby), about ``x``:
        parallel pumps one above another, duty pumps first; pumps in series one after the
        other, a standby pump below them."""
        if self.stacked:
            total = self.running + self.standby
            top = (total - 1) / 2 * self.pitch
            return [(x, top - i * self.pitch, i >= self.running) for i in range(total)]
        half = self.half_width()
        duty = [(x - half + i * self.STEP, 0.0, False) for i in range(self.running)]
        spare = [
            (x + (j - (self.standby - 1) / 2) * self.STEP, -self.SPARE_DROP_PT, True)
            for j in range(self.standby)
        ]
        return duty + spare

    def room(self, y: float, low: float, high: float) -> tuple[float, float]:
        """Elevation limits (low, high) widened where a stack of parallel pumps about the
        datum ``y`` would reach out of the axes (their height taken as AXES_PT)."""
        reach = self.places(0.0)[0][1] + self.size / 2 + 4.0  # above and below the datum [pt]
        f = reach / self.AXES_PT  # the share of the axes height either side must hold
        low = min(low, (y - f * high) / (1.0 - f))
        return low, max(high, (y - f * low) / (1.0 - f))

    def draw(
        self, ax: Any, x: float, y: float, pipe_kw: dict[str, Any]
    ) -> list[tuple[float, float, bool]]:
        """The pump symbols (a circle, a triangle pointing downstream; a standby one dashed
        and grey) and the piping between them; returns :meth:`places`."""
        places = self.places(x)
        half = self.half_width()
        branch_kw = {**pipe_kw, "lw": 1.2}
        if self.stacked:  # headers and a branch to each pump
            top, bottom = places[0][1], places[-1][1]
            for x_h in (x - half, x + half):
                ax.plot([0.0, 0.0], [top, bottom], transform=_around(ax, x_h, y), **branch_kw)
            for _, dy, _ in places:
                ax.plot([x - half, x + half], [y, y], transform=_shifted(ax, dy), **branch_kw)
        elif self.running > 1:  # the line through the pumps in series
            ax.plot([x - half, x + half], [y, y], **pipe_kw)
        scale = self.size / 15.0
        for x_p, dy, spare in places:
            at = _shifted(ax, dy)
            colour = GREY if spare else INK
            ax.plot([x_p], [y], marker="o", ms=self.size, mfc="white",
                    mec="white" if spare else INK, mew=1.2, zorder=5, transform=at)  # fmt: skip
            if spare:
                turn = np.linspace(0.0, 2.0 * np.pi, 49)
                r = self.size / 2
                ax.plot(r * np.cos(turn), dy + r * np.sin(turn), color=INK, lw=1.0,
                        ls=(0, (2.0, 1.5)), zorder=5, transform=_around(ax, x_p, y))  # fmt: skip
            ax.plot([x_p], [y], marker=">", ms=6 * scale, mfc=colour, mec=colour, zorder=6,
                    transform=at)  # fmt: skip
        return places

    def name(self) -> str:
        """The set's label on the sketch ("pump", "2 duty pumps in parallel"); the standby
        pumps have a label of their own."""
        duty = "duty " if self.standby else ""
        if self.running == 1:
            return f"{duty}pump"
        return f"{self.running} {duty}pumps in {self.arrangement}"

    def caption(self) -> str:
        """What the caption says of a set of several pumps."""
        if self.stacked:
            text = (
                f"the {self.running + self.standby} pumps in parallel drawn one above another "
                "about the pump datum, where all stand"
            )
            return text + (", standby dashed" if self.standby else "")
        text = "the duty pump"
        if self.running > 1:
            text = f"the {self.running} pumps in series drawn one after another"
        return text + (", standby dashed below" if self.standby else "")


def _shifted(ax: Any, dy: float) -> Any:
    """Data coordinates moved up by ``dy`` points (the data transform itself for none)."""
    from matplotlib.transforms import ScaledTranslation

    if dy == 0.0:
        return ax.transData
    return ax.transData + ScaledTranslation(0.0, dy / 72.0, ax.figure.dpi_scale_trans)


def _around(ax: Any, x: float, y: float) -> Any:
    """Coordinates in points about the data point (x, y)."""
    from matplotlib.transforms import Affine2D, ScaledTranslation

    return Affine2D().scale(ax.figure.dpi / 72.0) + ScaledTranslation(x, y, ax.transData)
