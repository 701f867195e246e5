"""Charts of the calculation report, drawn from a solved trace.

Every public function takes a trace (the ``calcreport-trace/1`` JSON as a
dict) and returns a :class:`Figure`: one page of vector PDF of a fixed size
and a one-line caption. The charts plot values of the trace and convert
units for display; they compute no engineering numbers (the one exception is
the background of the friction-factor chart, the laminar and Colebrook lines
of constant relative roughness, drawn with :mod:`calcreport.physics.friction`).

matplotlib is imported lazily, inside the functions, and only through its
object API (no pyplot), so solving never loads it and no global state is
left behind. The same trace gives the same PDF bytes.

Charts
------
- :func:`system_curve` -- system head against flow with the duty point
- :func:`npsh` -- NPSH available against flow
- :func:`profile` -- energy and hydraulic grade lines along the route
- :func:`loss_breakdown` -- the parts of the total dynamic head
- :func:`friction_factor` -- Darcy friction factor against Reynolds number
- :func:`sketch` -- a single-line schematic of the system with its elevations
- :func:`route_pressure` -- grade lines against the pipe, ratings and high points
- :func:`energy` -- input power and running cost at each point of the duty profile

Helpers
-------
- :class:`Figure` -- the PDF bytes, page size and caption of one chart
- :data:`FIGURES` -- the names of the chart functions, in report order

One module a chart (``system_chart``, ``npsh_chart``, ``profile_chart``, ``losses_chart``,
``friction_chart``, ``sketch_chart``, ``pressure_chart``, ``energy_chart``); ``base`` holds
the shared style, figure set-up and display helpers, ``placement`` the label placer.
"""

from __future__ import annotations

import io
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

from calcreport.report.charts.base import _PDF_METADATA, _RC, _plain_glyphs
from calcreport.report.charts.candidates_chart import _draw_candidates
from calcreport.report.charts.energy_chart import _draw_energy
from calcreport.report.charts.friction_chart import _draw_friction_factor
from calcreport.report.charts.losses_chart import _draw_loss_breakdown
from calcreport.report.charts.npsh_chart import _draw_npsh
from calcreport.report.charts.pressure_chart import _draw_route_pressure
from calcreport.report.charts.profile_chart import _draw_profile
from calcreport.report.charts.sizes_chart import _draw_pipe_sizes
from calcreport.report.charts.sketch_chart import _draw_sketch
from calcreport.report.charts.system_chart import _draw_system_curve
from calcreport.report.charts.tornado_chart import _draw_tornado

__all__ = [
    "FIGURES",
    "Drawn",
    "Figure",
    "applies",
    "candidates",
    "drawn",
    "energy",
    "friction_factor",
    "loss_breakdown",
    "npsh",
    "pipe_sizes",
    "profile",
    "route_pressure",
    "sketch",
    "system_curve",
    "tornado",
]


@dataclass(frozen=True)
class Figure:
    """One chart: a one-page vector PDF, its page size and its caption.

    ``title`` is the caption text without the "Figure N —" prefix, which
    the document adds. ``figure`` is the drawn matplotlib Figure itself, for
    a document that draws the chart on its own canvas rather than embedding
    ``pdf``; it takes no part in comparisons.
    """

    pdf: bytes
    width_pt: float
    height_pt: float
    title: str
    figure: Any = field(default=None, compare=False, repr=False)

    def __post_init__(self) -> None:
        if not self.pdf.startswith(b"%PDF"):
            raise ValueError("Figure.pdf must hold a PDF document.")
        if not (self.width_pt > 0 and self.height_pt > 0):
            raise ValueError("Figure width and height must be positive.")
        if not self.title:
            raise ValueError("Figure.title must not be empty.")


# --------------------------------------------------------------------------
# Public charts


def system_curve(trace: dict[str, Any]) -> Figure:
    """System head against flow with the duty point and the static head."""
    return _render(_draw_system_curve, trace)


def npsh(trace: dict[str, Any]) -> Figure:
    """NPSH available against flow with the duty flow marked."""
    return _render(_draw_npsh, trace)


def profile(trace: dict[str, Any]) -> Figure:
    """Energy and hydraulic grade lines along the route, source to destination."""
    return _render(_draw_profile, trace)


def loss_breakdown(trace: dict[str, Any]) -> Figure:
    """The parts of the total dynamic head as horizontal bars."""
    return _render(_draw_loss_breakdown, trace)


def friction_factor(trace: dict[str, Any]) -> Figure:
    """Darcy friction factor against Reynolds number with this system's pipes."""
    return _render(_draw_friction_factor, trace)


def sketch(trace: dict[str, Any]) -> Figure:
    """A single-line schematic of the system with its elevations to scale."""
    return _render(_draw_sketch, trace)


def route_pressure(trace: dict[str, Any]) -> Figure:
    """Grade lines along the route against the pipe, the ratings and the high points."""
    return _render(_draw_route_pressure, trace)


def energy(trace: dict[str, Any]) -> Figure:
    """Input power and running cost at each point of the duty profile."""
    return _render(_draw_energy, trace)


def candidates(trace: dict[str, Any]) -> Figure:
    """The offered pumps' curves over the design system curve, with their operating points."""
    return _render(_draw_candidates, trace)


def tornado(trace: dict[str, Any]) -> Figure:
    """How much each stated uncertainty moves TDH, operating flow, NPSH margin and power."""
    return _render(_draw_tornado, trace)


def pipe_sizes(trace: dict[str, Any]) -> Figure:
    """A main's life-cycle cost against its bore, with the pipes' and the energy's shares."""
    return _render(_draw_pipe_sizes, trace)


# Chart name -> the function that draws it, in report order.
_DRAWERS: dict[str, Callable[[dict[str, Any]], tuple[Any, str]]] = {
    "sketch": _draw_sketch,
    "system_curve": _draw_system_curve,
    "npsh": _draw_npsh,
    "profile": _draw_profile,
    "loss_breakdown": _draw_loss_breakdown,
    "friction_factor": _draw_friction_factor,
    "route_pressure": _draw_route_pressure,
    "energy": _draw_energy,
    "candidates": _draw_candidates,
    "pipe_sizes": _draw_pipe_sizes,
    "tornado": _draw_tornado,
}
# The chart names in report order.
FIGURES = tuple(_DRAWERS)


def applies(name: str, trace: dict[str, Any]) -> bool:
    """Whether the trace holds what chart ``name`` plots (some depend on optional input)."""
    results = trace.get("results", {})
    if name == "route_pressure":
        nodes = results.get("route", {}).get("nodes", [])
        # A profile needs two points along the pipes; the pump's flanges alone are not one.
        return sum(1 for n in nodes if "min_grade" in n and n.get("station") != "flange") >= 2
    if name == "energy":
        rows = results.get("energy", {}).get("profile", [])
        return bool(rows) and all("electrical_power" in r for r in rows)
    if name == "candidates":
        return any("curve" in c for c in results.get("study", {}).get("candidates", []))
    if name == "tornado":
        return bool(results.get("study", {}).get("sensitivity"))
    if name == "pipe_sizes":
        rows = results.get("study", {}).get("pipe_sizes", [])
        return sum(1 for row in rows if "life_cycle_cost" in row) >= 2
    return True


# --------------------------------------------------------------------------
# Rendering


def _render(draw: Callable[[dict[str, Any]], tuple[Any, str]], trace: dict[str, Any]) -> Figure:
    """Draw a chart under the package's settings and save it as PDF bytes."""
    import matplotlib

    with matplotlib.rc_context(_RC):
        fig, title = draw(trace)
        _plain_glyphs(fig)
        buffer = io.BytesIO()
        fig.savefig(buffer, format="pdf", metadata=_PDF_METADATA)
    width, height = fig.get_size_inches()
    return Figure(
        pdf=buffer.getvalue(),
        width_pt=float(width) * 72.0,
        height_pt=float(height) * 72.0,
        title=title,
        figure=fig,
    )


@dataclass(frozen=True)
class Drawn:
    """A chart drawn but not saved: the matplotlib figure and its caption."""

    figure: Any
    title: str


def drawn(name: str, trace: dict[str, Any]) -> Drawn:
    """Chart ``name`` of :data:`FIGURES` as a matplotlib figure, for a document to draw."""
    return Drawn(*_draw_only(name, trace))


def _draw_only(name: str, trace: dict[str, Any]) -> tuple[Any, str]:
    """The matplotlib figure and caption of chart ``name``, without saving a PDF."""
    import matplotlib

    with matplotlib.rc_context(_RC):
        fig, title = _DRAWERS[name](trace)
        _plain_glyphs(fig)
    return fig, title
