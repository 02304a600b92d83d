"""spanfleet from Python: read an input, run it, get DataFrames, write the workbook.

The ``spanfleet run`` command is a thin layer over these functions, so a script or a
notebook gets exactly what the command gives::

    from batch.interface import read, run
    results = run(read("sample_workbooks/kvha-inventory.xlsx"))
    results.envelopes        # a DataFrame, one row per member and station

* :func:`read` reads and validates a workbook or a JSON document (every problem at
  once, as :class:`InputError`); :func:`from_case` takes a :class:`~batch.model.Case`
  built in Python.
* :func:`run` computes it with the command's options: worker processes (``jobs``), a
  Dask cluster (``cluster``) and a checkpoint store (``store``).
* :class:`Results` gives each result sheet as a DataFrame (:mod:`batch.interface.frames`:
  columns titled with their units, as the sheet is) and :meth:`Results.write` writes
  the workbook the command writes, byte for byte but for the Run Log's times.
* :func:`read_store` reads the checkpoint store of a finished run back into
  :class:`Results` without computing anything.

Units are the input's (``Results.units``); sign conventions the workbook's: sagging
moment positive; V the sum of the upward forces left of the section; reactions
upward positive.
"""

from __future__ import annotations

import dataclasses
import hashlib
import io
import json
import os
import sqlite3
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path

import pandas as pd

import batch
from batch.interface.frames import table_frame, unit_labels
from batch.model import Case
from batch.model.sheets import SETTING_ROWS
from batch.reading.problems import InputReport, Problem
from batch.running.executor import ProgressFn, RunOptions, RunResult, run_case
from batch.validating import read_input
from batch.writing.columns import (
    CONCURRENT,
    ENVELOPES,
    GOVERNING,
    RATING_MATRIX,
    RATINGS,
    REACTIONS,
    RESULT_TABLES,
    SCREENING,
    SCREENING_DETAIL,
    VEHICLE_SUMMARY,
)
from batch.writing.declare import AnyTable
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import ResultPackage, SourcePackage
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo
from batch.writing.template import case_rows, input_workbook

__all__ = [
    "Input",
    "InputChanged",
    "InputError",
    "Results",
    "StoreMismatch",
    "from_case",
    "input_of",
    "read",
    "read_store",
    "results_package",
    "run",
    "run_key",
    "source_package",
]


class InputError(Exception):
    """The input has problems; ``problems`` lists every one (``Sheet!Cell: message``)."""

    def __init__(self, name: str, problems: tuple[Problem, ...]) -> None:
        self.problems = problems
        lines = "\n".join(p.render() for p in problems)
        count = len(problems)
        super().__init__(
            f"{name}: {count} problem{'s' if count != 1 else ''} found; fix them and run "
            f"again:\n{lines}"
        )


class InputChanged(Exception):
    """The input file changed between reading it and writing its results."""


class StoreMismatch(Exception):
    """A checkpoint store is not that of the input given, or its run is not finished."""


@dataclass(frozen=True)
class Input:
    """A validated input: its report (case, warnings, digest, document) and its origin.

    ``path`` is the file read (None for a case built in Python); ``data`` its bytes
    when it is a workbook (the results are spliced into a copy of them).
    """

    report: InputReport
    path: Path | None = None
    data: bytes | None = None

    @property
    def case(self) -> Case:
        """The validated model."""
        assert self.report.case is not None
        return self.report.case

    @property
    def name(self) -> str:
        """The input's file name (``case`` for a case built in Python)."""
        return self.path.name if self.path is not None else "case"

    @property
    def warnings(self) -> tuple[str, ...]:
        """The input's warnings, each ``Sheet!Cell: message``."""
        return tuple(w.render() for w in self.report.warnings)


def read(path: str | os.PathLike[str]) -> Input:
    """Read and validate a workbook (.xlsx, .xlsm) or a JSON document (.json).

    Raises :class:`InputError` listing every problem when the input has any.
    """
    path = Path(path)
    report = read_input(path)
    if not report.ok:
        raise InputError(path.name, report.problems)
    return input_of(report, path)


def input_of(report: InputReport, path: Path) -> Input:
    """The input read from ``path`` whose clean ``report`` is given.

    A workbook's bytes are read again for the results to be spliced into; raises
    :class:`InputChanged` when they are no longer the bytes the report was made from.
    """
    data = None
    if report.source == "workbook":
        data = path.read_bytes()
        if hashlib.sha256(data).hexdigest() != report.digest:
            raise InputChanged(
                f"{path.name}: the file changed while spanfleet was reading it; save it in "
                "your spreadsheet program, close it and run again"
            )
    return Input(report=report, path=path, data=data)


def from_case(case: Case) -> Input:
    """A case built in Python, as an input (its results go to a new workbook)."""
    document = json.loads(json.dumps(dataclasses.asdict(case), default=str))
    return Input(report=InputReport(case=case, document=document, source="python"))


def run_key(report: InputReport) -> str:
    """Identifies the validated input and the program version, for the checkpoint store."""
    text = json.dumps(report.document, sort_keys=True, default=str)
    return hashlib.sha256(f"{batch.__version__}\n{text}".encode()).hexdigest()


def run(
    source: Input | Case,
    *,
    jobs: int | None = None,
    cluster: str | None = None,
    cluster_timeout: float = 30.0,
    store: str | os.PathLike[str] | None = None,
    progress: ProgressFn | None = None,
) -> Results:
    """Run an input (or a case) as ``spanfleet run`` does; returns its :class:`Results`.

    ``jobs`` worker processes (None: every local core; small runs use one),
    ``cluster`` the address of a Dask cluster, ``store`` a checkpoint store file
    (None: none; a store of an interrupted run of the same input is resumed).
    ``progress`` is called as members finish (done, total, member id). Raises
    :class:`~batch.running.executor.RunError`, :class:`~batch.running.store.StoreError`
    or :class:`~batch.running.executor.ClusterError` with the reason.
    """
    inp = source if isinstance(source, Input) else from_case(source)
    options = RunOptions(
        jobs=jobs,
        cluster=cluster,
        cluster_timeout=cluster_timeout,
        store=Path(store) if store is not None else None,
        key=run_key(inp.report),
    )
    return Results(run_case(inp.case, progress, options), inp)


def read_store(store: str | os.PathLike[str], book: str | os.PathLike[str]) -> Results:
    """The results kept in the checkpoint ``store`` of a finished run of the input ``book``.

    Nothing is computed: the store must be that of ``book`` as it is now (same input,
    same spanfleet version) and hold every member. Raises :class:`StoreMismatch`
    otherwise, leaving the store untouched.
    """
    store = Path(store)
    inp = read(book)
    if not store.is_file():
        raise StoreMismatch(f"{store.name}: no such checkpoint store")
    key, done = _store_state(store)
    if key != run_key(inp.report):
        raise StoreMismatch(
            f"{store.name}: this store is of another input (or another spanfleet version) "
            f"than {inp.name}; run {inp.name} again to make its results"
        )
    if done < len(inp.case.members):
        raise StoreMismatch(
            f"{store.name}: holds {done} of {len(inp.case.members)} members; the run was "
            f"interrupted: run {inp.name} again with the same store to finish it"
        )
    return run(inp, jobs=1, store=store)


def _store_state(store: Path) -> tuple[str | None, int]:
    """The run key and the number of finished members of a store, read without changing it."""
    try:
        db = sqlite3.connect(f"{store.resolve().as_uri()}?mode=ro", uri=True)
        try:
            row = db.execute("SELECT value FROM meta WHERE key = 'run'").fetchone()
            (done,) = db.execute("SELECT COUNT(*) FROM members").fetchone()
        finally:
            db.close()
    except sqlite3.Error as exc:
        raise StoreMismatch(f"{store.name}: not a spanfleet checkpoint store ({exc})") from exc
    return (row[0] if row else None), int(done)


def source_package(inp: Input, keep_vba: bool = False) -> SourcePackage:
    """The package the results go into: the input workbook's own, or a new one.

    For JSON input or a case built in Python, the new workbook holds its input sheets.
    """
    if inp.data is not None:
        return SourcePackage(inp.data, inp.name, keep_vba=keep_vba)
    case = inp.case
    settings = {row.key: getattr(case.settings, row.key) for row in SETTING_ROWS}
    wb = input_workbook(units=case.settings.units, settings=settings, rows=case_rows(case))
    for ws in wb.worksheets:
        ws.sheet_view.tabSelected = False  # the results' Governing sheet will be the active one
    buffer = io.BytesIO()
    wb.save(buffer)
    return SourcePackage(
        buffer.getvalue(), f"({inp.report.source.upper()} input)", keep_active=False
    )


def results_package(
    results: Results, target: str | os.PathLike[str], source: SourcePackage | None = None
) -> ResultPackage:
    """The workbook of ``results`` to be saved as ``target`` (not yet written).

    ``source`` is the package the results go into (default :func:`source_package`).
    """
    inp = results.input
    info = InputInfo(
        name=inp.name,
        digest=inp.report.digest,
        source=inp.report.source,
        output=Path(target).name,
        warnings=inp.warnings,
    )
    return result_package(source or source_package(inp), results.result, info)


class Results:
    """A run's results: each result sheet as a DataFrame, and the workbook to write.

    ``result`` is the run itself (:class:`~batch.running.executor.RunResult`),
    ``input`` what it ran. Frames are made when first asked for and kept.
    """

    def __init__(self, result: RunResult, inp: Input) -> None:
        self.result = result
        self.input = inp
        self._frames: dict[str, pd.DataFrame] = {}

    @property
    def case(self) -> Case:
        """The case that was run."""
        return self.result.case

    @property
    def units(self) -> Mapping[str, str]:
        """The unit of each quantity in this run: ``length``, ``force``, ``moment``, ..."""
        return unit_labels(self.result)

    @property
    def warnings(self) -> tuple[str, ...]:
        """The input's warnings and the run's, in that order."""
        return (*self.input.warnings, *self.result.warnings)

    def tables(self) -> tuple[AnyTable, ...]:
        """The result tables this run writes (rated and screened ones only when asked for)."""
        return tuple(t for t in RESULT_TABLES if t.wanted(self.result))

    def frame(self, sheet: str) -> pd.DataFrame:
        """The result sheet ``sheet`` (e.g. ``"Envelopes"``) as a DataFrame.

        Raises ``KeyError`` when this run writes no such sheet (e.g. Ratings without
        capacities), saying why.
        """
        if sheet not in self._frames:
            table = next((t for t in RESULT_TABLES if t.sheet == sheet), None)
            if table is None:
                known = ", ".join(t.sheet for t in RESULT_TABLES)
                raise KeyError(f"{sheet!r} is not a result sheet; the result sheets are {known}")
            if not table.wanted(self.result):
                raise KeyError(f"this run writes no {sheet} sheet: {_why_not(table)}")
            self._frames[sheet] = table_frame(table, self.result)
        return self._frames[sheet]

    def frames(self) -> dict[str, pd.DataFrame]:
        """Every result sheet this run writes, by sheet name, in workbook order."""
        return {t.sheet: self.frame(t.sheet) for t in self.tables()}

    @property
    def envelopes(self) -> pd.DataFrame:
        """One row per member and station: M max, M min, V max, V min, what governs each."""
        return self.frame(ENVELOPES.sheet)

    @property
    def reactions(self) -> pd.DataFrame:
        """One row per member and support: R max and R min, what governs each."""
        return self.frame(REACTIONS.sheet)

    @property
    def governing(self) -> pd.DataFrame:
        """One row per member: its extreme of every effect, where and by which vehicle."""
        return self.frame(GOVERNING.sheet)

    @property
    def concurrent_forces(self) -> pd.DataFrame:
        """One row per member and station: each governing V and M with the force acting with it.

        The moment acting with each governing shear and the shear with each governing
        moment (the same vehicle in the same place), and what governs each.
        """
        return self.frame(CONCURRENT.sheet)

    @property
    def vehicle_summary(self) -> pd.DataFrame:
        """One row per member and vehicle: the vehicle's extreme of each effect."""
        return self.frame(VEHICLE_SUMMARY.sheet)

    @property
    def ratings(self) -> pd.DataFrame:
        """One row per rated member and vehicle: the governing rating factor and its terms."""
        return self.frame(RATINGS.sheet)

    @property
    def rating_matrix(self) -> pd.DataFrame:
        """Rated members down, vehicles across: the governing rating factor of each pair."""
        return self.frame(RATING_MATRIX.sheet)

    @property
    def postings(self) -> pd.DataFrame:
        """The rows of :attr:`ratings` with a posting load (legal loads rating below 1)."""
        ratings = self.ratings
        posting = next(c for c in ratings.columns if str(c).startswith("Posting load"))
        rows: pd.DataFrame = ratings.loc[ratings[posting].notna()].reset_index(drop=True)
        return rows

    @property
    def screening(self) -> pd.DataFrame:
        """Members down, vehicles across: the largest ratio to the reference vehicle."""
        return self.frame(SCREENING.sheet)

    @property
    def screening_detail(self) -> pd.DataFrame:
        """One row per member and vehicle: the largest ratio to the reference, and where."""
        return self.frame(SCREENING_DETAIL.sheet)

    def write(self, path: str | os.PathLike[str], *, overwrite: bool = False) -> Path:
        """Write the results workbook to ``path``, as ``spanfleet run ... --out`` writes it.

        A workbook input is copied with the result sheets added (every sheet of it
        kept); a JSON input or a case gets its input sheets in a new workbook. The save
        is atomic. Raises ``FileExistsError`` when ``path`` exists, unless
        ``overwrite``; the input itself is never written over.
        """
        target = Path(path)
        src = self.input.path
        if src is not None and target.exists() and os.path.samefile(src, target):
            raise FileExistsError(f"{target.name}: is the input; write the results elsewhere")
        if target.exists() and not overwrite:
            raise FileExistsError(f"{target.name}: exists; give another name or overwrite=True")
        keep_vba = (
            src is not None and src.suffix.lower() == ".xlsm" and target.suffix.lower() == ".xlsm"
        )
        atomic_save(results_package(self, target, source_package(self.input, keep_vba)), target)
        return target


def _why_not(table: AnyTable) -> str:
    if table is VEHICLE_SUMMARY:
        return "it has more rows than a sheet holds; read its rows from the checkpoint store"
    if table in (RATINGS, RATING_MATRIX):
        return "no member has Capacities rows"
    return "Settings has no Reference vehicle"
