"""Benchmark of the result writer alone: rows per second and peak memory.

    python scripts/bench_writer.py                    # ~300,000 Envelopes rows x 20 columns
    python scripts/bench_writer.py --members 2000     # a quick look

A seeded synthetic inventory is analysed for a few distinct members only; their
envelopes are repeated under fresh member ids until the inventory has
``--members`` members (about 31 station rows each for the default mix), so the
engine's time does not count. Then the whole result workbook — Envelopes,
Reactions, Governing, Moment Charts, Run Log — is written into a synthetic input
workbook's package and saved atomically, exactly as ``spanfleet run`` does, and
the script prints the time, rows and cells per second, microseconds per cell,
the file size and the peak memory the write added (resident set size, measured
with the kernel's high-water mark after resetting it; Linux only, else the
process peak).

Nothing here is a test: it prints figures and asserts nothing.
"""

from __future__ import annotations

import argparse
import dataclasses
import resource
import sys
import tempfile
import time
from pathlib import Path

from batch.demo.synthetic import synthetic_case
from batch.model import Settings
from batch.running.executor import run_case
from batch.writing.columns import ENVELOPES, GOVERNING, REACTIONS
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import SourcePackage
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo
from batch.writing.template import write_case_workbook

DISTINCT = 40  # members actually analysed; the rest repeat them


def _peak_kib() -> int:
    """Peak resident set size of this process, KiB (Linux: since the last reset)."""
    status = Path("/proc/self/status")
    if status.exists():
        for line in status.read_text().splitlines():
            if line.startswith("VmHWM:"):
                return int(line.split()[1])
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss


def _current_kib() -> int:
    status = Path("/proc/self/status")
    if status.exists():
        for line in status.read_text().splitlines():
            if line.startswith("VmRSS:"):
                return int(line.split()[1])
    return _peak_kib()


def _reset_peak() -> None:
    try:
        Path("/proc/self/clear_refs").write_text("5")  # Linux: reset VmHWM to VmRSS
    except OSError:
        pass


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--members", type=int, default=10_000)
    parser.add_argument("--vehicles", type=int, default=8)
    parser.add_argument("--seed", type=int, default=7)
    args = parser.parse_args()

    settings = Settings(stations_per_span=10, chart_members=50)
    case = synthetic_case(DISTINCT, args.vehicles, args.seed, settings)
    analysed = run_case(case)
    envelopes = tuple(
        dataclasses.replace(analysed.envelopes[k % DISTINCT], member=f"KV-{k + 1:05d} G1")
        for k in range(args.members)
    )
    big_case = dataclasses.replace(
        case, members=tuple(case.members[k % DISTINCT] for k in range(args.members))
    )
    result = dataclasses.replace(analysed, case=big_case, envelopes=envelopes, peaks=None)
    rows = {
        t.sheet: sum(len(t.columns[0].values(e)) for e in envelopes)
        for t in (ENVELOPES, REACTIONS, GOVERNING)
    }
    cells = sum(rows[t.sheet] * len(t.columns) for t in (ENVELOPES, REACTIONS, GOVERNING))

    with tempfile.TemporaryDirectory() as folder:
        book = Path(folder) / "kvha-input.xlsx"
        write_case_workbook(case, book)
        info = InputInfo(name=book.name, digest="0" * 64, source="workbook", output=book.name)
        source = SourcePackage(book.read_bytes(), book.name)
        before = _current_kib()
        _reset_peak()
        start = time.perf_counter()
        atomic_save(result_package(source, result, info), book)
        seconds = time.perf_counter() - start
        peak = _peak_kib()
        size = book.stat().st_size

    total_rows = sum(rows.values())
    print(f"members            {args.members:,} ({DISTINCT} distinct, repeated)")
    for sheet, n in rows.items():
        print(f"{sheet:<18} {n:,} rows")
    print(f"cells (3 tables)   {cells:,}")
    print(f"write + save       {seconds:.2f} s for the whole workbook")
    print(f"rows per second    {total_rows / seconds:,.0f}")
    print(f"per cell           {seconds / cells * 1e6:.2f} us (all sheets' time / table cells)")
    print(f"file size          {size / 2**20:.1f} MiB")
    print(f"memory added       {(peak - before) / 1024:.0f} MiB peak above the {before / 1024:.0f}")
    print("                   MiB held before writing (inputs and envelopes)")
    print(f"python             {sys.version.split()[0]}")


if __name__ == "__main__":
    main()
