"""The report's fast paths give what the plain ways give.

The label placer scores every candidate at once from one text layout, the
loss chart draws its bars in one call, the layout is frozen without a draw,
and an equation sets its font only where the face changes. Each test here
checks a fast path against the plain computation it replaces.
"""

from __future__ import annotations

import io
import itertools
import math
import re
from types import SimpleNamespace
from typing import Any

import numpy as np
import pytest

from calcreport.report.charts import base, losses_chart, placement


@pytest.fixture
def rc():
    """The charts' matplotlib settings, as every chart is drawn under them."""
    import matplotlib

    with matplotlib.rc_context(base._RC):
        yield


def _axes(log: bool = False) -> tuple[Any, Any]:
    fig = base._new_figure(3.0)
    ax = fig.add_subplot()
    if log:
        ax.set_xscale("log")
        ax.set_yscale("log")
        ax.set_xlim(1e3, 1e7)
        ax.set_ylim(0.008, 0.1)
    else:
        ax.set_xlim(0, 100)
        ax.set_ylim(0, 50)
    ax.set_xlabel("x")
    ax.set_ylabel("y")
    return fig, ax


def _extent(ann: Any, renderer: Any) -> Any:
    """The box matplotlib itself reports for an annotation's text."""
    from matplotlib.text import Text

    ann.update_positions(renderer)
    return Text.get_window_extent(ann, renderer).extents


# -- candidate boxes ------------------------------------------------------------------------


@pytest.mark.parametrize("log", [False, True])
def test_candidate_boxes_are_the_boxes_matplotlib_reports(rc, log: bool) -> None:
    fig, ax = _axes(log)
    placer = placement._Placer(fig, ax)
    anchor, other = ((3e4, 0.02), (2e6, 0.05)) if log else ((30.0, 20.0), (90.0, 45.0))
    ann = ax.annotate(
        "pump\nTDH 50.2 m",
        xy=anchor,
        xytext=(0, 0),
        textcoords="offset points",
        annotation_clip=False,
        multialignment="center",
    )
    # Every alignment (dx and dy below, about and above the 0.5 pt dead band), another anchor.
    options = [(anchor, (dx, dy)) for dx in (-12.0, 0.3, 7.5) for dy in (-9.0, 0.0, 14.0)]
    options.append((other, (-2.0, 3.0)))
    boxes, anchors = placer._candidate_boxes(ann, options)
    renderer = fig._get_renderer()
    for (xy, (dx, dy)), box, at in zip(options, boxes, anchors, strict=True):
        ann.xy = xy
        placer._set_offset(ann, dx, dy)
        np.testing.assert_allclose(box, _extent(ann, renderer), rtol=0, atol=1e-9)
        np.testing.assert_allclose(at, ax.transData.transform(xy), rtol=0, atol=1e-9)


# -- segments crossing boxes ------------------------------------------------------------------


def _cross(o: Any, a: Any, b: Any) -> float:
    return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])


def _crosses(seg: Any, box: Any) -> bool:
    """A segment meets a box: an end inside, or it crosses an edge (orientation tests)."""
    p, q = seg[:2], seg[2:]
    x0, y0, x1, y1 = box
    if any(x0 <= x <= x1 and y0 <= y <= y1 for x, y in (p, q)):
        return True
    corners = [(x0, y0), (x1, y0), (x1, y1), (x0, y1)]
    for a, b in zip(corners, corners[1:] + corners[:1], strict=True):
        if _cross(p, q, a) * _cross(p, q, b) < 0 and _cross(a, b, p) * _cross(a, b, q) < 0:
            return True
    return False


def test_segments_hit_agrees_with_edge_crossing_tests() -> None:
    rng = np.random.default_rng(8)
    seg = rng.uniform(0, 100, (300, 4))
    seg[:20, 2] = seg[:20, 0]  # vertical
    seg[20:40, 3] = seg[20:40, 1]  # horizontal
    corner = rng.uniform(0, 90, (60, 2))
    boxes = np.hstack([corner, corner + rng.uniform(1, 25, (60, 2))])
    hit = placement._segments_hit(seg, boxes)
    assert hit.shape == (60, 300)
    expected = [[_crosses(s, b) for s in seg] for b in boxes]
    assert hit.tolist() == expected
    assert 0 < hit.sum() < hit.size


def test_segments_hit_with_no_segments() -> None:
    assert placement._segments_hit(np.empty((0, 4)), [(0, 0, 1, 1)]).shape == (1, 0)


def test_scores_count_every_obstacle_as_one_candidate_at_a_time_would(rc) -> None:
    fig, ax = _axes()
    placer = placement._Placer(fig, ax)
    rng = np.random.default_rng(3)
    for _ in range(30):  # lines all over the axes, most far from the label
        placer.add_polyline(rng.uniform((0, 0), (100, 50), (4, 2)))
    x0, y0, x1, y1 = placer.frame
    ax_, ay = ax.transData.transform((95, 25))
    for cx in np.arange(ax_ - 95, ax_ + 95, 7.3):  # small boxes all round the candidates
        for cy in np.arange(ay - 60, ay + 60, 5.1):
            placer.boxes.append((cx, cy, cx + 1.5, cy + 1.0))
    ann = ax.annotate("D12  L 60 m\nID 202.7 mm", (95, 25), (0, 0), textcoords="offset points")
    options = [((95.0, 25.0), o) for o in placement._ring((7, 12, 20, 28, 38), [(0, 5)])]
    boxes, _ = placer._candidate_boxes(ann, options)
    scores = placer._scores(boxes, inside=True)
    p = placer.pad
    for box, score in zip(boxes, scores, strict=True):
        padded = box + (-p, -p, p, p)
        expected = float(placement._segments_hit(placer.segments, padded).sum())
        expected += 10.0 * sum(placement._overlap(padded, other) for other in placer.boxes)
        outside = box[0] < x0 or box[1] < y0 or box[2] > x1 or box[3] > y1
        assert score == expected + 20.0 * outside
    assert len(set(scores.tolist())) > 3  # the candidates differ: the test sees something


def test_a_rival_nearer_than_the_anchor_counts_against_a_place() -> None:
    boxes = np.array([(10.0, 0.0, 20.0, 5.0), (-20.0, 0.0, -10.0, 5.0), (200.0, 0.0, 210.0, 5.0)])
    anchors = np.array([(0.0, 0.0), (0.0, 0.0), (205.0, -4.0)])
    rivals = np.array([(25.0, 2.0), (1e6, 1e6), (np.nan, 0.0), (30.0, np.inf)])
    near = placement._nearer_to_rival(boxes, anchors, rivals)
    assert near.tolist() == [True, False, False]  # 5 pt from the rival, 10 pt from the anchor
    assert not placement._nearer_to_rival(boxes, anchors, rivals[1:]).any()


# -- placement --------------------------------------------------------------------------------


def test_place_keeps_the_first_of_the_best_candidates(rc) -> None:
    fig, ax = _axes()
    placer = placement._Placer(fig, ax)
    ann = placer.place("first", (50, 25), [(0, 5), (0, -8)])
    assert tuple(ann.xyann) == (0, 5)
    x, y = ax.transData.transform((50, 25))
    placer.boxes.append((x - 30, y, x + 30, y + 30))  # covers the place above the point
    ann = placer.place("second", (50, 25), [(0, 5), (0, -8)])
    assert tuple(ann.xyann) == (0, -8)
    assert ann.get_verticalalignment() == "top"


def test_labels_along_a_busy_line_keep_off_it_and_apart(rc) -> None:
    from matplotlib.text import Text

    fig, ax = _axes()
    x = np.linspace(2, 98, 17)
    ax.plot(x, 0.45 * x + 2, marker="o", ms=3)
    placer = placement._Placer(fig, ax)
    placer.add_lines()
    anns = [
        placer.place(
            f"D{i}", (xi, 0.45 * xi + 2), [(0, 5), (0, -8)] + placement._ring((12, 20, 30))
        )
        for i, xi in enumerate(x, start=1)
    ]
    renderer = fig._get_renderer()
    boxes = [_extent(a, renderer) for a in anns]
    line = placer.segments[: len(x) - 1]
    for i, box in enumerate(boxes):
        assert not placement._segments_hit(line, box).any(), anns[i].get_text()
        for other in boxes[i + 1 :]:
            assert not placement._overlap(box, other), anns[i].get_text()
    assert all(isinstance(a, Text) for a in anns)


# -- clusters ---------------------------------------------------------------------------------


def _clusters_brute_force(points: list[tuple[float, float]], within: float) -> list[list[int]]:
    group = list(range(len(points)))

    def root(i: int) -> int:
        while group[i] != i:
            i = group[i]
        return i

    for i in range(len(points)):
        for j in range(i + 1, len(points)):
            if math.dist(points[i], points[j]) < within:
                group[root(j)] = root(i)
    out: dict[int, list[int]] = {}
    for i in range(len(points)):
        out.setdefault(root(i), []).append(i)
    return list(out.values())


def test_clusters_are_the_groups_of_comparing_every_pair() -> None:
    from matplotlib.transforms import IdentityTransform

    rng = np.random.default_rng(5)
    points = [tuple(p) for p in rng.uniform(0, 120, (150, 2))]
    points += [(200 + 5.5 * k, 200 + 0.5 * k) for k in range(12)]  # a chain across cells
    points += [(6.0, 300.0), (12.0, 300.0), (-0.1, -0.1), (0.1, 0.1)]  # on cell edges
    points += [(math.inf, 5.0), (math.nan, 5.0), (-math.inf, -math.inf)]
    ax = SimpleNamespace(transData=IdentityTransform())
    assert placement._clusters(ax, points, 6.0) == _clusters_brute_force(points, 6.0)
    assert placement._clusters(ax, [], 6.0) == []


# -- layout and bars --------------------------------------------------------------------------


def test_frozen_layout_is_the_layout_a_draw_gives(rc) -> None:
    frozen, ax = _axes(log=True)
    drawn, ax2 = _axes(log=True)
    for a in (ax, ax2):
        a.plot([2e3, 5e6], [0.01, 0.05], label="a line with a long legend entry")
        base._legend_above(a)
    base._freeze_layout(frozen)
    drawn.draw_without_rendering()
    assert ax.get_position().bounds == ax2.get_position().bounds
    renderer, renderer2 = frozen._get_renderer(), drawn._get_renderer()
    (entry,), (entry2,) = ax.get_legend().get_texts(), ax2.get_legend().get_texts()
    assert entry.get_window_extent(renderer).bounds == entry2.get_window_extent(renderer2).bounds
    assert frozen.get_layout_engine() is None or not frozen.get_layout_engine().adjust_compatible


def _q(value: float) -> dict[str, Any]:
    return {"value": value, "unit": "m"}


def test_loss_breakdown_bars_are_the_parts_row_by_row(rc) -> None:
    trace = {
        "project": {"units": "SI"},
        "results": {
            "total_dynamic_head": _q(31.0),
            "static_head": _q(20.0),
            "pressure_head": _q(-2.0),
            "pipes": {
                "S1": {"side": "suction", "friction_loss": _q(1.0), "fitting_loss": _q(0.5)},
                "D1": {
                    "side": "discharge",
                    "friction_loss": _q(6.0),
                    "fitting_loss": _q(2.0),
                    "equipment_loss": _q(3.0),
                },
                "D2": {"friction_loss": _q(0.25), "minor_loss": _q(0.25)},
            },
        },
    }
    fig, _ = losses_chart._draw_loss_breakdown(trace)
    from matplotlib.colors import to_rgba

    bars = [
        (round(p.get_y() + p.get_height() / 2), p.get_x(), p.get_width(), p.get_facecolor(),
         p.get_hatch())
        for p in fig.axes[0].patches
    ]  # fmt: skip
    blue, tan, green = to_rgba(base.BLUE), to_rgba("#e7c3a8"), to_rgba("#c8dbb8")
    assert bars == [
        (0, 0.0, 20.0, to_rgba("#9a9a9a"), None),
        (1, 0.0, -2.0, to_rgba("#c8c8c8"), None),
        (2, 0.0, 1.0, blue, None),
        (2, 1.0, 0.5, tan, "////"),
        (3, 0.0, 6.0, blue, None),
        (3, 6.0, 2.0, tan, "////"),
        (3, 8.0, 3.0, green, "xxxx"),
        (4, 0.0, 0.25, blue, None),
        (4, 0.25, 0.25, tan, "////"),
    ]


# -- equations --------------------------------------------------------------------------------


def test_equation_sets_its_font_once_a_face_and_places_every_glyph() -> None:
    from reportlab.pdfgen.canvas import Canvas

    from calcreport.report.mathtext import Equation

    eq = Equation(r"h_f = f\,\frac{L}{D}\,\frac{v^2}{2 g}", 10.5)
    canvas = Canvas(io.BytesIO(), pageCompression=0)
    eq.wrap(400, 100)
    eq.drawOn(canvas, 50, 50)
    code = canvas._code  # the page's operators so far
    text = "\n".join(code)
    faces = [(font, size) for font, size, *_ in eq.glyphs]
    runs = 1 + sum(a != b for a, b in itertools.pairwise(faces))
    assert len(re.findall(r" Tf ", text)) == runs < len(faces)
    assert len(re.findall(r"\) Tj", text)) == len(eq.glyphs)
    assert Equation(eq.latex, 10.5).glyphs is eq.glyphs  # one layout per string and size


def test_equation_drawn_again_on_a_canvas_repeats_its_operators() -> None:
    from reportlab.pdfgen.canvas import Canvas

    from calcreport.report.mathtext import Equation

    def drawn(canvas: Any, latex: str) -> str:
        eq = Equation(latex, 10.5)
        eq.wrap(400, 100)
        before = len(canvas._code)
        eq.drawOn(canvas, 50, 50)
        return "\n".join(canvas._code[before:])

    first = Canvas(io.BytesIO(), pageCompression=0)
    once = drawn(first, r"v = \frac{4\,Q}{\pi D^2}")
    drawn(first, r"Re = \frac{\rho\, v\, D}{\mu}")
    assert drawn(first, r"v = \frac{4\,Q}{\pi D^2}") == once
    fresh = Canvas(io.BytesIO(), pageCompression=0)  # another canvas sets its glyphs anew
    assert drawn(fresh, r"v = \frac{4\,Q}{\pi D^2}") == once
    fresh.showPage()
    pdf = fresh.getpdfdata()
    assert b"/FontFile2" in pdf  # the glyphs' font is embedded in the new document


# -- equation layouts kept between builds -------------------------------------------------


@pytest.fixture
def fresh_layouts(tmp_path, monkeypatch):
    """An empty cache folder and no layouts remembered in this process."""
    from calcreport.report import mathtext

    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path))
    monkeypatch.delenv("CALCREPORT_CACHE", raising=False)

    def clear() -> None:
        mathtext._layout.cache_clear()
        mathtext._stored.cache_clear()
        mathtext._PARSED.clear()

    clear()
    yield tmp_path
    clear()


def test_layouts_are_cached_between_builds_and_read_back_unchanged(fresh_layouts, monkeypatch):
    from calcreport.report import mathtext

    latex = r"Re = \frac{\rho v D}{\mu}"
    first = mathtext._layout(latex, 10.5)
    mathtext.save_layouts()
    files = list((fresh_layouts / "calcreport").glob("mathtext-*.json"))
    assert len(files) == 1
    # A new run: nothing remembered, and parsing would fail; the file serves the layout.
    mathtext._layout.cache_clear()
    mathtext._stored.cache_clear()

    def no_parse(*args):
        raise AssertionError("parsed again")

    monkeypatch.setattr(mathtext, "_parse", no_parse)
    assert mathtext._layout(latex, 10.5) == first


def test_layout_cache_off_writes_nothing_and_a_bad_file_is_ignored(fresh_layouts, monkeypatch):
    from calcreport.report import mathtext

    monkeypatch.setenv("CALCREPORT_CACHE", "off")
    mathtext._layout(r"H = z_d - z_s", 10.5)
    mathtext.save_layouts()
    assert not (fresh_layouts / "calcreport").exists()
    monkeypatch.delenv("CALCREPORT_CACHE")
    path = mathtext._cache_file()
    path.parent.mkdir(parents=True)
    path.write_text("{ not json", encoding="utf-8")
    mathtext._stored.cache_clear()
    assert mathtext._stored() == {}
