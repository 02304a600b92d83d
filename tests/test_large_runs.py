"""Large runs: parallel, cluster and resumed runs give exactly the serial results.

The laws checked here are the tool's own promises (issue "Overnight scale"):
members are independent, so the way they are scheduled — one process, several
worker processes, a Dask cluster, or an interrupted run resumed from its
checkpoint store — must not change a single bit of any result. The per-vehicle
summary is checked against the definition of an envelope (the extreme over
stations of one vehicle's effects), computed independently here.
"""

from __future__ import annotations

import io
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import batch.running.executor
from batch.command import cli
from batch.demo.synthetic import synthetic_case
from batch.engine.envelope import member_envelope
from batch.loads.fleet import fleet_cases
from batch.model import Case, Settings
from batch.running.executor import RunOptions, run_case
from batch.running.store import store_path_for
from batch.writing.template import write_case_workbook

EXTREMES = ("m_max", "m_min", "v_max", "v_min", "r_max", "r_min")


def _small_case(members: int = 12, vehicles: int = 6, seed: int = 11) -> Case:
    return synthetic_case(members, vehicles, seed, Settings(stations_per_span=4))


def _same(a: batch.running.executor.RunResult, b: batch.running.executor.RunResult) -> None:
    assert [e.member for e in a.envelopes] == [e.member for e in b.envelopes]
    for ea, eb in zip(a.envelopes, b.envelopes, strict=True):
        for name in EXTREMES:
            xa, xb = getattr(ea, name), getattr(eb, name)
            assert np.array_equal(xa.value, xb.value)
            assert np.array_equal(xa.case, xb.case)
            assert np.array_equal(xa.position, xb.position, equal_nan=True)
            assert np.array_equal(xa.direction, xb.direction)
    assert a.peaks is not None and b.peaks is not None
    assert np.array_equal(a.peaks, b.peaks)


def test_worker_processes_give_the_serial_results_bit_for_bit(monkeypatch) -> None:
    case = _small_case()
    serial = run_case(case, options=RunOptions(jobs=1))
    monkeypatch.setattr(batch.running.executor, "PARALLEL_MIN_PAIRS", 0)
    parallel = run_case(case, options=RunOptions(jobs=2))
    assert parallel.workers == 2
    _same(serial, parallel)


# The cluster's own notices (slow scratch folders, ports in use, ...) under a loaded machine
# are not this test's subject; with warnings as errors they would make it flaky.
@pytest.mark.filterwarnings("ignore::UserWarning:distributed")
@pytest.mark.filterwarnings("ignore::RuntimeWarning:distributed")
@pytest.mark.filterwarnings("ignore::DeprecationWarning")
def test_a_dask_cluster_gives_the_serial_results_bit_for_bit() -> None:
    distributed = pytest.importorskip("dask.distributed")
    case = _small_case(members=8, vehicles=4, seed=5)
    serial = run_case(case, options=RunOptions(jobs=1))
    with distributed.LocalCluster(
        n_workers=1, threads_per_worker=1, processes=False, dashboard_address=None
    ) as local:
        clustered = run_case(case, options=RunOptions(cluster=local.scheduler_address))
    _same(serial, clustered)


def test_the_vehicle_summary_is_each_vehicles_own_envelope() -> None:
    # Definition of an envelope: the extreme over stations of one vehicle's effects.
    case = _small_case(members=4, vehicles=3, seed=2)
    result = run_case(case)
    cases = fleet_cases(case.vehicles, case.settings)
    for m, member in enumerate(case.members):
        for v in range(len(case.vehicles)):
            own = [c for c in cases if c.vehicle == v]
            env = member_envelope(member, own, case.settings.stations_per_span)
            expected = [
                env.m_max.value.max(),
                env.m_min.value.min(),
                env.v_max.value.max(),
                env.v_min.value.min(),
                env.r_max.value.max(),
                env.r_min.value.min(),
            ]
            assert result.peaks is not None
            np.testing.assert_allclose(result.peaks[m, v], expected, rtol=1e-12, atol=1e-12)


def test_a_run_with_a_store_reads_back_exactly_what_a_run_in_memory_keeps(tmp_path: Path) -> None:
    # The tool's promise: with a store, results are read back from it (memory stays
    # flat) and nothing changes; the stored sequence behaves as a sequence.
    case = _small_case(members=5, vehicles=3, seed=8)
    kept = run_case(case)
    stored = run_case(case, options=RunOptions(store=tmp_path / "s.sqlite", key="k"))
    assert isinstance(kept.envelopes, tuple) and not isinstance(stored.envelopes, tuple)
    _same(kept, stored)
    assert len(stored.envelopes) == len(case.members)
    assert stored.envelopes[-1].member == case.members[-1].id
    assert [e.member for e in stored.envelopes[1:3]] == [m.id for m in case.members[1:3]]
    with pytest.raises(IndexError):
        stored.envelopes[len(case.members)]
    assert stored.warnings == kept.warnings
    # Reading it back leaves only the store beside the workbook (no SQLite -wal or -shm).
    assert sorted(p.name for p in tmp_path.iterdir()) == ["s.sqlite"]


def test_a_store_resumes_only_the_same_input(tmp_path: Path) -> None:
    case = _small_case(members=6, vehicles=3, seed=4)
    store = tmp_path / "book.spanfleet.sqlite"
    first = run_case(case, options=RunOptions(store=store, key="input-1"))
    again = run_case(case, options=RunOptions(store=store, key="input-1"))
    assert first.resumed == 0 and again.resumed == len(case.members)
    _same(first, again)
    changed = run_case(case, options=RunOptions(store=store, key="input-2"))
    assert changed.resumed == 0
    with sqlite3.connect(store) as db:
        rows = db.execute("SELECT COUNT(*) FROM vehicle_summary").fetchone()[0]
    assert rows == len(case.members) * len(case.vehicles)


def test_a_killed_run_resumes_to_the_clean_results(tmp_path: Path) -> None:
    case = synthetic_case(80, 30, 9, Settings(stations_per_span=10))
    book = tmp_path / "kvha-synthetic.xlsx"
    write_case_workbook(case, book)
    out = tmp_path / "results.xlsx"
    command = [sys.executable, "-m", "batch", "run", str(book), "--out", str(out), "--jobs", "1"]
    store = store_path_for(out)
    proc = subprocess.Popen(command, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    deadline = time.monotonic() + 120
    done = 0
    while time.monotonic() < deadline and proc.poll() is None:
        if store.exists():
            try:
                with sqlite3.connect(store, timeout=1) as db:
                    done = db.execute("SELECT COUNT(*) FROM members").fetchone()[0]
            except sqlite3.OperationalError:
                done = 0
            if done >= 20:
                break
        time.sleep(0.05)
    if proc.poll() is not None:
        pytest.skip("the run finished before it could be interrupted (machine too fast)")
    os.kill(proc.pid, signal.SIGKILL)
    proc.wait()
    assert not out.exists()

    resumed = subprocess.run(command, capture_output=True, text=True, check=False)
    assert resumed.returncode == 0, resumed.stderr
    clean_out = tmp_path / "clean.xlsx"
    clean = subprocess.run(
        [*command[:6], str(clean_out), "--no-store"], capture_output=True, text=True, check=False
    )
    assert clean.returncode == 0, clean.stderr

    log = pd.read_excel(out, sheet_name="Run Log", header=None)
    resumed_count = log.loc[log[0] == "Members resumed from it", 1].iloc[0]
    assert 0 < resumed_count < len(case.members)
    for sheet in ("Envelopes", "Reactions", "Governing", "Vehicle Summary"):
        pd.testing.assert_frame_equal(
            pd.read_excel(out, sheet_name=sheet), pd.read_excel(clean_out, sheet_name=sheet)
        )


class _Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_progress_shows_members_rate_and_time_left_on_a_terminal(monkeypatch) -> None:
    screen = _Terminal()
    monkeypatch.setattr(sys, "stderr", screen)
    show = cli._progress(quiet=False)
    assert show is not None
    show(5, 20, "KV-0412 G1")
    text = screen.getvalue()
    assert "5/20 members" in text and "/s" in text and "left" in text and "KV-0412 G1" in text
    assert cli._progress(quiet=True) is None


def test_progress_is_silent_when_not_a_terminal(monkeypatch) -> None:
    monkeypatch.setattr(sys, "stderr", io.StringIO())
    assert cli._progress(quiet=False) is None
