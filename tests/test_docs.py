"""The documentation: generated parts current, references a maintainer can follow.

docs/workbook.md states the input sheets; its tables are generated from the column
declarations of batch/model/case.py (scripts/generate.py writes them), so a column
added in code cannot be missing from the specification that engineers and scripts
read. docs/load-models.md lists every value of every built-in load model with its
source and status, generated from the library (batch/loads/library), so a value
cannot change without its listing. Every test, docstring, comment and document cites
the published source itself or a file inside this repository, never a file outside it
or an absolute path of a machine (project rule).
"""

from __future__ import annotations

import re
import subprocess
from pathlib import Path

import pytest
from generate import (
    LOAD_MODELS_DOC,
    WORKBOOK_DOC,
    input_sheet_tables,
    load_models_doc,
    workbook_doc,
)


def test_workbook_doc_tables_are_current() -> None:
    current = WORKBOOK_DOC.read_text("utf-8")
    assert workbook_doc(current) == current, "run `python scripts/generate.py` and commit"


def test_every_input_column_is_in_the_workbook_doc() -> None:
    from batch.model.sheets import INPUT_SHEETS, SETTING_ROWS, SETTINGS

    tables = input_sheet_tables()
    for sheet in INPUT_SHEETS:
        assert f"### {sheet.name}" in tables
        for col in SETTING_ROWS if sheet is SETTINGS else sheet.columns:
            assert f"| {col.header} |" in tables, (sheet.name, col.header)


def test_load_models_doc_is_current() -> None:
    current = LOAD_MODELS_DOC.read_text("utf-8")
    assert load_models_doc() == current, "run `python scripts/generate.py` and commit"


def test_every_model_and_value_is_in_the_load_models_doc() -> None:
    from batch.loads import library

    doc = load_models_doc()
    for m in library.MODELS:
        assert f"## {m.name}\n" in doc
        for v in m.values:
            assert f"| {v.what.replace('|', chr(92) + '|')} |" in doc, (m.name, v.what)


# --- references a maintainer can follow ------------------------------------------------

ROOT = Path(__file__).resolve().parent.parent
SCANNED = ("batch", "tests", "scripts", "docs", "README.md", "DEVELOPERS.md")

# Citations must name the published source itself or a file inside this repository.
# The forbidden strings are assembled from parts so that this file does not hold them.
_FORBIDDEN_TEXT = (
    "shared" + "/contract",  # a workbook specification kept outside the repository
    "shared" + "/references",  # notes kept outside the repository
    "published" + "-facts",  # those notes, by name
    "[F" + " S",  # their source tags, which mean nothing without them
)
# An absolute path of a machine: work, tmp, home, root or Users just under the file-system
# root; not when the slash continues a word, a URL or a relative path ("a/tmp/b").
_ABSOLUTE_PATH = re.compile(r"(?<![\w.~/-])/(?:work|tmp|home|root|Users)/")


def _tracked_text_files() -> list[Path]:
    try:
        listed = subprocess.run(
            ["git", "ls-files", "-z", "--", *SCANNED],
            cwd=ROOT,
            capture_output=True,
            check=True,
        ).stdout
    except (OSError, subprocess.CalledProcessError):
        pytest.skip("not a git checkout: the tracked files cannot be listed")
    files = []
    for name in listed.decode("utf-8").split("\0"):
        path = ROOT / name
        if name and path.resolve() != Path(__file__).resolve() and path.is_file():
            files.append(path)
    return files


def test_references_stay_inside_the_repository() -> None:
    files = _tracked_text_files()
    assert any(p.name == "validation.md" for p in files), "the scan found the docs"
    hits = []
    for path in files:
        try:
            text = path.read_text("utf-8")
        except UnicodeDecodeError:
            continue  # not text
        for number, line in enumerate(text.splitlines(), start=1):
            found = [s for s in _FORBIDDEN_TEXT if s in line]
            found += _ABSOLUTE_PATH.findall(line)
            if found:
                hits.append(f"{path.relative_to(ROOT)}:{number}: {found}: {line.strip()}")
    assert not hits, (
        "cite the published source itself or a file of this repository, never a file"
        " outside it or an absolute path:\n" + "\n".join(hits)
    )
