"""The report's charts: vector PDF pages from a trace, deterministic, in the report's units.

Every chart is drawn once per example trace (module fixtures) and the
tests read those drawings: the PDF bytes, the caption, and the matplotlib
figure kept on ``Figure.figure``. Charts must work when the trace lacks the
optional keys (pump curve, operating point, route elevations, equipment
losses, other cases) and must keep every label on the page.
"""

from __future__ import annotations

import copy
import io
import json
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest

from calcreport.model.loader import load, loads
from calcreport.report import charts
from calcreport.solver import solve

ROOT = Path(__file__).parents[2]
EXAMPLES = {
    "si": ROOT / "input_examples" / "reservoir_fill_si.toml",
    "us": ROOT / "input_examples" / "process_transfer_us.toml",
    "check": ROOT / "input_examples" / "check_case.toml",
    "cooling": ROOT / "input_examples" / "cooling_water_selected_pump.toml",
    "offers": ROOT / "input_examples" / "pump_offers.toml",
}
NAMES = charts.FIGURES
WIDTH_PT = 6.3 * 72

# Ten pipes with a suction lift: the busiest sketch and friction chart we expect.
TEN_PIPES = """
format = 1
[project]
units = "SI"
[fluid]
temperature = "20 degC"
[duty]
flow = "15 L/s"
[source]
level = "10 m"
level_low = "9 m"
[destination]
level = "60 m"
[pump]
elevation = "14 m"
efficiency = 0.7
""" + "".join(
    f"""
[[pipe]]
id = "{side[0].upper()}{i}"
side = "{side}"
length = "{length} m"
inner_diameter = "{diameter} mm"
roughness = "0.045 mm"
fittings = [{{ K = 0.5 }}]
"""
    for side, i, length, diameter in [("suction", 1, 4, 150), ("suction", 2, 2.5, 125)]
    + [("discharge", i, 50 * i, 100 + 5 * i) for i in range(1, 9)]
)


def _trace_of(model: Any) -> dict[str, Any]:
    return json.loads(solve(model).dumps())


@pytest.fixture(scope="module")
def traces() -> dict[str, dict[str, Any]]:
    out = {key: _trace_of(load(path)) for key, path in EXAMPLES.items()}
    out["ten"] = _trace_of(loads(TEN_PIPES.encode(), "<ten pipes>"))
    return out


class _Applicable(dict):
    """Charts by (example, name); a chart the example's input does not call for is skipped."""

    def __missing__(self, key: tuple[str, str]) -> Any:
        pytest.skip(f"the {key[1]} chart does not apply to the {key[0]} example")


@pytest.fixture(scope="module")
def drawn(traces: dict[str, dict[str, Any]]) -> dict[tuple[str, str], charts.Figure]:
    """Every chart of the three examples that applies, through the public functions."""
    return _Applicable(
        {
            (key, name): getattr(charts, name)(traces[key])
            for key in EXAMPLES
            for name in NAMES
            if charts.applies(name, traces[key])
        }
    )


@pytest.fixture(scope="module")
def figures(traces, drawn) -> dict[tuple[str, str], Any]:
    """The matplotlib figures: the examples' as saved, the ten-pipe case drawn only."""
    out = _Applicable({key: fig.figure for key, fig in drawn.items()})
    for name in NAMES:
        if charts.applies(name, traces["ten"]):
            out["ten", name] = charts._draw_only(name, traces["ten"])[0]
    return out


def _texts(fig: Any) -> list[str]:
    """Every non-empty text of a matplotlib figure, tick labels included."""
    from matplotlib.text import Text

    return [t.get_text() for t in fig.findobj(Text) if t.get_visible() and t.get_text()]


def _pdf_text(pdf: bytes) -> str:
    from pypdf import PdfReader

    reader = PdfReader(io.BytesIO(pdf))
    assert len(reader.pages) == 1
    return reader.pages[0].extract_text()


# -- the Figure record -------------------------------------------------------------------


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("key", list(EXAMPLES))
def test_every_chart_is_a_one_page_pdf_of_report_width(drawn, key: str, name: str) -> None:
    fig = drawn[key, name]
    assert isinstance(fig, charts.Figure)
    assert fig.pdf.startswith(b"%PDF") and len(fig.pdf) > 1000
    assert fig.pdf.rstrip().endswith(b"%%EOF")
    assert fig.width_pt == pytest.approx(WIDTH_PT)
    assert 3.2 * 72 - 1e-9 <= fig.height_pt <= 5.0 * 72 + 1e-9  # two panels at most
    assert fig.title.strip() and "\n" not in fig.title
    assert not fig.title.lower().startswith("figure")
    assert fig.figure is not None
    assert tuple(fig.figure.get_size_inches() * 72) == pytest.approx((fig.width_pt, fig.height_pt))


def test_figure_refuses_what_is_not_a_pdf() -> None:
    with pytest.raises(ValueError, match="PDF"):
        charts.Figure(pdf=b"<svg/>", width_pt=10, height_pt=10, title="x")
    with pytest.raises(ValueError, match="title"):
        charts.Figure(pdf=b"%PDF-1.4", width_pt=10, height_pt=10, title="")


def test_figures_lists_every_public_chart() -> None:
    assert set(NAMES) == {
        "sketch",
        "system_curve",
        "npsh",
        "profile",
        "loss_breakdown",
        "friction_factor",
        "route_pressure",
        "energy",
        "candidates",
        "pipe_sizes",
        "tornado",
    }
    assert set(NAMES) <= set(charts.__all__)


def test_optional_charts_apply_only_where_the_trace_holds_their_data(traces) -> None:
    # The demo has a route with elevations but no duty profile; the check case neither; the
    # cooling-water example both.
    assert charts.applies("route_pressure", traces["si"])
    assert not charts.applies("energy", traces["si"])
    assert not charts.applies("route_pressure", traces["check"])
    assert charts.applies("energy", traces["cooling"])
    assert charts.applies("route_pressure", traces["cooling"])
    assert charts.applies("candidates", traces["offers"])
    assert not charts.applies("candidates", traces["cooling"])


def _applicable(traces: dict[str, dict[str, Any]], name: str) -> str:
    """The first example whose trace the chart applies to."""
    return next(key for key in ("us", *EXAMPLES) if charts.applies(name, traces[key]))


# -- deterministic bytes -------------------------------------------------------------------


@pytest.mark.parametrize("name", NAMES)
def test_same_trace_gives_the_same_bytes(traces, drawn, name: str) -> None:
    key = _applicable(traces, name)
    again = getattr(charts, name)(copy.deepcopy(traces[key]))
    assert again.pdf == drawn[key, name].pdf
    assert again.title == drawn[key, name].title


def test_pdf_has_no_date_or_producer(drawn) -> None:
    pdf = drawn["si", "system_curve"].pdf
    assert b"/CreationDate" not in pdf
    assert b"/Producer" not in pdf
    assert b"/Creator" not in pdf


def test_fonts_are_embedded_as_truetype(drawn) -> None:
    pdf = drawn["si", "loss_breakdown"].pdf
    assert b"/FontFile2" in pdf  # Type 42: TrueType outlines, text stays text
    assert b"/Type3" not in pdf


# -- units on the axes -----------------------------------------------------------------------


def test_us_traces_print_us_units(drawn) -> None:
    fig = drawn["us", "system_curve"].figure
    ax = fig.axes[0]
    assert ax.get_xlabel() == "Flow [gpm]"
    assert ax.get_ylabel() == "Head [ft]"
    text = _pdf_text(drawn["us", "system_curve"].pdf)
    assert "gpm" in text and "L/s" not in text
    assert drawn["us", "npsh"].figure.axes[0].get_xlabel() == "Flow [gpm]"
    assert drawn["us", "profile"].figure.axes[0].get_xlabel() == "Distance along route [ft]"
    assert drawn["us", "loss_breakdown"].figure.axes[0].get_xlabel() == "Head [ft]"
    assert drawn["us", "sketch"].figure.axes[0].get_ylabel() == "Elevation [ft]"
    sketch = " ".join(_texts(drawn["us", "sketch"].figure))
    assert "ID 6.065 in" in sketch and "L 640 ft" in sketch  # as entered
    assert "psig" in sketch  # the pressurised destination, gauge


def test_si_traces_print_si_units(drawn) -> None:
    ax = drawn["si", "system_curve"].figure.axes[0]
    assert (ax.get_xlabel(), ax.get_ylabel()) == ("Flow [L/s]", "Head [m]")
    text = _pdf_text(drawn["si", "system_curve"].pdf)
    assert "L/s" in text and "gpm" not in text
    sketch = " ".join(_texts(drawn["si", "sketch"].figure))
    assert "ID 202.7 mm" in sketch and "L 600 m" in sketch


def test_labels_carry_the_trace_values(traces, drawn) -> None:
    # 28 L/s in the SI example at the trace's TDH; the chart prints 3 significant figures.
    r = traces["si"]["results"]
    assert r["flow"]["value"] == pytest.approx(0.028)
    tdh = f"{r['total_dynamic_head']['value']:.3g}"
    texts = " ".join(_texts(drawn["si", "system_curve"].figure))
    assert f"28.0 L/s, TDH {tdh} m" in texts
    assert f"TDH {tdh} m" in drawn["si", "system_curve"].title
    assert f"TDH = {tdh} m" in drawn["si", "loss_breakdown"].title
    assert "where they are taken" in drawn["si", "profile"].title


def test_every_pipe_is_labelled(traces, drawn) -> None:
    for key in ("si", "us", "check"):
        ids = traces[key]["results"]["pipes"]
        for name in ("profile", "friction_factor", "sketch", "loss_breakdown"):
            texts = " ".join(_texts(drawn[key, name].figure))
            for pid in ids:
                assert pid in texts, (key, name, pid)


# -- layout: nothing off the page, labels do not collide ---------------------------------------


def _placed_texts(fig: Any) -> list[Any]:
    """The texts the charts place themselves: annotations, notes, legends, axis labels."""
    out = list(fig.texts)
    for ax in fig.axes:
        out += ax.texts
        out += [ax.xaxis.label, ax.yaxis.label]
        legend = ax.get_legend()
        if legend is not None:
            out += legend.get_texts()
    return [t for t in out if t.get_visible() and t.get_text().strip()]


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("key", ["si", "us", "check", "ten"])
def test_labels_stay_on_the_page_and_apart(figures, key: str, name: str) -> None:
    from matplotlib.text import Annotation, Text

    fig = figures[key, name]
    renderer = fig._get_renderer()
    page = fig.bbox
    boxes = []
    for t in _placed_texts(fig):
        if isinstance(t, Annotation):
            t.update_positions(renderer)
        bb = Text.get_window_extent(t, renderer)  # an annotation's text, not its leader
        assert bb.x0 >= page.x0 - 0.5 and bb.x1 <= page.x1 + 0.5, (t.get_text(), bb)
        assert bb.y0 >= page.y0 - 0.5 and bb.y1 <= page.y1 + 0.5, (t.get_text(), bb)
        boxes.append((t.get_text(), bb))
    for i, (a, box_a) in enumerate(boxes):
        for b, box_b in boxes[i + 1 :]:
            overlap_w = min(box_a.x1, box_b.x1) - max(box_a.x0, box_b.x0)
            overlap_h = min(box_a.y1, box_b.y1) - max(box_a.y0, box_b.y0)
            assert overlap_w <= 0.5 or overlap_h <= 0.5, (a, b)


# -- optional keys ----------------------------------------------------------------------------


def _strip_optional(trace: dict[str, Any]) -> dict[str, Any]:
    t = copy.deepcopy(trace)
    r = t["results"]
    r.pop("cases", None)
    r.pop("operating_point", None)
    r.pop("pump_curve", None)
    for p in r["pipes"].values():
        for key in ("equipment_loss", "elevation_start", "elevation_end", "fitting_loss"):
            p.pop(key, None)
    for node in r["profile"]["nodes"][1:-1]:  # the pipe ends; the surfaces stay
        node["elevation"] = None
    t["given"] = {}
    t.pop("cases", None)
    return t


@pytest.mark.parametrize("name", NAMES)
def test_charts_work_without_the_optional_keys(traces, name: str) -> None:
    fig = getattr(charts, name)(_strip_optional(traces[_applicable(traces, name)]))
    assert fig.pdf.startswith(b"%PDF") and fig.title


def test_pump_curve_and_operating_point_are_drawn_when_given(traces) -> None:
    t = copy.deepcopy(traces["si"])
    r = t["results"]
    flows = [0.0, 0.01, 0.02, 0.03, 0.04]
    r["pump_curve"] = {
        "flow": {"value": flows, "unit": "m^3/s"},
        "head": {"value": [70.0, 68.0, 63.0, 55.0, 44.0], "unit": "m"},
        "npsh_required": {"value": [1.5, 2.0, 2.8, 4.0, 5.6], "unit": "m"},
    }
    r["operating_point"] = {
        "flow": {"value": 0.0305, "unit": "m^3/s"},
        "head": {"value": 54.5, "unit": "m"},
        "npsh_required": {"value": 4.1, "unit": "m"},
    }
    curve = charts.system_curve(t)
    legend = [x.get_text() for x in curve.figure.axes[0].get_legend().get_texts()]
    assert "pump curve" in legend and "operating point" in legend
    assert "operating point" in curve.title
    assert "end of pump curve" in legend
    end = next(x for x in curve.figure.axes[0].lines if x.get_label() == "end of pump curve")
    assert list(end.get_xdata()) == [40.0] and list(end.get_ydata()) == [44.0]  # L/s, m
    npsh = charts.npsh(t)
    legend = [x.get_text() for x in npsh.figure.axes[0].get_legend().get_texts()]
    assert "NPSH required (pump data)" in legend
    assert len(npsh.figure.axes) == 1  # no efficiency in the pump data: no efficiency panel


def test_npsh_chart_adds_efficiency_and_the_margin_line_from_the_trace(traces) -> None:
    t = copy.deepcopy(traces["si"])
    r = t["results"]
    r["pump_curve"] = {
        "flow": {"value": [0.0, 0.02, 0.04], "unit": "m^3/s"},
        "head": {"value": [70.0, 63.0, 44.0], "unit": "m"},
        "efficiency": {"value": [0.0, 0.78, 0.6], "unit": ""},
        "npsh_required": {"value": [1.5, 2.8, 5.6], "unit": "m"},
        "npsh_needed": {"value": [2.1, 3.4, 6.2], "unit": "m"},
    }
    r["operating_point"] = {
        "flow": {"value": 0.03, "unit": "m^3/s"},
        "head": {"value": 55.0, "unit": "m"},
        "efficiency": {"value": 0.74, "unit": ""},
        "npsh_required": {"value": 4.1, "unit": "m"},
    }
    fig = charts.npsh(t)
    top, bottom = fig.figure.axes
    assert top.get_ylabel() == "Efficiency [%]" and bottom.get_ylabel().startswith("NPSH")
    eff = next(x for x in top.lines if x.get_label() == "pump efficiency")
    assert list(eff.get_ydata()) == pytest.approx([0.0, 78.0, 60.0])
    op = next(x for x in top.lines if x.get_label() == "operating point")
    assert list(op.get_ydata()) == pytest.approx([74.0])
    needed = next(x for x in bottom.lines if "margin criterion" in x.get_label())
    assert list(needed.get_ydata()) == [2.1, 3.4, 6.2]  # drawn as traced, not recomputed
    labels = [x.get_text() for x in top.get_legend().get_texts()]
    assert len(labels) == len(set(labels)) and "NPSH available" in " ".join(labels)
    assert fig.title.startswith("Pump efficiency (above) and NPSH available")


def test_other_cases_with_their_own_curve_are_drawn(traces) -> None:
    t = copy.deepcopy(traces["check"])
    other = copy.deepcopy(t["results"]["system_curve"])
    other["head"]["value"] = [h + 1.5 for h in other["head"]["value"]]
    t["results"]["cases"]["C2"] = {"system_curve": other}
    t["cases"].append({"id": "C2", "title": "Low source level"})
    fig = charts.system_curve(t)
    legend = [x.get_text() for x in fig.figure.axes[0].get_legend().get_texts()]
    assert "system curve, C2" in legend
    assert "C2: Low source level" in fig.title


def test_missing_required_results_say_what_is_missing(traces) -> None:
    t = copy.deepcopy(traces["check"])
    del t["results"]["system_curve"]
    with pytest.raises(ValueError, match="system_curve"):
        charts.system_curve(t)
    with pytest.raises(ValueError, match="results"):
        charts.profile({"project": {"units": "SI"}})


# -- no global state, no matplotlib on the solve path -------------------------------------------


def test_drawing_leaves_matplotlib_settings_alone(traces) -> None:
    import matplotlib

    before = dict(matplotlib.rcParams)
    charts.loss_breakdown(traces["check"])
    assert dict(matplotlib.rcParams) == before


def test_importing_the_charts_module_does_not_import_matplotlib() -> None:
    code = (
        "import sys, calcreport.report.charts, calcreport.solver; "
        "sys.exit('matplotlib' in sys.modules or 'matplotlib.pyplot' in sys.modules)"
    )
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert result.returncode == 0, result.stderr


def test_pyplot_is_never_used(drawn) -> None:
    assert "matplotlib.pyplot" not in sys.modules or all(
        fig.figure.canvas.manager is None for fig in drawn.values()
    )


def test_route_pressure_chart_shows_ratings_high_points_and_grade_lines(traces, drawn) -> None:
    fig = drawn["si", "route_pressure"].figure
    legend = [t.get_text() for t in fig.axes[0].get_legend().get_texts()]
    for label in ("pipe centreline", "highest grade line", "rating, as a grade line"):
        assert label in legend
    assert "high point (air valve)" in legend and any("downsurge" in x for x in legend)
    # The highest grade line is drawn through the trace's values, point by point.
    route = traces["si"]["results"]["route"]
    top = next(line for line in fig.axes[0].get_lines() if line.get_label() == "highest grade line")
    expected = [n["max_grade"]["value"] for n in route["nodes"] if "min_grade" in n]
    assert list(top.get_ydata()) == pytest.approx(expected)


def test_energy_chart_has_a_bar_and_a_cost_per_profile_point(traces, drawn) -> None:
    fig = drawn["cooling", "energy"].figure
    rows = traces["cooling"]["results"]["energy"]["profile"]
    bars = fig.axes[0].patches
    assert len(bars) == len(rows)
    heights = [b.get_height() for b in bars]
    assert heights == pytest.approx([r["electrical_power"]["value"] / 1e3 for r in rows])
    texts = " ".join(_texts(fig))
    for r in rows:
        assert f"{r['hours']:,.0f} h/yr" in texts
    cost = fig.axes[1].get_lines()[0].get_ydata()
    assert list(cost) == pytest.approx([r["annual_cost"]["value"] for r in rows])
