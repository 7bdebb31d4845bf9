"""Shared fixtures: synthetic lines from the forward model (session scoped).

Growing a margin takes a few seconds, so each scenario is made once per test
session.  Every line is seeded (``seed=0``).
"""

import pytest


@pytest.fixture(scope="session")
def synthetic_shelf():
    """The ``rimmed_shelf`` scenario in TWT: (section, truth); v = 2500 m/s constant."""
    from clinometry.synth import make_line

    return make_line("rimmed_shelf", seed=0)


@pytest.fixture(scope="session")
def synthetic_line_file(synthetic_shelf, tmp_path_factory):
    """The ``rimmed_shelf`` line written as SEG-Y: (path, truth) with truth["velocity_m_s"]."""
    from clinometry.synth.write import write_line

    section, truth = synthetic_shelf
    path = tmp_path_factory.mktemp("synthetic") / "shelf_line.sgy"
    write_line(section, truth, path)
    truth = dict(truth)
    assert truth["velocity"]["model"] == "constant"
    truth["velocity_m_s"] = truth["velocity"]["v_m_s"]
    return path, truth
