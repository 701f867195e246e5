"""Charts of several pumps: the curve of the running pumps, each pump's NPSH at their total
flow, and a sketch that draws every pump of the arrangement with the standby ones marked.

Identical pumps in parallel add their flows at equal head, in series their heads at equal
flow (Karassik, Pump Handbook, 4th ed., 2008): the chart draws the trace's combined curve,
and the operating point lies on it.
"""

from __future__ import annotations

import copy
import json
from typing import Any

import numpy as np
import pytest

from calcreport.model.loader import load, loads
from calcreport.report import charts
from calcreport.solver import solve
from tests.report.test_charts import EXAMPLES
from tests.solver.test_calc import CASE, _analytic_curve


def _trace(
    pump: str, destination: str = "25.0 m", flow: str = "40 L/s", datum: str = "0 m"
) -> dict[str, Any]:
    """The check case with ``pump`` lines in [pump], on its analytic curve with an NPSH
    required of our own (1.5 m + 0.004 m per (L/s)^2), solved, as the trace JSON."""
    curve = _analytic_curve(step_ls=5.0)
    flows = [5.0 * i for i in range(9)]
    curve += f'npsh_required = {{ unit = "m", values = {[1.5 + 0.004 * q * q for q in flows]} }}\n'
    text = CASE.replace("efficiency = 0.78\n", pump + 'min_continuous_flow = "6 L/s"\n') + curve
    text = text.replace('level = "25.0 m"', f'level = "{destination}"')
    text = text.replace('flow = "20 L/s"', f'flow = "{flow}"')
    text = text.replace('flow_range = ["0 L/s", "30 L/s"]', "")
    text = text.replace('elevation = "0 m"', f'elevation = "{datum}"')
    return json.loads(solve(loads(text.encode())).dumps())


@pytest.fixture(scope="module")
def parallel() -> dict[str, Any]:
    return _trace("count = 3\nstandby = 1\n")


@pytest.fixture(scope="module")
def series() -> dict[str, Any]:
    return _trace('count = 2\narrangement = "series"\n', destination="60.0 m", flow="20 L/s")


def _line(ax: Any, label: str) -> Any:
    return next(line for line in ax.lines if line.get_label() == label)


def _legend(ax: Any) -> list[str]:
    return [t.get_text() for t in ax.get_legend().get_texts()]


def _l_s(q: dict[str, Any]) -> Any:
    """A flow of the trace (m^3/s) in the SI charts' L/s."""
    return np.asarray(q["value"], dtype=float) * 1e3


# -- the system curve -------------------------------------------------------------------------


def test_parallel_chart_draws_the_combined_curve_and_one_pump_lighter(parallel) -> None:
    fig = charts.system_curve(parallel)
    ax = fig.figure.axes[0]
    pump = parallel["results"]["pump_curve"]
    both, one = _line(ax, "2 pumps in parallel"), _line(ax, "one pump")
    assert list(both.get_xdata()) == pytest.approx(list(_l_s(pump["combined"]["flow"])))
    assert list(one.get_xdata()) == pytest.approx(list(_l_s(pump["flow"])))
    assert both.get_xdata()[-1] == pytest.approx(80.0)  # 2 x the curve's last 40 L/s
    assert one.get_linewidth() < both.get_linewidth() and one.get_color() != both.get_color()
    assert {"2 pumps in parallel", "one pump"} <= set(_legend(ax))
    assert "pump curve" not in _legend(ax)
    assert "combined curve of the 2 pumps in parallel" in fig.title


# The chart draws straight lines between curve points, each chord below the parabola
# H = 42 + 0.2q - 0.02q^2 (q in L/s, one pump) by at most s^2|H''|/8 for points s apart: in
# parallel s = 10 L/s of total flow and |H''| = 0.01 m/(L/s)^2 (0.125 m), in series s = 5 L/s
# and |H''| = 0.08 (0.25 m).
@pytest.mark.parametrize("which, chord", [("parallel", 0.125), ("series", 0.25)])
def test_operating_point_sits_on_the_drawn_combined_and_system_curves(request, which, chord):
    trace = request.getfixturevalue(which)
    ax = charts.system_curve(trace).figure.axes[0]
    (q,), (h,) = _line(ax, "operating point").get_data()
    pumps = _line(ax, f"2 pumps in {which}")
    system = _line(ax, "system curve, C1 (design)")
    assert h - chord - 1e-3 <= np.interp(q, *pumps.get_data()) <= h + 1e-3
    assert np.interp(q, *system.get_data()) == pytest.approx(h, abs=0.05)
    assert q == pytest.approx(trace["results"]["operating_point"]["flow"]["value"] * 1e3)


def test_series_chart_draws_the_heads_added(series) -> None:
    ax = charts.system_curve(series).figure.axes[0]
    both, one = _line(ax, "2 pumps in series"), _line(ax, "one pump")
    assert list(both.get_xdata()) == pytest.approx(list(one.get_xdata()))
    assert list(both.get_ydata()) == pytest.approx([2 * h for h in one.get_ydata()])


def test_bep_and_regions_are_at_the_total_flow(parallel) -> None:
    ax = charts.system_curve(parallel).figure.axes[0]
    region = parallel["results"]["operating_region"]
    bep = _line(ax, "BEP flow").get_xdata()[0]
    assert bep == pytest.approx(2 * region["bep_flow"]["value"] * 1e3)
    minimum = _line(ax, "minimum continuous flow").get_xdata()[0]
    assert minimum == pytest.approx(12.0)  # 2 pumps x 6 L/s
    span = next(p for p in ax.patches if p.get_label() == "preferred operating region")
    x = span.get_path().transformed(span.get_patch_transform()).vertices[:, 0]
    low, high = (2 * q["value"] * 1e3 for q in region["preferred"])
    assert (x.min(), x.max()) == pytest.approx((low, high))


def test_a_single_pump_keeps_its_one_pump_curve() -> None:
    fig = charts.system_curve(json.loads(solve(load(EXAMPLES["cooling"])).dumps()))
    legend = _legend(fig.figure.axes[0])
    assert "pump curve" in legend and "one pump" not in legend


# -- NPSH -------------------------------------------------------------------------------------


def test_npsh_chart_draws_each_pump_at_the_total_flow(parallel) -> None:
    fig = charts.npsh(parallel)
    top, ax = fig.figure.axes
    assert ax.get_xlabel() == "Total flow of the 2 pumps in parallel [L/s]"
    pump = parallel["results"]["pump_curve"]
    npshr = _line(ax, "NPSH required of each pump (pump data)")
    assert list(npshr.get_xdata()) == pytest.approx(list(_l_s(pump["combined"]["flow"])))
    assert list(npshr.get_ydata()) == pytest.approx(pump["npsh_required"]["value"])
    (q,), (h,) = _line(ax, "operating point").get_data()
    # Each pump's NPSHr, 1.5 + 0.004 q^2, is 1.5 + 0.001 Q^2 in the total flow Q: between
    # points 10 L/s apart the chord lies above it by s^2|N''|/8 = 0.025 m at most.
    assert h - 1e-3 <= np.interp(q, *npshr.get_data()) <= h + 0.025 + 1e-3
    eff = _line(top, "efficiency of each pump")
    (qe,), (e,) = _line(top, "operating point").get_data()
    assert qe == q and np.interp(qe, *eff.get_data()) == pytest.approx(e, abs=1.0)
    bep = _line(top, "BEP flow").get_xdata()[0]
    assert bep == pytest.approx(
        2 * parallel["results"]["operating_region"]["bep_flow"]["value"] * 1e3
    )
    assert "each pump's NPSH required is drawn at the total flow" in fig.title


def test_npsh_chart_of_pumps_in_series_keeps_the_flow(series) -> None:
    ax = charts.npsh(series).figure.axes[1]
    assert ax.get_xlabel() == "Flow through the 2 pumps in series [L/s]"
    npshr = _line(ax, "NPSH required of the first pump (pump data)")
    assert list(npshr.get_xdata()) == pytest.approx(
        list(_l_s(series["results"]["pump_curve"]["flow"]))
    )


# -- the sketch -------------------------------------------------------------------------------


def _pumps_drawn(fig: Any) -> list[tuple[float, float, str]]:
    """Each pump symbol's triangle: its page position and colour."""
    from matplotlib.colors import to_hex

    ax = fig.axes[0]
    out = []
    for line in ax.lines:
        if line.get_marker() == ">":
            x, y = line.get_transform().transform(np.asarray(line.get_xydata()))[0]
            out.append((float(x), float(y), to_hex(line.get_markerfacecolor())))
    return out


def _dashed_rings(fig: Any) -> int:
    return sum(
        1
        for line in fig.axes[0].lines
        if len(line.get_xdata()) > 20 and line.get_linestyle() not in ("-", "None")
    )


def _texts(fig: Any) -> list[str]:
    return [t.get_text() for t in fig.axes[0].texts]


def test_sketch_draws_the_parallel_pumps_one_above_another_with_the_standby_marked(parallel):
    fig = charts.sketch(parallel).figure
    pumps = _pumps_drawn(fig)
    assert len(pumps) == 3  # 2 duty and 1 standby
    assert len({round(x, 3) for x, _, _ in pumps}) == 1  # one above another
    ys = sorted(y for _, y, _ in pumps)
    assert min(np.diff(ys)) > 14.0  # apart on the page, in points
    colours = [c for _, _, c in sorted(pumps, key=lambda p: -p[1])]
    assert colours[:2] == ["#222222", "#222222"] and colours[2] != "#222222"  # the lowest
    assert _dashed_rings(fig) == 1
    texts = _texts(fig)
    assert "standby" in texts
    assert any(t.startswith("2 duty pumps in parallel") for t in texts)
    assert "standby dashed" in charts.sketch(parallel).title


def test_sketch_draws_pumps_in_series_one_after_another(series) -> None:
    fig = charts.sketch(series).figure
    pumps = _pumps_drawn(fig)
    assert len(pumps) == 2 and len({round(y, 3) for _, y, _ in pumps}) == 1
    assert abs(pumps[1][0] - pumps[0][0]) > 14.0
    assert _dashed_rings(fig) == 0 and "standby" not in _texts(fig)
    assert any(t.startswith("2 pumps in series") for t in _texts(fig))


@pytest.mark.parametrize("count, standby", [(6, 2), (4, 0)])
def test_sketch_of_many_parallel_pumps_stays_readable(count: int, standby: int) -> None:
    from matplotlib.text import Text

    # The pump datum 3 m below the source level, the lowest point of the sketch.
    trace = _trace(f"count = {count}\nstandby = {standby}\n", flow="60 L/s", datum="-3 m")
    fig = charts.sketch(trace).figure
    pumps = _pumps_drawn(fig)
    assert len(pumps) == count and _dashed_rings(fig) == standby
    ax_box = fig.axes[0].get_window_extent()
    ys = sorted(y for _, y, _ in pumps)
    # Whole symbols (half the pitch either way) inside the axes, the datum low in the chart.
    assert min(np.diff(ys)) >= 12.0
    assert ax_box.y0 < ys[0] - 6.0 and ys[-1] + 6.0 < ax_box.y1
    renderer = fig._get_renderer()
    boxes = [Text.get_window_extent(t, renderer) for t in fig.axes[0].texts if t.get_text()]
    for i, a in enumerate(boxes):
        for b in boxes[i + 1 :]:
            assert not a.overlaps(b) or min(a.x1, b.x1) - max(a.x0, b.x0) <= 0.5


# -- legends fit their plots ------------------------------------------------------------------


def _legend_fits(fig: Any) -> None:
    renderer = fig._get_renderer()
    for ax in fig.axes:
        legend = ax.get_legend()
        if legend is not None:
            assert legend.get_window_extent(renderer).height <= ax.bbox.height


@pytest.mark.parametrize("name", ["system_curve", "npsh"])
def test_legends_of_several_pumps_fit_their_plots(parallel, name: str) -> None:
    _legend_fits(getattr(charts, name)(parallel).figure)


def test_a_crowded_legend_makes_the_chart_taller_rather_than_the_plot_flat(parallel) -> None:
    trace = copy.deepcopy(parallel)
    r = trace["results"]
    for k in range(10, 30):  # twenty more cases, each with a curve of its own
        curve = copy.deepcopy(r["system_curve"])
        curve["head"]["value"] = [h + 0.3 * k for h in curve["head"]["value"]]
        r["cases"][f"C{k}"] = {"system_curve": curve}
    fig = charts.system_curve(trace)
    assert fig.height_pt > 3.4 * 72
    _legend_fits(fig.figure)
