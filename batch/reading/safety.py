"""Look at an input file before trusting it: what it really is, and how big.

Spreadsheet files are zip archives of XML, so a hostile or damaged file can
declare gigabytes of content (a "zip bomb"), carry XML entity declarations that
expand without end ("billion laughs"), or simply be another kind of file with a
workbook's name. Everything here works on the file's bytes, never on the file
itself, so the input is never modified. Each finding is a :class:`Problem` that
says what the file is and what to do (usually: save it as .xlsx).

XML parsing itself goes through ``defusedxml`` (openpyxl uses it whenever it is
installed, see ``openpyxl.xml.DEFUSEDXML``); the checks here come first.
"""

from __future__ import annotations

import io
import zipfile
import zlib
from pathlib import Path

from batch.reading.problems import Problem, file_problem

__all__ = [
    "MAX_FILE_BYTES",
    "MAX_INPUT_COLUMNS",
    "MAX_INPUT_ROWS",
    "MAX_UNCOMPRESSED_BYTES",
    "MAX_ZIP_MEMBERS",
    "WORKBOOK_SUFFIXES",
    "read_bytes",
    "refusal",
    "sniff",
    "xml_entities_problem",
]

#: Largest input file read at all (bytes on disk). A workbook run again in place holds
#: the result sheets of its last run: those of a rated 1,000-member inventory against
#: 300 vehicles take 120-160 MB on disk (the per-vehicle ratings and their terms), and
#: they are replaced, not read (each carries its size, so the reader skips its rows).
MAX_FILE_BYTES = 2**30
#: Largest total uncompressed size of a workbook's zip members. The result sheets of
#: that run unpack to about 750 MB.
MAX_UNCOMPRESSED_BYTES = 8 * 2**30
#: A member may unpack to at most this many times its compressed size once it is
#: larger than ZIP_RATIO_FLOOR: spreadsheet XML compresses about 5-20 times, a zip
#: bomb hundreds or thousands of times.
MAX_ZIP_RATIO = 200
ZIP_RATIO_FLOOR = 16 * 2**20
#: Most members in a workbook's zip archive.
MAX_ZIP_MEMBERS = 10_000
#: Most data rows read from one input sheet (the header row not counted).
MAX_INPUT_ROWS = 100_000
#: Most columns in an input sheet's header row.
MAX_INPUT_COLUMNS = 200
#: File name endings read as workbooks.
WORKBOOK_SUFFIXES = (".xlsx", ".xlsm")

_OLE2 = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_ENCRYPTED = "EncryptedPackage".encode("utf-16-le")
_ODS = b"application/vnd.oasis.opendocument.spreadsheet"
# An XML part's DOCTYPE (where entities are declared) must come before its root element.
_XML_HEAD_BYTES = 64 * 1024
_SAVE_AS = "open it in your spreadsheet program and save it as an Excel Workbook (.xlsx)"


def _mb(n: int) -> str:
    return f"{n / 2**20:,.0f} MB"


def read_bytes(path: Path) -> bytes | Problem:
    """The file's bytes, or a problem when it is missing, unreadable or too large."""
    try:
        if not path.exists():
            return file_problem("file-not-found", f"{path} does not exist; check the path")
        if not path.is_file():
            return file_problem("not-a-file", f"{path} is not a file; give the path of a file")
        size = path.stat().st_size
        if size > MAX_FILE_BYTES:
            return file_problem(
                "file-too-large",
                f"{path.name} is {_mb(size)}, more than the {_mb(MAX_FILE_BYTES)} spanfleet "
                "reads; split the inventory into several workbooks",
            )
        return path.read_bytes()
    except OSError as exc:
        return file_problem(
            "file-unreadable",
            f"{path} cannot be read ({exc.strerror or exc}); close it in other programs "
            "and check that you may read it",
        )


def sniff(data: bytes) -> str:
    """What the bytes look like: ``empty``, ``encrypted``, ``ole2``, ``zip``, ``json`` or ``other``.

    ``encrypted`` is an OLE2 compound file holding an ``EncryptedPackage``
    stream (a password-protected workbook); any other OLE2 file is taken for
    the old binary .xls format.
    """
    if not data.strip():
        return "empty"
    if data.startswith(_OLE2):
        return "encrypted" if _ENCRYPTED in data else "ole2"
    if data[:4] in (b"PK\x03\x04", b"PK\x05\x06"):
        return "zip"
    if data.lstrip(b"\xef\xbb\xbf \t\r\n")[:1] in (b"{", b"["):
        return "json"
    return "other"


def inspect_zip(data: bytes) -> Problem | None:
    """``None`` when the zip archive is a workbook within the caps; else the problem."""
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as archive:
            infos = archive.infolist()
            if len(infos) > MAX_ZIP_MEMBERS:
                return file_problem(
                    "zip-too-large",
                    f"the workbook archive holds {len(infos):,} parts, more than "
                    f"{MAX_ZIP_MEMBERS:,}; it is damaged or not an ordinary workbook: {_SAVE_AS}",
                )
            total = sum(i.file_size for i in infos)
            if total > MAX_UNCOMPRESSED_BYTES:
                return file_problem(
                    "zip-too-large",
                    f"the workbook would unpack to {_mb(total)}, more than the "
                    f"{_mb(MAX_UNCOMPRESSED_BYTES)} spanfleet accepts; remove unused sheets, "
                    "images and formatting, or split the inventory into several workbooks",
                )
            for info in infos:
                if info.file_size > ZIP_RATIO_FLOOR and info.file_size > MAX_ZIP_RATIO * max(
                    info.compress_size, 1
                ):
                    return file_problem(
                        "zip-too-large",
                        f"the workbook part {info.filename} would unpack to "
                        f"{_mb(info.file_size)} from {_mb(info.compress_size)}, far more than a "
                        f"spreadsheet compresses; it is damaged or hostile: {_SAVE_AS}",
                    )
            names = {i.filename for i in infos}
            kind = _zip_kind(archive, names)
            if kind:
                return kind
            return _entity_declarations(archive, infos)
    except (
        zipfile.BadZipFile,
        zipfile.LargeZipFile,
        zlib.error,
        OSError,
        EOFError,
        ValueError,
    ) as exc:  # zlib.error: a member's compressed data is damaged
        return file_problem(
            "damaged-zip",
            f"the file is a damaged zip archive ({exc}); {_SAVE_AS} again",
        )
    except (NotImplementedError, RuntimeError) as exc:  # unknown compression, encrypted member
        return file_problem(
            "damaged-zip", f"the file's archive cannot be unpacked ({exc}); {_SAVE_AS} again"
        )


def _zip_kind(archive: zipfile.ZipFile, names: set[str]) -> Problem | None:
    if "mimetype" in names:
        if archive.read("mimetype").startswith(_ODS):
            return file_problem(
                "ods-format",
                "the file is an OpenDocument spreadsheet (.ods); spanfleet reads .xlsx "
                "workbooks: open it and save it as an Excel Workbook (.xlsx)",
            )
        return file_problem(
            "not-a-workbook", f"the file is an OpenDocument file, not a workbook; {_SAVE_AS}"
        )
    if "xl/workbook.bin" in names:
        return file_problem(
            "xlsb-format",
            "the file is a binary workbook (.xlsb); open it and save it as an Excel "
            "Workbook (.xlsx)",
        )
    if "[Content_Types].xml" not in names or not any(
        n.startswith("xl/") and n.endswith(".xml") for n in names
    ):
        return file_problem(
            "not-a-workbook",
            "the file is a zip archive but not an Excel workbook; give a .xlsx workbook "
            "(or a .json document)",
        )
    return None


def _entity_declarations(archive: zipfile.ZipFile, infos: list[zipfile.ZipInfo]) -> Problem | None:
    for info in infos:
        if not info.filename.endswith((".xml", ".rels", ".vml")):
            continue
        with archive.open(info) as part:
            head = part.read(_XML_HEAD_BYTES)
        if b"<!DOCTYPE" in head or b"<!ENTITY" in head:
            return xml_entities_problem(info.filename)
    return None


def xml_entities_problem(part: str = "") -> Problem:
    """The problem of XML with a DOCTYPE or entity declarations (refused for safety)."""
    where = f" ({part})" if part else ""
    return file_problem(
        "xml-entities",
        f"the workbook contains XML entity declarations{where}, which spanfleet refuses "
        "because they can expand without end; spreadsheet programs never write them: "
        f"{_SAVE_AS} again from a trusted copy",
    )


def refusal(kind: str, suffix: str, data: bytes, name: str) -> Problem | None:
    """Why bytes of this ``kind`` (see :func:`sniff`) cannot be read as the input ``name``.

    ``None`` when they can: a workbook within the caps named .xlsx or .xlsm, or
    anything named .json (the JSON reader judges it).
    """
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
