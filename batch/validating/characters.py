r"""Text a workbook cannot hold: refused in the input, so ``check`` says what ``run`` would meet.

Every text of the input (ids, descriptions, library names, choices) may end up in a
result cell. A worksheet cell is XML 1.0 text, which cannot hold most control
characters (U+0000 to U+001F other than tab, line feed and carriage return), the
non-characters U+FFFE and U+FFFF, or an unpaired surrogate (U+D800 to U+DFFF, which
a JSON escape such as ``\ud800`` can produce but no UTF-8 text holds): W3C XML 1.0
(Fifth Edition), §2.2 "Characters", production [2] Char. A cell holds at most
32,767 characters (Microsoft's "Excel specifications and limits"). Such text is
refused here, by cell, with the fix; it is never cut or changed in silence.
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Iterator

from batch.reading.problems import DocPath, Locator, PathSet, Problem
from batch.validating.fields import label

__all__ = ["MAX_TEXT", "character_problems"]

#: Most characters a worksheet cell holds.
MAX_TEXT = 32_767

# Control characters but tab, line feed and carriage return; surrogates; U+FFFE, U+FFFF.
_BAD = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")
_NESTED = (str, dict, list)


def _texts(value: object, path: DocPath) -> Iterator[tuple[DocPath, str]]:
    """Every text in ``value`` with its path (numbers are passed over without a call)."""
    if isinstance(value, str):
        yield path, value
        return
    items: Iterable[tuple[str | int, object]] = (
        value.items()
        if isinstance(value, dict)
        else enumerate(value)
        if isinstance(value, list)
        else ()
    )
    for key, item in items:
        if isinstance(item, _NESTED):
            yield from _texts(item, (*path, key))


def character_problems(
    document: object, locator: Locator, bad: PathSet | None = None
) -> list[tuple[DocPath, Problem]]:
    """Every text of ``document`` that a result cell could not hold, as (path, problem).

    ``bad`` holds the paths already reported; they are skipped.
    """
    bad = bad or PathSet()
    found = []
    for path, text in _texts(document, ()):
        if bad.touches(path):
            continue
        found_bad = _BAD.search(text)
        if found_bad is not None:
            ch = found_bad.group()
            code = "text-not-unicode" if 0xD800 <= ord(ch) <= 0xDFFF else "text-control-character"
            what = (
                f"an unpaired surrogate (U+{ord(ch):04X}), half of a character"
                if code == "text-not-unicode"
                else f"the control character U+{ord(ch):04X}"
            )
            shown = text if len(text) <= 40 else text[:40] + "..."
            message = (
                f"{label(path)}: {shown!a} holds {what}, which no workbook cell can hold; "
                "delete it (it often comes with text copied from another program)"
            )
        elif len(text) > MAX_TEXT:
            code = "text-too-long"
            message = (
                f"{label(path)}: the text has {len(text):,} characters, more than the "
                f"{MAX_TEXT:,} a workbook cell holds; shorten it"
            )
        else:
            continue
        sheet, cell = locator.where(path)
        found.append((path, Problem(code=code, sheet=sheet, cell=cell, message=message)))
    return found
