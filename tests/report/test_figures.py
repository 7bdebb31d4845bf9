"""Tests of the QC, summary and map figures (rendered with the Agg backend)."""

import numpy as np
import pytest

from clinometry.picking.picks import Horizon, Picks
from clinometry.report.figures import (
    FAMILY_COLORS,
    OKABE_ITO,
    map_figure,
    qc_figure,
    summary_figure,
    vertical_exaggeration,
)
from clinometry.section import make_section

mpimg = pytest.importorskip("matplotlib.image")

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"  # PNG specification (ISO/IEC 15948), from memory


def _section(domain="twt"):
    rng = np.random.default_rng(7)
    z = np.arange(0.0, 400.0, 4.0)
    return make_section(rng.normal(size=(60, z.size)).astype("float32"), z=z, domain=domain,
                        trace_spacing_m=25.0, attrs={"source_path": "demo_line.sgy"})


def _pt(trace, z, v=2500.0):
    d = trace * 25.0
    return {"trace": trace, "distance_m": d, "x": d, "y": 0.0, "z": z, "depth_m": z * v / 2000.0}


def _result():
    d = np.arange(60) * 25.0
    depth = np.where(d < 500, 100.0, np.where(d > 1000, 400.0, 100.0 + (d - 500) * 0.6))
    return {
        "schema_version": 1,
        "source": {"path": "demo_line.sgy", "n_traces": 60, "n_samples": 100, "domain": "twt"},
        "velocity": {"model": "constant", "v_m_s": 2500.0},
        "run": {"notes": []},
        "margins": [{
            "direction": "+", "family": "rimmed_shelf", "subtype": None, "confidence": 0.75,
            "reasons": ["maximum slope 31 deg is above the 10 deg rimmed-shelf threshold"],
            "platform_top": _pt(10, 80.0), "break": _pt(20, 80.0), "toe": _pt(40, 320.0),
            "relief_m": 300.0, "slope_max_deg": 31.0, "slope_mean_deg": 20.0,
            "uncertainty": {"relief_m": {"p10": 280.0, "p50": 300.0, "p90": 320.0}},
            "clinoforms": [], "trajectory": None,
            "profile": {"distance_m": d.tolist(), "depth_m": depth.tolist()},
        }],
    }


def test_vertical_exaggeration_is_vertical_over_horizontal_scale():
    # 10 km drawn 10 in wide (1 km/in), 1 km drawn 5 in high (0.2 km/in) -> VE 5
    # (ratio of scales, common practice, no source)
    assert vertical_exaggeration(10000.0, 1000.0, 10.0, 5.0) == pytest.approx(5.0)
    assert vertical_exaggeration(1000.0, 1000.0, 4.0, 4.0) == pytest.approx(1.0)


def test_palette_is_okabe_ito():
    # Okabe & Ito (2008) colour-universal-design palette (from memory)
    assert OKABE_ITO["vermillion"] == "#D55E00" and OKABE_ITO["blue"] == "#0072B2"
    assert OKABE_ITO["bluish_green"] == "#009E73" and OKABE_ITO["orange"] == "#E69F00"
    assert len(set(FAMILY_COLORS.values())) == len(FAMILY_COLORS)


def test_qc_figure_writes_a_png_with_section_profile_and_text(tmp_path):
    sec = _section()
    picks = Picks(horizons=(Horizon(0, "margin_profile", np.arange(60), np.linspace(80, 320, 60), np.ones(60)),
                            Horizon(1, "reflector", np.arange(10, 50), np.full(40, 200.0), np.ones(40))))

    class _R:  # a Result-like object: to_dict() and picks
        def __init__(self, d, p):
            self._d, self.picks = d, p

        def to_dict(self):
            return self._d

    before = sec.copy(deep=True)
    path = qc_figure(_R(_result(), picks), sec, tmp_path / "line.png")
    assert path.read_bytes()[:8] == PNG_SIGNATURE
    img = mpimg.imread(path)
    # 13 in wide; high: section 4.8 * 0.62 + one text row 2.9 + the gap between them 1.1 + top and bottom
    # 0.55 + 0.45 in; at 110 dpi
    assert img.shape[:2] == (round((4.8 * 0.62 + 2.9 + 1.1 + 0.55 + 0.45) * 110), 13 * 110)
    assert float(img[..., :3].std()) > 0.05  # not a blank canvas
    np.testing.assert_array_equal(sec.values, before.values)  # input untouched


def test_qc_figure_line_without_margin(tmp_path):
    res = _result()
    res["margins"] = []
    res["run"]["notes"] = ["no margin found on this line: flat reflectors only"]
    path = qc_figure(res, _section("depth"), tmp_path / "flat.png")
    img = mpimg.imread(path)
    assert img.shape[:2] == (round((4.8 * 0.62 + 2.9 + 1.1 + 0.55 + 0.45) * 110), 13 * 110)


def test_summary_and_map_figures(tmp_path):
    rows = [{"family": f, "slope_max_deg": s, "relief_m": r, "break_x": x, "break_y": y, "break_depth_m": dep}
            for f, s, r, x, y, dep in [("ramp", 1.0, 50.0, 0.0, 0.0, 100.0), ("ramp", 1.5, 60.0, 100.0, 0.0, 110.0),
                                       ("ramp", 0.8, 40.0, 200.0, 0.0, 120.0),
                                       ("steep_margin", 30.0, 800.0, 0.0, 500.0, None)]]
    s = summary_figure(rows, tmp_path / "summary.png")
    m = map_figure(rows, tmp_path / "map.png")
    # two families: two columns of 3.2 in plus 1 in, two rows (slope, relief) 7.4 in high, at 110 dpi
    assert mpimg.imread(s).shape[:2] == (round(7.4 * 110), round(7.4 * 110))
    assert mpimg.imread(m).shape[:2] == (round(5.2 * 110), round(12.0 * 110))


def test_summary_gives_each_family_its_own_scale():
    from clinometry.report.figures.overview import summary_axes

    rows = [{"family": "ramp", "slope_max_deg": s, "relief_m": 40.0 + s} for s in (0.4, 0.6, 0.9)]
    rows += [{"family": "steep_margin", "slope_max_deg": s, "relief_m": 800.0, "review_status": "accepted"}
             for s in (33.0, 41.0)]
    fig = summary_axes(rows)
    slope_axes = [ax for ax in fig.axes if ax.get_ylabel() == "maximum slope (°)"]
    assert [ax.get_title().split(" ")[0] for ax in slope_axes] == ["ramp", "steep_margin"]
    ramp_top, steep_top = (ax.get_ylim()[1] for ax in slope_axes)
    assert ramp_top == pytest.approx(0.9 * 1.15) and steep_top == pytest.approx(41.0 * 1.15)
    # the review decisions are named in a legend when any margin has one
    legend_texts = [t.get_text() for lg in fig.legends for t in lg.get_texts()]
    assert legend_texts == ["accepted", "not reviewed"]


def test_map_figure_without_break_coordinates_writes_nothing(tmp_path):
    assert map_figure([{"family": "ramp", "break_x": None, "break_y": None}], tmp_path / "map.png") is None
    assert not (tmp_path / "map.png").exists()


def _rejected_candidate(trace0=5):
    t = list(range(trace0, trace0 + 20))
    return {"direction": "+", "reason": "the platform top is 100 m long landward of the break (at least 250 m needed)",
            "confidence": 0.62, "steepest": {"trace": trace0 + 10, "z": 200.0, "distance_m": (trace0 + 10) * 25.0},
            "profile": {"trace": t, "z": [100.0 + 10.0 * k for k in range(20)]}}


def test_qc_figure_without_margin_lists_and_draws_the_dropped_candidates(tmp_path):
    from clinometry.report.figures.qc import _rejected_lines

    res = _result()
    res["margins"] = []
    res["run"]["rejected_candidates"] = [_rejected_candidate(5), _rejected_candidate(30)]
    path = qc_figure(res, _section(), tmp_path / "none.png")
    img = mpimg.imread(path)[..., :3]
    # the candidates are drawn in black dashes on a white halo: the section panel holds pure black pixels
    # that the grey-scale noise section alone (clipped at its 98th percentile) also has, so compare with
    # the same figure without candidates
    res_none = dict(res, run={"notes": []})
    plain = mpimg.imread(qc_figure(res_none, _section(), tmp_path / "plain.png"))[..., :3]
    assert img.shape == plain.shape
    assert np.abs(img - plain).sum() > 100  # something was drawn for the candidates
    dist_km = np.arange(60) * 0.025
    lines = _rejected_lines(res["run"]["rejected_candidates"], dist_km, 150)
    text = " ".join(lines)
    assert text.startswith("C1 at 0.38 km (trace 15), basin towards increasing traces, confidence 0.62")
    assert "C2 at 1.00 km (trace 40)" in text
    assert text.count("dropped because the platform top is 100 m long") == 2


def test_qc_text_panel_wraps_every_reason_and_says_no_source_bookkeeping(tmp_path):
    from clinometry.report.figures.qc import _margin_text

    res = _result()
    reasons = [f"reason {k}: " + "a long explanation of the rule that fired " * 3 + "(Widess 1973, from memory)"
               for k in range(6)]
    res["margins"][0]["reasons"] = reasons
    lines = _margin_text(res["margins"][0])
    joined = " ".join(s.strip() for s in lines)
    for k in range(6):  # every reason is there in full, none cut
        assert f"reason {k}: a long explanation" in joined
    assert "more reason" not in joined and "from memory" not in joined
    assert max(len(s) for s in lines) <= 60
    # a taller text makes a taller figure rather than a cut panel
    short = mpimg.imread(qc_figure(_result(), _section(), tmp_path / "short.png")).shape[0]
    tall = mpimg.imread(qc_figure(res, _section(), tmp_path / "tall.png")).shape[0]
    assert tall > short


def test_qc_velocity_note_reads_as_words():
    from clinometry.report._text import velocity_text

    assert velocity_text({"model": "constant", "velocity_m_s": 2500.0}) == "velocity 2500 m/s (constant)"
    flagged = velocity_text({"model": "constant", "velocity_m_s": 3000.0, "default_fallback": True})
    assert flagged.startswith("velocity 3000 m/s") and "default velocity" in flagged
    assert velocity_text({"model": "none"}) == "depth section: no velocity needed"


def test_qc_long_text_panel_stays_above_the_next_margin_and_lists_a_shared_reason_once(tmp_path, monkeypatch):
    # a margin with a dozen values missing for one long reason (as on a real line without a distinct
    # break), then a second margin: the first text panel must end above the second margin's plot
    import clinometry.report.figures.qc as qc

    drawn = []
    real_save = qc._save
    monkeypatch.setattr(qc, "_save", lambda fig, path: (drawn.append(fig), real_save(fig, path))[1])
    res = _result()
    why = ("no distinct shelf break: the profile bends by at most 0.052/km landward of its steepest point (a "
           "distinct break bends by 0.1/km or more), as on a ramp")
    first = dict(res["margins"][0], missing={f"value_{k}_deg": why for k in range(12)})
    res["margins"] = [first, dict(res["margins"][0], direction="-")]
    lines = qc._margin_text(first)
    assert " ".join(s.strip() for s in lines).count("no distinct shelf break") == 1  # once, the names before it
    assert "value_0_deg, value_1_deg" in " ".join(lines) and "value_11_deg" in " ".join(lines)
    # twelve different reasons make a long panel, above four more margins (five, as on that real line)
    res["margins"][0] = dict(first, missing={f"value_{k}_deg": f"{k}: {why}" for k in range(12)})
    res["margins"] += [dict(res["margins"][1]) for _ in range(3)]
    qc_figure(res, _section(), tmp_path / "two.png")
    fig = drawn[0]
    renderer = fig.canvas.get_renderer()
    text = next(t for ax in fig.axes for t in ax.texts if t.get_text().startswith("Margin 1:"))
    below = next(ax for ax in fig.axes if ax.get_title(loc="left").startswith("Margin 2:"))
    # display coordinates, y up: the text's bottom edge is above the top of the next plot with its title
    assert text.get_window_extent(renderer).y0 > below.get_tightbbox(renderer).y1


@pytest.mark.parametrize("families", [["rimmed_shelf"], ["ramp", "rimmed_shelf", "steep_margin"]])
def test_summary_title_fits_the_figure_and_clears_the_panels(families):
    # one family makes a 6 in figure, narrower than the one-line title was (cut on both sides)
    from clinometry.report.figures.overview import summary_axes

    rows = [{"family": f, "slope_max_deg": s, "relief_m": 100.0 + s} for f in families for s in (1.0, 2.0, 3.0)]
    fig = summary_axes(rows)
    fig.canvas.draw()
    renderer = fig.canvas.get_renderer()
    head = fig.get_suptitle()
    assert head.replace("\n", " ").endswith("each family on its own scale")
    box = fig._suptitle.get_window_extent(renderer)
    assert box.x0 >= 0 and box.x1 <= fig.bbox.x1 and box.y1 <= fig.bbox.y1
    assert all(ax.get_tightbbox(renderer).y1 < box.y0 for ax in fig.axes)  # no panel title under it
