"""The checkpoint store: finished members of a run, kept in SQLite beside the workbook.

A long run writes each finished member here as soon as it is done, so a run that
is interrupted (Ctrl-C, killed, power lost) and started again with the same
command and the same input carries on from where it stopped. The store is keyed
by a digest of the validated input and the program version (the *run key*): any
change to the input (or a new version of spanfleet) empties it.

A store may be shared by accident: two runs of one workbook at once, two inputs
written to the same ``--out``, a run still going when the engineer saves a
correction and runs again. So nothing in it is trusted on its name alone:

* every stored member carries the run key and the *token* of the run that wrote
  it (a random value each run draws when it opens the store), and a run reads
  only members whose key is its own and whose id is the member's at that place;
* the run that opens a store last owns it: opening writes its token (and, for a
  new key, empties the store) in one transaction, and every later write of any
  other run first checks, in the same transaction, that the store is still its
  own and still the same file; a run that finds it reset, taken over, deleted or
  replaced stops with a :class:`StoreError` saying so, instead of writing on;
* the results are read back only if every member is there under the run's key,
  so a reset between computing and writing the workbook stops the run too.

Results after any interleaving of runs on one store are therefore those of a
clean run, or the run refuses.

It also keeps the per-vehicle summary of every member — for each member and
vehicle, the extreme M max, M min, V max, V min, R max and R min over all
stations and supports — which can be far larger than a sheet holds. Engineers
may query it with any SQLite client, e.g.::

    SELECT member, vehicle, m_max FROM vehicle_summary
    WHERE member = 'KV-0412 G1' ORDER BY m_max DESC;

Values are in the run's units with the sign conventions of docs/workbook.md (sagging
moment positive, V = sum of the upward forces left of the section, reactions
upward). Envelopes, and each member's rating, screening and dead loads
(:class:`batch.rating.assess.MemberAssessment`), are stored as raw arrays of
numbers and fixed-width text behind a small header (no pickle), so a store file
from elsewhere cannot run code.
"""

from __future__ import annotations

import contextlib
import dataclasses
import json
import os
import secrets
import sqlite3
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any, TypeVar, overload

import numpy as np
from numpy.typing import NDArray

from batch.engine.asbuilt import MemberAsBuilt, MemberDeflection
from batch.engine.effects import Governing, ImpactRows, MemberEnvelope
from batch.engine.fatigue import FatigueRanges
from batch.rating.assess import MemberAssessment
from batch.rating.lrfr import MemberDeadLoads, MemberRating
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

#: The layout of the tables below (SQLite's user_version); a store of another layout
#: is rebuilt empty.
SCHEMA_VERSION = 5
#: Seconds a run waits for another run's write to the store to finish.
BUSY_TIMEOUT_S = 30.0

_TABLES = ("members", "vehicle_peaks", "vehicles", "assessments", "fatigue", "asbuilt", "meta")

# A member's peaks and assessment are written in the transaction of its members row and
# replaced or deleted with it: that row carries the proof (run key, token) for all three.
_SCHEMA = """
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS members (
    idx INTEGER PRIMARY KEY, run TEXT NOT NULL, token TEXT NOT NULL, member TEXT NOT NULL,
    envelope BLOB NOT NULL, warnings TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS vehicle_peaks (
    member_idx INTEGER NOT NULL, vehicle_idx INTEGER NOT NULL,
    m_max REAL, m_min REAL, v_max REAL, v_min REAL, r_max REAL, r_min REAL,
    PRIMARY KEY (member_idx, vehicle_idx)
);
CREATE TABLE IF NOT EXISTS vehicles (idx INTEGER PRIMARY KEY, vehicle TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS assessments (idx INTEGER PRIMARY KEY, blob BLOB NOT NULL);
CREATE TABLE IF NOT EXISTS fatigue (idx INTEGER PRIMARY KEY, blob BLOB NOT NULL);
CREATE TABLE IF NOT EXISTS asbuilt (idx INTEGER PRIMARY KEY, blob BLOB NOT NULL);
CREATE VIEW IF NOT EXISTS vehicle_summary AS
    SELECT m.member AS member, v.vehicle AS vehicle, p.m_max, p.m_min, p.v_max, p.v_min,
           p.r_max, p.r_min
    FROM vehicle_peaks p JOIN members m ON m.idx = p.member_idx
    JOIN vehicles v ON v.idx = p.vehicle_idx
    WHERE m.run = (SELECT value FROM meta WHERE key = 'run');
"""


class StoreError(Exception):
    """The checkpoint store cannot be used; the message says what is wrong and what to do."""


# SQLite's result codes (sqlite.org/rescode.html) by what they mean to the engineer.
_NO_ROOM = ("SQLITE_FULL", "SQLITE_IOERR")
_READ_ONLY = ("SQLITE_READONLY", "SQLITE_CANTOPEN", "SQLITE_PERM", "SQLITE_AUTH")
_BUSY = ("SQLITE_BUSY", "SQLITE_LOCKED")


def _explain(exc: Exception, path: Path) -> str:
    """What a failure of the store means and what to do, following "the checkpoint store"."""
    name = str(getattr(exc, "sqlite_errorname", ""))
    text = str(exc).lower()
    folder = path.parent
    if name.startswith(_NO_ROOM) or "disk is full" in text or "disk i/o" in text:
        return (
            f"cannot be written: there is no room to write it in {folder} ({exc}: the disk is "
            "full, a quota or "
            "file-size limit is reached, or the disk failed); free some space and run again, "
            "or run with --no-store"
        )
    if name.startswith(_READ_ONLY) or "readonly" in text or "unable to open" in text:
        return (
            f"cannot be written in {folder} ({exc}); make the folder and the store "
            "writable, write the results elsewhere with --out, or run with --no-store"
        )
    if name.startswith(_BUSY) or "locked" in text:
        return (
            f"has been held locked by another program for {BUSY_TIMEOUT_S:g} s ({exc}); close "
            "any program that has it open and run again, or run with --no-store"
        )
    return f"could not be used ({exc}); delete it to start afresh, or run with --no-store"


@contextlib.contextmanager
def _guarded(path: Path) -> Iterator[None]:
    """Turn SQLite's errors (a damaged or foreign file, a full disk, a lock) into StoreError.

    A stored blob that does not decode (ValueError) is a damaged store too.
    """
    try:
        yield
    except (sqlite3.Error, ValueError) as exc:
        raise StoreError(f"{path.name}: the checkpoint store {_explain(exc, path)}") from exc


def _connect(path: Path, create: bool) -> sqlite3.Connection:
    """A connection to the store; without ``create``, a missing file is an error, not a new one.

    Transactions are begun explicitly (``BEGIN IMMEDIATE`` before a write).
    """
    mode = "rwc" if create else "rw"
    uri = f"{path.absolute().as_uri()}?mode={mode}"
    return sqlite3.connect(uri, uri=True, timeout=BUSY_TIMEOUT_S, isolation_level=None)


@contextlib.contextmanager
def _writing(db: sqlite3.Connection) -> Iterator[None]:
    """One write transaction, holding the store's write lock from its first statement."""
    db.execute("BEGIN IMMEDIATE")
    try:
        yield
    except BaseException:
        with contextlib.suppress(sqlite3.Error):
            db.execute("ROLLBACK")
        raise
    db.execute("COMMIT")


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


#: The kinds of array an assessment blob may hold: bool, integers, floats, fixed-width text.
_ARRAY_KINDS = frozenset("biufU")


def _pack_arrays(arrays: dict[str, NDArray[np.generic]]) -> bytes:
    """Named arrays as a JSON header (name, type, shape) and their raw bytes, 8-byte aligned.

    Decoding is one ``np.frombuffer`` per array: no zip, no pickle, no parsing of
    per-array headers, so a rated member's many small arrays read back fast.
    """
    header, parts = [], []
    for key, array in arrays.items():
        a = np.ascontiguousarray(array)
        if a.dtype.kind not in _ARRAY_KINDS:
            raise ValueError(f"{key}: cannot store an array of {a.dtype}")
        data = a.tobytes()
        header.append([key, a.dtype.str, list(a.shape)])
        parts.append(data + b"\0" * (-len(data) % 8))
    head = json.dumps(header).encode("utf-8")
    head += b" " * (-len(head) % 8)
    return np.array([len(head)], "<i8").tobytes() + head + b"".join(parts)


def _unpack_arrays(blob: bytes) -> dict[str, NDArray[np.generic]]:
    """The arrays of :func:`_pack_arrays`; ValueError for a blob that does not decode."""
    if len(blob) < 8:
        raise ValueError("a stored rating is cut short")
    size = int(np.frombuffer(blob, "<i8", 1)[0])
    if not 0 <= size <= len(blob) - 8:
        raise ValueError("a stored rating has a damaged header")
    header = json.loads(blob[8 : 8 + size])
    offset, out = 8 + size, {}
    for key, kind, shape in header:
        dtype = np.dtype(kind)
        if dtype.kind not in _ARRAY_KINDS:
            raise ValueError(f"a stored rating holds an array of {dtype}")
        count = int(np.prod(shape, dtype=np.int64))
        end = offset + count * dtype.itemsize
        if end > len(blob):
            raise ValueError("a stored rating is cut short")
        out[key] = np.frombuffer(blob, dtype, count, offset).reshape(shape)
        offset = end + (-(end - offset) % 8)
    return out


def _pack_assessment(assessment: MemberAssessment) -> bytes:
    arrays: dict[str, NDArray[np.generic]] = {}
    parts = (
        ("rating", assessment.rating),
        ("screening", assessment.screening),
        ("dead", assessment.dead),
    )
    for name, part in parts:
        if part is not None:
            arrays |= {f"{name}.{k}": v for k, v in vars(part).items()}
    return _pack_arrays(arrays)


def _unpack_assessment(blob: bytes | None) -> MemberAssessment:
    if blob is None:
        return MemberAssessment()
    parts: dict[str, dict[str, Any]] = {}
    for key, array in _unpack_arrays(blob).items():
        name, field = key.split(".")
        parts.setdefault(name, {})[field] = array
    rating, screening, dead = parts.get("rating"), parts.get("screening"), parts.get("dead")
    try:
        return MemberAssessment(
            rating=None if rating is None else MemberRating(**rating),
            screening=None if screening is None else MemberScreening(**screening),
            dead=None if dead is None else MemberDeadLoads(**dead),
        )
    except TypeError as exc:  # written by another layout of the results
        raise ValueError(f"a stored rating does not have the expected fields ({exc})") from exc


def _pack_fatigue(ranges: FatigueRanges) -> bytes:
    return _pack_arrays({"cases": ranges.cases, "m_max": ranges.m_max, "m_min": ranges.m_min})


def _unpack_fatigue(blob: bytes | None) -> FatigueRanges | None:
    if blob is None:
        return None
    data: dict[str, Any] = dict(_unpack_arrays(blob))
    try:
        return FatigueRanges(cases=data["cases"], m_max=data["m_max"], m_min=data["m_min"])
    except KeyError as exc:
        raise ValueError(f"stored fatigue ranges lack {exc}") from exc


#: The arrays of a stored :class:`Governing` (every field of it).
_GOVERNING = tuple(f.name for f in dataclasses.fields(Governing))


def _pack_asbuilt(asbuilt: MemberAsBuilt) -> bytes:
    arrays: dict[str, NDArray[np.generic]] = {}
    d = asbuilt.deflection
    if d is not None:
        for sense in ("down", "up"):
            ext = getattr(d, sense)
            arrays |= {f"deflection.{sense}.{k}": getattr(ext, k) for k in _GOVERNING}
        arrays |= {
            "deflection.labels": np.array(d.labels),
            "deflection.span_length": d.span_length,
            "deflection.span_deflection": d.span_deflection,
            "deflection.span_ratio": d.span_ratio,
            "deflection.scalars": np.array([d.limit, d.df, d.df_source]),
        }
    return _pack_arrays(arrays)


def _unpack_asbuilt(blob: bytes | None) -> MemberAsBuilt:
    if blob is None:
        return MemberAsBuilt()
    data: dict[str, Any] = dict(_unpack_arrays(blob))
    if not data:
        return MemberAsBuilt()
    try:
        limit, df, source = (float(v) for v in data["deflection.scalars"])
        deflection = MemberDeflection(
            labels=tuple(str(label) for label in data["deflection.labels"]),
            down=Governing(**{k: data[f"deflection.down.{k}"] for k in _GOVERNING}),
            up=Governing(**{k: data[f"deflection.up.{k}"] for k in _GOVERNING}),
            span_length=data["deflection.span_length"],
            span_deflection=data["deflection.span_deflection"],
            span_ratio=data["deflection.span_ratio"],
            limit=limit,
            df=df,
            df_source=int(source),
        )
    except KeyError as exc:
        raise ValueError(f"stored deflections lack {exc}") from exc
    return MemberAsBuilt(deflection=deflection)


#: Each envelope array in the order it is stored, with its stored type: first the
#: layout, then per effect family and sense value, case, position, spacing (W per row, W
#: in the header) and concurrent effect; then, for a run with the Standard
#: Specifications' impact, its loaded length and fraction per effect (:data:`_IMPACT`);
#: the one-byte directions last (so every wider array stays aligned).
_ARRAYS: tuple[tuple[str, str, type[np.generic]], ...] = (
    ("", "station_span", np.int64),
    ("", "station_fraction", np.float64),
    ("", "station_x", np.float64),
    ("", "support_x", np.float64),
    *(
        (name, field, kind)
        for name in _EXTREMES
        for field, kind in (
            ("value", np.float64),
            ("case", np.int64),
            ("position", np.float64),
            ("spacing", np.float64),
            ("concurrent", np.float64),
        )
    ),
)
_DIRECTIONS: tuple[tuple[str, str, type[np.generic]], ...] = tuple(
    (name, "direction", np.int8) for name in _EXTREMES
)
#: The impact rows, stored as ("impact k", field): k indexes EFFECTS, whose attributes
#: _EXTREMES lists in the same order.
_IMPACT: tuple[tuple[str, str, type[np.generic]], ...] = tuple(
    (f"impact {k}", field, np.float64)
    for k in range(len(_EXTREMES))
    for field in ("loaded_length", "fraction")
)


def _stored(with_impact: bool) -> tuple[tuple[str, str, type[np.generic]], ...]:
    """The arrays of a stored envelope, in order (see :data:`_ARRAYS`)."""
    return (*_ARRAYS, *(_IMPACT if with_impact else ()), *_DIRECTIONS)


def _pack(env: MemberEnvelope) -> bytes:
    """An envelope as raw little-endian arrays behind a count of stations and supports.

    The header holds the number of stations, of supports, 1 when the envelope
    has the Standard Specifications' impact rows (else 0), and W, the width of
    the spacings (:class:`~batch.engine.effects.Governing`). Decoding is a
    handful of ``np.frombuffer`` views, fast enough to stream every member back
    to the writer for each result sheet.
    """
    impact = env.impact or ()
    width = env.m_max.spacing.shape[1]
    header = [env.station_x.size, env.support_x.size, int(env.impact is not None), width]
    parts = [np.array(header, "<i8").tobytes()]
    for name, field, kind in _stored(env.impact is not None):
        if name.startswith("impact "):
            array = getattr(impact[int(name.split()[1])], field)
        else:
            array = getattr(getattr(env, name), field) if name else getattr(env, field)
        parts.append(np.ascontiguousarray(array, np.dtype(kind).newbyteorder("<")).tobytes())
    return b"".join(parts)


def _unpack(member: str, blob: bytes | None, labels: tuple[str, ...]) -> MemberEnvelope:
    if blob is None:
        raise ValueError(f"member {member!r} has no stored results")
    if len(blob) < 32:
        raise ValueError(f"member {member!r}'s stored results are cut short")
    n_stations, n_supports, has_impact, width = (int(n) for n in np.frombuffer(blob, "<i8", 4))
    offset = 32
    arrays: dict[tuple[str, str], Any] = {}
    for name, field, kind in _stored(has_impact == 1):
        by_support = name.startswith("r_") or field == "support_x"
        if name.startswith("impact "):
            by_support = _EXTREMES[int(name.split()[1])].startswith("r_")
        count = n_supports if by_support else n_stations
        per_row = width if field == "spacing" else 1
        dtype = np.dtype(kind).newbyteorder("<")
        if width < 0 or offset + count * per_row * dtype.itemsize > len(blob):
            raise ValueError(f"member {member!r}'s stored results are cut short")
        array = np.frombuffer(blob, dtype, count * per_row, offset)
        arrays[name, field] = array.reshape(count, width) if field == "spacing" else array
        offset += count * per_row * dtype.itemsize
    if offset != len(blob):
        raise ValueError(f"member {member!r}'s stored results do not have the expected size")
    extremes: dict[str, Any] = {
        name: Governing(
            value=arrays[name, "value"],
            case=arrays[name, "case"],
            position=arrays[name, "position"],
            direction=arrays[name, "direction"],
            spacing=arrays[name, "spacing"],
            concurrent=arrays[name, "concurrent"],
        )
        for name in _EXTREMES
    }
    impact = None
    if has_impact == 1:
        impact = tuple(
            ImpactRows(
                loaded_length=arrays[f"impact {k}", "loaded_length"],
                fraction=arrays[f"impact {k}", "fraction"],
            )
            for k in range(len(_EXTREMES))
        )
    return MemberEnvelope(
        member=member,
        labels=labels,
        **{field: arrays["", field] for _, field, _ in _ARRAYS[:4]},
        **extremes,
        impact=impact,
    )


T = TypeVar("T")


class StoredMembers(Sequence[T]):
    """One kind of per-member result of a finished run, read from its store as needed.

    A sequence in member order that holds nothing in memory: iterating streams
    the members from the store file (one query, read as it goes), indexing reads
    one. It keeps a run's memory flat however many members the inventory has.
    ``column`` is one of the store's blob columns (``m.envelope``, ``a.blob`` or ``f.blob``),
    ``decode`` turns (member id, blob) into the result. Only members stored under
    the run key ``key`` are read, and each must be there: a member missing (the
    store was reset by another run after this one finished) raises
    :class:`StoreError` rather than giving fewer results.
    """

    def __init__(
        self,
        path: Path,
        key: str,
        size: int,
        column: str,
        decode: Callable[[str, bytes | None], T],
    ) -> None:
        self._path = path
        self._key = key
        self._size = size
        self._column = column
        self._decode = decode

    def __len__(self) -> int:
        return self._size

    def _rows(self, first: int, last: int) -> Iterator[T]:
        query = (
            f"SELECT m.idx, m.member, {self._column} FROM members m "  # fixed column names
            "LEFT JOIN assessments a ON a.idx = m.idx LEFT JOIN fatigue f ON f.idx = m.idx "
            "LEFT JOIN asbuilt b ON b.idx = m.idx "
            "WHERE m.run = ? AND m.idx >= ? AND m.idx < ? ORDER BY m.idx"
        )
        expected = first
        if not self._path.exists():
            raise StoreError(_lost(self._path, first))
        with _guarded(self._path):
            # (read-write, though it only reads: the last connection to close then tidies
            # away SQLite's -wal and -shm files, which a read-only one cannot)
            db = _connect(self._path, create=False)
            try:
                for idx, member, blob in db.execute(query, (self._key, first, last)):
                    if idx != expected:
                        break
                    yield self._decode(member, blob)
                    expected += 1
            finally:
                db.close()
        if expected != last:
            raise StoreError(_lost(self._path, expected))

    def __iter__(self) -> Iterator[T]:
        return self._rows(0, self._size)

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
        return next(self._rows(i, i + 1))


def _lost(path: Path, index: int) -> str:
    return (
        f"{path.name}: member {index + 1} is no longer in the checkpoint store under this "
        "run's input: another spanfleet run reset or took over the store while this one "
        "was going (the same --out, or the same workbook run twice at once), or the store "
        "was deleted, so this run stops rather than write results it did not compute; run "
        "again when the other run has finished, or give --out another name"
    )


class CheckpointStore:
    """Finished members of one run, by member index (see the module docstring).

    ``key`` identifies the run (input digest and version); opening a store whose
    key differs empties it. ``labels`` are the run's load-case labels, which the
    envelopes' case indices refer to; ``vehicles`` the fleet's ids. Opening makes
    this run the store's owner; ``resumed`` tells whether the store held this
    run's key already.
    """

    def __init__(
        self, path: Path, key: str, labels: tuple[str, ...], vehicles: tuple[str, ...]
    ) -> None:
        self.path = path
        self.key = key
        self.labels = labels
        self.token = secrets.token_hex(8)
        with _guarded(path):
            self._db = _connect(path, create=True)
        try:
            self._file = self._identity()
            with self._guard():
                self._open(vehicles)
        except BaseException:
            self._db.close()
            raise

    @contextlib.contextmanager
    def _guard(self) -> Iterator[None]:
        """:func:`_guarded`, saying so when the failure is the store taken away."""
        try:
            with _guarded(self.path):
                yield
        except StoreError:
            self._still_here()  # a store deleted under the run explains the failure best
            raise

    def _identity(self) -> tuple[int, int] | None:
        """The store file's device and inode, or None when it is gone."""
        try:
            found = os.stat(self.path)
        except OSError:
            return None
        return found.st_dev, found.st_ino

    def _open(self, vehicles: tuple[str, ...]) -> None:
        db = self._db
        db.execute("PRAGMA journal_mode=WAL")
        with _writing(db):
            if db.execute("PRAGMA user_version").fetchone()[0] != SCHEMA_VERSION:
                # An empty file, or a store of an earlier layout: built afresh.
                db.execute("DROP VIEW IF EXISTS vehicle_summary")
                for table in _TABLES:
                    db.execute(f"DROP TABLE IF EXISTS {table}")  # fixed table names
                for statement in _SCHEMA.split(";"):
                    if statement.strip():
                        db.execute(statement)
                db.execute(f"PRAGMA user_version = {SCHEMA_VERSION}")
            row = db.execute("SELECT value FROM meta WHERE key = 'run'").fetchone()
            self.resumed = row is not None and row[0] == self.key
            if not self.resumed:
                for table in _TABLES:
                    db.execute(f"DELETE FROM {table}")  # fixed table names
                db.execute("INSERT INTO meta VALUES ('run', ?)", (self.key,))
                db.execute("INSERT INTO meta VALUES ('labels', ?)", (json.dumps(self.labels),))
                db.executemany("INSERT INTO vehicles VALUES (?, ?)", list(enumerate(vehicles)))
            db.execute("INSERT OR REPLACE INTO meta VALUES ('token', ?)", (self.token,))

    def _still_here(self) -> None:
        """Raise StoreError unless the store's file is the one this run opened."""
        if self._file is None or self._identity() != self._file:
            raise StoreError(
                f"{self.path.name}: the checkpoint store was deleted or replaced while the run "
                "was going, so what this run stored is gone; run again (and leave the store "
                "alone while a run is going)"
            )

    def _still_ours(self) -> None:
        """Raise StoreError unless the store is this run's: same file, same key, our token."""
        self._still_here()
        meta = dict(self._db.execute("SELECT key, value FROM meta WHERE key IN ('run', 'token')"))
        if meta.get("run") == self.key and meta.get("token") == self.token:
            return
        who = (
            "another run of the same input"
            if meta.get("run") == self.key
            else "a run of another input (or of the workbook since it changed)"
        )
        raise StoreError(
            f"{self.path.name}: {who} took over this checkpoint store while this run was "
            "going (the same --out, or the same workbook run twice at once), so this run "
            "stops rather than mix the two; run again when the other run has finished, or "
            "give --out another name"
        )

    def finished(self, ids: Sequence[str]) -> set[int]:
        """Indices of the members stored under this run's key, each with the id ``ids`` gives."""
        with self._guard():
            rows = self._db.execute("SELECT idx, member FROM members WHERE run = ?", (self.key,))
            return {idx for idx, member in rows if 0 <= idx < len(ids) and ids[idx] == member}

    def put(
        self,
        index: int,
        envelope: MemberEnvelope,
        warnings: tuple[str, ...],
        peaks: NDArray[np.float64],
        assessment: MemberAssessment | None = None,
        fatigue: FatigueRanges | None = None,
        asbuilt: MemberAsBuilt | None = None,
    ) -> None:
        """Store one finished member, with its per-vehicle peaks (n_vehicles, 6), atomically.

        ``assessment`` (its rating and screening), ``fatigue`` (its moment ranges
        under fatigue loads) and ``asbuilt`` (its deflections) are stored when given. Raises
        :class:`StoreError` when the store is no longer this run's.
        """
        db = self._db
        with self._guard(), _writing(db):
            self._still_ours()
            db.execute(
                "INSERT OR REPLACE INTO members VALUES (?, ?, ?, ?, ?, ?)",
                (
                    index,
                    self.key,
                    self.token,
                    envelope.member,
                    _pack(envelope),
                    json.dumps(warnings),
                ),
            )
            db.executemany(
                "INSERT OR REPLACE INTO vehicle_peaks VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
                [(index, v, *map(float, row)) for v, row in enumerate(peaks)],
            )
            if assessment is not None:
                db.execute(
                    "INSERT OR REPLACE INTO assessments VALUES (?, ?)",
                    (index, _pack_assessment(assessment)),
                )
            if fatigue is not None:
                db.execute(
                    "INSERT OR REPLACE INTO fatigue VALUES (?, ?)", (index, _pack_fatigue(fatigue))
                )
            if asbuilt is not None:
                db.execute(
                    "INSERT OR REPLACE INTO asbuilt VALUES (?, ?)", (index, _pack_asbuilt(asbuilt))
                )

    def check_complete(self, size: int) -> None:
        """Raise StoreError unless members 0..size-1 are all stored under this run's key."""
        self._still_here()
        with self._guard():
            found = {
                idx
                for (idx,) in self._db.execute(
                    "SELECT idx FROM members WHERE run = ? AND idx < ?", (self.key, size)
                )
            }
        missing = next((i for i in range(size) if i not in found), None)
        if missing is not None:
            raise StoreError(_lost(self.path, missing))

    def stored_envelopes(self, size: int) -> StoredMembers[MemberEnvelope]:
        """Members 0..size-1's envelopes, read from the store file as they are needed."""
        labels = self.labels
        return StoredMembers(
            self.path,
            self.key,
            size,
            "m.envelope",
            lambda member, blob: _unpack(member, blob, labels),
        )

    def stored_assessments(self, size: int) -> StoredMembers[MemberAssessment]:
        """Members 0..size-1's ratings and screenings, read as they are needed."""
        return StoredMembers(
            self.path, self.key, size, "a.blob", lambda _, blob: _unpack_assessment(blob)
        )

    def stored_fatigue(self, size: int) -> StoredMembers[FatigueRanges | None]:
        """Members 0..size-1's fatigue moment ranges (None: no fatigue load), as needed."""
        return StoredMembers(
            self.path, self.key, size, "f.blob", lambda _, blob: _unpack_fatigue(blob)
        )

    def stored_asbuilt(self, size: int) -> StoredMembers[MemberAsBuilt]:
        """Members 0..size-1's results as built (deflections), as needed."""
        return StoredMembers(
            self.path, self.key, size, "b.blob", lambda _, blob: _unpack_asbuilt(blob)
        )

    def warnings(self) -> list[str]:
        """Every stored member's warnings, in member order."""
        with self._guard():
            rows = self._db.execute(
                "SELECT warnings FROM members WHERE run = ? ORDER BY idx", (self.key,)
            )
            return [w for (text,) in rows for w in json.loads(text)]

    def peak_rows(self) -> Iterator[PeakRow]:
        """Every per-vehicle summary row of this run, members and vehicles in input order."""
        query = (
            "SELECT p.member_idx, p.vehicle_idx, m.member, v.vehicle, "
            "p.m_max, p.m_min, p.v_max, p.v_min, p.r_max, p.r_min "
            "FROM vehicle_peaks p JOIN members m ON m.idx = p.member_idx "
            "JOIN vehicles v ON v.idx = p.vehicle_idx WHERE m.run = ? "
            "ORDER BY p.member_idx, p.vehicle_idx"
        )
        with self._guard():
            for mi, vi, member, vehicle, *values in self._db.execute(query, (self.key,)):
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
