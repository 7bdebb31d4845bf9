"""True dip from time dip, and dip along depth profiles."""

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy.integrate import quad

from clinometry.depth import (
    ConstantVelocity,
    LinearVelocity,
    dip_deg_from_depth,
    horizon_to_depth,
    time_dip_ms_per_m,
    true_dip_deg,
)
from clinometry.errors import GeometryError, VelocityError
from clinometry.section import make_section


def test_true_dip_issue_example_at_two_velocities():
    # tan(theta) = (v/2)(dt/dx) (Sheriff & Geldart 1995, Exploration Seismology,
    # from memory): 10 ms per 100 m is 7.1 deg at 2500 m/s and 11.3 deg at 4000 m/s
    assert true_dip_deg(10.0 / 100.0, 2500.0) == pytest.approx(7.1, abs=0.05)
    assert true_dip_deg(10.0 / 100.0, 4000.0) == pytest.approx(11.3, abs=0.05)


def test_true_dip_hand_formula_and_inverse():
    # theta = atan(v dt / (2 dx)) with dt in s (same formula, written out by hand)
    g = np.array([-0.2, 0.0, 0.05, 0.3])  # ms/m
    v = 3200.0
    assert_allclose(true_dip_deg(g, v), np.degrees(np.arctan(v * g / 1000.0 / 2.0)))
    assert_allclose(time_dip_ms_per_m(true_dip_deg(g, v), v), g, atol=1e-12)


def test_dip_from_depth_profile_of_known_slope():
    # a straight line falling 1 m per 10 m dips atan(0.1) = 5.7106 deg (trigonometry)
    x = np.linspace(0.0, 2000.0, 81)
    assert_allclose(dip_deg_from_depth(x, 300.0 + 0.1 * x), np.degrees(np.arctan(0.1)), atol=1e-9)


def _planar_reflector(dip_deg):
    x = np.linspace(0.0, 3000.0, 121)  # 25 m trace spacing
    z = 800.0 + np.tan(np.radians(dip_deg)) * x
    return x, z


@pytest.mark.parametrize("dip", [3.0, 12.0, 30.0])
def test_same_geometry_at_two_velocities_and_linear_vz_gives_the_same_true_dip(dip):
    # one dipping planar reflector, modelled as TWT three times: constant 2200 m/s,
    # constant 4500 m/s (t = 2 z / v, common practice, no source) and v(z) = 1800 + 0.6 z
    # (t = 2 * integral dz / v, by scipy.integrate.quad); once converted back, the true dip
    # must be the same within 0.2 deg, while the time dips differ
    x, z = _planar_reflector(dip)
    v0, k = 1800.0, 0.6
    cases = {
        "2200": (2.0 * z / 2200.0 * 1000.0, ConstantVelocity(2200.0)),
        "4500": (2.0 * z / 4500.0 * 1000.0, ConstantVelocity(4500.0)),
        "linear": (
            np.array([2000.0 * quad(lambda s: 1.0 / (v0 + k * s), 0.0, d, epsrel=1e-12)[0] for d in z]),
            LinearVelocity(v0, k),
        ),
    }
    time_dips = []
    for name, (twt, model) in cases.items():
        section = make_section(np.zeros((x.size, 4)), z=[0.0, 1000.0, 2000.0, 3000.0], distance=x)
        depth = horizon_to_depth(section, np.arange(x.size), twt, model)
        dips = dip_deg_from_depth(x, depth)
        assert_allclose(dips, dip, atol=0.2, err_msg=name)
        # and straight from the apparent time dip with the local interval velocity
        dtdx = np.gradient(twt, x)
        assert_allclose(true_dip_deg(dtdx, model.interval_velocity(twt)), dip, atol=0.2, err_msg=name)
        time_dips.append(np.median(dtdx))
    assert time_dips[0] > 1.5 * time_dips[1]  # the time sections really differ


def test_dip_from_depth_rejects_unsorted_distance():
    with pytest.raises(GeometryError, match="strictly increasing"):
        dip_deg_from_depth([0.0, 20.0, 10.0], [1.0, 2.0, 3.0])


def test_true_dip_rejects_zero_velocity():
    with pytest.raises(VelocityError, match="true dip: velocity is 0 m/s"):
        true_dip_deg(0.1, 0.0)
