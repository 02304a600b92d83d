"""Keep the sheet list of ``docProps/app.xml`` in step with the workbook's sheets.

The extended properties part may list the workbook's parts for file browsers
(ECMA-376 Part 1, §22.2.2.12 HeadingPairs and §22.2.2.24 TitlesOfParts): groups
such as "Worksheets" (the group titles are localised) with a count each, and
one name per counted part, in group order. Every result sheet is a worksheet,
so only the group that holds the kept worksheets changes: removed result sheets
leave it and new ones join it (other groups, such as named ranges, are left
alone even where a name equals a sheet's). When the lists do not have that
shape, both are removed: they are optional, and a spreadsheet program writes
them afresh on its next save.
"""

from __future__ import annotations

from collections.abc import Collection, Sequence

from batch.writing.package.xmltext import Node, Splice, parse, text

__all__ = ["update_sheet_list"]


def _vector(root: Node, local: str) -> Node | None:
    holder = root.find(local)
    return holder.find("vector") if holder is not None else None


def _count_of(variant: Node) -> int | None:
    number = next((c for c in variant.children if c.local in ("i4", "i2", "i8", "int")), None)
    if number is None or not number.text.strip().isdigit():
        return None
    return int(number.text.strip())


def update_sheet_list(
    data: bytes,
    worksheets: Collection[str],
    gone: Collection[str],
    new: Sequence[str],
    sheets: Collection[str],
) -> bytes:
    """``app.xml`` with ``gone`` removed from its sheet groups and ``new`` added.

    ``worksheets`` are the kept worksheets' names, ``sheets`` every sheet name
    of the input workbook (kept or gone).
    """
    data, root = parse(data, "docProps/app.xml")
    pairs, titles = _vector(root, "HeadingPairs"), _vector(root, "TitlesOfParts")
    if pairs is None or titles is None:
        return data
    splice = Splice(data)
    variants = pairs.findall("variant")
    names = titles.children
    counts = [_count_of(v) for v in variants[1::2]]
    if len(variants) % 2 or None in counts or sum(c or 0 for c in counts) != len(names):
        return _without_lists(splice, root)
    groups: list[list[Node]] = []
    at = 0
    for count in counts:
        groups.append(names[at : at + (count or 0)])
        at += count or 0
    target = next(
        (
            k
            for k, group in enumerate(groups)
            if group
            and all(n.text in sheets for n in group)
            and any(n.text in worksheets for n in group)
        ),
        None,
    )
    if target is None:
        return _without_lists(splice, root) if new or gone else data
    group = groups[target]
    dropped = [n for n in group if n.text in gone]
    for node in dropped:
        splice.delete(node)
    p = group[-1].prefix
    splice.insert(group[-1].end, "".join(f"<{p}lpstr>{text(name)}</{p}lpstr>" for name in new))
    number = variants[2 * target + 1].children[0]
    splice.replace(number.open_end, number.close_start, str(len(group) - len(dropped) + len(new)))
    splice.set_attrs(titles, {"size": str(len(names) - len(dropped) + len(new))})
    return splice.apply()


def _without_lists(splice: Splice, root: Node) -> bytes:
    """The part without its (optional) heading pairs and titles of parts."""
    for local in ("HeadingPairs", "TitlesOfParts"):
        node = root.find(local)
        if node is not None:
            splice.delete(node)
    return splice.apply()
