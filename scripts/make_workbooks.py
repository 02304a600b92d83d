"""Regenerate the committed workbooks: the blank template and the sample workbooks.

Run from anywhere: ``python scripts/make_workbooks.py``. The files are built
entirely from batch/inputs.py (layout) and batch/samples.py (demo data), so
never edit them by hand; tests compare them with a fresh regeneration.
"""

from __future__ import annotations

import sys
from pathlib import Path

from batch.demo.kvha import SAMPLE_WORKBOOKS
from batch.writing.template import write_case_workbook, write_template

ROOT = Path(__file__).resolve().parent.parent
TEMPLATE = ROOT / "templates" / "spanfleet-template.xlsx"
SAMPLES_DIR = ROOT / "sample_workbooks"


def main() -> int:
    TEMPLATE.parent.mkdir(exist_ok=True)
    write_template(TEMPLATE, overwrite=True)
    print(f"wrote {TEMPLATE.relative_to(ROOT)}")
    SAMPLES_DIR.mkdir(exist_ok=True)
    for name, case in SAMPLE_WORKBOOKS.items():
        path = SAMPLES_DIR / name
        write_case_workbook(case, path, overwrite=True)
        print(f"wrote {path.relative_to(ROOT)}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
