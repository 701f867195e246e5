"""The friction-factor chart: Darcy friction factor against Reynolds number, laminar and
Colebrook lines of constant relative roughness, this system's pipes.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from calcreport.report.charts.base import (
    FONT_PT,
    INK,
    RUST,
    _legend_above,
    _new_figure,
    _pipe_items,
    _results,
)
from calcreport.report.charts.placement import _clusters, _Placer, _ring

# --------------------------------------------------------------------------
# 5. Friction factor against Reynolds number

ROUGHNESS_LINES = (0.0, 1e-5, 5e-5, 1e-4, 2e-4, 5e-4, 1e-3, 2e-3, 5e-3, 1e-2, 2e-2, 5e-2)
RE_SPAN = (600.0, 1e8)
F_SPAN = (0.008, 0.1)


def _roughness_text(e: float) -> str:
    if e == 0:
        return "smooth"
    if e >= 1e-4:
        return f"{e:.6f}".rstrip("0")
    exponent = math.floor(math.log10(e))
    mantissa = e / 10**exponent
    superscript = str(exponent).translate(_SUPERSCRIPT)
    return f"{mantissa:.0f}×10{superscript}"


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _power_of_ten(v: float) -> str:
    """A decade tick as plain text, "10³", so the chart needs no mathtext font."""
    if v <= 0:
        return ""
    exponent = round(math.log10(v))
    return f"10{str(exponent).translate(_SUPERSCRIPT)}"


def _draw_friction_factor(trace: dict[str, Any]) -> tuple[Any, str]:
    from matplotlib.ticker import FixedLocator, FuncFormatter, LogLocator, NullFormatter

    from calcreport.physics import friction

    r = _results(trace, "pipes")

    # The system's pipes, in route order: (id, side, Re, f).
    points: list[tuple[str, str, float, float]] = []
    for pid, p in _pipe_items(r):
        if p.get("reynolds") is None or p.get("friction_factor") is None:
            continue
        side = "suction" if str(p.get("side", "")).startswith("suction") else "discharge"
        points.append(
            (pid, side, float(p["reynolds"]["value"]), float(p["friction_factor"]["value"]))
        )
    # The fixed span, widened (never narrowed) to show every pipe of this system.
    re_lo, re_hi = RE_SPAN
    f_lo, f_hi = F_SPAN
    usable = [(x, f) for _, _, x, f in points if x > 0 and f > 0]
    if usable:
        re_lo = min(re_lo, min(x for x, _ in usable) / 1.6)
        re_hi = max(re_hi, max(x for x, _ in usable) * 1.6)
        f_lo = min(f_lo, min(f for _, f in usable) / 1.15)
        f_hi = max(f_hi, max(f for _, f in usable) * 1.2)

    fig = _new_figure(3.8)
    ax = fig.add_subplot()
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlim(re_lo, re_hi)
    ax.set_ylim(f_lo, f_hi)
    ax.spines["top"].set_visible(True)
    ax.spines["right"].set_visible(True)
    ax.grid(True, which="major", color="#dedede", lw=0.5)
    ax.grid(True, which="minor", color="#efefef", lw=0.4)

    lam_limit, turb_limit = friction.LAMINAR_LIMIT, friction.TURBULENT_LIMIT
    ax.axvspan(lam_limit, turb_limit, color="#f0f0f0", lw=0, zorder=0)
    ax.text(
        math.sqrt(lam_limit * turb_limit),
        f_lo * 1.18,
        "transition",
        rotation=90,
        ha="center",
        va="bottom",
        color="#555555",
        fontsize=FONT_PT - 0.5,
    )
    re_lam = np.geomspace(re_lo, lam_limit, 40)
    (lam,) = ax.plot(re_lam, friction.laminar(re_lam), color=INK, lw=1.4, label="laminar, 64/Re")

    re = np.geomspace(lam_limit, re_hi, 160)
    smooth = None
    col = None
    # Right-end labels at least 8 pt apart (about 290 pt of plot height).
    per_decade = 290.0 / math.log10(f_hi / f_lo)
    last_label = math.inf
    for e in sorted(ROUGHNESS_LINES, reverse=True):
        f = friction.colebrook(re, np.full_like(re, e))
        (col,) = ax.plot(re, f, color="#7a8ea3", lw=0.8, zorder=2)
        if e == 0:
            smooth = (re, f)
        height = math.log10(f[-1]) * per_decade if f[-1] > 0 else -math.inf
        if f[-1] >= f_lo and last_label - height >= 8.0:
            last_label = height
            ax.annotate(
                _roughness_text(e),
                xy=(re_hi, float(f[-1])),
                xytext=(3, 0),
                textcoords="offset points",
                ha="left",
                va="center",
                fontsize=FONT_PT - 0.5,
                annotation_clip=False,
            )
    assert col is not None
    col.set_label("Colebrook, ε/D at right")
    ax.annotate(
        "ε/D",
        xy=(1.0, 1.0),
        xycoords="axes fraction",
        xytext=(3, 2),
        textcoords="offset points",
        ha="left",
        va="bottom",
        fontsize=FONT_PT - 0.5,
    )

    handles: list[Any] = [lam, col]
    for side, mk, face in (("suction", "o", "white"), ("discharge", "s", RUST)):
        mine = [(x, f) for _, s_, x, f in points if s_ == side]
        if mine:
            (pts,) = ax.plot(
                *zip(*mine, strict=True), ls="none", marker=mk, ms=5.5, mfc=face, mec=INK,
                mew=0.8, zorder=6, label=f"{side} pipe",
            )  # fmt: skip
            handles.append(pts)

    ax.xaxis.set_major_locator(LogLocator(base=10, numticks=12))
    ax.xaxis.set_minor_locator(LogLocator(base=10, subs=(2, 3, 4, 5, 6, 7, 8, 9), numticks=12))
    ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: _power_of_ten(v)))
    ax.xaxis.set_minor_formatter(NullFormatter())
    if math.log10(f_hi / f_lo) <= 1.3:
        y_ticks = [0.008, 0.01, 0.015, 0.02, 0.025, 0.03, 0.04, 0.05, 0.06, 0.08, 0.1]
        y_minor = [0.009, 0.035, 0.045, 0.07, 0.09]
    else:
        y_ticks = [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10]
        y_minor = [k * 10.0**n for n in range(-3, 1) for k in (3, 4, 6, 7, 8, 9)]
        y_minor += [0.015, 0.025, 0.15, 0.25]
    ax.yaxis.set_major_locator(FixedLocator(y_ticks))
    ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
    ax.yaxis.set_minor_locator(FixedLocator(y_minor))
    ax.yaxis.set_minor_formatter(NullFormatter())
    ax.set_xlabel("Reynolds number Re [–]")
    ax.set_ylabel("Darcy friction factor f [–]")
    _legend_above(ax, handles, reserve=40.0)

    placer = _Placer(fig, ax)
    placer.add_lines([lam, *handles[2:]])  # the points; labels may cross the background lines
    if smooth is not None:
        re_s, f_s = smooth
        k = int(np.argmin(np.abs(f_s - f_lo * 1.28)))
        ax.annotate(
            "smooth",
            xy=(re_s[k], f_s[k]),
            xytext=(-2, -3),
            textcoords="offset points",
            ha="right",
            va="top",
            fontsize=FONT_PT - 0.5,
        ).set_in_layout(False)

    # Pipes whose markers overlap share one label, so no label is ambiguous.
    groups = _clusters(ax, [(x, f) for _, _, x, f in points], 6.0)
    anchors = []
    for members in groups:
        ids = [points[i][0] for i in members]
        lines = [", ".join(ids[k : k + 5]) for k in range(0, len(ids), 5)]
        x = math.exp(sum(math.log(points[i][2]) for i in members) / len(members))
        f = math.exp(sum(math.log(points[i][3]) for i in members) / len(members))
        anchors.append(("\n".join(lines), x, f))
    for text, x, f in anchors:
        placer.place(
            text,
            (x, f),
            _ring((7, 12, 20, 28, 38)),
            rivals=[(x2, f2) for t2, x2, f2 in anchors if t2 != text],
            leader_from=11,
            bbox={"boxstyle": "square,pad=0.15", "fc": "white", "ec": "none", "alpha": 0.85},
        )

    title = (
        "Darcy friction factor against Reynolds number: laminar line "
        f"(Re < {friction.LAMINAR_LIMIT:g}), Colebrook lines of constant relative roughness "
        "ε/D, and this system's pipes"
    )
    return fig, title
