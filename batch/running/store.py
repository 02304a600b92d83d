"""The checkpoint store: finished members of a run, kept in SQLite beside the workbook.

A long run writes each finished member here as soon as it is done, so a run that
is interrupted (Ctrl-C, killed, power lost) and started again with the same
command and the same input carries on from where it stopped. The store is keyed
by a digest of the validated input and the program version: any change to the
input (or a new version of spanfleet) empties it.

It also keeps the per-vehicle summary of every member — for each member and
vehicle, the extreme M max, M min, V max, V min, R max and R min over all
stations and supports — which can be far larger than a sheet holds. Engineers
may query it with any SQLite client, e.g.::

    SELECT member, vehicle, m_max FROM vehicle_summary
    WHERE member = 'KV-0412 G1' ORDER BY m_max DESC;

Values are in the run's units with the sign conventions of docs/workbook.md (sagging
moment positive, V = sum of the upward forces left of the section, reactions
upward). Envelopes, and each member's rating and screening
(:class:`batch.rating.assess.MemberAssessment`), are stored as numpy ``.npz`` blobs
written and read with ``allow_pickle=False``, so a store file from elsewhere
cannot run code.
"""

from __future__ import annotations

import contextlib
import io
import json
import sqlite3
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any, TypeVar, overload

import numpy as np
from numpy.typing import NDArray

from batch.engine.effects import Governing, MemberEnvelope
from batch.rating.assess import MemberAssessment
from batch.rating.lrfr import MemberRating
from batch.rating.screening import MemberScreening

__all__ = [
    "PEAK_COLUMNS",
    "CheckpointStore",
    "PeakRow",
    "StoreError",
    "StoredMembers",
    "store_path_for",
]

#: Columns of the per-vehicle summary, in order (see the module docstring).
PEAK_COLUMNS: tuple[str, ...] = ("m_max", "m_min", "v_max", "v_min", "r_max", "r_min")

_EXTREMES = ("m_max", "m_min", "v_max", "v_min", "r_max", "r_min")

_SCHEMA = """
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS members (
    idx INTEGER PRIMARY KEY, member TEXT NOT NULL, envelope BLOB NOT NULL, warnings TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS vehicle_peaks (
    member_idx INTEGER NOT NULL, vehicle_idx INTEGER NOT NULL,
    m_max REAL, m_min REAL, v_max REAL, v_min REAL, r_max REAL, r_min REAL,
    PRIMARY KEY (member_idx, vehicle_idx)
);
CREATE TABLE IF NOT EXISTS vehicles (idx INTEGER PRIMARY KEY, vehicle TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS assessments (idx INTEGER PRIMARY KEY, blob BLOB NOT NULL);
CREATE VIEW IF NOT EXISTS vehicle_summary AS
    SELECT m.member AS member, v.vehicle AS vehicle, p.m_max, p.m_min, p.v_max, p.v_min,
           p.r_max, p.r_min
    FROM vehicle_peaks p JOIN members m ON m.idx = p.member_idx
    JOIN vehicles v ON v.idx = p.vehicle_idx;
"""


class StoreError(Exception):
    """The checkpoint store cannot be used; the message says what is wrong and what to do."""


@contextlib.contextmanager
def _guarded(path: Path) -> Iterator[None]:
    """Turn SQLite's errors (a damaged or foreign file, a full disk, a lock) into StoreError.

    A stored blob that does not decode (ValueError) is a damaged store too.
    """
    try:
        yield
    except (sqlite3.Error, ValueError) as exc:
        raise StoreError(
            f"{path.name}: the checkpoint store could not be used ({exc}); delete it to start "
            "afresh, or run with --no-store"
        ) from exc


@dataclass(frozen=True, kw_only=True)
class PeakRow:
    """One member's peaks under one vehicle, in the order of :data:`PEAK_COLUMNS`."""

    member_index: int
    vehicle_index: int
    member: str
    vehicle: str
    values: tuple[float, ...]


def store_path_for(target: Path) -> Path:
    """Where the store of a run that writes ``target`` lives: beside it, same stem."""
    return target.with_name(f"{target.stem}.spanfleet.sqlite")


def _npz(arrays: dict[str, NDArray[np.generic]]) -> bytes:
    buf = io.BytesIO()
    np.savez(buf, allow_pickle=False, **arrays)
    return buf.getvalue()


def _pack_assessment(assessment: MemberAssessment) -> bytes:
    arrays: dict[str, NDArray[np.generic]] = {}
    for name, part in (("rating", assessment.rating), ("screening", assessment.screening)):
        if part is not None:
            arrays |= {f"{name}.{k}": v for k, v in vars(part).items()}
    return _npz(arrays)


def _unpack_assessment(blob: bytes | None) -> MemberAssessment:
    if blob is None:
        return MemberAssessment()
    with np.load(io.BytesIO(blob), allow_pickle=False) as data:
        parts: dict[str, dict[str, Any]] = {}
        for key in data.files:
            name, field = key.split(".")
            parts.setdefault(name, {})[field] = data[key]
    rating, screening = parts.get("rating"), parts.get("screening")
    return MemberAssessment(
        rating=None if rating is None else MemberRating(**rating),
        screening=None if screening is None else MemberScreening(**screening),
    )


#: Each envelope array in the order it is stored, with its stored type: first the
#: layout, then per effect family and sense value, case and position; the one-byte
#: directions last (so every wider array stays aligned).
_ARRAYS: tuple[tuple[str, str, type[np.generic]], ...] = (
    ("", "station_span", np.int64),
    ("", "station_fraction", np.float64),
    ("", "station_x", np.float64),
    ("", "support_x", np.float64),
    *(
        (name, field, kind)
        for name in _EXTREMES
        for field, kind in (("value", np.float64), ("case", np.int64), ("position", np.float64))
    ),
    *((name, "direction", np.int8) for name in _EXTREMES),
)


def _pack(env: MemberEnvelope) -> bytes:
    """An envelope as raw little-endian arrays behind a count of stations and supports.

    Decoding is a handful of ``np.frombuffer`` views, fast enough to stream
    every member back to the writer for each result sheet.
    """
    parts = [np.array([env.station_x.size, env.support_x.size], "<i8").tobytes()]
    for name, field, kind in _ARRAYS:
        array = getattr(getattr(env, name), field) if name else getattr(env, field)
        parts.append(np.ascontiguousarray(array, np.dtype(kind).newbyteorder("<")).tobytes())
    return b"".join(parts)


def _unpack(member: str, blob: bytes | None, labels: tuple[str, ...]) -> MemberEnvelope:
    if blob is None:
        raise ValueError(f"member {member!r} has no stored results")
    n_stations, n_supports = (int(n) for n in np.frombuffer(blob, "<i8", 2))
    offset = 16
    arrays: dict[tuple[str, str], Any] = {}
    for name, field, kind in _ARRAYS:
        count = n_supports if name.startswith("r_") or field == "support_x" else n_stations
        dtype = np.dtype(kind).newbyteorder("<")
        if offset + count * dtype.itemsize > len(blob):
            raise ValueError(f"member {member!r}'s stored results are cut short")
        arrays[name, field] = np.frombuffer(blob, dtype, count, offset)
        offset += count * dtype.itemsize
    if offset != len(blob):
        raise ValueError(f"member {member!r}'s stored results do not have the expected size")
    extremes: dict[str, Any] = {
        name: Governing(
            value=arrays[name, "value"],
            case=arrays[name, "case"],
            position=arrays[name, "position"],
            direction=arrays[name, "direction"],
        )
        for name in _EXTREMES
    }
    return MemberEnvelope(
        member=member,
        labels=labels,
        **{field: arrays["", field] for _, field, _ in _ARRAYS[:4]},
        **extremes,
    )


T = TypeVar("T")


class StoredMembers(Sequence[T]):
    """One kind of per-member result of a finished run, read from its store as needed.

    A sequence in member order that holds nothing in memory: iterating streams
    the members from the store file (one query, read as it goes), indexing reads
    one. It keeps a run's memory flat however many members the inventory has.
    ``column`` is one of the store's blob columns (``m.envelope`` or ``a.blob``),
    ``decode`` turns (member id, blob) into the result.
    """

    def __init__(
        self, path: Path, size: int, column: str, decode: Callable[[str, bytes | None], T]
    ) -> None:
        self._path = path
        self._size = size
        self._column = column
        self._decode = decode

    def __len__(self) -> int:
        return self._size

    def _rows(self, where: str, args: tuple[int, ...]) -> Iterator[T]:
        query = (
            f"SELECT m.member, {self._column} FROM members m "  # fixed column names
            f"LEFT JOIN assessments a ON a.idx = m.idx {where} ORDER BY m.idx"
        )
        with _guarded(self._path):
            # (read-write, though it only reads: the last connection to close then tidies
            # away SQLite's -wal and -shm files, which a read-only one cannot)
            db = sqlite3.connect(self._path, timeout=30.0)
            try:
                for member, blob in db.execute(query, args):
                    yield self._decode(member, blob)
            finally:
                db.close()

    def __iter__(self) -> Iterator[T]:
        return self._rows("", ())

    @overload
    def __getitem__(self, index: int) -> T: ...

    @overload
    def __getitem__(self, index: slice) -> list[T]: ...

    def __getitem__(self, index: int | slice) -> T | list[T]:
        if isinstance(index, slice):
            return [self[i] for i in range(*index.indices(self._size))]
        i = index + self._size if index < 0 else index
        if not 0 <= i < self._size:
            raise IndexError(index)
        return next(self._rows("WHERE m.idx = ?", (i,)))


class CheckpointStore:
    """Finished members of one run, by member index (see the module docstring).

    ``key`` identifies the run (input digest and version); opening a store whose
    key differs empties it. ``labels`` are the run's load-case labels, which the
    envelopes' case indices refer to; ``vehicles`` the fleet's ids.
    """

    def __init__(
        self, path: Path, key: str, labels: tuple[str, ...], vehicles: tuple[str, ...]
    ) -> None:
        self.path = path
        self.labels = labels
        self._db = sqlite3.connect(path, timeout=30.0)
        try:
            with _guarded(path):
                self._open(key, vehicles)
        except StoreError:
            self._db.close()
            raise

    def _open(self, key: str, vehicles: tuple[str, ...]) -> None:
        labels = self.labels
        self._db.execute("PRAGMA journal_mode=WAL")
        self._db.executescript(_SCHEMA)
        row = self._db.execute("SELECT value FROM meta WHERE key = 'run'").fetchone()
        self.resumed = row is not None and row[0] == key
        if not self.resumed:
            with self._db:
                for table in ("members", "vehicle_peaks", "vehicles", "assessments", "meta"):
                    self._db.execute(f"DELETE FROM {table}")  # fixed table names
                self._db.execute("INSERT INTO meta VALUES ('run', ?)", (key,))
                self._db.execute("INSERT INTO meta VALUES ('labels', ?)", (json.dumps(labels),))
                self._db.executemany(
                    "INSERT INTO vehicles VALUES (?, ?)", list(enumerate(vehicles))
                )

    def finished(self) -> set[int]:
        """Indices of the members already stored."""
        with _guarded(self.path):
            return {idx for (idx,) in self._db.execute("SELECT idx FROM members")}

    def put(
        self,
        index: int,
        envelope: MemberEnvelope,
        warnings: tuple[str, ...],
        peaks: NDArray[np.float64],
        assessment: MemberAssessment | None = None,
    ) -> None:
        """Store one finished member, with its per-vehicle peaks (n_vehicles, 6), atomically.

        ``assessment`` (its rating and screening) is stored when given.
        """
        with _guarded(self.path), self._db:
            self._db.execute(
                "INSERT OR REPLACE INTO members VALUES (?, ?, ?, ?)",
                (index, envelope.member, _pack(envelope), json.dumps(warnings)),
            )
            self._db.executemany(
                "INSERT OR REPLACE INTO vehicle_peaks VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
                [(index, v, *map(float, row)) for v, row in enumerate(peaks)],
            )
            if assessment is not None:
                self._db.execute(
                    "INSERT OR REPLACE INTO assessments VALUES (?, ?)",
                    (index, _pack_assessment(assessment)),
                )

    def stored_envelopes(self, size: int) -> StoredMembers[MemberEnvelope]:
        """Members 0..size-1's envelopes, read from the store file as they are needed."""
        labels = self.labels
        return StoredMembers(
            self.path, size, "m.envelope", lambda member, blob: _unpack(member, blob, labels)
        )

    def stored_assessments(self, size: int) -> StoredMembers[MemberAssessment]:
        """Members 0..size-1's ratings and screenings, read as they are needed."""
        return StoredMembers(self.path, size, "a.blob", lambda _, blob: _unpack_assessment(blob))

    def warnings(self) -> list[str]:
        """Every stored member's warnings, in member order."""
        with _guarded(self.path):
            rows = self._db.execute("SELECT warnings FROM members ORDER BY idx")
            return [w for (text,) in rows for w in json.loads(text)]

    def peak_rows(self) -> Iterator[PeakRow]:
        """Every stored per-vehicle summary row, members and vehicles in input order."""
        query = (
            "SELECT p.member_idx, p.vehicle_idx, m.member, v.vehicle, "
            "p.m_max, p.m_min, p.v_max, p.v_min, p.r_max, p.r_min "
            "FROM vehicle_peaks p JOIN members m ON m.idx = p.member_idx "
            "JOIN vehicles v ON v.idx = p.vehicle_idx ORDER BY p.member_idx, p.vehicle_idx"
        )
        with _guarded(self.path):
            for mi, vi, member, vehicle, *values in self._db.execute(query):
                yield PeakRow(
                    member_index=mi,
                    vehicle_index=vi,
                    member=member,
                    vehicle=vehicle,
                    values=tuple(values),
                )

    def close(self) -> None:
        """Close the database (the file stays for resuming and for queries)."""
        self._db.close()
