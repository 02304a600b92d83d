"""Problems found in an input, and the report that carries them.

A problem is data: a stable kebab-case ``code``, where it is (``sheet`` and
``cell``), the value seen, and a message that says what is wrong and how to fix
it. Positions come from a *locator*, which turns a path in the normalised
document (``("members", 3, "spans")``) into the sheet and cell the value came
from, so the same checks serve workbook and JSON input alike:

* workbook input: ``Members!C7``;
* JSON input: sheet ``"JSON"`` and a JSON pointer, ``JSON /members/3/spans``;
* a problem with the whole file: sheet ``""`` and cell ``""``, ``file: ...``.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any, Literal, Protocol

from batch.model import Case

__all__ = [
    "JSON_SHEET",
    "DocPath",
    "InputReport",
    "JsonLocator",
    "Locator",
    "PathSet",
    "Problem",
    "Reading",
    "Severity",
    "WorkbookLocator",
    "file_problem",
]

Severity = Literal["error", "warning"]
#: A path into the normalised document: keys and list indexes from the root.
DocPath = tuple[str | int, ...]
#: The ``sheet`` of every problem found in a JSON document.
JSON_SHEET = "JSON"


@dataclass(frozen=True, kw_only=True)
class Problem:
    """One thing wrong with the input (an error) or worth a second look (a warning).

    ``cell`` is an A1 reference (``"C7"``), a JSON pointer for JSON input, or
    ``""`` when the problem concerns a whole sheet or the whole file.
    """

    code: str
    sheet: str
    cell: str
    message: str
    severity: Severity = "error"
    value: str | None = None

    def render(self) -> str:
        """The problem as one line for people: ``Members!C7: message``."""
        if self.sheet == JSON_SHEET:
            where = f"{JSON_SHEET} {self.cell}" if self.cell else JSON_SHEET
        elif not self.sheet:
            where = "file"
        else:
            where = f"{self.sheet}!{self.cell}" if self.cell else self.sheet
        return f"{where}: {self.message}"

    def to_dict(self) -> dict[str, str | None]:
        """The problem as a plain dict for a JSON report."""
        return {
            "code": self.code,
            "severity": self.severity,
            "sheet": self.sheet,
            "cell": self.cell,
            "message": self.message,
            "value": self.value,
            "text": self.render(),
        }


def file_problem(code: str, message: str) -> Problem:
    """An error about the whole input file (no sheet, no cell)."""
    return Problem(code=code, sheet="", cell="", message=message)


@dataclass(frozen=True, kw_only=True)
class InputReport:
    """Everything :func:`batch.validating.read_input` learnt about one input file.

    ``case`` is the validated model, or ``None`` when there is any error.
    ``problems`` are the errors and ``warnings`` the warnings, in the order
    found. ``digest`` is the SHA-256 (hex) of the file's bytes; ``document`` the
    normalised JSON document (``None`` when the file could not be read at all);
    ``source`` is ``"workbook"`` or ``"json"`` (``""`` when unknown).
    """

    case: Case | None
    problems: tuple[Problem, ...] = ()
    warnings: tuple[Problem, ...] = ()
    digest: str = ""
    document: dict[str, Any] | None = None
    source: str = ""

    @property
    def ok(self) -> bool:
        """True when there is no error (warnings allowed)."""
        return not self.problems

    def to_dict(self) -> dict[str, Any]:
        """The report (without the model) as a plain dict for a JSON report."""
        return {
            "ok": self.ok,
            "source": self.source,
            "digest": self.digest,
            "problems": [p.to_dict() for p in self.problems],
            "warnings": [p.to_dict() for p in self.warnings],
        }


class PathSet:
    """A set of document paths, asked whether a path is at, under or above one of them."""

    def __init__(self, paths: frozenset[DocPath] | set[DocPath] = frozenset()):
        self.paths = frozenset(paths)
        self._prefixes = {p[:k] for p in self.paths for k in range(len(p) + 1)}

    def touches(self, path: DocPath) -> bool:
        """True when ``path`` is one of the paths, inside one, or contains one."""
        return path in self._prefixes or any(path[:k] in self.paths for k in range(len(path)))


class Locator(Protocol):
    """Turns a document path into the (sheet, cell) the value came from."""

    def where(self, path: DocPath) -> tuple[str, str]:
        """Sheet and cell of ``path`` (or of its nearest located parent)."""
        ...


def _pointer(path: DocPath) -> str:
    return "".join("/" + str(p).replace("~", "~0").replace("/", "~1") for p in path)


@dataclass(frozen=True)
class JsonLocator:
    """Locator of a JSON document: every path is its own JSON pointer."""

    def where(self, path: DocPath) -> tuple[str, str]:
        """``("JSON", "/members/3/spans")`` for ``("members", 3, "spans")``."""
        return JSON_SHEET, _pointer(path)


@dataclass(frozen=True)
class WorkbookLocator:
    """Locator of a document read from a workbook: path -> (sheet, cell) recorded by the reader."""

    cells: Mapping[DocPath, tuple[str, str]] = field(default_factory=dict)

    def where(self, path: DocPath) -> tuple[str, str]:
        """The recorded cell of ``path``; else that of its nearest recorded parent."""
        for end in range(len(path), -1, -1):
            found = self.cells.get(path[:end])
            if found is not None:
                return found
        return "", ""


@dataclass(frozen=True, kw_only=True)
class Reading:
    """What a reader hands to validation.

    ``document`` is the normalised document (``None`` when the file could not
    be read at all); ``problems`` those found while reading (both severities);
    ``blocked`` the document paths whose value was unreadable and so left out,
    so that validation does not report them a second time.
    """

    document: dict[str, Any] | None
    locator: Locator
    problems: tuple[Problem, ...] = ()
    blocked: frozenset[DocPath] = frozenset()
