"""Fixtures for the picking tests: the independent test-line generator in lines.py."""

import importlib.util
from pathlib import Path

import pytest

_spec = importlib.util.spec_from_file_location("_picking_test_lines", Path(__file__).with_name("lines.py"))
_lines = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_lines)


@pytest.fixture
def make_test_line():
    """The generator of tests/picking/lines.py (analytic margins, Ricker wavelet)."""
    return _lines.make_test_line


@pytest.fixture
def ricker():
    return _lines.ricker
