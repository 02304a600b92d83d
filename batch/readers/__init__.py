"""Readers: an input file (workbook or JSON document) to a validated :class:`InputReport`.

:func:`read_input` is the one entry point. It reads the file's bytes once
(the file itself is never opened for writing), checks what the bytes really
are (:mod:`batch.readers.safety`), reads a workbook
(:mod:`batch.readers.workbook`) or a JSON document
(:mod:`batch.readers.jsondoc`) into the normalised document, and validates
it (:mod:`batch.validation`). It never raises for bad input: every problem
found is in the report at once.
"""

from __future__ import annotations

import hashlib
from pathlib import Path

from batch.readers.jsondoc import read_json
from batch.readers.safety import WORKBOOK_SUFFIXES, inspect_zip, read_bytes, sniff
from batch.readers.workbook import read_workbook
from batch.validation import validate
from batch.validation.problems import InputReport, Problem, Reading, file_problem

__all__ = ["read_input"]

_SAVE_AS = "open it in your spreadsheet program and save it as an Excel Workbook (.xlsx)"


def _refusal(kind: str, suffix: str, data: bytes, name: str) -> Problem | None:
    """Why these bytes cannot be read as an input with this name ending; None when they can."""
    if kind == "empty":
        return file_problem("file-empty", f"{name} is empty; give a workbook or a JSON document")
    if kind == "encrypted":
        return file_problem(
            "encrypted-workbook",
            f"{name} is protected by a password (encrypted), so it cannot be read; open it, "
            "remove the password to open, and save it as an Excel Workbook (.xlsx)",
        )
    if kind == "ole2":
        return file_problem(
            "xls-format", f"{name} is in the old binary Excel format (.xls); {_SAVE_AS}"
        )
    if kind == "zip":
        found = inspect_zip(data)
        if found is None and suffix not in WORKBOOK_SUFFIXES:
            return file_problem(
                "wrong-file-ending",
                f"{name} is an Excel workbook, but its name ends in {suffix or 'nothing'!r}; "
                "rename it to end in .xlsx",
            )
        return found
    if suffix == ".json":
        return None
    if suffix in WORKBOOK_SUFFIXES:
        return file_problem(
            "not-a-workbook",
            f"{name} is not an Excel workbook (its content does not start like one); {_SAVE_AS}",
        )
    return file_problem(
        "unsupported-file-type",
        f"spanfleet reads .xlsx and .xlsm workbooks and .json documents, not "
        f"{suffix or 'files without an ending'!r}; {_SAVE_AS}",
    )


def read_input(path: Path | str) -> InputReport:
    """Read and validate the input file at ``path``; never raises for bad input.

    A workbook (.xlsx, .xlsm) or a JSON document (.json) gives an
    :class:`InputReport` whose ``case`` is the validated model, or ``None`` with
    every problem listed when there is any error.
    """
    path = Path(path)
    data = read_bytes(path)
    if isinstance(data, Problem):
        return InputReport(case=None, problems=(data,))
    digest = hashlib.sha256(data).hexdigest()
    kind, suffix = sniff(data), path.suffix.lower()
    refusal = _refusal(kind, suffix, data, path.name)
    if refusal is not None:
        return InputReport(case=None, problems=(refusal,), digest=digest)
    source = "workbook" if kind == "zip" else "json"
    reading: Reading = read_workbook(data) if source == "workbook" else read_json(data)
    errors, warnings, case = validate(reading)
    return InputReport(
        case=case,
        problems=errors,
        warnings=warnings,
        digest=digest,
        document=reading.document,
        source=source,
    )
