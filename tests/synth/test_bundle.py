"""clinometry.demo_files: the bundled demo lines by name, made into a folder when not installed."""

import functools

import clinometry
from clinometry.synth import bundle


def test_demo_files_in_a_source_checkout_are_the_bundle():
    files = clinometry.demo_files()
    folder = bundle.bundled_folder()
    assert folder is not None and folder.name == "synthetic_volumes"
    assert files["rimmed_shelf"] == folder / "rimmed_shelf.sgy"
    assert files["curved_margin_cube"].is_file()
    assert all(p.with_name(p.stem + ".truth.json").is_file() for p in files.values())


def test_demo_files_are_made_once_where_the_bundle_is_missing(tmp_path, monkeypatch):
    monkeypatch.setattr(bundle, "bundled_folder", lambda: None)
    calls = []
    real = functools.partial(bundle.generate_bundle, scenarios=["flat_basin"], cube=False)

    def make(folder):
        calls.append(folder)
        return real(folder)

    monkeypatch.setattr(bundle, "generate_bundle", make)
    files = bundle.demo_files(tmp_path / "demo")
    assert list(files) == ["flat_basin"] and files["flat_basin"].is_file()
    assert bundle.demo_files(tmp_path / "demo") == files  # reused, not made again
    assert calls == [tmp_path / "demo"]
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    assert bundle.cache_folder().parent == tmp_path / "cache" / "clinometry"
