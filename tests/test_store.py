"""The checkpoint store never gives one run's results to another.

The promises are the store's own (batch/running/store.py): every stored member
carries its run key and the token of the run that wrote it; only members of a
run's key, with the member's id at their place, are read; the last run to open
a store owns it; a run whose store was reset, taken over, deleted or replaced
stops with a message; the results are read back only when every member is
there. Here two runs' stores are opened in one process, in the order a race
between two processes could give; tests/test_concurrent_runs.py races real
processes.
"""

from __future__ import annotations

import sqlite3
from pathlib import Path

import numpy as np
import pytest

from batch.demo.synthetic import synthetic_case
from batch.loads.fleet import fleet_cases
from batch.model import Case, Settings
from batch.running.executor import RunOptions, analyse_member, run_case
from batch.running.store import CheckpointStore, StoreError

CASE = synthetic_case(3, 2, 7, Settings(stations_per_span=4))
OTHER = synthetic_case(3, 2, 8, Settings(stations_per_span=4))


def _open(path: Path, key: str, case: Case = CASE) -> CheckpointStore:
    labels = tuple(c.label for c in fleet_cases(case.vehicles, case.settings))
    return CheckpointStore(path, key, labels, tuple(v.id for v in case.vehicles))


def _put(store: CheckpointStore, index: int, case: Case = CASE) -> None:
    cases = tuple(fleet_cases(case.vehicles, case.settings))
    r = analyse_member(index, case.members[index], cases, case.settings, len(case.vehicles))
    store.put(r.index, r.envelope, r.warnings, r.peaks)


def test_a_run_whose_store_another_input_reset_stops(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    first = _open(path, "alder")
    _put(first, 0)
    second = _open(path, "heron", OTHER)  # another input, the same --out
    assert second.finished(tuple(m.id for m in OTHER.members)) == set()
    with pytest.raises(StoreError, match=r"a run of another input .* took over"):
        _put(first, 1)
    _put(second, 0, OTHER)
    first.close()
    second.close()


def test_a_run_taken_over_by_a_run_of_the_same_input_stops_and_the_other_resumes(
    tmp_path: Path,
) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    first = _open(path, "alder")
    _put(first, 0)
    second = _open(path, "alder")
    assert second.resumed
    assert second.finished(tuple(m.id for m in CASE.members)) == {0}
    with pytest.raises(StoreError, match="another run of the same input took over"):
        _put(first, 1)
    first.close()
    second.close()


def test_members_of_another_key_or_another_id_are_never_read(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    store = _open(path, "alder")
    for k in range(3):
        _put(store, k)
    with sqlite3.connect(path) as db:  # as if written under another input's key
        db.execute("UPDATE members SET run = 'heron' WHERE idx = 1")
        db.execute("UPDATE members SET member = 'KV-9999 G9' WHERE idx = 2")
    db.close()
    ids = tuple(m.id for m in CASE.members)
    assert store.finished(ids) == {0}
    with pytest.raises(StoreError, match="member 2 is no longer in the checkpoint store"):
        list(store.stored_envelopes(3))
    with pytest.raises(StoreError):
        store.check_complete(3)
    store.close()


def test_a_store_deleted_under_a_run_stops_it(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    store = _open(path, "alder")
    _put(store, 0)
    path.rename(tmp_path / "elsewhere.sqlite")
    with pytest.raises(StoreError, match="deleted or replaced while the run was going"):
        _put(store, 1)
    store.close()


def test_a_reset_after_the_last_member_stops_the_read_back(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    store = _open(path, "alder")
    for k in range(3):
        _put(store, k)
    envelopes = store.stored_envelopes(3)
    assert [e.member for e in envelopes] == [m.id for m in CASE.members]
    _open(path, "heron", OTHER).close()  # another input's run starts on the same store
    with pytest.raises(StoreError, match="reset or took over the store"):
        list(envelopes)
    store.close()


def test_a_store_of_an_earlier_layout_is_rebuilt(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    with sqlite3.connect(path) as db:  # the layout before run keys were stored per member
        db.execute("CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL)")
        db.execute("CREATE TABLE members (idx INTEGER PRIMARY KEY, member TEXT, envelope BLOB)")
        db.execute("INSERT INTO meta VALUES ('run', 'alder')")
        db.execute("INSERT INTO members VALUES (0, 'KV-0001 G1', x'00')")
    db.close()
    result = run_case(CASE, options=RunOptions(store=path, key="alder"))
    assert result.resumed == 0
    assert [e.member for e in result.envelopes] == [m.id for m in CASE.members]


def test_the_vehicle_summary_view_shows_only_the_current_run(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    run_case(CASE, options=RunOptions(store=path, key="alder"))
    with sqlite3.connect(path) as db:
        db.execute("UPDATE meta SET value = 'heron' WHERE key = 'run'")
        rows = db.execute("SELECT COUNT(*) FROM vehicle_summary").fetchone()[0]
    db.close()
    assert rows == 0


def test_results_read_back_equal_those_computed(tmp_path: Path) -> None:
    path = tmp_path / "results.spanfleet.sqlite"
    kept = run_case(CASE)
    stored = run_case(CASE, options=RunOptions(store=path, key="alder"))
    for a, b in zip(kept.envelopes, stored.envelopes, strict=True):
        assert np.array_equal(a.m_max.value, b.m_max.value)
