"""The ``spanfleet`` command (also ``python -m batch``).

Commands::

    spanfleet run BOOK.xlsx                  results written back into BOOK.xlsx
    spanfleet run BOOK.xlsx --out OUT.xlsx   BOOK.xlsx untouched; input sheets + results to OUT
    spanfleet run case.json --out OUT.xlsx   JSON input (--out required)
    spanfleet check BOOK.xlsx [--json]       validate only; every problem printed
    spanfleet template NEW.xlsx              a blank, documented input workbook
    spanfleet library [--units SI]           the built-in load models
    spanfleet report BOOK.xlsx [--bridge P]  the printable rating report (PDF)

``--out`` never replaces a file spanfleet did not write unless ``--overwrite`` is
given; a read-only target, one open in a spreadsheet program, and a folder that
does not exist or cannot be written are refused before any work is done.

Exit status: 0 success; 1 the input has problems, or the results could not be
saved (each problem printed as ``Sheet!Cell: message``); 2 usage error; 3 an
internal error (please report it); 130 interrupted. A run that fails never
changes the input workbook. Set ``SPANFLEET_DEBUG=1`` to see the traceback of an
internal error.
"""

from __future__ import annotations

import argparse
import dataclasses
import json
import os
import sys
import time
import traceback
from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING

import batch

if TYPE_CHECKING:
    from batch.interface.session import Input, Results
    from batch.model.units import UnitSystem
    from batch.reading.problems import InputReport
    from batch.reporting.report import Report
    from batch.running.executor import ProgressFn
    from batch.writing.package.splice import SourcePackage

__all__ = ["EXIT_INTERNAL", "EXIT_OK", "EXIT_PROBLEMS", "EXIT_USAGE", "main"]

EXIT_OK = 0
EXIT_PROBLEMS = 1
EXIT_USAGE = 2
EXIT_INTERNAL = 3
EXIT_INTERRUPTED = 130

WORKBOOK_SUFFIXES = (".xlsx", ".xlsm")


class Refused(Exception):
    """The command cannot go on; the message says what is wrong and what to do (exit 1)."""


class Usage(Exception):
    """The command line asks for something impossible (exit 2)."""


def _say(text: str) -> None:
    print(text, file=sys.stderr)


def _warn(text: str) -> None:
    _say(f"warning: {text}")


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        raise argparse.ArgumentTypeError(f"{text!r} is not a whole number of at least 1")
    return value


def _positive_seconds(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        value = 0.0
    if not value > 0 or value == float("inf"):
        raise argparse.ArgumentTypeError(f"{text!r} is not a number of seconds above 0")
    return value


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the ``spanfleet`` command."""
    parser = argparse.ArgumentParser(
        prog="spanfleet",
        description="Live-load envelopes of a vehicle fleet over an inventory of girder lines.",
        epilog="Exit status: 0 success, 1 input problems, 2 usage error, 3 internal error.",
    )
    parser.add_argument("--version", action="version", version=f"spanfleet {batch.__version__}")
    sub = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")

    run = sub.add_parser("run", help="compute the envelopes and write the result sheets")
    run.add_argument("book", type=Path, help="input workbook (.xlsx, .xlsm) or JSON document")
    run.add_argument(
        "--out",
        type=Path,
        help="write the input sheets and the results to this workbook instead "
        "(the input is left untouched); required for JSON input",
    )
    run.add_argument("-q", "--quiet", action="store_true", help="print problems and warnings only")
    run.add_argument(
        "--jobs",
        type=_positive_int,
        default=None,
        metavar="N",
        help="worker processes (default: all local cores; small runs use one)",
    )
    run.add_argument(
        "--cluster",
        metavar="ADDRESS",
        help="run the members on an existing Dask cluster (e.g. tcp://10.0.0.5:8786); "
        "needs the 'cluster' extra",
    )
    run.add_argument(
        "--cluster-timeout",
        type=_positive_seconds,
        default=30.0,
        metavar="SECONDS",
        help="how long to wait for the cluster to answer before giving up (default 30)",
    )
    run.add_argument(
        "--overwrite",
        action="store_true",
        help="let --out replace an existing workbook that spanfleet did not write "
        "(one it wrote is replaced without asking)",
    )
    run.add_argument(
        "--no-store",
        action="store_true",
        help="keep no checkpoint store beside the workbook (no resume, no per-vehicle store)",
    )

    check = sub.add_parser("check", help="validate the input only; print every problem")
    check.add_argument("book", type=Path, help="input workbook or JSON document")
    check.add_argument("--json", action="store_true", help="print the report as JSON")

    template = sub.add_parser("template", help="write a blank, documented input workbook")
    template.add_argument("new", type=Path, help="name of the new workbook (.xlsx)")

    library = sub.add_parser("library", help="list the built-in load models")
    library.add_argument(
        "--units", choices=("US", "SI"), default="US", help="values in kip, ft or kN, m"
    )
    library.add_argument(
        "--json", action="store_true", help="print every model, part and value as JSON"
    )
    _report_parser(sub)
    return parser


def _report_parser(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """The ``report`` command's arguments."""
    report = sub.add_parser("report", help="write the printable rating report (PDF) of a run")
    report.add_argument("book", type=Path, help="input workbook (.xlsx, .xlsm) or JSON document")
    report.add_argument(
        "--out", type=Path, help="the PDF to write (default: BOOK's name ending in -report.pdf)"
    )
    report.add_argument(
        "--bridge",
        metavar="PREFIX",
        help="only the members whose id starts with PREFIX, e.g. the girder lines of one "
        "bridge (KV-0412 for KV-0412 G1, G2, ...); default: the whole inventory",
    )
    report.add_argument(
        "--store",
        type=Path,
        help="the checkpoint store of a finished run of BOOK (default: BOOK's own, beside "
        "it); without one, BOOK is run first (nothing is written to it)",
    )
    report.add_argument(
        "--jobs", type=_positive_int, default=None, metavar="N", help="worker processes"
    )
    report.add_argument("-q", "--quiet", action="store_true", help="print problems only")


# ---------------------------------------------------------------- reading


def _require_file(path: Path) -> None:
    if not path.exists():
        raise Refused(f"{path}: no such file; check the name and the folder")
    if path.is_dir():
        raise Refused(f"{path}: is a folder; give the input workbook or JSON file")


def _read(path: Path) -> InputReport:
    from batch.validating import read_input

    return read_input(path)


def _report_problems(report: InputReport, name: str) -> int:
    for w in report.warnings:
        _warn(w.render())
    if report.ok:
        return EXIT_OK
    for p in report.problems:
        _say(p.render())
    count = len(report.problems)
    _say(f"{name}: {count} problem{'s' if count != 1 else ''} found; fix them and run again.")
    return EXIT_PROBLEMS


# ---------------------------------------------------------------- run


def _target(src: Path, out: Path | None) -> tuple[Path, bool]:
    """Where results go, and whether that is the input itself (an in-place run)."""
    if out is None:
        return src.resolve(), True
    if out.is_dir():
        raise Refused(f"{out}: is a folder; give --out a workbook file name ending in .xlsx")
    same = out.exists() and os.path.samefile(src, out)
    return (src.resolve() if same else out.absolute()), same


def _check_names(src: Path, target: Path, is_json: bool, has_out: bool) -> None:
    if is_json and not has_out:
        raise Usage("a JSON input needs --out RESULTS.xlsx for the results")
    suffix = target.suffix.lower()
    if suffix not in WORKBOOK_SUFFIXES:
        raise Usage(f"{target.name}: results go to a workbook; give a name ending in .xlsx")
    if suffix == ".xlsm" and src.suffix.lower() != ".xlsm":
        raise Usage(f"{target.name}: .xlsm is for workbooks with macros; use .xlsx")


def _source(inp: Input, keep_vba: bool) -> SourcePackage:
    """The package the results go into (the input workbook's own, or a new one)."""
    from batch.interface.session import source_package
    from batch.writing.package.splice import BookProblem

    try:
        return source_package(inp, keep_vba)
    except BookProblem as exc:
        raise Refused(str(exc)) from exc


def _guard_target(target: Path, in_place: bool, overwrite: bool) -> None:
    """Refuse, before any work, a target the results could not or should not replace.

    The folder must exist and be writable (the workbook's temporary file and the
    checkpoint store go there); an existing target must be writable, not open in a
    spreadsheet program, and, for --out, a workbook spanfleet wrote (or --overwrite).
    """
    from batch.writing.package.save import open_elsewhere

    folder = target.parent
    elsewhere = "write the results elsewhere with --out" if in_place else "choose another --out"
    if not folder.is_dir():
        raise Refused(
            f"{target.name}: the folder {folder} does not exist; create it, or {elsewhere}"
        )
    if not os.access(folder, os.W_OK | os.X_OK):
        raise Refused(
            f"{target.name}: the folder {folder} is read-only for you, so neither the results "
            f"nor the checkpoint store can be written there; {elsewhere}"
        )
    if not target.exists():
        return
    unchanged = f"{target.name} was not changed."
    if not os.access(target, os.W_OK):
        raise Refused(
            f"{target.name}: the workbook is read-only, so spanfleet will not replace it; make "
            f"it writable, or {elsewhere}. {unchanged}"
        )
    lock = open_elsewhere(target)
    if lock is not None:
        raise Refused(
            f"{target.name}: seems to be open in a spreadsheet program (lock file {lock.name}); "
            f"close it and run again (delete the lock file if no program has it open), or "
            f"{elsewhere}. {unchanged}"
        )
    if not in_place and not overwrite and not _spanfleet_copy(target):
        raise Refused(
            f"{target.name}: the file exists and is not a copy spanfleet wrote with --out, so "
            f"it will not be replaced; give --out a new name, or add --overwrite to replace it. "
            f"{unchanged}"
        )


def _spanfleet_copy(path: Path) -> bool:
    """Whether ``path`` is a workbook spanfleet wrote with --out (safe to replace).

    It must hold result sheets spanfleet marked as its own, and its Run Log must
    name an input other than itself: a workbook run in place is the engineer's own.
    """
    import warnings

    import openpyxl

    from batch.writing.columns import RUN_LOG_SHEET
    from batch.writing.package.save import written_by_spanfleet
    from batch.writing.runlog import INPUT_FILE_ITEM, OUTPUT_FILE_ITEM

    if not written_by_spanfleet(path):
        return False
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            wb = openpyxl.load_workbook(path, read_only=True)
        try:
            rows = wb[RUN_LOG_SHEET].iter_rows(max_col=2, max_row=200, values_only=True)
            log = {str(item): value for item, value in rows if item is not None}
        finally:
            wb.close()
    except Exception:  # whatever is wrong with the file, it is not known to be a copy
        return False
    return log.get(INPUT_FILE_ITEM) != log.get(OUTPUT_FILE_ITEM)


def _progress(quiet: bool) -> ProgressFn | None:
    """A one-line progress display on a terminal: members done, rate, time left.

    Nothing when quiet or when standard error is not a terminal (a log file).
    """
    if quiet or not sys.stderr.isatty():
        return None
    start = time.monotonic()

    def show(done: int, total: int, member: str) -> None:
        spent = time.monotonic() - start
        rate = done / spent if spent > 0 else 0.0
        left = (total - done) / rate if rate > 0 else 0.0
        end = "\n" if done == total else ""
        print(
            f"\r  {done}/{total} members, {rate:.1f}/s, about {_duration(left)} left; "
            f"last {member[:30]:<30}",
            end=end,
            file=sys.stderr,
        )

    return show


def _duration(seconds: float) -> str:
    if seconds < 90:
        return f"{seconds:.0f} s"
    if seconds < 5400:
        return f"{seconds / 60:.0f} min"
    return f"{seconds / 3600:.1f} h"


def _cmd_run(args: argparse.Namespace) -> int:
    from batch.interface.session import InputChanged, input_of, results_package, run
    from batch.running.executor import ClusterError, RunError
    from batch.running.store import StoreError, store_path_for
    from batch.writing.package.save import SaveError, atomic_save
    from batch.writing.package.splice import BookProblem
    from batch.writing.results import replaced_note

    src: Path = args.book
    _require_file(src)
    is_json = src.suffix.lower() == ".json"
    target, in_place = _target(src, args.out)
    _check_names(src, target, is_json, args.out is not None)
    _guard_target(target, in_place, args.overwrite)
    report = _read(src)
    if (status := _report_problems(report, src.name)) != EXIT_OK:
        _say(f"{src.name} was not changed.")
        return status
    try:
        inp = input_of(report, src)
    except InputChanged as exc:
        raise Refused(str(exc)) from exc
    keep_vba = src.suffix.lower() == ".xlsm" and target.suffix.lower() == ".xlsm"
    source = _source(inp, keep_vba)
    for what in source.lacks:
        _warn(
            f"{target.name} will lack {what}: an .xlsx workbook cannot hold them; "
            "give --out a name ending in .xlsm to keep them"
        )
    try:
        results = run(
            inp,
            jobs=args.jobs,
            cluster=args.cluster,
            cluster_timeout=args.cluster_timeout,
            store=None if args.no_store else store_path_for(target),
            progress=_progress(args.quiet),
        )
        result = results.result
        # With a store, results are read back from it as the workbook is saved.
        package = results_package(results, target, source)
        atomic_save(package, target, expect_sha256=report.digest if in_place else None)
    except (RunError, StoreError, ClusterError) as exc:
        raise Refused(f"{exc}. {src.name} was not changed.") from exc
    except (SaveError, BookProblem) as exc:
        raise Refused(str(exc)) from exc
    for text in result.warnings:
        _warn(text)
    replaced = replaced_note(source)
    if replaced is not None and (replaced[1] or not args.quiet):
        say = _warn if replaced[1] else print
        say(f"{target.name}: {replaced[0]}")
    if not args.quiet:
        print(
            f"{target.name}: wrote {', '.join(package.sheets)} ({result.n_members} members, "
            f"{result.n_vehicles} vehicles, {result.n_load_cases} load cases, "
            f"{result.seconds:.1f} s)"
        )
    return EXIT_OK


# ---------------------------------------------------------------- other commands


def _cmd_check(args: argparse.Namespace) -> int:
    src: Path = args.book
    _require_file(src)
    report = _read(src)
    status = EXIT_OK if report.ok else EXIT_PROBLEMS
    if args.json:
        print(json.dumps({"file": str(src), **report.to_dict()}, indent=2))
        return status
    for p in report.problems:
        print(p.render())
    for w in report.warnings:
        print(f"warning: {w.render()}")
    if report.ok and report.case is not None:
        case = report.case
        if src.suffix.lower() in WORKBOOK_SUFFIXES:
            _check_writeback(src, report)
        print(
            f"{src.name}: no problems found ({len(case.members)} members, "
            f"{len(case.vehicles)} vehicles)."
        )
    else:
        print(f"{src.name}: {len(report.problems)} problem(s) found.")
    return status


def _check_writeback(src: Path, report: InputReport) -> None:
    """Say in advance when a run would refuse to write into this workbook."""
    from batch.writing.package.splice import BookProblem, SourcePackage

    try:
        SourcePackage(src.read_bytes(), src.name, keep_vba=src.suffix.lower() == ".xlsm")
    except BookProblem as exc:
        print(f"warning: {exc}")


def _cmd_template(args: argparse.Namespace) -> int:
    from batch.writing.template import write_template

    path: Path = args.new
    try:
        write_template(path)
    except FileExistsError:
        raise Refused(
            f"{path}: already exists; give a new file name (spanfleet never replaces an "
            "existing workbook with a blank template)"
        ) from None
    except ValueError as exc:
        raise Usage(str(exc)) from exc
    except OSError as exc:
        raise Refused(f"{path}: could not write the template: {exc.strerror or exc}") from exc
    print(f"{path.name}: blank input workbook written; fill it in, then: spanfleet run {path}")
    return EXIT_OK


def _cmd_library(args: argparse.Namespace) -> int:
    from batch.loads import library
    from batch.loads.sourced import STATUS_MEANINGS

    if args.json:
        print(json.dumps(_library_document(args.units), indent=2))
        return EXIT_OK
    rows = library.describe(args.units)
    if not rows:
        print("No built-in load models in this version; give every vehicle's axles.")
        return EXIT_OK
    unit = "kip" if args.units == "US" else "kN"
    header = ("Library name", "Axles", f"Weight ({unit})", "Status", "Source")
    table = [header, *((r.name, str(r.axles), f"{r.weight:.1f}", r.status, r.source) for r in rows)]
    widths = [max(len(row[k]) for row in table) for k in range(4)]
    for name, axles, weight, status, source in table:
        print(
            f"{name:<{widths[0]}}  {axles:>{widths[1]}}  {weight:>{widths[2]}}  "
            f"{status:<{widths[3]}}  {source}"
        )
    _print_parts(args.units)
    print("\nStatus of a model's values (each value's source and status: docs/load-models.md):")
    for status, meaning in STATUS_MEANINGS.items():
        print(f"  {status}: {meaning}")
    print("\nFrom memory, to be checked against the standard before relying on them:")
    for m in library.MODELS:
        memory = [v.what for v in m.values if v.status == "from memory"]
        if memory:
            print(f"  {m.name}: {'all values' if m.status == 'from memory' else '; '.join(memory)}")
    return EXIT_OK


@dataclasses.dataclass(frozen=True)
class _PartRow:
    """One part of a built-in model as listed: what it puts on the member.

    In the listing's units: axle loads front first; each spacing as [low, high] (equal
    for a fixed one; high None where the standard sets no upper end, "at least").
    ``dynamic_allowance`` is the standard's where it fixes one, else None (the run's);
    ``impact_formula`` the standard's formula where the allowance depends on the loaded
    length (then on axles and lane load alike), else None.
    """

    part: str
    axle_loads: list[float]
    spacings: list[tuple[float, float | None]]
    lane_load: float
    dynamic_allowance: float | None
    impact_formula: str | None
    factor: float
    scope: str
    min_span: float
    fatigue: bool


def _library_parts(units: UnitSystem) -> dict[str, list[_PartRow]]:
    """Each model's parts in ``units``, converted exactly (:meth:`LoadModel.cases`)."""
    from batch.loads import library
    from batch.loads.sourced import UNBOUNDED
    from batch.model.units import UNIT_LABELS

    return {
        m.name: [
            _PartRow(
                part=case.label,
                axle_loads=list(case.train.loads),
                spacings=[
                    (s.low, None if own.high >= UNBOUNDED else s.high)
                    for s, own in zip(case.train.spacings, item.train.spacings, strict=True)
                ],
                lane_load=case.lane_load,
                dynamic_allowance=item.impact,
                impact_formula=None
                if case.impact_formula is None
                else case.impact_formula.text(UNIT_LABELS[units]["length"]),
                factor=case.factor,
                scope=case.scope,
                min_span=case.min_span,
                fatigue=case.fatigue,
            )
            for item, case in zip(m.parts, m.cases(units, 0.0), strict=True)
        ]
        for m in library.MODELS
    }


def _print_parts(units: UnitSystem) -> None:
    """The parts table of ``spanfleet library``: what each model puts on the member."""
    from batch.model.units import UNIT_LABELS

    u = UNIT_LABELS[units]
    table = [
        (
            "Model (part)",
            f"Axle loads ({u['force']})",
            f"Spacings ({u['length']})",
            f"Lane ({u['line_load']})",
            "IM",
            "Factor",
        )
    ]
    for parts in _library_parts(units).values():
        table += [
            (
                p.part,
                ", ".join(f"{x:.4g}" for x in p.axle_loads),
                ", ".join(_spacing_text(low, high) for low, high in p.spacings) or "-",
                f"{p.lane_load:.4g}",
                p.impact_formula
                or ("run's" if p.dynamic_allowance is None else f"{p.dynamic_allowance:g}"),
                f"{p.factor:g}",
            )
            for p in parts
        ]
    widths = [max(len(row[k]) for row in table) for k in range(len(table[0]))]
    print(
        "\nParts (front axle first; a spacing range is searched exactly; IM: the dynamic "
        "allowance on axles, the run's Settings value unless the standard fixes it; a "
        "formula of the loaded length L is computed for each effect and applies to the lane "
        "load too):"
    )
    for row in table:
        print("  " + "  ".join(f"{c:<{w}}" for c, w in zip(row, widths, strict=True)).rstrip())


def _spacing_text(low: float, high: float | None) -> str:
    """A spacing as listed: ``14``, a range ``14-30``, or ``50 or more``."""
    if high is None:
        return f"{low:.4g} or more"
    return f"{low:.4g}" if high == low else f"{low:.4g}-{high:.4g}"


def _library_document(units: UnitSystem) -> dict[str, object]:
    """Every built-in model as a JSON document: its parts in ``units`` and its values' sources."""
    from batch.loads import library
    from batch.loads.sourced import STATUS_MEANINGS
    from batch.model.units import UNIT_LABELS

    parts = _library_parts(units)
    return {
        "units": units,
        "unit_labels": UNIT_LABELS[units],
        "statuses": dict(STATUS_MEANINGS),
        "models": [
            {
                "name": m.name,
                "aliases": list(m.aliases),
                "category": m.category,
                "defined_in": m.units,
                "description": m.description,
                "source": m.source,
                "status": m.status,
                "weight": m.weight(units),
                "parts": [dataclasses.asdict(p) for p in parts[m.name]],
                "values": [
                    {
                        "what": v.what,
                        "value": [list(x) if isinstance(x, tuple) else x for x in v.value],
                        "unit": v.unit,
                        "source": v.source,
                        "status": v.status,
                    }
                    for v in m.values
                ],
            }
            for m in library.MODELS
        ],
    }


def _cmd_report(args: argparse.Namespace) -> int:
    """Write the rating report of BOOK's results (from its store, or from a fresh run)."""
    src: Path = args.book
    _require_file(src)
    out: Path = args.out or src.with_name(f"{src.stem}-report.pdf")
    if out.suffix.lower() != ".pdf":
        raise Usage(f"{out.name}: the report is a PDF; give a name ending in .pdf")
    if out.is_dir() or not out.parent.is_dir():
        raise Refused(f"{out}: give --out a PDF file name in an existing folder")
    report = _read(src)
    if (status := _report_problems(report, src.name)) != EXIT_OK:
        return status
    results = _report_results(src, report, args)
    members = [
        m.id for m in results.case.members if args.bridge is None or m.id.startswith(args.bridge)
    ]
    if not members:
        raise Refused(
            f"--bridge {args.bridge}: no member id of {src.name} starts with it; the member ids "
            f"start like {', '.join(m.id for m in results.case.members[:5])}"
        )
    written = _write_report(results, out, members, args.bridge)
    if not args.quiet:
        count = len(written.members)
        print(f"{out.name}: {written.pages} pages, {count} member{'s' if count != 1 else ''}.")
    return EXIT_OK


def _report_results(src: Path, report: InputReport, args: argparse.Namespace) -> Results:
    """The results of BOOK: read from a finished run's store, or computed afresh."""
    from batch.interface.session import InputChanged, StoreMismatch, input_of, read_store, run
    from batch.running.executor import ClusterError, RunError
    from batch.running.store import StoreError, store_path_for

    store = args.store or store_path_for(src)
    try:
        if store.is_file():
            try:
                return read_store(store, src)
            except StoreMismatch as exc:
                if args.store is not None:
                    raise Refused(str(exc)) from exc
                if not args.quiet:
                    _say(f"{exc}; computing the results instead")
        elif args.store is not None:
            raise Refused(f"{store}: no such checkpoint store")
        return run(input_of(report, src), jobs=args.jobs, progress=_progress(args.quiet))
    except (InputChanged, RunError, StoreError, ClusterError) as exc:
        raise Refused(str(exc)) from exc


def _write_report(results: Results, out: Path, members: list[str], bridge: str | None) -> Report:
    """Write the report atomically: to a temporary file beside ``out``, then into place."""
    import tempfile

    from batch.reporting.report import write_report

    count = f"{len(members)} member{'s' if len(members) != 1 else ''}"
    scope = f"Bridge {bridge}, {count}" if bridge else ""
    handle, name = tempfile.mkstemp(prefix=f".{out.stem}-", suffix=".pdf", dir=out.parent)
    os.close(handle)
    temp = Path(name)
    try:
        written = write_report(results, temp, members, scope)
        os.replace(temp, out)
    except OSError as exc:
        raise Refused(
            f"{out.name}: the report could not be written ({exc.strerror or exc})"
        ) from exc
    finally:
        temp.unlink(missing_ok=True)
    return dataclasses.replace(written, path=out)


_COMMANDS = {
    "run": _cmd_run,
    "check": _cmd_check,
    "template": _cmd_template,
    "library": _cmd_library,
    "report": _cmd_report,
}


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line ``argv`` (default ``sys.argv[1:]``); returns the exit status."""
    for stream in (sys.stdout, sys.stderr):
        # A message may quote text that the terminal cannot encode (a lone surrogate from
        # JSON): escape it rather than fail while printing.
        reconfigure = getattr(stream, "reconfigure", None)
        if reconfigure is not None:
            reconfigure(errors="backslashreplace")
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse: --help, --version or a usage error
        return int(exc.code) if isinstance(exc.code, int) else EXIT_USAGE
    command = _COMMANDS[args.command]
    try:
        return command(args)
    except Usage as exc:
        parser.print_usage(sys.stderr)
        _say(f"spanfleet {args.command}: error: {exc}")
        return EXIT_USAGE
    except Refused as exc:
        _say(str(exc))
        return EXIT_PROBLEMS
    except KeyboardInterrupt:
        _say(f"spanfleet: interrupted; {_unchanged(args)}")
        return EXIT_INTERRUPTED
    except Exception as exc:
        if os.environ.get("SPANFLEET_DEBUG") == "1":
            traceback.print_exc()
        _say(
            f"spanfleet: internal error ({type(exc).__name__}: {exc}). {_unchanged(args)} "
            "Please report this, with the input file if you can; set SPANFLEET_DEBUG=1 to see "
            "the details."
        )
        return EXIT_INTERNAL


def _unchanged(args: argparse.Namespace) -> str:
    """Every save is atomic, so an aborted command never leaves a workbook half written."""
    book = getattr(args, "book", None)
    return f"{book.name} was not changed." if book is not None else "No workbook was changed."
