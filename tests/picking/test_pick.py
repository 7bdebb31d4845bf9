"""pick(): plugin dispatch, errors, options, and real lines."""

from pathlib import Path

import numpy as np
import pytest

from clinometry.errors import PickingError, PluginError
from clinometry.picking import pick
from clinometry.section import make_section

REAL = Path(__file__).resolve().parents[1] / "data" / "real-lines"


def test_pick_dispatches_to_the_default_plugin(make_test_line):
    section, _ = make_test_line("rimmed", seed=0)
    from clinometry.picking.default import pick_default

    a = pick(section, velocity=2800.0)
    b = pick_default(section, velocity=2800.0)
    assert a.picker == "default"
    assert [(m.shelf_break, m.toe) for m in a.margins] == [(m.shelf_break, m.toe) for m in b.margins]


def test_unknown_picker_names_the_installed_ones():
    s = make_section(np.random.default_rng(0).standard_normal((5, 50)), z=np.arange(50) * 2.0)
    with pytest.raises(PluginError, match="default"):
        pick(s, picker="no-such-picker")


def test_all_dead_section_raises_picking_error_naming_the_file():
    s = make_section(np.zeros((8, 60)), z=np.arange(60) * 2.0, trace_spacing_m=25.0, attrs={"source_path": "/data/dead_line.sgy"})
    with pytest.raises(PickingError, match="dead_line.sgy"):
        pick(s, velocity=2500.0)


def test_default_velocity_is_noted_when_none_is_given(make_test_line):
    section, _ = make_test_line("rimmed", seed=0)
    picks = pick(section)
    assert any(n.startswith("no velocity given") for n in picks.notes)


@pytest.mark.parametrize("name", ["teapot-line.sgy", "northsea-line.sgy", "australia-curt-line.sgy"])
def test_real_lines_give_reviewable_picks(name):
    from clinometry.io import read_section

    section = read_section(REAL / name)
    picks = pick(section)
    z0, z1 = float(section.z[0]), float(section.z[-1])
    assert len(picks.horizons) > 10
    for h in picks.horizons:
        assert np.all((h.z >= z0) & (h.z <= z1))
        assert np.all((h.quality >= 0) & (h.quality <= 1))
    for m in picks.margins:
        # every reported margin says why it was reported and how sure it is
        assert m.direction in ("+", "-")
        assert 0.3 <= m.confidence <= 1.0
        assert m.notes and "relief" in m.notes[0]


@pytest.mark.parametrize(
    "name",
    ["teapot-line.sgy", "australia-curt-line.sgy",
     # not met yet (issue 12): 5 margins at confidence >= 0.5 on this line, on fold
     # flanks and on vertical jumps between reflectors, measured 2026-12-04
     pytest.param("northsea-line.sgy", marks=pytest.mark.xfail(
         reason="issue 12 open: confident false margins on fold flanks of this real line", strict=False))],
)
def test_real_lines_without_carbonate_margins_give_no_confident_margin(name):
    # These real lines (tests/data/README.md) show folded and faulted
    # clastic and salt-related structure and no carbonate platform margin
    # (from memory, and by eye on the sections); an interpreter would call
    # any confident margin a false alarm.  Below 0.5 counts as low
    # confidence (common practice, no source).
    from clinometry.io import read_section

    picks = pick(read_section(REAL / name))
    confident = [(m.direction, m.shelf_break and m.shelf_break.trace, m.confidence) for m in picks.margins if m.confidence >= 0.5]
    assert confident == [], confident
