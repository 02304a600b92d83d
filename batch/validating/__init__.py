"""Readers: an input file (workbook or JSON document) to a validated :class:`InputReport`.

:func:`read_input` is the one entry point. It reads the file's bytes once
(the file itself is never opened for writing), checks what the bytes really
are (:mod:`batch.reading.safety`), reads a workbook
(:mod:`batch.reading.workbook`) or a JSON document
(:mod:`batch.reading.jsondoc`) into the normalised document, and validates
it (:mod:`batch.validating.validate`). It never raises for bad input: every problem
found is in the report at once.
"""

from __future__ import annotations

import hashlib
from pathlib import Path

from batch.reading.jsondoc import read_json
from batch.reading.problems import InputReport, Problem, Reading
from batch.reading.safety import read_bytes, refusal, sniff
from batch.reading.workbook import read_workbook
from batch.validating.validate import validate

__all__ = ["read_input"]


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
    refused = refusal(kind, suffix, data, path.name)
    if refused is not None:
        return InputReport(case=None, problems=(refused,), digest=digest)
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
