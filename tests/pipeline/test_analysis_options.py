"""AnalysisOptions: the one options object, built once and passed down."""

import dataclasses
import inspect
import pickle

import pytest

from clinometry.errors import PluginError
from clinometry.metrics import BUILTIN_METRICS
from clinometry.pipeline import OPTION_NAMES, AnalysisOptions, analyze, measure_horizon, run_analysis


def test_defaults_are_the_package_defaults():
    o = AnalysisOptions()
    assert (o.picker_name, o.metrics, o.classifier, o.thresholds, o.uncertainty, o.seed) == (
        "default", BUILTIN_METRICS, "rules", None, True, 0)
    assert BUILTIN_METRICS == ("shape", "slope", "trajectory")


def test_options_are_frozen_and_survive_pickling_to_workers():
    o = AnalysisOptions(velocity_linear=[1800.0, 0.6], metrics="slope", metric_options={"slope": {"flank_length_m": 800}})
    assert o.velocity_linear == (1800.0, 0.6) and o.metrics == ("slope",)
    with pytest.raises(dataclasses.FrozenInstanceError):
        o.seed = 3
    assert pickle.loads(pickle.dumps(o)) == o


def test_option_keywords_are_listed_in_one_place():
    # the front doors take **option_keywords; none of them repeats an option by name
    from clinometry.batch import TaskOptions, run_batch

    for func in (analyze, measure_horizon, run_analysis, run_batch):
        params = set(inspect.signature(func).parameters)
        assert not params & set(OPTION_NAMES), (func.__name__, params & set(OPTION_NAMES))
    assert not {f.name for f in dataclasses.fields(TaskOptions)} & set(OPTION_NAMES)


def test_horizons_choose_the_horizons_picker_and_refuse_another():
    assert AnalysisOptions(horizons="mine.csv").picker_name == "horizons"
    assert AnalysisOptions(horizons="mine.csv").picker_keywords() == {"horizons": "mine.csv"}
    with pytest.raises(PluginError, match=r"horizons= \(--horizons\) is read by the 'horizons' picker, but picker "
                                          r"'default' was chosen"):
        AnalysisOptions(horizons="mine.csv", picker="default")
    with pytest.raises(PluginError, match=r"the 'horizons' picker reads the interpreter's horizon: give horizons="):
        AnalysisOptions(picker="horizons")


def test_a_bad_choice_fails_before_the_file_is_read(tmp_path):
    # the file does not exist: the option errors must come first, naming the plugin and its options
    missing = tmp_path / "not_there.sgy"
    with pytest.raises(PluginError, match=r"picker plugin 'default' has no option 'no_such_option'; its options: "
                                          r".*velocity"):
        analyze(missing, picker_options={"no_such_option": 100.0})
    with pytest.raises(PluginError, match=r"no metric plugin named 'nope'"):
        analyze(missing, metrics=("slope", "nope"))
    with pytest.raises(PluginError, match=r"options given for metric\(s\) 'shape', which are not run"):
        analyze(missing, metrics=("slope",), metric_options={"shape": {"min_points": 5}})
    with pytest.raises(TypeError, match="velocity_m_s"):
        analyze(missing, velocity_m_s=2500.0)


def test_cli_arguments_become_the_same_options():
    import argparse

    from clinometry.cli._options import add_analysis_options, analysis_options

    parser = add_analysis_options(argparse.ArgumentParser(prog="clinometry analyze"), horizons=True)
    o = analysis_options(parser.parse_args(["--velocity", "2800", "--horizons", "mine.csv", "--seed", "4",
                                            "--no-uncertainty", "--metric", "slope"]))
    assert o == AnalysisOptions(velocity=2800.0, horizons="mine.csv", seed=4, uncertainty=False)
    assert o.picker_name == "horizons" and o.metrics == BUILTIN_METRICS  # a built-in named again runs once
