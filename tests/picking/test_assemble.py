"""Choosing the outer margin profile by the dip of its reflections, and slope faces.

Geometry only: a straight line z = x tan(a) has slope a (common practice,
no source); a surface following a foreset reflection dips with it, a
surface jumping from one reflector to a deeper one is steeper than the
reflections it crosses (foresets, Mitchum, Vail & Sangree 1977, from
memory).
"""

import numpy as np
import pytest

from clinometry.picking.assemble import choose_profile, dip_agreement, select_clinoforms, true_dip_deg
from clinometry.picking.faces import slope_faces
from clinometry.picking.margins import MarginCandidate
from clinometry.picking.tracking import TrackedPath

DX_M = 10.0  # trace spacing
DZ_M = 2.0  # depth sample interval (a depth section: z index * DZ_M = depth)
N, NZ = 120, 200
PERIOD = 10.0  # samples


def _cand(rank, *, brk, toe, steepest, slope_deg, quality=0.5, confidence=1.0):
    return MarginCandidate(
        path_rank=rank, direction="+", leg=(0, N - 1), steepest=steepest, shelf_break=brk, toe=toe,
        break_reason="", toe_reason="", relief_m=100.0, slope_max_deg=slope_deg, top_gradient_deg=0.0,
        foreset_quality=quality, confidence=confidence, mean_depth_m=0.0,
    )


def _dipping_field(dip_deg):
    # coherent reflections dipping dip_deg basinward (+) everywhere
    return np.full((N, NZ), dip_deg, np.float32), np.ones((N, NZ), np.float32)


def _ramp_surface(x0, x1, z0_m, slope_deg):
    x = np.arange(N) * DX_M
    depth = z0_m + np.clip(x - x0, 0, x1 - x0) * np.tan(np.radians(slope_deg))
    return x, depth


def test_surface_following_its_reflections_agrees_and_a_jump_does_not():
    dip, coh = _dipping_field(20.0)
    # along a 20-degree foreset the surface slope equals the reflection dip (tan 20 deg, geometry)
    x, d_follow = _ramp_surface(300.0, 800.0, 40.0, 20.0)
    c = _cand(0, brk=35, toe=75, steepest=55, slope_deg=20.0)
    dis, excess, refl, steepest = dip_agreement(c, d_follow, x, d_follow / DZ_M, dip, coh, PERIOD, 3.0)
    assert refl == pytest.approx(20.0)
    assert steepest == pytest.approx(20.0)
    assert dis < 2.0 and abs(excess) < 1e-6
    # a 60-degree step across the same 20-degree reflections
    x, d_jump = _ramp_surface(500.0, 560.0, 40.0, 60.0)
    j = _cand(1, brk=48, toe=58, steepest=53, slope_deg=60.0)
    dis_j, excess_j, refl_j, _ = dip_agreement(j, d_jump, x, d_jump / DZ_M, dip, coh, PERIOD, 1.0)
    assert refl_j == pytest.approx(20.0)
    assert excess_j == pytest.approx(40.0)
    assert dis_j > 20.0


def test_dip_agreement_is_missing_without_coherent_reflections():
    dip, coh = _dipping_field(20.0)
    x, d = _ramp_surface(300.0, 800.0, 40.0, 20.0)
    c = _cand(0, brk=35, toe=75, steepest=55, slope_deg=20.0)
    out = dip_agreement(c, d, x, d / DZ_M, dip, np.zeros_like(coh), PERIOD, 3.0)
    assert all(np.isnan(v) for v in out)


def test_outer_profile_is_the_shallowest_surface_that_dips_with_its_reflections():
    dip, coh = _dipping_field(20.0)
    x, d_jump = _ramp_surface(500.0, 560.0, 40.0, 60.0)  # shallowest, but a jump
    _, d_fore = _ramp_surface(300.0, 800.0, 60.0, 20.0)  # follows the foreset reflections
    _, d_old = _ramp_surface(200.0, 700.0, 90.0, 20.0)  # an older clinoform beneath
    depths = [d_jump, d_fore, d_old]
    paths = [TrackedPath(z_index=d / DZ_M, quality=np.ones(N), polarity="unknown", rank=i) for i, d in enumerate(depths)]
    g = [
        _cand(0, brk=48, toe=58, steepest=53, slope_deg=60.0),
        _cand(1, brk=30, toe=80, steepest=55, slope_deg=20.0),
        _cand(2, brk=20, toe=70, steepest=45, slope_deg=20.0),
    ]

    def agreement(m):
        return dip_agreement(m, depths[m.path_rank], x, paths[m.path_rank].z_index, dip, coh, PERIOD, 2.0)

    core = slice(45, 56)
    assert choose_profile(g, core, paths, depths, set(), PERIOD, agreement=agreement).path_rank == 1
    # without the dip test the shallowest strong surface (the jump) would be taken
    assert choose_profile(g, core, paths, depths, set(), PERIOD).path_rank == 0


def test_slope_face_starts_at_the_strong_foreset_not_in_a_weak_chaotic_interior():
    tr, z = np.meshgrid(np.arange(60), np.arange(80), indexing="ij")
    # strong flat layering everywhere (the section's typical amplitude)
    env = np.full(tr.shape, 0.5)
    dip = np.zeros(tr.shape)
    # a weak interior (traces 0-29) whose noise gives coherent-looking dips
    interior = (tr < 30) & (z > 30)
    dip[interior] = 30.0
    env[interior] = 0.05
    # a strong foreset wedge dipping below a 45-degree line (traces 30-59)
    wedge = (tr >= 30) & (z > tr - 10)
    dip[wedge] = 30.0
    env[wedge] = 1.0
    f = slope_faces(dip, np.ones_like(dip), env, min_dip_deg=5, period_samples=4)
    plus = [fc for fc in f if fc.direction == "+"]
    assert len(plus) == 1
    # the face starts where the strong wedge starts; the weak interior is not part of it
    assert plus[0].trace[0] == 30
    np.testing.assert_allclose(plus[0].z_index[10], 31, atol=2)


def test_slope_face_starts_at_its_shallowest_point():
    # a face deepens basinward: where the dipping region's top rises
    # basinward (tops of older clinoforms beneath a platform top, traces
    # 0-19) it is not the slope face (geometry, common practice, no source)
    tr, z = np.meshgrid(np.arange(60), np.arange(80), indexing="ij")
    top = np.where(tr < 20, 40 - tr, 20 + (tr - 20))
    dip = np.where(z > top, 30.0, 0.0)
    f = slope_faces(dip, np.ones_like(dip), np.ones_like(dip), min_dip_deg=5, period_samples=4)
    plus = [fc for fc in f if fc.direction == "+"]
    assert len(plus) == 1
    assert abs(int(plus[0].trace[0]) - 20) <= 2
    assert np.all(np.diff(plus[0].z_index) >= -1.0)


def _clino_stack():
    # outer profile (rank 0): platform top at 60 samples, break at trace 60, foreset to trace 90;
    # an older clinoform (rank 1) two periods deeper with its break landward at trace 50
    # (older = deeper and landward, superposition; Mitchum, Vail & Sangree 1977, from memory)
    x = np.arange(N, dtype=float)
    prof = 60.0 + np.clip(x - 60, 0, 30) * 2.0
    older = 80.0 + np.clip(x - 50, 0, 30) * 2.0
    return x, prof, older


def test_select_clinoforms_keeps_a_deeper_landward_clinoform():
    _, prof, older = _clino_stack()
    paths = [TrackedPath(z_index=z, quality=np.ones(N), polarity="unknown", rank=i) for i, z in enumerate((prof, older))]
    p = _cand(0, brk=60, toe=90, steepest=75, slope_deg=11.3)
    o = _cand(1, brk=50, toe=80, steepest=65, slope_deg=11.3, confidence=0.9)
    notes = []
    kept = select_clinoforms(p, [p, o], paths, PERIOD, notes)
    assert [k.path_rank for k in kept] == [0, 1]
    assert notes == []


def test_select_clinoforms_drops_a_side_lobe_within_half_a_period():
    # a surface 4 samples (0.4 period) beneath the profile all along is a lobe of the same
    # reflector: zero-phase wavelet lobes are about half a period apart (Widess 1973, from memory)
    _, prof, older = _clino_stack()
    lobe = prof + 0.4 * PERIOD
    paths = [TrackedPath(z_index=z, quality=np.ones(N), polarity="unknown", rank=i) for i, z in enumerate((prof, lobe, older))]
    p = _cand(0, brk=60, toe=90, steepest=75, slope_deg=11.3)
    lb = _cand(1, brk=61, toe=90, steepest=75, slope_deg=11.3, confidence=0.95)
    o = _cand(2, brk=50, toe=80, steepest=65, slope_deg=11.3, confidence=0.9)
    notes = []
    kept = select_clinoforms(p, [lb, p, o], paths, PERIOD, notes)
    assert [k.path_rank for k in kept] == [0, 2]
    assert len(notes) == 1 and "side lobe" in notes[0] and "trace 61" in notes[0]


def test_select_clinoforms_drops_a_break_above_the_outer_profile():
    # a break one period above the profile's platform top lies in the overlying fill: an
    # older clinoform lies beneath the younger one (superposition, Steno 1669, from memory)
    _, prof, older = _clino_stack()
    above = prof - 2.0 * PERIOD
    paths = [TrackedPath(z_index=z, quality=np.ones(N), polarity="unknown", rank=i) for i, z in enumerate((prof, above))]
    p = _cand(0, brk=60, toe=90, steepest=75, slope_deg=11.3)
    a = _cand(1, brk=40, toe=90, steepest=75, slope_deg=11.3, confidence=0.9)
    notes = []
    kept = select_clinoforms(p, [p, a], paths, PERIOD, notes)
    assert [k.path_rank for k in kept] == [0]
    assert len(notes) == 1 and "above the outer profile" in notes[0] and "trace 40" in notes[0]


@pytest.mark.parametrize("dtype", [np.float32, np.float64])
def test_true_dip_deg_is_the_twt_dip_formula_made_in_place(dtype):
    # tan(true dip) = (v / 2) dt/dx for a TWT section (time-to-depth of a
    # dipping reflector, common practice, no source); expected values from
    # numpy in float64 at 3000 m/s, 4 ms, 12.5 m traces
    from clinometry.section import make_section

    rng = np.random.default_rng(6)
    dip = rng.normal(0, 1.5, (30, 40)).astype(dtype)
    sec = make_section(np.zeros((30, 40), np.float32), z=np.arange(40) * 4.0, domain="twt", trace_spacing_m=12.5)
    got = true_dip_deg(sec, 3000.0, dip, 12.5)
    assert got.dtype == np.float32
    ref = np.degrees(np.arctan(0.5 * 3000.0 * dip.astype(float) * 4e-3 / 12.5))
    np.testing.assert_allclose(got, ref, rtol=2e-6, atol=1e-4)
    # one sample per trace at 4 ms and 3000 m/s over 12.5 m: atan(6 / 12.5)
    one = true_dip_deg(sec, 3000.0, np.ones((30, 40), dtype), 12.5)
    np.testing.assert_allclose(one, np.degrees(np.arctan(6.0 / 12.5)), rtol=1e-6)


def test_true_dip_deg_of_a_depth_section_is_dz_over_dx():
    from clinometry.section import make_section

    sec = make_section(np.zeros((5, 8), np.float32), z=np.arange(8) * 5.0, domain="depth", trace_spacing_m=10.0)
    got = true_dip_deg(sec, None, np.full((5, 8), 2.0, np.float32), 10.0)
    # two 5 m samples per 10 m trace: 45 degrees (geometry)
    np.testing.assert_allclose(got, 45.0, rtol=1e-6)
