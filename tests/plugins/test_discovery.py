"""Plugin discovery with hand-built entry points (no installation needed).

``importlib.metadata.entry_points`` is replaced by a function returning
:class:`importlib.metadata.EntryPoint` objects built here, pointing at
callables of the standard library, so the expected names, descriptions
and options can be read off the Python documentation.
"""

import inspect
from importlib.metadata import EntryPoint

import pytest

from clinometry import _plugins
from clinometry.errors import ClinometryWarning, PluginError


@pytest.fixture
def fake_entry_points(monkeypatch):
    """Install a fake entry-point table: {group: [EntryPoint, ...]}."""

    def install(table):
        def entry_points(*, group):
            return [ep for ep in table.get(group, [])]

        monkeypatch.setattr(_plugins, "entry_points", entry_points)
        _plugins._clear_cache()

    yield install
    _plugins._clear_cache()


def _ep(name, value, group="clinometry.classifiers"):
    return EntryPoint(name=name, value=value, group=group)


def test_plugin_names_sorted_without_loading(fake_entry_points):
    # a value whose module does not exist: listing names must not import it
    fake_entry_points({"clinometry.classifiers": [_ep("zeta", "no_such_module_xyz:f"), _ep("alpha", "json:dumps")]})
    assert _plugins.plugin_names("classifier") == ["alpha", "zeta"]


def test_load_plugin_returns_the_entry_point_target(fake_entry_points):
    import json

    fake_entry_points({"clinometry.classifiers": [_ep("dumps", "json:dumps")]})
    assert _plugins.load_plugin("classifier", "dumps") is json.dumps


def test_unknown_name_lists_installed(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("a", "json:dumps"), _ep("b", "json:loads")]})
    with pytest.raises(PluginError, match=r"no classifier plugin named 'c'; installed: a, b"):
        _plugins.load_plugin("classifier", "c")


def test_broken_plugin_selected_by_name_chains_import_error(fake_entry_points):
    fake_entry_points({"clinometry.classifiers": [_ep("broken", "no_such_module_xyz:f")]})
    with pytest.raises(PluginError, match=r"'broken' \(no_such_module_xyz:f\) failed to load: ModuleNotFoundError") as info:
        _plugins.load_plugin("classifier", "broken")
    assert isinstance(info.value.__cause__, ModuleNotFoundError)


def test_listing_warns_about_broken_plugin_and_keeps_others(fake_entry_points):
    import json

    fake_entry_points({"clinometry.classifiers": [_ep("broken", "no_such_module_xyz:f"), _ep("ok", "json:loads")]})
    with pytest.warns(ClinometryWarning, match=r"classifier plugin 'broken'"):
        found = _plugins.list_plugins("classifier")
    assert found == {"ok": json.loads}


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


def test_cli_plugins_lists_fake_and_names_broken_on_stderr(fake_entry_points, capsys):
    from clinometry.cli import main

    fake_entry_points({
        "clinometry.classifiers": [_ep("dumps", "json:dumps"), _ep("broken", "no_such_module_xyz:f")],
        "clinometry.pickers": [],
    })
    code = main(["plugins"])
    out, err = capsys.readouterr()
    assert code == 0
    assert "classifiers (clinometry.classifiers):" in out
    assert "  dumps  [json:dumps]" in out
    assert "      options: skipkeys=False, ensure_ascii=True" in out
    assert "pickers (clinometry.pickers):\n  (none installed)" in out
    assert "  broken  BROKEN (see warning)" in out
    assert err.strip() == (
        "clinometry: warning: classifier plugin 'broken' cannot be used: classifier plugin 'broken' "
        "(no_such_module_xyz:f) failed to load: ModuleNotFoundError: No module named 'no_such_module_xyz'"
    )
