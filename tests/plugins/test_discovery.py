"""Plugin discovery and signature checks with hand-built entry points (no installation needed).

``importlib.metadata.entry_points`` is replaced by a function returning
:class:`importlib.metadata.EntryPoint` objects built here.  They point at
callables of the standard library, so the expected names, descriptions and
signatures can be read off the Python documentation, or at small callables
of a module made here (``fake_plugins``) that fit or break the protocols of
:mod:`clinometry.plugins`.
"""

import inspect
import sys
import types
from importlib.metadata import EntryPoint

import pytest

from clinometry import _plugins
from clinometry.errors import ClinometryWarning, PluginError


def _classify_by_relief(values, *, thresholds=None, min_relief_m=100.0):
    """Steep margin above a relief, else rimmed shelf (test plugin)."""


def _picker_without_velocity(section, *, smoothing_m=None):
    """A picker that forgot velocity= (test plugin)."""


def _metric_with_two_positionals(geometry, section, *, scale=1.0):
    """A metric that wants the section too (test plugin)."""


def _metric_with_required_option(geometry, *, reference_m):
    """A metric whose option has no default (test plugin)."""


@pytest.fixture
def fake_plugins(monkeypatch):
    """A module ``fake_plugins`` holding the test callables, importable by entry points."""
    mod = types.ModuleType("fake_plugins")
    for f in (_classify_by_relief, _picker_without_velocity, _metric_with_two_positionals,
              _metric_with_required_option):
        setattr(mod, f.__name__.lstrip("_"), f)
    monkeypatch.setitem(sys.modules, "fake_plugins", mod)
    return mod


@pytest.fixture
def fake_entry_points(monkeypatch):
    """Install a fake entry-point table: {group: [EntryPoint, ...]}."""

    def install(table):
        def entry_points(*, group):
            return [ep for ep in table.get(group, [])]

        monkeypatch.setattr(_plugins, "entry_points", entry_points)
        _plugins.clear_cache()

    yield install
    _plugins.clear_cache()


def _ep(name, value, group="clinometry.classifiers"):
    return EntryPoint(name=name, value=value, group=group)


def test_plugin_names_sorted_without_loading(fake_entry_points):
    # a value whose module does not exist: listing names must not import it
    fake_entry_points({"clinometry.classifiers": [_ep("zeta", "no_such_module_xyz:f"), _ep("alpha", "json:dumps")]})
    assert _plugins.plugin_names("classifier") == ["alpha", "zeta"]


def test_load_plugin_returns_the_entry_point_target(fake_entry_points, fake_plugins):
    fake_entry_points({"clinometry.classifiers": [_ep("relief", "fake_plugins:classify_by_relief")]})
    assert _plugins.load_plugin("classifier", "relief") is fake_plugins.classify_by_relief


def test_callable_with_var_keywords_is_refused(fake_entry_points):
    # Python docs: json.dumps(obj, *, skipkeys=False, ..., sort_keys=False, **kw)
    fake_entry_points({"clinometry.classifiers": [_ep("dumps", "json:dumps")]})
    with pytest.raises(PluginError, match=r"classifier plugin 'dumps' \(json:dumps\) takes \*\*kw; clinometry passes "
                                          r"only named options"):
        _plugins.load_plugin("classifier", "dumps")


@pytest.mark.parametrize("kind,group,value,message", [
    ("picker", "clinometry.pickers", "fake_plugins:picker_without_velocity",
     r"has no keyword 'velocity'; every picker is called with velocity="),
    ("metric", "clinometry.metrics", "fake_plugins:metric_with_two_positionals",
     r"must take the geometry as its one positional argument"),
    ("classifier", "clinometry.classifiers", "json:loads",  # json.loads(s, *, cls=None, ..., **kw)
     r"takes \*\*kw"),
])
def test_signatures_that_do_not_fit_the_kind_are_refused(fake_entry_points, fake_plugins, kind, group, value,
                                                         message):
    fake_entry_points({group: [_ep("p", value, group)]})
    with pytest.raises(PluginError, match=message):
        _plugins.load_plugin(kind, "p")


def test_unknown_and_missing_options_are_refused_by_name(fake_plugins):
    f = fake_plugins.classify_by_relief
    _plugins.check_options("classifier", "relief", f, {"min_relief_m": 50.0}, passed=("thresholds",))
    with pytest.raises(PluginError, match=r"classifier plugin 'relief' has no option 'min_relief'; its options: "
                                          r"thresholds, min_relief_m"):
        _plugins.check_options("classifier", "relief", f, {"min_relief": 50.0})
    g = fake_plugins.metric_with_required_option
    with pytest.raises(PluginError, match=r"metric plugin 'ref' needs the option\(s\) 'reference_m'"):
        _plugins.check_options("metric", "ref", g, {})


def test_unknown_name_lists_installed(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("a", "json:dumps"), _ep("b", "json:loads")]})
    with pytest.raises(PluginError, match=r"no classifier plugin named 'c'; installed: a, b"):
        _plugins.load_plugin("classifier", "c")


def test_broken_plugin_selected_by_name_chains_import_error(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("broken", "no_such_module_xyz:f")]})
    with pytest.raises(PluginError, match=r"'broken' \(no_such_module_xyz:f\) failed to load: ModuleNotFoundError") as info:
        _plugins.load_plugin("classifier", "broken")
    assert isinstance(info.value.__cause__, ModuleNotFoundError)


def test_listing_warns_about_broken_plugin_and_keeps_others(fake_entry_points, fake_plugins):
    fake_entry_points({"clinometry.classifiers": [_ep("broken", "no_such_module_xyz:f"),
                                                  _ep("ok", "fake_plugins:classify_by_relief")]})
    with pytest.warns(ClinometryWarning, match=r"classifier plugin 'broken'"):
        found = _plugins.list_plugins("classifier")
    assert found == {"ok": fake_plugins.classify_by_relief}


def test_listing_warns_about_a_plugin_that_does_not_fit(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("dumps", "json:dumps")]})
    with pytest.warns(ClinometryWarning, match=r"classifier plugin 'dumps' cannot be used: .* takes \*\*kw"):
        assert _plugins.list_plugins("classifier") == {}


def test_duplicate_names_warn_and_first_wins(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("x", "json:dumps"), _ep("x", "json:loads")]})
    with pytest.warns(ClinometryWarning, match=r"two clinometry.classifiers plugins are named 'x'"):
        names = _plugins.plugin_names("classifier")
    assert names == ["x"]


def test_not_callable_is_refused(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("pi", "math:pi")]})
    with pytest.raises(PluginError, match=r"'pi' \(math:pi\) is not callable"):
        _plugins.load_plugin("classifier", "pi")


def test_unknown_kind_names_known_kinds():
    with pytest.raises(PluginError, match="known kinds: picker, metric, classifier"):
        _plugins.plugin_names("reader")


def test_parameters_and_description_of_a_stdlib_callable():
    import json

    # Python docs, json.dumps(obj, *, skipkeys=False, ensure_ascii=True, ...): keyword-only options
    params = _plugins.plugin_parameters(json.dumps)
    assert params["skipkeys"] is False and params["ensure_ascii"] is True
    assert "obj" not in params
    # first docstring line of json.dumps (Python standard library source)
    assert _plugins.plugin_description(json.dumps) == "Serialize ``obj`` to a JSON formatted ``str``."
    assert _plugins.plugin_parameters(len) == {}
    assert inspect.Parameter.empty not in params.values()


def test_cli_plugins_lists_fake_and_names_broken_on_stderr(fake_entry_points, fake_plugins, capsys):
    from clinometry.cli import main

    fake_entry_points({
        "clinometry.classifiers": [_ep("relief", "fake_plugins:classify_by_relief"),
                                   _ep("broken", "no_such_module_xyz:f")],
        "clinometry.pickers": [],
    })
    code = main(["plugins"])
    out, err = capsys.readouterr()
    assert code == 0
    assert "classifiers (clinometry.classifiers):" in out
    assert "  relief  [" in out and ":_classify_by_relief]" in out  # [module:qualified name]
    assert "      Steep margin above a relief, else rimmed shelf (test plugin)." in out
    assert "      options: thresholds=None, min_relief_m=100.0" in out
    assert "pickers (clinometry.pickers):\n  (none installed)" in out
    assert "  broken  BROKEN (see warning)" in out
    assert err.strip() == (
        "clinometry: warning: classifier plugin 'broken' cannot be used: classifier plugin 'broken' "
        "(no_such_module_xyz:f) failed to load: ModuleNotFoundError: No module named 'no_such_module_xyz'"
    )
