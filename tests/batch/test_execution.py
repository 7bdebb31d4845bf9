"""Tests of run_batch: the real chain on small synthetic lines, a corrupt file among
good ones, resume after a damaged output, identical outputs on 1 or 2 workers and
on a Dask LocalCluster started by the test."""

import csv
import json
import multiprocessing
import os
import shutil

import pytest

from clinometry.batch import run_batch
from clinometry.batch import execution as batch_run
from clinometry.result import validate_result_dict

from .conftest import BATCH_SCENARIOS


def _read_csv(path):
    with open(path, newline="", encoding="utf-8") as fh:
        return list(csv.DictReader(fh))


def _jsons(out):
    return {n: json.loads((out / n).read_text()) for n in sorted(os.listdir(out)) if n.endswith(".json")}


@pytest.fixture(scope="module")
def reference_run(good_lines, tmp_path_factory):
    """One serial run over the good lines, compared against by the other tests."""
    out = tmp_path_factory.mktemp("ref")
    summary = run_batch([good_lines], out, workers=1, plot=False, quiet=True, velocity=2500.0)
    return out, summary


def test_batch_writes_one_valid_json_per_line_and_rebuilds_margins_csv(reference_run):
    out, summary = reference_run
    assert (summary.n_tasks, summary.n_ok, summary.n_failed, summary.exit_code) == (2, 2, 0, 0)
    docs = _jsons(out)
    assert sorted(docs) == sorted(f"{n}.json" for n in BATCH_SCENARIOS)
    for d in docs.values():
        validate_result_dict(d)  # the results contract
    rows = _read_csv(out / "margins.csv")
    # one row per margin of every JSON, in task order (sorted file names)
    expected = [(n, m["direction"], m["family"]) for n in sorted(BATCH_SCENARIOS)
                for m in docs[f"{n}.json"]["margins"]]
    assert [(r["stem"], r["direction"], r["family"]) for r in rows] == expected
    for r in rows:
        m = [m for m in docs[f"{r['stem']}.json"]["margins"] if m["direction"] == r["direction"]][0]
        if m["slope_max_deg"] is not None:
            # margins.csv holds slopes to 0.1 deg (issue 13); the JSON keeps every digit
            assert float(r["slope_max_deg"]) == pytest.approx(m["slope_max_deg"], abs=0.05 + 1e-9)
    assert _read_csv(out / "errors.csv") == []
    for n in BATCH_SCENARIOS:
        assert (out / f"{n}.horizons.csv").is_file() and not (out / f"{n}.png").exists()
    assert (out / "index.html").is_file()
    assert [n for n in os.listdir(out) if n.startswith(".")] == []  # no temporary files left


def test_batch_corrupt_file_becomes_an_error_row_and_the_batch_goes_on(good_lines, corrupt_file, tmp_path,
                                                                        reference_run):
    out = tmp_path / "out"
    summary = run_batch([good_lines, corrupt_file], out, workers=1, plot=False, quiet=True, velocity=2500.0)
    assert summary.exit_code == 1
    assert summary.n_ok == 2 and summary.n_failed + summary.n_problems == 1
    errors = _read_csv(out / "errors.csv")
    assert len(errors) == 1
    assert errors[0]["error_type"] == "SegyReadError" and "corrupt.sgy" in errors[0]["message"]
    # the good lines are unaffected by the bad one
    assert (out / "margins.csv").read_text() == (reference_run[0] / "margins.csv").read_text()


def test_batch_exit_code_2_when_nothing_could_run(corrupt_file, tmp_path):
    summary = run_batch([corrupt_file, tmp_path / "missing.sgy"], tmp_path / "out", workers=1, plot=False,
                        quiet=True)
    assert summary.exit_code == 2 and summary.n_ok == 0
    errors = _read_csv(tmp_path / "out" / "errors.csv")
    # inputs that name nothing are listed first, then unreadable files
    assert [e["error_type"] for e in errors] == ["FileNotFoundError", "SegyReadError"]


def test_resume_skips_complete_lines_and_redoes_a_damaged_one(good_lines, reference_run, tmp_path):
    out = tmp_path / "out"
    shutil.copytree(reference_run[0], out)
    damaged = out / f"{BATCH_SCENARIOS[0]}.json"
    damaged.write_text(damaged.read_text()[:100])  # as if cut off by a crash without atomic writes
    summary = run_batch([good_lines], out, workers=1, plot=False, quiet=True, resume=True, velocity=2500.0)
    assert (summary.n_skipped, summary.n_ok, summary.exit_code) == (1, 1, 0)
    assert _jsons(out) == _jsons(reference_run[0])
    assert (out / "margins.csv").read_text() == (reference_run[0] / "margins.csv").read_text()


@pytest.mark.parametrize("start_method", ["fork", "spawn"])
def test_two_workers_give_the_same_files_as_one(good_lines, reference_run, tmp_path, monkeypatch, start_method):
    if start_method not in multiprocessing.get_all_start_methods():
        pytest.skip(f"no {start_method} start method on this platform")
    used = []

    def context():
        used.append(start_method)
        return multiprocessing.get_context(start_method)

    monkeypatch.setattr(batch_run, "_pool_context", context)
    out = tmp_path / "out"
    summary = run_batch([good_lines], out, workers=2, plot=False, quiet=True, velocity=2500.0)
    assert used == [start_method]
    assert summary.exit_code == 0
    assert _jsons(out) == _jsons(reference_run[0])
    assert (out / "margins.csv").read_text() == (reference_run[0] / "margins.csv").read_text()


@pytest.mark.requires_dask
def test_dask_local_cluster_gives_the_same_files_as_local(good_lines, reference_run, tmp_path):
    distributed = pytest.importorskip("distributed")
    with distributed.LocalCluster(n_workers=1, threads_per_worker=1, processes=False, host="127.0.0.1",
                                  protocol="tcp://", dashboard_address=None) as cluster:
        assert cluster.scheduler_address.startswith("tcp://127.0.0.1:")
        summary = run_batch([good_lines], tmp_path / "out", scheduler=cluster.scheduler_address, plot=False,
                            quiet=True, velocity=2500.0)
    assert summary.exit_code == 0
    assert _jsons(tmp_path / "out") == _jsons(reference_run[0])
    assert (tmp_path / "out" / "margins.csv").read_text() == (reference_run[0] / "margins.csv").read_text()


def test_batch_over_a_3d_cube_gives_one_line_per_inline_and_a_map(tmp_path):
    segyio = pytest.importorskip("segyio")
    from clinometry.synth import make_cube, write_cube

    cube, truth = make_cube(n_inlines=4, seed=1)
    path, _ = write_cube(cube, truth, tmp_path / "cube.sgy")
    out = tmp_path / "out"
    summary = run_batch([path], out, workers=1, quiet=True, uncertainty=False, velocity=2500.0)
    assert summary.exit_code == 0
    first = int(cube["inline"].values[0])
    assert [r["stem"] for r in summary.records] == [f"cube_il{first + i}" for i in range(4)]
    rows = _read_csv(out / "margins.csv")
    assert rows and {r["line"] for r in rows} <= {f"inline {first + i}" for i in range(4)}
    # break x/y are the header coordinates of the break trace, read back with segyio
    # (SEG-Y rev 1 bytes 181/185 CDP X/Y with the scalar at 71; segyio as independent reader)
    with segyio.open(str(path), ignore_geometry=True) as f:
        il = f.attributes(segyio.TraceField.INLINE_3D)[:]
        cx = f.attributes(segyio.TraceField.CDP_X)[:] / 100.0  # scalar -100 as written
        cy = f.attributes(segyio.TraceField.CDP_Y)[:] / 100.0
    assert any(r["break_trace"] for r in rows)
    for r in rows:
        if r["break_trace"]:
            idx = [i for i in range(il.size) if il[i] == int(r["line"].split()[1])][int(r["break_trace"])]
            # margins.csv holds coordinates to 1 m (issue 13)
            assert float(r["break_x"]) == pytest.approx(cx[idx], abs=0.5 + 1e-9)
            assert float(r["break_y"]) == pytest.approx(cy[idx], abs=0.5 + 1e-9)
    for name in ("map.png", "summary.png", "index.html", f"cube_il{first}.png"):
        assert (out / name).read_bytes()[:4] == (b"\x89PNG" if name.endswith(".png") else b"<!DO")


def test_resume_redoes_lines_made_with_another_velocity(good_lines, reference_run, tmp_path):
    out = tmp_path / "out"
    shutil.copytree(reference_run[0], out)
    summary = run_batch([good_lines], out, workers=1, plot=False, quiet=True, resume=True, velocity=2600.0,
                        uncertainty=True)
    assert (summary.n_skipped, summary.n_ok) == (0, 2)
    for d in _jsons(out).values():
        assert d["velocity"]["velocity_m_s"] == 2600.0


def test_workers_are_forked_only_on_linux_from_a_single_thread(monkeypatch):
    # fork is unsafe in a process with other threads and on macOS (Python
    # documentation of multiprocessing, "Contexts and start methods"); spawn
    # is the default there (common practice, no source)
    monkeypatch.setattr(batch_run.sys, "platform", "linux")
    monkeypatch.setattr(batch_run.threading, "active_count", lambda: 1)
    assert batch_run._pool_context().get_start_method() == "fork"
    monkeypatch.setattr(batch_run.threading, "active_count", lambda: 2)
    assert batch_run._pool_context().get_start_method() == "spawn"
    monkeypatch.setattr(batch_run.threading, "active_count", lambda: 1)
    monkeypatch.setattr(batch_run.sys, "platform", "darwin")
    assert batch_run._pool_context().get_start_method() == "spawn"


def test_worker_processes_start_before_the_caller_makes_threads(good_lines, tmp_path, monkeypatch):
    # the pool must exist when _iter_local returns, before run_batch creates
    # its progress bar (a thread): then it could be forked
    seen = []
    real = batch_run._iter_local

    def spy(tasks, options, workers):
        it = real(tasks, options, workers)
        seen.append(len(multiprocessing.active_children()))
        return it

    monkeypatch.setattr(batch_run, "_iter_local", spy)
    summary = run_batch([good_lines], tmp_path / "out", workers=2, plot=False, quiet=True, velocity=2500.0)
    assert summary.exit_code == 0
    assert seen == [1]


def test_batch_same_names_in_two_folders_keep_each_line_its_own_row(tmp_path):
    # issue 15 item 1: two inputs once shared a stem and one result overwrote the other;
    # three copies of segyio's 1xN.sgy (one inline, read as a 2D line; tests/data/README.md)
    data = os.path.join(os.path.dirname(__file__), "..", "data", "segy-reference", "1xN.sgy")
    for sub, name in (("a", "x.sgy"), ("b", "x.sgy"), ("b", "x_2.sgy")):
        (tmp_path / sub).mkdir(exist_ok=True)
        shutil.copy(data, tmp_path / sub / name)
    out = tmp_path / "out"
    with pytest.warns(Warning):  # 1xN.sgy has no trace coordinates: the spacing fallback warns
        summary = run_batch([tmp_path / "a", tmp_path / "b"], out, workers=1, plot=False, quiet=True,
                            velocity=2500.0)
    assert summary.n_ok == 3
    docs = _jsons(out)
    assert sorted(docs) == ["a_x.json", "b_x.json", "x_2.json"]
    # each JSON holds the result of its own input
    assert {n: os.path.relpath(d["source"]["path"], tmp_path) for n, d in docs.items()} == {
        "a_x.json": "a/x.sgy", "b_x.json": "b/x.sgy", "x_2.json": "b/x_2.sgy"}


def test_batch_never_replaces_an_input_with_an_output(tmp_path):
    # issue 15 item 4: a SEG-Y named line.png in the output folder (segyio's 1xN.sgy, tests/data/README.md)
    data = os.path.join(os.path.dirname(__file__), "..", "data", "segy-reference", "1xN.sgy")
    src = tmp_path / "line.png"
    shutil.copy(data, src)
    with pytest.warns(Warning):  # the trace-spacing fallback of 1xN.sgy
        summary = run_batch([src], tmp_path, workers=1, plot=True, quiet=True, velocity=2500.0)
    with open(data, "rb") as fh:
        assert src.read_bytes() == fh.read()  # the input is untouched
    assert summary.n_failed == 1
    assert "would replace the input file" in summary.errors[0]["message"]
