"""Edit an XML part as text: find elements, then splice bytes in, out or between them.

The package parts spanfleet changes (workbook, relationships, content types,
styles, document properties) are edited in place rather than parsed and
re-serialised: a round trip through an XML library renames namespace prefixes
and drops unused namespace declarations, which spreadsheet programs treat as
damage (``mc:Ignorable`` lists prefixes that must stay declared). Every byte
outside an edit stays as it was.

:func:`parse` gives each element's byte span, found with expat (so comments,
CDATA and processing instructions are never mistaken for elements) after
``defusedxml`` has refused entity declarations. :class:`Splice` collects edits
as (start, end, new bytes) and applies them in one pass.

Also here: :func:`text` and :func:`attr`, which make any Python string safe in
XML 1.0 content or a double-quoted attribute.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from xml.parsers import expat

from defusedxml import ElementTree

__all__ = ["Node", "Splice", "XmlPartError", "attr", "parse", "text"]

#: Characters XML 1.0 does not allow anywhere (C0 controls but tab, LF, CR; surrogates; two
#: non-characters).
_ILLEGAL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")
#: One attribute of a start tag; values may hold ``>`` (only ``<`` and ``&`` must be escaped).
_TAG_END = re.compile(rb"""(?:\s+[^\s=/>]+\s*=\s*(?:"[^"]*"|'[^']*'))*\s*(/?)>""")
_DECLARED_ENCODING = re.compile(rb"""^(<\?xml[^>]*?)\s+encoding\s*=\s*["'][^"']*["']""")


class XmlPartError(ValueError):
    """A package part is not well-formed XML (the message names the part)."""


def strip_illegal(value: str) -> str:
    """``value`` without the characters XML 1.0 forbids (a workbook cannot hold them)."""
    return _ILLEGAL.sub("", value)


def text(value: str) -> str:
    """``value`` as XML character content: forbidden characters dropped, ``& < >`` escaped."""
    value = strip_illegal(value)
    return value.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


def attr(value: str) -> str:
    """``value`` for a double-quoted attribute; tab and line ends kept as character references."""
    return (
        text(value)
        .replace('"', "&quot;")
        .replace("\t", "&#9;")
        .replace("\n", "&#10;")
        .replace("\r", "&#13;")
    )


@dataclass(eq=False)
class Node:
    """One element of a parsed part, with byte offsets into the part.

    ``start``: first byte of the start tag; ``open_end``: just past the start
    tag; ``close_start``: first byte of the end tag (``open_end`` for an empty
    element ``<x/>``); ``end``: just past the element. ``qname`` is the name as
    written (with its prefix), ``local`` the name without it; ``attrs`` are
    keyed by their names as written.
    """

    qname: str
    attrs: dict[str, str]
    start: int
    open_end: int
    empty: bool
    close_start: int = 0
    end: int = 0
    children: list[Node] = field(default_factory=list)
    text: str = ""

    @property
    def local(self) -> str:
        """The element name without its namespace prefix."""
        return self.qname.rpartition(":")[2]

    @property
    def prefix(self) -> str:
        """``"x:"`` for an element written ``<x:name>``, else ``""``."""
        head, colon, _ = self.qname.rpartition(":")
        return f"{head}{colon}"

    def get(self, name: str, default: str | None = None) -> str | None:
        """An attribute's value, by its name as written (e.g. ``"r:id"``) or its local name."""
        if name in self.attrs:
            return self.attrs[name]
        for key, value in self.attrs.items():
            if key.rpartition(":")[2] == name and ":" not in name:
                return value
        return default

    def find(self, local: str) -> Node | None:
        """The first child with this local name."""
        return next((c for c in self.children if c.local == local), None)

    def findall(self, local: str) -> list[Node]:
        """Every child with this local name, in document order."""
        return [c for c in self.children if c.local == local]


def _utf8(data: bytes) -> bytes:
    """The part as UTF-8 (parts written in UTF-16 are converted; the declaration follows)."""
    if data.startswith((b"\xff\xfe", b"\xfe\xff")):
        converted = data.decode("utf-16").encode("utf-8")
        return _DECLARED_ENCODING.sub(rb"\1", converted, count=1)
    return data


def parse(data: bytes, part: str) -> tuple[bytes, Node]:
    """The part's bytes (as UTF-8) and its root element with every descendant's span.

    Raises :class:`XmlPartError` for XML that is not well formed or declares
    entities (refused by ``defusedxml``).
    """
    data = _utf8(data)
    try:
        ElementTree.fromstring(data)
    except Exception as exc:  # defusedxml's refusals and expat's errors alike
        raise XmlPartError(f"{part}: {exc}") from exc
    parser = expat.ParserCreate()
    stack: list[Node] = []
    root: list[Node] = []

    def tag_end(at: int) -> tuple[int, bool]:
        m = _TAG_END.match(data, _name_end(data, at))
        if m is None:
            raise XmlPartError(f"{part}: cannot find the end of the tag at byte {at}")
        return m.end(), m.group(1) == b"/"

    def start(name: str, attrs: dict[str, str]) -> None:
        at = parser.CurrentByteIndex
        end, empty = tag_end(at)
        node = Node(qname=name, attrs=attrs, start=at, open_end=end, empty=empty)
        if stack:
            stack[-1].children.append(node)
        else:
            root.append(node)
        stack.append(node)

    def stop(_name: str) -> None:
        node = stack.pop()
        if node.empty:
            node.close_start = node.end = node.open_end
        else:
            node.close_start = parser.CurrentByteIndex
            node.end = data.index(b">", node.close_start) + 1

    def chars(content: str) -> None:
        if stack:
            stack[-1].text += content

    parser.StartElementHandler = start
    parser.EndElementHandler = stop
    parser.CharacterDataHandler = chars
    try:
        parser.Parse(data, True)
    except expat.ExpatError as exc:
        raise XmlPartError(f"{part}: {exc}") from exc
    return data, root[0]


def _name_end(data: bytes, at: int) -> int:
    """Just past the element name of the start tag at ``at`` (``<name``)."""
    i = at + 1
    while i < len(data) and data[i : i + 1] not in b" \t\r\n/>":
        i += 1
    return i


class Splice:
    """Edits to one part's bytes, applied together by :meth:`apply`.

    Offsets refer to the original bytes; edits must not overlap (a deletion
    and an insertion at the same offset are fine and keep their order).
    """

    def __init__(self, data: bytes) -> None:
        self.data = data
        self._edits: list[tuple[int, int, int, bytes]] = []

    def replace(self, start: int, end: int, new: str | bytes) -> None:
        """Replace ``data[start:end]`` by ``new``."""
        raw = new.encode("utf-8") if isinstance(new, str) else new
        self._edits.append((start, end, len(self._edits), raw))

    def insert(self, at: int, new: str | bytes) -> None:
        """Insert ``new`` before ``data[at]``."""
        self.replace(at, at, new)

    def delete(self, node: Node) -> None:
        """Remove an element and everything in it."""
        self.replace(node.start, node.end, b"")

    def set_attrs(self, node: Node, values: dict[str, str | None]) -> None:
        """Rewrite ``node``'s start tag with ``values`` changed (None removes an attribute)."""
        attrs = dict(node.attrs)
        for name, value in values.items():
            if value is None:
                attrs.pop(name, None)
            else:
                attrs[name] = value
        body = "".join(f' {k}="{attr(v)}"' for k, v in attrs.items())
        close = "/>" if node.empty else ">"
        self.replace(node.start, node.open_end, f"<{node.qname}{body}{close}")

    def append(self, node: Node, children: str) -> None:
        """Add ``children`` (XML text) as the last children of ``node``."""
        if not children:
            return
        if node.empty:
            body = "".join(f' {k}="{attr(v)}"' for k, v in node.attrs.items())
            self.replace(node.start, node.end, f"<{node.qname}{body}>{children}</{node.qname}>")
        else:
            self.insert(node.close_start, children)

    def apply(self) -> bytes:
        """The edited bytes."""
        out: list[bytes] = []
        pos = 0
        for start, end, _, raw in sorted(self._edits):
            if start < pos:
                raise ValueError("overlapping edits of one XML part")
            out.append(self.data[pos:start])
            out.append(raw)
            pos = end
        out.append(self.data[pos:])
        return b"".join(out)
