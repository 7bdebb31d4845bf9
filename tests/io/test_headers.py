"""Byte-position tables against segyio's enums (an independent encoding of SEG-Y rev 1 tables 1-2)."""

import numpy as np
import pytest

from clinometry.io.headers import BINARY_HEADER, SAMPLE_FORMATS, TRACE_HEADER, apply_scalar

segyio = pytest.importorskip("segyio")

# our name -> segyio enum name; both encode SEG-Y rev 1 (SEG Technical Standards Committee, 2002)
TRACE_NAMES = {
    "trace_sequence_line": "TRACE_SEQUENCE_LINE", "trace_sequence_file": "TRACE_SEQUENCE_FILE",
    "field_record": "FieldRecord", "trace_number": "TraceNumber", "energy_source_point": "EnergySourcePoint",
    "cdp": "CDP", "cdp_trace": "CDP_TRACE", "trace_id": "TraceIdentificationCode", "offset": "offset",
    "elevation_scalar": "ElevationScalar", "coordinate_scalar": "SourceGroupScalar",
    "source_x": "SourceX", "source_y": "SourceY", "group_x": "GroupX", "group_y": "GroupY",
    "coordinate_units": "CoordinateUnits", "delay_time": "DelayRecordingTime",
    "samples": "TRACE_SAMPLE_COUNT", "sample_interval": "TRACE_SAMPLE_INTERVAL",
    "cdp_x": "CDP_X", "cdp_y": "CDP_Y", "inline": "INLINE_3D", "crossline": "CROSSLINE_3D",
    "shotpoint": "ShotPoint", "shotpoint_scalar": "ShotPointScalar", "time_scalar": "ScalarTraceHeader",
}
BINARY_NAMES = {
    "job_id": "JobID", "line_number": "LineNumber", "reel_number": "ReelNumber",
    "traces_per_ensemble": "Traces", "aux_traces_per_ensemble": "AuxTraces",
    "sample_interval": "Interval", "sample_interval_original": "IntervalOriginal",
    "samples": "Samples", "samples_original": "SamplesOriginal", "format": "Format",
    "ensemble_fold": "EnsembleFold", "sorting_code": "SortingCode",
    "measurement_system": "MeasurementSystem", "extended_samples": "ExtSamples",
    "revision": "SEGYRevision", "fixed_length": "TraceFlag", "extended_text_headers": "ExtendedHeaders",
}


@pytest.mark.parametrize("name", sorted(TRACE_NAMES))
def test_trace_header_positions_match_segyio(name):
    enum = TRACE_NAMES[name]
    if not hasattr(segyio.TraceField, enum):
        pytest.skip(f"segyio has no TraceField.{enum}")
    assert TRACE_HEADER[name][0] == int(getattr(segyio.TraceField, enum))


@pytest.mark.parametrize("name", sorted(BINARY_NAMES))
def test_binary_header_positions_match_segyio(name):
    enum = BINARY_NAMES[name]
    if not hasattr(segyio.BinField, enum):
        pytest.skip(f"segyio has no BinField.{enum}")
    assert BINARY_HEADER[name][0] == int(getattr(segyio.BinField, enum))


def test_sample_format_sizes():
    # SEG-Y rev 2.0 format table (from memory): bytes per sample of each code
    assert {c: n for c, (_, n) in SAMPLE_FORMATS.items()} == {
        1: 4, 2: 4, 3: 2, 4: 4, 5: 4, 6: 8, 7: 3, 8: 1, 9: 8, 10: 4, 11: 2, 12: 8, 15: 3, 16: 1}


def test_apply_scalar_rev1_rule():
    # SEG-Y rev 1 bytes 71-72: positive multiplies, negative divides, 0 means 1
    np.testing.assert_allclose(apply_scalar([100, 100, 100, 100], [10, -10, 0, 1]), [1000, 10, 100, 100])
